/* test_tables.c - `--table NAME`: one table of a command's CSV (and JSON,
 * and text) output; the names each --help lists (cli/tables.c) are exactly
 * the tables the commands write, checked on real runs; an unknown name is
 * bad usage, a name this run has no table for says which it has. */
#define _DEFAULT_SOURCE
#include <jansson.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli/commands.h"
#include "cli/tables.h"
#include "testutil.h"

#define REVISED "payloads/desert-club-rocket-revised.yaml"

typedef struct run_case {
    const char *cmd;
    const char *args[16];
} run_case;

/* Runs that together write every table of every command. */
static const run_case RUNS[] = {
    {"size", {"--mass", "5kg", "--speed", "6m/s", "--family", "conical", NULL}},
    {"rate", {"--mass", "5kg", "--family", "conical", "--nominal-diameter", "2m", NULL}},
    {"sweep", {"--mass", "5kg", "--family", "conical", "--nominal-diameter", "2m", "--from", "0", "--to", "2km", "--step", "1km", NULL}},
    {"profile", {"@" REVISED, NULL}},
    {"loads", {"--mission", "@" REVISED, "--stage", "main", NULL}},
    {"loads", {"--mission", "@" REVISED, NULL}},
    {"freefall", {"--body", "sphere", "--diameter", "0.2m", "--mass", "3kg", "--trace", NULL}},
    {"dispersion", {"@" REVISED, "-n", "200", NULL}},
    {"air", {"--to", "2km", "--step", "1km", NULL}},
    {"canopies", {NULL}},
    {"canopies", {"conical", NULL}},
    {"check", {"@canopies/conical.yaml", NULL}},
    {"fit", {"@payloads/demo-flight.csv", "@payloads/demo-flight.csv", "--mission", "@payloads/desert-club-rocket.yaml",
             "--pressure-altitude", NULL}},
    /* the design search: misses, the front and the risk check */
    {"design", {"@payloads/desert-club-rocket.yaml", "--risk-samples", "200", NULL}},
    /* a failure case as the descent: the impact speeds of every attitude */
    {"profile", {"@" REVISED, "--fail", "main", NULL}},
};

/* The first run of a command in RUNS (new runs can go anywhere). */
static const run_case *first_run(const char *cmd)
{
    for (size_t r = 0; r < sizeof RUNS / sizeof RUNS[0]; r++)
        if (strcmp(RUNS[r].cmd, cmd) == 0)
            return &RUNS[r];
    fail_msg("no run of %s in RUNS", cmd);
    return NULL;
}

static int run(const run_case *rc, const char *format, const char *table, char **out, char **err)
{
    char *argv[40];
    int argc = 0;
    argv[argc++] = "sinkrate";
    argv[argc++] = (char *)rc->cmd;
    for (size_t i = 0; rc->args[i]; i++)
        argv[argc++] = (char *)(rc->args[i][0] == '@' ? sr_test_path(rc->args[i] + 1) : rc->args[i]);
    argv[argc++] = "--format";
    argv[argc++] = (char *)format;
    if (table) {
        argv[argc++] = "--table";
        argv[argc++] = (char *)table;
    }
    argv[argc] = NULL;
    return sr_test_cli_argv(out, err, argc, argv);
}

/* The registry and the commands agree both ways. */
static void test_registry_matches_outputs(void **state)
{
    (void)state;
    /* every command: a new one fails here until RUNS write each table it lists */
    const char *CMDS[64];
    size_t ncmds = 0;
    for (const sr_command *const *cmd = sr_cli_commands; *cmd && ncmds < 64; cmd++)
        CMDS[ncmds++] = (*cmd)->name;
    for (size_t c = 0; c < ncmds; c++) {
        const char *const *names = sr_cli_tables(CMDS[c]);
        assert_non_null(names);
        assert_string_equal(names[0], "values");
        int seen[16] = {0};
        seen[0] = 1;
        for (size_t r = 0; r < sizeof RUNS / sizeof RUNS[0]; r++) {
            if (strcmp(RUNS[r].cmd, CMDS[c]) != 0)
                continue;
            char *out, *err;
            int rc = run(&RUNS[r], "json", NULL, &out, &err);
            if (rc > 1)
                fail_msg("%s: exit %d: %s", CMDS[c], rc, err);
            json_error_t je;
            json_t *doc = json_loads(out, 0, &je);
            assert_non_null(doc);
            const char *key;
            json_t *v;
            json_object_foreach(json_object_get(doc, "tables"), key, v)
            {
                if (!sr_cli_table_known(CMDS[c], key))
                    fail_msg("%s writes a table '%s' that its --help does not list", CMDS[c], key);
                for (size_t k = 0; names[k]; k++) {
                    size_t l = strlen(names[k]);
                    if (strcmp(names[k], key) == 0 || (l > 2 && strcmp(names[k] + l - 2, "_N") == 0 &&
                                                      strncmp(names[k], key, l - 1) == 0))
                        seen[k] = 1;
                }
            }
            json_decref(doc);
            free(out);
            free(err);
        }
        for (size_t k = 0; names[k]; k++)
            if (!seen[k])
                fail_msg("%s: --help lists table '%s', which no test run wrote", CMDS[c], names[k]);
    }
}

/* CSV with --table: the caution and the header line on top, then one table
 * whose rows all have as many cells as its header. */
static void test_one_csv_table(void **state)
{
    (void)state;
    char *out, *err;
    assert_int_equal(run(first_run("profile"), "csv", "touchdown", &out, &err), 0);
    assert_non_null(strstr(out, "# CAUTION: preliminary engineering estimates only."));
    int data = 0, header = 0;
    size_t cols = 0;
    for (char *line = strtok(out, "\n"); line; line = strtok(NULL, "\n")) {
        if (line[0] == '#') {
            assert_int_equal(data, 0); /* comments only on top */
            assert_null(strstr(line, "# note:"));
            assert_null(strstr(line, "# table:"));
            continue;
        }
        size_t n = 1;
        for (char *p = line; *p; p++)
            n += *p == ',';
        if (!header) {
            header = 1;
            cols = n;
            assert_non_null(strstr(line, "\"rate_typical [m/s]\""));
        } else {
            assert_int_equal(n, cols);
            data++;
        }
    }
    assert_int_equal(data, 1);
    free(out);
    free(err);
    /* the single values as a table of their own */
    assert_int_equal(run(first_run("profile"), "csv", "values", &out, &err), 0);
    assert_non_null(strstr(out, "\"quantity\",\"value\",\"unit\""));
    assert_non_null(strstr(out, "\"descent_time_typical\","));
    assert_null(strstr(out, "\"time [s]\""));
    free(out);
    free(err);
}

static void test_one_json_and_text_table(void **state)
{
    (void)state;
    char *out, *err;
    assert_true(run(first_run("dispersion"), "json", "percentiles", &out, &err) <= 1);
    json_error_t je;
    json_t *doc = json_loads(out, 0, &je);
    assert_non_null(doc);
    assert_int_equal(json_object_size(json_object_get(doc, "tables")), 1);
    assert_non_null(json_object_get(json_object_get(doc, "tables"), "percentiles"));
    assert_null(json_object_get(doc, "values"));
    assert_non_null(json_object_get(doc, "caution"));
    json_decref(doc);
    free(out);
    free(err);
    assert_int_equal(run(first_run("rate"), "text", "rates", &out, &err), 0);
    assert_non_null(strstr(out, "CAUTION"));
    assert_non_null(strstr(out, "Descent rate (band from the drag range)"));
    assert_null(strstr(out, "Inputs"));
    assert_null(strstr(out, "Notes"));
    free(out);
    free(err);
}

static void test_bad_table_names(void **state)
{
    (void)state;
    char *out, *err;
    /* not a table of the command: bad usage before any work, with a suggestion */
    assert_int_equal(run(first_run("rate"), "csv", "rate", &out, &err), 2);
    assert_non_null(strstr(err, "--table: rate has no table 'rate'; did you mean 'rates'?"));
    assert_string_equal(out, "");
    assert_int_equal(sr_test_lines(err), 1);
    free(out);
    free(err);
    assert_int_equal(run(first_run("air"), "csv", "xyz", &out, &err), 2);
    assert_non_null(strstr(err, "(its tables: values, atmosphere)"));
    free(out);
    free(err);
    /* a table of the command this run does not write: exit 2, no file */
    char path[512];
    snprintf(path, sizeof path, "%s", sr_test_tmpfile(".csv", ""));
    unlink(path);
    const run_case noff = {"profile", {"@payloads/drone-cargo-drop.yaml", "-o", path, NULL}};
    assert_int_equal(run(&noff, "csv", "failure_cases", &out, &err), 2);
    assert_non_null(strstr(err, "--table: this output has no table 'failure_cases' (it has: values, "));
    assert_int_not_equal(access(path, F_OK), 0);
    free(out);
    free(err);
    /* a numbered family */
    assert_int_equal(run(first_run("freefall"), "csv", "trace_1", &out, &err), 0);
    free(out);
    free(err);
    assert_int_equal(run(first_run("freefall"), "csv", "trace_x", &out, &err), 2);
    free(out);
    free(err);
}

/* The help's line of table names, joined where --help wrapped it. */
static char *help_tables(const char *help)
{
    const char *at = strstr(help, "Tables of its output (--table NAME): ");
    assert_non_null(at);
    const char *end = strstr(at, "\n\n");
    char *s = strndup(at, end ? (size_t)(end - at) : strlen(at)), *o = s;
    for (const char *p = s; *p; p++) {
        if (*p == '\n') {
            while (p[1] == ' ')
                p++;
            *o++ = ' ';
        } else {
            *o++ = *p;
        }
    }
    *o = '\0';
    return s;
}

static void test_help_lists_tables(void **state)
{
    (void)state;
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "profile", "--help", NULL), 0);
    char *t = help_tables(out);
    assert_non_null(strstr(t, "Tables of its output (--table NAME): values, sections, free_fall_drag, stages, "));
    free(t);
    assert_non_null(strstr(out, "--table NAME"));
    free(out);
    free(err);
    assert_int_equal(sr_test_cli(&out, &err, "dispersion", "--help", NULL), 0);
    t = help_tables(out);
    assert_string_equal(t, "Tables of its output (--table NAME): values, uncertainty, percentiles, limits");
    free(t);
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_registry_matches_outputs),
        cmocka_unit_test(test_one_csv_table),
        cmocka_unit_test(test_one_json_and_text_table),
        cmocka_unit_test(test_bad_table_names),
        cmocka_unit_test(test_help_lists_tables),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
