/* fit_int.h - what the parts of the fit share: the air along the log as
 * tables (density, gravity, the descent-time integral and its inverse,
 * pressure and altitude both ways) and the segment finder. Not installed. */
#ifndef SR_FIT_INT_H
#define SR_FIT_INT_H

#include <gsl/gsl_interp.h>

#include "analysis/fit.h"

/* The air on a grid of altitudes above sea level. k1(z) = sqrt(2 g / rho) is
 * the steady descent rate of a unit mass on a unit drag area; F(z) = the
 * integral of dz / k1 from the grid's foot, so a steady descent under mass m
 * and drag area C runs along F(z(t)) = F(z0) - sqrt(m / C) (t - t0). */
typedef struct fit_air {
    size_t n;
    double *z, *k1, *F, *nlnp; /* nlnp = -ln p, increasing with z */
    gsl_interp *iF, *ik1, *iG, *iZ; /* F(z), k1(z), z(F), z(-ln p) */
    gsl_interp_accel *aF, *ak1, *aG, *aZ;
} fit_air;

/* gravity NaN: the atmosphere's g(z). */
int sr_fit_air_build(fit_air *a, const sr_atmos *atm, double zlo, double zhi, double gravity, sr_error *err);
void sr_fit_air_release(fit_air *a);
double sr_fit_air_F(const fit_air *a, double z);
double sr_fit_air_G(const fit_air *a, double F);
double sr_fit_air_k1(const fit_air *a, double z);
double sr_fit_air_z_of_p(const fit_air *a, double p); /* altitude of a pressure */

/* Median filter of window k (odd), and the odd window nearest `seconds`. */
int sr_fit_median(const double *x, double *y, size_t n, size_t k, sr_error *err);
size_t sr_fit_odd_window(double seconds, double step, size_t n, size_t min);

/* Segments of one log. */
typedef struct fit_seg {
    size_t apogee, touch;      /* rows */
    int touchdown;             /* 0: the log ends first */
    size_t ndep;
    size_t dep[SR_FIT_MAX_STAGES + 4]; /* rows of the detected deployments after apogee */
} fit_seg;

/* Median filter (window about 1.5 s), robust noise, smoothed descent rate
 * (local slope over about 2 s) of z (altitude, m) over t. */
int sr_fit_smooth(const double *t, const double *z, size_t n, double step, double *smooth, double *rate,
               double *noise, sr_error *err);

/* Apogee, touchdown and the change points of the descent rate reduced to
 * ground density (rate * sqrt(rho / rho_ground)). `where` names the log. */
int sr_fit_segments(const sr_flightlog *log, const double *t, const double *smooth, const double *rate, size_t n,
                 const fit_air *air, double zground, double noise, fit_seg *seg, sr_error *err);

/* The opening of a stage from the log's acceleration column, and the wind
 * from its positions (fit_extra.c). */
int sr_fit_find_opening(const sr_flightlog *log, const sr_fit_result *r, const sr_fit_stage_spec *sp, sr_fit_stage *st,
                        const fit_air *air, const sr_atmos *atm, sr_error *err);
int sr_fit_find_wind(const sr_flightlog *log, sr_fit_result *r, sr_error *err);

#endif
