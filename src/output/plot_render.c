/* plot_render.c - drawing a figure: gnuplot run on the script as the output
 * transaction's child, and the check that the figure it wrote is complete. */
#define _DEFAULT_SOURCE
#include "output/plot.h"

#include <errno.h>
#include <fcntl.h>
#include <signal.h>
#include <spawn.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "output/txn.h"

int sr_plot_find_gnuplot(char *path, size_t len)
{
    const char *env = getenv("PATH");
    if (!env || !*env)
        return 0;
    const char *p = env;
    while (1) {
        const char *end = strchr(p, ':');
        size_t n = end ? (size_t)(end - p) : strlen(p);
        char cand[4096];
        snprintf(cand, sizeof cand, "%.*s%sgnuplot", (int)n, n ? p : ".", "/");
        struct stat st;
        if (stat(cand, &st) == 0 && S_ISREG(st.st_mode) && access(cand, X_OK) == 0) {
            snprintf(path, len, "%s", cand);
            return 1;
        }
        if (!end)
            break;
        p = end + 1;
    }
    return 0;
}

/* The line of gnuplot's complaint that says what went wrong. */
static void gnuplot_message(const char *text, char *buf, size_t len)
{
    const char *best = NULL, *last = NULL;
    for (const char *p = text; *p;) {
        const char *e = strchr(p, '\n');
        size_t n = e ? (size_t)(e - p) : strlen(p);
        int blank = 1;
        for (size_t i = 0; i < n; i++)
            if (p[i] != ' ' && p[i] != '^' && p[i] != '\t')
                blank = 0;
        if (!blank) {
            last = p;
            if (!best) {
                for (size_t i = 0; i + 7 <= n; i++)
                    if (memcmp(p + i, "\" line ", 7) == 0) {
                        best = p;
                        break;
                    }
            }
        }
        if (!e)
            break;
        p = e + 1;
    }
    const char *s = best ? best : last;
    if (!s) {
        snprintf(buf, len, "no message");
        return;
    }
    const char *e = strchr(s, '\n');
    snprintf(buf, len, "%.*s", (int)(e ? (size_t)(e - s) : strlen(s)), s);
}

/* gnuplot names the script it ran by the temporary's name: say the file's. */
static void replace_all(char *s, size_t cap, const char *from, const char *to)
{
    size_t fl = strlen(from), tl = strlen(to);
    if (!fl)
        return;
    for (char *p = strstr(s, from); p; p = strstr(p + tl, from)) {
        size_t rest = strlen(p + fl);
        if ((size_t)(p - s) + tl + rest + 1 > cap)
            return;
        memmove(p + tl, p + fl, rest + 1);
        memcpy(p, to, tl);
    }
}

int sr_plot_check_image(const char *path, const char *format, const char *name, sr_error *err)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return sr_error_set(err, SR_EIO, "%s: cannot read: %s", name, strerror(errno));
    int ok = 0;
    if (strcmp(format, "png") == 0) {
        /* PNG (ISO/IEC 15948:2004) sec. 5.2 signature, 5.3 chunks (length, type, data, CRC), 11.2.5 IEND last */
        static const unsigned char SIG[8] = {0x89, 'P', 'N', 'G', 0x0d, 0x0a, 0x1a, 0x0a};
        unsigned char b[8];
        if (fread(b, 1, 8, f) == 8 && memcmp(b, SIG, 8) == 0) {
            long at = 8;
            for (int chunks = 0; chunks < 1000000; chunks++) {
                if (fseek(f, at, SEEK_SET) != 0 || fread(b, 1, 8, f) != 8)
                    break;
                unsigned long len = (unsigned long)b[0] << 24 | (unsigned long)b[1] << 16 | (unsigned long)b[2] << 8 | b[3];
                if (len > 0x7fffffffUL)
                    break;
                at += 12 + (long)len;
                if (memcmp(b + 4, "IEND", 4) == 0) {
                    /* the end chunk is empty, complete and the last bytes of the file */
                    ok = len == 0 && fseek(f, 0, SEEK_END) == 0 && ftell(f) == at;
                    break;
                }
            }
        }
    } else {
        /* an SVG document: the root element opened near the top and closed at the end */
        char head[512], tail[64];
        size_t n = fread(head, 1, sizeof head - 1, f);
        head[n] = '\0';
        if (strstr(head, "<svg") && fseek(f, -(long)(sizeof tail - 1), SEEK_END) == 0) {
            n = fread(tail, 1, sizeof tail - 1, f);
            tail[n] = '\0';
            while (n > 0 && (tail[n - 1] == '\n' || tail[n - 1] == '\r' || tail[n - 1] == ' ' || tail[n - 1] == '\t'))
                tail[--n] = '\0';
            ok = n >= 6 && strcmp(tail + n - 6, "</svg>") == 0;
        }
    }
    fclose(f);
    if (!ok)
        return sr_error_set(err, SR_EIO, "%s: gnuplot wrote an incomplete %s figure (a full disk?)", name,
                            strcmp(format, "png") == 0 ? "PNG" : "SVG");
    return SR_OK;
}

static int render(sr_txn *t, const char *gnuplot, const char *prefix, const char *format, char *diag,
                  size_t diaglen, sr_error *err)
{
    char *script = sr_plot_path_new(prefix, "gp"), *data = sr_plot_path_new(prefix, "dat");
    char *final = sr_plot_path_new(prefix, format);
    char *expr = NULL;
    size_t elen = 0;
    FILE *m = NULL;
    int rc = SR_OK;
    if (!script || !data || !final || !(m = open_memstream(&expr, &elen))) {
        rc = sr_error_set(err, SR_ENOMEM, "out of memory");
        goto out;
    }
    const char *tmp;
    if ((rc = sr_txn_temp(t, final, &tmp, err))) {
        fclose(m);
        goto out;
    }
    /* the script and data as this run wrote them (their temporaries), the
     * figure into its temporary; set before the script runs, single-quoted */
    const char *run_script = sr_txn_pending(t, script);
    fputs("fmt=", m);
    sr_plot_quote(m, format);
    fputs("; outfile=", m);
    sr_plot_quote(m, tmp);
    fputs("; datafile=", m);
    sr_plot_quote(m, sr_txn_pending(t, data));
    fclose(m);
    char *argv[] = {(char *)"gnuplot", (char *)"-e", expr, (char *)run_script, NULL};

    int pfd[2];
    if (pipe(pfd) != 0) {
        rc = sr_error_set(err, SR_EIO, "cannot run gnuplot: %s", strerror(errno));
        goto out;
    }
    fcntl(pfd[0], F_SETFD, FD_CLOEXEC);
    fcntl(pfd[1], F_SETFD, FD_CLOEXEC);
    posix_spawn_file_actions_t fa;
    posix_spawn_file_actions_init(&fa);
    posix_spawn_file_actions_addopen(&fa, 0, "/dev/null", O_RDONLY, 0);
    posix_spawn_file_actions_addopen(&fa, 1, "/dev/null", O_WRONLY, 0);
    posix_spawn_file_actions_adddup2(&fa, pfd[1], 2);
    /* gnuplot starts with no signal blocked and SIGPIPE at its default,
     * whatever the caller blocks or ignores */
    posix_spawnattr_t at;
    posix_spawnattr_init(&at);
    sigset_t none, def;
    sigemptyset(&none);
    sigemptyset(&def);
    sigaddset(&def, SIGPIPE);
    posix_spawnattr_setsigmask(&at, &none);
    posix_spawnattr_setsigdefault(&at, &def);
    posix_spawnattr_setflags(&at, POSIX_SPAWN_SETSIGMASK | POSIX_SPAWN_SETSIGDEF);
    pid_t pid;
    int sp = sr_txn_spawn(t, &pid, gnuplot, &fa, &at, argv);
    posix_spawn_file_actions_destroy(&fa);
    posix_spawnattr_destroy(&at);
    close(pfd[1]);
    if (sp != 0) {
        close(pfd[0]);
        rc = sr_error_set(err, SR_EIO, "cannot run %s: %s", gnuplot, strerror(sp));
        goto out;
    }
    char msg[8192];
    size_t got = 0;
    for (;;) {
        char chunk[1024];
        ssize_t r = read(pfd[0], chunk, sizeof chunk);
        if (r < 0 && errno == EINTR)
            continue;
        if (r <= 0)
            break;
        size_t keep = (size_t)r;
        if (got + keep > sizeof msg - 1)
            keep = sizeof msg - 1 - got;
        memcpy(msg + got, chunk, keep);
        got += keep;
    }
    close(pfd[0]);
    msg[got] = '\0';
    replace_all(msg, sizeof msg, run_script, script);
    int status = 0, we = sr_txn_wait(t, pid, &status);
    if (diag && diaglen)
        snprintf(diag, diaglen, "%s", msg);
    if (we) {
        rc = sr_error_set(err, SR_EIO, "gnuplot: %s", strerror(we));
    } else if (WIFSIGNALED(status)) {
        rc = sr_error_set(err, SR_EIO, "gnuplot stopped by signal %d on %s", WTERMSIG(status), script);
    } else if (!WIFEXITED(status) || WEXITSTATUS(status) != 0) {
        char line[400];
        gnuplot_message(msg, line, sizeof line);
        rc = sr_error_set(err, SR_EIO, "gnuplot rejected %s: %s", script, line);
    } else if (!(rc = sr_plot_check_image(tmp, format, final, err))) {
        rc = sr_txn_filled(t, final, err);
    }
out:
    free(expr);
    free(script);
    free(data);
    free(final);
    return rc;
}

int sr_plot_render(sr_txn *t, const char *gnuplot, const char *prefix, const char *format, char *diag,
                   size_t diaglen, sr_error *err)
{
    if (diag && diaglen)
        diag[0] = '\0';
    if (!format || (strcmp(format, "png") != 0 && strcmp(format, "svg") != 0))
        return sr_error_set(err, SR_EINVAL, "plot format must be png or svg");
    sr_txn *own = t ? NULL : sr_txn_new();
    if (!t && !own)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = render(t ? t : own, gnuplot, prefix, format, diag, diaglen, err);
    if (own) {
        if (!rc)
            rc = sr_txn_commit(own, err);
        sr_txn_free(own);
    }
    return rc;
}
