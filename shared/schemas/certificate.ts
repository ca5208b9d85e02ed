/**
 * Inputs of the laboratory settings (server/api/settings/lab), the certificate routes
 * (server/api/certificates) and the public verification (server/api/verify).
 */
import { z } from 'zod'
import { CERTIFICATE_STATUSES } from '../certificates/constants'
import { isValidTimeZone } from '../mail/milestones'
import { pageQuerySchema, text, versionSchema } from './common'
import { optionalText } from './registerQuery'

/** The password of the person signing, entered again at the moment of signing. */
const signingPassword = z.string({ error: 'Enter your password to sign' }).min(1, 'Enter your password to sign').max(200, 'At most 200 characters')
const signatoryFunction = text(120, 'The signing function')
const reason = text(2000, 'The reason')

const settingsFields = z.object({
  name: text(200, 'The laboratory name'),
  addressLines: text(600, 'The address'),
  city: text(120, 'The city'),
  postcode: optionalText(20),
  country: text(80, 'The country'),
  email: optionalText(254),
  phone: optionalText(40),
  accreditationBody: text(160, 'The accreditation body'),
  accreditationNumber: text(60, 'The accreditation number'),
  numberPrefix: z.string({ error: 'The prefix must be text' }).trim().max(12, 'At most 12 characters')
    .regex(/^[A-Za-z0-9]*(?:-[A-Za-z0-9]+)*$/, 'Letters and digits, hyphens only between them'),
  numberIncludesYear: z.boolean({ error: 'Say whether numbers include the year (true or false)' }),
  numberDigits: z.number({ error: 'The sequence digits must be a number' }).int('The sequence digits must be a whole number').min(3, 'At least 3 digits').max(8, 'At most 8 digits'),
  signatoryFunctions: z.array(text(120, 'Function'), { error: 'The signatory functions are a list of titles' }).min(1, 'Give at least one function').max(20, 'At most 20 functions')
    .refine(list => new Set(list.map(s => s.toLowerCase())).size === list.length, 'Each function once'),
  traceabilityStatement: text(2000, 'The traceability statement'),
  decisionRuleStatement: text(2000, 'The decision rule statement'),
  itemsStatement: text(600, 'The items statement'),
  reproductionStatement: optionalText(600),
  timeZone: z.string({ error: 'Time zone is required' }).trim().refine(isValidTimeZone, 'Not a time zone (use a name such as Europe/London)'),
})

/** PATCH /api/settings/lab: any subset of the settings, with the version last seen. */
export const labSettingsUpdateSchema = settingsFields.partial().extend({ version: versionSchema })
export type LabSettingsUpdateInput = z.infer<typeof labSettingsUpdateSchema>
/** The complete settings (a merged update is checked against this). */
export const labSettingsSchema = settingsFields
export type LabSettingsInput = z.infer<typeof labSettingsSchema>

/** POST /api/certificates: sign and issue the certificate of an approved run. */
export const certificateIssueSchema = z.object({
  runId: z.number({ error: 'The run must be a number' }).int('The run must be a whole number').positive('The run must be positive'),
  password: signingPassword,
  signatoryFunction,
})
export type CertificateIssueInput = z.infer<typeof certificateIssueSchema>

/** POST /api/certificates/[id]/amend: a new revision of the same number, with the reason. */
/**
 * POST /api/certificates/[id]/amend: sign the amendment from the corrected, approved revision run
 * (`runId`, or the one open for the certificate). The reason is the one given when it was reopened.
 */
export const certificateAmendSchema = z.object({
  runId: z.number({ error: 'runId must be a number' }).int().positive().optional(),
  password: signingPassword,
  signatoryFunction,
})
export type CertificateAmendInput = z.infer<typeof certificateAmendSchema>

/** POST /api/certificates/[id]/reopen: why the certificate must be corrected. */
export const certificateReopenSchema = z.object({ reason })
export type CertificateReopenInput = z.infer<typeof certificateReopenSchema>

/** POST /api/certificates/[id]/withdraw. */
export const certificateWithdrawSchema = z.object({ reason, password: signingPassword })
export type CertificateWithdrawInput = z.infer<typeof certificateWithdrawSchema>

/** GET /api/certificates: paged, newest first; a number or serial prefix in `q`. */
export const certificateQuerySchema = pageQuerySchema.extend({
  status: z.enum(CERTIFICATE_STATUSES, { error: `status is one of ${CERTIFICATE_STATUSES.join(', ')}` }).optional(),
  runId: z.coerce.number({ error: 'runId must be a number' }).int().positive('runId must be positive').optional(),
  instrumentId: z.coerce.number({ error: 'instrumentId must be a number' }).int().positive('instrumentId must be positive').optional(),
})
export type CertificateQuery = z.infer<typeof certificateQuerySchema>

/** GET /api/verify?number=…&code=… (no sign-in). */
export const verifyQuerySchema = z.object({
  number: z.string({ error: 'The certificate number is required' }).trim().min(1, 'The certificate number is required').max(60, 'At most 60 characters'),
  code: z.string({ error: 'The verification code is required' }).trim().min(1, 'The verification code is required').max(40, 'At most 40 characters'),
})
export type VerifyQuery = z.infer<typeof verifyQuerySchema>
