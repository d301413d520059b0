/* fit.c - the drag area of each stage from a flight log: the vertical column
 * as true height, the segments, and per stage a robust nonlinear
 * least-squares fit (GSL gsl_multifit_nlinear, trust region) of the steady
 * descent to the measured height, with its 95 % interval from the Jacobian,
 * the residual variance and an AR(1) correction for correlated residuals. */
#include "analysis/fit.h"

#include <gsl/gsl_blas.h>
#include <gsl/gsl_cdf.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_matrix.h>
#include <gsl/gsl_multifit_nlinear.h>
#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <gsl/gsl_vector.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/fit_int.h"
#include "physics/descent.h"

/* Floor of the residual scale in the outlier test, m: a log without noise
 * (a computed one) must not reject points for rounding. Our choice. */
#define RESID_FLOOR 0.05
#define MAX_ROUNDS 8
/* Settling after a deployment: the drag transient decays with the time
 * constant v/g; after 4.5 of them the rate is within 0.03 % of steady (tanh
 * from rest), plus 1 s for line stretch and filling. Our choice. */
#define SETTLE_TAU SR_FIT_SETTLE_TAU
#define SETTLE_PAD 1.0
#define END_PAD 0.5

void sr_fit_setup_init(sr_fit_setup *s)
{
    memset(s, 0, sizeof *s);
    s->ground = NAN;
    s->conf = 0.95;
    s->reject = 5.0;
    s->gravity = NAN;
    s->mass = NAN;
    s->events = SR_FIT_EVENTS_DETECT;
    for (size_t k = 0; k < SR_FIT_MAX_STAGES; k++)
        s->stage[k].time = NAN;
}

void sr_fit_result_free(sr_fit_result *r)
{
    free(r->t);
    free(r->h);
    free(r->h_logged);
    free(r->smooth);
    free(r->rate);
    free(r->model);
    free(r->cds_local);
    free(r->rejected);
    memset(r, 0, sizeof *r);
}

/* ---- the model: z(t) = G(F(z0) - sqrt(m / C) (t - t0)) ---- */

typedef struct model {
    const fit_air *air;
    const double *t, *z;
    const size_t *idx;
    size_t n;
    double t0, sqrt_m;
} model;

static double model_z(const model *M, double z0, double C, double t)
{
    return sr_fit_air_G(M->air, sr_fit_air_F(M->air, z0) - M->sqrt_m / sqrt(C) * (t - M->t0));
}

static int f_res(const gsl_vector *x, void *p, gsl_vector *f)
{
    const model *M = p;
    double z0 = gsl_vector_get(x, 0), C = exp(gsl_vector_get(x, 1));
    if (!isfinite(C) || !(C > 0))
        return GSL_EDOM;
    double F0 = sr_fit_air_F(M->air, z0), a = M->sqrt_m / sqrt(C);
    for (size_t k = 0; k < M->n; k++) {
        size_t i = M->idx[k];
        gsl_vector_set(f, k, sr_fit_air_G(M->air, F0 - a * (M->t[i] - M->t0)) - M->z[i]);
    }
    return GSL_SUCCESS;
}

static int df_res(const gsl_vector *x, void *p, gsl_matrix *J)
{
    const model *M = p;
    double z0 = gsl_vector_get(x, 0), C = exp(gsl_vector_get(x, 1));
    if (!isfinite(C) || !(C > 0))
        return GSL_EDOM;
    double F0 = sr_fit_air_F(M->air, z0), a = M->sqrt_m / sqrt(C), k0 = sr_fit_air_k1(M->air, z0);
    for (size_t k = 0; k < M->n; k++) {
        size_t i = M->idx[k];
        double dt = M->t[i] - M->t0;
        double zi = sr_fit_air_G(M->air, F0 - a * dt), ki = sr_fit_air_k1(M->air, zi);
        gsl_matrix_set(J, k, 0, ki / k0);          /* dz / dz0 */
        gsl_matrix_set(J, k, 1, 0.5 * a * ki * dt); /* dz / d ln C = v (t - t0) / 2 */
    }
    return GSL_SUCCESS;
}

typedef struct stage_fit {
    double C, lo, hi, se, rho1, infl, dof, rms, z0;
    size_t nk, nrej;
    int iter;
} stage_fit;

static double median_of(double *x, size_t n)
{
    gsl_sort(x, 1, n);
    return gsl_stats_median_from_sorted_data(x, 1, n);
}

/* One stage over rows [i0, i1): robust start, least squares, outlier
 * rounds, the interval. model_out (may be NULL) receives the fitted height
 * of every row of the window. */
static int fit_window(const fit_air *air, const double *t, const double *z, const double *smooth, const double *rate,
                      double noise, size_t i0, size_t i1, double mass, const sr_fit_setup *s, stage_fit *out,
                      double *model_out, unsigned char *rej_out, sr_error *err)
{
    size_t nw = i1 - i0;
    double *buf = malloc(nw * sizeof *buf), *res = malloc(nw * sizeof *res);
    size_t *idx = malloc(nw * sizeof *idx);
    unsigned char *keep = malloc(nw);
    int rc = SR_OK;
    gsl_multifit_nlinear_workspace *w = NULL;
    gsl_vector *x = NULL;
    gsl_matrix *cov = gsl_matrix_alloc(2, 2);
    if (!buf || !res || !idx || !keep || !cov) {
        rc = sr_error_set(err, SR_ENOMEM, "out of memory");
        goto done;
    }
    model M = {.air = air, .t = t, .z = z, .idx = idx, .t0 = t[i0], .sqrt_m = sqrt(mass)};
    /* start: the median drag area of the smoothed rates, the median offset */
    size_t nb = 0;
    for (size_t i = i0; i < i1; i++)
        if (rate[i] > 0.1) {
            double k = sr_fit_air_k1(air, smooth[i]);
            buf[nb++] = mass * k * k / (rate[i] * rate[i]);
        }
    if (nb < nw / 2) {
        rc = sr_error_set(err, SR_ENUMERIC, "the height does not fall steadily in the window");
        goto done;
    }
    double C = median_of(buf, nb);
    double a = M.sqrt_m / sqrt(C);
    for (size_t i = i0; i < i1; i++)
        buf[i - i0] = sr_fit_air_F(air, z[i]) + a * (t[i] - t[i0]);
    double z0 = sr_fit_air_G(air, median_of(buf, nw));
    /* round 0: off the median filter or far off the start model */
    for (size_t i = i0; i < i1; i++)
        res[i - i0] = fabs(model_z(&M, z0, C, t[i]) - z[i]);
    memcpy(buf, res, nw * sizeof *buf);
    double s0 = fmax(1.4826 * median_of(buf, nw), RESID_FLOOR);
    double thr_f = s->reject * fmax(noise, RESID_FLOOR);
    for (size_t i = i0; i < i1; i++)
        keep[i - i0] = fabs(z[i] - smooth[i]) <= thr_f && res[i - i0] <= 3.0 * s->reject * s0;
    gsl_multifit_nlinear_parameters fp = gsl_multifit_nlinear_default_parameters();
    int iters = 0;
    for (int round = 0; round < MAX_ROUNDS; round++) {
        size_t nk = 0;
        for (size_t k = 0; k < nw; k++)
            if (keep[k])
                idx[nk++] = i0 + k;
        if (nk < SR_FIT_MIN_POINTS) {
            rc = sr_error_set(err, SR_ENUMERIC, "only %zu of %zu points are left after the outliers are dropped", nk,
                              nw);
            goto done;
        }
        M.n = nk;
        gsl_multifit_nlinear_free(w);
        w = gsl_multifit_nlinear_alloc(gsl_multifit_nlinear_trust, &fp, nk, 2);
        gsl_vector_free(x);
        x = gsl_vector_alloc(2);
        if (!w || !x) {
            rc = sr_error_set(err, SR_ENOMEM, "out of memory");
            goto done;
        }
        gsl_vector_set(x, 0, z0);
        gsl_vector_set(x, 1, log(C));
        gsl_multifit_nlinear_fdf fdf = {.f = f_res, .df = df_res, .fvv = NULL, .n = nk, .p = 2, .params = &M};
        int info = 0;
        int st = gsl_multifit_nlinear_init(x, &fdf, w);
        if (!st)
            st = gsl_multifit_nlinear_driver(200, 1e-12, 1e-12, 0.0, NULL, NULL, &info, w);
        if (st) {
            rc = sr_error_set(err, SR_ENUMERIC, "the least-squares fit does not converge (%s)", gsl_strerror(st));
            goto done;
        }
        iters += (int)gsl_multifit_nlinear_niter(w);
        z0 = gsl_vector_get(w->x, 0);
        C = exp(gsl_vector_get(w->x, 1));
        if (!isfinite(C) || !isfinite(z0)) {
            rc = sr_error_set(err, SR_ENUMERIC, "the least-squares fit does not converge");
            goto done;
        }
        /* the outlier test on every point of the window */
        size_t nb2 = 0;
        for (size_t i = i0; i < i1; i++) {
            res[i - i0] = model_z(&M, z0, C, t[i]) - z[i];
            if (keep[i - i0])
                buf[nb2++] = fabs(res[i - i0]);
        }
        double sig = fmax(1.4826 * median_of(buf, nb2), RESID_FLOOR);
        int changed = 0;
        for (size_t k = 0; k < nw; k++) {
            unsigned char kk = fabs(res[k]) <= s->reject * sig;
            changed |= kk != keep[k];
            keep[k] = kk;
        }
        if (!changed)
            break;
    }
    /* the interval: (J'J)^-1 s^2, inflated for correlated residuals */
    size_t nk = M.n;
    gsl_matrix *J = gsl_multifit_nlinear_jac(w);
    if (gsl_multifit_nlinear_covar(J, 0.0, cov)) {
        rc = sr_error_set(err, SR_ENUMERIC, "the Jacobian is singular: the drag area is not determined");
        goto done;
    }
    gsl_vector *f = gsl_multifit_nlinear_residual(w);
    double ss = 0, num = 0;
    for (size_t k = 0; k < nk; k++) {
        double fk = gsl_vector_get(f, k);
        ss += fk * fk;
        if (k > 0)
            num += fk * gsl_vector_get(f, k - 1);
    }
    double s2 = ss / (double)(nk - 2);
    double rho1 = ss > 0 ? num / ss : 0.0;
    if (!(rho1 > 0))
        rho1 = 0.0; /* a negative correlation would narrow the interval: not taken (conservative) */
    if (rho1 > 0.98)
        rho1 = 0.98;
    double infl = (1.0 + rho1) / (1.0 - rho1);
    double var = gsl_matrix_get(cov, 1, 1) * s2 * infl;
    double dof = fmax(1.0, (double)nk / infl - 2.0);
    double tq = gsl_cdf_tdist_Pinv(0.5 + 0.5 * s->conf, dof);
    double se = sqrt(var);
    out->C = C;
    out->z0 = z0;
    out->se = se;
    out->lo = C * exp(-tq * se);
    out->hi = C * exp(tq * se);
    out->rho1 = rho1;
    out->infl = infl;
    out->dof = dof;
    out->rms = sqrt(ss / (double)nk);
    out->nk = nk;
    out->nrej = nw - nk;
    out->iter = iters;
    if (!isfinite(se) || !isfinite(out->hi) || !(out->lo > 0)) {
        rc = sr_error_set(err, SR_ENUMERIC, "the interval of the drag area is unbounded");
        goto done;
    }
    if (out->hi / out->lo > SR_FIT_MAX_CI_RATIO) {
        rc = sr_error_set(err, SR_ENUMERIC,
                          "the %.0f %% interval of the drag area spans a factor %.3g (more than %.0f): not determined",
                          100 * s->conf, out->hi / out->lo, SR_FIT_MAX_CI_RATIO);
        goto done;
    }
    for (size_t i = i0; model_out && i < i1; i++)
        model_out[i] = model_z(&M, z0, C, t[i]);
    for (size_t k = 0; rej_out && k < nw; k++)
        rej_out[i0 + k] = !keep[k];
done:
    gsl_vector_free(x);
    gsl_multifit_nlinear_free(w);
    gsl_matrix_free(cov);
    free(buf);
    free(res);
    free(idx);
    free(keep);
    return rc;
}

/* ---- the vertical column as true height ---- */

static double std_pressure_at_geopotential(double H)
{
    double z = SR_ATMOS_R0 * H / (SR_ATMOS_R0 - H), T, p;
    sr_atmos_standard_tp(z, 0.0, &T, &p);
    return p;
}

static double approx_std_altitude(double p)
{
    /* the troposphere formula, only to size the tables (margins follow) */
    return 44330.8 * (1.0 - pow(p / SR_ATMOS_P0, 0.190263));
}

static size_t row_at_time(const double *t, size_t n, double tt)
{
    size_t i = 0;
    while (i + 1 < n && t[i] < tt)
        i++;
    return i;
}

static int stage_fail(const sr_flightlog *log, size_t row, const char *stage, sr_error *e, sr_error *err)
{
    char w[600];
    sr_flightlog_where(log, row, log->field_t, w, sizeof w);
    return sr_error_set(err, e->code, "%s: stage '%s': %s", w, stage, e->msg);
}

int sr_fit_log(const sr_flightlog *log, const sr_fit_setup *s0, sr_fit_result *r, sr_error *err)
{
    memset(r, 0, sizeof *r);
    snprintf(r->path, sizeof r->path, "%s", log->path);
    sr_fit_setup S = *s0;
    sr_fit_setup *s = &S;
    size_t n = log->n;
    if (!s->atmos)
        return sr_error_set(err, SR_EINVAL, "internal: the fit needs an atmosphere");
    if (!(s->conf > 0.5 && s->conf < 0.9999))
        return sr_error_set(err, SR_EINVAL, "confidence level %g is outside 0.5 .. 0.9999", s->conf);
    r->n = n;
    r->t = malloc(n * sizeof *r->t);
    r->h = malloc(n * sizeof *r->h);
    r->h_logged = malloc(n * sizeof *r->h_logged);
    r->smooth = malloc(n * sizeof *r->smooth);
    r->rate = malloc(n * sizeof *r->rate);
    r->model = malloc(n * sizeof *r->model);
    r->cds_local = malloc(n * sizeof *r->cds_local);
    r->rejected = calloc(n, 1);
    double *z = malloc(n * sizeof *z), *zraw = malloc(n * sizeof *zraw), *sm = malloc(n * sizeof *sm);
    double *raw_smooth = NULL, *raw_rate = NULL, raw_noise = 0.0;
    fit_air air, std;
    memset(&air, 0, sizeof air);
    memset(&std, 0, sizeof std);
    int rc = SR_OK;
    sr_error e;
    if (!r->t || !r->h || !r->h_logged || !r->smooth || !r->rate || !r->model || !r->cds_local || !r->rejected ||
        !z || !zraw || !sm) {
        rc = sr_error_set(err, SR_ENOMEM, "out of memory");
        goto done;
    }
    memcpy(r->t, log->t, n * sizeof *r->t);
    for (size_t i = 0; i < n; i++) {
        r->model[i] = NAN;
        r->cds_local[i] = NAN;
    }
    int known_ground = !isnan(s->ground);
    double zg = known_ground ? s->ground : 0.0;
    /* the range of the air tables, with room for hot and cold days */
    double lo = INFINITY, hi = -INFINITY;
    for (size_t i = 0; i < n; i++) {
        double v = log->v[i];
        double zz = log->vertical == SR_LOG_PRESSURE ? approx_std_altitude(v)
                    : log->vertical == SR_LOG_HEIGHT ? zg + v
                                                     : v;
        lo = fmin(lo, zz);
        hi = fmax(hi, zz);
    }
    double span = hi - lo;
    lo = fmin(lo, zg) - 0.25 * span - 300.0;
    hi = hi + 0.25 * span + 300.0;
    if ((rc = sr_fit_air_build(&air, s->atmos, lo, hi, s->gravity, &e))) {
        rc = sr_error_set(err, rc, "%s: %s", log->path, e.msg);
        goto done;
    }
    /* the vertical column as altitude above sea level */
    const char *vname = sr_log_vertical_name(log->vertical);
    char atmdesc[160];
    sr_atmos_describe(s->atmos, atmdesc, sizeof atmdesc);
    int converted = 0;
    if (log->vertical == SR_LOG_PRESSURE) {
        for (size_t i = 0; i < n; i++) {
            z[i] = sr_fit_air_z_of_p(&air, log->v[i]);
            zraw[i] = NAN;
        }
        snprintf(r->conversion, sizeof r->conversion, "pressure to altitude in the site's air (%s)", atmdesc);
    } else {
        for (size_t i = 0; i < n; i++)
            zraw[i] = log->vertical == SR_LOG_HEIGHT ? zg + log->v[i] : log->v[i];
        if (s->pressure_altitude) {
            sr_atmos sa;
            sr_atmos_init_standard(&sa);
            if ((rc = sr_fit_air_build(&std, &sa, -900.0, fmin(hi + 3000.0, 85000.0), NAN, &e))) {
                rc = sr_error_set(err, rc, "%s: %s", log->path, e.msg);
                goto done;
            }
            /* the altimeter's zero: the pressure altitude of the ground's pressure in the site's air */
            double Hpad = 0.0;
            if (log->vertical == SR_LOG_HEIGHT) {
                sr_air ga;
                if ((rc = sr_atmos_at(s->atmos, zg, &ga, &e))) {
                    rc = sr_error_set(err, rc, "%s: %s", log->path, e.msg);
                    goto done;
                }
                Hpad = sr_atmos_geopotential(sr_fit_air_z_of_p(&std, ga.p));
            }
            for (size_t i = 0; i < n; i++) {
                double p = std_pressure_at_geopotential(log->vertical == SR_LOG_HEIGHT ? Hpad + log->v[i] : log->v[i]);
                z[i] = sr_fit_air_z_of_p(&air, p);
            }
            converted = 1;
            snprintf(r->conversion, sizeof r->conversion,
                     "%s as a pressure altitude (1976 standard, geopotential), back to pressure, then to true "
                     "altitude in the site's air (%s)",
                     vname, atmdesc);
        } else {
            memcpy(z, zraw, n * sizeof *z);
            snprintf(r->conversion, sizeof r->conversion, "%s taken as true %s (no pressure-altitude conversion)",
                     vname, log->vertical == SR_LOG_HEIGHT ? "height above ground" : "altitude");
        }
    }
    if ((rc = sr_fit_smooth(log->t, z, n, log->step, r->smooth, r->rate, &r->noise, &e))) {
        rc = sr_error_set(err, rc, "%s: %s", log->path, e.msg);
        goto done;
    }
    /* the ground of an altitude or pressure log with no site: where it rests */
    if (!known_ground && log->vertical != SR_LOG_HEIGHT) {
        size_t tail = 0;
        while (tail + 1 < n && log->t[n - 1] - log->t[n - 1 - tail] < 1.0)
            tail++;
        tail = tail < 4 ? 4 : tail;
        memcpy(sm, r->smooth + n - tail, tail * sizeof *sm);
        zg = median_of(sm, tail);
        r->ground_from_log = 1;
    }
    r->ground = zg;
    fit_seg seg;
    if ((rc = sr_fit_segments(log, log->t, r->smooth, r->rate, n, &air, zg, r->noise, &seg, err)))
        goto done;
    r->row_apogee = seg.apogee;
    r->t_apogee = log->t[seg.apogee];
    r->h_apogee = r->smooth[seg.apogee] - zg;
    r->row_touch = seg.touch;
    r->t_touch = log->t[seg.touch];
    r->h_touch = r->smooth[seg.touch] - zg;
    r->touchdown = seg.touchdown;
    /* stages without a mission: as many as the data show */
    if (s->nstages == 0) {
        size_t ns = s->events == SR_FIT_EVENTS_TIMES ? s->ntimes : 1 + seg.ndep;
        if (ns > SR_FIT_MAX_STAGES)
            ns = SR_FIT_MAX_STAGES;
        s->nstages = ns;
        for (size_t k = 0; k < ns; k++) {
            sr_fit_stage_spec *sp = &s->stage[k];
            memset(sp, 0, sizeof *sp);
            if (k < s->nnames && s->names[k])
                snprintf(sp->name, sizeof sp->name, "%s", s->names[k]);
            else
                snprintf(sp->name, sizeof sp->name, "stage %zu", k + 1);
            sp->mass = s->mass;
            sp->deploy = k == 0 ? SR_DEPLOY_APOGEE : SR_DEPLOY_ALTITUDE;
            sp->time = s->events == SR_FIT_EVENTS_TIMES ? s->times[k] : NAN;
            if (k + 1 == ns && s->last_canopy) {
                sp->has_canopy = 1;
                sp->canopy = *s->last_canopy;
            }
        }
    }
    r->nstages = s->nstages;
    /* the deployment row of each stage */
    size_t drow[SR_FIT_MAX_STAGES];
    char w[600];
    if (s->events == SR_FIT_EVENTS_DETECT) {
        size_t need = 0;
        for (size_t k = 0; k < s->nstages; k++)
            need += s->stage[k].deploy != SR_DEPLOY_APOGEE;
        if (need != seg.ndep) {
            char found[256] = "";
            size_t at = 0;
            for (size_t q = 0; q < seg.ndep && at < sizeof found - 16; q++)
                at += (size_t)snprintf(found + at, sizeof found - at, "%s%.1f s", q ? ", " : " at ", log->t[seg.dep[q]]);
            sr_flightlog_where(log, seg.apogee, log->field_t, w, sizeof w);
            rc = sr_error_set(err, SR_EINVAL,
                              "%s: the descent rate shows %zu deployment%s after apogee%s, the stages need %zu; give "
                              "the times with --deploy-times, or --events mission",
                              w, seg.ndep, seg.ndep == 1 ? "" : "s", found, need);
            goto done;
        }
        size_t q = 0;
        for (size_t k = 0; k < s->nstages; k++)
            drow[k] = s->stage[k].deploy == SR_DEPLOY_APOGEE ? seg.apogee : seg.dep[q++];
    } else {
        double tprev = log->t[seg.apogee];
        for (size_t k = 0; k < s->nstages; k++) {
            const sr_fit_stage_spec *sp = &s->stage[k];
            double td;
            if (s->events == SR_FIT_EVENTS_TIMES) {
                td = isnan(sp->time) ? log->t[seg.apogee] : sp->time;
                if (td < log->t[0] || td >= r->t_touch || (k > 0 && td <= tprev)) {
                    rc = sr_error_set(err, SR_EINVAL,
                                      "--deploy-times: %.10g s for stage '%s' is not between %s (%.1f s) and "
                                      "touchdown (%.1f s) of %s",
                                      td, sp->name, k ? "the deployment before" : "the start", k ? tprev : log->t[0],
                                      r->t_touch, log->path);
                    goto done;
                }
                drow[k] = row_at_time(log->t, n, td);
            } else if (sp->deploy == SR_DEPLOY_APOGEE) {
                drow[k] = seg.apogee;
            } else if (sp->deploy == SR_DEPLOY_DELAY) {
                drow[k] = row_at_time(log->t, n, tprev + sp->deploy_value);
            } else {
                size_t i = k ? drow[k - 1] : seg.apogee;
                while (i < seg.touch && r->smooth[i] - zg > sp->deploy_value)
                    i++;
                if (i >= seg.touch || (k == 0 && i == seg.apogee && r->smooth[i] - zg < sp->deploy_value - 1.0)) {
                    sr_flightlog_where(log, seg.apogee, log->field_v, w, sizeof w);
                    rc = sr_error_set(err, SR_EINVAL,
                                      "%s: stage '%s' deploys at %.0f m above ground, which the descent in the log "
                                      "(apogee %.0f m) does not pass",
                                      w, sp->name, sp->deploy_value, r->h_apogee);
                    goto done;
                }
                drow[k] = i;
            }
            if (drow[k] >= seg.touch) {
                sr_flightlog_where(log, seg.touch, log->field_t, w, sizeof w);
                rc = sr_error_set(err, SR_EINVAL, "%s: stage '%s' deploys after touchdown (%.1f s)", w, sp->name,
                                  r->t_touch);
                goto done;
            }
            tprev = log->t[drow[k]];
        }
    }
    if (converted && !s->skip_raw) {
        raw_smooth = malloc(n * sizeof *raw_smooth);
        raw_rate = malloc(n * sizeof *raw_rate);
        if (!raw_smooth || !raw_rate) {
            rc = sr_error_set(err, SR_ENOMEM, "out of memory");
            goto done;
        }
        if ((rc = sr_fit_smooth(log->t, zraw, n, log->step, raw_smooth, raw_rate, &raw_noise, &e))) {
            rc = sr_error_set(err, rc, "%s: %s", log->path, e.msg);
            goto done;
        }
    }
    for (size_t i = 0; i < n; i++)
        r->h[i] = z[i] - zg;
    for (size_t i = 0; i < n; i++)
        r->h_logged[i] = isnan(zraw[i]) ? NAN : zraw[i] - zg;
    /* each stage: its window, the fit */
    sr_atmos sea;
    sr_atmos_init_standard(&sea);
    sr_air sea_air, ground_air;
    sr_atmos_at(&sea, 0.0, &sea_air, NULL);
    if ((rc = sr_atmos_at(s->atmos, zg, &ground_air, &e))) {
        rc = sr_error_set(err, rc, "%s: the ground: %s", log->path, e.msg);
        goto done;
    }
    for (size_t k = 0; k < s->nstages; k++) {
        const sr_fit_stage_spec *sp = &s->stage[k];
        sr_fit_stage *st = &r->stage[k];
        size_t i0 = drow[k];
        size_t iend = k + 1 < s->nstages ? drow[k + 1] : seg.touch;
        st->row_deploy = i0;
        st->t_deploy = log->t[i0];
        st->h_deploy = r->smooth[i0] - zg;
        if (!(sp->mass > 0)) {
            rc = sr_error_set(err, SR_EINVAL, "stage '%s' has no mass", sp->name);
            goto done;
        }
        /* the steady rate in the later half of the segment sets the settling time */
        size_t nb = 0;
        for (size_t i = (i0 + iend) / 2; i < iend; i++)
            sm[nb++] = r->rate[i];
        double vs = nb ? fmax(median_of(sm, nb), 0.0) : 0.0;
        double g = ground_air.g;
        st->t0 = st->t_deploy + SETTLE_PAD + SETTLE_TAU * vs / g;
        st->t1 = log->t[iend] - END_PAD;
        size_t a0 = row_at_time(log->t, n, st->t0), a1 = a0;
        while (a1 < iend && log->t[a1] <= st->t1)
            a1++;
        st->npoints = a1 > a0 ? a1 - a0 : 0;
        if (st->t1 - st->t0 < SR_FIT_MIN_WINDOW || st->npoints < SR_FIT_MIN_POINTS) {
            sr_flightlog_where(log, i0, log->field_t, w, sizeof w);
            rc = sr_error_set(err, SR_EINVAL,
                              "%s: stage '%s' is too short to fit: from %.1f s to %.1f s, steady after about %.1f s, "
                              "it leaves %.1f s and %zu points (at least %.0f s and %d points)",
                              w, sp->name, st->t_deploy, log->t[iend], st->t0, fmax(0.0, st->t1 - st->t0),
                              st->npoints, SR_FIT_MIN_WINDOW, SR_FIT_MIN_POINTS);
            goto done;
        }
        stage_fit sf;
        if ((rc = fit_window(&air, log->t, z, r->smooth, r->rate, r->noise, a0, a1, sp->mass, s, &sf, r->model,
                             r->rejected, &e))) {
            rc = stage_fail(log, i0, sp->name, &e, err);
            goto done;
        }
        for (size_t i = a0; i < a1; i++)
            r->model[i] -= zg;
        st->fitted = 1;
        st->t0 = log->t[a0];
        st->t1 = log->t[a1 - 1];
        st->nrejected = sf.nrej;
        st->cds = sf.C;
        st->cds_lo = sf.lo;
        st->cds_hi = sf.hi;
        st->se_log = sf.se;
        st->rho1 = sf.rho1;
        st->inflation = sf.infl;
        st->dof = sf.dof;
        st->rms = sf.rms;
        st->iterations = sf.iter;
        st->rate_ground = sr_descent_speed(sp->mass, ground_air.g, ground_air.rho, sf.C);
        st->rate_sea = sr_descent_speed(sp->mass, sea_air.g, sea_air.rho, sf.C);
        st->cds_raw = NAN;
        if (converted && !s->skip_raw && raw_smooth) {
            stage_fit raw;
            if (fit_window(&air, log->t, zraw, raw_smooth, raw_rate, raw_noise, a0, a1, sp->mass, s, &raw, NULL,
                           NULL, &e) == SR_OK)
                st->cds_raw = raw.C;
        }
        /* the canopy's own share */
        double base = sp->base_cds, vb = 0.0;
        if (k > 0 && sp->keep_previous) {
            base = r->stage[k - 1].cds;
            double sb = r->stage[k - 1].cds * r->stage[k - 1].se_log;
            vb = sb * sb;
        }
        st->own = sf.C - base;
        if (vb == 0.0) {
            st->own_lo = sf.lo - base;
            st->own_hi = sf.hi - base;
        } else {
            double sc = sf.C * sf.se, dof = fmin(sf.dof, r->stage[k - 1].dof);
            double half = gsl_cdf_tdist_Pinv(0.5 + 0.5 * s->conf, dof) * sqrt(sc * sc + vb);
            st->own_lo = st->own - half;
            st->own_hi = st->own + half;
        }
        if (!(st->own_lo > 0)) {
            sr_flightlog_where(log, i0, log->field_t, w, sizeof w);
            rc = sr_error_set(err, SR_ENUMERIC,
                              "%s: stage '%s': the canopy's own drag area (total %.4g m2 less %.4g m2 of what else is "
                              "open) is not determined: its interval reaches zero",
                              w, sp->name, sf.C, base);
            goto done;
        }
        st->cd0 = st->cd0_lo = st->cd0_hi = NAN;
        st->band = SR_FIT_BAND_NONE;
        if (sp->has_canopy) {
            st->cd0 = sr_fit_cd0(&sp->canopy, st->own);
            st->cd0_lo = sr_fit_cd0(&sp->canopy, st->own_lo);
            st->cd0_hi = sr_fit_cd0(&sp->canopy, st->own_hi);
            st->band = sr_fit_band_of(&sp->canopy, st->cd0, st->cd0_lo, st->cd0_hi);
        }
        /* the point estimate along the way, from deployment to the next event, over a 5 s moving median */
        for (size_t i = i0; i < iend; i++) {
            double v = fmax(r->rate[i], 0.5), kk = sr_fit_air_k1(&air, r->smooth[i]);
            sm[i - i0] = sp->mass * kk * kk / (v * v);
        }
        if (iend > i0 && sr_fit_median(sm, r->cds_local + i0, iend - i0,
                                    sr_fit_odd_window(5.0, log->step, iend - i0, 3), &e) == SR_OK)
            for (size_t i = i0; i < iend; i++)
                if (!(r->rate[i] > 0.5))
                    r->cds_local[i] = NAN;
        if (log->acc && (rc = sr_fit_find_opening(log, r, sp, st, &air, s->atmos, err)))
            goto done;
    }
    if (log->east && (rc = sr_fit_find_wind(log, r, err)))
        goto done;
done:
    sr_fit_air_release(&air);
    sr_fit_air_release(&std);
    free(z);
    free(zraw);
    free(sm);
    free(raw_smooth);
    free(raw_rate);
    if (rc)
        sr_fit_result_free(r);
    return rc;
}
