/* cmd_fit.c - `sinkrate fit LOG...`: the drag area of each canopy from
 * altimeter logs, with its interval and the catalog band; the segments, the
 * opening, the wind; several flights pooled; a canopy file and a wind table
 * back into the tool. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "analysis/fit.h"
#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "output/txn.h"
#include "cli/fit_plot.h"
#include "files/flightlog.h"
#include "files/mission.h"
#include "output/fileio.h"
#include "physics/opening.h"

#define MAX_LOGS 16

typedef struct fit_opts {
    const char *names, *events, *times, *max_gap, *conf, *write_canopy, *stage, *write_wind;
    int pressure_alt;
    sr_payload_opts payload;
    sr_canopy_opts canopy;
    sr_atmos_opts atmos;
} fit_opts;

static const sr_opt OPTS[] = {
    SR_OPT_GROUP(sr_cli_group_payload, fit_opts, payload),
    SR_OPT_WITHOUT("altitude"),
    SR_OPT_WITHOUT("body-drag-area"),
    SR_OPT_FOR("mission", "FILE", "site weather, masses, canopies, stage names and deployment events from a mission "
                                  "file"),
    SR_OPT_FOR("mass", "M", "without a mission: the mass under every stage"),
    SR_OPT_STRING("stage-names", "A,B", fit_opts, names,
                  "without a mission: names of the stages (default stage 1, ...); the canopy options describe the "
                  "LAST stage's canopy"),
    SR_OPT_FLAG("pressure-altitude", fit_opts, pressure_alt,
                "the height or altitude column is a pressure altitude by the 1976 standard (as barometric altimeters "
                "log it): convert it back to pressure, then to true height in the site's air"),
    SR_OPT_STRING("events", "detect|mission", fit_opts, events,
                  "deployments from the descent rate (default) or from the mission's events (apogee, height, delay) "
                  "on the log"),
    SR_OPT_STRING("deploy-times", "T,...", fit_opts, times,
                  "the deployment time of each stage in the log's clock ('apogee' for a stage deployed there)"),
    SR_OPT_STRING("max-gap", "T", fit_opts, max_gap,
                  "longest step between rows taken as a dropout (default the larger of 1 s and 10 steps); a longer "
                  "one is an error"),
    SR_OPT_STRING("confidence", "P", fit_opts, conf, "confidence level of the intervals (default 95 %)"),
    SR_OPT_STRING("write-canopy", "FILE", fit_opts, write_canopy,
                  "a canopy file of one stage's canopy with the measured drag coefficient, its interval as the band "
                  "and the source"),
    SR_OPT_STRING("stage", "NAME", fit_opts, stage, "the stage --write-canopy writes (default the last)"),
    SR_OPT_STRING("write-wind", "FILE", fit_opts, write_wind,
                  "the drift under the canopies by height, as a wind table (needs positions in the log)"),
    SR_OPT_TEXT("Exit 1 when a fit does not converge or its interval is unbounded (no number then)."),
    SR_OPT_GROUP(sr_cli_group_canopy, fit_opts, canopy),
    SR_OPT_GROUP(sr_cli_group_atmos, fit_opts, atmos),
    SR_OPT_CLI_GROUP(sr_cli_group_plot),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "segments", "windows", "drag", "rates", "opening", "wind", "pooled", NULL};

static int run_fit(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_fit = {
    .name = "fit",
    .summary = "drag area of each canopy from flight logs, with an interval, into a canopy file",
    .usage = "usage: sinkrate fit LOG [LOG...] --mission FILE [options]\n"
             "       sinkrate fit LOG [LOG...] --mass M [--family ID --nominal-diameter D] [options]\n",
    .about = "The drag area CdS of each canopy from altimeter logs: the segments (apogee, each deployment, "
             "touchdown) from the change points of the descent rate, then per stage a robust nonlinear least-squares "
             "fit of the steady descent to the measured height, in the site's air, with the mass under that canopy, "
             "and a 95 % confidence interval (Jacobian and residual variance, corrected for correlated residuals). "
             "Points more than 5 robust standard deviations off the fit (spikes, dropouts) are dropped. With a "
             "canopy known, the drag coefficient on nominal area and whether it sits inside the family's catalog "
             "band. With an acceleration column, each opening: its peak force, and the growth exponent, filling "
             "time and load factor of the opening model of `loads` fitted to the force history, beside what "
             "`loads` predicts. Several logs of the same stages are pooled.\n"
             "\n"
             "A log is a CSV table with a header naming each column and its unit: time, and height (above ground) "
             "or altitude (above sea level) or pressure; optional acceleration (along the vehicle axis), east and "
             "north, or latitude and longitude.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_fit,
};

/* a name list "a,b" into names (strdup'ed into store) */
static int split_names(sr_cli *c, const char *text, char store[][SR_NAME_MAX], size_t max, size_t *n)
{
    *n = 0;
    const char *p = text;
    while (*p) {
        const char *q = strchr(p, ',');
        size_t len = q ? (size_t)(q - p) : strlen(p);
        if (len == 0 || len >= SR_NAME_MAX)
            return sr_cli_fail(c, "--stage-names: '%s' needs names of 1 to %d characters, separated by commas", text,
                               SR_NAME_MAX - 1);
        if (*n >= max)
            return sr_cli_fail(c, "--stage-names: at most %zu stages", max);
        memcpy(store[*n], p, len);
        store[*n][len] = '\0';
        (*n)++;
        p = q ? q + 1 : p + len;
        if (q && !*p)
            return sr_cli_fail(c, "--stage-names: '%s' ends with a comma", text);
    }
    return 0;
}

static int parse_times(sr_cli *c, const char *text, double *t, size_t max, size_t *n)
{
    *n = 0;
    char buf[1024];
    if (strlen(text) >= sizeof buf)
        return sr_cli_fail(c, "--deploy-times: too long");
    snprintf(buf, sizeof buf, "%s", text);
    char *save = NULL;
    for (char *tok = strtok_r(buf, ",", &save); tok; tok = strtok_r(NULL, ",", &save)) {
        while (*tok == ' ')
            tok++;
        if (*n >= max)
            return sr_cli_fail(c, "--deploy-times: at most %zu stages", max);
        if (strcmp(tok, "apogee") == 0) {
            t[(*n)++] = NAN;
            continue;
        }
        double v;
        int rc = sr_cli_quantity(c, "--deploy-times", tok, SR_Q_TIME, 0, &v);
        if (rc)
            return rc;
        t[(*n)++] = v;
    }
    if (*n == 0)
        return sr_cli_fail(c, "--deploy-times: give one time per stage, e.g. apogee,96.5");
    return 0;
}

/* a string safe inside a double-quoted YAML scalar */
static void yaml_quote(char *out, size_t len, const char *s)
{
    size_t o = 0;
    for (; *s && o + 3 < len; s++) {
        unsigned char ch = (unsigned char)*s;
        if (ch == '"' || ch == '\\') {
            out[o++] = '\\';
            out[o++] = (char)ch;
        } else {
            out[o++] = ch < 0x20 || ch == 0x7f ? '?' : (char)ch;
        }
    }
    out[o] = '\0';
}

static void fit_date(char *buf, size_t len)
{
    /* SOURCE_DATE_EPOCH (reproducible builds) fixes the date for tests and packaging */
    time_t now = time(NULL);
    const char *sde = getenv("SOURCE_DATE_EPOCH");
    if (sde && *sde) {
        char *end;
        long long v = strtoll(sde, &end, 10);
        if (*end == '\0' && v >= 0)
            now = (time_t)v;
    }
    struct tm tm;
    gmtime_r(&now, &tm);
    strftime(buf, len, "%Y-%m-%d", &tm);
}

static const char *ref_word(sr_size_kind k)
{
    switch (k) {
    case SR_SIZE_PROJECTED_DIAMETER: return "projected";
    case SR_SIZE_FLAT_DIAMETER: return "constructed";
    default: return "nominal";
    }
}

static const char *size_key(sr_size_kind k)
{
    switch (k) {
    case SR_SIZE_PROJECTED_DIAMETER: return "projected-diameter";
    case SR_SIZE_FLAT_DIAMETER: return "flat-diameter";
    case SR_SIZE_NOMINAL_AREA: return "nominal-area";
    default: return "nominal-diameter";
    }
}

/* the canopy file: the coefficient on the reference its size is given on, so
 * the drag area reads back exactly */
static int write_canopy(sr_cli *c, const char *path, const sr_fit_stage_spec *sp, double own, double lo, double hi,
                        double conf, char **logs, size_t nlogs)
{
    const sr_canopy *cp = &sp->canopy;
    double sref = cp->size_kind == SR_SIZE_NOMINAL_AREA ? cp->size_value
                                                         : 0.25 * 3.14159265358979323846 * cp->size_value * cp->size_value;
    double k = cp->count * cp->cluster_factor * sref;
    char date[32], names[700] = "", qname[200], src[1200], qsrc[1400];
    fit_date(date, sizeof date);
    for (size_t i = 0; i < nlogs; i++) {
        const char *b = strrchr(logs[i], '/');
        size_t at = strlen(names);
        snprintf(names + at, sizeof names - at, "%s%s", i ? ", " : "", b ? b + 1 : logs[i]);
    }
    snprintf(src, sizeof src,
             "sinkrate fit of %s on %s: robust nonlinear least squares of the steady descent (GSL multifit_nlinear), "
             "%.0f %% interval from the Jacobian, the residual variance and an AR(1) correction%s",
             names, date, 100 * conf, nlogs > 1 ? "; flights pooled by inverse variance" : "");
    yaml_quote(qsrc, sizeof qsrc, src);
    yaml_quote(qname, sizeof qname, sp->name);
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    if (!f)
        return sr_cli_fail(c, "out of memory");
    fprintf(f, "# A canopy file written by `sinkrate fit`: the drag coefficient measured from flight logs,\n"
               "# its confidence interval as the band. Use it with --canopy FILE or `canopy: FILE` in a mission.\n");
    sr_report_comment(f, sr_report_caution(), 0);
    fprintf(f, "canopy:\n  name: \"%s, measured\"\n  family: %s\n", qname, cp->fam.id);
    if (cp->size_kind == SR_SIZE_NOMINAL_AREA)
        fprintf(f, "  %s: %.6g m2\n", size_key(cp->size_kind), cp->size_value);
    else
        fprintf(f, "  %s: %.6g m\n", size_key(cp->size_kind), cp->size_value);
    fprintf(f,
            "  drag-coefficient:\n    value: %.4f\n    reference: %s\n    low: %.4f\n    high: %.4f\n"
            "    source: \"%s\"\n",
            own / k, ref_word(cp->size_kind), lo / k, hi / k, qsrc);
    if (cp->count > 1)
        fprintf(f, "  count: %d\n  cluster-factor: %.4g\n", cp->count, cp->cluster_factor);
    if (cp->areal_mass > 0)
        fprintf(f, "  areal-mass: %.6g g/m2\n", cp->areal_mass * 1000.0);
    if (fclose(f)) {
        free(buf);
        return sr_cli_fail(c, "out of memory");
    }
    sr_error e;
    int rc = sr_txn_write(c->txn, path, buf, len, &e);
    free(buf);
    if (rc)
        return sr_cli_fail(c, "%s", e.msg);
    return 0;
}

static int write_wind(sr_cli *c, const char *path, sr_fit_result **res, size_t nlogs)
{
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    if (!f)
        return sr_cli_fail(c, "out of memory");
    fprintf(f, "# Wind from the drift under the canopies (`sinkrate fit`), by height above ground; a mission's\n"
               "# site.wind `file:`. It reaches only as high as the fitted windows: extend it to the start height.\n");
    sr_report_comment(f, sr_report_caution(), 0);
    fprintf(f, "height [m],speed [m/s],from [deg]\n");
    size_t rows = 0;
    double last = -INFINITY;
    for (size_t l = 0; l < nlogs; l++)
        for (size_t i = 0; i < res[l]->nwind; i++) {
            const sr_fit_wind *w = &res[l]->wind[i];
            if (nlogs == 1 && !(w->h > last + 0.05))
                continue; /* a wind table's heights increase strictly */
            fprintf(f, "%.1f,%.2f,%.1f\n", w->h, w->speed, w->from * 180.0 / 3.14159265358979323846);
            last = w->h;
            rows++;
        }
    fclose(f);
    if (rows < 2) {
        free(buf);
        return sr_cli_fail(c, "--write-wind: the log has too few positions under the canopies for a wind table");
    }
    sr_error e;
    int rc = sr_txn_write(c->txn, path, buf, len, &e);
    free(buf);
    if (rc)
        return sr_cli_fail(c, "%s", e.msg);
    return 0;
}

static void describe_stage_report(sr_report *r, sr_fit_result **res, const sr_flightlog *fl, size_t nlogs,
                                  const sr_fit_setup *s, char **logs, double conf)
{
    char title[160];
    sr_rtable *t = sr_report_table(r, "segments", "Segments found (check them against the figure)");
    sr_rtable_text_column(t, "log", "log");
    sr_rtable_text_column(t, "event", "event");
    sr_rtable_column(t, "time", "time", SR_Q_TIME, SR_FIXED(2));
    sr_rtable_column(t, "height", "height", SR_Q_LENGTH, SR_FIXED(1));
    sr_rtable_column(t, "line", "line", SR_Q_NONE, SR_FIXED(0));
    for (size_t l = 0; l < nlogs; l++) {
        const sr_fit_result *R = res[l];
        const char *b = strrchr(logs[l], '/');
        const char *ln = b ? b + 1 : logs[l];
        const char *tx[2] = {ln, "apogee"};
        double ap[] = {R->t_apogee, R->h_apogee, (double)fl[l].line[R->row_apogee]};
        sr_rtable_row(t, ap, tx);
        for (size_t k = 0; k < R->nstages; k++) {
            snprintf(title, sizeof title, "%s deploys", s[l].stage[k].name);
            const char *tk[2] = {ln, title};
            double d[] = {R->stage[k].t_deploy, R->stage[k].h_deploy, (double)fl[l].line[R->stage[k].row_deploy]};
            sr_rtable_row(t, d, tk);
        }
        const char *tt[2] = {ln, R->touchdown ? "touchdown" : "log ends (in flight)"};
        double td[] = {R->t_touch, R->h_touch, (double)fl[l].line[R->row_touch]};
        sr_rtable_row(t, td, tt);
    }
    t = sr_report_table(r, "windows", "Fitting windows (steady descent)");
    sr_rtable_text_column(t, "log", "log");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_column(t, "from", "from", SR_Q_TIME, SR_FIXED(2));
    sr_rtable_column(t, "to", "to", SR_Q_TIME, SR_FIXED(2));
    sr_rtable_column(t, "points", "points", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_column(t, "dropped", "dropped", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_column(t, "rms", "residual RMS", SR_Q_LENGTH, 3);
    sr_rtable_column(t, "lag1", "lag-1 corr.", SR_Q_NONE, SR_FIXED(2));
    sr_rtable_column(t, "mass", "mass", SR_Q_MASS, 4);
    for (size_t l = 0; l < nlogs; l++) {
        const char *b = strrchr(logs[l], '/');
        for (size_t k = 0; k < res[l]->nstages; k++) {
            const sr_fit_stage *st = &res[l]->stage[k];
            const char *tx[2] = {b ? b + 1 : logs[l], s[l].stage[k].name};
            double row[] = {st->t0, st->t1, (double)st->npoints, (double)st->nrejected, st->rms, st->rho1,
                            s[l].stage[k].mass};
            sr_rtable_row(t, row, tx);
        }
    }
    snprintf(title, sizeof title, "Drag areas with %.0f %% intervals; CD0 on nominal area", 100 * conf);
    t = sr_report_table(r, "drag", title);
    sr_rtable_text_column(t, "log", "log");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_column(t, "drag_area_total", "CdS total", SR_Q_AREA, 4);
    sr_rtable_column(t, "drag_area", "canopy CdS", SR_Q_AREA, 4);
    sr_rtable_column(t, "drag_area_low", "low", SR_Q_AREA, 4);
    sr_rtable_column(t, "drag_area_high", "high", SR_Q_AREA, 4);
    sr_rtable_column(t, "cd0", "CD0 (nominal)", SR_Q_NONE, 3);
    sr_rtable_column(t, "cd0_low", "low", SR_Q_NONE, 3);
    sr_rtable_column(t, "cd0_high", "high", SR_Q_NONE, 3);
    sr_rtable_column(t, "catalog_low", "catalog low", SR_Q_NONE, 3);
    sr_rtable_column(t, "catalog_high", "high", SR_Q_NONE, 3);
    sr_rtable_text_column(t, "in_band", "catalog band");
    for (size_t l = 0; l < nlogs; l++) {
        const char *b = strrchr(logs[l], '/');
        for (size_t k = 0; k < res[l]->nstages; k++) {
            const sr_fit_stage *st = &res[l]->stage[k];
            const sr_fit_stage_spec *sp = &s[l].stage[k];
            const char *tx[3] = {b ? b + 1 : logs[l], sp->name, sr_fit_band_name(st->band)};
            double row[] = {st->cds,
                            st->own,
                            st->own_lo,
                            st->own_hi,
                            st->cd0,
                            st->cd0_lo,
                            st->cd0_hi,
                            sp->has_canopy ? sp->canopy.fam.cd0.v.lo : NAN,
                            sp->has_canopy ? sp->canopy.fam.cd0.v.hi : NAN};
            sr_rtable_row(t, row, tx);
        }
    }
    t = sr_report_table(r, "rates", "Steady descent rate with the fitted drag area");
    sr_rtable_text_column(t, "log", "log");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_column(t, "rate_ground", "at the ground", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_sea_level", "at sea level", SR_Q_SPEED, 3);
    for (size_t l = 0; l < nlogs; l++) {
        const char *b = strrchr(logs[l], '/');
        for (size_t k = 0; k < res[l]->nstages; k++) {
            const char *tx[2] = {b ? b + 1 : logs[l], s[l].stage[k].name};
            double row[] = {res[l]->stage[k].rate_ground, res[l]->stage[k].rate_sea};
            sr_rtable_row(t, row, tx);
        }
    }
}

static void opening_report(sr_report *r, sr_fit_result **res, size_t nlogs, const sr_fit_setup *s, char **logs,
                           const sr_atmos *atm)
{
    int any = 0;
    for (size_t l = 0; l < nlogs; l++)
        any |= res[l]->acc_rate > 0;
    if (!any)
        return;
    sr_rtable *t = sr_report_table(r, "opening", "Opening from the acceleration column, beside `loads` for the same "
                                                 "deployment");
    sr_rtable_text_column(t, "log", "log");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_column(t, "rate_needed", "rate needed", SR_Q_NONE, 3);
    sr_rtable_column(t, "speed", "speed", SR_Q_SPEED, 3);
    sr_rtable_column(t, "peak_force", "peak force", SR_Q_FORCE, 3);
    sr_rtable_column(t, "time_to_peak", "to peak", SR_Q_TIME, 3);
    sr_rtable_column(t, "filling_time", "filling", SR_Q_TIME, 3);
    sr_rtable_column(t, "growth_exponent", "exponent", SR_Q_NONE, 3);
    sr_rtable_column(t, "opening_load_factor", "load factor", SR_Q_NONE, 3);
    sr_rtable_column(t, "fit_rms", "fit rms", SR_Q_FORCE, 2);
    sr_rtable_column(t, "peak_over_cds_q", "peak/CdS q", SR_Q_NONE, 3);
    sr_rtable_column(t, "loads_force_low", "loads low", SR_Q_FORCE, 3);
    sr_rtable_column(t, "loads_force_high", "loads high", SR_Q_FORCE, 3);
    sr_rtable_column(t, "loads_filling_time", "loads filling", SR_Q_TIME, 3);
    sr_rtable_text_column(t, "unresolved", "why '-'");
    for (size_t l = 0; l < nlogs; l++) {
        const char *b = strrchr(logs[l], '/');
        for (size_t k = 0; k < res[l]->nstages; k++) {
            const sr_fit_stage *st = &res[l]->stage[k];
            const sr_fit_stage_spec *sp = &s[l].stage[k];
            const sr_fit_opening *o = &st->opening;
            double lo = NAN, hi = NAN, tf = NAN;
            if (o->measured && sp->has_canopy) {
                /* the same computation as `sinkrate loads`, with the measured speed and the fitted drag area */
                sr_opening_input in;
                sr_opening_input_init(&in);
                in.cds0 = st->own / sp->canopy.count;
                in.d0 = sp->canopy.d0.typ;
                in.mass = sp->mass;
                in.v1 = o->speed;
                sr_air a;
                if (sr_atmos_at(atm, res[l]->ground + st->h_deploy, &a, NULL) == SR_OK) {
                    in.rho = a.rho;
                    in.a = a.a;
                    in.n_fill = sp->canopy.fam.fill_n;
                    in.cx = sp->canopy.fam.cx.typ;
                    in.count = sp->canopy.count;
                    in.exponent = strcmp(sp->canopy.fam.cls, SR_CANOPY_CLASS_SLOTTED) == 0 ? 1.0 : 2.0;
                    sr_opening_result out;
                    if (sr_opening_solve(&in, &out, NULL) == SR_OK) {
                        lo = out.f_low;
                        hi = out.f_high;
                        tf = out.t_fill;
                    }
                }
            }
            const char *tx[3] = {b ? b + 1 : logs[l], sp->name, o->unresolved[0] ? o->unresolved : "-"};
            double row[] = {o->rate_needed,
                            o->speed,
                            o->measured ? o->force : NAN,
                            o->measured ? o->t_peak : NAN,
                            o->measured ? o->t_fill : NAN,
                            o->measured ? o->exponent : NAN,
                            o->measured ? o->olf : NAN,
                            o->measured ? o->residual : NAN,
                            o->measured ? o->peak_ratio : NAN,
                            lo,
                            hi,
                            tf};
            sr_rtable_row(t, row, tx);
        }
    }
    sr_report_note(r, "Opening: rate needed = ten samples over the predicted filling time n D0 / v, and 20 Hz at "
                      "least (our rule); below it the opening is not measured ('-'). Peak force = mass x peak "
                      "specific force. Filling time, growth exponent n and load factor: the inflation ODE of `loads` "
                      "(drag area growing as (t/t_f)^n, with the mass, the speed before the deployment, the air and "
                      "the fitted drag areas) fitted to the force over the rise and the peak, n within 0.5 .. 4, "
                      "t_f within 0.05 .. 5 s, the load factor the scale of its force (CX); fit rms = its residual; "
                      "'-' with the reason when the log does not resolve them. peak/CdS q = peak force / (canopy "
                      "CdS x q at deployment), CX X1 as measured.");
}

static int run_fit(sr_cli *c, int argc, char **argv)
{
    fit_opts o;
    memset(&o, 0, sizeof o);
    int first = 0;
    int rc = sr_cli_parse_options(c, argc, argv, &o, &first);
    if (rc)
        return rc;
    size_t nlogs = (size_t)(argc - first);
    if (nlogs == 0)
        return sr_cli_fail(c, "give one or more flight logs (CSV), e.g. sinkrate fit flight.csv --mission m.yaml");
    if (nlogs > MAX_LOGS)
        return sr_cli_fail(c, "'%s': at most %d logs at once", argv[first + MAX_LOGS], MAX_LOGS);
    if (o.write_canopy && (rc = sr_cli_output(c, "--write-canopy", o.write_canopy)))
        return rc;
    if (o.write_wind && (rc = sr_cli_output(c, "--write-wind", o.write_wind)))
        return rc;
    for (int i = first; i < argc; i++)
        if ((rc = sr_cli_input(c, "a flight log", argv[i])))
            return rc;
    sr_catalog *cat = NULL;
    sr_mission *mis = NULL;
    sr_atmos atm;
    sr_atmos_init_standard(&atm);
    sr_report *r = NULL;
    sr_flightlog *logs = calloc(nlogs, sizeof *logs);
    sr_fit_result **res = calloc(nlogs, sizeof *res);
    sr_fit_setup *setups = calloc(nlogs, sizeof *setups);
    sr_fit_setup *s = malloc(sizeof *s);
    sr_canopy *last = malloc(sizeof *last);
    char (*names)[SR_NAME_MAX] = calloc(SR_FIT_MAX_STAGES, SR_NAME_MAX);
    size_t nfitted = 0, nloaded = 0;
    double ground = 0.0;
    sr_error e;
    if (!logs || !res || !setups || !s || !last || !names) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    sr_fit_setup_init(s);
    if ((rc = sr_cli_catalog(c, &cat)) || (rc = sr_cli_mission(c, o.payload.mission, cat, &o.atmos, &mis, &atm, &ground)))
        goto out;
    s->atmos = &atm;
    s->ground = (mis || sr_cli_atmos_given(&o.atmos)) ? ground : NAN;
    s->pressure_altitude = o.pressure_alt;
    if (o.conf) {
        double p;
        if ((rc = sr_cli_quantity(c, "--confidence", o.conf, SR_Q_NONE, 1, &p)))
            goto out;
        if (p > 1.0)
            p /= 100.0; /* written as a percentage */
        if (!(p >= 0.5 && p <= 0.999)) {
            rc = sr_cli_fail(c, "--confidence: %s is outside 50 .. 99.9 %%", o.conf);
            goto out;
        }
        s->conf = p;
    }
    double max_gap = 0.0;
    if (o.max_gap && (rc = sr_cli_quantity(c, "--max-gap", o.max_gap, SR_Q_TIME, 1, &max_gap)))
        goto out;
    if (o.events) {
        if (strcmp(o.events, "detect") == 0)
            s->events = SR_FIT_EVENTS_DETECT;
        else if (strcmp(o.events, "mission") == 0)
            s->events = SR_FIT_EVENTS_MISSION;
        else {
            rc = sr_cli_fail(c, "--events: '%s' is not detect or mission", o.events);
            goto out;
        }
        if (s->events == SR_FIT_EVENTS_MISSION && !mis) {
            rc = sr_cli_fail(c, "--events: 'mission' needs --mission FILE");
            goto out;
        }
    }
    if (o.times) {
        if (o.events) {
            rc = sr_cli_fail(c, "--deploy-times: give either --deploy-times or --events, not both");
            goto out;
        }
        if ((rc = parse_times(c, o.times, s->times, SR_FIT_MAX_STAGES, &s->ntimes)))
            goto out;
        s->events = SR_FIT_EVENTS_TIMES;
    }
    if (mis) {
        if (o.payload.mass || o.names || sr_cli_canopy_given(&o.canopy)) {
            rc = sr_cli_fail(c, "%s: the mission gives the masses, stage names and canopies; leave it out with "
                                "--mission",
                             o.payload.mass ? "--mass" : o.names ? "--stage-names" : "--family");
            goto out;
        }
        if (sr_fit_stages_from_mission(mis, s, &e)) {
            rc = sr_cli_fail(c, "--mission: %s", e.msg);
            goto out;
        }
        for (size_t k = 0; k < s->nstages; k++)
            if (!mis->stages[k].has_size) {
                rc = sr_cli_fail(c, "--mission: stage '%s' has no size; the fit needs each canopy's size",
                                 mis->stages[k].name);
                goto out;
            }
        if (s->events == SR_FIT_EVENTS_TIMES) {
            if (s->ntimes != s->nstages) {
                rc = sr_cli_fail(c, "--deploy-times: %zu times for the mission's %zu stages", s->ntimes, s->nstages);
                goto out;
            }
            for (size_t k = 0; k < s->nstages; k++)
                s->stage[k].time = s->times[k];
        }
    } else {
        double mass = NAN;
        if ((rc = sr_cli_mass(c, o.payload.mass, "the mass under the canopies", &mass)))
            goto out;
        s->mass = mass;
        if (o.names) {
            if ((rc = split_names(c, o.names, names, SR_FIT_MAX_STAGES, &s->nnames)))
                goto out;
            for (size_t k = 0; k < s->nnames; k++)
                s->names[k] = names[k];
            if (s->events == SR_FIT_EVENTS_TIMES && s->ntimes != s->nnames) {
                rc = sr_cli_fail(c, "--deploy-times: %zu times for %zu stage names", s->ntimes, s->nnames);
                goto out;
            }
        }
        if (sr_cli_canopy_given(&o.canopy)) {
            if ((rc = sr_cli_canopy(c, cat, &o.canopy, 1, last)))
                goto out;
            s->last_canopy = last;
        }
    }
    if (o.write_canopy && !mis && !s->last_canopy) {
        rc = sr_cli_fail(c, "--write-canopy: the last stage has no canopy (family and size): give --mission, or "
                            "--family and a size");
        goto out;
    }
    /* each log */
    for (size_t l = 0; l < nlogs; l++) {
        const char *path = argv[first + (int)l];
        if (sr_flightlog_load(&logs[l], path, max_gap, &e)) {
            rc = sr_cli_fail_err(c, &e);
            goto out;
        }
        nloaded++;
    }
    for (size_t l = 0; l < nlogs; l++) {
        setups[l] = *s;
        res[l] = calloc(1, sizeof *res[l]);
        if (!res[l]) {
            rc = sr_cli_fail(c, "out of memory");
            goto out;
        }
        if (sr_fit_log(&logs[l], &setups[l], res[l], &e)) {
            if (e.code == SR_ENUMERIC) {
                sr_cli_fail(c, "%s", e.msg);
                rc = SR_EXIT_LIMIT;
            } else {
                rc = sr_cli_fail_err(c, &e);
            }
            free(res[l]);
            res[l] = NULL;
            goto out;
        }
        nfitted++;
        res[l]->acc_rate = logs[l].acc ? 1.0 / logs[l].step : 0.0;
        /* the stages the fit made up without a mission, for the report */
        if (s->nstages == 0) {
            setups[l].nstages = res[l]->nstages;
            for (size_t k = 0; k < res[l]->nstages; k++) {
                sr_fit_stage_spec *sp = &setups[l].stage[k];
                memset(sp, 0, sizeof *sp);
                if (k < s->nnames)
                    snprintf(sp->name, sizeof sp->name, "%s", s->names[k]);
                else
                    snprintf(sp->name, sizeof sp->name, "stage %zu", k + 1);
                sp->mass = s->mass;
                if (k + 1 == res[l]->nstages && s->last_canopy) {
                    sp->has_canopy = 1;
                    sp->canopy = *s->last_canopy;
                }
            }
        }
    }
    /* several flights: the same stages */
    for (size_t l = 1; l < nlogs; l++) {
        int same = setups[l].nstages == setups[0].nstages;
        for (size_t k = 0; same && k < setups[0].nstages; k++)
            same = strcmp(setups[l].stage[k].name, setups[0].stage[k].name) == 0;
        if (!same) {
            rc = sr_cli_fail(c, "%s: its stages (%zu) do not match those of %s (%zu); pool flights of the same stages",
                             logs[l].path, setups[l].nstages, logs[0].path, setups[0].nstages);
            goto out;
        }
    }
    /* which stage a canopy file is written for */
    size_t wstage = setups[0].nstages - 1;
    if (o.stage) {
        size_t k = 0;
        while (k < setups[0].nstages && strcmp(setups[0].stage[k].name, o.stage) != 0)
            k++;
        if (k == setups[0].nstages) {
            rc = sr_cli_fail(c, "--stage: no stage '%s' (the stages are %s%s%s)", o.stage, setups[0].stage[0].name,
                             setups[0].nstages > 1 ? " ... " : "",
                             setups[0].nstages > 1 ? setups[0].stage[setups[0].nstages - 1].name : "");
            goto out;
        }
        wstage = k;
    }
    if (o.write_canopy && !setups[0].stage[wstage].has_canopy) {
        rc = sr_cli_fail(c, "--write-canopy: stage '%s' has no canopy (family and size): give --mission, or --family "
                            "and a size for the last stage",
                         setups[0].stage[wstage].name);
        goto out;
    }
    if (o.write_wind) {
        int any = 0;
        for (size_t l = 0; l < nlogs; l++)
            any |= logs[l].east != NULL;
        if (!any) {
            rc = sr_cli_fail(c, "--write-wind: the log has no positions (east/north or latitude/longitude columns)");
            goto out;
        }
    }
    /* the report */
    r = sr_report_new("fit", "drag areas from flight logs");
    sr_report_section(r, "Inputs");
    for (size_t l = 0; l < nlogs; l++) {
        char key[32], val[700];
        snprintf(key, sizeof key, "log%zu", l + 1);
        snprintf(val, sizeof val, "%s (%zu rows, %.4g Hz%s%s)", logs[l].path, logs[l].n, 1.0 / logs[l].step,
                 logs[l].acc ? ", acceleration" : "", logs[l].east ? ", positions" : "");
        sr_report_text(r, key, nlogs > 1 ? key : "log", val);
    }
    if (mis)
        sr_report_text(r, "mission", "mission", mis->name);
    sr_cli_report_atmos(r, &atm);
    sr_report_value(r, "ground", "ground elevation", res[0]->ground, SR_Q_LENGTH, SR_FIXED(1));
    sr_report_text(r, "ground_from", "ground from",
                   res[0]->ground_from_log ? "where the log rests at the end"
                   : isnan(s->ground)      ? "no site given: sea level"
                                           : (mis ? "the mission's site" : "the site options"));
    sr_report_text(r, "conversion", "vertical column", res[0]->conversion);
    sr_report_text(r, "events",
                   "deployments from",
                   s->events == SR_FIT_EVENTS_DETECT    ? "change points of the descent rate"
                   : s->events == SR_FIT_EVENTS_MISSION ? "the mission's events"
                                                        : "--deploy-times");
    sr_report_value(r, "noise", "altimeter noise (robust)", res[0]->noise, SR_Q_LENGTH, 3);
    describe_stage_report(r, res, logs, nlogs, setups, (char **)(argv + first), s->conf);
    /* the conversion's effect */
    for (size_t l = 0; l < nlogs; l++)
        for (size_t k = 0; k < res[l]->nstages; k++) {
            const sr_fit_stage *st = &res[l]->stage[k];
            if (!isnan(st->cds_raw))
                sr_report_note(r, "%s, %s: the pressure-altitude conversion changed the total drag area by %+.2f %% "
                                  "(%.4g m2 fitted to the unconverted column).",
                               logs[l].path, setups[l].stage[k].name, 100.0 * (st->cds / st->cds_raw - 1.0),
                               st->cds_raw);
        }
    opening_report(r, res, nlogs, setups, (char **)(argv + first), &atm);
    /* wind */
    int anywind = 0;
    for (size_t l = 0; l < nlogs; l++)
        anywind |= res[l]->nwind > 0;
    if (anywind) {
        sr_rtable *t = sr_report_table(r, "wind", "Drift under the canopies by height (the wind)");
        sr_rtable_text_column(t, "log", "log");
        sr_rtable_column(t, "height", "height", SR_Q_LENGTH, SR_FIXED(0));
        sr_rtable_column(t, "east", "east", SR_Q_SPEED, 3);
        sr_rtable_column(t, "north", "north", SR_Q_SPEED, 3);
        sr_rtable_column(t, "speed", "speed", SR_Q_SPEED, 3);
        sr_rtable_column(t, "from", "from", SR_Q_BEARING, SR_FIXED(0));
        for (size_t l = 0; l < nlogs; l++) {
            const char *b = strrchr(logs[l].path, '/');
            for (size_t i = 0; i < res[l]->nwind; i++) {
                const sr_fit_wind *w = &res[l]->wind[i];
                const char *tx[1] = {b ? b + 1 : logs[l].path};
                double row[] = {w->h, w->east, w->north, w->speed, w->from};
                sr_rtable_row(t, row, tx);
            }
        }
    }
    /* pooled */
    sr_fit_pooled pool[SR_FIT_MAX_STAGES];
    if (nlogs > 1) {
        sr_rtable *t = sr_report_table(r, "pooled", "Flights pooled (inverse-variance mean of ln CdS, Birge ratio)");
        sr_rtable_text_column(t, "stage", "stage");
        sr_rtable_column(t, "flights", "flights", SR_Q_NONE, SR_FIXED(0));
        sr_rtable_column(t, "drag_area", "canopy CdS", SR_Q_AREA, 4);
        sr_rtable_column(t, "drag_area_low", "low", SR_Q_AREA, 4);
        sr_rtable_column(t, "drag_area_high", "high", SR_Q_AREA, 4);
        sr_rtable_column(t, "cd0", "CD0 (nominal)", SR_Q_NONE, 3);
        sr_rtable_column(t, "cd0_low", "low", SR_Q_NONE, 3);
        sr_rtable_column(t, "cd0_high", "high", SR_Q_NONE, 3);
        sr_rtable_column(t, "birge", "Birge ratio", SR_Q_NONE, 3);
        sr_rtable_text_column(t, "in_band", "catalog band");
        for (size_t k = 0; k < setups[0].nstages; k++) {
            if (sr_fit_pool((const sr_fit_result *const *)res, nlogs, k, &setups[0].stage[k], s->conf, &pool[k], &e)) {
                sr_cli_fail(c, "%s", e.msg);
                rc = e.code == SR_ENUMERIC ? SR_EXIT_LIMIT : SR_EXIT_USAGE;
                goto out;
            }
            const char *tx[2] = {setups[0].stage[k].name, sr_fit_band_name(pool[k].band)};
            double row[] = {(double)pool[k].nlogs, pool[k].own,    pool[k].own_lo, pool[k].own_hi,
                            pool[k].cd0,           pool[k].cd0_lo, pool[k].cd0_hi, pool[k].birge};
            sr_rtable_row(t, row, tx);
        }
    }
    sr_report_note(r, "Fit: per stage, the steady descent z(t) with F(z) = F(z0) - sqrt(m/CdS) (t - t0), F the "
                      "integral of dz / sqrt(2 g / rho), fitted to the height by nonlinear least squares (GSL, trust "
                      "region) from the settled descent (%.1f time constants v/g and 1 s after the deployment) to "
                      "0.5 s before the next event. Interval: t quantile x the standard error of ln CdS from the "
                      "Jacobian and the residual variance, times (1 + r1)/(1 - r1) for a lag-1 residual "
                      "correlation r1 > 0; its coverage is checked on seeded synthetic logs (docs/method.md, "
                      "section 12).",
                   SR_FIT_SETTLE_TAU);
    sr_report_note(r, "The canopy's CdS is the total less what else is open: the sections' own drag areas and, for "
                      "a stage that keeps the one before, that stage's fitted total. Vertical air motion (thermals, "
                      "sink) is not in the model: fit calm-air flights, and several of them.");
    for (size_t k = 0; k < setups[0].nstages; k++) {
        const sr_fit_stage_spec *sp = &setups[0].stage[k];
        if (sp->has_canopy && sp->canopy.measured)
            sr_report_note(r, "%s: the catalog band is the canopy's own measured band (%s).", sp->name,
                           sp->canopy.cd_source);
    }
    if (o.write_canopy) {
        const sr_fit_stage_spec *sp = &setups[0].stage[wstage];
        double own = nlogs > 1 ? pool[wstage].own : res[0]->stage[wstage].own;
        double lo = nlogs > 1 ? pool[wstage].own_lo : res[0]->stage[wstage].own_lo;
        double hi = nlogs > 1 ? pool[wstage].own_hi : res[0]->stage[wstage].own_hi;
        if ((rc = write_canopy(c, o.write_canopy, sp, own, lo, hi, s->conf, argv + first, nlogs)))
            goto out;
        sr_report_text(r, "canopy_file", "canopy file written", o.write_canopy);
    }
    if (o.write_wind) {
        if ((rc = write_wind(c, o.write_wind, res, nlogs)))
            goto out;
        sr_report_text(r, "wind_file", "wind table written", o.write_wind);
    }
    if ((rc = sr_cli_emit(c, r)))
        goto out;
    if (c->plot_prefix && !(rc = sr_cli_fit_plots(c, res, nlogs, setups, argc, argv)))
        rc = sr_cli_fit_plot_opening(c, res, setups, logs[0].acc, argc, argv);
out:
    sr_report_free(r);
    for (size_t l = 0; l < nfitted + 1 && res && l < nlogs; l++)
        if (res[l]) {
            sr_fit_result_free(res[l]);
            free(res[l]);
        }
    for (size_t l = 0; logs && l < nloaded; l++)
        sr_flightlog_free(&logs[l]);
    free(logs);
    free(res);
    free(setups);
    free(s);
    free(last);
    free(names);
    sr_atmos_release(&atm);
    sr_cli_mission_free(mis);
    free(cat);
    return rc;
}
