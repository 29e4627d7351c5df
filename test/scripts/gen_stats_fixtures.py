#!/usr/bin/env python3
"""Writes test/fixtures/stats.json: reference values for src/shared/stats from SciPy / NumPy.

Run from the repository root:  python3 test/scripts/gen_stats_fixtures.py
The tests read the JSON only; Python is not needed to run them. Floats are written with
repr(), which round-trips every double exactly.
"""
import json
import platform
import sys
from pathlib import Path

import numpy as np
import scipy
from scipy import special, stats

OUT = Path(__file__).resolve().parent.parent / "fixtures" / "stats.json"

DOFS = [1, 2, 3, 5, 10, 30, 100, 1000, 1e5, 1e7]
PROBABILITIES = [1e-10, 1e-6, 1e-3, 0.025, 0.05, 0.1, 0.25, 0.3, 0.4, 0.5, 0.6, 0.75, 0.9,
                 0.95, 0.975, 0.99, 0.995, 0.999, 1 - 1e-6, 1 - 1e-10]
T_VALUES = [-1e6, -3000.0, -50.0, -10.0, -6.5, -4.0, -2.5, -1.7, -1.0, -0.3, -1e-3, -1e-8,
            0.0, 1e-5, 0.2, 0.7, 1.5, 2.228, 3.0, 8.0, 40.0]
NORMAL_X = [-37.0, -30.0, -20.0, -10.0, -8.0, -6.0, -5.656, -4.0, -2.5, -1.96, -1.0, -0.66291,
            -0.5, -0.1, -1e-9, 0.0, 1e-9, 0.3, 0.66, 0.9, 1.0, 1.6448536269514722, 2.0, 3.5,
            5.0, 5.7, 7.0, 8.0]
NORMAL_P = [1e-300, 1e-100, 1e-20, 1e-10, 1e-6, 1e-3, 0.01, 0.025, 0.05, 0.074, 0.076, 0.1, 0.2,
            0.3, 0.4, 0.45, 0.5, 0.55, 0.6, 0.7, 0.8, 0.9, 0.924, 0.926, 0.95, 0.975, 0.99,
            0.999, 1 - 1e-6, 1 - 1e-10]
# (a, b, x): small, moderate, both large, and the large-a / b = ½ corner the t tail uses.
BETAINC_CASES = [
    (0.5, 0.5, 0.3), (1.0, 1.0, 0.42), (2.0, 3.0, 0.2), (2.0, 3.0, 0.9), (0.1, 7.0, 0.01),
    (7.5, 0.25, 0.999), (5.0, 0.5, 0.5), (15.0, 4.0, 0.6), (15.0, 4.0, 0.95), (30.0, 30.0, 0.5),
    (30.0, 30.0, 0.3), (100.0, 250.0, 0.28), (1000.0, 1000.0, 0.49), (1000.0, 1000.0, 0.53),
    (5e6, 0.5, 1 - 4e-7), (5e6, 0.5, 1 - 1e-6), (0.5, 5e6, 3e-7), (50.0, 0.5, 0.9),
    (0.5, 50.0, 0.02), (3.0, 12.0, 1e-5),
]
GAMMALN_X = [1e-8, 0.1, 0.5, 0.9, 1.0, 1.5, 2.0, 2.5, 3.7, 7.0, 10.0, 12.5, 33.3, 100.0, 1e3,
             1e5, 5e6, -0.5, -2.3]
PERCENTILE_Q = [0.0, 2.5, 5.0, 10.0, 25.0, 33.3, 50.0, 66.7, 75.0, 90.0, 95.0, 97.5, 99.0, 100.0]


def main() -> None:
    rng = np.random.default_rng(20240611)
    arrays = [
        [3.0],
        [2.0, 1.0],
        [1.0, 2.0, 2.0, 3.0, 10.0],
        [-5.5, 4.25, 0.0, 1e-3, -1e-3, 7.75, 7.75],
        [float(v) for v in rng.normal(60.0, 15.0, size=17)],
        [float(v) for v in rng.standard_exponential(size=101)],
    ]
    fixture = {
        "generator": "test/scripts/gen_stats_fixtures.py",
        "versions": {"python": platform.python_version(), "scipy": scipy.__version__, "numpy": np.__version__},
        "t_ppf": [
            {"p": p, "dof": d, "value": float(stats.t.ppf(p, d))} for d in DOFS for p in PROBABILITIES
        ],
        "t_cdf": [
            {"t": t, "dof": d, "value": float(stats.t.cdf(t, d))} for d in DOFS for t in T_VALUES
        ],
        "norm_cdf": [{"x": x, "value": float(stats.norm.cdf(x))} for x in NORMAL_X],
        "norm_ppf": [{"p": p, "value": float(stats.norm.ppf(p))} for p in NORMAL_P],
        "betainc": [
            {"a": a, "b": b, "x": x, "value": float(special.betainc(a, b, x))} for a, b, x in BETAINC_CASES
        ],
        "gammaln": [{"x": x, "value": float(special.gammaln(x))} for x in GAMMALN_X],
        "percentile": [
            {
                "values": values,
                "q_percent": PERCENTILE_Q,
                # numpy.percentile divides q by 100 before interpolating; record that double.
                "p": [q / 100 for q in PERCENTILE_Q],
                "result": [float(v) for v in np.percentile(np.array(values), PERCENTILE_Q, method="linear")],
            }
            for values in arrays
        ],
    }
    OUT.parent.mkdir(parents=True, exist_ok=True)
    OUT.write_text(json.dumps(fixture, indent=1) + "\n")
    print(f"wrote {OUT} (python {platform.python_version()}, scipy {scipy.__version__}, numpy {np.__version__})",
          file=sys.stderr)


if __name__ == "__main__":
    main()
