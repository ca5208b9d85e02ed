/**
 * Every migration, in order. Listed by hand (not globbed) so the built server
 * bundles them and scripts run the same list. Add a new file and one line here.
 */
import * as m0001 from './0001-foundation'

export const migrations = [
  { name: '0001-foundation', ...m0001 },
]
