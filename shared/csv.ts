/**
 * Spreadsheet-safe CSV cells. A cell that begins with `=`, `+`, `-`, `@`, a tab or a carriage
 * return may be run as a formula when the file is opened in a spreadsheet; the OWASP "CSV
 * Injection" guidance is to prefix such cells with a single quote so they are shown as text.
 * Plain numbers (`-12.5`, `+3`, `-1e-3`) are left alone so they stay numbers.
 */

const FORMULA_START = /^[=+\-@\t\r]/
const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/

/**
 * The text of a cell for export: `''` for null/undefined, numbers and booleans as written,
 * objects and arrays as JSON, strings that could start a formula prefixed with `'`.
 *
 * @example csvCell('=1+1')  // "'=1+1"
 * @example csvCell(-40)     // '-40'
 * @example csvCell('-40')   // '-40' (a plain number stays a number)
 * @example csvCell('-x')    // "'-x"
 */
export function csvCell(value: unknown): string {
  if (value === null || value === undefined) return ''
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : ''
  if (typeof value === 'boolean') return value ? 'true' : 'false'
  const text = typeof value === 'string' ? value : JSON.stringify(value)
  return escapeFormula(text)
}

/** Prefix `'` to a text that a spreadsheet would run as a formula; plain numbers pass unchanged. */
export function escapeFormula(text: string): string {
  if (!FORMULA_START.test(text)) return text
  if (PLAIN_NUMBER.test(text)) return text
  return `'${text}`
}

/**
 * Undo `escapeFormula` on import, so that export → import gives back the same text:
 * a leading `'` is removed only when what follows would have been escaped.
 *
 * @example unescapeFormula("'=1+1") // '=1+1'
 * @example unescapeFormula("'quoted") // "'quoted" (never escaped, kept)
 */
export function unescapeFormula(text: string): string {
  if (text.startsWith('\'') && FORMULA_START.test(text.slice(1)) && !PLAIN_NUMBER.test(text.slice(1))) return text.slice(1)
  return text
}
