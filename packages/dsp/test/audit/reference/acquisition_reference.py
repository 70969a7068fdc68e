#!/usr/bin/python3
"""Independent measurement of the acquisition figures (lock-in, pull-out, hold-in, pull-in) for the audit.

Reads {"acquisition": [{"spec": spec, "phasesDeg": [...], "limitHz": x}, ...]} (JSON) on stdin and
writes per spec the bracket [passHz, failHz] of each figure (failHz null when the loop still passes at
limitHz). Nothing here reads or mirrors the TypeScript: the loop is not the sampled loop at all but the
classic phase-domain model of the nonlinear analog loop (G3 Ch. 2), integrated with
scipy.integrate.solve_ivp:

    theta_e' = 2 pi df(t) - Ko y,   y = F(s) applied to u,   u = Kd sin(theta_e)

with Kd = A/2 (multiplier detector, the double-frequency term dropped), Ko = 2 pi gainHzPerUnit and F(s)
(loop filter and ripple filter) from loop_formulas.filter_zpk as a state space (scipy.signal.zpk2ss).
The definitions are the ones the dsp README states (after Ku23): a cycle slip is
sup|theta_e(t) - theta_e(0)| >= 2 pi; locked at the end means theta_e moves less than 0.1 rad over the
last 20 % of the run; run lengths are 60/(zeta wn) (plus the ramp, plus three pull-in times
dw^2/(2 zeta wn^3), G3), clamped to [2000, 400000] loop samples (the hold-in run to 1.6e6).
Many offsets and initial phases are integrated at once as one stacked system; a figure is the edge
between passing and failing offsets, found on a 24-point grid refined once more on 24 points.
"""
import math
import os
import sys

import numpy as np
from scipy import integrate, signal

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "reference"))
from loop_formulas import filter_zpk, serve, time_constants

GRID = 24
MIN_RUN, MAX_RUN = 2000, 400000
LOCKED_SPAN_RAD = 0.1


def time_scale(spec, k, dc):
    """wn (rad/s) and zeta of the second-order part (G3 Ch. 2, B6); else K F(0) and 0.7."""
    f = spec["filter"]
    kind = f["kind"]
    if kind == "single-pole" or (kind == "butterworth" and f["order"] == 1):
        tau = 1 / (2 * math.pi * f["cutoffHz"])
        return math.sqrt(k / tau), 1 / (2 * math.sqrt(k * tau))
    if kind in ("lag-lead", "pi"):
        t1, t2 = time_constants(kind, f, k)
        if kind == "pi":
            wn = math.sqrt(k / t1)
            return wn, wn * t2 / 2
        wn = math.sqrt(k / (t1 + t2))
        return wn, (wn / 2) * (t2 + 1 / k)
    return k * abs(dc), 0.7


class Loop:
    def __init__(self, spec):
        self.fs = spec["sampleRateHz"]
        self.kd = spec["input"]["amplitude"] / 2.0
        self.ko = 2 * math.pi * spec["nco"]["gainHzPerUnit"]
        k = self.kd * self.ko
        z, p, g, _ = filter_zpk(spec["filter"], k, spec.get("rippleFilter"))
        a, b, c, d = signal.zpk2ss(z, p, g)
        self.a, self.b, self.c, self.d = np.real(a), np.real(b).ravel(), np.real(c).ravel(), float(np.real(d).ravel()[0])
        self.n = self.a.shape[0]
        dc = None if np.any(np.abs(p) < 1e-12) else float(np.real(g * np.prod(-z) / np.prod(-p)))
        self.wn, self.zeta = time_scale(spec, k, dc)
        self.settle = 60 / (self.zeta * self.wn)

    def seconds(self, s, cap=MAX_RUN):
        return min(cap, max(MIN_RUN, math.ceil(s * self.fs))) / self.fs

    def run(self, theta0, df_of_t, t_end, slip_rad):
        """Integrate the stacked trials; per trial: slipped before its end, locked over its last 20 %."""
        m = len(theta0)
        n = self.n
        t_max = float(np.max(t_end))

        def rhs(t, y):
            x = y[: n * m].reshape(n, m)
            th = y[n * m:]
            u = self.kd * np.sin(th)
            out = self.c @ x + self.d * u
            dx = self.a @ x + np.outer(self.b, u)
            return np.concatenate([dx.ravel(), 2 * math.pi * df_of_t(t) - self.ko * out])

        y0 = np.concatenate([np.zeros(n * m), theta0])
        t_eval = np.linspace(0, t_max, 3001)
        sol = integrate.solve_ivp(rhs, (0, t_max), y0, t_eval=t_eval, rtol=1e-6, atol=1e-8, max_step=t_max / 300)
        th = sol.y[n * m:]
        slipped = np.zeros(m, dtype=bool)
        locked = np.zeros(m, dtype=bool)
        for i in range(m):
            inside = sol.t <= t_end[i] + 1e-15
            e = th[i, inside]
            slipped[i] = np.max(np.abs(e - theta0[i])) >= slip_rad
            tail = e[sol.t[inside] >= 0.8 * t_end[i]]
            locked[i] = (np.max(tail) - np.min(tail)) < LOCKED_SPAN_RAD
        return slipped, locked


def edge(lo, hi, passes):
    """Refine [lo, hi] twice on GRID points; `passes(offsets)` -> bool array, monotone (pass below)."""
    for _ in range(2):
        grid = np.linspace(lo, hi, GRID + 1)[1:]
        ok = passes(grid)
        fails = np.nonzero(~ok)[0]
        if len(fails) == 0:
            return {"passHz": float(hi), "failHz": None}
        first = fails[0]
        hi = float(grid[first])
        lo = float(grid[first - 1]) if first > 0 else lo
    return {"passHz": lo, "failHz": hi}


def measure(case):
    spec = case["spec"]
    loop = Loop(spec)
    phases = np.radians(np.array(case["phasesDeg"], dtype=float))
    limit = case["limitHz"]
    np_ = len(phases)

    def lock_in(offsets):
        t = loop.seconds(loop.settle)
        th0 = np.tile(phases, len(offsets))
        df = np.repeat(offsets, np_)
        slipped, locked = loop.run(th0, lambda _t: df, np.full(len(th0), t), 2 * math.pi)
        return (~slipped & locked).reshape(len(offsets), np_).all(axis=1)

    def pull_out(offsets):
        t = loop.seconds(loop.settle)
        slipped, _ = loop.run(np.zeros(len(offsets)), lambda _t: offsets, np.full(len(offsets), t), 2 * math.pi)
        return ~slipped

    def hold_in(offsets):
        rate = 0.02 * loop.wn ** 2 / (2 * math.pi)
        ramp = offsets / rate
        t = np.array([min(4 * MAX_RUN / loop.fs, loop.seconds(loop.settle) + r) for r in ramp])
        slipped, locked = loop.run(np.zeros(len(offsets)), lambda tt: offsets * np.minimum(1.0, tt / ramp), t, math.pi)
        return ~slipped & locked

    def pull_in(offsets):
        pull = (2 * math.pi * offsets) ** 2 / (2 * loop.zeta * loop.wn ** 3)
        t = np.array([loop.seconds(loop.settle + 3 * p) for p in pull])
        _, locked = loop.run(np.zeros(len(offsets)), lambda _t: offsets, t, 2 * math.pi)
        return locked

    return {name: edge(0.0, limit, fn) for name, fn in
            (("lockInHz", lock_in), ("pullOutHz", pull_out), ("holdInHz", hold_in), ("pullInHz", pull_in))}


if __name__ == "__main__":
    serve({"acquisition": measure})
