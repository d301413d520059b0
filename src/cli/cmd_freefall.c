/* cmd_freefall.c - `sinkrate freefall`: the speed of a body falling without a
 * canopy, with Reynolds-dependent drag: every equilibrium at each altitude,
 * its stability, and on request the classical fixed-point iteration. */
#define _DEFAULT_SOURCE
#include <fcntl.h>
#include <math.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>

#include "bluff.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "fileio.h"

extern char **environ;

enum {
    OPT_BODY = OPT_COMMAND_BASE,
    OPT_DIAMETER,
    OPT_LENGTH,
    OPT_MASS,
    OPT_CD_TABLE,
    OPT_INTERP,
    OPT_AREA,
    OPT_CURVE,
    OPT_TRACE,
    OPT_START_CD,
    OPT_STEPS,
    OPT_ALTITUDE
};

static const struct option OPTS[] = {
    {"body", required_argument, NULL, OPT_BODY},
    {"diameter", required_argument, NULL, OPT_DIAMETER},
    {"length", required_argument, NULL, OPT_LENGTH},
    {"mass", required_argument, NULL, OPT_MASS},
    {"cd-table", required_argument, NULL, OPT_CD_TABLE},
    {"interp", required_argument, NULL, OPT_INTERP},
    {"area", required_argument, NULL, OPT_AREA},
    {"curve", required_argument, NULL, OPT_CURVE},
    {"trace", no_argument, NULL, OPT_TRACE},
    {"start-cd", required_argument, NULL, OPT_START_CD},
    {"steps", required_argument, NULL, OPT_STEPS},
    {"altitude", required_argument, NULL, OPT_ALTITUDE},
    SR_OPTS_PLOT,
    SR_OPTS_ATMOS,
    SR_OPTS_OUTPUT,
    {NULL, 0, NULL, 0}};

static const char HELP[] =
    "usage: sinkrate freefall --body sphere|cylinder|disk --diameter D --mass M [--length L] [options]\n"
    "       sinkrate freefall --cd-table FILE --diameter D --mass M [--area A] [options]\n\n"
    "Free-fall speed of a body without a canopy whose drag coefficient depends on the\n"
    "Reynolds number. Every speed where drag equals weight is found (near the drag crisis\n"
    "there can be two stable ones), each with its Reynolds number, drag coefficient and\n"
    "stability; --trace also shows the classical fixed-point iteration step by step.\n\n"
    "  --body B                 sphere (default), cylinder (broadside, finite length),\n"
    "                           disk (thin, normal to the flow) or table\n"
    "  --diameter D             diameter; the length in the Reynolds number\n"
    "  --length L               cylinder length (its drag is on the projected area D x L)\n"
    "  --mass M                 mass of the falling body\n"
    "  --curve NAME             drag curve: sphere-cgw (default), sphere-morrison,\n"
    "                           sphere-brown-lawler, sphere-white, sphere-schiller-naumann,\n"
    "                           cylinder (default), cylinder-wieselsberger, cylinder-dnv,\n"
    "                           cylinder-sucker-brauer, disk\n"
    "  --cd-table FILE          drag table, Re increasing: CSV with the columns Re and Cd,\n"
    "                           or YAML (.yaml) with points: [[Re, Cd], ...] and optional\n"
    "                           name, source and reference-area (\"0.02 m2\")\n"
    "  --interp loglog|steffen  table interpolation: straight in log-log (default) or\n"
    "                           monotone cubic (Steffen)\n"
    "  --area A                 the table's reference area (default: the file's, else pi D^2/4)\n"
    "  --altitude Z[,Z...]      altitudes above sea level, or FROM:TO:STEP\n"
    "                           (default: the site elevation, or 0)\n"
    "  --trace                  show the fixed-point iteration at each altitude\n"
    "  --start-cd CD            its starting drag coefficient (default 1)\n"
    "  --steps N                its step limit (default 50, at most 200)\n"
    "  --plot PREFIX            write PREFIX.dat and PREFIX.gp (Cd(Re) with the equilibria,\n"
    "                           speed vs altitude) and render them when gnuplot is installed\n"
    "  --plot-format png|svg    figure format (default png)\n\n";

typedef struct ff_opts {
    const char *body, *diameter, *length, *mass, *cd_table, *interp, *area, *curve, *start_cd, *steps, *altitude;
    int trace;
    sr_atmos_opts atmos;
} ff_opts;

static int take(sr_cli *c, int code, const char *arg, void *ud)
{
    ff_opts *o = ud;
    switch (code) {
    case OPT_BODY: o->body = arg; return 0;
    case OPT_DIAMETER: o->diameter = arg; return 0;
    case OPT_LENGTH: o->length = arg; return 0;
    case OPT_MASS: o->mass = arg; return 0;
    case OPT_CD_TABLE: o->cd_table = arg; return 0;
    case OPT_INTERP: o->interp = arg; return 0;
    case OPT_AREA: o->area = arg; return 0;
    case OPT_CURVE: o->curve = arg; return 0;
    case OPT_TRACE: o->trace = 1; return 0;
    case OPT_START_CD: o->start_cd = arg; return 0;
    case OPT_STEPS: o->steps = arg; return 0;
    case OPT_ALTITUDE: o->altitude = arg; return 0;
    }
    if (sr_cli_take_atmos(&o->atmos, code, arg))
        return 0;
    return 1;
}

#define MAX_ALT 256
/* Cd settled to 1e-6 of itself: well past the digits a worked example shows */
#define TRACE_TOL 1e-6

/* "FROM:TO:STEP" into a list of altitudes. */
static int altitude_range(sr_cli *c, const char *text, double *out, size_t *n)
{
    char buf[256];
    if (strlen(text) >= sizeof buf)
        return sr_cli_fail(c, "--altitude: '%s' is too long", text);
    snprintf(buf, sizeof buf, "%s", text);
    char *p[3] = {buf, NULL, NULL};
    for (int k = 1; k < 3; k++) {
        char *colon = strchr(p[k - 1], ':');
        if (!colon)
            return sr_cli_fail(c, "--altitude: a range is FROM:TO:STEP, e.g. \"0:30 km:2 km\" (got '%s')", text);
        *colon = '\0';
        p[k] = colon + 1;
    }
    double v[3];
    int rc;
    for (int k = 0; k < 3; k++)
        if ((rc = sr_cli_quantity(c, "--altitude", p[k], SR_Q_LENGTH, k == 2, &v[k])))
            return rc;
    if (v[1] < v[0])
        return sr_cli_fail(c, "--altitude: the range ends (%g m) below its start (%g m)", v[1], v[0]);
    double count = floor((v[1] - v[0]) / v[2] + 1e-9) + 1;
    if (count > MAX_ALT)
        return sr_cli_fail(c, "--altitude: the range has %.0f altitudes, at most %d", count, MAX_ALT);
    *n = (size_t)count;
    for (size_t i = 0; i < *n; i++)
        out[i] = v[0] + (double)i * v[2];
    return 0;
}

/* Short labels of warning bits for the table's notes column. */
static void warn_tags(unsigned w, char *buf, size_t len)
{
    static const struct {
        unsigned bit;
        const char *tag;
    } T[] = {{SR_BLUFF_WARN_RE_LOW, "Re below curve"},
             {SR_BLUFF_WARN_RE_HIGH, "Re above curve"},
             {SR_BLUFF_WARN_ASPECT, "L/D outside data"},
             {SR_BLUFF_WARN_MACH, "Mach > 0.3"},
             {SR_BLUFF_WARN_STEP, "step in curve"}};
    buf[0] = '\0';
    for (size_t i = 0; i < sizeof T / sizeof T[0]; i++)
        if (w & T[i].bit) {
            if (buf[0])
                strncat(buf, "; ", len - strlen(buf) - 1);
            strncat(buf, T[i].tag, len - strlen(buf) - 1);
        }
}

static const char *body_word(sr_bluff_shape s)
{
    switch (s) {
    case SR_BLUFF_SPHERE: return "sphere";
    case SR_BLUFF_CYLINDER: return "circular cylinder, broadside to the flow";
    case SR_BLUFF_DISK: return "thin circular disk, normal to the flow";
    default: return "body with a drag table";
    }
}

/* ---- the figure ---------------------------------------------------------- */

typedef struct ff_result {
    double z;
    sr_air air;
    sr_bluff_equilibria eq;
} ff_result;

/* gnuplot string literal: the caution and file names go in double quotes. */
static void gp_quote(FILE *f, const char *s)
{
    fputc('"', f);
    for (; *s; s++) {
        if (*s == '\n') {
            fputs("\\n", f);
            continue;
        }
        if (*s == '"' || *s == '\\')
            fputc('\\', f);
        fputc(*s, f);
    }
    fputc('"', f);
}

static int write_mem(sr_cli *c, const char *path, char *buf, size_t len)
{
    sr_error e;
    int rc = sr_file_write_atomic(path, buf, len, &e);
    free(buf);
    if (rc)
        return sr_cli_fail(c, "--plot: %s", e.msg);
    return 0;
}

/* No plot module yet: the data file and script are written here. */
static int write_plot(sr_cli *c, const sr_bluff_body *b, const ff_result *res, size_t n)
{
    char dat[4096], gp[4096], img[4096];
    const char *ext = strcmp(c->plot_format, "svg") == 0 ? "svg" : "png";
    snprintf(dat, sizeof dat, "%s.dat", c->plot_prefix);
    snprintf(gp, sizeof gp, "%s.gp", c->plot_prefix);
    snprintf(img, sizeof img, "%s.%s", c->plot_prefix, ext);
    double lo = INFINITY, hi = 0;
    for (size_t i = 0; i < n; i++)
        for (size_t k = 0; k < res[i].eq.n; k++) {
            lo = fmin(lo, res[i].eq.root[k].re);
            hi = fmax(hi, res[i].eq.root[k].re);
        }
    lo = pow(10.0, floor(log10(lo)) - 2);
    hi = pow(10.0, ceil(log10(hi)) + 1);
    sr_unit_system us = c->units;
    const char *ul = sr_units_label(SR_Q_LENGTH, us), *uv = sr_units_label(SR_Q_SPEED, us);

    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    if (!f)
        return sr_cli_fail(c, "out of memory");
    fprintf(f, "# sinkrate freefall: drag curve, equilibria, speed vs altitude\n# ");
    fputs(sr_report_caution(), f);
    fprintf(f, "\n# drag curve %s: %s\n# Cd on %s\n", b->curve->name, b->curve->source, b->area_ref);
    fprintf(f, "# index 0: Re, Cd of the body (dotted lines in the figure: the curve's validity range)\n");
    double cdmin = INFINITY, cdmax = 0;
    for (int i = 0; i <= 400; i++) {
        double re = lo * pow(hi / lo, i / 400.0), cd = sr_bluff_body_cd(b, re, NULL);
        cdmin = fmin(cdmin, cd);
        cdmax = fmax(cdmax, cd);
        fprintf(f, "%.6e %.6e\n", re, cd);
    }
    fprintf(f, "\n\n# index 1: equilibria: Re, Cd, altitude [%s], speed [%s], stable (1/0)\n", ul, uv);
    for (size_t i = 0; i < n; i++)
        for (size_t k = 0; k < res[i].eq.n; k++) {
            const sr_bluff_root *r = &res[i].eq.root[k];
            fprintf(f, "%.6e %.6e %.6g %.6g %d\n", r->re, r->cd, sr_units_from_si(res[i].z, SR_Q_LENGTH, us),
                    sr_units_from_si(r->v, SR_Q_SPEED, us), r->stable);
        }
    fprintf(f, "\n\n# index 2: weight lines Cd = K / Re^2, one per altitude: altitude [%s], K\n", ul);
    for (size_t i = 0; i < n; i++) {
        const sr_air *a = &res[i].air;
        double K = 2.0 * b->mass * a->g * a->rho * b->d * b->d / (b->area * a->mu * a->mu);
        fprintf(f, "%.6g %.10e\n", sr_units_from_si(res[i].z, SR_Q_LENGTH, us), K);
    }
    fclose(f);
    int rc = write_mem(c, dat, buf, len);
    if (rc)
        return rc;

    buf = NULL;
    len = 0;
    f = open_memstream(&buf, &len);
    if (!f)
        return sr_cli_fail(c, "out of memory");
    fprintf(f, "# sinkrate freefall figure; run: gnuplot %s\n", gp);
    if (strcmp(ext, "svg") == 0)
        fprintf(f, "set terminal svg size 1200,560 dynamic font 'Sans,11'\n");
    else
        fprintf(f, "set terminal pngcairo size 1200,560 font 'Sans,10'\n");
    fprintf(f, "set output ");
    gp_quote(f, img);
    fprintf(f, "\nset multiplot layout 1,%d\nset bmargin 7\n", n > 1 ? 2 : 1);
    /* the caution on the figure, broken into lines that fit its width */
    char caution[1024];
    const char *cs = sr_report_caution();
    size_t k = 0, col = 0;
    for (; *cs && k + 2 < sizeof caution; cs++) {
        if (*cs == ' ' && col > 150) {
            caution[k++] = '\n';
            col = 0;
            continue;
        }
        caution[k++] = *cs;
        col++;
    }
    caution[k] = '\0';
    fprintf(f, "set label 99 ");
    gp_quote(f, caution);
    fprintf(f, " at screen 0.01,0.07 font ',8'\n");
    fprintf(f, "set logscale xy\nset grid\nset format xy '%%g'\nset xlabel 'Reynolds number'\n"
               "set ylabel 'Cd (%s)'\n", b->area_ref);
    fprintf(f, "set yrange [%g:%g]\n", cdmin / 3, cdmax * 3);
    if (b->curve->re_min > lo)
        fprintf(f, "set arrow 1 from %g, graph 0 to %g, graph 1 nohead dt 3\n", b->curve->re_min, b->curve->re_min);
    if (isfinite(b->curve->re_max) && b->curve->re_max < hi)
        fprintf(f, "set arrow 2 from %g, graph 0 to %g, graph 1 nohead dt 3\n", b->curve->re_max, b->curve->re_max);
    fprintf(f, "set title ");
    char title[512];
    snprintf(title, sizeof title, "Drag curve %s; equilibria where a weight line crosses it",
             b->curve->name);
    gp_quote(f, title);
    fprintf(f, "\nset key bottom left\nset xrange [%g:%g]\n", lo, hi);
    fprintf(f, "plot ");
    gp_quote(f, dat);
    fprintf(f, " index 0 using 1:2 with lines lw 2 title 'Cd(Re)', \\\n     ");
    for (size_t i = 0; i < n && i < 8; i++) {
        const sr_air *a = &res[i].air;
        double K = 2.0 * b->mass * a->g * a->rho * b->d * b->d / (b->area * a->mu * a->mu);
        char t[96];
        sr_report_format_value(t, sizeof t, res[i].z, SR_Q_LENGTH, us, 4);
        fprintf(f, "%.10e/x**2 with lines dt 2 title 'weight, %s', \\\n     ", K, t);
    }
    gp_quote(f, dat);
    fprintf(f, " index 1 using 1:($5==1?$2:1/0) with points pt 7 ps 1.5 title 'stable', \\\n     ");
    gp_quote(f, dat);
    fprintf(f, " index 1 using 1:($5==0?$2:1/0) with points pt 6 ps 1.5 title 'unstable'\n");
    if (n > 1) {
        fprintf(f, "unset logscale\nunset arrow\nset autoscale xy\nunset label 99\n");
        fprintf(f, "set xlabel 'free-fall speed [%s]'\nset ylabel 'altitude [%s]'\n", uv, ul);
        /* lines only when each altitude has one equilibrium: branches cannot be told apart */
        int single = 1;
        for (size_t i = 0; i < n; i++)
            single &= res[i].eq.n == 1;
        fprintf(f, "set title 'Equilibrium speed vs altitude'\nset key bottom right\n"
                   "set offsets graph 0.05, graph 0.05, graph 0.05, graph 0.05\n");
        fprintf(f, "plot ");
        gp_quote(f, dat);
        fprintf(f, " index 1 using ($5==1?$4:1/0):3 with %s pt 7 title 'stable', \\\n     ",
                single ? "linespoints" : "points");
        gp_quote(f, dat);
        fprintf(f, " index 1 using ($5==0?$4:1/0):3 with points pt 6 title 'unstable'\n");
    }
    fprintf(f, "unset multiplot\nset output\n");
    fclose(f);
    if ((rc = write_mem(c, gp, buf, len)))
        return rc;

    /* render when gnuplot is on PATH; a missing gnuplot is not an error */
    pid_t pid;
    char *argv[] = {"gnuplot", gp, NULL};
    posix_spawn_file_actions_t fa;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_addopen(&fa, 1, "/dev/null", O_WRONLY, 0);
    posix_spawn_file_actions_addopen(&fa, 2, "/dev/null", O_WRONLY, 0);
    int st = posix_spawnp(&pid, "gnuplot", &fa, NULL, argv, environ);
    posix_spawn_file_actions_destroy(&fa);
    if (st != 0) {
        fprintf(c->err, "sinkrate freefall: gnuplot not found; wrote %s and %s (render with: gnuplot %s)\n", dat,
                gp, gp);
        return 0;
    }
    int status = 0;
    if (waitpid(pid, &status, 0) < 0 || !WIFEXITED(status) || WEXITSTATUS(status) != 0)
        return sr_cli_fail(c, "--plot: gnuplot could not render %s (see gnuplot %s)", img, gp);
    return 0;
}

/* ---- the command --------------------------------------------------------- */

static void report_trace(sr_report *r, sr_cli *c, size_t idx, const ff_result *res, const sr_bluff_trace *t)
{
    char key[48], title[160], alt[64];
    sr_report_format_value(alt, sizeof alt, res->z, SR_Q_LENGTH, c->units, SR_FIXED(0));
    snprintf(key, sizeof key, "trace_%zu", idx + 1);
    snprintf(title, sizeof title, "Fixed-point iteration at %s (start: Cd = %g)", alt, t->cd0);
    sr_rtable *tb = sr_report_table(r, key, title);
    sr_rtable_column(tb, "step", "step", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_column(tb, "cd_used", "Cd used", SR_Q_NONE, 5);
    sr_rtable_column(tb, "speed", "speed from balance", SR_Q_SPEED, 5);
    sr_rtable_column(tb, "reynolds", "Re", SR_Q_NONE, 5);
    sr_rtable_column(tb, "cd_curve", "Cd from curve", SR_Q_NONE, 5);
    sr_rtable_text_column(tb, "notes", "notes");
    for (size_t k = 0; k < t->n; k++) {
        const sr_bluff_step *s = &t->step[k];
        double row[] = {(double)(k + 1), s->cd, s->v, s->re, s->cd_next};
        char tags[128];
        warn_tags(s->warn, tags, sizeof tags);
        const char *tx[] = {tags};
        sr_rtable_row(tb, row, tx);
    }
    const sr_bluff_step *last = &t->step[t->n - 1];
    char v[64];
    switch (t->outcome) {
    case SR_TRACE_CONVERGED:
        sr_report_format_value(v, sizeof v, last->v, SR_Q_SPEED, c->units, 5);
        if (t->root >= 0)
            sr_report_note(r, "Iteration at %s: converged in %zu steps%s to %s, equilibrium %d of %zu (%s).%s", alt,
                           t->n, t->alternating ? ", jumping above and below" : "", v, t->root + 1, res->eq.n,
                           res->eq.root[t->root].stable ? "stable" : "unstable",
                           res->eq.n > 1 ? " The iteration does not show the other equilibria." : "");
        else
            sr_report_note(r, "Iteration at %s: settled at %s, which is not one of the equilibria (a step in the "
                              "drag curve).", alt, v);
        break;
    case SR_TRACE_CYCLE:
        sr_report_warning(r, "Iteration at %s: repeats a cycle of %d steps and never settles; the equilibria are "
                             "those in the table, not any value of the cycle.", alt, t->period);
        break;
    case SR_TRACE_OSCILLATING:
        sr_report_warning(r, "Iteration at %s: still jumping above and below after %zu steps, with no sign of "
                             "settling; the equilibria are those in the table.", alt, t->n);
        break;
    default:
        sr_report_warning(r, "Iteration at %s: not converged after %zu steps (tolerance %g on Cd); the equilibria "
                             "are those in the table.", alt, t->n, t->tol);
        break;
    }
}

int sr_cmd_freefall(sr_cli *c, int argc, char **argv)
{
    ff_opts o;
    memset(&o, 0, sizeof o);
    int first, rc = sr_cli_parse(c, argc, argv, OPTS, take, &o, HELP, &first);
    if (rc)
        return rc;
    if (first < argc)
        return sr_cli_fail(c, "unexpected argument '%s' (freefall takes options only)", argv[first]);

    sr_bluff_shape shape = SR_BLUFF_SPHERE;
    if (o.body) {
        static const char *names[] = {"sphere", "cylinder", "disk", "table"};
        int found = -1;
        for (int i = 0; i < 4; i++)
            if (strcmp(o.body, names[i]) == 0)
                found = i;
        if (found < 0)
            return sr_cli_fail(c, "--body: '%s' is not one of sphere, cylinder, disk, table", o.body);
        shape = (sr_bluff_shape)found;
    } else if (o.cd_table) {
        shape = SR_BLUFF_TABLE;
    }
    if (shape == SR_BLUFF_TABLE && !o.cd_table)
        return sr_cli_fail(c, "--cd-table: a table body needs its drag table (columns Re, Cd)");
    if (shape != SR_BLUFF_TABLE && o.cd_table)
        return sr_cli_fail(c, "--cd-table: a drag table goes with --body table, not --body %s", o.body);
    if (shape == SR_BLUFF_TABLE && o.curve)
        return sr_cli_fail(c, "--curve: a table body takes its curve from --cd-table");
    if (shape != SR_BLUFF_TABLE && (o.interp || o.area))
        return sr_cli_fail(c, "%s: only for a table body (--cd-table)", o.interp ? "--interp" : "--area");
    if (shape != SR_BLUFF_CYLINDER && o.length)
        return sr_cli_fail(c, "--length: only a cylinder has a length");
    if (!o.diameter)
        return sr_cli_fail(c, "--diameter: the body's diameter is required");
    if (!o.mass)
        return sr_cli_fail(c, "--mass: the body's mass is required");
    if (shape == SR_BLUFF_CYLINDER && !o.length)
        return sr_cli_fail(c, "--length: a cylinder needs its length");
    if (!o.trace && (o.start_cd || o.steps))
        return sr_cli_fail(c, "%s: goes with --trace", o.start_cd ? "--start-cd" : "--steps");

    double d, mass, len = 0, area = NAN, cd0 = 1.0;
    long steps = 50;
    if ((rc = sr_cli_quantity(c, "--diameter", o.diameter, SR_Q_LENGTH, 1, &d)) ||
        (rc = sr_cli_quantity(c, "--mass", o.mass, SR_Q_MASS, 1, &mass)))
        return rc;
    if (o.length && (rc = sr_cli_quantity(c, "--length", o.length, SR_Q_LENGTH, 1, &len)))
        return rc;
    if (o.area && (rc = sr_cli_quantity(c, "--area", o.area, SR_Q_AREA, 1, &area)))
        return rc;
    if (o.start_cd && (rc = sr_cli_quantity(c, "--start-cd", o.start_cd, SR_Q_NONE, 1, &cd0)))
        return rc;
    if (o.steps && (rc = sr_cli_count(c, "--steps", o.steps, 1, SR_BLUFF_TRACE_MAX, &steps)))
        return rc;
    if (mass > 1e5)
        return sr_cli_fail(c, "--mass: %g kg is beyond any body this tool is meant for", mass);
    sr_bluff_interp kind = SR_BLUFF_LOGLOG;
    if (o.interp) {
        if (strcmp(o.interp, "steffen") == 0)
            kind = SR_BLUFF_STEFFEN;
        else if (strcmp(o.interp, "loglog") != 0)
            return sr_cli_fail(c, "--interp: '%s' is not one of loglog, steffen", o.interp);
    }

    sr_error e;
    sr_bluff_curve curve;
    memset(&curve, 0, sizeof curve);
    if (shape == SR_BLUFF_TABLE) {
        if (sr_bluff_curve_load(&curve, o.cd_table, kind, &e))
            return sr_cli_fail(c, "--cd-table: %s", e.msg);
    } else {
        sr_bluff_curve_id id = sr_bluff_default_curve(shape);
        if (o.curve && sr_bluff_curve_lookup(o.curve, &id, &e))
            return sr_cli_fail(c, "--curve: %s", e.msg);
        if (sr_bluff_curve_init(&curve, id, &e))
            return sr_cli_fail(c, "--curve: %s", e.msg);
    }
    sr_bluff_body body;
    if (sr_bluff_body_init(&body, shape, &curve, d, len, mass, area, &e)) {
        sr_bluff_curve_free(&curve);
        return sr_cli_fail(c, "%s: %s", strstr(e.msg, "curve") ? "--curve" : "--body", e.msg);
    }

    sr_atmos atm;
    double ground = 0;
    sr_report *r = NULL;
    ff_result *res = NULL;
    double *alt = NULL;
    size_t nalt = 1;
    if ((rc = sr_cli_atmos(c, &o.atmos, &atm, &ground)))
        goto out;
    alt = malloc(MAX_ALT * sizeof *alt);
    res = calloc(MAX_ALT, sizeof *res);
    if (!alt || !res) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    alt[0] = ground;
    if (o.altitude) {
        if (strchr(o.altitude, ':') && !strchr(o.altitude, ','))
            rc = altitude_range(c, o.altitude, alt, &nalt);
        else
            rc = sr_cli_quantity_list(c, "--altitude", o.altitude, SR_Q_LENGTH, alt, MAX_ALT, &nalt);
        if (rc)
            goto out;
    }
    for (size_t i = 0; i < nalt; i++) {
        res[i].z = alt[i];
        if (sr_atmos_at(&atm, alt[i], &res[i].air, &e)) {
            rc = sr_cli_fail(c, "--altitude: %s", e.msg);
            goto out;
        }
        if (sr_bluff_equilibria_find(&body, &res[i].air, &res[i].eq, &e)) {
            char a[64];
            sr_report_format_value(a, sizeof a, alt[i], SR_Q_LENGTH, c->units, SR_FIXED(0));
            rc = sr_cli_fail(c, "at %s: %s", a, e.msg);
            rc = e.code == SR_EIMPOSSIBLE ? SR_EXIT_LIMIT : SR_EXIT_USAGE;
            goto out;
        }
    }

    r = sr_report_new("freefall", "free fall with Reynolds-dependent drag");
    sr_report_section(r, "Inputs");
    sr_report_text(r, "body", "body", body_word(shape));
    sr_report_value(r, "diameter", "diameter D (length in Re)", d, SR_Q_LENGTH, 4);
    if (shape == SR_BLUFF_CYLINDER) {
        sr_report_value(r, "length", "length L", len, SR_Q_LENGTH, 4);
        sr_report_value(r, "aspect_ratio", "L/D", len / d, SR_Q_NONE, 3);
    }
    sr_report_value(r, "mass", "mass", mass, SR_Q_MASS, 4);
    sr_report_value(r, "reference_area", "reference area of Cd", body.area, SR_Q_AREA, 4);
    sr_report_text(r, "reference_area_is", "reference area is the", body.area_ref);
    sr_report_text(r, "drag_curve", "drag curve", curve.name);
    sr_report_text(r, "drag_curve_source", "source", curve.source);
    char range[128];
    if (curve.re_min > 0 && isfinite(curve.re_max))
        snprintf(range, sizeof range, "Re %.3g to %.3g", curve.re_min, curve.re_max);
    else if (isfinite(curve.re_max))
        snprintf(range, sizeof range, "Re up to %.3g", curve.re_max);
    else
        snprintf(range, sizeof range, "all Re");
    sr_report_text(r, "drag_curve_range", "valid for", range);
    if (shape == SR_BLUFF_TABLE)
        sr_report_text(r, "interpolation", "interpolation",
                       kind == SR_BLUFF_STEFFEN ? "monotone cubic (Steffen) in log Re, log Cd"
                                                : "straight lines in log Re, log Cd");
    if (shape == SR_BLUFF_CYLINDER)
        sr_report_text(r, "length_factor", "finite-length factor",
                       "DNV-RP-C205 kappa by L/D (subcritical below Re 2e5, supercritical above 5e5, blended)");
    sr_cli_report_atmos(r, &atm);

    sr_rtable *t = sr_report_table(r, "equilibria", "Equilibrium speeds (drag = weight)");
    sr_rtable_column(t, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "density", "density", SR_Q_DENSITY, 4);
    sr_rtable_column(t, "number", "#", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_column(t, "speed", "speed", SR_Q_SPEED, 4);
    sr_rtable_column(t, "reynolds", "Re", SR_Q_NONE, 4);
    sr_rtable_column(t, "cd", "Cd", SR_Q_NONE, 3);
    sr_rtable_text_column(t, "stability", "stability");
    sr_rtable_column(t, "mach", "Mach", SR_Q_NONE, 2);
    sr_rtable_column(t, "energy", "energy", SR_Q_ENERGY, 3);
    sr_rtable_text_column(t, "notes", "notes");
    unsigned allwarn = 0;
    for (size_t i = 0; i < nalt; i++) {
        const sr_bluff_equilibria *q = &res[i].eq;
        size_t nstable = 0;
        for (size_t k = 0; k < q->n; k++) {
            const sr_bluff_root *x = &q->root[k];
            double row[] = {res[i].z, res[i].air.rho, (double)(k + 1), x->v, x->re, x->cd,
                            x->mach > 0 ? x->mach : NAN, 0.5 * mass * x->v * x->v};
            char tags[128];
            warn_tags(x->warn, tags, sizeof tags);
            const char *tx[] = {x->stable ? "stable" : "unstable", tags};
            sr_rtable_row(t, row, tx);
            nstable += x->stable && !(x->warn & SR_BLUFF_WARN_STEP);
        }
        allwarn |= q->warn;
        if (q->n > 1) {
            char a[64];
            sr_report_format_value(a, sizeof a, res[i].z, SR_Q_LENGTH, c->units, SR_FIXED(0));
            sr_report_warning(r, "At %s the body has %zu equilibrium speeds, %zu of them stable: which one it falls "
                                 "at depends on how it got there (a fixed-point iteration picks one without saying "
                                 "so). Plan for the fastest stable one.", a, q->n, nstable);
        }
    }
    for (unsigned bit = 1; bit <= SR_BLUFF_WARN_TRUNCATED; bit <<= 1)
        if (allwarn & bit)
            sr_report_warning(r, "%s.", sr_bluff_warn_text(bit));
    sr_report_note(r, "Every speed where drag equals weight, 1/2 rho v^2 Cd(Re) A = m g, found by scanning for sign "
                      "changes over Re %g to %g and refining each with a bracketing solver (Brent). Stable: drag grows "
                      "with speed through the equilibrium, so a disturbed body returns to it.",
                   res[0].eq.re_lo, res[0].eq.re_hi);
    sr_report_note(r, "Energy is the kinetic energy 1/2 m v^2 at that speed (ground impact at the ground altitude).");

    if (o.trace) {
        for (size_t i = 0; i < nalt; i++) {
            sr_bluff_trace tr;
            if (sr_bluff_trace_run(&body, &res[i].air, cd0, (int)steps, TRACE_TOL, &res[i].eq, &tr, &e)) {
                rc = sr_cli_fail_err(c, &e);
                goto out;
            }
            report_trace(r, c, i, &res[i], &tr);
        }
        sr_report_note(r, "The fixed-point iteration: take Cd, get the speed from the drag balance "
                          "v = sqrt(2 m g / (rho A Cd)), its Reynolds number Re = rho v D / mu, look up Cd(Re), repeat "
                          "until Cd changes by less than %g of itself.", TRACE_TOL);
    }
    if ((rc = sr_cli_emit(c, r)))
        goto out;
    if (c->plot_prefix)
        rc = write_plot(c, &body, res, nalt);
out:
    sr_report_free(r);
    free(res);
    free(alt);
    sr_atmos_free(&atm);
    sr_bluff_curve_free(&curve);
    return rc;
}
