/* cli.c - the command table and dispatch: `sinkrate COMMAND [options]`. */
#include "cli/cli.h"

#include <gsl/gsl_errno.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"
#include "output/report.h"
#include "base/version.h"
#include "files/yamldoc.h"

typedef struct command {
    const char *name;
    sr_command_fn fn;
    const char *summary;
} command;

static const command COMMANDS[] = {
    {"size", sr_cmd_size, "nominal area and diameters a canopy family needs for a target touchdown speed"},
    {"rate", sr_cmd_rate, "descent rate of a canopy or cluster at one or more altitudes"},
    {"sweep", sr_cmd_sweep, "a table and figure over altitude, mass, diameter, temperature or site"},
    {"profile", sr_cmd_profile, "staged descent of a mission file: events, time, drift, touchdown, limits"},
    {"loads", sr_cmd_loads, "opening load of a canopy at deployment"},
    {"freefall", sr_cmd_freefall, "free-fall speed of a body with Reynolds-dependent drag"},
    {"dispersion", sr_cmd_dispersion, "Monte Carlo landing scatter of a mission file"},
    {"air", sr_cmd_air, "atmosphere table (standard, offset, site, sounding)"},
    {"canopies", sr_cmd_canopies, "list the canopy catalog, or show one family with its sources"},
    {"check", sr_cmd_check, "validate canopy, canopy-family and mission files"},
    {"fit", sr_cmd_fit, "drag area of each canopy from flight logs, with an interval, into a canopy file"},
};

#define NCOMMANDS (sizeof COMMANDS / sizeof COMMANDS[0])

static void usage(FILE *f)
{
    fprintf(f, "usage: sinkrate COMMAND [options]   (sinkrate COMMAND --help for its options)\n\n"
               "Sizes and checks parachute recovery systems for payloads.\n\nCommands:\n");
    for (size_t i = 0; i < NCOMMANDS; i++)
        fprintf(f, "  %-11s %s\n", COMMANDS[i].name, COMMANDS[i].summary);
    fprintf(f, "\nOptions: --version, --help\n\n");
}

int sr_cli_run(int argc, char **argv, FILE *out, FILE *err)
{
    /* GSL's default handler aborts; every GSL return code is checked instead */
    gsl_set_error_handler_off();
    sr_cli c;
    memset(&c, 0, sizeof c);
    c.out = out;
    c.err = err;
    c.plot_format = "png";
    if (argc < 2) {
        usage(err);
        return SR_EXIT_USAGE;
    }
    const char *name = argv[1];
    if (strcmp(name, "--version") == 0) {
        fprintf(out, "sinkrate %s\n", SR_VERSION);
        return SR_EXIT_OK;
    }
    if (strcmp(name, "--help") == 0 || strcmp(name, "-h") == 0 || strcmp(name, "help") == 0) {
        usage(out);
        sr_cli_help(&c, "");
        return SR_EXIT_OK;
    }
    for (size_t i = 0; i < NCOMMANDS; i++) {
        if (strcmp(COMMANDS[i].name, name) == 0) {
            c.cmd = COMMANDS[i].name;
            int rc = COMMANDS[i].fn(&c, argc - 1, argv + 1);
            sr_cli_made_end(&c, rc == SR_EXIT_USAGE);
            fflush(out);
            return rc < 0 ? SR_EXIT_OK : rc;
        }
    }
    const char *names[NCOMMANDS + 1];
    for (size_t i = 0; i < NCOMMANDS; i++)
        names[i] = COMMANDS[i].name;
    names[NCOMMANDS] = NULL;
    const char *s = sr_yaml_suggest(name, names);
    if (s)
        return sr_cli_fail(&c, "unknown command '%s'; did you mean '%s'?", name, s);
    return sr_cli_fail(&c, "unknown command '%s' (sinkrate --help lists them)", name);
}
