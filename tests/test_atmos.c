/* test_atmos.c - the 1976 standard atmosphere and its variants against the
 * published tables, the full-precision evaluation of the 1976 constants, and
 * GSL quadrature/interpolation used as reference libraries. */
#include "testutil.h"

#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_interp.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include "physics/atmos.h"
#include "files/sounding.h"

/* Sources, as they appear in docs/validation.md. */
#define SRC_USSA "U.S. Standard Atmosphere 1976, Table I (as republished)"
#define SRC_USSA3 "U.S. Standard Atmosphere 1976, Table III (as republished)"
#define SRC_USSA_LAYERS "U.S. Standard Atmosphere 1976, layer table (as republished)"
#define SRC_USSA_CONST "U.S. Standard Atmosphere 1976, defining constants (as republished)"
#define SRC_PDAS "U.S. Standard Atmosphere 1976, PDAS 2-km SI table (as republished)"
#define SRC_ICAO "ICAO Doc 7488 (3rd ed. 1993), Table A/D (as republished)"
#define SRC_DERIVED "U.S. Standard Atmosphere 1976 formulas and constants, evaluated independently (references atmosphere-1976.md 1.5)"
#define SRC_OURS_OFFSET "docs/method.md sec. 1: offset day, T + dT at the standard pressure"
#define SRC_OURS_SITE "docs/method.md sec. 1: site model, standard values where a surface value is not given"
#define SRC_GSL_QAGS "GSL 2.7 QAGS quadrature of the hydrostatic equation (Debian libgsl)"
#define SRC_GSL_INTERP "GSL 2.7 gsl_interp_linear (Debian libgsl)"
#define SRC_NIST "NIST SP 811 (2008) App. B"

static sr_air air_at(const sr_atmos *m, double z)
{
    sr_air a;
    sr_error e;
    int rc = sr_atmos_at(m, z, &a, &e);
    if (rc != SR_OK)
        fail_msg("sr_atmos_at(%g) failed: %s", z, e.msg);
    return a;
}

static sr_air std_at(double z)
{
    sr_atmos m;
    sr_atmos_init_standard(&m);
    return air_at(&m, z);
}

/* ---- printed 1976 values (section 1.4 of the reference notes) ----------- */

/* One printed row. Pressures in the 1976 tables are truncated at 5 digits,
 * so pressure tolerances are >= 1e-4 relative; T, rho, a, mu are rounded and
 * get half a unit in the last printed digit. A zero tolerance skips the item. */
typedef struct printed_row {
    double z_km;
    const char *src;
    double T, T_abs;
    double p, p_rel;
    double rho, rho_abs;
    double a, a_abs;
    double mu, mu_abs;
} printed_row;

static const printed_row PRINTED[] = {
    /* USSA rows: pressure printed in mb, converted to Pa here (x100). */
    {0, SRC_USSA, 288.150, 5e-4, 101325.0, 1e-4, 1.2250, 5e-5, 0, 0, 0, 0},
    {1, SRC_USSA, 281.651, 5e-4, 89876.0, 1e-4, 1.1117, 5e-5, 0, 0, 0, 0},
    {10, SRC_USSA, 223.252, 5e-4, 26499.0, 1e-4, 0.41351, 5e-6, 0, 0, 0, 0},
    /* 86 km: the printed T is kinetic (186.87 K), not comparable with T_M: skip T. */
    {86, SRC_USSA, 0, 0, 0.37338, 1e-4, 6.958e-6, 5e-10, 0, 0, 0, 0},
    {10, SRC_USSA3, 0, 0, 0, 0, 0, 0, 299.53, 5e-3, 1.4577e-5, 5e-10},
    {50, SRC_USSA3, 0, 0, 0, 0, 0, 0, 329.80, 5e-3, 1.7037e-5, 5e-10},
    /* PDAS 2-km table, 5 digits, T to 0.01 K (T_M above 80 km). */
    {0, SRC_PDAS, 288.15, 5e-3, 101320, 1e-4, 1.2250, 5e-5, 340.29, 5e-3, 1.7894e-5, 5e-10},
    {10, SRC_PDAS, 223.25, 5e-3, 26500, 1e-4, 0.41351, 5e-6, 299.53, 5e-3, 1.4577e-5, 5e-10},
    {20, SRC_PDAS, 216.65, 5e-3, 5529.3, 1e-4, 0.08891, 5e-6, 295.07, 5e-3, 1.4216e-5, 5e-10},
    {30, SRC_PDAS, 226.51, 5e-3, 1197.0, 1e-4, 0.01841, 5e-6, 301.71, 5e-3, 1.4753e-5, 5e-10},
    {40, SRC_PDAS, 250.35, 5e-3, 287.14, 1e-4, 0.0039957, 5e-8, 317.19, 5e-3, 1.6009e-5, 5e-10},
    {50, SRC_PDAS, 270.65, 5e-3, 79.779, 1e-4, 0.0010269, 5e-8, 329.80, 5e-3, 1.7037e-5, 5e-10},
    {60, SRC_PDAS, 247.02, 5e-3, 21.959, 1e-4, 3.0968e-4, 5e-9, 315.07, 5e-3, 1.5837e-5, 5e-10},
    {70, SRC_PDAS, 219.58, 5e-3, 5.2209, 1e-4, 8.2829e-5, 5e-10, 297.06, 5e-3, 1.4377e-5, 5e-10},
    {80, SRC_PDAS, 198.64, 5e-3, 1.0525, 1e-4, 1.8458e-5, 5e-10, 282.54, 5e-3, 1.3208e-5, 5e-10},
    {86, SRC_PDAS, 186.95, 5e-3, 0.37338, 1e-4, 6.9578e-6, 5e-11, 274.10, 5e-3, 1.2533e-5, 5e-10},
};

static void test_printed_tables(void **state)
{
    (void)state;
    char q[96];
    for (size_t i = 0; i < sizeof PRINTED / sizeof PRINTED[0]; i++) {
        const printed_row *r = &PRINTED[i];
        sr_air a = std_at(r->z_km * 1000.0);
        if (r->T_abs > 0) {
            snprintf(q, sizeof q, "T at %g km (K)", r->z_km);
            CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, q, r->src, r->T, a.T, r->T_abs);
        }
        if (r->p_rel > 0) {
            snprintf(q, sizeof q, "p at %g km (Pa)", r->z_km);
            CHECK_REL_CLASS(SR_CHECK_PUBLISHED, q, r->src, r->p, a.p, r->p_rel);
        }
        if (r->rho_abs > 0) {
            snprintf(q, sizeof q, "rho at %g km (kg/m3)", r->z_km);
            CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, q, r->src, r->rho, a.rho, r->rho_abs);
        }
        if (r->a_abs > 0) {
            snprintf(q, sizeof q, "speed of sound at %g km (m/s)", r->z_km);
            CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, q, r->src, r->a, a.a, r->a_abs);
        }
        if (r->mu_abs > 0) {
            snprintf(q, sizeof q, "viscosity at %g km (Pa s)", r->z_km);
            CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, q, r->src, r->mu, a.mu, r->mu_abs);
        }
    }
}

/* ---- full-precision oracle (section 1.5, derived) ----------------------- */

typedef struct oracle_row {
    double z_km, H, T, p, rho, a, mu, g;
} oracle_row;

static const oracle_row ORACLE[] = {
    {-1, -1000.16, 294.6510, 113931.2, 1.347015, 344.1114, 1.820580e-5, 9.80974},
    {0, 0.00, 288.1500, 101325.0, 1.224999, 340.2941, 1.789380e-5, 9.80665},
    {1, 999.84, 281.6510, 89876.29, 1.111659, 336.4347, 1.757850e-5, 9.80357},
    {2, 1999.37, 275.1541, 79501.42, 1.006553, 332.5317, 1.725982e-5, 9.80048},
    {5, 4996.07, 255.6755, 54048.29, 0.7364284, 320.5455, 1.628248e-5, 9.79124},
    {10, 9984.29, 223.2521, 26499.90, 0.4135104, 299.5318, 1.457662e-5, 9.77587},
    {11, 10981.00, 216.7735, 22699.96, 0.3648016, 295.1537, 1.422292e-5, 9.77280},
    {15, 14964.69, 216.6500, 12111.83, 0.1947550, 295.0696, 1.421613e-5, 9.76053},
    {20, 19937.27, 216.6500, 5529.312, 0.08890992, 295.0696, 1.421613e-5, 9.74523},
    {25, 24902.06, 221.5521, 2549.223, 0.04008389, 298.3891, 1.448424e-5, 9.72997},
    {30, 29859.08, 226.5091, 1197.032, 0.01841017, 301.7088, 1.475276e-5, 9.71474},
    {40, 39749.87, 250.3496, 287.1440, 0.003995678, 317.1894, 1.600929e-5, 9.68439},
    {50, 49609.79, 270.6500, 79.77909, 0.001026878, 329.7988, 1.703678e-5, 9.65418},
    {60, 59438.97, 247.0209, 21.95867, 3.096778e-4, 315.0736, 1.583719e-5, 9.62411},
    {70, 69237.56, 219.5848, 5.220896, 8.282865e-5, 297.0614, 1.437696e-5, 9.59419},
    {80, 79005.71, 198.6386, 1.052474, 1.845803e-5, 282.5380, 1.320810e-5, 9.56440},
    {86, 84852.05, 186.9459, 0.3733805, 6.957824e-6, 274.0963, 1.253342e-5, 9.54659},
};

static void test_full_precision(void **state)
{
    (void)state;
    char q[96];
    for (size_t i = 0; i < sizeof ORACLE / sizeof ORACLE[0]; i++) {
        const oracle_row *r = &ORACLE[i];
        double z = r->z_km * 1000.0;
        sr_air a = std_at(z);
        /* 7 significant digits in the oracle: half a unit is <= 5e-7 relative
         * (T and H are given to 4 and 2 decimals). */
        snprintf(q, sizeof q, "geopotential H at %g km (m')", r->z_km);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->H, sr_atmos_geopotential(z), 5e-3);
        snprintf(q, sizeof q, "T at %g km (K)", r->z_km);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->T, a.T, 5e-5);
        snprintf(q, sizeof q, "p at %g km (Pa)", r->z_km);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->p, a.p, 5e-7);
        snprintf(q, sizeof q, "rho at %g km (kg/m3)", r->z_km);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->rho, a.rho, 5e-7);
        snprintf(q, sizeof q, "speed of sound at %g km (m/s)", r->z_km);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->a, a.a, 5e-7);
        snprintf(q, sizeof q, "viscosity at %g km (Pa s)", r->z_km);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->mu, a.mu, 5e-7);
        snprintf(q, sizeof q, "gravity at %g km (m/s2)", r->z_km);
        CHECK_ABS_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->g, a.g, 5e-6);
        /* internal consistency: the density-only path and the pieces */
        double rho;
        sr_atmos m;
        sr_atmos_init_standard(&m);
        assert_int_equal(sr_atmos_density(&m, z, &rho, NULL), SR_OK);
        assert_true(rho == a.rho);
        assert_true(fabs(a.nu - a.mu / a.rho) <= 1e-15 * a.nu);
        double T, p;
        assert_int_equal(sr_atmos_standard_tp(z, 0.0, &T, &p), SR_OK);
        /* the evaluator interpolates ln p by cubic Hermite between 500 m' nodes
         * (bound 5e-9 relative, atmos.c); the closed form is exact */
        assert_true(fabs(T - a.T) <= 1e-12 * T && fabs(p - a.p) <= 1e-8 * p);
    }
}

/* ---- constants, sea level, the geometric/geopotential pitfall ----------- */

static void test_constants_and_sea_level(void **state)
{
    (void)state;
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "hydrostatic constant g0 M0/R* (K/km)", SRC_USSA_CONST, 34.163195,
                    SR_ATMOS_G0 * SR_ATMOS_M0 / SR_ATMOS_R_STAR * 1000.0, 3e-8);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "specific gas constant R*/M0 (J/(kg K))", SRC_DERIVED, 287.0531,
                    SR_ATMOS_R_STAR / SR_ATMOS_M0, 2e-7);
    sr_air a = std_at(0.0);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "sea-level density, exact evaluation (kg/m3)", SRC_DERIVED, 1.2249992, a.rho,
                    1e-7);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "sea-level density, printed (kg/m3)", SRC_USSA, 1.2250, a.rho, 5e-5);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "sea-level pressure (Pa)", SRC_USSA_CONST, 101325.0, a.p, 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "sea-level temperature (K)", SRC_USSA_CONST, 288.15, a.T, 1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "standard gravity at sea level (m/s2)", SRC_USSA_CONST, 9.80665, a.g, 1e-15);
    /* CODATA's gas constant would give 1.224978: make sure we are not there. */
    assert_true(fabs(a.rho - 1.224978) > 1e-5);
}

static void test_geometric_vs_geopotential(void **state)
{
    (void)state;
    sr_air a = std_at(10000.0);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "T at 10 km geometric (K), not 223.15 K", SRC_USSA, 223.252, a.T, 5e-4);
    assert_true(fabs(a.T - 223.15) > 0.09); /* 223.15 K belongs to H = 10 km' */
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "geopotential of 10 km geometric (m')", SRC_DERIVED, 9984.29,
                    sr_atmos_geopotential(10000.0), 5e-3);
    /* H = 10 km' is geometric 10015.8 m: there the temperature is 223.15 K. */
    double z = SR_ATMOS_R0 * 10000.0 / (SR_ATMOS_R0 - 10000.0);
    CHECK_ABS_CLASS(SR_CHECK_METHOD, "T at H = 10 km' (K)", SRC_DERIVED, 223.15, std_at(z).T, 1e-9);
}

/* Layer bases: geopotential H_b, exact and printed base pressures. */
typedef struct layer_row {
    double H, T, p_exact, p_printed_mb, rho_printed, rho_abs, p_icao;
} layer_row;

static const layer_row LAYERS[] = {
    {0, 288.150, 101325.0, 1.01325e3, 1.2250, 5e-5, 101325.0},
    {11000, 216.650, 22632.06, 2.2632e2, 3.6392e-1, 5e-5, 22632.0},
    {20000, 216.650, 5474.889, 5.4748e1, 8.8035e-2, 5e-6, 5474.87},
    {32000, 228.650, 868.0187, 8.6801e0, 1.3225e-2, 5e-7, 868.014},
    {47000, 270.650, 110.9063, 1.1090e0, 1.4275e-3, 5e-8, 110.906},
    {51000, 270.650, 66.93887, 6.6938e-1, 8.6160e-4, 5e-9, 66.9384},
    {71000, 214.650, 3.956420, 3.9564e-2, 6.4211e-5, 5e-10, 3.95639},
};

static void test_layer_bases(void **state)
{
    (void)state;
    char q[96];
    for (size_t i = 0; i < sizeof LAYERS / sizeof LAYERS[0]; i++) {
        const layer_row *r = &LAYERS[i];
        double z = SR_ATMOS_R0 * r->H / (SR_ATMOS_R0 - r->H);
        sr_air a = std_at(z);
        snprintf(q, sizeof q, "T at layer base H = %g m' (K)", r->H);
        CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, q, SRC_USSA_LAYERS, r->T, a.T, 5e-4);
        snprintf(q, sizeof q, "p at layer base H = %g m', exact (Pa)", r->H);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q, SRC_DERIVED, r->p_exact, a.p, 5e-7);
        snprintf(q, sizeof q, "p at layer base H = %g m', printed (Pa)", r->H);
        CHECK_REL_CLASS(SR_CHECK_PUBLISHED, q, SRC_USSA_LAYERS, r->p_printed_mb * 100.0, a.p, 1e-4);
        snprintf(q, sizeof q, "rho at layer base H = %g m' (kg/m3)", r->H);
        CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, q, SRC_USSA_LAYERS, r->rho_printed, a.rho, r->rho_abs);
        /* ICAO uses M0 = 28.964420: 2-5 ppm apart above 11 km */
        snprintf(q, sizeof q, "p at layer base H = %g m', ICAO (Pa)", r->H);
        CHECK_REL_CLASS(SR_CHECK_PUBLISHED, q, SRC_ICAO, r->p_icao, a.p, 2e-5);
        /* continuity across the base (the layer formulas meet) */
        if (r->H > 0) {
            sr_air lo = std_at(z - 1e-6), hi = std_at(z + 1e-6);
            assert_true(fabs(lo.p - hi.p) <= 1e-9 * a.p);
            assert_true(fabs(lo.T - hi.T) <= 1e-8);
        }
    }
    /* top of the model: H = 84.852 km' is 86 km geometric */
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "geopotential of 86 km geometric (m')", SRC_USSA_LAYERS, 84852.0,
                    sr_atmos_geopotential(86000.0), 0.5);
}

/* ---- Sutherland viscosity, speed of sound, gravity ---------------------- */

static void test_viscosity_sound_gravity(void **state)
{
    (void)state;
    static const struct {
        double T, mu;
    } SUTH[] = {{186.946, 1.253342e-5}, {200, 1.328559e-5},  {216.65, 1.421613e-5}, {250, 1.599126e-5},
                {273.15, 1.716079e-5},  {300, 1.846002e-5}, {320.65, 1.942123e-5}};
    char q[96];
    for (size_t i = 0; i < sizeof SUTH / sizeof SUTH[0]; i++) {
        snprintf(q, sizeof q, "Sutherland viscosity at %g K (Pa s)", SUTH[i].T);
        CHECK_REL_CLASS(SR_CHECK_METHOD, q,
                        "Sutherland law, 1976 beta form, evaluated independently (references drag-data.md 3)",
                        SUTH[i].mu, sr_atmos_viscosity(SUTH[i].T), 5e-7);
    }
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "viscosity at 288.15 K, tabulated (Pa s)", SRC_ICAO, 1.7894e-5,
                    sr_atmos_viscosity(288.15), 5e-10);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "viscosity at 216.65 K, tabulated (Pa s)", SRC_ICAO, 1.4216e-5,
                    sr_atmos_viscosity(216.65), 5e-10);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "viscosity at 320.65 K, tabulated (Pa s)", SRC_ICAO, 1.9421e-5,
                    sr_atmos_viscosity(320.65), 5e-10);
    /* White's reference form agrees with the beta form to 5e-5 (from memory for the form) */
    double white = 1.716e-5 * pow(250.0 / 273.15, 1.5) * (273.15 + 110.4) / (250.0 + 110.4);
    CHECK_REL_CLASS(SR_CHECK_MEMORY, "Sutherland at 250 K, White's reference form (Pa s)",
                    "from memory (White, Viscous Fluid Flow)", white, sr_atmos_viscosity(250.0), 5e-5);

    CHECK_REL_CLASS(SR_CHECK_METHOD, "speed of sound at 288.15 K (m/s)", SRC_DERIVED, 340.2941,
                    sr_atmos_sound_speed(288.15), 5e-7);
    CHECK_ABS_CLASS(SR_CHECK_PUBLISHED, "speed of sound at 288.15 K, tabulated (m/s)", SRC_PDAS, 340.29,
                    sr_atmos_sound_speed(288.15), 5e-3);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "speed of sound at 216.65 K (m/s)", SRC_DERIVED, 295.0696,
                    sr_atmos_sound_speed(216.65), 5e-7);

    static const struct {
        double z, g;
        const char *src;
        double tol;
    } GRAV[] = {
        {1000, 9.8036, SRC_ICAO, 5e-5},    {11000, 9.7728, SRC_ICAO, 5e-5},    {20000, 9.7452, SRC_ICAO, 5e-5},
        {25000, 9.7300, SRC_ICAO, 5e-5},   {5000, 9.79124, SRC_DERIVED, 5e-6}, {10000, 9.77587, SRC_DERIVED, 5e-6},
        {50000, 9.65418, SRC_DERIVED, 5e-6}, {86000, 9.54659, SRC_DERIVED, 5e-6},
    };
    for (size_t i = 0; i < sizeof GRAV / sizeof GRAV[0]; i++) {
        snprintf(q, sizeof q, "gravity at %g km (m/s2)", GRAV[i].z / 1000.0);
        CHECK_ABS_CLASS(strcmp(GRAV[i].src, SRC_ICAO) == 0 ? SR_CHECK_PUBLISHED : SR_CHECK_METHOD, q, GRAV[i].src,
                        GRAV[i].g, sr_atmos_gravity(GRAV[i].z), GRAV[i].tol);
    }
}

/* ---- GSL quadrature: hydrostatic consistency ----------------------------- */

typedef struct quad_ctx {
    const sr_atmos *m;
    int failed;
} quad_ctx;

/* dp/dz = -rho g: the integrand rho(z) g(z) */
static double rho_g(double z, void *p)
{
    quad_ctx *c = p;
    sr_air a;
    if (sr_atmos_at(c->m, z, &a, NULL) != SR_OK) {
        c->failed = 1;
        return 0.0;
    }
    return a.rho * a.g;
}

static double gravity_over_g0(double z, void *p)
{
    (void)p;
    return sr_atmos_gravity(z) / SR_ATMOS_G0;
}

/* p(z1) - p(z2) by GSL QAGS */
static double integrate_rho_g(const sr_atmos *m, double z1, double z2)
{
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(200);
    quad_ctx c = {m, 0};
    gsl_function f = {rho_g, &c};
    double r, abserr;
    int rc = gsl_integration_qags(&f, z1, z2, 0.0, 1e-11, 200, w, &r, &abserr);
    gsl_integration_workspace_free(w);
    assert_int_equal(rc, GSL_SUCCESS);
    assert_false(c.failed);
    return r;
}

static void test_hydrostatic_gsl(void **state)
{
    (void)state;
    sr_atmos m;
    sr_atmos_init_standard(&m);
    char q[128];
    /* every layer of the standard, closed form vs quadrature */
    double zb[8];
    for (size_t i = 0; i < 7; i++)
        zb[i] = SR_ATMOS_R0 * LAYERS[i].H / (SR_ATMOS_R0 - LAYERS[i].H);
    zb[7] = SR_ATMOS_Z_MAX;
    for (size_t i = 0; i < 7; i++) {
        double dp = std_at(zb[i]).p - std_at(zb[i + 1]).p;
        snprintf(q, sizeof q, "pressure drop over layer %zu, %.0f..%.0f m (Pa)", i, zb[i], zb[i + 1]);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, q, SRC_GSL_QAGS, integrate_rho_g(&m, zb[i], zb[i + 1]), dp, 1e-8);
    }
    /* below sea level too */
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "pressure drop -1000..0 m (Pa)", SRC_GSL_QAGS,
                    integrate_rho_g(&m, -1000.0, 0.0), std_at(-1000.0).p - std_at(0.0).p, 1e-8);

    /* geopotential height is the integral of g/g0 (its definition) */
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(100);
    gsl_function f = {gravity_over_g0, NULL};
    static const double Z[] = {-1000.0, 10000.0, 50000.0, 86000.0};
    for (size_t i = 0; i < sizeof Z / sizeof Z[0]; i++) {
        double r, abserr;
        assert_int_equal(gsl_integration_qags(&f, 0.0, Z[i], 1e-9, 1e-13, 100, w, &r, &abserr), GSL_SUCCESS);
        snprintf(q, sizeof q, "geopotential H(%g m) = integral of g/g0 (m')", Z[i]);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, q,
                        "GSL 2.7 QAGS quadrature of the geopotential definition (Debian libgsl)", r,
                        sr_atmos_geopotential(Z[i]), 1e-12);
    }
    gsl_integration_workspace_free(w);
}

/* ---- temperature offset ------------------------------------------------- */

static void test_offset(void **state)
{
    (void)state;
    static const double DT[] = {-20.0, 15.0, 30.0};
    static const double Z[] = {-1000.0, 0.0, 1500.0, 11000.0, 30000.0, 86000.0};
    char q[96];
    for (size_t i = 0; i < sizeof DT / sizeof DT[0]; i++) {
        sr_atmos m;
        sr_error e;
        assert_int_equal(sr_atmos_init_offset(&m, DT[i], &e), SR_OK);
        for (size_t k = 0; k < sizeof Z / sizeof Z[0]; k++) {
            sr_air s = std_at(Z[k]), o = air_at(&m, Z[k]);
            assert_true(fabs(o.T - (s.T + DT[i])) <= 1e-12 * s.T);
            assert_true(o.p == s.p); /* same pressure at the same height */
            /* gas law at fixed pressure: rho ratio = T_std / (T_std + dT) */
            snprintf(q, sizeof q, "offset %+g K: density ratio at %g m", DT[i], Z[k]);
            CHECK_REL_CLASS(SR_CHECK_DERIVED, q,
                            "docs/method.md sec. 1: offset day, T + dT at the standard pressure (ideal gas law)",
                            s.T / (s.T + DT[i]), o.rho / s.rho, 1e-13);
            snprintf(q, sizeof q, "offset %+g K: speed of sound at %g m (m/s)", DT[i], Z[k]);
            CHECK_REL_CLASS(SR_CHECK_DERIVED, q, SRC_OURS_OFFSET, sqrt(1.4 * 8.31432 / 28.9644e-3 * (s.T + DT[i])), o.a,
                            1e-13);
        }
    }
    /* hot day +15 K at sea level: rho = P0 M0 / (R* 303.15 K) */
    sr_atmos m;
    assert_int_equal(sr_atmos_init_offset(&m, 15.0, NULL), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "sea-level density on a +15 K day (kg/m3)", SRC_OURS_OFFSET, 1.16438564,
                    air_at(&m, 0.0).rho, 1e-8);

    sr_error e;
    assert_int_equal(sr_atmos_init_offset(&m, NAN, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "offset"));
    assert_int_equal(sr_atmos_init_offset(&m, 150.0, &e), SR_EINVAL);
    assert_int_equal(sr_atmos_init_offset(&m, -INFINITY, &e), SR_EINVAL);
    char d[128];
    assert_int_equal(sr_atmos_init_offset(&m, 15.0, NULL), SR_OK);
    sr_atmos_describe(&m, d, sizeof d);
    assert_non_null(strstr(d, "+15.0 K"));
}

/* ---- site model --------------------------------------------------------- */

static void test_site(void **state)
{
    (void)state;
    /* an invented hot, high test site: 1400 m, 38 C, 852 hPa */
    const double zs = 1400.0, Ts = 311.15, ps = 85200.0;
    sr_atmos m;
    sr_error e;
    assert_int_equal(sr_atmos_init_site(&m, zs, Ts, ps, &e), SR_OK);
    sr_air a = air_at(&m, zs);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "site model: measured surface temperature reproduced (K)",
                    "input (measured) surface temperature", Ts, a.T, 1e-13);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "site model: measured surface pressure reproduced (Pa)",
                    "input (measured) surface pressure", ps, a.p, 1e-8);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "site model: surface density from the gas law (kg/m3)",
                    "U.S. Standard Atmosphere 1976 gas law rho = P M0/(R* T), evaluated in the test",
                    ps * 28.9644e-3 / (8.31432 * Ts), a.rho, 1e-8);
    /* standard lapse above the site, shifted by the surface difference */
    sr_air s = std_at(zs), s5 = std_at(5000.0), a5 = air_at(&m, 5000.0);
    assert_true(fabs((a5.T - a.T) - (s5.T - s.T)) < 1e-8);

    /* hydrostatic consistency: GSL quadrature of rho g from the site up to 9 km
     * and down to -500 m equals the model's pressure drop */
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "site model: pressure drop 1400..9000 m (Pa)", SRC_GSL_QAGS,
                    integrate_rho_g(&m, zs, 9000.0), a.p - air_at(&m, 9000.0).p, 1e-8);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "site model: pressure drop -500..1400 m (Pa)", SRC_GSL_QAGS,
                    integrate_rho_g(&m, -500.0, zs), air_at(&m, -500.0).p - a.p, 1e-8);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "site model: pressure drop 9000..30000 m (Pa)", SRC_GSL_QAGS,
                    integrate_rho_g(&m, 9000.0, 30000.0), air_at(&m, 9000.0).p - air_at(&m, 30000.0).p, 1e-8);

    /* only a temperature: pressure standard at the site */
    assert_int_equal(sr_atmos_init_site(&m, zs, Ts, NAN, &e), SR_OK);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "site model, T only: standard pressure at the site (Pa)", SRC_OURS_SITE, s.p,
                    air_at(&m, zs).p, 1e-8);
    /* only a pressure: standard temperature at the site */
    assert_int_equal(sr_atmos_init_site(&m, zs, NAN, ps, &e), SR_OK);
    CHECK_ABS_CLASS(SR_CHECK_DERIVED, "site model, p only: standard temperature at the site (K)", SRC_OURS_SITE, s.T,
                    air_at(&m, zs).T, 1e-12);
    CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, "site model, p only: pressure at the site (Pa)",
                    "input (measured) surface pressure", ps, air_at(&m, zs).p, 1e-8);
    /* neither: the standard atmosphere itself */
    assert_int_equal(sr_atmos_init_site(&m, zs, NAN, NAN, &e), SR_OK);
    static const double Z[] = {-1000.0, 0.0, 1400.0, 20000.0, 86000.0};
    for (size_t k = 0; k < sizeof Z / sizeof Z[0]; k++) {
        sr_air x = air_at(&m, Z[k]), y = std_at(Z[k]);
        assert_true(fabs(x.p - y.p) <= 1e-8 * y.p && fabs(x.T - y.T) <= 1e-12);
    }

    char d[256];
    assert_int_equal(sr_atmos_init_site(&m, zs, Ts, ps, &e), SR_OK);
    sr_atmos_describe(&m, d, sizeof d);
    assert_non_null(strstr(d, "site at 1400 m"));
    sr_atmos_init_standard(&m);
    sr_atmos_describe(&m, d, sizeof d);
    assert_string_equal(d, "U.S. Standard Atmosphere 1976");

    /* bad input */
    assert_int_equal(sr_atmos_init_site(&m, 25000.0, NAN, NAN, &e), SR_EDOMAIN);
    assert_non_null(strstr(e.msg, "site elevation"));
    assert_int_equal(sr_atmos_init_site(&m, NAN, NAN, NAN, &e), SR_EDOMAIN);
    assert_int_equal(sr_atmos_init_site(&m, zs, 400.0, NAN, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "surface temperature"));
    assert_int_equal(sr_atmos_init_site(&m, zs, INFINITY, NAN, &e), SR_EINVAL);
    assert_int_equal(sr_atmos_init_site(&m, zs, NAN, 1000.0, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "surface pressure"));
    assert_int_equal(sr_atmos_init_site(&m, zs, NAN, -INFINITY, &e), SR_EINVAL);
}

/* ---- sounding ----------------------------------------------------------- */

static const char *SOUNDING =
    "# invented sounding for tests\n"
    "altitude [ft],temperature [C],pressure [hPa],wind-speed [kn]\n"
    "0,20,1013.0,5\n"
    "1000,18.5,977.5,8\n"
    "\n"
    "5000,11.0,843.0,15\n"
    "10000,1.0,697.0,20\n";

static void test_sounding_csv(void **state)
{
    (void)state;
    const char *path = sr_test_tmpfile(".csv", SOUNDING);
    assert_non_null(path);
    sr_atmos m;
    sr_error e;
    int rc = sr_sounding_load(&m, path, &e);
    if (rc)
        fail_msg("%s", e.msg);
    double lo, hi;
    sr_atmos_range(&m, &lo, &hi);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "sounding top, 10000 ft (m)", SRC_NIST ": 1 ft = 0.3048 m", 3048.0, hi, 1e-15);
    assert_true(lo == 0.0);

    /* rows reproduce, converted with exact factors */
    sr_air a = air_at(&m, 1000 * 0.3048);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "sounding row: 18.5 C (K)", SRC_NIST ": T/K = t/C + 273.15", 291.65, a.T,
                    1e-15);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "sounding row: 977.5 hPa (Pa)", SRC_NIST ": 1 hPa = 100 Pa", 97750.0, a.p,
                    1e-14);

    /* between rows: T linear and ln p linear, cross-checked with GSL */
    static const double zt[] = {0, 304.8, 1524.0, 3048.0};
    static const double Tt[] = {293.15, 291.65, 284.15, 274.15};
    const double lnp[] = {log(101300.0), log(97750.0), log(84300.0), log(69700.0)};
    gsl_interp *iT = gsl_interp_alloc(gsl_interp_linear, 4), *ip = gsl_interp_alloc(gsl_interp_linear, 4);
    assert_int_equal(gsl_interp_init(iT, zt, Tt, 4), GSL_SUCCESS);
    assert_int_equal(gsl_interp_init(ip, zt, lnp, 4), GSL_SUCCESS);
    static const double ZQ[] = {0.0, 100.0, 304.8, 1000.0, 2000.0, 3047.9, 3048.0};
    char q[96];
    for (size_t i = 0; i < sizeof ZQ / sizeof ZQ[0]; i++) {
        double Tg, lpg;
        assert_int_equal(gsl_interp_eval_e(iT, zt, Tt, ZQ[i], NULL, &Tg), GSL_SUCCESS);
        assert_int_equal(gsl_interp_eval_e(ip, zt, lnp, ZQ[i], NULL, &lpg), GSL_SUCCESS);
        sr_air x = air_at(&m, ZQ[i]);
        snprintf(q, sizeof q, "sounding T at %g m (K)", ZQ[i]);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, q, SRC_GSL_INTERP, Tg, x.T, 1e-13);
        snprintf(q, sizeof q, "sounding p at %g m (Pa)", ZQ[i]);
        CHECK_REL_CLASS(SR_CHECK_CONSISTENCY, q, SRC_GSL_INTERP " on ln p", exp(lpg), x.p, 1e-12);
        double rho;
        assert_int_equal(sr_atmos_density(&m, ZQ[i], &rho, NULL), SR_OK);
        assert_true(rho == x.rho);
    }
    gsl_interp_free(iT);
    gsl_interp_free(ip);
    /* geometric mean of pressures at the midpoint of a layer */
    CHECK_REL_CLASS(
        SR_CHECK_DERIVED, "sounding p at the midpoint 2286 m (Pa)",
        "docs/method.md sec. 1: ln p linear in altitude between sounding rows, the geometric mean at the midpoint",
        sqrt(84300.0 * 69700.0), air_at(&m, 2286.0).p, 1e-12);

    /* never extrapolated */
    sr_air x;
    assert_int_equal(sr_atmos_at(&m, -0.5, &x, &e), SR_EDOMAIN);
    assert_non_null(strstr(e.msg, "outside the sounding"));
    assert_int_equal(sr_atmos_at(&m, 3048.5, &x, &e), SR_EDOMAIN);
    double rho;
    assert_int_equal(sr_atmos_density(&m, 5000.0, &rho, &e), SR_EDOMAIN);
    assert_int_equal(sr_atmos_at(&m, NAN, &x, &e), SR_EDOMAIN);

    char d[512];
    sr_atmos_describe(&m, d, sizeof d);
    assert_non_null(strstr(d, path));
    sr_atmos_release(&m);
    sr_atmos_release(&m); /* idempotent */
    unlink(path);
}

/* Sounding files that must fail, with where the message must point. */
typedef struct bad_sounding {
    const char *what;
    const char *text;
    int code;
    const char *where; /* ":line:column:" */
    const char *says;
} bad_sounding;

static const bad_sounding BAD_SOUNDINGS[] = {
    {"altitude not increasing", "altitude [m],temperature [K],pressure [Pa]\n0,288,101325\n500,285,95000\n500,284,94000\n",
     SR_EINVAL, ":4:1:", "increase"},
    {"altitude decreasing", "altitude [m],temperature [K],pressure [Pa]\n0,288,101325\n500,285,95000\n400,284,94000\n",
     SR_EINVAL, ":4:1:", "increase"},
    {"pressure rising", "altitude [m],temperature [K],pressure [Pa]\n0,288,101325\n500,285,102000\n", SR_EINVAL,
     ":3:1:", "pressure"},
    {"temperature absurd", "# c\naltitude [m],temperature [K],pressure [Pa]\n0,288,101325\n500,5,95000\n", SR_EINVAL,
     ":4:1:", "temperature"},
    {"altitude out of model", "altitude [km],temperature [K],pressure [Pa]\n0,288,101325\n90,185,0.2\n", SR_EDOMAIN,
     ":3:1:", "altitude"},
    {"one row", "altitude [m],temperature [K],pressure [Pa]\n0,288,101325\n", SR_EINVAL, ":2:1:", "two rows"},
    {"bad unit", "altitude [m],temperature [Q],pressure [Pa]\n0,288,101325\n500,285,95000\n", SR_EINVAL, ":1:14:",
     "unit 'Q'"},
    {"pressure unit on temperature", "altitude [m],temperature [hPa],pressure [Pa]\n0,288,101325\n", SR_EINVAL,
     ":1:14:", "temperature unit"},
    {"missing pressure column", "altitude [m],temperature [K]\n0,288\n500,285\n", SR_EINVAL, ":1:1:", "pressure"},
    {"non-numeric cell", "altitude [m],temperature [K],pressure [Pa]\n0,288,101325\n500,warm,95000\n", SR_EINVAL,
     ":3:5:", "warm"},
    {"empty file", "", SR_EINVAL, ":1:1:", "empty"},
};

static void test_sounding_errors(void **state)
{
    (void)state;
    for (size_t i = 0; i < sizeof BAD_SOUNDINGS / sizeof BAD_SOUNDINGS[0]; i++) {
        const bad_sounding *b = &BAD_SOUNDINGS[i];
        const char *path = sr_test_tmpfile(".csv", b->text);
        assert_non_null(path);
        sr_atmos m;
        sr_error e;
        int rc = sr_sounding_load(&m, path, &e);
        char want[300];
        snprintf(want, sizeof want, "%s%s", path, b->where);
        if (rc != b->code || strstr(e.msg, want) != e.msg || !strstr(e.msg, b->says))
            fail_msg("%s: rc %d (want %d), message '%s' (want it to start with '%s' and mention '%s')", b->what, rc,
                     b->code, rc ? e.msg : "", want, b->says);
        assert_null(m.sz);
        unlink(path);
    }
    sr_atmos m;
    sr_error e;
    assert_int_equal(sr_sounding_load(&m, "/nonexistent/dir/sounding.csv", &e), SR_EIO);
    assert_non_null(strstr(e.msg, "/nonexistent/dir/sounding.csv"));

    /* the array form: the same rules, row numbers in the message */
    static const double z[] = {0, 100, 100}, T[] = {288, 287, 286}, p[] = {101325, 100000, 99000};
    assert_int_equal(sr_atmos_init_sounding(&m, z, T, p, 3, &e), SR_EINVAL);
    assert_non_null(strstr(e.msg, "row 3"));
    assert_int_equal(sr_atmos_init_sounding(&m, z, T, p, 1, &e), SR_EINVAL);
    assert_int_equal(sr_atmos_init_sounding(&m, z, T, p, 2, &e), SR_OK);
    assert_int_equal(m.kind, SR_ATMOS_SOUNDING);
    char d[128];
    sr_atmos_describe(&m, d, sizeof d);
    assert_string_equal(d, "sounding table (2 rows, 0 m .. 100 m)");
    sr_atmos_release(&m);
}

/* ---- out of range ------------------------------------------------------- */

static void test_out_of_range(void **state)
{
    (void)state;
    sr_atmos ms, mo, mi;
    sr_atmos_init_standard(&ms);
    assert_int_equal(sr_atmos_init_offset(&mo, 10.0, NULL), SR_OK);
    assert_int_equal(sr_atmos_init_site(&mi, 500.0, 300.0, NAN, NULL), SR_OK);
    const sr_atmos *models[] = {&ms, &mo, &mi};
    static const double BAD[] = {-1001.0, 86001.0, -1000.0001, 86000.0001, NAN, INFINITY, -INFINITY};
    for (size_t k = 0; k < 3; k++) {
        for (size_t i = 0; i < sizeof BAD / sizeof BAD[0]; i++) {
            sr_air a;
            double rho;
            sr_error e;
            assert_int_equal(sr_atmos_at(models[k], BAD[i], &a, &e), SR_EDOMAIN);
            assert_non_null(strstr(e.msg, "-1000 m .. 86000 m"));
            assert_int_equal(sr_atmos_density(models[k], BAD[i], &rho, &e), SR_EDOMAIN);
        }
        sr_air a;
        assert_int_equal(sr_atmos_at(models[k], -1000.0, &a, NULL), SR_OK);
        assert_int_equal(sr_atmos_at(models[k], 86000.0, &a, NULL), SR_OK);
    }
    double T, p;
    assert_int_equal(sr_atmos_standard_tp(86001.0, 0.0, &T, &p), SR_EDOMAIN);
    assert_int_equal(sr_atmos_standard_tp(NAN, 0.0, &T, &p), SR_EDOMAIN);
    double lo, hi;
    sr_atmos_range(&ms, &lo, &hi);
    assert_true(lo == -1000.0 && hi == 86000.0);
}

int main(void)
{
    gsl_set_error_handler_off();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_printed_tables),
        cmocka_unit_test(test_full_precision),
        cmocka_unit_test(test_constants_and_sea_level),
        cmocka_unit_test(test_geometric_vs_geopotential),
        cmocka_unit_test(test_layer_bases),
        cmocka_unit_test(test_viscosity_sound_gravity),
        cmocka_unit_test(test_hydrostatic_gsl),
        cmocka_unit_test(test_offset),
        cmocka_unit_test(test_site),
        cmocka_unit_test(test_sounding_csv),
        cmocka_unit_test(test_sounding_errors),
        cmocka_unit_test(test_out_of_range),
    };
    return cmocka_run_group_tests_name("atmos", tests, NULL, NULL);
}
