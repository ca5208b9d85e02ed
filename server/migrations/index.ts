/**
 * Every migration, in order. Listed by hand (not globbed) so the built server
 * bundles them and scripts run the same list. Add a new file and one line here.
 */
import * as m0001 from './0001-foundation'
import * as m0002 from './0002-registers'
import * as m0003 from './0003-runs'
import * as m0004 from './0004-certificates'
import * as m0005 from './0005-mail'
import * as m0006 from './0006-requests'
import * as m0007 from './0007-sessions-throttles'
import * as m0008 from './0008-lab-time-zone'
import * as m0009 from './0009-record-truth'
import * as m0010 from './0010-reference-basis'
import * as m0011 from './0011-shared-state'
import * as m0012 from './0012-certificate-dcc'
import * as m0013 from './0013-quality-records'
import * as m0014 from './0014-instrument-kinds'
import * as m0015 from './0015-speed'
import * as m0016 from './0016-billing'

export const migrations = [
  { name: '0001-foundation', ...m0001 },
  { name: '0002-registers', ...m0002 },
  { name: '0003-runs', ...m0003 },
  { name: '0004-certificates', ...m0004 },
  { name: '0005-mail', ...m0005 },
  { name: '0006-requests', ...m0006 },
  { name: '0007-sessions-throttles', ...m0007 },
  { name: '0008-lab-time-zone', ...m0008 },
  { name: '0009-record-truth', ...m0009 },
  { name: '0010-reference-basis', ...m0010 },
  { name: '0011-shared-state', ...m0011 },
  { name: '0012-certificate-dcc', ...m0012 },
  { name: '0013-quality-records', ...m0013 },
  { name: '0014-instrument-kinds', ...m0014 },
  { name: '0015-speed', ...m0015 },
  { name: '0016-billing', ...m0016 },
]
