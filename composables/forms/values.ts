import { convertQuantity, formatNumber, parseQuantity, type QuantityKind } from '#shared/quantities'
import { UNIT_SYMBOL, type TemperatureUnit } from '#shared/units'

/**
 * A stored value as a box shows it: kelvin in the user's unit (a difference in K or °F), other
 * kinds as they are; '' for none. The inverse of what useSchemaForm reads.
 *
 * @example shown(298.15, 'temperature', 'C') // '25'
 */
export function shown(value: number | null | undefined, kind: QuantityKind, unit: TemperatureUnit, decimals = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return ''
  if (kind === 'temperature') return formatNumber(convertQuantity(value, 'temperature', 'K', UNIT_SYMBOL[unit]), decimals)
  if (kind === 'temperatureDifference') return formatNumber(unit === 'F' ? value * 1.8 : value, decimals)
  return formatNumber(value, decimals + 2)
}

/**
 * A list of temperatures typed in one box ("0, 50, 100" in the user's unit, or "273.15 K; 323.15 K")
 * → kelvin; what cannot be read stays NaN, so the schema names it.
 *
 * @example temperaturesFrom('0, 100', 'C') // [273.15, 373.15]
 */
export function temperaturesFrom(text: string, unit: TemperatureUnit): number[] {
  return text.split(/[,;]|\s+(?=[+\-−]?\d)/).map(s => s.trim()).filter(Boolean).map((s) => {
    try {
      return parseQuantity(s, 'temperature', UNIT_SYMBOL[unit], 'K')
    }
    catch {
      return Number.NaN
    }
  })
}

/** Kelvin values as that box shows them: "0, 50, 100". */
export function temperaturesShown(values: readonly number[], unit: TemperatureUnit): string {
  return values.map(k => shown(k, 'temperature', unit)).join(', ')
}
