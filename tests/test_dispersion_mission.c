/* test_dispersion_mission.c - Monte Carlo over the real staged descent:
 * zero uncertainty reproduces the profile, and in uniform air each kind of
 * deviation moves the landing as the closed forms say (drift = w t, a higher
 * start or a later main adds dh/v), within the Monte Carlo error. */
#include "testutil.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "files/catalog.h"
#include "analysis/dispersion.h"
#include "analysis/dispersion_mission.h"
#include "files/mission.h"
#include "physics/profile.h"
#include "analysis/scatter.h"

#define PI 3.14159265358979323846
#define G0 9.80665
#define R0 6356766.0 /* m, the 1976 standard's effective Earth radius */
#define RHO 1.1

#define SRC_DRIFT "closed form, uniform air and a constant wind: drift = w t, so sd(drift) = t sd(w) (derived)"
#define SRC_RATE "Knacke 1991 sec. 4.5: steady rate v = sqrt(2 W/(CdS rho)) with g(z) = g0 (r0/(r0+z))^2 (1976 standard)"
#define SRC_SHIFT "closed form, uniform air: a deployment moved by dh in steady descent changes the time by dh (1/v_after - 1/v_before)"
#define SRC_MASS "closed form: v ~ sqrt(m), so sd(v)/v = sd(m)/(2 m) to first order"
#define SRC_PROFILE "the deterministic staged descent (sinkrate profile), fast mode, same mission"

static int setup(void **state)
{
    (void)state;
    gsl_set_error_handler_off();
    (void)sr_test_catalog();
    return 0;
}

/* An invented two-stage mission; %s takes the wind and the uncertainty block. */
static const char MISSION[] = "mission: dispersion test (invented)\n"
                              "site:\n"
                              "  elevation: 0 m\n"
                              "%s"
                              "sections:\n"
                              "  - name: body\n"
                              "    mass: 4 kg\n"
                              "stages:\n"
                              "  - name: drogue\n"
                              "    family: cross\n"
                              "    nominal-diameter: 0.7 m\n"
                              "    deploy: apogee\n"
                              "  - name: main\n"
                              "    family: conical\n"
                              "    nominal-diameter: 2.0 m\n"
                              "    deploy:\n"
                              "      height: 300 m\n"
                              "start:\n"
                              "  height: 1500 m\n"
                              "  speed: 0 m/s\n"
                              "  path-angle: 0 deg\n"
                              "limits:\n"
                              "  touchdown-speed: 4.9 m/s\n"
                              "  drift: 1300 m\n"
                              "%s";

static sr_mission *load(const char *wind, const char *unc)
{
    char text[4096];
    snprintf(text, sizeof text, MISSION, wind, unc);
    sr_mission *m = sr_test_mission_text(text);
    return m;
}

static void init(sr_disp_mission *dm, const sr_mission *m, double rho, int full)
{
    sr_profile_opts o;
    sr_profile_opts_init(&o);
    o.uniform_density = rho;
    sr_error e;
    if (sr_disp_mission_init(dm, m, &o, full, &e))
        fail_msg("%s", e.msg);
}

static void run(const sr_disp_mission *dm, const sr_uncertainty *u, size_t n, int threads, sr_disp_result *res,
                sr_disp_stats *st)
{
    sr_disp_options o = {.n = n, .seed = 2024, .threads = threads};
    sr_error e;
    if (sr_disp_run(&dm->model, u, &o, res, &e))
        fail_msg("%s", e.msg);
    if (st && sr_scatter_stats(res, st, &e))
        fail_msg("%s", e.msg);
}

static double steady(const sr_mission *m, size_t stage, double h, double cds_extra)
{
    /* v = sqrt(2 m g(z) / (rho CdS)) with the stage's typical drag area */
    const sr_canopy *c = &m->stages[stage].canopy;
    double cds = c->cds.typ * c->count * c->cluster_factor + cds_extra;
    double g = G0 * (R0 / (R0 + h)) * (R0 / (R0 + h));
    return sqrt(2.0 * sr_mission_total_mass(m) * g / (RHO * cds));
}

/* Zero uncertainty: every sample is the deterministic profile, bit for bit. */
static void test_zero_is_profile(void **state)
{
    (void)state;
    sr_mission *m = load("  wind:\n    model: power-law\n    speed: 5 m/s\n    from: 250 deg\n",
                         "uncertainty:\n  drag: fixed\n");
    assert_true(sr_uncertainty_is_zero(&m->unc));
    sr_disp_mission dm;
    init(&dm, m, NAN, 0);
    sr_profile_result *r = malloc(sizeof *r);
    sr_error e;
    assert_int_equal(sr_profile_run(dm.ctx, NULL, SR_PROFILE_FAST, NULL, r, NULL, &e), SR_OK);
    sr_landing nom;
    unsigned f;
    sr_disp_mission_outcome(&dm, r, &nom, &f);
    sr_disp_result res;
    sr_disp_stats st;
    run(&dm, &m->unc, 500, 2, &res, &st);
    for (size_t i = 0; i < res.n; i++)
        assert_memory_equal(&res.land[i], &nom, sizeof nom);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "landing east of every sample (m)", SRC_PROFILE, r->body[0].east,
                    st.body[0].mean_east, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "descent time of every sample (s)", SRC_PROFILE, r->descent_time,
                    st.body[0].time.max, 1e-12);
    /* and the fast nominal is the full nominal */
    const sr_profile_result *full = sr_profile_nominal(dm.ctx);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "fast nominal landing distance vs full (m)",
                    "the full staged descent (GSL rk8pd + QAG); fast-mode bound of profile.h", full->body[0].drift,
                    hypot(nom.east, nom.north), 1e-4);
    sr_disp_result_release(&res);
    sr_disp_mission_free(&dm);
    free(r);
    sr_mission_free(m);
}

/* Normal wind speed only, uniform air, constant wind: the along-wind sd is
 * t sd(w), the time does not vary, nothing moves across the wind. Fast and
 * full modes. */
static void test_wind_speed_uniform_air(void **state)
{
    (void)state;
    sr_mission *m = load("  wind:\n    model: constant\n    speed: 6 m/s\n    from: 270 deg\n",
                         "uncertainty:\n  drag: fixed\n  wind-speed: {distribution: normal, sigma: 1.5 m/s}\n");
    for (int full = 0; full < 2; full++) {
        sr_disp_mission dm;
        init(&dm, m, RHO, full);
        const size_t n = full ? 1500 : 20000;
        sr_disp_result res;
        sr_disp_stats st;
        run(&dm, &m->unc, n, 2, &res, &st);
        const sr_body_stats *b = &st.body[0];
        double t = b->time.mean;
        char q[128];
        CHECK_ABS_CLASS(SR_CHECK_DERIVED,
                        full ? "spread of descent time, wind only, full mode (s)"
                             : "spread of descent time, wind only (s)",
                        "the wind does not act on the vertical motion", 0.0, b->time.max - b->time.min, 1e-9 * t);
        snprintf(q, sizeof q, "along-wind sd of the landing point, sd(w) = 1.5 m/s, %s mode (m)", full ? "full" : "fast");
        CHECK_REL_CLASS(SR_CHECK_DERIVED, q, SRC_DRIFT, 1.5 * t, sqrt(b->cov_ee), 4.0 / sqrt(2.0 * (double)(n - 1)));
        snprintf(q, sizeof q, "cross-wind sd, %s mode (m)", full ? "full" : "fast");
        CHECK_ABS_CLASS(SR_CHECK_DERIVED, q, SRC_DRIFT, 0.0, sqrt(b->cov_nn), 1e-6 * t);
        snprintf(q, sizeof q, "ellipse major axis bearing, wind from 270 deg, %s mode (deg)", full ? "full" : "fast");
        CHECK_ABS_CLASS(SR_CHECK_DERIVED, q, SRC_DRIFT, 90.0, b->sigma1.bearing * 180.0 / PI, 1e-6);
        snprintf(q, sizeof q, "mean downwind drift, %s mode (m)", full ? "full" : "fast");
        CHECK_ABS_CLASS(SR_CHECK_DERIVED, q, SRC_DRIFT, 6.0 * t, b->mean_east, 4.0 * 1.5 * t / sqrt((double)n));
        sr_disp_result_release(&res);
        sr_disp_mission_free(&dm);
    }
    sr_mission_free(m);
}

/* First-deployment height and main deployment height, uniform air, calm:
 * the descent time moves by dh/v_drogue and by dh (1/v_main - 1/v_drogue). */
static void test_heights_uniform_air(void **state)
{
    (void)state;
    sr_mission *m = load("", "uncertainty:\n  drag: fixed\n  first-deployment: {distribution: normal, sigma: 40 m}\n");
    sr_disp_mission dm;
    init(&dm, m, RHO, 0);
    const size_t n = 20000;
    sr_disp_result res;
    sr_disp_stats st;
    run(&dm, &m->unc, n, 2, &res, &st);
    double vd = steady(m, 0, 1500.0, 0.0);
    double sd = 40.0 / vd, got = 0.0, mean = st.body[0].time.mean;
    for (size_t i = 0; i < n; i++)
        got += (res.land[i].time - mean) * (res.land[i].time - mean);
    got = sqrt(got / (double)(n - 1));
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "sd of descent time, first deployment sigma 40 m (s)", SRC_RATE, sd, got,
                    4.0 / sqrt(2.0 * (double)(n - 1)));
    sr_disp_result_release(&res);
    sr_disp_mission_free(&dm);
    sr_mission_free(m);

    m = load("", "uncertainty:\n  drag: fixed\n  deployment-height: {distribution: uniform, half-width: 30 m}\n");
    init(&dm, m, RHO, 0);
    run(&dm, &m->unc, n, 2, &res, &st);
    double vm = steady(m, 1, 300.0, m->stages[0].canopy.cds.typ), vd2 = steady(m, 0, 300.0, 0.0);
    /* with the drogue kept open the main's drag adds to it (previous: keep, the default) */
    double want = 60.0 / sqrt(12.0) * (1.0 / vm - 1.0 / vd2);
    mean = st.body[0].time.mean;
    got = 0.0;
    for (size_t i = 0; i < n; i++)
        got += (res.land[i].time - mean) * (res.land[i].time - mean);
    got = sqrt(got / (double)(n - 1));
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "sd of descent time, main deployment +-30 m uniform (s)", SRC_SHIFT, want, got,
                    0.03);
    /* the time is linear in the deployment height: its range is the full width */
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "range of descent time, main deployment +-30 m uniform (s)", SRC_SHIFT,
                    60.0 * (1.0 / vm - 1.0 / vd2), st.body[0].time.max - st.body[0].time.min, 0.03);
    sr_disp_result_release(&res);
    sr_disp_mission_free(&dm);
    sr_mission_free(m);
}

/* Deployment delay: a main opened dt later (the drogue steady at v_d) opens
 * v_d dt lower, so the descent time changes by dt (v_d/v_m - 1). */
static void test_delay_uniform_air(void **state)
{
    (void)state;
    const char *text = "mission: delay test (invented)\n"
                       "sections:\n  - name: body\n    mass: 4 kg\n"
                       "stages:\n  - name: drogue\n    family: cross\n    nominal-diameter: 0.7 m\n    deploy: apogee\n"
                       "  - name: main\n    family: conical\n    nominal-diameter: 2.0 m\n    deploy:\n      delay: 40 s\n"
                       "start:\n  height: 1500 m\n  speed: 0 m/s\n"
                       "uncertainty:\n  drag: fixed\n  deployment-delay: {distribution: uniform, half-width: 2 s}\n";
    sr_mission *m = sr_test_mission_text(text);
    assert_int_equal(m->unc.delay_stages, 2u);
    sr_disp_mission dm;
    init(&dm, m, RHO, 0);
    const size_t n = 4000;
    sr_disp_result res;
    sr_disp_stats st;
    run(&dm, &m->unc, n, 2, &res, &st);
    /* heights of the main's deployment: 1500 m less about 40 s of drogue descent */
    double vd = steady(m, 0, 1000.0, 0.0), vm = steady(m, 1, 0.0, m->stages[0].canopy.cds.typ);
    CHECK_REL_CLASS(
        SR_CHECK_DERIVED, "range of descent time, main delay +-2 s uniform (s)",
        "closed form, uniform air: a deployment dt later in steady descent changes the time by dt (v_d/v_m - 1)",
        4.0 * (vd / vm - 1.0), st.body[0].time.max - st.body[0].time.min, 0.01);
    sr_disp_result_release(&res);
    sr_disp_mission_free(&dm);
    sr_mission_free(m);
}

/* Mass only: touchdown speed spread sd(m)/(2m) v. */
static void test_mass_uniform_air(void **state)
{
    (void)state;
    sr_mission *m = load("", "uncertainty:\n  drag: fixed\n  mass: {distribution: normal, sigma: 4 %}\n");
    sr_disp_mission dm;
    init(&dm, m, RHO, 0);
    const size_t n = 20000;
    sr_disp_result res;
    sr_disp_stats st;
    run(&dm, &m->unc, n, 2, &res, &st);
    double mean = st.body[0].speed.mean, s2 = 0.0;
    for (size_t i = 0; i < n; i++)
        s2 += (res.land[i].speed - mean) * (res.land[i].speed - mean);
    double got = sqrt(s2 / (double)(n - 1));
    double v = steady(m, 1, 0.0, m->stages[0].canopy.cds.typ);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "median touchdown speed, nominal mass (m/s)", SRC_RATE, v, st.body[0].speed.pct[2],
                    2e-3);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "sd of touchdown speed, mass sigma 4 % (m/s)", SRC_MASS, 0.02 * v, got,
                    4.0 / sqrt(2.0 * (double)(n - 1)) + 2e-3);
    sr_disp_result_release(&res);
    sr_disp_mission_free(&dm);
    sr_mission_free(m);
}

/* Every deviation at once: same bytes at 1 and 2 threads; flags agree with
 * the outcomes. */
static void test_threads_and_flags(void **state)
{
    (void)state;
    sr_mission *m = load("  wind:\n    model: power-law\n    speed: 5 m/s\n    from: 250 deg\n",
                         "uncertainty:\n"
                         "  mass: {distribution: normal, sigma: 3 %}\n"
                         "  wind-speed: {distribution: normal, sigma: 2 m/s}\n"
                         "  wind-direction: {distribution: normal, sigma: 20 deg}\n"
                         "  first-deployment: {distribution: normal, sigma: 60 m}\n"
                         "  deployment-height: {distribution: triangular, half-width: 25 m}\n");
    sr_disp_mission dm;
    init(&dm, m, NAN, 0);
    const size_t n = 5000;
    sr_disp_result a, b;
    sr_disp_stats sa, sb;
    run(&dm, &m->unc, n, 1, &a, &sa);
    run(&dm, &m->unc, n, 2, &b, &sb);
    assert_memory_equal(a.land, b.land, n * sizeof *a.land);
    assert_memory_equal(a.flags, b.flags, n * sizeof *a.flags);
    assert_memory_equal(&sa, &sb, sizeof sa);
    size_t over_v = 0, over_d = 0;
    for (size_t i = 0; i < n; i++) {
        int v = a.land[i].speed > m->limit_speed, d = hypot(a.land[i].east, a.land[i].north) > m->limit_drift;
        assert_int_equal(!!(a.flags[i] & SR_LIMIT_SPEED), v);
        assert_int_equal(!!(a.flags[i] & SR_LIMIT_DRIFT), d);
        over_v += v;
        over_d += d;
    }
    assert_int_equal(sa.limit[0].count, over_v);
    assert_int_equal(sa.limit[3].count, over_d);
    assert_true(over_v > 0 && over_v < n);
    assert_true(over_d > 0 && over_d < n);
    sr_disp_result_release(&a);
    sr_disp_result_release(&b);
    sr_disp_mission_free(&dm);
    sr_mission_free(m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_zero_is_profile),    cmocka_unit_test(test_wind_speed_uniform_air),
        cmocka_unit_test(test_heights_uniform_air), cmocka_unit_test(test_delay_uniform_air),
        cmocka_unit_test(test_mass_uniform_air),
        cmocka_unit_test(test_threads_and_flags),
    };
    return cmocka_run_group_tests_name("dispersion_mission", tests, setup, NULL);
}
