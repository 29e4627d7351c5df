/** The JSON form of a fit (`tauwell fit --json`, and `fit` inside each forecast): SI, each value with its unit. */
import { parameterNamesOf, type AutoFitResult, type FitResult, type ParameterName } from '../../shared/fit/types.js';
import { finiteOrNull } from './json.js';

export interface ParameterJson {
  value: number | null;
  stderr: number | null;
  ci95: [number | null, number | null];
  unit: string;
}

export interface FitJson {
  group: string | null;
  model: FitResult['model'];
  status: FitResult['status'];
  message: string;
  n: number;
  nExcluded: number;
  parameters: Partial<Record<ParameterName, ParameterJson>>;
  rmse: { value: number | null; unit: 'K' };
  r2: number | null;
  aicc: number | null;
  iterations: number;
  correlation: (number | null)[][];
  converged: boolean;
  basis: FitResult['basis'];
  dof: number;
  /** ISO 8601 instant of time zero, or null when the time column held elapsed numbers. */
  timeOrigin: string | null;
  candidates?: FitJson[];
}

const UNIT: Record<ParameterName, (basisUnit: string) => string> = {
  theta0: () => 'K', thetaInf: () => 'K', b: () => '1', tau: (u) => u,
};

export function fitToJson(fit: FitResult | AutoFitResult, group: string | null, originMs: number | null): FitJson {
  const parameters: Partial<Record<ParameterName, ParameterJson>> = {};
  // Only the model's own parameters, present even when the fit failed (then with nulls).
  for (const name of parameterNamesOf(fit.model)) {
    const p = fit.parameters[name];
    parameters[name] = {
      value: finiteOrNull(p?.value),
      stderr: finiteOrNull(p?.stderr),
      ci95: [finiteOrNull(p?.ci95[0]), finiteOrNull(p?.ci95[1])],
      unit: p?.unit ?? UNIT[name](fit.basis === 'time' ? 's' : 'kg'),
    };
  }
  const json: FitJson = {
    group,
    model: fit.model,
    status: fit.status,
    message: fit.message,
    n: fit.n,
    nExcluded: fit.nExcluded,
    parameters,
    rmse: { value: finiteOrNull(fit.rmseK), unit: 'K' },
    r2: finiteOrNull(fit.r2),
    aicc: finiteOrNull(fit.aicc),
    iterations: fit.iterations,
    correlation: fit.correlation.map((row) => row.map((c) => finiteOrNull(c))),
    converged: fit.converged,
    basis: fit.basis,
    dof: fit.dof,
    timeOrigin: originMs === null ? null : new Date(originMs).toISOString(),
  };
  if ('candidates' in fit) json.candidates = fit.candidates.map((c) => fitToJson(c, group, originMs));
  return json;
}
