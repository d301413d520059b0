/* mission.c - the strict mission-file reader. */
#include "mission.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define PI 3.14159265358979323846

static const char *const TOP_KEYS[] = {"mission", "description", "site", "sections", "stages", "start", "limits",
                                       "uncertainty", NULL};
static const char *const TOP_REQ[] = {"mission", "sections", "stages", NULL};
static const char *const SITE_KEYS[] = {"elevation", "temperature", "pressure", "sounding", NULL};
static const char *const SECTION_KEYS[] = {"name", "mass", NULL};
static const char *const STAGE_KEYS[] = {"name",          "family",         "canopy",     "nominal-diameter",
                                         "projected-diameter", "flat-diameter", "nominal-area", "drag-coefficient",
                                         "count",         "cluster-factor", "areal-mass", "deploy",
                                         NULL};
static const char *const STAGE_REQ[] = {"name", NULL};
static const char *const DEPLOY_KEYS[] = {"height", "delay", NULL};
static const char *const START_KEYS[] = {"height", "speed", "path-angle", NULL};
static const char *const START_REQ[] = {"height", NULL};
static const char *const LIMIT_KEYS[] = {"touchdown-speed", "landing-energy", "descent-time", "drift", NULL};

static void relative_path(char *out, size_t len, const char *base, const char *file)
{
    if (file[0] == '/') {
        snprintf(out, len, "%s", file);
        return;
    }
    const char *slash = strrchr(base, '/');
    if (!slash) {
        snprintf(out, len, "%s", file);
        return;
    }
    snprintf(out, len, "%.*s/%s", (int)(slash - base), base, file);
}

static int parse_site(sr_mission *m, sr_yaml *y, yaml_node_t *site, sr_error *err)
{
    int rc;
    if ((rc = sr_yaml_check_map(y, site, "site", SITE_KEYS, NULL, err)))
        return rc;
    yaml_node_t *en = sr_yaml_get(y, site, "elevation"), *tn = sr_yaml_get(y, site, "temperature"),
                *pn = sr_yaml_get(y, site, "pressure"), *sn = sr_yaml_get(y, site, "sounding");
    double z = 0.0, T = NAN, p = NAN;
    if (en && (rc = sr_yaml_quantity(y, en, SR_Q_LENGTH, &z, err)))
        return rc;
    if (tn && (rc = sr_yaml_quantity(y, tn, SR_Q_TEMP, &T, err)))
        return rc;
    if (pn && (rc = sr_yaml_quantity(y, pn, SR_Q_PRESSURE, &p, err)))
        return rc;
    m->ground = z;
    sr_error e;
    if (sn) {
        if (tn || pn)
            return sr_yaml_fail(y, sn, err, "give either a sounding or surface temperature/pressure, not both");
        char file[400], path[1024];
        if ((rc = sr_yaml_string(y, sn, file, sizeof file, err)))
            return rc;
        relative_path(path, sizeof path, m->path, file);
        if ((rc = sr_atmos_load_sounding(&m->atmos, path, &e)))
            return sr_yaml_fail(y, sn, err, "%s", e.msg);
        double lo, hi;
        sr_atmos_range(&m->atmos, &lo, &hi);
        if (z < lo || z > hi)
            return sr_yaml_fail(y, en ? en : sn, err, "the site elevation %.0f m is outside the sounding (%.0f .. %.0f m)",
                                z, lo, hi);
        return SR_OK;
    }
    if ((rc = sr_atmos_init_site(&m->atmos, z, T, p, &e)))
        return sr_yaml_fail(y, tn ? tn : pn ? pn : en, err, "%s", e.msg);
    return SR_OK;
}

static int parse_stage(sr_mission *m, sr_yaml *y, yaml_node_t *n, const sr_catalog *cat, sr_stage *s, size_t idx,
                       sr_error *err)
{
    int rc;
    if ((rc = sr_yaml_check_map(y, n, "a stage", STAGE_KEYS, STAGE_REQ, err)))
        return rc;
    if ((rc = sr_yaml_string(y, sr_yaml_get(y, n, "name"), s->name, sizeof s->name, err)))
        return rc;
    yaml_node_t *cf = sr_yaml_get(y, n, "canopy");
    if (cf) {
        if (sr_yaml_get(y, n, "family"))
            return sr_yaml_fail(y, cf, err, "stage '%s': give either a family or a canopy file, not both", s->name);
        char file[400], path[1024];
        if ((rc = sr_yaml_string(y, cf, file, sizeof file, err)))
            return rc;
        relative_path(path, sizeof path, m->path, file);
        sr_error e;
        if ((rc = sr_catalog_load_canopy(&s->canopy, cat, path, &e)))
            return sr_yaml_fail(y, cf, err, "%s", e.msg);
        s->has_size = 1;
    } else {
        if ((rc = sr_catalog_canopy_from_node(&s->canopy, cat, y, n, 1, &s->has_size, err)))
            return rc;
    }
    yaml_node_t *d = sr_yaml_get(y, n, "deploy");
    if (!d) {
        if (idx == 0) {
            s->deploy = SR_DEPLOY_APOGEE;
            return SR_OK;
        }
        return sr_yaml_fail(y, n, err, "stage '%s' needs a deploy event (height: or delay:)", s->name);
    }
    if (d->type == YAML_SCALAR_NODE) {
        if (strcmp((const char *)d->data.scalar.value, "apogee") != 0)
            return sr_yaml_fail(y, d, err, "deploy must be 'apogee', or a mapping with height: or delay:");
        if (idx != 0)
            return sr_yaml_fail(y, d, err, "only the first stage can deploy at apogee");
        s->deploy = SR_DEPLOY_APOGEE;
        return SR_OK;
    }
    if ((rc = sr_yaml_check_map(y, d, "deploy", DEPLOY_KEYS, NULL, err)))
        return rc;
    yaml_node_t *h = sr_yaml_get(y, d, "height"), *t = sr_yaml_get(y, d, "delay");
    if ((h && t) || (!h && !t))
        return sr_yaml_fail(y, d, err, "deploy takes exactly one of height: (above ground) or delay:");
    if (h) {
        s->deploy = SR_DEPLOY_ALTITUDE;
        if ((rc = sr_yaml_quantity(y, h, SR_Q_LENGTH, &s->deploy_value, err)))
            return rc;
        if (!(s->deploy_value > 0.0 && s->deploy_value < 80000.0))
            return sr_yaml_fail(y, h, err, "deployment height must be above ground and below 80 km");
    } else {
        s->deploy = SR_DEPLOY_DELAY;
        if ((rc = sr_yaml_quantity(y, t, SR_Q_TIME, &s->deploy_value, err)))
            return rc;
        if (!(s->deploy_value >= 0.0 && s->deploy_value <= 3600.0))
            return sr_yaml_fail(y, t, err, "deployment delay must be between 0 s and 1 h");
    }
    return SR_OK;
}

int sr_mission_parse(sr_mission *m, sr_yaml *y, const sr_catalog *cat, sr_error *err)
{
    int rc;
    yaml_node_t *root = sr_yaml_root(y);
    if ((rc = sr_yaml_check_map(y, root, "the mission file", TOP_KEYS, TOP_REQ, err)))
        return rc;
    if ((rc = sr_yaml_string(y, sr_yaml_get(y, root, "mission"), m->name, sizeof m->name, err)))
        return rc;
    yaml_node_t *site = sr_yaml_get(y, root, "site");
    if (site) {
        if ((rc = parse_site(m, y, site, err)))
            return rc;
    }
    yaml_node_t *secs = sr_yaml_get(y, root, "sections");
    if ((rc = sr_yaml_require_seq(y, secs, "sections", 1, SR_MISSION_MAX_SECTIONS, err)))
        return rc;
    m->nsections = sr_yaml_seq_len(secs);
    for (size_t i = 0; i < m->nsections; i++) {
        yaml_node_t *s = sr_yaml_seq_at(y, secs, i);
        if ((rc = sr_yaml_check_map(y, s, "a section", SECTION_KEYS, SECTION_KEYS, err)))
            return rc;
        if ((rc = sr_yaml_string(y, sr_yaml_get(y, s, "name"), m->sections[i].name, sizeof m->sections[i].name,
                                 err)))
            return rc;
        yaml_node_t *mn = sr_yaml_get(y, s, "mass");
        if ((rc = sr_yaml_quantity(y, mn, SR_Q_MASS, &m->sections[i].mass, err)))
            return rc;
        if (!(m->sections[i].mass > 0.0 && m->sections[i].mass <= 10000.0))
            return sr_yaml_fail(y, mn, err, "section mass must be above 0 and at most 10000 kg");
        for (size_t j = 0; j < i; j++)
            if (strcmp(m->sections[j].name, m->sections[i].name) == 0)
                return sr_yaml_fail(y, s, err, "two sections are named '%s'", m->sections[i].name);
    }
    yaml_node_t *stages = sr_yaml_get(y, root, "stages");
    if ((rc = sr_yaml_require_seq(y, stages, "stages", 1, SR_MISSION_MAX_STAGES, err)))
        return rc;
    m->nstages = sr_yaml_seq_len(stages);
    for (size_t i = 0; i < m->nstages; i++) {
        if ((rc = parse_stage(m, y, sr_yaml_seq_at(y, stages, i), cat, &m->stages[i], i, err)))
            return rc;
    }
    /* deployment heights must fall from stage to stage */
    double prev = INFINITY;
    for (size_t i = 0; i < m->nstages; i++) {
        const sr_stage *s = &m->stages[i];
        if (s->deploy == SR_DEPLOY_ALTITUDE) {
            if (!(s->deploy_value < prev))
                return sr_yaml_fail(y, sr_yaml_seq_at(y, stages, i), err,
                                    "stage '%s' deploys at %.0f m, not below the previous deployment (%.0f m)",
                                    s->name, s->deploy_value, prev);
            prev = s->deploy_value;
        }
    }
    yaml_node_t *start = sr_yaml_get(y, root, "start");
    if (start) {
        if ((rc = sr_yaml_check_map(y, start, "start", START_KEYS, START_REQ, err)))
            return rc;
        yaml_node_t *hn = sr_yaml_get(y, start, "height");
        if ((rc = sr_yaml_quantity(y, hn, SR_Q_LENGTH, &m->start_height, err)))
            return rc;
        if (!(m->start_height > 0.0 && m->ground + m->start_height <= SR_ATMOS_Z_MAX))
            return sr_yaml_fail(y, hn, err, "start height must be above ground and within the atmosphere model");
        yaml_node_t *vn = sr_yaml_get(y, start, "speed"), *an = sr_yaml_get(y, start, "path-angle");
        if (vn) {
            if ((rc = sr_yaml_quantity(y, vn, SR_Q_SPEED, &m->start_speed, err)))
                return rc;
            if (!(m->start_speed >= 0.0 && m->start_speed < 2000.0))
                return sr_yaml_fail(y, vn, err, "start speed must be between 0 and 2000 m/s");
        }
        if (an) {
            if ((rc = sr_yaml_quantity(y, an, SR_Q_ANGLE, &m->start_path_angle, err)))
                return rc;
            if (!(fabs(m->start_path_angle) <= PI / 2))
                return sr_yaml_fail(y, an, err, "path angle must be within -90 deg .. 90 deg");
        }
        m->has_start = 1;
        for (size_t i = 0; i < m->nstages; i++)
            if (m->stages[i].deploy == SR_DEPLOY_ALTITUDE && m->stages[i].deploy_value > m->start_height)
                return sr_yaml_fail(y, sr_yaml_seq_at(y, stages, i), err,
                                    "stage '%s' deploys at %.0f m, above the first deployment at %.0f m",
                                    m->stages[i].name, m->stages[i].deploy_value, m->start_height);
    }
    yaml_node_t *lim = sr_yaml_get(y, root, "limits");
    if (lim) {
        if ((rc = sr_yaml_check_map(y, lim, "limits", LIMIT_KEYS, NULL, err)))
            return rc;
        struct {
            const char *key;
            sr_quantity q;
            double *dst;
        } L[] = {{"touchdown-speed", SR_Q_SPEED, &m->limit_speed},
                 {"landing-energy", SR_Q_ENERGY, &m->limit_energy},
                 {"descent-time", SR_Q_TIME, &m->limit_time},
                 {"drift", SR_Q_LENGTH, &m->limit_drift}};
        for (size_t i = 0; i < sizeof L / sizeof L[0]; i++) {
            yaml_node_t *n = sr_yaml_get(y, lim, L[i].key);
            if (!n)
                continue;
            if ((rc = sr_yaml_quantity(y, n, L[i].q, L[i].dst, err)))
                return rc;
            if (!(*L[i].dst > 0.0))
                return sr_yaml_fail(y, n, err, "limit %s must be positive", L[i].key);
        }
    }
    return sr_mission_parse_uncertainty(m, y, sr_yaml_get(y, root, "uncertainty"), err);
}

int sr_mission_load(sr_mission *m, const char *path, const sr_catalog *cat, sr_error *err)
{
    memset(m, 0, sizeof *m);
    sr_atmos_init_standard(&m->atmos);
    m->limit_speed = m->limit_energy = m->limit_time = m->limit_drift = NAN;
    snprintf(m->path, sizeof m->path, "%s", path);
    sr_yaml y;
    int rc = sr_yaml_load_file(&y, path, err);
    if (rc)
        return rc;
    rc = sr_mission_parse(m, &y, cat, err);
    sr_yaml_free(&y);
    if (rc)
        sr_mission_free(m);
    return rc;
}

void sr_mission_free(sr_mission *m)
{
    sr_atmos_free(&m->atmos);
}

double sr_mission_total_mass(const sr_mission *m)
{
    double s = 0.0;
    for (size_t i = 0; i < m->nsections; i++)
        s += m->sections[i].mass;
    return s;
}
