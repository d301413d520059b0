/* fuzz_family.c - canopy family files (canopies/<id>.yaml): YAML loading
 * through yamldoc, the strict family schema, then canopies built from the
 * family that loaded. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "physics/canopy.h"
#include "files/catalog.h"
#include "fuzz.h"
#include "files/yamldoc.h"

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    return 0;
}

static void band_ok(sr_band b)
{
    FUZZ_ASSERT(isfinite(b.lo) && isfinite(b.typ) && isfinite(b.hi));
    FUZZ_ASSERT(b.lo <= b.typ && b.typ <= b.hi);
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    sr_yaml y;
    sr_error e;
    if (sr_yaml_load_string(&y, "family.yaml", (const char *)data, size, &e) != SR_OK) {
        FUZZ_MSG_OK(e.msg);
        return 0;
    }
    sr_family f;
    int rc = sr_catalog_parse_family(&f, &y, &e);
    sr_yaml_free(&y);
    if (rc != SR_OK) {
        FUZZ_MSG_OK(e.msg);
        return 0;
    }
    band_ok(f.cd0.v);
    band_ok(f.dp_d0);
    band_ok(f.dc_d0);
    band_ok(f.cx);
    band_ok(f.oscillation);
    FUZZ_ASSERT(f.cd0.v.lo > 0);
    /* every size kind and a measured coefficient on every reference */
    static const double SIZES[] = {0.3, 1.0, 7.5};
    for (int k = SR_SIZE_NOMINAL_DIAMETER; k <= SR_SIZE_NOMINAL_AREA; k++)
        for (size_t i = 0; i < sizeof SIZES / sizeof SIZES[0]; i++) {
            sr_canopy c;
            if (sr_canopy_from_size(&c, &f, (sr_size_kind)k, SIZES[i], &e) != SR_OK)
                continue;
            band_ok(c.s0);
            band_ok(c.cds);
            FUZZ_ASSERT(c.s0.lo > 0);
            for (int r = SR_REF_NOMINAL; r <= SR_REF_CONSTRUCTED; r++) {
                sr_canopy m = c;
                if (sr_canopy_set_measured_cd(&m, 0.8, (sr_ref)r, "fuzz", &e) == SR_OK)
                    band_ok(m.cds);
                FUZZ_ASSERT(isfinite(sr_canopy_cd_on(&f, f.cd0.v.typ, (sr_ref)r)));
            }
        }
    return 0;
}
