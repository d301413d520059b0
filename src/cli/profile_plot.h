/* profile_plot.h - the figure of `sinkrate profile --plot PREFIX`. */
#ifndef SR_CLI_PROFILE_PLOT_H
#define SR_CLI_PROFILE_PLOT_H

#include "cli/cli.h"
#include "files/mission.h"
#include "physics/profile.h"

/* Two figures through the plot module: PREFIX (height, descent rate and
 * airspeed against time, deployments marked) and PREFIX-track (the ground
 * track with the wind along it and the drift limit; the wind profile).
 * argv is the command's argument list for the scripts' headers. Returns an
 * exit code. */
int sr_cli_profile_plot(sr_cli *c, const sr_mission *m, const sr_profile_ctx *ctx, const sr_profile_result *r,
                    const sr_profile_track *tr, int argc, char **argv);

/* Reserve the second figure's files (PREFIX-track) before any work. */
int sr_cli_profile_plot_reserve(sr_cli *c);

#endif
