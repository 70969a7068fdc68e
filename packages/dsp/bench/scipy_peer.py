#!/usr/bin/python3
"""The SciPy peer of analyzeDesign for the benchmark (bench/analysis.ts), Debian python3-scipy.

Reads {"cases": [...], "runs": n} on stdin (one case per demo spec: the spec's numbers, its analysis
range and its coefficient format) and times, per case, the linear pipeline a designer would script in
SciPy for the same spec: design F(s) (loop formulas), bilinear_zpk, the open-loop response on the same
600-point log grids (magnitude, unwrapped phase), gain and phase crossovers refined with brentq and
the margins there, the sections (zpk2sos) quantised to the coefficient format, and the radii of the
quantised poles. Writes the first call and the medians (wall and process CPU time) in ms as JSON.
The loop formulas and the margin search are the dsp tests' own SciPy reference (test/reference), so
the peer computes what the tests compare against, not a cut-down version.
"""
import os
import statistics
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "test", "reference"))

import numpy as np
from scipy import signal

from loop_formulas import bilinear_constant, filter_zpk, serve
from scipy_reference import margins, unwrap_from


def pipeline(case):
    fs, k, points = case["sampleRateHz"], case["kRadPerS"], case["points"]
    z, p, kf, _ = filter_zpk(case["filter"], k, case.get("rippleFilter"))
    loop_type = 1 + int(np.sum(np.abs(p) == 0))
    zd, pd, kd = signal.bilinear_zpk(z, p, kf, bilinear_constant(fs, case.get("prewarpHz")) / 2)
    pa = np.concatenate([p, [0.0]])
    pdd = np.concatenate([pd, [1.0]])

    def analog(f):
        return signal.freqs_zpk(z, pa, k * kf, worN=2 * np.pi * np.asarray(f, dtype=float))[1]

    def discrete(f):
        return signal.freqz_zpk(zd, pdd, k * kd / fs, worN=np.asarray(f, dtype=float), fs=fs)[1]

    grid_a = np.geomspace(case["fMinHz"], case["fMaxAnalogHz"], points)
    grid_d = np.geomspace(case["fMinHz"], fs / 2, points)
    grid_d[-1] = fs / 2
    out = {}
    for name, resp, grid in (("analog", analog, grid_a), ("discrete", discrete, grid_d)):
        h = resp(grid)
        out[name + "MagDb"] = 20 * np.log10(np.abs(h))
        out[name + "PhaseDeg"] = unwrap_from(h, loop_type)
        out[name] = margins(resp, grid, loop_type)
    scale = 2.0 ** case["coefficientFractionBits"]
    sos_q = np.round(signal.zpk2sos(zd, pd, kd) * scale) / scale
    out["poleRadii"] = [np.abs(np.roots(s[3:])).tolist() for s in sos_q]
    return out


def clocks():
    return time.perf_counter() * 1e3, time.process_time() * 1e3


def timed_case(case, runs):
    w0, c0 = clocks()
    first = pipeline(case)
    w1, c1 = clocks()
    wall, cpu = [], []
    for _ in range(runs):
        a = clocks()
        pipeline(case)
        b = clocks()
        wall.append(b[0] - a[0])
        cpu.append(b[1] - a[1])
    return {"firstCallMs": w1 - w0, "firstCallCpuMs": c1 - c0, "medianMs": statistics.median(wall),
            "cpuMedianMs": statistics.median(cpu), "runs": runs,
            "discreteCrossoverHz": first["discrete"]["crossoverHz"], "discretePhaseMarginDeg": first["discrete"]["phaseMarginDeg"]}


if __name__ == "__main__":
    runs = int(os.environ.get("LW_SCIPY_PEER_RUNS", "200"))
    serve({"cases": lambda c: timed_case(c, runs)},
          {"scipyVersion": __import__("scipy").__version__, "numpyVersion": np.__version__})
