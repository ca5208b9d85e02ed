/**
 * Tabulated relative spectral responsivity R(λ) of an instrument, as a laboratory or a maker
 * measured it: a two-column table of wavelength (µm) and relative response (any scale).
 * The instrument signal is S(T) = ∫ R(λ) L(λ,T) dλ (see shared/radiometry); this module only
 * reads and checks the table and puts it in a canonical form, so the same curve is stored once.
 */
import Papa from 'papaparse'

/** One row: `[wavelengthUm, relativeResponse]`. */
export type ResponsivityPoint = [wavelengthUm: number, response: number]

export type ResponsivityParse =
  | { ok: true, points: ResponsivityPoint[] }
  | { ok: false, message: string }

const MAX_POINTS = 20_000

function numberCell(cell: string): number | null {
  const s = cell.trim()
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) return null
  return Number(s)
}

/**
 * Check a table: at least 2 rows; wavelengths finite, above 0 µm and strictly increasing;
 * responses finite, not negative, and not all zero. Returns the first problem or `null`.
 *
 * @example responsivityProblem([[8, 0.1], [14, 0.2]]) // null
 */
export function responsivityProblem(points: readonly (readonly [number, number])[]): string | null {
  if (points.length < 2) return 'A responsivity table needs at least 2 points'
  if (points.length > MAX_POINTS) return `At most ${MAX_POINTS} points`
  for (let i = 0; i < points.length; i++) {
    const [l, r] = points[i]!
    if (!Number.isFinite(l) || l <= 0) return `Point ${i + 1}: the wavelength must be above 0 µm`
    if (!Number.isFinite(r) || r < 0) return `Point ${i + 1}: the response must be 0 or more`
    if (i > 0 && !(l > points[i - 1]![0])) return `Point ${i + 1}: wavelengths must increase strictly (${l} µm follows ${points[i - 1]![0]} µm)`
  }
  if (points.every(p => p[1] === 0)) return 'The responses are all zero'
  return null
}

/**
 * Read a CSV table of wavelength (µm) and relative response. A first row that is not numeric is
 * taken as a header; blank lines are skipped; comma, semicolon or tab separate the columns.
 *
 * @example parseResponsivityCsv('wavelengthUm,response\n8,0.2\n14,0.3') // { ok: true, points: [[8, 0.2], [14, 0.3]] }
 */
export function parseResponsivityCsv(text: string): ResponsivityParse {
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy', delimitersToGuess: [',', ';', '\t'] })
  const rows = parsed.data.filter(r => r.some(c => c.trim() !== ''))
  if (rows.length === 0) return { ok: false, message: 'The table is empty' }
  const points: ResponsivityPoint[] = []
  for (let i = 0; i < rows.length; i++) {
    const row = rows[i]!
    const l = numberCell(row[0] ?? '')
    const r = numberCell(row[1] ?? '')
    if (i === 0 && (l === null || r === null)) continue // header
    if (row.length < 2) return { ok: false, message: `Row ${i + 1}: two columns are needed (wavelength µm, relative response)` }
    if (l === null) return { ok: false, message: `Row ${i + 1}: the wavelength "${row[0]}" is not a number` }
    if (r === null) return { ok: false, message: `Row ${i + 1}: the response "${row[1]}" is not a number` }
    points.push([l, r])
  }
  const problem = responsivityProblem(points)
  return problem ? { ok: false, message: problem } : { ok: true, points }
}

/** 12 significant digits, written without exponent noise (`0.1` not `0.10000000000000001`). */
function canonicalNumber(x: number): string {
  return String(Number(x.toPrecision(12)))
}

/**
 * The canonical form of a valid table: responses scaled so the peak is 1, every number rounded to
 * 12 significant digits. Two tables that differ only in the scale of the response, in formatting
 * or in a header are the same curve and give the same canonical points.
 */
export function normalizeResponsivity(points: readonly (readonly [number, number])[]): ResponsivityPoint[] {
  const peak = Math.max(...points.map(p => p[1]))
  return points.map(([l, r]) => [Number(canonicalNumber(l)), Number(canonicalNumber(r / peak))])
}

/** The text that is hashed (SHA-256) to recognize a curve: one `λ,r` line per normalized point. */
export function canonicalResponsivityText(points: readonly (readonly [number, number])[]): string {
  return normalizeResponsivity(points).map(([l, r]) => `${canonicalNumber(l)},${canonicalNumber(r)}`).join('\n') + '\n'
}
