/* profile_grid.c - inside the profile module: the air and wind of a site on a
 * height grid, and the cumulative quadrature tables of the steady descent. */
#include "physics/profile_grid.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

/* Gauss-Legendre points per grid cell (between wind-table rows): exact for
 * polynomials of degree 7, far below 1e-9 on the smooth air integrand. */
#define GL_POINTS 4

int sr_profile_grid_direct(const sr_profile_grid *c, double h, double *f, double *we, double *wn)
{
    double z = c->ground + h, rho;
    if (!isnan(c->uniform_density)) {
        rho = c->uniform_density;
    } else {
        sr_error e;
        if (sr_atmos_density(&c->atmos, z, &rho, &e))
            return SR_EDOMAIN;
    }
    *f = sqrt(rho / sr_atmos_gravity(z));
    sr_wind_at(&c->wind, h, we, wn);
    return SR_OK;
}

int sr_profile_grid_phi(const sr_profile_grid *c, double h, double *phi, double *dphi)
{
    double z = c->ground + h, rho, dlnrho = 0.0;
    if (!isnan(c->uniform_density)) {
        rho = c->uniform_density;
    } else {
        sr_error e;
        double lo, hi, d = 0.5, r0, r1;
        sr_atmos_range(&c->atmos, &lo, &hi);
        double za = z - d < lo ? lo : z - d, zb = z + d > hi ? hi : z + d;
        if (sr_atmos_density(&c->atmos, z, &rho, &e) || sr_atmos_density(&c->atmos, za, &r0, &e) ||
            sr_atmos_density(&c->atmos, zb, &r1, &e))
            return SR_EDOMAIN;
        /* d ln(rho)/dh by a central difference: ln(rho) is smooth on this scale */
        dlnrho = (log(r1) - log(r0)) / (zb - za);
    }
    double g = sr_atmos_gravity(z);
    *phi = 1.0 / sqrt(rho * g);
    if (dphi)
        *dphi = -0.5 * *phi * (dlnrho - 2.0 / (SR_ATMOS_R0 + z));
    return SR_OK;
}

static int cell_integrals(const sr_profile_grid *c, const gsl_integration_glfixed_table *gl, double lo, double hi,
                          double out[5])
{
    /* split at wind-table rows inside the cell: the wind has kinks there */
    double cuts[34];
    size_t nc = 0;
    cuts[nc++] = lo;
    size_t nk;
    const double *k = sr_wind_knots(&c->wind, &nk);
    for (size_t i = 0; i < nk && nc < 33; i++)
        if (k[i] > lo && k[i] < hi)
            cuts[nc++] = k[i];
    cuts[nc++] = hi;
    out[0] = out[1] = out[2] = out[3] = out[4] = 0.0;
    for (size_t s = 0; s + 1 < nc; s++) {
        double pa, pb, ea, na, eb, nb;
        if (sr_profile_grid_phi(c, cuts[s], &pa, NULL) || sr_profile_grid_phi(c, cuts[s + 1], &pb, NULL))
            return SR_EDOMAIN;
        sr_wind_at(&c->wind, cuts[s], &ea, &na);
        sr_wind_at(&c->wind, cuts[s + 1], &eb, &nb);
        /* the shear lag, integral of phi dw, by parts: [phi w] - integral of w phi' dh (w has kinks, phi not) */
        out[3] += pb * eb - pa * ea;
        out[4] += pb * nb - pa * na;
        for (size_t j = 0; j < GL_POINTS; j++) {
            double x, w, f, we, wn, phi, dphi;
            gsl_integration_glfixed_point(cuts[s], cuts[s + 1], j, &x, &w, gl);
            if (sr_profile_grid_direct(c, x, &f, &we, &wn) || sr_profile_grid_phi(c, x, &phi, &dphi))
                return SR_EDOMAIN;
            out[0] += w * f;
            out[1] += w * we * f;
            out[2] += w * wn * f;
            out[3] -= w * we * dphi;
            out[4] -= w * wn * dphi;
        }
    }
    return SR_OK;
}

int sr_profile_grid_build(sr_profile_grid *c, const sr_atmos *atmos, const sr_wind *wind, double ground,
                          double uniform_density, double top, size_t n, sr_error *err)
{
    memset(c, 0, sizeof *c);
    sr_atmos_init_standard(&c->atmos);
    sr_wind_init_calm(&c->wind);
    int rc = sr_atmos_copy(&c->atmos, atmos, err);
    if (!rc)
        rc = sr_wind_copy(&c->wind, wind, err);
    if (rc)
        return rc;
    c->ground = ground;
    c->uniform_density = uniform_density;
    size_t m = n + 1;
    c->n = n;
    c->top = top;
    c->dh = top / (double)n;
    c->block = malloc(12 * m * sizeof(double));
    if (!c->block)
        return sr_error_set(err, SR_ENOMEM, "out of memory for the profile tables");
    double *b = c->block;
    c->lnrho = b;
    c->a = b + m;
    c->g = b + 2 * m;
    c->we = b + 3 * m;
    c->wn = b + 4 * m;
    c->f = b + 5 * m;
    c->I = b + 6 * m;
    c->Je = b + 7 * m;
    c->Jn = b + 8 * m;
    c->Le = b + 9 * m;
    c->Ln = b + 10 * m;
    c->mu = b + 11 * m;
    for (size_t i = 0; i < m; i++) {
        double h = c->dh * (double)i;
        sr_air air;
        sr_error e;
        if (sr_atmos_at(&c->atmos, c->ground + h, &air, &e))
            return sr_error_set(err, SR_EDOMAIN, "%s", e.msg);
        double rho = isnan(c->uniform_density) ? air.rho : c->uniform_density;
        c->lnrho[i] = log(rho);
        c->a[i] = air.a;
        c->g[i] = air.g;
        c->mu[i] = air.mu;
        sr_wind_at(&c->wind, h, &c->we[i], &c->wn[i]);
        c->f[i] = sqrt(rho / air.g);
    }
    gsl_integration_glfixed_table *gl = gsl_integration_glfixed_table_alloc(GL_POINTS);
    if (!gl)
        return sr_error_set(err, SR_ENOMEM, "out of memory for the quadrature table");
    c->I[0] = c->Je[0] = c->Jn[0] = c->Le[0] = c->Ln[0] = 0.0;
    for (size_t i = 0; i < n; i++) {
        double q[5];
        if (cell_integrals(c, gl, c->dh * (double)i, c->dh * (double)(i + 1), q)) {
            gsl_integration_glfixed_table_free(gl);
            return sr_error_set(err, SR_EDOMAIN, "the atmosphere is undefined within the descent");
        }
        c->I[i + 1] = c->I[i] + q[0];
        c->Je[i + 1] = c->Je[i] + q[1];
        c->Jn[i + 1] = c->Jn[i] + q[2];
        c->Le[i + 1] = c->Le[i] + q[3];
        c->Ln[i + 1] = c->Ln[i] + q[4];
    }
    gsl_integration_glfixed_table_free(gl);
    return SR_OK;
}

void sr_profile_grid_release(sr_profile_grid *c)
{
    sr_atmos_release(&c->atmos);
    sr_wind_release(&c->wind);
    free(c->block);
    c->block = NULL;
}

static inline size_t cell_of(const sr_profile_grid *c, double h, double *t)
{
    double x = h / c->dh;
    if (!(x > 0.0)) {
        *t = 0.0;
        return 0;
    }
    if (x >= (double)c->n) {
        *t = 1.0;
        return c->n - 1;
    }
    size_t i = (size_t)x;
    *t = x - (double)i;
    return i;
}

void sr_profile_grid_air(const sr_profile_grid *c, double h, double *rho, double *a, double *grav)
{
    double t;
    size_t i = cell_of(c, h, &t);
    /* ln(rho) is nearly linear in height: linear interpolation is good to 1e-6 */
    *rho = exp(c->lnrho[i] + t * (c->lnrho[i + 1] - c->lnrho[i]));
    if (a)
        *a = c->a[i] + t * (c->a[i + 1] - c->a[i]);
    if (grav)
        *grav = c->g[i] + t * (c->g[i + 1] - c->g[i]);
}

double sr_profile_grid_mu(const sr_profile_grid *c, double h)
{
    double t;
    size_t i = cell_of(c, h, &t);
    return c->mu[i] + t * (c->mu[i + 1] - c->mu[i]);
}

/* Cubic Hermite on the cumulative integral with the integrand as slope:
 * GSL's interpolators take no given slopes and want an accelerator. */
static inline double hermite(double y0, double y1, double d0, double d1, double dh, double t)
{
    double t2 = t * t, t3 = t2 * t;
    return (2 * t3 - 3 * t2 + 1) * y0 + (t3 - 2 * t2 + t) * dh * d0 + (-2 * t3 + 3 * t2) * y1 + (t3 - t2) * dh * d1;
}

void sr_profile_grid_cumulative(const sr_profile_grid *c, double h, double *I, double *Je, double *Jn)
{
    double t;
    size_t i = cell_of(c, h, &t);
    if (h > c->top) {
        /* beyond the tables (only a perturbed sample can ask): extend linearly */
        double over = h - c->top;
        *I = c->I[c->n] + over * c->f[c->n];
        if (Je) {
            *Je = c->Je[c->n] + over * c->we[c->n] * c->f[c->n];
            *Jn = c->Jn[c->n] + over * c->wn[c->n] * c->f[c->n];
        }
        return;
    }
    *I = hermite(c->I[i], c->I[i + 1], c->f[i], c->f[i + 1], c->dh, t);
    if (Je) {
        *Je = hermite(c->Je[i], c->Je[i + 1], c->we[i] * c->f[i], c->we[i + 1] * c->f[i + 1], c->dh, t);
        *Jn = hermite(c->Jn[i], c->Jn[i + 1], c->wn[i] * c->f[i], c->wn[i + 1] * c->f[i + 1], c->dh, t);
    }
}

void sr_profile_grid_lag(const sr_profile_grid *c, double h, double *Le, double *Ln)
{
    double t;
    size_t i = cell_of(c, h, &t);
    /* a correction of about 1%: linear between nodes (the slope is singular at the
     * ground for the power law and jumps at table rows) */
    *Le = c->Le[i] + t * (c->Le[i + 1] - c->Le[i]);
    *Ln = c->Ln[i] + t * (c->Ln[i + 1] - c->Ln[i]);
}

double sr_profile_grid_height_for_I(const sr_profile_grid *c, double target)
{
    if (target <= 0.0)
        return 0.0;
    if (target >= c->I[c->n])
        return c->top + (target - c->I[c->n]) / c->f[c->n];
    size_t lo = 0, hi = c->n;
    while (hi - lo > 1) {
        size_t mid = (lo + hi) / 2;
        if (c->I[mid] <= target)
            lo = mid;
        else
            hi = mid;
    }
    /* Newton on the cell's cubic, kept inside the cell by bisection (a GSL root
     * solver would be allocated per call, on the per-sample path) */
    double a = 0.0, b = 1.0, t = (target - c->I[lo]) / (c->I[lo + 1] - c->I[lo]);
    for (int it = 0; it < 30; it++) {
        double v = hermite(c->I[lo], c->I[lo + 1], c->f[lo], c->f[lo + 1], c->dh, t) - target;
        if (v > 0)
            b = t;
        else
            a = t;
        double t2 = t * t;
        double d = ((6 * t2 - 6 * t) * c->I[lo] + (3 * t2 - 4 * t + 1) * c->dh * c->f[lo] +
                    (-6 * t2 + 6 * t) * c->I[lo + 1] + (3 * t2 - 2 * t) * c->dh * c->f[lo + 1]);
        double nt = d > 0 ? t - v / d : 0.5 * (a + b);
        if (!(nt > a && nt < b))
            nt = 0.5 * (a + b);
        if (fabs(nt - t) < 1e-13)
            break;
        t = nt;
    }
    return c->dh * ((double)lo + t);
}

