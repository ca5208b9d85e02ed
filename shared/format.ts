/** Plain-language renderings shared by pages, certificates and e-mails. */
import type { AccuracySpec } from './schemas/instrument'

/** A maker's accuracy specification as it would be written on a data sheet. */
export function describeAccuracy(spec: AccuracySpec): string {
  switch (spec.kind) {
    case 'absolute': return `±${spec.b} °C`
    case 'percentOfReading': return `±${spec.a} % of reading`
    case 'greaterOf': return `±${spec.a} % of reading or ±${spec.b} °C, whichever is greater`
    case 'percentPlus': return `±(${spec.a} % of reading + ${spec.b} °C)`
  }
}

/** A spectral band for display: "8–14 µm" or the responsivity table's name. */
export function describeBand(b: { bandLambda1Um: number | null, bandLambda2Um: number | null, spectralResponseName?: string | null }): string {
  if (b.bandLambda1Um !== null && b.bandLambda2Um !== null) return `${b.bandLambda1Um}–${b.bandLambda2Um} µm`
  return b.spectralResponseName ? `table: ${b.spectralResponseName}` : '—'
}

/**
 * A kelvin value as Celsius, computed in whole micro-kelvins so that 373.15 K is exactly 100 °C
 * (not 100.00000000000003 from the binary difference). ITS-90: t/°C = T/K − 273.15.
 * @example kelvinToCelsius(373.15) === 100
 */
export function kelvinToCelsius(kelvin: number): number {
  return (Math.round(kelvin * 1e6) - 273_150_000) / 1e6
}

/** "100 °C", "−18.5 °C": a kelvin value in Celsius with up to `maxDecimals` decimals and a typographic minus. */
export function kelvinToCelsiusText(kelvin: number, maxDecimals = 2): string {
  return `${typographicMinus(String(+kelvinToCelsius(kelvin).toFixed(maxDecimals)))} °C`
}

/** Hyphen-minus signs replaced by the typographic minus (U+2212) in a rendered number. */
export function typographicMinus(text: string): string {
  return text.replace(/(^|[\s(±])-(?=\d)/g, '$1\u2212')
}

/**
 * A number rounded to `decimals` places in decimal, half away from zero, as text — the value is
 * first written with 15 significant digits (what a double holds faithfully), so 99.95 rounds to
 * 100.0 at one decimal, as on paper, not to 99.9 as its binary expansion 99.9499… would.
 * @example formatFixed(99.95, 1) === '100.0'; formatFixed(-0.04, 1) === '0.0'
 */
export function formatFixed(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return String(value)
  const neg = value < 0
  const [mant, expPart] = Math.abs(value).toPrecision(15).split('e')
  let [int, frac = ''] = mant!.split('.')
  const exp = Number(expPart ?? 0)
  // Shift the decimal point by the exponent.
  let digits = int! + frac
  let point = int!.length + exp
  if (point < 0) {
    digits = '0'.repeat(-point) + digits
    point = 0
  }
  if (point > digits.length) digits = digits + '0'.repeat(point - digits.length)
  int = digits.slice(0, point) || '0'
  frac = digits.slice(point)
  // Round at `decimals` places, half away from zero.
  const keep = (int + frac.padEnd(decimals, '0').slice(0, decimals)).split('').map(Number)
  if ((frac[decimals] ?? '0') >= '5') {
    let i = keep.length - 1
    while (i >= 0) {
      if (keep[i]! < 9) { keep[i]!++; break }
      keep[i] = 0
      i--
    }
    if (i < 0) keep.unshift(1)
  }
  const all = keep.join('')
  const intPart = all.slice(0, all.length - decimals).replace(/^0+(?=\d)/, '') || '0'
  const text = decimals > 0 ? `${intPart}.${all.slice(all.length - decimals)}` : intPart
  return neg && /[1-9]/.test(text) ? `-${text}` : text
}

/** A kelvin value in Celsius to `decimals` places (computed in decimal), with a typographic minus. */
export function celsiusFixed(kelvin: number, decimals: number): string {
  return typographicMinus(formatFixed(kelvinToCelsius(kelvin), decimals))
}

/** A decimal text as an integer count of 10^−places (`'-1.5'`, 2 → −150n); the text has at most `places` decimals. */
function scaledDecimal(text: string, places: number): bigint {
  const neg = text.startsWith('-')
  const [int, frac = ''] = text.replace(/^[-+]/, '').split('.')
  const v = BigInt(int! + frac.padEnd(places, '0'))
  return neg ? -v : v
}

/**
 * A kelvin value in kelvin text, rounded exactly as `celsiusFixed` rounds it in Celsius: the
 * Celsius digits to `decimals` places plus 273.15, added in decimal (ITS-90: T/K = t/°C + 273.15),
 * with at least two decimals — so a machine-readable certificate states the same value as the
 * printed one. Plain ASCII (hyphen-minus), no unit.
 * @param kelvin temperature, K
 * @param decimals decimal places of the Celsius value
 * @returns the temperature in kelvin as text, e.g. `'373.15'`
 * @example kelvinFixed(373.15, 2) === '373.15'; kelvinFixed(296.15, 1) === '296.15'; kelvinFixed(373.1549, 3) === '373.155'
 */
export function kelvinFixed(kelvin: number, decimals: number): string {
  const places = Math.max(decimals, 2)
  const sum = scaledDecimal(formatFixed(kelvinToCelsius(kelvin), decimals), places) + scaledDecimal('273.15', places)
  const neg = sum < BigInt(0)
  const digits = (neg ? -sum : sum).toString().padStart(places + 1, '0')
  return `${neg ? '-' : ''}${digits.slice(0, -places)}.${digits.slice(-places)}`
}

/**
 * A number for a box, with at most `decimals` decimals and no trailing zeros (25, 298.15, 0.9).
 *
 * @example formatNumber(298.15000000000003) // '298.15'
 */
export function formatNumber(value: number, decimals = 6): string {
  if (!Number.isFinite(value)) return ''
  return String(Number(value.toFixed(decimals)))
}

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December']

/**
 * A date (`YYYY-MM-DD`, or the start of an ISO timestamp) written out as documents print it.
 * @example longDate('2026-12-02') // '2 December 2026'
 */
export function longDate(iso: string): string {
  const [y, m, d] = iso.slice(0, 10).split('-').map(Number)
  return `${d} ${MONTHS[m! - 1]} ${y}`
}
