/* test_cli_loads.c - `sinkrate loads` in-process: the handbook check case
 * through the whole command, exact lbf/N agreement, mission stages, the
 * figure files, the caution, and one clear line with exit 2 for bad input. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <jansson.h>

#include "output/plot.h"
#include "output/report.h"
#include "testutil.h"

#define DEMO "payloads/desert-club-rocket.yaml"
#define SRC_TABLE "canopy-handbook.md 6.3 [D] (Pflanz closed form of K91 4.2 growth model)"
#define SRC_NIST "NIST SP 811 (2008) App. B: 1 lbf = 4.4482216152605 N exactly"

/* The handbook check case (D0 1.5 m, CD0 0.80 on nominal area, 30 m/s at sea
 * level, CX 1.7, n_fill 8) with mass m and exponent n, extra args appended. */
static json_t *run_json(int expect_rc, const char *const *extra)
{
    char *argv[48];
    int argc = 0;
    argv[argc++] = "sinkrate";
    static const char *const BASE[] = {"loads", "--family", "conical", "--nominal-diameter", "1.5 m",
                                       "--drag-coefficient", "0.80", "--drag-reference", "nominal",
                                       "--opening-factor", "1.7", "--filling-constant", "8", "--speed", "30 m/s",
                                       "--format", "json", NULL};
    for (size_t i = 0; BASE[i]; i++)
        argv[argc++] = (char *)BASE[i];
    for (size_t i = 0; extra && extra[i]; i++)
        argv[argc++] = (char *)extra[i];
    argv[argc] = NULL;
    char *out, *err;
    int rc = sr_test_cli_argv(&out, &err, argc, argv);
    if (rc != expect_rc)
        print_error("rc %d, stderr '%s'\n", rc, err);
    assert_int_equal(rc, expect_rc);
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    assert_non_null(j);
    free(out);
    free(err);
    return j;
}

static double val(json_t *j, const char *key, const char *field)
{
    json_t *v = json_object_get(json_object_get(j, "values"), key);
    assert_non_null(v);
    /* a value, or a band (whose typical end answers for "value") */
    json_t *x = json_object_get(v, field ? field : "value");
    if (!x && !field)
        x = json_object_get(v, "typical");
    if (!x && field && strcmp(field, "high") == 0)
        x = json_object_get(v, "value");
    assert_non_null(x);
    return json_number_value(x);
}

/* Row r, column c of a table (numbers only). */
static double cell(json_t *j, const char *table, size_t r, size_t c)
{
    json_t *rows = json_object_get(json_object_get(json_object_get(j, "tables"), table), "rows");
    assert_non_null(rows);
    return json_number_value(json_array_get(json_array_get(rows, r), c));
}

static void test_handbook_case(void **state)
{
    (void)state;
    static const struct {
        const char *mass, *n;
        double x1, f;
    } CASES[] = {
        {"50 kg", "2", 0.8746, 1158.7}, {"5 kg", "2", 0.3576, 473.8}, {"0.5 kg", "2", 0.0770, 102.1},
        {"50 kg", "1", 0.8206, NAN},    {"5 kg", "0.5", 0.3643, NAN},
    };
    char q[128];
    for (size_t i = 0; i < sizeof CASES / sizeof CASES[0]; i++) {
        /* gravity cannot be switched off from the command line: level flight
         * keeps its effect on the ODE small; the Pflanz row is gravity-free */
        const char *extra[] = {"--mass", CASES[i].mass, "--growth-exponent", CASES[i].n, "--path-angle", "0", NULL};
        json_t *j = run_json(0, extra);
        snprintf(q, sizeof q, "loads: Pflanz X1, m=%s, n=%s", CASES[i].mass, CASES[i].n);
        CHECK_ABS_CLASS(SR_CHECK_DERIVED, q, SRC_TABLE, CASES[i].x1, cell(j, "methods", 1, 4), 6e-5);
        if (!isnan(CASES[i].f)) {
            snprintf(q, sizeof q, "loads: Pflanz peak force, m=%s, n=2 (N)", CASES[i].mass);
            CHECK_ABS_CLASS(SR_CHECK_DERIVED, q, SRC_TABLE, CASES[i].f, cell(j, "methods", 1, 2), 0.15);
        }
        if (i == 0) {
            CHECK_ABS_CLASS(SR_CHECK_MEMORY, "loads: filling time (s)",
                            "t_f = n_fill D0/v1 (Knacke 1991 law, from memory; canopy-handbook.md 4.3): 8 x 1.5 m / 30 "
                            "m/s = 0.40 s",
                            0.40, val(j, "filling_time", NULL), 1e-12);
            CHECK_REL_CLASS(SR_CHECK_METHOD, "loads: q1 at sea level (Pa)",
                            "U.S. Standard Atmosphere 1976: rho0 = 1.2250 kg/m3", 551.25,
                            val(j, "dynamic_pressure", NULL), 1e-5);
            CHECK_REL_CLASS(SR_CHECK_METHOD, "loads: Mach at 30 m/s, sea level",
                            "U.S. Standard Atmosphere 1976: a0 = 340.294 m/s", 30 / 340.294, val(j, "mach", NULL),
                            1e-5);
            CHECK_REL_CLASS(SR_CHECK_DERIVED, "loads: mass ratio R_m", SRC_TABLE, 0.0412, val(j, "mass_ratio", NULL),
                            1.5e-3);
        }
        json_decref(j);
    }
}

static void test_lbf_and_newton(void **state)
{
    (void)state;
    const char *si[] = {"--mass", "5 kg", NULL};
    const char *us[] = {"--mass", "5 kg", "--units", "us", NULL};
    json_t *a = run_json(0, si), *b = run_json(0, us);
    for (size_t r = 0; r < 3; r++)
        for (size_t c = 1; c <= 3; c++) {
            char q[96];
            snprintf(q, sizeof q, "loads: method %zu force column %zu, lbf x 4.4482216152605 = N", r, c);
            CHECK_REL_CLASS(SR_CHECK_PUBLISHED, q, SRC_NIST, cell(a, "methods", r, c),
                            cell(b, "methods", r, c) * 4.4482216152605, 1e-9);
        }
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "loads: peak force lbf x 4.4482216152605 = N", SRC_NIST,
                    val(a, "peak_force", NULL), val(b, "peak_force", NULL) * 4.4482216152605, 1e-9);
    json_decref(a);
    json_decref(b);
}

static void test_design_and_cluster(void **state)
{
    (void)state;
    const char *extra[] = {"--mass", "5 kg", "--design-factor", "1.5", "--cluster", "3", NULL};
    json_t *j = run_json(0, extra);
    double hi = val(j, "peak_force", "high");
    assert_true(fabs(val(j, "required_strength", NULL) - 1.5 * hi) < 1e-6 * hi);
    /* the strengths follow the governing (high) end of the band */
    double eq = val(j, "canopy_force_equal", "high"), des = val(j, "canopy_force_design", "high");
    assert_true(isfinite(eq) && isfinite(des) && des > eq);
    assert_true(fabs(val(j, "required_strength_canopy", NULL) - 1.5 * des) < 1e-6 * des);
    json_decref(j);
    /* the caution about ratings accompanies the design factor */
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "loads", "--mass", "5 kg", "--speed", "30", "--family", "conical",
                                 "--nominal-diameter", "1.5 m", "--design-factor", "2", NULL),
                     0);
    assert_non_null(strstr(out, "rigger"));
    assert_non_null(strstr(out, "CAUTION: preliminary engineering estimates only."));
    free(out);
    free(err);
}

static void test_mission(void **state)
{
    (void)state;
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "loads", "--mission", sr_test_path(DEMO), "--format", "json", NULL);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    assert_non_null(j);
    json_t *rows = json_object_get(json_object_get(json_object_get(j, "tables"), "stages"), "rows");
    assert_int_equal(json_array_size(rows), 2);
    /* the drogue opens at the start state: 12 m/s, level, 2900 m above a 1380 m site (the demo file) */
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "loads --mission: drogue altitude (m)",
                    "demo mission file: 1380 m site + 2900 m start", 4280, cell(j, "stages", 0, 1), 1e-9);
    CHECK_ABS_CLASS(SR_CHECK_CONSISTENCY, "loads --mission: drogue speed (m/s)",
                    "demo mission file: start speed 12 m/s", 12, cell(j, "stages", 0, 3), 1e-9);
    /* every method gives a positive peak at every stage */
    for (size_t r = 0; r < 2; r++)
        for (size_t c = 8; c <= 10; c++)
            assert_true(cell(j, "stages", r, c) > 0);
    json_decref(j);
    free(out);
    free(err);

    rc = sr_test_cli(&out, &err, "loads", "--mission", sr_test_path(DEMO), "--stage", "main", NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "Peak opening force by method"));
    assert_non_null(strstr(out, "main"));
    assert_non_null(strstr(out, "spread is not the real uncertainty"));
    free(out);
    free(err);
}

/* A column of a table by its key. */
static double col(json_t *j, const char *table, size_t r, const char *key)
{
    json_t *t = json_object_get(json_object_get(j, "tables"), table);
    json_t *cols = json_object_get(t, "columns");
    for (size_t c = 0; c < json_array_size(cols); c++)
        if (strcmp(json_string_value(json_object_get(json_array_get(cols, c), "key")), key) == 0) {
            json_t *v = json_array_get(json_array_get(json_object_get(t, "rows"), r), c);
            return json_is_number(v) ? json_number_value(v) : NAN;
        }
    fail_msg("no column %s in %s", key, table);
    return NAN;
}

static json_t *cli_json(int want, const char *cmd, const char *path, const char *stage)
{
    char *out, *err;
    int rc = stage ? sr_test_cli(&out, &err, cmd, "--mission", path, "--stage", stage, "--format", "json", NULL)
             : strcmp(cmd, "loads") == 0 ? sr_test_cli(&out, &err, cmd, "--mission", path, "--format", "json", NULL)
                                         : sr_test_cli(&out, &err, cmd, path, "--format", "json", NULL);
    if (rc != want)
        print_error("%s %s: exit %d: %s\n", cmd, path, rc, err);
    assert_int_equal(rc, want);
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    assert_non_null(j);
    free(out);
    free(err);
    return j;
}

/* loads --mission and profile give the same opening loads, deployment speeds
 * and dynamic pressures for every stage of every demo mission: both take
 * them from the same band runs through the same function. */
static void test_loads_equal_profile(void **state)
{
    (void)state;
    static const char *const DEMOS[] = {"payloads/desert-club-rocket.yaml", "payloads/desert-club-rocket-revised.yaml",
                                        "payloads/balloon-instrument.yaml", "payloads/drone-cargo-drop.yaml"};
    static const int PROFILE_RC[] = {1, 0, 0, 0};
    for (size_t d = 0; d < 4; d++) {
        const char *path = sr_test_path(DEMOS[d]);
        char tmp[1024];
        snprintf(tmp, sizeof tmp, "%s", path);
        json_t *p = cli_json(PROFILE_RC[d], "profile", tmp, NULL);
        json_t *stages = json_object_get(json_object_get(json_object_get(p, "tables"), "stage_results"), "rows");
        size_t n = json_array_size(stages);
        assert_true(n >= 1);
        for (size_t k = 0; k < n; k++) {
            const char *name = json_string_value(json_array_get(json_array_get(stages, k), 0));
            json_t *l = cli_json(0, "loads", tmp, name);
            static const struct {
                const char *pkey, *lkey, *field, *what;
            } PAIRS[] = {{"opening_load_low", "peak_force", "low", "opening load, low end"},
                         {"opening_load_typical", "peak_force", "typical", "opening load, typical"},
                         {"opening_load_high", "peak_force", "high", "opening load, high end (governing)"}};
            for (size_t i = 0; i < 3; i++) {
                double pv = col(p, "stage_results", k, PAIRS[i].pkey);
                json_t *v = json_object_get(json_object_get(l, "values"), PAIRS[i].lkey);
                double lv = v ? json_number_value(json_object_get(v, json_object_get(v, "value") ? "value"
                                                                                               : PAIRS[i].field))
                              : NAN;
                char q[256];
                snprintf(q, sizeof q, "%s, %s stage '%s': profile = loads (N)", DEMOS[d], PAIRS[i].what, name);
                if (isnan(pv) || !v) {
                    /* opens at rest (the balloon release): neither has an opening load */
                    assert_true(isnan(pv) && !v);
                    continue;
                }
                CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, q, "analysis/band.c + analysis/loads.c (one function)", pv, lv,
                                1e-9);
            }
            json_decref(l);
        }
        /* the all-stage table of loads agrees too */
        json_t *l = cli_json(0, "loads", tmp, NULL);
        if (n > 1)
            for (size_t k = 0; k < n; k++) {
                double pv = col(p, "stage_results", k, "opening_load_high");
                if (isnan(pv))
                    continue;
                char q[256];
                snprintf(q, sizeof q, "%s stage %zu: governing load, profile = loads summary (N)", DEMOS[d], k + 1);
                CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, q, "analysis/band.c + analysis/loads.c (one function)", pv,
                                col(l, "stages", k, "force_high"), 1e-9);
            }
        json_decref(l);
        json_decref(p);
    }
}

/* A rated strength in the mission is judged by loads too (the same judge). */
static void test_rated_strength(void **state)
{
    (void)state;
    char *out, *err;
    const char *yaml = "mission: m\nsections: [{name: s, mass: 5 kg}]\n"
                       "stages:\n  - {name: main, family: conical, nominal-diameter: 2 m, deploy: apogee}\n"
                       "start: {height: 500 m, speed: 25 m/s, path-angle: 90 deg}\n"
                       "limits: {rated-strength: 600 N, design-factor: 2}\n";
    const char *path = sr_test_tmpfile(".yaml", yaml);
    int rc = sr_test_cli(&out, &err, "loads", "--mission", path, NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "limit exceeded: opening load, main"));
    assert_non_null(strstr(out, "Verdict: every limit judged at the worse end"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "profile", path, NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "limit exceeded: opening load, main"));
    free(out);
    free(err);
}

/* loads with args and --plot PREFIX, gnuplot hidden when hide. */
static void run_plot(const char *prefix, int hide, const char *const *args)
{
    char *argv[40];
    int argc = 0;
    argv[argc++] = "sinkrate";
    argv[argc++] = "loads";
    for (size_t i = 0; args[i]; i++)
        argv[argc++] = (char *)args[i];
    char *tail[] = {"--plot", (char *)prefix, "--plot-size", "800x500", NULL};
    for (size_t i = 0; tail[i]; i++)
        argv[argc++] = tail[i];
    argv[argc] = NULL;
    char *out, *err;
    sr_test_cli_figure(&out, &err, hide, argc, argv);
    free(out);
    free(err);
}

/* One figure's files, with the ODE's samples in the data. */
static void check_figure(const char *prefix, int rendered)
{
    char path[600];
    snprintf(path, sizeof path, "%s.dat", prefix);
    assert_int_equal(sr_test_dat_rows(path, "inflation ODE"), 301);
    sr_test_check_figure(prefix, rendered, 800, 500, "loads figure");
}

static void test_plot_files(void **state)
{
    (void)state;
    char dir[64];
    sr_test_tmpdir(dir, sizeof dir, "loads");
    char gnuplot[1024], prefix[300];
    int have = sr_plot_find_gnuplot(gnuplot, sizeof gnuplot);
    static const char *const ONE[] = {"--mass", "5 kg", "--speed", "30", "--family", "conical",
                                      "--nominal-diameter", "1.5 m", NULL};
    for (int hide = 0; hide < 2; hide++) {
        snprintf(prefix, sizeof prefix, "%s/%s/open", dir, hide ? "without" : "with");
        run_plot(prefix, hide, ONE);
        check_figure(prefix, have && !hide);
    }
    /* a mission: one figure a stage */
    const char *mis[] = {"--mission", sr_test_path(DEMO), NULL};
    snprintf(prefix, sizeof prefix, "%s/mission", dir);
    run_plot(prefix, 0, mis);
    static const char *const STAGES[] = {"drogue", "main"};
    for (size_t i = 0; i < 2; i++) {
        char stage[400];
        snprintf(stage, sizeof stage, "%s-%s", prefix, STAGES[i]);
        check_figure(stage, have);
    }
    /* a stage's name is a file name only: "a/../../x" stays beside PREFIX */
    const char *odd = sr_test_tmpfile(".yaml", "mission: m\nsections: [{name: s, mass: 2 kg}]\nstages:\n"
                                               "  - {name: a/../../x, family: cross, nominal-diameter: 0.6 m, "
                                               "deploy: apogee}\n"
                                               "  - {name: main, family: conical, nominal-diameter: 1.5 m, "
                                               "deploy: {height: 200 m}}\n"
                                               "start: {height: 1000 m, speed: 10 m/s}\n");
    const char *oddargs[] = {"--mission", odd, NULL};
    snprintf(prefix, sizeof prefix, "%s/odd/deeper/fig", dir);
    run_plot(prefix, 1, oddargs);
    char path[600];
    snprintf(path, sizeof path, "%s/odd/deeper/fig-a-..-..-x.dat", dir);
    assert_int_equal(access(path, F_OK), 0);
    snprintf(path, sizeof path, "%s/x.dat", dir);
    assert_int_not_equal(access(path, F_OK), 0);
    snprintf(path, sizeof path, "%s/odd/deeper/fig-a", dir);
    assert_int_not_equal(access(path, F_OK), 0);
    sr_test_rmtree(dir);
}

static void test_caution_everywhere(void **state)
{
    (void)state;
    static const char *const FORMATS[] = {"text", "csv", "json"};
    for (size_t f = 0; f < 3; f++) {
        char *out, *err;
        int rc = sr_test_cli(&out, &err, "loads", "--mass", "2 kg", "--speed", "25 m/s", "--family", "cross",
                             "--nominal-diameter", "1 m", "--format", FORMATS[f], NULL);
        assert_int_equal(rc, 0);
        assert_non_null(strstr(out, f == 0 ? "CAUTION: preliminary engineering estimates only."
                                           : sr_report_caution()));
        free(out);
        free(err);
    }
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "loads", "--help", NULL), 0);
    assert_non_null(strstr(out, "CAUTION"));
    assert_non_null(strstr(out, "--path-angle"));
    free(out);
    free(err);
}

static const struct {
    const char *args[14];
    const char *expect;
} BAD[] = {
    {{"--speed", "30", "--filling-constant", "0"}, "--filling-constant"},
    {{"--speed", "-5 m/s"}, "--speed"},
    {{"--speed", "0"}, "--speed"},
    {{"--speed", "400 m/s"}, "subsonic"},
    {{"--speed", "800 mph"}, "--speed"},
    {{"--speed", "30", "--design-factor", "0.5"}, "--design-factor"},
    {{"--speed", "30", "--growth-exponent", "0"}, "--growth-exponent"},
    {{"--speed", "30", "--path-angle", "120"}, "--path-angle"},
    {{"--speed", "30", "--opening-factor", "9"}, "--opening-factor"},
    {{"--speed", "30", "--cluster-allowance", "0.5"}, "--cluster-allowance"},
    {{"--speed", "30", "--stage", "main"}, "--stage"},
    {{"--speed", "30", "--altitude", "90 km"}, "--altitude"},
    {{"--speed", "30", "stray"}, "unexpected argument 'stray' (loads takes options only)"},
    {{"--speed", "30", "--mass", "2e5 kg"}, "--mass: given twice ('5 kg', then '2e5 kg')"},
    {{NULL}, "--speed"},
};

static void test_bad_input(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        char *argv[32];
        int argc = 0;
        static const char *const BASE[] = {"sinkrate", "loads", "--mass", "5 kg", "--family", "conical",
                                           "--nominal-diameter", "1.5 m", NULL};
        for (size_t k = 0; BASE[k]; k++)
            argv[argc++] = (char *)BASE[k];
        for (size_t k = 0; k < 14 && BAD[i].args[k]; k++)
            argv[argc++] = (char *)BAD[i].args[k];
        argv[argc] = NULL;
        char *out, *err;
        int rc = sr_test_cli_argv(&out, &err, argc, argv);
        if (rc != 2 || !strstr(err, BAD[i].expect) || sr_test_lines(err) != 1)
            print_error("case %zu: rc %d, stderr '%s'\n", i, rc, err);
        assert_int_equal(rc, 2);
        assert_non_null(strstr(err, BAD[i].expect));
        assert_int_equal(sr_test_lines(err), 1);
        assert_string_equal(out, "");
        free(out);
        free(err);
    }
    /* mission-level mistakes */
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "loads", "--mission", sr_test_path(DEMO), "--stage", "reserve", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "no stage 'reserve'"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "loads", "--mission", sr_test_path(DEMO), "--speed", "20", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "--stage"));
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_handbook_case), cmocka_unit_test(test_lbf_and_newton),
        cmocka_unit_test(test_design_and_cluster), cmocka_unit_test(test_mission),
        cmocka_unit_test(test_loads_equal_profile), cmocka_unit_test(test_rated_strength),
        cmocka_unit_test(test_plot_files), cmocka_unit_test(test_caution_everywhere),
        cmocka_unit_test(test_bad_input),
    };
    return cmocka_run_group_tests_name("cli_loads", tests, NULL, NULL);
}
