/**
 * Fixed vocabularies of calibration procedures and runs, with their labels for the UI. One list
 * each, used by the zod schemas, the models, the computation and the pages.
 */

/** Decision rules of ISO/IEC 17025:2017 7.8.6 as ILAC-G8:09/2019 describes them. */
export const DECISION_RULES = ['simple-acceptance', 'guard-band', 'non-binary'] as const
export type DecisionRuleName = (typeof DECISION_RULES)[number]
export const DECISION_RULE_LABELS: Record<DecisionRuleName, string> = {
  'simple-acceptance': 'Simple acceptance (no guard band)',
  'guard-band': 'Guarded acceptance (guard band w = r·U)',
  'non-binary': 'Non-binary statement (pass, conditional pass, conditional fail, fail)',
}

/** The rule's name alone, for text that states its guard band separately (the certificate). */
export const DECISION_RULE_NAMES: Record<DecisionRuleName, string> = {
  'simple-acceptance': 'Simple acceptance',
  'guard-band': 'Guarded acceptance',
  'non-binary': 'Non-binary statement',
}

/** GUM 4.2 / 4.3: Type A (statistics of repeated observations) or Type B (other information). */
export const COMPONENT_TYPES = ['A', 'B'] as const
export type ComponentType = (typeof COMPONENT_TYPES)[number]
export const COMPONENT_TYPE_LABELS: Record<ComponentType, string> = { A: 'Type A', B: 'Type B' }

/**
 * How a template component's `value` is read:
 * - `normal`: an expanded uncertainty U with its coverage factor k (u = U/k);
 * - `rectangular`, `triangular`, `u-shaped`: a half-width a (u = a/√3, a/√6, a/√2; GUM 4.3.7, 4.3.9);
 * - `standard`: the standard uncertainty u itself.
 */
export const TEMPLATE_DISTRIBUTIONS = ['normal', 'rectangular', 'triangular', 'u-shaped', 'standard'] as const
export type TemplateDistribution = (typeof TEMPLATE_DISTRIBUTIONS)[number]
export const TEMPLATE_DISTRIBUTION_LABELS: Record<TemplateDistribution, string> = {
  'normal': 'Normal (expanded uncertainty with k)',
  'rectangular': 'Rectangular (half-width)',
  'triangular': 'Triangular (half-width)',
  'u-shaped': 'U-shaped (half-width)',
  'standard': 'Standard uncertainty',
}

/**
 * Distributions that appear in a computed budget: the template's, plus `resolution` for the display
 * resolution δ of the instrument (u = δ/√12, GUM F.2.2.1).
 */
export type BudgetLineDistribution = TemplateDistribution | 'resolution'

/**
 * Units of a component's value: kelvin, millikelvin, an absolute emissivity (0.01 means ±0.01), or a
 * percentage of the emissivity value the input has at the point (1 means ±1 % of ε).
 */
export const COMPONENT_UNITS = ['K', 'mK', 'emissivity', 'percent-of-emissivity'] as const
export type ComponentUnit = (typeof COMPONENT_UNITS)[number]
export const COMPONENT_UNIT_LABELS: Record<ComponentUnit, string> = {
  'K': 'K',
  'mK': 'mK',
  'emissivity': 'emissivity (absolute)',
  'percent-of-emissivity': '% of emissivity',
}

/**
 * The input of the reading model a component acts on. The sensitivity coefficient comes from the
 * model at each point; `reading` acts on the reading itself (c = 1). `radianceTemperature` (the
 * certified T_rad) and `certificationReflectedTemperature` (T_w0, the surroundings when T_rad was
 * certified) exist only for a source whose certified value is a radiance temperature; there
 * `sourceTemperature` is the surface temperature T_s found from T_rad.
 */
export const MODEL_INPUTS = ['sourceTemperature', 'radianceTemperature', 'certificationReflectedTemperature', 'sourceEmissivity', 'reflectedTemperature', 'instrumentTemperature', 'emissivitySetting', 'reading', 'sourceEmissivity2', 'emissivityRatioSetting'] as const
export type ModelInput = (typeof MODEL_INPUTS)[number]
/** Inputs that only a radiance-temperature basis has. */
export const RADIANCE_BASIS_INPUTS: readonly ModelInput[] = ['radianceTemperature', 'certificationReflectedTemperature']
/**
 * Inputs that only a ratio (two-colour) pyrometer has: the source emissivity in its band 2 (`sourceEmissivity`
 * is then band 1's) and its emissivity-ratio setting k. In the ratio model the instrument temperature and
 * the emissivity setting do not enter: their sensitivity coefficients are 0 there.
 */
export const RATIO_INPUTS: readonly ModelInput[] = ['sourceEmissivity2', 'emissivityRatioSetting']
export const MODEL_INPUT_LABELS: Record<ModelInput, string> = {
  sourceTemperature: 'Source temperature T_s',
  radianceTemperature: 'Certified radiance temperature T_rad',
  certificationReflectedTemperature: 'Surroundings at the source’s certification T_w0',
  sourceEmissivity: 'Source emissivity ε_s',
  reflectedTemperature: 'Reflected temperature T_w',
  instrumentTemperature: 'Instrument temperature T_d',
  emissivitySetting: 'Emissivity setting ε_i',
  reading: 'Reading',
  sourceEmissivity2: 'Source emissivity in band 2 ε_2 (ratio pyrometer)',
  emissivityRatioSetting: 'Emissivity-ratio setting k (ratio pyrometer)',
}

/** Inputs whose unit is an emissivity (the others are temperatures, kelvin). */
export const EMISSIVITY_INPUTS: readonly ModelInput[] = ['sourceEmissivity', 'emissivitySetting', 'sourceEmissivity2', 'emissivityRatioSetting']
/** Units allowed for each kind of input. */
export const UNITS_FOR_TEMPERATURE: readonly ComponentUnit[] = ['K', 'mK']
export const UNITS_FOR_EMISSIVITY: readonly ComponentUnit[] = ['emissivity', 'percent-of-emissivity']

export const RUN_STATUSES = ['draft', 'submitted', 'returned', 'approved', 'void'] as const
export type RunStatus = (typeof RUN_STATUSES)[number]
export const RUN_STATUS_LABELS: Record<RunStatus, string> = {
  draft: 'Draft',
  submitted: 'Submitted for review',
  returned: 'Returned for correction',
  approved: 'Approved',
  void: 'Void',
}

/** Where the calibration was done (ISO/IEC 17025 7.8.2.1 b). */
export const PLACES_OF_CALIBRATION = ['laboratory', 'on-site'] as const
export type PlaceOfCalibration = (typeof PLACES_OF_CALIBRATION)[number]
export const PLACE_OF_CALIBRATION_LABELS: Record<PlaceOfCalibration, string> = {
  'laboratory': "In the laboratory's premises",
  'on-site': "At the customer's site",
}

/** The run header fields that are measured conditions: entered, never assumed. */
export const CONDITION_FIELDS = ['ambientTemperatureK', 'relativeHumidityPct', 'distanceMm', 'reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting'] as const
export type ConditionField = (typeof CONDITION_FIELDS)[number]
export const CONDITION_LABELS: Record<ConditionField, string> = {
  ambientTemperatureK: 'Ambient temperature',
  relativeHumidityPct: 'Relative humidity',
  distanceMm: 'Measuring distance',
  reflectedTemperatureK: 'Reflected (surroundings) temperature',
  instrumentTemperatureK: "Instrument's own temperature",
  emissivitySetting: 'Emissivity setting',
}
/** The conditions a point cannot be computed without (the reading model's inputs). */
export const COMPUTATION_CONDITIONS: readonly ConditionField[] = ['reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting']

/**
 * The measured conditions of a run of an instrument of a given kind (issue 16): a ratio pyrometer's run
 * records its emissivity-ratio setting instead of the emissivity setting, and the instrument's own
 * temperature does not enter its model (it may still be entered). Labels of every one: {@link RUN_CONDITION_LABELS}.
 */
export type RunConditionField = ConditionField | 'emissivityRatioSetting'
export const RUN_CONDITION_LABELS: Record<RunConditionField, string> = { ...CONDITION_LABELS, emissivityRatioSetting: 'Emissivity-ratio (slope) setting' }
const RATIO_CONDITIONS: readonly RunConditionField[] = ['ambientTemperatureK', 'relativeHumidityPct', 'distanceMm', 'reflectedTemperatureK', 'emissivityRatioSetting']
const RATIO_COMPUTATION: readonly RunConditionField[] = ['reflectedTemperatureK', 'emissivityRatioSetting']

/**
 * The conditions a run of this kind of instrument must have entered before it is submitted or certified.
 * @param ratio - true for a ratio (two-colour) pyrometer
 * @returns field names of the run header
 * @example conditionFieldsFor(true) → [… 'reflectedTemperatureK', 'emissivityRatioSetting']
 */
export function conditionFieldsFor(ratio: boolean): readonly RunConditionField[] {
  return ratio ? RATIO_CONDITIONS : CONDITION_FIELDS
}

/**
 * The conditions a point of this kind cannot be computed without (the model's inputs).
 * @param ratio - true for a ratio (two-colour) pyrometer
 * @returns field names of the run header
 * @example computationConditionsFor(false) → ['reflectedTemperatureK', 'instrumentTemperatureK', 'emissivitySetting']
 */
export function computationConditionsFor(ratio: boolean): readonly RunConditionField[] {
  return ratio ? RATIO_COMPUTATION : COMPUTATION_CONDITIONS
}

/** As found (before any adjustment) and as left (after it); a run without adjustment has only as-found points. */
export const POINT_STAGES = ['as-found', 'as-left'] as const
export type PointStage = (typeof POINT_STAGES)[number]
export const POINT_STAGE_LABELS: Record<PointStage, string> = { 'as-found': 'As found', 'as-left': 'As left' }

export const VERDICT_LABELS = {
  'pass': 'Pass',
  'conditional-pass': 'Conditional pass',
  'conditional-fail': 'Conditional fail',
  'fail': 'Fail',
} as const

/** Columns the run list may be sorted by. */
export const RUN_SORTS = ['calibrationDate', 'receivedDate', 'status', 'createdAt', 'updatedAt', 'id'] as const
export type RunSort = (typeof RUN_SORTS)[number]

/** Most repeat readings per point. */
export const MAX_READINGS = 50
/** Coverage probability of every stated expanded uncertainty (the GUM's "k = 2" level). */
export const COVERAGE_PROBABILITY = 0.9545
