/**
 * Series for the incomplete Bose–Einstein integrals that give band radiance in closed form.
 *
 * With t = c2/(λT), the radiance in a wavelength band and its first wavelength moment reduce to
 *   ∫ t³/(eᵗ − 1) dt   and   ∫ t²/(eᵗ − 1) dt
 * between the two band edges. Two series give them to full double precision:
 *
 * - for x ≥ 2, the exponential series of W. K. Widger and M. P. Woodall, "Integration of the Planck
 *   blackbody radiation function", Bull. Am. Meteorol. Soc. 57, 1217–1219 (1976):
 *   ∫ₓ^∞ t³/(eᵗ−1) dt = Σₖ e^(−kx) (x³/k + 3x²/k² + 6x/k³ + 6/k⁴), and for t²:
 *   ∫ₓ^∞ t²/(eᵗ−1) dt = Σₖ e^(−kx) (x²/k + 2x/k² + 2/k³).
 *   The ratio of successive terms is ≈ e^(−x); n = 2 + ⌈36.9/x⌉ terms bring the first omitted one below
 *   1e-16 of the sum (12 terms at x = 3.5, the switch below).
 * - for x < 3.5, the power series from the generating function of the Bernoulli numbers,
 *   t/(eᵗ − 1) = Σ Bₙ tⁿ/n!:  ∫₀ˣ t^(p)/(eᵗ−1) dt = Σ Bₙ x^(n+p)/((n+p) n!)  (p = 3 or 2),
 *   convergent for x < 2π; with B₂ₘ = (−1)^(m+1) 2 (2m)! ζ(2m)/(2π)^(2m) the coefficients are
 *   computed here from ζ(2m) rather than typed in. The terms fall by (x/2π)² per step (0.31 at
 *   x = 3.5): 12, 20 or 36 even terms (x ≤ 1, ≤ 2, < 3.5) reach ~1e-18 of the sum. Evaluated by
 *   Horner's rule, a power-series term costs about a fifth of an exponential-series term, which is why
 *   the switch sits at 3.5 rather than at 2 (the exponential series then needs at most 12 terms).
 *
 * The two series agree on 1 ≤ x ≤ 3.5 to ~1e-15 relative (tested). The complete integrals are
 * Γ(4)ζ(4) = π⁴/15 and Γ(3)ζ(3) = 2ζ(3).
 *
 * Internal module: functions take already validated x > 0.
 */

/** π⁴/15 = ∫₀^∞ t³/(eᵗ−1) dt. */
export const Z3 = Math.PI ** 4 / 15

/** Apéry's constant ζ(3) = 1.2020569031595942853997… (well-known value, OEIS A002117). */
export const ZETA3 = 1.2020569031595942

/** 2ζ(3) = ∫₀^∞ t²/(eᵗ−1) dt. */
export const Z2 = 2 * ZETA3

/** Threshold between the two series. */
export const SERIES_SWITCH_X = 3.5

const N_EVEN = 36

function zetaEven(s: number): number {
  // ζ(s) for even s ≥ 2: closed forms for 2, 4, 6, direct sum with an Euler–Maclaurin tail otherwise.
  if (s === 2) return Math.PI ** 2 / 6
  if (s === 4) return Math.PI ** 4 / 90
  if (s === 6) return Math.PI ** 6 / 945
  const K = 64
  let sum = 0
  for (let k = K; k >= 1; k--) sum += k ** -s
  // tail Σ_{k>K} k^-s ≈ K^(1−s)/(s−1) − K^-s/2 + s K^(-s-1)/12
  sum += K ** (1 - s) / (s - 1) - K ** -s / 2 + (s * K ** (-s - 1)) / 12
  return sum
}

/** Coefficients c_m (m = 1…N_EVEN) of y^m in the even part of the power series, y = x². */
function evenCoefficients(p: number): Float64Array {
  const c = new Float64Array(N_EVEN + 1)
  for (let m = 1; m <= N_EVEN; m++) {
    const sign = m % 2 === 1 ? 1 : -1 // B_2m sign is (−1)^(m+1)
    c[m] = (sign * 2 * zetaEven(2 * m)) / ((2 * m + p) * (2 * Math.PI) ** (2 * m))
  }
  return c
}

const C3 = evenCoefficients(3)
const C2C = evenCoefficients(2)

/** Coefficients regrouped for four interleaved Horner chains: chain r holds c_{4j+r+1}, j = 0…8. */
function chains(c: Float64Array): Float64Array[] {
  const out: Float64Array[] = []
  for (let r = 0; r < 4; r++) {
    const a = new Float64Array(N_EVEN / 4)
    for (let j = 0; j < N_EVEN / 4; j++) a[j] = c[4 * j + r + 1]!
    out.push(a)
  }
  return out
}
const [A0, A1, A2, A3] = chains(C3) as [Float64Array, Float64Array, Float64Array, Float64Array]
const [B0, B1, B2, B3] = chains(C2C) as [Float64Array, Float64Array, Float64Array, Float64Array]

/**
 * Σ_{m=1}^{4n} c_m y^m as y·(Q0(z) + y·Q1(z) + y²·Q2(z) + y³·Q3(z)), z = y⁴: four independent Horner
 * chains of length n, so the evaluation is not bound by one long chain of dependent operations.
 */
function evenSeries(y: number, n: number, q0: Float64Array, q1: Float64Array, q2: Float64Array, q3: Float64Array): number {
  const z = y * y * y * y
  let s0 = q0[n - 1]!
  let s1 = q1[n - 1]!
  let s2 = q2[n - 1]!
  let s3 = q3[n - 1]!
  for (let j = n - 2; j >= 0; j--) {
    s0 = s0 * z + q0[j]!
    s1 = s1 * z + q1[j]!
    s2 = s2 * z + q2[j]!
    s3 = s3 * z + q3[j]!
  }
  return y * (s0 + y * (s1 + y * (s2 + y * s3)))
}

const INV = new Float64Array(513)
for (let k = 1; k <= 512; k++) INV[k] = 1 / k

/**
 * ∫ₓ^∞ t³/(eᵗ−1) dt by the Widger–Woodall exponential series, given e = exp(−x). Accurate for x ≥ 2
 * (capped at 512 terms).
 * @param x - dimensionless c2/(λT), > 0
 * @param e - exp(−x)
 * @returns the integral, dimensionless
 */
export function tailExp3e(x: number, e: number): number {
  if (e === 0) return 0
  const x2 = x * x
  const x3 = x2 * x
  // terms needed for e^(−(n−1)x) < 1e-16: fixed count, two interleaved accumulators (odd, even k)
  const n = Math.min(512, 2 + Math.ceil(36.9 / x))
  const e2 = e * e
  let eo = e
  let ee = e2
  let so = 0
  let se = 0
  let k = 1
  for (; k + 1 <= n; k += 2) {
    const io = INV[k]!
    const ie = INV[k + 1]!
    so += eo * io * (x3 + io * (3 * x2 + io * (6 * x + 6 * io)))
    se += ee * ie * (x3 + ie * (3 * x2 + ie * (6 * x + 6 * ie)))
    eo *= e2
    ee *= e2
  }
  if (k === n) {
    const io = INV[k]!
    so += eo * io * (x3 + io * (3 * x2 + io * (6 * x + 6 * io)))
  }
  return so + se
}

/** ∫ₓ^∞ t³/(eᵗ−1) dt (exponential series), x > 0. */
export function tailExp3(x: number): number {
  return tailExp3e(x, Math.exp(-x))
}

/**
 * ∫ₓ^∞ t²/(eᵗ−1) dt by the exponential series (same form as Widger–Woodall for the t² moment).
 * @param x - dimensionless c2/(λT), > 0
 * @returns the integral, dimensionless
 */
export function tailExp2(x: number): number {
  const e = Math.exp(-x)
  if (e === 0) return 0
  const x2 = x * x
  const n = Math.min(512, 2 + Math.ceil(36.9 / x))
  const e2 = e * e
  let eo = e
  let ee = e2
  let so = 0
  let se = 0
  let k = 1
  for (; k + 1 <= n; k += 2) {
    const io = INV[k]!
    const ie = INV[k + 1]!
    so += eo * io * (x2 + io * (2 * x + 2 * io))
    se += ee * ie * (x2 + ie * (2 * x + 2 * ie))
    eo *= e2
    ee *= e2
  }
  if (k === n) {
    const io = INV[k]!
    so += eo * io * (x2 + io * (2 * x + 2 * io))
  }
  return so + se
}

function chainLength(x: number): number {
  // 12, 20 or 36 terms in four chains (see the module notes)
  return x <= 1 ? 3 : x <= 2 ? 5 : N_EVEN / 4
}

/**
 * ∫₀ˣ t³/(eᵗ−1) dt by the Bernoulli power series; accurate for 0 ≤ x < 3.5.
 * @param x - dimensionless, 0 ≤ x < 3.5
 * @returns the integral, dimensionless
 */
export function headPow3(x: number): number {
  const y = x * x
  return x * y * (1 / 3 - x / 8 + evenSeries(y, chainLength(x), A0, A1, A2, A3))
}

/**
 * ∫₀ˣ t²/(eᵗ−1) dt by the Bernoulli power series; accurate for 0 ≤ x < 3.5.
 * @param x - dimensionless, 0 ≤ x < 3.5
 * @returns the integral, dimensionless
 */
export function headPow2(x: number): number {
  const y = x * x
  return y * (1 / 2 - x / 6 + evenSeries(y, chainLength(x), B0, B1, B2, B3))
}

/**
 * ∫_{xb}^{xa} t³/(eᵗ−1) dt for xa ≥ xb > 0, choosing the series so that no digits are lost to
 * subtracting from π⁴/15 when both ends are on the same side of the switch.
 */
export function between3(xa: number, xb: number): number {
  if (xb >= SERIES_SWITCH_X) return tailExp3(xb) - tailExp3(xa)
  if (xa < SERIES_SWITCH_X) return headPow3(xa) - headPow3(xb)
  return Z3 - headPow3(xb) - tailExp3(xa)
}

/** ∫_{xb}^{xa} t²/(eᵗ−1) dt for xa ≥ xb > 0 (see {@link between3}). */
export function between2(xa: number, xb: number): number {
  if (xb >= SERIES_SWITCH_X) return tailExp2(xb) - tailExp2(xa)
  if (xa < SERIES_SWITCH_X) return headPow2(xa) - headPow2(xb)
  return Z2 - headPow2(xb) - tailExp2(xa)
}

/**
 * Band integral D = ∫_{xb}^{xa} t³/(eᵗ−1) dt and the derivative bracket
 * 4D − xa⁴/(e^xa − 1) + xb⁴/(e^xb − 1), sharing exp(−x) between the series and the boundary terms.
 * Writes D to out[0] and the bracket to out[1].
 */
export function between3WithBracket(xa: number, xb: number, out: Float64Array): void {
  let d: number
  let ga: number
  let gb: number
  if (xa >= SERIES_SWITCH_X) {
    const ea = Math.exp(-xa)
    const xa2 = xa * xa
    ga = ea === 0 ? 0 : (xa2 * xa2 * ea) / (1 - ea)
    const ta = tailExp3e(xa, ea)
    if (xb >= SERIES_SWITCH_X) {
      const eb = Math.exp(-xb)
      const xb2 = xb * xb
      gb = eb === 0 ? 0 : (xb2 * xb2 * eb) / (1 - eb)
      d = tailExp3e(xb, eb) - ta
    } else {
      gb = boundary4(xb)
      d = Z3 - headPow3(xb) - ta
    }
  } else {
    ga = boundary4(xa)
    gb = boundary4(xb)
    d = headPow3(xa) - headPow3(xb)
  }
  out[0] = d
  out[1] = 4 * d - ga + gb
}

/** x⁴/(eˣ − 1), the boundary term of d/dT for the t³ integral; 0 when eˣ overflows. */
export function boundary4(x: number): number {
  const d = Math.expm1(x)
  if (!Number.isFinite(d)) return 0
  const x2 = x * x
  return (x2 * x2) / d
}

/** x³/(eˣ − 1), the boundary term of d/dT for the t² integral; 0 when eˣ overflows. */
export function boundary3(x: number): number {
  const d = Math.expm1(x)
  if (!Number.isFinite(d)) return 0
  return (x * x * x) / d
}
