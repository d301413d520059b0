/* main.c - the sinkrate executable: everything happens in sr_cli_run; the
 * signal handling is the executable's alone (tests run commands in-process). */
#include <stdio.h>

#include "cli/cli.h"
#include "cli/signals.h"

int main(int argc, char **argv)
{
    sr_cli_signals_install();
    return sr_cli_signals_exit(sr_cli_run(argc, argv, stdout, stderr));
}
