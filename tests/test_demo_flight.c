/* test_demo_flight.c - the generator of the invented demo log
 * payloads/demo-flight.csv: the club rocket of payloads/desert-club-rocket.yaml
 * flown by the staged descent (typical drag), logged as a barometric altimeter
 * would (a pressure altitude above the pad, by the 1976 standard), at 20 Hz,
 * with noise, ejection-charge spikes, stray spikes, a dropout, the specific
 * force along the axis and noisy positions. The test makes the log again and
 * checks it is the committed file byte for byte; SR_WRITE_DEMO=1 rewrites it. */
#include "testutil.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_randist.h>
#include <gsl/gsl_rng.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "base/rng.h"
#include "files/catalog.h"
#include "files/mission.h"
#include "physics/atmos.h"
#include "physics/profile.h"

#define HZ 20.0
#define PAD_S 3.0

/* pressure altitude (1976 standard, geopotential) of a pressure: Newton on
 * the standard's own pressure, written here for the generator */
static double std_geopotential_of(double p)
{
    double H = 0.0;
    for (int it = 0; it < 50; it++) {
        double z = SR_ATMOS_R0 * H / (SR_ATMOS_R0 - H), T, pp;
        sr_atmos_standard_tp(z, 0.0, &T, &pp);
        /* dlnp/dH = -g0 M0 / (R* T) */
        double step = (log(pp) - log(p)) * SR_ATMOS_R_STAR * T / (SR_ATMOS_G0 * SR_ATMOS_M0);
        H += step;
        if (fabs(step) < 1e-7)
            break;
    }
    return H;
}

static size_t interp_at(const sr_profile_track *tr, double t, size_t from)
{
    size_t i = from;
    while (i + 1 < tr->n && tr->pt[i + 1].t <= t)
        i++;
    return i;
}

static char *make_log(size_t *len_out)
{
    sr_error e;
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket.yaml");
    sr_profile_ctx *ctx;
    if (sr_mission_profile(&ctx, m, NULL, &e))
        fail_msg("%s", e.msg);
    sr_profile_track tr = {.cap = 200000, .dt = 0.02};
    tr.pt = malloc(tr.cap * sizeof *tr.pt);
    sr_profile_result *res = malloc(sizeof *res);
    if (sr_profile_run(ctx, NULL, SR_PROFILE_FULL, NULL, res, &tr, &e))
        fail_msg("%s", e.msg);
    /* the pad's pressure and its pressure altitude: the altimeter's zero */
    sr_air pad;
    sr_atmos_at(&m->atmos, m->ground, &pad, NULL);
    double Hpad = std_geopotential_of(pad.p);
    double za = m->start_height, g = SR_ATMOS_G0;
    double ta = sqrt(2.0 * za / g); /* a coast from the pad: invented, not a flight */
    double t_land = res->descent_time, tend = PAD_S + ta + t_land + 5.0;
    double t_main = res->stage[1].t_deploy;
    gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
    sr_rng_seek(r, sr_rng_key(20240614, 14, 0));
    size_t cap = (size_t)(tend * HZ + 16) * 64 + 4096, len = 0;
    char *b = malloc(cap);
    len += (size_t)snprintf(b + len, cap - len,
                            "# Invented demo log: the club rocket of payloads/desert-club-rocket.yaml (not a real\n"
                            "# vehicle or flight), made by tests/test_demo_flight.c. A barometric altimeter's\n"
                            "# height above the pad (a pressure altitude by the 1976 standard) at 20 Hz, with\n"
                            "# noise, ejection-charge spikes, stray spikes and a dropout; the specific force\n"
                            "# along the axis; GPS positions from the launch point.\n"
                            "time [s],height [m],acceleration [g],east [m],north [m]\n");
    size_t i = 0, k = 0;
    double t_drop = PAD_S + ta + 0.45 * t_main;
    for (double t = 0; t < tend; t = (double)(++i) / HZ) {
        double h, east = 0, north = 0, f = 0;
        if (t < PAD_S) {
            h = 0;
            f = g;
        } else if (t < PAD_S + ta) {
            double s = t - PAD_S;
            h = za - 0.5 * g * (ta - s) * (ta - s);
            f = 0; /* coasting: the accelerometer reads no specific force */
        } else {
            double s = t - PAD_S - ta;
            if (s >= t_land) {
                h = 0;
                f = g;
                east = tr.pt[tr.n - 1].east;
                north = tr.pt[tr.n - 1].north;
            } else {
                k = interp_at(&tr, s, k);
                const sr_profile_point *a = &tr.pt[k], *c = &tr.pt[k + 1 < tr.n ? k + 1 : k];
                double u = c->t > a->t ? (s - a->t) / (c->t - a->t) : 0;
                h = a->h + u * (c->h - a->h);
                east = a->east + u * (c->east - a->east);
                north = a->north + u * (c->north - a->north);
                /* the specific force the engine computes along the track (drag / mass), between its points */
                f = a->accel + u * (c->accel - a->accel);
            }
        }
        sr_air air;
        sr_atmos_at(&m->atmos, m->ground + fmax(h, 0.0), &air, NULL);
        double reading = std_geopotential_of(air.p) - Hpad + gsl_ran_gaussian(r, 1.2);
        double sp = t - PAD_S - ta;
        /* the charges: the bay's pressure rises for a moment, the height reads low */
        if ((sp >= 0 && sp < 0.15) || (sp >= t_main && sp < t_main + 0.15))
            reading -= 40.0 + 20.0 * gsl_rng_uniform(r);
        if (gsl_rng_uniform(r) < 0.0015)
            reading += (gsl_rng_uniform(r) < 0.5 ? -1 : 1) * (25.0 + 60.0 * gsl_rng_uniform(r));
        /* a brown-out: the altimeter reads zero for 0.6 s */
        if (t >= t_drop && t < t_drop + 0.6)
            reading = 0.0;
        double acc = (f + gsl_ran_gaussian(r, 0.15)) / SR_G0;
        len += (size_t)snprintf(b + len, cap - len, "%.2f,%.1f,%.2f,%.1f,%.1f\n", t, reading, acc,
                                east + gsl_ran_gaussian(r, 1.5), north + gsl_ran_gaussian(r, 1.5));
    }
    gsl_rng_free(r);
    free(res);
    free(tr.pt);
    sr_profile_ctx_free(ctx);
    sr_mission_free(m);
    *len_out = len;
    return b;
}

static void test_demo_log_is_reproduced(void **state)
{
    (void)state;
    size_t len;
    char *b = make_log(&len);
    const char *path = sr_test_path("payloads/demo-flight.csv");
    if (getenv("SR_WRITE_DEMO")) {
        FILE *f = fopen(path, "wb");
        assert_non_null(f);
        fwrite(b, 1, len, f);
        assert_int_equal(fclose(f), 0);
    }
    FILE *f = fopen(path, "rb");
    assert_non_null(f);
    char *have = malloc(len + 2);
    size_t got = fread(have, 1, len + 1, f);
    fclose(f);
    if (got != len || memcmp(have, b, len) != 0)
        fail_msg("payloads/demo-flight.csv differs from what the generator makes (SR_WRITE_DEMO=1 rewrites it)");
    free(have);
    free(b);
}

int main(void)
{
    gsl_set_error_handler_off();
    const struct CMUnitTest tests[] = {cmocka_unit_test(test_demo_log_is_reproduced)};
    return cmocka_run_group_tests_name("demo_flight", tests, NULL, NULL);
}
