// A source's certified value on its basis (shared/calibration/compute.ts, step 1), the setup checks of
// shared/calibration/setup.ts (emissivity for the instrument's band, spot against aperture), budget lines
// from the equipment with their origins, correlated lines (GUM 5.2.2) and the Monte Carlo plan of a
// radiance-temperature point (JCGM 101). Reference values: scipy (tests/reference/reference_basis.py),
// hand arithmetic written beside each check.
import { describe, expect, it } from 'vitest'

import { computePoint, pointInputFromStored } from '../../../shared/calibration/compute'
import { monteCarloPlan, monteCarloPlanInputs, planReadingModel } from '../../../shared/calibration/monteCarloPlan'
import { bandSpanUm, emissivityForBand, spotFit, spotProblem, tableMean } from '../../../shared/calibration/setup'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { readingModel, readingSensitivities } from '../../../shared/radiometry/reading'
import { runMonteCarlo, validateGumResult } from '../../../shared/uncertainty/montecarlo'
import type { BandInput, EquipmentLine, PointComputationInput, ReferenceBasisInput, TemplateComponent } from '../../../shared/types/runs'

const BANDS = {
  LW: { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 },
  B22: { kind: 'rectangular', lambda1Um: 2, lambda2Um: 2.4 },
  B39: { kind: 'rectangular', lambda1Um: 3.8, lambda2Um: 4 },
} as const
type BandName = keyof typeof BANDS

const radiance = (b0: BandName, tw0: number): ReferenceBasisInput => ({ kind: 'radiance-temperature', band: BANDS[b0], reflectedTemperatureK: tw0 })

/** A point on the source's corrected value (no correction: the table is flat 0), on the given basis. */
function point(tK: number, basis: ReferenceBasisInput, over: Partial<PointComputationInput> = {}): PointComputationInput {
  return {
    band: BANDS.LW,
    reference: { kind: 'source-correction', sourceIndicatedK: tK, corrections: [[50, 0], [5000, 0]], basis },
    sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.15, emissivitySetting: 0.95,
    readingsK: [tK], resolutionK: 0.001,
    template: [], cmc: [], accuracy: { kind: 'absolute', b: 1 }, rule: 'simple-acceptance', guardBandFactor: null,
    ...over,
  }
}
const comp = (c: Partial<TemplateComponent>): TemplateComponent => ({
  name: 'c', type: 'B', distribution: 'standard', value: 0, coverageFactor: null, unit: 'K', input: 'reading', dof: null, ...c,
})

// tests/reference/reference_basis.py, part 1 (scipy.integrate.quad epsrel 1e-13, scipy.optimize.brentq xtol 1e-13)
// [b0, b, T_rad K, eps_s, T_w0 K, T_w K, T_d K, eps_i, T_s K, T_meas K]
const POINT_CASES: [string, string, number, number, number, number, number, number, number, number][] = [
  ['LW', 'LW', 273.15, 0.95, 296.15, 293.15, 298.15, 0.95, 271.7673218771496, 271.4290991891968],
  ['LW', 'LW', 373.15, 0.95, 296.15, 293.15, 298.15, 0.95, 376.32558363871374, 376.1764724069626],
  ['LW', 'LW', 673.15, 0.95, 296.15, 293.15, 298.15, 0.95, 686.7463504582099, 686.6760522026443],
  ['LW', 'LW', 273.15, 0.98, 296.15, 293.15, 298.15, 0.95, 272.61645203793125, 271.5498622328004],
  ['LW', 'LW', 373.15, 0.98, 296.15, 293.15, 298.15, 0.95, 374.3876606102226, 376.2296594072402],
  ['LW', 'LW', 673.15, 0.98, 296.15, 293.15, 298.15, 0.95, 678.4455378865824, 686.7011214539558],
  ['LW', 'LW', 273.15, 0.95, 296.15, 293.15, 298.15, 1.0, 271.7673218771496, 272.9621945174772],
  ['LW', 'LW', 373.15, 0.95, 296.15, 293.15, 298.15, 1.0, 376.32558363871374, 373.06440326678205],
  ['LW', 'LW', 673.15, 0.95, 296.15, 293.15, 298.15, 1.0, 686.7463504582099, 673.1097285317813],
  ['LW', 'LW', 273.15, 0.98, 296.15, 293.15, 298.15, 1.0, 272.61645203793125, 273.0749259824973],
  ['LW', 'LW', 373.15, 0.98, 296.15, 293.15, 298.15, 1.0, 374.3876606102226, 373.11576598445725],
  ['LW', 'LW', 673.15, 0.98, 296.15, 293.15, 298.15, 1.0, 678.4455378865824, 673.1338916262652],
  ['LW', 'B22', 273.15, 0.95, 296.15, 293.15, 298.15, 0.95, 271.7673218771496, 270.22543744867653],
  ['LW', 'B22', 373.15, 0.95, 296.15, 293.15, 298.15, 0.95, 376.32558363871374, 376.3212695736243],
  ['LW', 'B22', 673.15, 0.95, 296.15, 293.15, 298.15, 0.95, 686.7463504582099, 686.746344109977],
  ['LW', 'B22', 273.15, 0.98, 296.15, 293.15, 298.15, 0.95, 272.61645203793125, 269.37170981771897],
  ['LW', 'B22', 373.15, 0.98, 296.15, 293.15, 298.15, 0.95, 374.3876606102226, 375.0636730851776],
  ['LW', 'B22', 673.15, 0.98, 296.15, 293.15, 298.15, 0.95, 678.4455378865824, 680.6623722005899],
  ['LW', 'B39', 273.15, 0.95, 296.15, 293.15, 298.15, 1.0, 271.7673218771496, 273.4015027293408],
  ['LW', 'B39', 373.15, 0.95, 296.15, 293.15, 298.15, 1.0, 376.32558363871374, 374.4894288933058],
  ['LW', 'B39', 673.15, 0.95, 296.15, 293.15, 298.15, 1.0, 686.7463504582099, 680.2859088325881],
  ['LW', 'B39', 273.15, 0.98, 296.15, 293.15, 298.15, 1.0, 272.61645203793125, 273.24428125869446],
  ['LW', 'B39', 373.15, 0.98, 296.15, 293.15, 298.15, 1.0, 374.3876606102226, 373.6715400796853],
  ['LW', 'B39', 673.15, 0.98, 296.15, 293.15, 298.15, 1.0, 678.4455378865824, 675.9472882860181],
  ['B39', 'LW', 273.15, 0.95, 296.15, 293.15, 298.15, 0.98, 271.09040530872625, 271.7193682081264],
  ['B39', 'LW', 373.15, 0.95, 296.15, 293.15, 298.15, 0.98, 374.95099262157976, 372.93032437264657],
  ['B39', 'LW', 673.15, 0.95, 296.15, 293.15, 298.15, 0.98, 679.4757055539214, 671.2827179734498],
  ['B39', 'LW', 273.15, 0.98, 296.15, 293.15, 298.15, 0.98, 272.372570904572, 272.2424881165539],
  ['B39', 'LW', 373.15, 0.98, 296.15, 293.15, 298.15, 0.98, 373.85645761690654, 373.7978982844935],
  ['B39', 'LW', 673.15, 0.98, 296.15, 293.15, 298.15, 0.98, 675.627509889739, 675.5999283576938],
]

describe('expected reading from a radiance temperature (domain notes §7) against scipy (quad + brentq)', () => {
  it('same band and other bands, ε_s = 0.95 and 0.98, T_w0 = 296.15 K ≠ T_w = 293.15 K: T_s and T_meas within 1 µK', () => {
    let compared = 0
    for (const [b0, b, tRad, es, tw0, tw, td, ei, tsRef, tmRef] of POINT_CASES) {
      const r = computePoint(point(tRad, radiance(b0 as BandName, tw0), {
        band: BANDS[b as BandName], sourceEmissivity: es, reflectedTemperatureK: tw, instrumentTemperatureK: td, emissivitySetting: ei,
      }))
      expect(r.referenceBasis).toBe('radiance-temperature')
      // the reference temperature stays the certified radiance temperature; T_s is found from it
      expect(r.referenceTemperatureK).toBe(tRad)
      expect(Math.abs(r.sourceTemperatureK! - tsRef), `${b0}→${b} ${tRad} K ε_s ${es}: T_s`).toBeLessThan(1e-6)
      expect(Math.abs(r.expectedReadingK - tmRef), `${b0}→${b} ${tRad} K ε_s ${es} ε_i ${ei}: T_meas`).toBeLessThan(1e-6)
      compared++
    }
    expect(compared).toBe(30)
  })

  it('on a surface or cavity basis the corrected value is T_s itself (the model of shared/radiometry/reading.ts at T_s)', () => {
    for (const kind of ['surface-temperature', 'cavity-temperature'] as const) {
      const r = computePoint(point(373.15, { kind }, { instrumentTemperatureK: 298.15, emissivitySetting: 1 }))
      const direct = readingSensitivities({ band: BANDS.LW, sourceTemperatureK: 373.15, sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 298.15, emissivitySetting: 1 })
      expect(r.referenceBasis).toBe(kind)
      expect(r.sourceTemperatureK).toBe(373.15)
      expect(r.expectedReadingK).toBe(direct.expectedReadingK)
    }
    // a stored input without a basis (results before engine 1.2.0) is computed as before: T_s = the corrected value
    const old = point(373.15, { kind: 'surface-temperature' })
    if (old.reference.kind === 'source-correction') delete old.reference.basis
    expect(computePoint(old).expectedReadingK).toBe(computePoint(point(373.15, { kind: 'surface-temperature' })).expectedReadingK)
  })

  it('same band with T_w = T_w0: the reading does not depend on ε_s (the radiance temperature holds the emissivity)', () => {
    // ε_i·S(T_meas) + (1 − ε_i)·S(T_d) = ε_s·S(T_s) + (1 − ε_s)·S(T_w0) = S(T_rad) whatever ε_s is (eq. (1) into (2))
    const a = computePoint(point(373.15, radiance('LW', 296.15), { sourceEmissivity: 0.95 }))
    const b = computePoint(point(373.15, radiance('LW', 296.15), { sourceEmissivity: 0.9 }))
    expect(Math.abs(a.expectedReadingK - b.expectedReadingK)).toBeLessThan(1e-9)
    expect(Math.abs(a.sourceTemperatureK! - b.sourceTemperatureK!)).toBeGreaterThan(1) // but T_s does
    // the emissivity's sensitivity is then 0 (to rounding): its uncertainty drops out of the budget
    const e = computePoint(point(373.15, radiance('LW', 296.15), { template: [comp({ name: 'eps', unit: 'emissivity', input: 'sourceEmissivity', value: 0.005 })] }))
    expect(Math.abs(e.budget.components[0]!.sensitivity)).toBeLessThan(1e-6)
  })
})

describe('sensitivities of a radiance-temperature point (implicit differentiation through both equations)', () => {
  it('agree with central differences of the whole computation', () => {
    const base = { band: BANDS.B22, sourceEmissivity: 0.95, reflectedTemperatureK: 293.15, instrumentTemperatureK: 298.15, emissivitySetting: 0.95 }
    const lines = [
      comp({ name: 'T_rad', input: 'radianceTemperature', value: 0.1 }),
      comp({ name: 'T_w0', input: 'certificationReflectedTemperature', value: 0.1 }),
      comp({ name: 'eps', input: 'sourceEmissivity', unit: 'emissivity', value: 0.001 }),
      comp({ name: 'T_w', input: 'reflectedTemperature', value: 0.1 }),
      comp({ name: 'T_s', input: 'sourceTemperature', value: 0.1 }),
    ]
    const r = computePoint(point(473.15, radiance('LW', 296.15), { ...base, template: lines }))
    const at = (tRad: number, tw0: number, es: number, tw: number) => computePoint(point(tRad, radiance('LW', tw0), { ...base, sourceEmissivity: es, reflectedTemperatureK: tw })).expectedReadingK
    const h = 1e-3
    const he = 1e-6
    const c = r.budget.components
    expect(Math.abs(c[0]!.sensitivity - (at(473.15 + h, 296.15, 0.95, 293.15) - at(473.15 - h, 296.15, 0.95, 293.15)) / (2 * h))).toBeLessThan(1e-6)
    expect(Math.abs(c[1]!.sensitivity - (at(473.15, 296.15 + h, 0.95, 293.15) - at(473.15, 296.15 - h, 0.95, 293.15)) / (2 * h))).toBeLessThan(1e-6)
    expect(Math.abs(c[2]!.sensitivity - (at(473.15, 296.15, 0.95 + he, 293.15) - at(473.15, 296.15, 0.95 - he, 293.15)) / (2 * he))).toBeLessThan(1e-3)
    expect(Math.abs(c[3]!.sensitivity - (at(473.15, 296.15, 0.95, 293.15 + h) - at(473.15, 296.15, 0.95, 293.15 - h)) / (2 * h))).toBeLessThan(1e-6)
    // a line on T_s moves the surface temperature itself: ∂T_meas/∂T_s of the reading model at T_s
    const atTs = readingSensitivities({ ...base, sourceTemperatureK: r.sourceTemperatureK! })
    expect(c[4]!.sensitivity).toBe(atTs.sourceTemperature)
  })

  it('refuses lines on T_rad or T_w0 when the reference is not a radiance temperature, naming the line', () => {
    const field = (over: Partial<PointComputationInput>): string => {
      try {
        computePoint(point(373.15, { kind: 'surface-temperature' }, over))
      }
      catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field({ template: [comp({ input: 'radianceTemperature' })] })).toBe('template[0].input')
    const line: EquipmentLine = { ...comp({ input: 'certificationReflectedTemperature' }), origin: 'x' }
    expect(field({ equipmentLines: [line] })).toBe('equipmentLines[0].input')
  })

  it('a radiance temperature below what the surroundings alone reflect is refused on sourceIndicatedK', () => {
    // ε_s = 0.5 at T_w0 = 400 K: (1 − ε_s)·S(400 K) exceeds S(250 K), so no surface temperature gives T_rad = 250 K
    expect(() => computePoint(point(250, radiance('LW', 400), { sourceEmissivity: 0.5 }))).toThrow(expect.objectContaining({ field: 'sourceIndicatedK' }))
  })
})

describe('budget lines name their origin', () => {
  it('template lines the procedure, equipment lines their register entry, computed lines the readings and the resolution', () => {
    const equipment: EquipmentLine[] = [{ ...comp({ name: 'Certified value', distribution: 'normal', value: 0.3, coverageFactor: 2, input: 'radianceTemperature' }), origin: 'BB-FP-01 certified data, certificate HTS-26-0311' }]
    const r = computePoint(point(373.15, radiance('LW', 296.15), {
      readingsK: [373.1, 373.2],
      template: [comp({ name: 'Ambient', value: 0.1 })],
      templateOrigin: 'Procedure P (DOC-1), version 2',
      equipmentLines: equipment,
      setupNotes: ['Spot 25.0 mm within 150 mm'],
    }))
    expect(r.budget.components.map(l => [l.name, l.origin])).toEqual([
      ['Ambient', 'Procedure P (DOC-1), version 2'],
      ['Certified value', 'BB-FP-01 certified data, certificate HTS-26-0311'],
      ['Repeatability of the readings (s/√n)', 'The readings of this point (n = 2)'],
      ['Display resolution of the instrument (δ/√12)', 'The instrument’s display resolution (instrument register)'],
    ])
    // U/k = 0.3/2 = 0.15 K on T_rad, with c = dT_meas/dT_rad
    expect(r.budget.components[1]!.standardUncertainty).toBe(0.15)
    expect(r.budget.notes[0]).toBe('Spot 25.0 mm within 150 mm')
    // the stored inputs recompute the same result
    expect(computePoint(pointInputFromStored(r.inputs))).toEqual(r)
  })
})

describe('correlated lines at a point (JCGM 100 5.2.2, eq. (16))', () => {
  // Reflected temperature ±2 K and instrument temperature ±1 K (rectangular, GUM 4.3.7: u = a/√3) read
  // from one thermometer; 2.0–2.4 µm, ε_s = 0.9, ε_i = 0.9, T_s = 800 K, T_w = 296.15 K, T_d = 300 K.
  // u_c² = (c_w·u_w)² + (c_d·u_d)² + 2·r·(c_w·u_w)·(c_d·u_d) + (δ/√12)² (one reading: no Type A line)
  const template = [
    comp({ name: 'reflected', distribution: 'rectangular', value: 2, input: 'reflectedTemperature' }),
    comp({ name: 'instrument', distribution: 'rectangular', value: 1, input: 'instrumentTemperature' }),
  ]
  const at = (r?: number) => computePoint({
    ...point(800, { kind: 'cavity-temperature' }),
    band: BANDS.B22, sourceEmissivity: 0.9, emissivitySetting: 0.9, instrumentTemperatureK: 300, resolutionK: 0.1,
    template, ...(r === undefined ? {} : { correlations: [{ between: [0, 1] as [number, number], coefficient: r }] }),
  })
  it('r = 1 and r = −0.5 by hand from the point’s own sensitivities', () => {
    const plain = at()
    const [w, d] = plain.budget.components
    const sw = w!.sensitivity * 2 / Math.sqrt(3) // c_w·u_w, u_w = 2/√3 = 1.1547 K
    const sd = d!.sensitivity * 1 / Math.sqrt(3) // c_d·u_d, u_d = 1/√3 = 0.57735 K
    const res2 = 0.1 ** 2 / 12 // (δ/√12)², δ = 0.1 K
    expect(sw).toBeGreaterThan(0) // c_w = (1 − ε_s)·S'(T_w)/(ε_i·S'(T_meas)) > 0
    expect(sd).toBeLessThan(0) // c_d = −(1 − ε_i)·S'(T_d)/(ε_i·S'(T_meas)) < 0
    expect(Math.abs(plain.budget.combinedStandardUncertaintyK ** 2 - (sw ** 2 + sd ** 2 + res2))).toBeLessThan(1e-15)
    // r = 1: u_c² = sw² + sd² + 2·sw·sd + res² = (sw + sd)² + res² (the two partly cancel: c_w > 0 > c_d)
    const one = at(1)
    expect(Math.abs(one.budget.combinedStandardUncertaintyK ** 2 - ((sw + sd) ** 2 + res2))).toBeLessThan(1e-15)
    expect(Math.abs(one.budget.covarianceK2! - 2 * sw * sd)).toBeLessThan(1e-15)
    // r = −0.5: u_c² = sw² + sd² − sw·sd + res²
    const half = at(-0.5)
    expect(Math.abs(half.budget.combinedStandardUncertaintyK ** 2 - (sw ** 2 + sd ** 2 - sw * sd + res2))).toBeLessThan(1e-15)
    expect(one.budget.combinedStandardUncertaintyK).toBeLessThan(plain.budget.combinedStandardUncertaintyK)
    expect(half.budget.combinedStandardUncertaintyK).toBeGreaterThan(plain.budget.combinedStandardUncertaintyK)
  })
})

describe('emissivity for the instrument’s band (shared/calibration/setup.ts)', () => {
  const cavity = { emissivity: 0.995, emissivityU: 0.001, emissivityBandLambda1Um: 8, emissivityBandLambda2Um: 14 }
  it('an emissivity stated for 8–14 µm is refused for 2.0–2.4 µm, naming both bands and the value', () => {
    const e = emissivityForBand(cavity, BANDS.B22, 'BB-CV-02')
    expect('problem' in e && e.problem).toBe('BB-CV-02’s emissivity 0.995 is stated for 8–14 µm; the instrument’s band 2–2.4 µm lies outside it. Record the source’s emissivity for 2–2.4 µm (its emissivity table), or use another source')
    expect(emissivityForBand(cavity, BANDS.LW, 'BB-CV-02')).toMatchObject({ emissivity: 0.995, standardUncertainty: 0.001, from: 'stated-band' })
    expect(emissivityForBand({ ...cavity, emissivityBandLambda1Um: null, emissivityBandLambda2Um: null }, BANDS.LW, 'X')).toMatchObject({ problem: expect.stringContaining('is stated without a wavelength band') })
  })
  it('a table over wavelength gives the mean over the band (trapezoids, by hand) and the largest u', () => {
    // rows 1.5 µm 0.998, 5 µm 0.997: ε(λ) = 0.998 − 0.001·(λ − 1.5)/3.5; its mean over 2.0–2.4 µm is ε(2.2) = 0.998 − 0.0007/3.5 = 0.9978
    const table = [[1.5, 0.998, 0.001], [5, 0.997, 0.001], [8, 0.995, 0.002], [14, 0.995, 0.002]] as [number, number, number][]
    const e = emissivityForBand({ ...cavity, emissivityTable: table }, BANDS.B22, 'BB-CV-02')
    expect('emissivity' in e && Math.abs(e.emissivity - 0.9978)).toBeLessThan(1e-15)
    expect(e).toMatchObject({ standardUncertainty: 0.001, from: 'table' })
    // 7–15 µm over rows 7 0.94 (u 0.01), 8 0.95, 14 0.95, 15 0.94: (0.945·1 + 0.95·6 + 0.945·1)/8 = 0.94875, u = 0.01
    const plate = tableMean([[7, 0.94, 0.01], [8, 0.95, 0.005], [14, 0.95, 0.005], [15, 0.94, 0.01]], 7, 15)
    expect(Math.abs(plate.emissivity - 0.94875)).toBeLessThan(1e-15)
    expect(plate.standardUncertainty).toBe(0.01)
    // a flat stretch gives its value exactly
    expect(tableMean([[7, 0.94, 0.01], [8, 0.95, 0.005], [14, 0.95, 0.005], [15, 0.94, 0.01]], 8, 14).emissivity).toBe(0.95)
  })
  it('a tabulated responsivity covers the span of its non-zero response', () => {
    expect(bandSpanUm({ kind: 'tabulated', points: [[6, 0], [7, 0], [8, 0.5], [14, 1], [15, 0], [16, 0]] })).toEqual({ lambda1Um: 7, lambda2Um: 15 })
  })
})

describe('spot against aperture (shared/calibration/setup.ts)', () => {
  it('D:S 12 at 300 mm gives a 25 mm spot; a 40 mm aperture fails a margin of 2, naming both diameters', () => {
    const fit = spotFit({ apertureMm: 40, distanceMm: 300, distanceToSpot: 12, spotDiameterMm: null, margin: 2 })
    expect(fit).toEqual({ spotDiameterMm: 25, requiredApertureMm: 50, margin: 2, fits: false, how: 'at 300 mm with D:S 12:1' })
    expect(spotProblem(fit, 40, 'BB-X', 'P (version 1)')).toBe('The instrument’s spot is 25.0 mm across (at 300 mm with D:S 12:1); procedure P (version 1) asks for a source aperture of at least 2 × 25.0 mm = 50.0 mm, and BB-X’s aperture is 40.0 mm. Move the instrument closer or use a source with a larger aperture')
    expect(spotFit({ apertureMm: 50, distanceMm: 300, distanceToSpot: 12, spotDiameterMm: null, margin: 2 }).fits).toBe(true)
  })
  it('without a margin the spot must fit (m = 1); a stated spot overrides D:S; no distance and no spot: unknown', () => {
    expect(spotFit({ apertureMm: 20, distanceMm: 300, distanceToSpot: 12, spotDiameterMm: null, margin: null })).toMatchObject({ margin: 1, fits: false })
    expect(spotFit({ apertureMm: 20, distanceMm: 300, distanceToSpot: 12, spotDiameterMm: 8, margin: 2 })).toMatchObject({ spotDiameterMm: 8, fits: true, how: 'as stated for the run' })
    expect(spotFit({ apertureMm: 20, distanceMm: null, distanceToSpot: 12, spotDiameterMm: null, margin: 2 })).toMatchObject({ spotDiameterMm: null, fits: null })
  })
})

describe('Monte Carlo of a radiance-temperature point (JCGM 101)', () => {
  it('runs the two-step model with ε_s in both steps and validates the GUM result (§8)', () => {
    // a plate certified in 8–14 µm (U = 0.30 K, k = 2; surroundings 23.0 °C) read by a 2.0–2.4 µm instrument
    // today at T_w = 20.0 °C: ε_s now matters (other band), with u(ε_s) = 0.005
    const r = computePoint(point(373.15, radiance('LW', 296.15), {
      band: BANDS.B22, reflectedTemperatureK: 293.15, instrumentTemperatureK: 298.15, emissivitySetting: 1,
      equipmentLines: [
        { ...comp({ name: 'certified', distribution: 'normal', value: 0.3, coverageFactor: 2, input: 'radianceTemperature' }), origin: 'o' },
        { ...comp({ name: 'emissivity', value: 0.005, unit: 'emissivity', input: 'sourceEmissivity' }), origin: 'o' },
        { ...comp({ name: 'uniformity', distribution: 'rectangular', value: 0.2, input: 'radianceTemperature' }), origin: 'o' },
      ],
    }))
    const plan = monteCarloPlan(r)
    expect(plan.model.kind).toBe('radiance-temperature')
    expect(plan.modelInputs).toEqual(['radianceTemperatureK', 'sourceEmissivity', 'certificationReflectedTemperatureK', 'reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting'])
    const { inputs, correlations } = monteCarloPlanInputs(plan)
    const model = planReadingModel(plan.model)
    // at the centre of every input the model gives the GUM estimate
    expect(Math.abs(model(Float64Array.from(inputs.map(d => d.value))) - r.expectedReadingK)).toBeLessThan(1e-9)
    const mc = runMonteCarlo(model, inputs, { trials: 200_000, seed: 11, coverageProbability: r.budget.coverageProbability, correlations })
    const v = validateGumResult(plan.gum, mc.coverageInterval)
    expect(v.validated).toBe(true)
  })
})

describe('the Monte Carlo worker’s model (planReadingModel)', () => {
  it('a tabulated band goes through a signal table and agrees with the exact reading model within 1e-9 K, output terms added', () => {
    const band: BandInput = { kind: 'tabulated', points: [[7, 0], [8, 0.6], [10, 1], [13, 0.9], [14.5, 0]] }
    const viaTable = planReadingModel({ kind: 'reading', band })
    const exact = readingModel(band)
    let compared = 0
    for (const ts of [250, 300, 373.15, 600]) {
      for (const es of [0.9, 1]) {
        const x = [ts, es, 296.15, 298.15, 0.95]
        const y = viaTable(Float64Array.from([...x, 0.25, -0.05]))
        expect(Math.abs(y - (exact(x) + 0.2))).toBeLessThan(1e-9)
        compared++
      }
    }
    expect(compared).toBe(8)
  })
})
