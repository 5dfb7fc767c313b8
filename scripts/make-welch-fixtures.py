#!/usr/bin/python3
"""Reference values for the Welch / window / detrend tests, computed with scipy and numpy.

Run: /usr/bin/python3 scripts/make-welch-fixtures.py   (scipy 1.10.1, numpy 1.24.2)

Writes test/fixtures/welch/*.json. Inputs are seeded numpy noise plus tones, stored in the
fixture as float32-exact values in base64 (little-endian float32, key `x32`) so the TypeScript side reads the
very same samples. PSDs are stored as float64 base64 as well.
"""
import base64
import json
import os
import sys

import numpy as np
import scipy
from scipy import signal

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), '..', 'test', 'fixtures', 'welch')
SEED = 20240611

# our window names -> scipy get_window arguments
WINDOWS = {
    'rectangular': 'boxcar',
    'hann': 'hann',
    'hamming': 'hamming',
    'blackman': 'blackman',
    'blackman-harris': 'blackmanharris',
    'flat-top': 'flattop',
    'tukey': ('tukey', 0.25),
}
TUKEY_RATIO = 0.25
# our detrend words -> scipy's
DETRENDS = {'none': False, 'mean': 'constant', 'linear': 'linear'}


def b64(a):
    return base64.b64encode(np.ascontiguousarray(a, dtype='<f8').tobytes()).decode('ascii')


def b64_f32(a):
    # only for float32-exact inputs: the widening back to float64 on the reader side is exact
    f = np.ascontiguousarray(a, dtype='<f4')
    assert np.array_equal(f.astype(np.float64), a)
    return base64.b64encode(f.tobytes()).decode('ascii')


def provenance():
    return {
        'generator': 'scripts/make-welch-fixtures.py',
        'scipy': scipy.__version__,
        'numpy': np.__version__,
        'seed': SEED,
    }


def make_input(rng, n, fs):
    t = np.arange(n) / fs
    x = (rng.standard_normal(n)
         + 3.0 * np.sin(2 * np.pi * 10.3 * t + 0.4)
         + 0.5 * np.sin(2 * np.pi * 47.0 * t)
         + 0.002 * t * fs / n * 40.0   # slow drift so the detrend choice matters
         + 1.5)
    # float32-exact samples survive any text or binary round trip bit for bit
    return x.astype(np.float32).astype(np.float64)


def welch_cases(rng):
    """(name, fs, n, segment, overlap, fftLength, window, detrend, average)"""
    cases = []
    fs = 250.0
    # every window x every detrend x both averages at one non-power-of-two geometry
    for w in WINDOWS:
        for d in DETRENDS:
            for a in ('mean', 'median'):
                cases.append((f'{w}-{d}-{a}', fs, 3000, 250, 125, 250, w, d, a))
    # fftLength coverage, including primes, odd lengths and padding beyond the segment
    for nfft, seg, ov in ((500, 500, 250), (1000, 1000, 500), (250, 200, 100), (997, 997, 400),
                          (1001, 1001, 0), (768, 768, 384), (1025, 1025, 512), (1024, 1000, 500),
                          (1000, 750, 375), (997, 600, 300), (2048, 512, 256), (1, 1, 0), (2, 2, 1),
                          (3, 3, 1), (7, 5, 2)):
        for a in ('mean', 'median'):
            cases.append((f'fft{nfft}-seg{seg}-ov{ov}-{a}', fs, 4 * seg + 37, seg, ov, nfft, 'hann', 'mean', a))
    # a few segment counts around the median-bias steps (1, 2, 3, 4, 5 segments)
    for count in (1, 2, 3, 4, 5):
        seg = 128
        cases.append((f'count{count}-median', fs, seg * count + 17, seg, 0, seg, 'hamming', 'linear', 'median'))
    return cases


def main():
    rng = np.random.default_rng(SEED)
    os.makedirs(OUT, exist_ok=True)

    records = []
    for name, fs, n, seg, ov, nfft, w, d, a in welch_cases(rng):
        x = make_input(rng, n, fs)
        win = signal.get_window(WINDOWS[w], seg, fftbins=True)
        f, p = signal.welch(x, fs=fs, window=win, nperseg=seg, noverlap=ov, nfft=nfft,
                            detrend=DETRENDS[d], scaling='density', average=a)
        records.append({
            'name': name, 'samplingRate': fs, 'segmentSamples': seg, 'overlapSamples': ov,
            'fftLength': nfft, 'window': w, 'tukeyRatio': TUKEY_RATIO if w == 'tukey' else None,
            'detrend': d, 'average': a, 'x32': b64_f32(x), 'frequencies': b64(f), 'psd': b64(p),
            'segmentCount': (n - ov) // (seg - ov),
        })
    with open(os.path.join(OUT, 'welch-cases.json'), 'w') as fh:
        json.dump({'provenance': provenance(),
                   'call': 'scipy.signal.welch(x, fs, window=get_window(w, segmentSamples, fftbins=True), '
                           'nperseg=segmentSamples, noverlap=overlapSamples, nfft=fftLength, '
                           'detrend=False|"constant"|"linear", scaling="density", average)',
                   'cases': records}, fh, separators=(',', ':'))

    windows = []
    for w, arg in WINDOWS.items():
        for length in (1, 2, 3, 8, 17, 100, 250, 1000, 1025):
            windows.append({'window': w, 'tukeyRatio': TUKEY_RATIO if w == 'tukey' else None,
                            'length': length, 'values': b64(signal.get_window(arg, length, fftbins=True))})
    for ratio in (0.0, 0.1, 0.5, 0.9, 1.0):
        for length in (9, 64, 101):
            windows.append({'window': 'tukey', 'tukeyRatio': ratio, 'length': length,
                            'values': b64(signal.get_window(('tukey', ratio), length, fftbins=True))})
    with open(os.path.join(OUT, 'windows.json'), 'w') as fh:
        json.dump({'provenance': provenance(), 'call': 'scipy.signal.get_window(w, length, fftbins=True)',
                   'windows': windows}, fh, separators=(',', ':'))

    detrends = []
    for n in (1, 2, 3, 10, 257, 1000):
        x = make_input(rng, n, 100.0) + 0.01 * np.arange(n) ** 1.5
        x = x.astype(np.float32).astype(np.float64)
        detrends.append({'length': n, 'x32': b64_f32(x),
                         'mean': b64(signal.detrend(x, type='constant')),
                         'linear': b64(signal.detrend(x, type='linear'))})
    with open(os.path.join(OUT, 'detrend.json'), 'w') as fh:
        json.dump({'provenance': provenance(), 'call': 'scipy.signal.detrend(x, type="constant"|"linear")',
                   'cases': detrends}, fh, separators=(',', ':'))

    bias = [{'count': c, 'bias': float(signal._spectral_py._median_bias(c))} for c in range(1, 40)]
    with open(os.path.join(OUT, 'median-bias.json'), 'w') as fh:
        json.dump({'provenance': provenance(), 'call': 'scipy.signal._spectral_py._median_bias(count)',
                   'values': bias}, fh, separators=(',', ':'))
    sys.stdout.write(f'wrote {len(records)} welch cases, {len(windows)} windows, {len(detrends)} detrend cases\n')


if __name__ == '__main__':
    main()
