/* fuzz_cli.c - the command line: the input is split into arguments at NUL or
 * newline bytes and run through sr_cli_run with both streams on /dev/null.
 * Nothing may write files while fuzzing: the program runs in a fresh temporary
 * directory (with links to the tree's canopies/, payloads/ and tests/), the
 * output transaction's reservation (which makes the temporary), write and
 * commit are replaced at link time (-Wl,--wrap) by stubs that only check the
 * name or read the buffer, and options that write files by other routes
 * (--plot, --samples) are refused before the run, as are Monte Carlo runs of
 * more than a few hundred samples. */
#define _DEFAULT_SOURCE
#include <fcntl.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli/cli.h"
#include "base/error.h"
#include "output/txn.h"
#include "fuzz.h"

#define MAX_ARGS 64

static FILE *devnull;

/* Long options that write files other than by sr_txn_write (--plot: a
 * rendered figure; --samples: streamed; fit's --write-canopy and
 * --write-wind); commands that add such options add them here. An
 * abbreviation counts, as getopt_long accepts it ("--sam" for --samples). */
static const char *const WRITERS[] = {"plot", "plot-format", "plot-size", "samples", "write-canopy", "write-wind", NULL};

/* The reservation makes a temporary (and directories) where an argument
 * points: while fuzzing, only its checks of the name itself. */
int __wrap_sr_txn_reserve(sr_txn *t, const char *what, const char *path, unsigned flags, sr_error *err);
int __wrap_sr_txn_reserve(sr_txn *t, const char *what, const char *path, unsigned flags, sr_error *err)
{
    (void)t;
    (void)flags;
    if (!path || !*path)
        return sr_error_set(err, SR_EINVAL, "%s: empty output file name", what ? what : "");
    if (path[strlen(path) - 1] == '/')
        return sr_error_set(err, SR_EINVAL, "%s: %s: is a directory name, not a file", what ? what : "", path);
    return SR_OK;
}

int __wrap_sr_txn_write(sr_txn *t, const char *path, const void *data, size_t len, sr_error *err);
int __wrap_sr_txn_write(sr_txn *t, const char *path, const void *data, size_t len, sr_error *err)
{
    (void)t;
    if (!path || !*path)
        return sr_error_set(err, SR_EINVAL, "empty output file name");
    /* read every byte, so a bad buffer still shows under the sanitizers */
    volatile unsigned char sum = 0;
    for (size_t i = 0; i < len; i++)
        sum = (unsigned char)(sum + ((const unsigned char *)data)[i]);
    (void)sum;
    return SR_OK;
}

int __wrap_sr_txn_commit(sr_txn *t, sr_error *err);
int __wrap_sr_txn_commit(sr_txn *t, sr_error *err)
{
    (void)t;
    (void)err;
    return SR_OK;
}

static char workdir[] = "/tmp/sinkrate-fuzz-XXXXXX";
static const char *const LINKS[] = {"canopies", "payloads", "tests", NULL};

static void cleanup(void)
{
    for (const char *const *l = LINKS; *l; l++) {
        char p[sizeof workdir + 32];
        snprintf(p, sizeof p, "%s/%s", workdir, *l);
        unlink(p);
    }
    rmdir(workdir);
}

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    setenv("SINKRATE_DATA", SR_SOURCE_ROOT, 1);
    devnull = fopen("/dev/null", "w");
    /* a file argument of /dev/stdin must read nothing rather than wait */
    int fd = open("/dev/null", O_RDONLY);
    if (!devnull || fd < 0 || dup2(fd, 0) < 0)
        abort();
    close(fd);
    /* the temporary directory sees the tree's inputs through links, so
     * arguments such as payloads/x.yaml work as in the source tree */
    if (!mkdtemp(workdir) || chdir(workdir) != 0)
        abort();
    for (const char *const *l = LINKS; *l; l++) {
        char target[4096];
        snprintf(target, sizeof target, "%s/%s", SR_SOURCE_ROOT, *l);
        if (symlink(target, *l) != 0)
            abort();
    }
    atexit(cleanup);
    return 0;
}

/* Does argument a name (or abbreviate, as getopt_long allows) a writer? */
static int writes_files(const char *a)
{
    if (a[0] != '-' || a[1] != '-' || a[2] == '\0')
        return 0;
    size_t n = strcspn(a + 2, "=");
    for (const char *const *w = WRITERS; *w; w++)
        if (n <= strlen(*w) && strncmp(a + 2, *w, n) == 0)
            return 1;
    return 0;
}

/* A Monte Carlo run is as long as its sample count: up to 10 million, and
 * 10 000 by default, minutes under the sanitizers with --full. Such inputs
 * are skipped (a fuzzing timeout would only say the work is large): a
 * dispersion runs here only with -n given, at most MAX_SAMPLES. */
#define MAX_SAMPLES 500
/* A design search is as long as its space: every family of the catalog for
 * two stages is seconds, minutes under the sanitizers; such inputs (and a
 * risk check above MAX_SAMPLES) are skipped too. */
static int design_too_long(int argc, char **argv)
{
    for (int i = 2; i < argc && strcmp(argv[i], "--") != 0; i++) {
        if (strstr(argv[i], "all") || strstr(argv[i], "class:") || strstr(argv[i], "--grid") ||
            (strstr(argv[i], "..") && strchr(argv[i], '/')))
            return 1;
        if (strncmp(argv[i], "--risk-samples", 14) == 0) {
            const char *n = argv[i][14] == '=' ? argv[i] + 15 : i + 1 < argc ? argv[i + 1] : "";
            char *end;
            double v = strtod(n, &end);
            if (end != n && !(v <= MAX_SAMPLES))
                return 1;
        }
    }
    return 0;
}

static int too_long(int argc, char **argv)
{
    if (argc >= 2 && strcmp(argv[1], "design") == 0)
        return design_too_long(argc, argv);
    if (argc < 2 || strcmp(argv[1], "dispersion") != 0)
        return 0;
    const char *n = NULL;
    for (int i = 2; i < argc && strcmp(argv[i], "--") != 0; i++)
        if (strncmp(argv[i], "-n", 2) == 0)
            n = argv[i][2] ? argv[i] + 2 : i + 1 < argc ? argv[i + 1] : NULL;
    if (!n)
        return 1;
    char *end;
    double v = strtod(n, &end);
    return end != n && !(v <= MAX_SAMPLES); /* not a number: refused at once by the command */
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (size > 8192)
        return 0;
    char *buf = malloc(size + 1);
    if (!buf)
        return 0;
    memcpy(buf, data, size);
    buf[size] = '\0';
    char *argv[MAX_ARGS + 2];
    int argc = 0;
    argv[argc++] = "sinkrate";
    char *p = buf, *end = buf + size;
    while (p <= end && argc < MAX_ARGS + 1) {
        char *q = p;
        while (q < end && *q != '\0' && *q != '\n')
            q++;
        *q = '\0';
        argv[argc++] = p;
        p = q + 1;
    }
    argv[argc] = NULL;
    for (int i = 1; i < argc; i++)
        if (writes_files(argv[i])) {
            free(buf);
            return 0;
        }
    if (too_long(argc, argv)) {
        free(buf);
        return 0;
    }
    char *eb = NULL;
    size_t el = 0;
    FILE *err = open_memstream(&eb, &el);
    if (!err) {
        free(buf);
        return 0;
    }
    int rc = sr_cli_run(argc, argv, devnull, err);
    fclose(err);
    FUZZ_ASSERT(rc == 0 || rc == 1 || rc == 2);
    /* a failure always says why, on printable lines */
    FUZZ_ASSERT(rc == 0 || el > 0);
    for (size_t i = 0; i < el; i++)
        FUZZ_ASSERT(eb[i] == '\n' || ((unsigned char)eb[i] >= 0x20 && eb[i] != 0x7f));
    free(eb);
    free(buf);
    return 0;
}
