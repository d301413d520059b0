/* input_warnings.c - gathering the plausibility and wind-extrapolation
 * warnings of a command's inputs (thresholds in physics/plausible.c). */
#include "analysis/input_warnings.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "files/mission.h"
#include "physics/descent.h"
#include "physics/wind.h"

void sr_input_warnings_init(sr_input_warnings *w)
{
    w->n = 0;
}

void sr_input_warnings_add(sr_input_warnings *w, const char *msg)
{
    for (size_t i = 0; i < w->n; i++)
        if (strcmp(w->msg[i], msg) == 0)
            return;
    if (w->n < SR_INPUT_WARN_MAX)
        snprintf(w->msg[w->n++], SR_INPUT_WARN_LEN, "%s", msg);
}

int sr_input_warnings_value(sr_input_warnings *w, sr_plaus_kind kind, double si, const char *what,
                            sr_unit_system sys)
{
    char buf[SR_INPUT_WARN_LEN];
    if (!sr_plausible_check(kind, si, what, sys, buf, sizeof buf))
        return 0;
    sr_input_warnings_add(w, buf);
    return 1;
}

void sr_input_warnings_canopy(sr_input_warnings *w, const sr_canopy *cp, const char *what, sr_unit_system sys)
{
    char lab[160];
    snprintf(lab, sizeof lab, "%s nominal diameter D0", what);
    sr_input_warnings_value(w, SR_PLAUS_CANOPY_D0, cp->d0.typ, lab, sys);
    if (cp->areal_mass > 0.0) {
        snprintf(lab, sizeof lab, "%s areal mass", what);
        sr_input_warnings_value(w, SR_PLAUS_AREAL_MASS, cp->areal_mass, lab, sys);
    }
}

void sr_input_warnings_mission(sr_input_warnings *w, const sr_mission *m, const sr_atmos *atm, sr_unit_system sys)
{
    char lab[200];
    int mass_flagged = 0;
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        snprintf(lab, sizeof lab, "section '%s' mass", s->name);
        mass_flagged |= sr_input_warnings_value(w, SR_PLAUS_MASS, s->mass, lab, sys);
        if (s->has_body) {
            snprintf(lab, sizeof lab, "section '%s' body diameter", s->name);
            sr_input_warnings_value(w, SR_PLAUS_BODY_SIZE, s->body_d, lab, sys);
            snprintf(lab, sizeof lab, "section '%s' body length", s->name);
            sr_input_warnings_value(w, SR_PLAUS_BODY_SIZE, s->body_length, lab, sys);
        }
    }
    if (!mass_flagged && m->nsections > 1)
        sr_input_warnings_value(w, SR_PLAUS_MASS, sr_mission_total_mass(m), "total mass", sys);
    sr_air air;
    int have_air = sr_atmos_at(atm ? atm : &m->atmos, m->ground, &air, NULL) == SR_OK;
    for (size_t k = 0; k < m->nstages; k++) {
        const sr_stage *st = &m->stages[k];
        if (!st->has_size)
            continue;
        snprintf(lab, sizeof lab, "stage '%s' canopy", st->name);
        sr_input_warnings_canopy(w, &st->canopy, lab, sys);
        sr_band v;
        /* the stage's canopy alone: other drag only slows it more, so a flag here is certain */
        if (have_air && sr_descent_rate(&st->canopy, sr_mission_mass_of(m, st->carries), 0.0, &air, &v, NULL) == SR_OK) {
            snprintf(lab, sizeof lab, "stage '%s' steady descent at the ground (typical)", st->name);
            sr_input_warnings_value(w, SR_PLAUS_DESCENT_SPEED, v.typ, lab, sys);
        }
    }
    char buf[SR_INPUT_WARN_LEN];
    if (m->has_start && sr_wind_check_extrapolation(&m->wind, m->start_height, sys, buf, sizeof buf))
        sr_input_warnings_add(w, buf);
}
