/**
 * Money as the laboratory bills it: every amount is an integer number of the currency's minor unit
 * (pence, cents — `…Minor` in the API), so sums are exact; a tax rate is held in basis points
 * (1 bp = 0.01 %, 20 % = 2000 bp). Tax is worked out once on an invoice's net total and rounded to
 * the minor unit half away from zero (commercial rounding — common practice for invoice totals, and
 * the rule this product applies everywhere). Pure: no framework imports; pages, PDFs, e-mails and the
 * server all use it.
 */

/** ISO 4217 codes this product accepts: three capital letters. */
export const CURRENCY_RE = /^[A-Z]{3}$/

/** Largest unit price, in minor units (10⁸ — a million pounds or euros). */
export const MAX_MINOR = 100_000_000

/** Largest total of one document, in minor units: what a 32-bit database integer holds (2³¹ − 1). */
export const MAX_DOCUMENT_MINOR = 2_147_483_647

/**
 * Decimal places of a currency's minor unit (ISO 4217 "minor unit"), from the platform's Intl data:
 * 2 for GBP/EUR/USD, 0 for JPY, 3 for KWD. Falls back to 2 for a code Intl does not know.
 * @param currency - ISO 4217 code, e.g. `GBP`
 * @returns number of decimals, 0–3
 * @example currencyDigits('GBP') // 2
 */
export function currencyDigits(currency: string): number {
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2
  }
  catch {
    return 2
  }
}

/**
 * An amount typed in major units (120.5 pounds) as minor units (12050 pence); NaN when it has more
 * decimals than the currency's minor unit allows (120.505 GBP) or is not finite.
 * @param major - amount in major units
 * @param digits - the currency's decimals ({@link currencyDigits})
 * @example toMinor(120.5, 2) // 12050
 */
export function toMinor(major: number, digits: number): number {
  if (!Number.isFinite(major)) return Number.NaN
  const scaled = major * 10 ** digits
  const rounded = Math.round(scaled)
  // A decimal typed with at most `digits` places scales to within rounding noise of an integer.
  return Math.abs(scaled - rounded) < 1e-6 * Math.max(1, Math.abs(scaled)) ? rounded : Number.NaN
}

/**
 * An amount as typed in a form box ("120.50", "1,234", "£ 95") as minor units; NaN for anything
 * else — an empty box, letters, a negative amount, more decimals than the currency has.
 * @example moneyTextToMinor('1,234.5', 2) // 123450
 */
export function moneyTextToMinor(text: string, digits: number): number {
  const t = String(text ?? '').trim().replace(/[\s,]/g, '').replace(/^[£€$¥]/, '')
  if (!/^(\d+(\.\d*)?|\.\d+)$/.test(t)) return Number.NaN
  return toMinor(Number(t), digits)
}

/**
 * Minor units as major units, for a form box: 12050 → 120.5.
 * @example fromMinor(12050, 2) // 120.5
 */
export function fromMinor(minor: number, digits: number): number {
  return minor / 10 ** digits
}

/**
 * Minor units as plain decimal text with exactly the currency's decimals, a hyphen-minus for a
 * negative amount (for CSV files and form boxes): 12050 → "120.50", −5 → "-0.05".
 * @example minorToDecimal(12050, 2) // '120.50'
 */
export function minorToDecimal(minor: number, digits: number): string {
  const sign = minor < 0 ? '-' : ''
  const abs = Math.abs(Math.trunc(minor))
  if (digits === 0) return `${sign}${abs}`
  const s = String(abs).padStart(digits + 1, '0')
  return `${sign}${s.slice(0, -digits)}.${s.slice(-digits)}`
}

/**
 * An amount for people to read, with the currency's symbol: 123450 GBP → "£1,234.50".
 * @param minor - amount in minor units
 * @param currency - ISO 4217 code
 * @example formatMoney(123450, 'GBP') // '£1,234.50'
 */
export function formatMoney(minor: number, currency: string): string {
  const digits = currencyDigits(currency)
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency, minimumFractionDigits: digits, maximumFractionDigits: digits })
      .format(fromMinor(minor, digits))
      .replace(/^-/, '\u2212')
  }
  catch {
    return `${currency} ${minorToDecimal(minor, digits)}`
  }
}

/**
 * A tax rate in percent (as typed: 20, 7.7, 0) as basis points; NaN for more than two decimals.
 * @example percentToBasisPoints(7.7) // 770
 */
export function percentToBasisPoints(percent: number): number {
  return toMinor(percent, 2)
}

/** Basis points as percent: 2000 → 20. */
export function basisPointsToPercent(bp: number): number {
  return bp / 100
}

/**
 * The amount of one line: quantity × unit price, in minor units (exact: both are integers).
 * @param quantity - a whole number of units (points, items)
 * @param unitPriceMinor - price of one unit, minor units
 */
export function lineAmount(quantity: number, unitPriceMinor: number): number {
  return quantity * unitPriceMinor
}

/**
 * Tax on a net amount, rounded to the minor unit half away from zero, in exact integer arithmetic
 * (BigInt: net × rate can pass 2⁵³).
 * @param netMinor - net amount, minor units (negative for a credit)
 * @param rateBp - tax rate in basis points (2000 = 20 %)
 * @returns tax in minor units
 * @example taxOf(12345, 2000) // 2469 (20 % of £123.45 is £24.69)
 * @example taxOf(3, 2000) // 1 (0.6 p rounds up)
 */
export function taxOf(netMinor: number, rateBp: number): number {
  const n = BigInt(Math.abs(netMinor)) * BigInt(rateBp)
  // BigInt(…) rather than literals: the server bundle's target (es2019) has no BigInt literals.
  const q = (n + BigInt(5000)) / BigInt(10000)
  const t = Number(q)
  return netMinor < 0 ? -t : t
}

export interface Totals {
  netMinor: number
  taxMinor: number
  grossMinor: number
}

/**
 * Net (sum of the lines), tax (on the net, once) and gross of a document.
 * @param lines - each line's quantity and unit price (minor units)
 * @param rateBp - tax rate, basis points
 * @example totalsOf([{ quantity: 1, unitPriceMinor: 18000 }, { quantity: 2, unitPriceMinor: 2500 }], 2000) // { netMinor: 23000, taxMinor: 4600, grossMinor: 27600 }
 */
export function totalsOf(lines: readonly { quantity: number, unitPriceMinor: number }[], rateBp: number): Totals {
  const netMinor = lines.reduce((s, l) => s + lineAmount(l.quantity, l.unitPriceMinor), 0)
  const taxMinor = taxOf(netMinor, rateBp)
  return { netMinor, taxMinor, grossMinor: netMinor + taxMinor }
}
