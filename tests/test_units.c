/* test_units.c - unit parsing and formatting against the exact definitions of
 * NIST SP 811 and against udunits2 used as a reference library. */
#include "testutil.h"

#include <math.h>
#include <stdio.h>
#include <string.h>
#include <udunits2.h>

#include "physics/units.h"

#define NIST "NIST SP 811 (2008) App. B"
#define NIST_SI "NIST SP 811 (2008) ch. 4-5 (SI prefixes, units accepted with the SI)"
#define SI_BASE "SI Brochure (BIPM, 9th ed. 2019): SI base unit"
#define SI_DERIVED "SI Brochure (BIPM, 9th ed. 2019): SI derived unit"
#define UDUNITS "udunits2 2.2 (Debian libudunits2)"
#define PI 3.14159265358979323846

/* Definitions, written out here independently of src/physics/units.h. */
#define FT 0.3048           /* m, exact */
#define IN 0.0254           /* m, exact */
#define LB 0.45359237       /* kg, exact */
#define GN 9.80665          /* m/s2, standard gravity, exact */
#define LBF (LB * GN)       /* N = 4.4482216152605 */
#define YD (3.0 * FT)

/* One accepted spelling: the exact SI factor and offset from its definition,
 * where the definition is written down, and its udunits2 spelling with the
 * tolerance udunits2's own database allows (some of its entries are rounded
 * to 7 digits). Temperature intervals map to udunits' offset-free kelvin and
 * Rankine degree (a Celsius interval is a kelvin, a Fahrenheit one a Rankine). */
typedef struct unit_case {
    sr_quantity q;
    const char *unit;
    double factor, offset; /* si = (value + offset) * factor */
    const char *src;
    const char *ud, *ud_si; /* udunits2 spelling and its SI unit; NULL: no counterpart */
    double ud_rtol;
} unit_case;

static const unit_case CASES[] = {
    {SR_Q_MASS, "kg", 1.0, 0, SI_BASE, "kg", "kg", 1e-15},
    {SR_Q_MASS, "g", 1e-3, 0, NIST_SI, "g", "kg", 1e-15},
    {SR_Q_MASS, "lb", LB, 0, NIST ": 1 lb (avoirdupois) = 0.45359237 kg exactly", "lb", "kg", 1e-15},
    {SR_Q_MASS, "lbm", LB, 0, NIST ": 1 lb (avoirdupois) = 0.45359237 kg exactly", "lb", "kg", 1e-15},
    {SR_Q_MASS, "oz", LB / 16.0, 0, NIST ": 1 oz (avoirdupois) = 1/16 lb = 28.349523125 g", "avoirdupois_ounce",
     "kg", 2e-7},
    {SR_Q_MASS, "slug", LBF / FT, 0, NIST ": 1 slug = 1 lbf s2/ft = 14.59390 kg", "slug", "kg", 1e-6},

    {SR_Q_LENGTH, "m", 1.0, 0, SI_BASE, "m", "m", 1e-15},
    {SR_Q_LENGTH, "cm", 1e-2, 0, NIST_SI, "cm", "m", 1e-15},
    {SR_Q_LENGTH, "mm", 1e-3, 0, NIST_SI, "mm", "m", 1e-15},
    {SR_Q_LENGTH, "km", 1e3, 0, NIST_SI, "km", "m", 1e-15},
    {SR_Q_LENGTH, "ft", FT, 0, NIST ": 1 ft = 0.3048 m exactly", "ft", "m", 1e-15},
    {SR_Q_LENGTH, "in", IN, 0, NIST ": 1 in = 2.54 cm exactly", "inch", "m", 1e-15},

    {SR_Q_AREA, "m2", 1.0, 0, SI_DERIVED, "m2", "m2", 1e-15},
    {SR_Q_AREA, "m^2", 1.0, 0, SI_DERIVED, "m^2", "m2", 1e-15},
    {SR_Q_AREA, "cm2", 1e-4, 0, NIST_SI, "cm2", "m2", 1e-15},
    {SR_Q_AREA, "cm^2", 1e-4, 0, NIST_SI, "cm^2", "m2", 1e-15},
    {SR_Q_AREA, "ft2", FT * FT, 0, NIST ": 1 ft2 = 9.290304e-2 m2 exactly", "ft2", "m2", 1e-15},
    {SR_Q_AREA, "ft^2", FT * FT, 0, NIST ": 1 ft2 = 9.290304e-2 m2 exactly", "ft^2", "m2", 1e-15},
    {SR_Q_AREA, "in2", IN * IN, 0, NIST ": 1 in2 = 6.4516e-4 m2 exactly", "inch^2", "m2", 1e-15},
    {SR_Q_AREA, "in^2", IN * IN, 0, NIST ": 1 in2 = 6.4516e-4 m2 exactly", "inch^2", "m2", 1e-15},

    {SR_Q_SPEED, "m/s", 1.0, 0, SI_DERIVED, "m/s", "m/s", 1e-15},
    {SR_Q_SPEED, "km/h", 1.0 / 3.6, 0, NIST_SI, "km/h", "m/s", 1e-15},
    {SR_Q_SPEED, "ft/s", FT, 0, NIST ": 1 ft/s = 0.3048 m/s exactly", "ft/s", "m/s", 1e-15},
    {SR_Q_SPEED, "fps", FT, 0, NIST ": 1 ft/s = 0.3048 m/s exactly", "ft/s", "m/s", 1e-15},
    {SR_Q_SPEED, "mph", 0.44704, 0, NIST ": 1 mi/h = 0.44704 m/s exactly", "mile/hour", "m/s", 1e-15},
    {SR_Q_SPEED, "kn", 1852.0 / 3600.0, 0, NIST ": 1 knot = 1852 m/h exactly", "knot", "m/s", 1e-15},
    {SR_Q_SPEED, "kt", 1852.0 / 3600.0, 0, NIST ": 1 knot = 1852 m/h exactly", "knot", "m/s", 1e-15},

    {SR_Q_TEMP, "K", 1.0, 0, SI_BASE, "K", "K", 1e-15},
    {SR_Q_TEMP, "C", 1.0, 273.15, NIST ": T/K = t/C + 273.15", "degC", "K", 1e-15},
    {SR_Q_TEMP, "degC", 1.0, 273.15, NIST ": T/K = t/C + 273.15", "degC", "K", 1e-15},
    {SR_Q_TEMP, "\xc2\xb0" "C", 1.0, 273.15, NIST ": T/K = t/C + 273.15", "\xc2\xb0" "C", "K", 1e-15},
    {SR_Q_TEMP, "F", 1.0 / 1.8, 459.67, NIST ": T/K = (t/F + 459.67)/1.8", "degF", "K", 1e-15},
    {SR_Q_TEMP, "degF", 1.0 / 1.8, 459.67, NIST ": T/K = (t/F + 459.67)/1.8", "degF", "K", 1e-15},
    {SR_Q_TEMP, "\xc2\xb0" "F", 1.0 / 1.8, 459.67, NIST ": T/K = (t/F + 459.67)/1.8", "\xc2\xb0" "F", "K", 1e-15},
    {SR_Q_TEMP, "R", 1.0 / 1.8, 0, NIST ": T/K = (T/R)/1.8", "degR", "K", 1e-15},

    {SR_Q_TEMP_DIFF, "K", 1.0, 0, SI_BASE, "K", "K", 1e-15},
    {SR_Q_TEMP_DIFF, "C", 1.0, 0, NIST ": a Celsius interval equals a kelvin", "K", "K", 1e-15},
    {SR_Q_TEMP_DIFF, "degC", 1.0, 0, NIST ": a Celsius interval equals a kelvin", "K", "K", 1e-15},
    {SR_Q_TEMP_DIFF, "\xc2\xb0" "C", 1.0, 0, NIST ": a Celsius interval equals a kelvin", "K", "K", 1e-15},
    {SR_Q_TEMP_DIFF, "F", 1.0 / 1.8, 0, NIST ": 1 F interval = 5/9 K", "degR", "K", 1e-15},
    {SR_Q_TEMP_DIFF, "degF", 1.0 / 1.8, 0, NIST ": 1 F interval = 5/9 K", "degR", "K", 1e-15},
    {SR_Q_TEMP_DIFF, "\xc2\xb0" "F", 1.0 / 1.8, 0, NIST ": 1 F interval = 5/9 K", "degR", "K", 1e-15},

    {SR_Q_PRESSURE, "Pa", 1.0, 0, SI_DERIVED, "Pa", "Pa", 1e-15},
    {SR_Q_PRESSURE, "hPa", 100.0, 0, NIST_SI, "hPa", "Pa", 1e-15},
    {SR_Q_PRESSURE, "mbar", 100.0, 0, NIST ": 1 bar = 1e5 Pa exactly", "mbar", "Pa", 1e-15},
    {SR_Q_PRESSURE, "kPa", 1000.0, 0, NIST_SI, "kPa", "Pa", 1e-15},
    {SR_Q_PRESSURE, "bar", 1e5, 0, NIST ": 1 bar = 1e5 Pa exactly", "bar", "Pa", 1e-15},
    {SR_Q_PRESSURE, "atm", 101325.0, 0, NIST ": 1 atm (standard) = 101325 Pa exactly", "atm", "Pa", 1e-15},
    {SR_Q_PRESSURE, "psi", LBF / (IN * IN), 0, NIST ": 1 psi = 1 lbf/in2 = 6.894757e3 Pa", "psi", "Pa", 1e-15},
    {SR_Q_PRESSURE, "psf", LBF / (FT * FT), 0, NIST ": 1 lbf/ft2 = 47.88026 Pa", "lbf/ft2", "Pa", 1e-15},
    {SR_Q_PRESSURE, "lbf/ft2", LBF / (FT * FT), 0, NIST ": 1 lbf/ft2 = 47.88026 Pa", "lbf/ft2", "Pa", 1e-15},
    {SR_Q_PRESSURE, "inHg", IN * 13595.1 * GN, 0,
     NIST ": inch of mercury, conventional = 25.4 mm x 13.5951 g/cm3 x gn = 3.386389e3 Pa", "inHg", "Pa", 1e-15},

    {SR_Q_FORCE, "N", 1.0, 0, SI_DERIVED, "N", "N", 1e-15},
    {SR_Q_FORCE, "kN", 1000.0, 0, NIST_SI, "kN", "N", 1e-15},
    {SR_Q_FORCE, "lbf", LBF, 0, NIST ": 1 lbf = 4.4482216152605 N exactly", "lbf", "N", 1e-15},
    {SR_Q_FORCE, "kgf", GN, 0, NIST ": 1 kgf = 9.80665 N exactly", "kilogram_force", "N", 1e-15},

    {SR_Q_ENERGY, "J", 1.0, 0, SI_DERIVED, "J", "J", 1e-15},
    {SR_Q_ENERGY, "kJ", 1000.0, 0, NIST_SI, "kJ", "J", 1e-15},
    {SR_Q_ENERGY, "ft-lbf", FT * LBF, 0, NIST ": 1 ft lbf = 1.355818 J", "ft.lbf", "J", 1e-15},
    {SR_Q_ENERGY, "ft*lbf", FT * LBF, 0, NIST ": 1 ft lbf = 1.355818 J", "ft.lbf", "J", 1e-15},
    {SR_Q_ENERGY, "ft-lb", FT * LBF, 0, NIST ": 1 ft lbf = 1.355818 J", "ft.lbf", "J", 1e-15},

    {SR_Q_ANGLE, "deg", PI / 180.0, 0, NIST ": 1 degree = pi/180 rad", "degree", "rad", 1e-15},
    {SR_Q_ANGLE, "\xc2\xb0", PI / 180.0, 0, NIST ": 1 degree = pi/180 rad", "\xc2\xb0", "rad", 1e-15},
    {SR_Q_ANGLE, "rad", 1.0, 0, SI_DERIVED, "rad", "rad", 1e-15},

    {SR_Q_TIME, "s", 1.0, 0, SI_BASE, "s", "s", 1e-15},
    {SR_Q_TIME, "ms", 1e-3, 0, NIST_SI, "ms", "s", 1e-15},
    {SR_Q_TIME, "min", 60.0, 0, NIST_SI, "min", "s", 1e-15},
    {SR_Q_TIME, "h", 3600.0, 0, NIST_SI, "h", "s", 1e-15},

    {SR_Q_DENSITY, "kg/m3", 1.0, 0, SI_DERIVED, "kg/m3", "kg/m3", 1e-15},
    {SR_Q_DENSITY, "kg/m^3", 1.0, 0, SI_DERIVED, "kg/m^3", "kg/m3", 1e-15},
    {SR_Q_DENSITY, "g/cm3", 1000.0, 0, NIST_SI, "g/cm3", "kg/m3", 1e-15},
    {SR_Q_DENSITY, "slug/ft3", LBF / FT / (FT * FT * FT), 0, NIST ": 1 slug/ft3 = 515.3788 kg/m3", "slug/ft3",
     "kg/m3", 1e-6},
    {SR_Q_DENSITY, "lb/ft3", LB / (FT * FT * FT), 0, NIST ": 1 lb/ft3 = 16.01846 kg/m3", "lb/ft3", "kg/m3", 1e-15},

    {SR_Q_AREAL_MASS, "kg/m2", 1.0, 0, SI_DERIVED, "kg/m2", "kg/m2", 1e-15},
    {SR_Q_AREAL_MASS, "g/m2", 1e-3, 0, NIST_SI, "g/m2", "kg/m2", 1e-15},
    {SR_Q_AREAL_MASS, "oz/yd2", LB / 16.0 / (YD * YD), 0, NIST ": 1 oz/yd2 = 3.390575e-2 kg/m2",
     "avoirdupois_ounce/yd2", "kg/m2", 2e-7},

    {SR_Q_VISCOSITY, "Pa*s", 1.0, 0, SI_DERIVED, "Pa.s", "Pa.s", 1e-15},
    {SR_Q_VISCOSITY, "Pa.s", 1.0, 0, SI_DERIVED, "Pa.s", "Pa.s", 1e-15},
    {SR_Q_VISCOSITY, "lbf*s/ft2", LBF / (FT * FT), 0, NIST ": 1 lbf s/ft2 = 47.88026 Pa s", "lbf.s/ft2", "Pa.s",
     1e-15},

    {SR_Q_KIN_VISCOSITY, "m2/s", 1.0, 0, SI_DERIVED, "m2/s", "m2/s", 1e-15},
    {SR_Q_KIN_VISCOSITY, "ft2/s", FT * FT, 0, NIST ": 1 ft2/s = 9.290304e-2 m2/s exactly", "ft2/s", "m2/s", 1e-15},

    {SR_Q_ACCEL, "m/s2", 1.0, 0, SI_DERIVED, "m/s2", "m/s2", 1e-15},
    {SR_Q_ACCEL, "m/s^2", 1.0, 0, SI_DERIVED, "m/s^2", "m/s2", 1e-15},
    {SR_Q_ACCEL, "ft/s2", FT, 0, NIST ": 1 ft/s2 = 0.3048 m/s2 exactly", "ft/s2", "m/s2", 1e-15},
    {SR_Q_ACCEL, "g", GN, 0, NIST ": standard acceleration of gravity gn = 9.80665 m/s2 exactly",
     "standard_free_fall", "m/s2", 1e-15},
    {SR_Q_VOLUME, "m3", 1.0, 0, SI_DERIVED, "m3", "m3", 1e-15},
    {SR_Q_VOLUME, "m^3", 1.0, 0, SI_DERIVED, "m^3", "m3", 1e-15},
    {SR_Q_VOLUME, "L", 1e-3, 0, NIST_SI ": 1 L = 1 dm3 = 1e-3 m3", "L", "m3", 1e-15},
    {SR_Q_VOLUME, "mL", 1e-6, 0, NIST_SI ": 1 mL = 1 cm3", "mL", "m3", 1e-15},
    {SR_Q_VOLUME, "cm3", 1e-6, 0, NIST_SI, "cm3", "m3", 1e-15},
    {SR_Q_VOLUME, "cm^3", 1e-6, 0, NIST_SI, "cm^3", "m3", 1e-15},
    {SR_Q_VOLUME, "in3", IN * IN * IN, 0, NIST ": 1 in3 = 1.6387064e-5 m3 exactly", "in3", "m3", 1e-15},
    {SR_Q_VOLUME, "in^3", IN * IN * IN, 0, NIST ": 1 in3 = 1.6387064e-5 m3 exactly", "in^3", "m3", 1e-15},
    {SR_Q_VOLUME, "ft3", FT * FT * FT, 0, NIST ": 1 ft3 = 2.831685e-2 m3", "ft3", "m3", 1e-15},
    {SR_Q_VOLUME, "ft^3", FT * FT * FT, 0, NIST ": 1 ft3 = 2.831685e-2 m3", "ft^3", "m3", 1e-15},
};
#define NCASES (sizeof CASES / sizeof CASES[0])

/* Values each unit is parsed at; temperatures start above absolute zero in every scale. */
static const double XS[] = {1.0, 0.0, 36.5, 1234.5678, 1e-3};

static void test_nist_definitions(void **state)
{
    (void)state;
    char q[128], text[96];
    for (size_t i = 0; i < NCASES; i++) {
        const unit_case *c = &CASES[i];
        double f, off;
        if (sr_units_lookup(c->unit, c->q, &f, &off) != SR_OK)
            fail_msg("unit '%s' (%s) is not in the table", c->unit, sr_units_quantity_name(c->q));
        snprintf(q, sizeof q, "1 %s in SI (%s)", c->unit, sr_units_quantity_name(c->q));
        CHECK_REL_CLASS(SR_CHECK_PUBLISHED, q, c->src, c->factor, f, 1e-15);
        if (c->offset != 0.0 || off != 0.0) {
            snprintf(q, sizeof q, "offset of %s (%s)", c->unit, sr_units_quantity_name(c->q));
            CHECK_REL_CLASS(SR_CHECK_PUBLISHED, q, c->src, c->offset, off, 1e-15);
        }
        /* the parser applies the same factor, with and without a space */
        for (size_t k = 0; k < sizeof XS / sizeof XS[0]; k++) {
            double v;
            sr_error e;
            snprintf(text, sizeof text, k % 2 ? "%.17g%s" : "%.17g %s", XS[k], c->unit);
            if (sr_units_parse_strict(text, c->q, &v, &e) != SR_OK)
                fail_msg("'%s': %s", text, e.msg);
            double want = (XS[k] + c->offset) * c->factor;
            assert_true(fabs(v - want) <= 2e-15 * fabs(want) + 1e-300);
        }
    }
    /* the exact values as printed in SP 811 (spot checks with their digits) */
    double f, off;
    sr_units_lookup("lbf", SR_Q_FORCE, &f, &off);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "1 lbf (N)", NIST ": 4.448 222 E+00", 4.4482216152605, f, 1e-15);
    sr_units_lookup("psi", SR_Q_PRESSURE, &f, &off);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "1 psi (Pa)", NIST ": 6.894 757 E+03", 6894.757, f, 5e-4);
    sr_units_lookup("slug", SR_Q_MASS, &f, &off);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "1 slug (kg)", NIST ": 1.459 390 E+01", 14.59390, f, 5e-6);
    sr_units_lookup("inHg", SR_Q_PRESSURE, &f, &off);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "1 inHg, conventional (Pa)", NIST ": 3.386 389 E+03", 3386.389, f, 5e-4);
    sr_units_lookup("ft-lbf", SR_Q_ENERGY, &f, &off);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "1 ft lbf (J)", "NIST SP 811 exact factors (ft x lbf) = 1.3558179483314 J",
                    1.3558179483314, f, 1e-13);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "75 ft lbf (J)", "NIST SP 811 exact factors (ft x lbf)", 101.6863461, 75.0 * f,
                    1e-9);
    /* the macros in units.h */
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "SR_LBF (N)", NIST, 4.4482216152605, SR_LBF, 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "SR_FT_LBF (J)", NIST, 1.3558179483314, SR_FT_LBF, 1e-13);
}

/* ---- udunits2 as a reference library ----------------------------------- */

static ut_system *UD;

static int ud_setup(void **state)
{
    (void)state;
    ut_set_error_message_handler(ut_ignore);
    UD = ut_read_xml(NULL);
    return UD ? 0 : -1;
}

static int ud_teardown(void **state)
{
    (void)state;
    ut_free_system(UD);
    UD = NULL;
    return 0;
}

/* A converter from one udunits spelling to another; fails the test if udunits
 * cannot parse either. */
static cv_converter *ud_conv(const char *from, const char *to, ut_unit **a, ut_unit **b)
{
    *a = ut_parse(UD, from, UT_UTF8);
    *b = ut_parse(UD, to, UT_UTF8);
    if (!*a || !*b)
        fail_msg("udunits2 cannot parse '%s' or '%s'", from, to);
    cv_converter *c = ut_get_converter(*a, *b);
    if (!c)
        fail_msg("udunits2 cannot convert '%s' to '%s'", from, to);
    return c;
}

static void test_udunits(void **state)
{
    (void)state;
    assert_non_null(UD);
    char q[128], text[96];
    for (size_t i = 0; i < NCASES; i++) {
        const unit_case *c = &CASES[i];
        if (!c->ud)
            continue;
        ut_unit *a, *b;
        cv_converter *cv = ud_conv(c->ud, c->ud_si, &a, &b);
        for (size_t k = 0; k < sizeof XS / sizeof XS[0]; k++) {
            double want = cv_convert_double(cv, XS[k]);
            double got;
            sr_error e;
            snprintf(text, sizeof text, "%.17g %s", XS[k], c->unit);
            if (sr_units_parse(text, c->q, &got, &e) != SR_OK)
                fail_msg("'%s': %s", text, e.msg);
            if (want == 0.0) {
                assert_true(got == 0.0);
                continue;
            }
            /* logged once per unit (at every value for offset units); asserted everywhere */
            if (k == 0 || c->offset != 0.0) {
                snprintf(q, sizeof q, "%s in SI (%s)", text, sr_units_quantity_name(c->q));
                CHECK_REL_CLASS(SR_CHECK_LIBRARY, q, UDUNITS, want, got, c->ud_rtol);
            } else if (!(fabs(got - want) <= c->ud_rtol * fabs(want))) {
                fail_msg("'%s': %.17g, udunits2 says %.17g", text, got, want);
            }
        }
        cv_free(cv);
        ut_free(a);
        ut_free(b);
    }
}

/* Display units: labels per system and from_si against udunits2. */
typedef struct label_case {
    sr_quantity q;
    const char *si, *us;
    const char *ud_si, *ud_si_label, *ud_us_label; /* udunits spellings */
} label_case;

static const label_case LABELS[] = {
    {SR_Q_MASS, "kg", "lb", "kg", "kg", "lb"},
    {SR_Q_LENGTH, "m", "ft", "m", "m", "ft"},
    {SR_Q_AREA, "m2", "ft2", "m2", "m2", "ft2"},
    {SR_Q_SPEED, "m/s", "ft/s", "m/s", "m/s", "ft/s"},
    {SR_Q_TEMP, "K", "F", "K", "K", "degF"},
    {SR_Q_TEMP_DIFF, "K", "F", "K", "K", "degR"}, /* an F interval is a Rankine degree */
    {SR_Q_PRESSURE, "Pa", "psf", "Pa", "Pa", "lbf/ft2"},
    {SR_Q_FORCE, "N", "lbf", "N", "N", "lbf"},
    {SR_Q_ENERGY, "J", "ft-lbf", "J", "J", "ft.lbf"},
    {SR_Q_ANGLE, "deg", "deg", "rad", "degree", "degree"},
    {SR_Q_TIME, "s", "s", "s", "s", "s"},
    {SR_Q_DENSITY, "kg/m3", "slug/ft3", "kg/m3", "kg/m3", "slug/ft3"},
    {SR_Q_AREAL_MASS, "g/m2", "oz/yd2", "kg/m2", "g/m2", "avoirdupois_ounce/yd2"},
    {SR_Q_VISCOSITY, "Pa*s", "lbf*s/ft2", "Pa.s", "Pa.s", "lbf.s/ft2"},
    {SR_Q_KIN_VISCOSITY, "m2/s", "ft2/s", "m2/s", "m2/s", "ft2/s"},
    {SR_Q_ACCEL, "m/s2", "ft/s2", "m/s2", "m/s2", "ft/s2"},
    {SR_Q_SIZE, "m", "in", "m", "m", "in"},           /* a canopy size: inches under US (see units.h) */
    {SR_Q_BEARING, "deg", "deg", "rad", "degree", "degree"},
    {SR_Q_VOLUME, "L", "in3", "m3", "L", "in3"},
};

static void test_format_round_trip(void **state)
{
    (void)state;
    static const double SI[] = {0.001, 1.0, 9.80665, 288.15, 101325.0};
    char q[128], text[96];
    assert_int_equal(sizeof LABELS / sizeof LABELS[0], SR_Q_COUNT_ - 1);
    for (size_t i = 0; i < sizeof LABELS / sizeof LABELS[0]; i++) {
        const label_case *l = &LABELS[i];
        assert_string_equal(sr_units_label(l->q, SR_UNITS_SI), l->si);
        assert_string_equal(sr_units_label(l->q, SR_UNITS_US), l->us);
        for (int sys = 0; sys < 2; sys++) {
            ut_unit *a, *b;
            cv_converter *cv = ud_conv(l->ud_si, sys ? l->ud_us_label : l->ud_si_label, &a, &b);
            for (size_t k = 0; k < sizeof SI / sizeof SI[0]; k++) {
                double shown = sr_units_from_si(SI[k], l->q, sys);
                double want = cv_convert_double(cv, SI[k]);
                /* udunits' slug and ounce are rounded to 7 digits */
                double tol = (l->q == SR_Q_DENSITY || l->q == SR_Q_AREAL_MASS) && sys ? 1e-6 : 1e-14;
                if (k == 1) { /* logged once per label; asserted at every value */
                    snprintf(q, sizeof q, "%g SI %s shown in %s", SI[k], sr_units_quantity_name(l->q),
                             sr_units_label(l->q, sys));
                    CHECK_REL_CLASS(SR_CHECK_LIBRARY, q, UDUNITS, want, shown, tol);
                } else if (!(fabs(shown - want) <= tol * fabs(want))) {
                    fail_msg("%.17g SI %s shown as %.17g %s, udunits2 says %.17g", SI[k], l->si, shown,
                             sr_units_label(l->q, sys), want);
                }
                /* and the shown value, printed with its label, parses back */
                snprintf(text, sizeof text, "%.17g %s", shown, sr_units_label(l->q, sys));
                double back;
                sr_error e;
                if (sr_units_parse_strict(text, l->q, &back, &e) != SR_OK)
                    fail_msg("'%s': %s", text, e.msg);
                /* an offset (F) costs digits near absolute zero: compare on the offset's scale */
                double scale = l->q == SR_Q_TEMP ? 500.0 : SI[k];
                if (!(fabs(back - SI[k]) <= 1e-14 * scale))
                    fail_msg("round trip of %.17g %s via '%s' gave %.17g", SI[k], l->si, text, back);
            }
            cv_free(cv);
            ut_free(a);
            ut_free(b);
        }
    }
    /* familiar values */
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "273.15 K in F", NIST ": T/K = (t/F + 459.67)/1.8", 32.0,
                    sr_units_from_si(273.15, SR_Q_TEMP, SR_UNITS_US), 1e-12);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "233.15 K in F", NIST ": -40 C = -40 F", -40.0,
                    sr_units_from_si(233.15, SR_Q_TEMP, SR_UNITS_US), 1e-12);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "a 10 K offset in F", NIST ": 1 K interval = 1.8 F", 18.0,
                    sr_units_from_si(10.0, SR_Q_TEMP_DIFF, SR_UNITS_US), 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "101325 Pa in psf", NIST ": 1 lbf/ft2 = 47.88026 Pa", 2116.21662367394,
                    sr_units_from_si(101325.0, SR_Q_PRESSURE, SR_UNITS_US), 1e-12);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "pi rad shown in deg", NIST ": 1 degree = pi/180 rad", 180.0,
                    sr_units_from_si(PI, SR_Q_ANGLE, SR_UNITS_SI), 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "5 m/s in ft/s", NIST ": 1 ft = 0.3048 m", 16.404199475065617,
                    sr_units_from_si(5.0, SR_Q_SPEED, SR_UNITS_US), 1e-15);
    /* a dimensionless number passes through */
    assert_true(sr_units_from_si(2.5, SR_Q_NONE, SR_UNITS_US) == 2.5);
    assert_string_equal(sr_units_label(SR_Q_NONE, SR_UNITS_SI), "");
}

/* ---- temperatures: absolute vs offset ----------------------------------- */

static void test_temperature(void **state)
{
    (void)state;
    static const struct {
        const char *text;
        sr_quantity q;
        double si;
        const char *src;
    } T[] = {
        {"31 C", SR_Q_TEMP, 304.15, NIST ": T/K = t/C + 273.15"},
        {"31 C", SR_Q_TEMP_DIFF, 31.0, NIST ": a Celsius interval equals a kelvin"},
        {"-40 F", SR_Q_TEMP, 233.15, NIST ": -40 F = -40 C"},
        {"-40 C", SR_Q_TEMP, 233.15, NIST ": T/K = t/C + 273.15"},
        {"59 F", SR_Q_TEMP, 288.15, NIST ": T/K = (t/F + 459.67)/1.8"},
        {"+27 F", SR_Q_TEMP_DIFF, 15.0, NIST ": 1 F interval = 5/9 K"},
        {"-18 F", SR_Q_TEMP_DIFF, -10.0, NIST ": 1 F interval = 5/9 K"},
        {"518.67 R", SR_Q_TEMP, 288.15, NIST ": T/K = (T/R)/1.8"},
        {"0 K", SR_Q_TEMP, 0.0, SI_BASE},
        {"-273.15 C", SR_Q_TEMP, 0.0, NIST ": T/K = t/C + 273.15"},
        {"288.15", SR_Q_TEMP, 288.15, "DESIGN.md (ours): a bare number is SI"},
        {"-15", SR_Q_TEMP_DIFF, -15.0, "DESIGN.md (ours): a bare number is SI"},
        {"15 \xc2\xb0" "C", SR_Q_TEMP, 288.15, NIST ": T/K = t/C + 273.15"},
    };
    char q[96];
    for (size_t i = 0; i < sizeof T / sizeof T[0]; i++) {
        double v;
        sr_error e;
        if (sr_units_parse(T[i].text, T[i].q, &v, &e) != SR_OK)
            fail_msg("'%s': %s", T[i].text, e.msg);
        snprintf(q, sizeof q, "'%s' as %s (K)", T[i].text, sr_units_quantity_name(T[i].q));
        CHECK_ABS_CLASS(strstr(T[i].src, "NIST") || strstr(T[i].src, "SI Brochure") ? SR_CHECK_PUBLISHED
                                                                                    : SR_CHECK_DERIVED,
                        q, T[i].src, T[i].si, v, 1e-12);
    }
    /* below absolute zero is not a temperature; as an offset it is fine */
    static const char *COLD[] = {"-300 C", "-500 F", "-1 K", "-0.5", "-1 R"};
    for (size_t i = 0; i < sizeof COLD / sizeof COLD[0]; i++) {
        double v = 0;
        sr_error e;
        assert_int_equal(sr_units_parse(COLD[i], SR_Q_TEMP, &v, &e), SR_EINVAL);
        assert_non_null(strstr(e.msg, "absolute zero"));
    }
    double v;
    assert_int_equal(sr_units_parse("-300 C", SR_Q_TEMP_DIFF, &v, NULL), SR_OK);
    assert_true(v == -300.0);
    /* Rankine has no offset form */
    assert_int_equal(sr_units_parse("5 R", SR_Q_TEMP_DIFF, &v, NULL), SR_EINVAL);
}

/* ---- bad input ---------------------------------------------------------- */

typedef struct bad_case {
    const char *text;
    sr_quantity q;
    int strict;
    const char *says; /* a piece of the one-line message */
} bad_case;

static const bad_case BAD[] = {
    {"nan", SR_Q_MASS, 0, "not a number"},
    {"NaN kg", SR_Q_MASS, 0, "not a number"},
    {"-nan", SR_Q_LENGTH, 0, "not a number"},
    {"inf", SR_Q_MASS, 0, "not a number"},
    {"-Infinity m", SR_Q_LENGTH, 0, "not a number"},
    {"1e999", SR_Q_MASS, 0, "out of the range"},
    {"1e999 kg", SR_Q_MASS, 0, "out of the range"},
    {"-1e999", SR_Q_NONE, 0, "out of the range"},
    {"1e308 km", SR_Q_LENGTH, 0, "out of the range"},
    {"0x1p3", SR_Q_MASS, 0, "hexadecimal"},
    {"0x10", SR_Q_NONE, 0, "hexadecimal"},
    {"-0X1A m", SR_Q_LENGTH, 0, "hexadecimal"},
    {"", SR_Q_MASS, 0, "empty mass"},
    {"   ", SR_Q_SPEED, 0, "empty speed"},
    {"", SR_Q_NONE, 0, "empty"},
    {"2 stone", SR_Q_MASS, 0, "accepted: kg, g, lb, lbs, lbm, oz, slug"},
    {"18 ft/min", SR_Q_SPEED, 0, "accepted: m/s, km/h, ft/s, fps, mph, kn"},
    {"5 KG", SR_Q_MASS, 0, "unknown mass unit 'KG'"},
    {"3 kg", SR_Q_LENGTH, 0, "unknown length unit 'kg'"},
    {"100 mmHg", SR_Q_PRESSURE, 0, "accepted: Pa, hPa, mbar, kPa, bar, atm, psi, psf, inHg"},
    {"1 averyveryverylongunitnamethatgoeson", SR_Q_MASS, 0, "accepted: kg"},
    {"2 kg junk", SR_Q_MASS, 0, "unknown mass unit 'kg junk'"},
    {"2.5.1 m", SR_Q_LENGTH, 0, "unknown length unit '.1 m'"},
    {"1,5 m", SR_Q_LENGTH, 0, "decimals with a point (1.5...)"},
    {"1.5e m", SR_Q_LENGTH, 0, "unknown length unit 'e m'"},
    {"- 2 m", SR_Q_LENGTH, 0, "not a number"},
    {"abc", SR_Q_AREA, 0, "written like \"1.5 m2\""},
    {"kg", SR_Q_MASS, 0, "written like \"1.5 kg\""},
    {"two", SR_Q_NONE, 0, "not a number"},
    {"3 m", SR_Q_NONE, 0, "takes no unit"},
    {"3 %", SR_Q_NONE, 0, "takes no unit"},
    {"2", SR_Q_MASS, 1, "needs a unit (a mass in kg, g, lb, lbs, lbm, oz, slug)"},
    {"101325", SR_Q_PRESSURE, 1, "needs a unit"},
    {"1.5", SR_Q_LENGTH, 1, "needs a unit"},
    {"12345678901234567890123456789012345678901234567890123456789012345", SR_Q_NONE, 0, "too long"},
};

static void test_bad_input(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
        const bad_case *b = &BAD[i];
        double v = 12345.0;
        sr_error e;
        sr_error_clear(&e);
        int rc = b->strict ? sr_units_parse_strict(b->text, b->q, &v, &e) : sr_units_parse(b->text, b->q, &v, &e);
        if (rc != SR_EINVAL || !strstr(e.msg, b->says) || strchr(e.msg, '\n'))
            fail_msg("'%s' as %s: rc %d, message '%s' (want SR_EINVAL and '%s')", b->text,
                     sr_units_quantity_name(b->q), rc, e.msg, b->says);
        assert_true(v == 12345.0); /* the output is untouched on error */
        assert_int_equal(e.code, SR_EINVAL);
    }
    double v;
    sr_error e;
    assert_int_equal(sr_units_parse(NULL, SR_Q_MASS, &v, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "missing mass"));
    assert_int_equal(sr_units_parse("1", SR_Q_COUNT_, &v, &e), SR_EINVAL);
    assert_int_equal(sr_units_parse("1", (sr_quantity)-1, &v, &e), SR_EINVAL);
    /* no error struct: still a status */
    assert_int_equal(sr_units_parse("nan", SR_Q_MASS, &v, NULL), SR_EINVAL);
    double f, off;
    assert_int_equal(sr_units_lookup("furlong", SR_Q_LENGTH, &f, &off), SR_EINVAL);
    assert_int_equal(sr_units_lookup("kg", SR_Q_LENGTH, &f, &off), SR_EINVAL);
}

/* ---- accepted forms ----------------------------------------------------- */

static void test_accepted_forms(void **state)
{
    (void)state;
    static const struct {
        const char *text;
        sr_quantity q;
        double si;
        const char *src;
    } OK[] = {
        {"2.5 kg", SR_Q_MASS, 2.5, SI_BASE},
        {"36in", SR_Q_LENGTH, 0.9144, NIST ": 1 in = 2.54 cm exactly"},
        {"18 ft/s", SR_Q_SPEED, 5.4864, NIST ": 1 ft = 0.3048 m exactly"},
        {"  7\tlb  ", SR_Q_MASS, 3.17514659, NIST ": 1 lb = 0.45359237 kg exactly"},
        {"2kg\n", SR_Q_MASS, 2.0, SI_BASE},
        {".5 m", SR_Q_LENGTH, 0.5, SI_BASE},
        {"5. m", SR_Q_LENGTH, 5.0, SI_BASE},
        {"+2 m", SR_Q_LENGTH, 2.0, SI_BASE},
        {"-3.5e2 m", SR_Q_LENGTH, -350.0, SI_BASE},
        {"1E3m", SR_Q_LENGTH, 1000.0, SI_BASE},
        {"1.2e-3 km", SR_Q_LENGTH, 1.2, NIST_SI},
        {"12", SR_Q_SPEED, 12.0, "DESIGN.md (ours): a bare number is SI"},
        {"30", SR_Q_ANGLE, PI / 6.0, "units.h (ours): a bare angle is in degrees"},
        {"0.5 rad", SR_Q_ANGLE, 0.5, SI_DERIVED},
        {"2", SR_Q_NONE, 2.0, "ours: a bare number is a plain number"},
        {"0.75", SR_Q_NONE, 0.75, "ours: a bare number is a plain number"},
        {"1 g", SR_Q_MASS, 1e-3, "gram (NIST SP 811)"},
        {"1 g", SR_Q_ACCEL, 9.80665, NIST ": gn = 9.80665 m/s2"},
        {"29.92 inHg", SR_Q_PRESSURE, 101320.75, NIST ": conventional inch of mercury"},
        {"14.7 psi", SR_Q_PRESSURE, 101352.9322096, NIST ": 1 psi = 6.894757e3 Pa"},
        {"75 ft-lbf", SR_Q_ENERGY, 101.68634612, NIST ": exact factors (ft x lbf)"},
        {"20 kn", SR_Q_SPEED, 10.288888889, NIST ": 1 knot = 1852 m/h exactly"},
        {"1 mph", SR_Q_SPEED, 0.44704, NIST ": 1 mi/h = 0.44704 m/s exactly"},
        {"36 km/h", SR_Q_SPEED, 10.0, NIST_SI},
    };
    char q[96];
    for (size_t i = 0; i < sizeof OK / sizeof OK[0]; i++) {
        double v;
        sr_error e;
        if (sr_units_parse(OK[i].text, OK[i].q, &v, &e) != SR_OK)
            fail_msg("'%s': %s", OK[i].text, e.msg);
        snprintf(q, sizeof q, "'%s' in SI (%s)", OK[i].text, sr_units_quantity_name(OK[i].q));
        for (char *c = q; *c; c++) /* the validation log is one tab-separated line per check */
            if (*c == '\n' || *c == '\t')
                *c = ' ';
        CHECK_REL_CLASS(strstr(OK[i].src, "NIST") || strstr(OK[i].src, "SI Brochure") ? SR_CHECK_PUBLISHED
                                                                                      : SR_CHECK_DERIVED,
                        q, OK[i].src, OK[i].si, v, 2e-8);
    }
    /* every unit the messages list is accepted */
    for (int qq = SR_Q_MASS; qq < SR_Q_COUNT_; qq++) {
        char list[256];
        snprintf(list, sizeof list, "%s", sr_units_accepted(qq));
        assert_true(list[0] != '\0');
        for (char *tok = strtok(list, ", "); tok; tok = strtok(NULL, ", ")) {
            double f, off;
            if (sr_units_lookup(tok, qq, &f, &off) != SR_OK)
                fail_msg("%s lists '%s' but does not accept it", sr_units_quantity_name(qq), tok);
        }
        assert_string_not_equal(sr_units_quantity_name(qq), "?");
    }
    /* the units issue 2 asks for */
    static const struct {
        sr_quantity q;
        const char *units;
    } NEED[] = {
        {SR_Q_MASS, "kg g lb oz"},           {SR_Q_LENGTH, "m cm mm km ft in"}, {SR_Q_AREA, "m2 cm2 ft2 in2"},
        {SR_Q_SPEED, "m/s km/h ft/s mph kn"}, {SR_Q_TEMP, "K C F"},              {SR_Q_TEMP_DIFF, "K C F"},
        {SR_Q_PRESSURE, "Pa hPa kPa psi inHg"}, {SR_Q_FORCE, "N kN lbf"},        {SR_Q_ENERGY, "J ft-lbf"},
        {SR_Q_ANGLE, "deg"},
    };
    for (size_t i = 0; i < sizeof NEED / sizeof NEED[0]; i++) {
        char list[128];
        snprintf(list, sizeof list, "%s", NEED[i].units);
        for (char *tok = strtok(list, " "); tok; tok = strtok(NULL, " ")) {
            double f, off;
            if (sr_units_lookup(tok, NEED[i].q, &f, &off) != SR_OK)
                fail_msg("%s: '%s' is missing", sr_units_quantity_name(NEED[i].q), tok);
        }
    }
}

/* US customary as hobby teams use it: canopy sizes in inches below 10 ft and
 * in feet from there, masses below a pound in ounces, "lbs" read as pounds;
 * a bearing never prints as 360. */
static void test_us_customary_display(void **state)
{
    (void)state;
    static const struct {
        sr_quantity q;
        double si, mag;
        const char *unit;
        double shown;
        const char *src;
    } T[] = {
        {SR_Q_SIZE, 0.9144, 0.9144, "in", 36.0, NIST ": 1 in = 0.0254 m (36 in = 0.9144 m)"},
        {SR_Q_SIZE, 3.0, 3.0, "in", 3.0 / 0.0254, NIST ": 1 in = 0.0254 m"},
        {SR_Q_SIZE, 3.048, 3.048, "ft", 10.0, NIST ": 1 ft = 0.3048 m (10 ft, the switch to feet)"},
        {SR_Q_SIZE, 1.2, 3.2, "ft", 1.2 / 0.3048, NIST ": 1 ft = 0.3048 m (a column reaching 10 ft)"},
        {SR_Q_MASS, 0.45359237 / 16.0 * 12.0, 0.34, "oz", 12.0, NIST ": 1 oz = 1/16 lb = 28.349523125 g"},
        {SR_Q_MASS, 0.45359237, 0.45359237, "lb", 1.0, NIST ": 1 lb = 0.45359237 kg (1 lb, the switch to pounds)"},
        {SR_Q_MASS, 0.2, 5.3, "lb", 0.2 / 0.45359237, NIST ": 1 lb = 0.45359237 kg (a column reaching 1 lb)"},
        {SR_Q_LENGTH, 0.9144, 0.9144, "ft", 3.0, NIST ": 1 ft = 0.3048 m (other lengths stay in ft)"},
    };
    for (size_t i = 0; i < sizeof T / sizeof T[0]; i++) {
        assert_string_equal(sr_units_label_at(T[i].q, SR_UNITS_US, T[i].mag), T[i].unit);
        char q[128];
        snprintf(q, sizeof q, "%g SI %s shown in %s under --units us", T[i].si, sr_units_quantity_name(T[i].q),
                 T[i].unit);
        CHECK_REL_CLASS(SR_CHECK_PUBLISHED, q, T[i].src, T[i].shown,
                        sr_units_from_si_at(T[i].si, T[i].q, SR_UNITS_US, T[i].mag), 1e-14);
        /* SI stays SI */
        assert_string_equal(sr_units_label_at(T[i].q, SR_UNITS_SI, T[i].mag), sr_units_label(T[i].q, SR_UNITS_SI));
    }
    double v;
    sr_error e;
    assert_int_equal(sr_units_parse("12 lbs", SR_Q_MASS, &v, &e), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "'12 lbs' in SI (kg)", NIST ": 1 lb = 0.45359237 kg", 12 * 0.45359237, v,
                    1e-15);
    assert_int_equal(sr_units_parse("36 in", SR_Q_SIZE, &v, &e), SR_OK);
    assert_true(fabs(v - 0.9144) < 1e-15);
    /* bearings: due north is 0, never 360, at any number of decimals */
    static const struct {
        double deg;
        int dec;
        double want;
    } B[] = {{0.0, 0, 0.0},     {359.6, 0, 0.0},   {359.4, 0, 359.4},   {359.96, 1, 0.0},
             {359.94, 1, 359.94}, {-90.0, 0, 270.0}, {720.0 + 45.0, 0, 45.0}, {360.0, 3, 0.0}};
    for (size_t i = 0; i < sizeof B / sizeof B[0]; i++) {
        double got = sr_units_bearing_deg(B[i].deg * 3.14159265358979323846 / 180.0, B[i].dec);
        if (!(fabs(got - B[i].want) < 1e-9))
            fail_msg("bearing %g deg at %d decimals: %g, want %g", B[i].deg, B[i].dec, got, B[i].want);
    }
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_nist_definitions), cmocka_unit_test(test_udunits),
        cmocka_unit_test(test_format_round_trip), cmocka_unit_test(test_temperature),
        cmocka_unit_test(test_bad_input),         cmocka_unit_test(test_accepted_forms),
        cmocka_unit_test(test_us_customary_display),
    };
    return cmocka_run_group_tests_name("units", tests, ud_setup, ud_teardown);
}
