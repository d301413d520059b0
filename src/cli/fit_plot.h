/* fit_plot.h - the figures of `sinkrate fit --plot PREFIX`. */
#ifndef SR_CLI_FIT_PLOT_H
#define SR_CLI_FIT_PLOT_H

#include "analysis/fit.h"
#include "cli/cli.h"

/* PREFIX: height over time with the fitted model, the segments marked, and
 * the residuals below; PREFIX-drag: the drag area over height (a smoothed
 * point estimate) with the fitted value and the catalog band;
 * PREFIX-opening: the opening force over time, when an opening was measured.
 * Returns an exit code. */
int sr_cli_fit_plots(sr_cli *c, sr_fit_result **res, size_t nlogs, const sr_fit_setup *setups, int argc, char **argv);
/* PREFIX-opening from the first log's acceleration column (NULL: none). */
int sr_cli_fit_plot_opening(sr_cli *c, sr_fit_result **res, const sr_fit_setup *setups, const double *acc, int argc,
                        char **argv);

#endif
