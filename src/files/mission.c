/* mission.c - the strict mission-file reader. */
#include "files/mission.h"
#include "files/mission_int.h"
#include "files/sounding.h"
#include "files/dragtable.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#define PI 3.14159265358979323846

static const char *const TOP_KEYS[] = {"mission", "description", "site",          "sections",    "stages",
                                       "start",   "limits",      "failure-cases", "uncertainty", "design", NULL};
static const char *const TOP_REQ[] = {"mission", "sections", "stages", NULL};
static const char *const SITE_KEYS[] = {"elevation", "temperature", "pressure", "sounding", "wind", "latitude",
                                        "longitude", NULL};
static const char *const SECTION_KEYS[] = {"name", "mass", "drag-area", "body", "rigid-with", NULL};
static const char *const BODY_KEYS[] = {"shape", "diameter", "length", "curve", "cd-table", "area", "interpolation",
                                        "stable-end-on", NULL};
static const char *const BODY_REQ[] = {"diameter", NULL};
static const char *const FAILURE_KEYS[] = {"name", "fails", "only", NULL};
static const char *const SECTION_REQ[] = {"name", "mass", NULL};
static const char *const STAGE_KEYS[] = {"name",          "family",         "canopy",     "nominal-diameter",
                                         "projected-diameter", "flat-diameter", "nominal-area", "drag-coefficient",
                                         "count",         "cluster-factor", "areal-mass", "deploy",
                                         "carries",       "previous",       "line-stretch", "measured-opening",
                                         NULL};
static const char *const STAGE_REQ[] = {"name", NULL};
static const char *const DEPLOY_KEYS[] = {"height", "delay", NULL};
static const char *const START_KEYS[] = {"height", "speed", "path-angle", "heading", "east", "north", NULL};
static const char *const START_REQ[] = {"height", NULL};
static const char *const LIMIT_KEYS[] = {"touchdown-speed", "landing-energy",  "descent-time",
                                        "drift",           "deployment-pressure", "rated-strength",
                                        "design-factor",   "landing-energy-basis", NULL};
static const char *const MASS_KEYS[] = {"low", "typical", "high", NULL};
static const char *const MASS_REQ[] = {"low", "high", NULL};

static int parse_atmos(sr_mission *m, sr_yaml *y, yaml_node_t *site, sr_error *err)
{
    int rc, acc = SR_OK;
    yaml_node_t *en = sr_yaml_get(y, site, "elevation"), *tn = sr_yaml_get(y, site, "temperature"),
                *pn = sr_yaml_get(y, site, "pressure"), *sn = sr_yaml_get(y, site, "sounding");
    double z = 0.0, T = NAN, p = NAN;
    if (en)
        SR_YAML_STEP(sr_yaml_quantity(y, en, SR_Q_LENGTH, &z, err));
    if (tn)
        SR_YAML_STEP(sr_yaml_quantity(y, tn, SR_Q_TEMP, &T, err));
    if (pn)
        SR_YAML_STEP(sr_yaml_quantity(y, pn, SR_Q_PRESSURE, &p, err));
    if (acc) /* the air needs all three */
        return acc;
    m->ground = z;
    sr_error e;
    if (sn) {
        if (tn || pn)
            return sr_yaml_fail(y, sn, err, "give either a sounding or surface temperature/pressure, not both");
        char file[400], path[1024];
        if ((rc = sr_yaml_string(y, sn, file, sizeof file, err)))
            return rc;
        sr_yaml_relative_path(path, sizeof path, m->path, file);
        if ((rc = sr_sounding_load(&m->atmos, path, &e)))
            return sr_yaml_fail(y, sn, err, "%s", e.msg);
        double lo, hi;
        sr_atmos_range(&m->atmos, &lo, &hi);
        if (z < lo || z > hi)
            return sr_yaml_fail(y, en ? en : sn, err, "the site elevation %.0f m is outside the sounding (%.0f .. %.0f m)",
                                z, lo, hi);
        return SR_OK;
    }
    if ((rc = sr_atmos_init_site(&m->atmos, z, T, p, &e))) {
        /* the key the site model refuses: elevation, temperature or pressure */
        yaml_node_t *blame = sr_yaml_get(y, site, e.key);
        return sr_yaml_fail(y, blame ? blame : tn ? tn : pn ? pn : en, err, "%s", e.msg);
    }
    return SR_OK;
}

/* site.latitude and site.longitude: the launch or release point on WGS 84,
 * in degrees with their unit, north and east positive; both or neither. */
static int parse_position(sr_mission *m, sr_yaml *y, yaml_node_t *site, sr_error *err)
{
    int rc;
    yaml_node_t *la = sr_yaml_get(y, site, "latitude"), *lo = sr_yaml_get(y, site, "longitude");
    if (!la && !lo)
        return SR_OK;
    if (!la || !lo)
        return sr_yaml_fail(y, la ? la : lo, err, "give site.latitude and site.longitude together (the launch or "
                                                  "release point on WGS 84)");
    double a, b;
    if ((rc = sr_yaml_quantity(y, la, SR_Q_ANGLE, &a, err)) || (rc = sr_yaml_quantity(y, lo, SR_Q_ANGLE, &b, err)))
        return rc;
    a *= 180.0 / PI;
    b *= 180.0 / PI;
    if (!(a >= -90.0 && a <= 90.0))
        return sr_yaml_fail(y, la, err, "latitude %g deg is outside -90 .. 90 deg (north positive, south negative)", a);
    if (!(b >= -180.0 && b <= 180.0))
        return sr_yaml_fail(y, lo, err, "longitude %g deg is outside -180 .. 180 deg (east positive, west negative)",
                            b);
    m->has_position = 1;
    m->latitude = a;
    m->longitude = b;
    return SR_OK;
}

static int parse_site(sr_mission *m, sr_yaml *y, yaml_node_t *site, sr_error *err)
{
    int acc = SR_OK;
    if (!site || site->type != YAML_MAPPING_NODE)
        return sr_yaml_check_map(y, site, "site", SITE_KEYS, NULL, err);
    SR_YAML_STEP(sr_yaml_check_map(y, site, "site", SITE_KEYS, NULL, err));
    SR_YAML_STEP(parse_atmos(m, y, site, err));
    SR_YAML_STEP(parse_position(m, y, site, err));
    yaml_node_t *wn = sr_yaml_get(y, site, "wind");
    if (wn)
        SR_YAML_STEP(sr_mission_wind_parse(&m->wind, y, wn, m->path, m->ground, &m->atmos, err));
    return acc;
}

/* A list of section names, e.g. carries: [booster, payload bay]. */
static int parse_section_set(const sr_mission *m, sr_yaml *y, yaml_node_t *n, sr_section_set *out, sr_error *err)
{
    int rc;
    const char *names[SR_MISSION_MAX_SECTIONS + 1];
    for (size_t i = 0; i < m->nsections; i++)
        names[i] = m->sections[i].name;
    names[m->nsections] = NULL;
    if ((rc = sr_yaml_require_seq(y, n, "carries", 1, m->nsections, err)))
        return rc;
    *out = 0;
    for (size_t i = 0; i < sr_yaml_seq_len(n); i++) {
        yaml_node_t *e = sr_yaml_seq_at(y, n, i);
        char name[SR_NAME_MAX];
        if ((rc = sr_yaml_string(y, e, name, sizeof name, err)))
            return rc;
        int k = -1;
        for (size_t j = 0; j < m->nsections; j++)
            if (strcmp(names[j], name) == 0)
                k = (int)j;
        if (k < 0) {
            const char *s = sr_yaml_suggest(name, names);
            if (s)
                return sr_yaml_fail(y, e, err, "no section is named '%s'; did you mean '%s'?", name, s);
            return sr_yaml_fail(y, e, err, "no section is named '%s'", name);
        }
        if (*out & (1u << k))
            return sr_yaml_fail(y, e, err, "section '%s' is listed twice", name);
        *out |= 1u << k;
    }
    return SR_OK;
}

static int parse_deploy(sr_yaml *y, yaml_node_t *n, sr_stage *s, size_t idx, sr_error *err)
{
    int rc;
    yaml_node_t *d = sr_yaml_get(y, n, "deploy");
    if (!d) {
        if (idx == 0) {
            s->deploy = SR_DEPLOY_APOGEE;
            return SR_OK;
        }
        return sr_yaml_fail(y, n, err, "stage '%s' needs a deploy event (apogee, height: or delay:)", s->name);
    }
    if (d->type == YAML_SCALAR_NODE) {
        const char *v = (const char *)d->data.scalar.value;
        if (strcmp(v, "apogee") != 0 && strcmp(v, "release") != 0)
            return sr_yaml_fail(y, d, err,
                                "deploy must be 'apogee' (or 'release': at the start state), or a mapping with "
                                "height: or delay:");
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

static int parse_stage(sr_mission *m, sr_yaml *y, yaml_node_t *n, const sr_catalog *cat, sr_stage *s, size_t idx,
                       sr_error *err)
{
    int rc, acc = SR_OK;
    if (!n || n->type != YAML_MAPPING_NODE)
        return sr_yaml_check_map(y, n, "a stage", STAGE_KEYS, STAGE_REQ, err);
    /* each part of the stage on its own: check names every problem */
    SR_YAML_STEP(sr_yaml_check_map(y, n, "a stage", STAGE_KEYS, STAGE_REQ, err));
    yaml_node_t *nm = sr_yaml_get(y, n, "name");
    if (nm)
        SR_YAML_STEP(sr_yaml_string(y, nm, s->name, sizeof s->name, err));
    yaml_node_t *cf = sr_yaml_get(y, n, "canopy");
    if (cf) {
        char file[400], path[1024];
        if (sr_yaml_get(y, n, "family"))
            SR_YAML_STEP(rc = sr_yaml_fail(y, cf, err, "stage '%s': give either a family or a canopy file, not both",
                                           s->name));
        else
            SR_YAML_STEP(rc = sr_yaml_string(y, cf, file, sizeof file, err));
        if (!rc) {
            sr_yaml_relative_path(path, sizeof path, m->path, file);
            snprintf(s->file, sizeof s->file, "%s", path);
            sr_error e;
            if (sr_catalog_load_canopy(&s->canopy, cat, path, &e))
                SR_YAML_STEP(sr_yaml_fail(y, cf, err, "%s", e.msg));
            s->has_size = 1;
        }
    } else {
        SR_YAML_STEP(sr_catalog_canopy_from_node(&s->canopy, cat, y, n, 1, &s->has_size, err));
    }
    SR_YAML_STEP(parse_deploy(y, n, s, idx, err));
    yaml_node_t *cn = sr_yaml_get(y, n, "carries");
    s->carries = idx == 0 ? (sr_section_set)((1u << m->nsections) - 1u) : m->stages[idx - 1].carries;
    if (cn)
        SR_YAML_STEP(parse_section_set(m, y, cn, &s->carries, err));
    s->keep_previous = 1;
    yaml_node_t *pn = sr_yaml_get(y, n, "previous");
    if (pn) {
        char v[16];
        SR_YAML_STEP(rc = sr_yaml_string(y, pn, v, sizeof v, err));
        if (rc)
            ;
        else if (strcmp(v, "keep") == 0)
            s->keep_previous = 1;
        else if (strcmp(v, "release") == 0)
            s->keep_previous = 0;
        else
            SR_YAML_STEP(sr_yaml_fail(y, pn, err, "previous must be 'keep' (earlier canopies stay on the line and "
                                                  "keep their drag) or 'release' (they are cut away), not '%s'",
                                      v));
    }
    s->line_stretch = 0.0;
    yaml_node_t *ln = sr_yaml_get(y, n, "line-stretch");
    if (ln) {
        SR_YAML_STEP(rc = sr_yaml_quantity(y, ln, SR_Q_TIME, &s->line_stretch, err));
        if (!rc && !(s->line_stretch >= 0.0 && s->line_stretch <= 60.0))
            SR_YAML_STEP(sr_yaml_fail(y, ln, err, "line-stretch (time from deployment to line stretch) must be "
                                                  "between 0 s and 60 s"));
    }
    return acc;
}

/* body: {shape: sphere|cylinder|disk, diameter:, length: (cylinder), curve: (a built-in one of the shape)}
 * or body: {cd-table: FILE, area:, diameter:, interpolation: loglog|steffen}: the section's drag while no
 * canopy is open on it, with a Cd that depends on the Reynolds number. */
static int parse_body(sr_mission *m, sr_yaml *y, yaml_node_t *n, sr_section *sec, sr_error *err)
{
    int rc;
    if ((rc = sr_yaml_check_map(y, n, "a section's body", BODY_KEYS, BODY_REQ, err)))
        return rc;
    yaml_node_t *shn = sr_yaml_get(y, n, "shape"), *tn = sr_yaml_get(y, n, "cd-table"),
                *dn = sr_yaml_get(y, n, "diameter"), *ln = sr_yaml_get(y, n, "length"),
                *cn = sr_yaml_get(y, n, "curve"), *an = sr_yaml_get(y, n, "area"),
                *in = sr_yaml_get(y, n, "interpolation");
    if (shn && tn)
        return sr_yaml_fail(y, tn, err, "a body takes either shape: (a built-in drag curve) or cd-table: (your own "
                                        "Cd(Re) table), not both");
    if (!shn && !tn)
        return sr_yaml_fail(y, n, err, "a body needs shape: (sphere, cylinder or disk) or cd-table: (a file of Cd "
                                       "against Re)");
    double d, len = 0.0, area = NAN;
    if ((rc = sr_yaml_quantity(y, dn, SR_Q_LENGTH, &d, err)))
        return rc;
    if (!(d > 0.0 && d <= 20.0))
        return sr_yaml_fail(y, dn, err, "a body's diameter must be above 0 and at most 20 m");
    sr_error e;
    if (shn) {
        static const char *const shapes[] = {"sphere", "cylinder", "disk", NULL};
        char v[32];
        if ((rc = sr_yaml_string(y, shn, v, sizeof v, err)))
            return rc;
        if (strcmp(v, "sphere") == 0)
            sec->shape = SR_BLUFF_SPHERE;
        else if (strcmp(v, "cylinder") == 0)
            sec->shape = SR_BLUFF_CYLINDER;
        else if (strcmp(v, "disk") == 0)
            sec->shape = SR_BLUFF_DISK;
        else {
            const char *sg = sr_yaml_suggest(v, shapes);
            return sr_yaml_fail(y, shn, err, "shape must be sphere, cylinder (broadside to the flow) or disk, not "
                                             "'%s'%s%s%s",
                                v, sg ? "; did you mean '" : "", sg ? sg : "", sg ? "'?" : "");
        }
        if (an)
            return sr_yaml_fail(y, an, err, "area: goes with cd-table:; the reference area of a %s follows from "
                                            "its diameter%s",
                                v, sec->shape == SR_BLUFF_CYLINDER ? " and length" : "");
        if (in)
            return sr_yaml_fail(y, in, err, "interpolation: goes with cd-table:");
        if (sec->shape == SR_BLUFF_CYLINDER) {
            if (!ln)
                return sr_yaml_fail(y, n, err, "a cylinder body needs length: (it falls broadside: drag on d x L)");
            if ((rc = sr_yaml_quantity(y, ln, SR_Q_LENGTH, &len, err)))
                return rc;
            if (!(len > 0.0 && len <= 100.0))
                return sr_yaml_fail(y, ln, err, "a cylinder's length must be above 0 and at most 100 m");
        } else if (ln) {
            return sr_yaml_fail(y, ln, err, "only a cylinder body takes a length");
        }
        sr_bluff_curve_id id = sr_bluff_default_curve(sec->shape);
        if (cn) {
            char name[64];
            if ((rc = sr_yaml_string(y, cn, name, sizeof name, err)))
                return rc;
            if (sr_bluff_curve_lookup(name, &id, &e))
                return sr_yaml_fail(y, cn, err, "%s", e.msg);
        }
        if (sr_bluff_curve_init(&sec->curve, id, &e))
            return sr_yaml_fail(y, cn ? cn : shn, err, "%s", e.msg);
    } else {
        if (cn)
            return sr_yaml_fail(y, cn, err, "curve: names a built-in curve for a shape:; with cd-table: the table "
                                            "is the curve");
        if (ln)
            return sr_yaml_fail(y, ln, err, "length: goes with shape: cylinder; a drag table's body is described "
                                            "by its table, area and diameter");
        sr_bluff_interp kind = SR_BLUFF_LOGLOG;
        if (in) {
            char v[16];
            if ((rc = sr_yaml_string(y, in, v, sizeof v, err)))
                return rc;
            if (strcmp(v, "steffen") == 0)
                kind = SR_BLUFF_STEFFEN;
            else if (strcmp(v, "loglog") != 0)
                return sr_yaml_fail(y, in, err, "interpolation must be loglog (straight lines in log Re, log Cd) or "
                                                "steffen (monotone cubic), not '%s'",
                                    v);
        }
        if (an) {
            if ((rc = sr_yaml_quantity(y, an, SR_Q_AREA, &area, err)))
                return rc;
            if (!(area > 0.0 && area <= 1000.0))
                return sr_yaml_fail(y, an, err, "a body's reference area must be above 0 and at most 1000 m2");
        }
        char file[400], path[1024];
        if ((rc = sr_yaml_string(y, tn, file, sizeof file, err)))
            return rc;
        sr_yaml_relative_path(path, sizeof path, m->path, file);
        if (sr_dragtable_load(&sec->curve, path, kind, &e))
            return sr_yaml_fail(y, tn, err, "%s", e.msg);
        if (!an && !(sec->curve.table_area > 0.0))
            return sr_yaml_fail(y, n, err, "give area: (the reference area of the table's Cd values); %s states "
                                           "none",
                                file);
        sec->shape = SR_BLUFF_TABLE;
    }
    sr_bluff_body b;
    if (sr_bluff_body_init(&b, sec->shape, &sec->curve, d, len, sec->mass, area, &e))
        return sr_yaml_fail(y, n, err, "%s", e.msg);
    yaml_node_t *sn = sr_yaml_get(y, n, "stable-end-on");
    if (sn) {
        if ((rc = sr_yaml_bool(y, sn, &sec->stable_end_on, err)))
            return rc;
        if (sec->stable_end_on && sec->shape != SR_BLUFF_CYLINDER)
            return sr_yaml_fail(y, sn, err, "stable-end-on: applies to a cylinder (a section with fins or a "
                                            "weighted nose); a %s has no end to fall on",
                                sec->shape == SR_BLUFF_TABLE ? "drag table's body" : "sphere or disk");
    }
    sec->has_body = 1;
    sec->body_d = d;
    sec->body_length = len;
    sec->body_area = b.area;
    snprintf(sec->body_area_ref, sizeof sec->body_area_ref, "%s", b.area_ref);
    return SR_OK;
}

/* A section's mass: one value, or a band {low:, typical:, high:} (typical: the midpoint). */
static int parse_mass(sr_yaml *y, yaml_node_t *mn, sr_section *sec, sr_error *err)
{
    int rc;
    if (mn->type == YAML_MAPPING_NODE) {
        /* a band: mass: {low: 3.3 kg, typical: 3.4 kg, high: 3.6 kg} (typical: the midpoint) */
        if ((rc = sr_yaml_check_map(y, mn, "mass", MASS_KEYS, MASS_REQ, err)))
            return rc;
        const char *names[3] = {"low", "typical", "high"};
        double v[3] = {NAN, NAN, NAN};
        for (int k = 0; k < 3; k++) {
            yaml_node_t *vn = sr_yaml_get(y, mn, names[k]);
            if (!vn)
                continue;
            if ((rc = sr_yaml_quantity(y, vn, SR_Q_MASS, &v[k], err)))
                return rc;
            if (!(v[k] > 0.0 && v[k] <= 10000.0))
                return sr_yaml_fail(y, vn, err, "section mass must be above 0 and at most 10000 kg");
        }
        if (isnan(v[1]))
            v[1] = 0.5 * (v[0] + v[2]);
        if (!(v[0] <= v[1] && v[1] <= v[2]))
            return sr_yaml_fail(y, mn, err, "mass: low <= typical <= high does not hold");
        sec->mass_lo = v[0];
        sec->mass = v[1];
        sec->mass_hi = v[2];
    } else {
        if ((rc = sr_yaml_quantity(y, mn, SR_Q_MASS, &sec->mass, err)))
            return rc;
        if (!(sec->mass > 0.0 && sec->mass <= 10000.0))
            return sr_yaml_fail(y, mn, err, "section mass must be above 0 and at most 10000 kg");
        sec->mass_lo = sec->mass_hi = sec->mass;
    }
    return SR_OK;
}

static int parse_sections(sr_mission *m, sr_yaml *y, yaml_node_t *secs, sr_error *err)
{
    int rc, acc = SR_OK;
    if ((rc = sr_yaml_require_seq(y, secs, "sections", 1, SR_MISSION_MAX_SECTIONS, err)))
        return rc;
    m->nsections = sr_yaml_seq_len(secs);
    for (size_t i = 0; i < m->nsections; i++) {
        yaml_node_t *s = sr_yaml_seq_at(y, secs, i);
        sr_section *sec = &m->sections[i];
        sec->rigid_with = -1;
        if (!s || s->type != YAML_MAPPING_NODE) {
            SR_YAML_STEP(sr_yaml_check_map(y, s, "a section", SECTION_KEYS, SECTION_REQ, err));
            continue;
        }
        /* each part of each section on its own: check names every problem */
        SR_YAML_STEP(sr_yaml_check_map(y, s, "a section", SECTION_KEYS, SECTION_REQ, err));
        yaml_node_t *nm = sr_yaml_get(y, s, "name");
        if (nm) {
            SR_YAML_STEP(rc = sr_yaml_string(y, nm, sec->name, sizeof sec->name, err));
            for (size_t j = 0; j < i && !rc; j++)
                if (strcmp(m->sections[j].name, sec->name) == 0)
                    SR_YAML_STEP(rc = sr_yaml_fail(y, s, err, "two sections are named '%s'", sec->name));
        }
        yaml_node_t *mn = sr_yaml_get(y, s, "mass");
        if (mn)
            SR_YAML_STEP(parse_mass(y, mn, sec, err));
        yaml_node_t *an = sr_yaml_get(y, s, "drag-area");
        if (an) {
            SR_YAML_STEP(rc = sr_yaml_quantity(y, an, SR_Q_AREA, &sec->drag_area, err));
            if (!rc && !(sec->drag_area >= 0.0 && sec->drag_area <= 100.0))
                SR_YAML_STEP(sr_yaml_fail(y, an, err, "a section's drag area must be between 0 and 100 m2"));
        }
        yaml_node_t *bn = sr_yaml_get(y, s, "body");
        if (bn) {
            if (an)
                SR_YAML_STEP(sr_yaml_fail(y, sr_yaml_key_node(y, s, "body"), err,
                                          "section '%s': give either drag-area: (a constant drag area) or body: "
                                          "(drag that depends on the Reynolds number), not both",
                                          sec->name));
            else
                SR_YAML_STEP(parse_body(m, y, bn, sec, err));
        }
    }
    /* rigid-with names a section: all names are known now */
    for (size_t i = 0; i < m->nsections; i++) {
        yaml_node_t *s = sr_yaml_seq_at(y, secs, i), *rn = sr_yaml_get(y, s, "rigid-with");
        if (!rn)
            continue;
        char name[SR_NAME_MAX];
        SR_YAML_STEP(rc = sr_yaml_string(y, rn, name, sizeof name, err));
        if (rc)
            continue;
        for (size_t j = 0; j < m->nsections; j++)
            if (j != i && strcmp(m->sections[j].name, name) == 0)
                m->sections[i].rigid_with = (int)j;
        if (m->sections[i].rigid_with < 0)
            SR_YAML_STEP(sr_yaml_fail(y, rn, err, "rigid-with must name another section, and '%s' is not one", name));
    }
    return acc;
}

/* Walk the stages in file order as the sections come apart and check that
 * each stage hangs on sections that are still together, that heights fall
 * along every line of sections, and that rigid pairs land together. */
static int check_structure(sr_mission *m, sr_yaml *y, yaml_node_t *stages, yaml_node_t *secs, sr_error *err)
{
    sr_section_set bodies[SR_MISSION_MAX_SECTIONS];
    size_t nb = 1;
    bodies[0] = (sr_section_set)((1u << m->nsections) - 1u);
    for (size_t i = 0; i < m->nstages; i++) {
        const sr_stage *s = &m->stages[i];
        yaml_node_t *sn = sr_yaml_seq_at(y, stages, i);
        yaml_node_t *cn = sr_yaml_get(y, sn, "carries");
        if (s->deploy == SR_DEPLOY_APOGEE)
            for (size_t j = 0; j < i; j++)
                if (m->stages[j].deploy != SR_DEPLOY_APOGEE)
                    return sr_yaml_fail(y, sr_yaml_get(y, sn, "deploy"), err,
                                        "stage '%s' deploys at apogee after stage '%s', which does not: list the "
                                        "apogee stages first",
                                        s->name, m->stages[j].name);
        size_t b = nb;
        for (size_t k = 0; k < nb; k++)
            if ((s->carries & bodies[k]) == s->carries)
                b = k;
        if (b == nb) {
            char names[256];
            sr_mission_set_name(m, s->carries, names, sizeof names);
            return sr_yaml_fail(y, cn ? cn : sn, err,
                                "stage '%s' carries %s, but those sections have already come apart under earlier "
                                "stages",
                                s->name, names);
        }
        if (bodies[b] != s->carries) {
            bodies[b] &= ~s->carries;
            bodies[nb++] = s->carries;
        }
        if (s->deploy != SR_DEPLOY_ALTITUDE)
            continue;
        for (size_t j = 0; j < i; j++) {
            const sr_stage *p = &m->stages[j];
            if (p->deploy == SR_DEPLOY_ALTITUDE && (p->carries & s->carries) && !(s->deploy_value < p->deploy_value))
                return sr_yaml_fail(y, sr_yaml_get(y, sr_yaml_get(y, sn, "deploy"), "height"), err,
                                    "stage '%s' deploys at %.0f m, not below the earlier stage '%s' (%.0f m) on the "
                                    "same sections: deployments must go in falling order",
                                    s->name, s->deploy_value, p->name, p->deploy_value);
        }
    }
    for (size_t i = 0; i < m->nsections; i++) {
        int j = m->sections[i].rigid_with;
        if (j < 0)
            continue;
        for (size_t k = 0; k < nb; k++)
            if (((bodies[k] >> i) & 1u) != ((bodies[k] >> j) & 1u))
                return sr_yaml_fail(y, sr_yaml_get(y, sr_yaml_seq_at(y, secs, i), "rigid-with"), err,
                                    "section '%s' is rigid with '%s', but the stages let them land apart",
                                    m->sections[i].name, m->sections[j].name);
    }
    return SR_OK;
}

static int parse_start(sr_mission *m, sr_yaml *y, yaml_node_t *start, yaml_node_t *stages, sr_error *err)
{
    int rc;
    if ((rc = sr_yaml_check_map(y, start, "start", START_KEYS, START_REQ, err)))
        return rc;
    snprintf(m->start_at, sizeof m->start_at, "%s:%zu:%zu", y->name, start->start_mark.line + 1,
             start->start_mark.column + 1);
    yaml_node_t *hn = sr_yaml_get(y, start, "height");
    if ((rc = sr_yaml_quantity(y, hn, SR_Q_LENGTH, &m->start_height, err)))
        return rc;
    if (!(m->start_height > 0.0 && m->ground + m->start_height <= SR_ATMOS_Z_MAX))
        return sr_yaml_fail(y, hn, err, "start height must be above ground and within the atmosphere model");
    double lo, hi;
    sr_atmos_range(&m->atmos, &lo, &hi);
    if (m->ground + m->start_height > hi)
        return sr_yaml_fail(y, hn, err, "the start at %.0f m above ground (%.0f m above sea level) is above the top of "
                                        "the sounding (%.0f m); it is never extrapolated",
                            m->start_height, m->ground + m->start_height, hi);
    double top = sr_wind_top(&m->wind);
    if (m->start_height > top)
        return sr_yaml_fail(y, hn, err, "the start at %.0f m above ground is above the top of the wind table (%.0f m "
                                        "above ground); extend the table",
                            m->start_height, top);
    yaml_node_t *vn = sr_yaml_get(y, start, "speed"), *an = sr_yaml_get(y, start, "path-angle"),
                *dn = sr_yaml_get(y, start, "heading"), *en = sr_yaml_get(y, start, "east"),
                *nn = sr_yaml_get(y, start, "north");
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
    if (dn) {
        if ((rc = sr_yaml_quantity(y, dn, SR_Q_ANGLE, &m->start_heading, err)))
            return rc;
        if (!(m->start_heading >= -2 * PI && m->start_heading <= 2 * PI))
            return sr_yaml_fail(y, dn, err, "heading must be within -360 deg .. 360 deg");
        m->start_heading = fmod(m->start_heading + 2 * PI, 2 * PI);
    }
    struct {
        yaml_node_t *n;
        double *dst;
    } P[] = {{en, &m->start_east}, {nn, &m->start_north}};
    for (size_t i = 0; i < 2; i++) {
        if (!P[i].n)
            continue;
        if ((rc = sr_yaml_quantity(y, P[i].n, SR_Q_LENGTH, P[i].dst, err)))
            return rc;
        if (!(fabs(*P[i].dst) <= 100000.0))
            return sr_yaml_fail(y, P[i].n, err, "the start's offset from the launch point must be within 100 km");
    }
    m->has_start = 1;
    for (size_t i = 0; i < m->nstages; i++)
        if (m->stages[i].deploy == SR_DEPLOY_ALTITUDE && !(m->stages[i].deploy_value < m->start_height))
            return sr_yaml_fail(y, sr_yaml_get(y, sr_yaml_get(y, sr_yaml_seq_at(y, stages, i), "deploy"), "height"),
                                err, "stage '%s' deploys at %.0f m, not below the start at %.0f m above ground",
                                m->stages[i].name, m->stages[i].deploy_value, m->start_height);
    return SR_OK;
}

/* limits: landing-energy-basis, rated-strength with design-factor (first problem). */
static int parse_limit_strength(sr_mission *m, sr_yaml *y, yaml_node_t *lim, sr_error *err)
{
    int rc;
    yaml_node_t *bn = sr_yaml_get(y, lim, "landing-energy-basis");
    if (bn) {
        char v[32];
        if ((rc = sr_yaml_string(y, bn, v, sizeof v, err)))
            return rc;
        if (strcmp(v, "descent-rate") == 0)
            m->energy_ground = 0;
        else if (strcmp(v, "ground-relative") == 0)
            m->energy_ground = 1;
        else
            return sr_yaml_fail(y, bn, err, "landing-energy-basis must be descent-rate (the vertical speed, the "
                                            "default) or ground-relative (with the surface wind), not '%s'",
                                v);
    }
    /* rated-strength: 2 kN (every stage) or {drogue: 1 kN, main: 2.5 kN}, with design-factor: */
    yaml_node_t *rn = sr_yaml_get(y, lim, "rated-strength"), *fn = sr_yaml_get(y, lim, "design-factor");
    if (fn && !rn)
        return sr_yaml_fail(y, fn, err, "design-factor goes with rated-strength: (the strength the opening load is "
                                        "judged against)");
    if (!rn)
        return SR_OK;
    if (!fn)
        return sr_yaml_fail(y, sr_yaml_key_node(y, lim, "rated-strength"), err,
                            "rated-strength needs design-factor: beside it (the opening load may reach rated strength "
                            "/ factor; the factor is the rigger's and the applicable standard's call, so it is never "
                            "assumed)");
    if ((rc = sr_yaml_number(y, fn, &m->limit_design_factor, err)))
        return rc;
    if (!(m->limit_design_factor >= 1.0 && m->limit_design_factor <= 10.0))
        return sr_yaml_fail(y, fn, err, "design-factor must lie in 1 .. 10");
    if (rn->type == YAML_MAPPING_NODE) {
        const char *names[SR_MISSION_MAX_STAGES + 1];
        for (size_t k = 0; k < m->nstages; k++)
            names[k] = m->stages[k].name;
        names[m->nstages] = NULL;
        if ((rc = sr_yaml_check_map(y, rn, "rated-strength", names, NULL, err)))
            return rc;
        for (size_t k = 0; k < m->nstages; k++) {
            yaml_node_t *vn = sr_yaml_get(y, rn, m->stages[k].name);
            if (!vn)
                continue;
            if ((rc = sr_yaml_quantity(y, vn, SR_Q_FORCE, &m->limit_rated[k], err)))
                return rc;
            if (!(m->limit_rated[k] > 0.0 && m->limit_rated[k] <= 1e8))
                return sr_yaml_fail(y, vn, err, "a rated strength must lie above 0 and at most 100 MN");
        }
        return SR_OK;
    }
    double v;
    if ((rc = sr_yaml_quantity(y, rn, SR_Q_FORCE, &v, err)))
        return rc;
    if (!(v > 0.0 && v <= 1e8))
        return sr_yaml_fail(y, rn, err, "a rated strength must lie above 0 and at most 100 MN");
    for (size_t k = 0; k < m->nstages; k++)
        m->limit_rated[k] = v;
    return SR_OK;
}

static int parse_limits(sr_mission *m, sr_yaml *y, yaml_node_t *lim, sr_error *err)
{
    int rc, acc = SR_OK;
    if (!lim || lim->type != YAML_MAPPING_NODE)
        return sr_yaml_check_map(y, lim, "limits", LIMIT_KEYS, NULL, err);
    SR_YAML_STEP(sr_yaml_check_map(y, lim, "limits", LIMIT_KEYS, NULL, err));
    struct {
        const char *key;
        sr_quantity q;
        double *dst;
    } L[] = {{"touchdown-speed", SR_Q_SPEED, &m->limit_speed},
             {"landing-energy", SR_Q_ENERGY, &m->limit_energy},
             {"descent-time", SR_Q_TIME, &m->limit_time},
             {"drift", SR_Q_LENGTH, &m->limit_drift},
             {"deployment-pressure", SR_Q_PRESSURE, &m->limit_deploy_q}};
    for (size_t i = 0; i < sizeof L / sizeof L[0]; i++) {
        yaml_node_t *n = sr_yaml_get(y, lim, L[i].key);
        if (!n)
            continue;
        SR_YAML_STEP(rc = sr_yaml_quantity(y, n, L[i].q, L[i].dst, err));
        if (!rc && !(*L[i].dst > 0.0))
            SR_YAML_STEP(sr_yaml_fail(y, n, err, "limit %s must be positive", L[i].key));
    }
    SR_YAML_STEP(parse_limit_strength(m, y, lim, err));
    return acc;
}

/* Stage names, one or a list: fails: main, only: [drogue]. */
static int parse_stage_set(const sr_mission *m, sr_yaml *y, yaml_node_t *n, const char *key, unsigned *out,
                           sr_error *err)
{
    const char *names[SR_MISSION_MAX_STAGES + 1];
    for (size_t k = 0; k < m->nstages; k++)
        names[k] = m->stages[k].name;
    names[m->nstages] = NULL;
    size_t count = n && n->type == YAML_SEQUENCE_NODE ? sr_yaml_seq_len(n) : 1;
    int rc;
    if (n && n->type == YAML_SEQUENCE_NODE && (rc = sr_yaml_require_seq(y, n, key, 1, m->nstages, err)))
        return rc;
    *out = 0;
    for (size_t i = 0; i < count; i++) {
        yaml_node_t *e = n->type == YAML_SEQUENCE_NODE ? sr_yaml_seq_at(y, n, i) : n;
        char name[SR_NAME_MAX];
        if ((rc = sr_yaml_string(y, e, name, sizeof name, err)))
            return rc;
        size_t k = 0;
        while (k < m->nstages && strcmp(names[k], name) != 0)
            k++;
        if (k == m->nstages) {
            const char *sg = sr_yaml_suggest(name, names);
            if (sg)
                return sr_yaml_fail(y, e, err, "no stage is named '%s'; did you mean '%s'?", name, sg);
            return sr_yaml_fail(y, e, err, "no stage is named '%s'", name);
        }
        if (*out & (1u << k))
            return sr_yaml_fail(y, e, err, "stage '%s' is listed twice", name);
        *out |= 1u << k;
    }
    return SR_OK;
}

static void stage_list(const sr_mission *m, unsigned set, char *buf, size_t len)
{
    buf[0] = '\0';
    size_t used = 0;
    for (size_t k = 0; k < m->nstages; k++) {
        if (!((set >> k) & 1u))
            continue;
        int w = snprintf(buf + used, len - used, "%s%s", used ? " + " : "", m->stages[k].name);
        if (w < 0 || (size_t)w >= len - used)
            break;
        used += (size_t)w;
    }
}

/* failure-cases: [no-canopy, {only: drogue}, {fails: [main]}, {name: "...", fails: ...}] */
static int parse_failures(sr_mission *m, sr_yaml *y, yaml_node_t *list, sr_error *err)
{
    int rc;
    if ((rc = sr_yaml_require_seq(y, list, "failure-cases", 1, SR_MISSION_MAX_FAILURES, err)))
        return rc;
    unsigned all = (1u << m->nstages) - 1u;
    m->nfailures = sr_yaml_seq_len(list);
    for (size_t i = 0; i < m->nfailures; i++) {
        yaml_node_t *n = sr_yaml_seq_at(y, list, i);
        sr_failure_case *f = &m->failures[i];
        char names[256];
        if (n && n->type == YAML_SCALAR_NODE) {
            const char *v = (const char *)n->data.scalar.value;
            if (strcmp(v, "no-canopy") != 0) {
                for (size_t k = 0; k < m->nstages; k++)
                    if (strcmp(v, m->stages[k].name) == 0)
                        return sr_yaml_fail(y, n, err, "a failure case is 'no-canopy' or a mapping: write "
                                                       "{fails: %s} (it does not open) or {only: %s} (only it opens)",
                                            v, v);
                return sr_yaml_fail(y, n, err, "a failure case is 'no-canopy' (no stage deploys) or a mapping with "
                                               "fails: or only: and stage names, not '%s'",
                                    v);
            }
            f->failed = all;
            snprintf(f->name, sizeof f->name, "no canopy");
        } else {
            if ((rc = sr_yaml_check_map(y, n, "a failure case", FAILURE_KEYS, NULL, err)))
                return rc;
            yaml_node_t *fn = sr_yaml_get(y, n, "fails"), *on = sr_yaml_get(y, n, "only"),
                        *nn = sr_yaml_get(y, n, "name");
            if ((fn && on) || (!fn && !on))
                return sr_yaml_fail(y, n, err, "a failure case takes exactly one of fails: (the stages that do not "
                                               "open) or only: (the stages that do)");
            unsigned set;
            if ((rc = parse_stage_set(m, y, fn ? fn : on, fn ? "fails" : "only", &set, err)))
                return rc;
            stage_list(m, set, names, sizeof names);
            if (fn) {
                f->failed = set;
                snprintf(f->name, sizeof f->name, "%s fail%s", names, strchr(names, '+') ? "" : "s");
            } else {
                f->failed = all & ~set;
                if (!f->failed)
                    return sr_yaml_fail(y, on, err, "only: lists every stage: that is the nominal descent, not a "
                                                    "failure case");
                snprintf(f->name, sizeof f->name, "%s only", names);
            }
            if (f->failed == all)
                snprintf(f->name, sizeof f->name, "no canopy");
            if (nn && (rc = sr_yaml_string(y, nn, f->name, sizeof f->name, err)))
                return rc;
        }
        for (size_t j = 0; j < i; j++)
            if (m->failures[j].failed == f->failed)
                return sr_yaml_fail(y, n, err, "this failure case repeats case %zu ('%s'): the same stages fail", j + 1,
                                    m->failures[j].name);
    }
    return SR_OK;
}

/* The uncertainty block, read against the stages, masses and start read before. */
static int parse_uncertainty(sr_mission *m, sr_yaml *y, yaml_node_t *n, sr_error *err)
{
    sr_unc_basis b;
    memset(&b, 0, sizeof b);
    b.nstages = m->nstages;
    for (size_t s = 0; s < m->nstages; s++) {
        const sr_stage *st = &m->stages[s];
        b.stage[s].name = st->name;
        b.stage[s].cds = st->canopy.cds;
        b.stage[s].cd = st->canopy.cd.v.typ;
        b.stage[s].deploy = st->deploy;
        b.stage[s].deploy_value = st->deploy_value;
    }
    b.total_mass = sr_mission_total_mass(m);
    b.has_start = m->has_start;
    b.start_height = m->start_height;
    b.ground = m->ground;
    b.atmos = &m->atmos;
    return sr_mission_uncertainty_parse(&m->unc, y, n, &b, err);
}

_Static_assert(SR_DESIGN_MAX_STAGES == SR_MISSION_MAX_STAGES, "one design slot per mission stage");

void sr_mission_design_basis(const sr_mission *m, sr_design_basis *b)
{
    memset(b, 0, sizeof *b);
    b->nstages = m->nstages;
    for (size_t k = 0; k < m->nstages && k < SR_DESIGN_MAX_STAGES; k++) {
        const sr_stage *st = &m->stages[k];
        b->stage[k] = (sr_design_basis_stage){.name = st->name,
                                              .deploy = st->deploy,
                                              .canopy_file = st->file[0] != '\0',
                                              .measured_load = st->canopy.opening == SR_OPENING_MEASURED_LOAD,
                                              .has_size = st->has_size};
    }
    b->has_start = m->has_start;
    b->start_height = m->start_height;
}

int sr_mission_parse(sr_mission *m, sr_yaml *y, const sr_catalog *cat, sr_error *err)
{
    int rc, acc = SR_OK;
    /* defaults of the keys this reader owns (callers may have zeroed the struct) */
    m->start_heading = NAN;
    m->limit_deploy_q = NAN;
    m->limit_design_factor = NAN;
    for (size_t k = 0; k < SR_MISSION_MAX_STAGES; k++)
        m->limit_rated[k] = NAN;
    yaml_node_t *root = sr_yaml_root(y);
    if (!root || root->type != YAML_MAPPING_NODE)
        return sr_yaml_check_map(y, root, "the mission file", TOP_KEYS, TOP_REQ, err);
    /* Block by block: without a list of problems the first one stops the
     * reader; with one (check) every block is read and every problem kept,
     * except what needs an earlier block that failed (the structure of the
     * stages needs good sections and stages). */
    SR_YAML_STEP(sr_yaml_check_map(y, root, "the mission file", TOP_KEYS, TOP_REQ, err));
    yaml_node_t *nm = sr_yaml_get(y, root, "mission");
    if (nm)
        SR_YAML_STEP(sr_yaml_string(y, nm, m->name, sizeof m->name, err));
    yaml_node_t *site = sr_yaml_get(y, root, "site");
    if (site)
        SR_YAML_STEP(parse_site(m, y, site, err));
    yaml_node_t *secs = sr_yaml_get(y, root, "sections");
    int secs_ok = 0, stages_ok = 0;
    if (secs) {
        SR_YAML_STEP(rc = parse_sections(m, y, secs, err));
        secs_ok = !rc;
    }
    yaml_node_t *stages = sr_yaml_get(y, root, "stages");
    if (stages) {
        SR_YAML_STEP(rc = sr_yaml_require_seq(y, stages, "stages", 1, SR_MISSION_MAX_STAGES, err));
        if (!rc && secs) {
            stages_ok = 1;
            m->nstages = sr_yaml_seq_len(stages);
            for (size_t i = 0; i < m->nstages; i++) {
                SR_YAML_STEP(rc = parse_stage(m, y, sr_yaml_seq_at(y, stages, i), cat, &m->stages[i], i, err));
                stages_ok = stages_ok && !rc;
                for (size_t j = 0; j < i && !rc; j++)
                    if (strcmp(m->stages[j].name, m->stages[i].name) == 0)
                        SR_YAML_STEP(rc = sr_yaml_fail(y, sr_yaml_seq_at(y, stages, i), err,
                                                       "two stages are named '%s'", m->stages[i].name));
            }
        }
    }
    if (secs_ok && stages_ok)
        SR_YAML_STEP(rc = check_structure(m, y, stages, secs, err));
    else
        stages_ok = 0;
    yaml_node_t *start = sr_yaml_get(y, root, "start");
    if (start && stages_ok)
        SR_YAML_STEP(parse_start(m, y, start, stages, err));
    yaml_node_t *lim = sr_yaml_get(y, root, "limits");
    if (lim)
        SR_YAML_STEP(parse_limits(m, y, lim, err));
    yaml_node_t *fc = sr_yaml_get(y, root, "failure-cases");
    if (fc && stages_ok)
        SR_YAML_STEP(parse_failures(m, y, fc, err));
    if (stages_ok || !acc)
        SR_YAML_STEP(parse_uncertainty(m, y, sr_yaml_get(y, root, "uncertainty"), err));
    if (stages_ok) {
        sr_design_basis db;
        sr_mission_design_basis(m, &db);
        SR_YAML_STEP(sr_mission_parse_design(&m->design, y, sr_yaml_get(y, root, "design"), &db, cat, err));
    }
    return acc;
}

static void mission_init(sr_mission *m, const char *path)
{
    memset(m, 0, sizeof *m);
    sr_atmos_init_standard(&m->atmos);
    sr_wind_init_calm(&m->wind);
    m->limit_speed = m->limit_energy = m->limit_time = m->limit_drift = m->limit_deploy_q = NAN;
    sr_design_spec_init(&m->design);
    snprintf(m->path, sizeof m->path, "%s", path);
}

int sr_mission_load_doc(sr_mission *m, const char *path, const sr_catalog *cat, sr_yaml *y, sr_error *err)
{
    mission_init(m, path);
    int rc = sr_yaml_load_file(y, path, err);
    if (rc)
        return rc;
    rc = sr_mission_parse(m, y, cat, err);
    if (rc) {
        sr_yaml_free(y);
        sr_mission_release(m);
    }
    return rc;
}

int sr_mission_load(sr_mission *m, const char *path, const sr_catalog *cat, sr_error *err)
{
    sr_yaml y;
    int rc = sr_mission_load_doc(m, path, cat, &y, err);
    if (!rc)
        sr_yaml_free(&y);
    return rc;
}

int sr_mission_load_text(sr_mission *m, const char *path, const char *text, size_t len, const sr_catalog *cat,
                         sr_error *err)
{
    mission_init(m, path);
    sr_yaml y;
    int rc = sr_yaml_load_string(&y, path, text, len, err);
    if (rc)
        return rc;
    rc = sr_mission_parse(m, &y, cat, err);
    sr_yaml_free(&y);
    if (rc)
        sr_mission_release(m);
    return rc;
}

void sr_mission_release(sr_mission *m)
{
    for (size_t i = 0; i < SR_MISSION_MAX_SECTIONS; i++)
        sr_bluff_curve_free(&m->sections[i].curve);
    sr_atmos_release(&m->atmos);
    sr_wind_release(&m->wind);
}

int sr_mission_has_limits(const sr_mission *m)
{
    int any = !isnan(m->limit_speed) || !isnan(m->limit_energy) || !isnan(m->limit_time) || !isnan(m->limit_drift) ||
              !isnan(m->limit_deploy_q);
    for (size_t k = 0; k < m->nstages; k++)
        any |= !isnan(m->limit_rated[k]);
    return any;
}

double sr_mission_total_mass(const sr_mission *m)
{
    double s = 0.0;
    for (size_t i = 0; i < m->nsections; i++)
        s += m->sections[i].mass;
    return s;
}

double sr_mission_mass_of(const sr_mission *m, sr_section_set set)
{
    double s = 0.0;
    for (size_t i = 0; i < m->nsections; i++)
        if ((set >> i) & 1u)
            s += m->sections[i].mass;
    return s;
}

void sr_mission_set_name(const sr_mission *m, sr_section_set set, char *buf, size_t len)
{
    buf[0] = '\0';
    size_t used = 0;
    for (size_t i = 0; i < m->nsections; i++) {
        if (!((set >> i) & 1u))
            continue;
        int w = snprintf(buf + used, len - used, "%s%s", used ? " + " : "", m->sections[i].name);
        if (w < 0 || (size_t)w >= len - used)
            break;
        used += (size_t)w;
    }
}
