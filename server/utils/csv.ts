/**
 * CSV export and import for the registers (papaparse). Columns are named by the DTO fields
 * (camelCase), so a file exported here imports again. Export escapes cells a spreadsheet would
 * run as formulas (shared/csv.ts); import reads each row into typed input, validates it with
 * the register's zod schema and reports errors by line and field.
 */
import { createError, setResponseHeader, type H3Event } from 'h3'
import Papa from 'papaparse'
import type { z } from 'zod'
import { csvCell, unescapeFormula } from '#shared/csv'
import { isDateOnly } from '#shared/registers/dates'
import { fieldErrors } from '#shared/schemas/errors'
import type { ImportPreview, ImportPreviewRow } from '#shared/types'

/** How a column's text becomes a value: `list` is `a; b; c`, `json` is a JSON cell. */
export type CsvKind = 'text' | 'number' | 'integer' | 'boolean' | 'json' | 'date' | 'list'
export type CsvColumns = Record<string, CsvKind>

/** Most rows one import may hold. */
export const MAX_IMPORT_ROWS = 20_000

/** A structural problem with the file (no header, no known column, too many rows): a 400 on `csv`. */
export class CsvShapeError extends Error {}

// ---------------------------------------------------------------- export

/** The CSV text of `rows` with the given columns, each cell escaped against formula injection. */
export function csvFromRows(columns: readonly string[], rows: readonly Record<string, unknown>[]): string {
  const data = rows.map(r => columns.map(c => csvCell(r[c])))
  return Papa.unparse({ fields: [...columns], data }, { newline: '\r\n', quotes: false, escapeFormulae: false })
}

/** Send a CSV download: `text/csv`, `attachment; filename="<base>-YYYY-MM-DD.csv"`, a UTF-8 BOM for spreadsheets. */
export function sendCsv(event: H3Event, base: string, csv: string): string {
  const name = `${base.replace(/[^a-z0-9-]/gi, '')}-${new Date().toISOString().slice(0, 10)}.csv`
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${name}"`)
  setResponseHeader(event, 'x-content-type-options', 'nosniff')
  setResponseHeader(event, 'cache-control', 'no-store')
  return '\uFEFF' + csv
}

// ---------------------------------------------------------------- import

export interface CsvRecord {
  /** Line of the file where the record starts (the header is line 1 when it is the first line). */
  line: number
  /** Known columns only, formula escapes undone, trimmed. */
  cells: Record<string, string>
}

/**
 * Split CSV text into records keyed by the header's known column names. Unknown columns are
 * ignored (so an export's read-only columns — id, dueDate, pastDue … — import harmlessly).
 * @throws CsvShapeError when there is no header, no known column or too many rows
 */
export function readCsvRecords(text: string, columns: CsvColumns): CsvRecord[] {
  const csv = text.replace(/^\uFEFF/, '')
  const records: CsvRecord[] = []
  let header: string[] | null = null
  let lastCursor = 0
  let line = 1
  let tooMany = false
  Papa.parse<string[]>(csv, {
    skipEmptyLines: 'greedy',
    step: (result, parser) => {
      // Line of this record: count the newlines between the previous record's end and this one's start.
      const end = result.meta.cursor
      const chunk = csv.slice(lastCursor, end)
      let startLine = line
      let i = 0
      while (i < chunk.length && (chunk[i] === '\r' || chunk[i] === '\n')) {
        if (chunk[i] === '\n') startLine++
        i++
      }
      for (let j = 0; j < chunk.length; j++) if (chunk[j] === '\n') line++
      lastCursor = end
      const row = result.data
      if (!header) {
        header = row.map(h => h.trim())
        return
      }
      if (records.length >= MAX_IMPORT_ROWS) {
        tooMany = true
        parser.abort()
        return
      }
      const cells: Record<string, string> = {}
      header.forEach((name, k) => {
        if (name in columns && row[k] !== undefined) cells[name] = unescapeFormula(row[k]!.trim())
      })
      records.push({ line: startLine, cells })
    },
  })
  if (tooMany) throw new CsvShapeError(`At most ${MAX_IMPORT_ROWS} rows per import`)
  if (!header) throw new CsvShapeError('The file has no header row')
  const known = (header as string[]).filter(h => h in columns)
  if (!known.length) throw new CsvShapeError(`No known column; expected some of: ${Object.keys(columns).join(', ')}`)
  return records
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/

/** Turn a record's cells into typed input for the schema; an empty cell is left out (the schema's default applies). */
export function cellsToInput(cells: Record<string, string>, columns: CsvColumns): { input: Record<string, unknown>, errors: Record<string, string> } {
  const input: Record<string, unknown> = {}
  const errors: Record<string, string> = {}
  for (const [name, kind] of Object.entries(columns)) {
    const raw = cells[name]
    if (raw === undefined || raw === '') continue
    switch (kind) {
      case 'text':
        input[name] = raw
        break
      case 'number':
      case 'integer':
        if (!NUMBER.test(raw)) errors[name] = `"${raw.slice(0, 40)}" is not a number`
        else if (kind === 'integer' && !Number.isInteger(Number(raw))) errors[name] = 'Must be a whole number'
        else input[name] = Number(raw)
        break
      case 'boolean': {
        const v = raw.toLowerCase()
        if (['true', 'yes', '1'].includes(v)) input[name] = true
        else if (['false', 'no', '0'].includes(v)) input[name] = false
        else errors[name] = 'Write true or false'
        break
      }
      case 'date':
        if (!isDateOnly(raw)) errors[name] = 'Use a real date written YYYY-MM-DD'
        else input[name] = raw
        break
      case 'list':
        input[name] = raw.split(/[;\n]/).map(s => s.trim()).filter(Boolean)
        break
      case 'json':
        try {
          input[name] = JSON.parse(raw)
        }
        catch {
          errors[name] = 'Not valid JSON'
        }
        break
    }
  }
  return { input, errors }
}

/** A validated row: `value` is the schema's output when the row has no errors. */
export interface CheckedRow<T> extends ImportPreviewRow {
  value: T | null
}

/** Read and validate every row; `errors` maps field → message (schema and conversion errors). */
export function checkCsvRows<S extends z.ZodType>(text: string, columns: CsvColumns, schema: S): CheckedRow<z.output<S>>[] {
  return readCsvRecords(text, columns).map((rec) => {
    const { input, errors } = cellsToInput(rec.cells, columns)
    const parsed = schema.safeParse(input)
    const all = { ...(parsed.success ? {} : fieldErrors(parsed.error)), ...errors }
    const ok = parsed.success && Object.keys(errors).length === 0
    return { line: rec.line, data: ok ? (parsed.data as Record<string, unknown>) : rec.cells, errors: all, value: ok ? parsed.data : null }
  })
}

/** Mark a row bad on a field (after a database check), dropping its value. */
export function rowError<T>(row: CheckedRow<T>, field: string, message: string): void {
  row.errors[field] ??= message
  row.value = null
}

/** Report rows whose `key` repeats an earlier row's (case-insensitive), on `field`. */
export function markDuplicates<T>(rows: CheckedRow<T>[], key: (v: T) => string | null, field: string): void {
  const seen = new Map<string, number>()
  for (const row of rows) {
    if (!row.value) continue
    const k = key(row.value)?.toLowerCase()
    if (!k) continue
    const first = seen.get(k)
    if (first !== undefined) rowError(row, field, `Repeats line ${first}`)
    else seen.set(k, row.line)
  }
}

export function previewOf<T>(rows: readonly CheckedRow<T>[]): ImportPreview {
  const out = rows.map(({ line, data, errors }) => ({ line, data, errors }))
  const invalid = out.filter(r => Object.keys(r.errors).length > 0).length
  return { rows: out, valid: out.length - invalid, invalid }
}

/** Run `fn` and turn a CsvShapeError into a 400 naming `csv`. */
export function withCsvShape<T>(fn: () => T): T {
  try {
    return fn()
  }
  catch (err) {
    if (err instanceof CsvShapeError) {
      throw createError({ statusCode: 400, statusMessage: 'Validation Error', message: `Invalid input: csv: ${err.message}`, data: { fields: { csv: err.message } } })
    }
    throw err
  }
}

/** For `commit: true`: 400 with every row's errors unless all rows are good (nothing is created). */
export function refuseUnlessAllValid<T>(rows: readonly CheckedRow<T>[]): T[] {
  const preview = previewOf(rows)
  if (rows.length === 0) {
    throw createError({ statusCode: 400, statusMessage: 'Validation Error', message: 'Invalid input: csv: The file has no data rows', data: { fields: { csv: 'The file has no data rows' } } })
  }
  if (preview.invalid > 0) {
    const message = `${preview.invalid} of ${rows.length} rows have errors; nothing was imported`
    throw createError({
      statusCode: 400,
      statusMessage: 'Validation Error',
      message: `Invalid input: csv: ${message}`,
      data: { fields: { csv: message }, rows: preview.rows.filter(r => Object.keys(r.errors).length), valid: preview.valid, invalid: preview.invalid },
    })
  }
  return rows.map(r => r.value as T)
}
