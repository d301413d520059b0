/* loads.h - the opening load of one deployment over every banded input: the
 * deployment state of each band run, the canopy's own drag band, its
 * growth-exponent band and its opening-load-factor band. The governing load
 * is the highest of them. One function for `profile`, `loads`, the failure
 * cases, `dispersion` and the design search, so they cannot disagree.
 *
 * Ownership: plain values only; nothing is allocated, nothing printed. */
#ifndef SR_LOADS_H
#define SR_LOADS_H

#include "base/error.h"
#include "physics/canopy.h"
#include "physics/opening.h"

/* Deployment states: the typical run and the two band-end runs (band.h). */
#define SR_LOADS_NSTATES 3

/* What the loads need of a canopy, independent of the run. */
typedef struct sr_loads_canopy {
    double cds_ratio[3]; /* one canopy's drag area at the low, typical, high end of its band, over the typical */
    double d0_ratio[3];  /* its nominal diameter at the same ends, over the typical */
    int count;           /* canopies in the cluster */
    double n_fill;       /* filling constant */
    sr_band cx;          /* opening-load factor band */
    sr_band growth;      /* growth-exponent band */
    double mach_max;     /* the family's application envelope (0: none) */
    sr_measured_opening measured; /* a measured load or factor replaces the three estimates */
    double measured_value;        /* the factor, or the load in N */
} sr_loads_canopy;

/* From a canopy (its family's bands and any measured opening). */
void sr_loads_canopy_init(sr_loads_canopy *lc, const sr_canopy *cp);

/* The state at line stretch in one run. */
typedef struct sr_loads_state {
    int valid;          /* 0: the stage did not deploy in that run */
    double v1;          /* airspeed at line stretch, m/s */
    double path_angle;  /* rad below the horizontal */
    double rho, a, g;   /* air at line stretch */
    double mass;        /* mass the canopies decelerate, kg */
    double v_steady;    /* steady rate after the opening, for the filling time (opening.h), m/s; NaN: own */
    double cds0;        /* one canopy's typical full drag area in this run (cluster factor included), m2 */
    double d0;          /* one canopy's nominal diameter in this run, m */
} sr_loads_state;

/* One end of the band and the combination of banded inputs that gives it. */
typedef struct sr_loads_end {
    double force;       /* the highest of the three estimates (or the measured load), N, all canopies */
    double decel_g;     /* force / (m g0) */
    int state;          /* which state: 0 typical, 1 and 2 the band-end runs */
    int drag;           /* the canopy's own drag: 0 low, 1 typical, 2 high end */
    double exponent;    /* growth exponent */
    double cx;          /* opening-load factor */
} sr_loads_end;

typedef struct sr_loads_band {
    int valid;          /* the typical state deployed and had a speed */
    int measured;       /* sr_measured_opening in force */
    sr_loads_end lo, typ, hi;   /* the governing estimate (the highest of the three methods) at the low end of
                                 * the bands, at the typical values, and at the high end: hi governs */
    double v_lo, v_typ, v_hi;   /* airspeed at line stretch over the states, m/s */
    double q_lo, q_typ, q_hi;   /* dynamic pressure at line stretch, Pa */
    double mach_lo, mach_typ, mach_hi;
    double t_fill_typ;          /* filling time of the typical combination, s */
    int slow_deployment;        /* the typical opening is below the canopy's steady rate */
    int above_envelope;         /* the highest Mach is above the family's envelope */
} sr_loads_band;

/* The band over the valid states. The ends come from the band-end states
 * (1, 2) when they are valid, and state 0 otherwise; combinations: own drag at
 * its low and high end x growth exponent at its low and high end, with the
 * opening-load factor at its low end for the lowest load and its high end for
 * the highest. The typical load is state 0, typical drag, exponent and
 * factor. fast != 0 uses sr_opening_solve_fast (no allocation), else
 * sr_opening_solve. SR_OK with valid = 0 when the typical state is invalid. */
int sr_loads_evaluate(const sr_loads_canopy *c, const sr_loads_state st[SR_LOADS_NSTATES], int fast,
                      sr_loads_band *out, sr_error *err);

/* The opening-module input of one combination (for the full three-method
 * result of an end: sr_opening_solve on it gives the end's numbers). */
void sr_loads_input(const sr_loads_canopy *c, const sr_loads_state *s, int drag, double exponent, double cx,
                    sr_opening_input *in);

#endif
