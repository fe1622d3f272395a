import { defineStore } from 'pinia'
import type { UnitSystem } from '#shared/leakage'

/** Client UI preferences. The unit system is kept in a cookie so server and client render alike. */
export const usePreferences = defineStore('preferences', () => {
  const unitCookie = useCookie<UnitSystem>('tw-units', { default: () => 'ip', maxAge: 60 * 60 * 24 * 365, sameSite: 'lax' })
  const units = computed<UnitSystem>({
    get: () => (unitCookie.value === 'si' ? 'si' : 'ip'),
    set: (value) => { unitCookie.value = value },
  })
  return { units }
})
