import { describe, expect, it } from 'vitest'
import {
  BOLTZMANN_K,
  C1L,
  C2,
  C2_ITS90,
  CODATA_2018,
  EngineInputError,
  ITS_90,
  PLANCK_H,
  resolveConstants,
  SPEED_OF_LIGHT_C,
  STEFAN_BOLTZMANN_SIGMA,
  WIEN_B,
  WIEN_X,
} from '../../../shared/radiometry'

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b)

describe('CODATA 2018 constants', () => {
  it('keeps the exact SI values of h, c, k', () => {
    // SI Brochure, 9th edition (2019), Table 1: defining constants
    expect(PLANCK_H).toBe(6.62607015e-34)
    expect(SPEED_OF_LIGHT_C).toBe(299792458)
    expect(BOLTZMANN_K).toBe(1.380649e-23)
  })

  it('derives c2 = hc/k = 1.438776877e-2 m·K', () => {
    // CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010): c2 = 1.438 776 877… × 10⁻² m K
    expect(rel(C2, 1.438776877e-2)).toBeLessThan(1e-9)
  })

  it('derives c1L = 2hc² = 1.191042972e-16 W·m²·sr⁻¹', () => {
    // CODATA 2018: first radiation constant for spectral radiance 1.191 042 972… × 10⁻¹⁶ W m² sr⁻¹
    expect(rel(C1L, 1.191042972e-16)).toBeLessThan(1e-9)
  })

  it('derives σ = 5.670374419e-8 W·m⁻²·K⁻⁴', () => {
    // CODATA 2018: Stefan–Boltzmann constant 5.670 374 419… × 10⁻⁸ W m⁻² K⁻⁴
    expect(rel(STEFAN_BOLTZMANN_SIGMA, 5.670374419e-8)).toBeLessThan(1e-9)
  })

  it('solves Wien x = 5(1 − e^−x) = 4.965114231744276 and b = c2/x = 2.897771955e-3 m·K', () => {
    // Wien's displacement constant: root 4.965114231744276… (= 5 + W0(−5e⁻⁵), standard value);
    // CODATA 2018 b = 2.897 771 955… × 10⁻³ m K
    expect(Math.abs(WIEN_X - 4.965114231744276)).toBeLessThan(1e-14)
    expect(Math.abs(WIEN_X - 5 * (1 - Math.exp(-WIEN_X)))).toBeLessThan(1e-14)
    expect(rel(WIEN_B, 2.897771955e-3)).toBeLessThan(1e-9)
  })
})

describe('constant sets', () => {
  it('ITS-90 fixes c2 = 0.014388 m·K', () => {
    // Preston-Thomas 1990, Metrologia 27:3, section 3.3
    expect(C2_ITS90).toBe(0.014388)
    expect(ITS_90.c2).toBe(0.014388)
    expect(ITS_90.c2UmK).toBeCloseTo(14388, 9)
  })

  it('resolves ids and objects, rejects unknown ids', () => {
    expect(resolveConstants()).toBe(CODATA_2018)
    expect(resolveConstants('CODATA-2018')).toBe(CODATA_2018)
    expect(resolveConstants('ITS-90')).toBe(ITS_90)
    expect(resolveConstants(ITS_90)).toBe(ITS_90)
    expect(() => resolveConstants('CODATA-2014' as never)).toThrow(EngineInputError)
    // an unknown id must throw: a RangeError naming the field `constants`
    expect(() => resolveConstants('IPTS-68' as never)).toThrow(RangeError)
    expect(() => resolveConstants('IPTS-68' as never)).toThrow(expect.objectContaining({ field: 'constants' }))
  })

  it('band coefficient times π⁴/15 equals σ/π for CODATA 2018', () => {
    // ∫₀^∞ t³/(eᵗ−1) dt = π⁴/15 (standard integral); σ/π from the independent formula 2π⁵k⁴/(15h³c²)
    expect(rel((CODATA_2018.bandCoefficient * Math.PI ** 4) / 15, STEFAN_BOLTZMANN_SIGMA / Math.PI)).toBeLessThan(1e-14)
  })
})
