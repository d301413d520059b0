/* sounding.c - a sounding (altitude, temperature, pressure) from a CSV file
 * into the atmosphere model, and as a program's handle
 * (include/sinkrate/files.h). */
#include "files/sounding.h"

#include <stdio.h>
#include <stdlib.h>

#include "files/csvtable.h"
#include "sinkrate/files.h"

static const sr_csv_column SOUNDING_COLS[] = {
    {"altitude", SR_Q_LENGTH, 1},
    {"temperature", SR_Q_TEMP, 1},
    {"pressure", SR_Q_PRESSURE, 1},
    {"wind-speed", SR_Q_SPEED, 0},
    {"wind-from", SR_Q_ANGLE, 0},
};

int sr_sounding_load(sr_atmos *m, const char *path, sr_error *err)
{
    sr_atmos_init_standard(m);
    sr_csvtable t;
    int rc = sr_csvtable_load(&t, path, SOUNDING_COLS, sizeof SOUNDING_COLS / sizeof SOUNDING_COLS[0], err);
    if (rc)
        return rc;
    /* a bad row is reported as file:line:column of the CSV */
    size_t bad;
    rc = sr_atmos_init_sounding_rows(m, t.col[0], t.col[1], t.col[2], t.nrows, &bad, err);
    if (rc && bad != (size_t)-1)
        sr_error_locate(err, path, t.row_line[bad], 1);
    if (!rc)
        snprintf(m->source, sizeof m->source, "%s", path);
    sr_csvtable_free(&t);
    return rc;
}

int sr_atmos_open_sounding(sr_atmos **out, const char *path, sr_error *err)
{
    sr_error_gsl_off();
    *out = NULL;
    sr_atmos *m = malloc(sizeof *m);
    if (!m)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_sounding_load(m, path, err);
    if (rc) {
        sr_atmos_free(m);
        return rc;
    }
    *out = m;
    return SR_OK;
}
