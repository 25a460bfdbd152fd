"""Peer of `npm run analyze` on a sweep of trimmed cases, for `npm run bench`: the script a loads
engineer would write with numpy.

Reads a spanwright.case/1 file whose cases are given by weight and nz (JSON in), solves a lifting
line (Glauert's Fourier series, the file's compressibility rule on the section slopes) once per
distinct Mach number, combines every case by superposition of the basic and additional loadings,
integrates shear, bending and torsion at the output stations with integration matrices applied to
all cases at once, takes the envelope, and writes the summary as JSON (JSON out): per case the
flight condition, CL, alpha and the root loads; per station the envelope with the cases that set it.
Usage: python3 sweep_peer.py CASE.json > RESULT.json
"""
import json
import sys

import numpy as np

G0 = 9.80665
R_AIR = 287.05287
GAMMA = 1.4
TERMS = 60  # odd Fourier terms of the lifting line
GRID = 400  # integration nodes over the semispan (full cosine)
# The trapezoidal rule: numpy 2 names it trapezoid and has dropped trapz; numpy 1 before 1.25 has trapz alone.
trapezoid = getattr(np, "trapezoid", None) or np.trapz


def isa_pressure(h):
    """Static pressure (Pa) of the standard atmosphere, 0-20 km geopotential, vectorised."""
    h = np.asarray(h, dtype=float)
    t11 = 288.15 - 0.0065 * 11000.0
    p11 = 101325.0 * (t11 / 288.15) ** (G0 / (0.0065 * R_AIR))
    low = 101325.0 * ((288.15 - 0.0065 * h) / 288.15) ** (G0 / (0.0065 * R_AIR))
    high = p11 * np.exp(-G0 * (h - 11000.0) / (R_AIR * t11))
    return np.where(h <= 11000.0, low, high)


def slope_factor(rule, mach, cp_min):
    """k = Cp/Cp0 of the rule at the section's working Cp (its cpMin); Prandtl-Glauert where none."""
    beta = np.sqrt(1.0 - mach * mach)
    pg = np.full_like(cp_min, 1.0 / beta)
    if rule == "prandtl-glauert":
        return pg
    cp0 = np.where(np.isnan(cp_min), 0.0, cp_min)
    if rule == "karman-tsien":
        d = beta + mach * mach / (1.0 + beta) * cp0 / 2.0
    else:  # laitone
        d = beta + mach * mach * (1.0 + (GAMMA - 1.0) / 2.0 * mach * mach) / (2.0 * beta) * cp0
    k = np.where((d > 0) & ~np.isnan(cp_min), 1.0 / np.where(d > 0, d, 1.0), pg)
    return k


def main():
    with open(sys.argv[1]) as f:
        doc = json.load(f)
    wing, method, cases = doc["wing"], doc.get("method", {}), doc["cases"]
    st = wing["stations"]
    ys = np.array([s["y"] for s in st])
    col = lambda k: np.array([s.get(k, np.nan) for s in st], dtype=float)
    chord_s, xle_s, twist_s, a0_s, al0_s, cm_s, cpmin_s = (col(k) for k in ("chord", "xLe", "twist", "a0", "alphaL0", "cmAc", "cpMin"))
    semi = ys[-1]
    area = 2.0 * trapezoid(chord_s, ys)
    span = 2.0 * semi
    axis = wing.get("axis", {})
    fr, ft = axis.get("rootChordFraction", 0.25), axis.get("tipChordFraction", 0.25)
    x_axis = lambda y: (xle_s[0] + fr * chord_s[0]) + (y / semi) * ((xle_s[-1] + ft * chord_s[-1]) - (xle_s[0] + fr * chord_s[0]))
    rule = method.get("compressibility", "prandtl-glauert")
    n_out = method.get("stations", 40)
    mass_kg = wing.get("mass", {}).get("kg", 0.0)

    # Output stations (root first) and the integration grid.
    y_out = semi * np.cos(np.arange(n_out, 0, -1) * np.pi / (2 * n_out))
    y_out[0] = 0.0
    y = np.unique(np.concatenate([semi * (1 - np.cos(np.linspace(0, np.pi, GRID))) / 2, ys, y_out]))
    interp = lambda v: np.interp(y, ys, v)
    chord, xle, twist, a0, al0, cm, cpmin = (interp(v) for v in (chord_s, xle_s, twist_s, a0_s, al0_s, cm_s, cpmin_s))
    x_ac = xle + chord / 4.0

    # Integration matrices: V(y_k) = ∫_{y_k}^s l dy', M(y_k) = ∫ l (y' - y_k) dy', T(y_k) = ∫ [t + l (x_ref(y_k) - x_ac)] dy'.
    dy = np.diff(y)
    w = np.zeros((n_out, y.size))
    wy = np.zeros((n_out, y.size))
    for k, yk in enumerate(y_out):
        inside = (y[:-1] >= yk - 1e-12).astype(float) * dy / 2.0
        w[k, :-1] += inside
        w[k, 1:] += inside
    wy = w * (y[None, :] - y_out[:, None])
    xr = x_axis(y_out)

    # Lifting line per Mach number.
    mach_all = np.array([c["mach"] for c in cases])
    machs, which = np.unique(mach_all, return_inverse=True)
    n = 2 * np.arange(TERMS) + 1
    theta = np.arange(1, TERMS + 1) * np.pi / (2 * TERMS)
    y_col = semi * np.cos(theta)
    unit = []  # per Mach: CLa, alpha0L (rad), (shear, bending, torsion) of basic per q, additional per q.CL
    for m in machs:
        k_col = slope_factor(rule, m, np.interp(y_col, ys, cpmin_s))
        a_col = k_col * np.interp(y_col, ys, a0_s)
        c_col = np.interp(y_col, ys, chord_s)
        A = np.sin(np.outer(theta, n)) * (4 * span / (a_col * c_col))[:, None] + np.sin(np.outer(theta, n)) * n[None, :] / np.sin(theta)[:, None]
        rhs = np.column_stack([np.deg2rad(np.interp(y_col, ys, twist_s) - np.interp(y_col, ys, al0_s)), np.ones(TERMS)])
        coef = np.linalg.solve(A, rhs)
        th = np.arccos(np.clip(y / semi, -1, 1))
        ccl = 4 * span * np.sin(np.outer(th, n)) @ coef  # per solution, at the grid
        cl_alpha = np.pi * (span * span / area) * coef[0, 1]
        cl_twist = np.pi * (span * span / area) * coef[0, 0]
        additional = ccl[:, 1] / cl_alpha  # per unit CL
        basic = ccl[:, 0] - cl_twist * additional
        k_grid = slope_factor(rule, m, cpmin)
        moment = chord * chord * cm * k_grid
        lever = xr[:, None] - x_ac[None, :]
        unit.append((cl_alpha, -cl_twist / cl_alpha,
                     w @ basic, wy @ basic, (w * lever) @ basic + w @ moment,
                     w @ additional, wy @ additional, (w * lever) @ additional))
    # Structural mass spread with chord, on the reference axis: per unit nz.
    mass_line = mass_kg * chord / trapezoid(chord, y) * G0
    mass_v, mass_m = w @ mass_line, wy @ mass_line
    mass_t = (w * (xr[:, None] - x_axis(y)[None, :])) @ mass_line

    # Every case at once.
    alt = np.array([c["altitude"] for c in cases], dtype=float)
    weight = np.array([c["weight"] for c in cases], dtype=float)
    nz = np.array([c["nz"] for c in cases], dtype=float)
    q = 0.7 * isa_pressure(alt) * mach_all ** 2
    cl = nz * weight / (q * area)
    U = [np.array([u[i] for u in unit]) for i in range(8)]
    cla, a0l = U[0][which], U[1][which]
    shear = q[:, None] * (U[2][which] + cl[:, None] * U[5][which]) - nz[:, None] * mass_v
    bending = q[:, None] * (U[3][which] + cl[:, None] * U[6][which]) - nz[:, None] * mass_m
    torsion = q[:, None] * (U[4][which] + cl[:, None] * U[7][which]) - nz[:, None] * mass_t
    alpha = np.rad2deg(cl / cla + a0l)
    beta = np.sqrt(1 - mach_all ** 2)

    ids = [c["id"] for c in cases]
    out_cases = [
        {"id": i, "mach": m, "altitude": h, "beta": b, "dynamicPressure": qq, "alpha": a, "cl": c, "clAlpha": s,
         "root": {"shear": v, "bending": mo, "torsion": t}}
        for i, m, h, b, qq, a, c, s, v, mo, t in zip(ids, mach_all.tolist(), alt.tolist(), beta.tolist(), q.tolist(), alpha.tolist(),
                                                    cl.tolist(), cla.tolist(), shear[:, 0].tolist(), bending[:, 0].tolist(), torsion[:, 0].tolist())
    ]
    envelope = []
    for name, arr in (("shear", shear), ("bending", bending), ("torsion", torsion)):
        hi, lo = arr.argmax(axis=0), arr.argmin(axis=0)
        envelope.append((name, arr[hi, np.arange(n_out)].tolist(), [ids[i] for i in hi], arr[lo, np.arange(n_out)].tolist(), [ids[i] for i in lo]))
    env_rows = []
    for k, yk in enumerate(y_out.tolist()):
        row = {"y": yk}
        for name, mx, mxc, mn, mnc in envelope:
            row.update({name + "Max": mx[k], name + "MaxCase": mxc[k], name + "Min": mn[k], name + "MinCase": mnc[k]})
        env_rows.append(row)
    result = {"schema": "spanwright.result/1", "wing": {"area": area, "span": span}, "cases": out_cases, "envelope": env_rows}
    # json.dumps, not json.dump: the latter streams through the pure-Python encoder.
    sys.stdout.write(json.dumps(result, separators=(",", ":")) + "\n")


if __name__ == "__main__":
    main()
