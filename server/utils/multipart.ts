import { readMultipartFormData, type H3Event } from 'h3'
import { invalidInput } from './errors'

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
