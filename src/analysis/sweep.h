/* sweep.h - tables over a swept variable: descent-rate band, density,
 * dynamic pressure, Mach number and time to the ground over altitude, mass,
 * nominal diameter, temperature offset or site elevation; and the nominal
 * size a canopy family needs over a range of target speeds. */
#ifndef SR_SWEEP_H
#define SR_SWEEP_H

#include <stddef.h>

#include "physics/atmos.h"
#include "physics/canopy.h"
#include "base/error.h"
#include "physics/units.h"

/* Most rows a sweep makes (all curves together): enough for any figure or
 * table, small enough that a typo in --step cannot fill a disk. */
#define SR_SWEEP_MAX_ROWS 100000

typedef enum sr_sweep_var {
    SR_SWEEP_ALTITUDE = 0,   /* m above sea level */
    SR_SWEEP_MASS,           /* payload mass, kg */
    SR_SWEEP_DIAMETER,       /* nominal diameter D0, m */
    SR_SWEEP_TEMP_OFFSET,    /* temperature offset from standard, K */
    SR_SWEEP_SITE_ELEVATION, /* ground elevation of the site, m (touchdown there) */
    SR_SWEEP_SPEED,          /* target descent speed, m/s: the size each family needs */
    SR_SWEEP_NVARS
} sr_sweep_var;

/* "altitude", "mass", "diameter", "temp-offset", "site-elevation", "speed". */
const char *sr_sweep_var_name(sr_sweep_var v);
int sr_sweep_var_parse(const char *s, sr_sweep_var *v);
sr_quantity sr_sweep_var_quantity(sr_sweep_var v);

/* Values from, from + step, ... up to to (included when a step lands on it
 * within 1e-9 of a step). Step zero, a step pointing away from `to`, or more
 * than max values are SR_EINVAL with one clear message. *values is malloc'd. */
int sr_sweep_range(double from, double to, double step, size_t max, double **values, size_t *n, sr_error *err);

/* The case every row starts from. The atmosphere is held by value: a
 * shallow copy of the caller's model (a sounding's tables stay the caller's;
 * the sweep never frees them). */
typedef struct sr_sweep_case {
    sr_canopy canopy;
    double mass;       /* payload, kg (the canopy's fabric is added when it has an areal mass) */
    double body_cds;   /* payload drag area, m2 */
    double altitude;   /* where rows of non-altitude sweeps are evaluated, m above sea level; NaN: the ground */
    double ground;     /* ground elevation, m above sea level (the end of every descent) */
    sr_atmos atmos;
} sr_sweep_case;

/* Set one variable of the case (not SR_SWEEP_SPEED). Temperature offset and
 * site elevation rebuild the atmosphere: a site keeps its temperature
 * difference to standard; a site-elevation value takes the standard pressure
 * there. A sounding fixes both, so those two are SR_EINVAL with it. */
int sr_sweep_set(sr_sweep_case *c, sr_sweep_var v, double value, sr_error *err);

/* One row. Bands are ordered by value (lo is the low end). */
typedef struct sr_sweep_row {
    double x;          /* the swept value, SI */
    double z;          /* altitude the row is evaluated at, m above sea level */
    double ground;     /* m above sea level */
    double rho;        /* air density there, kg/m3 */
    double a;          /* speed of sound there, m/s */
    sr_band v;         /* descent rate, m/s (speed sweeps: the target, all three equal) */
    double q;          /* dynamic pressure at the typical rate, Pa */
    double mach;       /* typical rate over the speed of sound */
    sr_band t;         /* time from z down to the ground (altitude sweeps; NaN otherwise), s */
    sr_band d0;        /* nominal diameter of one canopy, m (speed sweeps: the size needed) */
    sr_band s0;        /* nominal area of one canopy, m2 */
    sr_band mass_total;/* descending mass with the canopy fabric, kg */
} sr_sweep_row;

typedef void (*sr_sweep_progress_fn)(void *ud, size_t done, size_t total);

/* The rows of one curve: the case with variable v set to each of xs[0..n).
 * rows must hold n. progress (may be NULL) is called now and then. */
int sr_sweep_run(const sr_sweep_case *c, sr_sweep_var v, const double *xs, size_t n, sr_sweep_row *rows,
                 sr_sweep_progress_fn progress, void *ud, sr_error *err);

/* Time to descend under the canopy from z_top to the case's ground in
 * quasi-steady descent, t = integral of dz / v(z) (GSL adaptive quadrature);
 * lo from the fast end of the drag band. */
int sr_sweep_descent_time(const sr_sweep_case *c, double z_top, sr_band *t, sr_error *err);

/* Drag-coefficient band on nominal area for sizing: the family's, or a
 * measured coefficient converted through the family's diameter ratios. */
sr_band sr_sweep_cd0_band(const sr_canopy *cp);

#endif
