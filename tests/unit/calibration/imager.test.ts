import { describe, expect, it } from 'vitest'
import { imagerNetd, imagerPointStatistics, NETD_AGGREGATES, type ImagerNetdInput, type ImagerPointInput } from '../../../shared/calibration/imager'
import { EngineInputError } from '../../../shared/radiometry/errors'

// Arithmetic checked by hand below (mean; experimental standard deviation with n − 1, GUM 4.2.2).
const POINT: ImagerPointInput = {
  expectedReadingK: 373.15,
  rois: [
    { name: 'centre', readingsK: [373.3, 373.5, 373.4] },
    { name: 'top-left', readingsK: [373.0, 373.2] },
    { name: 'top-right', readingsK: [373.6, 373.6, 373.9, 373.5] },
    { name: 'bottom', readingsK: [373.2] },
  ],
}

describe('thermal imager: point statistics', () => {
  it('centre error, per-ROI s and uniformity (hand-computed)', () => {
    // centre: mean 373.4; deviations −0.1, +0.1, 0 → s² = 0.02/2 = 0.01, s = 0.1; s/√3 = 0.057735;
    //   error E = 373.4 − 373.15 = 0.25 K (VIM 2.16)
    // top-left: mean 373.1; s² = (0.01 + 0.01)/1 → s = √0.02 = 0.141421
    // top-right: mean 1494.6/4 = 373.65; deviations −0.05, −0.05, 0.25, −0.15 → Σ = 0.09, s² = 0.03, s = 0.173205
    // bottom: mean 373.2, one reading → s null
    // ROI means 373.4, 373.1, 373.65, 373.2: range 373.65 − 373.1 = 0.55 (max top-right, min top-left);
    //   their mean 1493.35/4 = 373.3375; deviations 0.0625, −0.2375, 0.3125, −0.1375 →
    //   Σ² = 0.00390625 + 0.05640625 + 0.09765625 + 0.01890625 = 0.176875, s² = 0.0589583, s = 0.242813;
    //   largest |mean − centre| = |373.1 − 373.4| = 0.3
    const r = imagerPointStatistics(POINT)
    expect(r.centre.name).toBe('centre')
    expect(r.centre.meanK).toBeCloseTo(373.4, 10)
    expect(r.centre.errorK).toBeCloseTo(0.25, 10)
    expect(r.centre.standardDeviationK).toBeCloseTo(0.1, 10)
    expect(r.centre.standardUncertaintyOfMeanK).toBeCloseTo(0.1 / Math.sqrt(3), 10)
    expect(r.rois.map((s) => s.n)).toEqual([3, 2, 4, 1])
    expect(r.rois[1]!.meanK).toBeCloseTo(373.1, 10)
    expect(r.rois[1]!.standardDeviationK).toBeCloseTo(Math.sqrt(0.02), 10)
    expect(r.rois[2]!.meanK).toBeCloseTo(373.65, 10)
    expect(r.rois[2]!.standardDeviationK).toBeCloseTo(Math.sqrt(0.03), 10)
    expect(r.rois[3]!.standardDeviationK).toBeNull()
    expect(r.uniformity!.rangeK).toBeCloseTo(0.55, 10)
    expect(r.uniformity!.maxRoi).toBe('top-right')
    expect(r.uniformity!.minRoi).toBe('top-left')
    expect(r.uniformity!.standardDeviationK).toBeCloseTo(Math.sqrt(0.176875 / 3), 10)
    expect(r.uniformity!.maxDeviationFromCentreK).toBeCloseTo(0.3, 10)
  })

  it('another centre name; a single ROI has no uniformity; one centre reading has no s', () => {
    const r = imagerPointStatistics({ ...POINT, centreRoi: 'top-right' })
    expect(r.centre.errorK).toBeCloseTo(0.5, 10) // 373.65 − 373.15
    expect(r.uniformity!.maxDeviationFromCentreK).toBeCloseTo(0.55, 10) // |373.1 − 373.65|
    const one = imagerPointStatistics({ expectedReadingK: 300, rois: [{ name: 'centre', readingsK: [300.4] }] })
    expect(one.uniformity).toBeNull()
    expect(one.centre.errorK).toBeCloseTo(0.4, 10)
    expect(one.centre.standardDeviationK).toBeNull()
    expect(one.centre.standardUncertaintyOfMeanK).toBeNull()
  })

  it('rejects bad inputs with the API field names', () => {
    const field = (patch: Partial<ImagerPointInput>): string => {
      try {
        imagerPointStatistics({ ...POINT, ...patch })
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    const rois = (i: number, readingsK: unknown[]): ImagerPointInput['rois'] => POINT.rois.map((r, j) => (j === i ? { ...r, readingsK: readingsK as number[] } : r))
    expect(field({})).toBe('no error')
    expect(field({ expectedReadingK: Number.NaN })).toBe('expectedReadingK')
    expect(field({ rois: [] })).toBe('rois')
    expect(field({ rois: rois(2, [373.5, Number.NaN]) })).toBe('rois[2].readingsK[1]')
    expect(field({ rois: rois(2, [-1]) })).toBe('rois[2].readingsK[0]')
    expect(field({ rois: rois(1, []) })).toBe('rois[1].readingsK')
    expect(field({ rois: rois(0, ['373' as unknown as number]) })).toBe('rois[0].readingsK[0]')
    expect(field({ rois: [...POINT.rois, { name: 'centre', readingsK: [1] }] })).toBe('rois[4].name')
    expect(field({ rois: [...POINT.rois, { name: ' ', readingsK: [1] }] })).toBe('rois[4].name')
    expect(field({ rois: [...POINT.rois, null as never] })).toBe('rois[4]')
    expect(field({ centreRoi: 'middle' })).toBe('centreRoi')
  })
})

describe('thermal imager: NETD', () => {
  const FRAMES: ImagerNetdInput = {
    rois: [
      { name: 'centre', framesK: [300.02, 299.98, 300.01, 299.99] },
      { name: 'left', framesK: [300.1, 300.14, 300.12] },
      { name: 'right', framesK: [299.95, 299.95, 299.99, 299.91] },
    ],
  }

  it('temporal s per ROI and their mean, median and rms (hand-computed)', () => {
    // centre: mean 300.00; deviations 0.02, −0.02, 0.01, −0.01 → Σ = 0.001, s² = 0.001/3, s = 0.0182574
    // left: mean 300.12; deviations −0.02, 0.02, 0 → s² = 0.0008/2 = 0.0004, s = 0.02
    // right: mean 299.95; deviations 0, 0, 0.04, −0.04 → s² = 0.0032/3 = 0.00106667, s = 0.0326599
    // mean of s: (0.0182574 + 0.02 + 0.0326599)/3 = 0.0236391; median 0.02;
    // rms: √((0.00033333 + 0.0004 + 0.00106667)/3) = √0.0006 = 0.0244949
    const r = imagerNetd(FRAMES)
    expect(r.aggregate).toBe('mean')
    expect(r.rois[0]!.meanK).toBeCloseTo(300, 10)
    expect(r.rois[0]!.temporalStandardDeviationK).toBeCloseTo(Math.sqrt(0.001 / 3), 10)
    expect(r.rois[1]!.temporalStandardDeviationK).toBeCloseTo(0.02, 10)
    expect(r.rois[2]!.temporalStandardDeviationK).toBeCloseTo(Math.sqrt(0.0032 / 3), 10)
    expect(r.netdK).toBeCloseTo((Math.sqrt(0.001 / 3) + 0.02 + Math.sqrt(0.0032 / 3)) / 3, 10)
    expect(r.netdK).toBeCloseTo(0.0236391, 6)
    expect(imagerNetd({ ...FRAMES, aggregate: 'median' }).netdK).toBeCloseTo(0.02, 10)
    expect(imagerNetd({ ...FRAMES, aggregate: 'rms' }).netdK).toBeCloseTo(Math.sqrt(0.0006), 10)
    // median of an even count is the mean of the middle two: s = 0.0182574 and 0.02 → 0.0191287
    expect(imagerNetd({ rois: FRAMES.rois.slice(0, 2), aggregate: 'median' }).netdK).toBeCloseTo((Math.sqrt(0.001 / 3) + 0.02) / 2, 10)
    expect(NETD_AGGREGATES).toEqual(['mean', 'median', 'rms'])
  })

  it('rejects bad inputs with the API field names', () => {
    const field = (input: ImagerNetdInput): string => {
      try {
        imagerNetd(input)
      } catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        return (e as EngineInputError).field
      }
      return 'no error'
    }
    expect(field({ rois: [] })).toBe('rois')
    expect(field({ rois: [{ name: 'centre', framesK: [300] }] })).toBe('rois[0].framesK')
    expect(field({ rois: [FRAMES.rois[0]!, { name: 'left', framesK: [300, Number.POSITIVE_INFINITY] }] })).toBe('rois[1].framesK[1]')
    expect(field({ ...FRAMES, aggregate: 'max' as never })).toBe('aggregate')
  })
})
