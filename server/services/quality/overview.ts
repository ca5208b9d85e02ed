/**
 * The quality manager's overview (open nonconformities, checks due and overdue, failed checks, open
 * complaints, overdue corrective actions, proficiency results — each with the page of its record)
 * and the management-review summary over a period (ISO/IEC 17025:2017 8.9: counts and lists of the
 * same, runs and certificates issued per month), which ./reviewPdf.ts prints.
 */
import { Op } from 'sequelize'
import { addDays } from '#shared/mail/milestones'
import type { ManagementReviewQuery } from '#shared/schemas/managementReview'
import type { ManagementReviewDTO, QualityOverviewDTO } from '#shared/types'
import { CalibrationRun } from '#server/models/CalibrationRun'
import { Certificate } from '#server/models/Certificate'
import { CheckPlan } from '#server/models/CheckPlan'
import { CheckResult } from '#server/models/CheckResult'
import { Complaint } from '#server/models/Complaint'
import { CorrectiveAction } from '#server/models/CorrectiveAction'
import { CorrectiveActionItem } from '#server/models/CorrectiveActionItem'
import { Nonconformity } from '#server/models/Nonconformity'
import { ProficiencyResult } from '#server/models/ProficiencyResult'
import { checkPlanDTOs, checkResultDTOs } from '#server/services/checks/checks'
import { complaintDTOs } from '#server/services/complaints/complaints'
import { correctiveActionDTOs, overdueCorrectiveActions } from '#server/services/correctiveActions/correctiveActions'
import { nonconformityDTOs } from '#server/services/nonconformities/nonconformities'
import { proficiencyDTOs } from '#server/services/proficiency/proficiency'
import { labIdentity } from '#server/services/mail/templates'
import { labToday } from '#server/services/settings/today'
import { managementReviewPdf } from './reviewPdf'

const LAB = { role: 'quality' } as const

/** GET /api/quality/overview */
export async function qualityOverview(): Promise<QualityOverviewDTO> {
  const today = await labToday()
  const [ncs, plans, failed, complaints, overdue, openActions, pt] = await Promise.all([
    Nonconformity.findAll({ where: { status: 'open' }, order: [['raisedOn', 'DESC'], ['id', 'DESC']] }),
    CheckPlan.findAll({ where: { active: true }, order: [['id', 'ASC']] }),
    CheckResult.findAll({ where: { verdict: 'fail', checkedOn: { [Op.gte]: addDays(today, -90) } }, order: [['checkedOn', 'DESC'], ['id', 'DESC']] }),
    Complaint.findAll({ where: { status: { [Op.ne]: 'closed' } }, order: [['receivedOn', 'ASC'], ['id', 'ASC']] }),
    overdueCorrectiveActions(today),
    CorrectiveAction.findAll({ where: { status: 'open' }, order: [['openedOn', 'ASC'], ['id', 'ASC']] }),
    ProficiencyResult.findAll({ where: { reportedOn: { [Op.gte]: addDays(today, -730) } }, order: [['reportedOn', 'DESC'], ['id', 'DESC']] }),
  ])
  const planDTOs = await checkPlanDTOs(plans, today)
  const actions = await correctiveActionDTOs(openActions, today)
  const overdueIds = new Set(overdue.map(a => a.id))
  return {
    today,
    openNonconformities: (await nonconformityDTOs(ncs)).map(n => ({ ...n, link: `/quality/nonconformities/${n.id}` })),
    checksDue: planDTOs.filter(p => p.dueState === 'due').map(p => ({ ...p, link: `/quality/checks/${p.id}` })),
    checksOverdue: planDTOs.filter(p => p.dueState === 'overdue').map(p => ({ ...p, link: `/quality/checks/${p.id}` })),
    failedChecks: (await checkResultDTOs(failed)).map(r => ({ ...r, link: `/quality/checks/${r.planId}` })),
    openComplaints: (await complaintDTOs(complaints, LAB)).map(c => ({ ...c, link: `/complaints/${c.id}` })),
    overdueActions: actions.filter(a => overdueIds.has(a.id)).map(a => ({ ...a, link: `/quality/actions/${a.id}` })),
    actionsAwaitingEffectiveness: actions.filter(a => a.awaitingEffectiveness).map(a => ({ ...a, link: `/quality/actions/${a.id}` })),
    proficiencyResults: (await proficiencyDTOs(pt)).map(r => ({ ...r, link: `/quality/proficiency/${r.id}` })),
  }
}

function monthsOf(from: string, to: string): string[] {
  const out: string[] = []
  let [y, m] = from.slice(0, 7).split('-').map(Number) as [number, number]
  const end = to.slice(0, 7)
  for (;;) {
    const key = `${y}-${String(m).padStart(2, '0')}`
    out.push(key)
    if (key >= end || out.length > 600) break
    m++
    if (m > 12) {
      m = 1
      y++
    }
  }
  return out
}

/**
 * The management-review summary over a period (both dates included): what happened in it, and what
 * stood open at its end. Nonconformities and complaints by the date raised or received; checks by
 * the date checked; proficiency results by the date reported; runs (not void) by calibration date;
 * certificates (every revision) by issue date.
 */
export async function managementReview(q: ManagementReviewQuery): Promise<ManagementReviewDTO> {
  const inPeriod = { [Op.between]: [q.from, q.to] }
  const endOfPeriod = new Date(`${q.to}T23:59:59.999Z`)
  const [checks, pt, ncs, ncsClosed, ncsOpenAtEnd, complaints, complaintsClosed, actions, actionsClosed, lateItems, runs, certs] = await Promise.all([
    CheckResult.findAll({ where: { checkedOn: inPeriod }, order: [['checkedOn', 'ASC'], ['id', 'ASC']] }),
    ProficiencyResult.findAll({ where: { reportedOn: inPeriod }, order: [['reportedOn', 'ASC'], ['id', 'ASC']] }),
    Nonconformity.findAll({ where: { raisedOn: inPeriod }, order: [['raisedOn', 'ASC'], ['id', 'ASC']] }),
    Nonconformity.count({ where: { closedAt: { [Op.between]: [new Date(`${q.from}T00:00:00.000Z`), endOfPeriod] } } }),
    Nonconformity.count({ where: { raisedOn: { [Op.lte]: q.to }, [Op.or]: [{ closedAt: null }, { closedAt: { [Op.gt]: endOfPeriod } }] } }),
    Complaint.findAll({ where: { receivedOn: inPeriod }, order: [['receivedOn', 'ASC'], ['id', 'ASC']] }),
    Complaint.count({ where: { closedAt: { [Op.between]: [new Date(`${q.from}T00:00:00.000Z`), endOfPeriod] } } }),
    CorrectiveAction.findAll({ where: { openedOn: inPeriod }, order: [['openedOn', 'ASC'], ['id', 'ASC']] }),
    CorrectiveAction.count({ where: { closedAt: { [Op.between]: [new Date(`${q.from}T00:00:00.000Z`), endOfPeriod] } } }),
    CorrectiveActionItem.count({ where: { dueDate: { [Op.lt]: q.to }, [Op.or]: [{ doneOn: null }, { doneOn: { [Op.gt]: q.to } }] } }),
    CalibrationRun.findAll({ where: { calibrationDate: inPeriod, status: { [Op.ne]: 'void' } }, attributes: ['id', 'calibrationDate'] }),
    Certificate.findAll({ where: { issueDate: inPeriod }, attributes: ['id', 'issueDate'] }),
  ])
  const perMonth = monthsOf(q.from, q.to).map(month => ({
    month,
    runs: runs.filter(r => r.calibrationDate.startsWith(month)).length,
    certificates: certs.filter(c => c.issueDate.startsWith(month)).length,
  }))
  const failed = checks.filter(c => c.verdict === 'fail')
  return {
    from: q.from,
    to: q.to,
    counts: {
      checksPerformed: checks.length,
      checksFailed: failed.length,
      proficiencyResults: pt.length,
      proficiencySatisfactory: pt.filter(r => r.verdict === 'satisfactory').length,
      proficiencyQuestionable: pt.filter(r => r.verdict === 'questionable').length,
      proficiencyUnsatisfactory: pt.filter(r => r.verdict === 'unsatisfactory').length,
      nonconformitiesRaised: ncs.length,
      nonconformitiesClosed: ncsClosed,
      nonconformitiesOpenAtEnd: ncsOpenAtEnd,
      complaintsReceived: complaints.length,
      complaintsClosed,
      correctiveActionsOpened: actions.length,
      correctiveActionsClosed: actionsClosed,
      actionItemsOverdueAtEnd: lateItems,
      runs: runs.length,
      certificatesIssued: certs.length,
    },
    perMonth,
    nonconformities: await nonconformityDTOs(ncs),
    failedChecks: await checkResultDTOs(failed),
    proficiencyResults: await proficiencyDTOs(pt),
    complaints: await complaintDTOs(complaints, LAB),
    correctiveActions: await correctiveActionDTOs(actions, q.to),
  }
}

/** The management-review summary as a PDF (./reviewPdf.ts). */
export async function managementReviewDocument(q: ManagementReviewQuery): Promise<Buffer> {
  const [data, lab, today] = await Promise.all([managementReview(q), labIdentity(), labToday()])
  return managementReviewPdf(data, lab.name, today)
}
