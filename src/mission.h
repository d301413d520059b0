/* mission.h - mission files (payloads/<scenario>.yaml): the site and its
 * weather, the sections and their masses, the recovery stages with their
 * canopies and deployment events, the state at first deployment and the
 * landing limits. One schema for every command that reads a mission. */
#ifndef SR_MISSION_H
#define SR_MISSION_H

#include <stddef.h>

#include "atmos.h"
#include "canopy.h"
#include "catalog.h"
#include "error.h"
#include "uncertainty.h"

#define SR_MISSION_MAX_SECTIONS 8
#define SR_MISSION_MAX_STAGES 6
#define SR_NAME_MAX 64

typedef enum sr_deploy_kind {
    SR_DEPLOY_APOGEE = 0,   /* at the first-deployment state (apogee or release) */
    SR_DEPLOY_ALTITUDE,     /* at a height above ground */
    SR_DEPLOY_DELAY         /* a time after the previous event */
} sr_deploy_kind;

typedef struct sr_stage {
    char name[SR_NAME_MAX];
    sr_canopy canopy;
    int has_size;            /* 0: no size in the file (size --mission sizes it) */
    sr_deploy_kind deploy;
    double deploy_value;     /* m above ground, or s after the previous event */
} sr_stage;

typedef struct sr_section {
    char name[SR_NAME_MAX];
    double mass;             /* kg */
} sr_section;

typedef struct sr_mission {
    char name[128];
    char path[512];
    sr_atmos atmos;          /* site weather: standard, site model or sounding */
    double ground;           /* site elevation above mean sea level, m */
    size_t nsections;
    sr_section sections[SR_MISSION_MAX_SECTIONS];
    size_t nstages;
    sr_stage stages[SR_MISSION_MAX_STAGES];
    int has_start;
    double start_height;     /* first deployment: height above ground, m */
    double start_speed;      /* m/s */
    double start_path_angle; /* rad, below horizontal positive */
    /* landing limits, NaN when not set */
    double limit_speed;      /* touchdown speed, m/s */
    double limit_energy;     /* kinetic energy per section, J */
    double limit_time;       /* descent time, s */
    double limit_drift;      /* drift distance, m */
    sr_uncertainty unc;      /* what a dispersion run varies (mission_uncertainty.c) */
} sr_mission;

/* Load and validate; relative file names inside (sounding, canopy files) are
 * taken relative to the mission file. Release with sr_mission_free. */
int sr_mission_load(sr_mission *m, const char *path, const sr_catalog *cat, sr_error *err);
int sr_mission_parse(sr_mission *m, sr_yaml *y, const sr_catalog *cat, sr_error *err);
void sr_mission_free(sr_mission *m);

/* Total mass of all sections, kg. */
double sr_mission_total_mass(const sr_mission *m);

#endif
