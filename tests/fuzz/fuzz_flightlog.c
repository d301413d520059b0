/* fuzz_flightlog.c - flight logs as `sinkrate fit` reads them: the reader
 * from memory (sr_flightlog_parse) and, when a log loads, the fit itself in
 * the standard atmosphere with one mass, its result checked for sense. */
#include <gsl/gsl_errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

#include "analysis/fit.h"
#include "files/flightlog.h"
#include "fuzz.h"

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    gsl_set_error_handler_off();
    return 0;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    sr_flightlog log;
    sr_error e;
    if (sr_flightlog_parse(&log, "log.csv", (const char *)data, size, 0, &e) != SR_OK) {
        FUZZ_MSG_OK(e.msg);
        return 0;
    }
    FUZZ_ASSERT(log.n >= SR_FLIGHTLOG_MIN_ROWS && log.t && log.v && log.line);
    for (size_t i = 0; i < log.n; i++) {
        FUZZ_ASSERT(isfinite(log.t[i]) && isfinite(log.v[i]));
        FUZZ_ASSERT(i == 0 || log.t[i] > log.t[i - 1]);
    }
    FUZZ_ASSERT(log.step > 0);
    /* a long log costs a fit per stage: keep the fuzzer's inputs quick */
    if (log.n <= 20000) {
        sr_atmos atm;
        sr_atmos_init_standard(&atm);
        sr_fit_setup s;
        sr_fit_setup_init(&s);
        s.atmos = &atm;
        s.mass = 2.0;
        s.pressure_altitude = (int)(size & 1u);
        sr_fit_result r;
        if (sr_fit_log(&log, &s, &r, &e) == SR_OK) {
            FUZZ_ASSERT(r.nstages >= 1);
            for (size_t k = 0; k < r.nstages; k++) {
                const sr_fit_stage *st = &r.stage[k];
                FUZZ_ASSERT(st->cds_lo > 0 && st->cds_lo <= st->cds && st->cds <= st->cds_hi);
                FUZZ_ASSERT(st->cds_hi / st->cds_lo <= SR_FIT_MAX_CI_RATIO);
                FUZZ_ASSERT(isfinite(st->rms) && st->npoints >= SR_FIT_MIN_POINTS);
            }
            sr_fit_result_free(&r);
        } else {
            FUZZ_MSG_OK(e.msg);
        }
        sr_atmos_release(&atm);
    }
    sr_flightlog_free(&log);
    return 0;
}
