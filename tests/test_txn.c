/* test_txn.c - the output transaction: outputs appear only at the commit,
 * all or nothing (a rename that fails puts back the files already replaced);
 * an undo leaves no temporary and no directory the run made; inputs and
 * outputs that are the same file are refused; long names, dangling links,
 * devices, streams and a child program. */
#define _DEFAULT_SOURCE
#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "output/fileio.h"
#include "output/txn.h"
#include "testutil.h"

static char dir[64];

static int setup(void **state)
{
    (void)state;
    snprintf(dir, sizeof dir, "/tmp/sinkrate-txn-XXXXXX");
    return mkdtemp(dir) ? 0 : -1;
}

static int teardown(void **state)
{
    (void)state;
    sr_test_rmtree(dir);
    return 0;
}

static const char *at(const char *name)
{
    static char buf[8][4096];
    static int k;
    char *b = buf[k++ % 8];
    snprintf(b, 4096, "%s/%s", dir, name);
    return b;
}

static void put(const char *path, const char *text)
{
    FILE *f = fopen(path, "w");
    assert_non_null(f);
    fputs(text, f);
    fclose(f);
}

static int holds(const char *path, const char *text)
{
    char *data;
    size_t len;
    sr_error e;
    if (sr_file_read(path, 1 << 20, &data, &len, &e) != SR_OK)
        return 0;
    int ok = strcmp(data, text) == 0;
    free(data);
    return ok;
}

/* Nothing is in place before the commit; everything after it. */
static void test_commit_puts_in_place(void **state)
{
    (void)state;
    put(at("old.txt"), "old\n");
    sr_txn *t = sr_txn_new();
    sr_error e;
    assert_int_equal(sr_txn_reserve(t, "-o", at("new.txt"), 0, &e), SR_OK);
    assert_int_equal(sr_txn_reserve(t, "--samples", at("old.txt"), 0, &e), SR_OK);
    assert_int_equal(sr_txn_write(t, at("new.txt"), "new\n", 4, &e), SR_OK);
    FILE *f;
    assert_int_equal(sr_txn_open(t, at("old.txt"), &f, &e), SR_OK);
    fputs("replaced\n", f);
    assert_int_equal(sr_txn_close(t, f, &e), SR_OK);
    /* written, not yet in place: the temporaries hold it, the old file is as it was */
    assert_true(access(at("new.txt"), F_OK) != 0);
    assert_true(holds(at("old.txt"), "old\n"));
    assert_true(holds(sr_txn_pending(t, at("new.txt")), "new\n"));
    assert_int_equal(sr_test_entries(dir), 3);
    assert_int_equal(sr_txn_commit(t, &e), SR_OK);
    sr_txn_free(t);
    assert_true(holds(at("new.txt"), "new\n"));
    assert_true(holds(at("old.txt"), "replaced\n"));
    assert_int_equal(sr_test_entries(dir), 2);
}

/* A failed run: no temporary, no directory it made, old files untouched. */
static void test_abort_leaves_nothing(void **state)
{
    (void)state;
    put(at("keep.txt"), "keep\n");
    int before = sr_test_entries(dir);
    /* 40 levels of new directories (more than any fixed list would hold) */
    char deep[4096];
    size_t n = (size_t)snprintf(deep, sizeof deep, "%s", dir);
    for (int i = 0; i < 40; i++)
        n += (size_t)snprintf(deep + n, sizeof deep - n, "/d%d", i);
    snprintf(deep + n, sizeof deep - n, "/fig.dat");
    sr_txn *t = sr_txn_new();
    sr_error e;
    assert_int_equal(sr_txn_reserve(t, "--plot", deep, SR_TXN_MKDIRS, &e), SR_OK);
    assert_int_equal(sr_txn_reserve(t, "-o", at("keep.txt"), 0, &e), SR_OK);
    assert_int_equal(sr_txn_write(t, deep, "x", 1, &e), SR_OK);
    assert_int_equal(sr_txn_write(t, at("keep.txt"), "other\n", 6, &e), SR_OK);
    assert_int_equal(sr_test_entries(dir), before + 40 + 2);
    assert_int_equal(sr_txn_abort(t), 0);
    /* after an undo nothing more can be made */
    assert_int_not_equal(sr_txn_reserve(t, "-o", at("late.txt"), 0, &e), SR_OK);
    sr_txn_free(t);
    assert_int_equal(sr_test_entries(dir), before);
    assert_true(holds(at("keep.txt"), "keep\n"));

    /* without a commit, freeing is an undo too */
    t = sr_txn_new();
    assert_int_equal(sr_txn_reserve(t, "-o", at("never.txt"), 0, &e), SR_OK);
    sr_txn_free(t);
    assert_int_equal(sr_test_entries(dir), before);
}

/* All or nothing: when a rename fails, the files already replaced come back. */
static void test_commit_rolls_back(void **state)
{
    (void)state;
    put(at("a.txt"), "old a\n");
    sr_txn *t = sr_txn_new();
    sr_error e;
    assert_int_equal(sr_txn_write(t, at("a.txt"), "new a\n", 6, &e), SR_OK);
    assert_int_equal(sr_txn_write(t, at("b.txt"), "new b\n", 6, &e), SR_OK);
    assert_int_equal(sr_txn_write(t, at("c.txt"), "new c\n", 6, &e), SR_OK);
    /* c.txt becomes a directory meanwhile: its rename fails */
    assert_int_equal(mkdir(at("c.txt"), 0755), 0);
    assert_int_not_equal(sr_txn_commit(t, &e), SR_OK);
    assert_non_null(strstr(e.msg, "c.txt: cannot write"));
    sr_txn_free(t);
    assert_true(holds(at("a.txt"), "old a\n"));
    assert_true(access(at("b.txt"), F_OK) != 0);
    assert_int_equal(sr_test_entries(dir), 2); /* a.txt and the directory c.txt */
}

/* The same file twice: by path, through a link, by a hard link; inputs too. */
static void test_same_file_refused(void **state)
{
    (void)state;
    put(at("m.yaml"), "mission: m\n");
    assert_int_equal(symlink(at("m.yaml"), at("sym.yaml")), 0);
    assert_int_equal(link(at("m.yaml"), at("hard.yaml")), 0);
    static const struct {
        const char *in, *out1, *out2, *msg;
    } ROWS[] = {
        {"m.yaml", "m.yaml", NULL, "is also a file this run reads (the mission file)"},
        {"m.yaml", "sym.yaml", NULL, "is also a file this run reads"},
        {"m.yaml", "hard.yaml", NULL, "is also a file this run reads"},
        {"sym.yaml", "./m.yaml", NULL, "is also a file this run reads"},
        {NULL, "x.csv", "x.csv", "is also written by -o"},
        {NULL, "x.csv", "./x.csv", "is also written by -o"},
        {NULL, "m.yaml", "hard.yaml", "is also written by -o"},
    };
    for (size_t i = 0; i < sizeof ROWS / sizeof ROWS[0]; i++) {
        int before = sr_test_entries(dir);
        for (int order = 0; order < 2; order++) {
            sr_txn *t = sr_txn_new();
            sr_error e;
            int rc = 0;
            if (ROWS[i].in && order == 0)
                rc = sr_txn_input(t, "the mission file", at(ROWS[i].in), &e);
            if (!rc)
                rc = sr_txn_reserve(t, "-o", at(ROWS[i].out1), 0, &e);
            if (!rc && ROWS[i].out2)
                rc = sr_txn_reserve(t, "--samples", at(ROWS[i].out2), 0, &e);
            if (!rc && ROWS[i].in && order == 1) /* an input after the outputs: refused as well */
                rc = sr_txn_input(t, "the mission file", at(ROWS[i].in), &e);
            if (!rc || !strstr(e.msg, ROWS[i].msg))
                print_error("same-file row %zu order %d: rc %d '%s'\n", i, order, rc, rc ? e.msg : "");
            assert_int_not_equal(rc, SR_OK);
            assert_non_null(strstr(e.msg, ROWS[i].msg));
            sr_txn_free(t);
        }
        assert_int_equal(sr_test_entries(dir), before);
    }
    assert_true(holds(at("m.yaml"), "mission: m\n"));
    /* the same output under the same option is one reservation */
    sr_txn *t = sr_txn_new();
    sr_error e;
    assert_int_equal(sr_txn_reserve(t, "--plot", at("f.dat"), 0, &e), SR_OK);
    assert_int_equal(sr_txn_reserve(t, "--plot", at("f.dat"), 0, &e), SR_OK);
    assert_int_equal(sr_txn_write(t, at("f.dat"), "1", 1, &e), SR_OK);
    assert_int_not_equal(sr_txn_write(t, at("f.dat"), "2", 1, &e), SR_OK);
    assert_non_null(strstr(e.msg, "written twice"));
    sr_txn_free(t);
}

/* A 250-byte name (under the 255 of the common file systems) whose
 * temporary must be shortened to fit; a dangling link keeps being a link. */
static void test_names(void **state)
{
    (void)state;
    char name[251];
    memset(name, 'n', 250);
    name[250] = '\0';
    sr_error e;
    assert_int_equal(sr_file_write_atomic(at(name), "long\n", 5, &e), SR_OK);
    assert_true(holds(at(name), "long\n"));
    assert_int_equal(sr_file_write_atomic(at(name), "again\n", 6, &e), SR_OK); /* the backup copy fits too */
    assert_true(holds(at(name), "again\n"));
    unlink(at(name));

    assert_int_equal(symlink("target.txt", at("dangling")), 0);
    assert_int_equal(sr_file_write_atomic(at("dangling"), "via link\n", 9, &e), SR_OK);
    struct stat st;
    assert_int_equal(lstat(at("dangling"), &st), 0);
    assert_true(S_ISLNK(st.st_mode));
    assert_true(holds(at("target.txt"), "via link\n"));
    assert_int_equal(sr_test_entries(dir), 2);
    /* a link in a loop is no file */
    assert_int_equal(symlink("loop", at("loop")), 0);
    assert_int_not_equal(sr_file_write_atomic(at("loop"), "x", 1, &e), SR_OK);
    assert_non_null(strstr(e.msg, "cannot write"));
}

/* Devices: written in place at the commit; a full device is an error. */
static void test_devices(void **state)
{
    (void)state;
    sr_txn *t = sr_txn_new();
    sr_error e;
    assert_int_equal(sr_txn_write(t, "/dev/null", "x", 1, &e), SR_OK);
    assert_int_equal(sr_txn_commit(t, &e), SR_OK);
    sr_txn_free(t);
    struct stat st;
    assert_int_equal(stat("/dev/null", &st), 0);
    assert_true(S_ISCHR(st.st_mode));
    if (access("/dev/full", W_OK) != 0) {
        print_message("no /dev/full here: the full-device cases are skipped\n");
        return;
    }
    put(at("keep.txt"), "keep\n");
    t = sr_txn_new();
    assert_int_equal(sr_txn_write(t, at("keep.txt"), "new\n", 4, &e), SR_OK);
    assert_int_equal(sr_txn_write(t, "/dev/full", "x", 1, &e), SR_OK);
    assert_int_not_equal(sr_txn_commit(t, &e), SR_OK);
    assert_non_null(strstr(e.msg, "No space left on device"));
    sr_txn_free(t);
    assert_true(holds(at("keep.txt"), "keep\n"));
    /* a stream to a full device fails at its close */
    t = sr_txn_new();
    FILE *f;
    assert_int_equal(sr_txn_reserve(t, "--samples", "/dev/full", 0, &e), SR_OK);
    assert_int_equal(sr_txn_open(t, "/dev/full", &f, &e), SR_OK);
    for (int i = 0; i < 10000; i++)
        fputs("0123456789\n", f);
    assert_int_not_equal(sr_txn_close(t, f, &e), SR_OK);
    assert_non_null(strstr(e.msg, "--samples: /dev/full: cannot write: No space left on device"));
    sr_txn_free(t);
    assert_int_equal(sr_test_entries(dir), 1);
}

/* A program filling a temporary: stopped and dead before its file goes. */
static void test_child_stopped(void **state)
{
    (void)state;
    sr_txn *t = sr_txn_new();
    sr_error e;
    const char *tmp;
    assert_int_equal(sr_txn_temp(t, at("fig.png"), &tmp, &e), SR_OK);
    char script[4200];
    /* it would write the temporary again after a while */
    snprintf(script, sizeof script, "sleep 20; echo late > '%s'", tmp);
    char *argv[] = {"sh", "-c", script, NULL};
    pid_t pid;
    assert_int_equal(sr_txn_spawn(t, &pid, "/bin/sh", NULL, NULL, argv), 0);
    assert_int_equal(sr_txn_abort(t), 0);
    int status;
    assert_int_equal(sr_txn_wait(t, pid, &status), 0);
    assert_true(WIFSIGNALED(status) && WTERMSIG(status) == SIGKILL);
    assert_int_not_equal(sr_txn_spawn(t, &pid, "/bin/sh", NULL, NULL, argv), 0); /* none after the undo */
    sr_txn_free(t);
    assert_int_equal(sr_test_entries(dir), 0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test_setup_teardown(test_commit_puts_in_place, setup, teardown),
        cmocka_unit_test_setup_teardown(test_abort_leaves_nothing, setup, teardown),
        cmocka_unit_test_setup_teardown(test_commit_rolls_back, setup, teardown),
        cmocka_unit_test_setup_teardown(test_same_file_refused, setup, teardown),
        cmocka_unit_test_setup_teardown(test_names, setup, teardown),
        cmocka_unit_test_setup_teardown(test_devices, setup, teardown),
        cmocka_unit_test_setup_teardown(test_child_stopped, setup, teardown),
    };
    return cmocka_run_group_tests_name("txn", tests, NULL, NULL);
}
