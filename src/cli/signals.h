/* signals.h - a run stopped by SIGINT, SIGTERM or SIGHUP undoes its output
 * transaction (no temporary, no new directory, every existing file as it
 * was) and exits 128 + the signal: 130, 143, 129. */
#ifndef SR_CLI_SIGNALS_H
#define SR_CLI_SIGNALS_H

struct sr_txn;

/* For the executable only (main), before anything else: blocks the three
 * signals in every thread (threads made later inherit that) and waits for
 * them in one thread of its own, which undoes the transaction being watched
 * and exits. A signal ignored when the program started (nohup, a background
 * job) stays ignored. SIGPIPE is ignored from here on, so a closed pipe is a
 * write error the run sees; sr_cli_signals_pipe_default() says whether it
 * was at its default before, when that error ends the run as SIGPIPE would. */
void sr_cli_signals_install(void);

/* The run's transaction (NULL when the run ends) and its command name, for
 * the message. Without sr_cli_signals_install (tests in-process) a no-op. */
void sr_cli_signals_watch(struct sr_txn *t, const char *cmd);

int sr_cli_signals_pipe_default(void);

/* main's exit: the code, or death by SIGPIPE for SR_EXIT_PIPE. */
int sr_cli_signals_exit(int rc);

/* The exit code sr_cli_run returns when standard output is a closed pipe
 * and SIGPIPE was at its default: the shell's code for death by SIGPIPE. */
#define SR_EXIT_PIPE 141

#endif
