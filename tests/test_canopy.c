/* test_canopy.c - reference areas, diameter conversions and clusters against
 * the handbook definitions (Knacke 1991, NWC TP 6575). */
#include <math.h>

#include "physics/canopy.h"
#include "testutil.h"

#define PI 3.14159265358979323846

static sr_family conical(void)
{
    sr_family f = {.id = "conical",
                   .cd0 = {{0.75, 0.825, 0.90}, SR_REF_NOMINAL},
                   .dp_d0 = {0.70, 0.70, 0.70},
                   .dc_d0 = {0.93, 0.94, 0.95},
                   .areal_mass = NAN};
    return f;
}

static void test_nominal_relations(void **state)
{
    (void)state;
    /* D0 = sqrt(4 S0 / pi) = 1.1284 sqrt(S0) */
    static const double S0[] = {0.1, 1.0, 3.1416, 16.011, 50.0};
    for (size_t i = 0; i < 5; i++)
        CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "D0 from S0", "Knacke 1991, Fig. 6-28: D0 = 1.1284 sqrt(S0)",
                        1.1284 * sqrt(S0[i]), sr_canopy_d0_from_s0(S0[i]), 5e-5);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "S0 of a 2 m nominal diameter",
                    "definition S0 = pi D0^2/4 (canopy-handbook.md 6.2 case A: 3.1416 m2)", 3.1416,
                    sr_canopy_s0_from_d0(2.0), 1e-5);
}

static void test_projected_coefficient(void **state)
{
    (void)state;
    sr_family f = conical();
    /* CD0 0.75 with Dp/D0 0.70 is about 1.53 on projected area */
    CHECK_REL_CLASS(SR_CHECK_METHOD, "CDp from CD0 0.75, Dp/D0 0.70",
                    "canopy-handbook.md sec. 3 (derived: CDp = CD0 (D0/Dp)^2)", 1.53,
                    sr_canopy_cd_on(&f, 0.75, SR_REF_PROJECTED), 2e-3);
}

/* The same physical canopy given three ways has the same drag area. */
static void test_size_given_three_ways(void **state)
{
    (void)state;
    sr_family f = conical();
    f.dc_d0.lo = f.dc_d0.typ = f.dc_d0.hi = 0.94;
    sr_canopy a, b, c, d;
    assert_int_equal(sr_canopy_from_size(&a, &f, SR_SIZE_NOMINAL_DIAMETER, 2.0, NULL), 0);
    assert_int_equal(sr_canopy_from_size(&b, &f, SR_SIZE_PROJECTED_DIAMETER, 1.4, NULL), 0);
    assert_int_equal(sr_canopy_from_size(&c, &f, SR_SIZE_FLAT_DIAMETER, 1.88, NULL), 0);
    assert_int_equal(sr_canopy_from_size(&d, &f, SR_SIZE_NOMINAL_AREA, PI, NULL), 0);
    assert_true(fabs(a.cds.typ - b.cds.typ) < 1e-12);
    assert_true(fabs(a.cds.typ - c.cds.typ) < 1e-12);
    assert_true(fabs(a.cds.typ - d.cds.typ) < 1e-12);
    assert_true(fabs(a.d0.typ - 2.0) < 1e-12 && fabs(b.d0.typ - 2.0) < 1e-12);
}

/* A measured coefficient on the reference the size is given on gives an
 * exact drag area; on another reference it is converted and stays a band. */
static void test_measured_cd(void **state)
{
    (void)state;
    sr_family f = conical();
    sr_canopy c;
    assert_int_equal(sr_canopy_from_size(&c, &f, SR_SIZE_PROJECTED_DIAMETER, 1.4, NULL), 0);
    assert_int_equal(sr_canopy_set_measured_cd(&c, 1.53, SR_REF_PROJECTED, "test", NULL), 0);
    double sp = PI * 1.4 * 1.4 / 4;
    assert_true(fabs(c.cds.lo - 1.53 * sp) < 1e-12 && fabs(c.cds.hi - 1.53 * sp) < 1e-12);
    /* same canopy, coefficient on projected area, size on nominal */
    sr_canopy n;
    assert_int_equal(sr_canopy_from_size(&n, &f, SR_SIZE_NOMINAL_DIAMETER, 2.0, NULL), 0);
    assert_int_equal(sr_canopy_set_measured_cd(&n, 1.53, SR_REF_PROJECTED, "test", NULL), 0);
    assert_true(fabs(n.cds.typ - 1.53 * sp) < 1e-12);
    sr_error e;
    assert_int_equal(sr_canopy_set_measured_cd(&n, 7.0, SR_REF_NOMINAL, "test", &e), SR_EINVAL);
}

static void test_cluster(void **state)
{
    (void)state;
    sr_family f = conical();
    sr_canopy c;
    assert_int_equal(sr_canopy_from_size(&c, &f, SR_SIZE_NOMINAL_DIAMETER, 2.0, NULL), 0);
    assert_int_equal(sr_canopy_set_cluster(&c, 3, NAN, NULL), 0);
    sr_band t = sr_canopy_total_cds(&c);
    CHECK_REL_CLASS(SR_CHECK_MEMORY, "cluster of 3: drag factor per canopy",
                    "from memory: a few % loss for 2 canopies, 5-10% for 3+ "
                    "(Knacke 1991 cluster discussion, figure not read)",
                    0.93, t.typ / (3 * c.cds.typ), 1e-12);
    assert_int_equal(sr_canopy_set_cluster(&c, 0, NAN, NULL), SR_EINVAL);
    assert_int_equal(sr_canopy_set_cluster(&c, 2, 1.5, NULL), SR_EINVAL);
}

static void test_bad_sizes(void **state)
{
    (void)state;
    sr_family f = conical();
    sr_canopy c;
    static const double BAD[] = {0.0, -1.0, NAN, INFINITY, 500.0};
    for (size_t i = 0; i < 5; i++)
        assert_int_equal(sr_canopy_from_size(&c, &f, SR_SIZE_NOMINAL_DIAMETER, BAD[i], NULL), SR_EINVAL);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_nominal_relations), cmocka_unit_test(test_projected_coefficient),
        cmocka_unit_test(test_size_given_three_ways), cmocka_unit_test(test_measured_cd),
        cmocka_unit_test(test_cluster), cmocka_unit_test(test_bad_sizes),
    };
    return cmocka_run_group_tests_name("canopy", tests, NULL, NULL);
}
