/* test_geodesy.c - local east/north to WGS 84 and back (physics/geodesy.c,
 * PROJ's geodesic routines): the length of a degree of latitude and of
 * longitude on WGS 84, distances and azimuths against Vincenty's inverse
 * formula written in the test, the round trip, and the range checks. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "physics/geodesy.h"
#include "testutil.h"
#include "vincenty.h"

#define SRC_DEGREE "length of a degree of latitude on WGS 84 (geodesy tables), from memory"
#define SRC_WGS84 "WGS 84 (NIMA TR8350.2): a = 6378137 m; the equator is a circle of radius a, 1 deg = 2 pi a / 360"

/* A degree of latitude, centred on lat, is the local meridian arc: the
 * table gives it to the metre (it grows from the equator to the pole as the
 * ellipsoid flattens). Between lat - 0.5 and lat + 0.5 the arc differs from
 * the local value by less than 0.1 m. */
static void test_degree_of_latitude(void **state)
{
    (void)state;
    static const struct {
        double lat, metres;
    } T[] = {{0, 110574}, {15, 110649}, {30, 110852}, {45, 111132}, {60, 111412}, {75, 111618}};
    for (size_t i = 0; i < sizeof T / sizeof T[0]; i++) {
        sr_geo o;
        sr_error e;
        assert_int_equal(sr_geo_init(&o, T[i].lat - 0.5, 10.0, &e), SR_OK);
        double east, north;
        sr_geo_inverse(&o, T[i].lat + 0.5, 10.0, &east, &north);
        char q[96];
        snprintf(q, sizeof q, "one degree of latitude at %g deg (m)", T[i].lat);
        CHECK_REL_CLASS(SR_CHECK_MEMORY, q, SRC_DEGREE, T[i].metres, north, 1e-5);
        assert_true(fabs(east) < 1e-6);
        /* and forward: that far north lands one degree on */
        double lat, lon;
        sr_geo_forward(&o, 0.0, north, &lat, &lon);
        assert_true(fabs(lat - (T[i].lat + 0.5)) < 1e-9 && fabs(lon - 10.0) < 1e-9);
    }
}

static void test_degree_of_longitude_on_the_equator(void **state)
{
    (void)state;
    sr_geo o;
    sr_error e;
    assert_int_equal(sr_geo_init(&o, 0.0, 0.0, &e), SR_OK);
    double lat, lon, d = 2.0 * 3.14159265358979323846 * SR_WGS84_A / 360.0;
    sr_geo_forward(&o, d, 0.0, &lat, &lon);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "longitude reached 2 pi a / 360 east along the equator (deg)", SRC_WGS84, 1.0,
                    lon, 1e-12);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "latitude stays 0 along the equator (deg)", SRC_WGS84, 0.0, lat, 1e-12);
}

/* Points up to 60 km from launch points around the globe: the geodesic
 * distance and azimuth of each by Vincenty's formula equal the local east
 * and north the point was placed with, and the library's inverse returns
 * them. */
static void test_against_vincenty(void **state)
{
    (void)state;
    static const double SITES[][2] = {{28.95, -105.35}, {-33.9, 18.4}, {64.1, -21.9}, {0.0, 179.5}, {-77.8, 166.7}};
    static const double PTS[][2] = {{1233.0, 449.0}, {-500.0, 20.0}, {0.0, -3000.0}, {15000.0, 15000.0},
                                    {-42000.0, 41000.0}, {60000.0, 0.0}};
    double worst_d = 0, worst_a = 0, worst_rt = 0;
    for (size_t i = 0; i < sizeof SITES / sizeof SITES[0]; i++) {
        sr_geo o;
        sr_error e;
        assert_int_equal(sr_geo_init(&o, SITES[i][0], SITES[i][1], &e), SR_OK);
        for (size_t k = 0; k < sizeof PTS / sizeof PTS[0]; k++) {
            double lat, lon, s = NAN, az = NAN, east, north;
            sr_geo_forward(&o, PTS[k][0], PTS[k][1], &lat, &lon);
            assert_int_equal(sr_vincenty_inverse(o.lat0, o.lon0, lat, lon, &s, &az), 0);
            double d0 = hypot(PTS[k][0], PTS[k][1]);
            double a0 = atan2(PTS[k][0], PTS[k][1]) * 180.0 / 3.14159265358979323846;
            a0 = a0 < 0 ? a0 + 360.0 : a0;
            double da = fabs(az - a0);
            da = fmin(da, 360.0 - da);
            worst_d = fmax(worst_d, fabs(s - d0));
            worst_a = fmax(worst_a, da * 3.14159265358979323846 / 180.0 * d0); /* as metres across */
            sr_geo_inverse(&o, lat, lon, &east, &north);
            worst_rt = fmax(worst_rt, hypot(east - PTS[k][0], north - PTS[k][1]));
        }
    }
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "distance of 30 points from their launch point, worst error (m)",
                    SR_SRC_VINCENTY, 0.0, worst_d, 1e-3);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "azimuth of 30 points from their launch point, worst error across (m)",
                    SR_SRC_VINCENTY, 0.0, worst_a, 1e-3);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "east/north -> WGS 84 -> east/north round trip, worst error (m)",
                    "PROJ geod_direct against geod_inverse", 0.0, worst_rt, 1e-6);
}

static void test_ranges(void **state)
{
    (void)state;
    sr_geo o;
    sr_error e;
    assert_int_equal(sr_geo_init(&o, 90.5, 0.0, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "latitude"));
    assert_int_equal(sr_geo_init(&o, 0.0, -181.0, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "longitude"));
    assert_int_equal(sr_geo_init(&o, NAN, 0.0, &e), SR_EINVAL);
    assert_int_equal(sr_geo_init(&o, 90.0, 180.0, &e), SR_OK);
    /* the distance to the pole: a quarter meridian, 10001.966 km on WGS 84 (from memory) */
    assert_int_equal(sr_geo_init(&o, 0.0, 0.0, &e), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_MEMORY, "quarter meridian of WGS 84 (m)", "WGS 84 quarter meridian 10001.966 km, from memory",
                    10001966.0, sr_geo_pole_distance(&o), 2e-7);
    /* unrolled longitude across the antimeridian */
    assert_int_equal(sr_geo_init(&o, 0.0, 179.99, &e), SR_OK);
    double lat, lon;
    sr_geo_forward(&o, 5000.0, 0.0, &lat, &lon);
    assert_true(lon > 180.0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_degree_of_latitude),
        cmocka_unit_test(test_degree_of_longitude_on_the_equator),
        cmocka_unit_test(test_against_vincenty),
        cmocka_unit_test(test_ranges),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
