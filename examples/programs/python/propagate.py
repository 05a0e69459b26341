#!/usr/bin/env python3
"""A user's own simulation in Python, integrated by SciPy's solve_ivp, answering the
stepgauge-program protocol (protocol: lines): one JSON request per line on stdin, one JSON
response per line on stdout, for as long as stdin stays open. The process starts once per sweep,
so SciPy's import (a large part of a short run) is paid once.

    python3 propagate.py --method DOP853     (or Radau, RK45, BDF, LSODA)

Models, by problem id: the Van der Pol oscillator (van-der-pol, van-der-pol-stiff), and two-body
point-mass gravity for anything else (parameters.mu, default 1; state positions then velocities).
"""
import json
import math
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp


def model(problem):
    pid = problem["id"]
    if pid in ("van-der-pol", "van-der-pol-stiff"):
        mu = problem["parameters"].get("mu", 1000.0 if pid.endswith("stiff") else 1.0)

        def f(t, y):
            return [y[1], mu * (1.0 - y[0] * y[0]) * y[1] - y[0]]

        def jac(t, y):
            return [[0.0, 1.0], [-2.0 * mu * y[0] * y[1] - 1.0, mu * (1.0 - y[0] * y[0])]]

        return f, jac
    mu = problem["parameters"].get("mu", 1.0)
    dim = len(problem["y0"]) // 2

    def f(t, y):
        r = y[:dim]
        k = -mu / np.dot(r, r) ** 1.5
        return np.concatenate((y[dim:], k * r))

    return f, None


def solve(request, method):
    problem = request["problem"]
    setting = request["setting"]
    f, jac = model(problem)
    options = {"rtol": setting["rtol"], "atol": setting["atol"]}
    if jac is not None and method in ("Radau", "BDF", "LSODA"):
        options["jac"] = jac
    started = time.perf_counter()
    sol = solve_ivp(f, (problem["t0"], problem["tEnd"]), problem["y0"], method=method, **options)
    seconds = time.perf_counter() - started
    response = {
        "status": "ok" if sol.status == 0 else "error",
        "times": sol.t.tolist(),
        "states": sol.y.T.tolist(),
        # solve_ivp reports evaluations, Jacobians and LU decompositions, not its step counts.
        "counts": {"nfev": int(sol.nfev), "njev": int(sol.njev), "nlu": int(sol.nlu)},
        "seconds": seconds,
    }
    if sol.status != 0:
        response["message"] = sol.message
    return response


def main():
    method = sys.argv[sys.argv.index("--method") + 1] if "--method" in sys.argv else "DOP853"
    for line in sys.stdin:
        if not line.strip():
            continue
        try:
            response = solve(json.loads(line), method)
        except Exception as e:  # an answer, never a dead process
            response = {"status": "error", "message": f"{type(e).__name__}: {e}"}
        sys.stdout.write(json.dumps(response) + "\n")
        sys.stdout.flush()


if __name__ == "__main__":
    main()
