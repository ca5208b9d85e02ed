/**
 * Every error answer the API gives, built one way. Each carries `data.fields` naming the field(s)
 * at fault in the words of the API's JSON (`band.lambda1Um`, `points[2].readingsK`), so forms can
 * show the message under the field.
 */
import { createError, setResponseHeader, type H3Event } from 'h3'
import { EngineInputError } from '#shared/radiometry/errors'
import type { FieldErrors } from '#shared/types'

/** 400 "Validation Error" with `data.fields`, the same shape `parseWith` produces. */
export function invalidInput(fields: FieldErrors): never {
  const message = 'Invalid input: ' + Object.entries(fields).map(([f, m]) => `${f}: ${m}`).join('; ')
  throw createError({ statusCode: 400, statusMessage: 'Validation Error', message, data: { message, fields } })
}

/** 403 with the reason (role checks are `requirePermission`'s; this is for rules on the record). */
export function forbidden(message: string, field?: string): never {
  throw createError({ statusCode: 403, statusMessage: 'Forbidden', message, data: { message, ...(field ? { fields: { [field]: message } } : {}) } })
}

/** 404 with a message naming the kind of record; used for missing and out-of-scope records alike. */
export function notFound(entity: string): never {
  throw createError({ statusCode: 404, statusMessage: 'Not Found', message: `No such ${entity}` })
}

/** 409: the record's state does not allow this (`field` names what is in the way). */
export function conflict(message: string, field = 'status'): never {
  throw createError({ statusCode: 409, statusMessage: 'Conflict', message, data: { message, fields: { [field]: message } } })
}

/** 409 for a change made from a stale copy of a record. */
export function staleRecord() {
  return createError({
    statusCode: 409,
    statusMessage: 'Conflict',
    message: 'Someone else changed this record after you opened it. Reload it and apply your change again.',
    data: { fields: { version: 'Stale version' } },
  })
}

/** 409 unless the client's version is the stored one. */
export function assertVersion(stored: number, seen: number): void {
  if (stored !== seen) throw staleRecord()
}

/** 429 Too Many Requests with Retry-After. */
export function tooManyRequests(event: H3Event, waitSec: number, message: string, fields?: Record<string, string>): never {
  setResponseHeader(event, 'Retry-After', waitSec)
  throw createError({ statusCode: 429, statusMessage: 'Too Many Requests', message, data: { retryAfter: waitSec, ...(fields ? { fields } : {}) } })
}

/** "3 min" / "40 s" for a wait in seconds. */
export function waitInWords(waitSec: number): string {
  return waitSec >= 60 ? `${Math.ceil(waitSec / 60)} min` : `${waitSec} s`
}

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

/** An engine's refusal as a 400 naming the field; anything else unchanged. */
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
