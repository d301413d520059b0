/* test_fileio.c - one file written atomically: a new file, a replaced file, a
 * file behind a symbolic link (the link stays), a device (written to, never
 * replaced), and no temporary left behind when writing fails; bounded reads.
 * The transaction underneath is tested in test_txn.c. */
#define _DEFAULT_SOURCE
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "output/fileio.h"
#include "testutil.h"

static char dir[] = "/tmp/sinkrate-fileio-XXXXXX";

static const char *in_dir(const char *name)
{
    static char buf[4][512];
    static int k;
    char *b = buf[k++ % 4];
    snprintf(b, 512, "%s/%s", dir, name);
    return b;
}

static char *slurp(const char *path)
{
    char *data;
    size_t len;
    sr_error e;
    return sr_file_read(path, 1 << 20, &data, &len, &e) == SR_OK ? data : NULL;
}

static int entries(void)
{
    DIR *d = opendir(dir);
    int n = 0;
    struct dirent *e;
    while (d && (e = readdir(d)) != NULL)
        n += e->d_name[0] != '.';
    if (d)
        closedir(d);
    return n;
}

static void test_write_replace_link_device(void **state)
{
    (void)state;
    assert_non_null(mkdtemp(dir));
    sr_error e;
    const char *f = in_dir("a.txt");
    assert_int_equal(sr_file_write_atomic(f, "one\n", 4, &e), SR_OK);
    char *got = slurp(f);
    assert_string_equal(got, "one\n");
    free(got);
    assert_int_equal(sr_file_write_atomic(f, "two\n", 4, &e), SR_OK);
    got = slurp(f);
    assert_string_equal(got, "two\n");
    free(got);
    struct stat st;
    assert_int_equal(stat(f, &st), 0);
    mode_t um = umask(0);
    umask(um);
    assert_int_equal(st.st_mode & 0777, 0666 & ~um);

    /* through a link: the file it names changes, the link stays a link */
    const char *l = in_dir("link.txt");
    assert_int_equal(symlink(f, l), 0);
    assert_int_equal(sr_file_write_atomic(l, "three\n", 6, &e), SR_OK);
    assert_int_equal(lstat(l, &st), 0);
    assert_true(S_ISLNK(st.st_mode));
    got = slurp(f);
    assert_string_equal(got, "three\n");
    free(got);

    /* a device is written to, not replaced */
    assert_int_equal(sr_file_write_atomic("/dev/null", "x", 1, &e), SR_OK);
    assert_int_equal(stat("/dev/null", &st), 0);
    assert_true(S_ISCHR(st.st_mode));

    /* failures name the path and leave nothing behind */
    assert_int_equal(entries(), 2);
    assert_int_not_equal(sr_file_write_atomic(in_dir("no/such/x.txt"), "x", 1, &e), SR_OK);
    assert_non_null(strstr(e.msg, "no/such/x.txt"));
    assert_int_not_equal(sr_file_write_atomic(dir, "x", 1, &e), SR_OK);
    assert_non_null(strstr(e.msg, "is a directory"));
    assert_int_not_equal(sr_file_write_atomic("", "x", 1, &e), SR_OK);
    assert_int_equal(entries(), 2);

    unlink(l);
    unlink(f);
    assert_int_equal(rmdir(dir), 0);
}

/* What the writer refuses, with words that name the path; nothing is left. */
static void test_refused(void **state)
{
    (void)state;
    char d[64];
    sr_test_tmpdir(d, sizeof d, "check");
    char p[512];
    sr_error e;
    static const struct {
        const char *path; /* %s: the directory */
        const char *msg;
    } BAD[] = {
        {"", "empty output file name"},
        {"%s", "is a directory"},
        {"%s/", "is a directory name"},
        {"%s/no/such/x.txt", "cannot write: No such file or directory"},
        {"/proc/sinkrate-check.txt", "cannot write"},
        {"/dev/null/x.txt", "cannot write: Not a directory"},
    };
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        snprintf(p, sizeof p, BAD[i].path, d);
        assert_int_not_equal(sr_file_write_atomic(p, "x", 1, &e), SR_OK);
        if (!strstr(e.msg, BAD[i].msg))
            print_error("refused row %zu: '%s'\n", i, e.msg);
        assert_non_null(strstr(e.msg, BAD[i].msg));
    }
    assert_int_equal(rmdir(d), 0); /* nothing was made: no temporary, no directory */
}

static void test_read_limits(void **state)
{
    (void)state;
    char *data;
    size_t len;
    sr_error e;
    assert_int_not_equal(sr_file_read("/tmp", 100, &data, &len, &e), SR_OK);
    assert_non_null(strstr(e.msg, "is a directory"));
    assert_int_not_equal(sr_file_read("/nonexistent/sinkrate", 100, &data, &len, &e), SR_OK);
    assert_non_null(strstr(e.msg, "cannot open"));
    const char *p = sr_test_tmpfile(".txt", "0123456789");
    assert_int_not_equal(sr_file_read(p, 5, &data, &len, &e), SR_OK);
    assert_non_null(strstr(e.msg, "larger than"));
    assert_int_equal(sr_file_read(p, 10, &data, &len, &e), SR_OK);
    assert_int_equal(len, 10);
    free(data);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_write_replace_link_device),
        cmocka_unit_test(test_refused),
        cmocka_unit_test(test_read_limits),
    };
    return cmocka_run_group_tests_name("fileio", tests, NULL, NULL);
}
