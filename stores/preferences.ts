import { defineStore } from 'pinia'

import type { TemperatureUnit } from '~~/shared/units'

/** Per-browser display preferences (values are always stored in SI on the server). */
export const usePreferencesStore = defineStore('preferences', () => {
  const temperatureUnit = ref<TemperatureUnit>('C')
  function setTemperatureUnit(u: TemperatureUnit) {
    temperatureUnit.value = u
  }
  return { temperatureUnit, setTemperatureUnit }
})
