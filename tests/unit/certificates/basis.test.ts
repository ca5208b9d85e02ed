// What a certificate says the reference temperature is (its basis) and the source emissivity used,
// written from the points' stored inputs; and how it prints the probability of conformity (JCGM 106).
import { describe, expect, it } from 'vitest'
import { computePoint } from '../../../shared/calibration/compute'
import type { PointComputationInput, ReferenceBasisInput } from '../../../shared/types/runs'
import { basisStatement } from '../../../server/services/certificates/basis'
import { probabilityText } from '../../../server/services/certificates/pdf'

const LW = { kind: 'rectangular', lambda1Um: 8, lambda2Um: 14 } as const
const at = (basis: ReferenceBasisInput | null, over: Partial<PointComputationInput> = {}) => computePoint({
  band: LW,
  reference: basis ? { kind: 'source-correction', sourceIndicatedK: 373.15, corrections: [[200, 0], [500, 0]], basis } : { kind: 'reference-thermometer', referenceReadingK: 373.2 },
  sourceEmissivity: 0.95, reflectedTemperatureK: 296.15, instrumentTemperatureK: 296.65, emissivitySetting: 0.95,
  readingsK: [373.2], resolutionK: 0.1, template: [], cmc: [], accuracy: { kind: 'absolute', b: 1 }, rule: 'simple-acceptance', guardBandFactor: null,
  ...over,
})

describe('basisStatement', () => {
  it('a radiance temperature names its band, the medium of its wavelengths, the surroundings and the emissivity used', () => {
    const r = at({ kind: 'radiance-temperature', band: { ...LW, medium: 'air' }, reflectedTemperatureK: 296.15 })
    const s = basisStatement({ assetTag: 'BB-FP-01', kind: 'flat-plate' }, [r], [])
    expect(s).toContain('BB-FP-01 (flat plate): its calibration certificate states radiance temperatures in 8–14 µm (wavelengths in air)')
    expect(s).toContain('emissivity setting 1')
    expect(s).toContain('with the surroundings at 23.0 °C') // 296.15 K − 273.15
    expect(s).toContain('The emissivity of BB-FP-01 used in the reading model is 0.95 in the instrument’s band.')
  })
  it('a cavity temperature, and a reference thermometer read in the source', () => {
    const s = basisStatement({ assetTag: 'BB-CV-02', kind: 'cavity' }, [at({ kind: 'cavity-temperature' }, { sourceEmissivity: 0.9978 }), at(null, { sourceEmissivity: 0.9978 })], ['REF-PRT-02'])
    expect(s).toContain('BB-CV-02 (cavity): its calibration certificate states the source’s cavity temperature')
    expect(s).toContain('Where a reference thermometer (REF-PRT-02) is listed for BB-CV-02, the reference temperature is its reading in the source.')
    expect(s).toContain('is 0.9978 in the instrument’s band')
  })
})

describe('probabilityText', () => {
  it('one decimal of a percent, never 0 % or 100 %', () => {
    expect(probabilityText(0.94456)).toBe('94.5 %')
    expect(probabilityText(0.99996)).toBe('above 99.9 %')
    expect(probabilityText(0.0001)).toBe('below 0.1 %')
  })
})
