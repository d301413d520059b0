/* test_cli_freefall.c - `sinkrate freefall` run in-process: every
 * equilibrium in text, CSV and JSON, the trace, the figure (PNG, or data and
 * script without gnuplot), and the exit codes for bad input and impossible
 * requests. */
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "physics/atmos.h"
#include "output/plot.h"
#include "testutil.h"

#define PI 3.14159265358979323846

static int run(char **out, char **err, char **args)
{
    int n = 0;
    while (args[n])
        n++;
    char *argv[64];
    argv[0] = "sinkrate";
    for (int i = 0; i < n; i++)
        argv[i + 1] = args[i];
    argv[n + 1] = NULL;
    return sr_test_cli_argv(out, err, n + 1, argv);
}

/* Speeds (column "speed") of the equilibria table of a JSON report. */
static size_t json_speeds(const char *text, double *v, size_t max, int *nstable)
{
    json_error_t je;
    json_t *root = json_loads(text, 0, &je);
    assert_non_null(root);
    json_t *t = json_object_get(json_object_get(root, "tables"), "equilibria");
    assert_non_null(t);
    json_t *cols = json_object_get(t, "columns"), *rows = json_object_get(t, "rows");
    size_t is = 99, ist = 99;
    for (size_t i = 0; i < json_array_size(cols); i++) {
        const char *k = json_string_value(json_object_get(json_array_get(cols, i), "key"));
        if (strcmp(k, "speed") == 0)
            is = i;
        if (strcmp(k, "stability") == 0)
            ist = i;
    }
    assert_true(is != 99 && ist != 99);
    size_t n = json_array_size(rows);
    *nstable = 0;
    for (size_t i = 0; i < n && i < max; i++) {
        json_t *row = json_array_get(rows, i);
        v[i] = json_real_value(json_array_get(row, is));
        *nstable += strcmp(json_string_value(json_array_get(row, ist)), "stable") == 0;
    }
    assert_non_null(json_object_get(root, "caution"));
    json_decref(root);
    return n;
}

static void test_three_equilibria(void **state)
{
    (void)state;
    char *out, *err;
    char *a[] = {"freefall", "--body", "sphere", "--diameter", "20 cm", "--mass", "500 g", NULL};
    assert_int_equal(run(&out, &err, a), 0);
    assert_non_null(strstr(out, "CAUTION"));
    assert_non_null(strstr(out, "3 equilibrium speeds, 2 of them stable"));
    assert_non_null(strstr(out, "frontal area pi d^2/4"));
    assert_non_null(strstr(out, "Clift, Grace & Weber 1978"));
    assert_non_null(strstr(out, "unstable"));
    free(out);
    free(err);

    char *j[] = {"freefall", "--diameter", "0.2", "--mass", "0.5", "--format", "json", NULL};
    assert_int_equal(run(&out, &err, j), 0);
    double v[8];
    int ns;
    assert_int_equal(json_speeds(out, v, 8, &ns), 3);
    assert_int_equal(ns, 2);
    assert_true(v[0] < v[1] && v[1] < v[2]);
    /* each is a root of the drag balance with the sphere's Cd */
    json_error_t je;
    json_t *root = json_loads(out, 0, &je);
    json_t *rows = json_object_get(json_object_get(json_object_get(root, "tables"), "equilibria"), "rows");
    for (size_t i = 0; i < 3; i++) {
        json_t *row = json_array_get(rows, i);
        double rho = json_real_value(json_array_get(row, 1)), cd = json_real_value(json_array_get(row, 5));
        CHECK_REL_CLASS(
            SR_CHECK_CONSISTENCY, "freefall JSON: drag equals weight at each sphere equilibrium",
            "drag balance m g = 1/2 rho v^2 Cd A (DESIGN.md model 2), standard gravity 9.80665 m/s2 (NOAA-S/T "
            "76-1562)",
            0.5 * 9.80665, 0.5 * rho * v[i] * v[i] * cd * PI * 0.01, 1e-8);
    }
    json_decref(root);
    free(out);
    free(err);
}

static void test_person(void **state)
{
    (void)state;
    /* the body model of test_bluff.c's person check: Cd 0.73 on a 1.75 m x
     * 0.32 m plan area, held for all Re (no drag crisis on a clothed body) */
    const char *path = sr_test_tmpfile(".csv", "# belly-down person, plan area 1.75 m x 0.32 m\nRe,Cd\n1e4,0.73\n1e7,0.73\n");
    char *out, *err;
    char *a[] = {"freefall", "--cd-table", (char *)path, "--diameter", "0.32 m", "--mass", "80 kg", "--area", "0.56 m2",
                 "--format", "json", NULL};
    assert_int_equal(run(&out, &err, a), 0);
    double v[4];
    int ns;
    assert_int_equal(json_speeds(out, v, 4, &ns), 1);
    CHECK_REL_CLASS(SR_CHECK_TRADE, "freefall: belly-down person at sea level, m/s",
                    "common practice: about 200 km/h belly down (120-125 mph quoted: 5%)", 200.0 / 3.6, v[0], 0.05);
    free(out);
    free(err);
    remove(path);
}

static void test_yaml_table(void **state)
{
    (void)state;
    /* the same person model as a YAML drag table that states its area */
    const char *path = sr_test_tmpfile(".yaml", "name: \"belly-down person\"\nsource: \"test_bluff.c body model\"\n"
                                                 "reference-area: \"0.56 m2\"\npoints:\n  - [1.0e4, 0.73]\n"
                                                 "  - [1.0e7, 0.73]\n");
    char *out, *err;
    char *a[] = {"freefall", "--cd-table", (char *)path, "--diameter", "0.32 m", "--mass", "80 kg", "--format", "json",
                 NULL};
    assert_int_equal(run(&out, &err, a), 0);
    assert_non_null(strstr(out, "reference area stated in the table file"));
    assert_non_null(strstr(out, "belly-down person; test_bluff.c body model"));
    double v[4];
    int ns;
    assert_int_equal(json_speeds(out, v, 4, &ns), 1);
    CHECK_REL_CLASS(SR_CHECK_TRADE, "freefall, YAML table: belly-down person at sea level, m/s",
                    "common practice: about 200 km/h belly down (120-125 mph quoted: 5%)", 200.0 / 3.6, v[0], 0.05);
    free(out);
    free(err);
    remove(path);
    /* a bad point is reported at its line and column, exit 2 */
    path = sr_test_tmpfile(".yaml", "points:\n  - [1.0e4, 0.73]\n  - [1.0e3, 0.73]\n");
    char *b[] = {"freefall", "--cd-table", (char *)path, "--diameter", "0.32 m", "--mass", "80 kg", NULL};
    assert_int_equal(run(&out, &err, b), 2);
    assert_non_null(strstr(err, ":3:5: Reynolds number 1000 does not increase"));
    free(out);
    free(err);
    remove(path);
}

static void test_units_and_csv(void **state)
{
    (void)state;
    char *o1, *o2, *e;
    char *si[] = {"freefall", "--body", "disk", "--diameter", "0.3", "--mass", "0.5", "--format", "json", NULL};
    char *us[] = {"freefall", "--body", "disk", "--diameter", "0.3 m", "--mass", "0.5 kg", "--format", "json",
                  "--units", "us", NULL};
    assert_int_equal(run(&o1, &e, si), 0);
    free(e);
    assert_int_equal(run(&o2, &e, us), 0);
    free(e);
    double v1[2], v2[2];
    int ns;
    assert_int_equal(json_speeds(o1, v1, 2, &ns), 1);
    assert_int_equal(json_speeds(o2, v2, 2, &ns), 1);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "freefall --units us: speed in ft/s",
                    "NIST SP 811 (2008) App. B: 1 ft = 0.3048 m exactly", v1[0] / 0.3048, v2[0], 1e-9);
    /* disk above Re 5e4: constant Cd 1.16, so v = sqrt(2 m g / (rho Cd A)) */
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "freefall: 0.3 m disk of 0.5 kg at sea level, m/s",
                    "drag balance with the disk curve's Cd 1.16 above Re 5e4 (docs/method.md 9: Roos & Willmarth "
                    "1971 at 5e4, held above), rho 1.225 kg/m3 (NOAA-S/T 76-1562)",
                    sqrt(2 * 0.5 * 9.80665 / (1.225 * 1.16 * PI * 0.09 / 4)), v1[0], 1e-5);
    free(o1);
    free(o2);

    char *out, *err;
    char *c[] = {"freefall", "--body", "cylinder", "--diameter", "0.2", "--length", "2", "--mass", "9.1", "--format",
                 "csv", "--altitude", "0:10 km:5 km", NULL};
    assert_int_equal(run(&out, &err, c), 0);
    assert_non_null(strstr(out, "# CAUTION"));
    assert_non_null(strstr(out, "\"altitude [m]\",\"density [kg/m3]\",\"number\",\"speed [m/s]\""));
    assert_non_null(strstr(out, "\n10000,"));
    assert_non_null(strstr(out, "\n5000,"));
    assert_non_null(strstr(out, "projected area d x L"));
    free(out);
    free(err);
}

static void test_trace(void **state)
{
    (void)state;
    char *out, *err;
    char *a[] = {"freefall", "--body", "cylinder", "--diameter", "0.2", "--length", "2", "--mass", "9.1", "--trace",
                 "--format", "json", NULL};
    assert_int_equal(run(&out, &err, a), 0);
    assert_non_null(strstr(out, "Fixed-point iteration at 0 m (start: Cd = 1)"));
    assert_non_null(strstr(out, "equilibrium 1 of 3 (stable)"));
    assert_non_null(strstr(out, "does not show the other equilibria"));
    free(out);
    free(err);

    /* a step in Cd: the iteration cycles, the equilibrium is still found */
    const char *path = sr_test_tmpfile(".csv", "Re,Cd\n1e2,0.2\n1e3,0.2\n1.1e3,2.0\n1e4,2.0\n");
    char *b[] = {"freefall", "--cd-table", (char *)path, "--diameter", "1 cm", "--mass", "1.0467e-5 kg", "--trace",
                 "--steps", "12", "--start-cd", "1", NULL};
    assert_int_equal(run(&out, &err, b), 0);
    assert_non_null(strstr(out, "repeats a cycle of 2 steps"));
    assert_non_null(strstr(out, "stable"));
    free(out);
    free(err);
    remove(path);
}

/* freefall --diameter 0.2 --mass 0.5 at the altitudes given, with --plot
 * PREFIX (gnuplot hidden when hide); the JSON report's equilibria counted. */
static void run_plot(const char *prefix, int hide, const char *altitudes, int *n, int *nstable)
{
    char *a[] = {"sinkrate", "freefall", "--diameter", "0.2", "--mass", "0.5", "--altitude", (char *)altitudes,
                 "--format", "json", "--plot", (char *)prefix, "--plot-size", "800x500", NULL};
    char *out, *err;
    sr_test_cli_figure(&out, &err, hide, (int)(sizeof a / sizeof a[0]) - 1, a);
    double v[16];
    *n = (int)json_speeds(out, v, 16, nstable);
    free(out);
    free(err);
}

/* The figure's files, with the drag curve and every equilibrium of the
 * report in the data. */
static void check_figure(const char *prefix, int rendered, int n, int nstable)
{
    char path[600];
    snprintf(path, sizeof path, "%s.dat", prefix);
    assert_int_equal(sr_test_dat_rows(path, "Cd(Re)"), 401);
    assert_int_equal(sr_test_dat_rows(path, "stable equilibria"), nstable);
    assert_int_equal(sr_test_dat_rows(path, "unstable equilibria"), n - nstable);
    sr_test_check_figure(prefix, rendered, 800, 500, "freefall figure");
}

static void test_plot(void **state)
{
    (void)state;
    char dir[64];
    sr_test_tmpdir(dir, sizeof dir, "ff-plot");
    char gnuplot[1024], prefix[300], path[320];
    int have = sr_plot_find_gnuplot(gnuplot, sizeof gnuplot), n, ns;
    for (int hide = 0; hide < 2; hide++) {
        /* two altitudes: the curve and speed vs altitude */
        snprintf(prefix, sizeof prefix, "%s/%s/two", dir, hide ? "without" : "with");
        run_plot(prefix, hide, "0,3000", &n, &ns);
        assert_true(n >= 2 && ns >= 2);
        check_figure(prefix, have && !hide, n, ns);
    }
    /* one altitude: the curve alone, each equilibrium labelled with its speed */
    snprintf(prefix, sizeof prefix, "%s/one", dir);
    run_plot(prefix, 0, "0", &n, &ns);
    assert_int_equal(n, 3);
    check_figure(prefix, have, n, ns);
    snprintf(path, sizeof path, "%s.gp", prefix);
    assert_true(sr_test_file_has(path, " m/s, stable' at graph "));
    assert_true(sr_test_file_has(path, " m/s, unstable' at graph "));
    sr_test_rmtree(dir);
}

typedef struct bad_case {
    const char *table; /* CSV text for --cd-table, or NULL */
    const char *args[12];
    int rc;
    const char *expect;
} bad_case;

static const bad_case BAD[] = {
    {"Re,Cd\n100,1.0\n100,0.9\n", {"--diameter", "0.1", "--mass", "1"}, 2, ":3:1: Reynolds number 100 does not increase"},
    {"Re,Cd\n100,1.0\n1000,-0.5\n", {"--diameter", "0.1", "--mass", "1"}, 2, ":3:1: drag coefficient -0.5 must be positive"},
    {"Re,Cd\n100,1.0\n", {"--diameter", "0.1", "--mass", "1"}, 2, "at least 2 rows, this one has 1"},
    {"Re,Cd\n100,1.0\n200,1.0\n", {"--diameter", "0.1", "--mass", "1", "--interp", "steffen"}, 2, "at least 3 rows"},
    {"Re,Cd\n100,1.0\n200,1.0\n", {"--diameter", "0.1", "--mass", "1", "--interp", "cubic"}, 2, "--interp"},
    {NULL, {"--body", "sphere", "--mass", "1"}, 2, "--diameter"},
    {NULL, {"--body", "sphere", "--diameter", "1"}, 2, "--mass"},
    {NULL, {"--body", "cone", "--diameter", "1", "--mass", "1"}, 2, "--body: 'cone'"},
    {NULL, {"--body", "cylinder", "--diameter", "1", "--mass", "1"}, 2, "--length"},
    {NULL, {"--body", "sphere", "--diameter", "1", "--mass", "1", "--length", "2"}, 2, "--length"},
    {NULL, {"--body", "table", "--diameter", "1", "--mass", "1"}, 2, "--cd-table"},
    {NULL, {"--body", "cylinder", "--length", "1", "--diameter", "1", "--mass", "1", "--curve", "sphere-morrison"}, 2,
     "--curve"},
    {NULL, {"--diameter", "1", "--mass", "1", "--curve", "ogive"}, 2, "unknown drag curve 'ogive'"},
    {NULL, {"--diameter", "-1", "--mass", "1"}, 2, "--diameter"},
    {NULL, {"--diameter", "1 kg", "--mass", "1"}, 2, "--diameter"},
    {NULL, {"--diameter", "1", "--mass", "1", "--altitude", "100 km"}, 2, "--altitude"},
    {NULL, {"--diameter", "1", "--mass", "1", "--altitude", "5 km:1 km:1 km"}, 2, "--altitude"},
    {NULL, {"--diameter", "1", "--mass", "1", "--trace", "--steps", "0"}, 2, "--steps"},
    {NULL, {"--diameter", "1", "--mass", "1", "--steps", "5"}, 2, "goes with --trace"},
    {NULL, {"--diameter", "1", "--mass", "1", "stray"}, 2, "unexpected argument 'stray' (freefall takes options only)"},
    {NULL, {"--diameter", "1", "--mass", "2e5"}, 2, "--mass: 200000 kg is beyond any payload"},
    {NULL, {"--diameter", "1"}, 2, "--mass: the body's mass is required"},
    {NULL, {"--diameter", "1", "--mass", "1", "--area", "1"}, 2, "--area"},
    {NULL, {"--diameter", "1", "--mass", "1", "--frobnicate"}, 2, "frobnicate"},
    /* valid but impossible: far too light for any speed the curves cover */
    {NULL, {"--diameter", "1 m", "--mass", "1e-20 kg"}, 1, "too light"},
};

static void test_bad_input(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        char *argv[20];
        int n = 0;
        argv[n++] = "freefall";
        const char *path = NULL;
        if (BAD[i].table) {
            path = sr_test_tmpfile(".csv", BAD[i].table);
            argv[n++] = "--cd-table";
            argv[n++] = (char *)path;
        }
        for (int k = 0; k < 12 && BAD[i].args[k]; k++)
            argv[n++] = (char *)BAD[i].args[k];
        argv[n] = NULL;
        char *out, *err;
        int rc = run(&out, &err, argv);
        if (rc != BAD[i].rc || !strstr(err, BAD[i].expect))
            fail_msg("case %zu: exit %d (want %d), stderr '%s' (want '%s')", i, rc, BAD[i].rc, err, BAD[i].expect);
        free(out);
        free(err);
        if (path)
            remove(path);
    }
}

static void test_help(void **state)
{
    (void)state;
    char *out, *err;
    char *a[] = {"freefall", "--help", NULL};
    assert_int_equal(run(&out, &err, a), 0);
    assert_non_null(strstr(out, "--cd-table"));
    assert_non_null(strstr(out, "--trace"));
    assert_non_null(strstr(out, "CAUTION"));
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_three_equilibria), cmocka_unit_test(test_person), cmocka_unit_test(test_yaml_table), cmocka_unit_test(test_units_and_csv),
        cmocka_unit_test(test_trace),            cmocka_unit_test(test_plot),   cmocka_unit_test(test_bad_input),
        cmocka_unit_test(test_help),
    };
    return cmocka_run_group_tests_name("cli_freefall", tests, NULL, NULL);
}
