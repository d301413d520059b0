/* test_determinism.c - identical inputs give identical output bytes: every
 * command line below runs twice in-process (with the whole list run in
 * between, so no state leaks from one command to the next), in text, CSV and
 * JSON, SI and US units, and the bytes written with -o equal those on stdout.
 * A row may name a second command line that must give the same bytes (e.g.
 * the same Monte Carlo run at another thread count). A run may exit 1 (a
 * limit of a demo mission exceeded: its report is still the product), but
 * always with the same code. */
#define _DEFAULT_SOURCE
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli/commands.h"
#include "testutil.h"

#define DEMO "@ROOT@/payloads/desert-club-rocket.yaml"

typedef struct det_case {
    const char *args[16]; /* after "sinkrate"; @ROOT@ is the source tree */
    const char *same[16]; /* optional: another command line with the same output */
} det_case;

static const det_case CASES[] = {
    {{"size", "--mass", "5.3kg", "--speed", "6.1m/s", "--family", "conical", "--site-elevation", "1380m",
      "--surface-temp", "38C", "--surface-pressure", "858hPa"},
     {"size", "--family", "conical", "--surface-pressure", "858hPa", "--speed", "6.1m/s", "--surface-temp", "38C",
      "--mass", "5.3kg", "--site-elevation", "1380m"}},
    {{"size", "--mission", DEMO}, {"size", "--mission", DEMO, "--speed", "6.1 m/s"}},
    {{"size", "--mass", "2kg", "--speed", "5m/s", "--family", "cross", "--cluster", "3", "--areal-mass", "40g/m2"},
     {NULL}},
    {{"rate", "--mass", "5.3kg", "--family", "conical", "--projected-diameter", "1.5m", "--altitude",
      "1380m,2000m,4000m", "--site-elevation", "1380m", "--surface-temp", "38C"},
     {NULL}},
    {{"rate", "--mission", DEMO, "--altitude", "1380m,1630m,4280m"}, {NULL}},
    {{"rate", "--mass", "10kg", "--family", "flat-circular", "--nominal-diameter", "2m", "--drag-coefficient", "1.4",
      "--drag-reference", "projected"},
     {"rate", "--mass", "10000 g", "--family", "flat-circular", "--nominal-diameter", "200 cm", "--drag-coefficient",
      "1.4", "--drag-reference", "projected"}},
    {{"air", "--from", "0", "--to", "30km", "--step", "5km"}, {"air", "--altitude", "0,5km,10km,15km,20km,25km,30km"}},
    {{"air", "--temp-offset", "15C", "--altitude", "0,1km,11km"}, {NULL}},
    {{"canopies"}, {NULL}},
    {{"canopies", "disk-gap-band"}, {NULL}},
    {{"canopies", "--models"}, {NULL}},
    {{"check", DEMO, "@ROOT@/canopies/conical.yaml"}, {NULL}},
    {{"check", "@ROOT@/payloads/balloon-winds.csv", "@ROOT@/payloads/demo-flight.csv"}, {NULL}},
    {{"canopies", "--data", "@ROOT@/canopies"}, {NULL}},
    /* later commands append their rows here (seeded runs: give --seed) */
    {{"sweep", "--mass", "2kg", "--family", "conical", "--nominal-diameter", "1.5m", "--from", "0", "--to", "3km",
      "--step", "500m", "--by", "temp-offset=-20C,0C,25C"},
     {"sweep", "--by", "temp-offset=-20 C,0 C,25 C", "--values", "0,500m,1km,1500m,2km,2500m,3000m", "--mass",
      "2000g", "--family", "conical", "--nominal-diameter", "150cm"}},
    {{"sweep", "--mission", DEMO, "--vary", "mass", "--from", "4kg", "--to", "7kg", "--step", "0.5kg", "--by",
      "site-elevation=0,1380m"},
     {NULL}},
    {{"sweep", "--vary", "speed", "--values", "4m/s,6m/s,8m/s", "--mass", "3kg", "--family", "conical", "--family",
      "cross"},
     {NULL}},
    {{"profile", DEMO}, {NULL}},
    {{"profile", "@ROOT@/payloads/desert-club-rocket-revised.yaml"}, {NULL}},
    {{"profile", "@ROOT@/payloads/balloon-instrument.yaml"}, {NULL}},
    {{"profile", "@ROOT@/payloads/drone-cargo-drop.yaml"}, {NULL}},
    {{"profile", DEMO, "--fail", "main", "--limits-at", "typical"}, {NULL}},
    {{"loads", "--mission", DEMO}, {NULL}},
    {{"loads", "--mission", "@ROOT@/payloads/desert-club-rocket-revised.yaml", "--stage", "main", "--limits-at",
      "typical"},
     {NULL}},
    {{"profile", "@ROOT@/payloads/desert-club-rocket-revised.yaml", "--limits-at", "typical", "--fast"}, {NULL}},
    {{"loads", "--mass", "5kg", "--speed", "30m/s", "--family", "conical", "--nominal-diameter", "1.5m",
      "--design-factor", "1.5", "--cluster", "2"},
     {"loads", "--cluster", "2", "--design-factor", "1.5", "--nominal-diameter", "150cm", "--family", "conical",
      "--speed", "30 m/s", "--mass", "5000g"}},
    {{"freefall", "--body", "sphere", "--diameter", "10cm", "--mass", "1kg", "--trace", "--altitude", "0,5km"},
     {"freefall", "--mass", "1 kg", "--trace", "--diameter", "0.1 m", "--altitude", "0,5000m"}},
    {{"freefall", "--body", "cylinder", "--diameter", "10.2cm", "--length", "86cm", "--mass", "3.4kg", "--altitude",
      "0:4km:1km"},
     {NULL}},
    {{"fit", "@ROOT@/payloads/demo-flight.csv", "--mission", DEMO, "--pressure-altitude"},
     {"fit", "--pressure-altitude", "--mission", DEMO, "@ROOT@/payloads/demo-flight.csv"}},
    {{"fit", "@ROOT@/payloads/demo-flight.csv", "--mass", "5.3 kg", "--stage-names", "drogue,main", "--family",
      "conical", "--nominal-diameter", "2.2 m", "--site-elevation", "1380 m", "--surface-temp", "38 C"},
     {NULL}},
    /* Monte Carlo: a fixed seed gives the same bytes, at one thread or two */
    {{"dispersion", DEMO, "-n", "2000", "--seed", "42", "--threads", "1"},
     {"dispersion", DEMO, "-n", "2000", "--seed", "42", "--threads", "2"}},
    {{"dispersion", "@ROOT@/payloads/balloon-instrument.yaml", "-n", "2000", "--seed", "7", "--threads", "2"},
     {"dispersion", "@ROOT@/payloads/balloon-instrument.yaml", "-n", "2000", "--seed", "7", "--threads", "1"}},
    /* one table of the output */
    {{"profile", "@ROOT@/payloads/desert-club-rocket-revised.yaml", "--table", "touchdown"}, {NULL}},
    {{"dispersion", DEMO, "-n", "500", "--seed", "3", "--table", "percentiles", "--threads", "1"},
     {"dispersion", DEMO, "-n", "500", "--seed", "3", "--table", "percentiles", "--threads", "2"}},
    /* the design search: the same designs, margins and front at one thread or two */
    {{"design", DEMO, "--threads", "1"}, {"design", DEMO, "--threads", "2"}},
    {{"design", "@ROOT@/payloads/drone-cargo-drop.yaml", "--risk-samples", "300", "--seed", "4", "--threads", "2"},
     {"design", "@ROOT@/payloads/drone-cargo-drop.yaml", "--risk-samples", "300", "--seed", "4", "--threads", "1"}},
    {{"design", DEMO, "--optional", "drogue", "--objective", "drift", "--table", "pareto", "--threads", "2"},
     {"design", DEMO, "--objective", "drift", "--optional", "drogue", "--table", "pareto", "--threads", "1"}},
    {{"size", "--mass", "12 lbs", "--speed", "20 ft/s", "--family", "conical", "--table", "values"},
     {"size", "--mass", "192 oz", "--speed", "20 ft/s", "--family", "conical", "--table", "values"}},
};

#define NCASES (sizeof CASES / sizeof CASES[0])

static const char *const FORMATS[][4] = {
    {"--format", "text", "--units", "si"},
    {"--format", "csv", "--units", "si"},
    {"--format", "json", "--units", "si"},
    {"--format", "text", "--units", "us"},
    {"--format", "json", "--units", "us"},
};
#define NFORMATS (sizeof FORMATS / sizeof FORMATS[0])

/* Run one command line with a format; returns stdout (malloc'd) and its exit code. */
static char *run(const char *const *args, size_t fmt, const char *outfile, int *rc)
{
    char store[24][1024];
    char *argv[32];
    int argc = 0;
    argv[argc++] = "sinkrate";
    const char *root = getenv("SR_ROOT") ? getenv("SR_ROOT") : ".";
    for (size_t k = 0; k < 16 && args[k]; k++) {
        const char *at = strstr(args[k], "@ROOT@");
        if (at)
            snprintf(store[argc], sizeof store[argc], "%.*s%s%s", (int)(at - args[k]), args[k], root, at + 6);
        else
            snprintf(store[argc], sizeof store[argc], "%s", args[k]);
        argv[argc] = store[argc];
        argc++;
    }
    for (size_t k = 0; k < 4; k++)
        argv[argc++] = (char *)FORMATS[fmt][k];
    if (outfile) {
        argv[argc++] = "-o";
        argv[argc++] = (char *)outfile;
    }
    argv[argc] = NULL;
    char *out, *err;
    *rc = sr_test_cli_argv(&out, &err, argc, argv);
    free(err);
    return out;
}

static void test_same_bytes_twice(void **state)
{
    (void)state;
    /* every command has a line: a new one fails here until it is added */
    for (const sr_command *const *cmd = sr_cli_commands; *cmd; cmd++) {
        int found = 0;
        for (size_t i = 0; i < NCASES; i++)
            found |= strcmp(CASES[i].args[0], (*cmd)->name) == 0;
        if (!found)
            fail_msg("no determinism line for the command '%s'", (*cmd)->name);
    }
    char *first[NCASES][NFORMATS];
    int first_rc[NCASES];
    for (int pass = 0; pass < 2; pass++)
        for (size_t i = 0; i < NCASES; i++)
            for (size_t f = 0; f < NFORMATS; f++) {
                int rc;
                char *out = run(CASES[i].args, f, NULL, &rc);
                assert_true(rc == 0 || rc == 1);
                assert_true(strlen(out) > 0);
                if (pass == 0) {
                    first[i][f] = out;
                    first_rc[i] = rc;
                    continue;
                }
                assert_int_equal(rc, first_rc[i]);
                if (strcmp(out, first[i][f]) != 0)
                    print_error("row %zu (%s) %s %s: output differs between two runs\n", i, CASES[i].args[0],
                                FORMATS[f][1], FORMATS[f][3]);
                assert_string_equal(out, first[i][f]);
                free(out);
            }
    /* the second command line of a row gives the same bytes */
    for (size_t i = 0; i < NCASES; i++) {
        if (!CASES[i].same[0])
            continue;
        for (size_t f = 0; f < NFORMATS; f++) {
            int rc;
            char *out = run(CASES[i].same, f, NULL, &rc);
            assert_int_equal(rc, first_rc[i]);
            if (strcmp(out, first[i][f]) != 0)
                print_error("row %zu (%s) %s %s: the equivalent command line differs\n", i, CASES[i].args[0],
                            FORMATS[f][1], FORMATS[f][3]);
            assert_string_equal(out, first[i][f]);
            free(out);
        }
    }
    for (size_t i = 0; i < NCASES; i++)
        for (size_t f = 0; f < NFORMATS; f++)
            free(first[i][f]);
}

/* -o writes exactly what stdout would show. */
static void test_file_equals_stdout(void **state)
{
    (void)state;
    char dir[64];
    sr_test_tmpdir(dir, sizeof dir, "det");
    char file[256];
    snprintf(file, sizeof file, "%s/out", dir);
    for (size_t i = 0; i < NCASES; i++)
        for (size_t f = 0; f < NFORMATS; f++) {
            int rc;
            char *out = run(CASES[i].args, f, NULL, &rc);
            int rc_file;
            char *none = run(CASES[i].args, f, file, &rc_file);
            assert_int_equal(rc_file, rc);
            assert_true(rc == 0 || rc == 1);
            assert_string_equal(none, "");
            char *written = sr_test_slurp(file, NULL);
            assert_non_null(written);
            if (strcmp(out, written) != 0)
                print_error("row %zu (%s) %s: -o wrote other bytes than stdout\n", i, CASES[i].args[0],
                            FORMATS[f][1]);
            assert_string_equal(out, written);
            free(out);
            free(none);
            free(written);
            unlink(file);
        }
    assert_int_equal(rmdir(dir), 0); /* nothing else (no temporaries) was left */
}

/* The trajectory and the landing maps: the same bytes from two runs, and the
 * dispersion map at one thread and at two. */
static void test_map_files_same_bytes(void **state)
{
    (void)state;
    char dir[64];
    sr_test_tmpdir(dir, sizeof dir, "det-maps");
    const char *root = getenv("SR_ROOT") ? getenv("SR_ROOT") : ".";
    char revised[512], demo[512];
    snprintf(revised, sizeof revised, "%s/payloads/desert-club-rocket-revised.yaml", root);
    snprintf(demo, sizeof demo, "%s/payloads/desert-club-rocket.yaml", root);
    static const char *const NAMES[] = {"t.csv", "t.json", "p.geojson", "d.geojson"};
    char *first[4] = {NULL};
    for (int pass = 0; pass < 2; pass++) {
        char f[4][600];
        for (int k = 0; k < 4; k++)
            snprintf(f[k], sizeof f[k], "%s/%s", dir, NAMES[k]);
        char *out, *err;
        int rc = sr_test_cli(&out, &err, "profile", revised, "--trajectory", f[0], "--geojson", f[2], "--band-ends",
                             "--units", "us", NULL);
        assert_int_equal(rc, 0);
        free(out);
        free(err);
        rc = sr_test_cli(&out, &err, "profile", revised, "--trajectory", f[1], NULL);
        assert_int_equal(rc, 0);
        free(out);
        free(err);
        rc = sr_test_cli(&out, &err, "dispersion", demo, "-n", "1000", "--seed", "5", "--threads", pass ? "2" : "1",
                         "--geojson", f[3], "--geojson-samples", "100", NULL);
        assert_int_equal(rc, 1);
        free(out);
        free(err);
        for (int k = 0; k < 4; k++) {
            char *b = sr_test_slurp(f[k], NULL);
            assert_non_null(b);
            if (!pass) {
                first[k] = b;
                continue;
            }
            if (strcmp(b, first[k]) != 0)
                print_error("%s differs between two runs\n", NAMES[k]);
            assert_string_equal(b, first[k]);
            free(b);
            free(first[k]);
            unlink(f[k]);
        }
    }
    assert_int_equal(rmdir(dir), 0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_same_bytes_twice),
        cmocka_unit_test(test_file_equals_stdout),
        cmocka_unit_test(test_map_files_same_bytes),
    };
    return cmocka_run_group_tests_name("determinism", tests, NULL, NULL);
}
