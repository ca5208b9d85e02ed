/**
 * DTOs of calibration procedures and runs (server/api/procedures, server/api/runs).
 * Temperatures and uncertainties in kelvin unless a field says otherwise.
 */
import type { CertifiedBasis, InstrumentKind, SourceKind, WavelengthMediumName } from '../registers/constants'
import type {
  BudgetLineDistribution,
  ComponentType,
  ComponentUnit,
  DecisionRuleName,
  ModelInput,
  PlaceOfCalibration,
  PointStage,
  RunStatus,
  TemplateDistribution,
} from '../calibration/constants'
import type { AccuracySpec } from '../schemas/instrument'
import type { CalibrationEquationSettings, ImagerSettings, RoiFramesInput, RoiInput } from '../schemas/run'
import type { ImagerNetdResult, ImagerPointStatistics } from '../calibration/imager'
import type { EquationTable } from '../calibration/equation'
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

/**
 * A budget line taken from the equipment used (the source's certificate and register entry, the
 * reference thermometer's calibration), with where its value came from.
 */
export interface EquipmentLine extends TemplateComponent {
  /** Register entry and certificate the value comes from, e.g. 'BB-FP-01, certificate HTS-26-0311'. */
  origin: string
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
  /** Correlated pairs of template components, indices into `template` (GUM 5.2.2); empty: all independent. */
  correlations: TemplateCorrelation[]
  /**
   * True: each point's budget also takes the reference equipment's lines from the registers (the
   * source's certified U with its k, its emissivity uncertainty for the instrument's band, uniformity,
   * stability; the reference thermometer's calibration uncertainty), and the template holds the
   * instrument-side lines. False: the template is the whole budget (versions before migration 0010).
   */
  budgetFromEquipment: boolean
  /**
   * m in "the source's aperture must be at least m × the instrument's spot diameter"; null: the
   * procedure states none and the spot must only fit (m = 1).
   */
  spotMargin: number | null
  cmc: CmcEntry[]
  /** What the procedure applies to (null: a version from before this was recorded — it cannot be used for new points). */
  applicability: ProcedureApplicability | null
  changeNote: string | null
  createdBy: number | null
  createdByName: string | null
  createdAt: string
}

/** What a procedure applies to: source kinds, the instrument band it covers (µm) and its temperature range (K). */
export interface ProcedureApplicability {
  sourceKinds: SourceKind[]
  bandMinUm: number
  bandMaxUm: number
  minK: number
  maxK: number
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
  /** k of a normal line's expanded uncertainty `value` (u = value/k); absent for other distributions. */
  coverageFactor?: number | null
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
  /**
   * Where the value came from: the procedure (name, document, version), the register entry and
   * certificate of the equipment, or the point's own readings. Absent in results before engine 1.2.0.
   */
  origin?: string
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

/** A band the certified value of a source belongs to (µm; wavelengths in vacuum unless `medium` is 'air'). */
export interface CertifiedBandInput {
  kind: 'rectangular'
  lambda1Um: number
  lambda2Um: number
  medium?: WavelengthMediumName
}

/**
 * What a source's corrected value is, as the computation used it (shared/registers/constants.ts,
 * CERTIFIED_BASES). For a radiance temperature: its band b0 and the surroundings' temperature T_w0 when
 * it was certified.
 */
export type ReferenceBasisInput =
  | { kind: 'cavity-temperature' | 'surface-temperature' }
  | { kind: 'radiance-temperature', band: CertifiedBandInput, reflectedTemperatureK: number }

/** How the reference temperature of a point was obtained. `basis` absent (results before engine 1.2.0): the value is T_s. */
export type ReferenceInput =
  | { kind: 'source-correction', sourceIndicatedK: number, corrections: [number, number][], basis?: ReferenceBasisInput }
  | { kind: 'reference-thermometer', referenceReadingK: number }

/** The basis of a point's reference temperature: the source's certified basis, or a reference thermometer's reading. */
export type ReferenceBasis = CertifiedBasis | 'reference-thermometer'

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
  /** Where the template comes from (procedure name, document, version), stated on each template line. */
  templateOrigin?: string
  /** Lines from the reference equipment used, after the template's (see ProcedureVersionDTO.budgetFromEquipment). */
  equipmentLines?: EquipmentLine[]
  /** Correlated pairs of template components (indices into `template`); omitted or empty: all independent. */
  correlations?: TemplateCorrelation[]
  /** What the setup checks found (the source emissivity used for the band, the spot against the aperture), copied into the budget's notes. */
  setupNotes?: string[]
  cmc: CmcEntry[]
  accuracy: AccuracySpec
  rule: DecisionRuleName
  guardBandFactor: number | null
  /**
   * A ratio (two-colour) pyrometer's point (engine 1.3.0): computed with the two-colour model of
   * shared/radiometry/ratio.ts. `band` and `sourceEmissivity` are then band 1's; `instrumentTemperatureK`
   * and `emissivitySetting` do not enter the model.
   */
  ratio?: RatioPointInput
  /** A thermal imager's point (engine 1.3.0): its regions of interest; `readingsK` are the centre ROI's readings. */
  imager?: ImagerPointInput
}

/** What a ratio pyrometer's point adds to the inputs: band 2, the source's emissivity in it and the ratio setting. */
export interface RatioPointInput {
  band2: BandInput
  /** ε_s in band 2. */
  sourceEmissivity2: number
  /** The instrument's emissivity-ratio ("slope") setting k in the run. */
  emissivityRatioSetting: number
}

/** What a thermal imager's point adds to the inputs. */
export interface ImagerPointInput {
  /** The regions of interest with their readings, K (position and size in pixels). */
  rois: RoiInput[]
  /** Name of the centre ROI (its readings are the point's `readingsK`). */
  centreRoi: string
  /** A series of frames on the uniform source, per ROI, K (for the NETD); null when none was recorded. */
  netdFrames: RoiFramesInput[] | null
}

/** A thermal imager's point as computed: per ROI, the centre's error, the non-uniformity and the NETD (shared/calibration/imager.ts). */
export interface ImagerPointResult {
  /** Per ROI: its position and size (pixels) with the mean and s of its readings, K. */
  rois: (ImagerPointStatistics['rois'][number] & { xPx: number, yPx: number, widthPx: number, heightPx: number })[]
  centreRoi: string
  /** Centre mean − expected reading, K (the point's error). */
  centreErrorK: number
  /** max − min, sample standard deviation of the ROI means and the largest deviation from the centre, K; null with one ROI. */
  uniformity: ImagerPointStatistics['uniformity']
  /** The NETD from the frame series (mean of the per-ROI temporal standard deviations), or null. */
  netd: ImagerNetdResult | null
}

/** The computed result of one calibration point (shared/calibration/compute.ts returns exactly this). */
export interface PointResult {
  /**
   * Reference temperature, K: the source's corrected value on its certified basis (a radiance temperature
   * for a radiance basis), or the reference thermometer's reading.
   */
  referenceTemperatureK: number
  /** What the reference temperature is (absent before engine 1.2.0: then it is T_s). */
  referenceBasis?: ReferenceBasis
  /** Source temperature T_s in the reading model, K (from T_rad for a radiance basis; else the reference temperature). */
  sourceTemperatureK?: number
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
  /**
   * The inputs as computed. The instrument temperature and emissivity setting are null where the
   * run has none (a ratio pyrometer's model takes neither).
   */
  inputs: Omit<PointComputationInput, 'instrumentTemperatureK' | 'emissivitySetting'> & { instrumentTemperatureK: number | null, emissivitySetting: number | null }
  /** A thermal imager's point: ROI statistics, uniformity and NETD (engine 1.3.0). */
  imager?: ImagerPointResult
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
  /** The adaptive procedure of JCGM 101 7.9 when it was asked for: batches run and whether the results stabilised. */
  adaptive?: { batchTrials: number, batches: number, significantDigits: number, tolerance: number, converged: boolean } | null
  /** Correlated pairs sampled jointly (JCGM 101 6.4.8): the stated r and the r* of the underlying normals. */
  correlations?: { between: [number, number], coefficient: number, normalCoefficient: number }[]
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
  /** A thermal imager's regions of interest with their readings (null for other kinds). */
  rois: RoiInput[] | null
  /** A thermal imager's frame series on the uniform source for the NETD (null when none). */
  netdFrames: RoiFramesInput[] | null
  result: PointResult
  monteCarlo: PointMonteCarloDTO | null
  /** A voided point is kept (greyed, audited) and never used or printed. */
  voidedAt: string | null
  voidedByName: string | null
  voidReason: string | null
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
  /** From the receipt record; null until the item is received. */
  receivedDate: string | null
  calibrationDate: string
  /** Measured conditions: null until entered. */
  ambientTemperatureK: number | null
  relativeHumidityPct: number | null
  distanceMm: number | null
  /** Spot diameter stated for the run at its distance, mm (null: from the instrument's D:S). */
  spotDiameterMm: number | null
  emissivitySetting: number | null
  reflectedTemperatureK: number | null
  instrumentTemperatureK: number | null
  /** A ratio pyrometer's emissivity-ratio setting in the run (null until entered; null for other kinds). */
  emissivityRatioSetting: number | null
  /** A thermal imager's lens, field of view, range setting and non-uniformity correction (null until entered). */
  imagerSettings: ImagerSettings | null
  /** The temperatures of the calibration-equation table the certificate states, and the points' correlation (null: none). */
  calibrationEquation: CalibrationEquationSettings | null
  ambientInstrumentId: number | null
  adjusted: boolean
  /** True when the run has no adjustment: the as-found results are also the as-left results. */
  asLeftEqualsAsFound: boolean
  status: RunStatus
  submittedAt: string | null
  reviewerId: number | null
  reviewerName: string | null
  reviewedAt: string | null
  reviewComments: string | null
  /** The laboratory's own notes (null for anyone outside the laboratory). */
  internalNotes: string | null
  certificateRemarks: string | null
  methodDeviations: string | null
  placeOfCalibration: PlaceOfCalibration
  siteAddress: string | null
  requestId: number | null
  voidedAt: string | null
  voidReason: string | null
  /** The run whose certificate this run corrects, and why. */
  revisionOf: number | null
  revisionReason: string | null
  /** Who entered or changed data (they may not approve it). */
  contributorIds: number[]
  /** The version the last review saw (changes since then are listed for the reviewer). */
  lastReviewedVersion: number | null
  /** Points that are not voided. */
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
  kind: InstrumentKind
  /** A ratio pyrometer's band 2 and its label (null for other kinds, or before it is recorded). */
  band2: BandInput | null
  band2Label: string | null
  /** A ratio pyrometer's emissivity-ratio setting in the register. */
  emissivityRatioSetting: number | null
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
  /** The point's number in the run (null for a change of the header or the receipt). */
  pointNumber: number | null
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
  receipt: ItemReceiptDTO | null
  /** The agreed terms the run works to (from its calibration request), or null: then no statement of conformity is made. */
  agreement: RunAgreementDTO | null
  /** Measured conditions still to be entered, by field, with their labels. */
  missingConditions: { field: string, label: string }[]
  /** Revisions recorded after the last review (what the reviewer has not seen). */
  changesSinceReview: RunRevisionDTO[]
  /** The certificate issued from this run, if any; the certificate this run corrects, if any. */
  certificate: { id: number, number: string, status: string } | null
  corrects: { id: number, number: string } | null
  /** The calibration equation through the as-left points with its table, when the run asks for one. */
  equation: RunEquationDTO | null
}

/** A calibration equation through a run's as-left points and its table at the chosen temperatures (shared/calibration/equation.ts). */
export interface RunEquationDTO {
  /** The fit and its table, or why there is none (too few points, a temperature outside the calibrated range …). */
  fit: EquationTable | null
  problem: { field: string, message: string } | null
}

/** The receipt of the item (ISO/IEC 17025 7.4). */
export interface ItemReceiptDTO {
  id: number
  runId: number
  receivedOn: string
  receivedBy: number
  receivedByName: string | null
  packaging: string
  condition: string
  accessories: string | null
  deviations: string | null
  customerConsulted: boolean
  customerDecision: string | null
  version: number
  updatedAt: string
}

/** The terms agreed with the customer that a run works to. */
export interface RunAgreementDTO {
  requestId: number
  termsVersion: number
  agreedAt: string
  method: 'portal' | 'recorded'
  note: string | null
  agreedByName: string | null
  decisionRule: DecisionRuleName
  guardBandFactor: number | null
  /** The specification agreed (null: the instrument's own accuracy specification). */
  specification: AccuracySpec | null
  pointsK: number[]
  /** True when the terms still stand (not changed since they were agreed). */
  current: boolean
}

/** POST /api/runs/[id]/points/import: preview rows (line, data, errors), or the count created. */
export interface RunImportPreview {
  rows: { line: number, data: Record<string, unknown>, errors: Record<string, string> }[]
  valid: number
  invalid: number
}
