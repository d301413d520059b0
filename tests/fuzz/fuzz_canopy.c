/* fuzz_canopy.c - user canopy files (top-level `canopy:`): the schema, the
 * family lookup against the real catalog, sizes on every reference, measured
 * drag, clusters; then the descent rate of what loaded. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "physics/atmos.h"
#include "files/catalog.h"
#include "physics/descent.h"
#include "fuzz.h"
#include "files/yamldoc.h"

static sr_catalog *cat;

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    sr_error e;
    cat = malloc(sizeof *cat);
    if (!cat || sr_catalog_open(cat, SR_SOURCE_ROOT "/canopies", &e) != SR_OK) {
        fprintf(stderr, "fuzz_canopy: cannot load the catalog: %s\n", cat ? e.msg : "out of memory");
        abort();
    }
    return 0;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    sr_yaml y;
    sr_error e;
    if (sr_yaml_load_string(&y, "canopy.yaml", (const char *)data, size, &e) != SR_OK) {
        FUZZ_MSG_OK(e.msg);
        return 0;
    }
    sr_canopy c;
    int rc = sr_catalog_parse_canopy(&c, cat, &y, &e);
    sr_yaml_free(&y);
    if (rc != SR_OK) {
        FUZZ_MSG_OK(e.msg);
        return 0;
    }
    sr_band cds = sr_canopy_total_cds(&c);
    FUZZ_ASSERT(isfinite(cds.lo) && cds.lo > 0 && cds.lo <= cds.typ && cds.typ <= cds.hi && isfinite(cds.hi));
    FUZZ_ASSERT(c.count >= 1 && c.count <= 16);
    sr_atmos atm;
    sr_atmos_init_standard(&atm);
    sr_air air;
    FUZZ_ASSERT(sr_atmos_at(&atm, 0.0, &air, &e) == SR_OK);
    sr_band v;
    if (sr_descent_rate(&c, 2.0, 0.0, &air, &v, &e) == SR_OK)
        FUZZ_ASSERT(isfinite(v.lo) && v.lo > 0 && v.lo <= v.typ && v.typ <= v.hi);
    return 0;
}
