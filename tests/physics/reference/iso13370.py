"""Independent reference for the ISO 13370 floors beyond the slab on ground.

Reads JSON on standard input: {"cases": [{"kind": ..., ...}]}, every field given (no defaults,
no soil names: lambda and the surface resistances are numbers in each case). Kinds and formulas
(ISO 13370:2017, as the engine quotes them from memory; written here again from the formulas, not
from the engine's code):

  slab       dt = w + lam*(Rsi + Rf + Rse); dt < B: U = 2 lam/(pi B + dt) ln(pi B/dt + 1), else
             U = lam/(0.457 B + dt); B = A/(0.5 P)
  suspended  dg = w + lam*(Rsi + Rg + Rse), Ug = 2 lam/(pi B + dg) ln(pi B/dg + 1),
             Ux = 2 h Uw/B + 1450 eps v fw/B, U = 1/(1/Uf + 1/(Ug + Ux))
  heated     dt as the slab (floor Rsi), dw = lam*(Rsi_w + Rw + Rse); Ubf = the slab's expressions
             with dt + z/2 in place of dt; Ubw = 2 lam/(pi z) (1 + 0.5 d/(d + z)) ln(z/dw + 1),
             d = dt, or dw when dw < dt; H = A Ubf + z P Ubw, U' = H/(A + z P)
  unheated   the heated basement's Ubf and Ubw, then
             U = 1/(1/Uf + A/(A Ubf + z P Ubw + h P Uw + 0.33 n V))
  edge       U0 = the slab; R' = Rn - dn/lam, d' = R' lam; k = 1 (horizontal) or 2 (vertical):
             psi = -(lam/pi) (ln(k D/dt + 1) - ln(k D/(dt + d') + 1)), U = U0 + 2 psi/B

numpy evaluates the logarithms (numpy.log1p of the ratios, another route to ln(x + 1) than the
engine's Math.log(x + 1)). Writes JSON: the figures of each case by name.
"""

import json
import math
import sys

import numpy as np


def ln1(x):
    return float(np.log1p(x))


def slab(c):
    b = c["areaM2"] / (0.5 * c["perimeterM"])
    lam = c["lambda"]
    dt = c["w"] + lam * (c["rsi"] + c["floorR"] + c["rse"])
    if dt < b:
        u = 2 * lam / (math.pi * b + dt) * ln1(math.pi * b / dt)
    else:
        u = lam / (0.457 * b + dt)
    return {"b": b, "dt": dt, "u": u}


def suspended(c):
    b = c["areaM2"] / (0.5 * c["perimeterM"])
    lam = c["lambda"]
    dg = c["w"] + lam * (c["rsi"] + c["rg"] + c["rse"])
    ug = 2 * lam / (math.pi * b + dg) * ln1(math.pi * b / dg)
    ux = 2 * c["h"] * c["uw"] / b + 1450 * c["eps"] * c["v"] * c["fw"] / b
    return {"b": b, "dg": dg, "ug": ug, "ux": ux, "u": 1 / (1 / c["uf"] + 1 / (ug + ux))}


def basement(c):
    b = c["areaM2"] / (0.5 * c["perimeterM"])
    lam, z = c["lambda"], c["z"]
    dt = c["w"] + lam * (c["rsiFloor"] + c["floorR"] + c["rse"])
    dw = lam * (c["rsiWall"] + c["wallR"] + c["rse"])
    e = dt + 0.5 * z
    if e < b:
        ubf = 2 * lam / (math.pi * b + e) * ln1(math.pi * b / e)
    else:
        ubf = lam / (0.457 * b + e)
    d = dw if dw < dt else dt
    ubw = 2 * lam / (math.pi * z) * (1 + 0.5 * d / (d + z)) * ln1(z / dw)
    return {"b": b, "dt": dt, "dw": dw, "ubf": ubf, "ubw": ubw}


def heated(c):
    r = basement(c)
    h = c["areaM2"] * r["ubf"] + c["z"] * c["perimeterM"] * r["ubw"]
    r.update({"h": h, "u": h / (c["areaM2"] + c["z"] * c["perimeterM"])})
    return r


def unheated(c):
    r = basement(c)
    p = c["perimeterM"]
    loss = c["areaM2"] * r["ubf"] + c["z"] * p * r["ubw"] + c["hw"] * p * c["uw"] + 0.33 * c["n"] * c["volume"]
    r.update({"loss": loss, "u": 1 / (1 / c["uf"] + c["areaM2"] / loss)})
    return r


def edge(c):
    s = slab(c)
    lam = c["lambda"]
    d_prime = (c["rn"] - c["dn"] / lam) * lam
    k = 1 if c["orientation"] == "horizontal" else 2
    dt, big_d = s["dt"], c["D"]
    psi = -(lam / math.pi) * (ln1(k * big_d / dt) - ln1(k * big_d / (dt + d_prime)))
    return {"b": s["b"], "dt": dt, "u0": s["u"], "dPrime": d_prime, "psi": psi, "u": s["u"] + 2 * psi / s["b"]}


KINDS = {"slab": slab, "suspended": suspended, "heated": heated, "unheated": unheated, "edge": edge}


def main():
    data = json.load(sys.stdin)
    out = [KINDS[c["kind"]](c) for c in data["cases"]]
    json.dump({"numpy": np.__version__, "results": out}, sys.stdout)


if __name__ == "__main__":
    main()
