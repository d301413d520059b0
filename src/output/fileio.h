/* fileio.h - writing files atomically: a temporary file in the same
 * directory, then rename, so a failed run never leaves half a file. */
#ifndef SR_FILEIO_H
#define SR_FILEIO_H

#include <stddef.h>
#include <stdio.h>

#include "base/error.h"

int sr_file_write_atomic(const char *path, const void *data, size_t len, sr_error *err);

/* Whether sr_file_write_atomic(path) can succeed, checked before any work so
 * a bad output path fails first and nothing is written: the name is a file
 * name, not a directory, and a file can be created in its directory (a probe
 * file is made and removed). mkdirs != 0: a missing directory is fine when
 * the nearest existing one above it is writable (the writer creates it).
 * Errors read as sr_file_write_atomic's. */
int sr_file_check_writable(const char *path, int mkdirs, sr_error *err);

/* fopen(path, "rb") with the two errors users meet named plainly: the file
 * does not open (with the system's reason), or it is a directory. */
int sr_file_open_read(const char *path, FILE **f, sr_error *err);

/* Read a whole file (at most max bytes) into a malloc'd NUL-terminated buffer. */
int sr_file_read(const char *path, size_t max, char **data, size_t *len, sr_error *err);

#endif
