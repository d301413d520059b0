/* uncertainty.c - distributions of deviations and one sample's draw. */
#include "physics/uncertainty.h"

#include <gsl/gsl_randist.h>
#include <math.h>
#include <string.h>

#include "base/rng.h"

/* Stream slots: one per variable (and per stage), so changing one spread
 * leaves every other variable's draws untouched. */
enum {
    SLOT_DRAG = 0,
    SLOT_MASS = SLOT_DRAG + SR_UNC_MAX_STAGES,
    SLOT_WIND_SPEED,
    SLOT_WIND_DIR,
    SLOT_START_HEIGHT,
    SLOT_DEPLOY_HEIGHT,
    SLOT_DEPLOY_DELAY = SLOT_DEPLOY_HEIGHT + SR_UNC_MAX_STAGES
};

static const char *const DIST_NAMES[] = {"fixed", "uniform", "normal", "triangular"};

const char *sr_dist_name(sr_dist_kind k)
{
    return (unsigned)k < sizeof DIST_NAMES / sizeof DIST_NAMES[0] ? DIST_NAMES[k] : "?";
}

int sr_dist_parse_name(const char *s, sr_dist_kind *k)
{
    for (size_t i = 0; i < sizeof DIST_NAMES / sizeof DIST_NAMES[0]; i++)
        if (strcmp(s, DIST_NAMES[i]) == 0) {
            *k = (sr_dist_kind)i;
            return SR_OK;
        }
    return SR_EINVAL;
}

double sr_dist_sd(const sr_dist *d)
{
    double a = d->lo, b = d->hi;
    switch (d->kind) {
    case SR_DIST_NORMAL:
        return d->sigma;
    case SR_DIST_UNIFORM:
        return (b - a) / sqrt(12.0);
    case SR_DIST_TRIANGULAR:
        /* variance (a^2 + b^2 + c^2 - ab - ac - bc)/18 with mode c = 0 */
        return sqrt((a * a + b * b - a * b) / 18.0);
    default:
        return 0.0;
    }
}

double sr_dist_draw(const sr_dist *d, gsl_rng *r)
{
    double a = d->lo, b = d->hi, u;
    switch (d->kind) {
    case SR_DIST_NORMAL:
        return gsl_ran_gaussian_ziggurat(r, d->sigma);
    case SR_DIST_UNIFORM:
        return a + (b - a) * gsl_rng_uniform(r);
    case SR_DIST_TRIANGULAR:
        /* inverse CDF with mode 0; GSL has no triangular distribution */
        if (!(b > a))
            return 0.0;
        u = gsl_rng_uniform(r);
        if (u * (b - a) < -a)
            return a + sqrt(u * (b - a) * (-a));
        return b - sqrt((1.0 - u) * (b - a) * b);
    default:
        return 0.0;
    }
}

/* A draw of a relative deviation whose scale 1 + d must stay positive. */
static double draw_scale(const sr_dist *d, gsl_rng *r)
{
    for (int k = 0; k < 64; k++) {
        double s = 1.0 + sr_dist_draw(d, r);
        if (s > 0.0)
            return s;
    }
    return 1.0; /* unreachable with sigma <= 30 % (probability < 1e-200) */
}

static void seek(gsl_rng *r, uint64_t seed, uint64_t i, unsigned slot)
{
    sr_rng_seek(r, sr_rng_key(seed, i, slot));
}

void sr_perturb_nominal(sr_perturb *p)
{
    memset(p, 0, sizeof *p);
    for (size_t s = 0; s < SR_UNC_MAX_STAGES; s++)
        p->drag_scale[s] = 1.0;
    p->mass_scale = 1.0;
    p->wind_speed_scale = 1.0;
}

void sr_uncertainty_draw(const sr_uncertainty *u, uint64_t seed, uint64_t i, gsl_rng *r, sr_perturb *p)
{
    sr_perturb_nominal(p);
    size_t ns = u->nstages < SR_UNC_MAX_STAGES ? u->nstages : SR_UNC_MAX_STAGES;
    for (size_t s = 0; s < ns; s++) {
        if (u->drag[s].kind != SR_DIST_FIXED) {
            seek(r, seed, i, SLOT_DRAG + (unsigned)s);
            p->drag_scale[s] = draw_scale(&u->drag[s], r);
        }
    }
    if (u->mass.kind != SR_DIST_FIXED) {
        seek(r, seed, i, SLOT_MASS);
        p->mass_scale = draw_scale(&u->mass, r);
    }
    if (u->wind_speed.kind != SR_DIST_FIXED) {
        seek(r, seed, i, SLOT_WIND_SPEED);
        if (u->wind_speed.relative)
            p->wind_speed_scale = draw_scale(&u->wind_speed, r);
        else
            p->wind_speed_offset = sr_dist_draw(&u->wind_speed, r);
    }
    if (u->wind_dir.kind != SR_DIST_FIXED) {
        seek(r, seed, i, SLOT_WIND_DIR);
        p->wind_dir_offset = sr_dist_draw(&u->wind_dir, r);
    }
    if (u->start_height.kind != SR_DIST_FIXED) {
        seek(r, seed, i, SLOT_START_HEIGHT);
        p->start_height_offset = sr_dist_draw(&u->start_height, r);
    }
    for (size_t s = 0; s < ns; s++) {
        if (u->deploy_height.kind != SR_DIST_FIXED && (u->height_stages >> s & 1u)) {
            seek(r, seed, i, SLOT_DEPLOY_HEIGHT + (unsigned)s);
            p->deploy_height_offset[s] = sr_dist_draw(&u->deploy_height, r);
        }
        if (u->deploy_delay.kind != SR_DIST_FIXED && (u->delay_stages >> s & 1u)) {
            seek(r, seed, i, SLOT_DEPLOY_DELAY + (unsigned)s);
            p->deploy_delay_offset[s] = sr_dist_draw(&u->deploy_delay, r);
        }
    }
}

static int dist_zero(const sr_dist *d)
{
    return d->kind == SR_DIST_FIXED || sr_dist_sd(d) == 0.0;
}

int sr_uncertainty_is_zero(const sr_uncertainty *u)
{
    for (size_t s = 0; s < u->nstages && s < SR_UNC_MAX_STAGES; s++)
        if (!dist_zero(&u->drag[s]))
            return 0;
    return dist_zero(&u->mass) && dist_zero(&u->wind_speed) && dist_zero(&u->wind_dir) &&
           dist_zero(&u->start_height) && (dist_zero(&u->deploy_height) || !u->height_stages) &&
           (dist_zero(&u->deploy_delay) || !u->delay_stages);
}
