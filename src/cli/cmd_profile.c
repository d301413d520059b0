/* cmd_profile.c - `sinkrate profile FILE`: the staged descent of a mission
 * as a design-review page: stages, event timeline, per-stage rates, touchdown
 * band, landing energy per section, drift, and every limit met or exceeded. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/band.h"
#include "analysis/failcase.h"
#include "analysis/judge.h"
#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "cli/maps.h"
#include "analysis/input_warnings.h"
#include "cli/profile_failcase.h"
#include "cli/profile_plot.h"
#include "cli/verdict.h"
#include "files/mission.h"
#include "physics/profile.h"

#define PI 3.14159265358979323846

typedef struct profile_opts {
    int fast, band_ends;
    const char *fail, *limits_at, *trajectory, *geojson;
} profile_opts;

static const sr_opt OPTS[] = {
    SR_OPT_STRING("fail", "STAGE[,STAGE]", profile_opts, fail,
                  "failure case: these stages do not deploy ('all': no canopy); the limits and the exit code then "
                  "judge it, falling bodies in their worse attitude (broadside or tumbling)"),
    SR_OPT_LIMITS_AT(profile_opts, limits_at),
    SR_OPT_FLAG("fast", profile_opts, fast,
                "the fast mode used for dispersion and design search (steady stages from tables, transients reused "
                "from the nominal descent, opening loads by the fixed-step solver)"),
    SR_OPT_STRING("trajectory", "FILE", profile_opts, trajectory,
                  "the time history of every body: time, height, altitude, descent rate, airspeed, east, north, "
                  "dynamic pressure, Mach, stage, event; JSON when FILE ends in .json, CSV when in .csv, otherwise "
                  "as --format json (JSON) or CSV"),
    SR_OPT_STRING("geojson", "FILE", profile_opts, geojson,
                  "a landing map (GeoJSON, RFC 7946): tracks, landing points, deployments and the drift limit on "
                  "WGS 84; the mission needs site.latitude and site.longitude"),
    SR_OPT_FLAG("band-ends", profile_opts, band_ends,
                "trajectory and map also at both ends of the band: the fast end (low drag, heavy) and the slow end "
                "(high drag, light)"),
    SR_OPT_CLI_GROUP(sr_cli_group_plot),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "sections", "free_fall_drag", "stages", "timeline", "stage_results", "touchdown", "energy", "limits", "attitudes", "failure_case_list", "failure_cases", NULL};

static int run_profile(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_profile = {
    .name = "profile",
    .summary = "staged descent of a mission file: events, time, drift, touchdown, limits",
    .usage = "usage: sinkrate profile FILE [options]\n",
    .about = "The staged descent of a mission file: each deployment, the transient after it (adaptive ODE, drag "
             "area growing over the filling time, until the speed is within 1% of steady), the steady stages "
             "(quadrature of dt = dh/v and of the wind drift), the event timeline, per-stage descent rates and "
             "opening loads, touchdown speed, kinetic energy of every section, descent time, drift distance and "
             "bearing, and each limit of the file met or exceeded. Every result is a band: the descent is flown at "
             "the typical values and at both ends of every band (drag range, mass band), and each opening load over "
             "the growth-exponent and opening-load-factor ranges too. Exit 1 when a limit is exceeded at the worse "
             "end of a band (the conservative default; --limits-at typical relaxes it and the output says it is not "
             "conservative). The failure cases of the file are judged against every limit but never change the "
             "exit code. --plot PREFIX draws two figures: PREFIX (height, descent rate and airspeed against time) "
             "and PREFIX-track (the ground track with the wind and the drift limit, and the wind profile).",
    .options = OPTS,
    .tables = TABLES,
    .run = run_profile,
};

static int parse_fail(sr_cli *c, const sr_mission *m, const char *text, unsigned *mask)
{
    *mask = 0;
    char buf[512];
    snprintf(buf, sizeof buf, "%s", text);
    const char *names[SR_MISSION_MAX_STAGES + 2];
    for (size_t k = 0; k < m->nstages; k++)
        names[k] = m->stages[k].name;
    names[m->nstages] = "all";
    names[m->nstages + 1] = NULL;
    char *save = NULL;
    for (char *tok = strtok_r(buf, ",", &save); tok; tok = strtok_r(NULL, ",", &save)) {
        while (*tok == ' ')
            tok++;
        if (strcmp(tok, "all") == 0) {
            *mask |= (1u << m->nstages) - 1u;
            continue;
        }
        size_t k = 0;
        while (k < m->nstages && strcmp(m->stages[k].name, tok) != 0)
            k++;
        if (k == m->nstages) {
            const char *s = sr_yaml_suggest(tok, names);
            if (s)
                return sr_cli_fail(c, "--fail: the mission has no stage '%s'; did you mean '%s'?", tok, s);
            return sr_cli_fail(c, "--fail: the mission has no stage '%s' (give stage names or 'all')", tok);
        }
        *mask |= 1u << k;
    }
    if (!*mask)
        return sr_cli_fail(c, "--fail: give stage names or 'all'");
    return 0;
}

static void fmt(char *buf, size_t len, const sr_cli *c, double v, sr_quantity q, int sig)
{
    sr_report_format_value(buf, len, v, q, c->units, sig);
}

/* A number of the wind's description as the report writes it. */
static void wind_value(char *buf, size_t len, double si, sr_quantity q, int sig, void *ctx)
{
    const sr_cli *c = ctx;
    fmt(buf, len, c, si, q, sig > 0 ? sig : SR_FIXED(0));
}

static const char *deploy_text(const sr_cli *c, const sr_mission *m, size_t k, char *buf, size_t len)
{
    const sr_stage *s = &m->stages[k];
    char v[64];
    switch (s->deploy) {
    case SR_DEPLOY_APOGEE:
        snprintf(buf, len, "at the start (apogee / release)");
        break;
    case SR_DEPLOY_ALTITUDE:
        fmt(v, sizeof v, c, s->deploy_value, SR_Q_LENGTH, SR_FIXED(0));
        snprintf(buf, len, "%s above ground", v);
        break;
    case SR_DEPLOY_DELAY:
        fmt(v, sizeof v, c, s->deploy_value, SR_Q_TIME, 3);
        snprintf(buf, len, "%s after the previous deployment", v);
        break;
    }
    if (s->line_stretch > 0) {
        size_t l = strlen(buf);
        fmt(v, sizeof v, c, s->line_stretch, SR_Q_TIME, 3);
        snprintf(buf + l, len - l, ", line stretch %s later", v);
    }
    return buf;
}

static void report_inputs(sr_report *r, const sr_cli *c, const sr_mission *m, unsigned failed)
{
    char buf[768], v1[64], v2[64], v3[64];
    sr_report_section(r, "Mission");
    sr_report_text(r, "mission", "mission", m->name);
    sr_report_text(r, "file", "file", m->path);
    sr_cli_maps_report_position(r, m);
    sr_cli_report_atmos(r, &m->atmos);
    sr_wind_describe_fmt(&m->wind, wind_value, (void *)c, buf, sizeof buf);
    sr_report_text(r, "wind", "wind", buf);
    fmt(v1, sizeof v1, c, m->start_height, SR_Q_LENGTH, SR_FIXED(0));
    fmt(v2, sizeof v2, c, m->start_speed, SR_Q_SPEED, 3);
    fmt(v3, sizeof v3, c, m->start_path_angle, SR_Q_ANGLE, SR_FIXED(0));
    char head[96];
    if (isnan(m->start_heading)) {
        double we, wn, s, from;
        sr_wind_at(&m->wind, m->start_height, &we, &wn);
        sr_wind_polar(we, wn, &s, &from);
        snprintf(head, sizeof head, "%.0f deg (%s)", sr_units_bearing_deg(from, 0),
                 s > 0 ? "into the wind" : "north: calm air");
    } else {
        snprintf(head, sizeof head, "%.0f deg", sr_units_bearing_deg(m->start_heading, 0));
    }
    snprintf(buf, sizeof buf, "%s above ground, airspeed %s, path angle %s below horizontal, heading %s", v1, v2, v3,
             head);
    sr_report_text(r, "start", "start", buf);
    if (m->start_east != 0 || m->start_north != 0) {
        fmt(v1, sizeof v1, c, m->start_east, SR_Q_LENGTH, SR_FIXED(0));
        fmt(v2, sizeof v2, c, m->start_north, SR_Q_LENGTH, SR_FIXED(0));
        snprintf(buf, sizeof buf, "%s east, %s north of the launch point", v1, v2);
        sr_report_text(r, "start_offset", "start over the ground", buf);
    }
    if (failed) {
        buf[0] = '\0';
        for (size_t k = 0; k < m->nstages; k++)
            if ((failed >> k) & 1u) {
                size_t l = strlen(buf);
                snprintf(buf + l, sizeof buf - l, "%s%s", l ? ", " : "", m->stages[k].name);
            }
        size_t l = strlen(buf);
        snprintf(buf + l, sizeof buf - l, " do%s not deploy", strchr(buf, ',') ? "" : "es");
        sr_report_text(r, "failure_case", "FAILURE CASE", buf);
    }

    sr_rtable *t = sr_report_table(r, "sections", "Sections");
    sr_rtable_text_column(t, "section", "section");
    sr_rtable_column(t, "mass", "mass", SR_Q_MASS, 3);
    sr_rtable_column(t, "drag_area", "own drag area", SR_Q_AREA, 3);
    sr_rtable_text_column(t, "lands", "lands");
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        char lands[128];
        if (s->rigid_with >= 0)
            snprintf(lands, sizeof lands, "as one piece with %s", m->sections[s->rigid_with].name);
        else
            snprintf(lands, sizeof lands, "own energy (tethered or alone)");
        double row[] = {s->mass, s->drag_area > 0 ? s->drag_area : NAN};
        const char *txt[] = {s->name, lands};
        sr_rtable_row(t, row, txt);
    }
    sr_cli_profile_report_free_drag(r, c, m);

    t = sr_report_table(r, "stages", "Recovery stages (drag area band from the family's CD0 range; n: growth exponent "
                                     "of the drag area while filling)");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_text_column(t, "canopy", "canopy");
    sr_rtable_column(t, "nominal_diameter", "D0", SR_Q_SIZE, 3);
    sr_rtable_column(t, "drag_area_low", "CdS low", SR_Q_AREA, 3);
    sr_rtable_column(t, "drag_area_typical", "typ", SR_Q_AREA, 3);
    sr_rtable_column(t, "drag_area_high", "high", SR_Q_AREA, 3);
    sr_rtable_column(t, "growth_exponent_low", "n low", SR_Q_NONE, 2);
    sr_rtable_column(t, "growth_exponent_high", "n high", SR_Q_NONE, 2);
    sr_rtable_text_column(t, "carries", "carries");
    sr_rtable_text_column(t, "deploys", "deploys");
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_stage *s = &m->stages[k];
        char can[160], car[256], dep[160];
        if (s->canopy.count > 1)
            snprintf(can, sizeof can, "%s x%d", s->canopy.fam.id, s->canopy.count);
        else
            snprintf(can, sizeof can, "%s", s->canopy.fam.id);
        if (s->canopy.measured) {
            size_t l = strlen(can);
            snprintf(can + l, sizeof can - l, " (CD %.3g on %s)", s->canopy.cd.v.typ, sr_ref_name(s->canopy.cd.ref));
        }
        sr_mission_set_name(m, s->carries, car, sizeof car);
        if (!s->keep_previous) {
            size_t l = strlen(car);
            snprintf(car + l, sizeof car - l, "; earlier canopies released");
        }
        sr_band cds = sr_canopy_total_cds(&s->canopy);
        double row[] = {s->canopy.d0.typ, cds.lo, cds.typ, cds.hi, s->canopy.fam.growth.lo, s->canopy.fam.growth.hi};
        const char *txt[] = {s->name, can, car, deploy_text(c, m, k, dep, sizeof dep)};
        sr_rtable_row(t, row, txt);
    }
}

static void body_name(const sr_mission *m, const sr_profile_result *r, int b, char *buf, size_t len)
{
    if (b < 0 || (size_t)b >= r->nbodies) {
        snprintf(buf, len, "-");
        return;
    }
    sr_mission_set_name(m, r->body[b].sections, buf, len);
}

static void report_timeline(sr_report *r, const sr_mission *m, const sr_profile_result *p)
{
    sr_rtable *t = sr_report_table(r, "timeline", "Event timeline (typical drag)");
    sr_rtable_column(t, "time", "time", SR_Q_TIME, SR_FIXED(2));
    sr_rtable_text_column(t, "event", "event");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_text_column(t, "body", "sections");
    sr_rtable_column(t, "height", "height", SR_Q_LENGTH, SR_FIXED(1));
    sr_rtable_column(t, "airspeed", "airspeed", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate", "descent rate", SR_Q_SPEED, 3);
    sr_rtable_column(t, "dynamic_pressure", "q", SR_Q_PRESSURE, 3);
    sr_rtable_column(t, "mach", "Mach", SR_Q_NONE, 2);
    for (size_t i = 0; i < p->nevents; i++) {
        const sr_profile_event *e = &p->events[i];
        char ev[64], bn[256];
        const char *st = e->stage >= 0 ? m->stages[e->stage].name : "";
        snprintf(ev, sizeof ev, "%s", sr_profile_event_name(e->kind));
        if (e->kind == SR_EVENT_DEPLOY && e->stage >= 0 && !p->stage[e->stage].deployed)
            snprintf(ev, sizeof ev, "deployment FAILS");
        else if (e->kind == SR_EVENT_DEPLOY && e->stage >= 0 && p->stage[e->stage].body != e->body)
            snprintf(ev, sizeof ev, "deployment, separation");
        sr_mission_set_name(m, e->sections, bn, sizeof bn);
        if (e->kind == SR_EVENT_DEPLOY && e->stage >= 0 && p->stage[e->stage].deployed &&
            p->stage[e->stage].body != e->body)
            sr_mission_set_name(m, m->stages[e->stage].carries, bn, sizeof bn); /* the part that separates */
        double row[] = {e->t, e->h, e->speed, e->rate, e->q, e->mach};
        const char *txt[] = {ev, st, bn};
        sr_rtable_row(t, row, txt);
    }
}

static void report_stages(sr_report *r, const sr_mission *m, const sr_band_result *B)
{
    const sr_profile_result *p = &B->run[SR_BAND_TYPICAL];
    sr_rtable *t = sr_report_table(r, "stage_results",
                                   "Stages (typical drag; opening load over every band: low / typical / high, the "
                                   "high end governs)");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_column(t, "deploy_height", "deployed at", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "deploy_airspeed", "airspeed", SR_Q_SPEED, 3);
    sr_rtable_column(t, "deploy_q", "q", SR_Q_PRESSURE, 3);
    sr_rtable_column(t, "deploy_mach", "Mach", SR_Q_NONE, 2);
    sr_rtable_column(t, "filling_time", "filling time", SR_Q_TIME, 2);
    sr_rtable_column(t, "rate_top", "rate at top", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_bottom", "at bottom", SR_Q_SPEED, 3);
    sr_rtable_column(t, "time_in_stage", "time in stage", SR_Q_TIME, SR_FIXED(1));
    sr_rtable_column(t, "opening_load_low", "opening load low", SR_Q_FORCE, 3);
    sr_rtable_column(t, "opening_load_typical", "typical", SR_Q_FORCE, 3);
    sr_rtable_column(t, "opening_load_high", "high", SR_Q_FORCE, 3);
    sr_rtable_column(t, "opening_decel_high", "decel. high [g]", SR_Q_NONE, 3);
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_profile_stage *s = &p->stage[k];
        const sr_loads_band *L = &B->loads[k];
        double row[] = {s->h_deploy,
                        s->speed_deploy,
                        s->q_deploy,
                        s->mach_deploy,
                        s->deployed ? s->t_fill : NAN,
                        s->deployed ? s->rate_top : NAN,
                        s->deployed ? s->rate_bottom : NAN,
                        s->deployed ? s->t_end - s->t_deploy : NAN,
                        L->valid ? L->lo.force : NAN,
                        L->valid ? L->typ.force : NAN,
                        L->valid ? L->hi.force : NAN,
                        L->valid ? L->hi.decel_g : NAN};
        char name[96];
        snprintf(name, sizeof name, "%s%s", m->stages[k].name,
                 !s->deployed ? (isnan(s->t_deploy) ? " (not reached)" : " (fails)") : "");
        const char *txt[] = {name};
        sr_rtable_row(t, row, txt);
    }
}

/* lowest, typical and highest of a quantity over the band runs */
typedef struct span {
    double lo, typ, hi;
} span;

static span span_of(const sr_band_result *B, double (*get)(const sr_profile_result *, size_t), size_t i)
{
    span s = {get(&B->run[0], i), get(&B->run[0], i), get(&B->run[0], i)};
    for (int e = 1; e < SR_BAND_NRUNS; e++) {
        double v = get(&B->run[e], i);
        s.lo = fmin(s.lo, v);
        s.hi = fmax(s.hi, v);
    }
    return s;
}

static double get_rate(const sr_profile_result *r, size_t i) { return r->body[i].rate_land; }
static double get_energy(const sr_profile_result *r, size_t i) { return r->section_energy[i]; }
static double get_energy_ground(const sr_profile_result *r, size_t i) { return r->section_energy_ground[i]; }
static double get_speed_ground(const sr_profile_result *r, size_t i) { return r->section_speed_ground[i]; }
static double get_time(const sr_profile_result *r, size_t i) { (void)i; return r->descent_time; }
static double get_max_rate(const sr_profile_result *r, size_t i) { (void)i; return r->max_rate; }
static double get_max_energy(const sr_profile_result *r, size_t i) { (void)i; return r->max_energy; }
static double get_drift(const sr_profile_result *r, size_t i) { (void)i; return r->max_drift; }

static void report_touchdown(sr_report *r, const sr_mission *m, const sr_band_result *B, const sr_verdict *v)
{
    const sr_profile_result *p = &B->run[SR_BAND_TYPICAL];
    sr_rtable *t = sr_report_table(r, "touchdown",
                                   "Touchdown (descent rates over the bands; ground-relative: with the surface "
                                   "wind, at the band end)");
    sr_rtable_text_column(t, "body", "sections");
    sr_rtable_column(t, "time", "time", SR_Q_TIME, SR_FIXED(1));
    sr_rtable_column(t, "rate_low", "rate low", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_typical", "typical", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_high", "high", SR_Q_SPEED, 3);
    sr_rtable_column(t, "speed_ground_high", "ground-rel.", SR_Q_SPEED, 3);
    sr_rtable_column(t, "drift", "drift", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "bearing", "bearing", SR_Q_BEARING, SR_FIXED(0));
    sr_rtable_column(t, "east", "east", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "north", "north", SR_Q_LENGTH, SR_FIXED(0));
    double wind = 0.0;
    for (int e = 0; e < SR_BAND_NRUNS; e++)
        wind = fmax(wind, B->run[e].wind_surface);
    for (size_t i = 0; i < p->nbodies; i++) {
        const sr_profile_body *b = &p->body[i];
        char bn[256];
        body_name(m, p, (int)i, bn, sizeof bn);
        /* the same body index in every run: the structure does not depend on the bands */
        span rate = span_of(B, get_rate, i);
        double row[] = {b->t_land, rate.lo, rate.typ, rate.hi, hypot(rate.hi, wind), b->drift, b->bearing, b->east,
                        b->north};
        const char *txt[] = {bn};
        sr_rtable_row(t, row, txt);
    }
    t = sr_report_table(r, "energy",
                        m->energy_ground
                            ? "Landing energy per section (1/2 m v^2; the limit means the ground-relative speed)"
                            : "Landing energy per section (1/2 m v^2 at its touchdown descent rate; the limit means "
                              "the descent rate)");
    sr_rtable_text_column(t, "section", "section");
    sr_rtable_column(t, "mass", "mass", SR_Q_MASS, 3);
    sr_rtable_text_column(t, "lands_with", "lands with");
    sr_rtable_column(t, "energy_low", "energy low", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "energy_typical", "typical", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "energy_high", "high", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "speed_ground_high", "ground-rel. speed", SR_Q_SPEED, 3);
    sr_rtable_column(t, "energy_ground_high", "energy", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "margin", "margin to limit", SR_Q_ENERGY, 3);
    for (size_t s = 0; s < m->nsections; s++) {
        char bn[256];
        body_name(m, p, p->section_body[s], bn, sizeof bn);
        span e = span_of(B, get_energy, s), eg = span_of(B, get_energy_ground, s), vg = span_of(B, get_speed_ground, s);
        double margin = NAN;
        for (size_t k = 0; k < v->nrows; k++)
            if (v->row[k].kind == SR_JUDGE_ENERGY && v->row[k].index == (int)s)
                margin = v->row[k].margin;
        double row[] = {m->sections[s].mass, e.lo, e.typ, e.hi, vg.hi, eg.hi, margin};
        const char *txt[] = {m->sections[s].name, bn};
        sr_rtable_row(t, row, txt);
    }
}

static void report_warnings(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_band_result *B)
{
    const sr_profile_result *p = &B->run[SR_BAND_TYPICAL];
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_profile_stage *s = &p->stage[k];
        char a[64], b[64];
        if (isnan(s->t_deploy)) {
            sr_report_warning(r, "stage '%s' never deploys: its sections land first", m->stages[k].name);
            continue;
        }
        if (!s->deployed)
            continue; /* a failure case: it does not open */
        double q = 0.0;
        for (int e = 0; e < SR_BAND_NRUNS; e++)
            if (B->run[e].stage[k].deployed)
                q = fmax(q, B->run[e].stage[k].q_deploy);
        /* without a limit in the file: a warning level of ours, not a published limit */
        if (isnan(m->limit_deploy_q) && q > 2500.0) {
            sr_report_format_value(a, sizeof a, q, SR_Q_PRESSURE, c->units, 3);
            sr_report_format_value(b, sizeof b, 2500.0, SR_Q_PRESSURE, c->units, 3);
            sr_report_warning(r, "stage '%s' deploys at a high dynamic pressure, %s at the band end (warning level "
                                 "%s, our choice; set limits.deployment-pressure for your hardware)",
                              m->stages[k].name, a, b);
        }
        if (B->loads[k].slow_deployment)
            sr_report_warning(r, "stage '%s' opens at or below its steady descent rate: the payload speeds up while "
                                 "the canopy fills and the weight governs the opening load",
                              m->stages[k].name);
    }
    for (size_t i = 0; i < p->nbodies; i++) {
        char bn[256];
        body_name(m, p, (int)i, bn, sizeof bn);
        int plural = strchr(bn, '+') != NULL;
        if (p->body[i].no_drag)
            sr_report_warning(r, "%s fall%s with no canopy open and no drag of %s own at all (the file gives "
                                 "neither drag-area: nor body:): a fall in vacuum, far faster than any real one; "
                                 "describe %s",
                              bn, plural ? "" : "s", plural ? "their" : "its", plural ? "them" : "it");
        if (p->body[i].canopies == 0)
            sr_report_warning(r, "%s land%s without a canopy (free fall)", bn, plural ? "" : "s");
        else if (!p->body[i].steady_land)
            sr_report_warning(r, "%s touch%s down before the descent has settled: the touchdown speed is that of "
                                 "the transient",
                              bn, plural ? "" : "es");
    }
    for (size_t k = 0; k < m->nstages; k++)
        if (!m->stages[k].canopy.measured && strstr(m->stages[k].canopy.fam.cd0_source, "memory")) {
            sr_report_warning(r, "The drag data of the families used are recalled handbook values, not checked "
                                 "against the printed tables: confirm the rates with a drop test.");
            break;
        }
    sr_cli_profile_free_fall_warnings(r, c, m, p, "");
    if (p->events_dropped)
        sr_report_warning(r, "%d events beyond the first %d are not listed", p->events_dropped,
                          SR_PROFILE_MAX_EVENTS);
}

static void report_notes(sr_report *r, const sr_mission *m, int fast)
{
    sr_report_note(r, "Bands: the descent is flown at the typical values and at both ends of every band together: "
                      "the fast end (every canopy at the low end of its drag range, every banded mass at its heavy "
                      "end) and the slow end (high drag, light masses). Each limit is judged at the worst of them.");
    sr_report_note(r, "Steady stages: quadrature (GSL QAG) of dt = dh/v(h) and of the drift w(h)/v(h) dh, with "
                      "v = sqrt(2 m g / (rho CdS)) in the mission's air, plus the lag (v/g) dw of a body falling "
                      "through wind shear. After each deployment the motion is integrated (GSL rk8pd) with the drag "
                      "area growing as (t/t_f)^n over the filling time t_f = n_fill D0 / max(v, steady rate) (the "
                      "family's typical n) until the airspeed is within 1%% of the steady one.");
    sr_report_note(r, "Canopies already open stay on the line and keep their drag unless the stage says "
                      "'previous: release'. The start airspeed is relative to the moving air.");
    sr_report_note(r, "Landing energy: %s. The ground-relative speed combines the descent rate with the surface wind "
                      "(10 m above ground).",
                   m->energy_ground ? "the file's limit means the speed relative to the ground"
                                    : "the limit means the descent rate (vertical), as the trade's landing-energy "
                                      "limits do");
    sr_report_note(r, "Opening load: the highest of the opening-load-factor, Pflanz and inflation-ODE estimates "
                      "(one growth model, so their spread is not the real uncertainty), at the state of line "
                      "stretch in each band run, over the canopy's drag range, its growth-exponent range and its "
                      "opening-load-factor range; the high end governs. `sinkrate loads --mission FILE --stage S` "
                      "shows the methods for the same numbers.");
    if (fast)
        sr_report_note(r, "Fast mode: steady stages from the precomputed tables, transients from the nominal ODE "
                          "solution, opening loads by the fixed-step solver; no transient events are listed.");
}

static int run_profile(sr_cli *c, int argc, char **argv)
{
    profile_opts o;
    memset(&o, 0, sizeof o);
    int first, rc = sr_cli_parse_options(c, argc, argv, &o, &first);
    if (rc)
        return rc;
    sr_judge_basis basis = SR_JUDGE_BAND_END;
    if (o.limits_at && (rc = sr_cli_limits_at(c, o.limits_at, &basis)))
        return rc;
    if (first >= argc)
        return sr_cli_fail(c, "give a mission file (e.g. payloads/desert-club-rocket.yaml)");
    if (first + 1 < argc)
        return sr_cli_fail(c, "unexpected argument '%s' (profile takes one mission file)", argv[first + 1]);
    if (o.band_ends && !o.trajectory && !o.geojson)
        return sr_cli_fail(c, "--band-ends: goes with --trajectory or --geojson");
    if (o.fast && (o.trajectory || o.geojson))
        return sr_cli_fail(c, "%s: the time history needs the full integration; drop --fast",
                           o.trajectory ? "--trajectory" : "--geojson");
    if ((o.trajectory && (rc = sr_cli_output(c, "--trajectory", o.trajectory))) ||
        (o.geojson && (rc = sr_cli_output(c, "--geojson", o.geojson))))
        return rc;

    if ((rc = sr_cli_profile_plot_reserve(c)) || (rc = sr_cli_input(c, "the mission file", argv[first])))
        return rc;
    sr_catalog *cat = NULL;
    sr_mission *m = NULL;
    sr_band_ctx *bc = NULL;
    sr_band_work *w = NULL;
    sr_band_result *B = NULL;
    sr_failcase_result *F = NULL;
    sr_report *r = NULL;
    sr_profile_point *pts = NULL, *pts_lo = NULL, *pts_hi = NULL;
    char *tbuf = NULL, *gbuf = NULL;
    size_t tlen = 0, glen = 0;
    sr_error e;
    if ((rc = sr_cli_catalog(c, &cat)))
        goto out;
    m = calloc(1, sizeof *m);
    B = calloc(1, sizeof *B);
    if (!m || !B) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    if (sr_mission_load(m, argv[first], cat, &e)) {
        free(m);
        m = NULL;
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    if ((rc = sr_cli_mission_inputs(c, m)))
        goto out;
    if (!m->has_start) {
        rc = sr_cli_fail(c, "%s: the mission has no start: block (height above ground, airspeed and path angle at "
                            "the first deployment); a profile needs it",
                         m->path);
        goto out;
    }
    if (o.geojson && (rc = sr_cli_maps_need_position(c, "--geojson", m)))
        goto out;
    sr_profile_opts po;
    sr_profile_opts_init(&po);
    if (o.fail && (rc = parse_fail(c, m, o.fail, &po.failed)))
        goto out;
    sr_judge_limits lim;
    sr_judge_limits_init(&lim, m);
    sr_verdict verdict;
    sr_profile_mode mode = o.fast ? SR_PROFILE_FAST : SR_PROFILE_FULL;
    if (po.failed) {
        /* the failure case is the descent: every attitude its bodies can take, judged at the worse */
        F = calloc(1, sizeof *F);
        if (!F) {
            rc = sr_cli_fail(c, "out of memory");
            goto out;
        }
        if (sr_failcase_run(m, po.failed, &lim, basis, NULL, F, &e)) {
            rc = sr_cli_fail_err(c, &e);
            goto out;
        }
        verdict = F->verdict;
        po.attitude = F->attitude[F->worse];
        mode = SR_PROFILE_FULL;
    }
    if (sr_band_ctx_new(&bc, m, &po, &e) || sr_band_work_new(&w, &e)) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    sr_profile_track track = {NULL, 0, 0, 0.5}, track_lo = track, track_hi = track;
    int maps = o.trajectory || o.geojson, want_track = c->plot_prefix || maps;
    if (want_track) {
        track.cap = maps ? SR_MAPS_TRACK_CAP : 20000;
        pts = malloc(track.cap * sizeof *pts);
        if (!pts) {
            rc = sr_cli_fail(c, "out of memory");
            goto out;
        }
        track.pt = pts;
    }
    if (o.band_ends) {
        track_lo.cap = track_hi.cap = SR_MAPS_TRACK_CAP;
        track_lo.pt = pts_lo = malloc(SR_MAPS_TRACK_CAP * sizeof *pts_lo);
        track_hi.pt = pts_hi = malloc(SR_MAPS_TRACK_CAP * sizeof *pts_hi);
        if (!pts_lo || !pts_hi) {
            rc = sr_cli_fail(c, "out of memory");
            goto out;
        }
    }
    sr_profile_track *const tracks[SR_BAND_NRUNS] = {want_track ? &track : NULL, o.band_ends ? &track_lo : NULL,
                                                     o.band_ends ? &track_hi : NULL};
    if (sr_band_run_tracked(bc, NULL, mode, w, B, tracks, &e)) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    if (!F)
        sr_judge_band(&lim, B, basis, &verdict);
    r = sr_report_new("profile", "staged descent of a mission");
    if (!r) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    sr_cli_verdict_header(r, basis);
    report_inputs(r, c, m, po.failed);
    if (F && F->nattitudes > 1) {
        char buf[256];
        snprintf(buf, sizeof buf, "%s (the worse of %zu attitudes; the limits take the worst of all)",
                 sr_bluff_attitude_name(F->attitude[F->worse]), F->nattitudes);
        sr_report_text(r, "attitude", "falling bodies shown", buf);
    }
    const sr_profile_result *T = &B->run[SR_BAND_TYPICAL];
    span time = span_of(B, get_time, 0), rate = span_of(B, get_max_rate, 0), en = span_of(B, get_max_energy, 0),
         drift = span_of(B, get_drift, 0);
    sr_report_section(r, "Result (low / typical / high over every band)");
    sr_report_band(r, "descent_time", "descent time (last touchdown)", time.lo, T->descent_time, time.hi, SR_Q_TIME,
                   SR_FIXED(1));
    sr_report_band(r, "touchdown_rate", "highest touchdown descent rate", rate.lo, T->max_rate, rate.hi, SR_Q_SPEED,
                   3);
    sr_report_band(r, "landing_energy", "highest section landing energy", en.lo, T->max_energy, en.hi, SR_Q_ENERGY,
                   3);
    sr_report_band(r, "drift", "farthest landing point from launch", drift.lo, T->max_drift, drift.hi, SR_Q_LENGTH,
                   SR_FIXED(0));
    if (verdict.binding >= 0) {
        char label[200], buf[320];
        sr_cli_verdict_label(m, &lim, &verdict.row[verdict.binding], label, sizeof label);
        snprintf(buf, sizeof buf, "%s (%.0f %% of its limit%s)", label, 100.0 * verdict.row[verdict.binding].ratio,
                 basis == SR_JUDGE_TYPICAL ? ", typical" : ", band end");
        sr_report_text(r, "binding_limit", "limit closest to breaking", buf);
    }
    report_timeline(r, m, T);
    report_stages(r, m, B);
    report_touchdown(r, m, B, &verdict);
    if (!sr_cli_verdict_table(r, c, m, &lim, &verdict, 0))
        sr_report_note(r, "The mission file sets no limits: nothing was checked.");
    int exceeded = sr_cli_verdict_messages(r, c, m, &lim, &verdict, 0);
    report_warnings(r, c, m, B);
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    sr_input_warnings_mission(&iw, m, NULL, c->units);
    sr_cli_report_input_warnings(r, &iw);
    report_notes(r, m, o.fast && !F);
    if (F)
        sr_cli_profile_report_attitudes(r, c, m, F);
    if ((rc = sr_cli_profile_report_failures(r, c, m, &lim, basis)))
        goto out;
    /* the trajectory and the map are built before anything is written; the band-end runs are the fast end
     * (low drag, heavy) and the slow end (high drag, light) */
    sr_map_run mr[3] = {{"typical drag", &B->run[SR_BAND_TYPICAL], &track},
                        {"low drag", &B->run[SR_BAND_FAST], &track_lo},
                        {"high drag", &B->run[SR_BAND_SLOW], &track_hi}};
    size_t nmr = o.band_ends ? 3 : 1;
    if (o.trajectory && (rc = sr_cli_maps_trajectory(c, o.trajectory, m, sr_band_profile(bc), mr, nmr, &tbuf, &tlen)))
        goto out;
    if (o.geojson && (rc = sr_cli_maps_profile_geojson(c, m, mr, nmr, &gbuf, &glen)))
        goto out;
    if ((rc = sr_cli_emit(c, r)))
        goto out;
    if (tbuf && (rc = sr_cli_maps_write(c, "--trajectory", o.trajectory, tbuf, tlen)))
        goto out;
    if (gbuf && (rc = sr_cli_maps_write(c, "--geojson", o.geojson, gbuf, glen)))
        goto out;
    if (c->plot_prefix && (rc = sr_cli_profile_plot(c, m, sr_band_profile(bc), T, &track, argc, argv)))
        goto out;
    rc = exceeded ? SR_EXIT_LIMIT : SR_EXIT_OK;
out:
    free(pts);
    free(pts_lo);
    free(pts_hi);
    free(tbuf);
    free(gbuf);
    sr_report_free(r);
    sr_band_work_free(w);
    sr_band_ctx_free(bc);
    if (m) {
        sr_mission_release(m);
        free(m);
    }
    free(B);
    free(F);
    free(cat);
    return rc;
}
