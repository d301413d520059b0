/* txn.c - the output transaction: temporaries next to their targets, checked
 * writes, renames all or nothing, and the undo of a failed or stopped run. */
#define _DEFAULT_SOURCE
#include "output/txn.h"

#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <pthread.h>
#include <signal.h>
#include <stdarg.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

extern char **environ;

/* Something on disk that an undo removes: a temporary or backup file, or a
 * directory the run made. Newest first, so files go before their directory. */
typedef struct node {
    struct node *next;
    int dir;  /* rmdir instead of unlink */
    int live; /* still to be removed by an undo */
    char path[];
} node;

typedef enum ostate { O_RESERVED, O_OPEN, O_READY, O_DONE, O_DROPPED, O_FAILED } ostate;

typedef struct out {
    struct out *next;
    char *what;   /* the option naming it, for messages ("" for none) */
    char *given;  /* the path as given */
    char *target; /* the file replaced (the one a link names), or the device */
    char *canon;  /* absolute path without links, for comparisons */
    int device;   /* written in place, never replaced */
    int have_id;  /* the target existed when reserved: dev, ino, mode hold */
    dev_t dev;
    ino_t ino;
    ostate state;
    int fd;       /* the temporary, open until written */
    node *tmp;
    FILE *f;      /* sr_txn_open's stream */
    char *data;   /* a device's bytes, written at the commit */
    size_t len;
} out;

typedef struct in {
    struct in *next;
    char *what, *canon, *given;
    dev_t dev;
    ino_t ino;
} in;

struct sr_txn {
    pthread_mutex_t lock; /* sr_txn_abort may come from another thread */
    node *nodes;
    out *outs, **tail;
    in *ins;
    pid_t child;
    unsigned long counter;
    int aborted, committed;
};

/* "WHAT: PATH: reason", or "PATH: reason" for an output with no option. */
static int fail(sr_error *err, int code, const char *what, const char *path, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 5, 6)))
#endif
    ;
static int fail(sr_error *err, int code, const char *what, const char *path, const char *fmt, ...)
{
    char reason[SR_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(reason, sizeof reason, fmt, ap);
    va_end(ap);
    if (what && *what)
        return sr_error_set(err, code, "%s: %s: %s", what, path, reason);
    return sr_error_set(err, code, "%s: %s", path, reason);
}

static char *dup_printf(const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 1, 2)))
#endif
    ;
static char *dup_printf(const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    int n = vsnprintf(NULL, 0, fmt, ap);
    va_end(ap);
    char *s = n < 0 ? NULL : malloc((size_t)n + 1);
    if (s) {
        va_start(ap, fmt);
        vsnprintf(s, (size_t)n + 1, fmt, ap);
        va_end(ap);
    }
    return s;
}

static node *add_node(sr_txn *t, const char *path, int dir)
{
    size_t n = strlen(path);
    node *x = malloc(sizeof *x + n + 1);
    if (!x)
        return NULL;
    memcpy(x->path, path, n + 1);
    x->dir = dir;
    x->live = 1;
    x->next = t->nodes;
    t->nodes = x;
    return x;
}

static void remove_node(node *x)
{
    if (x && x->live) {
        if (x->dir)
            rmdir(x->path); /* only when empty: what others put there stays */
        else
            unlink(x->path);
        x->live = 0;
    }
}

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

sr_txn *sr_txn_new(void)
{
    sr_txn *t = calloc(1, sizeof *t);
    if (!t)
        return NULL;
    if (pthread_mutex_init(&t->lock, NULL) != 0) {
        free(t);
        return NULL;
    }
    t->tail = &t->outs;
    return t;
}

static out *find(const sr_txn *t, const char *path)
{
    for (out *o = t->outs; o; o = o->next)
        if (strcmp(o->given, path) == 0 || strcmp(o->target, path) == 0)
            return o;
    return NULL;
}

/* ---- inputs and outputs that are the same file ---- */

static int same_out(const out *o, const char *canon, int have_id, dev_t dev, ino_t ino)
{
    if (o->device || o->state == O_DROPPED)
        return 0;
    if (o->have_id && have_id)
        return o->dev == dev && o->ino == ino;
    return strcmp(o->canon, canon) == 0;
}

static int clash_input(const out *o, const in *i, sr_error *err)
{
    return fail(err, SR_EINVAL, o->what, o->given,
                "is also a file this run reads (%s); write the output to another file", i->what);
}

int sr_txn_input(sr_txn *t, const char *what, const char *path, sr_error *err)
{
    struct stat st;
    if (!path || stat(path, &st) != 0 || !S_ISREG(st.st_mode))
        return SR_OK;
    in *i = calloc(1, sizeof *i);
    if (!i)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    i->what = strdup(what ? what : "an input");
    i->canon = realpath(path, NULL);
    i->given = strdup(path);
    if (!i->what || !i->canon || !i->given) {
        free(i->what);
        free(i->canon);
        free(i->given);
        free(i);
        return SR_OK; /* its reader reports what is wrong with it */
    }
    i->dev = st.st_dev;
    i->ino = st.st_ino;
    pthread_mutex_lock(&t->lock);
    i->next = t->ins;
    t->ins = i;
    int rc = SR_OK;
    for (out *o = t->outs; o && !rc; o = o->next)
        if (same_out(o, i->canon, 1, i->dev, i->ino))
            rc = clash_input(o, i, err);
    pthread_mutex_unlock(&t->lock);
    return rc;
}

void sr_txn_inputs(const sr_txn *t, char *buf, size_t len)
{
    sr_txn *m = (sr_txn *)t; /* the lock only */
    pthread_mutex_lock(&m->lock);
    size_t at = 0;
    buf[0] = '\0';
    /* oldest first: the order the run read them */
    size_t n = 0;
    for (const in *i = t->ins; i; i = i->next)
        n++;
    for (size_t k = n; k-- > 0 && at < len;) {
        const in *i = t->ins;
        for (size_t j = 0; j < k; j++)
            i = i->next;
        int dup = 0; /* one file named once */
        for (const in *o = i->next; o; o = o->next)
            dup |= strcmp(o->canon, i->canon) == 0;
        if (!dup)
            at += (size_t)snprintf(buf + at, len - at, "%s%s %s", at ? ", " : "", i->what, i->given);
    }
    pthread_mutex_unlock(&m->lock);
}

/* ---- reserving an output ---- */

/* Follow a chain of symbolic links to the name at its end, which does not
 * exist (a dangling link): the file to create, so the link stays a link. */
static char *follow_links(const char *path, int *e)
{
    char *cur = strdup(path);
    for (int hops = 0; cur && hops < 40; hops++) {
        struct stat ls;
        if (lstat(cur, &ls) != 0 || !S_ISLNK(ls.st_mode))
            return cur;
        char buf[PATH_MAX];
        ssize_t n = readlink(cur, buf, sizeof buf - 1);
        if (n < 0) {
            *e = errno;
            free(cur);
            return NULL;
        }
        buf[n] = '\0';
        char *slash = strrchr(cur, '/');
        char *next = buf[0] == '/' || !slash ? strdup(buf) : dup_printf("%.*s/%s", (int)(slash - cur), cur, buf);
        free(cur);
        cur = next;
    }
    *e = cur ? ELOOP : ENOMEM;
    free(cur);
    return NULL;
}

/* The directory part of path ("." when none) and a pointer to its base name. */
static char *dir_of(const char *path, const char **base)
{
    const char *slash = strrchr(path, '/');
    *base = slash ? slash + 1 : path;
    if (!slash)
        return strdup(".");
    if (slash == path)
        return strdup("/");
    return dup_printf("%.*s", (int)(slash - path), path);
}

/* Make the missing directories of dir, each recorded as the run's; 0 or an
 * errno value. */
static int make_dirs(sr_txn *t, char *dir, int mkdirs)
{
    struct stat st;
    if (stat(dir, &st) == 0)
        return S_ISDIR(st.st_mode) ? 0 : ENOTDIR;
    if (errno != ENOENT)
        return errno;
    if (!mkdirs)
        return ENOENT;
    size_t n = strlen(dir);
    for (size_t k = 1; k <= n; k++) {
        if (k < n && dir[k] != '/')
            continue;
        char keep = dir[k];
        dir[k] = '\0';
        int e = 0;
        if (stat(dir, &st) == 0) {
            if (!S_ISDIR(st.st_mode))
                e = ENOTDIR;
        } else if (errno != ENOENT) {
            e = errno;
        } else {
            node *x = add_node(t, dir, 1);
            if (!x)
                e = ENOMEM;
            else if (mkdir(dir, 0777) != 0) {
                e = errno;
                x->live = 0;
                if (e == EEXIST && stat(dir, &st) == 0 && S_ISDIR(st.st_mode))
                    e = 0; /* made meanwhile by someone else: not ours */
            }
        }
        dir[k] = keep;
        if (e)
            return e;
    }
    return 0;
}

/* A new empty file next to target whose name fits the file system's limit:
 * "<base, shortened if need be>.sinkrate-<tag>-<pid>-<n>". */
static node *make_temp(sr_txn *t, const char *dir, const char *base, const char *tag, mode_t mode, int *fd,
                       int *e)
{
    long name_max = pathconf(dir, _PC_NAME_MAX);
    if (name_max <= 0)
        name_max = 255;
    for (int tries = 0; tries < 1000; tries++) {
        char suffix[80];
        int sl = snprintf(suffix, sizeof suffix, ".sinkrate-%s-%ld-%lu", tag, (long)getpid(), ++t->counter);
        size_t keep = strlen(base);
        if ((long)(keep + (size_t)sl) > name_max)
            keep = name_max > sl ? (size_t)(name_max - sl) : 0;
        while (keep > 0 && ((unsigned char)base[keep] & 0xc0) == 0x80) /* not inside a UTF-8 character */
            keep--;
        char *path = strcmp(dir, "/") == 0 ? dup_printf("/%.*s%s", (int)keep, base, suffix)
                                           : dup_printf("%s/%.*s%s", dir, (int)keep, base, suffix);
        node *x = path ? add_node(t, path, 0) : NULL;
        free(path);
        if (!x) {
            *e = ENOMEM;
            return NULL;
        }
        *fd = open(x->path, O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC | O_NOFOLLOW, 0666);
        if (*fd >= 0) {
            if (mode)
                (void)fchmod(*fd, mode & 07777); /* the replaced file's permissions */
            return x;
        }
        x->live = 0;
        *e = errno;
        if (*e != EEXIST && *e != ELOOP)
            return NULL;
    }
    return NULL;
}

static void free_out(out *o)
{
    free(o->what);
    free(o->given);
    free(o->target);
    free(o->canon);
    free(o->data);
    free(o);
}

static int reserve_locked(sr_txn *t, const char *what, const char *path, unsigned flags, sr_error *err)
{
    if (t->aborted)
        return fail(err, SR_EIO, what, path ? path : "", "the run was stopped");
    if (!path || !*path)
        return what && *what ? sr_error_set(err, SR_EINVAL, "%s: empty output file name", what)
                             : sr_error_set(err, SR_EINVAL, "empty output file name");
    if (path[strlen(path) - 1] == '/')
        return fail(err, SR_EINVAL, what, path, "is a directory name, not a file");
    out *o = calloc(1, sizeof *o);
    if (!o)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    o->fd = -1;
    o->what = strdup(what ? what : "");
    o->given = strdup(path);
    int rc = SR_OK, e = 0, mkdirs = (flags & SR_TXN_MKDIRS) != 0;
    mode_t mode = 0;
    struct stat st;
    if (!o->what || !o->given) {
        e = ENOMEM;
    } else if (stat(path, &st) == 0) {
        if (S_ISDIR(st.st_mode)) {
            free_out(o);
            return fail(err, SR_EIO, what, path, "is a directory");
        }
        if (!S_ISREG(st.st_mode)) { /* a device or a pipe (/dev/stdout, a FIFO) */
            o->device = 1;
            o->target = strdup(path);
            if (access(path, W_OK) != 0)
                e = errno;
        } else {
            o->target = realpath(path, NULL);
            o->have_id = 1;
            o->dev = st.st_dev;
            o->ino = st.st_ino;
            mode = st.st_mode;
        }
    } else if (errno == ENOENT) {
        struct stat ls;
        if (lstat(path, &ls) == 0 && S_ISLNK(ls.st_mode)) {
            o->target = follow_links(path, &e); /* a dangling link: create the file it names */
            mkdirs = 0;
            if (o->target && lstat(o->target, &ls) == 0)
                e = EEXIST; /* it appeared meanwhile */
        } else {
            o->target = strdup(path);
        }
    } else {
        e = errno;
    }
    if (!e && !o->target)
        e = ENOMEM;
    /* the same output again under the same option: the one reservation */
    for (out *p = t->outs; !e && p; p = p->next)
        if (strcmp(p->what, o->what) == 0 && strcmp(p->target, o->target) == 0 && p->state != O_DROPPED) {
            free_out(o);
            return SR_OK;
        }
    if (!e && !o->device) {
        const char *base;
        char *dir = dir_of(o->target, &base);
        if (!dir)
            e = ENOMEM;
        else if (!(e = make_dirs(t, dir, mkdirs))) {
            char *rdir = realpath(dir, NULL);
            o->canon = rdir ? dup_printf("%s%s%s", rdir, strcmp(rdir, "/") ? "/" : "", base) : NULL;
            free(rdir);
            if (!o->canon)
                e = errno ? errno : ENOMEM;
            for (out *p = t->outs; !e && !rc && p; p = p->next)
                if (same_out(p, o->canon, o->have_id, o->dev, o->ino))
                    rc = fail(err, SR_EINVAL, o->what, path,
                              "is also written by %s; give each output its own file",
                              p->what[0] ? p->what : "this run");
            for (in *i = t->ins; !e && !rc && i; i = i->next)
                if ((o->have_id && o->dev == i->dev && o->ino == i->ino) || strcmp(o->canon, i->canon) == 0)
                    rc = clash_input(o, i, err);
            if (!e && !rc)
                o->tmp = make_temp(t, dir, base, "tmp", mode, &o->fd, &e);
        }
        free(dir);
    }
    if (!e && !rc) {
        *t->tail = o;
        t->tail = &o->next;
        return SR_OK;
    }
    free_out(o);
    if (rc)
        return rc;
    if (e == ENOMEM)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    return fail(err, SR_EIO, what, path, "cannot write: %s", strerror(e));
}

int sr_txn_reserve(sr_txn *t, const char *what, const char *path, unsigned flags, sr_error *err)
{
    pthread_mutex_lock(&t->lock);
    int rc = reserve_locked(t, what, path, flags, err);
    pthread_mutex_unlock(&t->lock);
    return rc;
}

/* The output for path, reserved now if it was not; NULL with err filled. */
static out *get_locked(sr_txn *t, const char *path, sr_error *err)
{
    if (t->aborted) {
        fail(err, SR_EIO, NULL, path ? path : "", "the run was stopped");
        return NULL;
    }
    out *o = path ? find(t, path) : NULL;
    if (!o && reserve_locked(t, "", path, 0, err) == SR_OK)
        o = find(t, path);
    if (o && o->state != O_RESERVED) {
        fail(err, SR_EIO, o->what, o->given, "written twice by this run (two outputs with one name)");
        return NULL;
    }
    return o;
}

/* Flush a temporary to disk and close it; 0 or an errno value. */
static int finish_fd(out *o)
{
    int e = fsync(o->fd) != 0 ? errno : 0;
    if (close(o->fd) != 0 && !e)
        e = errno;
    o->fd = -1;
    return e;
}

/* The blocking part of an output's I/O (a pipe may wait for its reader, a
 * disk for its sync) runs outside the lock, so an undo from another thread
 * is never held up: the output is marked busy (O_OPEN) meanwhile. */
int sr_txn_write(sr_txn *t, const char *path, const void *data, size_t len, sr_error *err)
{
    pthread_mutex_lock(&t->lock);
    out *o = get_locked(t, path, err);
    int rc = o ? SR_OK : err ? err->code : SR_EIO;
    if (o && o->device) {
        o->data = malloc(len ? len : 1);
        if (!o->data) {
            rc = sr_error_set(err, SR_ENOMEM, "out of memory");
        } else {
            memcpy(o->data, data, len);
            o->len = len;
            o->state = O_READY;
        }
    }
    if (!o || o->device) {
        pthread_mutex_unlock(&t->lock);
        return rc;
    }
    int fd = o->fd;
    o->fd = -1;
    o->state = O_OPEN;
    pthread_mutex_unlock(&t->lock);
    int e = write_all(fd, data, len);
    if (fsync(fd) != 0 && !e)
        e = errno;
    if (close(fd) != 0 && !e)
        e = errno;
    pthread_mutex_lock(&t->lock);
    o->state = e ? O_FAILED : O_READY;
    if (e)
        rc = fail(err, SR_EIO, o->what, o->given, "cannot write: %s", strerror(e));
    pthread_mutex_unlock(&t->lock);
    return rc;
}

int sr_txn_open(sr_txn *t, const char *path, FILE **f, sr_error *err)
{
    *f = NULL;
    pthread_mutex_lock(&t->lock);
    out *o = get_locked(t, path, err);
    if (!o) {
        pthread_mutex_unlock(&t->lock);
        return err ? err->code : SR_EIO;
    }
    int fd = o->fd;
    o->fd = -1; /* the stream owns it */
    o->state = O_OPEN;
    int device = o->device;
    pthread_mutex_unlock(&t->lock);
    if (device)
        fd = open(o->target, O_WRONLY | O_NOCTTY | O_CLOEXEC);
    FILE *s = fd >= 0 ? fdopen(fd, "w") : NULL;
    int e = s ? 0 : errno;
    if (!s && fd >= 0)
        close(fd);
    pthread_mutex_lock(&t->lock);
    o->f = s;
    o->state = s ? O_OPEN : O_FAILED;
    pthread_mutex_unlock(&t->lock);
    if (!s)
        return fail(err, SR_EIO, o->what, o->given, "cannot write: %s", strerror(e));
    *f = s;
    return SR_OK;
}

int sr_txn_close(sr_txn *t, FILE *f, sr_error *err)
{
    pthread_mutex_lock(&t->lock);
    out *o = t->outs;
    while (o && o->f != f)
        o = o->next;
    if (o)
        o->f = NULL;
    pthread_mutex_unlock(&t->lock);
    if (!o)
        return sr_error_set(err, SR_EINVAL, "a stream the output transaction did not open");
    errno = 0;
    int e = fflush(f) != 0 || ferror(f) ? (errno ? errno : EIO) : 0;
    if (!e && !o->device && fsync(fileno(f)) != 0)
        e = errno;
    if (fclose(f) != 0 && !e)
        e = errno;
    pthread_mutex_lock(&t->lock);
    o->state = e ? O_FAILED : o->device ? O_DONE : O_READY;
    pthread_mutex_unlock(&t->lock);
    if (e)
        return fail(err, SR_EIO, o->what, o->given, "cannot write: %s", strerror(e));
    return SR_OK;
}

int sr_txn_temp(sr_txn *t, const char *path, const char **tmp, sr_error *err)
{
    *tmp = NULL;
    pthread_mutex_lock(&t->lock);
    out *o = get_locked(t, path, err);
    int rc = o ? SR_OK : err ? err->code : SR_EIO;
    if (o && o->device)
        rc = fail(err, SR_EINVAL, o->what, o->given, "is a device or a pipe; another program cannot fill it");
    else if (o)
        *tmp = o->tmp->path;
    pthread_mutex_unlock(&t->lock);
    return rc;
}

int sr_txn_filled(sr_txn *t, const char *path, sr_error *err)
{
    pthread_mutex_lock(&t->lock);
    out *o = find(t, path);
    int rc = SR_OK;
    if (t->aborted || !o || o->state != O_RESERVED || o->device) {
        rc = fail(err, SR_EIO, o ? o->what : NULL, path, "not an output waiting to be filled");
    } else {
        int e = finish_fd(o);
        o->state = e ? O_FAILED : O_READY;
        if (e)
            rc = fail(err, SR_EIO, o->what, o->given, "cannot write: %s", strerror(e));
    }
    pthread_mutex_unlock(&t->lock);
    return rc;
}

int sr_txn_spawn(sr_txn *t, pid_t *pid, const char *prog, const posix_spawn_file_actions_t *fa,
                 const posix_spawnattr_t *attr, char *const argv[])
{
    /* under the lock, so an undo never misses a child that has started */
    pthread_mutex_lock(&t->lock);
    int rc = t->aborted ? ECANCELED : posix_spawn(pid, prog, fa, attr, argv, environ);
    if (rc == 0)
        t->child = *pid;
    pthread_mutex_unlock(&t->lock);
    return rc;
}

int sr_txn_wait(sr_txn *t, pid_t pid, int *status)
{
    int rc = 0;
    while (waitpid(pid, status, 0) < 0) {
        if (errno != EINTR) {
            rc = errno;
            break;
        }
    }
    pthread_mutex_lock(&t->lock);
    t->child = 0;
    pthread_mutex_unlock(&t->lock);
    return rc;
}

const char *sr_txn_pending(const sr_txn *t, const char *path)
{
    sr_txn *m = (sr_txn *)t; /* the lock only */
    pthread_mutex_lock(&m->lock);
    const out *o = find(t, path);
    const char *p = o && !o->device && (o->state == O_READY) ? o->tmp->path : path;
    pthread_mutex_unlock(&m->lock);
    return p;
}

static void drop_locked(out *o)
{
    if (o->f) {
        fclose(o->f);
        o->f = NULL;
    }
    if (o->fd >= 0) {
        close(o->fd);
        o->fd = -1;
    }
    remove_node(o->tmp);
    o->state = O_DROPPED;
}

void sr_txn_drop(sr_txn *t, const char *path)
{
    pthread_mutex_lock(&t->lock);
    out *o = find(t, path);
    if (o && o->state != O_DONE)
        drop_locked(o);
    pthread_mutex_unlock(&t->lock);
}

/* ---- undo and commit ---- */

static void undo_locked(sr_txn *t)
{
    if (t->child > 0) {
        /* a program filling a temporary could create it again: stopped and
         * dead before its file goes (WNOWAIT: the owner may reap it) */
        kill(t->child, SIGKILL);
        siginfo_t si;
        while (waitid(P_PID, (id_t)t->child, &si, WEXITED | WNOWAIT) != 0 && errno == EINTR)
            ;
        t->child = 0;
    }
    for (node *x = t->nodes; x; x = x->next)
        remove_node(x);
    t->aborted = 1;
}

int sr_txn_abort(sr_txn *t)
{
    if (!t)
        return 0;
    pthread_mutex_lock(&t->lock);
    int committed = t->committed;
    if (!committed && !t->aborted)
        undo_locked(t);
    pthread_mutex_unlock(&t->lock);
    return committed;
}

static void sync_dir_of(const char *path)
{
    const char *base;
    char *dir = dir_of(path, &base);
    if (!dir)
        return;
    int fd = open(dir, O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    if (fd >= 0) {
        (void)fsync(fd); /* the renames on disk too; some file systems refuse, which is no error */
        close(fd);
    }
    free(dir);
}

int sr_txn_commit(sr_txn *t, sr_error *err)
{
    pthread_mutex_lock(&t->lock);
    int rc = SR_OK;
    if (t->aborted)
        rc = sr_error_set(err, SR_EIO, "the run was stopped");
    for (out *o = t->outs; o && !rc; o = o->next) {
        if (o->state == O_RESERVED)
            drop_locked(o);
        else if (o->state == O_OPEN || o->state == O_FAILED)
            rc = fail(err, SR_EIO, o->what, o->given, "was not written completely");
    }
    /* devices first, as they cannot be taken back; outside the lock (a pipe
     * may wait for its reader), each marked busy meanwhile */
    for (out *o = t->outs; o && !rc; o = o->next) {
        if (!o->device || o->state != O_READY)
            continue;
        o->state = O_OPEN;
        pthread_mutex_unlock(&t->lock);
        int fd = open(o->target, O_WRONLY | O_NOCTTY | O_CLOEXEC), e = fd < 0 ? errno : write_all(fd, o->data, o->len);
        if (fd >= 0 && close(fd) != 0 && !e)
            e = errno;
        pthread_mutex_lock(&t->lock);
        o->state = O_DONE;
        if (e)
            rc = fail(err, SR_EIO, o->what, o->given, "cannot write: %s", strerror(e));
        else if (t->aborted)
            rc = sr_error_set(err, SR_EIO, "the run was stopped");
    }
    /* a hard-linked copy of each file about to be replaced, so a rename that
     * fails can put back the ones done (file systems without hard links: no copy) */
    size_t n = 0;
    for (out *o = t->outs; o; o = o->next)
        n++;
    node **bak = calloc(n ? n : 1, sizeof *bak);
    if (!bak && !rc)
        rc = sr_error_set(err, SR_ENOMEM, "out of memory");
    size_t k = 0;
    for (out *o = t->outs; o && !rc; o = o->next, k++) {
        struct stat st;
        if (o->device || o->state != O_READY || lstat(o->target, &st) != 0 || !S_ISREG(st.st_mode))
            continue;
        const char *base;
        char *dir = dir_of(o->target, &base);
        for (int tries = 0; dir && tries < 100 && !bak[k]; tries++) {
            int fd, e = 0;
            node *x = make_temp(t, dir, base, "old", 0, &fd, &e);
            if (!x)
                break;
            close(fd);
            unlink(x->path);
            if (link(o->target, x->path) == 0)
                bak[k] = x;
            else
                x->live = 0;
            if (!bak[k] && errno != EEXIST)
                break;
        }
        free(dir);
    }
    k = 0;
    out *failed = NULL;
    int e = 0;
    for (out *o = t->outs; o && !rc; o = o->next, k++) {
        if (o->device || o->state != O_READY)
            continue;
        if (rename(o->tmp->path, o->target) != 0) {
            e = errno;
            failed = o;
            break;
        }
        o->tmp->live = 0;
        o->state = O_DONE;
    }
    if (failed) {
        /* put back what was replaced, remove what was new */
        k = 0;
        for (out *o = t->outs; o && o != failed; o = o->next, k++) {
            if (o->device || o->state != O_DONE)
                continue;
            if (bak[k] && rename(bak[k]->path, o->target) == 0)
                bak[k]->live = 0;
            else if (!bak[k])
                unlink(o->target);
        }
        rc = fail(err, SR_EIO, failed->what, failed->given, "cannot write: %s", strerror(e));
    }
    if (rc) {
        undo_locked(t);
    } else {
        for (size_t j = 0; j < n; j++)
            remove_node(bak[j]);
        for (out *o = t->outs; o; o = o->next)
            if (!o->device && o->state == O_DONE)
                sync_dir_of(o->target);
        /* directories the run made and no output went into */
        for (node *x = t->nodes; x; x = x->next) {
            if (x->dir && x->live)
                rmdir(x->path);
            x->live = 0;
        }
        t->committed = 1;
    }
    free(bak);
    pthread_mutex_unlock(&t->lock);
    return rc;
}

void sr_txn_free(sr_txn *t)
{
    if (!t)
        return;
    sr_txn_abort(t);
    for (out *o = t->outs; o;) {
        out *next = o->next;
        if (o->f)
            fclose(o->f);
        if (o->fd >= 0)
            close(o->fd);
        free_out(o);
        o = next;
    }
    for (in *i = t->ins; i;) {
        in *next = i->next;
        free(i->what);
        free(i->canon);
        free(i->given);
        free(i);
        i = next;
    }
    for (node *x = t->nodes; x;) {
        node *next = x->next;
        free(x);
        x = next;
    }
    pthread_mutex_destroy(&t->lock);
    free(t);
}
