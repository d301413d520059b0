#!/usr/bin/env python3
"""install.py - libsinkrate proved from outside, as a user meets it.

usage: install.py MAKE BUILD_DIR

1. `make install DESTDIR=<tmp> PREFIX=/usr/local` stages every file the
   install promises (program, shared library with its soname and links,
   static library, headers, sinkrate.pc, catalog, man pages, docs/files.md,
   bash completion) and nothing is missing;
2. the programs of examples/ are built with `pkg-config --cflags --libs
   sinkrate` (PKG_CONFIG_PATH and PKG_CONFIG_SYSROOT_DIR pointed at the
   staged tree), warnings as errors, against the staged headers and shared
   library only, and run: each prints what the README's "Using the library"
   section shows, and the README shows each program's source as it is;
3. the same built statically (`pkg-config --static`, the staged
   libsinkrate.a) prints the same;
4. the public headers compile as C++ too;
5. `make uninstall` with the same DESTDIR leaves no file behind.
"""
import os
import re
import shutil
import subprocess
import sys
import tempfile

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
PREFIX = "/usr/local"
# what each example is run with, and the exit code it must give
EXAMPLES = [("size", [], 0), ("profile", ["payloads/desert-club-rocket.yaml"], 1)]


def fail(msg):
    sys.exit("install-check: FAIL: " + msg)


def run(cmd, env=None, cwd=ROOT, want=0):
    r = subprocess.run(cmd, cwd=cwd, env=env, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    if want is not None and r.returncode != want:
        fail("%s exited %d (expected %d):\n%s%s" % (" ".join(cmd), r.returncode, want, r.stdout[-2000:],
                                                    r.stderr[-2000:]))
    return r


def readme_blocks(kind):
    """The ```kind blocks of the README, in order, as text."""
    text = open(os.path.join(ROOT, "README.md"), encoding="utf-8").read()
    return [m.group(1) for m in re.finditer(r"^```" + kind + r"\n(.*?)^```\n", text, re.S | re.M)]


def needed(path):
    out = run(["readelf", "-d", path]).stdout
    return re.findall(r"\(NEEDED\)\s+Shared library: \[([^\]]+)\]", out)


def main():
    if len(sys.argv) != 3:
        sys.exit(__doc__)
    make, build = sys.argv[1], sys.argv[2]
    version = re.search(r'#define SR_VERSION_STRING "([^"]+)"',
                        open(os.path.join(ROOT, "include/sinkrate/base.h")).read()).group(1)
    soname = "libsinkrate.so." + version.split(".")[0]
    tmp = tempfile.mkdtemp(prefix="sinkrate-install-")
    try:
        stage = os.path.join(tmp, "stage")
        mk = [make, "--no-print-directory", "-C", ROOT, "B=" + build, "DESTDIR=" + stage, "PREFIX=" + PREFIX]
        run(mk + ["install"])
        p = stage + PREFIX
        promised = ["bin/sinkrate", "lib/libsinkrate.so." + version, "lib/" + soname, "lib/libsinkrate.so",
                    "lib/libsinkrate.a", "lib/pkgconfig/sinkrate.pc", "include/sinkrate.h",
                    "share/man/man1/sinkrate.1", "share/man/man3/libsinkrate.3", "share/doc/sinkrate/files.md",
                    "share/bash-completion/completions/sinkrate", "share/sinkrate/canopies/conical.yaml"]
        promised += ["include/sinkrate/" + os.path.basename(h)
                     for h in sorted(os.listdir(os.path.join(ROOT, "include/sinkrate")))]
        for f in promised:
            if not os.path.lexists(os.path.join(p, f)):
                fail("make install did not stage %s" % f)
        if os.readlink(os.path.join(p, "lib", soname)) != "libsinkrate.so." + version:
            fail("%s does not point at libsinkrate.so.%s" % (soname, version))
        so = run(["readelf", "-d", os.path.join(p, "lib/libsinkrate.so." + version)]).stdout
        if "Library soname: [%s]" % soname not in so:
            fail("the shared library's soname is not %s" % soname)
        # nothing but the public headers is installed
        staged_h = sorted(os.path.relpath(os.path.join(d, f), p + "/include")
                          for d, _, fs in os.walk(p + "/include") for f in fs)
        want_h = ["sinkrate.h"] + ["sinkrate/" + h for h in sorted(os.listdir(os.path.join(ROOT, "include/sinkrate")))]
        if staged_h != sorted(want_h):
            fail("installed headers %s, expected %s" % (staged_h, want_h))

        env = dict(os.environ)
        env.update({"PKG_CONFIG_PATH": p + "/lib/pkgconfig", "PKG_CONFIG_SYSROOT_DIR": stage, "LC_ALL": "C"})
        flags = run(["pkg-config", "--cflags", "--libs", "sinkrate"], env=env).stdout.split()
        if "-I%s/include" % p not in flags or "-L%s/lib" % p not in flags:
            fail("pkg-config --cflags --libs sinkrate does not point at the staged tree: %s" % " ".join(flags))
        # statically: the archive by name (the shared library sits next to it), then what sinkrate.pc says
        # it needs (Libs.private, and the shared libraries of the Requires.private modules: a fully static
        # link would need static builds of every library PROJ uses, which Debian does not ship)
        pc = open(p + "/lib/pkgconfig/sinkrate.pc").read()
        private = re.search(r"^Libs\.private:(.*)$", pc, re.M).group(1).split()
        mods = run(["pkg-config", "--print-requires-private", "sinkrate"], env=env).stdout.split()
        sflags = ["-l:libsinkrate.a" if f == "-lsinkrate" else f for f in flags] + private
        sflags += run(["pkg-config", "--libs"] + mods, env=env).stdout.split()
        cc = os.environ.get("CC", "cc")
        renv = dict(os.environ)
        renv.update({"LD_LIBRARY_PATH": p + "/lib", "SINKRATE_DATA": p + "/share/sinkrate", "LC_ALL": "C"})
        renv.pop("SINKRATE_PATH", None)
        sources = readme_blocks("c")
        outputs = readme_blocks("text")
        for name, args, code in EXAMPLES:
            src = os.path.join(ROOT, "examples", name + ".c")
            text = open(src, encoding="utf-8").read()
            if text not in sources:
                fail("the README's \"Using the library\" does not show examples/%s.c as it is" % name)
            exe, sexe = os.path.join(tmp, name), os.path.join(tmp, name + "-static")
            cflags = ["-std=c11", "-Wall", "-Wextra", "-Werror", "-pedantic"]
            run([cc] + cflags + [src, "-o", exe] + flags, env=env)
            run([cc] + cflags + [src, "-o", sexe] + sflags, env=env)
            if soname not in needed(exe):
                fail("examples/%s.c does not link the shared library (%s)" % (name, needed(exe)))
            if any("sinkrate" in n for n in needed(sexe)):
                fail("the static examples/%s.c still needs %s" % (name, needed(sexe)))
            ldd = run(["ldd", exe], env=renv).stdout
            if p + "/lib/" + soname not in ldd:
                fail("examples/%s.c does not run on the staged library:\n%s" % (name, ldd))
            out = run([exe] + args, env=renv, want=code).stdout
            sout = run([sexe] + args, env=renv, want=code).stdout
            if sout != out:
                fail("examples/%s.c prints something else linked statically" % name)
            if out not in outputs:
                fail("the README does not show what examples/%s.c prints; it prints:\n%s" % (name, out))
            if "CAUTION" not in out:
                fail("examples/%s.c prints results without the caution" % name)
        # the headers are C++-clean
        cxx = shutil.which("c++")
        if cxx:
            probe = os.path.join(tmp, "probe.cc")
            with open(probe, "w") as f:
                f.write("#include <sinkrate.h>\nint main() { return sr_version()[0] == '0' ? 0 : 0; }\n")
            run([cxx, "-Wall", "-Wextra", "-Werror", probe, "-o", os.path.join(tmp, "probe")] + flags, env=env)
        run(mk + ["uninstall"])
        left = [os.path.join(d, f) for d, _, fs in os.walk(stage) for f in fs]
        if left:
            fail("make uninstall left %s" % ", ".join(os.path.relpath(x, stage) for x in left))
        print("install-check: staged install of libsinkrate %s (%s), %d examples built with pkg-config, shared and "
              "static, printing what the README shows; uninstall leaves nothing" % (version, soname, len(EXAMPLES)))
    finally:
        shutil.rmtree(tmp, ignore_errors=True)


if __name__ == "__main__":
    main()
