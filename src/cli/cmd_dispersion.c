/* cmd_dispersion.c - `sinkrate dispersion FILE`: Monte Carlo landing scatter
 * of a mission: footprint per landing body, ellipses, radii, percentiles of
 * descent time and touchdown speed, and how likely each limit is broken. */
#define _DEFAULT_SOURCE
#include <csv.h>
#include <errno.h>
#include <math.h>
#include <omp.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "cli/maps.h"
#include "output/txn.h"
#include "analysis/input_warnings.h"
#include "cli/progress.h"
#include "analysis/dispersion.h"
#include "analysis/dispersion_mission.h"
#include "files/mission.h"
#include "base/rng.h"
#include "analysis/scatter.h"

#define PI 3.14159265358979323846
#define DEFAULT_RISK 0.01   /* accepted probability per limit: our choice, stated in --help */
#define PLOT_POINTS 20000   /* landing points drawn per body; the statistics use every sample */
#define HIST_BINS 40
/* style colours: bodies take 1, 3, 4, 8; 2 is the limit, 5 nominal, 6 the ellipses and mean, 7 launch */
static const int BODY_COLOR[4] = {1, 3, 4, 8};

typedef struct disp_opts {
    const char *n, *samples, *risk, *geojson, *geojson_samples;
    int full;
} disp_opts;

static const sr_opt OPTS[] = {
    SR_OPT_SHORT_STRING('n', NULL, "N", disp_opts, n, "samples (default 10000, at most 10000000)"),
    SR_OPT_CLI_GROUP(sr_cli_group_run),
    SR_OPT_STRING("samples", "FILE", disp_opts, samples,
                  "every sample's landing point, touchdown state, limit flags and drawn deviations as CSV (one row "
                  "per sample and body)"),
    SR_OPT_FLAG("full", disp_opts, full,
                "integrate every transient by the ODE (slower); the default fast path reuses the nominal transients "
                "(see `sinkrate profile`)"),
    SR_OPT_STRING("max-risk", "P", disp_opts, risk,
                  "exit 1 when a limit is broken in more than this share of the samples (\"0.5 %\" or 0.005; default "
                  "1 %, our choice, not a rule)"),
    SR_OPT_STRING("geojson", "FILE", disp_opts, geojson,
                  "the footprint as a map (GeoJSON, RFC 7946, WGS 84): nominal tracks, nominal and mean landing "
                  "points, 1- and 3-sigma ellipses, 50 % and 95 % circles, the drift limit; the mission needs "
                  "site.latitude and site.longitude"),
    SR_OPT_STRING("geojson-samples", "N", disp_opts, geojson_samples,
                  "... and up to N sample landing points (every k-th sample; default 0, at most 20000)"),
    SR_OPT_TEXT("The output does not name the thread count: it is the same bytes for any. The figure (--plot, "
                "below) is 1250x700 unless --plot-size is given."),
    SR_OPT_CLI_GROUP(sr_cli_group_plot),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "uncertainty", "percentiles", "limits", NULL};

static int run_dispersion(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_dispersion = {
    .name = "dispersion",
    .summary = "Monte Carlo landing scatter of a mission file",
    .usage = "usage: sinkrate dispersion FILE [-n N] [--seed N] [--threads N] [--samples FILE] [options]\n",
    .about = "Monte Carlo landing scatter of a mission file: N descents with the drag, mass, wind and deployment "
             "values drawn from the file's uncertainty: block (without one, each stage's drag coefficient varies "
             "uniformly over its family's range). Reports, for every body that lands on its own, the mean landing "
             "point, the 1-sigma and 3-sigma ellipses, the radii holding 50 % and 95 % of the landings, percentiles "
             "of descent time, touchdown speed and energy, and the probability of breaking each limit of the "
             "mission (judged as `sinkrate profile` judges it, the Mach envelope at each deployment included) with "
             "its Monte Carlo error. Without an uncertainty: block only the drag varies, and the page says so. "
             "Sample i depends only on (seed, i): the output is the same at any thread count.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_dispersion,
};

/* ---- parsing small values ---- */

static int parse_count(sr_cli *c, const char *text, size_t *n)
{
    char *end;
    errno = 0;
    double v = strtod(text, &end);
    sr_error e;
    if (end == text || *end || errno == ERANGE) {
        return sr_cli_fail(c, "-n: '%s' is not a number of samples (a whole number from 1 to %d)", text,
                           SR_DISP_MAX_SAMPLES);
    }
    if (sr_disp_check_n(v, "-n", &e))
        return sr_cli_fail(c, "%s", e.msg);
    *n = (size_t)v;
    return 0;
}

/* ---- describing the uncertainty ---- */

static void describe(char *buf, size_t len, const sr_dist *d, sr_quantity q, int scale, sr_unit_system sys)
{
    char a[48], b[48];
    switch (d->kind) {
    case SR_DIST_NORMAL:
        if (d->relative || scale)
            snprintf(buf, len, "normal, sigma %.3g %%", 100.0 * d->sigma);
        else {
            sr_report_format_value(a, sizeof a, d->sigma, q, sys, 3);
            snprintf(buf, len, "normal, sigma %s", a);
        }
        break;
    case SR_DIST_UNIFORM:
    case SR_DIST_TRIANGULAR:
        if (d->relative || scale)
            snprintf(buf, len, "%s, %+.3g %% .. %+.3g %%", sr_dist_name(d->kind), 100.0 * d->lo, 100.0 * d->hi);
        else {
            sr_report_format_value(a, sizeof a, d->lo, q, sys, 3);
            sr_report_format_value(b, sizeof b, d->hi, q, sys, 3);
            snprintf(buf, len, "%s, %s .. %s", sr_dist_name(d->kind), a, b);
        }
        break;
    default:
        snprintf(buf, len, "fixed");
    }
}

static void report_uncertainty(sr_report *r, const sr_mission *m, sr_unit_system sys)
{
    const sr_uncertainty *u = &m->unc;
    sr_rtable *t = sr_report_table(r, "uncertainty", u->given ? "What varies (the mission's uncertainty block)"
                                                               : "What varies (no uncertainty block: the default)");
    sr_rtable_text_column(t, "variable", "variable");
    sr_rtable_text_column(t, "distribution", "distribution and spread");
    sr_rtable_text_column(t, "applies_to", "applies to");
    char var[128], dist[160], to[200];
    const char *row[3] = {var, dist, to};
    for (size_t s = 0; s < m->nstages; s++) {
        snprintf(var, sizeof var, "drag area, stage '%s'", m->stages[s].name);
        describe(dist, sizeof dist, &u->drag[s], SR_Q_NONE, 1, sys);
        if (u->drag_family[s] && u->drag[s].kind != SR_DIST_FIXED)
            snprintf(to, sizeof to, "the %s family's CD0 range %.2f .. %.2f (nominal area)", m->stages[s].canopy.fam.id,
                     m->stages[s].canopy.fam.cd0.v.lo, m->stages[s].canopy.fam.cd0.v.hi);
        else if (u->drag_family[s])
            snprintf(to, sizeof to, "measured coefficient: no range");
        else
            snprintf(to, sizeof to, "the drag area of every canopy in the stage");
        sr_rtable_row(t, NULL, row);
    }
    struct {
        const char *name;
        const sr_dist *d;
        sr_quantity q;
        int scale;
        const char *to;
    } V[] = {
        {"mass", &u->mass, SR_Q_MASS, 1, "every section, all together"},
        {"wind speed", &u->wind_speed, SR_Q_SPEED, 0,
         u->wind_speed.relative ? "the wind at every height, in proportion"
                                : "a uniform wind added along the mean wind (exact for a constant wind)"},
        {"wind direction", &u->wind_dir, SR_Q_ANGLE, 0, "the wind at every height, turned"},
        {"first deployment height", &u->start_height, SR_Q_LENGTH, 0, "the start state"},
        {"deployment height", &u->deploy_height, SR_Q_LENGTH, 0, "each later height-triggered stage, drawn apart"},
        {"deployment delay", &u->deploy_delay, SR_Q_TIME, 0, "each delay-triggered stage, drawn apart"},
    };
    for (size_t k = 0; k < sizeof V / sizeof V[0]; k++) {
        if (V[k].d->kind == SR_DIST_FIXED)
            continue;
        snprintf(var, sizeof var, "%s", V[k].name);
        describe(dist, sizeof dist, V[k].d, V[k].q, V[k].scale, sys);
        snprintf(to, sizeof to, "%s", V[k].to);
        sr_rtable_row(t, NULL, row);
    }
}

/* ---- the samples file, streamed to a temporary and renamed ---- */

static void cell(FILE *f, const char *s, int first)
{
    if (!first)
        fputc(',', f);
    csv_fwrite(f, s, strlen(s));
}

/* Numbers never hold a comma, quote or line break, so they need no quoting. */
static void num(FILE *f, double x)
{
    fprintf(f, isnan(x) ? "," : ",%.10g", x);
}

typedef struct col {
    char name[160];
    int kind;  /* which perturbation field */
    size_t stage;
    sr_quantity q;
} col;

enum { P_DRAG, P_MASS, P_WIND_OFF, P_WIND_SCALE, P_WIND_DIR, P_START, P_DEPLOY_H, P_DELAY };

static double pval(const sr_perturb *p, const col *c)
{
    switch (c->kind) {
    case P_DRAG: return p->drag_scale[c->stage];
    case P_MASS: return p->mass_scale;
    case P_WIND_OFF: return p->wind_speed_offset;
    case P_WIND_SCALE: return p->wind_speed_scale;
    case P_WIND_DIR: return p->wind_dir_offset;
    case P_START: return p->start_height_offset;
    case P_DEPLOY_H: return p->deploy_height_offset[c->stage];
    default: return p->deploy_delay_offset[c->stage];
    }
}

static int write_samples(sr_cli *c, const char *path, const sr_mission *m, const sr_disp_mission *dm,
                         const sr_disp_result *res)
{
    const sr_uncertainty *u = &m->unc;
    sr_unit_system sys = c->units;
    /* The file can be large (one row a sample): streamed into the run's
     * transaction (to its temporary, or in place to a device or a pipe) */
    FILE *f;
    sr_error e;
    if (sr_txn_open(c->txn, path, &f, &e))
        return sr_cli_fail(c, "%s", e.msg);
    /* the varied perturbations only, in a fixed order */
    col cols[4 * SR_MISSION_MAX_STAGES + 8];
    size_t nc = 0;
    for (size_t s = 0; s < m->nstages; s++)
        if (u->drag[s].kind != SR_DIST_FIXED) {
            cols[nc] = (col){.kind = P_DRAG, .stage = s, .q = SR_Q_NONE};
            snprintf(cols[nc++].name, sizeof cols[0].name, "drag scale %s", m->stages[s].name);
        }
    if (u->mass.kind != SR_DIST_FIXED)
        cols[nc++] = (col){.name = "mass scale", .kind = P_MASS, .q = SR_Q_NONE};
    if (u->wind_speed.kind != SR_DIST_FIXED) {
        if (u->wind_speed.relative)
            cols[nc++] = (col){.name = "wind speed scale", .kind = P_WIND_SCALE, .q = SR_Q_NONE};
        else
            cols[nc++] = (col){.name = "wind speed deviation", .kind = P_WIND_OFF, .q = SR_Q_SPEED};
    }
    if (u->wind_dir.kind != SR_DIST_FIXED)
        cols[nc++] = (col){.name = "wind direction deviation", .kind = P_WIND_DIR, .q = SR_Q_ANGLE};
    if (u->start_height.kind != SR_DIST_FIXED)
        cols[nc++] = (col){.name = "first deployment height deviation", .kind = P_START, .q = SR_Q_LENGTH};
    for (size_t s = 0; s < m->nstages; s++) {
        if (u->deploy_height.kind != SR_DIST_FIXED && (u->height_stages >> s & 1u)) {
            cols[nc] = (col){.kind = P_DEPLOY_H, .stage = s, .q = SR_Q_LENGTH};
            snprintf(cols[nc++].name, sizeof cols[0].name, "deployment height deviation %s", m->stages[s].name);
        }
        if (u->deploy_delay.kind != SR_DIST_FIXED && (u->delay_stages >> s & 1u)) {
            cols[nc] = (col){.kind = P_DELAY, .stage = s, .q = SR_Q_TIME};
            snprintf(cols[nc++].name, sizeof cols[0].name, "deployment delay deviation %s", m->stages[s].name);
        }
    }
    fprintf(f, "# sinkrate dispersion: every sample of %s, seed %llu\n", m->name, (unsigned long long)res->seed);
    sr_report_comment(f, sr_report_caution(), 0);
    char h[200];
    cell(f, "sample", 1);
    cell(f, "body", 0);
    const struct {
        const char *n;
        sr_quantity q;
    } H[] = {{"east", SR_Q_LENGTH},  {"north", SR_Q_LENGTH},          {"distance", SR_Q_LENGTH},
             {"descent time", SR_Q_TIME}, {"touchdown speed", SR_Q_SPEED}, {"landing energy", SR_Q_ENERGY}};
    for (size_t k = 0; k < sizeof H / sizeof H[0]; k++) {
        snprintf(h, sizeof h, "%s [%s]", H[k].n, sr_units_label(H[k].q, sys));
        cell(f, h, 0);
    }
    for (int k = 0; k < SR_DISP_NLIMITS; k++) {
        snprintf(h, sizeof h, "over %s", sr_limit_name(k));
        cell(f, h, 0);
    }
    for (size_t k = 0; k < nc; k++) {
        if (cols[k].q == SR_Q_NONE)
            snprintf(h, sizeof h, "%s", cols[k].name);
        else
            snprintf(h, sizeof h, "%s [%s]", cols[k].name, sr_units_label(cols[k].q, sys));
        cell(f, h, 0);
    }
    fputs("\r\n", f);
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    if (!r) {
        sr_txn_close(c->txn, f, &e);
        return sr_cli_fail(c, "out of memory");
    }
    for (size_t i = 0; i < res->n; i++) {
        sr_perturb p;
        if (nc)
            sr_uncertainty_draw(u, res->seed, i, r, &p);
        for (size_t b = 0; b < res->nbodies; b++) {
            const sr_landing *L = &res->land[i * res->nbodies + b];
            fprintf(f, "%zu", i);
            cell(f, dm->body_name[b], 0);
            num(f, sr_units_from_si(L->east, SR_Q_LENGTH, sys));
            num(f, sr_units_from_si(L->north, SR_Q_LENGTH, sys));
            num(f, sr_units_from_si(hypot(L->east, L->north), SR_Q_LENGTH, sys));
            num(f, sr_units_from_si(L->time, SR_Q_TIME, sys));
            num(f, sr_units_from_si(L->speed, SR_Q_SPEED, sys));
            num(f, sr_units_from_si(L->energy, SR_Q_ENERGY, sys));
            for (int k = 0; k < SR_DISP_NLIMITS; k++)
                fputs((res->flags[i] >> k & 1u) ? ",1" : ",0", f);
            for (size_t k = 0; k < nc; k++)
                num(f, cols[k].q == SR_Q_NONE ? pval(&p, &cols[k]) : sr_units_from_si(pval(&p, &cols[k]), cols[k].q, sys));
            fputs("\r\n", f);
        }
    }
    gsl_rng_free(r);
    if (sr_txn_close(c->txn, f, &e))
        return sr_cli_fail(c, "%s", e.msg);
    return 0;
}

/* ---- the report ---- */

static const char *const PCT_LABEL[SR_SCATTER_NPCT] = {"1 %", "5 %", "50 % (median)", "95 %", "99 %"};

static void report_body(sr_report *r, const sr_disp_mission *dm, size_t b, const sr_body_stats *s,
                        const sr_landing *nom, size_t nb)
{
    char h[256], key[64];
    if (nb > 1)
        snprintf(h, sizeof h, "Landing of %s (body %zu of %zu)", dm->body_name[b], b + 1, nb);
    else
        snprintf(h, sizeof h, "Landing (%s)", dm->body_name[b]);
    sr_report_section(r, h);
#define K(name) (snprintf(key, sizeof key, nb > 1 ? "%s_%zu" : "%s", name, b + 1), key)
    sr_report_value(r, K("nominal_east"), "nominal landing point, east", nom->east, SR_Q_LENGTH, SR_FIXED(0));
    sr_report_value(r, K("nominal_north"), "nominal landing point, north", nom->north, SR_Q_LENGTH, SR_FIXED(0));
    sr_report_value(r, K("mean_east"), "mean landing point, east", s->mean_east, SR_Q_LENGTH, SR_FIXED(0));
    sr_report_value(r, K("mean_north"), "mean landing point, north", s->mean_north, SR_Q_LENGTH, SR_FIXED(0));
    sr_report_value(r, K("mean_distance"), "mean landing point, distance", s->mean_distance, SR_Q_LENGTH,
                    SR_FIXED(0));
    sr_report_value(r, K("mean_bearing"), "mean landing point, bearing", s->mean_bearing, SR_Q_BEARING, SR_FIXED(0));
    sr_report_value(r, K("sigma1_major"), "1-sigma ellipse, semi-major axis", s->sigma1.major, SR_Q_LENGTH, 3);
    sr_report_value(r, K("sigma1_minor"), "1-sigma ellipse, semi-minor axis", s->sigma1.minor, SR_Q_LENGTH, 3);
    sr_report_value(r, K("ellipse_bearing"), "ellipse major axis, bearing", s->sigma1.bearing, SR_Q_BEARING,
                    SR_FIXED(0));
    sr_report_value(r, K("sigma3_major"), "3-sigma ellipse, semi-major axis", s->sigma3.major, SR_Q_LENGTH, 3);
    sr_report_value(r, K("sigma3_minor"), "3-sigma ellipse, semi-minor axis", s->sigma3.minor, SR_Q_LENGTH, 3);
    sr_report_value(r, K("r50_mean"), "50 % radius around the mean", s->r50_mean, SR_Q_LENGTH, 3);
    sr_report_value(r, K("r95_mean"), "95 % radius around the mean", s->r95_mean, SR_Q_LENGTH, 3);
    sr_report_value(r, K("r50_launch"), "50 % radius around the launch point", s->r50_launch, SR_Q_LENGTH, 3);
    sr_report_value(r, K("r95_launch"), "95 % radius around the launch point", s->r95_launch, SR_Q_LENGTH, 3);
#undef K
}

static void report_spread(sr_report *r, const sr_disp_mission *dm, const sr_disp_stats *st)
{
    sr_rtable *t = sr_report_table(r, "percentiles", "Descent time, touchdown speed and energy over the samples");
    if (st->nbodies > 1)
        sr_rtable_text_column(t, "body", "body");
    sr_rtable_text_column(t, "share", "percentile");
    sr_rtable_column(t, "descent_time", "descent time", SR_Q_TIME, 4);
    sr_rtable_column(t, "touchdown_speed", "touchdown speed", SR_Q_SPEED, 3);
    sr_rtable_column(t, "landing_energy", "landing energy", SR_Q_ENERGY, 3);
    for (size_t b = 0; b < st->nbodies; b++) {
        const sr_body_stats *s = &st->body[b];
        const char *tx[2];
        tx[0] = dm->body_name[b];
        int o = st->nbodies > 1;
        double row[3];
        tx[o] = "lowest";
        row[0] = s->time.min, row[1] = s->speed.min, row[2] = s->energy.min;
        sr_rtable_row(t, row, tx);
        for (int k = 0; k < SR_SCATTER_NPCT; k++) {
            tx[o] = PCT_LABEL[k];
            row[0] = s->time.pct[k], row[1] = s->speed.pct[k], row[2] = s->energy.pct[k];
            sr_rtable_row(t, row, tx);
        }
        tx[o] = "highest";
        row[0] = s->time.max, row[1] = s->speed.max, row[2] = s->energy.max;
        sr_rtable_row(t, row, tx);
        tx[o] = "mean";
        row[0] = s->time.mean, row[1] = s->speed.mean, row[2] = s->energy.mean;
        sr_rtable_row(t, row, tx);
    }
}

/* Returns the number of limits above the accepted risk. */
static int report_limits(sr_cli *c, sr_report *r, const sr_mission *m, const sr_disp_stats *st, double risk)
{
    sr_unit_system sys = c->units;
    double rated = NAN;
    for (size_t k = 0; k < m->nstages; k++)
        if (!isnan(m->limit_rated[k]))
            rated = m->limit_rated[k] / m->limit_design_factor;
    /* the judge's limits (analysis/judge.h); the Mach envelope is each stage's family's, always judged */
    const double lim[SR_DISP_NLIMITS] = {m->limit_speed, m->limit_energy, m->limit_time, m->limit_drift,
                                         m->limit_deploy_q, 1.0, rated};
    const sr_quantity q[SR_DISP_NLIMITS] = {SR_Q_SPEED, SR_Q_ENERGY, SR_Q_TIME, SR_Q_LENGTH, SR_Q_PRESSURE,
                                            SR_Q_NONE, SR_Q_FORCE};
    int any = 0;
    for (int k = 0; k < SR_DISP_NLIMITS; k++)
        any |= isfinite(lim[k]);
    if (!any) {
        sr_report_note(r, "The mission sets no limits, so no probability of breaking one is given.");
        return 0;
    }
    sr_rtable *t = sr_report_table(r, "limits", "Limits: share of samples that break each (the judge of `profile`)");
    sr_rtable_text_column(t, "limit", "limit");
    sr_rtable_text_column(t, "value", "value");
    sr_rtable_column(t, "samples_over", "samples over", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_column(t, "probability", "probability", SR_Q_NONE, 3);
    sr_rtable_column(t, "standard_error", "std. error", SR_Q_NONE, 2);
    sr_rtable_column(t, "interval_low", "95 % interval low", SR_Q_NONE, 3);
    sr_rtable_column(t, "interval_high", "high", SR_Q_NONE, 3);
    int bad = 0;
    for (int k = 0; k < SR_DISP_NLIMITS; k++) {
        if (!isfinite(lim[k]))
            continue;
        char v[64];
        if (k == 5)
            snprintf(v, sizeof v, "each stage's family envelope");
        else if (k == 6)
            snprintf(v, sizeof v, "rated strength / design factor");
        else
            sr_report_format_value(v, sizeof v, lim[k], q[k], sys, 4);
        const char *tx[2] = {sr_limit_name(k), v};
        const sr_proportion *p = &st->limit[k];
        double row[5] = {(double)p->count, p->p, p->se, p->lo, p->hi};
        sr_rtable_row(t, row, tx);
        if (p->p > risk) {
            bad++;
            sr_report_warning(r, "%s above %s in %.3g %% of the samples (95 %% interval %.3g .. %.3g %%), more than "
                                 "the accepted %.3g %%.",
                              sr_limit_name(k), v, 100.0 * p->p, 100.0 * p->lo, 100.0 * p->hi, 100.0 * risk);
            sr_cli_note(c, "limit exceeded: %s above %s in %.3g %% of the samples (accepted: %.3g %%)",
                        sr_limit_name(k), v, 100.0 * p->p, 100.0 * risk);
        }
    }
    return bad;
}

/* ---- the figure: landing points, ellipses, limit circle; speed histogram ---- */

/* Append the outline of an ellipse (centre, semi-axes, bearing of the major
 * axis) as a closed polygon of 96 sides, then a gap. */
static int outline(sr_plot *p, size_t blk, double ce, double cn, double a, double b, double brg, sr_unit_system sys)
{
    int rc = 0;
    double ue = sin(brg), un = cos(brg); /* the major axis */
    for (int k = 0; k <= 96 && !rc; k++) {
        double t = 2.0 * PI * k / 96.0, x = a * cos(t), y = b * sin(t);
        double row[2] = {sr_units_from_si(ce + x * ue + y * un, SR_Q_LENGTH, sys),
                         sr_units_from_si(cn + x * un - y * ue, SR_Q_LENGTH, sys)};
        rc = sr_plot_row(p, blk, row);
    }
    double gap[2] = {NAN, NAN};
    return rc ? rc : sr_plot_row(p, blk, gap);
}

static int figure(sr_cli *c, const sr_mission *m, const sr_disp_mission *dm, const sr_disp_result *res,
                  const sr_disp_stats *st, const sr_landing *nom, int argc, char **argv)
{
    sr_unit_system sys = c->units;
    sr_plot *p = sr_plot_new("Landing scatter");
    if (!p)
        return sr_cli_fail(c, "out of memory");
    char sub[600], a[48], t1[200];
    size_t shown = res->n < PLOT_POINTS ? res->n : PLOT_POINTS;
    snprintf(sub, sizeof sub, "%s. %zu samples (seed %llu)%s. Ellipses: 1 and 3 sigma, holding 39 %% and 98.9 %% "
                              "of a normal scatter.",
             m->name, res->n, (unsigned long long)res->seed, shown < res->n ? "; the first 20000 are drawn" : "");
    sr_plot_subtitle(p, sub);
    sr_plot_layout(p, 2, 0);
    const char *ul = sr_units_label(SR_Q_LENGTH, sys), *uv = sr_units_label(SR_Q_SPEED, sys);
    char xl[64], yl[64], sl[64];
    snprintf(xl, sizeof xl, "east of the launch point [%s]", ul);
    snprintf(yl, sizeof yl, "north of the launch point [%s]", ul);
    snprintf(sl, sizeof sl, "touchdown speed [%s]", uv);
    sr_plot_axes ax;
    sr_plot_axes_init(&ax);
    ax.title = "Where it lands";
    ax.xlabel = xl;
    ax.ylabel = yl;
    ax.equal = 1;
    /* The map holds the drawn landings, the 3-sigma ellipses, the launch
     * point and the drift limit. */
    size_t shown_n = shown * res->nbodies;
    double x0 = 0.0, x1 = 0.0, y0 = 0.0, y1 = 0.0;
    for (size_t i = 0; i < shown_n; i++) {
        x0 = fmin(x0, res->land[i].east), x1 = fmax(x1, res->land[i].east);
        y0 = fmin(y0, res->land[i].north), y1 = fmax(y1, res->land[i].north);
    }
    for (size_t b = 0; b < res->nbodies; b++) {
        double r3 = st->body[b].sigma3.major;
        x0 = fmin(x0, st->body[b].mean_east - r3), x1 = fmax(x1, st->body[b].mean_east + r3);
        y0 = fmin(y0, st->body[b].mean_north - r3), y1 = fmax(y1, st->body[b].mean_north + r3);
    }
    if (isfinite(m->limit_drift)) {
        x0 = fmin(x0, -m->limit_drift), x1 = fmax(x1, m->limit_drift);
        y0 = fmin(y0, -m->limit_drift), y1 = fmax(y1, m->limit_drift);
    }
    double span = fmax(fmax(x1 - x0, y1 - y0), 1.0);
    /* the legend goes in the strip above the panels, so it never covers a landing */
    ax.key = SR_PLOT_KEY_ABOVE;
    x0 -= 0.04 * span, x1 += 0.04 * span;
    y0 -= 0.04 * span, y1 += 0.04 * span;
    ax.xmin = sr_units_from_si(x0, SR_Q_LENGTH, sys), ax.xmax = sr_units_from_si(x1, SR_Q_LENGTH, sys);
    ax.ymin = sr_units_from_si(y0, SR_Q_LENGTH, sys), ax.ymax = sr_units_from_si(y1, SR_Q_LENGTH, sys);
    sr_plot_set_axes(p, 0, &ax);
    sr_plot_axes_init(&ax);
    ax.title = "Touchdown speed";
    ax.xlabel = sl;
    ax.ylabel = res->nbodies > 1 ? "share of samples per bin (40 bins per body) [%]" : "share of samples [%]";
    ax.ymin = 0.0;
    sr_plot_set_axes(p, 1, &ax);
    int rc = 0;
    const char *xy[] = {"east", "north"};
    /* The landings are drawn as short strokes, not markers: the shared
     * style's point markers are sized for a few points per curve and would
     * bury the ellipses under thousands of landings. */
    double eps = 0.002 * span;
    for (size_t b = 0; b < res->nbodies && !rc; b++) {
        int color = BODY_COLOR[b % 4];
        size_t blk;
        rc = sr_plot_block(p, dm->body_name[b], 2, xy, &blk);
        for (size_t i = 0; i < shown && !rc; i++) {
            const sr_landing *ld = &res->land[i * res->nbodies + b];
            double r0[2] = {sr_units_from_si(ld->east, SR_Q_LENGTH, sys), sr_units_from_si(ld->north, SR_Q_LENGTH, sys)};
            double r1[2] = {sr_units_from_si(ld->east + eps, SR_Q_LENGTH, sys), r0[1]};
            double gap[2] = {NAN, NAN};
            if (!(rc = sr_plot_row(p, blk, r0)) && !(rc = sr_plot_row(p, blk, r1)))
                rc = sr_plot_row(p, blk, gap);
        }
        snprintf(t1, sizeof t1, "%s%slandings", res->nbodies > 1 ? dm->body_name[b] : "", res->nbodies > 1 ? ": " : "");
        sr_plot_series pts = {.kind = SR_PLOT_LINES, .panel = 0, .block = blk, .x = 1, .y = 2, .title = t1,
                              .color = color};
        if (!rc)
            rc = sr_plot_add(p, &pts);
    }
    for (size_t b = 0; b < res->nbodies && !rc; b++) {
        const sr_body_stats *s = &st->body[b];
        for (int k = 0; k < 2 && !rc; k++) {
            const sr_ellipse *e = k ? &s->sigma3 : &s->sigma1;
            size_t eb;
            rc = sr_plot_block(p, k ? "3-sigma ellipse" : "1-sigma ellipse", 2, xy, &eb);
            if (!rc)
                rc = outline(p, eb, s->mean_east, s->mean_north, e->major, e->minor, e->bearing, sys);
            sr_plot_series el = {.kind = SR_PLOT_LINES, .panel = 0, .block = eb, .x = 1, .y = 2,
                                 .title = b ? NULL : k ? "3-sigma ellipse" : "1-sigma ellipse", .color = 6, .dash = k};
            if (!rc)
                rc = sr_plot_add(p, &el);
        }
    }
    if (!rc && isfinite(m->limit_drift)) {
        size_t cb;
        rc = sr_plot_block(p, "drift limit around the launch point", 2, xy, &cb);
        if (!rc)
            rc = outline(p, cb, 0.0, 0.0, m->limit_drift, m->limit_drift, 0.0, sys);
        sr_report_format_value(a, sizeof a, m->limit_drift, SR_Q_LENGTH, sys, 4);
        snprintf(t1, sizeof t1, "drift limit %s", a);
        sr_plot_series lc = {.kind = SR_PLOT_LINES, .panel = 0, .block = cb, .x = 1, .y = 2, .title = t1, .color = 2,
                             .dash = 1};
        if (!rc)
            rc = sr_plot_add(p, &lc);
    }
    /* the mean and nominal landing points (every body) and the launch point, on top */
    const struct {
        const char *title;
        int color;
    } MK[3] = {{"mean landing point", 6}, {"nominal landing point", 5}, {"launch point", 7}};
    for (int k = 0; k < 3 && !rc; k++) {
        size_t mb;
        rc = sr_plot_block(p, MK[k].title, 2, xy, &mb);
        for (size_t b = 0; b < (k < 2 ? res->nbodies : 1) && !rc; b++) {
            double e = k == 0 ? st->body[b].mean_east : k == 1 ? nom[b].east : 0.0;
            double n = k == 0 ? st->body[b].mean_north : k == 1 ? nom[b].north : 0.0;
            double row[2] = {sr_units_from_si(e, SR_Q_LENGTH, sys), sr_units_from_si(n, SR_Q_LENGTH, sys)};
            rc = sr_plot_row(p, mb, row);
        }
        sr_plot_series mp = {.kind = SR_PLOT_POINTS, .panel = 0, .block = mb, .x = 1, .y = 2, .title = MK[k].title,
                             .color = MK[k].color};
        if (!rc)
            rc = sr_plot_add(p, &mp);
    }
    /* histogram of touchdown speed: shares of samples in HIST_BINS bins over each body's range */
    for (size_t b = 0; b < res->nbodies && !rc; b++) {
        double lo = st->body[b].speed.min, hi = st->body[b].speed.max;
        if (!(hi > lo))
            hi = lo + 1e-3 * (fabs(lo) + 1.0);
        double w = (hi - lo) / HIST_BINS;
        size_t cnt[HIST_BINS] = {0};
        for (size_t i = 0; i < res->n; i++) {
            int k = (int)((res->land[i * res->nbodies + b].speed - lo) / w);
            cnt[k < 0 ? 0 : k >= HIST_BINS ? HIST_BINS - 1 : k]++;
        }
        const char *hn[] = {"speed", "share_percent", "width"};
        size_t hb;
        rc = sr_plot_block(p, "touchdown speed histogram", 3, hn, &hb);
        int outline_only = res->nbodies > 1;
        double r0[3] = {sr_units_from_si(lo, SR_Q_SPEED, sys), 0.0, 0.0};
        if (outline_only && !rc)
            rc = sr_plot_row(p, hb, r0);
        for (int k = 0; k < HIST_BINS && !rc; k++) {
            double row[3] = {sr_units_from_si(lo + (k + 0.5) * w, SR_Q_SPEED, sys),
                             100.0 * (double)cnt[k] / (double)res->n, sr_units_from_si(w, SR_Q_SPEED, sys)};
            rc = sr_plot_row(p, hb, row);
        }
        double r1[3] = {sr_units_from_si(hi, SR_Q_SPEED, sys), 0.0, 0.0};
        if (outline_only && !rc)
            rc = sr_plot_row(p, hb, r1);
        /* several bodies land at speeds far apart, and their bins are too
         * narrow for bars: each draws the outline through its bins instead */
        sr_plot_series hs = {.kind = res->nbodies > 1 ? SR_PLOT_LINES : SR_PLOT_BOXES, .panel = 1, .block = hb,
                             .x = 1, .y = 2, .w = res->nbodies > 1 ? 0 : 3,
                             .title = res->nbodies > 1 ? dm->body_name[b] : NULL, .color = BODY_COLOR[b % 4]};
        if (!rc)
            rc = sr_plot_add(p, &hs);
    }
    if (!rc && isfinite(m->limit_speed)) {
        sr_report_format_value(a, sizeof a, m->limit_speed, SR_Q_SPEED, sys, 3);
        rc = sr_plot_marker(p, 1, 'x', sr_units_from_si(m->limit_speed, SR_Q_SPEED, sys), "limit", 0);
    }
    if (rc) {
        sr_plot_free(p);
        return sr_cli_fail(c, "--plot: out of memory");
    }
    /* a map beside a histogram needs more room than the default figure */
    if (!c->plot_width) {
        c->plot_width = 1250;
        c->plot_height = 700;
    }
    rc = sr_cli_plot(c, p, argc, argv);
    sr_plot_free(p);
    return rc;
}

/* ---- the command ---- */

static void on_progress(size_t done, size_t n, void *ud)
{
    (void)n;
    sr_cli_progress_update(ud, done);
}

static int run_dispersion(sr_cli *c, int argc, char **argv)
{
    disp_opts o;
    memset(&o, 0, sizeof o);
    int first, rc = sr_cli_parse_options(c, argc, argv, &o, &first);
    if (rc)
        return rc;
    if (first >= argc)
        return sr_cli_fail(c, "a mission file is required (sinkrate dispersion FILE)");
    if (first + 1 < argc)
        return sr_cli_fail(c, "unexpected argument '%s' (dispersion takes one mission file)", argv[first + 1]);
    size_t n = SR_DISP_DEFAULT_SAMPLES;
    double risk = DEFAULT_RISK;
    if (o.n && (rc = parse_count(c, o.n, &n)))
        return rc;
    if (o.risk && (rc = sr_cli_share(c, "--max-risk", o.risk, &risk)))
        return rc;
    if (o.samples && (rc = sr_cli_output(c, "--samples", o.samples)))
        return rc;
    if ((rc = sr_cli_input(c, "the mission file", argv[first])))
        return rc;
    long geo_samples = 0;
    if (o.geojson_samples && !o.geojson)
        return sr_cli_fail(c, "--geojson-samples: goes with --geojson FILE");
    if (o.geojson_samples && (rc = sr_cli_count(c, "--geojson-samples", o.geojson_samples, 0, 20000, &geo_samples)))
        return rc;
    if (o.geojson && (rc = sr_cli_output(c, "--geojson", o.geojson)))
        return rc;
    sr_catalog *cat = NULL;
    sr_mission *m = NULL;
    sr_disp_mission dm;
    memset(&dm, 0, sizeof dm);
    sr_disp_result res;
    memset(&res, 0, sizeof res);
    sr_disp_stats *st = NULL;
    sr_report *r = NULL;
    char *gbuf = NULL;
    size_t glen = 0;
    sr_error e;
    if ((rc = sr_cli_catalog(c, &cat)))
        goto out;
    m = calloc(1, sizeof *m);
    st = calloc(1, sizeof *st);
    if (!m || !st) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    if (sr_mission_load(m, argv[first], cat, &e)) {
        free(m);
        m = NULL;
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    if (o.geojson && (rc = sr_cli_maps_need_position(c, "--geojson", m)))
        goto out;
    if ((rc = sr_cli_mission_inputs(c, m)))
        goto out;
    if (sr_disp_mission_init(&dm, m, NULL, o.full, &e)) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    int threads = c->threads > 0 ? c->threads : omp_get_num_procs();
    uint64_t seed = c->seed_set ? (uint64_t)c->seed : 1u;
    sr_progress bar;
    sr_cli_progress_start(&bar, c->err, n, "samples");
    sr_disp_options opt = {.n = n, .seed = seed, .threads = threads, .progress = on_progress, .progress_ud = &bar};
    rc = sr_disp_run(&dm.model, &m->unc, &opt, &res, &e);
    sr_cli_progress_end(&bar);
    if (rc) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    if (sr_scatter_stats(&res, st, &e)) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    sr_landing nom[SR_DISP_MAX_BODIES];
    unsigned nflags;
    sr_disp_mission_outcome(&dm, sr_profile_nominal(dm.ctx), nom, &nflags);

    r = sr_report_new("dispersion", "Monte Carlo landing dispersion");
    sr_report_section(r, "Inputs");
    sr_report_text(r, "mission", "mission", m->name);
    sr_cli_maps_report_position(r, m);
    sr_report_value(r, "samples", "samples", (double)n, SR_Q_NONE, SR_FIXED(0));
    sr_report_value(r, "seed", "seed", (double)seed, SR_Q_NONE, SR_FIXED(0));
    sr_report_text(r, "descent_model", "descent model",
                   o.full ? "staged descent, every transient by the ODE"
                          : "staged descent, fast path (steady stages from tables, nominal transients adjusted)");
    sr_cli_report_atmos(r, &m->atmos);
    report_uncertainty(r, m, c->units);
    if (!m->unc.given)
        sr_report_warning(r, "The mission has no uncertainty: block: only the drag of each stage varies (uniformly "
                             "over its family's drag range); mass, wind, and deployment heights and delays stay at "
                             "their nominal values, so the scatter lies along one line downwind instead of covering an "
                             "area. Add an uncertainty: block (docs/files.md) for a real footprint.");
    if (m->energy_ground)
        sr_report_note(r, "Landing energy is relative to the ground (the mission's landing-energy-basis): the descent "
                          "rate combined with the surface wind.");
    for (size_t b = 0; b < res.nbodies; b++)
        report_body(r, &dm, b, &st->body[b], &nom[b], res.nbodies);
    report_spread(r, &dm, st);
    int bad = report_limits(c, r, m, st, risk);
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    sr_input_warnings_mission(&iw, m, NULL, c->units);
    sr_cli_report_input_warnings(r, &iw);
    sr_report_note(r, "Bearings are clockwise from north; east and north are measured from the launch point "
                      "(the ground point below the first deployment unless the mission gives an offset).");
    sr_report_note(r, "A 2-D normal scatter puts 39.3 %% of the landings inside the 1-sigma ellipse and 98.9 %% "
                      "inside the 3-sigma ellipse; the 50 %% and 95 %% radii are counted from the samples.");
    sr_report_note(r, "Probabilities carry their Monte Carlo standard error sqrt(p(1-p)/n) and the Wilson 95 %% "
                      "interval, which stays meaningful when no sample breaks a limit.");
    if (m->unc.wind_speed.kind != SR_DIST_FIXED && !m->unc.wind_speed.relative)
        sr_report_note(r, "A wind-speed deviation is added as a uniform wind along the height-averaged wind "
                          "direction (exact for a constant wind; for a profile or a table it shifts every height "
                          "alike).");
    /* the map is built before anything is written */
    if (o.geojson &&
        (rc = sr_cli_maps_dispersion_geojson(c, m, &dm, &res, st, nom, (size_t)geo_samples, &gbuf, &glen)))
        goto out;
    if ((rc = sr_cli_emit(c, r)))
        goto out;
    if (o.samples && (rc = write_samples(c, o.samples, m, &dm, &res)))
        goto out;
    if (gbuf && (rc = sr_cli_maps_write(c, "--geojson", o.geojson, gbuf, glen)))
        goto out;
    if (c->plot_prefix && (rc = figure(c, m, &dm, &res, st, nom, argc, argv)))
        goto out;
    rc = bad ? SR_EXIT_LIMIT : SR_EXIT_OK;
out:
    free(gbuf);
    sr_report_free(r);
    sr_disp_result_release(&res);
    sr_disp_mission_free(&dm);
    if (m) {
        sr_mission_release(m);
        free(m);
    }
    free(st);
    free(cat);
    return rc;
}
