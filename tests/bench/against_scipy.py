#!/usr/bin/env python3
"""Reshuffle against scipy.stats on the same data and the same work, timed in one run.

    cargo build --release
    python3 tests/bench/against_scipy.py [path/to/reshuffle]

Needs numpy and scipy (pip install numpy scipy); says so and stops when they are missing.
Each line times the whole command (process start, reading the file, the test or interval and
writing the report) against scipy's vectorised call on arrays already in memory, best of
three, and prints the ratio. This is a benchmark, never a test: nothing here can fail a build.
"""

import os
import subprocess
import sys
import tempfile
import time

try:
    import numpy as np
    import scipy
    from scipy import stats
except ImportError:
    sys.exit("numpy and scipy are needed: pip install numpy scipy")

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
EXE = sys.argv[1] if len(sys.argv) > 1 else os.path.join(ROOT, "target", "release", "reshuffle")


def best(f, reps=3):
    times = []
    for _ in range(reps):
        t0 = time.perf_counter()
        f()
        times.append(time.perf_counter() - t0)
    return min(times)


def command(args):
    def run():
        subprocess.run([EXE] + args, check=True, stdout=subprocess.DEVNULL)
    return run


def main():
    rng = np.random.default_rng(20261203)
    tmp = tempfile.mkdtemp()
    a = 10.0 + 3.0 * rng.random(24)
    b = 9.5 + 3.0 * rng.random(20)
    two = os.path.join(tmp, "two.csv")
    with open(two, "w") as f:
        f.write("y,g\n")
        f.writelines(f"{float(v)!r},a\n" for v in a)
        f.writelines(f"{float(v)!r},b\n" for v in b)
    x = 5.0 + 3.0 * rng.random(1000)
    one = os.path.join(tmp, "one.csv")
    with open(one, "w") as f:
        f.write("y\n")
        f.writelines(f"{float(v)!r}\n" for v in x)

    def mean_diff(u, v, axis):
        return np.mean(u, axis=axis) - np.mean(v, axis=axis)

    rows = []
    s = best(lambda: stats.permutation_test(
        (a, b), mean_diff, vectorized=True, n_resamples=10**6, batch=10**5,
        permutation_type="independent", random_state=1))
    r = best(command(["analyze", two, "--exact-limit", "0", "--resamples", "1000000",
                      "--bootstrap", "200", "--seed", "1", "--json"]))
    rows.append(("10^6 random relabellings, 24 + 20 values", r, s))

    s = best(lambda: stats.bootstrap((x,), np.mean, n_resamples=10**5, method="BCa",
                                     vectorized=True, batch=10**4, random_state=1))
    r = best(command(["estimate", one, "--value", "y", "--estimate", "mean",
                      "--interval", "bca", "--resamples", "100000", "--seed", "1", "--json"]))
    rows.append(("BCa interval of a mean, n = 1000, 10^5 resamples", r, s))

    print(f"numpy {np.__version__}, scipy {scipy.__version__}, {os.cpu_count()} cores")
    for name, r, s in rows:
        print(f"  {name:<50} Reshuffle {r:7.3f} s, scipy {s:7.3f} s: {s / r:6.1f}x")


if __name__ == "__main__":
    main()
