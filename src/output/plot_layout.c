/* plot_layout.c - where everything goes on a figure, decided from its data:
 * the axis ranges (a marker line never on the frame), the legend in a corner
 * free of data or in a strip above the panels, the labels of marker lines
 * staggered or merged, labels beside the data where they hide none. */
#define _DEFAULT_SOURCE
#include "output/plot_int.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* ---- the style's sizes ---- */

void sr_plot_metrics_parse(const char *style, plot_metrics *m)
{
    *m = (plot_metrics){.ml = 92, .mr = 28, .mt = 78, .mb = 104, .gap = 84, .font = 11, .small = 8};
    if (!style)
        return;
    static const struct {
        const char *name;
        size_t off;
    } K[] = {{"sr_ml", offsetof(plot_metrics, ml)},     {"sr_mr", offsetof(plot_metrics, mr)},
             {"sr_mt", offsetof(plot_metrics, mt)},     {"sr_mb", offsetof(plot_metrics, mb)},
             {"sr_gap", offsetof(plot_metrics, gap)},   {"sr_fontsize", offsetof(plot_metrics, font)},
             {"sr_small", offsetof(plot_metrics, small)}};
    for (const char *line = style; line && *line; line = strchr(line, '\n') ? strchr(line, '\n') + 1 : NULL) {
        for (size_t k = 0; k < sizeof K / sizeof K[0]; k++) {
            size_t n = strlen(K[k].name);
            if (strncmp(line, K[k].name, n) != 0)
                continue;
            const char *s = line + n;
            s += strspn(s, " \t");
            if (*s != '=')
                continue;
            char *end;
            double v = strtod(s + 1, &end);
            if (end != s + 1 && v > 0 && v < 1000)
                *(double *)((char *)m + K[k].off) = v;
        }
    }
}

/* DejaVu Sans advance widths of ASCII 32..126, thousandths of an em (read
 * from the font's hmtx table); pngcairo draws a point as 4/3 px. */
static const short ADV[95] = {
    318, 401, 460, 838, 636, 950, 780, 275, 390, 390, 500, 838, 318, 361, 318, 337, 636, 636, 636, 636,
    636, 636, 636, 636, 636, 636, 337, 337, 838, 838, 838, 531, 1000, 684, 686, 698, 770, 632, 575, 775,
    752, 295, 295, 656, 557, 863, 748, 787, 603, 787, 695, 635, 611, 732, 684, 989, 685, 611, 685, 390,
    337, 390, 838, 500, 500, 613, 635, 550, 635, 615, 352, 635, 634, 278, 278, 579, 278, 974, 634, 612,
    635, 635, 411, 521, 392, 634, 592, 818, 592, 592, 525, 636, 337, 636, 838};

double sr_plot_text_px(const char *text, double pt)
{
    double em = 0.0;
    for (const unsigned char *c = (const unsigned char *)text; c && *c; c++) {
        if (*c >= 32 && *c < 127)
            em += ADV[*c - 32] / 1000.0;
        else if ((*c & 0xc0) != 0x80 && *c >= 0x80)
            em += 0.84; /* a letter or sign beyond ASCII (degree, Delta, minus, times): as wide as the widest */
    }
    return em * pt * 4.0 / 3.0 * 1.04 + 2.0;
}

/* ---- axis ranges ---- */

static void grow(double *lo, double *hi, double v)
{
    if (isfinite(v)) {
        if (v < *lo)
            *lo = v;
        if (v > *hi)
            *hi = v;
    }
}

static double cell(const pblock *b, size_t r, int col)
{
    return col >= 1 && (size_t)col <= b->ncols ? b->v[r * b->ncols + col - 1] : NAN;
}

/* The extent of what a panel draws along one axis: every series (bands
 * both edges, bars down to zero and their width, ellipses whole, arrows
 * both ends) and every marker line on that axis. */
static void extent(const sr_plot *p, int panel, char axis, int log, double *lo, double *hi)
{
    *lo = INFINITY;
    *hi = -INFINITY;
    int X = axis == 'x';
    for (size_t i = 0; i < p->nseries; i++) {
        const sr_plot_series *s = &p->series[i].s;
        if (s->panel != panel)
            continue;
        const pblock *b = &p->blocks[s->block];
        for (size_t r = 0; r < b->nrows; r++) {
            double v[4] = {NAN, NAN, NAN, NAN};
            switch (s->kind) {
            case SR_PLOT_BAND:
                v[0] = X ? cell(b, r, s->x) : cell(b, r, s->lo);
                v[1] = X ? NAN : cell(b, r, s->hi);
                break;
            case SR_PLOT_BAND_X:
                v[0] = X ? cell(b, r, s->lo) : cell(b, r, s->y);
                v[1] = X ? cell(b, r, s->hi) : NAN;
                break;
            case SR_PLOT_ELLIPSES: {
                double c = cell(b, r, X ? s->x : s->y);
                double half = 0.5 * fmax(fabs(cell(b, r, s->w)), fabs(cell(b, r, s->h)));
                v[0] = c - half;
                v[1] = c + half;
                break;
            }
            case SR_PLOT_BOXES:
                if (X) {
                    double w = s->w ? cell(b, r, s->w) : NAN;
                    if (!isfinite(w) && b->nrows > 1)
                        w = 0.9 * fabs(cell(b, r < b->nrows - 1 ? r + 1 : r - 1, s->x) - cell(b, r, s->x));
                    v[0] = cell(b, r, s->x) - 0.5 * (isfinite(w) ? w : 0.0);
                    v[1] = cell(b, r, s->x) + 0.5 * (isfinite(w) ? w : 0.0);
                } else {
                    v[0] = cell(b, r, s->y);
                    v[1] = log ? NAN : 0.0;
                }
                break;
            case SR_PLOT_VECTORS:
                v[0] = cell(b, r, X ? s->x : s->y);
                v[1] = v[0] + cell(b, r, X ? s->w : s->h);
                break;
            default:
                v[0] = cell(b, r, X ? s->x : s->y);
            }
            for (int k = 0; k < 4; k++)
                if (!log || v[k] > 0)
                    grow(lo, hi, v[k]);
        }
    }
    for (size_t i = 0; i < p->nmarkers; i++)
        if (p->markers[i].panel == panel && p->markers[i].axis == axis && (!log || p->markers[i].value > 0))
            grow(lo, hi, p->markers[i].value);
}

/* gnuplot's own choice of a tic step for a range (its quantize_normal_tics
 * with the guide of 20 it always uses), so a range we extend to whole steps
 * looks as gnuplot's autoscale would. */
static double tic_step(double range)
{
    double power = pow(10.0, floor(log10(range)));
    double xnorm = range / power, posns = 20.0 / xnorm, t;
    if (posns > 40)
        t = 0.05;
    else if (posns > 20)
        t = 0.1;
    else if (posns > 10)
        t = 0.2;
    else if (posns > 4)
        t = 0.5;
    else if (posns > 2)
        t = 1;
    else if (posns > 0.5)
        t = 2;
    else
        t = ceil(xnorm);
    return t * power;
}

/* The next tic step of the 1, 2, 5 sequence above step. */
static double next_step(double step)
{
    double p = pow(10.0, floor(log10(step) + 1e-9)), m = step / p;
    return (m < 1.5 ? 2.0 : m < 3.5 ? 5.0 : 10.0) * p;
}

/* gnuplot's step, made coarser until its tics are at least min_px apart on
 * an axis px long (a short panel would get its labels on top of each other). */
static double tic_step_px(double range, double px, double min_px)
{
    double st = tic_step(range);
    while (px > 0 && range / st * min_px > px)
        st = next_step(st);
    return st;
}

/* 1, 2, 5 times a power of ten at or below (up = 0) or at or above v > 0. */
static double nice125(double v, int up)
{
    double p = pow(10.0, floor(log10(v)));
    static const double M[] = {1, 2, 5, 10};
    if (up) {
        for (int k = 0; k < 4; k++)
            if (M[k] * p >= v * (1 - 1e-9))
                return M[k] * p;
        return 10 * p;
    }
    for (int k = 3; k >= 0; k--)
        if (M[k] * p <= v * (1 + 1e-9))
            return M[k] * p;
    return p;
}

/* The range of one axis: given ends kept, the rest from the data (whole tic
 * steps, or at the data for a tight axis), then every marker line at least
 * 1.5 % of the span inside the frame. */
static void axis_range(const sr_plot *p, int panel, char axis, double px, double *lo_out, double *hi_out,
                       double *step)
{
    double min_px = axis == 'x' ? 60.0 : 26.0; /* tic labels side by side need more room than stacked ones */
    const paxes *a = &p->axes[panel];
    int X = axis == 'x', log = X ? a->xlog : a->ylog, tight = X ? a->xtight : a->ytight;
    double fixlo = X ? a->xmin : a->ymin, fixhi = X ? a->xmax : a->ymax;
    double dlo, dhi;
    extent(p, panel, axis, log, &dlo, &dhi);
    *step = 0.0;
    double lo = isnan(fixlo) ? dlo : fixlo, hi = isnan(fixhi) ? dhi : fixhi;
    if (!isfinite(lo) || !isfinite(hi) || (log && (lo <= 0 || hi <= 0))) {
        *lo_out = *hi_out = NAN;
        return;
    }
    if (hi < lo) { /* a given end beyond all the data: the data's other end */
        if (isnan(fixlo))
            lo = hi - (fabs(hi) > 0 ? 0.1 * fabs(hi) : 1.0);
        else if (isnan(fixhi))
            hi = lo + (fabs(lo) > 0 ? 0.1 * fabs(lo) : 1.0);
    }
    if (hi <= lo) { /* one value: a small span around it */
        double pad = lo != 0.0 ? 0.05 * fabs(lo) : 1.0;
        if (log) {
            lo /= 1.2;
            hi *= 1.2;
        } else {
            if (isnan(fixlo))
                lo -= pad;
            if (isnan(fixhi))
                hi += pad;
            if (hi <= lo)
                hi = lo + pad;
        }
    }
    if (log) {
        if (!tight) {
            if (isnan(fixlo))
                lo = nice125(lo, 0);
            if (isnan(fixhi))
                hi = nice125(hi, 1);
        }
    } else {
        /* the ends at gnuplot's own step, the labelled tics as far apart as the panel needs */
        double fine = tic_step(hi - lo), st = tic_step_px(hi - lo, px, min_px);
        if (!tight) {
            if (isnan(fixlo))
                lo = fine * floor(lo / fine + 1e-9);
            if (isnan(fixhi))
                hi = fine * ceil(hi / fine - 1e-9);
        }
        *step = tight || !isnan(fixlo) || !isnan(fixhi) ? tic_step_px(hi - lo, px, min_px) : st;
    }
    /* marker lines off the frame: the end moves out by a tic step (or 3 % of
     * the span when the end is at the data or given) */
    for (int pass = 0; pass < 2; pass++)
        for (size_t i = 0; i < p->nmarkers; i++) {
            const pmarker *m = &p->markers[i];
            if (m->panel != panel || m->axis != axis || (log && m->value <= 0))
                continue;
            double t = log ? log10(m->value) : m->value, tl = log ? log10(lo) : lo, th = log ? log10(hi) : hi;
            double span = th - tl, near = 0.015 * span;
            double fine = !log && !tight && *step > 0 ? tic_step(span) : 0.0;
            double move = fine > 0 ? fmax(fine, 0.03 * span) : 0.03 * span;
            if (t - tl < near) {
                tl = fmin(tl, t) - move;
                if (fine > 0)
                    tl = fine * floor(tl / fine + 1e-9);
            }
            if (th - t < near) {
                th = fmax(th, t) + move;
                if (fine > 0)
                    th = fine * ceil(th / fine - 1e-9);
            }
            lo = log ? pow(10.0, tl) : tl;
            hi = log ? pow(10.0, th) : th;
        }
    *lo_out = lo;
    *hi_out = hi;
}

/* ---- graph coordinates ---- */

static double gmap(double v, double lo, double hi, int log)
{
    if (log)
        return v > 0 ? (log10(v) - log10(lo)) / (log10(hi) - log10(lo)) : NAN;
    return (v - lo) / (hi - lo);
}

static double GX(const sr_plot *p, const panel_layout *P, int panel, double x)
{
    return gmap(x, P->x0, P->x1, p->axes[panel].xlog);
}

static double GY(const sr_plot *p, const panel_layout *P, int panel, double y)
{
    return gmap(y, P->y0, P->y1, p->axes[panel].ylog);
}

static int box_overlap(const gbox *a, const gbox *b)
{
    return a->x0 < b->x1 && b->x0 < a->x1 && a->y0 < b->y1 && b->y0 < a->y1;
}

/* Whether the segment (x0,y0)-(x1,y1) meets the box (Liang-Barsky clipping). */
static int seg_hits(double x0, double y0, double x1, double y1, const gbox *b)
{
    if (!isfinite(x0) || !isfinite(y0) || !isfinite(x1) || !isfinite(y1))
        return 0;
    double t0 = 0, t1 = 1, dx = x1 - x0, dy = y1 - y0;
    double pp[4] = {-dx, dx, -dy, dy}, q[4] = {x0 - b->x0, b->x1 - x0, y0 - b->y0, b->y1 - y0};
    for (int k = 0; k < 4; k++) {
        if (pp[k] == 0) {
            if (q[k] < 0)
                return 0;
        } else {
            double t = q[k] / pp[k];
            if (pp[k] < 0) {
                if (t > t1)
                    return 0;
                if (t > t0)
                    t0 = t;
            } else {
                if (t < t0)
                    return 0;
                if (t < t1)
                    t1 = t;
            }
        }
    }
    return 1;
}

static int pt_in(double x, double y, const gbox *b)
{
    return x >= b->x0 && x <= b->x1 && y >= b->y0 && y <= b->y1;
}

/* Inside a closed polygon (even-odd). */
static int in_poly(const double *px, const double *py, int n, double x, double y)
{
    int in = 0;
    for (int i = 0, j = n - 1; i < n; j = i++)
        if ((py[i] > y) != (py[j] > y) && x < (px[j] - px[i]) * (y - py[i]) / (py[j] - py[i]) + px[i])
            in = !in;
    return in;
}

/* How many drawn pieces of a panel's data the box b (graph coordinates)
 * covers: line segments, points, band cells, bars, ellipses, arrows; with
 * markers != 0 the marker lines count too. A line is widened by its half
 * width and a point by its radius (pixels turned into graph units). */
static int data_hits(const sr_plot *p, const plot_layout *L, int panel, const gbox *box, int markers)
{
    const panel_layout *P = &L->pan[panel];
    if (!isfinite(P->x0) || !isfinite(P->y0))
        return 1;
    double ux = 1.0 / P->fw, uy = 1.0 / P->fh;
    gbox line = {box->x0 - 2 * ux, box->y0 - 2 * uy, box->x1 + 2 * ux, box->y1 + 2 * uy};
    gbox dot = {box->x0 - 5 * ux, box->y0 - 5 * uy, box->x1 + 5 * ux, box->y1 + 5 * uy};
    int hits = 0;
    for (size_t i = 0; i < p->nseries; i++) {
        const sr_plot_series *s = &p->series[i].s;
        if (s->panel != panel)
            continue;
        const pblock *b = &p->blocks[s->block];
        for (size_t r = 0; r < b->nrows; r++) {
            int last = r + 1 >= b->nrows;
            switch (s->kind) {
            case SR_PLOT_LINES:
            case SR_PLOT_LINESPOINTS:
            case SR_PLOT_POINTS: {
                double x = GX(p, P, panel, cell(b, r, s->x)), y = GY(p, P, panel, cell(b, r, s->y));
                if (s->kind != SR_PLOT_LINES && pt_in(x, y, &dot))
                    hits++;
                if (s->kind != SR_PLOT_POINTS && !last &&
                    seg_hits(x, y, GX(p, P, panel, cell(b, r + 1, s->x)), GY(p, P, panel, cell(b, r + 1, s->y)),
                             &line))
                    hits++;
                if (s->kind == SR_PLOT_LINES && !last && r == 0 && pt_in(x, y, &line))
                    hits++;
                break;
            }
            case SR_PLOT_BAND:
            case SR_PLOT_BAND_X: {
                if (last && b->nrows > 1)
                    break;
                size_t r1 = last ? r : r + 1;
                int X = s->kind == SR_PLOT_BAND;
                double a0 = cell(b, r, X ? s->x : s->y), a1 = cell(b, r1, X ? s->x : s->y);
                double l0 = cell(b, r, s->lo), l1 = cell(b, r1, s->lo), h0 = cell(b, r, s->hi), h1 = cell(b, r1, s->hi);
                if (!isfinite(a0) || !isfinite(a1) || !isfinite(l0) || !isfinite(l1) || !isfinite(h0) || !isfinite(h1))
                    break;
                double lo = fmin(fmin(l0, l1), fmin(h0, h1)), hi = fmax(fmax(l0, l1), fmax(h0, h1));
                if (s->outline) {
                    double e[4][2] = {{l0, l1}, {h0, h1}};
                    for (int k = 0; k < 2; k++) {
                        double ax = X ? GX(p, P, panel, a0) : GX(p, P, panel, e[k][0]);
                        double ay = X ? GY(p, P, panel, e[k][0]) : GY(p, P, panel, a0);
                        double bx = X ? GX(p, P, panel, a1) : GX(p, P, panel, e[k][1]);
                        double by = X ? GY(p, P, panel, e[k][1]) : GY(p, P, panel, a1);
                        if (seg_hits(ax, ay, bx, by, &line))
                            hits++;
                    }
                    break;
                }
                gbox c;
                if (X)
                    c = (gbox){GX(p, P, panel, fmin(a0, a1)), GY(p, P, panel, lo), GX(p, P, panel, fmax(a0, a1)),
                               GY(p, P, panel, hi)};
                else
                    c = (gbox){GX(p, P, panel, lo), GY(p, P, panel, fmin(a0, a1)), GX(p, P, panel, hi),
                               GY(p, P, panel, fmax(a0, a1))};
                if (c.x0 > c.x1) {
                    double t = c.x0;
                    c.x0 = c.x1;
                    c.x1 = t;
                }
                if (c.y0 > c.y1) {
                    double t = c.y0;
                    c.y0 = c.y1;
                    c.y1 = t;
                }
                c.x1 = fmax(c.x1, c.x0 + ux);
                c.y1 = fmax(c.y1, c.y0 + uy);
                if (box_overlap(&c, &line))
                    hits++;
                break;
            }
            case SR_PLOT_BOXES: {
                double x = cell(b, r, s->x), y = cell(b, r, s->y);
                double w = s->w ? cell(b, r, s->w) : NAN;
                if (!isfinite(w) && b->nrows > 1)
                    w = 0.9 * fabs(cell(b, last ? r - 1 : r + 1, s->x) - x);
                if (!isfinite(x) || !isfinite(y) || !isfinite(w))
                    break;
                double base = p->axes[panel].ylog ? P->y0 : 0.0;
                gbox c = {GX(p, P, panel, x - 0.5 * w), GY(p, P, panel, fmin(base, y)), GX(p, P, panel, x + 0.5 * w),
                          GY(p, P, panel, fmax(base, y))};
                if (box_overlap(&c, &line))
                    hits++;
                break;
            }
            case SR_PLOT_ELLIPSES: {
                double cx = cell(b, r, s->x), cy = cell(b, r, s->y), w = cell(b, r, s->w), h = cell(b, r, s->h);
                double an = cell(b, r, s->angle) * 3.14159265358979323846 / 180.0;
                if (!isfinite(cx) || !isfinite(cy) || !isfinite(w) || !isfinite(h) || !isfinite(an))
                    break;
                enum { N = 72 };
                double px[N], py[N];
                for (int k = 0; k < N; k++) {
                    double t = 2 * 3.14159265358979323846 * k / N, u = 0.5 * w * cos(t), v = 0.5 * h * sin(t);
                    px[k] = GX(p, P, panel, cx + u * cos(an) - v * sin(an));
                    py[k] = GY(p, P, panel, cy + u * sin(an) + v * cos(an));
                }
                int hit = in_poly(px, py, N, line.x0, line.y0) || in_poly(px, py, N, line.x1, line.y1) ||
                          in_poly(px, py, N, line.x0, line.y1) || in_poly(px, py, N, line.x1, line.y0);
                for (int k = 0; k < N && !hit; k++)
                    hit = seg_hits(px[k], py[k], px[(k + 1) % N], py[(k + 1) % N], &line);
                hits += hit;
                break;
            }
            case SR_PLOT_VECTORS: {
                double x = cell(b, r, s->x), y = cell(b, r, s->y);
                double ax = GX(p, P, panel, x), ay = GY(p, P, panel, y);
                double bx = GX(p, P, panel, x + cell(b, r, s->w)), by = GY(p, P, panel, y + cell(b, r, s->h));
                if (seg_hits(ax, ay, bx, by, &dot))
                    hits++;
                break;
            }
            }
        }
    }
    for (size_t i = 0; markers && i < p->nmarkers; i++) {
        const pmarker *m = &p->markers[i];
        if (m->panel != panel)
            continue;
        if (m->axis == 'x' && seg_hits(GX(p, P, panel, m->value), 0, GX(p, P, panel, m->value), 1, &line))
            hits++;
        if (m->axis == 'y' && seg_hits(0, GY(p, P, panel, m->value), 1, GY(p, P, panel, m->value), &line))
            hits++;
    }
    return hits;
}

/* ---- legend ---- */

int sr_plot_legend_kind(const sr_plot *p, size_t i)
{
    const sr_plot_series *s = &p->series[i].s;
    if (s->kind == SR_PLOT_POINTS)
        return s->open ? 4 : 2;
    if (s->kind == SR_PLOT_VECTORS)
        return 5;
    if ((s->kind == SR_PLOT_BAND || s->kind == SR_PLOT_BAND_X) && s->outline)
        return 6; /* its edges' thin dotted lines */
    if (s->kind == SR_PLOT_BOXES || s->kind == SR_PLOT_BAND || s->kind == SR_PLOT_BAND_X)
        return 3;
    if (s->kind == SR_PLOT_ELLIPSES)
        return 0; /* the outline's line */
    for (size_t j = 0; j < p->nseries; j++) {
        const sr_plot_series *b = &p->series[j].s;
        if ((b->kind == SR_PLOT_BAND || b->kind == SR_PLOT_BAND_X) && b->color == s->color && b->block == s->block &&
            !b->outline)
            return 1;
    }
    return 0;
}

static double em_px(double pt)
{
    return pt * 4.0 / 3.0;
}

/* The size of a panel's legend box in pixels; 0 entries: no legend. */
static int legend_px(const sr_plot *p, const plot_metrics *m, int panel, double *w, double *h)
{
    int n = 0;
    double tw = 0;
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].s.panel == panel && p->series[i].title) {
            n++;
            tw = fmax(tw, sr_plot_text_px(p->series[i].title, m->font));
        }
    *w = 8 + 28 + 8 + tw + 8;
    *h = n * em_px(m->font) * 1.3 + 8;
    return n;
}

/* ---- the frames ---- */

static void frames(const sr_plot *p, plot_layout *L)
{
    const plot_metrics *m = &L->m;
    double W = L->width, H = L->height;
    double mt = m->mt + (L->sub_lines > 1 ? (L->sub_lines - 1) * (m->small + 2) * 1.5 : 0);
    if (L->strip)
        mt += L->strip_rows * m->font * 1.9 + 12;
    if (L->titled)
        mt += 32;
    if (L->vrows)
        mt += 24 + 14.0 * (L->vrows - 1);
    L->mt = mt;
    L->vgap = m->gap + 40 + (L->titled ? 26 : 0) + (L->vrows ? 24 + 14.0 * (L->vrows - 1) : 0);
    double l = m->ml, r = W - m->mr, b = m->mb, t = H - mt;
    for (int k = 0; k < p->panels; k++) {
        panel_layout *P = &L->pan[k];
        if (p->panels == 1) {
            P->fx = l;
            P->fw = r - l;
            P->fy = b;
            P->fh = t - b;
        } else if (!p->stacked) {
            double w = (r - l - m->gap) / 2;
            P->fx = l + k * (w + m->gap);
            P->fw = w;
            P->fy = b;
            P->fh = t - b;
        } else {
            double h = (t - b - L->vgap) / 2;
            P->fx = l;
            P->fw = r - l;
            P->fy = t - k * (h + L->vgap) - h;
            P->fh = h;
        }
        if (P->fw < 10)
            P->fw = 10;
        if (P->fh < 10)
            P->fh = 10;
    }
}

static void ranges(const sr_plot *p, plot_layout *L)
{
    for (int k = 0; k < p->panels; k++) {
        panel_layout *P = &L->pan[k];
        axis_range(p, k, 'x', P->fw, &P->x0, &P->x1, &P->xstep);
        axis_range(p, k, 'y', P->fh, &P->y0, &P->y1, &P->ystep);
        const paxes *a = &p->axes[k];
        /* one scale on both axes: the shorter range widens about its middle to the frame's shape */
        if (a->equal && !a->xlog && !a->ylog && isfinite(P->x0) && isfinite(P->y0)) {
            double sx = (P->x1 - P->x0) / P->fw, sy = (P->y1 - P->y0) / P->fh;
            if (sx > sy) {
                double c = 0.5 * (P->y0 + P->y1), h = 0.5 * sx * P->fh;
                P->y0 = c - h;
                P->y1 = c + h;
                P->ystep = tic_step_px(P->y1 - P->y0, P->fh, 26.0);
            } else {
                double c = 0.5 * (P->x0 + P->x1), h = 0.5 * sy * P->fw;
                P->x0 = c - h;
                P->x1 = c + h;
                P->xstep = tic_step_px(P->x1 - P->x0, P->fw, 60.0);
            }
            /* a map shows its tics at the step of its longer side */
            P->xstep = P->ystep = fmax(P->xstep, P->ystep);
        }
    }
}

/* Labels of vertical marker lines sit above the frame: merged when their
 * lines coincide, right-aligned where they would run past the figure, and
 * staggered into rows where they would overlap. Returns the rows used. */
static int vertical_labels(const sr_plot *p, plot_layout *L)
{
    double pt = L->m.small + 1, gapx = 8;
    int rows = 0;
    double right_end[SR_PLOT_MAX_PANELS][4][SR_PLOT_MAX_MARKERS][2];
    int nplaced[SR_PLOT_MAX_PANELS][4] = {{0}};
    for (size_t i = 0; i < p->nmarkers && i < SR_PLOT_MAX_MARKERS; i++) {
        const pmarker *m = &p->markers[i];
        mark_place *M = &L->mark[i];
        if (m->axis != 'x' || !m->label)
            continue;
        const panel_layout *P = &L->pan[m->panel];
        M->shown = 1;
        snprintf(M->text, sizeof M->text, "%s", m->label);
        M->gx = GX(p, P, m->panel, m->value);
        M->gy = 1.0;
        if (!isfinite(M->gx) || M->gx < -1e-9 || M->gx > 1 + 1e-9) {
            M->shown = 0;
            continue;
        }
        /* the same line already labelled: one label for both */
        for (size_t j = 0; j < i; j++) {
            const pmarker *o = &p->markers[j];
            mark_place *O = &L->mark[j];
            if (O->shown && o->axis == 'x' && o->panel == m->panel && fabs(O->gx - M->gx) * P->fw < 2.0) {
                size_t l = strlen(O->text);
                snprintf(O->text + l, sizeof O->text - l, ", %s", m->label);
                M->shown = 0;
                break;
            }
        }
    }
    for (size_t i = 0; i < p->nmarkers && i < SR_PLOT_MAX_MARKERS; i++) {
        mark_place *M = &L->mark[i];
        const pmarker *m = &p->markers[i];
        if (!M->shown || m->axis != 'x')
            continue;
        const panel_layout *P = &L->pan[m->panel];
        double w = sr_plot_text_px(M->text, pt), ax = P->fx + M->gx * P->fw;
        double x0 = ax - 3, x1 = x0 + w;
        M->right = x1 > L->width - 4;
        if (M->right) {
            x1 = ax + 3;
            x0 = x1 - w;
        }
        int row = 0;
        for (; row < 4; row++) {
            int clash = 0;
            for (int k = 0; k < nplaced[m->panel][row] && !clash; k++)
                clash = x0 < right_end[m->panel][row][k][1] + gapx && right_end[m->panel][row][k][0] < x1 + gapx;
            if (!clash)
                break;
        }
        if (row == 4)
            row = 3;
        int n = nplaced[m->panel][row]++;
        right_end[m->panel][row][n][0] = x0;
        right_end[m->panel][row][n][1] = x1;
        M->row = row;
        if (row + 1 > rows)
            rows = row + 1;
    }
    return rows;
}

/* A box of w x h pixels at a corner or edge (graph coordinates), 4 px in. */
static gbox corner_box(const panel_layout *P, int where, double w, double h)
{
    double gw = w / P->fw, gh = h / P->fh, ix = 4.0 / P->fw, iy = 4.0 / P->fh;
    double x0 = where % 3 == 0 ? 1 - ix - gw : where % 3 == 1 ? ix : 0.5 - gw / 2;
    double y0 = where < 3 ? 1 - iy - gh : iy;
    return (gbox){x0, y0, x0 + gw, y0 + gh};
}

static int fits(const gbox *b)
{
    return b->x0 >= -1e-9 && b->y0 >= -1e-9 && b->x1 <= 1 + 1e-9 && b->y1 <= 1 + 1e-9;
}

/* The legends inside panels, each in a corner free of data (of marker lines
 * too if one is). 0 when a panel with a legend has no such corner. */
static int place_legends(const sr_plot *p, plot_layout *L)
{
    for (int k = 0; k < p->panels; k++) {
        panel_layout *P = &L->pan[k];
        P->legend = 0;
        double w, h;
        if (p->axes[k].key == SR_PLOT_KEY_NONE || legend_px(p, &L->m, k, &w, &h) == 0)
            continue;
        /* corners: 0 top right, 1 top left, 2 top middle, 3 bottom right, 4 bottom left, 5 bottom middle */
        int order[7] = {0, 1, 3, 4, 2, 5, -1};
        static const int PREF[] = {-1, 1, 0, 4, 3, -1, -1};
        int pref = PREF[p->axes[k].key];
        int found = 0;
        for (int strict = 1; strict >= 0 && !found; strict--)
            for (int j = -1; j < 6 && !found; j++) {
                int where = j < 0 ? pref : order[j];
                if (where < 0)
                    continue;
                gbox b = corner_box(P, where, w, h);
                if (!fits(&b) || data_hits(p, L, k, &b, strict))
                    continue;
                P->legend = 1;
                P->key = b;
                P->key_row = em_px(L->m.font) * 1.3 / P->fh;
                found = 1;
            }
        if (!found)
            return 0;
    }
    return 1;
}

/* Whether box b meets a legend box or a placed label of the panel. */
static int meets_texts(const plot_layout *L, int panel, const gbox *b, const sr_plot *p, size_t upto_mark,
                       size_t upto_label)
{
    if (L->pan[panel].legend && box_overlap(&L->pan[panel].key, b))
        return 1;
    for (size_t i = 0; i < upto_mark; i++)
        if (L->mark[i].boxed && p->markers[i].panel == panel && box_overlap(&L->mark[i].box, b))
            return 1;
    for (size_t i = 0; i < upto_label; i++)
        if (p->labels[i].panel == panel && box_overlap(&L->lab[i].box, b))
            return 1;
    return 0;
}

/* Where a label of two lines breaks: at " (" if it has one, else at the
 * space nearest its middle; 0 when it has no space. */
static size_t split_at(const char *t)
{
    const char *par = strstr(t, " (");
    if (par)
        return (size_t)(par - t);
    size_t n = strlen(t), best = 0;
    for (size_t i = 1; i + 1 < n; i++)
        if (t[i] == ' ' && (best == 0 || fabs((double)i - n / 2.0) < fabs((double)best - n / 2.0)))
            best = i;
    return best;
}

/* The wider line of a label broken at k. */
static double split_px(const char *t, size_t k, double pt)
{
    char a[256];
    snprintf(a, sizeof a, "%.*s", (int)k, t);
    return fmax(sr_plot_text_px(a, pt), sr_plot_text_px(t + k + 1, pt));
}

/* Labels of horizontal marker lines: along the line, above or below it, on
 * one line or two, where the box hides no data (the fewest pieces when
 * nowhere is free). */
static void horizontal_labels(const sr_plot *p, plot_layout *L)
{
    double pt = L->m.small + 1, th = em_px(pt) * 1.25;
    for (size_t i = 0; i < p->nmarkers && i < SR_PLOT_MAX_MARKERS; i++) {
        const pmarker *m = &p->markers[i];
        mark_place *M = &L->mark[i];
        if (m->axis != 'y' || !m->label)
            continue;
        const panel_layout *P = &L->pan[m->panel];
        double gy = GY(p, P, m->panel, m->value);
        if (!isfinite(gy) || gy < 0 || gy > 1)
            continue;
        snprintf(M->text, sizeof M->text, "%s", m->label);
        size_t k = split_at(M->text);
        double off = 3.0 / P->fh;
        int besth = 1 << 30;
        gbox bestb = {0};
        int bestright = 0, bestsplit = 0;
        for (int lines = 1; lines <= (k ? 2 : 1); lines++) {
            double gw = ((lines == 1 ? sr_plot_text_px(M->text, pt) : split_px(M->text, k, pt)) + 6) / P->fw;
            double gh = lines * th / P->fh;
            /* the ends first, then along the line */
            for (int side = 0; side < 2; side++)
                for (int a = 0; a < 21; a++) {
                    double x0 = a == 0 ? 0.985 - gw : a == 1 ? 0.015 : 0.05 * (a - 1) - gw / 2;
                    double y0 = side == 0 ? gy + off : gy - off - gh;
                    gbox b = {x0, y0, x0 + gw, y0 + gh};
                    if (!fits(&b))
                        continue;
                    int h = data_hits(p, L, m->panel, &b, 0) * 8 + meets_texts(L, m->panel, &b, p, i, 0) * 4 +
                            (lines - 1) * 2 + (a > 1 ? 1 : 0);
                    if (h < besth) {
                        besth = h;
                        bestb = b;
                        bestright = a == 0;
                        bestsplit = lines == 2;
                    }
                }
        }
        if (besth == 1 << 30)
            continue;
        M->shown = 1;
        M->boxed = 1;
        M->box = bestb;
        M->right = bestright;
        M->split = bestsplit ? k : 0;
        M->gx = M->right ? bestb.x1 - 3.0 / P->fw : bestb.x0 + 3.0 / P->fw;
        /* gnuplot puts a label's first line at its anchor and the next below */
        M->gy = bestsplit ? bestb.y1 - 0.5 * th / P->fh : 0.5 * (bestb.y0 + bestb.y1);
    }
}

/* Labels at data points: beside the point, on the side where the box hides
 * no data. */
static void point_labels(const sr_plot *p, plot_layout *L)
{
    double pt = L->m.small + 1, th = em_px(pt) * 1.25;
    for (size_t i = 0; i < p->nlabels && i < SR_PLOT_MAX_LABELS; i++) {
        const plabel *l = &p->labels[i];
        label_place *Q = &L->lab[i];
        const panel_layout *P = &L->pan[l->panel];
        double gx = GX(p, P, l->panel, l->x), gy = GY(p, P, l->panel, l->y);
        double gw = (sr_plot_text_px(l->text, pt) + 6) / P->fw, gh = th / P->fh;
        double dx = 7.0 / P->fw, dy = 5.0 / P->fh;
        int besth = 1 << 30;
        Q->gx = gx + dx;
        Q->gy = gy + dy + gh / 2;
        Q->box = (gbox){gx + dx, gy + dy, gx + dx + gw, gy + dy + gh};
        for (int c = 0; c < 4 && isfinite(gx) && isfinite(gy); c++) {
            int right = c & 1, below = c >> 1;
            double x0 = right ? gx - dx - gw : gx + dx, y0 = below ? gy - dy - gh : gy + dy;
            gbox b = {x0, y0, x0 + gw, y0 + gh};
            if (!fits(&b))
                continue;
            int h = data_hits(p, L, l->panel, &b, 0) * 2 + meets_texts(L, l->panel, &b, p, SR_PLOT_MAX_MARKERS, i);
            if (h < besth) {
                besth = h;
                Q->box = b;
                Q->right = right;
                Q->gx = right ? b.x1 - 3.0 / P->fw : b.x0 + 3.0 / P->fw;
                Q->gy = 0.5 * (b.y0 + b.y1);
            }
        }
    }
}

static int has_titles(const sr_plot *p)
{
    for (size_t i = 0; i < p->nseries; i++)
        if (p->series[i].title)
            return 1;
    return 0;
}

void sr_plot_layout_compute(const sr_plot *p, const plot_metrics *m, int width, int height, int sub_lines,
                            plot_layout *L)
{
    memset(L, 0, sizeof *L);
    L->m = *m;
    L->width = width;
    L->height = height;
    L->sub_lines = sub_lines;
    for (int k = 0; k < p->panels; k++)
        if (p->axes[k].title && p->axes[k].title[0])
            L->titled = 1;
    for (int k = 0; k < p->panels; k++)
        if (p->axes[k].key == SR_PLOT_KEY_ABOVE)
            L->strip = has_titles(p);
    for (int attempt = 0; attempt < 2; attempt++) {
        if (L->strip) {
            size_t n = 0;
            double tw = 0;
            for (size_t i = 0; i < p->nseries; i++)
                if (p->series[i].title) {
                    n++;
                    tw = fmax(tw, sr_plot_text_px(p->series[i].title, m->font));
                }
            L->strip_colw = tw + 28 + 8 + 24;
            int cols = (int)floor((width - m->ml - m->mr) / L->strip_colw);
            cols = cols < 1 ? 1 : cols > (int)n ? (int)n : cols;
            L->strip_cols = cols;
            L->strip_rows = (int)((n + (size_t)cols - 1) / (size_t)cols);
        }
        /* the rows of vertical labels depend on the ranges, which (on a map) depend on the frame */
        L->vrows = 0;
        for (int it = 0; it < 3; it++) {
            frames(p, L);
            ranges(p, L);
            memset(L->mark, 0, sizeof L->mark);
            int rows = vertical_labels(p, L);
            if (rows == L->vrows)
                break;
            L->vrows = rows;
        }
        if (L->strip || place_legends(p, L))
            break;
        L->strip = 1; /* no free corner somewhere: every legend goes above the panels */
        for (int k = 0; k < p->panels; k++)
            L->pan[k].legend = 0;
    }
    horizontal_labels(p, L);
    point_labels(p, L);
}
