/**
 * Spectral bands common in radiation thermometry (common practice; see the domain primer §5).
 * The narrow bands are given as a plausible rectangular width around the nominal wavelength;
 * a real instrument's band comes from its maker or a measured responsivity.
 */
export interface BandPreset {
  id: string
  label: string
  lambda1Um: number
  lambda2Um: number
  use: string
}

export const BAND_PRESETS: readonly BandPreset[] = [
  { id: 'lwir', label: '8–14 µm', lambda1Um: 8, lambda2Um: 14, use: 'thermopile, low temperatures, non-metals' },
  { id: 'flame', label: '3.9 µm', lambda1Um: 3.8, lambda2Um: 4.0, use: 'through flames and combustion gases' },
  { id: 'glass', label: '4.8–5.2 µm', lambda1Um: 4.8, lambda2Um: 5.2, use: 'glass surfaces' },
  { id: 'swir22', label: '2.2 µm', lambda1Um: 2.0, lambda2Um: 2.4, use: 'metals, medium temperatures' },
  { id: 'swir16', label: '1.6 µm', lambda1Um: 1.5, lambda2Um: 1.7, use: 'metals' },
  { id: 'nir10', label: '1.0 µm', lambda1Um: 0.95, lambda2Um: 1.05, use: 'metals, high temperatures' },
  { id: 'nir09', label: '0.9 µm', lambda1Um: 0.85, lambda2Um: 0.95, use: 'metals, high temperatures' },
  { id: 'vis065', label: '0.65 µm', lambda1Um: 0.64, lambda2Um: 0.66, use: 'visible, very high temperatures' },
]
