/* profile_failcase.h - the failure cases of `sinkrate profile FILE`: the
 * sections' drag without a canopy, the what-if descents the mission file
 * lists under failure-cases:, and the warnings of a free fall. */
#ifndef SR_CLI_PROFILE_FAILCASE_H
#define SR_CLI_PROFILE_FAILCASE_H

#include "analysis/failcase.h"
#include "analysis/judge.h"
#include "cli/cli.h"
#include "files/mission.h"
#include "physics/profile.h"
#include "output/report.h"

/* The table of each section's drag with no canopy open (drag curve, reference
 * area, source), when any section has a body:. */
void sr_cli_profile_report_free_drag(sr_report *r, const sr_cli *c, const sr_mission *m);

/* Warnings on the bodies of a result that land in free fall: several
 * equilibria at the ground, drag curves used outside their range. `prefix`
 * starts each warning (e.g. "failure case 'no canopy': "), may be "". */
void sr_cli_profile_free_fall_warnings(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_profile_result *p,
                                   const char *prefix);

/* Runs every failure case of the file through the analysis layer (failcase.h:
 * full mode, every band end, every attitude the falling bodies can take),
 * judges each against every limit with the one judge, and adds the "Failure
 * cases" tables. What-if results: nothing here changes the exit code; a case
 * that cannot be computed becomes a warning. Returns 0 or an exit code (out of
 * memory). */
int sr_cli_profile_report_failures(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_judge_limits *l,
                               sr_judge_basis basis);

/* For `profile --fail`: each section's impact speed in every attitude. */
void sr_cli_profile_report_attitudes(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_failcase_result *f);

#endif
