/**
 * Whether a blackbody source fits the instrument it is used with: the source's emissivity must be
 * known in the instrument's spectral band, and the instrument's measuring spot must fit inside the
 * source's aperture with the margin the procedure states. Pure and framework-free; the server
 * (server/services/runs/context.ts) refuses a point with these messages before it is computed.
 *
 * Emissivity for a band. A source's emissivity is stated either for a wavelength range (the register's
 * emissivity with its standard uncertainty and band λ1–λ2) or as a small table over wavelength
 * (rows [λ µm, ε, u(ε)], k = 1). An instrument band [a, b] (a rectangular band's edges; a tabulated
 * responsivity's span of non-zero response) is covered when it lies inside the table's span or inside
 * the stated range (edges inclusive). From a table, ε of the band is the mean of the table's linear
 * interpolant over [a, b] (the integral of a piecewise-linear function, exact) and u(ε) the largest
 * u over [a, b] (interpolated at a and b, and every row inside): the table is preferred when it covers
 * the band, since the lab recorded it for such use. A band covered by neither is refused, naming the
 * numbers: an emissivity stated for 8–14 µm says nothing about 2.0–2.4 µm, where a cavity's reading
 * moves by tens of kelvin per unit ε (its sensitivity there is large).
 *
 * Spot against aperture. The spot diameter at the measuring distance D is D/(D:S) for an instrument with
 * a distance-to-spot ratio D:S (the makers' convention: the diameter holding most of the signal, common
 * practice), or the spot diameter stated for the run. The source's aperture (cavity opening, plate's
 * usable diameter) must be at least m × the spot diameter, m the procedure's margin (e.g. 2, common
 * practice for the size-of-source effect); without a stated margin the spot must at least fit (m = 1).
 */

import type { BandInput } from '../types/runs'

/** A source's emissivity as its register states it. */
export interface EmissivityStatement {
  /** ε stated with the source, in (0, 1]. */
  emissivity: number
  /** Standard uncertainty u(ε), k = 1. */
  emissivityU: number
  /** The wavelength range ε is stated for, µm; both null when the register states none. */
  emissivityBandLambda1Um: number | null
  emissivityBandLambda2Um: number | null
  /** ε over wavelength: rows [λ µm, ε, u(ε) k = 1], λ increasing; null or empty when none is recorded. */
  emissivityTable?: readonly (readonly [number, number, number])[] | null
}

/** The emissivity a point uses in the instrument's band, with where it came from. */
export interface BandEmissivity {
  /** ε_s for the band. */
  emissivity: number
  /** u(ε_s), k = 1. */
  standardUncertainty: number
  /** 'table' when from the emissivity table, 'stated-band' when from the emissivity stated for a range. */
  from: 'table' | 'stated-band'
  /** The statement in words, e.g. 'ε = 0.95 (u = 0.005) stated for 8–14 µm'. */
  text: string
}

/** Edges below this (µm) count as equal, so that a band stated as 8–14 µm covers an 8–14 µm instrument. */
const EDGE_TOLERANCE_UM = 1e-9

const um = (v: number) => String(Number(v.toPrecision(6)))

/**
 * The wavelength span an instrument band covers, µm: a rectangular band's edges, or the span of a
 * tabulated responsivity's non-zero response (zero rows at either end left out).
 * @param band - instrument band (µm)
 * @returns { lambda1Um, lambda2Um }, µm
 * @example bandSpanUm({ kind: 'tabulated', points: [[7, 0], [8, 0.5], [14, 1], [15, 0]] }) → { lambda1Um: 7, lambda2Um: 15 }
 *   (the zero rows at 7 and 15 µm bound the response that rises from 7 µm and falls to 15 µm)
 */
export function bandSpanUm(band: BandInput): { lambda1Um: number, lambda2Um: number } {
  if (band.kind === 'rectangular') return { lambda1Um: band.lambda1Um, lambda2Um: band.lambda2Um }
  const p = band.points
  let first = p.findIndex(r => r[1] > 0)
  let last = p.length - 1 - [...p].reverse().findIndex(r => r[1] > 0)
  if (first < 0) return { lambda1Um: p[0]![0], lambda2Um: p[p.length - 1]![0] }
  // the response rises from the zero row before the first non-zero one (linear interpolation between rows)
  first = Math.max(0, first - 1)
  last = Math.min(p.length - 1, last + 1)
  return { lambda1Um: p[first]![0], lambda2Um: p[last]![0] }
}

/** Linear interpolation of column `col` of a table at λ (inside the table). */
function interpolate(table: readonly (readonly [number, number, number])[], lambda: number, col: 1 | 2): number {
  for (let i = 1; i < table.length; i++) {
    const a = table[i - 1]!
    const b = table[i]!
    if (lambda <= b[0]) {
      const f = b[0] === a[0] ? 0 : (lambda - a[0]) / (b[0] - a[0])
      return a[col] + Math.min(1, Math.max(0, f)) * (b[col] - a[col])
    }
  }
  return table[table.length - 1]![col]
}

/**
 * Mean of a table's ε over [a, b] (trapezoids of the piecewise-linear interpolant, exact) and the largest
 * u(ε) over [a, b].
 * @param table - rows [λ µm, ε, u], λ increasing, covering [a, b]
 * @param a - short edge, µm
 * @param b - long edge, µm (> a)
 * @returns { emissivity, standardUncertainty }
 * @example tableMean([[7, 0.94, 0.01], [8, 0.95, 0.005], [14, 0.95, 0.005], [15, 0.94, 0.01]], 7, 15)
 *   → ε = (0.945 + 6 × 0.95 + 0.945)/8 = 0.94875, u = 0.01
 */
export function tableMean(table: readonly (readonly [number, number, number])[], a: number, b: number): { emissivity: number, standardUncertainty: number } {
  const xs = [a, ...table.map(r => r[0]).filter(x => x > a && x < b), b]
  let mean = 0
  let u = Math.max(interpolate(table, a, 2), interpolate(table, b, 2))
  for (let i = 1; i < xs.length; i++) {
    const e0 = interpolate(table, xs[i - 1]!, 1)
    const e1 = interpolate(table, xs[i]!, 1)
    // each trapezoid weighted by its share of the band (a flat table gives its value exactly)
    mean += ((xs[i]! - xs[i - 1]!) / (b - a)) * (0.5 * (e0 + e1))
    u = Math.max(u, interpolate(table, xs[i]!, 2))
  }
  return { emissivity: mean, standardUncertainty: u }
}

/**
 * The source emissivity for an instrument's band, or the reason there is none (see the module notes).
 * @param statement - the source's emissivity statement (register fields)
 * @param band - the instrument's band (µm)
 * @param label - how the message names the source, e.g. its asset tag
 * @returns { emissivity, standardUncertainty (k = 1), from, text } or { problem } naming the numbers
 * @example emissivityForBand({ emissivity: 0.995, emissivityU: 0.001, emissivityBandLambda1Um: 8, emissivityBandLambda2Um: 14 },
 *   { kind: 'rectangular', lambda1Um: 2, lambda2Um: 2.4 }, 'BB-CV-02').problem
 *   === 'BB-CV-02’s emissivity 0.995 is stated for 8–14 µm; the instrument’s band 2–2.4 µm lies outside it, …'
 */
export function emissivityForBand(statement: EmissivityStatement, band: BandInput, label: string): BandEmissivity | { problem: string } {
  const { lambda1Um: a, lambda2Um: b } = bandSpanUm(band)
  const table = statement.emissivityTable ?? []
  if (table.length >= 2 && a >= table[0]![0] - EDGE_TOLERANCE_UM && b <= table[table.length - 1]![0] + EDGE_TOLERANCE_UM) {
    const lo = Math.max(a, table[0]![0])
    const hi = Math.min(b, table[table.length - 1]![0])
    const m = tableMean(table, lo, hi)
    return {
      emissivity: m.emissivity,
      standardUncertainty: m.standardUncertainty,
      from: 'table',
      text: `ε = ${Number(m.emissivity.toPrecision(5))} (u = ${Number(m.standardUncertainty.toPrecision(3))}), the mean of the source’s emissivity table over ${um(a)}–${um(b)} µm`,
    }
  }
  const l1 = statement.emissivityBandLambda1Um
  const l2 = statement.emissivityBandLambda2Um
  if (l1 != null && l2 != null && a >= l1 - EDGE_TOLERANCE_UM && b <= l2 + EDGE_TOLERANCE_UM) {
    return {
      emissivity: statement.emissivity,
      standardUncertainty: statement.emissivityU,
      from: 'stated-band',
      text: `ε = ${statement.emissivity} (u = ${statement.emissivityU}) stated for ${um(l1)}–${um(l2)} µm`,
    }
  }
  const stated = l1 != null && l2 != null ? `is stated for ${um(l1)}–${um(l2)} µm` : 'is stated without a wavelength band'
  const tableText = table.length >= 2 ? ` and its emissivity table covers ${um(table[0]![0])}–${um(table[table.length - 1]![0])} µm` : ''
  return {
    problem: `${label}’s emissivity ${statement.emissivity} ${stated}${tableText}; the instrument’s band ${um(a)}–${um(b)} µm lies outside it. Record the source’s emissivity for ${um(a)}–${um(b)} µm (its emissivity table), or use another source`,
  }
}

/** Input of {@link spotFit}. */
export interface SpotFitInput {
  /** The source's aperture diameter, mm. */
  apertureMm: number
  /** The run's measuring distance, mm (null when not entered). */
  distanceMm: number | null
  /** The instrument's distance-to-spot ratio D:S (null when not stated). */
  distanceToSpot: number | null
  /** A spot diameter stated for the run at its distance, mm (null: from D:S). */
  spotDiameterMm: number | null
  /** The procedure's margin m (aperture ≥ m × spot), or null for none stated (m = 1). */
  margin: number | null
}

/** Result of {@link spotFit}. */
export interface SpotFit {
  /** Spot diameter at the distance, mm (null when neither a stated spot nor D:S with a distance is known). */
  spotDiameterMm: number | null
  /** m × spot diameter, mm (null with the spot). */
  requiredApertureMm: number | null
  /** m used (1 when the procedure states none). */
  margin: number
  /** True when the aperture is at least m × the spot; null when the spot is not known. */
  fits: boolean | null
  /** How the spot was found, in words, e.g. 'at 300 mm with D:S 12:1'. */
  how: string | null
}

const mm = (v: number) => (Math.round(v * 10) / 10).toFixed(1)

/**
 * The instrument's spot at the run's distance against the source's aperture (see the module notes).
 * @param input - apertureMm, distanceMm, distanceToSpot, spotDiameterMm (mm), margin
 * @returns spot and required aperture (mm), the margin used, whether it fits (null when unknown)
 * @example spotFit({ apertureMm: 50, distanceMm: 300, distanceToSpot: 12, spotDiameterMm: null, margin: 2 })
 *   → { spotDiameterMm: 25, requiredApertureMm: 50, margin: 2, fits: true, how: 'at 300 mm with D:S 12:1' }
 */
export function spotFit(input: SpotFitInput): SpotFit {
  const margin = input.margin ?? 1
  let spot: number | null = null
  let how: string | null = null
  if (input.spotDiameterMm != null) {
    spot = input.spotDiameterMm
    how = 'as stated for the run'
  }
  else if (input.distanceToSpot != null && input.distanceToSpot > 0 && input.distanceMm != null) {
    spot = input.distanceMm / input.distanceToSpot
    how = `at ${Number(input.distanceMm.toPrecision(6))} mm with D:S ${Number(input.distanceToSpot.toPrecision(6))}:1`
  }
  if (spot === null) return { spotDiameterMm: null, requiredApertureMm: null, margin, fits: null, how: null }
  const required = margin * spot
  return { spotDiameterMm: spot, requiredApertureMm: required, margin, fits: input.apertureMm >= required - 1e-9, how }
}

/**
 * The refusal of a spot that does not fit, naming both diameters (mm), or null when it fits or is unknown.
 * @param fit - from {@link spotFit}
 * @param apertureMm - the source's aperture, mm
 * @param label - how the message names the source (asset tag)
 * @param procedure - how the message names the procedure (for the margin)
 * @returns the message or null
 * @example spotProblem(spotFit({ apertureMm: 40, distanceMm: 300, distanceToSpot: 12, spotDiameterMm: null, margin: 2 }), 40, 'BB-X', 'P')
 *   → 'The instrument’s spot is 25.0 mm across (at 300 mm with D:S 12:1); procedure P asks for a source aperture of at least 2 × 25.0 mm = 50.0 mm, and BB-X’s aperture is 40.0 mm. …'
 */
export function spotProblem(fit: SpotFit, apertureMm: number, label: string, procedure: string): string | null {
  if (fit.fits !== false) return null
  const asked = fit.margin === 1
    ? 'the spot must fit inside the source’s aperture'
    : `procedure ${procedure} asks for a source aperture of at least ${fit.margin} × ${mm(fit.spotDiameterMm!)} mm = ${mm(fit.requiredApertureMm!)} mm`
  return `The instrument’s spot is ${mm(fit.spotDiameterMm!)} mm across (${fit.how}); ${asked}, and ${label}’s aperture is ${mm(apertureMm)} mm. Move the instrument closer or use a source with a larger aperture`
}
