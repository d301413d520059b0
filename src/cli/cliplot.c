/* cliplot.c - the --plot output of a command: files, rendering, messages. */
#define _DEFAULT_SOURCE
#include "cli/cliplot.h"

#include <errno.h>
#include <limits.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli/common.h"

const char SR_HELP_PLOT[] =
    "Figure:\n"
    "  --plot PREFIX            write PREFIX.dat and PREFIX.gp (a gnuplot script using the\n"
    "                           shared style plots/sinkrate.gp) and, when gnuplot is on PATH,\n"
    "                           render PREFIX.png; the directory is created if needed\n"
    "  --plot-format png|svg    the figure's format (default png)\n"
    "  --plot-size WxH          the figure's size in pixels (default 1000x650)\n";

/* mkdir -p for the directory part of prefix; what it makes is the run's */
static int make_parent(sr_cli *c, const char *prefix)
{
    char dir[PATH_MAX];
    snprintf(dir, sizeof dir, "%s", prefix);
    char *slash = strrchr(dir, '/');
    if (!slash || slash == dir)
        return 0;
    *slash = '\0';
    for (char *p = dir + 1; *p; p++) {
        if (*p != '/')
            continue;
        *p = '\0';
        sr_cli_made(c, dir);
        if (mkdir(dir, 0777) != 0 && errno != EEXIST)
            return -1;
        *p = '/';
    }
    sr_cli_made(c, dir);
    if (mkdir(dir, 0777) != 0 && errno != EEXIST)
        return -1;
    return 0;
}

int sr_cli_plot(sr_cli *c, const sr_plot *p, int argc, char **argv)
{
    return c->plot_prefix ? sr_cli_plot_to(c, p, c->plot_prefix, argc, argv) : 0;
}

int sr_cli_plot_to(sr_cli *c, const sr_plot *p, const char *prefix, int argc, char **argv)
{
    char style[PATH_MAX + 32] = "", dir[PATH_MAX], real[PATH_MAX];
    if (sr_cli_data_dir(c, dir, sizeof dir) == 0 && realpath(dir, real))
        snprintf(style, sizeof style, "%s/plots/sinkrate.gp", real);
    /* the command line, for the script's header */
    char cmd[1024];
    size_t at = (size_t)snprintf(cmd, sizeof cmd, "sinkrate");
    for (int i = 0; i < argc && at < sizeof cmd; i++)
        at += (size_t)snprintf(cmd + at, sizeof cmd - at, " %s", argv[i]);
    if (make_parent(c, prefix) != 0)
        return sr_cli_fail(c, "--plot: cannot create the directory of '%s': %s", prefix, strerror(errno));
    sr_plot_out o = {.prefix = prefix,
                     .style = style[0] ? style : NULL,
                     .format = c->plot_format ? c->plot_format : "png",
                     .width = c->plot_width ? c->plot_width : SR_PLOT_DEFAULT_WIDTH,
                     .height = c->plot_height ? c->plot_height : SR_PLOT_DEFAULT_HEIGHT,
                     .command = cmd};
    char made[PATH_MAX + 8];
    const char *ext[3] = {"dat", "gp", o.format};
    for (int k = 0; k < 3; k++) {
        sr_plot_path(made, sizeof made, prefix, ext[k]);
        sr_cli_made(c, made);
    }
    sr_error e;
    if (sr_plot_write(p, &o, &e))
        return sr_cli_fail(c, "--plot: %s", e.msg);
    if (!o.style || access(o.style, R_OK) != 0)
        fprintf(c->err, "sinkrate %s: note: the shared plot style %s was not found; the script uses plain "
                        "defaults\n",
                c->cmd, style[0] ? style : "plots/sinkrate.gp");
    char gp[PATH_MAX];
    if (!sr_plot_find_gnuplot(gp, sizeof gp)) {
        fprintf(c->err,
                "sinkrate %s: wrote %s.dat and %s.gp; gnuplot is not on PATH, so no figure was drawn. "
                "Install gnuplot and run: gnuplot %s.gp\n",
                c->cmd, prefix, prefix, prefix);
        return 0;
    }
    char diag[2048];
    if (sr_plot_render(gp, prefix, o.format, diag, sizeof diag, &e))
        return sr_cli_fail(c, "--plot: %s", e.msg);
    char *save = NULL;
    for (char *line = strtok_r(diag, "\n", &save); line; line = strtok_r(NULL, "\n", &save))
        if (strstr(line, "arning"))
            fprintf(c->err, "sinkrate %s: gnuplot: %s\n", c->cmd, line);
    fprintf(c->err, "sinkrate %s: wrote %s.%s (data %s.dat, script %s.gp)\n", c->cmd, prefix, o.format, prefix,
            prefix);
    return 0;
}
