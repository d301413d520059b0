/* test_csvtable.c - header-driven numeric CSV: units in the header, free
 * column order, comments, quoting and line ends per RFC 4180, and one clear
 * file:line:column message for every kind of bad file. */
#include "testutil.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "files/csvtable.h"

#define NIST "NIST SP 811 (2008) App. B"
#define RFC "RFC 4180 sec. 2 (CSV format)"

/* A sounding-like table: two required columns with units, one optional
 * column with units, one optional pure number. */
static const sr_csv_column COLS[] = {
    {"altitude", SR_Q_LENGTH, 1},
    {"temperature", SR_Q_TEMP, 1},
    {"wind-speed", SR_Q_SPEED, 0},
    {"cd", SR_Q_NONE, 0},
};
#define NCOLS (sizeof COLS / sizeof COLS[0])

static sr_csvtable parse_ok(const char *text, size_t len)
{
    sr_csvtable t;
    sr_error e;
    if (sr_csvtable_parse(&t, "t.csv", text, len, COLS, NCOLS, &e) != SR_OK)
        fail_msg("unexpected error: %s", e.msg);
    return t;
}
#define PARSE_OK(s) parse_ok((s), sizeof(s) - 1)

/* ---- files that load ----------------------------------------------------- */

static void test_units_in_header(void **state)
{
    (void)state;
    sr_csvtable t = PARSE_OK("altitude [ft],temperature [F],wind-speed [kn],cd\n"
                             "1000,59,10,0.75\n"
                             "2000,41,20,0.8\n");
    assert_int_equal(t.nrows, 2);
    assert_int_equal(t.ncols, NCOLS);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "1000 ft column value (m)", NIST ": 1 ft = 0.3048 m exactly", 304.8,
                    t.col[0][0], 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "59 F column value (K)", NIST ": T/K = (t/F + 459.67)/1.8", 288.15, t.col[1][0],
                    1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "41 F column value (K)", NIST ": T/K = (t/F + 459.67)/1.8", 278.15, t.col[1][1],
                    1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "20 kn column value (m/s)", NIST ": 1 knot = 1852 m/h exactly",
                    20.0 * 1852.0 / 3600.0, t.col[2][1], 1e-15);
    assert_true(t.col[3][1] == 0.8); /* a pure number passes unchanged */
    assert_true(t.row_line[0] == 2 && t.row_line[1] == 3);
    sr_csvtable_free(&t);
    assert_null(t.col[0]);
    assert_null(t.row_line);
    sr_csvtable_free(&t); /* idempotent */

    /* spaces around names and units; metric prefixes; C */
    t = PARSE_OK("  altitude [ km ] ,temperature[C]\n1.5,-56.5\n");
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "1.5 km column value (m)", "NIST SP 811 (2008) ch. 4 (SI prefixes)", 1500.0,
                    t.col[0][0], 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "-56.5 C column value (K)", NIST ": T/K = t/C + 273.15", 216.65, t.col[1][0],
                    1e-13);
    assert_null(t.col[2]); /* absent optional columns stay NULL */
    assert_null(t.col[3]);
    sr_csvtable_free(&t);
}

static void test_column_order(void **state)
{
    (void)state;
    sr_csvtable a = PARSE_OK("altitude [m],temperature [K],cd\n0,288.15,1\n100,287.5,2\n");
    sr_csvtable b = PARSE_OK("cd,temperature [K],altitude [m]\n1,288.15,0\n2,287.5,100\n");
    sr_csvtable c = PARSE_OK("temperature [K],cd,altitude [m]\n288.15,1,0\n287.5,2,100\n");
    for (size_t i = 0; i < 2; i++)
        for (size_t j = 0; j < NCOLS; j++) {
            if (!a.col[j]) {
                assert_null(b.col[j]);
                assert_null(c.col[j]);
                continue;
            }
            assert_true(a.col[j][i] == b.col[j][i] && a.col[j][i] == c.col[j][i]);
        }
    sr_csvtable_free(&a);
    sr_csvtable_free(&b);
    sr_csvtable_free(&c);
}

static void test_comments_and_blank_lines(void **state)
{
    (void)state;
    sr_csvtable t = PARSE_OK("# a comment before the header\n"
                             "\n"
                             "altitude [m],temperature [K]\n"
                             "   # indented comment\n"
                             "0,288.15\n"
                             "\n"
                             "  \t \n"
                             "100,287.5\n"
                             "# trailing comment without a newline");
    assert_int_equal(t.nrows, 2);
    assert_true(t.row_line[0] == 5 && t.row_line[1] == 8);
    assert_true(t.col[0][1] == 100.0);
    sr_csvtable_free(&t);
    /* the last row without a line end */
    t = PARSE_OK("altitude [m],temperature [K]\n0,288.15\n100,287.5");
    assert_int_equal(t.nrows, 2);
    sr_csvtable_free(&t);
}

static void test_quoting_and_line_ends(void **state)
{
    (void)state;
    /* RFC 4180: quoted fields, CRLF line breaks, an optional final CRLF */
    sr_csvtable t = PARSE_OK("\"altitude [m]\",\"temperature [K]\"\r\n\"0\",\"288.15\"\r\n\" 100 \",287.5\r\n");
    assert_int_equal(t.nrows, 2);
    CHECK_REL_CLASS(SR_CHECK_FORMAT, "quoted cell \"288.15\" (K)", RFC, 288.15, t.col[1][0], 0.0);
    CHECK_REL_CLASS(SR_CHECK_FORMAT, "quoted cell \" 100 \" with spaces (m)", RFC, 100.0, t.col[0][1], 0.0);
    assert_true(t.row_line[1] == 3);
    sr_csvtable_free(&t);

    /* a comma inside quotes is part of the header cell, so "a,b" is one (unknown) name */
    sr_csvtable u;
    sr_error e;
    static const char q[] = "\"altitude, above sea [m]\",temperature [K]\n0,1\n";
    assert_int_equal(sr_csvtable_parse(&u, "q.csv", q, sizeof q - 1, COLS, NCOLS, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "unknown column 'altitude, above sea'"));

    /* CRLF without a final line end */
    t = PARSE_OK("altitude [m],temperature [K]\r\n0,288.15\r\n100,287.5");
    assert_int_equal(t.nrows, 2);
    sr_csvtable_free(&t);
    /* lone CR line ends (old spreadsheet exports), with a comment */
    t = PARSE_OK("# exported\raltitude [m],temperature [K]\r0,288.15\r100,287.5\r");
    assert_int_equal(t.nrows, 2);
    assert_true(t.row_line[0] == 3 && t.row_line[1] == 4);
    sr_csvtable_free(&t);
    /* a UTF-8 byte-order mark before the header */
    t = PARSE_OK("\xEF\xBB\xBF" "altitude [m],temperature [K]\n0,288.15\n");
    assert_int_equal(t.nrows, 1);
    sr_csvtable_free(&t);
    /* tabs around cells */
    t = PARSE_OK("altitude [m]\t,\ttemperature [K]\n\t0 ,\t288.15\n");
    assert_true(t.col[1][0] == 288.15);
    sr_csvtable_free(&t);
}

static void test_load_file(void **state)
{
    (void)state;
    /* a longer table read from disk: growth of the column arrays */
    size_t n = 1000, cap = 64 + n * 32;
    char *text = malloc(cap);
    assert_non_null(text);
    size_t len = (size_t)snprintf(text, cap, "altitude [m],temperature [K]\n");
    for (size_t i = 0; i < n; i++)
        len += (size_t)snprintf(text + len, cap - len, "%zu,%.2f\n", i * 10, 288.15 - 0.0065 * (double)(i * 10));
    const char *path = sr_test_tmpfile(".csv", text);
    free(text);
    assert_non_null(path);
    sr_csvtable t;
    sr_error e;
    if (sr_csvtable_load(&t, path, COLS, NCOLS, &e) != SR_OK)
        fail_msg("%s", e.msg);
    assert_int_equal(t.nrows, n);
    assert_true(t.col[0][n - 1] == 9990.0);
    assert_true(t.row_line[n - 1] == n + 1);
    assert_int_equal(sr_csvtable_require_increasing(&t, 0, path, "altitude", &e), SR_OK);
    /* temperature falls: not increasing, reported at the line of row 2 */
    assert_int_equal(sr_csvtable_require_increasing(&t, 1, path, "temperature", &e), SR_EINVAL);
    char want[300];
    snprintf(want, sizeof want, "%s:3:1: temperature must increase", path);
    assert_non_null(strstr(e.msg, want));
    /* an absent optional column has nothing to check */
    assert_int_equal(sr_csvtable_require_increasing(&t, 2, path, "wind", &e), SR_OK);
    sr_csvtable_free(&t);
    unlink(path);

    assert_int_equal(sr_csvtable_load(&t, "/nonexistent/dir/table.csv", COLS, NCOLS, &e), SR_EIO);
    assert_non_null(strstr(e.msg, "/nonexistent/dir/table.csv: cannot open"));
    /* an empty file on disk */
    path = sr_test_tmpfile(".csv", "");
    assert_int_equal(sr_csvtable_load(&t, path, COLS, NCOLS, &e), SR_EINVAL);
    snprintf(want, sizeof want, "%s:1:1: empty table", path);
    assert_non_null(strstr(e.msg, want));
    unlink(path);
}

/* ---- files that must fail, and where the message points ---------------- */

typedef struct bad_table {
    const char *what;
    const char *text;
    size_t len; /* 0: strlen(text) */
    const char *where; /* "t.csv:line:column: " */
    const char *says;
} bad_table;

static const char NUL_ROW[] = "altitude [m],temperature [K]\n0,1\0\n";

static const bad_table BAD[] = {
    {"non-numeric cell", "altitude [m],temperature [C]\n0,abc\n", 0, "t.csv:2:3: ", "'abc' is not a number"},
    {"NaN cell", "altitude [m],temperature [C]\n0,15\n100,NaN\n", 0, "t.csv:3:5: ", "not a number"},
    {"huge cell", "altitude [m],temperature [C]\n1e999,15\n", 0, "t.csv:2:1: ", "out of the range"},
    {"hex cell", "altitude [m],temperature [C]\n0x10,15\n", 0, "t.csv:2:1: ", "hexadecimal"},
    {"unit in a cell", "altitude [m],temperature [K]\n0,1 K\n", 0, "t.csv:2:3: ", "takes no unit"},
    {"empty cell", "altitude [m],temperature [K]\n,1\n", 0, "t.csv:2:1: ", "empty cell in column 'altitude'"},
    {"short row", "altitude [m],temperature [C]\n0,15\n10\n", 0, "t.csv:3:3: ", "row has 1 of the header's 2 cells"},
    {"short row, CRLF", "altitude [m],temperature [C]\r\n0\r\n", 0, "t.csv:2:2: ", "row has 1 of the header's 2"},
    {"long row", "altitude [m],temperature [C]\n0,15,3\n", 0, "t.csv:2:6: ", "more cells than the header's 2 columns"},
    {"unknown column", "altitude [m],temp [C]\n0,1\n", 0, "t.csv:1:14: ",
     "unknown column 'temp' (expected: altitude, temperature, wind-speed, cd)"},
    {"duplicate column", "altitude [m],temperature [K],altitude [ft]\n0,1,2\n", 0, "t.csv:1:30: ",
     "column 'altitude' appears twice"},
    {"missing required column", "altitude [m],cd\n0,1\n", 0, "t.csv:1:1: ", "the header has no 'temperature' column"},
    {"empty file", "", 0, "t.csv:1:1: ", "empty table"},
    {"only comments", "# nothing\n\n   \n", 0, "t.csv:1:1: ", "empty table"},
    {"header only", "altitude [m],temperature [K]\n", 0, "t.csv:1:1: ", "header but no data rows"},
    {"header and comments only", "altitude [m],temperature [K]\n# none\n\n", 0, "t.csv:3:1: ",
     "header but no data rows"},
    {"binary NUL", NUL_ROW, sizeof NUL_ROW - 1, "t.csv:2:4: ", "NUL byte"},
    {"missing unit", "altitude,temperature [C]\n0,1\n", 0, "t.csv:1:1: ",
     "column 'altitude' needs a unit in brackets, e.g. \"altitude [m]\""},
    {"unknown unit", "altitude [m],temperature [Q]\n0,1\n", 0, "t.csv:1:14: ",
     "unknown temperature unit 'Q' in column 'temperature' (accepted: K, C, F, R)"},
    {"unit of the wrong quantity", "altitude [kg],temperature [C]\n0,1\n", 0, "t.csv:1:1: ", "unknown length unit 'kg'"},
    {"unit on a pure number", "altitude [m],temperature [K],cd [m]\n0,1,2\n", 0, "t.csv:1:30: ",
     "column 'cd' takes no unit"},
    {"malformed unit", "altitude [m,temperature [K]\n0,1\n", 0, "t.csv:1:1: ", "malformed unit"},
    {"text after the unit", "altitude [m] above,temperature [K]\n0,1\n", 0, "t.csv:1:1: ", "malformed unit"},
    {"empty header cell", "altitude [m],temperature [K],\n0,1,\n", 0, "t.csv:1:30: ", "empty column name"},
    {"stray quote", "altitude [m],temperature [K]\n0,1\"2\n", 0, "t.csv:2:3: ", "malformed CSV"},
    {"unclosed quote at the end", "altitude [m],temperature [K]\n0,15\n100,\"14\n", 0, "t.csv:3:5: ",
     "a quoted cell runs past the end of its line"},
    {"quoted cell over a comment line", "altitude [m],temperature [K]\n0,\"15\n# note\n\",1\n", 0, "t.csv:2:3: ",
     "a quoted cell runs past the end of its line"},
    {"unclosed quote, no line end", "altitude [m],temperature [K]\n0,15\n100,\"14", 0, "t.csv:3:8: ",
     "ends inside a quoted cell"},
    {"error after CRLF lines", "altitude [m],temperature [C]\r\n0,15\r\n100,x\r\n", 0, "t.csv:3:5: ",
     "'x' is not a number"},
    {"error after lone-CR lines", "altitude [m],temperature [C]\r0,15\r100,x\r", 0, "t.csv:3:5: ",
     "'x' is not a number"},
    {"overlong cell",
     "altitude [m],temperature [K]\n0,"
     "1111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111"
     "1111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111111"
     "11111111111111111111111111111111111111111111111111111111111111111\n",
     0, "t.csv:2:3: ", "cell longer than 255 characters"},
};

static void test_errors(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        const bad_table *b = &BAD[i];
        sr_csvtable t;
        sr_error e;
        sr_error_clear(&e);
        size_t len = b->len ? b->len : strlen(b->text);
        int rc = sr_csvtable_parse(&t, "t.csv", b->text, len, COLS, NCOLS, &e);
        if (rc != SR_EINVAL || strstr(e.msg, b->where) != e.msg || !strstr(e.msg, b->says) || strchr(e.msg, '\n'))
            fail_msg("%s: rc %d, message '%s' (want SR_EINVAL, '%s...%s')", b->what, rc, e.msg, b->where, b->says);
        /* nothing is left allocated on error */
        for (size_t j = 0; j < SR_CSVTABLE_MAX_COLS; j++)
            assert_null(t.col[j]);
        assert_null(t.row_line);
        assert_int_equal(t.nrows, 0);
    }
    /* a NULL error struct still gets a status */
    sr_csvtable t;
    assert_int_equal(sr_csvtable_parse(&t, "t.csv", "x\n1\n", 4, COLS, NCOLS, NULL), SR_EINVAL);
    /* more specs than the table can hold is the caller's mistake */
    static const sr_csv_column MANY[13] = {{"a", SR_Q_NONE, 0}, {"b", SR_Q_NONE, 0}, {"c", SR_Q_NONE, 0}, {"j", SR_Q_NONE, 0}, {"k", SR_Q_NONE, 0}, {"l", SR_Q_NONE, 0}, {"m", SR_Q_NONE, 0},
                                          {"d", SR_Q_NONE, 0}, {"e", SR_Q_NONE, 0}, {"f", SR_Q_NONE, 0},
                                          {"g", SR_Q_NONE, 0}, {"h", SR_Q_NONE, 0}, {"i", SR_Q_NONE, 0}};
    sr_error e;
    assert_int_equal(sr_csvtable_parse(&t, "t.csv", "a\n1\n", 4, MANY, 13, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "internal"));
}

static void test_row_limit(void **state)
{
    (void)state;
    /* one row past the limit is refused at that row's line */
    size_t n = SR_CSVTABLE_MAX_ROWS + 1, cap = 32 + n * 8;
    char *text = malloc(cap);
    assert_non_null(text);
    size_t len = (size_t)snprintf(text, cap, "cd\n");
    for (size_t i = 0; i < n; i++)
        len += (size_t)snprintf(text + len, cap - len, "%zu\n", i % 10);
    static const sr_csv_column ONE[] = {{"cd", SR_Q_NONE, 1}};
    sr_csvtable t;
    sr_error e;
    assert_int_equal(sr_csvtable_parse(&t, "big.csv", text, len, ONE, 1, &e), SR_EINVAL);
    char want[64];
    snprintf(want, sizeof want, "big.csv:%zu:1: more than 100000 rows", n + 1);
    assert_non_null(strstr(e.msg, want));
    /* exactly at the limit is fine */
    len -= 2; /* drop the last row */
    assert_int_equal(sr_csvtable_parse(&t, "big.csv", text, len, ONE, 1, &e), SR_OK);
    assert_int_equal(t.nrows, SR_CSVTABLE_MAX_ROWS);
    sr_csvtable_free(&t);
    free(text);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_units_in_header),       cmocka_unit_test(test_column_order),
        cmocka_unit_test(test_comments_and_blank_lines), cmocka_unit_test(test_quoting_and_line_ends),
        cmocka_unit_test(test_load_file),             cmocka_unit_test(test_errors),
        cmocka_unit_test(test_row_limit),
    };
    return cmocka_run_group_tests_name("csvtable", tests, NULL, NULL);
}
