#!/usr/bin/env python3
"""Offline reference vectors for the core/dsp kernels (run by a developer, never at test time).

Writes tests/reference/sine-fit-vectors.json with:
  * fft        -- numpy.fft.rfft of seeded Gaussian vectors, sizes 8..4096 (powers of two);
  * windows    -- coherent gain and NENBW of scipy.signal.windows hann / blackmanharris /
                  flattop (periodic, sym=False), N = 4096;
  * sineFit    -- noisy tones (N 64..4096, SNR 10..60 dB, fractional bin 0 / 0.25 / 0.5, some
                  with a DC offset and a 3rd harmonic), the scipy.optimize.least_squares
                  minimum of the IEEE Std 1057 four-parameter model
                  x[n] = a cos(w t) + b sin(w t) + c,  t = n / fs,
                  and the real-tone Cramer-Rao bounds (Kay 1993, ch. 3);
  * grandke    -- numpy evaluation of the Hann-window + Grandke (1983) ratio interpolator on a
                  noise-free real tone of ~10 cycles in N = 64 samples, over fractional offsets
                  and phases;
  * harmonics  -- the 12.37-cycles-in-4096-samples THD signal (harmonics 2, 3, 5 of 1e-3, 3e-3,
                  5e-4, DC 0.01, noise 1e-5) and numpy.linalg.lstsq of DC + 7 harmonics at the
                  known fundamental.

Samples are rounded to 12 significant digits; every reference result is computed from the
rounded samples exactly as stored, so the TypeScript side solves the same problem.

Usage:  python3 scripts/reference/gen_sine_fit_vectors.py   (numpy >= 1.24, scipy >= 1.10)
"""
import json
import math
import os

import numpy as np
import scipy
from scipy.optimize import least_squares
from scipy.signal import windows as sw

OUT = os.path.join(os.path.dirname(__file__), '..', '..', 'tests', 'reference', 'sine-fit-vectors.json')


def r12(v):
    """Round to 12 significant digits and return the float that JSON will carry."""
    return [float(f'{x:.12g}') for x in np.asarray(v, dtype=float)]


def fft_vectors():
    rng = np.random.default_rng(20240601)
    out = []
    for p in range(3, 13):
        n = 1 << p
        x = np.array(r12(rng.standard_normal(n)))
        X = np.fft.rfft(x)
        out.append({'n': n, 'x': x.tolist(), 're': X.real.tolist(), 'im': X.imag.tolist()})
    return out


def window_metrics():
    n = 4096
    res = {}
    for name, w in (('hann', sw.hann(n, sym=False)),
                    ('blackmanHarris4', sw.blackmanharris(n, sym=False)),
                    ('flatTop', sw.flattop(n, sym=False))):
        res[name] = {
            'n': n,
            'coherentGain': float(w.sum() / n),
            'nenbwBins': float(n * (w ** 2).sum() / w.sum() ** 2),
            # a few raw samples for a pointwise check of the definition
            'samples': {str(i): float(w[i]) for i in (0, 1, 7, 1000, 2048, 3001, 4095)},
        }
    return res


def fit4_scipy(x, fs, f0):
    """scipy least_squares (MINPACK LM) on the literal model, t counted from the first sample."""
    n = np.arange(len(x), dtype=float)
    t = n / fs

    def model(p):
        f, a, b, c = p
        w = 2 * np.pi * f
        return a * np.cos(w * t) + b * np.sin(w * t) + c

    def resid(p):
        return model(p) - x

    def jac(p):
        f, a, b, c = p
        w = 2 * np.pi * f
        cw, sw_ = np.cos(w * t), np.sin(w * t)
        return np.column_stack([2 * np.pi * t * (-a * sw_ + b * cw), cw, sw_, np.ones_like(t)])

    # start: 3-parameter linear LS at f0
    w0 = 2 * np.pi * f0
    D = np.column_stack([np.cos(w0 * t), np.sin(w0 * t), np.ones_like(t)])
    a0, b0, c0 = np.linalg.lstsq(D, x, rcond=None)[0]
    sol = least_squares(resid, [f0, a0, b0, c0], jac=jac, method='lm', x_scale='jac',
                        xtol=1e-15, ftol=1e-15, gtol=1e-15, max_nfev=10000)
    f, a, b, c = sol.x
    # polish: the concentrated (variable-projection) cost is minimised at the same f; a, b, c
    # are then the exact linear LS solution at that f.
    w = 2 * np.pi * f
    D = np.column_stack([np.cos(w * t), np.sin(w * t), np.ones_like(t)])
    a, b, c = np.linalg.lstsq(D, x, rcond=None)[0]
    r = model([f, a, b, c]) - x
    return {'frequencyHz': float(f), 'a': float(a), 'b': float(b), 'offset': float(c),
            'residualRms': float(np.sqrt(np.mean(r ** 2))), 'status': int(sol.status),
            'optimality': float(sol.optimality)}


def crlb_real_tone(n, eta, fs):
    """Kay 1993 ch. 3 (real sinusoid in WGN), eta = A^2 / (2 sigma^2)."""
    var_f = 12.0 / ((2 * np.pi) ** 2 * eta * n * (n * n - 1)) * fs * fs
    return {'frequencyHz2': var_f,
            'phaseAtStartRad2': 2.0 * (2 * n - 1) / (eta * n * (n + 1)),
            'phaseAtCentreRad2': 1.0 / (eta * n)}


def sine_fit_cases():
    rng = np.random.default_rng(1057)
    specs = [
        # name, N, fs, cycles (integer + fractional bin), amplitude, phase, snrDb, dc, h3 rel
        ('n64-frac0.25-snr30', 64, 1000.0, 7.25, 1.0, 0.3, 30.0, 0.0, 0.0),
        ('n128-frac0-snr10', 128, 48000.0, 13.0, 2.5, -1.2, 10.0, 0.0, 0.0),
        ('n256-frac0.5-snr20-dc', 256, 100000.0, 20.5, 0.8, 2.0, 20.0, 0.15, 0.0),
        ('n512-frac0.25-snr40-h3', 512, 250000.0, 9.25, 1.0, 0.9, 40.0, 0.0, 0.02),
        ('n1024-frac0.5-snr60-dc-h3', 1024, 1.0e6, 40.5, 3.0, -2.7, 60.0, -0.4, 0.01),
        ('n4096-frac0-snr50-dc', 4096, 200000.0, 8.0, 1.2, 1.4, 50.0, 0.05, 0.0),
    ]
    cases = []
    for name, N, fs, cyc, A, phi, snr_db, dc, h3 in specs:
        f = cyc * fs / N
        eta = 10 ** (snr_db / 10)
        sigma = A / math.sqrt(2 * eta)
        n = np.arange(N, dtype=float)
        t = n / fs
        clean = A * np.sin(2 * np.pi * f * t + phi) + dc
        if h3:
            clean = clean + h3 * A * np.sin(3 * 2 * np.pi * f * t + 0.7)
        x = np.array(r12(clean + sigma * rng.standard_normal(N)))
        # scipy is started half a bin-tenth off the true frequency (inside the basin); its
        # minimum does not depend on the start.
        ref = fit4_scipy(x, fs, f + 0.1 * fs / N)
        cases.append({'name': name, 'n': N, 'sampleRateHz': fs,
                      'truth': {'frequencyHz': f, 'amplitude': A, 'phaseRad': phi, 'offset': dc,
                                'thirdHarmonicRelative': h3, 'snrDb': snr_db, 'noiseSigma': sigma},
                      'x': x.tolist(), 'scipy': ref, 'crlb': crlb_real_tone(N, eta, fs)})
    return cases


def grandke_hann(x):
    """Hann (periodic) window + rFFT + Grandke ratio on the larger neighbour; returns k + delta."""
    n = len(x)
    w = sw.hann(n, sym=False)
    X = np.abs(np.fft.rfft(x * w))
    k = int(np.argmax(X[2:n // 2 - 1])) + 2
    if X[k + 1] >= X[k - 1]:
        al = X[k + 1] / X[k]
        d = (2 * al - 1) / (al + 1)
    else:
        al = X[k - 1] / X[k]
        d = -(2 * al - 1) / (al + 1)
    return k + d


def grandke_cases():
    n = 64
    offsets = [i / 20 for i in range(11)]          # 0 .. 0.5 bin
    phases = [2 * np.pi * j / 12 for j in range(12)]
    rows = []
    for d in offsets:
        for ph in phases:
            cyc = 10 + d
            x = np.cos(2 * np.pi * cyc * np.arange(n) / n + ph)
            rows.append({'cycles': cyc, 'phaseRad': ph, 'estimateBins': float(grandke_hann(x))})
    worst = max(abs(r['estimateBins'] - r['cycles']) for r in rows)
    return {'n': n, 'rows': rows, 'worstBiasBins': worst}


def harmonics_case():
    rng = np.random.default_rng(1241)
    N, fs = 4096, 100000.0
    cyc = 12.37
    f = cyc * fs / N
    t = np.arange(N) / fs
    amps = {1: 1.0, 2: 1e-3, 3: 3e-3, 5: 5e-4}
    ph = {h: float(rng.uniform(-np.pi, np.pi)) for h in amps}
    clean = 0.01 + sum(A * np.sin(2 * np.pi * h * f * t + ph[h]) for h, A in amps.items())
    x = np.array(r12(clean + 1e-5 * rng.standard_normal(N)))
    H = 7
    cols = [np.ones(N)]
    for h in range(1, H + 1):
        cols += [np.cos(2 * np.pi * h * f * t), np.sin(2 * np.pi * h * f * t)]
    D = np.column_stack(cols)
    p = np.linalg.lstsq(D, x, rcond=None)[0]
    a = [0.0] + [float(p[2 * h - 1]) for h in range(1, H + 1)]
    b = [0.0] + [float(p[2 * h]) for h in range(1, H + 1)]
    A = [0.0] + [math.hypot(a[h], b[h]) for h in range(1, H + 1)]
    thd = math.sqrt(sum(A[h] ** 2 for h in range(2, H + 1))) / A[1]
    r = D @ p - x
    true_thd = math.sqrt(sum(v ** 2 for h, v in amps.items() if h >= 2)) / amps[1]
    return {'n': N, 'sampleRateHz': fs, 'frequencyHz': f, 'harmonics': H,
            'truth': {'amplitudes': {str(h): v for h, v in amps.items()}, 'phasesRad': {str(h): v for h, v in ph.items()},
                      'offset': 0.01, 'noiseSigma': 1e-5, 'thd': true_thd},
            'x': x.tolist(),
            'lstsq': {'offset': float(p[0]), 'a': a, 'b': b, 'amplitudes': A, 'thd': thd,
                      'residualRms': float(np.sqrt(np.mean(r ** 2)))}}


def main():
    doc = {
        'generator': 'scripts/reference/gen_sine_fit_vectors.py',
        'numpy': np.__version__,
        'scipy': scipy.__version__,
        'model': 'x[n] = a*cos(w t) + b*sin(w t) + c, t = n/fs, w = 2 pi f; '
                 'amplitude*sin(w t + phase) with a = A sin(phase), b = A cos(phase)',
        'fft': fft_vectors(),
        'windows': window_metrics(),
        'sineFit': sine_fit_cases(),
        'grandke': grandke_cases(),
        'harmonics': harmonics_case(),
    }
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, 'w') as fh:
        json.dump(doc, fh, separators=(',', ':'))
        fh.write('\n')
    for c in doc['sineFit']:
        s = c['scipy']
        print(f"{c['name']}: f={s['frequencyHz']!r} status={s['status']} opt={s['optimality']:.2e} "
              f"err/sd={(s['frequencyHz'] - c['truth']['frequencyHz']) / math.sqrt(c['crlb']['frequencyHz2']):+.2f}")
    print('grandke worst bias (bins):', doc['grandke']['worstBiasBins'])
    print('THD lstsq:', doc['harmonics']['lstsq']['thd'], 'true:', doc['harmonics']['truth']['thd'])
    print('wrote', os.path.normpath(OUT), os.path.getsize(OUT), 'bytes')


if __name__ == '__main__':
    main()
