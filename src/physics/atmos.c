/* atmos.c - U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562) below 86 km and
 * its variants. Layer data: 1976 standard, Table 4 (H_b, L_b); T_b follow. */
#include "physics/atmos.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_interp.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>


#define NLAYER 7
/* Geopotential base heights (m'), lapse rates (K/m'), base temperatures (K). */
static const double HB[NLAYER + 1] = {0, 11000, 20000, 32000, 47000, 51000, 71000, 84852};
static const double LB[NLAYER] = {-0.0065, 0.0, 0.001, 0.0028, 0.0, -0.0028, -0.002};
static const double TB[NLAYER] = {288.15, 216.65, 216.65, 228.65, 270.65, 270.65, 214.65};
/* g0 M0 / R*, K/m' (1976 standard: 34.163195 K/km) */
#define HYDRO (SR_ATMOS_G0 * SR_ATMOS_M0 / SR_ATMOS_R_STAR)

double sr_atmos_geopotential(double z)
{
    return SR_ATMOS_R0 * z / (SR_ATMOS_R0 + z);
}

double sr_atmos_gravity(double z)
{
    double r = SR_ATMOS_R0 / (SR_ATMOS_R0 + z);
    return SR_ATMOS_G0 * r * r;
}

double sr_atmos_viscosity(double T)
{
    return SR_ATMOS_BETA_S * T * sqrt(T) / (T + SR_ATMOS_S);
}

double sr_atmos_sound_speed(double T)
{
    return sqrt(SR_ATMOS_GAMMA * SR_ATMOS_R_STAR / SR_ATMOS_M0 * T);
}

/* g0 M0 / (R* L_b) per layer (0 for isothermal layers), the pressure exponent. */
static const double EXPO[NLAYER] = {HYDRO / -0.0065, 0.0, HYDRO / 0.001, HYDRO / 0.0028, 0.0, HYDRO / -0.0028,
                                    HYDRO / -0.002};

/* Pressure ratio across a layer from its base to geopotential height H.
 * exp(k log x) instead of pow: the same value to a few ulp, at half the cost
 * (the atmosphere sits in every descent integral). */
static double layer_ratio(int b, double Tb, double H)
{
    double L = LB[b];
    if (L == 0.0)
        return exp(-HYDRO * (H - HB[b]) / Tb);
    return exp(-EXPO[b] * log((Tb + L * (H - HB[b])) / Tb));
}

/* Base pressures for an offset dT applied in the hydrostatic integral. */
static void base_pressures(double dT, double pb[NLAYER])
{
    pb[0] = SR_ATMOS_P0;
    for (int b = 1; b < NLAYER; b++)
        pb[b] = pb[b - 1] * layer_ratio(b - 1, TB[b - 1] + dT, HB[b]);
}

static int layer_of(double H)
{
    int b = 0;
    while (b < NLAYER - 1 && H >= HB[b + 1])
        b++;
    return b;
}

int sr_atmos_standard_tp(double z, double dT, double *T, double *p)
{
    if (!(z >= SR_ATMOS_Z_MIN && z <= SR_ATMOS_Z_MAX))
        return SR_EDOMAIN;
    double pb[NLAYER];
    base_pressures(dT, pb);
    double H = sr_atmos_geopotential(z);
    int b = layer_of(H);
    *T = TB[b] + dT + LB[b] * (H - HB[b]);
    *p = pb[b] * layer_ratio(b, TB[b] + dT, H);
    return SR_OK;
}

/* Fill the ln p node table for temperature offset dT (in the hydrostatic
 * integral when hydro_dT, else standard pressure) and pressure scale. */
static void build_nodes(sr_atmos *m, double dT, int hydro_dT, double scale)
{
    double pb[NLAYER];
    base_pressures(hydro_dT ? dT : 0.0, pb);
    for (int k = 0; k < SR_ATMOS_NODES; k++) {
        double H = SR_ATMOS_NODE_H0 + k * SR_ATMOS_NODE_STEP;
        int b = layer_of(H + 0.5 * SR_ATMOS_NODE_STEP); /* the layer of the interval that starts here */
        int bn = layer_of(H);
        double Tb = TB[bn] + (hydro_dT ? dT : 0.0);
        double Tn = Tb + LB[bn] * (H - HB[bn]);
        m->lnp[k] = log(scale * pb[bn] * layer_ratio(bn, Tb, H));
        m->slope[k] = -HYDRO / Tn * SR_ATMOS_NODE_STEP;
        m->layer[k] = (signed char)b;
    }
}

void sr_atmos_init_standard(sr_atmos *m)
{
    memset(m, 0, sizeof *m);
    m->kind = SR_ATMOS_STANDARD;
    m->p_scale = 1.0;
    build_nodes(m, 0.0, 0, 1.0);
}

int sr_atmos_init_offset(sr_atmos *m, double dT, sr_error *err)
{
    sr_atmos_init_standard(m);
    if (!isfinite(dT) || dT < -100.0 || dT > 100.0)
        return sr_error_set(err, SR_EINVAL, "temperature offset %g K is outside -100 K .. +100 K", dT);
    m->kind = SR_ATMOS_OFFSET;
    m->dT = dT;
    return SR_OK; /* the pressure nodes stay standard */
}

int sr_atmos_init_site(sr_atmos *m, double z_site, double T_s, double p_s, sr_error *err)
{
    sr_atmos_init_standard(m);
    if (!isfinite(z_site) || z_site < SR_ATMOS_Z_MIN || z_site > 20000.0)
        return sr_error_set_key(err, SR_EDOMAIN, "elevation", "site elevation %g m is outside -1000 m .. 20000 m",
                                z_site);
    double Tstd, pstd;
    sr_atmos_standard_tp(z_site, 0.0, &Tstd, &pstd);
    if (!isnan(T_s) && (!isfinite(T_s) || T_s < 173.15 || T_s > 343.15))
        return sr_error_set_key(err, SR_EINVAL, "temperature",
                                "surface temperature %.2f K is outside 173.15 K .. 343.15 K (-100 C .. +70 C)", T_s);
    if (!isnan(p_s) && (!isfinite(p_s) || p_s < 0.3 * pstd || p_s > 1.3 * pstd))
        return sr_error_set_key(err, SR_EINVAL, "pressure",
                                "surface pressure %.0f Pa is implausible at %.0f m (standard there: %.0f Pa)", p_s,
                                z_site, pstd);
    m->kind = SR_ATMOS_SITE;
    m->site_z = z_site;
    m->site_measured = (isnan(T_s) ? 0 : SR_ATMOS_MEASURED_T) | (isnan(p_s) ? 0 : SR_ATMOS_MEASURED_P);
    m->dT = isnan(T_s) ? 0.0 : T_s - Tstd;
    m->site_T = Tstd + m->dT;
    m->site_p = isnan(p_s) ? pstd : p_s;
    double Toff, poff;
    sr_atmos_standard_tp(z_site, m->dT, &Toff, &poff);
    m->p_scale = m->site_p / poff;
    build_nodes(m, m->dT, 1, m->p_scale);
    return SR_OK;
}

int sr_atmos_copy(sr_atmos *dst, const sr_atmos *src, sr_error *err)
{
    sr_atmos_release(dst);
    *dst = *src;
    dst->sz = dst->sT = dst->slnp = NULL;
    if (src->kind != SR_ATMOS_SOUNDING)
        return SR_OK;
    size_t b = src->n * sizeof(double);
    dst->sz = malloc(b);
    dst->sT = malloc(b);
    dst->slnp = malloc(b);
    if (!dst->sz || !dst->sT || !dst->slnp) {
        sr_atmos_release(dst);
        sr_atmos_init_standard(dst);
        return sr_error_set(err, SR_ENOMEM, "out of memory for a copy of the sounding");
    }
    memcpy(dst->sz, src->sz, b);
    memcpy(dst->sT, src->sT, b);
    memcpy(dst->slnp, src->slnp, b);
    return SR_OK;
}

void sr_atmos_release(sr_atmos *m)
{
    if (!m)
        return;
    free(m->sz);
    free(m->sT);
    free(m->slnp);
    m->sz = m->sT = m->slnp = NULL;
    m->n = 0;
}

/* How far a sounding's pressure may lie from the 1976 standard's at the same
 * height. Common practice (a fact of the trade): sea-level pressure spans
 * about 870 .. 1085 hPa, and the seasonal and latitudinal spread of pressure
 * aloft stays well inside a factor of 2 up to the mesosphere. */
#define SOUNDING_P_FACTOR 3.0

/* The rules a sounding must meet. On failure *bad is the offending row
 * (0-based) and the message names no row: callers say where it is. */
static int check_sounding(const double *z, const double *T, const double *p, size_t n, size_t *bad,
                          sr_error *err)
{
    *bad = 0;
    if (n < 2)
        return sr_error_set(err, SR_EINVAL, "a sounding needs at least two rows");
    for (size_t i = 0; i < n; i++) {
        *bad = i;
        if (!(z[i] >= SR_ATMOS_Z_MIN && z[i] <= SR_ATMOS_Z_MAX))
            return sr_error_set(err, SR_EDOMAIN, "altitude %g m is outside -1000 m .. 86000 m", z[i]);
        if (i > 0 && !(z[i] > z[i - 1]))
            return sr_error_set(err, SR_EINVAL, "altitude must increase from row to row");
        if (!(T[i] > 100.0 && T[i] < 400.0))
            return sr_error_set(err, SR_EINVAL, "temperature %g K is outside 100 K .. 400 K", T[i]);
        if (!(p[i] > 0.0 && p[i] < 2e5))
            return sr_error_set(err, SR_EINVAL, "pressure %g Pa is outside 0 .. 200000 Pa", p[i]);
        /* weather moves the pressure at a height by tens of percent, never by a factor of
         * SOUNDING_P_FACTOR: beyond that the column is not air (a wrong unit, a typing slip),
         * and a density from it would give descent rates without meaning */
        double Ts, ps;
        if (sr_atmos_standard_tp(z[i], 0.0, &Ts, &ps) == SR_OK &&
            !(p[i] > ps / SOUNDING_P_FACTOR && p[i] < ps * SOUNDING_P_FACTOR))
            return sr_error_set(err, SR_EINVAL,
                                "pressure %.4g hPa at %.0f m is not air: the standard atmosphere has %.4g hPa there, "
                                "and a sounding stays within a factor of %g of it (check the unit)",
                                p[i] / 100.0, z[i], ps / 100.0, SOUNDING_P_FACTOR);
        if (i > 0 && !(p[i] < p[i - 1]))
            return sr_error_set(err, SR_EINVAL, "pressure must fall as altitude rises");
    }
    return SR_OK;
}

int sr_atmos_init_sounding(sr_atmos *m, const double *z, const double *T, const double *p, size_t n,
                           sr_error *err)
{
    size_t bad;
    int rc = sr_atmos_init_sounding_rows(m, z, T, p, n, &bad, err);
    if (rc && n >= 2 && bad != (size_t)-1)
        sr_error_prefix(err, "sounding row %zu: ", bad + 1);
    return rc;
}

int sr_atmos_init_sounding_rows(sr_atmos *m, const double *z, const double *T, const double *p, size_t n,
                                size_t *bad, sr_error *err)
{
    sr_atmos_init_standard(m);
    int rc = check_sounding(z, T, p, n, bad, err);
    if (rc)
        return rc;
    *bad = (size_t)-1;
    m->sz = malloc(n * sizeof *m->sz);
    m->sT = malloc(n * sizeof *m->sT);
    m->slnp = malloc(n * sizeof *m->slnp);
    if (!m->sz || !m->sT || !m->slnp) {
        sr_atmos_release(m);
        return sr_error_set(err, SR_ENOMEM, "out of memory for the sounding");
    }
    for (size_t i = 0; i < n; i++) {
        m->sz[i] = z[i];
        m->sT[i] = T[i];
        m->slnp[i] = log(p[i]);
    }
    m->n = n;
    m->kind = SR_ATMOS_SOUNDING;
    return SR_OK;
}

void sr_atmos_range(const sr_atmos *m, double *zmin, double *zmax)
{
    if (m->kind == SR_ATMOS_SOUNDING) {
        *zmin = m->sz[0];
        *zmax = m->sz[m->n - 1];
    } else {
        *zmin = SR_ATMOS_Z_MIN;
        *zmax = SR_ATMOS_Z_MAX;
    }
}

static int out_of_range(const sr_atmos *m, double z, sr_error *err)
{
    double lo, hi;
    sr_atmos_range(m, &lo, &hi);
    if (m->kind == SR_ATMOS_SOUNDING)
        return sr_error_set(err, SR_EDOMAIN,
                            "altitude %.1f m is outside the sounding (%.1f m .. %.1f m); it is never extrapolated",
                            z, lo, hi);
    return sr_error_set(err, SR_EDOMAIN,
                        "altitude %.1f m is outside the standard atmosphere model (-1000 m .. 86000 m geometric)", z);
}

/* Linear interpolation on the sounding; a hand-written binary search keeps
 * sr_atmos_at const and thread-safe (a gsl_interp_accel would be shared state). */
static void sounding_tp(const sr_atmos *m, double z, double *T, double *p)
{
    size_t i = gsl_interp_bsearch(m->sz, z, 0, m->n - 1);
    double w = (z - m->sz[i]) / (m->sz[i + 1] - m->sz[i]);
    *T = m->sT[i] + w * (m->sT[i + 1] - m->sT[i]);
    *p = exp(m->slnp[i] + w * (m->slnp[i + 1] - m->slnp[i]));
}

static inline void model_tp(const sr_atmos *m, double z, double inv, double *T, double *p)
{
    if (m->kind == SR_ATMOS_SOUNDING) {
        sounding_tp(m, z, T, p);
        return;
    }
    double H = SR_ATMOS_R0 * z * inv;
    /* Cubic Hermite on ln p with exact node slopes: relative error below 1e-8
     * (fourth derivative bound over 500 m' steps), one exp and no log or pow,
     * which keeps the atmosphere cheap inside every descent integral. */
    double x = (H - SR_ATMOS_NODE_H0) * (1.0 / SR_ATMOS_NODE_STEP);
    int k = (int)x;
    if (k >= SR_ATMOS_NODES - 1)
        k = SR_ATMOS_NODES - 2;
    double t = x - k, t2 = t * t, t3 = t2 * t;
    double h00 = 2 * t3 - 3 * t2 + 1, h10 = t3 - 2 * t2 + t, h01 = -2 * t3 + 3 * t2, h11 = t3 - t2;
    double lnp = h00 * m->lnp[k] + h10 * m->slope[k] + h01 * m->lnp[k + 1] + h11 * m->slope[k + 1];
    int b = m->layer[k];
    /* offset and site models move the temperature; the offset model keeps standard pressure */
    *T = TB[b] + LB[b] * (H - HB[b]) + m->dT;
    *p = exp(lnp);
}

int sr_atmos_at(const sr_atmos *m, double z, sr_air *out, sr_error *err)
{
    double lo, hi;
    sr_atmos_range(m, &lo, &hi);
    if (!(z >= lo && z <= hi))
        return out_of_range(m, z, err);
    double T, p, inv = 1.0 / (SR_ATMOS_R0 + z);
    model_tp(m, z, inv, &T, &p);
    if (!(T > 0.0))
        return sr_error_set(err, SR_EDOMAIN, "temperature at %.0f m falls to %.1f K: the offset is too large", z, T);
    out->z = z;
    out->T = T;
    out->p = p;
    out->rho = p * (SR_ATMOS_M0 / SR_ATMOS_R_STAR) / T;
    double sT = sqrt(T);
    out->a = sqrt(SR_ATMOS_GAMMA * SR_ATMOS_R_STAR / SR_ATMOS_M0) * sT;
    out->mu = SR_ATMOS_BETA_S * T * sT / (T + SR_ATMOS_S);
    out->nu = out->mu / out->rho;
    double r = SR_ATMOS_R0 * inv;
    out->g = SR_ATMOS_G0 * r * r;
    return SR_OK;
}

int sr_atmos_density(const sr_atmos *m, double z, double *rho, sr_error *err)
{
    double lo, hi;
    sr_atmos_range(m, &lo, &hi);
    if (!(z >= lo && z <= hi))
        return out_of_range(m, z, err);
    double T, p;
    model_tp(m, z, 1.0 / (SR_ATMOS_R0 + z), &T, &p);
    if (!(T > 0.0))
        return sr_error_set(err, SR_EDOMAIN, "temperature at %.0f m falls to %.1f K: the offset is too large", z, T);
    *rho = p * (SR_ATMOS_M0 / SR_ATMOS_R_STAR) / T;
    return SR_OK;
}

void sr_atmos_describe(const sr_atmos *m, char *buf, size_t len)
{
    switch (m->kind) {
    case SR_ATMOS_STANDARD:
        snprintf(buf, len, "U.S. Standard Atmosphere 1976");
        break;
    case SR_ATMOS_OFFSET:
        snprintf(buf, len, "U.S. Standard Atmosphere 1976, temperature %+.1f K at standard pressure", m->dT);
        break;
    case SR_ATMOS_SITE:
        if (!m->site_measured)
            snprintf(buf, len, "U.S. Standard Atmosphere 1976, ground at %.0f m (no measured surface values)",
                     m->site_z);
        else
            snprintf(buf, len, "site at %.0f m: surface %.2f K (%+.1f K from standard%s), %.0f Pa%s; standard lapse above",
                     m->site_z, m->site_T, m->dT, m->site_measured & SR_ATMOS_MEASURED_T ? "" : ": standard",
                     m->site_p, m->site_measured & SR_ATMOS_MEASURED_P ? "" : " (standard)");
        break;
    case SR_ATMOS_SOUNDING:
        snprintf(buf, len, "sounding %s (%zu rows, %.0f m .. %.0f m)", m->source[0] ? m->source : "table", m->n,
                 m->sz[0], m->sz[m->n - 1]);
        break;
    }
}

/* ---- a program's handles (include/sinkrate/physics.h) ---- */

/* The model built in tmp moves into a new handle, or is released. */
static int atmos_handle(sr_atmos **out, sr_atmos *tmp, int rc, sr_error *err)
{
    sr_error_gsl_off();
    *out = NULL;
    if (rc) {
        sr_atmos_release(tmp);
        return rc;
    }
    sr_atmos *m = malloc(sizeof *m);
    if (!m) {
        sr_atmos_release(tmp);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    *m = *tmp;
    *out = m;
    return SR_OK;
}

int sr_atmos_new_standard(sr_atmos **out, sr_error *err)
{
    sr_atmos t;
    sr_atmos_init_standard(&t);
    return atmos_handle(out, &t, SR_OK, err);
}

int sr_atmos_new_offset(sr_atmos **out, double dT, sr_error *err)
{
    sr_atmos t;
    int rc = sr_atmos_init_offset(&t, dT, err);
    return atmos_handle(out, &t, rc, err);
}

int sr_atmos_new_site(sr_atmos **out, double z, double T, double p, sr_error *err)
{
    sr_atmos t;
    int rc = sr_atmos_init_site(&t, z, T, p, err);
    return atmos_handle(out, &t, rc, err);
}

int sr_atmos_new_sounding(sr_atmos **out, const double *z, const double *T, const double *p, size_t n,
                          sr_error *err)
{
    sr_atmos t;
    int rc = sr_atmos_init_sounding(&t, z, T, p, n, err);
    return atmos_handle(out, &t, rc, err);
}

int sr_atmos_dup(sr_atmos **out, const sr_atmos *src, sr_error *err)
{
    sr_atmos t;
    sr_atmos_init_standard(&t);
    int rc = sr_atmos_copy(&t, src, err);
    return atmos_handle(out, &t, rc, err);
}

void sr_atmos_free(sr_atmos *m)
{
    if (!m)
        return;
    sr_atmos_release(m);
    free(m);
}
