/**
 * Closed forms of the decline models (DOMAIN.md §6) on any basis x (time in s, or produced mass in kg):
 *   exponential  θ = θ0·e^(−x/τ)
 *   floor        θ = θ∞ + (θ0 − θ∞)·e^(−x/τ)
 *   hyperbolic   θ = θ0·(1 + b·x/τ)^(−1/b)   (Arps, 1945, written with an initial time constant τ)
 * Used by the forecast, the recharge estimate and the charts; the fitter has its own fused loops.
 */
import type { DeclineModel, DeclineParameters } from './types.js';

export function declineValue(model: DeclineModel, p: DeclineParameters, x: number): number {
  switch (model) {
    case 'exponential':
      return p.theta0 * Math.exp(-x / p.tau);
    case 'floor': {
      const floor = p.thetaInf ?? 0;
      return floor + (p.theta0 - floor) * Math.exp(-x / p.tau);
    }
    case 'hyperbolic': {
      const b = p.b ?? 0;
      return p.theta0 * Math.exp(-Math.log1p((b * x) / p.tau) / b);
    }
  }
}

/** dθ/dx. */
export function declineSlope(model: DeclineModel, p: DeclineParameters, x: number): number {
  switch (model) {
    case 'exponential':
      return (-p.theta0 / p.tau) * Math.exp(-x / p.tau);
    case 'floor': {
      const floor = p.thetaInf ?? 0;
      return (-(p.theta0 - floor) / p.tau) * Math.exp(-x / p.tau);
    }
    case 'hyperbolic': {
      const b = p.b ?? 0;
      const u = 1 + (b * x) / p.tau;
      return (-p.theta0 / p.tau) * Math.exp((-(1 + b) / b) * Math.log(u));
    }
  }
}

/** ∫θ dx from x1 to x2, in closed form. */
export function declineIntegral(model: DeclineModel, p: DeclineParameters, x1: number, x2: number): number {
  switch (model) {
    case 'exponential':
      return p.tau * (declineValue(model, p, x1) - declineValue(model, p, x2));
    case 'floor': {
      const floor = p.thetaInf ?? 0;
      return floor * (x2 - x1) + p.tau * (declineValue(model, p, x1) - declineValue(model, p, x2));
    }
    case 'hyperbolic': {
      const b = p.b ?? 0;
      // With u = 1 + b·x/τ: ∫θ dx = θ0·τ/(b − 1)·u^((b−1)/b) for b ≠ 1, θ0·τ·ln u for b = 1.
      const u1 = 1 + (b * x1) / p.tau;
      const u2 = 1 + (b * x2) / p.tau;
      if (Math.abs(b - 1) < 1e-9) return p.theta0 * p.tau * (Math.log(u2) - Math.log(u1));
      const e = (b - 1) / b;
      return ((p.theta0 * p.tau) / (b - 1)) * (Math.pow(u2, e) - Math.pow(u1, e));
    }
  }
}

/**
 * The basis value at which θ falls to `thetaTarget`, or null when the model never gets there
 * (a floor at or above the target, a target above θ0 on a decline that starts below it, or bad parameters).
 */
export function basisWhereThetaFalls(model: DeclineModel, p: DeclineParameters, thetaTarget: number): number | null {
  if (!(p.tau > 0) || !Number.isFinite(p.tau)) return null;
  switch (model) {
    case 'exponential':
      if (!(thetaTarget > 0) || !(p.theta0 > 0)) return null;
      return p.tau * Math.log(p.theta0 / thetaTarget);
    case 'floor': {
      const floor = p.thetaInf ?? 0;
      const above = p.theta0 - floor;
      const gap = thetaTarget - floor;
      if (!(gap > 0) || !(above > 0)) return null;
      return p.tau * Math.log(above / gap);
    }
    case 'hyperbolic': {
      const b = p.b ?? 0;
      if (!(b > 0) || !(thetaTarget > 0) || !(p.theta0 > 0)) return null;
      return (p.tau / b) * (Math.pow(p.theta0 / thetaTarget, b) - 1);
    }
  }
}
