/* test_us_customary.c - the output as hobby teams read it under --units us:
 * canopy diameters in inches (feet from 10 ft), small masses in ounces,
 * "lbs" accepted, bearings that never print 360 (in SI too), the words of
 * `size` fitting the stage, one pressure unit per output (figure subtitles
 * included), and the site model saying what was measured. */
#define _DEFAULT_SOURCE
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "testutil.h"

#define NIST "NIST SP 811 (2008) App. B"

static json_t *json_of(const char *text)
{
    json_error_t je;
    json_t *d = json_loads(text, 0, &je);
    if (!d)
        fail_msg("not JSON: %s", je.text);
    return d;
}

static const char *unit_of(json_t *doc, const char *key)
{
    return json_string_value(json_object_get(json_object_get(json_object_get(doc, "values"), key), "unit"));
}

/* A small canopy in inches, a large one in feet, both converted exactly; a
 * payload given in lbs and in oz is the same payload. */
static void test_sizes_and_masses(void **state)
{
    (void)state;
    char *out, *err, *out_si, *err_si;
    assert_int_equal(sr_test_cli(&out, &err, "size", "--mass", "12 lbs", "--speed", "20 ft/s", "--family", "conical",
                                 "--units", "us", "--format", "json", NULL),
                     0);
    assert_int_equal(sr_test_cli(&out_si, &err_si, "size", "--mass", "192 oz", "--speed", "20 ft/s", "--family",
                                 "conical", "--format", "json", NULL),
                     0);
    json_t *us = json_of(out), *si = json_of(out_si);
    assert_string_equal(unit_of(us, "nominal_diameter"), "in");
    assert_string_equal(unit_of(us, "mass"), "lb");
    json_t *d_us = json_object_get(json_object_get(us, "values"), "nominal_diameter");
    json_t *d_si = json_object_get(json_object_get(si, "values"), "nominal_diameter");
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "typical D0 of a 12 lb payload shown in inches", NIST ": 1 in = 0.0254 m",
                    json_number_value(json_object_get(d_si, "typical")) / 0.0254,
                    json_number_value(json_object_get(d_us, "typical")), 1e-9);
    json_decref(us);
    json_decref(si);
    free(out);
    free(err);
    free(out_si);
    free(err_si);
    /* 150 kg at 5 m/s needs more than 10 ft: feet */
    assert_int_equal(sr_test_cli(&out, &err, "size", "--mass", "330 lb", "--speed", "16 ft/s", "--family", "conical",
                                 "--units", "us", NULL),
                     0);
    assert_non_null(strstr(out, "nominal diameter D0 "));
    char *line = strstr(out, "nominal diameter D0 ");
    char *eol = strchr(line, '\n');
    *eol = '\0';
    assert_non_null(strstr(line, " ft  (low / typical / high)"));
    free(out);
    free(err);
    /* the canopy's own fabric in ounces, the payload over a pound in pounds */
    assert_int_equal(sr_test_cli(&out, &err, "size", "--mass", "22oz", "--speed", "20ft/s", "--family",
                                 "flat-circular", "--areal-mass", "1.1oz/yd2", "--units", "us", NULL),
                     0);
    assert_non_null(strstr(out, "payload mass (without canopy)         1.375 lb"));
    line = strstr(out, "canopy fabric mass (all canopies)");
    assert_non_null(line);
    eol = strchr(line, '\n');
    *eol = '\0';
    assert_non_null(strstr(line, " oz  (low / typical / high)"));
    free(out);
    free(err);
}

/* A drift toward 359.7 deg prints as 0, not 360, in text; JSON keeps the number. */
static void test_bearing_never_360(void **state)
{
    (void)state;
    const char *m = sr_test_tmpfile(".yaml", "mission: north (invented)\n"
                                             "site: {wind: {speed: 6 m/s, from: 179.7 deg}}\n"
                                             "sections:\n  - {name: probe, mass: 2 kg}\n"
                                             "stages:\n  - {name: main, family: conical, nominal-diameter: 1.5 m}\n"
                                             "start: {height: 800 m}\n");
    static const char *const UNITS[] = {"si", "us"};
    for (int u = 0; u < 2; u++) {
        char *out, *err;
        assert_int_equal(sr_test_cli(&out, &err, "profile", m, "--units", UNITS[u], "--format", "text", NULL), 0);
        /* the touchdown table: time, rates low / typical / high, ground-relative speed, drift, bearing, east, north */
        char *row = strstr(out, "\nTouchdown");
        assert_non_null(row);
        row = strstr(row, "\n  probe ");
        assert_non_null(row);
        char *eol = strchr(row + 1, '\n');
        *eol = '\0';
        double f[9];
        int n = sscanf(row + 8, "%lf %lf %lf %lf %lf %lf %lf %lf %lf", &f[0], &f[1], &f[2], &f[3], &f[4], &f[5], &f[6],
                       &f[7], &f[8]);
        assert_int_equal(n, 9);
        if (f[6] != 0.0)
            fail_msg("--units %s: a drift toward 359.7 deg prints bearing %g (want 0): %s", UNITS[u], f[6], row + 1);
        free(out);
        free(err);
    }
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "profile", m, "--format", "json", NULL), 0);
    json_t *doc = json_of(out);
    json_t *td = json_object_get(json_object_get(doc, "tables"), "touchdown");
    json_t *cols = json_object_get(td, "columns");
    size_t k = 0;
    while (k < json_array_size(cols) &&
           strcmp(json_string_value(json_object_get(json_array_get(cols, k), "key")), "bearing") != 0)
        k++;
    double b = json_number_value(json_array_get(json_array_get(json_object_get(td, "rows"), 0), k));
    assert_true(b > 359.6 && b < 359.8);
    json_decref(doc);
    free(out);
    free(err);
}

/* size: a touchdown speed at the ground, a descent speed above it. */
static void test_size_words_fit_the_stage(void **state)
{
    (void)state;
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "size", "--mass", "5kg", "--speed", "23m/s", "--family", "cross",
                                 "--site-elevation", "1380m", "--altitude", "1580m", NULL),
                     0);
    assert_non_null(strstr(out, "sinkrate size: canopy size for a target descent speed"));
    assert_non_null(strstr(out, "target descent speed "));
    assert_null(strstr(out, "touchdown"));
    free(out);
    free(err);
    assert_int_equal(sr_test_cli(&out, &err, "size", "--mass", "5kg", "--speed", "6m/s", "--family", "conical",
                                 "--site-elevation", "1380m", NULL),
                     0);
    assert_non_null(strstr(out, "target touchdown speed "));
    free(out);
    free(err);
}

/* The site model says what it does with what was given, and never claims a
 * measurement that was not made. */
static void test_site_model_words(void **state)
{
    (void)state;
    static const struct {
        const char *args[8];
        const char *says, *never;
    } T[] = {
        {{"--site-elevation", "1380m"}, "U.S. Standard Atmosphere 1976 unchanged, with the ground at the site",
         "site model"},
        {{"--site-elevation", "1380m", "--surface-temp", "38C"}, "measured surface temperature, the standard pressure",
         "temperature and pressure"},
        {{"--site-elevation", "1380m", "--surface-pressure", "858hPa"},
         "measured surface pressure, the standard temperature", "difference to standard"},
        {{"--site-elevation", "1380m", "--surface-temp", "38C", "--surface-pressure", "858hPa"},
         "measured surface temperature and pressure", "(standard)"},
    };
    for (size_t i = 0; i < sizeof T / sizeof T[0]; i++) {
        char *argv[24];
        int argc = 0;
        const char *base[] = {"sinkrate", "rate", "--mass", "5kg", "--family", "conical", "--nominal-diameter", "2m"};
        for (size_t k = 0; k < sizeof base / sizeof base[0]; k++)
            argv[argc++] = (char *)base[k];
        for (size_t k = 0; T[i].args[k]; k++)
            argv[argc++] = (char *)T[i].args[k];
        argv[argc] = NULL;
        char *text;
        assert_int_equal(sr_test_cli_argv(&text, NULL, argc, argv), 0); /* the text page */
        if (strstr(text, T[i].never))
            fail_msg("case %zu: the page says '%s'", i, T[i].never);
        argv[argc++] = "--format";
        argv[argc++] = "json";
        argv[argc] = NULL;
        char *out, *err;
        assert_int_equal(sr_test_cli_argv(&out, &err, argc, argv), 0);
        json_t *doc = json_of(out);
        const char *atm = json_string_value(json_object_get(json_object_get(doc, "values"), "atmosphere"));
        if (!strstr(atm, T[i].says))
            fail_msg("case %zu: '%s' lacks '%s'", i, atm, T[i].says);
        json_decref(doc);
        free(out);
        free(err);
        free(text);
    }
}

/* A figure's subtitle uses the tables' pressure unit (psf), not inHg. */
static void test_one_pressure_unit(void **state)
{
    (void)state;
    char prefix[512], gp[600];
    snprintf(prefix, sizeof prefix, "%s", sr_test_tmpfile("", ""));
    snprintf(gp, sizeof gp, "%s.gp", prefix);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "sweep", "--mass", "5kg", "--family", "conical", "--nominal-diameter",
                                 "2m", "--site-elevation", "1380m", "--surface-temp", "38C", "--surface-pressure",
                                 "858hPa", "--from", "1380m", "--to", "3380m", "--step", "1000m", "--units", "us",
                                 "--plot", prefix, NULL),
                     0);
    char *script = sr_test_slurp(gp, NULL);
    assert_non_null(script);
    assert_non_null(strstr(script, "psf"));
    assert_null(strstr(script, "inHg"));
    free(script);
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_sizes_and_masses),         cmocka_unit_test(test_bearing_never_360),
        cmocka_unit_test(test_size_words_fit_the_stage), cmocka_unit_test(test_site_model_words),
        cmocka_unit_test(test_one_pressure_unit),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
