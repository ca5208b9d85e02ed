import type { z } from 'zod'
import type { FieldErrors } from '../types'

/** `['components', 0, 'halfWidth']` → `components[0].halfWidth`; the root is `body`. */
export function fieldName(path: readonly PropertyKey[]): string {
  if (path.length === 0) return 'body'
  return path
    .map((p, i) => (typeof p === 'number' ? `[${p}]` : i === 0 ? String(p) : `.${String(p)}`))
    .join('')
}

/** The first message for each field at fault — the same map the server sends in `data.fields`. */
export function fieldErrors(error: z.ZodError): FieldErrors {
  const fields: FieldErrors = {}
  for (const issue of error.issues) {
    const name = fieldName(issue.path)
    if (!(name in fields)) fields[name] = issue.message
  }
  return fields
}
