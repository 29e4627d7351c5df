/**
 * The reservoir part of a well's pages: the parameter version the forecast compared the decline with
 * (as stored, with the keys of `tauwell theory --params`), how many versions there are, and what the
 * lumped heat model makes of them.
 */
import type { Wire } from '../contract/channels.js';
import type { ForecastWellResponse } from '../contract/fits.js';
import type { ListReservoirVersionsResponse } from '../contract/reservoirs.js';
import { fin } from './numbers.js';

export interface ReservoirSummary {
  name: string;
  version: number;
  versions: number;
  recordedAt: string;
  recordedBy: string;
  note: string;
  /** The stored parameters, flattened (`fluid.iapws.temperature`), in the units of `tauwell theory --params`. */
  params: { key: string; value: string | number | boolean | null }[];
  theory: {
    kind: string; tauS: number | null; heatCapacityJPerK: number | null; usefulHeatJ: number | null; theta0K: number | null;
    massFlowKgPerS: number | null; fluidSpecificHeatJPerKgK: number | null; fluidDensityKgPerM3: number | null; fluidSource: string;
  };
  areaM2: number | null;
  meanMassFlowKgPerS: number | null;
  backgroundHeatFlowWPerM2: number | null;
}

export function reservoirSummary(f: Wire<ForecastWellResponse>, versions: Wire<ListReservoirVersionsResponse> | null): ReservoirSummary | null {
  const r = f.reservoir;
  if (r === null) return null;
  const t = r.theory;
  return {
    name: r.name,
    version: r.version.version,
    versions: versions?.versions.length ?? r.version.version,
    recordedAt: r.version.recordedAt,
    recordedBy: r.version.recordedBy,
    note: r.version.note,
    params: flatten(r.version.params, ''),
    theory: {
      kind: t.kind, tauS: fin(t.tau.value), heatCapacityJPerK: fin(t.heatCapacity.value), usefulHeatJ: fin(t.usefulHeat.value),
      theta0K: fin(t.theta0.value), massFlowKgPerS: fin(t.massFlow.value), fluidSpecificHeatJPerKgK: fin(t.fluidSpecificHeat.value),
      fluidDensityKgPerM3: fin(t.fluidDensity.value), fluidSource: String(t.fluidSource),
    },
    areaM2: fin(r.areaM2),
    meanMassFlowKgPerS: fin(r.meanMassFlowKgPerS),
    backgroundHeatFlowWPerM2: fin(r.backgroundHeatFlowWPerM2),
  };
}

function flatten(value: unknown, prefix: string): ReservoirSummary['params'] {
  if (value !== null && typeof value === 'object' && !Array.isArray(value)) {
    return Object.entries(value as Record<string, unknown>).flatMap(([k, v]) => flatten(v, prefix === '' ? k : `${prefix}.${k}`));
  }
  const v = typeof value === 'string' || typeof value === 'number' || typeof value === 'boolean' ? value : value === null ? null : JSON.stringify(value);
  return [{ key: prefix, value: v }];
}
