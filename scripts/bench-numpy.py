"""The reference a physicist would write: a vectorised per-cell Poisson bootstrap in numpy.

python3 scripts/bench-numpy.py FILE DIMENSION METHOD [RESAMPLES] [SEED] [CONFIDENCE]
Reads the long-form counts CSV (basis,outcome_a,outcome_b,counts), draws every cell of the bases
the method uses with numpy.random.default_rng(seed).poisson, evaluates the plug-in statistic per
replicate and prints the point value and the (1 - confidence) percentile as JSON. A speed
reference for `npm run bench` only: for the fidelity method it is not a valid bound.
"""
import json
import sys

import numpy as np

BASES = {"mub-correlation": [0, 1, 2], "steering-2mub": [0, 1], "fidelity-two-basis": [0, 1]}


def read_tables(path, d, bases):
    rows = np.loadtxt(path, delimiter=",", comments="#", skiprows=1, dtype=np.int64, ndmin=2)
    tables = np.zeros((len(bases), d, d))
    for i, t in enumerate(bases):
        sel = rows[rows[:, 0] == t]
        tables[i, sel[:, 1], sel[:, 2]] = sel[:, 3]
    return tables


def matching_sum(x):
    # x: (R, bases, d, d) counts -> sum over bases of the matching fraction
    diag = np.trace(x, axis1=-2, axis2=-1)
    return (diag / x.sum(axis=(-2, -1))).sum(axis=-1)


def fidelity(x, d):
    # F~ = (1/d)[P0 + d P1 - 1 - Gamma], Gamma over the cyclic differences of the computational table
    p0 = x[:, 0] / x[:, 0].sum(axis=(-2, -1))[:, None, None]
    diag1 = np.trace(x[:, 1], axis1=-2, axis2=-1) / x[:, 1].sum(axis=(-2, -1))
    a = np.arange(d)
    shifted = np.stack([p0[:, a, (a - k) % d] for k in range(1, d)], axis=1)  # (R, d-1, d)
    gamma = (np.sqrt(shifted).sum(axis=-1) ** 2 - shifted.sum(axis=-1)).sum(axis=-1)
    return (np.trace(p0, axis1=-2, axis2=-1) + d * diag1 - 1 - gamma) / d


def main():
    path, d, method = sys.argv[1], int(sys.argv[2]), sys.argv[3]
    resamples = int(sys.argv[4]) if len(sys.argv) > 4 else 10000
    seed = int(sys.argv[5]) if len(sys.argv) > 5 else 1
    confidence = float(sys.argv[6]) if len(sys.argv) > 6 else 0.99865
    tables = read_tables(path, d, BASES[method])
    statistic = (lambda x: fidelity(x, d)) if method == "fidelity-two-basis" else matching_sum
    rng = np.random.default_rng(seed)
    block = max(1, int(2e7 // tables.size))  # bounded memory: at most ~2e7 cells per block
    reps = []
    for start in range(0, resamples, block):
        n = min(block, resamples - start)
        reps.append(statistic(rng.poisson(tables, size=(n,) + tables.shape).astype(np.float64)))
    reps = np.concatenate(reps)
    point = float(statistic(tables[None])[0])
    lower = float(np.percentile(reps, 100 * (1 - confidence)))
    print(json.dumps({"method": method, "d": d, "value": point, "lower": lower, "resamples": resamples}))


if __name__ == "__main__":
    main()
