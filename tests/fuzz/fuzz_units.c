/* fuzz_units.c - the quantity parser for every quantity, bare and with a
 * required unit, and the formatting of whatever it accepts. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "fuzz.h"
#include "output/report.h"
#include "physics/units.h"

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    return 0;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size > 4096)
        return 0;
    char *s = malloc(size + 1);
    if (!s)
        return 0;
    memcpy(s, data, size);
    s[size] = '\0';
    for (int q = SR_Q_NONE; q < SR_Q_COUNT_; q++) {
        double v = NAN, w = NAN;
        sr_error e, f;
        int rc = sr_units_parse(s, (sr_quantity)q, &v, &e);
        int rs = sr_units_parse_strict(s, (sr_quantity)q, &w, &f);
        if (rc != SR_OK) {
            FUZZ_MSG_OK(e.msg);
            FUZZ_ASSERT(rs != SR_OK); /* strict accepts a subset */
            continue;
        }
        FUZZ_ASSERT(isfinite(v));
        if (q == SR_Q_TEMP)
            FUZZ_ASSERT(v >= 0.0);
        if (rs == SR_OK)
            FUZZ_ASSERT(w == v);
        for (int sys = SR_UNITS_SI; sys <= SR_UNITS_US; sys++) {
            char buf[128];
            sr_report_format_value(buf, sizeof buf, v, (sr_quantity)q, (sr_unit_system)sys, 4);
            sr_report_format_value(buf, sizeof buf, v, (sr_quantity)q, (sr_unit_system)sys, SR_FIXED(2));
            FUZZ_ASSERT(buf[0] != '\0');
            double back = sr_units_from_si(v, (sr_quantity)q, (sr_unit_system)sys);
            (void)back; /* may overflow to inf for 1e308 m in ft: formatting copes */
        }
    }
    free(s);
    return 0;
}
