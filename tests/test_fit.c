/* test_fit.c - the drag-area fit against logs whose truth is known: a
 * two-stage descent in an isothermal layer written here in closed form (not
 * the profile code), with noise, spikes, an ejection-charge spike and a
 * dropout; the coverage of the 95 % interval over seeded logs; the
 * pressure-altitude conversion on a hot day against a hand computation from
 * the 1976 standard; logs made by the staged descent of each demo mission
 * fitted back to the mission's drag areas; pooling; the segments. */
#include "testutil.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/fit.h"
#include "base/rng.h"
#include "files/catalog.h"
#include "files/flightlog.h"
#include "files/mission.h"
#include "physics/atmos.h"
#include "physics/opening.h"
#include "physics/profile.h"

#define G0 9.80665
#define PI 3.14159265358979323846
#define SRC_CLOSED                                                                                                \
    "closed form of the steady descent in an isothermal layer, rho = rho0 exp(-z/Hs), constant g: z(t) = -2 Hs "   \
    "ln(exp(-z0/2Hs) + v0 t/2Hs) (Knacke 1991 sec. 4.5 steady rate v = sqrt(2W/(CdS rho)), integrated in closed "  \
    "form)"
#define SRC_1976                                                                                                  \
    "U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562) eq. 33a (pressure in a layer of constant lapse) and the "    \
    "hypsometric equation dH = (R*/g0 M0) T dln p, by hand with T = T_std + dT at each pressure"

static int setup(void **state)
{
    (void)state;
    gsl_set_error_handler_off();
    (void)sr_test_catalog();
    return 0;
}

/* ---- the synthetic log: an isothermal layer, written here ---- */

#define HS 8000.0      /* scale height of the layer, m */
#define T_ISO 288.15   /* K */
#define P_ISO 101325.0 /* Pa at z = 0 */

static double rho0(void)
{
    return P_ISO * 28.9644e-3 / (8.31432 * T_ISO);
}

/* the layer as a sounding: T constant, ln p linear in z, so the model's
 * interpolation is exact */
static void iso_atmos(sr_atmos *m)
{
    double z[45], T[45], p[45];
    for (int i = 0; i < 45; i++) {
        z[i] = -1000.0 + 500.0 * i;
        T[i] = T_ISO;
        p[i] = P_ISO * exp(-z[i] / HS);
    }
    sr_error e;
    if (sr_atmos_init_sounding(m, z, T, p, 45, &e))
        fail_msg("sounding: %s", e.msg);
}

/* steady descent from z0 at t0 under mass m and drag area C, closed form */
static double closed_z(double z0, double t, double m, double C)
{
    double v0 = sqrt(2.0 * m * G0 / (rho0() * C));
    return -2.0 * HS * log(exp(-z0 / (2.0 * HS)) + v0 * t / (2.0 * HS));
}

typedef struct synth {
    double za, zmain;   /* apogee and main deployment, m */
    double m, c1, c2;   /* mass, drogue and main drag areas */
    double hz, sigma;   /* rate, noise */
    double rho_ar;      /* AR(1) correlation of the noise */
    int spikes, dropout;
} synth;

/* A log as CSV text: a coast to apogee, the drogue at apogee, the main at
 * zmain (its height continues the drogue's closed form), 3 s on the ground. */
static char *synth_log(const synth *S, uint64_t seed, size_t *len_out)
{
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    sr_rng_seek(r, sr_rng_key(seed, 14, 0));
    double ta = sqrt(2.0 * S->za / G0);
    /* time of the main: closed form inverted, w = exp(-z/2Hs) */
    double v1 = sqrt(2.0 * S->m * G0 / (rho0() * S->c1)), v2 = sqrt(2.0 * S->m * G0 / (rho0() * S->c2));
    double tm = 2.0 * HS * (exp(-S->zmain / (2 * HS)) - exp(-S->za / (2 * HS))) / v1;
    double tg = 2.0 * HS * (1.0 - exp(-S->zmain / (2 * HS))) / v2;
    double tend = ta + tm + tg + 3.0;
    size_t cap = (size_t)(tend * S->hz + 10) * 40 + 64;
    char *b = malloc(cap);
    size_t len = (size_t)snprintf(b, cap, "time [s],height [m]\n");
    double e = 0.0;
    size_t i = 0, drop_at = (size_t)((ta + 0.6 * tm) * S->hz);
    for (double t = 0.0; t < tend; t = (double)(++i) / S->hz) {
        double z;
        if (t < ta)
            z = S->za - 0.5 * G0 * (ta - t) * (ta - t);
        else if (t < ta + tm)
            z = closed_z(S->za, t - ta, S->m, S->c1);
        else if (t < ta + tm + tg)
            z = closed_z(S->zmain, t - ta - tm, S->m, S->c2);
        else
            z = 0.0;
        if (z < 0)
            z = 0;
        e = S->rho_ar * e + sqrt(1.0 - S->rho_ar * S->rho_ar) * gsl_ran_gaussian(r, S->sigma);
        double y = z + e;
        if (S->spikes) {
            /* an ejection charge at each deployment: the bay's pressure rises, the height reads low */
            if ((t >= ta && t < ta + 0.15) || (t >= ta + tm && t < ta + tm + 0.15))
                y -= 45.0;
            if (gsl_rng_uniform(r) < 0.003)
                y += (gsl_rng_uniform(r) < 0.5 ? -1 : 1) * (30.0 + 70.0 * gsl_rng_uniform(r));
        }
        if (S->dropout && i >= drop_at && i < drop_at + (size_t)(0.6 * S->hz))
            y = 0.0;
        len += (size_t)snprintf(b + len, cap - len, "%.3f,%.2f\n", t, y);
    }
    gsl_rng_free(r);
    *len_out = len;
    return b;
}

static const synth BASE = {.za = 1500, .zmain = 300, .m = 3.0, .c1 = 0.25, .c2 = 2.2, .hz = 20, .sigma = 1.5,
                           .rho_ar = 0.0, .spikes = 1, .dropout = 1};

static int fit_synth(const synth *S, uint64_t seed, sr_fit_result *r, sr_error *e)
{
    size_t len;
    char *b = synth_log(S, seed, &len);
    sr_flightlog log;
    int rc = sr_flightlog_parse(&log, "synth.csv", b, len, 0, e);
    free(b);
    if (rc)
        return rc;
    sr_atmos atm;
    iso_atmos(&atm);
    sr_fit_setup s;
    sr_fit_setup_init(&s);
    s.atmos = &atm;
    s.ground = 0.0;
    s.gravity = G0;
    s.mass = S->m;
    rc = sr_fit_log(&log, &s, r, e);
    sr_flightlog_free(&log);
    sr_atmos_release(&atm);
    return rc;
}

static void test_synthetic_recovers(void **state)
{
    (void)state;
    sr_fit_result r;
    sr_error e;
    if (fit_synth(&BASE, 1, &r, &e))
        fail_msg("fit: %s", e.msg);
    assert_int_equal(r.nstages, 2);
    double truth[2] = {BASE.c1, BASE.c2};
    for (int k = 0; k < 2; k++) {
        const sr_fit_stage *st = &r.stage[k];
        print_message("stage %d: CdS %.5f [%.5f, %.5f] truth %.5f, %zu points, %zu rejected, rms %.3f m, rho1 %.3f\n",
                      k + 1, st->cds, st->cds_lo, st->cds_hi, truth[k], st->npoints, st->nrejected, st->rms, st->rho1);
        assert_true(st->cds_lo <= truth[k] && truth[k] <= st->cds_hi);
        /* the estimate itself within 1 % (the interval is far narrower) */
        CHECK_REL_CLASS(SR_CHECK_METHOD, k ? "fitted main drag area, synthetic log with noise, spikes, dropout"
                                           : "fitted drogue drag area, synthetic log with noise, spikes, dropout",
                        SRC_CLOSED, truth[k], st->cds, 0.01);
    }
    assert_true(r.stage[0].nrejected + r.stage[1].nrejected >= 12); /* the dropout and the spikes went */
    /* the deployment found within a second of the truth */
    double ta = sqrt(2.0 * BASE.za / G0);
    double v1 = sqrt(2.0 * BASE.m * G0 / (rho0() * BASE.c1));
    double tm = ta + 2.0 * HS * (exp(-BASE.zmain / (2 * HS)) - exp(-BASE.za / (2 * HS))) / v1;
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "apogee time found in a synthetic log, s", SRC_CLOSED, ta, r.t_apogee, 0.5);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "main deployment time found (ejection spike not taken), s", SRC_CLOSED, tm,
                    r.stage[1].t_deploy, 1.0);
    sr_fit_result_free(&r);
}

/* Coverage of the 95 % interval over seeded logs: it must cover the truth in
 * 90 .. 98 % of them (white noise, and AR(1) noise of correlation 0.6). */
static void coverage(const synth *S, int nlogs, const char *what)
{
    int cover[2] = {0, 0}, fitted = 0;
    for (int i = 0; i < nlogs; i++) {
        sr_fit_result r;
        sr_error e;
        if (fit_synth(S, 1000 + (uint64_t)i, &r, &e))
            fail_msg("log %d: %s", i, e.msg);
        fitted++;
        cover[0] += r.stage[0].cds_lo <= S->c1 && S->c1 <= r.stage[0].cds_hi;
        cover[1] += r.stage[1].cds_lo <= S->c2 && S->c2 <= r.stage[1].cds_hi;
        sr_fit_result_free(&r);
    }
    for (int k = 0; k < 2; k++) {
        double frac = (double)cover[k] / fitted;
        char q[200];
        snprintf(q, sizeof q, "coverage of the 95 %% interval, %s stage, %d seeded logs (%s)", k ? "main" : "drogue",
                 nlogs, what);
        print_message("%s: %.3f\n", q, frac);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_CLOSED "; nominal 0.95, accepted 0.90 .. 0.98", 0.94, frac, 0.04);
    }
}

static void test_coverage_white(void **state)
{
    (void)state;
    coverage(&BASE, 200, "white noise 1.5 m, spikes, dropout");
}

static void test_coverage_correlated(void **state)
{
    (void)state;
    synth S = BASE;
    S.rho_ar = 0.6;
    coverage(&S, 200, "AR(1) noise 1.5 m, correlation 0.6, spikes, dropout");
}


/* ---- pressure altitude on a hot day, by hand from the 1976 standard ---- */

#define R_STAR 8.31432
#define M0 28.9644e-3
#define LAPSE 0.0065
#define T0 288.15
#define P0 101325.0
#define R0 6356766.0

static double geopot(double z)
{
    return R0 * z / (R0 + z);
}

/* 1976 eq. 33a in the first layer, base temperature Tb at geopotential Hb, pressure pb */
static double p_layer(double H, double Tb, double Hb, double pb)
{
    return pb * pow((Tb - LAPSE * (H - Hb)) / Tb, G0 * M0 / (R_STAR * LAPSE));
}

static double H_layer(double p, double Tb, double Hb, double pb)
{
    return Hb + Tb / LAPSE * (1.0 - pow(p / pb, R_STAR * LAPSE / (G0 * M0)));
}

static void test_pressure_altitude_hot_day(void **state)
{
    (void)state;
    /* the desert site of the demo mission: 1380 m, 38 C, 858 hPa; a hot day */
    double zs = 1380.0, Ts = 311.15, ps = 85800.0;
    double Hs = geopot(zs);
    double Tb = Ts; /* the site model keeps T - T_std at all heights: the layer's base temperature is Ts at Hs */
    double Hpad = H_layer(ps, T0, 0.0, P0); /* the altimeter's zero: the pressure altitude of the pad */
    /* a log: true height falling 9 m/s from 2000 m; the reading is the pressure altitude above the pad */
    size_t cap = 200000, len = 0;
    char *b = malloc(cap);
    len += (size_t)snprintf(b + len, cap - len, "time [s],height [m]\n");
    double truth[600];
    size_t rows = 0;
    for (double t = 0; t < 230.0 + 4.0; t += 0.5) {
        double h = t < 230.0 ? 2000.0 - 8.7 * t : 0.0;
        if (h < 0)
            h = 0;
        double p = p_layer(geopot(zs + h), Tb, Hs, ps);
        double reading = H_layer(p, T0, 0.0, P0) - Hpad;
        truth[rows++] = h;
        len += (size_t)snprintf(b + len, cap - len, "%.2f,%.6f\n", t, reading);
    }
    sr_flightlog log;
    sr_error e;
    if (sr_flightlog_parse(&log, "hot.csv", b, len, 0, &e))
        fail_msg("%s", e.msg);
    free(b);
    sr_atmos atm;
    if (sr_atmos_init_site(&atm, zs, Ts, ps, &e))
        fail_msg("%s", e.msg);
    sr_fit_setup s;
    sr_fit_setup_init(&s);
    s.atmos = &atm;
    s.ground = zs;
    s.pressure_altitude = 1;
    s.mass = 5.0;
    sr_fit_result r;
    if (sr_fit_log(&log, &s, &r, &e))
        fail_msg("%s", e.msg);
    static const size_t ROWS[] = {0, 100, 200, 300, 400};
    for (size_t k = 0; k < sizeof ROWS / sizeof ROWS[0]; k++) {
        size_t i = ROWS[k];
        if (i >= rows || i >= r.n)
            continue;
        char q[160];
        snprintf(q, sizeof q, "true height from a pressure altitude of %.1f m, site 1380 m 38 C 858 hPa, m",
                 log.v[i]);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_1976, truth[i], r.h[i], 0.02);
    }
    /* on this hot day the pressure altitude reads the height change short: the conversion lowers CdS */
    assert_true(r.stage[0].cds < r.stage[0].cds_raw);
    sr_fit_result_free(&r);
    sr_flightlog_free(&log);
    sr_atmos_release(&atm);
}

/* ---- logs made by the staged descent of each demo mission, fitted back ---- */

static void test_profile_logs_fitted_back(void **state)
{
    (void)state;
    static const struct {
        const char *file;
        double hz;
    } MISSIONS[] = {{"payloads/desert-club-rocket.yaml", 20},
                    {"payloads/desert-club-rocket-revised.yaml", 20},
                    {"payloads/drone-cargo-drop.yaml", 20},
                    {"payloads/balloon-instrument.yaml", 2}};
    for (size_t q = 0; q < sizeof MISSIONS / sizeof MISSIONS[0]; q++) {
        sr_mission *m = sr_test_mission_file(MISSIONS[q].file);
        sr_error e;
        sr_profile_ctx *ctx;
        if (sr_mission_profile(&ctx, m, NULL, &e))
            fail_msg("%s", e.msg);
        sr_profile_track tr = {.cap = 400000, .dt = 0.05};
        tr.pt = malloc(tr.cap * sizeof *tr.pt);
        sr_profile_result *res = malloc(sizeof *res);
        if (sr_profile_run(ctx, NULL, SR_PROFILE_FULL, NULL, res, &tr, &e))
            fail_msg("%s", e.msg);
        /* the log: height above ground at a fixed rate from the start, 3 s on the ground after */
        double tend = res->descent_time + 3.0;
        size_t cap = (size_t)(tend * MISSIONS[q].hz + 16) * 32 + 64, len = 0, k = 0;
        char *b = malloc(cap);
        len += (size_t)snprintf(b + len, cap - len, "time [s],height [m]\n");
        for (size_t i = 0;; i++) {
            double t = (double)i / MISSIONS[q].hz;
            if (t > tend)
                break;
            double h = 0;
            if (t < res->descent_time) {
                while (k + 1 < tr.n && tr.pt[k + 1].t <= t)
                    k++;
                const sr_profile_point *a = &tr.pt[k], *c = &tr.pt[k + 1 < tr.n ? k + 1 : k];
                double u = c->t > a->t ? (t - a->t) / (c->t - a->t) : 0;
                h = a->h + u * (c->h - a->h);
            }
            len += (size_t)snprintf(b + len, cap - len, "%.3f,%.4f\n", t, h);
        }
        sr_flightlog log;
        if (sr_flightlog_parse(&log, MISSIONS[q].file, b, len, 0, &e))
            fail_msg("%s", e.msg);
        free(b);
        sr_fit_setup s;
        sr_fit_setup_init(&s);
        s.atmos = &m->atmos;
        s.ground = m->ground;
        if (sr_fit_stages_from_mission(m, &s, &e))
            fail_msg("%s", e.msg);
        sr_fit_result r;
        if (sr_fit_log(&log, &s, &r, &e))
            fail_msg("%s: %s", MISSIONS[q].file, e.msg);
        for (size_t st = 0; st < m->nstages; st++) {
            double want = sr_canopy_total_cds(&m->stages[st].canopy).typ;
            char what[200];
            snprintf(what, sizeof what, "%s, stage %s: canopy drag area fitted to its profile log, m2",
                     MISSIONS[q].file + 9, m->stages[st].name);
            print_message("%s: %.5f (mission %.5f), CI %.5f .. %.5f\n", what, r.stage[st].own, want,
                          r.stage[st].own_lo, r.stage[st].own_hi);
            CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, what,
                            "the mission's drag area (typical CD0 x S0), flown by sr_profile_run (full mode)", want,
                            r.stage[st].own, 0.005);
        }
        sr_fit_result_free(&r);
        sr_flightlog_free(&log);
        free(res);
        free(tr.pt);
        sr_profile_ctx_free(ctx);
        sr_mission_free(m);
    }
}

/* ---- the command ---- */

#define DEMO_ARGS "fit", sr_test_path("payloads/demo-flight.csv"), "--mission", \
    sr_test_path("payloads/desert-club-rocket.yaml"), "--pressure-altitude"

static void test_cli_demo(void **state)
{
    (void)state;
    char *out, *err;
    /* text, CSV and JSON, each with the caution */
    static const char *const FORMATS[] = {"text", "csv", "json"};
    for (int f = 0; f < 3; f++) {
        int rc = sr_test_cli(&out, &err, DEMO_ARGS, "--format", FORMATS[f], NULL);
        if (rc)
            fail_msg("exit %d: %s", rc, err);
        assert_true(strstr(out, "CAUTION") || strstr(out, "caution"));
        assert_non_null(strstr(out, f == 0 ? "inside" : "in_band"));
        free(out);
        free(err);
    }
    /* a canopy file that the loaders accept, with the measured band */
    const char *canopy = sr_test_tmpfile(".yaml", "");
    int rc = sr_test_cli(&out, &err, DEMO_ARGS, "--write-canopy", canopy, "--stage", "main", NULL);
    if (rc)
        fail_msg("exit %d: %s", rc, err);
    free(out);
    free(err);
    sr_canopy cp;
    sr_error e;
    if (sr_catalog_load_canopy(&cp, sr_test_catalog(), canopy, &e))
        fail_msg("%s", e.msg);
    assert_true(cp.measured);
    assert_true(cp.cd.v.lo < cp.cd.v.typ && cp.cd.v.typ < cp.cd.v.hi);
    assert_non_null(strstr(cp.cd_source, "demo-flight.csv"));
    /* the demo was flown with the conical main at its typical CD0: the measured band holds it */
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "main CD0 measured from the demo log, written to a canopy file",
                    "the demo mission's typical CD0 of the conical family (the log's truth)", 0.825, cp.cd.v.typ,
                    0.01);
    /* rate takes it like any canopy file */
    rc = sr_test_cli(&out, &err, "rate", "--canopy", canopy, "--mass", "5.3 kg", NULL);
    assert_int_equal(rc, 0);
    free(out);
    free(err);
    /* two flights pooled (the same log twice: the pooled interval is the single one over sqrt 2) */
    rc = sr_test_cli(&out, &err, DEMO_ARGS, sr_test_path("payloads/demo-flight.csv"), "--format", "csv", NULL);
    if (rc)
        fail_msg("exit %d: %s", rc, err);
    assert_non_null(strstr(out, "pooled"));
    free(out);
    free(err);
    /* a wind table a mission can read */
    const char *wind = sr_test_tmpfile(".csv", "");
    rc = sr_test_cli(&out, &err, DEMO_ARGS, "--write-wind", wind, NULL);
    assert_int_equal(rc, 0);
    free(out);
    free(err);
    char mission[1024];
    snprintf(mission, sizeof mission,
             "mission: w\nsite: {elevation: 1380 m, wind: {file: %s}}\nsections:\n  - {name: a, mass: 5 kg}\n"
             "stages:\n  - {name: main, family: conical, nominal-diameter: 2.2 m, deploy: apogee}\n"
             "start: {height: 200 m}\n",
             wind);
    sr_mission *m = sr_test_mission_text(mission);
    sr_mission_free(m);
}

static void test_cli_figures(void **state)
{
    (void)state;
    for (int hide = 0; hide < 2; hide++) {
        char prefix[256];
        snprintf(prefix, sizeof prefix, "%s", sr_test_tmpfile("", ""));
        char *argv[] = {"sinkrate", "fit", (char *)sr_test_path("payloads/demo-flight.csv"), "--mission",
                        (char *)sr_test_path("payloads/desert-club-rocket.yaml"), "--pressure-altitude", "--plot",
                        prefix, NULL};
        char *out, *err;
        char a0[1024], a1[1024];
        snprintf(a0, sizeof a0, "%s", argv[2]);
        snprintf(a1, sizeof a1, "%s", argv[4]);
        argv[2] = a0;
        argv[4] = a1;
        sr_test_cli_figure(&out, &err, hide, 8, argv);
        free(out);
        free(err);
        sr_test_check_figure(prefix, !hide, 1000, 650, "fit figure");
        char p2[300];
        snprintf(p2, sizeof p2, "%s-drag", prefix);
        sr_test_check_figure(p2, !hide, 1000, 650, "fit drag-area figure");
        snprintf(p2, sizeof p2, "%s-opening", prefix);
        sr_test_check_figure(p2, !hide, 1000, 650, "fit opening figure");
    }
}

/* a fit that cannot stand behind a number: exit 1, one line, nothing on stdout */
static void test_cli_not_determined(void **state)
{
    (void)state;
    /* the sections' own drag area is said to be larger than all the drag the log shows */
    const char *m = sr_test_tmpfile(".yaml",
                                    "mission: x\nsite: {elevation: 1380 m, temperature: 38 C, pressure: 858 hPa}\n"
                                    "sections:\n  - {name: a, mass: 5.3 kg, drag-area: 5 m2}\n"
                                    "stages:\n  - {name: drogue, family: cross, nominal-diameter: 0.9 m, deploy: apogee}\n"
                                    "  - {name: main, family: conical, nominal-diameter: 2.2 m, deploy: {height: 250 m}}\n");
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "fit", sr_test_path("payloads/demo-flight.csv"), "--mission", m,
                         "--pressure-altitude", NULL);
    print_message("exit %d: %s", rc, err);
    assert_int_equal(rc, 1);
    assert_int_equal(sr_test_lines(err), 1);
    assert_non_null(strstr(err, "not determined"));
    assert_string_equal(out, "");
    free(out);
    free(err);
}

/* ---- the opening fitted to a force history ---- */

#define SRC_PFLANZ                                                                                                \
    "Pflanz/Knacke growth model m dv/dt = m g - q (CdS_o + CdS (t/t_f)^n), force CX q CdS (t/t_f)^n, integrated " \
    "in the test (GSL rk8pd)"

/* one synthetic opening, vertical: a drogue of drag area so (0: none) open before and after */
typedef struct opening_case {
    const char *what;
    double hz, n, tf, cx;      /* log rate, growth exponent, filling time, force scale */
    double m, cds, so, v1;     /* kg, m2, m2, m/s (v1 NaN: the drogue's steady rate) */
    double noise;              /* specific-force noise, m/s2 (one standard deviation) */
    double tol_n, tol_tf, tol_ls; /* accepted errors of n, t_f (relative) and line stretch (s); 0: '-' expected */
} opening_case;

typedef struct synth_open {
    double m, cds, so, rho, tf, n;
} synth_open;

static int synth_open_rhs(double t, const double y[], double dydt[], void *params)
{
    const synth_open *p = params;
    double tau = t <= 0 ? 0 : t >= p->tf ? 1 : t / p->tf;
    dydt[0] = G0 - 0.5 * p->rho * y[0] * y[0] * (p->so + p->cds * pow(tau, p->n)) / p->m;
    return GSL_SUCCESS;
}

static void run_opening_case(const opening_case *c, unsigned seed)
{
    const double rho = 1.1, tls = 0.37, t0 = -2.0, t1 = 5.0;
    synth_open P = {c->m, c->cds, c->so, rho, c->tf, c->n};
    double v1 = isnan(c->v1) ? sqrt(2 * c->m * G0 / (rho * c->so)) : c->v1;
    size_t n = (size_t)((t1 - t0) * c->hz) + 1;
    double *t = malloc(n * sizeof *t), *f = malloc(n * sizeof *f);
    gsl_odeiv2_system sys = {synth_open_rhs, NULL, 1, &P};
    gsl_odeiv2_driver *d = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, 1e-4, 1e-10, 1e-10);
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    sr_rng_seek(r, sr_rng_key(seed, 0, 0));
    double y[1] = {v1}, s = 0; /* s: time after line stretch */
    for (size_t i = 0; i < n; i++) {
        t[i] = t0 + (double)i / c->hz;
        double si = t[i] - tls;
        if (si > 0) {
            if (s < c->tf && si > c->tf)
                assert_int_equal(gsl_odeiv2_driver_apply(d, &s, c->tf, y), GSL_SUCCESS);
            assert_int_equal(gsl_odeiv2_driver_apply(d, &s, si, y), GSL_SUCCESS);
        }
        double tau = si <= 0 ? 0 : si >= c->tf ? 1 : si / c->tf;
        double q = 0.5 * rho * y[0] * y[0];
        f[i] = q * (c->so + c->cx * c->cds * pow(tau, c->n)) + c->m * gsl_ran_gaussian(r, c->noise);
    }
    gsl_odeiv2_driver_free(d);
    gsl_rng_free(r);
    sr_opening_input in;
    sr_opening_input_init(&in);
    in.cds0 = c->cds;
    in.d0 = sqrt(4 * c->cds / (PI * 0.8));
    in.mass = c->m;
    in.v1 = v1;
    in.rho = rho;
    in.a = 340;
    in.g = G0;
    in.cds_other = c->so;
    sr_fit_opening o;
    sr_error e;
    /* the deployment as a log would place it: 0.2 s before line stretch */
    assert_int_equal(sr_fit_opening_history(t, f, n, tls - 0.2, &in, &o, &e), SR_OK);
    print_message("%s: n %.4g t_f %.4g line %.4g k %.4g rms %.3g N, %s\n", c->what, o.exponent, o.t_fill,
                  o.t_line, o.olf, o.residual, o.unresolved);
    assert_int_equal(o.measured, 1);
    if (c->tol_n > 0) {
        char q[160];
        snprintf(q, sizeof q, "opening growth exponent n, %s", c->what);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_PFLANZ, c->n, o.exponent, c->tol_n);
        snprintf(q, sizeof q, "opening filling time t_f, %s", c->what);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_PFLANZ, c->tf, o.t_fill, c->tol_tf);
        snprintf(q, sizeof q, "opening line stretch after the deployment, %s", c->what);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_PFLANZ, 0.2, o.t_line, c->tol_ls);
        snprintf(q, sizeof q, "opening-load factor CX, %s", c->what);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_PFLANZ, c->cx, o.olf, c->tol_n);
        assert_string_equal(o.unresolved, "");
    } else {
        assert_true(isnan(o.exponent) && isnan(o.t_fill) && isnan(o.olf));
        assert_non_null(strstr(o.unresolved, "rate too low"));
    }
    free(t);
    free(f);
}

static void test_opening_fit(void **state)
{
    (void)state;
    /* noise 0.15 m/s2 as the demo log's accelerometer; tolerances: the model is exact, so they stand for
     * the noise and the rate (about five times what the fit reaches on these seeds) */
    static const opening_case C[] = {
        {"100 Hz, solid cloth under a drogue (n 2, t_f 0.8 s)", 100, 2.0, 0.8, 1.0, 5.0, 1.5, 0.08, NAN, 0.15, 0.05,
         0.02, 0.01},
        {"100 Hz, slotted, finite mass (n 1, t_f 0.5 s, CX 1.3)", 100, 1.0, 0.5, 1.3, 2.0, 1.2, 0.0, 30.0, 0.15, 0.05,
         0.02, 0.01},
        {"20 Hz, solid cloth under a drogue (n 2, t_f 1.2 s)", 20, 2.0, 1.2, 1.0, 8.0, 3.0, 0.12, NAN, 0.15, 0.1,
         0.03, 0.03},
        {"10 Hz, a fast opening (t_f 0.4 s): rate too low", 10, 2.0, 0.4, 1.0, 5.0, 1.5, 0.08, NAN, 0.15, 0, 0, 0},
    };
    for (size_t i = 0; i < sizeof C / sizeof C[0]; i++)
        run_opening_case(&C[i], 1400 + (unsigned)i);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_synthetic_recovers),
        cmocka_unit_test(test_coverage_white),
        cmocka_unit_test(test_coverage_correlated),
        cmocka_unit_test(test_pressure_altitude_hot_day),
        cmocka_unit_test(test_profile_logs_fitted_back),
        cmocka_unit_test(test_cli_demo),
        cmocka_unit_test(test_cli_figures),
        cmocka_unit_test(test_cli_not_determined),
        cmocka_unit_test(test_opening_fit),
    };
    return cmocka_run_group_tests_name("fit", tests, setup, NULL);
}
