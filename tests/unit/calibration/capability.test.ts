// The capability check of a contract review (ISO/IEC 17025 7.1.1 c): every reason the laboratory
// cannot offer terms is named. Cases are built here from the rule itself (points inside the
// procedure's range and a CMC entry, the instrument's band inside the procedure's band, points
// inside the instrument's range).
import { describe, expect, it } from 'vitest'
import { checkCapability } from '../../../shared/calibration/capability'

const plate = { sourceKinds: ['flat-plate' as const], bandMinUm: 7, bandMaxUm: 15, minK: 253.15, maxK: 423.15 }
const cmc = [{ minK: 253.15, maxK: 323.15, expandedUncertaintyK: 0.6 }, { minK: 323.15, maxK: 423.15, expandedUncertaintyK: 0.8 }]
const spot = { id: 1, label: 'Spot 8 SN-1', rangeMinK: 243.15, rangeMaxK: 773.15, bandMinUm: 8, bandMaxUm: 14 }

describe('checkCapability', () => {
  it('passes points inside the range and CMC, for an instrument whose band the procedure covers; the CMC is the larger at a boundary', () => {
    const f = checkCapability({ pointsK: [273.15, 323.15, 373.15], applicability: plate, cmc, instruments: [spot] })
    expect(f.every(x => x.ok)).toBe(true)
    expect(f.find(x => x.pointK === 323.15 && x.message.startsWith('CMC'))!.message).toBe('CMC at 50 °C: 0.8 K (k = 2)')
  })

  it('names each failing reason: point outside the procedure, point no CMC covers, band outside, point outside the instrument', () => {
    const narrow = { ...spot, id: 2, label: 'Narrow', rangeMinK: 300, rangeMaxK: 400 }
    const shortWave = { ...spot, id: 3, label: 'Short', bandMinUm: 2, bandMaxUm: 2.4 }
    const f = checkCapability({ pointsK: [273.15, 473.15], applicability: plate, cmc, instruments: [narrow, shortWave] })
    const failed = f.filter(x => !x.ok).map(x => x.message)
    expect(failed).toContain('200 °C is outside the procedure\'s range (\u221220 °C to 150 °C)')
    expect(failed).toContain('No CMC covers 200 °C')
    expect(failed).toContain('Short: band 2–2.4 µm is outside the procedure\'s 7–15 µm')
    expect(failed).toContain('Narrow: 0 °C is outside its range (26.85 °C to 126.85 °C)')
    expect(failed).toHaveLength(5) // the range and CMC at 200 °C, Short's band, both points outside Narrow's range
  })

  it('refuses a procedure that does not say what it applies to', () => {
    const f = checkCapability({ pointsK: [300], applicability: null, cmc, instruments: [spot] })
    expect(f).toHaveLength(1)
    expect(f[0]!.ok).toBe(false)
  })
})
