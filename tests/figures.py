#!/usr/bin/env python3
"""figures.py - every README figure drawn again and checked from its .dat and
its .gp, so that no figure hides data (make check; needs gnuplot).

usage: figures.py SINKRATE

The method: sinkrate writes every axis range as numbers and draws every box
that covers the plotting area itself (the legend, the labels beside lines
and points) as an opaque `set object rect` in graph coordinates; the frame's
size in pixels is in a "# layout:" comment of each panel. This script reads
those, reads the data blocks each plot command draws (`index K using a:b`),
maps them into the same graph coordinates with its own code, and checks:

  1. no opaque box covers any drawn data: a line segment (widened by 2 px),
     a point (5 px), a band cell, a bar, an ellipse (filled), an arrow;
  2. gnuplot's own key is off inside every panel (a legend is a box of ours,
     or the strip above the panels, which is outside every frame);
  3. no marker line lies on the frame: each is at least 1 % of the range
     (and 2 px) inside it;
  4. every legend entry is visible: a titled series is hidden where another
     series runs within 2 px of it and is drawn above it as a solid line or
     a fill, or has its colour; at least 5 % of its samples must be neither;
  5. labels of vertical marker lines of one panel do not overlap (same row,
     widths from the font's advance widths, as sinkrate estimates them);
  6. every README figure was drawn, and a figure written with --units us
     has no SI unit in its texts.
It prints one line per figure and fails with the figure, the panel and the
series or box at fault.
"""
import math
import os
import re
import shutil
import subprocess
import sys
import tempfile

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
FAILS = []


def fail(msg):
    FAILS.append(msg)
    print("FAIL " + msg)


def read_dat(path):
    blocks = []
    for chunk in re.split(r"\n\s*\n\s*\n", open(path).read()):
        rows = []
        for line in chunk.splitlines():
            line = line.strip()
            if not line or line.startswith("#"):
                continue
            rows.append([float(v) for v in line.split()])
        if rows or "# [" in chunk:
            blocks.append(rows)
    return blocks


def num(s):
    return float(s)


class Panel:
    def __init__(self, idx):
        self.idx = idx
        self.frame = None
        self.xr = self.yr = None
        self.xlog = self.ylog = False
        self.boxes = []      # (tag, x0, y0, x1, y1) graph coordinates
        self.series = []     # dicts
        self.markers = []    # ('x'|'y', value)
        self.vlabels = []    # (text, value, align, row)
        self.key_on = False

    def gx(self, x):
        lo, hi = self.xr
        if self.xlog:
            return (math.log10(x) - math.log10(lo)) / (math.log10(hi) - math.log10(lo)) if x > 0 else math.nan
        return (x - lo) / (hi - lo)

    def gy(self, y):
        lo, hi = self.yr
        if self.ylog:
            return (math.log10(y) - math.log10(lo)) / (math.log10(hi) - math.log10(lo)) if y > 0 else math.nan
        return (y - lo) / (hi - lo)


def parse_plot(cmd):
    out = []
    for part in re.split(r",\s*\\\n\s*", cmd):
        m = re.search(r"datafile index (\d+) using ([\d:]+) with (\w+)(.*)", part)
        if not m:
            continue
        rest = m.group(4)
        lt = re.search(r"\blt (\d+)", rest)
        dt = re.search(r"\bdt (\d+)", rest)
        t = re.search(r"title '((?:[^']|'')*)'", rest)
        out.append({"index": int(m.group(1)), "cols": [int(c) for c in m.group(2).split(":")],
                    "with": m.group(3), "lt": int(lt.group(1)) if lt else 0, "dt": int(dt.group(1)) if dt else 1,
                    "title": t.group(1).replace("''", "'") if t else None, "closed": " closed" in rest,
                    "thin": " lw 1 " in rest})
    return out


def parse_gp(path):
    text = open(path).read()
    parts = re.split(r"\n# ---- panel (\d+) ----\n", text)
    panels = []
    for k in range(1, len(parts), 2):
        P = Panel(int(parts[k]))
        body = parts[k + 1]
        m = re.search(r"# layout: frame ([\d.]+) ([\d.]+) ([\d.]+) ([\d.]+) px", body)
        P.frame = tuple(num(v) for v in m.groups()) if m else None
        for ax in "xy":
            m = re.search(r"set %srange \[([^:\]]*):([^\]]*)\]" % ax, body)
            if m and m.group(1) != "*":
                r = (num(m.group(1)), num(m.group(2)))
                setattr(P, ax + "r", r)
            setattr(P, ax + "log", re.search(r"^set logscale %s$" % ax, body, re.M) is not None)
        for m in re.finditer(r"set object (\d+) rect from graph ([-\d.e]+), graph ([-\d.e]+) to graph ([-\d.e]+), "
                             r"graph ([-\d.e]+) front fc rgb sr_paper", body):
            P.boxes.append((int(m.group(1)),) + tuple(num(v) for v in m.groups()[1:]))
        for m in re.finditer(r"set arrow \d+ from graph 0, first ([-\d.e+]+) to graph 1", body):
            P.markers.append(("y", num(m.group(1))))
        for m in re.finditer(r"set arrow \d+ from first ([-\d.e+]+), graph 0 to first", body):
            P.markers.append(("x", num(m.group(1))))
        for m in re.finditer(r"set label \d+ '((?:[^']|'')*)' at first ([-\d.e+]+), graph 1 (left|right) "
                             r"offset [-\d.]+,([\d.]+)", body):
            P.vlabels.append((m.group(1).replace("''", "'"), num(m.group(2)), m.group(3), num(m.group(4))))
        P.key_on = re.search(r"^set key on", body, re.M) is not None
        m = re.search(r"^plot(.*?)(?=\n(?:unset|set output|# ----|\Z))", body, re.S | re.M)
        P.series = parse_plot(m.group(1)) if m else []
        panels.append(P)
    return panels


# ---- geometry in pixels of the frame ----

def seg_hits_box(ax, ay, bx, by, b):
    if any(map(math.isnan, (ax, ay, bx, by))):
        return False
    t0, t1 = 0.0, 1.0
    dx, dy = bx - ax, by - ay
    for p, q in ((-dx, ax - b[0]), (dx, b[2] - ax), (-dy, ay - b[1]), (dy, b[3] - ay)):
        if p == 0:
            if q < 0:
                return False
        else:
            t = q / p
            if p < 0:
                t0 = max(t0, t)
            else:
                t1 = min(t1, t)
            if t0 > t1:
                return False
    return True


def in_box(x, y, b):
    return b[0] <= x <= b[2] and b[1] <= y <= b[3]


def in_poly(pts, x, y):
    inside = False
    n = len(pts)
    for i in range(n):
        (x1, y1), (x2, y2) = pts[i], pts[i - 1]
        if (y1 > y) != (y2 > y) and x < (x2 - x1) * (y - y1) / (y2 - y1) + x1:
            inside = not inside
    return inside


def geometry(P, s, blocks):
    """The series as pixel shapes: ('seg', x0, y0, x1, y1), ('pt', x, y),
    ('rect', x0, y0, x1, y1), ('poly', [(x, y)...])."""
    W, H = P.frame[2], P.frame[3]
    rows = blocks[s["index"]] if s["index"] < len(blocks) else []
    c = s["cols"]

    def px(x, y):
        return P.gx(x) * W, P.gy(y) * H

    shapes = []
    w = s["with"]
    if w in ("lines", "linespoints", "points"):
        prev = None
        for r in rows:
            x, y = r[c[0] - 1], r[c[1] - 1]
            if math.isnan(x) or math.isnan(y):
                prev = None
                continue
            q = px(x, y)
            if w != "lines":
                shapes.append(("pt",) + q)
            if w != "points" and prev:
                shapes.append(("seg",) + prev + q)
            prev = q
    elif w == "filledcurves" and s["closed"]:
        pts = [px(r[0], r[1]) for r in rows if not any(map(math.isnan, r[:2]))]
        if pts:
            shapes.append(("poly", pts))
    elif w == "filledcurves":
        for a, b in zip(rows, rows[1:]):
            v = [a[c[0] - 1], b[c[0] - 1], a[c[1] - 1], a[c[2] - 1], b[c[1] - 1], b[c[2] - 1]]
            if any(map(math.isnan, v)):
                continue
            x0, _ = px(min(v[0], v[1]), P.yr[0])
            x1, _ = px(max(v[0], v[1]), P.yr[0])
            _, y0 = px(P.xr[0], min(v[2:]))
            _, y1 = px(P.xr[0], max(v[2:]))
            shapes.append(("rect", x0, y0, x1, y1))
    elif w == "boxes":
        xs = [r[c[0] - 1] for r in rows]
        for i, r in enumerate(rows):
            x, y = r[c[0] - 1], r[c[1] - 1]
            bw = r[c[2] - 1] if len(c) > 2 else 0.9 * abs(xs[i + 1 if i + 1 < len(xs) else i - 1] - x)
            x0, y0 = px(x - bw / 2, min(0.0, y) if not P.ylog else P.yr[0])
            x1, y1 = px(x + bw / 2, max(0.0, y) if not P.ylog else y)
            shapes.append(("rect", x0, y0, x1, y1))
    elif w == "ellipses":
        for r in rows:
            cx, cy, ew, eh, an = (r[k - 1] for k in c[:5])
            a = math.radians(an)
            pts = []
            for k in range(72):
                t = 2 * math.pi * k / 72
                u, v = ew / 2 * math.cos(t), eh / 2 * math.sin(t)
                pts.append(px(cx + u * math.cos(a) - v * math.sin(a), cy + u * math.sin(a) + v * math.cos(a)))
            shapes.append(("poly", pts))
    elif w == "vectors":
        for r in rows:
            x, y, dx, dy = (r[k - 1] for k in c[:4])
            shapes.append(("seg",) + px(x, y) + px(x + dx, y + dy))
    return shapes


def shape_hits(sh, b):
    """Whether a shape meets box b (pixels), lines widened by 2 px and points by 5 px."""
    kind = sh[0]
    if kind == "seg":
        return seg_hits_box(sh[1], sh[2], sh[3], sh[4], (b[0] - 2, b[1] - 2, b[2] + 2, b[3] + 2))
    if kind == "pt":
        return in_box(sh[1], sh[2], (b[0] - 5, b[1] - 5, b[2] + 5, b[3] + 5))
    if kind == "rect":
        x0, x1 = sorted((sh[1], sh[3]))
        y0, y1 = sorted((sh[2], sh[4]))
        return x0 < b[2] and b[0] < x1 and y0 < b[3] and b[1] < y1
    pts = sh[1]
    if any(in_poly(pts, x, y) for x in (b[0], b[2]) for y in (b[1], b[3])):
        return True
    return any(seg_hits_box(*pts[i - 1], *pts[i], (b[0] - 2, b[1] - 2, b[2] + 2, b[3] + 2)) for i in range(len(pts)))


def samples(sh):
    if sh[0] == "seg":
        n = max(1, int(math.hypot(sh[3] - sh[1], sh[4] - sh[2]) / 2))
        return [(sh[1] + (sh[3] - sh[1]) * k / n, sh[2] + (sh[4] - sh[2]) * k / n) for k in range(n + 1)]
    if sh[0] == "pt":
        return [(sh[1], sh[2])]
    if sh[0] == "rect":
        return [((sh[1] + sh[3]) / 2, (sh[2] + sh[4]) / 2)]
    return [p for p in sh[1]]


def near(shapes, x, y, d):
    b = (x - d, y - d, x + d, y + d)
    for sh in shapes:
        if sh[0] == "seg" and seg_hits_box(sh[1], sh[2], sh[3], sh[4], b):
            return True
        if sh[0] == "pt" and in_box(sh[1], sh[2], (x - 4, y - 4, x + 4, y + 4)):
            return True
        if sh[0] == "rect" and shape_hits(sh, b):
            return True
        if sh[0] == "poly" and in_poly(sh[1], x, y):
            return True
    return False


# DejaVu Sans advance widths, ASCII 32..126, thousandths of an em (the font's hmtx table)
ADV = [318, 401, 460, 838, 636, 950, 780, 275, 390, 390, 500, 838, 318, 361, 318, 337, 636, 636, 636, 636, 636,
       636, 636, 636, 636, 636, 337, 337, 838, 838, 838, 531, 1000, 684, 686, 698, 770, 632, 575, 775, 752, 295,
       295, 656, 557, 863, 748, 787, 603, 787, 695, 635, 611, 732, 684, 989, 685, 611, 685, 390, 337, 390, 838,
       500, 500, 613, 635, 550, 635, 615, 352, 635, 634, 278, 278, 579, 278, 974, 634, 612, 635, 635, 411, 521,
       392, 634, 592, 818, 592, 592, 525, 636, 337, 636, 838]


def text_px(t, pt):
    em = sum(ADV[ord(ch) - 32] / 1000 if 32 <= ord(ch) < 127 else 0.84 for ch in t)
    return em * pt * 4 / 3


def check_figure(gp):
    name = os.path.basename(gp)[:-3]
    blocks = read_dat(gp[:-3] + ".dat")
    panels = parse_gp(gp)
    if not panels:
        fail("%s: no panels in the script" % name)
        return
    nboxes = 0
    for P in panels:
        where = "%s panel %d" % (name, P.idx)
        if P.key_on:
            fail("%s: gnuplot's key is on inside the panel" % where)
        if not P.frame or not P.xr or not P.yr:
            fail("%s: no layout comment or no numeric ranges" % where)
            continue
        W, H = P.frame[2], P.frame[3]
        drawn = [(s, geometry(P, s, blocks)) for s in P.series]
        # 1. opaque boxes over data
        for (tag, x0, y0, x1, y1) in P.boxes:
            nboxes += 1
            b = (x0 * W, y0 * H, x1 * W, y1 * H)
            for s, shapes in drawn:
                hit = next((sh for sh in shapes if shape_hits(sh, b)), None)
                if hit:
                    fail("%s: box %d (graph %.3f %.3f %.3f %.3f) covers data of '%s' (index %d) near px %s"
                         % (where, tag, x0, y0, x1, y1, s["title"] or "untitled", s["index"],
                            tuple(round(v) for v in samples(hit)[0])))
                    break
        # 3. marker lines off the frame
        for ax, v in P.markers:
            g = P.gx(v) if ax == "x" else P.gy(v)
            size = W if ax == "x" else H
            if not (g * size >= 2 and (1 - g) * size >= 2 and 0.01 <= g <= 0.99):
                fail("%s: marker line %s = %g is on the frame or outside (graph %.4f)" % (where, ax, v, g))
        # 4. every legend entry visible
        for i, (s, shapes) in enumerate(drawn):
            if not s["title"] or not shapes:
                continue
            pts = [p for sh in shapes for p in samples(sh)]
            pts = [p for p in pts if 0 <= p[0] <= W and 0 <= p[1] <= H]
            if not pts:
                continue
            covers = [sh2 for j, (s2, sh2) in enumerate(drawn) if j != i and (
                # the same look: one cannot tell them apart
                (s2["lt"] == s["lt"] and s2["with"] == s["with"] and s["with"] != "points") or
                # drawn above it as a solid, full-width line
                (j > i and s2["with"] in ("lines", "linespoints") and s2["dt"] == 1 and not s2["thin"]))]
            cov = [sh for group in covers for sh in group]
            step = max(1, len(pts) // 400)
            test = pts[::step]
            free = sum(1 for (x, y) in test if not near(cov, x, y, 2.0))
            if free < 0.05 * len(test):
                fail("%s: legend entry '%s' is hidden: %d of %d samples show" % (where, s["title"], free, len(test)))
        # 5. labels of vertical marker lines do not overlap
        placed = []
        for text, v, align, row in P.vlabels:
            x = P.gx(v) * W
            w = text_px(text, 9)
            x0, x1 = (x - w, x) if align == "right" else (x, x + w)
            for (t2, a0, a1, r2) in placed:
                if abs(r2 - row) < 0.5 and x0 < a1 + 2 and a0 < x1 + 2:
                    fail("%s: marker labels '%s' and '%s' overlap" % (where, text, t2))
            placed.append((text, x0, x1, row))
    print("ok   %-22s %d panel%s, %d box%s over the data checked" %
          (name, len(panels), "s" if len(panels) > 1 else "", nboxes, "es" if nboxes != 1 else ""))


SI_UNITS = re.compile(r"\[(m|m/s|kg|N|Pa|hPa|km|m2|kg/m2)\]|\b\d+(\.\d+)? (m|m/s|kg|N|Pa|hPa|km|K)\b(?! g /)|°C")


def check_us(sinkrate, tmp):
    """Figures written under --units us: no SI unit in any text they show."""
    cases = [
        ("us-profile", ["profile", "payloads/desert-club-rocket-revised.yaml"]),
        ("us-sweep", ["sweep", "--mission", "payloads/desert-club-rocket.yaml", "--mark-speed", "20ft/s"]),
        ("us-loads", ["loads", "--mission", "payloads/desert-club-rocket-revised.yaml", "--stage", "main"]),
        ("us-scatter", ["dispersion", "payloads/desert-club-rocket.yaml", "-n", "2000", "--seed", "1"]),
        ("us-freefall", ["freefall", "--body", "sphere", "--diameter", "4in", "--mass", "2lb", "--altitude",
                         "0ft,10000ft"]),
        ("us-fit", ["fit", "payloads/demo-flight.csv", "--mission", "payloads/desert-club-rocket.yaml",
                    "--pressure-altitude"]),
    ]
    for name, args in cases:
        prefix = os.path.join(tmp, name)
        r = subprocess.run([sinkrate] + args + ["--units", "us", "--plot", prefix], cwd=ROOT,
                           stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
        if r.returncode not in (0, 1):
            fail("%s: sinkrate exit %d: %s" % (name, r.returncode, r.stderr.strip()))
            continue
        gps = [os.path.join(tmp, f) for f in os.listdir(tmp) if f.startswith(name) and f.endswith(".gp")]
        for gp in gps:
            for line in open(gp):
                if not re.match(r"set (label|title|xlabel|ylabel)|array sr_key_text|caution|\s*datafile|"
                                r"plot|set label 102", line.strip()):
                    continue
                for q in re.findall(r"'((?:[^']|'')*)'", line):
                    m = SI_UNITS.search(q)
                    if m:
                        fail("%s: an SI unit under --units us: '%s' in %s" % (os.path.basename(gp), q, line.strip()[:60]))
            check_figure(gp)


def main():
    if len(sys.argv) != 2:
        sys.exit("usage: figures.py SINKRATE")
    sinkrate = os.path.abspath(sys.argv[1])
    if not shutil.which("gnuplot"):
        sys.exit("figures.py: gnuplot is not on PATH (Debian: gnuplot-nox)")
    tmp = tempfile.mkdtemp(prefix="sinkrate-figures-")
    try:
        out, img = os.path.join(tmp, "out"), os.path.join(tmp, "img")
        r = subprocess.run(["sh", "scripts/plots.sh", sinkrate, out, img], cwd=ROOT, stdout=subprocess.DEVNULL,
                           stderr=subprocess.PIPE, text=True)
        if r.returncode:
            sys.exit("figures.py: scripts/plots.sh failed: " + r.stderr.strip()[-400:])
        readme = open(os.path.join(ROOT, "README.md")).read()
        wanted = sorted(set(re.findall(r"\]\(plots/([\w-]+\.png)\)", readme)))
        for w in wanted:
            if not os.path.exists(os.path.join(img, w)):
                fail("README figure plots/%s was not drawn by scripts/plots.sh" % w)
        for f in sorted(os.listdir(out)):
            if f.endswith(".gp"):
                check_figure(os.path.join(out, f))
        us = os.path.join(tmp, "us")
        os.mkdir(us)
        check_us(sinkrate, us)
    finally:
        shutil.rmtree(tmp, ignore_errors=True)
    if FAILS:
        sys.exit("figures.py: %d problem%s" % (len(FAILS), "s" if len(FAILS) > 1 else ""))
    print("figures.py: every README figure (%d) hides no data" % len(wanted))


if __name__ == "__main__":
    main()
