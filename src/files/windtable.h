/* windtable.h - the wind as a table read from a file into the wind model
 * (physics/wind.h). */
#ifndef SR_WINDTABLE_H
#define SR_WINDTABLE_H

#include "base/error.h"
#include "physics/wind.h"

/* A wind table from CSV: columns `height` (above ground) or `altitude`
 * (above sea level, converted with `ground`, the site elevation), `speed`
 * and `from`, each with its unit in the header ("height [m],speed
 * [m/s],from [deg]"). Errors carry file:line:column. */
int sr_windtable_load(sr_wind *w, const char *path, double ground, sr_error *err);
/* The table from the optional wind-speed and wind-from columns of a
 * sounding CSV (altitude above sea level); an error when it has no wind. */
int sr_windtable_load_sounding(sr_wind *w, const char *path, double ground, sr_error *err);

#endif
