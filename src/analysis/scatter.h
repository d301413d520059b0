/* scatter.h - statistics of a landing scatter: mean point, covariance,
 * sigma ellipses, containment radii, percentiles and limit probabilities
 * with their Monte Carlo uncertainty. */
#ifndef SR_SCATTER_H
#define SR_SCATTER_H

#include <stddef.h>

#include "analysis/dispersion.h"
#include "base/error.h"

/* An ellipse k standard deviations out: semi-axes (m) and the bearing of the
 * major axis (rad clockwise from north, in [0, pi)). A 2-D normal puts
 * 1 - exp(-k^2/2) of its points inside: 39.3 % at k = 1, 98.9 % at k = 3. */
typedef struct sr_ellipse {
    double major, minor;
    double bearing;
} sr_ellipse;

/* Eigen-decomposition (gsl_eigen_symmv) of the east/north covariance. */
int sr_scatter_ellipse(double cov_ee, double cov_en, double cov_nn, double k, sr_ellipse *e, sr_error *err);

/* A proportion: count of n, p = count/n, its standard error sqrt(p(1-p)/n)
 * and the Wilson score interval at z (1.96 for 95 %), which stays
 * meaningful at p = 0 and p = 1. */
typedef struct sr_proportion {
    size_t count, n;
    double p, se, lo, hi;
} sr_proportion;
void sr_scatter_proportion(size_t count, size_t n, double z, sr_proportion *out);

/* Percentiles reported for descent time, touchdown speed and energy. */
#define SR_SCATTER_NPCT 5
extern const double sr_scatter_pct[SR_SCATTER_NPCT]; /* 0.01 0.05 0.50 0.95 0.99 */

typedef struct sr_spread1 {
    double mean, min, max;
    double pct[SR_SCATTER_NPCT];
} sr_spread1;

typedef struct sr_body_stats {
    double mean_east, mean_north;       /* m from the launch point */
    double mean_distance, mean_bearing; /* m; rad clockwise from north, [0, 2 pi) */
    double cov_ee, cov_en, cov_nn;      /* m2, with n - 1 */
    sr_ellipse sigma1, sigma3;
    double r50_mean, r95_mean;          /* radii holding 50 % / 95 % of the points, around the mean */
    double r50_launch, r95_launch;      /* ... around the launch point */
    sr_spread1 time, speed, energy;
} sr_body_stats;

typedef struct sr_disp_stats {
    size_t n, nbodies;
    sr_body_stats body[SR_DISP_MAX_BODIES];
    sr_proportion limit[SR_DISP_NLIMITS]; /* by bit index of sr_limit_bit */
    sr_proportion any;                    /* any limit */
} sr_disp_stats;

/* All statistics, computed in sample order (deterministic). */
int sr_scatter_stats(const sr_disp_result *res, sr_disp_stats *st, sr_error *err);

/* The quantiles of x at probs, as GSL's interpolated quantile of sorted
 * data (Hyndman-Fan type 7), by selection; x is reordered. */
void sr_scatter_quantiles(double *x, size_t n, const double *probs, size_t np, double *out);

#endif
