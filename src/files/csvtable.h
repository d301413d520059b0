/* csvtable.h - numeric tables from CSV files (soundings, wind tables, drag
 * tables): a header row of "name [unit]" cells, then rows of numbers. Parsed
 * with libcsv; every value is converted to SI through the units module. */
#ifndef SR_CSVTABLE_H
#define SR_CSVTABLE_H

#include <stddef.h>

#include "base/error.h"
#include "physics/units.h"

#define SR_CSVTABLE_MAX_COLS 12
#define SR_CSVTABLE_MAX_ROWS 100000

/* What a caller expects: the column name, its quantity (SR_Q_NONE for a
 * pure number) and whether it must be present. */
typedef struct sr_csv_column {
    const char *name;
    sr_quantity q;
    int required;
} sr_csv_column;

/* Caller-owned result; release with sr_csvtable_free. */
typedef struct sr_csvtable {
    size_t nrows;
    size_t ncols;                             /* = number of specs */
    double *col[SR_CSVTABLE_MAX_COLS];        /* SI values; NULL for an absent optional column */
    size_t *row_line;                         /* source line of each row, for messages */
    size_t field[SR_CSVTABLE_MAX_COLS];       /* 0-based field of each spec in the file's rows; SIZE_MAX absent */
} sr_csvtable;

/* Read path against the expected columns. Blank lines and lines starting with
 * '#' are skipped. Errors name file:line:column. Column order in the file is
 * free; an unknown column, a duplicate column, a missing unit in the header
 * (when the quantity has units), a non-numeric cell or a short row is an error. */
int sr_csvtable_load(sr_csvtable *t, const char *path, const sr_csv_column *specs, size_t nspecs,
                     sr_error *err);
/* Same, from a memory buffer; `name` is used in messages. */
int sr_csvtable_parse(sr_csvtable *t, const char *name, const char *buf, size_t len,
                      const sr_csv_column *specs, size_t nspecs, sr_error *err);
void sr_csvtable_free(sr_csvtable *t);

/* Read a whole text file (at most 64 MiB) into a malloc'd buffer, for
 * sr_csvtable_parse and for messages that quote a cell's position. */
int sr_csvtable_read_file(const char *path, char **buf, size_t *len, sr_error *err);

/* 1-based character column where field `field` (0-based) starts on source
 * line `line` (1-based) of buf, as the parser's messages count it; 1 when the
 * line is not there. For callers that check values after loading. */
size_t sr_csvtable_cell_column(const char *buf, size_t len, size_t line, size_t field);

/* Check that column c increases strictly down the table. */
int sr_csvtable_require_increasing(const sr_csvtable *t, size_t c, const char *path,
                                   const char *what, sr_error *err);

#endif
