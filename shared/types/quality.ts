// What the quality routes return: intermediate checks and their control charts, proficiency
// results, the impact of a faulty reference, nonconformities, complaints, corrective actions,
// interval reviews, the quality manager's overview and the management-review summary.
// Temperatures and differences in K; dates `YYYY-MM-DD`; timestamps ISO 8601.
import type { EquipmentType } from '../registers/constants'
import type {
  CertificateDecision,
  CheckAcceptance,
  CheckVerdict,
  ComplaintChannel,
  ComplaintStatus,
  CorrectiveActionStatus,
  IntervalItemType,
  IntervalMethod,
  NonconformityOrigin,
  NonconformityStatus,
  ProficiencySchemeType,
  ProficiencyVerdict,
  RiskLevel,
} from '../quality/constants'
import type { ControlLimits, DriftIntervalResult, RunRuleSignal, StaircaseResult } from '../quality'
import type { AuditEventDTO } from './index'

// ---------------------------------------------------------------- impact (the contract)

/** A certificate whose run used the item (its latest valid revision), with the points that used it. */
export interface ImpactCertificateDTO {
  id: number
  number: string
  issuedOn: string
  organizationId: number
  runId: number
  points: number[]
}

export interface ImpactRunDTO {
  id: number
  status: string
}

/** GET /api/sources/[id]/impact and /api/reference-instruments/[id]/impact. */
export interface ImpactDTO {
  certificates: ImpactCertificateDTO[]
  runs: ImpactRunDTO[]
}

/** The effect of the reference's correction on one affected point (shared/quality/impact.ts). */
export interface PointEffectDTO {
  pointId: number
  runId: number
  /** The point's number in its run. */
  seq: number
  stage: string
  referenceTemperatureK: number
  errorK: number
  statedUncertaintyK: number
  verdict: string
  /** δ at the point's reference temperature (true − value used), K; null when the as-found data do not cover it. */
  correctionK: number | null
  /** Δ = −c·δ, K. */
  errorShiftK: number | null
  correctedErrorK: number | null
  withinUncertainty: boolean | null
  correctedVerdict: string | null
  assessment: 'no-effect' | 'within-uncertainty' | 'exceeds-uncertainty' | 'verdict-changed' | 'not-computable'
  statement: string
}

/** The affected work of a nonconformity: the impact list with names, and the effect at each point. */
export interface AffectedWorkDTO {
  equipment: { type: EquipmentType, id: number, assetTag: string } | null
  from: string | null
  to: string | null
  certificates: (ImpactCertificateDTO & { organizationName: string | null, instrumentSerial: string })[]
  runs: (ImpactRunDTO & { calibrationDate: string, instrumentSerial: string | null, certificateNumber: string | null })[]
  effects: PointEffectDTO[]
}

// ---------------------------------------------------------------- checks

export interface CheckPlanDTO {
  id: number
  equipmentType: EquipmentType
  equipmentId: number
  equipmentTag: string | null
  title: string
  method: string
  intervalDays: number
  acceptance: CheckAcceptance
  acceptanceLimitK: number | null
  nominalsK: number[]
  startOn: string
  active: boolean
  lastCheckedOn: string | null
  lastVerdict: CheckVerdict | null
  /** The next check date: the last check plus the interval, or the start date. */
  nextDueOn: string
  /** `due` within 14 days, `overdue` after its date; `inactive` plans are not due. */
  dueState: 'ok' | 'due' | 'overdue' | 'inactive'
  version: number
  createdAt: string
  updatedAt: string
}

export interface CheckResultDTO {
  id: number
  planId: number
  planTitle: string | null
  equipmentType: EquipmentType
  equipmentId: number
  equipmentTag: string | null
  checkedOn: string
  nominalK: number
  nominalUncertaintyK: number | null
  measuredK: number
  expandedUncertaintyK: number | null
  deviationK: number
  en: number | null
  verdict: CheckVerdict
  statement: string
  performedBy: number
  performedByName: string | null
  notes: string | null
  nonconformityId: number | null
  nonconformityNumber: string | null
  createdAt: string
}

export interface CheckPlanDetailDTO extends CheckPlanDTO {
  /** Newest first. */
  results: CheckResultDTO[]
  audit: AuditEventDTO[]
}

/** POST /api/check-plans/[id]/results: the result, and the nonconformity a failure opened. */
export interface CheckRecordedDTO {
  result: CheckResultDTO
  nonconformity: NonconformityDTO | null
}

/** GET /api/check-plans/[id]/chart: the individuals chart of the deviation at one nominal value. */
export interface ControlChartDTO {
  planId: number
  equipmentTag: string | null
  nominalK: number
  /** What is plotted: d = measured − nominal, K. */
  quantity: 'deviationK'
  points: { resultId: number, checkedOn: string, value: number, inBaseline: boolean, zone: 'within-warning' | 'between-warning-and-action' | 'beyond-action', verdict: CheckVerdict }[]
  /** Null while fewer than 2 results (or no spread) give no limits; `reason` then says why. */
  limits: ControlLimits | null
  signals: RunRuleSignal[]
  /** The run rules applied, as stated on the chart. */
  runRules: string[]
  reason: string | null
}

// ---------------------------------------------------------------- proficiency

export interface ProficiencyResultDTO {
  id: number
  schemeType: ProficiencySchemeType
  scheme: string
  round: string
  artefact: string
  pointK: number
  labValueK: number
  labUncertaintyK: number
  referenceValueK: number
  referenceUncertaintyK: number
  sigmaPtK: number | null
  en: number
  enVerdict: ProficiencyVerdict
  z: number | null
  zVerdict: ProficiencyVerdict | null
  verdict: ProficiencyVerdict
  reportedOn: string
  notes: string | null
  nonconformityId: number | null
  nonconformityNumber: string | null
  recordedByName: string | null
  createdAt: string
}

export interface ProficiencyRecordedDTO {
  result: ProficiencyResultDTO
  nonconformity: NonconformityDTO | null
}

// ---------------------------------------------------------------- nonconformities

export interface NonconformityNoticeDTO {
  organizationId: number
  organizationName: string
  at: string
  byName: string | null
  /** The queued message; null when the organization had nobody to write to. */
  outboxMessageId: number | null
}

export interface NonconformityDTO {
  id: number
  number: string
  raisedOn: string
  raisedBy: number | null
  raisedByName: string | null
  origin: NonconformityOrigin
  originId: number | null
  title: string
  description: string
  risk: RiskLevel
  withhold: boolean
  equipmentType: EquipmentType | null
  equipmentId: number | null
  equipmentTag: string | null
  affectedFrom: string | null
  affectedTo: string | null
  referenceCorrections: [number, number][] | null
  status: NonconformityStatus
  notifications: NonconformityNoticeDTO[]
  resumedAt: string | null
  resumedByName: string | null
  resumeNote: string | null
  closedAt: string | null
  closedByName: string | null
  closeNote: string | null
  version: number
  createdAt: string
  updatedAt: string
}

export interface NonconformityDecisionDTO {
  id: number
  certificateId: number
  certificateNumber: string | null
  decision: CertificateDecision
  reason: string
  revisionRunId: number | null
  decidedByName: string | null
  decidedAt: string
}

export interface NonconformityDetailDTO extends NonconformityDTO {
  /** The affected work as it stands now, with the effect at each point. */
  affected: AffectedWorkDTO | null
  /** As it stood when the record was raised. */
  affectedWhenRaised: AffectedWorkDTO | null
  decisions: NonconformityDecisionDTO[]
  /** Affected valid certificates without a decision yet. */
  undecidedCertificateIds: number[]
  correctiveActions: CorrectiveActionDTO[]
  audit: AuditEventDTO[]
}

// ---------------------------------------------------------------- complaints

export interface ComplaintDTO {
  id: number
  number: string
  organizationId: number | null
  organizationName: string | null
  certificateId: number | null
  certificateNumber: string | null
  instrumentId: number | null
  instrumentSerial: string | null
  channel: ComplaintChannel
  submittedByName: string | null
  receivedOn: string
  subject: string
  description: string
  status: ComplaintStatus
  acknowledgedAt: string | null
  /** The outcome is shown to the customer once the complaint is closed. */
  outcome: string | null
  closedAt: string | null
  /** Laboratory only (null for customers): the investigation and who did what. */
  investigation: string | null
  investigatedByName: string | null
  outcomeProposedByName: string | null
  approvedByName: string | null
  approvedAt: string | null
  /** Laboratory only: the people who may not approve the outcome (they did the work complained about). */
  involvedUserIds: number[] | null
  nonconformityId: number | null
  version: number
  createdAt: string
  updatedAt: string
}

export interface ComplaintDetailDTO extends ComplaintDTO {
  /** Laboratory only (empty for customers). */
  correctiveActions: CorrectiveActionDTO[]
  audit: AuditEventDTO[]
}

// ---------------------------------------------------------------- corrective actions

export interface CorrectiveActionItemDTO {
  id: number
  description: string
  ownerId: number
  ownerName: string | null
  dueDate: string
  doneOn: string | null
  doneByName: string | null
  doneNote: string | null
  overdue: boolean
}

export interface CorrectiveActionDTO {
  id: number
  number: string
  nonconformityId: number | null
  nonconformityNumber: string | null
  complaintId: number | null
  complaintNumber: string | null
  title: string
  cause: string
  openedOn: string
  openedByName: string | null
  items: CorrectiveActionItemDTO[]
  effectivenessDueOn: string | null
  effectivenessCheck: string | null
  effective: boolean | null
  effectivenessCheckedByName: string | null
  effectivenessCheckedAt: string | null
  /** Every action done, effectiveness not yet recorded. */
  awaitingEffectiveness: boolean
  /** Any action not done after its due date. */
  overdue: boolean
  status: CorrectiveActionStatus
  closedAt: string | null
  closedByName: string | null
  version: number
  createdAt: string
  updatedAt: string
}

export interface CorrectiveActionDetailDTO extends CorrectiveActionDTO {
  audit: AuditEventDTO[]
}

// ---------------------------------------------------------------- intervals

/** One as-found result in an interval review: the correction found at the chosen temperature. */
export interface AsFoundHistoryPoint {
  date: string
  /** The correction found (true − value used), K: for the lab's equipment from its calibration record; for a customer's instrument its as-found error E. */
  deviationK: number
  standardUncertaintyK: number
  toleranceK: number | null
  inTolerance: boolean | null
  /** Where it comes from: `calibration:12` (equipment calibration) or `run:34` (a customer's run). */
  sourceRecord: string
}

export interface IntervalDecisionDTO {
  id: number
  itemType: IntervalItemType
  itemId: number
  method: IntervalMethod
  proposedMonths: number | null
  decidedMonths: number
  reason: string
  decidedOn: string
  decidedByName: string | null
  analysis: unknown
  createdAt: string
}

export interface IntervalReviewDTO {
  item: { type: IntervalItemType, id: number, label: string }
  /** The temperature the history is read at, K. */
  temperatureK: number | null
  /** The temperatures with as-found data, K (choose one with `temperatureK`). */
  temperaturesK: number[]
  history: AsFoundHistoryPoint[]
  /** The interval that has just ended, whole months, when known. */
  currentMonths: number | null
  staircase: { input: Record<string, unknown>, result: StaircaseResult } | null
  drift: { input: Record<string, unknown>, result: DriftIntervalResult } | null
  /** Why a method gave no proposal (too little data …). */
  notes: string[]
  /** A customer's instrument: shown to the laboratory only; no interval goes on its certificate unless agreed. */
  customerInstrument: boolean
  decisions: IntervalDecisionDTO[]
}

// ---------------------------------------------------------------- overview and review

export interface OverviewLink {
  /** The page of the record. */
  link: string
}

export interface QualityOverviewDTO {
  today: string
  openNonconformities: (NonconformityDTO & OverviewLink)[]
  checksDue: (CheckPlanDTO & OverviewLink)[]
  checksOverdue: (CheckPlanDTO & OverviewLink)[]
  /** Failed checks of the last 90 days. */
  failedChecks: (CheckResultDTO & OverviewLink)[]
  openComplaints: (ComplaintDTO & OverviewLink)[]
  overdueActions: (CorrectiveActionDTO & OverviewLink)[]
  /** Corrective actions whose actions are done and whose effectiveness is still to be checked. */
  actionsAwaitingEffectiveness: (CorrectiveActionDTO & OverviewLink)[]
  /** Proficiency results of the last 2 years, newest first. */
  proficiencyResults: (ProficiencyResultDTO & OverviewLink)[]
}

export interface ManagementReviewDTO {
  from: string
  to: string
  counts: {
    checksPerformed: number
    checksFailed: number
    proficiencyResults: number
    proficiencySatisfactory: number
    proficiencyQuestionable: number
    proficiencyUnsatisfactory: number
    nonconformitiesRaised: number
    nonconformitiesClosed: number
    nonconformitiesOpenAtEnd: number
    complaintsReceived: number
    complaintsClosed: number
    correctiveActionsOpened: number
    correctiveActionsClosed: number
    actionItemsOverdueAtEnd: number
    runs: number
    certificatesIssued: number
  }
  /** Non-void runs by calibration month, certificates (every revision) by issue month. */
  perMonth: { month: string, runs: number, certificates: number }[]
  nonconformities: NonconformityDTO[]
  failedChecks: CheckResultDTO[]
  proficiencyResults: ProficiencyResultDTO[]
  complaints: ComplaintDTO[]
  correctiveActions: CorrectiveActionDTO[]
}

