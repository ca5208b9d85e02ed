import { z } from 'zod'
import { UPLOAD_PURPOSES } from '../registers/constants'

/** The text fields of POST /api/uploads (multipart form; the file itself is the field `file`). */
export const uploadFieldsSchema = z.object({
  purpose: z.enum(UPLOAD_PURPOSES, { error: `purpose is one of ${UPLOAD_PURPOSES.join(', ')}` }),
  /** Required for `instrument-photo`: the organization that owns the instrument. */
  organizationId: z.coerce.number({ error: 'organizationId must be a number' }).int().positive().optional(),
}).superRefine((v, ctx) => {
  if (v.purpose === 'instrument-photo' && !v.organizationId) ctx.addIssue({ code: 'custom', path: ['organizationId'], message: 'An instrument photo belongs to an organization' })
  if (v.purpose !== 'instrument-photo' && v.organizationId) ctx.addIssue({ code: 'custom', path: ['organizationId'], message: 'Only instrument photos belong to an organization' })
})
export type UploadFields = z.infer<typeof uploadFieldsSchema>
