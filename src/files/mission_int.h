/* mission_int.h - inside the mission reader: its sub-readers, each filling its
 * own model from a block of the file (mission_wind.c: site.wind;
 * mission_uncertainty.c: uncertainty:) and knowing nothing of sr_mission. */
#ifndef SR_MISSION_INT_H
#define SR_MISSION_INT_H

#include <stddef.h>

#include "base/error.h"
#include "files/yamldoc.h"
#include "physics/atmos.h"
#include "physics/canopy.h"
#include "physics/descent_spec.h"
#include "physics/uncertainty.h"
#include "physics/wind.h"

/* The site.wind block: model, speed, direction, heights; a table from CSV
 * (relative to mission_path) or inline rows, or the wind columns of the
 * site's sounding (atmos). ground converts table altitudes to heights. */
int sr_mission_wind_parse(sr_wind *w, const sr_yaml *y, yaml_node_t *n, const char *mission_path, double ground,
                          const sr_atmos *atmos, sr_error *err);

/* What the uncertainty block is read against: the mission read before it. */
typedef struct sr_unc_stage {
    const char *name;
    sr_band cds;                /* one canopy's drag-area band */
    double cd;                  /* its typical drag coefficient (a spread in a quantity is divided by it) */
    sr_deploy_kind deploy;
    double deploy_value;
} sr_unc_stage;

typedef struct sr_unc_basis {
    size_t nstages;
    sr_unc_stage stage[SR_DESCENT_MAX_STAGES];
    double total_mass;          /* kg */
    int has_start;
    double start_height;        /* m above ground */
    double ground;              /* m above sea level */
    const sr_atmos *atmos;
} sr_unc_basis;

/* The `uncertainty:` node, or NULL (then the default: each stage's drag
 * uniform over its family's CD0 range, nothing else varies). */
int sr_mission_uncertainty_parse(sr_uncertainty *u, sr_yaml *y, yaml_node_t *n, const sr_unc_basis *b,
                                 sr_error *err);

#endif
