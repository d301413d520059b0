#!/usr/bin/env python3
"""ref_fluids.py SINKRATE - the built sinkrate against python3-fluids (Debian),
a general-purpose fluid-mechanics library: its 1976 standard atmosphere
(ATMOSPHERE_1976, with its temperature offset dT) and its sphere drag
correlations and terminal speeds. Rows go into $SR_VALIDATION_LOG.

fluids' `Clift` method is the Clift, Grace & Weber (1978) Table 5.2 curve that
sinkrate's sphere-cgw follows, but it has no drag crisis above Re = 4e5: it
returns Cd near 0.6 there, where the measured curve is below 0.1. It is compared
only below Re = 4e5; above, the `Morrison` method, which has the crisis, is
compared with sinkrate's sphere-morrison."""
import math
import sys

import fluids
from fluids.atmosphere import ATMOSPHERE_1976
from fluids.core import Reynolds
from fluids.drag import drag_sphere, v_terminal

from reflog import Checks, run_json, table

LIB = "python3-fluids %s (Debian)" % fluids.__version__
SRC_ATM = LIB + ", fluids.atmosphere.ATMOSPHERE_1976"
SRC_OFF = LIB + ", ATMOSPHERE_1976(Z, dT): T + dT at the standard pressure"
G0 = 9.80665  # fluids' g: standard gravity, its v_terminal uses it

ck = Checks(__file__)

# ---- the standard atmosphere ----------------------------------------------
# (column, attribute of ATMOSPHERE_1976, name, tolerance): 10 printed digits
# (5e-10) for T, a, mu, g; p and rho also carry sinkrate's interpolation of
# ln p between 500 m' nodes (bound 5e-9, src/physics/atmos.c).
QTY = [("temperature", "T", "temperature", 1e-9), ("pressure", "P", "pressure", 1e-8),
       ("density", "rho", "density", 1e-8), ("sound_speed", "v_sonic", "speed of sound", 1e-9),
       ("viscosity", "mu", "viscosity", 1e-9), ("gravity", "g", "gravity", 1e-9)]
# At 86 km sinkrate's geopotential is 84852.05 m', 0.05 m' above fluids' last
# layer base: 2 K/km' of lapse over 0.05 m' is 5e-7 of T there.
TOP_TOL = 1e-6

ALT = [-1000, 0, 1500, 5000, 11000, 20000, 32000, 47000, 51000, 71000, 80000, 86000]
doc = run_json("air", "--altitude", ",".join("%g" % z for z in ALT))
for row in table(doc, "atmosphere"):
    z = row["altitude"]
    ref = ATMOSPHERE_1976(z)
    for col, attr, name, tol in QTY:
        ck.rel("reference library", "air: %s at %g m, standard" % (name, z), SRC_ATM, getattr(ref, attr), row[col],
               TOP_TOL if z >= 86000 else tol)

# Every 250 m from -1 km to 85.75 km: one row per quantity with the largest deviation.
doc = run_json("air", "--from", "-1000", "--to", "85750", "--step", "250")
rows = table(doc, "atmosphere")
for col, attr, name, tol in QTY:
    worst, at = 0.0, None
    for row in rows:
        r = getattr(ATMOSPHERE_1976(row["altitude"]), attr)
        d = abs(row[col] - r) / abs(r)
        if d >= worst:
            worst, at = d, row["altitude"]
    ck.abs("reference library", "air: %s, largest relative deviation at %d altitudes -1 .. 85.75 km every 250 m "
           "(at %g m)" % (name, len(rows), at), SRC_ATM, 0.0, worst, tol)

# ---- hot and cold days ---------------------------------------------------
OFFSET_ALT = [0, 3000, 11000, 25000]
for dt in (-25.0, 15.0, 35.0):
    doc = run_json("air", "--altitude", ",".join("%g" % z for z in OFFSET_ALT), "--temp-offset", "%gK" % dt)
    for row in table(doc, "atmosphere"):
        ref = ATMOSPHERE_1976(row["altitude"], dT=dt)
        for col, attr, name, tol in QTY:
            if col in ("pressure", "gravity"):
                continue  # the same as the standard day's
            ck.rel("reference library", "air: %s at %g m, offset %+g K" % (name, row["altitude"], dt), SRC_OFF,
                   getattr(ref, attr), row[col], tol)
    doc = run_json("air", "--from", "-1000", "--to", "85750", "--step", "1000", "--temp-offset", "%gK" % dt)
    rows = table(doc, "atmosphere")
    worst = max(abs(r["density"] - ATMOSPHERE_1976(r["altitude"], dT=dt).rho) / ATMOSPHERE_1976(r["altitude"], dT=dt).rho
                for r in rows)
    ck.abs("reference library", "air: density, offset %+g K, largest relative deviation at %d altitudes -1 .. 85.75 km"
           % (dt, len(rows)), SRC_OFF, 0.0, worst, 1e-8)

# ---- spheres falling freely ----------------------------------------------
# (diameter m, mass kg, altitudes m): from a 0.1 mm droplet to a 10 cm ball.
SPHERES = [(1e-4, 1000 * math.pi / 6 * 1e-12, (0, 8000)),
           (5e-4, 2500 * math.pi / 6 * 1.25e-10, (0, 8000)),
           (2e-3, 2500 * math.pi / 6 * 8e-9, (0, 8000)),
           (1e-2, 7800 * math.pi / 6 * 1e-6, (0, 8000)),
           (5e-2, 0.1, (0, 8000)),
           (0.1, 0.5, (0, 8000))]
SRC_CLIFT = LIB + ", fluids.drag.drag_sphere(Re, Method='Clift') (Clift, Grace & Weber 1978, Table 5.2), Re < 4e5"
SRC_RE = LIB + ", fluids.core.Reynolds with ATMOSPHERE_1976 air"
SRC_VT = (LIB + ", fluids.drag.v_terminal(Method='Clift'), particle density raised by the air's so that its "
          "buoyancy term cancels, g scaled to the 1976 standard's g(z)")


def sphere_rows(d, m, alts, curve, method, src_cd, vt_ok):
    doc = run_json("freefall", "--body", "sphere", "--diameter", "%.17gm" % d, "--mass", "%.17gkg" % m,
                   "--curve", curve, "--altitude", ",".join("%g" % z for z in alts))
    eq = table(doc, "equilibria")
    for z in alts:
        here = [e for e in eq if e["altitude"] == z]
        air = ATMOSPHERE_1976(z)
        for e in here:
            what = "free fall: %g mm sphere of %.3g kg at %g m, equilibrium %d of %d" % (
                d * 1e3, m, z, int(e["number"]), len(here))
            if method == "Clift" and e["reynolds"] >= 4e5:
                continue  # fluids' Clift has no drag crisis there (see the top of this file)
            ck.rel("reference library", what + ": Cd at its Re (" + curve + ")", src_cd,
                   drag_sphere(e["reynolds"], Method=method), e["cd"], 2e-9)
            ck.rel("reference library", what + ": Re at its speed", SRC_RE,
                   Reynolds(V=e["speed"], D=d, rho=air.rho, mu=air.mu), e["reynolds"], 1e-8)
            if vt_ok and len(here) == 1:
                vol = math.pi / 6 * d ** 3
                rhop = air.rho + (air.g / G0) * m / vol
                ck.rel("reference library", what + ": terminal speed", SRC_VT.replace("Clift", method),
                       v_terminal(D=d, rhop=rhop, rho=air.rho, mu=air.mu, Method=method), e["speed"], 1e-8)


for d, m, alts in SPHERES:
    sphere_rows(d, m, alts, "sphere-cgw", "Clift", SRC_CLIFT, True)
SRC_MOR = LIB + ", fluids.drag.drag_sphere(Re, Method='Morrison') (Morrison 2013, with the drag crisis)"
for d, m, alts in [(1e-3, 2500 * math.pi / 6 * 1e-9, (0,)), (5e-2, 0.1, (0, 8000)), (0.2, 0.5, (0,)),
                   (0.2, 2.0, (0,))]:
    sphere_rows(d, m, alts, "sphere-morrison", "Morrison", SRC_MOR, True)

ck.done()
