/* fileio.h - one file written atomically (a transaction of one output,
 * output/txn.h); reads are base/fileread.h's. */
#ifndef SR_FILEIO_H
#define SR_FILEIO_H

#include <stddef.h>
#include <stdio.h>

#include "base/error.h"
#include "base/fileread.h"

/* One file written through a temporary next to it, fsync and rename (an
 * output transaction of one file, output/txn.h): a failed write leaves the
 * old file as it was. Through a symbolic link the file it names is replaced
 * and the link kept; a device or a pipe is written in place. */
int sr_file_write_atomic(const char *path, const void *data, size_t len, sr_error *err);

#endif
