"""The loop formulas both SciPy reference scripts build on (scipy_reference.py for the dsp tests,
../audit/reference/audit_reference.py for the audit), written once from docs/DESIGN.md's conventions and
the published formulas, with numpy/scipy (Debian python3-scipy); nothing here reads or mirrors the
TypeScript it checks. Also the scripts' one way of reading a JSON request and writing the answer.
"""
import json
import math
import sys

import numpy as np
from scipy import optimize, signal


def bilinear_constant(fs, prewarp_hz):
    """c of s = c (1 - z^-1)/(1 + z^-1): 2 fs, or wp / tan(wp / (2 fs)) prewarped at wp (OS3 Sec. 7.2, PM4)."""
    if prewarp_hz is None:
        return 2.0 * fs
    wp = 2 * math.pi * prewarp_hz
    return wp / math.tan(wp / (2 * fs))


def time_constants(kind, f, k):
    """tau1, tau2 of a lag-lead or PI filter: given, or designed from naturalHz and damping (G3 Ch. 2, B6):
    PI tau1 = K/wn^2, tau2 = 2 zeta/wn; lag-lead tau1 + tau2 = K/wn^2, tau2 = 2 zeta/wn - 1/K."""
    if f.get("tau1S") is not None:
        return f["tau1S"], f["tau2S"]
    wn = 2 * math.pi * f["naturalHz"]
    z = f["damping"]
    if kind == "pi":
        return k / wn ** 2, 2 * z / wn
    t2 = 2 * z / wn - 1 / k
    return k / wn ** 2 - t2, t2


def filter_zpk(f, k, ripple):
    """F(s) of the loop filter `f` (and the ripple filter in series, when given) as zeros, poles, gain,
    with the loop filter's time constants ({"tau"}, {"tau1", "tau2"} or None for Butterworth).
    single-pole 1/(1 + s tau), tau = 1/(2 pi fc); lag-lead (1 + s tau2)/(1 + s (tau1 + tau2));
    PI (1 + s tau2)/(s tau1); Butterworth from scipy.signal.butter(analog=True) (docs/DESIGN.md)."""
    kind = f["kind"]
    taus = None
    if kind == "single-pole":
        tau = 1 / (2 * math.pi * f["cutoffHz"])
        z, p, g = [], [-1 / tau], 1 / tau
        taus = {"tau": tau}
    elif kind == "lag-lead":
        t1, t2 = time_constants(kind, f, k)
        z, p, g = [-1 / t2], [-1 / (t1 + t2)], t2 / (t1 + t2)
        taus = {"tau1": t1, "tau2": t2}
    elif kind == "pi":
        t1, t2 = time_constants(kind, f, k)
        z, p, g = [-1 / t2], [0.0], t2 / t1
        taus = {"tau1": t1, "tau2": t2}
    else:
        z, p, g = signal.butter(f["order"], 2 * math.pi * f["cutoffHz"], analog=True, output="zpk")
    if ripple:
        rz, rp, rg = signal.butter(ripple["order"], 2 * math.pi * ripple["cutoffHz"], analog=True, output="zpk")
        z, p, g = list(z) + list(rz), list(p) + list(rp), g * rg
    return np.array(z, dtype=complex), np.array(p, dtype=complex), float(np.real(g)), taus


def bracketed_root(fun, a, b):
    """brentq on [a, b]; when rounding at an end hides the sign change, the end nearer zero."""
    fa, fb = fun(a), fun(b)
    if fa == 0:
        return a
    if fb == 0:
        return b
    if np.sign(fa) == np.sign(fb):
        return a if abs(fa) < abs(fb) else b
    return optimize.brentq(fun, a, b, xtol=1e-15, rtol=1e-15, maxiter=500)


def serve(handlers, extra=None):
    """Read one JSON document on stdin, answer each list in it with its handler, write JSON on stdout."""
    doc = json.load(sys.stdin)
    out = dict(extra or {})
    for key, handler in handlers.items():
        out[key] = [handler(c) for c in doc.get(key, [])]
    json.dump(out, sys.stdout, allow_nan=True)
