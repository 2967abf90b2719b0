#!/usr/bin/env python3
"""Writes the invented demo data of antipode into cmd/antipode/demo/.

The scenario is invented: the scene shop of the Kestrel Yard Theatre, a small
theatre workshop with its own lamps, gel filters and scenic paints. Every
spectrum is synthetic, made here from smooth functions (Planck's law for the
tungsten lamp, Gaussian bands for LED channels, logistic edges for filters and
paints). None of it is measured data and none of it describes a real product.

Run from the repository root: /usr/bin/python3 testdata/gen/make_demo.py
Only the Python standard library is used; the output is deterministic.
"""
import math
import os

OUT = os.path.join(os.path.dirname(__file__), "..", "..", "cmd", "antipode", "demo")
NM = list(range(380, 781, 5))  # 380-780 nm at 5 nm, as many instruments report


def planck(nm, t, c2=1.4388e-2):
    l = nm * 1e-9
    return 1.0 / (l ** 5 * (math.exp(c2 / (l * t)) - 1.0))


def gauss(nm, centre, fwhm):
    s = fwhm / 2.3548
    return math.exp(-0.5 * ((nm - centre) / s) ** 2)


def logistic(nm, edge, width):
    return 1.0 / (1.0 + math.exp(-(nm - edge) / width))


def fmt(v):
    return ("%.5f" % v).rstrip("0").rstrip(".") if v != 0 else "0"


def lamps():
    ref = planck(560, 3200)
    s = {}
    s["tungsten-3200"] = [100 * planck(n, 3200) / ref for n in NM]
    # LED wash channels: relative spectral power, peak 1.
    s["wash-red"] = [gauss(n, 628, 20) for n in NM]
    s["wash-green"] = [gauss(n, 522, 32) for n in NM]
    s["wash-blue"] = [gauss(n, 455, 22) for n in NM]
    s["wash-amber"] = [gauss(n, 592, 16) for n in NM]
    s["wash-cyan"] = [1.5046 * gauss(n, 488.27, 24) for n in NM]
    s["wash-lime"] = [0.08 * gauss(n, 450, 20) + 0.9 * gauss(n, 560, 95) for n in NM]
    # Cool white batten: blue pump plus a broad phosphor band.
    s["batten-cool-white"] = [gauss(n, 452, 20) + 0.62 * gauss(n, 565, 120) for n in NM]
    return s


def filters():
    s = {}
    # Transmittance fractions 0-1 of gel filters (invented).
    s["gel-straw"] = [0.04 + 0.86 * logistic(n, 485, 9) for n in NM]
    s["gel-steel-blue"] = [0.05 + 0.75 * gauss(n, 470, 110) for n in NM]
    s["gel-magenta"] = [0.02 + 0.85 * (gauss(n, 430, 70) + logistic(n, 610, 12)) / 1.02 for n in NM]
    s["gel-leaf-green"] = [0.01 + 0.80 * gauss(n, 530, 60) for n in NM]
    s["gel-deep-amber"] = [0.004 + 0.90 * logistic(n, 585, 7) for n in NM]
    s["gel-cyan"] = [0.003 + 0.85 * (1 - logistic(n, 548, 7)) for n in NM]
    return {k: [min(max(x, 0.0), 1.0) for x in v] for k, v in s.items()}


def paints():
    s = {}
    # Reflectance fractions 0-1 of scenic paints (invented), rows layout.
    s["ky-flat-white"] = [0.86 + 0.04 * logistic(n, 420, 10) for n in NM]
    s["ky-barn-red"] = [0.05 + 0.55 * logistic(n, 600, 14) for n in NM]
    s["ky-sky-blue"] = [0.10 + 0.45 * gauss(n, 470, 120) for n in NM]
    s["ky-ochre"] = [0.06 + 0.58 * logistic(n, 545, 18) for n in NM]
    s["ky-teal"] = [0.05 + 0.38 * gauss(n, 500, 80) for n in NM]
    s["ky-plum"] = [0.07 + 0.22 * gauss(n, 420, 50) + 0.30 * logistic(n, 640, 15) for n in NM]
    s["ky-sage"] = [0.12 + 0.20 * gauss(n, 540, 70) for n in NM]
    s["ky-lamp-black"] = [0.045 + 0.002 * (n - 380) / 400 for n in NM]
    # A touch-up batch of the sage mixed from other pigments: the same colour
    # as ky-sage under D65 for the CIE 1931 observer, a different spectrum (a
    # metamer: sage plus a "metameric black" that the D65 weights cannot see).
    s["ky-sage-touchup"] = metamer(s["ky-sage"])
    return s


def read_columns(path):
    """Reads a CIE reference CSV (header row, wavelength first) into a dict."""
    with open(path) as f:
        header = f.readline().strip().split(",")
        rows = [list(map(float, line.split(","))) for line in f if line.strip()]
    return {int(r[0]): r[1:] for r in rows}, header[1:]


def metamer(base):
    """Returns base plus a smooth spectrum in the null space of the D65/2° weights.

    The CIE tables are read from ../shared/reference (ISO/CIE 11664-1 and -2) at
    the 5 nm rows; only the generator needs them, not the program.
    """
    ref = os.path.join(os.path.dirname(__file__), "..", "..", "..", "shared", "reference")
    cmf, _ = read_columns(os.path.join(ref, "cie1931_2deg_1nm.csv"))
    d65, _ = read_columns(os.path.join(ref, "cie_illuminant_d65_1nm.csv"))
    w = [[d65[n][0] * cmf[n][k] for n in NM] for k in range(3)]
    f = [0.07 * math.sin(2 * math.pi * (n - 380) / 140.0) for n in NM]
    # Project f onto the null space of w: f - w^T (w w^T)^-1 w f.
    g = [[sum(a * b for a, b in zip(w[i], w[j])) for j in range(3)] for i in range(3)]
    wf = [sum(a * b for a, b in zip(w[i], f)) for i in range(3)]
    c = solve3(g, wf)
    black = [f[k] - sum(c[i] * w[i][k] for i in range(3)) for k in range(len(NM))]
    return [min(max(b + x, 0.0), 1.0) for b, x in zip(base, black)]


def solve3(a, b):
    """Solves the 3x3 system a x = b by Cramer's rule."""
    def det(m):
        return (m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1])
                - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0])
                + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]))
    d = det(a)
    out = []
    for i in range(3):
        m = [row[:] for row in a]
        for r in range(3):
            m[r][i] = b[r]
        out.append(det(m) / d)
    return out


def write_columns(path, spectra, header_note):
    names = list(spectra)
    with open(path, "w", newline="\n") as f:
        f.write("# %s\n" % header_note)
        f.write("# Invented demo data (Kestrel Yard Theatre scene shop); not a measurement.\n")
        f.write(",".join(["wavelength_nm"] + names) + "\n")
        for i, n in enumerate(NM):
            f.write(",".join([str(n)] + [fmt(spectra[k][i]) for k in names]) + "\n")


def write_rows(path, spectra, header_note):
    with open(path, "w", newline="\n") as f:
        f.write("# %s\n" % header_note)
        f.write("# Invented demo data (Kestrel Yard Theatre scene shop); not a measurement.\n")
        f.write(",".join(["name"] + [str(n) for n in NM]) + "\n")
        for k, v in spectra.items():
            f.write(",".join([k] + [fmt(x) for x in v]) + "\n")


def main():
    os.makedirs(OUT, exist_ok=True)
    write_columns(os.path.join(OUT, "lamps.csv"), lamps(),
                  "Relative spectral power of the shop's lamps and LED wash channels, 380-780 nm at 5 nm.")
    write_columns(os.path.join(OUT, "filters.csv"), filters(),
                  "Spectral transmittance (fraction 0-1) of the shop's gel filters, 380-780 nm at 5 nm.")
    write_rows(os.path.join(OUT, "paints.csv"), paints(),
               "Spectral reflectance (fraction 0-1) of the shop's scenic paints, 380-780 nm at 5 nm.")


if __name__ == "__main__":
    main()
