/* test_profile.c - the staged descent against closed forms (uniform air,
 * constant wind), against the equations of motion integrated by GSL all the
 * way down, the landing-energy limit table of the trade references, the
 * closed-form transient of the fast mode, and the fast mode's error bound. */
#include "testutil.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <jansson.h>

#include "physics/atmos.h"
#include "files/catalog.h"
#include "files/mission.h"
#include "physics/profile.h"

#define PI 3.14159265358979323846
#define G0 9.80665
#define RHO 1.225

#define SRC_CLOSED "closed form, uniform density: t = sqrt(rho CdS/(2 m g0)) [dz + (z2^2-z1^2)/(2 r0)] with g(z) of the 1976 standard; drift = w t (derived)"
#define SRC_RATE "Knacke 1991 sec. 4.5: steady rate v = sqrt(2 W/(CdS rho)) (verified, canopy-handbook.md sec. 7)"
#define SRC_ODE "our equations of motion integrated all the way down (GSL 2.7 rk8pd); 0.5% is the quasi-steady model's stated bound (docs/method.md 7.7)"
#define SRC_LAG "our lag closed forms (docs/method.md 7.5) against dv/dt = g(1 - v^2/vt^2) integrated in the test (GSL 2.7 rk8pd)"
#define SRC_KE "kinetic energy at the speeds v = sqrt(2E/m) of trade-facts.md sec. 5, E = 75 ft-lbf = 101.6863 J (NIST SP 811: 1 ft-lbf = 1.3558179483314 J)"
#define SRC_FAST "fast mode against full mode (GSL rk8pd + QAG): the bound stated in profile.h"

static int setup(void **state)
{
    (void)state;
    gsl_set_error_handler_off();
    (void)sr_test_catalog();
    return 0;
}

static sr_profile_ctx *ctx_of(const sr_mission *m, double steady_tol, double rho)
{
    sr_profile_opts o;
    sr_profile_opts_init(&o);
    o.steady_tol = steady_tol;
    o.uniform_density = rho;
    sr_profile_ctx *c;
    sr_error e;
    if (sr_mission_profile(&c, m, &o, &e))
        fail_msg("context: %s", e.msg);
    return c;
}

static void run(const sr_profile_ctx *c, const sr_profile_perturb *p, sr_profile_mode mode, sr_profile_result *r)
{
    sr_error e;
    if (sr_profile_run(c, p, mode, NULL, r, NULL, &e))
        fail_msg("profile: %s", e.msg);
}

/* Time of the closed form from height h1 down to h0 (ground at z = 0). */
static double closed_time(double h_top, double cds, double m)
{
    double r0 = SR_ATMOS_R0;
    return sqrt(RHO * cds / (2 * m * G0)) * (h_top + h_top * h_top / (2 * r0));
}

static const char UNIFORM[] = "mission: uniform air check\n"
                              "site:\n"
                              "  elevation: 0 m\n"
                              "  wind: {speed: 4 m/s, from: 270 deg}\n"
                              "sections:\n"
                              "  - {name: box, mass: 5 kg}\n"
                              "stages:\n"
                              "  - {name: main, family: conical, nominal-diameter: 2 m}\n"
                              "start: {height: 1500 m, speed: 0 m/s, path-angle: 90 deg}\n";

static void test_quadrature_closed_form(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_text(UNIFORM);
    sr_profile_ctx *c = ctx_of(m, 0.01, RHO);
    sr_profile_result r;
    run(c, NULL, SR_PROFILE_FULL, &r);
    const sr_profile_stage *s = &r.stage[0];
    double cds = 0.825 * PI; /* conical typical CD0 on S0 = pi m2 */
    assert_true(s->h_steady > 1000.0 && s->h_steady < 1500.0);
    double t_qs = r.body[0].t_land - s->t_steady;
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "uniform air: steady descent time from the settled point to touchdown",
                    SRC_CLOSED, closed_time(s->h_steady, cds, 5.0), t_qs, 1e-8);
    /* the position at the steady event */
    double east_s = NAN;
    for (size_t i = 0; i < r.nevents; i++)
        if (r.events[i].kind == SR_EVENT_STEADY)
            east_s = r.events[i].east;
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "uniform air, constant wind: drift of the steady part = w t", SRC_CLOSED,
                    4.0 * t_qs, r.body[0].east - east_s, 1e-8);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "uniform air: touchdown rate", SRC_RATE, sqrt(2 * 5.0 * G0 / (RHO * cds)),
                    r.body[0].rate_land, 1e-9);
    /* the fast mode reproduces the nominal descent through its tables */
    sr_profile_result f;
    run(c, NULL, SR_PROFILE_FAST, &f);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "fast mode, nominal: descent time", SRC_FAST, r.descent_time, f.descent_time,
                    1e-7);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "fast mode, nominal: drift", SRC_FAST, r.max_drift, f.max_drift, 1e-7);
    assert_int_equal(f.ode_segments, 0);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}

typedef struct ode_case {
    const char *what;
    const char *file; /* NULL: the uniform-air mission */
    int ground_shear; /* the power law's shear grows without bound at the ground */
} ode_case;

static void test_against_ode_all_the_way(void **state)
{
    (void)state;
    const ode_case cases[] = {
        {"uniform air, constant wind", NULL, 0},
        {"club rocket, hot high site, power-law wind", "payloads/desert-club-rocket.yaml", 1},
        {"balloon instrument from 30 km, wind table", "payloads/balloon-instrument.yaml", 0},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        sr_mission *m = cases[i].file ? sr_test_mission_file(cases[i].file) : sr_test_mission_text(UNIFORM);
        double rho = cases[i].file ? NAN : RHO;
        sr_profile_ctx *q = ctx_of(m, 0.01, rho), *o = ctx_of(m, 0.0, rho);
        sr_profile_result rq, ro;
        run(q, NULL, SR_PROFILE_FULL, &rq);
        run(o, NULL, SR_PROFILE_FULL, &ro);
        char what[160];
        snprintf(what, sizeof what, "%s: descent time, quadrature after 1%% settling vs ODE to the ground", cases[i].what);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, what, SRC_ODE, ro.descent_time, rq.descent_time, 5e-3);
        snprintf(what, sizeof what, "%s: drift, quadrature vs ODE to the ground", cases[i].what);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, what, SRC_ODE, ro.max_drift, rq.max_drift, 5e-3);
        /* In the last metres of a power-law profile the shear is so strong that the body
         * meets the still air at the ground with the wind it had above, and its descent
         * rate is a little lower than the steady one the quadrature reports
         * (conservative); elsewhere the rates agree. */
        if (!cases[i].ground_shear) {
            snprintf(what, sizeof what, "%s: touchdown descent rate, quadrature vs ODE to the ground", cases[i].what);
            CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, what, SRC_ODE, ro.max_rate, rq.max_rate, 5e-3);
        } else {
            assert_true(rq.max_rate >= ro.max_rate && rq.max_rate < 1.01 * ro.max_rate);
        }
        /* and the other way: the ODE result against the quadrature one */
        assert_true(fabs(rq.descent_time - ro.descent_time) <= 5e-3 * rq.descent_time);
        assert_true(fabs(rq.max_drift - ro.max_drift) <= 5e-3 * rq.max_drift + 1e-9);
        sr_profile_ctx_free(q);
        sr_profile_ctx_free(o);
        sr_mission_free(m);
    }
}

/* ---- the closed-form transient (profile_fast.c) against GSL ---- */

typedef struct lag_par {
    double g, vt;
} lag_par;

/* y: downward speed v, time lag L, horizontal airspeed u, distance X */
static int lag_rhs(double t, const double y[], double f[], void *p)
{
    (void)t;
    const lag_par *l = p;
    f[0] = l->g * (1 - y[0] * y[0] / (l->vt * l->vt));
    f[1] = 1 - y[0] / l->vt;
    f[2] = -l->g / (l->vt * l->vt) * y[0] * y[2];
    f[3] = y[2];
    return GSL_SUCCESS;
}

static void test_lag_closed_forms(void **state)
{
    (void)state;
    const double ratios[] = {0.0, 0.3, 0.9, 0.99995, 1.0, 1.00005, 1.7, 4.0, 12.0};
    for (size_t i = 0; i < sizeof ratios / sizeof ratios[0]; i++) {
        lag_par p = {9.80665, 7.5};
        gsl_odeiv2_system sys = {lag_rhs, NULL, 4, &p};
        gsl_odeiv2_driver *d = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, 1e-6, 1e-12, 1e-12);
        double y[4] = {ratios[i] * p.vt, 0, 3.0, 0}, t = 0;
        assert_int_equal(gsl_odeiv2_driver_apply(d, &t, 80 * p.vt / p.g, y), GSL_SUCCESS);
        gsl_odeiv2_driver_free(d);
        char what[128];
        snprintf(what, sizeof what, "time lag of the steady descent, v0/vt = %g", ratios[i]);
        CHECK_ABS_CLASS(SR_CHECK_DERIVED, what, SRC_LAG, y[1], sr_profile_lag_time(ratios[i] * p.vt, p.vt, p.g), 1e-8);
        snprintf(what, sizeof what, "distance a 3 m/s horizontal airspeed carries, v0/vt = %g", ratios[i]);
        CHECK_ABS_CLASS(SR_CHECK_DERIVED, what, SRC_LAG, y[3],
                        sr_profile_lag_distance(3.0, ratios[i] * p.vt, p.vt, p.g), 1e-7);
    }
    /* from rest: the classic ln 2 and pi/2 */
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "time lag from rest (vt/g) ln 2",
                    "quadratic-drag fall from rest, closed form (derived)", 2.0 / G0 * log(2.0),
                    sr_profile_lag_time(0.0, 2.0, G0), 1e-14);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "horizontal carry from rest u0 (vt/g) pi/2",
                    "linearised horizontal decay, closed form (derived)", 2.0 / G0 * PI / 2,
                    sr_profile_lag_distance(1.0, 0.0, 2.0, G0), 1e-14);
}

/* ---- landing energy against the limit table ---- */

typedef struct ke_case {
    double mass, vmax;
} ke_case;

static const ke_case KE[] = {{0.5, 20.168}, {1, 14.261}, {2, 10.084}, {5, 6.3777}, {10, 4.5097}, {20, 3.1888}};

static void test_landing_energy_table(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof KE / sizeof KE[0]; i++) {
        /* a canopy sized to land exactly at the table's speed in uniform sea-level air */
        double s0 = 2 * KE[i].mass * G0 / (RHO * 0.825 * KE[i].vmax * KE[i].vmax);
        char yaml[1024];
        snprintf(yaml, sizeof yaml,
                 "mission: energy check\n"
                 "sections:\n"
                 "  - {name: a, mass: %.10g kg}\n"
                 "stages:\n"
                 "  - {name: main, family: conical, nominal-area: %.12g m2}\n"
                 "start: {height: 800 m, speed: 0 m/s, path-angle: 90 deg}\n"
                 "limits: {landing-energy: 75 ft-lbf}\n",
                 KE[i].mass, s0);
        sr_mission *m = sr_test_mission_text(yaml);
        CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "75 ft-lbf in J as the mission file reads it",
                        "NIST SP 811 (2008): 1 ft-lbf = 1.3558179483314 J", 101.6863, m->limit_energy, 1e-6);
        sr_profile_ctx *c = ctx_of(m, 0.01, RHO);
        sr_profile_result r;
        run(c, NULL, SR_PROFILE_FULL, &r);
        char what[128];
        snprintf(what, sizeof what, "landing energy of a %g kg section at its table speed %g m/s", KE[i].mass,
                 KE[i].vmax);
        CHECK_REL_CLASS(SR_CHECK_METHOD, what, SRC_KE, 101.6863, r.section_energy[0], 1e-4);
        sr_profile_ctx_free(c);
        sr_mission_free(m);
    }
}

static void test_energy_per_section(void **state)
{
    (void)state;
    /* tethered sections: each its own mass; a rigid pair: the pair's mass */
    sr_mission *m = sr_test_mission_text("mission: sections\n"
                         "sections:\n"
                         "  - {name: booster, mass: 3 kg}\n"
                         "  - {name: nose, mass: 1 kg, rigid-with: avionics}\n"
                         "  - {name: avionics, mass: 0.5 kg}\n"
                         "stages:\n"
                         "  - {name: main, family: conical, nominal-diameter: 2 m}\n"
                         "start: {height: 600 m, speed: 0 m/s, path-angle: 90 deg}\n");
    sr_profile_ctx *c = ctx_of(m, 0.01, RHO);
    sr_profile_result r;
    run(c, NULL, SR_PROFILE_FULL, &r);
    double v = sqrt(2 * 4.5 * G0 / (RHO * 0.825 * PI));
    CHECK_REL_CLASS(SR_CHECK_METHOD, "tethered: touchdown rate of the whole", SRC_RATE, v, r.body[0].rate_land, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "tethered section energy 1/2 m v^2", "definition of kinetic energy",
                    0.5 * 3 * v * v, r.section_energy[0], 1e-9);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "rigid pair energy 1/2 (m1+m2) v^2", "definition of kinetic energy",
                    0.5 * 1.5 * v * v, r.section_energy[1], 1e-9);
    assert_true(r.section_energy[1] == r.section_energy[2]);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}

/* ---- separation, failure, delay ---- */

static const char SPLIT[] = "mission: separation\n"
                            "sections:\n"
                            "  - {name: booster, mass: 3 kg}\n"
                            "  - {name: payload, mass: 2 kg}\n"
                            "stages:\n"
                            "  - {name: drogue, family: cross, nominal-diameter: 0.6 m}\n"
                            "  - name: booster main\n"
                            "    family: conical\n"
                            "    nominal-diameter: 1.8 m\n"
                            "    carries: [booster]\n"
                            "    deploy: {height: 300 m}\n"
                            "  - name: payload main\n"
                            "    family: conical\n"
                            "    nominal-diameter: 1.4 m\n"
                            "    carries: [payload]\n"
                            "    deploy: {delay: 4 s}\n"
                            "start: {height: 1200 m, speed: 10 m/s, path-angle: 0 deg}\n";

static void test_separation(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_text(SPLIT);
    sr_profile_ctx *c = ctx_of(m, 0.01, RHO);
    sr_profile_result r;
    run(c, NULL, SR_PROFILE_FULL, &r);
    assert_int_equal(r.nbodies, 2);
    double cd_dro = 0.725 * PI * 0.09, cd_bm = 0.825 * PI * 0.81, cd_pm = 0.825 * PI * 0.49;
    /* 4 s after the drogue the payload separates under its main; the booster keeps the drogue and adds its
     * own main at 300 m */
    CHECK_REL_CLASS(SR_CHECK_METHOD, "separated payload under its main", SRC_RATE, sqrt(2 * 2 * G0 / (RHO * cd_pm)),
                    r.body[1].rate_land, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "booster under drogue and its main", SRC_RATE,
                    sqrt(2 * 3 * G0 / (RHO * (cd_dro + cd_bm))), r.body[0].rate_land, 1e-9);
    /* the delay counts from the drogue, the last deployment on the payload's sections */
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "payload main 4 s after the drogue", "the mission file's delay (definition)",
                    4.0, r.stage[2].t_deploy, 1e-9);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "booster main at its height", "the mission file's height (definition)", 300.0,
                    r.stage[1].h_deploy, 1e-6);
    assert_int_equal(r.stage[1].body, 0);
    assert_int_equal(r.stage[2].body, 1);
    assert_int_equal(r.body[1].parent, 0);
    assert_int_equal(r.section_body[0], 0);
    assert_int_equal(r.section_body[1], 1);
    /* events come sorted in time */
    for (size_t i = 1; i < r.nevents; i++)
        assert_true(r.events[i].t >= r.events[i - 1].t);
    sr_profile_ctx_free(c);

    /* failure case: the booster main does not open, the booster stays on the drogue with the payload */
    sr_profile_opts o;
    sr_profile_opts_init(&o);
    o.uniform_density = RHO;
    o.failed = 1u << 1;
    sr_error e;
    assert_int_equal(sr_mission_profile(&c, m, &o, &e), SR_OK);
    run(c, NULL, SR_PROFILE_FULL, &r);
    assert_int_equal(r.stage[1].deployed, 0);
    /* the payload main then carries part of the body: the payload separates with it */
    assert_int_equal(r.nbodies, 2);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "failure case: booster lands on the drogue alone", SRC_RATE,
                    sqrt(2 * 3 * G0 / (RHO * cd_dro)), r.body[0].rate_land, 1e-9);
    sr_profile_ctx_free(c);
    o.failed = 7;
    assert_int_equal(sr_mission_profile(&c, m, &o, &e), SR_OK);
    run(c, NULL, SR_PROFILE_FULL, &r);
    /* no canopy, no body drag: free fall from 1200 m starting level at 10 m/s */
    CHECK_REL_CLASS(SR_CHECK_METHOD, "no canopy, no drag: impact descent rate sqrt(2 g h)",
                    "free fall without drag, v = sqrt(2 g0 h) (g(z) of the 1976 standard lowers it by 1e-4)",
                    sqrt(2 * 1200 * G0), r.body[0].rate_land, 3e-4);
    assert_int_equal(r.body[0].canopies, 0);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}

/* ---- the fast mode's error against the full mode ---- */

static void test_fast_bound(void **state)
{
    (void)state;
    const char *files[] = {"payloads/desert-club-rocket.yaml", "payloads/desert-club-rocket-revised.yaml",
                           "payloads/balloon-instrument.yaml", "payloads/drone-cargo-drop.yaml"};
    double worst_t = 0, worst_x = 0;
    for (size_t f = 0; f < sizeof files / sizeof files[0]; f++) {
        sr_mission *m = sr_test_mission_file(files[f]);
        sr_profile_ctx *c = ctx_of(m, 0.01, NAN);
        for (int i = 0; i < 64; i++) {
            sr_profile_perturb p;
            sr_profile_perturb_init(&p);
            /* corners and mid points of a generous uncertainty box */
            for (size_t k = 0; k < m->nstages; k++)
                p.drag_scale[k] = (i >> k) & 1 ? 1.15 : 0.85;
            p.mass_scale = (i & 4) ? 1.1 : 0.92;
            p.wind_scale = (i & 8) ? 1.4 : 0.6;
            p.wind_turn = (i & 16) ? 0.4 : -0.3;
            p.wind_east = (i & 32) ? 1.5 : -1.0;
            p.start_height = (i & 1) ? 0.04 * m->start_height : -0.04 * m->start_height;
            for (size_t k = 0; k < m->nstages; k++)
                if (m->stages[k].deploy == SR_DEPLOY_ALTITUDE)
                    p.deploy_height[k] = (i & 2) ? 25.0 : -25.0;
            sr_profile_result a, b;
            run(c, &p, SR_PROFILE_FULL, &a);
            run(c, &p, SR_PROFILE_FAST, &b);
            double et = fabs(a.descent_time - b.descent_time) / a.descent_time;
            double ex = 0;
            for (size_t j = 0; j < a.nbodies; j++)
                ex = fmax(ex, hypot(a.body[j].east - b.body[j].east, a.body[j].north - b.body[j].north) /
                                  fmax(a.body[j].drift, 50.0));
            worst_t = fmax(worst_t, et);
            worst_x = fmax(worst_x, ex);
            assert_true(fabs(a.max_rate - b.max_rate) <= 1e-3 * a.max_rate);
        }
        sr_profile_ctx_free(c);
        sr_mission_free(m);
    }
    print_message("fast vs full: worst descent-time error %.2e, worst landing-point error %.2e of the drift\n", worst_t,
                  worst_x);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY,
                    "fast mode: worst relative descent-time error over the demo missions' uncertainty box", SRC_FAST,
                    0.0, worst_t, 2e-3);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY,
                    "fast mode: worst landing-point error over the demo missions' uncertainty box (fraction of drift, "
                    "at least 50 m)",
                    SRC_FAST, 0.0, worst_x, 1e-2);
}

/* ---- thread safety: one context, many threads ---- */

static void test_threads(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket.yaml");
    sr_profile_ctx *c = ctx_of(m, 0.01, NAN);
    enum { N = 400 };
    static double serial[N], parallel[N];
    for (int i = 0; i < N; i++) {
        sr_profile_perturb p;
        sr_profile_perturb_init(&p);
        p.wind_scale = 0.5 + i / (double)N;
        p.drag_scale[1] = 0.9 + 0.2 * i / N;
        sr_profile_result r;
        run(c, &p, SR_PROFILE_FAST, &r);
        serial[i] = r.body[0].east + r.descent_time;
    }
    int bad = 0;
#pragma omp parallel for num_threads(2) reduction(+ : bad)
    for (int i = 0; i < N; i++) {
        sr_profile_perturb p;
        sr_profile_perturb_init(&p);
        p.wind_scale = 0.5 + i / (double)N;
        p.drag_scale[1] = 0.9 + 0.2 * i / N;
        sr_profile_result r;
        sr_error e;
        if (sr_profile_run(c, &p, SR_PROFILE_FAST, NULL, &r, NULL, &e))
            bad++;
        else
            parallel[i] = r.body[0].east + r.descent_time;
    }
    assert_int_equal(bad, 0);
    assert_memory_equal(serial, parallel, sizeof serial);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}


/* ---- slow and odd descents: they finish, or fail with one line naming the stage and the cause ---- */

static void test_slow_descent(void **state)
{
    (void)state;
    /* the case: a 0.35 kg payload under a 7 m canopy (a cm -> m slip), about 0.47 m/s */
    const char *slow = sr_test_tmpfile(".yaml", "mission: slow\n"
                                                "site: {elevation: 1380 m, temperature: 38 C, pressure: 858 hPa,\n"
                                                "  wind: {model: power-law, speed: 5 m/s, from: 250 deg}}\n"
                                                "sections: [{name: payload, mass: 0.35 kg}]\n"
                                                "stages:\n  - {name: drogue, family: cross, nominal-diameter: 0.6 m,"
                                                " deploy: apogee}\n"
                                                "  - {name: main, family: conical, nominal-diameter: 7 m, deploy: "
                                                "{height: 200 m}}\n"
                                                "start: {height: 1000 m, speed: 12 m/s, path-angle: 0 deg}\n"
                                                "limits: {touchdown-speed: 5 m/s}\n");
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", slow, "--format", "json", NULL);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    assert_non_null(j);
    double v = json_number_value(json_object_get(json_object_get(json_object_get(j, "values"), "touchdown_rate"),
                                                 "typical"));
    sr_air air;
    sr_atmos a;
    assert_int_equal(sr_atmos_init_site(&a, 1380, 311.15, 85800, NULL), SR_OK);
    assert_int_equal(sr_atmos_at(&a, 1380, &air, NULL), SR_OK);
    double cds = 0.825 * PI * 49 / 4 + 0.725 * PI * 0.36 / 4;
    CHECK_REL_CLASS(SR_CHECK_METHOD, "0.35 kg under a 7 m conical main (and the drogue): touchdown rate (m/s)",
                    "Knacke 1991 sec. 4.5 (verified): v = sqrt(2 m g / (rho CdS)), site air of the 1976 standard",
                    sqrt(2 * 0.35 * air.g / (air.rho * cds)), v, 2e-3);
    assert_true(v < 0.5);
    json_decref(j);
    free(out);
    free(err);
    /* so slow that no step size fits the filling: one line, the stage and the cause, at once; check says the same */
    const char *stuck = sr_test_tmpfile(".yaml", "mission: a cm to m slip\n"
                                                 "sections: [{name: payload, mass: 1 g}]\n"
                                                 "stages:\n  - {name: main, family: conical, nominal-diameter: 20 m,"
                                                 " deploy: release}\n"
                                                 "start: {height: 300 m, speed: 0 m/s}\n");
    rc = sr_test_cli(&out, &err, "profile", stuck, NULL);
    assert_int_equal(rc, 2);
    assert_int_equal(sr_test_lines(err), 1);
    assert_string_equal(out, "");
    assert_non_null(strstr(err, "stage 'main'"));
    assert_non_null(strstr(err, "descent rate is only"));
    assert_non_null(strstr(err, "wrong unit"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "check", stuck, NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "`sinkrate profile` would fail: stage 'main'"));
    free(out);
    free(err);
    /* and check accepts what profile accepts */
    rc = sr_test_cli(&out, &err, "check", slow, NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "its descent flies"));
    free(out);
    free(err);
}

/* A section with neither drag-area: nor body: falls in vacuum: a warning says so. */
static void test_no_drag_warning(void **state)
{
    (void)state;
    const char *path = sr_test_tmpfile(".yaml", "mission: m\nsections: [{name: box, mass: 2 kg}]\n"
                                                "stages:\n  - {name: main, family: conical, nominal-diameter: 1.5 m,"
                                                " deploy: {delay: 3 s}}\n"
                                                "start: {height: 500 m, speed: 0 m/s}\n");
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", path, NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "no drag of its own at all"));
    free(out);
    free(err);
}

/* ---- the command ---- */

static void test_cli(void **state)
{
    (void)state;
    char *out, *err;
    /* the demo as first drawn comes down too slowly and drifts too far: exit 1, one line per limit */
    int rc = sr_test_cli(&out, &err, "profile", sr_test_path("payloads/desert-club-rocket.yaml"), NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "limit exceeded: descent time"));
    assert_non_null(strstr(err, "limit exceeded: drift"));
    assert_int_equal(sr_test_lines(err), 2);
    assert_non_null(strstr(out, "EXCEEDED"));
    free(out);
    free(err);
    /* the revised design meets them */
    rc = sr_test_cli(&out, &err, "profile", sr_test_path("payloads/desert-club-rocket-revised.yaml"), NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "CAUTION"));
    assert_non_null(strstr(out, "Event timeline"));
    assert_non_null(strstr(out, "touchdown"));
    assert_non_null(strstr(out, "Limits"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "profile", "--format", "json", sr_test_path("payloads/desert-club-rocket-revised.yaml"),
                     NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "\"caution\""));
    assert_non_null(strstr(out, "\"timeline\""));
    free(out);
    free(err);
    /* a failure case breaks the touchdown limit: exit 1 with one clear line */
    rc = sr_test_cli(&out, &err, "profile", "--fail", "main", sr_test_path("payloads/desert-club-rocket.yaml"), NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "limit exceeded: touchdown descent rate"));
    assert_non_null(strstr(out, "FAILURE CASE"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "profile", "--fail", "mainn", sr_test_path("payloads/desert-club-rocket.yaml"), NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "did you mean 'main'"));
    free(out);
    free(err);
    /* the energy limit: 2 kg landing at 10.2 m/s is over 75 ft-lbf */
    double s0 = 2 * 2 * G0 / (1.225 * 0.825 * 10.2 * 10.2);
    char yaml[1024];
    snprintf(yaml, sizeof yaml,
             "mission: over the limit\n"
             "sections:\n  - {name: a, mass: 2 kg}\n"
             "stages:\n  - {name: main, family: conical, nominal-area: %.10g m2}\n"
             "start: {height: 300 m}\n"
             "limits: {landing-energy: 75 ft-lbf}\n",
             s0);
    rc = sr_test_cli(&out, &err, "profile", sr_test_tmpfile(".yaml", yaml), NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "limit exceeded: landing energy"));
    free(out);
    free(err);
}

static void test_plot(void **state)
{
    (void)state;
    char prefix[] = "/tmp/sinkrate-test-plot-XXXXXX";
    int fd = mkstemp(prefix);
    assert_true(fd >= 0);
    close(fd);
    unlink(prefix);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", "--plot", prefix, "--units", "us",
                         sr_test_path("payloads/desert-club-rocket-revised.yaml"), NULL);
    assert_int_equal(rc, 0);
    free(out);
    free(err);
    const char *ext[] = {".dat", ".gp", "-track.dat", "-track.gp"};
    for (int i = 0; i < 4; i++) {
        char path[256];
        snprintf(path, sizeof path, "%s%s", prefix, ext[i]);
        FILE *f = fopen(path, "r");
        assert_non_null(f);
        char buf[8192];
        size_t n = fread(buf, 1, sizeof buf - 1, f);
        buf[n] = '\0';
        fclose(f);
        assert_non_null(strstr(buf, "CAUTION"));
        if (i == 1)
            assert_non_null(strstr(buf, "height [ft]"));
        if (i == 3)
            assert_non_null(strstr(buf, "drift limit"));
        unlink(path);
    }
    const char *img[] = {".png", "-track.png"};
    for (int i = 0; i < 2; i++) {
        char png[256];
        snprintf(png, sizeof png, "%s%s", prefix, img[i]);
        if (access("/usr/bin/gnuplot", X_OK) == 0)
            assert_int_equal(access(png, R_OK), 0);
        unlink(png);
    }
}

/* A start that climbs far above itself: the canopy opens at 11 km and its
 * transient ends at the equilibrium of the air there (the height tables
 * reach the drag-free climb), not of the air where the tables used to end. */
static void test_climbing_start(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_text("mission: climb\n"
                         "sections:\n"
                         "  - {name: a, mass: 2 kg}\n"
                         "stages:\n"
                         "  - {name: main, family: conical, nominal-diameter: 1.5 m, deploy: {delay: 20 s}}\n"
                         "start: {height: 3000 m, speed: 500 m/s, path-angle: -90 deg}\n");
    sr_profile_ctx *c = ctx_of(m, 0.01, NAN);
    sr_profile_result r;
    run(c, NULL, SR_PROFILE_FULL, &r);
    const sr_profile_event *dep = NULL, *steady = NULL;
    for (size_t i = 0; i < r.nevents; i++) {
        if (r.events[i].kind == SR_EVENT_DEPLOY && !dep)
            dep = &r.events[i];
        if (r.events[i].kind == SR_EVENT_STEADY && !steady)
            steady = &r.events[i];
    }
    assert_non_null(dep);
    assert_non_null(steady);
    /* no drag before the deployment: h = h0 + v t - g t^2 / 2 (g varies 0.3 % over the climb) */
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "height of a drag-free climb after 20 s",
                    "kinematics, uniform gravity (docs/method.md, staged descent)", 3000.0 + 500.0 * 20 - 0.5 * G0 * 400,
                    dep->h, 2e-3);
    /* the equilibrium rate in the 1976 air at that height, as the transient ends within 1 % of it */
    double rho;
    sr_error e;
    assert_int_equal(sr_atmos_density(&m->atmos, m->ground + steady->h, &rho, &e), SR_OK);
    double cds = sr_canopy_total_cds(&m->stages[0].canopy).typ;
    double v = sqrt(2.0 * 2.0 * sr_atmos_gravity(m->ground + steady->h) / (rho * cds));
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "descent rate where a climbing start's transient ends (11 km)",
                    "equilibrium W = 1/2 rho v^2 CdS in the 1976 air at that height", v, steady->rate, 0.011);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_quadrature_closed_form), cmocka_unit_test(test_against_ode_all_the_way),
        cmocka_unit_test(test_lag_closed_forms),       cmocka_unit_test(test_landing_energy_table),
        cmocka_unit_test(test_energy_per_section),     cmocka_unit_test(test_separation),
        cmocka_unit_test(test_fast_bound),             cmocka_unit_test(test_threads),
        cmocka_unit_test(test_cli),                    cmocka_unit_test(test_plot),
        cmocka_unit_test(test_slow_descent),           cmocka_unit_test(test_no_drag_warning),
        cmocka_unit_test(test_climbing_start),
    };
    return cmocka_run_group_tests_name("profile", tests, setup, NULL);
}
