/* test_dispersion.c - the Monte Carlo engine and its statistics against
 * closed forms (linear transforms of normal and uniform variables, the
 * Rayleigh and Wilson formulas) and against GSL's eigen-decomposition and
 * bivariate normal sampler. */
#include "testutil.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_eigen.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/dispersion.h"
#include "base/rng.h"
#include "analysis/scatter.h"

#define PI 3.14159265358979323846
#define DEG (PI / 180.0)
#define G0 9.80665

#define SRC_2X2 "closed-form eigenvalues/eigenvectors of a symmetric 2x2 matrix (linear algebra)"
#define SRC_GSL_EIG "GSL 2.7 gsl_eigen_symmv (Debian libgsl) on the same matrix, the routine scatter.c calls"
#define SRC_GSL_BIV "closed form of the exact covariance; sample drawn by GSL 2.7 gsl_ran_bivariate_gaussian (Debian libgsl)"
#define SRC_LINEAR "closed form: a linear map A of independent normals has covariance A A^T"
#define SRC_DRIFT "closed form: constant density and wind, drift = w t, so sd(drift) = t sd(w)"
#define SRC_RAYLEIGH "Rayleigh quantile sigma sqrt(-2 ln(1-P)) (GSL 2.7 gsl_cdf_rayleigh_Pinv)"
#define SRC_ORDER "closed form: t = h sqrt(rho k CdS / 2 m g) is monotone in the drag scale k, so its quantiles map from the uniform's"
#define SRC_WILSON "Wilson (1927), JASA 22:209: score interval; at 0 of n the upper end is z^2/(n + z^2)"

/* ---- an analytic descent: one canopy at equilibrium in air of constant
 * density, a constant wind; every perturbation acts as in the real model */
typedef struct amodel {
    double rho, mass, cds, height;
    double wind, wind_from; /* m/s, rad (the bearing it blows from) */
    double limit_speed;     /* m/s, or INFINITY */
    double fail_above;      /* a sample fails when start_height_offset > this (error tests) */
} amodel;

static int asample(const void *ctx, void *ws, const sr_perturb *p, sr_landing *out, unsigned *flags, sr_error *err)
{
    (void)ws;
    const amodel *a = ctx;
    if (p->start_height_offset > a->fail_above)
        return sr_error_set(err, SR_ENUMERIC, "deliberate failure at offset %.6f m", p->start_height_offset);
    double m = a->mass * p->mass_scale, cds = a->cds * p->drag_scale[0];
    double v = sqrt(2.0 * m * G0 / (a->rho * cds));
    double t = (a->height + p->start_height_offset) / v;
    double w = (a->wind + p->wind_speed_offset) * p->wind_speed_scale, from = a->wind_from + p->wind_dir_offset;
    out->east = -w * t * sin(from);
    out->north = -w * t * cos(from);
    out->time = t;
    out->speed = v;
    out->energy = 0.5 * m * v * v;
    *flags = v > a->limit_speed ? SR_LIMIT_SPEED : 0u;
    return SR_OK;
}

static amodel amodel_default(void)
{
    amodel a = {.rho = 1.225, .mass = 5.0, .cds = 2.5, .height = 400.0, .wind = 6.0, .wind_from = 270.0 * DEG,
                .limit_speed = INFINITY, .fail_above = INFINITY};
    return a;
}

static sr_disp_model model_of(const amodel *a)
{
    sr_disp_model m = {.nbodies = 1, .ctx = a, .sample = asample};
    return m;
}

static void run_ok(const amodel *a, const sr_uncertainty *u, size_t n, uint64_t seed, int threads,
                   sr_disp_result *res, sr_disp_stats *st)
{
    sr_disp_model m = model_of(a);
    sr_disp_options o = {.n = n, .seed = seed, .threads = threads};
    sr_error e;
    int rc = sr_disp_run(&m, u, &o, res, &e);
    if (rc)
        fail_msg("%s", e.msg);
    if (st && (rc = sr_scatter_stats(res, st, &e)))
        fail_msg("%s", e.msg);
}

static sr_uncertainty unc_none(void)
{
    sr_uncertainty u;
    memset(&u, 0, sizeof u);
    u.nstages = 1;
    return u;
}

static sr_dist normal(double sigma)
{
    sr_dist d = {.kind = SR_DIST_NORMAL, .sigma = sigma};
    return d;
}

/* ---- ellipse: against the closed form and GSL ---------------------------- */

static const struct {
    double ee, en, nn;
    const char *what;
} COVS[] = {
    {4.0, 1.5, 1.0, "tilted, east-leaning"},
    {1.0, 0.0, 4.0, "along north"},
    {9.0, 0.0, 1.0, "along east"},
    {2.0, -1.0, 2.0, "along 135 deg"},
    {250.0, 120.0, 90.0, "m2 scale"},
};

static void test_ellipse_known_covariance(void **state)
{
    (void)state;
    char q[160];
    for (size_t i = 0; i < sizeof COVS / sizeof COVS[0]; i++) {
        double a = COVS[i].ee, b = COVS[i].en, c = COVS[i].nn;
        /* closed form: l = (a + c)/2 +- sqrt(((a - c)/2)^2 + b^2); the major
         * axis makes 0.5 atan2(2b, a - c) with east, so its bearing is 90 deg minus that */
        double mid = 0.5 * (a + c), rad = sqrt(0.25 * (a - c) * (a - c) + b * b);
        double l1 = mid + rad, l2 = mid - rad;
        double brg = PI / 2 - 0.5 * atan2(2.0 * b, a - c);
        brg = fmod(brg + PI, PI);
        sr_ellipse e1, e3;
        sr_error err;
        assert_int_equal(sr_scatter_ellipse(a, b, c, 1.0, &e1, &err), SR_OK);
        assert_int_equal(sr_scatter_ellipse(a, b, c, 3.0, &e3, &err), SR_OK);
        snprintf(q, sizeof q, "1-sigma major semi-axis, %s", COVS[i].what);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_2X2, sqrt(l1), e1.major, 1e-12);
        snprintf(q, sizeof q, "1-sigma minor semi-axis, %s", COVS[i].what);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_2X2, sqrt(l2), e1.minor, 1e-12);
        snprintf(q, sizeof q, "3-sigma major semi-axis, %s", COVS[i].what);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_2X2, 3.0 * sqrt(l1), e3.major, 1e-12);
        snprintf(q, sizeof q, "major-axis bearing (deg), %s", COVS[i].what);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_2X2, brg / DEG, e1.bearing / DEG, 1e-9);

        /* GSL directly, as the test's own call */
        double m[4] = {a, b, b, c}, val[2], vec[4];
        gsl_matrix_view M = gsl_matrix_view_array(m, 2, 2);
        gsl_vector_view V = gsl_vector_view_array(val, 2);
        gsl_matrix_view E = gsl_matrix_view_array(vec, 2, 2);
        gsl_eigen_symmv_workspace *w = gsl_eigen_symmv_alloc(2);
        assert_int_equal(gsl_eigen_symmv(&M.matrix, &V.vector, &E.matrix, w), 0);
        gsl_eigen_symmv_free(w);
        gsl_eigen_symmv_sort(&V.vector, &E.matrix, GSL_EIGEN_SORT_VAL_DESC);
        snprintf(q, sizeof q, "1-sigma major semi-axis^2 (m2), %s", COVS[i].what);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, q, SRC_GSL_EIG, val[0], e1.major * e1.major, 1e-12);
        snprintf(q, sizeof q, "1-sigma minor semi-axis^2 (m2), %s", COVS[i].what);
        CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, q, SRC_GSL_EIG, val[1], e1.minor * e1.minor, 1e-12 * val[0]);
        /* the major axis is parallel to GSL's first eigenvector: |cross| = 0 */
        double ue = sin(e1.bearing), un = cos(e1.bearing);
        snprintf(q, sizeof q, "major axis x GSL eigenvector, %s", COVS[i].what);
        CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, q, SRC_GSL_EIG, 0.0, ue * vec[2] - un * vec[0], 1e-12);
    }
    /* a degenerate scatter (all points on a line) and an invalid matrix */
    sr_ellipse e;
    assert_int_equal(sr_scatter_ellipse(4.0, 2.0, 1.0, 1.0, &e, NULL), SR_OK);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "minor semi-axis of a line scatter (m)", SRC_2X2, 0.0, e.minor, 1e-7);
    assert_int_equal(sr_scatter_ellipse(-1.0, 0.0, 1.0, 1.0, &e, NULL), SR_EINVAL);
    assert_int_equal(sr_scatter_ellipse(NAN, 0.0, 1.0, 1.0, &e, NULL), SR_EINVAL);
}

/* A large sample from gsl_ran_bivariate_gaussian: the statistics recover the
 * covariance and the ellipse within the Monte Carlo error. */
static void test_ellipse_bivariate_sample(void **state)
{
    (void)state;
    const double sx = 120.0, sy = 45.0, rho = 0.6;
    const size_t n = 200000;
    gsl_rng *r = gsl_rng_alloc(gsl_rng_mt19937);
    gsl_rng_set(r, 20240611UL);
    sr_disp_result res = {.n = n, .nbodies = 1};
    res.land = calloc(n, sizeof *res.land);
    res.flags = calloc(n, sizeof *res.flags);
    for (size_t i = 0; i < n; i++) {
        double x, y;
        gsl_ran_bivariate_gaussian(r, sx, sy, rho, &x, &y);
        res.land[i].east = 300.0 + x;
        res.land[i].north = -200.0 + y;
        res.land[i].time = res.land[i].speed = res.land[i].energy = 1.0;
    }
    gsl_rng_free(r);
    sr_disp_stats st;
    sr_error e;
    assert_int_equal(sr_scatter_stats(&res, &st, &e), SR_OK);
    const sr_body_stats *b = &st.body[0];
    double a = sx * sx, c = sy * sy, bb = rho * sx * sy;
    double mid = 0.5 * (a + c), rad = sqrt(0.25 * (a - c) * (a - c) + bb * bb);
    double brg = fmod(PI / 2 - 0.5 * atan2(2.0 * bb, a - c) + PI, PI);
    /* standard error of a sample standard deviation ~ sigma / sqrt(2n); 5 of them */
    double tol = 5.0 / sqrt(2.0 * (double)n);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "mean east (m)", SRC_GSL_BIV, 300.0, b->mean_east, 5.0 * sx / sqrt((double)n));
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "mean north (m)", SRC_GSL_BIV, -200.0, b->mean_north, 5.0 * sy / sqrt((double)n));
    CHECK_REL_CLASS(SR_CHECK_METHOD, "variance east (m2)", SRC_GSL_BIV, a, b->cov_ee, 2.0 * tol);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "covariance east-north (m2)", SRC_GSL_BIV, bb, b->cov_en, 3.0 * tol);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "1-sigma major semi-axis (m)", SRC_GSL_BIV, sqrt(mid + rad), b->sigma1.major, tol);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "1-sigma minor semi-axis (m)", SRC_GSL_BIV, sqrt(mid - rad), b->sigma1.minor,
                    2.0 * tol);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "major-axis bearing (deg)", SRC_GSL_BIV, brg / DEG, b->sigma1.bearing / DEG, 0.5);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "mean landing bearing (deg)", "atan2(east, north) of the mean (300, -200) m",
                    atan2(300.0, -200.0) / DEG + 0.0, b->mean_bearing / DEG, 0.2);
    /* containment of the 1- and 3-sigma ellipses: 1 - exp(-k^2/2) */
    size_t in1 = 0, in3 = 0;
    double ue = sin(b->sigma1.bearing), un = cos(b->sigma1.bearing);
    for (size_t i = 0; i < n; i++) {
        double de = res.land[i].east - b->mean_east, dn = res.land[i].north - b->mean_north;
        double u = (de * ue + dn * un) / b->sigma1.major, v = (-de * un + dn * ue) / b->sigma1.minor;
        in1 += u * u + v * v <= 1.0;
        in3 += u * u + v * v <= 9.0;
    }
    double p1 = 1.0 - exp(-0.5), p3 = 1.0 - exp(-4.5);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "fraction inside the 1-sigma ellipse",
                    "bivariate normal: P(inside k sigma) = 1 - exp(-k^2/2)", p1, (double)in1 / (double)n,
                    5.0 * sqrt(p1 * (1 - p1) / (double)n));
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "fraction inside the 3-sigma ellipse",
                    "bivariate normal: P(inside k sigma) = 1 - exp(-k^2/2)", p3, (double)in3 / (double)n,
                    5.0 * sqrt(p3 * (1 - p3) / (double)n));
    sr_disp_result_release(&res);
}

/* Quantiles by selection against GSL's quantile of sorted data. */
static int cmp_d(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

static void test_quantiles_against_gsl(void **state)
{
    (void)state;
    const double P[] = {0.0, 0.01, 0.05, 0.25, 0.5, 0.95, 0.99, 0.999, 1.0};
    const size_t NP = sizeof P / sizeof P[0];
    const size_t sizes[] = {1, 2, 3, 10, 101, 5000};
    gsl_rng *r = gsl_rng_alloc(gsl_rng_mt19937);
    gsl_rng_set(r, 5UL);
    char q[96];
    for (size_t k = 0; k < sizeof sizes / sizeof sizes[0]; k++) {
        size_t n = sizes[k];
        double *x = malloc(n * sizeof *x), *y = malloc(n * sizeof *y), got[9];
        for (size_t i = 0; i < n; i++)
            x[i] = y[i] = floor(20.0 * gsl_rng_uniform(r)); /* with ties */
        qsort(y, n, sizeof *y, cmp_d);
        sr_scatter_quantiles(x, n, P, NP, got);
        for (size_t j = 0; j < NP; j++) {
            double want = gsl_stats_quantile_from_sorted_data(y, 1, n, P[j]);
            if (j == 4) {
                snprintf(q, sizeof q, "median of %zu values by selection", n);
                CHECK_ABS_CLASS(SR_CHECK_LIBRARY, q, "GSL 2.7 gsl_stats_quantile_from_sorted_data on the sorted data",
                                want, got[j], 1e-12);
            } else if (fabs(got[j] - want) > 1e-12) {
                fail_msg("n %zu, P %g: %.17g, GSL says %.17g", n, P[j], got[j], want);
            }
        }
        free(x);
        free(y);
    }
    gsl_rng_free(r);
}

/* ---- the engine end to end ---------------------------------------------- */

/* A normal wind-speed offset maps linearly onto the ground along the wind
 * (from 225 deg, so toward 045 deg): covariance A A^T of rank one. */
static void test_engine_linear_covariance(void **state)
{
    (void)state;
    amodel a = amodel_default();
    a.wind_from = 225.0 * DEG; /* from the south-west: drift toward north-east */
    sr_uncertainty u = unc_none();
    u.wind_speed = normal(1.2);
    const size_t n = 40000;
    sr_disp_result res;
    sr_disp_stats st;
    run_ok(&a, &u, n, 7, 0, &res, &st);
    double v = sqrt(2.0 * a.mass * G0 / (a.rho * a.cds)), t = a.height / v;
    /* drift along 045 deg only: sd along that axis t * 1.2, none across */
    double tol = 5.0 / sqrt(2.0 * (double)n);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "1-sigma major semi-axis (m)", SRC_LINEAR, 1.2 * t, st.body[0].sigma1.major, tol);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "1-sigma minor semi-axis (m)", SRC_LINEAR, 0.0, st.body[0].sigma1.minor, 1e-6);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "major-axis bearing (deg)", SRC_LINEAR, 45.0, st.body[0].sigma1.bearing / DEG,
                    1e-6);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "mean drift distance (m)", SRC_LINEAR, a.wind * t, st.body[0].mean_distance,
                    5.0 * 1.2 / a.wind / sqrt((double)n));
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "mean drift bearing (deg)", SRC_LINEAR, 45.0, st.body[0].mean_bearing / DEG, 1e-6);
    sr_disp_result_release(&res);
}

/* The acceptance case: normal wind speed only, constant density; the
 * along-wind spread is t sd(w) within the Monte Carlo error. */
static void test_wind_speed_spread_analytic(void **state)
{
    (void)state;
    amodel a = amodel_default(); /* wind from 270: drift toward east */
    const double sigmas[] = {0.5, 1.5, 3.0};
    const size_t n = 20000;
    char q[128];
    for (size_t k = 0; k < 3; k++) {
        sr_uncertainty u = unc_none();
        u.wind_speed = normal(sigmas[k]);
        sr_disp_result res;
        sr_disp_stats st;
        run_ok(&a, &u, n, 42 + k, 2, &res, &st);
        double v = sqrt(2.0 * a.mass * G0 / (a.rho * a.cds)), t = a.height / v;
        double sd = sqrt(st.body[0].cov_ee);
        snprintf(q, sizeof q, "along-wind sd of the landing point, sd(w) = %.1f m/s (m)", sigmas[k]);
        /* 4 standard errors of a sample sd, sigma/sqrt(2(n-1)) */
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_DRIFT, sigmas[k] * t, sd, 4.0 / sqrt(2.0 * (double)(n - 1)));
        snprintf(q, sizeof q, "mean downwind drift, sd(w) = %.1f m/s (m)", sigmas[k]);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_DRIFT, a.wind * t, st.body[0].mean_east,
                        4.0 * sigmas[k] * t / sqrt((double)n));
        snprintf(q, sizeof q, "cross-wind sd, sd(w) = %.1f m/s (m)", sigmas[k]);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_DRIFT, 0.0, sqrt(st.body[0].cov_nn), 1e-9);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "descent time, no drag or mass spread (s)",
                        "closed form t = h / v, v = sqrt(2 m g / (rho CdS))", t, st.body[0].time.pct[2], 1e-12);
        sr_disp_result_release(&res);
    }
}

/* Circular normal scatter: the 50 % and 95 % radii are Rayleigh quantiles. */
static void test_radii_rayleigh(void **state)
{
    (void)state;
    const double s = 80.0;
    const size_t n = 100000;
    gsl_rng *r = gsl_rng_alloc(gsl_rng_mt19937);
    gsl_rng_set(r, 99UL);
    sr_disp_result res = {.n = n, .nbodies = 1};
    res.land = calloc(n, sizeof *res.land);
    res.flags = calloc(n, sizeof *res.flags);
    for (size_t i = 0; i < n; i++)
        gsl_ran_bivariate_gaussian(r, s, s, 0.0, &res.land[i].east, &res.land[i].north);
    gsl_rng_free(r);
    sr_disp_stats st;
    assert_int_equal(sr_scatter_stats(&res, &st, NULL), SR_OK);
    /* quantile standard error: sqrt(p(1-p)/n) / f(r_p), Rayleigh density f */
    const double P[2] = {0.50, 0.95};
    const double got_mean[2] = {st.body[0].r50_mean, st.body[0].r95_mean};
    const double got_launch[2] = {st.body[0].r50_launch, st.body[0].r95_launch};
    char q[96];
    for (int k = 0; k < 2; k++) {
        double rp = gsl_cdf_rayleigh_Pinv(P[k], s);
        CHECK_REL_CLASS(SR_CHECK_METHOD, "Rayleigh quantile self-check (m)", "sigma sqrt(-2 ln(1-P))",
                        s * sqrt(-2.0 * log(1.0 - P[k])), rp, 1e-12);
        double se = sqrt(P[k] * (1 - P[k]) / (double)n) / gsl_ran_rayleigh_pdf(rp, s);
        snprintf(q, sizeof q, "%.0f %% radius around the mean (m)", 100 * P[k]);
        CHECK_ABS_CLASS(SR_CHECK_LIBRARY, q, SRC_RAYLEIGH, rp, got_mean[k], 5.0 * se + 0.5);
        snprintf(q, sizeof q, "%.0f %% radius around the launch point (m)", 100 * P[k]);
        CHECK_ABS_CLASS(SR_CHECK_LIBRARY, q, SRC_RAYLEIGH, rp, got_launch[k], 5.0 * se);
    }
    sr_disp_result_release(&res);
}

/* Drag uniform over a range: descent-time and touchdown-speed percentiles
 * follow from the uniform's quantiles through the closed form. */
static void test_percentiles_uniform_drag(void **state)
{
    (void)state;
    amodel a = amodel_default();
    sr_uncertainty u = unc_none();
    u.drag[0].kind = SR_DIST_UNIFORM;
    u.drag[0].lo = -0.10;
    u.drag[0].hi = 0.15;
    const size_t n = 50000;
    sr_disp_result res;
    sr_disp_stats st;
    run_ok(&a, &u, n, 5, 2, &res, &st);
    double v0 = sqrt(2.0 * a.mass * G0 / (a.rho * a.cds)), t0 = a.height / v0, w = 0.25;
    char q[128];
    for (int k = 0; k < SR_SCATTER_NPCT; k++) {
        double P = sr_scatter_pct[k];
        double kt = 0.90 + P * w;         /* time grows with the drag scale */
        double kv = 0.90 + (1.0 - P) * w; /* speed falls with it */
        /* quantile error: sqrt(P(1-P)/n) in the uniform's probability, times the slope */
        double dq = 5.0 * sqrt(P * (1 - P) / (double)n) * w;
        snprintf(q, sizeof q, "descent time, %g %% percentile (s)", 100 * P);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_ORDER, t0 * sqrt(kt), st.body[0].time.pct[k],
                        t0 * 0.5 * dq / sqrt(kt) + 1e-9);
        snprintf(q, sizeof q, "touchdown speed, %g %% percentile (m/s)", 100 * P);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_ORDER, v0 / sqrt(kv), st.body[0].speed.pct[k],
                        v0 * 0.5 * dq / pow(kv, 1.5) + 1e-9);
    }
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "fastest touchdown (m/s)", SRC_ORDER, v0 / sqrt(0.90), st.body[0].speed.max,
                    v0 * 1e-3);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "slowest touchdown (m/s)", SRC_ORDER, v0 / sqrt(1.15), st.body[0].speed.min,
                    v0 * 1e-3);
    /* energy = m v^2 / 2 falls as 1/k: mean over uniform k is m v0^2/2 * ln(1.15/0.9)/0.25 */
    double e0 = 0.5 * a.mass * v0 * v0;
    CHECK_REL_CLASS(SR_CHECK_METHOD, "mean touchdown energy (J)",
                    "closed form: E[1/k] for k uniform on [a, b] is ln(b/a)/(b - a)", e0 * log(1.15 / 0.90) / w,
                    st.body[0].energy.mean, 2e-3);
    sr_disp_result_release(&res);
}

/* Limit probability against the closed form, with its standard error and
 * Wilson interval. */
static void test_limit_probability(void **state)
{
    (void)state;
    amodel a = amodel_default();
    double v0 = sqrt(2.0 * a.mass * G0 / (a.rho * a.cds));
    sr_uncertainty u = unc_none();
    u.drag[0].kind = SR_DIST_UNIFORM;
    u.drag[0].lo = -0.10;
    u.drag[0].hi = 0.15;
    /* v > L  <=>  k < (v0/L)^2; P = ((v0/L)^2 - 0.9) / 0.25 */
    const double P = 0.12;
    a.limit_speed = v0 / sqrt(0.90 + P * 0.25);
    const size_t n = 20000;
    sr_disp_result res;
    sr_disp_stats st;
    run_ok(&a, &u, n, 11, 2, &res, &st);
    const sr_proportion *pr = &st.limit[0];
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "P(touchdown speed above the limit)", "closed form through the uniform drag scale",
                    P, pr->p, 4.0 * sqrt(P * (1 - P) / (double)n));
    CHECK_REL_CLASS(SR_CHECK_METHOD, "its standard error", "binomial: sqrt(p(1-p)/n)",
                    sqrt(pr->p * (1 - pr->p) / (double)n), pr->se, 1e-12);
    assert_true(pr->lo < P && P < pr->hi);
    assert_int_equal(st.limit[1].count, 0);
    assert_int_equal(st.any.count, pr->count);
    /* Wilson at the edges */
    sr_proportion z;
    sr_scatter_proportion(0, 1000, 1.96, &z);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "upper 95 % bound at 0 of 1000", SRC_WILSON, 1.96 * 1.96 / (1000 + 1.96 * 1.96),
                    z.hi, 1e-12);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "lower bound at 0 of 1000", SRC_WILSON, 0.0, z.lo, 0.0);
    sr_scatter_proportion(30, 100, 1.96, &z);
    /* Wilson interval for 30 of 100 at z = 1.96, the formula evaluated
     * independently (Python, double precision): 0.218948 .. 0.395850 */
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "Wilson lower bound, 30 of 100", SRC_WILSON, 0.218948, z.lo, 2e-6);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "Wilson upper bound, 30 of 100", SRC_WILSON, 0.395850, z.hi, 2e-6);
    sr_disp_result_release(&res);
}

/* Zero uncertainty: every sample is the nominal descent, bit for bit. */
static void test_zero_uncertainty(void **state)
{
    (void)state;
    amodel a = amodel_default();
    sr_uncertainty u = unc_none();
    assert_true(sr_uncertainty_is_zero(&u));
    sr_perturb p;
    sr_perturb_nominal(&p);
    sr_landing nom;
    unsigned f;
    assert_int_equal(asample(&a, NULL, &p, &nom, &f, NULL), SR_OK);
    sr_disp_result res;
    sr_disp_stats st;
    run_ok(&a, &u, 1000, 3, 2, &res, &st);
    for (size_t i = 0; i < res.n; i++)
        assert_memory_equal(&res.land[i], &nom, sizeof nom);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "1-sigma major axis with nothing uncertain (m)", "definition: no spread", 0.0,
                    st.body[0].sigma1.major, 0.0);
    sr_disp_result_release(&res);
}

/* Same seed, 1, 2 and 3 threads: identical bytes; another seed differs. */
static void test_threads_identical(void **state)
{
    (void)state;
    amodel a = amodel_default();
    a.limit_speed = 6.2;
    sr_uncertainty u = unc_none();
    u.drag[0].kind = SR_DIST_TRIANGULAR;
    u.drag[0].lo = -0.1;
    u.drag[0].hi = 0.1;
    u.mass = normal(0.03);
    u.wind_speed = normal(1.5);
    u.wind_dir = normal(15 * DEG);
    u.start_height = normal(20.0);
    const size_t n = 7777; /* not a multiple of the block or the thread count */
    sr_disp_result r1, r2, r3, r4;
    sr_disp_stats s1, s2, s3, s4;
    run_ok(&a, &u, n, 1234, 1, &r1, &s1);
    run_ok(&a, &u, n, 1234, 2, &r2, &s2);
    run_ok(&a, &u, n, 1234, 3, &r3, &s3);
    assert_int_equal(r1.threads, 1);
    assert_int_equal(r2.threads, 2);
    assert_memory_equal(r1.land, r2.land, n * sizeof *r1.land);
    assert_memory_equal(r1.flags, r2.flags, n * sizeof *r1.flags);
    assert_memory_equal(r1.land, r3.land, n * sizeof *r1.land);
    assert_memory_equal(&s1, &s2, sizeof s1);
    assert_memory_equal(&s1, &s3, sizeof s1);
    assert_true(s1.limit[0].count > 0 && s1.limit[0].count < n);
    /* GSL's environment variables are never consulted */
    setenv("GSL_RNG_SEED", "987654", 1);
    setenv("GSL_RNG_TYPE", "ranlux", 1);
    run_ok(&a, &u, n, 1234, 2, &r4, &s4);
    assert_memory_equal(r1.land, r4.land, n * sizeof *r1.land);
    unsetenv("GSL_RNG_SEED");
    unsetenv("GSL_RNG_TYPE");
    sr_disp_result_release(&r4);
    /* a different seed gives a different scatter */
    run_ok(&a, &u, n, 1235, 2, &r4, &s4);
    assert_true(memcmp(r1.land, r4.land, n * sizeof *r1.land) != 0);
    /* a prefix run gives the same first samples: sample i depends on (seed, i) only */
    sr_disp_result_release(&r4);
    run_ok(&a, &u, 100, 1234, 2, &r4, NULL);
    assert_memory_equal(r1.land, r4.land, 100 * sizeof *r1.land);
    sr_disp_result_release(&r1);
    sr_disp_result_release(&r2);
    sr_disp_result_release(&r3);
    sr_disp_result_release(&r4);
}

static size_t progress_last, progress_calls;
static void on_progress(size_t done, size_t n, void *ud)
{
    (void)ud;
    assert_true(done <= n);
    progress_last = done > progress_last ? done : progress_last;
    progress_calls++;
}

static void test_progress(void **state)
{
    (void)state;
    amodel a = amodel_default();
    sr_uncertainty u = unc_none();
    u.wind_speed = normal(1.0);
    sr_disp_model m = model_of(&a);
    sr_disp_options o = {.n = 5000, .seed = 1, .threads = 2, .progress = on_progress};
    sr_disp_result res;
    progress_last = progress_calls = 0;
    assert_int_equal(sr_disp_run(&m, &u, &o, &res, NULL), SR_OK);
    assert_int_equal(progress_last, 5000);
    assert_true(progress_calls >= 5000 / 256);
    sr_disp_result_release(&res);
}

/* Bad input: clear errors; a failing sample is the lowest failing index at
 * any thread count. */
static void test_bad_input(void **state)
{
    (void)state;
    amodel a = amodel_default();
    sr_uncertainty u = unc_none();
    sr_disp_model m = model_of(&a);
    sr_disp_result res;
    sr_error e;
    const size_t bad_n[] = {0, SR_DISP_MAX_SAMPLES + 1, (size_t)1e12};
    for (size_t k = 0; k < 3; k++) {
        sr_disp_options o = {.n = bad_n[k], .seed = 1};
        assert_int_equal(sr_disp_run(&m, &u, &o, &res, &e), SR_EINVAL);
        assert_non_null(strstr(e.msg, "number of samples must be a whole number from 1 to 10000000"));
        assert_null(res.land);
    }
    assert_int_equal(sr_disp_check_n(2.5, "-n", &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "-n: "));
    assert_int_equal(sr_disp_check_n(NAN, "-n", &e), SR_EINVAL);
    assert_int_equal(sr_disp_check_n(1e7, "-n", &e), SR_OK);
    sr_disp_options o = {.n = 10, .seed = 1, .threads = -2};
    assert_int_equal(sr_disp_run(&m, &u, &o, &res, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "threads"));
    o.threads = 1;
    sr_disp_model m0 = m;
    m0.nbodies = 0;
    assert_int_equal(sr_disp_run(&m0, &u, &o, &res, &e), SR_EINVAL);

    /* failures: the first sample whose height offset exceeds 2 sigma */
    u.start_height = normal(10.0);
    a.fail_above = 20.0;
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    size_t first = SIZE_MAX;
    for (size_t i = 0; i < 4000 && first == SIZE_MAX; i++) {
        sr_perturb p;
        sr_uncertainty_draw(&u, 77, i, r, &p);
        if (p.start_height_offset > 20.0)
            first = i;
    }
    gsl_rng_free(r);
    assert_true(first != SIZE_MAX);
    char expect[64];
    snprintf(expect, sizeof expect, "sample %zu (--seed 77): deliberate failure", first);
    for (int t = 1; t <= 3; t++) {
        sr_disp_options of = {.n = 4000, .seed = 77, .threads = t};
        assert_int_equal(sr_disp_run(&m, &u, &of, &res, &e), SR_ENUMERIC);
        if (!strstr(e.msg, expect))
            fail_msg("threads %d: '%s' lacks '%s'", t, e.msg, expect);
        assert_null(res.land);
    }
}

int main(void)
{
    gsl_set_error_handler_off();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_ellipse_known_covariance), cmocka_unit_test(test_ellipse_bivariate_sample),
        cmocka_unit_test(test_quantiles_against_gsl),
        cmocka_unit_test(test_engine_linear_covariance), cmocka_unit_test(test_wind_speed_spread_analytic),
        cmocka_unit_test(test_radii_rayleigh),           cmocka_unit_test(test_percentiles_uniform_drag),
        cmocka_unit_test(test_limit_probability),        cmocka_unit_test(test_zero_uncertainty),
        cmocka_unit_test(test_threads_identical),        cmocka_unit_test(test_progress),
        cmocka_unit_test(test_bad_input),
    };
    return cmocka_run_group_tests_name("dispersion", tests, NULL, NULL);
}
