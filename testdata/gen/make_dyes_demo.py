#!/usr/bin/env python3
"""Writes the invented dye demo data of antipode into cmd/antipode/demo/.

The scenario is invented: the scene shop of the Kestrel Yard Theatre tints
clear gel film with three dyes of its own naming (kestrel-amber-dye,
kestrel-teal-dye, kestrel-rose-dye). The "measurements" are synthetic, made
here from Gaussian absorption bands under the Beer-Lambert-Bouguer law, with
seeded transmittance noise; the most concentrated amber sample is bent away
from the law (as concentrated dyes do when they aggregate) so the fit report
has something to flag. None of it is measured data and none of it describes a
real product.

Files written:
  dyes_dilutions.csv  the dilution series (rows layout: name, dye,
                      concentration (g/L), heldout, then 380-780 nm at 5 nm)
  dyes_target.csv     a target transmittance (columns layout) that the three
                      dyes can make: the shop's "sunset wash" gel

Run from the repository root: /usr/bin/python3 testdata/gen/make_dyes_demo.py
Only the Python standard library is used; the output is deterministic.
"""
import math
import os
import random

OUT = os.path.join(os.path.dirname(__file__), "..", "..", "cmd", "antipode", "demo")
NM = list(range(380, 781, 5))  # 380-780 nm at 5 nm

# Invented absorption bands: (centre nm, width nm (sigma), absorbance per g/L
# at 1 mm of film), summed, on a small floor.
DYES = {
    "kestrel-amber-dye": [(440, 32, 11.0), (395, 25, 4.0)],
    "kestrel-teal-dye": [(625, 45, 8.5), (700, 40, 2.5)],
    "kestrel-rose-dye": [(535, 30, 9.5), (495, 20, 2.0)],
}
NOISE = 0.0015  # transmittance noise (fraction), invented


def absorptivity(name, nm):
    a = 0.03
    for centre, width, height in DYES[name]:
        a += height * math.exp(-0.5 * ((nm - centre) / width) ** 2)
    return a


def base(nm):
    # The clear carrier film: a little absorbance rising to the blue.
    return 0.015 + 0.02 * math.exp(-(nm - 380) / 60.0)


def transmittance(conc, rnd, bend=0.0):
    out = []
    for nm in NM:
        a = sum(c * absorptivity(d, nm) for d, c in conc.items())
        a = a / (1 + bend * a)  # bend > 0: saturating, away from the law
        t = 10 ** -(base(nm) + a)
        if rnd is not None:
            t += rnd.gauss(0, NOISE)
        out.append(max(t, 0.0))
    return out


def fmt(v):
    return ("%.5f" % v).rstrip("0").rstrip(".") if v != 0 else "0"


def dilutions():
    rnd = random.Random(20240611)
    rows = []
    for k in range(3):
        rows.append(("blank-%d" % (k + 1), "base", "0", "0", transmittance({}, rnd)))
    levels = [0.005, 0.01, 0.02, 0.04, 0.06]
    for d in DYES:
        short = d.split("-")[1]
        for c in levels:
            rows.append(("%s-%g" % (short, c), d, "%g" % c, "0", transmittance({d: c}, rnd)))
        # A replicate of the middle level, measured on another day.
        rows.append(("%s-%g-rep" % (short, 0.02), d, "0.02", "0", transmittance({d: 0.02}, rnd)))
        # A level held out to validate the fit.
        rows.append(("%s-%g" % (short, 0.03), d, "0.03", "1", transmittance({d: 0.03}, rnd)))
    # The strongest amber: aggregated, below the Beer-Lambert line.
    rows.append(("amber-0.1", "kestrel-amber-dye", "0.1", "0",
                 transmittance({"kestrel-amber-dye": 0.1}, rnd, bend=0.12)))
    # Two mixtures, held out to check that absorbances add.
    for name, conc in [("mix-sunrise", {"kestrel-amber-dye": 0.02, "kestrel-rose-dye": 0.01}),
                       ("mix-dusk", {"kestrel-teal-dye": 0.02, "kestrel-rose-dye": 0.015})]:
        cell = "+".join("%s=%g" % (d, c) for d, c in conc.items())
        rows.append((name, cell, "", "1", transmittance(conc, rnd)))
    path = os.path.join(OUT, "dyes_dilutions.csv")
    with open(path, "w") as f:
        f.write("# Spectral transmittance (fraction 0-1) of the shop's dye dilution series on clear gel film, 380-780 nm at 5 nm.\n")
        f.write("# Invented demo data (Kestrel Yard Theatre scene shop); not a measurement. Made by testdata/gen/make_dyes_demo.py.\n")
        f.write("name,dye,concentration (g/L),heldout," + ",".join(str(n) for n in NM) + "\n")
        for name, dye, c, held, t in rows:
            f.write(",".join([name, dye, c, held] + [fmt(v) for v in t]) + "\n")


def target():
    rnd = random.Random(7)
    t = transmittance({"kestrel-amber-dye": 0.035, "kestrel-rose-dye": 0.012, "kestrel-teal-dye": 0.004}, rnd)
    path = os.path.join(OUT, "dyes_target.csv")
    with open(path, "w") as f:
        f.write("# Target transmittance (fraction 0-1) for the shop's sunset-wash gel, 380-780 nm at 5 nm.\n")
        f.write("# Invented demo data (Kestrel Yard Theatre scene shop); not a measurement. Made by testdata/gen/make_dyes_demo.py.\n")
        f.write("nm,sunset-wash\n")
        for nm, v in zip(NM, t):
            f.write("%d,%s\n" % (nm, fmt(v)))


if __name__ == "__main__":
    dilutions()
    target()
