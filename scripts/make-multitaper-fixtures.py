#!/usr/bin/python3
"""Reference values for the DPSS, multitaper, periodogram, chi-square and spectral-edge tests.

Run with Debian's python3 (numpy 1.24.2, scipy 1.10.1):
    /usr/bin/python3 scripts/make-multitaper-fixtures.py
Writes JSON files into test/fixtures/multitaper/. Inputs are synthetic and seeded.
"""
import json
import os

import numpy as np
import scipy
from scipy import signal, stats
from scipy.signal import windows

OUT = os.path.join(os.path.dirname(__file__), "..", "test", "fixtures", "multitaper")
os.makedirs(OUT, exist_ok=True)


def write(name, payload):
    payload = {"generator": "scripts/make-multitaper-fixtures.py", "numpy": np.__version__,
               "scipy": scipy.__version__, **payload}
    with open(os.path.join(OUT, name), "w") as f:
        json.dump(payload, f, indent=None, separators=(",", ":"))
        f.write("\n")


def floats(a):
    return [float(v) for v in np.asarray(a).ravel()]


# --- DPSS: full vectors for small lengths, subsamples + checksums for large ones -------------
small_cases = [(4, 0.1, 2), (3, 1.4, 3), (5, 1.5, 5), (64, 1.5, 2), (100, 2, 4), (128, 2.5, 4), (256, 3, 5)]
large_cases = [(512, 4, 8), (1000, 4, 7), (1000, 10, 19), (2000, 6, 11), (5000, 2, 3),
               (10000, 1.5, 2), (10000, 4, 7), (10000, 10, 19)]
full, subsampled = [], []
for m, nw, k in small_cases:
    tapers, ratios = windows.dpss(m, nw, k, return_ratios=True)
    full.append({"length": m, "timeBandwidth": nw, "taperCount": k,
                 "tapers": [floats(t) for t in np.atleast_2d(tapers)], "concentrations": floats(ratios)})
for m, nw, k in large_cases:
    tapers, ratios = windows.dpss(m, nw, k, return_ratios=True)
    idx = np.unique(np.concatenate([np.arange(5), np.linspace(0, m - 1, 41).round().astype(int), m - 1 - np.arange(5)]))
    t = np.arange(m)
    subsampled.append({
        "length": m, "timeBandwidth": nw, "taperCount": k, "indices": [int(i) for i in idx],
        "values": [floats(row[idx]) for row in tapers],
        "sums": floats(tapers.sum(axis=1)), "sumsOfSquares": floats((tapers ** 2).sum(axis=1)),
        "firstMoments": floats((tapers * t).sum(axis=1)), "concentrations": floats(ratios)})
write("dpss.json", {"source": "scipy.signal.windows.dpss(M, NW, Kmax, return_ratios=True)",
                    "full": full, "subsampled": subsampled})

# --- chi-square quantiles ---------------------------------------------------------------------
dofs = [0.3, 1, 2, 3.7, 10, 14, 20, 37.994723, 57.3, 189.5734, 1000, 20000]
probabilities = [1e-10, 1e-4, 0.025, 0.05, 0.3, 0.5, 0.7, 0.95, 0.975, 0.9999, 1 - 1e-10]
write("chi-square.json", {"source": "scipy.stats.chi2.ppf(p, df) and chi2.cdf(x, df)",
                          "cases": [{"dof": d, "p": p, "quantile": float(stats.chi2.ppf(p, d))}
                                    for d in dofs for p in probabilities],
                          "cdf": [{"dof": d, "x": x, "cdf": float(stats.chi2.cdf(x, d))}
                                  for d in [0.5, 2, 7, 50] for x in [0.01, 0.7, 3, 9.5, 60]]})

# --- multitaper: scipy dpss + numpy rfft ----------------------------------------------------
rng = np.random.default_rng(20240611)


def make_signal(n, fs):
    t = np.arange(n) / fs
    white = rng.standard_normal(n)
    brown = np.cumsum(rng.standard_normal(n)) * 0.05
    return 3.0 + 0.02 * t + 2.0 * np.sin(2 * np.pi * 10.3 * t + 0.4) + white + brown


def detrended(x, kind):
    if kind == "none":
        return x.copy()
    return signal.detrend(x, type="constant" if kind == "mean" else "linear")


def one_sided(raw, nfft, fs):
    scale = np.full(raw.shape[-1], 2.0 / fs)
    scale[0] = 1.0 / fs
    if nfft % 2 == 0:
        scale[-1] = 1.0 / fs
    return raw * scale


def adaptive(eigen, ratios, variance, tol, max_iter):
    """Thomson (1982) adaptive weights as in Percival & Walden ch. 7; same stopping rule as the TS code."""
    k = eigen.shape[0]
    if k == 1:
        return eigen[0].copy(), np.ones_like(eigen), 0
    lam = ratios[:, None]
    s = 0.5 * (eigen[0] + eigen[1])
    it = 0
    while True:
        d = np.sqrt(lam) * s / (lam * s + (1 - lam) * variance)
        d2 = d * d
        s_new = (d2 * eigen).sum(axis=0) / d2.sum(axis=0)
        it += 1
        change = np.max(np.abs(s_new - s) / s_new)
        s = s_new
        if change < tol or it >= max_iter:
            return s, d, it


cases = []
for n, fs, nfft, nw, k, kind in [(500, 250.0, 500, 4, 7, "mean"), (500, 250.0, 1024, 4, 7, "linear"),
                                 (256, 256.0, 256, 2.5, 4, "none"), (300, 100.0, 301, 3, 5, "mean")]:
    x = make_signal(n, fs)
    y = detrended(x, kind)
    tapers, ratios = windows.dpss(n, nw, k, return_ratios=True)
    eigen = np.abs(np.fft.rfft(tapers * y, n=nfft, axis=-1)) ** 2
    equal = one_sided(eigen.mean(axis=0), nfft, fs)
    weighted = one_sided((ratios[:, None] * eigen).sum(axis=0) / ratios.sum(), nfft, fs)
    variance = float(np.mean(y ** 2))
    s, d, it = adaptive(eigen, ratios, variance, 1e-12, 500)
    d2 = d * d
    cases.append({"samplingRate": fs, "fftLength": nfft, "timeBandwidth": nw, "taperCount": k, "detrend": kind,
                  "signal": floats(x), "frequencies": floats(np.fft.rfftfreq(nfft, 1 / fs)),
                  "equal": floats(equal), "eigenvalue": floats(weighted),
                  "adaptive": floats(one_sided(s, nfft, fs)), "adaptiveIterations": it,
                  "adaptiveDof": floats(2 * d2.sum(axis=0) ** 2 / (d2 * d2).sum(axis=0))})
write("multitaper.json", {"source": "scipy.signal.windows.dpss + numpy.fft.rfft; adaptive is a numpy "
                                    "mirror of the Thomson iteration with tolerance 1e-12",
                          "cases": cases})

# --- periodogram ------------------------------------------------------------------------------
pcases = []
names = {"rectangular": "boxcar", "hann": "hann", "hamming": "hamming", "blackman": "blackman",
         "blackman-harris": "blackmanharris", "flat-top": "flattop"}
x = make_signal(400, 200.0)
for window, nfft, kind in [("rectangular", 400, "none"), ("hann", 400, "mean"), ("hamming", 512, "linear"),
                           ("blackman", 401, "mean"), ("blackman-harris", 400, "none"), ("flat-top", 800, "mean"),
                           ("tukey", 400, "linear")]:
    spec = ("tukey", 0.25) if window == "tukey" else names[window]
    det = {"none": False, "mean": "constant", "linear": "linear"}[kind]
    f, p = signal.periodogram(x, fs=200.0, window=spec, nfft=nfft, detrend=det, scaling="density")
    pcases.append({"window": window, "tukeyRatio": 0.25 if window == "tukey" else None, "fftLength": nfft,
                   "detrend": kind, "frequencies": floats(f), "psd": floats(p)})
write("periodogram.json", {"source": "scipy.signal.periodogram(x, fs, window, nfft, detrend, scaling='density')",
                           "samplingRate": 200.0, "signal": floats(x), "cases": pcases})

# --- spectral edge: trapezoid cumulative power + linear interpolation (np.interp) ------------
edges = []
for df in [1.0, 0.5, 0.25]:
    f = np.arange(0, 60 + df / 2, df)
    p = np.where(f > 0, 1 / np.where(f > 0, f, 1), 0)
    sel = (f >= 1) & (f <= 40)
    fs_, ps = f[sel], p[sel]
    cum = np.concatenate([[0], np.cumsum(0.5 * (ps[1:] + ps[:-1]) * np.diff(fs_))])
    edges.append({"binWidth": df, "range": [1, 40], "percentiles": [50, 90, 95],
                  "edges": [float(np.interp(q / 100 * cum[-1], cum, fs_)) for q in [50, 90, 95]]})
write("spectral-edge.json", {"source": "numpy: PSD = 1/f on [1, 40] Hz, trapezoid cumulative power, np.interp",
                             "cases": edges})
# --- median-averaged Welch: Monte-Carlo EDOF, nu = 2 mean^2 / variance over interior bins ------
mc = np.random.default_rng(7)
median_cases = []
for segments in [5, 9]:
    n = 256 * (segments + 1) // 2
    runs = np.array([signal.welch(mc.standard_normal(n), fs=1.0, window="hann", nperseg=256, noverlap=128,
                                  average="median", detrend=False)[1][10:118] for _ in range(3000)])
    mean, var = runs.mean(axis=0), runs.var(axis=0)
    median_cases.append({"segmentCount": segments, "segmentSamples": 256, "overlapSamples": 128, "runs": 3000,
                         "dof": float(np.mean(2 * mean ** 2 / var))})
write("welch-median-dof.json", {"source": "Monte Carlo: scipy.signal.welch(average='median', window='hann'), "
                                          "unit white noise, seed 7", "cases": median_cases})
print("fixtures written to", os.path.normpath(OUT))
