#!/usr/bin/env python3
"""symbols.py - what libsinkrate exports, and whose names are whose.

usage: symbols.py BUILD_DIR

1. The shared library exports (nm -D --defined-only) only names with the
   sr_ prefix, and exactly the functions the public headers declare with
   SR_API (include/sinkrate/*.h): nothing private leaks, nothing declared is
   missing.
2. Every global name the static library defines starts with sr_ (a program
   linking libsinkrate.a meets no other name of ours).
3. The command-line front end defines its global names under sr_cli_ and
   sr_cmd_ only (and main), never a name of the library's modules, and none
   that the library defines too.
"""
import glob
import os
import re
import subprocess
import sys

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))


def nm(args):
    out = subprocess.run(["nm"] + args, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, check=True).stdout
    return sorted({p[2] for p in (l.split() for l in out.splitlines()) if len(p) == 3 and p[1] not in "Uuw"})


def declared():
    text = ""
    for h in sorted(glob.glob(os.path.join(ROOT, "include", "sinkrate", "*.h"))):
        text += open(h, encoding="utf-8").read()
    text = re.sub(r"/\*.*?\*/", "", text, flags=re.S)
    return sorted(set(re.findall(r"SR_API\b[^;{]*?\b(sr_\w+)\s*\(", text)))


def main():
    if len(sys.argv) != 2:
        sys.exit(__doc__)
    build = sys.argv[1]
    bad = []
    exported = nm(["-D", "--defined-only", os.path.join(build, "libsinkrate.so")])
    for s in exported:
        if not s.startswith("sr_"):
            bad.append("libsinkrate.so exports %s, a name without the sr_ prefix" % s)
    api = declared()
    for s in sorted(set(exported) - set(api)):
        if s.startswith("sr_"):
            bad.append("libsinkrate.so exports %s, which no public header declares (mark it static, or keep "
                       "SR_API off its declaration)" % s)
    for s in sorted(set(api) - set(exported)):
        bad.append("include/ declares %s with SR_API, but libsinkrate.so does not export it" % s)
    static = nm(["-g", "--defined-only", os.path.join(build, "libsinkrate.a")])
    for s in static:
        if not s.startswith("sr_"):
            bad.append("libsinkrate.a defines %s, a global name without the sr_ prefix (make it static or "
                       "prefix it)" % s)
    cli = nm(["-g", "--defined-only"] + sorted(glob.glob(os.path.join(build, "obj", "cli", "*.o"))))
    for s in cli:
        if s == "main":
            continue
        if not (s.startswith("sr_cli_") or s.startswith("sr_cmd_")):
            bad.append("the CLI defines %s: its global names are sr_cli_* and sr_cmd_* (the library's are "
                       "every other sr_ name)" % s)
    for s in sorted(set(cli) & set(static)):
        bad.append("%s is defined both in the library and in the CLI" % s)
    if bad:
        for b in bad:
            print("symbols: " + b)
        sys.exit("symbols: %d problem%s with the exported names" % (len(bad), "s" if len(bad) > 1 else ""))
    print("symbols: libsinkrate.so exports the %d functions the headers declare, all sr_; libsinkrate.a defines "
          "%d global names, all sr_; the CLI's %d are sr_cli_/sr_cmd_" % (len(exported), len(static), len(cli)))


if __name__ == "__main__":
    main()
