#!/usr/bin/env python3
"""selftest_validation.py PYTHON GENERATOR - the generator of docs/validation.md
on crafted logs: it writes a good one with a header that matches its rows, and
refuses a row without a class, an outside row without a source, a recalled
value classed as outside, a failed row, a document whose header disagrees with
its rows, and a README without the legend."""
import atexit
import os
import shutil
import subprocess
import sys
import tempfile

PY, GEN = sys.argv[1], sys.argv[2]
tmp = tempfile.mkdtemp(prefix="sinkrate-valgen-")
atexit.register(shutil.rmtree, tmp, True)
failures = 0


def row(file, quantity, source, cls, status="pass"):
    return "\t".join([file, quantity, source, "1", "1", "rel 1e-09", status, cls]) if cls is not None else \
        "\t".join([file, quantity, source, "1", "1", "rel 1e-09", status])


GOOD = [row("test_atmos.c", "T at 0 km (K)", "U.S. Standard Atmosphere 1976, Table I", "published"),
        row("test_units.c", "1 ft in SI", "udunits2 2.2", "reference library"),
        row("test_opening.c", "Pflanz X1", "canopy-handbook.md 6.3 [D]", "our derivation"),
        row("test_catalog.c", "CD0 low", "Knacke 1991, Table 5-1 (from memory)", "from memory"),
        row("test_wind.c", "direction", "WMO convention (common practice)", "common practice"),
        row("test_plot.c", "PNG width", "PNG specification", "format"),
        row("ref_fluids.py", "air: rho at 0 m", "python3-fluids ATMOSPHERE_1976", "reference library"),
        row("test_profile.c", "fast vs full", "the full mode", "consistency")]


def run(lines, *extra):
    log = os.path.join(tmp, "log.tsv")
    with open(log, "w", encoding="utf-8") as f:
        f.write("\n".join(lines) + "\n")
    return subprocess.run([PY, GEN, log, *extra], capture_output=True, text=True)


def expect(what, p, code, says=None):
    global failures
    ok = p.returncode == code and (says is None or says in p.stderr)
    if not ok:
        failures += 1
        print("validation self-test: %s: exit %d (want %d), stderr: %s" % (what, p.returncode, code, p.stderr.strip()),
              file=sys.stderr)


# a good log: exit 0, and the header counts what the rows hold
p = run(GOOD)
expect("a good log", p, 0)
doc = p.stdout
want = ("**8 checks, 0 failed. 3 against the world (1 published, 2 reference library, 0 independent method); "
        "2 against our own work (1 our derivation, 1 consistency); 1 common practice; 1 from memory; 1 format.**")
if want not in doc:
    failures += 1
    print("validation self-test: the summary of a good log is not '%s'" % want, file=sys.stderr)
if "| atmosphere | 1 | 1 | 0 | **2** | 0 | 0 | 0 | 0 | 0 | 2 |" not in doc:
    failures += 1
    print("validation self-test: the atmosphere row of the header does not count the two atmosphere rows",
          file=sys.stderr)

# refused logs
expect("a row classed 'unclassified'", run(GOOD + [row("test_x.c", "q", "some source", "unclassified")]), 1,
       "no class")
expect("a row without the class column", run(GOOD + [row("test_x.c", "q", "some source", None)]), 1, "no class")
expect("a published row without a source", run(GOOD + [row("test_x.c", "q", "", "published")]), 1, "names no source")
expect("a library row with a placeholder source", run(GOOD + [row("test_x.c", "q", "none", "reference library")]), 1,
       "names no source")
expect("a recalled value classed published", run(GOOD + [row("test_x.c", "q", "Knacke 1991 (from memory)",
                                                              "published")]), 1, "from memory")
expect("a 'from memory' row that does not say so", run(GOOD + [row("test_x.c", "q", "Knacke 1991", "from memory")]),
       1, "does not say so")
expect("a failed row", run(GOOD + [row("test_x.c", "q", "NIST SP 811", "published", "FAIL")]), 1, "failed")
expect("an empty log", run([]), 1)

# a document whose header disagrees with its rows
path = os.path.join(tmp, "doc.md")


def verify(text):
    with open(path, "w", encoding="utf-8") as f:
        f.write(text)
    return subprocess.run([PY, GEN, "--verify", path], capture_output=True, text=True)


expect("the good document", verify(doc), 0)
expect("a header count changed", verify(doc.replace("| atmosphere | 1 | 1 |", "| atmosphere | 2 | 1 |")), 1,
       "header row 'atmosphere'")
expect("the summary changed", verify(doc.replace("8 checks, 0 failed", "9 checks, 0 failed")), 1, "summary")
lines = doc.split("\n")
body_row = next(i for i, l in enumerate(lines) if l.startswith("| T at 0 km"))
expect("a row dropped from the body", verify("\n".join(lines[:body_row] + lines[body_row + 1:])), 1, "header row")
expect("a body row's class changed", verify(doc.replace("| T at 0 km (K) | published |", "| T at 0 km (K) | "
                                                                                          "consistency |")), 1)

# the legend in the README
readme = os.path.join(tmp, "README.md")
with open(readme, "w", encoding="utf-8") as f:
    f.write("# a README without the legend\n")
expect("a README without the legend", run(GOOD, "--legend", readme), 1, "legend")

print("validation self-test: %s" % ("%d case(s) failed" % failures if failures else "every case as expected"))
sys.exit(1 if failures else 0)
