// A list of temperatures typed in one box (composables/forms/values.ts): the calibration points of
// the terms and a check plan's nominal values. Conversions follow the SI Brochure (9th ed., §2.3.1:
// t/°C = T/K − 273.15) and NIST SP 811 App. B (t/°F = T/K · 9/5 − 459.67).
import { describe, expect, it } from 'vitest'
import { temperaturesFrom, temperaturesShown } from '../../../composables/forms/values'

describe('a list of temperatures in one box', () => {
  it('reads bare numbers in the user\'s unit and numbers with their own unit, separated by commas, semicolons or spaces', () => {
    const c = temperaturesFrom('0, 50; 100', 'C')
    expect(c).toHaveLength(3)
    ;[273.15, 323.15, 373.15].forEach((k, i) => expect(Math.abs(c[i]! - k)).toBeLessThan(1e-9))
    const mixed = temperaturesFrom('300 K 212 °F −40', 'C')
    // 212 °F = 373.15 K; −40 °C = 233.15 K
    expect(mixed).toHaveLength(3)
    expect(Math.abs(mixed[0]! - 300)).toBeLessThan(1e-9)
    expect(Math.abs(mixed[1]! - 373.15)).toBeLessThan(1e-9)
    expect(Math.abs(mixed[2]! - 233.15)).toBeLessThan(1e-9)
    const f = temperaturesFrom('32', 'F')
    expect(Math.abs(f[0]! - 273.15)).toBeLessThan(1e-9)
  })

  it('keeps what cannot be read as NaN, so the schema names the value', () => {
    const v = temperaturesFrom('50, fifty, 20 m', 'C')
    expect(v).toHaveLength(3)
    expect(Number.isNaN(v[1]!)).toBe(true)
    expect(Number.isNaN(v[2]!)).toBe(true)
    expect(temperaturesFrom(' ', 'C')).toEqual([])
  })

  it('shows stored kelvin values back in the user\'s unit', () => {
    expect(temperaturesShown([273.15, 373.15], 'C')).toBe('0, 100')
    expect(temperaturesShown([273.15], 'K')).toBe('273.15')
    expect(temperaturesShown([373.15], 'F')).toBe('212')
  })
})
