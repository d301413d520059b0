#!/usr/bin/env python3
"""validation.py - write docs/validation.md from the validation log, and check it.

  validation.py LOG [--sinkrate BIN --data DIR] > docs/validation.md
      Reads the log the tests append to (tests/testutil.c, tests/ref/*.py: one
      tab-separated line per check: file, quantity, source, expected, result,
      tolerance, pass/FAIL, class) and writes the document: a header that counts
      the checks per class and per quantity, what is not yet checked against the
      world (from `sinkrate canopies --format json`, the one source of that
      status), then every check. Exit 1, naming the rows, when a row has no class,
      a row of an outside class names no source, a recalled value is classed as
      outside, a row failed, or the header it wrote disagrees with its rows.
  validation.py --verify DOC
      Re-count the rows of a written document against its header (exit 1 when
      they disagree).
"""
import collections
import json
import re
import subprocess
import sys

# The classes, in the order the header prints them, as tests/testutil.c names them.
CLASSES = ["published", "reference library", "independent method", "our derivation", "consistency",
           "common practice", "from memory", "format"]
OUTSIDE = CLASSES[:3]
OURS = CLASSES[3:5]

# The legend: README.md and docs/method.md carry these lines word for word
# (this script checks it), so the three describe validation in the same words.
LEGEND = [
    "- **published**: a value read in a published table, standard or dataset (the 1976 standard's tables, NIST SP 811, measured drag data).",
    "- **reference library**: a general-purpose library computes the value on its own: udunits2, python3-fluids, scipy, statsmodels, numpy, and GSL where it computes something our code does not (a distribution's quantile).",
    "- **independent method**: a published law or method evaluated in the test, independently of our code.",
    "- **our derivation**: a derivation of this project (docs/method.md) computed again in the test; it checks the code against our own equations, not against the world.",
    "- **consistency**: two of our own computations agree (the fast mode and the full one, an ODE and a closed form of the same model).",
    "- **common practice**: a fact of the trade.",
    "- **from memory**: a value recalled, not read in a publication; when the code and the test took it from the same recollection, the check only shows they agree.",
    "- **format**: a file-format check (PNG, CSV).",
]
LEGEND_HEAD = "The first three classes are checks against the world; the others are not."

# The quantities the header counts, in its order.
TOPICS = ["atmosphere", "units", "canopy catalog and reference areas", "descent rate", "sizing",
          "descent time and landing", "wind and drift", "opening load", "filling time", "free fall",
          "dispersion statistics", "random draws", "flight-log fit", "plausibility and Mach",
          "landing maps and trajectories", "design search and packing", "file formats", "other"]

# (file pattern, quantity pattern, topic): the first rule that matches wins.
RULES = [
    (r".*", r"^air: ", "atmosphere"),
    (r".*", r"^free fall: ", "free fall"),
    (r".*", r"^(drift|wind): ", "wind and drift"),
    (r".*", r"^descent rate: ", "descent rate"),
    (r".*", r"^descent time: ", "descent time and landing"),
    (r".*", r"^dispersion: ", "dispersion statistics"),
    (r".*", r"^fit: ", "flight-log fit"),
    (r"^test_(fit|demo_flight|flightlog)\.c$", r"", "flight-log fit"),
    (r"^test_(geodesy|maps)\.c$", r"", "landing maps and trajectories"),
    (r"^test_(design|cli_design)\.c$", r"", "design search and packing"),
    (r"^test_us_customary\.c$", r"", "units"),
    (r"^test_plausible\.c$", r"", "plausibility and Mach"),
    (r"^test_atmos\.c$", r"", "atmosphere"),
    (r"^test_(units|csvtable)\.c$", r"", "units"),
    (r"^test_mission\.c$", r"wind|kn from", "wind and drift"),
    (r"^test_mission\.c$", r"", "units"),
    (r"^test_wind\.c$", r"", "wind and drift"),
    (r"^test_(canopy|catalog)\.c$", r"", "canopy catalog and reference areas"),
    (r"^test_(descent|cli_core|sweep)\.c$", r"\bS0\b|\bD0\b", "sizing"),
    (r"^test_sweep\.c$", r"density|speed of sound", "atmosphere"),
    (r"^test_sweep\.c$", r"descent time", "descent time and landing"),
    (r"^test_(descent|cli_core|sweep)\.c$", r"", "descent rate"),
    (r"^test_(opening|cli_loads)\.c$", r"filling time|fill_time", "filling time"),
    (r"^test_(opening|cli_loads)\.c$", r"", "opening load"),
    (r"^test_(bluff|cli_freefall|failcase)\.c$", r"", "free fall"),
    (r"^test_profile\.c$", r"drift|wind", "wind and drift"),
    (r"^test_profile\.c$", r"", "descent time and landing"),
    (r"^test_(dispersion|dispersion_mission|cli_dispersion)\.c$", r"", "dispersion statistics"),
    (r"^test_uncertainty\.c$", r"", "random draws"),
    (r"^(test_plot\.c|testutil\.c)$", r"", "file formats"),
]

# A source that names nothing.
NON_SOURCES = {"", "-", "none", "n/a", "na", "unknown", "source", "todo", "tbd", "?"}

CAUTION = ("> These are preliminary engineering estimates. Nothing here validates a\n"
           "> parachute that carries people.")


def topic_of(file, quantity, cls):
    if cls == "format":
        return "file formats"
    for fpat, qpat, topic in RULES:
        if re.search(fpat, file) and re.search(qpat, quantity):
            return topic
    return "other"


def read_log(path):
    """Rows of the log and the problems found in them."""
    rows, problems = [], []
    try:
        lines = open(path, encoding="utf-8").read().splitlines()
    except OSError as e:
        return rows, ["%s: %s" % (path, e.strerror)]
    for n, line in enumerate(lines, 1):
        f = line.split("\t")
        where = "%s:%d" % (path, n)
        if len(f) < 7:
            problems.append("%s: %d fields, a row has 8" % (where, len(f)))
            continue
        cls = f[7].strip() if len(f) > 7 else ""
        row = {"file": f[0], "quantity": f[1], "source": f[2].strip(), "expected": f[3], "got": f[4],
               "tol": f[5], "status": f[6], "cls": cls}
        label = "%s (%s: %s)" % (where, f[0], f[1])
        if cls not in CLASSES:
            problems.append("%s: no class (%r); give it one with CHECK_REL_CLASS / CHECK_ABS_CLASS" % (label, cls))
        elif cls in OUTSIDE and row["source"].lower() in NON_SOURCES:
            problems.append("%s: a check of class '%s' names no source" % (label, cls))
        elif cls in OUTSIDE and "from memory" in row["source"]:
            problems.append("%s: a value from memory is classed '%s'; class it 'from memory'" % (label, cls))
        elif cls == "from memory" and "from memory" not in row["source"]:
            problems.append("%s: a 'from memory' check does not say so in its source" % label)
        elif cls == "common practice" and "common practice" not in row["source"]:
            problems.append("%s: a 'common practice' check does not say so in its source" % label)
        if row["status"] != "pass":
            problems.append("%s: the check failed" % label)
        row["topic"] = topic_of(row["file"], row["quantity"], cls)
        rows.append(row)
    return rows, problems


def counts(rows):
    c = {t: {k: 0 for k in CLASSES} for t in TOPICS}
    for r in rows:
        if r["cls"] in CLASSES:
            c[r["topic"]][r["cls"]] += 1
    return c


def summary_sentence(total, failed, per_class):
    world = sum(per_class[k] for k in OUTSIDE)
    ours = sum(per_class[k] for k in OURS)
    return ("%d checks, %d failed. %d against the world (%d published, %d reference library, %d independent "
            "method); %d against our own work (%d our derivation, %d consistency); %d common practice; %d from "
            "memory; %d format." % (total, failed, world, per_class["published"], per_class["reference library"],
                                    per_class["independent method"], ours, per_class["our derivation"],
                                    per_class["consistency"], per_class["common practice"], per_class["from memory"],
                                    per_class["format"]))


def cell(s):
    return str(s).replace("|", "/").replace("\n", " ")


# The family values `sinkrate canopies ID` gives a check status, as the doc names them.
FAMILY_VALUES = [("drag_coefficient", "CD0 range"), ("projected_ratio", "Dp/D0"), ("constructed_ratio", "Dc/D0"),
                 ("opening_factor", "CX"), ("filling_constant", "filling constant"), ("oscillation", "oscillation"),
                 ("mach_limit", "Mach limit"), ("areal_mass", "areal mass"), ("growth_exponent", "growth exponent")]


def canopy_status(sinkrate, data):
    """The check status of the catalog and the models, read through the
    command that shows it (one source: the catalog files and provenance.c)."""
    def run(*args):
        cmd = [sinkrate, "canopies", *args, "--format", "json"]
        if data:
            cmd += ["--data", data]
        out = subprocess.run(cmd, capture_output=True, text=True)
        if out.returncode != 0:
            raise RuntimeError("%s: exit %d: %s" % (" ".join(cmd), out.returncode, out.stderr.strip()))
        return json.loads(out.stdout)

    def column(doc, table, key):
        t = doc["tables"][table]
        k = [c["key"] for c in t["columns"]].index(key)
        return [row[k] for row in t["rows"]]
    fams = [run(fid) for fid in column(run(), "families", "id")]
    models = run("--models")
    return fams, models, column(models, "models", "model")


def not_checked_section(fams, models, model_ids):
    out = ["## Not yet checked against the world", "",
           "Every input and model below has no check of an outside class (published, reference",
           "library, independent method); beside each, the publication and table that would check it.",
           "The status lives in the catalog files (`outside-check:` and `to-check:` on every value)",
           "and, for the models, in src/physics/provenance.c; `sinkrate canopies ID` and",
           "`sinkrate canopies --models` show the same.", "",
           "### Canopy families (canopies/*.yaml)", "",
           "| family | values without an outside check: what would check them |", "| --- | --- |"]
    checked = []
    nvalues = nunchecked = 0
    for f in fams:
        v = f["values"]
        groups, order = {}, []
        for key, label in FAMILY_VALUES:
            if key + "_outside_check" not in v:
                continue
            nvalues += 1
            status, to = v[key + "_outside_check"], v.get(key + "_to_check", "(not named)")
            if status != "none":
                checked.append("%s, %s: %s" % (v["id"], label, status))
                continue
            nunchecked += 1
            if key == "growth_exponent":  # a model's value: its row below says what would check it
                to = "the model growth-exponent-%s below" % v["class"]
            if to not in groups:
                groups[to] = []
                order.append(to)
            groups[to].append(label)
        if order:
            where = "; ".join("%s: %s" % (", ".join(groups[o]), o) for o in order)
            out.append("| %s | %s |" % (cell(v["id"]), cell(where)))
    out += ["", "%d of %d family values have no outside check." % (nunchecked, nvalues), "",
            "### Models (sinkrate canopies --models)", "", "| model | value | source | would be checked by |",
            "| --- | --- | --- | --- |"]
    mv = models["values"]
    munchecked = 0
    for mid in model_ids:
        k = mid.replace("-", "_")
        if mv[k + "_outside_check"] != "none":
            checked.append("%s: %s" % (mid, mv[k + "_outside_check"]))
            continue
        munchecked += 1
        out.append("| %s | %s | %s | %s |" % (cell(mid), cell(mv[k + "_value"]), cell(mv[k + "_source"]),
                                             cell(mv[k + "_to_check"])))
    out += ["", "%d of %d models have no outside check." % (munchecked, len(model_ids)), ""]
    headline = ("Not yet checked against the world: %d of %d catalog values and %d of %d models (section "
                "\"Not yet checked against the world\" below)." % (nunchecked, nvalues, munchecked, len(model_ids)))
    if checked:
        out += ["Checked against the world so far:", ""] + ["- " + c for c in checked] + [""]
    return headline, out


def source_head(source):
    """The start of a source, for the header: up to the first ':' or ';',
    without an unclosed parenthesis, at most about 64 characters."""
    head = re.split(r"[:;]", source)[0].strip().rstrip(",")
    while head.count("(") > head.count(")"):
        head = head[:head.rfind("(")].rstrip(" ,")
    if len(head) > 64:
        head = head[:head.rfind(" ", 0, 61)].rstrip(" ,(") + " ..."
    return head or source[:40]


def write_doc(rows, status):
    headline, status_lines = status
    c = counts(rows)
    per_class = {k: sum(c[t][k] for t in TOPICS) for k in CLASSES}
    total = len(rows)
    failed = sum(1 for r in rows if r["status"] != "pass")
    out = ["# Validation: what each check is checked against", "",
           "Written by `make check` from the checks the tests make (tests/testutil.h,",
           "`CHECK_REL_CLASS` / `CHECK_ABS_CLASS`, and the reference-library scripts in",
           "tests/ref/). Each row is one assertion with its class, its source, the expected",
           "value, the result and the tolerance. Do not edit by hand.", "", CAUTION, "",
           "## Summary", "", "**" + summary_sentence(total, failed, per_class) + "**", ""] + \
          ([headline, ""] if headline else []) + [
           "What each class means (the same words as in README.md and docs/method.md):", "",
           LEGEND_HEAD, ""] + LEGEND + ["",
           "### Checks per quantity and class", "",
           "| quantity | " + " | ".join(CLASSES[:3]) + " | **against the world** | " + " | ".join(CLASSES[3:]) +
           " | all |",
           "| --- |" + " ---: |" * (len(CLASSES) + 2)]
    for t in TOPICS:
        n = sum(c[t].values())
        if n == 0:
            continue
        world = sum(c[t][k] for k in OUTSIDE)
        out.append("| %s | %s | **%d** | %s | %d |" % (t, " | ".join(str(c[t][k]) for k in CLASSES[:3]), world,
                                                      " | ".join(str(c[t][k]) for k in CLASSES[3:]), n))
    out.append("| **all** | %s | **%d** | %s | **%d** |" % (
        " | ".join("**%d**" % per_class[k] for k in CLASSES[:3]), sum(per_class[k] for k in OUTSIDE),
        " | ".join("**%d**" % per_class[k] for k in CLASSES[3:]), total))
    out += ["", "### What the checks against the world rest on", "",
            "The most frequent sources of each quantity's checks of an outside class; a quantity without any",
            "rests on our own work alone.", "", "| quantity | sources (checks) |", "| --- | --- |"]
    for t in TOPICS:
        sources = collections.Counter()
        for r in rows:
            if r["topic"] == t and r["cls"] in OUTSIDE:
                sources[source_head(r["source"])] += 1
        if sum(c[t].values()):
            out.append("| %s | %s |" % (t, cell("; ".join("%s (%d)" % kv for kv in sources.most_common(5)) or
                                                "none: no check of an outside class")))
    out.append("")
    out += status_lines
    out += ["## Every check", ""]
    for t in TOPICS:
        sel = [r for r in rows if r["topic"] == t]
        if not sel:
            continue
        out += ["### %s (%d)" % (t, len(sel)), "",
                "| quantity | class | source | expected | result | tolerance | test | |",
                "| --- | --- | --- | --- | --- | --- | --- | --- |"]
        for r in sel:
            out.append("| %s | %s | %s | %s | %s | %s | %s | %s |" % (
                cell(r["quantity"]), r["cls"], cell(r["source"]), r["expected"], r["got"], r["tol"], r["file"],
                r["status"]))
        out.append("")
    return "\n".join(out)


def verify(text):
    """Problems where the header of a written document disagrees with its rows."""
    problems = []
    if "\n## Every check\n" not in text:
        return ["no '## Every check' section"]
    head_text, body_text = text.split("\n## Every check\n", 1)
    # the rows of the detailed tables, per quantity and class
    body = {t: {k: 0 for k in CLASSES} for t in TOPICS}
    topic = None
    total_rows = failed_rows = 0
    for line in body_text.splitlines():
        m = re.match(r"^### (.+) \((\d+)\)$", line)
        if m:
            topic = m.group(1) if m.group(1) in TOPICS else None
            if topic is None:
                problems.append("unknown quantity heading '%s'" % m.group(1))
            continue
        if line.startswith("| ") and topic and not line.startswith(("| quantity |", "| --- |")):
            f = [x.strip() for x in line.strip("|").split("|")]
            if len(f) != 8 or f[1] not in CLASSES:
                problems.append("row without a class: %s" % line)
                continue
            body[topic][f[1]] += 1
            total_rows += 1
            failed_rows += f[7] != "pass"
    # the header table
    head = {}
    for line in head_text.splitlines():
        if line.startswith("| ") and not line.startswith("| quantity"):
            f = [x.strip().strip("*") for x in line.strip("|").split("|")]
            if len(f) == len(CLASSES) + 3 and (f[0] in TOPICS or f[0] == "all"):
                try:
                    head[f[0]] = [int(x) for x in f[1:]]
                except ValueError:
                    problems.append("header row '%s' holds a non-number" % f[0])

    def row_of(c, n):
        return [c[k] for k in CLASSES[:3]] + [sum(c[k] for k in OUTSIDE)] + [c[k] for k in CLASSES[3:]] + [n]
    for t in TOPICS:
        n = sum(body[t].values())
        if n == 0 and t not in head:
            continue
        if head.get(t) != row_of(body[t], n):
            problems.append("header row '%s' says %s, the rows count %s" % (t, head.get(t), row_of(body[t], n)))
    per_class = {k: sum(body[t][k] for t in TOPICS) for k in CLASSES}
    if head.get("all") != row_of(per_class, total_rows):
        problems.append("header row 'all' says %s, the rows count %s" % (head.get("all"), row_of(per_class, total_rows)))
    sentence = "**" + summary_sentence(total_rows, failed_rows, per_class) + "**"
    if sentence not in head_text.splitlines():
        problems.append("the summary sentence disagrees with the rows, which say: %s" % sentence)
    return problems


def check_legend(paths):
    problems = []
    for p in paths:
        try:
            text = open(p, encoding="utf-8").read()
        except OSError as e:
            problems.append("%s: %s" % (p, e.strerror))
            continue
        for line in [LEGEND_HEAD] + LEGEND:
            if line not in text:
                problems.append("%s does not carry the validation legend line: %s" % (p, line))
    return problems


def main(argv):
    args = argv[1:]
    if len(args) == 2 and args[0] == "--verify":
        problems = verify(open(args[1], encoding="utf-8").read())
        for p in problems:
            print("validation.py: %s: %s" % (args[1], p), file=sys.stderr)
        return 1 if problems else 0
    log, sinkrate, data, legend = None, None, None, []
    i = 0
    while i < len(args):
        a = args[i]
        if a in ("--sinkrate", "--data", "--legend") and i + 1 < len(args):
            if a == "--sinkrate":
                sinkrate = args[i + 1]
            elif a == "--data":
                data = args[i + 1]
            else:
                legend.append(args[i + 1])
            i += 2
        elif log is None and not a.startswith("-"):
            log = a
            i += 1
        else:
            print(__doc__, file=sys.stderr)
            return 2
    if log is None:
        print(__doc__, file=sys.stderr)
        return 2
    rows, problems = read_log(log)
    if not rows and not problems:
        problems.append("%s: no checks logged" % log)
    status = (None, [])
    if sinkrate:
        try:
            status = not_checked_section(*canopy_status(sinkrate, data))
        except (RuntimeError, KeyError, ValueError, OSError) as e:
            problems.append("the catalog's check status: %s" % e)
    problems += check_legend(legend)
    doc = write_doc(rows, status)
    problems += verify(doc)
    for p in problems:
        print("validation.py: %s" % p, file=sys.stderr)
    if problems:
        print("validation.py: %d problem(s); docs/validation.md not written" % len(problems), file=sys.stderr)
        return 1
    sys.stdout.write(doc + "\n")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
