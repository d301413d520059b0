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

struct sr_txn;
struct sr_command;

/* What every subcommand shares: streams (out collects standard output until
 * the run ends, when it is written and checked), the common options, and
 * the run's output transaction. */
typedef struct sr_cli {
    FILE *out;
    FILE *err;
    const char *cmd;         /* subcommand name, for messages */
    const struct sr_command *command; /* its table (cli/options.h), set by the dispatch */
    sr_format format;
    sr_unit_system units;
    const char *output;      /* -o FILE, or NULL for stdout */
    const char *table;       /* --table NAME: only this table of the output, or NULL */
    const char *data_dirs[16]; /* --data DIR, each in front of the ones after it and of the built-in catalog */
    int ndata;
    char catalog_notes[4][384]; /* a user family replacing a built-in one: said in the output (sr_cli_emit) */
    int ncatalog_notes;
    const char *plot_prefix; /* --plot PREFIX */
    const char *plot_format; /* png | svg */
    int plot_width;          /* --plot-size WxH in pixels, 0 = the default */
    int plot_height;
    int threads;             /* --threads N, 0 = all cores */
    unsigned long seed;      /* --seed N */
    int seed_set;
    /* the run's output transaction: every file written through it is put
     * in place only when the run succeeds (output/txn.h) */
    struct sr_txn *txn;
    /* lines for the error stream once the outputs are in place ("wrote
     * fig.png"): said only of files that exist */
    FILE *notes;
    char *notes_buf;
    size_t notes_len;
    int keep_on_usage; /* check: its report stands at exit 2, so it is written */
} sr_cli;

/* Run one command line. Standard output is written, and checked, when the
 * command has succeeded and before its files are put in place; a write
 * error there is exit 2 ("standard output: No space left on device") and
 * changes no file. */
int sr_cli_run(int argc, char **argv, FILE *out, FILE *err);

#endif
