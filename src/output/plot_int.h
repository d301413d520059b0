/* plot_int.h - the figure's parts as plot.c keeps them, and the layout that
 * plot_layout.c decides from them (private to src/output/plot*.c). */
#ifndef SR_PLOT_INT_H
#define SR_PLOT_INT_H

#include <stddef.h>

#include "output/plot.h"

typedef struct pblock {
    char *title;
    size_t ncols;
    char **names;
    double *v; /* row-major */
    size_t nrows, cap;
} pblock;

typedef struct pseries {
    sr_plot_series s;
    char *title;
} pseries;

typedef struct pmarker {
    int panel;
    char axis;
    double value;
    char *label;
    int style;
} pmarker;

typedef struct plabel {
    int panel;
    double x, y;
    char *text;
} plabel;

typedef struct paxes {
    char *title, *xlabel, *ylabel;
    int xlog, ylog, equal, xtight, ytight;
    double xmin, xmax, ymin, ymax;
    sr_plot_key key;
} paxes;

#define SR_PLOT_MAX_MARKERS 32
#define SR_PLOT_MAX_LABELS 32

struct sr_plot {
    char *title, *subtitle;
    int panels, stacked;
    paxes axes[SR_PLOT_MAX_PANELS];
    pblock *blocks;
    size_t nblocks;
    pseries *series;
    size_t nseries;
    pmarker *markers;
    size_t nmarkers;
    plabel *labels;
    size_t nlabels;
    int next_color;
};

/* The style's sizes the layout needs (pixels and points), read from the
 * shared style's "sr_name = number" lines; the defaults are plots/sinkrate.gp's. */
typedef struct plot_metrics {
    double ml, mr, mt, mb, gap; /* margins, px */
    double font, small;         /* type sizes, pt */
} plot_metrics;

void sr_plot_metrics_parse(const char *style, plot_metrics *m);

/* Width in pixels of text in DejaVu Sans at pt points as pngcairo draws it
 * (96 dpi), from the font's advance widths, a little generous. */
double sr_plot_text_px(const char *text, double pt);

/* A box in a panel's graph coordinates (0..1 across the frame). */
typedef struct gbox {
    double x0, y0, x1, y1;
} gbox;

typedef struct panel_layout {
    double x0, x1, y0, y1;     /* axis ranges; NaN: no data, gnuplot autoscales */
    double xstep, ystep;       /* major tic step of a linear axis (0: gnuplot's) */
    double fx, fy, fw, fh;     /* the frame in pixels, from the figure's bottom left */
    int legend;                /* 1: a legend box inside the panel */
    gbox key;                  /* its box */
    double key_row;            /* one entry's height, graph units */
} panel_layout;

typedef struct mark_place {
    int shown;                 /* 0: merged into another marker's label, or no label */
    char text[256];            /* the label, merged texts joined */
    double gx, gy;             /* anchor, graph coordinates */
    int right;                 /* right-aligned at the anchor */
    int row;                   /* vertical markers: row above the frame, 0 nearest */
    int boxed;                 /* an opaque box behind it (inside the frame) */
    size_t split;              /* > 0: on two lines, broken at this byte (a space) */
    gbox box;
} mark_place;

typedef struct label_place {
    double gx, gy;             /* anchor of the text */
    int right;
    gbox box;
} label_place;

typedef struct plot_layout {
    plot_metrics m;
    int width, height;
    int sub_lines;             /* lines of the subtitle */
    int strip;                 /* the legend is a strip above the panels */
    double strip_colw;         /* one strip column, px */
    int strip_cols, strip_rows;
    int vrows;                 /* rows of labels of vertical marker lines (0: none) */
    int titled;                /* some panel has a title */
    double mt, vgap;           /* the top margin and the gap of stacked panels, px */
    panel_layout pan[SR_PLOT_MAX_PANELS];
    mark_place mark[SR_PLOT_MAX_MARKERS];
    label_place lab[SR_PLOT_MAX_LABELS];
} plot_layout;

/* Decide the layout of p drawn at width x height pixels with the style's
 * metrics. */
void sr_plot_layout_compute(const sr_plot *p, const plot_metrics *m, int width, int height, int sub_lines,
                            plot_layout *L);

/* The legend sample of a titled series: 0 line, 1 line over a band patch,
 * 2 point, 3 box, 4 open point, 5 arrow, 6 thin dotted line (a band's edges). */
int sr_plot_legend_kind(const sr_plot *p, size_t i);

#endif
