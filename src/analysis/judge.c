/* judge.c - every limit of a mission against band runs or one descent. */
#include "analysis/judge.h"

#include <math.h>
#include <string.h>

#include "physics/plausible.h"

const char *sr_judge_kind_name(sr_limit_kind k)
{
    switch (k) {
    case SR_JUDGE_SPEED: return "touchdown speed";
    case SR_JUDGE_ENERGY: return "landing energy";
    case SR_JUDGE_TIME: return "descent time";
    case SR_JUDGE_DRIFT: return "drift";
    case SR_JUDGE_DEPLOY_Q: return "deployment pressure";
    case SR_JUDGE_MACH: return "Mach envelope";
    case SR_JUDGE_OPENING: return "opening load";
    default: return "?";
    }
}

void sr_judge_limits_init(sr_judge_limits *l, const sr_mission *m)
{
    memset(l, 0, sizeof *l);
    l->speed = m->limit_speed;
    l->energy = m->limit_energy;
    l->time = m->limit_time;
    l->drift = m->limit_drift;
    l->deploy_q = m->limit_deploy_q;
    l->energy_ground = m->energy_ground;
    l->nstages = m->nstages;
    l->nsections = m->nsections;
    l->design_factor = m->limit_design_factor;
    for (size_t k = 0; k < SR_MISSION_MAX_STAGES; k++) {
        l->mach_max[k] = k < m->nstages ? m->stages[k].canopy.fam.mach_max : NAN;
        l->rated[k] = k < m->nstages ? m->limit_rated[k] : NAN;
    }
}

/* The value a limit looks at in one run (NaN: none, e.g. a stage that did not deploy). */
static double value_of(const sr_judge_limits *l, sr_limit_kind kind, int idx, const sr_profile_result *r)
{
    switch (kind) {
    case SR_JUDGE_SPEED: return r->max_rate;
    case SR_JUDGE_ENERGY: return l->energy_ground ? r->section_energy_ground[idx] : r->section_energy[idx];
    case SR_JUDGE_TIME: return r->descent_time;
    case SR_JUDGE_DRIFT: return r->max_drift;
    case SR_JUDGE_DEPLOY_Q: return r->stage[idx].deployed ? r->stage[idx].q_deploy : NAN;
    case SR_JUDGE_MACH: return r->stage[idx].deployed ? r->stage[idx].mach_deploy : NAN;
    default: return NAN;
    }
}

static double limit_of(const sr_judge_limits *l, sr_limit_kind kind, int idx)
{
    switch (kind) {
    case SR_JUDGE_SPEED: return l->speed;
    case SR_JUDGE_ENERGY: return l->energy;
    case SR_JUDGE_TIME: return l->time;
    case SR_JUDGE_DRIFT: return l->drift;
    case SR_JUDGE_DEPLOY_Q: return l->deploy_q;
    case SR_JUDGE_MACH: return l->mach_max[idx] > 0 ? l->mach_max[idx] : NAN;
    case SR_JUDGE_OPENING:
        return l->rated[idx] > 0 && l->design_factor >= 1 ? l->rated[idx] / l->design_factor : NAN;
    default: return NAN;
    }
}

/* NaN-skipping maximum */
static double worst(double a, double b)
{
    return isnan(a) ? b : isnan(b) ? a : fmax(a, b);
}

typedef struct slot {
    sr_limit_kind kind;
    int index;
} slot;

/* The rows a mission has, in report order. */
static size_t slots(const sr_judge_limits *l, slot *s)
{
    size_t n = 0;
    sr_limit_kind whole[] = {SR_JUDGE_SPEED, SR_JUDGE_TIME, SR_JUDGE_DRIFT};
    if (!isnan(l->speed))
        s[n++] = (slot){SR_JUDGE_SPEED, -1};
    if (!isnan(l->energy))
        for (size_t i = 0; i < l->nsections; i++)
            s[n++] = (slot){SR_JUDGE_ENERGY, (int)i};
    for (size_t j = 1; j < 3; j++)
        if (!isnan(limit_of(l, whole[j], -1)))
            s[n++] = (slot){whole[j], -1};
    sr_limit_kind per_stage[] = {SR_JUDGE_DEPLOY_Q, SR_JUDGE_MACH, SR_JUDGE_OPENING};
    for (size_t j = 0; j < 3; j++)
        for (size_t k = 0; k < l->nstages; k++)
            if (!isnan(limit_of(l, per_stage[j], (int)k)))
                s[n++] = (slot){per_stage[j], (int)k};
    return n;
}

void sr_judge_bands(const sr_judge_limits *l, const sr_band_result *const *b, size_t n, sr_judge_basis basis,
                    sr_verdict *v)
{
    memset(v, 0, sizeof *v);
    v->basis = basis;
    v->binding = -1;
    slot s[SR_JUDGE_MAX_ROWS];
    size_t ns = slots(l, s);
    for (size_t i = 0; i < ns; i++) {
        sr_judge_row *row = &v->row[v->nrows];
        row->kind = s[i].kind;
        row->index = s[i].index;
        row->limit = limit_of(l, s[i].kind, s[i].index);
        double typ = NAN, end = NAN;
        for (size_t j = 0; j < n; j++) {
            if (s[i].kind == SR_JUDGE_OPENING) {
                const sr_loads_band *lb = &b[j]->loads[s[i].index];
                if (lb->valid) {
                    typ = worst(typ, lb->typ.force);
                    end = worst(end, lb->hi.force);
                }
                continue;
            }
            typ = worst(typ, value_of(l, s[i].kind, s[i].index, &b[j]->run[SR_BAND_TYPICAL]));
            for (int e = 0; e < SR_BAND_NRUNS; e++)
                end = worst(end, value_of(l, s[i].kind, s[i].index, &b[j]->run[e]));
        }
        row->typical = typ;
        row->band_end = worst(end, typ);
        row->known = !isnan(row->band_end);
        row->judged = basis == SR_JUDGE_TYPICAL ? row->typical : row->band_end;
        row->margin = row->limit - row->judged;
        row->ratio = row->judged / row->limit;
        if (s[i].kind == SR_JUDGE_MACH) {
            /* the Mach judgement every command shares (physics/plausible.h) */
            row->exceeded_typical = row->known && (sr_mach_judge(row->typical, row->limit) & SR_MACH_OVER_ENVELOPE);
            row->exceeded_band_end = row->known && (sr_mach_judge(row->band_end, row->limit) & SR_MACH_OVER_ENVELOPE);
        } else {
            row->exceeded_typical = row->known && row->typical > row->limit;
            row->exceeded_band_end = row->known && row->band_end > row->limit;
        }
        row->exceeded = basis == SR_JUDGE_TYPICAL ? row->exceeded_typical : row->exceeded_band_end;
        v->exceeded += row->exceeded;
        v->exceeded_band_end += row->exceeded_band_end;
        if (row->known && (v->binding < 0 || row->ratio > v->row[v->binding].ratio))
            v->binding = (int)v->nrows;
        v->nrows++;
    }
}

void sr_judge_band(const sr_judge_limits *l, const sr_band_result *b, sr_judge_basis basis, sr_verdict *v)
{
    sr_judge_bands(l, &b, 1, basis, v);
}

double sr_judge_opening_limit(const sr_judge_limits *l, size_t k)
{
    return limit_of(l, SR_JUDGE_OPENING, (int)k);
}

unsigned sr_judge_flags(const sr_judge_limits *l, const sr_profile_result *r, const sr_loads_band *loads)
{
    slot s[SR_JUDGE_MAX_ROWS];
    size_t ns = slots(l, s);
    unsigned f = 0;
    for (size_t i = 0; i < ns; i++) {
        double v;
        if (s[i].kind == SR_JUDGE_OPENING)
            v = loads && loads[s[i].index].valid ? loads[s[i].index].hi.force : NAN;
        else
            v = value_of(l, s[i].kind, s[i].index, r);
        double lim = limit_of(l, s[i].kind, s[i].index);
        int over = s[i].kind == SR_JUDGE_MACH ? (sr_mach_judge(v, lim) & SR_MACH_OVER_ENVELOPE) != 0 : v > lim;
        if (over)
            f |= 1u << s[i].kind;
    }
    return f;
}

/* ---- a program's limits and verdicts (include/sinkrate/analysis.h) ---- */

sr_quantity sr_judge_kind_quantity(sr_limit_kind k)
{
    switch (k) {
    case SR_JUDGE_SPEED: return SR_Q_SPEED;
    case SR_JUDGE_ENERGY: return SR_Q_ENERGY;
    case SR_JUDGE_TIME: return SR_Q_TIME;
    case SR_JUDGE_DRIFT: return SR_Q_LENGTH;
    case SR_JUDGE_DEPLOY_Q: return SR_Q_PRESSURE;
    case SR_JUDGE_OPENING: return SR_Q_FORCE;
    default: return SR_Q_NONE;
    }
}

const char *sr_judge_row_subject(const sr_mission *m, const sr_judge_row *row)
{
    size_t i = (size_t)row->index;
    switch (row->kind) {
    case SR_JUDGE_ENERGY: return row->index >= 0 && i < m->nsections ? m->sections[i].name : "";
    case SR_JUDGE_DEPLOY_Q:
    case SR_JUDGE_MACH:
    case SR_JUDGE_OPENING: return row->index >= 0 && i < m->nstages ? m->stages[i].name : "";
    default: return "";
    }
}

int sr_judge_limits_new(sr_judge_limits **out, const sr_mission *m, sr_error *err)
{
    *out = malloc(sizeof **out);
    if (!*out)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    sr_judge_limits_init(*out, m);
    return SR_OK;
}

void sr_judge_limits_free(sr_judge_limits *l)
{
    free(l);
}

int sr_verdict_new(sr_verdict **out, sr_error *err)
{
    *out = calloc(1, sizeof **out);
    if (!*out)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    (*out)->binding = -1;
    return SR_OK;
}

void sr_verdict_free(sr_verdict *v)
{
    free(v);
}

size_t sr_verdict_rows(const sr_verdict *v)
{
    return v->nrows;
}

const sr_judge_row *sr_verdict_row(const sr_verdict *v, size_t i)
{
    return i < v->nrows ? &v->row[i] : NULL;
}

int sr_verdict_binding(const sr_verdict *v)
{
    return v->binding;
}

int sr_verdict_exceeded(const sr_verdict *v)
{
    return v->exceeded;
}

sr_judge_basis sr_verdict_basis(const sr_verdict *v)
{
    return v->basis;
}
