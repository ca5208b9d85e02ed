/**
 * Calibration intervals of the laboratory's own equipment (ISO/IEC 17025:2017 6.4.7, 6.4.10), by two
 * of the methods of ILAC-G24:2007 / OIML D 10:2007 "Guidelines for the determination of calibration
 * intervals of measuring instruments" (method numbering *from memory*).
 *
 * **Staircase** ({@link staircaseInterval}; ILAC-G24 method 1, "automatic adjustment or staircase"):
 * after each calibration the interval is multiplied by a > 1 when the item was found in tolerance
 * and by b < 1 when it was not; the laboratory sets a, b and the shortest and longest intervals.
 * Common variant (common practice): lengthen only when the largest as-found error used at most a
 * set fraction of the tolerance (e.g. 80 % of the MPE); between that fraction and the tolerance the
 * interval is kept.
 * Whole months: the proposal is rounded **down** (the safe side), except that a lengthening moves the
 * interval by at least one month (otherwise 3 × 1.25 = 3.75 would round back to 3 for ever); then it
 * is held within [minMonths, maxMonths]. A product within 1e-9 of a whole number counts as that
 * number (0.57 × 100 is 56.99999999999999 in binary).
 *
 * **Drift** ({@link driftInterval}; ILAC-G24 "statistical approaches", here a straight-line drift
 * model): the as-found deviations d_i at dates t_i (the item's error before any adjustment, with
 * standard uncertainties u_i) are fitted with d(t) = a + b·t, t in years from the **last** calibration
 * (t = 0 there, earlier dates negative; 1 year = 365.25 days). Then the interval is the longest Δ
 * after the last calibration with
 *   |a + b·Δ| + k·u_pred(Δ) ≤ TL,   u_pred(Δ)² = Var(a) + 2Δ·Cov(a, b) + Δ²·Var(b) + u_m²,
 * i.e. the predicted deviation plus k times its standard uncertainty stays within the tolerance;
 * the first three terms are the fit's uncertainty at Δ, u_m is the standard uncertainty of the next
 * as-found measurement (default: that of the last calibration). The left side is convex in Δ, so the
 * Δ that satisfy it form one interval [0, Δ*].
 * Fit:
 * - `'weighted'` (default): weighted least squares with weights 1/u_i²; covariance (XᵀWX)⁻¹, i.e. the
 *   stated u_i are taken as the standard deviations of the d_i (as numpy.polyfit(w = 1/u,
 *   cov = 'unscaled') and scipy's curve_fit(absolute_sigma = True)). χ² and the Birge ratio
 *   √(χ²/(n − 2)) are reported so a scatter larger than the stated u_i is visible.
 * - `'ordinary'`: unweighted least squares; covariance s²(XᵀX)⁻¹ with s² = RSS/(n − 2) (numpy.polyfit
 *   cov = True); needs at least 3 points.
 * The interval is reported in whole calendar months: the largest m ≤ maxMonths such that the
 * condition holds on the date m calendar months after the last calibration ({@link addMonths}).
 * The history must describe one unadjusted state of the item: after an adjustment, start a new one.
 */

import { EngineInputError } from '../radiometry/errors'
import { addMonths, isDateOnly } from '../registers/dates'

const METHOD_STAIRCASE = 'ILAC-G24:2007 / OIML D 10:2007, method 1 (automatic adjustment or "staircase")'
const METHOD_DRIFT = 'ILAC-G24:2007 / OIML D 10:2007, statistical approach: straight-line drift of the as-found deviation'

/** Days in a year for the drift fit (the Julian year). */
export const DAYS_PER_YEAR = 365.25

function wholeMonths(v: unknown, field: string): number {
  if (typeof v !== 'number' || !Number.isInteger(v) || v < 1) throw new EngineInputError(field, `must be a whole number of months ≥ 1, got ${String(v)}`)
  return v
}

function fmt(x: number, digits = 4): string {
  return String(Number(x.toPrecision(digits)))
}

/** Input of {@link staircaseInterval}. */
export interface StaircaseInput {
  /** The interval that has just ended, whole months (≥ 1). */
  currentMonths: number
  /** The item's as-found verdict at this calibration (in tolerance under the lab's decision rule). */
  foundInTolerance: boolean
  /** a > 1: factor applied when found in tolerance (dimensionless). */
  lengthenFactor: number
  /** b in (0, 1): factor applied when found out of tolerance (dimensionless). */
  shortenFactor: number
  /** Shortest interval allowed, whole months (≥ 1). */
  minMonths: number
  /** Longest interval allowed, whole months (≥ minMonths). */
  maxMonths: number
  /**
   * Largest |as-found error| / tolerance over the calibration points (dimensionless, ≥ 0; 0.45 means
   * 45 % of the MPE used). Given: the interval is lengthened only when it is ≤ `lengthenWithinFraction`.
   */
  fractionOfTolerance?: number
  /** Threshold for `fractionOfTolerance` (dimensionless, in (0, 1]; default 0.8, i.e. 80 % of the MPE). */
  lengthenWithinFraction?: number
}

/** Result of {@link staircaseInterval}. */
export interface StaircaseResult {
  /** What the staircase did. */
  action: 'lengthen' | 'keep' | 'shorten'
  /** currentMonths × factor (or currentMonths when kept), months, before rounding and limits. */
  exactMonths: number
  /** The proposed interval, whole months within [minMonths, maxMonths]. */
  proposedMonths: number
  /** Which limit cut the proposal, if any. */
  limitedBy: 'minMonths' | 'maxMonths' | null
  /** One plain sentence giving the proposal and why. */
  reason: string
  /** The method, for the equipment record. */
  method: string
}

/**
 * Staircase adjustment of a calibration interval (ILAC-G24:2007 method 1; see the module notes).
 * @param input - currentMonths (whole months), foundInTolerance, lengthenFactor a > 1, shortenFactor 0 < b < 1,
 *   minMonths, maxMonths (whole months), optional fractionOfTolerance (largest |E|/TL) and lengthenWithinFraction (default 0.8)
 * @returns action, exact and proposed months, the limit that applied and the reason
 * @throws EngineInputError (`currentMonths`, `foundInTolerance`, `lengthenFactor`, `shortenFactor`, `minMonths`,
 *   `maxMonths`, `fractionOfTolerance`, `lengthenWithinFraction`)
 * @example staircaseInterval({ currentMonths: 12, foundInTolerance: true, lengthenFactor: 1.25, shortenFactor: 0.5, minMonths: 3, maxMonths: 24 })
 *   // { action: 'lengthen', proposedMonths: 15, … }
 */
export function staircaseInterval(input: StaircaseInput): StaircaseResult {
  const current = wholeMonths(input.currentMonths, 'currentMonths')
  if (typeof input.foundInTolerance !== 'boolean') throw new EngineInputError('foundInTolerance', `must be true or false, got ${String(input.foundInTolerance)}`)
  const a = input.lengthenFactor
  if (typeof a !== 'number' || !Number.isFinite(a) || a <= 1) throw new EngineInputError('lengthenFactor', `must be a finite number above 1, got ${String(a)}`)
  const b = input.shortenFactor
  if (typeof b !== 'number' || !Number.isFinite(b) || b <= 0 || b >= 1) throw new EngineInputError('shortenFactor', `must be a number between 0 and 1 (exclusive), got ${String(b)}`)
  const min = wholeMonths(input.minMonths, 'minMonths')
  const max = wholeMonths(input.maxMonths, 'maxMonths')
  if (max < min) throw new EngineInputError('maxMonths', `must not be less than minMonths (${min}), got ${max}`)
  const fraction = input.fractionOfTolerance
  if (fraction !== undefined) {
    if (typeof fraction !== 'number' || !Number.isFinite(fraction) || fraction < 0) throw new EngineInputError('fractionOfTolerance', `must be a finite number ≥ 0, got ${String(fraction)}`)
    if (input.foundInTolerance && fraction > 1) {
      throw new EngineInputError('fractionOfTolerance', `is ${fraction} (above the tolerance) but foundInTolerance is true`)
    }
  }
  const threshold = input.lengthenWithinFraction ?? 0.8
  if (typeof threshold !== 'number' || !Number.isFinite(threshold) || threshold <= 0 || threshold > 1) {
    throw new EngineInputError('lengthenWithinFraction', `must be a number in (0, 1], got ${String(threshold)}`)
  }

  let action: StaircaseResult['action']
  let exact: number
  let whole: number
  let why: string
  const pct = (x: number): string => `${fmt(100 * x, 3)} %`
  if (!input.foundInTolerance) {
    action = 'shorten'
    exact = current * b
    whole = Math.floor(exact + 1e-9)
    why = `Found out of tolerance: interval multiplied by b = ${b}`
  } else if (fraction !== undefined && fraction > threshold) {
    action = 'keep'
    exact = current
    whole = current
    why = `Found in tolerance, but the largest as-found error used ${pct(fraction)} of the tolerance, more than ${pct(threshold)}: interval kept`
  } else {
    action = 'lengthen'
    exact = current * a
    whole = Math.max(Math.floor(exact + 1e-9), current + 1)
    why =
      fraction !== undefined
        ? `Found in tolerance, largest as-found error ${pct(fraction)} of the tolerance (within ${pct(threshold)}): interval multiplied by a = ${a}`
        : `Found in tolerance: interval multiplied by a = ${a}`
  }
  let limitedBy: StaircaseResult['limitedBy'] = null
  if (whole > max) {
    whole = max
    limitedBy = 'maxMonths'
  } else if (whole < min) {
    whole = min
    limitedBy = 'minMonths'
  }
  const limitText = limitedBy === 'maxMonths' ? ` (held at the longest interval, ${max} months)` : limitedBy === 'minMonths' ? ` (held at the shortest interval, ${min} months)` : ''
  return {
    action,
    exactMonths: exact,
    proposedMonths: whole,
    limitedBy,
    reason: action === 'keep' && whole === current ? `${why} at ${current} months.` : `${why}, from ${current} to ${whole} months${limitText}.`,
    method: METHOD_STAIRCASE,
  }
}

/** One as-found calibration result of the item. */
export interface AsFoundPoint {
  /** Calibration date, `YYYY-MM-DD`. */
  date: string
  /** As-found deviation (error) of the item, in the unit of the tolerance (e.g. K). */
  deviation: number
  /** Standard uncertainty (k = 1) of that deviation, same unit (> 0 for the weighted fit). */
  standardUncertainty: number
}

/** Input of {@link driftInterval}. */
export interface DriftIntervalInput {
  /** As-found history, any order, at least 2 points on at least 2 dates (3 for the ordinary fit). */
  history: readonly AsFoundPoint[]
  /** Tolerance TL (MPE), unit of the deviations (> 0). */
  tolerance: number
  /** Coverage factor k (> 0; default 2). */
  coverageFactor?: number
  /** Longest interval proposed, whole months (≥ 1). */
  maxMonths: number
  /** `'weighted'` (default, weights 1/u²) or `'ordinary'` least squares. */
  weighting?: 'weighted' | 'ordinary'
  /** u_m, standard uncertainty of the next as-found measurement (≥ 0); default the last point's. */
  measurementUncertainty?: number
}

/** A point of the chart series of {@link driftInterval}. */
export interface DriftSeriesPoint {
  /** `YYYY-MM-DD`. */
  date: string
  /** Years from the last calibration (negative before it). */
  years: number
  /** Fitted deviation a + b·t (unit of the deviations). */
  predicted: number
  /** predicted − k·u_pred. */
  lower: number
  /** predicted + k·u_pred. */
  upper: number
}

/** Result of {@link driftInterval}; deviations in the unit of the input (e.g. K), time in years. */
export interface DriftIntervalResult {
  /** Date of the last calibration: t = 0 of the fit. */
  originDate: string
  /** Fit used. */
  weighting: 'weighted' | 'ordinary'
  /** b, unit per year. */
  slopePerYear: number
  /** a: fitted deviation at the last calibration (unit). */
  intercept: number
  /** Covariance of (a, b): [[Var a, Cov], [Cov, Var b]] in unit², unit²/yr, unit²/yr². */
  covariance: [[number, number], [number, number]]
  /** n − 2. */
  degreesOfFreedom: number
  /** Weighted fit: Σ((d_i − d̂_i)/u_i)²; null for the ordinary fit. */
  chiSquared: number | null
  /** Weighted fit with n > 2: √(χ²/(n − 2)); null otherwise. */
  birgeRatio: number | null
  /** Ordinary fit with n > 2: s = √(RSS/(n − 2)) (unit); null otherwise. */
  residualStandardDeviation: number | null
  /** u_m used (unit). */
  measurementUncertainty: number
  /** k used. */
  coverageFactor: number
  /** TL (unit). */
  tolerance: number
  /** Δ* in years where |a + bΔ| + k·u_pred(Δ) reaches TL; null when it is not reached within maxMonths, 0 when already reached. */
  limitYears: number | null
  /** The interval, whole calendar months (0 when already out of tolerance). */
  months: number
  /** addMonths(originDate, months). */
  dueDate: string
  /** 'maxMonths' when the cap applied, else null. */
  limitedBy: 'maxMonths' | null
  /** One plain sentence stating the interval and why. */
  reason: string
  /** The method, for the equipment record. */
  method: string
  /** The as-found points, in date order, with their time in years. */
  observed: (AsFoundPoint & { years: number })[]
  /** Fitted line and its ± k·u_pred band, monthly from the first calibration to maxMonths after the last. */
  series: DriftSeriesPoint[]
}

function dayNumber(date: string): number {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number]
  return Date.UTC(y, m - 1, d) / 86_400_000
}

/**
 * Years from `origin` to `date` (1 year = 365.25 days).
 * @param origin - `YYYY-MM-DD`
 * @param date - `YYYY-MM-DD`
 * @returns years, negative when date is before origin
 */
export function yearsBetween(origin: string, date: string): number {
  return (dayNumber(date) - dayNumber(origin)) / DAYS_PER_YEAR
}

/**
 * Predicted deviation and its uncertainty at a date, from a {@link driftInterval} result.
 * @param fit - the result (intercept, slopePerYear, covariance, measurementUncertainty, coverageFactor, originDate)
 * @param date - `YYYY-MM-DD`
 * @returns years from the last calibration, predicted deviation (unit), u_fit, u_pred and k·u_pred (unit)
 * @throws EngineInputError (`date`)
 * @example predictDrift(result, '2026-01-01').expanded // k·u_pred at that date
 */
export function predictDrift(
  fit: Pick<DriftIntervalResult, 'originDate' | 'intercept' | 'slopePerYear' | 'covariance' | 'measurementUncertainty' | 'coverageFactor'>,
  date: string,
): { years: number, deviation: number, fitUncertainty: number, uncertainty: number, expanded: number } {
  if (typeof date !== 'string' || !isDateOnly(date)) throw new EngineInputError('date', `must be a YYYY-MM-DD date, got ${String(date)}`)
  const t = yearsBetween(fit.originDate, date)
  return { years: t, ...predictAt(fit, t) }
}

function predictAt(
  fit: Pick<DriftIntervalResult, 'intercept' | 'slopePerYear' | 'covariance' | 'measurementUncertainty' | 'coverageFactor'>,
  t: number,
): { deviation: number, fitUncertainty: number, uncertainty: number, expanded: number } {
  const [[va, cab], [, vb]] = fit.covariance
  const vfit = Math.max(0, va + 2 * t * cab + t * t * vb)
  const u = Math.sqrt(vfit + fit.measurementUncertainty ** 2)
  return { deviation: fit.intercept + fit.slopePerYear * t, fitUncertainty: Math.sqrt(vfit), uncertainty: u, expanded: fit.coverageFactor * u }
}

/**
 * Drift method for the calibration interval of an item from its as-found history (see the module notes).
 * @param input - history [{ date, deviation, standardUncertainty }], tolerance TL, coverageFactor k (default 2),
 *   maxMonths, weighting ('weighted' default | 'ordinary'), measurementUncertainty u_m (default the last point's u)
 * @returns slope (unit/yr), intercept at the last calibration (unit), covariance, goodness of fit, the interval in whole
 *   months with its due date and reason, and the observed points and fitted band for a chart
 * @throws EngineInputError (`history`, `history[i].date`, `history[i].deviation`, `history[i].standardUncertainty`,
 *   `tolerance`, `coverageFactor`, `maxMonths`, `weighting`, `measurementUncertainty`)
 * @example driftInterval({ history: [{ date: '2016-01-01', deviation: -0.6, standardUncertainty: 0.1 },
 *   { date: '2020-01-01', deviation: -0.2, standardUncertainty: 0.1 }, { date: '2024-01-01', deviation: 0.2, standardUncertainty: 0.1 }],
 *   tolerance: 1, maxMonths: 120 }).months // 51 (slope 0.1 K/yr)
 */
export function driftInterval(input: DriftIntervalInput): DriftIntervalResult {
  const weighting = input.weighting ?? 'weighted'
  if (weighting !== 'weighted' && weighting !== 'ordinary') throw new EngineInputError('weighting', `must be 'weighted' or 'ordinary', got ${String(weighting)}`)
  const history = input.history
  if (!Array.isArray(history) || history.length < 2) {
    throw new EngineInputError('history', `needs at least 2 as-found results, got ${Array.isArray(history) ? history.length : String(history)}`)
  }
  history.forEach((p, i) => {
    if (typeof p !== 'object' || p === null) throw new EngineInputError(`history[${i}]`, 'must be an object with date, deviation and standardUncertainty')
    if (typeof p.date !== 'string' || !isDateOnly(p.date)) throw new EngineInputError(`history[${i}].date`, `must be a YYYY-MM-DD date, got ${String(p.date)}`)
    if (typeof p.deviation !== 'number' || !Number.isFinite(p.deviation)) throw new EngineInputError(`history[${i}].deviation`, `must be a finite number, got ${String(p.deviation)}`)
    const u = p.standardUncertainty
    if (typeof u !== 'number' || !Number.isFinite(u) || u < 0 || (weighting === 'weighted' && u === 0)) {
      throw new EngineInputError(`history[${i}].standardUncertainty`, `must be a finite number ${weighting === 'weighted' ? 'above 0 for the weighted fit' : '≥ 0'}, got ${String(u)}`)
    }
  })
  const TL = input.tolerance
  if (typeof TL !== 'number' || !Number.isFinite(TL) || TL <= 0) throw new EngineInputError('tolerance', `must be a finite number above 0, got ${String(TL)}`)
  const k = input.coverageFactor ?? 2
  if (typeof k !== 'number' || !Number.isFinite(k) || k <= 0) throw new EngineInputError('coverageFactor', `must be a finite number above 0, got ${String(k)}`)
  const maxMonths = wholeMonths(input.maxMonths, 'maxMonths')

  const sorted = [...history].sort((p, q) => (p.date < q.date ? -1 : p.date > q.date ? 1 : 0))
  const last = sorted[sorted.length - 1]!
  const origin = last.date
  if (sorted[0]!.date === origin) throw new EngineInputError('history', 'needs results on at least 2 different dates to fit a drift')
  const n = sorted.length
  if (weighting === 'ordinary' && n < 3) throw new EngineInputError('history', 'needs at least 3 results for the ordinary fit (its scatter is estimated from the residuals)')
  const um = input.measurementUncertainty ?? last.standardUncertainty
  if (typeof um !== 'number' || !Number.isFinite(um) || um < 0) throw new EngineInputError('measurementUncertainty', `must be a finite number ≥ 0, got ${String(um)}`)

  // Least squares on centred time (numerically stable), then back to the origin t = 0.
  const t = sorted.map(p => yearsBetween(origin, p.date))
  const y = sorted.map(p => p.deviation)
  const w = sorted.map(p => (weighting === 'weighted' ? 1 / p.standardUncertainty ** 2 : 1))
  const S = w.reduce((s, wi) => s + wi, 0)
  const tBar = w.reduce((s, wi, i) => s + wi * t[i]!, 0) / S
  const yBar = w.reduce((s, wi, i) => s + wi * y[i]!, 0) / S
  const Stt = w.reduce((s, wi, i) => s + wi * (t[i]! - tBar) ** 2, 0)
  const Sty = w.reduce((s, wi, i) => s + wi * (t[i]! - tBar) * (y[i]! - yBar), 0)
  const slope = Sty / Stt
  const intercept = yBar - slope * tBar
  const wrss = w.reduce((s, wi, i) => s + wi * (y[i]! - intercept - slope * t[i]!) ** 2, 0)
  const dof = n - 2
  const scale = weighting === 'weighted' ? 1 : wrss / dof
  const va = scale * (1 / S + (tBar * tBar) / Stt)
  const vb = scale / Stt
  const cab = (-scale * tBar) / Stt
  const covariance: [[number, number], [number, number]] = [
    [va, cab],
    [cab, vb],
  ]
  const fit = { intercept, slopePerYear: slope, covariance, measurementUncertainty: um, coverageFactor: k }

  const f = (years: number): number => {
    const p = predictAt(fit, years)
    return Math.abs(p.deviation) + p.expanded
  }
  const inside = (years: number): boolean => f(years) <= TL * (1 + 1e-12)
  const unit = (x: number): string => fmt(x)

  let months: number
  let limitYears: number | null
  let limitedBy: 'maxMonths' | null = null
  let reason: string
  const driftText = `fitted drift ${unit(slope)} per year${slope === 0 ? '' : Math.sign(slope) === Math.sign(intercept) || intercept === 0 ? ' (away from zero)' : ' (towards zero)'}`
  const worstLast = sorted.filter(p => p.date === origin).reduce((m, p) => (Math.abs(p.deviation) > Math.abs(m) ? p.deviation : m), 0)
  if (Math.abs(worstLast) > TL) {
    months = 0
    limitYears = 0
    reason = `Already out of tolerance: the last as-found deviation ${unit(worstLast)} on ${origin} exceeds the tolerance ±${unit(TL)}; interval 0 months.`
  } else if (!inside(0)) {
    months = 0
    limitYears = 0
    reason = `Already at the tolerance: at the last calibration (${origin}) the fitted deviation ${unit(intercept)} plus k·u = ${unit(k * predictAt(fit, 0).uncertainty)} exceeds ±${unit(TL)}; interval 0 months.`
  } else {
    const yearsAtMax = yearsBetween(origin, addMonths(origin, maxMonths))
    if (inside(yearsAtMax)) {
      limitYears = null
      months = maxMonths
      limitedBy = 'maxMonths'
    } else {
      // f is convex and f(0) ≤ TL < f(yearsAtMax): the Δ with f(Δ) ≤ TL form [0, Δ*]; bisect for Δ*.
      let lo = 0
      let hi = yearsAtMax
      for (let i = 0; i < 200 && hi - lo > 1e-13 * hi; i++) {
        const mid = (lo + hi) / 2
        if (inside(mid)) lo = mid
        else hi = mid
      }
      limitYears = lo
      // largest whole calendar month m ≤ maxMonths whose date is still inside
      months = Math.min(maxMonths, Math.floor(lo * 12) + 2)
      while (months > 0 && !inside(yearsBetween(origin, addMonths(origin, months)))) months--
    }
    reason =
      limitedBy === 'maxMonths'
        ? `The ${driftText}; the predicted deviation plus k·u stays within ±${unit(TL)} for the longest interval allowed: ${months} months.`
        : `The ${driftText}; the predicted deviation plus k·u reaches ±${unit(TL)} after ${unit(limitYears!)} years: interval ${months} months.`
  }

  const firstMonth = -Math.ceil(-yearsBetween(origin, sorted[0]!.date) * 12)
  const series: DriftSeriesPoint[] = []
  for (let m = firstMonth; m <= maxMonths; m++) {
    const date = addMonths(origin, m)
    const years = yearsBetween(origin, date)
    const p = predictAt(fit, years)
    series.push({ date, years, predicted: p.deviation, lower: p.deviation - p.expanded, upper: p.deviation + p.expanded })
  }

  return {
    originDate: origin,
    weighting,
    slopePerYear: slope,
    intercept,
    covariance,
    degreesOfFreedom: dof,
    chiSquared: weighting === 'weighted' ? wrss : null,
    birgeRatio: weighting === 'weighted' && dof > 0 ? Math.sqrt(wrss / dof) : null,
    residualStandardDeviation: weighting === 'ordinary' ? Math.sqrt(wrss / dof) : null,
    measurementUncertainty: um,
    coverageFactor: k,
    tolerance: TL,
    limitYears,
    months,
    dueDate: addMonths(origin, months),
    limitedBy,
    reason,
    method: METHOD_DRIFT,
    observed: sorted.map((p, i) => ({ ...p, years: t[i]! })),
    series,
  }
}
