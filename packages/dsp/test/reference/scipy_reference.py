#!/usr/bin/python3
"""Reference figures from SciPy (Debian python3-scipy) for the dsp tests.

Reads one JSON document {"butter": [...], "bilinear": [...], "loops": [...]} on stdin and writes the
answers as JSON on stdout. Everything here is built independently of the TypeScript code, from the
conventions of DESIGN.md and scipy.signal:

* Butterworth: scipy.signal.butter (analog=True, and digital with fs, which prewarps the cutoff).
* Bilinear: scipy.signal.bilinear with fs_eff = c/2, where c = 2*fs or, prewarped at wp,
  c = wp / tan(wp / (2 fs)) (OS3 Sec. 7.2; SciPy applies the same prewarp inside `butter`).
* Loops: F(s) from the loop-filter formulas as zeros/poles/gain, bilinear_zpk, then
  L(s) = K F(s)/s (freqs_zpk) and L(z) = K T F(z)/(z - 1) (freqz_zpk). Margins on a dense log grid
  refined with brentq; the discrete search interval is closed at fs/2. No control library is packaged
  for Debian, hence the grid search (REFERENCES.md).
* Noise bandwidth exactly (noiseExact): the closed loops as tf2ss realisations and their Gramians from
  scipy.linalg.solve_continuous_lyapunov / solve_discrete_lyapunov.
"""
import numpy as np
from scipy import integrate, linalg, optimize, signal

from loop_formulas import bilinear_constant, bracketed_root as root, filter_zpk, serve

GRID_POINTS = 20000
END_TOUCH_DEG = 1e-7


def butter_case(case):
    n, fc = case["order"], case["cutoffHz"]
    b_an, a_an = signal.butter(n, 2 * np.pi * fc, analog=True)
    out = {"analogNum": b_an.tolist(), "analogDen": a_an.tolist()}
    fs = case.get("sampleRateHz")
    if fs is not None:
        b, a = signal.butter(n, fc, fs=fs)
        # Responses from SciPy's own second-order sections: high-order b/a loses digits for narrow
        # filters (the scipy.signal docs recommend sos), which would make the reference the weak side.
        sos = signal.butter(n, fc, fs=fs, output="sos")
        f = np.asarray(case["freqHz"], dtype=float)
        _, h = signal.sosfreqz(sos, worN=f, fs=fs)
        out.update({"b": b.tolist(), "a": a.tolist(), "magDb": (20 * np.log10(np.abs(h))).tolist(),
                    "phaseDeg": np.degrees(np.angle(h)).tolist()})
        _, hc = signal.sosfreqz(sos, worN=[fc], fs=fs)
        out["cutoffDb"] = float(20 * np.log10(abs(hc[0])))
    return out


def bilinear_case(case):
    fs_eff = bilinear_constant(case["sampleRateHz"], case.get("prewarpHz")) / 2
    b, a = signal.bilinear(case["num"], case["den"], fs=fs_eff)
    return {"b": np.atleast_1d(b).tolist(), "a": np.atleast_1d(a).tolist()}


def unwrap_from(h, loop_type):
    ph = np.unwrap(np.angle(h))
    ph0 = np.degrees(ph[0])
    shift = 360 * np.round((-90 * loop_type - ph0) / 360)
    return np.degrees(ph) + shift


def margins(resp, freqs, loop_type):
    """Gain/phase crossovers of resp(f) on the grid, refined with brentq in log f."""
    h = resp(freqs)
    mag_db = 20 * np.log10(np.maximum(np.abs(h), 1e-200))
    ph = unwrap_from(h, loop_type)
    lf = np.log(freqs)

    def phase_near(x, i):
        return ph[i] + np.degrees(np.angle(resp(np.array([np.exp(x)]))[0] / h[i]))

    pms = []
    for i in range(len(freqs) - 1):
        a, b = mag_db[i], mag_db[i + 1]
        if (a > 0 and b <= 0) or (a < 0 and b >= 0):
            x = root(lambda x: 20 * np.log10(abs(resp(np.array([np.exp(x)]))[0])), lf[i], lf[i + 1])
            pms.append((np.exp(x), 180 + phase_near(x, i)))
    gms = []
    last = len(freqs) - 1
    for i in range(last):
        pa, pb = ph[i], ph[i + 1]
        lo, hi = min(pa, pb), max(pa, pb)
        for n in range(int(np.ceil((lo - END_TOUCH_DEG + 180) / 360)), int(np.floor((hi + END_TOUCH_DEG + 180) / 360)) + 1):
            level = -180 + 360 * n
            pbl = level if (i + 1 == last and abs(pb - level) < END_TOUCH_DEG) else pb
            da, db = pa - level, pbl - level
            if not ((da > 0 and db <= 0) or (da < 0 and db >= 0)):
                continue
            if db == 0:
                f = freqs[i + 1]
            else:
                f = np.exp(root(lambda x: phase_near(x, i) - level, lf[i], lf[i + 1]))
            g = abs(resp(np.array([f]))[0])
            if g < 1e-12:
                continue
            gms.append((f, -20 * np.log10(g)))
    out = {"crossoverHz": None, "phaseMarginDeg": None, "phaseCrossoverHz": None, "gainMarginDb": None}
    if pms:
        f, pm = min(pms, key=lambda t: t[1])
        out.update(crossoverHz=float(f), phaseMarginDeg=float(pm))
    if gms:
        f, gm = min(gms, key=lambda t: abs(t[1]))
        out.update(phaseCrossoverHz=float(f), gainMarginDb=float(gm))
    return out


def closed_loop_figures(resp, freqs):
    hc = lambda f: resp(f) / (1 + resp(f))
    db = 20 * np.log10(np.abs(hc(freqs)))
    i_peak = int(np.argmax(db))
    peak = max(0.0, float(db[i_peak]))
    if db[i_peak] > 0 and 0 < i_peak < len(freqs) - 1:
        r = optimize.minimize_scalar(lambda x: -20 * np.log10(abs(hc(np.array([np.exp(x)]))[0])),
                                     bounds=(np.log(freqs[i_peak - 1]), np.log(freqs[i_peak + 1])), method="bounded",
                                     options={"xatol": 1e-12})
        peak = max(peak, float(-r.fun))
    target = 10 * np.log10(0.5)
    bw = None
    for i in range(i_peak, len(freqs) - 1):
        if db[i] >= target and db[i + 1] < target:
            x = root(lambda x: 20 * np.log10(abs(hc(np.array([np.exp(x)]))[0])) - target,
                     np.log(freqs[i]), np.log(freqs[i + 1]))
            bw = float(np.exp(x))
            break
    return {"bandwidth3dbHz": bw, "peakingDb": peak}


def noise_bandwidth(resp, f_lo, f_hi):
    """One-sided integral of |H|^2 df with scipy.integrate.quad over log-spaced pieces."""
    def h2(f):
        v = resp(np.array([f]))[0]
        v = v / (1 + v)
        return abs(v) ** 2
    edges = np.geomspace(f_lo, f_hi, 40)
    total = f_lo * h2(f_lo)  # |H| is flat (≈ 1) below the grid
    for a, b in zip(edges[:-1], edges[1:]):
        total += integrate.quad(h2, a, b, limit=200, epsabs=0, epsrel=1e-11)[0]
    return total


def loop_step_errors(zd, pd, kd, k, fs, n):
    """The discrete loop run sample by sample: e = theta_i - theta_o, u = F(z) e (zpk2sos sections),
    theta_o[n+1] = theta_o[n] + K*T*u[n] (the NCO accumulator with one sample of delay, DESIGN.md).
    Inputs: a 1 rad phase step and a 1 Hz frequency step (theta_i = 2*pi*n*T), both at n = 0."""
    sos = signal.zpk2sos(zd, pd, kd)
    kt, t = k / fs, 1 / fs
    out = {}
    for name in ("phase", "frequency"):
        zi = np.zeros((sos.shape[0], 2))
        theta_o = 0.0
        errs = np.empty(n)
        for i in range(n):
            theta_i = 1.0 if name == "phase" else 2 * np.pi * i * t
            e = theta_i - theta_o
            u, zi = signal.sosfilt(sos, [e], zi=zi)
            errs[i] = e
            theta_o += kt * u[0]
        out[name] = errs.tolist()
    return out


def loop_case(case):
    fs = case["sampleRateHz"]
    k = case["kRadPerS"]
    z, p, kf, _ = filter_zpk(case["filter"], k, case.get("rippleFilter"))
    loop_type = 1 + int(np.sum(np.abs(p) == 0))
    fs_eff = bilinear_constant(fs, case.get("prewarpHz")) / 2
    zd, pd, kd = signal.bilinear_zpk(z, p, kf, fs_eff)
    pa = np.concatenate([p, [0.0]])
    pdd = np.concatenate([pd, [1.0]])

    def analog(f):
        _, h = signal.freqs_zpk(z, pa, k * kf, worN=2 * np.pi * np.asarray(f, dtype=float))
        return h

    def discrete(f):
        _, h = signal.freqz_zpk(zd, pdd, k * kd / fs, worN=np.asarray(f, dtype=float), fs=fs)
        return h

    f_lo, f_hi_analog, nyq = case["fMinHz"], case["fMaxAnalogHz"], fs / 2
    grid_a = np.geomspace(f_lo, f_hi_analog, GRID_POINTS)
    grid_d = np.geomspace(f_lo, nyq, GRID_POINTS)
    grid_d[-1] = nyq
    out = {"analog": margins(analog, grid_a, loop_type), "discrete": margins(discrete, grid_d, loop_type),
           "analogClosed": closed_loop_figures(analog, grid_a), "discreteClosed": closed_loop_figures(discrete, grid_d)}
    if case.get("noiseBandwidth"):
        out["analogNoiseHz"] = noise_bandwidth(analog, f_lo, f_hi_analog * 1e3)
        out["discreteNoiseHz"] = noise_bandwidth(discrete, f_lo, nyq)
    if case.get("stepSamples"):
        out["step"] = loop_step_errors(zd, pd, kd, k, fs, case["stepSamples"])
    f = np.asarray(case.get("freqHz", []), dtype=float)
    if f.size:
        ha, hd = analog(f), discrete(f)
        out["analogMagDb"] = (20 * np.log10(np.abs(ha))).tolist()
        out["discreteMagDb"] = (20 * np.log10(np.abs(hd))).tolist()
        out["analogPhaseDeg"] = np.degrees(np.angle(ha)).tolist()
        out["discretePhaseDeg"] = np.degrees(np.angle(hd)).tolist()
    return out


def series_ss(blocks):
    """One state-space model of blocks (A, B, C, D) in series, the first block's output feeding the next."""
    a, b, c, d = blocks[0]
    for a2, b2, c2, d2 in blocks[1:]:
        n1, n2 = a.shape[0], a2.shape[0]
        a = np.block([[a, np.zeros((n1, n2))], [b2 @ c, a2]])
        b = np.vstack([b, b2 @ d])
        c = np.hstack([d2 @ c, c2])
        d = d2 @ d
    return a, b, c, d


def noise_exact_case(case):
    """The noise bandwidth by Gramians instead of an integral (Parseval; As70, ZDG96).
    Analog: H = L/(1 + L) from the zpk of F(s), its frequency scaled by w0 = |a_n/a_0|^(1/n) so that
    tf2ss's companion matrix is of order one (unscaled, solve_continuous_lyapunov loses every digit on
    the IF loop), then (w0/2)·C·P·C' with A·P + P·A' + B·B' = 0.
    Discrete: the loop assembled as state space from zpk2sos of bilinear_zpk (one tf2ss per section,
    in series) and the NCO accumulator theta[n+1] = theta[n] + K·T·y[n], closed by e = theta_i − theta_o
    (a closed-loop polynomial in z loses the digits of a narrow loop), then (fs/2)·C·P·C' with
    P = A·P·A' + B·B' (solve_discrete_lyapunov, direct). Beside them the integral by quad (noise_bandwidth)
    from 1e-3 of the analysis's lowest frequency."""
    fs = case["sampleRateHz"]
    k = case["kRadPerS"]
    z, p, kf, _ = filter_zpk(case["filter"], k, case.get("rippleFilter"))
    b, a = signal.zpk2tf(z, np.concatenate([p, [0.0]]), k * kf)
    b = np.atleast_1d(b)
    a_cl = np.pad(a, (0, 0)) + np.pad(b, (len(a) - len(b), 0))
    n = len(a_cl) - 1
    w0 = abs(a_cl[-1] / a_cl[0]) ** (1.0 / n)
    scale = lambda poly: np.asarray(poly) * w0 ** np.arange(len(poly) - 1, -1, -1)
    a_s, b_s, c_s, _ = signal.tf2ss(scale(b) / w0 ** n, scale(a_cl) / w0 ** n)
    pa = linalg.solve_continuous_lyapunov(a_s, -b_s @ b_s.T)
    fs_eff = bilinear_constant(fs, case.get("prewarpHz")) / 2
    zd, pd, kd = signal.bilinear_zpk(z, p, kf, fs_eff)
    sos = signal.zpk2sos(zd, pd, kd)
    af, bf, cf, df = series_ss([tuple(np.atleast_2d(m).astype(float) for m in signal.tf2ss(s[:3], s[3:])) for s in sos])
    nf, kt = af.shape[0], k / fs
    # states [theta_o, x_F]; u = theta_i − theta_o
    a_z = np.block([[np.array([[1.0]]) - kt * df, kt * cf], [-bf, af]])
    b_z = np.vstack([kt * df, bf])
    c_z = np.hstack([np.array([[1.0]]), np.zeros((1, nf))])
    pz = linalg.solve_discrete_lyapunov(a_z, b_z @ b_z.T, method="direct")
    pa_ = np.concatenate([p, [0.0]])
    pdd = np.concatenate([pd, [1.0]])
    analog = lambda f: signal.freqs_zpk(z, pa_, k * kf, worN=2 * np.pi * np.asarray(f, dtype=float))[1]
    discrete = lambda f: signal.freqz_zpk(zd, pdd, k * kd / fs, worN=np.asarray(f, dtype=float), fs=fs)[1]
    f_lo, f_hi = case["fMinHz"] * 1e-3, case["fMaxAnalogHz"] * 1e6
    # Above f_hi a type-1 or type-2 loop's |H|^2 falls as f^-2 (or faster): its tail is |H(f_hi)|^2 * f_hi at most.
    tail = abs(analog(np.array([f_hi]))[0] / (1 + analog(np.array([f_hi]))[0])) ** 2 * f_hi
    return {"analogLyapunovHz": float(0.5 * w0 * (c_s @ pa @ c_s.T)[0, 0]),
            "discreteLyapunovHz": float(0.5 * fs * (c_z @ pz @ c_z.T)[0, 0]),
            "analogQuadHz": noise_bandwidth(analog, f_lo, f_hi) + tail,
            "discreteQuadHz": noise_bandwidth(discrete, f_lo, fs / 2)}


if __name__ == "__main__":
    serve({"butter": butter_case, "bilinear": bilinear_case, "loops": loop_case, "noiseExact": noise_exact_case},
          {"scipyVersion": __import__("scipy").__version__})
