/* dispersion_mission.h - a mission's staged descent (the profile module, in
 * its fast mode by default) as the dispersion engine's sample model: how a
 * sample's perturbations map onto the profile, and what it reports back. */
#ifndef SR_DISPERSION_MISSION_H
#define SR_DISPERSION_MISSION_H

#include "analysis/dispersion.h"
#include "analysis/judge.h"
#include "analysis/loads.h"
#include "files/mission.h"
#include "physics/profile.h"

typedef struct sr_disp_mission {
    const sr_mission *m;
    sr_profile_ctx *ctx;
    sr_profile_mode mode;
    size_t nbodies;
    char body_name[SR_DISP_MAX_BODIES][160];   /* "booster + payload bay" */
    /* An absolute wind-speed deviation is a uniform wind added along the
     * height-averaged wind direction (north for a calm mission), turned with
     * the sample's direction deviation: exact for a constant wind. */
    double along_east, along_north;
    /* the one judge (judge.h) decides which limits a sample breaks; opening
     * loads are computed per sample (fast solver) only when the mission sets a
     * rated strength */
    sr_judge_limits limits;
    int judge_loads;
    sr_loads_canopy lc[SR_MISSION_MAX_STAGES];
    sr_disp_model model;
} sr_disp_mission;

/* Build the model: one profile context with options po (NULL: the
 * defaults; full = 1: every transient by the ODE instead of the fast path).
 * The table margin is widened to hold the highest first deployment the
 * uncertainty can draw. m must outlive dm. */
int sr_disp_mission_init(sr_disp_mission *dm, const sr_mission *m, const sr_profile_opts *po, int full,
                         sr_error *err);
void sr_disp_mission_free(sr_disp_mission *dm);

/* The profile perturbation of a sample. */
void sr_disp_mission_map(const sr_disp_mission *dm, const sr_perturb *in, sr_profile_perturb *out);

/* Landing outcome and limit flags of one profile result (also for the
 * nominal descent): the flags are the judge's (sr_judge_flags); the energy
 * follows the mission's landing-energy basis. */
void sr_disp_mission_outcome(const sr_disp_mission *dm, const sr_profile_result *r, sr_landing *out,
                             unsigned *flags);

#endif
