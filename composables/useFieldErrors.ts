import type { z } from 'zod'
import { fieldErrors } from '#shared/schemas/errors'
import type { FieldErrors } from '#shared/types'

interface ApiErrorShape {
  data?: { message?: string, statusCode?: number, data?: { fields?: FieldErrors } }
  statusCode?: number
  message?: string
}

/**
 * Field messages for a form: filled by the shared zod schema before sending, and
 * by the server's 4xx answer (`data.fields`) after. Messages show beside the fields.
 */
export function useFieldErrors() {
  const errors = ref<FieldErrors>({})
  const message = ref('')

  function clear() {
    errors.value = {}
    message.value = ''
  }

  /** Validate locally with the same schema the route uses; returns the parsed value or null. */
  function check<S extends z.ZodType>(schema: S, value: unknown): z.output<S> | null {
    clear()
    const result = schema.safeParse(value)
    if (result.success) return result.data
    errors.value = fieldErrors(result.error)
    message.value = 'Please correct the marked fields.'
    return null
  }

  function fromError(err: unknown) {
    const e = err as ApiErrorShape
    errors.value = e.data?.data?.fields ?? {}
    message.value = e.data?.message ?? e.message ?? 'Something went wrong.'
  }

  return { errors, message, clear, check, fromError }
}
