"""Yardstick for the benchmark, not part of the product: the obvious pandas + numpy way to do
what `statorscope analyze` does at its core on a 4-channel synchro capture (R1-R2, S1-S3,
S3-S2, S2-S1 after a time column): read the CSV with pandas' C reader, find the carrier from an
FFT peak of the reference (Hann window, parabolic interpolation of the log magnitude), then a
per-cycle lock-in (multiply by cos/sin of the carrier phase, sum over each carrier cycle) and the
Scott-T angle. Prints one JSON line with its own stage timings.

Run with Debian's /usr/bin/python3 (python3-pandas, python3-numpy):
    /usr/bin/python3 tests/bench/pandasAnchor.py capture.csv
"""
import json
import sys
import time

import numpy as np
import pandas as pd


def main(path):
    t0 = time.perf_counter()
    df = pd.read_csv(path)
    t1 = time.perf_counter()
    t = df.iloc[:, 0].to_numpy()
    x = [df.iloc[:, k].to_numpy() for k in range(1, 5)]
    n = len(t)
    fs = (n - 1) / (t[-1] - t[0])

    # Carrier: FFT peak of the reference over at most 2^20 samples.
    m = 1 << min(20, int(np.log2(n)))
    seg = x[0][:m] * np.hanning(m)
    spec = np.abs(np.fft.rfft(seg))
    k = int(np.argmax(spec[1:]) + 1)
    a, b, c = np.log(spec[k - 1 : k + 2] + 1e-300)
    f = (k + 0.5 * (a - c) / (a - 2 * b + c)) * fs / m

    # Per-cycle lock-in against the carrier phase.
    spc = fs / f
    starts = np.round(np.arange(0.0, n - spc, spc)).astype(np.int64)
    w = 2 * np.pi * f / fs * np.arange(n)
    cw = np.cos(w)
    sw = np.sin(w)
    lengths = np.diff(np.append(starts, int(round(starts[-1] + spc))))
    phasors = []
    for ch in x:
        i = np.add.reduceat(ch * cw, starts) * 2 / lengths
        q = np.add.reduceat(ch * sw, starts) * 2 / lengths
        phasors.append((i, q))
    ri, rq = phasors[0]
    rmag = np.hypot(ri, rq)
    signed = [(i * ri + q * rq) / rmag for i, q in phasors[1:]]
    v13, v32, v21 = signed
    angle = np.degrees(np.arctan2(v13, (v32 - v21) / np.sqrt(3))) % 360
    t2 = time.perf_counter()
    print(json.dumps({
        "rows": n,
        "importS": t1 - t0,
        "lockInS": t2 - t1,
        "carrierHz": f,
        "cycles": int(len(starts)),
        "angleFirstDeg": float(angle[0]),
        "angleLastDeg": float(angle[-1]),
    }))


if __name__ == "__main__":
    main(sys.argv[1])
