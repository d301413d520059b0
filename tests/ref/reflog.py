"""reflog.py - what the reference-library scripts share: running the built
sinkrate with --format json, and writing validation rows into the log the C
tests write (tests/testutil.c: file, quantity, source, expected, result,
tolerance, pass/FAIL, class), with the same rules on class and source."""
import csv
import io
import json
import math
import os
import subprocess
import sys

OUTSIDE = ("published", "reference library", "independent method")
CLASSES = OUTSIDE + ("our derivation", "consistency", "common practice", "from memory", "format")


class Checks:
    """Assert and log; exit(1) at the end when a check failed."""

    def __init__(self, script):
        self.file = os.path.basename(script)
        self.log = os.environ.get("SR_VALIDATION_LOG")
        self.failed = 0
        self.count = 0

    def _row(self, cls, quantity, source, expected, got, tol, absolute):
        if cls not in CLASSES:
            raise ValueError("%s: no class" % quantity)
        if len(source) < 4 or (cls in OUTSIDE and "from memory" in source):
            raise ValueError("%s: class %s needs a source that is not from memory" % (quantity, cls))
        lim = tol if absolute else tol * abs(expected)
        ok = math.isfinite(got) and abs(got - expected) <= lim
        self.count += 1
        if not ok:
            self.failed += 1
            print("%s: %s: expected %.10g, got %.10g (tolerance %s %.3g) [source: %s]" %
                  (self.file, quantity, expected, got, "abs" if absolute else "rel", tol, source), file=sys.stderr)
        if self.log:
            with open(self.log, "a", encoding="utf-8") as f:
                f.write("%s\t%s\t%s\t%.10g\t%.10g\t%s%.3g\t%s\t%s\n" % (
                    self.file, quantity.replace("\t", " "), source.replace("\t", " "), expected, got,
                    "abs " if absolute else "rel ", tol, "pass" if ok else "FAIL", cls))
        return ok

    def rel(self, cls, quantity, source, expected, got, tol):
        return self._row(cls, quantity, source, float(expected), float(got), tol, False)

    def abs(self, cls, quantity, source, expected, got, tol):
        return self._row(cls, quantity, source, float(expected), float(got), tol, True)

    def done(self):
        print("%s: %d checks, %d failed" % (self.file, self.count, self.failed))
        sys.exit(1 if self.failed else 0)


def sinkrate_path():
    if len(sys.argv) < 2:
        sys.exit("usage: %s SINKRATE" % sys.argv[0])
    return sys.argv[1]


def run(*args, ok=(0,)):
    """stdout of the built sinkrate (exit code among ok)."""
    cmd = [sinkrate_path(), *args]
    p = subprocess.run(cmd, capture_output=True, text=True)
    if p.returncode not in ok:
        sys.exit("%s: exit %d: %s" % (" ".join(cmd), p.returncode, p.stderr.strip()))
    return p.stdout


def run_json(*args, ok=(0,)):
    return json.loads(run(*args, "--format", "json", ok=ok))


def table(doc, name):
    """Rows of a JSON report table as dicts keyed by column."""
    t = doc["tables"][name]
    keys = [c["key"] for c in t["columns"]]
    return [dict(zip(keys, r)) for r in t["rows"]]


def value(doc, key, field="value"):
    return doc["values"][key][field]


def read_csv(path):
    """A CSV file of sinkrate without its comment lines: header, rows of text."""
    with open(path, encoding="utf-8") as f:
        text = "".join(line for line in f if not line.startswith("#"))
    r = list(csv.reader(io.StringIO(text)))
    return r[0], r[1:]
