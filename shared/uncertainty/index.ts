/**
 * Uncertainty engine: GUM budgets (JCGM 100:2008), Monte Carlo propagation (JCGM 101:2008) and
 * conformity decisions (ILAC-G8:09/2019). Pure TypeScript, no framework imports.
 */
export { EngineInputError } from '../radiometry/errors'
export * from './budget'
export * from './montecarlo'
export * from './conformity'
export * from './normal'
