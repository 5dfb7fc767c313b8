#!/usr/bin/python3
"""scipy/numpy side of bench/multitaper.ts: the same multitaper workload, single thread.

Usage: /usr/bin/python3 bench/scipy-multitaper.py EPOCHS CHANNELS SAMPLES NW K FFT_LENGTH
Prints one JSON object with seconds per weighting.
"""
import json
import os
import sys
import time

for name in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(name, "1")

import numpy as np  # noqa: E402
import scipy  # noqa: E402
from scipy.signal import windows  # noqa: E402

epochs, channels, samples = (int(v) for v in sys.argv[1:4])
nw, k, nfft = float(sys.argv[4]), int(sys.argv[5]), int(sys.argv[6])
fs = 1000.0
data = np.random.default_rng(1).standard_normal((epochs, channels, samples))


def run(weighting):
    start = time.perf_counter()
    tapers, ratios = windows.dpss(samples, nw, k, return_ratios=True)  # taper setup is timed, as in the TS plan
    scale = np.full(nfft // 2 + 1, 2.0 / fs)
    scale[0] = 1.0 / fs
    if nfft % 2 == 0:
        scale[-1] = 1.0 / fs
    lam = ratios[None, :, None]
    out = np.empty((channels, nfft // 2 + 1))
    for e in range(epochs):
        y = data[e] - data[e].mean(axis=-1, keepdims=True)
        eigen = np.abs(np.fft.rfft(tapers[None, :, :] * y[:, None, :], n=nfft, axis=-1)) ** 2
        if weighting == "equal":
            out = eigen.mean(axis=1) * scale
        else:
            variance = np.mean(y ** 2, axis=-1)[:, None, None]
            s = 0.5 * (eigen[:, 0] + eigen[:, 1])[:, None, :]
            for _ in range(100):
                d = np.sqrt(lam) * s / (lam * s + (1 - lam) * variance)
                d2 = d * d
                s_new = ((d2 * eigen).sum(axis=1) / d2.sum(axis=1))[:, None, :]
                change = np.max(np.abs(s_new - s) / s_new)
                s = s_new
                if change < 1e-8:
                    break
            out = s[:, 0, :] * scale
    return time.perf_counter() - start, float(out.sum())


run("equal")  # warm-up
result = {"numpy": np.__version__, "scipy": scipy.__version__}
for weighting in ("equal", "adaptive"):
    seconds, _ = run(weighting)
    result[weighting] = seconds
print(json.dumps(result))
