/* sizing.h - the canopy a payload needs for a target touchdown speed, with
 * everything `sinkrate size` reports around the inversion: the drag band on
 * nominal area (a measured coefficient converted), the nominal area and
 * diameters as bands, projected and flat diameters, the canopy's own mass, the
 * touchdown energy, the descent rate of the typical size higher up, and the
 * verdict on a canopy a mission file already names.
 *
 * Plain values only; nothing is allocated or printed. */
#ifndef SR_SIZING_H
#define SR_SIZING_H

#include "base/error.h"
#include "physics/atmos.h"
#include "physics/canopy.h"
#include "physics/descent.h"
#include "sinkrate/analysis.h"

#define SR_SIZING_RATES 6

typedef struct sr_sizing_request {
    const sr_canopy *canopy;  /* family, cluster, areal mass, measured coefficient (its size is ignored) */
    double mass;              /* payload mass without the canopy, kg */
    double speed;             /* target touchdown speed, m/s */
    double body_cds;          /* the payload's own drag area, m2 (0: none) */
    const sr_atmos *atmos;
    double altitude;          /* touchdown altitude above sea level, m */
} sr_sizing_request;

typedef struct sr_sizing_result {
    sr_air air;               /* at the touchdown altitude */
    sr_band cd0;              /* drag coefficient band on nominal area used */
    int cd0_converted;        /* a measured coefficient on another reference was converted */
    sr_size_result size;      /* nominal area, diameter, canopy mass bands; drag area needed */
    sr_band dp, dc;           /* projected and flat (constructed) diameters, m */
    double energy;            /* touchdown kinetic energy of payload and typical canopy, J */
    size_t nrates;            /* the typical size's descent rate at the altitude and above */
    double rate_altitude[SR_SIZING_RATES], rate_density[SR_SIZING_RATES];
    sr_band rate[SR_SIZING_RATES];
} sr_sizing_result;

/* SR_EIMPOSSIBLE with one line when no canopy can reach the speed
 * (sr_descent_size_canopy's message, the same as `sweep --vary speed`'s). */
int sr_sizing_run(const sr_sizing_request *req, sr_sizing_result *out, sr_error *err);

/* How a canopy a file already names compares with the band. */
typedef enum sr_sizing_fit {
    SR_SIZING_FITS_BAND = 0, /* at least the high end of the band: meets the speed over the whole drag range */
    SR_SIZING_FITS_TYPICAL,  /* meets it with the typical drag coefficient only */
    SR_SIZING_TOO_SMALL      /* smaller than the typical size: lands faster than the target */
} sr_sizing_fit;

sr_sizing_fit sr_sizing_compare(const sr_sizing_result *res, const sr_canopy *given);

#endif
