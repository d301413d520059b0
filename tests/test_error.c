/* test_error.c - the error struct (base/error.h): what an error is about
 * travels as fields (key, file, line, column) beside the message, filled
 * where the message is made, so callers act on fields and never read the
 * message; a new error never keeps an old one's fields. */
#define _DEFAULT_SOURCE
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "base/error.h"
#include "files/yamldoc.h"
#include "physics/atmos.h"
#include "physics/bluff.h"
#include "physics/opening.h"
#include "physics/units.h"
#include "physics/wind.h"
#include "testutil.h"
#include "files/sounding.h"

static void test_setters(void **state)
{
    (void)state;
    sr_error e;
    sr_error_set_at(&e, SR_EINVAL, "m.yaml", 3, 7, "unknown key '%s'", "x");
    assert_string_equal(e.msg, "m.yaml:3:7: unknown key 'x'");
    assert_string_equal(e.file, "m.yaml");
    assert_int_equal(e.line, 3);
    assert_int_equal(e.column, 7);
    assert_string_equal(e.key, "");
    /* a new error forgets the place of the one before */
    sr_error_set_key(&e, SR_EDOMAIN, "exponent", "exponent %g too large", 2.0);
    assert_string_equal(e.msg, "exponent 2 too large");
    assert_string_equal(e.key, "exponent");
    assert_string_equal(e.file, "");
    assert_int_equal(e.line, 0);
    assert_int_equal(e.code, SR_EDOMAIN);
    /* put into a file later: the key stays, the place comes */
    assert_int_equal(sr_error_locate(&e, "wind.csv", 5, 1), SR_EDOMAIN);
    assert_string_equal(e.msg, "wind.csv:5:1: exponent 2 too large");
    assert_string_equal(e.key, "exponent");
    assert_string_equal(e.file, "wind.csv");
    assert_int_equal(e.line, 5);
    /* a file without a place */
    sr_error_set(&e, SR_EIO, "cannot open");
    sr_error_locate(&e, "a.csv", 0, 0);
    assert_string_equal(e.msg, "a.csv: cannot open");
    assert_string_equal(e.file, "a.csv");
    assert_int_equal(e.line, 0);
    assert_int_equal(e.column, 0);
    sr_error_set(&e, SR_EINVAL, "plain");
    assert_string_equal(e.key, "");
    assert_string_equal(e.file, "");
    sr_error_clear(&e);
    assert_int_equal(e.code, SR_OK);
    assert_string_equal(e.msg, "");
}

/* The readers fill the place: YAML (libyaml's marks) and CSV (the row's line). */
static void test_readers_fill_the_place(void **state)
{
    (void)state;
    sr_yaml y;
    sr_error e;
    static const char DOC[] = "a: 1\nb: [1, 2\n";
    assert_int_not_equal(sr_yaml_load_string(&y, "doc.yaml", DOC, sizeof DOC - 1, &e), SR_OK);
    assert_string_equal(e.file, "doc.yaml");
    assert_true(e.line >= 2);
    char head[64];
    snprintf(head, sizeof head, "doc.yaml:%d:%d: ", e.line, e.column);
    assert_memory_equal(e.msg, head, strlen(head));

    const char *path = sr_test_tmpfile(".csv", "altitude [m], temperature [K], pressure [Pa]\n0, 288.15, 101325\n"
                                               "1000, 281.65, 89876\n500, 285, 95000\n");
    sr_atmos a;
    assert_int_not_equal(sr_sounding_load(&a, path, &e), SR_OK);
    assert_string_equal(e.file, path);
    assert_int_equal(e.line, 4);
    assert_int_equal(e.column, 1);
}

/* The models name the input they refuse, in the file's words (docs/files.md)
 * or the input struct's fields. */
static void test_models_name_the_input(void **state)
{
    (void)state;
    sr_error e;
    double v;
    assert_int_not_equal(sr_units_parse_strict("12", SR_Q_LENGTH, &v, &e), SR_OK);
    assert_string_equal(e.key, "unit");
    assert_int_not_equal(sr_units_parse_strict("12 parsecs", SR_Q_LENGTH, &v, &e), SR_OK);
    assert_string_not_equal(e.key, "unit");

    sr_atmos m;
    assert_int_not_equal(sr_atmos_init_site(&m, 30000.0, NAN, NAN, &e), SR_OK);
    assert_string_equal(e.key, "elevation");
    assert_int_not_equal(sr_atmos_init_site(&m, 1000.0, 400.0, 90000.0, &e), SR_OK);
    assert_string_equal(e.key, "temperature");
    assert_int_not_equal(sr_atmos_init_site(&m, 1000.0, 300.0, 10000.0, &e), SR_OK);
    assert_string_equal(e.key, "pressure");

    sr_wind w;
    assert_int_not_equal(sr_wind_init_power(&w, 5.0, 0.0, 10.0, 2.0, &e), SR_OK);
    assert_string_equal(e.key, "exponent");
    assert_int_not_equal(sr_wind_init_power(&w, 5.0, 0.0, 5000.0, 0.14, &e), SR_OK);
    assert_string_equal(e.key, "reference-height");
    assert_int_not_equal(sr_wind_init_log(&w, 5.0, 0.0, 10.0, 0.03, 500.0, &e), SR_OK);
    assert_string_equal(e.key, "displacement");
    assert_int_not_equal(sr_wind_init_constant(&w, 5.0, 100.0, &e), SR_OK);
    assert_string_equal(e.key, "from");

    sr_opening_input in;
    sr_opening_input_init(&in);
    in.cds0 = 0.8 * 3.14159 / 4;
    in.d0 = 1.0;
    in.mass = 2.0;
    in.v1 = 30.0;
    in.rho = 1.2;
    in.a = 340.0;
    in.n_fill = 8.0;
    in.cx = 1.7;
    in.exponent = 20.0;
    sr_opening_result r;
    assert_int_not_equal(sr_opening_solve(&in, &r, &e), SR_OK);
    assert_string_equal(e.key, "exponent");
    in.exponent = 2.0;
    in.v1 = 500.0;
    assert_int_not_equal(sr_opening_solve(&in, &r, &e), SR_OK);
    assert_string_equal(e.key, "v1");

    sr_bluff_curve cv;
    assert_int_equal(sr_bluff_curve_init(&cv, sr_bluff_default_curve(SR_BLUFF_CYLINDER), &e), SR_OK);
    sr_bluff_body b;
    assert_int_not_equal(sr_bluff_body_init(&b, SR_BLUFF_SPHERE, &cv, 0.1, NAN, 1.0, NAN, &e), SR_OK);
    assert_string_equal(e.key, "curve");
    sr_bluff_curve_free(&cv);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_setters),
        cmocka_unit_test(test_readers_fill_the_place),
        cmocka_unit_test(test_models_name_the_input),
    };
    return cmocka_run_group_tests_name("error", tests, NULL, NULL);
}
