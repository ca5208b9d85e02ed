// CSV cells safe for spreadsheets (OWASP "CSV Injection": prefix cells starting with = + - @ tab CR
// with a single quote), and the import helpers: line numbers, typed cells, row validation.
import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import { csvCell, escapeFormula, unescapeFormula } from '../../../shared/csv'
import { cellsToInput, checkCsvRows, csvFromRows, CsvShapeError, markDuplicates, readCsvRecords } from '../../../server/utils/csv'

describe('formula escaping', () => {
  it('prefixes cells that a spreadsheet would run', () => {
    for (const s of ['=1+1', '+SUM(A1)', '-2+3', '@cmd', '\tx', '\rx', '=HYPERLINK("http://x.example")']) expect(escapeFormula(s)).toBe(`'${s}`)
  })
  it('leaves plain numbers and ordinary text alone', () => {
    for (const s of ['-40', '+3', '-1e-3', '-0.5', '12', 'Calderon Optics', 'a=b', '']) expect(escapeFormula(s)).toBe(s)
    expect(csvCell(-40)).toBe('-40')
    expect(csvCell(0.95)).toBe('0.95')
    expect(csvCell(null)).toBe('')
    expect(csvCell(true)).toBe('true')
    expect(csvCell({ kind: 'absolute', b: 2 })).toBe('{"kind":"absolute","b":2}')
    expect(csvCell(Number.NaN)).toBe('')
  })
  it('import undoes the escape so export → import gives the original text', () => {
    for (const s of ['=1+1', '-x', '@a', 'plain', '-12', '\'quoted']) expect(unescapeFormula(escapeFormula(s))).toBe(s)
    expect(unescapeFormula('\'quoted')).toBe('\'quoted')
  })
})

describe('CSV import helpers', () => {
  const columns = { name: 'text', n: 'number', k: 'integer', on: 'boolean', when: 'date', tags: 'list', spec: 'json' } as const

  it('numbers records by the line they start on, across blank lines and quoted line breaks', () => {
    const csv = 'name,n\r\nfirst,1\r\n\r\n"multi\r\nline",2\r\nlast,3\r\n'
    expect(readCsvRecords(csv, columns).map(r => [r.line, r.cells.name])).toEqual([[2, 'first'], [4, 'multi\r\nline'], [6, 'last']])
  })
  it('ignores unknown columns, strips a BOM and undoes formula escapes', () => {
    const recs = readCsvRecords('\uFEFFname,unknown,n\n\'=x,zzz,-5\n', columns)
    expect(recs).toEqual([{ line: 2, cells: { name: '=x', n: '-5' } }])
  })
  it('refuses a file without a known column', () => {
    expect(() => readCsvRecords('foo,bar\n1,2', columns)).toThrow(CsvShapeError)
    expect(() => readCsvRecords('', columns)).toThrow(CsvShapeError)
  })
  it('types cells and names the field of each conversion error', () => {
    const ok = cellsToInput({ name: 'A', n: '-1.5e2', k: '12', on: 'yes', when: '2026-12-01', tags: 'a; b;', spec: '{"a":1}' }, columns)
    expect(ok).toEqual({ input: { name: 'A', n: -150, k: 12, on: true, when: '2026-12-01', tags: ['a', 'b'], spec: { a: 1 } }, errors: {} })
    const bad = cellsToInput({ n: '1,5', k: '1.5', on: 'maybe', when: '2026-02-30', spec: '{' }, columns)
    expect(Object.keys(bad.errors).sort()).toEqual(['k', 'n', 'on', 'spec', 'when'])
  })
  it('validates rows with a schema and flags repeats', () => {
    const schema = z.object({ name: z.string().min(2), n: z.number().positive() })
    const rows = checkCsvRows('name,n\nAlpha,1\nB,2\nAlpha,-3\nalpha,4\n', { name: 'text', n: 'number' }, schema)
    expect(rows.map(r => Object.keys(r.errors))).toEqual([[], ['name'], ['n'], []])
    markDuplicates(rows, v => v.name, 'name')
    expect(rows[3]!.errors.name).toBe('Repeats line 2')
    expect(rows[3]!.value).toBeNull()
  })
  it('writes CSV with escaped cells and quoted separators', () => {
    const text = csvFromRows(['a', 'b'], [{ a: '=cmd', b: 'x,y' }, { a: -3, b: null }])
    expect(text).toBe('a,b\r\n\'=cmd,"x,y"\r\n-3,')
  })
})
