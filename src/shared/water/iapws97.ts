/**
 * Liquid water properties from IAPWS-IF97: the Revised Release on the IAPWS Industrial
 * Formulation 1997 for the Thermodynamic Properties of Water and Steam (IAPWS, 2007).
 *
 * Implemented: the region 1 basic equation (compressed liquid, Eq. 7 and Table 3 of the
 * release) and the region 4 saturation-pressure equation with its backward equation
 * (Eqs. 30 and 31, Table 34). Nothing is extrapolated: a state outside region 1 is an
 * InputError that says which side of the region it lies on.
 *
 * SI at the boundary (K, Pa, J/kg, ...); the release's own units (MPa, kJ/kg) appear only
 * inside, where its reducing constants are defined in them.
 */
import { InputError, requireFinite, requirePositive } from '../errors.js';

export interface LiquidWaterProperties {
  temperatureK: number;
  pressurePa: number;
  densityKgPerM3: number;
  specificVolumeM3PerKg: number;
  specificEnthalpyJPerKg: number;
  specificInternalEnergyJPerKg: number;
  specificEntropyJPerKgK: number;
  /** Isobaric specific heat capacity cp. */
  specificHeatJPerKgK: number;
  speedOfSoundMPerS: number;
  /** Saturation pressure ps(T) from region 4, the lower pressure bound of region 1 at this T. */
  saturationPressurePa: number;
}

/** Range of region 1 in IAPWS-IF97 (2007): 273.15 K ≤ T ≤ 623.15 K, ps(T) ≤ p ≤ 100 MPa. */
export const REGION1_LIMITS = { minTemperatureK: 273.15, maxTemperatureK: 623.15, maxPressurePa: 100e6 } as const;

/** Specific gas constant of water, IAPWS-IF97 (2007) Eq. 1, in J/(kg·K). */
const R_J_PER_KG_K = 461.526;

/** Region 1 reducing constants, IAPWS-IF97 (2007) Eq. 7. */
const P_STAR_PA = 16.53e6;
const T_STAR_K = 1386;

/** Region 1 coefficients I_i, J_i, n_i, IAPWS-IF97 (2007) Table 2. */
const I1 = [0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 2, 2, 2, 2, 2, 3, 3, 3, 4, 4, 4, 5, 8, 8, 21, 23, 29, 30, 31, 32];
const J1 = [-2, -1, 0, 1, 2, 3, 4, 5, -9, -7, -1, 0, 1, 3, -3, 0, 1, 3, 17, -4, 0, 6, -5, -2, 10, -8, -11, -6, -29, -31, -38, -39, -40, -41];
const N1 = [
  0.14632971213167, -0.84548187169114, -0.3756360367204e1, 0.33855169168385e1, -0.95791963387872,
  0.15772038513228, -0.16616417199501e-1, 0.81214629983568e-3, 0.28319080123804e-3, -0.60706301565874e-3,
  -0.18990068218419e-1, -0.32529748770505e-1, -0.21841717175414e-1, -0.5283835796993e-4, -0.47184321073267e-3,
  -0.30001780793026e-3, 0.47661393906987e-4, -0.44141845330846e-5, -0.72694996297594e-15, -0.31679644845054e-4,
  -0.28270797985312e-5, -0.85205128120103e-9, -0.22425281908e-5, -0.65171222895601e-6, -0.14341729937924e-12,
  -0.40516996860117e-6, -0.12734301741641e-8, -0.17424871230634e-9, -0.68762131295531e-18, 0.14478307828521e-19,
  0.26335781662795e-22, -0.11947622640071e-22, 0.18228094581404e-23, -0.93537087292458e-25,
];

/** Region 4 coefficients n1..n10, IAPWS-IF97 (2007) Table 34 (index 0 unused to keep the release's numbering). */
const N4 = [
  0, 0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2, 0.12020824702470e5, -0.32325550322333e7,
  0.1491510861353e2, -0.48232657361591e4, 0.40511340542057e6, -0.23855557567849, 0.65017534844798e3,
];

const CRITICAL_TEMPERATURE_K = 647.096;
const CRITICAL_PRESSURE_PA = 22.064e6;

/**
 * Lower bound of the backward equation Ts(p). The release states 611.213 Pa, which is
 * ps(273.15 K) rounded to six digits; the unrounded value is used so that
 * saturationTemperatureK(saturationPressurePa(273.15)) works.
 */
const MIN_SATURATION_PRESSURE_PA = saturationPressureUnchecked(REGION1_LIMITS.minTemperatureK);

/**
 * Relative slack allowed at the edges of region 1 so that a state exactly on a boundary
 * counts as inside: p = saturationPressurePa(T), or T = saturationTemperatureK(p), which
 * can land 1e-12 K past 623.15 K. Eqs. 30 and 31 are exact inverses, so such round trips
 * agree to about 1e-14, far inside this; nothing measurably beyond a boundary is accepted.
 */
const BOUNDARY_RELATIVE_TOLERANCE = 1e-9;

/** Saturation pressure ps(T) in Pa, IAPWS-IF97 (2007) Eq. 30; valid 273.15 K ≤ T ≤ 647.096 K. */
export function saturationPressurePa(temperatureK: number): number {
  const t = requireFinite(temperatureK, 'temperature');
  if (t < REGION1_LIMITS.minTemperatureK || t > CRITICAL_TEMPERATURE_K) {
    throw new InputError(
      `the saturation-pressure equation of IAPWS-IF97 holds from 273.15 K to 647.096 K (0 °C to the critical point, 373.946 °C); got ${formatKelvin(t)}`,
      { field: 'temperature' },
    );
  }
  return saturationPressureUnchecked(t);
}

/** Saturation temperature Ts(p) in K, IAPWS-IF97 (2007) Eq. 31; valid 611.213 Pa ≤ p ≤ 22.064 MPa. */
export function saturationTemperatureK(pressurePa: number): number {
  const p = requireFinite(pressurePa, 'pressure');
  if (p < MIN_SATURATION_PRESSURE_PA || p > CRITICAL_PRESSURE_PA) {
    throw new InputError(
      `the saturation-temperature equation of IAPWS-IF97 holds from 611.213 Pa to 22.064 MPa (the critical pressure); got ${formatPascal(p)}`,
      { field: 'pressure' },
    );
  }
  const beta = Math.pow(p / 1e6, 0.25);
  const e = beta * beta + N4[3] * beta + N4[6];
  const f = N4[1] * beta * beta + N4[4] * beta + N4[7];
  const g = N4[2] * beta * beta + N4[5] * beta + N4[8];
  const d = (2 * g) / (-f - Math.sqrt(f * f - 4 * e * g));
  return (N4[10] + d - Math.sqrt((N4[10] + d) * (N4[10] + d) - 4 * (N4[9] + N4[10] * d))) / 2;
}

/**
 * Properties of compressed liquid water at (T, p) from the region 1 basic equation,
 * IAPWS-IF97 (2007) Eq. 7 and the relations of its Table 3.
 */
export function liquidWater(temperatureK: number, pressurePa: number): LiquidWaterProperties {
  const t = requireFinite(temperatureK, 'temperature');
  const p = requirePositive(pressurePa, 'pressure');
  const ps = checkRegion1(t, p);

  const pi = p / P_STAR_PA;
  const tau = T_STAR_K / t;
  const g = gibbsRegion1(pi, tau);
  const rt = R_J_PER_KG_K * t;

  const specificVolume = (pi * g.gPi * rt) / p;
  const tauGTau = tau * g.gTau;
  const piGPi = pi * g.gPi;
  const cp = -R_J_PER_KG_K * tau * tau * g.gTauTau;
  const w2 = (rt * g.gPi * g.gPi) / (((g.gPi - tau * g.gPiTau) ** 2) / (tau * tau * g.gTauTau) - g.gPiPi);

  return {
    temperatureK: t,
    pressurePa: p,
    densityKgPerM3: 1 / specificVolume,
    specificVolumeM3PerKg: specificVolume,
    specificEnthalpyJPerKg: rt * tauGTau,
    specificInternalEnergyJPerKg: rt * (tauGTau - piGPi),
    specificEntropyJPerKgK: R_J_PER_KG_K * (tauGTau - g.g),
    specificHeatJPerKgK: cp,
    speedOfSoundMPerS: Math.sqrt(w2),
    saturationPressurePa: ps,
  };
}

/** The validity of region 1 at (T, p), as an InputError naming the field; returns ps(T). */
function checkRegion1(t: number, p: number): number {
  if (t < REGION1_LIMITS.minTemperatureK * (1 - BOUNDARY_RELATIVE_TOLERANCE)) {
    throw new InputError(
      `water at ${formatCelsius(t)} (${formatKelvin(t)}) is below 0 °C (273.15 K), outside IAPWS-IF97 region 1`,
      { field: 'temperature' },
    );
  }
  if (t > REGION1_LIMITS.maxTemperatureK * (1 + BOUNDARY_RELATIVE_TOLERANCE)) {
    throw new InputError(
      `water at ${formatCelsius(t)} (${formatKelvin(t)}) is above 350 °C (623.15 K), outside IAPWS-IF97 region 1 (the near-critical region 3 is not implemented)`,
      { field: 'temperature' },
    );
  }
  if (p > REGION1_LIMITS.maxPressurePa) {
    throw new InputError(
      `pressure ${formatPascal(p)} is above 100 MPa, outside IAPWS-IF97 region 1`,
      { field: 'pressure' },
    );
  }
  const ps = saturationPressureUnchecked(t);
  if (p < ps * (1 - BOUNDARY_RELATIVE_TOLERANCE)) {
    throw new InputError(
      `water at ${formatCelsius(t)} and ${formatPascal(p)} is steam, not liquid (saturation pressure ${formatPascal(ps)}); IAPWS-IF97 region 1 needs p ≥ ps(T)`,
      { field: 'pressure' },
    );
  }
  return ps;
}

/**
 * Density alone, for converting logged volume flows row by row: the same region 1 equation and validity
 * checks as liquidWater, but only ∂γ/∂π, with the powers built by multiplication (about 20 times faster).
 */
export function liquidDensityKgPerM3(temperatureK: number, pressurePa: number): number {
  const t = requireFinite(temperatureK, 'temperature');
  const p = requirePositive(pressurePa, 'pressure');
  checkRegion1(t, p);
  const pi = p / P_STAR_PA;
  const a = 7.1 - pi;
  const b = T_STAR_K / t - 1.222;
  // a^(i−1) for i = 1..32 and b^j for j = −41..17 (Table 2's exponent ranges).
  const aPow = new Float64Array(32);
  aPow[0] = 1;
  for (let k = 1; k < 32; k++) aPow[k] = aPow[k - 1] * a;
  const bPow = new Float64Array(59);
  bPow[41] = 1;
  for (let k = 1; k <= 17; k++) bPow[41 + k] = bPow[40 + k] * b;
  const inverse = 1 / b;
  for (let k = 1; k <= 41; k++) bPow[41 - k] = bPow[42 - k] * inverse;
  let gPi = 0;
  for (let k = 8; k < N1.length; k++) gPi -= N1[k] * I1[k] * aPow[I1[k] - 1] * bPow[J1[k] + 41];
  return p / (pi * gPi * R_J_PER_KG_K * t);
}

interface GibbsDerivatives {
  g: number;
  gPi: number;
  gPiPi: number;
  gTau: number;
  gTauTau: number;
  gPiTau: number;
}

/** Dimensionless Gibbs free energy γ(π, τ) of region 1 and its derivatives, IAPWS-IF97 (2007) Table 4. */
function gibbsRegion1(pi: number, tau: number): GibbsDerivatives {
  // Within region 1, 7.1 − π ≥ 7.1 − 100/16.53 > 1 and τ − 1.222 ≥ 1386/623.15 − 1.222 > 1,
  // so the negative powers below are all finite.
  const a = 7.1 - pi;
  const b = tau - 1.222;
  let g = 0;
  let gPi = 0;
  let gPiPi = 0;
  let gTau = 0;
  let gTauTau = 0;
  let gPiTau = 0;
  for (let k = 0; k < N1.length; k++) {
    const i = I1[k];
    const j = J1[k];
    const n = N1[k];
    const ai = Math.pow(a, i);
    const bj = Math.pow(b, j);
    const aI1 = Math.pow(a, i - 1);
    const bJ1 = Math.pow(b, j - 1);
    g += n * ai * bj;
    gPi -= n * i * aI1 * bj;
    gPiPi += n * i * (i - 1) * Math.pow(a, i - 2) * bj;
    gTau += n * j * ai * bJ1;
    gTauTau += n * j * (j - 1) * ai * Math.pow(b, j - 2);
    gPiTau -= n * i * j * aI1 * bJ1;
  }
  return { g, gPi, gPiPi, gTau, gTauTau, gPiTau };
}

/** Eq. 30 of IAPWS-IF97 (2007) without the range check; the release's equation is in MPa. */
function saturationPressureUnchecked(temperatureK: number): number {
  const theta = temperatureK + N4[9] / (temperatureK - N4[10]);
  const a = theta * theta + N4[1] * theta + N4[2];
  const b = N4[3] * theta * theta + N4[4] * theta + N4[5];
  const c = N4[6] * theta * theta + N4[7] * theta + N4[8];
  return Math.pow((2 * c) / (-b + Math.sqrt(b * b - 4 * a * c)), 4) * 1e6;
}

function formatCelsius(temperatureK: number): string {
  return `${trim(temperatureK - 273.15, 2)} °C`;
}

function formatKelvin(temperatureK: number): string {
  return `${trim(temperatureK, 6)} K`;
}

/** MPa as the trade reads wellhead pressures; Pa near the triple point, where MPa shows only zeros. */
function formatPascal(pressurePa: number): string {
  if (Math.abs(pressurePa) < 1e4) return `${Number(pressurePa.toPrecision(5))} Pa`;
  return `${Number((pressurePa / 1e6).toPrecision(5))} MPa`;
}

/** Rounds to `decimals` places without trailing zeros (180.00 → "180"). */
function trim(value: number, decimals: number): string {
  return String(Number(value.toFixed(decimals)));
}
