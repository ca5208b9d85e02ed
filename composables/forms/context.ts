import type { InjectionKey, Ref } from 'vue'
import type { TemperatureUnit } from '#shared/units'
import type { FieldSpec } from './messages'

/** What the field components of a schema form read from it (provided by useSchemaForm). */
export interface SchemaFormContext {
  /** The spec of a path (label, kind), row numbers filled in. */
  spec: (path: string) => FieldSpec
  /** The unit a box shows for a path ('' for none). */
  unitOf: (path: string) => string
  temperatureUnit: TemperatureUnit
  /** The form-wide message (server refusals, problems with no field on screen). */
  message: Ref<string>
  busy: Ref<boolean>
  /** Submits the form (what `<FormFrame>` calls). */
  submit: (e?: Event) => Promise<unknown>
  /** Every error by path, as the form holds them. */
  errors: Ref<Partial<Record<string, string>>>
  /** A field component shows the errors of this path (and its sub-paths) on screen. */
  show: (path: string) => () => void
}

export const SCHEMA_FORM: InjectionKey<SchemaFormContext> = Symbol('bandlight-schema-form')
