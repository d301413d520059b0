/* mission_descent.c - a mission as the descent the profile engine flies:
 * its sections, stages, start state, air and wind in numbers. */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "files/mission.h"

int sr_mission_descent(const sr_mission *m, sr_descent_spec *d, sr_error *err)
{
    memset(d, 0, sizeof *d);
    if (!m->has_start)
        return sr_error_set_at(err, SR_EINVAL, m->path, 0, 0,
                               "the mission has no start: block; a profile needs the height above ground, speed and "
                               "path angle at the first deployment (apogee or release)");
    d->atmos = &m->atmos;
    d->wind = &m->wind;
    d->ground = m->ground;
    d->nsections = m->nsections;
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        sr_descent_section *t = &d->section[i];
        t->mass = s->mass;
        t->drag_area = s->drag_area;
        t->rigid_with = s->rigid_with;
        t->curve = s->has_body ? &s->curve : NULL;
        t->shape = s->shape;
        t->d = s->body_d;
        t->length = s->body_length;
        t->area = s->shape == SR_BLUFF_TABLE ? s->body_area : NAN;
        t->stable_end_on = s->stable_end_on;
    }
    d->nstages = m->nstages;
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_stage *s = &m->stages[k];
        sr_descent_stage *t = &d->stage[k];
        if (!s->has_size)
            return sr_error_set_at(err, SR_EINVAL, m->path, 0, 0,
                                   "stage '%s' has no size; give one in the file, or run `sinkrate size --mission` "
                                   "first",
                                   s->name);
        snprintf(t->name, sizeof t->name, "%s", s->name);
        t->cds = sr_canopy_total_cds(&s->canopy).typ;
        t->d0 = s->canopy.d0.typ;
        t->fill_n = s->canopy.fam.fill_n;
        /* drag-area growth (t/t_f)^n: the family's typical exponent (n = 2 solid cloth, 1 slotted unless the
         * family file sets its own; Knacke 1991, Pflanz curves, from memory) */
        t->growth = s->canopy.fam.growth.typ;
        t->count = s->canopy.count;
        t->fabric = s->canopy.areal_mass > 0.0 ? s->canopy.count * s->canopy.areal_mass * s->canopy.s0.typ : 0.0;
        t->deploy = s->deploy;
        t->deploy_value = s->deploy_value;
        t->carries = s->carries;
        t->keep_previous = s->keep_previous;
        t->line_stretch = s->line_stretch;
    }
    d->start_height = m->start_height;
    d->start_speed = m->start_speed;
    d->start_path_angle = m->start_path_angle;
    d->start_heading = m->start_heading;
    d->start_east = m->start_east;
    d->start_north = m->start_north;
    snprintf(d->start_at, sizeof d->start_at, "%s", m->start_at[0] ? m->start_at : m->path);
    return SR_OK;
}

int sr_mission_profile(sr_profile_ctx **ctx, const sr_mission *m, const sr_profile_opts *o, sr_error *err)
{
    *ctx = NULL;
    sr_descent_spec d;
    int rc = sr_mission_descent(m, &d, err);
    return rc ? rc : sr_profile_ctx_new(ctx, &d, o, err);
}
