// The International Standard Atmosphere (ICAO Doc 7488/3, identical to ISO 2533:1975 up to 32 km) for the
// troposphere, and air density from the day's pressure and temperature by the ideal gas law. Dry air.

/** ISA sea-level temperature, K. */
export const T0 = 288.15
/** ISA sea-level pressure, Pa. */
export const P0 = 101_325
/** Temperature lapse rate in the troposphere, K/m. */
export const LAPSE = 0.0065
/** Standard gravity, m/s² (the value defining the ISA, and used for weight). */
export const G0 = 9.80665
/** Specific gas constant of dry air, J/(kg·K), as ISO 2533 gives it. */
export const R_AIR = 287.05287

/** The standard atmosphere at a geopotential altitude (m, up to the tropopause at 11 000 m). */
export function standardAtmosphere(altitudeM: number) {
  if (altitudeM < -5000 || altitudeM > 11_000) throw new RangeError('the planner\'s atmosphere covers -5000 to 11000 m')
  const temperatureK = T0 - LAPSE * altitudeM
  const pressurePa = P0 * (temperatureK / T0) ** (G0 / (R_AIR * LAPSE))
  return { temperatureK, pressurePa, density: pressurePa / (R_AIR * temperatureK) }
}

/** Density of dry air, kg/m³, from the station pressure (hPa) and the air temperature (°C): ρ = p / (R·T). */
export const airDensity = (pressureHpa: number, temperatureC: number) =>
  (pressureHpa * 100) / (R_AIR * (temperatureC + 273.15))
