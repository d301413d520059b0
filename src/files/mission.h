/* mission.h - mission files (payloads/<scenario>.yaml): the site and its
 * weather, the sections and their masses, the recovery stages with their
 * canopies and deployment events, the state at first deployment and the
 * landing limits. One schema for every command that reads a mission. */
#ifndef SR_MISSION_H
#define SR_MISSION_H

#include <stddef.h>

#include "physics/atmos.h"
#include "physics/bluff.h"
#include "physics/canopy.h"
#include "physics/descent_spec.h"
#include "physics/profile.h"
#include "files/catalog.h"
#include "base/error.h"
#include "physics/wind.h"
#include "physics/uncertainty.h"
#include "sinkrate/files.h"
#include "files/mission_design.h"

/* the engine's bounds (physics/descent_spec.h): sections, stages, names;
 * sr_deploy_kind (`apogee` or `release`, `altitude`, `delay`) and
 * sr_section_set (bit i is sections[i]) are the engine's too */
#define SR_MISSION_MAX_SECTIONS SR_DESCENT_MAX_SECTIONS
#define SR_MISSION_MAX_STAGES SR_DESCENT_MAX_STAGES
#define SR_NAME_MAX SR_DESCENT_NAME_MAX
#define SR_MISSION_MAX_FAILURES 8

typedef struct sr_stage {
    char name[SR_NAME_MAX];
    sr_canopy canopy;
    char file[512];          /* the canopy file it came from (`canopy:`), "" for a family and size */
    int has_size;            /* 0: no size in the file (size --mission sizes it) */
    sr_deploy_kind deploy;
    double deploy_value;     /* m above ground, or s after the previous deployment on the same sections */
    sr_section_set carries;  /* sections hanging under this canopy from its deployment on (`carries:`;
                              * default: those of the stage before, all for the first). Fewer than the
                              * body it deploys on: those sections separate and land on their own. */
    int keep_previous;       /* `previous: keep` (default): canopies already open on these sections keep
                              * their drag; `release`: they are cut away at this deployment */
    double line_stretch;     /* s from the deployment event to line stretch (bag strip), default 0 */
} sr_stage;

typedef struct sr_section {
    char name[SR_NAME_MAX];
    double mass;             /* kg (the typical value when the file gives a band) */
    double mass_lo, mass_hi; /* the band `mass: {low:, typical:, high:}`; both equal mass when not banded */
    double drag_area;        /* m2, the section's own drag area CdA (0: neglected) */
    int rigid_with;          /* index of the section it lands as one piece with (`rigid-with:`), -1 none;
                              * tethered sections (the default) each land with their own energy */
    /* `body:` (instead of drag-area): drag with a Reynolds-dependent Cd while no canopy is open on the
     * section; under a canopy it is neglected (the body hangs in another attitude; conservative) */
    int has_body;
    sr_bluff_shape shape;    /* sphere, cylinder (broadside), disk, or SR_BLUFF_TABLE for `cd-table:` */
    double body_d;           /* diameter: the length of the Reynolds number, m */
    double body_length;      /* cylinder length, m (0 otherwise) */
    double body_area;        /* reference area of its Cd, m2 */
    char body_area_ref[64];  /* what that area is, e.g. "projected area d x L" */
    sr_bluff_curve curve;    /* its drag curve (owned; freed by sr_mission_release) */
    int stable_end_on;       /* `stable-end-on: true`: fins or a weighted nose keep it pointing into the flow
                              * when it falls without a canopy, so falling end-on is judged too */
} sr_section;

/* A what-if case the profile reports besides the nominal descent
 * (`failure-cases:`): the stages in `failed` do not deploy. */
typedef struct sr_failure_case {
    char name[128];          /* "no canopy", "drogue only", "main fails", or the file's name: */
    unsigned failed;         /* bit k: stage k does not deploy */
} sr_failure_case;

typedef struct sr_mission {
    char name[128];
    char path[512];
    sr_atmos atmos;          /* site weather: standard, site model or sounding */
    double ground;           /* site elevation above mean sea level, m */
    int has_position;        /* site.latitude / site.longitude given */
    double latitude;         /* launch or release point (the origin of east and north) on WGS 84, deg north */
    double longitude;        /* ... deg east */
    sr_wind wind;            /* site.wind; calm when absent */
    size_t nsections;
    sr_section sections[SR_MISSION_MAX_SECTIONS];
    size_t nstages;
    sr_stage stages[SR_MISSION_MAX_STAGES];
    int has_start;
    char start_at[600];      /* "file:line:column" of the start: block, for messages about it */
    double start_height;     /* first deployment: height above ground, m */
    double start_speed;      /* m/s */
    double start_path_angle; /* rad, below horizontal positive */
    double start_heading;    /* rad, bearing of the horizontal motion; NaN: into the wind (north when calm) */
    double start_east;       /* m, position of the start east of the launch / release point on the ground */
    double start_north;      /* m, ... and north of it */
    /* landing limits, NaN when not set */
    double limit_speed;      /* touchdown speed, m/s */
    double limit_energy;     /* kinetic energy per section, J */
    double limit_time;       /* descent time, s */
    double limit_drift;      /* drift distance, m */
    double limit_deploy_q;   /* dynamic pressure at any deployment, Pa */
    double limit_rated[SR_MISSION_MAX_STAGES]; /* rated strength of what carries each stage's opening load, N
                                                * (`rated-strength:`, one value or one per stage); NaN: none */
    double limit_design_factor; /* `design-factor:` the opening load may reach rated strength / factor */
    int energy_ground;       /* `landing-energy-basis: ground-relative`: the landing-energy limit means the
                              * speed relative to the ground (descent rate with the surface wind); 0: the
                              * descent rate (the default, as the trade's landing-energy limits do) */
    size_t nfailures;        /* failure-cases: */
    sr_failure_case failures[SR_MISSION_MAX_FAILURES];
    sr_uncertainty unc;      /* what a dispersion run varies (mission_uncertainty.c) */
    sr_design_spec design;   /* what the design search varies (`design:`, mission_design.c) */
} sr_mission;

/* Load and validate; relative file names inside (sounding, canopy files) are
 * taken relative to the mission file. Release with sr_mission_release. */
int sr_mission_load(sr_mission *m, const char *path, const sr_catalog *cat, sr_error *err);
/* The same, keeping the YAML document in *y for the caller (who frees it with
 * sr_yaml_free; on failure nothing is kept). */
int sr_mission_load_doc(sr_mission *m, const char *path, const sr_catalog *cat, sr_yaml *y, sr_error *err);
/* A mission from text, as if read from the file `path` (its messages name it
 * and relative file names inside are taken relative to it). */
int sr_mission_load_text(sr_mission *m, const char *path, const char *text, size_t len, const sr_catalog *cat,
                         sr_error *err);
/* The stages a design: block or design's options are read against. */
void sr_mission_design_basis(const sr_mission *m, sr_design_basis *b);

int sr_mission_parse(sr_mission *m, sr_yaml *y, const sr_catalog *cat, sr_error *err);
void sr_mission_release(sr_mission *m);

/* sr_mission_has_limits and sr_mission_total_mass are public. */

/* Mass of a set of sections, kg. */
double sr_mission_mass_of(const sr_mission *m, sr_section_set s);

/* sr_mission_set_name (public): "booster + payload bay" for a set of sections. */

/* The descent the profile engine flies (physics/descent_spec.h): every
 * stage must have a size and the mission a start: block (SR_EINVAL naming
 * the file otherwise). The spec borrows the mission's atmosphere, wind and
 * drag curves: it is valid while m is. */
int sr_mission_descent(const sr_mission *m, sr_descent_spec *spec, sr_error *err);

/* sr_mission_profile (public): sr_mission_descent and sr_profile_ctx_new in
 * one call. */

#endif
