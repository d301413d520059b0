/* profile_failcase.h - the failure cases of `sinkrate profile FILE`: the
 * sections' drag without a canopy, the what-if descents the mission file
 * lists under failure-cases:, and the warnings of a free fall. */
#ifndef SR_CLI_PROFILE_FAILCASE_H
#define SR_CLI_PROFILE_FAILCASE_H

#include "cli/cli.h"
#include "files/mission.h"
#include "physics/profile.h"
#include "output/report.h"

/* The table of each section's drag with no canopy open (drag curve, reference
 * area, source), when any section has a body:. */
void sr_profile_report_free_drag(sr_report *r, const sr_cli *c, const sr_mission *m);

/* Warnings on the bodies of a result that land in free fall: several
 * equilibria at the ground, drag curves used outside their range. `prefix`
 * starts each warning (e.g. "failure case 'no canopy': "), may be "". */
void sr_profile_free_fall_warnings(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_profile_result *p,
                                   const char *prefix);

/* Runs every failure case of the file (full mode, typical drag and the low
 * end of the drag range of the canopies that open) and adds the "Failure
 * cases" section. What-if results: nothing here changes the exit code; a
 * case that cannot be computed becomes a warning. */
void sr_profile_report_failures(sr_report *r, const sr_cli *c, const sr_mission *m);

#endif
