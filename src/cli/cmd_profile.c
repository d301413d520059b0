/* cmd_profile.c - placeholder until `sinkrate profile` lands. */
#include "cli/commands.h"
#include "cli/common.h"

int sr_cmd_profile(sr_cli *c, int argc, char **argv)
{
    (void)argc;
    (void)argv;
    return sr_cli_fail(c, "not available in this build yet");
}
