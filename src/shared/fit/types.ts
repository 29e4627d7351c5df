/** The decline models of DOMAIN.md §6, fitted to the available temperature θ = Tprod − Tref. */
export type DeclineModel = 'exponential' | 'floor' | 'hyperbolic';
export const DECLINE_MODELS: readonly DeclineModel[] = ['exponential', 'floor', 'hyperbolic'];

/**
 * What θ is fitted against (DOMAIN.md §4): elapsed time in s, or cumulative produced mass in kg.
 * On the mass basis the decline constant is the characteristic mass Mc = C/cw (kg), and τ = Mc/ṁ.
 */
export type Basis = 'time' | 'mass';

export type ParameterName = 'theta0' | 'tau' | 'thetaInf' | 'b';

/** Parameters in SI: θ0 and θ∞ in K, τ in the basis unit (s, or kg on the mass basis), b dimensionless. */
export interface DeclineParameters {
  theta0: number;
  tau: number;
  thetaInf?: number;
  b?: number;
}

export interface ParameterEstimate {
  value: number;
  /** Standard error from s²·(JᵀWJ)⁻¹; NaN when the covariance could not be formed. */
  stderr: number;
  /** 95 % interval from Student's t with n − p degrees of freedom. */
  ci95: [number, number];
  unit: string;
}

export type FitStatus =
  | 'converged'
  | 'max-iterations'
  | 'at-bound'
  | 'singular'
  | 'too-few-points'
  | 'no-decline';

/** One record per fit, honest about itself: callers never have to guess whether it worked. */
export interface FitResult {
  model: DeclineModel;
  basis: Basis;
  status: FitStatus;
  converged: boolean;
  /** Plain-words account of the status; empty when converged cleanly. */
  message: string;
  /** Points that entered the fit. */
  n: number;
  /** Points given but excluded (shut-in, test, flagged, zero weight). */
  nExcluded: number;
  dof: number;
  parameterNames: ParameterName[];
  estimates: DeclineParameters;
  parameters: Partial<Record<ParameterName, ParameterEstimate>>;
  /** Covariance in SI, ordered as parameterNames. */
  covariance: number[][];
  correlation: number[][];
  /** Basis values and residuals θobs − θfit of the points that entered the fit, in input order. */
  x: Float64Array;
  residuals: Float64Array;
  /** Weighted sum of squared residuals, K². */
  sse: number;
  /** Root-mean-square residual, K (weighted mean when weights are given). */
  rmseK: number;
  r2: number;
  /** Small-sample Akaike criterion with k = p + 1 (the variance counts). */
  aicc: number;
  /** Levenberg–Marquardt iterations, including those of a subsample pre-fit on long logs. */
  iterations: number;
  /** Passes over the full data (each computes residuals and the normal equations). */
  evaluations: number;
  /** Smallest and largest basis value that entered the fit. */
  xRange: [number, number];
}

export interface AutoFitResult extends FitResult {
  /** Every candidate model's fit, best AICc first among converged ones. */
  candidates: FitResult[];
}

export function basisUnit(basis: Basis): 's' | 'kg' {
  return basis === 'time' ? 's' : 'kg';
}

export function parameterNamesOf(model: DeclineModel): ParameterName[] {
  switch (model) {
    case 'exponential':
      return ['theta0', 'tau'];
    case 'floor':
      return ['theta0', 'tau', 'thetaInf'];
    case 'hyperbolic':
      return ['theta0', 'tau', 'b'];
  }
}
