/* error.h - the one error struct every fallible sinkrate call fills.
 * A status code (GSL-style, small ints) plus one clear, complete message. */
#ifndef SR_ERROR_H
#define SR_ERROR_H

#include <stddef.h>

/* enum sr_status, sr_error_name and the object's accessors are public:
 * include/sinkrate/base.h */
#include "sinkrate/base.h"

#define SR_ERROR_MSG_MAX 512
#define SR_ERROR_KEY_MAX 48
#define SR_ERROR_FILE_MAX 256

/* The message says it all in words; the fields after it say what the error
 * is about, for a caller to act on without reading the message: the CLI
 * names the option from the key, a file reader points at the key's line.
 * Each field is empty (or 0) when the code that made the error did not know
 * it; sr_error_set clears them, so a field is never left from an older error.
 *   key     the input the error is about, by its name where it was made: a
 *           key of a file as docs/files.md names it ("exponent",
 *           "temperature"), a field of an input struct ("v1", "n_fill"), or
 *           "unit" for a value that lacks its unit
 *   file    the file it is about, line and column its place there (1-based;
 *           the message then starts with "file:line:column: ") */
typedef struct sr_error {
    int code;                      /* enum sr_status */
    char msg[SR_ERROR_MSG_MAX];    /* one line, no trailing newline */
    char key[SR_ERROR_KEY_MAX];
    char file[SR_ERROR_FILE_MAX];
    int line, column;
} sr_error;

/* Fill err (when not NULL) and return code, so callers write
 * `return sr_error_set(err, SR_EINVAL, "...", ...);`. */
int sr_error_set(sr_error *err, int code, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;

/* As sr_error_set, and say which input the error is about (err->key). */
int sr_error_set_key(sr_error *err, int code, const char *key, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 4, 5)))
#endif
    ;

/* As sr_error_set about a place in a file: the message starts with
 * "file:line:column: " (or "file: " when line is 0), and the fields say the
 * same. */
int sr_error_set_at(sr_error *err, int code, const char *file, size_t line, size_t column, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 6, 7)))
#endif
    ;

/* Put an error made without its place into a file: the message gets the
 * prefix "file:line:column: " (or "file: " when line is 0), the fields the
 * place; the key is kept. Returns err->code. */
int sr_error_locate(sr_error *err, const char *file, size_t line, size_t column);

/* Prefix an existing message ("wind row 3: " + old message); the fields are
 * kept. */
int sr_error_prefix(sr_error *err, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

void sr_error_clear(sr_error *err);

/* GSL's default error handler aborts the process; the library checks every
 * GSL status itself and reports it in an sr_error, so the handler goes off
 * the first time a program makes one of its handles (once per process, safe
 * from any thread; the CLI does it in sr_cli_run). */
void sr_error_gsl_off(void);

/* Keep a message on one printable line: a tab becomes a space, any other
 * control byte (a newline or terminal escape quoted from the input) a '?'. */
void sr_error_printable(char *s);

#endif
