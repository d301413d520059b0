/* mission_view.c - a program's mission (include/sinkrate/files.h): the
 * reader's struct behind a handle, and read-only accessors. */
#include <stdlib.h>

#include "files/mission.h"

int sr_mission_open(sr_mission **out, const char *path, const sr_catalog *cat, sr_error *err)
{
    sr_error_gsl_off();
    *out = NULL;
    sr_mission *m = malloc(sizeof *m);
    if (!m)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_mission_load(m, path, cat, err);
    if (rc) {
        free(m);
        return rc;
    }
    *out = m;
    return SR_OK;
}

void sr_mission_free(sr_mission *m)
{
    if (!m)
        return;
    sr_mission_release(m);
    free(m);
}

const char *sr_mission_name(const sr_mission *m)
{
    return m->name;
}

double sr_mission_ground(const sr_mission *m)
{
    return m->ground;
}

const sr_atmos *sr_mission_atmos(const sr_mission *m)
{
    return &m->atmos;
}

const sr_wind *sr_mission_wind(const sr_mission *m)
{
    return &m->wind;
}

size_t sr_mission_sections(const sr_mission *m)
{
    return m->nsections;
}

const char *sr_mission_section_name(const sr_mission *m, size_t i)
{
    return i < m->nsections ? m->sections[i].name : NULL;
}

double sr_mission_section_mass(const sr_mission *m, size_t i)
{
    return i < m->nsections ? m->sections[i].mass : 0.0;
}

size_t sr_mission_stages(const sr_mission *m)
{
    return m->nstages;
}

const char *sr_mission_stage_name(const sr_mission *m, size_t k)
{
    return k < m->nstages ? m->stages[k].name : NULL;
}

const sr_canopy *sr_mission_stage_canopy(const sr_mission *m, size_t k)
{
    return k < m->nstages ? &m->stages[k].canopy : NULL;
}

int sr_mission_stage_has_size(const sr_mission *m, size_t k)
{
    return k < m->nstages && m->stages[k].has_size;
}

size_t sr_mission_failures(const sr_mission *m)
{
    return m->nfailures;
}

const char *sr_mission_failure_name(const sr_mission *m, size_t i)
{
    return i < m->nfailures ? m->failures[i].name : NULL;
}

unsigned sr_mission_failure_stages(const sr_mission *m, size_t i)
{
    return i < m->nfailures ? m->failures[i].failed : 0u;
}
