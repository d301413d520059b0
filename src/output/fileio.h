/* fileio.h - one file written atomically (a transaction of one output,
 * output/txn.h) and bounded reads with plain errors. */
#ifndef SR_FILEIO_H
#define SR_FILEIO_H

#include <stddef.h>
#include <stdio.h>

#include "base/error.h"

/* One file written through a temporary next to it, fsync and rename (an
 * output transaction of one file, output/txn.h): a failed write leaves the
 * old file as it was. Through a symbolic link the file it names is replaced
 * and the link kept; a device or a pipe is written in place. */
int sr_file_write_atomic(const char *path, const void *data, size_t len, sr_error *err);

/* fopen(path, "rb") with the two errors users meet named plainly: the file
 * does not open (with the system's reason), or it is a directory. */
int sr_file_open_read(const char *path, FILE **f, sr_error *err);

/* Read a whole file (at most max bytes) into a malloc'd NUL-terminated buffer. */
int sr_file_read(const char *path, size_t max, char **data, size_t *len, sr_error *err);

#endif
