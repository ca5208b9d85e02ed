/**
 * Radiometry engine: Planck's law, band radiance, inversion, the reading model of a radiation
 * thermometer and the Sakuma–Hattori equation. Pure TypeScript, no framework imports.
 * Units: wavelength µm, temperature K, radiance W·m⁻²·sr⁻¹ (spectral: per µm).
 */
export * from './constants'
export * from './errors'
export {
  PreparedBand,
  prepareBand,
  validateBand,
  spectralRadiance,
  spectralRadianceDerivative,
  blackbodyFraction,
  totalRadiance,
  bandRadiance,
  bandRadianceDerivative,
  bandRadianceQuadrature,
  type Band,
  type RectangularBand,
  type TabulatedBand,
  type QuadratureResult,
} from './planck'
export { INVERSION_RANGE_K, temperatureFromRadiance, type InversionOptions } from './inversion'
export {
  expectedReading,
  expectedReadingK,
  readingSensitivities,
  readingModel,
  type ReadingInput,
  type ExpectedReading,
  type ReadingSensitivities,
} from './reading'
export * from './sakumaHattori'
export { SignalTable, prepareSignalTable, SIGNAL_TABLE_TOLERANCE, type ReadingModelOptions } from './signalTable'
