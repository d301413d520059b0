/* fileread.c - bounded reads of input files with plain errors. */
#define _DEFAULT_SOURCE
#include "base/fileread.h"

#include <errno.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

int sr_file_open_read(const char *path, FILE **f, sr_error *err)
{
    *f = fopen(path, "rb");
    if (!*f)
        return sr_error_set_at(err, SR_EIO, path, 0, 0, "cannot open: %s", strerror(errno));
    struct stat st;
    if (fstat(fileno(*f), &st) == 0 && S_ISDIR(st.st_mode)) {
        fclose(*f);
        *f = NULL;
        return sr_error_set_at(err, SR_EIO, path, 0, 0, "is a directory, not a file");
    }
    return SR_OK;
}

int sr_file_read(const char *path, size_t max, char **data, size_t *len, sr_error *err)
{
    *data = NULL;
    *len = 0;
    FILE *f;
    int rc = sr_file_open_read(path, &f, err);
    if (rc)
        return rc;
    char *buf = malloc(max + 1);
    if (!buf) {
        fclose(f);
        return sr_error_set_at(err, SR_ENOMEM, path, 0, 0, "out of memory");
    }
    size_t n = fread(buf, 1, max + 1, f);
    int bad = ferror(f), bad_errno = errno;
    fclose(f);
    if (bad) {
        free(buf);
        return sr_error_set_at(err, SR_EIO, path, 0, 0, "read error: %s", strerror(bad_errno));
    }
    if (n > max) {
        free(buf);
        return sr_error_set_at(err, SR_EINVAL, path, 0, 0, "larger than %zu bytes", max);
    }
    buf[n] = '\0';
    *data = buf;
    *len = n;
    return SR_OK;
}
