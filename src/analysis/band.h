/* band.h - the band runs of a mission: its staged descent at the typical
 * value of every banded input and at the two ends of the bands (the fast end:
 * every canopy at the low end of its drag range and every banded mass at its
 * heavy end; the slow end: high drag, light masses), and the opening load of
 * every deployment over its bands (loads.h). `profile`, `loads --mission`, the
 * failure cases and the design search all run these, so they cannot disagree.
 *
 * Use: build a context once per mission (sr_band_ctx_new), a workspace per
 * thread (sr_band_work_new); sr_band_run fills a caller-owned result. In the
 * fast mode a run allocates nothing. The context is read-only after it is
 * built and may be shared by threads. Nothing here prints. */
#ifndef SR_BAND_H
#define SR_BAND_H

#include "analysis/loads.h"
#include "base/error.h"
#include "files/mission.h"
#include "physics/profile.h"
#include "sinkrate/analysis.h"

/* SR_BAND_TYPICAL, SR_BAND_FAST (low drag of every canopy, heavy end of
 * every mass band), SR_BAND_SLOW (high drag, light end), SR_BAND_NRUNS and
 * the functions of a program's handles are public:
 * include/sinkrate/analysis.h. */

typedef struct sr_band_result {
    sr_profile_result run[SR_BAND_NRUNS];  /* indexed by SR_BAND_* */
    size_t nstages;
    sr_loads_band loads[SR_MISSION_MAX_STAGES]; /* opening load of each stage over its bands */
} sr_band_result;

/* sr_band_ctx_new (public) builds one profile context with the options po
 * (NULL for the defaults: failure case, attitude, tolerances). */

/* The profile context inside (for air and wind look-ups, plots). */
const sr_profile_ctx *sr_band_profile(const sr_band_ctx *bc);

/* The band factors of stage k's drag area and section i's mass at the fast and
 * slow ends (1 when not banded). */
double sr_band_drag_factor(const sr_band_ctx *bc, size_t k, int end);
double sr_band_mass_factor(const sr_band_ctx *bc, size_t i, int end);

/* The loads canopy of stage k (its bands as the opening loads use them). */
const sr_loads_canopy *sr_band_loads_canopy(const sr_band_ctx *bc, size_t k);

int sr_band_work_new(sr_band_work **w, sr_error *err);
void sr_band_work_free(sr_band_work *w);

/* sr_band_run (public): design holds changes of this candidate against the
 * mission (sizes by area_scale, deployment heights, a sample's draws...),
 * NULL for none; the band factors multiply its drag and mass scales. mode:
 * SR_PROFILE_FULL (ODE transients, adaptive opening solver) or
 * SR_PROFILE_FAST (tables, reused transients, the fast opening solver). w: a
 * workspace (NULL allocates one for the call). track: points of the typical
 * run for plots (NULL: none). */

/* The same with points for plots and maps of each run (tracks[SR_BAND_*],
 * NULL entries: none). */
int sr_band_run_tracked(const sr_band_ctx *bc, const sr_profile_perturb *design, sr_profile_mode mode,
                        sr_band_work *w, sr_band_result *r, sr_profile_track *const tracks[SR_BAND_NRUNS],
                        sr_error *err);

/* The two halves of sr_band_run: the three descents only (every stage's
 * loads marked not valid, so the judge leaves the opening loads out), and
 * then the opening loads from those descents. A search that needs only the
 * landing to decide runs the first alone. With a workspace, loads whose
 * states at line stretch are bit for bit those of the workspace's last run of
 * the same context are taken from it, not solved again (the same numbers). */
int sr_band_descents(const sr_band_ctx *bc, const sr_profile_perturb *design, sr_profile_mode mode,
                     sr_band_work *w, sr_band_result *r, sr_profile_track *const tracks[SR_BAND_NRUNS], sr_error *err);
int sr_band_loads(const sr_band_ctx *bc, sr_profile_mode mode, sr_band_work *w, sr_band_result *r, sr_error *err);

/* The state at line stretch of stage k in one run of a profile context (for
 * sr_loads_evaluate); valid = 0 when it did not deploy. The drag area is the
 * run's own (a band-end run's includes its band factor). */
void sr_band_state(const sr_profile_ctx *ctx, const sr_profile_result *run, size_t k, sr_loads_state *s);

#endif
