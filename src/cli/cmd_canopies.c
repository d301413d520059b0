/* cmd_canopies.c - `sinkrate canopies [ID | --models]`: the catalog as a table,
 * one family with every value, its source and its outside-check status, or
 * the models behind the numbers with theirs. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"
#include "physics/provenance.h"

typedef struct canopies_opts {
    int models;
} canopies_opts;

static const sr_opt OPTS[] = {
    SR_OPT_FLAG("models", canopies_opts, models,
                "the models behind the numbers that are not catalog values (growth exponents, cluster factors, the "
                "X1 envelope, ...) with their sources and outside checks"),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "families", NULL};

static int run_canopies(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_canopies = {
    .name = "canopies",
    .summary = "list the canopy catalog, or show one family with its sources",
    .usage = "usage: sinkrate canopies [ID | --models]\n",
    .about = "Without ID: every canopy family of the catalog with its drag-coefficient range (on nominal area), "
             "diameter ratios, opening-load factor, filling constant, Mach limit of its usual application, and how "
             "many of its values a source outside the project has checked. With ID: one family, every value with "
             "its source and its outside check (none yet, or what checked it) and the publication that would check "
             "it. docs/validation.md lists the same.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_canopies,
};

#define DEG (180.0 / 3.14159265358979323846)

static void band_line(sr_report *r, const char *key, const char *label, sr_band b, const char *src)
{
    char buf[600];
    snprintf(buf, sizeof buf, "%.3g / %.3g / %.3g   [%s]", b.lo, b.typ, b.hi, src);
    sr_report_text(r, key, label, buf);
}

/* The JSON key of a family value: its YAML key in snake case. */
static void value_key(char *buf, size_t len, const char *yaml_key, const char *suffix)
{
    snprintf(buf, len, "%s%s", yaml_key, suffix);
    for (char *p = buf; *p; p++)
        if (*p == '-')
            *p = '_';
}

static void check_lines(sr_report *r, const char *yaml_key, const char *label, const char *outside,
                        const char *to_check)
{
    char key[96];
    value_key(key, sizeof key, yaml_key, "_outside_check");
    sr_report_text(r, key, label, outside);
    value_key(key, sizeof key, yaml_key, "_to_check");
    sr_report_text(r, key, "  would be checked by", to_check[0] ? to_check : "(not named)");
}

static int has_value(const sr_family *f, int v)
{
    if (v == SR_FV_GROWTH)
        return f->growth_given;
    return v != SR_FV_AREAL || !isnan(f->areal_mass);
}

static sr_report *family_report(const sr_family *f, const sr_catalog_origin *o)
{
    char title[160], buf[600];
    snprintf(title, sizeof title, "canopy family %s", f->id);
    sr_report *r = sr_report_new("canopies", title);
    sr_report_section(r, f->name);
    sr_report_text(r, "id", "id", f->id);
    sr_report_text(r, "class", "class (filling)", f->cls);
    sr_report_text(r, "file", "file", f->file);
    snprintf(buf, sizeof buf, "%s%s%s", o->from, o->replaces[0] ? "; replaces " : "", o->replaces);
    sr_report_text(r, "origin", "from", buf);
    band_line(r, "drag_coefficient", "CD0 on nominal area", f->cd0.v, f->cd0_source);
    band_line(r, "projected_ratio", "Dp/D0", f->dp_d0, f->dp_source);
    band_line(r, "constructed_ratio", "Dc/D0", f->dc_d0, f->dc_source);
    band_line(r, "opening_factor", "opening-load factor CX", f->cx, f->cx_source);
    snprintf(buf, sizeof buf, "%.3g   [%s]", f->fill_n, f->fill_source);
    sr_report_text(r, "filling_constant", "filling constant n", buf);
    snprintf(buf, sizeof buf, "%.0f to %.0f deg   [%s]", f->oscillation.lo * DEG, f->oscillation.hi * DEG,
             f->osc_source);
    sr_report_text(r, "oscillation", "oscillation", buf);
    snprintf(buf, sizeof buf, "%.2g   [%s]", f->mach_max, f->mach_source);
    sr_report_text(r, "mach_limit", "Mach limit of usual use", buf);
    if (!isnan(f->areal_mass)) {
        snprintf(buf, sizeof buf, "%.0f g/m2   [%s]", f->areal_mass * 1e3, f->areal_source);
        sr_report_text(r, "areal_mass", "areal mass", buf);
    }
    /* the growth exponent: the file's band, or the class's (physics/provenance.h) */
    const sr_provenance *g = f->growth_given ? NULL : sr_provenance_growth(f->cls);
    if (f->growth_given) {
        band_line(r, "growth_exponent", "growth exponent n", f->growth, f->growth_source);
    } else if (g) {
        char v[96];
        sr_provenance_value(g, v, sizeof v);
        snprintf(buf, sizeof buf, "%s   [%s]", v, g->source);
        snprintf(title, sizeof title, "growth exponent (%s filling)", f->cls);
        sr_report_text(r, "growth_exponent", title, buf);
    }
    snprintf(buf, sizeof buf, "%.3g / %.3g / %.3g", sr_canopy_cd_on(f, f->cd0.v.lo, SR_REF_PROJECTED),
             sr_canopy_cd_on(f, f->cd0.v.typ, SR_REF_PROJECTED), sr_canopy_cd_on(f, f->cd0.v.hi, SR_REF_PROJECTED));
    sr_report_text(r, "cd_projected", "same drag on projected area", buf);

    sr_report_section(r, "Outside checks (none: nothing outside the project has checked it yet)");
    for (int v = 0; v < SR_FV_COUNT_; v++)
        if (has_value(f, v))
            check_lines(r, sr_family_value_key(v), sr_family_value_label(v), f->check[v].outside,
                        f->check[v].to_check);
    if (g) {
        snprintf(title, sizeof title, "growth exponent (%s filling)", f->cls);
        check_lines(r, "growth-exponent", title, g->outside, g->to_check);
    }
    if (f->notes[0])
        sr_report_note(r, "%s", f->notes);
    sr_report_note(r, "The projected-area coefficient is CD0 (D0/Dp)^2 at the typical ratio: the same drag, "
                      "quoted on a smaller area. Never mix the two when sizing.");
    return r;
}

/* Values of a family with an outside check, and all of them. */
static void count_checked(const sr_family *f, int *checked, int *all)
{
    *checked = *all = 0;
    for (int v = 0; v < SR_FV_COUNT_; v++)
        if (has_value(f, v)) {
            (*all)++;
            *checked += strcmp(f->check[v].outside, "none") != 0;
        }
    const sr_provenance *g = f->growth_given ? NULL : sr_provenance_growth(f->cls);
    if (g) {
        (*all)++;
        *checked += strcmp(g->outside, "none") != 0;
    }
}

static sr_report *catalog_report(const sr_catalog *cat)
{
    sr_report *r = sr_report_new("canopies", "canopy catalog");
    sr_rtable *t = sr_report_table(r, "families", NULL);
    sr_rtable_text_column(t, "id", "id");
    sr_rtable_text_column(t, "name", "name");
    sr_rtable_text_column(t, "class", "class");
    sr_rtable_column(t, "cd0_low", "CD0 low", SR_Q_NONE, 2);
    sr_rtable_column(t, "cd0_typical", "typ", SR_Q_NONE, 3);
    sr_rtable_column(t, "cd0_high", "high", SR_Q_NONE, 2);
    sr_rtable_column(t, "dp_d0", "Dp/D0", SR_Q_NONE, 2);
    sr_rtable_column(t, "dc_d0", "Dc/D0", SR_Q_NONE, 2);
    sr_rtable_column(t, "opening_factor", "CX", SR_Q_NONE, 3);
    sr_rtable_column(t, "filling_constant", "fill n", SR_Q_NONE, 3);
    sr_rtable_column(t, "mach_limit", "Mach max", SR_Q_NONE, 2);
    sr_rtable_text_column(t, "outside_checks", "checked");
    sr_rtable_text_column(t, "origin", "from");
    int total_checked = 0, total = 0;
    for (size_t i = 0; i < cat->n; i++) {
        const sr_family *f = &cat->fam[i];
        double row[] = {f->cd0.v.lo, f->cd0.v.typ, f->cd0.v.hi, f->dp_d0.typ, f->dc_d0.typ,
                        f->cx.typ,   f->fill_n,    f->mach_max};
        int checked, all;
        count_checked(f, &checked, &all);
        total_checked += checked;
        total += all;
        char chk[32];
        snprintf(chk, sizeof chk, "%d of %d", checked, all);
        char from[600];
        snprintf(from, sizeof from, "%s%s", cat->origin[i].from, cat->origin[i].replaces[0] ? ", replaces built-in" : "");
        const char *txt[] = {f->id, f->name, f->cls, chk, from};
        sr_rtable_row(t, row, txt);
    }
    sr_report_note(r, "CD0 is on nominal area S0. Most values are recalled handbook figures (Knacke 1991, NWC "
                      "TP 6575, Tables 5-1 and 5-2), marked so in each file; `sinkrate canopies ID` shows "
                      "the source of every value.");
    sr_report_note(r, "checked: values (with the class's growth exponent) that a source outside the project has "
                      "checked; %d of %d in all. `sinkrate canopies ID` names the publication that would check "
                      "each of the others; `sinkrate canopies --models` lists the models.",
                   total_checked, total);
    return r;
}

static sr_report *models_report(void)
{
    sr_report *r = sr_report_new("canopies", "models behind the numbers");
    size_t n;
    const sr_provenance *m = sr_provenance_models(&n);
    sr_rtable *t = sr_report_table(r, "models", NULL);
    sr_rtable_text_column(t, "model", "model");
    sr_rtable_text_column(t, "what", "what it is");
    sr_rtable_text_column(t, "checked", "checked");
    for (size_t i = 0; i < n; i++) {
        const char *txt[] = {m[i].id, m[i].name, strcmp(m[i].outside, "none") ? "yes" : "no"};
        sr_rtable_row(t, NULL, txt);
    }
    for (size_t i = 0; i < n; i++) {
        char v[160], key[96];
        sr_report_section(r, m[i].id);
        sr_provenance_value(&m[i], v, sizeof v);
        value_key(key, sizeof key, m[i].id, "_value");
        sr_report_text(r, key, "value", v);
        value_key(key, sizeof key, m[i].id, "_source");
        sr_report_text(r, key, "source", m[i].source);
        value_key(key, sizeof key, m[i].id, "_outside_check");
        sr_report_text(r, key, "outside check", m[i].outside);
        value_key(key, sizeof key, m[i].id, "_to_check");
        sr_report_text(r, key, "would be checked by", m[i].to_check);
    }
    sr_report_note(r, "outside check none: nothing outside the project has checked the model yet; "
                      "docs/validation.md lists the same.");
    return r;
}

static int run_canopies(sr_cli *c, int argc, char **argv)
{
    canopies_opts o = {0};
    int first, rc = sr_cli_parse_options(c, argc, argv, &o, &first);
    int models = o.models;
    if (rc)
        return rc;
    if (argc - first > 1)
        return sr_cli_fail(c, "give at most one family id");
    if (models && first < argc)
        return sr_cli_fail(c, "--models lists the models of every family: give no family id with it");
    sr_report *r;
    if (models) {
        r = models_report();
    } else {
        sr_catalog *cat;
        if ((rc = sr_cli_catalog(c, &cat)))
            return rc;
        if (first < argc) {
            sr_error e;
            const sr_family *f = sr_catalog_find(cat, argv[first], &e);
            if (!f) {
                free(cat);
                return sr_cli_fail(c, "%s", e.msg);
            }
            r = family_report(f, &cat->origin[f - cat->fam]);
        } else {
            r = catalog_report(cat);
        }
        free(cat);
    }
    rc = sr_cli_emit(c, r);
    sr_report_free(r);
    return rc;
}
