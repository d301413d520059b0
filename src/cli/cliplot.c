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
#include "output/txn.h"

static int take_plot(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    if (!*arg)
        return sr_cli_fail(c, "--plot: empty file prefix");
    c->plot_prefix = arg;
    return 0;
}

static int take_plot_format(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    if (strcmp(arg, "png") != 0 && strcmp(arg, "svg") != 0)
        return sr_cli_fail(c, "--plot-format: '%s' is not one of png, svg", arg);
    c->plot_format = arg;
    return 0;
}

static int take_plot_size(sr_cli *c, const sr_opt *o, const char *arg, void *place)
{
    (void)o;
    (void)place;
    int w, h, used = 0;
    if (sscanf(arg, "%dx%d%n", &w, &h, &used) != 2 || arg[used] || w < 200 || h < 150 || w > 10000 || h > 10000)
        return sr_cli_fail(c, "--plot-size: '%s' is not WIDTHxHEIGHT in pixels (200x150 .. 10000x10000)", arg);
    c->plot_width = w;
    c->plot_height = h;
    return 0;
}

const sr_opt sr_cli_group_plot[] = {
    SR_OPT_HEADING("Figure:"),
    {.type = SR_OPTION_CALL, .name = "plot", .value = "PREFIX", .call = take_plot, .flags = SR_OPT_IN_CLI,
     .help = "write PREFIX.dat and PREFIX.gp (a gnuplot script using the shared style plots/sinkrate.gp) and, when "
             "gnuplot is on PATH, render PREFIX.png; the directory is created if needed"},
    {.type = SR_OPTION_CALL, .name = "plot-format", .value = "png|svg", .call = take_plot_format,
     .flags = SR_OPT_IN_CLI, .help = "the figure's format (default png)"},
    {.type = SR_OPTION_CALL, .name = "plot-size", .value = "WxH", .call = take_plot_size, .flags = SR_OPT_IN_CLI,
     .help = "the figure's size in pixels (default 1000x650)"},
    SR_OPT_END};

/* The style file the script loads, absolute (empty when the data
 * directory is not found). */
static void style_path(sr_cli *c, char *style, size_t len)
{
    char dir[PATH_MAX], real[PATH_MAX];
    style[0] = '\0';
    if (sr_cli_data_dir(c, dir, sizeof dir) == 0 && realpath(dir, real))
        snprintf(style, len, "%s/plots/sinkrate.gp", real);
}

int sr_cli_plot_reserve(sr_cli *c, const char *prefix)
{
    sr_error e;
    if (sr_plot_reserve(c->txn, "--plot", prefix, c->plot_format ? c->plot_format : "png", &e))
        return sr_cli_fail(c, "%s", e.msg);
    /* the shared style is read by every figure: never a figure's file */
    char style[PATH_MAX + 32];
    style_path(c, style, sizeof style);
    return style[0] ? sr_cli_input(c, "the shared plot style", style) : 0;
}

int sr_cli_plot(sr_cli *c, const sr_plot *p, int argc, char **argv)
{
    return c->plot_prefix ? sr_cli_plot_to(c, p, c->plot_prefix, argc, argv) : 0;
}

/* The command line for the script's header, without what does not change
 * the figure (--threads: the same bytes at any thread count). */
static void command_line(char *cmd, size_t len, int argc, char **argv)
{
    size_t at = (size_t)snprintf(cmd, len, "sinkrate");
    for (int i = 0; i < argc && at < len; i++) {
        if (strcmp(argv[i], "--threads") == 0 && i + 1 < argc) {
            i++;
            continue;
        }
        if (strncmp(argv[i], "--threads=", 10) == 0)
            continue;
        at += (size_t)snprintf(cmd + at, len - at, " %s", argv[i]);
    }
}

int sr_cli_plot_to(sr_cli *c, const sr_plot *p, const char *prefix, int argc, char **argv)
{
    /* reserved before the work for --plot; a figure of another prefix now */
    int rc = sr_cli_plot_reserve(c, prefix);
    if (rc)
        return rc;
    char style[PATH_MAX + 32];
    style_path(c, style, sizeof style);
    char cmd[1024];
    command_line(cmd, sizeof cmd, argc, argv);
    sr_plot_out o = {.prefix = prefix,
                     .style = style[0] ? style : NULL,
                     .format = c->plot_format ? c->plot_format : "png",
                     .width = c->plot_width ? c->plot_width : SR_PLOT_DEFAULT_WIDTH,
                     .height = c->plot_height ? c->plot_height : SR_PLOT_DEFAULT_HEIGHT,
                     .command = cmd,
                     .txn = c->txn};
    sr_error e;
    if (sr_plot_write(p, &o, &e))
        return sr_cli_fail(c, "--plot: %s", e.msg);
    if (!o.style || access(o.style, R_OK) != 0)
        sr_cli_note(c, "note: the shared plot style %s was not found; the script uses plain defaults",
                    style[0] ? style : "plots/sinkrate.gp");
    char gp[PATH_MAX];
    char *image = sr_plot_path_new(prefix, o.format);
    if (!image)
        return sr_cli_fail(c, "out of memory");
    if (!sr_plot_find_gnuplot(gp, sizeof gp)) {
        sr_txn_drop(c->txn, image); /* no figure: an older one stays as it was */
        free(image);
        sr_cli_note(c, "wrote %s.dat and %s.gp; gnuplot is not on PATH, so no figure was drawn. Install gnuplot "
                       "and run: gnuplot %s.gp",
                    prefix, prefix, prefix);
        return 0;
    }
    free(image);
    char diag[2048];
    if (sr_plot_render(c->txn, gp, prefix, o.format, diag, sizeof diag, &e))
        return sr_cli_fail(c, "--plot: %s", e.msg);
    char *save = NULL;
    for (char *line = strtok_r(diag, "\n", &save); line; line = strtok_r(NULL, "\n", &save))
        if (strstr(line, "arning"))
            sr_cli_note(c, "gnuplot: %s", line);
    sr_cli_note(c, "wrote %s.%s (data %s.dat, script %s.gp)", prefix, o.format, prefix, prefix);
    return 0;
}
