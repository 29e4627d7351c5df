/**
 * Lumped heat models of a geothermal reservoir: the theoretical heat capacity, stored
 * useful heat and time constant that a fitted decline is later compared against.
 *
 * Hot-dry-rock slab: a linear geotherm T(z) = T0 + G·z swept between the depth z1 of the
 * minimum useful temperature T1 and the well depth z2; the stored heat above T1 is
 * E0 = ρr·cr·A·G·(z2 − z1)²/2 with mean excess θ0 = (T2 − T1)/2 and C = ρr·cr·A·(z2 − z1).
 * Aquifer: a thin layer of thickness h at depth z2, C = [φ·ρw·cw + (1 − φ)·ρr·cr]·h·A,
 * θ0 = T2 − T1. Both decline by C·dθ/dt = −ṁ·cw·θ, so θ = θ0·e^(−t/τ) with τ = C/(ṁ·cw).
 * (Published lumped models; summarised in DOMAIN.md §2–3.)
 *
 * SI only, absolute temperatures in K. Errors name the parameter by its key in the
 * command-line JSON contract (`gradient`, `maxDepth`, `fluid.density`, …), which is what
 * a user can find and fix.
 */
import { InputError, requireFinite, requirePositive } from '../errors.js';
import { liquidWater } from '../water/iapws97.js';

export type FluidSpec =
  | { kind: 'fixed'; densityKgPerM3: number; specificHeatJPerKgK: number }
  | { kind: 'iapws'; temperatureK: number; pressurePa: number };

export type FlowSpec = { massFlowKgPerS: number } | { volumeFlowM3PerS: number };

interface CommonParams {
  surfaceTemperatureK: number;
  gradientKPerM: number;
  minUsefulTemperatureK: number;
  areaM2: number;
  rockDensityKgPerM3: number;
  rockSpecificHeatJPerKgK: number;
  flow: FlowSpec;
  fluid: FluidSpec;
}

export interface HotDryRockParams extends CommonParams {
  kind: 'hot-dry-rock';
  /** Deepest useful depth reached by the wells, z2. */
  maxDepthM: number;
}

export interface AquiferParams extends CommonParams {
  kind: 'aquifer';
  /** Depth of the aquifer, z2; its temperature is T0 + G·z2. */
  depthM: number;
  thicknessM: number;
  /** Pore fraction φ, 0 ≤ φ < 1. */
  porosity: number;
}

export type ReservoirParams = HotDryRockParams | AquiferParams;

export interface FluidProperties {
  densityKgPerM3: number;
  specificHeatJPerKgK: number;
  source: 'fixed' | 'IAPWS-IF97 region 1';
  /** State the IAPWS properties were evaluated at (absent for fixed properties). */
  temperatureK?: number;
  pressurePa?: number;
}

export interface ReservoirTheory {
  kind: ReservoirParams['kind'];
  /** z1, where the geotherm reaches the minimum useful temperature. */
  minUsefulDepthM: number;
  /** T2 = T0 + G·z2. */
  bottomTemperatureK: number;
  /** Initial mean excess temperature over T1. */
  theta0K: number;
  heatCapacityJPerK: number;
  /** E0 = C·θ0, heat stored above the minimum useful temperature. */
  usefulHeatJ: number;
  fluid: FluidProperties;
  massFlowKgPerS: number;
  tauS: number;
  /** Mc = C/cw, the produced mass per e-fold of decline (DOMAIN.md §4). */
  characteristicMassKg: number;
  /** P(0) = E0/τ = ṁ·cw·θ0. */
  initialPowerW: number;
}

/**
 * Checks every parameter that can be checked without evaluating water properties.
 * Exported so that a parser can report these errors against its input file.
 */
export function checkReservoirParams(p: ReservoirParams): void {
  const t0 = requirePositive(p.surfaceTemperatureK, 'surfaceTemperature');
  const g = requireFinite(p.gradientKPerM, 'gradient');
  if (!(g > 0)) throw new InputError(`geothermal gradient must be greater than zero (got ${g} K/m)`, { field: 'gradient' });
  const t1 = requireFinite(p.minUsefulTemperatureK, 'minUsefulTemperature');
  if (t1 < t0) {
    throw new InputError(
      `minimum useful temperature ${describeK(t1)} is below the surface temperature ${describeK(t0)}`,
      { field: 'minUsefulTemperature' },
    );
  }
  requirePositive(p.areaM2, 'area');
  requirePositive(p.rockDensityKgPerM3, 'rockDensity');
  requirePositive(p.rockSpecificHeatJPerKgK, 'rockSpecificHeat');
  checkFlow(p.flow);
  checkFluid(p.fluid);

  const z1 = (t1 - t0) / g;
  const depthField = p.kind === 'hot-dry-rock' ? 'maxDepth' : 'depth';
  const z2 = requirePositive(p.kind === 'hot-dry-rock' ? p.maxDepthM : p.depthM, depthField);
  if (!(z2 > z1)) {
    throw new InputError(
      `the wells do not reach the minimum useful temperature: depth ${z2} m is not below z1 = ${z1.toPrecision(6)} m ` +
        `where the geotherm reaches ${describeK(t1)}`,
      { field: depthField },
    );
  }
  if (p.kind === 'aquifer') {
    requirePositive(p.thicknessM, 'thickness');
    const phi = requireFinite(p.porosity, 'porosity');
    if (!(phi >= 0 && phi < 1)) throw new InputError(`porosity must be in [0, 1) (got ${phi})`, { field: 'porosity' });
  }
}

export function reservoirTheory(p: ReservoirParams): ReservoirTheory {
  checkReservoirParams(p);
  const fluid = fluidProperties(p.fluid);
  const massFlowKgPerS =
    'massFlowKgPerS' in p.flow ? p.flow.massFlowKgPerS : p.flow.volumeFlowM3PerS * fluid.densityKgPerM3;

  const t0 = p.surfaceTemperatureK;
  const g = p.gradientKPerM;
  const t1 = p.minUsefulTemperatureK;
  const z1 = (t1 - t0) / g;
  const rockVolumetricHeat = p.rockDensityKgPerM3 * p.rockSpecificHeatJPerKgK;

  const z2 = p.kind === 'hot-dry-rock' ? p.maxDepthM : p.depthM;
  const t2 = t0 + g * z2;
  let heatCapacityJPerK: number;
  let theta0K: number;
  if (p.kind === 'hot-dry-rock') {
    heatCapacityJPerK = rockVolumetricHeat * p.areaM2 * (z2 - z1);
    // Mean of a linear excess rising from 0 at z1 to T2 − T1 at z2.
    theta0K = (t2 - t1) / 2;
  } else {
    const bulkVolumetricHeat =
      p.porosity * fluid.densityKgPerM3 * fluid.specificHeatJPerKgK + (1 - p.porosity) * rockVolumetricHeat;
    heatCapacityJPerK = bulkVolumetricHeat * p.thicknessM * p.areaM2;
    theta0K = t2 - t1;
  }
  const usefulHeatJ = heatCapacityJPerK * theta0K;
  const cw = fluid.specificHeatJPerKgK;
  const tauS = heatCapacityJPerK / (massFlowKgPerS * cw);
  return {
    kind: p.kind,
    minUsefulDepthM: z1,
    bottomTemperatureK: t2,
    theta0K,
    heatCapacityJPerK,
    usefulHeatJ,
    fluid,
    massFlowKgPerS,
    tauS,
    characteristicMassKg: heatCapacityJPerK / cw,
    initialPowerW: usefulHeatJ / tauS,
  };
}

/** τ = C/(ṁ·cw) at another mass flow, e.g. the mean flow of a fit window (DOMAIN.md §7). */
export function tauAtMassFlowS(theory: ReservoirTheory, massFlowKgPerS: number): number {
  const m = requirePositive(massFlowKgPerS, 'massFlow');
  return theory.heatCapacityJPerK / (m * theory.fluid.specificHeatJPerKgK);
}

/** θ(t) = θ0·e^(−t/τ), t in seconds since production started. */
export function thetaAtK(theory: ReservoirTheory, tS: number): number {
  return theory.theta0K * decay(theory, tS);
}

/** E(t) = E0·e^(−t/τ), the useful heat still in place. */
export function energyAtJ(theory: ReservoirTheory, tS: number): number {
  return theory.usefulHeatJ * decay(theory, tS);
}

/** P(t) = (E0/τ)·e^(−t/τ) = ṁ·cw·θ(t). */
export function powerAtW(theory: ReservoirTheory, tS: number): number {
  return theory.initialPowerW * decay(theory, tS);
}

function decay(theory: ReservoirTheory, tS: number): number {
  const t = requireFinite(tS, 'time');
  // The model starts with production; earlier times are not part of it.
  if (t < 0) throw new InputError(`time must be zero or later (got ${t} s)`, { field: 'time' });
  return Math.exp(-t / theory.tauS);
}

function checkFlow(flow: FlowSpec): void {
  if ('massFlowKgPerS' in flow) requirePositive(flow.massFlowKgPerS, 'massFlow');
  else requirePositive(flow.volumeFlowM3PerS, 'volumeFlow');
}

function checkFluid(fluid: FluidSpec): void {
  if (fluid.kind === 'fixed') {
    requirePositive(fluid.densityKgPerM3, 'fluid.density');
    requirePositive(fluid.specificHeatJPerKgK, 'fluid.specificHeat');
  } else {
    requirePositive(fluid.temperatureK, 'fluid.iapws.temperature');
    requirePositive(fluid.pressurePa, 'fluid.iapws.pressure');
  }
}

function fluidProperties(fluid: FluidSpec): FluidProperties {
  if (fluid.kind === 'fixed') {
    return { densityKgPerM3: fluid.densityKgPerM3, specificHeatJPerKgK: fluid.specificHeatJPerKgK, source: 'fixed' };
  }
  let water: ReturnType<typeof liquidWater>;
  try {
    water = liquidWater(fluid.temperatureK, fluid.pressurePa);
  } catch (e) {
    // Re-home the water-property error ('temperature' or 'pressure') onto the fluid state the user gave.
    if (e instanceof InputError) {
      const field = e.where.field !== undefined ? `fluid.iapws.${e.where.field}` : 'fluid.iapws';
      throw new InputError(e.reason, { field });
    }
    throw e;
  }
  return {
    densityKgPerM3: water.densityKgPerM3,
    specificHeatJPerKgK: water.specificHeatJPerKgK,
    source: 'IAPWS-IF97 region 1',
    temperatureK: fluid.temperatureK,
    pressurePa: fluid.pressurePa,
  };
}

function describeK(k: number): string {
  // 273.15 K is the exact Celsius offset (SI Brochure); shown because users enter °C.
  return `${k} K (${(k - 273.15).toFixed(2)} °C)`;
}
