/* cmd_check.c - `sinkrate check FILE...`: validate canopy-family, canopy and
 * mission files; one line per file, the first problem of each bad file with
 * its file:line:column. */
#include <stdlib.h>
#include <string.h>

#include "analysis/band.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "analysis/input_warnings.h"
#include "files/mission.h"
#include "files/yamldoc.h"

typedef struct check_opts {
    int unused; /* check takes the output options only */
} check_opts;

static const sr_opt OPTS[] = {SR_OPT_CLI_GROUP(SR_GROUP_OUTPUT), SR_OPT_END};

static int run_check(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_check = {
    .name = "check",
    .summary = "validate canopy, canopy-family and mission files",
    .usage = "usage: sinkrate check FILE...\n",
    .about = "Validate YAML files of sinkrate: canopy families (top-level 'id'), canopy files (top-level 'canopy') "
             "and mission files (top-level 'mission'). Every file is checked; each bad file is reported with "
             "file:line:column of its first problem. A mission with a start block and every stage sized is also "
             "flown as `sinkrate profile` flies it (every band end, every opening load), so a file that profile "
             "would reject (a descent that cannot be integrated, a supersonic deployment) is rejected here too. "
             "Exit 0 when all are valid, 2 otherwise.",
    .options = OPTS,
    .run = run_check,
};

static int check_one(const sr_catalog *cat, const char *path, char *kind, size_t klen, char *what, size_t wlen,
                     sr_input_warnings *iw, sr_unit_system sys, sr_error *e)
{
    sr_yaml y;
    int rc = sr_yaml_load_file(&y, path, e);
    if (rc)
        return rc;
    yaml_node_t *root = sr_yaml_root(&y);
    if (sr_yaml_get(&y, root, "mission")) {
        snprintf(kind, klen, "mission");
        sr_mission *m = calloc(1, sizeof *m);
        if (!m) {
            sr_yaml_free(&y);
            return sr_error_set(e, SR_ENOMEM, "out of memory");
        }
        sr_atmos_init_standard(&m->atmos);
        m->limit_speed = m->limit_energy = m->limit_time = m->limit_drift = 0.0 / 0.0;
        snprintf(m->path, sizeof m->path, "%s", path);
        rc = sr_mission_parse(m, &y, cat, e);
        int sized = 1;
        for (size_t k = 0; !rc && k < m->nstages; k++)
            sized &= m->stages[k].has_size;
        if (!rc && m->has_start && sized) {
            /* what profile would reject: fly it as profile does */
            sr_band_ctx *bc = NULL;
            sr_band_result *b = malloc(sizeof *b);
            sr_error pe;
            if (!b)
                rc = sr_error_set(e, SR_ENOMEM, "out of memory");
            else if (sr_band_ctx_new(&bc, m, NULL, &pe) || sr_band_run(bc, NULL, SR_PROFILE_FULL, NULL, b, NULL, &pe))
                rc = sr_error_set(e, SR_EINVAL, "%s: `sinkrate profile` would fail: %s", path, pe.msg);
            sr_band_ctx_free(bc);
            free(b);
        }
        if (!rc) {
            snprintf(what, wlen, "'%s': %zu section(s), %zu stage(s)%s", m->name, m->nsections, m->nstages,
                     m->has_start && sized ? ", its descent flies" : "");
            sr_input_warnings_mission(iw, m, NULL, sys);
        }
        sr_mission_free(m);
        free(m);
    } else if (sr_yaml_get(&y, root, "canopy")) {
        snprintf(kind, klen, "canopy");
        sr_canopy cp;
        rc = sr_catalog_parse_canopy(&cp, cat, &y, e);
        if (!rc) {
            snprintf(what, wlen, "%s, nominal diameter %.3g m", cp.fam.id, cp.d0.typ);
            sr_input_warnings_canopy(iw, &cp, "canopy", sys);
        }
    } else if (sr_yaml_get(&y, root, "id")) {
        snprintf(kind, klen, "canopy family");
        sr_family f;
        rc = sr_catalog_parse_family(&f, &y, e);
        if (!rc)
            snprintf(what, wlen, "%s", f.id);
    } else {
        snprintf(kind, klen, "?");
        rc = sr_yaml_fail(&y, root, e,
                          "not a sinkrate file: expected a top-level 'mission', 'canopy' or 'id' (canopy family) key");
    }
    sr_yaml_free(&y);
    return rc;
}

static int run_check(sr_cli *c, int argc, char **argv)
{
    check_opts o = {0};
    int first, rc = sr_cli_parse_options(c, argc, argv, &o, &first);
    if (rc)
        return rc;
    if (first >= argc)
        return sr_cli_fail(c, "give one or more files to check");
    for (int i = first; i < argc; i++)
        if ((rc = sr_cli_input(c, "a file to check", argv[i])))
            return rc;
    sr_catalog *cat;
    if ((rc = sr_cli_catalog(c, &cat)))
        return rc;
    sr_report *r = sr_report_new("check", "file validation");
    sr_rtable *t = sr_report_table(r, "files", NULL);
    sr_rtable_text_column(t, "file", "file");
    sr_rtable_text_column(t, "kind", "kind");
    sr_rtable_text_column(t, "result", "result");
    int bad = 0;
    sr_input_warnings *iw = malloc(sizeof *iw);
    if (!iw) {
        sr_report_free(r);
        free(cat);
        return sr_cli_fail(c, "out of memory");
    }
    for (int i = first; i < argc; i++) {
        char kind[32] = "?", what[256] = "";
        sr_error e;
        sr_input_warnings_init(iw);
        int frc = check_one(cat, argv[i], kind, sizeof kind, what, sizeof what, iw, c->units, &e);
        /* a valid file's plausibility warnings, each named with the file */
        for (size_t k = 0; !frc && k < iw->n; k++)
            sr_report_warning(r, "%s: %s", argv[i], iw->msg[k]);
        char res[600];
        if (frc) {
            bad++;
            fprintf(c->err, "sinkrate check: %s\n", e.msg);
            snprintf(res, sizeof res, "INVALID: %s", e.msg);
        } else {
            snprintf(res, sizeof res, "ok %s", what);
        }
        const char *row[] = {argv[i], kind, res};
        sr_rtable_row(t, NULL, row);
    }
    free(iw);
    if (bad)
        sr_report_warning(r, "%d of %d file(s) invalid", bad, argc - first);
    rc = sr_cli_emit(c, r);
    if (!rc) /* the report is the product even when a file is invalid: exit 2 writes it */
        c->keep_on_usage = 1;
    sr_report_free(r);
    free(cat);
    return rc ? rc : bad ? SR_EXIT_USAGE : SR_EXIT_OK;
}
