/* sweep.c - rows of a sweep: the equilibrium descent of descent.c repeated
 * over one variable, with the time to the ground by GSL quadrature of
 * dt = dz / v(z) (quasi-steady descent; Knacke 1991, NWC TP 6575, sec. 4.5). */
#include "analysis/sweep.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "physics/descent.h"

static const char *const VAR_NAMES[SR_SWEEP_NVARS] = {"altitude",    "mass",           "diameter",
                                                      "temp-offset", "site-elevation", "speed"};

const char *sr_sweep_var_name(sr_sweep_var v)
{
    return v < SR_SWEEP_NVARS ? VAR_NAMES[v] : "?";
}

int sr_sweep_var_parse(const char *s, sr_sweep_var *v)
{
    for (int i = 0; i < SR_SWEEP_NVARS; i++)
        if (strcmp(s, VAR_NAMES[i]) == 0) {
            *v = (sr_sweep_var)i;
            return SR_OK;
        }
    return SR_EINVAL;
}

sr_quantity sr_sweep_var_quantity(sr_sweep_var v)
{
    switch (v) {
    case SR_SWEEP_MASS: return SR_Q_MASS;
    case SR_SWEEP_TEMP_OFFSET: return SR_Q_TEMP_DIFF;
    case SR_SWEEP_SPEED: return SR_Q_SPEED;
    case SR_SWEEP_DIAMETER: return SR_Q_SIZE;
    default: return SR_Q_LENGTH;
    }
}

int sr_sweep_range(double from, double to, double step, size_t max, double **values, size_t *n, sr_error *err)
{
    *values = NULL;
    *n = 0;
    if (!isfinite(from) || !isfinite(to) || !isfinite(step))
        return sr_error_set(err, SR_EINVAL, "from, to and step must be finite numbers");
    if (step == 0.0)
        return sr_error_set(err, SR_EINVAL, "step must not be zero");
    if (to != from && (to - from) * step < 0.0)
        return sr_error_set(err, SR_EINVAL, "step %g goes away from 'to' (from %g to %g): give it the sign of to - from",
                            step, from, to);
    double span = (to - from) / step; /* >= 0 */
    if (span + 1.0 > (double)max)
        return sr_error_set(err, SR_EINVAL, "from %g to %g by %g makes %.0f rows; the most is %zu (take a larger step)",
                            from, to, step, floor(span + 1e-9) + 1.0, max);
    size_t count = (size_t)floor(span + 1e-9) + 1;
    double *v = malloc(count * sizeof *v);
    if (!v)
        return sr_error_set(err, SR_ENOMEM, "out of memory for %zu rows", count);
    /* from + i*step rather than a running sum, so rounding does not creep */
    for (size_t i = 0; i < count; i++)
        v[i] = from + (double)i * step;
    if (count > 1 && fabs(v[count - 1] - to) <= 1e-9 * fabs(step))
        v[count - 1] = to;
    *values = v;
    *n = count;
    return SR_OK;
}

sr_band sr_sweep_cd0_band(const sr_canopy *cp)
{
    return sr_canopy_cd0_band(cp);
}

static int set_diameter(sr_canopy *cp, double d0, sr_error *err)
{
    sr_canopy n;
    int rc = sr_canopy_from_size(&n, &cp->fam, SR_SIZE_NOMINAL_DIAMETER, d0, err);
    if (rc)
        return rc;
    if (cp->measured && (rc = sr_canopy_set_measured_cd(&n, cp->cd.v.typ, cp->cd.ref, cp->cd_source, err)))
        return rc;
    if ((rc = sr_canopy_set_cluster(&n, cp->count, cp->cluster_factor, err)))
        return rc;
    n.areal_mass = cp->areal_mass;
    *cp = n;
    return SR_OK;
}

int sr_sweep_set(sr_sweep_case *c, sr_sweep_var v, double value, sr_error *err)
{
    if (!isfinite(value))
        return sr_error_set(err, SR_EINVAL, "%s must be a finite number", sr_sweep_var_name(v));
    switch (v) {
    case SR_SWEEP_ALTITUDE:
        c->altitude = value;
        return SR_OK;
    case SR_SWEEP_MASS:
        if (!(value > 0.0))
            return sr_error_set(err, SR_EINVAL, "mass must be positive (got %g kg)", value);
        c->mass = value;
        return SR_OK;
    case SR_SWEEP_DIAMETER:
        if (!(value > 0.0))
            return sr_error_set(err, SR_EINVAL, "nominal diameter must be positive (got %g m)", value);
        return set_diameter(&c->canopy, value, err);
    case SR_SWEEP_TEMP_OFFSET: {
        sr_atmos m;
        int rc;
        if (c->atmos.kind == SR_ATMOS_SOUNDING)
            return sr_error_set(err, SR_EINVAL, "a sounding fixes the temperature; a temperature offset cannot vary it");
        if (c->atmos.kind == SR_ATMOS_SITE) {
            double Tstd, pstd;
            sr_atmos_standard_tp(c->atmos.site_z, 0.0, &Tstd, &pstd);
            rc = sr_atmos_init_site(&m, c->atmos.site_z, Tstd + value, c->atmos.site_p, err);
        } else {
            rc = sr_atmos_init_offset(&m, value, err);
        }
        if (rc)
            return rc;
        c->atmos = m;
        return SR_OK;
    }
    case SR_SWEEP_SITE_ELEVATION: {
        if (c->atmos.kind == SR_ATMOS_SOUNDING)
            return sr_error_set(err, SR_EINVAL, "a sounding fixes the ground; the site elevation cannot vary with it");
        double Tstd, pstd;
        if (sr_atmos_standard_tp(value, 0.0, &Tstd, &pstd) != SR_OK)
            return sr_error_set(err, SR_EDOMAIN, "site elevation %g m is outside the standard atmosphere", value);
        sr_atmos m;
        int rc = sr_atmos_init_site(&m, value, Tstd + c->atmos.dT, NAN, err);
        if (rc)
            return rc;
        c->atmos = m;
        c->ground = value;
        return SR_OK;
    }
    default:
        return sr_error_set(err, SR_EINVAL, "%s is not a variable of the case", sr_sweep_var_name(v));
    }
}

/* ---- time to the ground ---- */

typedef struct tparams {
    const sr_atmos *m;
    int bad;
    sr_error e;
} tparams;

/* 1/v(z) = sqrt(rho CdS / (2 m g)): the drag band only scales it, so one
 * integral of sqrt(rho / g) serves all three ends. */
static double inv_speed_shape(double z, void *vp)
{
    tparams *p = vp;
    double rho;
    if (sr_atmos_density(p->m, z, &rho, p->bad ? NULL : &p->e)) {
        p->bad = 1;
        return GSL_NAN;
    }
    return sqrt(rho / sr_atmos_gravity(z));
}

typedef struct scale {
    double k[3]; /* time band = k * integral, lo / typ / hi */
} scale;

static void time_scale(const sr_sweep_case *c, scale *s)
{
    sr_band cds = sr_canopy_total_cds(&c->canopy);
    double m[3] = {c->mass, c->mass, c->mass};
    if (c->canopy.areal_mass > 0.0) {
        double k = c->canopy.count * c->canopy.areal_mass;
        m[0] += k * c->canopy.s0.hi;
        m[1] += k * c->canopy.s0.typ;
        m[2] += k * c->canopy.s0.lo;
    }
    /* short time: least drag with least mass (as sr_descent_rate pairs them) */
    s->k[0] = sqrt((cds.lo + c->body_cds) / (2.0 * m[2]));
    s->k[1] = sqrt((cds.typ + c->body_cds) / (2.0 * m[1]));
    s->k[2] = sqrt((cds.hi + c->body_cds) / (2.0 * m[0]));
}

#define QUAD_LIMIT 200

static int integrate(gsl_integration_workspace *w, tparams *tp, double a, double b, double *out, sr_error *err)
{
    if (b == a) {
        *out = 0.0;
        return SR_OK;
    }
    gsl_function F = {inv_speed_shape, tp};
    double res, abserr;
    int s = gsl_integration_qag(&F, a, b, 0.0, 1e-10, QUAD_LIMIT, GSL_INTEG_GAUSS15, w, &res, &abserr);
    if (tp->bad) {
        if (err)
            *err = tp->e;
        return tp->e.code ? tp->e.code : SR_EDOMAIN;
    }
    if (s != GSL_SUCCESS && !(s == GSL_EROUND && abserr < 1e-8 * fabs(res)))
        return sr_error_set(err, SR_ENUMERIC, "descent-time quadrature from %.1f m to %.1f m failed: %s", a, b,
                            gsl_strerror(s));
    *out = res;
    return SR_OK;
}

static int check_top(const sr_sweep_case *c, double z, sr_error *err)
{
    if (z < c->ground)
        return sr_error_set(err, SR_EDOMAIN, "altitude %.1f m is below the ground (%.1f m above sea level)", z,
                            c->ground);
    return SR_OK;
}

int sr_sweep_descent_time(const sr_sweep_case *c, double z_top, sr_band *t, sr_error *err)
{
    int rc = check_top(c, z_top, err);
    if (rc)
        return rc;
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(QUAD_LIMIT);
    if (!w)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    tparams tp = {.m = &c->atmos};
    double I;
    rc = integrate(w, &tp, c->ground, z_top, &I, err);
    gsl_integration_workspace_free(w);
    if (rc)
        return rc;
    scale s;
    time_scale(c, &s);
    t->lo = s.k[0] * I;
    t->typ = s.k[1] * I;
    t->hi = s.k[2] * I;
    return SR_OK;
}

/* ---- rows ---- */

typedef struct zsort {
    size_t i;
    double z;
} zsort;

static int cmp_zsort(const void *a, const void *b)
{
    const zsort *x = a, *y = b;
    return (x->z > y->z) - (x->z < y->z);
}

/* Times for every altitude row: integrate between neighbours in altitude
 * order and add up from the ground, so a long sweep costs one pass. */
static int altitude_times(const sr_sweep_case *c, sr_sweep_row *rows, size_t n, sr_error *err)
{
    zsort *o = malloc(n * sizeof *o);
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(QUAD_LIMIT);
    if (!o || !w) {
        free(o);
        gsl_integration_workspace_free(w);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    for (size_t i = 0; i < n; i++) {
        o[i].i = i;
        o[i].z = rows[i].z;
    }
    qsort(o, n, sizeof *o, cmp_zsort);
    scale s;
    time_scale(c, &s);
    tparams tp = {.m = &c->atmos};
    double below = c->ground, I = 0.0;
    int rc = SR_OK;
    for (size_t j = 0; j < n; j++) {
        double piece;
        if ((rc = integrate(w, &tp, below, o[j].z, &piece, err)))
            break;
        I += piece;
        below = o[j].z;
        sr_sweep_row *r = &rows[o[j].i];
        r->t.lo = s.k[0] * I;
        r->t.typ = s.k[1] * I;
        r->t.hi = s.k[2] * I;
    }
    free(o);
    gsl_integration_workspace_free(w);
    return rc;
}

static int rate_row(const sr_sweep_case *c, double x, double z, sr_sweep_row *r, sr_error *err)
{
    sr_air air;
    int rc = sr_atmos_at(&c->atmos, z, &air, err);
    if (rc)
        return rc;
    memset(r, 0, sizeof *r);
    r->x = x;
    r->z = z;
    r->ground = c->ground;
    r->rho = air.rho;
    r->a = air.a;
    if ((rc = sr_descent_rate(&c->canopy, c->mass, c->body_cds, &air, &r->v, err)))
        return rc;
    r->q = 0.5 * air.rho * r->v.typ * r->v.typ;
    r->mach = r->v.typ / air.a;
    r->t.lo = r->t.typ = r->t.hi = NAN;
    r->d0 = c->canopy.d0;
    r->s0 = c->canopy.s0;
    double k = c->canopy.areal_mass > 0.0 ? c->canopy.count * c->canopy.areal_mass : 0.0;
    r->mass_total.lo = c->mass + k * c->canopy.s0.lo;
    r->mass_total.typ = c->mass + k * c->canopy.s0.typ;
    r->mass_total.hi = c->mass + k * c->canopy.s0.hi;
    return SR_OK;
}

static int size_row(const sr_sweep_case *c, double speed, sr_sweep_row *r, sr_error *err)
{
    double z = isnan(c->altitude) ? c->ground : c->altitude;
    sr_air air;
    int rc = sr_atmos_at(&c->atmos, z, &air, err);
    if (rc)
        return rc;
    sr_size_result res;
    if ((rc = sr_descent_size_canopy(&c->canopy, c->mass, speed, c->body_cds, &air, &res, err)))
        return rc;
    memset(r, 0, sizeof *r);
    r->x = speed;
    r->z = z;
    r->ground = c->ground;
    r->rho = air.rho;
    r->a = air.a;
    r->v.lo = r->v.typ = r->v.hi = speed;
    r->q = 0.5 * air.rho * speed * speed;
    r->mach = speed / air.a;
    r->t.lo = r->t.typ = r->t.hi = NAN;
    r->d0 = res.d0;
    r->s0 = res.s0;
    r->mass_total.lo = c->mass + res.canopy_mass.lo;
    r->mass_total.typ = c->mass + res.canopy_mass.typ;
    r->mass_total.hi = c->mass + res.canopy_mass.hi;
    return SR_OK;
}

int sr_sweep_run(const sr_sweep_case *c, sr_sweep_var v, const double *xs, size_t n, sr_sweep_row *rows,
                 sr_sweep_progress_fn progress, void *ud, sr_error *err)
{
    if (v >= SR_SWEEP_NVARS)
        return sr_error_set(err, SR_EINVAL, "unknown sweep variable");
    if (n > SR_SWEEP_MAX_ROWS)
        return sr_error_set(err, SR_EINVAL, "%zu rows is more than the %d a sweep makes", n, SR_SWEEP_MAX_ROWS);
    size_t every = n / 50 + 1;
    for (size_t i = 0; i < n; i++) {
        int rc;
        if (v == SR_SWEEP_SPEED) {
            if (!(xs[i] > 0.0))
                return sr_error_set(err, SR_EINVAL, "target speed must be positive (got %g m/s)", xs[i]);
            rc = size_row(c, xs[i], &rows[i], err);
        } else if (v == SR_SWEEP_ALTITUDE) {
            /* the hot path of long sweeps: no copy of the case */
            if ((rc = check_top(c, xs[i], err)))
                return rc;
            rc = rate_row(c, xs[i], xs[i], &rows[i], err);
        } else {
            sr_sweep_case k = *c;
            if ((rc = sr_sweep_set(&k, v, xs[i], err)))
                return rc;
            rc = rate_row(&k, xs[i], isnan(k.altitude) ? k.ground : k.altitude, &rows[i], err);
        }
        if (rc)
            return rc;
        if (progress && i % every == 0)
            progress(ud, i, n);
    }
    if (v == SR_SWEEP_ALTITUDE) {
        int rc = altitude_times(c, rows, n, err);
        if (rc)
            return rc;
    }
    if (progress)
        progress(ud, n, n);
    return SR_OK;
}
