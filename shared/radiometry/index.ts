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
  vacuumWavelengthFactor,
  STANDARD_AIR_REFRACTIVE_INDEX,
  type WavelengthMedium,
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
export {
  surfaceTemperatureFromRadianceTemperature,
  expectedReadingFromRadianceTemperature,
  expectedReadingFromRadianceTemperatureK,
  radianceTemperatureReadingModel,
  type RadianceTemperatureInput,
  type RadianceTemperatureReadingInput,
  type RadianceTemperatureReading,
  type RadianceTemperatureSensitivities,
} from './radianceTemperature'
export {
  RATIO_MODEL_INPUTS,
  expectedRatioReading,
  ratioReadingModel,
  type RatioReadingInput,
  type RatioReading,
  type RatioReadingSensitivities,
} from './ratio'
export {
  CALIBRATION_EQUATION_MODELS,
  fitCalibrationEquation,
  calibrationEquationAtReading,
  calibrationEquationAtReference,
  type CalibrationPointInput,
  type CalibrationEquationModel,
  type CalibrationEquationInput,
  type CalibrationResidual,
  type CalibrationEquation,
  type CalibrationEquationValue,
} from './calibrationEquation'
export { SignalTable, prepareSignalTable, SIGNAL_TABLE_TOLERANCE, type ReadingModelOptions } from './signalTable'
