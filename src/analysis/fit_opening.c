/* fit_opening.c - the opening of a stage from the log's acceleration column:
 * the peak, and the inflation ODE of physics/opening.c fitted to the force
 * history (growth exponent, filling time, line stretch, load factor). */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_multimin.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/fit_int.h"

/* The fit's acceptance, our choice: a filling time resolved by ten rows (the
 * rate rule), a residual within a fifth of the rise. */
#define MIN_ROWS_FILL 10.0
#define MAX_RMS_OF_JUMP 0.2
/* the load factor a canopy can show (CX of the catalog families is 1 .. 2; our margin) */
#define K_MIN 0.3
#define K_MAX 3.0

static void unresolved(sr_fit_opening *o, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(o->unresolved, sizeof o->unresolved, fmt, ap);
    va_end(ap);
}

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

static double crossing(const double *t, const double *a, size_t i, double level)
{
    /* the time between rows i-1 and i where a crosses level */
    double d = a[i] - a[i - 1];
    return d != 0.0 ? t[i - 1] + (level - a[i - 1]) / d * (t[i] - t[i - 1]) : t[i];
}

/* One trial of the fit: the window's rows and the model. */
typedef struct trial {
    const double *t, *y; /* window rows: time, measured force */
    size_t n;
    sr_opening_input in;
    double *rel, *fm, *vm; /* scratch: time after line stretch, model force, model speed */
    double lo[3], hi[3];   /* bounds of (n, ln t_f, t_line) */
    double k, c;           /* the linear part at the last evaluation: scale and offset */
} trial;

/* Sum of squares of measured - (k F_model + c + drag of what else is open),
 * k and c by linear least squares; HUGE_VAL when the ODE fails. */
static double sse_at(trial *T, double nexp, double tf, double tls)
{
    for (size_t i = 0; i < T->n; i++)
        T->rel[i] = T->t[i] - tls;
    T->in.exponent = nexp;
    if (sr_opening_trace_at(&T->in, tf, T->rel, T->n, T->fm, T->vm, NULL) != SR_OK)
        return HUGE_VAL;
    double N = (double)T->n, sf = 0, sff = 0, sy = 0, sfy = 0;
    for (size_t i = 0; i < T->n; i++) {
        double y = T->y[i] - 0.5 * T->in.rho * T->vm[i] * T->vm[i] * T->in.cds_other;
        T->vm[i] = y; /* the canopy's share of the measured force */
        sf += T->fm[i];
        sff += T->fm[i] * T->fm[i];
        sy += y;
        sfy += T->fm[i] * y;
    }
    double det = N * sff - sf * sf;
    if (!(det > 0))
        return HUGE_VAL;
    T->k = (N * sfy - sf * sy) / det;
    T->c = (sy - T->k * sf) / N;
    double s = 0;
    for (size_t i = 0; i < T->n; i++) {
        double r = T->vm[i] - T->k * T->fm[i] - T->c;
        s += r * r;
    }
    return s;
}

/* The simplex's objective: inside the bounds the sum of squares, outside it
 * that of the nearest point inside, raised with the distance. */
static double objective(const gsl_vector *x, void *params)
{
    trial *T = params;
    double p[3], out = 0;
    for (int j = 0; j < 3; j++) {
        double v = gsl_vector_get(x, j), w = T->hi[j] - T->lo[j];
        p[j] = fmin(fmax(v, T->lo[j]), T->hi[j]);
        out += fabs(v - p[j]) / w;
    }
    double s = sse_at(T, p[0], exp(p[1]), p[2]);
    return out > 0 ? (s + 1.0) * (1.0 + 1e3 * out) : s;
}

static int fit_model(trial *T, double best[3], double *sse, sr_error *err)
{
    /* the bounded grid: n, ln t_f and the line stretch */
    static const double NS[] = {0.5, 0.75, 1.0, 1.5, 2.0, 2.5, 3.0, 3.5, 4.0};
    const int NTF = 16, NLS = 6;
    *sse = HUGE_VAL;
    for (size_t a = 0; a < sizeof NS / sizeof NS[0]; a++)
        for (int b = 0; b < NTF; b++)
            for (int c = 0; c < NLS; c++) {
                double p[3] = {NS[a], T->lo[1] + (T->hi[1] - T->lo[1]) * b / (NTF - 1),
                               T->lo[2] + (T->hi[2] - T->lo[2]) * c / (NLS - 1)};
                double s = sse_at(T, p[0], exp(p[1]), p[2]);
                if (s < *sse) {
                    *sse = s;
                    memcpy(best, p, sizeof p);
                }
            }
    if (!isfinite(*sse))
        return sr_error_set(err, SR_ENUMERIC, "opening fit: the inflation ODE failed on every trial");
    /* refined by the simplex */
    gsl_multimin_fminimizer *m = gsl_multimin_fminimizer_alloc(gsl_multimin_fminimizer_nmsimplex2, 3);
    gsl_vector *x = gsl_vector_alloc(3), *ss = gsl_vector_alloc(3);
    if (!m || !x || !ss) {
        gsl_multimin_fminimizer_free(m);
        gsl_vector_free(x);
        gsl_vector_free(ss);
        return sr_error_set(err, SR_ENOMEM, "opening fit: out of memory");
    }
    gsl_multimin_function f = {objective, 3, T};
    for (int j = 0; j < 3; j++) {
        gsl_vector_set(x, j, best[j]);
        gsl_vector_set(ss, j, 0.1 * (T->hi[j] - T->lo[j]));
    }
    if (gsl_multimin_fminimizer_set(m, &f, x, ss) == GSL_SUCCESS) {
        for (int it = 0; it < 600; it++) {
            if (gsl_multimin_fminimizer_iterate(m) != GSL_SUCCESS)
                break;
            if (gsl_multimin_test_size(gsl_multimin_fminimizer_size(m), 1e-5) == GSL_SUCCESS)
                break;
        }
        if (m->fval < *sse)
            for (int j = 0; j < 3; j++)
                best[j] = fmin(fmax(gsl_vector_get(m->x, j), T->lo[j]), T->hi[j]);
    }
    gsl_multimin_fminimizer_free(m);
    gsl_vector_free(x);
    gsl_vector_free(ss);
    /* the linear part and the sum at the point kept */
    *sse = sse_at(T, best[0], exp(best[1]), best[2]);
    return SR_OK;
}

int sr_fit_opening_history(const double *t, const double *force, size_t n, double t_deploy,
                           const sr_opening_input *model, sr_fit_opening *o, sr_error *err)
{
    o->measured = 0;
    o->force = o->t_peak = NAN;
    o->t_fill = o->exponent = o->olf = o->t_line = o->residual = o->nsamples = NAN;
    o->unresolved[0] = '\0';
    if (!t || !force || !model || n < 2)
        return sr_error_set(err, SR_EINVAL, "opening fit: no force history");
    double step = (t[n - 1] - t[0]) / (double)(n - 1);
    double g = model->g > 0 ? model->g : 9.80665;
    /* the steady level before: median of the second before the deployment */
    size_t i0 = 0;
    while (i0 < n && t[i0] < t_deploy)
        i0++;
    double *before = malloc(n * sizeof *before);
    if (!before)
        return sr_error_set(err, SR_ENOMEM, "opening fit: out of memory");
    size_t nb = 0;
    for (size_t i = 0; i < i0; i++)
        if (t[i] >= t_deploy - 1.0)
            before[nb++] = force[i];
    qsort(before, nb, sizeof *before, cmp_double);
    double f0 = nb ? before[nb / 2] : NAN;
    free(before);
    if (nb < 3 || i0 >= n) {
        unresolved(o, "fewer than three rows before or after the deployment");
        return SR_OK;
    }
    /* the peak within 4 s of the deployment */
    size_t ip = i0;
    for (size_t i = i0; i < n && t[i] <= t_deploy + 4.0; i++)
        if (force[i] > force[ip])
            ip = i;
    double jump = force[ip] - f0;
    if (!(jump > 0.5 * model->mass * g) || ip == i0) {
        unresolved(o, "no clear rise (less than 0.5 g within 4 s of the deployment)");
        return SR_OK;
    }
    o->measured = 1;
    o->force = force[ip];
    o->t_peak = t[ip] - t_deploy;
    /* the first row of the rise above 10 % of the jump */
    size_t i10 = ip;
    while (i10 > i0 && force[i10 - 1] > f0 + 0.1 * jump)
        i10--;
    if (i10 == 0 || ip - i10 + 1 < 4) {
        unresolved(o, "rate too low: the rise spans %zu rows, 4 needed", ip - i10 + 1);
        return SR_OK;
    }
    if (!(model->v1 > 0)) {
        unresolved(o, "no speed at the deployment");
        return SR_OK;
    }
    double t10 = crossing(t, force, i10, f0 + 0.1 * jump), rise = t[ip] - t10;
    /* the window: the level before the rise, the rise, the peak and a little after */
    double tlo = fmax(t10 - 3.0 * rise - 0.2, t[0]), thi = t[ip] + fmax(0.5 * rise, 3.0 * step);
    size_t ws = 0, we = 0;
    while (ws < n && t[ws] < tlo)
        ws++;
    we = ws;
    while (we < n && t[we] <= thi)
        we++;
    trial T = {.t = t + ws, .y = force + ws, .n = we - ws, .in = *model};
    T.in.n_fill = 1.0; /* the filling time is the fit's; these only pass the checks */
    T.in.cx = 1.0;
    T.lo[0] = SR_FIT_OPENING_N_MIN, T.hi[0] = SR_FIT_OPENING_N_MAX;
    T.lo[1] = log(SR_FIT_OPENING_TF_MIN), T.hi[1] = log(SR_FIT_OPENING_TF_MAX);
    T.lo[2] = tlo, T.hi[2] = t10;
    T.rel = malloc(3 * T.n * sizeof *T.rel);
    if (!T.rel)
        return sr_error_set(err, SR_ENOMEM, "opening fit: out of memory");
    T.fm = T.rel + T.n;
    T.vm = T.fm + T.n;
    double best[3], sse;
    int rc = fit_model(&T, best, &sse, err);
    free(T.rel);
    if (rc != SR_OK)
        return rc;
    double nexp = best[0], tf = exp(best[1]);
    o->residual = sqrt(sse / (double)T.n);
    o->nsamples = tf / step;
    const char *bound = NULL;
    if (nexp <= SR_FIT_OPENING_N_MIN * 1.01 || nexp >= SR_FIT_OPENING_N_MAX * 0.99)
        bound = "growth exponent";
    else if (tf <= SR_FIT_OPENING_TF_MIN * 1.02 || tf >= SR_FIT_OPENING_TF_MAX / 1.02)
        bound = "filling time";
    else if (best[2] <= tlo + 0.25 * step)
        bound = "line stretch";
    if (bound) {
        unresolved(o, "fit at a bound of the %s (n %.3g, t_f %.3g s)", bound, nexp, tf);
        return SR_OK;
    }
    if (o->nsamples < MIN_ROWS_FILL) {
        unresolved(o, "rate too low: %.3g rows over the fitted filling time, %g needed", o->nsamples, MIN_ROWS_FILL);
        return SR_OK;
    }
    if (o->residual > MAX_RMS_OF_JUMP * jump) {
        unresolved(o, "the model does not follow the rise (rms %.0f %% of the jump)", 100.0 * o->residual / jump);
        return SR_OK;
    }
    if (!(T.k >= K_MIN && T.k <= K_MAX)) {
        unresolved(o, "load factor %.3g outside %g .. %g: the drag area or the speed does not fit this rise", T.k,
                   K_MIN, K_MAX);
        return SR_OK;
    }
    o->exponent = nexp;
    o->t_fill = tf;
    o->t_line = best[2] - t_deploy;
    o->olf = T.k;
    o->model = T.in;
    o->model.exponent = nexp;
    o->offset = T.c;
    return SR_OK;
}

int sr_fit_opening_curve(const sr_fit_opening *o, const double *s, size_t n, double *force, sr_error *err)
{
    if (!(o->exponent > 0) || !s || !force || n == 0)
        return sr_error_set(err, SR_EINVAL, "opening curve: no resolved fit");
    double *rel = malloc(2 * n * sizeof *rel);
    if (!rel)
        return sr_error_set(err, SR_ENOMEM, "opening curve: out of memory");
    double *v = rel + n;
    for (size_t i = 0; i < n; i++)
        rel[i] = s[i] - o->t_line;
    int rc = sr_opening_trace_at(&o->model, o->t_fill, rel, n, force, v, err);
    if (rc == SR_OK)
        for (size_t i = 0; i < n; i++)
            force[i] = o->olf * force[i] + 0.5 * o->model.rho * v[i] * v[i] * o->model.cds_other + o->offset;
    free(rel);
    return rc;
}

int sr_fit_find_opening(const sr_flightlog *log, const sr_fit_result *r, const sr_fit_stage_spec *sp, sr_fit_stage *st,
                        const fit_air *air, const sr_atmos *atm, sr_error *err)
{
    (void)air;
    sr_fit_opening *o = &st->opening;
    memset(o, 0, sizeof *o);
    o->force = o->t_peak = o->t_fill = o->exponent = o->olf = o->t_line = o->residual = o->nsamples = NAN;
    o->peak_ratio = NAN;
    size_t n = log->n, i0 = st->row_deploy;
    const double *t = log->t;
    /* the speed at deployment: the descent rate just before it (the airspeed when the fall is vertical) */
    size_t ib = i0;
    while (ib > 0 && t[ib] > t[i0] - 1.0)
        ib--;
    o->speed = fmax(r->rate[ib], 0.0);
    sr_air air_d;
    if (sr_atmos_at(atm, r->ground + r->smooth[i0], &air_d, NULL)) {
        unresolved(o, "no air at the deployment height");
        return SR_OK;
    }
    o->q = 0.5 * air_d.rho * o->speed * o->speed;
    /* the rate that resolves it: ten samples over the predicted filling time n D0 / v, 20 Hz at least */
    double tf = 0.5;
    if (sp->has_canopy && o->speed > 1.0)
        tf = sp->canopy.fam.fill_n * sp->canopy.d0.typ / o->speed;
    o->rate_needed = fmax(20.0, 10.0 / tf);
    if (1.0 / log->step < o->rate_needed) {
        unresolved(o, "rate too low: the log has %.3g Hz, %.3g Hz needed", 1.0 / log->step, o->rate_needed);
        return SR_OK;
    }
    if (o->speed < 1.0) {
        unresolved(o, "no speed at the deployment (below 1 m/s)");
        return SR_OK;
    }
    if (!(st->own > 0)) {
        unresolved(o, "no drag area of the canopy");
        return SR_OK;
    }
    /* the rows from 1.5 s before the deployment to 6 s after it */
    size_t a = ib > 0 ? ib - 1 : 0, b = i0;
    while (a > 0 && t[a] > t[i0] - 1.5)
        a--;
    while (b < n && t[b] <= t[i0] + 6.0)
        b++;
    double *f = malloc((b - a) * sizeof *f);
    if (!f)
        return sr_error_set(err, SR_ENOMEM, "opening fit: out of memory");
    for (size_t i = a; i < b; i++)
        f[i - a] = sp->mass * log->acc[i];
    sr_opening_input in;
    sr_opening_input_init(&in);
    int count = sp->has_canopy ? sp->canopy.count : 1;
    in.count = count;
    in.cds0 = st->own / count;
    /* without a canopy a nominal diameter of CD0 0.8 passes the model's checks; the fit does not use it */
    in.d0 = sp->has_canopy ? sp->canopy.d0.typ : sqrt(4.0 * in.cds0 / (3.14159265358979323846 * 0.8));
    in.mass = sp->mass;
    in.v1 = o->speed;
    in.rho = air_d.rho;
    in.a = air_d.a;
    in.g = air_d.g;
    in.cds_other = fmax(st->cds - st->own, 0.0);
    double rate_needed = o->rate_needed, speed = o->speed, q = o->q;
    int rc = sr_fit_opening_history(t + a, f, b - a, t[i0], &in, o, err);
    o->rate_needed = rate_needed;
    o->speed = speed;
    o->q = q;
    o->peak_ratio = o->measured && q > 0 ? o->force / (st->own * q) : NAN;
    free(f);
    return rc;
}
