/* cli.c - command table and dispatch (temporary stub while the core lands). */
#include "cli/cli.h"

int sr_cli_run(int argc, char **argv, FILE *out, FILE *err)
{
    (void)argc;
    (void)argv;
    (void)out;
    fprintf(err, "sinkrate: not yet\n");
    return 2;
}
