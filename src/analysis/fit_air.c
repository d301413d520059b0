/* fit_air.c - the air along a flight log as interpolation tables: the steady
 * rate of a unit mass and drag area, the descent-time integral and its
 * inverse, and pressure against altitude both ways (for the conversion of a
 * pressure altitude to true height). */
#include "analysis/fit_int.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

/* 2 m between nodes: cubic interpolation of these smooth functions is then
 * exact to far below a millimetre (checked in tests/test_fit.c). */
#define NODE_STEP 2.0
#define NODES_MAX 60000

void sr_fit_air_release(fit_air *a)
{
    gsl_interp_free(a->iF);
    gsl_interp_free(a->ik1);
    gsl_interp_free(a->iG);
    gsl_interp_free(a->iZ);
    gsl_interp_accel_free(a->aF);
    gsl_interp_accel_free(a->ak1);
    gsl_interp_accel_free(a->aG);
    gsl_interp_accel_free(a->aZ);
    free(a->z);
    free(a->k1);
    free(a->F);
    free(a->nlnp);
    memset(a, 0, sizeof *a);
}

int sr_fit_air_build(fit_air *a, const sr_atmos *atm, double zlo, double zhi, double gravity, sr_error *err)
{
    memset(a, 0, sizeof *a);
    double mlo, mhi;
    sr_atmos_range(atm, &mlo, &mhi);
    zlo = fmax(zlo, mlo);
    zhi = fmin(zhi, mhi);
    if (!(zhi > zlo))
        return sr_error_set(err, SR_EDOMAIN, "the log's heights (%.0f .. %.0f m above sea level) lie outside the "
                                             "atmosphere model (%.0f .. %.0f m)", zlo, zhi, mlo, mhi);
    size_t n = (size_t)ceil((zhi - zlo) / NODE_STEP) + 1;
    if (n > NODES_MAX)
        n = NODES_MAX;
    if (n < 4)
        n = 4;
    double step = (zhi - zlo) / (double)(n - 1);
    a->n = n;
    a->z = malloc(n * sizeof *a->z);
    a->k1 = malloc(n * sizeof *a->k1);
    a->F = malloc(n * sizeof *a->F);
    a->nlnp = malloc(n * sizeof *a->nlnp);
    if (!a->z || !a->k1 || !a->F || !a->nlnp) {
        sr_fit_air_release(a);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    sr_error e;
    double prev_inv = 0.0;
    for (size_t i = 0; i < n; i++) {
        double z = i + 1 == n ? zhi : zlo + step * (double)i;
        sr_air air;
        int rc = sr_atmos_at(atm, z, &air, &e);
        if (rc) {
            sr_fit_air_release(a);
            return sr_error_set(err, rc, "%s", e.msg);
        }
        double g = isnan(gravity) ? air.g : gravity;
        a->z[i] = z;
        a->k1[i] = sqrt(2.0 * g / air.rho);
        a->nlnp[i] = -log(air.p);
        double inv = 1.0 / a->k1[i];
        if (i == 0) {
            a->F[i] = 0.0;
        } else {
            /* Simpson on the cell, with the midpoint from the atmosphere itself */
            double zm = 0.5 * (z + a->z[i - 1]);
            sr_air am;
            if ((rc = sr_atmos_at(atm, zm, &am, &e))) {
                sr_fit_air_release(a);
                return sr_error_set(err, rc, "%s", e.msg);
            }
            double gm = isnan(gravity) ? am.g : gravity;
            double invm = 1.0 / sqrt(2.0 * gm / am.rho);
            a->F[i] = a->F[i - 1] + (z - a->z[i - 1]) * (prev_inv + 4.0 * invm + inv) / 6.0;
        }
        prev_inv = inv;
    }
    for (size_t i = 1; i < n; i++)
        if (!(a->nlnp[i] > a->nlnp[i - 1])) {
            double zi = a->z[i];
            sr_fit_air_release(a);
            return sr_error_set(err, SR_EDOMAIN, "the atmosphere's pressure does not fall with altitude near %.0f m",
                                zi);
        }
    a->iF = gsl_interp_alloc(gsl_interp_cspline, n);
    a->ik1 = gsl_interp_alloc(gsl_interp_cspline, n);
    a->iG = gsl_interp_alloc(gsl_interp_cspline, n);
    a->iZ = gsl_interp_alloc(gsl_interp_cspline, n);
    a->aF = gsl_interp_accel_alloc();
    a->ak1 = gsl_interp_accel_alloc();
    a->aG = gsl_interp_accel_alloc();
    a->aZ = gsl_interp_accel_alloc();
    if (!a->iF || !a->ik1 || !a->iG || !a->iZ || !a->aF || !a->ak1 || !a->aG || !a->aZ ||
        gsl_interp_init(a->iF, a->z, a->F, n) || gsl_interp_init(a->ik1, a->z, a->k1, n) ||
        gsl_interp_init(a->iG, a->F, a->z, n) || gsl_interp_init(a->iZ, a->nlnp, a->z, n)) {
        sr_fit_air_release(a);
        return sr_error_set(err, SR_ENOMEM, "cannot build the air tables of the fit");
    }
    return SR_OK;
}

/* Clamped evaluation: outside the grid the ends are extended linearly (the
 * optimiser may try a step beyond the log's heights). */
static double eval(const gsl_interp *ip, const double *x, const double *y, size_t n, gsl_interp_accel *acc, double v)
{
    if (v <= x[0])
        return y[0] + (v - x[0]) * (y[1] - y[0]) / (x[1] - x[0]);
    if (v >= x[n - 1])
        return y[n - 1] + (v - x[n - 1]) * (y[n - 1] - y[n - 2]) / (x[n - 1] - x[n - 2]);
    double out;
    if (gsl_interp_eval_e(ip, x, y, v, acc, &out))
        return NAN;
    return out;
}

double sr_fit_air_F(const fit_air *a, double z)
{
    return eval(a->iF, a->z, a->F, a->n, a->aF, z);
}

double sr_fit_air_G(const fit_air *a, double F)
{
    return eval(a->iG, a->F, a->z, a->n, a->aG, F);
}

double sr_fit_air_k1(const fit_air *a, double z)
{
    if (z <= a->z[0])
        return a->k1[0];
    if (z >= a->z[a->n - 1])
        return a->k1[a->n - 1];
    return eval(a->ik1, a->z, a->k1, a->n, a->ak1, z);
}

double sr_fit_air_z_of_p(const fit_air *a, double p)
{
    return eval(a->iZ, a->nlnp, a->z, a->n, a->aZ, -log(p));
}
