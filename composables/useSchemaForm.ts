/**
 * The form layer: a vee-validate form checked by the same zod 4 schema as the API route, through a
 * small adapter (vee-validate's own zod package wants zod 3). The form's values mirror the body
 * the route takes (the same keys and nesting, so the server's `data.fields` land on the same
 * fields); number boxes hold what was typed and are read with shared/quantities in the unit the
 * user works in, so "25 °C", "298.15 K" or "900 nm" all mean what they say and letters are refused
 * in words. Every message names the field's label and speaks in the user's unit
 * (./forms/messages.ts). Field components (`components/form/*`) find the form by injection.
 * The unit parser (shared/quantities with mathjs's unit machinery) is loaded by the first check of
 * a form that has number boxes, so pages whose forms have none (sign-in) never download it.
 */
import { useForm, type GenericObject, type TypedSchema } from 'vee-validate'
import type { z } from 'zod'
import type { TemperatureUnit } from '#shared/units'
import { apiProblem, labelled } from './forms/api'
import { SCHEMA_FORM, type SchemaFormContext } from './forms/context'
import { humanize, issueMessages, specFor, unitsOf, type FieldSpecs } from './forms/messages'

export interface SchemaFormOptions<S extends z.ZodType, V extends GenericObject> {
  /** The route's schema (a getter when it depends on the form, e.g. create or update). */
  schema: MaybeRefOrGetter<S>
  /** Labels and kinds of the fields, by path (`corrections[*][0]` for every row). */
  fields: MaybeRefOrGetter<FieldSpecs>
  initialValues: V
  /** The unit temperatures are typed in; by default the user's preference when the form opens (fixed while it is open). */
  temperatureUnit?: TemperatureUnit
  /** Reshape the values (number boxes already read into the schema's units) into the route's body. */
  toBody?: (read: V, values: V) => unknown
  /** Sends the checked body; an API refusal it throws is shown on the fields (`data.fields`). */
  onSubmit?: (body: z.output<S>) => unknown
}

type Quantities = typeof import('#shared/quantities')
let quantities: Promise<Quantities> | null = null
/** shared/quantities, loaded once, on first need (a separate chunk in the browser). */
function loadQuantities(): Promise<Quantities> {
  // a failed download is tried again at the next check
  return (quantities ??= import('#shared/quantities').catch((err: unknown) => {
    quantities = null
    throw err
  }))
}

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  !!v && typeof v === 'object' && !Array.isArray(v) && Object.getPrototypeOf(v) === Object.prototype

export function useSchemaForm<S extends z.ZodType, V extends GenericObject>(opts: SchemaFormOptions<S, V>) {
  const temperatureUnit = opts.temperatureUnit ?? usePreferencesStore().temperatureUnit
  const specs = () => toValue(opts.fields)
  const message = ref('')

  /** Every number box read into the schema's unit; what cannot be read is noted in `problems`. */
  function read(value: unknown, path: string, problems: Record<string, string>, q: Quantities | null): unknown {
    if (Array.isArray(value)) return value.map((v, i) => read(v, `${path}[${i}]`, problems, q))
    if (isPlainObject(value)) return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, read(v, path ? `${path}.${k}` : k, problems, q)]))
    const spec = specFor(specs(), path)
    if (!spec.quantity) return value
    const text = value === null || value === undefined ? '' : String(value)
    if (text.trim() === '') return spec.optional ? null : Number.NaN
    const { shown, schema } = unitsOf(spec, temperatureUnit)
    try {
      return q!.parseQuantity(text, spec.quantity, shown, schema)
    }
    catch (err) {
      problems[path] = labelled(spec.label, (err as Error).message)
      return Number.NaN
    }
  }

  // Paths a field component shows on screen; errors elsewhere go into the form's message.
  const onScreen = new Map<string, number>()
  function show(path: string) {
    onScreen.set(path, (onScreen.get(path) ?? 0) + 1)
    return () => {
      const n = (onScreen.get(path) ?? 1) - 1
      if (n > 0) onScreen.set(path, n)
      else onScreen.delete(path)
    }
  }
  /** The field on screen that shows a path: itself, or the nearest enclosing one (`contactEmails` for `contactEmails[2]`). */
  function shownAt(path: string): string | null {
    let best: string | null = null
    for (const p of onScreen.keys()) {
      if ((path === p || path.startsWith(`${p}[`) || path.startsWith(`${p}.`)) && (!best || p.length > best.length)) best = p
    }
    return best
  }

  const typedSchema: TypedSchema<V, V> = {
    __type: 'VVTypedSchema',
    async parse(values) {
      const problems: Record<string, string> = {}
      const q = Object.values(specs()).some(s => typeof s !== 'string' && !!s.quantity) ? await loadQuantities() : null
      const numbers = read(values, '', problems, q) as V
      const body = opts.toBody ? opts.toBody(numbers, values) : numbers
      const result = toValue(opts.schema).safeParse(body)
      const errors = { ...(result.success ? {} : issueMessages(result.error, specs(), temperatureUnit)), ...problems }
      // A problem of a part (`contactEmails[2]`) shows under the field that holds it (`contactEmails`).
      const byField: Record<string, string> = {}
      for (const [path, m] of Object.entries(errors)) {
        const at = shownAt(path) ?? path
        if (!(at in byField)) byField[at] = m
      }
      const list = Object.entries(byField).map(([path, m]) => ({ path, errors: [m] }))
      return { value: list.length || !result.success ? undefined : (result.data as V), errors: list }
    },
  }

  const form = useForm<V, V>({
    validationSchema: typedSchema,
    initialValues: opts.initialValues as never,
    // A field hidden for a while (a band given as a table instead of λ1–λ2) keeps what was typed.
    keepValuesOnUnmount: true,
  })

  function summary(errors: Partial<Record<string, string>>): string {
    const offScreen = Object.entries(errors)
      .filter(([path, m]) => m && !shownAt(path))
      .map(([path, m]) => labelled(specFor(specs(), path).label, m!))
    const marked = Object.keys(errors).some(path => shownAt(path))
    return [marked ? 'Please correct the marked fields.' : '', ...offScreen].filter(Boolean).join(' ')
  }

  /** Show an API refusal: each `data.fields` message under its field, the rest as the form's message. */
  function fromError(err: unknown) {
    const p = apiProblem(err)
    const lines: string[] = []
    let marked = 0
    for (const [path, m] of Object.entries(p.fields)) {
      if (path === 'version' || path === 'body') continue
      const text = humanize(m, specs())
      const at = shownAt(path)
      if (at) {
        form.setFieldError(at as never, text)
        marked++
      }
      else {
        lines.push(labelled(specFor(specs(), path).label, text))
      }
    }
    message.value = lines.length ? lines.join(' ') : marked ? 'Not saved: see the marked fields.' : humanize(p.message, specs())
  }

  const submit = form.handleSubmit(
    async (body) => {
      message.value = ''
      try {
        await opts.onSubmit?.(body as unknown as z.output<S>)
      }
      catch (err) {
        fromError(err)
      }
    },
    ({ errors }) => {
      message.value = summary(errors as Partial<Record<string, string>>)
    },
  )

  const context: SchemaFormContext = {
    spec: path => specFor(specs(), path),
    unitOf: path => unitsOf(specFor(specs(), path), temperatureUnit).shown,
    temperatureUnit,
    message,
    busy: form.isSubmitting,
    submit,
    errors: form.errors as Ref<Partial<Record<string, string>>>,
    show,
  }
  provide(SCHEMA_FORM, context)

  return {
    /** The values as typed (reactive). */
    values: form.values,
    errors: form.errors,
    message,
    busy: form.isSubmitting,
    submit,
    fromError,
    /** Set a value by path (`template[2].unit`). */
    setFieldValue: (path: string, value: unknown, validate = false) => form.setFieldValue(path as never, value as never, validate),
    setValues: (values: Partial<Record<string, unknown>>, validate = false) => form.setValues(values as never, validate),
    resetForm: form.resetForm,
    validate: form.validate,
    temperatureUnit,
    form,
  }
}
