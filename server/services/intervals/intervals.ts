/**
 * Calibration-interval review (ISO/IEC 17025:2017 6.4.7; ILAC-G24:2007 / OIML D 10:2007) from an
 * item's as-found history, by the pure methods of shared/quality/intervals.ts:
 * - staircase: lengthen or shorten the interval that has just ended by the factors the laboratory
 *   sets, from the latest as-found result (in tolerance, and how much of the tolerance it used);
 * - drift: fit the as-found deviation against time and take the longest interval keeping the
 *   predicted deviation plus k·u inside the tolerance.
 * For the laboratory's sources and reference instruments the history is the as-found corrections on
 * their calibration records, read at one temperature; a decision is recorded (audited). For a
 * customer's instrument the same analysis is shown to the laboratory only, from the as-found
 * points of its approved runs (error E, u = U/k, the tolerance of its specification); no decision is
 * recorded and no interval is printed on its certificate unless agreed with the customer (7.8.4.3).
 */
import { EngineInputError } from '#shared/radiometry/errors'
import { driftInterval, referenceCorrectionAt, staircaseInterval, type AsFoundPoint } from '#shared/quality'
import type { IntervalItemType } from '#shared/quality/constants'
import type { EquipmentType } from '#shared/registers/constants'
import { intervalReviewQuerySchema, type IntervalDecisionInput, type IntervalReviewQuery } from '#shared/schemas/interval'
import type { AsFoundHistoryPoint, IntervalDecisionDTO, IntervalReviewDTO, SessionUser } from '#shared/types'
import { fieldErrors } from '#shared/schemas/errors'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { EquipmentCalibration } from '#server/models/EquipmentCalibration'
import { Instrument } from '#server/models/Instrument'
import { IntervalDecision } from '#server/models/IntervalDecision'
import { RunPoint } from '#server/models/RunPoint'
import { createAudited } from '#server/utils/audit'
import { invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { equipmentLabel, findEquipment, userNames } from '#server/services/quality/records'
import { labToday } from '#server/services/settings/today'

/** Whole calendar months from one date to another (a month counts once its day is reached). */
export function monthsBetween(from: string, to: string): number {
  const [y1, m1, d1] = from.split('-').map(Number) as [number, number, number]
  const [y2, m2, d2] = to.split('-').map(Number) as [number, number, number]
  return (y2 - y1) * 12 + (m2 - m1) - (d2 < d1 ? 1 : 0)
}

/** The temperature most records cover (ties: the lowest), K. */
function commonest(lists: number[][]): number | null {
  const count = new Map<number, number>()
  for (const l of lists) for (const t of new Set(l.map(v => Math.round(v * 100) / 100))) count.set(t, (count.get(t) ?? 0) + 1)
  return [...count].sort((a, b) => b[1] - a[1] || a[0] - b[0])[0]?.[0] ?? null
}

interface History {
  label: string
  temperaturesK: number[]
  temperatureK: number | null
  history: AsFoundHistoryPoint[]
  currentMonths: number | null
  /** Largest |deviation| / tolerance of the latest as-found result over all its values, and whether it was in tolerance. */
  latest: { fraction: number, inTolerance: boolean } | null
  notes: string[]
}

async function equipmentHistory(type: EquipmentType, id: number, q: IntervalReviewQuery): Promise<History> {
  const item = await findEquipment(type, id)
  if (!item) notFound(equipmentLabel(type))
  const cals = await EquipmentCalibration.findAll({ where: { equipmentType: type, equipmentId: id }, order: [['calibrationDate', 'ASC'], ['id', 'ASC']] })
  const withData = cals.filter(c => c.asFoundCorrections?.length && c.asFoundUncertaintyK && c.asFoundToleranceK)
  const temperaturesK = [...new Set(withData.flatMap(c => c.asFoundCorrections!.map(([t]) => Math.round(t * 100) / 100)))].sort((a, b) => a - b)
  const temperatureK = q.temperatureK ?? commonest(withData.map(c => c.asFoundCorrections!.map(([t]) => t)))
  const notes: string[] = []
  const history: AsFoundHistoryPoint[] = []
  if (temperatureK !== null) {
    for (const c of withData) {
      const d = referenceCorrectionAt(c.asFoundCorrections!, temperatureK)
      if (d === null) continue
      history.push({ date: c.calibrationDate, deviationK: d, standardUncertaintyK: c.asFoundUncertaintyK!, toleranceK: c.asFoundToleranceK, inTolerance: c.asFoundInTolerance ?? null, sourceRecord: `calibration:${c.id}` })
    }
  }
  const last = cals[cals.length - 1]
  const lastData = last && withData.includes(last) ? last : null
  if (!withData.length) notes.push('No calibration of this item records as-found data: record them with its calibrations to review the interval')
  else if (!lastData) notes.push('The latest calibration records no as-found data: the staircase needs them')
  return {
    label: item.assetTag,
    temperaturesK,
    temperatureK,
    history,
    currentMonths: last ? monthsBetween(last.calibrationDate, last.dueDate) : null,
    latest: lastData
      ? { fraction: Math.max(...lastData.asFoundCorrections!.map(([, d]) => Math.abs(d))) / lastData.asFoundToleranceK!, inTolerance: !!lastData.asFoundInTolerance }
      : null,
    notes,
  }
}

async function instrumentHistory(id: number, q: IntervalReviewQuery): Promise<History> {
  const instrument = await Instrument.findByPk(id)
  if (!instrument) notFound('instrument')
  const runs = await CalibrationRun.findAll({ where: { instrumentId: id, status: 'approved' }, order: [['calibrationDate', 'ASC'], ['id', 'ASC']] })
  const points = runs.length ? await RunPoint.findAll({ where: { runId: runs.map(r => r.id), stage: 'as-found', voidedAt: null } }) : []
  const byRun = new Map<number, RunPoint[]>()
  for (const p of points) byRun.set(p.runId, [...(byRun.get(p.runId) ?? []), p])
  const used = runs.filter(r => byRun.has(r.id))
  const temperaturesK = [...new Set(points.map(p => Math.round(p.setPointK * 100) / 100))].sort((a, b) => a - b)
  const temperatureK = q.temperatureK ?? commonest(used.map(r => byRun.get(r.id)!.map(p => p.setPointK)))
  const history: AsFoundHistoryPoint[] = []
  if (temperatureK !== null) {
    for (const r of used) {
      const near = byRun.get(r.id)!.filter(p => Math.abs(p.setPointK - temperatureK) <= 1).sort((a, b) => Math.abs(a.setPointK - temperatureK) - Math.abs(b.setPointK - temperatureK))[0]
      if (!near) continue
      const k = near.result.budget.cmcApplied ? 2 : near.result.budget.coverageFactor
      const tl = near.result.conformity?.tolerance ?? null
      history.push({ date: r.calibrationDate, deviationK: near.errorK, standardUncertaintyK: near.statedUncertaintyK / k, toleranceK: tl, inTolerance: tl === null ? null : Math.abs(near.errorK) <= tl, sourceRecord: `run:${r.id}` })
    }
  }
  const lastRun = used[used.length - 1]
  const lastPoints = lastRun ? byRun.get(lastRun.id)!.filter(p => p.result.conformity?.tolerance > 0) : []
  const notes = used.length ? [] : ['No approved run of this instrument has as-found points']
  return {
    label: instrument.serial,
    temperaturesK,
    temperatureK,
    history,
    currentMonths: instrument.calibrationIntervalMonths,
    latest: lastPoints.length
      ? { fraction: Math.max(...lastPoints.map(p => Math.abs(p.errorK) / p.result.conformity.tolerance)), inTolerance: lastPoints.every(p => Math.abs(p.errorK) <= p.result.conformity.tolerance) }
      : null,
    notes,
  }
}

/** The analysis of an item's interval with the laboratory's settings (see the module notes). */
export async function intervalReview(type: IntervalItemType, id: number, q: IntervalReviewQuery): Promise<IntervalReviewDTO> {
  const h = type === 'instrument' ? await instrumentHistory(id, q) : await equipmentHistory(type, id, q)
  const notes = [...h.notes]
  let staircase: IntervalReviewDTO['staircase'] = null
  if (h.latest && h.currentMonths && h.currentMonths >= 1) {
    const input = {
      currentMonths: h.currentMonths,
      foundInTolerance: h.latest.inTolerance,
      lengthenFactor: q.lengthenFactor,
      shortenFactor: q.shortenFactor,
      minMonths: q.minMonths,
      maxMonths: q.maxMonths,
      fractionOfTolerance: h.latest.fraction,
      lengthenWithinFraction: q.lengthenWithinFraction,
    }
    try {
      staircase = { input, result: staircaseInterval(input) }
    }
    catch (err) {
      if (!(err instanceof EngineInputError)) throw err
      notes.push(`Staircase: ${err.message}`)
    }
  }
  let drift: IntervalReviewDTO['drift'] = null
  const tolerance = [...h.history].reverse().find(p => p.toleranceK)?.toleranceK ?? null
  if (h.history.length >= 2 && tolerance) {
    const input = {
      history: h.history.map((p): AsFoundPoint => ({ date: p.date, deviation: p.deviationK, standardUncertainty: p.standardUncertaintyK })),
      tolerance,
      coverageFactor: q.coverageFactor,
      maxMonths: q.maxMonths,
      weighting: q.weighting,
    }
    try {
      drift = { input: { ...input, temperatureK: h.temperatureK }, result: driftInterval(input) }
    }
    catch (err) {
      if (!(err instanceof EngineInputError)) throw err
      notes.push(`Drift: ${err.message}`)
    }
  }
  else if (h.history.length < 2) {
    notes.push(`Drift: ${h.history.length} as-found result(s)${h.temperatureK ? ` at ${h.temperatureK} K` : ''}; the fit needs at least 2 on different dates`)
  }
  const decisions = type === 'instrument' ? [] : await IntervalDecision.findAll({ where: { itemType: type, itemId: id }, order: [['decidedOn', 'DESC'], ['id', 'DESC']] })
  const names = await userNames(decisions.map(d => d.decidedBy))
  return {
    item: { type, id, label: h.label },
    temperatureK: h.temperatureK,
    temperaturesK: h.temperaturesK,
    history: h.history,
    currentMonths: h.currentMonths,
    staircase,
    drift,
    notes,
    customerInstrument: type === 'instrument',
    decisions: decisions.map((d): IntervalDecisionDTO => ({
      id: d.id,
      itemType: d.itemType,
      itemId: d.itemId,
      method: d.method,
      proposedMonths: d.proposedMonths ?? null,
      decidedMonths: d.decidedMonths,
      reason: d.reason,
      decidedOn: d.decidedOn,
      decidedByName: names.get(d.decidedBy) ?? null,
      analysis: d.analysis,
      createdAt: d.createdAt.toISOString(),
    })),
  }
}

/**
 * Record the interval decided for a source or reference instrument, with the analysis it was based
 * on (the review with `settings`, as shown) and the method's proposal; audited.
 */
export async function recordIntervalDecision(user: SessionUser, type: EquipmentType, id: number, input: IntervalDecisionInput): Promise<IntervalReviewDTO> {
  const parsed = intervalReviewQuerySchema.safeParse(input.settings ?? {})
  if (!parsed.success) invalidInput(Object.fromEntries(Object.entries(fieldErrors(parsed.error)).map(([f, m]) => [`settings.${f}`, m])))
  const review = await intervalReview(type, id, parsed.data)
  const proposed = input.method === 'staircase' ? review.staircase?.result.proposedMonths ?? null : input.method === 'drift' ? review.drift?.result.months ?? null : null
  if (input.method !== 'other' && proposed === null) invalidInput({ method: `The ${input.method} method gives no proposal for this item (${review.notes.join('; ') || 'too little data'}): choose "other" and state the reason` })
  await inTransaction(async (t) => {
    await createAudited(t, user, IntervalDecision, {
      itemType: type,
      itemId: id,
      method: input.method,
      proposedMonths: proposed,
      decidedMonths: input.decidedMonths,
      reason: input.reason,
      analysis: { settings: parsed.data, temperatureK: review.temperatureK, history: review.history, staircase: review.staircase, drift: review.drift ? { input: review.drift.input, result: { ...review.drift.result, series: undefined } } : null },
      decidedOn: await labToday(new Date(), t),
      decidedBy: user.id,
    }, { entity: 'IntervalDecision' })
  })
  return intervalReview(type, id, parsed.data)
}
