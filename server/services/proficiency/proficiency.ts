/**
 * Proficiency tests and interlaboratory comparisons (ISO/IEC 17025:2017 7.7.2): each result with its
 * E_n = (x − X)/√(U_lab² + U_ref²) (|E_n| ≤ 1 satisfactory) and, where the scheme reports them, its z
 * score (|z| ≤ 2 satisfactory, 2–3 questionable, ≥ 3 unsatisfactory; ISO 13528), computed by
 * shared/quality/proficiency.ts. An unsatisfactory result raises a nonconformity.
 */
import type { Transaction } from 'sequelize'
import { EngineInputError } from '#shared/radiometry/errors'
import { evaluateProficiency } from '#shared/quality'
import { PROFICIENCY_SCHEME_TYPE_LABELS } from '#shared/quality/constants'
import type { ProficiencyCreateInput, ProficiencyQuery } from '#shared/schemas/proficiency'
import type { Page, ProficiencyRecordedDTO, ProficiencyResultDTO, SessionUser } from '#shared/types'
import { Nonconformity } from '#server/models/Nonconformity'
import { ProficiencyResult } from '#server/models/ProficiencyResult'
import { createAudited, updateAudited } from '#server/utils/audit'
import { engine, notFound } from '#server/utils/errors'
import { inTransaction } from '#server/utils/transaction'
import { nonconformityDTOs } from '#server/services/nonconformities/nonconformities'
import { raiseNonconformityIn } from '#server/services/nonconformities/raise'
import { userNames } from '#server/services/quality/records'
import { readTogether } from '#server/utils/db'

/** Engine field names → the API's. */
const FIELDS: Record<string, string> = {
  labValue: 'labValueK',
  labExpandedUncertainty: 'labUncertaintyK',
  referenceValue: 'referenceValueK',
  referenceExpandedUncertainty: 'referenceUncertaintyK',
  standardDeviationForProficiency: 'sigmaPtK',
}

export async function proficiencyDTOs(rows: ProficiencyResult[], t?: Transaction): Promise<ProficiencyResultDTO[]> {
  if (!rows.length) return []
  const ncIds = rows.map(r => r.nonconformityId).filter((v): v is number => !!v)
  const [names, ncs] = await readTogether(t, [
    () => userNames(rows.map(r => r.recordedBy), t),
    () => ncIds.length ? Nonconformity.findAll({ where: { id: ncIds }, attributes: ['id', 'number'], transaction: t }) : [],
  ])
  const ncNumber = new Map(ncs.map(n => [n.id, n.number]))
  return rows.map(r => ({
    id: r.id,
    schemeType: r.schemeType,
    scheme: r.scheme,
    round: r.round,
    artefact: r.artefact,
    pointK: r.pointK,
    labValueK: r.labValueK,
    labUncertaintyK: r.labUncertaintyK,
    referenceValueK: r.referenceValueK,
    referenceUncertaintyK: r.referenceUncertaintyK,
    sigmaPtK: r.sigmaPtK ?? null,
    en: r.en,
    enVerdict: r.enVerdict,
    z: r.z ?? null,
    zVerdict: r.zVerdict ?? null,
    verdict: r.verdict,
    reportedOn: r.reportedOn,
    notes: r.notes ?? null,
    nonconformityId: r.nonconformityId ?? null,
    nonconformityNumber: r.nonconformityId ? ncNumber.get(r.nonconformityId) ?? null : null,
    recordedByName: names.get(r.recordedBy) ?? null,
    createdAt: r.createdAt.toISOString(),
  }))
}

export async function listProficiencyResults(q: ProficiencyQuery): Promise<Page<ProficiencyResultDTO>> {
  const where = q.verdict ? { verdict: q.verdict } : {}
  const { rows, count } = await ProficiencyResult.findAndCountAll({ where, order: [['reportedOn', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { rows: await proficiencyDTOs(rows), total: count, page: q.page, pageSize: q.pageSize }
}

export async function proficiencyResultDetail(id: number): Promise<ProficiencyResultDTO> {
  const row = await ProficiencyResult.findByPk(id)
  if (!row) notFound('proficiency result')
  return (await proficiencyDTOs([row]))[0]!
}

/** Record a result in the caller's transaction; an unsatisfactory one raises a nonconformity. */
export async function recordProficiencyIn(t: Transaction, actor: { id: number }, input: ProficiencyCreateInput): Promise<{ result: ProficiencyResult, nonconformity: Nonconformity | null }> {
  const ev = engine(() => {
    try {
      return evaluateProficiency({
        labValue: input.labValueK,
        labExpandedUncertainty: input.labUncertaintyK,
        referenceValue: input.referenceValueK,
        referenceExpandedUncertainty: input.referenceUncertaintyK,
        standardDeviationForProficiency: input.sigmaPtK,
      })
    }
    catch (err) {
      if (err instanceof EngineInputError) throw new EngineInputError(FIELDS[err.field] ?? err.field, err.message.slice(err.field.length + 2))
      throw err
    }
  }, 'labValueK')
  const result = await createAudited(t, actor, ProficiencyResult, {
    ...input,
    en: ev.en.en,
    enVerdict: ev.en.verdict,
    z: ev.z?.z ?? null,
    zVerdict: ev.z?.verdict ?? null,
    verdict: ev.verdict,
    nonconformityId: null,
    recordedBy: actor.id,
  }, { entity: 'ProficiencyResult' })
  if (ev.verdict !== 'unsatisfactory') return { result, nonconformity: null }
  const scores = [`E_n = ${Number(ev.en.en.toPrecision(3))} (${ev.en.verdict})`, ...(ev.z ? [`z = ${Number(ev.z.z.toPrecision(3))} (${ev.z.verdict})`] : [])].join(', ')
  const nc = await raiseNonconformityIn(t, actor, {
    origin: 'proficiency',
    originId: result.id,
    title: `Unsatisfactory result in ${input.scheme}, round ${input.round}`,
    description: `${PROFICIENCY_SCHEME_TYPE_LABELS[input.schemeType]} ${input.scheme}, round ${input.round}, artefact ${input.artefact} at ${input.pointK} K: our value ${input.labValueK} K (U = ${input.labUncertaintyK} K) against ${input.referenceValueK} K (U = ${input.referenceUncertaintyK} K): ${scores}. Investigate the cause and the results issued at this point since the last satisfactory comparison.`,
    risk: 'high',
    withhold: false,
    equipment: null,
    affectedFrom: null,
    affectedTo: null,
    referenceCorrections: null,
  })
  await updateAudited(t, actor, result, { nonconformityId: nc.id }, { entity: 'ProficiencyResult', action: 'link-nonconformity' })
  return { result, nonconformity: nc }
}

export async function recordProficiency(user: SessionUser, input: ProficiencyCreateInput): Promise<ProficiencyRecordedDTO> {
  const { result, nonconformity } = await inTransaction(t => recordProficiencyIn(t, user, input))
  return { result: (await proficiencyDTOs([result]))[0]!, nonconformity: nonconformity ? (await nonconformityDTOs([nonconformity]))[0]! : null }
}
