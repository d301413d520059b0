/* trajectory.c - a staged descent's time history: track points and events
 * of every body in one table, in time order. */
#include "analysis/trajectory.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

typedef struct keyed {
    sr_traj_row row;
    int is_point;   /* events sort before a point of the same time */
    size_t seq;
} keyed;

static int cmp(const void *a, const void *b)
{
    const keyed *x = a, *y = b;
    if (x->row.body != y->row.body)
        return x->row.body < y->row.body ? -1 : 1;
    if (x->row.t != y->row.t)
        return x->row.t < y->row.t ? -1 : 1;
    if (x->is_point != y->is_point)
        return x->is_point - y->is_point;
    return x->seq < y->seq ? -1 : x->seq > y->seq;
}

/* Whether an event of body b happened at time t. */
static int at_event(const sr_profile_result *r, int b, double t)
{
    for (size_t i = 0; i < r->nevents; i++)
        if (r->events[i].body == b && fabs(r->events[i].t - t) <= 1e-9 * (1.0 + fabs(t)))
            return 1;
    return 0;
}

int sr_trajectory_build(const sr_profile_ctx *ctx, const sr_profile_result *r, const sr_profile_track *tr,
                        sr_trajectory *out, sr_error *err)
{
    out->row = NULL;
    out->n = 0;
    if (tr->cap > 0 && tr->n >= tr->cap)
        return sr_error_set(err, SR_EIMPOSSIBLE, "the trajectory has more than %zu points; it was cut short", tr->cap);
    keyed *k = malloc((r->nevents + tr->n + 1) * sizeof *k);
    if (!k)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    size_t n = 0;
    for (size_t i = 0; i < r->nevents; i++) {
        const sr_profile_event *e = &r->events[i];
        keyed *x = &k[n];
        x->row = (sr_traj_row){.body = e->body, .t = e->t, .h = e->h, .east = e->east, .north = e->north,
                               .rate = e->rate, .speed = e->speed, .q = e->q, .mach = e->mach, .stage = -1,
                               .event = (int)e->kind, .event_stage = e->stage};
        x->is_point = 0;
        x->seq = n++;
    }
    for (size_t i = 0; i < tr->n; i++) {
        const sr_profile_point *p = &tr->pt[i];
        if (at_event(r, p->body, p->t))
            continue;
        double rho, a, g, we, wn;
        sr_profile_air(ctx, p->h, &rho, &a, &g, &we, &wn);
        keyed *x = &k[n];
        x->row = (sr_traj_row){.body = p->body, .t = p->t, .h = p->h, .east = p->east, .north = p->north,
                               .rate = p->rate, .speed = p->speed, .q = 0.5 * rho * p->speed * p->speed,
                               .mach = p->speed / a, .stage = -1, .event = -1, .event_stage = -1};
        x->is_point = 1;
        x->seq = n++;
    }
    qsort(k, n, sizeof *k, cmp);
    out->row = malloc((n + 1) * sizeof *out->row);
    if (!out->row) {
        free(k);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    /* the stage last deployed on each body, walking its rows in time order:
     * a body that separated starts under the stage that separated it; a
     * deployment that separates a part goes with that part; a failed stage
     * never deploys */
    int cur = -1, body = -1;
    for (size_t i = 0; i < n; i++) {
        sr_traj_row *row = &k[i].row;
        if (row->body != body) {
            body = row->body;
            cur = body >= 0 && (size_t)body < r->nbodies ? r->body[body].stage_split : -1;
        }
        int s = row->event_stage;
        if (row->event == SR_EVENT_DEPLOY && s >= 0 && (size_t)s < r->nstages && r->stage[s].deployed &&
            r->stage[s].body == row->body)
            cur = s;
        row->stage = cur;
        out->row[i] = *row;
    }
    out->n = n;
    free(k);
    return SR_OK;
}

void sr_trajectory_free(sr_trajectory *t)
{
    if (t) {
        free(t->row);
        t->row = NULL;
        t->n = 0;
    }
}
