/* tables.h - the names of the tables each command's output holds, for
 * --table NAME (one table of the CSV or JSON output) and for --help. */
#ifndef SR_CLI_TABLES_H
#define SR_CLI_TABLES_H

#include <stddef.h>

/* The table names of a command ("values" first: its single values), NULL
 * terminated; NULL for an unknown command. A name ending in "_N" stands for
 * a numbered family (trace_1, trace_2, ...). */
const char *const *sr_cli_tables(const char *cmd);

/* Whether name is one of them (a numbered name matches its family). */
int sr_cli_table_known(const char *cmd, const char *name);

/* "values, rates" for help and messages. */
void sr_cli_tables_list(const char *cmd, char *buf, size_t len);

#endif
