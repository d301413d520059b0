/* testutil.c - the validation log and the in-process CLI runner for tests. */
#define _DEFAULT_SOURCE
#include "testutil.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli/cli.h"

void sr_test_check(const char *file, int line, const char *quantity, const char *source, double expected,
                   double got, double tol, int absolute)
{
    double dev = fabs(got - expected);
    double lim = absolute ? tol : tol * fabs(expected);
    int ok = isfinite(got) && dev <= lim;
    const char *log = getenv("SR_VALIDATION_LOG");
    if (log) {
        FILE *f = fopen(log, "a");
        if (f) {
            const char *base = strrchr(file, '/');
            fprintf(f, "%s\t%s\t%s\t%.10g\t%.10g\t%s%.3g\t%s\n", base ? base + 1 : file, quantity, source,
                    expected, got, absolute ? "abs " : "rel ", tol, ok ? "pass" : "FAIL");
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
