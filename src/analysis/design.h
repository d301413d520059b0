/* design.h - the design search: the lightest (or smallest packed, or least
 * drifting) recovery system of a mission that meets every limit at the band
 * end, for every combination of canopy families, cluster counts and stages
 * kept that the mission's design: block (or the command's options) allows.
 *
 * Each candidate is judged by the one judge (judge.h) on its band runs
 * (band.h) in the fast mode; the size of the last stage is exact for the
 * touchdown limits (the sizing inversion, then bisection), the other sizes
 * and the deployment heights come from a bounded grid refined around the
 * best; the packed volume of every stage (physics/packing.h) must fit its
 * bay. The best design of each combination is then written as a mission file
 * (files/mission_write.h), read back and judged again with the full
 * integration, exactly as `sinkrate profile` judges that file: the numbers
 * reported are those.
 *
 * Deterministic at any thread count: every candidate depends only on its own
 * inputs, results are stored by index and chosen in index order. Nothing
 * here prints. */
#ifndef SR_DESIGN_H
#define SR_DESIGN_H

#include <stddef.h>

#include "analysis/judge.h"
#include "base/error.h"
#include "files/catalog.h"
#include "files/mission.h"
#include "physics/packing.h"

/* the mission's document as read (files/yamldoc.h): the search writes each
 * candidate from it, so an analysis header needs only its name */
typedef struct sr_yaml sr_yaml;

#define SR_DESIGN_MAX_COMBOS 20000
#define SR_DESIGN_MAX_SLICES 4000   /* grid points of one combination */
#define SR_DESIGN_MAX_POINTS_ALL 1e7 /* grid points over every combination (some minutes of work) */
#define SR_DESIGN_REFINE 3          /* refinement rounds around the best grid point (each halves the step) */
#define SR_DESIGN_SIZE_TOL 1e-4     /* the last stage's size: relative, to the exact minimum */
#define SR_DESIGN_DIGITS 6          /* significant digits of a written diameter */
#define SR_DESIGN_TRIES 8           /* candidates of a combination tried by the full integration */
#define SR_DESIGN_SCREEN_ODE_TOL 1e-6 /* the ODE's tolerance while screening (the full judgement: 1e-9) */

/* Where a design's miss or binding limit lies: a row of the judge's verdict,
 * or the bay of a stage. */
typedef struct sr_design_limit {
    int row;            /* index into the verdict's rows, -1: a bay */
    int stage;          /* the stage of the design's mission whose bay, when row = -1 */
    double ratio;       /* judged / allowed (packed volume / bay) */
} sr_design_limit;

/* One design: the values chosen and how it fares. Indices [k] are the
 * stages of the mission file (the design's own mission leaves out the
 * stages it drops: stage_index maps them). */
typedef struct sr_design_point {
    unsigned present;                      /* stages kept, bit k */
    char family[SR_MISSION_MAX_STAGES][48];
    int count[SR_MISSION_MAX_STAGES];
    double d0[SR_MISSION_MAX_STAGES];      /* nominal diameter, m */
    double height[SR_MISSION_MAX_STAGES];  /* deployment height, m (NaN: not height-triggered) */
    int stage_index[SR_MISSION_MAX_STAGES];/* index in the design's mission, -1: dropped */
    sr_pack pack[SR_MISSION_MAX_STAGES];   /* canopy mass and packed volume */
    double bay[SR_MISSION_MAX_STAGES];     /* the bay it must fit, m3 (NaN: none given) */
    double mass, mass_hi;                  /* recovery mass: every canopy with its lines, typical and high, kg */
    double volume;                         /* packed volume of every stage, typical, m3 */
    double speed, energy, time, drift;     /* judged touchdown speed, highest landing energy, descent time, drift */
    double objective;                      /* the value ranked on (SI) */
    int feasible;                          /* meets every limit and fits every bay */
    int evaluated;                         /* 0: not flown (a building error: see note) */
    sr_design_limit worst;                 /* the limit closest to breaking, or the one most exceeded */
    sr_verdict verdict;                    /* the judge's, on the design's mission */
    int full;                              /* judged with the full integration (as profile judges it) */
    int bay_capped;                        /* the last stage is the largest its bay holds (stage + 1; 0: not) */
    char note[256];                        /* why it could not be flown, when it could not */
} sr_design_point;

/* One combination of families, counts and stages kept, and its best design. */
typedef struct sr_design_combo {
    unsigned present;
    char family[SR_MISSION_MAX_STAGES][48];
    int count[SR_MISSION_MAX_STAGES];
    int feasible;                /* a design meets every limit (confirmed by the full integration) */
    sr_design_point best;        /* the best that meets every limit, or the closest miss */
    sr_mission *mission;         /* the best's mission (read back from its text); NULL when none */
    char *text;                  /* that mission as YAML: what --write writes */
    size_t len;
    size_t candidates;           /* candidates judged on the fast path */
    int rejected;                /* candidates the fast path passed and the full integration did not */
    int bay_blocked;             /* stage + 1 whose bay holds not even its least size (0: none) */
    /* the risk check (sr_design_risk) */
    int risk_checked, risk_dropped;
    double risk;                 /* share of the dispersion's samples breaking a limit */
    double risk_limit[7];        /* per limit (sr_limit_bit order) */
} sr_design_combo;

/* The resolution of one searched variable, for the output. */
typedef struct sr_design_axis {
    int stage;                   /* mission stage */
    int height;                  /* 0: its nominal diameter, 1: its deployment height */
    int exact;                   /* the last stage's size: exact for the touchdown limits */
    int list;                    /* sizes from a list (every one tried) */
    size_t points;               /* grid points (or list entries) */
    double lo, hi;               /* m */
    double resolution;           /* after refinement: relative (size) or m (height) */
} sr_design_axis;

typedef struct sr_design_result {
    sr_design_objective objective;
    sr_judge_basis basis;
    size_t ncombos;
    sr_design_combo *combo;
    size_t nranked;
    size_t *rank;                /* feasible combinations, best first */
    size_t npareto;
    sr_design_point *pareto;     /* the non-dominated designs over the two Pareto quantities, confirmed */
    size_t naxes;
    sr_design_axis axis[2 * SR_MISSION_MAX_STAGES];
    size_t candidates;           /* candidates judged on the fast path, all combinations */
    size_t confirmed;            /* designs judged again with the full integration */
    int bay_blocks;              /* some bay is smaller than the smallest canopy of its stage, every combination */
} sr_design_result;

/* The Pareto quantities. */
typedef enum sr_design_quantity {
    SR_DQ_SPEED = 0, SR_DQ_DRIFT, SR_DQ_MASS, SR_DQ_VOLUME, SR_DQ_TIME, SR_DQ_N
} sr_design_quantity;
const char *sr_design_quantity_name(sr_design_quantity q);
int sr_design_quantity_parse(const char *s, sr_design_quantity *q);
double sr_design_quantity_of(const sr_design_point *p, sr_design_quantity q);

typedef void (*sr_design_progress_fn)(size_t done, size_t total, void *ud);

typedef struct sr_design_opts {
    sr_judge_basis basis;
    int threads;                 /* 0: all the OpenMP runtime offers */
    sr_design_quantity pareto_x, pareto_y;
    const char *target;          /* the path a written design will be read from (file names inside are made to
                                  * resolve from there); NULL: the mission's own */
    const char *header;          /* comment lines on top of every written design, or NULL */
    sr_design_progress_fn progress;
    void *progress_ud;
} sr_design_opts;

void sr_design_opts_init(sr_design_opts *o);

/* The search. m: the mission (its design: block, after the command's
 * options are applied), y: the YAML document it was read from. SR_EINVAL for
 * an empty or too large search space; an impossible search is no error
 * (nranked = 0: the combinations hold their closest misses). Release with
 * sr_design_result_free. */
int sr_design_run(const sr_mission *m, const sr_yaml *y, const sr_catalog *cat, const sr_design_opts *o,
                  sr_design_result *res, sr_error *err);
void sr_design_result_free(sr_design_result *res);

/* The risk check: the mission's dispersion (n samples, seed) on the best k
 * ranked designs; a design whose share of samples breaking any limit
 * exceeds max_risk is dropped from the ranking (res->rank keeps the others,
 * in order). */
int sr_design_risk(sr_design_result *res, size_t k, size_t n, unsigned long seed, double max_risk, int threads,
                   sr_error *err);

/* The size of a stage's search as the default asks for it when the file
 * says nothing: from half to twice its nominal diameter. Fills the design
 * spec's stages that do not vary at all; returns how many it filled. */
size_t sr_design_default_ranges(sr_mission *m);

#endif
