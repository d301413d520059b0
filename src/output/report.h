/* report.h - a command's result as a document (values, bands, tables, notes,
 * warnings) rendered as aligned text, CSV (libcsv) or JSON (jansson), in SI or
 * US units, always with the caution. Values are stored in SI. */
#ifndef SR_REPORT_H
#define SR_REPORT_H

#include <stddef.h>
#include <stdio.h>

#include "base/error.h"
#include "physics/units.h"
#include "sinkrate/output.h"

typedef enum sr_report_format { SR_REPORT_TEXT = 0, SR_REPORT_CSV, SR_REPORT_JSON } sr_report_format;

/* Precision argument `sig` of values and columns: significant digits, or
 * SR_FIXED(d) for a fixed number d of decimals (altitudes: SR_FIXED(0)). */
#define SR_FIXED(d) (100 + (d))

typedef struct sr_report sr_report;
typedef struct sr_rtable sr_rtable;

/* The one caution text (DESIGN.md, Cautions). */
const char *sr_report_caution(void);

/* text as comment lines ("# ...") of a file we write (CSV, YAML): width 0
 * keeps it on one line (a line break becomes a space); otherwise a line
 * ends at its first space past column width and at each line break. The
 * caution heads every such file through it. */
void sr_report_comment(FILE *f, const char *text, size_t width);

sr_report *sr_report_new(const char *command, const char *title);
void sr_report_free(sr_report *r);

/* A line of the header, right below the caution: text output prints it
 * there, CSV as a comment line after the caution, JSON as a top-level field
 * `key` (e.g. the basis of a verdict). */
int sr_report_header(sr_report *r, const char *key, const char *text);

/* Start a group of values with a heading ("Inputs", "Result"). */
int sr_report_section(sr_report *r, const char *heading);
/* A value: key for CSV/JSON (snake_case), label for text, SI value with its
 * quantity, significant digits for text. */
int sr_report_value(sr_report *r, const char *key, const char *label, double si, sr_quantity q, int sig);
/* A band low / typical / high (e.g. from a drag-coefficient range). */
int sr_report_band(sr_report *r, const char *key, const char *label, double lo, double typ, double hi,
                   sr_quantity q, int sig);
/* A text value. */
int sr_report_text(sr_report *r, const char *key, const char *label, const char *text);
int sr_report_note(sr_report *r, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;
int sr_report_warning(sr_report *r, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

/* Tables: columns first, then rows of SI values (text columns take strings). */
sr_rtable *sr_report_table(sr_report *r, const char *key, const char *title);
int sr_rtable_column(sr_rtable *t, const char *key, const char *label, sr_quantity q, int sig);
int sr_rtable_text_column(sr_rtable *t, const char *key, const char *label);
/* Append a row: one double per numeric column (NaN prints as "-"), and one
 * const char * per text column, in column order. */
int sr_rtable_row(sr_rtable *t, const double *nums, const char *const *texts);
size_t sr_rtable_rows(const sr_rtable *t);

int sr_report_write(const sr_report *r, FILE *f, sr_report_format fmt, sr_unit_system sys, sr_error *err);

/* Only one part of the report (the header, the caution and the warnings
 * stay): the table whose key is `table`, or with "values" the single values
 * (as a quantity,value,unit table in CSV). table NULL: the whole report. A
 * table this report does not hold is an error that lists the ones it has. */
#define SR_REPORT_VALUES "values"
int sr_report_write_part(const sr_report *r, FILE *f, sr_report_format fmt, sr_unit_system sys, const char *table,
                         sr_error *err);

/* Format one SI value in a unit system with sig significant digits, with
 * its unit ("5.52 m/s"). */
void sr_report_format_value(char *buf, size_t len, double si, sr_quantity q, sr_unit_system sys, int sig);

/* Number of warnings recorded (commands use it for exit decisions). */
size_t sr_report_warnings(const sr_report *r);

/* The label of the first number in the report that is infinite (a value, a
 * band end or a table cell), or NULL: no such number may reach an output.
 * NaN is "none" and prints as "-" (null in JSON). */
const char *sr_report_infinite(const sr_report *r);

#endif
