/* sounding.c - CSV tables the models take, read into a program's handles
 * (include/sinkrate/files.h): a sounding, a wind table. */
#include <stdlib.h>

#include "physics/atmos.h"
#include "physics/wind.h"
#include "sinkrate/files.h"

int sr_atmos_open_sounding(sr_atmos **out, const char *path, sr_error *err)
{
    *out = NULL;
    sr_atmos *m = malloc(sizeof *m);
    if (!m)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    sr_atmos_init_standard(m);
    int rc = sr_atmos_load_sounding(m, path, err);
    if (rc) {
        sr_atmos_free(m);
        return rc;
    }
    *out = m;
    return SR_OK;
}

int sr_wind_open_table(sr_wind **out, const char *path, double ground, sr_error *err)
{
    *out = NULL;
    sr_wind *w = malloc(sizeof *w);
    if (!w)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    sr_wind_init_calm(w);
    int rc = sr_wind_load_table(w, path, ground, err);
    if (rc) {
        sr_wind_free(w);
        return rc;
    }
    *out = w;
    return SR_OK;
}
