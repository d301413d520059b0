#!/usr/bin/env python3
"""layers.py - the source tree keeps its layers (DEVELOPERS.md, "Layers").

usage: layers.py BUILD_DIR

The layers, bottom up: base < physics < files < analysis < output < cli.
Output sits above analysis: it renders what the jobs computed (today it needs
only base and physics), and analysis never includes output. The public
headers belong to the layer of what they declare (include/sinkrate/base.h to
base, physics.h to physics, ...); include/sinkrate.h is for programs only.

Checked, each failure naming the files:
1. every #include "..." in src/<layer>/ names a file that exists, in the same
   or a lower layer;
2. no include cycle between the library's modules (a module is a file's
   stem, a private header X_int.h belonging to module X);
3. the objects (BUILD_DIR/obj/<layer>/*.o) call down only, and no two of the
   library's objects call each other through any chain (symbol references
   found with nm). The front end (src/cli/) is one program on top: its command
   table names every command and the commands share the parts that read the
   table, so its files may refer to each other; it only has to stay on top.
4. libyaml (<yaml.h>, files/yamldoc.h) and the CSV reader (files/csvtable.h)
   are included in the readers (src/files/) and the CLI only: the models take
   arrays and structs.
"""
import collections
import glob
import os
import re
import subprocess
import sys

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
LAYERS = ["base", "physics", "files", "analysis", "output", "cli"]
PUBLIC = {"sinkrate/base.h": "base", "sinkrate/physics.h": "physics", "sinkrate/files.h": "files",
          "sinkrate/analysis.h": "analysis", "sinkrate/output.h": "output"}
READER_ONLY = {"<yaml.h>", "files/yamldoc.h", "files/csvtable.h"}
READER_LAYERS = {"files", "cli"}


def module_of(path):
    """(layer, stem) of a source or header; X_int.h belongs to module X."""
    rel = os.path.relpath(path, ROOT)
    if rel.startswith("include/"):
        key = rel[len("include/"):]
        return (PUBLIC.get(key, "public"), key)
    layer = rel.split("/")[1]
    stem = os.path.splitext(os.path.basename(rel))[0]
    if stem.endswith("_int"):
        stem = stem[:-4]
    return (layer, stem)


def sccs(graph):
    """Strongly connected components with more than one node (Tarjan)."""
    index, low, stack, on, out, n = {}, {}, [], set(), [], [0]
    sys.setrecursionlimit(100000)

    def visit(v):
        index[v] = low[v] = n[0]
        n[0] += 1
        stack.append(v)
        on.add(v)
        for w in sorted(graph.get(v, ())):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = []
            while True:
                w = stack.pop()
                on.discard(w)
                comp.append(w)
                if w == v:
                    break
            if len(comp) > 1:
                out.append(sorted(comp))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def name(m):
    return "%s/%s" % m if not m[1].startswith("sinkrate/") else "include/" + m[1]


def main():
    if len(sys.argv) != 2:
        sys.exit(__doc__)
    build = sys.argv[1]
    bad = []
    files = sorted(glob.glob(os.path.join(ROOT, "src", "*", "*.[ch]")))
    for f in files:
        if os.path.relpath(f, ROOT).split("/")[1] not in LAYERS:
            bad.append("%s: a folder that is no layer (%s)" % (os.path.relpath(f, ROOT), ", ".join(LAYERS)))
    headers = files + sorted(glob.glob(os.path.join(ROOT, "include", "sinkrate", "*.h")))

    # 1 and 4: every include, by layer
    graph = collections.defaultdict(set)
    for f in headers:
        rel = os.path.relpath(f, ROOT)
        src = module_of(f)
        text = open(f, encoding="utf-8").read()
        for m in re.finditer(r'^\s*#\s*include\s*([<"])([^>"]+)[>"]', text, re.M):
            quoted, inc = m.group(1) == '"', m.group(2)
            line = text.count("\n", 0, m.start()) + 1
            shown = '"%s"' % inc if quoted else "<%s>" % inc
            if (shown if not quoted else inc) in READER_ONLY and src[0] not in READER_LAYERS:
                bad.append("%s:%d: includes %s: reading files is the readers' job (src/files/); "
                           "a model takes arrays and structs" % (rel, line, shown))
            if not quoted:
                continue
            if inc.startswith("sinkrate/") or inc == "sinkrate.h":
                target = os.path.join(ROOT, "include", inc)
            else:
                target = os.path.join(ROOT, "src", inc)
            if not os.path.exists(target):
                bad.append("%s:%d: includes \"%s\", which is no file of src/ or include/" % (rel, line, inc))
                continue
            dst = module_of(target)
            if dst[0] == "public":
                bad.append("%s:%d: includes \"%s\", the header for programs only" % (rel, line, inc))
                continue
            if src[0] in LAYERS and LAYERS.index(dst[0]) > LAYERS.index(src[0]):
                bad.append("%s:%d: includes \"%s\": %s is above %s (layers, bottom up: %s)"
                           % (rel, line, inc, dst[0], src[0], " < ".join(LAYERS)))
            if dst != src:
                graph[src].add(dst)
    for comp in sccs({k: {d for d in v if d[0] != "cli"} for k, v in graph.items() if k[0] != "cli"}):
        bad.append("include cycle between modules: %s" % " <-> ".join(name(m) for m in comp))

    # 3: the objects' symbol references
    objs = sorted(glob.glob(os.path.join(build, "obj", "*", "*.o")))
    objs = [o for o in objs if os.path.basename(os.path.dirname(o)) in LAYERS]
    if not objs:
        bad.append("no objects under %s/obj: build first" % build)
    defined, refs = {}, collections.defaultdict(set)
    for o in objs:
        key = (os.path.basename(os.path.dirname(o)), os.path.splitext(os.path.basename(o))[0])
        out = subprocess.run(["nm", o], stdout=subprocess.PIPE, text=True, check=True).stdout
        for line in out.splitlines():
            p = line.split()
            if len(p) == 3 and p[1] in "TDBRCVW":
                defined[p[2]] = key
            elif len(p) == 2 and p[0] == "U":
                refs[key].add(p[1])
    calls = collections.defaultdict(set)
    up = collections.defaultdict(list)
    for o, syms in sorted(refs.items()):
        for s in sorted(syms):
            d = defined.get(s)
            if d and d != o:
                calls[o].add(d)
                if LAYERS.index(d[0]) > LAYERS.index(o[0]):
                    up[(o, d)].append(s)
    for (o, d), syms in sorted(up.items()):
        bad.append("%s.o calls %s.o (%s): %s is above %s" % (name(o), name(d), ", ".join(syms), d[0], o[0]))
    for comp in sccs({k: {d for d in v if d[0] != "cli"} for k, v in calls.items() if k[0] != "cli"}):
        bad.append("call cycle between objects: %s" % " <-> ".join(name(m) + ".o" for m in comp))

    if bad:
        for b in bad:
            print("layers: " + b)
        sys.exit("layers: %d problem%s with the layers of the source tree" % (len(bad), "s" if len(bad) > 1 else ""))
    print("layers: %d files include only their own or lower layers (%s), %d modules without an include cycle, "
          "%d objects calling down without a cycle" % (len(headers), " < ".join(LAYERS), len(graph), len(objs)))


if __name__ == "__main__":
    main()
