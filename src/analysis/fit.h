/* fit.h - the drag area of each canopy from a flight log: the log's height
 * in true metres (pressure altitude converted with the site's weather), the
 * segments (apogee, deployments, touchdown), a robust nonlinear least-squares
 * fit of CdS per stage (GSL gsl_multifit_nlinear) with a 95 % interval, the
 * opening from acceleration, the wind from positions, and several flights
 * pooled. The method and its coverage check: docs/method.md, section 12. */
#ifndef SR_FIT_H
#define SR_FIT_H

#include <stddef.h>

#include "base/error.h"
#include "files/flightlog.h"
#include "files/mission.h"
#include "physics/atmos.h"
#include "physics/canopy.h"
#include "physics/opening.h"

#define SR_FIT_MAX_STAGES SR_MISSION_MAX_STAGES
#define SR_FIT_MAX_WIND 64
/* Shortest fitting window and fewest points a stage can be fitted from. */
#define SR_FIT_MIN_WINDOW 3.0
#define SR_FIT_MIN_POINTS 20
/* Widest interval a result is given with: upper over lower bound of CdS. A
 * wider one is "not determined" (exit 1), never a number. Our choice. */
#define SR_FIT_MAX_CI_RATIO 4.0
/* The window of a stage starts this many time constants v/g and 1 s after
 * its deployment (the transient has decayed; docs/method.md section 12). */
#define SR_FIT_SETTLE_TAU 4.5

/* Where the deployments come from. */
typedef enum sr_fit_events {
    SR_FIT_EVENTS_DETECT = 0, /* change points in the descent rate (default) */
    SR_FIT_EVENTS_MISSION,    /* the mission's deployment events (apogee, height, delay) on the log */
    SR_FIT_EVENTS_TIMES       /* times given by the user, one per stage */
} sr_fit_events;

/* One recovery stage as the fit sees it. */
typedef struct sr_fit_stage_spec {
    char name[SR_NAME_MAX];
    double mass;             /* kg descending under it (canopy fabric included) */
    double base_cds;         /* m2, drag area that is not this stage's canopy nor a kept earlier one
                              * (the sections' own drag areas) */
    int keep_previous;       /* the stage before stays open: its drag is part of this stage's total */
    int has_canopy;          /* canopy known: the drag coefficient on nominal area and the catalog band */
    sr_canopy canopy;
    sr_deploy_kind deploy;   /* for SR_FIT_EVENTS_MISSION */
    double deploy_value;
    double time;             /* for SR_FIT_EVENTS_TIMES: log time of the deployment, s; NaN: at apogee */
} sr_fit_stage_spec;

typedef struct sr_fit_setup {
    const sr_atmos *atmos;   /* the site's air (required) */
    double ground;           /* site elevation above sea level, m; NaN: unknown (a height log then sits at
                              * sea level; an altitude or pressure log rests on its last readings) */
    int pressure_altitude;   /* the height or altitude column is a standard pressure altitude */
    sr_fit_events events;
    size_t nstages;
    sr_fit_stage_spec stage[SR_FIT_MAX_STAGES];
    double conf;             /* confidence level, default 0.95 */
    double reject;           /* outlier threshold in robust standard deviations, default 5 */
    double gravity;          /* NaN: g(z) of the 1976 standard; > 0: constant (checks against closed forms) */
    int skip_raw;            /* 1: do not refit without the pressure-altitude conversion */
    /* Without stages (nstages 0), one per segment the log shows: */
    double mass;             /* kg under every stage */
    size_t nnames;
    const char *names[SR_FIT_MAX_STAGES]; /* their names ("stage 1", ... when not given) */
    const sr_canopy *last_canopy; /* the canopy of the last stage, NULL when not known */
    size_t ntimes;           /* SR_FIT_EVENTS_TIMES: the deployment times, NaN for apogee */
    double times[SR_FIT_MAX_STAGES];
} sr_fit_setup;

/* Defaults: conf 0.95, reject 5, gravity NaN, events detect, no stages. */
void sr_fit_setup_init(sr_fit_setup *s);

/* Where a stage's CD0 sits against its family's catalog band. */
typedef enum sr_fit_band {
    SR_FIT_BAND_NONE = 0,    /* no canopy known */
    SR_FIT_BAND_INSIDE,      /* the whole interval inside the band */
    SR_FIT_BAND_EDGE,        /* the estimate inside, the interval reaching past an edge */
    SR_FIT_BAND_BELOW,       /* the estimate below the band */
    SR_FIT_BAND_ABOVE        /* the estimate above the band */
} sr_fit_band;

const char *sr_fit_band_name(sr_fit_band b);

/* The opening of a stage, from the acceleration column. */
typedef struct sr_fit_opening {
    int measured;            /* 1: a rise was found; force and t_peak are set */
    double rate_needed;      /* Hz the log needs for this opening (also set when not measured) */
    double force;            /* peak opening force m * a, N */
    double t_peak;           /* time from the deployment to the peak, s */
    /* the inflation ODE of physics/opening.h fitted to the force history (NaN when not resolved): */
    double t_fill;           /* filling time t_f of the growth law, s (0.05 .. 5) */
    double exponent;         /* growth exponent n (0.5 .. 4) */
    double olf;              /* opening-load factor: the scale of the model's force that fits the log (CX) */
    double peak_ratio;       /* peak force / (canopy CdS x q at deployment): CX X1 as measured, the
                              * `measured-opening: factor:` of a canopy file */
    double t_line;           /* line stretch, s after the deployment */
    double residual;         /* rms residual of the fit, N */
    double nsamples;         /* log rows over the fitted filling time */
    char unresolved[112];    /* why the fit is '-' ("" when resolved) */
    sr_opening_input model;  /* the deployment the fit ran the ODE with (exponent: the fitted n) */
    double offset;           /* the fit's constant offset c, N */
    double speed;            /* airspeed at the deployment (descent rate from the log), m/s */
    double q;                /* dynamic pressure at the deployment, Pa */
} sr_fit_opening;

/* Bounds of the opening fit (our choice: the class bands spread over 0.5 .. 3,
 * filling times of small canopies to large ones). */
#define SR_FIT_OPENING_N_MIN 0.5
#define SR_FIT_OPENING_N_MAX 4.0
#define SR_FIT_OPENING_TF_MIN 0.05
#define SR_FIT_OPENING_TF_MAX 5.0

/* The opening from a measured force history: force[i] = mass x specific
 * force at t[i] (evenly spaced rows, N, the whole drag on the payload),
 * around the deployment at t_deploy. model holds the deployment as
 * sr_opening_trace_at reads it (canopy drag area, count, mass, speed v1, air,
 * gravity, path angle, cds_other: what else is open); its exponent, filling
 * constant and CX are ignored. Finds the peak and fits the growth exponent n,
 * the filling time t_f, the line stretch and the load factor (with a constant
 * offset) to the rise and the peak: a bounded grid, then the Nelder-Mead
 * simplex (GSL). rate_needed is the caller's. Not resolved: o->unresolved
 * says why and the fitted values are NaN. Errors only for bad arguments. */
int sr_fit_opening_history(const double *t, const double *force, size_t n, double t_deploy,
                           const sr_opening_input *model, sr_fit_opening *o, sr_error *err);

/* The fitted model of the measured force, k F_ode + q CdS_other + c, at
 * non-decreasing times s[i] after the deployment (for the figure). Only for a
 * resolved fit (o->exponent not NaN). */
int sr_fit_opening_curve(const sr_fit_opening *o, const double *s, size_t n, double *force, sr_error *err);

typedef struct sr_fit_stage {
    int fitted;
    double t_deploy, h_deploy; /* s, m above ground */
    size_t row_deploy;       /* log row of the deployment */
    double t0, t1;           /* fitting window, s */
    size_t npoints;          /* points in the window */
    size_t nrejected;        /* of them, dropped as outliers */
    double cds, cds_lo, cds_hi;  /* total drag area in this stage and its interval, m2 */
    double own, own_lo, own_hi;  /* this stage's canopy alone (total less what else is open), m2 */
    double cd0, cd0_lo, cd0_hi;  /* own drag area on the canopy's nominal area (NaN without a canopy) */
    sr_fit_band band;
    double se_log;           /* standard error of ln CdS (total), correlation included */
    double rho1;             /* lag-1 autocorrelation of the residuals */
    double inflation;        /* variance factor for it, (1 + rho1) / (1 - rho1), >= 1 */
    double dof;              /* effective degrees of freedom of the t quantile */
    double rms;              /* residual RMS of the kept points, m */
    double rate_ground;      /* steady descent rate with the total drag area at the ground, m/s */
    double rate_sea;         /* ... at sea level in the standard atmosphere, m/s */
    double cds_raw;          /* total drag area fitted to the unconverted pressure altitude, NaN when no
                              * conversion was made */
    int iterations;
    sr_fit_opening opening;
} sr_fit_stage;

typedef enum sr_fit_event_kind { SR_FIT_APOGEE = 0, SR_FIT_DEPLOY, SR_FIT_TOUCHDOWN, SR_FIT_END } sr_fit_event_kind;

/* A wind table row: the drift under the canopies, by height. */
typedef struct sr_fit_wind {
    double h;                /* m above ground, the middle of the band */
    double east, north;      /* drift velocity, m/s */
    double speed, from;      /* m/s, rad (the bearing it blows from) */
    int stage;
} sr_fit_wind;

typedef struct sr_fit_result {
    char path[512];
    size_t n;
    double *t;               /* s */
    double *h;               /* true height above ground, m */
    double *h_logged;        /* as logged in m above ground, before any conversion (NaN for pressure) */
    double *smooth;          /* median-filtered height, m */
    double *rate;            /* smoothed descent rate, m/s */
    double *model;           /* fitted height in the windows, NaN elsewhere */
    double *cds_local;       /* point estimate 2 m g / (rho v^2) from the smoothed rate under a canopy, NaN
                              * elsewhere, m2 */
    unsigned char *rejected; /* 1: dropped as an outlier */
    double ground;           /* elevation used for the ground, m above sea level */
    int ground_from_log;     /* 1: the ground is where the log rests at the end */
    char conversion[256];    /* what was done with the vertical column */
    double noise;            /* robust standard deviation of the height about its median filter, m */
    double t_apogee, h_apogee;
    size_t row_apogee;
    double t_touch, h_touch;
    size_t row_touch;
    int touchdown;           /* 0: the log ends before touchdown */
    size_t nstages;
    sr_fit_stage stage[SR_FIT_MAX_STAGES];
    size_t nwind;
    sr_fit_wind wind[SR_FIT_MAX_WIND];
    double acc_rate;         /* Hz of the acceleration column, 0 without one */
} sr_fit_result;

/* Fit one log. Errors: SR_EINVAL with file:line:column for a log that never
 * descends, a stage too short to fit, deployments that do not match the
 * stages; SR_ENUMERIC for a fit that does not converge or an interval wider
 * than SR_FIT_MAX_CI_RATIO (the message says which stage). The result owns
 * arrays: sr_fit_result_free. */
int sr_fit_log(const sr_flightlog *log, const sr_fit_setup *s, sr_fit_result *r, sr_error *err);
void sr_fit_result_free(sr_fit_result *r);

/* Stages from a mission: names, masses (sections carried and canopy fabric,
 * as the staged descent counts them), the sections' own drag areas, kept
 * canopies, deployment events and canopies. */
int sr_fit_stages_from_mission(const sr_mission *m, sr_fit_setup *s, sr_error *err);

/* Several flights of one stage: the inverse-variance weighted mean of ln CdS
 * (own drag area), its interval widened by the Birge ratio when the flights
 * disagree more than their intervals allow. */
typedef struct sr_fit_pooled {
    size_t nlogs;
    double own, own_lo, own_hi;
    double cd0, cd0_lo, cd0_hi;
    double birge;            /* sqrt(chi2 / (k - 1)), 1 for one flight; the interval is widened by it when > 1 */
    sr_fit_band band;
} sr_fit_pooled;

int sr_fit_pool(const sr_fit_result *const *r, size_t nlogs, size_t stage, const sr_fit_stage_spec *spec,
                double conf, sr_fit_pooled *out, sr_error *err);

/* The CD0 of a drag area on the canopy's nominal area (count and cluster
 * factor applied) and where an interval sits against the family band. */
double sr_fit_cd0(const sr_canopy *c, double own);
sr_fit_band sr_fit_band_of(const sr_canopy *c, double cd0, double lo, double hi);

#endif
