/**
 * Field specs used by several forms: what a box holds, in one word each, and the labels of the
 * fields every piece of equipment has.
 */
import type { FieldSpec, FieldSpecs } from './messages'

/** A temperature box (typed in °C, K or °F; the API takes kelvin). */
export const temperature = (label: string, more: Partial<FieldSpec> = {}): FieldSpec => ({ label, quantity: 'temperature', ...more })
/** A temperature difference (K, or °F for those who work in °F). */
export const difference = (label: string, more: Partial<FieldSpec> = {}): FieldSpec => ({ label, quantity: 'temperatureDifference', ...more })
/** A wavelength in µm ("900 nm" is read as 0.9 µm). */
export const wavelength = (label: string, more: Partial<FieldSpec> = {}): FieldSpec => ({ label, quantity: 'wavelength', ...more })
/** A distance in mm ("0.3 m" is read as 300 mm). */
export const length = (label: string, more: Partial<FieldSpec> = {}): FieldSpec => ({ label, quantity: 'length', ...more })
/** A plain number (an emissivity, a count, a factor). */
export const plain = (label: string, more: Partial<FieldSpec> = {}): FieldSpec => ({ label, quantity: 'number', ...more })
/** A value chosen from a list. */
export const choice = (label: string): FieldSpec => ({ label, choice: true })

/** Identity and state of a source or a reference instrument (components/equipment/IdentityFields.vue). */
export const EQUIPMENT_IDENTITY: FieldSpecs = {
  assetTag: 'Asset tag',
  kind: choice('Kind'),
  status: choice('Status'),
  maker: 'Maker',
  model: 'Model',
  serial: 'Serial number',
  notes: 'Notes',
}

/**
 * Rows of `[temperature, correction]` at `path`: the corrections a reference was found to need (true
 * value − value used, K), edited with components/quality/CorrectionRows.vue.
 */
export const correctionRowSpecs = (path: string, label: string): FieldSpecs => ({
  [path]: label,
  [`${path}[*]`]: 'Row {n}',
  [`${path}[*][0]`]: temperature('Temperature, row {n}'),
  [`${path}[*][1]`]: difference('Correction, row {n}'),
})
