// Quantities as people type them (shared/quantities.ts), converted with mathjs.
// Sources of the expected values:
//  - SI Brochure, 9th edition (BIPM 2019), §2.3.1: t/°C = T/K − 273.15 (exact; ITS-90 uses the same relation).
//  - NIST SP 811 (2008 edition), Appendix B: T/K = (t/°F + 459.67)/1.8, i.e. t/°F = T/K · 9/5 − 459.67 (exact);
//    a temperature interval of 1 °F = 5/9 K. (Appendix numbering from memory.)
//  - SI Brochure, 9th edition, Table 7 (SI prefixes): micro = 10⁻⁶, nano = 10⁻⁹, milli = 10⁻³ (exact).
//  - International yard and pound agreement (1959): 1 in = 25.4 mm exactly.
import { describe, expect, it } from 'vitest'
import { convertQuantity, formatNumber, hasUnit, parseQuantity, QuantityError, splitQuantity } from '../../shared/quantities'

const close = (a: number, b: number, tol = 1e-9) => expect(Math.abs(a - b)).toBeLessThan(tol)

function problem(fn: () => unknown): { problem: string, message: string } {
  try {
    fn()
  }
  catch (err) {
    expect(err).toBeInstanceOf(QuantityError)
    return { problem: (err as QuantityError).problem, message: (err as QuantityError).message }
  }
  throw new Error('expected a QuantityError')
}

describe('temperatures (SI Brochure §2.3.1; NIST SP 811 App. B)', () => {
  it('0 °C = 273.15 K, and back', () => {
    close(parseQuantity('0 °C', 'temperature', '°C', 'K'), 273.15)
    close(convertQuantity(273.15, 'temperature', 'K', '°C'), 0)
  })
  it('°F = K·9/5 − 459.67: 32 °F = 273.15 K, 212 °F = 373.15 K, 77 °F = 298.15 K', () => {
    close(parseQuantity('32 °F', 'temperature', '°C', 'K'), 273.15)
    close(parseQuantity('212 °F', 'temperature', '°C', 'K'), 373.15)
    close(parseQuantity('77 °F', 'temperature', '°C', 'K'), 298.15)
    close(convertQuantity(0, 'temperature', 'K', '°F'), -459.67)
  })
  it('−40 °C = −40 °F (the scales cross there, from the two definitions)', () => {
    close(convertQuantity(-40, 'temperature', '°C', '°F'), -40)
  })
  it('reads a bare number in the box\'s unit and a typed unit as written', () => {
    close(parseQuantity('25', 'temperature', '°C', 'K'), 298.15)
    close(parseQuantity('298.15 K', 'temperature', '°C', 'K'), 298.15)
    close(parseQuantity('298.15 K', 'temperature', '°C'), 25)
    close(parseQuantity('25°C', 'temperature', 'K'), 298.15)
    close(parseQuantity('25 C', 'temperature', 'K'), 298.15)
  })
  it('a temperature difference converts by scale, without the offset: 1 K = 1 °C = 1.8 °F, 1 mK = 0.001 K', () => {
    close(convertQuantity(1, 'temperatureDifference', 'K', '°F'), 1.8)
    close(convertQuantity(1, 'temperatureDifference', '°C', 'K'), 1)
    close(parseQuantity('0.9 °F', 'temperatureDifference', 'K'), 0.5)
    close(parseQuantity('120 mK', 'temperatureDifference', 'K'), 0.12)
  })
})

describe('lengths and wavelengths (SI prefixes, Table 7; 1 in = 25.4 mm)', () => {
  it('1 µm = 1000 nm: 900 nm in a µm box is 0.9 µm', () => {
    close(parseQuantity('900 nm', 'wavelength', 'µm'), 0.9)
    close(convertQuantity(1, 'wavelength', 'µm', 'nm'), 1000)
    close(parseQuantity('0.65 um', 'wavelength', 'nm'), 650)
  })
  it('distances: 0.3 m = 300 mm, 1 in = 25.4 mm', () => {
    close(parseQuantity('0.3 m', 'length', 'mm'), 300)
    close(parseQuantity('1 in', 'length', 'mm'), 25.4)
    close(parseQuantity('30 cm', 'length', 'mm'), 300)
  })
})

describe('percentages and plain numbers', () => {
  it('"1.5 %" and "1.5" are both 1.5 %', () => {
    expect(parseQuantity('1.5 %', 'percent', '%')).toBe(1.5)
    expect(parseQuantity('1.5', 'percent', '%')).toBe(1.5)
  })
  it('a plain number takes no unit', () => {
    expect(parseQuantity('0.95', 'number', '')).toBe(0.95)
    expect(problem(() => parseQuantity('0.95 K', 'number', '')).message).toBe('a plain number expected, got K')
  })
})

describe('how people type numbers', () => {
  it('takes a Unicode minus, a decimal comma and an exponent', () => {
    expect(splitQuantity('−40 °C')).toEqual({ value: -40, unit: '°C' })
    expect(splitQuantity('0,95')).toEqual({ value: 0.95, unit: null })
    expect(splitQuantity('1e3 nm')).toEqual({ value: 1000, unit: 'nm' })
    expect(splitQuantity(' .5 ')).toEqual({ value: 0.5, unit: null })
  })
  it('knows whether a unit was typed', () => {
    expect(hasUnit('298.15 K')).toBe(true)
    expect(hasUnit('25')).toBe(false)
    expect(hasUnit('abc')).toBe(false)
  })
  it('formats a number for a box without float noise', () => {
    expect(formatNumber(298.15000000000003)).toBe('298.15')
    expect(formatNumber(0.9000000000000001)).toBe('0.9')
    expect(formatNumber(Number.NaN)).toBe('')
  })
})

describe('refusals, in words', () => {
  it('a unit of the wrong kind: "°C expected, got m"', () => {
    expect(problem(() => parseQuantity('25 m', 'temperature', '°C', 'K'))).toEqual({ problem: 'wrong-unit', message: '°C expected, got m' })
    expect(problem(() => parseQuantity('8 K', 'wavelength', 'µm')).message).toBe('µm expected, got K')
    expect(problem(() => parseQuantity('5 K', 'percent', '%')).message).toBe('% expected, got K')
  })
  it('letters are not a number', () => {
    expect(problem(() => parseQuantity('abc', 'temperature', '°C'))).toEqual({ problem: 'not-a-number', message: '“abc” is not a number' })
    expect(problem(() => parseQuantity('1.2.3', 'length', 'mm')).problem).toBe('not-a-number')
    expect(problem(() => parseQuantity('', 'length', 'mm')).problem).toBe('empty')
  })
  it('an unknown unit names the units the box takes', () => {
    expect(problem(() => parseQuantity('25 zorks', 'temperature', '°C'))).toEqual({ problem: 'unknown-unit', message: '“zorks” is not a unit: use °C, K or °F' })
  })
  it('a conversion between kinds is refused', () => {
    expect(problem(() => convertQuantity(1, 'temperature', 'm', 'K')).problem).toBe('wrong-unit')
  })
})
