#!/usr/bin/env python3
"""ref_statsmodels.py SINKRATE - the limit probabilities of `sinkrate
dispersion` against statsmodels (Debian python3-statsmodels): the Wilson
score interval at 95 % of every limit's share, from the counts the command
prints, and the share and its standard error from the --samples file's flags.
Rows go into $SR_VALIDATION_LOG."""
import atexit
import math
import os
import shutil
import tempfile

import statsmodels
from statsmodels.stats.proportion import proportion_confint

from reflog import Checks, read_csv, run_json, table

ck = Checks(__file__)
ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
SM = "statsmodels %s (Debian python3-statsmodels)" % statsmodels.__version__
SRC_W = SM + ": proportion_confint(count, n, alpha=0.05, method='wilson') (Wilson 1927)"
SRC_P = "binomial standard error sqrt(p(1-p)/n) of the share counted in the test"
FLAG = {"touchdown speed": "over touchdown speed", "landing energy": "over landing energy",
        "descent time": "over descent time", "drift": "over drift", "deployment pressure": "over deployment pressure",
        "Mach envelope": "over Mach envelope", "opening load": "over opening load"}

tmp = tempfile.mkdtemp(prefix="sinkrate-ref-")
atexit.register(shutil.rmtree, tmp, True)
for mission, n, seed in (("desert-club-rocket", 300, 2), ("drone-cargo-drop", 400, 4), ("drone-cargo-drop", 6000, 9),
                         ("desert-club-rocket-revised", 1500, 6)):
    samples = os.path.join(tmp, "samples.csv")
    doc = run_json("dispersion", os.path.join(ROOT, "payloads", mission + ".yaml"), "-n", str(n), "--seed",
                   str(seed), "--samples", samples, ok=(0, 1))
    head, rows = read_csv(samples)
    col = {h: i for i, h in enumerate(head)}
    for lim in table(doc, "limits"):
        name = lim["limit"]
        what = "dispersion: %s, %d samples, seed %d: %s limit %s" % (mission, n, seed, name, lim["value"])
        count = sum(int(r[col[FLAG[name]]]) for r in rows)
        ck.abs("consistency", what + ", samples over", "the --samples file's limit flags, counted in the test", count,
               lim["samples_over"], 0)
        p = count / n
        ck.abs("independent method", what + ", standard error of the share", SRC_P, math.sqrt(p * (1 - p) / n),
               lim["standard_error"], 1e-10)
        lo, hi = proportion_confint(count, n, alpha=0.05, method="wilson")
        ck.abs("reference library", what + ", Wilson 95 % interval, low end", SRC_W, lo, lim["interval_low"], 1e-10)
        ck.abs("reference library", what + ", Wilson 95 % interval, high end", SRC_W, hi, lim["interval_high"], 1e-10)

ck.done()
