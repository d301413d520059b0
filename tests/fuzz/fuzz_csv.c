/* fuzz_csv.c - the CSV tables the tool reads, through their real loaders:
 * a sounding (sr_sounding_load, sr_windtable_load_sounding), a wind table
 * (sr_windtable_load) and a drag table (sr_dragtable_load, both
 * interpolations); what loads is evaluated across its range. The table
 * reader itself also runs from memory (sr_csvtable_parse). */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "physics/atmos.h"
#include "physics/bluff.h"
#include "files/csvtable.h"
#include "fuzz.h"
#include "physics/wind.h"
#include "files/sounding.h"
#include "files/windtable.h"
#include "files/dragtable.h"

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    return 0;
}

/* as src/physics/atmos.c reads a sounding */
static const sr_csv_column SOUNDING[] = {
    {"altitude", SR_Q_LENGTH, 1},  {"temperature", SR_Q_TEMP, 1}, {"pressure", SR_Q_PRESSURE, 1},
    {"wind-speed", SR_Q_SPEED, 0}, {"wind-from", SR_Q_ANGLE, 0},
};

static void wind_ok(const sr_wind *w)
{
    double top = sr_wind_top(w);
    for (int k = 0; k <= 8; k++) {
        double e, n;
        sr_wind_at(w, isfinite(top) ? top * k / 8.0 : 100.0 * k, &e, &n);
        FUZZ_ASSERT(isfinite(e) && isfinite(n));
    }
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    sr_csvtable t;
    sr_error e;
    if (sr_csvtable_parse(&t, "table.csv", (const char *)data, size, SOUNDING, 5, &e) == SR_OK) {
        FUZZ_ASSERT(t.nrows >= 1 && t.row_line);
        for (size_t j = 0; j < 5; j++)
            for (size_t i = 0; t.col[j] && i < t.nrows; i++)
                FUZZ_ASSERT(isfinite(t.col[j][i]));
        sr_csvtable_free(&t);
    } else {
        FUZZ_MSG_OK(e.msg);
    }

    const char *path = fuzz_file("table.csv", data, size);
    sr_atmos m;
    if (sr_sounding_load(&m, path, &e) == SR_OK) {
        double lo, hi;
        sr_atmos_range(&m, &lo, &hi);
        FUZZ_ASSERT(lo < hi);
        for (int k = 0; k <= 8; k++) {
            sr_air a;
            double z = k == 8 ? hi : lo + (hi - lo) * k / 8.0;
            FUZZ_ASSERT(sr_atmos_at(&m, z, &a, &e) == SR_OK);
            FUZZ_ASSERT(isfinite(a.rho) && a.rho > 0 && isfinite(a.mu) && a.mu > 0);
        }
        sr_air a;
        FUZZ_ASSERT(sr_atmos_at(&m, hi + 1.0, &a, &e) != SR_OK); /* never extrapolated */
        sr_atmos_release(&m);
    } else {
        FUZZ_MSG_OK(e.msg);
    }

    sr_wind w;
    if (sr_windtable_load_sounding(&w, path, 0.0, &e) == SR_OK) {
        wind_ok(&w);
        sr_wind_release(&w);
    } else {
        FUZZ_MSG_OK(e.msg);
    }
    if (sr_windtable_load(&w, path, 100.0, &e) == SR_OK) {
        wind_ok(&w);
        sr_wind_release(&w);
    } else {
        FUZZ_MSG_OK(e.msg);
    }

    for (int kind = SR_BLUFF_LOGLOG; kind <= SR_BLUFF_STEFFEN; kind++) {
        sr_bluff_curve c;
        if (sr_dragtable_load(&c, path, (sr_bluff_interp)kind, &e) != SR_OK) {
            FUZZ_MSG_OK(e.msg);
            continue;
        }
        FUZZ_ASSERT(c.re_min > 0 && c.re_min < c.re_max);
        for (int k = 0; k <= 8; k++) {
            unsigned warn = 0;
            double re = k == 8 ? c.re_max : c.re_min * pow(c.re_max / c.re_min, k / 8.0);
            double cd = sr_bluff_curve_cd(&c, re, &warn);
            FUZZ_ASSERT(isfinite(cd) && cd > 0);
        }
        sr_bluff_curve_free(&c);
    }
    return 0;
}
