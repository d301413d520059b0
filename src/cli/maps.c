/* maps.c - the trajectory file (a report table in CSV or JSON) and the
 * GeoJSON landing maps of `profile` and `dispersion`, written through the run's
 * transaction. */
#define _DEFAULT_SOURCE
#include "cli/maps.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/trajectory.h"
#include "cli/common.h"
#include "output/txn.h"
#include "output/geojson.h"
#include "output/report.h"
#include "physics/geodesy.h"

int sr_cli_maps_write(sr_cli *c, const char *opt, const char *path, const char *data, size_t len)
{
    sr_error e;
    (void)opt; /* the transaction's message names the option it was reserved under */
    if (sr_txn_write(c->txn, path, data, len, &e))
        return sr_cli_fail(c, "%s", e.msg);
    return 0;
}

void sr_cli_maps_report_position(sr_report *r, const sr_mission *m)
{
    if (!m->has_position)
        return;
    char buf[128];
    snprintf(buf, sizeof buf, "%.4f deg %c, %.4f deg %c (WGS 84)", fabs(m->latitude), m->latitude < 0 ? 'S' : 'N',
             fabs(m->longitude), m->longitude < 0 ? 'W' : 'E');
    sr_report_text(r, "launch_point", "launch point", buf);
}

int sr_cli_maps_need_position(sr_cli *c, const char *opt, const sr_mission *m)
{
    if (!m->has_position)
        return sr_cli_fail(c, "%s: the mission gives no launch point on the map: add site.latitude and "
                              "site.longitude (WGS 84, e.g. \"35.25 deg\", \"-116.68 deg\") to %s",
                           opt, m->path);
    return 0;
}

int sr_cli_maps_trajectory_format(const sr_cli *c, const char *path)
{
    size_t l = strlen(path);
    if (l >= 5 && strcmp(path + l - 5, ".json") == 0)
        return SR_REPORT_JSON;
    if (l >= 4 && strcmp(path + l - 4, ".csv") == 0)
        return SR_REPORT_CSV;
    return c->format == SR_FMT_JSON ? SR_REPORT_JSON : SR_REPORT_CSV;
}

static const char *event_text(const sr_profile_result *r, const sr_traj_row *w)
{
    if (w->event < 0)
        return "";
    int s = w->event_stage;
    if (w->event == SR_EVENT_DEPLOY && s >= 0 && (size_t)s < r->nstages) {
        if (!r->stage[s].deployed)
            return "deployment FAILS";
        if (r->stage[s].body != w->body)
            return "deployment, separation";
    }
    return sr_profile_event_name((sr_event_kind)w->event);
}

int sr_cli_maps_trajectory(sr_cli *c, const char *path, const sr_mission *m, const sr_profile_ctx *ctx,
                       const sr_map_run *runs, size_t nruns, char **out, size_t *outlen)
{
    *out = NULL;
    *outlen = 0;
    sr_report *rep = sr_report_new("profile", "trajectory of a mission");
    if (!rep)
        return sr_cli_fail(c, "out of memory");
    sr_report_section(rep, "Mission");
    sr_report_text(rep, "mission", "mission", m->name);
    sr_report_text(rep, "file", "file", m->path);
    sr_report_value(rep, "site_elevation", "site elevation (altitude of the ground)", m->ground, SR_Q_LENGTH,
                    SR_FIXED(0));
    sr_rtable *t = sr_report_table(rep, "trajectory", "Trajectory of every body");
    if (nruns > 1)
        sr_rtable_text_column(t, "run", "run");
    sr_rtable_text_column(t, "body", "sections");
    sr_rtable_column(t, "time", "time", SR_Q_TIME, SR_FIXED(2));
    sr_rtable_column(t, "height", "height", SR_Q_LENGTH, SR_FIXED(1));
    sr_rtable_column(t, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(1));
    sr_rtable_column(t, "descent_rate", "descent rate", SR_Q_SPEED, 4);
    sr_rtable_column(t, "airspeed", "airspeed", SR_Q_SPEED, 4);
    sr_rtable_column(t, "east", "east", SR_Q_LENGTH, SR_FIXED(1));
    sr_rtable_column(t, "north", "north", SR_Q_LENGTH, SR_FIXED(1));
    sr_rtable_column(t, "dynamic_pressure", "q", SR_Q_PRESSURE, 4);
    sr_rtable_column(t, "mach", "Mach", SR_Q_NONE, 3);
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_text_column(t, "event", "event");
    int rc = 0;
    sr_error e;
    for (size_t k = 0; k < nruns && !rc; k++) {
        sr_trajectory tj;
        if (sr_trajectory_build(ctx, runs[k].r, runs[k].tr, &tj, &e)) {
            rc = sr_cli_fail(c, "--trajectory: %s", e.msg);
            break;
        }
        for (size_t i = 0; i < tj.n; i++) {
            const sr_traj_row *w = &tj.row[i];
            char bn[256];
            sr_mission_set_name(m, runs[k].r->body[w->body].sections, bn, sizeof bn);
            int s = w->event >= 0 && w->event_stage >= 0 ? w->event_stage : w->stage;
            double row[] = {w->t, w->h, w->h + m->ground, w->rate, w->speed, w->east, w->north, w->q, w->mach};
            const char *txt3[] = {runs[k].name, bn, s >= 0 ? m->stages[s].name : "none", event_text(runs[k].r, w)};
            if (sr_rtable_row(t, row, nruns > 1 ? txt3 : txt3 + 1)) {
                rc = sr_cli_fail(c, "out of memory");
                break;
            }
        }
        sr_trajectory_free(&tj);
    }
    sr_report_note(rep, "Height is above the ground, altitude above sea level; east and north are measured from "
                        "the launch or release point. Rows are by body, then time: the points the descent engine "
                        "kept (each ODE step of a transient, evenly in time through a steady stage) and the event "
                        "rows of the profile's timeline (event column).");
    sr_report_note(rep, "stage: the stage of an event row; elsewhere the stage last deployed on the body (earlier "
                        "canopies stay open unless a stage releases them); none: no canopy yet.");
    if (nruns > 1)
        sr_report_note(rep, "Runs: the typical drag, and the low and the high end of every stage's drag range at "
                            "once (the band ends of the profile).");
    char *buf = NULL;
    size_t len = 0;
    FILE *mem = rc ? NULL : open_memstream(&buf, &len);
    if (!rc && !mem)
        rc = sr_cli_fail(c, "out of memory");
    if (!rc) {
        int w = sr_report_write(rep, mem, (sr_report_format)sr_cli_maps_trajectory_format(c, path), c->units, &e);
        fclose(mem);
        rc = w ? sr_cli_fail(c, "--trajectory: %s", e.msg) : 0;
    }
    if (rc)
        free(buf);
    else {
        *out = buf;
        *outlen = len;
    }
    sr_report_free(rep);
    return rc;
}

/* ---- GeoJSON ---- */

static sr_geojson *map_new(sr_cli *c, const sr_mission *m, const char *title)
{
    sr_geo o;
    sr_error e;
    if (sr_geo_init(&o, m->latitude, m->longitude, &e)) {
        sr_cli_fail(c, "--geojson: %s", e.msg);
        return NULL;
    }
    sr_geojson *g = sr_geojson_new(&o, c->units);
    if (!g) {
        sr_cli_fail(c, "out of memory");
        return NULL;
    }
    sr_geojson_member(g, "title", title);
    sr_geojson_member(g, "mission", m->name);
    /* the launch point carries the caution too: most map programs show only
     * the properties of features */
    sr_geojson_point(g, "launch point", "launch / release point", 0.0, 0.0);
    sr_geojson_text(g, "caution", sr_report_caution());
    sr_geojson_text(g, "mission", m->name);
    sr_geojson_value(g, "latitude", m->latitude, SR_Q_NONE);
    sr_geojson_text(g, "latitude_unit", "deg");
    sr_geojson_value(g, "longitude", m->longitude, SR_Q_NONE);
    sr_geojson_text(g, "longitude_unit", "deg");
    sr_geojson_value(g, "ground_elevation", m->ground, SR_Q_LENGTH);
    if (m->start_east != 0.0 || m->start_north != 0.0) {
        sr_geojson_point(g, "start", "first deployment (apogee / release)", m->start_east, m->start_north);
        sr_geojson_value(g, "height", m->start_height, SR_Q_LENGTH);
        sr_geojson_value(g, "east", m->start_east, SR_Q_LENGTH);
        sr_geojson_value(g, "north", m->start_north, SR_Q_LENGTH);
    }
    return g;
}

static int map_finish(sr_cli *c, sr_geojson *g, const sr_mission *m, char **buf, size_t *len)
{
    if (!isnan(m->limit_drift)) {
        sr_geojson_circle(g, "drift limit", "drift limit around the launch point", 0.0, 0.0, m->limit_drift);
        sr_geojson_value(g, "radius", m->limit_drift, SR_Q_LENGTH);
    }
    sr_error e;
    int rc = sr_geojson_dump(g, buf, len, &e);
    sr_geojson_free(g);
    if (rc)
        return e.code == SR_EIMPOSSIBLE ? (sr_cli_fail(c, "--geojson: %s", e.msg), SR_EXIT_LIMIT)
                                        : sr_cli_fail(c, "--geojson: %s", e.msg);
    return 0;
}

/* The track of body b as east/north arrays (malloc'd, *n points). */
static int track_of(const sr_profile_track *tr, int b, double **east, double **north, size_t *n)
{
    *n = 0;
    *east = malloc((tr->n + 1) * sizeof **east);
    *north = malloc((tr->n + 1) * sizeof **north);
    if (!*east || !*north) {
        free(*east);
        free(*north);
        return SR_ENOMEM;
    }
    for (size_t i = 0; i < tr->n; i++)
        if (tr->pt[i].body == b) {
            (*east)[*n] = tr->pt[i].east;
            (*north)[*n] = tr->pt[i].north;
            (*n)++;
        }
    return SR_OK;
}

static int add_tracks(sr_geojson *g, const sr_mission *m, const sr_map_run *run)
{
    const sr_profile_result *r = run->r;
    for (size_t b = 0; b < r->nbodies; b++) {
        char bn[256];
        sr_mission_set_name(m, r->body[b].sections, bn, sizeof bn);
        double *e, *n;
        size_t np;
        if (track_of(run->tr, (int)b, &e, &n, &np))
            return SR_ENOMEM;
        /* a body that separated starts where its parent was */
        int rc = sr_geojson_line(g, "trajectory", bn, e, n, np);
        free(e);
        free(n);
        if (rc)
            return rc;
        if (np >= 2) {
            sr_geojson_text(g, "run", run->name);
            sr_geojson_value(g, "descent_time", r->body[b].t_land, SR_Q_TIME);
        }
    }
    return SR_OK;
}

static int add_landings(sr_geojson *g, const sr_mission *m, const sr_map_run *run)
{
    const sr_profile_result *r = run->r;
    for (size_t b = 0; b < r->nbodies; b++) {
        const sr_profile_body *pb = &r->body[b];
        char bn[256];
        sr_mission_set_name(m, pb->sections, bn, sizeof bn);
        double energy = NAN;
        for (size_t s = 0; s < r->nsections; s++)
            if (r->section_body[s] == (int)b && !(r->section_energy[s] <= energy))
                energy = r->section_energy[s];
        int rc = sr_geojson_point(g, "landing point", bn, pb->east, pb->north);
        rc = rc ? rc : sr_geojson_text(g, "run", run->name);
        rc = rc ? rc : sr_geojson_value(g, "time", pb->t_land, SR_Q_TIME);
        rc = rc ? rc : sr_geojson_value(g, "descent_rate", pb->rate_land, SR_Q_SPEED);
        rc = rc ? rc : sr_geojson_value(g, "landing_energy", energy, SR_Q_ENERGY);
        rc = rc ? rc : sr_geojson_value(g, "drift", pb->drift, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_bearing(g, "bearing", pb->bearing);
        rc = rc ? rc : sr_geojson_value(g, "east", pb->east, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_value(g, "north", pb->north, SR_Q_LENGTH);
        if (rc)
            return rc;
    }
    return SR_OK;
}

int sr_cli_maps_profile_geojson(sr_cli *c, const sr_mission *m, const sr_map_run *runs, size_t nruns, char **buf,
                            size_t *len)
{
    *buf = NULL;
    sr_geojson *g = map_new(c, m, "staged descent of a mission: tracks and landing points");
    if (!g)
        return SR_EXIT_USAGE;
    int rc = 0;
    for (size_t k = 0; k < nruns && !rc; k++)
        rc = add_tracks(g, m, &runs[k]);
    for (size_t k = 0; k < nruns && !rc; k++)
        rc = add_landings(g, m, &runs[k]);
    /* the deployments of the typical run */
    const sr_profile_result *r = runs[0].r;
    for (size_t i = 0; i < r->nevents && !rc; i++) {
        const sr_profile_event *e = &r->events[i];
        if (e->kind != SR_EVENT_DEPLOY || e->stage < 0)
            continue;
        rc = sr_geojson_point(g, r->stage[e->stage].deployed ? "deployment" : "deployment fails",
                              m->stages[e->stage].name, e->east, e->north);
        rc = rc ? rc : sr_geojson_text(g, "run", runs[0].name);
        rc = rc ? rc : sr_geojson_value(g, "time", e->t, SR_Q_TIME);
        rc = rc ? rc : sr_geojson_value(g, "height", e->h, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_value(g, "airspeed", e->speed, SR_Q_SPEED);
        rc = rc ? rc : sr_geojson_value(g, "dynamic_pressure", e->q, SR_Q_PRESSURE);
    }
    if (rc) {
        sr_geojson_free(g);
        return sr_cli_fail(c, "out of memory");
    }
    return map_finish(c, g, m, buf, len);
}

int sr_cli_maps_dispersion_geojson(sr_cli *c, const sr_mission *m, const sr_disp_mission *dm, const sr_disp_result *res,
                               const sr_disp_stats *st, const sr_landing *nom, size_t max_samples, char **buf,
                               size_t *len)
{
    *buf = NULL;
    sr_geojson *g = map_new(c, m, "Monte Carlo landing dispersion: footprint");
    if (!g)
        return SR_EXIT_USAGE;
    /* the nominal descent's tracks: the same full-mode run as the profile's */
    sr_profile_result *pr = malloc(sizeof *pr);
    sr_profile_point *pts = malloc(SR_MAPS_TRACK_CAP * sizeof *pts);
    sr_profile_track tr = {pts, SR_MAPS_TRACK_CAP, 0, 0.5};
    sr_error e;
    int rc = 0;
    if (!pr || !pts)
        rc = sr_cli_fail(c, "out of memory");
    else if (sr_profile_run(dm->ctx, NULL, SR_PROFILE_FULL, NULL, pr, &tr, &e))
        rc = sr_cli_fail_err(c, &e);
    else {
        sr_map_run run = {"nominal", pr, &tr};
        if (add_tracks(g, m, &run))
            rc = sr_cli_fail(c, "out of memory");
    }
    free(pts);
    free(pr);
    if (rc) {
        sr_geojson_free(g);
        return rc;
    }
    for (size_t b = 0; b < res->nbodies && !rc; b++) {
        const sr_body_stats *s = &st->body[b];
        const char *bn = dm->body_name[b];
        rc = sr_geojson_point(g, "nominal landing point", bn, nom[b].east, nom[b].north);
        rc = rc ? rc : sr_geojson_value(g, "time", nom[b].time, SR_Q_TIME);
        rc = rc ? rc : sr_geojson_value(g, "touchdown_speed", nom[b].speed, SR_Q_SPEED);
        rc = rc ? rc : sr_geojson_value(g, "east", nom[b].east, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_value(g, "north", nom[b].north, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_point(g, "mean landing point", bn, s->mean_east, s->mean_north);
        rc = rc ? rc : sr_geojson_value(g, "distance", s->mean_distance, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_bearing(g, "bearing", s->mean_bearing);
        rc = rc ? rc : sr_geojson_value(g, "east", s->mean_east, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_value(g, "north", s->mean_north, SR_Q_LENGTH);
        rc = rc ? rc : sr_geojson_integer(g, "samples", (long long)res->n);
        const struct {
            const char *kind;
            const sr_ellipse *el;
            double share;
        } EL[2] = {{"1-sigma ellipse", &s->sigma1, 39.3}, {"3-sigma ellipse", &s->sigma3, 98.9}};
        for (int k = 0; k < 2 && !rc; k++) {
            rc = sr_geojson_ellipse(g, EL[k].kind, bn, s->mean_east, s->mean_north, EL[k].el->major, EL[k].el->minor,
                                    EL[k].el->bearing);
            rc = rc ? rc : sr_geojson_value(g, "semi_major_axis", EL[k].el->major, SR_Q_LENGTH);
            rc = rc ? rc : sr_geojson_value(g, "semi_minor_axis", EL[k].el->minor, SR_Q_LENGTH);
            rc = rc ? rc : sr_geojson_bearing(g, "major_axis_bearing", EL[k].el->bearing);
            rc = rc ? rc : sr_geojson_value(g, "normal_share_percent", EL[k].share, SR_Q_NONE);
        }
        const struct {
            const char *kind;
            double r, e, n;
        } CI[4] = {{"50 % circle around the mean", s->r50_mean, s->mean_east, s->mean_north},
                   {"95 % circle around the mean", s->r95_mean, s->mean_east, s->mean_north},
                   {"50 % circle around the launch point", s->r50_launch, 0.0, 0.0},
                   {"95 % circle around the launch point", s->r95_launch, 0.0, 0.0}};
        for (int k = 0; k < 4 && !rc; k++) {
            rc = sr_geojson_circle(g, CI[k].kind, bn, CI[k].e, CI[k].n, CI[k].r);
            rc = rc ? rc : sr_geojson_value(g, "radius", CI[k].r, SR_Q_LENGTH);
        }
    }
    /* a thinned set of landing points: every k-th sample */
    if (max_samples > 0 && !rc) {
        size_t every = (res->n + max_samples - 1) / max_samples;
        for (size_t i = 0; i < res->n && !rc; i += every)
            for (size_t b = 0; b < res->nbodies && !rc; b++) {
                const sr_landing *l = &res->land[i * res->nbodies + b];
                rc = sr_geojson_point(g, "sample landing point", dm->body_name[b], l->east, l->north);
                rc = rc ? rc : sr_geojson_integer(g, "sample", (long long)i);
                rc = rc ? rc : sr_geojson_value(g, "time", l->time, SR_Q_TIME);
                rc = rc ? rc : sr_geojson_value(g, "touchdown_speed", l->speed, SR_Q_SPEED);
                rc = rc ? rc : sr_geojson_value(g, "landing_energy", l->energy, SR_Q_ENERGY);
            }
    }
    if (rc) {
        sr_geojson_free(g);
        return sr_cli_fail(c, "out of memory");
    }
    return map_finish(c, g, m, buf, len);
}
