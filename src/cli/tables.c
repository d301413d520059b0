/* tables.c - which tables each command writes (the keys its report gives
 * sr_report_table), from the `tables` list of its sr_command;
 * tests/test_tables.c checks every one against the real output, so the
 * lists cannot drift from the commands. */
#include "cli/tables.h"

#include "cli/commands.h"

#include <ctype.h>
#include <stdio.h>
#include <string.h>

const char *const *sr_cli_tables(const char *cmd)
{
    for (const sr_command *const *c = sr_cli_commands; cmd && *c; c++)
        if (strcmp((*c)->name, cmd) == 0)
            return (*c)->tables;
    return NULL;
}

int sr_cli_table_known(const char *cmd, const char *name)
{
    const char *const *t = sr_cli_tables(cmd);
    for (size_t i = 0; t && t[i]; i++) {
        size_t l = strlen(t[i]);
        if (l > 2 && strcmp(t[i] + l - 2, "_N") == 0) {
            /* a numbered family: the stem, then digits */
            if (strncmp(name, t[i], l - 1) == 0 && name[l - 1]) {
                const char *p = name + l - 1;
                while (isdigit((unsigned char)*p))
                    p++;
                if (!*p)
                    return 1;
            }
        } else if (strcmp(t[i], name) == 0) {
            return 1;
        }
    }
    return 0;
}

void sr_cli_tables_list(const char *cmd, char *buf, size_t len)
{
    const char *const *t = sr_cli_tables(cmd);
    buf[0] = '\0';
    for (size_t i = 0; t && t[i]; i++) {
        size_t l = strlen(buf);
        snprintf(buf + l, len > l ? len - l : 0, "%s%s", i ? ", " : "", t[i]);
    }
}
