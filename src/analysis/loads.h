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
#include "sinkrate/analysis.h"

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

/* The state of a canopy deployed on its own (no band runs): airspeed v1 at
 * line stretch, path angle (rad below the horizontal), the mass it
 * decelerates and the air; the steady rate its own (`loads` without a
 * mission and sr_loads_deployment). */
void sr_loads_state_of(sr_loads_state *s, const sr_canopy *c, double mass, double v1, double path_angle,
                       const sr_air *air);

/* sr_loads_end and sr_loads_band (records) are public:
 * include/sinkrate/analysis.h. */

/* The band over the valid states. The ends come from the band-end states
 * (1, 2) when they are valid, and state 0 otherwise; combinations: own drag at
 * its low and high end x growth exponent at its low and high end, with the
 * opening-load factor at its low end for the lowest load and its high end for
 * the highest. The typical load is state 0, typical drag, exponent and
 * factor. fast != 0 uses sr_opening_solve_fast (no allocation), else
 * sr_opening_solve. SR_OK with valid = 0 when the typical state is invalid. */
int sr_loads_evaluate(const sr_loads_canopy *c, const sr_loads_state st[SR_LOADS_NSTATES], int fast,
                      sr_loads_band *out, sr_error *err);

/* An upper bound of the highest load sr_loads_evaluate can give from state s
 * over the canopy's bands (sr_opening_bound at each drag end and the
 * opening-load factor's high end; a measured opening as combo() applies it):
 * a load that cannot break a limit need not be solved. */
double sr_loads_bound(const sr_loads_canopy *c, const sr_loads_state *s);

/* The opening-module input of one combination (for the full three-method
 * result of an end: sr_opening_solve on it gives the end's numbers). */
void sr_loads_input(const sr_loads_canopy *c, const sr_loads_state *s, int drag, double exponent, double cx,
                    sr_opening_input *in);

#endif
