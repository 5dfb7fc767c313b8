#!/usr/bin/python3
"""numpy/scipy side of bench/morlet.ts: the same Morlet power workload by FFT convolution.

Usage: /usr/bin/python3 bench/scipy-morlet.py EPOCHS CHANNELS SAMPLES SAMPLING_RATE F_LOW F_HIGH COUNT CYCLES [WORKERS]
WORKERS (default 1) is scipy.fft's `workers`: the transforms of one call are spread over that many
threads (over the channel axis); the products and powers stay on one thread, as numpy does them.
Prints one JSON object: seconds, cpu (process CPU seconds, all threads), versions, and the per-frequency sum of power over all the data (a
cross-check against the TypeScript run, which uses the same sine-hash data and wavelets).
"""
import json
import math
import os
import sys
import time

for name in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(name, "1")

import numpy as np  # noqa: E402
import scipy  # noqa: E402
import scipy.fft  # noqa: E402

epochs, channels, samples = (int(v) for v in sys.argv[1:4])
fs, f_low, f_high = (float(v) for v in sys.argv[4:7])
count, cycles = int(sys.argv[7]), float(sys.argv[8])
workers = int(sys.argv[9]) if len(sys.argv) > 9 else 1

# the same deterministic sine-hash data as bench/morlet.ts, uniform on [-1/2, 1/2)
index = (np.arange(epochs * channels)[:, None] * samples + np.arange(samples)[None, :] + 1).astype(np.float64)
h = np.sin(index * 12.9898) * 43758.5453
data = (h - np.floor(h) - 0.5).reshape(epochs, channels, samples)
frequencies = f_low * (f_high / f_low) ** (np.arange(count) / (count - 1))


def transform_length(n):
    # as in src/dsp/morlet.ts: the smallest m*2^a >= n, m in {1, 3, 5, 9}
    return min(m << max(0, math.ceil(math.log2(n / m))) for m in (1, 3, 5, 9))


def run():
    cpu = time.process_time()
    start = time.perf_counter()
    # wavelet spectra: sampled over +-6 sigma_t, divided by the envelope sum (unit gain at f)
    bank = []
    for f in frequencies:
        sigma = cycles / (2 * np.pi * f)
        half = math.ceil(6 * sigma * fs)
        m = np.arange(-half, half + 1)
        envelope = np.exp(-(m / fs) ** 2 / (2 * sigma ** 2))
        psi = envelope * np.exp(2j * np.pi * f * m / fs) / envelope.sum()
        # as the TypeScript side: only lags |k| <= kept = min(M, samples - 1) meet the signal, laid out
        # at h[k mod L]; L >= samples + kept keeps outputs 0..samples-1 free of aliases
        kept = min(half, samples - 1)
        size = transform_length(samples + kept)
        kernel = np.zeros(size, dtype=complex)
        kernel[np.arange(-kept, kept + 1) % size] = psi[half - kept:half + kept + 1]
        bank.append((size, scipy.fft.fft(kernel)))
    sizes = sorted({size for size, _ in bank})
    totals = np.zeros(count)
    for e in range(epochs):
        spectra = {size: scipy.fft.fft(data[e], size, axis=-1, workers=workers) for size in sizes}
        for j, (size, spectrum) in enumerate(bank):
            w = scipy.fft.ifft(spectra[size] * spectrum, axis=-1, workers=workers)[:, :samples]
            power = 2.0 * (w.real ** 2 + w.imag ** 2)
            totals[j] += power.sum()
    return time.perf_counter() - start, time.process_time() - cpu, totals


seconds, cpu, totals = run()
print(json.dumps({"seconds": seconds, "cpu": cpu, "numpy": np.__version__, "scipy": scipy.__version__, "totals": totals.tolist()}))
