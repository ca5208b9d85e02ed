// Radiance-temperature basis (domain notes §7): the surface temperature behind a radiance temperature
// and the reading it implies in another band, against an independent scipy computation and central
// differences.
import { describe, expect, it } from 'vitest'
import {
  EngineInputError,
  expectedReadingFromRadianceTemperature,
  expectedReadingFromRadianceTemperatureK,
  expectedReadingK,
  radianceTemperatureReadingModel,
  surfaceTemperatureFromRadianceTemperature,
  type Band,
  type RadianceTemperatureReadingInput,
} from '../../../shared/radiometry'

const BANDS: Record<string, Band> = {
  LW: { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 },
  B22: { kind: 'rectangular', lambda1Um: 2.0, lambda2Um: 2.4 },
  B39: { kind: 'rectangular', lambda1Um: 3.8, lambda2Um: 4.0 },
}

// Reference values: tests/reference/radiance_temperature.py (scipy 1.17): band radiance by
// scipy.integrate.quad (epsabs = 0, epsrel = 1e-13) of Planck's law with CODATA 2018 constants,
// temperatures by scipy.optimize.brentq (xtol = 1e-13) on ln S. Pasted from its output.
// [b0, b, T_rad K, eps_s, T_w0 K, T_w K, T_d K, eps_i, T_s K, T_meas K]
const SCIPY: [string, string, number, number, number, number, number, number, number, number][] = [
  ['LW', 'LW', 273.15, 0.95, 296.15, 293.15, 298.15, 1.0, 271.7673218771496, 272.9621945174772],
  ['LW', 'LW', 323.15, 0.95, 296.15, 293.15, 298.15, 1.0, 324.4194417564141, 323.0322521875502],
  ['LW', 'LW', 373.15, 0.95, 296.15, 293.15, 298.15, 1.0, 376.32558363871374, 373.06440326678205],
  ['LW', 'LW', 523.15, 0.95, 296.15, 293.15, 298.15, 1.0, 531.3760024562891, 523.0990778515778],
  ['LW', 'LW', 773.15, 0.95, 296.15, 293.15, 298.15, 1.0, 790.5976517574428, 773.1132118596355],
  ['LW', 'LW', 273.15, 0.98, 296.15, 293.15, 298.15, 1.0, 272.61645203793125, 273.0749259824973],
  ['LW', 'LW', 323.15, 0.98, 296.15, 293.15, 298.15, 1.0, 323.64368200376566, 323.10291353389476],
  ['LW', 'LW', 373.15, 0.98, 296.15, 293.15, 298.15, 1.0, 374.3876606102226, 373.11576598445725],
  ['LW', 'LW', 523.15, 0.98, 296.15, 293.15, 298.15, 1.0, 526.356996358281, 523.1296318241425],
  ['LW', 'LW', 773.15, 0.98, 296.15, 293.15, 298.15, 1.0, 779.941484547824, 773.1352848644136],
  ['LW', 'LW', 273.15, 0.95, 296.15, 293.15, 298.15, 0.95, 271.7673218771496, 271.4290991891968],
  ['LW', 'LW', 323.15, 0.95, 296.15, 293.15, 298.15, 0.95, 324.4194417564141, 324.21282560344133],
  ['LW', 'LW', 373.15, 0.95, 296.15, 293.15, 298.15, 0.95, 376.32558363871374, 376.1764724069626],
  ['LW', 'LW', 523.15, 0.95, 296.15, 293.15, 298.15, 0.95, 531.3760024562891, 531.2873927895499],
  ['LW', 'LW', 773.15, 0.95, 296.15, 293.15, 298.15, 0.95, 790.5976517574428, 790.5333084557255],
  ['LW', 'LW', 273.15, 0.98, 296.15, 293.15, 298.15, 0.95, 272.61645203793125, 271.5498622328004],
  ['LW', 'LW', 323.15, 0.98, 296.15, 293.15, 298.15, 0.95, 323.64368200376566, 324.2865427512759],
  ['LW', 'LW', 373.15, 0.98, 296.15, 293.15, 298.15, 0.95, 374.3876606102226, 376.2296594072402],
  ['LW', 'LW', 523.15, 0.98, 296.15, 293.15, 298.15, 0.95, 526.356996358281, 531.3189932784242],
  ['LW', 'LW', 773.15, 0.98, 296.15, 293.15, 298.15, 0.95, 779.941484547824, 790.5562538873214],
  ['LW', 'B22', 273.15, 0.95, 296.15, 293.15, 298.15, 0.95, 271.7673218771496, 270.22543744867653],
  ['LW', 'B22', 323.15, 0.95, 296.15, 293.15, 298.15, 0.95, 324.4194417564141, 324.3716354007768],
  ['LW', 'B22', 373.15, 0.95, 296.15, 293.15, 298.15, 0.95, 376.32558363871374, 376.3212695736243],
  ['LW', 'B22', 523.15, 0.95, 296.15, 293.15, 298.15, 0.95, 531.3760024562891, 531.3759426833859],
  ['LW', 'B22', 773.15, 0.95, 296.15, 293.15, 298.15, 0.95, 790.5976517574428, 790.5976493344041],
  ['LW', 'B22', 273.15, 0.98, 296.15, 293.15, 298.15, 0.95, 272.61645203793125, 269.37170981771897],
  ['LW', 'B22', 323.15, 0.98, 296.15, 293.15, 298.15, 0.95, 323.64368200376566, 324.0438734663366],
  ['LW', 'B22', 373.15, 0.98, 296.15, 293.15, 298.15, 0.95, 374.3876606102226, 375.0636730851776],
  ['LW', 'B22', 523.15, 0.98, 296.15, 293.15, 298.15, 0.95, 526.356996358281, 527.6998205774411],
  ['LW', 'B22', 773.15, 0.98, 296.15, 293.15, 298.15, 0.95, 779.941484547824, 782.8623665319533],
  ['LW', 'B39', 273.15, 0.95, 296.15, 293.15, 298.15, 1.0, 271.7673218771496, 273.4015027293408],
  ['LW', 'B39', 323.15, 0.95, 296.15, 293.15, 298.15, 1.0, 324.4194417564141, 323.4017680354662],
  ['LW', 'B39', 373.15, 0.95, 296.15, 293.15, 298.15, 1.0, 376.32558363871374, 374.4894288933058],
  ['LW', 'B39', 523.15, 0.95, 296.15, 293.15, 298.15, 1.0, 531.3760024562891, 527.4958782565295],
  ['LW', 'B39', 773.15, 0.95, 296.15, 293.15, 298.15, 1.0, 790.5976517574428, 782.0851479414931],
  ['LW', 'B39', 273.15, 0.98, 296.15, 293.15, 298.15, 1.0, 272.61645203793125, 273.24428125869446],
  ['LW', 'B39', 323.15, 0.98, 296.15, 293.15, 298.15, 1.0, 323.64368200376566, 323.2468534566129],
  ['LW', 'B39', 373.15, 0.98, 296.15, 293.15, 298.15, 1.0, 374.3876606102226, 373.6715400796853],
  ['LW', 'B39', 523.15, 0.98, 296.15, 293.15, 298.15, 1.0, 526.356996358281, 524.8509706280262],
  ['LW', 'B39', 773.15, 0.98, 296.15, 293.15, 298.15, 1.0, 779.941484547824, 776.6554402903741],
  ['LW', 'B39', 273.15, 0.95, 296.15, 293.15, 298.15, 0.9, 271.7673218771496, 268.22653808940646],
  ['LW', 'B39', 323.15, 0.95, 296.15, 293.15, 298.15, 0.9, 324.4194417564141, 325.30073162442767],
  ['LW', 'B39', 373.15, 0.95, 296.15, 293.15, 298.15, 0.9, 376.32558363871374, 378.22724155476993],
  ['LW', 'B39', 523.15, 0.95, 296.15, 293.15, 298.15, 0.9, 531.3760024562891, 535.5219369254904],
  ['LW', 'B39', 773.15, 0.95, 296.15, 293.15, 298.15, 0.9, 790.5976517574428, 799.7673918963505],
  ['LW', 'B39', 273.15, 0.98, 296.15, 293.15, 298.15, 0.9, 272.61645203793125, 268.0081587260603],
  ['LW', 'B39', 323.15, 0.98, 296.15, 293.15, 298.15, 0.9, 323.64368200376566, 325.13777225702296],
  ['LW', 'B39', 373.15, 0.98, 296.15, 293.15, 298.15, 0.9, 374.3876606102226, 377.38615613535075],
  ['LW', 'B39', 523.15, 0.98, 296.15, 293.15, 298.15, 0.9, 526.356996358281, 532.7951942687413],
  ['LW', 'B39', 773.15, 0.98, 296.15, 293.15, 298.15, 0.9, 779.941484547824, 794.095624364711],
  ['B39', 'LW', 273.15, 0.95, 296.15, 293.15, 298.15, 1.0, 271.09040530872625, 272.32804396789453],
  ['B39', 'LW', 323.15, 0.95, 296.15, 293.15, 298.15, 1.0, 324.1008249441443, 322.7263806838429],
  ['B39', 'LW', 373.15, 0.95, 296.15, 293.15, 298.15, 1.0, 374.95099262157976, 371.73598893621255],
  ['B39', 'LW', 523.15, 0.95, 296.15, 293.15, 298.15, 1.0, 526.9636046174862, 518.8318309188721],
  ['B39', 'LW', 773.15, 0.95, 296.15, 293.15, 298.15, 1.0, 781.471668131714, 764.3331120848623],
  ['B39', 'LW', 273.15, 0.98, 296.15, 293.15, 298.15, 1.0, 272.372570904572, 272.8371785569001],
  ['B39', 'LW', 323.15, 0.98, 296.15, 293.15, 298.15, 1.0, 323.52180759918093, 322.9829858479536],
  ['B39', 'LW', 373.15, 0.98, 296.15, 293.15, 298.15, 1.0, 373.85645761690654, 372.5916712084043],
  ['B39', 'LW', 523.15, 0.98, 296.15, 293.15, 298.15, 1.0, 524.6453662443771, 521.440389025128],
  ['B39', 'LW', 773.15, 0.98, 296.15, 293.15, 298.15, 1.0, 776.4068089138013, 769.6539307113857],
]

const LW = BANDS.LW!
const base: RadianceTemperatureReadingInput = {
  radianceTemperatureBand: LW,
  radianceTemperatureK: 373.15,
  sourceEmissivity: 0.95,
  certificationReflectedTemperatureK: 296.15,
  band: BANDS.B22!,
  reflectedTemperatureK: 293.15,
  instrumentTemperatureK: 298.15,
  emissivitySetting: 0.95,
}

describe('surface temperature from a radiance temperature', () => {
  it('agrees with scipy (quad + brentq) within 1 µK', () => {
    let worst = 0
    for (const [b0, , tRad, es, tw0, , , , ts] of SCIPY) {
      const t = surfaceTemperatureFromRadianceTemperature({ band: BANDS[b0]!, radianceTemperatureK: tRad, sourceEmissivity: es, reflectedTemperatureK: tw0 })
      worst = Math.max(worst, Math.abs(t - ts))
    }
    expect(worst).toBeLessThan(1e-6)
  })

  it('a blackbody (ε_s = 1) is at its radiance temperature; a source at T_w0 has T_rad = T_w0 whatever ε_s', () => {
    // model identities of equation (1): ε_s = 1 removes the reflected term; T_s = T_w0 makes both sides S(T_w0)
    expect(surfaceTemperatureFromRadianceTemperature({ band: LW, radianceTemperatureK: 400, sourceEmissivity: 1, reflectedTemperatureK: 296 })).toBe(400)
    const t = surfaceTemperatureFromRadianceTemperature({ band: LW, radianceTemperatureK: 296.15, sourceEmissivity: 0.9, reflectedTemperatureK: 296.15 })
    expect(Math.abs(t - 296.15)).toBeLessThan(1e-9)
  })

  it('a source colder than its surroundings has T_s < T_rad (a solution exists while S(T_rad) > (1 − ε_s)·S(T_w0))', () => {
    const t = surfaceTemperatureFromRadianceTemperature({ band: LW, radianceTemperatureK: 253.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15 })
    expect(t).toBeLessThan(253.15)
    // independent check of equation (1) with the reading model: a source at T_s seen with ε_i = 1, T_d = T_w = T_w0 reads T_rad
    const back = expectedReadingK({ band: LW, sourceTemperatureK: t, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 1 })
    expect(Math.abs(back - 253.15)).toBeLessThan(1e-7)
  })

  it('rejects a radiance temperature that would need a negative emitted radiance, naming radianceTemperatureK', () => {
    // 8–14 µm: S(100 K) is far below 0.5·S(300 K), so ε_s = 0.5 would need a negative S(T_s)
    const negative = () => surfaceTemperatureFromRadianceTemperature({ band: LW, radianceTemperatureK: 100, sourceEmissivity: 0.5, reflectedTemperatureK: 300 })
    expect(negative).toThrow(EngineInputError)
    expect(negative).toThrow(expect.objectContaining({ field: 'radianceTemperatureK' }))
  })

  it('rejects bad inputs with their field names', () => {
    const field = (f: () => unknown): string => {
      try {
        f()
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    const ok = { band: LW, radianceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15 }
    expect(field(() => surfaceTemperatureFromRadianceTemperature({ ...ok, radianceTemperatureK: 0 }))).toBe('radianceTemperatureK')
    expect(field(() => surfaceTemperatureFromRadianceTemperature({ ...ok, sourceEmissivity: 1.2 }))).toBe('sourceEmissivity')
    expect(field(() => surfaceTemperatureFromRadianceTemperature({ ...ok, reflectedTemperatureK: Number.NaN }))).toBe('reflectedTemperatureK')
    expect(field(() => surfaceTemperatureFromRadianceTemperature({ ...ok, band: { kind: 'rectangular', lambda1Um: 14, lambda2Um: 8 } }))).toBe('band.lambda2Um')
    expect(field(() => surfaceTemperatureFromRadianceTemperature({ ...ok, constants: 'IPTS-68' as never }))).toBe('constants')
    expect(field(() => expectedReadingFromRadianceTemperature({ ...base, radianceTemperatureBand: { kind: 'rectangular', lambda1Um: 0, lambda2Um: 8 } }))).toBe('radianceTemperatureBand.lambda1Um')
    expect(field(() => expectedReadingFromRadianceTemperature({ ...base, certificationReflectedTemperatureK: -1 }))).toBe('certificationReflectedTemperatureK')
    expect(field(() => expectedReadingFromRadianceTemperature({ ...base, emissivitySetting: 0 }))).toBe('emissivitySetting')
    // hot detector, low ε_i, cold source: the instrument side would need a negative signal (as in ./reading)
    expect(field(() => expectedReadingFromRadianceTemperature({ ...base, band: LW, radianceTemperatureK: 250, instrumentTemperatureK: 400, emissivitySetting: 0.1 }))).toBe('instrumentTemperatureK')
  })
})

describe('expected reading on a radiance-temperature basis', () => {
  it('agrees with scipy (quad + brentq) within 1 µK in the same and in other bands', () => {
    let worst = 0
    for (const [b0, b, tRad, es, tw0, tw, td, ei, ts, tm] of SCIPY) {
      const input = { radianceTemperatureBand: BANDS[b0]!, radianceTemperatureK: tRad, sourceEmissivity: es, certificationReflectedTemperatureK: tw0, band: BANDS[b]!, reflectedTemperatureK: tw, instrumentTemperatureK: td, emissivitySetting: ei }
      const r = expectedReadingFromRadianceTemperature(input)
      expect(Math.abs(r.sourceTemperatureK - ts), `${b0}→${b} ${tRad} K ε_s ${es}`).toBeLessThan(1e-6)
      expect(Math.abs(r.expectedReadingK - tm), `${b0}→${b} ${tRad} K ε_s ${es} ε_i ${ei}`).toBeLessThan(1e-6)
      expect(expectedReadingFromRadianceTemperatureK(input)).toBe(r.expectedReadingK)
      worst = Math.max(worst, Math.abs(r.expectedReadingK - tm))
    }
    expect(worst).toBeLessThan(1e-6)
  })

  it('same band, ε_i = 1 and T_w = T_w0 reads T_rad exactly (1e-9 K) for any ε_s and T_d', () => {
    // identity of the model (module notes): (1) and (2) give S(T_meas) = S(T_rad)
    for (const band of [LW, BANDS.B39!, { kind: 'tabulated', points: [[7.5, 0], [9, 1], [13, 0.8], [14.5, 0]] } as Band]) {
      for (const tRad of [273.15, 373.15, 773.15, 1273.15]) {
        for (const es of [0.8, 0.95, 0.98]) {
          const r = expectedReadingFromRadianceTemperature({ ...base, radianceTemperatureBand: band, band, radianceTemperatureK: tRad, sourceEmissivity: es, certificationReflectedTemperatureK: 296.15, reflectedTemperatureK: 296.15, instrumentTemperatureK: 310, emissivitySetting: 1 })
          expect(Math.abs(r.expectedReadingK - tRad), `${tRad} K ε_s ${es}`).toBeLessThan(1e-9)
        }
      }
    }
  })

  it('the radiance-temperature basis equals the surface basis of ./reading once T_s is known', () => {
    const r = expectedReadingFromRadianceTemperature(base)
    const direct = expectedReadingK({ band: base.band, sourceTemperatureK: r.sourceTemperatureK, sourceEmissivity: 0.95, reflectedTemperatureK: 293.15, instrumentTemperatureK: 298.15, emissivitySetting: 0.95 })
    expect(Math.abs(r.expectedReadingK - direct)).toBeLessThan(1e-7)
    // CODATA 2018 c2 = 1.438776877e-2 m·K
    expect(r.constants.id).toBe('CODATA-2018')
    expect(Math.abs(r.constants.c2 / 1.438776877e-2 - 1)).toBeLessThan(1e-9)
  })

  it('sensitivities match central differences of the whole two-step computation', () => {
    const inputs: RadianceTemperatureReadingInput[] = [
      base,
      { ...base, band: BANDS.B39!, emissivitySetting: 0.9, radianceTemperatureK: 523.15, sourceEmissivity: 0.98 },
      { ...base, band: LW, emissivitySetting: 0.97, radianceTemperatureK: 323.15 },
      { ...base, radianceTemperatureBand: BANDS.B39!, band: { kind: 'tabulated', points: [[7.5, 0], [9, 1], [13, 0.8], [14.5, 0]] }, radianceTemperatureK: 773.15, emissivitySetting: 0.92 },
    ]
    const keys = [
      ['radianceTemperatureK', 'radianceTemperature', 1e-3],
      ['sourceEmissivity', 'sourceEmissivity', 1e-5],
      ['certificationReflectedTemperatureK', 'certificationReflectedTemperature', 1e-3],
      ['reflectedTemperatureK', 'reflectedTemperature', 1e-3],
      ['instrumentTemperatureK', 'instrumentTemperature', 1e-3],
      ['emissivitySetting', 'emissivitySetting', 1e-5],
    ] as const
    for (const inp of inputs) {
      const s = expectedReadingFromRadianceTemperature(inp).sensitivities
      for (const [field, out, h] of keys) {
        const up = expectedReadingFromRadianceTemperatureK({ ...inp, [field]: inp[field] + h })
        const dn = expectedReadingFromRadianceTemperatureK({ ...inp, [field]: inp[field] - h })
        const cd = (up - dn) / (2 * h)
        expect(Math.abs(s[out] - cd), `${out}`).toBeLessThan(1e-6 * Math.max(1, Math.abs(cd)))
      }
    }
  })

  it('the Monte Carlo model agrees with the checked function and gives NaN where there is no solution', () => {
    const f = radianceTemperatureReadingModel(LW, BANDS.B22!)
    const x = [373.15, 0.95, 296.15, 293.15, 298.15, 0.95]
    expect(Math.abs(f(x) - expectedReadingFromRadianceTemperatureK(base))).toBeLessThan(1e-12)
    expect(Number.isNaN(f([100, 0.5, 300, 293, 298, 0.95]))).toBe(true)
  })
})
