/* fileio.c - atomic file output (mkstemp, fsync, rename) and bounded reads. */
#define _DEFAULT_SOURCE
#include "output/fileio.h"

#include <errno.h>
#include <fcntl.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

/* Write all of data to fd; 0 or an errno value. */
static int write_all(int fd, const char *p, size_t left)
{
    while (left > 0) {
        ssize_t w = write(fd, p, left);
        if (w < 0) {
            if (errno == EINTR)
                continue;
            return errno;
        }
        p += w;
        left -= (size_t)w;
    }
    return 0;
}

int sr_file_write_atomic(const char *path, const void *data, size_t len, sr_error *err)
{
    if (!path || !*path)
        return sr_error_set(err, SR_EINVAL, "empty output file name");
    size_t pl = strlen(path);
    if (path[pl - 1] == '/')
        return sr_error_set(err, SR_EINVAL, "%s: is a directory name, not a file", path);
    struct stat st;
    if (stat(path, &st) == 0) {
        if (S_ISDIR(st.st_mode))
            return sr_error_set(err, SR_EIO, "%s: is a directory", path);
        if (!S_ISREG(st.st_mode)) {
            /* a device or a pipe (/dev/stdout, a FIFO) is written to, never replaced */
            int fd = open(path, O_WRONLY);
            int e = fd < 0 ? errno : write_all(fd, data, len);
            if (fd >= 0 && close(fd) != 0 && !e)
                e = errno;
            if (e)
                return sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(e));
            return SR_OK;
        }
    }
    /* through a symbolic link, replace the file it names and keep the link */
    char *real = realpath(path, NULL);
    const char *target = real ? real : path;
    size_t tl = strlen(target);
    char *tmp = malloc(tl + 16);
    if (!tmp) {
        free(real);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    snprintf(tmp, tl + 16, "%s.tmp.XXXXXX", target);
    int fd = mkstemp(tmp);
    if (fd < 0) {
        int e = errno;
        free(tmp);
        free(real);
        return sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(e));
    }
    int e = write_all(fd, data, len);
    if (e) {
        close(fd);
        unlink(tmp);
        free(tmp);
        free(real);
        return sr_error_set(err, SR_EIO, "%s: write failed: %s", path, strerror(e));
    }
    /* files we write are for people and tools to read: the usual 0644 under umask;
     * on disk before the rename, so a crash leaves the old file or the new one */
    mode_t um = umask(0);
    umask(um);
    if (fchmod(fd, 0666 & ~um) != 0 || fsync(fd) != 0)
        e = errno;
    if (close(fd) != 0 && !e)
        e = errno;
    if (e) {
        unlink(tmp);
        free(tmp);
        free(real);
        return sr_error_set(err, SR_EIO, "%s: cannot finish writing: %s", path, strerror(e));
    }
    if (rename(tmp, target) != 0) {
        e = errno;
        unlink(tmp);
        free(tmp);
        free(real);
        return sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(e));
    }
    free(tmp);
    free(real);
    return SR_OK;
}

/* Create and remove a file in dir: the one test that holds for root, for
 * read-only and pseudo file systems alike. */
static int probe_dir(const char *dir)
{
    size_t dl = strlen(dir);
    char *tmp = malloc(dl + 32);
    if (!tmp)
        return ENOMEM;
    snprintf(tmp, dl + 32, "%s/.sinkrate-probe.XXXXXX", dir);
    int fd = mkstemp(tmp), e = fd < 0 ? errno : 0;
    if (fd >= 0) {
        close(fd);
        unlink(tmp);
    }
    free(tmp);
    return e;
}

int sr_file_check_writable(const char *path, int mkdirs, sr_error *err)
{
    if (!path || !*path)
        return sr_error_set(err, SR_EINVAL, "empty output file name");
    size_t pl = strlen(path);
    if (path[pl - 1] == '/')
        return sr_error_set(err, SR_EINVAL, "%s: is a directory name, not a file", path);
    struct stat st;
    if (stat(path, &st) == 0) {
        if (S_ISDIR(st.st_mode))
            return sr_error_set(err, SR_EIO, "%s: is a directory", path);
        if (!S_ISREG(st.st_mode)) /* a device or a pipe is written to, never replaced */
            return access(path, W_OK) == 0 ? SR_OK
                                             : sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(errno));
    }
    /* the directory the temporary goes to: that of the file a link names */
    char *real = realpath(path, NULL);
    char *dir = strdup(real ? real : path);
    free(real);
    if (!dir)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int e = 0;
    for (;;) {
        char *slash = strrchr(dir, '/');
        if (!slash) {
            e = probe_dir(".");
            break;
        }
        if (slash == dir)
            slash[1] = '\0';
        else
            *slash = '\0';
        if (stat(dir, &st) == 0) {
            e = S_ISDIR(st.st_mode) ? probe_dir(dir) : ENOTDIR;
            break;
        }
        if (errno != ENOENT || !mkdirs || slash == dir) {
            e = errno;
            break;
        }
    }
    free(dir);
    if (e)
        return sr_error_set(err, SR_EIO, "%s: cannot write: %s", path, strerror(e));
    return SR_OK;
}

int sr_file_open_read(const char *path, FILE **f, sr_error *err)
{
    *f = fopen(path, "rb");
    if (!*f)
        return sr_error_set(err, SR_EIO, "%s: cannot open: %s", path, strerror(errno));
    struct stat st;
    if (fstat(fileno(*f), &st) == 0 && S_ISDIR(st.st_mode)) {
        fclose(*f);
        *f = NULL;
        return sr_error_set(err, SR_EIO, "%s: is a directory, not a file", path);
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
        return sr_error_set(err, SR_ENOMEM, "%s: out of memory", path);
    }
    size_t n = fread(buf, 1, max + 1, f);
    int bad = ferror(f), bad_errno = errno;
    fclose(f);
    if (bad) {
        free(buf);
        return sr_error_set(err, SR_EIO, "%s: read error: %s", path, strerror(bad_errno));
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
