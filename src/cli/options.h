/* options.h - a command's options as one table: each row holds the option's
 * name, its value, its help line and where the value goes. getopt_long's
 * table, the option list of --help and the shell completion are all made
 * from it, so adding an option is one row. Shared groups (payload, canopy,
 * atmosphere, figure, output: cli/common.h) are declared once and included.
 * Recipe: DEVELOPERS.md, "Adding an option". */
#ifndef SR_CLI_OPTIONS_H
#define SR_CLI_OPTIONS_H

#include <stddef.h>

#include "cli/cli.h"

typedef enum sr_opt_type {
    SR_OPTION_END = 0,
    SR_OPTION_STRING,  /* the value as given, into a const char * (commands parse it after every option
                        * is read: --units may come later and changes what a bare number means) */
    SR_OPTION_FLAG,    /* no value: an int set to 1 */
    SR_OPTION_CALL,    /* a special case: the value (NULL without one) goes to .call */
    SR_OPTION_HELP,    /* -h, --help: print the help, exit 0 */
    SR_OPTION_GROUP,   /* every option of .group, their places counted from .offset */
    SR_OPTION_FOR,     /* this command's own value name and help line for an option of an included group */
    SR_OPTION_WITHOUT, /* an option of an included group that this command does not take */
    SR_OPTION_HEADING, /* a heading line of --help ("Canopy:") */
    SR_OPTION_TEXT,    /* a paragraph of --help */
    SR_OPTION_ITEM     /* an indented item of --help under the option before it (a value it takes) */
} sr_opt_type;

/* flags */
enum {
    SR_OPT_REPEAT = 1, /* may be given more than once (on a group: all of its options); every other option
                        * with a value is refused when given twice */
    SR_OPT_IN_CLI = 2  /* the place is in sr_cli (the output options), not in the command's struct */
};

typedef struct sr_opt sr_opt;

/* A special case: called with the option's row, its value (NULL for an
 * option without one) and where the table says the value goes. Returns 0,
 * or an exit code after printing one line (sr_cli_fail). On a group row,
 * the call takes every option of the group instead (SR_OPT_GROUP_CALL). */
typedef int (*sr_opt_call)(sr_cli *c, const sr_opt *opt, const char *arg, void *place);

struct sr_opt {
    sr_opt_type type;
    int short_name;       /* 'o' for -o, or 0 */
    const char *name;     /* the long name without its dashes; NULL for a short option alone */
    const char *value;    /* the value's name in --help ("M", "FILE"); NULL: takes no value */
    size_t offset;        /* where the value goes: offset into the command's options struct */
    const char *help;     /* help text: wrapped to 80 columns; a line starting with a space is kept as
                           * written (a list, an example); an empty line starts a paragraph */
    sr_opt_call call;     /* SR_OPTION_CALL, or a group's taker */
    const sr_opt *group;  /* SR_OPTION_GROUP */
    unsigned flags;
};

/* ---- rows: T is the command's options struct, F the field ---- */

/* --NAME VALUE, kept as text in T.F (const char *) */
#define SR_OPT_STRING(NAME, VALUE, T, F, HELP)                                                               \
    {.type = SR_OPTION_STRING, .name = (NAME), .value = (VALUE), .offset = offsetof(T, F), .help = (HELP)}
/* -S, --NAME VALUE (NAME may be NULL: -S VALUE alone) */
#define SR_OPT_SHORT_STRING(S, NAME, VALUE, T, F, HELP)                                                      \
    {.type = SR_OPTION_STRING, .short_name = (S), .name = (NAME), .value = (VALUE), .offset = offsetof(T, F),  \
     .help = (HELP)}
/* --NAME without a value: T.F (int) set to 1 */
#define SR_OPT_FLAG(NAME, T, F, HELP)                                                                        \
    {.type = SR_OPTION_FLAG, .name = (NAME), .offset = offsetof(T, F), .help = (HELP)}
/* --NAME [VALUE] handed to CALL with &T.F */
#define SR_OPT_CALL(NAME, VALUE, T, F, CALL, HELP)                                                           \
    {.type = SR_OPTION_CALL, .name = (NAME), .value = (VALUE), .offset = offsetof(T, F), .call = (CALL),     \
     .help = (HELP)}
/* --NAME VALUE that may be given several times: CALL keeps each value
 * (e.g. appends it to a list at &T.F) */
#define SR_OPT_REPEATED(NAME, VALUE, T, F, CALL, HELP)                                                       \
    {.type = SR_OPTION_CALL, .name = (NAME), .value = (VALUE), .offset = offsetof(T, F), .call = (CALL),     \
     .help = (HELP), .flags = SR_OPT_REPEAT}
/* every option of GROUP, its struct at T.F */
#define SR_OPT_GROUP(GROUP, T, F) {.type = SR_OPTION_GROUP, .offset = offsetof(T, F), .group = (GROUP)}
/* a group whose options all live in sr_cli (output, figure) */
#define SR_OPT_CLI_GROUP(GROUP) {.type = SR_OPTION_GROUP, .group = (GROUP)}
/* GROUP with CALL taking each of its options (place: the command's whole
 * struct; the option's own offset is into the group's struct); FLAGS e.g.
 * SR_OPT_REPEAT */
#define SR_OPT_GROUP_CALL(GROUP, CALL, FLAGS)                                                                \
    {.type = SR_OPTION_GROUP, .group = (GROUP), .call = (CALL), .flags = (FLAGS)}
/* this command's words for --NAME of an included group */
#define SR_OPT_FOR(NAME, VALUE, HELP) {.type = SR_OPTION_FOR, .name = (NAME), .value = (VALUE), .help = (HELP)}
/* --NAME of an included group is not taken here */
#define SR_OPT_WITHOUT(NAME) {.type = SR_OPTION_WITHOUT, .name = (NAME)}
#define SR_OPT_HEADING(TEXT) {.type = SR_OPTION_HEADING, .help = (TEXT)}
#define SR_OPT_TEXT(TEXT) {.type = SR_OPTION_TEXT, .help = (TEXT)}
#define SR_OPT_ITEM(NAME, HELP) {.type = SR_OPTION_ITEM, .name = (NAME), .help = (HELP)}
#define SR_OPT_END {.type = SR_OPTION_END}

/* A command: its name, the words of its help and its option table. */
typedef struct sr_command {
    const char *name;
    const char *summary;  /* one line for `sinkrate --help` */
    const char *usage;    /* the usage lines, as written */
    const char *about;    /* what it does: paragraphs, wrapped like help texts */
    const sr_opt *options;
    /* the keys of the tables its report holds ("values" first: its single
     * values), NULL-terminated, for --table and --help; a name ending in "_N"
     * stands for a numbered family (trace_1, trace_2, ...);
     * tests/test_tables.c checks them against real runs */
    const char *const *tables;
    /* argv starts at the command's name; an exit code, or -1 after --help */
    int (*run)(sr_cli *c, int argc, char **argv);
} sr_command;

/* An option of a command's table as the parser sees it: groups expanded in
 * place, the command's own words (SR_OPT_FOR) applied, omitted ones gone. */
typedef struct sr_opt_flat {
    const sr_opt *opt;     /* its row (name, short name, type, call, flags) */
    const sr_opt *group;   /* the group row that brought it in, or NULL */
    const char *value;     /* the value's name, NULL: none */
    const char *help;
    size_t offset;         /* where the value goes, in the command's struct (in sr_cli: SR_OPT_IN_CLI) */
} sr_opt_flat;

#define SR_OPT_MAX 128

/* The options of a table in order; returns how many (at most max). */
size_t sr_cli_opt_flatten(const sr_opt *table, sr_opt_flat *out, size_t max);

/* How messages name an option: "-o" for one with a short name (but
 * "--help"), else "--name". */
const char *sr_cli_opt_display(const sr_opt *o, char *buf, size_t len);

/* Read the options of c->command into opts (the command's struct, zeroed
 * by the caller). Returns 0 to go on, -1 when help was printed (exit 0), or
 * an exit code (one line printed). *first_arg receives the index of the
 * first operand; first_arg NULL: the command takes options only, and an
 * operand is an error. Reserves -o and --plot in the run's transaction. */
int sr_cli_parse_options(sr_cli *c, int argc, char **argv, void *opts, int *first_arg);

/* The command's --help into c->out: usage, about, the options from the
 * table, the tables of its output, the caution. */
void sr_cli_print_help(sr_cli *c);

/* Write text wrapped to 80 columns as help texts are (see sr_opt.help):
 * continuing on a line already at column col, later lines indented. */
void sr_cli_wrap(FILE *f, const char *text, size_t col, size_t indent);

#endif
