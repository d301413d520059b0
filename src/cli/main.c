/* main.c - the sinkrate executable: everything happens in sr_cli_run. */
#include <stdio.h>

#include "cli/cli.h"

int main(int argc, char **argv)
{
    return sr_cli_run(argc, argv, stdout, stderr);
}
