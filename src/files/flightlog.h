/* flightlog.h - flight logs from an altimeter: a CSV table (csvtable) with a
 * header naming each column and its unit: time, one of height / altitude /
 * pressure, optional acceleration and positions. Checked row by row; every
 * problem names file:line:column. */
#ifndef SR_FLIGHTLOG_H
#define SR_FLIGHTLOG_H

#include <stddef.h>

#include "base/error.h"

/* What the vertical column holds. */
typedef enum sr_log_vertical {
    SR_LOG_HEIGHT = 0,   /* `height`: above the ground (the launch or drop site), m */
    SR_LOG_ALTITUDE,     /* `altitude`: above mean sea level, m */
    SR_LOG_PRESSURE      /* `pressure`: static pressure, Pa */
} sr_log_vertical;

const char *sr_log_vertical_name(sr_log_vertical v); /* "height", "altitude", "pressure" */

/* Plausible static pressure of a log, Pa: below 1 kPa (above about 31 km) or
 * above 110 kPa is taken for a wrong unit in the header (Pa for hPa). */
#define SR_FLIGHTLOG_P_MIN 1000.0
#define SR_FLIGHTLOG_P_MAX 110000.0
/* Fewest rows a log can be fitted from. */
#define SR_FLIGHTLOG_MIN_ROWS 20
/* Mean Earth radius for positions given as latitude and longitude, m (IUGG
 * mean radius R1, Moritz 1980, Geodetic Reference System 1980). */
#define SR_FLIGHTLOG_EARTH_R 6371008.8

/* Caller-owned; release with sr_flightlog_free. Arrays hold n values. */
typedef struct sr_flightlog {
    char path[512];
    size_t n;
    double *t;                /* s, strictly increasing */
    double *v;                /* the vertical column in SI (m or Pa) */
    sr_log_vertical vertical;
    double *acc;              /* specific force along the vehicle axis, m/s2; NULL when absent */
    double *east, *north;     /* m; NULL when absent. From latitude/longitude: on the plane tangent at the
                               * first row (equirectangular, exact to 1e-4 over a few km) */
    int latlon;               /* positions were given as latitude/longitude */
    size_t *line;             /* source line of each row */
    size_t header_line;       /* source line of the header */
    size_t field_t, field_v, field_acc; /* 0-based fields of those columns, for messages */
    double step;              /* median time step, s */
    char *text;               /* the file's text, kept for the positions in later messages */
    size_t text_len;
} sr_flightlog;

/* Read and check a log. max_gap (s): the longest step between rows accepted
 * (a short dropout of rows); <= 0 takes max(1 s, 10 median steps). Errors:
 * unknown or duplicate columns, missing units, empty or non-numeric cells
 * (the table reader); no vertical column or more than one; times that repeat,
 * go back or leave a gap; a pressure outside SR_FLIGHTLOG_P_MIN..MAX; a height
 * outside the atmosphere's range; positions given half. */
int sr_flightlog_load(sr_flightlog *l, const char *path, double max_gap, sr_error *err);
/* The same from memory; `name` is used in messages. */
int sr_flightlog_parse(sr_flightlog *l, const char *name, const char *buf, size_t len, double max_gap,
                       sr_error *err);
void sr_flightlog_free(sr_flightlog *l);

/* "file:line:column" of row i's cell in field f (for messages of later checks). */
void sr_flightlog_where(const sr_flightlog *l, size_t i, size_t f, char *buf, size_t len);

#endif
