/* failcase.c - failure cases in every attitude, judged at the worse one. */
#include "analysis/failcase.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

size_t sr_failcase_attitudes(const sr_mission *m, sr_bluff_attitude out[SR_FAILCASE_MAX_ATTITUDES])
{
    int tumble = 0, end_on = 0;
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        if (!s->has_body)
            continue;
        tumble |= s->shape == SR_BLUFF_CYLINDER || s->shape == SR_BLUFF_DISK;
        end_on |= s->stable_end_on;
    }
    size_t n = 0;
    out[n++] = SR_ATTITUDE_BROADSIDE;
    if (tumble)
        out[n++] = SR_ATTITUDE_TUMBLING;
    if (end_on)
        out[n++] = SR_ATTITUDE_END_ON;
    return n;
}

int sr_failcase_run(const sr_mission *m, unsigned failed, const sr_judge_limits *l, sr_judge_basis basis,
                    const sr_profile_opts *po, sr_failcase_result *out, sr_error *err)
{
    memset(out, 0, sizeof *out);
    out->failed = failed;
    out->nattitudes = sr_failcase_attitudes(m, out->attitude);
    sr_band_work *w = NULL;
    int rc = sr_band_work_new(&w, err);
    for (size_t a = 0; a < out->nattitudes && !rc; a++) {
        sr_profile_opts o;
        if (po)
            o = *po;
        else
            sr_profile_opts_init(&o);
        o.failed = failed;
        o.attitude = out->attitude[a];
        sr_band_ctx *bc = NULL;
        rc = sr_band_ctx_new(&bc, m, &o, err);
        if (!rc)
            rc = sr_band_run(bc, NULL, SR_PROFILE_FULL, w, &out->band[a], NULL, err);
        sr_band_ctx_free(bc);
    }
    sr_band_work_free(w);
    if (rc)
        return rc;
    const sr_band_result *bands[SR_FAILCASE_MAX_ATTITUDES];
    double fastest = -1.0;
    for (size_t a = 0; a < out->nattitudes; a++) {
        bands[a] = &out->band[a];
        for (size_t i = 0; i < m->nsections; i++) {
            double v = 0.0, en = 0.0;
            for (int e = 0; e < SR_BAND_NRUNS; e++) {
                const sr_profile_result *r = &out->band[a].run[e];
                v = fmax(v, r->section_rate[i]);
                en = fmax(en, l->energy_ground ? r->section_energy_ground[i] : r->section_energy[i]);
            }
            out->impact[a][i] = v;
            out->energy[a][i] = en;
        }
        /* the worse attitude: the one closest to (or furthest past) a limit; without limits the fastest landing */
        sr_verdict v;
        sr_judge_band(l, &out->band[a], basis, &v);
        double top = v.binding >= 0 ? v.row[v.binding].ratio : 0.0;
        if (v.binding < 0)
            for (int e = 0; e < SR_BAND_NRUNS; e++)
                top = fmax(top, out->band[a].run[e].max_rate);
        if (top > fastest) {
            fastest = top;
            out->worse = (int)a;
        }
    }
    sr_judge_bands(l, bands, out->nattitudes, basis, &out->verdict);
    return SR_OK;
}

/* ---- a program's failure case (include/sinkrate/analysis.h) ---- */

int sr_failcase_result_new(sr_failcase_result **out, sr_error *err)
{
    *out = calloc(1, sizeof **out);
    return *out ? SR_OK : sr_error_set(err, SR_ENOMEM, "out of memory");
}

void sr_failcase_result_free(sr_failcase_result *f)
{
    free(f);
}

const sr_verdict *sr_failcase_result_verdict(const sr_failcase_result *f)
{
    return &f->verdict;
}

size_t sr_failcase_result_attitudes(const sr_failcase_result *f)
{
    return f->nattitudes;
}

sr_bluff_attitude sr_failcase_result_attitude(const sr_failcase_result *f, size_t i)
{
    return i < f->nattitudes ? f->attitude[i] : SR_ATTITUDE_BROADSIDE;
}

const sr_band_result *sr_failcase_result_band(const sr_failcase_result *f, size_t i)
{
    return i < f->nattitudes ? &f->band[i] : NULL;
}

size_t sr_failcase_result_worse(const sr_failcase_result *f)
{
    return (size_t)(f->worse > 0 ? f->worse : 0);
}
