import { readMultipartFormData, type H3Event } from 'h3'
import type { z } from 'zod'
import { fieldErrors } from '#shared/schemas/errors'
import { invalidInput } from './errors'
import { nulFields } from './validation'

export interface FileForm {
  /** The text fields of the form. */
  fields: Record<string, string>
  /** The parts that carry a file (`filename` set). */
  files: { name: string, filename: string, data: Buffer }[]
}

/** A multipart form read from the request (its size was already limited, server/middleware/02.body.ts); 400 when it is none. */
export async function readFileForm(event: H3Event): Promise<FileForm> {
  let parts: Awaited<ReturnType<typeof readMultipartFormData>>
  try {
    parts = await readMultipartFormData(event)
  }
  catch {
    invalidInput({ file: 'The multipart form could not be read' })
  }
  if (!parts) invalidInput({ file: 'Send a multipart form with the file in the field "file"' })
  const fields: Record<string, string> = {}
  const files: FileForm['files'] = []
  for (const p of parts) {
    if (p.filename !== undefined) files.push({ name: p.name ?? '', filename: p.filename, data: p.data })
    else if (p.name) fields[p.name] = p.data.toString('utf8')
  }
  return { fields, files }
}

/**
 * A multipart form whose text fields are checked against a schema (a NUL character refused
 * first, as `parseWith` does): 400 naming the fields at fault. The files are left to the service.
 */
export async function readFileFormWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<{ fields: z.output<S>, files: FileForm['files'] }> {
  const form = await readFileForm(event)
  const nul = nulFields(form.fields)
  if (nul.length) invalidInput(Object.fromEntries(nul.map(f => [f, 'Contains a NUL character, which no field may hold'])))
  const checked = schema.safeParse(form.fields)
  if (!checked.success) invalidInput(fieldErrors(checked.error))
  return { fields: checked.data, files: form.files }
}
