import { z } from 'zod'
import {
  CUSTOMER_SORTS,
  EQUIPMENT_STATUSES,
  INSTRUMENT_KINDS,
  INSTRUMENT_SORTS,
  INSTRUMENT_STATUSES,
  REFERENCE_KINDS,
  REFERENCE_SORTS,
  SOURCE_KINDS,
  SOURCE_SORTS,
} from '../registers/constants'
import { isDateOnly } from '../registers/dates'
import { pageQuerySchema, versionSchema } from './common'

/** A calendar date `YYYY-MM-DD` (calibration dates, due dates). */
export const dateOnlySchema = z
  .string({ error: 'Use a date written YYYY-MM-DD' })
  .trim()
  .refine(isDateOnly, 'Use a real date written YYYY-MM-DD')

/** Optional free text: trimmed, `''` and null stored as null. */
export const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max, `At most ${max} characters`)
    .nullable()
    .optional()
    .transform(v => (v === '' ? null : v))

/** A finite number with a message naming what it is. */
export const numberField = (label: string) => z.number({ error: `${label} must be a number` }).finite(`${label} must be a finite number`)

const listBase = pageQuerySchema.extend({
  dir: z.enum(['asc', 'desc'], { error: 'dir is asc or desc' }).default('asc'),
  /** `false` (default) hides archived records, `true` shows only them, `all` both. */
  archived: z.enum(['false', 'true', 'all'], { error: 'archived is false, true or all' }).default('false'),
  dueBefore: dateOnlySchema.optional(),
})

const sortOf = <S extends readonly [string, ...string[]]>(columns: S, fallback: S[number]) =>
  z.enum(columns, { error: `sort is one of ${columns.join(', ')}` }).default(fallback as never)

/** GET /api/sources */
export const sourceQuerySchema = listBase.extend({
  sort: sortOf(SOURCE_SORTS, 'assetTag'),
  status: z.enum(EQUIPMENT_STATUSES).optional(),
  kind: z.enum(SOURCE_KINDS).optional(),
})
export type SourceQuery = z.infer<typeof sourceQuerySchema>

/** GET /api/reference-instruments */
export const referenceQuerySchema = listBase.extend({
  sort: sortOf(REFERENCE_SORTS, 'assetTag'),
  status: z.enum(EQUIPMENT_STATUSES).optional(),
  kind: z.enum(REFERENCE_KINDS).optional(),
})
export type ReferenceQuery = z.infer<typeof referenceQuerySchema>

/** GET /api/instruments (a customer's organizationId is forced to its own). */
export const instrumentQuerySchema = listBase.extend({
  sort: sortOf(INSTRUMENT_SORTS, 'serial'),
  status: z.enum(INSTRUMENT_STATUSES).optional(),
  kind: z.enum(INSTRUMENT_KINDS).optional(),
  organizationId: z.coerce.number({ error: 'Must be a number' }).int().positive().optional(),
})
export type InstrumentQuery = z.infer<typeof instrumentQuerySchema>

/** GET /api/customers: `archived` here reads "inactive" (organizations are deactivated, not archived). */
export const customerQuerySchema = pageQuerySchema.extend({
  sort: sortOf(CUSTOMER_SORTS, 'name'),
  dir: z.enum(['asc', 'desc'], { error: 'dir is asc or desc' }).default('asc'),
  active: z.enum(['true', 'false', 'all'], { error: 'active is true, false or all' }).default('true'),
})
export type CustomerQuery = z.infer<typeof customerQuerySchema>

/** GET /api/responsivities */
export const responsivityQuerySchema = pageQuerySchema
export type ResponsivityQuery = z.infer<typeof responsivityQuerySchema>

/** POST /api/<register>/[id]/archive */
export const archiveSchema = z.object({
  archived: z.boolean({ error: 'archived must be true or false' }),
  version: versionSchema,
})
export type ArchiveInput = z.infer<typeof archiveSchema>

/** POST /api/<register>/import: without `commit` a preview, with it all rows or none. */
export const csvImportSchema = z.object({
  csv: z.string({ error: 'csv is required' }).min(1, 'The file is empty').max(5_000_000, 'At most 5 MB of CSV per import'),
  commit: z.boolean({ error: 'commit must be true or false' }).default(false),
})
export type CsvImportInput = z.infer<typeof csvImportSchema>
