/* plot.h - gnuplot figures: a data file PREFIX.dat (blocks of columns), a
 * script PREFIX.gp that holds a copy of the shared style plots/sinkrate.gp
 * (so it runs from any directory) and that a user can edit and re-run, and
 * rendering PREFIX.png / .svg with gnuplot. Where the legend and the labels
 * go is decided from the data (plot_layout.c), so that none hides data. */
#ifndef SR_PLOT_H
#define SR_PLOT_H

#include <stddef.h>

#include <stdio.h>

#include "base/error.h"
#include "output/txn.h"

#define SR_PLOT_MAX_PANELS 2
#define SR_PLOT_COLORS 8          /* colours in the shared style, used in turn */

typedef struct sr_plot sr_plot;

/* What one series draws, and which columns it reads (1-based column numbers
 * of its data block; unused ones stay 0). */
typedef enum sr_plot_kind {
    SR_PLOT_LINES = 0,   /* x, y */
    SR_PLOT_POINTS,      /* x, y */
    SR_PLOT_LINESPOINTS, /* x, y */
    SR_PLOT_BAND,        /* x, lo, hi: shaded between lo and hi (vertical extent) at each x */
    SR_PLOT_BAND_X,      /* y, lo, hi: shaded between lo and hi (horizontal extent) at each y,
                            e.g. a rate band with altitude on the vertical axis */
    SR_PLOT_ELLIPSES,    /* x, y, w, h, angle: centre, full axis lengths along and across the
                            ellipse, angle in degrees counter-clockwise from +x */
    SR_PLOT_BOXES,       /* x, y and optionally w: histogram bars centred at x, height y */
    SR_PLOT_VECTORS      /* x, y, w, h: arrows from (x, y) to (x + w, y + h), drawn above the lines */
} sr_plot_kind;

typedef struct sr_plot_series {
    sr_plot_kind kind;
    int panel;           /* 0 .. panels-1 */
    size_t block;        /* from sr_plot_block */
    int x, y, lo, hi, w, h, angle;
    const char *title;   /* legend text (plain text); NULL: not in the legend */
    int color;           /* 1 .. SR_PLOT_COLORS; 0: the next colour in turn */
    int dash;            /* 0 solid, 1 dashed, 2 dotted */
    int outline;         /* bands: draw the low and high edges as thin dotted lines instead of a
                            fill, for figures with many overlapping bands */
    int open;            /* points, linespoints: open circles instead of the colour's filled symbol,
                            e.g. unstable or rejected points beside filled ones */
    int front;           /* drawn above every other series (a fitted curve over its points);
                            otherwise bands, bars, ellipses, lines, arrows, points, bottom up */
} sr_plot_series;

/* Where a panel's legend goes. Inside a panel it is a box in a corner that
 * no data crosses, chosen from the data (a corner asked for is tried
 * first); when a panel has no such corner, every legend of the figure goes
 * into the strip above the panels. */
typedef enum sr_plot_key {
    SR_PLOT_KEY_AUTO = 0,  /* a free corner */
    SR_PLOT_KEY_TOP_LEFT,
    SR_PLOT_KEY_TOP_RIGHT,
    SR_PLOT_KEY_BOTTOM_LEFT,
    SR_PLOT_KEY_BOTTOM_RIGHT,
    SR_PLOT_KEY_NONE,
    SR_PLOT_KEY_ABOVE      /* a legend strip under the titles, above all panels, laid out in
                              columns that fit the width; never covers data. Any panel asking
                              for it puts every titled series of the figure there. */
} sr_plot_key;

/* One panel's axes. Labels are plain text and should carry the unit
 * ("descent rate [m/s]"). Ranges NaN: from the data, extended to whole tic
 * steps (tight: at the data); either way a marker line is never on the frame. */
typedef struct sr_plot_axes {
    const char *title;     /* panel title, NULL for none */
    const char *xlabel, *ylabel;
    int xlog, ylog;        /* logarithmic axis */
    int equal;             /* same scale on both axes (maps, landing scatter) */
    int xtight, ytight;    /* autoscaled ends at the data (and markers), not the next tic */
    double xmin, xmax, ymin, ymax;
    sr_plot_key key;
} sr_plot_axes;

/* All NULL / 0, ranges NaN. */
void sr_plot_axes_init(sr_plot_axes *a);

/* A figure with a title (plain text). NULL when out of memory. */
sr_plot *sr_plot_new(const char *title);
void sr_plot_free(sr_plot *p);

/* A second title line in a quieter type: what the figure holds (mass,
 * atmosphere, what the shading means). */
int sr_plot_subtitle(sr_plot *p, const char *text);

/* One panel (default) or two: side by side (stacked = 0) or one above the
 * other (stacked = 1). */
int sr_plot_layout(sr_plot *p, int panels, int stacked);
int sr_plot_set_axes(sr_plot *p, int panel, const sr_plot_axes *a);

/* A data block of ncols named columns (names become the block's header
 * comment; use the unit in the name: "altitude_m"). *index receives the
 * block number for series. */
int sr_plot_block(sr_plot *p, const char *title, size_t ncols, const char *const *colnames, size_t *index);
/* Append one row of ncols values (NaN allowed: gnuplot leaves a gap). */
int sr_plot_row(sr_plot *p, size_t block, const double *values);
size_t sr_plot_block_rows(const sr_plot *p, size_t block);

int sr_plot_add(sr_plot *p, const sr_plot_series *s);

/* A marker line across a panel: axis 'x' draws a vertical line at x = value,
 * 'y' a horizontal one at y = value; label (plain, may be NULL) is written
 * beside it. style 0: a limit (red, dashed), 1: a reference (ground,
 * deployment; brown, dotted). */
int sr_plot_marker(sr_plot *p, int panel, char axis, double value, const char *label, int style);

/* A short text (plain) beside the data point (x, y) of a panel, to the upper
 * right of it: the value of a peak or of an equilibrium. It does not widen
 * the axes; anchor it at a point the series draw. At most 32 a figure. */
int sr_plot_label(sr_plot *p, int panel, double x, double y, const char *text);

/* Where and how the figure is written. */
typedef struct sr_plot_out {
    const char *prefix;    /* PREFIX: writes PREFIX.dat and PREFIX.gp */
    const char *style;     /* path of the shared style plots/sinkrate.gp, copied into the script
                              so it runs from anywhere; NULL or unreadable: plain defaults */
    const char *format;    /* "png" or "svg": the script's default output */
    int width, height;     /* pixels */
    const char *command;   /* the command line that made it, for the header (may be NULL) */
    sr_txn *txn;           /* the run's output transaction; NULL: the two files are one of their own */
} sr_plot_out;

/* Write PREFIX.dat and PREFIX.gp through o->txn (both or neither; without a
 * transaction, each is committed together at once). The caution is in both
 * files and on the figure. */
int sr_plot_write(const sr_plot *p, const sr_plot_out *o, sr_error *err);

/* Reserve PREFIX.dat, PREFIX.gp and PREFIX.<format> ("png" or "svg") in the
 * transaction before any work (what: the option, for messages): the prefix
 * names a file (not a directory, no control characters), and the three can
 * be created, their directory too if missing. */
int sr_plot_reserve(sr_txn *t, const char *what, const char *prefix, const char *format, sr_error *err);

/* Path of the data file and script for a prefix ("out/a" -> "out/a.dat"). */
void sr_plot_path(char *buf, size_t len, const char *prefix, const char *ext);
/* The same, malloc'd (NULL when out of memory). */
char *sr_plot_path_new(const char *prefix, const char *ext);

/* Write s as a gnuplot single-quoted string: no escapes, no backquote or
 * macro expansion inside; a quote is doubled, control characters become spaces. */
void sr_plot_quote(FILE *f, const char *s);

/* Look for an executable `gnuplot` on $PATH; 1 and its path when found. */
int sr_plot_find_gnuplot(char *path, size_t len);

/* Run gnuplot on PREFIX.gp to make PREFIX.<format> in the transaction t
 * (NULL: one of its own, committed at once): the script and its data are
 * read where t holds them (their temporaries before the commit), the figure
 * goes to its temporary, and gnuplot runs as t's child, so a stopped run
 * stops it too. This is the one place in sinkrate that runs another
 * program: posix_spawn of `gnuplot` (argv only, no shell), stdin from
 * /dev/null, its stderr collected into diag (may be NULL) for warnings. The
 * figure counts only when gnuplot exits 0 and the file is a complete PNG or
 * SVG (sr_plot_check_image); else SR_EIO with gnuplot's own message. */
int sr_plot_render(sr_txn *t, const char *gnuplot, const char *prefix, const char *format, char *diag,
                   size_t diaglen, sr_error *err);

/* Whether the file at path is a complete figure: a PNG whose chunks run from
 * the signature to IEND at the end of the file (PNG specification, ISO/IEC
 * 15948:2004, sec. 5), or an SVG document closed by </svg>. name: how to call
 * the file in the message. */
int sr_plot_check_image(const char *path, const char *format, const char *name, sr_error *err);

#endif
