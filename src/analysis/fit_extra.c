/* fit_extra.c - what the fit adds around the drag area: the stages of a
 * mission, the catalog band of a fitted coefficient, the
 * wind from the positions, and several flights pooled (the opening: fit_opening.c). */
#include <gsl/gsl_cdf.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_fit.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/fit_int.h"

#define PI 3.14159265358979323846

const char *sr_fit_band_name(sr_fit_band b)
{
    switch (b) {
    case SR_FIT_BAND_INSIDE: return "inside";
    case SR_FIT_BAND_EDGE: return "inside, interval past an edge";
    case SR_FIT_BAND_BELOW: return "below";
    case SR_FIT_BAND_ABOVE: return "above";
    default: return "-";
    }
}

double sr_fit_cd0(const sr_canopy *c, double own)
{
    return own / (c->count * c->cluster_factor * c->s0.typ);
}

sr_fit_band sr_fit_band_of(const sr_canopy *c, double cd0, double lo, double hi)
{
    sr_band b = c->fam.cd0.v;
    if (cd0 < b.lo)
        return SR_FIT_BAND_BELOW;
    if (cd0 > b.hi)
        return SR_FIT_BAND_ABOVE;
    return (lo >= b.lo && hi <= b.hi) ? SR_FIT_BAND_INSIDE : SR_FIT_BAND_EDGE;
}

int sr_fit_stages_from_mission(const sr_mission *m, sr_fit_setup *s, sr_error *err)
{
    if (m->nstages > SR_FIT_MAX_STAGES)
        return sr_error_set(err, SR_EINVAL, "%s: too many stages", m->path);
    s->nstages = m->nstages;
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_stage *g = &m->stages[k];
        sr_fit_stage_spec *sp = &s->stage[k];
        memset(sp, 0, sizeof *sp);
        snprintf(sp->name, sizeof sp->name, "%s", g->name);
        /* the mass as the staged descent counts it: the sections carried and the fabric of every canopy
         * packed on or flying from them (profile_ctx.c) */
        double mass = 0.0, base = 0.0;
        for (size_t i = 0; i < m->nsections; i++)
            if ((g->carries >> i) & 1u) {
                mass += m->sections[i].mass;
                base += m->sections[i].drag_area;
            }
        for (size_t j = 0; j < m->nstages; j++) {
            const sr_stage *o = &m->stages[j];
            if (!(o->canopy.areal_mass > 0.0))
                continue;
            size_t owner = 0;
            while (owner + 1 < SR_MISSION_MAX_SECTIONS && !((o->carries >> owner) & 1u))
                owner++;
            if ((g->carries >> owner) & 1u)
                mass += o->canopy.count * o->canopy.areal_mass * o->canopy.s0.typ;
        }
        sp->mass = mass;
        sp->base_cds = base;
        sp->keep_previous = k > 0 && g->keep_previous && (m->stages[k - 1].carries & g->carries);
        sp->has_canopy = g->has_size;
        sp->canopy = g->canopy;
        sp->deploy = g->deploy;
        sp->deploy_value = g->deploy_value;
        sp->time = NAN;
        if (k > 0 && g->carries != m->stages[k - 1].carries)
            return sr_error_set(err, SR_EINVAL,
                                "%s: stage '%s' carries other sections than the stage before: a log follows one body, "
                                "and the fit needs every stage on the same sections",
                                m->path, g->name);
    }
    return SR_OK;
}

/* ---- wind: the drift under the canopies by height band ---- */

int sr_fit_find_wind(const sr_flightlog *log, sr_fit_result *r, sr_error *err)
{
    (void)err;
    r->nwind = 0;
    for (size_t k = 0; k < r->nstages; k++) {
        const sr_fit_stage *st = &r->stage[k];
        if (!st->fitted)
            continue;
        double htop = NAN, hbot = NAN;
        size_t a0 = 0, a1 = 0;
        for (size_t i = 0; i < log->n; i++)
            if (log->t[i] >= st->t0 && log->t[i] <= st->t1) {
                if (isnan(htop)) {
                    htop = r->smooth[i] - r->ground;
                    a0 = i;
                }
                hbot = r->smooth[i] - r->ground;
                a1 = i + 1;
            }
        if (isnan(htop) || !(htop > hbot))
            continue;
        /* bands of at least 25 m and 3 s, at most eight per stage */
        double band = fmax(25.0, (htop - hbot) / 8.0);
        size_t i = a0;
        while (i < a1 && r->nwind < SR_FIT_MAX_WIND) {
            double top = r->smooth[i] - r->ground;
            size_t j = i;
            while (j < a1 && (top - (r->smooth[j] - r->ground) < band || log->t[j] - log->t[i] < 3.0))
                j++;
            size_t m = j - i;
            if (m >= 10) {
                double c0, ve, vn, c00, c01, c11, ss, hm = 0;
                gsl_fit_linear(log->t + i, 1, log->east + i, 1, m, &c0, &ve, &c00, &c01, &c11, &ss);
                gsl_fit_linear(log->t + i, 1, log->north + i, 1, m, &c0, &vn, &c00, &c01, &c11, &ss);
                for (size_t q = i; q < j; q++)
                    hm += (r->smooth[q] - r->ground) / (double)m;
                sr_fit_wind *wr = &r->wind[r->nwind++];
                wr->h = hm;
                wr->east = ve;
                wr->north = vn;
                wr->speed = hypot(ve, vn);
                /* the bearing it blows FROM, clockwise from north */
                double from = atan2(-ve, -vn);
                wr->from = from < 0 ? from + 2 * PI : from;
                wr->stage = (int)k;
            }
            i = j;
        }
    }
    /* ascending height, as a wind table is read */
    for (size_t x = 1; x < r->nwind; x++)
        for (size_t y = x; y > 0 && r->wind[y - 1].h > r->wind[y].h; y--) {
            sr_fit_wind tmp = r->wind[y];
            r->wind[y] = r->wind[y - 1];
            r->wind[y - 1] = tmp;
        }
    return SR_OK;
}

/* ---- several flights ---- */

int sr_fit_pool(const sr_fit_result *const *r, size_t nlogs, size_t stage, const sr_fit_stage_spec *spec,
                double conf, sr_fit_pooled *out, sr_error *err)
{
    memset(out, 0, sizeof *out);
    double sw = 0, swx = 0, mindof = INFINITY;
    size_t k = 0;
    double x[64], wt[64];
    for (size_t i = 0; i < nlogs && k < 64; i++) {
        if (stage >= r[i]->nstages || !r[i]->stage[stage].fitted)
            continue;
        const sr_fit_stage *st = &r[i]->stage[stage];
        /* on the log scale of the own drag area: half the log-width of its interval over the quantile */
        double tq = gsl_cdf_tdist_Pinv(0.5 + 0.5 * conf, st->dof);
        double se = (log(st->own_hi) - log(st->own_lo)) / (2.0 * tq);
        if (!(se > 0))
            continue;
        x[k] = log(st->own);
        wt[k] = 1.0 / (se * se);
        sw += wt[k];
        swx += wt[k] * x[k];
        mindof = fmin(mindof, st->dof);
        k++;
    }
    if (k == 0)
        return sr_error_set(err, SR_EINVAL, "no flight has a fitted stage %zu to pool", stage + 1);
    double mean = swx / sw, chi2 = 0;
    for (size_t i = 0; i < k; i++)
        chi2 += wt[i] * (x[i] - mean) * (x[i] - mean);
    out->nlogs = k;
    out->birge = k > 1 ? sqrt(chi2 / (double)(k - 1)) : 1.0;
    double se = sqrt(1.0 / sw) * fmax(1.0, out->birge);
    /* the flights disagreeing: the quantile with k - 1 degrees of freedom, else the flights' own */
    double dof = k > 1 && out->birge > 1.0 ? (double)(k - 1) : mindof;
    double tq = gsl_cdf_tdist_Pinv(0.5 + 0.5 * conf, dof);
    out->own = exp(mean);
    out->own_lo = exp(mean - tq * se);
    out->own_hi = exp(mean + tq * se);
    out->cd0 = out->cd0_lo = out->cd0_hi = NAN;
    out->band = SR_FIT_BAND_NONE;
    if (spec && spec->has_canopy) {
        out->cd0 = sr_fit_cd0(&spec->canopy, out->own);
        out->cd0_lo = sr_fit_cd0(&spec->canopy, out->own_lo);
        out->cd0_hi = sr_fit_cd0(&spec->canopy, out->own_hi);
        out->band = sr_fit_band_of(&spec->canopy, out->cd0, out->cd0_lo, out->cd0_hi);
    }
    if (out->own_hi / out->own_lo > SR_FIT_MAX_CI_RATIO)
        return sr_error_set(err, SR_ENUMERIC, "the pooled interval of stage %zu spans a factor %.3g: not determined",
                            stage + 1, out->own_hi / out->own_lo);
    return SR_OK;
}
