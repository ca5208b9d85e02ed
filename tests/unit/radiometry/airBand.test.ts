// Wavelengths in air (band.medium = 'air'): converted to vacuum by λ_vac = n·λ_air before computing.
import { describe, expect, it } from 'vitest'
import {
  bandRadiance,
  bandRadianceDerivative,
  EngineInputError,
  expectedReading,
  expectedReadingK,
  ITS_90,
  prepareBand,
  resolveConstants,
  STANDARD_AIR_REFRACTIVE_INDEX,
  temperatureFromRadiance,
  vacuumWavelengthFactor,
  type Band,
} from '../../../shared/radiometry'

const N = STANDARD_AIR_REFRACTIVE_INDEX
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b)

describe('bands stated in air', () => {
  it('the default n is that of standard air by Ciddor (1996) to 1e-5', () => {
    // Ciddor, Appl. Opt. 35:1566 (1996), standard air (dry, 15 °C, 101 325 Pa, 450 ppm CO2):
    // (n − 1)·1e8 = 5792105/(238.0185 − σ²) + 167917/(57.362 − σ²), σ in µm⁻¹ (coefficients as tabulated
    // by refractiveindex.info); evaluated here at 0.65 µm and 1.6 µm
    for (const lam of [0.65, 1.6]) {
      const s2 = 1 / lam ** 2
      const n = 1 + (5792105 / (238.0185 - s2) + 167917 / (57.362 - s2)) * 1e-8
      expect(Math.abs(N - n)).toBeLessThan(1e-5)
    }
  })

  it('an air band equals the vacuum band scaled by n (rectangular and tabulated)', () => {
    const air: Band = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14, medium: 'air' }
    const vac: Band = { kind: 'rectangular', lambda1Um: 8 * N, lambda2Um: 14 * N }
    const tAir: Band = { kind: 'tabulated', points: [[0.64, 0], [0.65, 1], [0.66, 0]], medium: 'air', refractiveIndex: 1.0003 }
    const tVac: Band = { kind: 'tabulated', points: [[0.64 * 1.0003, 0], [0.65 * 1.0003, 1], [0.66 * 1.0003, 0]] }
    for (const T of [300, 373.15, 1234.93]) {
      expect(rel(bandRadiance(air, T), bandRadiance(vac, T))).toBeLessThan(1e-13)
      expect(rel(bandRadianceDerivative(air, T), bandRadianceDerivative(vac, T))).toBeLessThan(1e-13)
      expect(rel(bandRadiance(tAir, T), bandRadiance(tVac, T))).toBeLessThan(1e-12)
      expect(rel(bandRadiance(air, T, 'ITS-90'), bandRadiance(vac, T, ITS_90))).toBeLessThan(1e-13)
    }
    expect(prepareBand(air).lambda1Um).toBe(8 * N)
    expect(prepareBand(air).meanWavelengthUm).toBeCloseTo(11 * N, 12)
    const s = bandRadiance(vac, 400)
    expect(Math.abs(temperatureFromRadiance(air, s) - 400)).toBeLessThan(1e-6)
    const reading = (band: Band): number =>
      expectedReadingK({ band, sourceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 1 })
    expect(Math.abs(reading(air) - reading(vac))).toBeLessThan(1e-9)
    // and the vacuum band is not the same as the air band stated as if in vacuum
    expect(Math.abs(reading(air) - reading({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }))).toBeGreaterThan(1e-5)
  })

  it('medium vacuum (or none) changes nothing', () => {
    const a: Band = { kind: 'rectangular', lambda1Um: 3.8, lambda2Um: 4, medium: 'vacuum' }
    expect(bandRadiance(a, 500)).toBe(bandRadiance({ kind: 'rectangular', lambda1Um: 3.8, lambda2Um: 4 }, 500))
    expect(vacuumWavelengthFactor(a)).toBe(1)
    expect(vacuumWavelengthFactor({ kind: 'rectangular', lambda1Um: 3.8, lambda2Um: 4, medium: 'air' })).toBe(N)
  })

  it('rejects an unknown medium and a refractive index that is not that of air', () => {
    const field = (band: unknown): string => {
      try {
        bandRadiance(band as Band, 300)
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14, medium: 'water' })).toBe('band.medium')
    expect(field({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14, medium: 'air', refractiveIndex: 0.99 })).toBe('band.refractiveIndex')
    expect(field({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14, medium: 'air', refractiveIndex: 1.5 })).toBe('band.refractiveIndex')
    expect(field({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14, refractiveIndex: 1.0003 })).toBe('band.refractiveIndex')
    expect(field({ kind: 'tabulated', points: [[1, 0], [2, 1]], medium: 'argon' })).toBe('band.medium')
  })
})

describe('constants stated and chosen', () => {
  it("a reading names the c2 used: CODATA 2018 by default, 0.014388 m·K for 'ITS-90'", () => {
    const input = { band: { kind: 'rectangular', lambda1Um: 0.645, lambda2Um: 0.655 } as Band, sourceTemperatureK: 1337.33, sourceEmissivity: 1, reflectedTemperatureK: 296, instrumentTemperatureK: 296, emissivitySetting: 1 }
    // CODATA 2018: c2 = 1.438776877e-2 m·K; ITS-90 (Preston-Thomas 1990, section 3.3): c2 = 0.014388 m·K
    expect(expectedReading(input).constants.id).toBe('CODATA-2018')
    expect(rel(expectedReading(input).constants.c2, 1.438776877e-2)).toBeLessThan(1e-9)
    expect(expectedReading({ ...input, constants: 'ITS-90' }).constants).toEqual({ id: 'ITS-90', c2: 0.014388 })
    // the choice changes the result: ITS-90's c2 is 1.9e-6 relative larger than CODATA 2018's
    expect(expectedReading({ ...input, constants: 'ITS-90', sourceEmissivity: 0.9 }).expectedReadingK).not.toBe(expectedReading({ ...input, sourceEmissivity: 0.9 }).expectedReadingK)
    expect(() => expectedReading({ ...input, constants: 'CODATA-2022' as never })).toThrow(EngineInputError)
    // an unknown constants id must be rejected, naming the field
    expect(() => expectedReading({ ...input, constants: 'IPTS-68' as never })).toThrow(expect.objectContaining({ field: 'constants' }))
    expect(resolveConstants('ITS-90').c2).toBe(0.014388)
  })
})

describe('band radiance of a band in air, through the public functions', () => {
  it('bandRadiance and bandRadianceDerivative convert air wavelengths to vacuum (λ_vac = n·λ_air)', () => {
    // Definition of the conversion (the band's own documentation); n = 1.00028 for standard air.
    const n = 1.00028
    const air = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14, medium: 'air' } as const
    const vac = { kind: 'rectangular', lambda1Um: 8 * n, lambda2Um: 14 * n } as const
    expect(Math.abs(bandRadiance(air, 373.15) / bandRadiance(vac, 373.15) - 1)).toBeLessThan(1e-14)
    expect(Math.abs(bandRadianceDerivative(air, 373.15) / bandRadianceDerivative(vac, 373.15) - 1)).toBeLessThan(1e-14)
    expect(Math.abs(bandRadiance(air, 373.15) / bandRadiance({ kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 }, 373.15) - 1)).toBeGreaterThan(1e-5)
  })
})
