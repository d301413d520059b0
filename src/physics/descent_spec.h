/* descent_spec.h - what the staged-descent engine (profile.h) flies: the
 * sections and their drag, the stages (each canopy in numbers and its
 * deployment event), the start state, and the site's air and wind. Built from
 * a mission by the mission reader (files/mission.h, sr_mission_descent);
 * plain values and borrowed pointers, nothing owned, nothing to release. */
#ifndef SR_DESCENT_SPEC_H
#define SR_DESCENT_SPEC_H

#include <stddef.h>

#include "physics/atmos.h"
#include "physics/bluff.h"
#include "physics/wind.h"
#include "sinkrate/physics.h"

#define SR_DESCENT_MAX_SECTIONS 8
#define SR_DESCENT_MAX_STAGES 6
#define SR_DESCENT_NAME_MAX 64

/* sr_section_set (bit i is section i) is public: include/sinkrate/physics.h */

typedef enum sr_deploy_kind {
    SR_DEPLOY_APOGEE = 0,   /* at the start state (apogee or release) */
    SR_DEPLOY_ALTITUDE,     /* at a height above ground */
    SR_DEPLOY_DELAY         /* a time after the previous event */
} sr_deploy_kind;

typedef struct sr_descent_section {
    double mass;             /* kg */
    double drag_area;        /* its own constant drag area, m2 (0: none) */
    int rigid_with;          /* the section it lands as one piece with, -1: none */
    /* Reynolds-dependent drag while no canopy is open on it (curve NULL: none) */
    const sr_bluff_curve *curve; /* borrowed: must outlive the profile context's construction */
    sr_bluff_shape shape;
    double d;                /* diameter: the length of the Reynolds number, m */
    double length;           /* cylinder length, m (0 otherwise) */
    double area;             /* a table's reference area, m2 (NaN: the shape's own) */
    int stable_end_on;       /* it can fall end-on (sr_bluff_attitude) */
} sr_descent_section;

typedef struct sr_descent_stage {
    char name[SR_DESCENT_NAME_MAX];
    double cds;              /* full drag area of the cluster, typical, m2 */
    double d0;               /* nominal diameter of one canopy, typical, m */
    double fill_n;           /* filling constant: t_f = n D0 / v */
    double growth;           /* exponent of the drag-area growth (t/t_f)^n while filling */
    int count;               /* canopies in the cluster */
    double fabric;           /* mass of the canopies, kg (0: neglected) */
    sr_deploy_kind deploy;
    double deploy_value;     /* m above ground, or s after the previous deployment */
    sr_section_set carries;  /* sections under it from its deployment on */
    int keep_previous;       /* canopies already open on these sections keep their drag */
    double line_stretch;     /* s from the deployment event to line stretch */
} sr_descent_stage;

typedef struct sr_descent_spec {
    const sr_atmos *atmos;   /* borrowed (copied by the profile context) */
    const sr_wind *wind;     /* borrowed (copied by the profile context) */
    double ground;           /* site elevation above mean sea level, m */
    size_t nsections;
    sr_descent_section section[SR_DESCENT_MAX_SECTIONS];
    size_t nstages;
    sr_descent_stage stage[SR_DESCENT_MAX_STAGES];
    double start_height;     /* first deployment: height above ground, m */
    double start_speed;      /* m/s */
    double start_path_angle; /* rad below the horizontal */
    double start_heading;    /* rad, bearing of the horizontal motion; NaN: into the wind */
    double start_east, start_north; /* m from the launch or release point */
    char start_at[600];      /* where the start was given ("file:line:column"), for messages */
} sr_descent_spec;

#endif
