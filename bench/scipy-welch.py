#!/usr/bin/python3
"""scipy reference timing for bench/welch.ts: scipy.signal.welch called once per channel.

Usage: scipy-welch.py DATA CHANNELS SAMPLES FS SEGMENT OVERLAP REPEATS RUN [RUN ...]
RUN is FFTLENGTH:AVERAGE (e.g. 1024:mean). DATA holds CHANNELS x SAMPLES little-endian float64,
channel-major. Prints one JSON object: {"scipy": version, "numpy": version,
"runs": [{"fftLength", "average", "seconds" (best of REPEATS), "psd0" (channel 0, list)}]}.
"""
import json
import sys
import time

import numpy as np

try:
    import scipy
    from scipy import signal
except ImportError:  # the TypeScript side prints a note instead of a ratio
    print(json.dumps({'error': 'scipy is not installed for this interpreter'}))
    sys.exit(0)


def main():
    path, channels, samples, fs, segment, overlap, repeats = sys.argv[1:8]
    channels, samples, segment, overlap, repeats = map(int, (channels, samples, segment, overlap, repeats))
    fs = float(fs)
    x = np.fromfile(path, dtype='<f8').reshape(channels, samples)
    window = signal.get_window('hann', segment, fftbins=True)
    runs = []
    for run in sys.argv[8:]:
        nfft, average = run.split(':')
        nfft = int(nfft)
        best = float('inf')
        for _ in range(repeats):
            start = time.perf_counter()
            for c in range(channels):
                f, p = signal.welch(x[c], fs=fs, window=window, nperseg=segment, noverlap=overlap, nfft=nfft,
                                    detrend='constant', scaling='density', average=average)
                if c == 0:
                    psd0 = p
            best = min(best, time.perf_counter() - start)
        runs.append({'fftLength': nfft, 'average': average, 'seconds': best, 'psd0': psd0.tolist()})
    print(json.dumps({'scipy': scipy.__version__, 'numpy': np.__version__, 'runs': runs}))


if __name__ == '__main__':
    main()
