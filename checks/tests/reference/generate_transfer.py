#!/usr/bin/env python3
"""Reference first-order transfer maps of beam lines, computed with mpmath at 50 significant digits.

Regenerate (from the repository root):

    pip install mpmath            # the committed file was written with mpmath 1.3.0
    python3 checks/tests/reference/generate_transfer.py

It writes transfer_maps.csv next to this script: one row per line, with the species, the kinetic
energy in MeV and the elements in the input format of `fourforce map` (joined by `;`), then the 36
entries of the 6x6 map (rows and columns x, x', y, y', dt, delta; 20 significant digits), then the
36 scales S of those entries:

    S = (|M_n| ... |M_1|)_ij + sum over inputs p of |p dM_ij/dp|

the first term the entry of the product of the elements' absolute values (the scale of the
roundings of a product of matrices), the second the change of the entry when every input (each
element parameter, the kinetic energy, the rest energy) moves by its own relative rounding. A
result is then judged by |M_ij(computed) - M_ij(exact)| / (eps S_ij).

The lines are random (a fixed seed): one line per element kind and species, and 70 mixed lines of
3 to 12 elements, for seven species from the electron to a uranium ion, at kinetic energies from
1 keV to 10 GeV. Element strengths are drawn relative to the reference rigidity at the element (the
energy flows through the gaps), so that every map stays within a few orders of magnitude of 1,
and then written with 7 significant digits; the decimal value written is the input.

The maps are built here from the textbook matrices, full 6x6 products, independently of the
crate's compact forms (H. Wiedemann, Particle Accelerator Physics; K. L. Brown, SLAC-75; both from
memory):

- drift L: R12 = R34 = L, R56 = -L/(v gamma^2);
- quadrupole L, G: k = sign(Q) G/Brho; cos/sin in the plane with k > 0, cosh/sinh in the other;
- thin quadrupole GL: R21 = -sign(Q) GL/Brho, R43 = +sign(Q) GL/Brho;
- electrostatic quadrupole L, V, a: k = sign(Q) 2V/(a^2 Erho), then as the quadrupole;
- sector dipole L, theta, e1, e2: rho = L/theta, body R11 = R22 = cos, R12 = rho sin, R21 = -sin/rho,
  R16 = rho(1 - cos), R26 = sin, R34 = L, R51 = sin/v, R52 = rho(1 - cos)/v,
  R56 = (rho(theta - sin) - L/gamma^2)/v; edges x' += tan(e)/rho x, y' -= tan(e)/rho y, as
  E(e2) B E(e1);
- solenoid L, B: K = sign(Q) B/(2 Brho), the coupled rotation-focusing matrix, R56 = -L/(v gamma^2);
- gap V: T += Q V, R22 = R44 = p0/p1, R66 = (v0 p0)/(v1 p1).
"""

import csv
import os
import random

from mpmath import mp, mpf, sqrt, sin, cos, sinh, cosh, tan

mp.dps = 50

# ---- Constants --------------------------------------------------------------------------------
C = mpf("299792458")  # speed of light in vacuum, m/s, exact (SI 2019)
# Rest energies in eV: CODATA 2018 recommended values (E. Tiesinga, P. J. Mohr, D. B. Newell,
# B. N. Taylor, Rev. Mod. Phys. 93, 025010 (2021)).
ELECTRON = mpf("0.51099895000e6")  # CODATA 2018
PROTON = mpf("938.27208816e6")  # CODATA 2018
MUON = mpf("105.6583755e6")  # CODATA 2018
DEUTERON = mpf("1875.61294257e6")  # CODATA 2018
ALPHA = mpf("3727.3794066e6")  # CODATA 2018

# (name as `fourforce map --species` spells it, rest energy in eV, charge in e)
SPECIES = [
    ("electron", ELECTRON, -1),
    ("antimuon", MUON, 1),
    ("proton", PROTON, 1),
    ("deuteron", DEUTERON, 1),
    ("alpha", ALPHA, 2),
    # bare carbon-12 (12 u less six electrons plus 1030.108 eV binding; invented rounding)
    ("custom:11174.864265:6", mpf("11174.864265e6"), 6),
    # a uranium-238 ion of charge 28+ (rest energy rounded to 1 keV; an invented beam)
    ("custom:221695.831:28", mpf("221695.831e6"), 28),
]

KINDS = ["drift", "quad", "thinquad", "equad", "bend", "solenoid", "gap"]


def state(m, q, t):
    """Reference quantities at kinetic energy t (eV)."""
    e = t + m
    pc = sqrt(t * (t + 2 * m))
    beta = pc / e
    return {
        "t": t,
        "gamma": e / m,
        "v": beta * C,
        "pc": pc,
        "brho": pc / (C * abs(q)),
        "erho": pc * beta / abs(q),
        "sign": 1 if q > 0 else -1,
    }


def identity():
    return mp.eye(6)


def drift(st, length):
    r = identity()
    r[0, 1] = length
    r[2, 3] = length
    r[4, 5] = -length / (st["v"] * st["gamma"] ** 2)
    return r


def plane(k, length):
    if k > 0:
        s = sqrt(k)
        return [[cos(s * length), sin(s * length) / s], [-s * sin(s * length), cos(s * length)]]
    if k < 0:
        s = sqrt(-k)
        return [[cosh(s * length), sinh(s * length) / s], [s * sinh(s * length), cosh(s * length)]]
    return [[1, length], [0, 1]]


def lens(st, k, length):
    r = drift(st, length)
    for base, kk in ((0, k), (2, -k)):
        p = plane(kk, length)
        for i in range(2):
            for j in range(2):
                r[base + i, base + j] = p[i][j]
    return r


def thin(st, gl):
    r = identity()
    inv_f = st["sign"] * gl / st["brho"]
    r[1, 0] = -inv_f
    r[3, 2] = inv_f
    return r


def bend(st, length, theta, e1, e2):
    if theta == 0:
        return drift(st, length)
    rho = length / theta
    v, g = st["v"], st["gamma"]
    b = identity()
    b[0, 0] = cos(theta)
    b[0, 1] = rho * sin(theta)
    b[1, 0] = -sin(theta) / rho
    b[1, 1] = cos(theta)
    b[0, 5] = rho * (1 - cos(theta))
    b[1, 5] = sin(theta)
    b[2, 3] = length
    b[4, 0] = sin(theta) / v
    b[4, 1] = rho * (1 - cos(theta)) / v
    b[4, 5] = (rho * (theta - sin(theta)) - length / g**2) / v

    def edge(e):
        r = identity()
        r[1, 0] = tan(e) / rho
        r[3, 2] = -tan(e) / rho
        return r

    return edge(e2) * b * edge(e1)


def solenoid(st, length, field):
    k = st["sign"] * field / (2 * st["brho"])
    r = identity()
    if k == 0:
        return drift(st, length)
    c, s = cos(k * length), sin(k * length)
    m = [
        [c * c, s * c / k, s * c, s * s / k],
        [-k * s * c, c * c, -k * s * s, s * c],
        [-s * c, -s * s / k, c * c, s * c / k],
        [k * s * s, -s * c, -k * s * c, c * c],
    ]
    for i in range(4):
        for j in range(4):
            r[i, j] = m[i][j]
    r[4, 5] = -length / (st["v"] * st["gamma"] ** 2)
    return r


def line_maps(m, q, t, elements):
    """The maps of the elements of a line (parameters as mpf), the energy flowing through gaps."""
    st = state(m, q, t)
    maps = []
    for kind, p in elements:
        if kind == "drift":
            maps.append(drift(st, p[0]))
        elif kind == "quad":
            maps.append(lens(st, st["sign"] * p[1] / st["brho"], p[0]))
        elif kind == "thinquad":
            maps.append(thin(st, p[0]))
        elif kind == "equad":
            maps.append(lens(st, st["sign"] * 2 * p[1] / (p[2] ** 2 * st["erho"]), p[0]))
        elif kind == "bend":
            maps.append(bend(st, *p))
        elif kind == "solenoid":
            maps.append(solenoid(st, p[0], p[1]))
        elif kind == "gap":
            after = state(m, q, st["t"] + q * p[0])
            r = identity()
            r[1, 1] = st["pc"] / after["pc"]
            r[3, 3] = st["pc"] / after["pc"]
            r[5, 5] = (st["v"] * st["pc"]) / (after["v"] * after["pc"])
            maps.append(r)
            st = after
        else:
            raise ValueError(kind)
    return maps


def product(maps):
    total = identity()
    for r in maps:
        total = r * total
    return total


def line_map(m, q, t, elements):
    return product(line_maps(m, q, t, elements))


def scales(m, q, t, elements):
    """S of every entry: the rounding scale plus the sensitivity to every input's rounding."""
    absolute = identity()
    for r in line_maps(m, q, t, elements):
        absolute = r.apply(abs) * absolute
    base = line_map(m, q, t, elements)
    s = absolute.copy()
    h = mpf("1e-20")

    def add(perturbed, value):
        if value == 0:
            return
        for i in range(6):
            for j in range(6):
                s[i, j] += abs((perturbed[i, j] - base[i, j]) / h)

    add(line_map(m, q, t * (1 + h), elements), t)
    add(line_map(m * (1 + h), q, t, elements), m)
    for n, (kind, p) in enumerate(elements):
        for k in range(len(p)):
            if p[k] == 0:
                continue
            changed = list(elements)
            params = list(p)
            params[k] = params[k] * (1 + h)
            changed[n] = (kind, params)
            add(line_map(m, q, t, changed), p[k])
    return base, s


def fmt7(x):
    return "%.7g" % x


def draw_element(rng, kind, st, q):
    """An element of this kind with a strength drawn relative to the reference state `st`."""
    sign = st["sign"]
    log = lambda lo, hi: 10 ** rng.uniform(lo, hi)
    pm = lambda: rng.choice((-1, 1))
    if kind == "drift":
        return [fmt7(log(-1.5, 0.7))]
    if kind == "quad":
        length = log(-1.3, -0.3)
        strength = log(-4, 0.6) / length**2 * pm()  # |k| L^2 from 1e-4 to 4
        return [fmt7(length), fmt7(strength * float(st["brho"]) * sign)]
    if kind == "thinquad":
        return [fmt7(log(-3, 0.3) * pm() * float(st["brho"]))]
    if kind == "equad":
        length = log(-1.3, -0.5)
        radius = log(-2, -1.2)
        strength = log(-4, 0.5) / length**2 * pm()
        return [fmt7(length), fmt7(strength * radius**2 * float(st["erho"]) / 2 * sign), fmt7(radius)]
    if kind == "bend":
        length = log(-0.7, 0.5)
        theta = log(-4, 0.2) * pm()
        form = rng.random()
        if form < 0.25:
            e1 = e2 = theta / 2
        elif form < 0.5:
            e1 = e2 = 0.0
        else:
            e1, e2 = rng.uniform(-0.6, 0.6), rng.uniform(-0.6, 0.6)
        return [fmt7(length), fmt7(theta), fmt7(e1), fmt7(e2)]
    if kind == "solenoid":
        length = log(-1, 0)
        phase = log(-3, 0.3) * pm()  # K L
        return [fmt7(length), fmt7(2 * phase / length * float(st["brho"]) * sign)]
    if kind == "gap":
        fraction = rng.uniform(-0.4, 1.0)  # of the kinetic energy
        return [fmt7(fraction * float(st["t"]) / q)]
    raise ValueError(kind)


def make_line(rng, kinds, m, q, t):
    """Elements (as decimal strings) of the given kinds, strengths drawn along the flowing energy."""
    st = state(m, q, t)
    out = []
    for kind in kinds:
        params = draw_element(rng, kind, st, q)
        out.append((kind, params))
        if kind == "gap":
            st = state(m, q, st["t"] + q * mpf(params[0]))
    return out


def main():
    rng = random.Random(20261202)
    rows = []
    cases = []
    for name, m, q in SPECIES:
        for kind in KINDS:
            t_mev = fmt7(10 ** rng.uniform(-3, 4))
            cases.append((name, m, q, t_mev, [kind]))
    for n in range(70):
        name, m, q = SPECIES[n % len(SPECIES)]
        t_mev = fmt7(10 ** rng.uniform(-3, 4))
        count = rng.randint(3, 12)
        kinds = [rng.choice(KINDS) for _ in range(count)]
        if n < len(KINDS):
            kinds[rng.randrange(count)] = KINDS[n]
        cases.append((name, m, q, t_mev, kinds))
    for case, (name, m, q, t_mev, kinds) in enumerate(cases):
        t = mpf(t_mev) * 10**6
        elements = make_line(rng, kinds, m, q, t)
        exact = [(kind, [mpf(x) for x in params]) for kind, params in elements]
        base, s = scales(m, q, t, exact)
        text = ";".join(",".join([kind] + params) for kind, params in elements)
        values = [mp.nstr(base[i, j], 20, min_fixed=1, max_fixed=0) for i in range(6) for j in range(6)]
        sc = [mp.nstr(s[i, j], 6, min_fixed=1, max_fixed=0) for i in range(6) for j in range(6)]
        rows.append([case, name, t_mev, text] + values + sc)
    here = os.path.dirname(os.path.abspath(__file__))
    with open(os.path.join(here, "transfer_maps.csv"), "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        header = ["case", "species", "kinetic_MeV", "line"]
        header += ["R%d%d" % (i + 1, j + 1) for i in range(6) for j in range(6)]
        header += ["S%d%d" % (i + 1, j + 1) for i in range(6) for j in range(6)]
        w.writerow(header)
        w.writerows(rows)


if __name__ == "__main__":
    main()
