/**
 * Vocabularies of the quality records (ISO/IEC 17025:2017 6.4.10, 7.7, 7.9, 7.10, 8.7, 8.9), with
 * their labels for the UI. One list each, used by the zod schemas, the models, the services and the
 * pages. Framework-free.
 */

/** How an intermediate check is judged: a limit on |measured − nominal|, or |E_n| ≤ 1. */
export const CHECK_ACCEPTANCES = ['limit', 'en'] as const
export type CheckAcceptance = (typeof CHECK_ACCEPTANCES)[number]
export const CHECK_ACCEPTANCE_LABELS: Record<CheckAcceptance, string> = {
  limit: 'Within a limit: |measured − nominal| ≤ limit',
  en: 'Normalized error: |E_n| ≤ 1',
}

export const CHECK_VERDICTS = ['pass', 'fail'] as const
export type CheckVerdict = (typeof CHECK_VERDICTS)[number]

/**
 * Kinds of comparison (ISO/IEC 17025:2017 7.7.2): an interlaboratory comparison judged by E_n
 * against a reference laboratory, or a proficiency-testing scheme that also reports z scores.
 */
export const PROFICIENCY_SCHEME_TYPES = ['interlaboratory-comparison', 'proficiency-test'] as const
export type ProficiencySchemeType = (typeof PROFICIENCY_SCHEME_TYPES)[number]
export const PROFICIENCY_SCHEME_TYPE_LABELS: Record<ProficiencySchemeType, string> = {
  'interlaboratory-comparison': 'Interlaboratory comparison (E_n)',
  'proficiency-test': 'Proficiency test scheme (z score)',
}

export const PROFICIENCY_VERDICTS = ['satisfactory', 'questionable', 'unsatisfactory'] as const
export type ProficiencyVerdict = (typeof PROFICIENCY_VERDICTS)[number]

/** What raised a nonconformity: a person, or one of the events that raise one by themselves. */
export const NONCONFORMITY_ORIGINS = ['manual', 'check', 'proficiency', 'calibration', 'complaint'] as const
export type NonconformityOrigin = (typeof NONCONFORMITY_ORIGINS)[number]
export const NONCONFORMITY_ORIGIN_LABELS: Record<NonconformityOrigin, string> = {
  manual: 'Raised by hand',
  check: 'Failed intermediate check',
  proficiency: 'Unsatisfactory proficiency result',
  calibration: 'Reference found out of tolerance at calibration',
  complaint: 'Complaint',
}

export const RISK_LEVELS = ['low', 'medium', 'high'] as const
export type RiskLevel = (typeof RISK_LEVELS)[number]
export const RISK_LABELS: Record<RiskLevel, string> = { low: 'Low', medium: 'Medium', high: 'High' }

export const NONCONFORMITY_STATUSES = ['open', 'closed'] as const
export type NonconformityStatus = (typeof NONCONFORMITY_STATUSES)[number]

/** What the laboratory decides for each affected certificate (7.10.1). */
export const CERTIFICATE_DECISIONS = ['keep', 'amend', 'withdraw'] as const
export type CertificateDecision = (typeof CERTIFICATE_DECISIONS)[number]
export const CERTIFICATE_DECISION_LABELS: Record<CertificateDecision, string> = {
  keep: 'Keep, with the reason',
  amend: 'Amend (reopen for a corrected revision)',
  withdraw: 'Withdraw',
}

export const COMPLAINT_STATUSES = ['received', 'investigating', 'outcome-proposed', 'closed'] as const
export type ComplaintStatus = (typeof COMPLAINT_STATUSES)[number]
export const COMPLAINT_STATUS_LABELS: Record<ComplaintStatus, string> = {
  'received': 'Received',
  'investigating': 'Under investigation',
  'outcome-proposed': 'Outcome awaiting approval',
  'closed': 'Closed',
}

/** How a complaint reached the laboratory. */
export const COMPLAINT_CHANNELS = ['portal', 'laboratory'] as const
export type ComplaintChannel = (typeof COMPLAINT_CHANNELS)[number]

export const CORRECTIVE_ACTION_STATUSES = ['open', 'closed'] as const
export type CorrectiveActionStatus = (typeof CORRECTIVE_ACTION_STATUSES)[number]

/** Equipment whose calibration interval can be reviewed: the lab's own, and customers' instruments (analysis only). */
export const INTERVAL_ITEM_TYPES = ['source', 'reference', 'instrument'] as const
export type IntervalItemType = (typeof INTERVAL_ITEM_TYPES)[number]

export const INTERVAL_METHODS = ['staircase', 'drift', 'other'] as const
export type IntervalMethod = (typeof INTERVAL_METHODS)[number]
export const INTERVAL_METHOD_LABELS: Record<IntervalMethod, string> = {
  staircase: 'Staircase (ILAC-G24 method 1)',
  drift: 'Drift of the as-found deviation',
  other: 'Other (stated in the reason)',
}

/** A check plan is "due" this many days before its next check date (the overview lists it). */
export const CHECK_DUE_WINDOW_DAYS = 14
