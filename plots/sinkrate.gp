# sinkrate.gp - the shared look of every figure sinkrate writes.
# Each generated script sets plain defaults for the sr_* variables below and
# then loads this file, so editing it restyles every figure on its next run.
# It sets no terminal and no output: the generated script chooses those from
# its fmt / width / height variables.

# ---- type and paper ----
sr_font     = 'DejaVu Sans'
sr_fontsize = 11          # axis labels, tics, legend (points)
sr_titlesize = 15         # figure title
sr_small    = 8           # footnote (the caution) and subtitle details
sr_paper    = '#ffffff'
sr_ink      = '#1f2a33'   # text, border, tics
sr_muted    = '#5f6d78'   # subtitle and footnote
sr_gridline = '#d5dbe0'
sr_gridfine = '#eceff2'

# ---- margins around the plotting area, in pixels ----
sr_ml = 92                # left: tic labels and the y label
sr_mr = 28
sr_mt = 78                # top: title and subtitle
sr_mb = 104               # bottom: tic labels, x label, footnote
sr_gap = 84               # between two panels

set encoding utf8

# ---- frame: open on top and right, ticks outside, a quiet grid ----
set border 3 lc rgb sr_ink lw 1.1
set tics nomirror out scale 0.6,0.3 textcolor rgb sr_ink
sr_minor = 2              # minor intervals between major tics (log axes: 2..9 of each decade)
set mxtics sr_minor
set mytics sr_minor
set grid xtics ytics mxtics mytics lt 1 lc rgb sr_gridline lw 0.9, lt 1 lc rgb sr_gridfine lw 0.6
set grid back
set xlabel textcolor rgb sr_ink offset 0,0.2
set ylabel textcolor rgb sr_ink offset 0.6,0
set title textcolor rgb sr_ink offset 0,-0.3
sr_format = '%g'          # tic labels (log axes over three decades: powers of ten)
set format x sr_format
set format y sr_format

# ---- legend: no box, sample lines short, over a white patch ----
set key noenhanced textcolor rgb sr_ink spacing 1.25 samplen 2.2 width 1 opaque nobox
set key top right

# ---- eight colours in turn (ours): deep teal, brick, moss, plum, ochre, slate, rose, sea green ----
set linetype 1 lc rgb '#0b6e8c' lw 2.4 pt 7  ps 0.9 dt solid
set linetype 2 lc rgb '#c0532a' lw 2.4 pt 5  ps 0.9 dt solid
set linetype 3 lc rgb '#5b8c2a' lw 2.4 pt 9  ps 1.0 dt solid
set linetype 4 lc rgb '#7a4c9e' lw 2.4 pt 11 ps 1.0 dt solid
set linetype 5 lc rgb '#c49214' lw 2.4 pt 13 ps 1.0 dt solid
set linetype 6 lc rgb '#3e4c59' lw 2.4 pt 15 ps 0.9 dt solid
set linetype 7 lc rgb '#bf3f76' lw 2.4 pt 7  ps 0.9 dt solid
set linetype 8 lc rgb '#23998a' lw 2.4 pt 5  ps 0.9 dt solid
set linetype cycle 8

# ---- shaded bands (a drag-coefficient range around the typical curve) ----
sr_band_opacity = 0.20
set style fill transparent solid sr_band_opacity noborder

# ---- marker lines: limits, deployment altitudes, the ground ----
set style line 100 lc rgb '#a3262a' lw 1.5 dt (10,5)
set style line 101 lc rgb '#6b5a3a' lw 1.3 dt (3,4)
set style arrow 100 nohead ls 100 back
set style arrow 101 nohead ls 101 back
# marker labels sit on a patch of paper so lines under them do not hide them
set style textbox opaque noborder margins 1.5,1

# ---- histograms and landing ellipses ----
set style ellipse units xy
set boxwidth 0.9 relative

# ---- the caution, as a footnote on every figure ----
# The generated script defines caution (the text, from sinkrate), caution_lines
# and height before loading this file; label 100 is the footnote.
if (!exists("caution_lines")) caution_lines = 1
if (!exists("height")) height = 650
if (exists("caution")) set label 100 caution at screen 0.012, \
    screen (6.0 + (caution_lines - 0.5) * sr_small * 1.45) / height \
    left front noenhanced font sprintf("%s,%d", sr_font, sr_small) textcolor rgb sr_muted
