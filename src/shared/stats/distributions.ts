/**
 * Special functions and the two distributions the decline fitter and the forecast need:
 * Student's t (confidence intervals with n − p degrees of freedom) and the standard normal.
 *
 * Accuracy targets are relative, in the tails as well as the middle: a 95 % interval and a
 * 1e-10 tail probability must both come out to ~1e-14. Every evaluation therefore works on
 * the smaller of the two tails and keeps both x and 1 − x exact when both are needed.
 */
import { InputError, requireFinite } from '../errors.js';

const LN_SQRT_2PI = 0.9189385332046728; // ½·ln(2π)
const INV_SQRT_2PI = 0.3989422804014327; // 1/√(2π)

/**
 * Above this many degrees of freedom Student's t is the normal to double precision: the
 * leading correction to the quantile, (z³ + z)/(4·dof) (Abramowitz & Stegun 26.7.5), is
 * below 1e-17 relative for |z| < 40, and the CDF's, about x⁴/(4·dof), below 5e-15 even at
 * x = −37 where the normal CDF underflows.
 */
const NORMAL_LIMIT_DOF = 1e20;

// ---------------------------------------------------------------------------------------------
// Gamma and beta functions
// ---------------------------------------------------------------------------------------------

// Lanczos approximation with g = 7, n = 9 (coefficients published by P. Godfrey, 2001);
// relative error of Γ about 1e-15 on x ≥ ½.
const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];

/** ln |Γ(x)|: Lanczos for x ≥ ½, the reflection formula Γ(x)Γ(1 − x) = π / sin(πx) below. */
export function logGamma(x: number): number {
  requireFinite(x, 'x');
  if (x < 0.5) {
    const s = Math.sin(Math.PI * x);
    if (s === 0) return Infinity; // pole at 0, −1, −2, …
    return Math.log(Math.PI / Math.abs(s)) - logGamma(1 - x);
  }
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return LN_SQRT_2PI + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/**
 * ln Γ(x) − [(x − ½)·ln x − x + ½·ln 2π] for x ≥ 10: the tail of Stirling's series
 * Σ B₂ₖ / (2k(2k − 1)·x^(2k−1)) (Abramowitz & Stegun 6.1.40), eight terms, error < 2e-18.
 * Working with this remainder keeps ln B(a, b) accurate when a or b is large, where
 * differences of ln Γ values of size 1e8 would lose eight digits.
 */
function stirlingRemainder(x: number): number {
  const r = 1 / (x * x);
  return (1 / 12 + r * (-1 / 360 + r * (1 / 1260 + r * (-1 / 1680 + r * (1 / 1188 +
    r * (-691 / 360360 + r * (1 / 156 + r * (-3617 / 122400)))))))) / x;
}

/** ln B(a, b) = ln Γ(a) + ln Γ(b) − ln Γ(a + b), without cancellation when a or b is large. */
export function logBeta(a: number, b: number): number {
  requirePositiveParameter(a, 'a');
  requirePositiveParameter(b, 'b');
  const p = Math.min(a, b);
  const q = Math.max(a, b);
  const sum = p + q;
  if (p >= 10) {
    // Both large: Stirling for all three terms, the ln terms regrouped as ratios.
    const corr = stirlingRemainder(p) + stirlingRemainder(q) - stirlingRemainder(sum);
    return -0.5 * Math.log(q) + LN_SQRT_2PI + corr + (p - 0.5) * Math.log(p / sum) + q * Math.log1p(-p / sum);
  }
  if (q >= 10) {
    // Only q large: ln Γ(q) − ln Γ(p + q) from Stirling, regrouped the same way.
    const corr = stirlingRemainder(q) - stirlingRemainder(sum);
    return logGamma(p) + corr + p - p * Math.log(sum) + (q - 0.5) * Math.log1p(-p / sum);
  }
  return logGamma(p) + logGamma(q) - logGamma(sum);
}

// ---------------------------------------------------------------------------------------------
// Regularized incomplete beta function
// ---------------------------------------------------------------------------------------------

/** Iₓ(a, b) = B(x; a, b) / B(a, b) for 0 ≤ x ≤ 1 and a, b > 0. */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  requireFinite(x, 'x');
  if (x < 0 || x > 1) throw new InputError(`must lie in [0, 1] (got ${x})`, { field: 'x' });
  requirePositiveParameter(a, 'a');
  requirePositiveParameter(b, 'b');
  // 1 − x is exact for x ≥ ½ (Sterbenz); below ½ it rounds but is then the larger of the two.
  return incompleteBeta(a, b, x, 1 - x);
}

/**
 * Iₓ(a, b) given both x and y = 1 − x to full relative precision (callers such as the t
 * distribution can form both exactly, where 1 − x would round away the small one).
 * Continued fraction of Numerical Recipes §6.4 on whichever side of the mean converges.
 */
function incompleteBeta(a: number, b: number, x: number, y: number): number {
  if (x <= 0) return 0;
  if (y <= 0) return 1;
  // x < (a + 1)/(a + b + 2), tested on whichever of x, y carries the information.
  const direct = x < 0.5 ? x * (a + b + 2) < a + 1 : y * (a + b + 2) > b + 1;
  if (direct) return Math.exp(logBetaPowerTerm(a, b, x, y)) * betaContinuedFraction(a, b, x, y) / a;
  return 1 - Math.exp(logBetaPowerTerm(b, a, y, x)) * betaContinuedFraction(b, a, y, x) / b;
}

/** ln[xᵃ·yᵇ / B(a, b)], the prefactor of the continued fraction. */
function logBetaPowerTerm(a: number, b: number, x: number, y: number): number {
  // ln x from whichever of x, y is accurate: ln x = ln1p(−y) when x is near 1.
  const lnX = x < 0.5 ? Math.log(x) : Math.log1p(-y);
  const lnY = y < 0.5 ? Math.log(y) : Math.log1p(-x);
  if (Math.min(a, b) < 10) return a * lnX + b * lnY - logBeta(a, b);
  // Both large: a·ln x and ln B(a, b) are each ~a and cancel. Expanding ln B by Stirling
  // about the mean x₀ = a/(a + b) leaves a·ln(x/x₀) + b·ln(y/y₀), small near the mean
  // (the grouping of Temme's uniform expansion, Temme 1992).
  const sum = a + b;
  const dx = (x * b - y * a) / a; // x/x₀ − 1, exact in form because x + y = 1
  const dy = (y * a - x * b) / b; // y/y₀ − 1
  const lnRatioX = Math.abs(dx) < 0.5 ? Math.log1p(dx) : lnX + Math.log1p(b / a);
  const lnRatioY = Math.abs(dy) < 0.5 ? Math.log1p(dy) : lnY + Math.log1p(a / b);
  const corr = stirlingRemainder(a) + stirlingRemainder(b) - stirlingRemainder(sum);
  return a * lnRatioX + b * lnRatioY + 0.5 * Math.log(a * b / sum) - LN_SQRT_2PI - corr;
}

const CF_TINY = 1e-300;
const CF_EPS = 1e-16;
const CF_MAX_ITERATIONS = 100_000;

/**
 * The continued fraction Iₓ(a, b) = xᵃyᵇ/(a·B) · 1/(1 + d₁/(1 + d₂/(1 + …))) of Numerical
 * Recipes (3rd ed., eq. 6.4.5), evaluated by modified Lentz on its even contraction.
 *
 * With a large and x near 1 every odd term d₂ₘ₊₁ is close to −1, so 1 + d₂ₘ₊₁ cancels to
 * ~1e-7 and the textbook evaluation loses six or more digits (3e-10 relative at 1e7
 * degrees of freedom). The contraction groups each odd term with its 1, and 1 + d₂ₘ₊₁ is
 * then expanded exactly: with x = 1 − y,
 *   1 + d₂ₘ₊₁ = [a(2m + 1 − b) + m(3m + 2 − b) + y(a + m)(a + b + m)] / [(a + 2m)(a + 2m + 1)],
 * every term non-negative once b ≤ 2m + 1.
 */
function betaContinuedFraction(a: number, b: number, x: number, y: number): number {
  const onePlusOdd = (m: number): number => {
    const den = (a + 2 * m) * (a + 2 * m + 1);
    if (b <= 2 * m + 1) return (a * (2 * m + 1 - b) + m * (3 * m + 2 - b) + y * (a + m) * (a + b + m)) / den;
    return 1 - (a + m) * (a + b + m) * x / den;
  };
  const odd = (m: number): number => -(a + m) * (a + b + m) * x / ((a + 2 * m) * (a + 2 * m + 1));
  const even = (m: number): number => m * (b - m) * x / ((a + 2 * m - 1) * (a + 2 * m));

  // S = β₀ + α₁/(β₁ + α₂/(β₂ + …)), β₀ = 1 + d₁, αₘ = −d₂ₘ₋₁·d₂ₘ, βₘ = d₂ₘ + (1 + d₂ₘ₊₁).
  let f = onePlusOdd(0);
  if (f === 0) f = CF_TINY;
  let c = f;
  let d = 0;
  for (let m = 1; m <= CF_MAX_ITERATIONS; m++) {
    const alpha = -odd(m - 1) * even(m);
    const beta = even(m) + onePlusOdd(m);
    d = beta + alpha * d;
    if (Math.abs(d) < CF_TINY) d = CF_TINY;
    d = 1 / d;
    c = beta + alpha / c;
    if (Math.abs(c) < CF_TINY) c = CF_TINY;
    const delta = c * d;
    f *= delta;
    if (Math.abs(delta - 1) <= CF_EPS) return 1 / f;
  }
  const reason = `incomplete beta continued fraction did not converge for a = ${a}, b = ${b}, x = ${x}`;
  throw new InputError(reason, { field: 'a' });
}

// ---------------------------------------------------------------------------------------------
// Standard normal
// ---------------------------------------------------------------------------------------------

// W. J. Cody, "Rational Chebyshev approximations for the error function", Math. Comp. 23
// (1969) 631–637, in the form of his ANORM routine (ACM TOMS Algorithm 715, 1993).
// The published 20-digit coefficients are written as the doubles they round to.
const CODY_A = [
  2.2352520354606837, 161.02823106855587, 1067.6894854603709, 18154.98125334356,
  0.06568233791820745,
];
const CODY_B = [47.202581904688245, 976.0985517377767, 10260.932208618979, 45507.78933502673];
const CODY_C = [
  0.39894151208813466, 8.883149794388377, 93.50665613217785, 597.2702763948002, 2494.5375852903726,
  6848.190450536283, 11602.65143764735, 9842.714838383978, 1.0765576773720192e-8,
];
const CODY_D = [
  22.266688044328117, 235.387901782625, 1519.3775994075547, 6485.558298266761, 18615.571640885097,
  34900.95272114598, 38912.00328609327, 19685.429676859992,
];
const CODY_P = [
  0.215898534057957, 0.12740116116024736, 0.022235277870649807, 0.0014216191932278934,
  0.000029112874951168793, 0.023073441764940174,
];
const CODY_Q = [
  1.284260096144911, 0.4682382124808651, 0.06598813786892856, 0.0037823963320275824,
  0.00007297515550839662,
];

/** Φ(x) = P(Z ≤ x), relative accuracy ~1e-16 down to the underflow at x ≈ −37.5. */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) throw new InputError('must be a number (got NaN)', { field: 'x' });
  const y = Math.abs(x);
  if (y <= 0.66291) {
    const xsq = y > 1.11e-16 ? x * x : 0;
    let num = CODY_A[4] * xsq;
    let den = xsq;
    for (let i = 0; i < 3; i++) {
      num = (num + CODY_A[i]) * xsq;
      den = (den + CODY_B[i]) * xsq;
    }
    return 0.5 + x * (num + CODY_A[3]) / (den + CODY_B[3]);
  }
  let tail: number;
  if (y <= 5.656854248) {
    let num = CODY_C[8] * y;
    let den = y;
    for (let i = 0; i < 7; i++) {
      num = (num + CODY_C[i]) * y;
      den = (den + CODY_D[i]) * y;
    }
    tail = gaussianFactor(y) * (num + CODY_C[7]) / (den + CODY_D[7]);
  } else if (y < 37.519) {
    const r = 1 / (y * y);
    let num = CODY_P[5] * r;
    let den = r;
    for (let i = 0; i < 4; i++) {
      num = (num + CODY_P[i]) * r;
      den = (den + CODY_Q[i]) * r;
    }
    tail = gaussianFactor(y) * (INV_SQRT_2PI - r * (num + CODY_P[4]) / (den + CODY_Q[4])) / y;
  } else {
    tail = 0;
  }
  return x > 0 ? 1 - tail : tail;
}

/** exp(−y²/2) with y split as y₁ + y₂, y₁ a multiple of 1/16, so that y₁² is exact (Cody). */
function gaussianFactor(y: number): number {
  const y1 = Math.trunc(y * 16) / 16;
  const del = (y - y1) * (y + y1);
  return Math.exp(-y1 * y1 * 0.5) * Math.exp(-del * 0.5);
}

// M. J. Wichura, "Algorithm AS 241: The percentage points of the normal distribution",
// Applied Statistics 37 (1988) 477–484, routine PPND16 (relative accuracy about 1e-16).
// Coefficients in ascending powers, each published 20-digit value written as its double.
const AS241_A = [
  3.3871328727963665, 133.14166789178438, 1971.5909503065513, 13731.69376550946, 45921.95393154987,
  67265.7709270087, 33430.57558358813, 2509.0809287301227,
];
const AS241_B = [
  1, 42.31333070160091, 687.1870074920579, 5394.196021424751, 21213.794301586597,
  39307.89580009271, 28729.085735721943, 5226.495278852854,
];
const AS241_C = [
  1.4234371107496835, 4.630337846156546, 5.769497221460691, 3.6478483247632045, 1.2704582524523684,
  0.2417807251774506, 0.022723844989269184, 0.0007745450142783414,
];
const AS241_D = [
  1, 2.053191626637759, 1.6763848301838038, 0.6897673349851, 0.14810397642748008,
  0.015198666563616457, 0.0005475938084995345, 1.0507500716444169e-9,
];
const AS241_E = [
  6.657904643501103, 5.463784911164114, 1.7848265399172913, 0.29656057182850487,
  0.026532189526576124, 0.0012426609473880784, 0.000027115555687434876, 2.0103343992922881e-7,
];
const AS241_F = [
  1, 0.599832206555888, 0.1369298809227358, 0.014875361290850615, 0.0007868691311456133,
  0.000018463183175100548, 1.421511758316446e-7, 2.0442631033899397e-15,
];

/** Ratio of two degree-7 polynomials in r, coefficients in ascending powers. */
function rational7(num: readonly number[], den: readonly number[], r: number): number {
  let n = num[7];
  let d = den[7];
  for (let i = 6; i >= 0; i--) {
    n = n * r + num[i];
    d = d * r + den[i];
  }
  return n / d;
}

/** Φ⁻¹(p): the z with P(Z ≤ z) = p; −∞ at p = 0 and +∞ at p = 1. */
export function normalQuantile(p: number): number {
  requireProbability(p);
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) return q * rational7(AS241_A, AS241_B, 0.180625 - q * q);
  const r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  const z = r <= 5 ? rational7(AS241_C, AS241_D, r - 1.6) : rational7(AS241_E, AS241_F, r - 5);
  return q < 0 ? -z : z;
}

// ---------------------------------------------------------------------------------------------
// Student's t
// ---------------------------------------------------------------------------------------------

/** x = dof/(dof + t²) and y = t²/(dof + t²), each to full relative precision and without overflow. */
function tBetaArguments(absT: number, dof: number): [number, number] {
  const s = absT / Math.sqrt(dof);
  if (s <= 1) {
    const s2 = s * s;
    return [1 / (1 + s2), s2 / (1 + s2)];
  }
  const r2 = 1 / (s * s);
  return [r2 / (1 + r2), 1 / (1 + r2)];
}

/** P(T ≤ −|t|) = ½·I_x(dof/2, ½), relatively accurate however small. */
function studentTTail(absT: number, dof: number): number {
  const [x, y] = tBetaArguments(absT, dof);
  return 0.5 * incompleteBeta(dof / 2, 0.5, x, y);
}

/** P(0 < T ≤ |t|) = ½·I_y(½, dof/2), relatively accurate for small |t|. */
function studentTCentral(absT: number, dof: number): number {
  const [x, y] = tBetaArguments(absT, dof);
  return 0.5 * incompleteBeta(0.5, dof / 2, y, x);
}

/** ln of the t density's normalizing constant, 1/(√dof·B(dof/2, ½)). */
function logTNormalizer(dof: number): number {
  return -logBeta(dof / 2, 0.5) - 0.5 * Math.log(dof);
}

/** Density of Student's t with `dof` degrees of freedom (dof > 0). */
export function studentTPdf(t: number, dof: number): number {
  requireFinite(t, 't');
  requireDof(dof, 0);
  if (dof > NORMAL_LIMIT_DOF) return INV_SQRT_2PI * Math.exp(-0.5 * t * t);
  return Math.exp(logTNormalizer(dof) - 0.5 * (dof + 1) * Math.log1p((t / Math.sqrt(dof)) ** 2));
}

/** P(T ≤ t) for Student's t with `dof` degrees of freedom (dof > 0; Infinity gives the normal). */
export function studentTCdf(t: number, dof: number): number {
  if (Number.isNaN(t)) throw new InputError('must be a number (got NaN)', { field: 't' });
  requireDof(dof, 0);
  if (dof > NORMAL_LIMIT_DOF) return normalCdf(t);
  if (t === 0) return 0.5;
  if (!Number.isFinite(t)) return t < 0 ? 0 : 1;
  const tail = studentTTail(Math.abs(t), dof);
  return t < 0 ? tail : 1 - tail;
}

/**
 * The t with P(T ≤ t) = p, for dof ≥ 1 (non-integer allowed; Infinity gives the normal).
 *
 * Start from G. W. Hill, "Algorithm 396: Student's t-quantiles", Comm. ACM 13 (1970) 619–620
 * (a few digits), then Halley steps on the CDF. The residual F(t) − p is formed from the
 * smaller tail, or from the central probability ½ − p near the median, so it stays accurate
 * relative to itself and the root is good to ~1e-15 relative.
 */
export function studentTQuantile(p: number, dof: number): number {
  requireProbability(p);
  requireDof(dof, 1);
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p === 0.5) return 0;
  if (dof > NORMAL_LIMIT_DOF) return normalQuantile(p);
  const q = p < 0.5 ? p : 1 - p; // exact
  const magnitude = lowerTailQuantileMagnitude(q, dof);
  return p < 0.5 ? -magnitude : magnitude;
}

/** s > 0 with P(T ≤ −s) = q, for 0 < q < ½. */
function lowerTailQuantileMagnitude(q: number, dof: number): number {
  if (dof === 1) return q < 0.25 ? 1 / Math.tan(Math.PI * q) : Math.tan(Math.PI * (0.5 - q)); // Cauchy: s = cot(πq)
  if (dof === 2) return (1 - 2 * q) / Math.sqrt(2 * q * (1 - q)); // inverts ½ − s/(2√(2 + s²)) = q
  const logNorm = logTNormalizer(dof);
  const centralTarget = 0.5 - q; // exact for q ≥ ¼, where it is used
  let t = -hillStart(2 * q, dof);
  for (let iteration = 0; iteration < 60; iteration++) {
    const residual = q < 0.25 ? studentTTail(-t, dof) - q : centralTarget - studentTCentral(-t, dof);
    if (residual === 0) return -t;
    const density = Math.exp(logNorm - 0.5 * (dof + 1) * Math.log1p((t / Math.sqrt(dof)) ** 2));
    const newton = residual / density;
    // Halley: f'/f = −(dof + 1)·t/(dof + t²) for the t density; plain Newton if that
    // correction is large (far from the root).
    const halley = 1 + 0.5 * newton * (dof + 1) * t / (dof + t * t);
    const step = halley > 0.5 && halley < 2 ? newton / halley : newton;
    let next = t - step;
    // Keep the iterate on the negative axis; far-tail densities can underflow.
    if (!(next < 0) || !Number.isFinite(next)) next = residual < 0 ? t / 2 : 2 * t;
    // Halley converges cubically, so after a step below 1e-12 the error left is rounding
    // noise in the residual; waiting for a smaller step could wait forever.
    if (Math.abs(next - t) <= 1e-12 * Math.abs(next)) return -next;
    t = next;
  }
  return -t;
}

/** Hill's (1970) approximation to the upper quantile with two-tailed probability P. */
function hillStart(P: number, n: number): number {
  const a = 1 / (n - 0.5);
  const b = 48 / (a * a);
  let c = ((20700 * a / b - 98) * a - 16) * a + 96.36;
  const d = ((94.5 / (b + c) - 3) / b + 1) * Math.sqrt(a * Math.PI / 2) * n;
  let y = Math.pow(d * P, 2 / n);
  if ((n < 2.1 && P > 0.5) || y > 0.05 + a) {
    // Asymptotic inverse expansion about the normal deviate.
    const x = normalQuantile(0.5 * P);
    y = x * x;
    if (n < 5) c += 0.3 * (n - 4.5) * (x + 0.6);
    c = (((0.05 * d * x - 5) * x - 7) * x - 2) * x + b + c;
    y = (((((0.4 * y + 6.3) * y + 36) * y + 94.5) / c - y - 3) / b + 1) * x;
    y = Math.expm1(a * y * y);
  } else {
    y = ((1 / (((n + 6) / (n * y) - 0.089 * d - 0.822) * (n + 2) * 3) + 0.5 / (n + 4)) * y - 1) * (n + 1) / (n + 2) + 1 / y;
  }
  return Math.sqrt(n * y);
}

// ---------------------------------------------------------------------------------------------
// Argument checks
// ---------------------------------------------------------------------------------------------

function requireProbability(p: number): void {
  requireFinite(p, 'p');
  if (p < 0 || p > 1) throw new InputError(`must lie in [0, 1] (got ${p})`, { field: 'p' });
}

function requirePositiveParameter(v: number, field: string): void {
  requireFinite(v, field);
  if (!(v > 0)) throw new InputError(`must be greater than zero (got ${v})`, { field });
}

function requireDof(dof: number, minimum: number): void {
  if (typeof dof !== 'number' || Number.isNaN(dof)) {
    throw new InputError(`must be a number (got ${String(dof)})`, { field: 'dof' });
  }
  const ok = minimum > 0 ? dof >= minimum : dof > 0;
  const bound = minimum > 0 ? `at least ${minimum}` : 'greater than zero';
  if (!ok) throw new InputError(`must be ${bound} (got ${dof})`, { field: 'dof' });
}
