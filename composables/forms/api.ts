/**
 * What an API refusal says: status, message and `data.fields` (`{ "band.lambda1Um": "…" }`), read
 * from the error $fetch throws.
 */
import type { FieldErrors } from '#shared/types'
import { humanize, specFor, type FieldSpecs } from './messages'

export interface ApiProblem {
  status: number | null
  message: string
  fields: FieldErrors
}

interface FetchErrorShape {
  statusCode?: number
  status?: number
  message?: string
  data?: { message?: string, statusMessage?: string, data?: { message?: string, fields?: FieldErrors } }
}

/** The parts of an API refusal (or of any other error: its message). */
export function apiProblem(err: unknown): ApiProblem {
  const e = (err ?? {}) as FetchErrorShape
  return {
    status: e.statusCode ?? e.status ?? null,
    message: e.data?.message ?? e.data?.data?.message ?? e.message ?? 'Something went wrong.',
    fields: e.data?.data?.fields ?? {},
  }
}

/** "Label: message", unless the message already starts with the label. */
export function labelled(label: string, message: string): string {
  return message.toLowerCase().startsWith(label.toLowerCase()) ? message : `${label}: ${message}`
}

/** An API refusal as one sentence for a notice: each field's message with its label, or the message. */
export function problemText(err: unknown, specs: FieldSpecs = {}): string {
  const p = apiProblem(err)
  const lines = Object.entries(p.fields)
    .filter(([path]) => path !== 'version' && path !== 'body')
    .map(([path, m]) => labelled(specFor(specs, path).label, humanize(m, specs)))
  return lines.length ? lines.join(' ') : humanize(p.message, specs)
}
