/**
 * Physical constants for radiometry, each with its source and edition.
 *
 * Primary source: CODATA 2018 recommended values (E. Tiesinga, P. J. Mohr, D. B. Newell,
 * B. N. Taylor, "CODATA recommended values of the fundamental physical constants: 2018",
 * Rev. Mod. Phys. 93, 025010 (2021)). Since the 2019 redefinition of the SI, h, c and k are exact;
 * the radiation constants c1L, c2, σ and Wien's b follow from them and are derived here in code
 * rather than typed in.
 *
 * Alternative: the ITS-90 value c2 = 0.014388 m·K (H. Preston-Thomas, "The International
 * Temperature Scale of 1990 (ITS-90)", Metrologia 27, 3–10 (1990), section 3.3), used by the
 * scale's radiometric definition above the freezing point of silver.
 */

import { EngineInputError } from './errors'

/** Planck constant h, J·s. Exact (SI 2019; CODATA 2018). Value 6.62607015e-34. */
export const PLANCK_H = 6.62607015e-34

/** Speed of light in vacuum c, m·s⁻¹. Exact (SI 1983; CODATA 2018). Value 299792458. */
export const SPEED_OF_LIGHT_C = 299_792_458

/** Boltzmann constant k, J·K⁻¹. Exact (SI 2019; CODATA 2018). Value 1.380649e-23. */
export const BOLTZMANN_K = 1.380649e-23

/**
 * First radiation constant for spectral radiance c1L = 2hc², W·m²·sr⁻¹.
 * Derived from the exact h and c (CODATA 2018 lists 1.191042972…e-16 W·m²·sr⁻¹).
 * @example C1L ≈ 1.191042972e-16
 */
export const C1L = 2 * PLANCK_H * SPEED_OF_LIGHT_C * SPEED_OF_LIGHT_C

/**
 * Second radiation constant c2 = hc/k, m·K. Derived from the exact h, c, k (CODATA 2018 lists
 * 1.438776877…e-2 m·K).
 * @example C2 ≈ 1.438776877e-2
 */
export const C2 = (PLANCK_H * SPEED_OF_LIGHT_C) / BOLTZMANN_K

/**
 * Second radiation constant as fixed by ITS-90, m·K: c2 = 0.014388 m·K exactly
 * (Preston-Thomas 1990, Metrologia 27:3, eq. (24) and the text of section 3.3).
 */
export const C2_ITS90 = 0.014388

/**
 * Stefan–Boltzmann constant σ = 2π⁵k⁴/(15h³c²), W·m⁻²·K⁻⁴. Derived from exact h, c, k
 * (CODATA 2018 lists 5.670374419…e-8).
 * @example STEFAN_BOLTZMANN_SIGMA ≈ 5.670374419e-8
 */
export const STEFAN_BOLTZMANN_SIGMA =
  (2 * Math.PI ** 5 * BOLTZMANN_K ** 4) / (15 * PLANCK_H ** 3 * SPEED_OF_LIGHT_C ** 2)

/**
 * Root of x = 5(1 − e^(−x)), the dimensionless Wien displacement constant for spectral radiance
 * per unit wavelength; solved here by Newton's method to machine precision.
 * Check value 4.965114231744276… (it equals 5 + W₀(−5e⁻⁵), W₀ the Lambert W function).
 */
export const WIEN_X: number = (() => {
  let x = 5
  for (let i = 0; i < 50; i++) {
    const e = Math.exp(-x)
    const g = x - 5 * (1 - e)
    const dg = 1 - 5 * e
    const step = g / dg
    x -= step
    if (Math.abs(step) < 1e-16 * x) break
  }
  return x
})()

/**
 * Wien displacement law constant b = c2 / WIEN_X, m·K (CODATA 2018 lists 2.897771955…e-3 m·K).
 * The peak of L(λ, T) per unit wavelength is at λ_max = b / T.
 * @example WIEN_B ≈ 2.897771955e-3; a 5800 K body peaks near 0.4996 µm.
 */
export const WIEN_B = C2 / WIEN_X

/** Identifier of a set of radiation constants, as accepted by the API (`constants` field). */
export type RadiationConstantsId = 'CODATA-2018' | 'ITS-90'

/**
 * A set of radiation constants used by Planck-law functions. Functions that depend on c2 take an
 * optional `constants` argument (an object of this type or its id) and default to CODATA 2018.
 */
export interface RadiationConstants {
  /** Identifier, e.g. `'CODATA-2018'`. */
  readonly id: RadiationConstantsId
  /** Human-readable source and edition. */
  readonly source: string
  /** First radiation constant for radiance c1L, W·m²·sr⁻¹. */
  readonly c1L: number
  /** Second radiation constant c2, m·K. */
  readonly c2: number
  /** c2 in µm·K (c2 × 10⁶), used with wavelengths in micrometres. */
  readonly c2UmK: number
  /** c1L in W·µm⁴·m⁻²·sr⁻¹ (c1L × 10²⁴): gives spectral radiance per µm with λ in µm. */
  readonly c1LUm: number
  /**
   * c1L/c2⁴, W·m⁻²·sr⁻¹·K⁻⁴: the radiance of a band is this × T⁴ × ∫ t³/(eᵗ−1) dt over the
   * band in t = c2/(λT). With CODATA 2018 values, (π⁴/15)·c1L/c2⁴ = σ/π.
   */
  readonly bandCoefficient: number
  /** c1L/c2³, W·m⁻¹·sr⁻¹·K⁻³: the first wavelength moment ∫λL dλ = this × T³ × ∫ t²/(eᵗ−1) dt. */
  readonly momentCoefficient: number
}

function makeConstants(id: RadiationConstantsId, source: string, c1L: number, c2: number): RadiationConstants {
  return Object.freeze({
    id,
    source,
    c1L,
    c2,
    c2UmK: c2 * 1e6,
    c1LUm: c1L * 1e24,
    bandCoefficient: c1L / c2 ** 4,
    momentCoefficient: c1L / c2 ** 3,
  })
}

/**
 * CODATA 2018 radiation constants: c1L = 2hc², c2 = hc/k from the exact SI values of h, c, k.
 * The default everywhere.
 */
export const CODATA_2018: RadiationConstants = makeConstants(
  'CODATA-2018',
  'CODATA 2018 (Tiesinga et al., Rev. Mod. Phys. 93, 025010, 2021): c1L = 2hc², c2 = hc/k, h, c, k exact',
  C1L,
  C2,
)

/**
 * ITS-90 radiation constants: c2 = 0.014388 m·K (Preston-Thomas 1990, Metrologia 27:3). ITS-90 defines
 * temperature above the silver point through radiance *ratios*, in which c1L cancels; absolute
 * radiances computed with this set use the CODATA 2018 c1L.
 */
export const ITS_90: RadiationConstants = makeConstants(
  'ITS-90',
  'ITS-90 (Preston-Thomas, Metrologia 27, 3, 1990): c2 = 0.014388 m·K; c1L from CODATA 2018',
  C1L,
  C2_ITS90,
)

/** A constants choice as accepted by engine functions: an id or a {@link RadiationConstants} object. */
export type RadiationConstantsChoice = RadiationConstantsId | RadiationConstants

/**
 * Resolves a constants choice to a {@link RadiationConstants} object (no allocation).
 * @param choice - `'CODATA-2018'` (default when undefined), `'ITS-90'`, or a constants object
 * @returns the constants set
 * @throws EngineInputError (field `'constants'`) for an unknown id
 * @example resolveConstants('ITS-90').c2 === 0.014388
 */
export function resolveConstants(choice?: RadiationConstantsChoice): RadiationConstants {
  if (choice === undefined || choice === 'CODATA-2018') return CODATA_2018
  if (choice === 'ITS-90') return ITS_90
  if (typeof choice === 'object' && choice !== null && typeof choice.c2UmK === 'number') return choice
  throw new EngineInputError('constants', `unknown radiation constants '${String(choice)}'; use 'CODATA-2018' or 'ITS-90'`)
}

/** The radiation constants a result was computed with, as stated in that result (JSON-safe). */
export interface ConstantsUsed {
  /** `'CODATA-2018'` or `'ITS-90'`. */
  readonly id: RadiationConstantsId
  /** Second radiation constant c2 used, m·K (1.438776877e-2 for CODATA 2018, 0.014388 for ITS-90). */
  readonly c2: number
}

/**
 * The statement of the constants used, for a result object.
 * @param c - resolved constants
 * @returns `{ id, c2 }` with c2 in m·K
 * @example constantsUsed(ITS_90) → { id: 'ITS-90', c2: 0.014388 }
 */
export function constantsUsed(c: RadiationConstants): ConstantsUsed {
  return { id: c.id, c2: c.c2 }
}
