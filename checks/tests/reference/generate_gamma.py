#!/usr/bin/env python3
"""Reference Lorentz factors of off-axis velocities, computed with mpmath at 50 significant digits.

Regenerate (from the repository root):

    pip install mpmath            # the committed file was written with mpmath 1.3.0
    python3 checks/tests/reference/generate_gamma.py

It writes gamma_velocity.csv next to this script, one row per case:

    prec,kind,x,y,z,gamma_hi,gamma_lo

- prec: f32 or f64, the precision the inputs are exact in (x, y, z are the IEEE bit patterns in
  hexadecimal of that precision);
- kind: beta (x, y, z are beta = v/c, dimensionless), velocity (x, y, z in m/s) or speed (x is a
  speed in m/s, y and z a direction of any length: gamma depends on x alone);
- gamma_hi + gamma_lo: the exact gamma of the rounded inputs (gamma_hi the nearest binary64,
  gamma_lo the binary64 nearest to the rest), so that an f64 result is measured far below an ulp.

Cases: gamma drawn log-uniformly from 1 to 10^3 (f32) or 10^6 (f64), plus a few fixed ones near
both ends; directions uniform on the sphere (so almost never along an axis). Each component is
rounded to the precision and the reference is computed from the rounded values, so the inputs are
exact in the precision and the reference belongs to exactly those inputs. Deterministic (fixed
seed).
"""

import os
import random
import struct

from mpmath import mp, mpf, sqrt

mp.dps = 50

C = mpf("299792458")  # speed of light in vacuum, m/s, exact (SI 2019)

PER_KIND = 600
MAX_GAMMA = {"f32": 1e3, "f64": 1e6}


def rounded(x, prec):
    """x rounded to the nearest value of the precision, as (mpf value, hex bits)."""
    if prec == "f32":
        b = struct.unpack("<I", struct.pack("<f", float(x)))[0]
        # float(x) is x rounded to binary64 first; the double rounding is harmless for random
        # inputs, and the reference uses the value actually stored, whatever it is.
        return mpf(struct.unpack("<f", struct.pack("<I", b))[0]), f"{b:08x}"
    v = float(x)
    return mpf(v), f"{struct.unpack('<Q', struct.pack('<d', v))[0]:016x}"


def direction(rng):
    while True:
        d = [mpf(rng.gauss(0.0, 1.0)) for _ in range(3)]
        n = sqrt(sum(c * c for c in d))
        if n > mpf("0.1"):
            return [c / n for c in d]


def split(g):
    hi = float(g)
    lo = float(g - mpf(hi))
    return repr(hi), repr(lo)


def cases(rng, prec):
    gmax = MAX_GAMMA[prec]
    targets = [mpf(1) + mpf(2) ** -20, mpf(1.5), mpf(gmax) / 2, mpf(gmax) * mpf("0.99")]
    while len(targets) < PER_KIND:
        targets.append(mpf(gmax) ** mpf(rng.random()))
    for kind in ("beta", "velocity", "speed"):
        for g in targets:
            beta = sqrt(1 - 1 / (g * g))
            d = direction(rng)
            if kind == "beta":
                comps = [rounded(beta * c, prec) for c in d]
                s = sum(v * v for v, _ in comps)
                if s >= 1:
                    continue
                ref = 1 / sqrt(1 - s)
            elif kind == "velocity":
                comps = [rounded(C * beta * c, prec) for c in d]
                s = sum(v * v for v, _ in comps)
                if s >= C * C:
                    continue
                ref = C / sqrt(C * C - s)
            else:
                speed = rounded(C * beta, prec)
                if speed[0] >= C:
                    continue
                comps = [speed] + [rounded(c, prec) for c in d[1:]]
                if comps[1][0] == 0 and comps[2][0] == 0:
                    continue
                ref = C / sqrt(C * C - speed[0] * speed[0])
            hi, lo = split(ref)
            yield [prec, kind] + [b for _, b in comps] + [hi, lo]


def main():
    rng = random.Random(20261202)
    out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "gamma_velocity.csv")
    with open(out, "w") as f:
        f.write("prec,kind,x,y,z,gamma_hi,gamma_lo\n")
        for prec in ("f32", "f64"):
            for row in cases(rng, prec):
                f.write(",".join(row) + "\n")


if __name__ == "__main__":
    main()
