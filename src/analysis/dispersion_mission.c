/* dispersion_mission.c - the staged descent as a Monte Carlo sample model. */
#include "analysis/dispersion_mission.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

typedef struct work {
    sr_profile_work *w;
    sr_profile_result r;
} work;

static void *thread_init(const void *ctx)
{
    (void)ctx;
    work *k = malloc(sizeof *k);
    if (!k)
        return NULL;
    if (sr_profile_work_new(&k->w, NULL) != SR_OK) {
        free(k);
        return NULL;
    }
    return k;
}

static void thread_free(void *ws)
{
    work *k = ws;
    sr_profile_work_free(k->w);
    free(k);
}

void sr_disp_mission_map(const sr_disp_mission *dm, const sr_perturb *in, sr_profile_perturb *out)
{
    sr_profile_perturb_init(out);
    for (size_t s = 0; s < dm->m->nstages; s++) {
        out->drag_scale[s] = in->drag_scale[s];
        out->deploy_height[s] = in->deploy_height_offset[s];
        out->deploy_delay[s] = in->deploy_delay_offset[s];
    }
    out->mass_scale = in->mass_scale;
    out->wind_scale = in->wind_speed_scale;
    out->wind_turn = in->wind_dir_offset;
    if (in->wind_speed_offset != 0.0) {
        /* along the mean wind, turned with it (a wind from bearing b moves
         * toward b + pi; turning "from" by d turns "toward" by d) */
        double c = cos(in->wind_dir_offset), s = sin(in->wind_dir_offset);
        double e = dm->along_east * c + dm->along_north * s, n = -dm->along_east * s + dm->along_north * c;
        out->wind_east = in->wind_speed_offset * e;
        out->wind_north = in->wind_speed_offset * n;
    }
    out->start_height = in->start_height_offset;
}

void sr_disp_mission_outcome(const sr_disp_mission *dm, const sr_profile_result *r, sr_landing *out,
                             unsigned *flags)
{
    for (size_t b = 0; b < dm->nbodies; b++) {
        const sr_profile_body *B = &r->body[b];
        sr_landing *L = &out[b];
        L->east = B->east;
        L->north = B->north;
        L->time = B->t_land;
        L->speed = B->rate_land;
        L->energy = 0.0;
        for (size_t i = 0; i < r->nsections; i++) {
            double e = dm->limits.energy_ground ? r->section_energy_ground[i] : r->section_energy[i];
            if (r->section_body[i] == (int)b && e > L->energy)
                L->energy = e;
        }
    }
    sr_loads_band loads[SR_MISSION_MAX_STAGES];
    const sr_loads_band *lp = NULL;
    if (dm->judge_loads) {
        /* the sample's own state at line stretch, over the canopy's growth-exponent and opening-load-factor
         * bands (its drag is the sample's draw) */
        for (size_t k = 0; k < r->nstages; k++) {
            sr_loads_state st[SR_LOADS_NSTATES];
            memset(st, 0, sizeof st);
            sr_band_state(dm->ctx, r, k, &st[0]);
            sr_loads_canopy lc = dm->lc[k];
            lc.cds_ratio[0] = lc.cds_ratio[2] = 1.0;
            lc.d0_ratio[0] = lc.d0_ratio[2] = 1.0;
            /* only the flags are kept: a stage without a limit, or whose load cannot reach it
             * (sr_loads_bound), is not solved and counts as not exceeding, as solving it would */
            double lim = sr_judge_opening_limit(&dm->limits, k);
            if (isnan(lim) || sr_loads_bound(&lc, &st[0]) <= lim)
                loads[k].valid = 0;
            else if (sr_loads_evaluate(&lc, st, 1, &loads[k], NULL) != SR_OK)
                loads[k].valid = 0;
        }
        lp = loads;
    }
    *flags = sr_judge_flags(&dm->limits, r, lp);
}

static int sample(const void *ctx, void *ws, const sr_perturb *p, sr_landing *out, unsigned *flags, sr_error *err)
{
    const sr_disp_mission *dm = ctx;
    work *k = ws;
    sr_profile_perturb pp;
    sr_disp_mission_map(dm, p, &pp);
    int rc = sr_profile_run(dm->ctx, &pp, dm->mode, k->w, &k->r, NULL, err);
    if (rc)
        return rc;
    if (k->r.nbodies != dm->nbodies)
        return sr_error_set(err, SR_ENUMERIC, "the sample landed %zu bodies, the nominal descent %zu", k->r.nbodies,
                            dm->nbodies);
    sr_disp_mission_outcome(dm, &k->r, out, flags);
    return SR_OK;
}

/* Largest upward reach of a deviation: half-width, or 6 sigma for a normal
 * (a 1e-9 tail; beyond it the profile reports the sample out of range). */
static double reach(const sr_dist *d)
{
    switch (d->kind) {
    case SR_DIST_NORMAL:
        return 6.0 * d->sigma;
    case SR_DIST_UNIFORM:
    case SR_DIST_TRIANGULAR:
        return d->hi;
    default:
        return 0.0;
    }
}

int sr_disp_mission_init(sr_disp_mission *dm, const sr_mission *m, const sr_profile_opts *po, int full,
                         sr_error *err)
{
    memset(dm, 0, sizeof *dm);
    dm->m = m;
    dm->mode = full ? SR_PROFILE_FULL : SR_PROFILE_FAST;
    sr_judge_limits_init(&dm->limits, m);
    for (size_t k = 0; k < m->nstages; k++) {
        sr_loads_canopy_init(&dm->lc[k], &m->stages[k].canopy);
        dm->judge_loads |= !isnan(m->limit_rated[k]);
    }
    sr_profile_opts o;
    if (po)
        o = *po;
    else
        sr_profile_opts_init(&o);
    if (m->has_start && m->start_height > 0.0) {
        double need = (reach(&m->unc.start_height) + 200.0) / m->start_height;
        if (need > o.top_margin)
            o.top_margin = need;
    }
    int rc = sr_mission_profile(&dm->ctx, m, &o, err);
    if (rc)
        return rc;
    const sr_profile_result *nom = sr_profile_nominal(dm->ctx);
    dm->nbodies = nom->nbodies;
    if (dm->nbodies < 1 || dm->nbodies > SR_DISP_MAX_BODIES) {
        sr_disp_mission_free(dm);
        return sr_error_set(err, SR_EINVAL, "the mission lands %zu bodies; dispersion handles 1 to %d",
                            dm->nbodies, SR_DISP_MAX_BODIES);
    }
    for (size_t b = 0; b < dm->nbodies; b++)
        sr_mission_set_name(m, nom->body[b].sections, dm->body_name[b], sizeof dm->body_name[b]);
    /* height-averaged wind over the first deployment height, 256 levels */
    double se = 0.0, sn = 0.0, top = m->start_height;
    for (int i = 0; i < 256; i++) {
        double e, n;
        sr_wind_at(&m->wind, top * (i + 0.5) / 256.0, &e, &n);
        se += e;
        sn += n;
    }
    double len = hypot(se, sn);
    if (len > 1e-12) {
        dm->along_east = se / len;
        dm->along_north = sn / len;
    } else {
        /* calm: a wind from the north, moving south */
        dm->along_east = 0.0;
        dm->along_north = -1.0;
    }
    dm->model.nbodies = dm->nbodies;
    dm->model.ctx = dm;
    dm->model.thread_init = thread_init;
    dm->model.thread_free = thread_free;
    dm->model.sample = sample;
    return SR_OK;
}

void sr_disp_mission_free(sr_disp_mission *dm)
{
    if (dm && dm->ctx) {
        sr_profile_ctx_free(dm->ctx);
        dm->ctx = NULL;
    }
}

/* ---- a program's dispersion run (include/sinkrate/analysis.h) ---- */

int sr_disp_mission_run(sr_disp_result **out, const sr_mission *m, size_t n, uint64_t seed, int threads, int full,
                        sr_error *err)
{
    *out = NULL;
    sr_disp_result *res = calloc(1, sizeof *res);
    if (!res)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    sr_disp_mission dm;
    int rc = sr_disp_mission_init(&dm, m, NULL, full, err);
    if (!rc) {
        sr_disp_options o = {.n = n, .seed = seed, .threads = threads};
        rc = sr_disp_run(&dm.model, &m->unc, &o, res, err);
        sr_disp_mission_free(&dm);
    }
    if (rc) {
        free(res);
        return rc;
    }
    *out = res;
    return SR_OK;
}
