/* uncertainty.h - what a Monte Carlo sample varies: distributions of the
 * deviations from a mission's nominal values, and drawing one sample's
 * perturbations from its own random streams. */
#ifndef SR_UNCERTAINTY_H
#define SR_UNCERTAINTY_H

#include <gsl/gsl_rng.h>
#include <stddef.h>
#include <stdint.h>

#include "base/error.h"
#include "physics/descent_spec.h"

#define SR_UNC_MAX_STAGES SR_DESCENT_MAX_STAGES /* one perturbation slot per stage */

typedef enum sr_dist_kind {
    SR_DIST_FIXED = 0,   /* no deviation */
    SR_DIST_UNIFORM,     /* uniform over [lo, hi] */
    SR_DIST_NORMAL,      /* normal, mean 0, standard deviation sigma */
    SR_DIST_TRIANGULAR   /* triangular over [lo, hi], mode 0 */
} sr_dist_kind;

/* A deviation from the nominal value. A zeroed struct is "fixed". For a
 * scale (drag, mass, relative wind speed) the deviation is relative and the
 * scale is 1 + deviation; a normal draw is repeated until the scale is
 * positive (parsing keeps relative sigmas at or below 30 %, so this trims
 * less than 1e-3 of the tail). */
typedef struct sr_dist {
    sr_dist_kind kind;
    double sigma;        /* normal */
    double lo, hi;       /* uniform, triangular: lo <= 0 <= hi */
    int relative;        /* given in % of the nominal (reports only) */
} sr_dist;

const char *sr_dist_name(sr_dist_kind k);   /* "fixed", "uniform", "normal", "triangular" */
int sr_dist_parse_name(const char *s, sr_dist_kind *k);
/* Standard deviation of the distribution (0 when fixed). */
double sr_dist_sd(const sr_dist *d);
/* One draw of the deviation. */
double sr_dist_draw(const sr_dist *d, gsl_rng *r);

/* The uncertainty block of a mission, in deviations from the nominal. */
typedef struct sr_uncertainty {
    int given;                          /* the mission file had an uncertainty block */
    size_t nstages;
    sr_dist drag[SR_UNC_MAX_STAGES];    /* relative: drag area of each stage */
    int drag_family[SR_UNC_MAX_STAGES]; /* the range is the family's CD0 range */
    sr_dist mass;                       /* relative: every section's mass */
    sr_dist wind_speed;                 /* m/s added to the wind at every altitude, or relative */
    sr_dist wind_dir;                   /* rad added to the bearing the wind blows from */
    sr_dist start_height;               /* m added to the first-deployment height */
    sr_dist deploy_height;              /* m added to each later height-triggered deployment, drawn per stage */
    sr_dist deploy_delay;               /* s added to each delay-triggered deployment, drawn per stage */
    unsigned height_stages;             /* bit s: stage s deploys at a height (not the first event) */
    unsigned delay_stages;              /* bit s: stage s deploys after a delay */
} sr_uncertainty;

/* One sample's perturbations, ready for the descent model. */
typedef struct sr_perturb {
    double drag_scale[SR_UNC_MAX_STAGES];        /* multiplies the stage's drag area */
    double mass_scale;                           /* multiplies every section's mass */
    double wind_speed_offset;                    /* m/s added to the wind speed at every altitude */
    double wind_speed_scale;                     /* multiplies the wind speed */
    double wind_dir_offset;                      /* rad added to the bearing the wind blows from */
    double start_height_offset;                  /* m added to the first-deployment height */
    double deploy_height_offset[SR_UNC_MAX_STAGES]; /* m added to a height-triggered deployment */
    double deploy_delay_offset[SR_UNC_MAX_STAGES];  /* s added to a delay-triggered deployment */
} sr_perturb;

/* The perturbation of no deviation (scales 1, offsets 0). */
void sr_perturb_nominal(sr_perturb *p);

/* Draw sample i's perturbations. Each variable draws from its own stream
 * keyed by (seed, i, variable), so the result depends on nothing else: not
 * on the thread, the order of samples, or which other variables vary.
 * r must come from gsl_rng_alloc(sr_rng_splitmix64). */
void sr_uncertainty_draw(const sr_uncertainty *u, uint64_t seed, uint64_t i, gsl_rng *r, sr_perturb *p);

/* 1 when nothing varies. */
int sr_uncertainty_is_zero(const sr_uncertainty *u);

#endif
