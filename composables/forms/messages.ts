/**
 * The words of the forms: what each field is called and holds, and every problem with it said in
 * those words — the field's label (never a schema key such as `setPointK`) and values in the
 * unit the user works in (°C, K or °F; a bound of 0 K reads "above absolute zero (−273.15 °C)").
 * Pure: the form layer (useSchemaForm) and its tests use it.
 */
import type { z } from 'zod'
import { formatNumber } from '#shared/format'
import type { QuantityKind } from '#shared/quantities'
import { fieldName } from '#shared/schemas/errors'
import { deltaFromKelvin, fromKelvin, UNIT_SYMBOL, type TemperatureUnit } from '#shared/units'

/** What a field is called and what its box holds. */
export interface FieldSpec {
  /** The label people read, without the unit ("Usable from"); `{n}` is the row number in a table. */
  label: string
  /** A box typed as text and read with shared/quantities (letters are refused in words). */
  quantity?: QuantityKind
  /** An empty box means "not given" (null), not "required". */
  optional?: boolean
  /** Picked from a list (a select, checkboxes): a missing value reads "Choose the …". */
  choice?: boolean
  /** The unit a bare number is typed in, if not the kind's usual one. */
  unit?: string
  /** The unit the schema (the API) takes, if not the kind's usual one. */
  schemaUnit?: string
}

/** Field specs by path; `[*]` stands for any row (`corrections[*][0]`). A string is a label. */
export type FieldSpecs = Record<string, string | FieldSpec>

/** A spec with its row number filled in. */
export type ResolvedSpec = FieldSpec

/** The unit a box of a kind shows and the unit the schema takes, for a temperature unit. */
export function unitsOf(spec: FieldSpec, temperatureUnit: TemperatureUnit): { shown: string, schema: string } {
  const kind = spec.quantity
  const by: Record<QuantityKind, { shown: string, schema: string }> = {
    temperature: { shown: UNIT_SYMBOL[temperatureUnit], schema: 'K' },
    temperatureDifference: { shown: temperatureUnit === 'F' ? '°F' : 'K', schema: 'K' },
    wavelength: { shown: 'µm', schema: 'µm' },
    length: { shown: 'mm', schema: 'mm' },
    percent: { shown: '%', schema: '%' },
    number: { shown: '', schema: '' },
  }
  const base = kind ? by[kind] : { shown: '', schema: '' }
  return { shown: spec.unit ?? base.shown, schema: spec.schemaUnit ?? spec.unit ?? base.schema }
}

/** The keys a path may be described under (`corrections[3][0]`, `corrections[*][0]`, `corrections[*][*]`) and its row number (4). */
function patterns(path: string): { keys: string[], row: number | null } {
  const first = /\[(\d+)\]/.exec(path)
  return {
    keys: [path, path.replace(/\[\d+\]/, '[*]'), path.replace(/\[\d+\]/g, '[*]')],
    row: first ? Number(first[1]) + 1 : null,
  }
}

/** "ambientTemperatureK" → "Ambient temperature"; "organizationId" → "Organization". */
export function words(key: string): string {
  const last = key.split(/[.[\]]/).filter(s => s && !/^\d+$/.test(s) && s !== '*').pop() ?? key
  const bare = last.replace(/(?<=[a-z0-9])(Id|Ids|K|Um|Mm|Pct)$/, '')
  const spaced = bare.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase()
  return spaced.charAt(0).toUpperCase() + spaced.slice(1)
}

/** The spec of a path: exact, else by its row pattern; a field nobody described gets words made from its key. */
export function specFor(specs: FieldSpecs, path: string): ResolvedSpec {
  const { keys, row } = patterns(path)
  const raw = keys.map(k => specs[k]).find(v => v !== undefined)
  const spec: FieldSpec = raw === undefined ? { label: words(path) } : typeof raw === 'string' ? { label: raw } : raw
  return { ...spec, label: spec.label.replace('{n}', row === null ? '' : String(row)) }
}

/** A label in the middle of a sentence: "Ambient temperature" → "ambient temperature", "CMC" stays. */
export function midSentence(label: string): string {
  return /^[A-Z][a-z]/.test(label) ? label.charAt(0).toLowerCase() + label.slice(1) : label
}

/** Replace schema keys in a message with their labels, and any other camelCase key with words. */
export function humanize(message: string, specs: FieldSpecs = {}): string {
  let out = message
  for (const [key, raw] of Object.entries(specs)) {
    if (!/^[A-Za-z]\w*$/.test(key)) continue
    const label = typeof raw === 'string' ? raw : raw.label
    out = out.replace(new RegExp(`\\b${key}\\b`, 'g'), (m, offset: number) => (offset === 0 ? label : midSentence(label)))
  }
  return out.replace(/\b[a-z]+(?:[A-Z][a-z0-9]*)+\b/g, (m, offset: number) => (offset === 0 ? words(m) : midSentence(words(m))))
}

const TEMPERATURE_UNIT_OF: Record<string, TemperatureUnit> = { '°C': 'C', 'K': 'K', '°F': 'F' }

/**
 * A value in the schema's unit as the box shows it: the same unit, or kelvin in °C or °F (exact,
 * shared/units.ts); null for any other pair (the bound is then stated in the schema's unit). Kept
 * free of the unit parser so that forms without a quantity box do not load it.
 */
function shownValue(value: number, kind: QuantityKind, schema: string, shown: string): number | null {
  if (shown === schema) return value
  const unit = TEMPERATURE_UNIT_OF[shown]
  if (schema !== 'K' || !unit) return null
  if (kind === 'temperature') return fromKelvin(value, unit)
  if (kind === 'temperatureDifference') return deltaFromKelvin(value, unit)
  return null
}

/** A bound of a number field in the unit the user sees ("−73.15 °C", "0.5 µm", "1"). */
function bound(value: number, spec: FieldSpec, temperatureUnit: TemperatureUnit): string {
  const { shown, schema } = unitsOf(spec, temperatureUnit)
  if (!spec.quantity || spec.quantity === 'number') return formatNumber(value)
  const v = shownValue(value, spec.quantity, schema, shown)
  if (v === null) return `${formatNumber(value, 2).replace('-', '−')} ${schema}`.trim()
  return `${formatNumber(v, 2).replace('-', '−')} ${shown}`.trim()
}

/**
 * One problem the schema found, in the words of the form.
 *
 * @param issue the zod issue (its path, code and bounds, in the schema's units)
 * @param spec the field's spec (label, kind)
 * @param temperatureUnit the unit the form shows temperatures in
 * @param specs every spec of the form, to name other fields a message mentions
 * @example issueMessage({ code: 'too_small', origin: 'number', minimum: 0, inclusive: false, path: ['setPointK'], message: '' }, { label: 'Set-point', quantity: 'temperature' }, 'C')
 *   // 'Set-point must be above absolute zero (−273.15 °C)'
 */
export function issueMessage(issue: z.core.$ZodIssue, spec: FieldSpec, temperatureUnit: TemperatureUnit, specs: FieldSpecs = {}): string {
  const label = spec.label
  const { shown } = unitsOf(spec, temperatureUnit)
  switch (issue.code) {
    case 'invalid_type':
      if (spec.choice) return `Choose the ${midSentence(label)}`
      if (issue.expected === 'int') return `${label} must be a whole number`
      if (issue.expected === 'number') return `Enter the ${midSentence(label)} (a number${shown ? ` in ${shown}` : ''})`
      if (issue.expected === 'string' || issue.expected === 'array' || issue.expected === 'boolean') return `${label} is required`
      return `${label}: ${humanize(issue.message, specs)}`
    case 'too_small':
      if (issue.origin === 'number') {
        const min = Number(issue.minimum)
        if (spec.quantity === 'temperature' && min === 0 && !issue.inclusive) return `${label} must be above absolute zero (${bound(0, spec, temperatureUnit)})`
        return `${label} must be ${issue.inclusive ? 'at least' : 'above'} ${bound(min, spec, temperatureUnit)}`
      }
      if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? `${label} is required` : `${label}: at least ${issue.minimum} characters`
      return humanize(issue.message, specs)
    case 'too_big':
      if (issue.origin === 'number') return `${label} must be ${issue.inclusive ? 'at most' : 'below'} ${bound(Number(issue.maximum), spec, temperatureUnit)}`
      if (issue.origin === 'string') return `${label}: at most ${issue.maximum} characters`
      return humanize(issue.message, specs)
    case 'invalid_value':
    case 'invalid_union':
      return `Choose the ${midSentence(label)}`
    case 'invalid_format':
      return issue.format === 'email' ? 'Not a valid e-mail address' : `${label}: ${humanize(issue.message, specs)}`
    default:
      return humanize(issue.message, specs)
  }
}

/**
 * Every problem of a failed parse, by field path as the API spells it (`band.lambda1Um`,
 * `corrections[1][0]`), the first one per field.
 */
export function issueMessages(error: z.ZodError, specs: FieldSpecs, temperatureUnit: TemperatureUnit): Record<string, string> {
  const out: Record<string, string> = {}
  for (const issue of error.issues) {
    const path = fieldName(issue.path)
    if (!(path in out)) out[path] = issueMessage(issue, specFor(specs, path), temperatureUnit, specs)
  }
  return out
}
