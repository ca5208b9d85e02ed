// Responsivity tables: reading, checking and the canonical form used to recognize the same curve.
// The tables are invented.
import { describe, expect, it } from 'vitest'
import { canonicalResponsivityText, normalizeResponsivity, parseResponsivityCsv, responsivityProblem } from '../../../shared/registers/responsivity'

describe('parseResponsivityCsv', () => {
  it('reads a table with or without a header, skipping blank lines', () => {
    expect(parseResponsivityCsv('wavelengthUm,response\n8,0.2\n\n14,0.3\n')).toEqual({ ok: true, points: [[8, 0.2], [14, 0.3]] })
    expect(parseResponsivityCsv('8;0.2\n9;0.5\n10;0.1')).toEqual({ ok: true, points: [[8, 0.2], [9, 0.5], [10, 0.1]] })
  })
  it('refuses fewer than 2 points, non-numbers, non-increasing or non-positive wavelengths, negative or all-zero responses', () => {
    expect(parseResponsivityCsv('8,0.2')).toMatchObject({ ok: false, message: expect.stringMatching(/at least 2/) })
    expect(parseResponsivityCsv('l,r\n8,0.2\nnine,0.3')).toMatchObject({ ok: false, message: expect.stringMatching(/Row 3.*not a number/) })
    expect(parseResponsivityCsv('8,0.2\n8,0.3')).toMatchObject({ ok: false, message: expect.stringMatching(/increase strictly/) })
    expect(parseResponsivityCsv('9,0.2\n8,0.3')).toMatchObject({ ok: false, message: expect.stringMatching(/increase strictly/) })
    expect(parseResponsivityCsv('0,0.2\n8,0.3')).toMatchObject({ ok: false, message: expect.stringMatching(/above 0/) })
    expect(parseResponsivityCsv('8,-0.2\n9,0.3')).toMatchObject({ ok: false, message: expect.stringMatching(/0 or more/) })
    expect(parseResponsivityCsv('8,0\n9,0')).toMatchObject({ ok: false, message: expect.stringMatching(/all zero/) })
    expect(parseResponsivityCsv('')).toMatchObject({ ok: false })
  })
  it('responsivityProblem refuses NaN and infinities', () => {
    expect(responsivityProblem([[8, Number.NaN], [9, 1]])).toMatch(/0 or more/)
    expect(responsivityProblem([[8, 1], [Number.POSITIVE_INFINITY, 1]])).toMatch(/above 0/)
  })
})

describe('canonical form', () => {
  it('scales the peak to 1', () => {
    expect(normalizeResponsivity([[8, 0.5], [9, 2], [10, 1]])).toEqual([[8, 0.25], [9, 1], [10, 0.5]])
  })
  it('gives the same text for the same curve in another scale or format, and another text for another curve', () => {
    const a = canonicalResponsivityText([[8, 0.5], [9, 2], [10, 1]])
    const b = canonicalResponsivityText([[8.0, 25], [9.0, 100], [10.0, 50]])
    const c = canonicalResponsivityText([[8, 0.5], [9, 2], [10, 1.1]])
    expect(a).toBe(b)
    expect(a).not.toBe(c)
    expect(a).toBe('8,0.25\n9,1\n10,0.5\n')
  })
})
