// The kinds of instrument in the point computation (shared/calibration/compute.ts), the Monte Carlo
// plan (shared/calibration/monteCarloPlan.ts) and the certificate's calibration-equation table
// (shared/calibration/equation.ts): a ratio pyrometer's point against the scipy reference of the
// two-colour model, a thermal imager's point against hand arithmetic, the equation's table against
// the scipy curve_fit reference and the interpolation uncertainty of a straight line with correlated
// points against a hand calculation. Each expected value names its source.
import { describe, expect, it } from 'vitest'
import { computePoint } from '../../../shared/calibration/compute'
import { equationTable, type EquationPoint } from '../../../shared/calibration/equation'
import { MC_RATIO_MODEL_INPUTS, monteCarloPlan, planReadingModel } from '../../../shared/calibration/monteCarloPlan'
import { calibrationEquationAtReading, fitCalibrationEquation } from '../../../shared/radiometry/calibrationEquation'
import { EngineInputError } from '../../../shared/radiometry/errors'
import { expectedRatioReading } from '../../../shared/radiometry/ratio'
import type { PointComputationInput, TemplateComponent } from '../../../shared/types/runs'

const B1 = { kind: 'rectangular', lambda1Um: 0.95, lambda2Um: 1.0 } as const
const B2 = { kind: 'rectangular', lambda1Um: 1.0, lambda2Um: 1.05 } as const

const comp = (c: Partial<TemplateComponent>): TemplateComponent => ({
  name: 'c', type: 'B', distribution: 'standard', value: 0, coverageFactor: null, unit: 'K', input: 'reading', dof: null, ...c,
})

function ratioPoint(over: Partial<PointComputationInput> = {}): PointComputationInput {
  return {
    band: B1,
    reference: { kind: 'source-correction', sourceIndicatedK: 1273.15, corrections: [[1073.15, 0.4], [1273.15, 0.6]], basis: { kind: 'cavity-temperature' } },
    sourceEmissivity: 0.8825,
    reflectedTemperatureK: 296.15,
    // no part of the two-colour model: NaN as the server passes them when they were not entered
    instrumentTemperatureK: Number.NaN,
    emissivitySetting: Number.NaN,
    readingsK: [1287, 1287.5, 1286.5],
    resolutionK: 1,
    template: [],
    cmc: [],
    accuracy: { kind: 'percentPlus', a: 0.5, b: 3 },
    rule: 'simple-acceptance',
    guardBandFactor: null,
    ratio: { band2: B2, sourceEmissivity2: 0.8775, emissivityRatioSetting: 1 },
    ...over,
  }
}

const fieldOf = (f: () => unknown): string => {
  try {
    f()
  }
  catch (e) {
    expect(e).toBeInstanceOf(EngineInputError)
    return (e as EngineInputError).field
  }
  return 'no error'
}

describe('a ratio pyrometer’s point (two-colour model)', () => {
  it('takes its expected reading from the two-colour model: scipy quad + brentq within 1 mK, k = 1 and k = 1.02', () => {
    // Printed by tests/reference/ratio_runs.py (scipy 1.17.1; band radiance by scipy.integrate.quad, epsrel 1e-12;
    // the ratio equation by scipy.optimize.brentq, xtol 1e-12): T_s = 1273.15 + 0.6 = 1273.75 K (the certificate
    // correction at the set-point), ε₁ = 0.8825, ε₂ = 0.8775, T_w = 296.15 K, bands 0.95–1.00 / 1.00–1.05 µm:
    //   k = 1    → T_R = 1286.761706134 K
    //   k = 1.02 → T_R = 1242.520010746 K
    const k1 = computePoint(ratioPoint())
    expect(k1.referenceTemperatureK).toBeCloseTo(1273.75, 9)
    expect(Math.abs(k1.expectedReadingK - 1286.761706134)).toBeLessThan(1e-3)
    const k102 = computePoint(ratioPoint({ ratio: { band2: B2, sourceEmissivity2: 0.8775, emissivityRatioSetting: 1.02 } }))
    expect(Math.abs(k102.expectedReadingK - 1242.520010746)).toBeLessThan(1e-3)
    // same as the engine's own model, and the error from the readings (mean 1287 K)
    expect(k1.expectedReadingK).toBe(expectedRatioReading({ band1: B1, band2: B2, sourceTemperatureK: 1273.75, sourceEmissivity1: 0.8825, sourceEmissivity2: 0.8775, reflectedTemperatureK: 296.15, emissivityRatioSetting: 1 }).expectedReadingK)
    expect(k1.errorK).toBeCloseTo(1287 - k1.expectedReadingK, 9)
  })

  it('budget lines take the two-colour sensitivities: ε₁, ε₂, k, T_w, T_s; the instrument temperature and ε_i have c = 0', () => {
    const template = [
      comp({ name: 'Reflected', distribution: 'rectangular', value: 2, input: 'reflectedTemperature' }),
      comp({ name: 'Instrument temperature', distribution: 'rectangular', value: 1, input: 'instrumentTemperature' }),
      comp({ name: 'Emissivity setting', distribution: 'rectangular', value: 0.01, unit: 'emissivity', input: 'emissivitySetting' }),
      comp({ name: 'Ratio setting', distribution: 'rectangular', value: 0.005, unit: 'emissivity', input: 'emissivityRatioSetting' }),
      comp({ name: 'ε in band 2', value: 0.002, unit: 'emissivity', input: 'sourceEmissivity2' }),
      comp({ name: 'Source', distribution: 'normal', value: 2, coverageFactor: 2, input: 'sourceTemperature' }),
    ]
    const r = computePoint(ratioPoint({ template }))
    const s = expectedRatioReading({ band1: B1, band2: B2, sourceTemperatureK: 1273.75, sourceEmissivity1: 0.8825, sourceEmissivity2: 0.8775, reflectedTemperatureK: 296.15, emissivityRatioSetting: 1 }).sensitivities
    const line = (name: string) => r.budget.components.find(l => l.name === name)!
    expect(line('Reflected').sensitivity).toBe(s.reflectedTemperature)
    expect(line('Instrument temperature').sensitivity).toBe(0)
    expect(line('Emissivity setting').sensitivity).toBe(0)
    expect(line('Ratio setting').sensitivity).toBe(s.emissivityRatioSetting)
    expect(line('ε in band 2').sensitivity).toBe(s.sourceEmissivity2)
    expect(line('Source').sensitivity).toBe(s.sourceTemperature)
    // ∂T_R/∂k = −1/(k·D) < 0 and large at 1 µm: a 1 % change of k moves T_R by tens of kelvin
    expect(s.emissivityRatioSetting).toBeLessThan(-1000)
    expect(line('Instrument temperature').contributionK).toBe(0)
    expect(r.budget.notes.join(' ')).toMatch(/Ratio \(two-colour\) model: source emissivity ε_1 = 0\.8825 in band 1 and ε_2 = 0\.8775 in band 2/)
  })

  it('refuses a radiance-temperature reference (one band says nothing about the other) and ratio lines on other kinds', () => {
    const radiance = ratioPoint({ reference: { kind: 'source-correction', sourceIndicatedK: 1273.15, corrections: [[1073.15, 0.4], [1273.15, 0.6]], basis: { kind: 'radiance-temperature', band: { kind: 'rectangular', lambda1Um: 0.64, lambda2Um: 0.66 }, reflectedTemperatureK: 296.15 } } })
    expect(fieldOf(() => computePoint(radiance))).toBe('sourceId')
    const { ratio: _r, ...single } = ratioPoint({ template: [comp({ name: 'k', value: 0.01, unit: 'emissivity', input: 'emissivityRatioSetting' })], instrumentTemperatureK: 296.15, emissivitySetting: 1 })
    expect(fieldOf(() => computePoint(single))).toBe('template[0].input')
    // overlapping bands: the point's band 2 is named
    expect(fieldOf(() => computePoint(ratioPoint({ ratio: { band2: { kind: 'rectangular', lambda1Um: 0.98, lambda2Um: 1.05 }, sourceEmissivity2: 0.8775, emissivityRatioSetting: 1 } })))).toBe('instrument.band2')
  })

  it('its Monte Carlo plan runs the two-colour model over [T_s, ε₁, ε₂, T_w, k], at the GUM value', () => {
    const r = computePoint(ratioPoint({ template: [comp({ name: 'Ratio setting', value: 0.002, unit: 'emissivity', input: 'emissivityRatioSetting' }), comp({ name: 'Instrument temperature', value: 1, input: 'instrumentTemperature' })] }))
    const plan = monteCarloPlan(r)
    expect(plan.model.kind).toBe('ratio')
    expect(plan.modelInputs).toEqual(MC_RATIO_MODEL_INPUTS)
    expect(plan.inputs.emissivityRatioSetting).toMatchObject({ distribution: 'normal', value: 1, standardUncertainty: 0.002 })
    expect(plan.notes.join(' ')).toMatch(/Instrument temperature: no input of the two-colour model/)
    const model = planReadingModel(plan.model)
    const x = Float64Array.from([1273.75, 0.8825, 0.8775, 296.15, 1, ...plan.outputTerms.map(() => 0)])
    expect(model(x)).toBeCloseTo(r.expectedReadingK, 9)
  })
})

describe('a thermal imager’s point (centre ROI, uniformity, NETD)', () => {
  const LWIR = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 } as const
  const roi = (name: string, readingsK: number[], x = 0) => ({ name, xPx: x, yPx: 10, widthPx: 20, heightPx: 20, readingsK })
  const imagerPoint = (over: Partial<PointComputationInput> = {}): PointComputationInput => ({
    band: LWIR,
    reference: { kind: 'reference-thermometer', referenceReadingK: 373.15 },
    sourceEmissivity: 0.95,
    reflectedTemperatureK: 296.15,
    instrumentTemperatureK: 296.15,
    emissivitySetting: 0.95,
    readingsK: [373.3, 373.5, 373.4],
    resolutionK: 0.1,
    template: [],
    cmc: [],
    accuracy: { kind: 'absolute', b: 2 },
    rule: 'simple-acceptance',
    guardBandFactor: null,
    imager: {
      centreRoi: 'centre',
      rois: [roi('centre', [373.3, 373.5, 373.4], 150), roi('top-left', [373.0, 373.2], 40), roi('top-right', [373.6, 373.6, 373.9, 373.5], 260), roi('bottom', [373.2], 150)],
      netdFrames: [{ name: 'centre', framesK: [300.02, 299.98, 300.01, 299.99] }, { name: 'top-left', framesK: [300.0, 300.1] }],
    },
    ...over,
  })

  it('states the centre error with its budget, the non-uniformity and the NETD (hand arithmetic)', () => {
    // ε_i = ε_s, T_d = T_w: the expected reading is T_s = 373.15 K (model identity), so the centre error is
    // 373.4 − 373.15 = 0.25 K (the centre's readings are the point's). ROI means 373.4, 373.1, 373.65, 373.2:
    // max − min = 0.55 K; their s (n − 1): mean 373.3375, Σd² = 0.176875, s = √(0.176875/3) = 0.242813 K.
    // NETD (mean of the temporal s): centre frames 300.02, 299.98, 300.01, 299.99 → mean 300, Σd² = 0.001,
    // s = √(0.001/3) = 0.0182574; top-left 300.0, 300.1 → s = √(0.005) = 0.0707107; mean 0.0444840 K.
    const r = computePoint(imagerPoint())
    expect(r.errorK).toBeCloseTo(0.25, 6)
    expect(r.imager!.centreErrorK).toBeCloseTo(r.errorK, 12)
    expect(r.imager!.uniformity!.rangeK).toBeCloseTo(0.55, 10)
    expect(r.imager!.uniformity!.standardDeviationK).toBeCloseTo(Math.sqrt(0.176875 / 3), 10)
    expect(r.imager!.rois.map(x => [x.name, x.xPx, x.n])).toEqual([['centre', 150, 3], ['top-left', 40, 2], ['top-right', 260, 4], ['bottom', 150, 1]])
    expect(r.imager!.netd!.netdK).toBeCloseTo((Math.sqrt(0.001 / 3) + Math.sqrt(0.005)) / 2, 10)
    expect(r.n).toBe(3)
  })

  it('refuses readings that are not the centre ROI’s, and names the frame series’ faults as netdFrames…', () => {
    expect(fieldOf(() => computePoint(imagerPoint({ readingsK: [373.3, 373.5] })))).toBe('rois')
    const bad = imagerPoint()
    bad.imager!.netdFrames = [{ name: 'centre', framesK: [300] }]
    expect(fieldOf(() => computePoint(bad))).toBe('netdFrames[0].framesK')
  })
})

describe('the certificate’s calibration-equation table (Sakuma–Hattori through the as-left points)', () => {
  // The five as-left points of tests/unit/radiometry/calibrationEquation.test.ts (0.8–1.0 µm) with U and k.
  const BAND = { kind: 'rectangular', lambda1Um: 0.8, lambda2Um: 1.0 } as const
  const R5 = [872.4, 1072.1, 1271.65, 1471.2, 1670.9]
  const T5 = [873.15, 1073.15, 1273.15, 1473.15, 1673.15]
  const U5 = [1.6, 2.0, 2.4, 3.0, 3.6]
  const K5 = [2, 2, 2.1, 2, 2.2]
  const asLeft: EquationPoint[] = R5.map((r, i) => ({ stage: 'as-left', referenceTemperatureK: T5[i]!, meanReadingK: r, expandedUncertaintyK: U5[i]!, coverageFactor: K5[i]! }))
  const asFound: EquationPoint[] = asLeft.map(p => ({ ...p, stage: 'as-found', meanReadingK: p.meanReadingK - 3 }))

  it('matches scipy curve_fit at reference temperatures; an adjusted run fits its as-left points only', () => {
    // Printed by tests/reference/calibration_equation.py (scipy 1.17.1, scipy.optimize.curve_fit with absolute
    // sigma; the reading at T by scipy.optimize.brentq): case sh5, at T = 900, 1173.15, 1600 K the reading
    // R = 899.216530462, 1171.861612284, 1597.856938130 K with u = 0.6882162080, 0.7632936153, 1.124872808 K.
    const eq = equationTable({ band: BAND, points: [...asFound, ...asLeft], adjusted: true, temperaturesK: [900, 1173.15, 1600], pointCorrelation: 0 })
    expect(eq.pointCount).toBe(5)
    expect(eq.points).toBe('as-left')
    const ref: [number, number, number][] = [[900, 899.216530462, 0.688216208], [1173.15, 1171.861612284, 0.7632936153], [1600, 1597.85693813, 1.124872808]]
    ref.forEach(([t, r, u], i) => {
      const row = eq.rows[i]!
      expect(row.temperatureK).toBe(t)
      expect(Math.abs(row.readingK - r)).toBeLessThan(1e-6)
      expect(Math.abs(row.standardUncertaintyK - u) / u).toBeLessThan(1e-6)
      expect(row.expandedUncertaintyK).toBe(2 * row.standardUncertaintyK)
      expect(row.correctionK).toBeCloseTo(t - row.readingK, 12)
    })
    expect(eq.rangeK).toEqual({ min: 873.15, max: 1673.15 })
  })

  it('is refused outside the calibrated range and with fewer than three as-left points, naming the run’s field', () => {
    expect(fieldOf(() => equationTable({ band: BAND, points: asLeft, adjusted: false, temperaturesK: [900, 1700], pointCorrelation: 0 }))).toBe('calibrationEquation.temperaturesK[1]')
    expect(fieldOf(() => equationTable({ band: BAND, points: [...asFound, ...asLeft.slice(0, 2)], adjusted: true, temperaturesK: [900], pointCorrelation: 0 }))).toBe('calibrationEquation')
    expect(fieldOf(() => equationTable({ band: BAND, points: asLeft, adjusted: false, temperaturesK: [900], pointCorrelation: 1 }))).toBe('calibrationEquation.pointCorrelation')
  })

  it('correlated points: the uncertainty at a calibration point stays u_i when three points fix three parameters', () => {
    // Three points, three parameters: the curve passes through every point, f(R_i) = T_i, and
    // gᵀV_p g = (J⁻¹ V_y J⁻ᵀ)_ii-propagated = (V_y)_ii = u_i² whatever the correlation between the points.
    const three = asLeft.slice(0, 3)
    for (const r of [0, 0.6]) {
      const eq = fitCalibrationEquation({ points: three.map(p => ({ referenceTemperatureK: p.referenceTemperatureK, readingK: p.meanReadingK, expandedUncertaintyK: p.expandedUncertaintyK, coverageFactor: p.coverageFactor })), band: BAND, ...(r ? { correlation: [[1, r, r], [r, 1, r], [r, r, 1]] } : {}) })
      three.forEach((p) => {
        const v = calibrationEquationAtReading(eq, p.meanReadingK)
        expect(Math.abs(v.standardUncertaintyK - p.expandedUncertaintyK / p.coverageFactor)).toBeLessThan(1e-7)
      })
    }
  })
})

describe('interpolation uncertainty of a straight line with correlated points (hand calculation)', () => {
  it('u²(f(R)) = u²[(1 − r)(1/n + (R − R̄)²/Σ(R − R̄)²) + r]', () => {
    // Points (R, T) = (400, 400.5), (500, 500.2), (600, 600.4), U = 1 K, k = 2 → u = 0.5 K, all pairs correlated
    // with r (V_y = u²[(1 − r)I + r·11ᵀ]). With an intercept in the model the generalized least squares estimate
    // is the ordinary one, and Var(a, b) = u²(1 − r)(XᵀX)⁻¹ + u²r·e₁e₁ᵀ (X e₁ = 1), so at a reading R
    //   u²(f(R)) = u²[(1 − r)(1/n + (R − R̄)²/Sxx) + r], n = 3, R̄ = 500, Sxx = 2·100² = 20000.
    // r = 0.5:  R = 500: 0.25·(0.5·(1/3) + 0.5)            = 0.25·0.6666667 = 0.1666667 → u = 0.4082483 K
    //           R = 450: 0.25·(0.5·(1/3 + 2500/20000) + 0.5) = 0.25·0.7291667 = 0.1822917 → u = 0.4269563 K
    //           R = 600: 0.25·(0.5·(1/3 + 10000/20000) + 0.5) = 0.25·0.9166667 = 0.2291667 → u = 0.4787136 K
    // r = 0:    R = 450: 0.25·(1/3 + 0.125) = 0.1145833 → u = 0.3385016 K;  R = 500: 0.25/3 → u = 0.2886751 K
    const pts = [[400, 400.5], [500, 500.2], [600, 600.4]].map(([R, T]) => ({ referenceTemperatureK: T!, readingK: R!, expandedUncertaintyK: 1, coverageFactor: 2 }))
    const K = [[1, 0.5, 0.5], [0.5, 1, 0.5], [0.5, 0.5, 1]]
    const correlated = fitCalibrationEquation({ points: pts, model: 'linear', correlation: K })
    const independent = fitCalibrationEquation({ points: pts, model: 'linear' })
    for (const [R, u] of [[500, 0.4082483], [450, 0.4269563], [600, 0.4787136]] as const) expect(calibrationEquationAtReading(correlated, R).standardUncertaintyK).toBeCloseTo(u, 6)
    for (const [R, u] of [[450, 0.3385016], [500, 0.2886751]] as const) expect(calibrationEquationAtReading(independent, R).standardUncertaintyK).toBeCloseTo(u, 6)
    // the estimate itself does not change with r (GLS = OLS here): a = 37/60, b = 0.9995 (closed form in calibrationEquation.test.ts)
    expect(correlated.parameters[0]).toBeCloseTo(37 / 60, 8)
    expect(correlated.parameters[1]).toBeCloseTo(0.9995, 10)
  })
})
