import { defineStore } from 'pinia'

import { TEMPERATURE_UNITS, type TemperatureUnit } from '#shared/units'

/**
 * Per-browser display preferences (values are always stored in SI on the server). The temperature
 * unit lives in a cookie, so it survives a reload and the server renders pages in it too.
 */
export const usePreferencesStore = defineStore('preferences', () => {
  const cookie = useCookie<string | null>('bandlight-unit', { maxAge: 60 * 60 * 24 * 400, sameSite: 'lax', path: '/' })
  const temperatureUnit = computed<TemperatureUnit>(() => (TEMPERATURE_UNITS.includes(cookie.value as TemperatureUnit) ? (cookie.value as TemperatureUnit) : 'C'))
  function setTemperatureUnit(u: TemperatureUnit) {
    cookie.value = u
  }
  return { temperatureUnit, setTemperatureUnit }
})
