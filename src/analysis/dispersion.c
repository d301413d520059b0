/* dispersion.c - the Monte Carlo loop: static partition over OpenMP threads,
 * results stored by sample index, errors resolved to the lowest index. */
#include "analysis/dispersion.h"

#include <gsl/gsl_rng.h>
#include <math.h>
#include <omp.h>
#include <stdlib.h>
#include <string.h>

#include "base/rng.h"

/* samples between progress calls and stop checks */
#define BLOCK 256

static const char *const LIMIT_NAMES[SR_DISP_NLIMITS] = {"touchdown speed", "landing energy", "descent time",
                                                         "drift",           "deployment pressure", "Mach envelope",
                                                         "opening load"};

const char *sr_limit_name(int k)
{
    return k >= 0 && k < SR_DISP_NLIMITS ? LIMIT_NAMES[k] : "?";
}

int sr_disp_check_n(double n, const char *what, sr_error *err)
{
    if (!(n >= 1.0 && n <= (double)SR_DISP_MAX_SAMPLES && n == floor(n)))
        return sr_error_set(err, SR_EINVAL, "%s: the number of samples must be a whole number from 1 to %d, got %.15g",
                            what, SR_DISP_MAX_SAMPLES, n);
    return SR_OK;
}

void sr_disp_result_release(sr_disp_result *res)
{
    if (!res)
        return;
    free(res->land);
    free(res->flags);
    res->land = NULL;
    res->flags = NULL;
}

int sr_disp_run(const sr_disp_model *m, const sr_uncertainty *u, const sr_disp_options *o, sr_disp_result *res,
                sr_error *err)
{
    memset(res, 0, sizeof *res);
    int rc;
    if ((rc = sr_disp_check_n((double)o->n, "dispersion", err)))
        return rc;
    if (!m || !m->sample || m->nbodies < 1 || m->nbodies > SR_DISP_MAX_BODIES)
        return sr_error_set(err, SR_EINVAL, "dispersion: the descent model must land 1 to %d bodies",
                            SR_DISP_MAX_BODIES);
    if (o->threads < 0 || o->threads > 1024)
        return sr_error_set(err, SR_EINVAL, "dispersion: threads must be from 0 (all) to 1024, got %d", o->threads);
    const size_t n = o->n, nb = m->nbodies;
    res->land = malloc(n * nb * sizeof *res->land);
    res->flags = malloc(n * sizeof *res->flags);
    if (!res->land || !res->flags) {
        sr_disp_result_release(res);
        return sr_error_set(err, SR_ENOMEM, "dispersion: no memory for %zu samples; use fewer (-n)", n);
    }
    res->n = n;
    res->nbodies = nb;
    res->seed = o->seed;
    int nt = o->threads > 0 ? o->threads : omp_get_max_threads();
    if ((size_t)nt > n)
        nt = (int)n;

    /* shared state: the lowest failing index and its message, the count done */
    size_t fail_at = SIZE_MAX;
    sr_error fail_err;
    sr_error_clear(&fail_err);
    size_t done = 0;
    int used = 1;
    /* locks of this run (named critical sections would be process-wide symbols) */
    omp_lock_t fail_lock, progress_lock;
    omp_init_lock(&fail_lock);
    omp_init_lock(&progress_lock);

#pragma omp parallel num_threads(nt)
    {
        int t = omp_get_thread_num(), T = omp_get_num_threads();
        if (t == 0)
            used = T; /* read after the region's closing barrier */
        /* static partition: thread t takes the contiguous range [lo, hi) */
        size_t lo = n * (size_t)t / (size_t)T, hi = n * (size_t)(t + 1) / (size_t)T;
        gsl_rng *r = gsl_rng_alloc(sr_rng_splitmix64);
        void *ws = m->thread_init ? m->thread_init(m->ctx) : NULL;
        int ok = r && (!m->thread_init || ws);
        if (!ok) {
            omp_set_lock(&fail_lock);
            if (lo < fail_at) {
#pragma omp atomic write
                fail_at = lo;
                sr_error_set(&fail_err, SR_ENOMEM, "dispersion: no memory for a thread's workspace");
            }
            omp_unset_lock(&fail_lock);
        }
        sr_error e;
        for (size_t b0 = lo; ok && b0 < hi; b0 += BLOCK) {
            size_t stop;
#pragma omp atomic read
            stop = fail_at;
            /* samples after a known failure cannot change the outcome */
            if (b0 > stop)
                break;
            size_t b1 = b0 + BLOCK < hi ? b0 + BLOCK : hi;
            for (size_t i = b0; i < b1; i++) {
                sr_perturb p;
                sr_uncertainty_draw(u, o->seed, i, r, &p);
                res->flags[i] = 0;
                if (m->sample(m->ctx, ws, &p, &res->land[i * nb], &res->flags[i], &e) != SR_OK) {
                    omp_set_lock(&fail_lock);
                    if (i < fail_at) {
#pragma omp atomic write
                        fail_at = i;
                        fail_err = e;
                    }
                    omp_unset_lock(&fail_lock);
                    ok = 0;
                    break;
                }
            }
            size_t d;
#pragma omp atomic capture
            d = done += b1 - b0;
            if (o->progress) {
                omp_set_lock(&progress_lock);
                o->progress(d, n, o->progress_ud);
                omp_unset_lock(&progress_lock);
            }
        }
        if (ws && m->thread_free)
            m->thread_free(ws);
        gsl_rng_free(r);
    }
    omp_destroy_lock(&fail_lock);
    omp_destroy_lock(&progress_lock);
    res->threads = used;
    if (fail_at != SIZE_MAX) {
        sr_disp_result_release(res);
        if (fail_err.code == SR_ENOMEM)
            return sr_error_set(err, SR_ENOMEM, "%s", fail_err.msg);
        return sr_error_set(err, fail_err.code ? fail_err.code : SR_ENUMERIC, "sample %zu (--seed %llu): %s",
                            fail_at, (unsigned long long)o->seed, fail_err.msg);
    }
    return SR_OK;
}

/* ---- a program's dispersion result (include/sinkrate/analysis.h) ---- */

void sr_disp_result_free(sr_disp_result *r)
{
    if (!r)
        return;
    sr_disp_result_release(r);
    free(r);
}

size_t sr_disp_result_samples(const sr_disp_result *r)
{
    return r->n;
}

size_t sr_disp_result_bodies(const sr_disp_result *r)
{
    return r->nbodies;
}

const sr_landing *sr_disp_result_landing(const sr_disp_result *r, size_t i, size_t b)
{
    return i < r->n && b < r->nbodies ? &r->land[i * r->nbodies + b] : NULL;
}

unsigned sr_disp_result_flags(const sr_disp_result *r, size_t i)
{
    return i < r->n ? r->flags[i] : 0u;
}
