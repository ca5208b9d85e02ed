import { z } from 'zod'
import { text } from './common'
import { dateOnlySchema, optionalText } from './registerQuery'

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
  })
  .superRefine((v, ctx) => {
    if (v.dueDate <= v.calibrationDate) ctx.addIssue({ code: 'custom', path: ['dueDate'], message: 'The due date must come after the calibration date' })
  })
export type CalibrationCreateInput = z.infer<typeof calibrationCreateSchema>
