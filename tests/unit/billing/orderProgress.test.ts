// The stages an order's customer follows, from the records of its instruments (dates invented).
import { describe, expect, it } from 'vitest'
import { orderProgress, type OrderItemFacts } from '../../../shared/billing/orderProgress'

const none: OrderItemFacts = { receivedOn: null, firstPointOn: null, submittedOn: null, certifiedOn: null }

describe('orderProgress', () => {
  it('awaits the instrument until a receipt is recorded', () => {
    const p = orderProgress([none], null)
    expect(p.stage).toBe('awaiting')
    expect(p.steps.map(s => s.stage)).toEqual(['received', 'in-calibration', 'in-review', 'certified', 'returned'])
    expect(p.steps.every(s => s.date === null)).toBe(true)
  })
  it('received only when every instrument is, on the last receipt’s date; "1 of 2" before', () => {
    const half = orderProgress([{ ...none, receivedOn: '2026-11-02' }, none], null)
    expect(half.stage).toBe('awaiting')
    expect(half.steps[0]).toMatchObject({ stage: 'received', date: null, detail: '1 of 2' })
    const both = orderProgress([{ ...none, receivedOn: '2026-11-02' }, { ...none, receivedOn: '2026-11-04' }], null)
    expect(both.stage).toBe('received')
    expect(both.steps[0]).toMatchObject({ date: '2026-11-04', detail: null })
  })
  it('in calibration from the first point of any instrument; in review, certified and returned in turn', () => {
    const a = { receivedOn: '2026-11-02', firstPointOn: '2026-11-05', submittedOn: '2026-11-06', certifiedOn: '2026-11-09' }
    const b = { receivedOn: '2026-11-03', firstPointOn: '2026-11-04', submittedOn: null, certifiedOn: null }
    const p = orderProgress([a, b], null)
    expect(p.stage).toBe('in-calibration')
    expect(p.steps[1]).toMatchObject({ stage: 'in-calibration', date: '2026-11-04' })
    expect(p.steps[2]).toMatchObject({ stage: 'in-review', date: null, detail: '1 of 2' })
    const done = orderProgress([a, { ...b, submittedOn: '2026-11-07', certifiedOn: '2026-11-10' }], '2026-11-12')
    expect(done.stage).toBe('returned')
    expect(done.steps.map(s => s.date)).toEqual(['2026-11-03', '2026-11-04', '2026-11-07', '2026-11-10', '2026-11-12'])
  })
  it('an instrument returned without calibration shows as returned', () => {
    expect(orderProgress([{ ...none, receivedOn: '2026-11-02' }], '2026-11-03').stage).toBe('returned')
  })
})
