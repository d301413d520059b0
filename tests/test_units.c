/* test_units.c - unit parsing and formatting against exact definitions. */
#include "testutil.h"
#include "units.h"

static void test_placeholder(void **state)
{
    (void)state;
    double v;
    sr_error e;
    assert_int_equal(sr_units_parse("2 lb", SR_Q_MASS, &v, &e), 0);
    CHECK_REL("1 lb in kg", "NIST SP 811 (2008) App. B: 1 lb = 0.45359237 kg exactly", 0.90718474, v, 1e-15);
}

int main(void)
{
    const struct CMUnitTest tests[] = {cmocka_unit_test(test_placeholder)};
    return cmocka_run_group_tests_name("units", tests, NULL, NULL);
}
