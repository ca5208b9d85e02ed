/**
 * Fast band integrals ∫ t³/(eᵗ − 1) dt between two values of t = c2/(λT), for rectangular band radiance.
 *
 * The two incomplete integrals of ./series,
 *   H(x) = ∫₀ˣ t³/(eᵗ−1) dt   and   G(x) = ∫ₓ^∞ t³/(eᵗ−1) dt = π⁴/15 − H(x),
 * are replaced on 0 ≤ x < 40 by piecewise polynomials built once when the module loads, one per
 * panel [p/2, (p + 1)/2) (80 panels), in the variable s = 4x − 2p − 1 ∈ [−1, 1):
 *   panel 0      h(x) = H(x)/x³ on [0, ½) (so H keeps full relative precision as x → 0);
 *   panels 1–5   H(x) on [½, 3);
 *   panels 6–79  G(x) on [3, 40).
 * Each is the Chebyshev interpolant of degree 11 at the 12 Chebyshev points of the panel (J. C. Mason
 * and D. C. Handscomb, "Chebyshev Polynomials", Chapman & Hall 2003, §6.3), with node values from the
 * series of ./series (the Widger–Woodall exponential series and the Bernoulli power series, each
 * accurate to ~1e-16), refined twice by the residual at the rounded nodes, then rewritten in
 * monomial form and evaluated by Estrin's scheme (four levels, no loop, no branch on x inside a
 * panel). Above x = 40 the first Widger–Woodall term alone, e^(−x)(x³ + 3x² + 6x + 6), is used: the
 * omitted terms are below e^(−x)/2 ≤ 3e-18 of it.
 *
 * Accuracy. The integrand is analytic except for poles at t = ±2πik, at least 2π from any panel, and
 * G(z) ~ z³e^(−z) off the real axis; so the Chebyshev interpolation error on a panel of half-width ½
 * is bounded by ~(e/(8n))ⁿ relative for a panel of half-width ¼ (n = 11: < 1e-19; L. N. Trefethen, "Approximation Theory and
 * Approximation Practice", SIAM 2013, Theorem 8.2, with a Bernstein ellipse of half-axis ~n), far below
 * rounding. What remains is rounding: the tests compare H and G with the series at 10⁵ points on
 * 0 < x < 60 (≤ 2e-15 relative, about 10 ulp) and the resulting band radiance with independent
 * Gauss–Kronrod and Simpson quadrature and with scipy (≤ 1e-12 relative over 50–5000 K and 0.65–14 µm).
 * The value of G at x = c2/(λT) is itself sensitive to the rounding of x (condition number ≈ x), so
 * the interpolant adds no error beyond what computing x already costs.
 *
 * Speed: one panel look-up and one 12-term polynomial per band edge (two with dS/dT), no exp below
 * x = 40, no loop: ≈ 10 ns per edge where the series needed 16–37 ns. See scripts/bench/engine.ts.
 *
 * Internal module: functions take already validated x > 0.
 */

import { headPow3, tailExp3, Z3 } from './series'

/** Panels cover 0 ≤ x < PANEL_X_MAX; beyond it the first Widger–Woodall term is used. */
export const PANEL_X_MAX = 40

/** Below this x a panel holds H (∫₀ˣ), at and above it G (∫ₓ^∞). */
export const PANEL_SWITCH_X = 3

/** Coefficients per panel (degree 11). */
const NC = 12
/** Panels per unit of x. */
const PPU = 2
const NP = PANEL_X_MAX * PPU

function dct(f: Float64Array): Float64Array {
  const c = new Float64Array(NC)
  for (let k = 0; k < NC; k++) {
    let sum = 0
    // the angle is reduced modulo 2π through integers, so large k·j lose no digits in cos
    for (let j = 0; j < NC; j++) sum += f[j]! * Math.cos((Math.PI * ((k * (2 * j + 1)) % (4 * NC))) / (2 * NC))
    c[k] = ((k === 0 ? 1 : 2) * sum) / NC
  }
  return c
}

function clenshaw(c: Float64Array, s: number): number {
  let b1 = 0
  let b2 = 0
  for (let k = NC - 1; k >= 1; k--) {
    const t = 2 * s * b1 - b2 + c[k]!
    b2 = b1
    b1 = t
  }
  return s * b1 - b2 + c[0]!
}

/** Reference value on panel p from the series: h(x) on panel 0, H(x) below the switch, G(x) above. */
function panelReference(p: number, x: number): number {
  if (p === 0) return headPow3(x) / (x * x * x)
  return p < PANEL_SWITCH_X * PPU ? headPow3(x) : tailExp3(x)
}

/** Reference boundary term on panel p: x/(eˣ − 1) on panel 0 (times x³ when used), x⁴/(eˣ − 1) above. */
function boundaryReference(p: number, x: number): number {
  return p === 0 ? x / Math.expm1(x) : (x * x * x * x) / Math.expm1(x)
}

/**
 * Monomial coefficients in s (NP panels × NC) of the Chebyshev interpolant of `ref` on each panel.
 */
function buildPanels(ref: (p: number, x: number) => number): Float64Array {
  const out = new Float64Array(NP * NC)
  for (let p = 0; p < NP; p++) out.set(interpolate(p, ref), p * NC)
  return out
}

function interpolate(p: number, ref: (p: number, x: number) => number): Float64Array {
  const f = new Float64Array(NC)
  const sAt = new Float64Array(NC)
  for (let j = 0; j < NC; j++) {
    const x = (p + (Math.cos((Math.PI * (2 * j + 1)) / (2 * NC)) + 1) / 2) / PPU
    sAt[j] = 4 * x - 2 * p - 1 // the node actually used, after rounding x
    f[j] = ref(p, x)
  }
  const cheb = dct(f)
  for (let it = 0; it < 2; it++) {
    const r = new Float64Array(NC)
    for (let j = 0; j < NC; j++) r[j] = f[j]! - clenshaw(cheb, sAt[j]!)
    const d = dct(r)
    for (let k = 0; k < NC; k++) cheb[k] = cheb[k]! + d[k]!
  }
  // Chebyshev → monomial: T0 = 1, T1 = s, T(k+1) = 2s·T(k) − T(k−1)
  const mono = new Float64Array(NC)
  let tPrev = new Float64Array(NC)
  let tCur = new Float64Array(NC)
  tPrev[0] = 1
  tCur[1] = 1
  mono[0] = cheb[0]!
  for (let k = 1; k < NC; k++) {
    for (let m = 0; m < NC; m++) mono[m] = mono[m]! + cheb[k]! * tCur[m]!
    const next = new Float64Array(NC)
    for (let m = 0; m < NC; m++) next[m] = (m > 0 ? 2 * tCur[m - 1]! : 0) - tPrev[m]!
    tPrev = tCur
    tCur = next
  }
  return mono
}

/** Panels of the incomplete integrals (h, H or G) and of the boundary term x⁴/(eˣ − 1). */
const COEF = buildPanels(panelReference)
const BCOEF = buildPanels(boundaryReference)

/** Σ a[o+k]·s^k, k = 0…11, by Estrin's scheme (three levels instead of an 11-step Horner chain). */
function estrin12(a: Float64Array, o: number, s: number): number {
  const s2 = s * s
  const s4 = s2 * s2
  const q0 = a[o]! + a[o + 1]! * s + s2 * (a[o + 2]! + a[o + 3]! * s)
  const q1 = a[o + 4]! + a[o + 5]! * s + s2 * (a[o + 6]! + a[o + 7]! * s)
  const q2 = a[o + 8]! + a[o + 9]! * s + s2 * (a[o + 10]! + a[o + 11]! * s)
  return q0 + s4 * (q1 + s4 * q2)
}

/**
 * The incomplete integral that keeps full precision at x: H(x) = ∫₀ˣ t³/(eᵗ−1) dt for x < 3,
 * G(x) = ∫ₓ^∞ t³/(eᵗ−1) dt for x ≥ 3 (see {@link PANEL_SWITCH_X}).
 * @param x - dimensionless c2/(λT), > 0
 * @returns H(x) or G(x), dimensionless
 * @example incomplete3(1) ≈ 0.2248 (H); incomplete3(5) ≈ 1.6128 (G)
 */
export function incomplete3(x: number): number {
  if (x < PANEL_X_MAX) {
    const p = (PPU * x) | 0
    const v = estrin12(COEF, p * NC, 4 * x - 2 * p - 1)
    return p === 0 ? v * x * x * x : v
  }
  const e = Math.exp(-x)
  if (e === 0) return 0
  return e * (x * (x * (x + 3) + 6) + 6)
}

/** ∫₀ˣ t³/(eᵗ−1) dt, x > 0 (panels; see the module notes). */
export function lowerIntegral3(x: number): number {
  return x < PANEL_SWITCH_X ? incomplete3(x) : Z3 - incomplete3(x)
}

/** ∫ₓ^∞ t³/(eᵗ−1) dt, x > 0 (panels; see the module notes). */
export function upperIntegral3(x: number): number {
  return x < PANEL_SWITCH_X ? Z3 - incomplete3(x) : incomplete3(x)
}

/**
 * ∫_{xb}^{xa} t³/(eᵗ−1) dt for xa ≥ xb > 0: the band integral of a rectangular band, with
 * xa = c2/(λ1T) and xb = c2/(λ2T).
 * @param xa - c2/(λ1T), dimensionless
 * @param xb - c2/(λ2T), dimensionless, ≤ xa
 * @returns the integral, dimensionless
 * @example bandIntegral3(4.6, 2.6) ≈ 2.226 (8–14 µm at 390 K)
 */
export function bandIntegral3(xa: number, xb: number): number {
  const qa = incomplete3(xa)
  const qb = incomplete3(xb)
  // qa, qb are G (∫ₓ^∞) at or above the switch and H (∫₀ˣ) below it, so D is one of
  // G(xb) − G(xa), H(xa) − H(xb) or π⁴/15 − H(xb) − G(xa); written without branches, which
  // temperatures scattered across the switch would mispredict
  const fa = +(xa >= PANEL_SWITCH_X)
  const fb = +(xb >= PANEL_SWITCH_X)
  return Z3 * (fa - fb) + ((2 * fb - 1) * qb - (2 * fa - 1) * qa)
}

/**
 * The boundary term x⁴/(eˣ − 1) of dS/dT (x times the integrand at x), from its own panels below
 * x = 40 (interpolated like the integrals, ≤ 2e-15 relative; tested) and directly above.
 * @param x - dimensionless c2/(λT), > 0
 * @returns x⁴/(eˣ − 1), dimensionless; 0 when eˣ overflows
 * @example boundaryTerm4(3) ≈ 4.2316
 */
export function boundaryTerm4(x: number): number {
  if (x < PANEL_X_MAX) {
    const p = (PPU * x) | 0
    const v = estrin12(BCOEF, p * NC, 4 * x - 2 * p - 1)
    return p === 0 ? v * x * x * x : v
  }
  const e = Math.exp(-x)
  if (e === 0) return 0
  const x2 = x * x
  return (x2 * x2 * e) / (1 - e)
}

/**
 * Band integral D = ∫_{xb}^{xa} t³/(eᵗ−1) dt and the derivative bracket
 * 4D − xa⁴/(e^xa − 1) + xb⁴/(e^xb − 1) (so that dS/dT = (c1L/c2⁴)·T³·bracket), written to out[0] and
 * out[1]. Same contract as `between3WithBracket` in ./series.
 * @param xa - c2/(λ1T) ≥ xb
 * @param xb - c2/(λ2T) > 0
 * @param out - receives [D, bracket]
 */
export function bandIntegral3WithBracket(xa: number, xb: number, out: Float64Array): void {
  const d = bandIntegral3(xa, xb)
  out[0] = d
  out[1] = 4 * d - boundaryTerm4(xa) + boundaryTerm4(xb)
}
