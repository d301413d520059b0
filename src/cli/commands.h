/* commands.h - the subcommands, one per src/cli/cmd_<name>.c: each defines
 * its sr_command (cli/options.h): name, help words, option table and the
 * function that runs it. */
#ifndef SR_CLI_COMMANDS_H
#define SR_CLI_COMMANDS_H

#include "cli/cli.h"
#include "cli/options.h"

extern const sr_command sr_cmd_size, sr_cmd_rate, sr_cmd_sweep, sr_cmd_profile, sr_cmd_loads, sr_cmd_freefall,
    sr_cmd_dispersion, sr_cmd_air, sr_cmd_canopies, sr_cmd_check, sr_cmd_fit, sr_cmd_design;

/* Every command, in the order of `sinkrate --help`, NULL-terminated (cli.c). */
extern const sr_command *const sr_cli_commands[];

#endif
