import { z } from 'zod'
import { text } from './common'
import { dateOnlySchema, optionalText } from './registerQuery'
import { correctionRowsSchema, uncertaintyField } from './quality'

/**
 * What the certificate says the item was like before any adjustment: at each temperature the
 * correction it needed (true value − value the laboratory was using, K), their standard
 * uncertainty, and the tolerance the laboratory allows the item. Out of tolerance (any
 * |correction| above it) opens a nonconformity listing the work done with the item since the last
 * good evidence (ISO/IEC 17025:2017 6.4.9, 7.10).
 */
export const asFoundSchema = z.object({
  corrections: correctionRowsSchema,
  standardUncertaintyK: uncertaintyField('Standard uncertainty of the as-found corrections').positive('The standard uncertainty must be above 0 K'),
  toleranceK: uncertaintyField('Tolerance').positive('The tolerance must be above 0 K'),
}, { error: 'asFound is an object with corrections, standardUncertaintyK and toleranceK' })
export type AsFoundInput = z.infer<typeof asFoundSchema>

/** POST /api/sources/[id]/calibrations and /api/reference-instruments/[id]/calibrations */
export const calibrationCreateSchema = z
  .object({
    provider: text(160, 'Provider'),
    certificateNumber: text(80, 'Certificate number'),
    calibrationDate: dateOnlySchema,
    dueDate: dateOnlySchema,
    results: optionalText(8000),
    /** An upload with purpose `equipment-certificate`. */
    uploadId: z.number({ error: 'The certificate file must be an upload' }).int().positive().nullable().optional(),
    /** As found, before adjustment (optional). */
    asFound: asFoundSchema.nullable().optional().default(null),
  })
  .superRefine((v, ctx) => {
    if (v.dueDate <= v.calibrationDate) ctx.addIssue({ code: 'custom', path: ['dueDate'], message: 'The due date must come after the calibration date' })
  })
export type CalibrationCreateInput = z.infer<typeof calibrationCreateSchema>

/**
 * The text fields of POST /api/sources/[id]/calibrations/dcc and
 * /api/reference-instruments/[id]/calibrations/dcc (a multipart form; the supplier's DCC is the
 * field `file`). Without `commit=true` the file is only read and previewed; with it the
 * calibration is recorded, which needs the due date of the next calibration — a DCC states none.
 */
export const calibrationDccFieldsSchema = z
  .object({
    commit: z.enum(['true', 'false'], { error: 'commit is true (record) or false (preview)' }).optional(),
    dueDate: z.preprocess(v => (v === '' ? undefined : v), dateOnlySchema.optional()),
  })
  .superRefine((v, ctx) => {
    if (v.commit === 'true' && !v.dueDate) ctx.addIssue({ code: 'custom', path: ['dueDate'], message: 'Enter the due date of the next calibration: a DCC does not state one' })
  })
export type CalibrationDccFields = z.infer<typeof calibrationDccFieldsSchema>
