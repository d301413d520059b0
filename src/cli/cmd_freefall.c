/* cmd_freefall.c - `sinkrate freefall`: the speed of a body falling without a
 * canopy, with Reynolds-dependent drag: every equilibrium at each altitude,
 * its stability, and on request the classical fixed-point iteration. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "physics/bluff.h"
#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "analysis/input_warnings.h"
#include "files/dragtable.h"

typedef struct ff_opts {
    const char *body, *diameter, *length, *mass, *cd_table, *interp, *area, *curve, *start_cd, *steps, *altitude;
    int trace;
    sr_atmos_opts atmos;
} ff_opts;

static const sr_opt OPTS[] = {
    SR_OPT_STRING("body", "B", ff_opts, body,
                  "sphere (default), cylinder (broadside, finite length), disk (thin, normal to the flow) or table"),
    SR_OPT_STRING("diameter", "D", ff_opts, diameter, "diameter; the length in the Reynolds number"),
    SR_OPT_STRING("length", "L", ff_opts, length, "cylinder length (its drag is on the projected area D x L)"),
    SR_OPT_STRING("mass", "M", ff_opts, mass, "mass of the falling body"),
    SR_OPT_STRING("curve", "NAME", ff_opts, curve,
                  "drag curve: sphere-cgw (default), sphere-morrison, sphere-brown-lawler, sphere-white, "
                  "sphere-schiller-naumann, cylinder (default), cylinder-wieselsberger, cylinder-dnv, "
                  "cylinder-sucker-brauer, disk"),
    SR_OPT_STRING("cd-table", "FILE", ff_opts, cd_table,
                  "drag table, Re increasing: CSV with the columns Re and Cd, or YAML (.yaml) with points: [[Re, "
                  "Cd], ...] and optional name, source and reference-area (\"0.02 m2\")"),
    SR_OPT_STRING("interp", "loglog|steffen", ff_opts, interp,
                  "table interpolation: straight in log-log (default) or monotone cubic (Steffen)"),
    SR_OPT_STRING("area", "A", ff_opts, area, "the table's reference area (default: the file's, else pi D^2/4)"),
    SR_OPT_STRING("altitude", "Z[,Z...]", ff_opts, altitude,
                  "altitudes above sea level, or FROM:TO:STEP (default: the site elevation, or 0)"),
    SR_OPT_FLAG("trace", ff_opts, trace, "show the fixed-point iteration at each altitude"),
    SR_OPT_STRING("start-cd", "CD", ff_opts, start_cd, "its starting drag coefficient (default 1)"),
    SR_OPT_STRING("steps", "N", ff_opts, steps, "its step limit (default 50, at most 200)"),
    SR_OPT_TEXT("The figure (with --plot): the drag curve Cd(Re) with the weight lines and every equilibrium on it "
                "and, with several altitudes, the equilibrium speeds over altitude."),
    SR_OPT_GROUP(sr_cli_group_atmos, ff_opts, atmos),
    SR_OPT_CLI_GROUP(sr_cli_group_plot),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "equilibria", "trace_N", NULL};

static int run_freefall(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_freefall = {
    .name = "freefall",
    .summary = "free-fall speed of a body with Reynolds-dependent drag",
    .usage = "usage: sinkrate freefall --body sphere|cylinder|disk --diameter D --mass M [--length L] [options]\n"
             "       sinkrate freefall --cd-table FILE --diameter D --mass M [--area A] [options]\n",
    .about = "Free-fall speed of a body without a canopy whose drag coefficient depends on the Reynolds number. "
             "Every speed where drag equals weight is found (near the drag crisis there can be two stable ones), "
             "each with its Reynolds number, drag coefficient and stability; --trace also shows the classical "
             "fixed-point iteration step by step.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_freefall,
};

/* The option a refusal of the body model is about (its error key). */
static const char *option_of(const char *key)
{
    static const char *const MAP[][2] = {
        {"curve", "--curve"}, {"diameter", "--diameter"}, {"length", "--length"}, {"mass", "--mass"}, {"area", "--area"}};
    for (size_t i = 0; i < sizeof MAP / sizeof MAP[0]; i++)
        if (strcmp(key, MAP[i][0]) == 0)
            return MAP[i][1];
    return "--body";
}

#define MAX_ALT 256
/* Cd settled to 1e-6 of itself: well past the digits a worked example shows */
#define TRACE_TOL 1e-6

/* "FROM:TO:STEP" into a list of altitudes. */
static int altitude_range(sr_cli *c, const char *text, double *out, size_t *n)
{
    char buf[256];
    if (strlen(text) >= sizeof buf)
        return sr_cli_fail(c, "--altitude: '%s' is too long", text);
    snprintf(buf, sizeof buf, "%s", text);
    char *p[3] = {buf, NULL, NULL};
    for (int k = 1; k < 3; k++) {
        char *colon = strchr(p[k - 1], ':');
        if (!colon)
            return sr_cli_fail(c, "--altitude: a range is FROM:TO:STEP, e.g. \"0:30 km:2 km\" (got '%s')", text);
        *colon = '\0';
        p[k] = colon + 1;
    }
    double v[3];
    int rc;
    for (int k = 0; k < 3; k++)
        if ((rc = sr_cli_quantity(c, "--altitude", p[k], SR_Q_LENGTH, k == 2, &v[k])))
            return rc;
    if (v[1] < v[0])
        return sr_cli_fail(c, "--altitude: the range ends (%g m) below its start (%g m)", v[1], v[0]);
    double count = floor((v[1] - v[0]) / v[2] + 1e-9) + 1;
    if (count > MAX_ALT)
        return sr_cli_fail(c, "--altitude: the range has %.0f altitudes, at most %d", count, MAX_ALT);
    *n = (size_t)count;
    for (size_t i = 0; i < *n; i++)
        out[i] = v[0] + (double)i * v[2];
    return 0;
}

/* Short labels of warning bits for the table's notes column. */
static void warn_tags(unsigned w, char *buf, size_t len)
{
    static const struct {
        unsigned bit;
        const char *tag;
    } T[] = {{SR_BLUFF_WARN_RE_LOW, "Re below curve"},
             {SR_BLUFF_WARN_RE_HIGH, "Re above curve"},
             {SR_BLUFF_WARN_ASPECT, "L/D outside data"},
             {SR_BLUFF_WARN_MACH, "Mach > 0.3"},
             {SR_BLUFF_WARN_STEP, "step in curve"}};
    buf[0] = '\0';
    for (size_t i = 0; i < sizeof T / sizeof T[0]; i++)
        if (w & T[i].bit) {
            if (buf[0])
                strncat(buf, "; ", len - strlen(buf) - 1);
            strncat(buf, T[i].tag, len - strlen(buf) - 1);
        }
}

static const char *body_word(sr_bluff_shape s)
{
    switch (s) {
    case SR_BLUFF_SPHERE: return "sphere";
    case SR_BLUFF_CYLINDER: return "circular cylinder, broadside to the flow";
    case SR_BLUFF_DISK: return "thin circular disk, normal to the flow";
    default: return "body with a drag table";
    }
}

/* ---- the figure ---------------------------------------------------------- */

typedef struct ff_result {
    double z;
    sr_air air;
    sr_bluff_equilibria eq;
} ff_result;

/* A round value at or below (up = 0) or at or above (up = 1) v > 0: 1, 2 or
 * 5 times a power of ten, for the ends of a log axis. */
static double round_125(double v, int up)
{
    static const double M[] = {1, 2, 5, 10};
    double p = pow(10.0, floor(log10(v)));
    if (up) {
        for (int i = 0; i < 4; i++)
            if (M[i] * p >= v * (1 - 1e-12))
                return M[i] * p;
        return 10 * p;
    }
    for (int i = 3; i >= 0; i--)
        if (M[i] * p <= v * (1 + 1e-12))
            return M[i] * p;
    return p;
}

/* The weight line Cd = K / Re^2 of one altitude (drag = weight, with the speed
 * written through Re = rho v D / mu), clipped to the panel: a straight line
 * on log-log axes, so its two ends suffice. */
static int weight_line(sr_plot *p, const sr_bluff_body *b, const ff_result *r, const double *box, const char *title,
                       int color)
{
    const sr_air *a = &r->air;
    double K = 2.0 * b->mass * a->g * a->rho * b->d * b->d / (b->area * a->mu * a->mu);
    double x0 = fmax(box[0], sqrt(K / box[3])), x1 = fmin(box[1], sqrt(K / box[2]));
    if (!(x1 > x0))
        return 0;
    const char *names[] = {"Re", "Cd"};
    double rows[2][2] = {{x0, K / (x0 * x0)}, {x1, K / (x1 * x1)}};
    size_t blk;
    int rc = sr_plot_block(p, title, 2, names, &blk);
    for (int i = 0; i < 2 && !rc; i++)
        rc = sr_plot_row(p, blk, rows[i]);
    sr_plot_series s = {.kind = SR_PLOT_LINES, .block = blk, .x = 1, .y = 2, .title = title, .color = color,
                        .dash = 1};
    return rc ? rc : sr_plot_add(p, &s);
}

/* Colours of the figure (the shared style's eight, in turn): the curve,
 * the weight lines, the equilibria (whose symbol is a circle, filled or open). */
#define FF_CURVE 1
#define FF_EQUILIBRIA 7
static const int FF_WEIGHT[] = {6, 3, 5};

static int figure(sr_cli *c, const sr_bluff_body *b, const sr_atmos *atm, const ff_result *res, size_t n, int argc,
                  char **argv)
{
    sr_unit_system us = c->units;
    const char *ul = sr_units_label(SR_Q_LENGTH, us), *uv = sr_units_label(SR_Q_SPEED, us);
    double lo = INFINITY, hi = 0, zlo = INFINITY, zhi = -INFINITY;
    for (size_t i = 0; i < n; i++) {
        zlo = fmin(zlo, res[i].z);
        zhi = fmax(zhi, res[i].z);
        for (size_t k = 0; k < res[i].eq.n; k++) {
            lo = fmin(lo, res[i].eq.root[k].re);
            hi = fmax(hi, res[i].eq.root[k].re);
        }
    }
    /* two decades below the equilibria and one above show where the curve goes */
    lo = pow(10.0, floor(log10(lo)) - 2);
    hi = pow(10.0, ceil(log10(hi)) + 1);
    sr_plot *p = sr_plot_new(n > 1 ? "Free fall: drag curve, equilibria and speed vs altitude"
                                   : "Free fall: drag curve and equilibria");
    if (!p)
        return sr_cli_fail(c, "out of memory");
    char sub[700], atmos[200], size[160], m[48], dl[48], ll[48];
    sr_cli_atmos_short(atm, us, atmos, sizeof atmos);
    sr_report_format_value(dl, sizeof dl, b->d, SR_Q_LENGTH, us, 3);
    sr_report_format_value(m, sizeof m, b->mass, SR_Q_MASS, us, 3);
    if (b->shape == SR_BLUFF_CYLINDER) {
        sr_report_format_value(ll, sizeof ll, b->length, SR_Q_LENGTH, us, 3);
        snprintf(size, sizeof size, "D %s, L %s", dl, ll);
    } else {
        snprintf(size, sizeof size, "D %s", dl);
    }
    snprintf(sub, sizeof sub,
             "%s, %s, %s; drag curve %s; %s. Equilibria where a dashed weight line (drag = weight at an altitude) "
             "crosses the curve: filled stable, open unstable.",
             body_word(b->shape), size, m, b->curve->name, atmos);
    int rc = sr_plot_subtitle(p, sub) || sr_plot_layout(p, n > 1 ? 2 : 1, 0);

    /* the drag curve */
    const char *cn[] = {"Re", "Cd"};
    size_t blk;
    double cdmin = INFINITY, cdmax = 0;
    char title[160];
    snprintf(title, sizeof title, "Cd(Re), %s", b->curve->name);
    rc = rc || sr_plot_block(p, title, 2, cn, &blk);
    for (int i = 0; i <= 400 && !rc; i++) {
        double re = lo * pow(hi / lo, i / 400.0), row[2] = {re, sr_bluff_body_cd(b, re, NULL)};
        cdmin = fmin(cdmin, row[1]);
        cdmax = fmax(cdmax, row[1]);
        rc = sr_plot_row(p, blk, row);
    }
    sr_plot_series curve = {.kind = SR_PLOT_LINES, .block = blk, .x = 1, .y = 2, .title = title, .color = FF_CURVE};
    rc = rc || sr_plot_add(p, &curve);

    char yl[160];
    snprintf(yl, sizeof yl, "drag coefficient Cd (%s)", b->area_ref);
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.title = n > 1 ? "drag curve and weight lines" : NULL;
    a.xlabel = "Reynolds number (length D)";
    a.ylabel = yl;
    a.xlog = a.ylog = 1;
    a.xmin = lo;
    a.xmax = hi;
    a.ymin = round_125(cdmin / 2, 0);
    a.ymax = round_125(cdmax * 2, 1);
    a.key = SR_PLOT_KEY_ABOVE;
    rc = rc || sr_plot_set_axes(p, 0, &a);
    double box[4] = {a.xmin, a.xmax, a.ymin, a.ymax};

    /* weight lines: the first, middle and last altitude (more would hide the curve) */
    size_t pick[3] = {0, n / 2, n - 1}, npick = n < 3 ? n : 3;
    for (size_t j = 0; j < npick && !rc; j++) {
        char z[48];
        sr_report_format_value(z, sizeof z, res[pick[j]].z, SR_Q_LENGTH, us, SR_FIXED(0));
        snprintf(title, sizeof title, "weight at %s", z);
        rc = weight_line(p, b, &res[pick[j]], box, title, FF_WEIGHT[j]);
    }

    /* the equilibria: stable and unstable, on the curve and over altitude */
    char zn[48], vn[48];
    snprintf(zn, sizeof zn, "altitude[%s]", ul);
    snprintf(vn, sizeof vn, "speed[%s]", uv);
    const char *en[] = {"Re", "Cd", zn, vn};
    size_t eb[2];
    int single = 1;
    rc = rc || sr_plot_block(p, "unstable equilibria", 4, en, &eb[0]) ||
         sr_plot_block(p, "stable equilibria", 4, en, &eb[1]);
    for (size_t i = 0; i < n && !rc; i++) {
        single &= res[i].eq.n == 1;
        for (size_t k = 0; k < res[i].eq.n && !rc; k++) {
            const sr_bluff_root *r = &res[i].eq.root[k];
            double row[4] = {r->re, r->cd, sr_units_from_si(res[i].z, SR_Q_LENGTH, us),
                             sr_units_from_si(r->v, SR_Q_SPEED, us)};
            rc = sr_plot_row(p, eb[r->stable != 0], row);
            if (!rc && n == 1) {
                char v[48], label[96];
                sr_report_format_value(v, sizeof v, r->v, SR_Q_SPEED, us, 3);
                snprintf(label, sizeof label, "%s, %s", v, r->stable ? "stable" : "unstable");
                rc = sr_plot_label(p, 0, r->re, r->cd, label);
            }
        }
    }
    for (int s = 1; s >= 0 && !rc; s--) {
        if (sr_plot_block_rows(p, eb[s]) == 0)
            continue;
        sr_plot_series on_curve = {.kind = SR_PLOT_POINTS, .block = eb[s], .x = 1, .y = 2, .color = FF_EQUILIBRIA,
                                   .open = !s, .title = s ? "stable equilibrium" : "unstable equilibrium"};
        /* one equilibrium at every altitude: one branch, drawn as a line */
        sr_plot_series over_z = {.kind = s && single ? SR_PLOT_LINESPOINTS : SR_PLOT_POINTS, .panel = 1,
                                 .block = eb[s], .x = 4, .y = 3, .color = FF_EQUILIBRIA, .open = !s};
        rc = sr_plot_add(p, &on_curve) || (n > 1 && sr_plot_add(p, &over_z));
    }

    /* the curve's own validity range, when the axis goes beyond it */
    char mark[64];
    if (!rc && b->curve->re_min > lo) {
        snprintf(mark, sizeof mark, "curve data from Re %.3g", b->curve->re_min);
        rc = sr_plot_marker(p, 0, 'x', b->curve->re_min, mark, 1);
    }
    if (!rc && isfinite(b->curve->re_max) && b->curve->re_max < hi) {
        snprintf(mark, sizeof mark, "to Re %.3g", b->curve->re_max);
        rc = sr_plot_marker(p, 0, 'x', b->curve->re_max, mark, 1);
    }

    if (!rc && n > 1) {
        char xl[64], zl[96];
        snprintf(xl, sizeof xl, "free-fall speed [%s]", uv);
        snprintf(zl, sizeof zl, "altitude above sea level [%s]", ul);
        sr_plot_axes_init(&a);
        a.title = "equilibrium speed vs altitude";
        a.xlabel = xl;
        a.ylabel = zl;
        a.xmin = 0;
        double pad = 0.04 * (zhi - zlo);
        a.ymin = sr_units_from_si(zlo - pad, SR_Q_LENGTH, us);
        a.ymax = sr_units_from_si(zhi + pad, SR_Q_LENGTH, us);
        a.key = SR_PLOT_KEY_NONE;
        rc = sr_plot_set_axes(p, 1, &a);
    }
    if (rc)
        rc = sr_cli_fail(c, "out of memory");
    else
        rc = sr_cli_plot(c, p, argc, argv);
    sr_plot_free(p);
    return rc;
}

/* ---- the command --------------------------------------------------------- */

static void report_trace(sr_report *r, sr_cli *c, size_t idx, const ff_result *res, const sr_bluff_trace *t)
{
    char key[48], title[160], alt[64];
    sr_report_format_value(alt, sizeof alt, res->z, SR_Q_LENGTH, c->units, SR_FIXED(0));
    snprintf(key, sizeof key, "trace_%zu", idx + 1);
    snprintf(title, sizeof title, "Fixed-point iteration at %s (start: Cd = %g)", alt, t->cd0);
    sr_rtable *tb = sr_report_table(r, key, title);
    sr_rtable_column(tb, "step", "step", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_column(tb, "cd_used", "Cd used", SR_Q_NONE, 5);
    sr_rtable_column(tb, "speed", "speed from balance", SR_Q_SPEED, 5);
    sr_rtable_column(tb, "reynolds", "Re", SR_Q_NONE, 5);
    sr_rtable_column(tb, "cd_curve", "Cd from curve", SR_Q_NONE, 5);
    sr_rtable_text_column(tb, "notes", "notes");
    for (size_t k = 0; k < t->n; k++) {
        const sr_bluff_step *s = &t->step[k];
        double row[] = {(double)(k + 1), s->cd, s->v, s->re, s->cd_next};
        char tags[128];
        warn_tags(s->warn, tags, sizeof tags);
        const char *tx[] = {tags};
        sr_rtable_row(tb, row, tx);
    }
    const sr_bluff_step *last = &t->step[t->n - 1];
    char v[64];
    switch (t->outcome) {
    case SR_TRACE_CONVERGED:
        sr_report_format_value(v, sizeof v, last->v, SR_Q_SPEED, c->units, 5);
        if (t->root >= 0)
            sr_report_note(r, "Iteration at %s: converged in %zu steps%s to %s, equilibrium %d of %zu (%s).%s", alt,
                           t->n, t->alternating ? ", jumping above and below" : "", v, t->root + 1, res->eq.n,
                           res->eq.root[t->root].stable ? "stable" : "unstable",
                           res->eq.n > 1 ? " The iteration does not show the other equilibria." : "");
        else
            sr_report_note(r, "Iteration at %s: settled at %s, which is not one of the equilibria (a step in the "
                              "drag curve).", alt, v);
        break;
    case SR_TRACE_CYCLE:
        sr_report_warning(r, "Iteration at %s: repeats a cycle of %d steps and never settles; the equilibria are "
                             "those in the table, not any value of the cycle.", alt, t->period);
        break;
    case SR_TRACE_OSCILLATING:
        sr_report_warning(r, "Iteration at %s: still jumping above and below after %zu steps, with no sign of "
                             "settling; the equilibria are those in the table.", alt, t->n);
        break;
    default:
        sr_report_warning(r, "Iteration at %s: not converged after %zu steps (tolerance %g on Cd); the equilibria "
                             "are those in the table.", alt, t->n, t->tol);
        break;
    }
}

static int run_freefall(sr_cli *c, int argc, char **argv)
{
    ff_opts o;
    memset(&o, 0, sizeof o);
    int rc = sr_cli_parse_options(c, argc, argv, &o, NULL);
    if (rc)
        return rc;

    sr_bluff_shape shape = SR_BLUFF_SPHERE;
    if (o.body) {
        static const char *names[] = {"sphere", "cylinder", "disk", "table"};
        int found = -1;
        for (int i = 0; i < 4; i++)
            if (strcmp(o.body, names[i]) == 0)
                found = i;
        if (found < 0)
            return sr_cli_fail(c, "--body: '%s' is not one of sphere, cylinder, disk, table", o.body);
        shape = (sr_bluff_shape)found;
    } else if (o.cd_table) {
        shape = SR_BLUFF_TABLE;
    }
    if (shape == SR_BLUFF_TABLE && !o.cd_table)
        return sr_cli_fail(c, "--cd-table: a table body needs its drag table (columns Re, Cd)");
    if (shape != SR_BLUFF_TABLE && o.cd_table)
        return sr_cli_fail(c, "--cd-table: a drag table goes with --body table, not --body %s", o.body);
    if (o.cd_table && (rc = sr_cli_input(c, "--cd-table", o.cd_table)))
        return rc;
    if (shape == SR_BLUFF_TABLE && o.curve)
        return sr_cli_fail(c, "--curve: a table body takes its curve from --cd-table");
    if (shape != SR_BLUFF_TABLE && (o.interp || o.area))
        return sr_cli_fail(c, "%s: only for a table body (--cd-table)", o.interp ? "--interp" : "--area");
    if (shape != SR_BLUFF_CYLINDER && o.length)
        return sr_cli_fail(c, "--length: only a cylinder has a length");
    if (!o.diameter)
        return sr_cli_fail(c, "--diameter: the body's diameter is required");
    if (shape == SR_BLUFF_CYLINDER && !o.length)
        return sr_cli_fail(c, "--length: a cylinder needs its length");
    if (!o.trace && (o.start_cd || o.steps))
        return sr_cli_fail(c, "%s: goes with --trace", o.start_cd ? "--start-cd" : "--steps");

    double d, mass = NAN, len = 0, area = NAN, cd0 = 1.0;
    long steps = 50;
    if ((rc = sr_cli_quantity(c, "--diameter", o.diameter, SR_Q_LENGTH, 1, &d)) ||
        (rc = sr_cli_mass(c, o.mass, "the body's mass", &mass)))
        return rc;
    if (o.length && (rc = sr_cli_quantity(c, "--length", o.length, SR_Q_LENGTH, 1, &len)))
        return rc;
    if (o.area && (rc = sr_cli_quantity(c, "--area", o.area, SR_Q_AREA, 1, &area)))
        return rc;
    if (o.start_cd && (rc = sr_cli_quantity(c, "--start-cd", o.start_cd, SR_Q_NONE, 1, &cd0)))
        return rc;
    if (o.steps && (rc = sr_cli_count(c, "--steps", o.steps, 1, SR_BLUFF_TRACE_MAX, &steps)))
        return rc;
    sr_bluff_interp kind = SR_BLUFF_LOGLOG;
    if (o.interp) {
        if (strcmp(o.interp, "steffen") == 0)
            kind = SR_BLUFF_STEFFEN;
        else if (strcmp(o.interp, "loglog") != 0)
            return sr_cli_fail(c, "--interp: '%s' is not one of loglog, steffen", o.interp);
    }

    sr_error e;
    sr_bluff_curve curve;
    memset(&curve, 0, sizeof curve);
    if (shape == SR_BLUFF_TABLE) {
        if (sr_dragtable_load(&curve, o.cd_table, kind, &e))
            return sr_cli_fail(c, "--cd-table: %s", e.msg);
    } else {
        sr_bluff_curve_id id = sr_bluff_default_curve(shape);
        if (o.curve && sr_bluff_curve_lookup(o.curve, &id, &e))
            return sr_cli_fail(c, "--curve: %s", e.msg);
        if (sr_bluff_curve_init(&curve, id, &e))
            return sr_cli_fail(c, "--curve: %s", e.msg);
    }
    sr_bluff_body body;
    if (sr_bluff_body_init(&body, shape, &curve, d, len, mass, area, &e)) {
        sr_bluff_curve_free(&curve);
        return sr_cli_fail(c, "%s: %s", option_of(e.key), e.msg);
    }

    sr_atmos atm;
    double ground = 0;
    sr_report *r = NULL;
    ff_result *res = NULL;
    double *alt = NULL;
    size_t nalt = 1;
    if ((rc = sr_cli_atmos(c, &o.atmos, &atm, &ground)))
        goto out;
    alt = malloc(MAX_ALT * sizeof *alt);
    res = calloc(MAX_ALT, sizeof *res);
    if (!alt || !res) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    alt[0] = ground;
    if (o.altitude) {
        if (strchr(o.altitude, ':') && !strchr(o.altitude, ','))
            rc = altitude_range(c, o.altitude, alt, &nalt);
        else
            rc = sr_cli_quantity_list(c, "--altitude", o.altitude, SR_Q_LENGTH, alt, MAX_ALT, &nalt);
        if (rc)
            goto out;
    }
    for (size_t i = 0; i < nalt; i++) {
        res[i].z = alt[i];
        if (sr_atmos_at(&atm, alt[i], &res[i].air, &e)) {
            rc = sr_cli_fail(c, "--altitude: %s", e.msg);
            goto out;
        }
        if (sr_bluff_equilibria_find(&body, &res[i].air, &res[i].eq, &e)) {
            char a[64];
            sr_report_format_value(a, sizeof a, alt[i], SR_Q_LENGTH, c->units, SR_FIXED(0));
            rc = sr_cli_fail(c, "at %s: %s", a, e.msg);
            rc = e.code == SR_EIMPOSSIBLE ? SR_EXIT_LIMIT : SR_EXIT_USAGE;
            goto out;
        }
    }

    r = sr_report_new("freefall", "free fall with Reynolds-dependent drag");
    sr_report_section(r, "Inputs");
    sr_report_text(r, "body", "body", body_word(shape));
    sr_report_value(r, "diameter", "diameter D (length in Re)", d, SR_Q_LENGTH, 4);
    if (shape == SR_BLUFF_CYLINDER) {
        sr_report_value(r, "length", "length L", len, SR_Q_LENGTH, 4);
        sr_report_value(r, "aspect_ratio", "L/D", len / d, SR_Q_NONE, 3);
    }
    sr_report_value(r, "mass", "mass", mass, SR_Q_MASS, 4);
    sr_report_value(r, "reference_area", "reference area of Cd", body.area, SR_Q_AREA, 4);
    sr_report_text(r, "reference_area_is", "reference area is the", body.area_ref);
    sr_report_text(r, "drag_curve", "drag curve", curve.name);
    sr_report_text(r, "drag_curve_source", "source", curve.source);
    char range[128];
    if (curve.re_min > 0 && isfinite(curve.re_max))
        snprintf(range, sizeof range, "Re %.3g to %.3g", curve.re_min, curve.re_max);
    else if (isfinite(curve.re_max))
        snprintf(range, sizeof range, "Re up to %.3g", curve.re_max);
    else
        snprintf(range, sizeof range, "all Re");
    sr_report_text(r, "drag_curve_range", "valid for", range);
    if (shape == SR_BLUFF_TABLE)
        sr_report_text(r, "interpolation", "interpolation",
                       kind == SR_BLUFF_STEFFEN ? "monotone cubic (Steffen) in log Re, log Cd"
                                                : "straight lines in log Re, log Cd");
    if (shape == SR_BLUFF_CYLINDER)
        sr_report_text(r, "length_factor", "finite-length factor",
                       "DNV-RP-C205 kappa by L/D (subcritical below Re 2e5, supercritical above 5e5, blended)");
    sr_cli_report_atmos(r, &atm);

    sr_rtable *t = sr_report_table(r, "equilibria", "Equilibrium speeds (drag = weight)");
    sr_rtable_column(t, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "density", "density", SR_Q_DENSITY, 4);
    sr_rtable_column(t, "number", "#", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_column(t, "speed", "speed", SR_Q_SPEED, 4);
    sr_rtable_column(t, "reynolds", "Re", SR_Q_NONE, 4);
    sr_rtable_column(t, "cd", "Cd", SR_Q_NONE, 3);
    sr_rtable_text_column(t, "stability", "stability");
    sr_rtable_column(t, "mach", "Mach", SR_Q_NONE, 2);
    sr_rtable_column(t, "energy", "energy", SR_Q_ENERGY, 3);
    sr_rtable_text_column(t, "notes", "notes");
    unsigned allwarn = 0;
    for (size_t i = 0; i < nalt; i++) {
        const sr_bluff_equilibria *q = &res[i].eq;
        size_t nstable = 0;
        for (size_t k = 0; k < q->n; k++) {
            const sr_bluff_root *x = &q->root[k];
            double row[] = {res[i].z, res[i].air.rho, (double)(k + 1), x->v, x->re, x->cd,
                            x->mach > 0 ? x->mach : NAN, 0.5 * mass * x->v * x->v};
            char tags[128];
            warn_tags(x->warn, tags, sizeof tags);
            const char *tx[] = {x->stable ? "stable" : "unstable", tags};
            sr_rtable_row(t, row, tx);
            nstable += x->stable && !(x->warn & SR_BLUFF_WARN_STEP);
        }
        allwarn |= q->warn;
        if (q->n > 1) {
            char a[64];
            sr_report_format_value(a, sizeof a, res[i].z, SR_Q_LENGTH, c->units, SR_FIXED(0));
            sr_report_warning(r, "At %s the body has %zu equilibrium speeds, %zu of them stable: which one it falls "
                                 "at depends on how it got there (a fixed-point iteration picks one without saying "
                                 "so). Plan for the fastest stable one.", a, q->n, nstable);
        }
    }
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    sr_input_warnings_value(&iw, SR_PLAUS_MASS, mass, "mass", c->units);
    sr_input_warnings_value(&iw, SR_PLAUS_BODY_SIZE, d, "body diameter", c->units);
    if (shape == SR_BLUFF_CYLINDER)
        sr_input_warnings_value(&iw, SR_PLAUS_BODY_SIZE, len, "body length", c->units);
    sr_cli_report_input_warnings(r, &iw);
    for (unsigned bit = 1; bit <= SR_BLUFF_WARN_TRUNCATED; bit <<= 1)
        if (allwarn & bit)
            sr_report_warning(r, "%s.", sr_bluff_warn_text(bit));
    sr_report_note(r, "Every speed where drag equals weight, 1/2 rho v^2 Cd(Re) A = m g, found by scanning for sign "
                      "changes over Re %g to %g and refining each with a bracketing solver (Brent). Stable: drag grows "
                      "with speed through the equilibrium, so a disturbed body returns to it.",
                   res[0].eq.re_lo, res[0].eq.re_hi);
    sr_report_note(r, "Energy is the kinetic energy 1/2 m v^2 at that speed (ground impact at the ground altitude).");

    if (o.trace) {
        for (size_t i = 0; i < nalt; i++) {
            sr_bluff_trace tr;
            if (sr_bluff_trace_run(&body, &res[i].air, cd0, (int)steps, TRACE_TOL, &res[i].eq, &tr, &e)) {
                rc = sr_cli_fail_err(c, &e);
                goto out;
            }
            report_trace(r, c, i, &res[i], &tr);
        }
        sr_report_note(r, "The fixed-point iteration: take Cd, get the speed from the drag balance "
                          "v = sqrt(2 m g / (rho A Cd)), its Reynolds number Re = rho v D / mu, look up Cd(Re), repeat "
                          "until Cd changes by less than %g of itself.", TRACE_TOL);
    }
    if (c->plot_prefix && (rc = figure(c, &body, &atm, res, nalt, argc, argv)))
        goto out;
    rc = sr_cli_emit(c, r);
out:
    sr_report_free(r);
    free(res);
    free(alt);
    sr_atmos_release(&atm);
    sr_bluff_curve_free(&curve);
    return rc;
}
