/* txn.h - the output transaction of a run: every file the run writes goes to
 * a temporary next to its target, is checked (every write, flush, fsync and
 * close), and is renamed into place only when every output is complete, all
 * or nothing; a run that fails, or is stopped, removes every temporary and
 * every directory it made and leaves existing files as they were. */
#ifndef SR_TXN_H
#define SR_TXN_H

#include <spawn.h>
#include <stddef.h>
#include <stdio.h>
#include <sys/types.h>

#include "base/error.h"

typedef struct sr_txn sr_txn;

/* Flags of sr_txn_reserve. */
enum {
    SR_TXN_MKDIRS = 1 /* create the missing directories above the file (they are the run's) */
};

/* A new, empty transaction; NULL when out of memory. */
sr_txn *sr_txn_new(void);
/* Abort what is not committed, then free. */
void sr_txn_free(sr_txn *t);

/* A file the run reads (what: how to name it in messages, "the mission
 * file"): an output naming the same file -- the same path, or the same
 * device and inode -- is refused. A path that is not a regular file is not
 * recorded (a missing one is its reader's error). */
int sr_txn_input(sr_txn *t, const char *what, const char *path, sr_error *err);
/* The inputs recorded, for a message: "the mission file m.yaml, --sounding
 * s.csv" (empty when none), in the order they were read. */
void sr_txn_inputs(const sr_txn *t, char *buf, size_t len);

/* Reserve an output before any work (what: the option that names it, "-o",
 * in every message about it). A regular file or a name that does not exist
 * yet gets its temporary now, next to it (through a symbolic link, next to
 * the file the link names; the link stays), so a path that cannot be written
 * fails here; the temporary's name fits the file system's name limit. A
 * device or a pipe is written in place, never replaced. Refused: an empty
 * name, a directory, a missing directory (unless SR_TXN_MKDIRS), and a file
 * that is an input or another output of the run. Reserving the same path
 * again under the same `what` is no error. */
int sr_txn_reserve(sr_txn *t, const char *what, const char *path, unsigned flags, sr_error *err);

/* The whole content of an output (reserved with no flags if it was not).
 * A file's temporary is written, flushed to disk and closed now; a device's
 * bytes are kept and written by sr_txn_commit. An output is written once. */
int sr_txn_write(sr_txn *t, const char *path, const void *data, size_t len, sr_error *err);

/* Stream a large output: a stream on its temporary (a device: on the device
 * itself). sr_txn_close checks every write, flushes, syncs and closes it. */
int sr_txn_open(sr_txn *t, const char *path, FILE **f, sr_error *err);
int sr_txn_close(sr_txn *t, FILE *f, sr_error *err);

/* An output another program fills: *tmp receives the path of its (empty)
 * temporary, valid until the transaction ends. The program runs through
 * sr_txn_spawn and sr_txn_wait (so a stopped run stops it too); after the
 * caller has checked the content, sr_txn_filled syncs it and marks it done. */
int sr_txn_temp(sr_txn *t, const char *path, const char **tmp, sr_error *err);
int sr_txn_filled(sr_txn *t, const char *path, sr_error *err);
/* posix_spawn recorded as the transaction's child; sr_txn_wait reaps it. */
int sr_txn_spawn(sr_txn *t, pid_t *pid, const char *prog, const posix_spawn_file_actions_t *fa,
                 const posix_spawnattr_t *attr, char *const argv[]);
int sr_txn_wait(sr_txn *t, pid_t pid, int *status);

/* Where the content of an output can be read before the commit: its
 * temporary once written, else path itself. */
const char *sr_txn_pending(const sr_txn *t, const char *path);

/* An output reserved that this run will not write after all: its temporary
 * goes, the file stays as it is. */
void sr_txn_drop(sr_txn *t, const char *path);

/* Put every output in place: devices are written, then each temporary is
 * renamed over its target. When a rename fails, the ones done are undone
 * (the old files come back from hard-linked copies) and every temporary
 * goes. Outputs reserved but never written are dropped. */
int sr_txn_commit(sr_txn *t, sr_error *err);

/* Undo: stop the child program, remove every temporary and every directory
 * the run made (newest first). Safe from another thread while the owner is
 * still working (a run stopped by a signal): later calls fail at once.
 * Returns 1 when the transaction had already committed (nothing to undo). */
int sr_txn_abort(sr_txn *t);

#endif
