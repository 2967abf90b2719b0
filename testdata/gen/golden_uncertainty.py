#!/usr/bin/env python3
"""Reference values for antipode's metamerism and uncertainty tests
(colorimetry/metamerism_test.go, colorimetry/uncertainty_test.go),
computed independently of antipode from the CIE tables in shared/reference
with numpy 1.24 (Debian), python-colormath 3.0.0 (Debian python3-colormath)
for CIELAB and CIEDE2000, and the 'uncertainties' package 3.1.6 (Debian
python3-uncertainties: first-order propagation by automatic
differentiation).

All sums on 380-780 nm at 5 nm (the 5 nm rows of the 1 nm CIE tables), with
weights W = k S cmf, k = 100 / sum(S ybar).
Install and run (from the repository root; prints the values the tests
quote):

    apt-get install -y python3-colormath python3-uncertainties
    /usr/bin/python3 testdata/gen/golden_uncertainty.py [path/to/shared/reference]
"""
import csv
import math
import os
import sys

import numpy as np

np.asscalar = lambda a: a.item()  # colormath 3.0.0 still calls it

from colormath import color_constants  # noqa: E402
from colormath.color_conversions import convert_color  # noqa: E402
from colormath.color_diff import delta_e_cie2000  # noqa: E402
from colormath.color_objects import LabColor, XYZColor  # noqa: E402
import uncertainties  # noqa: E402
from uncertainties import ufloat, umath  # noqa: E402

REF = sys.argv[1] if len(sys.argv) > 1 else os.path.join(
    os.path.dirname(os.path.abspath(__file__)), "..", "..", "..", "shared", "reference")
NM = np.arange(380, 781, 5)


def table(name):
    with open(os.path.join(REF, name)) as f:
        r = csv.reader(f)
        head = next(r)
        rows = {int(row[0]): [float(v) for v in row[1:]] for row in r}
    return head[1:], rows


def column(name, col):
    head, rows = table(name)
    j = head.index(col)
    return np.array([rows[int(w)][j] for w in NM])


CMF = np.array([column("cie1931_2deg_1nm.csv", c) for c in ("xbar", "ybar", "zbar")])
CMF10 = np.array([column("cie1964_10deg_1nm.csv", c) for c in ("xbar10", "ybar10", "zbar10")])
D65 = column("cie_illuminant_d65_1nm.csv", "D65")
# A from its defining formula (ISO/CIE 11664-2), as the 1 nm CIE table is
# printed to 6 significant figures only.
A = 100 * (560 / NM) ** 5 * np.expm1(1.435e7 / (2848 * 560)) / np.expm1(1.435e7 / (2848 * NM))
F11 = column("cie_fluorescent_f1_f12_5nm.csv", "F11")
TCS = {n: column("cie_13_3_tcs_5nm.csv", "TCS%02d" % n) for n in range(1, 15)}


def weights(s, cmf=CMF):
    return 100 * s * cmf / np.dot(s, cmf[1])


def lab(xyz, white):
    # colormath converts relative to a named white; register this one.
    color_constants.ILLUMINANTS["2"]["tmp"] = tuple(white / 100)
    c = convert_color(XYZColor(*(xyz / 100), observer="2", illuminant="tmp"), LabColor, target_illuminant="tmp")
    return LabColor(c.lab_l, c.lab_a, c.lab_b)


def de00(p, q):
    return float(delta_e_cie2000(p, q))


def metamer(std, amp):
    """std + amp times the part of sin(2 pi (nm-380)/200) in the null space
    of the D65 weights (a metameric black)."""
    W = weights(D65)
    p = np.sin(2 * math.pi * (NM - 380) / 200)
    b = p - W.T @ np.linalg.solve(W @ W.T, W @ p)
    return std + amp * b


def index(std, trial, ref, test):
    wr, wt = weights(ref), weights(test)
    ls, lt = lab(wr @ std, wr.sum(1)), lab(wr @ trial, wr.sum(1))
    d = [lt.lab_l - ls.lab_l, lt.lab_a - ls.lab_a, lt.lab_b - ls.lab_b]
    s, t = lab(wt @ std, wt.sum(1)), lab(wt @ trial, wt.sum(1))
    tc = LabColor(t.lab_l - d[0], t.lab_a - d[1], t.lab_b - d[2])
    return de00(s, tc), de00(s, t), de00(ls, lt)


def ulab(X, Y, Z, white):
    def f(t):
        return t ** (1 / 3) if t.nominal_value > (6 / 29) ** 3 else t * 841 / 108 + 4 / 29
    fx, fy, fz = f(X / white[0]), f(Y / white[1]), f(Z / white[2])
    return 116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)


def ude2000(l1, l2):
    """CIEDE2000 (Sharma, Wu & Dalal 2005, eq. 1-22) on uncertain numbers."""
    L1, a1, b1 = l1
    L2, a2, b2 = l2
    C1, C2 = umath.sqrt(a1 ** 2 + b1 ** 2), umath.sqrt(a2 ** 2 + b2 ** 2)
    Cb = (C1 + C2) / 2
    G = 0.5 * (1 - umath.sqrt(Cb ** 7 / (Cb ** 7 + 25.0 ** 7)))
    a1p, a2p = (1 + G) * a1, (1 + G) * a2
    C1p, C2p = umath.sqrt(a1p ** 2 + b1 ** 2), umath.sqrt(a2p ** 2 + b2 ** 2)

    def hp(b, a):
        h = umath.degrees(umath.atan2(b, a))
        return h + 360 if h.nominal_value < 0 else h
    h1p, h2p = hp(b1, a1p), hp(b2, a2p)
    dLp, dCp = L2 - L1, C2p - C1p
    d = (h2p - h1p).nominal_value
    dhp = h2p - h1p + (-360 if d > 180 else 360 if d < -180 else 0)
    dHp = 2 * umath.sqrt(C1p * C2p) * umath.sin(umath.radians(dhp / 2))
    Lbp, Cbp = (L1 + L2) / 2, (C1p + C2p) / 2
    s = (h1p + h2p)
    Hbp = s / 2 if abs(d) <= 180 else (s + 360) / 2 if s.nominal_value < 360 else (s - 360) / 2
    T = (1 - 0.17 * umath.cos(umath.radians(Hbp - 30)) + 0.24 * umath.cos(umath.radians(2 * Hbp))
         + 0.32 * umath.cos(umath.radians(3 * Hbp + 6)) - 0.20 * umath.cos(umath.radians(4 * Hbp - 63)))
    dth = 30 * umath.exp(-(((Hbp - 275) / 25) ** 2))
    RC = 2 * umath.sqrt(Cbp ** 7 / (Cbp ** 7 + 25.0 ** 7))
    SL = 1 + 0.015 * (Lbp - 50) ** 2 / umath.sqrt(20 + (Lbp - 50) ** 2)
    SC, SH = 1 + 0.045 * Cbp, 1 + 0.015 * Cbp * T
    RT = -umath.sin(umath.radians(2 * dth)) * RC
    return umath.sqrt((dLp / SL) ** 2 + (dCp / SC) ** 2 + (dHp / SH) ** 2 + RT * (dCp / SC) * (dHp / SH))


def uxyz(spec, u, W):
    vals = [ufloat(v, e) for v, e in zip(spec, u)]
    return [sum(w * v for w, v in zip(row, vals)) for row in W]


def uxyz_cov(spec, cov, W):
    vals = uncertainties.correlated_values(list(spec), cov)
    return [sum(w * v for w, v in zip(row, vals)) for row in W]


def report_colour(tag, X, Y, Z, white):
    cm = uncertainties.covariance_matrix([X, Y, Z])
    print("%s XYZ %r %r %r" % (tag, X.n, Y.n, Z.n))
    print("%s covXYZ %r %r %r %r %r %r" % (tag, cm[0][0], cm[0][1], cm[0][2], cm[1][1], cm[1][2], cm[2][2]))
    S = X + Y + Z
    x, y = X / S, Y / S
    D = X + 15 * Y + 3 * Z
    up, vp = 4 * X / D, 9 * Y / D
    L, a, b = ulab(X, Y, Z, white)
    C = umath.sqrt(a ** 2 + b ** 2)
    h = umath.degrees(umath.atan2(b, a)) % 360
    for name, q in (("xy", (x, y)), ("uv", (up, vp)), ("Lab", (L, a, b))):
        cm = uncertainties.covariance_matrix(list(q))
        flat = [cm[i][j] for i in range(len(q)) for j in range(i, len(q))]
        print("%s %s %s cov %s" % (tag, name, " ".join(repr(v.n) for v in q), " ".join(map(repr, flat))))
    print("%s Ch %r %r %r %r" % (tag, C.n, C.s, h.n, h.s))
    return L, a, b


def main():
    # --- metamerism -------------------------------------------------------
    std = TCS[5]
    trial = metamer(std, 0.1)
    print("# metamer min %r max %r" % (trial.min(), trial.max()))
    for name, ill in (("A", A), ("F11", F11), ("D65", D65)):
        print("meta %s %r %r %r" % ((name,) + index(std, trial, D65, ill)))
    for tag, cmf in (("2", CMF), ("10", CMF10)):
        W = weights(D65, cmf)
        print("field %s %r" % (tag, de00(lab(W @ std, W.sum(1)), lab(W @ trial, W.sum(1)))))
    off = trial + 0.02
    for name, ill in (("A", A), ("F11", F11)):
        print("metaoff %s %r %r %r" % ((name,) + index(std, off, D65, ill)))
    # --- uncertainty: independent u(λ), TCS05 under D65 ------------------------
    W = weights(D65)
    white = W.sum(1)
    u = 0.002 + 0.003 * (NM - 380) / 400
    X, Y, Z = uxyz(std, u, W)
    la = report_colour("tcs05", X, Y, Z, white)
    # correlated: independent part plus a fully correlated 0.003 offset
    # and an exponential correlation (length 30 nm) of 0.002.
    cov = np.diag(u ** 2) + 0.003 ** 2 + 0.002 ** 2 * np.exp(-np.abs(NM[:, None] - NM[None, :]) / 30)
    X2, Y2, Z2 = uxyz_cov(std, cov, W)
    report_colour("tcs05corr", X2, Y2, Z2, white)
    # ΔE00 between TCS05 and TCS06, and TCS05 and TCS05 + 0.01, independent
    # spectra with the same u(λ).
    for tag, other in (("de_tcs06", TCS[6]), ("de_offset", std + 0.01)):
        Xb, Yb, Zb = uxyz(other, u, W)
        lb = ulab(Xb, Yb, Zb, white)
        de = ude2000(la, lb)
        ref = de00(lab(W @ std, white), lab(W @ other, white))
        assert abs(de.n - ref) < 1e-9, (de.n, ref)
        print("%s %r %r" % (tag, de.n, de.s))


if __name__ == "__main__":
    main()
