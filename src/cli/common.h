/* common.h - what the subcommands share: option groups (output, atmosphere,
 * canopy), parsing quantities with the option name in errors, loading the
 * catalog, and the run's outputs (through its transaction, output/txn.h). */
#ifndef SR_CLI_COMMON_H
#define SR_CLI_COMMON_H

#include <getopt.h>
#include <stddef.h>

#include "physics/atmos.h"
#include "physics/canopy.h"
#include "files/catalog.h"
#include "cli/cli.h"
#include "output/report.h"

/* Option codes for long-only options. */
enum {
    OPT_FORMAT = 1000, OPT_UNITS, OPT_OUTPUT, OPT_DATA, OPT_PLOT, OPT_PLOT_FORMAT, OPT_THREADS, OPT_SEED, OPT_HELP,
    /* atmosphere */
    OPT_TEMP_OFFSET, OPT_SITE_ELEVATION, OPT_SURFACE_TEMP, OPT_SURFACE_PRESSURE, OPT_SOUNDING,
    /* canopy */
    OPT_FAMILY, OPT_CANOPY, OPT_NOMINAL_DIAMETER, OPT_PROJECTED_DIAMETER, OPT_FLAT_DIAMETER, OPT_NOMINAL_AREA,
    OPT_CLUSTER, OPT_CLUSTER_FACTOR, OPT_AREAL_MASS, OPT_DRAG_COEFFICIENT, OPT_DRAG_REFERENCE,
    OPT_PLOT_SIZE, OPT_TABLE,
    /* first free code for a command's own options */
    OPT_COMMAND_BASE = 1100
};

#define SR_OPTS_OUTPUT                                                                                        \
    {"format", required_argument, NULL, OPT_FORMAT}, {"units", required_argument, NULL, OPT_UNITS},           \
        {"output", required_argument, NULL, 'o'}, {"data", required_argument, NULL, OPT_DATA},                \
        {"table", required_argument, NULL, OPT_TABLE}, {"help", no_argument, NULL, 'h'}

#define SR_OPTS_PLOT                                                                                          \
    {"plot", required_argument, NULL, OPT_PLOT}, {"plot-format", required_argument, NULL, OPT_PLOT_FORMAT},   \
        {"plot-size", required_argument, NULL, OPT_PLOT_SIZE}

#define SR_OPTS_ATMOS                                                                                         \
    {"temp-offset", required_argument, NULL, OPT_TEMP_OFFSET},                                                \
        {"site-elevation", required_argument, NULL, OPT_SITE_ELEVATION},                                      \
        {"surface-temp", required_argument, NULL, OPT_SURFACE_TEMP},                                          \
        {"surface-pressure", required_argument, NULL, OPT_SURFACE_PRESSURE},                                  \
        {"sounding", required_argument, NULL, OPT_SOUNDING}

#define SR_OPTS_CANOPY                                                                                        \
    {"family", required_argument, NULL, OPT_FAMILY}, {"canopy", required_argument, NULL, OPT_CANOPY},         \
        {"nominal-diameter", required_argument, NULL, OPT_NOMINAL_DIAMETER},                                  \
        {"projected-diameter", required_argument, NULL, OPT_PROJECTED_DIAMETER},                              \
        {"flat-diameter", required_argument, NULL, OPT_FLAT_DIAMETER},                                        \
        {"nominal-area", required_argument, NULL, OPT_NOMINAL_AREA},                                          \
        {"cluster", required_argument, NULL, OPT_CLUSTER},                                                    \
        {"cluster-factor", required_argument, NULL, OPT_CLUSTER_FACTOR},                                      \
        {"areal-mass", required_argument, NULL, OPT_AREAL_MASS},                                              \
        {"drag-coefficient", required_argument, NULL, OPT_DRAG_COEFFICIENT},                                  \
        {"drag-reference", required_argument, NULL, OPT_DRAG_REFERENCE}

typedef struct sr_atmos_opts {
    const char *temp_offset, *site_elevation, *surface_temp, *surface_pressure, *sounding;
} sr_atmos_opts;

typedef struct sr_canopy_opts {
    const char *family, *canopy, *nominal_diameter, *projected_diameter, *flat_diameter, *nominal_area;
    const char *cluster, *cluster_factor, *areal_mass, *drag_coefficient, *drag_reference;
} sr_canopy_opts;

/* Print "sinkrate CMD: message" on the error stream; returns SR_EXIT_USAGE. */
int sr_cli_fail(sr_cli *c, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;
/* Report a library error with the exit code it deserves (1 impossible, 2 bad input). */
int sr_cli_fail_err(sr_cli *c, const sr_error *e);

/* getopt_long over opts; calls handle(c, code, optarg, ud) for every option;
 * the common output options are consumed here. Unknown options get a
 * suggestion. Returns 0 to go on, -1 when help was printed (exit 0), or an
 * exit code. *first_arg receives the index of the first operand; first_arg
 * NULL: the command takes options only, and an operand is an error. */
typedef int (*sr_opt_handler)(sr_cli *c, int code, const char *arg, void *ud);
int sr_cli_parse(sr_cli *c, int argc, char **argv, const struct option *opts, sr_opt_handler handle, void *ud,
                 const char *help, int *first_arg);

/* Consume atmosphere and canopy options; return 1 if taken. */
int sr_cli_take_atmos(sr_atmos_opts *a, int code, const char *arg);
int sr_cli_take_canopy(sr_canopy_opts *o, int code, const char *arg);

/* Parse a quantity from option `opt`; positive != 0 requires > 0. */
int sr_cli_quantity(sr_cli *c, const char *opt, const char *text, sr_quantity q, int positive, double *out);
/* A comma-separated list of quantities, at most max. */
int sr_cli_quantity_list(sr_cli *c, const char *opt, const char *text, sr_quantity q, double *out, size_t max,
                         size_t *n);
int sr_cli_count(sr_cli *c, const char *opt, const char *text, long lo, long hi, long *out);
/* The mass a command works with: --mass (text, NULL when not given) replaces
 * *mass (a mission's total, or NaN). Missing is an error that says what the
 * mass is (what: "the payload mass"), and so is more than any payload this
 * tool is meant for. */
int sr_cli_mass(sr_cli *c, const char *text, const char *what, double *mass);

/* Build the atmosphere from its options; *ground receives the site elevation
 * (0 without a site). */
int sr_cli_atmos(sr_cli *c, const sr_atmos_opts *a, sr_atmos *m, double *ground);

/* Whether any atmosphere option was given. */
int sr_cli_atmos_given(const sr_atmos_opts *a);

/* Load a mission file (heap-allocated into *mis) and its air: the atmosphere
 * options, when given, replace the file's site weather (*ground then comes
 * from them); otherwise the mission's atmosphere moves into *atm. Without a
 * file (path NULL) *mis is NULL and the air comes from the options alone.
 * Release with sr_cli_mission_free. */
struct sr_mission;
int sr_cli_mission(sr_cli *c, const char *path, const sr_catalog *cat, const sr_atmos_opts *a,
                   struct sr_mission **mis, sr_atmos *atm, double *ground);
void sr_cli_mission_free(struct sr_mission *mis);

/* The catalog: the built-in one ($SINKRATE_DATA, next to the executable, or
 * the installed share directory) with the user's directories in front
 * (--data, then $SINKRATE_PATH); a family of the user's with a built-in id
 * replaces it, and the command's output says so. Heap-allocated; free() it. */
int sr_cli_catalog(sr_cli *c, sr_catalog **cat);
/* The built-in data directory found (holding canopies/ and plots/). */
int sr_cli_data_dir(sr_cli *c, char *buf, size_t len);

/* Build the canopy from its options; size_required = 0 lets `size` go without. */
int sr_cli_canopy(sr_cli *c, const sr_catalog *cat, const sr_canopy_opts *o, int size_required, sr_canopy *out);
int sr_cli_canopy_given(const sr_canopy_opts *o);

/* Describe the canopy into the report (family, size, drag coefficient with
 * its reference and source, cluster). */
void sr_cli_report_canopy(sr_report *r, const sr_canopy *cp);
/* Describe the atmosphere. */
void sr_cli_report_atmos(sr_report *r, const sr_atmos *m);
/* The atmosphere in a few words, for a figure's subtitle. */
void sr_cli_atmos_short(const sr_atmos *m, sr_unit_system sys, char *buf, size_t len);

/* Add gathered input warnings (analysis/input_warnings.h) to the report. */
struct sr_input_warnings;
void sr_cli_report_input_warnings(sr_report *r, const struct sr_input_warnings *w);

/* Render the report in the chosen format to standard output or -o FILE
 * (through the run's transaction). */
int sr_cli_emit(sr_cli *c, sr_report *r);

/* Reserve an output file (opt: "-o", "--samples") in the run's transaction
 * before any work; sr_cli_parse does it for -o and --plot. 0 or an exit
 * code (one line printed). */
int sr_cli_output(sr_cli *c, const char *opt, const char *path);

/* A file the run reads (what: "the mission file", "--sounding"): an output
 * naming the same file is refused. 0 or an exit code. */
int sr_cli_input(sr_cli *c, const char *what, const char *path);
/* Every file a loaded mission read: itself, its sounding, wind table, canopy
 * files and drag tables. */
struct sr_mission;
int sr_cli_mission_inputs(sr_cli *c, const struct sr_mission *m);

/* A line for the error stream once the run's files are in place ("wrote
 * fig.png"); dropped when the run fails. */
void sr_cli_note(sr_cli *c, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

/* Help text pieces shared by the commands. */
extern const char SR_HELP_OUTPUT[];
extern const char SR_HELP_ATMOS[];
extern const char SR_HELP_CANOPY[];
void sr_cli_help(sr_cli *c, const char *text);

#endif
