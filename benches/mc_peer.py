#!/usr/bin/env python3
"""mc_peer.py - the peer of benches/bench_tolerance.c: a plain-Python
Monte-Carlo (standard library only) of the same simple chain, to show what
the C engine's speed is worth.  A 10 W CW Gaussian beam (1064 nm, 1 mm
waist at the start, M² 1) crosses 500 mm of air, a 250 mm lens and 240 mm
more onto a window rated for 70 kW/cm²; the power (± 5 %), the lens's
focal length (± 1 %) and both gaps (± 2 mm) are normal.  The beam is the
complex q of Kogelnik & Li 1966 (q → q + d in a gap, 1/q → 1/q − 1/f at a
thin lens, w² = −λ/(π Im 1/q)); the irradiance is 2P/(πw²).
Usage: mc_peer.py N SEED; prints 'p_over=P samples=N seconds=S'."""
import math
import random
import sys
import time

LAMBDA = 1064e-9
W0 = 1e-3
RATING = 70e3 * 1e4          # 70 kW/cm² in W/m²


def ratio(power, d1, f, d2):
    zr = math.pi * W0 * W0 / LAMBDA
    q = complex(0.0, zr) + d1
    q = 1.0 / (1.0 / q - 1.0 / f)
    q = q + d2
    w2 = -LAMBDA / (math.pi * (1.0 / q).imag)
    return 2.0 * power / (math.pi * w2) / RATING


def main():
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 10000
    rng = random.Random(int(sys.argv[2]) if len(sys.argv) > 2 else 1)
    t0 = time.perf_counter()
    over = 0
    for _ in range(n):
        r = ratio(rng.gauss(10.0, 0.5), rng.gauss(0.5, 0.002),
                  rng.gauss(0.25, 0.0025), rng.gauss(0.24, 0.002))
        over += r >= 1.0
    dt = time.perf_counter() - t0
    print("p_over=%.6f samples=%d seconds=%.6f nominal=%.6f"
          % (over / n, n, dt, ratio(10.0, 0.5, 0.25, 0.24)))


if __name__ == "__main__":
    main()
