import type { z } from 'zod'
import { fieldErrors } from '../../shared/schemas/errors'

/**
 * A validator for h3's `readValidatedBody`, `getValidatedQuery` and
 * `getValidatedRouterParams`. On failure h3 answers 400 "Validation Error" with
 * `data: { message, fields }`, where `fields` maps each field at fault to its message.
 */
export function parseWith<S extends z.ZodType>(schema: S) {
  return (input: unknown): z.output<S> => {
    const result = schema.safeParse(input)
    if (result.success) return result.data
    const fields = fieldErrors(result.error)
    const message = 'Invalid input: ' + Object.entries(fields).map(([f, m]) => `${f}: ${m}`).join('; ')
    // A plain object (not an Error) so it serializes into the response's `data`.
    throw { message, fields }
  }
}
