/* mission_uncertainty.c - the mission file's `uncertainty:` block: what a
 * dispersion run varies, each with a distribution and a spread in units. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "files/mission_int.h"

#define PI 3.14159265358979323846
/* A relative normal spread above 30 % would put the scale's zero within
 * 3.3 sigma; spreads that wide are not a small uncertainty any more. */
#define MAX_REL_SIGMA 0.30
#define MAX_REL_HALF 0.90

static const char *const UNC_KEYS[] = {"drag",          "mass",           "wind-speed",       "wind-direction",
                                       "first-deployment", "deployment-height", "deployment-delay", NULL};
static const char *const DIST_KEYS[] = {"distribution", "sigma", "half-width", NULL};
static const char *const DIST_REQ[] = {"distribution", NULL};

/* How a spread may be written. */
typedef enum spread_mode {
    SPREAD_ABS,    /* a quantity: an offset in its unit */
    SPREAD_SCALE,  /* "5 %", or a quantity divided by the nominal: a relative deviation */
    SPREAD_EITHER  /* "5 %" relative, or a quantity as an offset (wind speed) */
} spread_mode;

typedef struct dist_ctx {
    const char *what;  /* "wind-speed", "drag of stage 'main'" */
    sr_quantity q;
    spread_mode mode;
    double nominal;    /* SPREAD_SCALE: the nominal value a quantity is divided by */
    double max_abs;    /* largest offset spread (same unit as q, SI), or 0 for no bound */
    const char *max_why;
    double max_up;     /* largest upward reach (6 sigma, or the half-width), or 0 for no bound */
    const char *up_why;
    sr_band family;    /* drag only: the canopy's drag-area band; family.typ > 0 */
    int is_drag;
} dist_ctx;

static const char *scalar(yaml_node_t *n)
{
    return n && n->type == YAML_SCALAR_NODE ? (const char *)n->data.scalar.value : NULL;
}

/* Read a spread value: *rel = 1 when written in % (value as a fraction). */
static int read_spread(sr_yaml *y, yaml_node_t *n, const char *key, const dist_ctx *c, double *v, int *rel,
                       sr_error *err)
{
    const char *s = scalar(n);
    if (!s)
        return sr_yaml_fail(y, n, err, "uncertainty %s: %s must be a value like \"%s\"", c->what, key,
                            c->mode == SPREAD_ABS ? "1.5 m" : "5 %");
    size_t len = strlen(s);
    while (len > 0 && (s[len - 1] == ' ' || s[len - 1] == '\t'))
        len--;
    sr_error e;
    if (len > 0 && s[len - 1] == '%') {
        if (c->mode == SPREAD_ABS)
            return sr_yaml_fail(y, n, err, "uncertainty %s: %s takes a %s (e.g. \"%s\"), not a percentage", c->what,
                                key, sr_units_quantity_name(c->q), c->q == SR_Q_ANGLE ? "10 deg" : "20 m");
        char buf[64];
        if (len - 1 >= sizeof buf)
            return sr_yaml_fail(y, n, err, "uncertainty %s: %s is too long for a number", c->what, key);
        memcpy(buf, s, len - 1);
        buf[len - 1] = '\0';
        if (sr_units_parse(buf, SR_Q_NONE, v, &e) != SR_OK)
            return sr_yaml_fail(y, n, err, "uncertainty %s: %s: %s", c->what, key, e.msg);
        *v /= 100.0;
        *rel = 1;
    } else {
        int rc = c->q == SR_Q_NONE ? sr_units_parse(s, SR_Q_NONE, v, &e) : sr_units_parse_strict(s, c->q, v, &e);
        if (rc != SR_OK) {
            if (c->q == SR_Q_NONE)
                return sr_yaml_fail(y, n, err, "uncertainty %s: %s: %s (give a drag coefficient or a %%)", c->what,
                                    key, e.msg);
            return sr_yaml_fail(y, n, err, "uncertainty %s: %s: %s%s", c->what, key, e.msg,
                                c->mode == SPREAD_ABS ? "" : " (or give it in %)");
        }
        *rel = 0;
    }
    if (!(*v >= 0.0))
        return sr_yaml_fail(y, n, err, "uncertainty %s: %s must not be negative (got '%s')", c->what, key, s);
    return SR_OK;
}

static int parse_dist(sr_yaml *y, yaml_node_t *n, const dist_ctx *c, sr_dist *d, int *family, sr_error *err)
{
    memset(d, 0, sizeof *d);
    if (family)
        *family = 0;
    sr_dist_kind kind;
    const char *s = scalar(n);
    yaml_node_t *kn = n, *sig = NULL, *half = NULL;
    if (s) {
        /* short forms: `fixed`, and for drag `uniform` / `triangular` over the family's range */
        if (sr_dist_parse_name(s, &kind) != SR_OK) {
            const char *sg = sr_yaml_suggest(s, (const char *const[]){"fixed", "uniform", "normal", "triangular", NULL});
            return sr_yaml_fail(y, n, err,
                                "uncertainty %s: unknown distribution '%s'%s%s%s (use fixed, uniform, normal or "
                                "triangular)",
                                c->what, s, sg ? "; did you mean '" : "", sg ? sg : "", sg ? "'?" : "");
        }
        if (kind == SR_DIST_NORMAL || (kind != SR_DIST_FIXED && !c->is_drag))
            return sr_yaml_fail(y, n, err,
                                "uncertainty %s: '%s' needs a spread: write {distribution: %s, %s: ...}", c->what, s,
                                s, kind == SR_DIST_NORMAL ? "sigma" : "half-width");
    } else {
        int rc;
        char what[128];
        snprintf(what, sizeof what, "uncertainty %s", c->what);
        if ((rc = sr_yaml_check_map(y, n, what, DIST_KEYS, DIST_REQ, err)))
            return rc;
        kn = sr_yaml_get(y, n, "distribution");
        const char *ks = scalar(kn);
        if (!ks)
            return sr_yaml_fail(y, kn, err, "uncertainty %s: distribution must be a word", c->what);
        if (sr_dist_parse_name(ks, &kind) != SR_OK) {
            const char *sg = sr_yaml_suggest(ks, (const char *const[]){"fixed", "uniform", "normal", "triangular", NULL});
            return sr_yaml_fail(y, kn, err,
                                "uncertainty %s: unknown distribution '%s'%s%s%s (use fixed, uniform, normal or "
                                "triangular)",
                                c->what, ks, sg ? "; did you mean '" : "", sg ? sg : "", sg ? "'?" : "");
        }
        sig = sr_yaml_get(y, n, "sigma");
        half = sr_yaml_get(y, n, "half-width");
        if (kind == SR_DIST_FIXED && (sig || half))
            return sr_yaml_fail(y, sig ? sig : half, err, "uncertainty %s: a fixed value takes no spread", c->what);
        if (kind == SR_DIST_NORMAL) {
            if (half)
                return sr_yaml_fail(y, half, err,
                                    "uncertainty %s: a normal distribution takes sigma:, not half-width:", c->what);
            if (!sig)
                return sr_yaml_fail(y, n, err, "uncertainty %s: a normal distribution needs sigma:", c->what);
        }
        if (kind == SR_DIST_UNIFORM || kind == SR_DIST_TRIANGULAR) {
            if (sig)
                return sr_yaml_fail(y, sig, err, "uncertainty %s: a %s distribution takes half-width:, not sigma:",
                                    c->what, sr_dist_name(kind));
            if (!half && !c->is_drag)
                return sr_yaml_fail(y, n, err, "uncertainty %s: a %s distribution needs half-width:", c->what,
                                    sr_dist_name(kind));
        }
    }
    d->kind = kind;
    if (kind == SR_DIST_FIXED)
        return SR_OK;
    if (c->is_drag && !sig && !half) {
        /* the canopy's drag-area band: the family's CD0 range (and the
         * diameter-ratio range when the size was not a nominal one) */
        d->lo = c->family.lo / c->family.typ - 1.0;
        d->hi = c->family.hi / c->family.typ - 1.0;
        d->relative = 1;
        if (family)
            *family = 1;
        if (!(d->hi > d->lo))
            d->kind = SR_DIST_FIXED; /* a measured coefficient has no range */
        return SR_OK;
    }
    yaml_node_t *vn = sig ? sig : half;
    const char *key = sig ? "sigma" : "half-width";
    double v;
    int rel = 0, rc;
    if ((rc = read_spread(y, vn, key, c, &v, &rel, err)))
        return rc;
    if (c->mode == SPREAD_SCALE && !rel) {
        v /= c->nominal;
        rel = 1;
    }
    d->relative = rel;
    if (rel) {
        double cap = sig ? MAX_REL_SIGMA : MAX_REL_HALF;
        if (v > cap)
            return sr_yaml_fail(y, vn, err,
                                "uncertainty %s: %s is %.3g %% of the nominal value; at most %.0f %% is accepted "
                                "(the value must stay positive)",
                                c->what, key, 100.0 * v, 100.0 * cap);
    } else {
        double reach = sig ? 3.0 * v : v;
        if (c->max_abs > 0.0 && !(reach < c->max_abs))
            return sr_yaml_fail(y, vn, err, "uncertainty %s: %s%s reaches %s", c->what, sig ? "three times " : "",
                                key, c->max_why);
        /* upward, every draw a run can make must have air to fall through: six sigma (a
         * 1e-9 tail) or the half-width, as the dispersion's height tables are built */
        double up = sig ? 6.0 * v : v;
        if (c->max_up > 0.0 && !(up <= c->max_up))
            return sr_yaml_fail(y, vn, err, "uncertainty %s: %s%s reaches %s", c->what, sig ? "six times " : "", key,
                                c->up_why);
    }
    if (sig)
        d->sigma = v;
    else
        d->lo = -v, d->hi = v;
    return SR_OK;
}

static int stage_index(const sr_unc_basis *m, const char *name)
{
    for (size_t s = 0; s < m->nstages; s++)
        if (strcmp(m->stage[s].name, name) == 0)
            return (int)s;
    return -1;
}

static int parse_drag(sr_uncertainty *u, const sr_unc_basis *m, sr_yaml *y, yaml_node_t *n, sr_error *err)
{
    dist_ctx c = {.q = SR_Q_NONE, .mode = SPREAD_SCALE, .is_drag = 1};
    char what[SR_DESCENT_NAME_MAX + 32];
    int rc;
    if (n && n->type == YAML_MAPPING_NODE && !sr_yaml_get(y, n, "distribution")) {
        /* one entry per stage, by name */
        const char *names[SR_DESCENT_MAX_STAGES + 1];
        for (size_t s = 0; s < m->nstages; s++)
            names[s] = m->stage[s].name;
        names[m->nstages] = NULL;
        if ((rc = sr_yaml_check_map(y, n, "uncertainty drag (stage names)", names, NULL, err)))
            return rc;
        for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
            yaml_node_t *k = yaml_document_get_node(&y->doc, p->key);
            yaml_node_t *v = yaml_document_get_node(&y->doc, p->value);
            int s = stage_index(m, scalar(k));
            snprintf(what, sizeof what, "drag of stage '%s'", m->stage[s].name);
            c.what = what;
            c.family = m->stage[s].cds;
            c.nominal = m->stage[s].cd;
            if ((rc = parse_dist(y, v, &c, &u->drag[s], &u->drag_family[s], err)))
                return rc;
        }
        return SR_OK;
    }
    /* one distribution for every stage */
    for (size_t s = 0; s < m->nstages; s++) {
        snprintf(what, sizeof what, "drag");
        c.what = what;
        c.family = m->stage[s].cds;
        c.nominal = m->stage[s].cd;
        if ((rc = parse_dist(y, n, &c, &u->drag[s], &u->drag_family[s], err)))
            return rc;
    }
    return SR_OK;
}

static void set_default_drag(sr_uncertainty *u, const sr_unc_basis *m)
{
    for (size_t s = 0; s < m->nstages; s++) {
        const sr_band *b = &m->stage[s].cds;
        sr_dist *d = &u->drag[s];
        memset(d, 0, sizeof *d);
        u->drag_family[s] = 1;
        if (b->typ > 0.0 && b->hi > b->lo) {
            d->kind = SR_DIST_UNIFORM;
            d->lo = b->lo / b->typ - 1.0;
            d->hi = b->hi / b->typ - 1.0;
            d->relative = 1;
        }
    }
}

int sr_mission_uncertainty_parse(sr_uncertainty *u, sr_yaml *y, yaml_node_t *n, const sr_unc_basis *m,
                                 sr_error *err)
{
    memset(u, 0, sizeof *u);
    u->nstages = m->nstages;
    double lowest_height = INFINITY;
    for (size_t s = 0; s < m->nstages; s++) {
        if (m->stage[s].deploy == SR_DEPLOY_ALTITUDE) {
            u->height_stages |= 1u << s;
            if (m->stage[s].deploy_value < lowest_height)
                lowest_height = m->stage[s].deploy_value;
        }
        if (m->stage[s].deploy == SR_DEPLOY_DELAY)
            u->delay_stages |= 1u << s;
    }
    set_default_drag(u, m);
    if (!n)
        return SR_OK;
    int acc = SR_OK; /* each distribution on its own: check names every problem */
    if (n->type != YAML_MAPPING_NODE)
        return sr_yaml_check_map(y, n, "uncertainty", UNC_KEYS, NULL, err);
    SR_YAML_STEP(sr_yaml_check_map(y, n, "uncertainty", UNC_KEYS, NULL, err));
    u->given = 1;
    yaml_node_t *v;
    if ((v = sr_yaml_get(y, n, "drag")))
        SR_YAML_STEP(parse_drag(u, m, y, v, err));
    if ((v = sr_yaml_get(y, n, "mass"))) {
        dist_ctx c = {.what = "mass", .q = SR_Q_MASS, .mode = SPREAD_SCALE, .nominal = m->total_mass};
        SR_YAML_STEP(parse_dist(y, v, &c, &u->mass, NULL, err));
    }
    if ((v = sr_yaml_get(y, n, "wind-speed"))) {
        dist_ctx c = {.what = "wind-speed", .q = SR_Q_SPEED, .mode = SPREAD_EITHER};
        SR_YAML_STEP(parse_dist(y, v, &c, &u->wind_speed, NULL, err));
    }
    if ((v = sr_yaml_get(y, n, "wind-direction"))) {
        dist_ctx c = {.what = "wind-direction", .q = SR_Q_ANGLE, .mode = SPREAD_ABS, .max_abs = PI + 1e-9,
                      .max_why = "beyond 180 deg"};
        SR_YAML_STEP(parse_dist(y, v, &c, &u->wind_dir, NULL, err));
    }
    char why[160];
    if ((v = sr_yaml_get(y, n, "first-deployment"))) {
        dist_ctx c = {.what = "first-deployment", .q = SR_Q_LENGTH, .mode = SPREAD_ABS};
        char up_why[200];
        if (m->has_start) {
            snprintf(why, sizeof why, "the ground from the first deployment at %.0f m", m->start_height);
            c.max_abs = m->start_height;
            c.max_why = why;
            double lo, hi;
            sr_atmos_range(m->atmos, &lo, &hi);
            snprintf(up_why, sizeof up_why,
                     "above the top of the atmosphere model (%.0f m above sea level) from the first deployment at "
                     "%.0f m above sea level",
                     hi, m->ground + m->start_height);
            c.max_up = hi - m->ground - m->start_height;
            c.up_why = up_why;
            if (!(c.max_up > 0.0))
                c.max_up = 1e-9; /* a start at the very top leaves no room at all */
        }
        SR_YAML_STEP(parse_dist(y, v, &c, &u->start_height, NULL, err));
    }
    if ((v = sr_yaml_get(y, n, "deployment-height"))) {
        if (!u->height_stages)
            SR_YAML_STEP(sr_yaml_fail(y, v, err,
                                      "uncertainty deployment-height: no stage deploys at a height, so there is "
                                      "nothing to vary"));
        else {
            snprintf(why, sizeof why, "the ground from the lowest deployment at %.0f m", lowest_height);
            dist_ctx c = {.what = "deployment-height", .q = SR_Q_LENGTH, .mode = SPREAD_ABS,
                          .max_abs = lowest_height, .max_why = why};
            SR_YAML_STEP(parse_dist(y, v, &c, &u->deploy_height, NULL, err));
        }
    }
    if ((v = sr_yaml_get(y, n, "deployment-delay"))) {
        dist_ctx c = {.what = "deployment-delay", .q = SR_Q_TIME, .mode = SPREAD_ABS};
        if (!u->delay_stages)
            SR_YAML_STEP(sr_yaml_fail(y, v, err,
                                      "uncertainty deployment-delay: no stage deploys after a delay, so there is "
                                      "nothing to vary"));
        else
            SR_YAML_STEP(parse_dist(y, v, &c, &u->deploy_delay, NULL, err));
    }
    return acc;
}
