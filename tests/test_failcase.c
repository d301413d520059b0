/* test_failcase.c - failure cases of a mission: bodies falling with no canopy
 * open and a Reynolds-dependent drag, against the bluff module's root finder
 * and the closed form of a constant-Cd fall; the failure-cases: and body:
 * schema (exit 2, one line at file:line:column); the demo's failure cases in
 * `sinkrate profile`, which never change the exit code. */
#include "testutil.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <gsl/gsl_integration.h>

#include "analysis/failcase.h"
#include "analysis/judge.h"
#include "physics/atmos.h"
#include "physics/bluff.h"
#include "files/catalog.h"
#include "files/mission.h"
#include "physics/profile.h"
#include "files/dragtable.h"

#define PI 3.14159265358979323846
#define G0 9.80665
#define RHO 1.225

#define SRC_ROOT "bluff module: every root of 1/2 rho v^2 Cd(Re) A = m g by scan and GSL Brent (tests/test_bluff.c)"
#define SRC_FALL                                                                                                     \
    "closed form of a fall from rest with constant Cd in uniform air: v = vt sqrt(1 - exp(-2 g H/vt^2)), t = (vt/g) " \
    "acosh(exp(g H/vt^2)), vt^2 = 2 m g/(rho Cd A) (derived; g at mid-height of the 1976 standard's g(z))"
#define SRC_DISK "drag balance with the disk curve's Cd 1.16 above Re 5e4 (docs/method.md 9: Roos & Willmarth 1971 at 5e4, held above)"

static int setup(void **state)
{
    (void)state;
    gsl_set_error_handler_off();
    (void)sr_test_catalog();
    return 0;
}

/* The context of a failure case: the stages in `failed` do not deploy. */
static sr_profile_ctx *ctx_failed(const sr_mission *m, unsigned failed, double rho)
{
    sr_profile_opts o;
    sr_profile_opts_init(&o);
    o.failed = failed;
    o.uniform_density = rho;
    sr_profile_ctx *c;
    sr_error e;
    if (sr_mission_profile(&c, m, &o, &e))
        fail_msg("context: %s", e.msg);
    return c;
}

/* A single section dropped from rest; its canopy never opens. */
static void drop_mission(char *buf, size_t len, const char *site, double height, const char *mass, const char *body)
{
    snprintf(buf, len,
             "mission: drop check\n"
             "site: %s\n"
             "sections:\n"
             "  - {name: box, mass: %s, body: %s}\n"
             "stages:\n"
             "  - {name: main, family: conical, nominal-diameter: 2 m}\n"
             "start: {height: %g m, speed: 0 m/s, path-angle: 90 deg}\n"
             "failure-cases: [no-canopy]\n",
             site, mass, body, height);
}

/* ---- terminal speed at the ground against the bluff module ---- */

typedef struct term_case {
    const char *what;
    const char *body;     /* the mission's body: */
    const char *mass;
    double kg;
    sr_bluff_shape shape;
    sr_bluff_curve_id curve;
    double d, len;
} term_case;

static void test_terminal_speed(void **state)
{
    (void)state;
    const term_case cases[] = {
        {"sphere 0.1 m, 50 g (Clift-Grace-Weber)", "{shape: sphere, diameter: 10 cm}", "50 g", 0.05, SR_BLUFF_SPHERE,
         SR_CURVE_SPHERE_CGW, 0.1, 0},
        {"sphere 0.1 m, 50 g (Morrison)", "{shape: sphere, diameter: 10 cm, curve: sphere-morrison}", "50 g", 0.05,
         SR_BLUFF_SPHERE, SR_CURVE_SPHERE_MORRISON, 0.1, 0},
        {"cylinder broadside 0.08 m x 0.4 m, 1 kg", "{shape: cylinder, diameter: 8 cm, length: 40 cm}", "1 kg", 1.0,
         SR_BLUFF_CYLINDER, SR_CURVE_CYL_COMPOSITE, 0.08, 0.4},
        {"disk 0.3 m, 0.5 kg", "{shape: disk, diameter: 30 cm}", "0.5 kg", 0.5, SR_BLUFF_DISK, SR_CURVE_DISK, 0.3, 0},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        const term_case *k = &cases[i];
        char yaml[1024];
        /* 2000 m in the standard atmosphere: the speed follows the equilibrium long before the ground */
        drop_mission(yaml, sizeof yaml, "{elevation: 0 m}", 2000.0, k->mass, k->body);
        sr_mission *m = sr_test_mission_text(yaml);
        assert_int_equal(m->nfailures, 1);
        sr_profile_ctx *c = ctx_failed(m, m->failures[0].failed, NAN);
        const sr_profile_result *r = sr_profile_nominal(c);
        sr_error e;
        sr_air air;
        assert_int_equal(sr_atmos_at(&m->atmos, m->ground, &air, &e), SR_OK);
        sr_bluff_curve cv;
        sr_bluff_body b;
        sr_bluff_equilibria q;
        assert_int_equal(sr_bluff_curve_init(&cv, k->curve, &e), SR_OK);
        assert_int_equal(sr_bluff_body_init(&b, k->shape, &cv, k->d, k->len, k->kg, NAN, &e), SR_OK);
        assert_int_equal(sr_bluff_equilibria_find(&b, &air, &q, &e), SR_OK);
        assert_int_equal(q.n, 1);
        assert_true(r->body[0].free_fall);
        assert_int_equal(r->body[0].equilibria, 1);
        assert_int_equal(r->body[0].canopies, 0);
        char what[256];
        snprintf(what, sizeof what,
                 "%s from 2000 m, no canopy: impact speed = terminal speed at the ground (0.5%%: the lag behind the "
                 "equilibrium as the air thickens)",
                 k->what);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, what, SRC_ROOT, q.root[0].v, r->body[0].rate_land, 5e-3);
        snprintf(what, sizeof what, "%s: the profile's own equilibrium at the ground", k->what);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, what, SRC_ROOT, q.root[0].v, r->body[0].v_terminal, 1e-9);
        CHECK_REL_CLASS(SR_CHECK_METHOD, "kinetic energy of the section at impact",
                        "definition of kinetic energy 1/2 m v^2",
                        0.5 * k->kg * r->body[0].rate_land * r->body[0].rate_land, r->section_energy[0], 1e-12);
        /* the fast mode integrates a free fall the same way (no tables for it) */
        sr_profile_result f;
        assert_int_equal(sr_profile_run(c, NULL, SR_PROFILE_FAST, NULL, &f, NULL, &e), SR_OK);
        assert_true(fabs(f.body[0].rate_land - r->body[0].rate_land) <= 1e-9 * r->body[0].rate_land);
        assert_true(fabs(f.descent_time - r->descent_time) <= 1e-9 * r->descent_time);
        sr_bluff_curve_free(&cv);
        sr_profile_ctx_free(c);
        sr_mission_free(m);
    }
}

/* ---- constant Cd: the closed form ---- */

static void test_constant_cd_closed_form(void **state)
{
    (void)state;
    /* a 0.3 m, 5 kg disk from 200 m: about 99% of its terminal speed at the ground */
    const double H = 200.0, mass = 5.0, d = 0.3, w = 4.0;
    char yaml[1024];
    drop_mission(yaml, sizeof yaml, "{elevation: 0 m, wind: {speed: 4 m/s, from: 270 deg}}", H, "5 kg",
                 "{shape: disk, diameter: 30 cm}");
    sr_mission *m = sr_test_mission_text(yaml);
    sr_profile_ctx *c = ctx_failed(m, 1u, RHO);
    const sr_profile_result *r = sr_profile_nominal(c);
    double g = G0 * pow(SR_ATMOS_R0 / (SR_ATMOS_R0 + H / 2), 2);
    double A = PI * d * d / 4, vt = sqrt(2 * mass * g / (RHO * 1.16 * A));
    double v = vt * sqrt(1 - exp(-2 * g * H / (vt * vt))), t = vt / g * acosh(exp(g * H / (vt * vt)));
    CHECK_REL_CLASS(SR_CHECK_METHOD, "disk, uniform air: impact speed after a 200 m fall from rest", SRC_FALL, v,
                    r->body[0].rate_land, 1e-5);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "disk, uniform air: time to the ground from rest", SRC_FALL, t, r->body[0].t_land,
                    1e-5);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "disk, uniform air: terminal speed at the ground", SRC_DISK,
                    sqrt(2 * mass * G0 / (RHO * 1.16 * A)), r->body[0].v_terminal, 1e-6);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "a fall from rest in a constant wind drifts w t",
                    "kinematics: no airspeed across the wind (derived)", w * r->body[0].t_land, r->body[0].east, 1e-9);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}

/* ---- the drag crisis: several equilibria, the fastest one is reported ---- */

static void test_drag_crisis(void **state)
{
    (void)state;
    char yaml[1024];
    /* the 0.2 m, 0.5 kg sphere that has three equilibria at sea level (tests/test_bluff.c) */
    drop_mission(yaml, sizeof yaml, "{elevation: 0 m}", 600.0, "0.5 kg", "{shape: sphere, diameter: 20 cm}");
    sr_mission *m = sr_test_mission_text(yaml);
    sr_profile_ctx *c = ctx_failed(m, 1u, NAN);
    const sr_profile_result *r = sr_profile_nominal(c);
    sr_error e;
    sr_air air;
    assert_int_equal(sr_atmos_at(&m->atmos, 0.0, &air, &e), SR_OK);
    sr_bluff_curve cv;
    sr_bluff_body b;
    sr_bluff_equilibria q;
    assert_int_equal(sr_bluff_curve_init(&cv, SR_CURVE_SPHERE_CGW, &e), SR_OK);
    assert_int_equal(sr_bluff_body_init(&b, SR_BLUFF_SPHERE, &cv, 0.2, 0, 0.5, NAN, &e), SR_OK);
    assert_int_equal(sr_bluff_equilibria_find(&b, &air, &q, &e), SR_OK);
    assert_int_equal(q.n, 3);
    assert_int_equal(r->body[0].equilibria, 3);
    /* from rest it settles on the slow branch; the report takes the fast one */
    assert_true(r->body[0].speed_arrive < q.root[1].v);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY,
                    "sphere in the drag crisis: the integration arrives on the slowest equilibrium", SRC_ROOT,
                    q.root[0].v, r->body[0].speed_arrive, 1e-2);
    assert_true(r->body[0].crisis);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY,
                    "sphere in the drag crisis: impact speed is the fastest stable equilibrium (conservative)",
                    SRC_ROOT, q.root[2].v, r->body[0].rate_land, 1e-9);
    sr_bluff_curve_free(&cv);
    sr_profile_ctx_free(c);
    sr_mission_free(m);

    /* the command says so in a warning, and the what-if result leaves the exit code alone */
    snprintf(yaml, sizeof yaml,
             "mission: crisis\n"
             "sections:\n  - {name: ball, mass: 0.5 kg, body: {shape: sphere, diameter: 20 cm}}\n"
             "stages:\n  - {name: main, family: conical, nominal-diameter: 1.5 m}\n"
             "start: {height: 600 m, speed: 0 m/s, path-angle: 90 deg}\n"
             "limits: {touchdown-speed: 6 m/s, landing-energy: 75 ft-lbf}\n"
             "failure-cases: [no-canopy]\n");
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", "--format", "json", sr_test_tmpfile(".yaml", yaml), NULL);
    assert_int_equal(rc, 0);
    assert_string_equal(err, "");
    assert_non_null(strstr(out, "3 equilibrium speeds at the ground (drag crisis)"));
    assert_non_null(strstr(out, "fastest stable one"));
    assert_non_null(strstr(out, "FAR BEYOND the limits"));
    free(out);
    free(err);
}

/* ---- the schema ---- */

static const char BASE[] = "mission: schema check\n"                                           /* 1 */
                           "sections:\n"                                                       /* 2 */
                           "  - name: booster\n"                                               /* 3 */
                           "    mass: 3 kg\n"                                                  /* 4 */
                           "    body: {shape: cylinder, diameter: 10 cm, length: 80 cm}\n"     /* 5 */
                           "  - name: payload\n"                                               /* 6 */
                           "    mass: 2 kg\n"                                                  /* 7 */
                           "stages:\n"                                                         /* 8 */
                           "  - {name: drogue, family: cross, nominal-diameter: 0.6 m}\n"      /* 9 */
                           "  - name: main\n"                                                  /* 10 */
                           "    family: conical\n"                                             /* 11 */
                           "    nominal-diameter: 2 m\n"                                       /* 12 */
                           "    deploy: {height: 300 m}\n"                                     /* 13 */
                           "start: {height: 1500 m, speed: 10 m/s}\n"                          /* 14 */
                           "failure-cases:\n"                                                  /* 15 */
                           "  - no-canopy\n"                                                   /* 16 */
                           "  - {only: drogue}\n";                                             /* 17 */

typedef struct bad_case {
    const char *what;
    int line, to;      /* lines of BASE replaced (to 0: one line) */
    const char *text;
    const char *where; /* ":line:col:" expected */
    const char *says;
} bad_case;

static const bad_case BAD[] = {
    {"both drag-area and body", 4, 0, "    mass: 3 kg\n    drag-area: 0.01 m2", ":6:5:", "not both"},
    {"unknown shape", 5, 0, "    body: {shape: cone, diameter: 10 cm}", ":5:19:", "shape must be sphere, cylinder"},
    {"misspelt shape", 5, 0, "    body: {shape: spher, diameter: 10 cm}", ":5:19:", "did you mean 'sphere'"},
    {"body without a diameter", 5, 0, "    body: {shape: sphere}", ":5:11:", "missing the required key 'diameter'"},
    {"diameter without a unit", 5, 0, "    body: {shape: sphere, diameter: 10}", ":5:37:", "unit"},
    {"diameter as a mass", 5, 0, "    body: {shape: sphere, diameter: 10 kg}", ":5:37:", "length"},
    {"negative diameter", 5, 0, "    body: {shape: sphere, diameter: -1 cm}", ":5:37:", "diameter must be above 0"},
    {"cylinder without a length", 5, 0, "    body: {shape: cylinder, diameter: 10 cm}", ":5:11:", "needs length"},
    {"length on a sphere", 5, 0, "    body: {shape: sphere, diameter: 10 cm, length: 1 m}", ":5:52:",
     "only a cylinder"},
    {"area on a shape", 5, 0, "    body: {shape: disk, diameter: 10 cm, area: 0.1 m2}", ":5:48:", "goes with cd-table"},
    {"curve of another shape", 5, 0, "    body: {shape: sphere, diameter: 10 cm, curve: cylinder}", ":5:11:",
     "is for a cylinder, not a sphere"},
    {"unknown curve", 5, 0, "    body: {shape: sphere, diameter: 10 cm, curve: sphere-x}", ":5:51:",
     "unknown drag curve 'sphere-x'"},
    {"shape and table", 5, 0, "    body: {shape: sphere, cd-table: x.csv, diameter: 10 cm}", ":5:37:", "not both"},
    {"neither shape nor table", 5, 0, "    body: {diameter: 10 cm}", ":5:11:", "needs shape:"},
    {"missing table file", 5, 0, "    body: {cd-table: no-such-table.csv, area: 0.01 m2, diameter: 10 cm}", ":5:22:",
     "no-such-table.csv"},
    {"misspelt body key", 5, 0, "    body: {shape: sphere, diametre: 10 cm}", ":5:27:", "did you mean 'diameter'"},
    {"body not a mapping", 5, 0, "    body: sphere", ":5:11:", "mapping"},
    {"unknown failure case", 16, 0, "  - no-chute", ":16:5:", "'no-canopy' (no stage deploys)"},
    {"a stage name alone", 16, 0, "  - main", ":16:5:", "write {fails: main}"},
    {"unknown stage in only", 17, 0, "  - {only: drouge}", ":17:12:", "did you mean 'drogue'"},
    {"both fails and only", 17, 0, "  - {only: drogue, fails: main}", ":17:5:", "exactly one of fails: "},
    {"only every stage", 17, 0, "  - {only: [drogue, main]}", ":17:12:", "nominal descent"},
    {"a case twice", 17, 0, "  - {fails: [drogue, main]}", ":17:5:", "repeats case 1"},
    {"misspelt case key", 17, 0, "  - {fail: main}", ":17:6:", "did you mean 'fails'"},
    {"failure cases not a list", 15, 17, "failure-cases: no-canopy", ":15:16:", "failure-cases"},
};

/* BASE with lines line..to (to 0: just line) replaced by text */
static char *edited(int line, int to, const char *text)
{
    static char buf[4096];
    buf[0] = '\0';
    const char *p = BASE;
    for (int l = 1; *p; l++) {
        const char *nl = strchr(p, '\n');
        size_t n = nl ? (size_t)(nl - p + 1) : strlen(p), u = strlen(buf);
        if (l == line)
            snprintf(buf + u, sizeof buf - u, "%s\n", text);
        else if (l < line || l > (to ? to : line))
            snprintf(buf + u, sizeof buf - u, "%.*s", (int)n, p);
        p += n;
    }
    return buf;
}

static void test_schema_errors(void **state)
{
    (void)state;
    /* the base file itself is fine */
    sr_mission *m = sr_test_mission_text(BASE);
    assert_true(m->sections[0].has_body);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "a broadside cylinder's reference area d x L",
                    "projected area of a cylinder (geometry)", 0.1 * 0.8, m->sections[0].body_area, 1e-12);
    assert_false(m->sections[1].has_body);
    assert_int_equal(m->nfailures, 2);
    assert_string_equal(m->failures[0].name, "no canopy");
    assert_int_equal(m->failures[0].failed, 3u);
    assert_string_equal(m->failures[1].name, "drogue only");
    assert_int_equal(m->failures[1].failed, 2u);
    sr_mission_free(m);
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        const char *path = sr_test_tmpfile(".yaml", edited(BAD[i].line, BAD[i].to, BAD[i].text));
        char *out, *err;
        int rc = sr_test_cli(&out, &err, "profile", path, NULL);
        if (rc != 2 || !strstr(err, BAD[i].where) || !strstr(err, BAD[i].says) || sr_test_lines(err) != 1)
            fail_msg("%s: exit %d, message: %s", BAD[i].what, rc, err);
        free(out);
        free(err);
    }
}

/* a drag table for a body: from a YAML file with its reference area, and with area: in the mission */
static void test_table_body(void **state)
{
    (void)state;
    const char *table = sr_test_tmpfile(".yaml", "name: tumbling box (invented for the test)\n"
                                                 "reference-area: 0.04 m2\n"
                                                 "points: [[1.0e3, 1.3], [1.0e5, 1.1], [1.0e6, 1.05]]\n");
    char body[512], yaml[1024];
    snprintf(body, sizeof body, "{cd-table: %s, diameter: 20 cm}", table);
    drop_mission(yaml, sizeof yaml, "{elevation: 0 m}", 2000.0, "2 kg", body);
    sr_mission *m = sr_test_mission_text(yaml);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "a table body's area from the table file", "the table file's reference-area",
                    0.04, m->sections[0].body_area, 1e-12);
    sr_profile_ctx *c = ctx_failed(m, 1u, NAN);
    const sr_profile_result *r = sr_profile_nominal(c);
    sr_error e;
    sr_air air;
    assert_int_equal(sr_atmos_at(&m->atmos, 0.0, &air, &e), SR_OK);
    sr_bluff_curve cv;
    sr_bluff_body b;
    sr_bluff_equilibria q;
    assert_int_equal(sr_dragtable_load(&cv, table, SR_BLUFF_LOGLOG, &e), SR_OK);
    assert_int_equal(sr_bluff_body_init(&b, SR_BLUFF_TABLE, &cv, 0.2, 0, 2.0, NAN, &e), SR_OK);
    assert_int_equal(sr_bluff_equilibria_find(&b, &air, &q, &e), SR_OK);
    assert_int_equal(q.n, 1);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY,
                    "table body from 2000 m: impact speed = terminal speed at the ground (0.5%: "
                    "the lag behind the equilibrium)",
                    SRC_ROOT, q.root[0].v, r->body[0].rate_land, 5e-3);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
    sr_bluff_curve_free(&cv);
    /* area: in the mission wins over the file's */
    snprintf(body, sizeof body, "{cd-table: %s, area: 0.05 m2, diameter: 20 cm}", table);
    drop_mission(yaml, sizeof yaml, "{elevation: 0 m}", 2000.0, "2 kg", body);
    m = sr_test_mission_text(yaml);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "a table body's area from the mission", "the mission's area:", 0.05,
                    m->sections[0].body_area, 1e-12);
    sr_mission_free(m);
    /* a CSV table states no area: the mission must */
    const char *csv = sr_test_tmpfile(".csv", "Re,Cd\n1000,1.2\n1000000,1.0\n");
    snprintf(body, sizeof body, "{cd-table: %s, diameter: 20 cm}", csv);
    drop_mission(yaml, sizeof yaml, "{elevation: 0 m}", 2000.0, "2 kg", body);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", sr_test_tmpfile(".yaml", yaml), NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, ":4:35: give area:"));
    assert_int_equal(sr_test_lines(err), 1);
    free(out);
    free(err);
}

/* ---- one free-fall context, many threads (fast mode, per-thread workspaces) ---- */

static void test_threads(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket-revised.yaml");
    sr_error e;
    sr_profile_ctx *c = ctx_failed(m, 3u, NAN);
    enum { N = 64 };
    static double serial[N], parallel[N];
    for (int i = 0; i < N; i++) {
        sr_profile_perturb p;
        sr_profile_perturb_init(&p);
        p.wind_scale = 0.5 + i / (double)N;
        p.mass_scale = 0.9 + 0.2 * i / N;
        sr_profile_result r;
        assert_int_equal(sr_profile_run(c, &p, SR_PROFILE_FAST, NULL, &r, NULL, &e), SR_OK);
        serial[i] = r.body[0].east + r.descent_time + r.max_rate;
    }
    int bad = 0;
#pragma omp parallel num_threads(2) reduction(+ : bad)
    {
        sr_profile_work *w = NULL;
        sr_error te;
        if (sr_profile_work_new(&w, &te))
            bad++;
#pragma omp for
        for (int i = 0; i < N; i++) {
            sr_profile_perturb p;
            sr_profile_perturb_init(&p);
            p.wind_scale = 0.5 + i / (double)N;
            p.mass_scale = 0.9 + 0.2 * i / N;
            sr_profile_result r;
            if (!w || sr_profile_run(c, &p, SR_PROFILE_FAST, w, &r, NULL, &te))
                bad++;
            else
                parallel[i] = r.body[0].east + r.descent_time + r.max_rate;
        }
        sr_profile_work_free(w);
    }
    assert_int_equal(bad, 0);
    assert_memory_equal(serial, parallel, sizeof serial);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}


/* ---- attitudes: a tumbling body is not given its highest drag ---- */

static double sin3(double a, void *p)
{
    (void)p;
    double s = sin(a);
    return s * s * s * 0.5 * sin(a); /* over the sphere: density sin(a)/2 on 0 .. pi */
}

static double cos3(double a, void *p)
{
    (void)p;
    double c = fabs(cos(a));
    return c * c * c * 0.5 * sin(a);
}

static void test_attitude_factors(void **state)
{
    (void)state;
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(200);
    double s3, c3, err;
    gsl_function F1 = {sin3, NULL}, F2 = {cos3, NULL};
    assert_int_equal(gsl_integration_qags(&F1, 0, PI, 0, 1e-12, 200, w, &s3, &err), GSL_SUCCESS);
    assert_int_equal(gsl_integration_qags(&F2, 0, PI, 0, 1e-12, 200, w, &c3, &err), GSL_SUCCESS);
    gsl_integration_workspace_free(w);
    double k, c, d = 0.1, end = 0.82 * PI * d * d / 4;
    sr_bluff_attitude_drag(SR_BLUFF_CYLINDER, d, SR_ATTITUDE_TUMBLING, 0, &k, &c);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "tumbling cylinder: broadside share <sin^3> over the sphere",
                    "bluff.h: cross-flow principle (Hoerner 1965, from memory), average by GSL qags (our derivation)",
                    s3, k, 1e-10);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "tumbling cylinder: the ends' drag area <|cos|^3> 0.82 pi d^2/4 (m2)",
                    "bluff.h: cross-flow principle, average by GSL qags (our derivation)", c3 * end, c, 1e-10);
    sr_bluff_attitude_drag(SR_BLUFF_CYLINDER, d, SR_ATTITUDE_END_ON, 1, &k, &c);
    CHECK_REL_CLASS(SR_CHECK_MEMORY, "end-on cylinder: Cd 0.82 on the end area (m2)",
                    "Hoerner 1965, Fluid-Dynamic Drag, flat-ended cylinder in axial flow (from memory)", end, c, 1e-12);
    assert_true(k == 0.0);
    /* not stable end-on: it tumbles */
    sr_bluff_attitude_drag(SR_BLUFF_CYLINDER, d, SR_ATTITUDE_END_ON, 0, &k, &c);
    assert_true(fabs(k - s3) < 1e-9);
    sr_bluff_attitude_drag(SR_BLUFF_DISK, d, SR_ATTITUDE_TUMBLING, 0, &k, &c);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "tumbling disk: face-on share <|cos|^3> over the sphere",
                    "bluff.h: cross-flow principle, average by GSL qags (our derivation)", c3, k, 1e-10);
    sr_bluff_attitude_drag(SR_BLUFF_SPHERE, d, SR_ATTITUDE_TUMBLING, 0, &k, &c);
    assert_true(k == 1.0 && c == 0.0);
}

/* The revised demo with no canopy: broadside and tumbling, judged at the
 * worse; the tumbling fall balances its weight with the averaged drag. */
static void test_tumbling_demo(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket-revised.yaml");
    sr_error e;
    sr_judge_limits l;
    sr_judge_limits_init(&l, m);
    sr_failcase_result *f = calloc(1, sizeof *f);
    assert_int_equal(sr_failcase_run(m, m->failures[0].failed, &l, SR_JUDGE_BAND_END, NULL, f, &e), SR_OK);
    assert_int_equal(f->nattitudes, 2);
    assert_int_equal(f->attitude[1], SR_ATTITUDE_TUMBLING);
    assert_int_equal(f->worse, 1);
    double broad = f->impact[0][0], tumble = f->impact[1][0];
    assert_true(tumble > 1.2 * broad);
    /* the estimate: a tumbling-average drag area of about 0.5 .. 0.7 of broadside gives about 36 .. 43 m/s */
    CHECK_ABS_CLASS(SR_CHECK_TRADE, "demo booster tumbling, impact speed (m/s)",
                    "tumbling drag area about 0.5-0.7 of broadside (common practice): about 36-43 m/s", 39.5, tumble,
                    3.5);
    /* judged at the worse: the energy rows take the tumbling fall */
    for (size_t i = 0; i < f->verdict.nrows; i++)
        if (f->verdict.row[i].kind == SR_JUDGE_ENERGY && f->verdict.row[i].index == 0)
            CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "failure case judged at the worse attitude: booster energy (J)",
                            "analysis/failcase.c", f->energy[1][0], f->verdict.row[i].band_end, 1e-12);
    /* the tumbling fall's terminal speed balances the weight with the attitude-averaged drag */
    const sr_profile_result *r = &f->band[1].run[SR_BAND_TYPICAL];
    double v = r->body[0].v_terminal, drag = 0.0;
    sr_air air;
    assert_int_equal(sr_atmos_at(&m->atmos, m->ground, &air, &e), SR_OK);
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        sr_bluff_body b;
        double k, c;
        assert_int_equal(sr_bluff_body_init(&b, s->shape, &s->curve, s->body_d, s->body_length, s->mass, NAN, &e),
                         SR_OK);
        sr_bluff_attitude_drag(s->shape, s->body_d, SR_ATTITUDE_TUMBLING, 0, &k, &c);
        drag += 0.5 * air.rho * v * v * (k * sr_bluff_body_cd(&b, air.rho * v * b.d / air.mu, NULL) * b.area + c);
    }
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "tumbling demo: attitude-averaged drag at the terminal speed = weight",
                    "drag balance m g = 1/2 rho v^2 sum (k Cd_i(Re_i) A_i + c_i) (bluff.h attitudes)",
                    sr_mission_total_mass(m) * air.g, drag, 1e-9);
    free(f);
    sr_mission_free(m);
}

/* A stable-end-on section adds the end-on attitude; other shapes refuse it. */
static void test_end_on(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_text("mission: finned booster\n"
                         "sections:\n  - {name: booster, mass: 3 kg, body: {shape: cylinder, diameter: 10 cm, "
                         "length: 80 cm, stable-end-on: true}}\n"
                         "stages:\n  - {name: main, family: conical, nominal-diameter: 2 m, deploy: apogee}\n"
                         "start: {height: 1000 m, speed: 10 m/s}\n"
                         "limits: {landing-energy: 100 J}\n"
                         "failure-cases: [no-canopy]\n");
    sr_bluff_attitude a[SR_FAILCASE_MAX_ATTITUDES];
    assert_int_equal(sr_failcase_attitudes(m, a), 3);
    assert_int_equal(a[2], SR_ATTITUDE_END_ON);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", m->path, NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "end-on"));
    assert_non_null(strstr(out, "FAR BEYOND"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "profile", m->path, "--fail", "main", NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(out, "end-on (the worse of 3 attitudes"));
    free(out);
    free(err);
    sr_mission_free(m);
    const char *bad = sr_test_tmpfile(".yaml", "mission: m\nsections:\n  - {name: s, mass: 1 kg, body: {shape: sphere, "
                                               "diameter: 10 cm, stable-end-on: true}}\n"
                                               "stages:\n  - {name: main, family: conical, nominal-diameter: 2 m}\n");
    rc = sr_test_cli(&out, &err, "check", bad, NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, ":3:"));
    assert_non_null(strstr(err, "stable-end-on"));
    free(out);
    free(err);
}

/* A failure case breaks the deployment pressure, the Mach envelope and the
 * opening load, and its row says so; --fail makes it the descent, exit 1. */
static void test_failure_breaches(void **state)
{
    (void)state;
    const char *path = sr_test_tmpfile(".yaml", "mission: a dense instrument probe (invented test case)\n"
                                                "sections:\n  - {name: probe, mass: 20 kg, body: {shape: sphere, "
                                                "diameter: 15 cm}}\n"
                                                "stages:\n"
                                                "  - {name: drogue, family: conical-ribbon, nominal-diameter: 0.8 m, "
                                                "deploy: apogee}\n"
                                                "  - {name: main, family: conical, nominal-diameter: 5 m, deploy: "
                                                "{height: 600 m}}\n"
                                                "start: {height: 6000 m, speed: 20 m/s, path-angle: 0 deg}\n"
                                                "limits:\n  touchdown-speed: 6 m/s\n  deployment-pressure: 1500 Pa\n"
                                                "  rated-strength: 8 kN\n  design-factor: 1.5\n"
                                                "failure-cases:\n  - fails: drogue\n");
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "profile", path, NULL);
    assert_int_equal(rc, 0);
    assert_string_equal(err, "");
    assert_non_null(strstr(out, "deployment pressure main"));
    assert_non_null(strstr(out, "Mach main"));
    assert_non_null(strstr(out, "opening load main"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "profile", path, "--fail", "drogue", NULL);
    assert_int_equal(rc, 1);
    assert_int_equal(sr_test_lines(err), 3);
    assert_non_null(strstr(err, "limit exceeded: dynamic pressure at deployment, main"));
    assert_non_null(strstr(err, "limit exceeded: Mach at deployment, main"));
    assert_non_null(strstr(err, "limit exceeded: opening load, main"));
    free(out);
    free(err);
}

/* ---- the demo ---- */

static void test_demo(void **state)
{
    (void)state;
    char *out, *err;
    /* the revised demo meets its limits; its failure cases are far beyond them and do not change that */
    int rc = sr_test_cli(&out, &err, "profile", sr_test_path("payloads/desert-club-rocket-revised.yaml"), NULL);
    assert_int_equal(rc, 0);
    assert_string_equal(err, "");
    assert_non_null(strstr(out, "Failure cases"));
    assert_non_null(strstr(out, "never change the exit code"));
    assert_non_null(strstr(out, "no canopy     booster"));
    assert_non_null(strstr(out, "no canopy     payload bay"));
    assert_non_null(strstr(out, "drogue only   booster"));
    assert_non_null(strstr(out, "no canopy: 'cylinder' Cd(Re) on 0.0877 m2"));
    assert_non_null(strstr(out, "FAR BEYOND the limits"));
    assert_non_null(strstr(out, "projected area d x L"));
    assert_non_null(strstr(out, "Wieselsberger 1922"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "profile", "--format", "json",
                     sr_test_path("payloads/desert-club-rocket-revised.yaml"), NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "\"failure_cases\""));
    assert_non_null(strstr(out, "\"free_fall_drag\""));
    assert_non_null(strstr(out, "\"impact_speed_broadside\""));
    assert_non_null(strstr(out, "\"impact_speed_tumbling\""));
    free(out);
    free(err);
    /* the first design breaks two limits: still exactly those two lines */
    rc = sr_test_cli(&out, &err, "profile", sr_test_path("payloads/desert-club-rocket.yaml"), NULL);
    assert_int_equal(rc, 1);
    assert_int_equal(sr_test_lines(err), 2);
    assert_null(strstr(err, "failure"));
    assert_non_null(strstr(out, "Failure cases"));
    free(out);
    free(err);
    /* --fail still makes the failure case the nominal run, with its limits in the exit code */
    rc = sr_test_cli(&out, &err, "profile", "--fail", "all", sr_test_path("payloads/desert-club-rocket-revised.yaml"),
                     NULL);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "limit exceeded: landing energy"));
    assert_non_null(strstr(out, "FAILURE CASE"));
    free(out);
    free(err);

    /* the numbers behind the table: the no-canopy case of the revised demo */
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket-revised.yaml");
    sr_error e;
    assert_int_equal(m->nfailures, 3);
    sr_profile_ctx *c = ctx_failed(m, m->failures[0].failed, NAN);
    const sr_profile_result *r = sr_profile_nominal(c);
    assert_int_equal(r->nbodies, 1);
    assert_true(r->body[0].free_fall);
    /* the two tethered sections fall together: drag of both at the terminal speed = their weight */
    sr_air air;
    assert_int_equal(sr_atmos_at(&m->atmos, m->ground, &air, &e), SR_OK);
    double v = r->body[0].v_terminal, drag = 0.0;
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        sr_bluff_body b;
        assert_int_equal(sr_bluff_body_init(&b, s->shape, &s->curve, s->body_d, s->body_length, s->mass, NAN, &e),
                         SR_OK);
        drag += 0.5 * air.rho * v * v * sr_bluff_body_cd(&b, air.rho * v * b.d / air.mu, NULL) * b.area;
    }
    CHECK_REL_CLASS(
        SR_CHECK_CONSISTENCY,
        "demo, no canopy: drag of both tumbling sections at the terminal speed equals their weight",
        "drag balance m g = 1/2 rho v^2 sum Cd_i(Re_i) A_i (DESIGN.md model 2) with the bluff module's cylinder "
        "curve (Wieselsberger 1922 / DNV-RP-C205)",
        sr_mission_total_mass(m) * air.g, drag, 1e-9);
    assert_true(fabs(r->body[0].rate_land - v) <= 5e-3 * v);
    sr_profile_ctx_free(c);
    sr_mission_free(m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_terminal_speed), cmocka_unit_test(test_constant_cd_closed_form),
        cmocka_unit_test(test_drag_crisis),    cmocka_unit_test(test_schema_errors),
        cmocka_unit_test(test_table_body),     cmocka_unit_test(test_threads),
        cmocka_unit_test(test_demo),           cmocka_unit_test(test_attitude_factors),
        cmocka_unit_test(test_tumbling_demo),  cmocka_unit_test(test_end_on),
        cmocka_unit_test(test_failure_breaches),
    };
    return cmocka_run_group_tests_name("failcase", tests, setup, NULL);
}
