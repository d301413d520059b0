/* input_warnings.h - the warnings about inputs that are valid but probably
 * wrong: values that look like a unit slip (physics/plausible) and a wind
 * law used far above the layer it describes. Every command that reads a
 * mission gathers them here, so profile, dispersion, loads and check warn alike. */
#ifndef SR_INPUT_WARNINGS_H
#define SR_INPUT_WARNINGS_H

#include <stddef.h>

#include "physics/atmos.h"
#include "physics/canopy.h"
#include "physics/plausible.h"
#include "physics/units.h"

struct sr_mission;

#define SR_INPUT_WARN_MAX 32
#define SR_INPUT_WARN_LEN 512

typedef struct sr_input_warnings {
    size_t n;
    char msg[SR_INPUT_WARN_MAX][SR_INPUT_WARN_LEN];
} sr_input_warnings;

void sr_input_warnings_init(sr_input_warnings *w);
/* Add a message (a repeat of one already there is dropped). */
void sr_input_warnings_add(sr_input_warnings *w, const char *msg);

/* One value judged by sr_plausible_check; added when it is implausible.
 * Returns 1 when it was. */
int sr_input_warnings_value(sr_input_warnings *w, sr_plaus_kind kind, double si, const char *what,
                            sr_unit_system sys);

/* A canopy: its nominal diameter and areal mass. */
void sr_input_warnings_canopy(sr_input_warnings *w, const sr_canopy *cp, const char *what, sr_unit_system sys);

/* Every value of a mission: section masses (and the total), body sizes,
 * stage canopies, the steady descent under each stage at the ground
 * (typical drag, the stage's canopy alone on the sections it carries), and
 * the wind law's extrapolation up to the start height. atm: the mission's
 * air (NULL: m->atmos). */
void sr_input_warnings_mission(sr_input_warnings *w, const struct sr_mission *m, const sr_atmos *atm,
                               sr_unit_system sys);

#endif
