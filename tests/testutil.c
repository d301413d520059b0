/* testutil.c - the validation log, the in-process CLI runner and the set-up
 * tests share (the catalog, missions, temporary directories). */
#define _DEFAULT_SOURCE
#include "testutil.h"

#include <dirent.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "base/fileread.h"
#include "cli/cli.h"

const char *sr_test_class_name(sr_check_class c)
{
    static const char *const NAMES[] = {"unclassified", "published", "reference library", "independent method",
                                        "our derivation", "consistency", "common practice", "from memory",
                                        "format"};
    return (unsigned)c < sizeof NAMES / sizeof NAMES[0] ? NAMES[c] : "unclassified";
}

void sr_test_check(const char *file, int line, sr_check_class cls, const char *quantity, const char *source,
                   double expected, double got, double tol, int absolute)
{
    double dev = fabs(got - expected);
    double lim = absolute ? tol : tol * fabs(expected);
    int ok = isfinite(got) && dev <= lim;
    /* the rules scripts/validation.py enforces on the log, caught here at the line */
    const char *why = NULL;
    int outside = cls == SR_CHECK_PUBLISHED || cls == SR_CHECK_LIBRARY || cls == SR_CHECK_METHOD;
    if (cls <= SR_CHECK_UNCLASSIFIED || cls > SR_CHECK_FORMAT)
        why = "a validation check needs its class";
    else if (!source || strlen(source) < 4)
        why = "a validation check needs its source";
    else if (outside && strstr(source, "from memory"))
        why = "a value from memory is not an outside check: class it SR_CHECK_MEMORY";
    else if (cls == SR_CHECK_MEMORY && !strstr(source, "from memory"))
        why = "a check of class SR_CHECK_MEMORY says \"from memory\" in its source";
    else if (cls == SR_CHECK_TRADE && !strstr(source, "common practice"))
        why = "a check of class SR_CHECK_TRADE says \"common practice\" in its source";
    if (why) {
        print_error("%s:%d: %s: %s [source: %s]\n", file, line, quantity, why, source ? source : "(none)");
        fail();
    }
    const char *log = getenv("SR_VALIDATION_LOG");
    if (log) {
        FILE *f = fopen(log, "a");
        if (f) {
            const char *base = strrchr(file, '/');
            fprintf(f, "%s\t%s\t%s\t%.10g\t%.10g\t%s%.3g\t%s\t%s\n", base ? base + 1 : file, quantity, source,
                    expected, got, absolute ? "abs " : "rel ", tol, ok ? "pass" : "FAIL", sr_test_class_name(cls));
            fclose(f);
        }
    }
    if (!ok) {
        print_error("%s:%d: %s: expected %.10g, got %.10g (tolerance %s %.3g) [source: %s]\n", file, line,
                    quantity, expected, got, absolute ? "abs" : "rel", tol, source);
        fail();
    }
}

static char *slurp_memstream(char *buf)
{
    return buf ? buf : strdup("");
}

int sr_test_cli_argv(char **out, char **err, int argc, char **argv)
{
    char *ob = NULL, *eb = NULL;
    size_t ol = 0, el = 0;
    FILE *fo = open_memstream(&ob, &ol);
    FILE *fe = open_memstream(&eb, &el);
    int rc = sr_cli_run(argc, argv, fo, fe);
    fclose(fo);
    fclose(fe);
    if (out)
        *out = slurp_memstream(ob);
    else
        free(ob);
    if (err)
        *err = slurp_memstream(eb);
    else
        free(eb);
    return rc;
}

int sr_test_cli(char **out, char **err, ...)
{
    char *argv[128];
    int argc = 0;
    argv[argc++] = "sinkrate";
    va_list ap;
    va_start(ap, err);
    const char *a;
    while ((a = va_arg(ap, const char *)) != NULL && argc < 127)
        argv[argc++] = (char *)a;
    va_end(ap);
    argv[argc] = NULL;
    return sr_test_cli_argv(out, err, argc, argv);
}

const char *sr_test_path(const char *rel)
{
    static char buf[8][4096];
    static int k;
    const char *root = getenv("SR_ROOT");
    char *b = buf[k++ % 8];
    snprintf(b, 4096, "%s/%s", root ? root : ".", rel);
    return b;
}

/* Temporary files are removed when the test program exits. */
static char **tmp_made;
static size_t tmp_n;

static void tmp_cleanup(void)
{
    for (size_t i = 0; i < tmp_n; i++) {
        unlink(tmp_made[i]);
        free(tmp_made[i]);
    }
    free(tmp_made);
    tmp_made = NULL;
    tmp_n = 0;
}

const char *sr_test_tmpfile(const char *suffix, const char *text)
{
    static char buf[16][256];
    static int k;
    char *b = buf[k++ % 16];
    snprintf(b, 256, "/tmp/sinkrate-test-XXXXXX%s", suffix ? suffix : "");
    int fd = mkstemps(b, suffix ? (int)strlen(suffix) : 0);
    if (fd < 0)
        return NULL;
    char **grown = realloc(tmp_made, (tmp_n + 1) * sizeof *grown);
    if (grown) {
        if (tmp_n == 0)
            atexit(tmp_cleanup);
        tmp_made = grown;
        tmp_made[tmp_n] = strdup(b);
        if (tmp_made[tmp_n])
            tmp_n++;
    }
    size_t n = strlen(text);
    if (write(fd, text, n) != (ssize_t)n) {
        close(fd);
        return NULL;
    }
    close(fd);
    return b;
}

int sr_test_lines(const char *s)
{
    int n = 0;
    for (; *s; s++)
        if (*s == '\n')
            n++;
    return n;
}

int sr_test_png_size(const char *path, unsigned *w, unsigned *h)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return 0;
    unsigned char b[24];
    size_t n = fread(b, 1, sizeof b, f);
    fclose(f);
    static const unsigned char SIG[8] = {0x89, 'P', 'N', 'G', 0x0d, 0x0a, 0x1a, 0x0a};
    /* the first chunk is IHDR, 13 bytes long */
    if (n < 24 || memcmp(b, SIG, 8) != 0 || memcmp(b + 8, "\0\0\0\x0dIHDR", 8) != 0)
        return 0;
    *w = (unsigned)b[16] << 24 | (unsigned)b[17] << 16 | (unsigned)b[18] << 8 | b[19];
    *h = (unsigned)b[20] << 24 | (unsigned)b[21] << 16 | (unsigned)b[22] << 8 | b[23];
    return 1;
}

int sr_test_file_has(const char *path, const char *text)
{
    FILE *f = fopen(path, "r");
    if (!f)
        return 0;
    char line[4096];
    int found = 0;
    while (!found && fgets(line, sizeof line, f))
        found = strstr(line, text) != NULL;
    fclose(f);
    return found;
}

int sr_test_dat_rows(const char *path, const char *title)
{
    FILE *f = fopen(path, "r");
    if (!f)
        return -1;
    char line[4096];
    int in = 0, rows = -1;
    while (fgets(line, sizeof line, f)) {
        if (!in) {
            char *close = strncmp(line, "# [", 3) == 0 ? strstr(line, "] ") : NULL;
            if (close && strncmp(close + 2, title, strlen(title)) == 0) {
                in = 1;
                rows = 0;
            }
            continue;
        }
        if (line[0] == '\n')
            break;
        if (line[0] != '#')
            rows++;
    }
    fclose(f);
    return rows;
}

void sr_test_cli_figure(char **out, char **err, int hide, int argc, char **argv)
{
    char *old = strdup(getenv("PATH") ? getenv("PATH") : "");
    if (hide)
        setenv("PATH", "/nonexistent", 1);
    int rc = sr_test_cli_argv(out, err, argc, argv);
    setenv("PATH", old, 1);
    free(old);
    if (rc)
        fail_msg("exit %d: %s", rc, *err);
    if (hide && !strstr(*err, "gnuplot is not on PATH"))
        fail_msg("no note that gnuplot is missing: %s", *err);
    if (!hide && strstr(*err, "gnuplot:"))
        fail_msg("gnuplot warned: %s", *err);
}

void sr_test_check_figure(const char *prefix, int rendered, unsigned w, unsigned h, const char *what)
{
    char path[4200], q[256];
    snprintf(path, sizeof path, "%s.dat", prefix);
    assert_true(sr_test_file_has(path, "CAUTION"));
    snprintf(path, sizeof path, "%s.gp", prefix);
    assert_true(sr_test_file_has(path, "CAUTION"));
    assert_true(sr_test_file_has(path, "load style"));
    snprintf(path, sizeof path, "%s.png", prefix);
    unsigned pw = 0, ph = 0;
    if (!rendered) {
        assert_false(sr_test_png_size(path, &pw, &ph));
        return;
    }
    assert_true(sr_test_png_size(path, &pw, &ph));
    snprintf(q, sizeof q, "PNG width of the %s (--plot-size %ux%u)", what, w, h);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, q, SR_SRC_PNG, w, pw, 0);
    snprintf(q, sizeof q, "PNG height of the %s (--plot-size %ux%u)", what, w, h);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, q, SR_SRC_PNG, h, ph, 0);
}

/* ---- the set-up tests share ---- */

static sr_catalog *test_cat;

static void catalog_cleanup(void)
{
    sr_catalog_free(test_cat);
    test_cat = NULL;
}

const sr_catalog *sr_test_catalog(void)
{
    if (!test_cat) {
        sr_error *e = sr_error_new();
        if (sr_catalog_new(&test_cat, sr_test_path("canopies"), e))
            fail_msg("catalog: %s", sr_error_message(e));
        sr_error_free(e);
        atexit(catalog_cleanup);
    }
    return test_cat;
}

static sr_mission *mission_at(const char *path)
{
    sr_mission *m = NULL;
    sr_error *e = sr_error_new();
    if (sr_mission_open(&m, path, sr_test_catalog(), e))
        fail_msg("mission: %s", sr_error_message(e));
    sr_error_free(e);
    return m;
}

sr_mission *sr_test_mission_file(const char *rel)
{
    return mission_at(sr_test_path(rel));
}

sr_mission *sr_test_mission_text(const char *yaml)
{
    const char *p = sr_test_tmpfile(".yaml", yaml);
    if (!p)
        fail_msg("cannot write a temporary mission file");
    return mission_at(p);
}

char *sr_test_tmpdir(char *buf, size_t len, const char *what)
{
    snprintf(buf, len, "/tmp/sinkrate-%s-XXXXXX", what);
    if (!mkdtemp(buf))
        fail_msg("cannot make a temporary directory %s", buf);
    return buf;
}

void sr_test_rmtree(const char *dir)
{
    DIR *d = opendir(dir);
    if (d) {
        struct dirent *e;
        while ((e = readdir(d))) {
            if (strcmp(e->d_name, ".") == 0 || strcmp(e->d_name, "..") == 0)
                continue;
            char sub[4096];
            snprintf(sub, sizeof sub, "%s/%s", dir, e->d_name);
            struct stat st;
            if (lstat(sub, &st) == 0 && S_ISDIR(st.st_mode))
                sr_test_rmtree(sub);
            else
                unlink(sub);
        }
        closedir(d);
    }
    rmdir(dir);
}

char *sr_test_slurp(const char *path, size_t *len)
{
    char *data;
    size_t n;
    sr_error e;
    if (sr_file_read(path, 64u << 20, &data, &n, &e) != SR_OK)
        return NULL;
    if (len)
        *len = n;
    return data;
}

int sr_test_entries(const char *dir)
{
    DIR *h = opendir(dir);
    if (!h)
        return 0;
    int n = 0;
    struct dirent *e;
    while ((e = readdir(h)) != NULL) {
        if (strcmp(e->d_name, ".") == 0 || strcmp(e->d_name, "..") == 0)
            continue;
        n++;
        char sub[4200];
        snprintf(sub, sizeof sub, "%s/%s", dir, e->d_name);
        struct stat st;
        if (lstat(sub, &st) == 0 && S_ISDIR(st.st_mode))
            n += sr_test_entries(sub);
    }
    closedir(h);
    return n;
}
