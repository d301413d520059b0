/* fuzz_dragcurve.c - drag curves Cd(Re) written as YAML (points: [[Re, Cd],
 * ...]), through sr_dragtable_load with both interpolations, then a body
 * built on the curve and its equilibrium speeds found in standard air. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "physics/atmos.h"
#include "physics/bluff.h"
#include "fuzz.h"
#include "files/dragtable.h"

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    return 0;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    const char *path = fuzz_file("curve.yaml", data, size);
    sr_error e;
    sr_atmos std;
    sr_atmos_init_standard(&std);
    sr_air air;
    if (sr_atmos_at(&std, 0.0, &air, &e) != SR_OK)
        abort();
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
        sr_bluff_body b;
        sr_bluff_equilibria eq;
        if (sr_bluff_body_init(&b, SR_BLUFF_TABLE, &c, 0.1, 0.0, 0.5, 0.0, &e) == SR_OK &&
            sr_bluff_equilibria_find(&b, &air, &eq, &e) == SR_OK) {
            FUZZ_ASSERT(eq.n <= SR_BLUFF_MAX_ROOTS);
            for (size_t i = 0; i < eq.n; i++) {
                FUZZ_ASSERT(isfinite(eq.root[i].v) && eq.root[i].v > 0);
                FUZZ_ASSERT(i == 0 || eq.root[i].v >= eq.root[i - 1].v); /* in increasing speed */
            }
        }
        sr_bluff_curve_free(&c);
    }
    return 0;
}
