/* profile.c - running the staged descent: bodies (sections hanging
 * together), deployment events, the transient after each event by GSL's
 * adaptive ODE, the steady stages by quadrature, touchdown and the results. */
#include <gsl/gsl_errno.h>
#include <math.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "physics/opening.h"
#include "physics/plausible.h"
#include "physics/profile_int.h"

#define PI 3.14159265358979323846
#define MAX_SEGMENTS 2000
#define MAX_ODE_STEPS 2000000

const char *sr_profile_event_name(sr_event_kind k)
{
    switch (k) {
    case SR_EVENT_START: return "start";
    case SR_EVENT_DEPLOY: return "deployment";
    case SR_EVENT_LINE_STRETCH: return "line stretch";
    case SR_EVENT_FULL_OPEN: return "full open";
    case SR_EVENT_STEADY: return "steady descent";
    case SR_EVENT_TOUCHDOWN: return "touchdown";
    }
    return "?";
}

/* the wind of a sample: w' = k R(turn) w + d */
typedef struct wind_pert {
    double k, c, s, de, dn;
} wind_pert;

typedef struct body {
    int idx;               /* result body */
    sr_section_set secs;
    double mass, cd_sec;   /* kg; constant drag area of the sections themselves */
    sr_section_set free;   /* its sections with a Reynolds-dependent drag (in free fall only) */
    unsigned open;         /* stages open on it */
    int cur;               /* last stage deployed on it (time in stage), -1 */
    double t, y[6];        /* east, north, height, and their rates */
    int steady;
    int key;               /* cache key of the current transient */
    double o_t, o_y[6];    /* where the current transient began */
    double hstep;
} body;

typedef struct run {
    const sr_profile_ctx *c;
    sr_profile_perturb p;
    sr_profile_mode mode;
    sr_profile_work *w;
    sr_profile_result *r;
    sr_profile_track *track;
    seg_cache *rec;
    wind_pert wp;
    double cds[NS];
    double d0[NS];         /* nominal diameter of one canopy (area_scale) */
    double sec_mass[NSEC];
    double t_ls[NS], t_f[NS];
    int fired[NS];
    double t_fired[NS];
    body b[SR_PROFILE_MAX_BODIES];
    size_t nb;
    sr_error *err;
} run;

static inline void wind_of(const run *R, double h, double *we, double *wn)
{
    double e, n;
    sr_wind_at(&R->c->grid.wind, h, &e, &n);
    *we = R->wp.k * (R->wp.c * e + R->wp.s * n) + R->wp.de;
    *wn = R->wp.k * (-R->wp.s * e + R->wp.c * n) + R->wp.dn;
}

/* perturbed cumulative integrals from the tables */
static inline void cum_of(const run *R, double h, double *I, double *Je, double *Jn)
{
    double e, n;
    sr_profile_grid_cumulative(&R->c->grid, h, I, &e, &n);
    *Je = R->wp.k * (R->wp.c * e + R->wp.s * n) + R->wp.de * *I;
    *Jn = R->wp.k * (-R->wp.s * e + R->wp.c * n) + R->wp.dn * *I;
}

/* perturbed shear-lag integrals (a uniform added wind has no shear) */
static inline void lag_of(const run *R, double h, double *Le, double *Ln)
{
    double e, n;
    sr_profile_grid_lag(&R->c->grid, h, &e, &n);
    *Le = R->wp.k * (R->wp.c * e + R->wp.s * n);
    *Ln = R->wp.k * (-R->wp.s * e + R->wp.c * n);
}

/* No canopy open and sections whose drag depends on the Reynolds number:
 * the drag curves act, and the fall is integrated to the ground. */
static inline int in_free_fall(const body *b)
{
    return b->open == 0 && b->free != 0;
}

static double body_cd_full(const run *R, const body *b)
{
    double C = b->cd_sec;
    for (size_t k = 0; k < R->c->nstg; k++)
        if ((b->open >> k) & 1u)
            C += R->cds[k];
    return C;
}

static double body_cd_at(const run *R, const body *b, double t)
{
    double C = b->cd_sec;
    for (size_t k = 0; k < R->c->nstg; k++) {
        if (!((b->open >> k) & 1u))
            continue;
        if (t < R->t_ls[k])
            continue;
        if (isnan(R->t_f[k])) {
            C += R->cds[k]; /* filling not resolved (fast mode): open */
            continue;
        }
        double tau = (t - R->t_ls[k]) / R->t_f[k];
        C += tau >= 1.0 ? R->cds[k] : R->cds[k] * pow(tau, R->c->st[k].growth);
    }
    return C;
}

static void body_mass(const run *R, body *b)
{
    const sr_profile_ctx *c = R->c;
    b->mass = 0.0;
    b->cd_sec = 0.0;
    b->free = b->secs & c->fall.secs;
    for (size_t i = 0; i < c->nsec; i++)
        if ((b->secs >> i) & 1u) {
            b->mass += R->sec_mass[i];
            b->cd_sec += c->sec_cda[i];
        }
    for (size_t k = 0; k < c->nstg; k++)
        if ((b->secs >> c->st[k].fabric_owner) & 1u)
            b->mass += c->st[k].fabric * R->p.mass_scale * R->p.area_scale[k];
}

static double steady_rate(const run *R, const body *b, double h)
{
    double C = body_cd_full(R, b), rho, g;
    sr_profile_grid_air(&R->c->grid, h, &rho, NULL, &g);
    return C > 0.0 ? sqrt(2.0 * b->mass * g / (rho * C)) : INFINITY;
}

static void airspeed(const run *R, const double y[6], double *V, double *ue, double *un)
{
    double we, wn;
    wind_of(R, y[2], &we, &wn);
    *ue = y[3] - we;
    *un = y[4] - wn;
    *V = sqrt(*ue * *ue + *un * *un + y[5] * y[5]);
}

static sr_profile_event *add_event(run *R, sr_event_kind kind, int stage, const body *b)
{
    sr_profile_result *r = R->r;
    if (r->nevents >= SR_PROFILE_MAX_EVENTS) {
        r->events_dropped++;
        return NULL;
    }
    sr_profile_event *e = &r->events[r->nevents++];
    double V, ue, un, rho, a;
    airspeed(R, b->y, &V, &ue, &un);
    sr_profile_grid_air(&R->c->grid, b->y[2], &rho, &a, NULL);
    e->kind = kind;
    e->stage = stage;
    e->body = b->idx;
    e->sections = b->secs;
    e->t = b->t;
    e->h = b->y[2];
    e->east = b->y[0];
    e->north = b->y[1];
    e->speed = V;
    e->rate = -b->y[5];
    e->q = 0.5 * rho * V * V;
    e->mach = V / a;
    return e;
}

static void add_point(run *R, const body *b)
{
    sr_profile_track *tr = R->track;
    if (!tr || tr->n >= tr->cap)
        return;
    double V, ue, un;
    airspeed(R, b->y, &V, &ue, &un);
    sr_profile_point *p = &tr->pt[tr->n++];
    p->t = b->t;
    p->h = b->y[2];
    p->east = b->y[0];
    p->north = b->y[1];
    p->speed = V;
    p->rate = -b->y[5];
    /* what an accelerometer on the body reads: the drag over the mass, the filling canopies at their
     * present drag area */
    double rho, C = body_cd_at(R, b, b->t);
    sr_profile_grid_air(&R->c->grid, b->y[2], &rho, NULL, NULL);
    if (in_free_fall(b))
        C += sr_profile_free_cda(&R->c->fall, b->free, V, rho, sr_profile_grid_mu(&R->c->grid, b->y[2]), NULL);
    p->accel = b->mass > 0.0 ? 0.5 * rho * V * V * C / b->mass : NAN;
    p->body = b->idx;
}

static void set_steady_state(const run *R, body *b)
{
    double we, wn;
    wind_of(R, b->y[2], &we, &wn);
    b->y[3] = we;
    b->y[4] = wn;
    b->y[5] = -steady_rate(R, b, b->y[2]);
    b->steady = 1;
}

static void begin_transient(body *b, int key)
{
    b->steady = 0;
    b->key = key;
    b->o_t = b->t;
    memcpy(b->o_y, b->y, sizeof b->y);
}

/* ---- events ---- */

static int stage_armed(const run *R, const body *b, size_t k)
{
    const stage_c *s = &R->c->st[k];
    if (R->fired[k] || (s->carries & ~b->secs))
        return 0;
    for (size_t j = 0; j < k; j++)
        if ((R->c->st[j].carries & s->carries) && !R->fired[j])
            return 0;
    return 1;
}

/* Time a delay stage fires: after the latest earlier deployment on its sections. */
static double delay_time(const run *R, size_t k)
{
    double ref = 0.0;
    for (size_t j = 0; j < k; j++)
        if ((R->c->st[j].carries & R->c->st[k].carries) && R->fired[j] && R->t_fired[j] > ref)
            ref = R->t_fired[j];
    return ref + R->c->st[k].value + R->p.deploy_delay[k];
}

static double height_of(const run *R, size_t k)
{
    return R->c->st[k].value + R->p.deploy_height[k];
}

static void end_stage(run *R, body *b)
{
    if (b->cur < 0)
        return;
    sr_profile_stage *s = &R->r->stage[b->cur];
    s->t_end = b->t;
    s->h_end = b->y[2];
    double rho, g;
    sr_profile_grid_air(&R->c->grid, b->y[2], &rho, NULL, &g);
    s->rate_bottom = sqrt(2.0 * s->mass * g / (rho * s->cds));
}

static int fire(run *R, body *b, size_t k)
{
    const sr_profile_ctx *c = R->c;
    const stage_c *st = &c->st[k];
    sr_profile_stage *s = &R->r->stage[k];
    R->fired[k] = 1;
    R->t_fired[k] = b->t;
    double V, ue, un, rho, a;
    airspeed(R, b->y, &V, &ue, &un);
    sr_profile_grid_air(&c->grid, b->y[2], &rho, &a, NULL);
    s->t_deploy = b->t;
    s->h_deploy = b->y[2];
    s->speed_deploy = V;
    s->q_deploy = 0.5 * rho * V * V;
    s->mach_deploy = V / a;
    s->rho_deploy = rho;
    s->body = b->idx;
    add_event(R, SR_EVENT_DEPLOY, (int)k, b);
    if ((c->o.failed >> k) & 1u) {
        s->deployed = 0;
        return SR_OK;
    }
    s->deployed = 1;
    body *d = b;
    if (st->carries != b->secs) {
        /* a separation: the carried sections go on under this canopy */
        if (R->nb >= SR_PROFILE_MAX_BODIES)
            return sr_error_set(R->err, SR_EINVAL, "more than %d separate bodies", SR_PROFILE_MAX_BODIES);
        d = &R->b[R->nb];
        *d = *b;
        d->idx = (int)R->nb;
        R->nb++;
        d->secs = st->carries;
        d->open = 0;
        d->cur = -1;
        body_mass(R, d);
        sr_profile_body *rb = &R->r->body[d->idx];
        rb->sections = d->secs;
        rb->parent = b->idx;
        rb->stage_split = (int)k;
        R->r->nbodies = R->nb;
        b->secs &= ~st->carries;
        body_mass(R, b);
        begin_transient(b, KEY_REST(k));
        s->body = d->idx;
    } else {
        end_stage(R, b);
        if (!st->keep_prev)
            d->open = 0;
    }
    d->open |= 1u << k;
    d->cur = (int)k;
    begin_transient(d, (int)k);
    R->t_ls[k] = d->t + st->line_stretch;
    R->t_f[k] = NAN;
    s->cds = body_cd_full(R, d);
    s->mass = d->mass;
    s->rate_top = steady_rate(R, d, d->y[2]);
    s->d0 = R->d0[k];
    s->cds_canopy = R->cds[k] / st->count;
    /* until line stretch is resolved by the ODE: the deployment state, shifted in
     * the fast mode as the nominal descent's line stretch was from its deployment */
    s->t_line = R->t_ls[k];
    s->speed_line = V;
    s->h_line = d->y[2];
    s->path_line = atan2(-d->y[5], hypot(ue, un));
    if (R->mode == SR_PROFILE_FAST && st->line_stretch > 0.0) {
        const sr_profile_stage *n = &c->nominal.stage[k];
        if (n->deployed && isfinite(n->speed_line)) {
            s->speed_line = fmax(0.0, V + n->speed_line - n->speed_deploy);
            s->h_line = fmax(0.0, d->y[2] + n->h_line - n->h_deploy);
            s->path_line = n->path_line;
        }
    }
    sr_opening_fill_time(st->fill_n, R->d0[k], s->speed_line, s->rate_top, &s->t_fill, NULL);
    return SR_OK;
}

/* Fire every stage whose event has come for body b. */
static int fire_ready(run *R, body *b)
{
    const sr_profile_ctx *c = R->c;
    for (int again = 1; again;) {
        again = 0;
        for (size_t k = 0; k < c->nstg; k++) {
            if (!stage_armed(R, b, k))
                continue;
            const stage_c *st = &c->st[k];
            int now = st->kind == SR_DEPLOY_APOGEE ||
                      (st->kind == SR_DEPLOY_ALTITUDE && b->y[2] <= height_of(R, k) + 1e-9) ||
                      (st->kind == SR_DEPLOY_DELAY && b->t >= delay_time(R, k) - 1e-12);
            if (!now)
                continue;
            int rc = fire(R, b, k);
            if (rc)
                return rc;
            again = 1;
            break;
        }
    }
    return SR_OK;
}

/* Next stop for body b: the highest armed height event (or the ground) and
 * the earliest armed delay event. */
static void next_stop(const run *R, const body *b, double *h_stop, double *t_stop)
{
    *h_stop = 0.0;
    *t_stop = INFINITY;
    for (size_t k = 0; k < R->c->nstg; k++) {
        if (!stage_armed(R, b, k))
            continue;
        if (R->c->st[k].kind == SR_DEPLOY_ALTITUDE && height_of(R, k) > *h_stop)
            *h_stop = height_of(R, k);
        else if (R->c->st[k].kind == SR_DEPLOY_DELAY && delay_time(R, k) < *t_stop)
            *t_stop = delay_time(R, k);
    }
}

/* ---- the transient: ODE ---- */

typedef struct ode_par {
    const run *R;
    const body *b;
} ode_par;

static int rhs(double t, const double y[], double dydt[], void *params)
{
    const ode_par *p = params;
    double rho, g, we, wn;
    sr_profile_grid_air(&p->R->c->grid, y[2], &rho, NULL, &g);
    wind_of(p->R, y[2], &we, &wn);
    double ue = y[3] - we, un = y[4] - wn, uz = y[5];
    double V = sqrt(ue * ue + un * un + uz * uz);
    double C = body_cd_at(p->R, p->b, t);
    if (in_free_fall(p->b))
        C += sr_profile_free_cda(&p->R->c->fall, p->b->free, V, rho, sr_profile_grid_mu(&p->R->c->grid, y[2]), NULL);
    double k = 0.5 * rho * C * V / p->b->mass;
    dydt[0] = y[3];
    dydt[1] = y[4];
    dydt[2] = y[5];
    dydt[3] = -k * ue;
    dydt[4] = -k * un;
    dydt[5] = -k * uz - g;
    return GSL_SUCCESS;
}

/* End of filling of every open canopy known and passed, and the airspeed
 * vector within steady_tol of the steady one. */
static int is_steady(const run *R, const body *b)
{
    double tol = R->c->o.steady_tol;
    if (!(tol > 0.0) || in_free_fall(b))
        return 0;
    for (size_t k = 0; k < R->c->nstg; k++)
        if (((b->open >> k) & 1u) && (isnan(R->t_f[k]) || b->t < R->t_ls[k] + R->t_f[k] - 1e-12))
            return 0;
    double vt = steady_rate(R, b, b->y[2]);
    if (!isfinite(vt))
        return 0;
    double V, ue, un;
    airspeed(R, b->y, &V, &ue, &un);
    /* falling through wind shear the body lags the air by (vt^2/g) dw/dh
     * (linearised horizontal drag rate g/vt): that lag is part of the
     * equilibrium, not of the transient */
    double h = b->y[2], d = 0.5, e1, n1, e0, n0, rho, g;
    wind_of(R, h + d, &e1, &n1);
    wind_of(R, h > d ? h - d : 0.0, &e0, &n0);
    sr_profile_grid_air(&R->c->grid, h, &rho, NULL, &g);
    double k = vt * vt / g / (h > d ? 2 * d : h + d);
    double lx = ue - k * (e1 - e0), ly = un - k * (n1 - n0), dz = b->y[5] + vt;
    return sqrt(lx * lx + ly * ly + dz * dz) <= tol * vt;
}

/* Line stretch of canopies whose time has come: fix their filling time. */
static void line_stretch(run *R, body *b)
{
    for (size_t k = 0; k < R->c->nstg; k++) {
        if (!((b->open >> k) & 1u) || !isnan(R->t_f[k]) || b->t < R->t_ls[k] - 1e-12)
            continue;
        double V, ue, un;
        airspeed(R, b->y, &V, &ue, &un);
        const stage_c *st = &R->c->st[k];
        sr_profile_stage *s = &R->r->stage[k];
        /* the one filling-time definition (opening.h): t_f = n D0 / max(v, steady rate) */
        if (sr_opening_fill_time(st->fill_n, R->d0[k], V, s->rate_top, &R->t_f[k], NULL) != SR_OK)
            R->t_f[k] = INFINITY; /* no speed and no steady rate: it never fills */
        s->t_line = b->t;
        s->speed_line = V;
        s->h_line = b->y[2];
        s->path_line = atan2(-b->y[5], hypot(ue, un));
        s->t_fill = R->t_f[k];
        if (st->line_stretch > 0.0)
            add_event(R, SR_EVENT_LINE_STRETCH, (int)k, b);
    }
}

static double next_kink(const run *R, const body *b)
{
    double t = INFINITY;
    for (size_t k = 0; k < R->c->nstg; k++) {
        if (!((b->open >> k) & 1u))
            continue;
        if (R->t_ls[k] > b->t + 1e-12 && R->t_ls[k] < t)
            t = R->t_ls[k];
        if (!isnan(R->t_f[k])) {
            double e = R->t_ls[k] + R->t_f[k];
            if (e > b->t + 1e-12 && e < t)
                t = e;
        }
    }
    return t;
}

/* Find where the last step crossed h_stop by regula falsi on single steps
 * from its start: GSL's evolve has no event location. */
static int locate(run *R, body *b, gsl_odeiv2_system *sys, double tp, const double yp[6], double h_stop)
{
    double ta = tp, fa = yp[2] - h_stop, tb = b->t, fb = b->y[2] - h_stop;
    double y[6], yerr[6];
    int side = 0;
    for (int it = 0; it < 60; it++) {
        double tm = (fa * tb - fb * ta) / (fa - fb);
        if (!(tm > ta && tm < tb))
            tm = 0.5 * (ta + tb);
        memcpy(y, yp, sizeof y);
        gsl_odeiv2_step_reset(R->w->step);
        if (gsl_odeiv2_step_apply(R->w->step, tp, tm - tp, y, yerr, NULL, NULL, sys) != GSL_SUCCESS)
            return sr_error_set(R->err, SR_ENUMERIC, "the descent ODE failed while locating an event");
        double fm = y[2] - h_stop;
        b->t = tm;
        memcpy(b->y, y, sizeof y);
        if (fabs(fm) <= 1e-9 * (1.0 + fabs(h_stop)) || tb - ta < 1e-12)
            break;
        if ((fm > 0) == (fa > 0)) {
            ta = tm;
            fa = fm;
            if (side == 1)
                fb *= 0.5;
            side = 1;
        } else {
            tb = tm;
            fb = fm;
            if (side == -1)
                fa *= 0.5;
            side = -1;
        }
    }
    b->y[2] = h_stop; /* within 1e-9 m: exact for the events that follow */
    return SR_OK;
}

static void record_full_open(run *R, const body *b, double tp)
{
    for (size_t k = 0; k < R->c->nstg; k++) {
        if (!((b->open >> k) & 1u) || isnan(R->t_f[k]))
            continue;
        double e = R->t_ls[k] + R->t_f[k];
        if (e > tp && e <= b->t + 1e-12 && isnan(R->r->stage[k].t_full)) {
            R->r->stage[k].t_full = b->t;
            R->r->stage[k].h_full = b->y[2];
            add_event(R, SR_EVENT_FULL_OPEN, (int)k, b);
        }
    }
}

/* One line on why the transient ODE gave up: the stage, where, and the likely
 * cause (a descent so slow or a filling so long that no step size fits it). */
static int ode_failure(run *R, const body *b, const char *what)
{
    char who[SR_DESCENT_NAME_MAX + 64];
    if (b->cur >= 0)
        snprintf(who, sizeof who, "stage '%s'", R->c->st[b->cur].name);
    else
        snprintf(who, sizeof who, "the fall before any canopy opens");
    double vt = steady_rate(R, b, b->y[2]), tf = 0.0;
    for (size_t k = 0; k < R->c->nstg; k++)
        if (((b->open >> k) & 1u) && isfinite(R->r->stage[k].t_fill))
            tf = fmax(tf, R->r->stage[k].t_fill);
    char cause[256] = "";
    if (isfinite(vt) && vt < 0.5)
        snprintf(cause, sizeof cause, ": its steady descent rate is only %.3g m/s%s (is the mass or the canopy size "
                                      "in the wrong unit?)",
                 vt, tf > 60.0 ? ", so slow that the canopy would take minutes to fill" : "");
    else if (tf > 60.0)
        snprintf(cause, sizeof cause, ": the filling time n D0 / v is %.3g s (is the canopy size in the wrong unit?)",
                 tf);
    return sr_error_set(R->err, SR_ENUMERIC, "%s: %s at %.3f s, %.1f m above ground%s", who, what, b->t, b->y[2],
                        cause);
}

/* The trajectory rose above the heights the tables hold: they reach the
 * drag-free climb of the start, so only the top of the atmosphere model
 * stops it -- or a sample whose start was raised more than prepared for. */
static int above_tables(run *R, const body *b)
{
    const sr_profile_ctx *c = R->c;
    double lo, hi;
    sr_atmos_range(&c->grid.atmos, &lo, &hi);
    if (c->top_is_model)
        return sr_error_set(R->err, SR_EDOMAIN,
                            "%s: from this start (%.0f m/s, %.0f deg above the horizontal) the trajectory climbs "
                            "past %.0f m above sea level, the top of the atmosphere model, %.0f s after the start; "
                            "nothing above it is modelled (a lower speed, a flatter path or an earlier deployment "
                            "keeps it inside)",
                            c->start_at, c->start_v, -c->start_gamma * 180.0 / PI, hi, b->t);
    return sr_error_set(R->err, SR_EDOMAIN,
                        "%s: the trajectory climbs past %.0f m above ground, above the heights prepared for this "
                        "start and its uncertainty",
                        c->start_at, c->top);
}

/* why: 0 steady, 1 reached h_stop, 2 reached t_stop */
static int ode_segment(run *R, body *b, double h_stop, double t_stop, int *why)
{
    sr_profile_work *w = R->w;
    ode_par par = {R, b};
    gsl_odeiv2_system sys = {rhs, NULL, 6, &par};
    gsl_odeiv2_evolve_reset(w->evolve);
    gsl_odeiv2_step_reset(w->step);
    if (!(b->hstep > 0.0))
        b->hstep = 1e-3;
    R->r->ode_segments++;
    if (b->open == 0 && b->cd_sec == 0.0 && !b->free)
        R->r->body[b->idx].no_drag = 1;
    /* a filling far longer than the motion's relaxation time vt / g needs about t_f g / vt steps of an
     * explicit scheme: say so at once rather than after millions of steps */
    double vt = steady_rate(R, b, b->y[2]);
    for (size_t k = 0; k < R->c->nstg && isfinite(vt) && vt > 0.0; k++) {
        double tf = R->r->stage[k].t_fill;
        if (((b->open >> k) & 1u) && isfinite(tf) && tf * 9.80665 / vt > (double)MAX_ODE_STEPS) {
            char what[96];
            snprintf(what, sizeof what, "the transient would take more than %d ODE steps", MAX_ODE_STEPS);
            return ode_failure(R, b, what);
        }
    }
    for (long n = 0; n < MAX_ODE_STEPS; n++) {
        line_stretch(R, b);
        double t1 = fmin(t_stop, next_kink(R, b));
        if (!isfinite(t1))
            t1 = b->t + 1e5;
        double tp = b->t, yp[6];
        memcpy(yp, b->y, sizeof yp);
        int st = gsl_odeiv2_evolve_apply(w->evolve, w->control, w->step, &sys, &b->t, t1, &b->hstep, b->y);
        if (st != GSL_SUCCESS) {
            char what[128];
            snprintf(what, sizeof what, "the descent ODE failed (%s)", gsl_strerror(st));
            return ode_failure(R, b, what);
        }
        if (b->y[2] <= h_stop) {
            int rc = locate(R, b, &sys, tp, yp, h_stop);
            if (rc)
                return rc;
            record_full_open(R, b, tp);
            *why = 1;
            return SR_OK;
        }
        if (b->y[2] > R->c->top)
            return above_tables(R, b);
        record_full_open(R, b, tp);
        add_point(R, b);
        if (b->t >= t_stop) {
            *why = 2;
            return SR_OK;
        }
        if (t1 > b->t + 1e-12 && b->t - tp <= 0.0)
            return ode_failure(R, b, "the descent ODE made no progress");
        if (is_steady(R, b)) {
            *why = 0;
            return SR_OK;
        }
    }
    char what[96];
    snprintf(what, sizeof what, "the transient did not settle within %d ODE steps", MAX_ODE_STEPS);
    return ode_failure(R, b, what);
}

/* ---- steady stages: quadrature ---- */

typedef struct quad_par {
    const sr_profile_ctx *c;
    int which; /* 0: f, 1: we f, 2: wn f, 3: we phi', 4: wn phi' */
    int bad;
} quad_par;

static double integrand(double h, void *params)
{
    quad_par *q = params;
    double f, we, wn, phi, dphi = 0.0;
    if (sr_profile_grid_direct(&q->c->grid, h, &f, &we, &wn) || (q->which >= 3 && sr_profile_grid_phi(&q->c->grid, h, &phi, &dphi))) {
        q->bad = 1;
        return 0.0;
    }
    switch (q->which) {
    case 0: return f;
    case 1: return we * f;
    case 2: return wn * f;
    case 3: return we * dphi;
    default: return wn * dphi;
    }
}

/* Integrals from lo to hi by GSL QAG (unperturbed wind): of f, we f, wn f,
 * and the shear lag integrals of phi dw (by parts: [phi w] - w phi' dh). */
static int quad5(run *R, double lo, double hi, double out[5])
{
    for (int i = 0; i < 5; i++) {
        out[i] = 0.0;
        if (i > 0 && R->c->grid.wind.kind == SR_WIND_CALM)
            continue;
        quad_par qp = {R->c, i, 0};
        gsl_function F = {integrand, &qp};
        double err;
        /* QAGS: its extrapolation copes with the power law's infinite slope at the ground */
        int st = i == 0 ? gsl_integration_qag(&F, lo, hi, 1e-12, R->c->o.quad_tol, 256, GSL_INTEG_GAUSS21, R->w->quad,
                                              &out[i], &err)
                        : gsl_integration_qags(&F, lo, hi, 1e-12, R->c->o.quad_tol, 256, R->w->quad, &out[i], &err);
        if (qp.bad)
            return sr_error_set(R->err, SR_EDOMAIN, "the descent leaves the atmosphere model");
        if (st != GSL_SUCCESS && st != GSL_EROUND)
            return sr_error_set(R->err, SR_ENUMERIC, "the descent-time quadrature failed (%s)", gsl_strerror(st));
    }
    if (R->c->grid.wind.kind != SR_WIND_CALM) {
        double pa, pb, ea, na, eb, nb;
        if (sr_profile_grid_phi(&R->c->grid, lo, &pa, NULL) || sr_profile_grid_phi(&R->c->grid, hi, &pb, NULL))
            return sr_error_set(R->err, SR_EDOMAIN, "the descent leaves the atmosphere model");
        sr_wind_at(&R->c->grid.wind, lo, &ea, &na);
        sr_wind_at(&R->c->grid.wind, hi, &eb, &nb);
        out[3] = pb * eb - pa * ea - out[3];
        out[4] = pb * nb - pa * na - out[4];
    }
    return SR_OK;
}

static int qs_segment(run *R, body *b, double h_stop, double t_stop, int *why)
{
    const sr_profile_ctx *c = R->c;
    double C = body_cd_full(R, b), s = sqrt(C / (2.0 * b->mass));
    double h0 = b->y[2], h1 = h_stop;
    double I0, E0, N0, I1, E1, N1;
    cum_of(R, h0, &I0, &E0, &N0);
    cum_of(R, h1, &I1, &E1, &N1);
    *why = 1;
    if (b->t + s * (I0 - I1) > t_stop) {
        *why = 2;
        h1 = sr_profile_grid_height_for_I(&c->grid, I0 - (t_stop - b->t) / s);
        if (h1 < h_stop)
            h1 = h_stop;
        cum_of(R, h1, &I1, &E1, &N1);
    }
    double La0, Ln0, La1, Ln1;
    lag_of(R, h0, &La0, &Ln0);
    lag_of(R, h1, &La1, &Ln1);
    /* drift: the wind, plus the lag of a body falling through shear, (v/g) dw */
    double dI = I0 - I1, dE = E0 - E1 + (La0 - La1) / (s * s), dN = N0 - N1 + (Ln0 - Ln1) / (s * s);
    if (R->mode == SR_PROFILE_FULL && h0 > h1) {
        double q[5];
        int rc = quad5(R, h1, h0, q);
        if (rc)
            return rc;
        if (*why == 2) {
            /* polish the height of the time event by Newton on the direct integral */
            for (int it = 0; it < 4; it++) {
                double F = s * q[0] - (t_stop - b->t), f, we, wn;
                if (fabs(F) < 1e-10 * (1.0 + t_stop))
                    break;
                sr_profile_grid_direct(&c->grid, h1, &f, &we, &wn);
                h1 += F / (s * f); /* dF/dh1 = -s f */
                if (h1 > h0)
                    h1 = h0;
                if ((rc = quad5(R, h1, h0, q)))
                    return rc;
            }
        }
        dI = q[0];
        dE = R->wp.k * (R->wp.c * q[1] + R->wp.s * q[2]) + R->wp.de * q[0];
        dN = R->wp.k * (-R->wp.s * q[1] + R->wp.c * q[2]) + R->wp.dn * q[0];
        dE += R->wp.k * (R->wp.c * q[3] + R->wp.s * q[4]) / (s * s);
        dN += R->wp.k * (-R->wp.s * q[3] + R->wp.c * q[4]) / (s * s);
    }
    if (R->track && h0 > h1) {
        /* points for plots from the tables (1e-6 of the quadrature) */
        double span_t = s * dI, dt = R->track->dt > 0 ? R->track->dt : 1.0;
        int np = (int)fmin(400.0, ceil(span_t / dt));
        for (int i = 1; i < np; i++) {
            double h = h0 - (h0 - h1) * i / np, I, E, N, La, Ln;
            cum_of(R, h, &I, &E, &N);
            lag_of(R, h, &La, &Ln);
            body tmp = *b;
            tmp.t = b->t + s * (I0 - I);
            tmp.y[0] = b->y[0] + s * (E0 - E) + (La0 - La) / s;
            tmp.y[1] = b->y[1] + s * (N0 - N) + (Ln0 - Ln) / s;
            tmp.y[2] = h;
            set_steady_state(R, &tmp);
            add_point(R, &tmp);
        }
    }
    b->t += s * dI;
    b->y[0] += s * dE;
    b->y[1] += s * dN;
    b->y[2] = h1;
    set_steady_state(R, b);
    add_point(R, b);
    return SR_OK;
}

/* ---- the fast mode's transient: the nominal one, shifted (profile_fast.c) ---- */

static int fast_jump(run *R, body *b, double h_stop, double t_stop, int *why)
{
    const sr_profile_ctx *c = R->c;
    const seg_cache *k = &c->cache[b->key];
    if (!k->valid || b->t != b->o_t)
        return 0;
    double C = body_cd_full(R, b), s = sqrt(C / (2.0 * b->mass)), h0 = b->y[2];
    double rho, g;
    sr_profile_grid_air(&c->grid, h0, &rho, NULL, &g);
    double vt = sqrt(2.0 * b->mass * g / (rho * C)), V, ue, un;
    airspeed(R, b->y, &V, &ue, &un);
    double v0 = -b->y[5];
    double dt = k->dt + sr_profile_lag_time(v0, vt, g) - sr_profile_lag_time(k->v0, k->vt, k->g);
    double ts = sr_profile_lag_distance(1.0, v0, vt, g), tn = sr_profile_lag_distance(1.0, k->v0, k->vt, k->g);
    double dx = k->dx + ue * ts - k->ue * tn, dy = k->dy + un * ts - k->un * tn;
    double ratio = vt / k->vt;
    double span = k->span * fmax(1.0, ratio * ratio) * 1.25 + 1.0;
    double I0, E0, N0, I1, E1, N1, h1 = h_stop;
    cum_of(R, h0, &I0, &E0, &N0);
    cum_of(R, h1, &I1, &E1, &N1);
    *why = 1;
    if (b->t + s * (I0 - I1) + dt > t_stop) {
        *why = 2;
        h1 = sr_profile_grid_height_for_I(&c->grid, I0 - (t_stop - b->t - dt) / s);
        if (h1 < h_stop)
            h1 = h_stop;
        cum_of(R, h1, &I1, &E1, &N1);
    }
    /* reuse only a transient that is a small part of the segment: where it takes
     * a large part (a low drop) the first-order shift is not good enough */
    if (h0 - h1 < span || span > 0.25 * (h0 - h_stop))
        return 0;
    for (size_t j = 0; j < c->nstg; j++)
        if (((b->open >> j) & 1u) && isnan(R->t_f[j]))
            R->t_f[j] = R->r->stage[j].t_fill; /* filled within the jump: the estimate from the deployment speed */
    double La0, Ln0, La1, Ln1;
    lag_of(R, h0, &La0, &Ln0);
    lag_of(R, h1, &La1, &Ln1);
    b->t += s * (I0 - I1) + dt;
    b->y[0] += s * (E0 - E1) + (La0 - La1) / s + dx;
    b->y[1] += s * (N0 - N1) + (Ln0 - Ln1) / s + dy;
    b->y[2] = h1;
    set_steady_state(R, b);
    return 1;
}

/* Context build: keep the nominal transient against the steady descent. */
static void record_cache(run *R, const body *b)
{
    if (!R->rec)
        return;
    seg_cache *k = &R->rec[b->key];
    double C = body_cd_full(R, b), s = sqrt(C / (2.0 * b->mass));
    double I0, E0, N0, I1, E1, N1, rho, g, V, ue, un;
    cum_of(R, b->o_y[2], &I0, &E0, &N0);
    cum_of(R, b->y[2], &I1, &E1, &N1);
    sr_profile_grid_air(&R->c->grid, b->o_y[2], &rho, NULL, &g);
    airspeed(R, b->o_y, &V, &ue, &un);
    k->valid = 1;
    k->dt = (b->t - b->o_t) - s * (I0 - I1);
    double La0, Ln0, La1, Ln1;
    lag_of(R, b->o_y[2], &La0, &Ln0);
    lag_of(R, b->y[2], &La1, &Ln1);
    k->dx = (b->y[0] - b->o_y[0]) - s * (E0 - E1) - (La0 - La1) / s;
    k->dy = (b->y[1] - b->o_y[1]) - s * (N0 - N1) - (Ln0 - Ln1) / s;
    k->span = b->o_y[2] - b->y[2];
    k->vt = sqrt(2.0 * b->mass * g / (rho * C));
    k->g = g;
    k->v0 = -b->o_y[5];
    k->ue = ue;
    k->un = un;
}

/* ---- one body from its creation to touchdown ---- */

static int touchdown(run *R, body *b)
{
    sr_profile_body *rb = &R->r->body[b->idx];
    double V, ue, un;
    airspeed(R, b->y, &V, &ue, &un);
    rb->sections = b->secs;
    rb->mass = b->mass;
    rb->t_land = b->t;
    rb->east = b->y[0];
    rb->north = b->y[1];
    rb->drift = hypot(b->y[0], b->y[1]);
    double brg = atan2(b->y[0], b->y[1]);
    rb->bearing = brg < 0 ? brg + 2 * PI : brg;
    rb->rate_land = -b->y[5];
    rb->speed_land = V;
    rb->ground_speed = hypot(b->y[3], b->y[4]);
    rb->steady_land = b->steady;
    rb->open = b->open;
    rb->canopies = 0;
    for (unsigned o = b->open; o; o >>= 1)
        rb->canopies += (int)(o & 1u);
    rb->speed_arrive = rb->v_terminal = NAN;
    if (in_free_fall(b)) {
        sr_free_eq eq;
        if (!R->w)
            return sr_error_set(R->err, SR_EINVAL, "a workspace is needed for the free-fall equilibria");
        int rc = sr_profile_free_equilibria(&R->c->fall, &R->c->grid, R->w->root, b->free, b->mass, b->cd_sec, 0.0, &eq, R->err);
        if (rc)
            return rc;
        double rho, a;
        sr_profile_grid_air(&R->c->grid, 0.0, &rho, &a, NULL);
        rb->free_fall = 1;
        rb->equilibria = eq.n;
        rb->speed_arrive = V;
        rb->v_terminal = eq.v_fast;
        rb->drag_warn = eq.warn;
        (void)sr_profile_free_cda(&R->c->fall, b->free, V, rho, sr_profile_grid_mu(&R->c->grid, 0.0), &rb->drag_warn);
        if (V / a > 0.3)
            rb->drag_warn |= SR_BLUFF_WARN_MACH;
        if (eq.n > 1 && eq.v_fast > V) {
            /* drag crisis: it may as well fall on the fastest branch */
            rb->crisis = 1;
            rb->rate_land = fmax(rb->rate_land, eq.v_fast);
            rb->speed_land = eq.v_fast;
        }
    }
    end_stage(R, b);
    add_event(R, SR_EVENT_TOUCHDOWN, -1, b);
    return SR_OK;
}

static int simulate(run *R, body *b)
{
    int rc;
    for (int seg = 0; seg < MAX_SEGMENTS; seg++) {
        if ((rc = fire_ready(R, b)))
            return rc;
        if (b->y[2] <= 0.0)
            return touchdown(R, b);
        double h_stop, t_stop;
        next_stop(R, b, &h_stop, &t_stop);
        int why = 1;
        if (b->steady) {
            rc = qs_segment(R, b, h_stop, t_stop, &why);
        } else if (R->mode == SR_PROFILE_FAST && fast_jump(R, b, h_stop, t_stop, &why)) {
            rc = SR_OK;
        } else {
            if (!R->w)
                return sr_error_set(R->err, SR_EINVAL, "a workspace is needed for the ODE");
            rc = ode_segment(R, b, h_stop, t_stop, &why);
            if (!rc && why == 0) {
                record_cache(R, b);
                if (b->key < NS && isnan(R->r->stage[b->key].t_steady)) {
                    R->r->stage[b->key].t_steady = b->t;
                    R->r->stage[b->key].h_steady = b->y[2];
                }
                add_event(R, SR_EVENT_STEADY, b->key < NS ? b->key : -1, b);
                b->steady = 1;
            }
        }
        if (rc)
            return rc;
        if (why == 2)
            b->t = t_stop; /* the quadrature and table inversions land within 1e-10 s of it */
        if (b->y[2] <= 0.0 && why == 1 && h_stop <= 0.0) {
            b->y[2] = 0.0;
            return touchdown(R, b);
        }
    }
    return sr_error_set(R->err, SR_ENUMERIC, "the descent did not reach the ground in %d segments", MAX_SEGMENTS);
}

static void finish(run *R)
{
    const sr_profile_ctx *c = R->c;
    sr_profile_result *r = R->r;
    r->nsections = c->nsec;
    r->descent_time = r->max_rate = r->max_energy = r->max_drift = 0.0;
    for (size_t i = 0; i < r->nbodies; i++) {
        const sr_profile_body *b = &r->body[i];
        r->descent_time = fmax(r->descent_time, b->t_land);
        r->max_rate = fmax(r->max_rate, b->rate_land);
        r->max_drift = fmax(r->max_drift, b->drift);
        for (size_t s = 0; s < c->nsec; s++)
            if ((b->sections >> s) & 1u) {
                r->section_body[s] = (int)i;
                r->section_rate[s] = b->rate_land;
            }
    }
    /* rigid groups land as one piece (the check at load keeps them in one body) */
    int grp[NSEC];
    for (size_t s = 0; s < c->nsec; s++)
        grp[s] = (int)s;
    for (int changed = 1; changed;) {
        changed = 0;
        for (size_t s = 0; s < c->nsec; s++) {
            int j = c->sec_rigid[s];
            if (j >= 0 && grp[s] != grp[j]) {
                int lo = grp[s] < grp[j] ? grp[s] : grp[j];
                grp[s] = grp[j] = lo;
                changed = 1;
            }
        }
    }
    /* relative to the ground: the descent rate with the surface wind, the wind 10 m above ground (the
     * standard height of surface wind observations, common practice) */
    double we, wn;
    wind_of(R, 10.0, &we, &wn);
    r->wind_surface = hypot(we, wn);
    r->max_energy_ground = 0.0;
    for (size_t s = 0; s < c->nsec; s++) {
        double m = 0.0;
        for (size_t t = 0; t < c->nsec; t++)
            if (grp[t] == grp[s])
                m += R->sec_mass[t];
        r->section_energy[s] = 0.5 * m * r->section_rate[s] * r->section_rate[s];
        r->max_energy = fmax(r->max_energy, r->section_energy[s]);
        r->section_speed_ground[s] = hypot(r->section_rate[s], r->wind_surface);
        r->section_energy_ground[s] = 0.5 * m * r->section_speed_ground[s] * r->section_speed_ground[s];
        r->max_energy_ground = fmax(r->max_energy_ground, r->section_energy_ground[s]);
    }
    /* events by time (insertion sort keeps equal times in order of occurrence) */
    for (size_t i = 1; i < r->nevents; i++) {
        sr_profile_event e = r->events[i];
        size_t j = i;
        while (j > 0 && r->events[j - 1].t > e.t) {
            r->events[j] = r->events[j - 1];
            j--;
        }
        r->events[j] = e;
    }
}

static int check_perturb(const sr_profile_ctx *c, const sr_profile_perturb *p, sr_error *err)
{
    for (size_t k = 0; k < c->nstg; k++)
        if (!(p->drag_scale[k] > 0.0 && p->drag_scale[k] < 100.0))
            return sr_error_set(err, SR_EINVAL, "drag scale %g of stage %zu is outside 0 .. 100", p->drag_scale[k], k + 1);
    for (size_t k = 0; k < c->nstg; k++)
        if (!(p->area_scale[k] > 0.0 && p->area_scale[k] < 100.0))
            return sr_error_set(err, SR_EINVAL, "area scale %g of stage %zu is outside 0 .. 100", p->area_scale[k], k + 1);
    for (size_t i = 0; i < c->nsec; i++)
        if (!(p->section_mass_scale[i] > 0.0 && p->section_mass_scale[i] < 100.0))
            return sr_error_set(err, SR_EINVAL, "mass scale %g of section %zu is outside 0 .. 100",
                                p->section_mass_scale[i], i + 1);
    if (!(p->mass_scale > 0.0 && p->mass_scale < 100.0))
        return sr_error_set(err, SR_EINVAL, "mass scale %g is outside 0 .. 100", p->mass_scale);
    if (!(p->wind_scale >= 0.0 && p->wind_scale < 100.0) || !isfinite(p->wind_turn) || !isfinite(p->wind_east) ||
        !isfinite(p->wind_north))
        return sr_error_set(err, SR_EINVAL, "wind perturbation out of range");
    double h0 = c->start_h + p->start_height;
    if (!(h0 > 0.0 && h0 <= c->top))
        return sr_error_set(err, SR_EDOMAIN,
                            "%s: a sample's first deployment at %.0f m above ground is outside the heights prepared "
                            "from the uncertainty block (0 .. %.0f m): a draw beyond six sigma, or a spread that "
                            "reaches the ground",
                            c->start_at, h0, c->top);
    if (!(c->start_v + p->start_speed >= 0.0))
        return sr_error_set(err, SR_EINVAL, "the sample's start speed is negative");
    return SR_OK;
}

int sr_profile_run_recorded(const sr_profile_ctx *c, const sr_profile_perturb *p, sr_profile_mode mode, sr_profile_work *w,
                sr_profile_result *r, sr_profile_track *track, seg_cache *record, sr_error *err)
{
    run R;
    memset(&R, 0, sizeof R);
    R.c = c;
    if (p)
        R.p = *p;
    else
        sr_profile_perturb_init(&R.p);
    int rc = check_perturb(c, &R.p, err);
    if (rc)
        return rc;
    R.mode = mode;
    R.w = w;
    if (w && w->tol != c->o.ode_tol) {
        gsl_odeiv2_control_init(w->control, c->o.ode_tol, c->o.ode_tol, 1.0, 0.0);
        w->tol = c->o.ode_tol;
    }
    R.r = r;
    R.track = track;
    R.rec = record;
    R.err = err;
    R.wp.k = R.p.wind_scale;
    R.wp.c = cos(R.p.wind_turn);
    R.wp.s = sin(R.p.wind_turn);
    R.wp.de = R.p.wind_east;
    R.wp.dn = R.p.wind_north;
    for (size_t k = 0; k < c->nstg; k++) {
        R.cds[k] = c->st[k].cds * R.p.drag_scale[k] * R.p.area_scale[k];
        R.d0[k] = c->st[k].d0 * sqrt(R.p.area_scale[k]);
        R.t_ls[k] = R.t_f[k] = NAN;
    }
    for (size_t i = 0; i < c->nsec; i++)
        R.sec_mass[i] = c->sec_mass[i] * R.p.mass_scale * R.p.section_mass_scale[i];
    /* everything but the event array, which is filled up to nevents (it is
     * most of the struct, and the Monte Carlo path runs this per sample) */
    memset(r, 0, offsetof(sr_profile_result, events));
    memset((char *)r + offsetof(sr_profile_result, nstages), 0, sizeof *r - offsetof(sr_profile_result, nstages));
    r->mode = mode;
    r->nstages = c->nstg;
    for (size_t k = 0; k < c->nstg; k++) {
        sr_profile_stage *s = &r->stage[k];
        s->body = -1;
        s->t_deploy = s->h_deploy = s->speed_deploy = s->q_deploy = s->mach_deploy = s->rho_deploy = NAN;
        s->t_line = s->speed_line = s->t_fill = s->t_full = s->h_full = s->t_steady = s->h_steady = NAN;
        s->t_end = s->h_end = s->rate_top = s->rate_bottom = s->cds = s->mass = NAN;
        s->h_line = s->path_line = s->d0 = s->cds_canopy = NAN;
    }
    /* the start: airspeed along the heading and path angle, carried by the wind */
    body *b = &R.b[0];
    R.nb = 1;
    b->idx = 0;
    b->secs = (sr_section_set)((1u << c->nsec) - 1u);
    b->cur = -1;
    body_mass(&R, b);
    b->t = 0.0;
    b->y[0] = c->start_e;
    b->y[1] = c->start_n;
    b->y[2] = c->start_h + R.p.start_height;
    double we, wn, v = c->start_v + R.p.start_speed;
    wind_of(&R, b->y[2], &we, &wn);
    b->y[3] = we + v * cos(c->start_gamma) * sin(c->heading);
    b->y[4] = wn + v * cos(c->start_gamma) * cos(c->heading);
    b->y[5] = -v * sin(c->start_gamma);
    begin_transient(b, KEY_START);
    r->nbodies = 1;
    r->body[0].sections = b->secs;
    r->body[0].parent = -1;
    r->body[0].stage_split = -1;
    add_event(&R, SR_EVENT_START, -1, b);
    add_point(&R, b);
    for (size_t i = 0; i < R.nb && !rc; i++)
        rc = simulate(&R, &R.b[i]);
    if (rc)
        return rc;
    finish(&R);
    return SR_OK;
}

int sr_profile_run(const sr_profile_ctx *c, const sr_profile_perturb *p, sr_profile_mode mode, sr_profile_work *w,
                   sr_profile_result *r, sr_profile_track *track, sr_error *err)
{
    if (w)
        return sr_profile_run_recorded(c, p, mode, w, r, track, NULL, err);
    sr_profile_work tmp;
    int rc = sr_profile_work_init(&tmp, c->o.ode_tol, err);
    if (rc)
        return rc;
    rc = sr_profile_run_recorded(c, p, mode, &tmp, r, track, NULL, err);
    sr_profile_work_release(&tmp);
    return rc;
}
void sr_profile_perturb_init(sr_profile_perturb *p)
{
    memset(p, 0, sizeof *p);
    for (size_t i = 0; i < NS; i++)
        p->drag_scale[i] = p->area_scale[i] = 1.0;
    for (size_t i = 0; i < NSEC; i++)
        p->section_mass_scale[i] = 1.0;
    p->mass_scale = 1.0;
    p->wind_scale = 1.0;
}

int sr_profile_work_init(sr_profile_work *w, double tol, sr_error *err)
{
    memset(w, 0, sizeof *w);
    w->tol = tol;
    w->step = gsl_odeiv2_step_alloc(gsl_odeiv2_step_rk8pd, 6);
    w->control = gsl_odeiv2_control_standard_new(tol, tol, 1.0, 0.0);
    w->evolve = gsl_odeiv2_evolve_alloc(6);
    w->quad = gsl_integration_workspace_alloc(256);
    w->root = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
    if (!w->step || !w->control || !w->evolve || !w->quad || !w->root) {
        sr_profile_work_release(w);
        return sr_error_set(err, SR_ENOMEM, "out of memory for the ODE and quadrature workspaces");
    }
    return SR_OK;
}

void sr_profile_work_release(sr_profile_work *w)
{
    if (w->step)
        gsl_odeiv2_step_free(w->step);
    if (w->control)
        gsl_odeiv2_control_free(w->control);
    if (w->evolve)
        gsl_odeiv2_evolve_free(w->evolve);
    if (w->quad)
        gsl_integration_workspace_free(w->quad);
    if (w->root)
        gsl_root_fsolver_free(w->root);
    memset(w, 0, sizeof *w);
}

int sr_profile_work_new(sr_profile_work **w, sr_error *err)
{
    *w = malloc(sizeof **w);
    if (!*w)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_profile_work_init(*w, 1e-9, err);
    if (rc) {
        free(*w);
        *w = NULL;
    }
    return rc;
}

void sr_profile_work_free(sr_profile_work *w)
{
    if (!w)
        return;
    sr_profile_work_release(w);
    free(w);
}

