/* error.h - the one error struct every fallible sinkrate call fills.
 * A status code (GSL-style, small ints) plus one clear, complete message. */
#ifndef SR_ERROR_H
#define SR_ERROR_H

#include <stddef.h>

enum sr_status {
    SR_OK = 0,
    SR_EINVAL = 1,      /* bad input: malformed, wrong unit, unphysical value */
    SR_EDOMAIN = 2,     /* outside a model's range (altitude above 86 km, ...) */
    SR_EIMPOSSIBLE = 3, /* valid request with no answer (no canopy size can reach the target) */
    SR_ENOMEM = 4,
    SR_EIO = 5,         /* cannot open, read or write a file */
    SR_ENUMERIC = 6     /* a solver failed to converge */
};

#define SR_ERROR_MSG_MAX 512

typedef struct sr_error {
    int code;                      /* enum sr_status */
    char msg[SR_ERROR_MSG_MAX];    /* one line, no trailing newline */
} sr_error;

/* Fill err (when not NULL) and return code, so callers write
 * `return sr_error_set(err, SR_EINVAL, "...", ...);`. */
int sr_error_set(sr_error *err, int code, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;

/* Prefix an existing message ("file.yaml:3:7: " + old message). */
int sr_error_prefix(sr_error *err, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

void sr_error_clear(sr_error *err);

/* Keep a message on one printable line: a tab becomes a space, any other
 * control byte (a newline or terminal escape quoted from the input) a '?'. */
void sr_error_printable(char *s);

/* Short name of a status code, e.g. "invalid input". */
const char *sr_error_name(int code);

#endif
