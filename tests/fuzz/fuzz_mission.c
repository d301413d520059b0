/* fuzz_mission.c - mission files: the whole schema against the real catalog.
 * Relative file names inside (sounding, canopy files) resolve next to
 * tests/fuzz/files/mission.yaml, where a valid sounding and canopy file wait,
 * so the fuzzer reaches those readers too. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "physics/atmos.h"
#include "files/catalog.h"
#include "physics/descent.h"
#include "fuzz.h"
#include "files/mission.h"
#include "files/yamldoc.h"

static sr_catalog *cat;
static sr_mission *mis;

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    sr_error e;
    cat = malloc(sizeof *cat);
    mis = malloc(sizeof *mis);
    if (!cat || !mis || sr_catalog_open(cat, SR_SOURCE_ROOT "/canopies", &e) != SR_OK) {
        fprintf(stderr, "fuzz_mission: cannot load the catalog\n");
        abort();
    }
    return 0;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    sr_yaml y;
    sr_error e;
    if (sr_yaml_load_string(&y, "mission.yaml", (const char *)data, size, &e) != SR_OK) {
        FUZZ_MSG_OK(e.msg);
        return 0;
    }
    /* as sr_mission_load prepares it */
    memset(mis, 0, sizeof *mis);
    sr_atmos_init_standard(&mis->atmos);
    mis->limit_speed = mis->limit_energy = mis->limit_time = mis->limit_drift = NAN;
    snprintf(mis->path, sizeof mis->path, "%s", SR_SOURCE_ROOT "/tests/fuzz/files/mission.yaml");
    int rc = sr_mission_parse(mis, &y, cat, &e);
    sr_yaml_free(&y);
    if (rc != SR_OK) {
        FUZZ_MSG_OK(e.msg);
        sr_mission_release(mis);
        return 0;
    }
    FUZZ_ASSERT(mis->nsections >= 1 && mis->nstages >= 1);
    double mass = sr_mission_total_mass(mis);
    FUZZ_ASSERT(isfinite(mass) && mass > 0);
    sr_air air;
    if (sr_atmos_at(&mis->atmos, mis->ground, &air, &e) == SR_OK) {
        FUZZ_ASSERT(isfinite(air.rho) && air.rho > 0);
        for (size_t i = 0; i < mis->nstages; i++) {
            sr_band v;
            if (mis->stages[i].has_size && sr_descent_rate(&mis->stages[i].canopy, mass, 0.0, &air, &v, &e) == SR_OK)
                FUZZ_ASSERT(isfinite(v.typ) && v.typ > 0);
        }
    }
    if (mis->has_start) {
        sr_air top;
        (void)sr_atmos_at(&mis->atmos, mis->ground + mis->start_height, &top, &e);
    }
    sr_mission_release(mis);
    return 0;
}
