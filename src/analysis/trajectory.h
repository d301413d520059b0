/* trajectory.h - the time history of every body of a staged descent: the
 * points the descent engine kept along the way merged with its events, each
 * with height, descent rate, airspeed, position, dynamic pressure, Mach
 * number and the stage last deployed on the body. */
#ifndef SR_TRAJECTORY_H
#define SR_TRAJECTORY_H

#include <stddef.h>

#include "base/error.h"
#include "physics/profile.h"

typedef struct sr_traj_row {
    int body;               /* index into sr_profile_result.body */
    double t;               /* s from the start */
    double h;               /* m above ground */
    double east, north;     /* m from the launch / release point */
    double rate;            /* descent rate, m/s */
    double speed;           /* airspeed, m/s */
    double q;               /* dynamic pressure on the airspeed, Pa */
    double mach;
    int stage;              /* the stage last deployed on the body, whose canopy it hangs under (-1: none) */
    int event;              /* sr_event_kind of an event row, -1 for a point between events */
    int event_stage;        /* the stage of the event (-1: none, or a point) */
} sr_traj_row;

typedef struct sr_trajectory {
    sr_traj_row *row;       /* by body, then time */
    size_t n;
} sr_trajectory;

/* Merge the track of one run (sr_profile_run with a track, full mode) with
 * its events. A track point at the time of an event of its body gives way
 * to the event row. A track that filled its capacity is an error (the
 * history would stop early). Free with sr_trajectory_free. */
int sr_trajectory_build(const sr_profile_ctx *ctx, const sr_profile_result *r, const sr_profile_track *tr,
                        sr_trajectory *out, sr_error *err);
void sr_trajectory_free(sr_trajectory *t);

#endif
