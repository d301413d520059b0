/* profile_int.h - inside the profile module: the per-mission context (the
 * descent in numbers, the air and wind grid, the free-falling bodies, the
 * nominal transients) that profile_ctx.c builds and profile.c runs. */
#ifndef SR_PROFILE_INT_H
#define SR_PROFILE_INT_H

#include <gsl/gsl_integration.h>
#include <gsl/gsl_odeiv2.h>
#include <gsl/gsl_roots.h>

#include "physics/bluff.h"
#include "physics/profile.h"
#include "physics/profile_free.h"
#include "physics/profile_grid.h"

#define NS SR_DESCENT_MAX_STAGES
#define NSEC SR_DESCENT_MAX_SECTIONS
/* cache keys: stage k deployed onto a body (k), the rest of a body after
 * stage k separated part of it (NS + k), the start before any deployment */
#define KEY_REST(k) (NS + (k))
#define KEY_START (2 * NS)
#define NKEYS (2 * NS + 1)

typedef struct stage_c {
    char name[SR_DESCENT_NAME_MAX];
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
    /* the descent, in numbers */
    size_t nsec, nstg;
    double sec_mass[NSEC], sec_cda[NSEC];
    int sec_rigid[NSEC];
    /* sections with Reynolds-dependent drag (mission `body:`), used while no canopy is open on them */
    sr_profile_free fall;
    stage_c st[NS];
    double ground;
    double start_h, start_v, start_gamma, heading, start_e, start_n;
    char start_at[600];  /* "file:line:column" of the mission's start: block, for messages */
    int top_is_model;    /* the tables reach the top of the atmosphere model: above is no air we know */
    double top;          /* the height the tables reach, m above ground */
    sr_profile_grid grid; /* the air and wind on a height grid, with their own atmosphere and wind */
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

/* The run itself (profile.c); record != 0 fills ctx->cache (context build). */
int sr_profile_run_recorded(const sr_profile_ctx *c, const sr_profile_perturb *p, sr_profile_mode mode,
                            sr_profile_work *w, sr_profile_result *r, sr_profile_track *track, seg_cache *record,
                            sr_error *err);

/* A workspace in place (profile.c). */
int sr_profile_work_init(sr_profile_work *w, double tol, sr_error *err);
void sr_profile_work_release(sr_profile_work *w);

#endif
