/**
 * Fixed vocabularies of the registers (blackbody sources, reference instruments,
 * customers' instruments, uploads), with their labels for the UI. One list each,
 * used by the zod schemas, the models and the pages.
 */

export const SOURCE_KINDS = ['cavity', 'flat-plate'] as const
export type SourceKind = (typeof SOURCE_KINDS)[number]

/**
 * What the value a source's certificate states is — the basis of its reference temperature:
 * - `cavity-temperature`: the temperature of the cavity (its walls); the source emissivity ε_s and the
 *   surroundings' reflected radiation apply in the reading model;
 * - `surface-temperature`: the contact (surface) temperature of a plate; ε_s and the surroundings apply;
 * - `radiance-temperature`: the temperature of a blackbody with the same band radiance in a stated band,
 *   i.e. what an ideal instrument with emissivity setting 1 read on the source, with the surroundings at
 *   a stated temperature T_w0 at the time; it already holds the plate's emissivity and the reflection of
 *   those surroundings (domain notes §7).
 */
export const CERTIFIED_BASES = ['cavity-temperature', 'surface-temperature', 'radiance-temperature'] as const
export type CertifiedBasis = (typeof CERTIFIED_BASES)[number]
export const CERTIFIED_BASIS_LABELS: Record<CertifiedBasis, string> = {
  'cavity-temperature': 'Cavity temperature',
  'surface-temperature': 'Surface (contact) temperature',
  'radiance-temperature': 'Radiance temperature in a stated band (emissivity setting 1)',
}
/**
 * The basis a source has when none is stated (a create without `certifiedBasis`, and migration 0010 for
 * sources recorded before): its kind's own temperature, which is how the engine used the certified value
 * before the basis was recorded (as T_s in ε_s·S(T_s) + (1 − ε_s)·S(T_w)).
 */
export const DEFAULT_CERTIFIED_BASIS: Record<SourceKind, CertifiedBasis> = {
  'cavity': 'cavity-temperature',
  'flat-plate': 'surface-temperature',
}

/** Wavelengths of a band are stated in vacuum (default) or in air (then converted with n_air). */
export const WAVELENGTH_MEDIA = ['vacuum', 'air'] as const
export type WavelengthMediumName = (typeof WAVELENGTH_MEDIA)[number]
export const WAVELENGTH_MEDIUM_LABELS: Record<WavelengthMediumName, string> = { vacuum: 'in vacuum', air: 'in air' }

/** Status of the laboratory's own reference equipment (sources and reference instruments). */
export const EQUIPMENT_STATUSES = ['in-service', 'out-of-service', 'quarantined'] as const
export type EquipmentStatus = (typeof EQUIPMENT_STATUSES)[number]

export const REFERENCE_KINDS = ['contact-thermometer', 'transfer-radiation-thermometer', 'hygrometer', 'ambient-sensor'] as const
export type ReferenceKind = (typeof REFERENCE_KINDS)[number]

/** Units a reference instrument's range and uncertainty are stated in: kelvin, or percent relative humidity. */
export const RANGE_UNITS = ['K', '%RH'] as const
export type RangeUnit = (typeof RANGE_UNITS)[number]

export const EQUIPMENT_TYPES = ['source', 'reference'] as const
export type EquipmentType = (typeof EQUIPMENT_TYPES)[number]

export const INSTRUMENT_KINDS = ['spot-infrared', 'fixed-pyrometer', 'fibre-optic-pyrometer', 'ratio-pyrometer', 'thermal-imager'] as const
export type InstrumentKind = (typeof INSTRUMENT_KINDS)[number]

/**
 * What each kind of instrument is computed with (issue 16): a ratio (two-colour) pyrometer has two bands
 * and an emissivity-ratio ("slope") setting and is computed with the two-colour model
 * (shared/radiometry/ratio.ts); a thermal imager records readings in regions of interest (shared/calibration/imager.ts);
 * the spot and reference pyrometers may state a calibration equation through their as-left points
 * (shared/radiometry/calibrationEquation.ts). The others are single-band spot instruments.
 */
export const RATIO_KINDS: readonly InstrumentKind[] = ['ratio-pyrometer']
export const IMAGER_KINDS: readonly InstrumentKind[] = ['thermal-imager']
/** Kinds whose certificate may carry a calibration equation (a Sakuma–Hattori fit through the as-left points). */
export const EQUATION_KINDS: readonly InstrumentKind[] = ['spot-infrared', 'fixed-pyrometer', 'fibre-optic-pyrometer']
/** True for a ratio (two-colour) pyrometer. */
export const isRatioKind = (kind: string): boolean => (RATIO_KINDS as readonly string[]).includes(kind)
/** True for a thermal imager. */
export const isImagerKind = (kind: string): boolean => (IMAGER_KINDS as readonly string[]).includes(kind)

export const INSTRUMENT_STATUSES = ['active', 'out-of-service', 'retired'] as const
export type InstrumentStatus = (typeof INSTRUMENT_STATUSES)[number]

export const UPLOAD_PURPOSES = ['equipment-certificate', 'responsivity', 'instrument-photo'] as const
export type UploadPurpose = (typeof UPLOAD_PURPOSES)[number]

/** Content types the server recognizes by their bytes (never by the name or the client's claim). */
export const UPLOAD_TYPES = ['application/pdf', 'image/png', 'image/jpeg', 'text/csv'] as const
export type UploadType = (typeof UPLOAD_TYPES)[number]

/** Which detected content types each purpose accepts. */
export const UPLOAD_TYPES_BY_PURPOSE: Record<UploadPurpose, readonly UploadType[]> = {
  'equipment-certificate': ['application/pdf', 'image/png', 'image/jpeg'],
  'responsivity': ['text/csv'],
  'instrument-photo': ['image/png', 'image/jpeg'],
}

/** Columns a list may be sorted by (whitelists: anything else is a 400). */
export const SOURCE_SORTS = ['assetTag', 'kind', 'maker', 'model', 'serial', 'status', 'minTemperatureK', 'maxTemperatureK', 'emissivity', 'dueDate', 'updatedAt'] as const
export const REFERENCE_SORTS = ['assetTag', 'kind', 'maker', 'model', 'serial', 'status', 'rangeMin', 'rangeMax', 'dueDate', 'updatedAt'] as const
export const INSTRUMENT_SORTS = ['serial', 'assetTag', 'maker', 'model', 'kind', 'status', 'nextDueDate', 'rangeMinK', 'rangeMaxK', 'createdAt', 'updatedAt'] as const
export const CUSTOMER_SORTS = ['name', 'city', 'country', 'createdAt', 'updatedAt'] as const

export const SOURCE_KIND_LABELS: Record<SourceKind, string> = { 'cavity': 'Cavity', 'flat-plate': 'Flat plate' }
export const EQUIPMENT_STATUS_LABELS: Record<EquipmentStatus, string> = {
  'in-service': 'In service',
  'out-of-service': 'Out of service',
  'quarantined': 'Quarantined',
}
export const REFERENCE_KIND_LABELS: Record<ReferenceKind, string> = {
  'contact-thermometer': 'Contact thermometer',
  'transfer-radiation-thermometer': 'Transfer radiation thermometer',
  'hygrometer': 'Hygrometer',
  'ambient-sensor': 'Ambient sensor',
}
export const INSTRUMENT_KIND_LABELS: Record<InstrumentKind, string> = {
  'spot-infrared': 'Spot infrared thermometer',
  'fixed-pyrometer': 'Fixed pyrometer',
  'fibre-optic-pyrometer': 'Fibre-optic pyrometer',
  'ratio-pyrometer': 'Ratio pyrometer',
  'thermal-imager': 'Thermal imager',
}
export const INSTRUMENT_STATUS_LABELS: Record<InstrumentStatus, string> = {
  'active': 'Active',
  'out-of-service': 'Out of service',
  'retired': 'Retired',
}
export const UPLOAD_PURPOSE_LABELS: Record<UploadPurpose, string> = {
  'equipment-certificate': 'Certificate of reference equipment',
  'responsivity': 'Spectral responsivity table',
  'instrument-photo': 'Photo of an instrument label',
}
