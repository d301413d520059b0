/* profile_plot.c - the figures of `sinkrate profile --plot PREFIX` through
 * the plot module: PREFIX (height and speeds against time, deployments
 * marked) and PREFIX-track (the ground track with the wind along it and the
 * drift limit, and the wind profile), in the units of --units. */
#include "cli/profile_plot.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli/cliplot.h"
#include "cli/common.h"
#include "output/plot.h"
#include "output/report.h"

#define PI 3.14159265358979323846

typedef struct plot_ctx {
    sr_cli *c;
    const sr_mission *m;
    const sr_profile_ctx *ctx;
    const sr_profile_result *r;
    const sr_profile_track *tr;
    const char *ul, *uv;
} plot_ctx;

static double L(const plot_ctx *P, double x)
{
    return sr_units_from_si(x, SR_Q_LENGTH, P->c->units);
}

static double V(const plot_ctx *P, double x)
{
    return sr_units_from_si(x, SR_Q_SPEED, P->c->units);
}

static int time_figure(const plot_ctx *P, sr_plot *p)
{
    const sr_mission *m = P->m;
    const sr_profile_result *r = P->r;
    char lab[160];
    int rc = sr_plot_layout(p, 2, 0);
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.title = "height above ground";
    a.xlabel = "time [s]";
    snprintf(lab, sizeof lab, "height [%s]", P->ul);
    a.ylabel = lab;
    a.ymin = 0;
    a.xtight = 1;
    rc = rc ? rc : sr_plot_set_axes(p, 0, &a);
    char lab2[160];
    sr_plot_axes_init(&a);
    a.title = "descent rate and airspeed";
    a.xlabel = "time [s]";
    snprintf(lab2, sizeof lab2, "speed [%s]", P->uv);
    a.ylabel = lab2;
    a.ymin = 0;
    a.xtight = 1;
    rc = rc ? rc : sr_plot_set_axes(p, 1, &a);
    static const char *const COLS[] = {"time_s", "height", "descent_rate", "airspeed"};
    for (size_t b = 0; b < r->nbodies && !rc; b++) {
        char bn[256], t1[300], t2[300];
        sr_mission_set_name(m, r->body[b].sections, bn, sizeof bn);
        size_t blk;
        if ((rc = sr_plot_block(p, bn, 4, COLS, &blk)))
            break;
        for (size_t i = 0; i < P->tr->n && !rc; i++) {
            const sr_profile_point *q = &P->tr->pt[i];
            if (q->body != (int)b)
                continue;
            double row[] = {q->t, L(P, q->h), V(P, q->rate), V(P, q->speed)};
            rc = sr_plot_row(p, blk, row);
        }
        int color = (int)(b % SR_PLOT_COLORS) + 1;
        sr_plot_series h = {.kind = SR_PLOT_LINES, .panel = 0, .block = blk, .x = 1, .y = 2, .title = bn, .color = color};
        snprintf(t1, sizeof t1, "descent rate%s%s", r->nbodies > 1 ? ", " : "", r->nbodies > 1 ? bn : "");
        snprintf(t2, sizeof t2, "airspeed%s%s", r->nbodies > 1 ? ", " : "", r->nbodies > 1 ? bn : "");
        sr_plot_series d = {.kind = SR_PLOT_LINES, .panel = 1, .block = blk, .x = 1, .y = 3, .title = t1, .color = color};
        /* airspeed is close to the descent rate once the body drifts with the wind: dashed, in a colour
         * of its own and drawn over it, so both show */
        sr_plot_series s = {.kind = SR_PLOT_LINES, .panel = 1, .block = blk, .x = 1, .y = 4, .title = t2,
                            .color = (int)((b + r->nbodies) % SR_PLOT_COLORS) + 1, .dash = 1};
        if (!rc)
            rc = sr_plot_add(p, &h);
        if (!rc)
            rc = sr_plot_add(p, &d);
        if (!rc)
            rc = sr_plot_add(p, &s);
    }
    /* the deployments, on both panels */
    for (size_t i = 0; i < r->nevents && !rc; i++) {
        const sr_profile_event *e = &r->events[i];
        if (e->kind != SR_EVENT_DEPLOY || e->stage < 0)
            continue;
        snprintf(lab, sizeof lab, "%s%s", m->stages[e->stage].name, r->stage[e->stage].deployed ? "" : " (fails)");
        rc = sr_plot_marker(p, 0, 'x', e->t, lab, 1);
        if (!rc)
            rc = sr_plot_marker(p, 1, 'x', e->t, NULL, 1);
    }
    if (!rc && !isnan(m->limit_speed))
        rc = sr_plot_marker(p, 1, 'y', V(P, m->limit_speed), "touchdown limit", 0);
    return rc;
}

static int track_figure(const plot_ctx *P, sr_plot *p)
{
    const sr_mission *m = P->m;
    const sr_profile_result *r = P->r;
    const sr_profile_track *tr = P->tr;
    char xl[64], yl[64], xl2[64], yl2[64];
    double reach = 1.0, hmax = m->start_height;
    double x0 = 0, x1 = 0, y0 = 0, y1 = 0;
    for (size_t i = 0; i < tr->n; i++) {
        reach = fmax(reach, hypot(tr->pt[i].east, tr->pt[i].north));
        hmax = fmax(hmax, tr->pt[i].h);
        x0 = fmin(x0, tr->pt[i].east);
        x1 = fmax(x1, tr->pt[i].east);
        y0 = fmin(y0, tr->pt[i].north);
        y1 = fmax(y1, tr->pt[i].north);
    }
    int circle = !isnan(m->limit_drift) && m->limit_drift < 2.5 * reach;
    if (circle) {
        x0 = fmin(x0, -m->limit_drift);
        x1 = fmax(x1, m->limit_drift);
        y0 = fmin(y0, -m->limit_drift);
        y1 = fmax(y1, m->limit_drift);
    }
    /* a square box around it all, so the map with equal scales fills its panel */
    double half = 0.54 * fmax(fmax(x1 - x0, y1 - y0), 1.0), cx = 0.5 * (x0 + x1), cy = 0.5 * (y0 + y1);
    int rc = sr_plot_layout(p, 2, 0);
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.title = "ground track from the launch point";
    snprintf(xl, sizeof xl, "east [%s]", P->ul);
    snprintf(yl, sizeof yl, "north [%s]", P->ul);
    a.xlabel = xl;
    a.ylabel = yl;
    a.equal = 1;
    a.xmin = L(P, cx - half);
    a.xmax = L(P, cx + half);
    a.ymin = L(P, cy - half);
    a.ymax = L(P, cy + half);
    rc = rc ? rc : sr_plot_set_axes(p, 0, &a);
    sr_plot_axes_init(&a);
    a.title = "wind";
    snprintf(xl2, sizeof xl2, "wind speed [%s]", P->uv);
    snprintf(yl2, sizeof yl2, "height [%s]", P->ul);
    a.xlabel = xl2;
    a.ylabel = yl2;
    a.ymin = 0;
    rc = rc ? rc : sr_plot_set_axes(p, 1, &a);
    static const char *const COLS[] = {"east", "north"};
    for (size_t b = 0; b < r->nbodies && !rc; b++) {
        char bn[256];
        sr_mission_set_name(m, r->body[b].sections, bn, sizeof bn);
        size_t blk;
        if ((rc = sr_plot_block(p, bn, 2, COLS, &blk)))
            break;
        for (size_t i = 0; i < tr->n && !rc; i++)
            if (tr->pt[i].body == (int)b) {
                double row[] = {L(P, tr->pt[i].east), L(P, tr->pt[i].north)};
                rc = sr_plot_row(p, blk, row);
            }
        sr_plot_series s = {.kind = SR_PLOT_LINES, .panel = 0, .block = blk, .x = 1, .y = 2, .title = bn,
                            .color = (int)(b % SR_PLOT_COLORS) + 1};
        if (!rc)
            rc = sr_plot_add(p, &s);
    }
    /* the wind at the body's height along the track: a segment from each
     * of a few points in the direction the air moves, 6 % of the reach long
     * at the strongest wind */
    double wmax = 0.0;
    for (int i = 0; i <= 60; i++) {
        double rho, a_, g, we, wn;
        sr_profile_air(P->ctx, hmax * i / 60, &rho, &a_, &g, &we, &wn);
        wmax = fmax(wmax, hypot(we, wn));
    }
    size_t wb, pb;
    static const char *const VCOLS[] = {"east", "north", "wind_east", "wind_north"};
    if (!rc && wmax > 0 && !(rc = sr_plot_block(p, "wind along the track", 4, VCOLS, &wb))) {
        double scale = 0.06 * reach / wmax;
        for (size_t b = 0; b < r->nbodies && !rc; b++) {
            size_t n = 0, k = 0;
            for (size_t i = 0; i < tr->n; i++)
                n += tr->pt[i].body == (int)b;
            size_t every = n / 7 + 1;
            for (size_t i = 0; i < tr->n && !rc; i++) {
                const sr_profile_point *q = &tr->pt[i];
                if (q->body != (int)b || (k++ % every) != 0)
                    continue;
                double rho, a_, g, we, wn;
                sr_profile_air(P->ctx, q->h, &rho, &a_, &g, &we, &wn);
                double row[] = {L(P, q->east), L(P, q->north), L(P, scale * we), L(P, scale * wn)};
                rc = sr_plot_row(p, wb, row);
            }
        }
        /* arrows above the track, in a colour of their own: the body drifts with the wind, so the wind
         * lies along the track, and a line there would hide under it */
        sr_plot_series s = {.kind = SR_PLOT_VECTORS, .panel = 0, .block = wb, .x = 1, .y = 2, .w = 3, .h = 4,
                            .title = "wind where the body is", .color = 5};
        if (!rc)
            rc = sr_plot_add(p, &s);
    }
    /* launch point and landing points */
    static const char *const PCOLS[] = {"east", "north"};
    if (!rc && !(rc = sr_plot_block(p, "launch and landing points", 2, PCOLS, &pb))) {
        double o[] = {0.0, 0.0};
        rc = sr_plot_row(p, pb, o);
        for (size_t b = 0; b < r->nbodies && !rc; b++) {
            double row[] = {L(P, r->body[b].east), L(P, r->body[b].north)};
            rc = sr_plot_row(p, pb, row);
        }
        sr_plot_series s = {.kind = SR_PLOT_POINTS, .panel = 0, .block = pb, .x = 1, .y = 2,
                            .title = "launch, landing", .color = 6};
        if (!rc)
            rc = sr_plot_add(p, &s);
    }
    /* the drift limit as a circle, when it is within reach of the map */
    static const char *const ECOLS[] = {"east", "north", "width", "height", "angle_deg"};
    size_t eb;
    if (!rc && circle && !(rc = sr_plot_block(p, "drift limit", 5, ECOLS, &eb))) {
        double row[] = {0.0, 0.0, L(P, 2 * m->limit_drift), L(P, 2 * m->limit_drift), 0.0};
        rc = sr_plot_row(p, eb, row);
        sr_plot_series s = {.kind = SR_PLOT_ELLIPSES, .panel = 0, .block = eb, .x = 1, .y = 2, .w = 3, .h = 4,
                            .angle = 5, .title = "drift limit", .color = 2, .dash = 1};
        if (!rc)
            rc = sr_plot_add(p, &s);
    }
    /* the wind profile */
    static const char *const WCOLS[] = {"height", "speed", "east", "north"};
    size_t fb;
    if (!rc && !(rc = sr_plot_block(p, "wind profile", 4, WCOLS, &fb))) {
        for (int i = 0; i <= 200 && !rc; i++) {
            double h = hmax * i / 200, rho, a_, g, we, wn;
            sr_profile_air(P->ctx, h, &rho, &a_, &g, &we, &wn);
            double row[] = {L(P, h), V(P, hypot(we, wn)), V(P, we), V(P, wn)};
            rc = sr_plot_row(p, fb, row);
        }
        /* a colour of its own: in a legend strip above both panels it stands beside the tracks */
        sr_plot_series s = {.kind = SR_PLOT_LINES, .panel = 1, .block = fb, .x = 2, .y = 1, .title = "wind speed",
                            .color = 7};
        sr_plot_series e = {.kind = SR_PLOT_LINES, .panel = 1, .block = fb, .x = 3, .y = 1,
                            .title = "toward east", .color = 3, .dash = 1};
        sr_plot_series n = {.kind = SR_PLOT_LINES, .panel = 1, .block = fb, .x = 4, .y = 1,
                            .title = "toward north", .color = 4, .dash = 2};
        if (!rc)
            rc = sr_plot_add(p, &s);
        if (!rc)
            rc = sr_plot_add(p, &e);
        if (!rc)
            rc = sr_plot_add(p, &n);
    }
    for (size_t k = 0; k < m->nstages && !rc; k++)
        if (r->stage[k].deployed && m->stages[k].deploy == SR_DEPLOY_ALTITUDE)
            rc = sr_plot_marker(p, 1, 'y', L(P, m->stages[k].deploy_value), m->stages[k].name, 1);
    return rc;
}

static void track_prefix(const sr_cli *c, char *buf, size_t len)
{
    snprintf(buf, len, "%s-track", c->plot_prefix);
}

int sr_cli_profile_plot_reserve(sr_cli *c)
{
    char tprefix[4096];
    track_prefix(c, tprefix, sizeof tprefix);
    return c->plot_prefix ? sr_cli_plot_reserve(c, tprefix) : 0;
}

int sr_cli_profile_plot(sr_cli *c, const sr_mission *m, const sr_profile_ctx *ctx, const sr_profile_result *r,
                    const sr_profile_track *tr, int argc, char **argv)
{
    plot_ctx P = {c, m, ctx, r, tr, sr_units_label(SR_Q_LENGTH, c->units), sr_units_label(SR_Q_SPEED, c->units)};
    char sub[512], wind[256];
    sr_wind_describe(&m->wind, c->units, wind, sizeof wind);
    snprintf(sub, sizeof sub, "typical drag; wind: %s", wind);
    sr_plot *p = sr_plot_new(m->name);
    if (!p)
        return sr_cli_fail(c, "out of memory");
    int rc = sr_plot_subtitle(p, sub);
    rc = rc ? rc : time_figure(&P, p);
    if (rc) {
        sr_plot_free(p);
        return sr_cli_fail(c, "--plot: out of memory");
    }
    rc = sr_cli_plot(c, p, argc, argv);
    sr_plot_free(p);
    if (rc)
        return rc;
    /* the second figure: PREFIX-track */
    const char *prefix = c->plot_prefix;
    char tprefix[4096];
    track_prefix(c, tprefix, sizeof tprefix);
    p = sr_plot_new(m->name);
    if (!p)
        return sr_cli_fail(c, "out of memory");
    rc = sr_plot_subtitle(p, sub);
    rc = rc ? rc : track_figure(&P, p);
    if (rc) {
        sr_plot_free(p);
        return sr_cli_fail(c, "--plot: out of memory");
    }
    c->plot_prefix = tprefix;
    rc = sr_cli_plot(c, p, argc, argv);
    c->plot_prefix = prefix;
    sr_plot_free(p);
    return rc;
}
