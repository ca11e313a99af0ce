#!/usr/bin/env python3
"""trace_peer.py - the peer of the whole-process figure in
benches/bench_trace.c: a straightforward pure-Python tracer (standard
library only) of the same physics on the relay line bench_trace writes
(gaps, thin lenses, flat folding mirrors, a dump), reading the bench file
and writing JSON as `beamledger trace --no-ghosts --format json` does.

The beam is the complex q of Kogelnik & Li 1966 (q -> q + d in a gap,
1/q -> 1/q - 1/f at a thin lens), w^2 = M^2 lambda |q|^2 / (pi Im q); the
peak irradiance 2P/(pi w^2), the linear power density P/(2w); a mirror
keeps its reflectance's share; a focus in a gap is where the waist
(-Re q from the gap's start) falls inside it.  A rating's ratio is the
exposure over its threshold (no scaling: the bench's ratings are at the
source's wavelength, CW).  Only the element types and keys the relay line
uses are read; anything else is refused.

Usage: trace_peer.py FILE > OUT.json"""
import json
import math
import sys

UNITS = {"nm": 1e-9, "um": 1e-6, "mm": 1e-3, "cm": 1e-2, "m": 1.0, "W": 1.0,
         "mW": 1e-3, "kW/cm": 1e5, "W/cm": 1e2, "kW/cm^2": 1e7, "W/cm^2": 1e4,
         "MW/cm^2": 1e10}


def quantity(v):
    if isinstance(v, (int, float)):
        return float(v)
    num, unit = v.split(" ", 1)
    return float(num) * UNITS[unit]


def main():
    bench = json.load(open(sys.argv[1]))
    src = bench["source"]
    lam = quantity(src["wavelength"])
    p = quantity(src["power"])
    w0 = quantity(src["waist"])
    m2 = float(src.get("m2", 1))
    q = complex(-quantity(src.get("waist_position", 0)), math.pi * w0 * w0 / (m2 * lam))
    z = 0.0
    rows, worst, worst_ratio = [], None, -1.0
    for el in bench["path"]:
        t = el["type"]
        w = math.sqrt(m2 * lam * abs(q) ** 2 / (math.pi * q.imag))
        irr = 2 * p / (math.pi * w * w)
        lin = p / (2 * w)
        row = {"id": el["id"], "type": t, "z": z, "power_in": p, "wx": w, "wy": w,
               "irradiance": irr, "linear_density": lin}
        dmg = el.get("damage", {})
        ratio = None
        if "cw_irradiance" in dmg:
            ratio = irr / quantity(dmg["cw_irradiance"])
        if "cw_linear" in dmg:
            r = lin / quantity(dmg["cw_linear"])
            ratio = r if ratio is None else max(ratio, r)
        if t == "space":
            d = quantity(el["length"])
            waist = -q.real
            if 0 < waist < d:
                qf = q + waist
                row["focus"] = {"z": z + waist, "w": math.sqrt(
                    m2 * lam * abs(qf) ** 2 / (math.pi * qf.imag))}
            q += d
            z += d
        elif t == "lens":
            q = 1 / (1 / q - 1 / quantity(el["focal"]))
        elif t == "mirror":
            p *= float(el["reflectance"])
        elif t == "dump":
            p = 0.0
        else:
            sys.exit("trace_peer.py: %s: type %s is not traced here" % (el["id"], t))
        row["ratio"] = ratio
        if ratio is not None:
            row["status"] = "over" if ratio >= 1 else "caution" if ratio >= 0.5 else "ok"
            if ratio > worst_ratio:
                worst, worst_ratio = el["id"], ratio
        rows.append(row)
    json.dump({"bench": bench["name"], "elements": rows, "worst": worst,
               "worst_ratio": worst_ratio}, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
