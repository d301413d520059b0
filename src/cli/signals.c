/* signals.c - stopping a run cleanly on SIGINT, SIGTERM and SIGHUP.
 *
 * The one piece of mutable global state in sinkrate, by design: which
 * transaction a signal must undo. The signals are blocked in every thread and
 * taken by sigwait in a thread of their own, so the undo runs as ordinary
 * code under the transaction's lock (no async-signal-safety limits, no race
 * with the OpenMP threads of a dispersion), then the process exits. */
#define _DEFAULT_SOURCE
#include "cli/signals.h"

#include <pthread.h>
#include <signal.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include "output/txn.h"

static pthread_mutex_t watch_lock = PTHREAD_MUTEX_INITIALIZER;
static struct sr_txn *watched;
static const char *watched_cmd;
static int installed, pipe_default;
static sigset_t waited;

static const char *signal_name(int sig)
{
    switch (sig) {
    case SIGINT: return "SIGINT";
    case SIGTERM: return "SIGTERM";
    case SIGHUP: return "SIGHUP";
    default: return "a signal";
    }
}

static void *waiter(void *arg)
{
    (void)arg;
    int sig = 0;
    while (sigwait(&waited, &sig) != 0)
        ;
    /* held until the exit: the run cannot end (and free the transaction) meanwhile */
    pthread_mutex_lock(&watch_lock);
    int committed = sr_txn_abort(watched);
    const char *cmd = watched_cmd;
    char msg[256];
    int n = snprintf(msg, sizeof msg, "%ssinkrate%s%s: stopped by %s; %s\n", isatty(2) ? "\n" : "",
                     cmd ? " " : "", cmd ? cmd : "", signal_name(sig),
                     committed ? "its outputs were already complete" : "no file was written or changed");
    /* write(2), not stdio: the stopped thread may hold the stream's lock */
    if (n > 0 && write(2, msg, (size_t)n < sizeof msg ? (size_t)n : sizeof msg - 1) < 0)
        n = 0;
    _exit(128 + sig);
}

void sr_cli_signals_install(void)
{
    static const int SIGS[] = {SIGINT, SIGTERM, SIGHUP};
    sigemptyset(&waited);
    for (size_t i = 0; i < sizeof SIGS / sizeof SIGS[0]; i++) {
        struct sigaction sa;
        if (sigaction(SIGS[i], NULL, &sa) == 0 && sa.sa_handler != SIG_IGN)
            sigaddset(&waited, SIGS[i]);
    }
    struct sigaction sp;
    if (sigaction(SIGPIPE, NULL, &sp) == 0 && sp.sa_handler == SIG_DFL)
        pipe_default = 1;
    signal(SIGPIPE, SIG_IGN);
    if (pthread_sigmask(SIG_BLOCK, &waited, NULL) != 0)
        return;
    pthread_attr_t at;
    pthread_t th;
    pthread_attr_init(&at);
    pthread_attr_setdetachstate(&at, PTHREAD_CREATE_DETACHED);
    if (pthread_create(&th, &at, waiter, NULL) == 0)
        installed = 1;
    else
        pthread_sigmask(SIG_UNBLOCK, &waited, NULL); /* no waiter: the signals' defaults */
    pthread_attr_destroy(&at);
}

void sr_cli_signals_watch(struct sr_txn *t, const char *cmd)
{
    if (!installed)
        return;
    pthread_mutex_lock(&watch_lock);
    watched = t;
    watched_cmd = cmd;
    pthread_mutex_unlock(&watch_lock);
}

int sr_cli_signals_pipe_default(void)
{
    return pipe_default;
}

int sr_cli_signals_exit(int rc)
{
    if (rc == SR_EXIT_PIPE && pipe_default) {
        signal(SIGPIPE, SIG_DFL);
        raise(SIGPIPE);
    }
    return rc;
}
