"""Reference fits for test/fit-scipy.test.ts, computed with SciPy's curve_fit.

Run from the project root:  python3 test/scripts/gen_fit_fixtures.py
Writes test/fixtures/fit-scipy.json (committed; the tests need no Python).

The series are synthetic (seeded NumPy noise on known declines); the reference is SciPy's answer on them,
not the truth. curve_fit is given the analytic Jacobian and tight tolerances so that its optimum and its
covariance (pcov = s^2 (J^T W J)^-1, absolute_sigma=False) are accurate to far better than the 1e-6 / 1e-4
agreement the tests ask for. Each fit is repeated in years and checked against the SI fit before writing.
"""
import json
import sys

import numpy as np
import scipy
from scipy.optimize import curve_fit

YEAR = 365.25 * 86400.0
WEEK = 7 * 86400.0


def exponential(x, theta0, tau):
    return theta0 * np.exp(-x / tau)


def exponential_jac(x, theta0, tau):
    e = np.exp(-x / tau)
    return np.column_stack([e, theta0 * e * x / tau**2])


def floor(x, theta0, tau, theta_inf):
    return theta_inf + (theta0 - theta_inf) * np.exp(-x / tau)


def floor_jac(x, theta0, tau, theta_inf):
    e = np.exp(-x / tau)
    return np.column_stack([e, (theta0 - theta_inf) * e * x / tau**2, 1 - e])


def hyperbolic(x, theta0, tau, b):
    return theta0 * np.exp(-np.log1p(b * x / tau) / b)


def hyperbolic_jac(x, theta0, tau, b):
    s = x / tau
    u = 1 + b * s
    g = np.exp(-np.log1p(b * s) / b)
    f = theta0 * g
    db = np.log1p(b * s) / b**2 - s / (b * u)
    return np.column_stack([g, f * s / (tau * u), f * db])


MODELS = {
    "exponential": (exponential, exponential_jac, ["theta0", "tau"]),
    "floor": (floor, floor_jac, ["theta0", "tau", "thetaInf"]),
    "hyperbolic": (hyperbolic, hyperbolic_jac, ["theta0", "tau", "b"]),
}


def fit(model, x, y, p0, sigma=None):
    f, jac, _ = MODELS[model]
    popt, pcov = curve_fit(f, x, y, p0=p0, sigma=sigma, jac=jac, method="lm",
                           ftol=1e-15, xtol=1e-15, gtol=1e-15, maxfev=200000)
    return popt, pcov


def make_case(name, model, basis, x, truth, noise_k, rng, weights=None, unit_scale=YEAR):
    f, _, names = MODELS[model]
    y = f(x, *truth)
    if weights is None:
        y = y + rng.normal(0.0, noise_k, size=x.size)
        sigma = None
    else:
        y = y + rng.normal(0.0, 1.0, size=x.size) / np.sqrt(weights)
        sigma = 1.0 / np.sqrt(weights)
    p0 = [v * (1.1 if i == 1 else 1.0) for i, v in enumerate(truth)]
    popt, pcov = fit(model, x, y, p0, sigma)
    # The same fit in scaled units must give the same optimum: guards against a poorly converged SI fit.
    scaled = np.array(truth, dtype=float)
    scaled[1] /= unit_scale
    popt2, pcov2 = fit(model, x / unit_scale, y, list(scaled * np.array([1, 1.1] + [1] * (len(truth) - 2))), sigma)
    popt2[1] *= unit_scale
    assert np.allclose(popt, popt2, rtol=1e-9, atol=0), (name, popt, popt2)
    perr = np.sqrt(np.diag(pcov))
    perr2 = np.sqrt(np.diag(pcov2)) * np.array([unit_scale if i == 1 else 1 for i in range(len(truth))])
    assert np.allclose(perr, perr2, rtol=1e-7), (name, perr, perr2)
    case = {
        "name": name, "model": model, "basis": basis,
        "truth": dict(zip(names, map(float, truth))),
        "x": [float(v) for v in x], "theta": [float(v) for v in y],
        "popt": dict(zip(names, map(float, popt))),
        "perr": dict(zip(names, map(float, perr))),
        "pcov": [[float(v) for v in row] for row in pcov],
        "sse": float(np.sum(((y - f(x, *popt)) / (1 if sigma is None else sigma)) ** 2)),
    }
    if weights is not None:
        case["weights"] = [float(v) for v in weights]
    return case


def main():
    rng = np.random.default_rng(20261201)
    cases = []
    weekly10 = np.arange(520) * WEEK
    cases.append(make_case("exponential, 10 years weekly", "exponential", "time", weekly10,
                           [60.0, 30 * YEAR], 0.4, rng))
    cases.append(make_case("exponential, 12 points", "exponential", "time", np.arange(12) * 30 * 86400.0,
                           [45.0, 4 * YEAR], 0.3, rng))
    cases.append(make_case("floor, 12 years weekly", "floor", "time", np.arange(624) * WEEK,
                           [70.0, 6 * YEAR, 20.0], 0.5, rng))
    cases.append(make_case("hyperbolic, 15 years weekly", "hyperbolic", "time", np.arange(780) * WEEK,
                           [55.0, 8 * YEAR, 0.6], 0.3, rng))
    cases.append(make_case("hyperbolic, 1500 points", "hyperbolic", "time", np.linspace(0, 20 * YEAR, 1500),
                           [80.0, 5 * YEAR, 1.1], 0.5, rng))
    weights = rng.uniform(1.0, 25.0, size=520)
    cases.append(make_case("exponential, weighted", "exponential", "time", weekly10 + 3 * 86400.0,
                           [50.0, 12 * YEAR], None, rng, weights=weights))
    # Irregular readings with gaps (shut-ins removed), not starting at zero.
    t = np.sort(rng.uniform(0.5 * YEAR, 9 * YEAR, size=300))
    t = t[(t < 3 * YEAR) | (t > 3.5 * YEAR)]
    cases.append(make_case("floor, irregular with a gap", "floor", "time", t, [62.0, 3 * YEAR, 35.0], 0.6, rng))
    # Mass basis: flow 40, then 55, then 30 kg/s; theta decays with cumulative produced mass (DOMAIN §4).
    flow = np.concatenate([np.full(200, 40.0), np.full(150, 55.0), np.full(170, 30.0)])
    mass = np.concatenate([[0.0], np.cumsum(flow[:-1] * WEEK)])
    cases.append(make_case("exponential, mass basis, three flow rates", "exponential", "mass", mass,
                           [58.0, 2.5e10], 0.4, rng, unit_scale=1e9))
    out = {
        "generator": "test/scripts/gen_fit_fixtures.py",
        "scipy": scipy.__version__, "numpy": np.__version__, "python": sys.version.split()[0],
        "method": "scipy.optimize.curve_fit(method='lm', jac=analytic, ftol=xtol=gtol=1e-15, absolute_sigma=False)",
        "cases": cases,
    }
    with open("test/fixtures/fit-scipy.json", "w") as fh:
        json.dump(out, fh, indent=1)
    print(f"wrote {len(cases)} cases with SciPy {scipy.__version__}")


if __name__ == "__main__":
    main()
