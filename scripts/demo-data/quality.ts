/**
 * The invented demo laboratory's quality records, small and in step with the rest of the scenario
 * (whose "today" is 2026-12-01):
 * - a check plan per blackbody source with about ten monthly checks each. The flat plate BB-FP-01
 *   passes every one. The high-temperature cavity BB-CV-03 passes until its calibration fell due
 *   (2026-10-15), after which it is not checked (its plan shows overdue). The cavity BB-CV-02 passes
 *   until its check of 2026-11-30, which fails: it goes out of service, and nonconformity
 *   NC-2026-001 is raised over its work since the last good check (2026-11-05) — the draft run of
 *   PG-IR-005 on 2026-11-27, no certificate — with issuing withheld;
 * - that nonconformity has a corrective action (a loose thermocouple connector, reseated; the
 *   monthly check now inspects it) whose actions are done and whose effectiveness check — the next
 *   two monthly checks — is still to be recorded;
 * - one result per kind of comparison: an interlaboratory comparison judged by E_n (satisfactory)
 *   and a proficiency-test scheme with z scores (questionable, z = 2.4);
 * - one complaint, submitted in the portal by the demo customer about KF-IR-013's first certificate
 *   (the 50 °C reading the demo amended), investigated, with its outcome proposed by the quality
 *   manager — who signed that certificate and so may not approve it: it waits for someone else.
 * Everything goes through the services (audited, mail through the outbox). Idempotent by natural
 * keys: plan (item, title), check (plan, date), comparison (scheme, round), complaint (organization,
 * subject), corrective action (title).
 */
import type { Transaction } from 'sequelize'
import type { CheckPlanCreateInput } from '#shared/schemas/check'
import type { SessionUser } from '#shared/types'
import { BlackbodySource } from '#server/models/BlackbodySource'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { CheckPlan } from '#server/models/CheckPlan'
import { CheckResult } from '#server/models/CheckResult'
import { Complaint } from '#server/models/Complaint'
import { CorrectiveAction } from '#server/models/CorrectiveAction'
import { CorrectiveActionItem } from '#server/models/CorrectiveActionItem'
import { Instrument } from '#server/models/Instrument'
import { ProficiencyResult } from '#server/models/ProficiencyResult'
import { User } from '#server/models/User'
import { createCheckPlanIn, recordCheckIn } from '#server/services/checks/checks'
import { investigateComplaintIn, proposeOutcomeIn, submitComplaintIn } from '#server/services/complaints/complaints'
import { markActionItemDoneIn, openCorrectiveActionIn } from '#server/services/correctiveActions/correctiveActions'
import { recordProficiencyIn } from '#server/services/proficiency/proficiency'
import { readTogether } from '#server/utils/db'

const C = (celsius: number) => Math.round((celsius + 273.15) * 100) / 100

interface DemoPlan {
  source: string
  plan: Omit<CheckPlanCreateInput, 'equipmentType' | 'equipmentId'>
  /** Measured − nominal of each check, K, and its U (for the E_n plans). */
  checks: { on: string, deviationK: number }[]
  measuredU: number | null
  nominalU: number | null
}

const months = (first: string, deviations: number[]) => deviations.map((d, i) => {
  const [y, m, day] = first.split('-').map(Number) as [number, number, number]
  const total = (y * 12 + m - 1) + i
  return { on: `${Math.floor(total / 12)}-${String(total % 12 + 1).padStart(2, '0')}-${String(day).padStart(2, '0')}`, deviationK: d }
})

const PLANS: DemoPlan[] = [
  {
    source: 'BB-FP-01',
    plan: {
      title: 'Radiance temperature at 50 °C with the check thermometer',
      method: 'Plate at 50 °C, settled 30 min; the laboratory’s 8–14 µm check thermometer at 300 mm, emissivity setting 0.95, five readings averaged; compared with the plate’s set-point and certificate correction.',
      intervalDays: 30, acceptance: 'limit', acceptanceLimitK: 0.3, nominalsK: [C(50)], startOn: '2026-02-02',
    },
    checks: months('2026-02-02', [0.05, -0.03, 0.08, 0.02, -0.06, 0.04, 0.1, -0.02, 0.06, 0.01]),
    measuredU: null,
    nominalU: null,
  },
  {
    source: 'BB-CV-02',
    plan: {
      title: 'Cavity temperature at 300 °C against the reference PRT',
      method: 'Cavity at 300 °C, settled 45 min; REF-PRT-02 in the cavity’s thermometer well, read against the cavity’s corrected set-point. E_n with the check’s U = 0.25 K and the cavity’s U = 0.12 K.',
      intervalDays: 30, acceptance: 'en', acceptanceLimitK: null, nominalsK: [C(300)], startOn: '2026-02-05',
    },
    checks: [...months('2026-02-05', [0.06, -0.04, 0.09, 0.03, 0.11, -0.02, 0.07, 0.12, 0.05, 0.08]), { on: '2026-11-30', deviationK: 0.62 }],
    measuredU: 0.25,
    nominalU: 0.12,
  },
  {
    source: 'BB-CV-03',
    plan: {
      title: 'Radiance temperature at 800 °C with the transfer standard',
      method: 'Cavity at 800 °C; REF-TRT-01 at its calibrated distance, ten readings averaged; compared with the cavity’s corrected set-point.',
      intervalDays: 30, acceptance: 'limit', acceptanceLimitK: 1, nominalsK: [C(800)], startOn: '2025-11-12',
    },
    checks: months('2025-11-12', [0.2, -0.1, 0.3, 0.1, 0.4, 0, 0.35, 0.25, 0.5, 0.45]),
    measuredU: null,
    nominalU: null,
  },
]

const COMPARISONS = [
  {
    schemeType: 'interlaboratory-comparison' as const,
    scheme: 'Regional radiation thermometry comparison RT-ILC-2026 (invented)',
    round: 'R1',
    artefact: 'The pilot laboratory’s 1.6 µm transfer radiation thermometer TRT-7',
    pointK: C(500), labValueK: 773.42, labUncertaintyK: 0.6, referenceValueK: 773.18, referenceUncertaintyK: 0.45, sigmaPtK: null,
    reportedOn: '2026-06-18',
    notes: 'E_n = 0.24/0.75 = 0.32.',
  },
  {
    schemeType: 'proficiency-test' as const,
    scheme: 'Infrared thermometry proficiency scheme IR-PT (invented)',
    round: '2026/2',
    artefact: 'A handheld 8–14 µm thermometer circulated by the provider, read at 100 °C',
    pointK: C(100), labValueK: 373.82, labUncertaintyK: 0.6, referenceValueK: 373.22, referenceUncertaintyK: 0.4, sigmaPtK: 0.25,
    reportedOn: '2026-09-24',
    notes: 'z = 0.60/0.25 = 2.4 (questionable: a warning signal); E_n = 0.60/0.72 = 0.83. Watched at the next round; no action required by the scheme.',
  },
]

const sessionOf = (u: User): SessionUser => ({ id: u.id, name: u.name, email: u.email, role: u.role, organizationId: u.organizationId ?? null })

/** Make sure the demo quality records exist; returns the number of records created. */
export async function seedQuality(t: Transaction): Promise<number> {
  let created = 0
  const [tech, quality, customer] = await readTogether(t, ['technician@bandlight.test', 'quality@bandlight.test', 'customer@bandlight.test']
    .map(email => () => User.findOne({ where: { email }, transaction: t })))
  if (!tech || !quality || !customer) return 0

  for (const spec of PLANS) {
    const source = await BlackbodySource.findOne({ where: { assetTag: spec.source }, transaction: t })
    if (!source) continue
    let plan = await CheckPlan.findOne({ where: { equipmentType: 'source', equipmentId: source.id, title: spec.plan.title }, transaction: t })
    if (!plan) {
      plan = await createCheckPlanIn(t, quality, { ...spec.plan, equipmentType: 'source', equipmentId: source.id })
      created++
    }
    const nominalK = spec.plan.nominalsK[0]!
    for (const c of spec.checks) {
      if (await CheckResult.findOne({ where: { planId: plan.id, checkedOn: c.on }, transaction: t })) continue
      await recordCheckIn(t, tech, plan.id, {
        checkedOn: c.on,
        nominalK,
        nominalUncertaintyK: spec.nominalU,
        measuredK: Math.round((nominalK + c.deviationK) * 1000) / 1000,
        expandedUncertaintyK: spec.measuredU,
        notes: null,
      })
      created++
    }
  }

  for (const spec of COMPARISONS) {
    if (await ProficiencyResult.findOne({ where: { scheme: spec.scheme, round: spec.round }, transaction: t })) continue
    await recordProficiencyIn(t, quality, spec)
    created++
  }

  // The corrective action of the nonconformity the failed BB-CV-02 check raised.
  const failed = await CheckResult.findOne({ where: { verdict: 'fail', checkedOn: '2026-11-30' }, order: [['id', 'ASC']], transaction: t })
  const title = 'BB-CV-02 control thermocouple connector'
  if (failed?.nonconformityId && !(await CorrectiveAction.findOne({ where: { title }, transaction: t }))) {
    const action = await openCorrectiveActionIn(t, quality, {
      nonconformityId: failed.nonconformityId,
      complaintId: null,
      title,
      cause: 'The connector of the cavity’s control thermocouple had worked loose, so the controller read low and the cavity ran about 0.6 K above its corrected set-point at 300 °C. The monthly check did not look at the connector.',
      items: [
        { description: 'Reseat and secure the control thermocouple connector; repeat the 300 °C check', ownerId: tech.id, dueDate: '2026-12-01' },
        { description: 'Add a look at the thermocouple connectors to the monthly check of every cavity', ownerId: quality.id, dueDate: '2026-12-01' },
      ],
      effectivenessDueOn: '2027-01-31',
    }, '2026-11-30')
    for (const item of await CorrectiveActionItem.findAll({ where: { correctiveActionId: action.id }, transaction: t })) {
      await markActionItemDoneIn(t, { id: item.ownerId, role: item.ownerId === quality.id ? 'quality' : 'technician' }, action.id, item.id, { doneOn: '2026-12-01', note: null })
    }
    created++
  }

  // The complaint about KF-IR-013's first certificate.
  const subject = 'The 50 °C result looks wrong'
  const instrument = await Instrument.findOne({ where: { assetTag: 'KF-IR-013' }, transaction: t })
  if (instrument && customer.organizationId === instrument.organizationId && !(await Complaint.findOne({ where: { organizationId: instrument.organizationId, subject }, transaction: t }))) {
    const run = await CalibrationRun.findOne({ where: { instrumentId: instrument.id, revisionOf: null }, order: [['id', 'ASC']], transaction: t })
    const first = run ? await Certificate.findOne({ where: { runId: run.id }, transaction: t }) : null
    const amended = first ? await Certificate.findOne({ where: { baseNumber: first.baseNumber, status: 'valid' }, transaction: t }) : null
    if (first) {
      const c = await submitComplaintIn(t, sessionOf(customer), {
        subject,
        description: `On certificate ${first.number} the error at 50 °C is 0.4 K larger than at the neighbouring points, and our own comparison against the furnace thermocouple does not show it. Please check the figure.`,
        certificateId: first.id,
        instrumentId: null,
        organizationId: null,
        receivedOn: null,
      }, '2026-11-12')
      await investigateComplaintIn(t, quality, c.id, {
        investigation: `One of the five 50 °C readings was transcribed from the wrong line of the worksheet. The certificate was reopened, the reading corrected and the amendment${amended && amended.id !== first.id ? ` ${amended.number}` : ''} issued; the other points are unaffected.`,
        version: c.version,
      })
      await c.reload({ transaction: t })
      await proposeOutcomeIn(t, quality, c.id, {
        outcome: `Complaint upheld: a reading was transcribed wrongly. The amended certificate${amended && amended.id !== first.id ? ` ${amended.number}` : ''} replaces ${first.number}; readings are now entered at the bench, not copied from paper.`,
        version: c.version,
      })
      created++
    }
  }
  return created
}
