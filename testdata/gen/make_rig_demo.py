#!/usr/bin/env python3
"""Writes the invented lights demo of antipode into cmd/antipode/demo/.

The scenario is invented: the LED wash rig of the Kestrel Yard Theatre scene
shop. Its five channels are the wash channels of demo/lamps.csv (wash-red,
wash-green, wash-blue, wash-amber, wash-lime; made by make_demo.py). This
script pretends to have measured each channel at ten drive levels with a
spectroradiometer:

    measured(d) = dark + scale * response(d) * lamps.csv shape + noise

with an invented output scale and power-law response (gamma 2.0-2.4) per
channel, a faint dark spectrum (spill from the shop's work lights, a warm
Planckian shape), Gaussian noise of 0.0005 (0.05 % of the strongest peak)
from a seeded generator, and two dark rows. The amber channel's peak moves
3 nm towards the blue at low drive (an LED running cooler), so the fit warns
about it. One extra ramp row per channel, at drive 0.45, is flagged held
out. None of it is measured data and none of it describes a real product.

It also writes the coloured light that the demo complements to a 4000 K
white: the tungsten-3200 lamp of lamps.csv through gel-straw of
filters.csv, scaled into the rig's units as if measured by the same
instrument at the same place.

Run from the repository root: /usr/bin/python3 testdata/gen/make_rig_demo.py
Only the Python standard library is used; the output is deterministic.
"""
import csv
import math
import os
import random

DEMO = os.path.join(os.path.dirname(__file__), "..", "..", "cmd", "antipode", "demo")

# Channel: (output scale at full drive, gamma), invented.
CHANNELS = {
    "wash-red": (0.90, 2.2),
    "wash-green": (0.70, 2.0),
    "wash-blue": (1.00, 2.4),
    "wash-amber": (0.60, 2.3),
    "wash-lime": (0.80, 2.1),
}
DRIVES = [0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0]
HELD_OUT_DRIVE = 0.45
NOISE = 0.0005
AMBER_SHIFT_NM = 3.0  # peak shift towards the blue at zero drive
FILTERED_SCALE = 0.0025  # tungsten (100 at 560 nm) into the rig's units
SEED = 20240611


def read_columns(path):
    """Reads a columns-layout CSV written by make_demo.py."""
    with open(path, newline="") as f:
        rows = [r for r in csv.reader(f) if r and not r[0].startswith("#")]
    header = rows[0]
    nm = [float(r[0]) for r in rows[1:]]
    cols = {header[j]: [float(r[j]) for r in rows[1:]] for j in range(1, len(header))}
    return nm, cols


def shifted(nm, values, shift):
    """values(λ - shift) by linear interpolation, zero outside."""
    out = []
    for n in nm:
        x = n - shift
        if x <= nm[0] or x >= nm[-1]:
            out.append(0.0 if x < nm[0] or x > nm[-1] else values[nm.index(x)])
            continue
        k = int((x - nm[0]) // (nm[1] - nm[0]))
        t = (x - nm[k]) / (nm[k + 1] - nm[k])
        out.append(values[k] * (1 - t) + values[k + 1] * t)
    return out


def planck(n, t, c2=1.4388e-2):
    l = n * 1e-9
    return 1.0 / (l ** 5 * (math.exp(c2 / (l * t)) - 1.0))


def fmt(v):
    return "%.6f" % v


def main():
    nm, lamps = read_columns(os.path.join(DEMO, "lamps.csv"))
    _, filters = read_columns(os.path.join(DEMO, "filters.csv"))
    rnd = random.Random(SEED)
    ref = planck(560, 2700)
    dark = [0.0004 * planck(n, 2700) / ref for n in nm]

    def noisy(values):
        return [v + rnd.gauss(0.0, NOISE) for v in values]

    rows = []
    for k in range(2):
        rows.append(("dark-%d" % (k + 1), "dark", 0.0, 0, noisy(dark)))
    for name, (scale, gamma) in CHANNELS.items():
        shape = lamps[name]
        levels = [(d, 0) for d in DRIVES] + [(HELD_OUT_DRIVE, 1)]
        for d, held in levels:
            w = d ** gamma
            s = shape
            if name == "wash-amber":
                s = shifted(nm, shape, -AMBER_SHIFT_NM * (1 - d))
            spec = [dk + scale * w * v for dk, v in zip(dark, s)]
            rows.append(("%s@%g" % (name, d), name, d, held, noisy(spec)))

    path = os.path.join(DEMO, "rig_ramps.csv")
    with open(path, "w", newline="\n") as f:
        f.write("# Drive ramps of the Kestrel Yard Theatre LED wash rig: spectral power in the rig's\n")
        f.write("# relative units, 380-780 nm at 5 nm; drive 0-1; 'dark' rows have every channel off.\n")
        f.write("# Invented demo data (Kestrel Yard Theatre scene shop); not a measurement.\n")
        f.write(",".join(["name", "channel", "drive", "heldout"] + ["%g" % n for n in nm]) + "\n")
        for name, ch, d, held, spec in rows:
            f.write(",".join([name, ch, "%g" % d, str(held)] + [fmt(v) for v in spec]) + "\n")

    filtered = [FILTERED_SCALE * t * g for t, g in zip(lamps["tungsten-3200"], filters["gel-straw"])]
    path = os.path.join(DEMO, "rig_filtered.csv")
    with open(path, "w", newline="\n") as f:
        f.write("# The shop's tungsten-3200 lamp through gel-straw, in the LED rig's relative units\n")
        f.write("# (as if measured with the same instrument), 380-780 nm at 5 nm.\n")
        f.write("# Invented demo data (Kestrel Yard Theatre scene shop); not a measurement.\n")
        f.write("wavelength_nm,tungsten-3200+gel-straw\n")
        for n, v in zip(nm, filtered):
            f.write("%g,%s\n" % (n, fmt(v)))


if __name__ == "__main__":
    main()
