/* test_completion.c - `sinkrate --completion bash`: bash reads the script
 * (bash -n), it lists every command and, for each, exactly the options its
 * --help shows (the help and the option table are written apart, so each
 * checks the other), and sourced in bash it completes commands, options and
 * the values of --format, --units and --table. */
#define _DEFAULT_SOURCE
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli/commands.h"
#include "testutil.h"


static char *script(void)
{
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "--completion", "bash", NULL);
    assert_int_equal(rc, 0);
    assert_string_equal(err, "");
    free(err);
    return out;
}

/* The opts='...' list of a command in the script. */
static char *opts_of(const char *s, const char *cmd)
{
    char head[64];
    snprintf(head, sizeof head, "\n    %s)\n        opts='", cmd);
    const char *p = strstr(s, head);
    if (!p)
        return NULL;
    p += strlen(head);
    const char *e = strchr(p, '\'');
    return e ? strndup(p, (size_t)(e - p)) : NULL;
}

static int has_word(const char *list, const char *w)
{
    size_t n = strlen(w);
    for (const char *p = list; (p = strstr(p, w)); p += n)
        if ((p == list || p[-1] == ' ') && (p[n] == ' ' || p[n] == '\0'))
            return 1;
    return 0;
}

static void test_syntax_and_every_option(void **state)
{
    (void)state;
    char *s = script();
    const char *path = sr_test_tmpfile(".bash", s);
    char cmd[1024];
    snprintf(cmd, sizeof cmd, "bash -n '%s'", path);
    assert_int_equal(system(cmd), 0);
    for (const sr_command *const *cmd = sr_cli_commands; *cmd; cmd++) {
        const char *name = (*cmd)->name;
        char *opts = opts_of(s, name);
        if (!opts)
            fail_msg("no options of '%s' in the script", name);
        char *out, *err;
        assert_int_equal(sr_test_cli(&out, &err, name, "--help", NULL), 0);
        /* every option the help names is in the list ... */
        for (const char *p = out; (p = strstr(p, "  --")); p += 4) {
            char name[64];
            if (sscanf(p + 2, "%63[a-z0-9-]", name) != 1)
                continue;
            if (!has_word(opts, name))
                fail_msg("%s: --help shows %s, the completion does not offer it", name, name);
        }
        /* ... and every option in the list is in the help */
        char *copy = strdup(opts), *save = NULL;
        for (char *w = strtok_r(copy, " ", &save); w; w = strtok_r(NULL, " ", &save)) {
            char a[80], b[80];
            snprintf(a, sizeof a, "%s,", w);
            snprintf(b, sizeof b, "%s ", w);
            if (!strstr(out, a) && !strstr(out, b))
                fail_msg("%s: the completion offers %s, --help does not show it", name, w);
        }
        free(copy);
        free(out);
        free(err);
        free(opts);
    }
    free(s);
}

/* The script sourced in bash: what it offers after a few typed words. */
static void test_completes_in_bash(void **state)
{
    (void)state;
    char *s = script();
    const char *path = sr_test_tmpfile(".bash", s);
    static const struct {
        const char *words; /* COMP_WORDS, the last one being completed */
        const char *want;  /* in COMPREPLY */
        const char *not;   /* not in it (or NULL) */
    } CASES[] = {
        {"sinkrate pro", "profile", "size"},
        {"sinkrate rate --fo", "--format", "--mass"},
        {"sinkrate rate --format \"\"", "json", NULL},
        {"sinkrate air --units \"\"", "us", NULL},
        {"sinkrate dispersion --ta", "--table", NULL},
        {"sinkrate dispersion --table p", "percentiles", "rates"},
        {"sinkrate size --fam", "--family", NULL},
        {"sinkrate --comp", "--completion", NULL},
    };
    for (size_t i = 0; i < sizeof CASES / sizeof CASES[0]; i++) {
        char cmd[2048], out[4096] = "";
        snprintf(cmd, sizeof cmd,
                 "bash -c 'source \"%s\"; COMP_WORDS=(%s); COMP_CWORD=$((${#COMP_WORDS[@]} - 1)); _sinkrate; "
                 "printf \"%%s\\n\" \"${COMPREPLY[@]}\"' 2>&1",
                 path, CASES[i].words);
        FILE *f = popen(cmd, "r");
        assert_non_null(f);
        size_t n = fread(out, 1, sizeof out - 1, f);
        out[n] = '\0';
        assert_int_equal(pclose(f), 0);
        char want[80];
        snprintf(want, sizeof want, "%s\n", CASES[i].want);
        if (!strstr(out, want) || (CASES[i].not && strstr(out, CASES[i].not)))
            fail_msg("'%s': want '%s'%s%s, got:\n%s", CASES[i].words, CASES[i].want, CASES[i].not ? " and not " : "",
                     CASES[i].not ? CASES[i].not : "", out);
    }
    free(s);
    char *out, *err;
    assert_int_equal(sr_test_cli(&out, &err, "--completion", "zsh", NULL), 2);
    assert_non_null(strstr(err, "--completion: give the shell: bash"));
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_syntax_and_every_option),
        cmocka_unit_test(test_completes_in_bash),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
