/* tables.c - which tables each command writes (the keys its report gives
 * sr_report_table); tests/test_tables.c checks every one against the real
 * output, so this list cannot drift from the commands. */
#include "cli/tables.h"

#include <ctype.h>
#include <stdio.h>
#include <string.h>

typedef struct cmd_tables {
    const char *cmd;
    const char *const names[16];
} cmd_tables;

static const cmd_tables TABLES[] = {
    {"size", {"values", "rate_of_typical_size", NULL}},
    {"rate", {"values", "rates", NULL}},
    {"sweep", {"values", "sweep", NULL}},
    {"profile",
     {"values", "sections", "free_fall_drag", "stages", "timeline", "stage_results", "touchdown", "energy", "limits",
      "attitudes", "failure_case_list", "failure_cases", NULL}},
    {"loads", {"values", "methods", "stages", "limits", NULL}},
    {"freefall", {"values", "equilibria", "trace_N", NULL}},
    {"dispersion", {"values", "uncertainty", "percentiles", "limits", NULL}},
    {"air", {"values", "atmosphere", NULL}},
    {"canopies", {"values", "families", NULL}},
    {"check", {"values", "files", NULL}},
    {"fit", {"values", "segments", "windows", "drag", "rates", "opening", "wind", "pooled", NULL}},
    {"design", {"values", "designs", "margins", "limits", "packing", "misses", "pareto", "risk", NULL}},
};

const char *const *sr_cli_tables(const char *cmd)
{
    for (size_t i = 0; cmd && i < sizeof TABLES / sizeof TABLES[0]; i++)
        if (strcmp(TABLES[i].cmd, cmd) == 0)
            return TABLES[i].names;
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
