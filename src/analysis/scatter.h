/* scatter.h - statistics of a landing scatter: mean point, covariance,
 * sigma ellipses, containment radii, percentiles and limit probabilities
 * with their Monte Carlo uncertainty. */
#ifndef SR_SCATTER_H
#define SR_SCATTER_H

#include <stddef.h>

#include "analysis/dispersion.h"
#include "base/error.h"
#include "sinkrate/analysis.h"

/* An ellipse k standard deviations out (sr_ellipse, public): semi-axes (m)
 * and the bearing of the major axis (rad clockwise from north, in [0, pi)). A
 * 2-D normal puts 1 - exp(-k^2/2) of its points inside: 39.3 % at k = 1,
 * 98.9 % at k = 3. Eigen-decomposition (gsl_eigen_symmv) of the east/north covariance. */
int sr_scatter_ellipse(double cov_ee, double cov_en, double cov_nn, double k, sr_ellipse *e, sr_error *err);

/* A proportion: count of n, p = count/n, its standard error sqrt(p(1-p)/n)
 * and the Wilson score interval at z (1.96 for 95 %), which stays
 * meaningful at p = 0 and p = 1. */
void sr_scatter_proportion(size_t count, size_t n, double z, sr_proportion *out);

/* Percentiles reported for descent time, touchdown speed and energy. */
extern const double sr_scatter_pct[SR_SCATTER_NPCT]; /* 0.01 0.05 0.50 0.95 0.99 */

/* sr_spread1 and sr_body_stats (records) are public. */

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
