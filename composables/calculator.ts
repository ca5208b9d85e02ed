import type { BandInput } from '#shared/schemas/calculation'

/** The radiation constants a calculation may name, with what the page says about each. */
export type ConstantsId = 'CODATA-2018' | 'ITS-90'
export const CONSTANTS_LABELS: Record<ConstantsId, string> = {
  'CODATA-2018': 'CODATA 2018 (c₂ = hc/k)',
  'ITS-90': 'ITS-90 (c₂ = 0.014388 m·K)',
}

/** A certified radiance temperature: T_rad (K) in its band, with the surroundings T_w0 (K) when certified. */
export interface RadianceTemperatureSource { temperatureK: number, band: BandInput, reflectedTemperatureK: number }

/**
 * One set of the reading calculator's inputs, in SI (kelvin, µm): the body of
 * POST /api/calculations/expected-reading. The source is given by its temperature T_s
 * (`sourceTemperatureK`) or by its certified radiance temperature (`sourceRadianceTemperature`).
 */
export interface ReadingPoint {
  band: BandInput
  sourceTemperatureK?: number
  sourceRadianceTemperature?: RadianceTemperatureSource
  sourceEmissivity: number
  reflectedTemperatureK: number
  instrumentTemperatureK: number
  emissivitySetting: number
  constants: ConstantsId
}

/**
 * The expected-reading API's answer: T_meas, the source temperature T_s it used (found from T_rad
 * for a radiance temperature), the constants with c₂ (m·K) and ∂T_meas/∂x for each input — for a
 * radiance temperature `radianceTemperature` and `certificationReflectedTemperature` instead of
 * `sourceTemperature`.
 */
export interface ReadingReply {
  expectedReadingK: number
  sourceTemperatureK: number
  constants: ConstantsId
  c2: number
  sensitivities: Record<string, number>
}

/** What each sensitivity acts on, in the order the page lists them, and whether it is an emissivity. */
export const SENSITIVITY_INPUTS: { key: string, label: string, emissivity: boolean }[] = [
  { key: 'sourceTemperature', label: 'Source temperature T_s', emissivity: false },
  { key: 'radianceTemperature', label: 'Radiance temperature T_rad', emissivity: false },
  { key: 'sourceEmissivity', label: 'Source emissivity ε_s', emissivity: true },
  { key: 'certificationReflectedTemperature', label: 'Surroundings when certified T_w0', emissivity: false },
  { key: 'reflectedTemperature', label: 'Reflected temperature T_w', emissivity: false },
  { key: 'instrumentTemperature', label: 'Instrument temperature T_d', emissivity: false },
  { key: 'emissivitySetting', label: 'Emissivity setting ε_i', emissivity: true },
]

/** The source temperature T_s of a point: the API's (found from T_rad) when it answered, else as given. */
export function surfaceTemperatureOf(point: ReadingPoint, reply: ReadingReply | null): number {
  return reply?.sourceTemperatureK ?? point.sourceTemperatureK ?? point.sourceRadianceTemperature?.temperatureK ?? Number.NaN
}
