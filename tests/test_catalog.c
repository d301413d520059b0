/* test_catalog.c - the shipped canopy catalog and the strict YAML readers. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "files/catalog.h"
#include "testutil.h"

static sr_catalog *load(void)
{
    sr_catalog *c = malloc(sizeof *c);
    sr_error e;
    int rc = sr_catalog_open(c, sr_test_path("canopies"), &e);
    if (rc)
        print_error("%s\n", e.msg);
    assert_int_equal(rc, 0);
    return c;
}

/* The families the catalog must hold (issue list) with the handbook ranges
 * of CD0 on nominal area, Knacke 1991 Tables 5-1 / 5-2, from memory. */
static const struct {
    const char *id;
    double lo, hi;
} FAMILIES[] = {
    {"flat-circular", 0.75, 0.80}, {"conical", 0.75, 0.90},       {"biconical", 0.75, 0.92},
    {"triconical", 0.80, 0.96},    {"extended-skirt", 0.78, 0.87}, {"hemispherical", 0.62, 0.77},
    {"guide-surface", 0.28, 0.42}, {"annular", 0.85, 0.95},        {"cross", 0.60, 0.85},
    {"flat-ribbon", 0.45, 0.50},   {"conical-ribbon", 0.50, 0.55}, {"ringslot", 0.56, 0.65},
    {"ringsail", 0.75, 0.90},      {"disk-gap-band", 0.52, 0.58},
};

static void test_catalog_complete_and_sourced(void **state)
{
    (void)state;
    sr_catalog *c = load();
    for (size_t i = 0; i < sizeof FAMILIES / sizeof FAMILIES[0]; i++) {
        sr_error e;
        const sr_family *f = sr_catalog_find(c, FAMILIES[i].id, &e);
        assert_non_null(f);
        CHECK_ABS_CLASS(SR_CHECK_MEMORY, "CD0 low (nominal area)",
                        "Knacke 1991, NWC TP 6575, Tables 5-1/5-2 (from memory)", FAMILIES[i].lo, f->cd0.v.lo, 1e-12);
        CHECK_ABS_CLASS(SR_CHECK_MEMORY, "CD0 high (nominal area)",
                        "Knacke 1991, NWC TP 6575, Tables 5-1/5-2 (from memory)", FAMILIES[i].hi, f->cd0.v.hi, 1e-12);
        assert_int_equal(f->cd0.ref, SR_REF_NOMINAL);
        const char *srcs[] = {f->cd0_source, f->dp_source, f->dc_source, f->cx_source,
                              f->fill_source, f->osc_source, f->mach_source};
        for (size_t k = 0; k < 7; k++) {
            assert_true(strlen(srcs[k]) > 10);
            /* every recalled value must say so */
            assert_non_null(strstr(srcs[k], "memory"));
        }
    }
    free(c);
}

static void test_unknown_family_suggests(void **state)
{
    (void)state;
    sr_catalog *c = load();
    sr_error e;
    assert_null(sr_catalog_find(c, "conicl", &e));
    assert_non_null(strstr(e.msg, "did you mean 'conical'"));
    free(c);
}

/* Bad family files: each gives one positioned message. */
static const struct {
    const char *what, *yaml, *expect;
} BAD[] = {
    {"malformed YAML", "id: x\nname: [unclosed\n", "malformed YAML"},
    {"unknown key with suggestion", "id: x\nnmae: y\n", "did you mean 'name'"},
    {"duplicate key", "id: a\nid: b\n", "duplicate key 'id'"},
    {"not a mapping", "- a\n- b\n", "must be a mapping"},
    {"empty", "", "empty"},
};

static void test_bad_family_files(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        const char *p = sr_test_tmpfile(".yaml", BAD[i].yaml);
        sr_family f;
        sr_error e;
        assert_int_not_equal(sr_catalog_load_family(&f, p, &e), 0);
        if (!strstr(e.msg, BAD[i].expect))
            print_error("%s: got '%s'\n", BAD[i].what, e.msg);
        assert_non_null(strstr(e.msg, BAD[i].expect));
        assert_null(strchr(e.msg, '\n'));
    }
}

/* A good file with one value broken in turn. */
static const char GOOD[] = "id: t\nname: T\nclass: solid\n"
                           "drag-coefficient: {reference: nominal, low: 0.7, high: 0.8, source: s}\n"
                           "projected-ratio: {low: 0.7, high: 0.7, source: s}\n"
                           "constructed-ratio: {low: 1, high: 1, source: s}\n"
                           "opening-factor: {low: 1.7, high: 1.7, source: s}\n"
                           "filling-constant: {value: 8, source: s}\n"
                           "oscillation: {low: 10 deg, high: 20 deg, source: s}\n"
                           "mach-limit: {value: 0.5, source: s}\n";

static void test_value_errors(void **state)
{
    (void)state;
    sr_family f;
    sr_error e;
    assert_int_equal(sr_catalog_load_family(&f, sr_test_tmpfile(".yaml", GOOD), &e), 0);
    assert_true(fabs(f.cd0.v.typ - 0.75) < 1e-12); /* midpoint when typical is absent */
    static const struct {
        const char *from, *to, *expect;
    } MUT[] = {
        {"reference: nominal", "reference: projected", "must be on nominal area"},
        {"low: 10 deg", "low: 10", "needs a unit"},
        {"low: 0.7, high: 0.8", "low: 0.9, high: 0.8", "low <= typical <= high"},
        {"value: 8", "value: -8", "plausible range"},
        {"class: solid", "class: mushy", "class must be"},
        {"source: s}\nfill", "sorce: s}\nfill", "did you mean 'source'"},
        {"low: 0.7, high: 0.8", "low: nan, high: 0.8", "not a number"},
    };
    for (size_t i = 0; i < sizeof MUT / sizeof MUT[0]; i++) {
        char buf[2048];
        const char *at = strstr(GOOD, MUT[i].from);
        assert_non_null(at);
        snprintf(buf, sizeof buf, "%.*s%s%s", (int)(at - GOOD), GOOD, MUT[i].to, at + strlen(MUT[i].from));
        int rc = sr_catalog_load_family(&f, sr_test_tmpfile(".yaml", buf), &e);
        if (rc == 0 || !strstr(e.msg, MUT[i].expect))
            print_error("mutation %zu: rc %d, '%s'\n", i, rc, e.msg);
        assert_int_not_equal(rc, 0);
        assert_non_null(strstr(e.msg, MUT[i].expect));
    }
}

static void test_canopy_file(void **state)
{
    (void)state;
    sr_catalog *c = load();
    sr_canopy cp;
    sr_error e;
    const char *ok = "canopy:\n  name: test\n  family: conical\n  projected-diameter: 1.4 m\n"
                     "  drag-coefficient: {value: 1.5, reference: projected, source: drop test}\n";
    assert_int_equal(sr_catalog_load_canopy(&cp, c, sr_test_tmpfile(".yaml", ok), &e), 0);
    assert_true(cp.measured && cp.cd.ref == SR_REF_PROJECTED);
    const char *two = "canopy:\n  family: conical\n  projected-diameter: 1.4 m\n  nominal-diameter: 2 m\n";
    assert_int_not_equal(sr_catalog_load_canopy(&cp, c, sr_test_tmpfile(".yaml", two), &e), 0);
    assert_non_null(strstr(e.msg, "one size only"));
    const char *noref = "canopy:\n  family: conical\n  nominal-diameter: 2 m\n  drag-coefficient: {value: 1.5}\n";
    assert_int_not_equal(sr_catalog_load_canopy(&cp, c, sr_test_tmpfile(".yaml", noref), &e), 0);
    assert_non_null(strstr(e.msg, "reference"));
    free(c);
}

/* What is not a regular file in the catalog directory is skipped: a FIFO
 * named like a family would block every command on its open. */
static void test_only_regular_files(void **state)
{
    (void)state;
    char d[64];
    sr_test_tmpdir(d, sizeof d, "cat");
    char p[256], q[256];
    snprintf(p, sizeof p, "%s/conical.yaml", d);
    assert_int_equal(symlink(sr_test_path("canopies/conical.yaml"), p), 0); /* a link to a family is one */
    snprintf(q, sizeof q, "%s/stuck.yaml", d);
    assert_int_equal(mkfifo(q, 0644), 0);
    char sub[256];
    snprintf(sub, sizeof sub, "%s/dir.yaml", d);
    assert_int_equal(mkdir(sub, 0755), 0);
    sr_catalog *c = malloc(sizeof *c);
    sr_error e;
    int rc = sr_catalog_open(c, d, &e);
    if (rc)
        print_error("%s\n", e.msg);
    assert_int_equal(rc, 0);
    assert_int_equal(c->n, 1);
    free(c);
    unlink(p);
    unlink(q);
    rmdir(sub);
    rmdir(d);
}

/* A file of the built-in catalog with its id and name changed (the rest as shipped). */
static void write_variant(const char *path, const char *from_id, const char *id, const char *name)
{
    FILE *in = fopen(sr_test_path("canopies/conical.yaml"), "r"), *out = fopen(path, "w");
    assert_non_null(in);
    assert_non_null(out);
    char line[1024];
    (void)from_id;
    while (fgets(line, sizeof line, in)) {
        if (strncmp(line, "id:", 3) == 0)
            fprintf(out, "id: %s\n", id);
        else if (strncmp(line, "name:", 5) == 0)
            fprintf(out, "name: \"%s\"\n", name);
        else
            fputs(line, out);
    }
    fclose(in);
    fclose(out);
}

/* User directories go in front of the built-in catalog: a new family is
 * added, one with a built-in id replaces it and the output says so, the
 * first --data wins over a later one and over $SINKRATE_PATH, and
 * `canopies` lists where each family came from (the issue: after adding one
 * family, --family cross was unknown). */
static void test_user_catalog_in_front(void **state)
{
    (void)state;
    char a[] = "/tmp/sinkrate-user-a-XXXXXX", b[] = "/tmp/sinkrate-user-b-XXXXXX";
    assert_non_null(mkdtemp(a));
    assert_non_null(mkdtemp(b));
    char p1[300], p2[300], p3[300], sub[300];
    snprintf(p1, sizeof p1, "%s/my-cone.yaml", a);
    write_variant(p1, "conical", "my-cone", "Our cone");
    snprintf(p2, sizeof p2, "%s/conical.yaml", a);
    write_variant(p2, "conical", "conical", "Conical, first directory");
    snprintf(sub, sizeof sub, "%s/canopies", b); /* the other layout: DIR/canopies/ */
    assert_int_equal(mkdir(sub, 0755), 0);
    snprintf(p3, sizeof p3, "%s/conical.yaml", sub);
    write_variant(p3, "conical", "conical", "Conical, second directory");

    /* the library: the built-in catalog, then a directory in front */
    sr_catalog *c = load();
    size_t n0 = c->n;
    sr_error e;
    assert_int_equal(sr_catalog_add(c, sub, "--data b", &e), SR_OK);
    assert_int_equal(sr_catalog_add(c, a, "--data a", &e), SR_OK);
    assert_int_equal(c->n, n0 + 1);
    const sr_family *f = sr_catalog_find(c, "conical", &e);
    assert_non_null(f);
    assert_string_equal(f->name, "Conical, first directory");
    size_t k = (size_t)(f - c->fam);
    assert_string_equal(c->origin[k].from, "--data a");
    assert_string_equal(c->origin[k].replaces, p3);
    assert_non_null(sr_catalog_find(c, "cross", &e));
    assert_non_null(sr_catalog_find(c, "my-cone", &e));
    /* the built-in directory again adds nothing */
    assert_int_equal(sr_catalog_add(c, sr_test_path("canopies"), "--data .", &e), SR_OK);
    assert_int_equal(c->n, n0 + 1);
    free(c);

    /* the command line: --data twice, the first wins; cross is still known */
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "rate", "--family", "conical", "--nominal-diameter", "2m", "--mass", "5kg",
                         "--data", a, "--data", b, NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "Conical, first directory"));
    assert_non_null(strstr(out, "family 'conical' is yours"));
    assert_non_null(strstr(out, "it replaces the one in"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "rate", "--family", "cross", "--nominal-diameter", "1m", "--mass", "2kg", "--data", a,
                     NULL);
    assert_int_equal(rc, 0);
    free(out);
    free(err);
    /* $SINKRATE_PATH comes after --data, before the built-in catalog */
    setenv("SINKRATE_PATH", b, 1);
    rc = sr_test_cli(&out, &err, "canopies", "--format", "csv", NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "Conical, second directory"));
    assert_non_null(strstr(out, "SINKRATE_PATH"));
    assert_non_null(strstr(out, "replaces built-in"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "canopies", "--data", a, "--format", "json", NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "Conical, first directory"));
    assert_non_null(strstr(out, "\"built-in\""));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "canopies", "conical", "--data", a, NULL);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(out, "--data"));
    free(out);
    free(err);
    unsetenv("SINKRATE_PATH");
    /* a directory of nothing is an error naming it */
    rc = sr_test_cli(&out, &err, "canopies", "--data", "/nonexistent-dir", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "--data: /nonexistent-dir holds no canopies/"));
    free(out);
    free(err);
    unlink(p1);
    unlink(p2);
    unlink(p3);
    rmdir(sub);
    rmdir(a);
    rmdir(b);
}

/* Every shipped value carries its outside-check status and names the
 * publication that would check it (docs/validation.md, "Not yet checked");
 * where one is checked, the check is here. */
#define SRC_AGARD "AGARD-AG-319 p. 15, as quoted in secondary material (canopy-handbook.md 2.2)"

static void test_check_status(void **state)
{
    (void)state;
    sr_catalog *c = load();
    for (size_t i = 0; i < c->n; i++) {
        const sr_family *f = &c->fam[i];
        for (int v = 0; v < SR_FV_COUNT_; v++) {
            if ((v == SR_FV_AREAL && isnan(f->areal_mass)) || (v == SR_FV_GROWTH && !f->growth_given))
                continue;
            if (strlen(f->check[v].to_check) < 10)
                print_error("%s: %s names no publication that would check it\n", f->id, sr_family_value_key(v));
            assert_true(strlen(f->check[v].to_check) >= 10);
            assert_true(strcmp(f->check[v].outside, "none") == 0 || strstr(f->check[v].outside, "tests/"));
        }
    }
    sr_error e;
    const sr_family *d = sr_catalog_find(c, "disk-gap-band", &e);
    assert_non_null(d);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "disk-gap-band Dp/D0 (half a unit of the quoted 0.65)", SRC_AGARD, 0.65,
                    d->dp_d0.typ, 0.005);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "disk-gap-band Dc/D0 (half a unit of the quoted 0.73)", SRC_AGARD, 0.73,
                    d->dc_d0.typ, 0.005);
    assert_string_not_equal(d->check[SR_FV_PROJECTED].outside, "none");
    assert_string_not_equal(d->check[SR_FV_CONSTRUCTED].outside, "none");
    free(c);

    /* the status keys: optional, `none` by default, an outside class otherwise */
    sr_family f;
    char buf[2048];
    snprintf(buf, sizeof buf, "%s", GOOD);
    assert_int_equal(sr_catalog_load_family(&f, sr_test_tmpfile(".yaml", buf), &e), 0);
    assert_string_equal(f.check[SR_FV_DRAG].outside, "none");
    assert_string_equal(f.check[SR_FV_DRAG].to_check, "");
    static const struct {
        const char *status, *expect;
    } ST[] = {
        {"outside-check: \"published: Some Handbook 1999, Table 2\"", NULL},
        {"outside-check: \"independent method: a fit in the test\"", NULL},
        {"outside-check: checked", "outside-check must be 'none' or name its check"},
        {"outside-check: \"our derivation: docs/method.md\"", "outside-check must be 'none' or name its check"},
        {"outside-check: \"published: from memory, Table 5-1\"", "a value from memory is not an outside check"},
        {"to-check: [a, b]", "expected a text value"},
        {"outside-chek: none", "did you mean 'outside-check'"},
    };
    for (size_t i = 0; i < sizeof ST / sizeof ST[0]; i++) {
        const char *at = strstr(GOOD, "high: 0.8, source: s}");
        assert_non_null(at);
        snprintf(buf, sizeof buf, "%.*shigh: 0.8, source: s, %s}%s", (int)(at - GOOD), GOOD, ST[i].status,
                 at + strlen("high: 0.8, source: s}"));
        int rc = sr_catalog_load_family(&f, sr_test_tmpfile(".yaml", buf), &e);
        if (ST[i].expect ? rc == 0 || !strstr(e.msg, ST[i].expect) : rc != 0)
            print_error("status %zu: rc %d, '%s'\n", i, rc, rc ? e.msg : "");
        if (ST[i].expect) {
            assert_int_not_equal(rc, 0);
            assert_non_null(strstr(e.msg, ST[i].expect));
            assert_non_null(strstr(e.msg, ".yaml:4:")); /* file:line:column of the drag-coefficient line */
        } else {
            assert_int_equal(rc, 0);
        }
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_catalog_complete_and_sourced), cmocka_unit_test(test_unknown_family_suggests),
        cmocka_unit_test(test_bad_family_files), cmocka_unit_test(test_value_errors),
        cmocka_unit_test(test_canopy_file),         cmocka_unit_test(test_check_status),
        cmocka_unit_test(test_only_regular_files),
        cmocka_unit_test(test_user_catalog_in_front),
    };
    return cmocka_run_group_tests_name("catalog", tests, NULL, NULL);
}
