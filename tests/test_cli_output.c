/* test_cli_output.c - a run succeeds whole or leaves every existing file as
 * it was: standard output on a full device or a closed pipe, a gnuplot that
 * fails, is killed or writes half a figure (a fake one on PATH), a signal to
 * the running program (the built binary, forked), outputs checked before any
 * work, nested new directories, links and long names, and the figure
 * script's bytes at any thread count. */
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
#include <time.h>
#include <unistd.h>

#include "cli/cli.h"
#include "output/fileio.h"
#include "testutil.h"

static char dir[64];
static char bin[4096];    /* the built sinkrate next to this test's directory */
static char fakes[4200];  /* a directory holding the fake gnuplot */
static char fake_png[4200];
static char mission[4200];

static const char *at(const char *name)
{
    static char buf[16][4200];
    static int k;
    char *b = buf[k++ % 16];
    snprintf(b, 4200, "%s/%s", dir, name);
    return b;
}

static void put(const char *path, const void *data, size_t len)
{
    FILE *f = fopen(path, "wb");
    assert_non_null(f);
    assert_int_equal(fwrite(data, 1, len, f), len);
    fclose(f);
}

/* The smallest PNG: signature, IHDR of 1x1, one IDAT, IEND (ISO/IEC 15948:2004 sec. 5). */
static const unsigned char PNG[] = {
    0x89, 'P', 'N', 'G', 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 'I', 'H', 'D', 'R', 0, 0, 0, 1, 0, 0, 0, 1, 8, 2, 0,
    0, 0, 0x90, 0x77, 0x53, 0xde, 0, 0, 0, 12, 'I', 'D', 'A', 'T', 0x08, 0xd7, 0x63, 0xf8, 0xcf, 0xc0, 0, 0, 0x03,
    0x01, 0x01, 0, 0x18, 0xdd, 0x8d, 0xb0, 0, 0, 0, 0, 'I', 'E', 'N', 'D', 0xae, 0x42, 0x60, 0x82};

/* A gnuplot stand-in: FAKE_GNUPLOT says what it does with the figure file
 * named by the outfile='...' it is given. */
static const char FAKE[] =
    "#!/bin/sh\n"
    "o=$(printf '%s' \"$2\" | sed -n \"s/.*outfile='\\([^']*\\)'.*/\\1/p\")\n"
    "case \"$FAKE_GNUPLOT\" in\n"
    "ok) cat \"$FAKE_PNG\" > \"$o\" ;;\n"
    "fail) echo \"\\\"x.gp\\\" line 3: undefined variable: foo\" >&2; exit 1 ;;\n"
    "kill) kill -9 $$ ;;\n"
    "half) head -c 40 \"$FAKE_PNG\" > \"$o\" ;;\n"
    "sleep) echo $$ > \"$FAKE_PID\"; exec sleep 60 ;;\n"
    "esac\n";

static int setup(void **state)
{
    (void)state;
    snprintf(dir, sizeof dir, "/tmp/sinkrate-cliout-XXXXXX");
    if (!mkdtemp(dir))
        return -1;
    char exe[4096];
    ssize_t n = readlink("/proc/self/exe", exe, sizeof exe - 1);
    if (n <= 0)
        return -1;
    exe[n] = '\0';
    *strrchr(exe, '/') = '\0'; /* B/tests */
    *strrchr(exe, '/') = '\0'; /* B */
    snprintf(bin, sizeof bin, "%s/sinkrate", exe);
    snprintf(fakes, sizeof fakes, "%s/fakes", dir);
    mkdir(fakes, 0755);
    char p[4300];
    snprintf(p, sizeof p, "%s/gnuplot", fakes);
    put(p, FAKE, strlen(FAKE));
    chmod(p, 0755);
    snprintf(fake_png, sizeof fake_png, "%s/fake.png", fakes);
    put(fake_png, PNG, sizeof PNG);
    setenv("FAKE_PNG", fake_png, 1);
    snprintf(mission, sizeof mission, "%s", sr_test_path("payloads/desert-club-rocket.yaml"));
    return 0;
}

static int teardown(void **state)
{
    (void)state;
    sr_test_rmtree(dir);
    return 0;
}

/* A fresh, empty work directory under dir. */
static const char *workdir(const char *name)
{
    const char *w = at(name);
    sr_test_rmtree(w);
    assert_int_equal(mkdir(w, 0755), 0);
    return w;
}

/* ---- standard output ---- */

/* A write or flush error on standard output is exit 2 with one line, and
 * the run's files stay as they were (here: none is made). */
static void test_stdout_full(void **state)
{
    (void)state;
    if (access("/dev/full", W_OK) != 0) {
        print_message("no /dev/full here: skipped\n");
        return;
    }
    const char *w = workdir("full");
    char fig[4300];
    snprintf(fig, sizeof fig, "%s/new/fig", w);
    const char *LINES[][8] = {
        {"air"},
        {"air", "--help"},
        {"--help"},
        {"--version"},
        {"canopies"},
        {"profile", mission, "--fast"},
        {"check", mission},
        {"sweep", "--mass", "2 kg", "--family", "conical", "--nominal-diameter", "1.5 m"},
        {"freefall", "--mass", "1 kg", "--diameter", "10 cm", "--plot", fig},
    };
    for (size_t i = 0; i < sizeof LINES / sizeof LINES[0]; i++) {
        char *argv[10];
        int argc = 0;
        argv[argc++] = "sinkrate";
        for (size_t k = 0; k < 8 && LINES[i][k]; k++)
            argv[argc++] = (char *)LINES[i][k];
        argv[argc] = NULL;
        FILE *out = fopen("/dev/full", "w");
        assert_non_null(out);
        char *eb = NULL;
        size_t el = 0;
        FILE *err = open_memstream(&eb, &el);
        char *old = strdup(getenv("PATH"));
        setenv("PATH", "/nonexistent", 1); /* the figure needs no gnuplot here */
        int rc = sr_cli_run(argc, argv, out, err);
        setenv("PATH", old, 1);
        free(old);
        fclose(err);
        fclose(out);
        if (rc != 2 || sr_test_lines(eb) != 1 || !strstr(eb, "standard output: No space left on device"))
            print_error("stdout row %zu (%s): rc %d, stderr '%s'\n", i, argv[1], rc, eb);
        assert_int_equal(rc, 2);
        assert_int_equal(sr_test_lines(eb), 1);
        assert_non_null(strstr(eb, "standard output: No space left on device"));
        free(eb);
        assert_int_equal(sr_test_entries(w), 0);
    }
}

/* Run the built program with stdout on a pipe whose reader has gone. */
static int run_closed_pipe(int ignore_pipe, char *err, size_t errlen)
{
    int p[2];
    assert_int_equal(pipe(p), 0);
    close(p[0]);
    char errfile[4300];
    snprintf(errfile, sizeof errfile, "%s/pipe.err", dir);
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int fd = open(errfile, O_WRONLY | O_CREAT | O_TRUNC, 0644);
        dup2(p[1], 1);
        dup2(fd, 2);
        signal(SIGPIPE, ignore_pipe ? SIG_IGN : SIG_DFL);
        execl(bin, "sinkrate", "air", (char *)NULL);
        _exit(127);
    }
    close(p[1]);
    int status;
    assert_int_equal(waitpid(pid, &status, 0), pid);
    char *e = sr_test_slurp(errfile, NULL);
    snprintf(err, errlen, "%s", e ? e : "");
    free(e);
    unlink(errfile);
    return status;
}

/* With SIGPIPE ignored, a closed pipe is a write error: exit 2, one line.
 * At its default, the program ends by SIGPIPE, silently, as tools do. */
static void test_stdout_closed_pipe(void **state)
{
    (void)state;
    char err[1024];
    int status = run_closed_pipe(1, err, sizeof err);
    if (!WIFEXITED(status) || WEXITSTATUS(status) != 2 || !strstr(err, "standard output: Broken pipe"))
        print_error("closed pipe, SIGPIPE ignored: status %d, stderr '%s'\n", status, err);
    assert_true(WIFEXITED(status) && WEXITSTATUS(status) == 2);
    assert_int_equal(sr_test_lines(err), 1);
    assert_non_null(strstr(err, "sinkrate air: standard output: Broken pipe"));
    status = run_closed_pipe(0, err, sizeof err);
    assert_true(WIFSIGNALED(status) && WTERMSIG(status) == SIGPIPE);
    assert_string_equal(err, "");
}

/* ---- figures: a fake gnuplot that fails ---- */

typedef struct snap {
    char name[64];
    char *data;
    size_t len;
} snap;

/* Every file of a work directory and its bytes. */
static size_t snapshot(const char *w, snap *s, size_t max)
{
    DIR *h = opendir(w);
    assert_non_null(h);
    size_t n = 0;
    struct dirent *e;
    while ((e = readdir(h)) != NULL && n < max) {
        if (e->d_name[0] == '.')
            continue;
        snprintf(s[n].name, sizeof s[n].name, "%s", e->d_name);
        char p[4300];
        snprintf(p, sizeof p, "%s/%s", w, e->d_name);
        s[n].data = sr_test_slurp(p, &s[n].len);
        assert_non_null(s[n].data);
        n++;
    }
    closedir(h);
    return n;
}

static void same_as(const char *w, snap *s, size_t n)
{
    assert_int_equal(sr_test_entries(w), (int)n);
    for (size_t i = 0; i < n; i++) {
        char p[4300];
        snprintf(p, sizeof p, "%s/%s", w, s[i].name);
        size_t len = 0;
        char *now = sr_test_slurp(p, &len);
        if (!now || len != s[i].len || memcmp(now, s[i].data, len) != 0)
            print_error("%s changed\n", s[i].name);
        assert_true(now && len == s[i].len && memcmp(now, s[i].data, len) == 0);
        free(now);
        free(s[i].data);
    }
}

static int run_with_fake(const char *mode, char **out, char **err, int argc, char **argv)
{
    char *old = strdup(getenv("PATH")), path[8600];
    snprintf(path, sizeof path, "%s:%s", fakes, old); /* the fake first; sed, cat, head after it */
    setenv("PATH", path, 1);
    setenv("FAKE_GNUPLOT", mode, 1);
    int rc = sr_test_cli_argv(out, err, argc, argv);
    setenv("PATH", old, 1);
    free(old);
    return rc;
}

/* A first run in --units us puts every file in place; the same run in SI
 * with gnuplot failing must leave each of them, byte for byte. */
static void test_gnuplot_fails(void **state)
{
    (void)state;
    const char *w = workdir("fig");
    char o[4300], s[4300], fig[4300];
    snprintf(o, sizeof o, "%s/report.txt", w);
    snprintf(s, sizeof s, "%s/samples.csv", w);
    snprintf(fig, sizeof fig, "%s/disp", w);
    char *argv[] = {"sinkrate", "dispersion", mission, "-n", "50", "--seed", "4", "-o", o, "--samples", s,
                    "--plot", fig, "--units", "us", NULL};
    int argc = 15;
    char *out, *err;
    int rc = run_with_fake("ok", &out, &err, argc, argv);
    if (rc != 1)
        print_error("first run: rc %d: %s\n", rc, err);
    assert_int_equal(rc, 1);
    assert_non_null(strstr(err, "wrote"));
    free(out);
    free(err);
    snap before[16];
    size_t n = snapshot(w, before, 16);
    assert_int_equal(n, 5); /* report, samples, .dat, .gp, .png */
    static const struct {
        const char *mode, *msg;
    } ROWS[] = {
        {"fail", "gnuplot rejected"},
        {"kill", "gnuplot stopped by signal 9"},
        {"half", "gnuplot wrote an incomplete PNG figure"},
    };
    for (size_t i = 0; i < sizeof ROWS / sizeof ROWS[0]; i++) {
        /* afresh: getopt_long reorders the array it is given */
        char *args[] = {"sinkrate", "dispersion", mission, "-n", "50", "--seed", "4", "-o", o, "--samples", s,
                        "--plot", fig, "--units", "si", NULL};
        memcpy(argv, args, sizeof args);
        rc = run_with_fake(ROWS[i].mode, &out, &err, argc, argv);
        if (rc != 2 || sr_test_lines(err) != 1 || !strstr(err, ROWS[i].msg))
            print_error("gnuplot %s: rc %d, stderr '%s'\n", ROWS[i].mode, rc, err);
        assert_int_equal(rc, 2);
        assert_int_equal(sr_test_lines(err), 1);
        assert_non_null(strstr(err, ROWS[i].msg));
        assert_null(strstr(err, ": wrote "));
        assert_string_equal(out, "");
        free(out);
        free(err);
        snap again[16];
        size_t m = snapshot(w, again, 16);
        for (size_t k = 0; k < m; k++)
            free(again[k].data);
        assert_int_equal(m, n);
    }
    same_as(w, before, n);
}

/* ---- checked before any work ---- */

static void one_line_exit2(int argc, char **argv, const char *phrase)
{
    char *out, *err;
    int rc = sr_test_cli_argv(&out, &err, argc, argv);
    if (rc != 2 || sr_test_lines(err) != 1 || !strstr(err, phrase))
        print_error("%s %s: rc %d, stderr '%s'\n", argv[1], argv[2], rc, err);
    assert_int_equal(rc, 2);
    assert_int_equal(sr_test_lines(err), 1);
    assert_non_null(strstr(err, phrase));
    assert_string_equal(out, "");
    free(out);
    free(err);
}

/* The second figure's file is a directory: refused before the profile is
 * computed, and -o is not touched. */
static void test_second_figure_checked_first(void **state)
{
    (void)state;
    const char *w = workdir("track");
    char o[4300], fig[4300], blocker[4300];
    snprintf(o, sizeof o, "%s/r.txt", w);
    snprintf(fig, sizeof fig, "%s/tr/fig", w);
    snprintf(blocker, sizeof blocker, "%s/tr", w);
    mkdir(blocker, 0755);
    snprintf(blocker, sizeof blocker, "%s/tr/fig-track.dat", w);
    mkdir(blocker, 0755);
    put(o, "old\n", 4);
    char *argv[] = {"sinkrate", "profile", mission, "--plot", fig, "-o", o, NULL};
    one_line_exit2(7, argv, "fig-track.dat: is a directory");
    char *now = sr_test_slurp(o, NULL);
    assert_string_equal(now, "old\n");
    free(now);
    assert_int_equal(sr_test_entries(w), 3);
}

/* 40 new directories for a figure, then a failure: none stays. */
static void test_nested_directories_removed(void **state)
{
    (void)state;
    const char *w = workdir("deep");
    char fig[4300];
    size_t n = (size_t)snprintf(fig, sizeof fig, "%s", w);
    for (int i = 0; i < 40; i++)
        n += (size_t)snprintf(fig + n, sizeof fig - n, "/d%d", i);
    snprintf(fig + n, sizeof fig - n, "/fig");
    char *argv[] = {"sinkrate", "dispersion", mission, "--plot", fig, "-n", "0", NULL};
    one_line_exit2(7, argv, "-n");
    assert_int_equal(sr_test_entries(w), 0);
}

/* -o through a dangling link writes the file it names (the link stays);
 * a 250-byte name works although its temporary needs a suffix. */
static void test_link_and_long_name(void **state)
{
    (void)state;
    const char *w = workdir("names");
    char link[4300], target[4300], longname[4300];
    snprintf(link, sizeof link, "%s/link.txt", w);
    snprintf(target, sizeof target, "%s/target.txt", w);
    assert_int_equal(symlink("target.txt", link), 0);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "air", "-o", link, NULL), 0);
    free(out);
    free(err);
    struct stat st;
    assert_int_equal(lstat(link, &st), 0);
    assert_true(S_ISLNK(st.st_mode));
    assert_true(sr_test_file_has(target, "CAUTION"));
    size_t n = (size_t)snprintf(longname, sizeof longname, "%s/", w);
    memset(longname + n, 'r', 250);
    longname[n + 250] = '\0';
    assert_int_equal(sr_test_cli(&out, &err, "air", "-o", longname, NULL), 0);
    free(out);
    free(err);
    assert_true(sr_test_file_has(longname, "CAUTION"));
    assert_int_equal(sr_test_entries(w), 3);
}

/* The figure's script records the command line without --threads: the
 * same bytes at any thread count. */
static void test_script_same_at_any_thread_count(void **state)
{
    (void)state;
    const char *w = workdir("threads");
    char fig[4300], gp[4300];
    snprintf(fig, sizeof fig, "%s/fig", w);
    snprintf(gp, sizeof gp, "%s/fig.gp", w);
    char *first = NULL;
    size_t flen = 0;
    const char *T[] = {"1", "3"};
    for (int k = 0; k < 2; k++) {
        char *out, *err;
        char *old = strdup(getenv("PATH"));
        setenv("PATH", "/nonexistent", 1);
        int rc = sr_test_cli(&out, &err, "dispersion", mission, "-n", "100", "--threads", T[k], "--plot", fig, NULL);
        setenv("PATH", old, 1);
        free(old);
        assert_int_equal(rc, 1);
        free(out);
        free(err);
        size_t len = 0;
        char *now = sr_test_slurp(gp, &len);
        assert_non_null(now);
        assert_null(strstr(now, "--threads"));
        if (k == 0) {
            first = now;
            flen = len;
        } else {
            assert_true(len == flen && memcmp(now, first, len) == 0);
            free(now);
        }
    }
    free(first);
}

/* ---- signals to the running program ---- */

static int wait_for(pid_t pid, int *status, double seconds)
{
    struct timespec ts = {0, 20 * 1000 * 1000};
    for (double t = 0; t < seconds; t += 0.02) {
        pid_t r = waitpid(pid, status, WNOHANG);
        if (r == pid)
            return 1;
        nanosleep(&ts, NULL);
    }
    return 0;
}

/* Start the program on argv with stderr to a file; wait until the work
 * directory holds `want` entries (its temporaries are made before the work). */
static pid_t start(char **argv, const char *w, int want, const char *errfile)
{
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int fd = open(errfile, O_WRONLY | O_CREAT | O_TRUNC, 0644);
        int nul = open("/dev/null", O_WRONLY);
        dup2(nul, 1);
        dup2(fd, 2);
        /* the signals as a terminal would deliver them, whatever this test inherited */
        sigset_t none;
        sigemptyset(&none);
        sigprocmask(SIG_SETMASK, &none, NULL);
        signal(SIGINT, SIG_DFL);
        signal(SIGTERM, SIG_DFL);
        signal(SIGHUP, SIG_DFL);
        execv(bin, argv);
        _exit(127);
    }
    struct timespec ts = {0, 10 * 1000 * 1000};
    for (int i = 0; i < 2000 && sr_test_entries(w) < want; i++)
        nanosleep(&ts, NULL);
    return pid;
}

/* SIGINT, SIGTERM and SIGHUP during a long dispersion: exit 130, 143, 129,
 * one line; no temporary, no new directory, the old files as they were. */
static void test_signal_during_work(void **state)
{
    (void)state;
    static const struct {
        int sig, code;
        const char *name;
    } SIGS[] = {{SIGINT, 130, "SIGINT"}, {SIGTERM, 143, "SIGTERM"}, {SIGHUP, 129, "SIGHUP"}};
    const char *w = workdir("signal");
    char o[4300], s[4300], fig[4300], errfile[4300];
    snprintf(o, sizeof o, "%s/report.txt", w);
    snprintf(s, sizeof s, "%s/samples.csv", w);
    snprintf(fig, sizeof fig, "%s/new/dir/fig", w);
    snprintf(errfile, sizeof errfile, "%s/signal.err", dir);
    put(o, "old report\n", 11);
    for (size_t i = 0; i < sizeof SIGS / sizeof SIGS[0]; i++) {
        char *argv[] = {"sinkrate", "dispersion", mission, "--full", "-n", "1000000", "--threads", "1", "-o", o,
                        "--samples", s, "--plot", fig, NULL};
        /* report.txt, its temporary, samples' temporary, new, new/dir and the figure's three */
        pid_t pid = start(argv, w, 8, errfile);
        assert_int_equal(sr_test_entries(w), 8);
        kill(pid, SIGS[i].sig);
        int status = 0;
        if (!wait_for(pid, &status, 30)) {
            kill(pid, SIGKILL);
            waitpid(pid, &status, 0);
            fail_msg("%s did not stop the run", SIGS[i].name);
        }
        char *err = sr_test_slurp(errfile, NULL);
        if (!WIFEXITED(status) || WEXITSTATUS(status) != SIGS[i].code)
            print_error("%s: status %d, stderr '%s'\n", SIGS[i].name, status, err);
        assert_true(WIFEXITED(status));
        assert_int_equal(WEXITSTATUS(status), SIGS[i].code);
        assert_non_null(strstr(err, "stopped by"));
        assert_non_null(strstr(err, SIGS[i].name));
        assert_non_null(strstr(err, "no file was written or changed"));
        free(err);
        assert_int_equal(sr_test_entries(w), 1);
        char *now = sr_test_slurp(o, NULL);
        assert_string_equal(now, "old report\n");
        free(now);
    }
}

/* SIGINT while gnuplot draws: gnuplot is stopped too, nothing is left. */
static void test_signal_while_drawing(void **state)
{
    (void)state;
    const char *w = workdir("drawing");
    char fig[4300], errfile[4300], pidfile[4300], path[8600];
    snprintf(fig, sizeof fig, "%s/fig", w);
    snprintf(errfile, sizeof errfile, "%s/drawing.err", dir);
    snprintf(pidfile, sizeof pidfile, "%s/gnuplot.pid", dir);
    unlink(pidfile);
    snprintf(path, sizeof path, "%s:%s", fakes, getenv("PATH"));
    setenv("FAKE_GNUPLOT", "sleep", 1);
    setenv("FAKE_PID", pidfile, 1);
    char *old = strdup(getenv("PATH"));
    setenv("PATH", path, 1);
    char *argv[] = {"sinkrate", "freefall", "--mass", "1 kg", "--diameter", "10 cm", "--plot", fig, NULL};
    pid_t pid = start(argv, w, 3, errfile);
    setenv("PATH", old, 1);
    free(old);
    struct timespec ts = {0, 10 * 1000 * 1000};
    for (int i = 0; i < 2000 && access(pidfile, R_OK) != 0; i++)
        nanosleep(&ts, NULL);
    char *gp = sr_test_slurp(pidfile, NULL);
    assert_non_null(gp);
    pid_t child = (pid_t)atol(gp);
    free(gp);
    kill(pid, SIGINT);
    int status = 0;
    if (!wait_for(pid, &status, 30)) {
        kill(pid, SIGKILL);
        kill(child, SIGKILL);
        fail_msg("SIGINT did not stop the run");
    }
    assert_true(WIFEXITED(status) && WEXITSTATUS(status) == 130);
    assert_int_equal(sr_test_entries(w), 0);
    /* the fake gnuplot is gone (or a zombie nobody has reaped yet) */
    char stat_path[64], st[512] = "";
    snprintf(stat_path, sizeof stat_path, "/proc/%ld/stat", (long)child);
    FILE *f = fopen(stat_path, "r");
    if (f) {
        if (!fgets(st, sizeof st, f))
            st[0] = '\0';
        fclose(f);
        const char *close = strrchr(st, ')');
        assert_true(close && close[1] == ' ' && close[2] == 'Z');
    }
    unlink(pidfile);
}

/* A control character in a file name reaches the report only escaped. */
static void test_control_characters_escaped(void **state)
{
    (void)state;
    const char *w = workdir("escapes");
    char snd[4300];
    snprintf(snd, sizeof snd, "%s/s\x1b[31mred\x07.csv", w);
    const char *csv = "altitude [m],temperature [C],pressure [hPa]\n0,15,1013.25\n1000,8.5,898.7\n";
    put(snd, csv, strlen(csv));
    const char *F[] = {"text", "csv", "json"};
    for (int k = 0; k < 3; k++) {
        char *out, *err;
        assert_int_equal(sr_test_cli(&out, &err, "air", "--sounding", snd, "--format", F[k], NULL), 0);
        assert_null(strchr(out, 0x1b));
        assert_null(strchr(out, 0x07));
        if (k == 0) /* JSON escapes the backslash once more */
            assert_non_null(strstr(out, "s\\e[31mred\\x07.csv"));
        free(out);
        free(err);
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_stdout_full),
        cmocka_unit_test(test_stdout_closed_pipe),
        cmocka_unit_test(test_gnuplot_fails),
        cmocka_unit_test(test_second_figure_checked_first),
        cmocka_unit_test(test_nested_directories_removed),
        cmocka_unit_test(test_link_and_long_name),
        cmocka_unit_test(test_script_same_at_any_thread_count),
        cmocka_unit_test(test_control_characters_escaped),
        cmocka_unit_test(test_signal_during_work),
        cmocka_unit_test(test_signal_while_drawing),
    };
    return cmocka_run_group_tests_name("cli_output", tests, setup, teardown);
}
