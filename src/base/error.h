/* error.h - the one error struct every fallible sinkrate call fills.
 * A status code (GSL-style, small ints) plus one clear, complete message. */
#ifndef SR_ERROR_H
#define SR_ERROR_H

#include <stddef.h>

/* enum sr_status, sr_error_name and the object's accessors are public:
 * include/sinkrate/base.h */
#include "sinkrate/base.h"

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

#endif
