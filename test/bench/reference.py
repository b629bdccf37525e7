#!/usr/bin/env python3
"""Reference timings for the Couplet benchmark harness (test/bench/core-bench.ts).

Reads a JSON manifest of problems the harness generated (arrays as .npy files in a
temporary folder), solves each with numpy/scipy, and writes a JSON file of timings
and values. The harness starts this script with single-threaded BLAS
(OMP/OPENBLAS/MKL_NUM_THREADS=1) so that both sides use one core.

Usage:
    python3 reference.py --describe            # versions and BLAS, as JSON on stdout
    python3 reference.py MANIFEST.json OUT.json

What each case kind runs (wall time with time.perf_counter and, beside it, the process's CPU time with
time.process_time, which leaves out time spent waiting for a core):
- "assignment":  scipy.optimize.linear_sum_assignment(C); value = sum of C[i, col[i]].
- "transport-lp": scipy.optimize.linprog(method="highs") on the transportation LP
  min <C, P> s.t. P 1 = a, P^T 1 = b, P >= 0, with a sparse (n+m) x nm constraint
  matrix built before timing; value = the LP optimum.
- "sinkhorn-iterations": a plain numpy Sinkhorn run for a fixed number of iterations,
  kernel form (u = a / (K v), v = b / (K^T u), K = exp(-C/eps)) or log form
  (scipy.special.logsumexp), timed at `iterations` and at 2 x `iterations`; the time
  per iteration is the median paired difference divided by `iterations`, so the
  one-off setup (K = exp(-C/eps), copies) cancels out.
- "sinkhorn-tolerance": the kernel form run until the marginal error
  max(|P1 - a|_1 / |a|_1, |P^T 1 - b|_1 / |b|_1) <= tolerance, checked every
  iteration (after the v update the column marginals are exact, so the error is that of
  the rows, and the K v product it needs is reused by the next u update).

Both Sinkhorn forms follow core/sinkhorn.ts step for step, so that the iterates are
the same in exact arithmetic: start from f = 0 (u = a in the kernel form) with g
brought up to date (v = b / (K^T u)); one iteration then updates f (u), then g (v).
The time-to-tolerance loop measures the error of the current state before each
update and stops on that state, counting iterations as Couplet does.
The value reported is the dual value <f, a> + <g, b>, with f = eps log(u / a) and
g = eps log(v / b) in the kernel form; after a g update P has total mass 1, so this is
the entropic dual objective.
"""

import json
import os
import platform
import statistics
import sys
import time

import numpy as np
import scipy
import scipy.sparse
from scipy.optimize import linear_sum_assignment, linprog
from scipy.special import logsumexp


def describe():
    """Versions and the BLAS that threadpoolctl reports (if installed)."""
    info = {
        "python": platform.python_version(),
        "numpy": np.__version__,
        "scipy": scipy.__version__,
        "threads": {k: os.environ.get(k) for k in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS")},
        "openblasCoretype": os.environ.get("OPENBLAS_CORETYPE"),
        "blas": None,
    }
    try:
        import threadpoolctl

        info["blas"] = [
            {
                "api": pool.get("internal_api"),
                "kernel": pool.get("architecture"),
                "version": pool.get("version"),
                "threads": pool.get("num_threads"),
            }
            for pool in threadpoolctl.threadpool_info()
            if pool.get("user_api") == "blas"
        ]
    except ImportError:
        info["blas"] = "threadpoolctl not installed"
    return info


WARM_UP_SECONDS = 0.25
WARM_UP_RUNS = 20


def clock(run):
    """(wall seconds, CPU seconds of the process, value) of one call."""
    cpu = time.process_time()
    wall = time.perf_counter()
    value = run()
    return time.perf_counter() - wall, time.process_time() - cpu, value


def warm_up(run):
    """At least one run, more while under WARM_UP_SECONDS in all (at most WARM_UP_RUNS).

    The same rule as warmUp in median-time.ts. Returns (first run's wall and CPU
    seconds, last value).
    """
    begin = time.perf_counter()
    wall, cpu, value = clock(run)
    runs = 1
    while runs < WARM_UP_RUNS and time.perf_counter() - begin < WARM_UP_SECONDS:
        value = run()
        runs += 1
    return (wall, cpu), value


def timed(run, repetitions, budget_seconds, long_seconds):
    """Median wall (and CPU) time of `run` after the warm-up, as a result dict.

    The first warm-up run is timed: if it alone took more than `long_seconds`, it is the
    only sample (so a five-minute LP is not run four more times). Otherwise up to
    `repetitions` more runs, at least 3, fewer when the budget allows fewer.
    """
    (first, first_cpu), value = warm_up(run)
    if first > long_seconds:
        return {"seconds": first, "samples": [first], "cpuSeconds": first_cpu, "singleRun": True, "value": value}
    count = max(3, min(repetitions, int(budget_seconds / max(first, 1e-9))))
    samples = []
    cpu = []
    for _ in range(count):
        wall, used, value = clock(run)
        samples.append(wall)
        cpu.append(used)
    return {"seconds": statistics.median(samples), "samples": samples, "cpuSeconds": statistics.median(cpu), "singleRun": False, "value": value}


def load(folder, name):
    return np.load(os.path.join(folder, name))


def run_assignment(case, folder):
    C = load(folder, case["files"]["C"])

    def run():
        rows, cols = linear_sum_assignment(C)
        return float(C[rows, cols].sum())

    return timed(run, case["repetitions"], case["budgetSeconds"], case["longSeconds"])


def transport_constraints(n, m):
    """Sparse (n+m) x nm equality matrix: rows sums (first n) then column sums."""
    k = np.arange(n * m)
    rows = np.concatenate([k // m, n + (k % m)])
    cols = np.concatenate([k, k])
    data = np.ones(2 * n * m)
    return scipy.sparse.csr_matrix((data, (rows, cols)), shape=(n + m, n * m))


def run_transport_lp(case, folder):
    C = load(folder, case["files"]["C"])
    a = load(folder, case["files"]["a"])
    b = load(folder, case["files"]["b"])
    n, m = C.shape
    A = transport_constraints(n, m)
    rhs = np.concatenate([a, b])
    cost = C.ravel()
    options = {"time_limit": float(case["timeLimitSeconds"])}
    status = {}

    def run():
        result = linprog(cost, A_eq=A, b_eq=rhs, bounds=(0, None), method="highs", options=options)
        status["status"] = int(result.status)
        status["message"] = str(result.message)
        status["iterations"] = int(getattr(result, "nit", -1))
        return float(result.fun) if result.status == 0 else float("nan")

    return {**timed(run, case["repetitions"], case["budgetSeconds"], case["longSeconds"]), **status}


def sinkhorn_kernel(K, a, b, iterations):
    """Fixed number of kernel Sinkhorn iterations from u = a (f = 0), v its target update."""
    u = a.copy()
    v = b / (K.T @ u)
    for _ in range(iterations):
        u = a / (K @ v)
        v = b / (K.T @ u)
    return u, v


def sinkhorn_log(C, Ct, a, b, eps, iterations):
    """Fixed number of log-domain iterations with scipy.special.logsumexp."""
    log_a = np.log(a)
    log_b = np.log(b)
    f = np.zeros(C.shape[0])
    g = -eps * logsumexp((f[None, :] - Ct) / eps + log_a[None, :], axis=1)
    for _ in range(iterations):
        f = -eps * logsumexp((g[None, :] - C) / eps + log_b[None, :], axis=1)
        g = -eps * logsumexp((f[None, :] - Ct) / eps + log_a[None, :], axis=1)
    return f, g


def kernel_dual(u, v, a, b, eps):
    return float(eps * (np.dot(np.log(u / a), a) + np.dot(np.log(v / b), b)))


def run_sinkhorn_iterations(case, folder):
    C = load(folder, case["files"]["C"])
    a = load(folder, case["files"]["a"])
    b = load(folder, case["files"]["b"])
    eps = float(case["epsilon"])
    k = int(case["iterations"])
    domain = case["domain"]

    if domain == "kernel":

        def solve(count):
            K = np.exp(-C / eps)
            u, v = sinkhorn_kernel(K, a, b, count)
            return kernel_dual(u, v, a, b, eps)

    else:

        def solve(count):
            # A contiguous transpose makes the g update a row-wise reduction like the f one.
            Ct = np.ascontiguousarray(C.T)
            f, g = sinkhorn_log(C, Ct, a, b, eps, count)
            return float(np.dot(f, a) + np.dot(g, b))

    _, value = warm_up(lambda: solve(k))
    differences = []
    cpu_differences = []
    totals = []
    repetitions = max(3, int(case["repetitions"]))
    for _ in range(repetitions):
        short, short_cpu, value = clock(lambda: solve(k))
        long, long_cpu, _ = clock(lambda: solve(2 * k))
        differences.append((long - short) / k)
        cpu_differences.append((long_cpu - short_cpu) / k)
        totals.append(short)
    return {
        "seconds": statistics.median(differences),
        "samples": differences,
        "cpuSeconds": statistics.median(cpu_differences),
        "singleRun": False,
        "value": value,
        "iterations": k,
        "totalSeconds": statistics.median(totals),
    }


def sinkhorn_to_tolerance(C, a, b, eps, tolerance, max_iterations):
    K = np.exp(-C / eps)
    norm_a = np.abs(a).sum()
    u = a.copy()
    v = b / (K.T @ u)
    error = float("inf")
    iterations = 0
    while iterations < max_iterations:
        # Column marginals are exact after a v update; the row error needs K v, which the
        # next u update reuses.
        Kv = K @ v
        error = float(np.abs(u * Kv - a).sum() / norm_a)
        iterations += 1
        if error <= tolerance:
            break
        u = a / Kv
        v = b / (K.T @ u)
    return u, v, iterations, error


def run_sinkhorn_tolerance(case, folder):
    C = load(folder, case["files"]["C"])
    a = load(folder, case["files"]["a"])
    b = load(folder, case["files"]["b"])
    eps = float(case["epsilon"])
    state = {}

    def run():
        u, v, iterations, error = sinkhorn_to_tolerance(C, a, b, eps, float(case["tolerance"]), int(case["maxIterations"]))
        state["iterations"] = iterations
        state["marginalError"] = error
        return kernel_dual(u, v, a, b, eps)

    return {**timed(run, case["repetitions"], case["budgetSeconds"], case["longSeconds"]), **state}


RUNNERS = {
    "assignment": run_assignment,
    "transport-lp": run_transport_lp,
    "sinkhorn-iterations": run_sinkhorn_iterations,
    "sinkhorn-tolerance": run_sinkhorn_tolerance,
}


def main(argv):
    if len(argv) == 2 and argv[1] == "--describe":
        print(json.dumps(describe()))
        return 0
    if len(argv) != 3:
        print(__doc__, file=sys.stderr)
        return 2
    manifest_path, out_path = argv[1], argv[2]
    with open(manifest_path) as handle:
        manifest = json.load(handle)
    folder = os.path.dirname(os.path.abspath(manifest_path))
    results = []
    for case in manifest["cases"]:
        try:
            result = RUNNERS[case["kind"]](case, folder)
        except Exception as error:  # reported per case; the harness prints it
            result = {"error": f"{type(error).__name__}: {error}"}
        result["id"] = case["id"]
        results.append(result)
    with open(out_path, "w") as handle:
        json.dump({"environment": describe(), "results": results}, handle)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
