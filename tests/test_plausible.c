/* test_plausible.c - the judgements of inputs that are valid but probably a
 * unit slip, and of the Mach number, through the library and through every
 * command that takes those inputs; --units us and its bare numbers; and
 * `size` and `sweep --vary speed` agreeing on impossible targets. The
 * thresholds are ours (docs/method.md, Plausibility); the tests check the
 * behaviour at and around them. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/input_warnings.h"
#include "physics/plausible.h"
#include "testutil.h"

#define DEMO "payloads/desert-club-rocket.yaml"

/* ---- the library ---- */

typedef struct rule_case {
    sr_plaus_kind kind;
    double ok, slip; /* a plausible value and one just beyond a threshold, SI */
    const char *phrase;
} rule_case;

static const rule_case RULES[] = {
    {SR_PLAUS_MASS, 2.65, 0.004, "under 0.005 kg"},           /* 4 g: a payload in g read as kg the other way */
    {SR_PLAUS_MASS, 9000.0, 10001.0, "over 10000 kg"},        /* 10 t */
    {SR_PLAUS_CANOPY_D0, 0.9, 50.5, "over 50 m"},             /* 36 read as m, not in, at D0 */
    {SR_PLAUS_CANOPY_D0, 0.3, 0.09, "under 0.1 m"},           /* 36 mm meant as in */
    {SR_PLAUS_DESCENT_SPEED, 1.0, 0.99, "under 1 m/s"},       /* the 36 m canopy of a 2.65 kg payload */
    {SR_PLAUS_BODY_SIZE, 0.102, 51.0, "over 50 m"},
    {SR_PLAUS_AREAL_MASS, 0.040, 0.009, "9 g/m2 is under 10 g/m2"}, /* kg/m2 written as g/m2 */
};

static void test_rules(void **state)
{
    (void)state;
    char buf[SR_INPUT_WARN_LEN];
    for (size_t i = 0; i < sizeof RULES / sizeof RULES[0]; i++) {
        const rule_case *c = &RULES[i];
        assert_int_equal(sr_plausible_check(c->kind, c->ok, "x", SR_UNITS_SI, buf, sizeof buf), 0);
        assert_int_equal(sr_plausible_check(c->kind, c->slip, "--opt", SR_UNITS_SI, buf, sizeof buf), 1);
        if (!strstr(buf, c->phrase) || strncmp(buf, "--opt: ", 7) != 0)
            fail_msg("rule %zu: '%s' lacks '%s'", i, buf, c->phrase);
        assert_non_null(sr_plausible_rule(c->kind));
    }
    /* the message follows the unit system */
    assert_int_equal(sr_plausible_check(SR_PLAUS_CANOPY_D0, 36.0, "D0", SR_UNITS_US, buf, sizeof buf), 0);
    assert_int_equal(sr_plausible_check(SR_PLAUS_CANOPY_D0, 60.0, "D0", SR_UNITS_US, buf, sizeof buf), 1);
    assert_non_null(strstr(buf, "197 ft is over 164 ft"));
    /* NaN and infinities are not judged here (the parsers refuse them) */
    assert_int_equal(sr_plausible_check(SR_PLAUS_MASS, NAN, "x", SR_UNITS_SI, buf, sizeof buf), 0);
}

static void test_mach_judge(void **state)
{
    (void)state;
    CHECK_ABS_CLASS(SR_CHECK_TRADE, "Mach number below which air is treated as incompressible",
                    "common practice: density changes stay under about 5 % below Mach 0.3", 0.3,
                    SR_MACH_INCOMPRESSIBLE, 0.0);
    static const struct {
        double mach, envelope;
        unsigned bits;
    } C[] = {
        {0.02, 0.5, 0},
        {0.3, 0.5, 0}, /* at the limit: not above it */
        {0.31, 0.5, SR_MACH_OVER_INCOMPRESSIBLE},
        {0.6, 0.5, SR_MACH_OVER_INCOMPRESSIBLE | SR_MACH_OVER_ENVELOPE},
        {0.2, 0.1, SR_MACH_OVER_ENVELOPE},
        {0.2, 0.0, 0},  /* no envelope given */
        {0.9, NAN, SR_MACH_OVER_INCOMPRESSIBLE},
        {NAN, 0.5, 0},
    };
    for (size_t i = 0; i < sizeof C / sizeof C[0]; i++)
        assert_int_equal(sr_mach_judge(C[i].mach, C[i].envelope), C[i].bits);
    char buf[400];
    sr_mach_describe(SR_MACH_OVER_ENVELOPE | SR_MACH_OVER_INCOMPRESSIBLE, 2.95, 0.5, "conical", "the descent", buf,
                     sizeof buf);
    assert_non_null(strstr(buf, "the descent reaches Mach 2.95, above the conical family's usual application "
                                "(Mach 0.5) and above Mach 0.3"));
    sr_mach_describe(SR_MACH_OVER_INCOMPRESSIBLE, 0.57, 2.0, "flat-ribbon", "the descent", buf, sizeof buf);
    assert_null(strstr(buf, "family"));
    assert_non_null(strstr(buf, "above Mach 0.3"));
}

/* ---- through the commands ---- */

/* Whether text holds phrase, any run of white space matching any other
 * (the text report wraps its warnings). */
static int has(const char *s, const char *phrase)
{
    if (!s)
        return 0;
    char *a = malloc(strlen(s) + 1), *b = malloc(strlen(phrase) + 1);
    assert_non_null(a);
    assert_non_null(b);
    const char *src[2] = {s, phrase};
    char *dst[2] = {a, b};
    for (int k = 0; k < 2; k++) {
        char *d = dst[k];
        for (const char *p = src[k]; *p; p++) {
            int sp = *p == ' ' || *p == '\n' || *p == '\t';
            if (sp && d > dst[k] && d[-1] == ' ')
                continue;
            *d++ = sp ? ' ' : *p;
        }
        *d = '\0';
    }
    int r = strstr(a, b) != NULL;
    free(a);
    free(b);
    return r;
}

typedef struct cli_case {
    const char *what;
    const char *args[24];
    int rc;             /* the exit code; -1: 0 or 1, whatever the mission's limits say */
    const char *phrase; /* in stdout (text), NULL: no warning of this module may appear */
} cli_case;

static const cli_case WARN[] = {
    /* the slip of the issue, written in SI: a 36 m canopy for a 2.65 kg payload */
    {"rate: slow descent",
     {"rate", "--mass", "2.65 kg", "--flat-diameter", "36 m", "--family", "flat-circular"},
     0,
     "Descent rate (typical) at 0 m: 0.232 m/s is under 1 m/s"},
    {"rate: light mass", {"rate", "--mass", "3 g", "--nominal-diameter", "30 cm", "--family", "conical"}, 0,
     "Descending mass: 0.003 kg is under 0.005 kg"},
    {"rate: wide canopy", {"rate", "--mass", "2000 kg", "--nominal-diameter", "60 m", "--family", "ringsail"}, 0,
     "Canopy nominal diameter D0: 60 m is over 50 m"},
    {"rate: tiny canopy", {"rate", "--mass", "10 g", "--nominal-diameter", "8 cm", "--family", "conical"}, 0,
     "Canopy nominal diameter D0: 0.08 m is under 0.1 m"},
    {"rate: light cloth",
     {"rate", "--mass", "2 kg", "--nominal-diameter", "1.5 m", "--family", "conical", "--areal-mass", "5 g/m2"},
     0,
     "Canopy areal mass: 5 g/m2 is under 10 g/m2"},
    {"rate: plausible", {"rate", "--mass", "2 kg", "--nominal-diameter", "1.5 m", "--family", "conical"}, 0, NULL},
    {"size: heavy payload, wide canopy", {"size", "--mass", "20000 kg", "--speed", "6 m/s", "--family", "conical"}, 0,
     "Payload mass: 20000 kg is over 10000 kg"},
    {"size: heavy payload, wide canopy (2)",
     {"size", "--mass", "20000 kg", "--speed", "6 m/s", "--family", "conical"},
     0,
     "Nominal diameter D0 needed (typical): 117 m is over 50 m"},
    {"size: slow target", {"size", "--mass", "2 kg", "--speed", "0.8 m/s", "--family", "conical"}, 0,
     "Target touchdown speed: 0.8 m/s is under 1 m/s"},
    {"sweep: slow rows",
     {"sweep", "--family", "conical", "--nominal-diameter", "20 m", "--vary", "mass", "--values", "1 kg,2 kg"},
     0,
     "Slowest descent rate (typical): 0.249 m/s is under 1 m/s"},
    {"sweep: swept mass", {"sweep", "--family", "conical", "--nominal-diameter", "1 m", "--vary", "mass", "--values",
                           "2 g,2 kg"},
     0, "Swept mass: 0.002 kg is under 0.005 kg"},
    {"sweep: canopy", {"sweep", "--mass", "3000 kg", "--family", "ringsail", "--nominal-diameter", "55 m"}, 0,
     "Canopy (ringsail) nominal diameter D0: 55 m is over 50 m"},
    {"loads: light mass",
     {"loads", "--mass", "3 g", "--speed", "20 m/s", "--family", "conical", "--nominal-diameter", "30 cm"},
     0,
     "Decelerated mass: 0.003 kg is under 0.005 kg"},
    {"freefall: large body", {"freefall", "--mass", "500 kg", "--diameter", "60 m", "--body", "disk"}, 0,
     "Body diameter: 60 m is over 50 m"},
    {"freefall: light body", {"freefall", "--mass", "1 g", "--diameter", "1 cm"}, 0,
     "Mass: 0.001 kg is under 0.005 kg"},
    /* Mach: above the family's envelope and 0.3; above 0.3 only; the judgement is shared */
    {"rate: Mach 3 at 30 km",
     {"rate", "--mass", "50 kg", "--nominal-diameter", "30 cm", "--altitude", "30 km", "--family", "conical"},
     0,
     "the conical family's usual application (Mach 0.5) and above Mach 0.3"},
    {"rate: Mach above 0.3 within the envelope",
     {"rate", "--mass", "50 kg", "--nominal-diameter", "1 m", "--altitude", "20 km", "--family", "flat-ribbon"},
     0,
     "above Mach 0.3, where the air's compressibility"},
    {"size: Mach of the target", {"size", "--mass", "50 kg", "--speed", "200 m/s", "--altitude", "20 km", "--family",
                                  "conical"},
     0, "The target speed reaches Mach 0.68, above the conical family's usual application"},
    {"sweep: Mach over altitude",
     {"sweep", "--mass", "50 kg", "--family", "conical", "--nominal-diameter", "30 cm", "--from", "0", "--to",
      "30 km", "--step", "10 km"},
     0,
     "The descent reaches Mach 3.31, above the conical family's usual application"},
    {"sweep: Mach of target speeds",
     {"sweep", "--mass", "50 kg", "--family", "conical", "--vary", "speed", "--values", "150 m/s,250 m/s"},
     0,
     "The target speed reaches Mach 0.73"},
    /* the power-law wind of the demo runs from 10 m up to the 2900 m start */
    {"profile: wind extrapolated", {"profile", DEMO}, -1,
     "The power-law wind is extrapolated from its reference height (10 m) to 2900 m above ground"},
    {"check: wind extrapolated", {"check", DEMO}, 0, "the power-law wind is extrapolated"},
    {"dispersion: wind extrapolated", {"dispersion", DEMO, "-n", "200"}, -1, "The power-law wind is extrapolated"},
};

static char *run_args(const char *const *args, int *rc, char **err)
{
    char *argv[32];
    int argc = 0;
    argv[argc++] = "sinkrate";
    for (size_t k = 0; args[k]; k++) {
        if (strcmp(args[k], DEMO) == 0)
            argv[argc++] = (char *)sr_test_path(DEMO);
        else
            argv[argc++] = (char *)args[k];
    }
    argv[argc] = NULL;
    char *out;
    *rc = sr_test_cli_argv(&out, err, argc, argv);
    return out;
}

static void test_command_warnings(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof WARN / sizeof WARN[0]; i++) {
        const cli_case *c = &WARN[i];
        int rc;
        char *err;
        char *out = run_args(c->args, &rc, &err);
        int ok = (rc == c->rc || (c->rc < 0 && (rc == 0 || rc == 1))) &&
                 (c->phrase ? has(out, c->phrase)
                            : !has(out, "is the unit right") && !has(out, "check the units") && !has(out, "Mach 0.3"));
        if (!ok)
            fail_msg("%s: rc %d (want %d), want '%s'\nstdout:\n%s\nstderr:\n%s", c->what, rc, c->rc,
                     c->phrase ? c->phrase : "(none)", out, err);
        free(out);
        free(err);
    }
}

/* A mission file with a slip: 0.35 kg under a 7 m canopy (cm written as m). */
static const char SLIP[] = "# invented demo: a unit slip\n"
                           "mission: slip\n"
                           "sections:\n"
                           "  - {name: probe, mass: 0.35 kg}\n"
                           "stages:\n"
                           "  - {name: main, family: conical, nominal-diameter: 7 m}\n"
                           "start: {height: 300 m, speed: 10 m/s, path-angle: 0 deg}\n";
/* Two sections of 6 t: the total is over 10 t. */
static const char HEAVY[] = "# invented demo: a heavy drop\n"
                            "mission: heavy\n"
                            "sections:\n"
                            "  - {name: crate, mass: 6000 kg}\n"
                            "  - {name: frame, mass: 6000 kg}\n"
                            "stages:\n"
                            "  - {name: main, family: ringsail, nominal-diameter: 35 m, count: 8}\n"
                            "start: {height: 1000 m, speed: 60 m/s, path-angle: 0 deg}\n";

static void test_mission_warnings(void **state)
{
    (void)state;
    const char *slip = sr_test_tmpfile(".yaml", SLIP);
    const char *heavy = sr_test_tmpfile(".yaml", HEAVY);
    const char *want_slip = "teady descent at the ground (typical): 0.42 m/s is under 1 m/s";
    const char *want_heavy = "otal mass: 12000 kg is over 10000 kg";
    /* every command that reads the mission warns alike (one gatherer) */
    const char *cmds[][6] = {{"check", "@"}, {"profile", "@"}, {"dispersion", "@", "-n", "100"},
                             {"loads", "--mission", "@"}};
    const char *files[2] = {slip, heavy};
    const char *want[2] = {want_slip, want_heavy};
    for (size_t f = 0; f < 2; f++) {
        for (size_t k = 0; k < sizeof cmds / sizeof cmds[0]; k++) {
            const char *args[8];
            size_t n = 0;
            for (size_t j = 0; j < 6 && cmds[k][j]; j++)
                args[n++] = strcmp(cmds[k][j], "@") == 0 ? files[f] : cmds[k][j];
            args[n] = NULL;
            int rc;
            char *err;
            char *out = run_args(args, &rc, &err);
            if (!has(out, want[f]))
                fail_msg("%s on %s: rc %d, want '%s'\nstdout:\n%s\nstderr:\n%s", cmds[k][0], f ? "HEAVY" : "SLIP", rc,
                         want[f], out, err);
            free(out);
            free(err);
        }
    }
}

/* A power-law wind with a gradient height: held there, no warning. */
static void test_gradient_height_file(void **state)
{
    (void)state;
    static const char BASE[] = "# invented demo\n"
                               "mission: windy\n"
                               "site:\n"
                               "  wind: {model: power-law, speed: 10 m/s, from: 270 deg, exponent: 0.3%s}\n"
                               "sections:\n"
                               "  - {name: probe, mass: 2 kg}\n"
                               "stages:\n"
                               "  - {name: main, family: conical, nominal-diameter: 1.5 m}\n"
                               "start: {height: 3000 m, speed: 10 m/s, path-angle: 0 deg}\n";
    char text[2][1024];
    snprintf(text[0], sizeof text[0], BASE, "");
    snprintf(text[1], sizeof text[1], BASE, ", gradient-height: 300 m");
    double drift[2];
    for (int k = 0; k < 2; k++) {
        const char *path = sr_test_tmpfile(".yaml", text[k]);
        char *out, *err;
        int rc = sr_test_cli(&out, &err, "profile", path, NULL);
        assert_true(rc == 0 || rc == 1);
        assert_int_equal(has(out, "is extrapolated from its reference height (10 m) to 3000 m"), k == 0);
        assert_int_equal(has(out, "held constant above 300 m (gradient height)"), k == 1);
        const char *d = strstr(out, "farthest landing point from launch");
        assert_non_null(d);
        d += strlen("farthest landing point from launch");
        drift[k] = strtod(d + strspn(d, " "), NULL);
        free(out);
        free(err);
    }
    /* held at 10 (300/10)^0.3 = 27.7 m/s instead of up to 55 m/s: less drift */
    assert_true(drift[1] < drift[0]);
}

/* ---- --units us ---- */

static void test_units_us(void **state)
{
    (void)state;
    char *out, *err;
    /* the case of the issue: refused, one line, naming the option */
    int rc = sr_test_cli(&out, &err, "rate", "--mass", "2.65 lb", "--flat-diameter", "36", "--family",
                         "flat-circular", "--units", "us", NULL);
    assert_int_equal(rc, 2);
    assert_string_equal(out, "");
    assert_int_equal(sr_test_lines(err), 1);
    assert_non_null(strstr(err, "sinkrate rate: --flat-diameter: give a unit, e.g. 36in"));
    free(out);
    free(err);
    /* with units it runs, and says it in US units */
    rc = sr_test_cli(&out, &err, "rate", "--mass", "2.65 lb", "--flat-diameter", "36in", "--family", "flat-circular",
                     "--units", "us", NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "[ft/s]"));
    free(out);
    free(err);
    /* --units after the option counts the same */
    rc = sr_test_cli(&out, &err, "rate", "--units", "us", "--mass", "2.65", "--flat-diameter", "36in", "--family",
                     "flat-circular", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "--mass: give a unit, e.g. 2.65lb"));
    free(out);
    free(err);
    /* a bare zero is zero in every unit; angles and plain numbers need none */
    rc = sr_test_cli(&out, &err, "air", "--from", "0", "--to", "3000 ft", "--step", "1000 ft", "--units", "us", NULL);
    assert_int_equal(rc, 0);
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "loads", "--mass", "11 lb", "--speed", "90 ft/s", "--family", "conical",
                     "--nominal-diameter", "59 in", "--path-angle", "30", "--cluster-factor", "0.95", "--units", "us",
                     NULL);
    assert_int_equal(rc, 0);
    free(out);
    free(err);
    /* without --units us a bare number is SI, as before */
    rc = sr_test_cli(&out, &err, "rate", "--mass", "2.65", "--flat-diameter", "0.9", "--family", "flat-circular",
                     NULL);
    assert_int_equal(rc, 0);
    free(out);
    free(err);
}

/* ---- size and sweep --vary speed agree on impossible targets ---- */

static void test_size_sweep_agree(void **state)
{
    (void)state;
    static const struct {
        const char *what;
        const char *speed;
        const char *extra[3];
    } C[] = {
        {"a target no canopy reaches", "0.01 m/s", {NULL}},
        {"a payload whose own drag suffices", "10 m/s", {"--body-drag-area", "10 m2", NULL}},
        {"a canopy heavier than its drag", "1 m/s", {"--areal-mass", "1.5 kg/m2", NULL}},
    };
    for (size_t i = 0; i < sizeof C / sizeof C[0]; i++) {
        char *argv_s[16], *argv_w[20];
        int ns = 0, nw = 0;
        const char *base_s[] = {"sinkrate", "size", "--mass", "2 kg", "--family", "conical", "--speed", C[i].speed};
        const char *base_w[] = {"sinkrate", "sweep", "--mass", "2 kg", "--family", "conical", "--vary", "speed",
                                "--values", C[i].speed};
        for (size_t k = 0; k < sizeof base_s / sizeof *base_s; k++)
            argv_s[ns++] = (char *)base_s[k];
        for (size_t k = 0; k < sizeof base_w / sizeof *base_w; k++)
            argv_w[nw++] = (char *)base_w[k];
        for (size_t k = 0; C[i].extra[k]; k++) {
            argv_s[ns++] = (char *)C[i].extra[k];
            argv_w[nw++] = (char *)C[i].extra[k];
        }
        argv_s[ns] = argv_w[nw] = NULL;
        char *o1, *e1, *o2, *e2;
        int r1 = sr_test_cli_argv(&o1, &e1, ns, argv_s);
        int r2 = sr_test_cli_argv(&o2, &e2, nw, argv_w);
        const char *m1 = strstr(e1, ": "), *m2 = strstr(e2, ": ");
        if (r1 != 1 || r2 != 1 || !m1 || !m2 || strcmp(m1, m2) != 0 || o1[0] || o2[0])
            fail_msg("%s: size rc %d '%s', sweep rc %d '%s'", C[i].what, r1, e1, r2, e2);
        free(o1);
        free(e1);
        free(o2);
        free(e2);
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_rules),          cmocka_unit_test(test_mach_judge),
        cmocka_unit_test(test_command_warnings), cmocka_unit_test(test_mission_warnings),
        cmocka_unit_test(test_gradient_height_file), cmocka_unit_test(test_units_us),
        cmocka_unit_test(test_size_sweep_agree),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
