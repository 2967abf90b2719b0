#!/usr/bin/env python3
"""Writes the invented pigments demo of antipode into cmd/antipode/demo/.

The scenario is invented: the scenic paints of the Kestrel Yard Theatre scene
shop, a white and six tinting colorants with invented unit absorption K and
scattering S (relative to the white's scattering), on 400-700 nm at 10 nm.
This script pretends to have measured, with a spectrophotometer that includes
the specular component (Saunderson k1 = 0.04 from n = 1.5, k2 = 0.6):

  paint_ladders.csv  the tint ladders: every colorant alone (masstone) and
                     mixed with the white at mass fractions 0.5, 0.25, 0.1,
                     0.05 and 0.02, two films of the white alone, one
                     held-out tint per colorant at 0.15, and one colorant
                     (ky-deep-sea at 0.1) drawn down thin over the black and
                     the white part of a drawdown chart, with the bare chart
                     measured too;
  paint_target.csv   a colour the designer wants, made with the model from a
                     known recipe and then slightly perturbed (a gentle tilt
                     and noise), as a real swatch would be;
  paint_trial.csv    a trial batch mixed from that recipe in the shop, whose
                     ky-brick came out 12 % stronger than the calibration.

Every film is the two-constant Kubelka-Munk model with the Saunderson
correction; the measured values get Gaussian noise of 0.0015 from a seeded
generator and are rounded to 5 decimals. None of it is measured data and none
of it describes a real product.

Run from the repository root: python3 testdata/gen/make_paint_demo.py
Python standard library only; the output is the same on every run.
"""
import math
import os
import random

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "cmd", "antipode", "demo")

NM = [400 + 10 * i for i in range(31)]
K1, K2 = 0.04, 0.6
NOISE = 0.0015
RNG = random.Random(20261202)

WHITE = "ky-scenic-white"


def band(centre, width, height):
    return [height * math.exp(-0.5 * ((nm - centre) / width) ** 2) for nm in NM]


def add(*vs):
    return [sum(x) for x in zip(*vs)]


def const(v):
    return [v] * len(NM)


def slope(a, b):
    return [a + (b - a) * (nm - NM[0]) / (NM[-1] - NM[0]) for nm in NM]


# Invented colorants: K per unit mass fraction, S per unit mass fraction,
# both relative to the white's S (= 1).
COLORANTS = {
    WHITE: (add(const(0.006), [0.25 * math.exp(-(nm - 380) / 12) for nm in NM]), const(1.0)),
    "ky-sunflower": (add(const(0.02), band(440, 40, 7.0), band(400, 25, 2.0)), slope(0.45, 0.30)),
    "ky-brick": (add(const(0.06), band(490, 60, 8.0)), slope(0.60, 0.45)),
    "ky-magenta-flat": (add(const(0.03), band(545, 38, 9.0)), slope(0.30, 0.22)),
    "ky-deep-sea": (add(const(0.05), band(615, 55, 10.0), band(420, 30, 0.8)), slope(0.22, 0.14)),
    "ky-moss": (add(const(0.04), band(445, 40, 6.0), band(655, 50, 7.0)), slope(0.30, 0.25)),
    "ky-lamp-black": (const(7.0), const(0.35)),
}


def r_inf(q):
    return 1.0 / (1.0 + q + math.sqrt(q * q + 2.0 * q))


def measured(r):
    return K1 + (1 - K1) * (1 - K2) * r / (1 - K2 * r)


def internal(rm):
    x = rm - K1
    return x / ((1 - K1) * (1 - K2) + K2 * x)


def mix_ks(recipe, strength=None):
    """K and S per band of a recipe {name: mass fraction}."""
    strength = strength or {}
    k = [0.0] * len(NM)
    s = [0.0] * len(NM)
    for name, c in recipe.items():
        ck, cs = COLORANTS[name]
        f = strength.get(name, 1.0)
        for i in range(len(NM)):
            k[i] += c * ck[i] * f
            s[i] += c * cs[i]
    return k, s


def opaque(recipe, strength=None):
    k, s = mix_ks(recipe, strength)
    return [measured(r_inf(k[i] / s[i])) for i in range(len(NM))]


def layer(k, s, x, rg):
    """Kubelka's hyperbolic solution: internal reflectance over rg."""
    a = 1 + k / s
    b = math.sqrt(a * a - 1)
    y = b * s * x
    bc = b / math.tanh(y)
    return (1 - rg * (a - bc)) / (a - rg + bc)


def thin(recipe, x, card):
    k, s = mix_ks(recipe)
    return [measured(layer(k[i], s[i], x, internal(card[i]))) for i in range(len(NM))]


def noisy(v):
    return [round(x + RNG.gauss(0.0, NOISE), 5) for x in v]


def write(name, header_extra, rows, comment):
    path = os.path.join(OUT, name)
    with open(path, "w", newline="\n") as fh:
        for line in comment:
            fh.write("# " + line + "\n")
        fh.write(",".join(["name"] + header_extra + [str(nm) for nm in NM]) + "\n")
        for r in rows:
            fh.write(",".join(r[0] + ["%.5f" % v for v in r[1]]) + "\n")
    print("wrote", os.path.relpath(path))


def main():
    rows = []
    for k in (1, 2):
        rows.append(([f"white-{k}", WHITE, "1", "opaque", "0"], noisy(opaque({WHITE: 1.0}))))
    for name in COLORANTS:
        if name == WHITE:
            continue
        short = name[3:]
        for f in (1, 0.5, 0.25, 0.1, 0.05, 0.02):
            rec = {name: f, WHITE: 1 - f} if f < 1 else {name: 1.0}
            label = f"{short}-masstone" if f == 1 else f"{short}-{f:g}"
            rows.append(([label, name, f"{f:g}", "opaque", "0"], noisy(opaque(rec))))
        rows.append(([f"{short}-0.15-check", name, "0.15", "opaque", "1"], noisy(opaque({name: 0.15, WHITE: 0.85}))))
    # A drawdown chart: the bare black and white parts, and a thin film of
    # a 1:10 deep-sea tint over each (film thickness 0.4 / S_white).
    card_black = [0.045 + 0.002 * i / 30 for i in range(31)]
    card_white = [0.80 + 0.02 * i / 30 for i in range(31)]
    rows.append((["chart-black", "", "", "black", "0"], noisy(card_black)))
    rows.append((["chart-white", "", "", "white", "0"], noisy(card_white)))
    rec = {"ky-deep-sea": 0.1, WHITE: 0.9}
    rows.append((["deep-sea-0.1-over-black", "ky-deep-sea", "0.1", "black", "0"], noisy(thin(rec, 0.4, card_black))))
    rows.append((["deep-sea-0.1-over-white", "ky-deep-sea", "0.1", "white", "0"], noisy(thin(rec, 0.4, card_white))))
    write("paint_ladders.csv", ["colorant", "fraction", "backing", "heldout"], rows, [
        "Tint ladders of the shop's scenic paints: reflectance (fraction 0-1), specular included.",
        "Invented demo data (Kestrel Yard Theatre scene shop); not a measurement.",
        "Made by testdata/gen/make_paint_demo.py.",
    ])

    recipe = {WHITE: 0.86, "ky-sunflower": 0.075, "ky-brick": 0.045, "ky-deep-sea": 0.02}
    base = opaque(recipe)
    tilt = [1.0 + 0.01 * (nm - 550) / 150 for nm in NM]
    target = noisy([base[i] * tilt[i] for i in range(len(NM))])
    write("paint_target.csv", [], [(["autumn-wall"], target)], [
        "The colour the designer wants for the autumn wall flat: reflectance (fraction 0-1).",
        "Invented demo data (Kestrel Yard Theatre scene shop); not a measurement.",
        "Made by testdata/gen/make_paint_demo.py.",
    ])
    trial = noisy(opaque(recipe, {"ky-brick": 1.12}))
    write("paint_trial.csv", [], [(["autumn-wall-trial-1"], trial)], [
        "First trial batch for the autumn wall: reflectance (fraction 0-1).",
        "Invented demo data (Kestrel Yard Theatre scene shop); not a measurement.",
        "Made by testdata/gen/make_paint_demo.py.",
    ])


if __name__ == "__main__":
    main()
