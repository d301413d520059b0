#!/usr/bin/env python3
"""readme_examples.py - the README's console examples run for real and
compared with the README's text, so the README cannot drift from the tool.

usage: readme_examples.py SINKRATE [--update] [README]

Every ```console block of the README holds commands (lines starting "$ ",
continued by a trailing backslash) each followed by the output it prints.
Each command runs under bash in a scratch directory that holds copies of
payloads/, canopies/ and plots/sinkrate.gp (so files an example writes, such
as `fit --write-canopy payloads/...` or `--plot out/x`, never touch the
tree), with `sinkrate` on PATH being SINKRATE. The example's output is what
it writes on standard output, then what it writes on standard error (a
terminal shows both; in this order the text does not depend on timing). The
outputs are deterministic (dispersion examples give --seed); a line may
differ from the README only in trailing blanks. A line "..." in the README
stands for any lines the example leaves out (one such line per example:
--update keeps as many lines before and after it as the README shows).

make check runs the comparison (make readme-check); after changing an
output, `make readme` (--update) writes the real outputs into the README and
`git diff README.md` shows what changed.
"""
import os
import re
import shutil
import subprocess
import sys
import tempfile

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


def blocks(lines):
    """(start, end) line indices of the inside of each ```console block."""
    out, i = [], 0
    while i < len(lines):
        if lines[i].strip() == "```console":
            j = i + 1
            while j < len(lines) and lines[j].strip() != "```":
                j += 1
            out.append((i + 1, j))
            i = j
        i += 1
    return out


def examples(lines, start, end):
    """[(command, first output line, end of output)] of one block."""
    out, i = [], start
    while i < end:
        if not lines[i].startswith("$ "):
            i += 1
            continue
        cmd = [lines[i][2:]]
        while cmd[-1].endswith("\\") and i + 1 < end:
            i += 1
            cmd.append(lines[i])
        j = i + 1
        while j < end and not lines[j].startswith("$ "):
            j += 1
        out.append(("\n".join(cmd), i + 1, j))
        i = j
    return out


def scratch(sinkrate):
    d = tempfile.mkdtemp(prefix="sinkrate-readme-")
    for sub in ("payloads", "canopies"):
        shutil.copytree(os.path.join(ROOT, sub), os.path.join(d, sub))
    os.mkdir(os.path.join(d, "plots"))
    shutil.copy(os.path.join(ROOT, "plots", "sinkrate.gp"), os.path.join(d, "plots", "sinkrate.gp"))
    os.mkdir(os.path.join(d, "bin"))
    os.symlink(sinkrate, os.path.join(d, "bin", "sinkrate"))
    return d


def run(cmd, d):
    env = dict(os.environ)
    env.update({"PATH": os.path.join(d, "bin") + ":" + env.get("PATH", "/usr/bin:/bin"), "SINKRATE_DATA": d,
                "LC_ALL": "C.UTF-8"})
    env.pop("SINKRATE_PATH", None)
    r = subprocess.run(["bash", "-c", cmd], cwd=d, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    text = r.stdout.decode("utf-8", "replace")
    err = r.stderr.decode("utf-8", "replace")
    if err:
        text = text + ("\n" if text and not text.endswith("\n") else "") + err
    if d in text:
        text = text.replace(d, "SCRATCH")  # a path of the scratch directory is a fault of the example
    if text.endswith("\n"):
        text = text[:-1]  # the last line's newline; a blank line the example prints stays
    return text.split("\n") if text else []


def matches(got, want):
    """Lines equal but for trailing blanks; a "..." line of want stands for any lines."""
    g = [x.rstrip() for x in got]
    w = [x.rstrip() for x in want]
    if "..." not in [x.strip() for x in w]:
        return g == w
    k = [x.strip() for x in w].index("...")
    head, tail = w[:k], w[k + 1:]
    return len(g) >= len(head) + len(tail) and g[:len(head)] == head and (not tail or g[-len(tail):] == tail)


def abridged(got, want):
    """The real output cut as the README cuts it: as many lines before and after its "..." line."""
    k = [x.strip() for x in want].index("...")
    nt = len(want) - k - 1
    return got[:k] + [want[k]] + (got[-nt:] if nt else [])


def main():
    args = [a for a in sys.argv[1:] if not a.startswith("--")]
    update = "--update" in sys.argv[1:]
    if not args:
        sys.exit("usage: readme_examples.py SINKRATE [--update] [README]")
    sinkrate = os.path.abspath(args[0])
    readme = args[1] if len(args) > 1 else os.path.join(ROOT, "README.md")
    lines = open(readme, encoding="utf-8").read().split("\n")
    d = scratch(sinkrate)
    bad, n, changes = 0, 0, []
    try:
        for start, end in blocks(lines):
            for cmd, o0, o1 in examples(lines, start, end):
                n += 1
                got = run(cmd, d)
                want = lines[o0:o1]
                if matches(got, want):
                    continue
                if [w.strip() for w in want].count("...") > 1:
                    print("readme: %s:%d: more than one '...' in an example; keep one" % (os.path.basename(readme), o0))
                    bad += 1
                    continue
                if "..." in [w.strip() for w in want]:
                    got = abridged(got, want)
                if any("SCRATCH" in g for g in got):
                    print("readme: %s:%d: the output names the scratch directory; an example must not depend on "
                          "where it runs" % (os.path.basename(readme), o0))
                    bad += 1
                    continue
                changes.append((o0, o1, got))
                if not update:
                    bad += 1
                    first = next(k for k in range(max(len(got), len(want)))
                                 if k >= len(got) or k >= len(want) or got[k].rstrip() != want[k].rstrip())
                    print("readme: %s:%d: `%s` prints something else from line %d on:\n  README: %s\n  real:   %s"
                          % (os.path.basename(readme), o0, cmd.split("\n")[0][:90], o0 + first + 1,
                             want[first] if first < len(want) else "(nothing)",
                             got[first] if first < len(got) else "(nothing)"))
    finally:
        shutil.rmtree(d, ignore_errors=True)
    if update:
        for o0, o1, got in reversed(changes):
            lines[o0:o1] = got
        if changes:
            with open(readme + ".tmp", "w", encoding="utf-8") as f:
                f.write("\n".join(lines))
            os.replace(readme + ".tmp", readme)
        print("readme: %d example%s run, %d rewritten from real runs" % (n, "s" if n != 1 else "", len(changes)))
        sys.exit(1 if bad else 0)
    if bad:
        sys.exit("readme: %d of %d example%s differ from the README; `make readme` writes the real outputs "
                 "(then review git diff README.md)" % (bad, n, "s" if n != 1 else ""))
    print("readme: all %d console examples of the README print what it shows" % n)


if __name__ == "__main__":
    main()
