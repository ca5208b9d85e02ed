import type { z } from 'zod'
import { fieldErrors } from '#shared/schemas/errors'
import { invalidInput } from './errors'

const NUL_MESSAGE = 'Contains a NUL character, which no field may hold'

/** Paths of the strings (keys too) that hold a NUL character, as `a.b[2].c`. */
export function nulFields(input: unknown, path = '', out: string[] = [], depth = 0): string[] {
  if (out.length >= 10 || depth > 32) return out
  if (typeof input === 'string') {
    if (input.includes('\u0000')) out.push(path || 'body')
  }
  else if (Array.isArray(input)) {
    input.forEach((v, i) => nulFields(v, `${path}[${i}]`, out, depth + 1))
  }
  else if (input && typeof input === 'object') {
    for (const [k, v] of Object.entries(input)) {
      const p = path ? `${path}.${k}` : k
      if (k.includes('\u0000')) out.push(p.split('\u0000').join('\\0'))
      else nulFields(v, p, out, depth + 1)
    }
  }
  return out
}

/**
 * A validator for h3's `readValidatedBody`, `getValidatedQuery` and
 * `getValidatedRouterParams`. On failure h3 answers 400 "Validation Error" with
 * `data: { message, fields }`, where `fields` maps each field at fault to its message.
 * A NUL character anywhere in the input is refused first: it has no meaning in any field, and
 * SQL engines and C libraries cut text at it.
 */
export function parseWith<S extends z.ZodType>(schema: S) {
  return (input: unknown): z.output<S> => {
    const nul = nulFields(input)
    if (nul.length) {
      const fields = Object.fromEntries(nul.map(f => [f, NUL_MESSAGE]))
      // A plain object (not an Error) so it serializes into the response's `data`.
      throw { message: 'Invalid input: ' + nul.map(f => `${f}: ${NUL_MESSAGE}`).join('; '), fields }
    }
    const result = schema.safeParse(input)
    if (result.success) return result.data
    const fields = fieldErrors(result.error)
    const message = 'Invalid input: ' + Object.entries(fields).map(([f, m]) => `${f}: ${m}`).join('; ')
    // A plain object (not an Error) so it serializes into the response's `data`.
    throw { message, fields }
  }
}

/**
 * Validate the record an update would produce (stored values overlaid with the change) against
 * the create schema, so cross-field rules (min < max, band ends) hold after a partial update.
 */
export function checkMerged<S extends z.ZodType>(schema: S, merged: unknown): z.output<S> {
  const result = schema.safeParse(merged)
  if (!result.success) invalidInput(fieldErrors(result.error))
  return result.data
}

/** The attributes of `input` without `version`, for `record.set(...)`. */
export function changes<T extends { version: number }>(input: T): Omit<T, 'version'> {
  const { version: _version, ...rest } = input
  return rest
}
