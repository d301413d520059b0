/* test_cli_check.c - `sinkrate check`: every problem of a file in one run,
 * each with its file:line:column and in the order of the file; a tab in YAML
 * named as such; the CSV tables (sounding, wind table, drag table, flight
 * log) validated by the reader their columns call for; every other command
 * still stops at the first problem. */
#define _DEFAULT_SOURCE
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "testutil.h"

/* Four mistakes of a student's mission file, one per block: a misspelt key,
 * a negative mass, a size without its unit, a limit in the wrong unit. */
static const char FOUR[] = "mission: \"Four mistakes\"\n"
                           "site:\n"
                           "  elevation: 1380 m\n"
                           "  temprature: 38 C\n"
                           "sections:\n"
                           "  - {name: booster, mass: 3.1 kg}\n"
                           "  - {name: payload, mass: -2 kg}\n"
                           "stages:\n"
                           "  - name: drogue\n"
                           "    family: cross\n"
                           "    nominal-diameter: 0.9\n"
                           "    deploy: apogee\n"
                           "  - name: main\n"
                           "    family: conical\n"
                           "    nominal-diameter: 2.2 m\n"
                           "    deploy: {height: 250 m}\n"
                           "limits:\n"
                           "  touchdown-speed: 6.1 kg\n";

/* Where each problem of FOUR is and what it says. */
static const struct {
    const char *at, *says;
} FOUR_PROBLEMS[] = {
    {":4:3: ", "unknown key 'temprature' in site; did you mean 'temperature'?"},
    {":7:27: ", "section mass must be above 0"},
    {":11:23: ", "'0.9' needs a unit"},
    {":18:20: ", "unknown speed unit 'kg'"},
};

/* The lines of s, as pointers into a copy (free both). */
static size_t split_lines(const char *s, char ***lines, char **copy)
{
    *copy = strdup(s);
    size_t n = 0, cap = 16;
    *lines = malloc(cap * sizeof **lines);
    for (char *save = NULL, *l = strtok_r(*copy, "\n", &save); l; l = strtok_r(NULL, "\n", &save)) {
        if (n == cap)
            *lines = realloc(*lines, (cap *= 2) * sizeof **lines);
        (*lines)[n++] = l;
    }
    return n;
}

static void test_every_problem_of_a_mission(void **state)
{
    (void)state;
    const char *path = sr_test_tmpfile(".yaml", FOUR);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "check", path, NULL);
    assert_int_equal(rc, 2);
    char **lines, *copy;
    size_t n = split_lines(err, &lines, &copy);
    assert_int_equal(n, 4);
    for (size_t i = 0; i < 4; i++) {
        char want[600];
        snprintf(want, sizeof want, "sinkrate check: %s%s", path, FOUR_PROBLEMS[i].at);
        if (strncmp(lines[i], want, strlen(want)) != 0 || !strstr(lines[i], FOUR_PROBLEMS[i].says))
            fail_msg("problem %zu: want '%s...%s', got '%s'", i + 1, want, FOUR_PROBLEMS[i].says, lines[i]);
    }
    /* the report lists them too, and counts them */
    size_t rows = 0;
    for (const char *p = out; (p = strstr(p, "INVALID: ")); p++)
        rows++;
    assert_int_equal(rows, 4);
    assert_non_null(strstr(out, "4 problems in all"));
    free(lines);
    free(copy);
    free(out);
    free(err);

    /* every other command stops at the first problem: one line, exit 2 */
    rc = sr_test_cli(&out, &err, "profile", path, NULL);
    assert_int_equal(rc, 2);
    assert_int_equal(sr_test_lines(err), 1);
    assert_non_null(strstr(err, FOUR_PROBLEMS[0].at));
    assert_non_null(strstr(err, FOUR_PROBLEMS[0].says));
    free(out);
    free(err);
}

/* Tabs: libyaml's "cannot start any token" becomes a sentence that names
 * the tab, and every line indented with one is listed. */
static void test_tabs_named(void **state)
{
    (void)state;
    const char *path = sr_test_tmpfile(".yaml", "mission: x\nsite:\n\televation: 10 m\n\ttemperature: 3 C\n"
                                                "sections:\n  - {name: a, mass: 1 kg}\n");
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "check", path, NULL);
    assert_int_equal(rc, 2);
    assert_int_equal(sr_test_lines(err), 2);
    char want[600];
    for (int line = 3; line <= 4; line++) {
        snprintf(want, sizeof want, "%s:%d:1: a tab character: YAML indents with spaces, never tabs", path, line);
        if (!strstr(err, want))
            fail_msg("want '%s' in: %s", want, err);
    }
    assert_null(strstr(err, "cannot start any token"));
    free(out);
    free(err);
    /* a tab after the indentation, where libyaml speaks of indentation */
    path = sr_test_tmpfile(".yaml", "mission: x\nsite:\n  elevation: 10 m\n \t temperature: 3 C\n");
    rc = sr_test_cli(&out, &err, "rate", "--mission", path, "--family", "conical", "--nominal-diameter", "1m", NULL);
    assert_int_equal(rc, 2);
    snprintf(want, sizeof want, "%s:4:2: a tab character", path);
    assert_non_null(strstr(err, want));
    free(out);
    free(err);
}

/* Replace the first `from` in text (room for the result) by `to`. */
static void replace(char *text, const char *from, const char *to)
{
    char *k = strstr(text, from);
    assert_non_null(k);
    size_t fl = strlen(from), tl = strlen(to);
    memmove(k + tl, k + fl, strlen(k + fl) + 1);
    memcpy(k, to, tl);
}

/* A misspelt key is named once, with its suggestion, and not again as the
 * required key it was meant to be; the other blocks are still read. */
static void test_family_misspelt_key(void **state)
{
    (void)state;
    FILE *in = fopen(sr_test_path("canopies/conical.yaml"), "r");
    assert_non_null(in);
    static char text[16384];
    size_t len = fread(text, 1, sizeof text - 64, in);
    fclose(in);
    text[len] = '\0';
    replace(text, "\ndrag-coefficient:", "\ndrag-coeficient:");
    replace(text, "\nmach-limit:", "\nmach-limmit:");
    const char *path = sr_test_tmpfile(".yaml", text);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "check", path, NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "did you mean 'drag-coefficient'?"));
    assert_null(strstr(err, "missing the required key 'drag-coefficient'"));
    assert_int_equal(sr_test_lines(err), 2);
    free(out);
    free(err);
}

/* CSV tables: each kind read by its own reader and named in the table. */
static void test_csv_tables(void **state)
{
    (void)state;
    static const struct {
        const char *text; /* NULL: the file at path */
        const char *path;
        int rc;
        const char *kind, *says;
    } CASES[] = {
        /* invented demo files of the repository */
        {NULL, "payloads/balloon-winds.csv", 0, "wind table", "ok "},
        {NULL, "payloads/demo-flight.csv", 0, "flight log", "ok "},
        {"altitude [m],temperature [C],pressure [hPa]\n0,15,1013.25\n1000,8.5,898.76\n", NULL, 0, "sounding",
         "ok 0 .. 1000 m"},
        {"Re,Cd\n1e3,0.47\n1e4,0.40\n1e5,0.47\n", NULL, 0, "drag table", "ok "},
        {"altitude [m],temperature [C],pressure [hPa]\n0,15,1013\n1000,x,900\n", NULL, 2, "sounding",
         ":3:6: column 'temperature': 'x' is not a number"},
        {"time [s],height\n0,1\n", NULL, 2, "flight log", "height"},
        {"colour,size\nred,3\n", NULL, 2, "?", ":1:1: not a sinkrate table"},
    };
    for (size_t i = 0; i < sizeof CASES / sizeof CASES[0]; i++) {
        const char *path = CASES[i].text ? sr_test_tmpfile(".csv", CASES[i].text) : sr_test_path(CASES[i].path);
        char *out, *err;
        int rc = sr_test_cli(&out, &err, "check", path, NULL);
        if (rc != CASES[i].rc || !strstr(out, CASES[i].kind) || !strstr(rc ? err : out, CASES[i].says))
            fail_msg("case %zu (%s): exit %d, want %d, kind '%s' and '%s'\nout: %s\nerr: %s", i, path, rc, CASES[i].rc,
                     CASES[i].kind, CASES[i].says, out, err);
        free(out);
        free(err);
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_every_problem_of_a_mission),
        cmocka_unit_test(test_tabs_named),
        cmocka_unit_test(test_family_misspelt_key),
        cmocka_unit_test(test_csv_tables),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
