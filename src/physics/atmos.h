/* atmos.h - the air a canopy falls through: the U.S. Standard Atmosphere 1976
 * (NOAA-S/T 76-1562) from -1 km to 86 km geometric altitude, and its variants
 * (hot/cold-day offset, a site's measured surface values, a sounding table). */
#ifndef SR_ATMOS_H
#define SR_ATMOS_H

#include <stddef.h>

#include "base/error.h"
#include "sinkrate/physics.h"

/* 1976 standard constants (U.S. Standard Atmosphere 1976, Table 2 / ICAO Doc 7488 Table A). */
#define SR_ATMOS_R_STAR 8.31432      /* J/(mol K): the 1976 value, not CODATA */
#define SR_ATMOS_M0 28.9644e-3       /* kg/mol, mean molar mass below 86 km */
#define SR_ATMOS_G0 9.80665          /* m/s2 */
#define SR_ATMOS_R0 6356766.0        /* m, effective Earth radius for geopotential */
#define SR_ATMOS_T0 288.15           /* K */
#define SR_ATMOS_P0 101325.0         /* Pa */
#define SR_ATMOS_GAMMA 1.4
#define SR_ATMOS_BETA_S 1.458e-6     /* kg/(m s K^0.5), Sutherland */
#define SR_ATMOS_S 110.4             /* K, Sutherland */
#define SR_ATMOS_Z_MIN (-1000.0)     /* m geometric */
#define SR_ATMOS_Z_MAX 86000.0       /* m geometric */

typedef enum sr_atmos_kind {
    SR_ATMOS_STANDARD = 0,
    SR_ATMOS_OFFSET,   /* T + dT at the standard pressure */
    SR_ATMOS_SITE,     /* measured surface T and/or p at an elevation, standard lapse above */
    SR_ATMOS_SOUNDING  /* a table of altitude, temperature, pressure */
} sr_atmos_kind;

/* Caller-owned model inside the library; initialise with one of the
 * sr_atmos_init_* calls and release with sr_atmos_release (only the sounding
 * holds memory). A program holds it as a handle (sr_atmos_new_*, public:
 * include/sinkrate/physics.h with sr_air, sr_atmos_at, _density, _range,
 * _describe). */
typedef struct sr_atmos {
    sr_atmos_kind kind;
    double dT;        /* offset / site temperature offset from standard, K */
    double p_scale;   /* site: measured surface pressure over the offset-model pressure */
    double site_z;    /* site elevation (m), 0 when not a site model */
    double site_T;    /* surface temperature, K (site): measured, or the standard one of the elevation */
    double site_p;    /* surface pressure, Pa (site): measured, or the standard one of the elevation */
    int site_measured; /* SR_ATMOS_MEASURED_T | SR_ATMOS_MEASURED_P: which surface values were given */
#define SR_ATMOS_MEASURED_T 1
#define SR_ATMOS_MEASURED_P 2
    /* ln p on nodes every SR_ATMOS_NODE_STEP m' of geopotential height, with
     * its exact slope -g0 M0/(R* T), for cubic Hermite evaluation */
#define SR_ATMOS_NODE_H0 (-1500.0)
#define SR_ATMOS_NODE_STEP 500.0
#define SR_ATMOS_NODES 174
    double lnp[SR_ATMOS_NODES];
    double slope[SR_ATMOS_NODES]; /* d ln p / dH times the node step */
    signed char layer[SR_ATMOS_NODES];
    /* sounding */
    size_t n;
    double *sz, *sT, *slnp; /* altitude (m), temperature (K), ln pressure */
    char source[256];       /* file name of the sounding, for reports */
} sr_atmos;

void sr_atmos_init_standard(sr_atmos *m);
int sr_atmos_init_offset(sr_atmos *m, double dT, sr_error *err);
/* Site model: elevation z_site (m); surface temperature T_s (K) and/or
 * surface pressure p_s (Pa), either may be NaN to mean "standard at that
 * elevation". The temperature difference to standard is kept at all
 * altitudes, the pressure follows the hydrostatic equation from the surface. */
int sr_atmos_init_site(sr_atmos *m, double z_site, double T_s, double p_s, sr_error *err);
/* A sounding from rows of altitude (m, increasing), temperature (K) and
 * pressure (Pa); between rows T linear, ln p linear in altitude. A file is
 * read by files/sounding.h. */
int sr_atmos_init_sounding(sr_atmos *m, const double *z, const double *T, const double *p, size_t n,
                           sr_error *err);
/* The same with the failing row in *bad ((size_t)-1 when the error is about
 * no row) and no row in the message, for a reader that names its line. */
int sr_atmos_init_sounding_rows(sr_atmos *m, const double *z, const double *T, const double *p, size_t n,
                                size_t *bad, sr_error *err);
/* Deep copy (a sounding's arrays are duplicated): dst, initialised or
 * released before, afterwards owns its own memory. */
int sr_atmos_copy(sr_atmos *dst, const sr_atmos *src, sr_error *err);
void sr_atmos_release(sr_atmos *m);

/* Pieces of the standard, exposed for tests and other modules. */
double sr_atmos_geopotential(double z);           /* H from geometric z, m' */
double sr_atmos_gravity(double z);                /* g(z), m/s2 */
double sr_atmos_viscosity(double T);              /* Sutherland, Pa s */
double sr_atmos_sound_speed(double T);            /* m/s */
/* Standard temperature and pressure at geometric z with a temperature offset
 * dT applied in the hydrostatic integral (dT = 0: the 1976 standard). */
int sr_atmos_standard_tp(double z, double dT, double *T, double *p);

#endif
