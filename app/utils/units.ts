import type { UnitSystem } from '#shared/leakage'

/** Unit labels of the form fields in each unit system. */
export function unitLabels(units: UnitSystem) {
  return units === 'ip'
    ? { volume: 'ft³', area: 'ft²', length: 'ft', flow: 'cfm', temperature: '°F' }
    : { volume: 'm³', area: 'm²', length: 'm', flow: 'm³/h', temperature: '°C' }
}
