/* test_cli_core.c - the core subcommands run in-process: real answers,
 * the caution on every output of every command, and one clear line with
 * exit 2 for bad input. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include <jansson.h>

#include "cli/commands.h"
#include "output/report.h"
#include "testutil.h"

#define DEMO "payloads/desert-club-rocket.yaml"

/* The demo sizing against a hand calculation: rho = p M0 / (R* T) from the
 * site's measured surface pressure and temperature (1976 gas constant and
 * molar mass), g = g0 (r0/(r0+z))^2, S0 = 2 m g / (rho v^2 CD0). */
static void test_demo_size_matches_hand_calculation(void **state)
{
    (void)state;
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "size", "--mission", sr_test_path(DEMO), "--format", "json", NULL);
    assert_int_equal(rc, 0);
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    assert_non_null(j);
    double s0 = json_real_value(json_object_get(json_object_get(json_object_get(j, "values"), "nominal_area"),
                                                "typical"));
    double rho = 85800.0 * 28.9644e-3 / (8.31432 * (38.0 + 273.15));
    double r = 6356766.0 / (6356766.0 + 1380.0), g = 9.80665 * r * r;
    double m = 3.4 + 1.9, v = 6.1, cd0 = 0.825; /* conical: midpoint of 0.75-0.90 */
    CHECK_REL_CLASS(SR_CHECK_METHOD, "demo main canopy S0 by hand (exact)",
                    "hand calculation: 1976 gas law density, Knacke 1991 sec. 4.5", 2 * m * g / (rho * v * v * cd0), s0,
                    1e-9);
    json_decref(j);
    free(out);
    free(err);
}

#define REVISED "payloads/desert-club-rocket-revised.yaml"

/* Every command's report: the caution at the top of the text (the text
 * wraps it: its first words), as a comment line of the CSV and as the JSON's
 * "caution" field; and in every command's --help. DESIGN.md, Cautions. */
static void test_caution_everywhere(void **state)
{
    (void)state;
    const char *caution = sr_report_caution();
    static const char *const FORMATS[] = {"text", "csv", "json"};
    static const char *const CMDS[][12] = {
        {"size", "--mass", "2 kg", "--speed", "5 m/s", "--family", "cross", NULL},
        {"rate", "--mass", "2 kg", "--family", "cross", "--nominal-diameter", "1 m", NULL},
        {"sweep", "--mass", "2 kg", "--family", "cross", "--nominal-diameter", "1 m", "--values", "0,1km", NULL},
        {"profile", "@" REVISED, NULL},
        {"loads", "--mass", "5 kg", "--speed", "30 m/s", "--family", "conical", "--nominal-diameter", "1.5 m", NULL},
        {"freefall", "--mass", "1 kg", "--diameter", "10 cm", "--trace", NULL},
        {"dispersion", "@" REVISED, "-n", "200", "--max-risk", "1", NULL},
        {"air", NULL},
        {"canopies", NULL},
        {"canopies", "ringslot", NULL},
        {"check", "@" REVISED, NULL},
        {"fit", "@payloads/demo-flight.csv", "--mission", "@payloads/desert-club-rocket.yaml", NULL},
        {"design", "@payloads/drone-cargo-drop.yaml", NULL},
    };
    /* every command is here: a new one fails until it has a line */
    for (const sr_command *const *cmd = sr_cli_commands; *cmd; cmd++) {
        int found = 0;
        for (size_t i = 0; i < sizeof CMDS / sizeof CMDS[0]; i++)
            found |= strcmp(CMDS[i][0], (*cmd)->name) == 0;
        if (!found)
            fail_msg("the caution test has no line for the command '%s'", (*cmd)->name);
    }
    for (size_t i = 0; i < sizeof CMDS / sizeof CMDS[0]; i++) {
        for (size_t f = 0; f < 3; f++) {
            char *argv[20];
            int argc = 0;
            argv[argc++] = "sinkrate";
            for (size_t k = 0; CMDS[i][k]; k++)
                argv[argc++] = (char *)(CMDS[i][k][0] == '@' ? sr_test_path(CMDS[i][k] + 1) : CMDS[i][k]);
            argv[argc++] = "--format";
            argv[argc++] = (char *)FORMATS[f];
            argv[argc] = NULL;
            char *out, *err;
            int rc = sr_test_cli_argv(&out, &err, argc, argv);
            if (rc != 0)
                print_error("%s --format %s: exit %d: %s\n", CMDS[i][0], FORMATS[f], rc, err);
            assert_int_equal(rc, 0);
            if (f == 0) {
                /* at the top: after the title line, before any result */
                const char *at = strstr(out, "CAUTION: preliminary engineering estimates only.");
                assert_non_null(at);
                assert_true(at - out < 200);
            } else if (f == 1) {
                const char *at = strstr(out, caution);
                assert_non_null(at);
                assert_true(at >= out + 2 && at[-2] == '#' && at[-1] == ' ' && (at - 2 == out || at[-3] == '\n'));
            } else {
                json_error_t je;
                json_t *j = json_loads(out, 0, &je);
                assert_non_null(j);
                assert_string_equal(json_string_value(json_object_get(j, "caution")), caution);
                json_decref(j);
            }
            free(out);
            free(err);
        }
        char *out, *err;
        assert_int_equal(sr_test_cli(&out, &err, CMDS[i][0], "--help", NULL), 0);
        assert_non_null(strstr(out, "CAUTION: preliminary engineering estimates only."));
        assert_non_null(strstr(out, "carry people"));
        free(out);
        free(err);
    }
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "--help", NULL), 0);
    assert_non_null(strstr(out, "CAUTION"));
    free(out);
    free(err);
}

/* Every file a command writes besides its report carries the caution too:
 * the data and script of each figure (--plot, gnuplot hidden: the files
 * alone), and the samples of a dispersion. */
static void test_caution_in_files(void **state)
{
    (void)state;
    char dir[64];
    sr_test_tmpdir(dir, sizeof dir, "caution");
    char pre[300], samples[300];
    snprintf(pre, sizeof pre, "%s/fig", dir);
    snprintf(samples, sizeof samples, "%s/samples.csv", dir);
    static const struct {
        const char *args[12];
        const char *figures[3]; /* suffixes of the prefix: the figures written */
    } CMDS[] = {
        {{"sweep", "--mass", "2 kg", "--family", "cross", "--nominal-diameter", "1 m", "--values", "0,1km", NULL},
         {"", NULL}},
        {{"profile", "@" REVISED, NULL}, {"", "-track", NULL}},
        {{"loads", "--mass", "5 kg", "--speed", "30 m/s", "--family", "conical", "--nominal-diameter", "1.5 m", NULL},
         {"", NULL}},
        {{"loads", "--mission", "@" REVISED, NULL}, {"-drogue", "-main", NULL}},
        {{"freefall", "--mass", "1 kg", "--diameter", "10 cm", "--altitude", "0,5km", NULL}, {"", NULL}},
        {{"dispersion", "@" REVISED, "-n", "200", "--max-risk", "1", "--samples", "@@", NULL}, {"", NULL}},
    };
    char *old = strdup(getenv("PATH") ? getenv("PATH") : "");
    setenv("PATH", "/nonexistent", 1);
    for (size_t i = 0; i < sizeof CMDS / sizeof CMDS[0]; i++) {
        char *argv[20];
        int argc = 0;
        argv[argc++] = "sinkrate";
        for (size_t k = 0; CMDS[i].args[k]; k++) {
            const char *a = CMDS[i].args[k];
            argv[argc++] = (char *)(strcmp(a, "@@") == 0 ? samples : a[0] == '@' ? sr_test_path(a + 1) : a);
        }
        argv[argc++] = "--plot";
        argv[argc++] = pre;
        argv[argc] = NULL;
        char *out, *err;
        int rc = sr_test_cli_argv(&out, &err, argc, argv);
        if (rc != 0)
            print_error("%s --plot: exit %d: %s\n", CMDS[i].args[0], rc, err);
        assert_int_equal(rc, 0);
        for (size_t k = 0; CMDS[i].figures[k]; k++) {
            static const char *const EXT[] = {"dat", "gp"};
            for (size_t e = 0; e < 2; e++) {
                char path[400];
                snprintf(path, sizeof path, "%s%s.%s", pre, CMDS[i].figures[k], EXT[e]);
                if (!sr_test_file_has(path, "# CAUTION: preliminary engineering estimates only."))
                    print_error("%s: no caution in %s\n", CMDS[i].args[0], path);
                assert_true(sr_test_file_has(path, "# CAUTION: preliminary engineering estimates only."));
                unlink(path);
            }
        }
        free(out);
        free(err);
    }
    setenv("PATH", old, 1);
    free(old);
    /* the samples: the caution whole on a comment line, before the header */
    FILE *f = fopen(samples, "r");
    assert_non_null(f);
    char line[2048], want[1024];
    snprintf(want, sizeof want, "# %s", sr_report_caution());
    for (char *nl = strchr(want, '\n'); nl; nl = strchr(nl, '\n'))
        *nl = ' ';
    int found = 0;
    while (!found && fgets(line, sizeof line, f) && line[0] == '#')
        found = strncmp(line, want, strlen(want)) == 0;
    fclose(f);
    assert_true(found);
    unlink(samples);
    assert_int_equal(rmdir(dir), 0); /* nothing else was written */
}

/* Bad input: one clear line on stderr naming the option or file, exit 2. */
static const struct {
    const char *args[10];
    const char *expect;
} BAD[] = {
    {{"size", "--mass", "-2 kg", "--speed", "5", "--family", "conical"}, "--mass"},
    {{"size", "--mass", "0", "--speed", "5", "--family", "conical"}, "--mass"},
    {{"size", "--mass", "nan", "--speed", "5", "--family", "conical"}, "--mass"},
    {{"size", "--mass", "2 stone", "--speed", "5", "--family", "conical"}, "unknown mass unit"},
    {{"size", "--mass", "2 kg", "--speed", "5", "--family", "conicle"}, "did you mean 'conical'"},
    {{"size", "--mass", "2 kg", "--speed", "5", "--family", "conical", "--altitude", "90 km"}, "outside"},
    {{"size", "--mass", "2 kg", "--family", "conical"}, "--speed"},
    {{"size", "--mass", "2 kg", "--speed", "5", "--familly", "conical"}, "did you mean '--family'"},
    {{"rate", "--mass", "2 kg", "--family", "conical"}, "needs a size"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "1 m", "--projected-diameter", "1 m"},
     "one size only"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "1 m", "--drag-coefficient", "1.5"},
     "reference"},
    {{"rate", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "-1 m"}, "--nominal-diameter"},
    {{"air", "--from", "0", "--to", "10km", "--step", "0"}, "--step"},
    {{"air", "--altitude", "-2 km"}, "outside"},
    {{"air", "--temp-offset", "15 C", "--surface-temp", "30 C"}, "not both"},
    {{"air", "--units", "imperial"}, "--units"},
    {{"air", "--format", "xml"}, "--format"},
    {{"canopies", "parasol"}, "unknown canopy family"},
    {{"frobnicate"}, "unknown command"},
    {{"sizee"}, "did you mean 'size'"},
};

static void test_bad_input(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        char *argv[16];
        int argc = 0;
        argv[argc++] = "sinkrate";
        for (size_t k = 0; k < 10 && BAD[i].args[k]; k++)
            argv[argc++] = (char *)BAD[i].args[k];
        argv[argc] = NULL;
        char *out, *err;
        int rc = sr_test_cli_argv(&out, &err, argc, argv);
        if (rc != 2 || !strstr(err, BAD[i].expect) || sr_test_lines(err) != 1)
            print_error("case %zu (%s): rc %d, stderr '%s'\n", i, BAD[i].args[0], rc, err);
        assert_int_equal(rc, 2);
        assert_non_null(strstr(err, BAD[i].expect));
        assert_int_equal(sr_test_lines(err), 1);
        assert_string_equal(out, "");
        free(out);
        free(err);
    }
}

static void test_bad_yaml_files(void **state)
{
    (void)state;
    static const struct {
        const char *yaml, *expect;
    } Y[] = {
        {"mission: x\nsections: [\n", "malformed YAML"},
        {"mission: x\nsections:\n  - {name: a, mass: 2 kg}\nstages:\n  - {name: m, family: conical}\nsite: {elevaton: "
         "10 m}\n",
         "did you mean 'elevation'"},
        {"mission: x\nsections:\n  - {name: a, mass: 2}\nstages:\n  - {name: m, family: conical}\n", "needs a unit"},
    };
    for (size_t i = 0; i < sizeof Y / sizeof Y[0]; i++) {
        const char *p = sr_test_tmpfile(".yaml", Y[i].yaml);
        char *out, *err;
        int rc = sr_test_cli(&out, &err, "size", "--mission", p, "--speed", "5", NULL);
        if (rc != 2 || !strstr(err, Y[i].expect))
            print_error("yaml case %zu: rc %d '%s'\n", i, rc, err);
        assert_int_equal(rc, 2);
        assert_non_null(strstr(err, Y[i].expect));
        assert_non_null(strstr(err, p)); /* names the file */
        assert_int_equal(sr_test_lines(err), 1);
        free(out);
        free(err);
        rc = sr_test_cli(&out, &err, "check", p, NULL);
        assert_int_equal(rc, 2);
        free(out);
        free(err);
    }
}

static void test_impossible_is_exit_1(void **state)
{
    (void)state;
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "size", "--mass", "0.1 kg", "--speed", "0.5 m/s", "--family", "conical",
                         "--areal-mass", "1500 g/m2", NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "no canopy size"));
    free(out);
    free(err);
}

static void test_output_file_atomic(void **state)
{
    (void)state;
    char path[64];
    sr_test_tmpdir(path, sizeof path, "out");
    char file[300];
    snprintf(file, sizeof file, "%s/air.csv", path);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "air", "-o", file, "--format", "csv", NULL), 0);
    struct stat st;
    assert_int_equal(stat(file, &st), 0);
    free(out);
    free(err);
    /* unwritable: a directory that does not exist; nothing is left behind */
    char bad[300];
    snprintf(bad, sizeof bad, "%s/nope/air.csv", path);
    assert_int_equal(sr_test_cli(&out, &err, "air", "-o", bad, NULL), 2);
    assert_int_equal(sr_test_lines(err), 1);
    assert_int_not_equal(stat(bad, &st), 0);
    free(out);
    free(err);

    /* a write that fails after others succeeded (gnuplot, a stand-in that
     * always fails, rejects the figure): exit 2, and what the run made is
     * removed again: the report of -o, the figure's data and script and the
     * directories made for them; the file of the earlier run stays */
    char fake[300], pre[300], report[300];
    snprintf(fake, sizeof fake, "%s/gnuplot", path);
    FILE *g = fopen(fake, "w");
    assert_non_null(g);
    fputs("#!/bin/sh\necho 'line 1: rejected' >&2\nexit 1\n", g);
    fclose(g);
    assert_int_equal(chmod(fake, 0755), 0);
    snprintf(pre, sizeof pre, "%s/made/deeper/fig", path);
    snprintf(report, sizeof report, "%s/profile.txt", path);
    char *old = strdup(getenv("PATH") ? getenv("PATH") : "");
    setenv("PATH", path, 1);
    int rc = sr_test_cli(&out, &err, "profile", sr_test_path(REVISED), "--plot", pre, "-o", report, NULL);
    setenv("PATH", old, 1);
    free(old);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "gnuplot rejected"));
    assert_int_equal(sr_test_lines(err), 1);
    assert_int_not_equal(stat(report, &st), 0);
    snprintf(bad, sizeof bad, "%s/made", path);
    assert_int_not_equal(stat(bad, &st), 0);
    assert_int_equal(stat(file, &st), 0);
    free(out);
    free(err);
    remove(fake);
    remove(file);
    assert_int_equal(rmdir(path), 0);
}

static void test_check_command(void **state)
{
    (void)state;
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "check", sr_test_path(DEMO), sr_test_path("canopies/conical.yaml"), NULL),
                     0);
    assert_non_null(strstr(out, "ok"));
    free(out);
    free(err);
    const char *bad = sr_test_tmpfile(".yaml", "hello: world\n");
    assert_int_equal(sr_test_cli(&out, &err, "check", sr_test_path(DEMO), bad, NULL), 2);
    assert_non_null(strstr(err, "not a sinkrate file"));
    free(out);
    free(err);
    /* its report is the product even then: -o keeps it although the exit is 2 */
    char report[300];
    snprintf(report, sizeof report, "%s.report.txt", bad);
    assert_int_equal(sr_test_cli(&out, &err, "check", sr_test_path(DEMO), bad, "-o", report, NULL), 2);
    assert_true(sr_test_file_has(report, "INVALID"));
    unlink(report);
    free(out);
    free(err);
}

/* US units: the same answer in ft/s as in m/s (exact factor 0.3048). */
static void test_us_units(void **state)
{
    (void)state;
    char *o1, *o2, *e;
    assert_int_equal(sr_test_cli(&o1, &e, "rate", "--mass", "10 kg", "--family", "flat-circular",
                                 "--nominal-diameter", "2 m", "--format", "json", NULL), 0);
    free(e);
    assert_int_equal(sr_test_cli(&o2, &e, "rate", "--mass", "22.0462262 lb", "--family", "flat-circular",
                                 "--nominal-diameter", "6.56167979 ft", "--format", "json", "--units", "us", NULL),
                     0);
    free(e);
    json_t *a = json_loads(o1, 0, NULL), *b = json_loads(o2, 0, NULL);
    json_t *ra = json_array_get(json_object_get(json_object_get(json_object_get(a, "tables"), "rates"), "rows"), 0);
    json_t *rb = json_array_get(json_object_get(json_object_get(json_object_get(b, "tables"), "rates"), "rows"), 0);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "rate in ft/s vs m/s", "NIST SP 811: 1 ft = 0.3048 m exactly",
                    json_real_value(json_array_get(ra, 3)) / 0.3048, json_real_value(json_array_get(rb, 3)), 1e-7);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "descent rate, 10 kg under a 2 m flat circular (CD0 0.80)",
                    "canopy-handbook.md 6.2 case A scaled: "
                    "8.243 m/s at CD0 0.75 -> x sqrt(0.75/0.80)",
                    8.243 * sqrt(0.75 / 0.80), json_real_value(json_array_get(ra, 2)), 1e-4);
    json_decref(a);
    json_decref(b);
    free(o1);
    free(o2);
}

/* The outside-check status of every catalog value and model is shown by the
 * command (docs/validation.md reads it from there). */
static void test_canopies_check_status(void **state)
{
    (void)state;
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "canopies", "conical", NULL), 0);
    assert_non_null(strstr(out, "Outside checks"));
    assert_non_null(strstr(out, "would be checked by"));
    assert_non_null(strstr(out, "Conical row"));
    free(out);
    free(err);
    assert_int_equal(sr_test_cli(&out, &err, "canopies", "disk-gap-band", "--format", "json", NULL), 0);
    json_t *j = json_loads(out, 0, NULL), *v = json_object_get(j, "values");
    assert_string_equal(json_string_value(json_object_get(v, "drag_coefficient_outside_check")), "none");
    assert_non_null(strstr(json_string_value(json_object_get(v, "projected_ratio_outside_check")), "published: "));
    assert_string_equal(json_string_value(json_object_get(v, "growth_exponent_outside_check")), "none");
    json_decref(j);
    free(out);
    free(err);
    assert_int_equal(sr_test_cli(&out, &err, "canopies", "--models", "--format", "json", NULL), 0);
    j = json_loads(out, 0, NULL);
    v = json_object_get(j, "values");
    assert_string_equal(json_string_value(json_object_get(v, "x1_envelope_outside_check")), "none");
    assert_string_equal(json_string_value(json_object_get(v, "cluster_factor_value")),
                        "0.97 for 2, 0.93 for 3, 0.90 for 4 or more canopies");
    assert_non_null(strstr(json_string_value(json_object_get(v, "tumbling_drag_to_check")), "Hoerner 1965"));
    json_decref(j);
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_demo_size_matches_hand_calculation),
        cmocka_unit_test(test_caution_everywhere),
        cmocka_unit_test(test_caution_in_files),
        cmocka_unit_test(test_bad_input),
        cmocka_unit_test(test_bad_yaml_files),
        cmocka_unit_test(test_impossible_is_exit_1),
        cmocka_unit_test(test_output_file_atomic),
        cmocka_unit_test(test_check_command),
        cmocka_unit_test(test_us_units),
        cmocka_unit_test(test_canopies_check_status),
    };
    return cmocka_run_group_tests_name("cli_core", tests, NULL, NULL);
}
