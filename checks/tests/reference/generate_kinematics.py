#!/usr/bin/env python3
"""Reference vectors for fourforce's kinematics, computed with mpmath at 50 significant digits.

Regenerate (from the repository root):

    pip install mpmath            # the committed files were written with mpmath 1.3.0
    python3 checks/tests/reference/generate_kinematics.py

It writes, next to this script:

- kinematics_forward.csv: states built from the kinetic energy. For every species (the ten named
  ones and three custom ions), kinetic energies on a log grid of 16 points per decade from 1 eV to
  100 TeV, each rounded to the nearest binary32 value, so that one file serves f32 and f64 alike
  (the input is exact in both precisions).
- kinematics_inverse.csv: states built from another quantity (total energy, gamma, beta, beta
  gamma, momentum, B rho, E rho, speed, time of flight over 2.5 m). The input is the exact
  quantity of a grid state rounded to binary32 (column prec = "both": exact in f32 and f64); where
  binary32 cannot hold it (beta rounds to 1, a flight time rounds below L/c) it is rounded to
  binary64 instead (prec = "f64"). The reference state is then computed from that exact input.
- table_sample_expected.csv: the exact values for the good lines of table_sample_input.csv (the
  sample of the host table tool, checked by ci/table), computed from the decimal inputs.

Every value is written with 20 significant digits, enough to measure an f64 result to 1e-4 ulp.
Nothing is read from a constants library: scipy's recent releases carry CODATA 2022, which moves
the electron rest energy by 1.35e-9 relative (millions of f64 ulps). The constants are typed here,
each with its source.
"""

import csv
import os
import struct

from mpmath import mp, mpf, pi, sqrt

mp.dps = 50

# ---- Constants --------------------------------------------------------------------------------
# Exact by the definition of the SI (26th CGPM 2018, in force 20 May 2019).
C = mpf("299792458")  # speed of light in vacuum, m/s, exact (SI 2019)
E_CHARGE = mpf("1.602176634e-19")  # elementary charge, C, exact (SI 2019)

# Rest energies in eV: CODATA 2018 recommended values (E. Tiesinga, P. J. Mohr, D. B. Newell,
# B. N. Taylor, Rev. Mod. Phys. 93, 025010 (2021); NIST physics.nist.gov/constants, 2018 tables).
ELECTRON = mpf("0.51099895000e6")  # m_e c^2 = 0.510 998 950 00 MeV, CODATA 2018
PROTON = mpf("938.27208816e6")  # m_p c^2 = 938.272 088 16 MeV, CODATA 2018
MUON = mpf("105.6583755e6")  # m_mu c^2 = 105.658 3755 MeV, CODATA 2018
DEUTERON = mpf("1875.61294257e6")  # m_d c^2 = 1875.612 942 57 MeV, CODATA 2018
TRITON = mpf("2808.92113298e6")  # m_t c^2 = 2808.921 132 98 MeV, CODATA 2018
HELION = mpf("2808.39160743e6")  # m_h c^2 = 2808.391 607 43 MeV, CODATA 2018
ALPHA = mpf("3727.3794066e6")  # m_alpha c^2 = 3727.379 4066 MeV, CODATA 2018

# (name as the table tool and the tests spell it, rest energy in MeV as a decimal string, charge)
SPECIES = [
    ("electron", ELECTRON, -1),
    ("positron", ELECTRON, 1),
    ("proton", PROTON, 1),
    ("antiproton", PROTON, -1),
    ("muon", MUON, -1),
    ("antimuon", MUON, 1),
    ("deuteron", DEUTERON, 1),
    ("triton", TRITON, 1),
    ("helion", HELION, 2),
    ("alpha", ALPHA, 2),
    # Bare carbon-12, 12 m_u c^2 - 6 m_e c^2 + 1030.108 eV = 11174.864265448 MeV (CODATA 2018
    # m_u c^2 and m_e c^2; binding energy from the NIST Atomic Spectra Database, from memory).
    ("custom:11174.864265448:6", mpf("11174.864265448e6"), 6),
    # Invented heavy ion of our own: 221.7 GeV rest energy, charge state 28.
    ("custom:221700:28", mpf("221700e6"), 28),
    # Invented negative molecular ion of our own: 1877.5 MeV, charge -1.
    ("custom:1877.5:-1", mpf("1877.5e6"), -1),
]

QUANTITIES = [
    "gamma",
    "gamma_minus_1",
    "beta",
    "one_minus_beta",
    "beta_gamma",
    "pc_eV",
    "total_eV",
    "brho_Tm",
    "erho_V",
    "v_m_per_s",
    "tof_s_per_m",
    "cyclotron_Hz_per_T",
    "p_kg_m_per_s",
]

TOF_LENGTH = mpf("2.5")  # metres, exact in both precisions


def f32(x):
    """Nearest binary32 value, as an mpf (exact)."""
    return mpf(struct.unpack("f", struct.pack("f", float(x)))[0])


def f64(x):
    """Nearest binary64 value, as an mpf (exact)."""
    return mpf(float(x))


def fmt(x):
    return mp.nstr(x, 20, min_fixed=0, max_fixed=0, strip_zeros=False)


def exact(x):
    """The exact decimal of a binary64 (or binary32) value: repr round-trips it."""
    return repr(float(x))


def state(m, q, t=None, g1=None, pc=None):
    """Every quantity from one of T, gamma - 1 or pc (all exact at 50 digits)."""
    if t is None and g1 is not None:
        t = g1 * m
    if t is None:
        t = pc * pc / (sqrt(pc * pc + m * m) + m)
    e = t + m
    pc = sqrt(t * (t + 2 * m))
    g = e / m
    beta = pc / e
    omb = m * m / (e * (e + pc))
    qa = abs(mpf(q))
    return {
        "T_eV": t,
        "gamma": g,
        "gamma_minus_1": t / m,
        "beta": beta,
        "one_minus_beta": omb,
        "beta_gamma": pc / m,
        "pc_eV": pc,
        "total_eV": e,
        "brho_Tm": pc / (C * qa),
        "erho_V": pc * beta / qa,
        "v_m_per_s": beta * C,
        "tof_s_per_m": 1 / (beta * C) if beta > 0 else mpf("inf"),
        "cyclotron_Hz_per_T": qa * C * C / (2 * pi * e),
        "p_kg_m_per_s": pc * E_CHARGE / C,
    }


def from_beta(m, q, b):
    """State from an exact beta: gamma - 1 = b^2 / (s (1 + s)), s = sqrt(1 - b^2)."""
    s = sqrt((1 - b) * (1 + b))
    return state(m, q, g1=b * b / (s * (1 + s)))


def grid():
    """Kinetic energies 10^(k/16) eV, k = 0..224, rounded to binary32."""
    return [f32(mpf(10) ** (mpf(k) / 16)) for k in range(0, 14 * 16 + 1)]


def inverse_grid():
    """One energy per decade, between the forward grid's decades, plus the two ends."""
    return [f32(mpf(1))] + [f32(mpf(10) ** (k + mpf("0.5"))) for k in range(14)] + [f32(mpf(10) ** 14)]


def rounded_input(kind, value, valid):
    """The input rounded to binary32 if that is valid, else to binary64; None if neither."""
    for prec, rnd in (("both", f32), ("f64", f64)):
        x = rnd(value)
        if valid(x):
            return prec, x
    return None


def inverse_rows(name, m, q):
    rows = []
    for t in inverse_grid():
        s = state(m, q, t=t)
        qa = abs(mpf(q))
        cases = [
            ("total_energy", s["total_eV"], lambda x: x >= m, lambda x: state(m, q, t=x - m)),
            ("gamma", s["gamma"], lambda x: x >= 1, lambda x: state(m, q, g1=x - 1)),
            ("beta", s["beta"], lambda x: 0 <= x < 1, lambda x: from_beta(m, q, x)),
            ("beta_gamma", s["beta_gamma"], lambda x: x >= 0, lambda x: state(m, q, pc=x * m)),
            ("momentum", s["pc_eV"], lambda x: x >= 0, lambda x: state(m, q, pc=x)),
            ("magnetic_rigidity", s["brho_Tm"], lambda x: x >= 0, lambda x: state(m, q, pc=x * C * qa)),
            ("electric_rigidity", s["erho_V"], lambda x: x >= 0, lambda x: erho_state(m, q, x * qa)),
            ("speed", s["v_m_per_s"], lambda x: 0 <= x < C, lambda x: from_beta(m, q, x / C)),
            (
                "flight_time",
                TOF_LENGTH * s["tof_s_per_m"],
                lambda x: C * x > TOF_LENGTH,
                lambda x: from_beta(m, q, TOF_LENGTH / (C * x)),
            ),
        ]
        for kind, value, valid, build in cases:
            got = rounded_input(kind, value, valid)
            if got is None:
                continue
            prec, x = got
            r = build(x)
            rows.append([kind, prec, name, exact(m), exact(x), fmt(r["T_eV"])] + [fmt(r[k]) for k in QUANTITIES])
    return rows


def erho_state(m, q, w):
    """State from w = E rho |Q| = pc beta: E = (w + sqrt(w^2 + 4 m^2))/2, pc^2 = w E."""
    e = (w + sqrt(w * w + 4 * m * m)) / 2
    return state(m, q, pc=sqrt(w * e))


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    with open(os.path.join(here, "kinematics_forward.csv"), "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["species", "rest_energy_eV", "T_eV"] + QUANTITIES)
        for name, m, q in SPECIES:
            for t in grid():
                s = state(m, q, t=t)
                w.writerow([name, exact(m), exact(t)] + [fmt(s[k]) for k in QUANTITIES])
    with open(os.path.join(here, "kinematics_inverse.csv"), "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["from", "prec", "species", "rest_energy_eV", "input", "T_eV"] + QUANTITIES)
        for name, m, q in SPECIES:
            w.writerows(inverse_rows(name, m, q))
    # The table tool's sample: exact values from the decimal MeV inputs of its good lines.
    by_name = {name: (m, q) for name, m, q in SPECIES}
    with open(os.path.join(here, "table_sample_input.csv")) as f_in, open(
        os.path.join(here, "table_sample_expected.csv"), "w", newline=""
    ) as f_out:
        w = csv.writer(f_out, lineterminator="\n")
        w.writerow(["line", "species", "T_MeV"] + QUANTITIES)
        for number, line in enumerate(f_in, start=1):
            parts = line.strip().split(",")
            if len(parts) != 2:
                continue
            name, t_mev = parts[0].strip(), parts[1].strip()
            if name in by_name:
                m, q = by_name[name]
            elif name.startswith("custom:") and len(name.split(":")) == 3:
                _, rest, charge = name.split(":")
                try:
                    m, q = mpf(rest) * 10**6, int(charge)
                except ValueError:
                    continue
                if q == 0 or m <= 0:
                    continue
            else:
                continue
            try:
                t = mpf(t_mev) * 10**6
            except ValueError:
                continue
            if t < 0:
                continue
            s = state(m, q, t=t)
            w.writerow([number, name, t_mev] + [fmt(s[k]) for k in QUANTITIES])


if __name__ == "__main__":
    main()
