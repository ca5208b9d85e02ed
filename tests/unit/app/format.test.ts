// Numbers as the certificate writes them: Celsius from kelvin by the ITS-90 definition, decimal
// rounding (half away from zero, as a person rounds on paper) and the typographic minus.
import { describe, expect, it } from 'vitest'
import { celsiusFixed, formatFixed, kelvinFixed, kelvinToCelsius, kelvinToCelsiusText, typographicMinus } from '../../../shared/format'

describe('kelvinToCelsius', () => {
  // ITS-90 (BIPM, "Supplementary Information for the ITS-90"): t90/°C = T90/K − 273.15.
  it('is exact at the values people type: 255.35 K is −17.8 °C, not −17.799999999999983', () => {
    expect(255.35 - 273.15).not.toBe(-17.8) // the binary difference the function avoids
    expect(373.1 - 273.15).not.toBe(99.95)
    expect(kelvinToCelsius(373.1)).toBe(99.95)
    expect(kelvinToCelsius(373.15)).toBe(100)
    expect(kelvinToCelsius(273.15)).toBe(0)
    expect(kelvinToCelsius(255.35)).toBe(-17.8)
    expect(kelvinToCelsius(0)).toBe(-273.15)
  })
  it('writes text with up to the given decimals and a typographic minus', () => {
    expect(kelvinToCelsiusText(373.15)).toBe('100 °C')
    expect(kelvinToCelsiusText(254.65)).toBe('\u221218.5 °C')
    expect(kelvinToCelsiusText(300.123456, 3)).toBe('26.973 °C')
  })
})

describe('formatFixed: decimal rounding, half away from zero (common practice for reported values; ISO 80000-1 annex B rule B)', () => {
  it('rounds the decimal value written, not its binary expansion', () => {
    // 99.95 is stored as 99.9500000000000028…, 1.005 as 1.00499999999999989…; on paper they round up.
    expect((1.005).toFixed(2)).toBe('1.00') // what binary rounding gives
    expect(formatFixed(1.005, 2)).toBe('1.01')
    expect(formatFixed(99.95, 1)).toBe('100.0')
    expect(formatFixed(0.15, 1)).toBe('0.2')
    expect(formatFixed(2.675, 2)).toBe('2.68')
  })
  it('keeps the sign on negative values, and a rounded zero carries none', () => {
    expect(formatFixed(-0.15, 1)).toBe('-0.2')
    expect(formatFixed(-0.04, 1)).toBe('0.0')
    expect(formatFixed(-12.345, 2)).toBe('-12.35')
  })
  it('pads and handles small, large and whole values', () => {
    expect(formatFixed(3, 2)).toBe('3.00')
    expect(formatFixed(0.000123, 5)).toBe('0.00012')
    expect(formatFixed(1234567.891, 1)).toBe('1234567.9')
    expect(formatFixed(9.96, 1)).toBe('10.0')
    expect(formatFixed(0.5, 0)).toBe('1')
  })
})

describe('celsiusFixed and typographicMinus', () => {
  it('converts then rounds in decimal: 373.10 K is 99.95 °C and its 0.1 °C rounding is 100.0 °C', () => {
    expect(celsiusFixed(373.1, 2)).toBe('99.95')
    expect(celsiusFixed(373.1, 1)).toBe('100.0')
    expect(celsiusFixed(253.15, 1)).toBe('\u221220.0')
  })
  it('replaces a hyphen-minus only where it is a sign', () => {
    expect(typographicMinus('-0.4 to -1.2 (-3)')).toBe('\u22120.4 to \u22121.2 (\u22123)')
    expect(typographicMinus('8-14 µm, BL-2026-00042, ±-1')).toBe('8-14 µm, BL-2026-00042, ±\u22121')
  })
})

describe('kelvinFixed: kelvin text rounded as the certificate rounds Celsius (for the DCC)', () => {
  // ITS-90: T90/K = t90/°C + 273.15 exactly, so the kelvin text is the printed Celsius text plus 273.15.
  it('adds 273.15 in decimal to the Celsius digits celsiusFixed prints', () => {
    expect(kelvinFixed(373.15, 2)).toBe('373.15')
    expect(kelvinFixed(296.15, 1)).toBe('296.15') // 23.0 °C printed → 296.15 K (273.15 has two decimals)
    expect(kelvinFixed(373.1, 1)).toBe('373.15') // 99.95 °C prints as 100.0 °C: the kelvin text follows it
    expect(kelvinFixed(263.149, 2)).toBe('263.15') // −10.001 °C prints as −10.00 °C
    expect(kelvinFixed(373.1549, 3)).toBe('373.155')
  })
  it('is the printed Celsius value plus 273.15 for every value of a sweep (both texts read back as numbers)', () => {
    for (let k = 200; k < 1800; k += 0.731) {
      for (const d of [1, 2, 3]) {
        const c = Number(celsiusFixed(k, d).replace('\u2212', '-'))
        expect(Math.abs(Number(kelvinFixed(k, d)) - (c + 273.15)), `${k} K, ${d} decimals`).toBeLessThan(1e-9)
        expect(kelvinFixed(k, d).split('.')[1]!.length).toBe(Math.max(d, 2))
      }
    }
  })
})
