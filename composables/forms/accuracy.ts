/**
 * An accuracy specification in a form (the maker's, or the one a customer names): its form
 * (± b, ± a % of reading, the greater of the two, or their sum) with a and b in boxes; the same
 * shape the API's `accuracySpecSchema` takes. One place for the instrument, request and terms forms.
 */
import type { AccuracySpec } from '#shared/schemas/instrument'
import type { TemperatureUnit } from '#shared/units'
import type { SelectOption } from './options'
import { choice, difference } from './specs'
import type { FieldSpecs } from './messages'
import { shown } from './values'

export const ACCURACY_FORMS: SelectOption[] = [
  { value: 'absolute', label: '± b' },
  { value: 'percentOfReading', label: '± a % of reading' },
  { value: 'greaterOf', label: 'greater of ± a % and ± b' },
  { value: 'percentPlus', label: '± (a % of reading + b)' },
]

/** "None": no specification (no statement of conformity is asked for). */
export const NO_ACCURACY = 'none'

/** The field specs of an accuracy specification at `path` (e.g. `accuracy`, `terms.specification`). */
export function accuracySpecs(path: string, label = 'Accuracy specification'): FieldSpecs {
  return {
    [path]: choice(label),
    [`${path}.kind`]: choice('Form'),
    [`${path}.a`]: { label: 'a', quantity: 'percent' },
    [`${path}.b`]: difference('b'),
  }
}

export interface AccuracyValues { kind: string, a: string, b: string }

/** What the boxes show for a specification (or for none). */
export function accuracyValues(spec: AccuracySpec | null | undefined, unit: TemperatureUnit, fallback: 'none' | 'greaterOf' = 'greaterOf'): AccuracyValues {
  return {
    kind: spec?.kind ?? fallback,
    a: shown(spec && 'a' in spec ? spec.a : 1, 'percent', unit),
    b: shown(spec && 'b' in spec ? spec.b : 1, 'temperatureDifference', unit),
  }
}

/** The boxes (already read into numbers) as the API's specification; null for "none". */
export function accuracyBody(v: unknown): AccuracySpec | null {
  const { kind, a, b } = v as { kind: string, a: number, b: number }
  if (kind === NO_ACCURACY) return null
  if (kind === 'absolute') return { kind, b }
  if (kind === 'percentOfReading') return { kind, a }
  return { kind, a, b } as AccuracySpec
}
