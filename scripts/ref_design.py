#!/usr/bin/python3
"""Independent reference for the pond design model of internal/design.

Reads a case (JSON: terrain, zones, water level, freeboard, berm) and
evaluates the same model on a fine grid with NumPy, SciPy and Shapely,
written from the model's definition only:

  bowl      E(p) = min_i ( W - d_i + dist(p, Z_i) / s_i )      (round corners)
            dist = max(0, max_k signed distance to edge line k) (sharp corners)
            E = W - d_i inside Z_i, no contribution outside       (s_i = 0)
  rim       R = W + f
  berm      B(p) = R - max(0, dist(p, {E <= R}) - c) / b
  finished  D = E where E <= R, else max(B, min(G, E))
  volumes   cut = iint (G - D)+, fill = iint (D - G)+,
            water = iint_{E <= W} (W - E), water area = |{E <= W}|.

Independent of the Go code in method: containment by Shapely, distances by
vectorised NumPy over all edges, the distance to the rim set {E <= R} as
the distance to the zones' rim polygons (Shapely buffers for round corners,
explicit mitred offsets for sharp ones), cross-checked against
scipy.ndimage.distance_transform_edt of the sampled rim set; integration
of the piecewise-linear interpolant on triangles split along the
(i+1, j)-(i, j+1) diagonal (the Go lattice uses the other one), at cell h
and h/2, with Richardson extrapolation V = V_{h/2} + (V_{h/2} - V_h)/3 and
its size reported as the spread.

Usage:
  ref_design.py CASE.json [--h 0.02] [--levels 2] [--out result.json]
Output: JSON on stdout (and in --out): volumes in m^3, areas in m^2.
"""
import argparse
import json
import math
import sys
import time

import numpy as np
from scipy import ndimage
from shapely.geometry import Polygon
from shapely import vectorized


# --------------------------------------------------------------- terrain
def make_terrain(spec):
    kind = spec["kind"]
    if kind == "plane":
        z0, gx, gy = spec["z0"], spec.get("gx", 0.0), spec.get("gy", 0.0)
        return lambda X, Y: z0 + gx * X + gy * Y
    if kind == "refbench":
        # ../shared/refbench/site.json terrain, in site coordinates minus
        # (ox, oy) given here.
        t = spec
        k1, l1 = 2 * math.pi / t["l1x"], 2 * math.pi / t["l1y"]
        k2, l2 = 2 * math.pi / t["l2x"], 2 * math.pi / t["l2y"]

        def f(X, Y):
            u, v = X - t["u0"], Y - t["v0"]
            z = t["z0"] + t["gx"] * u + t["gy"] * v
            z = z + t["a1"] * np.sin(k1 * u) * np.cos(l1 * v)
            return z + t["a2"] * np.cos(k2 * u + l2 * v)
        return f
    if kind == "gridtin":
        # A regular-grid TIN: nodes (x0 + i hg, y0 + j hg) carrying the
        # refbench terrain, each cell split along its (0,0)-(1,1) diagonal.
        base = make_terrain(dict(spec["surface"]))
        x0, y0, hg, nx, ny = spec["x0"], spec["y0"], spec["hg"], spec["nx"], spec["ny"]
        XS = x0 + np.arange(nx) * hg
        YS = y0 + np.arange(ny) * hg
        Zg = base(*np.meshgrid(XS, YS))

        def f(X, Y):
            fx, fy = (X - x0) / hg, (Y - y0) / hg
            i = np.clip(np.floor(fx).astype(np.int64), 0, nx - 2)
            j = np.clip(np.floor(fy).astype(np.int64), 0, ny - 2)
            u, v = fx - i, fy - j
            z00, z10 = Zg[j, i], Zg[j, i + 1]
            z01, z11 = Zg[j + 1, i], Zg[j + 1, i + 1]
            first = u >= v
            out = np.where(first, z00 + u * (z10 - z00) + v * (z11 - z10),
                           z00 + v * (z01 - z00) + u * (z11 - z01))
            inside = (fx >= 0) & (fy >= 0) & (fx <= nx - 1) & (fy <= ny - 1)
            return np.where(inside, out, np.nan)
        return f
    raise ValueError("unknown terrain kind %r" % kind)


# ----------------------------------------------------------------- zones
def ccw(P):
    P = np.asarray(P, float)
    a = 0.5 * np.sum(P[:, 0] * np.roll(P[:, 1], -1) - np.roll(P[:, 0], -1) * P[:, 1])
    return P if a > 0 else P[::-1].copy()


def seg_dist(P, X, Y):
    """Distance from each (X, Y) to the boundary of polygon P, all edges."""
    d2 = np.full(X.shape, np.inf)
    n = len(P)
    for k in range(n):
        ax, ay = P[k]
        bx, by = P[(k + 1) % n]
        ex, ey = bx - ax, by - ay
        t = np.clip(((X - ax) * ex + (Y - ay) * ey) / (ex * ex + ey * ey), 0.0, 1.0)
        d2 = np.minimum(d2, (X - ax - t * ex) ** 2 + (Y - ay - t * ey) ** 2)
    return np.sqrt(d2)


def normals(P):
    n = len(P)
    out = []
    for k in range(n):
        ax, ay = P[k]
        bx, by = P[(k + 1) % n]
        L = math.hypot(bx - ax, by - ay)
        nx, ny = (by - ay) / L, -(bx - ax) / L
        out.append((nx, ny, nx * ax + ny * ay))
    return out


def mitre_offset(P, r):
    N = normals(P)
    n = len(P)
    out = []
    for k in range(n):
        a, b = N[k - 1], N[k]
        f = r / (1.0 + a[0] * b[0] + a[1] * b[1])
        out.append((P[k][0] + f * (a[0] + b[0]), P[k][1] + f * (a[1] + b[1])))
    return np.array(out)


class Zone:
    def __init__(self, spec, freeboard):
        self.P = ccw(spec["ring"])
        self.d = float(spec["depth"])
        self.s = float(spec.get("wall_slope", 0.0))
        self.sharp = spec.get("corners", "round") == "sharp"
        self.poly = Polygon(self.P)
        self.r = self.s * (self.d + freeboard)
        if self.s > 0 and self.sharp:
            self.rimP = mitre_offset(self.P, self.r)
            self.rim = Polygon(self.rimP)

    def rel(self, X, Y):
        """E_i - W and the distance to this zone's rim region."""
        inside = vectorized.contains(self.poly, X, Y)
        if self.s == 0:
            dist = np.where(inside, 0.0, seg_dist(self.P, X, Y))
            e = np.where(dist == 0, -self.d, np.inf)
            return e, dist
        if self.sharp:
            m = np.zeros(X.shape)
            for nx, ny, c in normals(self.P):
                m = np.maximum(m, nx * X + ny * Y - c)
            e = -self.d + m / self.s
            rin = vectorized.contains(self.rim, X, Y)
            rho = np.where(rin, 0.0, seg_dist(self.rimP, X, Y))
            return e, rho
        dist = np.where(inside, 0.0, seg_dist(self.P, X, Y))
        return -self.d + dist / self.s, np.maximum(0.0, dist - self.r)


# ------------------------------------------------------------ integration
def pos_part(area, f1, f2, f3):
    """iint max(0, f) over triangles with corner values f (vectorised)."""
    F = -np.sort(-np.stack([f1, f2, f3]), axis=0)
    a, b, c = F
    out = np.zeros(a.shape)
    m = c >= 0
    out[m] = area * (a[m] + b[m] + c[m]) / 3
    m1 = (a > 0) & (b <= 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        out[m1] = area * a[m1] ** 3 / (3 * (a[m1] - b[m1]) * (a[m1] - c[m1]))
        m2 = (b > 0) & (c < 0)
        out[m2] = area * ((a[m2] + b[m2] + c[m2]) / 3
                          + (-c[m2]) ** 3 / (3 * (a[m2] - c[m2]) * (b[m2] - c[m2])))
    return out


def pos_area(area, f1, f2, f3):
    F = -np.sort(-np.stack([f1, f2, f3]), axis=0)
    a, b, c = F
    out = np.zeros(a.shape)
    m = (c >= 0) & (a > 0)
    out[m] = area
    m1 = (a > 0) & (b <= 0)
    with np.errstate(divide="ignore", invalid="ignore"):
        out[m1] = area * a[m1] ** 2 / ((a[m1] - b[m1]) * (a[m1] - c[m1]))
        m2 = (b > 0) & (c < 0)
        out[m2] = area * (1 - c[m2] ** 2 / ((a[m2] - c[m2]) * (b[m2] - c[m2])))
    return out


def integrate(F, h, area_too=False):
    """Positive part of the piecewise-linear F (rows = y) over triangles
    (i,j)-(i+1,j)-(i,j+1) and (i+1,j)-(i+1,j+1)-(i,j+1)."""
    f00, f10 = F[:-1, :-1], F[:-1, 1:]
    f01, f11 = F[1:, :-1], F[1:, 1:]
    ok = ~(np.isnan(f00) | np.isnan(f10) | np.isnan(f01) | np.isnan(f11))
    A = h * h / 2
    v = pos_part(A, f00[ok], f10[ok], f01[ok]).sum() + pos_part(A, f10[ok], f11[ok], f01[ok]).sum()
    if not area_too:
        return float(v)
    a = pos_area(A, f00[ok], f10[ok], f01[ok]).sum() + pos_area(A, f10[ok], f11[ok], f01[ok]).sum()
    return float(v), float(a)


def evaluate(case, h, check_edt=False, band=400):
    """Evaluate the model at cell h in bands of rows (a single band when
    the EDT cross-check runs, so its distances see the whole rim set)."""
    W, f = case["water_level"], case["freeboard"]
    c, b = case.get("berm_crest", 0.0), case.get("berm_slope", 3.0)
    zones = [Zone(z, f) for z in case["zones"]]
    G = make_terrain(case["terrain"])
    x0, y0, x1, y1 = case["box"]
    nx = int(math.ceil((x1 - x0) / h)) + 1
    ny = int(math.ceil((y1 - y0) / h)) + 1
    if check_edt:
        band = ny
    xs = x0 + np.arange(nx) * h
    R = W + f
    tot = dict(cut=0.0, fill=0.0, water=0.0, water_area=0.0)
    edt_max = 0.0
    # Bands of rows overlapping by one row, so every cell is in one band.
    for j0 in range(0, ny - 1, band):
        j1 = min(ny, j0 + band + 1)
        X, Y = np.meshgrid(xs, y0 + np.arange(j0, j1) * h)
        e = np.full(X.shape, np.inf)
        rho = np.full(X.shape, np.inf)
        for z in zones:
            ei, ri = z.rel(X, Y)
            e, rho = np.minimum(e, ei), np.minimum(rho, ri)
        g = G(X, Y)
        E = W + e
        Bz = R - np.maximum(0.0, rho - c) / b
        with np.errstate(invalid="ignore"):
            D = np.where(E <= R, E, np.maximum(Bz, np.minimum(g, E)))
        tot["cut"] += integrate(g - D, h)
        tot["fill"] += integrate(D - g, h)
        wv, wa = integrate(np.where(np.isinf(e), -1e6, -e), h, area_too=True)
        tot["water"] += wv
        tot["water_area"] += wa
        if check_edt:
            out = ~(e <= f)
            d = ndimage.distance_transform_edt(out, sampling=h)
            sel = rho < 3.0
            edt_max = max(edt_max, float(np.max(np.abs(d[sel] - rho[sel]))) if sel.any() else 0.0)
    if check_edt:
        tot["edt_vs_analytic_max_m"] = edt_max
    tot["nodes"] = nx * ny
    return tot


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("case")
    ap.add_argument("--h", type=float, default=0.02, help="finest cell, m (default 0.02)")
    ap.add_argument("--levels", type=int, default=2, help="1: only h; 2: 2h and h with Richardson")
    ap.add_argument("--out", help="also write the JSON here")
    a = ap.parse_args()
    with open(a.case) as fh:
        case = json.load(fh)
    t0 = time.perf_counter()
    hs = [a.h] if a.levels == 1 else [2 * a.h, a.h]
    rows = [evaluate(case, h, check_edt=(a.levels > 1 and k == len(hs) - 1)) for k, h in enumerate(hs)]
    secs = time.perf_counter() - t0
    res = {"h": hs, "levels": rows, "seconds": secs}
    fine = rows[-1]
    for key in ("cut", "fill", "water", "water_area"):
        if len(rows) == 2:
            v1, v2 = rows[0][key], rows[1][key]
            res[key] = v2 + (v2 - v1) / 3.0
            res[key + "_spread"] = abs(v2 - v1) / 3.0
        else:
            res[key] = fine[key]
            res[key + "_spread"] = float("nan")
    if "edt_vs_analytic_max_m" in fine:
        res["edt_vs_analytic_max_m"] = fine["edt_vs_analytic_max_m"]
    txt = json.dumps(res, indent=1)
    if a.out:
        with open(a.out, "w") as fh:
            fh.write(txt)
    print(txt)


if __name__ == "__main__":
    main()
