/* profile_plot.c - gnuplot data and script for `sinkrate profile --plot`:
 * height and speeds against time, the ground track with the wind along it,
 * and the wind profile. No plot module on main yet: written here, as the
 * other commands do, in the units of --units. */
#define _DEFAULT_SOURCE
#include "cli/profile_plot.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>

#include "cli/common.h"
#include "fileio.h"
#include "report.h"

#define PI 3.14159265358979323846

static void gp_quote(FILE *f, const char *s)
{
    fputc('"', f);
    for (; *s; s++) {
        if (*s == '\n') {
            fputs("\\n", f);
            continue;
        }
        if (*s == '"' || *s == '\\' || *s == '@' || *s == '&' || *s == '^' || *s == '_' || *s == '{' || *s == '}')
            fputc('\\', f); /* no enhanced-text markup from names */
        fputc(*s, f);
    }
    fputc('"', f);
}

static int write_mem(sr_cli *c, const char *path, char *buf, size_t len)
{
    sr_error e;
    int rc = sr_file_write_atomic(path, buf, len, &e);
    free(buf);
    return rc ? sr_cli_fail(c, "--plot: %s", e.msg) : 0;
}

static const char *base_name(const char *p)
{
    const char *s = strrchr(p, '/');
    return s ? s + 1 : p;
}

/* gnuplot, when on PATH, run in the prefix's directory so the script's
 * plain file names hold; its absence is not an error. */
static int render(sr_cli *c, const char *prefix, const char *gp)
{
    const char *path = getenv("PATH");
    int found = 0;
    if (path) {
        char buf[4096];
        snprintf(buf, sizeof buf, "%s", path);
        char *save = NULL;
        for (char *dir = strtok_r(buf, ":", &save); dir && !found; dir = strtok_r(NULL, ":", &save)) {
            char cand[4200];
            snprintf(cand, sizeof cand, "%s/gnuplot", *dir ? dir : ".");
            found = access(cand, X_OK) == 0;
        }
    }
    if (!found)
        return 0;
    char dir[4096];
    snprintf(dir, sizeof dir, "%s", prefix);
    char *slash = strrchr(dir, '/');
    if (slash)
        *slash = '\0';
    else
        snprintf(dir, sizeof dir, ".");
    fflush(c->out);
    fflush(c->err);
    pid_t pid = fork();
    if (pid < 0)
        return sr_cli_fail(c, "--plot: cannot start gnuplot");
    if (pid == 0) {
        if (chdir(dir) != 0 || !freopen("/dev/null", "w", stdout) || !freopen("/dev/null", "w", stderr))
            _exit(126);
        execlp("gnuplot", "gnuplot", base_name(gp), (char *)NULL);
        _exit(127);
    }
    int st = 0;
    if (waitpid(pid, &st, 0) < 0 || !WIFEXITED(st) || WEXITSTATUS(st) != 0)
        return sr_cli_fail(c, "--plot: gnuplot failed on %s", gp);
    return 0;
}

int sr_profile_plot(sr_cli *c, const sr_mission *m, const sr_profile_ctx *ctx, const sr_profile_result *r,
                    const sr_profile_track *tr)
{
    sr_unit_system us = c->units;
    const char *fmt = c->plot_format && strcmp(c->plot_format, "svg") == 0 ? "svg" : "png";
    char dat[4096], gp[4096], img[4096];
    snprintf(dat, sizeof dat, "%s.dat", c->plot_prefix);
    snprintf(gp, sizeof gp, "%s.gp", c->plot_prefix);
    snprintf(img, sizeof img, "%s.%s", c->plot_prefix, fmt);
    const char *ul = sr_units_label(SR_Q_LENGTH, us), *uv = sr_units_label(SR_Q_SPEED, us);
#define L(x) sr_units_from_si((x), SR_Q_LENGTH, us)
#define V(x) sr_units_from_si((x), SR_Q_SPEED, us)

    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    if (!f)
        return sr_cli_fail(c, "out of memory");
    fprintf(f, "# sinkrate profile: %s\n# ", m->name);
    fputs(sr_report_caution(), f);
    fputc('\n', f);
    /* index 0 .. nbodies-1: the track of each body */
    double emin = 0, emax = 0, nmin = 0, nmax = 0, hmax = m->start_height;
    for (size_t b = 0; b < r->nbodies; b++) {
        char bn[256];
        sr_mission_set_name(m, r->body[b].sections, bn, sizeof bn);
        fprintf(f, "%s# index %zu: track of %s: time [s], height [%s], east [%s], north [%s], airspeed [%s], "
                   "descent rate [%s]\n",
                b ? "\n\n" : "", b, bn, ul, ul, ul, uv, uv);
        for (size_t i = 0; i < tr->n; i++) {
            const sr_profile_point *p = &tr->pt[i];
            if (p->body != (int)b)
                continue;
            fprintf(f, "%.6g %.6g %.6g %.6g %.6g %.6g\n", p->t, L(p->h), L(p->east), L(p->north), V(p->speed),
                    V(p->rate));
            emin = fmin(emin, p->east);
            emax = fmax(emax, p->east);
            nmin = fmin(nmin, p->north);
            nmax = fmax(nmax, p->north);
            hmax = fmax(hmax, p->h);
        }
    }
    size_t ib = r->nbodies;
    fprintf(f, "\n\n# index %zu: events: time [s], height [%s], east [%s], north [%s], label\n", ib, ul, ul, ul);
    for (size_t i = 0; i < r->nevents; i++) {
        const sr_profile_event *e = &r->events[i];
        if (e->kind != SR_EVENT_DEPLOY && e->kind != SR_EVENT_TOUCHDOWN)
            continue;
        char lab[160];
        if (e->kind == SR_EVENT_DEPLOY)
            snprintf(lab, sizeof lab, "%s", m->stages[e->stage].name);
        else
            snprintf(lab, sizeof lab, "touchdown");
        for (char *q = lab; *q; q++)
            if (*q == '"')
                *q = '\'';
        fprintf(f, "%.6g %.6g %.6g %.6g \"%s\"\n", e->t, L(e->h), L(e->east), L(e->north), lab);
    }
    /* the wind along each track: arrows scaled to a tenth of the map */
    double span = fmax(fmax(emax - emin, nmax - nmin), 1.0), wmax = 0;
    const int NW = 60;
    for (int i = 0; i <= NW; i++) {
        double rho, a, g, we, wn;
        sr_profile_air(ctx, hmax * i / NW, &rho, &a, &g, &we, &wn);
        wmax = fmax(wmax, hypot(we, wn));
    }
    double scale = wmax > 0 ? 0.1 * span / wmax : 0;
    fprintf(f, "\n\n# index %zu: wind along the tracks (arrows, %.3g %s per %s): east, north, d east, d north\n",
            ib + 1, L(scale), ul, uv);
    for (size_t b = 0; b < r->nbodies; b++) {
        size_t n = 0, every;
        for (size_t i = 0; i < tr->n; i++)
            n += tr->pt[i].body == (int)b;
        every = n / 12 + 1;
        for (size_t i = 0, k = 0; i < tr->n; i++) {
            const sr_profile_point *p = &tr->pt[i];
            if (p->body != (int)b || (k++ % every) != 0)
                continue;
            double rho, a, g, we, wn;
            sr_profile_air(ctx, p->h, &rho, &a, &g, &we, &wn);
            fprintf(f, "%.6g %.6g %.6g %.6g\n", L(p->east), L(p->north), L(we * scale), L(wn * scale));
        }
    }
    fprintf(f, "\n\n# index %zu: wind profile: height [%s], speed [%s], from [deg]\n", ib + 2, ul, uv);
    for (int i = 0; i <= 200; i++) {
        double h = hmax * i / 200, rho, a, g, we, wn, s, from;
        sr_profile_air(ctx, h, &rho, &a, &g, &we, &wn);
        sr_wind_polar(we, wn, &s, &from);
        fprintf(f, "%.6g %.6g %.6g\n", L(h), V(s), s > 0 ? from * 180 / PI : NAN);
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
    const char *d = base_name(dat);
    fprintf(f, "# sinkrate profile: the staged descent of a mission (gnuplot script; run it in this directory)\n# ");
    fputs(sr_report_caution(), f);
    fprintf(f, "\nif (!exists(\"out\")) out = ");
    gp_quote(f, base_name(img));
    if (strcmp(fmt, "svg") == 0)
        fprintf(f, "\nset terminal svg size 1200,900 dynamic font \"sans,11\" background rgb \"white\"\n");
    else
        fprintf(f, "\nset terminal pngcairo size 1200,900 font \"sans,10\"\n");
    fprintf(f, "set output out\nset datafile commentschars \"#\"\nset grid lc rgb \"#dddddd\"\nset key top right\n");
    fprintf(f, "set multiplot layout 2,2 title ");
    char title[600];
    snprintf(title, sizeof title, "%s\n%s", m->name, sr_report_caution());
    /* the caution wraps onto the title's second line at ~150 characters */
    char wrapped[800];
    size_t w = 0, col = 0;
    for (const char *p = title; *p && w < sizeof wrapped - 2; p++) {
        if (*p == '\n')
            col = 0;
        if (*p == ' ' && col > 140) {
            wrapped[w++] = '\n';
            col = 0;
            continue;
        }
        wrapped[w++] = *p;
        col++;
    }
    wrapped[w] = '\0';
    gp_quote(f, wrapped);
    fprintf(f, " font \",10\"\n");
    /* colours by body */
    static const char *const COL[] = {"#1f5fa8", "#c0392b", "#2e8b57", "#8e44ad", "#d35400", "#16a085", "#7f8c8d",
                                      "#b7950b"};
    fprintf(f, "\nset title \"height above ground\"\nset xlabel \"time [s]\"\nset ylabel \"height [%s]\"\n", ul);
    fprintf(f, "plot ");
    for (size_t b = 0; b < r->nbodies; b++) {
        char bn[256];
        sr_mission_set_name(m, r->body[b].sections, bn, sizeof bn);
        fprintf(f, "\"%s\" index %zu using 1:2 with lines lw 2 lc rgb \"%s\" title ", d, b, COL[b % 8]);
        gp_quote(f, bn);
        fprintf(f, ", \\\n     ");
    }
    fprintf(f, "\"%s\" index %zu using 1:2 with points pt 7 ps 0.8 lc rgb \"black\" notitle, \\\n     "
               "\"%s\" index %zu using 1:2:5 with labels offset 1,0.6 left font \",8\" notitle\n",
            d, ib, d, ib);
    fprintf(f, "\nset title \"speed\"\nset xlabel \"time [s]\"\nset ylabel \"speed [%s]\"\nset yrange [0:*]\nplot ", uv);
    for (size_t b = 0; b < r->nbodies; b++)
        fprintf(f, "\"%s\" index %zu using 1:($6>0?$6:1/0) with lines lw 2 lc rgb \"%s\" title \"descent rate%s\", "
                   "\\\n     \"%s\" index %zu using 1:5 with lines dt 2 lc rgb \"%s\" title \"airspeed%s\", \\\n     ",
                d, b, COL[b % 8], b ? " (separated)" : "", d, b, COL[b % 8], b ? " (separated)" : "");
    if (!isnan(m->limit_speed))
        fprintf(f, "%.6g with lines dt 3 lc rgb \"#c0392b\" title \"touchdown limit\"\n", V(m->limit_speed));
    else
        fprintf(f, "1/0 notitle\n");
    fprintf(f, "set autoscale y\n");
    fprintf(f, "\nset title \"ground track, with the wind at the body's height\"\nset xlabel \"east [%s]\"\n"
               "set ylabel \"north [%s]\"\nset size ratio -1\nset key bottom right\n",
            ul, ul);
    double reach = fmax(fmax(-emin, emax), fmax(-nmin, nmax));
    if (!isnan(m->limit_drift) && m->limit_drift < 2.5 * reach) {
        /* the limit circle around the launch point, and room for it (when it is not far off) */
        double R = 1.05 * fmax(m->limit_drift, reach);
        fprintf(f, "set object 1 circle at 0,0 size %.6g fs empty border rgb \"#c0392b\" dt 3\n", L(m->limit_drift));
        fprintf(f, "set xrange [%.6g:%.6g]\nset yrange [%.6g:%.6g]\n", L(-R), L(R), L(-R), L(R));
        fprintf(f, "set label 1 \"drift limit\" at first %.6g, first %.6g center textcolor rgb \"#c0392b\" "
                   "font \",8\"\n",
                0.0, L(m->limit_drift * 0.92));
    }
    fprintf(f, "plot ");
    for (size_t b = 0; b < r->nbodies; b++)
        fprintf(f, "\"%s\" index %zu using 3:4 with lines lw 2 lc rgb \"%s\" notitle, \\\n     ", d, b, COL[b % 8]);
    fprintf(f, "\"%s\" index %zu using 1:2:3:4 with vectors head filled size screen 0.008,20 lc rgb \"#7f8c8d\" "
               "title \"wind\", \\\n     "
               "\"%s\" index %zu using 3:4 with points pt 7 ps 0.8 lc rgb \"black\" notitle, \\\n     "
               "\"+\" using (0):(0) every ::0::0 with points pt 2 ps 2 lc rgb \"black\" title \"launch point\"\n",
            d, ib + 1, d, ib);
    fprintf(f, "unset object 1\nunset label 1\nset autoscale xy\n");
    fprintf(f, "set size noratio\nset key top right\n");
    fprintf(f, "\nset title \"wind\"\nset xlabel \"speed [%s]\"\nset ylabel \"height [%s]\"\nset x2label "
               "\"direction it blows from [deg]\"\nset x2tics 0,90,360\nset x2range [0:360]\nplot \"%s\" index %zu "
               "using 2:1 with lines lw 2 lc rgb \"#1f5fa8\" title \"speed\", \\\n     \"%s\" index %zu using 3:1 "
               "axes x2y1 with lines dt 2 lc rgb \"#d35400\" title \"from\"\n",
            uv, ul, d, ib + 2, d, ib + 2);
    fprintf(f, "unset multiplot\n");
    fclose(f);
    if ((rc = write_mem(c, gp, buf, len)))
        return rc;
    return render(c, c->plot_prefix, gp);
#undef L
#undef V
}
