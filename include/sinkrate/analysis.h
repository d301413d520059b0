/* sinkrate/analysis.h - the jobs: the canopy size for a target speed, the
 * opening load of a deployment over its bands, the band runs of a mission,
 * the one judge of its limits, failure cases, and the Monte Carlo landing
 * dispersion. The command-line tool calls these same functions, so a
 * program using them and `sinkrate` cannot disagree. Conventions:
 * sinkrate/base.h. */
#ifndef SINKRATE_ANALYSIS_H
#define SINKRATE_ANALYSIS_H

#include <stddef.h>
#include <stdint.h>

#include "sinkrate/base.h"
#include "sinkrate/files.h"
#include "sinkrate/physics.h"

#ifdef __cplusplus
extern "C" {
#endif

/* ---- sizing --------------------------------------------------------------
 * The canopy a payload needs to touch down at a target speed. */

typedef struct sr_sizing_result sr_sizing_result;

/* Size canopies like c (its family, cluster, areal mass and any measured
 * coefficient; its own size is ignored) for a payload of mass kg (without
 * the canopy) to descend at speed m/s at altitude m above sea level in the
 * atmosphere. body_cds: the payload's own drag area, m2 (0 to neglect).
 * SR_EIMPOSSIBLE with one line when no canopy can reach the speed. */
SR_API int sr_sizing_new(sr_sizing_result **out, const sr_canopy *c, double mass, double speed, double body_cds,
                         const sr_atmos *atmos, double altitude, sr_error *err);
SR_API void sr_sizing_free(sr_sizing_result *s);
/* Bands of one canopy (lo from the high drag coefficient): nominal area
 * (m2), nominal, projected and flat diameters (m); the mass of all canopies
 * (kg, 0 without an areal mass); the drag coefficient used, on nominal area. */
SR_API sr_band sr_sizing_nominal_area(const sr_sizing_result *s);
SR_API sr_band sr_sizing_nominal_diameter(const sr_sizing_result *s);
SR_API sr_band sr_sizing_projected_diameter(const sr_sizing_result *s);
SR_API sr_band sr_sizing_flat_diameter(const sr_sizing_result *s);
SR_API sr_band sr_sizing_canopy_mass(const sr_sizing_result *s);
SR_API sr_band sr_sizing_cd0(const sr_sizing_result *s);
/* Touchdown kinetic energy of payload and typical canopy, J; the air at the
 * sizing altitude (owned by s). */
SR_API double sr_sizing_energy(const sr_sizing_result *s);
SR_API const sr_air *sr_sizing_air(const sr_sizing_result *s);

/* ---- opening loads -------------------------------------------------------
 * The opening load of one deployment over every banded input: the canopy's
 * drag band, its growth-exponent band and its opening-load-factor band, each
 * with three published estimates (the opening-load-factor method, the
 * Pflanz closed form, an inflation ODE); the governing load is the highest. */

/* A record: one end of the band and the combination that gives it. */
typedef struct sr_loads_end {
    double force;       /* the highest of the three estimates (or the measured load), N, all canopies */
    double decel_g;     /* force / (m g0) */
    int state;          /* which deployment state: 0 typical, 1 fast end, 2 slow end of the band runs */
    int drag;           /* the canopy's own drag: 0 low, 1 typical, 2 high end */
    double exponent;    /* growth exponent */
    double cx;          /* opening-load factor */
} sr_loads_end;

/* A record: the opening load of one deployment over its bands. */
typedef struct sr_loads_band {
    int valid;          /* the typical state deployed and had a speed */
    int measured;       /* a measured opening load or factor replaced the estimates */
    sr_loads_end lo, typ, hi;   /* the governing estimate at the low end, typical, high end: hi governs */
    double v_lo, v_typ, v_hi;   /* airspeed at line stretch over the states, m/s */
    double q_lo, q_typ, q_hi;   /* dynamic pressure at line stretch, Pa */
    double mach_lo, mach_typ, mach_hi;
    double t_fill_typ;          /* filling time of the typical combination, s */
    int slow_deployment;        /* the typical opening is below the canopy's steady rate */
    int above_envelope;         /* the highest Mach is above the family's envelope */
} sr_loads_band;

/* A canopy deployed at airspeed v1 (m/s at line stretch) on a path angle
 * (rad below the horizontal: pi/2 straight down, 0 level), decelerating
 * mass (kg), in the air state. The result is allocated: sr_loads_free. */
SR_API int sr_loads_deployment(sr_loads_band **out, const sr_canopy *c, double mass, double v1, double path_angle,
                               const sr_air *air, sr_error *err);
SR_API void sr_loads_free(sr_loads_band *b);

/* ---- band runs -----------------------------------------------------------
 * A mission's staged descent at the typical value of every banded input and
 * at the two ends of its bands (the fast end: every canopy at the low end of
 * its drag range, every banded mass heavy; the slow end: high drag, light),
 * with the opening load of every deployment over its bands. */

enum {
    SR_BAND_TYPICAL = 0, /* every banded input at its typical value */
    SR_BAND_FAST = 1,    /* low drag, heavy end: fast, hard landings */
    SR_BAND_SLOW = 2,    /* high drag, light end: long, far-drifting descents */
    SR_BAND_NRUNS = 3
};

typedef struct sr_band_ctx sr_band_ctx;
typedef struct sr_band_work sr_band_work;     /* per-thread scratch: pass NULL */
typedef struct sr_band_result sr_band_result;

/* The band context of a mission (po: NULL for the defaults). The mission is
 * copied where needed; it need not outlive the context. Read-only once
 * built: threads may share it, each with its own result. */
SR_API int sr_band_ctx_new(sr_band_ctx **bc, const sr_mission *m, const sr_profile_opts *po, sr_error *err);
SR_API void sr_band_ctx_free(sr_band_ctx *bc);
SR_API int sr_band_result_new(sr_band_result **out, sr_error *err);
SR_API void sr_band_result_free(sr_band_result *r);
/* Run the three descents and the opening loads. design, w and track: NULL. */
SR_API int sr_band_run(const sr_band_ctx *bc, const sr_profile_perturb *design, sr_profile_mode mode,
                       sr_band_work *w, sr_band_result *r, sr_profile_track *track, sr_error *err);
/* One of the runs (SR_BAND_TYPICAL, _FAST, _SLOW; owned by r). */
SR_API const sr_profile_result *sr_band_result_run(const sr_band_result *r, int which);
/* The opening load of stage k over its bands (owned by r; NULL past the end). */
SR_API const sr_loads_band *sr_band_result_loads(const sr_band_result *r, size_t k);

/* ---- the judge -----------------------------------------------------------
 * The one judge: a mission's band runs against every limit its file sets.
 * Conservative by default (each limit judged at the worse end of every
 * band); relaxed on request to the typical values, which is NOT conservative
 * and must be said wherever the verdict is shown. */

typedef enum sr_limit_kind {
    SR_JUDGE_SPEED = 0,  /* touchdown descent rate: the highest over the bodies */
    SR_JUDGE_ENERGY,     /* landing energy of one section (index) */
    SR_JUDGE_TIME,       /* descent time: the last touchdown */
    SR_JUDGE_DRIFT,      /* the farthest landing point from the launch point */
    SR_JUDGE_DEPLOY_Q,   /* dynamic pressure at a stage's deployment (index) */
    SR_JUDGE_MACH,       /* Mach at a stage's deployment against its family's envelope (index) */
    SR_JUDGE_OPENING,    /* opening load of a stage (index) against rated strength / design factor */
    SR_JUDGE_NKINDS
} sr_limit_kind;

SR_API const char *sr_judge_kind_name(sr_limit_kind k); /* "touchdown speed", ... */
/* The quantity of a kind's values (for sr_units_label and sr_units_from_si):
 * a speed, an energy, a time, a length, a pressure, none (Mach), a force. */
SR_API sr_quantity sr_judge_kind_quantity(sr_limit_kind k);

typedef enum sr_judge_basis {
    SR_JUDGE_BAND_END = 0, /* the worse end of every band: conservative (the default) */
    SR_JUDGE_TYPICAL       /* the typical values: NOT conservative, the output must say so */
} sr_judge_basis;

/* A record: one limit judged. */
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

typedef struct sr_judge_limits sr_judge_limits;
typedef struct sr_verdict sr_verdict;

/* What a row is about: the name of its section (a landing energy) or stage
 * (deployment pressure, Mach, opening load) in the mission, "" for a limit
 * of the whole descent. */
SR_API const char *sr_judge_row_subject(const sr_mission *m, const sr_judge_row *row);

/* The limits a mission file sets. */
SR_API int sr_judge_limits_new(sr_judge_limits **out, const sr_mission *m, sr_error *err);
SR_API void sr_judge_limits_free(sr_judge_limits *l);
SR_API int sr_verdict_new(sr_verdict **out, sr_error *err);
SR_API void sr_verdict_free(sr_verdict *v);
/* Judge band runs: each value is the worst over the runs (an opening load:
 * the governing load of its band). */
SR_API void sr_judge_band(const sr_judge_limits *l, const sr_band_result *b, sr_judge_basis basis, sr_verdict *v);

SR_API size_t sr_verdict_rows(const sr_verdict *v);
SR_API const sr_judge_row *sr_verdict_row(const sr_verdict *v, size_t i);
/* The row with the least margin (the highest ratio), -1 without rows. */
SR_API int sr_verdict_binding(const sr_verdict *v);
/* How many limits the judged values break (a program judging a mission
 * should fail when this is not 0). */
SR_API int sr_verdict_exceeded(const sr_verdict *v);
SR_API sr_judge_basis sr_verdict_basis(const sr_verdict *v);

/* ---- failure cases -------------------------------------------------------
 * Some stages do not deploy: the bands run in every attitude the falling
 * bodies can take, judged at the worse attitude and the worse band end. */

typedef struct sr_failcase_result sr_failcase_result;

SR_API int sr_failcase_result_new(sr_failcase_result **out, sr_error *err);
SR_API void sr_failcase_result_free(sr_failcase_result *f);
/* failed: bit k set = stage k does not deploy (sr_mission_failure_stages).
 * po: NULL for the defaults. */
SR_API int sr_failcase_run(const sr_mission *m, unsigned failed, const sr_judge_limits *l, sr_judge_basis basis,
                           const sr_profile_opts *po, sr_failcase_result *out, sr_error *err);
SR_API const sr_verdict *sr_failcase_result_verdict(const sr_failcase_result *f);
SR_API size_t sr_failcase_result_attitudes(const sr_failcase_result *f);
SR_API sr_bluff_attitude sr_failcase_result_attitude(const sr_failcase_result *f, size_t i);
/* The band runs in attitude i (owned by f). */
SR_API const sr_band_result *sr_failcase_result_band(const sr_failcase_result *f, size_t i);
/* The attitude closest to or furthest past a limit. */
SR_API size_t sr_failcase_result_worse(const sr_failcase_result *f);

/* ---- dispersion ----------------------------------------------------------
 * Monte Carlo landing scatter: n samples of the mission, each drawing the
 * uncertainties its file sets from its own random streams (seed, sample),
 * so the results are the same at any thread count. */

/* Limits a sample can break: bit 1u << k of its flags for sr_limit_kind k. */
#define SR_DISP_NLIMITS 7

/* A record: where and how one body of one sample came down. */
typedef struct sr_landing {
    double east, north; /* m from the launch point */
    double time;        /* descent time from the first deployment, s */
    double speed;       /* touchdown speed, m/s */
    double energy;      /* kinetic energy at touchdown of the heaviest-hit section in the body, J */
} sr_landing;

typedef struct sr_disp_result sr_disp_result;

/* Run n samples (1 .. 10^7) with the given seed on `threads` threads (0: all
 * the OpenMP runtime offers). full != 0: every transient by the ODE (slow;
 * the default fast mode is checked against it in the tests). */
SR_API int sr_disp_mission_run(sr_disp_result **out, const sr_mission *m, size_t n, uint64_t seed, int threads,
                               int full, sr_error *err);
SR_API void sr_disp_result_free(sr_disp_result *r);
SR_API size_t sr_disp_result_samples(const sr_disp_result *r);
SR_API size_t sr_disp_result_bodies(const sr_disp_result *r);
/* Sample i, body b (owned by r; NULL past the end). */
SR_API const sr_landing *sr_disp_result_landing(const sr_disp_result *r, size_t i, size_t b);
/* The limits sample i breaks (bits 1u << sr_limit_kind). */
SR_API unsigned sr_disp_result_flags(const sr_disp_result *r, size_t i);

/* Statistics of a scatter. */
#define SR_SCATTER_NPCT 5 /* percentiles: 1, 5, 50, 95, 99 % */

/* Records of the statistics. */
typedef struct sr_ellipse {
    double major, minor; /* semi-axes, m */
    double bearing;      /* of the major axis, rad clockwise from north, [0, pi) */
} sr_ellipse;

typedef struct sr_proportion {
    size_t count, n;
    double p, se, lo, hi; /* count/n, its standard error, the 95 % Wilson interval */
} sr_proportion;

typedef struct sr_spread1 {
    double mean, min, max;
    double pct[SR_SCATTER_NPCT];
} sr_spread1;

typedef struct sr_body_stats {
    double mean_east, mean_north;       /* m from the launch point */
    double mean_distance, mean_bearing; /* m; rad clockwise from north, [0, 2 pi) */
    double cov_ee, cov_en, cov_nn;      /* m2, with n - 1 */
    sr_ellipse sigma1, sigma3;          /* 1 and 3 standard deviations out */
    double r50_mean, r95_mean;          /* radii holding 50 % / 95 % of the points, around the mean */
    double r50_launch, r95_launch;      /* ... around the launch point */
    sr_spread1 time, speed, energy;
} sr_body_stats;

typedef struct sr_disp_stats sr_disp_stats;

SR_API int sr_disp_stats_new(sr_disp_stats **out, const sr_disp_result *r, sr_error *err);
SR_API void sr_disp_stats_free(sr_disp_stats *s);
SR_API const sr_body_stats *sr_disp_stats_body(const sr_disp_stats *s, size_t b);
/* The share of samples breaking limit kind k (sr_limit_kind), and any limit. */
SR_API const sr_proportion *sr_disp_stats_limit(const sr_disp_stats *s, sr_limit_kind k);
SR_API const sr_proportion *sr_disp_stats_any(const sr_disp_stats *s);

#ifdef __cplusplus
}
#endif

#endif
