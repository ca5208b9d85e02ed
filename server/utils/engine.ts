import { EngineInputError } from '../../shared/radiometry/errors'
import type { BudgetComponent } from '../../shared/uncertainty/budget'

/**
 * Run an engine computation; an input the engine refuses becomes 400 naming the
 * field (the engine spells fields as the API's JSON does, e.g. `band.lambda2Um`).
 * A result that holds a number JSON cannot carry (∞, NaN — an overflow) is a 400 too, naming
 * `overflowField` (or the field it returns for that result): an answer never holds `null` in
 * place of a number.
 */
export function engine<T>(fn: () => T, overflowField: string | ((result: T) => string) = 'body'): T {
  let result: T
  try {
    result = fn()
  }
  catch (err) {
    throw engineError(err)
  }
  if (hasNonFinite(result)) {
    const field = typeof overflowField === 'function' ? overflowField(result) : overflowField
    throw engineError(new EngineInputError(field, 'is too large: the result overflows the range of numbers (≈ 1.8e308)'))
  }
  return result
}

/** True when a number anywhere in the value is ∞ or NaN. */
export function hasNonFinite(value: unknown, depth = 0): boolean {
  if (typeof value === 'number') return !Number.isFinite(value)
  if (depth > 8 || value === null || typeof value !== 'object') return false
  if (ArrayBuffer.isView(value)) return false
  for (const v of Array.isArray(value) ? value : Object.values(value)) if (hasNonFinite(v, depth + 1)) return true
  return false
}

/** The budget input to blame for an overflow: the component whose |c·u| is largest or not finite. */
export function budgetOverflowField(components: readonly BudgetComponent[], contributions: readonly { contribution: number }[]): string {
  let worst = 0
  let worstValue = -1
  contributions.forEach((c, i) => {
    const v = Number.isFinite(c.contribution) ? Math.abs(c.contribution) : Number.POSITIVE_INFINITY
    if (v > worstValue) {
      worst = i
      worstValue = v
    }
  })
  const c = components[worst]
  if (!c) return 'components'
  const valueField = c.standardUncertainty !== undefined ? 'standardUncertainty' : c.distribution === 'resolution' ? 'resolution' : 'halfWidth'
  const valueSize = Math.abs(Number(c.standardUncertainty ?? c.halfWidth ?? c.resolution ?? 0))
  return `components[${worst}].${Math.abs(c.sensitivity) > valueSize ? 'sensitivity' : valueField}`
}

export function engineError(err: unknown): unknown {
  if (err instanceof EngineInputError) {
    const message = err.message.startsWith(`${err.field}: `) ? err.message.slice(err.field.length + 2) : err.message
    return createError({
      statusCode: 400,
      statusMessage: 'Validation Error',
      message: `Invalid input: ${err.field}: ${message}`,
      data: { message: `Invalid input: ${err.field}: ${message}`, fields: { [err.field]: message } },
    })
  }
  return err
}
