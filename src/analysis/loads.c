/* loads.c - the opening load of a deployment over every banded input (the
 * run's state, own drag, growth exponent, opening-load factor); the highest
 * governs. */
#include "analysis/loads.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "physics/units.h"

void sr_loads_canopy_init(sr_loads_canopy *lc, const sr_canopy *cp)
{
    memset(lc, 0, sizeof *lc);
    const double cds[3] = {cp->cds.lo, cp->cds.typ, cp->cds.hi}, d0[3] = {cp->d0.lo, cp->d0.typ, cp->d0.hi};
    for (int k = 0; k < 3; k++) {
        lc->cds_ratio[k] = cp->cds.typ > 0 ? cds[k] / cp->cds.typ : 1.0;
        lc->d0_ratio[k] = cp->d0.typ > 0 ? d0[k] / cp->d0.typ : 1.0;
    }
    lc->count = cp->count;
    lc->n_fill = cp->fam.fill_n;
    lc->cx = cp->fam.cx;
    lc->growth = cp->fam.growth;
    lc->mach_max = isfinite(cp->fam.mach_max) ? cp->fam.mach_max : 0.0;
    lc->measured = cp->opening;
    lc->measured_value = cp->opening_value;
}

void sr_loads_input(const sr_loads_canopy *c, const sr_loads_state *s, int drag, double exponent, double cx,
                    sr_opening_input *in)
{
    sr_opening_input_init(in);
    in->cds0 = s->cds0 * c->cds_ratio[drag];
    in->d0 = s->d0 * c->d0_ratio[drag];
    in->count = c->count;
    in->mass = s->mass;
    in->v1 = s->v1;
    in->path_angle = s->path_angle;
    in->rho = s->rho;
    in->a = s->a;
    in->g = s->g;
    in->n_fill = c->n_fill;
    in->cx = cx;
    in->exponent = exponent;
    in->mach_envelope = c->mach_max;
    in->v_steady = s->v_steady;
}

/* One combination at two opening-load factors: the governing (highest)
 * estimate at cx_lo and at cx_hi (a measured opening replaces them). */
static int combo(const sr_loads_canopy *c, const sr_loads_state *s, int drag, double n, double cx_lo, double cx_hi,
                 int fast, double *f_lo, double *f_hi, double *t_fill, int *slow, sr_error *err)
{
    sr_opening_input in;
    sr_loads_input(c, s, drag, n, cx_hi, &in);
    int rc;
    if (fast) {
        sr_opening_quick q;
        if ((rc = sr_opening_solve_fast(&in, &q, err)) != SR_OK)
            return rc;
        *f_hi = sr_opening_quick_high(&q, cx_hi);
        *f_lo = sr_opening_quick_high(&q, cx_lo);
        *t_fill = q.t_fill;
        *slow = q.slow_deployment;
    } else {
        sr_opening_result r;
        if ((rc = sr_opening_solve(&in, &r, err)) != SR_OK)
            return rc;
        *f_hi = r.f_high;
        *t_fill = r.t_fill;
        *slow = r.slow_deployment;
        if (cx_lo != cx_hi) {
            in.cx = cx_lo;
            if ((rc = sr_opening_solve(&in, &r, err)) != SR_OK)
                return rc;
        }
        *f_lo = r.f_high;
    }
    if (c->measured == SR_OPENING_MEASURED_FACTOR)
        *f_lo = *f_hi = c->measured_value * in.count * in.cds0 * 0.5 * s->rho * s->v1 * s->v1;
    else if (c->measured == SR_OPENING_MEASURED_LOAD)
        *f_lo = *f_hi = c->measured_value;
    return SR_OK;
}

static void set_end(sr_loads_end *e, double f, double mass, int state, int drag, double n, double cx)
{
    e->force = f;
    e->decel_g = f / (mass * SR_G0);
    e->state = state;
    e->drag = drag;
    e->exponent = n;
    e->cx = cx;
}

int sr_loads_evaluate(const sr_loads_canopy *c, const sr_loads_state st[SR_LOADS_NSTATES], int fast,
                      sr_loads_band *out, sr_error *err)
{
    memset(out, 0, sizeof *out);
    out->measured = c->measured != SR_OPENING_ESTIMATED;
    const sr_loads_state *t = &st[0];
    if (!t->valid || !(t->v1 > 0.0))
        return SR_OK;
    int rc, slow;
    double lo, hi, tf;
    if ((rc = combo(c, t, 1, c->growth.typ, c->cx.typ, c->cx.typ, fast, &lo, &hi, &tf, &slow, err)) != SR_OK)
        return rc;
    out->valid = 1;
    set_end(&out->typ, hi, t->mass, 0, 1, c->growth.typ, c->cx.typ);
    out->t_fill_typ = tf;
    out->slow_deployment = slow;
    /* the ends from the band-end runs where they deployed, else the typical */
    int use[SR_LOADS_NSTATES] = {0, st[1].valid && st[1].v1 > 0.0, st[2].valid && st[2].v1 > 0.0};
    if (!use[1] && !use[2])
        use[0] = 1;
    out->lo = out->hi = out->typ;
    out->v_lo = out->v_hi = out->v_typ = t->v1;
    out->q_lo = out->q_hi = out->q_typ = 0.5 * t->rho * t->v1 * t->v1;
    out->mach_lo = out->mach_hi = out->mach_typ = t->v1 / t->a;
    const int drags[2] = {0, 2};
    const double ns[2] = {c->growth.lo, c->growth.hi};
    for (int s = 0; s < SR_LOADS_NSTATES; s++) {
        if (!use[s])
            continue;
        const sr_loads_state *x = &st[s];
        double q = 0.5 * x->rho * x->v1 * x->v1, mach = x->v1 / x->a;
        out->v_lo = fmin(out->v_lo, x->v1), out->v_hi = fmax(out->v_hi, x->v1);
        out->q_lo = fmin(out->q_lo, q), out->q_hi = fmax(out->q_hi, q);
        out->mach_lo = fmin(out->mach_lo, mach), out->mach_hi = fmax(out->mach_hi, mach);
        /* drag ends that are the same canopy (a dispersion sample's own draw) are solved once */
        int same_drag = c->cds_ratio[0] == c->cds_ratio[2] && c->d0_ratio[0] == c->d0_ratio[2];
        for (int d = 0; d < 2; d++)
            for (int j = 0; j < 2; j++) {
                if ((j == 1 && ns[1] == ns[0]) || (d == 1 && same_drag))
                    continue;
                if ((rc = combo(c, x, drags[d], ns[j], c->cx.lo, c->cx.hi, fast, &lo, &hi, &tf, &slow, err)) !=
                    SR_OK)
                    return rc;
                if (hi > out->hi.force)
                    set_end(&out->hi, hi, x->mass, s, drags[d], ns[j], c->cx.hi);
                if (lo < out->lo.force)
                    set_end(&out->lo, lo, x->mass, s, drags[d], ns[j], c->cx.lo);
            }
    }
    out->above_envelope = c->mach_max > 0 && out->mach_hi > c->mach_max;
    return SR_OK;
}

double sr_loads_bound(const sr_loads_canopy *c, const sr_loads_state *s)
{
    if (!s->valid || !(s->v1 > 0.0))
        return 0.0; /* not deployed: sr_loads_evaluate gives no load */
    if (c->measured == SR_OPENING_MEASURED_LOAD)
        return c->measured_value;
    double b = 0.0;
    for (int d = 0; d < 3; d++) {
        sr_opening_input in;
        sr_loads_input(c, s, d, c->growth.hi, c->cx.hi, &in);
        double f = c->measured == SR_OPENING_MEASURED_FACTOR
                       ? c->measured_value * in.count * in.cds0 * 0.5 * s->rho * s->v1 * s->v1
                       : sr_opening_bound(&in);
        b = fmax(b, f);
    }
    return b;
}

/* ---- a program's opening load (include/sinkrate/analysis.h) ---- */

void sr_loads_state_of(sr_loads_state *s, const sr_canopy *c, double mass, double v1, double path_angle,
                       const sr_air *air)
{
    memset(s, 0, sizeof *s);
    s->valid = 1;
    s->v1 = v1;
    s->path_angle = path_angle;
    s->rho = air->rho;
    s->a = air->a;
    s->g = air->g;
    s->mass = mass;
    s->v_steady = NAN;
    s->cds0 = c->cluster_factor * c->cds.typ;
    s->d0 = c->d0.typ;
}

int sr_loads_deployment(sr_loads_band **out, const sr_canopy *c, double mass, double v1, double path_angle,
                        const sr_air *air, sr_error *err)
{
    *out = NULL;
    if (!(isfinite(v1) && v1 > 0.0))
        return sr_error_set_key(err, SR_EINVAL, "v1", "the speed at line stretch must be positive (got %g m/s)", v1);
    if (!(isfinite(mass) && mass > 0.0))
        return sr_error_set_key(err, SR_EINVAL, "mass", "the mass must be positive (got %g kg)", mass);
    if (!(fabs(path_angle) <= 1.57079632679489662 + 1e-9)) /* pi/2 */
        return sr_error_set_key(err, SR_EINVAL, "path_angle",
                                "the path angle %g rad is outside -pi/2 .. pi/2 below the horizontal", path_angle);
    sr_loads_canopy lc;
    sr_loads_canopy_init(&lc, c);
    /* one deployment state, the typical one: the band ends come from the canopy's own bands */
    sr_loads_state st[SR_LOADS_NSTATES];
    memset(st, 0, sizeof st);
    sr_loads_state_of(&st[0], c, mass, v1, path_angle, air);
    sr_loads_band *b = malloc(sizeof *b);
    if (!b)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_loads_evaluate(&lc, st, 0, b, err);
    if (rc) {
        free(b);
        return rc;
    }
    *out = b;
    return SR_OK;
}

void sr_loads_free(sr_loads_band *b)
{
    free(b);
}
