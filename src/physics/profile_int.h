/* profile_int.h - inside the profile module: the per-mission context (air
 * and wind tables on a height grid, cumulative quadrature tables, the
 * nominal transients) shared by profile_ctx.c, profile.c and profile_fast.c. */
#ifndef SR_PROFILE_INT_H
#define SR_PROFILE_INT_H

#include <gsl/gsl_integration.h>
#include <gsl/gsl_odeiv2.h>
#include <gsl/gsl_roots.h>

#include "physics/bluff.h"

#include "physics/profile.h"

#define NS SR_MISSION_MAX_STAGES
#define NSEC SR_MISSION_MAX_SECTIONS
/* cache keys: stage k deployed onto a body (k), the rest of a body after
 * stage k separated part of it (NS + k), the start before any deployment */
#define KEY_REST(k) (NS + (k))
#define KEY_START (2 * NS)
#define NKEYS (2 * NS + 1)

typedef struct stage_c {
    char name[SR_NAME_MAX];
    double cds;          /* total drag area, typical, m2 */
    double d0;           /* nominal diameter of one canopy, m */
    double fill_n;       /* filling constant */
    double growth;       /* exponent of drag-area growth during filling (the family's typical) */
    int count;           /* canopies in the cluster */
    double fabric;       /* canopy mass, kg (0 without an areal mass) */
    int fabric_owner;    /* section the packed canopy travels with */
    sr_deploy_kind kind;
    double value;        /* m or s */
    sr_section_set carries;
    int keep_prev;
    double line_stretch;
} stage_c;

/* The nominal transient after one event, relative to the steady descent
 * that starts at the same point (see profile_fast.c). */
typedef struct seg_cache {
    int valid;           /* the transient settled before the next event */
    double dt;           /* time it adds to the steady descent, s */
    double dx, dy;       /* distance it adds, east and north, m */
    double span;         /* height it takes to settle, m */
    double vt, g;        /* steady rate and gravity at its origin */
    double v0;           /* downward airspeed at its origin */
    double ue, un;       /* horizontal airspeed at its origin */
} seg_cache;

struct sr_profile_ctx {
    sr_profile_opts o;
    /* the mission, in numbers */
    size_t nsec, nstg;
    double sec_mass[NSEC], sec_cda[NSEC];
    int sec_rigid[NSEC];
    /* sections with Reynolds-dependent drag (mission `body:`), used while no canopy is open on them */
    sr_section_set free_secs;
    sr_bluff_curve sec_curve[NSEC]; /* owned copies */
    sr_bluff_body sec_body[NSEC];   /* .curve points into sec_curve */
    double att_k[NSEC], att_c[NSEC]; /* attitude: drag area k Cd(Re) A + c (sr_bluff_attitude) */
    stage_c st[NS];
    double ground;
    double start_h, start_v, start_gamma, heading, start_e, start_n;
    char start_at[600];  /* "file:line:column" of the mission's start: block, for messages */
    int top_is_model;    /* the tables reach the top of the atmosphere model: above is no air we know */
    sr_atmos atmos;      /* deep copy (sounding arrays owned) */
    sr_wind wind;        /* deep copy (table arrays owned) */
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
    seg_cache cache[NKEYS];
    sr_profile_result nominal;
};

struct sr_profile_work {
    gsl_odeiv2_step *step;
    gsl_odeiv2_control *control;
    gsl_odeiv2_evolve *evolve;
    gsl_integration_workspace *quad;
    gsl_root_fsolver *root;    /* equilibria of a free fall at touchdown */
    double tol;
};

/* Table look-ups (profile_ctx.c). Heights outside [0, top] clamp. */
void ctx_air(const sr_profile_ctx *c, double h, double *rho, double *a, double *g);
void ctx_cumulative(const sr_profile_ctx *c, double h, double *I, double *Je, double *Jn);
void ctx_lag(const sr_profile_ctx *c, double h, double *Le, double *Ln);
/* Height where I(h) = target (I increases with h); clamps to [0, top]. */
double ctx_height_for_I(const sr_profile_ctx *c, double target);
int ctx_build_tables(sr_profile_ctx *c, sr_error *err);

/* The full-mode integrands at h (profile_ctx.c): f = sqrt(rho/g), the wind,
 * and (when dphi is not NULL) the height derivative of phi = 1/sqrt(rho g). */
int ctx_direct(const sr_profile_ctx *c, double h, double *f, double *we, double *wn);
int ctx_phi(const sr_profile_ctx *c, double h, double *phi, double *dphi);

/* Viscosity at height h from the tables (profile_ctx.c). */
double ctx_mu(const sr_profile_ctx *c, double h);

/* Free fall with Reynolds-dependent drag (profile_free.c). The drag area
 * sum of Cd_i(Re_i) A_i of the sections in `secs` that have a body, at
 * airspeed V in air of density rho and viscosity mu; ORs SR_BLUFF_WARN_* into
 * *warn (may be NULL). */
double free_cda(const sr_profile_ctx *c, sr_section_set secs, double V, double rho, double mu, unsigned *warn);

/* Every equilibrium speed of a body falling with no canopy open at height h:
 * m g = 1/2 rho v^2 (cda_const + free_cda(v)). */
typedef struct free_eq {
    int n;               /* equilibria found */
    int nstable;         /* of which stable (drag grows through them) */
    double v_fast;       /* fastest equilibrium (always stable: drag exceeds weight above it), m/s */
    double v_slow;       /* slowest stable one, m/s */
    unsigned warn;       /* SR_BLUFF_WARN_* of the curves at v_fast (Re range, L/D, Mach) */
} free_eq;

int free_equilibria(const sr_profile_ctx *c, gsl_root_fsolver *s, sr_section_set secs, double mass, double cda_const,
                    double h, free_eq *out, sr_error *err);

int profile_work_init(sr_profile_work *w, double tol, sr_error *err);
void profile_work_release(sr_profile_work *w);

/* The run itself (profile.c); record != 0 fills ctx->cache (context build). */
int profile_run(const sr_profile_ctx *c, const sr_profile_perturb *p, sr_profile_mode mode, sr_profile_work *w,
                sr_profile_result *r, sr_profile_track *track, seg_cache *record, sr_error *err);

#endif
