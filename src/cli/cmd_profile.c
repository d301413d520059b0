/* cmd_profile.c - `sinkrate profile FILE`: the staged descent of a mission
 * as a design-review page: stages, event timeline, per-stage rates, touchdown
 * band, landing energy per section, drift, and every limit met or exceeded. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/maps.h"
#include "analysis/input_warnings.h"
#include "cli/profile_failcase.h"
#include "cli/profile_plot.h"
#include "files/mission.h"
#include "physics/profile.h"

#define PI 3.14159265358979323846

enum { OPT_FAST = OPT_COMMAND_BASE, OPT_FAIL, OPT_WORST, OPT_TRAJECTORY, OPT_GEOJSON, OPT_BAND_ENDS };

static const struct option OPTS[] = {
    {"fast", no_argument, NULL, OPT_FAST},
    {"trajectory", required_argument, NULL, OPT_TRAJECTORY},
    {"geojson", required_argument, NULL, OPT_GEOJSON},
    {"band-ends", no_argument, NULL, OPT_BAND_ENDS},
    {"fail", required_argument, NULL, OPT_FAIL},
    {"worst-case", no_argument, NULL, OPT_WORST},
    SR_OPTS_PLOT,
    SR_OPTS_OUTPUT,
    {NULL, 0, NULL, 0}};

static const char HELP[] =
    "usage: sinkrate profile FILE [options]\n\n"
    "The staged descent of a mission file: each deployment, the transient after it\n"
    "(adaptive ODE, drag area growing over the filling time, until the speed is within\n"
    "1% of steady), the steady stages (quadrature of dt = dh/v and of the wind drift),\n"
    "the event timeline, per-stage descent rates, touchdown speed as a band from the\n"
    "canopies' drag-coefficient range, kinetic energy of every section, descent time,\n"
    "drift distance and bearing, and each limit of the file met or exceeded.\n"
    "Exit 1 when a limit is exceeded (at the typical drag; with --worst-case at any\n"
    "end of the band). --plot PREFIX draws two figures: PREFIX (height, descent rate\n"
    "and airspeed against time) and PREFIX-track (the ground track with the wind and\n"
    "the drift limit, and the wind profile).\n\n"
    "  --fail STAGE[,STAGE]     failure case: these stages do not deploy ('all': no canopy)\n"
    "  --worst-case             judge limits at the worst end of each band\n"
    "  --fast                   the fast mode used for dispersion (steady stages from\n"
    "                           tables, transients reused from the nominal descent)\n"
    "  --trajectory FILE        the time history of every body: time, height, altitude,\n"
    "                           descent rate, airspeed, east, north, dynamic pressure, Mach,\n"
    "                           stage, event; JSON when FILE ends in .json, CSV when in\n"
    "                           .csv, otherwise as --format json (JSON) or CSV\n"
    "  --geojson FILE           a landing map (GeoJSON, RFC 7946): tracks, landing points,\n"
    "                           deployments and the drift limit on WGS 84; the mission needs\n"
    "                           site.latitude and site.longitude\n"
    "  --band-ends              trajectory and map also at the low and the high end of the\n"
    "                           drag band\n\n";

typedef struct profile_opts {
    int fast, worst, band_ends;
    const char *fail, *trajectory, *geojson;
} profile_opts;

static int take(sr_cli *c, int code, const char *arg, void *ud)
{
    profile_opts *o = ud;
    (void)c;
    switch (code) {
    case OPT_FAST: o->fast = 1; return 0;
    case OPT_WORST: o->worst = 1; return 0;
    case OPT_FAIL: o->fail = arg; return 0;
    case OPT_TRAJECTORY: o->trajectory = arg; return 0;
    case OPT_GEOJSON: o->geojson = arg; return 0;
    case OPT_BAND_ENDS: o->band_ends = 1; return 0;
    }
    return 1;
}

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

/* The wind in words, in the chosen units. */
static void wind_text(const sr_cli *c, const sr_wind *w, char *buf, size_t len)
{
    char v[64], h[64], v2[64], h2[64];
    double deg = sr_units_bearing_deg(w->from, 0);
    switch (w->kind) {
    case SR_WIND_CALM:
        snprintf(buf, len, "calm");
        return;
    case SR_WIND_CONSTANT:
        fmt(v, sizeof v, c, w->speed, SR_Q_SPEED, 3);
        snprintf(buf, len, "constant, %s from %.0f deg at every height", v, deg);
        return;
    case SR_WIND_POWER:
    case SR_WIND_LOG:
        fmt(v, sizeof v, c, w->speed, SR_Q_SPEED, 3);
        fmt(h, sizeof h, c, w->h_ref, SR_Q_LENGTH, 3);
        if (w->kind == SR_WIND_POWER) {
            snprintf(buf, len, "power law, %s from %.0f deg at %s above ground, exponent %.3f", v, deg, h, w->alpha);
        } else {
            fmt(v2, sizeof v2, c, w->z0, SR_Q_LENGTH, 3);
            fmt(h2, sizeof h2, c, w->d, SR_Q_LENGTH, 3);
            snprintf(buf, len, "log law, %s from %.0f deg at %s above ground, roughness length %s, displacement %s", v,
                     deg, h, v2, h2);
        }
        if (w->h_grad > 0.0) {
            size_t l = strlen(buf);
            fmt(h, sizeof h, c, w->h_grad, SR_Q_LENGTH, 3);
            snprintf(buf + l, len > l ? len - l : 0, "; held constant above %s (gradient height)", h);
        }
        return;
    case SR_WIND_TABLE: {
        double s0, f0, s1, f1;
        sr_wind_polar(w->east[0], w->north[0], &s0, &f0);
        sr_wind_polar(w->east[w->n - 1], w->north[w->n - 1], &s1, &f1);
        fmt(v, sizeof v, c, s0, SR_Q_SPEED, 3);
        fmt(h, sizeof h, c, w->h[0], SR_Q_LENGTH, SR_FIXED(0));
        fmt(v2, sizeof v2, c, s1, SR_Q_SPEED, 3);
        fmt(h2, sizeof h2, c, w->h[w->n - 1], SR_Q_LENGTH, SR_FIXED(0));
        snprintf(buf, len, "table%s%s, %zu rows: %s from %.0f deg at %s to %s from %.0f deg at %s above ground",
                 w->source[0] ? " " : "", w->source, w->n, v, sr_units_bearing_deg(f0, 0), h, v2,
                 sr_units_bearing_deg(f1, 0), h2);
        return;
    }
    }
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

/* The three runs behind every band: typical drag, the low and the high end
 * of every stage's drag range at once. */
typedef struct runs {
    sr_profile_result typ, lo, hi; /* lo: low drag (fast, hard landing), hi: high drag */
} runs;

static double worst3(double a, double b, double c)
{
    return fmax(a, fmax(b, c));
}

static void report_inputs(sr_report *r, const sr_cli *c, const sr_mission *m, unsigned failed)
{
    char buf[768], v1[64], v2[64], v3[64];
    sr_report_section(r, "Mission");
    sr_report_text(r, "mission", "mission", m->name);
    sr_report_text(r, "file", "file", m->path);
    sr_maps_report_position(r, m);
    sr_cli_report_atmos(r, &m->atmos);
    wind_text(c, &m->wind, buf, sizeof buf);
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
    sr_profile_report_free_drag(r, c, m);

    t = sr_report_table(r, "stages", "Recovery stages (drag area band from the family's CD0 range)");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_text_column(t, "canopy", "canopy");
    sr_rtable_column(t, "nominal_diameter", "D0", SR_Q_SIZE, 3);
    sr_rtable_column(t, "drag_area_low", "CdS low", SR_Q_AREA, 3);
    sr_rtable_column(t, "drag_area_typical", "typ", SR_Q_AREA, 3);
    sr_rtable_column(t, "drag_area_high", "high", SR_Q_AREA, 3);
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
        double row[] = {s->canopy.d0.typ, cds.lo, cds.typ, cds.hi};
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

static void report_stages(sr_report *r, const sr_mission *m, const sr_profile_result *p)
{
    sr_rtable *t = sr_report_table(r, "stage_results", "Stages (typical drag)");
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
    sr_rtable_column(t, "opening_load_high", "high", SR_Q_FORCE, 3);
    sr_rtable_column(t, "opening_decel", "peak decel [g]", SR_Q_NONE, 3);
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_profile_stage *s = &p->stage[k];
        double row[] = {s->h_deploy,  s->speed_deploy, s->q_deploy,    s->mach_deploy,
                        s->deployed ? s->t_fill : NAN,
                        s->deployed ? s->rate_top : NAN, s->deployed ? s->rate_bottom : NAN,
                        s->deployed ? s->t_end - s->t_deploy : NAN, s->opening_force_low, s->opening_force,
                        s->opening_decel};
        char name[96];
        snprintf(name, sizeof name, "%s%s", m->stages[k].name,
                 !s->deployed ? (isnan(s->t_deploy) ? " (not reached)" : " (fails)") : "");
        const char *txt[] = {name};
        sr_rtable_row(t, row, txt);
    }
}

static void report_touchdown(sr_report *r, const sr_mission *m, const runs *R)
{
    const sr_profile_result *p = &R->typ;
    sr_rtable *t = sr_report_table(r, "touchdown",
                                   "Touchdown (rates over the canopies' drag-coefficient range)");
    sr_rtable_text_column(t, "body", "sections");
    sr_rtable_column(t, "time", "time", SR_Q_TIME, SR_FIXED(1));
    sr_rtable_column(t, "rate_low", "rate low", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_typical", "typical", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_high", "high", SR_Q_SPEED, 3);
    sr_rtable_column(t, "drift", "drift", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "bearing", "bearing", SR_Q_BEARING, SR_FIXED(0));
    sr_rtable_column(t, "east", "east", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "north", "north", SR_Q_LENGTH, SR_FIXED(0));
    for (size_t i = 0; i < p->nbodies; i++) {
        const sr_profile_body *b = &p->body[i];
        char bn[256];
        body_name(m, p, (int)i, bn, sizeof bn);
        /* the same body index in every run: the structure does not depend on drag */
        double row[] = {b->t_land, R->hi.body[i].rate_land, b->rate_land, R->lo.body[i].rate_land, b->drift,
                        b->bearing, b->east, b->north};
        const char *txt[] = {bn};
        sr_rtable_row(t, row, txt);
    }
    t = sr_report_table(r, "energy", "Landing energy per section (1/2 m v^2 at its touchdown descent rate)");
    sr_rtable_text_column(t, "section", "section");
    sr_rtable_column(t, "mass", "mass", SR_Q_MASS, 3);
    sr_rtable_text_column(t, "lands_with", "lands with");
    sr_rtable_column(t, "energy_low", "energy low", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "energy_typical", "typical", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "energy_high", "high", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "margin", "margin to limit", SR_Q_ENERGY, 3);
    for (size_t s = 0; s < m->nsections; s++) {
        char bn[256];
        body_name(m, p, p->section_body[s], bn, sizeof bn);
        double row[] = {m->sections[s].mass, R->hi.section_energy[s], p->section_energy[s], R->lo.section_energy[s],
                        m->limit_energy - p->section_energy[s]};
        const char *txt[] = {m->sections[s].name, bn};
        sr_rtable_row(t, row, txt);
    }
}

typedef struct limit_row {
    const char *key, *label;
    sr_quantity q;
    double limit, typ, worst;
} limit_row;

static double max_deploy_q(const sr_profile_result *p)
{
    double q = 0.0;
    for (size_t k = 0; k < p->nstages; k++)
        if (p->stage[k].deployed && p->stage[k].q_deploy > q)
            q = p->stage[k].q_deploy;
    return q;
}

/* Returns the number of limits exceeded (typical, or any end with worst). */
static int report_limits(sr_report *r, sr_cli *c, const sr_mission *m, const runs *R, int worst)
{
    limit_row L[] = {
        {"touchdown_speed", "touchdown descent rate", SR_Q_SPEED, m->limit_speed, R->typ.max_rate,
         worst3(R->typ.max_rate, R->lo.max_rate, R->hi.max_rate)},
        {"landing_energy", "landing energy of any section", SR_Q_ENERGY, m->limit_energy, R->typ.max_energy,
         worst3(R->typ.max_energy, R->lo.max_energy, R->hi.max_energy)},
        {"descent_time", "descent time", SR_Q_TIME, m->limit_time, R->typ.descent_time,
         worst3(R->typ.descent_time, R->lo.descent_time, R->hi.descent_time)},
        {"drift", "drift from the launch point", SR_Q_LENGTH, m->limit_drift, R->typ.max_drift,
         worst3(R->typ.max_drift, R->lo.max_drift, R->hi.max_drift)},
        {"deployment_pressure", "dynamic pressure at deployment", SR_Q_PRESSURE, m->limit_deploy_q,
         max_deploy_q(&R->typ), worst3(max_deploy_q(&R->typ), max_deploy_q(&R->lo), max_deploy_q(&R->hi))},
    };
    sr_rtable *t = sr_report_table(r, "limits", "Limits (worst: the worse end of the drag band)");
    sr_rtable_text_column(t, "limit", "limit");
    sr_rtable_column(t, "value", "allowed", SR_Q_NONE, 4);
    sr_rtable_column(t, "typical", "typical", SR_Q_NONE, 4);
    sr_rtable_column(t, "worst", "worst", SR_Q_NONE, 4);
    sr_rtable_column(t, "margin", "margin", SR_Q_NONE, 4);
    sr_rtable_text_column(t, "unit", "unit");
    sr_rtable_text_column(t, "status", "status");
    int exceeded = 0, any = 0;
    for (size_t i = 0; i < sizeof L / sizeof L[0]; i++) {
        if (isnan(L[i].limit))
            continue;
        any = 1;
        const char *status;
        int bad_typ = L[i].typ > L[i].limit, bad_worst = L[i].worst > L[i].limit;
        if (bad_typ)
            status = "EXCEEDED";
        else if (bad_worst)
            status = worst ? "EXCEEDED at the band end" : "met; exceeded at the band end";
        else
            status = "met";
        double lim = sr_units_from_si(L[i].limit, L[i].q, c->units);
        double typ = sr_units_from_si(L[i].typ, L[i].q, c->units);
        double wst = sr_units_from_si(L[i].worst, L[i].q, c->units);
        double row[] = {lim, typ, wst, lim - typ};
        const char *txt[] = {L[i].label, sr_units_label(L[i].q, c->units), status};
        sr_rtable_row(t, row, txt);
        if (bad_typ || (worst && bad_worst)) {
            exceeded++;
            char a[64], b[64];
            sr_report_format_value(a, sizeof a, bad_typ ? L[i].typ : L[i].worst, L[i].q, c->units, 4);
            sr_report_format_value(b, sizeof b, L[i].limit, L[i].q, c->units, 4);
            sr_cli_note(c, "limit exceeded: %s %s > %s%s", L[i].label, a, b,
                        bad_typ ? "" : " (at the worse end of the drag band)");
        } else if (bad_worst) {
            char a[64], b[64];
            sr_report_format_value(a, sizeof a, L[i].worst, L[i].q, c->units, 4);
            sr_report_format_value(b, sizeof b, L[i].limit, L[i].q, c->units, 4);
            sr_report_warning(r, "%s: met at the typical drag, but %s at the worse end of the drag band exceeds %s",
                              L[i].label, a, b);
        }
    }
    if (!any)
        sr_report_note(r, "The mission file sets no limits: nothing was checked.");
    return exceeded;
}

static void report_warnings(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_profile_ctx *ctx,
                            const runs *R)
{
    const sr_profile_result *p = &R->typ;
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_profile_stage *s = &p->stage[k];
        char a[64], b[64];
        if (isnan(s->t_deploy)) {
            sr_report_warning(r, "stage '%s' never deploys: its sections land first", m->stages[k].name);
            continue;
        }
        if (!s->deployed)
            continue; /* a failure case: it does not open */
        if (s->warn_q) {
            sr_report_format_value(a, sizeof a, s->q_deploy, SR_Q_PRESSURE, c->units, 3);
            if (isnan(m->limit_deploy_q)) {
                sr_report_format_value(b, sizeof b, 2500.0, SR_Q_PRESSURE, c->units, 3);
                sr_report_warning(r, "stage '%s' deploys at a high dynamic pressure, %s (warning level %s, our "
                                     "choice; set limits.deployment-pressure for your hardware)",
                                  m->stages[k].name, a, b);
            }
        }
        if (s->warn_mach)
            sr_report_warning(r, "stage '%s' deploys at Mach %.2f, above the %s family's usual application limit "
                                 "(Mach %.2f)",
                              m->stages[k].name, s->mach_deploy, m->stages[k].canopy.fam.id,
                              m->stages[k].canopy.fam.mach_max);
    }
    for (size_t i = 0; i < p->nbodies; i++) {
        char bn[256];
        body_name(m, p, (int)i, bn, sizeof bn);
        if (p->body[i].canopies == 0)
            sr_report_warning(r, "%s land%s without a canopy (free fall)", bn,
                              strchr(bn, '+') ? "" : "s");
        else if (!p->body[i].steady_land)
            sr_report_warning(r, "%s touch%s down before the descent has settled: the touchdown speed is that of "
                                 "the transient",
                              bn, strchr(bn, '+') ? "" : "es");
    }
    for (size_t k = 0; k < m->nstages; k++)
        if (!m->stages[k].canopy.measured && strstr(m->stages[k].canopy.fam.cd0_source, "memory")) {
            sr_report_warning(r, "The drag data of the families used are recalled handbook values, not checked "
                                 "against the printed tables: confirm the rates with a drop test.");
            break;
        }
    sr_profile_free_fall_warnings(r, c, m, p, "");
    if (p->events_dropped)
        sr_report_warning(r, "%d events beyond the first %d are not listed", p->events_dropped,
                          SR_PROFILE_MAX_EVENTS);
    (void)ctx;
}

static void report_notes(sr_report *r, int fast)
{
    sr_report_note(r, "Steady stages: quadrature (GSL QAG) of dt = dh/v(h) and of the drift w(h)/v(h) dh, with "
                      "v = sqrt(2 m g / (rho CdS)) in the mission's air, plus the lag (v/g) dw of a body falling "
                      "through wind shear. After each deployment the motion is integrated (GSL rk8pd) with the drag "
                      "area growing as (t/t_f)^n over the filling time t_f = n_fill D0 / v (n = 2 solid cloth, 1 "
                      "slotted; Knacke 1991, from memory) until the airspeed is within 1%% of the steady one.");
    sr_report_note(r, "Canopies already open stay on the line and keep their drag unless the stage says "
                      "'previous: release'. The start airspeed is relative to the moving air. Landing energy "
                      "uses the descent rate, as landing-energy limits usually do.");
    sr_report_note(r, "Opening load: lowest and highest of the opening-load-factor, Pflanz and inflation-ODE "
                      "estimates at the airspeed, density and path angle of line stretch, typical drag, with the "
                      "mass of the sections under the canopy; `sinkrate loads --mission FILE` shows the methods "
                      "in detail.");
    if (fast)
        sr_report_note(r, "Fast mode: steady stages from the precomputed tables, transients from the nominal ODE "
                          "solution; no transient events are listed.");
}

int sr_cmd_profile(sr_cli *c, int argc, char **argv)
{
    profile_opts o;
    memset(&o, 0, sizeof o);
    int first, rc = sr_cli_parse(c, argc, argv, OPTS, take, &o, HELP, &first);
    if (rc)
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

    if ((rc = sr_profile_plot_reserve(c)) || (rc = sr_cli_input(c, "the mission file", argv[first])))
        return rc;
    sr_catalog *cat = NULL;
    sr_mission *m = NULL;
    sr_profile_ctx *ctx = NULL;
    sr_profile_work *w = NULL;
    runs *R = NULL;
    sr_report *r = NULL;
    sr_profile_point *pts = NULL, *pts_lo = NULL, *pts_hi = NULL;
    char *tbuf = NULL, *gbuf = NULL;
    size_t tlen = 0, glen = 0;
    sr_error e;
    if ((rc = sr_cli_catalog(c, &cat)))
        goto out;
    m = calloc(1, sizeof *m);
    R = calloc(1, sizeof *R);
    if (!m || !R) {
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
    if (o.geojson && (rc = sr_maps_need_position(c, "--geojson", m)))
        goto out;
    sr_profile_opts po;
    sr_profile_opts_init(&po);
    if (o.fail && (rc = parse_fail(c, m, o.fail, &po.failed)))
        goto out;
    if (sr_profile_ctx_new(&ctx, m, &po, &e) || sr_profile_work_new(&w, &e)) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    sr_profile_mode mode = o.fast ? SR_PROFILE_FAST : SR_PROFILE_FULL;
    sr_profile_perturb lo, hi;
    sr_profile_perturb_init(&lo);
    sr_profile_perturb_init(&hi);
    for (size_t k = 0; k < m->nstages; k++) {
        sr_band b = sr_canopy_total_cds(&m->stages[k].canopy);
        lo.drag_scale[k] = b.lo / b.typ;
        hi.drag_scale[k] = b.hi / b.typ;
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
    if (sr_profile_run(ctx, NULL, mode, w, &R->typ, want_track ? &track : NULL, &e) ||
        sr_profile_run(ctx, &lo, mode, w, &R->lo, o.band_ends ? &track_lo : NULL, &e) ||
        sr_profile_run(ctx, &hi, mode, w, &R->hi, o.band_ends ? &track_hi : NULL, &e)) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    r = sr_report_new("profile", "staged descent of a mission");
    if (!r) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    report_inputs(r, c, m, po.failed);
    sr_report_section(r, "Result (low / typical / high over the canopies' drag-coefficient range)");
    sr_report_band(r, "descent_time", "descent time (last touchdown)", fmin(R->lo.descent_time, R->hi.descent_time),
                   R->typ.descent_time, fmax(R->lo.descent_time, R->hi.descent_time), SR_Q_TIME, SR_FIXED(1));
    sr_report_band(r, "touchdown_rate", "highest touchdown descent rate", R->hi.max_rate, R->typ.max_rate,
                   R->lo.max_rate, SR_Q_SPEED, 3);
    sr_report_band(r, "landing_energy", "highest section landing energy", R->hi.max_energy, R->typ.max_energy,
                   R->lo.max_energy, SR_Q_ENERGY, 3);
    sr_report_band(r, "drift", "farthest landing point from launch", fmin(R->lo.max_drift, R->hi.max_drift),
                   R->typ.max_drift, fmax(R->lo.max_drift, R->hi.max_drift), SR_Q_LENGTH, SR_FIXED(0));
    report_timeline(r, m, &R->typ);
    report_stages(r, m, &R->typ);
    report_touchdown(r, m, R);
    int exceeded = report_limits(r, c, m, R, o.worst);
    report_warnings(r, c, m, ctx, R);
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    sr_input_warnings_mission(&iw, m, NULL, c->units);
    sr_cli_report_input_warnings(r, &iw);
    report_notes(r, o.fast);
    sr_profile_report_failures(r, c, m);
    /* the trajectory and the map are built before anything is written */
    sr_map_run mr[3] = {{"typical drag", &R->typ, &track}, {"low drag", &R->lo, &track_lo},
                        {"high drag", &R->hi, &track_hi}};
    size_t nmr = o.band_ends ? 3 : 1;
    if (o.trajectory && (rc = sr_maps_trajectory(c, o.trajectory, m, ctx, mr, nmr, &tbuf, &tlen)))
        goto out;
    if (o.geojson && (rc = sr_maps_profile_geojson(c, m, mr, nmr, &gbuf, &glen)))
        goto out;
    if ((rc = sr_cli_emit(c, r)))
        goto out;
    if (tbuf && (rc = sr_maps_write(c, "--trajectory", o.trajectory, tbuf, tlen)))
        goto out;
    if (gbuf && (rc = sr_maps_write(c, "--geojson", o.geojson, gbuf, glen)))
        goto out;
    if (c->plot_prefix && (rc = sr_profile_plot(c, m, ctx, &R->typ, &track, argc, argv)))
        goto out;
    rc = exceeded ? SR_EXIT_LIMIT : SR_EXIT_OK;
out:
    free(pts);
    free(pts_lo);
    free(pts_hi);
    free(tbuf);
    free(gbuf);
    sr_report_free(r);
    sr_profile_work_free(w);
    sr_profile_ctx_free(ctx);
    if (m) {
        sr_mission_free(m);
        free(m);
    }
    free(R);
    free(cat);
    return rc;
}
