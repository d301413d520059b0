/* flightlog.c - reading and checking altimeter flight logs on top of the CSV
 * table reader: one vertical column, increasing times without gaps, plausible
 * values, positions in a local east/north frame. */
#include "files/flightlog.h"

#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "files/csvtable.h"
#include "physics/atmos.h"

#define SR_PI_ 3.14159265358979323846

enum { C_TIME = 0, C_HEIGHT, C_ALTITUDE, C_PRESSURE, C_ACC, C_EAST, C_NORTH, C_LAT, C_LON, NCOL };

static const sr_csv_column COLS[NCOL] = {
    [C_TIME] = {"time", SR_Q_TIME, 1},          [C_HEIGHT] = {"height", SR_Q_LENGTH, 0},
    [C_ALTITUDE] = {"altitude", SR_Q_LENGTH, 0}, [C_PRESSURE] = {"pressure", SR_Q_PRESSURE, 0},
    [C_ACC] = {"acceleration", SR_Q_ACCEL, 0},   [C_EAST] = {"east", SR_Q_LENGTH, 0},
    [C_NORTH] = {"north", SR_Q_LENGTH, 0},       [C_LAT] = {"latitude", SR_Q_ANGLE, 0},
    [C_LON] = {"longitude", SR_Q_ANGLE, 0},
};

const char *sr_log_vertical_name(sr_log_vertical v)
{
    switch (v) {
    case SR_LOG_ALTITUDE: return "altitude";
    case SR_LOG_PRESSURE: return "pressure";
    default: return "height";
    }
}

void sr_flightlog_free(sr_flightlog *l)
{
    free(l->t);
    free(l->v);
    free(l->acc);
    free(l->east);
    free(l->north);
    free(l->line);
    free(l->text);
    memset(l, 0, sizeof *l);
}

void sr_flightlog_where(const sr_flightlog *l, size_t i, size_t f, char *buf, size_t len)
{
    size_t line = i < l->n ? l->line[i] : l->header_line;
    size_t col = l->text ? sr_csvtable_cell_column(l->text, l->text_len, line, f) : 1;
    snprintf(buf, len, "%s:%zu:%zu", l->path, line, col);
}

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* line of the header: the first line that is neither blank nor a comment */
static size_t header_line(const char *buf, size_t len)
{
    size_t line = 1, pos = 0;
    while (pos < len) {
        size_t end = pos;
        while (end < len && buf[end] != '\n' && buf[end] != '\r')
            end++;
        size_t i = pos;
        while (i < end && (buf[i] == ' ' || buf[i] == '\t'))
            i++;
        if (i < end && buf[i] != '#')
            return line;
        if (end < len && buf[end] == '\r' && end + 1 < len && buf[end + 1] == '\n')
            end++;
        pos = end + 1;
        line++;
    }
    return 1;
}

static int fail_cell(const sr_flightlog *l, size_t i, size_t f, sr_error *err, const char *msg)
{
    size_t line = i < l->n ? l->line[i] : l->header_line;
    size_t col = l->text ? sr_csvtable_cell_column(l->text, l->text_len, line, f) : 1;
    return sr_error_set_at(err, SR_EINVAL, l->path, line, col, "%s", msg);
}

static int check(sr_flightlog *l, const sr_csvtable *t, double max_gap, sr_error *err)
{
    char msg[SR_ERROR_MSG_MAX];
    /* exactly one vertical column */
    int nv = 0, which = -1;
    for (int c = C_HEIGHT; c <= C_PRESSURE; c++)
        if (t->col[c]) {
            nv++;
            if (which < 0)
                which = c;
            else {
                snprintf(msg, sizeof msg, "the log gives both '%s' and '%s'; keep one vertical column",
                         COLS[which].name, COLS[c].name);
                return fail_cell(l, SIZE_MAX, t->field[c], err, msg);
            }
        }
    if (nv == 0)
        return fail_cell(l, SIZE_MAX, 0, err,
                         "the log needs a vertical column: 'height [m]' (above ground), 'altitude [m]' (above sea "
                         "level) or 'pressure [hPa]'");
    l->vertical = which == C_HEIGHT ? SR_LOG_HEIGHT : which == C_ALTITUDE ? SR_LOG_ALTITUDE : SR_LOG_PRESSURE;
    l->field_t = t->field[C_TIME];
    l->field_v = t->field[which];
    l->field_acc = t->field[C_ACC];
    if ((t->col[C_EAST] != NULL) != (t->col[C_NORTH] != NULL))
        return fail_cell(l, SIZE_MAX, t->field[t->col[C_EAST] ? C_EAST : C_NORTH], err,
                         "positions need both 'east' and 'north'");
    if ((t->col[C_LAT] != NULL) != (t->col[C_LON] != NULL))
        return fail_cell(l, SIZE_MAX, t->field[t->col[C_LAT] ? C_LAT : C_LON], err,
                         "positions need both 'latitude' and 'longitude'");
    if (t->col[C_EAST] && t->col[C_LAT])
        return fail_cell(l, SIZE_MAX, t->field[C_LAT], err,
                         "give positions once: east/north or latitude/longitude, not both");
    for (size_t i = 0; i < l->n; i++) {
        double v = l->v[i];
        if (l->vertical == SR_LOG_PRESSURE && !(v >= SR_FLIGHTLOG_P_MIN && v <= SR_FLIGHTLOG_P_MAX)) {
            snprintf(msg, sizeof msg,
                     "pressure %.6g Pa is outside %.0f .. %.0f hPa: check the unit in the header (hPa, Pa, kPa)", v,
                     SR_FLIGHTLOG_P_MIN / 100, SR_FLIGHTLOG_P_MAX / 100);
            return fail_cell(l, i, l->field_v, err, msg);
        }
        if (l->vertical != SR_LOG_PRESSURE && !(v >= SR_ATMOS_Z_MIN - 2000.0 && v <= SR_ATMOS_Z_MAX)) {
            snprintf(msg, sizeof msg, "%s %.6g m is outside -3 .. 86 km: check the unit in the header",
                     sr_log_vertical_name(l->vertical), v);
            return fail_cell(l, i, l->field_v, err, msg);
        }
        if (l->acc && !(fabs(l->acc[i]) <= 2000.0 * SR_ATMOS_G0)) {
            snprintf(msg, sizeof msg, "acceleration %.6g m/s2 is beyond 2000 g: check the unit in the header",
                     l->acc[i]);
            return fail_cell(l, i, l->field_acc, err, msg);
        }
    }
    /* times: strictly increasing (the values come first: a wrong unit says more than a short log) */
    for (size_t i = 1; i < l->n; i++) {
        if (l->t[i] == l->t[i - 1]) {
            snprintf(msg, sizeof msg, "time %.10g s repeats the row before (line %zu)", l->t[i], l->line[i - 1]);
            return fail_cell(l, i, l->field_t, err, msg);
        }
        if (l->t[i] < l->t[i - 1]) {
            snprintf(msg, sizeof msg, "time %.10g s is earlier than the row before (%.10g s); the rows must be in "
                                      "time order", l->t[i], l->t[i - 1]);
            return fail_cell(l, i, l->field_t, err, msg);
        }
    }
    if (l->n < 2)
        return fail_cell(l, 0, 0, err, "the log has one row; a fit needs at least 20");
    double *d = malloc((l->n - 1) * sizeof *d);
    if (!d)
        return sr_error_set_at(err, SR_ENOMEM, l->path, 0, 0, "out of memory");
    for (size_t i = 1; i < l->n; i++)
        d[i - 1] = l->t[i] - l->t[i - 1];
    qsort(d, l->n - 1, sizeof *d, cmp_double);
    l->step = d[(l->n - 1) / 2];
    free(d);
    double gap = max_gap > 0 ? max_gap : fmax(1.0, 10.0 * l->step);
    for (size_t i = 1; i < l->n; i++)
        if (l->t[i] - l->t[i - 1] > gap) {
            snprintf(msg, sizeof msg,
                     "a gap of %.4g s in the log after %.10g s (its step is %.4g s, the longest dropout accepted "
                     "%.4g s; --max-gap sets it)",
                     l->t[i] - l->t[i - 1], l->t[i - 1], l->step, gap);
            return fail_cell(l, i, l->field_t, err, msg);
        }
    if (t->col[C_LAT]) {
        for (size_t i = 0; i < l->n; i++) {
            double la = t->col[C_LAT][i], lo = t->col[C_LON][i];
            if (!(fabs(la) <= SR_PI_ / 2))
                return fail_cell(l, i, t->field[C_LAT], err, "latitude is outside -90 .. 90 deg");
            if (!(fabs(lo) <= SR_PI_))
                return fail_cell(l, i, t->field[C_LON], err, "longitude is outside -180 .. 180 deg");
        }
    }
    if (l->n < SR_FLIGHTLOG_MIN_ROWS) {
        snprintf(msg, sizeof msg, "the log has %zu rows; a fit needs at least %d", l->n, SR_FLIGHTLOG_MIN_ROWS);
        return fail_cell(l, l->n - 1, 0, err, msg);
    }
    return SR_OK;
}

int sr_flightlog_parse(sr_flightlog *l, const char *name, const char *buf, size_t len, double max_gap,
                       sr_error *err)
{
    memset(l, 0, sizeof *l);
    snprintf(l->path, sizeof l->path, "%s", name);
    sr_csvtable t;
    int rc = sr_csvtable_parse(&t, name, buf, len, COLS, NCOL, err);
    if (rc)
        return rc;
    l->text = malloc(len + 1);
    if (!l->text) {
        sr_csvtable_free(&t);
        return sr_error_set_at(err, SR_ENOMEM, name, 0, 0, "out of memory");
    }
    memcpy(l->text, buf, len);
    l->text[len] = '\0';
    l->text_len = len;
    l->header_line = header_line(buf, len);
    l->n = t.nrows;
    /* the table's arrays move into the log */
    l->t = t.col[C_TIME];
    int vcol = -1;
    for (int c = C_HEIGHT; c <= C_PRESSURE; c++)
        if (t.col[c] && vcol < 0)
            vcol = c;
    l->v = vcol >= 0 ? t.col[vcol] : NULL;
    l->acc = t.col[C_ACC];
    l->line = t.row_line;
    rc = check(l, &t, max_gap, err);
    /* the moved arrays now belong to the log */
    t.col[C_TIME] = NULL;
    if (vcol >= 0)
        t.col[vcol] = NULL;
    t.col[C_ACC] = NULL;
    t.row_line = NULL;
    if (!rc && (t.col[C_EAST] || t.col[C_LAT])) {
        l->east = malloc(l->n * sizeof *l->east);
        l->north = malloc(l->n * sizeof *l->north);
        if (!l->east || !l->north)
            rc = sr_error_set_at(err, SR_ENOMEM, name, 0, 0, "out of memory");
        for (size_t i = 0; !rc && i < l->n; i++) {
            if (t.col[C_EAST]) {
                l->east[i] = t.col[C_EAST][i];
                l->north[i] = t.col[C_NORTH][i];
            } else {
                double la0 = t.col[C_LAT][0], lo0 = t.col[C_LON][0];
                double dlo = remainder(t.col[C_LON][i] - lo0, 2 * SR_PI_);
                l->east[i] = SR_FLIGHTLOG_EARTH_R * cos(la0) * dlo;
                l->north[i] = SR_FLIGHTLOG_EARTH_R * (t.col[C_LAT][i] - la0);
            }
        }
        l->latlon = t.col[C_LAT] != NULL;
    }
    sr_csvtable_free(&t);
    if (rc)
        sr_flightlog_free(l);
    return rc;
}

int sr_flightlog_load(sr_flightlog *l, const char *path, double max_gap, sr_error *err)
{
    memset(l, 0, sizeof *l);
    char *buf;
    size_t len;
    int rc = sr_csvtable_read_file(path, &buf, &len, err);
    if (rc)
        return rc;
    rc = sr_flightlog_parse(l, path, buf ? buf : "", len, max_gap, err);
    free(buf);
    return rc;
}
