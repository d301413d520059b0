/* profile_free.h - inside the profile module: sections that fall with no
 * canopy open and a Reynolds-dependent drag coefficient (a mission's `body:`),
 * in the attitude of the run: their drag area at an airspeed, and every
 * equilibrium speed of such a body at a height. */
#ifndef SR_PROFILE_FREE_H
#define SR_PROFILE_FREE_H

#include <gsl/gsl_roots.h>

#include "base/error.h"
#include "physics/bluff.h"
#include "physics/descent_spec.h"
#include "physics/profile_grid.h"

typedef struct sr_profile_free {
    size_t nsec;
    sr_section_set secs;                                 /* the sections with a drag curve */
    sr_bluff_curve curve[SR_DESCENT_MAX_SECTIONS];       /* owned copies */
    sr_bluff_body body[SR_DESCENT_MAX_SECTIONS];         /* .curve points into curve[] */
    double k[SR_DESCENT_MAX_SECTIONS], c[SR_DESCENT_MAX_SECTIONS]; /* drag area k Cd(Re) A + c (attitude) */
} sr_profile_free;

/* Copy the drag curves of the spec's sections and set their attitude. f must
 * be zeroed before; release it with sr_profile_free_release in every case. */
int sr_profile_free_init(sr_profile_free *f, const sr_descent_spec *s, sr_bluff_attitude attitude, sr_error *err);
void sr_profile_free_release(sr_profile_free *f);

/* Sum of k Cd_i(Re_i) A_i + c of the sections in `secs` that have a curve, at
 * airspeed V in air of density rho and viscosity mu; ORs SR_BLUFF_WARN_* into
 * *warn (may be NULL). */
double sr_profile_free_cda(const sr_profile_free *f, sr_section_set secs, double V, double rho, double mu,
                           unsigned *warn);

/* Every equilibrium speed of a body falling with no canopy open at height h:
 * m g = 1/2 rho v^2 (cda_const + sr_profile_free_cda(v)). */
typedef struct sr_free_eq {
    int n;               /* equilibria found */
    int nstable;         /* of which stable (drag grows through them) */
    double v_fast;       /* fastest equilibrium (always stable: drag exceeds weight above it), m/s */
    double v_slow;       /* slowest stable one, m/s */
    unsigned warn;       /* SR_BLUFF_WARN_* of the curves at v_fast (Re range, L/D, Mach) */
} sr_free_eq;

int sr_profile_free_equilibria(const sr_profile_free *f, const sr_profile_grid *g, gsl_root_fsolver *s,
                               sr_section_set secs, double mass, double cda_const, double h, sr_free_eq *out,
                               sr_error *err);

#endif
