/**
 * Quantities as people type them: "25 °C", "298.15 K", "900 nm", "300 mm", "1.5 %". A box knows
 * what it holds (a temperature, a wavelength …) and the unit a bare number is read in; a typed
 * unit is converted with mathjs, and a unit of the wrong kind is refused in words ("°C expected,
 * got m"). Pure: no framework imports; used by the forms now and by the CSV import later.
 *
 * Definitions (exact, SI Brochure 9th ed. §2.3.1 and ITS-90): t/°C = T/K − 273.15;
 * t/°F = T/K · 9/5 − 459.67 (so 0 °C = 32 °F and a difference of 1 K = 1 °C = 1.8 °F);
 * 1 µm = 1000 nm = 10⁻⁶ m.
 *
 * @example parseQuantity('25 °C', 'temperature', '°C', 'K') // 298.15
 * @example parseQuantity('900 nm', 'wavelength', 'µm') // 0.9
 */
import { create, unitDependencies } from 'mathjs'
import { formatNumber } from './format'

export { formatNumber }

// Only the unit machinery of mathjs (its types list every factory as possibly missing).
const math = create({ unitDependencies: unitDependencies! })

/** What a box holds. `number` is a plain number (an emissivity, a coverage factor): no unit. */
export type QuantityKind = 'temperature' | 'temperatureDifference' | 'wavelength' | 'length' | 'percent' | 'number'

/** The units people type for each kind, in the spelling the pages show. */
export const QUANTITY_UNITS: Record<QuantityKind, readonly string[]> = {
  temperature: ['°C', 'K', '°F'],
  temperatureDifference: ['K', '°C', '°F', 'mK'],
  wavelength: ['µm', 'nm', 'mm'],
  length: ['mm', 'cm', 'm'],
  percent: ['%'],
  number: [],
}

/** Why a text is not a quantity of the kind asked for. */
export type QuantityProblem = 'empty' | 'not-a-number' | 'unknown-unit' | 'wrong-unit'

/** A text that is not a quantity of the kind asked for; `message` says why in words. */
export class QuantityError extends Error {
  constructor(readonly problem: QuantityProblem, message: string) {
    super(message)
    this.name = 'QuantityError'
  }
}

/** Spellings people type → mathjs unit names (anything else is handed to mathjs as typed). */
const ALIASES: Record<string, string> = {
  '°C': 'degC', '℃': 'degC', 'ºC': 'degC', 'C': 'degC', 'degC': 'degC', 'celsius': 'degC',
  '°F': 'degF', '℉': 'degF', 'ºF': 'degF', 'F': 'degF', 'degF': 'degF', 'fahrenheit': 'degF',
  'K': 'K', 'kelvin': 'K', 'mK': 'mK',
  'µm': 'um', 'μm': 'um', 'um': 'um', 'micron': 'um', 'microns': 'um',
}

/** The base unit of each kind as mathjs knows it (for the dimension check). */
const BASE: Partial<Record<QuantityKind, string>> = { temperature: 'K', temperatureDifference: 'K', wavelength: 'm', length: 'm' }

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?$/i

/**
 * Split a typed quantity into its number and the unit written after it (null when none).
 * Accepts a Unicode minus (−), a decimal comma ("0,95") and no space before the unit ("25°C").
 *
 * @param text what was typed, e.g. "−40 °C"
 * @returns the number (unitless) and the unit as typed, e.g. `{ value: -40, unit: '°C' }`
 * @throws QuantityError 'empty' or 'not-a-number'
 * @example splitQuantity('0,95') // { value: 0.95, unit: null }
 */
export function splitQuantity(text: string): { value: number, unit: string | null } {
  const s = text.trim().replace(/[−–]/g, '-')
  if (s === '') throw new QuantityError('empty', 'Nothing entered')
  const m = /^([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/.exec(s)
  if (!m) throw new QuantityError('not-a-number', `“${text.trim()}” is not a number`)
  const numberText = m[1]!.replace(',', '.')
  const value = Number(numberText)
  if (!NUMBER.test(numberText) || !Number.isFinite(value)) throw new QuantityError('not-a-number', `“${text.trim()}” is not a number`)
  const unit = m[2]!.trim()
  // "1.2.3", "25 30": more number where a unit would stand.
  if (/^[\d.,+-]/.test(unit)) throw new QuantityError('not-a-number', `“${text.trim()}” is not a number`)
  return { value, unit: unit === '' ? null : unit }
}

/** A mathjs unit for a spelling, or null when mathjs knows no such unit. */
function mathUnit(spelling: string) {
  const name = ALIASES[spelling] ?? spelling
  try {
    return math.unit(1, name)
  }
  catch {
    return null
  }
}

function unitOf(spelling: string) {
  const u = mathUnit(spelling)
  if (!u) throw new QuantityError('unknown-unit', `“${spelling}” is not a unit`)
  return u
}

/** "°C, K or °F" */
function inWords(list: readonly string[]): string {
  return list.length <= 1 ? (list[0] ?? '') : `${list.slice(0, -1).join(', ')} or ${list[list.length - 1]}`
}

/**
 * Convert a value of a kind between two units (spelt as the pages spell them: °C, K, °F, µm …).
 * Temperatures convert with their offsets; a temperature difference converts by scale only.
 *
 * @param value the number in `from`
 * @param kind what it is
 * @param from its unit, e.g. '°C'
 * @param to the unit wanted, e.g. 'K'
 * @returns the value in `to`
 * @throws QuantityError 'unknown-unit' or 'wrong-unit'
 * @example convertQuantity(0, 'temperature', '°C', '°F') // 32
 * @example convertQuantity(1, 'temperatureDifference', 'K', '°F') // 1.8
 */
export function convertQuantity(value: number, kind: QuantityKind, from: string, to: string): number {
  if (kind === 'number' || kind === 'percent' || from === to) {
    if (from !== to) throw new QuantityError('wrong-unit', `${to || 'a plain number'} expected, got ${from}`)
    return value
  }
  const source = unitOf(from)
  const target = unitOf(to)
  const base = math.unit(1, BASE[kind]!)
  if (!source.equalBase(base)) throw new QuantityError('wrong-unit', `${from} is not a unit of ${kind === 'wavelength' || kind === 'length' ? 'length' : 'temperature'}`)
  if (!target.equalBase(base)) throw new QuantityError('wrong-unit', `${to} is not a unit of ${kind === 'wavelength' || kind === 'length' ? 'length' : 'temperature'}`)
  const sourceName = ALIASES[from] ?? from
  const targetName = ALIASES[to] ?? to
  if (kind === 'temperatureDifference') {
    // A difference keeps no offset: (v in from → K) − (0 in from → K), then K → to the same way.
    const k = math.unit(value, sourceName).toNumber('K') - math.unit(0, sourceName).toNumber('K')
    const perK = math.unit(1, 'K').toNumber(targetName) - math.unit(0, 'K').toNumber(targetName)
    return k * perK
  }
  return math.unit(value, sourceName).toNumber(targetName)
}

/**
 * Read a typed quantity: the number, in the unit written after it or else in `unit`, converted to
 * `to`. A unit of another kind ("25 m" in a temperature box) is refused in words.
 *
 * @param text what was typed, e.g. "298.15 K" or "25"
 * @param kind what the box holds
 * @param unit the unit a bare number is read in, e.g. '°C' (ignored for `number`; for `percent` a
 *   spelling such as '%RH' that is accepted besides '%')
 * @param to the unit of the result (default: `unit`)
 * @returns the value in `to`
 * @throws QuantityError with a message such as "°C expected, got m"
 * @example parseQuantity('77 °F', 'temperature', '°C', 'K') // 298.15
 * @example parseQuantity('1.5 %', 'percent', '%') // 1.5
 */
export function parseQuantity(text: string, kind: QuantityKind, unit: string, to: string = unit): number {
  const { value, unit: typed } = splitQuantity(text)
  if (kind === 'number') {
    if (typed !== null) throw new QuantityError('wrong-unit', `a plain number expected, got ${typed}`)
    return value
  }
  if (kind === 'percent') {
    if (typed !== null && typed !== '%' && typed !== unit) throw new QuantityError('wrong-unit', `% expected, got ${typed}`)
    return value
  }
  if (typed === null) return convertQuantity(value, kind, unit, to)
  const u = mathUnit(typed)
  if (!u) throw new QuantityError('unknown-unit', `“${typed}” is not a unit: use ${inWords(QUANTITY_UNITS[kind])}`)
  if (!u.equalBase(math.unit(1, BASE[kind]!))) throw new QuantityError('wrong-unit', `${unit} expected, got ${typed}`)
  return convertQuantity(value, kind, typed, to)
}

/**
 * Whether a text carries its own unit (so a form can show it converted into the box's unit).
 *
 * @example hasUnit('298.15 K') // true
 */
export function hasUnit(text: string): boolean {
  try {
    return splitQuantity(text).unit !== null
  }
  catch {
    return false
  }
}
