/* sinkrate/output.h - what every output of results must carry. */
#ifndef SINKRATE_OUTPUT_H
#define SINKRATE_OUTPUT_H

#include "sinkrate/base.h"

#ifdef __cplusplus
extern "C" {
#endif

/* The caution: preliminary engineering estimates only, not for parachutes
 * that carry people. A program that shows, prints or writes results of this
 * library shows this text with them (at the top of a page, a comment line of
 * a table, a field of a JSON document, on a figure). */
SR_API const char *sr_caution(void);

#ifdef __cplusplus
}
#endif

#endif
