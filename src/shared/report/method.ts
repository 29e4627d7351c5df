/**
 * "The method in short" of every report: what was computed, in a manager's words, and the published
 * sources the code rests on — cited as the engine's own modules cite them (src/shared/reservoir,
 * src/shared/water/iapws97.ts, src/shared/units.ts, src/shared/fit, src/shared/forecast).
 */

export interface MethodStep {
  heading: string;
  text: string;
}

export interface MethodSection {
  steps: MethodStep[];
  sources: string[];
}

export const REPORT_METHOD: MethodSection = {
  steps: [
    {
      heading: 'Available temperature',
      text: 'Each producing reading gives θ = Tprod − Tref, the excess of the production temperature over the well\'s reference ' +
        '(minimum useful) temperature. Shut-in and test readings and readings flagged bad or as a spike stay in the log but do not enter the fit.',
    },
    {
      heading: 'Lumped heat model',
      text: 'The swept rock is one heat store of capacity C cooled by the circulated water: C·dθ/dt = −ṁ·cw·θ, so θ = θ0·e^(−t/τ) with ' +
        'the time constant τ = C/(ṁ·cw). Fitted against the cumulative produced mass instead of time, the same balance gives the ' +
        'characteristic mass Mc = C/cw, and τ = Mc/ṁ at any flow. The theoretical τ comes from the reservoir parameters (slab or aquifer).',
    },
    {
      heading: 'Decline models',
      text: 'Exponential θ = θ0·e^(−t/τ); exponential to a floor θ = θ∞ + (θ0 − θ∞)·e^(−t/τ), a steady state where recharge balances ' +
        'extraction; Arps hyperbolic θ = θ0·(1 + b·t/τ)^(−1/b). Each is fitted by least squares; when the model is chosen automatically, ' +
        'the converged candidate with the lowest AICc is used and every candidate is listed.',
    },
    {
      heading: 'Uncertainty',
      text: 'Standard errors from the covariance s²·(JᵀJ)⁻¹ and 95 % intervals from Student\'s t with n − p degrees of freedom. ' +
        'The forecast band and the end-of-life percentiles come from seeded draws of the parameters (multivariate normal on the covariance), ' +
        'so the same data give the same report.',
    },
    {
      heading: 'Recharge',
      text: 'R = τfit/τtheory and the recharge fraction f = 1 − τtheory/τeff, the share of the extracted heat being replenished, ' +
        'compared with the background conductive heat flow through the reservoir\'s footprint. A negative f means the reservoir cools ' +
        'faster than its parameters allow: the swept volume is smaller than assumed.',
    },
    {
      heading: 'End of economic life',
      text: 'The time the fitted θ falls to the economic limit θecon, projected past the last reading at the planned flow. Trade ' +
        'convention (petroleum reserves): P90 is the low case, exceeded with 90 % probability; P50 the median; P10 the high case. ' +
        'Remaining producible heat is ṁ·cw·∫θ dt from now to the limit; current thermal power is ṁ·cw·θ now.',
    },
    {
      heading: 'Water properties and units',
      text: 'Density and specific heat of the produced water from IAPWS-IF97 region 1 at the logged temperature (saturation pressure from ' +
        'region 4); a state outside region 1 is refused, never extrapolated. Unit conversions use exact factors; a year is 365.25 d.',
    },
  ],
  sources: [
    'Lumped heat models of a hot-dry-rock slab and a hot aquifer: C = ρr·cr·A·(z2 − z1), E0 = C·θ0, τ = C/(ṁ·cw) (published lumped models).',
    'Arps, J. J. (1945), hyperbolic decline, written here with an initial time constant τ.',
    'IAPWS (2007), Revised Release on the IAPWS Industrial Formulation 1997 for the Thermodynamic Properties of Water and Steam (IAPWS-IF97): region 1 basic equation and region 4 saturation pressure.',
    'NIST Special Publication 811 (2008), Guide for the Use of the International System of Units (SI), Appendix B.8: conversion factors.',
    'Marquardt, D. W. (1963), Levenberg–Marquardt least squares, with Nielsen\'s (1999) update of the damping; stopping tests as in MINPACK.',
    'Golub, G. H. & Pereyra, V. (1973), variable projection: the starting values of the linear parameters.',
    'Hill, G. W. (1970), Algorithm 396: Student\'s t-quantiles, Comm. ACM 13, 619–620: the 95 % intervals.',
    'Akaike\'s information criterion with the small-sample correction (AICc, k = p + 1 counting the variance): the choice between models.',
  ],
};
