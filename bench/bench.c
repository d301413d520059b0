/* bench.c - `make bench`: speed figures as ratios measured in one run.
 * Not a test: it prints, it never fails on a number. */
#define _DEFAULT_SOURCE
#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>

#include "physics/atmos.h"
#include "physics/bluff.h"
#include "files/catalog.h"
#include "analysis/dispersion.h"
#include "analysis/dispersion_mission.h"
#include "files/mission.h"
#include "physics/opening.h"
#include "physics/profile.h"
#include "analysis/band.h"
#include "analysis/design.h"
#include "analysis/judge.h"
#include "analysis/sweep.h"
#include <omp.h>
#include "files/yamldoc.h"
#include "output/fileio.h"
#include "analysis/fit.h"
#include "files/flightlog.h"

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* keeps the optimiser from dropping the loops */
static volatile double sink;

/* Cost per call of f over n altitudes spread across the model, best of 5 runs. */
static double per_call_exp(size_t n)
{
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double s = 0, t0 = now();
        for (size_t i = 0; i < n; i++)
            s += exp(-1e-4 * (double)(i % 86000));
        double t = (now() - t0) / (double)n;
        sink = s;
        if (t < best)
            best = t;
    }
    return best;
}

static double per_call_atmos(const sr_atmos *m, size_t n, int density_only)
{
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double s = 0, t0 = now();
        for (size_t i = 0; i < n; i++) {
            double z = (double)(i % 86000);
            if (density_only) {
                double rho;
                sr_atmos_density(m, z, &rho, NULL);
                s += rho;
            } else {
                sr_air a;
                sr_atmos_at(m, z, &a, NULL);
                s += a.rho;
            }
        }
        double t = (now() - t0) / (double)n;
        sink = s;
        if (t < best)
            best = t;
    }
    return best;
}

/* One opening-load solve (all three methods; the inflation ODE dominates),
 * a finite-mass case whose peak comes during filling, best of 5 runs. */
static double per_opening_solve(size_t n)
{
    sr_opening_input in;
    sr_opening_input_init(&in);
    in.d0 = 1.5;
    in.cds0 = 0.80 * 1.76714586764; /* CD0 0.80 on S0 of a 1.5 m canopy */
    in.mass = 5;
    in.v1 = 30;
    in.rho = 1.225;
    in.a = 340.294;
    in.n_fill = 8;
    in.cx = 1.7;
    in.path_angle = 0;
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double s = 0, t0 = now();
        for (size_t i = 0; i < n; i++) {
            sr_opening_result r;
            in.mass = 5 + 1e-6 * (double)(i % 7);
            sr_opening_solve(&in, &r, NULL);
            s += r.ode.force;
        }
        double t = (now() - t0) / (double)n;
        sink = s;
        if (t < best)
            best = t;
    }
    return best;
}

/* The same case on the fast path (fixed-step ODE, closed forms), best of 5. */
static double per_opening_fast(size_t n)
{
    sr_opening_input in;
    sr_opening_input_init(&in);
    in.d0 = 1.5;
    in.cds0 = 0.80 * 1.76714586764;
    in.mass = 5;
    in.v1 = 30;
    in.rho = 1.225;
    in.a = 340.294;
    in.n_fill = 8;
    in.cx = 1.7;
    in.path_angle = 0;
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double s = 0, t0 = now();
        for (size_t i = 0; i < n; i++) {
            sr_opening_quick q;
            in.mass = 5 + 1e-6 * (double)(i % 7);
            sr_opening_solve_fast(&in, &q, NULL);
            s += q.ode;
        }
        double t = (now() - t0) / (double)n;
        sink = s;
        if (t < best)
            best = t;
    }
    return best;
}

/* Banded staged descents judged (the design search's inner step): per
 * candidate the three band runs on the fast path, the opening load of every
 * stage over its bands (fast solver) and the one judge, with one read-only
 * context and a workspace per thread; candidates differ in canopy sizes and the
 * main's deployment height. Best of 5 at 1 and 2 threads. */
static void bench_band(void)
{
    const char *data = getenv("SINKRATE_DATA");
    char dir[1024], path[1024];
    snprintf(dir, sizeof dir, "%s/canopies", data ? data : ".");
    snprintf(path, sizeof path, "%s/payloads/desert-club-rocket-revised.yaml", data ? data : ".");
    sr_catalog *cat = malloc(sizeof *cat);
    sr_mission *m = calloc(1, sizeof *m);
    sr_error e;
    sr_band_ctx *bc = NULL;
    if (!cat || !m || sr_catalog_open(cat, dir, &e) || sr_mission_load(m, path, cat, &e) ||
        sr_band_ctx_new(&bc, m, NULL, &e)) {
        printf("banded judge: cannot set up the revised demo (%s)\n\n", cat && m ? e.msg : "out of memory");
        free(cat);
        free(m);
        return;
    }
    sr_judge_limits lim;
    sr_judge_limits_init(&lim, m);
    const size_t n = 20000;
    double rate[2] = {0, 0};
    int bad = 0;
    for (int rep = 0; rep < 5; rep++)
        for (int k = 0; k < 2; k++) {
            double t0 = now(), s = 0;
#pragma omp parallel num_threads(k + 1) reduction(+ : s, bad)
            {
                sr_band_work *w = NULL;
                sr_band_result *r = malloc(sizeof *r);
                sr_error te;
                if (!r || sr_band_work_new(&w, &te))
                    bad++;
#pragma omp for schedule(static)
                for (size_t i = 0; i < n; i++) {
                    if (!w || !r)
                        continue;
                    sr_profile_perturb p;
                    sr_profile_perturb_init(&p);
                    double u = (double)(i % 997) / 997.0, v = (double)(i % 101) / 101.0;
                    p.area_scale[0] = 0.8 + 0.5 * u;
                    p.area_scale[1] = 0.8 + 0.5 * v;
                    p.deploy_height[1] = -40 + 80 * u;
                    sr_verdict vd;
                    if (sr_band_run(bc, &p, SR_PROFILE_FAST, w, r, NULL, &te)) {
                        bad++;
                        continue;
                    }
                    sr_judge_band(&lim, r, SR_JUDGE_BAND_END, &vd);
                    s += vd.binding >= 0 ? vd.row[vd.binding].ratio : 0.0;
                }
                sr_band_work_free(w);
                free(r);
            }
            sink = s;
            rate[k] = fmax(rate[k], (double)n / (now() - t0));
        }
    if (bad)
        printf("banded judge: %d candidates failed\n", bad);
    printf("banded staged descents judged, fast path %8.0f /s at 1 thread, %8.0f at 2  (goal >= 20000 at 2)\n\n",
           rate[0], rate[1]);
    sr_band_ctx_free(bc);
    sr_mission_release(m);
    free(m);
    free(cat);
}

/* The design search (analysis/design.c) on the demo rocket: candidates
 * judged per second of wall time at 1 and 2 threads (each a banded staged
 * descent on the fast path, judged; the last stage's bisection steps count,
 * they are candidates too), and the large search: every pair of the
 * catalog's families for drogue and main, sizes continuous in their ranges, 20
 * main deployment heights, at 2 threads. Best of 3. */
static int design_once(const char *path, const sr_catalog *cat, int threads, int all, double *secs, size_t *cand,
                       size_t *combos)
{
    sr_mission *m = calloc(1, sizeof *m);
    sr_yaml y;
    sr_error e;
    if (!m || sr_mission_load_doc(m, path, cat, &y, &e)) {
        printf("design: cannot load %s (%s)\n", path, m ? e.msg : "out of memory");
        free(m);
        return 1;
    }
    sr_design_basis db;
    sr_mission_design_basis(m, &db);
    if (all)
        for (size_t k = 0; k < m->nstages; k++)
            sr_design_set_families(&m->design.stage[k], &db, k, cat, "all", "all", &e);
    /* no bays: every combination is searched to its end */
    for (size_t k = 0; k < m->nstages && all; k++)
        m->design.stage[k].bay = NAN;
    sr_design_opts o;
    sr_design_opts_init(&o);
    o.threads = threads;
    sr_design_result res;
    double t0 = now();
    int rc = sr_design_run(m, &y, cat, &o, &res, &e);
    *secs = now() - t0;
    if (rc)
        printf("design: %s\n", e.msg);
    else {
        *cand = res.candidates;
        *combos = res.ncombos;
        sr_design_result_free(&res);
    }
    sr_yaml_free(&y);
    sr_mission_release(m);
    free(m);
    return rc;
}

static void bench_design(void)
{
    const char *data = getenv("SINKRATE_DATA");
    char dir[1024], path[1024];
    snprintf(dir, sizeof dir, "%s/canopies", data ? data : ".");
    snprintf(path, sizeof path, "%s/payloads/desert-club-rocket.yaml", data ? data : ".");
    sr_catalog *cat = malloc(sizeof *cat);
    sr_error e;
    if (!cat || sr_catalog_open(cat, dir, &e)) {
        printf("design: no catalog\n\n");
        free(cat);
        return;
    }
    double rate[2] = {0, 0}, best_all = INFINITY, t;
    size_t cand = 0, combos = 0;
    for (int rep = 0; rep < 3; rep++)
        for (int k = 0; k < 2; k++)
            if (!design_once(path, cat, k + 1, 0, &t, &cand, &combos))
                rate[k] = fmax(rate[k], (double)cand / t);
    printf("design search, demo rocket (%zu combinations, %zu candidates): %8.0f candidates/s at 1 thread, %8.0f at "
           "2  (goal >= 20000 at 2)\n",
           combos, cand, rate[0], rate[1]);
    for (int rep = 0; rep < 3; rep++)
        if (!design_once(path, cat, 2, 1, &t, &cand, &combos))
            best_all = fmin(best_all, t);
    printf("design search, every pair of the %zu families, 20 main heights: %.2f s at 2 threads, %zu candidates = "
           "%.0f /s  (goal < 10 s)\n\n",
           cat->n, best_all, cand, (double)cand / best_all);
    free(cat);
}

/* Cost of finding every equilibrium of a body (one altitude), best of 5. */
static double per_call_equilibria(const sr_bluff_body *b, const sr_air *air, size_t n)
{
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double s = 0, t0 = now();
        for (size_t i = 0; i < n; i++) {
            sr_bluff_equilibria q;
            sr_bluff_equilibria_find(b, air, &q, NULL);
            s += q.root[0].v;
        }
        double t = (now() - t0) / (double)n;
        sink = s;
        if (t < best)
            best = t;
    }
    return best;
}

/* The staged descent of the demo mission: context build, one full profile
 * (ODE transients, quadrature stages, opening loads), one fast profile, and
 * perturbed fast samples; best of 5 runs each. */
static void bench_profile(void)
{
    const char *data = getenv("SINKRATE_DATA");
    char dir[1024], path[1024];
    snprintf(dir, sizeof dir, "%s/canopies", data ? data : ".");
    snprintf(path, sizeof path, "%s/payloads/desert-club-rocket.yaml", data ? data : ".");
    sr_catalog *cat = malloc(sizeof *cat);
    sr_mission *m = calloc(1, sizeof *m);
    sr_error e;
    if (!cat || !m || sr_catalog_open(cat, dir, &e) || sr_mission_load(m, path, cat, &e)) {
        printf("staged descent: cannot load the demo mission (%s)\n\n", cat && m ? e.msg : "out of memory");
        free(cat);
        free(m);
        return;
    }
    sr_profile_ctx *ctx = NULL;
    sr_profile_work *w = NULL;
    double best_ctx = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double t0 = now();
        sr_profile_ctx_free(ctx);
        if (sr_mission_profile(&ctx, m, NULL, &e)) {
            printf("staged descent: %s\n\n", e.msg);
            return;
        }
        best_ctx = fmin(best_ctx, now() - t0);
    }
    sr_profile_work_new(&w, &e);
    sr_profile_result r;
    double best[3] = {1e9, 1e9, 1e9};
    size_t reps[3] = {400, 200000, 200000};
    for (int mode = 0; mode < 3; mode++) {
        for (int rep = 0; rep < 5; rep++) {
            double s = 0, t0 = now();
            for (size_t i = 0; i < reps[mode]; i++) {
                sr_profile_perturb p;
                sr_profile_perturb_init(&p);
                if (mode == 2) {
                    /* a dispersion-like sample: every input moved */
                    double u = (double)(i % 1000) / 1000.0;
                    p.drag_scale[0] = 0.9 + 0.2 * u;
                    p.drag_scale[1] = 1.1 - 0.2 * u;
                    p.mass_scale = 0.97 + 0.06 * u;
                    p.wind_scale = 0.7 + 0.6 * u;
                    p.wind_turn = -0.3 + 0.6 * u;
                    p.deploy_height[1] = -20 + 40 * u;
                }
                sr_profile_run(ctx, &p, mode == 0 ? SR_PROFILE_FULL : SR_PROFILE_FAST, w, &r, NULL, NULL);
                s += r.descent_time;
            }
            sink = s;
            best[mode] = fmin(best[mode], (now() - t0) / (double)reps[mode]);
        }
    }
    printf("staged descent, demo mission: context   %7.1f us/build  (air and wind tables, nominal transients)\n",
           best_ctx * 1e6);
    printf("staged descent, full (ODE transients)   %7.1f us/profile               (goal < 1 ms)\n", best[0] * 1e6);
    printf("staged descent, fast (quadrature only)  %7.2f us/profile               (goal < 20 us)\n", best[1] * 1e6);
    printf("staged descent, fast, perturbed sample  %7.2f us/sample  = %.0f samples/s on one thread\n\n",
           best[2] * 1e6, 1.0 / best[2]);
    sr_profile_work_free(w);
    sr_profile_ctx_free(ctx);
    sr_mission_release(m);
    free(m);
    free(cat);
}

/* The rows of a 100 000-row altitude sweep (rate band, density, q, Mach,
 * time to the ground), physics only, best of 3: seconds per row. */
static double per_sweep_row(void)
{
    const char *data = getenv("SINKRATE_DATA");
    char dir[1024];
    snprintf(dir, sizeof dir, "%s/canopies", data && *data ? data : ".");
    sr_catalog *cat = malloc(sizeof *cat);
    sr_sweep_case c;
    memset(&c, 0, sizeof c);
    const sr_family *fam;
    if (!cat || sr_catalog_open(cat, dir, NULL) || !(fam = sr_catalog_find(cat, "conical", NULL)) ||
        sr_canopy_from_size(&c.canopy, fam, SR_SIZE_NOMINAL_DIAMETER, 2.2, NULL)) {
        free(cat);
        return NAN;
    }
    c.mass = 5.3;
    c.altitude = NAN;
    sr_atmos_init_standard(&c.atmos);
    size_t n = SR_SWEEP_MAX_ROWS;
    double *xs = malloc(n * sizeof *xs);
    sr_sweep_row *rows = malloc(n * sizeof *rows);
    double best = 1e9;
    for (size_t i = 0; xs && i < n; i++)
        xs[i] = 0.5 * (double)i;
    for (int rep = 0; xs && rows && rep < 3; rep++) {
        double t0 = now();
        sr_sweep_run(&c, SR_SWEEP_ALTITUDE, xs, n, rows, NULL, NULL, NULL);
        double t = (now() - t0) / (double)n;
        sink = rows[n - 1].t.typ;
        if (t < best)
            best = t;
    }
    free(xs);
    free(rows);
    free(cat);
    return best;
}

/* Monte Carlo dispersion of the demo mission (two stages), fast path, with a
 * full set of deviations; once with its power-law wind and once with a
 * 12-row wind table in its place. Samples per second at 1 and 2 threads,
 * best of 3 runs each, and the ratio. */
static double cpu_now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_PROCESS_CPUTIME_ID, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* Samples per second of wall time at 1 and 2 threads, the runs alternating
 * (best of 5 each, so that a passing load on this shared machine hits both
 * alike), and the process CPU time per sample of the best runs: when it stays
 * the same at two threads, the threads do not slow each other and the
 * wall-time ratio only reflects how many cores were free. */
static void disp_rates(const sr_disp_mission *dm, const sr_uncertainty *u, size_t n, double rate[2], double cpu[2])
{
    double best[2] = {1e9, 1e9};
    rate[0] = rate[1] = cpu[0] = cpu[1] = NAN;
    for (int rep = 0; rep < 5; rep++)
        for (int k = 0; k < 2; k++) {
            sr_disp_options o = {.n = n, .seed = 1, .threads = k + 1};
            sr_disp_result res;
            double t0 = now(), c0 = cpu_now();
            if (sr_disp_run(&dm->model, u, &o, &res, NULL))
                return;
            double t = now() - t0, c = cpu_now() - c0;
            sink = res.land[n - 1].east;
            sr_disp_result_release(&res);
            if (t < best[k]) {
                best[k] = t;
                cpu[k] = c / (double)n;
            }
        }
    rate[0] = (double)n / best[0];
    rate[1] = (double)n / best[1];
}

static void bench_dispersion(void)
{
    gsl_set_error_handler_off();
    const char *data = getenv("SINKRATE_DATA");
    char dir[1024], path[1024];
    snprintf(dir, sizeof dir, "%s/canopies", data ? data : ".");
    snprintf(path, sizeof path, "%s/payloads/desert-club-rocket.yaml", data ? data : ".");
    sr_catalog *cat = malloc(sizeof *cat);
    sr_mission *m = calloc(1, sizeof *m);
    sr_error e;
    if (!cat || !m || sr_catalog_open(cat, dir, &e) || sr_mission_load(m, path, cat, &e)) {
        printf("dispersion: cannot load the demo mission (%s)\n\n", cat && m ? e.msg : "out of memory");
        free(cat);
        free(m);
        return;
    }
    /* every kind of deviation at once (drag stays the family range) */
    sr_uncertainty *u = &m->unc;
    u->mass = (sr_dist){.kind = SR_DIST_NORMAL, .sigma = 0.02, .relative = 1};
    u->wind_speed = (sr_dist){.kind = SR_DIST_NORMAL, .sigma = 1.5};
    u->wind_dir = (sr_dist){.kind = SR_DIST_NORMAL, .sigma = 15.0 * 3.14159265358979 / 180.0};
    u->start_height = (sr_dist){.kind = SR_DIST_NORMAL, .sigma = 60.0};
    u->deploy_height = (sr_dist){.kind = SR_DIST_UNIFORM, .lo = -10.0, .hi = 10.0};
    const size_t n = 100000;
    for (int variant = 0; variant < 2; variant++) {
        if (variant == 1) {
            /* an invented 12-row wind table from the ground to 4 km */
            double h[12], v[12], from[12];
            for (int i = 0; i < 12; i++) {
                h[i] = i == 0 ? 0.0 : 10.0 * pow(400.0, (double)i / 11.0);
                v[i] = 3.0 + 1.5 * (double)i;
                from[i] = (240.0 + 3.0 * i) * 3.14159265358979 / 180.0;
            }
            sr_wind_release(&m->wind);
            if (sr_wind_init_table(&m->wind, h, v, from, 12, &e)) {
                printf("dispersion: %s\n", e.msg);
                break;
            }
        }
        sr_disp_mission dm;
        if (sr_disp_mission_init(&dm, m, NULL, 0, &e)) {
            printf("dispersion: %s\n", e.msg);
            break;
        }
        double rt[2], cp[2];
        disp_rates(&dm, u, n, rt, cp);
        double r1 = rt[0], r2 = rt[1], c1 = cp[0], c2 = cp[1];
        const char *what = variant ? "demo mission, 12-row wind table" : "demo mission, power-law wind";
        printf("dispersion, %-32s %9.0f samples/s at 1 thread, %9.0f at 2  (goal >= 200000 at 2)\n", what, r1,
               r2);
        printf("dispersion, %-32s 2 threads / 1 = %.2fx                        (goal >= 1.8x)\n", what, r2 / r1);
        printf("dispersion, %-32s CPU per sample 2 threads / 1 = %.2f; cores the 2-thread run got: %.2f\n", what,
               c2 / c1, c2 * r2);
        sr_disp_mission_free(&dm);
    }
    printf("\n");
    sr_mission_release(m);
    free(m);
    free(cat);
}

/* Seconds to load (or refuse) a YAML text, best of reps. */
static double per_yaml_load(const char *buf, size_t len, int reps)
{
    double best = 1e9;
    for (int r = 0; r < reps; r++) {
        double t0 = now();
        sr_yaml y;
        sr_error e;
        if (sr_yaml_load_string(&y, "bench", buf, len, &e) == SR_OK)
            sr_yaml_free(&y);
        best = fmin(best, now() - t0);
    }
    return best;
}

/* A hostile file costs about what a real one does: 0.9 MB of 29 000
 * anchors and 29 000 aliases (libyaml's own loader searches every anchor
 * for every alias: 16 s of CPU for such a file) against the demo mission. */
static void bench_yaml(void)
{
    char *demo;
    size_t dlen;
    sr_error e;
    if (sr_file_read("payloads/desert-club-rocket.yaml", 1u << 20, &demo, &dlen, &e)) {
        printf("yaml: %s\n\n", e.msg);
        return;
    }
    size_t cap = 1u << 20, n = 0;
    char *hostile = malloc(cap);
    if (!hostile) {
        free(demo);
        return;
    }
    for (int i = 0; i < 29000 && n + 64 < cap; i++)
        n += (size_t)snprintf(hostile + n, cap - n, "k%d: &a%d x\n", i, i);
    for (int i = 0; i < 29000 && n + 64 < cap; i++)
        n += (size_t)snprintf(hostile + n, cap - n, "r%d: *a%d\n", i, i);
    double t_demo = per_yaml_load(demo, dlen, 50), t_bad = per_yaml_load(hostile, n, 5);
    printf("yaml: the demo mission (%zu bytes)        %7.1f us/load\n", dlen, t_demo * 1e6);
    printf("yaml: 29k anchors x 29k aliases, refused %7.1f us      = %.0fx the demo mission (goal: < 1000x)\n\n",
           t_bad * 1e6, t_bad / t_demo);
    free(hostile);
    free(demo);
}

static double process_time(const char *bin, char *const argv[], int reps)
{
    double best = 1e9;
    for (int r = 0; r < reps; r++) {
        fflush(stdout); /* or the child's freopen flushes our buffered lines a second time */
        double t0 = now();
        pid_t p = fork();
        if (p == 0) {
            if (!freopen("/dev/null", "w", stdout))
                _exit(127);
            execv(bin, argv);
            _exit(127);
        }
        int st;
        waitpid(p, &st, 0);
        double t = now() - t0;
        if (t < best)
            best = t;
    }
    return best;
}

/* sinkrate fit's job on a two-stage, 20 Hz, 5-minute log (6 000 rows): a
 * descent in the standard atmosphere at steady rates with 1.5 m of noise,
 * read from memory and fitted (both stages, their intervals), best of 5. */
static void bench_fit(void)
{
    size_t cap = 6000 * 32 + 64, len = 0;
    char *b = malloc(cap);
    if (!b)
        return;
    len += (size_t)snprintf(b + len, cap - len, "time [s],height [m]\n");
    unsigned long long st = 88172645463325252ULL;
    double h = 0;
    for (int i = 0; i < 6000; i++) {
        double t = i / 20.0;
        if (t < 20)
            h = 1962.0 - 0.5 * 9.80665 * (20 - t) * (20 - t);
        else if (h > 300)
            h -= 20.0 / 20.0 * (1.0 + (h - 1000) * 5e-5); /* about 20 m/s, faster aloft */
        else if (h > 0)
            h -= 5.5 / 20.0;
        if (h < 0)
            h = 0;
        /* xorshift noise, uniform +-2.6 m (1.5 m standard deviation) */
        st ^= st << 13;
        st ^= st >> 7;
        st ^= st << 17;
        double u = (double)(st >> 11) / 9007199254740992.0;
        len += (size_t)snprintf(b + len, cap - len, "%.2f,%.2f\n", t, h + (u - 0.5) * 5.196);
    }
    double best = 1e9;
    int ok = 1;
    for (int rep = 0; rep < 5 && ok; rep++) {
        double t0 = now();
        sr_flightlog log;
        sr_error e;
        sr_atmos atm;
        sr_atmos_init_standard(&atm);
        if (sr_flightlog_parse(&log, "bench.csv", b, len, 0, &e)) {
            printf("fit: %s\n", e.msg);
            ok = 0;
            break;
        }
        sr_fit_setup s;
        sr_fit_setup_init(&s);
        s.atmos = &atm;
        s.ground = 0;
        s.mass = 5.0;
        s.pressure_altitude = 1; /* the conversion and the refit without it: the heavier case */
        sr_fit_result r;
        if (sr_fit_log(&log, &s, &r, &e)) {
            printf("fit: %s\n", e.msg);
            ok = 0;
        } else {
            sink = r.stage[0].cds + (double)r.nstages;
            sr_fit_result_free(&r);
        }
        sr_flightlog_free(&log);
        double t = now() - t0;
        if (t < best)
            best = t;
    }
    free(b);
    if (ok)
        printf("fit, two stages, 20 Hz, 5 min (6000 rows) %6.1f ms (read, convert, fit) (goal <= 50 ms)\n\n",
               best * 1e3);
}

/* The opening fit of one deployment (sr_fit_opening_history): a 100 Hz,
 * 7 s force history made by the opening model itself (speed only, not a
 * check), best of 5; as a multiple of one adaptive opening solve. */
static void bench_opening_fit(double t_solve)
{
    enum { N = 701 };
    double t[N], f[N], rel[N];
    sr_opening_input in;
    sr_opening_input_init(&in);
    in.cds0 = 1.5;
    in.d0 = 1.55;
    in.mass = 5.0;
    in.v1 = 33.0;
    in.rho = 1.1;
    in.a = 340;
    in.n_fill = 4;
    in.cx = 1;
    in.cds_other = 0.08;
    for (int i = 0; i < N; i++) {
        t[i] = -2.0 + i / 100.0;
        rel[i] = t[i] - 0.37;
    }
    sr_error e;
    if (sr_opening_trace_at(&in, 0.8, rel, N, f, NULL, &e) != SR_OK) {
        printf("opening fit: %s\n", e.msg);
        return;
    }
    for (int i = 0; i < N; i++)
        f[i] += 0.5 * in.rho * 33.0 * 33.0 * in.cds_other * (rel[i] <= 0);
    double best = 1e9;
    for (int rep = 0; rep < 5; rep++) {
        double t0 = now();
        sr_fit_opening o;
        if (sr_fit_opening_history(t, f, N, 0.17, &in, &o, &e) != SR_OK) {
            printf("opening fit: %s\n", e.msg);
            return;
        }
        sink = o.exponent;
        double dt = now() - t0;
        if (dt < best)
            best = dt;
    }
    printf("opening fit, 100 Hz, 7 s history        %7.1f ms       = %.0fx one opening solve (goal <= 100 ms)\n\n",
           best * 1e3, best / t_solve);
}

int main(int argc, char **argv)
{
    const char *bin = argc > 1 ? argv[1] : "build/sinkrate";
    printf("sinkrate bench (one run; ratios are within this run)\n\n");

    /* GSL's default handler aborts; the library's callers switch it off */
    gsl_set_error_handler_off();
    size_t n = 1000000;
    sr_atmos std;
    sr_atmos_init_standard(&std);
    sr_atmos site;
    sr_atmos_init_site(&site, 1380.0, 311.15, 85800.0, NULL);
    /* interleaved rounds, best of each: a busy neighbour slows both sides of a ratio alike */
    double t_exp = 1e9, t_at = 1e9, t_rho = 1e9, t_site = 1e9;
    for (int round = 0; round < 6; round++) {
        t_exp = fmin(t_exp, per_call_exp(n));
        t_at = fmin(t_at, per_call_atmos(&std, n, 0));
        t_rho = fmin(t_rho, per_call_atmos(&std, n, 1));
        t_site = fmin(t_site, per_call_atmos(&site, n, 0));
    }
    printf("atmosphere (1976 standard), full state  %7.1f ns/call  = %.2fx exp()   (goal <= 3x)\n", t_at * 1e9,
           t_at / t_exp);
    printf("atmosphere (1976 standard), density     %7.1f ns/call  = %.2fx exp()\n", t_rho * 1e9, t_rho / t_exp);
    printf("atmosphere (site model), full state     %7.1f ns/call  = %.2fx exp()\n", t_site * 1e9, t_site / t_exp);
    printf("libm exp()                              %7.1f ns/call\n\n", t_exp * 1e9);

    /* free fall: the whole Re scan (1e-6 .. 1e10) and Brent on each sign change */
    sr_air air;
    sr_atmos_at(&std, 0.0, &air, NULL);
    sr_bluff_curve cgw, cyl;
    sr_bluff_curve_init(&cgw, SR_CURVE_SPHERE_CGW, NULL);
    sr_bluff_curve_init(&cyl, SR_CURVE_CYL_COMPOSITE, NULL);
    sr_bluff_body sph, cy;
    sr_bluff_body_init(&sph, SR_BLUFF_SPHERE, &cgw, 0.2, 0, 0.5, NAN, NULL);
    sr_bluff_body_init(&cy, SR_BLUFF_CYLINDER, &cyl, 0.2, 2.0, 9.1, NAN, NULL);
    double t_sph = per_call_equilibria(&sph, &air, 200), t_cyl = per_call_equilibria(&cy, &air, 200);
    printf("all equilibria, sphere (3 roots)        %7.1f us/call  = %.0fx exp()   (goal: 256 altitudes < 0.1 s)\n",
           t_sph * 1e6, t_sph / t_exp);
    printf("all equilibria, finite cylinder (3)     %7.1f us/call  = %.0fx exp()\n\n", t_cyl * 1e6, t_cyl / t_exp);
    sr_bluff_curve_free(&cgw);
    sr_bluff_curve_free(&cyl);

    double t_open = per_opening_solve(2000), t_fast = per_opening_fast(200000);
    printf("opening loads, one ODE solve            %7.1f us/solve                 (goal < 50 us)\n", t_open * 1e6);
    printf("opening loads, fast path (fixed steps)  %7.2f us/solve  = %.0fx faster than the adaptive solve\n\n",
           t_fast * 1e6, t_open / t_fast);

    bench_yaml();
    bench_profile();
    bench_band();
    bench_design();
    bench_fit();
    bench_opening_fit(t_open);
    bench_dispersion();
    /* sweep: 100 000 altitude rows (0 .. 49 999.5 m by 0.5 m) as CSV to /dev/null */
    double t_row = per_sweep_row();
    char *sweep_argv[] = {(char *)"sinkrate", (char *)"sweep",    (char *)"--mass",   (char *)"5.3kg",
                          (char *)"--family", (char *)"conical",  (char *)"--nominal-diameter",
                          (char *)"2.2m",     (char *)"--from",   (char *)"0",        (char *)"--to",
                          (char *)"49999.5m", (char *)"--step",   (char *)"0.5m",     (char *)"--format",
                          (char *)"csv",      NULL};
    double t_sweep = process_time(bin, sweep_argv, 3);
    printf("sweep, 100 000 altitude rows as CSV     %7.0f rows/s (whole process, %.2f s)\n",
           (double)SR_SWEEP_MAX_ROWS / t_sweep, t_sweep);
    printf("sweep rows, physics only                %7.0f rows/s = %.0f%% of the run  (goal: output, not physics, "
           "is the limit: < 50%%)\n\n",
           1.0 / t_row, 100.0 * t_row * SR_SWEEP_MAX_ROWS / t_sweep);

    char *size_argv[] = {(char *)"sinkrate", (char *)"size",   (char *)"--mass",   (char *)"5.3 kg",
                         (char *)"--speed",  (char *)"6 m/s",  (char *)"--family", (char *)"conical",
                         NULL};
    char *ver_argv[] = {(char *)"sinkrate", (char *)"--version", NULL};
    double t_size = process_time(bin, size_argv, 20);
    double t_ver = process_time(bin, ver_argv, 20);
    char *ff_argv[] = {(char *)"sinkrate", (char *)"freefall", (char *)"--diameter", (char *)"0.2",
                       (char *)"--mass",   (char *)"0.5",      (char *)"--trace",    NULL};
    double t_ff = process_time(bin, ff_argv, 20);
    printf("whole process: sinkrate freefall --trace %6.2f ms  = %.2fx `sinkrate --version`\n", t_ff * 1e3,
           t_ff / t_ver);
    printf("whole process: sinkrate size ...        %7.2f ms  = %.2fx `sinkrate --version` (%.2f ms)\n",
           t_size * 1e3, t_size / t_ver, t_ver * 1e3);
    return 0;
}
