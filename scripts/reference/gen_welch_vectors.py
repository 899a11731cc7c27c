#!/usr/bin/env python3
"""Offline reference vectors for core/motion/welchPsd.ts (run by a developer, never at test time).

Writes tests/reference/welch-vectors.json: seeded records and their one-sided power spectral
density from scipy.signal.welch(x, fs, window='hann', nperseg, noverlap, detrend, scaling='density',
average='mean') -- Welch 1967 with scipy's periodic Hann window.

Cases:
  * white      -- white Gaussian noise, sigma = 0.3, fs = 1 kHz, N = 4096, nperseg 256 (50 %);
                  also its mean PSD (2 sigma^2 / fs = 1.8e-4 expected), the integral of the PSD
                  (sum * df) and the sample variance;
  * twoTone    -- an angle jitter record in arc-minutes at fs = 400 Hz (one point per 400 Hz
                  carrier cycle), 5 s: 2' at 3.1 Hz + 0.7' at 11.7 Hz + 0.3' white noise + a
                  0.5'/s drift; nperseg 512 (50 %);
  * oddOverlap -- N = 1000 (segments do not tile the record), fs = 50 Hz, nperseg 64, noverlap 16,
                  a quadratic trend plus noise;
  * constant   -- detrend='constant' (mean only), nperseg 128, noverlap 64, on a ramp plus a tone.

Samples are rounded to 12 significant digits and the PSD is computed from the rounded samples
exactly as stored, so the TypeScript side solves the same problem.

Usage:  python3 scripts/reference/gen_welch_vectors.py   (numpy >= 1.24, scipy >= 1.10)
"""
import json
import os

import numpy as np
import scipy
from scipy.signal import welch

OUT = os.path.join(os.path.dirname(__file__), '..', '..', 'tests', 'reference', 'welch-vectors.json')


def r12(v):
    """Round to 12 significant digits and return the floats that JSON will carry."""
    return np.array([float(f'{x:.12g}') for x in np.asarray(v, dtype=float)])


def case(name, x, fs, nperseg, noverlap, detrend):
    x = r12(x)
    f, p = welch(x, fs=fs, window='hann', nperseg=nperseg, noverlap=noverlap, detrend=detrend,
                 scaling='density', average='mean')
    df = f[1] - f[0]
    return {
        'name': name,
        'fs': fs,
        'nperseg': nperseg,
        'noverlap': noverlap,
        'detrend': detrend,
        'x': x.tolist(),
        'f': f.tolist(),
        'psd': p.tolist(),
        'stats': {
            'meanPsd': float(p.mean()),
            'integral': float(p.sum() * df),
            'variance': float(x.var()),
        },
    }


def main():
    rng = np.random.default_rng(20240917)
    cases = []

    sigma = 0.3
    cases.append(case('white', sigma * rng.standard_normal(4096), 1000.0, 256, 128, 'linear'))

    fs = 400.0
    t = np.arange(2000) / fs
    x = (2.0 * np.sin(2 * np.pi * 3.1 * t + 0.4) + 0.7 * np.sin(2 * np.pi * 11.7 * t + 1.9)
         + 0.3 * rng.standard_normal(t.size) + 0.5 * t)
    cases.append(case('twoTone', x, fs, 512, 256, 'linear'))

    fs = 50.0
    t = np.arange(1000) / fs
    x = 0.02 * t ** 2 - 0.3 * t + 1.0 * rng.standard_normal(t.size)
    cases.append(case('oddOverlap', x, fs, 64, 16, 'linear'))

    fs = 1000.0
    t = np.arange(3000) / fs
    x = 0.8 * t + 0.05 * np.sin(2 * np.pi * 87.3 * t) + 0.01 * rng.standard_normal(t.size)
    cases.append(case('constant', x, fs, 128, 64, 'constant'))

    doc = {
        'generator': 'scripts/reference/gen_welch_vectors.py',
        'numpy': np.__version__,
        'scipy': scipy.__version__,
        'call': "scipy.signal.welch(x, fs, window='hann', nperseg, noverlap, detrend, scaling='density', average='mean')",
        'cases': cases,
    }
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, 'w') as fh:
        json.dump(doc, fh, separators=(',', ':'))
        fh.write('\n')
    for c in cases:
        s = c['stats']
        print(f"{c['name']}: N={len(c['x'])} bins={len(c['psd'])} mean PSD={s['meanPsd']:.6g} "
              f"integral={s['integral']:.6g} variance={s['variance']:.6g}")
    print('wrote', os.path.normpath(OUT), os.path.getsize(OUT), 'bytes')


if __name__ == '__main__':
    main()
