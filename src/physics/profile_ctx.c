/* profile_ctx.c - the per-mission context of the staged descent: the mission
 * in numbers, the air and wind on a height grid, the cumulative quadrature
 * tables of the steady descent, and the nominal transients. */
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "physics/profile_int.h"

#define PI 3.14159265358979323846
/* Gauss-Legendre points per grid cell (between wind-table rows): exact for
 * polynomials of degree 7, far below 1e-9 on the smooth air integrand. */
#define GL_POINTS 4

void sr_profile_opts_init(sr_profile_opts *o)
{
    memset(o, 0, sizeof *o);
    o->steady_tol = 0.01;
    o->ode_tol = 1e-9;
    o->quad_tol = 1e-9;
    o->uniform_density = NAN;
    o->failed = 0;
    o->grid_cells = 1024;
    o->top_margin = 0.25;
    o->attitude = SR_ATTITUDE_BROADSIDE;
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

static int copy_atmos(sr_atmos *dst, const sr_atmos *src)
{
    *dst = *src;
    dst->sz = dst->sT = dst->slnp = NULL;
    if (src->kind != SR_ATMOS_SOUNDING)
        return SR_OK;
    size_t b = src->n * sizeof(double);
    dst->sz = malloc(b);
    dst->sT = malloc(b);
    dst->slnp = malloc(b);
    if (!dst->sz || !dst->sT || !dst->slnp)
        return SR_ENOMEM;
    memcpy(dst->sz, src->sz, b);
    memcpy(dst->sT, src->sT, b);
    memcpy(dst->slnp, src->slnp, b);
    return SR_OK;
}

static int copy_wind(sr_wind *dst, const sr_wind *src)
{
    *dst = *src;
    dst->h = dst->east = dst->north = NULL;
    if (src->kind != SR_WIND_TABLE)
        return SR_OK;
    size_t b = src->n * sizeof(double);
    dst->h = malloc(b);
    dst->east = malloc(b);
    dst->north = malloc(b);
    if (!dst->h || !dst->east || !dst->north)
        return SR_ENOMEM;
    memcpy(dst->h, src->h, b);
    memcpy(dst->east, src->east, b);
    memcpy(dst->north, src->north, b);
    return SR_OK;
}

void sr_profile_ctx_free(sr_profile_ctx *c)
{
    if (!c)
        return;
    sr_atmos_free(&c->atmos);
    sr_wind_free(&c->wind);
    for (size_t i = 0; i < NSEC; i++)
        sr_bluff_curve_free(&c->sec_curve[i]);
    free(c->block);
    free(c);
}

int ctx_direct(const sr_profile_ctx *c, double h, double *f, double *we, double *wn)
{
    double z = c->ground + h, rho;
    if (!isnan(c->o.uniform_density)) {
        rho = c->o.uniform_density;
    } else {
        sr_error e;
        if (sr_atmos_density(&c->atmos, z, &rho, &e))
            return SR_EDOMAIN;
    }
    *f = sqrt(rho / sr_atmos_gravity(z));
    sr_wind_at(&c->wind, h, we, wn);
    return SR_OK;
}

int ctx_phi(const sr_profile_ctx *c, double h, double *phi, double *dphi)
{
    double z = c->ground + h, rho, dlnrho = 0.0;
    if (!isnan(c->o.uniform_density)) {
        rho = c->o.uniform_density;
    } else {
        sr_error e;
        double lo, hi, d = 0.5, r0, r1;
        sr_atmos_range(&c->atmos, &lo, &hi);
        double za = z - d < lo ? lo : z - d, zb = z + d > hi ? hi : z + d;
        if (sr_atmos_density(&c->atmos, z, &rho, &e) || sr_atmos_density(&c->atmos, za, &r0, &e) ||
            sr_atmos_density(&c->atmos, zb, &r1, &e))
            return SR_EDOMAIN;
        /* d ln(rho)/dh by a central difference: ln(rho) is smooth on this scale */
        dlnrho = (log(r1) - log(r0)) / (zb - za);
    }
    double g = sr_atmos_gravity(z);
    *phi = 1.0 / sqrt(rho * g);
    if (dphi)
        *dphi = -0.5 * *phi * (dlnrho - 2.0 / (SR_ATMOS_R0 + z));
    return SR_OK;
}

static int cell_integrals(const sr_profile_ctx *c, const gsl_integration_glfixed_table *gl, double lo, double hi,
                          double out[5])
{
    /* split at wind-table rows inside the cell: the wind has kinks there */
    double cuts[34];
    size_t nc = 0;
    cuts[nc++] = lo;
    size_t nk;
    const double *k = sr_wind_knots(&c->wind, &nk);
    for (size_t i = 0; i < nk && nc < 33; i++)
        if (k[i] > lo && k[i] < hi)
            cuts[nc++] = k[i];
    cuts[nc++] = hi;
    out[0] = out[1] = out[2] = out[3] = out[4] = 0.0;
    for (size_t s = 0; s + 1 < nc; s++) {
        double pa, pb, ea, na, eb, nb;
        if (ctx_phi(c, cuts[s], &pa, NULL) || ctx_phi(c, cuts[s + 1], &pb, NULL))
            return SR_EDOMAIN;
        sr_wind_at(&c->wind, cuts[s], &ea, &na);
        sr_wind_at(&c->wind, cuts[s + 1], &eb, &nb);
        /* the shear lag, integral of phi dw, by parts: [phi w] - integral of w phi' dh (w has kinks, phi not) */
        out[3] += pb * eb - pa * ea;
        out[4] += pb * nb - pa * na;
        for (size_t j = 0; j < GL_POINTS; j++) {
            double x, w, f, we, wn, phi, dphi;
            gsl_integration_glfixed_point(cuts[s], cuts[s + 1], j, &x, &w, gl);
            if (ctx_direct(c, x, &f, &we, &wn) || ctx_phi(c, x, &phi, &dphi))
                return SR_EDOMAIN;
            out[0] += w * f;
            out[1] += w * we * f;
            out[2] += w * wn * f;
            out[3] -= w * we * dphi;
            out[4] -= w * wn * dphi;
        }
    }
    return SR_OK;
}

int ctx_build_tables(sr_profile_ctx *c, sr_error *err)
{
    size_t n = c->o.grid_cells < 16 ? 16 : c->o.grid_cells, m = n + 1;
    double zlo, zhi;
    sr_atmos_range(&c->atmos, &zlo, &zhi);
    double top = c->start_h * (1.0 + c->o.top_margin) + 200.0;
    if (c->start_gamma < 0.0) {
        /* a start that climbs: the tables reach the height it could coast to without drag,
         * v^2 sin^2(gamma) / 2g (drag only lowers it; g at the model's top, the smallest) */
        double vz = c->start_v * sin(-c->start_gamma), gmin = sr_atmos_gravity(zhi);
        top += vz * vz / (2.0 * gmin);
        /* and more cells, so the steps stay as fine as for a start of this height */
        double grow = top / (c->start_h * (1.0 + c->o.top_margin) + 200.0);
        if (grow > 1.0) {
            n += (size_t)fmin(15.0 * (double)n, (grow - 1.0) * (double)n);
            m = n + 1;
        }
    }
    c->top_is_model = 0;
    if (c->ground + top > zhi) {
        top = zhi - c->ground;
        c->top_is_model = 1;
    }
    if (!(top >= c->start_h))
        return sr_error_set(err, SR_EDOMAIN, "%s: the start at %.0f m above ground is above the atmosphere model",
                            c->start_at, c->start_h);
    if (c->ground < zlo)
        return sr_error_set(err, SR_EDOMAIN, "the ground at %.0f m is below the atmosphere model (%.0f m)", c->ground,
                            zlo);
    c->n = n;
    c->top = top;
    c->dh = top / (double)n;
    c->block = malloc(12 * m * sizeof(double));
    if (!c->block)
        return sr_error_set(err, SR_ENOMEM, "out of memory for the profile tables");
    double *b = c->block;
    c->lnrho = b;
    c->a = b + m;
    c->g = b + 2 * m;
    c->we = b + 3 * m;
    c->wn = b + 4 * m;
    c->f = b + 5 * m;
    c->I = b + 6 * m;
    c->Je = b + 7 * m;
    c->Jn = b + 8 * m;
    c->Le = b + 9 * m;
    c->Ln = b + 10 * m;
    c->mu = b + 11 * m;
    for (size_t i = 0; i < m; i++) {
        double h = c->dh * (double)i;
        sr_air air;
        sr_error e;
        if (sr_atmos_at(&c->atmos, c->ground + h, &air, &e))
            return sr_error_set(err, SR_EDOMAIN, "%s", e.msg);
        double rho = isnan(c->o.uniform_density) ? air.rho : c->o.uniform_density;
        c->lnrho[i] = log(rho);
        c->a[i] = air.a;
        c->g[i] = air.g;
        c->mu[i] = air.mu;
        sr_wind_at(&c->wind, h, &c->we[i], &c->wn[i]);
        c->f[i] = sqrt(rho / air.g);
    }
    gsl_integration_glfixed_table *gl = gsl_integration_glfixed_table_alloc(GL_POINTS);
    if (!gl)
        return sr_error_set(err, SR_ENOMEM, "out of memory for the quadrature table");
    c->I[0] = c->Je[0] = c->Jn[0] = c->Le[0] = c->Ln[0] = 0.0;
    for (size_t i = 0; i < n; i++) {
        double q[5];
        if (cell_integrals(c, gl, c->dh * (double)i, c->dh * (double)(i + 1), q)) {
            gsl_integration_glfixed_table_free(gl);
            return sr_error_set(err, SR_EDOMAIN, "the atmosphere is undefined within the descent");
        }
        c->I[i + 1] = c->I[i] + q[0];
        c->Je[i + 1] = c->Je[i] + q[1];
        c->Jn[i + 1] = c->Jn[i] + q[2];
        c->Le[i + 1] = c->Le[i] + q[3];
        c->Ln[i + 1] = c->Ln[i] + q[4];
    }
    gsl_integration_glfixed_table_free(gl);
    return SR_OK;
}

static inline size_t cell_of(const sr_profile_ctx *c, double h, double *t)
{
    double x = h / c->dh;
    if (!(x > 0.0)) {
        *t = 0.0;
        return 0;
    }
    if (x >= (double)c->n) {
        *t = 1.0;
        return c->n - 1;
    }
    size_t i = (size_t)x;
    *t = x - (double)i;
    return i;
}

void ctx_air(const sr_profile_ctx *c, double h, double *rho, double *a, double *g)
{
    double t;
    size_t i = cell_of(c, h, &t);
    /* ln(rho) is nearly linear in height: linear interpolation is good to 1e-6 */
    *rho = exp(c->lnrho[i] + t * (c->lnrho[i + 1] - c->lnrho[i]));
    if (a)
        *a = c->a[i] + t * (c->a[i + 1] - c->a[i]);
    if (g)
        *g = c->g[i] + t * (c->g[i + 1] - c->g[i]);
}

double ctx_mu(const sr_profile_ctx *c, double h)
{
    double t;
    size_t i = cell_of(c, h, &t);
    return c->mu[i] + t * (c->mu[i + 1] - c->mu[i]);
}

/* Cubic Hermite on the cumulative integral with the integrand as slope:
 * GSL's interpolators take no given slopes and want an accelerator. */
static inline double hermite(double y0, double y1, double d0, double d1, double dh, double t)
{
    double t2 = t * t, t3 = t2 * t;
    return (2 * t3 - 3 * t2 + 1) * y0 + (t3 - 2 * t2 + t) * dh * d0 + (-2 * t3 + 3 * t2) * y1 + (t3 - t2) * dh * d1;
}

void ctx_cumulative(const sr_profile_ctx *c, double h, double *I, double *Je, double *Jn)
{
    double t;
    size_t i = cell_of(c, h, &t);
    if (h > c->top) {
        /* beyond the tables (only a perturbed sample can ask): extend linearly */
        double over = h - c->top;
        *I = c->I[c->n] + over * c->f[c->n];
        if (Je) {
            *Je = c->Je[c->n] + over * c->we[c->n] * c->f[c->n];
            *Jn = c->Jn[c->n] + over * c->wn[c->n] * c->f[c->n];
        }
        return;
    }
    *I = hermite(c->I[i], c->I[i + 1], c->f[i], c->f[i + 1], c->dh, t);
    if (Je) {
        *Je = hermite(c->Je[i], c->Je[i + 1], c->we[i] * c->f[i], c->we[i + 1] * c->f[i + 1], c->dh, t);
        *Jn = hermite(c->Jn[i], c->Jn[i + 1], c->wn[i] * c->f[i], c->wn[i + 1] * c->f[i + 1], c->dh, t);
    }
}

void ctx_lag(const sr_profile_ctx *c, double h, double *Le, double *Ln)
{
    double t;
    size_t i = cell_of(c, h, &t);
    /* a correction of about 1%: linear between nodes (the slope is singular at the
     * ground for the power law and jumps at table rows) */
    *Le = c->Le[i] + t * (c->Le[i + 1] - c->Le[i]);
    *Ln = c->Ln[i] + t * (c->Ln[i + 1] - c->Ln[i]);
}

double ctx_height_for_I(const sr_profile_ctx *c, double target)
{
    if (target <= 0.0)
        return 0.0;
    if (target >= c->I[c->n])
        return c->top + (target - c->I[c->n]) / c->f[c->n];
    size_t lo = 0, hi = c->n;
    while (hi - lo > 1) {
        size_t mid = (lo + hi) / 2;
        if (c->I[mid] <= target)
            lo = mid;
        else
            hi = mid;
    }
    /* Newton on the cell's cubic, kept inside the cell by bisection (a GSL root
     * solver would be allocated per call, on the per-sample path) */
    double a = 0.0, b = 1.0, t = (target - c->I[lo]) / (c->I[lo + 1] - c->I[lo]);
    for (int it = 0; it < 30; it++) {
        double v = hermite(c->I[lo], c->I[lo + 1], c->f[lo], c->f[lo + 1], c->dh, t) - target;
        if (v > 0)
            b = t;
        else
            a = t;
        double t2 = t * t;
        double d = ((6 * t2 - 6 * t) * c->I[lo] + (3 * t2 - 4 * t + 1) * c->dh * c->f[lo] +
                    (-6 * t2 + 6 * t) * c->I[lo + 1] + (3 * t2 - 2 * t) * c->dh * c->f[lo + 1]);
        double nt = d > 0 ? t - v / d : 0.5 * (a + b);
        if (!(nt > a && nt < b))
            nt = 0.5 * (a + b);
        if (fabs(nt - t) < 1e-13)
            break;
        t = nt;
    }
    return c->dh * ((double)lo + t);
}

int profile_work_init(sr_profile_work *w, double tol, sr_error *err)
{
    memset(w, 0, sizeof *w);
    w->tol = tol;
    w->step = gsl_odeiv2_step_alloc(gsl_odeiv2_step_rk8pd, 6);
    w->control = gsl_odeiv2_control_standard_new(tol, tol, 1.0, 0.0);
    w->evolve = gsl_odeiv2_evolve_alloc(6);
    w->quad = gsl_integration_workspace_alloc(256);
    w->root = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
    if (!w->step || !w->control || !w->evolve || !w->quad || !w->root) {
        profile_work_release(w);
        return sr_error_set(err, SR_ENOMEM, "out of memory for the ODE and quadrature workspaces");
    }
    return SR_OK;
}

void profile_work_release(sr_profile_work *w)
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
    int rc = profile_work_init(*w, 1e-9, err);
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
    profile_work_release(w);
    free(w);
}

static int copy_mission(sr_profile_ctx *c, const sr_mission *m, sr_error *err)
{
    if (!m->has_start)
        return sr_error_set(err, SR_EINVAL,
                            "%s: the mission has no start: block; a profile needs the height above ground, speed and "
                            "path angle at the first deployment (apogee or release)",
                            m->path);
    c->nsec = m->nsections;
    c->nstg = m->nstages;
    for (size_t i = 0; i < c->nsec; i++) {
        c->sec_mass[i] = m->sections[i].mass;
        c->sec_cda[i] = m->sections[i].drag_area;
        c->sec_rigid[i] = m->sections[i].rigid_with;
        const sr_section *s = &m->sections[i];
        if (!s->has_body)
            continue;
        int rc = sr_bluff_curve_copy(&c->sec_curve[i], &s->curve, err);
        if (!rc)
            rc = sr_bluff_body_init(&c->sec_body[i], s->shape, &c->sec_curve[i], s->body_d, s->body_length, s->mass,
                                    s->shape == SR_BLUFF_TABLE ? s->body_area : NAN, err);
        if (rc)
            return rc;
        sr_bluff_attitude_drag(s->shape, s->body_d, c->o.attitude, s->stable_end_on, &c->att_k[i], &c->att_c[i]);
        c->free_secs |= 1u << i;
    }
    for (size_t k = 0; k < c->nstg; k++) {
        const sr_stage *s = &m->stages[k];
        stage_c *t = &c->st[k];
        if (!s->has_size)
            return sr_error_set(err, SR_EINVAL,
                                "%s: stage '%s' has no size; give one in the file, or run `sinkrate size --mission` "
                                "first",
                                m->path, s->name);
        snprintf(t->name, sizeof t->name, "%s", s->name);
        t->cds = sr_canopy_total_cds(&s->canopy).typ;
        t->d0 = s->canopy.d0.typ;
        t->fill_n = s->canopy.fam.fill_n;
        /* drag-area growth (t/t_f)^n: the family's typical exponent (n = 2 solid cloth, 1 slotted unless the
         * family file sets its own; Knacke 1991, Pflanz curves, from memory) */
        t->growth = s->canopy.fam.growth.typ;
        t->count = s->canopy.count;
        t->fabric = s->canopy.areal_mass > 0.0 ? s->canopy.count * s->canopy.areal_mass * s->canopy.s0.typ : 0.0;
        t->fabric_owner = 0;
        while (t->fabric_owner < (int)NSEC - 1 && !((s->carries >> t->fabric_owner) & 1u))
            t->fabric_owner++;
        t->kind = s->deploy;
        t->value = s->deploy_value;
        t->carries = s->carries;
        t->keep_prev = s->keep_previous;
        t->line_stretch = s->line_stretch;
    }
    c->ground = m->ground;
    c->start_h = m->start_height;
    c->start_v = m->start_speed;
    c->start_gamma = m->start_path_angle;
    snprintf(c->start_at, sizeof c->start_at, "%s", m->start_at[0] ? m->start_at : m->path);
    c->start_e = m->start_east;
    c->start_n = m->start_north;
    c->heading = m->start_heading;
    if (isnan(c->heading)) {
        /* into the wind at the start: rockets weathercock into it (common practice) */
        double we, wn, s;
        sr_wind_at(&m->wind, m->start_height, &we, &wn);
        sr_wind_polar(we, wn, &s, &c->heading);
    }
    if (copy_atmos(&c->atmos, &m->atmos) || copy_wind(&c->wind, &m->wind))
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    return SR_OK;
}

int sr_profile_ctx_new(sr_profile_ctx **out, const sr_mission *m, const sr_profile_opts *o, sr_error *err)
{
    *out = NULL;
    sr_profile_ctx *c = calloc(1, sizeof *c);
    if (!c)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    if (o)
        c->o = *o;
    else
        sr_profile_opts_init(&c->o);
    int rc;
    if (!(c->o.steady_tol >= 0.0 && c->o.steady_tol < 0.5))
        rc = sr_error_set(err, SR_EINVAL, "steady tolerance %g is outside 0 .. 0.5", c->o.steady_tol);
    else if (!(c->o.ode_tol >= 1e-13 && c->o.ode_tol <= 1e-3))
        rc = sr_error_set(err, SR_EINVAL, "ODE tolerance %g is outside 1e-13 .. 1e-3", c->o.ode_tol);
    else if (!isnan(c->o.uniform_density) && !(c->o.uniform_density > 0.0 && c->o.uniform_density < 10.0))
        rc = sr_error_set(err, SR_EINVAL, "uniform density %g kg/m3 is outside 0 .. 10", c->o.uniform_density);
    else if (!(c->o.attitude >= SR_ATTITUDE_BROADSIDE && c->o.attitude <= SR_ATTITUDE_END_ON))
        rc = sr_error_set(err, SR_EINVAL, "unknown attitude %d", (int)c->o.attitude);
    else if (c->o.grid_cells > 1000000)
        rc = sr_error_set(err, SR_EINVAL, "too many grid cells (%zu)", c->o.grid_cells);
    else
        rc = copy_mission(c, m, err);
    if (!rc)
        rc = ctx_build_tables(c, err);
    if (!rc) {
        sr_profile_work w;
        if (!(rc = profile_work_init(&w, c->o.ode_tol, err))) {
            seg_cache rec[NKEYS];
            memset(rec, 0, sizeof rec);
            rc = profile_run(c, NULL, SR_PROFILE_FULL, &w, &c->nominal, NULL, rec, err);
            memcpy(c->cache, rec, sizeof rec);
            profile_work_release(&w);
        }
    }
    if (rc) {
        sr_profile_ctx_free(c);
        return rc;
    }
    *out = c;
    return SR_OK;
}

const sr_profile_result *sr_profile_nominal(const sr_profile_ctx *c)
{
    return &c->nominal;
}

void sr_profile_air(const sr_profile_ctx *c, double h, double *rho, double *a, double *g, double *east,
                    double *north)
{
    ctx_air(c, h, rho, a, g);
    sr_wind_at(&c->wind, h, east, north);
}

double sr_profile_steady_rate(const sr_profile_ctx *c, sr_section_set body, unsigned open, double h)
{
    double m = 0.0, cds = 0.0;
    for (size_t i = 0; i < c->nsec; i++)
        if ((body >> i) & 1u) {
            m += c->sec_mass[i];
            cds += c->sec_cda[i];
        }
    for (size_t k = 0; k < c->nstg; k++) {
        if ((body >> c->st[k].fabric_owner) & 1u)
            m += c->st[k].fabric;
        if ((open >> k) & 1u)
            cds += c->st[k].cds;
    }
    double rho, g;
    ctx_air(c, h, &rho, NULL, &g);
    return cds > 0.0 ? sqrt(2.0 * m * g / (rho * cds)) : INFINITY;
}
