/* fileio.c - atomic file output (mkstemp + rename) and bounded reads. */
#define _DEFAULT_SOURCE
#include "fileio.h"

#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

/* A device or pipe (/dev/null, /dev/stdout, a FIFO) is written in place:
 * a temporary file renamed over it would replace the device itself. */
static int write_direct(const char *path, const void *data, size_t len, sr_error *err)
{
    FILE *f = fopen(path, "wb");
    if (!f)
        return sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(errno));
    size_t w = fwrite(data, 1, len, f);
    int bad = w != len || ferror(f);
    if (fclose(f) != 0 || bad)
        return sr_error_set(err, SR_EIO, "%s: write failed: %s", path, strerror(errno));
    return SR_OK;
}

int sr_file_write_atomic(const char *path, const void *data, size_t len, sr_error *err)
{
    if (!path || !*path)
        return sr_error_set(err, SR_EINVAL, "empty output file name");
    size_t pl = strlen(path);
    if (path[pl - 1] == '/')
        return sr_error_set(err, SR_EINVAL, "%s: is a directory name, not a file", path);
    struct stat st;
    if (stat(path, &st) == 0 && S_ISDIR(st.st_mode))
        return sr_error_set(err, SR_EIO, "%s: is a directory", path);
    if (stat(path, &st) == 0 && !S_ISREG(st.st_mode))
        return write_direct(path, data, len, err);
    char *tmp = malloc(pl + 16);
    if (!tmp)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    snprintf(tmp, pl + 16, "%s.tmp.XXXXXX", path);
    int fd = mkstemp(tmp);
    if (fd < 0) {
        int e = errno;
        free(tmp);
        return sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(e));
    }
    const char *p = data;
    size_t left = len;
    while (left > 0) {
        ssize_t w = write(fd, p, left);
        if (w < 0) {
            if (errno == EINTR)
                continue;
            int e = errno;
            close(fd);
            unlink(tmp);
            free(tmp);
            return sr_error_set(err, SR_EIO, "%s: write failed: %s", path, strerror(e));
        }
        p += w;
        left -= (size_t)w;
    }
    /* files we write are for people and tools to read: the usual 0644 under umask */
    mode_t um = umask(0);
    umask(um);
    if (fchmod(fd, 0666 & ~um) != 0 || close(fd) != 0) {
        int e = errno;
        unlink(tmp);
        free(tmp);
        return sr_error_set(err, SR_EIO, "%s: cannot finish writing: %s", path, strerror(e));
    }
    if (rename(tmp, path) != 0) {
        int e = errno;
        unlink(tmp);
        free(tmp);
        return sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(e));
    }
    free(tmp);
    return SR_OK;
}

int sr_file_read(const char *path, size_t max, char **data, size_t *len, sr_error *err)
{
    *data = NULL;
    *len = 0;
    FILE *f = fopen(path, "rb");
    if (!f)
        return sr_error_set(err, SR_EIO, "%s: cannot open: %s", path, strerror(errno));
    char *buf = malloc(max + 1);
    if (!buf) {
        fclose(f);
        return sr_error_set(err, SR_ENOMEM, "%s: out of memory", path);
    }
    size_t n = fread(buf, 1, max + 1, f);
    int bad = ferror(f);
    fclose(f);
    if (bad) {
        free(buf);
        return sr_error_set(err, SR_EIO, "%s: read error (is it a directory?)", path);
    }
    if (n > max) {
        free(buf);
        return sr_error_set(err, SR_EINVAL, "%s: larger than %zu bytes", path, max);
    }
    buf[n] = '\0';
    *data = buf;
    *len = n;
    return SR_OK;
}
