#!/usr/bin/python3
"""Independent reference figures for the numerical audit of packages/dsp.

Reads {"cases": [spec, ...], "nco": [...], "bilinear": [...], "openLoop": [...]} (JSON) on stdin and
writes the answers as JSON on stdout. Nothing here reads or mirrors the TypeScript code: every figure is
built from DESIGN.md's conventions with numpy/scipy.signal (Debian python3-scipy):

* F(s) from the spec's filter formulas (DESIGN.md; REFERENCES.md G3/B6 for targets -> time constants),
  Butterworth from scipy.signal.butter(analog=True); the ripple filter multiplies in.
* Discrete F(z): scipy.signal.bilinear_zpk with fs' = c/2, c = 2 fs or wp/tan(wp/(2 fs)) (OS3, PM4).
* L(s) = K F(s)/s, K = (A/2)(2 pi g); L(z) = K T F(z) z^-1/(1 - z^-1) (DESIGN.md conventions).
* Phase from the sum of factor angles (continuous, so no unwrapping), margins on a 40 000-point log
  grid refined with brentq (no control library in Debian; REFERENCES.md).
* Noise bandwidth = integral of |H|^2 df with scipy.integrate.quad in ln f (exact integral, G3).
* NCO tuning word with Python's exact integers / Fraction (TRG71), worked without floating point.
"""
import decimal
import math
import os
import sys
import warnings
from fractions import Fraction

import numpy as np
from scipy import integrate, optimize, signal

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "reference"))
from loop_formulas import bilinear_constant as bilinear_c, bracketed_root as brent, filter_zpk as loop_filter_zpk, serve

GRID = 40000


def loop_gain(spec):
    kd = spec["input"]["amplitude"] / 2.0
    ko = 2 * math.pi * spec["nco"]["gainHzPerUnit"]
    return kd * ko


def filter_zpk(spec, k):
    """F(s) of the spec's loop filter and ripple filter (loop_formulas.filter_zpk)."""
    return loop_filter_zpk(spec["filter"], k, spec.get("rippleFilter"))


def second_order(spec, k, taus):
    """wn, zeta per kind (REFERENCES.md, G3 Ch. 2 / B6)."""
    kind = spec["filter"]["kind"]
    if kind == "single-pole" or (kind == "butterworth" and spec["filter"]["order"] == 1):
        tau = 1 / (2 * math.pi * spec["filter"]["cutoffHz"])
        wn = math.sqrt(k / tau)
        return wn / (2 * math.pi), 1 / (2 * math.sqrt(k * tau))
    if kind == "lag-lead":
        t1, t2 = taus["tau1"], taus["tau2"]
        wn = math.sqrt(k / (t1 + t2))
        return wn / (2 * math.pi), (wn / 2) * (t2 + 1 / k)
    if kind == "pi":
        t1, t2 = taus["tau1"], taus["tau2"]
        wn = math.sqrt(k / t1)
        return wn / (2 * math.pi), wn * t2 / 2
    return None, None


class Loop:
    """Open loop L on the jw axis (analog) or the unit circle (discrete), magnitude and continuous phase."""

    def __init__(self, zeros, poles, gain, discrete, fs):
        self.z, self.p, self.g, self.discrete, self.fs = zeros, poles, gain, discrete, fs

    def point(self, f):
        f = np.asarray(f, dtype=float)
        if self.discrete:
            x = np.exp(1j * 2 * np.pi * f / self.fs)
        else:
            x = 1j * 2 * np.pi * f
        logmag = np.full(f.shape, math.log(abs(self.g)))
        ph = np.full(f.shape, 0.0 if self.g > 0 else math.pi)
        for zz in self.z:
            d = x - zz
            logmag = logmag + np.log(np.abs(d))
            ph = ph + np.angle(d)
        for pp in self.p:
            d = x - pp
            logmag = logmag - np.log(np.abs(d))
            ph = ph - np.angle(d)
        return logmag, np.degrees(ph)

    def complex(self, f):
        lm, ph = self.point(f)
        return np.exp(lm) * np.exp(1j * np.radians(ph))


def open_loops(spec):
    k = loop_gain(spec)
    fs = spec["sampleRateHz"]
    z, p, g, taus = filter_zpk(spec, k)
    c = bilinear_c(fs, spec["discretization"].get("prewarpHz"))
    zd, pd, gd = signal.bilinear_zpk(z, p, g, c / 2)
    analog = Loop(z, np.append(p, 0.0), k * g, False, fs)
    # L(z) = K T F(z) z^-1/(1 - z^-1) = K T F(z)/(z - 1)
    discrete = Loop(zd, np.append(pd, 1.0), k * gd / fs, True, fs)
    return k, (z, p, g), (zd, pd, gd), analog, discrete, taus, c


def phase_near(loop, t, ref):
    """Phase at f = e^t shifted by whole turns to the branch nearest ref (the unwrapped grid value)."""
    v = float(loop.point(np.array([math.exp(t)]))[1][0])
    return v + 360 * round((ref - v) / 360)


def margins(loop, f_lo, f_hi, closed_end):
    u = np.linspace(math.log(f_lo), math.log(f_hi), GRID)
    lm, ph = loop.point(np.exp(u))
    # Factor angles are principal values: a discrete pole with positive imaginary part wraps near
    # Nyquist, so unwrap along the dense grid (start on the low-frequency branch -90 deg per integrator).
    ph = np.degrees(np.unwrap(np.radians(ph)))
    gain_x = []
    for i in np.nonzero(np.sign(lm[:-1]) != np.sign(lm[1:]))[0]:
        x = brent(lambda t: float(loop.point(np.array([math.exp(t)]))[0][0]), u[i], u[i + 1])
        f = math.exp(x)
        gain_x.append((f, 180 + phase_near(loop, x, ph[i])))
    phase_x = []
    kmin = math.floor((ph.min() + 180) / 360) - 1
    kmax = math.ceil((ph.max() + 180) / 360) + 1
    for kk in range(kmin, kmax + 1):
        target = -180 + 360 * kk
        d = ph - target
        for i in np.nonzero(np.sign(d[:-1]) * np.sign(d[1:]) < 0)[0]:
            x = brent(lambda t, r=ph[i]: phase_near(loop, t, r) - target, u[i], u[i + 1])
            phase_x.append(math.exp(x))
        if closed_end and abs(d[-1]) < 1e-6:
            phase_x.append(f_hi)
    pcs = []
    for f in phase_x:
        lmf = float(loop.point(np.array([f]))[0][0])
        db = 20 * lmf / math.log(10)
        # |L| below -240 dB: a transmission zero (at Nyquist), no finite gain margin (DESIGN.md is silent;
        # README states this rule, and any finite figure there would be meaningless)
        if db < -240 or any(abs(f - q) <= 1e-12 * f for q, _ in pcs):
            continue
        pcs.append((f, -db))
    pm = min(gain_x, key=lambda t: t[1]) if gain_x else None
    gm = min(pcs, key=lambda t: abs(t[1])) if pcs else None
    return {
        "crossoverHz": pm[0] if pm else None,
        "phaseMarginDeg": pm[1] if pm else None,
        "gainCrossingsHz": sorted(t[0] for t in gain_x),
        "phaseCrossoverHz": gm[0] if gm else None,
        "gainMarginDb": gm[1] if gm else None,
        "phaseCrossingsHz": sorted(t[0] for t in pcs),
    }


def h_abs2(loop, f):
    lc = loop.complex(np.atleast_1d(f))
    return np.abs(lc / (1 + lc)) ** 2


def closed_loop(loop, f_lo, f_hi):
    u = np.linspace(math.log(f_lo), math.log(f_hi), GRID)
    db = 10 * np.log10(h_abs2(loop, np.exp(u)))
    i = int(np.argmax(db))
    peak = max(0.0, float(db[i]))
    if 0 < i < len(u) - 1 and db[i] > 0:
        r = optimize.minimize_scalar(lambda t: -10 * math.log10(h_abs2(loop, math.exp(t))[0]),
                                     bounds=(u[i - 1], u[i + 1]), method="bounded", options={"xatol": 1e-12})
        peak = max(peak, -float(r.fun))
    m3 = 10 * math.log10(0.5)
    bw = None
    for j in range(i, len(u) - 1):
        if db[j] >= m3 and db[j + 1] < m3:
            x = brent(lambda t: 10 * math.log10(h_abs2(loop, math.exp(t))[0]) - m3, u[j], u[j + 1])
            bw = math.exp(x)
            break
    return {"bandwidth3dbHz": bw, "peakingDb": peak}


def noise_bw(loop, f_lo, f_hi):
    """Integral of |H|^2 df from 0 to f_hi in ln f, per decade with quad; below f_lo |H| = 1."""
    edges = np.exp(np.linspace(math.log(f_lo), math.log(f_hi), int(math.ceil(math.log10(f_hi / f_lo) * 4)) + 1))
    total = f_lo * float(h_abs2(loop, f_lo)[0])
    for a, b in zip(edges[:-1], edges[1:]):
        v, _ = integrate.quad(lambda t: float(h_abs2(loop, math.exp(t))[0]) * math.exp(t), math.log(a), math.log(b),
                              epsabs=0, epsrel=1e-12, limit=400)
        total += v
    return total


def chars_hz(k, z, p):
    vals = [k / (2 * math.pi)] + [abs(x) / (2 * math.pi) for x in list(z) + list(p) if abs(x) > 0]
    return min(vals), max(vals)


def case(spec):
    k, (z, p, g), (zd, pd, gd), analog, discrete, taus, c = open_loops(spec)
    fs = spec["sampleRateHz"]
    lo, hi = chars_hz(k, z, p)
    f_lo = min(lo, fs / 2) * 1e-4
    f_hi_a = max(hi, fs / 2) * 1e4
    nyq = fs / 2
    out = {"kRadPerS": k}
    out["analogMargins"] = margins(analog, f_lo, f_hi_a, False)
    out["discreteMargins"] = margins(discrete, f_lo, nyq, True)
    out["analogClosed"] = closed_loop(analog, f_lo, f_hi_a)
    out["discreteClosed"] = closed_loop(discrete, f_lo, nyq)
    # Analog tail beyond f_hi_a: |H|^2 falls at least as 1/f^2, so the rest is at most |H|^2 f there.
    out["analogNoiseHz"] = noise_bw(analog, f_lo, f_hi_a) + float(h_abs2(analog, f_hi_a)[0]) * f_hi_a
    out["discreteNoiseHz"] = noise_bw(discrete, f_lo, nyq)
    fn, zeta = second_order(spec, k, taus)
    out["naturalHz"], out["damping"] = fn, zeta
    out["taus"] = taus
    # Ripple at 2 centerHz: analog |F(j 2 pi 2fc)|; discrete |F(e^{j 2 pi 2fc / fs})| (periodic in fs, so the
    # alias lands where it should without any special case).
    fr = 2 * spec["centerHz"]
    fa = Loop(z, p, g, False, fs).complex(np.array([fr]))[0]
    fd = Loop(zd, pd, gd, True, fs).complex(np.array([fr]))[0]
    out["ripple"] = {"rippleHz": fr, "aliasedRippleHz": abs(fr - fs * round(fr / fs)),
                     "analogAttenuationDb": -20 * math.log10(abs(fa)), "discreteAttenuationDb": -20 * math.log10(abs(fd)),
                     # the 2f term has amplitude Kd at the detector, i.e. 1 rad of equivalent input phase:
                     # NCO phase ripple = |H(2fc)| rad (common practice, no source)
                     "analogFilterOutputAmplitude": spec["input"]["amplitude"] / 2 * abs(fa),
                     "discreteFilterOutputAmplitude": spec["input"]["amplitude"] / 2 * abs(fd),
                     "analogPhaseRippleDeg": math.degrees(math.sqrt(float(h_abs2(analog, fr)[0]))),
                     "discretePhaseRippleDeg": math.degrees(math.sqrt(float(h_abs2(discrete, fr)[0])))}
    pw = spec["discretization"].get("prewarpHz")
    if pw is not None:  # analog and digital F agree exactly at the prewarp frequency (OS3, PM4)
        out["prewarp"] = {"analog": abs(Loop(z, p, g, False, fs).complex(np.array([pw]))[0]),
                          "digital": abs(Loop(zd, pd, gd, True, fs).complex(np.array([pw]))[0])}
    # Coefficients: scipy.signal.bilinear on the whole F(s) (b/a with a[0] = 1).
    num = np.real(np.poly(z)) * g if len(z) else np.array([g])
    den = np.real(np.poly(p))
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # BadCoefficients: see the length check below
        b, a = signal.bilinear(num, den, fs=c / 2)
    out["bTf"], out["aTf"] = (b / a[0]).tolist(), (a / a[0]).tolist()
    # signal.bilinear's normalize() strips leading numerator coefficients below 1e-14 (a narrow
    # high-order low-pass has all of them that small), so the zpk route is the reference for b/a.
    bz, az = signal.zpk2tf(zd, pd, gd)
    out["b"], out["a"] = np.real(bz / az[0]).tolist(), np.real(az / az[0]).tolist()
    out["analogNum"], out["analogDen"] = num.tolist(), den.tolist()
    return out


def round_half_away(fr):
    q = math.floor(abs(fr) + Fraction(1, 2))
    return q if fr >= 0 else -q


def nco_case(c):
    n = c["accumulatorBits"]
    f, fs = Fraction(c["frequencyHz"]), Fraction(c["sampleRateHz"])
    m = round_half_away(f * 2 ** n / fs)
    actual = Fraction(m) * fs / 2 ** n
    return {"tuningWordDecimal": str(m), "hi": str(m >> 32), "lo": str(m & 0xFFFFFFFF),
            "actualHz": float(actual), "errorHz": float(actual - f), "errorPpm": float((actual - f) / f * 10 ** 6),
            "resolutionHz": float(fs / 2 ** n)}


def bilinear_only(c):
    b, a = signal.bilinear(c["num"], c["den"], fs=bilinear_c(c["sampleRateHz"], c.get("prewarpHz")) / 2)
    return {"b": (b / a[0]).tolist(), "a": (a / a[0]).tolist()}


def open_loop_points(c):
    """L(z) = K F(z) T z^-1/(1 - z^-1) evaluated by hand on the given sections (the filter's own coefficients)."""
    k, fs = c["kRadPerS"], c["sampleRateHz"]
    out = []
    for f in c["freqHz"]:
        zi = np.exp(-1j * 2 * np.pi * f / fs)
        fz = 1.0
        for sec in c["sections"]:  # cascade of second-order sections, each b/a in powers of z^-1
            fz = fz * np.polyval(sec["b"][::-1], zi) / np.polyval(sec["a"][::-1], zi)
        lz = k * fz * (1 / fs) * zi / (1 - zi)
        out.append({"re": float(lz.real), "im": float(lz.imag)})
    return out


def rounding_case(c):
    """Integer rounding of x = p/2^s by Python's decimal module (IEEE754 cl. 4.3 attributes):
    ROUND_HALF_UP = ties away from zero, ROUND_HALF_EVEN = ties to even, ROUND_FLOOR = toward -inf."""
    x = decimal.Decimal(c["p"]) / (decimal.Decimal(2) ** c["s"])
    modes = {"nearest": decimal.ROUND_HALF_UP, "half-even": decimal.ROUND_HALF_EVEN, "truncate": decimal.ROUND_FLOOR}
    return {m: int(x.to_integral_value(rounding=r)) for m, r in modes.items()}


def bode_case(c):
    """|L| in dB and the phase of L (degrees) of the analog and the discrete loop at given frequencies."""
    _, _, _, analog, discrete, _, _ = open_loops(c["spec"])
    f = np.asarray(c["freqHz"], dtype=float)
    out = {}
    for name, loop in (("analog", analog), ("discrete", discrete)):
        lm, ph = loop.point(f)
        out[name + "Db"] = (20 * lm / math.log(10)).tolist()
        out[name + "PhaseDeg"] = ph.tolist()
    return out


def section_loop_case(c):
    """Margins and pole radii of a loop whose F(z) is given as second-order sections (quantised codes /
    2^F): roots by numpy, L(z) = K T F(z)/(z - 1), margins as above; plus the filter's response deviation
    from the reference sections with sosfreqz on a dense grid."""
    fs, k = c["sampleRateHz"], c["kRadPerS"]
    zs, ps, g = [], [], 1.0
    radii = []
    for sec in c["sections"]:
        b = np.trim_zeros(np.asarray(sec["b"], dtype=float), "b")
        a = np.trim_zeros(np.asarray(sec["a"], dtype=float), "b")
        # b0 + b1 z^-1 + b2 z^-2 = z^-2 (b0 z^2 + b1 z + b2): zeros = roots(b); the leading b0 is the gain
        radii.append(float(max(abs(np.roots(a)))) if len(a) > 1 else 0.0)
        lead = np.nonzero(b)[0][0] if np.any(b) else None
        if lead is None:
            g = 0.0
            continue
        zs += list(np.roots(b[lead:]))
        ps += list(np.roots(a))
        g *= b[lead]
        # the z^-lead delay: lead extra poles at z = 0; length mismatch of b and a adds poles/zeros at 0
        nb, na = len(b) - 1 - lead, len(a) - 1
        zs += [0.0] * max(0, na - nb)
        ps += [0.0] * max(0, nb - na) + [0.0] * lead
    out = {"margins": None, "poleRadius": radii}
    if g != 0:  # an all-zero numerator (the numerator-zero trap) leaves no loop to measure
        loop = Loop(np.array(zs, dtype=complex), np.array(ps + [1.0], dtype=complex), k * g / fs, True, fs)
        out["margins"] = margins(loop, c["fMinHz"], fs / 2, True)
    if "referenceSections" in c:
        f = np.exp(np.linspace(math.log(1e-6 * fs / 2), math.log(fs / 2), 60000))
        sos_q = np.array([list(s["b"]) + list(s["a"]) for s in c["sections"]], dtype=float)
        sos_r = np.array([list(s["b"]) + list(s["a"]) for s in c["referenceSections"]], dtype=float)
        _, hq = signal.sosfreqz(sos_q, worN=f, fs=fs)
        _, hr = signal.sosfreqz(sos_r, worN=f, fs=fs)
        with np.errstate(divide="ignore"):
            dr = 20 * np.log10(np.abs(hr))
            dq = 20 * np.log10(np.abs(hq))
        band = dr >= dr.max() - 40
        out["maxDeviationDb"] = float(np.max(np.abs(dq[band] - dr[band])))
    return out


def step_case(c):
    """Phase error of the discrete loop after a 1 rad phase step and a 1 Hz frequency step (input phase
    2 pi n T), by scipy.signal.lfilter of E(z) = 1/(1 + L(z)) = (1 - z^-1)A / ((1 - z^-1)A + K T z^-1 B)."""
    spec, n = c["spec"], c["n"]
    k, _, (zd, pd, gd), _, _, _, _ = open_loops(spec)
    fs = spec["sampleRateHz"]
    b, a = signal.zpk2tf(zd, pd, gd)
    b, a = np.real(b), np.real(a)
    m = max(len(a), len(b))
    b = np.concatenate([np.zeros(m - len(b)), b])[::-1][::-1]  # align as polynomials in z (same degree)
    a = np.concatenate([np.zeros(m - len(a)), a])
    # in powers of z^-1 after dividing by z^(m-1): coefficient lists are unchanged (leading = z^(m-1))
    one_minus = np.array([1.0, -1.0])
    num = np.convolve(one_minus, a)
    den = num + np.concatenate([[0.0], k / fs * b])
    t = np.arange(n) / fs
    e_phase = signal.lfilter(num, den, np.ones(n))
    e_freq = signal.lfilter(num, den, 2 * np.pi * t)
    return {"phase": e_phase.tolist(), "freq": e_freq.tolist()}


def butter_digital(c):
    """scipy.signal.butter(N, fc, fs=fs, output='sos') response (SciPy prewarps the cutoff itself)."""
    sos = signal.butter(c["order"], c["cutoffHz"], fs=c["sampleRateHz"], output="sos")
    _, h = signal.sosfreqz(sos, worN=np.asarray(c["freqHz"], dtype=float), fs=c["sampleRateHz"])
    return {"re": np.real(h).tolist(), "im": np.imag(h).tolist()}


def round_s(p, sh, mode):
    """README primitive round_s: q = p >> s (floor), r = p - q 2^s, ties per mode (IEEE754 cl. 4.3)."""
    if sh <= 0:
        return p << -sh
    q = p >> sh
    r = p - (q << sh)
    h = 1 << (sh - 1)
    if mode == "truncate":
        return q
    if r > h:
        return q + 1
    if r < h:
        return q
    if mode == "nearest":
        return q + 1 if p >= 0 else q
    return q + 1 if q % 2 else q


def reduce_w(v, w, mode):
    lo, hi = -(1 << (w - 1)), (1 << (w - 1)) - 1
    if lo <= v <= hi:
        return v
    if mode == "saturate":
        return hi if v > hi else lo
    v &= (1 << w) - 1
    return v - (1 << w) if v > hi else v


def bit_true_case(c):
    """Re-run the README's bit-true arithmetic (steps 1-8) with Python integers on the given input codes;
    the tuning word from Fraction and the sine table from numpy, both independent of the TypeScript."""
    d, wc, fc, wa = c["dataBits"], c["coefficientBits"], c["fractionBits"], c["macBits"]
    n_acc, p_bits, b_bits = c["ncoAccumulatorBits"], c["phaseBits"], c["amplitudeBits"]
    mode, ovf = c["rounding"], c["overflow"]
    fs_code = (1 << (b_bits - 1)) - 1
    k = np.arange(1 << p_bits)
    ideal = fs_code * np.sin(2 * np.pi * k / (1 << p_bits))
    table = [int(math.copysign(math.floor(abs(v) + 0.5), v)) for v in ideal]
    m = round_half_away(Fraction(c["centerHz"]) * 2 ** n_acc / Fraction(c["sampleRateHz"]))
    g, sh = c["gainCode"], c["gainShift"]
    codes = c["coefficientCodes"]
    nsec = len(codes) // 5
    st = [[0, 0, 0, 0] for _ in range(nsec)]
    phi = 0
    rows = []
    for x in c["inputCode"]:
        a = ((phi >> (n_acc - p_bits)) + (1 << (p_bits - 2))) % (1 << p_bits)
        if c["waveform"] == "sine":
            nco = table[a]
        else:
            nco = fs_code if a < (1 << (p_bits - 1)) else -fs_code
        u = reduce_w(round_s(x * nco, b_bits - 1, mode), d, ovf)
        v = u
        for i in range(nsec):
            b0, b1, b2, a1, a2 = codes[5 * i:5 * i + 5]
            x1, x2, y1, y2 = st[i]
            acc = b0 * v + b1 * x1 + b2 * x2 - a1 * y1 - a2 * y2
            if wa < wc + d + 1:
                acc = reduce_w(acc, wa, ovf)
            y = reduce_w(round_s(acc, fc, mode), d, ovf)
            st[i] = [v, x1, y, y1]
            v = y
        delta = round_s(v * g, sh, mode) if sh > 0 else v * g * (1 << -sh)
        rows.append([x, str(phi), a, nco, u, v])
        phi = (phi + m + delta) % (1 << n_acc)
    # FNV-1a over 32-bit words (offset basis 2166136261, prime 16777619; README, memory), per sample:
    # input_code, phase hi word, phase lo word, table_address, nco_code, detector_code, filter_code
    h = 2166136261
    for x, ph, a, nco, u, y in rows:
        ph = int(ph)
        for w in (x, ph >> 32, ph & 0xFFFFFFFF, a, nco, u, y):
            h = ((h ^ (w & 0xFFFFFFFF)) * 16777619) & 0xFFFFFFFF
    return {"rows": rows, "tuningWord": str(m), "table": table, "checksum": h}


def datapath_noise_case(c):
    """Noise gains, DC gains and peak gains of the fixed-point loop linearised about lock, built as
    transfer functions in z^-1 from DESIGN.md's conventions (not from the TypeScript state-space):
    u = -Kd*theta + e_det, y = F u (+ each section's output error e_i after its sum, which runs through
    1/A_i and the later sections, OS3 Sec. 6.9 (memory)), theta = z^-1/(1 - z^-1) (Ko T y + e_ctrl).
    With D = (1 - z^-1) prod A + Kd Ko T z^-1 prod B every transfer is num/D. Impulse responses by
    scipy.signal.sosfilt (zpk2sos of the closed loop), 2^18 samples; sum of squares and of |h| over it
    (Ja70 L2 and L1); L-infinity from sosfreqz on a dense grid; DC gain num(1)/D(1)."""
    secs = c["sections"]
    kd = c["amplitude"] * (4 / math.pi if c["waveform"] == "square" else 1.0) / 2
    kd *= (2 ** (c["amplitudeBits"] - 1) - 1) / 2 ** (c["amplitudeBits"] - 1)
    kot = 2 * math.pi * c["gainHzPerUnit"] / c["sampleRateHz"]
    A = [np.asarray(s["a"], dtype=float) for s in secs]
    B = [np.asarray(s["b"], dtype=float) for s in secs]
    delta = np.array([1.0, -1.0])
    z1 = np.array([0.0, 1.0])

    # coefficient sequences in z^-1 multiply by convolution (np.polymul would drop a leading zero, the z^-1)
    def prod(ps):
        out = np.array([1.0])
        for q in ps:
            out = np.convolve(out, q)
        return out

    def padd(x, y):
        n = max(len(x), len(y))
        return np.pad(x, (0, n - len(x))) + np.pad(y, (0, n - len(y)))

    den = padd(np.convolve(delta, prod(A)), kd * kot * np.convolve(z1, prod(B)))
    kk = len(secs)
    n = 1 << 18
    imp = np.zeros(n)
    imp[0] = 1.0

    def response(num):
        # z^-1 polynomials: b/a in SciPy's digital convention, as lfilter/tf2zpk read them
        z, p, g = signal.tf2zpk(num, den)
        sos = signal.zpk2sos(z, p, g)
        h = signal.sosfilt(sos, imp)
        return h, sos

    def figures(num):
        h, sos = response(num)
        return {"l2": float(np.sum(h * h)), "l1": float(np.sum(np.abs(h))), "dc": float(np.sum(num) / np.sum(den)), "tail": float(np.max(np.abs(h[-1000:]))), "sos": sos}

    inputs = []
    # detector: to y and theta
    inputs.append((np.convolve(delta, prod(B)), kot * np.convolve(z1, prod(B))))
    for i in range(kk):
        rest = np.convolve(prod(B[i + 1:]), prod(A[:i]))
        inputs.append((np.convolve(delta, rest), kot * np.convolve(z1, rest)))
    inputs.append((-kd * np.convolve(z1, prod(B)), np.convolve(z1, prod(A))))
    gains = []
    for ny, nt in inputs:
        fy, ft = figures(ny), figures(nt)
        gains.append({"outputGain": fy["l2"], "phaseGain": ft["l2"], "outputDc": fy["dc"], "phaseDc": ft["dc"], "tail": max(fy["tail"], ft["tail"])})
    sections = []
    f = np.concatenate([np.linspace(0, c["sampleRateHz"] / 2, 100001)[1:], np.exp(np.linspace(math.log(1e-7 * c["sampleRateHz"]), math.log(c["sampleRateHz"] / 2), 100000))])
    for k in range(kk):
        num = np.convolve(delta, np.convolve(prod(B[:k + 1]), prod(A[k + 1:])))
        fk = figures(num)
        _, hf = signal.sosfreqz(fk["sos"], worN=f, fs=c["sampleRateHz"])
        sections.append({"l1": fk["l1"], "l2": math.sqrt(fk["l2"]), "lInf": float(np.max(np.abs(hf)))})
    return {"inputs": gains, "sections": sections}


if __name__ == "__main__":
    serve({
        "cases": case,
        "nco": nco_case,
        "bilinear": bilinear_only,
        "openLoop": open_loop_points,
        "rounding": rounding_case,
        "bode": bode_case,
        "sectionLoops": section_loop_case,
        "steps": step_case,
        "butterDigital": butter_digital,
        "bitTrue": bit_true_case,
        "datapathNoise": datapath_noise_case,
    })
