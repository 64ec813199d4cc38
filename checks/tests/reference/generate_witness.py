#!/usr/bin/env python3
"""Reference values for fourforce's energy witnesses, computed with mpmath at 50 significant digits.

Regenerate (from the repository root; about a minute):

    pip install mpmath            # the committed files were written with mpmath 1.3.0
    python3 checks/tests/reference/generate_witness.py

The constants and species are those of generate_kinematics.py (CODATA 2018, typed there with
their sources). Relations (textbook special relativity, m the rest energy, E = T + m, all in eV):
flight time t over L: beta = L/(c t); dipole field B on radius r: pc = B r c |Q|; deflector field
E on radius r: |Q| E r = pc beta = (pc)^2/E; speed v: beta = v/c; and T = E - m. The first-order
uncertainty of each implied T is |dT/dx| sigma_x with the closed forms

    dT/dt = -m gamma^3 beta^2 / t       dT/dB = (pc)^2 / (E B)
    dT/dE = |Q| r E^2 / (E^2 + m^2)     dT/dv = m gamma^3 beta / c

each checked here against a central finite difference (120 digits, step 1e-30 relative, so the
difference is exact to far below 1e-30) before anything is written.

It writes, next to this script:

- witness_derivatives.csv: for six species and every kind of witness, readings on a log grid of
  kinetic energies from 10 keV to 3 GeV; the reading is the exact one rounded to binary32, so it
  is exact in f32 and f64. Columns: species, kind, reading, sigma (binary32, 2^-10 of the
  reading), geometry (baseline or radius, m; 0 for a speed), T_eV implied by the reading, dT/dx
  by finite difference, and sigma_T = |dT/dx| sigma.
- witness_cases.txt: random witness sets in the input format of `fourforce energy` (T in MeV,
  the others in SI), every number a binary32 value written so that f32 and f64 parse it exactly.
  Six species from the electron to a heavy ion, true energies log-uniform from 10 keV to 3 GeV,
  2 to 6 witnesses of random kinds, sigma_T/T log-uniform from 1e-4 to 1e-2, readings drawn from
  normal distributions about the true value, and in a quarter of the sets one witness moved by
  40 sigma. For each set the exact implied energies, the inverse-variance fusion, chi^2 with n - 1
  degrees of freedom, the verdict at alpha = 1e-3 and the outlier (the witness whose removal leaves
  the smallest chi^2, named when the set is inconsistent and the rest agree) are written as the
  tool's output lines. Sets whose verdict or outlier hinges on less than 1e-3 relative (chi^2 near
  a critical value, two removals nearly equal) are drawn again.
- chi2_critical.csv: upper critical values of the chi-square distribution, x with
  Q(k/2, x/2) = alpha (regularized upper incomplete gamma), for k = 1..15 and the levels of
  fourforce::witness::Alpha, to 20 digits.
"""

import os
import random

from mpmath import findroot, gammainc, inf, mp, mpf, sqrt

from generate_kinematics import C, SPECIES, f32, fmt

mp.dps = 50

HERE = os.path.dirname(os.path.abspath(__file__))
ALPHAS = ["0.1", "0.05", "0.025", "0.01", "0.001", "1e-4", "1e-5", "1e-6"]
MAX_DOF = 15
BASELINE = mpf("2.5")  # m, flight-time baseline of the derivative grid
DIPOLE_RADIUS = mpf("1.5")  # m
DEFLECTOR_RADIUS = mpf("1.25")  # m

BY_NAME = {name: (m, q) for name, m, q in SPECIES}
# Six species from the electron to a heavy ion (names as the host tool spells them).
CASE_SPECIES = [
    "electron",
    "proton",
    "deuteron",
    "alpha",
    "custom:11174.864265448:6",
    "custom:221700:28",
]


def tail(k, x):
    """Upper-tail probability of chi^2 with k degrees of freedom."""
    return gammainc(mpf(k) / 2, x / 2, inf, regularized=True)


def critical(k, alpha):
    """x with tail(k, x) = alpha, by bisection to far below 1e-40 (tail is decreasing)."""
    alpha = mpf(alpha)
    lo, hi = mpf(0), mpf(200)
    for _ in range(400):
        mid = (lo + hi) / 2
        if tail(k, mid) > alpha:
            lo = mid
        else:
            hi = mid
    return (lo + hi) / 2


# ---- Witness physics ---------------------------------------------------------------------------
def kinetic_from(kind, x, geom, m, q):
    """T (eV) implied by reading x of the kind (geometry: baseline or radius in m)."""
    qa = abs(mpf(q))
    if kind == "kinetic":
        return x
    if kind == "tof":
        beta = geom / (C * x)
    elif kind == "speed":
        beta = x / C
    elif kind == "dipole":
        pc = x * geom * C * qa
        return pc * pc / (sqrt(pc * pc + m * m) + m)
    elif kind == "deflector":
        w = qa * x * geom
        e = (w + sqrt(w * w + 4 * m * m)) / 2
        return w * e / (e + m)
    else:
        raise ValueError(kind)
    g2 = 1 / ((1 - beta) * (1 + beta))
    return m * (g2 - 1) / (sqrt(g2) + 1)


def reading_from(kind, t, geom, m, q):
    """The exact reading of the kind for kinetic energy t (eV)."""
    qa = abs(mpf(q))
    e = t + m
    pc = sqrt(t * (t + 2 * m))
    beta = pc / e
    if kind == "kinetic":
        return t
    if kind == "tof":
        return geom / (beta * C)
    if kind == "speed":
        return beta * C
    if kind == "dipole":
        return pc / (C * qa * geom)
    if kind == "deflector":
        return pc * beta / (qa * geom)
    raise ValueError(kind)


def derivative(kind, x, geom, m, q):
    """|dT/dx| by the closed forms of the module doc."""
    t = kinetic_from(kind, x, geom, m, q)
    e = t + m
    pc = sqrt(t * (t + 2 * m))
    g = e / m
    beta = pc / e
    if kind == "kinetic":
        return mpf(1)
    if kind == "tof":
        return m * g**3 * beta**2 / x
    if kind == "speed":
        return m * g**3 * beta / C
    if kind == "dipole":
        return pc * pc / (e * x)
    if kind == "deflector":
        return abs(mpf(q)) * geom * e * e / (e * e + m * m)
    raise ValueError(kind)


def finite_difference(kind, x, geom, m, q):
    """Central difference at 120 digits with a step of 1e-30 relative: the truncation error is
    about 1e-60 and the 120 digits absorb the step and the cancellations near c."""
    with mp.workdps(120):
        h = x * mpf("1e-30")
        d = kinetic_from(kind, x + h, geom, m, q) - kinetic_from(kind, x - h, geom, m, q)
        return abs(d) / (2 * h)


def checked_derivative(kind, x, geom, m, q):
    d = derivative(kind, x, geom, m, q)
    fd = finite_difference(kind, x, geom, m, q)
    assert abs(d / fd - 1) < mpf("1e-30"), (kind, x, d, fd)
    return fd


GEOMETRY = {"kinetic": mpf(0), "tof": BASELINE, "dipole": DIPOLE_RADIUS,
            "deflector": DEFLECTOR_RADIUS, "speed": mpf(0)}
KINDS = ["kinetic", "tof", "dipole", "deflector", "speed"]


def exact(x):
    """A binary32 value as a decimal both f32 and f64 parse exactly."""
    return repr(float(x))


# ---- Fusion ------------------------------------------------------------------------------------
def fuse(est):
    w = [1 / (s * s) for _, s in est]
    sw = sum(w)
    t = sum(wi * ti for wi, (ti, _) in zip(w, est)) / sw
    chi2 = sum(((ti - t) / s) ** 2 for ti, s in est)
    return t, 1 / sqrt(sw), chi2


def write_derivatives(path):
    rows = 0
    with open(path, "w", newline="") as f:
        f.write("species,kind,reading,sigma,geometry_m,T_eV,dTdx,sigma_T_eV\n")
        for name in CASE_SPECIES + ["muon"]:
            m, q = BY_NAME[name]
            for i in range(13):
                t = mpf(10) ** (4 + mpf(i) * mpf("5.5") / 12)  # 10 keV .. 3.16 GeV
                for kind in KINDS[1:]:
                    geom = GEOMETRY[kind]
                    x = f32(reading_from(kind, t, geom, m, q))
                    if kind == "speed" and x >= C:
                        continue
                    if kind == "tof" and C * x <= geom:
                        continue
                    sigma = x / 1024
                    d = checked_derivative(kind, x, geom, m, q)
                    ti = kinetic_from(kind, x, geom, m, q)
                    f.write(",".join([name, kind, exact(x), exact(sigma), exact(geom), fmt(ti),
                                      fmt(d), fmt(d * sigma)]) + "\n")
                    rows += 1
    return rows


def assess(est, crit):
    n = len(est)
    t, s, chi2 = fuse(est)
    dof = n - 1
    margins = []
    consistent = True
    if n >= 2:
        c = crit[dof]
        consistent = chi2 <= c
        margins.append(abs(chi2 / c - 1))
    outlier = 0
    if not consistent and n >= 3:
        rest = [fuse(est[:j] + est[j + 1:])[2] for j in range(n)]
        order = sorted(range(n), key=lambda j: rest[j])
        best = order[0]
        margins.append(abs(rest[order[1]] / rest[best] - 1) if rest[best] > 0 else mpf(1))
        margins.append(abs(rest[best] / crit[n - 2] - 1))
        if rest[best] <= crit[n - 2]:
            outlier = best + 1
    return t, s, chi2, dof, consistent, outlier, min(margins) if margins else mpf(1)


def draw_case(rng, crit, faulty):
    name = rng.choice(CASE_SPECIES)
    m, q = BY_NAME[name]
    t_true = mpf(10) ** (4 + mpf(rng.random()) * mpf("5.4771212547"))  # 10 keV .. 3 GeV
    n = rng.randint(3, 6) if faulty else rng.randint(2, 6)
    lines, est = [], []
    fault_at = rng.randrange(n) if faulty else -1
    while len(lines) < n:
        kind = rng.choice(KINDS)
        geom = {"tof": f32(mpf(rng.uniform(1, 20))), "dipole": f32(mpf(rng.uniform(0.3, 3))),
                "deflector": f32(mpf(rng.uniform(0.3, 3)))}.get(kind, mpf(0))
        rel = mpf(10) ** (-4 + 2 * mpf(rng.random()))
        x_true = reading_from(kind, t_true, geom, m, q)
        sigma_x = f32(rel * t_true / checked_derivative(kind, x_true, geom, m, q))
        shift = 40 if len(lines) == fault_at else rng.gauss(0, 1)
        if len(lines) == fault_at and rng.random() < 0.5:
            shift = -40
        x_raw = x_true + mpf(shift) * sigma_x
        if kind == "kinetic":
            x_raw = x_raw / 10**6  # MeV on the tool's input
        x = f32(x_raw)
        x_ev = x * 10**6 if kind == "kinetic" else x
        if kind == "kinetic" and x <= 0:
            continue
        if kind == "speed" and not (0 < x < C):
            continue
        if kind == "tof" and C * x <= geom:
            continue
        if x <= 0:
            continue
        t_i = kinetic_from(kind, x_ev, geom, m, q)
        # The binary32 rounding of the reading must not move T by more than 5 % of sigma_T.
        if abs(t_i - kinetic_from(kind, x_raw * (10**6 if kind == "kinetic" else 1), geom, m, q)) \
                > rel * t_true / 20:
            continue
        s_i = checked_derivative(kind, x_ev, geom, m, q) * sigma_x
        if kind == "kinetic":
            lines.append(f"kinetic,{exact(x)},{exact(f32(sigma_x / 10**6))}")
            s_i = f32(sigma_x / 10**6) * 10**6
        elif kind in ("tof", "dipole", "deflector"):
            lines.append(f"{kind},{exact(x)},{exact(sigma_x)},{exact(geom)}")
        else:
            lines.append(f"speed,{exact(x)},{exact(sigma_x)}")
        est.append((t_i, s_i))
    t, s, chi2, dof, consistent, outlier, margin = assess(est, crit)
    if margin < mpf("1e-3"):
        return None
    out = [f"reading,{i + 1},{ln.split(',')[0]},{fmt(ti / 10**6)},{fmt(si / 10**6)}"
           for i, (ln, (ti, si)) in enumerate(zip(lines, est))]
    out.append(f"fused,{fmt(t / 10**6)},{fmt(s / 10**6)},{fmt(chi2)},{dof},"
               f"{'consistent' if consistent else 'inconsistent'},{outlier}")
    return name, lines, out


def main():
    crit_rows = []
    for k in range(1, MAX_DOF + 1):
        crit_rows.append([critical(k, a) for a in ALPHAS])
    with open(os.path.join(HERE, "chi2_critical.csv"), "w", newline="") as f:
        f.write("dof," + ",".join(ALPHAS) + "\n")
        for k, row in enumerate(crit_rows, start=1):
            f.write(f"{k}," + ",".join(fmt(x) for x in row) + "\n")
    crit = {k: row[ALPHAS.index("0.001")] for k, row in enumerate(crit_rows, start=1)}

    rows = write_derivatives(os.path.join(HERE, "witness_derivatives.csv"))

    rng = random.Random(20261202)
    cases = []
    while len(cases) < 200:
        c = draw_case(rng, crit, faulty=(len(cases) % 4 == 3))
        if c is not None:
            cases.append(c)
    with open(os.path.join(HERE, "witness_cases.txt"), "w") as f:
        f.write("# Written by generate_witness.py (mpmath, 50 digits); alpha = 1e-3.\n")
        for i, (name, lines, out) in enumerate(cases, start=1):
            f.write(f"case {i} {name}\n")
            for ln in lines:
                f.write(ln + "\n")
            for ln in out:
                f.write("expect " + ln + "\n")
    print(f"{rows} derivative rows, {len(cases)} witness sets")


if __name__ == "__main__":
    main()
