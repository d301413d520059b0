/* test_report.c - what a report may hold: no infinite number reaches an
 * output (the command refuses it), and control characters in its texts are
 * written visibly in every format. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "output/report.h"
#include "testutil.h"

static void test_infinite_found(void **state)
{
    (void)state;
    static const struct {
        const char *what;
        int where; /* 0 value, 1 band end, 2 table cell */
        double x;
        const char *label;
    } ROWS[] = {
        {"a finite value", 0, 5.0, NULL},
        {"NaN means none", 0, NAN, NULL},
        {"an infinite value", 0, INFINITY, "descent rate"},
        {"a band's high end", 1, INFINITY, "drag area"},
        {"a table cell", 2, -INFINITY, "rate"},
        {"a NaN table cell", 2, NAN, NULL},
    };
    for (size_t i = 0; i < sizeof ROWS / sizeof ROWS[0]; i++) {
        sr_report *r = sr_report_new("test", "infinite");
        sr_report_value(r, "v", "descent rate", ROWS[i].where == 0 ? ROWS[i].x : 1.0, SR_Q_SPEED, 3);
        sr_report_band(r, "b", "drag area", 1.0, 2.0, ROWS[i].where == 1 ? ROWS[i].x : 3.0, SR_Q_AREA, 3);
        sr_rtable *t = sr_report_table(r, "t", "rates");
        sr_rtable_column(t, "z", "altitude", SR_Q_LENGTH, 3);
        sr_rtable_column(t, "v", "rate", SR_Q_SPEED, 3);
        double row[2] = {100.0, ROWS[i].where == 2 ? ROWS[i].x : 4.0};
        sr_rtable_row(t, row, NULL);
        const char *got = sr_report_infinite(r);
        if (ROWS[i].label ? !got || strcmp(got, ROWS[i].label) != 0 : got != NULL)
            print_error("infinite row %zu (%s): got '%s'\n", i, ROWS[i].what, got ? got : "(none)");
        if (ROWS[i].label)
            assert_string_equal(got, ROWS[i].label);
        else
            assert_null(got);
        sr_report_free(r);
    }
}

/* A name holding a terminal escape, a line break, a bell or a C1 control. */
static void test_control_characters_visible(void **state)
{
    (void)state;
    sr_report *r = sr_report_new("test", "escapes");
    sr_report_text(r, "mission", "mission", "red\x1b[31m\nnext\a\xc2\x9b end");
    sr_report_note(r, "note with a\ttab");
    sr_rtable *t = sr_report_table(r, "t", "names");
    sr_rtable_text_column(t, "name", "name");
    const char *cell[] = {"a\rb"};
    sr_rtable_row(t, NULL, cell);
    static const sr_report_format F[] = {SR_REPORT_TEXT, SR_REPORT_CSV, SR_REPORT_JSON};
    for (int k = 0; k < 3; k++) {
        char *buf = NULL;
        size_t len = 0;
        FILE *m = open_memstream(&buf, &len);
        sr_error e;
        assert_int_equal(sr_report_write(r, m, F[k], SR_UNITS_SI, &e), SR_OK);
        fclose(m);
        for (size_t i = 0; i < len; i++) {
            unsigned char ch = (unsigned char)buf[i];
            /* only the format's own line ends remain */
            assert_true(ch >= 0x20 || ch == '\n' || (ch == '\r' && i + 1 < len && buf[i + 1] == '\n'));
            assert_false(ch == 0xc2 && i + 1 < len && (unsigned char)buf[i + 1] == 0x9b);
        }
        if (k == 0) {
            assert_non_null(strstr(buf, "red\\e[31m\\nnext\\x07\\u009b end"));
            assert_non_null(strstr(buf, "a\\rb"));
            assert_non_null(strstr(buf, "note with a\\ttab"));
        }
        free(buf);
    }
    sr_report_free(r);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_infinite_found),
        cmocka_unit_test(test_control_characters_visible),
    };
    return cmocka_run_group_tests_name("report", tests, NULL, NULL);
}
