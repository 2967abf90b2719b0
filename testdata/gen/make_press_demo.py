#!/usr/bin/env python3
"""Writes the invented halftone-print demo data of antipode into cmd/antipode/demo/.

The scenario is invented: the Kestrel Yard Theatre prints its posters on a
small four-colour press of its own (inks c, m, y, k on a white coated stock).
The "measurements" are synthetic, made here from a known spectral
Yule-Nielsen modified Neugebauer model:

  * the paper and the inks are invented smooth spectra; the solids and
    overprints (the 16 Neugebauer primaries) are the paper seen through the
    inks' films twice (R = s + (paper - s) * 10^(-2 * A), with A the sum of
    the inks' absorbances, 8 % less for each further ink of an overprint
    (imperfect trapping), and s a small first-surface reflection), an
    invented but plausible way to make them;
  * tints follow the Yule-Nielsen modified spectral Neugebauer equations
    with n = 1.65 and the Demichel weights of the effective coverages;
  * each ink's dot gain is e = 1 - (1 - a)^gamma, with gamma chosen to give
    about 15-19 % at 50 %, the order of magnitude the printing standards
    give for coated offset (ISO 12647-2, from memory);
  * every value gets seeded Gaussian noise of 0.0015 * (0.2 + R).

None of it is measured data and none of it describes a real product.

Files written:
  press_characterisation.csv  the press chart (rows layout: name, c, m, y,
                              k in percent, heldout, then 380-730 nm at
                              10 nm): paper (twice), every solid and
                              overprint, a tint ramp per ink, and overprint
                              tints (half held out to validate the model)
  press_target.csv            two targets (columns layout): the poster's
                              brick red, which the press can print, and a
                              fluorescent-looking green, which it cannot

Run from the repository root: /usr/bin/python3 testdata/gen/make_press_demo.py
Only the Python standard library is used; the output is deterministic.
"""
import math
import os
import random

OUT = os.path.join(os.path.dirname(__file__), "..", "..", "cmd", "antipode", "demo")
NM = list(range(380, 731, 10))  # 380-730 nm at 10 nm, a common instrument range
INKS = ["c", "m", "y", "k"]
N_FACTOR = 1.65
GAMMA = {"c": 1.55, "m": 1.58, "y": 1.50, "k": 1.68}
NOISE = 0.0015
SURFACE = 0.008  # first-surface reflection of the ink film (invented)
TRAP = 0.08  # each further ink of an overprint takes 8 % less (imperfect trapping, invented)

# Invented ink absorbance (one pass): floor plus Gaussian bands
# (centre nm, sigma nm, height).
BANDS = {
    "c": (0.03, [(655, 55, 1.0), (600, 25, 0.30), (400, 20, 0.15)]),
    "m": (0.02, [(540, 40, 0.75), (470, 30, 0.45)]),
    "y": (0.015, [(440, 30, 0.85), (405, 25, 0.25)]),
    "k": (0.78, [(560, 200, 0.08)]),
}


def absorbance(ink, nm):
    floor, bands = BANDS[ink]
    return floor + sum(h * math.exp(-0.5 * ((nm - c) / w) ** 2) for c, w, h in bands)


def paper(nm):
    # A white stock, slightly bluish in the visible, falling off into the
    # near ultraviolet.
    return (0.885 + 0.025 * math.exp(-0.5 * ((nm - 450) / 45.0) ** 2)
            - 0.20 * math.exp(-(nm - 380) / 14.0))


def primary(mask):
    out = []
    for nm in NM:
        present = [ink for i, ink in enumerate(INKS) if mask & (1 << i)]
        a = sum(absorbance(ink, nm) for ink in present) * (1 - TRAP * max(len(present) - 1, 0))
        out.append(SURFACE + (paper(nm) - SURFACE) * 10 ** (-2 * a))
    return out


PRIMARIES = [primary(mask) for mask in range(16)]


def effective(ink, a):
    return 1 - (1 - a) ** GAMMA[ink]


def print_patch(nominal):
    """Reflectance of the nominal coverages (fractions, in INKS order)."""
    eff = [effective(ink, a) for ink, a in zip(INKS, nominal)]
    out = []
    for j in range(len(NM)):
        s = 0.0
        for mask in range(16):
            w = 1.0
            for i in range(4):
                w *= eff[i] if mask & (1 << i) else 1 - eff[i]
            s += w * PRIMARIES[mask][j] ** (1 / N_FACTOR)
        out.append(s ** N_FACTOR)
    return out


def noisy(r, rnd):
    return [v + NOISE * (0.2 + v) * rnd.gauss(0, 1) for v in r]


def fmt(v):
    return "%.5f" % v


def pct(a):
    return ("%g" % (100 * a))


def chart():
    rnd = random.Random(20261202)
    rows = []

    def add(name, nominal, held=False):
        rows.append((name, nominal, held, noisy(print_patch(nominal), rnd)))

    add("paper", [0, 0, 0, 0])
    add("paper-2", [0, 0, 0, 0])
    for mask in range(1, 16):
        name = "+".join(ink for i, ink in enumerate(INKS) if mask & (1 << i))
        add("solid-" + name, [1 if mask & (1 << i) else 0 for i in range(4)])
    for i, ink in enumerate(INKS):
        for level in [5, 10, 20, 30, 40, 50, 60, 70, 80, 90, 95]:
            nominal = [0, 0, 0, 0]
            nominal[i] = level / 100
            add("%s%d" % (ink, level), nominal)
    mixes = [
        (40, 30, 30, 0), (70, 60, 60, 0), (20, 15, 15, 0), (50, 40, 40, 20),
        (30, 60, 0, 0), (0, 70, 60, 0), (60, 0, 50, 0), (20, 80, 90, 0),
        (80, 20, 10, 10), (10, 10, 10, 60), (100, 60, 0, 0), (0, 100, 50, 0),
        (45, 35, 35, 10), (60, 50, 50, 40), (15, 40, 45, 0), (90, 85, 80, 30),
    ]
    for q, mix in enumerate(mixes):
        name = "".join("%s%d" % (ink, v) for ink, v in zip(INKS, mix) if v)
        add(name, [v / 100 for v in mix], held=(q % 2 == 1))
    path = os.path.join(OUT, "press_characterisation.csv")
    with open(path, "w") as f:
        f.write("# Spectral reflectance (fraction 0-1) of the Kestrel Yard Theatre poster press chart, 380-730 nm at 10 nm;\n")
        f.write("# coverages c, m, y, k in percent. Invented demo data (a synthetic press, not a measurement).\n")
        f.write("# Made by testdata/gen/make_press_demo.py.\n")
        f.write("name,c,m,y,k,heldout," + ",".join(str(n) for n in NM) + "\n")
        for name, nominal, held, r in rows:
            f.write(",".join([name] + [pct(a) for a in nominal] + ["1" if held else "0"] + [fmt(v) for v in r]) + "\n")


def targets():
    rnd = random.Random(7)
    brick = noisy(print_patch([0.12, 0.78, 0.85, 0.06]), rnd)
    # A fluorescent-looking green: a tall narrow peak no process ink set
    # reaches.
    green = [0.04 + 0.80 * math.exp(-0.5 * ((nm - 525) / 22.0) ** 2) for nm in NM]
    path = os.path.join(OUT, "press_target.csv")
    with open(path, "w") as f:
        f.write("# Target reflectances (fraction 0-1) for the Kestrel Yard Theatre posters, 380-730 nm at 10 nm.\n")
        f.write("# Invented demo data; not a measurement. Made by testdata/gen/make_press_demo.py.\n")
        f.write("nm,poster-brick,signal-green\n")
        for nm, b, g in zip(NM, brick, green):
            f.write("%d,%s,%s\n" % (nm, fmt(b), fmt(g)))


if __name__ == "__main__":
    chart()
    targets()
