/* plot.c - gnuplot data files and scripts with the shared style (rendering
 * them is plot_render.c). */
#define _DEFAULT_SOURCE
#include "output/plot.h"
#include "output/plot_int.h"

#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "output/fileio.h"
#include "output/txn.h"
#include "output/report.h"
#include "base/version.h"

static char *dupstr(const char *s)
{
    return s ? strdup(s) : NULL;
}

void sr_plot_axes_init(sr_plot_axes *a)
{
    memset(a, 0, sizeof *a);
    a->xmin = a->xmax = a->ymin = a->ymax = NAN;
}

sr_plot *sr_plot_new(const char *title)
{
    sr_plot *p = calloc(1, sizeof *p);
    if (!p)
        return NULL;
    p->title = dupstr(title ? title : "");
    p->panels = 1;
    for (int i = 0; i < SR_PLOT_MAX_PANELS; i++) {
        p->axes[i].xmin = p->axes[i].xmax = p->axes[i].ymin = p->axes[i].ymax = NAN;
    }
    if (!p->title) {
        free(p);
        return NULL;
    }
    return p;
}

void sr_plot_free(sr_plot *p)
{
    if (!p)
        return;
    for (size_t i = 0; i < p->nblocks; i++) {
        for (size_t c = 0; c < p->blocks[i].ncols; c++)
            free(p->blocks[i].names[c]);
        free(p->blocks[i].names);
        free(p->blocks[i].title);
        free(p->blocks[i].v);
    }
    free(p->blocks);
    for (size_t i = 0; i < p->nseries; i++)
        free(p->series[i].title);
    free(p->series);
    for (size_t i = 0; i < p->nmarkers; i++)
        free(p->markers[i].label);
    free(p->markers);
    for (size_t i = 0; i < p->nlabels; i++)
        free(p->labels[i].text);
    free(p->labels);
    for (int i = 0; i < SR_PLOT_MAX_PANELS; i++) {
        free(p->axes[i].title);
        free(p->axes[i].xlabel);
        free(p->axes[i].ylabel);
    }
    free(p->title);
    free(p->subtitle);
    free(p);
}

int sr_plot_subtitle(sr_plot *p, const char *text)
{
    free(p->subtitle);
    p->subtitle = dupstr(text);
    return text && !p->subtitle ? SR_ENOMEM : SR_OK;
}

int sr_plot_layout(sr_plot *p, int panels, int stacked)
{
    if (panels < 1 || panels > SR_PLOT_MAX_PANELS)
        return SR_EINVAL;
    p->panels = panels;
    p->stacked = stacked != 0;
    return SR_OK;
}

int sr_plot_set_axes(sr_plot *p, int panel, const sr_plot_axes *a)
{
    if (panel < 0 || panel >= SR_PLOT_MAX_PANELS)
        return SR_EINVAL;
    paxes *x = &p->axes[panel];
    free(x->title);
    free(x->xlabel);
    free(x->ylabel);
    x->title = dupstr(a->title);
    x->xlabel = dupstr(a->xlabel);
    x->ylabel = dupstr(a->ylabel);
    x->xlog = a->xlog;
    x->ylog = a->ylog;
    x->equal = a->equal;
    x->xtight = a->xtight;
    x->ytight = a->ytight;
    x->xmin = a->xmin;
    x->xmax = a->xmax;
    x->ymin = a->ymin;
    x->ymax = a->ymax;
    x->key = a->key;
    return SR_OK;
}

int sr_plot_block(sr_plot *p, const char *title, size_t ncols, const char *const *colnames, size_t *index)
{
    if (ncols < 1 || ncols > 64)
        return SR_EINVAL;
    pblock *n = realloc(p->blocks, (p->nblocks + 1) * sizeof *n);
    if (!n)
        return SR_ENOMEM;
    p->blocks = n;
    pblock *b = &p->blocks[p->nblocks];
    memset(b, 0, sizeof *b);
    b->ncols = ncols;
    b->title = dupstr(title ? title : "");
    b->names = calloc(ncols, sizeof *b->names);
    if (!b->title || !b->names) {
        free(b->title);
        free(b->names);
        return SR_ENOMEM;
    }
    for (size_t c = 0; c < ncols; c++)
        b->names[c] = dupstr(colnames && colnames[c] ? colnames[c] : "value");
    *index = p->nblocks++;
    return SR_OK;
}

int sr_plot_row(sr_plot *p, size_t block, const double *values)
{
    if (block >= p->nblocks)
        return SR_EINVAL;
    pblock *b = &p->blocks[block];
    if (b->nrows == b->cap) {
        size_t cap = b->cap ? 2 * b->cap : 64;
        double *n = realloc(b->v, cap * b->ncols * sizeof *n);
        if (!n)
            return SR_ENOMEM;
        b->v = n;
        b->cap = cap;
    }
    memcpy(b->v + b->nrows * b->ncols, values, b->ncols * sizeof *values);
    b->nrows++;
    return SR_OK;
}

size_t sr_plot_block_rows(const sr_plot *p, size_t block)
{
    return block < p->nblocks ? p->blocks[block].nrows : 0;
}

static int col_ok(int c, size_t ncols, int required)
{
    if (c == 0)
        return !required;
    return c >= 1 && (size_t)c <= ncols;
}

int sr_plot_add(sr_plot *p, const sr_plot_series *s)
{
    if (s->panel < 0 || s->panel >= SR_PLOT_MAX_PANELS || s->block >= p->nblocks || s->color < 0 ||
        s->color > SR_PLOT_COLORS || s->dash < 0 || s->dash > 2)
        return SR_EINVAL;
    size_t nc = p->blocks[s->block].ncols;
    int ok;
    switch (s->kind) {
    case SR_PLOT_LINES:
    case SR_PLOT_POINTS:
    case SR_PLOT_LINESPOINTS:
        ok = col_ok(s->x, nc, 1) && col_ok(s->y, nc, 1);
        break;
    case SR_PLOT_BAND:
        ok = col_ok(s->x, nc, 1) && col_ok(s->lo, nc, 1) && col_ok(s->hi, nc, 1);
        break;
    case SR_PLOT_BAND_X:
        ok = col_ok(s->y, nc, 1) && col_ok(s->lo, nc, 1) && col_ok(s->hi, nc, 1);
        break;
    case SR_PLOT_ELLIPSES:
        ok = col_ok(s->x, nc, 1) && col_ok(s->y, nc, 1) && col_ok(s->w, nc, 1) && col_ok(s->h, nc, 1) &&
             col_ok(s->angle, nc, 1);
        break;
    case SR_PLOT_BOXES:
        ok = col_ok(s->x, nc, 1) && col_ok(s->y, nc, 1) && col_ok(s->w, nc, 0);
        break;
    case SR_PLOT_VECTORS:
        ok = col_ok(s->x, nc, 1) && col_ok(s->y, nc, 1) && col_ok(s->w, nc, 1) && col_ok(s->h, nc, 1);
        break;
    default:
        ok = 0;
    }
    if (!ok)
        return SR_EINVAL;
    pseries *n = realloc(p->series, (p->nseries + 1) * sizeof *n);
    if (!n)
        return SR_ENOMEM;
    p->series = n;
    pseries *d = &p->series[p->nseries];
    d->s = *s;
    d->title = dupstr(s->title);
    if (s->title && !d->title)
        return SR_ENOMEM;
    d->s.title = NULL;
    if (d->s.color == 0)
        d->s.color = p->next_color % SR_PLOT_COLORS + 1;
    p->next_color = d->s.color % SR_PLOT_COLORS;
    p->nseries++;
    return SR_OK;
}

int sr_plot_marker(sr_plot *p, int panel, char axis, double value, const char *label, int style)
{
    if (panel < 0 || panel >= SR_PLOT_MAX_PANELS || (axis != 'x' && axis != 'y') || !isfinite(value) ||
        style < 0 || style > 1 || p->nmarkers >= SR_PLOT_MAX_MARKERS)
        return SR_EINVAL;
    pmarker *n = realloc(p->markers, (p->nmarkers + 1) * sizeof *n);
    if (!n)
        return SR_ENOMEM;
    p->markers = n;
    pmarker *m = &p->markers[p->nmarkers];
    m->panel = panel;
    m->axis = axis;
    m->value = value;
    m->style = style;
    m->label = dupstr(label);
    if (label && !m->label)
        return SR_ENOMEM;
    p->nmarkers++;
    return SR_OK;
}

int sr_plot_label(sr_plot *p, int panel, double x, double y, const char *text)
{
    if (panel < 0 || panel >= SR_PLOT_MAX_PANELS || !isfinite(x) || !isfinite(y) || !text || p->nlabels >= SR_PLOT_MAX_LABELS)
        return SR_EINVAL;
    plabel *n = realloc(p->labels, (p->nlabels + 1) * sizeof *n);
    if (!n)
        return SR_ENOMEM;
    p->labels = n;
    plabel *l = &p->labels[p->nlabels];
    l->panel = panel;
    l->x = x;
    l->y = y;
    l->text = strdup(text);
    if (!l->text)
        return SR_ENOMEM;
    p->nlabels++;
    return SR_OK;
}

void sr_plot_path(char *buf, size_t len, const char *prefix, const char *ext)
{
    snprintf(buf, len, "%s.%s", prefix, ext);
}

/* ---- writing ---- */

#define gpq sr_plot_quote

void sr_plot_quote(FILE *f, const char *s)
{
    fputc('\'', f);
    for (const unsigned char *p = (const unsigned char *)(s ? s : ""); *p; p++) {
        if (*p == '\'')
            fputs("''", f);
        else if (*p < 0x20 || *p == 0x7f)
            fputc(' ', f);
        else
            fputc(*p, f);
    }
    fputc('\'', f);
}

/* Text inside a comment line: line breaks and control characters become spaces. */
static void gpc(FILE *f, const char *s)
{
    for (const unsigned char *p = (const unsigned char *)(s ? s : ""); *p; p++)
        fputc(*p < 0x20 || *p == 0x7f ? ' ' : *p, f);
}

static void gpnum(FILE *f, double x)
{
    if (isnan(x))
        fputs("NaN", f);
    else if (isinf(x))
        fputs(x > 0 ? "Inf" : "-Inf", f);
    else
        fprintf(f, "%.9g", x);
}

/* Break text into lines of at most width characters at spaces. Returns the
 * number of lines; calls emit for each. */
static int wrap_lines(const char *text, size_t width, void (*emit)(void *, const char *, size_t, int), void *ud)
{
    int n = 0;
    const char *p = text;
    while (*p) {
        while (*p == ' ')
            p++;
        if (!*p)
            break;
        size_t len = strlen(p);
        size_t cut = len;
        if (len > width) {
            cut = width;
            while (cut > 0 && p[cut] != ' ')
                cut--;
            if (cut == 0)
                cut = width;
        }
        emit(ud, p, cut, n);
        n++;
        p += cut;
    }
    return n;
}

static void emit_comment(void *ud, const char *s, size_t n, int i)
{
    (void)i;
    fprintf((FILE *)ud, "# %.*s\n", (int)n, s);
}

static void emit_gp_piece(void *ud, const char *s, size_t n, int i)
{
    FILE *f = ud;
    char *piece = strndup(s, n);
    if (i > 0)
        fputs(" . \"\\n\" . ", f);
    gpq(f, piece ? piece : "");
    free(piece);
}

static const char *base_name(const char *path)
{
    const char *s = strrchr(path, '/');
    return s ? s + 1 : path;
}

/* Index of the polygon block drawn for BAND_X series number k. */
static size_t polygon_block(const sr_plot *p, size_t k)
{
    size_t idx = p->nblocks;
    for (size_t i = 0; i < k; i++)
        if (p->series[i].s.kind == SR_PLOT_BAND_X && !p->series[i].s.outline)
            idx++;
    return idx;
}

static void write_block_rows(FILE *f, const pblock *b)
{
    for (size_t r = 0; r < b->nrows; r++) {
        for (size_t c = 0; c < b->ncols; c++) {
            if (c)
                fputc(' ', f);
            gpnum(f, b->v[r * b->ncols + c]);
        }
        fputc('\n', f);
    }
}

static void write_data(FILE *f, const sr_plot *p, const char *name)
{
    fputs("# ", f);
    gpc(f, name);
    fputs(".dat - data for ", f);
    gpc(f, name);
    fprintf(f, ".gp, written by sinkrate %s\n# ", SR_VERSION);
    gpc(f, p->title);
    fputc('\n', f);
    if (p->subtitle) {
        fputs("# ", f);
        gpc(f, p->subtitle);
        fputc('\n', f);
    }
    wrap_lines(sr_report_caution(), 76, emit_comment, f);
    fputs("# Blocks are separated by two blank lines (gnuplot: index N).\n", f);
    size_t k = 0;
    for (size_t i = 0; i < p->nblocks; i++, k++) {
        const pblock *b = &p->blocks[i];
        fprintf(f, "%s# [%zu] ", k ? "\n\n" : "\n", k);
        gpc(f, b->title);
        fputs("\n#", f);
        for (size_t c = 0; c < b->ncols; c++) {
            fprintf(f, " %zu:", c + 1);
            gpc(f, b->names[c]);
        }
        fputc('\n', f);
        write_block_rows(f, b);
        /* gnuplot reads a block without rows as no block at all, which would
         * shift the index of every later one: one row of gaps holds its place */
        if (b->nrows == 0)
            for (size_t c = 0; c < b->ncols; c++)
                fputs(c + 1 < b->ncols ? "NaN " : "NaN\n", f);
    }
    /* a band with the spread along x is drawn as a closed outline: low side
     * going up, high side coming back */
    for (size_t s = 0; s < p->nseries; s++) {
        const sr_plot_series *se = &p->series[s].s;
        if (se->kind != SR_PLOT_BAND_X || se->outline)
            continue;
        const pblock *b = &p->blocks[se->block];
        fprintf(f, "\n\n# [%zu] outline of the band of block %zu (for filledcurves closed)\n# 1:x 2:y\n", k++,
                se->block);
        for (int pass = 0; pass < 2; pass++) {
            for (size_t j = 0; j < b->nrows; j++) {
                size_t r = pass == 0 ? j : b->nrows - 1 - j;
                const double *row = b->v + r * b->ncols;
                double y = row[se->y - 1], x = pass == 0 ? row[se->lo - 1] : row[se->hi - 1];
                if (!isfinite(y) || !isfinite(row[se->lo - 1]) || !isfinite(row[se->hi - 1]))
                    continue;
                gpnum(f, x);
                fputc(' ', f);
                gpnum(f, y);
                fputc('\n', f);
            }
        }
    }
}

static int kind_order(sr_plot_kind k)
{
    switch (k) {
    case SR_PLOT_BAND:
    case SR_PLOT_BAND_X:
        return 0;
    case SR_PLOT_BOXES:
        return 1;
    case SR_PLOT_ELLIPSES:
        return 2;
    case SR_PLOT_LINES:
    case SR_PLOT_LINESPOINTS:
        return 3;
    case SR_PLOT_VECTORS:
        return 4;
    default:
        return 5;
    }
}

/* The drawing order of a series: 0 first (bottom) .. 6 last (top). */
static int series_order(const sr_plot_series *s)
{
    return s->front ? 6 : kind_order(s->kind);
}

/* A panel's range of one axis as the layout decided it (gnuplot's autoscale
 * only when the panel has no data to decide from). */
static void write_range(FILE *f, char axis, double lo, double hi)
{
    fprintf(f, "set %crange [", axis);
    if (isfinite(lo) && isfinite(hi)) {
        gpnum(f, lo);
        fputc(':', f);
        gpnum(f, hi);
    } else {
        fputc('*', f);
        fputc(':', f);
        fputc('*', f);
    }
    fputs("]\n", f);
}

/* Tics of one axis: a linear axis at the step its range was extended to; a
 * log axis has its minor tics at 2..9 of each decade; over three decades or
 * more its labels are powers of ten, over fewer it gets labelled tics at 2
 * and 5 of each decade too. Each panel sets its own: panels share gnuplot's
 * state. */
static void write_tics(FILE *f, char axis, int log, double lo, double hi, double step)
{
    if (!log) {
        if (step > 0)
            fprintf(f, "set %ctics %.9g\n", axis, step);
        else
            fprintf(f, "set %ctics autofreq\n", axis);
        fprintf(f, "set m%ctics sr_minor\nset format %c sr_format\n", axis, axis);
        return;
    }
    fprintf(f, "set %ctics autofreq\n", axis);
    int known = lo > 0 && hi > lo && isfinite(hi);
    int wide = known && log10(hi / lo) >= 3 - 1e-9;
    fprintf(f, "set m%ctics default\nset format %c %s\n", axis, axis, wide ? "'10^{%L}'" : "sr_format");
    if (!known || wide)
        return;
    fprintf(f, "set %ctics add (", axis);
    int first = 1;
    for (int k = (int)floor(log10(lo)); k <= (int)ceil(log10(hi)); k++)
        for (int m = 2; m <= 5; m += 3) {
            double t = m * pow(10.0, k);
            if (t >= lo * (1 - 1e-9) && t <= hi * (1 + 1e-9)) {
                fprintf(f, "%s%.9g", first ? "" : ", ", t);
                first = 0;
            }
        }
    fputs(first ? "1)\n" : ")\n", f);
}

static size_t titled_series(const sr_plot *p)
{
    size_t n = 0;
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].title)
            n++;
    return n;
}

/* An opaque box of paper over the grid and the data (which the layout
 * keeps out of it), in graph coordinates: behind a legend or a label. */
static void write_box(FILE *f, int tag, const gbox *b)
{
    fprintf(f, "set object %d rect from graph %.5f, graph %.5f to graph %.5f, graph %.5f front fc rgb sr_paper "
               "fs solid 1.0 noborder\n",
            tag, b->x0, b->y0, b->x1, b->y1);
}

/* The legend box of a panel: its entries in rows, a sample and the text. */
static int write_panel_legend(FILE *f, const sr_plot *p, const plot_layout *L, int panel)
{
    const panel_layout *P = &L->pan[panel];
    int tag = 400;
    fputs("# the legend, in a corner the data leave free\n", f);
    write_box(f, tag++, &P->key);
    double ux = 1.0 / P->fw, uy = 1.0 / P->fh;
    int row = 0;
    for (size_t i = 0; i < p->nseries; i++) {
        const pseries *s = &p->series[i];
        if (s->s.panel != panel || !s->title)
            continue;
        double y = P->key.y1 - 4 * uy - (row + 0.5) * P->key_row, x0 = P->key.x0 + 8 * ux, x1 = x0 + 28 * ux;
        int kind = sr_plot_legend_kind(p, i), lt = s->s.color, dt = s->s.dash + 1;
        if (kind == 1 || kind == 3)
            fprintf(f, "set object %d rect from graph %.5f, graph %.5f to graph %.5f, graph %.5f front fc lt %d "
                       "fs transparent solid %s noborder\n",
                    tag++, x0, y - 6 * uy, x1, y + 6 * uy, lt, kind == 3 ? "0.55" : "sr_band_opacity");
        if (kind <= 1)
            fprintf(f, "set arrow %d from graph %.5f, graph %.5f to graph %.5f, graph %.5f nohead front lt %d dt %d\n",
                    tag++, x0, y, x1, y, lt, dt);
        if (kind == 6)
            fprintf(f, "set arrow %d from graph %.5f, graph %.5f to graph %.5f, graph %.5f nohead front lt %d lw 1 "
                       "dt 3\n",
                    tag++, x0, y, x1, y, lt);
        if (kind == 5)
            fprintf(f, "set arrow %d from graph %.5f, graph %.5f to graph %.5f, graph %.5f head filled "
                       "size screen 0.01,25 front lt %d dt %d\n",
                    tag++, x0, y, x1, y, lt, dt);
        if (kind == 2 || kind == 4)
            fprintf(f, "set label %d '' at graph %.5f, graph %.5f point lt %d%s front\n", tag++, 0.5 * (x0 + x1), y,
                    lt, kind == 4 ? " pt 6" : "");
        fprintf(f, "set label %d ", tag++);
        gpq(f, s->title);
        fprintf(f, " at graph %.5f, graph %.5f left front noenhanced textcolor rgb sr_ink\n", x1 + 8 * ux, y);
        row++;
    }
    return tag;
}

static void write_panel(FILE *f, const sr_plot *p, const plot_layout *L, int panel)
{
    const paxes *a = &p->axes[panel];
    const panel_layout *P = &L->pan[panel];
    fprintf(f, "\n# ---- panel %d ----\n", panel + 1);
    /* for tests and readers: where the frame is at the size the script was written for */
    fprintf(f, "# layout: frame %.1f %.1f %.1f %.1f px (left bottom width height) of %dx%d\n", P->fx, P->fy, P->fw,
            P->fh, L->width, L->height);
    if (p->panels == 1) {
        fputs("set lmargin at screen sr_l\nset rmargin at screen sr_r\n"
              "set bmargin at screen sr_b\nset tmargin at screen sr_t\n",
              f);
    } else if (!p->stacked) {
        fprintf(f, "sr_w = (sr_r - sr_l - sr_gap * 1.0 / width) / 2\n");
        fprintf(f, "set lmargin at screen sr_l + %d * (sr_w + sr_gap * 1.0 / width)\n", panel);
        fprintf(f, "set rmargin at screen sr_l + %d * (sr_w + sr_gap * 1.0 / width) + sr_w\n", panel);
        fputs("set bmargin at screen sr_b\nset tmargin at screen sr_t\n", f);
    } else {
        fputs("set lmargin at screen sr_l\nset rmargin at screen sr_r\n", f);
        fprintf(f, "sr_h = (sr_t - sr_b - sr_vgap * 1.0 / height) / 2\n");
        fprintf(f, "set tmargin at screen sr_t - %d * (sr_h + sr_vgap * 1.0 / height)\n", panel);
        fprintf(f, "set bmargin at screen sr_t - %d * (sr_h + sr_vgap * 1.0 / height) - sr_h\n", panel);
    }
    fputs("set title ", f);
    gpq(f, a->title ? a->title : "");
    /* above the labels of vertical marker lines, which sit on the frame */
    if (L->vrows)
        fprintf(f, " noenhanced offset 0,%.2f\nset xlabel ", 1.0 + 1.05 * (L->vrows - 1));
    else
        fputs(" noenhanced offset 0,0\nset xlabel ", f);
    gpq(f, a->xlabel ? a->xlabel : "");
    fputs(" noenhanced\nset ylabel ", f);
    gpq(f, a->ylabel ? a->ylabel : "");
    fputs(" noenhanced\n", f);
    fprintf(f, "%s logscale x\n%s logscale y\n", a->xlog ? "set" : "unset", a->ylog ? "set" : "unset");
    write_tics(f, 'x', a->xlog, P->x0, P->x1, P->xstep);
    write_tics(f, 'y', a->ylog, P->y0, P->y1, P->ystep);
    fputs(a->equal ? "set size ratio -1\n" : "set size noratio\n", f);
    write_range(f, 'x', P->x0, P->x1);
    write_range(f, 'y', P->y0, P->y1);
    fputs("unset key\n", f);
    int tag = 10;
    for (size_t i = 0; i < p->nmarkers; i++) {
        const pmarker *m = &p->markers[i];
        const mark_place *M = &L->mark[i];
        if (m->panel != panel)
            continue;
        int st = 100 + m->style;
        if (m->axis == 'y')
            fprintf(f, "set arrow %d from graph 0, first %.9g to graph 1, first %.9g as %d\n", tag, m->value, m->value,
                    st);
        else
            fprintf(f, "set arrow %d from first %.9g, graph 0 to first %.9g, graph 1 as %d\n", tag, m->value, m->value,
                    st);
        if (M->shown && M->boxed) {
            write_box(f, tag, &M->box);
            fprintf(f, "set label %d ", tag);
            if (M->split) {
                char first[256];
                snprintf(first, sizeof first, "%.*s", (int)M->split, M->text);
                gpq(f, first);
                fputs(" . \"\\n\" . ", f);
                gpq(f, M->text + M->split + 1);
            } else {
                gpq(f, M->text);
            }
            fprintf(f, " at graph %.5f, graph %.5f %s front noenhanced textcolor ls %d "
                       "font sprintf('%%s,%%d', sr_font, sr_small + 1)\n",
                    M->gx, M->gy, M->right ? "right" : "left", st);
        } else if (M->shown) {
            fprintf(f, "set label %d ", tag);
            gpq(f, M->text);
            fprintf(f, " at first %.9g, graph 1 %s offset %s,%.2f front noenhanced textcolor ls %d "
                       "font sprintf('%%s,%%d', sr_font, sr_small + 1)\n",
                    m->value, M->right ? "right" : "left", M->right ? "0.4" : "-0.4", 0.75 + 1.05 * M->row, st);
        }
        tag++;
    }
    for (size_t i = 0; i < p->nlabels; i++) {
        const plabel *l = &p->labels[i];
        const label_place *Q = &L->lab[i];
        if (l->panel != panel)
            continue;
        write_box(f, tag, &Q->box);
        fprintf(f, "set label %d ", tag++);
        gpq(f, l->text);
        fprintf(f, " at graph %.5f, graph %.5f %s front noenhanced textcolor rgb sr_ink "
                   "font sprintf('%%s,%%d', sr_font, sr_small + 1)\n",
                Q->gx, Q->gy, Q->right ? "right" : "left");
    }
    int ltag = P->legend ? write_panel_legend(f, p, L, panel) : 400;
    /* bands under bars under ellipses under lines under arrows under points, then the front ones */
    int first = 1;
    fputs("plot", f);
    for (int order = 0; order <= 6; order++) {
        for (size_t i = 0; i < p->nseries; i++) {
            const sr_plot_series *s = &p->series[i].s;
            if (s->panel != panel || series_order(s) != order || p->blocks[s->block].nrows == 0)
                continue;
            fputs(first ? " \\\n    " : ", \\\n    ", f);
            first = 0;
            size_t blk = s->kind == SR_PLOT_BAND_X && !s->outline ? polygon_block(p, i) : s->block;
            fprintf(f, "datafile index %zu ", blk);
            int lt = s->color, dt = s->dash + 1;
            switch (s->kind) {
            case SR_PLOT_LINES:
                fprintf(f, "using %d:%d with lines lt %d dt %d", s->x, s->y, lt, dt);
                break;
            case SR_PLOT_POINTS:
                fprintf(f, "using %d:%d with points lt %d%s", s->x, s->y, lt, s->open ? " pt 6" : "");
                break;
            case SR_PLOT_LINESPOINTS:
                fprintf(f, "using %d:%d with linespoints lt %d dt %d%s", s->x, s->y, lt, dt, s->open ? " pt 6" : "");
                break;
            case SR_PLOT_BAND:
                if (s->outline)
                    fprintf(f, "using %d:%d with lines lt %d lw 1 dt 3 notitle, \\\n    datafile index %zu using %d:%d "
                               "with lines lt %d lw 1 dt 3",
                            s->x, s->lo, lt, blk, s->x, s->hi, lt);
                else
                    fprintf(f, "using %d:%d:%d with filledcurves lt %d fs transparent solid sr_band_opacity noborder",
                            s->x, s->lo, s->hi, lt);
                break;
            case SR_PLOT_BAND_X:
                if (s->outline)
                    fprintf(f, "using %d:%d with lines lt %d lw 1 dt 3 notitle, \\\n    datafile index %zu using %d:%d "
                               "with lines lt %d lw 1 dt 3",
                            s->lo, s->y, lt, blk, s->hi, s->y, lt);
                else
                    fprintf(f, "using 1:2 with filledcurves closed lt %d fs transparent solid sr_band_opacity "
                               "noborder",
                            lt);
                break;
            case SR_PLOT_ELLIPSES:
                fprintf(f, "using %d:%d:%d:%d:%d with ellipses lt %d dt %d fs transparent solid 0.06 border lt %d",
                        s->x, s->y, s->w, s->h, s->angle, lt, dt, lt);
                break;
            case SR_PLOT_BOXES:
                if (s->w)
                    fprintf(f, "using %d:%d:%d", s->x, s->y, s->w);
                else
                    fprintf(f, "using %d:%d", s->x, s->y);
                fprintf(f, " with boxes lt %d fs solid 0.55 border lc rgb sr_paper", lt);
                break;
            case SR_PLOT_VECTORS:
                fprintf(f, "using %d:%d:%d:%d with vectors head filled size screen 0.007,25 lt %d lw 1.6 dt %d", s->x, s->y,
                        s->w, s->h, lt, dt);
                break;
            }
            if (p->series[i].title) {
                fputs(" title ", f);
                gpq(f, p->series[i].title);
            } else {
                fputs(" notitle", f);
            }
        }
    }
    if (first)
        fputs(" NaN notitle", f);
    fputc('\n', f);
    for (int t = 10; t < tag; t++)
        fprintf(f, "unset arrow %d\nunset label %d\nunset object %d\n", t, t, t);
    for (int t = 400; t < ltag; t++)
        fprintf(f, "unset arrow %d\nunset label %d\nunset object %d\n", t, t, t);
}

/* The legend as a strip of columns under the titles: a sample (a line over
 * a patch of band colour, a point, a box or an arrow) and the text for every
 * titled series. gnuplot's own key does not wrap into columns inside a
 * narrow panel, so the strip is laid out here, in the script, from the width. */
static void write_strip_legend(FILE *f, const sr_plot *p, const plot_layout *L)
{
    size_t n = titled_series(p);
    if (n == 0)
        return;
    fprintf(f, "\n# the legend: a strip of columns under the titles, above the data\narray sr_key_text[%zu] = [", n);
    size_t k = 0;
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].title) {
            fputs(k++ ? ", " : "", f);
            gpq(f, p->series[i].title);
        }
    fprintf(f, "]\narray sr_key_lt[%zu] = [", n);
    k = 0;
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].title)
            fprintf(f, "%s%d", k++ ? ", " : "", p->series[i].s.color);
    fprintf(f, "]\narray sr_key_dt[%zu] = [", n);
    k = 0;
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].title)
            fprintf(f, "%s%d", k++ ? ", " : "", p->series[i].s.dash + 1);
    /* 0 line, 1 line over a band patch, 2 point, 3 box, 4 open point, 5 arrow, 6 thin dotted line */
    fprintf(f, "]\narray sr_key_kind[%zu] = [", n);
    k = 0;
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].title)
            fprintf(f, "%s%d", k++ ? ", " : "", sr_plot_legend_kind(p, i));
    fprintf(f, "]\n"
               "sr_key_w = %.1f     # one column, px: the longest text, the sample and a gap\n"
               "sr_key_h = sr_fontsize * 1.9                 # one row, px\n"
               "sr_key_cols = floor((width - sr_ml - sr_mr) / sr_key_w)\n"
               "if (sr_key_cols < 1) sr_key_cols = 1\n"
               "if (sr_key_cols > %zu) sr_key_cols = %zu\n"
               "sr_key_top = sr_mt + 4\n"
               "sr_mt = sr_mt + ceil(%zu.0 / sr_key_cols) * sr_key_h + 12\n",
            L->strip_colw, n, n, n);
    fprintf(f, "do for [i = 1:%zu] {\n"
               "    sr_x = sr_ml + ((i - 1) %% sr_key_cols) * sr_key_w\n"
               "    sr_y = height - sr_key_top - ((i - 1) / sr_key_cols + 0.5) * sr_key_h\n"
               "    if (sr_key_kind[i] == 1 || sr_key_kind[i] == 3) {\n"
               "        set object 200 + i rect from screen sr_x / width, screen (sr_y - 6) / height "
               "to screen (sr_x + 28) / width, screen (sr_y + 6) / height fc lt sr_key_lt[i] "
               "fs transparent solid (sr_key_kind[i] == 3 ? 0.55 : sr_band_opacity) noborder\n"
               "    }\n"
               "    if (sr_key_kind[i] <= 1) {\n"
               "        set arrow 200 + i from screen sr_x / width, screen sr_y / height "
               "to screen (sr_x + 28) / width, screen sr_y / height nohead lt sr_key_lt[i] dt sr_key_dt[i]\n"
               "    }\n"
               "    if (sr_key_kind[i] == 6) {\n"
               "        set arrow 200 + i from screen sr_x / width, screen sr_y / height "
               "to screen (sr_x + 28) / width, screen sr_y / height nohead lt sr_key_lt[i] lw 1 dt 3\n"
               "    }\n"
               "    if (sr_key_kind[i] == 5) {\n"
               "        set arrow 200 + i from screen sr_x / width, screen sr_y / height "
               "to screen (sr_x + 28) / width, screen sr_y / height head filled size screen 0.01,25 "
               "lt sr_key_lt[i] dt sr_key_dt[i]\n"
               "    }\n"
               "    if (sr_key_kind[i] == 2) {\n"
               "        set label 300 + i '' at screen (sr_x + 14) / width, screen sr_y / height point lt sr_key_lt[i]\n"
               "    }\n"
               "    if (sr_key_kind[i] == 4) {\n"
               "        set label 300 + i '' at screen (sr_x + 14) / width, screen sr_y / height point lt sr_key_lt[i] "
               "pt 6\n"
               "    }\n"
               "    set label 200 + i sr_key_text[i] at screen (sr_x + 36) / width, screen sr_y / height left "
               "noenhanced textcolor rgb sr_ink\n"
               "}\n",
            n);
}

static void count_emit(void *ud, const char *s, size_t n, int i)
{
    (void)ud;
    (void)s;
    (void)n;
    (void)i;
}

static void write_script(FILE *f, const sr_plot *p, const sr_plot_out *o, const char *name, const char *style)
{
    fputs("# ", f);
    gpc(f, name);
    fprintf(f, ".gp - gnuplot script written by sinkrate %s\n# ", SR_VERSION);
    gpc(f, p->title);
    fputc('\n', f);
    if (o->command) {
        fputs("# made by: ", f);
        gpc(f, o->command);
        fputc('\n', f);
    }
    wrap_lines(sr_report_caution(), 76, emit_comment, f);
    fprintf(f, "#\n"
               "# Render again after editing:  gnuplot %s.gp   (from any directory)\n"
               "# Another format or size:      gnuplot -e \"fmt='svg'; width=1600; height=1000\" %s.gp\n"
               "# The data are in %s.dat next to this script; move the two together. The look\n"
               "# (type, colours, lines, grid) is a copy of the shared style sinkrate.gp below;\n"
               "# -e \"style='/path/other.gp'\" loads another after it. Where the legend and the\n"
               "# labels go was chosen from the data for %dx%d pixels, so that they hide none.\n\n",
            name, name, name, o->width, o->height);
    fprintf(f, "if (!exists(\"fmt\")) fmt = ");
    gpq(f, o->format);
    fprintf(f, "\nif (!exists(\"width\")) width = %d\nif (!exists(\"height\")) height = %d\n", o->width, o->height);
    fputs("# this script's directory, so that it runs from anywhere\n"
          "here = ''\n"
          "do for [i = strlen(ARG0):1:-1] { if (here eq '' && ARG0[i:i] eq '/') { here = ARG0[1:i] } }\n",
          f);
    fprintf(f, "if (!exists(\"datafile\")) datafile = here . ");
    gpq(f, name);
    fputs(" . '.dat'\n", f);
    fprintf(f, "if (!exists(\"outfile\")) outfile = here . ");
    gpq(f, name);
    fputs(" . '.' . fmt\n\n", f);
    /* the caution footnote: wrapped to the figure width (DejaVu Sans 8 pt is about 5.3 px a character) */
    size_t chars = (size_t)(o->width / 5.6);
    if (chars < 50)
        chars = 50;
    fputs("caution = ", f);
    int lines = wrap_lines(sr_report_caution(), chars, emit_gp_piece, f);
    fprintf(f, "\ncaution_lines = %d\n\n", lines);
    fputs("# plain defaults; the shared style below sets the real look\n"
          "sr_font = 'Sans'; sr_fontsize = 11; sr_titlesize = 14; sr_small = 8\n"
          "sr_paper = '#ffffff'; sr_ink = '#000000'; sr_muted = '#555555'; sr_band_opacity = 0.2\n"
          "sr_ml = 90; sr_mr = 30; sr_mt = 80; sr_mb = 100; sr_gap = 80; sr_minor = 2; sr_format = '%g'\n"
          "set style textbox opaque noborder\n",
          f);
    if (style) {
        fputs("\n# ==== the shared style (plots/sinkrate.gp), copied so that this script runs anywhere ====\n", f);
        fputs(style, f);
        if (!*style || style[strlen(style) - 1] != '\n')
            fputc('\n', f);
        fputs("# ==== end of the shared style ====\n", f);
    } else {
        fputs("# the shared style sinkrate.gp was not found when this script was written\n", f);
        fputs("set label 100 caution at screen 0.012, screen (6.0 + (caution_lines - 0.5) * sr_small * 1.45) / "
              "height left front noenhanced font sprintf('%s,%d', sr_font, sr_small) textcolor rgb sr_muted\n",
              f);
    }
    fputs("if (exists(\"style\")) load style\n", f);
    plot_metrics met;
    sr_plot_metrics_parse(style, &met);
    size_t subchars = (size_t)((o->width - 24) / 6.6);
    if (subchars < 40)
        subchars = 40;
    int sub_lines = p->subtitle ? wrap_lines(p->subtitle, subchars, count_emit, NULL) : 0;
    plot_layout *L = malloc(sizeof *L);
    if (!L) {
        fputs("exit error 'out of memory'\n", f);
        return;
    }
    sr_plot_layout_compute(p, &met, o->width, o->height, sub_lines, L);
    fputs("\nif (fmt eq 'svg') {\n"
          "    set terminal svg size width,height dynamic font sprintf('%s,%d', sr_font, sr_fontsize) "
          "background rgb sr_paper\n"
          "} else {\n"
          "    if (fmt ne 'png') { exit error \"fmt must be 'png' or 'svg'\" }\n"
          "    set terminal pngcairo size width,height font sprintf('%s,%d', sr_font, sr_fontsize) "
          "background rgb sr_paper\n"
          "}\n"
          "set output outfile\n",
          f);
    fputs("set label 101 ", f);
    gpq(f, p->title);
    fputs(" at screen 12.0 / width, screen 1 - 28.0 / height left front noenhanced "
          "font sprintf('%s,%d', sr_font, sr_titlesize) textcolor rgb sr_ink\n",
          f);
    if (p->subtitle) {
        /* wrapped to the width (10 pt is about 6.3 px a character, 6.6 to be safe with wide letters); each
         * further line pushes the panels down */
        fputs("set label 102 ", f);
        int n = wrap_lines(p->subtitle, subchars, emit_gp_piece, f);
        fputs(" at screen 12.0 / width, screen 1 - 52.0 / height left front noenhanced "
              "font sprintf('%s,%d', sr_font, sr_small + 2) textcolor rgb sr_muted\n",
              f);
        if (n > 1)
            fprintf(f, "sr_mt = sr_mt + %d * (sr_small + 2) * 1.5   # the subtitle's further lines\n", n - 1);
    }
    if (L->strip)
        write_strip_legend(f, p, L);
    if (L->titled)
        fputs("sr_mt = sr_mt + 32   # room for the panel titles\n", f);
    if (L->vrows)
        fprintf(f, "sr_mt = sr_mt + %g   # room for the labels of vertical marker lines, above the frame (%d row%s)\n",
                24 + 14.0 * (L->vrows - 1), L->vrows, L->vrows > 1 ? "s" : "");
    if (p->panels > 1 && p->stacked)
        fprintf(f, "sr_vgap = sr_gap + 40 + %g   # stacked: the upper x label and the lower title between\n",
                (L->titled ? 26 : 0) + (L->vrows ? 24 + 14.0 * (L->vrows - 1) : 0));
    fputs("sr_l = sr_ml * 1.0 / width; sr_r = 1 - sr_mr * 1.0 / width\n"
          "sr_b = sr_mb * 1.0 / height; sr_t = 1 - sr_mt * 1.0 / height\n",
          f);
    if (p->panels > 1)
        fputs("set multiplot\n", f);
    for (int k = 0; k < p->panels; k++) {
        write_panel(f, p, L, k);
        if (k == 0 && p->panels > 1) {
            fputs("# the title, legend and footnote once, not on every panel\n"
                  "unset label 100\nunset label 101\nunset label 102\n",
                  f);
            if (L->strip && titled_series(p))
                fputs("do for [i = 1:|sr_key_text|] { unset object 200 + i; unset arrow 200 + i; "
                      "unset label 200 + i; unset label 300 + i }\n",
                      f);
        }
    }
    if (p->panels > 1)
        fputs("unset multiplot\n", f);
    fputs("set output\n", f);
    free(L);
}

static int write_mem(sr_txn *t, const char *path, void (*fill)(FILE *, const void *), const void *ud,
                     sr_error *err)
{
    char *buf = NULL;
    size_t len = 0;
    FILE *m = open_memstream(&buf, &len);
    if (!m)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    fill(m, ud);
    int bad = ferror(m);
    fclose(m);
    if (bad) {
        free(buf);
        return sr_error_set(err, SR_ENOMEM, "out of memory writing %s", path);
    }
    int rc = sr_txn_write(t, path, buf, len, err);
    free(buf);
    return rc;
}

typedef struct wctx {
    const sr_plot *p;
    const sr_plot_out *o;
    const char *name;
    const char *style; /* the shared style's text, NULL when it was not found */
} wctx;

static void fill_data(FILE *f, const void *ud)
{
    const wctx *w = ud;
    write_data(f, w->p, w->name);
}

static void fill_script(FILE *f, const void *ud)
{
    const wctx *w = ud;
    write_script(f, w->p, w->o, w->name, w->style);
}

/* The prefix names a file and the format is one we render. */
static int check_names(const char *prefix, const char *format, sr_error *err)
{
    if (!prefix || !*prefix)
        return sr_error_set(err, SR_EINVAL, "empty plot file prefix");
    for (const unsigned char *c = (const unsigned char *)prefix; *c; c++)
        if (*c < 0x20 || *c == 0x7f)
            return sr_error_set(err, SR_EINVAL, "plot file prefix contains a control character");
    if (!*base_name(prefix))
        return sr_error_set(err, SR_EINVAL, "plot prefix '%s' names a directory; add a file name", prefix);
    if (!format || (strcmp(format, "png") != 0 && strcmp(format, "svg") != 0))
        return sr_error_set(err, SR_EINVAL, "plot format must be png or svg");
    return SR_OK;
}

int sr_plot_reserve(sr_txn *t, const char *what, const char *prefix, const char *format, sr_error *err)
{
    int rc = check_names(prefix, format, err);
    if (rc)
        return what && *what ? sr_error_prefix(err, "%s: ", what) : rc;
    const char *ext[3] = {"dat", "gp", format};
    for (int k = 0; k < 3 && !rc; k++) {
        char *path = sr_plot_path_new(prefix, ext[k]);
        rc = path ? sr_txn_reserve(t, what, path, SR_TXN_MKDIRS, err) : sr_error_set(err, SR_ENOMEM, "out of memory");
        free(path);
    }
    return rc;
}

int sr_plot_write(const sr_plot *p, const sr_plot_out *o, sr_error *err)
{
    int rc = check_names(o->prefix, o->format, err);
    if (rc)
        return rc;
    const char *name = base_name(o->prefix);
    if (o->width < 200 || o->width > 10000 || o->height < 150 || o->height > 10000)
        return sr_error_set(err, SR_EINVAL, "plot size %dx%d is outside 200x150 .. 10000x10000 pixels", o->width,
                            o->height);
    for (int k = 0; k < p->panels; k++) {
        size_t rows = 0;
        for (size_t i = 0; i < p->nseries; i++)
            if (p->series[i].s.panel == k)
                rows += p->blocks[p->series[i].s.block].nrows;
        if (rows == 0)
            return sr_error_set(err, SR_EINVAL, "panel %d of the figure has no data to draw", k + 1);
    }
    /* the shared style goes into the script, which then runs anywhere */
    char *style = NULL;
    size_t slen = 0;
    sr_error serr;
    if (o->style && sr_file_read(o->style, 1 << 20, &style, &slen, &serr) != SR_OK)
        style = NULL;
    wctx w = {p, o, name, style};
    /* both files or neither: the caller's transaction, or one of our own */
    sr_txn *t = o->txn ? o->txn : sr_txn_new();
    if (!t)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    char *dat = sr_plot_path_new(o->prefix, "dat"), *gp = sr_plot_path_new(o->prefix, "gp");
    rc = !dat || !gp ? sr_error_set(err, SR_ENOMEM, "out of memory") : write_mem(t, dat, fill_data, &w, err);
    if (!rc)
        rc = write_mem(t, gp, fill_script, &w, err);
    if (!rc && !o->txn)
        rc = sr_txn_commit(t, err);
    if (!o->txn)
        sr_txn_free(t);
    free(dat);
    free(gp);
    free(style);
    return rc;
}

char *sr_plot_path_new(const char *prefix, const char *ext)
{
    size_t n = strlen(prefix) + strlen(ext) + 2;
    char *s = malloc(n);
    if (s)
        sr_plot_path(s, n, prefix, ext);
    return s;
}
