/**
 * Thermal imager statistics for one calibration point on a uniform source: error at the centre region
 * of interest (ROI), non-uniformity across ROIs and the temporal noise (NETD).
 *
 * What is computed (the quantities the domain notes §7 list for thermal imagers, after IEC TS 63144-1
 * and VDI/VDE 5585; the standards' exact definitions were not checked, recalled from memory):
 * - Per ROI: the mean of its readings and their experimental standard deviation s (GUM 4.2.2,
 *   n − 1 in the denominator; null for a single reading). A "reading" of an ROI is the value the imager
 *   reports for it (usually the ROI's spatial mean in one frame).
 * - Error at the centre ROI: E = mean(centre) − expected reading (VIM 2.16), with s/√n of the centre
 *   mean (GUM 4.2.3) for the budget's repeatability line.
 * - Non-uniformity over the field on a uniform source: the range max − min of the ROI means, the
 *   sample standard deviation of the ROI means (n − 1), and the largest |mean_j − mean_centre|; all ROIs,
 *   the centre included, count. Null with fewer than two ROIs.
 * - NETD (noise-equivalent temperature difference) from a series of frames on a uniform source: the
 *   temporal standard deviation of each ROI's series (n − 1), then one figure over the ROIs: the mean
 *   (default), the median, or the root mean square (the pooled standard deviation for equal series
 *   lengths). Taking the temporal standard deviation per pixel or ROI and averaging over the field is
 *   common practice; which average a procedure prescribes is the procedure's choice (from memory).
 *
 * Units: kelvin in and out (differences in K). Every input error is an {@link EngineInputError} naming
 * the field as in the API JSON, e.g. `rois[2].readingsK[0]`.
 */

import { EngineInputError } from '../radiometry/errors'

/** Readings of one ROI at a calibration point (the API's `rois[i]`). */
export interface ImagerRoiReadings {
  /** ROI name, unique within the point (e.g. 'centre', 'top-left'). */
  name: string
  /** Readings of the ROI, K (at least one). */
  readingsK: number[]
}

/** Input of {@link imagerPointStatistics}. */
export interface ImagerPointInput {
  /** Expected reading at the centre ROI (e.g. the source's radiance temperature in the imager's band), K. */
  expectedReadingK: number
  /** ROIs with their readings (at least one; the centre ROI among them). */
  rois: ImagerRoiReadings[]
  /** Name of the centre ROI (default 'centre'). */
  centreRoi?: string
}

/** Statistics of one ROI. */
export interface ImagerRoiStatistics {
  name: string
  /** Number of readings. */
  n: number
  /** Mean reading, K. */
  meanK: number
  /** Experimental standard deviation s (n − 1), K; null for one reading. */
  standardDeviationK: number | null
}

/** Result of {@link imagerPointStatistics}. */
export interface ImagerPointStatistics {
  rois: ImagerRoiStatistics[]
  centre: ImagerRoiStatistics & {
    /** Mean of the centre ROI − expected reading, K. */
    errorK: number
    /** s/√n of the centre mean, K; null for one reading. */
    standardUncertaintyOfMeanK: number | null
  }
  /** Non-uniformity over the ROIs; null with fewer than two ROIs. */
  uniformity: {
    /** max − min of the ROI means, K. */
    rangeK: number
    /** Sample standard deviation (n − 1) of the ROI means, K. */
    standardDeviationK: number
    /** Largest |ROI mean − centre mean|, K. */
    maxDeviationFromCentreK: number
    /** ROI with the highest mean. */
    maxRoi: string
    /** ROI with the lowest mean. */
    minRoi: string
  } | null
}

/** One ROI's frame series for {@link imagerNetd} (the API's `rois[i]`). */
export interface ImagerRoiFrames {
  name: string
  /** The ROI's value in successive frames on a uniform, stable source, K (at least two). */
  framesK: number[]
}

/** How the per-ROI temporal standard deviations are combined into one NETD. */
export type NetdAggregate = 'mean' | 'median' | 'rms'

/** The aggregates {@link imagerNetd} accepts. */
export const NETD_AGGREGATES: readonly NetdAggregate[] = Object.freeze(['mean', 'median', 'rms'])

/** Input of {@link imagerNetd}. */
export interface ImagerNetdInput {
  rois: ImagerRoiFrames[]
  /** Combination over ROIs (default 'mean'). */
  aggregate?: NetdAggregate
}

/** Result of {@link imagerNetd}. */
export interface ImagerNetdResult {
  rois: { name: string; n: number; meanK: number; temporalStandardDeviationK: number }[]
  aggregate: NetdAggregate
  /** The NETD, K. */
  netdK: number
}

function meanOf(v: readonly number[]): number {
  let s = 0
  for (const x of v) s += x
  return s / v.length
}

/** Experimental standard deviation (n − 1), two-pass about the mean; null for n < 2. */
function sdOf(v: readonly number[], mean: number): number | null {
  if (v.length < 2) return null
  let s = 0
  for (const x of v) s += (x - mean) * (x - mean)
  return Math.sqrt(s / (v.length - 1))
}

function checkRois(rois: unknown, key: 'readingsK' | 'framesK', minCount: number): { name: string; values: number[] }[] {
  if (!Array.isArray(rois) || rois.length === 0) throw new EngineInputError('rois', 'needs at least one region of interest')
  const names = new Set<string>()
  return rois.map((roi: unknown, i) => {
    if (typeof roi !== 'object' || roi === null) throw new EngineInputError(`rois[${i}]`, 'must be an object { name, ' + key + ' }')
    const { name } = roi as { name?: unknown }
    if (typeof name !== 'string' || name.trim() === '') throw new EngineInputError(`rois[${i}].name`, 'must be a non-empty name')
    if (names.has(name)) throw new EngineInputError(`rois[${i}].name`, `'${name}' is used by another region of interest`)
    names.add(name)
    const values: unknown = (roi as Record<string, unknown>)[key]
    if (!Array.isArray(values) || values.length < minCount) {
      throw new EngineInputError(`rois[${i}].${key}`, minCount === 1 ? 'needs at least one value in K' : `needs at least ${minCount} values in K`)
    }
    values.forEach((v: unknown, j) => {
      if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
        throw new EngineInputError(`rois[${i}].${key}[${j}]`, `must be a finite temperature above 0 K, got ${String(v)}`)
      }
    })
    return { name, values: values as number[] }
  })
}

/**
 * Statistics of one calibration point of a thermal imager: per-ROI mean and s, the error at the centre
 * ROI and the non-uniformity across ROIs (see the module notes).
 * @param input - expectedReadingK (K); rois: [{ name, readingsK (K) }]; centreRoi (default 'centre')
 * @returns per-ROI statistics, the centre ROI with its error (K), and uniformity (K) or null
 * @throws EngineInputError naming `expectedReadingK`, `rois`, `rois[i]`, `rois[i].name`, `rois[i].readingsK`,
 *   `rois[i].readingsK[j]` or `centreRoi`
 * @example centre readings 373.3, 373.5, 373.4 K against 373.15 K → centre.errorK = 0.25 K, s = 0.1 K
 */
export function imagerPointStatistics(input: ImagerPointInput): ImagerPointStatistics {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('rois', 'imager point input must be an object')
  const expected = input.expectedReadingK
  if (typeof expected !== 'number' || !Number.isFinite(expected) || expected <= 0) {
    throw new EngineInputError('expectedReadingK', `must be a finite temperature above 0 K, got ${String(expected)}`)
  }
  const rois = checkRois(input.rois, 'readingsK', 1)
  const centreName = input.centreRoi ?? 'centre'
  const stats: ImagerRoiStatistics[] = rois.map(({ name, values }) => {
    const m = meanOf(values)
    return { name, n: values.length, meanK: m, standardDeviationK: sdOf(values, m) }
  })
  const centre = stats.find((s) => s.name === centreName)
  if (!centre) {
    throw new EngineInputError('centreRoi', `no region of interest is named '${String(centreName)}' (names: ${stats.map((s) => s.name).join(', ')})`)
  }
  let uniformity: ImagerPointStatistics['uniformity'] = null
  if (stats.length >= 2) {
    let max = stats[0]!
    let min = stats[0]!
    let dev = 0
    for (const s of stats) {
      if (s.meanK > max.meanK) max = s
      if (s.meanK < min.meanK) min = s
      dev = Math.max(dev, Math.abs(s.meanK - centre.meanK))
    }
    const means = stats.map((s) => s.meanK)
    uniformity = {
      rangeK: max.meanK - min.meanK,
      standardDeviationK: sdOf(means, meanOf(means))!,
      maxDeviationFromCentreK: dev,
      maxRoi: max.name,
      minRoi: min.name,
    }
  }
  return {
    rois: stats,
    centre: {
      ...centre,
      errorK: centre.meanK - expected,
      standardUncertaintyOfMeanK: centre.standardDeviationK === null ? null : centre.standardDeviationK / Math.sqrt(centre.n),
    },
    uniformity,
  }
}

/**
 * NETD of a thermal imager from frame series on a uniform source: the temporal standard deviation
 * (n − 1) of each ROI's series, combined over the ROIs by their mean (default), median or root mean
 * square (see the module notes).
 * @param input - rois: [{ name, framesK (K, at least two) }]; aggregate 'mean' | 'median' | 'rms'
 * @returns per-ROI mean and temporal standard deviation (K), the aggregate used and netdK (K)
 * @throws EngineInputError naming `rois`, `rois[i]`, `rois[i].name`, `rois[i].framesK`, `rois[i].framesK[j]`
 *   or `aggregate`
 * @example one ROI with frames 300.02, 299.98, 300.01, 299.99 K → netdK ≈ 0.0183 K
 */
export function imagerNetd(input: ImagerNetdInput): ImagerNetdResult {
  if (typeof input !== 'object' || input === null) throw new EngineInputError('rois', 'NETD input must be an object')
  const aggregate = input.aggregate ?? 'mean'
  if (!NETD_AGGREGATES.includes(aggregate)) {
    throw new EngineInputError('aggregate', `unknown aggregate '${String(aggregate)}'; use ${NETD_AGGREGATES.join(', ')}`)
  }
  const rois = checkRois(input.rois, 'framesK', 2).map(({ name, values }) => {
    const m = meanOf(values)
    return { name, n: values.length, meanK: m, temporalStandardDeviationK: sdOf(values, m)! }
  })
  const sds = rois.map((r) => r.temporalStandardDeviationK)
  let netdK: number
  if (aggregate === 'mean') {
    netdK = meanOf(sds)
  } else if (aggregate === 'rms') {
    netdK = Math.sqrt(meanOf(sds.map((s) => s * s)))
  } else {
    const sorted = sds.slice().sort((a, b) => a - b)
    const h = sorted.length >> 1
    netdK = sorted.length % 2 ? sorted[h]! : (sorted[h - 1]! + sorted[h]!) / 2
  }
  return { rois, aggregate, netdK }
}
