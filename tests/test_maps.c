/* test_maps.c - `profile --trajectory`, `profile --geojson` and
 * `dispersion --geojson`: the trajectory read back (CSV with libcsv, JSON
 * with Jansson) agrees with the profile's event timeline, touchdown table
 * and drag band; every GeoJSON file meets RFC 7946's structure (types,
 * [longitude, latitude] positions, closed counterclockwise rings, bbox),
 * and its coordinates, read back with Vincenty's inverse formula and with
 * PROJ's, sit at the east/north the reports give. */
#define _DEFAULT_SOURCE
#include <csv.h>
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "physics/geodesy.h"
#include "testutil.h"
#include "vincenty.h"

#define REVISED "payloads/desert-club-rocket-revised.yaml"
#define DEMO "payloads/desert-club-rocket.yaml"
#define PI 3.14159265358979323846
#define SRC_RFC "RFC 7946 (GeoJSON): sections 3, 3.1.1 positions, 3.1.6 rings, 5 bbox"
#define SRC_ONE "the profile's own event timeline and touchdown table (same run)"
#define SR_TEST_MAXPOS 100000

/* ---- reading files back ---- */

/* A CSV table read with libcsv: '#' comment lines skipped, the header row
 * kept as row 0. */
typedef struct table {
    char ***cell;
    size_t *ncell;
    size_t nrows, cap;
    char **cur;
    size_t ncur;
} table;

static void on_field(void *s, size_t len, void *ud)
{
    table *t = ud;
    t->cur = realloc(t->cur, (t->ncur + 1) * sizeof *t->cur);
    t->cur[t->ncur] = strndup(s ? s : "", len);
    t->ncur++;
}

static void on_row(int c, void *ud)
{
    (void)c;
    table *t = ud;
    if (t->nrows == t->cap) {
        t->cap = t->cap ? 2 * t->cap : 64;
        t->cell = realloc(t->cell, t->cap * sizeof *t->cell);
        t->ncell = realloc(t->ncell, t->cap * sizeof *t->ncell);
    }
    t->cell[t->nrows] = t->cur;
    t->ncell[t->nrows] = t->ncur;
    t->nrows++;
    t->cur = NULL;
    t->ncur = 0;
}

static void read_csv(const char *text, table *t)
{
    memset(t, 0, sizeof *t);
    struct csv_parser p;
    assert_int_equal(csv_init(&p, CSV_STRICT), 0);
    const char *s = text;
    while (*s) {
        const char *e = strchr(s, '\n');
        size_t l = e ? (size_t)(e - s + 1) : strlen(s);
        if (s[0] != '#')
            assert_int_equal(csv_parse(&p, s, l, on_field, on_row, t), l);
        s += l;
    }
    csv_fini(&p, on_field, on_row, t);
    csv_free(&p);
}

static void free_table(table *t)
{
    for (size_t i = 0; i < t->nrows; i++) {
        for (size_t k = 0; k < t->ncell[i]; k++)
            free(t->cell[i][k]);
        free(t->cell[i]);
    }
    free(t->cell);
    free(t->ncell);
}

static int column(const table *t, const char *head)
{
    for (size_t k = 0; k < t->ncell[0]; k++)
        if (strcmp(t->cell[0][k], head) == 0)
            return (int)k;
    fail_msg("no column '%s' in the trajectory", head);
    return -1;
}

static double num(const table *t, size_t row, int col)
{
    return atof(t->cell[row][col]);
}

/* The column index of key in a report JSON table. */
static size_t jcol(json_t *tab, const char *key)
{
    json_t *cols = json_object_get(tab, "columns");
    for (size_t k = 0; k < json_array_size(cols); k++)
        if (strcmp(json_string_value(json_object_get(json_array_get(cols, k), "key")), key) == 0)
            return k;
    fail_msg("no column '%s'", key);
    return 0;
}

static double jrow(json_t *tab, size_t i, const char *key)
{
    return json_number_value(json_array_get(json_array_get(json_object_get(tab, "rows"), i), jcol(tab, key)));
}

static const char *jrow_s(json_t *tab, size_t i, const char *key)
{
    return json_string_value(json_array_get(json_array_get(json_object_get(tab, "rows"), i), jcol(tab, key)));
}

/* ---- trajectories ---- */

/* Every event of the timeline appears in the trajectory with the same time,
 * height, speeds, dynamic pressure and Mach number; the last row of the body
 * is its touchdown, at the touchdown table's time and landing point; height
 * and altitude differ by the site elevation. */
static void test_trajectory_csv_matches_events(void **state)
{
    (void)state;
    char path[512];
    snprintf(path, sizeof path, "%s", sr_test_tmpfile(".csv", ""));
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", sr_test_path(REVISED), "--format", "json", "--trajectory", path, NULL);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *doc = json_loads(out, 0, &je);
    assert_non_null(doc);
    json_t *tl = json_object_get(json_object_get(doc, "tables"), "timeline");
    json_t *td = json_object_get(json_object_get(doc, "tables"), "touchdown");
    char *text = sr_test_slurp(path, NULL);
    assert_non_null(text);
    assert_non_null(strstr(text, "# CAUTION: preliminary engineering estimates only."));
    table t;
    read_csv(text, &t);
    assert_true(t.nrows > 100);
    int ct = column(&t, "time [s]"), ch = column(&t, "height [m]"), ca = column(&t, "altitude [m]"),
        cr = column(&t, "descent_rate [m/s]"), cv = column(&t, "airspeed [m/s]"), ce = column(&t, "east [m]"),
        cn = column(&t, "north [m]"), cq = column(&t, "dynamic_pressure [Pa]"), cm = column(&t, "mach"),
        cs = column(&t, "stage"), cev = column(&t, "event");
    size_t nev = json_array_size(json_object_get(tl, "rows"));
    assert_true(nev >= 6);
    double worst = 0.0;
    for (size_t i = 0; i < nev; i++) {
        const char *ev = jrow_s(tl, i, "event"), *st = jrow_s(tl, i, "stage");
        double time = jrow(tl, i, "time");
        size_t found = 0;
        for (size_t r = 1; r < t.nrows; r++)
            if (strcmp(t.cell[r][cev], ev) == 0 && (!st[0] || strcmp(t.cell[r][cs], st) == 0) &&
                fabs(num(&t, r, ct) - time) <= 1e-9 * (1 + time)) {
                found = r;
                break;
            }
        if (!found)
            fail_msg("event '%s' (%s) at %g s is not in the trajectory", ev, st, time);
        const char *keys[] = {"height", "airspeed", "rate", "dynamic_pressure", "mach"};
        int cols[] = {ch, cv, cr, cq, cm};
        for (int k = 0; k < 5; k++) {
            double a = jrow(tl, i, keys[k]), b = num(&t, found, cols[k]);
            worst = fmax(worst, fabs(a - b) / fmax(fabs(a), 1e-3));
        }
    }
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "trajectory rows at the timeline's events, worst relative difference",
                    SRC_ONE, 0.0, worst, 1e-9);
    /* time in order, height and altitude 1380 m apart, the last row the touchdown */
    for (size_t r = 2; r < t.nrows; r++)
        assert_true(num(&t, r, ct) >= num(&t, r - 1, ct));
    for (size_t r = 1; r < t.nrows; r++)
        assert_true(fabs(num(&t, r, ca) - num(&t, r, ch) - 1380.0) < 1e-6);
    size_t last = t.nrows - 1;
    assert_string_equal(t.cell[last][cev], "touchdown");
    assert_true(fabs(num(&t, last, ch)) < 1e-6);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "trajectory touchdown time (s)", SRC_ONE, jrow(td, 0, "time"),
                    num(&t, last, ct), 1e-9);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "trajectory landing point east (m)", SRC_ONE, jrow(td, 0, "east"),
                    num(&t, last, ce), 1e-6);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "trajectory landing point north (m)", SRC_ONE, jrow(td, 0, "north"),
                    num(&t, last, cn), 1e-6);
    /* the stages: none before the first deployment, then the drogue, the main at the end */
    assert_string_equal(t.cell[1][cs], "none");
    assert_string_equal(t.cell[last][cs], "main");
    free_table(&t);
    free(text);
    json_decref(doc);
    free(out);
    free(err);
}

/* JSON trajectory with the band ends: three runs, each ending at the
 * touchdown time the profile gives for that end of the band. */
static void test_trajectory_json_band_ends(void **state)
{
    (void)state;
    char path[512];
    snprintf(path, sizeof path, "%s", sr_test_tmpfile(".json", ""));
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", sr_test_path(REVISED), "--format", "json", "--trajectory", path,
                         "--band-ends", NULL);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *doc = json_loads(out, 0, &je), *tj = json_load_file(path, 0, &je);
    assert_non_null(doc);
    assert_non_null(tj);
    assert_string_equal(json_string_value(json_object_get(tj, "caution")), json_string_value(json_object_get(doc, "caution")));
    json_t *tab = json_object_get(json_object_get(tj, "tables"), "trajectory");
    assert_non_null(tab);
    json_t *band = json_object_get(json_object_get(doc, "values"), "descent_time");
    const char *runs[] = {"typical drag", "low drag", "high drag"};
    double t_end[3] = {NAN, NAN, NAN};
    size_t n = json_array_size(json_object_get(tab, "rows"));
    for (size_t i = 0; i < n; i++)
        for (int k = 0; k < 3; k++)
            if (strcmp(jrow_s(tab, i, "run"), runs[k]) == 0 && strcmp(jrow_s(tab, i, "event"), "touchdown") == 0)
                t_end[k] = jrow(tab, i, "time");
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "trajectory touchdown, typical drag (s)", "the profile's descent-time band",
                    json_number_value(json_object_get(band, "typical")), t_end[0], 1e-9);
    /* low drag comes down fastest: the short end of the time band */
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "trajectory touchdown, low drag (s)", "the profile's descent-time band",
                    json_number_value(json_object_get(band, "low")), t_end[1], 1e-9);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "trajectory touchdown, high drag (s)", "the profile's descent-time band",
                    json_number_value(json_object_get(band, "high")), t_end[2], 1e-9);
    json_decref(doc);
    json_decref(tj);
    free(out);
    free(err);
}

/* --units us: the same rows in ft, ft/s and psf. */
static void test_trajectory_us(void **state)
{
    (void)state;
    char p1[512], p2[512];
    snprintf(p1, sizeof p1, "%s", sr_test_tmpfile(".csv", ""));
    snprintf(p2, sizeof p2, "%s", sr_test_tmpfile(".csv", ""));
    assert_int_equal(sr_test_cli(NULL, NULL, "profile", sr_test_path(REVISED), "--trajectory", p1, NULL), 0);
    assert_int_equal(sr_test_cli(NULL, NULL, "profile", sr_test_path(REVISED), "--trajectory", p2, "--units", "us",
                                 NULL),
                     0);
    char *a = sr_test_slurp(p1, NULL), *b = sr_test_slurp(p2, NULL);
    table ta, tb;
    read_csv(a, &ta);
    read_csv(b, &tb);
    assert_int_equal(ta.nrows, tb.nrows);
    int h1 = column(&ta, "height [m]"), h2 = column(&tb, "height [ft]"), q1 = column(&ta, "dynamic_pressure [Pa]"),
        q2 = column(&tb, "dynamic_pressure [psf]"), v2 = column(&tb, "airspeed [ft/s]");
    (void)v2;
    size_t mid = ta.nrows / 2;
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "trajectory height under --units us (ft)", "NIST SP 811: 1 ft = 0.3048 m",
                    num(&ta, mid, h1) / 0.3048, num(&tb, mid, h2), 1e-9);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "trajectory dynamic pressure under --units us (psf)",
                    "NIST SP 811: 1 lbf/ft2 = 47.88026 Pa", num(&ta, mid, q1) / 47.88025898033584, num(&tb, mid, q2),
                    1e-8);
    free_table(&ta);
    free_table(&tb);
    free(a);
    free(b);
}

/* ---- GeoJSON ---- */

static int is_position(json_t *p)
{
    if (!json_is_array(p) || json_array_size(p) < 2 || json_array_size(p) > 3)
        return 0;
    for (size_t i = 0; i < json_array_size(p); i++)
        if (!json_is_number(json_array_get(p, i)))
            return 0;
    double lon = json_number_value(json_array_get(p, 0)), lat = json_number_value(json_array_get(p, 1));
    return lon >= -180.0 && lon <= 180.0 && lat >= -90.0 && lat <= 90.0;
}

/* Twice the signed area of a ring in (longitude, latitude): positive when
 * it runs counterclockwise. */
static double ring_area(json_t *ring)
{
    double a = 0.0;
    for (size_t i = 0; i + 1 < json_array_size(ring); i++) {
        json_t *p = json_array_get(ring, i), *q = json_array_get(ring, i + 1);
        a += json_number_value(json_array_get(p, 0)) * json_number_value(json_array_get(q, 1)) -
             json_number_value(json_array_get(q, 0)) * json_number_value(json_array_get(p, 1));
    }
    return a;
}

static int in_bbox(json_t *bbox, json_t *p)
{
    double lon = json_number_value(json_array_get(p, 0)), lat = json_number_value(json_array_get(p, 1));
    return lon >= json_number_value(json_array_get(bbox, 0)) && lat >= json_number_value(json_array_get(bbox, 1)) &&
           lon <= json_number_value(json_array_get(bbox, 2)) && lat <= json_number_value(json_array_get(bbox, 3));
}

/* The structure RFC 7946 asks for; returns the number of violations (each
 * printed) and counts the features. Every number among the properties has
 * its unit beside it (key_unit), counts and shares excepted. */
static int check_rfc7946(json_t *doc, size_t *nfeat)
{
    int bad = 0;
#define BAD(...) (print_message(__VA_ARGS__), print_message("\n"), bad++)
    if (!json_is_object(doc) || strcmp(json_string_value(json_object_get(doc, "type")) ?: "", "FeatureCollection"))
        return BAD("not a FeatureCollection"), bad;
    if (json_object_get(doc, "crs"))
        BAD("a crs member (RFC 7946 section 4 removed it)");
    json_t *bbox = json_object_get(doc, "bbox");
    if (bbox && (json_array_size(bbox) != 4 || json_number_value(json_array_get(bbox, 0)) >
                                                   json_number_value(json_array_get(bbox, 2)) ||
                 json_number_value(json_array_get(bbox, 1)) > json_number_value(json_array_get(bbox, 3))))
        BAD("bbox is not [west, south, east, north]");
    json_t *fs = json_object_get(doc, "features");
    if (!json_is_array(fs))
        return BAD("no features array"), bad;
    *nfeat = json_array_size(fs);
    for (size_t i = 0; i < json_array_size(fs); i++) {
        json_t *f = json_array_get(fs, i), *g = json_object_get(f, "geometry"), *pr = json_object_get(f, "properties");
        if (strcmp(json_string_value(json_object_get(f, "type")) ?: "", "Feature"))
            BAD("feature %zu: type is not Feature", i);
        if (!json_is_object(pr))
            BAD("feature %zu: properties is not an object", i);
        const char *key;
        json_t *v;
        json_object_foreach(pr, key, v)
        {
            char uk[160];
            snprintf(uk, sizeof uk, "%s_unit", key);
            if (json_is_real(v) && !json_object_get(pr, uk) && strcmp(key, "normal_share_percent") != 0)
                BAD("feature %zu: property %s has no unit", i, key);
        }
        const char *type = json_string_value(json_object_get(g, "type")) ?: "";
        json_t *c = json_object_get(g, "coordinates");
        size_t np = 0;
        static json_t *pos[SR_TEST_MAXPOS];
        if (!strcmp(type, "Point")) {
            pos[np++] = c;
        } else if (!strcmp(type, "LineString")) {
            if (json_array_size(c) < 2)
                BAD("feature %zu: a LineString needs two or more positions", i);
            for (size_t k = 0; k < json_array_size(c) && np < SR_TEST_MAXPOS; k++)
                pos[np++] = json_array_get(c, k);
        } else if (!strcmp(type, "Polygon")) {
            for (size_t r = 0; r < json_array_size(c); r++) {
                json_t *ring = json_array_get(c, r);
                size_t n = json_array_size(ring);
                if (n < 4)
                    BAD("feature %zu: a linear ring needs four or more positions", i);
                else if (!json_equal(json_array_get(ring, 0), json_array_get(ring, n - 1)))
                    BAD("feature %zu: ring %zu is not closed", i, r);
                double a = ring_area(ring);
                if ((r == 0 && a <= 0) || (r > 0 && a >= 0))
                    BAD("feature %zu: ring %zu runs the wrong way (exterior counterclockwise, holes clockwise)", i,
                        r);
                for (size_t k = 0; k < n && np < SR_TEST_MAXPOS; k++)
                    pos[np++] = json_array_get(ring, k);
            }
        } else {
            BAD("feature %zu: unexpected geometry type '%s'", i, type);
        }
        for (size_t k = 0; k < np; k++) {
            if (!is_position(pos[k]))
                BAD("feature %zu: position %zu is not [longitude, latitude] in range", i, k);
            else if (bbox && !in_bbox(bbox, pos[k]))
                BAD("feature %zu: position %zu lies outside the bbox", i, k);
        }
    }
#undef BAD
    return bad;
}

/* Local east/north of a position from the launch point: by Vincenty's
 * formula, and by PROJ's inverse. */
static void local_of(const sr_geo *o, json_t *p, double *e_v, double *n_v, double *e_p, double *n_p)
{
    double lon = json_number_value(json_array_get(p, 0)), lat = json_number_value(json_array_get(p, 1)), s = NAN,
           az = NAN;
    assert_int_equal(sr_vincenty_inverse(o->lat0, o->lon0, lat, lon, &s, &az), 0);
    *e_v = s * sin(az * PI / 180.0);
    *n_v = s * cos(az * PI / 180.0);
    sr_geo_inverse(o, lat, lon, e_p, n_p);
}

static json_t *feature_of(json_t *doc, const char *kind, size_t nth)
{
    json_t *fs = json_object_get(doc, "features");
    for (size_t i = 0; i < json_array_size(fs); i++) {
        json_t *f = json_array_get(fs, i);
        if (strcmp(json_string_value(json_object_get(json_object_get(f, "properties"), "kind")), kind) == 0 &&
            nth-- == 0)
            return f;
    }
    return NULL;
}

static json_t *coords(json_t *f)
{
    return json_object_get(json_object_get(f, "geometry"), "coordinates");
}

/* The landing points of the profile's map sit where its touchdown table
 * says (east and north from the launch point), within the 10 significant
 * digits of the coordinates (about 1 cm). */
static void test_geojson_profile(void **state)
{
    (void)state;
    char path[512];
    snprintf(path, sizeof path, "%s", sr_test_tmpfile(".geojson", ""));
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", sr_test_path(REVISED), "--format", "json", "--geojson", path,
                         "--band-ends", NULL);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *doc = json_loads(out, 0, &je), *map = json_load_file(path, 0, &je);
    assert_non_null(map);
    size_t nf = 0;
    int bad = check_rfc7946(map, &nf);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, "profile map: structure errors", SRC_RFC, 0, bad, 0);
    assert_true(nf >= 8);
    assert_non_null(strstr(json_string_value(json_object_get(map, "caution")), "not for designing"));
    assert_string_equal(json_string_value(json_object_get(json_object_get(doc, "values"), "launch_point")),
                        "28.9500 deg N, 105.3500 deg W (WGS 84)");
    sr_geo o;
    sr_error e;
    assert_int_equal(sr_geo_init(&o, 28.95, -105.35, &e), SR_OK);
    json_t *lp = coords(feature_of(map, "launch point", 0));
    assert_true(fabs(json_number_value(json_array_get(lp, 0)) + 105.35) < 1e-12);
    assert_true(fabs(json_number_value(json_array_get(lp, 1)) - 28.95) < 1e-12);
    json_t *td = json_object_get(json_object_get(doc, "tables"), "touchdown");
    /* the first landing point is the typical run's */
    json_t *land = feature_of(map, "landing point", 0);
    assert_string_equal(json_string_value(json_object_get(json_object_get(land, "properties"), "run")),
                        "typical drag");
    double ev, nv, ep, np;
    local_of(&o, coords(land), &ev, &nv, &ep, &np);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "map landing point east of the launch point (m)", SR_SRC_VINCENTY,
                    jrow(td, 0, "east"), ev, 0.02);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "map landing point north of the launch point (m)", SR_SRC_VINCENTY,
                    jrow(td, 0, "north"), nv, 0.02);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "map landing point east, PROJ inverse (m)", "PROJ geod_inverse",
                    jrow(td, 0, "east"), ep, 0.02);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "map landing point north, PROJ inverse (m)", "PROJ geod_inverse",
                    jrow(td, 0, "north"), np, 0.02);
    /* the track ends at the landing point; the drift limit is a circle of 1500 m around the launch point */
    json_t *track = coords(feature_of(map, "trajectory", 0));
    double te, tn, tpe, tpn;
    local_of(&o, json_array_get(track, json_array_size(track) - 1), &te, &tn, &tpe, &tpn);
    assert_true(hypot(te - ev, tn - nv) < 0.05);
    json_t *ring = json_array_get(coords(feature_of(map, "drift limit", 0)), 0);
    double worst = 0.0;
    for (size_t k = 0; k < json_array_size(ring); k++) {
        local_of(&o, json_array_get(ring, k), &ev, &nv, &ep, &np);
        worst = fmax(worst, fabs(hypot(ev, nv) - 1500.0));
    }
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "drift-limit circle: distance of its vertices from the launch point (m)",
                    SR_SRC_VINCENTY, 0.0, worst, 0.02);
    /* three runs: three landing points */
    assert_non_null(feature_of(map, "landing point", 2));
    assert_null(feature_of(map, "landing point", 3));
    json_decref(doc);
    json_decref(map);
    free(out);
    free(err);
}

/* The footprint: the mean landing point where the report puts it, the
 * ellipses' vertices on the ellipse of the report's axes and bearing, the
 * circles at their radii, at most the asked number of sample points. */
static void test_geojson_dispersion(void **state)
{
    (void)state;
    char path[512];
    snprintf(path, sizeof path, "%s", sr_test_tmpfile(".geojson", ""));
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "dispersion", sr_test_path(DEMO), "-n", "2000", "--seed", "3", "--format", "json",
                         "--geojson", path, "--geojson-samples", "150", NULL);
    assert_int_equal(rc, 1); /* the first demo design breaks its limits */
    json_error_t je;
    json_t *doc = json_loads(out, 0, &je), *map = json_load_file(path, 0, &je);
    assert_non_null(doc);
    assert_non_null(map);
    size_t nf = 0;
    int bad = check_rfc7946(map, &nf);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, "dispersion map: structure errors", SRC_RFC, 0, bad, 0);
    json_t *vals = json_object_get(doc, "values");
#define V(k) json_number_value(json_object_get(json_object_get(vals, k), "value"))
    sr_geo o;
    sr_error e;
    assert_int_equal(sr_geo_init(&o, 28.95, -105.35, &e), SR_OK);
    double ev, nv, ep, np;
    local_of(&o, coords(feature_of(map, "mean landing point", 0)), &ev, &nv, &ep, &np);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "map mean landing point east (m)", SR_SRC_VINCENTY, V("mean_east"), ev, 0.02);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "map mean landing point north (m)", SR_SRC_VINCENTY, V("mean_north"), nv, 0.02);
    /* every vertex of the 3-sigma ellipse: ((d.u)/a)^2 + ((d.w)/b)^2 = 1 */
    double b = V("ellipse_bearing") * PI / 180.0, A = V("sigma3_major"), B = V("sigma3_minor"), worst = 0.0;
    json_t *ring = json_array_get(coords(feature_of(map, "3-sigma ellipse", 0)), 0);
    for (size_t k = 0; k < json_array_size(ring); k++) {
        local_of(&o, json_array_get(ring, k), &ev, &nv, &ep, &np);
        double de = ev - V("mean_east"), dn = nv - V("mean_north");
        double x = de * sin(b) + dn * cos(b), y = -de * cos(b) + dn * sin(b);
        worst = fmax(worst, fabs(hypot(x / A, y / B) - 1.0));
    }
    /* coordinates carry 10 digits: about 1 cm */
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "3-sigma ellipse vertices against the report's axes, worst (x/a, y/b) radius - 1",
                    SR_SRC_VINCENTY, 0.0, worst, 1e-4);
    ring = json_array_get(coords(feature_of(map, "95 % circle around the mean", 0)), 0);
    worst = 0.0;
    for (size_t k = 0; k < json_array_size(ring); k++) {
        local_of(&o, json_array_get(ring, k), &ev, &nv, &ep, &np);
        worst = fmax(worst, fabs(hypot(ev - V("mean_east"), nv - V("mean_north")) - V("r95_mean")));
    }
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "95 % circle vertices: distance from the mean landing point - radius (m)",
                    SR_SRC_VINCENTY, 0.0, worst, 0.05);
    size_t ns = 0;
    while (feature_of(map, "sample landing point", ns))
        ns++;
    assert_true(ns > 100 && ns <= 150);
    assert_non_null(feature_of(map, "drift limit", 0));
    assert_non_null(feature_of(map, "1-sigma ellipse", 0));
    assert_non_null(feature_of(map, "50 % circle around the launch point", 0));
#undef V
    json_decref(doc);
    json_decref(map);
    free(out);
    free(err);
}

static const char *mission_at(double lat, double lon, const char *extra)
{
    static char buf[4096];
    snprintf(buf, sizeof buf,
             "mission: map test (invented)\n"
             "site:\n  latitude: %g deg\n  longitude: %g deg\n  wind: {speed: 8 m/s, from: 270 deg}\n"
             "sections:\n  - {name: probe, mass: 2 kg}\n"
             "stages:\n  - {name: main, family: conical, nominal-diameter: 1.5 m}\n"
             "start: {height: 1500 m}\n%s",
             lat, lon, extra);
    return sr_test_tmpfile(".yaml", buf);
}

static void test_geojson_refusals(void **state)
{
    (void)state;
    char path[512];
    snprintf(path, sizeof path, "%s", sr_test_tmpfile(".geojson", ""));
    unlink(path);
    char *out, *err;
    /* a mission without a launch point on the map: exit 2, one line, no file */
    int rc = sr_test_cli(&out, &err, "profile", sr_test_path("payloads/drone-cargo-drop.yaml"), "--geojson", path,
                         NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "--geojson: the mission gives no launch point"));
    assert_int_equal(sr_test_lines(err), 1);
    assert_string_equal(out, "");
    assert_int_not_equal(access(path, F_OK), 0);
    free(out);
    free(err);
    /* a drift across the antimeridian: the writer does not split it (exit 1, nothing written) */
    rc = sr_test_cli(&out, &err, "profile", mission_at(10.0, 179.999, ""), "--geojson", path, NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "antimeridian"));
    assert_string_equal(out, "");
    assert_int_not_equal(access(path, F_OK), 0);
    free(out);
    free(err);
    /* on the other side of the globe it draws */
    rc = sr_test_cli(&out, &err, "profile", mission_at(-10.0, -179.0, ""), "--geojson", path, NULL);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *map = json_load_file(path, 0, &je);
    size_t nf;
    assert_int_equal(check_rfc7946(map, &nf), 0);
    json_decref(map);
    free(out);
    free(err);
    /* options that go together */
    rc = sr_test_cli(&out, &err, "profile", sr_test_path(REVISED), "--band-ends", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "--band-ends"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "dispersion", sr_test_path(DEMO), "--geojson-samples", "10", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "--geojson-samples: goes with --geojson"));
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_trajectory_csv_matches_events),
        cmocka_unit_test(test_trajectory_json_band_ends),
        cmocka_unit_test(test_trajectory_us),
        cmocka_unit_test(test_geojson_profile),
        cmocka_unit_test(test_geojson_dispersion),
        cmocka_unit_test(test_geojson_refusals),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
