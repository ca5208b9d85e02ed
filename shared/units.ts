/**
 * Temperature units for display. Everything is stored and computed in kelvin; pages
 * convert at the edge. ITS-90 / SI: t/°C = T/K − 273.15; t/°F = 1.8·t/°C + 32.
 */
export type TemperatureUnit = 'C' | 'K' | 'F'
export const TEMPERATURE_UNITS: readonly TemperatureUnit[] = ['C', 'K', 'F']
export const UNIT_SYMBOL: Record<TemperatureUnit, string> = { C: '°C', K: 'K', F: '°F' }

const ZERO_CELSIUS_K = 273.15

/** A temperature in the given unit → kelvin. */
export function toKelvin(value: number, unit: TemperatureUnit): number {
  if (unit === 'K') return value
  if (unit === 'C') return value + ZERO_CELSIUS_K
  return (value - 32) / 1.8 + ZERO_CELSIUS_K
}

/** Kelvin → a temperature in the given unit. */
export function fromKelvin(kelvin: number, unit: TemperatureUnit): number {
  if (unit === 'K') return kelvin
  if (unit === 'C') return kelvin - ZERO_CELSIUS_K
  return (kelvin - ZERO_CELSIUS_K) * 1.8 + 32
}

/** A temperature difference in kelvin → the same difference in the given unit (1 K = 1 °C = 1.8 °F). */
export function deltaFromKelvin(deltaK: number, unit: TemperatureUnit): number {
  return unit === 'F' ? deltaK * 1.8 : deltaK
}

/** Format a temperature in kelvin for display in a unit. */
export function formatTemperature(kelvin: number, unit: TemperatureUnit, decimals = 2): string {
  return `${fromKelvin(kelvin, unit).toFixed(decimals)} ${UNIT_SYMBOL[unit]}`
}
