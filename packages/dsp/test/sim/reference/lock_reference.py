#!/usr/bin/python3
"""Lock time of the float loop by a NumPy/SciPy simulation of its own (Debian python3-scipy).

Reads one JSON document {"cases": [...]} on stdin, writes {"cases": [...]} on stdout. Built
independently of the TypeScript code, from DESIGN.md's conventions and the lock definition of
REFERENCES.md ("Lock and lock time"):

* the loop filter is designed here with scipy.signal (butter with fs, which prewarps its cutoff; or
  bilinear of the single pole 1/(1 + s*tau)), and run as direct-form-I sections sample by sample in a
  nonlinear loop: input A*sin(2*pi*phi_i), NCO cos(2*pi*phi_o), detector x*nco, phi_o advancing by
  (fc + gain*y)/fs cycles after each sample;
* the tracking error the linear loop has under FM comes from scipy.signal.lfilter of the error
  transfer 1/(1 + L(z)), L(z) = K*T*z^-1*F(z)/(1 - z^-1), over many modulation periods (not from
  harmonics, as the TypeScript does), and is smoothed by the same one-ripple-period boxcar as the
  loop's phase error instead of being delayed; without FM the (type-1) loop's rest error
  asin(2*pi*offset/(K*F(0))) is taken off instead;
* lock time is read per sample: one past the last sample outside +-tol of the final value (the mean
  over the last tenth), less the boxcar's delay. Of the rule for "locked" only the last tenth is
  applied (the cases run long enough for the six loop time constants as well).
"""
import json
import sys

import numpy as np
from scipy import signal


def modulation(kind, p):
    c = p - np.floor(p)
    if kind == "sine":
        return np.sin(2 * np.pi * c)
    if kind == "square":
        return np.where(c < 0.5, 1.0, -1.0)
    return np.where(c < 0.25, 4 * c, np.where(c < 0.75, 2 - 4 * c, 4 * c - 4))


def offsets(sc, t):
    k = sc["kind"]
    if k == "tone":
        return np.full_like(t, sc["offsetHz"])
    if k == "frequency-step":
        return np.where(t >= sc["atS"], sc["stepHz"], 0.0)
    if k == "fm":
        return sc["deviationHz"] * modulation(sc["modulation"], sc["rateHz"] * t)
    return np.zeros_like(t)


def loop_sos(case):
    fs = case["sampleRateHz"]
    f = case["filter"]
    if f["kind"] == "butterworth":
        return signal.butter(f["order"], f["cutoffHz"], fs=fs, output="sos")
    tau = 1 / (2 * np.pi * f["cutoffHz"])
    b, a = signal.bilinear([1.0], [tau, 1.0], fs=fs)
    return signal.tf2sos(b, a)


def run_loop(case, sos, x):
    fs, fc, gain = case["sampleRateHz"], case["centerHz"], case["gainHzPerUnit"]
    state = np.zeros((len(sos), 4))  # x1, x2, y1, y2 per section
    ph = 0.0
    nco_phase = np.empty(len(x))
    for n, xn in enumerate(x):
        v = xn * np.cos(2 * np.pi * ph)
        for j, s in enumerate(sos):
            b0, b1, b2, _, a1, a2 = s
            x1, x2, y1, y2 = state[j]
            y = b0 * v + b1 * x1 + b2 * x2 - a1 * y1 - a2 * y2
            state[j] = (v, x1, y, y1)
            v = y
        nco_phase[n] = ph
        ph += (fc + gain * v) / fs
        ph -= np.floor(ph)
    return nco_phase


def boxcar(values, length):
    c = np.cumsum(values)
    n = np.arange(len(values))
    lo = n - length
    return (c - np.where(lo >= 0, c[np.maximum(lo, 0)], 0.0)) / np.minimum(n + 1, length)


def linear_tracking_error(case, sos, total):
    """Steady-state phase error of the linear loop under the FM, at samples 0 .. total-1."""
    sc = case["scenario"]
    fs = case["sampleRateHz"]
    period = fs / sc["rateHz"]
    assert abs(period - round(period)) < 1e-9, "the reference wants a whole number of samples per period"
    period = int(round(period))
    k = (case["amplitude"] / 2) * 2 * np.pi * case["gainHzPerUnit"]
    b, a = signal.sos2tf(sos)
    one_minus = np.array([1.0, -1.0])
    num = np.convolve(one_minus, a)
    den = num + (k / fs) * np.concatenate(([0.0], b, [0.0]))[: len(num)]
    periods = 60
    t = np.arange(periods * period) / fs
    theta_i = 2 * np.pi * np.concatenate(([0.0], np.cumsum(offsets(sc, t))[:-1])) / fs
    e = signal.lfilter(num, den, theta_i)
    last = e[-period:]
    # the last period starts at a multiple of the period, so sample n of the run is last[n % period]
    return last[np.arange(total) % period], last


def case_answer(case):
    fs, fc, amp = case["sampleRateHz"], case["centerHz"], case["amplitude"]
    sc = case["scenario"]
    total = int(round(sc["durationS"] * fs))
    n = np.arange(total)
    off = offsets(sc, n / fs)
    phase = np.empty(total)
    p = (sc.get("initialPhaseDeg", 0.0) / 360.0) % 1.0
    for i in range(total):
        phase[i] = p
        p += (fc + off[i]) / fs
        p -= np.floor(p)
    x = amp * np.sin(2 * np.pi * phase)
    sos = loop_sos(case)
    nco = run_loop(case, sos, x)
    e = phase - nco
    e -= np.round(e)
    unwrapped = 2 * np.pi * np.concatenate(([e[0]], e[0] + np.cumsum(np.diff(e) - np.round(np.diff(e)))))
    length = max(1, min(total, int(round(fs / (2 * fc)))))
    d = boxcar(unwrapped, length)
    table = None
    if sc["kind"] == "fm":
        ref, table = linear_tracking_error(case, sos, total)
        d = d - boxcar(ref, length)
    else:
        # type 1: the loop rests at asin(2*pi*offset/(K*F(0))) (G3 Ch. 2); F(0) from the sections
        dc = np.prod([(s[0] + s[1] + s[2]) / (s[3] + s[4] + s[5]) for s in sos])
        k = (amp / 2) * 2 * np.pi * case["gainHzPerUnit"]
        d = d - np.arcsin(np.clip(2 * np.pi * off / (k * dc), -1, 1))
    tail = int(np.floor(0.9 * total))
    final = d[tail:].mean()
    outside = np.nonzero(np.abs(d - final) > case["toleranceRad"])[0]
    delay = (length - 1) / 2
    if len(outside) and outside[-1] == total - 1:
        return {"lockTimeS": None, "locked": False, "table": None if table is None else table.tolist()}
    enter = 0.0 if not len(outside) else max(0.0, outside[-1] + 1 - delay)
    locked = enter <= tail
    return {"lockTimeS": enter / fs if locked else None, "locked": bool(locked),
            "table": None if table is None else table.tolist()}


def main():
    doc = json.load(sys.stdin)
    json.dump({"cases": [case_answer(c) for c in doc["cases"]]}, sys.stdout)


if __name__ == "__main__":
    main()
