/**
 * The computation of one calibration point of a radiation thermometer against a blackbody source:
 * reference temperature, expected reading, error of indication, the full uncertainty budget, the CMC
 * floor, rounding for the statement and the conformity decision. Pure and framework-free: the
 * server loads the records, builds a {@link PointComputationInput} and stores what this returns,
 * with the inputs, so a stored result can be recomputed exactly.
 *
 * Steps and the methods they implement (units: kelvin unless stated):
 * 1. Reference temperature: the source's indicated temperature plus the correction of its
 *    certificate, interpolated linearly and never extrapolated (shared/registers/correction.ts), or
 *    the reading of a reference thermometer. The source's value has the basis its certificate states
 *    (`reference.basis`, shared/registers/constants.ts CERTIFIED_BASES): a cavity or surface temperature
 *    is the source temperature T_s itself; a radiance temperature T_rad in band b0 with the surroundings
 *    at T_w0 gives T_s from ε_s·S_b0(T_s) + (1 − ε_s)·S_b0(T_w0) = S_b0(T_rad) (domain notes §7;
 *    shared/radiometry/radianceTemperature.ts). Without a basis (results before engine 1.2.0) the value is T_s.
 * 2. Expected reading from the reading model ε_i·S(T_meas) + (1 − ε_i)·S(T_d) = ε_s·S(T_s) + (1 − ε_s)·S(T_w)
 *    in the instrument's band with today's T_w (ASTM E2758 / E2847 form, see shared/radiometry/reading.ts)
 *    and its sensitivity coefficients ∂T_meas/∂x at the point (implicit differentiation of the same model;
 *    for a radiance basis through both equations: dT_meas/dT_rad, dT_meas/dε_s with ε_s in both steps,
 *    dT_meas/dT_w0; a line on `sourceTemperature` then moves T_s itself).
 * 3. Mean reading, experimental standard deviation s (GUM 4.2.2, n − 1 in the denominator), error of
 *    indication E = mean − expected (VIM 2.16) and correction −E.
 * 4. Budget (GUM 5.1.2): the procedure's template components, then the lines of the reference equipment
 *    used (`equipmentLines`: the source's certified U with its k, its emissivity uncertainty for the
 *    band, uniformity, stability; the reference thermometer's calibration), each converted to a standard
 *    uncertainty in its input's unit (normal U/k; rectangular a/√3; triangular a/√6; U-shaped a/√2;
 *    GUM 4.3.7, 4.3.9) with its sensitivity from step 2 (c = 1 on the reading); the repeatability of
 *    the mean s/√n (Type A, ν = n − 1, GUM 4.2.3) when n ≥ 2; the display resolution δ/√12 (GUM F.2.2.1).
 *    Every line states its origin (the procedure and version, the register entry and certificate, or
 *    the point's readings).
 *    u_c, ν_eff (Welch–Satterthwaite, GUM G.4.1), k = t_{95.45 %}(ν_eff) and U = k·u_c by
 *    shared/uncertainty/budget.ts; correlated template components (`correlations`, pairs of template
 *    indices with r) enter u_c by GUM 5.2.2 eq. (16) (see budget.ts for ν_eff and the shares).
 * 5. The uncertainty stated is never below the laboratory's CMC at T_s: U_stated = max(U, CMC).
 * 6. Rounding to two significant digits, the error to the same decimal place (GUM 7.2.6).
 * 7. Conformity with the instrument's accuracy specification at the mean reading under the decision
 *    rule (ILAC-G8:09/2019), with U_stated, and the probability of conformity for a normal PDF with
 *    u = U_stated/k (JCGM 106:2012, 7.4): k of the budget, or 2 when the CMC (stated at k = 2) is stated.
 *
 * Kinds of instrument (engine 1.3.0):
 * - A ratio (two-colour) pyrometer's point (`inputs.ratio`) takes its expected reading and sensitivities
 *   from the two-colour model of shared/radiometry/ratio.ts (domain notes §7): S_i = ε_i·L_i(T_s) +
 *   (1 − ε_i)·L_i(T_w) in bands 1 and 2, L_1(T_R)/L_2(T_R) = (S_1/S_2)/k. Lines on `sourceEmissivity` act on
 *   ε_1, on `sourceEmissivity2` on ε_2, on `emissivityRatioSetting` on k; the instrument temperature and the
 *   emissivity setting do not enter the model (c = 0). Its reference must be a source temperature (cavity or
 *   surface) or a reference thermometer: a radiance temperature belongs to one band and is refused.
 * - A thermal imager's point (`inputs.imager`) is computed on its centre region of interest (the point's
 *   readings are the centre ROI's), and adds the ROI statistics, the non-uniformity over the ROIs and, with a
 *   frame series, the NETD (shared/calibration/imager.ts).
 */
import { ENGINE_VERSION } from '../engine'
import { EngineInputError } from '../radiometry/errors'
import { prepareBand, type Band, type PreparedBand } from '../radiometry/planck'
import { expectedReadingFromRadianceTemperature } from '../radiometry/radianceTemperature'
import { expectedRatioReading } from '../radiometry/ratio'
import { readingSensitivities, type ReadingSensitivities } from '../radiometry/reading'
import { imagerNetd, imagerPointStatistics } from './imager'
import { correctionAt, CorrectionRangeError } from '../registers/correction'
import { evaluateBudget, roundResult, validateCorrelations, type BudgetCorrelation } from '../uncertainty/budget'
import { evaluateConformity } from '../uncertainty/conformity'
import type { BudgetLine, CmcEntry, ImagerPointResult, PointComputationInput, PointResult, ReferenceBasis, ReferenceBasisInput, TemplateComponent } from '../types/runs'
import { COVERAGE_PROBABILITY, EMISSIVITY_INPUTS, MAX_READINGS, RADIANCE_BASIS_INPUTS, RATIO_INPUTS, UNITS_FOR_EMISSIVITY, UNITS_FOR_TEMPERATURE, type ModelInput } from './constants'

/** Name of the Type A line added from the readings. */
export const REPEATABILITY_NAME = 'Repeatability of the readings (s/√n)'
/** Name of the line added for the instrument's display resolution. */
export const RESOLUTION_NAME = 'Display resolution of the instrument (δ/√12)'
/** The remark added to a budget computed from one reading. */
export const SINGLE_READING_NOTE = 'One reading only: the repeatability (Type A, s/√n) cannot be evaluated and is not in the budget.'
/** Origin of the lines computed from the point's own readings. */
export const READINGS_ORIGIN = 'The readings of this point'
/** Origin of the display-resolution line. */
export const RESOLUTION_ORIGIN = 'The instrument’s display resolution (instrument register)'

/**
 * Reference temperature of a point, K.
 * @param reference - the source's indicated temperature (K) with its certificate table `[setPointK, correctionK]`,
 *   or a reference thermometer's reading (K)
 * @returns T_s (K) and the correction applied (K; null for a reference thermometer)
 * @throws EngineInputError naming `sourceIndicatedK` (outside the table, or no table) or `referenceReadingK`
 * @example referenceTemperature({ kind: 'source-correction', sourceIndicatedK: 348.15, corrections: [[323.15, 0.12], [373.15, 0.2]] })
 *   → { referenceTemperatureK: 348.31, sourceCorrectionK: 0.16 }
 */
export function referenceTemperature(reference: PointComputationInput['reference']): { referenceTemperatureK: number, sourceCorrectionK: number | null } {
  if (reference.kind === 'reference-thermometer') {
    const t = reference.referenceReadingK
    if (!(typeof t === 'number' && Number.isFinite(t) && t > 0)) throw new EngineInputError('referenceReadingK', 'must be a temperature above 0 K')
    return { referenceTemperatureK: t, sourceCorrectionK: null }
  }
  const t = reference.sourceIndicatedK
  if (!(typeof t === 'number' && Number.isFinite(t) && t > 0)) throw new EngineInputError('sourceIndicatedK', 'must be a temperature above 0 K')
  if (!reference.corrections?.length) {
    throw new EngineInputError('sourceIndicatedK', "the source's certificate has no correction table; give a reference thermometer reading instead")
  }
  try {
    const c = correctionAt(reference.corrections, t)
    return { referenceTemperatureK: t + c, sourceCorrectionK: c }
  }
  catch (err) {
    if (err instanceof CorrectionRangeError) throw new EngineInputError('sourceIndicatedK', err.message)
    throw err
  }
}

/**
 * Standard uncertainty of a template component in its input's unit (K, or an absolute emissivity).
 * @param c - the component (value in `c.unit`)
 * @param inputValue - the value of the emissivity input at the point (needed for `percent-of-emissivity`)
 * @param index - position in the template, for error field names `template[i].…`
 * @param list - the list the component is in, for error field names (`template` or `equipmentLines`)
 * @returns u(xᵢ), K or absolute emissivity
 * @throws EngineInputError (`template[i].value`, `.coverageFactor`, `.unit`)
 * @example templateStandardUncertainty({ distribution: 'rectangular', value: 1, unit: 'percent-of-emissivity', input: 'sourceEmissivity', … }, 0.95)
 *   ≈ 0.0095/√3 = 0.005485
 */
export function templateStandardUncertainty(c: TemplateComponent, inputValue: number, index = 0, list = 'template'): number {
  const f = `${list}[${index}]`
  if (!(typeof c.value === 'number' && Number.isFinite(c.value) && c.value >= 0)) throw new EngineInputError(`${f}.value`, 'must be a finite number ≥ 0')
  const emissivityInput = EMISSIVITY_INPUTS.includes(c.input)
  const allowed = emissivityInput ? UNITS_FOR_EMISSIVITY : UNITS_FOR_TEMPERATURE
  if (!allowed.includes(c.unit)) throw new EngineInputError(`${f}.unit`, `an input '${c.input}' takes ${allowed.join(' or ')}, not ${c.unit}`)
  let u: number
  switch (c.distribution) {
    case 'normal':
      if (!(typeof c.coverageFactor === 'number' && c.coverageFactor > 0)) throw new EngineInputError(`${f}.coverageFactor`, 'a normal component needs the coverage factor k of its expanded uncertainty')
      u = c.value / c.coverageFactor
      break
    case 'rectangular': u = c.value / Math.sqrt(3); break
    case 'triangular': u = c.value / Math.sqrt(6); break
    case 'u-shaped': u = c.value / Math.SQRT2; break
    case 'standard': u = c.value; break
    default: throw new EngineInputError(`${f}.distribution`, `unknown distribution '${String(c.distribution)}'`)
  }
  switch (c.unit) {
    case 'mK': return u / 1000
    case 'percent-of-emissivity': return (u / 100) * inputValue
    default: return u
  }
}

/**
 * The CMC at a temperature: the largest expanded uncertainty (k = 2) of the ranges that contain it
 * (bounds inclusive), or null when none does.
 * @param cmc - ranges `{ minK, maxK, expandedUncertaintyK }`
 * @param temperatureK - K
 * @returns K or null
 * @example cmcAt([{ minK: 250, maxK: 400, expandedUncertaintyK: 0.6 }], 373.15) === 0.6
 */
export function cmcAt(cmc: readonly CmcEntry[], temperatureK: number): number | null {
  let best: number | null = null
  for (const r of cmc) {
    if (temperatureK >= r.minK && temperatureK <= r.maxK && (best === null || r.expandedUncertaintyK > best)) best = r.expandedUncertaintyK
  }
  return best
}

/**
 * Sensitivity coefficients of a point: those of the reading model (or the ratio model), for a radiance basis
 * those of T_rad and T_w0, for a ratio pyrometer those of ε_2 and k.
 */
type PointSensitivities = ReadingSensitivities & {
  radianceTemperature: number | null
  certificationReflectedTemperature: number | null
  sourceEmissivity2: number | null
  emissivityRatioSetting: number | null
}

function sensitivityFor(input: ModelInput, s: PointSensitivities, field: string): number {
  if (input === 'reading') return 1
  const c = s[input]
  if (c === null) {
    if (RATIO_INPUTS.includes(input)) throw new EngineInputError(field, `a line on ${input} belongs to a ratio (two-colour) pyrometer; this point's instrument is not one`)
    throw new EngineInputError(field, `a line on ${input} needs a source whose certified value is a radiance temperature; this point's reference is not one`)
  }
  return c
}

/** Coverage factor of a CMC entry's expanded uncertainty (CmcEntry: k = 2). */
const CMC_COVERAGE_FACTOR = 2

/**
 * Validates the point's correlations against its template (field names `correlations[n].…`).
 * @param correlations - pairs of template indices with r, or undefined
 * @param templateLength - number of template components
 * @returns pairs for evaluateBudget (template indices are budget line indices: the template lines come first)
 * @throws EngineInputError (`correlations`, `correlations[n].between`, `correlations[n].coefficient`)
 */
function templateCorrelations(correlations: PointComputationInput['correlations'], templateLength: number): BudgetCorrelation[] {
  if (correlations === undefined || correlations === null) return []
  return validateCorrelations(correlations, templateLength).map(({ i, j, r }) => ({ between: [i, j] as [number, number], coefficient: r }))
}

/** The reading-model field names become the point's own: T_s comes from the reference input, T_rad's band and T_w0 from the source. */
function pointField(field: string, reference: PointComputationInput['reference']): string {
  if (field === 'sourceTemperatureK' || field === 'radianceTemperatureK') return reference.kind === 'source-correction' ? 'sourceIndicatedK' : 'referenceReadingK'
  if (field.startsWith('radianceTemperatureBand') || field === 'certificationReflectedTemperatureK') return 'sourceId'
  if (field.startsWith('band2')) return 'instrument.band2'
  if (field.startsWith('band')) return 'instrument.band'
  if (field === 'sourceEmissivity1' || field === 'sourceEmissivity2') return 'sourceId'
  return field
}

/** Calls the engine, naming a refused input by the point's field. */
function asPoint<T>(fn: () => T, reference: PointComputationInput['reference']): T {
  try {
    return fn()
  }
  catch (err) {
    if (err instanceof EngineInputError) throw new EngineInputError(pointField(err.field, reference), err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message)
    throw err
  }
}

/** The basis of the point's reference temperature (a source without a stated basis: its value is T_s). */
function basisOf(reference: PointComputationInput['reference']): { basis: ReferenceBasis, input: ReferenceBasisInput | null } {
  if (reference.kind === 'reference-thermometer') return { basis: 'reference-thermometer', input: null }
  const b = reference.basis ?? null
  return { basis: b?.kind ?? 'surface-temperature', input: b }
}

/**
 * The expected reading and its sensitivities from the reference temperature on its basis (steps 1–2).
 * @returns T_s (K), the sensitivities (K per input unit; T_rad and T_w0 null unless a radiance basis)
 */
function modelAtPoint(input: PointComputationInput, band: Band | PreparedBand, referenceK: number, basis: ReferenceBasisInput | null): { sourceTemperatureK: number, sens: PointSensitivities } {
  if (input.ratio) return ratioAtPoint(input, band, referenceK, basis)
  const common = {
    band,
    sourceEmissivity: input.sourceEmissivity,
    reflectedTemperatureK: input.reflectedTemperatureK,
    instrumentTemperatureK: input.instrumentTemperatureK,
    emissivitySetting: input.emissivitySetting,
  }
  if (basis?.kind !== 'radiance-temperature') {
    const s = asPoint(() => readingSensitivities({ ...common, sourceTemperatureK: referenceK }), input.reference)
    return { sourceTemperatureK: referenceK, sens: { ...s, radianceTemperature: null, certificationReflectedTemperature: null, sourceEmissivity2: null, emissivityRatioSetting: null } }
  }
  if (!(typeof basis.reflectedTemperatureK === 'number' && Number.isFinite(basis.reflectedTemperatureK) && basis.reflectedTemperatureK > 0)) {
    throw new EngineInputError('sourceId', 'the source’s radiance temperature needs the temperature of the surroundings when it was certified (T_w0)')
  }
  const r = asPoint(() => expectedReadingFromRadianceTemperature({
    ...common,
    radianceTemperatureBand: basis.band as Band,
    radianceTemperatureK: referenceK,
    certificationReflectedTemperatureK: basis.reflectedTemperatureK,
  }), input.reference)
  // ∂T_meas/∂T_s at fixed ε_s (a line that moves the surface temperature itself) from the reading model at T_s
  const atTs = asPoint(() => readingSensitivities({ ...common, sourceTemperatureK: r.sourceTemperatureK }), input.reference)
  return {
    sourceTemperatureK: r.sourceTemperatureK,
    sens: {
      expectedReadingK: r.expectedReadingK,
      sourceTemperature: atTs.sourceTemperature,
      // ε_s enters both T_s (step 1) and the reading model (step 2): the total derivative
      sourceEmissivity: r.sensitivities.sourceEmissivity,
      reflectedTemperature: r.sensitivities.reflectedTemperature,
      instrumentTemperature: r.sensitivities.instrumentTemperature,
      emissivitySetting: r.sensitivities.emissivitySetting,
      radianceTemperature: r.sensitivities.radianceTemperature,
      certificationReflectedTemperature: r.sensitivities.certificationReflectedTemperature,
      sourceEmissivity2: null,
      emissivityRatioSetting: null,
    },
  }
}

/**
 * A ratio pyrometer's expected reading and sensitivities (two-colour model, shared/radiometry/ratio.ts) at the
 * source temperature T_s = the reference temperature (a cavity or surface temperature, or a thermometer's reading).
 */
function ratioAtPoint(input: PointComputationInput, band: Band | PreparedBand, referenceK: number, basis: ReferenceBasisInput | null): { sourceTemperatureK: number, sens: PointSensitivities } {
  const ratio = input.ratio!
  if (basis?.kind === 'radiance-temperature') {
    throw new EngineInputError('sourceId', 'a ratio pyrometer’s point needs the source’s temperature (a cavity or surface temperature) or a reference thermometer: a radiance temperature belongs to one band and says nothing about the other')
  }
  const band2 = ratio.band2.kind === 'tabulated' ? prepareBand(ratio.band2 as Band) : (ratio.band2 as Band)
  const r = asPoint(() => expectedRatioReading({
    band1: band,
    band2,
    sourceTemperatureK: referenceK,
    sourceEmissivity1: input.sourceEmissivity,
    sourceEmissivity2: ratio.sourceEmissivity2,
    reflectedTemperatureK: input.reflectedTemperatureK,
    emissivityRatioSetting: ratio.emissivityRatioSetting,
  }), input.reference)
  const s = r.sensitivities
  return {
    sourceTemperatureK: referenceK,
    sens: {
      expectedReadingK: r.expectedReadingK,
      sourceTemperature: s.sourceTemperature,
      sourceEmissivity: s.sourceEmissivity1,
      reflectedTemperature: s.reflectedTemperature,
      // neither enters the two-colour model
      instrumentTemperature: 0,
      emissivitySetting: 0,
      radianceTemperature: null,
      certificationReflectedTemperature: null,
      sourceEmissivity2: s.sourceEmissivity2,
      emissivityRatioSetting: s.emissivityRatioSetting,
    },
  }
}

/** The NETD's refusals (shared/calibration/imager.ts names `rois…`) named as the point's frame series (`netdFrames…`). */
function asFrames<T>(fn: () => T): T {
  try {
    return fn()
  }
  catch (err) {
    if (err instanceof EngineInputError) {
      throw new EngineInputError(err.field.replace(/^rois/, 'netdFrames'), err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message)
    }
    throw err
  }
}

/**
 * A thermal imager's point statistics: per ROI, the centre's error, the non-uniformity and the NETD
 * (shared/calibration/imager.ts), with each ROI's position and size.
 * @throws EngineInputError naming `rois…` or `netdFrames…` (also when the centre ROI's readings are not the point's)
 */
function imagerAt(imager: NonNullable<PointComputationInput['imager']>, readingsK: readonly number[], expectedK: number): ImagerPointResult {
  if (!Array.isArray(imager.rois)) throw new EngineInputError('rois', 'a thermal imager’s point needs its regions of interest')
  const centre = imager.rois.find(r => r && r.name === imager.centreRoi)
  if (!centre) throw new EngineInputError('rois', `no region of interest is named '${String(imager.centreRoi)}'`)
  if (!Array.isArray(centre.readingsK) || centre.readingsK.length !== readingsK.length || centre.readingsK.some((r, i) => r !== readingsK[i])) {
    throw new EngineInputError('rois', `the point's readings must be those of its '${imager.centreRoi}' region of interest`)
  }
  const stats = imagerPointStatistics({ expectedReadingK: expectedK, rois: imager.rois.map(r => ({ name: r.name, readingsK: r.readingsK })), centreRoi: imager.centreRoi })
  const netd = imager.netdFrames?.length ? asFrames(() => imagerNetd({ rois: imager.netdFrames!.map(f => ({ name: f.name, framesK: f.framesK })) })) : null
  return {
    rois: stats.rois.map((r, i) => ({ ...r, xPx: imager.rois[i]!.xPx, yPx: imager.rois[i]!.yPx, widthPx: imager.rois[i]!.widthPx, heightPx: imager.rois[i]!.heightPx })),
    centreRoi: imager.centreRoi,
    centreErrorK: stats.centre.errorK,
    uniformity: stats.uniformity,
    netd,
  }
}

/**
 * Computes one calibration point (see the module notes for each step and its source).
 * @param input - band (µm), reference (K) with the basis of the source's value, ε_s, T_w (K), T_d (K), ε_i,
 *   readings (K, 1–50), resolution δ (K), the budget template with its origin, the equipment's lines,
 *   the CMC ranges (K, k = 2), the accuracy specification, the decision rule and r
 * @returns the point result with its inputs and the engine version
 * @throws EngineInputError naming the field at fault (`readingsK[i]`, `sourceIndicatedK`, `referenceReadingK`,
 *   `resolutionK`, `template[i].…`, `equipmentLines[i].…`, `sourceId` (the source's certified band or T_w0),
 *   `emissivitySetting`, `instrumentTemperatureK`, …)
 * @example 8–14 µm, T_s = 373.15 K, ε_s = ε_i = 0.95, T_w = T_d = 296.15 K, readings [373.3, 373.5]:
 *   expectedReadingK = 373.15, meanReadingK = 373.4, errorK = 0.25, correctionK = −0.25;
 *   the same with a radiance basis (8–14 µm, T_w0 = 296.15 K) and ε_s = 0.95: T_s ≈ 376.3 K and
 *   expectedReadingK ≈ 376.3 K (the instrument set to the plate's emissivity reads its surface temperature)
 */
export function computePoint(input: PointComputationInput): PointResult {
  const readings = input.readingsK
  if (!Array.isArray(readings) || readings.length < 1) throw new EngineInputError('readingsK', 'give at least one reading')
  if (readings.length > MAX_READINGS) throw new EngineInputError('readingsK', `at most ${MAX_READINGS} readings`)
  readings.forEach((r, i) => {
    if (!(typeof r === 'number' && Number.isFinite(r) && r > 0)) throw new EngineInputError(`readingsK[${i}]`, 'must be a temperature above 0 K')
  })
  if (!(typeof input.resolutionK === 'number' && Number.isFinite(input.resolutionK) && input.resolutionK > 0)) {
    throw new EngineInputError('resolutionK', "the instrument's display resolution must be above 0 K")
  }
  const { referenceTemperatureK, sourceCorrectionK } = referenceTemperature(input.reference)
  const { basis, input: basisInput } = basisOf(input.reference)

  const band = input.band.kind === 'tabulated' ? prepareBand(input.band as Band) : (input.band as Band)
  const { sourceTemperatureK, sens } = modelAtPoint(input, band, referenceTemperatureK, basisInput)
  const expected = sens.expectedReadingK

  const n = readings.length
  const mean = readings.reduce((a, b) => a + b, 0) / n
  const stdDev = n > 1 ? Math.sqrt(readings.reduce((a, r) => a + (r - mean) ** 2, 0) / (n - 1)) : 0
  const error = mean - expected
  const imager = input.imager ? imagerAt(input.imager, readings, expected) : undefined

  const valueOf: Record<ModelInput, number> = {
    sourceTemperature: sourceTemperatureK,
    radianceTemperature: referenceTemperatureK,
    certificationReflectedTemperature: basisInput?.kind === 'radiance-temperature' ? basisInput.reflectedTemperatureK : Number.NaN,
    sourceEmissivity: input.sourceEmissivity,
    reflectedTemperature: input.reflectedTemperatureK,
    instrumentTemperature: input.instrumentTemperatureK,
    emissivitySetting: input.emissivitySetting,
    reading: mean,
    sourceEmissivity2: input.ratio ? input.ratio.sourceEmissivity2 : Number.NaN,
    emissivityRatioSetting: input.ratio ? input.ratio.emissivityRatioSetting : Number.NaN,
  }
  const line = (c: TemplateComponent, i: number, list: 'template' | 'equipmentLines', origin: string | undefined): Omit<BudgetLine, 'contributionK' | 'percent'> => {
    if (RADIANCE_BASIS_INPUTS.includes(c.input) && basis !== 'radiance-temperature') {
      throw new EngineInputError(`${list}[${i}].input`, `a line on ${c.input} needs a source whose certified value is a radiance temperature; this point's reference is a ${basis.replace('-', ' ')}`)
    }
    if (RATIO_INPUTS.includes(c.input) && !input.ratio) {
      throw new EngineInputError(`${list}[${i}].input`, `a line on ${c.input} belongs to a ratio (two-colour) pyrometer; this point's instrument is not one`)
    }
    return {
      name: c.name,
      type: c.type,
      input: c.input,
      distribution: c.distribution,
      value: c.value,
      unit: c.unit,
      standardUncertainty: templateStandardUncertainty(c, valueOf[c.input], i, list),
      sensitivity: sensitivityFor(c.input, sens, `${list}[${i}].input`),
      dof: c.dof ?? null,
      ...(c.distribution === 'normal' ? { coverageFactor: c.coverageFactor } : {}),
      ...(origin !== undefined ? { origin } : {}),
    }
  }
  const lines: Omit<BudgetLine, 'contributionK' | 'percent'>[] = input.template.map((c, i) => line(c, i, 'template', input.templateOrigin))
  const equipment = input.equipmentLines ?? []
  if (!Array.isArray(equipment)) throw new EngineInputError('equipmentLines', 'must be a list of budget lines')
  equipment.forEach((c, i) => lines.push(line(c, i, 'equipmentLines', c.origin)))
  const notes: string[] = [...(Array.isArray(input.setupNotes) ? input.setupNotes.filter(x => typeof x === 'string') : [])]
  if (input.ratio) {
    notes.push(`Ratio (two-colour) model: source emissivity ε_1 = ${Number(input.sourceEmissivity.toPrecision(6))} in band 1 and ε_2 = ${Number(input.ratio.sourceEmissivity2.toPrecision(6))} in band 2, emissivity-ratio setting k = ${Number(input.ratio.emissivityRatioSetting.toPrecision(6))}; the instrument temperature and the emissivity setting do not enter it (sensitivity 0).`)
  }
  if (n >= 2) {
    const u = stdDev / Math.sqrt(n)
    lines.push({ name: REPEATABILITY_NAME, type: 'A', input: 'reading', distribution: 'standard', value: u, unit: 'K', standardUncertainty: u, sensitivity: 1, dof: n - 1, origin: `${READINGS_ORIGIN} (n = ${n})` })
  }
  else {
    notes.push(SINGLE_READING_NOTE)
  }
  lines.push({ name: RESOLUTION_NAME, type: 'B', input: 'reading', distribution: 'resolution', value: input.resolutionK, unit: 'K', standardUncertainty: input.resolutionK / Math.sqrt(12), sensitivity: 1, dof: null, origin: RESOLUTION_ORIGIN })

  const correlations = templateCorrelations(input.correlations, input.template.length)
  const budget = evaluateBudget(
    lines.map(l => ({ name: l.name, standardUncertainty: l.standardUncertainty, sensitivity: l.sensitivity, dof: l.dof })),
    { coverageProbability: COVERAGE_PROBABILITY, ...(correlations.length ? { correlations } : {}) },
  )
  if (budget.correlation) notes.push(...budget.correlation.notes)
  const U = budget.expandedUncertainty
  const cmcK = cmcAt(input.cmc, referenceTemperatureK)
  const cmcApplied = cmcK !== null && cmcK > U
  const stated = cmcApplied ? cmcK : U
  const rounded = roundResult(error, stated)
  const rule = input.rule
  const conformity = evaluateConformity({
    spec: input.accuracy,
    readingK: mean,
    error,
    expandedUncertainty: stated,
    rule,
    ...(rule !== 'simple-acceptance' ? { guardBandFactor: input.guardBandFactor ?? 1 } : {}),
    // u = U_stated/k: the CMC is an expanded uncertainty at k = 2 (CmcEntry), the computed U has the budget's k
    coverageFactor: cmcApplied ? CMC_COVERAGE_FACTOR : budget.coverageFactor,
  })

  return {
    referenceTemperatureK,
    referenceBasis: basis,
    sourceTemperatureK,
    sourceCorrectionK,
    expectedReadingK: expected,
    meanReadingK: mean,
    stdDevK: stdDev,
    n,
    errorK: error,
    correctionK: -error,
    budget: {
      components: lines.map((l, i) => ({ ...l, contributionK: budget.contributions[i]!.contribution, percent: budget.contributions[i]!.percent })),
      combinedStandardUncertaintyK: budget.combinedStandardUncertainty,
      effectiveDegreesOfFreedom: budget.effectiveDegreesOfFreedom,
      coverageFactor: budget.coverageFactor,
      coverageProbability: budget.coverageProbability,
      expandedUncertaintyK: U,
      cmcK,
      statedUncertaintyK: stated,
      cmcApplied,
      notes,
      ...(budget.correlation ? { covarianceK2: budget.correlation.covarianceTerm } : {}),
    },
    rounded: { error: rounded.value, uncertainty: rounded.uncertainty, errorText: rounded.valueText, uncertaintyText: rounded.uncertaintyText },
    conformity: {
      rule: conformity.rule,
      ruleReference: conformity.ruleReference,
      tolerance: conformity.tolerance,
      guardBand: conformity.guardBand,
      acceptanceLimit: conformity.acceptanceLimit,
      verdict: conformity.verdict,
      statement: conformity.statement,
      probabilityOfConformity: conformity.probabilityOfConformity!,
    },
    engineVersion: ENGINE_VERSION,
    // an input the model does not take (NaN in) is echoed as null, as it is stored
    inputs: { ...input, instrumentTemperatureK: finiteOrNull(input.instrumentTemperatureK), emissivitySetting: finiteOrNull(input.emissivitySetting) },
    ...(imager ? { imager } : {}),
  }
}

/**
 * A stored result's inputs as {@link computePoint} takes them (an input the run has none of, null
 * in the result, is NaN to the model), so a stored result recomputes exactly.
 * @param inputs - `PointResult.inputs`
 * @returns the computation input
 */
export function pointInputFromStored(inputs: PointResult['inputs']): PointComputationInput {
  return { ...inputs, instrumentTemperatureK: inputs.instrumentTemperatureK ?? Number.NaN, emissivitySetting: inputs.emissivitySetting ?? Number.NaN }
}

function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? v : null
}
