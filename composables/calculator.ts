import type { BandInput } from '#shared/schemas/calculation'

/** One set of the reading calculator's inputs, in SI (kelvin, µm). */
export interface ReadingPoint { band: BandInput, sourceTemperatureK: number, sourceEmissivity: number, reflectedTemperatureK: number, instrumentTemperatureK: number, emissivitySetting: number }

/** The expected-reading API's answer. */
export interface ReadingReply { expectedReadingK: number, sensitivities: Record<'sourceTemperature' | 'sourceEmissivity' | 'reflectedTemperature' | 'instrumentTemperature' | 'emissivitySetting', number> }
