import { defineStore } from 'pinia'

export type TemperatureUnit = 'C' | 'K' | 'F'

/** Per-browser display preferences (values are always stored in SI on the server). */
export const usePreferencesStore = defineStore('preferences', () => {
  const temperatureUnit = ref<TemperatureUnit>('C')
  function setTemperatureUnit(u: TemperatureUnit) {
    temperatureUnit.value = u
  }
  return { temperatureUnit, setTemperatureUnit }
})
