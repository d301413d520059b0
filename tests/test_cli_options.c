/* test_cli_options.c - the option tables (cli/options.h): every option of
 * every command is in its --help and in the man page, no two options of a
 * command share a name, a command's own words name options it includes, and
 * reading options keeps its rules (a value given twice, a flag given a value,
 * a missing value, an unknown option with a suggestion). */
#define _DEFAULT_SOURCE
#include <ctype.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/cliplot.h"
#include "testutil.h"

/* Whether word occurs in text as a whole option name (not inside a longer
 * one: "--plot" is not found in "--plot-size"). */
static int has_word(const char *text, const char *word)
{
    size_t n = strlen(word);
    for (const char *p = strstr(text, word); p; p = strstr(p + 1, word)) {
        int before = p == text || !(isalnum((unsigned char)p[-1]) || p[-1] == '-');
        int after = !(isalnum((unsigned char)p[n]) || p[n] == '-');
        if (before && after)
            return 1;
    }
    return 0;
}

/* How --help starts the option's line: "  -o, --output", "  -n", "  --mass". */
static void help_label(const sr_opt *o, char *buf, size_t len)
{
    if (o->short_name && o->name)
        snprintf(buf, len, "\n  -%c, --%s", o->short_name, o->name);
    else if (o->short_name)
        snprintf(buf, len, "\n  -%c", o->short_name);
    else
        snprintf(buf, len, "\n  --%s", o->name);
}

static void test_every_option_in_help(void **state)
{
    (void)state;
    for (const sr_command *const *cmd = sr_cli_commands; *cmd; cmd++) {
        sr_opt_flat flat[SR_OPT_MAX];
        size_t n = sr_cli_opt_flatten((*cmd)->options, flat, SR_OPT_MAX);
        assert_true(n > 0 && n < SR_OPT_MAX);
        char *out, *err;
        assert_int_equal(sr_test_cli(&out, &err, (*cmd)->name, "--help", NULL), 0);
        for (size_t i = 0; i < n; i++) {
            char label[96];
            help_label(flat[i].opt, label, sizeof label);
            const char *at = strstr(out, label);
            while (at && !(at[strlen(label)] == ' ' || at[strlen(label)] == '\n'))
                at = strstr(at + 1, label);
            if (!at)
                fail_msg("%s --help does not list %s", (*cmd)->name, label + 3);
            if (!flat[i].help || !flat[i].help[0])
                fail_msg("%s: %s has no help line", (*cmd)->name, label + 3);
            if ((flat[i].opt->type == SR_OPTION_STRING || flat[i].opt->type == SR_OPTION_CALL) && !flat[i].value &&
                flat[i].opt->type == SR_OPTION_STRING)
                fail_msg("%s: %s keeps a value but names none", (*cmd)->name, label + 3);
        }
        /* every help line fits 80 columns, unless a single word is longer */
        for (const char *l = out; *l;) {
            const char *e = strchr(l, '\n');
            size_t len = e ? (size_t)(e - l) : strlen(l);
            if (len > 80 && memchr(l, ' ', len) && strncmp(l, "usage:", 6) != 0 && l[0] != ' ') {
                /* usage lines are written as they are */
                fail_msg("%s --help: a line of %zu columns: %.*s", (*cmd)->name, len, (int)len, l);
            }
            l += len + (e ? 1 : 0);
        }
        free(out);
        free(err);
    }
}

static void test_no_two_options_collide(void **state)
{
    (void)state;
    for (const sr_command *const *cmd = sr_cli_commands; *cmd; cmd++) {
        sr_opt_flat flat[SR_OPT_MAX];
        size_t n = sr_cli_opt_flatten((*cmd)->options, flat, SR_OPT_MAX);
        /* every command takes the output options, -h/--help among them */
        int help = 0;
        for (size_t i = 0; i < n; i++)
            help |= flat[i].opt->type == SR_OPTION_HELP && flat[i].group && flat[i].group->group == sr_cli_group_output;
        if (!help)
            fail_msg("%s does not include sr_cli_group_output (-o, --format, --help, ...)", (*cmd)->name);
        for (size_t i = 0; i < n; i++) {
            const sr_opt *a = flat[i].opt;
            assert_true(a->name || a->short_name);
            for (size_t k = i + 1; k < n; k++) {
                const sr_opt *b = flat[k].opt;
                if (a->name && b->name && strcmp(a->name, b->name) == 0)
                    fail_msg("%s: two options --%s", (*cmd)->name, a->name);
                if (a->short_name && a->short_name == b->short_name)
                    fail_msg("%s: two options -%c", (*cmd)->name, a->short_name);
            }
        }
        /* a command's own words (SR_OPT_FOR, SR_OPT_WITHOUT) name an option of a group it includes */
        for (const sr_opt *t = (*cmd)->options; t->type != SR_OPTION_END; t++) {
            if (t->type != SR_OPTION_FOR && t->type != SR_OPTION_WITHOUT)
                continue;
            int found = 0;
            for (const sr_opt *g = (*cmd)->options; g->type != SR_OPTION_END; g++)
                if (g->type == SR_OPTION_GROUP)
                    for (const sr_opt *o = g->group; o->type != SR_OPTION_END; o++)
                        found |= o->name && strcmp(o->name, t->name) == 0;
            if (!found)
                fail_msg("%s: its words for --%s name no option of a group it includes", (*cmd)->name, t->name);
        }
    }
}

/* The man page's text with the roff escapes for a hyphen and fonts removed. */
static char *man_text(void)
{
    FILE *f = fopen(sr_test_path("docs/sinkrate.1"), "r");
    assert_non_null(f);
    char *buf = calloc(1, 1 << 20);
    size_t len = fread(buf, 1, (1 << 20) - 1, f);
    fclose(f);
    char *o = buf;
    for (size_t i = 0; i < len; i++) {
        if (buf[i] == '\\' && buf[i + 1] == '-') {
            *o++ = '-';
            i++;
        } else if (buf[i] == '\\' && buf[i + 1] == 'f') {
            i += 2;
        } else if (buf[i] == '"') {
            continue; /* .BI \-\-mass " M" */
        } else {
            *o++ = buf[i];
        }
    }
    *o = '\0';
    return buf;
}

/* The man page section of a heading (".SH NAME" up to the next .SH), or an
 * entry of COMMAND OPTIONS (".TP" then the command's name). */
static char *man_part(const char *man, const char *heading, const char *command)
{
    char h[96];
    snprintf(h, sizeof h, ".SH %s\n", heading);
    const char *s = strstr(man, h);
    if (!s)
        return NULL;
    s += strlen(h);
    const char *e = strstr(s, "\n.SH ");
    size_t len = e ? (size_t)(e - s) : strlen(s);
    char *part = strndup(s, len);
    if (!command)
        return part;
    /* the .TP entries: ".TP\n.B size\n..." */
    for (char *tp = strstr(part, ".TP\n"); tp; tp = strstr(tp + 1, ".TP\n")) {
        char macro[8], name[64];
        if (sscanf(tp + 4, "%7s %63s", macro, name) == 2 && strcmp(name, command) == 0) {
            char *next = strstr(tp + 4, ".TP\n");
            char *entry = strndup(tp, next ? (size_t)(next - tp) : strlen(tp));
            free(part);
            return entry;
        }
    }
    free(part);
    return NULL;
}

/* Where the man page documents a shared group's options (the others: in
 * the command's own entry of COMMAND OPTIONS). */
static const char *group_section(const sr_opt *group)
{
    if (group == sr_cli_group_output)
        return "COMMON OPTIONS";
    if (group == sr_cli_group_atmos)
        return "ATMOSPHERE OPTIONS";
    if (group == sr_cli_group_canopy)
        return "CANOPY OPTIONS";
    if (group == sr_cli_group_plot)
        return "FIGURES";
    return NULL;
}

static void test_every_option_in_man_page(void **state)
{
    (void)state;
    char *man = man_text();
    int missing = 0;
    for (const sr_command *const *cmd = sr_cli_commands; *cmd; cmd++) {
        sr_opt_flat flat[SR_OPT_MAX];
        size_t n = sr_cli_opt_flatten((*cmd)->options, flat, SR_OPT_MAX);
        char *entry = man_part(man, "COMMAND OPTIONS", (*cmd)->name);
        for (size_t i = 0; i < n; i++) {
            const sr_opt *o = flat[i].opt;
            const char *where = flat[i].group ? group_section(flat[i].group->group) : NULL;
            char *part = where ? man_part(man, where, NULL) : NULL;
            char word[96];
            if (o->name)
                snprintf(word, sizeof word, "--%s", o->name);
            else
                snprintf(word, sizeof word, "-%c", o->short_name);
            const char *text = where ? part : entry;
            for (int k = 0; k < 2; k++) {
                if (k == 1 && !(o->short_name && o->name))
                    break;
                if (k == 1)
                    snprintf(word, sizeof word, "-%c", o->short_name);
                if (!text || !has_word(text, word)) {
                    print_error("docs/sinkrate.1 does not document %s %s (in %s)\n", (*cmd)->name, word,
                                where ? where : "its entry of COMMAND OPTIONS");
                    missing++;
                }
            }
            free(part);
        }
        free(entry);
    }
    free(man);
    assert_int_equal(missing, 0);
}

/* The reading rules, on one command (they are the same code for all). */
static const struct {
    const char *args[8];
    const char *expect;
} RULES[] = {
    {{"air", "--temp-offset", "5C", "--temp-offset", "6C"}, "sinkrate air: --temp-offset: given twice ('5C', then '6C'); give it once\n"},
    {{"air", "-o", "a", "-o", "b"}, "sinkrate air: -o: given twice ('a', then 'b'); give it once\n"},
    {{"air", "--help=x"}, "sinkrate air: --help takes no value (got '--help=x')\n"},
    {{"air", "--temp-offset"}, "sinkrate air: --temp-offset needs a value (see --help)\n"},
    {{"air", "-o"}, "sinkrate air: -o needs a value (see --help)\n"},
    {{"air", "--tmp-offset", "5C"}, "sinkrate air: unknown option '--tmp-offset'; did you mean '--temp-offset'?\n"},
    {{"air", "-q"}, "sinkrate air: unknown option '-q' (see --help)\n"},
    {{"air", "--mass", "2kg"}, "sinkrate air: unknown option '--mass' (see --help)\n"},
    {{"air", "x"}, "sinkrate air: unexpected argument 'x' (air takes options only)\n"},
};

static void test_reading_rules(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof RULES / sizeof RULES[0]; i++) {
        char *argv[10] = {"sinkrate"};
        int argc = 1;
        while (argc < 9 && RULES[i].args[argc - 1]) {
            argv[argc] = (char *)RULES[i].args[argc - 1];
            argc++;
        }
        argv[argc] = NULL;
        char *out, *err;
        assert_int_equal(sr_test_cli_argv(&out, &err, argc, argv), 2);
        assert_string_equal(err, RULES[i].expect);
        assert_string_equal(out, "");
        free(out);
        free(err);
    }
}

/* Wrapping keeps a quoted value on one line and a line starting with a
 * space as it is written. */
static void test_wrap(void **state)
{
    (void)state;
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    sr_cli_wrap(f,
                "one two three four five six seven eight nine ten eleven twelve thirteen fourteen fifteen "
                "sixteen \"17 m2\" eighteen\n  kept   as written\nnext",
                0, 4);
    fclose(f);
    assert_string_equal(buf, "one two three four five six seven eight nine ten eleven twelve thirteen fourteen\n"
                             "    fifteen sixteen \"17 m2\" eighteen\n"
                             "      kept   as written\n"
                             "    next\n");
    free(buf);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_every_option_in_help), cmocka_unit_test(test_no_two_options_collide),
        cmocka_unit_test(test_every_option_in_man_page), cmocka_unit_test(test_reading_rules),
        cmocka_unit_test(test_wrap),
    };
    return cmocka_run_group_tests_name("cli_options", tests, NULL, NULL);
}
