"""Peer of the engine's dense solve for `npm run bench`: LAPACK's dgesv through numpy.

Reads an n x n row-major float64 matrix and an n x k right-hand side (k columns, row-major), times
numpy.linalg.solve on them (one warm-up call, then --repeat timed calls), writes the solution
beside the input and prints one JSON line: the times in ms, the BLAS library numpy has loaded,
the thread count it may use and, with --cond, the 1-norm condition number of the matrix.
Usage: python3 dense_solve_peer.py MATRIX.f64 RHS.f64 N K SOLUTION.f64 [--repeat 9] [--cond]
"""
import json
import os
import sys
import time

import numpy as np


def loaded_blas():
    """The BLAS/LAPACK shared libraries this process has mapped (which one numpy really uses)."""
    libs = set()
    with open("/proc/self/maps") as maps:
        for line in maps:
            path = line.split()[-1]
            name = os.path.basename(path)
            if "blas" in name or "lapack" in name:
                libs.add(os.path.realpath(path))
    return sorted(libs)


def main():
    matrix, rhs, n, k, out = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4]), sys.argv[5]
    repeat = int(sys.argv[sys.argv.index("--repeat") + 1]) if "--repeat" in sys.argv else 9
    a = np.fromfile(matrix, dtype="<f8").reshape(n, n)
    b = np.fromfile(rhs, dtype="<f8").reshape(n, k)
    x = np.linalg.solve(a, b)  # warm-up: loads LAPACK, starts the BLAS threads
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        x = np.linalg.solve(a, b)
        times.append((time.perf_counter() - t0) * 1000)
    np.ascontiguousarray(x).astype("<f8").tofile(out)
    cond1 = float(np.linalg.cond(a, 1)) if "--cond" in sys.argv else None
    threads = os.environ.get("OPENBLAS_NUM_THREADS") or os.environ.get("OMP_NUM_THREADS") or str(os.cpu_count())
    print(json.dumps({"times_ms": times, "numpy": np.__version__, "blas": loaded_blas(), "threads": threads, "cond1": cond1}))


if __name__ == "__main__":
    main()
