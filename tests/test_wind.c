/* test_wind.c - wind models against the derived profile ratios of the trade
 * references, the meteorological direction convention, vector interpolation
 * of tables, and the CSV reader's positioned errors. */
#include "testutil.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "physics/wind.h"
#include "files/windtable.h"

#define PI 3.14159265358979323846
#define DEG (PI / 180.0)

#define SRC_POWER "trade-facts.md sec. 6: u(100 m)/u(10 m) of the power law u = u_ref (z/z_ref)^alpha (derived)"
#define SRC_LOG "trade-facts.md sec. 6: u(100 m)/u(10 m) of the neutral log law, z0 = 0.03 m, d = 0 (derived)"
#define SRC_MET "WMO convention: wind direction is the bearing it blows FROM, clockwise from north (common practice)"
#define SRC_VEC "linear interpolation of the east/north components (DESIGN.md model 5, docs/method.md 7): |(a+b)/2|"

static double speed_at(const sr_wind *w, double h)
{
    double e, n;
    sr_wind_at(w, h, &e, &n);
    return hypot(e, n);
}

typedef struct ratio_case {
    const char *what;
    int log_law;
    double alpha, z0, expected;
    const char *src;
} ratio_case;

static const ratio_case RATIOS[] = {
    {"power law 1/7 u(100)/u(10)", 0, 1.0 / 7.0, 0, 1.38950, SRC_POWER},
    {"power law 0.2 u(100)/u(10)", 0, 0.2, 0, 1.58489, SRC_POWER},
    {"log law z0 0.03 m u(100)/u(10)", 1, 0, 0.03, 1.39637, SRC_LOG},
};

static void test_profile_ratios(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof RATIOS / sizeof RATIOS[0]; i++) {
        const ratio_case *c = &RATIOS[i];
        sr_wind w;
        sr_error e;
        int rc = c->log_law ? sr_wind_init_log(&w, 6.0, 200 * DEG, 10.0, c->z0, 0.0, &e)
                            : sr_wind_init_power(&w, 6.0, 200 * DEG, 10.0, c->alpha, &e);
        assert_int_equal(rc, SR_OK);
        CHECK_REL_CLASS(SR_CHECK_METHOD, c->what, c->src, c->expected, speed_at(&w, 100.0) / speed_at(&w, 10.0), 5e-6);
        /* the reference height gives the reference speed back */
        assert_true(fabs(speed_at(&w, 10.0) - 6.0) < 1e-12);
        /* calm at and below ground */
        assert_true(speed_at(&w, 0.0) == 0.0 && speed_at(&w, -5.0) == 0.0);
    }
    /* the default exponent is the seventh-root profile */
    assert_true(fabs(SR_WIND_ALPHA_OPEN - 0.142857142857) < 1e-9);
}

typedef struct dir_case {
    double from_deg, east, north;
} dir_case;

static const dir_case DIRS[] = {
    {0, 0, -1},    /* from the north: the air moves south */
    {90, -1, 0},   /* from the east: it moves west */
    {180, 0, 1},   /* from the south: north */
    {270, 1, 0},   /* from the west: east */
    {225, 0.70710678, 0.70710678},
};

static void test_direction_convention(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof DIRS / sizeof DIRS[0]; i++) {
        sr_wind w;
        sr_error e;
        assert_int_equal(sr_wind_init_constant(&w, 10.0, DIRS[i].from_deg * DEG, &e), SR_OK);
        double east, north;
        sr_wind_at(&w, 1234.0, &east, &north);
        char what[96];
        snprintf(what, sizeof what, "east component of 10 m/s from %.0f deg", DIRS[i].from_deg);
        CHECK_ABS_CLASS(SR_CHECK_TRADE, what, SRC_MET, 10 * DIRS[i].east, east, 1e-6);
        snprintf(what, sizeof what, "north component of 10 m/s from %.0f deg", DIRS[i].from_deg);
        CHECK_ABS_CLASS(SR_CHECK_TRADE, what, SRC_MET, 10 * DIRS[i].north, north, 1e-6);
        double s, from;
        sr_wind_polar(east, north, &s, &from);
        assert_true(fabs(s - 10.0) < 1e-12);
        assert_true(fabs(remainder(from - DIRS[i].from_deg * DEG, 2 * PI)) < 1e-12);
    }
}

static void test_table_components(void **state)
{
    (void)state;
    double h[] = {0.0, 100.0, 300.0}, s[] = {10.0, 10.0, 4.0}, f[] = {0.0, 90 * DEG, 90 * DEG};
    sr_wind w;
    sr_error e;
    assert_int_equal(sr_wind_init_table(&w, h, s, f, 3, &e), SR_OK);
    double east, north, sp, from;
    sr_wind_at(&w, 50.0, &east, &north);
    sr_wind_polar(east, north, &sp, &from);
    /* north wind and east wind averaged as vectors: 10/sqrt(2) from 45 deg, not 10 from 45 deg */
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "table wind speed halfway between 10 m/s from 0 deg and 10 m/s from 90 deg",
                    SRC_VEC, 10.0 / sqrt(2.0), sp, 1e-12);
    CHECK_ABS_CLASS(SR_CHECK_DERIVED, "table wind direction halfway between 0 deg and 90 deg", SRC_VEC, 45.0,
                    from / DEG, 1e-9);
    sr_wind_at(&w, 200.0, &east, &north);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "table wind speed halfway between 10 and 4 m/s from 90 deg", SRC_VEC, 7.0,
                    hypot(east, north), 1e-12);
    /* below the first row and above the last the end rows hold */
    sr_wind_at(&w, -10.0, &east, &north);
    assert_true(fabs(north + 10.0) < 1e-12 && fabs(east) < 1e-12);
    sr_wind_at(&w, 1000.0, &east, &north);
    assert_true(fabs(east + 4.0) < 1e-12);
    assert_true(sr_wind_top(&w) == 300.0);
    size_t nk;
    assert_true(sr_wind_knots(&w, &nk) == w.h && nk == 3);
    sr_wind_release(&w);
}

static void test_bad_models(void **state)
{
    (void)state;
    sr_wind w;
    sr_error e;
    assert_int_equal(sr_wind_init_constant(&w, -1.0, 0, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "wind speed"));
    assert_int_equal(sr_wind_init_constant(&w, 500.0, 0, &e), SR_EINVAL);
    assert_int_equal(sr_wind_init_power(&w, 5.0, 0, 10.0, 1.5, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "exponent"));
    assert_int_equal(sr_wind_init_power(&w, 5.0, 0, 0.0, 0.14, &e), SR_EINVAL);
    assert_int_equal(sr_wind_init_log(&w, 5.0, 0, 10.0, 0.0, 0.0, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "roughness"));
    assert_int_equal(sr_wind_init_log(&w, 5.0, 0, 2.0, 0.1, 3.0, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "reference height"));
    double h[] = {0, 100, 100}, s[] = {1, 2, 3}, f[] = {0, 0, 0};
    assert_int_equal(sr_wind_init_table(&w, h, s, f, 3, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "wind row 3"));
}

static void test_csv(void **state)
{
    (void)state;
    sr_wind w;
    sr_error e;
    const char *ok = sr_test_tmpfile(".csv", "# winds aloft, invented\n"
                                             "altitude [m],speed [kn],from [deg]\n"
                                             "1400,10,240\n"
                                             "2400,20,260\n");
    assert_int_equal(sr_windtable_load(&w, ok, 1400.0, &e), SR_OK);
    double east, north;
    sr_wind_at(&w, 0.0, &east, &north);
    /* 10 kn from 240 deg: 1 kn = 1852/3600 m/s exactly (NIST SP 811) */
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "table wind at the site from an altitude column in knots",
                    "NIST SP 811 (2008) App. B: 1 kn = 1852/3600 m/s", 10 * 1852.0 / 3600.0, hypot(east, north), 1e-12);
    assert_true(fabs(sr_wind_top(&w) - 1000.0) < 1e-9);
    sr_wind_release(&w);

    struct {
        const char *text, *want;
    } bad[] = {
        {"height [m],speed [m/s]\n0,5\n", ":1:"},                                /* no from column */
        {"height [m],altitude [m],speed [m/s],from [deg]\n0,0,5,90\n", ":1:1"},  /* both heights */
        {"height [m],speed [m/s],from [deg]\n0,5,90\n100,6,90\n50,7,90\n", ":4:1"},  /* not increasing */
        {"height [m],speed [m/s],from [deg]\n0,5,90\n100,600,90\n", ":3:1"},      /* absurd speed */
        {"height [m],speed [m],from [deg]\n0,5,90\n", ":1:"},                     /* wrong unit */
    };
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++) {
        const char *p = sr_test_tmpfile(".csv", bad[i].text);
        assert_int_not_equal(sr_windtable_load(&w, p, 0.0, &e), SR_OK);
        if (!strstr(e.msg, bad[i].want))
            fail_msg("case %zu: '%s' lacks '%s'", i, e.msg, bad[i].want);
        assert_non_null(strstr(e.msg, p));
    }
    const char *snd = sr_test_tmpfile(".csv", "altitude [m],temperature [C],pressure [hPa]\n0,15,1013.25\n"
                                              "1000,8.5,898.7\n");
    assert_int_equal(sr_windtable_load_sounding(&w, snd, 0.0, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "no 'wind-speed'"));
}

#define SRC_GRADIENT                                                                                            \
    "ASCE 7 exposure C gradient height z_g = 900 ft = 274.32 m; Davenport's open-country profile about 270-300 m " \
    "(from memory)"

/* Above the gradient height a law is held at its value there (when the
 * mission gives one), and without one its use above it is warned about. */
static void test_gradient_height(void **state)
{
    (void)state;
    CHECK_REL_CLASS(SR_CHECK_MEMORY, "gradient height over open country (top of the layer a wind law describes)",
                    SRC_GRADIENT, 274.32, SR_WIND_GRADIENT_HEIGHT, 0.1);
    static const struct {
        int log_law;
        double alpha, z0;
    } C[] = {{0, 1.0 / 7.0, 0}, {0, 0.3, 0}, {1, 0, 0.03}};
    for (size_t i = 0; i < sizeof C / sizeof C[0]; i++) {
        sr_wind w;
        sr_error e;
        int rc = C[i].log_law ? sr_wind_init_log(&w, 6.0, 250 * DEG, 10.0, C[i].z0, 0.0, &e)
                              : sr_wind_init_power(&w, 6.0, 250 * DEG, 10.0, C[i].alpha, &e);
        assert_int_equal(rc, SR_OK);
        double free_below = speed_at(&w, 200.0), free_above = speed_at(&w, 2900.0);
        /* the law reaches far above its gradient height unwarned no more */
        char buf[600];
        assert_int_equal(sr_wind_check_extrapolation(&w, 2900.0, SR_UNITS_SI, buf, sizeof buf), 1);
        assert_non_null(strstr(buf, "extrapolated from its reference height (10 m) to 2900 m above ground"));
        assert_int_equal(sr_wind_check_extrapolation(&w, 250.0, SR_UNITS_SI, buf, sizeof buf), 0);
        assert_int_equal(sr_wind_set_gradient_height(&w, 300.0, &e), SR_OK);
        assert_int_equal(sr_wind_check_extrapolation(&w, 2900.0, SR_UNITS_SI, buf, sizeof buf), 0);
        /* below the gradient height the law is untouched; above it, its value there */
        double at300 = C[i].log_law ? 6.0 * log(300.0 / C[i].z0) / log(10.0 / C[i].z0) : 6.0 * pow(30.0, C[i].alpha);
        CHECK_REL_CLASS(SR_CHECK_DERIVED, C[i].log_law ? "log-law wind held above a 300 m gradient height"
                                                       : "power-law wind held above a 300 m gradient height",
                        C[i].log_law ? SRC_LOG "; held above the gradient height (docs/method.md 11, our rule)"
                                     : SRC_POWER "; held above the gradient height (docs/method.md 11, our rule)",
                        at300, speed_at(&w, 2900.0), 1e-12);
        assert_true(speed_at(&w, 200.0) == free_below);
        assert_true(speed_at(&w, 2900.0) < free_above);
        size_t nk;
        const double *k = sr_wind_knots(&w, &nk);
        assert_true(nk == 1 && k[0] == 300.0);
        sr_wind_describe(&w, SR_UNITS_SI, buf, sizeof buf);
        assert_non_null(strstr(buf, "held constant above 300 m"));
        /* a figure under --units us says it in feet (300 m = 984.25 ft, exact by the international foot) */
        sr_wind_describe(&w, SR_UNITS_US, buf, sizeof buf);
        assert_non_null(strstr(buf, "held constant above 984 ft"));
        assert_null(strstr(buf, " m/s"));
    }
    /* the case of the issue: exponent 0.3 from 10 m/s at 10 m reaches 55 m/s at 3 km, now with a warning */
    sr_wind w;
    sr_error e;
    assert_int_equal(sr_wind_init_power(&w, 10.0, 0, 10.0, 0.3, &e), SR_OK);
    char buf[600];
    assert_int_equal(sr_wind_check_extrapolation(&w, 3000.0, SR_UNITS_SI, buf, sizeof buf), 1);
    assert_non_null(strstr(buf, "blows 55.4 m/s"));
    assert_int_equal(sr_wind_check_extrapolation(&w, 3000.0, SR_UNITS_US, buf, sizeof buf), 1);
    assert_non_null(strstr(buf, "to 9843 ft above ground"));
    /* only laws have a gradient height, and it lies above the reference */
    assert_int_equal(sr_wind_set_gradient_height(&w, 5.0, &e), SR_EINVAL);
    assert_int_equal(sr_wind_set_gradient_height(&w, 6000.0, &e), SR_EINVAL);
    assert_int_equal(sr_wind_init_constant(&w, 5.0, 0, &e), SR_OK);
    assert_int_equal(sr_wind_set_gradient_height(&w, 300.0, &e), SR_EINVAL);
    assert_int_equal(sr_wind_check_extrapolation(&w, 3000.0, SR_UNITS_SI, buf, sizeof buf), 0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_profile_ratios), cmocka_unit_test(test_direction_convention),
        cmocka_unit_test(test_table_components), cmocka_unit_test(test_bad_models), cmocka_unit_test(test_csv),
        cmocka_unit_test(test_gradient_height),
    };
    return cmocka_run_group_tests_name("wind", tests, NULL, NULL);
}
