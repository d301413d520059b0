/* options.c - reading a command's options from its table (getopt_long's
 * table is made from it), and writing its --help from the same table. */
#define _DEFAULT_SOURCE
#include "cli/options.h"

#include <getopt.h>
#include <stdlib.h>
#include <string.h>

#include "cli/cliplot.h"
#include "cli/common.h"
#include "cli/tables.h"
#include "files/yamldoc.h"

#define WIDTH 80     /* help text columns */
#define LABEL_COL 27 /* where an option's help starts */
/* getopt_long's code of the i-th option: above every short option's character */
#define CODE_BASE 1000

/* ---- the table ---- */

static const sr_opt *find_row(const sr_opt *t, sr_opt_type type, const char *name)
{
    for (; t->type != SR_OPTION_END; t++)
        if (t->type == type && t->name && name && strcmp(t->name, name) == 0)
            return t;
    return NULL;
}

static size_t flatten(const sr_opt *top, const sr_opt *t, const sr_opt *group, size_t base, sr_opt_flat *out,
                      size_t n, size_t max)
{
    for (; t->type != SR_OPTION_END; t++) {
        switch (t->type) {
        case SR_OPTION_STRING:
        case SR_OPTION_FLAG:
        case SR_OPTION_CALL:
        case SR_OPTION_HELP: {
            if (n >= max)
                return n;
            const sr_opt *own = group ? find_row(top, SR_OPTION_FOR, t->name) : NULL;
            if (group && find_row(top, SR_OPTION_WITHOUT, t->name))
                continue;
            out[n].opt = t;
            out[n].group = group;
            out[n].value = own && own->value ? own->value : t->value;
            out[n].help = own ? own->help : t->help;
            out[n].offset = (t->flags & SR_OPT_IN_CLI) ? t->offset : base + t->offset;
            n++;
            break;
        }
        case SR_OPTION_GROUP:
            n = flatten(top, t->group, group ? group : t, base + t->offset, out, n, max);
            break;
        default:
            break;
        }
    }
    return n;
}

size_t sr_cli_opt_flatten(const sr_opt *table, sr_opt_flat *out, size_t max)
{
    return table ? flatten(table, table, NULL, 0, out, 0, max) : 0;
}

const char *sr_cli_opt_display(const sr_opt *o, char *buf, size_t len)
{
    if (o->short_name && (o->type != SR_OPTION_HELP || !o->name))
        snprintf(buf, len, "-%c", o->short_name);
    else
        snprintf(buf, len, "--%s", o->name ? o->name : "");
    return buf;
}

/* ---- reading the options ---- */

static int repeatable(const sr_opt_flat *f)
{
    return (f->opt->flags & SR_OPT_REPEAT) || (f->group && (f->group->flags & SR_OPT_REPEAT));
}

/* One option read: its value to where the table says. */
static int take(sr_cli *c, const sr_opt_flat *f, const char *arg, void *opts)
{
    const sr_opt *o = f->opt;
    if (f->group && f->group->call)
        return f->group->call(c, o, arg, (char *)opts + f->group->offset);
    void *place = (o->flags & SR_OPT_IN_CLI) ? (void *)((char *)c + f->offset) : (void *)((char *)opts + f->offset);
    switch (o->type) {
    case SR_OPTION_STRING:
        *(const char **)place = arg;
        return 0;
    case SR_OPTION_FLAG:
        *(int *)place = 1;
        return 0;
    case SR_OPTION_CALL:
        return o->call(c, o, arg, place);
    case SR_OPTION_HELP:
        sr_cli_print_help(c);
        return -1;
    default:
        return sr_cli_fail(c, "unexpected option");
    }
}

int sr_cli_parse_options(sr_cli *c, int argc, char **argv, void *opts, int *first_arg)
{
    sr_opt_flat *flat = malloc(SR_OPT_MAX * sizeof *flat);
    struct option *lo = malloc((SR_OPT_MAX + 1) * sizeof *lo);
    const char **names = malloc((SR_OPT_MAX + 1) * sizeof *names);
    if (!flat || !lo || !names) {
        free(flat);
        free(lo);
        free(names);
        return sr_cli_fail(c, "out of memory");
    }
    size_t n = sr_cli_opt_flatten(c->command->options, flat, SR_OPT_MAX), nl = 0;
    /* a leading ':' makes a missing value ':' (not '?'), so it is named as such */
    char shorts[64] = ":";
    int short_of[128] = {0}; /* 1 + the index of a short option's row */
    for (size_t i = 0; i < n; i++) {
        const sr_opt *o = flat[i].opt;
        if (o->name) {
            lo[nl] = (struct option){o->name, flat[i].value ? required_argument : no_argument, NULL,
                                     CODE_BASE + (int)i};
            names[nl++] = o->name;
        }
        if (o->short_name > 0 && o->short_name < 128 && strlen(shorts) + 3 < sizeof shorts) {
            size_t l = strlen(shorts);
            shorts[l] = (char)o->short_name;
            shorts[l + 1] = flat[i].value ? ':' : '\0';
            shorts[l + 2] = '\0';
            short_of[o->short_name] = (int)i + 1;
        }
    }
    lo[nl] = (struct option){NULL, 0, NULL, 0};
    names[nl] = NULL;

    optind = 0; /* GNU: full re-initialisation, so in-process calls can repeat */
    opterr = 0;
    /* options given once only: a second value would silently replace the first */
    struct {
        size_t i;
        const char *arg;
    } seen[64];
    size_t nseen = 0;
    char name[128];
    int code, rc = 0;
    while (!rc && (code = getopt_long(argc, argv, shorts, lo, NULL)) != -1) {
        if (code == '?') {
            const char *bad = argv[optind - 1];
            if (optopt && optopt < CODE_BASE && bad[0] == '-' && bad[1] != '-') {
                rc = sr_cli_fail(c, "unknown option '-%c' (see --help)", optopt);
            } else if (optopt >= CODE_BASE) { /* a long option that takes no value, given one */
                rc = sr_cli_fail(c, "%s takes no value (got '%s')",
                                 sr_cli_opt_display(flat[optopt - CODE_BASE].opt, name, sizeof name), bad);
            } else {
                snprintf(name, sizeof name, "%s", bad + (bad[0] == '-' ? (bad[1] == '-' ? 2 : 1) : 0));
                char *eq = strchr(name, '=');
                if (eq)
                    *eq = '\0';
                const char *s = sr_yaml_suggest(name, names);
                if (s)
                    rc = sr_cli_fail(c, "unknown option '%s'; did you mean '--%s'?", bad, s);
                else
                    rc = sr_cli_fail(c, "unknown option '%s' (see --help)", bad);
            }
            break;
        }
        if (code == ':') { /* a known option at the end of the line, missing its value */
            size_t i = optopt >= CODE_BASE ? (size_t)(optopt - CODE_BASE)
                       : optopt > 0 && optopt < 128 && short_of[optopt] ? (size_t)(short_of[optopt] - 1)
                                                                      : n;
            if (i < n)
                rc = sr_cli_fail(c, "%s needs a value (see --help)", sr_cli_opt_display(flat[i].opt, name, sizeof name));
            else
                rc = sr_cli_fail(c, "an option needs a value (see --help)");
            break;
        }
        size_t i = code >= CODE_BASE ? (size_t)(code - CODE_BASE) : (size_t)(short_of[code & 127] - 1);
        if (i >= n) {
            rc = sr_cli_fail(c, "unexpected option");
            break;
        }
        if (optarg && !repeatable(&flat[i])) {
            for (size_t k = 0; k < nseen && !rc; k++)
                if (seen[k].i == i)
                    rc = sr_cli_fail(c, "%s: given twice ('%s', then '%s'); give it once",
                                     sr_cli_opt_display(flat[i].opt, name, sizeof name), seen[k].arg, optarg);
            if (rc)
                break;
            if (nseen < sizeof seen / sizeof seen[0]) {
                seen[nseen].i = i;
                seen[nseen++].arg = optarg;
            }
        }
        rc = take(c, &flat[i], optarg, opts);
    }
    free(flat);
    free(lo);
    free(names);
    if (rc)
        return rc;
    /* the outputs before any work: a bad one fails first, with one line,
     * and nothing is computed; each gets its temporary now */
    if (c->output && (rc = sr_cli_output(c, "-o", c->output)))
        return rc;
    if (c->plot_prefix && (rc = sr_cli_plot_reserve(c, c->plot_prefix)))
        return rc;
    if (first_arg)
        *first_arg = optind;
    else if (optind < argc)
        return sr_cli_fail(c, "unexpected argument '%s' (%s takes options only)", argv[optind], c->cmd);
    return 0;
}

/* ---- writing the help ---- */

typedef struct wr {
    FILE *f;
    size_t col, indent;
    int fresh;   /* nothing on this line yet after its indent */
    int pending; /* at a new line whose indent is not written yet */
} wr;

static void wr_newline(wr *w)
{
    fputc('\n', w->f);
    w->col = 0;
    w->fresh = 1;
    w->pending = 1;
}

static void wr_indent(wr *w)
{
    if (w->pending) {
        fprintf(w->f, "%*s", (int)w->indent, "");
        w->col = w->indent;
        w->pending = 0;
    }
}

static void wr_word(wr *w, const char *s, size_t len)
{
    if (!w->fresh && w->col + 1 + len > WIDTH)
        wr_newline(w);
    wr_indent(w);
    if (!w->fresh) {
        fputc(' ', w->f);
        w->col++;
    }
    fwrite(s, 1, len, w->f);
    w->col += len;
    w->fresh = 0;
}

void sr_cli_wrap(FILE *f, const char *text, size_t col, size_t indent)
{
    wr w = {f, col, indent, 1, 0};
    const char *p = text ? text : "";
    while (*p) {
        const char *end = strchr(p, '\n');
        size_t len = end ? (size_t)(end - p) : strlen(p);
        if (len == 0) { /* an empty line: a new paragraph */
            if (!w.fresh)
                wr_newline(&w);
            fputc('\n', f);
        } else if (p[0] == ' ') { /* kept as written */
            if (!w.fresh)
                wr_newline(&w);
            wr_indent(&w);
            fwrite(p, 1, len, f);
            w.fresh = 0;
            wr_newline(&w);
        } else {
            for (size_t i = 0; i < len;) {
                while (i < len && p[i] == ' ')
                    i++;
                size_t j = i;
                int quoted = 0; /* a quoted value ("0.02 m2") stays on one line */
                while (j < len && (p[j] != ' ' || quoted)) {
                    if (p[j] == '"')
                        quoted = !quoted;
                    j++;
                }
                if (j > i)
                    wr_word(&w, p + i, j - i);
                i = j;
            }
        }
        p += len + (end ? 1 : 0);
    }
    if (!w.fresh)
        fputc('\n', f);
}

/* "  -o, --output FILE" and its help from column 27 (on the next line when
 * the label is longer). */
static void print_option(FILE *f, const sr_opt *o, const char *value, const char *help, int indent)
{
    char label[160];
    size_t l = (size_t)snprintf(label, sizeof label, "%*s", indent, "");
    if (o->short_name)
        l += (size_t)snprintf(label + l, sizeof label - l, "-%c%s", o->short_name, o->name ? ", " : "");
    if (o->name)
        l += (size_t)snprintf(label + l, sizeof label - l, "%s%s", o->type == SR_OPTION_ITEM ? "" : "--", o->name);
    if (value)
        l += (size_t)snprintf(label + l, sizeof label - l, " %s", value);
    if (l > sizeof label - 1)
        l = sizeof label - 1;
    fputs(label, f);
    if (l + 1 > LABEL_COL - 1) {
        fputc('\n', f);
        fprintf(f, "%*s", LABEL_COL, "");
    } else {
        fprintf(f, "%*s", (int)(LABEL_COL - l), "");
    }
    sr_cli_wrap(f, help && *help ? help : "", LABEL_COL, LABEL_COL);
}

/* A blank line before a heading, a group or a paragraph, unless one is there. */
static void blank(FILE *f, const char *buf, size_t len)
{
    if (len >= 2 && buf[len - 1] == '\n' && buf[len - 2] == '\n')
        return;
    if (len >= 1)
        fputc('\n', f);
}

static void print_entries(FILE *f, char **buf, size_t *len, const sr_opt *top, const sr_opt *t, int in_group)
{
    for (; t->type != SR_OPTION_END; t++) {
        fflush(f);
        switch (t->type) {
        case SR_OPTION_STRING:
        case SR_OPTION_FLAG:
        case SR_OPTION_CALL:
        case SR_OPTION_HELP: {
            const sr_opt *own = in_group ? find_row(top, SR_OPTION_FOR, t->name) : NULL;
            if (in_group && find_row(top, SR_OPTION_WITHOUT, t->name))
                break;
            print_option(f, t, own && own->value ? own->value : t->value, own ? own->help : t->help, 2);
            break;
        }
        case SR_OPTION_ITEM:
            print_option(f, t, NULL, t->help, 6);
            break;
        case SR_OPTION_HEADING:
            blank(f, *buf, *len);
            fprintf(f, "%s\n", t->help);
            break;
        case SR_OPTION_TEXT:
            blank(f, *buf, *len);
            sr_cli_wrap(f, t->help, 0, 0);
            break;
        case SR_OPTION_GROUP:
            if (t->group[0].type == SR_OPTION_HEADING)
                blank(f, *buf, *len);
            print_entries(f, buf, len, top, t->group, 1);
            break;
        default:
            break;
        }
    }
}

void sr_cli_print_help(sr_cli *c)
{
    const sr_command *cmd = c->command;
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    if (!f) {
        sr_cli_help(c, cmd->usage);
        return;
    }
    fputs(cmd->usage, f);
    fputc('\n', f);
    sr_cli_wrap(f, cmd->about, 0, 0);
    fputc('\n', f);
    print_entries(f, &buf, &len, cmd->options, cmd->options, 0);
    /* the tables --table can pick */
    sr_opt_flat *flat = malloc(SR_OPT_MAX * sizeof *flat);
    size_t n = flat ? sr_cli_opt_flatten(cmd->options, flat, SR_OPT_MAX) : 0;
    int has_table = 0;
    for (size_t i = 0; i < n; i++)
        has_table |= flat[i].opt->name && strcmp(flat[i].opt->name, "table") == 0;
    free(flat);
    if (has_table && sr_cli_tables(c->cmd)) {
        char names[512], line[640];
        sr_cli_tables_list(c->cmd, names, sizeof names);
        snprintf(line, sizeof line, "Tables of its output (--table NAME): %s", names);
        fflush(f);
        blank(f, buf, len);
        sr_cli_wrap(f, line, 0, 2);
    }
    fclose(f);
    sr_cli_help(c, buf);
    free(buf);
}
