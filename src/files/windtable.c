/* windtable.c - the wind as a table from a file: a CSV wind table, or the
 * wind columns of a sounding; every bad row named by file:line:column. */
#include "files/windtable.h"

#include <stdio.h>
#include <stdlib.h>

#include "files/csvtable.h"
#include "sinkrate/files.h"

/* Shared by the table and sounding readers: heights are alt - ground. */
static int table_from_csv(sr_wind *w, const char *path, const sr_csvtable *t, const double *alt, double ground,
                          size_t cs, size_t cf, sr_error *err)
{
    double *h = malloc((t->nrows ? t->nrows : 1) * sizeof *h);
    if (!h)
        return sr_error_set(err, SR_ENOMEM, "out of memory for the wind table");
    for (size_t i = 0; i < t->nrows; i++)
        h[i] = alt[i] - ground;
    size_t bad;
    int rc = sr_wind_init_table_rows(w, h, t->col[cs], t->col[cf], t->nrows, &bad, err);
    free(h);
    if (rc) {
        sr_error_locate(err, path, bad != (size_t)-1 ? t->row_line[bad] : 0, 1);
        return rc;
    }
    snprintf(w->source, sizeof w->source, "%s", path);
    return SR_OK;
}

int sr_windtable_load(sr_wind *w, const char *path, double ground, sr_error *err)
{
    static const sr_csv_column COLS[] = {
        {"height", SR_Q_LENGTH, 0},
        {"altitude", SR_Q_LENGTH, 0},
        {"speed", SR_Q_SPEED, 1},
        {"from", SR_Q_ANGLE, 1},
    };
    sr_wind_init_calm(w);
    sr_csvtable t;
    int rc = sr_csvtable_load(&t, path, COLS, sizeof COLS / sizeof COLS[0], err);
    if (rc)
        return rc;
    if ((t.col[0] != NULL) == (t.col[1] != NULL)) {
        sr_csvtable_free(&t);
        return sr_error_set_at(err, SR_EINVAL, path, 1, 1,
                               "a wind table needs exactly one of the columns 'height' (above ground) or "
                               "'altitude' (above sea level)");
    }
    rc = table_from_csv(w, path, &t, t.col[0] ? t.col[0] : t.col[1], t.col[0] ? 0.0 : ground, 2, 3, err);
    sr_csvtable_free(&t);
    return rc;
}

int sr_windtable_load_sounding(sr_wind *w, const char *path, double ground, sr_error *err)
{
    /* the sounding's own columns, as the atmosphere reads them */
    static const sr_csv_column COLS[] = {
        {"altitude", SR_Q_LENGTH, 1},  {"temperature", SR_Q_TEMP, 1}, {"pressure", SR_Q_PRESSURE, 1},
        {"wind-speed", SR_Q_SPEED, 0}, {"wind-from", SR_Q_ANGLE, 0},
    };
    sr_wind_init_calm(w);
    sr_csvtable t;
    int rc = sr_csvtable_load(&t, path, COLS, sizeof COLS / sizeof COLS[0], err);
    if (rc)
        return rc;
    if (!t.col[3] || !t.col[4]) {
        sr_csvtable_free(&t);
        return sr_error_set_at(err, SR_EINVAL, path, 1, 1, "the sounding has no 'wind-speed' and 'wind-from' columns");
    }
    rc = table_from_csv(w, path, &t, t.col[0], ground, 3, 4, err);
    sr_csvtable_free(&t);
    return rc;
}

int sr_wind_open_table(sr_wind **out, const char *path, double ground, sr_error *err)
{
    *out = NULL;
    sr_wind *w = malloc(sizeof *w);
    if (!w)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_windtable_load(w, path, ground, err);
    if (rc) {
        sr_wind_free(w);
        return rc;
    }
    *out = w;
    return SR_OK;
}
