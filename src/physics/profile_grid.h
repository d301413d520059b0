/* profile_grid.h - inside the profile module: the air and wind of a site on a
 * height grid above ground, with the cumulative quadrature tables of a steady
 * descent (time and drift of a unit descent rate), for table look-ups on the
 * per-sample path. Owns copies of its atmosphere and wind. */
#ifndef SR_PROFILE_GRID_H
#define SR_PROFILE_GRID_H

#include <stddef.h>

#include "base/error.h"
#include "physics/atmos.h"
#include "physics/wind.h"

typedef struct sr_profile_grid {
    sr_atmos atmos;            /* own copy (sounding arrays owned) */
    sr_wind wind;              /* own copy (table arrays owned) */
    double ground;             /* site elevation, m */
    double uniform_density;    /* NaN: the atmosphere's density; > 0: this density at every height */
    /* height grid h_i = i dh, i = 0..n */
    size_t n;
    double dh, top;
    double *lnrho, *a, *g;     /* air */
    double *mu;                /* dynamic viscosity */
    double *we, *wn;           /* wind, east and north */
    double *f;                 /* sqrt(rho / g): dt/dh of a unit steady descent */
    double *I, *Je, *Jn;       /* integrals of f, we f, wn f from 0 to h_i */
    double *Le, *Ln;           /* shear lag: integrals of dw / sqrt(rho g) from 0 to h_i */
    double *block;             /* one allocation behind the arrays */
} sr_profile_grid;

/* Copy the atmosphere and wind, then fill n cells from the ground up to top
 * (m above ground; the caller keeps it inside the atmosphere model). On
 * failure the grid holds nothing; release it with sr_profile_grid_release
 * in every case. */
int sr_profile_grid_build(sr_profile_grid *g, const sr_atmos *atmos, const sr_wind *wind, double ground,
                          double uniform_density, double top, size_t n, sr_error *err);
void sr_profile_grid_release(sr_profile_grid *g);

/* Table look-ups. Heights outside [0, top] clamp (the cumulative integrals
 * extend linearly above the top). */
void sr_profile_grid_air(const sr_profile_grid *g, double h, double *rho, double *a, double *grav);
double sr_profile_grid_mu(const sr_profile_grid *g, double h);
void sr_profile_grid_cumulative(const sr_profile_grid *g, double h, double *I, double *Je, double *Jn);
void sr_profile_grid_lag(const sr_profile_grid *g, double h, double *Le, double *Ln);
/* Height where I(h) = target (I increases with h). */
double sr_profile_grid_height_for_I(const sr_profile_grid *g, double target);

/* The full-mode integrands at h from the models themselves: f = sqrt(rho/g),
 * the wind, and (when dphi is not NULL) the height derivative of
 * phi = 1/sqrt(rho g). SR_EDOMAIN outside the atmosphere model. */
int sr_profile_grid_direct(const sr_profile_grid *g, double h, double *f, double *we, double *wn);
int sr_profile_grid_phi(const sr_profile_grid *g, double h, double *phi, double *dphi);

#endif
