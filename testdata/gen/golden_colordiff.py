#!/usr/bin/env python3
"""Golden vectors for antipode's colour spaces, colour differences and
chromatic adaptation, computed by an independent general-purpose colour
library: python-colormath 3.0.0 as Debian packages it (python3-colormath,
3.0.0-4), with the Debian numpy 1.24.2.

Install and run (from the repository root):

    apt-get install -y python3-colormath
    /usr/bin/python3 testdata/gen/golden_colordiff.py > testdata/golden/colordiff.csv

colormath 3.0.0 predates numpy 1.23, which removed numpy.asscalar; its ΔE
functions call it, so the one-line shim below restores it before import.

Output: CSV on stdout, '#' comment lines, one record kind per row (first
field), all numbers written with repr() (shortest round-trip form):

    diff,L1,a1,b1,L2,a2,b2,dE76,dE94_graphic,dE94_textile,CMC21,CMC11,dE00
    lab,X,Y,Z,L,a,b                    XYZ (white Y = 100) -> CIELAB, D65
    luv,X,Y,Z,L,u,v                    XYZ (white Y = 100) -> CIELUV, D65
    adapt,cat,X,Y,Z,X2,Y2,Z2           XYZ under D65 -> corresponding XYZ under D50

Colour differences take the first colour of a pair as the reference
(standard): colormath's CIE94 and CMC weight by the first colour's chroma
and hue, as antipode's DeltaE94 and DeltaECMC do.
"""
import random
import subprocess
import sys

import numpy

numpy.asscalar = lambda a: a.item()  # removed in numpy 1.23; colormath 3.0.0 still calls it

import colormath  # noqa: E402
from colormath import color_constants  # noqa: E402
from colormath.chromatic_adaptation import _get_adaptation_matrix  # noqa: E402
from colormath.color_conversions import convert_color  # noqa: E402
from colormath.color_diff import (  # noqa: E402
    delta_e_cie1976, delta_e_cie1994, delta_e_cie2000, delta_e_cmc)
from colormath.color_objects import LabColor, LuvColor, XYZColor  # noqa: E402

SEED = 20050101
# The whites antipode's tests use, on the 0-100 scale: ASTM E308 D65 and D50
# for the CIE 1931 observer (from memory; they equal colormath's own
# 2-degree 'd65' and 'd50', which is asserted below).
D65 = (95.047, 100.0, 108.883)
D50 = (96.422, 100.0, 82.521)


def scaled(w):
    return tuple(v / 100.0 for v in w)


def debian_version():
    try:
        return subprocess.run(["dpkg-query", "-W", "-f=${Version}", "python3-colormath"],
                              capture_output=True, text=True, check=True).stdout.strip()
    except (OSError, subprocess.CalledProcessError):
        return "unknown"


def lab_pairs(rng):
    """200 deterministic Lab pairs: 110 close pairs, 40 unrelated pairs,
    25 dark pairs (L* < 16, the CMC S_L branch) and 25 near-neutral pairs."""
    r4 = lambda x: round(x, 4)  # noqa: E731
    pairs = []
    for _ in range(110):
        L1, a1, b1 = rng.uniform(5, 98), rng.uniform(-90, 90), rng.uniform(-90, 90)
        d = [rng.uniform(-6, 6) for _ in range(3)]
        pairs.append((L1, a1, b1, min(100, max(0, L1 + d[0])), a1 + d[1], b1 + d[2]))
    for _ in range(40):
        pairs.append((rng.uniform(0, 100), rng.uniform(-110, 110), rng.uniform(-110, 110),
                      rng.uniform(0, 100), rng.uniform(-110, 110), rng.uniform(-110, 110)))
    for _ in range(25):
        L1, a1, b1 = rng.uniform(0.5, 15.9), rng.uniform(-30, 30), rng.uniform(-30, 30)
        pairs.append((L1, a1, b1, L1 + rng.uniform(-3, 3), a1 + rng.uniform(-3, 3), b1 + rng.uniform(-3, 3)))
    for _ in range(25):
        L1 = rng.uniform(10, 95)
        pairs.append((L1, rng.uniform(-2, 2), rng.uniform(-2, 2),
                      L1 + rng.uniform(-2, 2), rng.uniform(-2, 2), rng.uniform(-2, 2)))
    return [tuple(r4(v) for v in p) for p in pairs]


# XYZ samples on the white-Y-100 scale: the white, greys, chromatic colours,
# and dark colours whose X/Xn, Y/Yn or Z/Zn fall at or below (6/29)^3,
# where colormath's 7.787 differs from the exact 841/108.
XYZ_SAMPLES = [
    (95.047, 100.0, 108.883),
    (0.0, 0.0, 0.0),
    (18.0, 18.0, 18.0),
    (17.5064, 18.4187, 20.0563),
    (41.24, 21.26, 1.93),
    (35.76, 71.52, 11.92),
    (18.05, 7.22, 95.05),
    (59.3, 48.7, 3.9),
    (12.3, 25.6, 44.1),
    (3.2, 1.9, 0.4),
    (0.4, 0.6, 0.9),
    (0.5, 0.2, 0.05),
    (70.0, 80.0, 0.7),
    (104.0, 97.0, 120.0),
]

# Colours to adapt, under D65 (white Y = 100); the unit primaries give the
# columns of the adaptation matrix.
ADAPT_SAMPLES = [
    (100.0, 0.0, 0.0),
    (0.0, 100.0, 0.0),
    (0.0, 0.0, 100.0),
    (95.047, 100.0, 108.883),
    (41.24, 21.26, 1.93),
    (18.05, 7.22, 95.05),
    (12.3, 25.6, 44.1),
]


def main():
    for name, wp in (("d65", D65), ("d50", D50)):
        own = color_constants.ILLUMINANTS["2"][name]
        assert max(abs(a - b) for a, b in zip(own, scaled(wp))) < 1e-15, "colormath's %s differs" % name
    out = sys.stdout
    w = lambda *f: out.write(",".join(f) + "\n")  # noqa: E731
    w("# Golden vectors from python-colormath %s (Debian python3-colormath %s), numpy %s, Python %s."
      % (colormath.VERSION, debian_version(), numpy.__version__, sys.version.split()[0]))
    w("# Generated by testdata/gen/golden_colordiff.py, seed %d. Do not edit by hand." % SEED)
    w("# White D65 = %r, D50 = %r (white Y = 100; given to colormath as Y = 1)." % (D65, D50))
    w("# diff,L1,a1,b1,L2,a2,b2,dE76,dE94_graphic,dE94_textile,CMC21,CMC11,dE00 (first colour = reference)")
    w("# lab,X,Y,Z,L,a,b  (XYZ -> CIELAB relative to D65)")
    w("# luv,X,Y,Z,L,u,v  (XYZ -> CIELUV relative to D65)")
    w("# adapt,cat,X,Y,Z,X2,Y2,Z2  (D65 -> D50; cat bradford or von_kries, colormath's matrices)")

    rng = random.Random(SEED)
    for p in lab_pairs(rng):
        c1, c2 = LabColor(*p[:3]), LabColor(*p[3:])
        vals = [
            delta_e_cie1976(c1, c2),
            delta_e_cie1994(c1, c2),
            delta_e_cie1994(c1, c2, K_L=2, K_1=0.048, K_2=0.014),
            delta_e_cmc(c1, c2, pl=2, pc=1),
            delta_e_cmc(c1, c2, pl=1, pc=1),
            delta_e_cie2000(c1, c2),
        ]
        w("diff", *map(repr, p), *map(repr, vals))

    for x in XYZ_SAMPLES:
        c = XYZColor(*scaled(x), observer="2", illuminant="d65")
        lab = convert_color(c, LabColor, target_illuminant="d65")
        luv = convert_color(c, LuvColor, target_illuminant="d65")
        w("lab", *map(repr, x), repr(lab.lab_l), repr(lab.lab_a), repr(lab.lab_b))
        w("luv", *map(repr, x), repr(luv.luv_l), repr(luv.luv_u), repr(luv.luv_v))

    for cat in ("bradford", "von_kries"):
        m = _get_adaptation_matrix(numpy.array(scaled(D65)), numpy.array(scaled(D50)), "2", cat)
        for x in ADAPT_SAMPLES:
            y = m.dot(numpy.array(x))
            w("adapt", cat, *map(repr, x), *(repr(float(v)) for v in y))


if __name__ == "__main__":
    main()
