/* common.h - what the subcommands share: option groups (output, payload,
 * atmosphere, canopy), parsing quantities with the option name in errors, loading the
 * catalog, and the run's outputs (through its transaction, output/txn.h). */
#ifndef SR_CLI_COMMON_H
#define SR_CLI_COMMON_H

#include <stddef.h>

#include "physics/atmos.h"
#include "physics/canopy.h"
#include "files/catalog.h"
#include "cli/cli.h"
#include "cli/options.h"
#include "output/report.h"

/* ---- the shared option groups (cli/options.h), each declared once ---- */

/* Output: --format, --units, -o, --table, --data, -h (into sr_cli). */
extern const sr_opt sr_cli_group_output[];
/* --seed, --threads of a Monte Carlo run (into sr_cli). */
extern const sr_opt sr_cli_group_run[];
/* Atmosphere: --temp-offset, --site-elevation, --surface-temp,
 * --surface-pressure, --sounding (into sr_atmos_opts). */
extern const sr_opt sr_cli_group_atmos[];
/* Canopy: --family, the sizes, the measured drag, --canopy, the cluster,
 * --areal-mass (into sr_canopy_opts). */
extern const sr_opt sr_cli_group_canopy[];
/* The case: --mass, --altitude, --body-drag-area, --mission (into
 * sr_payload_opts); a command says with SR_OPT_FOR what each means there. */
extern const sr_opt sr_cli_group_payload[];

typedef struct sr_payload_opts {
    const char *mass, *altitude, *body, *mission;
} sr_payload_opts;

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

/* --body-drag-area (text, NULL when not given): a drag area, zero or more,
 * into *area (left as it is without the option). */
int sr_cli_body_drag(sr_cli *c, const char *text, double *area);

/* Parse a quantity from option `opt`; positive != 0 requires > 0. */
int sr_cli_quantity(sr_cli *c, const char *opt, const char *text, sr_quantity q, int positive, double *out);
/* A comma-separated list of quantities, at most max. */
int sr_cli_quantity_list(sr_cli *c, const char *opt, const char *text, sr_quantity q, double *out, size_t max,
                         size_t *n);
/* A probability for opt: a number from 0 to 1, or a percentage ("1 %");
 * 0 or an exit code (one line naming opt). */
int sr_cli_share(sr_cli *c, const char *opt, const char *text, double *p);

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
 * before any work; sr_cli_parse_options does it for -o and --plot. 0 or an exit
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

/* The end of every help text: how quantities are written, and the caution. */
void sr_cli_help(sr_cli *c, const char *text);

#endif
