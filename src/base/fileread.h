/* fileread.h - bounded reads of input files with plain errors (the readers'
 * side; writing is the output layer's, output/fileio.h and output/txn.h). */
#ifndef SR_FILEREAD_H
#define SR_FILEREAD_H

#include <stddef.h>
#include <stdio.h>

#include "base/error.h"

/* fopen(path, "rb") with the two errors users meet named plainly: the file
 * does not open (with the system's reason), or it is a directory. */
int sr_file_open_read(const char *path, FILE **f, sr_error *err);

/* Read a whole file (at most max bytes) into a malloc'd NUL-terminated buffer. */
int sr_file_read(const char *path, size_t max, char **data, size_t *len, sr_error *err);

#endif
