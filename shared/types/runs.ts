/**
 * DTOs of calibration procedures and runs (server/api/procedures, server/api/runs).
 * Temperatures and uncertainties in kelvin unless a field says otherwise.
 */
import type {
  BudgetLineDistribution,
  ComponentType,
  ComponentUnit,
  DecisionRuleName,
  ModelInput,
  PointStage,
  RunStatus,
  TemplateDistribution,
} from '../calibration/constants'
import type { AccuracySpec } from '../schemas/instrument'
import type { AuditEventDTO } from './index'

/** One line of a procedure's uncertainty-budget template. */
export interface TemplateComponent {
  name: string
  type: ComponentType
  distribution: TemplateDistribution
  /** Half-width, expanded uncertainty (normal) or standard uncertainty (standard), in `unit`. */
  value: number
  /** Coverage factor k of a normal component's expanded uncertainty; null otherwise. */
  coverageFactor: number | null
  unit: ComponentUnit
  input: ModelInput
  /** Degrees of freedom; null = infinite. */
  dof: number | null
}

/** The laboratory's calibration and measurement capability over a temperature range (k = 2). */
export interface CmcEntry {
  minK: number
  maxK: number
  expandedUncertaintyK: number
}

export interface ProcedureVersionDTO {
  id: number
  procedureId: number
  versionNumber: number
  name: string
  documentReference: string
  decisionRule: DecisionRuleName
  /** r in w = r·U (guard-band and non-binary rules); null for simple acceptance. */
  guardBandFactor: number | null
  template: TemplateComponent[]
  cmc: CmcEntry[]
  changeNote: string | null
  createdBy: number | null
  createdByName: string | null
  createdAt: string
}

export interface ProcedureDTO {
  id: number
  name: string
  documentReference: string
  archived: boolean
  version: number
  currentVersion: ProcedureVersionDTO
  createdAt: string
  updatedAt: string
}

export interface ProcedureDetailDTO extends ProcedureDTO {
  /** Every version, newest first. */
  versions: ProcedureVersionDTO[]
  audit: AuditEventDTO[]
}

/** One line of a computed budget. */
export interface BudgetLine {
  name: string
  type: ComponentType
  input: ModelInput
  distribution: BudgetLineDistribution
  /** The stated value in `unit` (for `resolution`: the full step δ; for repeatability: s/√n). */
  value: number
  unit: ComponentUnit
  /** u(xᵢ) in the input's unit (K for temperatures and the reading, absolute emissivity for emissivities). */
  standardUncertainty: number
  /** cᵢ = ∂T_meas/∂xᵢ from the reading model at the point (1 for `reading`), K per input unit. */
  sensitivity: number
  /** |cᵢ|·u(xᵢ), K. */
  contributionK: number
  /** Share of u_c², percent. */
  percent: number
  /** νᵢ; null = infinite. */
  dof: number | null
}

export interface PointBudget {
  components: BudgetLine[]
  combinedStandardUncertaintyK: number
  /** ν_eff by Welch–Satterthwaite; null = infinite. */
  effectiveDegreesOfFreedom: number | null
  coverageFactor: number
  coverageProbability: number
  /** U = k·u_c as computed, K. */
  expandedUncertaintyK: number
  /** The CMC at the reference temperature, K (k = 2), or null when no CMC range covers it. */
  cmcK: number | null
  /** The uncertainty stated: max(U, CMC), K. */
  statedUncertaintyK: number
  /** True when the CMC was above the computed U and was stated instead. */
  cmcApplied: boolean
  /** Plain remarks on the budget (e.g. repeatability omitted with one reading, correlated lines). */
  notes: string[]
  /** 2 Σ_{i<j} cᵢcⱼu(xᵢ)u(xⱼ)r, K², when the point has correlations (GUM 5.2.2). */
  covarianceK2?: number
}

export interface PointConformity {
  rule: DecisionRuleName
  ruleReference: string
  /** Tolerance limit TL from the instrument's accuracy specification at the mean reading, K. */
  tolerance: number
  /** Guard band w, K. */
  guardBand: number
  /** TL − w, K. */
  acceptanceLimit: number
  verdict: 'pass' | 'conditional-pass' | 'conditional-fail' | 'fail'
  statement: string
  /**
   * Probability that the error lies within ±TL for a normal PDF with expectation E and u = U_stated/k
   * (JCGM 106:2012, 7.4), dimensionless. Absent in results computed before engine 1.1.0.
   */
  probabilityOfConformity?: number
}

/** A correlation between two template components of a point's budget (GUM 5.2.2). */
export interface TemplateCorrelation {
  /** Indices [i, j] of the two components in `template` (0-based, i ≠ j). */
  between: [number, number]
  /** Correlation coefficient r, −1 ≤ r ≤ 1. */
  coefficient: number
}

/** How the reference temperature of a point was obtained. */
export type ReferenceInput =
  | { kind: 'source-correction', sourceIndicatedK: number, corrections: [number, number][] }
  | { kind: 'reference-thermometer', referenceReadingK: number }

/** The band as the computation used it. */
export type BandInput =
  | { kind: 'rectangular', lambda1Um: number, lambda2Um: number }
  | { kind: 'tabulated', points: [number, number][] }

/** Everything a point's result was computed from: `computePoint(inputs)` gives the same result again. */
export interface PointComputationInput {
  band: BandInput
  reference: ReferenceInput
  /** Source emissivity ε_s. */
  sourceEmissivity: number
  /** Reflected temperature T_w, K. */
  reflectedTemperatureK: number
  /** Instrument temperature T_d, K. */
  instrumentTemperatureK: number
  /** Emissivity setting ε_i. */
  emissivitySetting: number
  /** Repeat readings, K. */
  readingsK: number[]
  /** Display resolution δ of the instrument, K. */
  resolutionK: number
  template: TemplateComponent[]
  /** Correlated pairs of template components (indices into `template`); omitted or empty: all independent. */
  correlations?: TemplateCorrelation[]
  cmc: CmcEntry[]
  accuracy: AccuracySpec
  rule: DecisionRuleName
  guardBandFactor: number | null
}

/** The computed result of one calibration point (shared/calibration/compute.ts returns exactly this). */
export interface PointResult {
  /** Reference temperature T_s used, K. */
  referenceTemperatureK: number
  /** Correction from the source's certificate table, K (null with a reference thermometer). */
  sourceCorrectionK: number | null
  expectedReadingK: number
  meanReadingK: number
  /** Experimental standard deviation s of the readings, K (0 with one reading). */
  stdDevK: number
  n: number
  /** E = mean − expected, K. */
  errorK: number
  /** −E, K. */
  correctionK: number
  budget: PointBudget
  rounded: { error: number, uncertainty: number, errorText: string, uncertaintyText: string }
  conformity: PointConformity
  engineVersion: string
  inputs: PointComputationInput
}

/** Monte Carlo (JCGM 101) check of a point's GUM result. */
export interface PointMonteCarloDTO {
  trials: number
  seed: number
  coverageProbability: number
  mean: number
  standardUncertainty: number
  coverageInterval: [number, number]
  validated: boolean
  tolerance: number
  dLow: number | null
  dHigh: number | null
  /** Remarks on how the budget was mapped to distributions. */
  notes: string[]
  engineVersion: string
  at: string
}

export interface RunPointDTO {
  id: number
  runId: number
  seq: number
  stage: PointStage
  sourceId: number
  sourceAssetTag: string | null
  referenceInstrumentId: number | null
  referenceAssetTag: string | null
  setPointK: number
  sourceIndicatedK: number | null
  referenceReadingK: number | null
  readingsK: number[]
  result: PointResult
  monteCarlo: PointMonteCarloDTO | null
  version: number
  createdAt: string
  updatedAt: string
}

export interface RunDTO {
  id: number
  instrumentId: number
  instrumentSerial: string | null
  instrumentLabel: string | null
  organizationId: number | null
  organizationName: string | null
  procedureId: number | null
  procedureVersionId: number
  procedureName: string | null
  procedureVersionNumber: number | null
  technicianId: number
  technicianName: string | null
  receivedDate: string
  calibrationDate: string
  ambientTemperatureK: number
  relativeHumidityPct: number
  distanceMm: number
  emissivitySetting: number
  reflectedTemperatureK: number
  instrumentTemperatureK: number
  adjusted: boolean
  /** True when the run has no adjustment: the as-found results are also the as-left results. */
  asLeftEqualsAsFound: boolean
  status: RunStatus
  submittedAt: string | null
  reviewerId: number | null
  reviewerName: string | null
  reviewedAt: string | null
  reviewComments: string | null
  notes: string | null
  pointCount: number
  /** Approved runs cannot change. */
  locked: boolean
  version: number
  createdAt: string
  updatedAt: string
}

export interface RunInstrumentSummary {
  id: number
  serial: string
  assetTag: string | null
  maker: string
  model: string
  organizationId: number
  organizationName: string | null
  band: BandInput
  /** e.g. '8–14 µm' or the responsivity table's name. */
  bandLabel: string
  accuracy: AccuracySpec
  resolutionK: number
  rangeMinK: number
  rangeMaxK: number
  defaultEmissivity: number
}

export interface RunRevisionDTO {
  id: number
  runId: number
  pointId: number | null
  userId: number
  userName: string | null
  at: string
  reason: string
  before: unknown
  after: unknown
}

export interface RunDetailDTO extends RunDTO {
  instrument: RunInstrumentSummary
  procedureVersion: ProcedureVersionDTO
  points: RunPointDTO[]
  revisions: RunRevisionDTO[]
  audit: AuditEventDTO[]
}

/** POST /api/runs/[id]/points/import: preview rows (line, data, errors), or the count created. */
export interface RunImportPreview {
  rows: { line: number, data: Record<string, unknown>, errors: Record<string, string> }[]
  valid: number
  invalid: number
}
