/* cmd_loads.c - `sinkrate loads`: opening load of a canopy (or cluster) at
 * deployment by three methods on one growth model, over every banded input
 * (analysis/loads.h); for a mission file, at every stage's deployment in the
 * same band runs as `sinkrate profile` (analysis/band.h), judged against the
 * mission's rated strength by the one judge. */
#define _DEFAULT_SOURCE
#include <ctype.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/band.h"
#include "analysis/judge.h"
#include "analysis/loads.h"
#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "analysis/input_warnings.h"
#include "cli/verdict.h"
#include "physics/descent.h"
#include "files/mission.h"
#include "files/yamldoc.h"
#include "physics/opening.h"

typedef struct loads_opts {
    const char *speed, *angle, *design, *exponent, *fill, *cx, *allowance, *stage;
    const char *limits_at;
    sr_payload_opts payload;
    sr_canopy_opts canopy;
    sr_atmos_opts atmos;
} loads_opts;

static const sr_opt OPTS[] = {
    SR_OPT_GROUP(sr_cli_group_payload, loads_opts, payload),
    SR_OPT_WITHOUT("body-drag-area"),
    SR_OPT_FOR("mass", "M", "mass the canopies decelerate"),
    SR_OPT_FOR("altitude", "Z", "deployment altitude above sea level (default: the site elevation, or 0)"),
    SR_OPT_FOR("mission", "FILE",
               "the mission's staged descent, flown as `sinkrate profile` flies it (line stretch, released "
               "canopies, section drag and masses, every band): each stage at its line stretch; the file's "
               "rated-strength limit is judged (exit 1 when broken)"),
    SR_OPT_STRING("speed", "V", loads_opts, speed, "speed at line stretch (deployment), subsonic"),
    SR_OPT_STRING("path-angle", "A", loads_opts, angle,
                  "flight-path angle below the horizontal at deployment: 90 straight down (default), 0 level as at "
                  "apogee"),
    SR_OPT_STRING("design-factor", "K", loads_opts, design, "turn the peak into a required rated strength (1 to 10)"),
    SR_OPT_STRING("growth-exponent", "N", loads_opts, exponent,
                  "drag area grows as (t/t_f)^N while filling (default: the family's band, by class solid 1..3, "
                  "slotted 0.5..2, from memory; a value here replaces the band)"),
    SR_OPT_STRING("filling-constant", "N", loads_opts, fill, "override the family's filling constant (t_f = N D0 / V)"),
    SR_OPT_STRING("opening-factor", "CX", loads_opts, cx, "override the family's opening-load factor (its band)"),
    SR_OPT_STRING("cluster-allowance", "K", loads_opts, allowance,
                  "per-canopy load over the equal share in a cluster (default: the bound with the lead canopy taking "
                  "the whole mass)"),
    SR_OPT_STRING("stage", "NAME", loads_opts, stage,
                  "only this stage of the mission (then --speed and --path-angle may replace its deployment state)"),
    SR_OPT_LIMITS_AT(loads_opts, limits_at),
    SR_OPT_TEXT("The figure (with --plot): force vs time from the inflation ODE at the typical ends of the bands, "
                "with each method's peak marked; for a whole mission, one figure a stage, PREFIX-STAGE.png (in the "
                "stage's name, what is not a letter, digit, '.', '_' or '-' becomes '-')."),
    SR_OPT_GROUP(sr_cli_group_canopy, loads_opts, canopy),
    SR_OPT_GROUP(sr_cli_group_atmos, loads_opts, atmos),
    SR_OPT_CLI_GROUP(sr_cli_group_plot),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "methods", "stages", "limits", NULL};

static int run_loads(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_loads = {
    .name = "loads",
    .summary = "opening load of a canopy at deployment",
    .usage = "usage: sinkrate loads --mass M --speed V --family ID --nominal-diameter D [options]\n"
             "       sinkrate loads --mass M --speed V --canopy FILE [options]\n"
             "       sinkrate loads --mission FILE [--stage NAME] [options]\n",
    .about = "Peak opening force of a canopy or cluster deployed at speed V, by three methods built on ONE "
             "drag-area growth model: the opening-load-factor method (X1 from the ballistic mass ratio), the "
             "Pflanz closed form (gravity neglected) and an inflation ODE with gravity and flight-path angle. "
             "Because they share the model, their spread is not the real uncertainty: the band is taken over the "
             "canopy's drag range, its growth-exponent range and its opening-load-factor range, and its high end "
             "governs. A measured opening load or factor (measured-opening: in a canopy file) replaces the three "
             "estimates.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_loads,
};

/* Overrides of the family data and the design options; NaN = not given. */
typedef struct tweaks {
    double exponent, fill, cx, design, allowance;
} tweaks;

/* One deployment: its band over every banded input (analysis/loads.h), and
 * the full three-method results at the low end, the typical and the high end
 * (the combinations the band found). */
typedef struct deploy {
    char name[SR_NAME_MAX];
    const sr_canopy *cp;
    sr_loads_canopy lc;
    sr_loads_state st[SR_LOADS_NSTATES];
    sr_loads_band band;
    double mass, z, angle; /* the typical state: mass, altitude above sea level, path angle */
    double v[3];           /* speed at line stretch: lowest, typical, highest over the states */
    sr_opening_input in[3];
    sr_opening_result res[3];
    int at_rest;           /* it opens with no airspeed (released under an open canopy): no opening load */
} deploy;

/* Which option a refusal of the opening model is about, for the one-line
 * error: its key names the field of sr_opening_input. With a mission the
 * deployment state is the mission's. */
static const char *option_of(const sr_error *e, int mission)
{
    static const char *const MAP[][2] = {{"v1", "--speed"},
                                         {"n_fill", "--filling-constant"},
                                         {"cx", "--opening-factor"},
                                         {"exponent", "--growth-exponent"},
                                         {"design_factor", "--design-factor"},
                                         {"mass", "--mass"},
                                         {"path_angle", "--path-angle"},
                                         {"cluster_allowance", "--cluster-allowance"},
                                         {"cds0", "--drag-coefficient"}};
    for (size_t i = 0; i < sizeof MAP / sizeof MAP[0]; i++)
        if (strcmp(e->key, MAP[i][0]) == 0)
            return mission && strcmp(MAP[i][1], "--speed") == 0 ? "--mission" : MAP[i][1];
    return mission ? "--mission" : "--speed";
}

/* The family data with the command's overrides. */
static void apply_tweaks(sr_loads_canopy *lc, const tweaks *tw)
{
    if (!isnan(tw->exponent))
        lc->growth.lo = lc->growth.typ = lc->growth.hi = tw->exponent;
    if (!isnan(tw->fill))
        lc->n_fill = tw->fill;
    if (!isnan(tw->cx))
        lc->cx.lo = lc->cx.typ = lc->cx.hi = tw->cx;
}

/* The band (the same function as the profile's), then the three-method
 * results of its three ends. */
static int solve(sr_cli *c, deploy *d, const tweaks *tw, int mission)
{
    sr_error e;
    const char *where = mission ? "--mission" : NULL;
    if (sr_loads_evaluate(&d->lc, d->st, 0, &d->band, &e) != SR_OK) {
        if (mission)
            return sr_cli_fail(c, "%s: stage '%s': %s", where, d->name, e.msg);
        return sr_cli_fail(c, "%s: %s", option_of(&e, 0), e.msg);
    }
    const sr_loads_state *t = &d->st[0];
    d->mass = t->mass;
    d->angle = t->path_angle;
    if (!d->band.valid) {
        /* released under an open canopy: it fills as the payload speeds up, no opening shock */
        d->at_rest = 1;
        d->v[0] = d->v[1] = d->v[2] = t->v1;
        for (int k = 0; k < 3; k++)
            memset(&d->res[k], 0xff, sizeof d->res[k]); /* NaN everywhere: printed as "-" */
        return 0;
    }
    const sr_loads_end *ends[3] = {&d->band.lo, &d->band.typ, &d->band.hi};
    for (int k = 0; k < 3; k++) {
        sr_loads_input(&d->lc, &d->st[ends[k]->state], ends[k]->drag, ends[k]->exponent, ends[k]->cx, &d->in[k]);
        d->in[k].design_factor = isnan(tw->design) ? 0 : tw->design;
        d->in[k].cluster_allowance = isnan(tw->allowance) ? 0 : tw->allowance;
        if (sr_opening_solve(&d->in[k], &d->res[k], &e) != SR_OK) {
            if (mission)
                return sr_cli_fail(c, "%s: stage '%s': %s", option_of(&e, 1), d->name, e.msg);
            return sr_cli_fail(c, "%s: %s", option_of(&e, 0), e.msg);
        }
    }
    d->v[0] = d->band.v_lo;
    d->v[1] = d->band.v_typ;
    d->v[2] = d->band.v_hi;
    return 0;
}

static const char *regime_text(int regime)
{
    return regime == SR_OPENING_INFINITE_MASS ? "closer to infinite mass (peak at full inflation)"
                                              : "closer to finite mass (peak before full inflation)";
}

static const char *kind_text(int kind)
{
    switch (kind) {
    case SR_PEAK_INTERIOR: return "during filling";
    case SR_PEAK_FULL: return "at full inflation";
    case SR_PEAK_STEADY: return "steady descent (weight)";
    default: return "-";
    }
}

static void warn_common(sr_report *r, const deploy *d, int *recalled, int mission)
{
    if (d->at_rest)
        return;
    const char *pre = mission ? d->name : NULL;
    if (d->band.above_envelope)
        sr_report_warning(r, "%s%sMach %.2f at deployment (band end) is above the %s family's usual application "
                             "(Mach %.2g, from memory).",
                          pre ? pre : "", pre ? ": " : "", d->band.mach_hi, d->cp->fam.id, d->cp->fam.mach_max);
    if (d->band.slow_deployment)
        sr_report_warning(r, "%s%sdeployment at or below the canopy's steady descent speed (%.3g m/s): the payload "
                             "speeds up while the canopy fills and the load is governed by the weight; the "
                             "filling-time law is not meant for such slow openings.",
                          pre ? pre : "", pre ? ": " : "", d->res[1].v_terminal);
    if (d->cp->opening == SR_OPENING_ESTIMATED &&
        (strstr(d->cp->fam.cx_source, "memory") || strstr(d->cp->fam.fill_source, "memory") ||
         strstr(d->cp->fam.growth_source, "memory")))
        *recalled = 1;
}

static void notes_common(sr_report *r, int recalled, double design, int cluster, int measured)
{
    sr_report_note(r, "Three estimates on ONE drag-area growth model (CD S)(t) = CD0 S0 (t/t_f)^n, t_f = n_fill D0 / "
                      "max(V, steady rate): the opening-load-factor method takes X1 from the ballistic mass ratio R_m "
                      "on the envelope of the n = 1 and n = 2 curves; Pflanz uses the exponent n with gravity "
                      "neglected; the ODE adds gravity and the flight-path angle. Sharing one model, their spread is "
                      "not the real uncertainty: the band is taken over the canopy's drag range, its growth-exponent "
                      "range and its opening-load-factor range (and the deployment states of the band runs for a "
                      "mission), and its high end governs. A measured opening load or opening-load factor "
                      "(measured-opening: in a canopy file) replaces the estimates. Method and sources: "
                      "docs/method.md, Opening loads.");
    if (measured)
        sr_report_note(r, "A measured opening (measured-opening:) replaces the three estimates where it is given; the "
                          "method table still shows the estimates for comparison.");
    if (cluster)
        sr_report_note(r, "Cluster: canopies do not fill in step and the leading one takes more than its share "
                          "(Knacke 1991, Ch. 6); without --cluster-allowance the per-canopy design load is the "
                          "bound of the same models with the lead canopy decelerating the whole mass alone.");
    if (recalled)
        sr_report_warning(r, "The family's opening-load factor, filling constant and growth exponent are recalled "
                             "handbook values, not checked against the printed tables: confirm the loads by test.");
    if (design > 0)
        sr_report_warning(r, "The design factor and what a rating means (break strength or proof load) are the "
                             "rigger's and the applicable standard's call, not this tool's.");
}

/* A band, or a single value when the band has no width. */
static void band_or_value(sr_report *r, const char *key, const char *label, double lo, double typ, double hi,
                          sr_quantity q, int sig)
{
    if (lo == hi && typ == hi)
        sr_report_value(r, key, label, typ, q, sig);
    else
        sr_report_band(r, key, label, lo, typ, hi, q, sig);
}

static void band_text(char *buf, size_t len, sr_band b, const char *why)
{
    if (b.lo == b.hi)
        snprintf(buf, len, "%.3g (%s)", b.typ, why);
    else
        snprintf(buf, len, "%.3g / %.3g / %.3g (%s)", b.lo, b.typ, b.hi, why);
}

static int report_one(sr_cli *c, sr_report *r, deploy *d, int mission_stage, const tweaks *tw)
{
    const sr_opening_result *lo = &d->res[0], *t = &d->res[1], *hi = &d->res[2];
    const sr_loads_band *B = &d->band;
    (void)c;
    sr_report_section(r, "Deployment");
    if (mission_stage)
        sr_report_text(r, "stage", "stage", d->name);
    sr_report_value(r, "mass", "decelerated mass", d->mass, SR_Q_MASS, 4);
    band_or_value(r, "speed", "speed at line stretch", d->v[0], d->v[1], d->v[2], SR_Q_SPEED, 4);
    sr_report_value(r, "path_angle", "path angle below horizontal", d->angle, SR_Q_ANGLE, 3);
    sr_report_value(r, "altitude", "altitude", d->z, SR_Q_LENGTH, SR_FIXED(0));
    sr_report_value(r, "density", "air density", d->st[0].rho, SR_Q_DENSITY, 4);
    sr_report_value(r, "speed_of_sound", "speed of sound", d->st[0].a, SR_Q_SPEED, 4);
    band_or_value(r, "dynamic_pressure", "dynamic pressure q1", B->q_lo, B->q_typ, B->q_hi, SR_Q_PRESSURE, 4);
    band_or_value(r, "mach", "Mach number", B->mach_lo, B->mach_typ, B->mach_hi, SR_Q_NONE, 3);

    sr_report_section(r, "Canopy");
    sr_cli_report_canopy(r, d->cp);
    if (d->at_rest) {
        sr_report_note(r, "Stage '%s' opens with no airspeed (released under an open canopy): the canopy fills as the "
                          "payload speeds up, and there is no opening shock above the weight.",
                       d->name);
        return 0;
    }
    band_or_value(r, "nominal_diameter", "nominal diameter D0", d->cp->d0.lo, d->cp->d0.typ, d->cp->d0.hi,
                  SR_Q_SIZE, 4);
    band_or_value(r, "drag_area", "drag area CD0 S0 (all canopies)", d->lc.count * d->st[0].cds0 * d->lc.cds_ratio[0],
                  d->lc.count * d->st[0].cds0, d->lc.count * d->st[0].cds0 * d->lc.cds_ratio[2], SR_Q_AREA, 4);
    char buf[512];
    snprintf(buf, sizeof buf, "%.3g%s", d->lc.n_fill, isnan(tw->fill) ? " (family)" : " (given)");
    sr_report_text(r, "filling_constant", "filling constant n_fill", buf);
    band_text(buf, sizeof buf, d->lc.cx, isnan(tw->cx) ? "family" : "given");
    sr_report_text(r, "opening_factor", "opening-load factor CX", buf);
    band_text(buf, sizeof buf, d->lc.growth,
              !isnan(tw->exponent) ? "given"
              : strstr(d->cp->fam.growth_source, "class default")
                  ? (strcmp(d->cp->fam.cls, SR_CANOPY_CLASS_SLOTTED) == 0 ? "slotted class, from memory"
                                                                          : "solid class, from memory")
                  : "family file");
    sr_report_text(r, "growth_exponent", "growth exponent n", buf);
    band_or_value(r, "filling_time", "filling time t_f", fmin(lo->t_fill, fmin(t->t_fill, hi->t_fill)), t->t_fill,
                  fmax(lo->t_fill, fmax(t->t_fill, hi->t_fill)), SR_Q_TIME, 3);
    sr_report_value(r, "mass_ratio", "mass ratio R_m (per canopy, typical)", t->mass_ratio, SR_Q_NONE, 3);
    sr_report_value(r, "ballistic_parameter", "Pflanz parameter A (typical)", t->ballistic, SR_Q_NONE, 3);
    sr_report_text(r, "mass_regime", "mass regime", regime_text(t->regime));
    if (d->cp->opening != SR_OPENING_ESTIMATED) {
        snprintf(buf, sizeof buf, "%s %.4g%s (%s)",
                 d->cp->opening == SR_OPENING_MEASURED_FACTOR ? "opening-load factor" : "opening load",
                 d->cp->opening_value, d->cp->opening == SR_OPENING_MEASURED_LOAD ? " N" : "", d->cp->opening_source);
        sr_report_text(r, "measured_opening", "measured (replaces the estimates)", buf);
    }

    sr_rtable *tab = sr_report_table(r, "methods",
                                     "Peak opening force by method (all canopies; at the combinations of the band's "
                                     "low end, typical, high end)");
    sr_rtable_text_column(tab, "method", "method");
    sr_rtable_column(tab, "force_low", "force low", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_typical", "typical", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_high", "high", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "x1", "X1 typ", SR_Q_NONE, 3);
    sr_rtable_column(tab, "time", "time typ", SR_Q_TIME, 3);
    sr_rtable_column(tab, "deceleration_g", "decel. typ (g)", SR_Q_NONE, 3);
    sr_rtable_text_column(tab, "peak", "peak");
    static const char *const NAMES[3] = {"opening-load factor", "Pflanz (no gravity)", "inflation ODE"};
    for (int m = 0; m < 3; m++) {
        const sr_opening_peak *p[3];
        for (int k = 0; k < 3; k++)
            p[k] = m == 0 ? &d->res[k].olf : m == 1 ? &d->res[k].pflanz : &d->res[k].ode;
        double row[6] = {p[0]->force, p[1]->force, p[2]->force, p[1]->x1, p[1]->time, p[1]->decel_g};
        const char *texts[2] = {NAMES[m], kind_text(p[1]->kind)};
        sr_rtable_row(tab, row, texts);
    }

    sr_report_section(r, "Result");
    band_or_value(r, "peak_force", B->measured ? "peak opening force (measured)" : "peak opening force (highest method)",
                  B->lo.force, B->typ.force, B->hi.force, SR_Q_FORCE, 4);
    char n_txt[64], lbf_txt[64];
    sr_report_format_value(n_txt, sizeof n_txt, B->hi.force, SR_Q_FORCE, SR_UNITS_SI, 4);
    sr_report_format_value(lbf_txt, sizeof lbf_txt, B->hi.force, SR_Q_FORCE, SR_UNITS_US, 4);
    snprintf(buf, sizeof buf, "%s = %s", n_txt, lbf_txt);
    sr_report_text(r, "peak_force_high_n_lbf", "governing peak in N and lbf", buf);
    snprintf(buf, sizeof buf, "%s drag, n = %.3g, CX = %.3g%s", B->hi.drag == 0 ? "low" : B->hi.drag == 2 ? "high" : "typical",
             B->hi.exponent, B->hi.cx,
             B->hi.state == 1 ? ", the fast band-end run" : B->hi.state == 2 ? ", the slow band-end run" : "");
    sr_report_text(r, "governing_combination", "governing combination", buf);
    sr_report_value(r, "spread_percent", "spread of the methods (high-low)/low %, typical", 100 * t->spread,
                    SR_Q_NONE, 3);
    band_or_value(r, "peak_deceleration_g", "peak deceleration (g)", B->lo.decel_g, B->typ.decel_g, B->hi.decel_g,
                  SR_Q_NONE, 3);
    if (d->cp->count > 1) {
        band_or_value(r, "canopy_force_equal", "per canopy, equal share", lo->f_canopy_equal, t->f_canopy_equal,
                      hi->f_canopy_equal, SR_Q_FORCE, 4);
        band_or_value(r, "canopy_force_design", "per canopy, with unequal inflation", lo->f_canopy_design,
                      t->f_canopy_design, hi->f_canopy_design, SR_Q_FORCE, 4);
        snprintf(buf, sizeof buf, "%.3g (%s)", hi->allowance,
                 hi->allowance_derived ? "lead canopy alone with the whole mass, derived bound" : "given");
        sr_report_text(r, "cluster_allowance", "unequal-inflation allowance (high end)", buf);
    }
    if (t->design_factor > 0) {
        sr_report_value(r, "design_factor", "design factor", t->design_factor, SR_Q_NONE, 3);
        sr_report_value(r, "required_strength", "required rated strength, whole system",
                        t->design_factor * B->hi.force, SR_Q_FORCE, 4);
        if (d->cp->count > 1)
            sr_report_value(r, "required_strength_canopy", "required rated strength, each canopy and riser",
                            hi->strength_canopy, SR_Q_FORCE, 4);
    }
    return 0;
}

/* ---- the figure: ODE force vs time (typical case), closed-form peaks marked */

/* One method's peak: a level line across the figure, in the legend with its
 * value, and a point at its time when the method has one. */
static int peak_series(sr_plot *p, sr_unit_system sys, const char *what, const sr_opening_peak *pk, double tend,
                       int color, int dash)
{
    char fv[48], tv[48], title[200], fname[48];
    sr_report_format_value(fv, sizeof fv, pk->force, SR_Q_FORCE, sys, 4);
    if (isfinite(pk->time)) {
        sr_report_format_value(tv, sizeof tv, pk->time, SR_Q_TIME, sys, 3);
        snprintf(title, sizeof title, "%s: %s at %s", what, fv, tv);
    } else {
        snprintf(title, sizeof title, "%s: %s", what, fv);
    }
    snprintf(fname, sizeof fname, "force[%s]", sr_units_label(SR_Q_FORCE, sys));
    const char *names[] = {"time[s]", fname};
    double f = sr_units_from_si(pk->force, SR_Q_FORCE, sys);
    double level[2][2] = {{0, f}, {tend, f}};
    size_t b;
    int rc = sr_plot_block(p, title, 2, names, &b);
    for (int i = 0; i < 2 && !rc; i++)
        rc = sr_plot_row(p, b, level[i]);
    sr_plot_series line = {.kind = SR_PLOT_LINES, .block = b, .x = 1, .y = 2, .title = title, .color = color,
                           .dash = dash};
    if (rc || (rc = sr_plot_add(p, &line)) || !isfinite(pk->time))
        return rc;
    double at[2] = {pk->time, f};
    sr_plot_series point = {.kind = SR_PLOT_POINTS, .x = 1, .y = 2, .color = color};
    if ((rc = sr_plot_block(p, "the peak at its time", 2, names, &point.block)) ||
        (rc = sr_plot_row(p, point.block, at)))
        return rc;
    return sr_plot_add(p, &point);
}

/* What the figure is of, in a line: the deployment and the canopy. */
static void figure_subtitle(const deploy *d, sr_unit_system sys, char *buf, size_t len)
{
    char m[48], v[48], a[48], z[48], d0[48], cds[48], cl[32] = "";
    sr_report_format_value(m, sizeof m, d->mass, SR_Q_MASS, sys, 3);
    sr_report_format_value(v, sizeof v, d->v[1], SR_Q_SPEED, sys, 3);
    sr_report_format_value(a, sizeof a, d->angle, SR_Q_ANGLE, sys, 3);
    sr_report_format_value(z, sizeof z, d->z, SR_Q_LENGTH, sys, SR_FIXED(0));
    sr_report_format_value(d0, sizeof d0, d->in[1].d0, SR_Q_SIZE, sys, 3);
    sr_report_format_value(cds, sizeof cds, d->res[1].cds_total, SR_Q_AREA, sys, 3);
    if (d->cp->count > 1)
        snprintf(cl, sizeof cl, "%d x ", d->cp->count);
    snprintf(buf, len,
             "%s at %s, %s below the horizontal, altitude %s; %s%s D0 %s, CD0 S0 %s (typical). Line: the ODE's "
             "drag without CX; level lines: each method's peak force with CX at the typical values, with a point at "
             "its time, and the governing load at the band's high end.",
             m, v, a, z, cl, d->cp->fam.id, d0, cds);
}

/* A round top for a force axis a tenth above the highest value, so no level
 * line sits on the frame. */
static double round_top(double v)
{
    static const double STEPS[] = {1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10};
    double target = 1.1 * v, p = pow(10.0, floor(log10(target)));
    for (size_t i = 0; i < sizeof STEPS / sizeof STEPS[0]; i++)
        if (STEPS[i] * p >= target)
            return STEPS[i] * p;
    return 10 * p;
}

static int figure(sr_cli *c, const deploy *d, const char *prefix, int argc, char **argv)
{
    if (d->at_rest)
        return 0; /* no opening to draw */
    enum { N = 301 };
    const sr_opening_result *t = &d->res[1];
    sr_unit_system sys = c->units;
    double tend = 2 * t->t_fill;
    if (t->ode.kind != SR_PEAK_STEADY && t->ode.time > 0.5 * tend)
        tend = 2 * t->ode.time;
    double ts[N], fs[N];
    sr_error e;
    if (sr_opening_trace(&d->in[1], tend, N, ts, fs, &e) != SR_OK)
        return sr_cli_fail(c, "--plot: %s", e.msg);
    char title[160], sub[600], xl[64], yl[96], fname[48], tf[48], mark[96];
    snprintf(title, sizeof title, "Opening force vs time%s%s", d->name[0] ? ", stage " : "", d->name);
    figure_subtitle(d, sys, sub, sizeof sub);
    snprintf(xl, sizeof xl, "time after line stretch [%s]", sr_units_label(SR_Q_TIME, sys));
    snprintf(yl, sizeof yl, "force on the payload, all canopies [%s]", sr_units_label(SR_Q_FORCE, sys));
    snprintf(fname, sizeof fname, "force[%s]", sr_units_label(SR_Q_FORCE, sys));
    sr_report_format_value(tf, sizeof tf, t->t_fill, SR_Q_TIME, sys, 3);
    snprintf(mark, sizeof mark, "full inflation, t_f %s", tf);
    sr_plot *p = sr_plot_new(title);
    if (!p)
        return sr_cli_fail(c, "out of memory");
    sr_plot_axes a;
    sr_plot_axes_init(&a);
    a.xlabel = xl;
    a.ylabel = yl;
    a.xmin = 0;
    a.xmax = tend;
    a.ymin = 0;
    double top = fmax(fmax(t->ode.force, d->band.hi.force), fmax(t->pflanz.force, t->olf.force));
    for (int i = 0; i < N; i++)
        top = fmax(top, fs[i]);
    a.ymax = round_top(sr_units_from_si(top, SR_Q_FORCE, sys));
    a.key = SR_PLOT_KEY_ABOVE;
    const char *names[] = {"time[s]", fname};
    size_t b;
    int rc = sr_plot_subtitle(p, sub) || sr_plot_set_axes(p, 0, &a) ||
             sr_plot_block(p, "inflation ODE: drag of the growth model without CX, typical band end", 2, names, &b);
    for (int i = 0; i < N && !rc; i++) {
        double row[2] = {ts[i], sr_units_from_si(fs[i], SR_Q_FORCE, sys)};
        rc = sr_plot_row(p, b, row);
    }
    sr_plot_series drag = {.kind = SR_PLOT_LINES, .block = b, .x = 1, .y = 2, .color = 1,
                           .title = "ODE drag, without CX"};
    int steady = t->ode.kind == SR_PEAK_STEADY;
    /* the governing load of the band (every banded input), when above the typical estimates */
    sr_opening_peak high = {.force = d->band.hi.force, .time = NAN};
    int governs = d->band.hi.force > t->f_high * (1 + 1e-9);
    if (!rc)
        rc = sr_plot_add(p, &drag) ||
             peak_series(p, sys, steady ? "ODE peak, steady drag = weight" : "ODE peak \u00d7 CX", &t->ode, tend, 1,
                         1) ||
             peak_series(p, sys, "Pflanz, no gravity", &t->pflanz, tend, 2, 1) ||
             peak_series(p, sys, "opening-load factor", &t->olf, tend, 3, 2) ||
             (governs && peak_series(p, sys, "governing, band high end", &high, tend, 4, 1)) ||
             sr_plot_marker(p, 0, 'x', t->t_fill, mark, 1);
    if (rc)
        rc = sr_cli_fail(c, "out of memory");
    else
        rc = sr_cli_plot_to(c, p, prefix, argc, argv);
    sr_plot_free(p);
    return rc;
}

/* One figure, or one a stage (PREFIX-STAGE) for a whole mission. */
static int figures(sr_cli *c, const deploy *ds, size_t n, int argc, char **argv)
{
    int rc = 0;
    if (n == 1)
        return figure(c, &ds[0], c->plot_prefix, argc, argv);
    for (size_t i = 0; i < n && !rc; i++) {
        char pre[4096];
        snprintf(pre, sizeof pre, "%s-", c->plot_prefix);
        size_t at = strlen(pre);
        /* the stage name comes from the mission file: as a file name only,
         * so "a/../../x" cannot put a figure anywhere but beside PREFIX */
        for (const char *s = ds[i].name; *s && at + 1 < sizeof pre; s++)
            pre[at++] = isalnum((unsigned char)*s) || *s == '-' || *s == '_' || *s == '.' ? *s : '-';
        pre[at] = '\0';
        rc = figure(c, &ds[i], pre, argc, argv);
    }
    return rc;
}

/* ---- mission files ---------------------------------------------------- */

static int mission_summary(sr_report *r, deploy *ds, size_t n, const tweaks *tw)
{
    sr_rtable *tab = sr_report_table(r, "stages",
                                     "Opening load at each deployment (at line stretch in the band runs; the load band "
                                     "over every banded input, its high end governs)");
    sr_rtable_text_column(tab, "stage", "stage");
    sr_rtable_column(tab, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(tab, "mass", "mass", SR_Q_MASS, 3);
    sr_rtable_column(tab, "speed", "speed", SR_Q_SPEED, 3);
    sr_rtable_column(tab, "path_angle", "angle", SR_Q_ANGLE, 3);
    sr_rtable_column(tab, "dynamic_pressure", "q1", SR_Q_PRESSURE, 3);
    sr_rtable_column(tab, "mach", "Mach", SR_Q_NONE, 2);
    sr_rtable_column(tab, "filling_time", "t_f", SR_Q_TIME, 3);
    sr_rtable_column(tab, "force_olf", "load-factor", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_pflanz", "Pflanz", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_ode", "ODE", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_low", "load low", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_typical", "typical", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_high", "high", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "deceleration_g", "decel. high (g)", SR_Q_NONE, 3);
    if (!isnan(tw->design))
        sr_rtable_column(tab, "required_strength", "strength", SR_Q_FORCE, 4);
    sr_rtable_text_column(tab, "ode_peak", "ODE peak");
    sr_rtable_text_column(tab, "mass_regime", "mass regime");
    for (size_t i = 0; i < n; i++) {
        const sr_opening_result *t = &ds[i].res[1];
        const sr_loads_band *B = &ds[i].band;
        double row[16] = {ds[i].z,      ds[i].mass,      ds[i].v[1],      ds[i].angle,    B->q_typ,
                          B->mach_typ,  t->t_fill,       t->olf.force,    t->pflanz.force, t->ode.force,
                          B->lo.force,  B->typ.force,    B->hi.force,     B->hi.decel_g,
                          isnan(tw->design) ? NAN : tw->design * B->hi.force};
        const char *texts[3] = {ds[i].name, ds[i].at_rest ? "opens at rest" : kind_text(t->ode.kind),
                                ds[i].at_rest ? "-" : t->regime == SR_OPENING_INFINITE_MASS ? "infinite" : "finite"};
        sr_rtable_row(tab, row, texts);
    }
    return 0;
}

/* --stage names no stage of the mission: say so, with the nearest name. */
static int no_stage(sr_cli *c, const sr_mission *mis, const char *name)
{
    const char *names[SR_MISSION_MAX_STAGES + 1];
    for (size_t i = 0; i < mis->nstages; i++)
        names[i] = mis->stages[i].name;
    names[mis->nstages] = NULL;
    const char *s = sr_yaml_suggest(name, names);
    if (s)
        return sr_cli_fail(c, "--stage: the mission has no stage '%s'; did you mean '%s'?", name, s);
    return sr_cli_fail(c, "--stage: the mission has no stage '%s'", name);
}

/* ---- entry point ------------------------------------------------------ */

static int parse_tweaks(sr_cli *c, const loads_opts *o, tweaks *tw)
{
    int rc;
    tw->exponent = tw->fill = tw->cx = tw->design = tw->allowance = NAN;
    if (o->exponent && (rc = sr_cli_quantity(c, "--growth-exponent", o->exponent, SR_Q_NONE, 1, &tw->exponent)))
        return rc;
    if (o->fill && (rc = sr_cli_quantity(c, "--filling-constant", o->fill, SR_Q_NONE, 1, &tw->fill)))
        return rc;
    if (o->cx && (rc = sr_cli_quantity(c, "--opening-factor", o->cx, SR_Q_NONE, 1, &tw->cx)))
        return rc;
    if (o->design && (rc = sr_cli_quantity(c, "--design-factor", o->design, SR_Q_NONE, 1, &tw->design)))
        return rc;
    if (o->allowance && (rc = sr_cli_quantity(c, "--cluster-allowance", o->allowance, SR_Q_NONE, 1, &tw->allowance)))
        return rc;
    if (!isnan(tw->design) && tw->design < 1)
        return sr_cli_fail(c, "--design-factor: must be at least 1 (got '%s')", o->design);
    if (!isnan(tw->allowance) && tw->allowance < 1)
        return sr_cli_fail(c, "--cluster-allowance: must be at least 1 (got '%s')", o->allowance);
    return 0;
}

/* A deployment state from the options (one state: the band is then over the
 * canopy's own bands only). */
static int state_from_options(sr_cli *c, const loads_opts *o, const sr_atmos *atm, double ground, double z_stage,
                              double mass, deploy *d)
{
    int rc;
    double v;
    if (!o->speed)
        return sr_cli_fail(c, "--speed: the speed at deployment is required");
    if ((rc = sr_cli_quantity(c, "--speed", o->speed, SR_Q_SPEED, 1, &v)))
        return rc;
    double angle = M_PI / 2;
    if (o->angle && (rc = sr_cli_quantity(c, "--path-angle", o->angle, SR_Q_ANGLE, 0, &angle)))
        return rc;
    if (fabs(angle) > M_PI / 2 + 1e-9)
        return sr_cli_fail(c, "--path-angle: '%s' is outside -90..90 degrees below the horizontal", o->angle);
    d->z = isnan(z_stage) ? ground : z_stage;
    if (o->payload.altitude && (rc = sr_cli_quantity(c, "--altitude", o->payload.altitude, SR_Q_LENGTH, 0, &d->z)))
        return rc;
    sr_air air;
    sr_error e;
    if (sr_atmos_at(atm, d->z, &air, &e) != SR_OK)
        return sr_cli_fail(c, "--altitude: %s", e.msg);
    /* the state sr_loads_deployment takes too: a program and this command agree */
    memset(d->st, 0, sizeof d->st);
    sr_loads_state_of(&d->st[0], d->cp, mass, v, angle, &air);
    return 0;
}

static int run_loads(sr_cli *c, int argc, char **argv)
{
    loads_opts o;
    memset(&o, 0, sizeof o);
    int rc = sr_cli_parse_options(c, argc, argv, &o, NULL);
    if (rc)
        return rc;
    tweaks tw;
    if ((rc = parse_tweaks(c, &o, &tw)))
        return rc;
    sr_judge_basis basis = SR_JUDGE_BAND_END;
    if (o.limits_at && (rc = sr_cli_limits_at(c, o.limits_at, &basis)))
        return rc;
    if (o.stage && !o.payload.mission)
        return sr_cli_fail(c, "--stage: needs --mission FILE");
    if (o.limits_at && !o.payload.mission)
        return sr_cli_fail(c, "--limits-at: needs --mission FILE (the limits are the mission's)");
    if (o.payload.mission && !o.stage && (o.speed || o.angle || o.payload.altitude))
        return sr_cli_fail(c, "%s: with --mission, a deployment state applies to one stage; add --stage NAME",
                           o.speed ? "--speed" : o.angle ? "--path-angle" : "--altitude");
    if (o.payload.mission && sr_cli_canopy_given(&o.canopy))
        return sr_cli_fail(c, "--mission: the stages give the canopies; drop --family / --canopy");
    if (o.payload.mission && o.payload.mass)
        return sr_cli_fail(c, "--mass: with --mission the mass under each canopy comes from the staged descent; drop "
                              "--mass");

    sr_catalog *cat = NULL;
    sr_mission *mis = NULL;
    sr_atmos atm;
    sr_atmos_init_standard(&atm);
    sr_report *r = NULL;
    sr_error e;
    sr_canopy cp;
    sr_band_ctx *bc = NULL;
    sr_band_result *BR = NULL;
    deploy *ds = calloc(SR_MISSION_MAX_STAGES, sizeof *ds);
    size_t nd = 0;
    double mass = NAN, ground = 0;
    int judged = 0, exceeded = 0;
    sr_judge_limits lim;
    sr_verdict verdict;
    if (!ds) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    if ((rc = sr_cli_catalog(c, &cat)) || (rc = sr_cli_mission(c, o.payload.mission, cat, &o.atmos, &mis, &atm, &ground)))
        goto out;
    if (!mis) {
        if ((rc = sr_cli_canopy(c, cat, &o.canopy, 1, &cp)) ||
            (rc = sr_cli_mass(c, o.payload.mass, "the mass the canopy decelerates", &mass)))
            goto out;
        deploy *d = &ds[nd++];
        d->cp = &cp;
        sr_loads_canopy_init(&d->lc, &cp);
        apply_tweaks(&d->lc, &tw);
        if ((rc = state_from_options(c, &o, &atm, ground, NAN, mass, d)))
            goto out;
    } else {
        size_t only = mis->nstages;
        if (o.stage) {
            for (only = 0; only < mis->nstages && strcmp(mis->stages[only].name, o.stage) != 0; only++)
                ;
            if (only == mis->nstages) {
                rc = no_stage(c, mis, o.stage);
                goto out;
            }
        }
        if (!mis->has_start) {
            rc = sr_cli_fail(c, "--mission: %s has no start block (start:); the deployment states come from the staged "
                                "descent, which needs it",
                             mis->path);
            goto out;
        }
        for (size_t k = 0; k < mis->nstages; k++)
            if (!mis->stages[k].has_size) {
                rc = sr_cli_fail(c, "--mission: stage '%s' has no size; give one in the file, or run `sinkrate size "
                                    "--mission` first",
                                 mis->stages[k].name);
                goto out;
            }
        /* the same band runs as `sinkrate profile` */
        BR = calloc(1, sizeof *BR);
        if (!BR) {
            rc = sr_cli_fail(c, "out of memory");
            goto out;
        }
        /* the air moved into atm (the file's, or the options' that replace it); the context copies it */
        sr_atmos own = mis->atmos;
        double own_ground = mis->ground;
        mis->atmos = atm;
        mis->ground = ground;
        int bad = sr_band_ctx_new(&bc, mis, NULL, &e);
        mis->atmos = own;
        mis->ground = own_ground;
        if (bad || sr_band_run(bc, NULL, SR_PROFILE_FULL, NULL, BR, NULL, &e)) {
            rc = sr_cli_fail_err(c, &e);
            goto out;
        }
        for (size_t k = 0; k < mis->nstages; k++) {
            if (o.stage && k != only)
                continue;
            deploy *d = &ds[nd++];
            snprintf(d->name, sizeof d->name, "%s", mis->stages[k].name);
            d->cp = &mis->stages[k].canopy;
            d->lc = *sr_band_loads_canopy(bc, k);
            apply_tweaks(&d->lc, &tw);
            const sr_profile_stage *ps = &BR->run[SR_BAND_TYPICAL].stage[k];
            if (o.speed) {
                double z = ps->deployed ? mis->ground + ps->h_line : NAN;
                double m = ps->deployed ? ps->mass : sr_mission_total_mass(mis);
                if ((rc = state_from_options(c, &o, &atm, ground, z, m, d)))
                    goto out;
                continue;
            }
            if (!ps->deployed) {
                rc = sr_cli_fail(c, "--mission: stage '%s' never deploys in the staged descent (its sections land "
                                    "first)",
                                 d->name);
                goto out;
            }
            for (int e2 = 0; e2 < SR_BAND_NRUNS; e2++) {
                sr_band_state(sr_band_profile(bc), &BR->run[e2], k, &d->st[e2]);
                d->st[e2].cds0 /= sr_band_drag_factor(bc, k, e2);
            }
            d->z = mis->ground + ps->h_line;
        }
    }
    for (size_t i = 0; i < nd; i++)
        if ((rc = solve(c, &ds[i], &tw, mis != NULL && !o.speed)))
            goto out;
    if (mis && !o.speed) {
        /* the one judge on the mission's rated strength, with these loads */
        sr_judge_limits_init(&lim, mis);
        for (size_t i = 0, k = 0; k < mis->nstages; k++)
            if (!o.stage || strcmp(mis->stages[k].name, o.stage) == 0)
                BR->loads[k] = ds[i++].band;
        sr_judge_band(&lim, BR, basis, &verdict);
        if (o.stage) {
            /* the page is about one stage: its rows only */
            size_t n = 0;
            for (size_t i = 0; i < verdict.nrows; i++)
                if (verdict.row[i].index >= 0 && strcmp(mis->stages[verdict.row[i].index].name, o.stage) == 0 &&
                    verdict.row[i].kind >= SR_JUDGE_DEPLOY_Q)
                    verdict.row[n++] = verdict.row[i];
            verdict.nrows = n;
            verdict.binding = -1;
        }
        judged = 1;
    }

    r = sr_report_new("loads", "opening load at deployment");
    if (!r) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    if (judged)
        sr_cli_verdict_header(r, basis);
    sr_report_section(r, "Inputs");
    if (mis)
        sr_report_text(r, "mission", "mission", mis->name);
    sr_cli_report_atmos(r, &atm);
    int recalled = 0, cluster = 0, measured = 0;
    if (nd == 1) {
        if ((rc = report_one(c, r, &ds[0], mis != NULL, &tw)))
            goto out;
    } else {
        if ((rc = mission_summary(r, ds, nd, &tw)))
            goto out;
        sr_report_note(r, "Each stage at its line stretch in the staged descent of `sinkrate profile` (the same band "
                          "runs and the same function: the numbers agree); `sinkrate loads --mission FILE --stage "
                          "NAME` shows one stage in full.");
    }
    if (judged) {
        unsigned only = 1u << SR_JUDGE_OPENING;
        if (sr_cli_verdict_table(r, c, mis, &lim, &verdict, only))
            exceeded = sr_cli_verdict_messages(r, c, mis, &lim, &verdict, only);
        else
            sr_report_note(r, "The mission sets no rated-strength limit: the loads are not judged.");
    }
    for (size_t i = 0; i < nd; i++) {
        warn_common(r, &ds[i], &recalled, nd > 1);
        cluster |= ds[i].cp->count > 1;
        measured |= ds[i].band.measured;
    }
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    if (mis) {
        sr_input_warnings_mission(&iw, mis, &atm, c->units);
        if (o.payload.mass)
            sr_input_warnings_value(&iw, SR_PLAUS_MASS, mass, "--mass", c->units);
    } else {
        sr_input_warnings_value(&iw, SR_PLAUS_MASS, mass, "decelerated mass", c->units);
        sr_input_warnings_canopy(&iw, &cp, "canopy", c->units);
    }
    sr_cli_report_input_warnings(r, &iw);
    notes_common(r, recalled, isnan(tw.design) ? 0 : tw.design, cluster, measured);
    if (c->plot_prefix && (rc = figures(c, ds, nd, argc, argv)))
        goto out;
    if ((rc = sr_cli_emit(c, r)))
        goto out;
    rc = exceeded ? SR_EXIT_LIMIT : SR_EXIT_OK;
out:
    sr_report_free(r);
    sr_atmos_release(&atm);
    sr_cli_mission_free(mis);
    sr_band_ctx_free(bc);
    free(BR);
    free(ds);
    free(cat);
    return rc;
}
