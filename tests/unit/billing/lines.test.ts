// Quote lines from the price list, what is owed once the work is recorded, and credit lines.
// Prices are invented for the test; every expected line is worked by hand beside it.
import { describe, expect, it } from 'vitest'
import { creditLinesFor, owedLines, owedQuantity, priceItemFor, quoteLinesFrom, type BillingLine, type InstrumentWork, type PriceItem } from '../../../shared/billing/lines'
import { totalsOf } from '../../../shared/billing/money'

const ITEMS: PriceItem[] = [
  { label: 'Flat plate, 8–14 µm', procedureId: 4, instrumentKind: null, priceMinor: 18000, includedPoints: 3, extraPointMinor: 2500 },
  { label: 'Thermal imager', procedureId: null, instrumentKind: 'thermal-imager', priceMinor: 42000, includedPoints: 5, extraPointMinor: 4000 },
  { label: 'Any other calibration', procedureId: null, instrumentKind: null, priceMinor: 25000, includedPoints: 4, extraPointMinor: 3000 },
]
const EXTRAS = { expressMinor: 9000, onSiteMinor: 35000, adjustmentMinor: 6000 }

describe('priceItemFor', () => {
  it('prefers the procedure’s price, then the instrument kind’s, then the general one', () => {
    expect(priceItemFor(ITEMS, 4, 'thermal-imager')!.label).toBe('Flat plate, 8–14 µm')
    expect(priceItemFor(ITEMS, 9, 'thermal-imager')!.label).toBe('Thermal imager')
    expect(priceItemFor(ITEMS, 9, 'spot-infrared')!.label).toBe('Any other calibration')
    expect(priceItemFor(ITEMS.slice(0, 2), 9, 'spot-infrared')).toBeNull()
  })
})

describe('quoteLinesFrom', () => {
  it('one calibration per instrument, the points beyond the included ones, one on-site line', () => {
    const { lines, unpriced } = quoteLinesFrom(ITEMS, EXTRAS, {
      instruments: [{ id: 1, kind: 'spot-infrared', label: 'SN-1' }, { id: 2, kind: 'spot-infrared', label: 'SN-2' }],
      procedureId: 4,
      pointsCount: 5,
      onSite: true,
    })
    expect(unpriced).toEqual([])
    expect(lines.map(l => [l.kind, l.instrumentId, l.quantity, l.unitPriceMinor, l.includedPoints])).toEqual([
      ['calibration', 1, 1, 18000, null],
      ['extra-points', 1, 2, 2500, 3], // 5 points, 3 included → 2 more at £25
      ['calibration', 2, 1, 18000, null],
      ['extra-points', 2, 2, 2500, 3],
      ['on-site', null, 1, 35000, null],
    ])
    // 2 × (180 + 2 × 25) + 350 = 810.00; 20 % = 162.00.
    expect(totalsOf(lines, 2000)).toEqual({ netMinor: 81000, taxMinor: 16200, grossMinor: 97200 })
  })
  it('no additional line within the included points; an instrument without a price is named and priced 0', () => {
    const { lines, unpriced } = quoteLinesFrom(ITEMS.slice(0, 1), EXTRAS, { instruments: [{ id: 7, kind: 'thermal-imager', label: 'TI-7' }], procedureId: 9, pointsCount: 2, onSite: false })
    expect(unpriced).toEqual(['TI-7'])
    expect(lines).toHaveLength(1)
    expect(lines[0]!.unitPriceMinor).toBe(0)
  })
})

const line = (over: Partial<BillingLine>): BillingLine => ({ kind: 'calibration', instrumentId: 1, description: 'x', quantity: 1, unitPriceMinor: 100, includedPoints: null, ...over })

describe('owedQuantity', () => {
  it('nothing for a withdrawn certificate; additional points no more than certified beyond the included', () => {
    const extra = line({ kind: 'extra-points', quantity: 3, includedPoints: 5 })
    expect(owedQuantity(extra, { certificate: 'valid', certifiedPoints: 8 })).toBe(3)
    expect(owedQuantity(extra, { certificate: 'valid', certifiedPoints: 6 })).toBe(1)
    expect(owedQuantity(extra, { certificate: 'valid', certifiedPoints: 4 })).toBe(0)
    // More points certified than quoted: never more than quoted.
    expect(owedQuantity(extra, { certificate: 'valid', certifiedPoints: 12 })).toBe(3)
    expect(owedQuantity(extra, { certificate: 'none', certifiedPoints: null })).toBe(3)
    expect(owedQuantity(line({}), { certificate: 'withdrawn', certifiedPoints: null })).toBe(0)
    expect(owedQuantity(extra, { certificate: 'withdrawn', certifiedPoints: null })).toBe(0)
    // A line of the whole order is owed whatever happened to one instrument.
    expect(owedQuantity(line({ kind: 'on-site', instrumentId: null }), { certificate: 'withdrawn', certifiedPoints: null })).toBe(1)
  })
})

describe('credit lines', () => {
  const invoiced = [line({ instrumentId: 1 }), line({ kind: 'extra-points', instrumentId: 1, quantity: 2, includedPoints: 3 }), line({ instrumentId: 2 }), line({ kind: 'on-site', instrumentId: null })]
  it('a withdrawal gives back that instrument’s lines, once', () => {
    const work = new Map<number, InstrumentWork>([[1, { certificate: 'withdrawn', certifiedPoints: null }], [2, { certificate: 'valid', certifiedPoints: 3 }]])
    const first = creditLinesFor(invoiced, new Map(), work)
    expect(first.map(l => [l.invoiceLine, l.quantity])).toEqual([[0, 1], [1, 2]])
    expect(first[0]!.description).toBe('Credit: x')
    const credited = new Map(first.map(l => [l.invoiceLine, l.quantity]))
    expect(creditLinesFor(invoiced, credited, work)).toEqual([])
  })
  it('an amendment with fewer points gives back the points no longer certified', () => {
    const work = new Map<number, InstrumentWork>([[1, { certificate: 'valid', certifiedPoints: 4 }], [2, { certificate: 'valid', certifiedPoints: 3 }]])
    expect(creditLinesFor(invoiced, new Map(), work).map(l => [l.invoiceLine, l.quantity])).toEqual([[1, 1]])
  })
  it('owed lines of a quote leave out what is owed nothing', () => {
    const work = new Map<number, InstrumentWork>([[1, { certificate: 'withdrawn', certifiedPoints: null }], [2, { certificate: 'valid', certifiedPoints: 3 }]])
    expect(owedLines(invoiced, work).map(l => [l.kind, l.instrumentId])).toEqual([['calibration', 2], ['on-site', null]])
  })
})
