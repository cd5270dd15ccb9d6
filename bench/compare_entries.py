#!/usr/bin/python3
# SPDX-License-Identifier: MIT
"""Compares two entries files of the same species (docs/performance.md):
 - blocks byte-identical (the input-sha256 line aside: the digest's canonical form may change
   between versions without any change of the data), and T_mid equal;
 - at equal T_mid: the largest change of the fitted curves (Cp/R relative, H/RT and S/R
   absolute, on a 1 K grid over the range) in units of the thresholds, and the largest relative
   change of a max error among those above 1e-9 (smaller ones are rounding noise, e.g. atoms);
 - always: the worst normalised error (max over both ranges of max|dCp|/Cp / thr_cp,
   max|dH|/RT / thr_h, max|dS|/R / thr_s), new against old.
Usage: bench/compare_entries.py OLD.entries NEW.entries THR_CP THR_H THR_S
(THR_*: the fit thresholds of the species, to normalise the errors; docs/performance.md)"""
import sys
def blocks(path):
    """Records of an entries file (format 2): a header line '"NAME" record-version ...' at the
    left margin and the indented field lines below it (docs/entries-format.md)."""
    out = {}; name = None
    for line in open(path):
        if line.startswith('"'):
            name = line.split('"')[1]; out[name] = [line]
        elif name is not None and line.startswith((' ', '\t')) and line.strip():
            out[name].append(line)
    return out
def fields(block):
    return {l.split()[0]: l.split()[1:] for l in block[1:]}
def worst(f, thr):
    w = 0.0
    for key, t in zip(('cp-error', 'h-error', 's-error'), thr):
        v = f[key]  # low max X at-k T rms R high max X at-k T rms R
        w = max(w, float(v[2]) / t, float(v[9]) / t)
    return w
import math
def curves(a, t):
    """Cp/R, H/RT, S/R of the 7 coefficients a at t."""
    cp = a[0] + t * (a[1] + t * (a[2] + t * (a[3] + t * a[4])))
    h = a[0] + t * (a[1] / 2 + t * (a[2] / 3 + t * (a[3] / 4 + t * a[4] / 5))) + a[5] / t
    s = a[0] * math.log(t) + t * (a[1] + t * (a[2] / 2 + t * (a[3] / 3 + t * a[4] / 4))) + a[6]
    return cp, h, s
def curve_change(fo, fn, thr):
    low, mid, high = (float(x) for x in fo['temperatures-k'][1::2])  # low X mid X high X
    worst = 0.0
    t = low
    while t <= high:
        key = 'coefficients-low' if t < mid else 'coefficients-high'
        co = curves([float(x) for x in fo[key]], t)
        cn = curves([float(x) for x in fn[key]], t)
        worst = max(worst, abs(cn[0] - co[0]) / abs(co[0]) / thr[0],
                    abs(cn[1] - co[1]) / thr[1], abs(cn[2] - co[2]) / thr[2])
        t += 1.0
    return worst
def rel(x, y):
    return abs(x - y) / max(abs(x), abs(y), 1e-300)
old, new = blocks(sys.argv[1]), blocks(sys.argv[2])
thr = [float(x) for x in sys.argv[3:6]]
assert old.keys() == new.keys()
identical = same_mid = 0; coef = quality = 0.0; ratios = []
for k in old:
    fo, fn = fields(old[k]), fields(new[k])
    def without_digest(block):
        return [line for line in block if not line.lstrip().startswith('input-sha256 ')]
    identical += without_digest(old[k]) == without_digest(new[k])
    wo, wn = worst(fo, thr), worst(fn, thr)
    ratios.append((wn / wo if wo > 1e-6 else 1.0, k, wo, wn))
    if fo['temperatures-k'] == fn['temperatures-k']:
        same_mid += 1
        coef = max(coef, curve_change(fo, fn, thr))
        for key in ('cp-error', 'h-error', 's-error', 'g-error'):
            for i in (2, 9):
                if max(float(fo[key][i]), float(fn[key][i])) > 1e-9:
                    quality = max(quality, rel(float(fo[key][i]), float(fn[key][i])))
ratios.sort()
n = len(old)
print(f"{n} species: {identical} byte-identical blocks; {same_mid} with the same T_mid")
print(f"  same T_mid: largest change of the fitted curves {coef:.2g} (in units of the thresholds), "
      f"largest relative change of a max error {quality:.2g}")
print(f"  worst normalised error new/old: min {ratios[0][0]:.4f} median {ratios[n // 2][0]:.4f} "
      f"max {ratios[-1][0]:.4f} ({ratios[-1][1]}: {ratios[-1][2]:.4g} -> {ratios[-1][3]:.4g})")
print(f"  species worse by more than 1 %: {sum(r > 1.01 for r, *_ in ratios)}; "
      f"better by more than 1 %: {sum(r < 0.99 for r, *_ in ratios)}")
