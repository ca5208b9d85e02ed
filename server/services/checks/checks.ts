/**
 * Intermediate checks of the laboratory's sources and reference instruments (ISO/IEC 17025:2017
 * 6.4.10, 7.7.1): a plan per item (what, how, how often, at which values, judged by a limit or by
 * |E_n| ≤ 1), the results (nominal, measured, U, who, when; judged by shared/quality/checks.ts), and
 * a Shewhart individuals chart per plan and nominal value (shared/quality/controlChart.ts). A failed
 * check takes the item out of service with the reason — the run form's setup check then refuses it,
 * naming item and reason — and raises a nonconformity listing the work done with the item since the
 * last good evidence, with issuing withheld.
 */
import { Op, type Transaction } from 'sequelize'
import { EngineInputError } from '#shared/radiometry/errors'
import { addDays, daysBetween } from '#shared/mail/milestones'
import { CHECK_DUE_WINDOW_DAYS } from '#shared/quality/constants'
import { controlChart, evaluateCheck, runRuleLabels } from '#shared/quality'
import { LAB_ROLES } from '#shared/roles'
import type { CheckPlanCreateInput, CheckPlanQuery, CheckPlanUpdateInput, CheckResultCreateInput, CheckResultQuery, ControlChartQuery } from '#shared/schemas/check'
import { checkPlanMergedSchema } from '#shared/schemas/check'
import type { CheckPlanDTO, CheckPlanDetailDTO, CheckRecordedDTO, CheckResultDTO, ControlChartDTO, Page, SessionUser } from '#shared/types'
import { CheckPlan } from '#server/models/CheckPlan'
import { CheckResult } from '#server/models/CheckResult'
import { Nonconformity } from '#server/models/Nonconformity'
import { User } from '#server/models/User'
import { createAudited, updateAudited } from '#server/utils/audit'
import { assertVersion, conflict, engine, invalidInput, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { checkMerged } from '#server/utils/validation'
import { auditTrail } from '#server/services/audit/trail'
import { nonconformityDTOs } from '#server/services/nonconformities/nonconformities'
import { affectedPeriod, raiseNonconformityIn, takeOutOfServiceIn } from '#server/services/nonconformities/raise'
import { equipmentTags, findEquipment, userNames } from '#server/services/quality/records'
import { labToday } from '#server/services/settings/today'
import { readTogether } from '#server/utils/db'

/** Plans with their last check, next due date and due state (lab-local `today`). */
export async function checkPlanDTOs(plans: CheckPlan[], today: string, t?: Transaction): Promise<CheckPlanDTO[]> {
  if (!plans.length) return []
  const [results, tags] = await readTogether(t, [
    () => CheckResult.findAll({ where: { planId: plans.map(p => p.id) }, attributes: ['planId', 'checkedOn', 'verdict', 'id'], order: [['checkedOn', 'DESC'], ['id', 'DESC']], transaction: t }),
    () => equipmentTags(plans.map(p => ({ type: p.equipmentType, id: p.equipmentId })), t),
  ])
  const last = new Map<number, CheckResult>()
  for (const r of results) if (!last.has(r.planId)) last.set(r.planId, r)
  return plans.map((p) => {
    const l = last.get(p.id)
    const nextDueOn = l ? addDays(l.checkedOn, p.intervalDays) : p.startOn
    const dueState: CheckPlanDTO['dueState'] = !p.active ? 'inactive' : nextDueOn < today ? 'overdue' : daysBetween(today, nextDueOn) <= CHECK_DUE_WINDOW_DAYS ? 'due' : 'ok'
    return {
      id: p.id,
      equipmentType: p.equipmentType,
      equipmentId: p.equipmentId,
      equipmentTag: tags.get(`${p.equipmentType}:${p.equipmentId}`) ?? null,
      title: p.title,
      method: p.method,
      intervalDays: p.intervalDays,
      acceptance: p.acceptance,
      acceptanceLimitK: p.acceptanceLimitK ?? null,
      nominalsK: p.nominalsK,
      startOn: p.startOn,
      active: !!p.active,
      lastCheckedOn: l?.checkedOn ?? null,
      lastVerdict: l?.verdict ?? null,
      nextDueOn,
      dueState,
      version: p.version,
      createdAt: p.createdAt.toISOString(),
      updatedAt: p.updatedAt.toISOString(),
    }
  })
}

export async function checkResultDTOs(rows: CheckResult[], t?: Transaction): Promise<CheckResultDTO[]> {
  if (!rows.length) return []
  const [plans, tags, names, ncs] = await readTogether(t, [
    () => CheckPlan.findAll({ where: { id: [...new Set(rows.map(r => r.planId))] }, attributes: ['id', 'title'], transaction: t }),
    () => equipmentTags(rows.map(r => ({ type: r.equipmentType, id: r.equipmentId })), t),
    () => userNames(rows.map(r => r.performedBy), t),
    () => Nonconformity.findAll({ where: { id: rows.map(r => r.nonconformityId).filter((v): v is number => !!v) }, attributes: ['id', 'number'], transaction: t }),
  ])
  const title = new Map(plans.map(p => [p.id, p.title]))
  const ncNumber = new Map(ncs.map(n => [n.id, n.number]))
  return rows.map(r => ({
    id: r.id,
    planId: r.planId,
    planTitle: title.get(r.planId) ?? null,
    equipmentType: r.equipmentType,
    equipmentId: r.equipmentId,
    equipmentTag: tags.get(`${r.equipmentType}:${r.equipmentId}`) ?? null,
    checkedOn: r.checkedOn,
    nominalK: r.nominalK,
    nominalUncertaintyK: r.nominalUncertaintyK ?? null,
    measuredK: r.measuredK,
    expandedUncertaintyK: r.expandedUncertaintyK ?? null,
    deviationK: r.deviationK,
    en: r.en ?? null,
    verdict: r.verdict,
    statement: r.statement,
    performedBy: r.performedBy,
    performedByName: names.get(r.performedBy) ?? null,
    notes: r.notes ?? null,
    nonconformityId: r.nonconformityId ?? null,
    nonconformityNumber: r.nonconformityId ? ncNumber.get(r.nonconformityId) ?? null : null,
    createdAt: r.createdAt.toISOString(),
  }))
}

export async function listCheckPlans(q: CheckPlanQuery): Promise<CheckPlanDTO[]> {
  const where: Record<string, unknown> = {}
  if (q.equipmentType) where.equipmentType = q.equipmentType
  if (q.equipmentId) where.equipmentId = q.equipmentId
  if (q.active !== 'all') where.active = q.active === 'true'
  const plans = await CheckPlan.findAll({ where, order: [['equipmentType', 'ASC'], ['equipmentId', 'ASC'], ['id', 'ASC']], limit: 1000 })
  return checkPlanDTOs(plans, await labToday())
}

export async function checkPlanDetail(id: number): Promise<CheckPlanDetailDTO> {
  const plan = await CheckPlan.findByPk(id)
  if (!plan) notFound('check plan')
  const [dto] = await checkPlanDTOs([plan], await labToday())
  const results = await CheckResult.findAll({ where: { planId: id }, order: [['checkedOn', 'DESC'], ['id', 'DESC']], limit: 1000 })
  return { ...dto!, results: await checkResultDTOs(results), audit: await auditTrail('CheckPlan', id) }
}

/** A plan for an existing item (400 naming `equipmentId` otherwise). */
export async function createCheckPlanIn(t: Transaction, actor: { id: number }, input: CheckPlanCreateInput): Promise<CheckPlan> {
  const item = await findEquipment(input.equipmentType, input.equipmentId, t)
  if (!item) invalidInput({ equipmentId: `No ${input.equipmentType === 'source' ? 'blackbody source' : 'reference instrument'} with this id` })
  return createAudited(t, actor, CheckPlan, { ...input, acceptanceLimitK: input.acceptance === 'limit' ? input.acceptanceLimitK : null, createdBy: actor.id }, { entity: 'CheckPlan' })
}

export async function createCheckPlan(user: SessionUser, input: CheckPlanCreateInput): Promise<CheckPlanDetailDTO> {
  const plan = await inTransaction(t => createCheckPlanIn(t, user, input))
  return checkPlanDetail(plan.id)
}

export async function updateCheckPlan(user: SessionUser, id: number, input: CheckPlanUpdateInput): Promise<CheckPlanDetailDTO> {
  await inTransaction(async (t) => {
    const plan = await CheckPlan.findByPk(id, { transaction: t })
    if (!plan) notFound('check plan')
    assertVersion(plan.version, input.version)
    const { version: _v, active, ...terms } = input
    const merged = checkMerged(checkPlanMergedSchema, {
      title: plan.title, method: plan.method, intervalDays: plan.intervalDays, acceptance: plan.acceptance,
      acceptanceLimitK: plan.acceptanceLimitK, nominalsK: plan.nominalsK, startOn: plan.startOn, ...terms,
    })
    await updateAudited(t, user, plan, { ...merged, acceptanceLimitK: merged.acceptance === 'limit' ? merged.acceptanceLimitK : null, ...(active !== undefined ? { active } : {}) }, {
      entity: 'CheckPlan',
      action: (b, a) => (b.active !== a.active ? (a.active ? 'activate' : 'deactivate') : 'update'),
    })
  })
  return checkPlanDetail(id)
}

/**
 * Record one check under a plan, in the caller's transaction: judged by the plan's rule; a failure
 * raises a nonconformity (withholding, over the period since the last good evidence, with the
 * deviation found as the reference's correction at the nominal value) and takes the item out of
 * service with the reason. `performedBy` (default the actor) must be an active laboratory user.
 */
export async function recordCheckIn(t: Transaction, actor: { id: number }, planId: number, input: CheckResultCreateInput): Promise<{ result: CheckResult, nonconformity: Nonconformity | null }> {
  const plan = await CheckPlan.findByPk(planId, { transaction: t })
  if (!plan) notFound('check plan')
  if (!plan.active) conflict('This check plan is no longer active: reactivate it to record checks under it', 'planId')
  const performedBy = input.performedBy ?? actor.id
  if (input.performedBy) {
    const who = await User.findByPk(input.performedBy, { attributes: ['id', 'role', 'active'], transaction: t })
    if (!who || !who.active || !(LAB_ROLES as readonly string[]).includes(who.role)) invalidInput({ performedBy: 'Choose an active member of the laboratory staff' })
  }
  const today = await labToday(new Date(), t)
  if (input.checkedOn > today) invalidInput({ checkedOn: 'A check cannot be recorded on a date still to come' })
  const item = await findEquipment(plan.equipmentType, plan.equipmentId, t)
  if (!item) notFound(plan.equipmentType === 'source' ? 'source' : 'reference instrument')
  const judged = engine(() => evaluateCheck({
    nominalK: input.nominalK,
    measuredK: input.measuredK,
    acceptance: plan.acceptance,
    acceptanceLimitK: plan.acceptanceLimitK,
    expandedUncertaintyK: input.expandedUncertaintyK,
    nominalUncertaintyK: input.nominalUncertaintyK,
  }), 'measuredK')
  const result = await createAudited(t, actor, CheckResult, {
    planId: plan.id,
    equipmentType: plan.equipmentType,
    equipmentId: plan.equipmentId,
    checkedOn: input.checkedOn,
    nominalK: input.nominalK,
    nominalUncertaintyK: input.nominalUncertaintyK,
    measuredK: input.measuredK,
    expandedUncertaintyK: input.expandedUncertaintyK,
    deviationK: judged.deviationK,
    en: judged.en,
    verdict: judged.verdict,
    statement: judged.statement,
    performedBy,
    notes: input.notes,
    nonconformityId: null,
  }, { entity: 'CheckResult' })
  if (judged.verdict === 'pass') return { result, nonconformity: null }

  const period = await affectedPeriod(plan.equipmentType, plan.equipmentId, input.checkedOn, t)
  const nc = await raiseNonconformityIn(t, actor, {
    raisedOn: input.checkedOn,
    origin: 'check',
    originId: result.id,
    title: `${item.assetTag} failed its intermediate check on ${input.checkedOn}`,
    description: `${plan.title}: ${judged.statement} (nominal ${input.nominalK} K, measured ${input.measuredK} K). Work done with ${item.assetTag} from ${period.from} (last good evidence) to ${period.to} is affected; issuing certificates from it is withheld until the work is reviewed.`,
    risk: 'high',
    withhold: true,
    equipment: { type: plan.equipmentType, id: plan.equipmentId },
    affectedFrom: period.from,
    affectedTo: period.to,
    referenceCorrections: [[input.nominalK, judged.deviationK]],
  })
  await updateAudited(t, actor, result, { nonconformityId: nc.id }, { entity: 'CheckResult', action: 'link-nonconformity' })
  await takeOutOfServiceIn(t, actor, plan.equipmentType, plan.equipmentId, `failed its intermediate check on ${input.checkedOn} (${judged.statement}); nonconformity ${nc.number}`)
  return { result, nonconformity: nc }
}

export async function recordCheck(user: SessionUser, planId: number, input: CheckResultCreateInput): Promise<CheckRecordedDTO> {
  const { result, nonconformity } = await inTransaction(t => recordCheckIn(t, user, planId, input))
  const [dto] = await checkResultDTOs([result])
  return { result: dto!, nonconformity: nonconformity ? (await nonconformityDTOs([nonconformity]))[0]! : null }
}

export async function listCheckResults(q: CheckResultQuery): Promise<Page<CheckResultDTO>> {
  const where: Record<string, unknown> = {}
  if (q.equipmentType) where.equipmentType = q.equipmentType
  if (q.equipmentId) where.equipmentId = q.equipmentId
  if (q.planId) where.planId = q.planId
  if (q.verdict) where.verdict = q.verdict
  if (q.from || q.to) where.checkedOn = { ...(q.from ? { [Op.gte]: q.from } : {}), ...(q.to ? { [Op.lte]: q.to } : {}) }
  const { rows, count } = await CheckResult.findAndCountAll({ where, order: [['checkedOn', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await checkResultDTOs(rows), total: count, page: q.page, pageSize: q.pageSize }
}

/**
 * The individuals chart of a plan at one nominal value: the deviations d = measured − nominal (K)
 * in the order checked, with Shewhart limits from the baseline and the run rules
 * (shared/quality/controlChart.ts, NIST SOP 9 / NIST/SEMATECH e-Handbook 6.3.2). With fewer than
 * 2 results, or a baseline with no spread, there are no limits and `reason` says why.
 */
export async function checkChart(id: number, q: ControlChartQuery): Promise<ControlChartDTO> {
  const plan = await CheckPlan.findByPk(id)
  if (!plan) notFound('check plan')
  const nominalK = q.nominalK ?? plan.nominalsK[0]!
  const rows = (await CheckResult.findAll({ where: { planId: id }, order: [['checkedOn', 'ASC'], ['id', 'ASC']] }))
    .filter(r => Math.abs(r.nominalK - nominalK) < 0.005)
  const tag = (await equipmentTags([{ type: plan.equipmentType, id: plan.equipmentId }])).get(`${plan.equipmentType}:${plan.equipmentId}`) ?? null
  const values = rows.map(r => r.deviationK)
  const runRules = Object.values(runRuleLabels())
  const plain = (reason: string): ControlChartDTO => ({
    planId: id, equipmentTag: tag, nominalK, quantity: 'deviationK', limits: null, signals: [], runRules, reason,
    points: rows.map(r => ({ resultId: r.id, checkedOn: r.checkedOn, value: r.deviationK, inBaseline: false, zone: 'within-warning', verdict: r.verdict })),
  })
  if (values.length < 2) return plain(`${values.length} result(s) at ${nominalK} K: limits need at least 2`)
  if (q.baselineCount !== undefined && q.baselineCount > values.length) invalidInput({ baselineCount: `At most the number of results at ${nominalK} K (${values.length})` })
  let chart
  try {
    chart = controlChart(values, { method: q.method, ...(q.baselineCount ? { baselineCount: q.baselineCount } : {}) })
  }
  catch (err) {
    if (err instanceof EngineInputError && err.field === 'values') return plain(`No limits: ${err.message.replace(/^values: /, '')}`)
    throw err
  }
  return {
    planId: id,
    equipmentTag: tag,
    nominalK,
    quantity: 'deviationK',
    points: chart.points.map((p, i) => ({ resultId: rows[i]!.id, checkedOn: rows[i]!.checkedOn, value: p.value, inBaseline: p.inBaseline, zone: p.zone, verdict: rows[i]!.verdict })),
    limits: chart.limits,
    signals: chart.signals,
    runRules,
    reason: null,
  }
}
