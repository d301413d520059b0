/* cmd_check.c - `sinkrate check FILE...`: validate canopy-family, canopy and
 * mission files and the CSV tables (soundings, wind tables, drag tables,
 * flight logs); every problem of each file with its file:line:column, as a
 * compiler lists them, not only the first. */
#include <ctype.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "analysis/band.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "analysis/input_warnings.h"
#include "files/csvtable.h"
#include "files/flightlog.h"
#include "files/mission.h"
#include "files/yamldoc.h"
#include "physics/atmos.h"
#include "physics/bluff.h"
#include "physics/wind.h"
#include "files/sounding.h"
#include "files/windtable.h"
#include "files/dragtable.h"

typedef struct check_opts {
    int unused; /* check takes the output options only */
} check_opts;

static const sr_opt OPTS[] = {SR_OPT_CLI_GROUP(sr_cli_group_output), SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "files", NULL};

static int run_check(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_check = {
    .name = "check",
    .summary = "validate canopy, canopy-family and mission files",
    .usage = "usage: sinkrate check FILE...\n",
    .about = "Validate the files sinkrate reads: canopy families (YAML, top-level 'id'), canopy files (top-level "
             "'canopy') and mission files (top-level 'mission'), and the CSV tables (*.csv) told apart by their "
             "columns: a sounding (altitude, temperature, pressure), a wind table (height or altitude, speed, from), "
             "a drag table (Re, Cd) or a flight log (time and height, altitude or pressure). Every file is checked "
             "and every problem of a file is listed with its file:line:column (a YAML file is read on after a "
             "problem wherever its structure allows; a tab in YAML is named as such). A mission with a start block "
             "and every stage sized is also flown as `sinkrate profile` flies it (every band end, every opening "
             "load), so a file that profile would reject (a descent that cannot be integrated, a supersonic "
             "deployment) is rejected here too. Exit 0 when all are valid, 2 otherwise.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_check,
};

static int check_yaml(const sr_catalog *cat, const char *path, sr_yaml_errors *list, char *kind, size_t klen,
                      char *what, size_t wlen, sr_input_warnings *iw, sr_unit_system sys, sr_error *e)
{
    sr_yaml y;
    int rc = sr_yaml_load_file_all(&y, path, list, e);
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
        sr_mission_release(m);
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

static int has_suffix(const char *path, const char *suffix)
{
    size_t n = strlen(path), k = strlen(suffix);
    return n > k && strcasecmp(path + n - k, suffix) == 0;
}

/* The column names of a CSV table's header, lower case and without their
 * units, to pick the reader (which then parses the whole file with libcsv):
 * a plain split at commas is enough for names. */
static size_t header_names(const char *buf, size_t len, char names[][32], size_t max)
{
    size_t i = 0, n = 0;
    while (i < len) { /* the first line that is neither blank nor a comment */
        size_t j = i;
        while (j < len && (buf[j] == ' ' || buf[j] == '\t' || buf[j] == '\r'))
            j++;
        if (j < len && buf[j] != '\n' && buf[j] != '#')
            break;
        while (i < len && buf[i] != '\n')
            i++;
        i++;
    }
    while (i < len && buf[i] != '\n' && n < max) {
        size_t k = 0;
        int in_unit = 0;
        while (i < len && buf[i] != ',' && buf[i] != '\n') {
            char ch = buf[i++];
            if (ch == '[' || ch == '(')
                in_unit = 1;
            if (!in_unit && ch != '"' && !isspace((unsigned char)ch) && k + 1 < sizeof names[0])
                names[n][k++] = (char)tolower((unsigned char)ch);
        }
        names[n++][k] = '\0';
        if (i < len && buf[i] == ',')
            i++;
    }
    return n;
}

static int has_name(char names[][32], size_t n, const char *name)
{
    for (size_t i = 0; i < n; i++)
        if (strcmp(names[i], name) == 0)
            return 1;
    return 0;
}

/* The kept problems of a file in the order of the file, by their places
 * (insertion sort: a handful). */
static void sort_problems(sr_yaml_errors *l)
{
    for (size_t i = 1; i < l->n; i++)
        for (size_t j = i; j > 0; j--) {
            int a1 = l->line[j - 1], a2 = l->column[j - 1], b1 = l->line[j], b2 = l->column[j];
            if (a1 < b1 || (a1 == b1 && a2 <= b2))
                break;
            char tmp[SR_ERROR_MSG_MAX];
            memcpy(tmp, l->msg[j], sizeof tmp);
            memcpy(l->msg[j], l->msg[j - 1], sizeof tmp);
            memcpy(l->msg[j - 1], tmp, sizeof tmp);
            l->line[j - 1] = b1, l->column[j - 1] = b2, l->line[j] = a1, l->column[j] = a2;
        }
}

/* A CSV table, read by the reader its columns call for. */
static int check_csv(const char *path, char *kind, size_t klen, char *what, size_t wlen, sr_error *e)
{
    char *buf;
    size_t len;
    int rc = sr_csvtable_read_file(path, &buf, &len, e);
    if (rc)
        return rc;
    char names[SR_CSVTABLE_MAX_COLS + 4][32];
    size_t n = header_names(buf, len, names, sizeof names / sizeof names[0]);
    free(buf);
    if (has_name(names, n, "time")) {
        snprintf(kind, klen, "flight log");
        sr_flightlog l;
        if ((rc = sr_flightlog_load(&l, path, 0.0, e)))
            return rc;
        snprintf(what, wlen, "%zu rows over %.1f s, %s", l.n, l.t[l.n - 1] - l.t[0], sr_log_vertical_name(l.vertical));
        sr_flightlog_free(&l);
    } else if (has_name(names, n, "temperature")) {
        snprintf(kind, klen, "sounding");
        sr_atmos a;
        if ((rc = sr_sounding_load(&a, path, e)))
            return rc;
        double lo, hi;
        sr_atmos_range(&a, &lo, &hi);
        snprintf(what, wlen, "%.0f .. %.0f m", lo, hi);
        sr_atmos_release(&a);
    } else if (has_name(names, n, "speed") || has_name(names, n, "from")) {
        snprintf(kind, klen, "wind table");
        sr_wind w;
        if ((rc = sr_windtable_load(&w, path, 0.0, e)))
            return rc;
        snprintf(what, wlen, "%zu rows", w.n);
        sr_wind_release(&w);
    } else if (has_name(names, n, "re") || has_name(names, n, "cd")) {
        snprintf(kind, klen, "drag table");
        sr_bluff_curve cv;
        if ((rc = sr_dragtable_load(&cv, path, SR_BLUFF_LOGLOG, e)))
            return rc;
        snprintf(what, wlen, "Cd over Re");
        sr_bluff_curve_free(&cv);
    } else {
        snprintf(kind, klen, "?");
        return sr_error_set(e, SR_EINVAL,
                            "%s:1:1: not a sinkrate table: expected the columns of a sounding (altitude, temperature, "
                            "pressure), a wind table (height or altitude, speed, from), a drag table (Re, Cd) or a "
                            "flight log (time and height, altitude or pressure)",
                            path);
    }
    return SR_OK;
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
    sr_yaml_errors *list = malloc(sizeof *list);
    if (!list) {
        free(iw);
        sr_report_free(r);
        free(cat);
        return sr_cli_fail(c, "out of memory");
    }
    int problems = 0;
    for (int i = first; i < argc; i++) {
        char kind[32] = "?", what[256] = "";
        sr_error e;
        sr_input_warnings_init(iw);
        list->n = list->more = 0;
        int frc = has_suffix(argv[i], ".csv")
                      ? check_csv(argv[i], kind, sizeof kind, what, sizeof what, &e)
                      : check_yaml(cat, argv[i], list, kind, sizeof kind, what, sizeof what, iw, c->units, &e);
        /* a valid file's plausibility warnings, each named with the file */
        for (size_t k = 0; !frc && k < iw->n; k++)
            sr_report_warning(r, "%s: %s", argv[i], iw->msg[k]);
        if (!frc) {
            char res[600];
            snprintf(res, sizeof res, "ok %s", what);
            const char *row[] = {argv[i], kind, res};
            sr_rtable_row(t, NULL, row);
            continue;
        }
        bad++;
        /* every problem the readers kept, one row and one line each, in the order of the file */
        if (list->n == 0) {
            list->line[0] = list->column[0] = 0;
            snprintf(list->msg[list->n++], sizeof list->msg[0], "%s", e.msg);
        }
        sort_problems(list);
        for (size_t k = 0; k < list->n; k++) {
            char res[SR_ERROR_MSG_MAX + 16];
            snprintf(res, sizeof res, "INVALID: %s", list->msg[k]);
            fprintf(c->err, "sinkrate check: %s\n", list->msg[k]);
            const char *row[] = {argv[i], kind, res};
            sr_rtable_row(t, NULL, row);
            problems++;
        }
        if (list->more) {
            fprintf(c->err, "sinkrate check: %s: %zu more problems not listed\n", argv[i], list->more);
            sr_report_warning(r, "%s: %zu more problems not listed", argv[i], list->more);
        }
    }
    free(list);
    free(iw);
    if (bad)
        sr_report_warning(r, "%d of %d file(s) invalid, %d problem%s in all", bad, argc - first, problems,
                          problems == 1 ? "" : "s");
    rc = sr_cli_emit(c, r);
    if (!rc) /* the report is the product even when a file is invalid: exit 2 writes it */
        c->keep_on_usage = 1;
    sr_report_free(r);
    free(cat);
    return rc ? rc : bad ? SR_EXIT_USAGE : SR_EXIT_OK;
}
