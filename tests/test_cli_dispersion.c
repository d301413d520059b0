/* test_cli_dispersion.c - `sinkrate dispersion` in-process: the same bytes at
 * 1 and 2 threads (report and samples file), the JSON fields, the samples
 * file and figure, the exit code for a broken limit, and one clear line with
 * exit 2 for bad input. */
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

static int run(char **out, char **err, const char *const *args)
{
    char *argv[64];
    int argc = 0;
    argv[argc++] = "sinkrate";
    argv[argc++] = "dispersion";
    for (size_t i = 0; args[i]; i++)
        argv[argc++] = (char *)args[i];
    argv[argc] = NULL;
    return sr_test_cli_argv(out, err, argc, argv);
}

/* 1 and 2 threads: the same report and the same samples file, byte for byte. */
static void test_threads_same_bytes(void **state)
{
    (void)state;
    char s1[512], s2[512];
    snprintf(s1, sizeof s1, "%s", sr_test_tmpfile(".csv", ""));
    snprintf(s2, sizeof s2, "%s", sr_test_tmpfile(".csv", ""));
    const char *a1[] = {sr_test_path(DEMO), "-n", "3000", "--seed", "7", "--threads", "1", "--samples", s1, NULL};
    const char *a2[] = {sr_test_path(DEMO), "-n", "3000", "--seed", "7", "--threads", "2", "--samples", s2, NULL};
    char *o1, *e1, *o2, *e2;
    int r1 = run(&o1, &e1, a1), r2 = run(&o2, &e2, a2);
    assert_int_equal(r1, r2);
    assert_true(r1 == 0 || r1 == 1);
    assert_string_equal(o1, o2);
    char *c1 = sr_test_slurp(s1, NULL), *c2 = sr_test_slurp(s2, NULL);
    assert_non_null(c1);
    assert_non_null(c2);
    assert_string_equal(c1, c2);
    /* two comment lines, a header, one row per sample and body (one body) */
    assert_int_equal(sr_test_lines(c1), 3 + 3000);
    assert_non_null(strstr(c1, "# CAUTION"));
    assert_non_null(strstr(c1, "\"sample\",\"body\",\"east [m]\",\"north [m]\""));
    assert_non_null(strstr(c1, "\r\n0,\"booster + payload bay\","));
    assert_non_null(strstr(o1, "CAUTION"));
    assert_non_null(strstr(o1, "1-sigma ellipse, semi-major axis"));
    free(o1), free(o2), free(e1), free(e2), free(c1), free(c2);
}

static void test_json_fields(void **state)
{
    (void)state;
    const char *a[] = {sr_test_path(DEMO), "-n", "2000", "--format", "json", "--max-risk", "100 %", NULL};
    char *out, *err;
    int rc = run(&out, &err, a);
    if (rc)
        print_error("%s\n", err);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    assert_non_null(j);
    json_t *v = json_object_get(j, "values");
    assert_non_null(v);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "samples reported", "the -n option", 2000.0,
                    json_number_value(json_object_get(json_object_get(v, "samples"), "value")), 0.0);
    assert_non_null(json_object_get(v, "sigma3_major"));
    assert_non_null(json_object_get(v, "r95_launch"));
    /* the 3-sigma ellipse is three times the 1-sigma one */
    double s1 = json_number_value(json_object_get(json_object_get(v, "sigma1_major"), "value"));
    double s3 = json_number_value(json_object_get(json_object_get(v, "sigma3_major"), "value"));
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "3-sigma over 1-sigma semi-major axis (JSON, 10 digits)",
                    "definition of the k-sigma ellipse", 3.0, s3 / s1, 1e-9);
    json_decref(j);
    free(out);
    free(err);
}

/* A limit broken in more samples than accepted: exit 1 and a line saying
 * which; accepting every risk: exit 0. */
static void test_limit_exit(void **state)
{
    (void)state;
    const char *a[] = {sr_test_path(DEMO), "-n", "2000", "--max-risk", "0.5 %", NULL};
    char *out, *err;
    assert_int_equal(run(&out, &err, a), 1);
    assert_non_null(strstr(err, "sinkrate dispersion: limit exceeded: descent time above"));
    free(out);
    free(err);
    const char *b[] = {sr_test_path(DEMO), "-n", "2000", "--max-risk", "1", NULL};
    assert_int_equal(run(&out, &err, b), 0);
    assert_string_equal(err, "");
    free(out);
    free(err);
}

static void test_plot_files(void **state)
{
    (void)state;
    char prefix[512];
    snprintf(prefix, sizeof prefix, "%s.d/scatter", sr_test_tmpfile(".x", ""));
    const char *a[] = {sr_test_path(DEMO), "-n", "500", "--max-risk", "1", "--plot", prefix, NULL};
    char *out, *err;
    assert_int_equal(run(&out, &err, a), 0);
    char path[600];
    snprintf(path, sizeof path, "%s.gp", prefix);
    char *gp = sr_test_slurp(path, NULL);
    assert_non_null(gp);
    assert_non_null(strstr(gp, "CAUTION"));
    assert_non_null(strstr(gp, "3-sigma ellipse"));
    assert_non_null(strstr(gp, "drift limit"));
    free(gp);
    snprintf(path, sizeof path, "%s.dat", prefix);
    assert_int_equal(access(path, R_OK), 0);
    free(out);
    free(err);
}

/* Sections that land apart: one block of statistics and one samples row per body. */
static void test_two_bodies(void **state)
{
    (void)state;
    const char *mis = sr_test_tmpfile(".yaml", "mission: two bodies (invented)\n"
                                               "site:\n  wind:\n    model: constant\n    speed: 6 m/s\n    from: 300 deg\n"
                                               "sections:\n  - name: booster\n    mass: 3 kg\n  - name: nose\n    mass: 1.5 kg\n"
                                               "stages:\n  - name: drogue\n    family: cross\n    nominal-diameter: 0.8 m\n"
                                               "    deploy: apogee\n  - name: nose main\n    family: conical\n"
                                               "    nominal-diameter: 1.5 m\n    carries: [nose]\n    deploy:\n      height: 400 m\n"
                                               "start:\n  height: 1500 m\n"
                                               "uncertainty:\n  wind-speed: {distribution: normal, sigma: 1 m/s}\n");
    char mp[512], csv[512];
    snprintf(mp, sizeof mp, "%s", mis);
    snprintf(csv, sizeof csv, "%s", sr_test_tmpfile(".csv", ""));
    const char *a[] = {mp, "-n", "100", "--samples", csv, NULL};
    char *out, *err;
    int rc = run(&out, &err, a);
    if (rc)
        print_error("%s\n", err);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "Landing of booster (body 1 of 2)"));
    assert_non_null(strstr(out, "Landing of nose (body 2 of 2)"));
    char *c = sr_test_slurp(csv, NULL);
    assert_non_null(c);
    assert_int_equal(sr_test_lines(c), 3 + 2 * 100);
    assert_non_null(strstr(c, "\r\n99,\"nose\","));
    free(c);
    free(out);
    free(err);
}

/* Bad input: one line naming the problem, exit 2. */
static void test_bad_input(void **state)
{
    (void)state;
    const char *neg = sr_test_tmpfile(".yaml", "mission: bad\n"
                                              "sections:\n  - name: a\n    mass: 2 kg\n"
                                              "stages:\n  - name: c\n    family: conical\n    nominal-diameter: 1.5 m\n"
                                              "start:\n  height: 500 m\n"
                                              "uncertainty:\n  mass: {distribution: normal, sigma: -3 %}\n");
    char negp[512];
    snprintf(negp, sizeof negp, "%s", neg);
    const char *unk = sr_test_tmpfile(".yaml", "mission: bad\n"
                                              "sections:\n  - name: a\n    mass: 2 kg\n"
                                              "stages:\n  - name: c\n    family: conical\n    nominal-diameter: 1.5 m\n"
                                              "start:\n  height: 500 m\n"
                                              "uncertainty:\n  wind-speed: {distribution: lognormal, sigma: 1 m/s}\n");
    struct {
        const char *args[8];
        const char *says;
    } C[] = {
        {{DEMO, "-n", "0", NULL}, "-n: the number of samples must be a whole number from 1 to 10000000, got 0"},
        {{DEMO, "-n", "1e12", NULL}, "-n: the number of samples must be a whole number from 1 to 10000000"},
        {{DEMO, "-n", "many", NULL}, "-n: 'many' is not a number of samples"},
        {{DEMO, "-n", "2.5", NULL}, "got 2.5"},
        {{DEMO, "--threads", "-1", NULL}, "--threads"},
        {{DEMO, "--max-risk", "150 %", NULL}, "--max-risk: '150 %' is not a probability"},
        {{DEMO, "--seed", "x", NULL}, "--seed"},
        {{NULL}, "a mission file is required"},
        {{"no-such-file.yaml", NULL}, "no-such-file.yaml: cannot open"},
        {{negp, NULL}, "sigma must not be negative"},
        {{unk, NULL}, "unknown distribution 'lognormal'"},
    };
    for (size_t i = 0; i < sizeof C / sizeof C[0]; i++) {
        const char *args[10];
        size_t k = 0;
        for (; C[i].args[k]; k++)
            args[k] = strcmp(C[i].args[k], DEMO) == 0 ? sr_test_path(DEMO) : C[i].args[k];
        args[k] = NULL;
        char *out, *err;
        int rc = run(&out, &err, args);
        if (rc != 2 || !strstr(err, C[i].says))
            fail_msg("case %zu: rc %d, stderr '%s', wanted '%s'", i, rc, err, C[i].says);
        assert_int_equal(sr_test_lines(err), 1);
        assert_string_equal(out, "");
        free(out);
        free(err);
    }
    /* the file's position is in the message */
    char *out, *err;
    const char *a[] = {negp, NULL};
    run(&out, &err, a);
    assert_non_null(strstr(err, ":12:39: uncertainty mass: sigma must not be negative"));
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_threads_same_bytes), cmocka_unit_test(test_json_fields),
        cmocka_unit_test(test_limit_exit),         cmocka_unit_test(test_plot_files),
        cmocka_unit_test(test_two_bodies),
        cmocka_unit_test(test_bad_input),
    };
    return cmocka_run_group_tests_name("cli_dispersion", tests, NULL, NULL);
}
