/* cli.c - the command table and dispatch: `sinkrate COMMAND [options]`. */
#define _DEFAULT_SOURCE
#include "cli/cli.h"

#include <errno.h>
#include <gsl/gsl_errno.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/signals.h"
#include "output/txn.h"
#include "output/report.h"
#include "base/version.h"
#include "files/yamldoc.h"

const sr_command *const sr_commands[] = {&sr_cmd_size,       &sr_cmd_rate,     &sr_cmd_sweep,    &sr_cmd_profile,
                                         &sr_cmd_loads,      &sr_cmd_freefall, &sr_cmd_dispersion, &sr_cmd_air,
                                         &sr_cmd_canopies,   &sr_cmd_check,    &sr_cmd_fit,      NULL};

#define NCOMMANDS (sizeof sr_commands / sizeof sr_commands[0] - 1)

static void usage(FILE *f)
{
    fprintf(f, "usage: sinkrate COMMAND [options]   (sinkrate COMMAND --help for its options)\n\n"
               "Sizes and checks parachute recovery systems for payloads.\n\nCommands:\n");
    for (size_t i = 0; i < NCOMMANDS; i++)
        fprintf(f, "  %-11s %s\n", sr_commands[i]->name, sr_commands[i]->summary);
    fprintf(f, "\nOptions: --version, --help\n\n");
}

static int dispatch(sr_cli *c, int argc, char **argv)
{
    if (argc < 2) {
        usage(c->err);
        return SR_EXIT_USAGE;
    }
    const char *name = argv[1];
    if (strcmp(name, "--version") == 0) {
        fprintf(c->out, "sinkrate %s\n", SR_VERSION);
        return SR_EXIT_OK;
    }
    if (strcmp(name, "--help") == 0 || strcmp(name, "-h") == 0 || strcmp(name, "help") == 0) {
        usage(c->out);
        sr_cli_help(c, "");
        return SR_EXIT_OK;
    }
    for (size_t i = 0; i < NCOMMANDS; i++) {
        if (strcmp(sr_commands[i]->name, name) == 0) {
            c->cmd = sr_commands[i]->name;
            c->command = sr_commands[i];
            sr_cli_signals_watch(c->txn, c->cmd);
            int rc = sr_commands[i]->run(c, argc - 1, argv + 1);
            return rc < 0 ? SR_EXIT_OK : rc;
        }
    }
    const char *names[NCOMMANDS + 1];
    for (size_t i = 0; i < NCOMMANDS; i++)
        names[i] = sr_commands[i]->name;
    names[NCOMMANDS] = NULL;
    const char *s = sr_yaml_suggest(name, names);
    if (s)
        return sr_cli_fail(c, "unknown command '%s'; did you mean '%s'?", name, s);
    return sr_cli_fail(c, "unknown command '%s' (sinkrate --help lists them)", name);
}

/* The end of a run: on success, standard output first (it cannot be taken
 * back, the files still can), checked, then every file put in place, then
 * the notes about them; on failure, nothing of it. */
static int finish(sr_cli *c, int rc, const char *obuf, size_t olen, FILE *out)
{
    if (!(rc == SR_EXIT_OK || rc == SR_EXIT_LIMIT || (rc == SR_EXIT_USAGE && c->keep_on_usage))) {
        sr_txn_abort(c->txn);
        return rc;
    }
    errno = 0;
    int e = olen && fwrite(obuf, 1, olen, out) != olen ? (errno ? errno : EIO) : 0;
    errno = 0;
    if ((fflush(out) != 0 || ferror(out)) && !e)
        e = errno ? errno : EIO;
    if (e) {
        sr_txn_abort(c->txn);
        if (e == EPIPE && sr_cli_signals_pipe_default())
            return SR_EXIT_PIPE; /* as if SIGPIPE had ended it, silently */
        return sr_cli_fail(c, "standard output: %s", strerror(e));
    }
    sr_error err;
    if (sr_txn_commit(c->txn, &err))
        return sr_cli_fail(c, "%s", err.msg);
    if (c->notes_len)
        fputs(c->notes_buf, c->err);
    return rc;
}

int sr_cli_run(int argc, char **argv, FILE *out, FILE *err)
{
    /* GSL's default handler aborts; every GSL return code is checked instead */
    gsl_set_error_handler_off();
    sr_cli c;
    memset(&c, 0, sizeof c);
    c.err = err;
    c.plot_format = "png";
    char *obuf = NULL;
    size_t olen = 0;
    c.out = open_memstream(&obuf, &olen);
    c.notes = open_memstream(&c.notes_buf, &c.notes_len);
    c.txn = sr_txn_new();
    int rc;
    if (!c.out || !c.notes || !c.txn) {
        rc = sr_cli_fail(&c, "out of memory");
    } else {
        sr_cli_signals_watch(c.txn, NULL);
        rc = dispatch(&c, argc, argv);
        fclose(c.out);
        c.out = NULL;
        fclose(c.notes);
        c.notes = NULL;
        rc = finish(&c, rc, obuf, olen, out);
        sr_cli_signals_watch(NULL, NULL);
    }
    if (c.out)
        fclose(c.out);
    if (c.notes)
        fclose(c.notes);
    sr_txn_free(c.txn);
    free(obuf);
    free(c.notes_buf);
    return rc;
}
