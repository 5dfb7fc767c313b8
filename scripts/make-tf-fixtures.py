#!/usr/bin/python3
"""Reference values for the time-frequency and connectivity tests, computed with scipy and numpy.

Run: /usr/bin/python3 scripts/make-tf-fixtures.py   (scipy 1.10.1, numpy 1.24.2)

Writes test/fixtures/tf/*.json:
- spectrogram.json: scipy.signal.spectrogram(..., scaling='density', mode='psd'); the DPSS case is the
  mean over tapers of scipy's spectrogram with each taper as the window (dpss norm=2: unit energy).
- coherence.json: scipy.signal.coherence for several windows and overlaps.
- morlet.json: numpy.convolve of a signal with Morlet wavelets sampled as the brief defines them
  (support +-6 sigma_t, divided by the sum of the Gaussian envelope), an independent time-domain route.
- phase-null.json: E[R_n], the mean resultant length of n uniform random phases, from
  E|S_n| = integral_0^inf (1 - J0(t)^n)/t^2 dt (scipy.integrate.quad with scipy.special.j0).
Inputs are seeded numpy noise plus tones, stored as float32-exact values (base64 little-endian float32,
key `x32`) so the TypeScript side reads the very same samples; outputs are float64 base64.
"""
import importlib.util
import json
import math
import os

import numpy as np
import scipy
from scipy import integrate, signal, special

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), '..', 'test', 'fixtures', 'tf')
SEED = 20240917

WINDOWS = {
    'rectangular': 'boxcar', 'hann': 'hann', 'hamming': 'hamming', 'blackman': 'blackman',
    'blackman-harris': 'blackmanharris', 'flat-top': 'flattop',
}
DETRENDS = {'none': False, 'mean': 'constant', 'linear': 'linear'}


def _welch_generator():
    # the float32/float64 base64 writers of the Welch fixtures, shared rather than copied
    path = os.path.join(os.path.dirname(os.path.abspath(__file__)), 'make-welch-fixtures.py')
    spec = importlib.util.spec_from_file_location('make_welch_fixtures', path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


_WELCH = _welch_generator()
b64, b64_f32 = _WELCH.b64, _WELCH.b64_f32


def provenance(what):
    return {'generator': 'scripts/make-tf-fixtures.py', 'what': what, 'scipy': scipy.__version__,
            'numpy': np.__version__, 'seed': SEED}


def f32(a):
    return np.asarray(a, dtype=np.float32).astype(np.float64)


def noisy(rng, n, fs, tones):
    t = np.arange(n) / fs
    x = rng.standard_normal(n) + 0.3 * t
    for amp, freq, phase in tones:
        x += amp * np.sin(2 * np.pi * freq * t + phase)
    return f32(x)


def write(name, payload):
    with open(os.path.join(OUT, name), 'w') as fh:
        json.dump(payload, fh, indent=1, sort_keys=True)
        fh.write('\n')


def spectrogram_cases(rng):
    specs = [
        dict(name='hann-256-half', samplingRate=256.0, n=2000, segmentSamples=256, overlapSamples=128,
             fftLength=256, window='hann', detrend='mean'),
        dict(name='hamming-200-padded-linear', samplingRate=500.0, n=1700, segmentSamples=200, overlapSamples=150,
             fftLength=512, window='hamming', detrend='linear'),
        dict(name='rectangular-odd-none', samplingRate=100.0, n=1100, segmentSamples=255, overlapSamples=0,
             fftLength=255, window='rectangular', detrend='none'),
        dict(name='blackman-harris-fft-200', samplingRate=250.0, n=1500, segmentSamples=128, overlapSamples=96,
             fftLength=200, window='blackman-harris', detrend='mean'),
        dict(name='flat-top-odd-fft', samplingRate=1000.0, n=3001, segmentSamples=300, overlapSamples=100,
             fftLength=301, window='flat-top', detrend='linear'),
        dict(name='dpss-nw3-k5', samplingRate=256.0, n=2048, segmentSamples=256, overlapSamples=192,
             fftLength=256, window=None, timeBandwidth=3.0, taperCount=5, detrend='mean'),
    ]
    cases = []
    for spec in specs:
        fs, n = spec['samplingRate'], spec['n']
        x = noisy(rng, n, fs, [(3.0, fs / 9.7, 0.4), (1.0, fs / 4.3, 1.1)])
        common = dict(fs=fs, nperseg=spec['segmentSamples'], noverlap=spec['overlapSamples'], nfft=spec['fftLength'],
                      detrend=DETRENDS[spec['detrend']], scaling='density', mode='psd')
        if spec['window'] is None:
            tapers = signal.windows.dpss(spec['segmentSamples'], spec['timeBandwidth'], spec['taperCount'])
            total = None
            for taper in tapers:
                f, t, sxx = signal.spectrogram(x, window=taper, **common)
                total = sxx if total is None else total + sxx
            sxx = total / len(tapers)
        else:
            f, t, sxx = signal.spectrogram(x, window=WINDOWS[spec['window']], **common)
        case = {k: v for k, v in spec.items() if k != 'n'}
        case.update(x32=b64_f32(x), frequencies=b64(f), times=b64(t), power=b64(sxx.T.ravel()),
                    timeCount=int(sxx.shape[1]), frequencyCount=int(sxx.shape[0]))
        cases.append(case)
    return cases


def coherence_cases(rng):
    specs = [
        dict(name='hann-256-half', samplingRate=256.0, n=4096, segmentSamples=256, overlapSamples=128,
             fftLength=256, window='hann', detrend='mean'),
        dict(name='hamming-200-padded-linear', samplingRate=500.0, n=5000, segmentSamples=200, overlapSamples=100,
             fftLength=256, window='hamming', detrend='linear'),
        dict(name='rectangular-128-none', samplingRate=128.0, n=2048, segmentSamples=128, overlapSamples=0,
             fftLength=128, window='rectangular', detrend='none'),
    ]
    cases = []
    for spec in specs:
        fs, n = spec['samplingRate'], spec['n']
        t = np.arange(n) / fs
        shared = np.sin(2 * np.pi * fs / 12.5 * t) + 0.5 * np.sin(2 * np.pi * fs / 5.3 * t + 0.2)
        x = f32(shared + rng.standard_normal(n))
        y = f32(0.8 * np.roll(shared, 3) + rng.standard_normal(n))
        f, cxy = signal.coherence(x, y, fs=fs, window=WINDOWS[spec['window']], nperseg=spec['segmentSamples'],
                                  noverlap=spec['overlapSamples'], nfft=spec['fftLength'],
                                  detrend=DETRENDS[spec['detrend']])
        case = {k: v for k, v in spec.items() if k != 'n'}
        case.update(x32=b64_f32(x), y32=b64_f32(y), frequencies=b64(f), coherence=b64(cxy))
        cases.append(case)
    return cases


def morlet_case(rng):
    fs, n = 200.0, 700
    x = noisy(rng, n, fs, [(2.0, 10.5, 0.3), (1.0, 31.0, 2.0)])
    frequencies = [4.0, 10.5, 31.0, 62.0]
    cycles = [4.0, 7.0, 9.0, 12.0]
    re_rows, im_rows = [], []
    for freq, nc in zip(frequencies, cycles):
        sigma = nc / (2 * np.pi * freq)
        half = math.ceil(6 * sigma * fs)
        m = np.arange(-half, half + 1)
        envelope = np.exp(-(m / fs) ** 2 / (2 * sigma ** 2))
        psi = envelope * np.exp(2j * np.pi * freq * m / fs) / envelope.sum()
        full = np.convolve(x, psi)  # full linear convolution, length n + 2*half
        w = full[half:half + n]
        re_rows.append(w.real)
        im_rows.append(w.imag)
    return dict(samplingRate=fs, frequencies=frequencies, cycles=cycles, x32=b64_f32(x),
                re=b64(np.array(re_rows).T.ravel()), im=b64(np.array(im_rows).T.ravel()))


def mean_resultant_length(n):
    # E|S_n| = integral_0^inf (1 - J0(t)^n)/t^2 dt; the integrand is integrated piecewise to T and the
    # tail beyond T is 1/T (J0^n/t^2 integrates to far below the stated precision there)
    top = 4000.0
    edges = np.linspace(0.0, top, 40001)
    total = 0.0
    for a, b in zip(edges[:-1], edges[1:]):
        value, _ = integrate.quad(lambda t: (1 - special.j0(t) ** n) / t ** 2 if t > 0 else n / 4.0, a, b,
                                  epsabs=1e-15, epsrel=1e-12, limit=200)
        total += value
    return (total + 1.0 / top) / n


def main():
    os.makedirs(OUT, exist_ok=True)
    rng = np.random.default_rng(SEED)
    write('spectrogram.json', {'provenance': provenance('scipy.signal.spectrogram, density/psd'),
                               'cases': spectrogram_cases(rng)})
    write('coherence.json', {'provenance': provenance('scipy.signal.coherence'), 'cases': coherence_cases(rng)})
    write('morlet.json', {'provenance': provenance('numpy.convolve with sampled unit-gain Morlet wavelets'),
                          'case': morlet_case(rng)})
    counts = [1, 2, 3, 4, 5, 7, 10, 20, 50, 100]
    import warnings
    with warnings.catch_warnings():
        warnings.simplefilter('ignore', integrate.IntegrationWarning)
        values = [{'trials': n, 'mean': mean_resultant_length(n)} for n in counts]
    write('phase-null.json', {'provenance': provenance('E[R_n] by quadrature of (1 - J0^n)/t^2'),
                              'closedForms': {'1': 1.0, '2': 2 / math.pi}, 'values': values})


if __name__ == '__main__':
    main()
