/* cmd_canopies.c - `sinkrate canopies [ID]`: the catalog as a table, or one
 * family with every value and its source. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"

static const struct option OPTS[] = {SR_OPTS_OUTPUT, {NULL, 0, NULL, 0}};

static const char HELP[] =
    "usage: sinkrate canopies [ID]\n\n"
    "Without ID: every canopy family of the catalog with its drag-coefficient range\n"
    "(on nominal area), diameter ratios, opening-load factor, filling constant and\n"
    "Mach limit of its usual application. With ID: one family, every value with its\n"
    "source.\n\n";

#define DEG (180.0 / 3.14159265358979323846)

static void band_line(sr_report *r, const char *key, const char *label, sr_band b, const char *src)
{
    char buf[600];
    snprintf(buf, sizeof buf, "%.3g / %.3g / %.3g   [%s]", b.lo, b.typ, b.hi, src);
    sr_report_text(r, key, label, buf);
}

int sr_cmd_canopies(sr_cli *c, int argc, char **argv)
{
    int first, rc = sr_cli_parse(c, argc, argv, OPTS, NULL, NULL, HELP, &first);
    if (rc)
        return rc;
    if (argc - first > 1)
        return sr_cli_fail(c, "give at most one family id");
    sr_catalog *cat;
    if ((rc = sr_cli_catalog(c, &cat)))
        return rc;
    sr_report *r;
    if (first < argc) {
        sr_error e;
        const sr_family *f = sr_catalog_find(cat, argv[first], &e);
        if (!f) {
            free(cat);
            return sr_cli_fail(c, "%s", e.msg);
        }
        char title[160], buf[600];
        snprintf(title, sizeof title, "canopy family %s", f->id);
        r = sr_report_new("canopies", title);
        sr_report_section(r, f->name);
        sr_report_text(r, "id", "id", f->id);
        sr_report_text(r, "class", "class (filling)", f->cls);
        sr_report_text(r, "file", "file", f->file);
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
        snprintf(buf, sizeof buf, "%.3g / %.3g / %.3g", sr_canopy_cd_on(f, f->cd0.v.lo, SR_REF_PROJECTED),
                 sr_canopy_cd_on(f, f->cd0.v.typ, SR_REF_PROJECTED), sr_canopy_cd_on(f, f->cd0.v.hi, SR_REF_PROJECTED));
        sr_report_text(r, "cd_projected", "same drag on projected area", buf);
        if (f->notes[0])
            sr_report_note(r, "%s", f->notes);
        sr_report_note(r, "The projected-area coefficient is CD0 (D0/Dp)^2 at the typical ratio: the same drag, "
                          "quoted on a smaller area. Never mix the two when sizing.");
    } else {
        r = sr_report_new("canopies", "canopy catalog");
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
        for (size_t i = 0; i < cat->n; i++) {
            const sr_family *f = &cat->fam[i];
            double row[] = {f->cd0.v.lo, f->cd0.v.typ, f->cd0.v.hi, f->dp_d0.typ, f->dc_d0.typ,
                            f->cx.typ,   f->fill_n,    f->mach_max};
            const char *txt[] = {f->id, f->name, f->cls};
            sr_rtable_row(t, row, txt);
        }
        sr_report_note(r, "CD0 is on nominal area S0. Most values are recalled handbook figures (Knacke 1991, NWC "
                          "TP 6575, Tables 5-1 and 5-2), marked so in each file; `sinkrate canopies ID` shows "
                          "the source of every value.");
    }
    rc = sr_cli_emit(c, r);
    sr_report_free(r);
    free(cat);
    return rc;
}
