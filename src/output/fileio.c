/* fileio.c - one file written atomically (a transaction of one output). */
#define _DEFAULT_SOURCE
#include "output/fileio.h"

#include "output/txn.h"

#include <errno.h>
#include <fcntl.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

int sr_file_write_atomic(const char *path, const void *data, size_t len, sr_error *err)
{
    sr_txn *t = sr_txn_new();
    if (!t)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_txn_reserve(t, NULL, path, 0, err);
    if (!rc)
        rc = sr_txn_write(t, path, data, len, err);
    if (!rc)
        rc = sr_txn_commit(t, err);
    sr_txn_free(t);
    return rc;
}
