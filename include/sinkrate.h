/* sinkrate.h - libsinkrate, the library behind the sinkrate tool: parachute
 * recovery systems for payloads sized and checked over the 1976 standard
 * atmosphere, staged descents, opening loads, free fall and landing
 * dispersion. Include this one header and link with
 * `pkg-config --cflags --libs sinkrate`.
 *
 *   sinkrate/base.h      conventions (errors, ownership, threads), version, sr_band
 *   sinkrate/physics.h   units, atmosphere, wind, canopies, descent, opening, free fall, profile results
 *   sinkrate/files.h     the canopy catalog, canopy files, missions, sounding and wind tables
 *   sinkrate/analysis.h  sizing, opening loads, band runs, the judge, failure cases, dispersion
 *   sinkrate/output.h    the caution every output carries
 *
 * CAUTION: preliminary engineering estimates only. Not for designing,
 * selecting or certifying parachutes that carry people (sr_caution()). */
#ifndef SINKRATE_H
#define SINKRATE_H

#include "sinkrate/base.h"
#include "sinkrate/physics.h"
#include "sinkrate/files.h"
#include "sinkrate/analysis.h"
#include "sinkrate/output.h"

#endif
