import { DomainInputError } from "./errors";
import { requireFinite, requireInRange, requirePositive } from "./input-guards";

// U.S. Standard Atmosphere 1976, troposphere (the same as ICAO and ISO 2533 below 11 km).
// The laws are written in geopotential height H; an event's elevation is geometric height Z
// above sea level, converted with the 1976 standard's effective Earth radius.

export const SEA_LEVEL_PRESSURE_PA = 101325;
export const SEA_LEVEL_TEMPERATURE_K = 288.15;
export const LAPSE_RATE_K_PER_M = 0.0065;
export const STANDARD_GRAVITY_M_S2 = 9.80665;
export const AIR_MOLAR_MASS_KG_PER_MOL = 0.0289644;
export const GAS_CONSTANT_J_PER_MOL_K = 8.31432;
export const EARTH_RADIUS_M = 6356766;
export const KELVIN_OFFSET = 273.15;

/** g0·M / (R*·L) = 5.255876…, computed rather than rounded. */
export const PRESSURE_EXPONENT =
  (STANDARD_GRAVITY_M_S2 * AIR_MOLAR_MASS_KG_PER_MOL) / (GAS_CONSTANT_J_PER_MOL_K * LAPSE_RATE_K_PER_M);

export const MIN_ELEVATION_M = -500;
export const MAX_ELEVATION_M = 9000;
/** Ground air temperatures the fuel check accepts (the recorded extremes sit inside). */
export const MIN_AIR_TEMP_C = -90;
export const MAX_AIR_TEMP_C = 60;

export interface StandardAtmosphere {
  pressureKpa: number;
  temperatureC: number;
  densityKgM3: number;
  /** Pressure over the sea-level standard pressure. */
  pressureRatio: number;
  geopotentialM: number;
}

export function geopotentialFromGeometricM(elevationM: number): number {
  const z = requireFinite("elevationM", elevationM);
  return (EARTH_RADIUS_M * z) / (EARTH_RADIUS_M + z);
}

export function geometricFromGeopotentialM(geopotentialM: number): number {
  const h = requireFinite("geopotentialM", geopotentialM);
  if (Math.abs(h) >= EARTH_RADIUS_M / 2) throw new DomainInputError("geopotentialM", "geopotentialM is out of range");
  return (EARTH_RADIUS_M * h) / (EARTH_RADIUS_M - h);
}

/** Dry air, ideal gas: ρ = p·M / (R*·T). */
export function computeAirDensityKgM3(pressureKpa: number, temperatureC: number): number {
  requirePositive("pressureKpa", pressureKpa);
  const temperatureK = requireFinite("temperatureC", temperatureC) + KELVIN_OFFSET;
  if (!(temperatureK > 0)) throw new DomainInputError("temperatureC", "temperatureC must be above absolute zero");
  return (pressureKpa * 1000 * AIR_MOLAR_MASS_KG_PER_MOL) / (GAS_CONSTANT_J_PER_MOL_K * temperatureK);
}

// Valid for any height whose standard temperature is above absolute zero (H < 44 km): density
// altitudes above 11 km use the tropospheric law extended, as density-altitude practice does.
function computeLayerState(geopotentialM: number): StandardAtmosphere {
  const temperatureK = SEA_LEVEL_TEMPERATURE_K - LAPSE_RATE_K_PER_M * geopotentialM;
  const pressureRatio = (temperatureK / SEA_LEVEL_TEMPERATURE_K) ** PRESSURE_EXPONENT;
  const pressureKpa = (SEA_LEVEL_PRESSURE_PA * pressureRatio) / 1000;
  const temperatureC = temperatureK - KELVIN_OFFSET;
  return {
    pressureKpa,
    temperatureC,
    densityKgM3: computeAirDensityKgM3(pressureKpa, temperatureC),
    pressureRatio,
    geopotentialM,
  };
}

/** Standard atmosphere at a geopotential height of −500…11 000 m. */
export function standardAtmosphereAtGeopotential(geopotentialM: number): StandardAtmosphere {
  return computeLayerState(requireInRange("geopotentialM", geopotentialM, -500, 11000));
}

/** Standard atmosphere at a geometric elevation above sea level, −500…9000 m. */
export function standardAtmosphere(elevationM: number): StandardAtmosphere {
  const z = requireInRange("elevationM", elevationM, MIN_ELEVATION_M, MAX_ELEVATION_M);
  return computeLayerState(geopotentialFromGeometricM(z));
}

export interface DensityAltitude {
  /** Geometric height at which the standard atmosphere is as dense as this air, m. */
  densityAltitudeM: number;
  densityKgM3: number;
  /** Standard pressure at the density altitude: the pressure a standard-day charge of the same density would have. */
  equivalentPressureKpa: number;
}

/**
 * Density altitude for dry air at the standard pressure of `elevationM` and the measured air
 * temperature. Solved in closed form: the standard density is ρ0·(T/T0)^(exponent − 1).
 */
export function computeDensityAltitude(elevationM: number, airTempC: number): DensityAltitude {
  const here = standardAtmosphere(elevationM);
  const tempC = requireInRange("airTempC", airTempC, MIN_AIR_TEMP_C, MAX_AIR_TEMP_C);
  const densityKgM3 = computeAirDensityKgM3(here.pressureKpa, tempC);
  const seaLevelDensity = computeAirDensityKgM3(SEA_LEVEL_PRESSURE_PA / 1000, SEA_LEVEL_TEMPERATURE_K - KELVIN_OFFSET);
  const temperatureShare = (densityKgM3 / seaLevelDensity) ** (1 / (PRESSURE_EXPONENT - 1));
  const geopotentialM = (SEA_LEVEL_TEMPERATURE_K * (1 - temperatureShare)) / LAPSE_RATE_K_PER_M;
  return {
    densityAltitudeM: geometricFromGeopotentialM(geopotentialM),
    densityKgM3,
    equivalentPressureKpa: computeLayerState(geopotentialM).pressureKpa,
  };
}

export function densityAltitudeM(elevationM: number, airTempC: number): number {
  return computeDensityAltitude(elevationM, airTempC).densityAltitudeM;
}
