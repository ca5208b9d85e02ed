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
    uploadId: z.number({ error: 'uploadId must be a number' }).int().positive().nullable().optional(),
    /** As found, before adjustment (optional). */
    asFound: asFoundSchema.nullable().optional().default(null),
  })
  .superRefine((v, ctx) => {
    if (v.dueDate <= v.calibrationDate) ctx.addIssue({ code: 'custom', path: ['dueDate'], message: 'The due date must come after the calibration date' })
  })
export type CalibrationCreateInput = z.infer<typeof calibrationCreateSchema>
