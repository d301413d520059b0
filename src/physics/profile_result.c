/* profile_result.c - a program's view of a staged descent's result
 * (include/sinkrate/physics.h): allocation and read-only accessors. */
#include <stdlib.h>
#include <string.h>

#include "physics/profile.h"

int sr_profile_result_new(sr_profile_result **out, sr_error *err)
{
    *out = calloc(1, sizeof **out);
    return *out ? SR_OK : sr_error_set(err, SR_ENOMEM, "out of memory");
}

void sr_profile_result_free(sr_profile_result *r)
{
    free(r);
}

size_t sr_profile_result_events(const sr_profile_result *r)
{
    return r->nevents;
}

const sr_profile_event *sr_profile_result_event(const sr_profile_result *r, size_t i)
{
    return i < r->nevents ? &r->events[i] : NULL;
}

size_t sr_profile_result_stages(const sr_profile_result *r)
{
    return r->nstages;
}

const sr_profile_stage *sr_profile_result_stage(const sr_profile_result *r, size_t k)
{
    return k < r->nstages ? &r->stage[k] : NULL;
}

size_t sr_profile_result_bodies(const sr_profile_result *r)
{
    return r->nbodies;
}

const sr_profile_body *sr_profile_result_body(const sr_profile_result *r, size_t i)
{
    return i < r->nbodies ? &r->body[i] : NULL;
}

double sr_profile_result_descent_time(const sr_profile_result *r)
{
    return r->descent_time;
}

double sr_profile_result_max_rate(const sr_profile_result *r)
{
    return r->max_rate;
}

double sr_profile_result_max_energy(const sr_profile_result *r)
{
    return r->max_energy;
}

double sr_profile_result_max_drift(const sr_profile_result *r)
{
    return r->max_drift;
}
