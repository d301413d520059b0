/* profile_free.c - inside the profile module: the drag of sections that fall
 * with no canopy open and a Reynolds-dependent drag coefficient (mission
 * `body:`), and every equilibrium speed of such a body at a height. */
#include "physics/profile_free.h"

#include <gsl/gsl_errno.h>
#include <math.h>
#include <string.h>

/* the Reynolds-number range scanned for equilibria, as the bluff module does */
#define RE_SCAN_LO 1e-6
#define RE_SCAN_HI 1e10
#define PER_DECADE 100

int sr_profile_free_init(sr_profile_free *f, const sr_descent_spec *s, sr_bluff_attitude attitude, sr_error *err)
{
    f->nsec = s->nsections;
    f->secs = 0;
    for (size_t i = 0; i < s->nsections; i++) {
        const sr_descent_section *d = &s->section[i];
        if (!d->curve)
            continue;
        int rc = sr_bluff_curve_copy(&f->curve[i], d->curve, err);
        if (!rc)
            rc = sr_bluff_body_init(&f->body[i], d->shape, &f->curve[i], d->d, d->length, d->mass, d->area, err);
        if (rc)
            return rc;
        sr_bluff_attitude_drag(d->shape, d->d, attitude, d->stable_end_on, &f->k[i], &f->c[i]);
        f->secs |= 1u << i;
    }
    return SR_OK;
}

void sr_profile_free_release(sr_profile_free *f)
{
    for (size_t i = 0; i < SR_DESCENT_MAX_SECTIONS; i++)
        sr_bluff_curve_free(&f->curve[i]);
}

double sr_profile_free_cda(const sr_profile_free *c, sr_section_set secs, double V, double rho, double mu,
                           unsigned *warn)
{
    double C = 0.0;
    secs &= c->secs;
    for (size_t i = 0; secs && i < c->nsec; i++, secs >>= 1) {
        if (!(secs & 1u))
            continue;
        const sr_bluff_body *b = &c->body[i];
        double re = rho * V * b->d / mu;
        /* at rest there is no Reynolds number: drag is zero there whatever Cd is */
        if (!(re > 0.0))
            continue;
        C += c->k[i] > 0.0 ? c->k[i] * sr_bluff_body_cd(b, re, warn) * b->area + c->c[i] : c->c[i];
    }
    return C;
}

typedef struct balance {
    const sr_profile_free *c;
    sr_section_set secs;
    double rho, mu, cda0, w;
} balance;

static double force_balance(double v, void *p_)
{
    const balance *p = p_;
    return 0.5 * p->rho * v * v * (p->cda0 + sr_profile_free_cda(p->c, p->secs, v, p->rho, p->mu, NULL)) - p->w;
}

/* Speed of the next knot of section i's tabulated curve above v; idx keeps
 * the walk (the knots are few and sorted: no merged array is allocated). */
static double next_knot(const sr_profile_free *c, size_t i, size_t *idx, double v, double vscale)
{
    const sr_bluff_curve *cv = &c->curve[i];
    double d = c->body[i].d;
    while (*idx < cv->n && exp(cv->lnre[*idx]) * vscale / d <= v * (1.0 + 1e-12))
        (*idx)++;
    return *idx < cv->n ? exp(cv->lnre[*idx]) * vscale / d : INFINITY;
}

static int refine(gsl_root_fsolver *s, gsl_function *F, double lo, double hi, double *root)
{
    int st = gsl_root_fsolver_set(s, F, lo, hi);
    if (st != GSL_SUCCESS)
        return st;
    for (int it = 0; it < 200; it++) {
        if ((st = gsl_root_fsolver_iterate(s)) != GSL_SUCCESS)
            return st;
        double a = gsl_root_fsolver_x_lower(s), b = gsl_root_fsolver_x_upper(s);
        if (gsl_root_test_interval(a, b, 0.0, 1e-13) == GSL_SUCCESS) {
            *root = gsl_root_fsolver_root(s);
            return GSL_SUCCESS;
        }
    }
    return GSL_EMAXITER;
}

int sr_profile_free_equilibria(const sr_profile_free *c, const sr_profile_grid *grid, gsl_root_fsolver *s,
                               sr_section_set secs, double mass, double cda_const, double h, sr_free_eq *out,
                               sr_error *err)
{
    out->n = out->nstable = 0;
    out->v_fast = out->v_slow = NAN;
    out->warn = 0;
    secs &= c->secs;
    if (!secs)
        return sr_error_set(err, SR_EINVAL, "no section of the body has a drag curve");
    double rho, a, g, mu = sr_profile_grid_mu(grid, h);
    sr_profile_grid_air(grid, h, &rho, &a, &g);
    balance p = {c, secs, rho, mu, cda_const, mass * g};
    double dmin = INFINITY, dmax = 0.0;
    for (size_t i = 0; i < c->nsec; i++)
        if ((secs >> i) & 1u) {
            dmin = fmin(dmin, c->body[i].d);
            dmax = fmax(dmax, c->body[i].d);
        }
    double vscale = mu / rho; /* v = Re vscale / d */
    double v = RE_SCAN_LO * vscale / dmax, v_hi = RE_SCAN_HI * vscale / dmin, step = pow(10.0, 1.0 / PER_DECADE);
    double f = force_balance(v, &p);
    if (!(f < 0.0))
        return sr_error_set(err, SR_EIMPOSSIBLE, "the drag of the falling sections exceeds their weight already at "
                                                 "%.3g m/s",
                            v);
    if (!(force_balance(v_hi, &p) > 0.0))
        return sr_error_set(err, SR_EIMPOSSIBLE, "the drag of the falling sections stays below their weight up to "
                                                 "%.3g m/s: no equilibrium speed",
                            v_hi);
    gsl_function F = {force_balance, &p};
    size_t idx[SR_DESCENT_MAX_SECTIONS] = {0};
    while (v < v_hi) {
        /* the log grid plus every knot of a tabulated curve, so that a table cannot
         * turn between two grid points and hide a pair of equilibria */
        double vn = fmin(v * step, v_hi);
        for (size_t i = 0; i < c->nsec; i++)
            if (((secs >> i) & 1u) && c->curve[i].n)
                vn = fmin(vn, next_knot(c, i, &idx[i], v, vscale));
        double fn = force_balance(vn, &p);
        if (!isfinite(fn))
            return sr_error_set(err, SR_ENUMERIC, "a drag curve gave no value at %.6g m/s", vn);
        /* zero counts as negative, so a root exactly on a grid point is found once */
        int up = f <= 0.0 && fn > 0.0, down = f > 0.0 && fn <= 0.0;
        if (up || down) {
            double root;
            int st = refine(s, &F, v, vn, &root);
            if (st != GSL_SUCCESS)
                return sr_error_set(err, SR_ENUMERIC, "the free-fall equilibrium near %.6g m/s was not refined (%s)",
                                    vn, gsl_strerror(st));
            out->n++;
            if (up) {
                out->nstable++;
                if (isnan(out->v_slow))
                    out->v_slow = root;
            }
            out->v_fast = root;
        }
        v = vn;
        f = fn;
    }
    (void)sr_profile_free_cda(c, secs, out->v_fast, rho, mu, &out->warn);
    if (a > 0.0 && out->v_fast / a > 0.3)
        out->warn |= SR_BLUFF_WARN_MACH;
    return SR_OK;
}
