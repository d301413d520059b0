/* test_cli_design.c - `sinkrate design` in-process: the design it writes
 * passes `profile` with the margins it printed; its last stage's size is the
 * number `size` gives; no design, or no bay that fits, is exit 1 with the
 * closest miss in one line (and nothing written); the risk check drops what
 * the dispersion breaks; the options; the caution in every format and in the
 * written file; the figure. */
#define _DEFAULT_SOURCE
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "output/report.h"
#include "testutil.h"

#define DEMO "payloads/desert-club-rocket.yaml"
#define DRONE "payloads/drone-cargo-drop.yaml"

static json_t *json_of(const char *out)
{
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    if (!j)
        fail_msg("not JSON (%s): %.200s", je.text, out);
    return j;
}

static json_t *table(json_t *j, const char *name)
{
    return json_object_get(json_object_get(json_object_get(j, "tables"), name), "rows");
}

static double value(json_t *j, const char *key, const char *field)
{
    json_t *v = json_object_get(json_object_get(j, "values"), key);
    if (!v)
        fail_msg("no value '%s'", key);
    return json_number_value(json_object_get(v, field));
}

static const char *tmpdir(void)
{
    static char d[64];
    snprintf(d, sizeof d, "/tmp/sinkrate-design-XXXXXX");
    assert_non_null(mkdtemp(d));
    return d;
}

static void rm_rf(const char *dir)
{
    char cmd[256];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
    assert_int_equal(system(cmd), 0);
}

/* The design written with --write passes profile, and profile's limits
 * table is the design's, number for number (JSON keeps 10 digits). */
static void check_write(const char *mission, const char *basis)
{
    const char *d = tmpdir();
    char path[128];
    snprintf(path, sizeof path, "%s/chosen.yaml", d);
    char *out, *err, *pout, *perr;
    int rc = sr_test_cli(&out, &err, "design", sr_test_path(mission), "--write", path, "--format", "json",
                         "--limits-at", basis, NULL);
    if (rc != 0)
        fail_msg("design: %d %s", rc, err);
    assert_non_null(strstr(err, "wrote"));
    rc = sr_test_cli(&pout, &perr, "profile", path, "--format", "json", "--limits-at", basis, NULL);
    if (rc != 0)
        fail_msg("profile of the written design: %d %s", rc, perr);
    json_t *dj = json_of(out), *pj = json_of(pout);
    json_t *a = table(dj, "limits"), *b = table(pj, "limits");
    assert_non_null(a);
    assert_true(json_array_size(a) > 0);
    if (!json_equal(a, b)) {
        char *x = json_dumps(a, 0), *y = json_dumps(b, 0);
        fail_msg("design's limits\n%s\nprofile's\n%s", x, y);
    }
    /* and the margins table's rows of rank 1 are the same judgement */
    json_t *mr = table(dj, "margins");
    size_t rows1 = 0;
    for (size_t i = 0; i < json_array_size(mr); i++) {
        json_t *r = json_array_get(mr, i);
        if (json_number_value(json_array_get(r, 0)) != 1.0 || strstr(json_string_value(json_array_get(r, 1)), "(bay)"))
            continue;
        json_t *pr = json_array_get(b, rows1++);
        assert_string_equal(json_string_value(json_array_get(r, 1)), json_string_value(json_array_get(pr, 0)));
        assert_true(json_number_value(json_array_get(r, 4)) == json_number_value(json_array_get(pr, 4)));
    }
    assert_int_equal(rows1, json_array_size(b));
    /* the written file carries the caution and names where it came from */
    FILE *f = fopen(path, "rb");
    char text[16384];
    size_t n = fread(text, 1, sizeof text - 1, f);
    fclose(f);
    text[n] = '\0';
    assert_non_null(strstr(text, "# CAUTION"));
    assert_non_null(strstr(text, "sinkrate design"));
    json_decref(dj);
    json_decref(pj);
    free(out);
    free(err);
    free(pout);
    free(perr);
    rm_rf(d);
}

static void test_written_design_passes_profile(void **state)
{
    (void)state;
    check_write(DEMO, "band-end");
    check_write(DRONE, "band-end");
    check_write(DEMO, "typical");
}

/* One stage, one family: the least size meeting the touchdown speed at the
 * band end is the number `size --mission` gives as the high end of its band
 * (the low drag coefficient's size); design writes it to 6 digits, up. */
static void test_same_number_as_size(void **state)
{
    (void)state;
    const char *m = sr_test_tmpfile(".yaml",
                                    "mission: one stage\n"
                                    "site: {elevation: 1380 m, temperature: 38 C, pressure: 858 hPa}\n"
                                    "sections:\n  - {name: payload, mass: 5.3 kg}\n"
                                    "stages:\n  - {name: main, family: conical, nominal-diameter: 2 m, deploy: apogee}\n"
                                    "start: {height: 300 m, speed: 5 m/s}\n"
                                    "limits: {touchdown-speed: 6.1 m/s}\n"
                                    "design:\n  stages:\n    main: {nominal-diameter: {min: 1 m, max: 4 m}}\n");
    char *out, *err, *sout, *serr;
    assert_int_equal(sr_test_cli(&out, &err, "design", m, "--format", "json", NULL), 0);
    assert_int_equal(sr_test_cli(&sout, &serr, "size", "--mission", m, "--format", "json", NULL), 0);
    json_t *dj = json_of(out), *sj = json_of(sout);
    double got = value(dj, "main_nominal_diameter", "value"), want = value(sj, "nominal_diameter", "high");
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "design's main nominal diameter against size's band end [m]",
                    "sinkrate size --mission (the sizing inversion at the low end of the drag range)", want, got, 5e-6);
    assert_true(got >= want);
    /* the text pages print the same number */
    free(out);
    free(err);
    assert_int_equal(sr_test_cli(&out, &err, "design", m, NULL), 0);
    assert_non_null(strstr(out, "2.221 m"));
    free(sout);
    free(serr);
    assert_int_equal(sr_test_cli(&sout, &serr, "size", "--mission", m, NULL), 0);
    assert_non_null(strstr(sout, "2.22"));
    json_decref(dj);
    json_decref(sj);
    free(out);
    free(err);
    free(sout);
    free(serr);
}

/* No design: exit 1, one line naming the closest miss, the page with every
 * combination's miss, nothing written. */
static void test_no_design(void **state)
{
    (void)state;
    const char *d = tmpdir();
    char path[128];
    snprintf(path, sizeof path, "%s/never.yaml", d);
    const char *m = sr_test_tmpfile(".yaml",
                                    "mission: too hard\n"
                                    "sections:\n  - {name: payload, mass: 5 kg}\n"
                                    "stages:\n  - {name: main, family: conical, nominal-diameter: 2 m, deploy: apogee}\n"
                                    "start: {height: 300 m, speed: 5 m/s}\n"
                                    "limits: {touchdown-speed: 2 m/s}\n"
                                    "design:\n  stages:\n    main: {families: [conical, annular], nominal-diameter: "
                                    "{min: 1 m, max: 3 m}}\n");
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "design", m, "--write", path, NULL), 1);
    assert_int_equal(sr_test_lines(err), 1);
    assert_non_null(strstr(err, "no design meets every limit; the closest, main annular, misses touchdown descent rate"));
    assert_non_null(strstr(out, "closest miss of each"));
    struct stat st;
    assert_int_equal(stat(path, &st), -1);
    free(out);
    free(err);
    /* a bay that holds no canopy of the range: its own line */
    const char *b = sr_test_tmpfile(".yaml",
                                    "mission: no room\n"
                                    "sections:\n  - {name: payload, mass: 5 kg}\n"
                                    "stages:\n  - {name: main, family: conical, nominal-diameter: 2 m, deploy: apogee}\n"
                                    "start: {height: 300 m, speed: 5 m/s}\n"
                                    "limits: {touchdown-speed: 6 m/s}\n"
                                    "design:\n  stages:\n    main: {nominal-diameter: {min: 1.5 m, max: 3 m}, "
                                    "bay-volume: 10 cm3}\n");
    assert_int_equal(sr_test_cli(&out, &err, "design", b, NULL), 1);
    assert_int_equal(sr_test_lines(err), 1);
    assert_non_null(strstr(err, "no candidate fits its bay: the least 'main', a 1.500 m conical"));
    free(out);
    free(err);
    rm_rf(d);
}

/* The risk check: the demo's best designs land at the touchdown limit at the
 * band end, so the dispersion (drag, mass and wind drawn) breaks it in a good
 * share of the samples; with the default 1 % they are dropped, said on
 * stderr and in the risk table, and the next design is chosen. */
static void test_risk_check(void **state)
{
    (void)state;
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DEMO), "--format", "json", NULL), 0);
    json_t *j0 = json_of(out);
    json_t *third = json_array_get(table(j0, "designs"), 2);
    char drogue[64], main_[64];
    snprintf(drogue, sizeof drogue, "%s", json_string_value(json_array_get(third, 1)));
    snprintf(main_, sizeof main_, "%s", json_string_value(json_array_get(third, 2)));
    json_decref(j0);
    free(out);
    free(err);
    int rc = sr_test_cli(&out, &err, "design", sr_test_path(DEMO), "--risk-samples", "400", "--risk-designs", "2",
                         "--seed", "3", "--format", "json", NULL);
    assert_int_equal(rc, 0);
    assert_int_equal(sr_test_lines(err), 2);
    assert_non_null(strstr(err, "risk check: dropped drogue"));
    json_t *j = json_of(out);
    json_t *risk = table(j, "risk");
    assert_int_equal(json_array_size(risk), 2);
    for (size_t i = 0; i < 2; i++) {
        json_t *r = json_array_get(risk, i);
        assert_true(json_number_value(json_array_get(r, 2)) > 1.0);
        assert_non_null(strstr(json_string_value(json_array_get(r, 4)), "DROPPED"));
    }
    /* the chosen design is the third of the ranking before the check */
    json_t *first = json_array_get(table(j, "designs"), 0);
    assert_string_equal(json_string_value(json_array_get(first, 1)), drogue);
    assert_string_equal(json_string_value(json_array_get(first, 2)), main_);
    json_decref(j);
    free(out);
    free(err);
    /* the same seed, the same page at any thread count */
    char *out2, *err2, *out3, *err3;
    assert_int_equal(sr_test_cli(&out2, &err2, "design", sr_test_path(DEMO), "--risk-samples", "400",
                                 "--risk-designs", "2", "--seed", "3", "--threads", "1", NULL),
                     0);
    assert_int_equal(sr_test_cli(&out3, &err3, "design", sr_test_path(DEMO), "--risk-samples", "400",
                                 "--risk-designs", "2", "--seed", "3", "--threads", "2", NULL),
                     0);
    assert_string_equal(out2, out3);
    free(out2);
    free(err2);
    free(out3);
    free(err3);
    /* nothing passes a zero risk: exit 1, said */
    assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DEMO), "--risk-samples", "200", "--risk-designs",
                                 "100", "--max-risk", "0", NULL),
                     1);
    assert_non_null(strstr(err, "the risk check dropped every design that met the limits"));
    free(out);
    free(err);
}

/* Options replace the file's design: block part by part. */
static void test_options(void **state)
{
    (void)state;
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DRONE), "--families", "cargo canopy=cross",
                                 "--diameters", "cargo canopy=1.5m,1.8m,2.1m,2.4m", "--bay", "cargo canopy=2L",
                                 "--format", "json", NULL),
                     0);
    json_t *j = json_of(out);
    json_t *d = table(j, "designs");
    assert_int_equal(json_array_size(d), 1);
    assert_string_equal(json_string_value(json_array_get(json_array_get(d, 0), 1)), "cross");
    /* the least listed size that lands slow enough: the cross needs 1.694 m (its least size above) */
    assert_true(json_number_value(json_array_get(json_array_get(d, 0), 2)) == 1.8);
    json_decref(j);
    free(out);
    free(err);
    /* ranked by drift: the first has the least drift of the designs shown */
    assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DRONE), "--objective", "drift", "--bay",
                                 "cargo canopy=2L", "--format", "json", NULL),
                     0);
    j = json_of(out);
    d = table(j, "designs");
    double first = json_number_value(json_array_get(json_array_get(d, 0), 6));
    for (size_t i = 1; i < json_array_size(d); i++)
        assert_true(json_number_value(json_array_get(json_array_get(d, i), 6)) >= first);
    json_decref(j);
    free(out);
    free(err);
    /* without a design: block the sizes go from half to twice the file's */
    const char *m = sr_test_tmpfile(".yaml",
                                    "mission: no block\n"
                                    "sections:\n  - {name: payload, mass: 5 kg}\n"
                                    "stages:\n  - {name: main, family: conical, nominal-diameter: 2 m, deploy: apogee}\n"
                                    "start: {height: 300 m, speed: 5 m/s}\n"
                                    "limits: {touchdown-speed: 6 m/s}\n");
    assert_int_equal(sr_test_cli(&out, &err, "design", m, NULL), 0);
    assert_non_null(strstr(out, "1.000 m .. 4.000 m"));
    assert_non_null(strstr(out, "no design: block"));
    free(out);
    free(err);
}

static void test_caution_and_formats(void **state)
{
    (void)state;
    static const char *const FMT[] = {"text", "csv", "json"};
    for (size_t i = 0; i < 3; i++) {
        char *out, *err;
        assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DRONE), "--format", FMT[i], NULL), 0);
        assert_non_null(strstr(out, "not for"));
        assert_non_null(strstr(out, "Verdict: every limit judged at the worse end"));
        free(out);
        free(err);
    }
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DRONE), "--limits-at", "typical", NULL), 0);
    assert_non_null(strstr(out, "VERDICT NOT CONSERVATIVE"));
    free(out);
    free(err);
    assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DRONE), "--units", "us", NULL), 0);
    assert_non_null(strstr(out, "[in3]"));
    free(out);
    free(err);
    assert_int_equal(sr_test_cli(&out, &err, "design", "--help", NULL), 0);
    assert_non_null(strstr(out, "not for"));
    assert_non_null(strstr(out, "--write FILE"));
    free(out);
    free(err);
}

static void test_figure(void **state)
{
    (void)state;
    const char *d = tmpdir();
    char prefix[128], dat[160], gp[160];
    snprintf(prefix, sizeof prefix, "%s/front", d);
    snprintf(dat, sizeof dat, "%s.dat", prefix);
    snprintf(gp, sizeof gp, "%s.gp", prefix);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "design", sr_test_path(DEMO), "--plot", prefix, NULL), 0);
    struct stat st;
    assert_int_equal(stat(dat, &st), 0);
    assert_int_equal(stat(gp, &st), 0);
    FILE *f = fopen(dat, "rb");
    char text[65536];
    size_t n = fread(text, 1, sizeof text - 1, f);
    fclose(f);
    text[n] = '\0';
    assert_non_null(strstr(text, "Pareto front"));
    assert_non_null(strstr(text, "chosen design"));
    assert_non_null(strstr(text, "not for"));
    free(out);
    free(err);
    rm_rf(d);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_written_design_passes_profile),
        cmocka_unit_test(test_same_number_as_size),
        cmocka_unit_test(test_no_design),
        cmocka_unit_test(test_risk_check),
        cmocka_unit_test(test_options),
        cmocka_unit_test(test_caution_and_formats),
        cmocka_unit_test(test_figure),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
