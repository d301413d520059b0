/* sinkrate/base.h - the conventions of libsinkrate every other header follows:
 * the export macro, the version, status codes, the error object, and the
 * low / typical / high band every banded result is given as.
 *
 * Conventions (the reference for the whole API):
 *
 * Names. Every name the library exports starts with sr_ (macros SR_). Names
 * not declared under include/ are private: they may change in any release.
 *
 * Units. SI inside and out: kg, m, s, m/s, Pa, K, N, J, rad. Heights "above
 * ground" and altitudes "above sea level" are said where they differ. Parse
 * and show other units with the units functions (sinkrate/physics.h).
 *
 * Errors. Every fallible function returns an int: SR_OK (0) or one of
 * enum sr_status, and fills the error object `err` when it is not NULL: one
 * printable line (sr_error_message) and, where the code that failed knew it,
 * what the error is about (sr_error_key, sr_error_file, sr_error_line,
 * sr_error_column), so a caller never has to parse the message. On failure,
 * an output handle is set to NULL and nothing needs to be freed. Functions
 * that cannot fail return their value directly.
 *
 * Ownership. A handle (an opaque struct pointer) comes from a *_new*,
 * *_open or *_dup function and goes back with the matching *_free, which
 * accepts NULL. Pointers returned by accessors (names, records, views) belong
 * to the handle they came from and stay valid until it is freed. A function
 * that takes a handle keeps no reference to it after it returns, unless its
 * comment says so. Records (structs of plain numbers the library hands out as
 * const pointers: sr_profile_body, sr_judge_row, sr_loads_band, ...) may gain
 * fields at their end in a later release: read them through the pointer, never
 * declare or copy one yourself. Value structs (sr_band, sr_air) are fixed.
 *
 * Threads. The library keeps no mutable global state, never prints and never
 * exits. A handle may be read by any number of threads at once; a function
 * that changes a handle (*_set_*, *_add) needs it to itself. Running a
 * profile or band context from several threads is the intended use (one
 * workspace or result per thread). The dispersion run uses OpenMP threads of
 * its own. One process-wide setting: the first atmosphere, wind, catalog,
 * mission or falling body a program makes turns GSL's error handler off
 * (once, safely from any thread), because GSL's default handler would abort
 * the program on a numerical failure that the library reports as an error;
 * a program that wants a handler for its own GSL calls sets one after.
 *
 * Caution. Every output of results made with this library carries the
 * caution of sr_caution() (sinkrate/output.h): nothing here is for
 * parachutes that carry people. */
#ifndef SINKRATE_BASE_H
#define SINKRATE_BASE_H

#include <stddef.h>

#ifdef __cplusplus
extern "C" {
#endif

#if defined(__GNUC__) || defined(__clang__)
#define SR_API __attribute__((visibility("default")))
#else
#define SR_API
#endif

/* The release this header belongs to; sr_version() gives the library's. */
#define SR_VERSION_STRING "0.1.0"
SR_API const char *sr_version(void);

/* Status codes (small ints, 0 = success). */
enum sr_status {
    SR_OK = 0,
    SR_EINVAL = 1,      /* bad input: malformed, wrong unit, unphysical value */
    SR_EDOMAIN = 2,     /* outside a model's range (altitude above 86 km, ...) */
    SR_EIMPOSSIBLE = 3, /* valid request with no answer (no canopy size can reach the target) */
    SR_ENOMEM = 4,
    SR_EIO = 5,         /* cannot open, read or write a file */
    SR_ENUMERIC = 6     /* a solver failed to converge */
};

/* Short name of a status code, e.g. "invalid input". */
SR_API const char *sr_error_name(int code);

/* The error object: allocate one (sr_error_new), pass it to any number of
 * calls; each failing call overwrites it, a succeeding call leaves it alone. */
typedef struct sr_error sr_error;

SR_API sr_error *sr_error_new(void); /* NULL when out of memory */
SR_API void sr_error_free(sr_error *err);
SR_API int sr_error_code(const sr_error *err);          /* enum sr_status of the last failure, SR_OK if none */
SR_API const char *sr_error_message(const sr_error *err); /* one line, "" if none */
/* What the error is about, for a program to act on without reading the
 * message; each is "" (or 0) when the code that failed did not know it. The
 * key: the input refused, by the name a file gives it ("exponent",
 * "temperature", as docs/files.md names the keys), or the parameter of the
 * function ("v1", "mass"), or "unit" for a value without its unit. The
 * file, and the line and column there (1-based; the message then starts with
 * "file:line:column: "). */
SR_API const char *sr_error_key(const sr_error *err);
SR_API const char *sr_error_file(const sr_error *err);
SR_API int sr_error_line(const sr_error *err);
SR_API int sr_error_column(const sr_error *err);

/* A range: low, typical, high, always ordered lo <= typ <= hi. */
typedef struct sr_band {
    double lo, typ, hi;
} sr_band;

#ifdef __cplusplus
}
#endif

#endif
