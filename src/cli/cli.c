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
#include "cli/tables.h"
#include "output/txn.h"
#include "output/report.h"
#include "base/version.h"
#include "files/yamldoc.h"

const sr_command *const sr_cli_commands[] = {&sr_cmd_size,       &sr_cmd_rate,     &sr_cmd_sweep,    &sr_cmd_profile,
                                         &sr_cmd_loads,      &sr_cmd_freefall, &sr_cmd_dispersion, &sr_cmd_air,
                                         &sr_cmd_canopies,   &sr_cmd_check,    &sr_cmd_fit,      &sr_cmd_design, NULL};

#define NCOMMANDS (sizeof sr_cli_commands / sizeof sr_cli_commands[0] - 1)

static void usage(FILE *f)
{
    fprintf(f, "usage: sinkrate COMMAND [options]   (sinkrate COMMAND --help for its options)\n\n"
               "Sizes and checks parachute recovery systems for payloads.\n\nCommands:\n");
    for (size_t i = 0; i < NCOMMANDS; i++)
        fprintf(f, "  %-11s %s\n", sr_cli_commands[i]->name, sr_cli_commands[i]->summary);
    fprintf(f, "\nOptions: --version, --help, --completion bash (the shell completion script)\n\n");
}

/* `sinkrate --completion bash`: the bash completion script, written from
 * the command table and each command's option table (cli/options.h), so it
 * cannot drift from them. */
static int completion(sr_cli *c, const char *shell)
{
    if (!shell || strcmp(shell, "bash") != 0)
        return sr_cli_fail(c, "--completion: give the shell: bash");
    FILE *f = c->out;
    fprintf(f, "# bash completion for sinkrate %s, written by `sinkrate --completion bash` from its\n"
               "# command and option tables. Install: make install, or source this file.\n"
               "_sinkrate()\n{\n"
               "    local cur=${COMP_WORDS[COMP_CWORD]} prev=${COMP_WORDS[COMP_CWORD-1]}\n"
               "    local cmd=${COMP_WORDS[1]} opts='' vals='' tables=''\n"
               "    if [ \"$COMP_CWORD\" -eq 1 ]; then\n"
               "        COMPREPLY=($(compgen -W \"",
            SR_VERSION);
    for (size_t i = 0; i < NCOMMANDS; i++)
        fprintf(f, "%s ", sr_cli_commands[i]->name);
    fputs("--help --version --completion\" -- \"$cur\"))\n"
          "        return\n"
          "    fi\n"
          "    case $cmd in\n",
          f);
    sr_opt_flat *flat = malloc(SR_OPT_MAX * sizeof *flat);
    if (!flat)
        return sr_cli_fail(c, "out of memory");
    for (size_t i = 0; i < NCOMMANDS; i++) {
        size_t n = sr_cli_opt_flatten(sr_cli_commands[i]->options, flat, SR_OPT_MAX);
        /* every option, then those that take a value (a file name is completed after them) */
        for (int values = 0; values < 2; values++) {
            fprintf(f, values ? "'\n        vals='" : "    %s)\n        opts='", sr_cli_commands[i]->name);
            const char *sep = "";
            for (size_t k = 0; k < n; k++) {
                const sr_opt *o = flat[k].opt;
                if (values && !flat[k].value)
                    continue;
                if (o->short_name) {
                    fprintf(f, "%s-%c", sep, o->short_name);
                    sep = " ";
                }
                if (o->name) {
                    fprintf(f, "%s--%s", sep, o->name);
                    sep = " ";
                }
            }
        }
        char names[512] = "";
        if (sr_cli_tables(sr_cli_commands[i]->name))
            sr_cli_tables_list(sr_cli_commands[i]->name, names, sizeof names);
        for (char *p = names; *p; p++)
            if (*p == ',')
                *p = ' ';
        fprintf(f, "'\n        tables='%s' ;;\n", names);
    }
    free(flat);
    fputs("    *) return ;;\n"
          "    esac\n"
          "    case $prev in\n"
          "        --format) COMPREPLY=($(compgen -W \"text csv json\" -- \"$cur\")); return ;;\n"
          "        --units) COMPREPLY=($(compgen -W \"si us\" -- \"$cur\")); return ;;\n"
          "        --plot-format) COMPREPLY=($(compgen -W \"png svg\" -- \"$cur\")); return ;;\n"
          "        --table) COMPREPLY=($(compgen -W \"$tables\" -- \"$cur\")); return ;;\n"
          "        --family)\n"
          "            local ids\n"
          "            ids=$(sinkrate canopies --format csv --table families 2>/dev/null |\n"
          "                  awk -F, '$1 !~ /^#/ && $1 != \"id\" && $1 != \"\" {print $1}')\n"
          "            COMPREPLY=($(compgen -W \"$ids\" -- \"$cur\")); return ;;\n"
          "        --data) COMPREPLY=($(compgen -d -- \"$cur\")); return ;;\n"
          "    esac\n"
          "    case \" $vals \" in\n"
          "        *\" $prev \"*) COMPREPLY=($(compgen -f -- \"$cur\")); return ;;\n"
          "    esac\n"
          "    if [[ $cur == -* ]]; then\n"
          "        COMPREPLY=($(compgen -W \"$opts\" -- \"$cur\"))\n"
          "    else\n"
          "        COMPREPLY=($(compgen -f -- \"$cur\"))\n"
          "    fi\n"
          "}\n"
          "complete -o filenames -o bashdefault -F _sinkrate sinkrate\n",
          f);
    return SR_EXIT_OK;
}

static int dispatch(sr_cli *c, int argc, char **argv)
{
    if (argc < 2) {
        usage(c->err);
        return SR_EXIT_USAGE;
    }
    const char *name = argv[1];
    if (strcmp(name, "--completion") == 0)
        return completion(c, argc > 2 ? argv[2] : NULL);
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
        if (strcmp(sr_cli_commands[i]->name, name) == 0) {
            c->cmd = sr_cli_commands[i]->name;
            c->command = sr_cli_commands[i];
            sr_cli_signals_watch(c->txn, c->cmd);
            int rc = sr_cli_commands[i]->run(c, argc - 1, argv + 1);
            return rc < 0 ? SR_EXIT_OK : rc;
        }
    }
    const char *names[NCOMMANDS + 1];
    for (size_t i = 0; i < NCOMMANDS; i++)
        names[i] = sr_cli_commands[i]->name;
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
    sr_error_gsl_off();
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
