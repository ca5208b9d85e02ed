/**
 * Assuring the validity of results (ISO/IEC 17025:2017 6.4.9, 6.4.10, 7.7, 7.10): proficiency
 * statistics, check-standard control charts, calibration intervals of the laboratory's own
 * equipment and the re-evaluation of results after a reference is found out of tolerance.
 * Pure TypeScript, no framework imports.
 */
export { EngineInputError } from '../radiometry/errors'
export * from './proficiency'
export * from './controlChart'
export * from './intervals'
export * from './impact'
export * from './checks'
export * from './constants'
