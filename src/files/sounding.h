/* sounding.h - a sounding read from a file into the atmosphere model
 * (physics/atmos.h). */
#ifndef SR_SOUNDING_H
#define SR_SOUNDING_H

#include "base/error.h"
#include "physics/atmos.h"

/* A sounding from CSV: a header row naming the columns altitude,
 * temperature, pressure, each with its unit in brackets ("altitude
 * [m],temperature [C],pressure [hPa]"), then rows in increasing altitude.
 * Extra columns (the wind: files/windtable.h) are ignored here. A bad row is
 * named by file:line:column. Release with sr_atmos_release. */
int sr_sounding_load(sr_atmos *m, const char *path, sr_error *err);

#endif
