/* design.c - the design search (design.h): combinations, the exact size of
 * the last stage, the grid and its refinement, the Pareto samples, the
 * confirmation of the best designs by the full integration, the risk check. */
#include "analysis/design.h"

#include <math.h>
#include <omp.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/band.h"
#include "analysis/dispersion.h"
#include "analysis/dispersion_mission.h"
#include "files/mission_write.h"

#define NS SR_MISSION_MAX_STAGES
#define PI 3.14159265358979323846
#define MAX_DIMS (2 * NS)
#define PARETO_SAMPLES 6   /* sizes of the last stage between its least and its largest feasible one */
#define PARETO_MAX 200

static const char *const QNAMES[SR_DQ_N] = {"speed", "drift", "mass", "volume", "time"};

const char *sr_design_quantity_name(sr_design_quantity q)
{
    return q >= 0 && q < SR_DQ_N ? QNAMES[q] : "?";
}

int sr_design_quantity_parse(const char *s, sr_design_quantity *q)
{
    for (int i = 0; i < SR_DQ_N; i++)
        if (strcmp(s, QNAMES[i]) == 0) {
            *q = (sr_design_quantity)i;
            return SR_OK;
        }
    return SR_EINVAL;
}

double sr_design_quantity_of(const sr_design_point *p, sr_design_quantity q)
{
    switch (q) {
    case SR_DQ_SPEED: return p->speed;
    case SR_DQ_DRIFT: return p->drift;
    case SR_DQ_MASS: return p->mass;
    case SR_DQ_VOLUME: return p->volume;
    case SR_DQ_TIME: return p->time;
    default: return NAN;
    }
}

void sr_design_opts_init(sr_design_opts *o)
{
    memset(o, 0, sizeof *o);
    o->basis = SR_JUDGE_BAND_END;
    o->pareto_x = SR_DQ_SPEED;
    o->pareto_y = SR_DQ_DRIFT;
}

size_t sr_design_default_ranges(sr_mission *m)
{
    size_t n = 0;
    for (size_t k = 0; k < m->nstages; k++) {
        sr_design_stage *s = &m->design.stage[k];
        const sr_stage *st = &m->stages[k];
        if (sr_design_stage_varies(s) || st->file[0] || !st->has_size || st->canopy.opening == SR_OPENING_MEASURED_LOAD)
            continue;
        double d = st->canopy.d0.typ;
        s->sizes = SR_DSIZE_RANGE;
        s->dmin = fmax(0.5 * d, SR_CANOPY_SIZE_MIN);
        s->dmax = fmin(2.0 * d, SR_CANOPY_SIZE_MAX);
        n++;
    }
    return n;
}

/* ---- numbers as written ---- */

/* x to SR_DESIGN_DIGITS significant digits, rounded up (up > 0), down (< 0) or to the nearest */
static double round_sig(double x, int up)
{
    if (!(x > 0.0) || !isfinite(x))
        return x;
    double e = floor(log10(x));
    double sc = pow(10.0, SR_DESIGN_DIGITS - 1 - e);
    double t = x * sc, r = nearbyint(t);
    if (fabs(t - r) > 1e-7 * fmax(1.0, fabs(t)))
        r = up > 0 ? ceil(t) : up < 0 ? floor(t) : r;
    return sc >= 1.0 ? r / sc : r * (1.0 / sc);
}

static double round_height(double h)
{
    return nearbyint(h * 10.0) / 10.0;
}

static double area_of(double d)
{
    return 0.25 * PI * d * d;
}

/* ---- combinations and their search state ---- */

typedef struct dim {
    int stage;           /* mission stage */
    int height;          /* 1: deployment height, 0: size */
    int continuous;      /* refined around the best */
    size_t n;
    double *v;           /* grid values */
    double lo, hi;       /* the range */
    double spacing;      /* between grid points (log for sizes, m for heights) */
} dim;

typedef struct slice {
    double d0[NS], h[NS];
    double objective, ratio;
    double next[2];      /* the second and third highest ratios: ties broken by margin to them */
    double speed, energy, time, drift, mass, volume;
    int feasible, evaluated;
    sr_design_limit worst;
    char note[160];      /* why it could not be flown */
    size_t runs;         /* band runs it took (the last stage's size solved) */
    int solved;          /* the last stage's size was solved for the landing rows */
    int chain;           /* in the grid right after a slice differing only in the last dimension: its solve
                          * starts from that one's answer (the slices of a chain run in order on one thread) */
} slice;

typedef struct cstate {
    sr_design_combo *out;
    sr_design_objective objective;
    sr_judge_basis basis;
    sr_mission *m;               /* the combination at its reference sizes and heights */
    sr_band_ctx *bc;
    sr_judge_limits lim;
    int idx[NS];                 /* mission stage -> index in m, -1 dropped */
    int L;                       /* the last kept stage when its size is searched, else -1 */
    size_t Ln;                   /* its sizes from a list, within the bay (0: a range) */
    double Lv[SR_DESIGN_MAX_SIZES];
    double Llo, Lhi;             /* its size range, the bay's limit applied (Lhi < Llo: nothing fits) */
    int Lcapped;                 /* the bay holds less than the range's largest size */
    double dref[NS], href[NS];
    double dfix[NS], hfix[NS];   /* values of the stages that do not vary (NaN for heights not triggered) */
    double areal[NS];            /* cloth areal mass of one canopy (NaN: the recalled cloth) */
    sr_pack_kind pack[NS];
    double bay[NS];
    size_t ndims;
    dim d[MAX_DIMS];
    double step[MAX_DIMS];       /* refinement step of each continuous dimension */
    slice *s;
    size_t ns, cap;
    size_t best;                 /* index of the best slice */
    double pilot;                /* the last stage's size at the pilot slice (start of every solve) */
    int broken;                  /* the combination could not be built */
    size_t confirmed;            /* designs of it judged with the full integration */
    char why[256];
} cstate;

typedef struct worker {
    sr_band_work *w;
    sr_band_result *r;
    sr_verdict v;
    size_t runs;         /* candidates judged (band runs) */
    /* the candidate whose descents r holds (the landing's last try is often the candidate itself) */
    const void *held_c;
    sr_profile_perturb held;
} worker;

static int worker_init(worker *wk, sr_error *err)
{
    memset(wk, 0, sizeof *wk);
    wk->r = malloc(sizeof *wk->r);
    if (!wk->r)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    return sr_band_work_new(&wk->w, err);
}

static void worker_free(worker *wk)
{
    sr_band_work_free(wk->w);
    free(wk->r);
}

static int stage_varies_size(const sr_design_stage *s)
{
    return s->sizes != SR_DSIZE_FIXED;
}

/* The edit that writes a design as a mission. */
static void edit_of(const sr_mission *m, const sr_design_point *p, const sr_design_opts *o, sr_mission_edit *e)
{
    sr_mission_edit_init(e);
    e->target = o->target;
    e->header = o->header;
    for (size_t k = 0; k < m->nstages; k++) {
        if (!((p->present >> k) & 1u)) {
            e->dropped |= 1u << k;
            continue;
        }
        e->stage[k].family = p->family[k];
        e->stage[k].count = p->count[k];
        if (isfinite(p->d0[k]))
            e->stage[k].d0 = p->d0[k];
        if (isfinite(p->height[k]) && m->stages[k].deploy == SR_DEPLOY_ALTITUDE &&
            p->height[k] != m->stages[k].deploy_value)
            e->stage[k].height = p->height[k];
        if (!m->design.stage[k].height && !stage_varies_size(&m->design.stage[k]) &&
            !m->design.stage[k].nfamilies && !m->design.stage[k].ncounts) {
            /* a stage that does not vary stays exactly as written */
            e->stage[k].family = NULL;
            e->stage[k].count = 0;
            e->stage[k].d0 = NAN;
        }
    }
}

/* The design's mission: its text, read back as the file will be read. */
static int design_mission(const sr_mission *m, const sr_yaml *y, const sr_catalog *cat, const sr_design_opts *o,
                          const sr_design_point *p, sr_mission **out, char **text, size_t *len, sr_error *err)
{
    sr_mission_edit e;
    edit_of(m, p, o, &e);
    *out = NULL;
    int rc = sr_mission_write(m, y, &e, text, len, err);
    if (rc)
        return rc;
    sr_mission *dm = malloc(sizeof *dm);
    if (!dm) {
        free(*text);
        *text = NULL;
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    if ((rc = sr_mission_load_text(dm, o->target ? o->target : m->path, *text, *len, cat, err))) {
        free(dm);
        free(*text);
        *text = NULL;
        return rc;
    }
    *out = dm;
    return SR_OK;
}

static void mission_release(sr_mission *dm)
{
    if (dm) {
        sr_mission_release(dm);
        free(dm);
    }
}

/* Fill a point's packing, bays and recovery mass from its sizes. */
static void pack_point(const cstate *c, sr_design_point *p)
{
    p->mass = p->mass_hi = p->volume = 0.0;
    for (size_t k = 0; k < NS; k++) {
        p->bay[k] = NAN;
        if (!((p->present >> k) & 1u))
            continue;
        sr_pack_canopy(area_of(p->d0[k]), p->count[k], c->areal[k], c->pack[k], &p->pack[k]);
        p->bay[k] = c->bay[k];
        p->mass += p->pack[k].mass.typ;
        p->mass_hi += p->pack[k].mass.hi;
        p->volume += p->pack[k].volume.typ;
    }
}

/* The judged touchdown speed, energy, time and drift of band runs. */
static void judged_values(const sr_band_result *r, sr_judge_basis basis, int energy_ground, double *speed,
                          double *energy, double *time, double *drift)
{
    *speed = *energy = *time = *drift = 0.0;
    for (int e = 0; e < SR_BAND_NRUNS; e++) {
        if (basis == SR_JUDGE_TYPICAL && e != SR_BAND_TYPICAL)
            continue;
        const sr_profile_result *p = &r->run[e];
        *speed = fmax(*speed, p->max_rate);
        *energy = fmax(*energy, energy_ground ? p->max_energy_ground : p->max_energy);
        *time = fmax(*time, p->descent_time);
        *drift = fmax(*drift, p->max_drift);
    }
}

/* The worst limit of a verdict and of the bays: the highest ratio. */
static sr_design_limit worst_of(const sr_verdict *v, const sr_design_point *p, const int *idx)
{
    sr_design_limit w = {-1, -1, 0.0};
    for (size_t i = 0; i < v->nrows; i++) {
        const sr_judge_row *row = &v->row[i];
        if (!row->known)
            continue;
        double r = row->exceeded && !(row->ratio > 1.0) ? 1.0 + 1e-12 : row->ratio; /* Mach: the shared judgement */
        if (w.row < 0 && w.stage < 0 ? 1 : r > w.ratio) {
            w.row = (int)i;
            w.stage = -1;
            w.ratio = r;
        }
    }
    for (size_t k = 0; k < NS; k++) {
        if (!((p->present >> k) & 1u) || !(p->bay[k] > 0.0))
            continue;
        double r = p->pack[k].volume.hi / p->bay[k];
        if ((w.row < 0 && w.stage < 0) || r > w.ratio) {
            w.row = -1;
            w.stage = idx ? idx[k] : (int)k;
            w.ratio = r;
        }
    }
    return w;
}

/* The second and third highest ratios over the rows and bays (below the worst). */
static void next_ratios(const sr_verdict *v, const sr_design_point *p, double worst, double next[2])
{
    double top[3] = {-1.0, -1.0, -1.0};
    size_t n = v->nrows;
    for (size_t i = 0; i < n + NS; i++) {
        double r;
        if (i < n) {
            if (!v->row[i].known)
                continue;
            r = v->row[i].ratio;
        } else {
            size_t k = i - n;
            if (!((p->present >> k) & 1u) || !(p->bay[k] > 0.0))
                continue;
            r = p->pack[k].volume.hi / p->bay[k];
        }
        for (int j = 0; j < 3; j++)
            if (r > top[j]) {
                for (int t = 2; t > j; t--)
                    top[t] = top[t - 1];
                top[j] = r;
                break;
            }
    }
    (void)worst;
    next[0] = top[1];
    next[1] = top[2];
}

static int bays_fit(const sr_design_point *p)
{
    for (size_t k = 0; k < NS; k++)
        if (((p->present >> k) & 1u) && p->bay[k] > 0.0 && p->pack[k].volume.hi > p->bay[k])
            return 0;
    return 1;
}

static double objective_of(sr_design_objective obj, const sr_design_point *p)
{
    return obj == SR_DESIGN_VOLUME ? p->volume : obj == SR_DESIGN_DRIFT ? p->drift : p->mass;
}

/* ---- one candidate on the fast path ---- */

typedef struct search {
    const sr_mission *m;
    const sr_yaml *y;
    const sr_catalog *cat;
    const sr_design_opts *o;
    sr_design_result *res;
    cstate *cs;
    size_t nc;
    size_t done, total;
    /* locks of this run (named critical sections would be process-wide symbols) */
    omp_lock_t *fail_lock, *progress_lock;
} search;

/* The first failure of a parallel loop is kept; the others are dropped. */
static void note_fail(const search *S, int *fail, sr_error *first, const sr_error *e)
{
    omp_set_lock(S->fail_lock);
    if (!*fail) {
        *fail = 1;
        *first = *e;
    }
    omp_unset_lock(S->fail_lock);
}

static void point_of(const cstate *c, const double *d0, const double *h, sr_design_point *p)
{
    memset(p, 0, sizeof *p);
    p->present = c->out->present;
    for (size_t k = 0; k < NS; k++) {
        snprintf(p->family[k], sizeof p->family[k], "%s", c->out->family[k]);
        p->count[k] = c->out->count[k];
        p->d0[k] = d0[k];
        p->height[k] = h[k];
        p->stage_index[k] = c->idx[k];
    }
}

static void perturb_of(const cstate *c, const double *d0, const double *h, sr_profile_perturb *pp)
{
    sr_profile_perturb_init(pp);
    for (size_t k = 0; k < NS; k++) {
        int i = c->idx[k];
        if (i < 0)
            continue;
        if (c->dref[k] > 0.0 && isfinite(d0[k]))
            pp->area_scale[i] = (d0[k] / c->dref[k]) * (d0[k] / c->dref[k]);
        if (isfinite(h[k]) && isfinite(c->href[k]))
            pp->deploy_height[i] = h[k] - c->href[k];
    }
}

/* The landing rows (touchdown speed, landing energy): the highest ratio and
 * whether one is exceeded. */
static void landing_rows(const sr_verdict *v, double *ratio, int *exceeded, int *row)
{
    *ratio = 0.0;
    *exceeded = 0;
    *row = -1;
    for (size_t i = 0; i < v->nrows; i++) {
        const sr_judge_row *r = &v->row[i];
        if (!r->known || (r->kind != SR_JUDGE_SPEED && r->kind != SR_JUDGE_ENERGY))
            continue;
        *exceeded |= r->exceeded;
        if (*row < 0 || r->ratio > *ratio) {
            *ratio = r->ratio;
            *row = (int)i;
        }
    }
}

/* The size of the last stage that brings the binding landing row exactly to
 * its limit, from one descent with that stage at size d: the drag balance
 * 2 m g = rho v^2 CdS at the ground, inverted for the stage's area with its
 * fabric mass (the inversion of physics/descent.h, with the other canopies'
 * drag taken from the run). NaN when it does not apply (the body does not
 * land steady under the stage). */
static double landing_seed(const cstate *c, const sr_band_result *r, const sr_verdict *v, int row, double d)
{
    if (row < 0)
        return NAN;
    const sr_judge_row *jr = &v->row[row];
    int e = SR_BAND_TYPICAL;
    if (v->basis == SR_JUDGE_BAND_END) {
        double best = -1.0;
        for (int k = 0; k < SR_BAND_NRUNS; k++) {
            const sr_profile_result *p = &r->run[k];
            double x = jr->kind == SR_JUDGE_SPEED ? p->max_rate
                       : c->lim.energy_ground     ? p->section_energy_ground[jr->index]
                                                  : p->section_energy[jr->index];
            if (x > best) {
                best = x;
                e = k;
            }
        }
    }
    const sr_profile_result *p = &r->run[e];
    int iL = c->idx[c->L];
    size_t b = 0;
    if (jr->kind == SR_JUDGE_SPEED) {
        for (size_t i = 1; i < p->nbodies; i++)
            if (p->body[i].rate_land > p->body[b].rate_land)
                b = i;
    } else {
        if (p->section_body[jr->index] < 0)
            return NAN;
        b = (size_t)p->section_body[jr->index];
    }
    const sr_profile_body *bd = &p->body[b];
    if (!bd->steady_land || !((bd->open >> iL) & 1u) || !(bd->rate_land > 0.0))
        return NAN;
    double target2;
    if (jr->kind == SR_JUDGE_SPEED) {
        target2 = jr->limit * jr->limit;
    } else {
        double v0 = p->section_rate[jr->index], en = p->section_energy[jr->index];
        if (!(v0 > 0.0 && en > 0.0))
            return NAN;
        double meff = 2.0 * en / (v0 * v0);
        target2 = 2.0 * jr->limit / meff;
        if (c->lim.energy_ground)
            target2 -= p->wind_surface * p->wind_surface;
    }
    if (!(target2 > 0.0))
        return NAN;
    double rho, a, g, we, wn;
    sr_profile_air(sr_band_profile(c->bc), 0.0, &rho, &a, &g, &we, &wn);
    const sr_stage *st = &c->m->stages[iL];
    double S = area_of(d), m = bd->mass;
    double C_tot = 2.0 * m * g / (rho * bd->rate_land * bd->rate_land);
    double C_L = st->canopy.count * p->stage[iL].cds_canopy;
    double cL = C_L / S, C_other = C_tot - C_L;
    double sigma = st->canopy.areal_mass > 0.0 ? st->canopy.count * st->canopy.areal_mass : 0.0;
    double m0 = m - sigma * S;
    double num = 2.0 * m0 * g - rho * target2 * C_other, den = rho * target2 * cL - 2.0 * sigma * g;
    if (!(num > 0.0 && den > 0.0))
        return NAN;
    double S1 = num / den;
    return sqrt(4.0 * S1 / PI);
}

/* Descents at size d of the last stage; the landing rows judged. */
static int try_landing(const cstate *c, worker *wk, const double *d0, const double *h, double d, double *ratio,
                       int *exceeded, int *row, sr_error *err)
{
    double dd[NS];
    memcpy(dd, d0, sizeof dd);
    dd[c->L] = d;
    sr_profile_perturb pp;
    perturb_of(c, dd, h, &pp);
    wk->runs++;
    wk->held_c = NULL;
    int rc = sr_band_descents(c->bc, &pp, SR_PROFILE_FAST, wk->w, wk->r, NULL, err);
    if (rc)
        return rc;
    wk->held_c = c;
    wk->held = pp;
    sr_judge_band(&c->lim, wk->r, c->basis, &wk->v);
    landing_rows(&wk->v, ratio, exceeded, row);
    return SR_OK;
}

/* The least size of the last stage meeting the landing rows, within its
 * range (and bay): *d, or NaN when even the largest allowed does not (then
 * *miss is its landing ratio and the descents in wk are of that size). */
static int solve_landing(const cstate *c, worker *wk, const double *d0, const double *h, double start, double *d,
                         double *miss, sr_error *err)
{
    double ratio;
    int ex, row, rc;
    *d = NAN;
    *miss = NAN;
    if (c->Ln) { /* sizes from a list: the least that passes, by bisection over the list */
        size_t a = 0, b = c->Ln - 1;
        if ((rc = try_landing(c, wk, d0, h, c->Lv[b], &ratio, &ex, &row, err)))
            return rc;
        if (ex) {
            *miss = ratio;
            return SR_OK;
        }
        while (a < b) {
            size_t mid = a + (b - a) / 2;
            if ((rc = try_landing(c, wk, d0, h, c->Lv[mid], &ratio, &ex, &row, err)))
                return rc;
            if (ex)
                a = mid + 1;
            else
                b = mid;
        }
        *d = c->Lv[b];
        return SR_OK;
    }
    const double lo = c->Llo, hi = c->Lhi, tol = SR_DESIGN_SIZE_TOL;
    double pass = NAN, fail = NAN;
    double x = round_sig(fmin(fmax(start, lo), hi), 1);
    if (x > hi)
        x = hi;
    if ((rc = try_landing(c, wk, d0, h, x, &ratio, &ex, &row, err)))
        return rc;
    if (!ex && ratio >= 1.0 - tol) {
        *d = x;
        return SR_OK;
    }
    if (ex)
        fail = x;
    else
        pass = x;
    /* the inversion from this descent: exact when the body lands steady under the stage */
    double seed = landing_seed(c, wk->r, &wk->v, row, x);
    if (isfinite(seed)) {
        double xs = round_sig(fmin(fmax(seed, lo), hi), 1);
        if (xs > hi)
            xs = hi;
        if (xs != x) {
            if ((rc = try_landing(c, wk, d0, h, xs, &ratio, &ex, &row, err)))
                return rc;
            if (!ex && ratio >= 1.0 - tol) {
                *d = xs;
                return SR_OK;
            }
            if (ex)
                fail = isnan(fail) ? xs : fmax(fail, xs);
            else
                pass = isnan(pass) ? xs : fmin(pass, xs);
        }
    }
    if (isnan(pass)) {
        if ((rc = try_landing(c, wk, d0, h, hi, &ratio, &ex, &row, err)))
            return rc;
        if (ex) {
            *miss = ratio;
            return SR_OK;
        }
        pass = hi;
    }
    if (isnan(fail)) {
        if ((rc = try_landing(c, wk, d0, h, lo, &ratio, &ex, &row, err)))
            return rc;
        if (!ex) {
            *d = lo;
            return SR_OK;
        }
        fail = lo;
    }
    while (pass > fail * (1.0 + tol)) {
        double mid = round_sig(sqrt(pass * fail), 1);
        if (!(mid > fail && mid < pass))
            break;
        if ((rc = try_landing(c, wk, d0, h, mid, &ratio, &ex, &row, err)))
            return rc;
        if (ex)
            fail = mid;
        else
            pass = mid;
    }
    *d = pass;
    return SR_OK;
}

static void slice_note(slice *sl, const sr_error *e)
{
    sl->evaluated = 1;
    sl->feasible = 0;
    sl->ratio = INFINITY;
    sl->worst = (sr_design_limit){-1, -1, INFINITY};
    sl->objective = NAN;
    snprintf(sl->note, sizeof sl->note, "%s", e->msg);
}

/* Judge one candidate completely (sizes and heights in sl, the last stage's
 * size solved from `start`): band runs, opening loads, the judge, the bays. */
static int eval_full(const cstate *c, worker *wk, slice *sl, sr_error *err)
{
    sr_profile_perturb pp;
    perturb_of(c, sl->d0, sl->h, &pp);
    int rc = SR_OK;
    if (!(wk->held_c == c && memcmp(&wk->held, &pp, sizeof pp) == 0)) {
        wk->runs++;
        wk->held_c = NULL;
        rc = sr_band_descents(c->bc, &pp, SR_PROFILE_FAST, wk->w, wk->r, NULL, err);
        if (!rc) {
            wk->held_c = c;
            wk->held = pp;
        }
    }
    if (!rc)
        rc = sr_band_loads(c->bc, SR_PROFILE_FAST, wk->w, wk->r, err);
    if (rc)
        return rc;
    sr_judge_band(&c->lim, wk->r, c->basis, &wk->v);
    sr_design_point p;
    point_of(c, sl->d0, sl->h, &p);
    pack_point(c, &p);
    judged_values(wk->r, c->basis, c->lim.energy_ground, &sl->speed, &sl->energy, &sl->time, &sl->drift);
    p.speed = sl->speed;
    p.energy = sl->energy;
    p.time = sl->time;
    p.drift = sl->drift;
    sl->mass = p.mass;
    sl->volume = p.volume;
    sl->worst = worst_of(&wk->v, &p, NULL);
    sl->ratio = sl->worst.ratio;
    next_ratios(&wk->v, &p, sl->ratio, sl->next);
    sl->feasible = !wk->v.exceeded && bays_fit(&p);
    sl->objective = objective_of(c->objective, &p);
    sl->evaluated = 1;
    return SR_OK;
}

/* One candidate: the last stage's size solved, then judged completely. A
 * candidate that cannot be flown is infeasible with the reason noted. */
static int eval_slice_(const cstate *c, worker *wk, slice *sl, double start, sr_error *err);

static int eval_slice(const cstate *c, worker *wk, slice *sl, double start, sr_error *err)
{
    size_t before = wk->runs;
    int rc = eval_slice_(c, wk, sl, start, err);
    sl->runs = wk->runs - before;
    return rc;
}

static int eval_slice_(const cstate *c, worker *wk, slice *sl, double start, sr_error *err)
{
    sr_error e;
    int rc;
    if (c->L >= 0) {
        if (c->Ln == 0 && c->Lhi < c->Llo) {
            /* no size of the last stage fits its bay: judged at the least */
            sl->d0[c->L] = c->Llo;
            rc = eval_full(c, wk, sl, &e);
            if (rc == SR_ENOMEM)
                return sr_error_set(err, rc, "%s", e.msg);
            if (rc)
                slice_note(sl, &e);
            sl->feasible = 0;
            return SR_OK;
        }
        double d, miss;
        rc = solve_landing(c, wk, sl->d0, sl->h, isfinite(start) ? start : c->pilot, &d, &miss, &e);
        if (rc == SR_ENOMEM)
            return sr_error_set(err, rc, "%s", e.msg);
        if (rc) {
            slice_note(sl, &e);
            return SR_OK;
        }
        sl->d0[c->L] = isnan(d) ? (c->Ln ? c->Lv[c->Ln - 1] : c->Lhi) : d;
        sl->solved = !isnan(d);
    }
    rc = eval_full(c, wk, sl, &e);
    if (rc == SR_ENOMEM)
        return sr_error_set(err, rc, "%s", e.msg);
    if (rc)
        slice_note(sl, &e);
    return SR_OK;
}

/* ---- building a combination ---- */

static int push_slice(cstate *c, const double *d0, const double *h)
{
    if (c->ns == c->cap) {
        size_t cap = c->cap ? 2 * c->cap : 64;
        slice *s = realloc(c->s, cap * sizeof *s);
        if (!s)
            return SR_ENOMEM;
        c->s = s;
        c->cap = cap;
    }
    slice *sl = &c->s[c->ns++];
    memset(sl, 0, sizeof *sl);
    memcpy(sl->d0, d0, sizeof sl->d0);
    memcpy(sl->h, h, sizeof sl->h);
    sl->objective = sl->ratio = NAN;
    return SR_OK;
}

/* Whether a slice with these values exists already (refinement revisits). */
static int has_slice(const cstate *c, const double *d0, const double *h)
{
    for (size_t i = 0; i < c->ns; i++) {
        int same = 1;
        for (size_t j = 0; j < c->ndims && same; j++) {
            int k = c->d[j].stage;
            same = c->d[j].height ? c->s[i].h[k] == h[k] : c->s[i].d0[k] == d0[k];
        }
        if (same)
            return 1;
    }
    return 0;
}

static double cap_of(const cstate *c, size_t k, int count)
{
    if (!(c->bay[k] > 0.0))
        return INFINITY;
    double s = sr_pack_max_area(c->bay[k], count, c->areal[k], c->pack[k]);
    return sqrt(4.0 * s / PI);
}

/* The grid values of one stage's size, within its bay (may leave none). */
static int size_dim(cstate *c, size_t k, const sr_design_stage *ds, size_t grid, dim *d)
{
    double cap = cap_of(c, k, c->out->count[k]);
    d->stage = (int)k;
    d->height = 0;
    d->v = malloc((ds->sizes == SR_DSIZE_LIST ? ds->nsizes : grid) * sizeof *d->v);
    if (!d->v)
        return SR_ENOMEM;
    d->n = 0;
    if (ds->sizes == SR_DSIZE_LIST) {
        d->continuous = 0;
        for (size_t i = 0; i < ds->nsizes; i++)
            if (ds->size[i] <= cap)
                d->v[d->n++] = ds->size[i];
        d->lo = ds->size[0];
        d->hi = ds->size[ds->nsizes - 1];
        return SR_OK;
    }
    d->continuous = 1;
    d->lo = round_sig(ds->dmin, 1);
    d->hi = round_sig(ds->dmax, -1);
    d->spacing = grid > 1 ? log(d->hi / d->lo) / (double)(grid - 1) : 0.0;
    for (size_t i = 0; i < grid; i++) {
        double v = i + 1 == grid ? d->hi : i == 0 ? d->lo : round_sig(d->lo * exp(d->spacing * (double)i), 0);
        if (v <= cap && (d->n == 0 || v > d->v[d->n - 1]))
            d->v[d->n++] = v;
    }
    return SR_OK;
}

static int height_dim(const sr_design_stage *ds, size_t k, size_t points, dim *d)
{
    size_t n = ds->hpoints ? ds->hpoints : points;
    if (ds->hmin == ds->hmax)
        n = 1;
    d->stage = (int)k;
    d->height = 1;
    d->continuous = n > 1;
    d->lo = ds->hmin;
    d->hi = ds->hmax;
    d->spacing = n > 1 ? (d->hi - d->lo) / (double)(n - 1) : 0.0;
    d->v = malloc(n * sizeof *d->v);
    if (!d->v)
        return SR_ENOMEM;
    d->n = 0;
    for (size_t i = 0; i < n; i++) {
        double v = round_height(i + 1 == n ? d->hi : d->lo + d->spacing * (double)i);
        if (d->n == 0 || v > d->v[d->n - 1])
            d->v[d->n++] = v;
    }
    return SR_OK;
}

static void fail_combo(cstate *c, const char *fmt, const char *msg)
{
    c->broken = 1;
    snprintf(c->why, sizeof c->why, fmt, msg);
}

/* The combination's mission at reference sizes, its band context, its grid. */
static int build_combo(const search *S, cstate *c, worker *wk, sr_error *err)
{
    const sr_mission *m = S->m;
    const sr_design_spec *spec = &m->design;
    sr_design_combo *out = c->out;
    c->objective = spec->objective;
    c->basis = S->o->basis;
    c->L = -1;
    /* the last stage kept, when its size is searched, is solved exactly */
    int last = -1;
    for (size_t k = 0; k < m->nstages; k++)
        if ((out->present >> k) & 1u)
            last = (int)k;
    int n = 0;
    for (size_t k = 0; k < NS; k++) {
        c->idx[k] = k < m->nstages && ((out->present >> k) & 1u) ? n++ : -1;
        c->dref[k] = c->href[k] = c->dfix[k] = c->hfix[k] = NAN;
        c->areal[k] = NAN;
        c->bay[k] = NAN;
        c->pack[k] = spec->packing;
    }
    sr_design_point ref;
    memset(&ref, 0, sizeof ref);
    ref.present = out->present;
    for (size_t k = 0; k < m->nstages; k++) {
        snprintf(ref.family[k], sizeof ref.family[k], "%s", out->family[k]);
        ref.count[k] = out->count[k];
        ref.height[k] = NAN;
        if (!((out->present >> k) & 1u))
            continue;
        const sr_design_stage *ds = &spec->stage[k];
        const sr_stage *st = &m->stages[k];
        c->bay[k] = ds->bay;
        if (ds->packing >= 0)
            c->pack[k] = (sr_pack_kind)ds->packing;
        if (ds->sizes == SR_DSIZE_RANGE)
            c->dref[k] = round_sig(sqrt(ds->dmin * ds->dmax), 0);
        else if (ds->sizes == SR_DSIZE_LIST)
            c->dref[k] = ds->size[ds->nsizes / 2];
        else
            c->dref[k] = c->dfix[k] = st->canopy.d0.typ;
        ref.d0[k] = c->dref[k];
        if (st->deploy == SR_DEPLOY_ALTITUDE) {
            c->href[k] = c->hfix[k] = st->deploy_value;
            if (ds->height)
                c->href[k] = round_height(0.5 * (ds->hmin + ds->hmax));
            ref.height[k] = c->href[k];
        }
    }
    char *text = NULL;
    size_t len = 0;
    sr_error e;
    int rc = design_mission(m, S->y, S->cat, S->o, &ref, &c->m, &text, &len, &e);
    free(text);
    if (rc == SR_ENOMEM)
        return sr_error_set(err, rc, "%s", e.msg);
    if (rc) {
        fail_combo(c, "%s", e.msg);
        return SR_OK;
    }
    for (size_t k = 0; k < m->nstages; k++)
        if (c->idx[k] >= 0) {
            double a = c->m->stages[c->idx[k]].canopy.areal_mass;
            c->areal[k] = a > 0.0 ? a : NAN;
        }
    sr_judge_limits_init(&c->lim, c->m);
    /* screening: the fast path, whose transients fall back to the ODE where the nominal one cannot be shifted
     * (a canopy far smaller than the reference); at 1e-6 the ODE is still far inside the fast path's own error
     * (docs/method.md 7.5), and every design reported is judged again at the default 1e-9 */
    sr_profile_opts po;
    sr_profile_opts_init(&po);
    po.ode_tol = SR_DESIGN_SCREEN_ODE_TOL;
    if ((rc = sr_band_ctx_new(&c->bc, c->m, &po, &e))) {
        if (rc == SR_ENOMEM)
            return sr_error_set(err, rc, "%s", e.msg);
        fail_combo(c, "%s", e.msg);
        return SR_OK;
    }
    /* the dimensions of the grid, in stage order: sizes, then heights */
    c->ndims = 0;
    for (size_t k = 0; k < m->nstages; k++) {
        if (!((out->present >> k) & 1u))
            continue;
        const sr_design_stage *ds = &spec->stage[k];
        if (stage_varies_size(ds) && (int)k == last) {
            c->L = (int)k;
            double cap = cap_of(c, k, out->count[k]);
            if (ds->sizes == SR_DSIZE_LIST) {
                c->Ln = 0;
                for (size_t i = 0; i < ds->nsizes; i++)
                    if (ds->size[i] <= cap)
                        c->Lv[c->Ln++] = ds->size[i];
                c->Llo = ds->size[0];
                c->Lhi = c->Ln ? c->Lv[c->Ln - 1] : -1.0;
                c->Lcapped = c->Ln < ds->nsizes;
            } else {
                c->Llo = round_sig(ds->dmin, 1);
                c->Lhi = round_sig(fmin(ds->dmax, cap), -1);
                c->Lcapped = cap < ds->dmax;
            }
        } else if (stage_varies_size(ds)) {
            if ((rc = size_dim(c, k, ds, spec->grid, &c->d[c->ndims++])))
                return sr_error_set(err, rc, "out of memory");
        }
        if (ds->height && (rc = height_dim(ds, k, spec->heights, &c->d[c->ndims++])))
            return sr_error_set(err, rc, "out of memory");
    }
    /* a bay smaller than every size of a gridded stage: one candidate at its least size shows the miss */
    for (size_t j = 0; j < c->ndims; j++)
        if (!c->d[j].height && c->d[j].n == 0) {
            c->d[j].v[0] = c->d[j].lo;
            c->d[j].n = 1;
            if (!out->bay_blocked)
                out->bay_blocked = c->d[j].stage + 1;
        }
    if (c->L >= 0 && !out->bay_blocked && c->Ln == 0 && (spec->stage[c->L].sizes == SR_DSIZE_LIST || c->Lhi < c->Llo))
        out->bay_blocked = c->L + 1;
    /* bounded: the sizes' grids shrink until the product fits */
    for (;;) {
        double prod = 1.0;
        for (size_t j = 0; j < c->ndims; j++)
            prod *= (double)c->d[j].n;
        if (prod <= SR_DESIGN_MAX_SLICES)
            break;
        size_t jmax = SIZE_MAX;
        for (size_t j = 0; j < c->ndims; j++)
            if (c->d[j].continuous && c->d[j].n > 2 && (jmax == SIZE_MAX || c->d[j].n > c->d[jmax].n))
                jmax = j;
        if (jmax == SIZE_MAX)
            return sr_error_set(err, SR_EINVAL, "the search space is too large: %.0f grid points for one family "
                                                "combination (at most %d); give fewer sizes or heights",
                                prod, SR_DESIGN_MAX_SLICES);
        dim *d = &c->d[jmax];
        size_t nn = d->n - 1;
        d->spacing = d->height ? (d->hi - d->lo) / (double)(nn - 1) : log(d->hi / d->lo) / (double)(nn - 1);
        for (size_t i = 0; i < nn; i++)
            d->v[i] = d->height ? round_height(i + 1 == nn ? d->hi : d->lo + d->spacing * (double)i)
                                : (i + 1 == nn ? d->hi : i == 0 ? d->lo : round_sig(d->lo * exp(d->spacing * i), 0));
        d->n = nn;
    }
    for (size_t j = 0; j < c->ndims; j++)
        c->step[j] = c->d[j].spacing;
    /* the grid */
    double d0[NS], h[NS];
    size_t ix[MAX_DIMS] = {0};
    for (;;) {
        memcpy(d0, c->dfix, sizeof d0);
        memcpy(h, c->hfix, sizeof h);
        for (size_t j = 0; j < c->ndims; j++) {
            if (c->d[j].height)
                h[c->d[j].stage] = c->d[j].v[ix[j]];
            else
                d0[c->d[j].stage] = c->d[j].v[ix[j]];
        }
        if (c->L >= 0)
            d0[c->L] = NAN;
        if (push_slice(c, d0, h))
            return sr_error_set(err, SR_ENOMEM, "out of memory");
        c->s[c->ns - 1].chain = c->ndims > 0 && ix[c->ndims - 1] > 0;
        size_t j = c->ndims;
        while (j-- > 0) {
            if (++ix[j] < c->d[j].n)
                break;
            ix[j] = 0;
        }
        if (j == SIZE_MAX)
            break;
    }
    /* the pilot: the middle of the grid; its last-stage size starts every other solve */
    c->pilot = c->L >= 0 ? (c->Ln ? c->Lv[c->Ln / 2] : c->dref[c->L]) : NAN;
    size_t mid = 0, stride = 1;
    for (size_t j = c->ndims; j-- > 0;) {
        mid += (c->d[j].n / 2) * stride;
        stride *= c->d[j].n;
    }
    slice *ps = &c->s[mid];
    if ((rc = eval_slice(c, wk, ps, NAN, err)))
        return rc;
    if (c->L >= 0 && ps->evaluated && isfinite(ps->d0[c->L]))
        c->pilot = ps->d0[c->L];
    return SR_OK;
}

/* ---- choosing ---- */

/* a better than b: feasible first; then the objective (ties within 1e-9),
 * the least ratio of the binding limit, the earlier index */
static int better(const slice *a, size_t ia, const slice *b, size_t ib)
{
    if (!a->evaluated || !b->evaluated)
        return a->evaluated && !b->evaluated;
    if (a->feasible != b->feasible)
        return a->feasible;
    if (a->feasible) {
        double tol = 1e-9 * fmax(fabs(a->objective), fabs(b->objective));
        if (fabs(a->objective - b->objective) > tol)
            return a->objective < b->objective;
    }
    /* equal objectives: the more margin, to the binding limit and then the next two */
    double ra[3] = {a->ratio, a->next[0], a->next[1]}, rb[3] = {b->ratio, b->next[0], b->next[1]};
    for (int j = 0; j < 3; j++)
        if (fabs(ra[j] - rb[j]) > 1e-6 * fmax(fabs(ra[j]), fabs(rb[j])))
            return ra[j] < rb[j];
    return ia < ib;
}

static void choose_best(cstate *c)
{
    c->best = 0;
    for (size_t i = 1; i < c->ns; i++)
        if (better(&c->s[i], i, &c->s[c->best], c->best))
            c->best = i;
}

/* New candidates around the best: each continuous dimension at -step, 0,
 * +step (3^d - 1 points; coordinate-wise beyond 4 dimensions). */
static int refine_round(cstate *c)
{
    if (c->broken || c->ns == 0)
        return SR_OK;
    choose_best(c);
    const slice base = c->s[c->best];
    size_t cont[MAX_DIMS], nc = 0;
    for (size_t j = 0; j < c->ndims; j++) {
        c->step[j] *= 0.5;
        if (c->d[j].continuous && c->step[j] > 0.0)
            cont[nc++] = j;
    }
    if (!nc)
        return SR_OK;
    int full = nc <= 4;
    size_t total = 1;
    for (size_t i = 0; i < nc; i++)
        total *= 3;
    size_t npts = full ? total : 2 * nc;
    for (size_t t = 0; t < npts; t++) {
        int off[MAX_DIMS] = {0};
        if (full) {
            size_t x = t;
            int zero = 1;
            for (size_t i = 0; i < nc; i++) {
                off[i] = (int)(x % 3) - 1;
                x /= 3;
                zero &= off[i] == 0;
            }
            if (zero)
                continue;
        } else {
            off[t / 2] = t % 2 ? 1 : -1;
        }
        double d0[NS], h[NS];
        memcpy(d0, base.d0, sizeof d0);
        memcpy(h, base.h, sizeof h);
        if (c->L >= 0)
            d0[c->L] = NAN;
        int moved = 0;
        for (size_t i = 0; i < nc; i++) {
            const dim *d = &c->d[cont[i]];
            int k = d->stage;
            if (!off[i])
                continue;
            if (d->height) {
                double v = round_height(fmin(fmax(h[k] + off[i] * c->step[cont[i]], d->lo), d->hi));
                moved |= v != h[k];
                h[k] = v;
            } else {
                double cap = cap_of(c, (size_t)k, c->out->count[k]);
                double v = round_sig(fmin(fmax(d0[k] * exp(off[i] * c->step[cont[i]]), d->lo), fmin(d->hi, cap)), 0);
                if (v < d->lo)
                    v = d->lo;
                moved |= v != d0[k];
                d0[k] = v;
            }
        }
        if (!moved || has_slice(c, d0, h))
            continue;
        if (push_slice(c, d0, h))
            return SR_ENOMEM;
    }
    return SR_OK;
}

/* ---- parallel loops ---- */

typedef struct job {
    size_t combo, slice, count;
} job;

static void progress_add(search *S, size_t n)
{
    size_t d;
#pragma omp atomic capture
    d = S->done += n;
    if (S->o->progress && omp_get_thread_num() == 0) {
        omp_set_lock(S->progress_lock);
        S->o->progress(d < S->total ? d : S->total, S->total, S->o->progress_ud);
        omp_unset_lock(S->progress_lock);
    }
}

/* The jobs of combinations [c0, c1): runs of slices not yet evaluated, a
 * chain of the grid in one job (jobs NULL: count them). */
static size_t make_jobs(const search *S, size_t c0, size_t c1, job *jobs)
{
    size_t n = 0;
    for (size_t i = c0; i < c1; i++) {
        const cstate *c = &S->cs[i];
        if (c->broken)
            continue;
        for (size_t j = 0; j < c->ns;) {
            if (c->s[j].evaluated) {
                j++;
                continue;
            }
            size_t k = j + 1;
            while (k < c->ns && c->s[k].chain && !c->s[k].evaluated)
                k++;
            if (jobs)
                jobs[n] = (job){i, j, k - j};
            n++;
            j = k;
        }
    }
    return n;
}

/* Evaluate the slices not yet evaluated of combinations [c0, c1). A chain
 * starts its last-stage solve from its predecessor's answer (evaluated
 * before, on the same thread or in an earlier loop), else from the pilot. */
static int eval_pending(search *S, size_t c0, size_t c1, int nt, sr_error *err)
{
    size_t nj = make_jobs(S, c0, c1, NULL);
    if (!nj)
        return SR_OK;
    job *jobs = malloc(nj * sizeof *jobs);
    if (!jobs)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    make_jobs(S, c0, c1, jobs);
    int fail = 0;
    sr_error first = {0};
#pragma omp parallel num_threads(nt)
    {
        worker wk;
        sr_error e;
        int ok = worker_init(&wk, &e) == SR_OK;
        if (!ok) {
            note_fail(S, &fail, &first, &e);
        }
#pragma omp for schedule(dynamic, 1)
        for (size_t t = 0; t < nj; t++) {
            int f;
#pragma omp atomic read
            f = fail;
            if (f || !ok)
                continue;
            cstate *c = &S->cs[jobs[t].combo];
            size_t j0 = jobs[t].slice;
            double start = NAN;
            if (c->L >= 0 && j0 > 0 && c->s[j0].chain && c->s[j0 - 1].solved)
                start = c->s[j0 - 1].d0[c->L];
            for (size_t j = j0; j < j0 + jobs[t].count; j++) {
                if (eval_slice(c, &wk, &c->s[j], start, &e)) {
                    note_fail(S, &fail, &first, &e);
                    break;
                }
                start = c->L >= 0 && c->s[j].solved ? c->s[j].d0[c->L] : NAN;
            }
            progress_add(S, jobs[t].count);
        }
        worker_free(&wk);
    }
    free(jobs);
    if (fail)
        return sr_error_set(err, first.code ? first.code : SR_ENOMEM, "%s", first.msg);
    return SR_OK;
}

/* ---- the Pareto samples: the last stage's size from its least to its largest feasible one ---- */

typedef struct ppoint {
    size_t combo, seq;   /* its combination; order of arrival (batches in order) */
    double x, y;         /* the two Pareto quantities */
    slice s;
} ppoint;

static int sample_at(const cstate *c, worker *wk, const slice *base, double d, slice *out, sr_error *err)
{
    *out = *base;
    out->d0[c->L] = d;
    out->evaluated = 0;
    sr_error e;
    int rc = eval_full(c, wk, out, &e);
    if (rc == SR_ENOMEM)
        return sr_error_set(err, rc, "%s", e.msg);
    if (rc)
        slice_note(out, &e);
    return SR_OK;
}

static int pareto_samples(const cstate *c, worker *wk, slice *out, size_t *n, sr_error *err)
{
    *n = 0;
    if (c->broken || c->L < 0 || !c->ns || !c->s[c->best].feasible)
        return SR_OK;
    const slice *b = &c->s[c->best];
    double lo = b->d0[c->L];
    slice t;
    int rc;
    if (c->Ln) {
        for (size_t i = 0; i < c->Ln && *n < 2 * PARETO_SAMPLES; i++) {
            if (!(c->Lv[i] > lo))
                continue;
            if ((rc = sample_at(c, wk, b, c->Lv[i], &t, err)))
                return rc;
            if (!t.feasible)
                break;
            out[(*n)++] = t;
        }
        return SR_OK;
    }
    double hi = c->Lhi, pass = lo, fail = NAN;
    if (!(hi > lo * (1.0 + 1e-3)))
        return SR_OK;
    if ((rc = sample_at(c, wk, b, hi, &t, err)))
        return rc;
    if (t.feasible)
        pass = hi;
    else
        fail = hi;
    while (isfinite(fail) && fail > pass * (1.0 + 1e-3)) {
        double mid = round_sig(sqrt(pass * fail), -1);
        if (!(mid > pass && mid < fail))
            break;
        if ((rc = sample_at(c, wk, b, mid, &t, err)))
            return rc;
        if (t.feasible)
            pass = mid;
        else
            fail = mid;
    }
    if (!(pass > lo * (1.0 + 1e-3)))
        return SR_OK;
    for (size_t i = 1; i <= PARETO_SAMPLES; i++) {
        double d = i == PARETO_SAMPLES ? pass : round_sig(lo * pow(pass / lo, (double)i / PARETO_SAMPLES), -1);
        if (!(d > lo))
            continue;
        if ((rc = sample_at(c, wk, b, d, &t, err)))
            return rc;
        if (t.feasible)
            out[(*n)++] = t;
    }
    return SR_OK;
}

static double pq(const slice *s, sr_design_quantity q)
{
    switch (q) {
    case SR_DQ_SPEED: return s->speed;
    case SR_DQ_DRIFT: return s->drift;
    case SR_DQ_MASS: return s->mass;
    case SR_DQ_VOLUME: return s->volume;
    case SR_DQ_TIME: return s->time;
    default: return NAN;
    }
}

static int cmp_pp(const void *a, const void *b)
{
    const ppoint *x = a, *y = b;
    if (x->x != y->x)
        return x->x < y->x ? -1 : 1;
    if (x->y != y->y)
        return x->y < y->y ? -1 : 1;
    return x->seq < y->seq ? -1 : x->seq > y->seq;
}

/* Keep the points no other point beats in both quantities (both smaller is
 * better), sorted by the first. */
static size_t pareto_front(ppoint *p, size_t n)
{
    if (!n)
        return 0;
    qsort(p, n, sizeof *p, cmp_pp);
    size_t m = 0;
    double ybest = INFINITY;
    for (size_t i = 0; i < n; i++) {
        if (!(p[i].y < ybest))
            continue;
        /* the same first quantity to 1e-4 (a limit met exactly by both): the lower second one only */
        if (m > 0 && fabs(p[i].x - p[m - 1].x) <= 1e-4 * fmax(fabs(p[i].x), fabs(p[m - 1].x)))
            m--;
        ybest = p[i].y;
        p[m++] = p[i];
    }
    return m;
}

/* ---- the full integration of a design's own mission: what profile says ---- */

static int confirm(const search *S, const cstate *c, const slice *sl, sr_design_point *p, sr_mission **dm_out,
                   char **text_out, size_t *len_out, sr_error *err)
{
    point_of(c, sl->d0, sl->h, p);
    pack_point(c, p);
    p->evaluated = 1;
    p->full = 1;
    p->feasible = 0;
    if (c->L >= 0 && c->Lcapped && c->Lhi >= c->Llo && p->d0[c->L] >= c->Lhi)
        p->bay_capped = c->L + 1;
    p->worst = (sr_design_limit){-1, -1, INFINITY};
    p->objective = NAN;
    sr_mission *dm = NULL;
    char *text = NULL;
    size_t len = 0;
    sr_band_ctx *bc = NULL;
    sr_band_work *w = NULL;
    sr_band_result *r = NULL;
    sr_error e;
    int rc = design_mission(S->m, S->y, S->cat, S->o, p, &dm, &text, &len, &e);
    if (!rc)
        rc = sr_band_ctx_new(&bc, dm, NULL, &e);
    if (!rc)
        rc = sr_band_work_new(&w, &e);
    if (!rc && !(r = malloc(sizeof *r)))
        rc = sr_error_set(&e, SR_ENOMEM, "out of memory");
    if (!rc)
        rc = sr_band_run(bc, NULL, SR_PROFILE_FULL, w, r, NULL, &e);
    if (!rc) {
        sr_judge_limits lim;
        sr_judge_limits_init(&lim, dm);
        sr_judge_band(&lim, r, S->o->basis, &p->verdict);
        judged_values(r, S->o->basis, lim.energy_ground, &p->speed, &p->energy, &p->time, &p->drift);
        p->worst = worst_of(&p->verdict, p, NULL);
        p->feasible = !p->verdict.exceeded && bays_fit(p);
        p->objective = objective_of(S->m->design.objective, p);
    } else if (rc != SR_ENOMEM) {
        snprintf(p->note, sizeof p->note, "%s", e.msg);
        rc = SR_OK;
    }
    free(r);
    sr_band_work_free(w);
    sr_band_ctx_free(bc);
    if (rc) {
        mission_release(dm);
        free(text);
        return sr_error_set(err, rc, "%s", e.msg);
    }
    if (dm_out && dm) {
        *dm_out = dm;
        *text_out = text;
        *len_out = len;
    } else {
        mission_release(dm);
        free(text);
    }
    return SR_OK;
}

static int cmp_index_by(const slice *s, size_t a, size_t b)
{
    return better(&s[a], a, &s[b], b) ? -1 : better(&s[b], b, &s[a], a) ? 1 : 0;
}

/* The combination's best design, confirmed: its candidates in order, up to
 * SR_DESIGN_TRIES of those the fast path passed; otherwise the closest miss. */
static int confirm_combo(search *S, cstate *c, sr_error *err)
{
    sr_design_combo *out = c->out;
    out->feasible = 0;
    if (c->broken || !c->ns) {
        memset(&out->best, 0, sizeof out->best);
        point_of(c, c->dfix, c->hfix, &out->best);
        out->best.worst = (sr_design_limit){-1, -1, INFINITY};
        snprintf(out->best.note, sizeof out->best.note, "%s", c->why);
        return SR_OK;
    }
    size_t *order = malloc(c->ns * sizeof *order);
    if (!order)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    for (size_t i = 0; i < c->ns; i++)
        order[i] = i;
    /* insertion sort by `better`: a few thousand at most, once per combination */
    for (size_t i = 1; i < c->ns; i++) {
        size_t x = order[i], j = i;
        while (j > 0 && cmp_index_by(c->s, x, order[j - 1]) < 0) {
            order[j] = order[j - 1];
            j--;
        }
        order[j] = x;
    }
    int rc = SR_OK, have = 0;
    size_t tries = 0;
    for (size_t t = 0; t < c->ns && tries < SR_DESIGN_TRIES && !rc; t++) {
        const slice *sl = &c->s[order[t]];
        if (!sl->feasible && tries > 0)
            break;
        tries++;
        sr_design_point p;
        sr_mission *dm = NULL;
        char *text = NULL;
        size_t len = 0;
        if ((rc = confirm(S, c, sl, &p, &dm, &text, &len, err)))
            break;
        progress_add(S, 1);
        c->confirmed++; /* summed after the parallel loop, in order */
        if (sl->feasible && !p.feasible)
            out->rejected++;
        int take = !have || (p.feasible && !out->best.feasible) ||
                   (!p.feasible && !out->best.feasible && p.worst.ratio < out->best.worst.ratio);
        if (take) {
            mission_release(out->mission);
            free(out->text);
            out->best = p;
            out->mission = dm;
            out->text = text;
            out->len = len;
            have = 1;
        } else {
            mission_release(dm);
            free(text);
        }
        if (p.feasible) {
            out->feasible = 1;
            break;
        }
        if (!sl->feasible)
            break;
    }
    free(order);
    return rc;
}

/* ---- the combinations ---- */

typedef struct stage_opt {
    int present;
    const char *family;
    int count;
} stage_opt;

static int enumerate(const sr_mission *m, sr_design_result *res, sr_error *err)
{
    stage_opt *opt[NS];
    size_t nopt[NS];
    double total = 1.0;
    int rc = SR_OK;
    memset(opt, 0, sizeof opt);
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_design_stage *ds = &m->design.stage[k];
        const sr_stage *st = &m->stages[k];
        size_t nf = ds->nfamilies ? ds->nfamilies : 1, ncnt = ds->ncounts ? ds->ncounts : 1;
        nopt[k] = nf * ncnt + (ds->optional ? 1 : 0);
        opt[k] = malloc(nopt[k] * sizeof *opt[k]);
        if (!opt[k]) {
            rc = sr_error_set(err, SR_ENOMEM, "out of memory");
            goto out;
        }
        size_t i = 0;
        for (size_t f = 0; f < nf; f++)
            for (size_t n = 0; n < ncnt; n++)
                opt[k][i++] = (stage_opt){1, ds->nfamilies ? ds->family[f] : st->canopy.fam.id,
                                          ds->ncounts ? ds->count[n] : st->canopy.count};
        if (ds->optional)
            opt[k][i++] = (stage_opt){0, st->canopy.fam.id, st->canopy.count};
        total *= (double)nopt[k];
    }
    if (total > SR_DESIGN_MAX_COMBOS) {
        rc = sr_error_set(err, SR_EINVAL, "the search space is too large: %.0f combinations of families, counts and "
                                          "stages (at most %d); give fewer families",
                          total, SR_DESIGN_MAX_COMBOS);
        goto out;
    }
    res->combo = calloc((size_t)total, sizeof *res->combo);
    if (!res->combo) {
        rc = sr_error_set(err, SR_ENOMEM, "out of memory");
        goto out;
    }
    size_t ix[NS] = {0}, n = 0;
    for (;;) {
        sr_design_combo *c = &res->combo[n];
        unsigned present = 0;
        for (size_t k = 0; k < m->nstages; k++) {
            const stage_opt *o = &opt[k][ix[k]];
            if (o->present)
                present |= 1u << k;
            snprintf(c->family[k], sizeof c->family[k], "%s", o->family);
            c->count[k] = o->count;
        }
        c->present = present;
        if (present)
            n++; /* a design needs a canopy: the combination without any is left out */
        size_t k = m->nstages;
        while (k-- > 0) {
            if (++ix[k] < nopt[k])
                break;
            ix[k] = 0;
        }
        if (k == SIZE_MAX)
            break;
    }
    res->ncombos = n;
out:
    for (size_t k = 0; k < m->nstages; k++)
        free(opt[k]);
    return rc;
}

static void describe_axes(const sr_mission *m, sr_design_result *res)
{
    const sr_design_spec *spec = &m->design;
    res->naxes = 0;
    int last_varies = -1;
    for (size_t k = 0; k < m->nstages; k++)
        if (stage_varies_size(&spec->stage[k]))
            last_varies = (int)k;
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_design_stage *ds = &spec->stage[k];
        if (stage_varies_size(ds)) {
            sr_design_axis *a = &res->axis[res->naxes++];
            memset(a, 0, sizeof *a);
            a->stage = (int)k;
            a->exact = (int)k == last_varies && k + 1 == m->nstages;
            a->list = ds->sizes == SR_DSIZE_LIST;
            a->points = a->list ? ds->nsizes : spec->grid;
            a->lo = a->list ? ds->size[0] : ds->dmin;
            a->hi = a->list ? ds->size[ds->nsizes - 1] : ds->dmax;
        }
        if (ds->height) {
            sr_design_axis *a = &res->axis[res->naxes++];
            memset(a, 0, sizeof *a);
            a->stage = (int)k;
            a->height = 1;
            a->points = ds->hpoints ? ds->hpoints : spec->heights;
            if (ds->hmin == ds->hmax)
                a->points = 1;
            a->lo = ds->hmin;
            a->hi = ds->hmax;
        }
    }
}

/* A grid of one combination that had to shrink (SR_DESIGN_MAX_SLICES): the
 * axis states the coarsest one used. */
static void axes_used(sr_design_result *res, const cstate *c)
{
    for (size_t j = 0; j < c->ndims; j++)
        for (size_t i = 0; i < res->naxes; i++) {
            sr_design_axis *a = &res->axis[i];
            if (a->stage == c->d[j].stage && a->height == c->d[j].height && !a->list && c->d[j].continuous &&
                c->d[j].n < a->points)
                a->points = c->d[j].n;
        }
}

static void axes_resolution(sr_design_result *res)
{
    for (size_t i = 0; i < res->naxes; i++) {
        sr_design_axis *a = &res->axis[i];
        double steps = (double)(1 << SR_DESIGN_REFINE);
        if (a->height) {
            a->resolution = a->points > 1 ? (a->hi - a->lo) / (double)(a->points - 1) / steps : 0.0;
            if (a->resolution > 0.0 && a->resolution < 0.1)
                a->resolution = 0.1; /* heights are written to 0.1 m */
        } else if (a->exact) {
            a->resolution = a->list ? 0.0 : SR_DESIGN_SIZE_TOL;
        } else if (!a->list && a->points > 1) {
            a->resolution = exp(log(a->hi / a->lo) / (double)(a->points - 1) / steps) - 1.0;
        }
    }
}

static void free_state(cstate *c)
{
    sr_band_ctx_free(c->bc);
    c->bc = NULL;
    mission_release(c->m);
    c->m = NULL;
    free(c->s);
    c->s = NULL;
    c->ns = c->cap = 0;
    for (size_t j = 0; j < c->ndims; j++) {
        free(c->d[j].v);
        c->d[j].v = NULL;
    }
}

#define BATCH 32

int sr_design_run(const sr_mission *m, const sr_yaml *y, const sr_catalog *cat, const sr_design_opts *o,
                  sr_design_result *res, sr_error *err)
{
    memset(res, 0, sizeof *res);
    res->objective = m->design.objective;
    res->basis = o->basis;
    int any = 0;
    for (size_t k = 0; k < m->nstages; k++)
        any |= sr_design_stage_varies(&m->design.stage[k]);
    if (!any)
        return sr_error_set(err, SR_EINVAL, "%s: nothing to search: no stage varies (give a design: block or "
                                            "the options that vary families, sizes, heights or counts)",
                            m->path);
    if (!m->has_start)
        return sr_error_set(err, SR_EINVAL, "%s: the mission has no start: block; a design search flies the "
                                            "descent and needs it",
                            m->path);
    int rc = enumerate(m, res, err);
    if (rc)
        return rc;
    if (!res->ncombos) {
        sr_design_result_free(res);
        return sr_error_set(err, SR_EINVAL, "%s: the search space is empty: every stage is dropped", m->path);
    }
    describe_axes(m, res);
    int nt = o->threads > 0 ? o->threads : omp_get_max_threads();
    search S = {m, y, cat, o, res, NULL, res->ncombos, 0, 0, NULL, NULL};
    S.cs = calloc(res->ncombos, sizeof *S.cs);
    ppoint *pp = NULL;
    size_t npp = 0, cpp = 0, seq = 0;
    if (!S.cs) {
        sr_design_result_free(res);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    /* the progress counts candidates: an estimate of the grid and its refinement per combination */
    size_t per = 1;
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_design_stage *ds = &m->design.stage[k];
        if (stage_varies_size(ds) && k + 1 < m->nstages)
            per *= ds->sizes == SR_DSIZE_LIST ? ds->nsizes : m->design.grid;
        if (ds->height)
            per *= ds->hpoints ? ds->hpoints : m->design.heights;
    }
    S.total = res->ncombos * (per + 3 * 8 + 2);
    if ((double)res->ncombos * (double)per > SR_DESIGN_MAX_POINTS_ALL) {
        double all = (double)res->ncombos * (double)per;
        free(S.cs);
        sr_design_result_free(res);
        return sr_error_set(err, SR_EINVAL, "%s: the search space is too large: %.3g grid points over every "
                                            "combination (at most %.0e); give fewer families, sizes or heights",
                            m->path, all, SR_DESIGN_MAX_POINTS_ALL);
    }
    omp_lock_t locks[2];
    omp_init_lock(&locks[0]);
    omp_init_lock(&locks[1]);
    S.fail_lock = &locks[0];
    S.progress_lock = &locks[1];
    for (size_t i = 0; i < res->ncombos; i++)
        S.cs[i].out = &res->combo[i];
    for (size_t b0 = 0; b0 < res->ncombos && !rc; b0 += BATCH) {
        size_t b1 = b0 + BATCH < res->ncombos ? b0 + BATCH : res->ncombos;
        int fail = 0;
        sr_error first = {0};
        /* build each combination: its mission, band context, grid and pilot */
#pragma omp parallel num_threads(nt)
        {
            worker wk;
            sr_error e;
            int ok = worker_init(&wk, &e) == SR_OK;
#pragma omp for schedule(dynamic, 1)
            for (size_t i = b0; i < b1; i++) {
                if (ok && !build_combo(&S, &S.cs[i], &wk, &e))
                    continue;
                note_fail(&S, &fail, &first, &e);
            }
            worker_free(&wk);
        }
        if (fail) {
            rc = sr_error_set(err, first.code ? first.code : SR_ENOMEM, "%s", first.msg);
            break;
        }
        /* the grid, then rounds of refinement around each best */
        if ((rc = eval_pending(&S, b0, b1, nt, err)))
            break;
        for (int r = 0; r < SR_DESIGN_REFINE && !rc; r++) {
            for (size_t i = b0; i < b1 && !rc; i++)
                if (refine_round(&S.cs[i]))
                    rc = sr_error_set(err, SR_ENOMEM, "out of memory");
            if (!rc)
                rc = eval_pending(&S, b0, b1, nt, err);
        }
        if (rc)
            break;
        for (size_t i = b0; i < b1; i++)
            if (S.cs[i].ns)
                choose_best(&S.cs[i]);
        /* the Pareto samples and the confirmation, combination by combination */
        slice(*samples)[2 * PARETO_SAMPLES] = calloc(b1 - b0, sizeof *samples);
        size_t *nsamp = calloc(b1 - b0, sizeof *nsamp);
        if (!samples || !nsamp) {
            free(samples);
            free(nsamp);
            rc = sr_error_set(err, SR_ENOMEM, "out of memory");
            break;
        }
#pragma omp parallel num_threads(nt)
        {
            worker wk;
            sr_error e;
            int ok = worker_init(&wk, &e) == SR_OK;
#pragma omp for schedule(dynamic, 1)
            for (size_t i = b0; i < b1; i++) {
                int bad = !ok;
                if (!bad) {
                    size_t before = wk.runs;
                    bad = pareto_samples(&S.cs[i], &wk, samples[i - b0], &nsamp[i - b0], &e) != SR_OK;
                    S.cs[i].out->candidates += wk.runs - before;
                }
                if (!bad)
                    bad = confirm_combo(&S, &S.cs[i], &e) != SR_OK;
                if (bad) {
                    note_fail(&S, &fail, &first, &e);
                }
            }
            worker_free(&wk);
        }
        if (fail)
            rc = sr_error_set(err, first.code ? first.code : SR_ENOMEM, "%s", first.msg);
        /* the candidates of the Pareto front: every feasible candidate and sample, pruned batch by batch */
        for (size_t i = b0; i < b1 && !rc; i++) {
            cstate *c = &S.cs[i];
            for (size_t j = 0; j < c->ns; j++)
                c->out->candidates += c->s[j].runs;
            for (size_t j = 0; j < c->ns + nsamp[i - b0]; j++) {
                const slice *sl = j < c->ns ? &c->s[j] : &samples[i - b0][j - c->ns];
                if (!sl->feasible)
                    continue;
                double x = pq(sl, o->pareto_x), yv = pq(sl, o->pareto_y);
                if (!isfinite(x) || !isfinite(yv))
                    continue;
                if (npp == cpp) {
                    size_t cap = cpp ? 2 * cpp : 256;
                    ppoint *np = realloc(pp, cap * sizeof *np);
                    if (!np) {
                        rc = sr_error_set(err, SR_ENOMEM, "out of memory");
                        break;
                    }
                    pp = np;
                    cpp = cap;
                }
                pp[npp++] = (ppoint){i, seq++, x, yv, *sl};
            }
        }
        if (!rc)
            npp = pareto_front(pp, npp);
        free(samples);
        free(nsamp);
        for (size_t i = b0; i < b1; i++) {
            res->candidates += S.cs[i].out->candidates;
            res->confirmed += S.cs[i].confirmed;
            axes_used(res, &S.cs[i]);
            free_state(&S.cs[i]);
        }
    }
    /* the front confirmed by the full integration, then the front of what passed */
    if (!rc && npp) {
        if (npp > PARETO_MAX)
            npp = PARETO_MAX;
        res->pareto = calloc(npp, sizeof *res->pareto);
        if (!res->pareto)
            rc = sr_error_set(err, SR_ENOMEM, "out of memory");
        int fail = 0;
        sr_error first = {0};
#pragma omp parallel for num_threads(nt) schedule(dynamic, 1)
        for (size_t i = 0; i < (rc ? 0 : npp); i++) {
            sr_error e;
            if (confirm(&S, &S.cs[pp[i].combo], &pp[i].s, &res->pareto[i], NULL, NULL, NULL, &e)) {
                note_fail(&S, &fail, &first, &e);
            }
        }
        if (fail && !rc)
            rc = sr_error_set(err, first.code ? first.code : SR_ENOMEM, "%s", first.msg);
        if (!rc) {
            res->confirmed += npp;
            /* keep what passed, as a front again */
            ppoint *q = malloc(npp * sizeof *q);
            sr_design_point *kept = malloc(npp * sizeof *kept);
            if (!q || !kept) {
                free(q);
                free(kept);
                rc = sr_error_set(err, SR_ENOMEM, "out of memory");
            } else {
                size_t nq = 0;
                for (size_t i = 0; i < npp; i++)
                    if (res->pareto[i].feasible) {
                        q[nq] = (ppoint){i, i, sr_design_quantity_of(&res->pareto[i], o->pareto_x),
                                         sr_design_quantity_of(&res->pareto[i], o->pareto_y), pp[0].s};
                        nq++;
                    }
                nq = pareto_front(q, nq);
                for (size_t i = 0; i < nq; i++)
                    kept[i] = res->pareto[q[i].combo];
                free(res->pareto);
                res->pareto = kept;
                res->npareto = nq;
                free(q);
            }
        }
    }
    free(pp);
    free(S.cs);
    omp_destroy_lock(&locks[0]);
    omp_destroy_lock(&locks[1]);
    axes_resolution(res);
    if (rc) {
        sr_design_result_free(res);
        return rc;
    }
    /* the ranking: feasible combinations by objective, then margin, then order */
    res->rank = malloc(res->ncombos * sizeof *res->rank);
    if (!res->rank) {
        sr_design_result_free(res);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    int blocked = 1;
    for (size_t i = 0; i < res->ncombos; i++) {
        const sr_design_combo *c = &res->combo[i];
        if (c->feasible)
            res->rank[res->nranked++] = i;
        blocked &= c->bay_blocked != 0;
    }
    res->bay_blocks = res->nranked == 0 && blocked;
    for (size_t i = 1; i < res->nranked; i++) {
        size_t x = res->rank[i], j = i;
        while (j > 0) {
            const sr_design_point *a = &res->combo[x].best, *b = &res->combo[res->rank[j - 1]].best;
            double tol = 1e-9 * fmax(fabs(a->objective), fabs(b->objective));
            int before = fabs(a->objective - b->objective) > tol ? a->objective < b->objective
                         : a->worst.ratio != b->worst.ratio    ? a->worst.ratio < b->worst.ratio
                                                               : 0;
            if (!before)
                break;
            res->rank[j] = res->rank[j - 1];
            j--;
        }
        res->rank[j] = x;
    }
    return SR_OK;
}

void sr_design_result_free(sr_design_result *res)
{
    for (size_t i = 0; res->combo && i < res->ncombos; i++) {
        mission_release(res->combo[i].mission);
        free(res->combo[i].text);
    }
    free(res->combo);
    free(res->rank);
    free(res->pareto);
    memset(res, 0, sizeof *res);
}

/* ---- the risk check ---- */

int sr_design_risk(sr_design_result *res, size_t k, size_t n, unsigned long seed, double max_risk, int threads,
                   sr_error *err)
{
    size_t upto = k < res->nranked ? k : res->nranked;
    for (size_t i = 0; i < upto; i++) {
        sr_design_combo *c = &res->combo[res->rank[i]];
        if (!c->mission)
            continue;
        sr_disp_mission dm;
        memset(&dm, 0, sizeof dm);
        sr_disp_result dr;
        memset(&dr, 0, sizeof dr);
        int rc = sr_disp_mission_init(&dm, c->mission, NULL, 0, err);
        if (rc)
            return rc;
        sr_disp_options opt = {.n = n, .seed = seed, .threads = threads};
        rc = sr_disp_run(&dm.model, &c->mission->unc, &opt, &dr, err);
        if (rc) {
            sr_disp_mission_free(&dm);
            return rc;
        }
        size_t any = 0, per[SR_DISP_NLIMITS] = {0};
        for (size_t s = 0; s < dr.n; s++) {
            any += dr.flags[s] != 0;
            for (int b = 0; b < SR_DISP_NLIMITS; b++)
                per[b] += (dr.flags[s] >> b) & 1u;
        }
        c->risk_checked = 1;
        c->risk = (double)any / (double)dr.n;
        for (int b = 0; b < SR_DISP_NLIMITS; b++)
            c->risk_limit[b] = (double)per[b] / (double)dr.n;
        c->risk_dropped = c->risk > max_risk;
        sr_disp_result_release(&dr);
        sr_disp_mission_free(&dm);
    }
    size_t m = 0;
    for (size_t i = 0; i < res->nranked; i++)
        if (!res->combo[res->rank[i]].risk_dropped)
            res->rank[m++] = res->rank[i];
    res->nranked = m;
    return SR_OK;
}
