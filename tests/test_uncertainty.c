/* test_uncertainty.c - the random streams (SplitMix64 reference sequence,
 * uniformity and normality against GSL's distribution functions), the
 * distributions of deviations, and the mission file's uncertainty block. */
#include "testutil.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "files/catalog.h"
#include "files/mission.h"
#include "base/rng.h"
#include "physics/uncertainty.h"
#include "files/yamldoc.h"

#define PI 3.14159265358979323846
#define DEG (PI / 180.0)
#define SRC_SM "SplitMix64 reference sequence from state 0 (Steele, Lea & Flood 2014; Vigna's splitmix64.c), from memory"
#define SRC_MOMENTS "moments of the distribution (uniform (b-a)/sqrt(12); triangular Var = (a^2+b^2+c^2-ab-ac-bc)/18)"
#define SRC_CHI2 "Pearson chi-square test, p-value from GSL 2.7 gsl_cdf_chisq_Q"
#define SRC_KS "Kolmogorov-Smirnov statistic against the closed-form CDF, 1.63/sqrt(n) is the 1 % critical value"
#define SRC_FAMILY "Knacke 1991, NWC TP 6575, Tables 5-1/5-2 CD0 range (from memory) via canopies/*.yaml"
#define SRC_UNITS "NIST SP 811 (2008) App. B: 1 ft = 0.3048 m, 1 kn = 1852 m/h"

/* ---- the generator ------------------------------------------------------ */

static void test_splitmix_reference(void **state)
{
    (void)state;
    static const uint64_t REF[4] = {0xe220a8397b1dcdafULL, 0x6e789e6aa1b965f4ULL, 0x06c45d188009454fULL,
                                    0xf88bb8a8724c81ecULL};
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    assert_non_null(r);
    sr_rng_seek(r, 0);
    for (int k = 0; k < 4; k++)
        CHECK_ABS_CLASS(SR_CHECK_MEMORY, "SplitMix64 output, upper 32 bits", SRC_SM, (double)(REF[k] >> 32),
                        (double)gsl_rng_get(r), 0.0);
    sr_rng_seek(r, 0);
    for (int k = 0; k < 4; k++)
        CHECK_ABS_CLASS(SR_CHECK_MEMORY, "SplitMix64 output as a double in [0,1)", SRC_SM,
                        (double)(REF[k] >> 11) * 0x1.0p-53, gsl_rng_uniform(r), 0.0);
    assert_int_equal(gsl_rng_max(r), 0xffffffffUL);
    assert_int_equal(gsl_rng_min(r), 0);
    gsl_rng_free(r);
    /* keys: any one argument changed gives another key */
    uint64_t k0 = sr_rng_key(1, 2, 3);
    assert_true(k0 != sr_rng_key(2, 2, 3));
    assert_true(k0 != sr_rng_key(1, 3, 3));
    assert_true(k0 != sr_rng_key(1, 2, 4));
    assert_true(sr_rng_key(0, 0, 0) != 0);
}

/* The first draw of 100 000 consecutive sample streams: uniform by a
 * chi-square test, and no correlation between neighbouring samples. */
static void test_streams_uniform(void **state)
{
    (void)state;
    const size_t n = 100000, bins = 100;
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    double *u = malloc(n * sizeof *u);
    size_t count[100] = {0};
    for (size_t i = 0; i < n; i++) {
        sr_rng_seek(r, sr_rng_key(2024, i, 0));
        u[i] = gsl_rng_uniform(r);
        assert_true(u[i] >= 0.0 && u[i] < 1.0);
        count[(size_t)(u[i] * bins)]++;
    }
    double chi2 = 0.0, e = (double)n / bins;
    for (size_t b = 0; b < bins; b++)
        chi2 += ((double)count[b] - e) * ((double)count[b] - e) / e;
    double pval = gsl_cdf_chisq_Q(chi2, bins - 1);
    assert_true(pval > 1e-4);
    CHECK_ABS_CLASS(SR_CHECK_LIBRARY, "chi-square p-value of first draws, 100 bins (> 1e-4)", SRC_CHI2, 0.5, pval,
                    0.5 - 1e-4);
    double rho = gsl_stats_correlation(u, 1, u + 1, 1, n - 1);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "lag-1 correlation across sample streams",
                    "independent streams: abs(r) < 4/sqrt(n)", 0.0, rho, 4.0 / sqrt((double)n));
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "mean of first draws", "uniform on [0,1): mean 1/2, sd 1/sqrt(12n)", 0.5,
                    gsl_stats_mean(u, 1, n), 5.0 / sqrt(12.0 * (double)n));
    free(u);
    gsl_rng_free(r);
}

/* ---- distributions ----------------------------------------------------- */

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* Kolmogorov-Smirnov distance of a sorted sample from a CDF. */
static double ks(const double *x, size_t n, double (*cdf)(double, const sr_dist *), const sr_dist *d)
{
    double D = 0.0;
    for (size_t i = 0; i < n; i++) {
        double F = cdf(x[i], d);
        double a = fabs(F - (double)i / (double)n), b = fabs((double)(i + 1) / (double)n - F);
        D = fmax(D, fmax(a, b));
    }
    return D;
}

static double cdf_closed(double x, const sr_dist *d)
{
    double a = d->lo, b = d->hi;
    switch (d->kind) {
    case SR_DIST_UNIFORM:
        return x <= a ? 0 : x >= b ? 1 : (x - a) / (b - a);
    case SR_DIST_NORMAL:
        return gsl_cdf_gaussian_P(x, d->sigma);
    case SR_DIST_TRIANGULAR:
        if (x <= a)
            return 0;
        if (x >= b)
            return 1;
        return x <= 0 ? (x - a) * (x - a) / ((b - a) * (-a)) : 1 - (b - x) * (b - x) / ((b - a) * b);
    default:
        return x < 0 ? 0 : 1;
    }
}

static void test_distributions(void **state)
{
    (void)state;
    const sr_dist D[] = {
        {.kind = SR_DIST_UNIFORM, .lo = -0.2, .hi = 0.1},
        {.kind = SR_DIST_NORMAL, .sigma = 1.5},
        {.kind = SR_DIST_TRIANGULAR, .lo = -3.0, .hi = 1.0},
        {.kind = SR_DIST_TRIANGULAR, .lo = -1.0, .hi = 1.0},
    };
    const double sd[] = {0.3 / sqrt(12.0), 1.5, sqrt((9.0 + 1.0 + 3.0) / 18.0), sqrt(3.0 / 18.0)};
    const size_t n = 40000;
    double *x = malloc(n * sizeof *x);
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    char q[128];
    for (size_t k = 0; k < sizeof D / sizeof D[0]; k++) {
        snprintf(q, sizeof q, "standard deviation of %s [%g, %g] sigma %g", sr_dist_name(D[k].kind), D[k].lo, D[k].hi,
                 D[k].sigma);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_MOMENTS, sd[k], sr_dist_sd(&D[k]), 1e-12);
        sr_rng_seek(r, sr_rng_key(5, k, 0));
        for (size_t i = 0; i < n; i++)
            x[i] = sr_dist_draw(&D[k], r);
        snprintf(q, sizeof q, "sample sd of %s draws", sr_dist_name(D[k].kind));
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_MOMENTS, sd[k], gsl_stats_sd(x, 1, n),
                        5.0 / sqrt(2.0 * (double)n) * 1.5);
        qsort(x, n, sizeof *x, cmp_double);
        snprintf(q, sizeof q, "KS distance of %s draws from its CDF (< 1 %% critical value)", sr_dist_name(D[k].kind));
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_KS, 0.0, ks(x, n, cdf_closed, &D[k]), 1.63 / sqrt((double)n));
    }
    sr_dist fixed = {0};
    assert_true(sr_dist_draw(&fixed, r) == 0.0);
    assert_true(sr_dist_sd(&fixed) == 0.0);
    sr_dist_kind kk;
    assert_int_equal(sr_dist_parse_name("triangular", &kk), SR_OK);
    assert_int_equal(kk, SR_DIST_TRIANGULAR);
    assert_int_equal(sr_dist_parse_name("gaussian", &kk), SR_EINVAL);
    free(x);
    gsl_rng_free(r);
}

/* ---- the mission file's uncertainty block ------------------------------ */

static int setup(void **state)
{
    (void)state;
    (void)sr_test_catalog();
    return 0;
}

#define BASE                                                                                                     \
    "mission: uncertainty test\n"   /* 1 */                                                                      \
    "sections:\n"                   /* 2 */                                                                      \
    "  - name: body\n"              /* 3 */                                                                      \
    "    mass: 4 kg\n"              /* 4 */                                                                      \
    "stages:\n"                     /* 5 */                                                                      \
    "  - name: drogue\n"            /* 6 */                                                                      \
    "    family: cross\n"           /* 7 */                                                                      \
    "    nominal-diameter: 0.9 m\n" /* 8 */                                                                      \
    "  - name: main\n"              /* 9 */                                                                      \
    "    family: conical\n"         /* 10 */                                                                     \
    "    nominal-diameter: 2.2 m\n" /* 11 */                                                                     \
    "    deploy:\n"                 /* 12 */                                                                     \
    "      height: 250 m\n"         /* 13 */                                                                     \
    "start:\n"                      /* 14 */                                                                     \
    "  height: 2000 m\n"            /* 15 */
/* the uncertainty block starts on line 16 */

static int parse(const char *text, sr_mission *m, sr_error *e)
{
    memset(m, 0, sizeof *m);
    sr_atmos_init_standard(&m->atmos);
    m->limit_speed = m->limit_energy = m->limit_time = m->limit_drift = NAN;
    snprintf(m->path, sizeof m->path, "test.yaml");
    sr_yaml y;
    int rc = sr_yaml_load_string(&y, "test.yaml", text, strlen(text), e);
    if (rc)
        return rc;
    rc = sr_mission_parse(m, &y, sr_test_catalog(), e);
    sr_yaml_free(&y);
    sr_mission_release(m);
    return rc;
}

static void test_default_is_family_range(void **state)
{
    (void)state;
    sr_mission m;
    sr_error e;
    if (parse(BASE, &m, &e))
        fail_msg("%s", e.msg);
    const sr_uncertainty *u = &m.unc;
    assert_int_equal(u->given, 0);
    assert_int_equal(u->nstages, 2);
    /* cross CD0 0.60 .. 0.85 and conical 0.75 .. 0.90 on nominal area */
    const double lo[2] = {0.60, 0.75}, hi[2] = {0.85, 0.90};
    for (int s = 0; s < 2; s++) {
        assert_int_equal(u->drag[s].kind, SR_DIST_UNIFORM);
        assert_int_equal(u->drag_family[s], 1);
        double typ = m.stages[s].canopy.cd.v.typ;
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY,
                        s ? "main drag scale, low end (CD0 lo / typ)" : "drogue drag scale, low end (CD0 lo / typ)",
                        SRC_FAMILY, lo[s] / typ, 1.0 + u->drag[s].lo, 1e-12);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY,
                        s ? "main drag scale, high end (CD0 hi / typ)" : "drogue drag scale, high end (CD0 hi / typ)",
                        SRC_FAMILY, hi[s] / typ, 1.0 + u->drag[s].hi, 1e-12);
    }
    assert_int_equal(u->mass.kind, SR_DIST_FIXED);
    assert_int_equal(u->wind_speed.kind, SR_DIST_FIXED);
    assert_int_equal(u->height_stages, 2u); /* the main, stage 1 */
    assert_int_equal(u->delay_stages, 0u);
    assert_false(sr_uncertainty_is_zero(u));
}

static void test_full_block(void **state)
{
    (void)state;
    const char *text = BASE "uncertainty:\n"
                            "  drag:\n"
                            "    drogue: {distribution: normal, sigma: 5 %}\n"
                            "    main: {distribution: triangular, half-width: 0.06}\n"
                            "  mass: {distribution: normal, sigma: 0.2 kg}\n"
                            "  wind-speed: {distribution: normal, sigma: 3 kn}\n"
                            "  wind-direction: {distribution: uniform, half-width: 20 deg}\n"
                            "  first-deployment: {distribution: normal, sigma: 200 ft}\n"
                            "  deployment-height:\n"
                            "    distribution: uniform\n"
                            "    half-width: 15 m\n";
    sr_mission m;
    sr_error e;
    if (parse(text, &m, &e))
        fail_msg("%s", e.msg);
    const sr_uncertainty *u = &m.unc;
    assert_int_equal(u->given, 1);
    assert_int_equal(u->drag[0].kind, SR_DIST_NORMAL);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "drogue drag sigma, 5 % (relative)", "definition of a percentage", 0.05,
                    u->drag[0].sigma, 1e-15);
    assert_int_equal(u->drag[1].kind, SR_DIST_TRIANGULAR);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "main drag half-width, 0.06 in CD over the typical CD0 (relative)",
                    SRC_FAMILY, 0.06 / m.stages[1].canopy.cd.v.typ, u->drag[1].hi, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "mass sigma 0.2 kg of 4 kg (relative)", "0.2 / 4", 0.05, u->mass.sigma,
                    1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "wind-speed sigma 3 kn (m/s)", SRC_UNITS, 3.0 * 1852.0 / 3600.0,
                    u->wind_speed.sigma, 1e-15);
    assert_int_equal(u->wind_speed.relative, 0);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "wind-direction half-width 20 deg (rad)", "NIST SP 811: 1 deg = pi/180 rad",
                    20 * DEG, u->wind_dir.hi, 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "first-deployment sigma 200 ft (m)", SRC_UNITS, 60.96, u->start_height.sigma,
                    1e-15);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "deployment-height low end (m)", "half-width 15 m", -15.0,
                    u->deploy_height.lo, 0.0);

    /* the draws: each variable where it belongs, with the stated spread */
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    const size_t n = 20000;
    double *ms = malloc(n * sizeof *ms), *wd = malloc(n * sizeof *wd), *dh = malloc(n * sizeof *dh);
    for (size_t i = 0; i < n; i++) {
        sr_perturb p;
        sr_uncertainty_draw(u, 99, i, r, &p);
        ms[i] = p.mass_scale;
        wd[i] = p.wind_dir_offset;
        dh[i] = p.deploy_height_offset[1];
        assert_true(p.deploy_height_offset[0] == 0.0); /* the drogue deploys at the start, not at a height */
        assert_true(p.wind_speed_scale == 1.0);
        assert_true(fabs(p.deploy_height_offset[1]) <= 15.0);
        assert_true(p.drag_scale[1] >= 1.0 - u->drag[1].hi && p.drag_scale[1] <= 1.0 + u->drag[1].hi);
    }
    double tol = 5.0 / sqrt(2.0 * (double)n);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "sd of the drawn mass scale", "normal, sigma 0.05", 0.05, gsl_stats_sd(ms, 1, n),
                    tol);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "sd of the drawn wind-direction offset (rad)", SRC_MOMENTS, 40 * DEG / sqrt(12.0),
                    gsl_stats_sd(wd, 1, n), tol);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "sd of the drawn main deployment-height offset (m)", SRC_MOMENTS,
                    30.0 / sqrt(12.0), gsl_stats_sd(dh, 1, n), tol);
    /* one stream per variable: fixing the mass leaves every other draw as it was */
    sr_uncertainty u2 = *u;
    u2.mass.kind = SR_DIST_FIXED;
    for (size_t i = 0; i < 100; i++) {
        sr_perturb a, b;
        sr_uncertainty_draw(u, 99, i, r, &a);
        sr_uncertainty_draw(&u2, 99, i, r, &b);
        assert_true(b.mass_scale == 1.0);
        b.mass_scale = a.mass_scale;
        assert_memory_equal(&a, &b, sizeof a);
    }
    free(ms);
    free(wd);
    free(dh);
    gsl_rng_free(r);
}

static void test_short_forms(void **state)
{
    (void)state;
    sr_mission m;
    sr_error e;
    /* one distribution for every stage; relative wind speed */
    if (parse(BASE "uncertainty:\n  drag: {distribution: normal, sigma: 4 %}\n"
                   "  wind-speed: {distribution: normal, sigma: 20 %}\n",
              &m, &e))
        fail_msg("%s", e.msg);
    assert_int_equal(m.unc.drag[0].kind, SR_DIST_NORMAL);
    assert_int_equal(m.unc.drag[1].kind, SR_DIST_NORMAL);
    assert_int_equal(m.unc.wind_speed.relative, 1);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "wind-speed sigma 20 % (relative)", "definition of a percentage", 0.2,
                    m.unc.wind_speed.sigma, 1e-15);
    /* `fixed` and the family range as words; nothing varies */
    if (parse(BASE "uncertainty:\n  drag:\n    drogue: fixed\n    main: uniform\n", &m, &e))
        fail_msg("%s", e.msg);
    assert_int_equal(m.unc.drag[0].kind, SR_DIST_FIXED);
    assert_int_equal(m.unc.drag[1].kind, SR_DIST_UNIFORM);
    assert_int_equal(m.unc.drag_family[1], 1);
    if (parse(BASE "uncertainty:\n  drag: fixed\n", &m, &e))
        fail_msg("%s", e.msg);
    assert_true(sr_uncertainty_is_zero(&m.unc));
    /* an empty block of spreads that are zero */
    if (parse(BASE "uncertainty:\n  drag: fixed\n  mass: {distribution: normal, sigma: 0 kg}\n", &m, &e))
        fail_msg("%s", e.msg);
    assert_true(sr_uncertainty_is_zero(&m.unc));
}

/* Each bad block: one clear message at the right line and column. */
static const struct {
    const char *block;
    const char *where; /* "test.yaml:L:C:" */
    const char *says;
} BAD[] = {
    {"  mass: {distribution: normal, sigma: -2 %}\n", "test.yaml:17:39:", "sigma must not be negative"},
    {"  wind-speed: {distribution: normal, sigma: -1 m/s}\n", "test.yaml:17:45:", "must not be negative"},
    {"  deployment-height: {distribution: uniform, half-width: -5 m}\n", "test.yaml:17:58:",
     "half-width must not be negative"},
    {"  wind-speed: {distribution: gaussian, sigma: 1 m/s}\n", "test.yaml:17:30:", "unknown distribution 'gaussian'"},
    {"  wind-speed: {distribution: normall, sigma: 1 m/s}\n", "test.yaml:17:30:", "did you mean 'normal'?"},
    {"  wind-sped: {distribution: normal, sigma: 1 m/s}\n", "test.yaml:17:3:", "did you mean 'wind-speed'?"},
    {"  drag:\n    drouge: fixed\n", "test.yaml:18:5:", "did you mean 'drogue'?"},
    {"  mass: {distribution: normal}\n", "test.yaml:17:9:", "needs sigma:"},
    {"  mass: {distribution: normal, half-width: 2 %}\n", "test.yaml:17:44:", "takes sigma:, not half-width:"},
    {"  mass: {distribution: uniform, sigma: 2 %}\n", "test.yaml:17:40:", "takes half-width:, not sigma:"},
    {"  mass: {distribution: uniform}\n", "test.yaml:17:9:", "needs half-width:"},
    {"  mass: {distribution: fixed, sigma: 2 %}\n", "test.yaml:17:38:", "takes no spread"},
    {"  mass: {sigma: 2 %}\n", "test.yaml:17:9:", "missing the required key 'distribution'"},
    {"  mass: normal\n", "test.yaml:17:9:", "needs a spread"},
    {"  mass: {distribution: normal, sigma: 40 %}\n", "test.yaml:17:39:", "at most 30 %"},
    {"  drag: {distribution: uniform, half-width: 95 %}\n", "test.yaml:17:45:", "at most 90 %"},
    {"  wind-direction: {distribution: normal, sigma: 15 m}\n", "test.yaml:17:49:", "unknown angle unit 'm'"},
    {"  wind-direction: {distribution: uniform, half-width: 200 deg}\n", "test.yaml:17:55:", "beyond 180 deg"},
    {"  first-deployment: {distribution: normal, sigma: 5 %}\n", "test.yaml:17:51:", "not a percentage"},
    {"  first-deployment: {distribution: normal, sigma: 60}\n", "test.yaml:17:51:", "needs a unit"},
    {"  first-deployment: {distribution: normal, sigma: 700 m}\n", "test.yaml:17:51:",
     "three times sigma reaches the ground from the first deployment at 2000 m"},
    {"  deployment-height: {distribution: normal, sigma: 100 m}\n", "test.yaml:17:52:",
     "reaches the ground from the lowest deployment at 250 m"},
    {"  deployment-delay: {distribution: normal, sigma: 1 s}\n", "test.yaml:17:21:", "nothing to vary"},
    {"  drag: {distribution: normal, sigma: 0.5 m}\n", "test.yaml:17:39:", "give a drag coefficient or a %"},
    {"  mass: [1, 2]\n", "test.yaml:17:9:", "must be a mapping"},
};

static void test_bad_blocks(void **state)
{
    (void)state;
    char text[2048];
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        snprintf(text, sizeof text, BASE "uncertainty:\n%s", BAD[i].block);
        sr_mission m;
        sr_error e;
        int rc = parse(text, &m, &e);
        if (rc != SR_EINVAL || !strstr(e.msg, BAD[i].where) || !strstr(e.msg, BAD[i].says))
            fail_msg("case %zu: rc %d, message '%s'; wanted '%s' ... '%s'", i, rc, rc ? e.msg : "", BAD[i].where,
                     BAD[i].says);
    }
    sr_mission m;
    sr_error e;
    assert_int_equal(parse(BASE "uncertainty: 3\n", &m, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "test.yaml:16:14: uncertainty must be a mapping"));
}

int main(void)
{
    gsl_set_error_handler_off();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_splitmix_reference),     cmocka_unit_test(test_streams_uniform),
        cmocka_unit_test(test_distributions),          cmocka_unit_test(test_default_is_family_range),
        cmocka_unit_test(test_full_block),             cmocka_unit_test(test_short_forms),
        cmocka_unit_test(test_bad_blocks),
    };
    return cmocka_run_group_tests_name("uncertainty", tests, setup, NULL);
}
