/* band.c - the three band runs of a staged descent and the opening loads of
 * every deployment over their bands. */
#include "analysis/band.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

struct sr_band_ctx {
    sr_profile_ctx *ctx;
    size_t nstages, nsections;
    double drag[SR_BAND_NRUNS][SR_MISSION_MAX_STAGES];   /* drag-area factor of each stage per run */
    double mass[SR_BAND_NRUNS][SR_MISSION_MAX_SECTIONS]; /* mass factor of each section per run */
    sr_loads_canopy lc[SR_MISSION_MAX_STAGES];
    char name[SR_MISSION_MAX_STAGES][SR_NAME_MAX];
};

/* The opening loads of each stage last computed in this workspace: a run
 * whose states at line stretch are the same bits gets the same loads without
 * solving again (a design search moves one canopy while the others' openings
 * stay as they were). */
typedef struct loads_memo {
    int valid, fast;
    sr_loads_canopy lc;  /* the canopy itself, not its context's address: a freed context's may come back */
    sr_loads_state st[SR_LOADS_NSTATES];
    sr_loads_band out;
} loads_memo;

struct sr_band_work {
    sr_profile_work *w;
    loads_memo memo[SR_MISSION_MAX_STAGES];
};

int sr_band_ctx_new(sr_band_ctx **out, const sr_mission *m, const sr_profile_opts *po, sr_error *err)
{
    *out = NULL;
    sr_band_ctx *bc = calloc(1, sizeof *bc);
    if (!bc)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    bc->nstages = m->nstages;
    bc->nsections = m->nsections;
    for (size_t k = 0; k < m->nstages; k++) {
        sr_band b = sr_canopy_total_cds(&m->stages[k].canopy);
        bc->drag[SR_BAND_TYPICAL][k] = 1.0;
        bc->drag[SR_BAND_FAST][k] = b.typ > 0 ? b.lo / b.typ : 1.0;
        bc->drag[SR_BAND_SLOW][k] = b.typ > 0 ? b.hi / b.typ : 1.0;
        sr_loads_canopy_init(&bc->lc[k], &m->stages[k].canopy);
        snprintf(bc->name[k], sizeof bc->name[k], "%s", m->stages[k].name);
    }
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        bc->mass[SR_BAND_TYPICAL][i] = 1.0;
        bc->mass[SR_BAND_FAST][i] = s->mass_hi > 0 ? s->mass_hi / s->mass : 1.0;
        bc->mass[SR_BAND_SLOW][i] = s->mass_lo > 0 ? s->mass_lo / s->mass : 1.0;
    }
    int rc = sr_mission_profile(&bc->ctx, m, po, err);
    if (rc) {
        free(bc);
        return rc;
    }
    *out = bc;
    return SR_OK;
}

void sr_band_ctx_free(sr_band_ctx *bc)
{
    if (!bc)
        return;
    sr_profile_ctx_free(bc->ctx);
    free(bc);
}

const sr_profile_ctx *sr_band_profile(const sr_band_ctx *bc)
{
    return bc->ctx;
}

double sr_band_drag_factor(const sr_band_ctx *bc, size_t k, int end)
{
    return k < bc->nstages && end >= 0 && end < SR_BAND_NRUNS ? bc->drag[end][k] : 1.0;
}

double sr_band_mass_factor(const sr_band_ctx *bc, size_t i, int end)
{
    return i < bc->nsections && end >= 0 && end < SR_BAND_NRUNS ? bc->mass[end][i] : 1.0;
}

const sr_loads_canopy *sr_band_loads_canopy(const sr_band_ctx *bc, size_t k)
{
    return k < bc->nstages ? &bc->lc[k] : NULL;
}

int sr_band_work_new(sr_band_work **w, sr_error *err)
{
    *w = calloc(1, sizeof **w);
    if (!*w)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_profile_work_new(&(*w)->w, err);
    if (rc) {
        free(*w);
        *w = NULL;
    }
    return rc;
}

void sr_band_work_free(sr_band_work *w)
{
    if (!w)
        return;
    sr_profile_work_free(w->w);
    free(w);
}

void sr_band_state(const sr_profile_ctx *ctx, const sr_profile_result *run, size_t k, sr_loads_state *s)
{
    memset(s, 0, sizeof *s);
    const sr_profile_stage *st = &run->stage[k];
    if (k >= run->nstages || !st->deployed || !isfinite(st->speed_line))
        return;
    double rho, a, g, we, wn;
    sr_profile_air(ctx, st->h_line, &rho, &a, &g, &we, &wn);
    s->valid = 1;
    s->v1 = st->speed_line;
    s->path_angle = st->path_line;
    s->rho = rho;
    s->a = a;
    s->g = g;
    s->mass = st->mass;
    s->v_steady = st->rate_top;
    s->cds0 = st->cds_canopy;
    s->d0 = st->d0;
}

int sr_band_run(const sr_band_ctx *bc, const sr_profile_perturb *design, sr_profile_mode mode, sr_band_work *w,
                sr_band_result *r, sr_profile_track *track, sr_error *err)
{
    sr_profile_track *const tracks[SR_BAND_NRUNS] = {track, NULL, NULL};
    return sr_band_run_tracked(bc, design, mode, w, r, tracks, err);
}

int sr_band_descents(const sr_band_ctx *bc, const sr_profile_perturb *design, sr_profile_mode mode,
                     sr_band_work *w, sr_band_result *r, sr_profile_track *const tracks[SR_BAND_NRUNS], sr_error *err)
{
    sr_profile_perturb base;
    if (design)
        base = *design;
    else
        sr_profile_perturb_init(&base);
    sr_profile_work *tmp = NULL;
    int rc = SR_OK;
    if (!w && (rc = sr_profile_work_new(&tmp, err)))
        return rc;
    for (int e = 0; e < SR_BAND_NRUNS && !rc; e++) {
        sr_profile_perturb p = base;
        for (size_t k = 0; k < bc->nstages; k++)
            p.drag_scale[k] *= bc->drag[e][k];
        for (size_t i = 0; i < bc->nsections; i++)
            p.section_mass_scale[i] *= bc->mass[e][i];
        rc = sr_profile_run(bc->ctx, &p, mode, w ? w->w : tmp, &r->run[e], tracks ? tracks[e] : NULL, err);
    }
    r->nstages = bc->nstages;
    for (size_t k = 0; k < SR_MISSION_MAX_STAGES; k++)
        r->loads[k].valid = 0;
    if (tmp)
        sr_profile_work_free(tmp);
    return rc;
}

int sr_band_loads(const sr_band_ctx *bc, sr_profile_mode mode, sr_band_work *w, sr_band_result *r, sr_error *err)
{
    int rc = SR_OK, fast = mode == SR_PROFILE_FAST;
    for (size_t k = 0; k < bc->nstages && !rc; k++) {
        sr_loads_state st[SR_LOADS_NSTATES];
        for (int e = 0; e < SR_BAND_NRUNS; e++) {
            sr_band_state(bc->ctx, &r->run[e], k, &st[e]);
            /* the loads apply the canopy's own drag band themselves: each state
             * carries the candidate's typical drag area */
            st[e].cds0 /= bc->drag[e][k];
        }
        loads_memo *mm = w ? &w->memo[k] : NULL;
        if (mm && mm->valid && mm->fast == fast && memcmp(&mm->lc, &bc->lc[k], sizeof mm->lc) == 0 &&
            memcmp(mm->st, st, sizeof st) == 0) {
            r->loads[k] = mm->out;
            continue;
        }
        rc = sr_loads_evaluate(&bc->lc[k], st, fast, &r->loads[k], err);
        if (rc && err) {
            char msg[sizeof err->msg];
            snprintf(msg, sizeof msg, "%s", err->msg);
            rc = sr_error_set(err, rc, "stage '%s': opening load: %s", bc->name[k], msg);
        }
        if (mm) {
            mm->valid = !rc;
            mm->fast = fast;
            memcpy(&mm->lc, &bc->lc[k], sizeof mm->lc);
            memcpy(mm->st, st, sizeof st);
            mm->out = r->loads[k];
        }
    }
    return rc;
}

int sr_band_run_tracked(const sr_band_ctx *bc, const sr_profile_perturb *design, sr_profile_mode mode,
                        sr_band_work *w, sr_band_result *r, sr_profile_track *const tracks[SR_BAND_NRUNS],
                        sr_error *err)
{
    int rc = sr_band_descents(bc, design, mode, w, r, tracks, err);
    return rc ? rc : sr_band_loads(bc, mode, w, r, err);
}

/* ---- a program's band results (include/sinkrate/analysis.h) ---- */

int sr_band_result_new(sr_band_result **out, sr_error *err)
{
    *out = calloc(1, sizeof **out);
    return *out ? SR_OK : sr_error_set(err, SR_ENOMEM, "out of memory");
}

void sr_band_result_free(sr_band_result *r)
{
    free(r);
}

const sr_profile_result *sr_band_result_run(const sr_band_result *r, int which)
{
    return which >= 0 && which < SR_BAND_NRUNS ? &r->run[which] : NULL;
}

const sr_loads_band *sr_band_result_loads(const sr_band_result *r, size_t k)
{
    return k < r->nstages ? &r->loads[k] : NULL;
}
