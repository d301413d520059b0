/* cmd_loads.c - `sinkrate loads`: opening load of a canopy (or cluster) at
 * deployment by three methods, their spread, per-canopy loads and required
 * strengths; for a mission file, at every stage's deployment. */
#define _DEFAULT_SOURCE
#include <ctype.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "analysis/input_warnings.h"
#include "physics/descent.h"
#include "files/mission.h"
#include "physics/opening.h"
#include "files/yamldoc.h"

enum {
    OPT_MASS = OPT_COMMAND_BASE, OPT_SPEED, OPT_ALTITUDE, OPT_PATH_ANGLE, OPT_DESIGN_FACTOR, OPT_EXPONENT,
    OPT_FILL, OPT_CX, OPT_ALLOWANCE, OPT_MISSION, OPT_STAGE
};

static const struct option OPTS[] = {
    {"mass", required_argument, NULL, OPT_MASS},
    {"speed", required_argument, NULL, OPT_SPEED},
    {"altitude", required_argument, NULL, OPT_ALTITUDE},
    {"path-angle", required_argument, NULL, OPT_PATH_ANGLE},
    {"design-factor", required_argument, NULL, OPT_DESIGN_FACTOR},
    {"growth-exponent", required_argument, NULL, OPT_EXPONENT},
    {"filling-constant", required_argument, NULL, OPT_FILL},
    {"opening-factor", required_argument, NULL, OPT_CX},
    {"cluster-allowance", required_argument, NULL, OPT_ALLOWANCE},
    {"mission", required_argument, NULL, OPT_MISSION},
    {"stage", required_argument, NULL, OPT_STAGE},
    SR_OPTS_CANOPY,
    SR_OPTS_ATMOS,
    SR_OPTS_PLOT,
    SR_OPTS_OUTPUT,
    {NULL, 0, NULL, 0}};

static const char HELP[] =
    "usage: sinkrate loads --mass M --speed V --family ID --nominal-diameter D [options]\n"
    "       sinkrate loads --mass M --speed V --canopy FILE [options]\n"
    "       sinkrate loads --mission FILE [--stage NAME] [options]\n\n"
    "Peak opening force of a canopy or cluster deployed at speed V, by three methods\n"
    "built on one drag-area growth model: the opening-load-factor method (X1 from the\n"
    "ballistic mass ratio), the Pflanz closed form (gravity neglected) and an inflation\n"
    "ODE with gravity and flight-path angle. Bands come from the family's drag and\n"
    "opening-factor ranges; the highest estimate governs the design figures.\n\n"
    "  --mass M                 mass the canopies decelerate\n"
    "  --speed V                speed at line stretch (deployment), subsonic\n"
    "  --altitude Z             deployment altitude above sea level (default: the site\n"
    "                           elevation, or 0)\n"
    "  --path-angle A           flight-path angle below the horizontal at deployment:\n"
    "                           90 straight down (default), 0 level as at apogee\n"
    "  --design-factor K        turn the peak into a required rated strength (1 to 10)\n"
    "  --growth-exponent N      drag area grows as (t/t_f)^N while filling (default by the\n"
    "                           family's class: solid 2, slotted 1, from memory)\n"
    "  --filling-constant N     override the family's filling constant (t_f = N D0 / V)\n"
    "  --opening-factor CX      override the family's opening-load factor\n"
    "  --cluster-allowance K    per-canopy load over the equal share in a cluster (default:\n"
    "                           the bound with the lead canopy taking the whole mass)\n"
    "  --mission FILE           mass, site and stages from a mission file: the first stage\n"
    "                           deploys at the start state, later ones at the previous\n"
    "                           stage's steady descent rate, straight down\n"
    "  --stage NAME             only this stage of the mission (then --speed and --path-angle\n"
    "                           may replace its deployment state)\n\n"
    "The figure (with --plot): force vs time from the inflation ODE at the typical ends of\n"
    "the bands, with each method's peak marked; for a whole mission, one figure a stage,\n"
    "PREFIX-STAGE.png (in the stage's name, what is not a letter, digit, '.', '_' or '-'\n"
    "becomes '-').\n\n";

typedef struct loads_opts {
    const char *mass, *speed, *altitude, *angle, *design, *exponent, *fill, *cx, *allowance, *mission, *stage;
    sr_canopy_opts canopy;
    sr_atmos_opts atmos;
} loads_opts;

static int take(sr_cli *c, int code, const char *arg, void *ud)
{
    loads_opts *o = ud;
    switch (code) {
    case OPT_MASS: o->mass = arg; return 0;
    case OPT_SPEED: o->speed = arg; return 0;
    case OPT_ALTITUDE: o->altitude = arg; return 0;
    case OPT_PATH_ANGLE: o->angle = arg; return 0;
    case OPT_DESIGN_FACTOR: o->design = arg; return 0;
    case OPT_EXPONENT: o->exponent = arg; return 0;
    case OPT_FILL: o->fill = arg; return 0;
    case OPT_CX: o->cx = arg; return 0;
    case OPT_ALLOWANCE: o->allowance = arg; return 0;
    case OPT_MISSION: o->mission = arg; return 0;
    case OPT_STAGE: o->stage = arg; return 0;
    }
    if (sr_cli_take_canopy(&o->canopy, code, arg) || sr_cli_take_atmos(&o->atmos, code, arg))
        return 0;
    return 1;
}

/* Overrides of the family data and the design options; NaN = not given. */
typedef struct tweaks {
    double exponent, fill, cx, design, allowance;
} tweaks;

/* One deployment, evaluated at the low, typical and high ends of the
 * canopy's drag band (with the opening factor's band and, in a mission,
 * the band of the speed the previous stage brings). */
typedef struct deploy {
    char name[SR_NAME_MAX];
    const sr_canopy *cp;
    double mass, z, angle;
    double v[3];
    sr_air air;
    sr_opening_input in[3];
    sr_opening_result res[3];
    double exponent;
} deploy;

static double band_at(const sr_band *b, int k)
{
    return k == 0 ? b->lo : k == 1 ? b->typ : b->hi;
}

/* Which option a library message is about, for the one-line error. */
static const char *option_of(const char *msg, int mission)
{
    static const struct {
        const char *word, *opt;
    } MAP[] = {{"deployment speed", "--speed"}, {"Mach", "--speed"},       {"filling constant", "--filling-constant"},
               {"opening-load factor", "--opening-factor"}, {"growth exponent", "--growth-exponent"},
               {"design factor", "--design-factor"},         {"payload mass", "--mass"},
               {"flight-path angle", "--path-angle"},        {"cluster allowance", "--cluster-allowance"},
               {"drag area", "--drag-coefficient"}};
    for (size_t i = 0; i < sizeof MAP / sizeof MAP[0]; i++)
        if (strstr(msg, MAP[i].word))
            return mission && strcmp(MAP[i].opt, "--speed") == 0 ? "--mission" : MAP[i].opt;
    return mission ? "--mission" : "--speed";
}

static int solve(sr_cli *c, deploy *d, const tweaks *tw, int mission)
{
    const sr_family *f = &d->cp->fam;
    d->exponent = !isnan(tw->exponent) ? tw->exponent
                  : strcmp(f->cls, SR_CANOPY_CLASS_SLOTTED) == 0 ? sr_opening_class_exponent(SR_OPENING_SLOTTED)
                                                                 : sr_opening_class_exponent(SR_OPENING_SOLID);
    for (int k = 0; k < 3; k++) {
        sr_opening_input *in = &d->in[k];
        sr_opening_input_init(in);
        in->cds0 = d->cp->cluster_factor * band_at(&d->cp->cds, k);
        in->d0 = band_at(&d->cp->d0, k);
        in->count = d->cp->count;
        in->mass = d->mass;
        in->v1 = d->v[k];
        in->path_angle = d->angle;
        in->rho = d->air.rho;
        in->a = d->air.a;
        in->g = d->air.g;
        in->n_fill = !isnan(tw->fill) ? tw->fill : f->fill_n;
        in->cx = !isnan(tw->cx) ? tw->cx : band_at(&f->cx, k);
        in->exponent = d->exponent;
        in->design_factor = isnan(tw->design) ? 0 : tw->design;
        in->cluster_allowance = isnan(tw->allowance) ? 0 : tw->allowance;
        in->mach_envelope = isfinite(f->mach_max) ? f->mach_max : 0;
        sr_error e;
        if (sr_opening_solve(in, &d->res[k], &e) != SR_OK) {
            const char *opt = option_of(e.msg, mission);
            if (mission)
                return sr_cli_fail(c, "%s: stage '%s': %s", opt, d->name, e.msg);
            return sr_cli_fail(c, "%s: %s", opt, e.msg);
        }
    }
    return 0;
}

/* Lowest and highest of a result field over the three band ends. */
#define SPAN(d, field, lo, hi)                                                                                \
    do {                                                                                                      \
        lo = fmin((d)->res[0].field, fmin((d)->res[1].field, (d)->res[2].field));                            \
        hi = fmax((d)->res[0].field, fmax((d)->res[1].field, (d)->res[2].field));                            \
    } while (0)

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
    const sr_opening_result *t = &d->res[1];
    const char *pre = mission ? d->name : NULL;
    if (t->above_envelope)
        sr_report_warning(r, "%s%sMach %.2f at deployment is above the %s family's usual application (Mach %.2g, "
                             "from memory).",
                          pre ? pre : "", pre ? ": " : "", t->mach, d->cp->fam.id, d->cp->fam.mach_max);
    if (d->res[2].slow_deployment)
        sr_report_warning(r, "%s%sdeployment at or below the canopy's steady descent speed (%.3g m/s): the payload "
                             "speeds up while the canopy fills and the load is governed by the weight; the "
                             "filling-time law is not meant for such slow openings.",
                          pre ? pre : "", pre ? ": " : "", t->v_terminal);
    if (strstr(d->cp->fam.cx_source, "memory") || strstr(d->cp->fam.fill_source, "memory"))
        *recalled = 1;
}

static void notes_common(sr_report *r, int recalled, double design, int cluster)
{
    sr_report_note(r, "Three estimates on one drag-area growth model (CD S)(t) = CD0 S0 (t/t_f)^n, t_f = n_fill D0 / V: "
                      "the opening-load-factor method takes X1 from the ballistic mass ratio R_m on the envelope "
                      "of the solid (n = 2) and slotted (n = 1) curves; Pflanz uses the family's own exponent with "
                      "gravity neglected; the ODE adds gravity and the flight-path angle. They differ by the "
                      "filling shape (most for light payloads) and by gravity (most for steep, heavy deployments); "
                      "the highest governs. Method and sources: docs/method.md, Opening loads.");
    if (cluster)
        sr_report_note(r, "Cluster: canopies do not fill in step and the leading one takes more than its share "
                          "(Knacke 1991, Ch. 6); without --cluster-allowance the per-canopy design load is the "
                          "bound of the same models with the lead canopy decelerating the whole mass alone.");
    if (recalled)
        sr_report_warning(r, "The family's opening-load factor and filling constant are recalled handbook values, "
                             "not checked against the printed tables: confirm the loads by test.");
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

static int report_one(sr_cli *c, sr_report *r, deploy *d, int mission_stage, const tweaks *tw)
{
    const sr_opening_result *lo = &d->res[0], *t = &d->res[1], *hi = &d->res[2];
    double a, b;
    sr_report_section(r, "Deployment");
    if (mission_stage)
        sr_report_text(r, "stage", "stage", d->name);
    sr_report_value(r, "mass", "decelerated mass", d->mass, SR_Q_MASS, 4);
    if (d->v[0] != d->v[2])
        band_or_value(r, "speed", "speed at deployment", d->v[0], d->v[1], d->v[2], SR_Q_SPEED, 4);
    else
        sr_report_value(r, "speed", "speed at deployment", d->v[1], SR_Q_SPEED, 4);
    sr_report_value(r, "path_angle", "path angle below horizontal", d->angle, SR_Q_ANGLE, 3);
    sr_report_value(r, "altitude", "altitude", d->z, SR_Q_LENGTH, SR_FIXED(0));
    sr_report_value(r, "density", "air density", d->air.rho, SR_Q_DENSITY, 4);
    sr_report_value(r, "speed_of_sound", "speed of sound", d->air.a, SR_Q_SPEED, 4);
    SPAN(d, q1, a, b);
    band_or_value(r, "dynamic_pressure", "dynamic pressure q1", a, t->q1, b, SR_Q_PRESSURE, 4);
    SPAN(d, mach, a, b);
    band_or_value(r, "mach", "Mach number", a, t->mach, b, SR_Q_NONE, 3);

    sr_report_section(r, "Canopy");
    sr_cli_report_canopy(r, d->cp);
    band_or_value(r, "nominal_diameter", "nominal diameter D0", d->cp->d0.lo, d->cp->d0.typ, d->cp->d0.hi,
                   SR_Q_LENGTH, 4);
    band_or_value(r, "drag_area", "drag area CD0 S0 (all canopies)", lo->cds_total, t->cds_total, hi->cds_total,
                   SR_Q_AREA, 4);
    char buf[512];
    snprintf(buf, sizeof buf, "%.3g%s", d->in[1].n_fill, isnan(tw->fill) ? " (family)" : " (given)");
    sr_report_text(r, "filling_constant", "filling constant n_fill", buf);
    band_or_value(r, "opening_factor", "opening-load factor CX", d->in[0].cx, d->in[1].cx, d->in[2].cx, SR_Q_NONE,
                   3);
    snprintf(buf, sizeof buf, "%.3g (%s)", d->exponent,
             !isnan(tw->exponent) ? "given" : strcmp(d->cp->fam.cls, SR_CANOPY_CLASS_SLOTTED) == 0
                                                  ? "slotted class, from memory"
                                                  : "solid class, from memory");
    sr_report_text(r, "growth_exponent", "growth exponent n", buf);
    SPAN(d, t_fill, a, b);
    band_or_value(r, "filling_time", "filling time t_f", a, t->t_fill, b, SR_Q_TIME, 3);
    SPAN(d, mass_ratio, a, b);
    band_or_value(r, "mass_ratio", "mass ratio R_m (per canopy)", a, t->mass_ratio, b, SR_Q_NONE, 3);
    SPAN(d, ballistic, a, b);
    band_or_value(r, "ballistic_parameter", "Pflanz parameter A", a, t->ballistic, b, SR_Q_NONE, 3);
    sr_report_text(r, "mass_regime", "mass regime", regime_text(t->regime));

    sr_rtable *tab = sr_report_table(r, "methods", "Peak opening force by method (all canopies)");
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
        double row[6] = {fmin(p[0]->force, fmin(p[1]->force, p[2]->force)),
                         p[1]->force,
                         fmax(p[0]->force, fmax(p[1]->force, p[2]->force)),
                         p[1]->x1,
                         p[1]->time,
                         p[1]->decel_g};
        const char *texts[2] = {NAMES[m], kind_text(p[1]->kind)};
        sr_rtable_row(tab, row, texts);
    }

    sr_report_section(r, "Result");
    SPAN(d, f_high, a, b);
    band_or_value(r, "peak_force", "peak opening force (highest method)", a, t->f_high, b, SR_Q_FORCE, 4);
    char n_txt[64], lbf_txt[64];
    sr_report_format_value(n_txt, sizeof n_txt, b, SR_Q_FORCE, SR_UNITS_SI, 4);
    sr_report_format_value(lbf_txt, sizeof lbf_txt, b, SR_Q_FORCE, SR_UNITS_US, 4);
    snprintf(buf, sizeof buf, "%s = %s", n_txt, lbf_txt);
    sr_report_text(r, "peak_force_high_n_lbf", "highest peak in N and lbf", buf);
    SPAN(d, spread, a, b);
    band_or_value(r, "spread_percent", "spread of the methods (high-low)/low %", 100 * a, 100 * t->spread, 100 * b,
                  SR_Q_NONE, 3);
    SPAN(d, decel_g_max, a, b);
    band_or_value(r, "peak_deceleration_g", "peak deceleration (g)", a, t->decel_g_max, b, SR_Q_NONE, 3);
    if (d->cp->count > 1) {
        SPAN(d, f_canopy_equal, a, b);
        band_or_value(r, "canopy_force_equal", "per canopy, equal share", a, t->f_canopy_equal, b, SR_Q_FORCE, 4);
        SPAN(d, f_canopy_design, a, b);
        band_or_value(r, "canopy_force_design", "per canopy, with unequal inflation", a, t->f_canopy_design, b,
                       SR_Q_FORCE, 4);
        snprintf(buf, sizeof buf, "%.3g (%s)", hi->allowance,
                 hi->allowance_derived ? "lead canopy alone with the whole mass, derived bound" : "given");
        sr_report_text(r, "cluster_allowance", "unequal-inflation allowance (high end)", buf);
    }
    if (t->design_factor > 0) {
        sr_report_value(r, "design_factor", "design factor", t->design_factor, SR_Q_NONE, 3);
        sr_report_value(r, "required_strength", "required rated strength, whole system", hi->strength_total,
                        SR_Q_FORCE, 4);
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
    sr_report_format_value(d0, sizeof d0, d->in[1].d0, SR_Q_LENGTH, sys, 3);
    sr_report_format_value(cds, sizeof cds, d->res[1].cds_total, SR_Q_AREA, sys, 3);
    if (d->cp->count > 1)
        snprintf(cl, sizeof cl, "%d x ", d->cp->count);
    snprintf(buf, len,
             "%s at %s, %s below the horizontal, altitude %s; %s%s D0 %s, CD0 S0 %s (typical). Line: the ODE's "
             "drag without CX; level lines: each method's peak force with CX, with a point at its time.",
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
    double top = fmax(t->ode.force, fmax(t->pflanz.force, t->olf.force));
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
    if (!rc)
        rc = sr_plot_add(p, &drag) ||
             peak_series(p, sys, steady ? "ODE peak, steady drag = weight" : "ODE peak \u00d7 CX", &t->ode, tend, 1,
                         1) ||
             peak_series(p, sys, "Pflanz, no gravity", &t->pflanz, tend, 2, 1) ||
             peak_series(p, sys, "opening-load factor", &t->olf, tend, 3, 2) ||
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

static int mission_summary(sr_cli *c, sr_report *r, deploy *ds, size_t n, const tweaks *tw)
{
    sr_rtable *tab = sr_report_table(r, "stages", "Opening load at each deployment (typical; peak band high end)");
    sr_rtable_text_column(tab, "stage", "stage");
    sr_rtable_column(tab, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(tab, "speed", "speed", SR_Q_SPEED, 3);
    sr_rtable_column(tab, "path_angle", "angle", SR_Q_ANGLE, 3);
    sr_rtable_column(tab, "dynamic_pressure", "q1", SR_Q_PRESSURE, 3);
    sr_rtable_column(tab, "mach", "Mach", SR_Q_NONE, 2);
    sr_rtable_column(tab, "filling_time", "t_f", SR_Q_TIME, 3);
    sr_rtable_column(tab, "mass_ratio", "R_m", SR_Q_NONE, 3);
    sr_rtable_column(tab, "force_olf", "load-factor", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_pflanz", "Pflanz", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_ode", "ODE", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "force_high", "peak high", SR_Q_FORCE, 4);
    sr_rtable_column(tab, "deceleration_g", "decel. (g)", SR_Q_NONE, 3);
    if (!isnan(tw->design))
        sr_rtable_column(tab, "required_strength", "strength", SR_Q_FORCE, 4);
    sr_rtable_text_column(tab, "ode_peak", "ODE peak");
    sr_rtable_text_column(tab, "mass_regime", "mass regime");
    for (size_t i = 0; i < n; i++) {
        const sr_opening_result *t = &ds[i].res[1];
        double a, b;
        SPAN(&ds[i], f_high, a, b);
        (void)a;
        double row[13] = {ds[i].z,      ds[i].v[1],      ds[i].angle,   t->q1,         t->mach,
                          t->t_fill,    t->mass_ratio,   t->olf.force,  t->pflanz.force, t->ode.force,
                          b,            t->decel_g_max,  ds[i].res[2].strength_total};
        const char *texts[3] = {ds[i].name, kind_text(t->ode.kind),
                                t->regime == SR_OPENING_INFINITE_MASS ? "infinite" : "finite"};
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

/* Deployment states of a mission's stages: the first at the start state,
 * each later one at the previous stage's steady descent rate (its band),
 * straight down, at its deployment height. */
static int mission_deploys(sr_cli *c, const sr_mission *mis, const sr_atmos *atm, double mass, deploy *ds,
                           size_t *n, const char *only)
{
    sr_error e;
    *n = 0;
    int found = 0;
    for (size_t i = 0; i < mis->nstages; i++) {
        const sr_stage *s = &mis->stages[i];
        if (only && strcmp(only, s->name) != 0)
            continue;
        found = 1;
        deploy *d = &ds[(*n)++];
        memset(d, 0, sizeof *d);
        snprintf(d->name, sizeof d->name, "%s", s->name);
        d->cp = &s->canopy;
        d->mass = mass;
        if (!s->has_size)
            return sr_cli_fail(c, "--mission: stage '%s' has no size; give one in the file, or run `sinkrate size "
                                  "--mission` first",
                               s->name);
        if (s->deploy == SR_DEPLOY_APOGEE) {
            if (!mis->has_start)
                return sr_cli_fail(c, "--mission: stage '%s' deploys at the start state, but the file has no "
                                      "start block (height, speed, path angle)",
                                   s->name);
            d->z = mis->ground + mis->start_height;
            d->v[0] = d->v[1] = d->v[2] = mis->start_speed;
            d->angle = mis->start_path_angle;
        } else if (s->deploy == SR_DEPLOY_ALTITUDE && i > 0) {
            const sr_stage *prev = &mis->stages[i - 1];
            d->z = mis->ground + s->deploy_value;
            d->angle = M_PI / 2;
            sr_air air;
            sr_band v;
            if (sr_atmos_at(atm, d->z, &air, &e) != SR_OK || sr_descent_rate(&prev->canopy, mass, 0, &air, &v, &e))
                return sr_cli_fail(c, "--mission: stage '%s': %s", s->name, e.msg);
            /* the fastest previous descent goes with the high end of this canopy's band */
            d->v[0] = v.lo;
            d->v[1] = v.typ;
            d->v[2] = v.hi;
        } else {
            return sr_cli_fail(c, "--mission: stage '%s' deploys on a timer (or first, at a height); its speed at "
                                  "deployment needs the trajectory: give --stage %s with --speed and --path-angle, "
                                  "or see `sinkrate profile`",
                               s->name, s->name);
        }
        if (sr_atmos_at(atm, d->z, &d->air, &e) != SR_OK)
            return sr_cli_fail(c, "--mission: stage '%s': %s", s->name, e.msg);
    }
    if (only && !found)
        return no_stage(c, mis, only);
    return 0;
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

int sr_cmd_loads(sr_cli *c, int argc, char **argv)
{
    loads_opts o;
    memset(&o, 0, sizeof o);
    int rc = sr_cli_parse(c, argc, argv, OPTS, take, &o, HELP, NULL);
    if (rc)
        return rc;
    tweaks tw;
    if ((rc = parse_tweaks(c, &o, &tw)))
        return rc;
    if (o.stage && !o.mission)
        return sr_cli_fail(c, "--stage: needs --mission FILE");
    if (o.mission && !o.stage && (o.speed || o.angle || o.altitude))
        return sr_cli_fail(c, "%s: with --mission, a deployment state applies to one stage; add --stage NAME",
                           o.speed ? "--speed" : o.angle ? "--path-angle" : "--altitude");
    if (o.mission && sr_cli_canopy_given(&o.canopy))
        return sr_cli_fail(c, "--mission: the stages give the canopies; drop --family / --canopy");

    sr_catalog *cat = NULL;
    sr_mission *mis = NULL;
    sr_atmos atm;
    sr_atmos_init_standard(&atm);
    sr_report *r = NULL;
    sr_error e;
    sr_canopy cp;
    deploy *ds = calloc(SR_MISSION_MAX_STAGES, sizeof *ds);
    size_t nd = 0;
    double mass = NAN, ground = 0;
    if (!ds) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    if ((rc = sr_cli_catalog(c, &cat)) || (rc = sr_cli_mission(c, o.mission, cat, &o.atmos, &mis, &atm, &ground)))
        goto out;
    if (mis)
        mass = sr_mission_total_mass(mis);
    else if ((rc = sr_cli_canopy(c, cat, &o.canopy, 1, &cp)))
        goto out;
    if ((rc = sr_cli_mass(c, o.mass, "the mass the canopy decelerates", &mass)))
        goto out;

    if (mis && !o.speed) {
        if ((rc = mission_deploys(c, mis, &atm, mass, ds, &nd, o.stage)))
            goto out;
    } else {
        deploy *d = &ds[nd++];
        if (mis) {
            size_t k;
            for (k = 0; k < mis->nstages && strcmp(mis->stages[k].name, o.stage) != 0; k++)
                ;
            if (k == mis->nstages) {
                rc = no_stage(c, mis, o.stage);
                goto out;
            }
            snprintf(d->name, sizeof d->name, "%s", o.stage);
            d->cp = &mis->stages[k].canopy;
        } else {
            d->cp = &cp;
        }
        d->mass = mass;
        if (!o.speed) {
            rc = sr_cli_fail(c, "--speed: the speed at deployment is required");
            goto out;
        }
        double v;
        if ((rc = sr_cli_quantity(c, "--speed", o.speed, SR_Q_SPEED, 1, &v)))
            goto out;
        d->v[0] = d->v[1] = d->v[2] = v;
        d->angle = M_PI / 2;
        if (o.angle && (rc = sr_cli_quantity(c, "--path-angle", o.angle, SR_Q_ANGLE, 0, &d->angle)))
            goto out;
        if (fabs(d->angle) > M_PI / 2 + 1e-9) {
            rc = sr_cli_fail(c, "--path-angle: '%s' is outside -90..90 degrees below the horizontal", o.angle);
            goto out;
        }
        d->z = ground;
        if (mis) {
            /* the stage's own deployment height, when the file fixes one */
            for (size_t k = 0; k < mis->nstages; k++) {
                const sr_stage *st = &mis->stages[k];
                if (strcmp(st->name, o.stage) != 0)
                    continue;
                if (st->deploy == SR_DEPLOY_ALTITUDE)
                    d->z = mis->ground + st->deploy_value;
                else if (st->deploy == SR_DEPLOY_APOGEE && mis->has_start)
                    d->z = mis->ground + mis->start_height;
            }
        }
        if (o.altitude && (rc = sr_cli_quantity(c, "--altitude", o.altitude, SR_Q_LENGTH, 0, &d->z)))
            goto out;
        if (sr_atmos_at(&atm, d->z, &d->air, &e) != SR_OK) {
            rc = sr_cli_fail(c, "--altitude: %s", e.msg);
            goto out;
        }
    }
    for (size_t i = 0; i < nd; i++)
        if ((rc = solve(c, &ds[i], &tw, mis != NULL && !o.speed)))
            goto out;

    r = sr_report_new("loads", "opening load at deployment");
    sr_report_section(r, "Inputs");
    if (mis)
        sr_report_text(r, "mission", "mission", mis->name);
    sr_cli_report_atmos(r, &atm);
    int recalled = 0, cluster = 0;
    if (nd == 1) {
        if ((rc = report_one(c, r, &ds[0], mis != NULL, &tw)))
            goto out;
    } else {
        sr_report_value(r, "mass", "decelerated mass", mass, SR_Q_MASS, 4);
        if ((rc = mission_summary(c, r, ds, nd, &tw)))
            goto out;
        sr_report_note(r, "Stages after the first deploy at the previous stage's steady descent rate, straight "
                          "down; `sinkrate loads --mission FILE --stage NAME` shows one stage in full.");
    }
    for (size_t i = 0; i < nd; i++) {
        warn_common(r, &ds[i], &recalled, nd > 1);
        cluster |= ds[i].cp->count > 1;
    }
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    if (mis) {
        sr_input_warnings_mission(&iw, mis, &atm, c->units);
        if (o.mass)
            sr_input_warnings_value(&iw, SR_PLAUS_MASS, mass, "--mass", c->units);
    } else {
        sr_input_warnings_value(&iw, SR_PLAUS_MASS, mass, "decelerated mass", c->units);
        sr_input_warnings_canopy(&iw, &cp, "canopy", c->units);
    }
    sr_cli_report_input_warnings(r, &iw);
    notes_common(r, recalled, isnan(tw.design) ? 0 : tw.design, cluster);
    if (c->plot_prefix && (rc = figures(c, ds, nd, argc, argv)))
        goto out;
    rc = sr_cli_emit(c, r);
out:
    sr_report_free(r);
    sr_atmos_free(&atm);
    sr_cli_mission_free(mis);
    free(ds);
    free(cat);
    return rc;
}
