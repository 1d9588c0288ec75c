"""Independent reference for the two-dimensional junction solve: vertex-centred finite volumes.

Reads a junction model as JSON on standard input (the same shape as the engine's input: regions
of material as rectangles in mm, later ones overriding earlier ones, boundary segments facing
environments with a temperature and a surface resistance; every other edge adiabatic) plus
"spacings", a list of grid spacings in mm that divide every coordinate. For each spacing it solves
the steady-state heat equation on a uniform square grid with the temperatures at the grid points:
each point's control volume is the dual cell around it, the conductance between neighbouring points
is the sum over the (up to two) cells beside their joining edge of lambda_cell * (d/2) / d, and a
surface resistance Rs couples a point to its environment through the half edges beside it,
h * (d/2), h = 1/Rs (Rs = 0 fixes the point's temperature). This is the classic five-point scheme,
not the engine's bilinear finite elements, and shares no code with it.

The system is solved by conjugate gradients with a diagonal preconditioner, written with numpy
only (no scipy), started from the previous spacing's field.

Writes JSON: for each spacing, the heat flow from each environment (W/m), L2D (the flow between
the warmest and the coldest environment over their difference), and the temperature at the
requested "points" (which must be grid points).
"""

import json
import sys

import numpy as np


def key(v, d):
    k = round(v / d)
    if abs(k * d - v) > 1e-9:
        raise SystemExit(f"coordinate {v} is not a multiple of the spacing {d}")
    return k


def build(model, d):
    xs = [c for r in model["regions"] for c in (r["x0"], r["x1"])]
    ys = [c for r in model["regions"] for c in (r["y0"], r["y1"])]
    x0, y0 = min(xs), min(ys)
    nx, ny = key(max(xs) - x0, d), key(max(ys) - y0, d)
    lam = np.zeros((ny, nx))  # cell conductivity, row j = y, column i = x
    for r in model["regions"]:
        i0, i1 = key(r["x0"] - x0, d), key(r["x1"] - x0, d)
        j0, j1 = key(r["y0"] - y0, d), key(r["y1"] - y0, d)
        lam[j0:j1, i0:i1] = r["lambda"]
    pad = np.zeros((ny + 2, nx + 2))
    pad[1:-1, 1:-1] = lam
    # conductance of the edge from point (j, i) to (j, i+1): cells (j-1, i) and (j, i)
    gx = 0.5 * (pad[0:-1, 1:-1] + pad[1:, 1:-1])  # shape (ny+1, nx)
    # conductance of the edge from point (j, i) to (j+1, i): cells (j, i-1) and (j, i)
    gy = 0.5 * (pad[1:-1, 0:-1] + pad[1:-1, 1:])  # shape (ny, nx+1)
    envs = model["environments"]
    names = list(envs)
    h = np.zeros((len(names), ny + 1, nx + 1))  # conductance of each point to each environment, W/(m K)
    fixed = np.full((ny + 1, nx + 1), -1)
    for b in model["boundaries"]:
        e = names.index(b["environment"])
        (ax, ay), (bx, by) = b["from"], b["to"]
        i0, i1 = sorted((key(ax - x0, d), key(bx - x0, d)))
        j0, j1 = sorted((key(ay - y0, d), key(by - y0, d)))
        rs = envs[b["environment"]]["rs"]
        if rs == 0:
            sel = fixed[j0 : j1 + 1, i0 : i1 + 1]
            sel[sel < 0] = e
            continue
        half = 0.5 * d / 1000.0 / rs
        if j0 == j1:
            h[e, j0, i0:i1] += half
            h[e, j0, i0 + 1 : i1 + 1] += half
        else:
            h[e, j0:j1, i0] += half
            h[e, j0 + 1 : j1 + 1, i0] += half
    active = np.zeros((ny + 1, nx + 1), bool)
    active[:-1, :-1] |= lam > 0
    active[1:, :-1] |= lam > 0
    active[:-1, 1:] |= lam > 0
    active[1:, 1:] |= lam > 0
    temps = np.array([envs[n]["temperature"] for n in names])
    return dict(x0=x0, y0=y0, nx=nx, ny=ny, gx=gx, gy=gy, h=h, fixed=fixed, active=active, names=names, temps=temps)


def operator(g):
    gx, gy = g["gx"], g["gy"]
    hsum = g["h"].sum(axis=0)
    diag = hsum.copy()
    diag[:, :-1] += gx
    diag[:, 1:] += gx
    diag[:-1, :] += gy
    diag[1:, :] += gy

    def apply(t):
        out = diag * t
        out[:, :-1] -= gx * t[:, 1:]
        out[:, 1:] -= gx * t[:, :-1]
        out[:-1, :] -= gy * t[1:, :]
        out[1:, :] -= gy * t[:-1, :]
        return out

    return apply, diag


def solve(g, guess):
    apply, diag = operator(g)
    free = g["active"] & (g["fixed"] < 0)
    tfix = np.where(g["fixed"] >= 0, g["temps"][np.maximum(g["fixed"], 0)], 0.0)
    tfix[~g["active"]] = 0.0
    rhs = np.tensordot(g["temps"], g["h"], axes=1) - apply(tfix)
    rhs[~free] = 0.0
    inv = np.where(free, 1.0 / np.where(diag > 0, diag, 1.0), 0.0)

    def a(t):
        out = apply(np.where(free, t, 0.0))
        out[~free] = 0.0
        return out

    x = np.where(free, guess, 0.0)
    r = rhs - a(x)
    z = inv * r
    p = z.copy()
    rz = float(np.sum(r * z))
    bnorm = float(np.sqrt(np.sum(rhs * rhs)))
    for it in range(200000):
        if np.sqrt(np.sum(r * r)) <= 1e-11 * bnorm:
            break
        q = a(p)
        alpha = rz / float(np.sum(p * q))
        x += alpha * p
        r -= alpha * q
        z = inv * r
        rz_new = float(np.sum(r * z))
        p = z + (rz_new / rz) * p
        rz = rz_new
    return np.where(free, x, tfix), it


def flows(g, t):
    apply, _ = operator(g)
    out = {}
    residual = apply(t) - np.tensordot(g["temps"], g["h"], axes=1)
    for e, name in enumerate(g["names"]):
        q = float(np.sum(g["h"][e] * (g["temps"][e] - t)))
        q += float(np.sum(residual[(g["fixed"] == e) & g["active"]]))
        out[name] = q
    return out


def main():
    model = json.load(sys.stdin)
    results = []
    guess = None
    for d in model["spacings"]:
        g = build(model, d)
        if guess is None:
            start = np.full((g["ny"] + 1, g["nx"] + 1), float(np.mean(g["temps"])))
        else:  # the previous (twice as coarse) field, each value repeated over its finer points
            start = np.kron(guess, np.ones((2, 2)))[: g["ny"] + 1, : g["nx"] + 1]
        t, iterations = solve(g, start)
        guess = t
        q = flows(g, t)
        used = sorted({b["environment"] for b in model["boundaries"]}, key=lambda n: model["environments"][n]["temperature"])
        warm, cold = used[-1], used[0]
        dt = model["environments"][warm]["temperature"] - model["environments"][cold]["temperature"]
        l2d = (q[warm] - q[cold]) / 2.0 / dt
        points = [float(t[key(y - g["y0"], d), key(x - g["x0"], d)]) for x, y in model.get("points", [])]
        results.append(dict(spacing=d, heatFlows=q, couplingCoefficient=l2d, points=points, iterations=iterations))
    json.dump(dict(numpy=np.__version__, results=results), sys.stdout)


if __name__ == "__main__":
    main()
