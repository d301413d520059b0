/* test_mission.c - the mission-file schema: every required key missing in
 * turn, wrong and missing units, unknown keys, events out of order, a
 * deployment above the start, bad wind blocks and section structure: each one
 * clear error at file:line:column and exit 2 from `sinkrate profile`. */
#include "testutil.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "files/catalog.h"
#include "files/mission.h"

#define PI 3.14159265358979323846

/* A complete mission; each case replaces one line (or inserts after it). */
static const char BASE[] = "mission: schema check\n"                        /* 1 */
                           "site:\n"                                        /* 2 */
                           "  elevation: 100 m\n"                           /* 3 */
                           "  wind:\n"                                      /* 4 */
                           "    model: power-law\n"                         /* 5 */
                           "    speed: 5 m/s\n"                             /* 6 */
                           "    from: 250 deg\n"                            /* 7 */
                           "sections:\n"                                    /* 8 */
                           "  - name: booster\n"                            /* 9 */
                           "    mass: 3 kg\n"                               /* 10 */
                           "  - name: payload\n"                            /* 11 */
                           "    mass: 2 kg\n"                               /* 12 */
                           "stages:\n"                                      /* 13 */
                           "  - name: drogue\n"                             /* 14 */
                           "    family: cross\n"                            /* 15 */
                           "    nominal-diameter: 0.6 m\n"                  /* 16 */
                           "    deploy: apogee\n"                           /* 17 */
                           "  - name: main\n"                               /* 18 */
                           "    family: conical\n"                          /* 19 */
                           "    nominal-diameter: 2 m\n"                    /* 20 */
                           "    deploy:\n"                                  /* 21 */
                           "      height: 300 m\n"                          /* 22 */
                           "start:\n"                                       /* 23 */
                           "  height: 1500 m\n"                             /* 24 */
                           "  speed: 10 m/s\n"                              /* 25 */
                           "limits:\n"                                      /* 26 */
                           "  touchdown-speed: 6 m/s\n";                    /* 27 */

typedef struct edit {
    int line;          /* 1-based line of BASE */
    const char *text;  /* replacement ("" deletes the line) */
    int insert;        /* 1: insert text after the line instead of replacing it */
    int to;            /* > 0: delete lines line..to */
} edit;

typedef struct bad_case {
    const char *what;
    edit e[3];
    const char *where; /* ":line:col:" expected in the message */
    const char *says;  /* a phrase of the message */
} bad_case;

#define REP(l, t) {l, t, 0, 0}
#define INS(l, t) {l, t, 1, 0}
#define DEL(l, m) {l, "", 0, m}

static const bad_case BAD[] = {
    /* every required key missing in turn */
    {"no mission name", {REP(1, "")}, ":1:1:", "missing the required key 'mission'"},
    {"no sections", {DEL(8, 12)}, ":1:1:", "missing the required key 'sections'"},
    {"no stages", {DEL(13, 22)}, ":1:1:", "missing the required key 'stages'"},
    {"section without a name", {REP(9, "  - mass: 3 kg"), REP(10, "")}, ":9:5:", "missing the required key 'name'"},
    {"section without a mass", {REP(10, "")}, ":9:5:", "missing the required key 'mass'"},
    {"stage without a name", {REP(14, "  - family: cross"), REP(15, "")}, ":14:5:", "missing the required key 'name'"},
    {"stage without a family", {REP(15, "")}, ":14:5:", "needs a 'family'"},
    {"later stage without an event", {REP(21, ""), REP(22, "")}, ":18:5:", "needs a deploy event"},
    {"start without a height", {REP(24, "")}, ":24:3:", "missing the required key 'height'"},
    {"wind without a speed", {REP(6, "")}, ":5:5:", "missing the required key 'speed'"},
    {"wind without a direction", {REP(7, "")}, ":5:5:", "missing the required key 'from'"},
    {"log law without a roughness", {REP(5, "    model: log-law")}, ":5:5:", "needs roughness-length"},
    /* wrong units and missing units */
    {"mass in metres", {REP(10, "    mass: 3 m")}, ":10:11:", "mass"},
    {"mass without a unit", {REP(10, "    mass: 3")}, ":10:11:", "unit"},
    {"start height in kilograms", {REP(24, "  height: 1500 kg")}, ":24:11:", "length"},
    {"wind speed in metres", {REP(6, "    speed: 5 m")}, ":6:12:", "speed"},
    {"wind direction in m/s", {REP(7, "    from: 250 m/s")}, ":7:11:", "angle"},
    {"deployment height in seconds", {REP(22, "      height: 300 s")}, ":22:15:", "length"},
    {"limit in the wrong unit", {REP(27, "  touchdown-speed: 6 J")}, ":27:20:", "speed"},
    /* unknown keys, with a suggestion */
    {"misspelt top-level key", {REP(26, "limts:")}, ":26:1:", "did you mean 'limits'"},
    {"misspelt stage key", {REP(17, "    deplyo: apogee")}, ":17:5:", "did you mean 'deploy'"},
    {"misspelt wind key", {REP(7, "    form: 250 deg")}, ":7:5:", "did you mean 'from'"},
    {"misspelt section key", {REP(10, "    mas: 3 kg")}, ":10:5:", "did you mean 'mass'"},
    {"key of another wind model", {INS(7, "    roughness-length: 0.1 m")}, ":8:5:", "does not belong to the power-law"},
    {"unknown wind model", {REP(5, "    model: power")}, ":5:12:", "unknown wind model 'power' (constant, power-law"},
    /* events out of order */
    {"main above the drogue", {REP(17, "    deploy: {height: 200 m}")}, ":22:15:", "not below the earlier stage 'drogue'"},
    {"main above the start", {REP(22, "      height: 1600 m")}, ":22:15:", "not below the start"},
    {"apogee after a height event",
     {REP(17, "    deploy: {height: 800 m}"), REP(22, ""), REP(21, "    deploy: apogee")},
     ":21:13:",
     "list the apogee stages first"},
    /* structure */
    {"carries an unknown section", {INS(22, "    carries: [payload bay]")}, ":23:15:", "no section is named 'payload bay'"},
    {"rigid with an unknown section", {INS(12, "    rigid-with: nose")}, ":13:17:", "not one"},
    {"sections listed twice", {INS(22, "    carries: [payload, payload]")}, ":23:24:", "listed twice"},
    {"bad previous", {INS(22, "    previous: drop")}, ":23:15:", "previous must be 'keep'"},
    {"negative line stretch", {INS(22, "    line-stretch: -1 s")}, ":23:19:", "line-stretch"},
    {"impossible wind exponent", {INS(7, "    exponent: 3")}, ":8:15:", "exponent"},
    {"start above the wind table",
     {REP(5, "    rows: [{height: 0 m, speed: 2 m/s, from: 200 deg}, {height: 1000 m, speed: 9 m/s, from: 260 deg}]"),
      REP(6, ""),
      REP(7, "")},
     ":22:11:",
     "above the top of the wind table"},
    {"carries sections already apart",
     {INS(20, "    carries: [booster]"),
      INS(22, "  - {name: extra, family: conical, nominal-diameter: 1 m, carries: [booster, payload], deploy: {height: 100 m}}")},
     ":24:68:",
     "already come apart"},
    {"rigid pair landing apart", {INS(12, "    rigid-with: booster"), INS(20, "    carries: [booster]")}, ":13:17:",
     "the stages let them land apart"},
    {"misspelt wind model", {REP(5, "    model: powr-law")}, ":5:12:", "did you mean 'power-law'"},
};

static char *apply(const bad_case *c)
{
    /* split BASE into lines, apply the edits, join */
    char *lines[64];
    int n = 0;
    char *copy = strdup(BASE), *save = NULL;
    for (char *l = strtok_r(copy, "\n", &save); l && n < 64; l = strtok_r(NULL, "\n", &save))
        lines[n++] = l;
    size_t cap = strlen(BASE) + 1024;
    char *out = malloc(cap);
    out[0] = '\0';
    for (int i = 0; i < n; i++) {
        const char *text = lines[i];
        const char *after = NULL;
        for (int k = 0; k < 3; k++) {
            if (c->e[k].to > 0 && i + 1 >= c->e[k].line && i + 1 <= c->e[k].to)
                text = "";
            if (c->e[k].line != i + 1 || !c->e[k].text || c->e[k].to > 0)
                continue;
            if (c->e[k].insert)
                after = c->e[k].text;
            else
                text = c->e[k].text;
        }
        if (text[0]) {
            strcat(out, text);
            strcat(out, "\n");
        }
        if (after) {
            strcat(out, after);
            strcat(out, "\n");
        }
    }
    free(copy);
    return out;
}

static void test_base_is_valid(void **state)
{
    (void)state;
    char *out, *err;
    const char *p = sr_test_tmpfile(".yaml", BASE);
    int rc = sr_test_cli(&out, &err, "profile", p, NULL);
    if (rc != 0)
        fail_msg("base mission: exit %d: %s", rc, err);
    free(out);
    free(err);
}

static void test_each_bad_case(void **state)
{
    (void)state;
    int bad = 0;
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        const bad_case *c = &BAD[i];
        char *yaml = apply(c);
        const char *p = sr_test_tmpfile(".yaml", yaml);
        char *out, *err;
        int rc = sr_test_cli(&out, &err, "profile", p, NULL);
        char want[600];
        snprintf(want, sizeof want, "%s%s", p, c->where);
        if (rc != 2 || !strstr(err, want) || !strstr(err, c->says) || sr_test_lines(err) != 1) {
            print_error("case '%s': exit %d, message '%s' (wanted exit 2, one line with '%s' and '%s')\n", c->what, rc,
                        err, c->where, c->says);
            bad++;
        }
        /* nothing on standard output for bad input */
        assert_int_equal(strlen(out), 0);
        if (getenv("SR_SHOW"))
            fprintf(stderr, "%-30s %s", c->what, err);
        /* `sinkrate check` refuses it too */
        free(out);
        free(err);
        rc = sr_test_cli(&out, &err, "check", p, NULL);
        assert_int_equal(rc, 2);
        assert_non_null(strstr(err, p));
        free(out);
        free(err);
        free(yaml);
    }
    assert_int_equal(bad, 0);
}

static void test_no_start(void **state)
{
    (void)state;
    bad_case c = {"no start", {DEL(23, 25)}, "", ""};
    char *yaml = apply(&c);
    const char *p = sr_test_tmpfile(".yaml", yaml);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "profile", p, NULL), 2);
    assert_non_null(strstr(err, "no start: block"));
    free(out);
    free(err);
    /* but the file itself is valid: size and check do not need a start */
    assert_int_equal(sr_test_cli(&out, &err, "check", p, NULL), 0);
    free(out);
    free(err);
    free(yaml);
}

static void test_values_read(void **state)
{
    (void)state;
    const char *yaml = "mission: values\n"
                       "site:\n"
                       "  elevation: 1000 ft\n"
                       "  wind:\n"
                       "    rows:\n"
                       "      - {altitude: 1000 ft, speed: 10 kn, from: 270 deg}\n"
                       "      - {height: 500 m, speed: 20 kn, from: 300 deg}\n"
                       "sections:\n"
                       "  - {name: a, mass: 3 lb, drag-area: 0.1 ft2}\n"
                       "  - {name: b, mass: 500 g, rigid-with: a}\n"
                       "stages:\n"
                       "  - {name: drogue, family: cross, nominal-diameter: 24 in}\n"
                       "  - {name: main, family: conical, nominal-diameter: 6 ft, carries: [a, b], previous: release,\n"
                       "     line-stretch: 300 ms, deploy: {delay: 2 s}}\n"
                       "start: {height: 1500 ft, speed: 20 ft/s, path-angle: 10 deg, heading: 45 deg, east: -30 m,\n"
                       "        north: 12 m}\n"
                       "limits: {touchdown-speed: 20 ft/s, landing-energy: 75 ft-lbf, descent-time: 2 min, drift: 0.5 km,\n"
                       "         deployment-pressure: 1 kPa}\n";
    sr_mission *m = sr_test_mission_text(yaml);
    const char *src = "NIST SP 811 (2008) App. B exact conversion factors";
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "site elevation 1000 ft", src, 304.8, m->ground, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "section mass 3 lb", src, 3 * 0.45359237, m->sections[0].mass, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "section drag area 0.1 ft2", src, 0.1 * 0.3048 * 0.3048,
                    m->sections[0].drag_area, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "start height 1500 ft", src, 1500 * 0.3048, m->start_height, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "touchdown limit 20 ft/s", src, 20 * 0.3048, m->limit_speed, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "energy limit 75 ft-lbf", src, 75 * 0.3048 * 0.45359237 * 9.80665,
                    m->limit_energy, 1e-12);
    assert_int_equal(m->sections[1].rigid_with, 0);
    assert_int_equal(m->stages[1].carries, 3u);
    assert_int_equal(m->stages[1].keep_previous, 0);
    assert_true(fabs(m->stages[1].line_stretch - 0.3) < 1e-12);
    assert_int_equal(m->stages[1].deploy, SR_DEPLOY_DELAY);
    assert_true(fabs(m->start_heading - PI / 4) < 1e-12);
    assert_true(m->start_east == -30.0 && m->start_north == 12.0);
    assert_true(m->limit_deploy_q == 1000.0);
    /* the table row given as an altitude is at the ground */
    assert_int_equal(m->wind.kind, SR_WIND_TABLE);
    assert_true(fabs(m->wind.h[0]) < 1e-9 && fabs(m->wind.h[1] - 500.0) < 1e-9);
    double east, north;
    sr_wind_at(&m->wind, 0.0, &east, &north);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "10 kn from the west at the ground",
                    "NIST SP 811 (2008): 1 kn = 1852/3600 m/s; WMO direction convention", 10 * 1852.0 / 3600.0, east,
                    1e-12);
    sr_mission_free(m);
}

/* What looks like nesting inside a string or a comment is text; anchors
 * and aliases used sparingly work; a folded note reads as one line. */
static void test_text_is_text(void **state)
{
    (void)state;
    const char *yaml = "mission: brackets\n"
                       "description: \"[[[[[[[[[[[[[[[[[[[[ {{{{{{{{{{{{{{{{{{{{\"\n"
                       "# [[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[[\n"
                       "site: {elevation: 100 m}   # {{{{{{{{{{{{{{{{{{{{{{{{{\n"
                       "sections:\n"
                       "  - {name: 'a [[[[[[[[[[[[[[[[[[', mass: &m 2 kg}\n"
                       "  - {name: b, mass: *m}\n"
                       "stages:\n"
                       "  - {name: main, family: conical, nominal-diameter: 1.5 m}\n";
    sr_mission *m = sr_test_mission_text(yaml);
    assert_string_equal(m->sections[0].name, "a [[[[[[[[[[[[[[[[[[");
    assert_true(m->sections[1].mass == 2.0);
    sr_mission_free(m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_base_is_valid),
        cmocka_unit_test(test_each_bad_case),
        cmocka_unit_test(test_no_start),
        cmocka_unit_test(test_values_read),
        cmocka_unit_test(test_text_is_text),
    };
    return cmocka_run_group_tests_name("mission", tests, NULL, NULL);
}
