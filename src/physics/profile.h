/* profile.h - the staged descent of a mission: quasi-steady stages by
 * quadrature of dt = dh/v(h) and drift = integral of w(h)/v(h) dh, the
 * transient after each deployment by an adaptive ODE with the drag area
 * growing over the filling time, the event timeline, touchdown speed and
 * energy per section, drift, and a fast mode for Monte Carlo work.
 *
 * Use: build one context per mission (sr_profile_ctx_new: precomputed air and
 * wind tables, the nominal transients), then call sr_profile_run as often as
 * needed, from any number of threads, each with its own workspace and result.
 * The context is never written after it is built. */
#ifndef SR_PROFILE_H
#define SR_PROFILE_H

#include <stddef.h>

#include "base/error.h"
#include "physics/bluff.h"
#include "physics/descent_spec.h"
#include "sinkrate/physics.h"

#define SR_PROFILE_MAX_BODIES SR_DESCENT_MAX_SECTIONS
#define SR_PROFILE_MAX_EVENTS 96

/* sr_profile_mode (public): SR_PROFILE_FULL runs transients by the adaptive
 * ODE (GSL rk8pd) and steady stages by adaptive quadrature (GSL QAG) of the
 * atmosphere and wind models. SR_PROFILE_FAST takes steady stages from the
 * context's cumulative quadrature tables (two table look-ups per stage) and
 * transients from the nominal ODE solution kept in the context, shifted by
 * the closed-form constant-density transient for the sample's own drag, mass
 * and deployment state. Where the nominal transient does not settle before
 * the next event the ODE runs instead. No memory is allocated. Error against
 * FULL: see sr_profile_fast_bound and docs/method.md, section 7.5. */

typedef struct sr_profile_opts {
    double steady_tol;      /* a transient ends when |v_air - v_steady| <= steady_tol * v_steady (vector
                             * difference; default 0.01). 0: integrate the ODE all the way down */
    double ode_tol;         /* relative and absolute tolerance of the ODE (default 1e-9) */
    double quad_tol;        /* relative tolerance of the steady-stage quadrature (default 1e-9) */
    double uniform_density; /* NaN (default): the mission's atmosphere; > 0: air of this density at every
                             * height (checks against closed forms) */
    unsigned failed;        /* failure case: bit i set = stage i does not deploy (all bits: no canopy) */
    size_t grid_cells;      /* cells of the precomputed height tables (default 1024) */
    double top_margin;      /* tables reach start height * (1 + top_margin) + 200 m (default 0.25), for
                             * samples that raise the start */
    sr_bluff_attitude attitude; /* bodies falling with no canopy open (default: broadside; sr_bluff_attitude) */
} sr_profile_opts;

void sr_profile_opts_init(sr_profile_opts *o);

/* Changes of one sample against the mission (issue: landing dispersion).
 * sr_profile_perturb_init gives the identity. */
typedef struct sr_profile_perturb {
    double drag_scale[SR_DESCENT_MAX_STAGES]; /* x drag area of each stage (1) */
    double area_scale[SR_DESCENT_MAX_STAGES]; /* x nominal area of each stage's canopies (1): a change of size,
                                               * so the drag area, the fabric mass and D0^2 scale with it */
    double section_mass_scale[SR_DESCENT_MAX_SECTIONS]; /* x the mass of each section (1), with mass_scale */
    double mass_scale;                         /* x every section mass (1) */
    double wind_scale;                         /* x wind speed at every height (1) */
    double wind_turn;                          /* rad added to the wind direction at every height (0) */
    double wind_east, wind_north;              /* m/s, a uniform wind added after scale and turn (0) */
    double start_height;                       /* m added to the start height (0) */
    double start_speed;                        /* m/s added to the start speed (0) */
    double deploy_height[SR_DESCENT_MAX_STAGES]; /* m added to each height event (0) */
    double deploy_delay[SR_DESCENT_MAX_STAGES];  /* s added to each delay event (0) */
} sr_profile_perturb;

void sr_profile_perturb_init(sr_profile_perturb *p);

/* sr_event_kind, sr_profile_event_name and the records of a result
 * (sr_profile_event, sr_profile_stage, sr_profile_body) are public; a program
 * reads a result through sr_profile_result_* (include/sinkrate/physics.h). */

typedef struct sr_profile_result {
    sr_profile_mode mode;
    size_t nevents;
    int events_dropped;     /* events beyond SR_PROFILE_MAX_EVENTS */
    sr_profile_event events[SR_PROFILE_MAX_EVENTS]; /* sorted by time */
    size_t nstages;
    sr_profile_stage stage[SR_DESCENT_MAX_STAGES];
    size_t nbodies;
    sr_profile_body body[SR_PROFILE_MAX_BODIES];
    size_t nsections;
    int section_body[SR_DESCENT_MAX_SECTIONS];      /* body each section lands with */
    double section_rate[SR_DESCENT_MAX_SECTIONS];   /* its touchdown descent rate, m/s */
    double section_energy[SR_DESCENT_MAX_SECTIONS]; /* 1/2 m v^2 at that rate, J; a rigid pair counts as
                                                     * one piece: both carry the pair's energy */
    /* relative to the ground: the descent rate combined with the surface wind (the wind 10 m above
     * ground, the standard height of surface wind observations) */
    double wind_surface;    /* m/s, the wind speed 10 m above ground (of this run's wind) */
    double section_speed_ground[SR_DESCENT_MAX_SECTIONS];  /* sqrt(rate^2 + wind_surface^2), m/s */
    double section_energy_ground[SR_DESCENT_MAX_SECTIONS]; /* 1/2 m v^2 at that speed, J */
    double descent_time;    /* last touchdown, s */
    double max_rate;        /* highest touchdown descent rate, m/s */
    double max_energy;      /* highest section energy, J */
    double max_energy_ground; /* highest section energy relative to the ground, J */
    double max_drift;       /* farthest landing point from the launch point, m */
    int ode_segments;       /* transient segments integrated by the ODE (fast mode: fallbacks) */
} sr_profile_result;

/* Points along the descent for plots (full mode). The caller owns pt[cap]. */
typedef struct sr_profile_point {
    double t, h, east, north, speed, rate;
    double accel;           /* specific force: drag / mass, m/s2 (what an accelerometer reads) */
    int body;
} sr_profile_point;

typedef struct sr_profile_track {
    sr_profile_point *pt;
    size_t cap, n;
    double dt;              /* spacing of points in steady stages, s (0: 1 s) */
} sr_profile_track;

/* Build the context of a descent (a mission's: sr_mission_descent, or
 * sr_mission_profile in one call). The context copies what it keeps (the
 * atmosphere, the wind, the drag curves): the spec and what it points to need
 * not outlive it. Runs the nominal profile once (full mode) to keep its
 * transients for the fast mode. o may be NULL for the defaults. */
int sr_profile_ctx_new(sr_profile_ctx **ctx, const sr_descent_spec *spec, const sr_profile_opts *o, sr_error *err);

/* Per-thread scratch (ODE stepper, quadrature workspace). */
int sr_profile_work_new(sr_profile_work **w, sr_error *err);
void sr_profile_work_free(sr_profile_work *w);

/* sr_profile_run (public): p NULL is the nominal mission; w may be NULL in
 * full mode (then allocated for the call) and in fast mode (then a needed
 * ODE fallback allocates); track may be NULL. Thread-safe for a shared ctx.
 * sr_profile_nominal (public): the nominal full-mode result the context keeps. */

/* Steady descent rate of a body at height h with the stages in `open` (bit
 * set) fully open: v = sqrt(2 m g / (rho CdS)). Constant drag areas only:
 * sections with a `body:` add no drag here (they do only in free fall). */
double sr_profile_steady_rate(const sr_profile_ctx *ctx, sr_section_set body, unsigned open, double h);

/* Air and wind from the context's tables at height h above ground (for
 * reports and tests): density, speed of sound, gravity, wind components. */
void sr_profile_air(const sr_profile_ctx *ctx, double h, double *rho, double *a, double *g, double *east,
                    double *north);

/* Closed forms of the constant-density transient (gravity g, steady rate
 * vt, initial downward airspeed v0, drag with no filling): the time the
 * descent lags behind an instant start at vt, (vt/g) ln(2/(1+v0/vt)), and
 * the distance a horizontal airspeed u0 carries the body beyond the wind,
 * u0 (vt/g) psi(v0/vt). Used by the fast mode; exposed for the tests. */
double sr_profile_lag_time(double v0, double vt, double g);
double sr_profile_lag_distance(double u0, double v0, double vt, double g);

#endif
