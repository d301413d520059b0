/* descent.h - the equilibrium drag balance W = 1/2 rho v^2 (CdS)_total and
 * its inversion for the canopy size a target touchdown speed needs. */
#ifndef SR_DESCENT_H
#define SR_DESCENT_H

#include "physics/atmos.h"
#include "physics/canopy.h"
#include "base/error.h"
#include "sinkrate/physics.h"

/* sr_descent_speed and sr_descent_rate are public (include/sinkrate/physics.h). */

typedef struct sr_size_request {
    double mass;           /* payload mass without the canopy, kg */
    double speed;          /* target descent speed, m/s */
    double rho, g;         /* air density and gravity at the sizing altitude */
    int count;             /* canopies in the cluster */
    double cluster_factor; /* drag per canopy in the cluster over single */
    double areal_mass;     /* canopy mass per nominal area, kg/m2 (0 = neglected) */
    double body_cds;       /* payload drag area, m2 (0 = neglected) */
    sr_band cd0;           /* drag coefficient band on NOMINAL area */
} sr_size_request;

typedef struct sr_size_result {
    sr_band s0;            /* nominal area of one canopy, m2 (lo from the high CD0) */
    sr_band d0;            /* nominal diameter, m */
    sr_band canopy_mass;   /* mass of all canopies, kg (0 when areal mass is 0) */
    double cds_total;      /* drag area needed in total, m2, typical */
} sr_size_result;

/* Exact inversion, canopy mass included:
 *   S0 = (m g - CdS_body q) / (N (k CD0 q - sigma g)),  q = rho v^2 / 2.
 * SR_EIMPOSSIBLE when the canopy's own weight outgrows its drag at that speed
 * (no size can reach the target), the payload's own drag already suffices, or
 * the diameter needed lies outside SR_CANOPY_SIZE_MIN .. _MAX (no canopy fits).
 * `size` and `sweep --vary speed` both call it, so they agree on what is impossible. */
int sr_descent_size(const sr_size_request *req, sr_size_result *res, sr_error *err);

/* The size of a canopy's family (its drag band, cluster and areal mass; the
 * canopy's own size is ignored) that carries mass at speed in the air state:
 * the request sr_descent_size needs, built in one place for every caller. */
int sr_descent_size_canopy(const sr_canopy *c, double mass, double speed, double body_cds, const sr_air *air,
                           sr_size_result *res, sr_error *err);

/* Equivalent drop height v^2 / (2 g): the free-fall height that lands as fast. */
double sr_descent_drop_height(double v, double g);

#endif
