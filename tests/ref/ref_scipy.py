#!/usr/bin/env python3
"""ref_scipy.py SINKRATE - the built sinkrate against scipy (Debian
python3-scipy) with python3-fluids' 1976 atmosphere: descent times and drifts
as scipy.integrate.quad of the steady descent over the printed wind laws, a
free fall as scipy.integrate.solve_ivp with fluids' sphere drag, the site
model's pressure by quadrature of the hydrostatic equation, and the landing
statistics of `sinkrate dispersion --samples` by numpy and scipy.stats.
Rows go into $SR_VALIDATION_LOG."""
import atexit
import math
import os
import shutil
import tempfile

import numpy as np
import scipy
from fluids.atmosphere import ATMOSPHERE_1976
from fluids.drag import drag_sphere
from scipy import integrate, optimize, stats

import fluids
from reflog import Checks, read_csv, run, run_json, table, value

ck = Checks(__file__)
ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
FL = "python3-fluids %s ATMOSPHERE_1976" % fluids.__version__
SCIPY = "scipy %s (Debian python3-scipy)" % scipy.__version__
NUMPY = "numpy %s (Debian python3-numpy)" % np.__version__
R_STAR, M0 = 8.31432, 28.9644e-3  # the 1976 standard's gas constant and molar mass
CONICAL = (0.75, 0.825, 0.9)  # the conical family's CD0 band as sinkrate canopies conical prints it
QUAD = dict(epsabs=0.0, epsrel=1e-13, limit=400)


def steady_rate(m, cds, air):
    """Knacke 1991 sec. 4.5: drag equals weight."""
    return math.sqrt(2.0 * m * air.g / (air.rho * cds))


# ---- descent rate and time to the ground over altitude (sinkrate sweep) ----
SRC_T = "%s: integral of dz/v(z), v = sqrt(2 m g/(rho CdS)) (Knacke 1991 sec. 4.5), %s air" % (SCIPY, FL)
SRC_V = "v = sqrt(2 m g/(rho CdS)) (Knacke 1991 sec. 4.5) with %s air and gravity" % FL
for dt in (0.0, -20.0, 25.0):
    mass, d0 = 5.0, 2.0
    doc = run_json("sweep", "--values", "1000m,4000m,12000m", "--mass", "%gkg" % mass, "--family", "conical",
                   "--nominal-diameter", "%gm" % d0, "--temp-offset", "%gK" % dt)
    s0 = math.pi * d0 * d0 / 4
    for row in table(doc, "sweep") if "sweep" in doc["tables"] else table(doc, list(doc["tables"])[0]):
        z = row["altitude"]
        day = "standard day" if dt == 0 else "offset %+g K" % dt
        air = ATMOSPHERE_1976(z, dT=dt)
        ck.rel("reference library", "descent rate: 5 kg under a 2 m conical, typical CD0, at %g m, %s" % (z, day),
               SRC_V, steady_rate(mass, CONICAL[1] * s0, air), row["rate_typical"], 1e-8)
        for end, cd0 in zip(("low", "typical", "high"), CONICAL):
            # the low drag end is the short time
            key = {"low": "time_low", "typical": "time_typical", "high": "time_high"}[end]
            t, _ = integrate.quad(lambda h: 1.0 / steady_rate(mass, cd0 * s0, ATMOSPHERE_1976(h, dT=dt)), 0.0, z,
                                  **QUAD)
            ck.rel("reference library", "descent time: from %g m to sea level, CD0 %g, %s" % (z, cd0, day), SRC_T, t,
                   row[key], 1e-8)

# ---- drift in the wind (sinkrate profile) ----------------------------------
# Below the steady point sinkrate's drift is the quadrature of docs/method.md
# 7.2: integral w/v dh plus the shear lag integral (v/g) dw, our derivation.
# Above it (the opening transient, a few seconds) the body moves with the wind
# it passes: t_s times the wind there, within half the wind's change over it.
SRC_DQ = ("%s quad of docs/method.md 7.2: integral w/v dh + integral (v/g) dw (the shear lag, our derivation), "
          "%s air") % (SCIPY, FL)
SRC_DODE = ("%s solve_ivp (DOP853) of m dv/dt = -rho CdS |v - w| (v - w)/2 - m g from the steady point, "
            "%s air; 0.5%% is the quasi-steady model's stated bound (docs/method.md 7.7)") % (SCIPY, FL)


def wind_power(speed, frm, href, alpha):
    def w(h):
        s = speed * (h / href) ** alpha if h > 0 else 0.0
        return -s * math.sin(math.radians(frm)), -s * math.cos(math.radians(frm))

    def dw(h):  # dw/dh
        s = speed * alpha / href * (h / href) ** (alpha - 1) if h > 0 else 0.0
        return -s * math.sin(math.radians(frm)), -s * math.cos(math.radians(frm))
    return w, dw, []


def wind_log(speed, frm, href, z0):
    def w(h):
        s = speed * math.log(h / z0) / math.log(href / z0) if h > z0 else 0.0
        return -s * math.sin(math.radians(frm)), -s * math.cos(math.radians(frm))

    def dw(h):
        s = speed / (h * math.log(href / z0)) if h > z0 else 0.0
        return -s * math.sin(math.radians(frm)), -s * math.cos(math.radians(frm))
    return w, dw, [z0]


def wind_table(rows):
    hs = [r[0] for r in rows]
    es = [-r[1] * math.sin(math.radians(r[2])) for r in rows]
    ns = [-r[1] * math.cos(math.radians(r[2])) for r in rows]

    def w(h):
        return float(np.interp(h, hs, es)), float(np.interp(h, hs, ns))

    def dw(h):
        i = max(0, min(len(hs) - 2, int(np.searchsorted(hs, h, side="right")) - 1))
        if h < hs[0] or h > hs[-1]:
            return 0.0, 0.0
        return (es[i + 1] - es[i]) / (hs[i + 1] - hs[i]), (ns[i + 1] - ns[i]) / (hs[i + 1] - hs[i])
    return w, dw, hs


MISSIONS = [
    ("power law 1/7 from 270 deg", 0.0, "model: power-law\n    speed: 5 m/s\n    from: 270 deg\n"
     "    reference-height: 10 m\n    exponent: 0.143", wind_power(5.0, 270.0, 10.0, 0.143), 4.0, 2.0),
    ("power law 0.2 from 200 deg, site at 800 m", 800.0, "model: power-law\n    speed: 6 m/s\n    from: 200 deg\n"
     "    reference-height: 10 m\n    exponent: 0.2", wind_power(6.0, 200.0, 10.0, 0.2), 3.0, 1.8),
    ("log law z0 0.03 m from 315 deg", 0.0, "model: log-law\n    speed: 7 m/s\n    from: 315 deg\n"
     "    reference-height: 10 m\n    roughness-length: 0.03 m", wind_log(7.0, 315.0, 10.0, 0.03), 6.0, 2.6),
    ("wind table, veering", 300.0, "model: table\n    rows:\n"
     "      - {height: 0 m, speed: 2 m/s, from: 180 deg}\n"
     "      - {height: 300 m, speed: 8 m/s, from: 230 deg}\n"
     "      - {height: 800 m, speed: 12 m/s, from: 280 deg}\n"
     "      - {height: 1300 m, speed: 9 m/s, from: 300 deg}\n"
     "      - {height: 1700 m, speed: 9 m/s, from: 300 deg}",
     wind_table([(0, 2, 180), (300, 8, 230), (800, 12, 280), (1300, 9, 300), (1700, 9, 300)]), 2.5, 1.5),
]
tmp = tempfile.mkdtemp(prefix="sinkrate-ref-")
atexit.register(shutil.rmtree, tmp, True)
for what, elev, wind, (w, dw, kinks), mass, d0 in MISSIONS:
    path = os.path.join(tmp, "drift.yaml")
    with open(path, "w", encoding="utf-8") as f:
        f.write("mission: \"reference check: %s\"\nsite:\n  elevation: %g m\n  wind:\n    %s\nsections:\n"
                "  - name: payload\n    mass: %g kg\nstages:\n  - name: main\n    family: conical\n"
                "    nominal-diameter: %g m\n    deploy: apogee\nstart:\n  height: 1500 m\n  speed: 5 m/s\n"
                "  path-angle: 90 deg\n" % (what, elev, wind, mass, d0))
    doc = run_json("profile", path)
    ev = {r["event"]: r for r in table(doc, "timeline")}
    t_s, h_s, t_land = ev["steady descent"]["time"], ev["steady descent"]["height"], ev["touchdown"]["time"]
    down = table(doc, "touchdown")[0]
    cds = CONICAL[1] * math.pi * d0 * d0 / 4

    def air(h):
        return ATMOSPHERE_1976(elev + h)

    def v(h):
        return steady_rate(mass, cds, air(h))
    pts = [k for k in kinks if 0.0 < k < h_s] or None
    t_q, _ = integrate.quad(lambda h: 1.0 / v(h), 0.0, h_s, **QUAD)
    ck.rel("reference library", "descent time: %s, from the steady point at %.1f m to the ground" % (what, h_s),
           SRC_T, t_q, t_land - t_s, 1e-7)

    # the equations of motion from the steady point, in equilibrium with the air there
    def rhs(t, y):
        a = air(y[2])
        we, wn = w(y[2])
        ae, an, az = y[3] - we, y[4] - wn, y[5]
        k = 0.5 * a.rho * cds * math.sqrt(ae * ae + an * an + az * az) / mass
        return [y[3], y[4], y[5], -k * ae, -k * an, -k * az - a.g]

    def ground(t, y):
        return y[2]
    ground.terminal, ground.direction = True, -1
    we0, wn0 = w(h_s)
    dwe, dwn = dw(h_s)
    lag = v(h_s) ** 2 / air(h_s).g
    sol = integrate.solve_ivp(rhs, (0.0, 1e5), [0.0, 0.0, h_s, we0 - lag * dwe, wn0 - lag * dwn, -v(h_s)],
                              method="DOP853", rtol=1e-10, atol=1e-8, events=ground)
    for k, comp in ((0, "east"), (1, "north")):
        below, _ = integrate.quad(lambda h: w(h)[k] / v(h) + v(h) / air(h).g * dw(h)[k], 0.0, h_s, points=pts,
                                  **QUAD)
        w_top, w_low = w(1500.0)[k], w(h_s)[k]
        above = t_s * 0.5 * (w_top + w_low)
        band = t_s * 0.5 * abs(w_top - w_low)
        ck.abs("our derivation", "drift: %s, %s (m; tolerance: the wind change over the %.1f s transient)" % (
            what, comp, t_s), SRC_DQ, below + above, down[comp], band + 1e-7 * abs(below) + 1e-9)
        ode = sol.y_events[0][0][k]
        ck.abs("reference library", "drift: %s, %s, against the equations of motion (m)" % (what, comp), SRC_DODE,
               ode + above, down[comp], band + 5e-3 * abs(ode) + 1e-9)

# ---- the site model's pressure aloft --------------------------------------
SRC_SITE = ("%s: p = ps exp(-integral of g M0/(R* T) dz) with T = T_1976 + (Ts - T_1976(zs)) "
            "(docs/method.md sec. 1, site model), %s temperatures and gravity") % (SCIPY, FL)
for zs, ts, ps in ((1400.0, 311.15, 85200.0), (0.0, 268.15, 103000.0)):
    alts = [zs - 300, zs, zs + 700, zs + 3000, 9000.0, 20000.0]
    doc = run_json("air", "--site-elevation", "%gm" % zs, "--surface-temp", "%gK" % ts, "--surface-pressure",
                   "%gPa" % ps, "--altitude", ",".join("%g" % z for z in alts))
    dT = ts - ATMOSPHERE_1976(zs).T
    for row in table(doc, "atmosphere"):
        z = row["altitude"]

        def integrand(x):
            a = ATMOSPHERE_1976(x)
            return a.g * M0 / (R_STAR * (a.T + dT))
        # the 1976 temperature has kinks at the layer bases: split there
        pts = [b for b in (11019.1, 20063.1, 32161.9) if min(zs, z) < b < max(zs, z)]
        integral, _ = integrate.quad(integrand, zs, z, points=pts or None, **QUAD)
        p = ps * math.exp(-integral)
        T = ATMOSPHERE_1976(z).T + dT
        what = "air: site model %g m, %g K, %g Pa: %%s at %g m" % (zs, ts, ps, z)
        ck.rel("our derivation", what % "pressure", SRC_SITE, p, row["pressure"], 1e-8)
        ck.rel("our derivation", what % "density", SRC_SITE, p * M0 / (R_STAR * T), row["density"], 1e-8)

# ---- a free fall with Reynolds-dependent drag (failure case no-canopy) -----
SRC_FF = ("%s solve_ivp (DOP853) of dv/dt = g - rho v^2 Cd(Re) A/(2 m) with python3-fluids' "
          "drag_sphere(Method='Clift') (Re < 4e5 here) and %s air") % (SCIPY, FL)
for d, mass, h0 in ((0.05, 0.1, 1500.0), (0.02, 0.03, 3000.0), (0.1, 0.1, 800.0)):
    path = os.path.join(tmp, "fall.yaml")
    with open(path, "w", encoding="utf-8") as f:
        f.write("mission: \"reference check: a sphere without canopy\"\nsite:\n  elevation: 0 m\nsections:\n"
                "  - name: ball\n    mass: %g kg\n    body: {shape: sphere, diameter: %g m}\nstages:\n"
                "  - name: main\n    family: conical\n    nominal-diameter: 1 m\n    deploy: apogee\nstart:\n"
                "  height: %g m\n  speed: 1 m/s\n  path-angle: 90 deg\nfailure-cases:\n  - no-canopy\n"
                % (mass, d, h0))
    row = table(run_json("profile", path), "failure_cases")[0]
    area = math.pi * d * d / 4

    def rhs(t, y):
        a = ATMOSPHERE_1976(y[0])
        re = a.rho * y[1] * d / a.mu
        return [-y[1], a.g - 0.5 * a.rho * y[1] * y[1] * drag_sphere(re, Method="Clift") * area / mass]

    def ground(t, y):
        return y[0]
    ground.terminal, ground.direction = True, -1
    sol = integrate.solve_ivp(rhs, (0.0, 1e4), [h0, 1.0], method="DOP853", rtol=1e-12, atol=1e-10,
                              events=ground)
    t_hit, v_hit = sol.t_events[0][0], sol.y_events[0][0][1]
    what = "free fall: %g mm sphere of %g kg from %g m, no canopy" % (d * 1e3, mass, h0)
    ck.rel("reference library", what + ": time to the ground", SRC_FF, t_hit, row["time_to_ground"], 1e-7)
    ck.rel("reference library", what + ": impact speed", SRC_FF, v_hit, row["impact_speed_broadside"], 1e-7)

# ---- the flight-log fit (sinkrate fit) against scipy.optimize.least_squares ----
# A synthetic one-stage log written here (steady descent, seeded Gaussian noise)
# is fitted by sinkrate; scipy fits the same model, z(t) from dz/dt =
# -sqrt(2 m g/(rho CdS)) in fluids' air, to the same points (the window the fit
# reports), by Levenberg-Marquardt. The interval is our rule (docs/method.md
# 12.4: AR(1)-inflated, Student t), evaluated again here from scipy's Jacobian.
SRC_LS = ("%s optimize.least_squares (lm) of the steady descent z(t), dz/dt = -sqrt(2 m g/(rho CdS)) "
          "(Knacke 1991 sec. 4.5), %s air, on the points of the fit's window") % (SCIPY, FL)
SRC_CI = ("docs/method.md 12.4 (our interval: se from (J'J)^-1 s^2 times (1 + r1)/(1 - r1), Student t with "
          "n (1 - r1)/(1 + r1) - 2 dof), evaluated with scipy's Jacobian and stats.t")
for what, args, site, dt, mass, cds_true, z_top, noise, seed in (
        ("sea level, standard day", [], 0.0, 0.0, 4.0, 2.0, 800.0, 0.5, 7),
        ("offset +20 K", ["--temp-offset", "20K"], 0.0, 20.0, 2.5, 0.9, 1200.0, 0.8, 11),
        ("site at 1500 m", ["--site-elevation", "1500m"], 1500.0, 0.0, 6.0, 4.5, 600.0, 0.3, 13)):
    def k_of(z):
        a = ATMOSPHERE_1976(site + z, dT=dt)
        return math.sqrt(2.0 * a.g / a.rho)
    # z as a function of F = integral dz/k, from below the ground to above the top
    zf = integrate.solve_ivp(lambda F, y: [k_of(y[0])], (0.0, 400.0), [-60.0], method="DOP853", rtol=1e-12,
                             atol=1e-12, dense_output=True)

    def z_of_F(F):
        return zf.sol(F)[0]

    def F_of_z(z):
        from scipy.optimize import brentq
        return brentq(lambda F: z_of_F(F) - z, 0.0, zf.t[-1], xtol=1e-14, rtol=1e-15)
    t_land = (F_of_z(z_top) - F_of_z(0.0)) / math.sqrt(mass / cds_true)
    rng = np.random.default_rng(seed)
    path = os.path.join(tmp, "fit.csv")
    with open(path, "w", encoding="utf-8") as f:
        f.write("time [s],height [m]\n")
        ts = np.arange(int((t_land + 5.0) * 10)) / 10.0
        zs = np.where(ts < t_land, z_of_F(F_of_z(z_top) - math.sqrt(mass / cds_true) * ts), 0.0)
        for ti, zi in zip(ts, zs + rng.normal(0.0, noise, len(ts))):
            f.write("%.2f,%.4f\n" % (ti, zi))
    doc = run_json("fit", path, "--mass", "%gkg" % mass, "--deploy-times", "apogee", *args)
    win = table(doc, "windows")[0]
    fit = table(doc, "drag")[0]
    head, rows = read_csv(path)
    pts = [(float(r[0]), float(r[1])) for r in rows if win["from"] - 1e-9 <= float(r[0]) <= win["to"] + 1e-9]
    t = np.array([p[0] for p in pts])
    z = np.array([p[1] for p in pts])
    t0 = t[0]

    def resid(x):
        return z_of_F(F_of_z(x[0]) - math.sqrt(mass / math.exp(x[1])) * (t - t0)) - z
    ls = optimize.least_squares(resid, [z[0], math.log(cds_true * 1.1)], method="lm", xtol=1e-15, ftol=1e-15,
                                gtol=1e-15, x_scale=[100.0, 1.0])
    label = "fit: one-stage synthetic log, %s, %g kg, %d points" % (what, mass, len(t))
    ck.abs("consistency", label + ": points in the window", "the fit's window (from, to) applied to the log",
           len(t), win["points"], 0)
    cds = math.exp(ls.x[1])
    ck.rel("reference library", label + ": drag area (m2)", SRC_LS, cds, fit["drag_area_total"], 1e-8)
    r = ls.fun
    n = len(r)
    r1 = max(0.0, float(np.sum(r[1:] * r[:-1]) / np.sum(r * r)))
    s2 = float(np.sum(r * r)) / (n - 2)
    cov = np.linalg.inv(ls.jac.T @ ls.jac) * s2 * (1 + r1) / (1 - r1)
    dof = n * (1 - r1) / (1 + r1) - 2
    half = stats.t.ppf(0.975, dof) * math.sqrt(cov[1][1])
    ck.rel("our derivation", label + ": 95 % interval, low end (m2)", SRC_CI, cds * math.exp(-half),
           fit["drag_area_low"], 1e-8)
    ck.rel("our derivation", label + ": 95 % interval, high end (m2)", SRC_CI, cds * math.exp(half),
           fit["drag_area_high"], 1e-8)

# ---- landing statistics from the samples file (sinkrate dispersion) ---------
SRC_COV = "%s: mean and covariance (ddof 1) of the --samples file, numpy.linalg.eigh for the axes" % NUMPY
SRC_Q = "%s: numpy.quantile (linear, the interpolation of docs/method.md 10.4) of the --samples file" % NUMPY
SRC_CHI = "%s: scipy.stats.chi2 with 2 degrees of freedom (the k-sigma ellipse of a 2-D normal)" % SCIPY
PCT = [("lowest", 0.0), ("1 %", 0.01), ("5 %", 0.05), ("50 % (median)", 0.5), ("95 %", 0.95), ("99 %", 0.99),
       ("highest", 1.0)]
for mission, n, seed in (("desert-club-rocket", 4000, 3), ("balloon-instrument", 3000, 5),
                         ("drone-cargo-drop", 5000, 8)):
    samples = os.path.join(tmp, "samples.csv")
    doc = run_json("dispersion", os.path.join(ROOT, "payloads", mission + ".yaml"), "-n", str(n), "--seed", str(seed),
                   "--samples", samples, ok=(0, 1))
    head, rows = read_csv(samples)
    col = {h.split(" [")[0]: i for i, h in enumerate(head)}
    east = np.array([float(r[col["east"]]) for r in rows])
    north = np.array([float(r[col["north"]]) for r in rows])
    what = "dispersion: %s, %d samples, seed %d: %%s" % (mission, n, seed)
    me, mn = east.mean(), north.mean()
    ck.rel("reference library", what % "mean landing point, east (m)", SRC_COV, me, value(doc, "mean_east"), 1e-9)
    ck.rel("reference library", what % "mean landing point, north (m)", SRC_COV, mn, value(doc, "mean_north"), 1e-9)
    cov = np.cov(np.vstack([east, north]), ddof=1)
    lam, vec = np.linalg.eigh(cov)  # ascending
    major, minor = math.sqrt(lam[1]), math.sqrt(lam[0])
    brg = math.degrees(math.atan2(vec[0][1], vec[1][1])) % 180.0
    ck.rel("reference library", what % "1-sigma semi-major axis (m)", SRC_COV, major, value(doc, "sigma1_major"), 1e-8)
    # a scatter along a line has a minor axis of rounding noise: absolute, against the major axis
    ck.abs("reference library", what % "1-sigma semi-minor axis (m; within 1e-6 of the major)", SRC_COV, minor,
           value(doc, "sigma1_minor"), 1e-6 * major)
    ck.abs("reference library", what % "major-axis bearing (deg)", SRC_COV, brg, value(doc, "ellipse_bearing"), 1e-6)
    # the k-sigma ellipse: chi-square with 2 degrees of freedom
    p1, p3 = stats.chi2.cdf(1.0, 2), stats.chi2.cdf(9.0, 2)
    k3 = math.sqrt(stats.chi2.ppf(p3, 2))
    ck.rel("reference library", what % "3-sigma semi-major axis: sqrt(chi2.ppf(P3, 2)) x the 1-sigma one (m)", SRC_CHI,
           k3 * major, value(doc, "sigma3_major"), 1e-8)
    ck.abs("reference library", what % "3-sigma semi-minor axis (m; within 1e-6 of the major)", SRC_CHI, k3 * minor,
           value(doc, "sigma3_minor"), 3e-6 * major)
    notes = " ".join(doc["notes"])
    if mission == "desert-club-rocket":  # the notes are the same for every mission: check them once
        import re
        m = re.search(r"puts ([0-9.]+) % of the landings inside the 1-sigma ellipse and ([0-9.]+) % inside the "
                      r"3-sigma", notes)
        ck.abs("reference library", "dispersion: share of a 2-D normal inside the 1-sigma ellipse, as the output "
               "says (%)", SRC_CHI, 100 * p1, float(m.group(1)), 0.05)
        ck.abs("reference library", "dispersion: share of a 2-D normal inside the 3-sigma ellipse, as the output "
               "says (%)", SRC_CHI, 100 * p3, float(m.group(2)), 0.05)
    dist_mean = np.hypot(east - me, north - mn)
    dist_launch = np.hypot(east, north)
    for key, x, p in (("r50_mean", dist_mean, 0.5), ("r95_mean", dist_mean, 0.95), ("r50_launch", dist_launch, 0.5),
                      ("r95_launch", dist_launch, 0.95)):
        ck.rel("reference library", what % ("%d %% radius around the %s (m)" % (round(100 * p), key.split("_")[1])),
               SRC_Q, np.quantile(x, p), value(doc, key), 1e-8)
    pct = {r["share"]: r for r in table(doc, "percentiles")}
    for qty, csvcol in (("descent_time", "descent time"), ("touchdown_speed", "touchdown speed"),
                        ("landing_energy", "landing energy")):
        x = np.array([float(r[col[csvcol]]) for r in rows])
        for share, p in PCT:
            ck.rel("reference library", what % ("%s, %s" % (csvcol, share)), SRC_Q, np.quantile(x, p),
                   pct[share][qty], 1e-8)
        ck.rel("reference library", what % ("%s, mean" % csvcol), SRC_Q.replace("numpy.quantile", "numpy.mean"),
               x.mean(), pct["mean"][qty], 1e-9)

ck.done()
