/* error.c - filling and prefixing the error struct. */
#include "base/error.h"

#include <limits.h>
#include <gsl/gsl_errno.h>
#include <pthread.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

void sr_error_printable(char *s)
{
    for (unsigned char *p = (unsigned char *)s; *p; p++)
        if (*p == '\t')
            *p = ' ';
        else if (*p < 0x20 || *p == 0x7f)
            *p = '?';
}

static void fields_clear(sr_error *err)
{
    err->key[0] = '\0';
    err->file[0] = '\0';
    err->line = err->column = 0;
}

static void set_place(sr_error *err, const char *file, size_t line, size_t column)
{
    snprintf(err->file, sizeof err->file, "%s", file ? file : "");
    err->line = line > INT_MAX ? INT_MAX : (int)line;
    err->column = line == 0 ? 0 : column > INT_MAX ? INT_MAX : (int)column;
}

int sr_error_set(sr_error *err, int code, const char *fmt, ...)
{
    if (err) {
        va_list ap;
        va_start(ap, fmt);
        vsnprintf(err->msg, sizeof err->msg, fmt, ap);
        va_end(ap);
        sr_error_printable(err->msg);
        err->code = code;
        fields_clear(err);
    }
    return code;
}

int sr_error_set_key(sr_error *err, int code, const char *key, const char *fmt, ...)
{
    if (err) {
        va_list ap;
        va_start(ap, fmt);
        vsnprintf(err->msg, sizeof err->msg, fmt, ap);
        va_end(ap);
        sr_error_printable(err->msg);
        err->code = code;
        fields_clear(err);
        snprintf(err->key, sizeof err->key, "%s", key ? key : "");
    }
    return code;
}

int sr_error_set_at(sr_error *err, int code, const char *file, size_t line, size_t column, const char *fmt, ...)
{
    if (err) {
        char text[SR_ERROR_MSG_MAX];
        va_list ap;
        va_start(ap, fmt);
        vsnprintf(text, sizeof text, fmt, ap);
        va_end(ap);
        if (line)
            snprintf(err->msg, sizeof err->msg, "%s:%zu:%zu: %s", file ? file : "", line, column, text);
        else
            snprintf(err->msg, sizeof err->msg, "%s: %s", file ? file : "", text);
        sr_error_printable(err->msg);
        err->code = code;
        fields_clear(err);
        set_place(err, file, line, column);
    }
    return code;
}

int sr_error_locate(sr_error *err, const char *file, size_t line, size_t column)
{
    if (!err)
        return SR_EINVAL;
    if (line)
        sr_error_prefix(err, "%s:%zu:%zu: ", file ? file : "", line, column);
    else
        sr_error_prefix(err, "%s: ", file ? file : "");
    set_place(err, file, line, column);
    return err->code;
}

int sr_error_prefix(sr_error *err, const char *fmt, ...)
{
    if (!err)
        return SR_EINVAL;
    char head[SR_ERROR_MSG_MAX], old[SR_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(head, sizeof head, fmt, ap);
    va_end(ap);
    memcpy(old, err->msg, sizeof old);
    snprintf(err->msg, sizeof err->msg, "%s%s", head, old);
    sr_error_printable(err->msg);
    return err->code;
}

void sr_error_clear(sr_error *err)
{
    if (err) {
        err->code = SR_OK;
        err->msg[0] = '\0';
        fields_clear(err);
    }
}

const char *sr_error_name(int code)
{
    switch (code) {
    case SR_OK: return "ok";
    case SR_EINVAL: return "invalid input";
    case SR_EDOMAIN: return "outside the model's range";
    case SR_EIMPOSSIBLE: return "no solution";
    case SR_ENOMEM: return "out of memory";
    case SR_EIO: return "input/output error";
    case SR_ENUMERIC: return "numerical failure";
    default: return "unknown error";
    }
}

/* ---- the error object of a program (include/sinkrate/base.h) ---- */

sr_error *sr_error_new(void)
{
    sr_error *e = malloc(sizeof *e);
    if (e)
        sr_error_clear(e);
    return e;
}

void sr_error_free(sr_error *err)
{
    free(err);
}

int sr_error_code(const sr_error *err)
{
    return err ? err->code : SR_OK;
}

const char *sr_error_message(const sr_error *err)
{
    return err ? err->msg : "";
}

const char *sr_error_key(const sr_error *err)
{
    return err ? err->key : "";
}

const char *sr_error_file(const sr_error *err)
{
    return err ? err->file : "";
}

int sr_error_line(const sr_error *err)
{
    return err ? err->line : 0;
}

int sr_error_column(const sr_error *err)
{
    return err ? err->column : 0;
}

static void gsl_off(void)
{
    gsl_set_error_handler_off();
}

void sr_error_gsl_off(void)
{
    /* pthread_once: the one process-wide setting of the library, made once and race-free */
    static pthread_once_t once = PTHREAD_ONCE_INIT;
    pthread_once(&once, gsl_off);
}
