/* common.c - option groups, quantity options, catalog lookup and report
 * output shared by every subcommand. */
#define _DEFAULT_SOURCE
#include "cli/common.h"

#include <limits.h>
#include <math.h>
#include <stdarg.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include <dirent.h>

#include "analysis/input_warnings.h"
#include "cli/cliplot.h"
#include "cli/tables.h"
#include "output/fileio.h"
#include "output/txn.h"
#include "output/plot.h"
#include "files/mission.h"
#include "files/yamldoc.h"
#include "files/sounding.h"

/* ---- the shared option groups ---- */

static int take_format(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    if (strcmp(arg, "text") == 0)
        c->format = SR_FMT_TEXT;
    else if (strcmp(arg, "csv") == 0)
        c->format = SR_FMT_CSV;
    else if (strcmp(arg, "json") == 0)
        c->format = SR_FMT_JSON;
    else
        return sr_cli_fail(c, "--format: '%s' is not one of text, csv, json", arg);
    return 0;
}

static int take_units(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    if (strcmp(arg, "si") == 0)
        c->units = SR_UNITS_SI;
    else if (strcmp(arg, "us") == 0)
        c->units = SR_UNITS_US;
    else
        return sr_cli_fail(c, "--units: '%s' is not one of si, us", arg);
    return 0;
}

static int take_table(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    if (!sr_cli_table_known(c->cmd, arg)) {
        char names[512];
        const char *const *t = sr_cli_tables(c->cmd);
        const char *s = t ? sr_yaml_suggest(arg, t) : NULL;
        sr_cli_tables_list(c->cmd, names, sizeof names);
        if (s)
            return sr_cli_fail(c, "--table: %s has no table '%s'; did you mean '%s'?", c->cmd, arg, s);
        return sr_cli_fail(c, "--table: %s has no table '%s' (its tables: %s)", c->cmd, arg, names);
    }
    c->table = arg;
    return 0;
}

static int take_data(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    if (c->ndata >= (int)(sizeof c->data_dirs / sizeof c->data_dirs[0]))
        return sr_cli_fail(c, "--data: at most %d directories", c->ndata);
    c->data_dirs[c->ndata++] = arg;
    return 0;
}

static int take_threads(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    long t = 0;
    int rc = sr_cli_count(c, "--threads", arg, 0, 256, &t);
    if (rc)
        return rc;
    c->threads = (int)t;
    return 0;
}

static int take_seed(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    char *end;
    if (!arg[0] || arg[0] == '-')
        return sr_cli_fail(c, "--seed: '%s' is not a whole number >= 0", arg);
    unsigned long long s = strtoull(arg, &end, 10);
    if (*end || s > 0xffffffffULL)
        return sr_cli_fail(c, "--seed: '%s' is not a whole number from 0 to 4294967295", arg);
    c->seed = (unsigned long)s;
    c->seed_set = 1;
    return 0;
}

const sr_opt sr_cli_group_output[] = {
    SR_OPT_HEADING("Output:"),
    {.type = SR_OPTION_CALL, .name = "format", .value = "text|csv|json", .call = take_format, .flags = SR_OPT_IN_CLI,
     .help = "output format (default text)"},
    {.type = SR_OPTION_CALL, .name = "units", .value = "si|us", .call = take_units, .flags = SR_OPT_IN_CLI,
     .help = "SI (default) or US customary units (ft, lb, ft/s, lbf)"},
    {.type = SR_OPTION_STRING, .short_name = 'o', .name = "output", .value = "FILE", .offset = offsetof(sr_cli, output),
     .flags = SR_OPT_IN_CLI,
     .help = "write to FILE instead of standard output; every file a run writes is put in place only when the "
             "whole run succeeds"},
    {.type = SR_OPTION_CALL, .name = "table", .value = "NAME", .call = take_table, .flags = SR_OPT_IN_CLI,
     .help = "only this table of the output (with the caution and the warnings): one clean table for a "
             "spreadsheet; names below"},
    {.type = SR_OPTION_CALL, .name = "data", .value = "DIR", .call = take_data, .flags = SR_OPT_IN_CLI | SR_OPT_REPEAT,
     .help = "your canopy families (DIR/canopies/*.yaml or DIR/*.yaml) in front of the built-in catalog; "
             "repeatable, the first wins; $SINKRATE_PATH (DIR:DIR...) adds more after them"},
    {.type = SR_OPTION_HELP, .short_name = 'h', .name = "help", .help = "this help"},
    SR_OPT_END};

const sr_opt sr_cli_group_run[] = {
    {.type = SR_OPTION_CALL, .name = "seed", .value = "N", .call = take_seed, .flags = SR_OPT_IN_CLI,
     .help = "seed of the random streams (default 1)"},
    {.type = SR_OPTION_CALL, .name = "threads", .value = "N", .call = take_threads, .flags = SR_OPT_IN_CLI,
     .help = "threads (default 0: all cores)"},
    SR_OPT_END};

const sr_opt sr_cli_group_atmos[] = {
    SR_OPT_HEADING("Atmosphere (default: U.S. Standard Atmosphere 1976):"),
    SR_OPT_STRING("temp-offset", "DT", sr_atmos_opts, temp_offset,
                  "hot or cold day: temperature + DT at standard pressure (\"15 C\")"),
    SR_OPT_STRING("site-elevation", "Z", sr_atmos_opts, site_elevation,
                  "site model: ground elevation above sea level"),
    SR_OPT_STRING("surface-temp", "T", sr_atmos_opts, surface_temp,
                  "site model: measured surface temperature (\"35 C\", \"95 F\")"),
    SR_OPT_STRING("surface-pressure", "P", sr_atmos_opts, surface_pressure,
                  "site model: measured surface (station) pressure (\"850 hPa\")"),
    SR_OPT_STRING("sounding", "FILE", sr_atmos_opts, sounding,
                  "CSV sounding: altitude, temperature, pressure columns with units"),
    SR_OPT_END};

const sr_opt sr_cli_group_canopy[] = {
    SR_OPT_HEADING("Canopy:"),
    SR_OPT_STRING("family", "ID", sr_canopy_opts, family, "catalog family (sinkrate canopies lists them)"),
    SR_OPT_STRING("nominal-diameter", "D", sr_canopy_opts, nominal_diameter,
                  "size as nominal diameter D0 (from S0, vent included)"),
    SR_OPT_STRING("projected-diameter", "D", sr_canopy_opts, projected_diameter,
                  "size as inflated projected diameter Dp (converted by Dp/D0)"),
    SR_OPT_STRING("flat-diameter", "D", sr_canopy_opts, flat_diameter,
                  "size as flat (constructed) diameter Dc (converted by Dc/D0)"),
    SR_OPT_STRING("nominal-area", "S", sr_canopy_opts, nominal_area, "size as nominal area S0"),
    SR_OPT_STRING("drag-coefficient", "CD", sr_canopy_opts, drag_coefficient,
                  "measured drag coefficient instead of the family range, with --drag-reference"),
    SR_OPT_STRING("drag-reference", "REF", sr_canopy_opts, drag_reference,
                  "the reference area of --drag-coefficient: nominal, projected or constructed"),
    SR_OPT_STRING("canopy", "FILE", sr_canopy_opts, canopy,
                  "a canopy file (family, size, measured drag) instead of the above"),
    SR_OPT_STRING("cluster", "N", sr_canopy_opts, cluster, "N identical canopies (default 1)"),
    SR_OPT_STRING("cluster-factor", "K", sr_canopy_opts, cluster_factor,
                  "drag per canopy in the cluster over single (default by N, from memory)"),
    SR_OPT_STRING("areal-mass", "W", sr_canopy_opts, areal_mass,
                  "canopy mass per nominal area (\"40 g/m2\"); its weight then counts"),
    SR_OPT_END};

const sr_opt sr_cli_group_payload[] = {
    SR_OPT_STRING("mass", "M", sr_payload_opts, mass, "payload mass, without the canopy (\"4.2 kg\", \"9 lb\")"),
    SR_OPT_STRING("altitude", "Z", sr_payload_opts, altitude,
                  "altitude above sea level (default: the ground, the site elevation or 0)"),
    SR_OPT_STRING("body-drag-area", "A", sr_payload_opts, body,
                  "payload drag area CdA counted with the canopy's (\"0.02 m2\")"),
    SR_OPT_STRING("mission", "FILE", sr_payload_opts, mission,
                  "mass (all sections), site and canopies from a mission file"),
    SR_OPT_END};

int sr_cli_body_drag(sr_cli *c, const char *text, double *area)
{
    int rc;
    if (text && (rc = sr_cli_quantity(c, "--body-drag-area", text, SR_Q_AREA, 0, area)))
        return rc;
    if (*area < 0)
        return sr_cli_fail(c, "--body-drag-area: must be zero or positive");
    return 0;
}

int sr_cli_fail(sr_cli *c, const char *fmt, ...)
{
    char msg[1024];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    sr_error_printable(msg);
    fprintf(c->err, "sinkrate%s%s: %s\n", c->cmd ? " " : "", c->cmd ? c->cmd : "", msg);
    return SR_EXIT_USAGE;
}

int sr_cli_fail_err(sr_cli *c, const sr_error *e)
{
    sr_cli_fail(c, "%s", e->msg);
    return e->code == SR_EIMPOSSIBLE ? SR_EXIT_LIMIT : SR_EXIT_USAGE;
}

void sr_cli_help(sr_cli *c, const char *text)
{
    fputs(text, c->out);
    fputc('\n', c->out);
    sr_cli_wrap(c->out,
                "Quantities take a unit (\"2.5 kg\", \"36in\", \"18 ft/s\", \"31 C\"); a bare number is SI (kg, m, "
                "m/s, K, Pa), except angles, which are degrees. Under --units us a bare number is refused (0 "
                "excepted): give the unit. Files always need units.",
                0, 0);
    fputc('\n', c->out);
    /* the caution belongs in every help text */
    const char *p = sr_report_caution();
    size_t col = 0;
    while (*p) {
        const char *w = p;
        while (*w && *w != ' ')
            w++;
        size_t wl = (size_t)(w - p);
        if (col + wl + 1 > 78) {
            fputc('\n', c->out);
            col = 0;
        } else if (col) {
            fputc(' ', c->out);
            col++;
        }
        fwrite(p, 1, wl, c->out);
        col += wl;
        p = *w ? w + 1 : w;
    }
    fputc('\n', c->out);
}

/* An example unit for a bare number under --units us: inches for sizes, the
 * US display unit otherwise. */
static const char *us_example_unit(const char *opt, sr_quantity q)
{
    if (q == SR_Q_LENGTH && (strstr(opt, "diameter") || strstr(opt, "length")))
        return "in";
    if (q == SR_Q_PRESSURE)
        return "inHg";
    return sr_units_label(q, SR_UNITS_US);
}

int sr_cli_quantity(sr_cli *c, const char *opt, const char *text, sr_quantity q, int positive, double *out)
{
    sr_error e;
    /* under --units us a bare number would silently be SI (36 read as 36 m, not 36 in): refuse
     * it; angles are degrees in both systems, dimensionless numbers have no unit, and a bare
     * zero is zero in every unit of a quantity without an offset (absolute temperature has one) */
    if (c->units == SR_UNITS_US && q != SR_Q_NONE && q != SR_Q_ANGLE &&
        sr_units_parse_strict(text, q, out, &e) != SR_OK && strcmp(e.key, "unit") == 0 &&
        !(q != SR_Q_TEMP && sr_units_parse(text, q, out, NULL) == SR_OK && *out == 0.0)) {
        char num[64];
        snprintf(num, sizeof num, "%s", text + strspn(text, " \t"));
        num[strcspn(num, " \t")] = '\0';
        return sr_cli_fail(c, "%s: give a unit, e.g. %s%s (under --units us a bare number is not taken as SI)",
                           opt, num, us_example_unit(opt, q));
    }
    if (sr_units_parse(text, q, out, &e) != SR_OK)
        return sr_cli_fail(c, "%s: %s", opt, e.msg);
    if (positive && !(*out > 0.0))
        return sr_cli_fail(c, "%s: must be greater than zero (got '%s')", opt, text);
    return 0;
}

/* A share of samples: "0.01" or "1 %". */
int sr_cli_share(sr_cli *c, const char *opt, const char *text, double *p)
{
    char buf[64];
    size_t len = strlen(text);
    if (len == 0 || len >= sizeof buf)
        return sr_cli_fail(c, "%s: '%s' is not a probability (0.01 or 1 %%)", opt, text);
    memcpy(buf, text, len + 1);
    double scale = 1.0;
    while (len > 0 && buf[len - 1] == ' ')
        buf[--len] = '\0';
    if (len > 0 && buf[len - 1] == '%') {
        buf[--len] = '\0';
        scale = 0.01;
    }
    double v;
    sr_error e;
    if (sr_units_parse(buf, SR_Q_NONE, &v, &e) || !(v * scale >= 0.0 && v * scale <= 1.0))
        return sr_cli_fail(c, "%s: '%s' is not a probability from 0 to 1 (or 0 %% to 100 %%)", opt, text);
    *p = v * scale;
    return 0;
}

int sr_cli_quantity_list(sr_cli *c, const char *opt, const char *text, sr_quantity q, double *out, size_t max,
                         size_t *n)
{
    *n = 0;
    char buf[4096];
    if (strlen(text) >= sizeof buf)
        return sr_cli_fail(c, "%s: list too long", opt);
    snprintf(buf, sizeof buf, "%s", text);
    char *save = NULL;
    for (char *tok = strtok_r(buf, ",", &save); tok; tok = strtok_r(NULL, ",", &save)) {
        if (*n >= max)
            return sr_cli_fail(c, "%s: more than %zu values", opt, max);
        int rc = sr_cli_quantity(c, opt, tok, q, 0, &out[*n]);
        if (rc)
            return rc;
        (*n)++;
    }
    if (*n == 0)
        return sr_cli_fail(c, "%s: empty list", opt);
    return 0;
}

int sr_cli_count(sr_cli *c, const char *opt, const char *text, long lo, long hi, long *out)
{
    char *end;
    long v = strtol(text, &end, 10);
    if (!text[0] || *end || v < lo || v > hi)
        return sr_cli_fail(c, "%s: '%s' is not a whole number from %ld to %ld", opt, text, lo, hi);
    *out = v;
    return 0;
}

int sr_cli_mass(sr_cli *c, const char *text, const char *what, double *mass)
{
    int rc;
    if (text && (rc = sr_cli_quantity(c, "--mass", text, SR_Q_MASS, 1, mass)))
        return rc;
    if (isnan(*mass))
        return sr_cli_fail(c, "--mass: %s is required", what);
    if (*mass > 1e5)
        return sr_cli_fail(c, "--mass: %g kg is beyond any payload this tool is meant for", *mass);
    return 0;
}

int sr_cli_atmos_given(const sr_atmos_opts *a)
{
    return a->temp_offset || a->site_elevation || a->surface_temp || a->surface_pressure || a->sounding;
}

int sr_cli_mission(sr_cli *c, const char *path, const sr_catalog *cat, const sr_atmos_opts *a, sr_mission **mis,
                   sr_atmos *atm, double *ground)
{
    sr_error e;
    *mis = NULL;
    if (!path)
        return sr_cli_atmos(c, a, atm, ground);
    int rc;
    if ((rc = sr_cli_input(c, "the mission file", path)))
        return rc;
    *mis = calloc(1, sizeof **mis);
    if (!*mis)
        return sr_cli_fail(c, "out of memory");
    if (sr_mission_load(*mis, path, cat, &e)) {
        free(*mis);
        *mis = NULL;
        return sr_cli_fail(c, "--mission: %s", e.msg);
    }
    if ((rc = sr_cli_mission_inputs(c, *mis)))
        return rc;
    *ground = (*mis)->ground;
    if (sr_cli_atmos_given(a))
        return sr_cli_atmos(c, a, atm, ground);
    *atm = (*mis)->atmos;
    memset(&(*mis)->atmos, 0, sizeof (*mis)->atmos); /* ownership moves to *atm */
    return 0;
}

void sr_cli_mission_free(sr_mission *mis)
{
    if (mis) {
        sr_mission_release(mis);
        free(mis);
    }
}

int sr_cli_atmos(sr_cli *c, const sr_atmos_opts *a, sr_atmos *m, double *ground)
{
    sr_error e;
    *ground = 0.0;
    sr_atmos_init_standard(m);
    int site = a->site_elevation || a->surface_temp || a->surface_pressure;
    if (a->sounding) {
        if (site || a->temp_offset)
            return sr_cli_fail(c, "--sounding: give either a sounding or the other atmosphere options, not both");
        int rc = sr_cli_input(c, "--sounding", a->sounding);
        if (rc)
            return rc;
        if (sr_sounding_load(m, a->sounding, &e))
            return sr_cli_fail(c, "--sounding: %s", e.msg);
        double lo, hi;
        sr_atmos_range(m, &lo, &hi);
        *ground = lo;
        return 0;
    }
    if (site && a->temp_offset)
        return sr_cli_fail(c, "--temp-offset: use either a temperature offset or the site options "
                              "(--surface-temp sets the site's temperature), not both");
    if (a->temp_offset) {
        double dT;
        int rc = sr_cli_quantity(c, "--temp-offset", a->temp_offset, SR_Q_TEMP_DIFF, 0, &dT);
        if (rc)
            return rc;
        if (sr_atmos_init_offset(m, dT, &e))
            return sr_cli_fail(c, "--temp-offset: %s", e.msg);
        return 0;
    }
    if (site) {
        double z = 0, T = NAN, p = NAN;
        int rc;
        if (a->site_elevation && (rc = sr_cli_quantity(c, "--site-elevation", a->site_elevation, SR_Q_LENGTH, 0, &z)))
            return rc;
        if (a->surface_temp && (rc = sr_cli_quantity(c, "--surface-temp", a->surface_temp, SR_Q_TEMP, 1, &T)))
            return rc;
        if (a->surface_pressure &&
            (rc = sr_cli_quantity(c, "--surface-pressure", a->surface_pressure, SR_Q_PRESSURE, 1, &p)))
            return rc;
        if (sr_atmos_init_site(m, z, T, p, &e))
            return sr_cli_fail(c, "%s: %s",
                               strcmp(e.key, "elevation") == 0     ? "--site-elevation"
                               : strcmp(e.key, "temperature") == 0 ? "--surface-temp"
                                                                   : "--surface-pressure",
                               e.msg);
        *ground = z;
    }
    return 0;
}

static int has_canopies(const char *dir)
{
    char p[PATH_MAX];
    struct stat st;
    snprintf(p, sizeof p, "%s/canopies", dir);
    return stat(p, &st) == 0 && S_ISDIR(st.st_mode);
}

int sr_cli_data_dir(sr_cli *c, char *buf, size_t len)
{
    const char *env = getenv("SINKRATE_DATA");
    if (env && *env) {
        if (!has_canopies(env))
            return sr_cli_fail(c, "SINKRATE_DATA=%s holds no canopies/ directory", env);
        snprintf(buf, len, "%s", env);
        return 0;
    }
    /* next to the executable: the build tree (build/sinkrate -> ./canopies) or an install prefix */
    char exe[PATH_MAX];
    ssize_t n = readlink("/proc/self/exe", exe, sizeof exe - 1);
    if (n > 0) {
        exe[n] = '\0';
        char *slash = strrchr(exe, '/');
        if (slash) {
            *slash = '\0';
            const char *rel[] = {"", "/..", "/../..", "/../share/sinkrate"};
            for (size_t i = 0; i < sizeof rel / sizeof rel[0]; i++) {
                char cand[PATH_MAX + 32];
                snprintf(cand, sizeof cand, "%s%s", exe, rel[i]);
                char real[PATH_MAX];
                if (has_canopies(cand) && realpath(cand, real)) {
                    snprintf(buf, len, "%s", real);
                    return 0;
                }
            }
        }
    }
    if (has_canopies(SR_DATADIR)) {
        snprintf(buf, len, "%s", SR_DATADIR);
        return 0;
    }
    return sr_cli_fail(c, "cannot find the built-in canopy catalog; set SINKRATE_DATA to the directory holding "
                          "canopies/ and plots/");
}

/* A user directory of families: DIR/canopies when it has one, else DIR
 * itself when it holds *.yaml files. 0 and the directory, or an exit code. */
static int user_dir(sr_cli *c, const char *what, const char *dir, char *buf, size_t len)
{
    struct stat st;
    if (has_canopies(dir)) {
        snprintf(buf, len, "%s/canopies", dir);
        return 0;
    }
    if (stat(dir, &st) == 0 && S_ISDIR(st.st_mode)) {
        DIR *d = opendir(dir);
        struct dirent *e;
        int yaml = 0;
        while (d && (e = readdir(d)) != NULL) {
            size_t l = strlen(e->d_name);
            yaml |= l > 5 && strcmp(e->d_name + l - 5, ".yaml") == 0 && e->d_name[0] != '.';
        }
        if (d)
            closedir(d);
        if (yaml) {
            snprintf(buf, len, "%s", dir);
            return 0;
        }
    }
    return sr_cli_fail(c, "%s: %s holds no canopies/ directory and no family files (*.yaml)", what, dir);
}

int sr_cli_catalog(sr_cli *c, sr_catalog **cat)
{
    char dir[PATH_MAX];
    int rc = sr_cli_data_dir(c, dir, sizeof dir - 16);
    if (rc)
        return rc;
    *cat = malloc(sizeof **cat);
    if (!*cat)
        return sr_cli_fail(c, "out of memory");
    char cdir[PATH_MAX + 16];
    snprintf(cdir, sizeof cdir, "%s/canopies", dir);
    sr_error e;
    if (sr_catalog_open(*cat, cdir, &e)) {
        free(*cat);
        *cat = NULL;
        return sr_cli_fail(c, "%s", e.msg);
    }
    /* the user's directories in front, lowest precedence first: $SINKRATE_PATH from its last
     * entry, then --data from the last given; so the first --data wins */
    const char *given[64], *what[64];
    int ng = 0;
    for (int i = 0; i < c->ndata; i++) {
        given[ng] = c->data_dirs[i];
        what[ng++] = "--data";
    }
    char *envcopy = NULL;
    const char *env = getenv("SINKRATE_PATH");
    if (env && *env && (envcopy = strdup(env))) {
        char *save = NULL;
        for (char *t = strtok_r(envcopy, ":", &save); t && ng < 64; t = strtok_r(NULL, ":", &save)) {
            given[ng] = t;
            what[ng++] = "SINKRATE_PATH";
        }
    }
    c->ncatalog_notes = 0;
    for (int i = ng - 1; i >= 0 && !rc; i--) {
        char udir[PATH_MAX + 16], from[PATH_MAX + 32];
        if ((rc = user_dir(c, what[i], given[i], udir, sizeof udir)))
            break;
        snprintf(from, sizeof from, "%s %s", what[i], given[i]);
        if (sr_catalog_add(*cat, udir, from, &e))
            rc = sr_cli_fail(c, "%s", e.msg);
    }
    free(envcopy);
    for (size_t i = 0; i < (*cat)->n && !rc; i++) {
        const sr_catalog_origin *o = &(*cat)->origin[i];
        if (o->replaces[0] && c->ncatalog_notes < 4)
            snprintf(c->catalog_notes[c->ncatalog_notes++], sizeof c->catalog_notes[0],
                     "family '%s' is yours (%s, from %s): it replaces the one in %s", (*cat)->fam[i].id,
                     (*cat)->fam[i].file, o->from, o->replaces);
        rc = sr_cli_input(c, "a canopy family file of the catalog", (*cat)->fam[i].file);
    }
    if (rc) {
        free(*cat);
        *cat = NULL;
    }
    return rc;
}

int sr_cli_canopy_given(const sr_canopy_opts *o)
{
    return o->family || o->canopy;
}

int sr_cli_canopy(sr_cli *c, const sr_catalog *cat, const sr_canopy_opts *o, int size_required, sr_canopy *out)
{
    sr_error e;
    int rc;
    if (o->canopy) {
        if (o->family || o->nominal_diameter || o->projected_diameter || o->flat_diameter || o->nominal_area ||
            o->drag_coefficient)
            return sr_cli_fail(c, "--canopy: the canopy file already gives family, size and drag; drop the "
                                  "--family / size / --drag-coefficient options");
        if ((rc = sr_cli_input(c, "--canopy", o->canopy)))
            return rc;
        if (sr_catalog_load_canopy(out, cat, o->canopy, &e))
            return sr_cli_fail(c, "--canopy: %s", e.msg);
    } else {
        if (!o->family)
            return sr_cli_fail(c, "--family: a canopy family is required (or --canopy FILE); sinkrate canopies "
                                  "lists the families");
        const sr_family *fam = sr_catalog_find(cat, o->family, &e);
        if (!fam)
            return sr_cli_fail(c, "--family: %s", e.msg);
        const char *names[4] = {"--nominal-diameter", "--projected-diameter", "--flat-diameter", "--nominal-area"};
        const char *vals[4] = {o->nominal_diameter, o->projected_diameter, o->flat_diameter, o->nominal_area};
        int which = -1;
        for (int i = 0; i < 4; i++) {
            if (!vals[i])
                continue;
            if (which >= 0)
                return sr_cli_fail(c, "%s: give one size only (%s is also set)", names[i], names[which]);
            which = i;
        }
        if (which < 0) {
            if (size_required)
                return sr_cli_fail(c, "the canopy needs a size: --nominal-diameter, --projected-diameter, "
                                      "--flat-diameter or --nominal-area");
            sr_canopy_from_size(out, fam, SR_SIZE_NOMINAL_AREA, 1.0, &e);
        } else {
            double v;
            if ((rc = sr_cli_quantity(c, names[which], vals[which], which == 3 ? SR_Q_AREA : SR_Q_LENGTH, 1, &v)))
                return rc;
            if (sr_canopy_from_size(out, fam, (sr_size_kind)which, v, &e))
                return sr_cli_fail(c, "%s: %s", names[which], e.msg);
        }
        if (o->drag_coefficient || o->drag_reference) {
            if (!o->drag_coefficient || !o->drag_reference)
                return sr_cli_fail(c, "--drag-coefficient and --drag-reference go together: a drag coefficient "
                                      "means nothing without its reference area");
            double cd;
            sr_ref ref;
            if ((rc = sr_cli_quantity(c, "--drag-coefficient", o->drag_coefficient, SR_Q_NONE, 1, &cd)))
                return rc;
            if (sr_ref_parse(o->drag_reference, &ref))
                return sr_cli_fail(c, "--drag-reference: '%s' is not one of nominal, projected, constructed",
                                   o->drag_reference);
            if (sr_canopy_set_measured_cd(out, cd, ref, "given with --drag-coefficient", &e))
                return sr_cli_fail(c, "--drag-coefficient: %s", e.msg);
        }
    }
    if (o->cluster || o->cluster_factor) {
        long n = out->count;
        double k = NAN;
        if (o->cluster && (rc = sr_cli_count(c, "--cluster", o->cluster, 1, 16, &n)))
            return rc;
        if (o->cluster_factor && (rc = sr_cli_quantity(c, "--cluster-factor", o->cluster_factor, SR_Q_NONE, 1, &k)))
            return rc;
        if (sr_canopy_set_cluster(out, (int)n, k, &e))
            return sr_cli_fail(c, "%s: %s", o->cluster_factor ? "--cluster-factor" : "--cluster", e.msg);
    }
    if (o->areal_mass) {
        double w;
        if ((rc = sr_cli_quantity(c, "--areal-mass", o->areal_mass, SR_Q_AREAL_MASS, 1, &w)))
            return rc;
        if (w > 2.0)
            return sr_cli_fail(c, "--areal-mass: %g kg/m2 is heavier than any canopy cloth; check the unit", w);
        out->areal_mass = w;
    }
    return 0;
}

void sr_cli_report_canopy(sr_report *r, const sr_canopy *cp)
{
    char buf[512];
    snprintf(buf, sizeof buf, "%s (%s)", cp->fam.name, cp->fam.id);
    sr_report_text(r, "family", "canopy family", buf);
    if (cp->measured) {
        snprintf(buf, sizeof buf, "%.4g on %s area (%s)", cp->cd.v.typ, sr_ref_name(cp->cd.ref), cp->cd_source);
        sr_report_text(r, "drag_coefficient", "drag coefficient", buf);
    } else {
        snprintf(buf, sizeof buf, "%.3g / %.3g / %.3g on nominal area S0", cp->fam.cd0.v.lo, cp->fam.cd0.v.typ,
                 cp->fam.cd0.v.hi);
        sr_report_text(r, "drag_coefficient", "drag coefficient CD0", buf);
    }
    if (cp->count > 1) {
        snprintf(buf, sizeof buf, "%d canopies, drag factor %.2f each", cp->count, cp->cluster_factor);
        sr_report_text(r, "cluster", "cluster", buf);
    }
}

void sr_cli_report_atmos(sr_report *r, const sr_atmos *m)
{
    char buf[512];
    switch (m->kind) {
    case SR_ATMOS_SITE: {
        /* say what the model does with what was given; values as values, so they follow --units */
        int T = m->site_measured & SR_ATMOS_MEASURED_T, P = m->site_measured & SR_ATMOS_MEASURED_P;
        sr_report_text(r, "atmosphere", "atmosphere",
                       T && P ? "site model: measured surface temperature and pressure, 1976 standard lapse above, "
                                "hydrostatic pressure"
                       : T    ? "site model: measured surface temperature, the standard pressure of the elevation, "
                                "1976 standard lapse above, hydrostatic pressure"
                       : P    ? "site model: measured surface pressure, the standard temperature of the elevation, "
                                "1976 standard lapse above, hydrostatic pressure"
                              : "U.S. Standard Atmosphere 1976 unchanged, with the ground at the site elevation (no "
                                "measured surface values)");
        sr_report_value(r, "site_elevation", "site elevation", m->site_z, SR_Q_LENGTH, SR_FIXED(0));
        sr_report_value(r, "surface_temperature", T ? "surface temperature" : "surface temperature (standard)",
                        m->site_T, SR_Q_TEMP, SR_FIXED(1));
        if (T)
            sr_report_value(r, "temperature_offset", "difference to standard", m->dT, SR_Q_TEMP_DIFF, 3);
        sr_report_value(r, "surface_pressure", P ? "surface pressure" : "surface pressure (standard)", m->site_p,
                        SR_Q_PRESSURE, 5);
        break;
    }
    case SR_ATMOS_OFFSET:
        sr_report_text(r, "atmosphere", "atmosphere", "U.S. Standard Atmosphere 1976, offset temperature at "
                                                      "standard pressure");
        sr_report_value(r, "temperature_offset", "temperature offset", m->dT, SR_Q_TEMP_DIFF, 3);
        break;
    default:
        sr_atmos_describe(m, buf, sizeof buf);
        sr_report_text(r, "atmosphere", "atmosphere", buf);
    }
}

void sr_cli_atmos_short(const sr_atmos *m, sr_unit_system sys, char *buf, size_t len)
{
    char z[48], p[48];
    switch (m->kind) {
    case SR_ATMOS_STANDARD:
        snprintf(buf, len, "U.S. Standard Atmosphere 1976");
        break;
    case SR_ATMOS_OFFSET:
        snprintf(buf, len, "standard atmosphere %+.0f K", m->dT);
        break;
    case SR_ATMOS_SITE: {
        sr_report_format_value(z, sizeof z, m->site_z, SR_Q_LENGTH, sys, SR_FIXED(0));
        if (!m->site_measured) {
            snprintf(buf, len, "U.S. Standard Atmosphere 1976, ground at %s", z);
            break;
        }
        double T = sys == SR_UNITS_US ? (m->site_T - 273.15) * 1.8 + 32.0 : m->site_T - 273.15;
        /* one pressure unit per output: the tables' (Pa, psf under US) */
        sr_report_format_value(p, sizeof p, m->site_p, SR_Q_PRESSURE, sys, 4);
        snprintf(buf, len, "site %s, %.1f %s, %s", z, T, sys == SR_UNITS_US ? "\u00b0F" : "\u00b0C", p);
        break;
    }
    case SR_ATMOS_SOUNDING: {
        const char *b = strrchr(m->source, '/');
        snprintf(buf, len, "sounding %s", b ? b + 1 : m->source);
        break;
    }
    default:
        snprintf(buf, len, "atmosphere");
    }
}

int sr_cli_output(sr_cli *c, const char *opt, const char *path)
{
    sr_error e;
    if (sr_txn_reserve(c->txn, opt, path, 0, &e))
        return sr_cli_fail(c, "%s", e.msg);
    return 0;
}

int sr_cli_input(sr_cli *c, const char *what, const char *path)
{
    sr_error e;
    if (sr_txn_input(c->txn, what, path, &e))
        return sr_cli_fail(c, "%s", e.msg);
    return 0;
}

int sr_cli_mission_inputs(sr_cli *c, const sr_mission *m)
{
    int rc = sr_cli_input(c, "the mission file", m->path);
    if (!rc && m->atmos.kind == SR_ATMOS_SOUNDING)
        rc = sr_cli_input(c, "the mission's sounding", m->atmos.source);
    if (!rc && m->wind.source[0])
        rc = sr_cli_input(c, "the mission's wind table", m->wind.source);
    for (size_t k = 0; k < m->nstages && !rc; k++)
        if (m->stages[k].file[0])
            rc = sr_cli_input(c, "a canopy file of the mission", m->stages[k].file);
    for (size_t k = 0; k < m->nsections && !rc; k++)
        if (m->sections[k].has_body && m->sections[k].curve.path[0])
            rc = sr_cli_input(c, "a drag table of the mission", m->sections[k].curve.path);
    return rc;
}

void sr_cli_note(sr_cli *c, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    if (c->notes) {
        fprintf(c->notes, "sinkrate %s: ", c->cmd ? c->cmd : "");
        vfprintf(c->notes, fmt, ap);
        fputc('\n', c->notes);
    }
    va_end(ap);
}

int sr_cli_emit(sr_cli *c, sr_report *r)
{
    /* a family of the user's replacing a built-in one is said wherever the catalog was used */
    for (int i = 0; i < c->ncatalog_notes; i++)
        sr_report_note(r, "%s", c->catalog_notes[i]);
    c->ncatalog_notes = 0;
    /* an infinite number is no result: the inputs were outside what the models hold */
    const char *inf = sr_report_infinite(r);
    if (inf) {
        char inputs[1024];
        sr_txn_inputs(c->txn, inputs, sizeof inputs);
        return sr_cli_fail(c, "'%s' came out infinite: %s is outside what the models hold; check %s", inf,
                           inputs[0] ? "an input" : "a value given", inputs[0] ? inputs : "the options");
    }
    char *buf = NULL;
    size_t len = 0;
    FILE *mem = open_memstream(&buf, &len);
    if (!mem)
        return sr_cli_fail(c, "out of memory");
    sr_error e;
    static const sr_report_format F[] = {SR_REPORT_TEXT, SR_REPORT_CSV, SR_REPORT_JSON};
    int rc = sr_report_write_part(r, mem, F[c->format], c->units, c->table, &e);
    fclose(mem);
    if (rc) {
        free(buf);
        return sr_cli_fail(c, "%s%s", c->table ? "--table: " : "", e.msg);
    }
    if (c->output) {
        rc = sr_txn_write(c->txn, c->output, buf, len, &e);
        free(buf);
        if (rc)
            return sr_cli_fail(c, "%s", e.msg);
        return 0;
    }
    fwrite(buf, 1, len, c->out);
    free(buf);
    return 0;
}

void sr_cli_report_input_warnings(sr_report *r, const sr_input_warnings *w)
{
    for (size_t i = 0; i < w->n; i++) /* a sentence starts with a capital, as the other warnings do */
        sr_report_warning(r, "%c%s", w->msg[i][0] >= 'a' && w->msg[i][0] <= 'z' ? w->msg[i][0] - 'a' + 'A'
                                                                                  : w->msg[i][0],
                          w->msg[i][0] ? w->msg[i] + 1 : "");
}
