/* fit_plot.c - the figures of `sinkrate fit --plot PREFIX` through the plot
 * module, in the units of --units: the fit over time with its residuals,
 * the drag area over height against the catalog band, the opening force. */
#include "cli/fit_plot.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/cliplot.h"
#include "cli/common.h"
#include "output/plot.h"

static double L(const sr_cli *c, double x)
{
    return sr_units_from_si(x, SR_Q_LENGTH, c->units);
}

static const char *base_name(const char *p)
{
    const char *b = strrchr(p, '/');
    return b ? b + 1 : p;
}

static int time_figure(sr_cli *c, sr_plot *p, sr_fit_result **res, size_t nlogs, const sr_fit_setup *S)
{
    const char *ul = sr_units_label(SR_Q_LENGTH, c->units);
    char yl[64], rl[64];
    int rc = sr_plot_layout(p, 2, 1);
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.title = "height above ground: the log, the fitted steady descent, the segments";
    a.xlabel = "time [s]";
    snprintf(yl, sizeof yl, "height [%s]", ul);
    a.ylabel = yl;
    a.xtight = 1;
    a.key = SR_PLOT_KEY_AUTO;
    rc = rc ? rc : sr_plot_set_axes(p, 0, &a);
    sr_plot_axes_init(&a);
    a.title = "residuals of the fit (log - model); open: dropped as outliers";
    a.xlabel = "time [s]";
    snprintf(rl, sizeof rl, "residual [%s]", ul);
    a.ylabel = rl;
    a.xtight = 1;
    a.key = SR_PLOT_KEY_NONE;
    rc = rc ? rc : sr_plot_set_axes(p, 1, &a);
    static const char *const COLS[] = {"time_s", "height", "model", "residual", "dropped_height", "dropped_residual"};
    for (size_t l = 0; l < nlogs && !rc; l++) {
        const sr_fit_result *R = res[l];
        size_t blk;
        if ((rc = sr_plot_block(p, base_name(R->path), 6, COLS, &blk)))
            break;
        /* the residual panel shows the kept points in full and the dropped ones clipped to it */
        for (size_t i = 0; i < R->n && !rc; i++) {
            double res_i = isnan(R->model[i]) ? NAN : R->h[i] - R->model[i];
            int drop = R->rejected[i];
            double row[] = {R->t[i],
                            drop ? NAN : L(c, R->h[i]),
                            isnan(R->model[i]) ? NAN : L(c, R->model[i]),
                            drop ? NAN : L(c, res_i),
                            drop ? L(c, R->h[i]) : NAN,
                            drop ? L(c, res_i) : NAN};
            rc = sr_plot_row(p, blk, row);
        }
        char t1[300], t2[300];
        snprintf(t1, sizeof t1, "%s%s", nlogs > 1 ? base_name(R->path) : "log", nlogs > 1 ? "" : " (true height)");
        snprintf(t2, sizeof t2, "fitted model%s%s", nlogs > 1 ? ", " : "", nlogs > 1 ? base_name(R->path) : "");
        int color = (int)(2 * l % SR_PLOT_COLORS) + 1;
        sr_plot_series s1 = {.kind = SR_PLOT_POINTS, .panel = 0, .block = blk, .x = 1, .y = 2, .title = t1,
                             .color = color};
        sr_plot_series s2 = {.kind = SR_PLOT_LINES, .panel = 0, .block = blk, .x = 1, .y = 3, .title = t2,
                             .color = color + 1, .front = 1}; /* over the log's points, which would hide it */
        sr_plot_series s3 = {.kind = SR_PLOT_POINTS, .panel = 0, .block = blk, .x = 1, .y = 5,
                             .title = l == 0 ? "dropped (spikes, dropouts)" : NULL, .color = 2, .open = 1};
        sr_plot_series s4 = {.kind = SR_PLOT_POINTS, .panel = 1, .block = blk, .x = 1, .y = 4, .color = color};
        if (!rc)
            rc = sr_plot_add(p, &s1);
        if (!rc)
            rc = sr_plot_add(p, &s3);
        if (!rc)
            rc = sr_plot_add(p, &s2);
        if (!rc)
            rc = sr_plot_add(p, &s4);
    }
    /* the segments of the first log */
    const sr_fit_result *R = res[0];
    if (!rc)
        rc = sr_plot_marker(p, 0, 'x', R->t_apogee, "apogee", 1);
    for (size_t k = 0; k < R->nstages && !rc; k++) {
        if (fabs(R->stage[k].t_deploy - R->t_apogee) > 0.5)
            rc = sr_plot_marker(p, 0, 'x', R->stage[k].t_deploy, S[0].stage[k].name, 1);
        if (!rc)
            rc = sr_plot_marker(p, 1, 'x', R->stage[k].t0, NULL, 1);
        if (!rc)
            rc = sr_plot_marker(p, 1, 'x', R->stage[k].t1, NULL, 1);
    }
    if (!rc)
        rc = sr_plot_marker(p, 0, 'x', R->t_touch, R->touchdown ? "touchdown" : "log ends", 1);
    if (!rc)
        rc = sr_plot_marker(p, 1, 'y', 0.0, NULL, 1);
    return rc;
}

static int drag_figure(sr_cli *c, sr_plot *p, sr_fit_result **res, size_t nlogs, const sr_fit_setup *S)
{
    const char *ul = sr_units_label(SR_Q_LENGTH, c->units), *ua = sr_units_label(SR_Q_AREA, c->units);
    char xl[64], yl[64];
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.title = "drag area over height: smoothed point estimate 2 m g / (rho v^2), fit, catalog band";
    snprintf(xl, sizeof xl, "drag area CdS, total [%s]", ua);
    snprintf(yl, sizeof yl, "height [%s]", ul);
    a.xlabel = xl;
    a.ylabel = yl;
    a.ymin = 0;
    a.key = SR_PLOT_KEY_AUTO;
    int rc = sr_plot_set_axes(p, 0, &a);
    double xmax = 0;
    static const char *const COLS[] = {"height", "drag_area"};
    for (size_t l = 0; l < nlogs && !rc; l++) {
        const sr_fit_result *R = res[l];
        size_t blk;
        if ((rc = sr_plot_block(p, base_name(R->path), 2, COLS, &blk)))
            break;
        for (size_t i = 0; i < R->n && !rc; i++) {
            double v = R->cds_local[i];
            double row[] = {L(c, R->smooth[i] - R->ground), sr_units_from_si(v, SR_Q_AREA, c->units)};
            if (!isnan(v) && R->t[i] >= R->stage[0].t0 - 1.0)
                rc = sr_plot_row(p, blk, row);
        }
        sr_plot_series s = {.kind = SR_PLOT_LINES, .panel = 0, .block = blk, .x = 2, .y = 1,
                            .title = nlogs > 1 ? base_name(R->path) : "point estimate (smoothed rate)",
                            .color = (int)(l % SR_PLOT_COLORS) + 1};
        if (!rc)
            rc = sr_plot_add(p, &s);
    }
    /* per stage: the fit and its interval over the window, the catalog band */
    static const char *const BC[] = {"height", "low", "high", "fit"};
    const sr_fit_result *R = res[0];
    for (size_t k = 0; k < R->nstages && !rc; k++) {
        const sr_fit_stage *st = &R->stage[k];
        const sr_fit_stage_spec *sp = &S[0].stage[k];
        double htop = st->h_deploy, hbot = k + 1 < R->nstages ? R->stage[k + 1].h_deploy : 0.0;
        char name[128];
        snprintf(name, sizeof name, "%s fit", sp->name);
        size_t fb;
        if ((rc = sr_plot_block(p, name, 4, BC, &fb)))
            break;
        for (int e = 0; e < 2 && !rc; e++) {
            double row[] = {L(c, e ? htop : hbot), sr_units_from_si(st->cds_lo, SR_Q_AREA, c->units),
                            sr_units_from_si(st->cds_hi, SR_Q_AREA, c->units),
                            sr_units_from_si(st->cds, SR_Q_AREA, c->units)};
            rc = sr_plot_row(p, fb, row);
        }
        xmax = fmax(xmax, st->cds_hi);
        char t1[160];
        snprintf(t1, sizeof t1, "fitted, %s", sp->name);
        sr_plot_series f = {.kind = SR_PLOT_LINES, .panel = 0, .block = fb, .x = 4, .y = 1, .title = t1,
                            .color = 3 + (int)k};
        sr_plot_series fi = {.kind = SR_PLOT_BAND_X, .panel = 0, .block = fb, .y = 1, .lo = 2, .hi = 3,
                             .color = 3 + (int)k};
        if (!rc)
            rc = sr_plot_add(p, &fi);
        if (!rc)
            rc = sr_plot_add(p, &f);
        if (!rc && sp->has_canopy) {
            const sr_canopy *cp = &sp->canopy;
            double kk = cp->count * cp->cluster_factor * cp->s0.typ, base = st->cds - st->own;
            snprintf(name, sizeof name, "%s catalog band", sp->name);
            size_t cb;
            if ((rc = sr_plot_block(p, name, 4, BC, &cb)))
                break;
            for (int e = 0; e < 2 && !rc; e++) {
                double row[] = {L(c, e ? htop : hbot),
                                sr_units_from_si(base + cp->fam.cd0.v.lo * kk, SR_Q_AREA, c->units),
                                sr_units_from_si(base + cp->fam.cd0.v.hi * kk, SR_Q_AREA, c->units), NAN};
                rc = sr_plot_row(p, cb, row);
            }
            xmax = fmax(xmax, base + cp->fam.cd0.v.hi * kk);
            char t2[160];
            snprintf(t2, sizeof t2, "catalog band, %s (%s)", sp->name, cp->fam.id);
            sr_plot_series b = {.kind = SR_PLOT_BAND_X, .panel = 0, .block = cb, .y = 1, .lo = 2, .hi = 3,
                                .title = t2, .color = 3 + (int)k, .outline = 1};
            if (!rc)
                rc = sr_plot_add(p, &b);
        }
    }
    if (!rc) {
        /* the point estimate runs off during transients: the axis holds the fits and bands */
        a.xmin = 0;
        a.xmax = sr_units_from_si(1.6 * xmax, SR_Q_AREA, c->units);
        rc = sr_plot_set_axes(p, 0, &a);
    }
    return rc;
}

static int opening_figure(sr_cli *c, sr_plot *p, sr_fit_result **res, const sr_fit_setup *S, const double *acc,
                          int *any)
{
    (void)c;
    const sr_fit_result *R = res[0];
    const char *uf = sr_units_label(SR_Q_FORCE, c->units);
    char yl[64];
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.title = "opening force: mass x specific force along the axis";
    a.xlabel = "time from the deployment [s]";
    snprintf(yl, sizeof yl, "force [%s]", uf);
    a.ylabel = yl;
    a.key = SR_PLOT_KEY_AUTO;
    int rc = sr_plot_set_axes(p, 0, &a);
    static const char *const COLS[] = {"time_s", "force"};
    *any = 0;
    for (size_t k = 0; k < R->nstages && !rc; k++) {
        const sr_fit_stage *st = &R->stage[k];
        if (!st->opening.measured)
            continue;
        *any = 1;
        size_t blk;
        if ((rc = sr_plot_block(p, S[0].stage[k].name, 2, COLS, &blk)))
            break;
        for (size_t i = 0; i < R->n && !rc; i++)
            if (R->t[i] >= st->t_deploy - 1.0 && R->t[i] <= st->t_deploy + 4.0) {
                double row[] = {R->t[i] - st->t_deploy,
                                sr_units_from_si(S[0].stage[k].mass * acc[i], SR_Q_FORCE, c->units)};
                rc = sr_plot_row(p, blk, row);
            }
        /* the peak in the key: a label beside a broad peak would cover the data after it */
        char ttl[160];
        snprintf(ttl, sizeof ttl, "%s, peak %.0f %s", S[0].stage[k].name,
                 sr_units_from_si(st->opening.force, SR_Q_FORCE, c->units), uf);
        sr_plot_series s = {.kind = SR_PLOT_LINESPOINTS, .panel = 0, .block = blk, .x = 1, .y = 2,
                            .title = ttl, .color = (int)k + 1};
        if (!rc)
            rc = sr_plot_add(p, &s);
        const sr_fit_opening *o = &st->opening;
        if (rc || !(o->exponent > 0))
            continue;
        /* the fitted inflation model over the same second before and four after */
        enum { NM = 201 };
        double ts[NM], fm[NM];
        for (int i = 0; i < NM; i++)
            ts[i] = -1.0 + 5.0 * i / (NM - 1);
        if (sr_fit_opening_curve(o, ts, NM, fm, NULL) != SR_OK)
            continue;
        snprintf(ttl, sizeof ttl, "%s, fitted model: n %.3g, t_f %.3g s, load factor %.3g", S[0].stage[k].name,
                 o->exponent, o->t_fill, o->olf);
        if ((rc = sr_plot_block(p, ttl, 2, COLS, &blk)))
            break;
        for (int i = 0; i < NM && !rc; i++) {
            double row[] = {ts[i], sr_units_from_si(fm[i], SR_Q_FORCE, c->units)};
            rc = sr_plot_row(p, blk, row);
        }
        sr_plot_series sm = {.kind = SR_PLOT_LINES, .panel = 0, .block = blk, .x = 1, .y = 2, .title = ttl,
                             .color = (int)k + 1, .dash = 1};
        if (!rc)
            rc = sr_plot_add(p, &sm);
    }
    return rc;
}

static int emit(sr_cli *c, sr_plot *p, const char *suffix, int argc, char **argv)
{
    char prefix[4096];
    snprintf(prefix, sizeof prefix, "%s%s", c->plot_prefix, suffix);
    return sr_cli_plot_to(c, p, prefix, argc, argv);
}

int sr_cli_fit_plots(sr_cli *c, sr_fit_result **res, size_t nlogs, const sr_fit_setup *setups, int argc, char **argv)
{
    char title[600];
    snprintf(title, sizeof title, "Drag areas from %s%s", base_name(res[0]->path), nlogs > 1 ? " and more" : "");
    sr_plot *p = sr_plot_new(title);
    if (!p)
        return sr_cli_fail(c, "out of memory");
    /* the analysis words the conversion in SI (the report's note); a figure speaks the units of --units */
    char sub[600], air[256];
    const char *conv = res[0]->conversion, *paren = strstr(conv, "site's air (");
    if (c->units != SR_UNITS_SI && setups[0].atmos && paren) {
        sr_cli_atmos_short(setups[0].atmos, c->units, air, sizeof air);
        snprintf(sub, sizeof sub, "%.*s (%s)", (int)(paren + strlen("site's air") - conv), conv, air);
        conv = sub;
    }
    int rc = sr_plot_subtitle(p, conv);
    rc = rc ? rc : time_figure(c, p, res, nlogs, setups);
    if (rc) {
        sr_plot_free(p);
        return sr_cli_fail(c, "--plot: out of memory");
    }
    rc = emit(c, p, "", argc, argv);
    sr_plot_free(p);
    if (rc)
        return rc;
    p = sr_plot_new(title);
    if (!p)
        return sr_cli_fail(c, "out of memory");
    rc = sr_plot_subtitle(p, "shaded: the fit's interval; dotted: the family's catalog band on this canopy's nominal area");
    rc = rc ? rc : drag_figure(c, p, res, nlogs, setups);
    if (rc) {
        sr_plot_free(p);
        return sr_cli_fail(c, "--plot: out of memory");
    }
    rc = emit(c, p, "-drag", argc, argv);
    sr_plot_free(p);
    if (rc)
        return rc;
    return 0;
}

int sr_cli_fit_plot_opening(sr_cli *c, sr_fit_result **res, const sr_fit_setup *setups, const double *acc, int argc,
                        char **argv)
{
    if (!acc)
        return 0;
    char title[600];
    snprintf(title, sizeof title, "Opening from %s", base_name(res[0]->path));
    sr_plot *p = sr_plot_new(title);
    if (!p)
        return sr_cli_fail(c, "out of memory");
    int any = 0;
    int rc = opening_figure(c, p, res, setups, acc, &any);
    if (rc) {
        sr_plot_free(p);
        return sr_cli_fail(c, "--plot: out of memory");
    }
    rc = any ? emit(c, p, "-opening", argc, argv) : 0;
    sr_plot_free(p);
    return rc;
}
