/* profile_plot.h - the figure of `sinkrate profile --plot PREFIX`. */
#ifndef SR_CLI_PROFILE_PLOT_H
#define SR_CLI_PROFILE_PLOT_H

#include "cli/cli.h"
#include "mission.h"
#include "profile.h"

/* Write PREFIX.dat and PREFIX.gp (height and speed against time, the ground
 * track with the wind along it, the wind profile) and render PREFIX.png or
 * .svg when gnuplot is on PATH. Returns an exit code. */
int sr_profile_plot(sr_cli *c, const sr_mission *m, const sr_profile_ctx *ctx, const sr_profile_result *r,
                    const sr_profile_track *tr);

#endif
