#!/usr/bin/python3
"""numpy/scipy side of bench/fft.ts: microseconds per inverse complex transform at the given lengths.

Usage: /usr/bin/python3 bench/scipy-fft.py ROWS N [N ...]
Each call of scipy.fft.ifft transforms ROWS rows at once (workers=1), as bench/scipy-morlet.py does over
the channels of an epoch; the time per row is reported, the best of several rounds (the machine is shared).
Prints one JSON object: versions and {n: microseconds per row}.
"""
import json
import os
import sys
import time

for name in ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(name, "1")

import numpy as np  # noqa: E402
import scipy  # noqa: E402
import scipy.fft  # noqa: E402

rows = int(sys.argv[1])
sizes = [int(v) for v in sys.argv[2:]]
result = {}
for n in sizes:
    rng = np.random.default_rng(n)
    x = rng.uniform(-1, 1, (rows, n)) + 1j * rng.uniform(-1, 1, (rows, n))
    calls = 1
    while True:
        start = time.perf_counter()
        for _ in range(calls):
            scipy.fft.ifft(x, axis=-1, workers=1)
        if time.perf_counter() - start > 0.02:
            break
        calls *= 2
    best = float("inf")
    for _ in range(7):
        start = time.perf_counter()
        for _ in range(calls):
            scipy.fft.ifft(x, axis=-1, workers=1)
        best = min(best, (time.perf_counter() - start) / (calls * rows))
    result[str(n)] = best * 1e6
print(json.dumps({"numpy": np.__version__, "scipy": scipy.__version__, "micros": result}))
