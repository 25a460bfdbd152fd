import { EngineError } from "./errors";

/** Sea-level ISA constants (ICAO Doc 7488/3; U.S. Standard Atmosphere 1976). */
export const ISA = {
  T0: 288.15,
  p0: 101325,
  rho0: 1.225,
  g0: 9.80665,
  /** Specific gas constant of dry air, J/(kg·K) (ICAO value). */
  R: 287.05287,
  gamma: 1.4,
  /** Earth radius used for geopotential height, m. */
  r0: 6356766,
} as const;

/** Geopotential altitude range the engine supports, m. */
export const ISA_MIN_ALTITUDE = 0;
export const ISA_MAX_ALTITUDE = 32000;

/** Layer bases: geopotential altitude (m), base temperature (K), lapse rate (K/m). */
const LAYERS = [
  { h: 0, T: 288.15, L: -0.0065 },
  { h: 11000, T: 216.65, L: 0 },
  { h: 20000, T: 216.65, L: 0.001 },
] as const;

/** Base pressures of each layer, derived once from p0 by the hydrostatic equation. */
const LAYER_P: number[] = (() => {
  const p: number[] = [ISA.p0];
  for (let i = 1; i < LAYERS.length; i++) {
    const b = LAYERS[i - 1];
    p.push(layerPressure(p[i - 1], b.T, b.L, LAYERS[i].h - b.h));
  }
  return p;
})();

function layerPressure(pBase: number, TBase: number, lapse: number, dh: number): number {
  if (lapse === 0) return pBase * Math.exp((-ISA.g0 * dh) / (ISA.R * TBase));
  return pBase * Math.pow((TBase + lapse * dh) / TBase, -ISA.g0 / (ISA.R * lapse));
}

/** State of the standard atmosphere at one altitude. */
export interface AtmosphereState {
  /** Geopotential altitude, m. */
  altitude: number;
  /** Temperature, K. */
  temperature: number;
  /** Static pressure, Pa. */
  pressure: number;
  /** Density, kg/m³. */
  density: number;
  /** Speed of sound, m/s. */
  speedOfSound: number;
  /** Density ratio ρ/ρ0. */
  sigma: number;
}

/**
 * ISA at a geopotential altitude (m), 0–32 000 m: troposphere, isothermal layer, first stratospheric layer.
 * @throws EngineError altitude-out-of-range outside that range.
 */
export function isa(altitude: number, field = "altitude"): AtmosphereState {
  if (!Number.isFinite(altitude) || altitude < ISA_MIN_ALTITUDE || altitude > ISA_MAX_ALTITUDE) {
    throw new EngineError(
      "altitude-out-of-range",
      `must be between ${ISA_MIN_ALTITUDE} and ${ISA_MAX_ALTITUDE} m geopotential (standard atmosphere range)`,
      field,
    );
  }
  let i = LAYERS.length - 1;
  while (i > 0 && altitude < LAYERS[i].h) i--;
  const b = LAYERS[i];
  const dh = altitude - b.h;
  const temperature = b.T + b.L * dh;
  const pressure = layerPressure(LAYER_P[i], b.T, b.L, dh);
  const density = pressure / (ISA.R * temperature);
  return {
    altitude,
    temperature,
    pressure,
    density,
    speedOfSound: Math.sqrt(ISA.gamma * ISA.R * temperature),
    sigma: density / ISA.rho0,
  };
}

/** Geopotential altitude (m) from geometric altitude (m): H = r0·Z/(r0 + Z). */
export function geopotentialFromGeometric(z: number): number {
  return (ISA.r0 * z) / (ISA.r0 + z);
}

/** Geometric altitude (m) from geopotential altitude (m). */
export function geometricFromGeopotential(h: number): number {
  return (ISA.r0 * h) / (ISA.r0 - h);
}

/** Dynamic pressure q = ½ρV² = (γ/2)·p·M² (Pa) at a Mach number and geopotential altitude (m). */
export function dynamicPressure(mach: number, altitude: number): number {
  return 0.5 * ISA.gamma * isa(altitude).pressure * mach * mach;
}

/** True airspeed (m/s) from Mach number. */
export function tasFromMach(mach: number, altitude: number): number {
  return mach * isa(altitude).speedOfSound;
}

/** Mach number from true airspeed (m/s). */
export function machFromTas(tas: number, altitude: number): number {
  return tas / isa(altitude).speedOfSound;
}

/** Equivalent airspeed (m/s) from true airspeed: EAS = TAS·√σ. */
export function easFromTas(tas: number, altitude: number): number {
  return tas * Math.sqrt(isa(altitude).sigma);
}

/** True airspeed (m/s) from equivalent airspeed. */
export function tasFromEas(eas: number, altitude: number): number {
  return eas / Math.sqrt(isa(altitude).sigma);
}

/** Equivalent airspeed (m/s) from Mach number. */
export function easFromMach(mach: number, altitude: number): number {
  return easFromTas(tasFromMach(mach, altitude), altitude);
}

/** Mach number from equivalent airspeed (m/s). */
export function machFromEas(eas: number, altitude: number): number {
  return machFromTas(tasFromEas(eas, altitude), altitude);
}

/** Subsonic impact pressure q_c = p[(1 + 0.2M²)^3.5 − 1] (Pa). */
export function impactPressure(mach: number, altitude: number): number {
  return isa(altitude).pressure * (Math.pow(1 + 0.2 * mach * mach, 3.5) - 1);
}

/** Calibrated airspeed (m/s) from Mach number, subsonic pitot relation referred to sea level. */
export function casFromMach(mach: number, altitude: number): number {
  const qc = impactPressure(mach, altitude);
  const a0 = isa(0).speedOfSound;
  return a0 * Math.sqrt(5 * (Math.pow(qc / ISA.p0 + 1, 2 / 7) - 1));
}
