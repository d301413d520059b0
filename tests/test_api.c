/* test_api.c - the installed API (include/sinkrate.h) as a program uses it:
 * only the public header, handles and accessors; errors through the error
 * object's fields; the numbers equal to what the command-line tool prints
 * for the same question (one computation per question). */
#define _DEFAULT_SOURCE
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <sinkrate.h>

#include "testutil.h"

#define SRC_1976 "U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562), Table I: density 1.2250 kg/m3 at 0 m"

static sr_error *E;

static int setup(void **state)
{
    (void)state;
    E = sr_error_new();
    (void)sr_test_catalog();
    return E ? 0 : -1;
}

static int teardown(void **state)
{
    (void)state;
    sr_error_free(E);
    return 0;
}

/* A value of the CLI's JSON output: values.<key>.<field> ("value", "typical", ...). */
static double cli_value(const char *out, const char *key, const char *field)
{
    json_error_t je;
    json_t *j = json_loads(out, 0, &je);
    assert_non_null(j);
    json_t *v = json_object_get(json_object_get(json_object_get(j, "values"), key), field);
    assert_non_null(v);
    double x = json_number_value(v);
    json_decref(j);
    return x;
}

static void test_version_error_caution(void **state)
{
    (void)state;
    assert_string_equal(sr_version(), SR_VERSION_STRING);
    assert_non_null(strstr(sr_caution(), "not for designing, selecting or certifying parachutes that carry people"));
    /* an error object starts empty; NULL is harmless everywhere */
    sr_error *e = sr_error_new();
    assert_int_equal(sr_error_code(e), SR_OK);
    assert_string_equal(sr_error_message(e), "");
    assert_string_equal(sr_error_key(e), "");
    assert_int_equal(sr_error_line(e), 0);
    sr_error_free(e);
    sr_error_free(NULL);
    assert_string_equal(sr_error_message(NULL), "");
    assert_string_equal(sr_error_name(SR_EDOMAIN), "outside the model's range");
    sr_atmos *a = NULL;
    assert_int_equal(sr_atmos_new_offset(&a, 500.0, NULL), SR_EINVAL); /* err may be NULL */
    assert_null(a);
    sr_atmos_free(NULL), sr_wind_free(NULL), sr_canopy_free(NULL), sr_catalog_free(NULL), sr_mission_free(NULL);
    sr_band_ctx_free(NULL), sr_band_result_free(NULL), sr_verdict_free(NULL), sr_judge_limits_free(NULL);
    sr_sizing_free(NULL), sr_loads_free(NULL), sr_freefall_free(NULL), sr_disp_result_free(NULL);
    sr_disp_stats_free(NULL), sr_failcase_result_free(NULL), sr_profile_result_free(NULL), sr_profile_ctx_free(NULL);
}

static void test_atmosphere_and_wind(void **state)
{
    (void)state;
    sr_atmos *a = NULL, *b = NULL;
    assert_int_equal(sr_atmos_new_standard(&a, E), SR_OK);
    assert_int_equal(sr_atmos_dup(&b, a, E), SR_OK);
    sr_air air;
    assert_int_equal(sr_atmos_at(b, 0.0, &air, E), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "sea-level density through the public API", SRC_1976, 1.2250, air.rho, 5e-5);
    /* outside the model: the error says so, no value */
    assert_int_equal(sr_atmos_at(a, 90000.0, &air, E), SR_EDOMAIN);
    assert_int_equal(sr_error_code(E), SR_EDOMAIN);
    assert_non_null(strstr(sr_error_message(E), "86000 m"));
    double lo, hi;
    sr_atmos_range(a, &lo, &hi);
    assert_true(lo == -1000.0 && hi == 86000.0);
    sr_atmos_free(a);
    sr_atmos_free(b);
    /* a sounding from arrays is copied: the caller's arrays may go */
    double z[] = {0, 1000, 2000}, T[] = {288.15, 281.65, 275.15}, p[] = {101325, 89876, 79501};
    assert_int_equal(sr_atmos_new_sounding(&a, z, T, p, 3, E), SR_OK);
    z[1] = T[1] = p[1] = 0;
    assert_int_equal(sr_atmos_density(a, 1000.0, &air.rho, E), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_FORMAT, "sounding density at a row: p / (R T)", "ideal gas law on the row's values",
                    89876.0 / (287.05287 * 281.65), air.rho, 1e-4);
    sr_atmos_free(a);
    /* a site refuses its elevation by key */
    assert_int_equal(sr_atmos_new_site(&a, 30000.0, NAN, NAN, E), SR_EDOMAIN);
    assert_string_equal(sr_error_key(E), "elevation");

    sr_wind *w = NULL, *w2 = NULL;
    assert_int_equal(sr_wind_new_constant(&w, 5.0, M_PI / 2, E), SR_OK); /* from the east */
    assert_int_equal(sr_wind_dup(&w2, w, E), SR_OK);
    double east, north;
    sr_wind_at(w2, 100.0, &east, &north);
    assert_true(fabs(east + 5.0) < 1e-12 && fabs(north) < 1e-12); /* blowing toward the west */
    sr_wind_free(w);
    sr_wind_free(w2);
    double h[] = {0, 100}, s[] = {2, 4}, f[] = {0, 0};
    assert_int_equal(sr_wind_new_table(&w, h, s, f, 2, E), SR_OK);
    sr_wind_at(w, 50.0, &east, &north);
    assert_true(fabs(north + 3.0) < 1e-12);
    sr_wind_free(w);
}

static void test_catalog_and_canopies(void **state)
{
    (void)state;
    const sr_catalog *cat = sr_test_catalog();
    assert_true(sr_catalog_count(cat) >= 14);
    assert_null(sr_catalog_family(cat, sr_catalog_count(cat)));
    const sr_family *f = sr_catalog_find(cat, "conical", E);
    assert_non_null(f);
    assert_string_equal(sr_family_id(f), "conical");
    assert_string_equal(sr_family_class(f), "solid");
    sr_band cd = sr_family_band(f, SR_FV_DRAG);
    assert_true(cd.lo <= cd.typ && cd.typ <= cd.hi);
    assert_true(strlen(sr_family_source(f, SR_FV_DRAG)) > 4);
    /* an unknown family: the error of the find stands through sr_canopy_new */
    sr_canopy *c = NULL;
    assert_int_equal(sr_canopy_new(&c, sr_catalog_find(cat, "konical", E), SR_SIZE_NOMINAL_DIAMETER, 1.0, E),
                     SR_EINVAL);
    assert_null(c);
    assert_non_null(strstr(sr_error_message(E), "did you mean 'conical'"));
    assert_string_equal(sr_error_key(E), "family");
    assert_int_equal(sr_canopy_new(&c, f, SR_SIZE_NOMINAL_DIAMETER, 1.5, E), SR_OK);
    sr_band d0 = sr_canopy_nominal_diameter(c), s0 = sr_canopy_nominal_area(c), cds = sr_canopy_total_cds(c);
    assert_true(d0.typ == 1.5);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "nominal area of a 1.5 m canopy", "S0 = pi D0^2 / 4 (definition of D0)",
                    M_PI * 1.5 * 1.5 / 4.0, s0.typ, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "drag area = CD0 S0", "sr_family_band x sr_canopy_nominal_area",
                    cd.typ * s0.typ, cds.typ, 1e-12);
    assert_int_equal(sr_canopy_set_cluster(c, 3, NAN, E), SR_OK);
    assert_int_equal(sr_canopy_count(c), 3);
    assert_int_equal(sr_canopy_set_cluster(c, 40, NAN, E), SR_EINVAL);
    sr_canopy *c2 = NULL;
    assert_int_equal(sr_canopy_dup(&c2, c, E), SR_OK);
    assert_string_equal(sr_family_id(sr_canopy_family(c2)), "conical");
    sr_air air;
    sr_atmos *a = NULL;
    assert_int_equal(sr_atmos_new_standard(&a, E), SR_OK);
    assert_int_equal(sr_atmos_at(a, 0.0, &air, E), SR_OK);
    sr_band v;
    assert_int_equal(sr_descent_rate(c2, 10.0, 0.0, &air, &v, E), SR_OK);
    assert_true(v.lo <= v.typ && v.typ <= v.hi);
    sr_atmos_free(a);
    sr_canopy_free(c);
    sr_canopy_free(c2);
}

/* The worked example of the README: the API and `sinkrate size` give the same band. */
static void test_sizing_as_the_cli(void **state)
{
    (void)state;
    sr_canopy *c = NULL;
    sr_atmos *site = NULL;
    sr_sizing_result *s = NULL;
    assert_int_equal(sr_canopy_new(&c, sr_catalog_find(sr_test_catalog(), "conical", E), SR_SIZE_NOMINAL_AREA, 1.0,
                                   E),
                     SR_OK);
    assert_int_equal(sr_atmos_new_site(&site, 1380.0, 311.15, 85800.0, E), SR_OK);
    assert_int_equal(sr_sizing_new(&s, c, 5.3, 6.1, 0.0, site, 1380.0, E), SR_OK);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "size", "--mass", "5.3kg", "--speed", "6.1m/s", "--family", "conical",
                                 "--site-elevation", "1380m", "--surface-temp", "38C", "--surface-pressure", "858hPa",
                                 "--format", "json", NULL),
                     0);
    sr_band d = sr_sizing_nominal_diameter(s);
    const char *src = "sinkrate size of the same payload, site and family (the same library function)";
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "sized D0 low, API and CLI", src, cli_value(out, "nominal_diameter", "low"),
                    d.lo, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "sized D0 typical, API and CLI", src,
                    cli_value(out, "nominal_diameter", "typical"), d.typ, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "sized D0 high, API and CLI", src,
                    cli_value(out, "nominal_diameter", "high"), d.hi, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "touchdown energy, API and CLI", src,
                    cli_value(out, "touchdown_energy", "value"), sr_sizing_energy(s), 1e-9);
    assert_true(fabs(sr_sizing_air(s)->rho - cli_value(out, "density", "value")) < 1e-9);
    free(out);
    free(err);
    sr_sizing_free(s);
    /* no canopy can reach 0.2 m/s with a payload this heavy: one line, no result */
    assert_int_equal(sr_sizing_new(&s, c, 5000.0, 0.2, 0.0, site, 1380.0, E), SR_EIMPOSSIBLE);
    assert_null(s);
    sr_atmos_free(site);
    sr_canopy_free(c);
}

static void test_loads_as_the_cli(void **state)
{
    (void)state;
    sr_canopy *c = NULL;
    sr_atmos *a = NULL;
    sr_loads_band *b = NULL;
    sr_air air;
    assert_int_equal(sr_canopy_new(&c, sr_catalog_find(sr_test_catalog(), "conical", E), SR_SIZE_NOMINAL_DIAMETER,
                                   1.5, E),
                     SR_OK);
    assert_int_equal(sr_atmos_new_standard(&a, E), SR_OK);
    assert_int_equal(sr_atmos_at(a, 0.0, &air, E), SR_OK);
    assert_int_equal(sr_loads_deployment(&b, c, 5.0, 30.0, M_PI / 2, &air, E), SR_OK);
    assert_true(b->valid && b->lo.force <= b->typ.force && b->typ.force <= b->hi.force);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "loads", "--mass", "5kg", "--speed", "30m/s", "--family", "conical",
                                 "--nominal-diameter", "1.5m", "--format", "json", NULL),
                     0);
    const char *src = "sinkrate loads of the same canopy and deployment (the same library function)";
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "governing opening load, API and CLI", src,
                    cli_value(out, "peak_force", "high"), b->hi.force, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "typical opening load, API and CLI", src,
                    cli_value(out, "peak_force", "typical"), b->typ.force, 1e-9);
    free(out);
    free(err);
    sr_loads_free(b);
    /* a deployment speed of zero is refused by the key of the input */
    assert_int_not_equal(sr_loads_deployment(&b, c, 5.0, -1.0, M_PI / 2, &air, E), SR_OK);
    assert_null(b);
    assert_string_equal(sr_error_key(E), "v1");
    sr_atmos_free(a);
    sr_canopy_free(c);
}

/* The demo mission flown and judged through the API; the judge agrees with `sinkrate profile`. */
static void test_mission_band_judge(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket.yaml");
    assert_int_equal(sr_mission_sections(m), 2);
    assert_string_equal(sr_mission_section_name(m, 1), "payload bay");
    assert_null(sr_mission_section_name(m, 2));
    assert_int_equal(sr_mission_stages(m), 2);
    assert_true(sr_mission_stage_has_size(m, 1));
    assert_non_null(sr_mission_stage_canopy(m, 1));
    assert_true(sr_mission_has_limits(m));
    char name[128];
    sr_mission_set_name(m, 3u, name, sizeof name);
    assert_string_equal(name, "booster + payload bay");
    sr_band_ctx *bc = NULL;
    sr_band_result *r = NULL;
    sr_judge_limits *lim = NULL;
    sr_verdict *v = NULL;
    assert_int_equal(sr_band_ctx_new(&bc, m, NULL, E), SR_OK);
    assert_int_equal(sr_band_result_new(&r, E), SR_OK);
    assert_int_equal(sr_band_run(bc, NULL, SR_PROFILE_FULL, NULL, r, NULL, E), SR_OK);
    assert_int_equal(sr_judge_limits_new(&lim, m, E), SR_OK);
    assert_int_equal(sr_verdict_new(&v, E), SR_OK);
    sr_judge_band(lim, r, SR_JUDGE_BAND_END, v);
    assert_int_equal(sr_verdict_basis(v), SR_JUDGE_BAND_END);
    const sr_profile_result *typ = sr_band_result_run(r, SR_BAND_TYPICAL);
    assert_null(sr_band_result_run(r, 3));
    assert_int_equal(sr_profile_result_bodies(typ), 1);
    assert_int_equal(sr_profile_result_stages(typ), 2);
    assert_true(sr_profile_result_events(typ) > 4);
    const sr_profile_event *first = sr_profile_result_event(typ, 0), *last = NULL;
    assert_int_equal(first->kind, SR_EVENT_START);
    for (size_t i = 0; i < sr_profile_result_events(typ); i++)
        last = sr_profile_result_event(typ, i);
    assert_int_equal(last->kind, SR_EVENT_TOUCHDOWN);
    assert_true(fabs(last->t - sr_profile_result_descent_time(typ)) < 1e-9);
    assert_non_null(sr_band_result_loads(r, 1));
    assert_null(sr_band_result_loads(r, 2));
    char *out, *err;
    int code = sr_test_cli(&out, &err, "profile", sr_test_path("payloads/desert-club-rocket.yaml"), "--format", "json",
                           NULL);
    assert_int_equal(code, sr_verdict_exceeded(v) ? 1 : 0);
    /* every exceeded row names its limit in the CLI's lines, with the subject where there is one */
    for (size_t i = 0; i < sr_verdict_rows(v); i++) {
        const sr_judge_row *j = sr_verdict_row(v, i);
        if (j->kind == SR_JUDGE_ENERGY)
            assert_string_equal(sr_judge_row_subject(m, j), sr_mission_section_name(m, (size_t)j->index));
        if (j->kind == SR_JUDGE_MACH)
            assert_string_equal(sr_judge_row_subject(m, j), sr_mission_stage_name(m, (size_t)j->index));
        if (j->exceeded)
            assert_non_null(strstr(err, sr_judge_kind_name(j->kind)));
    }
    assert_int_equal(sr_judge_kind_quantity(SR_JUDGE_DRIFT), SR_Q_LENGTH);
    assert_null(sr_verdict_row(v, sr_verdict_rows(v)));
    free(out);
    free(err);
    /* the profile context alone, and a result of one's own */
    sr_profile_ctx *ctx = NULL;
    sr_profile_result *pr = NULL;
    assert_int_equal(sr_mission_profile(&ctx, m, NULL, E), SR_OK);
    assert_int_equal(sr_profile_result_new(&pr, E), SR_OK);
    assert_int_equal(sr_profile_run(ctx, NULL, SR_PROFILE_FULL, NULL, pr, NULL, E), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "descent time: profile run and band run", "the same staged descent",
                    sr_profile_result_descent_time(typ), sr_profile_result_descent_time(pr), 1e-12);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "descent time: nominal of the context", "the same staged descent",
                    sr_profile_result_descent_time(sr_profile_nominal(ctx)), sr_profile_result_descent_time(pr),
                    1e-12);
    sr_profile_result_free(pr);
    sr_profile_ctx_free(ctx);
    sr_verdict_free(v);
    sr_judge_limits_free(lim);
    sr_band_result_free(r);
    sr_band_ctx_free(bc);
    sr_mission_free(m);
}

static void test_failure_case(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket-revised.yaml");
    assert_true(sr_mission_failures(m) >= 1);
    sr_judge_limits *lim = NULL;
    sr_failcase_result *f = NULL;
    assert_int_equal(sr_judge_limits_new(&lim, m, E), SR_OK);
    assert_int_equal(sr_failcase_result_new(&f, E), SR_OK);
    assert_int_equal(sr_failcase_run(m, sr_mission_failure_stages(m, 0), lim, SR_JUDGE_BAND_END, NULL, f, E), SR_OK);
    assert_true(sr_failcase_result_attitudes(f) >= 1);
    assert_int_equal(sr_failcase_result_attitude(f, 0), SR_ATTITUDE_BROADSIDE);
    assert_true(sr_failcase_result_worse(f) < sr_failcase_result_attitudes(f));
    assert_non_null(sr_failcase_result_band(f, 0));
    assert_true(sr_verdict_rows(sr_failcase_result_verdict(f)) > 0);
    assert_string_equal(sr_bluff_attitude_name(SR_ATTITUDE_TUMBLING), "tumbling");
    sr_failcase_result_free(f);
    sr_judge_limits_free(lim);
    sr_mission_free(m);
}

static void test_dispersion(void **state)
{
    (void)state;
    sr_mission *m = sr_test_mission_file("payloads/desert-club-rocket.yaml");
    sr_disp_result *a = NULL, *b = NULL;
    assert_int_equal(sr_disp_mission_run(&a, m, 200, 7, 1, 0, E), SR_OK);
    assert_int_equal(sr_disp_mission_run(&b, m, 200, 7, 2, 0, E), SR_OK);
    assert_int_equal(sr_disp_result_samples(a), 200);
    assert_int_equal(sr_disp_result_bodies(a), 1);
    for (size_t i = 0; i < 200; i++) {
        assert_memory_equal(sr_disp_result_landing(a, i, 0), sr_disp_result_landing(b, i, 0), sizeof(double) * 5);
        assert_int_equal(sr_disp_result_flags(a, i), sr_disp_result_flags(b, i));
    }
    assert_null(sr_disp_result_landing(a, 200, 0));
    sr_disp_stats *st = NULL;
    assert_int_equal(sr_disp_stats_new(&st, a, E), SR_OK);
    const sr_body_stats *bs = sr_disp_stats_body(st, 0);
    assert_non_null(bs);
    assert_true(bs->sigma3.major >= bs->sigma1.major && bs->r95_mean >= bs->r50_mean);
    const sr_proportion *any = sr_disp_stats_any(st);
    assert_int_equal(any->n, 200);
    assert_true(any->lo <= any->p && any->p <= any->hi);
    assert_int_equal(sr_disp_stats_limit(st, SR_JUDGE_TIME)->n, 200);
    sr_disp_stats_free(st);
    sr_disp_result_free(a);
    sr_disp_result_free(b);
    assert_int_equal(sr_disp_mission_run(&a, m, 0, 7, 1, 0, E), SR_EINVAL);
    assert_null(a);
    sr_mission_free(m);
}

/* A free fall: the terminal speed balances weight and drag on the body's own Cd(Re). */
static void test_freefall(void **state)
{
    (void)state;
    sr_freefall *f = NULL;
    sr_atmos *a = NULL;
    sr_air air;
    assert_int_equal(sr_atmos_new_standard(&a, E), SR_OK);
    assert_int_equal(sr_atmos_at(a, 0.0, &air, E), SR_OK);
    assert_int_equal(sr_freefall_new(&f, SR_BLUFF_SPHERE, NULL, 0.1, 0.0, 0.5, E), SR_OK);
    double v, vs[4];
    size_t n;
    assert_int_equal(sr_freefall_terminal(f, &air, &v, E), SR_OK);
    assert_int_equal(sr_freefall_speeds(f, &air, vs, 4, &n, E), SR_OK);
    assert_true(n >= 1 && vs[n < 4 ? n - 1 : 3] <= v);
    double re = air.rho * v * 0.1 / air.mu, drag = 0.5 * air.rho * v * v * sr_freefall_cd(f, re) * M_PI * 0.01 / 4;
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "free fall: drag at the terminal speed equals the weight",
                    "1/2 rho v^2 Cd(Re) A = m g on the body's own curve", 0.5 * air.g, drag, 1e-9);
    sr_freefall_free(f);
    assert_int_equal(sr_freefall_new(&f, SR_BLUFF_CYLINDER, NULL, 0.1, 0.0, 0.5, E), SR_EINVAL);
    assert_string_equal(sr_error_key(E), "length");
    assert_int_equal(sr_freefall_new(&f, SR_BLUFF_SPHERE, "no-such-curve", 0.1, 0.0, 0.5, E), SR_EINVAL);
    double tre[] = {1e3, 1e5, 1e6}, tcd[] = {0.5, 0.5, 0.5};
    assert_int_equal(sr_freefall_new_table(&f, tre, tcd, 3, 0.1, 0.01, 0.5, E), SR_OK);
    assert_int_equal(sr_freefall_terminal(f, &air, &v, E), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "terminal speed on a constant Cd table",
                    "drag balance v = sqrt(2 m g / (rho Cd A))", sqrt(2 * 0.5 * air.g / (air.rho * 0.5 * 0.01)), v,
                    1e-9);
    sr_freefall_free(f);
    sr_atmos_free(a);
}

/* A file error reaches a program as fields: the key, the file, its line and column. */
static void test_file_errors_as_fields(void **state)
{
    (void)state;
    const char *p = sr_test_tmpfile(".yaml", "mission: fields\n"
                                             "site:\n"
                                             "  elevation: 100 m\n"
                                             "  wind: {model: power-law, speed: 5 m/s, from: 270 deg, exponent: 4}\n"
                                             "sections:\n  - {name: a, mass: 2 kg}\n"
                                             "stages:\n  - {name: main, family: conical, nominal-diameter: 1 m}\n");
    sr_mission *m = NULL;
    assert_int_equal(sr_mission_open(&m, p, sr_test_catalog(), E), SR_EINVAL);
    assert_null(m);
    assert_string_equal(sr_error_file(E), p);
    assert_int_equal(sr_error_line(E), 4);
    assert_string_equal(sr_error_key(E), "exponent");
    char head[300];
    snprintf(head, sizeof head, "%s:%d:%d: ", p, sr_error_line(E), sr_error_column(E));
    assert_memory_equal(sr_error_message(E), head, strlen(head));
    /* a value of a list item: the key of the list */
    p = sr_test_tmpfile(".yaml", "mission: fields\nsections:\n  - {name: a, mass: -2 kg}\n"
                                 "stages:\n  - {name: main, family: conical, nominal-diameter: 1 m}\n");
    assert_int_equal(sr_mission_open(&m, p, sr_test_catalog(), E), SR_EINVAL);
    assert_int_equal(sr_error_line(E), 3);
    assert_string_equal(sr_error_key(E), "mass");
    /* a table row */
    p = sr_test_tmpfile(".csv", "height [m],speed [m/s],from [deg]\n0,3,270\n50,4,270\n40,5,270\n");
    sr_wind *w = NULL;
    assert_int_equal(sr_wind_open_table(&w, p, 0.0, E), SR_EINVAL);
    assert_int_equal(sr_error_line(E), 4);
    assert_string_equal(sr_error_file(E), p);
    /* a file that is not there */
    sr_atmos *a = NULL;
    assert_int_equal(sr_atmos_open_sounding(&a, "/nonexistent/sounding.csv", E), SR_EIO);
    assert_string_equal(sr_error_file(E), "/nonexistent/sounding.csv");
    assert_int_equal(sr_error_line(E), 0);
    sr_catalog *c = NULL;
    assert_int_equal(sr_catalog_new(&c, "/nonexistent/canopies", E), SR_EIO);
    assert_null(c);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_version_error_caution), cmocka_unit_test(test_atmosphere_and_wind),
        cmocka_unit_test(test_catalog_and_canopies),  cmocka_unit_test(test_sizing_as_the_cli),
        cmocka_unit_test(test_loads_as_the_cli),      cmocka_unit_test(test_mission_band_judge),
        cmocka_unit_test(test_failure_case),          cmocka_unit_test(test_dispersion),
        cmocka_unit_test(test_freefall),              cmocka_unit_test(test_file_errors_as_fields),
    };
    return cmocka_run_group_tests_name("api", tests, setup, teardown);
}
