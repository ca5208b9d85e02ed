import { storeToRefs } from 'pinia'
import { typographicMinus } from '#shared/format'
import { deltaFromKelvin, fromKelvin, UNIT_SYMBOL } from '#shared/units'

/**
 * Temperatures and differences stored in kelvin, written in the unit the user works in: `t(373.15)`
 * → "100.00 °C", `d(-0.123)` → "−0.123 K" (or °F), with a typographic minus; '—' for none.
 * `tv` and `dv` give the number alone; `sym` and `dSym` are the units for table headings ("Nominal / °C", "Deviation / K").
 */
export function useTemperatureText() {
  const { temperatureUnit: unit } = storeToRefs(usePreferencesStore())
  const sym = computed(() => UNIT_SYMBOL[unit.value])
  const dSym = computed(() => (unit.value === 'F' ? '°F' : 'K'))
  /** A temperature, K → the user's unit, with its symbol. */
  const t = (k: number | null | undefined, decimals = 2) => (k === null || k === undefined ? '—' : typographicMinus(`${fromKelvin(k, unit.value).toFixed(decimals)} ${sym.value}`))
  /** A difference, K → K (or °F), with its symbol; `signed` writes "+" before positive values. */
  const d = (k: number | null | undefined, decimals = 3, signed = false) => {
    if (k === null || k === undefined) return '—'
    const v = deltaFromKelvin(k, unit.value)
    return typographicMinus(`${signed && v > 0 ? '+' : ''}${v.toFixed(decimals)} ${dSym.value}`)
  }
  /** The number of `t` alone, for a column headed with its unit. */
  const tv = (k: number | null | undefined, decimals = 2) => (k === null || k === undefined ? '—' : typographicMinus(fromKelvin(k, unit.value).toFixed(decimals)))
  /** The number of `d` alone, for a column headed with its unit. */
  const dv = (k: number | null | undefined, decimals = 3, signed = false) => {
    if (k === null || k === undefined) return '—'
    const v = deltaFromKelvin(k, unit.value)
    return typographicMinus(`${signed && v > 0 ? '+' : ''}${v.toFixed(decimals)}`)
  }
  /** A plain number (E_n, z) with a typographic minus. */
  const n = (v: number | null | undefined, decimals = 2) => (v === null || v === undefined ? '—' : typographicMinus(v.toFixed(decimals)))
  return { unit, sym, dSym, t, d, tv, dv, n }
}
