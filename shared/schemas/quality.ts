/**
 * Small pieces shared by the quality schemas (checks, proficiency, nonconformities, complaints,
 * corrective actions, intervals): temperatures in K, uncertainties in K, ids, periods.
 */
import { z } from 'zod'
import { EQUIPMENT_TYPES } from '../registers/constants'
import { dateOnlySchema, numberField } from './registerQuery'

/** A temperature in K, above 0 and at most 5000 K. */
export const kelvinField = (label: string) => numberField(label).positive(`${label} must be above 0 K`).max(5000, `${label}: at most 5000 K`)
/** An expanded uncertainty (or a limit) in K: ≥ 0, at most 100 K. */
export const uncertaintyField = (label: string) => numberField(label).min(0, `${label} cannot be negative`).max(100, `${label}: at most 100 K`)
/** A record id in a body. */
export const idField = (label: string) => z.number({ error: `${label} must be a number` }).int(`${label} must be a whole number`).positive(`${label} must be positive`)
/** A record id in a query string. */
export const idQuery = (label: string) => z.coerce.number({ error: `${label} must be a number` }).int(`${label} must be a whole number`).positive(`${label} must be positive`)

export const equipmentTypeSchema = z.enum(EQUIPMENT_TYPES, { error: `Equipment is a source or a reference instrument (${EQUIPMENT_TYPES.join(', ')})` })

/** `[temperatureK, correctionK]` rows: what a reference needed (true − value used), K. */
export const correctionRowsSchema = z
  .array(z.tuple([kelvinField('Temperature'), numberField('Correction').min(-100, 'A correction of more than 100 K is not a correction').max(100, 'A correction of more than 100 K is not a correction')], { error: 'Each row is [temperature in K, correction in K]' }), { error: 'A list of [temperature in K, correction in K] rows' })
  .min(1, 'Give at least one temperature and its correction')
  .max(100, 'At most 100 rows')

/** A period `from`–`to` (both dates included); `from` not after `to`. */
export const periodSchema = z
  .object({
    from: dateOnlySchema,
    to: dateOnlySchema,
  })
  .refine(v => v.from <= v.to, { path: ['to'], message: 'The end of the period must not be before its start' })
