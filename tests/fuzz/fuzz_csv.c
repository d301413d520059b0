/* fuzz_csv.c - the CSV table reader under the three shapes the tool reads:
 * a sounding (altitude, temperature, pressure, optional wind), a wind table
 * and a drag table (Reynolds number, drag coefficient); a sounding that
 * parses is then built and evaluated. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "atmos.h"
#include "csvtable.h"
#include "fuzz.h"

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    return 0;
}

/* as src/atmos.c reads a sounding */
static const sr_csv_column SOUNDING[] = {
    {"altitude", SR_Q_LENGTH, 1},  {"temperature", SR_Q_TEMP, 1}, {"pressure", SR_Q_PRESSURE, 1},
    {"wind-speed", SR_Q_SPEED, 0}, {"wind-from", SR_Q_ANGLE, 0},
};
/* wind-table and drag-table shapes */
static const sr_csv_column WIND[] = {
    {"altitude", SR_Q_LENGTH, 1},
    {"wind-speed", SR_Q_SPEED, 1},
    {"wind-from", SR_Q_ANGLE, 1},
};
static const sr_csv_column DRAG[] = {
    {"reynolds", SR_Q_NONE, 1},
    {"drag-coefficient", SR_Q_NONE, 1},
};

static void table_ok(const sr_csvtable *t, size_t nspecs)
{
    FUZZ_ASSERT(t->nrows >= 1 && t->ncols == nspecs && t->row_line);
    for (size_t j = 0; j < nspecs; j++)
        if (t->col[j])
            for (size_t i = 0; i < t->nrows; i++)
                FUZZ_ASSERT(isfinite(t->col[j][i]));
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    const char *buf = (const char *)data;
    sr_csvtable t;
    sr_error e;
    if (sr_csvtable_parse(&t, "sounding.csv", buf, size, SOUNDING, 5, &e) == SR_OK) {
        table_ok(&t, 5);
        sr_atmos m;
        if (sr_atmos_init_sounding(&m, t.col[0], t.col[1], t.col[2], t.nrows, &e) == SR_OK) {
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
            sr_atmos_free(&m);
        } else {
            FUZZ_MSG_OK(e.msg);
        }
        sr_csvtable_free(&t);
    } else {
        FUZZ_MSG_OK(e.msg);
    }
    if (sr_csvtable_parse(&t, "wind.csv", buf, size, WIND, 3, &e) == SR_OK) {
        table_ok(&t, 3);
        if (sr_csvtable_require_increasing(&t, 0, "wind.csv", "altitude", &e) != SR_OK)
            FUZZ_MSG_OK(e.msg);
        sr_csvtable_free(&t);
    } else {
        FUZZ_MSG_OK(e.msg);
    }
    if (sr_csvtable_parse(&t, "drag.csv", buf, size, DRAG, 2, &e) == SR_OK) {
        table_ok(&t, 2);
        if (sr_csvtable_require_increasing(&t, 0, "drag.csv", "reynolds", &e) != SR_OK)
            FUZZ_MSG_OK(e.msg);
        sr_csvtable_free(&t);
    } else {
        FUZZ_MSG_OK(e.msg);
    }
    return 0;
}
