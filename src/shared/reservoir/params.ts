/**
 * The command-line JSON contract for reservoir parameters, in the units people write
 * them in (°C, MPa), and the JSON form of the theoretical result (SI, each value with
 * its unit). Parsing converts to SI once, here, so the engine never sees °C or MPa.
 */
import { InputError } from '../errors.js';
import { checkReservoirParams } from './theory.js';
import type { FlowSpec, FluidSpec, ReservoirParams, ReservoirTheory } from './theory.js';

/** Exact offset between the Celsius and kelvin scales (SI Brochure). */
const CELSIUS_OFFSET_K = 273.15;
const PA_PER_MPA = 1e6;

const COMMON_KEYS = [
  'kind', 'surfaceTemperature', 'gradient', 'minUsefulTemperature', 'area',
  'rockDensity', 'rockSpecificHeat', 'massFlow', 'volumeFlow', 'fluid',
] as const;
const KEYS_BY_KIND = {
  'hot-dry-rock': [...COMMON_KEYS, 'maxDepth'],
  aquifer: [...COMMON_KEYS, 'depth', 'thickness', 'porosity'],
} as const;

/**
 * Parses and checks reservoir parameters. Every error is an InputError carrying `file`
 * (when given) and the JSON key at fault; nested keys are dotted (`fluid.iapws.pressure`).
 * Water properties are not evaluated here; that happens in `reservoirTheory`.
 */
export function parseReservoirParams(json: unknown, file?: string): ReservoirParams {
  const fail = (reason: string, field?: string): never => {
    throw new InputError(reason, { ...(file !== undefined ? { file } : {}), ...(field !== undefined ? { field } : {}) });
  };
  const root = asObject(json, undefined, fail);

  const kind = root.kind;
  if (kind !== 'hot-dry-rock' && kind !== 'aquifer') {
    return fail(`must be "hot-dry-rock" or "aquifer" (got ${JSON.stringify(kind)})`, 'kind');
  }
  rejectUnknownKeys(root, KEYS_BY_KIND[kind], '', fail);
  const num = (key: string): number => requireNumber(root, key, '', fail);

  const common = {
    surfaceTemperatureK: num('surfaceTemperature') + CELSIUS_OFFSET_K,
    gradientKPerM: num('gradient'),
    minUsefulTemperatureK: num('minUsefulTemperature') + CELSIUS_OFFSET_K,
    areaM2: num('area'),
    rockDensityKgPerM3: num('rockDensity'),
    rockSpecificHeatJPerKgK: num('rockSpecificHeat'),
    flow: parseFlow(root, fail),
    fluid: parseFluid(root.fluid, fail),
  };
  const params: ReservoirParams =
    kind === 'hot-dry-rock'
      ? { kind, ...common, maxDepthM: num('maxDepth') }
      : { kind, ...common, depthM: num('depth'), thicknessM: num('thickness'), porosity: num('porosity') };

  try {
    checkReservoirParams(params);
  } catch (e) {
    if (e instanceof InputError) return fail(e.reason, e.where.field);
    throw e;
  }
  return params;
}

type Fail = (reason: string, field?: string) => never;

function parseFlow(root: Record<string, unknown>, fail: Fail): FlowSpec {
  const hasMass = root.massFlow !== undefined;
  const hasVolume = root.volumeFlow !== undefined;
  if (hasMass && hasVolume) return fail('give either massFlow or volumeFlow, not both', 'volumeFlow');
  if (hasVolume) return { volumeFlowM3PerS: requireNumber(root, 'volumeFlow', '', fail) };
  if (!hasMass) return fail('missing: give massFlow (kg/s) or volumeFlow (m³/s)', 'massFlow');
  return { massFlowKgPerS: requireNumber(root, 'massFlow', '', fail) };
}

function parseFluid(value: unknown, fail: Fail): FluidSpec {
  if (value === undefined) {
    return fail('missing: give {"density":…,"specificHeat":…} or {"iapws":{"temperature":°C,"pressure":MPa}}', 'fluid');
  }
  const fluid = asObject(value, 'fluid', fail);
  if (fluid.iapws !== undefined) {
    rejectUnknownKeys(fluid, ['iapws'], 'fluid.', fail);
    const state = asObject(fluid.iapws, 'fluid.iapws', fail);
    rejectUnknownKeys(state, ['temperature', 'pressure'], 'fluid.iapws.', fail);
    return {
      kind: 'iapws',
      temperatureK: requireNumber(state, 'temperature', 'fluid.iapws.', fail) + CELSIUS_OFFSET_K,
      pressurePa: requireNumber(state, 'pressure', 'fluid.iapws.', fail) * PA_PER_MPA,
    };
  }
  rejectUnknownKeys(fluid, ['density', 'specificHeat'], 'fluid.', fail);
  return {
    kind: 'fixed',
    densityKgPerM3: requireNumber(fluid, 'density', 'fluid.', fail),
    specificHeatJPerKgK: requireNumber(fluid, 'specificHeat', 'fluid.', fail),
  };
}

function asObject(value: unknown, field: string | undefined, fail: Fail): Record<string, unknown> {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    return fail(`must be a JSON object (got ${value === null ? 'null' : Array.isArray(value) ? 'an array' : typeof value})`, field);
  }
  return value as Record<string, unknown>;
}

function rejectUnknownKeys(obj: Record<string, unknown>, allowed: readonly string[], prefix: string, fail: Fail): void {
  for (const key of Object.keys(obj)) {
    // JSON has no comments: a top-level free-text "note" documents the file (e.g. where the values came from).
    if (prefix === '' && key === 'note' && typeof obj[key] === 'string') continue;
    if (!allowed.includes(key)) fail(`unknown key; expected one of ${allowed.join(', ')}`, prefix + key);
  }
}

function requireNumber(obj: Record<string, unknown>, key: string, prefix: string, fail: Fail): number {
  const value = obj[key];
  if (value === undefined) return fail('missing', prefix + key);
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    return fail(`must be a finite number (got ${JSON.stringify(value)})`, prefix + key);
  }
  return value;
}

export interface Quantity<U extends string> {
  value: number;
  unit: U;
}

export interface ReservoirTheoryJson {
  kind: ReservoirTheory['kind'];
  minUsefulDepth: Quantity<'m'>;
  bottomTemperature: Quantity<'K'>;
  theta0: Quantity<'K'>;
  heatCapacity: Quantity<'J/K'>;
  usefulHeat: Quantity<'J'>;
  tau: Quantity<'s'>;
  initialPower: Quantity<'W'>;
  massFlow: Quantity<'kg/s'>;
  characteristicMass: Quantity<'kg'>;
  fluidDensity: Quantity<'kg/m3'>;
  fluidSpecificHeat: Quantity<'J/(kg K)'>;
  /** Where the water properties came from: the assumption a report must record (DOMAIN.md §4). */
  fluidSource: ReservoirTheory['fluid']['source'];
}

/** SI throughout, so the bottom temperature is in K like every other temperature. */
export function reservoirTheoryToJson(t: ReservoirTheory): ReservoirTheoryJson {
  return {
    kind: t.kind,
    minUsefulDepth: { value: t.minUsefulDepthM, unit: 'm' },
    bottomTemperature: { value: t.bottomTemperatureK, unit: 'K' },
    theta0: { value: t.theta0K, unit: 'K' },
    heatCapacity: { value: t.heatCapacityJPerK, unit: 'J/K' },
    usefulHeat: { value: t.usefulHeatJ, unit: 'J' },
    tau: { value: t.tauS, unit: 's' },
    initialPower: { value: t.initialPowerW, unit: 'W' },
    massFlow: { value: t.massFlowKgPerS, unit: 'kg/s' },
    characteristicMass: { value: t.characteristicMassKg, unit: 'kg' },
    fluidDensity: { value: t.fluid.densityKgPerM3, unit: 'kg/m3' },
    fluidSpecificHeat: { value: t.fluid.specificHeatJPerKgK, unit: 'J/(kg K)' },
    fluidSource: t.fluid.source,
  };
}
