/* profile_ctx.c - the per-mission context of the staged descent: the
 * descent specification in numbers, its air and wind grid (profile_grid.c),
 * its free-falling bodies (profile_free.c), and the nominal transients of a
 * first full run (profile.c). */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "physics/profile_int.h"

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

void sr_profile_ctx_free(sr_profile_ctx *c)
{
    if (!c)
        return;
    sr_profile_grid_release(&c->grid);
    sr_profile_free_release(&c->fall);
    free(c);
}

static int copy_spec(sr_profile_ctx *c, const sr_descent_spec *m, sr_error *err)
{
    if (m->nsections < 1 || m->nsections > NSEC || m->nstages > NS)
        return sr_error_set(err, SR_EINVAL, "a descent needs 1 .. %d sections and at most %d stages", NSEC, NS);
    c->nsec = m->nsections;
    c->nstg = m->nstages;
    for (size_t i = 0; i < c->nsec; i++) {
        c->sec_mass[i] = m->section[i].mass;
        c->sec_cda[i] = m->section[i].drag_area;
        c->sec_rigid[i] = m->section[i].rigid_with;
    }
    int rc = sr_profile_free_init(&c->fall, m, c->o.attitude, err);
    if (rc)
        return rc;
    for (size_t k = 0; k < c->nstg; k++) {
        const sr_descent_stage *s = &m->stage[k];
        stage_c *t = &c->st[k];
        snprintf(t->name, sizeof t->name, "%s", s->name);
        t->cds = s->cds;
        t->d0 = s->d0;
        t->fill_n = s->fill_n;
        t->growth = s->growth;
        t->count = s->count;
        t->fabric = s->fabric;
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
    snprintf(c->start_at, sizeof c->start_at, "%s", m->start_at);
    c->start_e = m->start_east;
    c->start_n = m->start_north;
    c->heading = m->start_heading;
    if (isnan(c->heading)) {
        /* into the wind at the start: rockets weathercock into it (common practice) */
        double we, wn, s;
        sr_wind_at(m->wind, m->start_height, &we, &wn);
        sr_wind_polar(we, wn, &s, &c->heading);
    }
    return SR_OK;
}

/* How high the tables reach and in how many cells, then the grid. */
static int build_grid(sr_profile_ctx *c, const sr_descent_spec *m, sr_error *err)
{
    size_t n = c->o.grid_cells < 16 ? 16 : c->o.grid_cells;
    double zlo, zhi;
    sr_atmos_range(m->atmos, &zlo, &zhi);
    double top = c->start_h * (1.0 + c->o.top_margin) + 200.0;
    if (c->start_gamma < 0.0) {
        /* a start that climbs: the tables reach the height it could coast to without drag,
         * v^2 sin^2(gamma) / 2g (drag only lowers it; g at the model's top, the smallest) */
        double vz = c->start_v * sin(-c->start_gamma), gmin = sr_atmos_gravity(zhi);
        top += vz * vz / (2.0 * gmin);
        /* and more cells, so the steps stay as fine as for a start of this height */
        double grow = top / (c->start_h * (1.0 + c->o.top_margin) + 200.0);
        if (grow > 1.0)
            n += (size_t)fmin(15.0 * (double)n, (grow - 1.0) * (double)n);
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
    c->top = top;
    return sr_profile_grid_build(&c->grid, m->atmos, m->wind, c->ground, c->o.uniform_density, top, n, err);
}

int sr_profile_ctx_new(sr_profile_ctx **out, const sr_descent_spec *m, const sr_profile_opts *o, sr_error *err)
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
        rc = copy_spec(c, m, err);
    if (!rc)
        rc = build_grid(c, m, err);
    if (!rc) {
        sr_profile_work w;
        if (!(rc = sr_profile_work_init(&w, c->o.ode_tol, err))) {
            seg_cache rec[NKEYS];
            memset(rec, 0, sizeof rec);
            rc = sr_profile_run_recorded(c, NULL, SR_PROFILE_FULL, &w, &c->nominal, NULL, rec, err);
            memcpy(c->cache, rec, sizeof rec);
            sr_profile_work_release(&w);
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
    sr_profile_grid_air(&c->grid, h, rho, a, g);
    sr_wind_at(&c->grid.wind, h, east, north);
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
    sr_profile_grid_air(&c->grid, h, &rho, NULL, &g);
    return cds > 0.0 ? sqrt(2.0 * m * g / (rho * cds)) : INFINITY;
}
