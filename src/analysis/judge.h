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
#include "sinkrate/analysis.h"

/* sr_limit_kind, sr_judge_kind_name, sr_judge_basis, sr_judge_row (a
 * record) and the functions of a program's handles are public:
 * include/sinkrate/analysis.h. */

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

/* One descent on its own (a dispersion sample): the limits it breaks, as
 * bits 1 << sr_limit_kind. loads may be NULL (opening loads not judged). */
/* The opening load stage k may reach (rated strength / design factor), N;
 * NaN when the mission sets none for it. */
double sr_judge_opening_limit(const sr_judge_limits *l, size_t k);

unsigned sr_judge_flags(const sr_judge_limits *l, const sr_profile_result *r, const sr_loads_band *loads);

#endif
