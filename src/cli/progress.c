/* progress.c - the terminal progress bar. */
#define _DEFAULT_SOURCE
#include "cli/progress.h"

#include <string.h>
#include <time.h>
#include <unistd.h>

#define WIDTH 28

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

void sr_cli_progress_start(sr_progress *p, FILE *f, size_t n, const char *unit)
{
    memset(p, 0, sizeof *p);
    p->f = f;
    p->n = n;
    p->unit = unit;
    int fd = f ? fileno(f) : -1;
    p->active = fd >= 0 && isatty(fd);
    p->t0 = p->last = now();
}

static void fmt_time(char *buf, size_t len, double s)
{
    if (s < 60.0)
        snprintf(buf, len, "%.0f s", s);
    else if (s < 3600.0)
        snprintf(buf, len, "%d min %02d s", (int)(s / 60.0), (int)s % 60);
    else
        snprintf(buf, len, "%.1f h", s / 3600.0);
}

void sr_cli_progress_update(sr_progress *p, size_t done)
{
    if (!p->active || p->n == 0)
        return;
    double t = now();
    if (t - p->last < 0.1 && done < p->n)
        return;
    p->last = t;
    double el = t - p->t0, frac = (double)done / (double)p->n;
    double rate = el > 0.0 ? (double)done / el : 0.0;
    char bar[WIDTH + 1], left[32];
    int k = (int)(frac * WIDTH + 0.5);
    for (int i = 0; i < WIDTH; i++)
        bar[i] = i < k ? '#' : '.';
    bar[WIDTH] = '\0';
    if (rate > 0.0)
        fmt_time(left, sizeof left, (double)(p->n - done) / rate);
    else
        snprintf(left, sizeof left, "?");
    fprintf(p->f, "\r[%s] %3.0f %%  %.0f %s/s  %s left\033[K", bar, 100.0 * frac, rate, p->unit, left);
    fflush(p->f);
}

void sr_cli_progress_end(sr_progress *p)
{
    if (!p->active)
        return;
    fprintf(p->f, "\r\033[K");
    fflush(p->f);
}
