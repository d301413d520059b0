/* progress.h - a progress bar on stderr for long runs, drawn only when the
 * stream is a terminal: done / total, rate per second and the time left. */
#ifndef SR_CLI_PROGRESS_H
#define SR_CLI_PROGRESS_H

#include <stddef.h>
#include <stdio.h>

typedef struct sr_progress {
    FILE *f;
    int active;        /* 0: not a terminal, nothing is drawn */
    size_t n;
    const char *unit;  /* "samples" */
    double t0, last;
} sr_progress;

void sr_cli_progress_start(sr_progress *p, FILE *f, size_t n, const char *unit);
/* Redraw at most ten times a second; safe to call from any one thread at a time. */
void sr_cli_progress_update(sr_progress *p, size_t done);
/* Erase the bar. */
void sr_cli_progress_end(sr_progress *p);

#endif
