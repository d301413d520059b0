/* cli.h - the command-line front end, callable in-process: main() only
 * forwards argv and the two streams here, so tests run every command. */
#ifndef SR_CLI_H
#define SR_CLI_H

#include <stdio.h>

#include "physics/units.h"

/* Exit codes (DESIGN.md): success, valid-but-impossible or a limit exceeded,
 * bad usage or bad input. */
enum { SR_EXIT_OK = 0, SR_EXIT_LIMIT = 1, SR_EXIT_USAGE = 2 };

typedef enum sr_format { SR_FMT_TEXT = 0, SR_FMT_CSV, SR_FMT_JSON } sr_format;

/* What every subcommand shares: streams, the common options, and the
 * resolved catalog directory. */
typedef struct sr_cli {
    FILE *out;
    FILE *err;
    const char *cmd;         /* subcommand name, for messages */
    sr_format format;
    sr_unit_system units;
    const char *output;      /* -o FILE, or NULL for stdout */
    const char *table;       /* --table NAME: only this table of the output, or NULL */
    const char *data_dir;    /* --data DIR, or NULL to search */
    const char *plot_prefix; /* --plot PREFIX */
    const char *plot_format; /* png | svg */
    int plot_width;          /* --plot-size WxH in pixels, 0 = the default */
    int plot_height;
    int threads;             /* --threads N, 0 = all cores */
    unsigned long seed;      /* --seed N */
    int seed_set;
    /* files and directories this run created, removed again when it ends
     * with bad input or a failed write (exit 2): no half product stays */
    char *made[32];
    int nmade;
} sr_cli;

int sr_cli_run(int argc, char **argv, FILE *out, FILE *err);

#endif
