#!/usr/bin/env python3
"""Offline reference vectors for core/diagnostics (run by a developer, never at test time).

Writes tests/reference/harmonic-vectors.json with:
  * lineHarmonics -- one stator line against a carrier phase track Phi(n), DC + harmonics 1..7
                     (given in-phase/quadrature parts against sin(h Phi) / cos(h Phi)) + seeded
                     noise; for each case a list of segments (whole carrier cycles) and the
                     numpy.linalg.lstsq fit of [1, sin(h Phi), cos(h Phi)], h = 1..H, per
                     segment on the exact per-sample phase, combined over segments weighted by
                     their sample counts (mean power per harmonic, mean complex component).
                     Case "constant": fs = 97.3 kHz, f = 400 Hz (243.25 samples per cycle), three
                     segments of 10, 15 and 12 cycles. Case "drift": the carrier drifts by
                     2 Hz/s (quadratic phase) and one segment spans 40 cycles.
  * ellipse       -- noisy points on c = oc + a cos t, s = os + b sin(t + phi), and the
                     Halir-Flusser (1998) direct ellipse fit computed with numpy.linalg.eig
                     (LAPACK) on the same points, as conic coefficients normalised to
                     4AC - B^2 = 1, A > 0.
  * heydemann     -- noisy points of the Heydemann (1981) model and numpy.linalg.lstsq of
                     A u1^2 + B u2^2 + C u1 u2 + D u1 + E u2 = 1 on the raw (uncentred) points
                     ('lstsq') and on the points centred on their mean and scaled to unit RMS
                     radius ('lstsqCentred'; the algebraic criterion depends on the frame).

Samples are rounded to 12 significant digits; every reference result is computed from the
rounded samples exactly as stored.

Usage:  python3 scripts/reference/gen_harmonic_vectors.py   (numpy >= 1.24)
"""
import json
import math
import os

import numpy as np

OUT = os.path.join(os.path.dirname(__file__), '..', '..', 'tests', 'reference', 'harmonic-vectors.json')


def r12(v):
    return [float(f'{x:.12g}') for x in np.asarray(v, dtype=float)]


def line_case(name, fs, f0, phi0, drift_hz_per_s, n, parts, dc, noise, seg_cycles, H, seed):
    rng = np.random.default_rng(seed)
    k = np.arange(n, dtype=float)
    t = k / fs
    phase = phi0 + 2 * np.pi * (f0 * t + 0.5 * drift_hz_per_s * t * t)
    x = dc + noise * rng.standard_normal(n)
    for h, (i_h, q_h) in parts.items():
        x = x + i_h * np.sin(h * phase) + q_h * np.cos(h * phase)
    x = np.array(r12(x))
    # Whole cycles: boundary of cycle m = first sample with Phi(n) >= phi0 + 2 pi m.
    def boundary(m):
        return int(np.searchsorted(phase, phi0 + 2 * np.pi * m, side='left'))
    segments = []
    for c0, cycles in seg_cycles:
        s0, s1 = boundary(c0), boundary(c0 + cycles)
        segments.append({'startSample': s0, 'lengthSamples': s1 - s0})
    power = np.zeros(H + 1)
    mean_i = np.zeros(H + 1)
    mean_q = np.zeros(H + 1)
    used = 0
    for seg in segments:
        s0, L = seg['startSample'], seg['lengthSamples']
        ph = phase[s0:s0 + L]
        cols = [np.ones(L)]
        for h in range(1, H + 1):
            cols += [np.sin(h * ph), np.cos(h * ph)]
        D = np.column_stack(cols)
        p = np.linalg.lstsq(D, x[s0:s0 + L], rcond=None)[0]
        for h in range(1, H + 1):
            i_h, q_h = p[2 * h - 1], p[2 * h]
            power[h] += L * (i_h ** 2 + q_h ** 2)
            mean_i[h] += L * i_h
            mean_q[h] += L * q_h
        used += L
    power /= used
    mean_i /= used
    mean_q /= used
    harm_power = float(np.sum(power[2:]))
    return {
        'name': name, 'sampleRateHz': fs, 'frequencyHz': f0, 'phase0Rad': phi0, 'driftHzPerS': drift_hz_per_s,
        'n': n, 'harmonics': H, 'segments': segments,
        'truth': {'parts': {str(h): list(v) for h, v in parts.items()}, 'dc': dc, 'noiseSigma': noise},
        'x': x.tolist(),
        'lstsq': {
            'fundamentalRmsV': float(math.sqrt(power[1] / 2)),
            'fundamentalInPhaseV': float(mean_i[1]), 'fundamentalQuadratureV': float(mean_q[1]),
            'harmonicMv': float(math.sqrt(harm_power / 2) * 1000),
            'thdPct': float(100 * math.sqrt(harm_power / power[1])),
            'rmsMv': [0.0, 0.0] + [float(math.sqrt(power[h] / 2) * 1000) for h in range(2, H + 1)],
            'inPhaseMv': [0.0, 0.0] + [float(mean_i[h] / math.sqrt(2) * 1000) for h in range(2, H + 1)],
            'quadratureMv': [0.0, 0.0] + [float(mean_q[h] / math.sqrt(2) * 1000) for h in range(2, H + 1)],
        },
    }


def ellipse_case(seed):
    rng = np.random.default_rng(seed)
    n = 400
    t = np.linspace(0, 2 * np.pi, n, endpoint=False) + 0.1
    oc, os_, a, b, phi = 0.02, -0.015, 1.0, 1.04, math.radians(2.5)
    c = np.array(r12(oc + a * np.cos(t) + 1e-3 * rng.standard_normal(n)))
    s = np.array(r12(os_ + b * np.sin(t + phi) + 1e-3 * rng.standard_normal(n)))
    D1 = np.column_stack([c * c, c * s, s * s])
    D2 = np.column_stack([c, s, np.ones(n)])
    S1, S2, S3 = D1.T @ D1, D1.T @ D2, D2.T @ D2
    T = -np.linalg.solve(S3, S2.T)
    M = S1 + S2 @ T
    C1inv = np.array([[0, 0, 0.5], [0, -1, 0], [0.5, 0, 0]])
    w, V = np.linalg.eig(C1inv @ M)
    V = np.real(V)
    cond = 4 * V[0] * V[2] - V[1] ** 2
    a1 = V[:, int(np.argmax(cond))]
    conic = np.concatenate([a1, T @ a1])
    conic = conic / math.sqrt(4 * conic[0] * conic[2] - conic[1] ** 2)
    if conic[0] < 0:
        conic = -conic
    return {'cos': c.tolist(), 'sin': s.tolist(),
            'truth': {'cosOffset': oc, 'sinOffset': os_, 'cosAmplitude': a, 'sinAmplitude': b, 'skewRad': phi, 'noiseSigma': 1e-3},
            'conic': [float(v) for v in conic]}


def heydemann_case(seed):
    rng = np.random.default_rng(seed)
    n = 1000
    th = 2 * np.pi * rng.uniform(size=n)
    p, q, r, alpha = 0.05, -0.03, 1.08, math.radians(3.0)
    x, y = np.cos(th), np.sin(th)
    u1 = np.array(r12(x + p + 1e-3 * rng.standard_normal(n)))
    u2 = np.array(r12((y * math.cos(alpha) - x * math.sin(alpha)) / r + q + 1e-3 * rng.standard_normal(n)))
    def fit(a, b, m1=0.0, m2=0.0, s=1.0):
        a, b = (a - m1) / s, (b - m2) / s
        D = np.column_stack([a * a, b * b, a * b, a, b])
        A, B, C, Dc, E = np.linalg.lstsq(D, np.ones(n), rcond=None)[0]
        den = C * C - 4 * A * B
        return {'p': float(m1 + s * (2 * B * Dc - E * C) / den), 'q': float(m2 + s * (2 * A * E - Dc * C) / den),
                'r': float(math.sqrt(B / A)), 'alphaRad': float(math.asin(C / math.sqrt(4 * A * B)))}
    m1, m2 = float(np.mean(u1)), float(np.mean(u2))
    sc = float(np.sqrt(np.mean((u1 - m1) ** 2 + (u2 - m2) ** 2)))
    return {'u1': u1.tolist(), 'u2': u2.tolist(),
            'truth': {'p': p, 'q': q, 'r': r, 'alphaRad': alpha, 'noiseSigma': 1e-3},
            'lstsq': fit(u1, u2),
            # the same fit on points centred on their mean and scaled to unit RMS radius
            'lstsqCentred': fit(u1, u2, m1, m2, sc)}


def main():
    parts = {1: (5.0, 0.3), 2: (2e-3, -1e-3), 3: (15e-3, 5e-3), 5: (-2e-3, 1e-3)}
    doc = {
        'generator': 'scripts/reference/gen_harmonic_vectors.py',
        'numpy': np.__version__,
        'model': 'x[n] = dc + sum_h I_h sin(h Phi(n)) + Q_h cos(h Phi(n)) + noise, '
                 'Phi(n) = phase0 + 2 pi (f t + drift t^2 / 2), t = n / fs',
        'lineHarmonics': [
            line_case('constant', 97300.0, 400.0, 0.7, 0.0, 19460, parts, 0.02, 1e-4,
                      [(3, 10), (20, 15), (50, 12)], 7, 4001),
            line_case('drift', 97300.0, 400.0, -1.3, 2.0, 19460, parts, -0.01, 1e-4,
                      [(10, 40)], 7, 4002),
        ],
        'ellipse': ellipse_case(1998),
        'heydemann': heydemann_case(1981),
    }
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    with open(OUT, 'w') as fh:
        json.dump(doc, fh, separators=(',', ':'))
        fh.write('\n')
    for c in doc['lineHarmonics']:
        print(c['name'], 'THD %', c['lstsq']['thdPct'], 'harmonic mV', c['lstsq']['harmonicMv'])
    print('heydemann', doc['heydemann']['lstsq'])
    print('wrote', os.path.normpath(OUT), os.path.getsize(OUT), 'bytes')


if __name__ == '__main__':
    main()
