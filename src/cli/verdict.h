/* verdict.h - the one judge's verdict on a page: the --limits-at option, the
 * header line that says whether the verdict is conservative, the limits
 * table, and one line on stderr per limit exceeded. Shared by `profile` and
 * `loads`, so the same verdict reads the same everywhere. */
#ifndef SR_CLI_VERDICT_H
#define SR_CLI_VERDICT_H

#include "analysis/judge.h"
#include "cli/cli.h"
#include "cli/options.h"
#include "files/mission.h"
#include "output/report.h"

/* The option every judging command takes: --limits-at, its text into T.F
 * (parsed with sr_cli_limits_at). */
#define SR_OPT_LIMITS_AT(T, F)                                                                                \
    SR_OPT_STRING("limits-at", "band-end|typical", T, F,                                                      \
                  "band-end (the default): every limit is judged at the worse end of every band (drag range, "  \
                  "mass band, opening-load factor range, growth-exponent range): exit 1 when that end breaks a " \
                  "limit. typical: judge at the typical values only; the output then says at its top that the " \
                  "verdict is NOT conservative")

/* Parse the option's value; 0 or an exit code (one line naming the option). */
int sr_cli_limits_at(sr_cli *c, const char *text, sr_judge_basis *basis);

/* The header line: the basis of the verdict (text line under the caution, CSV
 * comment, JSON field "verdict_basis"). */
void sr_cli_verdict_header(sr_report *r, sr_judge_basis basis);

/* A row's label ("landing energy, booster") and unit quantity. */
void sr_cli_verdict_label(const sr_mission *m, const sr_judge_limits *l, const sr_judge_row *row, char *buf,
                          size_t len);
sr_quantity sr_cli_verdict_quantity(sr_limit_kind k);

/* The limits table (key "limits") with every row of the verdict, kinds in
 * `only` (bits 1 << kind; 0: all). Returns the rows shown. */
size_t sr_cli_verdict_table(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_judge_limits *l,
                            const sr_verdict *v, unsigned only);

/* One stderr line per row that breaks its limit ("limit exceeded: ..."), and a
 * warning in the report for a relaxed verdict hiding band-end breaches.
 * Returns the number of rows exceeded (the exit code follows it). */
int sr_cli_verdict_messages(sr_report *r, sr_cli *c, const sr_mission *m, const sr_judge_limits *l,
                            const sr_verdict *v, unsigned only);

/* A compact list of the broken limits ("energy 15.7x, speed 5.0x, opening
 * load 'main' 3.4x the limit"), for failure-case rows; "" when none. Returns
 * the highest ratio. */
double sr_cli_verdict_breaches(const sr_mission *m, const sr_verdict *v, char *buf, size_t len);

#endif
