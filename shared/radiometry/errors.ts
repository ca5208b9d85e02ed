/**
 * Errors thrown by the calculation engine (shared/radiometry, shared/uncertainty).
 *
 * Every rejected input raises an {@link EngineInputError}. It extends the built-in `RangeError`, so
 * callers that only know the standard error types still catch it, and it carries `field`: the name
 * of the input at fault, spelt as in the calculation API's JSON bodies (for example
 * `'band.lambda2Um'`, `'temperatureK'`, `'components[2].halfWidth'`). The API layer maps it to a
 * 400 response that points at that field.
 */

/**
 * An input the engine cannot compute with: NaN or ∞, a temperature ≤ 0 K, an emissivity outside
 * (0, 1], a band with λ2 ≤ λ1, a responsivity table that is too short, unsorted or negative, an
 * unknown distribution, a radiance outside the inversion range, and so on.
 *
 * @example
 * ```ts
 * try { bandRadiance({ kind: 'rectangular', lambda1Um: 14, lambda2Um: 8 }, 300) }
 * catch (e) { if (e instanceof EngineInputError) console.log(e.field) } // 'band.lambda2Um'
 * ```
 */
export class EngineInputError extends RangeError {
  /** The input at fault, as named in the API JSON (e.g. `'band.lambda1Um'`, `'components[0].dof'`). */
  readonly field: string

  /**
   * @param field - name of the input at fault, in the API's JSON spelling
   * @param message - what is wrong and what is accepted, for a person to read
   */
  constructor(field: string, message: string) {
    super(`${field}: ${message}`)
    this.name = 'EngineInputError'
    this.field = field
  }
}

/**
 * Throws unless `value` is a finite number.
 * @param value - the value to check (any unit)
 * @param field - API field name used in the error
 * @returns nothing; throws {@link EngineInputError} for NaN, ±∞ or a non-number
 */
export function requireFinite(value: unknown, field: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new EngineInputError(field, `must be a finite number, got ${String(value)}`)
  }
}

/**
 * Throws unless `value` is a finite number greater than zero.
 * @param value - the value to check (any unit)
 * @param field - API field name used in the error
 */
export function requirePositive(value: unknown, field: string): asserts value is number {
  requireFinite(value, field)
  if (value <= 0) throw new EngineInputError(field, `must be greater than zero, got ${value}`)
}

/**
 * Throws unless `value` is a finite number ≥ 0.
 * @param value - the value to check (any unit)
 * @param field - API field name used in the error
 */
export function requireNonNegative(value: unknown, field: string): asserts value is number {
  requireFinite(value, field)
  if (value < 0) throw new EngineInputError(field, `must not be negative, got ${value}`)
}

/**
 * Throws unless `value` is a temperature in kelvins: finite and > 0 K.
 * @param value - thermodynamic temperature, K
 * @param field - API field name used in the error (e.g. `'sourceTemperatureK'`)
 */
export function requireTemperature(value: unknown, field: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new EngineInputError(field, `must be a finite thermodynamic temperature above 0 K, got ${String(value)}`)
  }
}

/**
 * Throws unless `value` is an emissivity in (0, 1].
 * @param value - emissivity, dimensionless
 * @param field - API field name used in the error (e.g. `'sourceEmissivity'`)
 */
export function requireEmissivity(value: unknown, field: string): asserts value is number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0 || value > 1) {
    throw new EngineInputError(field, `must be an emissivity in (0, 1], got ${String(value)}`)
  }
}
