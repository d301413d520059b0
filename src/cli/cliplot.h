/* cliplot.h - `--plot PREFIX` for every command: write the figure's data and
 * script next to PREFIX, render it when gnuplot is on PATH, say what happened
 * on the error stream. */
#ifndef SR_CLI_PLOT_H
#define SR_CLI_PLOT_H

#include "cli/cli.h"
#include "cli/options.h"
#include "output/plot.h"

#define SR_PLOT_DEFAULT_WIDTH 1000
#define SR_PLOT_DEFAULT_HEIGHT 650

/* Figure: --plot, --plot-format, --plot-size (into sr_cli). */
extern const sr_opt sr_cli_group_plot[];

/* Write PREFIX.dat and PREFIX.gp (the style from the data directory's
 * plots/sinkrate.gp), creating PREFIX's directory if needed, then render
 * PREFIX.png/.svg with gnuplot when it is on PATH, else tell how to -- all in
 * the run's transaction, so nothing is in place before the run succeeds. argv
 * is the command's own argument list, recorded in the script's header
 * (without --threads). Returns 0 or an exit code (message printed). */
int sr_cli_plot(sr_cli *c, const sr_plot *p, int argc, char **argv);
/* The same to another prefix than --plot's (one figure of several). */
int sr_cli_plot_to(sr_cli *c, const sr_plot *p, const char *prefix, int argc, char **argv);

/* Reserve PREFIX.dat, .gp and the figure in the run's transaction before
 * any work (sr_cli_parse_options does it for --plot; a command with figures of
 * other prefixes reserves those too). 0 or an exit code. */
int sr_cli_plot_reserve(sr_cli *c, const char *prefix);

#endif
