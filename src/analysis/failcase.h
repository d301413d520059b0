/* failcase.h - a failure case of a mission (some stages do not deploy) as
 * band runs in every attitude its falling bodies can take, judged by the one
 * judge against every limit at the worse attitude and the worse band end.
 * A falling body is never given only its highest-drag attitude: a cylinder is
 * run broadside and tumbling (and end-on where the file says it can fall so),
 * a disk face-on and tumbling (bluff.h, sr_bluff_attitude).
 *
 * The caller owns the result (large: allocate it); nothing is printed. */
#ifndef SR_FAILCASE_H
#define SR_FAILCASE_H

#include "analysis/band.h"
#include "analysis/judge.h"
#include "sinkrate/analysis.h"

#define SR_FAILCASE_MAX_ATTITUDES 3

typedef struct sr_failcase_result {
    unsigned failed;                 /* bit k: stage k does not deploy */
    size_t nattitudes;
    sr_bluff_attitude attitude[SR_FAILCASE_MAX_ATTITUDES];     /* broadside first */
    sr_band_result band[SR_FAILCASE_MAX_ATTITUDES];            /* full mode, one per attitude */
    sr_verdict verdict;              /* the worst over attitudes and band ends (or typical, relaxed) */
    int worse;                       /* the attitude closest to or furthest past a limit (without limits: the
                                      * fastest touchdown) */
    /* per section: the impact speed (descent rate at the ground) and the
     * energy the judge uses, at the band end, in each attitude */
    double impact[SR_FAILCASE_MAX_ATTITUDES][SR_MISSION_MAX_SECTIONS];
    double energy[SR_FAILCASE_MAX_ATTITUDES][SR_MISSION_MAX_SECTIONS];
} sr_failcase_result;

/* The attitudes the mission's bodies can take (broadside always; tumbling
 * when a section is a cylinder or a disk; end-on when one is marked
 * stable-end-on). Returns how many were written (at most 3). */
size_t sr_failcase_attitudes(const sr_mission *m, sr_bluff_attitude out[SR_FAILCASE_MAX_ATTITUDES]);

/* sr_failcase_run (public) runs the failure case `failed` (full mode) in
 * every attitude and judges it; po: profile options (NULL: defaults; its
 * failed and attitude are set here). */

#endif
