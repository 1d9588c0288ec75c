"""Independent reference for the ISO 13786 dynamic thermal characteristics of plane layers.

Reads JSON on standard input: {"cases": [{"layers": [...], "rsi": .., "rse": .., "periodH": ..}]},
each layer either {"thicknessMm", "lambda", "density", "specificHeat"} or {"resistance"}, listed
from side 1 (inside) to side 2 (outside). Every field is required here (no defaults).

It does not expand the standard's real and imaginary parts. It solves the periodic heat equation
rho*c*dT/dt = lambda*d2T/dx2 for T(x, t) = Re(theta(x)*exp(i*omega*t)) directly: theta'' = k^2*theta
with k = sqrt(i*omega*rho*c/lambda), so across a layer of thickness d, with the flux
q = -lambda*theta' positive towards side 2,

    [theta(d); q(d)] = [[cosh(kd), -sinh(kd)/(lambda*k)], [-lambda*k*sinh(kd), cosh(kd)]] [theta(0); q(0)]

using numpy's complex cosh and sinh and the principal complex square root. A resistance R (a
surface or an air layer) is [[1, -R], [0, 1]]. The element matrix is the product from side 1 to
side 2, numpy.matmul. From it: Y12 = -1/Z12, Y11 = -Z11/Z12, Y22 = -Z22/Z12,
kappa_m = T/(2*pi)*|(Z_mm - 1)/Z12| in J/(m2*K), U = 1/(sum of resistances).

Writes JSON: for each case the four entries of Z, Y11, Y22, Y12 (as [re, im]), kappa1, kappa2
(kJ/(m2*K)), U, and each layer's delta = sqrt(2/(omega*rho*c/lambda)) and xi = d/delta.
"""

import json
import math
import sys

import numpy as np


def layer(l, omega):
    if "resistance" in l:
        r = l["resistance"]
        return np.array([[1, -r], [0, 1]], dtype=complex), r, None, 0.0
    d = l["thicknessMm"] / 1000.0
    lam, rho, c = l["lambda"], l["density"], l["specificHeat"]
    k = np.sqrt(1j * omega * rho * c / lam)
    m = np.array(
        [[np.cosh(k * d), -np.sinh(k * d) / (lam * k)], [-lam * k * np.sinh(k * d), np.cosh(k * d)]],
        dtype=complex,
    )
    delta = math.sqrt(2.0 * lam / (omega * rho * c))
    return m, d / lam, delta, d / delta


def pair(z):
    return [float(np.real(z)), float(np.imag(z))]


def solve(case):
    period = case["periodH"] * 3600.0
    omega = 2.0 * math.pi / period
    z = np.array([[1, -case["rsi"]], [0, 1]], dtype=complex)
    r_total = case["rsi"] + case["rse"]
    layers = []
    for l in case["layers"]:
        m, r, delta, xi = layer(l, omega)
        z = np.matmul(m, z)
        r_total += r
        layers.append({"delta": delta, "xi": xi})
    z = np.matmul(np.array([[1, -case["rse"]], [0, 1]], dtype=complex), z)
    z11, z12, z21, z22 = z[0, 0], z[0, 1], z[1, 0], z[1, 1]
    return {
        "z": [pair(z11), pair(z12), pair(z21), pair(z22)],
        "y12": pair(-1.0 / z12),
        "y11": pair(-z11 / z12),
        "y22": pair(-z22 / z12),
        "kappa1": period / (2 * math.pi) * abs((z11 - 1) / z12) / 1000.0,
        "kappa2": period / (2 * math.pi) * abs((z22 - 1) / z12) / 1000.0,
        "u": 1.0 / r_total,
        "layers": layers,
    }


def main():
    data = json.load(sys.stdin)
    json.dump({"numpy": np.__version__, "results": [solve(c) for c in data["cases"]]}, sys.stdout)


if __name__ == "__main__":
    main()
