/* dragtable.h - drag curves Cd(Re) read from files into the bluff model's
 * curves (physics/bluff.h). */
#ifndef SR_DRAGTABLE_H
#define SR_DRAGTABLE_H

#include "base/error.h"
#include "physics/bluff.h"

/* A user curve from a file, errors at file:line:column. CSV: the columns
 * "Re" and "Cd" (no units). YAML (.yaml, .yml): the keys
 *   name: "..."                optional description
 *   source: "..."              optional: where the numbers come from
 *   reference-area: "0.02 m2"  optional: the area the Cd values are based on
 *   points: [[Re, Cd], ...]    required, Re increasing
 * Release with sr_bluff_curve_free. */
int sr_dragtable_load(sr_bluff_curve *c, const char *path, sr_bluff_interp kind, sr_error *err);

#endif
