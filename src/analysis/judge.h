/* judge.h - the one judge: a descent against every limit its mission sets
 * (touchdown speed, landing energy of each section, descent time, drift,
 * dynamic pressure at each deployment, the family's Mach envelope at each
 * deployment, the opening load of each stage against its rated strength over
 * the design factor). Conservative by default: each limit is judged at the
 * worse end of every band (the worst of the band runs, the governing opening
 * load); relaxed on request to the typical values, and the verdict then says
 * it is not conservative. Every command that judges a limit calls this.
 *
 * Plain values only: nothing is allocated or printed; the caller owns every
 * struct. Margins and ratios are in SI. */
#ifndef SR_JUDGE_H
#define SR_JUDGE_H

#include "analysis/band.h"
#include "files/mission.h"
#include "physics/profile.h"

typedef enum sr_limit_kind {
    SR_JUDGE_SPEED = 0,  /* touchdown descent rate: the highest over the bodies */
    SR_JUDGE_ENERGY,     /* landing energy of one section (index), vertical or ground-relative */
    SR_JUDGE_TIME,       /* descent time: the last touchdown */
    SR_JUDGE_DRIFT,      /* the farthest landing point from the launch point */
    SR_JUDGE_DEPLOY_Q,   /* dynamic pressure at a stage's deployment (index) */
    SR_JUDGE_MACH,       /* Mach at a stage's deployment against its family's envelope (index) */
    SR_JUDGE_OPENING,    /* opening load of a stage (index) against rated strength / design factor */
    SR_JUDGE_NKINDS
} sr_limit_kind;

/* "touchdown speed", "landing energy", ... */
const char *sr_judge_kind_name(sr_limit_kind k);

/* The limits of a mission, in numbers (NaN: not set). */
typedef struct sr_judge_limits {
    double speed, energy, time, drift, deploy_q;
    int energy_ground;                        /* the landing-energy limit means the ground-relative speed */
    size_t nstages, nsections;
    double mach_max[SR_MISSION_MAX_STAGES];   /* each stage's family envelope (from memory in the catalog) */
    double rated[SR_MISSION_MAX_STAGES];      /* rated strength of each stage's load path, N */
    double design_factor;
} sr_judge_limits;

void sr_judge_limits_init(sr_judge_limits *l, const sr_mission *m);

typedef enum sr_judge_basis {
    SR_JUDGE_BAND_END = 0, /* the worse end of every band: conservative (the default) */
    SR_JUDGE_TYPICAL       /* the typical values: NOT conservative, the output must say so */
} sr_judge_basis;

typedef struct sr_judge_row {
    sr_limit_kind kind;
    int index;           /* stage or section, -1 for the whole descent */
    int known;           /* 0: no value (the stage did not deploy): not judged */
    double limit;        /* allowed, SI (an opening load: rated strength / design factor) */
    double typical;      /* value in the typical run */
    double band_end;     /* the worst over the bands */
    double judged;       /* band_end, or typical when relaxed */
    double margin;       /* limit - judged: positive when met */
    double ratio;        /* judged / limit */
    int exceeded;        /* the judged value breaks the limit */
    int exceeded_typical;
    int exceeded_band_end;
} sr_judge_row;

#define SR_JUDGE_MAX_ROWS (4 + SR_MISSION_MAX_SECTIONS + 3 * SR_MISSION_MAX_STAGES)

typedef struct sr_verdict {
    sr_judge_basis basis;
    size_t nrows;
    sr_judge_row row[SR_JUDGE_MAX_ROWS];
    int binding;            /* the row with the highest ratio (the least margin), -1 without rows */
    int exceeded;           /* rows whose judged value breaks the limit: exit 1 */
    int exceeded_band_end;  /* rows broken at the band end (with a relaxed basis, some are not counted) */
} sr_verdict;

/* Judge band runs: each value is the worst over the runs (and over the n
 * results, for failure cases run in several attitudes); an opening load is
 * the governing load of the band. */
void sr_judge_bands(const sr_judge_limits *l, const sr_band_result *const *b, size_t n, sr_judge_basis basis,
                    sr_verdict *v);
void sr_judge_band(const sr_judge_limits *l, const sr_band_result *b, sr_judge_basis basis, sr_verdict *v);

/* One descent on its own (a dispersion sample): the limits it breaks, as
 * bits 1 << sr_limit_kind. loads may be NULL (opening loads not judged). */
unsigned sr_judge_flags(const sr_judge_limits *l, const sr_profile_result *r, const sr_loads_band *loads);

#endif
