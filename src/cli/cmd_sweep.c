/* cmd_sweep.c - placeholder until `sinkrate sweep` lands. */
#include "cli/commands.h"
#include "cli/common.h"

int sr_cmd_sweep(sr_cli *c, int argc, char **argv)
{
    (void)argc;
    (void)argv;
    return sr_cli_fail(c, "not available in this build yet");
}
