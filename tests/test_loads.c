/* test_loads.c - the opening load of a deployment over every banded input
 * (analysis/loads.c): the growth-exponent band raising the governing load,
 * the opening-load factor's band, a measured opening replacing the
 * estimates, the one filling-time definition, and the fast solver against
 * the adaptive one. The opening loads are the project's own derivation on
 * the handbook's growth model (docs/method.md, section 8): their checks are
 * DERIVED or CONSISTENCY rows, never outside ones. */
#include "testutil.h"

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "analysis/loads.h"
#include "physics/opening.h"
#include "physics/units.h"

#define SRC_M8 "docs/method.md section 8 (our derivation on the K91 growth model)"
#define SRC_BAND "trade-facts.md section 6 (from memory): n = 2 solid, n = 1 slotted, fits spread about 0.5 .. 3"

/* The handbook reference file's check case (section 6.3): D0 1.5 m, CD0 0.80
 * on nominal area, 30 m/s at sea level, CX 1.7, n_fill 8; one state. */
static void table_case(sr_loads_canopy *c, sr_loads_state st[SR_LOADS_NSTATES], double mass)
{
    memset(c, 0, sizeof *c);
    for (int k = 0; k < 3; k++)
        c->cds_ratio[k] = c->d0_ratio[k] = 1.0;
    c->count = 1;
    c->n_fill = 8;
    c->cx = (sr_band){1.7, 1.7, 1.7};
    c->growth = (sr_band){1.0, 2.0, 3.0};
    memset(st, 0, SR_LOADS_NSTATES * sizeof *st);
    st[0] = (sr_loads_state){.valid = 1,
                             .v1 = 30,
                             .path_angle = M_PI / 2,
                             .rho = 1.2250,
                             .a = 340.294,
                             .g = SR_G0,
                             .mass = mass,
                             .v_steady = NAN,
                             .cds0 = 0.80 * M_PI * 1.5 * 1.5 / 4,
                             .d0 = 1.5};
}

static double full_high(const sr_loads_canopy *c, const sr_loads_state *s, int drag, double n, double cx)
{
    sr_opening_input in;
    sr_opening_result r;
    sr_loads_input(c, s, drag, n, cx, &in);
    assert_int_equal(sr_opening_solve(&in, &r, NULL), SR_OK);
    return r.f_high;
}

/* The case: 5 kg under a 1.5 m flat circular at 30 m/s, sea level:
 * about 573 N at n = 2, 699 N at n = 3, 964 N at n = 6 (recomputed
 * independently by the author on the same model). The band's high
 * end follows n to the top of its band. */
static void test_growth_band_raises_load(void **state)
{
    (void)state;
    sr_loads_canopy c;
    sr_loads_state st[SR_LOADS_NSTATES];
    table_case(&c, st, 5.0);
    static const struct {
        double n, expect;
    } CASES[] = {{2, 573}, {3, 699}, {6, 964}};
    for (size_t i = 0; i < 3; i++) {
        char q[96];
        snprintf(q, sizeof q, "governing opening load, 5 kg, 1.5 m flat circular, 30 m/s, n = %g (N)", CASES[i].n);
        CHECK_REL_CLASS(SR_CHECK_DERIVED, q, "issue 'Verdicts an engineer can sign' (same growth model, recomputed)",
                        CASES[i].expect, full_high(&c, &st[0], 1, CASES[i].n, 1.7), 1e-3);
    }
    sr_loads_band b;
    assert_int_equal(sr_loads_evaluate(&c, st, 0, &b, NULL), SR_OK);
    assert_true(b.valid);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "loads band, typical = the n = 2 solve (N)", SRC_M8,
                    full_high(&c, &st[0], 1, 2.0, 1.7), b.typ.force, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "loads band, high end = the n = 3 solve, the top of the solid band (N)",
                    SRC_M8, full_high(&c, &st[0], 2, 3.0, 1.7), b.hi.force, 1e-12);
    assert_true(b.hi.force > 1.2 * b.typ.force);
    assert_true(b.hi.exponent == 3.0);
    /* with the band collapsed to n = 2 the governing load stays at the typical one */
    c.growth = (sr_band){2, 2, 2};
    assert_int_equal(sr_loads_evaluate(&c, st, 0, &b, NULL), SR_OK);
    assert_true(fabs(b.hi.force - b.typ.force) < 1e-9 * b.typ.force);
}

/* The opening-load factor multiplies every method's force (F = CD0 S0 q1 CX X1,
 * K91 section 5, from memory): the band ends scale by CX_hi / CX_typ. */
static void test_cx_band(void **state)
{
    (void)state;
    sr_loads_canopy c;
    sr_loads_state st[SR_LOADS_NSTATES];
    table_case(&c, st, 50.0);
    c.growth = (sr_band){2, 2, 2};
    c.cx = (sr_band){1.6, 1.7, 1.8};
    sr_loads_band b;
    assert_int_equal(sr_loads_evaluate(&c, st, 0, &b, NULL), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "high end / typical = CX high / CX typical (50 kg, dynamic peak)", SRC_M8,
                    1.8 / 1.7, b.hi.force / b.typ.force, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "low end / typical = CX low / CX typical (50 kg, dynamic peak)", SRC_M8,
                    1.6 / 1.7, b.lo.force / b.typ.force, 1e-9);
    /* the fast path gives the same ends within its bound */
    sr_loads_band f;
    assert_int_equal(sr_loads_evaluate(&c, st, 1, &f, NULL), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "loads band high end, fast solver against the adaptive one", SRC_M8,
                    b.hi.force, f.hi.force, 5e-3);
}

/* A measured opening replaces the three estimates. */
static void test_measured(void **state)
{
    (void)state;
    sr_loads_canopy c;
    sr_loads_state st[SR_LOADS_NSTATES];
    table_case(&c, st, 5.0);
    c.cds_ratio[0] = 0.75 / 0.80;
    c.cds_ratio[2] = 0.85 / 0.80;
    c.measured = SR_OPENING_MEASURED_FACTOR;
    c.measured_value = 1.25;
    sr_loads_band b;
    assert_int_equal(sr_loads_evaluate(&c, st, 0, &b, NULL), SR_OK);
    assert_true(b.measured);
    double q = 0.5 * 1.2250 * 30 * 30, S = 0.80 * M_PI * 1.5 * 1.5 / 4;
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "measured opening-load factor: F = factor CD0 S0 q1, typical (N)",
                    "docs/files.md measured-opening (definition of the factor)", 1.25 * S * q, b.typ.force, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "measured opening-load factor: F at the high end of the drag band (N)",
                    "docs/files.md measured-opening (definition of the factor)", 1.25 * S * 0.85 / 0.80 * q,
                    b.hi.force, 1e-12);
    c.measured = SR_OPENING_MEASURED_LOAD;
    c.measured_value = 812.0;
    assert_int_equal(sr_loads_evaluate(&c, st, 1, &b, NULL), SR_OK);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, "measured opening load replaces the band (N)",
                    "docs/files.md measured-opening", 812.0, b.hi.force, 0);
    assert_true(b.lo.force == 812.0 && b.typ.force == 812.0);
}

/* The one filling-time definition: n D0 / max(v, steady rate). */
static void test_fill_time(void **state)
{
    (void)state;
    double tf;
    assert_int_equal(sr_opening_fill_time(8, 1.5, 30, 7.5, &tf, NULL), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "filling time at speed: n D0 / v (s)", "docs/method.md section 8 (the one "
                    "filling-time definition)", 8 * 1.5 / 30, tf, 1e-15);
    assert_int_equal(sr_opening_fill_time(8, 1.5, 3, 7.5, &tf, NULL), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "filling time below the steady rate: n D0 / v_steady (s)",
                    "docs/method.md section 8 (the one filling-time definition)", 8 * 1.5 / 7.5, tf, 1e-15);
    assert_int_equal(sr_opening_fill_time(8, 1.5, 0, 7.5, &tf, NULL), SR_OK);
    assert_int_equal(sr_opening_fill_time(8, 1.5, 0, NAN, &tf, NULL), SR_EINVAL);
    /* the solver uses it: a slow opening takes the canopy's own steady rate */
    sr_opening_input in;
    sr_opening_result r;
    sr_opening_input_init(&in);
    in.cds0 = 0.80 * M_PI * 1.5 * 1.5 / 4;
    in.d0 = 1.5;
    in.mass = 5;
    in.v1 = 3;
    in.rho = 1.2250;
    in.a = 340.294;
    in.n_fill = 8;
    in.cx = 1.7;
    assert_int_equal(sr_opening_solve(&in, &r, NULL), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "solver's filling time for a slow opening = n D0 / v_terminal (s)",
                    "docs/method.md section 8", 8 * 1.5 / r.v_terminal, r.t_fill, 1e-12);
}

/* The class bands (from memory). */
static void test_class_bands(void **state)
{
    (void)state;
    double lo, typ, hi;
    sr_opening_class_band(SR_OPENING_SOLID, &lo, &typ, &hi);
    CHECK_ABS_CLASS(SR_CHECK_MEMORY, "growth exponent band, solid cloth: low", SRC_BAND, 1.0, lo, 0);
    CHECK_ABS_CLASS(SR_CHECK_MEMORY, "growth exponent band, solid cloth: typical", SRC_BAND, 2.0, typ, 0);
    CHECK_ABS_CLASS(SR_CHECK_MEMORY, "growth exponent band, solid cloth: high", SRC_BAND, 3.0, hi, 0);
    sr_opening_class_band(SR_OPENING_SLOTTED, &lo, &typ, &hi);
    CHECK_ABS_CLASS(SR_CHECK_MEMORY, "growth exponent band, slotted: low", SRC_BAND, 0.5, lo, 0);
    CHECK_ABS_CLASS(SR_CHECK_MEMORY, "growth exponent band, slotted: typical", SRC_BAND, 1.0, typ, 0);
    CHECK_ABS_CLASS(SR_CHECK_MEMORY, "growth exponent band, slotted: high", SRC_BAND, 2.0, hi, 0);
}

/* The fast solver against the adaptive one over a grid of cases: masses
 * 0.05 .. 1000 kg, exponents 0.5 .. 3, 3 .. 200 m/s, climbing to straight
 * down, filling constants 4 .. 14. */
static void test_fast_solver(void **state)
{
    (void)state;
    static const double M[] = {0.05, 0.3, 1, 5, 20, 100, 1000}, N[] = {0.5, 1, 2, 3}, V[] = {3, 8, 15, 30, 80, 200},
                        A[] = {-0.5, 0, 0.7, M_PI / 2}, F[] = {4, 8, 14};
    double worst = 0, bound = INFINITY;
    int count = 0;
    for (size_t a = 0; a < 7; a++)
        for (size_t b = 0; b < 4; b++)
            for (size_t c = 0; c < 6; c++)
                for (size_t d = 0; d < 4; d++)
                    for (size_t f = 0; f < 3; f++) {
                        sr_opening_input in;
                        sr_opening_input_init(&in);
                        in.cds0 = 0.80 * M_PI * 1.5 * 1.5 / 4;
                        in.d0 = 1.5;
                        in.mass = M[a];
                        in.v1 = V[c];
                        in.rho = 1.0;
                        in.a = 340;
                        in.n_fill = F[f];
                        in.cx = 1.7;
                        in.path_angle = A[d];
                        in.exponent = N[b];
                        sr_opening_result r;
                        sr_opening_quick q;
                        assert_int_equal(sr_opening_solve(&in, &r, NULL), SR_OK);
                        assert_int_equal(sr_opening_solve_fast(&in, &q, NULL), SR_OK);
                        worst = fmax(worst, fabs(sr_opening_quick_high(&q, 1.7) - r.f_high) / r.f_high);
                        worst = fmax(worst, fabs(sr_opening_quick_low(&q, 1.7) - r.f_low) / r.f_low);
                        bound = fmin(bound, sr_opening_bound(&in) / fmax(r.f_high, sr_opening_quick_high(&q, 1.7)));
                        count++;
                    }
    printf("fast opening solver: %d cases, worst relative error %.2e\n", count, worst);
    /* the bound that lets a dispersion skip a load that cannot break its limit */
    printf("opening-load bound: at least %.3f x the highest estimate over the %d cases\n", bound, count);
    assert_true(bound >= 1.0);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "fast opening solver against the adaptive one, worst over 2016 cases",
                    "opening.h: within 0.5 % of sr_opening_solve", 0.0, worst, 5e-3);
}

/* The bound of sr_loads_bound over slow deployments too (a drogue at apogee,
 * a canopy opening from rest): never below the highest load sr_loads_evaluate
 * gives, for estimated and measured openings. */
static void test_bound(void **state)
{
    (void)state;
    static const double M[] = {0.3, 2, 20, 300}, V[] = {0.3, 1, 3, 10, 40}, A[] = {0, 0.7, M_PI / 2};
    double least = INFINITY;
    for (int meas = 0; meas < 2; meas++)
        for (size_t a = 0; a < 4; a++)
            for (size_t c = 0; c < 5; c++)
                for (size_t d = 0; d < 3; d++) {
                    sr_loads_canopy lc = {.cds_ratio = {0.9, 1.0, 1.1}, .d0_ratio = {1, 1, 1}, .count = 2,
                                          .n_fill = 8, .cx = {1.05, 1.3, 1.8}, .growth = {1, 2, 3}};
                    if (meas) {
                        lc.measured = SR_OPENING_MEASURED_FACTOR;
                        lc.measured_value = 1.4;
                    }
                    sr_loads_state st[SR_LOADS_NSTATES];
                    memset(st, 0, sizeof st);
                    st[0] = (sr_loads_state){.valid = 1, .v1 = V[c], .path_angle = A[d], .rho = 1.1, .a = 340,
                                             .g = 9.80665, .mass = M[a], .v_steady = NAN, .cds0 = 1.2, .d0 = 1.4};
                    sr_loads_band b;
                    assert_int_equal(sr_loads_evaluate(&lc, st, 1, &b, NULL), SR_OK);
                    least = fmin(least, sr_loads_bound(&lc, &st[0]) / b.hi.force);
                    assert_int_equal(sr_loads_evaluate(&lc, st, 0, &b, NULL), SR_OK);
                    least = fmin(least, sr_loads_bound(&lc, &st[0]) / b.hi.force);
                }
    printf("opening-load bound over slow and fast deployments: at least %.3f x the load\n", least);
    assert_true(least >= 1.0);
}

int main(void)
{
    gsl_set_error_handler_off();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_growth_band_raises_load), cmocka_unit_test(test_cx_band),
        cmocka_unit_test(test_measured), cmocka_unit_test(test_fill_time),
        cmocka_unit_test(test_class_bands), cmocka_unit_test(test_fast_solver), cmocka_unit_test(test_bound),
    };
    return cmocka_run_group_tests_name("loads", tests, NULL, NULL);
}
