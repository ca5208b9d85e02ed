/**
 * Where an order stands, from the records of its instruments (pure): the stages the customer
 * follows, each with the lab-local date it was reached, or null.
 *
 * - received: every instrument's receipt is recorded — the date of the last receipt;
 * - in calibration: data entered for any instrument — the date of the first point;
 * - in review: every run submitted for review (or approved) — the date of the last submission;
 * - certificate issued: every instrument has its certificate — the date of the last issue;
 * - returned: the laboratory recorded the return — its date.
 *
 * The current stage is the last one reached; "awaiting the instrument" before any. A later stage
 * reached while an earlier one is not (e.g. returned uncalibrated) still counts as reached.
 */
import { ORDER_STAGES, ORDER_STAGE_LABELS, type OrderStage } from './constants'

/** One instrument of an order, as its run and certificate record it (lab-local dates `YYYY-MM-DD`). */
export interface OrderItemFacts {
  receivedOn: string | null
  /** Date the first point of its run was entered. */
  firstPointOn: string | null
  /** Date its run was (last) submitted for review, while submitted or approved; null otherwise. */
  submittedOn: string | null
  /** Issue date of its (first) certificate. */
  certifiedOn: string | null
}

export interface OrderStep {
  stage: OrderStage
  label: string
  /** Lab-local date the stage was reached, or null. */
  date: string | null
  /** How far the instruments are ("1 of 2"), when only some have reached it. */
  detail: string | null
}

export interface OrderProgress {
  stage: OrderStage
  steps: OrderStep[]
}

const maxDate = (d: (string | null)[]) => (d.some(x => x === null) || !d.length ? null : (d as string[]).reduce((a, b) => (a > b ? a : b)))
const minDate = (d: (string | null)[]) => {
  const known = d.filter((x): x is string => x !== null)
  return known.length ? known.reduce((a, b) => (a < b ? a : b)) : null
}

/**
 * The order's stages with their dates, and its current stage.
 * @param items - one entry per instrument of the order
 * @param returnedOn - date of the return the laboratory recorded, or null
 * @example orderProgress([{ receivedOn: '2026-11-02', firstPointOn: null, submittedOn: null, certifiedOn: null }], null).stage // 'received'
 */
export function orderProgress(items: readonly OrderItemFacts[], returnedOn: string | null): OrderProgress {
  const n = items.length
  const count = (f: (i: OrderItemFacts) => string | null) => items.filter(i => f(i) !== null).length
  const partial = (k: number) => (k > 0 && k < n ? `${k} of ${n}` : null)
  const dates: Record<OrderStage, string | null> = {
    'awaiting': null,
    'received': n ? maxDate(items.map(i => i.receivedOn)) : null,
    'in-calibration': minDate(items.map(i => i.firstPointOn)),
    'in-review': n ? maxDate(items.map(i => i.submittedOn)) : null,
    'certified': n ? maxDate(items.map(i => i.certifiedOn)) : null,
    'returned': returnedOn,
  }
  const details: Record<OrderStage, string | null> = {
    'awaiting': null,
    'received': partial(count(i => i.receivedOn)),
    'in-calibration': null,
    'in-review': partial(count(i => i.submittedOn)),
    'certified': partial(count(i => i.certifiedOn)),
    'returned': null,
  }
  let stage: OrderStage = 'awaiting'
  for (const s of ORDER_STAGES) if (dates[s] !== null) stage = s
  return {
    stage,
    steps: ORDER_STAGES.filter(s => s !== 'awaiting').map(s => ({ stage: s, label: ORDER_STAGE_LABELS[s], date: dates[s], detail: details[s] })),
  }
}
