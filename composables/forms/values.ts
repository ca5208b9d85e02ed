import { convertQuantity, formatNumber, type QuantityKind } from '#shared/quantities'
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
