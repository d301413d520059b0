/* commands.h - one entry point per subcommand (src/cli/cmd_<name>.c). Each
 * gets argv starting at its own name and returns an exit code (or -1 after
 * printing help). */
#ifndef SR_CLI_COMMANDS_H
#define SR_CLI_COMMANDS_H

#include "cli/cli.h"

typedef int (*sr_command_fn)(sr_cli *c, int argc, char **argv);

int sr_cmd_size(sr_cli *c, int argc, char **argv);
int sr_cmd_rate(sr_cli *c, int argc, char **argv);
int sr_cmd_sweep(sr_cli *c, int argc, char **argv);
int sr_cmd_profile(sr_cli *c, int argc, char **argv);
int sr_cmd_loads(sr_cli *c, int argc, char **argv);
int sr_cmd_freefall(sr_cli *c, int argc, char **argv);
int sr_cmd_dispersion(sr_cli *c, int argc, char **argv);
int sr_cmd_air(sr_cli *c, int argc, char **argv);
int sr_cmd_canopies(sr_cli *c, int argc, char **argv);
int sr_cmd_check(sr_cli *c, int argc, char **argv);
int sr_cmd_fit(sr_cli *c, int argc, char **argv);
int sr_cmd_design(sr_cli *c, int argc, char **argv);

#endif
