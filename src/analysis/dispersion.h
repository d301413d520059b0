/* dispersion.h - the Monte Carlo landing-scatter engine: n samples of a
 * descent model, each with perturbations drawn from its own (seed, i)
 * streams, run in parallel and stored by index, so the results are the same
 * bytes at any thread count. */
#ifndef SR_DISPERSION_H
#define SR_DISPERSION_H

#include <stddef.h>
#include <stdint.h>

#include "base/error.h"
#include "physics/uncertainty.h"
#include "sinkrate/analysis.h"

#define SR_DISP_MAX_BODIES 8          /* bodies landing apart (= mission sections at most) */
#define SR_DISP_MAX_SAMPLES 10000000  /* 1e7: 50 s at the speed goal, ~0.4 GB per body */
#define SR_DISP_DEFAULT_SAMPLES 10000

/* Limits a sample can break (bits of its flags; the order of the judge's
 * sr_limit_kind, analysis/judge.h). */
enum sr_limit_bit {
    SR_LIMIT_SPEED = 1u << 0,    /* touchdown speed */
    SR_LIMIT_ENERGY = 1u << 1,   /* kinetic energy of a section */
    SR_LIMIT_TIME = 1u << 2,     /* descent time */
    SR_LIMIT_DRIFT = 1u << 3,    /* drift distance from the launch point */
    SR_LIMIT_DEPLOY_Q = 1u << 4, /* dynamic pressure at a deployment */
    SR_LIMIT_MACH = 1u << 5,     /* Mach at a deployment above the family's envelope */
    SR_LIMIT_OPENING = 1u << 6   /* opening load above rated strength / design factor */
};
const char *sr_limit_name(int k); /* "touchdown speed", ... for bit 1u << k */

/* sr_landing (where and how one body came down; a record) and
 * SR_DISP_NLIMITS are public: include/sinkrate/analysis.h. */

/* A descent model. sample() must be thread-safe for distinct ws and must
 * depend only on ctx and the perturbations: it fills out[0 .. nbodies-1]
 * and *flags (sr_limit_bit), or returns a status with err filled. */
typedef struct sr_disp_model {
    size_t nbodies;
    const void *ctx;
    /* optional per-thread scratch (ODE and quadrature workspaces); NULL
     * return means out of memory */
    void *(*thread_init)(const void *ctx);
    void (*thread_free)(void *ws);
    int (*sample)(const void *ctx, void *ws, const sr_perturb *p, sr_landing *out, unsigned *flags, sr_error *err);
} sr_disp_model;

/* Progress: called now and then with the samples done so far, from one
 * thread at a time (any thread). */
typedef void (*sr_disp_progress_fn)(size_t done, size_t n, void *ud);

typedef struct sr_disp_options {
    size_t n;          /* samples, 1 .. SR_DISP_MAX_SAMPLES */
    uint64_t seed;
    int threads;       /* 0: all the OpenMP runtime offers */
    sr_disp_progress_fn progress;
    void *progress_ud;
} sr_disp_options;

typedef struct sr_disp_result {
    size_t n, nbodies;
    uint64_t seed;
    sr_landing *land;   /* n * nbodies, sample i body b at [i * nbodies + b] */
    unsigned *flags;    /* n */
    int threads;        /* threads used (not part of the results) */
} sr_disp_result;

/* Run n samples. On error no result is kept; a failing sample is reported
 * as the lowest failing index with its message, whatever the thread count. */
int sr_disp_run(const sr_disp_model *m, const sr_uncertainty *u, const sr_disp_options *o, sr_disp_result *res,
                sr_error *err);
void sr_disp_result_release(sr_disp_result *res);

/* Validate a sample count with a clear message (what = the option name). */
int sr_disp_check_n(double n, const char *what, sr_error *err);

#endif
