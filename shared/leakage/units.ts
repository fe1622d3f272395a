/**
 * Unit conversions and physical constants used by the leakage engine.
 *
 * Length, area and volume factors are exact by definition of the international foot
 * (NIST SP 811, appendix B); see also CHECKS.md §1.
 */

/** Unit system of a request: `ip` = ft, ft², ft³, cfm, °F; `si` = m, m², m³, m³/h, °C. */
export type UnitSystem = 'ip' | 'si'

/** 1 ft in m (exact; NIST SP 811). */
export const M_PER_FT = 0.3048
/** 1 ft² in m² (exact; NIST SP 811). */
export const M2_PER_FT2 = 0.09290304
/** 1 ft³ in m³ (exact; NIST SP 811). */
export const M3_PER_FT3 = 0.028316846592
/** 1 in² in m² (exact; 0.0254² — NIST SP 811). */
export const M2_PER_IN2 = 0.00064516
/** 1 in² in cm² (exact). */
export const CM2_PER_IN2 = 6.4516
/** 1 cfm in m³/h: ft³ → m³ times 60 min/h (exact, 1.69901079552; CHECKS.md §1 gives 1.6990108). */
export const M3H_PER_CFM = M3_PER_FT3 * 60
/** 1 cfm in m³/s: ft³ → m³ over 60 s/min (exact, 4.7194744…×10⁻⁴; CHECKS.md §1). */
export const M3S_PER_CFM = M3_PER_FT3 / 60
/** 1 cfm/ft² in m³/(h·m²): 60·0.3048 (exact, 18.288; CHECKS.md §1). */
export const M3HM2_PER_CFMFT2 = 60 * M_PER_FT

/** Reference pressure difference of an air-leakage test, Pa (common practice: 50 Pa ≈ 0.2 in. w.c.; CHECKS.md §7). */
export const REFERENCE_PRESSURE_PA = 50
/**
 * Air density used for leakage areas, kg/m³: dry air at 20 °C and 101.325 kPa
 * (CHECKS.md §4, as used with the ASHRAE Handbook—Fundamentals leakage-area formula).
 */
export const AIR_DENSITY_KG_M3 = 1.2041
/** 0 °C in kelvin (exact, SI definition). */
export const KELVIN_OFFSET = 273.15

/** °F → °C: (°F − 32)/1.8 (CHECKS.md §1; NIST SP 811). */
export function fahrenheitToCelsius(f: number): number {
  return (f - 32) / 1.8
}

/** °C → °F: °C·1.8 + 32 (inverse of CHECKS.md §1). */
export function celsiusToFahrenheit(c: number): number {
  return c * 1.8 + 32
}

/** A temperature in the request's unit (°F for `ip`, °C for `si`) → kelvin (K = °C + 273.15; CHECKS.md §1). */
export function toKelvin(temperature: number, units: UnitSystem): number {
  const celsius = units === 'ip' ? fahrenheitToCelsius(temperature) : temperature
  return celsius + KELVIN_OFFSET
}

/** Flow in the request's unit (cfm or m³/h) → cfm (CHECKS.md §1). */
export function flowToCfm(flow: number, units: UnitSystem): number {
  return units === 'ip' ? flow : flow / M3H_PER_CFM
}

/** cfm → flow in the request's unit (cfm or m³/h) (CHECKS.md §1). */
export function cfmToFlow(cfm: number, units: UnitSystem): number {
  return units === 'ip' ? cfm : cfm * M3H_PER_CFM
}

/** Volume in the request's unit (ft³ or m³) → ft³ (NIST SP 811, exact). */
export function volumeToFt3(volume: number, units: UnitSystem): number {
  return units === 'ip' ? volume : volume / M3_PER_FT3
}

/** Area in the request's unit (ft² or m²) → ft² (NIST SP 811, exact). */
export function areaToFt2(area: number, units: UnitSystem): number {
  return units === 'ip' ? area : area / M2_PER_FT2
}

/** Length in the request's unit (ft or m) → m (NIST SP 811, exact). */
export function lengthToM(length: number, units: UnitSystem): number {
  return units === 'ip' ? length * M_PER_FT : length
}
