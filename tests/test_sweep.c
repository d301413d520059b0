/* test_sweep.c - sweeps: rows equal the single-point `rate` and `size`
 * results at the same inputs (both run in-process), against the 1976
 * standard's printed tables and closed forms of the descent time; CSV read
 * back with libcsv (RFC 4180), JSON with jansson; bad ranges are one-line
 * errors with exit 2; figures render under the real gnuplot. */
#define _DEFAULT_SOURCE
#include <csv.h>
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "physics/atmos.h"
#include "files/catalog.h"
#include "output/plot.h"
#include "analysis/sweep.h"
#include "testutil.h"

#define USSA "U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562) printed tables, via references/atmosphere-1976.md 1.4"

static char tmpdir[256];

static int setup(void **state)
{
    (void)state;
    snprintf(tmpdir, sizeof tmpdir, "/tmp/sinkrate-sweep-XXXXXX");
    return mkdtemp(tmpdir) ? 0 : -1;
}

static int teardown(void **state)
{
    (void)state;
    char cmd[400];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", tmpdir);
    return system(cmd) == 0 ? 0 : -1;
}

static const char *tpath(const char *name)
{
    static char buf[8][512];
    static int k;
    char *b = buf[k++ % 8];
    snprintf(b, 512, "%s/%s", tmpdir, name);
    return b;
}

/* ---- a small RFC 4180 reader on libcsv: comment lines (#) dropped ---- */

typedef struct table {
    char **cells; /* row-major */
    size_t ncols, nrows, cap, col;
    int bad;
} table;

static void on_field(void *s, size_t len, void *ud)
{
    table *t = ud;
    if (t->nrows * t->ncols + t->col + 1 > t->cap) {
        t->cap = t->cap ? 2 * t->cap : 256;
        t->cells = realloc(t->cells, t->cap * sizeof *t->cells);
    }
    if (t->nrows > 0 && t->col >= t->ncols) {
        t->bad = 1;
        return;
    }
    t->cells[t->nrows * t->ncols + t->col] = strndup(s, len);
    t->col++;
}

static void on_row(int c, void *ud)
{
    (void)c;
    table *t = ud;
    if (t->nrows == 0)
        t->ncols = t->col;
    else if (t->col != t->ncols)
        t->bad = 1;
    t->nrows++;
    t->col = 0;
}

/* Parse CSV text; row 0 is the header. */
static table parse_csv(const char *text)
{
    table t;
    memset(&t, 0, sizeof t);
    /* the header row (stored before the width is known) fits in the first allocation */
    t.cap = 4096;
    t.cells = calloc(t.cap, sizeof *t.cells);
    struct csv_parser p;
    assert_int_equal(csv_init(&p, CSV_STRICT | CSV_STRICT_FINI | CSV_APPEND_NULL), 0);
    for (const char *line = text; *line;) {
        const char *e = strchr(line, '\n');
        size_t n = e ? (size_t)(e - line) + 1 : strlen(line);
        if (line[0] != '#') {
            size_t done = csv_parse(&p, line, n, on_field, on_row, &t);
            assert_int_equal(done, n);
        }
        line += n;
    }
    assert_int_equal(csv_fini(&p, on_field, on_row, &t), 0);
    csv_free(&p);
    assert_false(t.bad);
    return t;
}

static void free_table(table *t)
{
    size_t stride = t->ncols;
    for (size_t i = 0; i < t->nrows * stride; i++)
        free(t->cells[i]);
    free(t->cells);
}

static const char *cell(const table *t, size_t row, size_t col)
{
    return t->cells[row * t->ncols + col];
}

/* Column whose header starts with name (then " [unit]" or end). */
static size_t column(const table *t, const char *name)
{
    size_t n = strlen(name);
    for (size_t c = 0; c < t->ncols; c++) {
        const char *h = cell(t, 0, c);
        if (strncmp(h, name, n) == 0 && (h[n] == '\0' || h[n] == ' '))
            return c;
    }
    fail_msg("no column %s", name);
    return 0;
}

static double num(const table *t, size_t row, const char *name)
{
    return strtod(cell(t, row, column(t, name)), NULL);
}

/* Run the CLI; exit code 0 expected; CSV on stdout parsed. */
static table run_csv(char **argv)
{
    int argc = 0;
    while (argv[argc])
        argc++;
    char *out, *err;
    int rc = sr_test_cli_argv(&out, &err, argc, argv);
    if (rc != 0)
        fail_msg("%s %s: exit %d: %s", argv[1], argv[2], rc, err);
    table t = parse_csv(out);
    free(out);
    free(err);
    return t;
}

/* The same column of two tables, cell for cell as printed (same digits). */
static void same_column(const table *a, size_t ra, const table *b, size_t rb, const char *name)
{
    const char *x = cell(a, ra, column(a, name)), *y = cell(b, rb, column(b, name));
    if (strcmp(x, y) != 0)
        fail_msg("%s: sweep %s, single point %s", name, x, y);
}

static const char *RATE_COLS[] = {"density", "rate_low", "rate_typical", "rate_high", "dynamic_pressure"};

/* ---- sweep rows equal `rate` at the same inputs ---- */

static void check_altitudes(char **common, int ncommon, const char *alts)
{
    char *sw[48] = {"sinkrate", "sweep", "--format", "csv", "--values", (char *)alts};
    char *rt[48] = {"sinkrate", "rate", "--format", "csv", "--altitude", (char *)alts};
    for (int i = 0; i < ncommon; i++)
        sw[6 + i] = rt[6 + i] = common[i];
    table s = run_csv(sw), r = run_csv(rt);
    assert_int_equal(s.nrows, r.nrows);
    assert_true(s.nrows > 2);
    for (size_t i = 1; i < s.nrows; i++) {
        same_column(&s, i, &r, i, "altitude");
        for (size_t k = 0; k < sizeof RATE_COLS / sizeof RATE_COLS[0]; k++)
            same_column(&s, i, &r, i, RATE_COLS[k]);
    }
    free_table(&s);
    free_table(&r);
}

static void test_altitude_rows_equal_rate(void **state)
{
    (void)state;
    char *a[] = {"--mass", "5.3kg", "--family", "conical", "--nominal-diameter", "2.2m"};
    check_altitudes(a, 6, "0,500m,1000m,3000m,10km,25km");
    /* hot high site, a cluster with fabric mass and payload drag */
    char *b[] = {"--mass", "5.3kg", "--family", "cross", "--nominal-diameter", "0.9m", "--cluster", "2",
                 "--areal-mass", "40 g/m2", "--body-drag-area", "0.01 m2", "--site-elevation", "1380m",
                 "--surface-temp", "38C", "--surface-pressure", "858hPa"};
    check_altitudes(b, 18, "1380m,2000m,4280m");
    /* a measured drag coefficient on projected area, size given as flat diameter */
    char *c[] = {"--mass", "12 lb", "--family", "flat-circular", "--flat-diameter", "60in", "--drag-coefficient",
                 "1.4", "--drag-reference", "projected", "--temp-offset", "-20C"};
    check_altitudes(c, 12, "0,2000m,6000m");
}

/* One sweep over var against `rate` run once per value with the option. */
static void check_var(const char *vary, const char *values, const char **vals, int nvals, const char *rate_opt,
                      char **common, int ncommon)
{
    char *sw[48] = {"sinkrate", "sweep", "--format", "csv", "--vary", (char *)vary, "--values", (char *)values};
    for (int i = 0; i < ncommon; i++)
        sw[8 + i] = common[i];
    table s = run_csv(sw);
    assert_int_equal(s.nrows, (size_t)nvals + 1);
    for (int v = 0; v < nvals; v++) {
        char *rt[48] = {"sinkrate", "rate", "--format", "csv", (char *)rate_opt, (char *)vals[v]};
        for (int i = 0; i < ncommon; i++)
            rt[6 + i] = common[i];
        table r = run_csv(rt);
        assert_int_equal(r.nrows, 2);
        for (size_t k = 0; k < sizeof RATE_COLS / sizeof RATE_COLS[0]; k++)
            same_column(&s, (size_t)v + 1, &r, 1, RATE_COLS[k]);
        free_table(&r);
    }
    free_table(&s);
}

static void test_other_rows_equal_rate(void **state)
{
    (void)state;
    const char *masses[] = {"1kg", "2.5kg", "7kg", "20lb"};
    char *m[] = {"--family", "conical", "--nominal-diameter", "2.2m", "--areal-mass", "35 g/m2"};
    check_var("mass", "1kg,2.5kg,7kg,20lb", masses, 4, "--mass", m, 6);
    /* diameter: the family without a size in the sweep; rate gets the size */
    const char *diams[] = {"0.8m", "1.5m", "2.2m", "100in"};
    char *sw[] = {"sinkrate", "sweep", "--format", "csv", "--vary", "diameter", "--values", "0.8m,1.5m,2.2m,100in",
                  "--mass", "5.3kg", "--family", "ringsail", "--cluster", "3", NULL};
    table s = run_csv(sw);
    for (int v = 0; v < 4; v++) {
        char *rt[] = {"sinkrate", "rate", "--format", "csv", "--mass", "5.3kg", "--family", "ringsail",
                      "--nominal-diameter", (char *)diams[v], "--cluster", "3", NULL};
        table r = run_csv(rt);
        for (size_t k = 0; k < sizeof RATE_COLS / sizeof RATE_COLS[0]; k++)
            same_column(&s, (size_t)v + 1, &r, 1, RATE_COLS[k]);
        free_table(&r);
    }
    free_table(&s);
    const char *offsets[] = {"-30C", "0C", "15C", "40C"};
    char *t[] = {"--mass", "5.3kg", "--family", "conical", "--nominal-diameter", "2.2m", "--altitude", "1500m"};
    check_var("temp-offset", "-30C,0C,15C,40C", offsets, 4, "--temp-offset", t, 8);
    /* site elevation: touchdown at each site's ground, standard there */
    const char *sites[] = {"0m", "1380m", "2500m", "6000ft"};
    char *e[] = {"--mass", "5.3kg", "--family", "conical", "--nominal-diameter", "2.2m"};
    check_var("site-elevation", "0m,1380m,2500m,6000ft", sites, 4, "--site-elevation", e, 6);
}

static void test_speed_rows_equal_size(void **state)
{
    (void)state;
    const char *speeds[] = {"3m/s", "5.5m/s", "18ft/s", "9m/s"};
    char *sw[] = {"sinkrate", "sweep", "--format", "csv", "--vary", "speed", "--values", "3m/s,5.5m/s,18ft/s,9m/s",
                  "--mass", "5.3kg", "--family", "annular", "--site-elevation", "1380m", "--surface-temp", "38C",
                  NULL};
    table s = run_csv(sw);
    assert_int_equal(s.nrows, 5);
    for (int v = 0; v < 4; v++) {
        char *sz[] = {"sinkrate", "size", "--format", "csv", "--mass", "5.3kg", "--speed", (char *)speeds[v],
                      "--family", "annular", "--site-elevation", "1380m", "--surface-temp", "38C", NULL};
        int argc = 14;
        char *out, *err;
        assert_int_equal(sr_test_cli_argv(&out, &err, argc, sz), 0);
        /* size prints its tables after the values as comments; read the values back */
        static const char *keys[] = {"nominal_diameter_low", "nominal_diameter_typical", "nominal_diameter_high"};
        for (int k = 0; k < 3; k++) {
            char pat[64];
            snprintf(pat, sizeof pat, "# %s = ", keys[k]);
            const char *at = strstr(out, pat);
            assert_non_null(at);
            double want = strtod(at + strlen(pat), NULL);
            double got = num(&s, (size_t)v + 1, keys[k]);
            assert_true(fabs(got - want) <= 1e-9 * want);
        }
        free(out);
        free(err);
    }
    free_table(&s);
}

/* ---- outside checks ---- */

static void test_against_standard_and_drag_balance(void **state)
{
    (void)state;
    char *sw[] = {"sinkrate", "sweep", "--format", "csv", "--values", "0,1000m,10000m", "--mass", "5.3kg",
                  "--family", "conical", "--nominal-diameter", "2.2m", NULL};
    table s = run_csv(sw);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "density at 0 m in a sweep row", USSA " (1.2250 kg/m3)", 1.2250,
                    num(&s, 1, "density"), 5e-5);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "density at 1000 m in a sweep row", USSA " (1.1117 kg/m3)", 1.1117,
                    num(&s, 2, "density"), 5e-5);
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "density at 10 km in a sweep row", USSA " (0.41351 kg/m3)", 0.41351,
                    num(&s, 3, "density"), 5e-5);
    /* Mach: the rate over the speed of sound */
    double a10 = num(&s, 3, "rate_typical") / num(&s, 3, "mach");
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "speed of sound at 10 km from rate / Mach", USSA " (299.53 m/s)", 299.53, a10,
                    2e-5);
    double a0 = num(&s, 1, "rate_typical") / num(&s, 1, "mach");
    CHECK_REL_CLASS(SR_CHECK_PUBLISHED, "speed of sound at 0 m from rate / Mach", USSA " (340.29 m/s, PDAS table)",
                    340.29, a0, 2e-5);
    /* at equilibrium the dynamic pressure is the weight over the drag area, whatever the air */
    double cds = 0.825 * M_PI / 4.0 * 2.2 * 2.2;
    CHECK_REL_CLASS(SR_CHECK_METHOD, "dynamic pressure at equilibrium at 0 m = m g0 / CdS",
                    "drag equation in steady descent, q CdS = m g (Knacke 1991, NWC TP 6575, sec. 4.5)",
                    5.3 * 9.80665 / cds, num(&s, 1, "dynamic_pressure"), 1e-9);
    double g10 = 9.80665 * pow(6356766.0 / (6356766.0 + 10000.0), 2);
    CHECK_REL_CLASS(SR_CHECK_METHOD, "dynamic pressure at equilibrium at 10 km = m g(z) / CdS",
                    "drag equation in steady descent; g(z) = g0 (r0/(r0+z))^2, U.S. Standard Atmosphere 1976",
                    5.3 * g10 / cds, num(&s, 3, "dynamic_pressure"), 1e-9);
    free_table(&s);

    /* sizing at sea level: D0 = sqrt(8 m g / (pi rho v^2 CD0)) with the printed sea-level density */
    char *sz[] = {"sinkrate", "sweep", "--format", "csv", "--vary", "speed", "--values", "5m/s,7m/s", "--mass",
                  "5.3kg", "--family", "conical", NULL};
    table z = run_csv(sz);
    double d5 = sqrt(8.0 * 5.3 * 9.80665 / (M_PI * 1.2250 * 25.0 * 0.825));
    CHECK_REL_CLASS(SR_CHECK_METHOD, "D0 for 5 m/s, 5.3 kg, conical CD0 0.825, sea level",
                    "drag equation solved for S0 = 2 m g / (rho v^2 CD0), D0 = sqrt(4 S0/pi); rho0 " USSA, d5,
                    num(&z, 1, "nominal_diameter_typical"), 5e-5);
    double d7 = sqrt(8.0 * 5.3 * 9.80665 / (M_PI * 1.2250 * 49.0 * 0.90));
    CHECK_REL_CLASS(SR_CHECK_METHOD, "D0 for 7 m/s, 5.3 kg, conical CD0 0.90 (low size), sea level",
                    "drag equation solved for S0; rho0 " USSA, d7, num(&z, 2, "nominal_diameter_low"), 5e-5);
    free_table(&z);
}

/* Closed form of integral sqrt(rho/g) dz from z1 to z1+h for rho = rho1
 * exp(-(z - z1)/H) and g = g0 (r0/(r0+z))^2, i.e. 1/sqrt(g) = (r0+z)/(r0 sqrt(g0)). */
static double isothermal_integral(double rho1, double H, double z1, double h)
{
    const double r0 = 6356766.0, g0 = 9.80665;
    double a = 1.0 / (2.0 * H), e = exp(-a * h);
    return sqrt(rho1 / g0) * ((1.0 + z1 / r0) * (1.0 - e) / a + (1.0 - e * (1.0 + a * h)) / (a * a * r0));
}

static void test_descent_time_closed_forms(void **state)
{
    (void)state;
    sr_error e;
    const sr_family *fam = sr_catalog_find(sr_test_catalog(), "flat-circular", &e);
    assert_non_null(fam);
    sr_sweep_case c;
    memset(&c, 0, sizeof c);
    assert_int_equal(sr_canopy_from_size(&c.canopy, fam, SR_SIZE_NOMINAL_DIAMETER, 1.8, &e), 0);
    c.mass = 4.0;
    c.altitude = NAN;
    c.ground = 0.0;
    const double Rs = 8.31432 / 28.9644e-3;

    /* uniform air: T constant and p all but constant; t = h / v with v from the drag balance */
    double zs[2] = {0.0, 4000.0}, T[2] = {270.0, 270.0}, p[2] = {90000.0, 90000.0 * (1.0 - 1e-12)};
    assert_int_equal(sr_atmos_init_sounding(&c.atmos, zs, T, p, 2, &e), 0);
    double rho = 90000.0 / (Rs * 270.0);
    sr_band t;
    assert_int_equal(sr_sweep_descent_time(&c, 2500.0, &t, &e), 0);
    double cds = 0.775 * M_PI / 4.0 * 1.8 * 1.8;
    /* with g(z) of the standard the integral of 1/v is h/v0 (1 + (z1 + z2)/(2 r0)) */
    double v0 = sqrt(2.0 * 4.0 * 9.80665 / (rho * cds));
    double want = 2500.0 / v0 * (1.0 + 2500.0 / (2.0 * 6356766.0));
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "descent time 2500 m in uniform air, flat circular 1.8 m, 4 kg",
                    "closed form t = h / v for constant density (common practice), g(z) of US Standard Atmosphere 1976",
                    want, t.typ, 1e-9);
    sr_atmos_release(&c.atmos);

    /* isothermal air: density falls exponentially with scale height H = ln-pressure slope */
    double H = 8000.0;
    double p2[2] = {101000.0, 101000.0 * exp(-4000.0 / H)};
    assert_int_equal(sr_atmos_init_sounding(&c.atmos, zs, T, p2, 2, &e), 0);
    c.ground = 300.0;
    assert_int_equal(sr_sweep_descent_time(&c, 3300.0, &t, &e), 0);
    double rho300 = 101000.0 * exp(-300.0 / H) / (Rs * 270.0);
    double I = isothermal_integral(rho300, H, 300.0, 3000.0);
    sr_band cdsb = sr_canopy_total_cds(&c.canopy);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "descent time 3000 m in isothermal air (typical drag)",
                    "closed form: integral of sqrt(rho/g) dz for rho = rho1 exp(-(z-z1)/H), g(z) of USSA 1976",
                    sqrt(cdsb.typ / (2.0 * 4.0)) * I, t.typ, 1e-9);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "descent time 3000 m in isothermal air (low drag: short time)",
                    "closed form as above with the family's low CD0", sqrt(cdsb.lo / (2.0 * 4.0)) * I, t.lo, 1e-9);

    /* the sweep's running sum agrees with single integrals, in either order */
    double xs[5] = {3300.0, 300.0, 2000.0, 1200.5, 3999.0};
    sr_sweep_row rows[5];
    assert_int_equal(sr_sweep_run(&c, SR_SWEEP_ALTITUDE, xs, 5, rows, NULL, NULL, &e), 0);
    for (int i = 0; i < 5; i++) {
        sr_band one;
        assert_int_equal(sr_sweep_descent_time(&c, xs[i], &one, &e), 0);
        assert_true(fabs(one.typ - rows[i].t.typ) <= 1e-9 * (one.typ + 1e-12));
        assert_true(rows[i].t.lo <= rows[i].t.typ && rows[i].t.typ <= rows[i].t.hi);
    }
    assert_true(rows[1].t.typ == 0.0);
    /* below the ground or above the sounding: clear errors */
    assert_int_equal(sr_sweep_descent_time(&c, 100.0, &t, &e), SR_EDOMAIN);
    assert_non_null(strstr(e.msg, "below the ground"));
    xs[0] = 4500.0;
    assert_int_equal(sr_sweep_run(&c, SR_SWEEP_ALTITUDE, xs, 5, rows, NULL, NULL, &e), SR_EDOMAIN);
    assert_non_null(strstr(e.msg, "sounding"));
    sr_atmos_release(&c.atmos);

    /* the same through the command line, with the sounding read from CSV */
    const char *csv = sr_test_tmpfile(".csv", "altitude [m],temperature [K],pressure [Pa]\n"
                                              "0,270,101000\n"
                                              "4000,270,61256.47757\n");
    char *sw[] = {"sinkrate", "sweep", "--format", "csv", "--values", "0,1000m,3000m", "--mass", "4kg",
                  "--family", "flat-circular", "--nominal-diameter", "1.8m", "--sounding", (char *)csv, NULL};
    table s = run_csv(sw);
    double Hc = 4000.0 / log(101000.0 / 61256.47757);
    double rho0 = 101000.0 / (Rs * 270.0);
    CHECK_REL_CLASS(SR_CHECK_DERIVED, "descent time from 3000 m, isothermal sounding file",
                    "closed form: integral of sqrt(rho/g) dz, exponential density, g(z) of USSA 1976",
                    sqrt(cdsb.typ / 8.0) * isothermal_integral(rho0, Hc, 0.0, 3000.0), num(&s, 3, "time_typical"),
                    1e-8);
    assert_true(num(&s, 1, "time_typical") == 0.0);
    free_table(&s);
    unlink(csv);
}

static void test_range_values(void **state)
{
    (void)state;
    double *v;
    size_t n;
    sr_error e;
    assert_int_equal(sr_sweep_range(0.0, 1.0, 0.1, 1000, &v, &n, &e), 0);
    assert_int_equal(n, 11); /* 0.1 is not exact in binary; the end is still included */
    assert_true(v[10] == 1.0);
    free(v);
    assert_int_equal(sr_sweep_range(3000.0, 0.0, -250.0, 1000, &v, &n, &e), 0);
    assert_int_equal(n, 13);
    assert_true(v[12] == 0.0);
    free(v);
    assert_int_equal(sr_sweep_range(0.0, 10.0, 3.0, 1000, &v, &n, &e), 0);
    assert_int_equal(n, 4); /* 0 3 6 9: 10 is not on the grid */
    free(v);
    assert_int_equal(sr_sweep_range(5.0, 5.0, 1.0, 1000, &v, &n, &e), 0);
    assert_int_equal(n, 1);
    free(v);
    assert_int_equal(sr_sweep_range(0.0, 99999.0, 1.0, SR_SWEEP_MAX_ROWS, &v, &n, &e), 0);
    assert_int_equal(n, SR_SWEEP_MAX_ROWS);
    free(v);
    assert_int_equal(sr_sweep_range(0.0, 100000.0, 1.0, SR_SWEEP_MAX_ROWS, &v, &n, &e), SR_EINVAL);
    assert_int_equal(sr_sweep_range(0.0, 1.0, 0.0, 10, &v, &n, &e), SR_EINVAL);
    assert_int_equal(sr_sweep_range(0.0, 1.0, -0.5, 10, &v, &n, &e), SR_EINVAL);
    assert_int_equal(sr_sweep_range(0.0, NAN, 1.0, 10, &v, &n, &e), SR_EINVAL);
}

/* ---- CSV and JSON ---- */

static void test_csv_and_json_read_back(void **state)
{
    (void)state;
    /* two canopies by three temperature offsets: the canopy column holds commas */
    char *base[] = {"sinkrate", "sweep", "--from", "1380m", "--to", "3000m", "--step", "90m", "--mission",
                    (char *)sr_test_path("payloads/desert-club-rocket.yaml"), "--by", "temp-offset=-10C,0C,25C",
                    "--format", "csv", NULL};
    table s = run_csv(base);
    size_t nvals = 19; /* 1380 .. 2910 by 90, 3000 not on the grid */
    assert_int_equal(s.nrows, 1 + 2 * 3 * nvals);
    size_t cc = column(&s, "canopy");
    assert_non_null(strchr(cell(&s, 1, cc), ','));
    assert_string_equal(cell(&s, 1, column(&s, "altitude")), "1380");

    base[13] = "json";
    char *out, *err;
    assert_int_equal(sr_test_cli_argv(&out, &err, 14, base), 0);
    json_error_t je;
    json_t *root = json_loads(out, 0, &je);
    if (!root)
        fail_msg("JSON: %s at line %d", je.text, je.line);
    assert_non_null(strstr(json_string_value(json_object_get(root, "caution")), "not for designing"));
    json_t *tab = json_object_get(json_object_get(root, "tables"), "sweep");
    json_t *cols = json_object_get(tab, "columns"), *rows = json_object_get(tab, "rows");
    assert_int_equal(json_array_size(rows), s.nrows - 1);
    assert_int_equal(json_array_size(cols), s.ncols);
    /* every number in the CSV equals the JSON number (both printed to 10 digits) */
    for (size_t i = 0; i < json_array_size(rows); i++) {
        json_t *row = json_array_get(rows, i);
        for (size_t k = 0; k < s.ncols; k++) {
            json_t *v = json_array_get(row, k);
            const char *txt = cell(&s, i + 1, k);
            if (json_is_string(v)) {
                assert_string_equal(json_string_value(v), txt);
            } else if (json_is_null(v)) {
                assert_string_equal(txt, "");
            } else {
                double x = json_number_value(v), y = strtod(txt, NULL);
                assert_true(fabs(x - y) <= 1e-9 * fabs(y) + 1e-300);
            }
        }
    }
    json_decref(root);
    free(out);
    free(err);
    free_table(&s);
}

/* ---- bad requests ---- */

static void test_bad_ranges_are_one_line(void **state)
{
    (void)state;
    static const char *cases[][8] = {
        {"--from", "0", "--to", "1000m", "--step", "0", NULL},
        {"--from", "0", "--to", "1000m", "--step", "-10m", NULL},
        {"--from", "1000m", "--to", "0", "--step", "10m", NULL},
        {"--from", "0", "--to", "86km", "--step", "0.5m", NULL},
        {"--from", "0", "--to", "90km", "--step", "1km", NULL},
        {"--from", "-2km", "--to", "1km", "--step", "100m", NULL},
        {"--values", "0,100m,87km", NULL},
        {"--from", "0", "--to", "1000m", NULL},
        {"--values", "0,100", "--step", "5", NULL},
        {"--vary", "mass", "--values", "0,2kg", NULL},
        {"--vary", "temp-offset", "--values", "-150C,0C", NULL},
        {"--vary", "site-elevation", "--values", "0,25km", NULL},
        {"--vary", "wind", NULL},
        {"--by", "speed=1,2", NULL},
        {"--by", "altitude", NULL},
        {"--figure", "map", NULL},
        {"--vary", "mass", "--figure", "time", "--values", "1", NULL},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        /* a mass sweep takes no --mass */
        int sweeps_mass = strcmp(cases[i][0], "--vary") == 0 && strcmp(cases[i][1], "mass") == 0;
        char *argv[32] = {"sinkrate", "sweep", "--family", "conical", "--nominal-diameter", "2m", "--mass", "5kg"};
        int argc = sweeps_mass ? 6 : 8;
        for (int k = 0; cases[i][k]; k++)
            argv[argc++] = (char *)cases[i][k];
        argv[argc] = NULL;
        char *out, *err;
        int rc = sr_test_cli_argv(&out, &err, argc, argv);
        if (rc != 2 || sr_test_lines(err) != 1 || out[0] || strncmp(err, "sinkrate sweep: ", 16) != 0)
            fail_msg("case %zu (%s %s): exit %d, stdout [%s], stderr [%s]", i, cases[i][0], cases[i][1], rc, out,
                     err);
        free(out);
        free(err);
    }
    /* too many rows over all curves names the limit */
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "sweep", "--mass", "5kg", "--family", "conical", "--nominal-diameter", "2m",
                         "--family", "cross", "--nominal-diameter", "1m", "--from", "0", "--to", "59999m", "--step",
                         "1m", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "100000"));
    free(out);
    free(err);
    /* size options before any --family, or twice for one canopy */
    rc = sr_test_cli(&out, &err, "sweep", "--mass", "5kg", "--nominal-diameter", "2m", "--family", "conical", NULL);
    assert_int_equal(rc, 2);
    assert_non_null(strstr(err, "after the --family"));
    free(out);
    free(err);
    rc = sr_test_cli(&out, &err, "sweep", "--mass", "5kg", "--family", "conical", "--nominal-diameter", "2m",
                     "--nominal-area", "3m2", "--values", "0", NULL);
    assert_int_equal(rc, 2);
    free(out);
    free(err);
}

/* ---- figures through the command line ---- */

static int exists(const char *path)
{
    struct stat st;
    return stat(path, &st) == 0;
}

static void figure(const char *name, const char *const *args)
{
    char prefix[512], png[600];
    snprintf(prefix, sizeof prefix, "%s/fig/%s", tmpdir, name);
    char *argv[48] = {"sinkrate", "sweep", "--plot", prefix, "--plot-size", "800x500", "-o", (char *)tpath("t.txt")};
    int argc = 8;
    for (int k = 0; args[k]; k++)
        argv[argc++] = (char *)args[k];
    argv[argc] = NULL;
    char *out, *err;
    int rc = sr_test_cli_argv(&out, &err, argc, argv);
    if (rc != 0 || !strstr(err, "wrote") || strstr(err, "gnuplot:"))
        fail_msg("%s: exit %d: %s", name, rc, err);
    snprintf(png, sizeof png, "%s.png", prefix);
    unsigned w = 0, h = 0;
    assert_true(sr_test_png_size(png, &w, &h));
    char q[128];
    snprintf(q, sizeof q, "PNG width of the '%s' sweep figure (--plot-size 800x500)", name);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, q, SR_SRC_PNG, 800, w, 0);
    snprintf(q, sizeof q, "PNG height of the '%s' sweep figure (--plot-size 800x500)", name);
    CHECK_ABS_CLASS(SR_CHECK_FORMAT, q, SR_SRC_PNG, 500, h, 0);
    free(out);
    free(err);
}

static void test_figures_render(void **state)
{
    (void)state;
    const char *mission = sr_test_path("payloads/desert-club-rocket.yaml");
    const char *alt[] = {"--mission", mission, "--mark-speed", "6.1m/s", NULL};
    figure("both", alt);
    const char *rate[] = {"--mission", mission, "--figure", "rate", "--units", "us", NULL};
    figure("rate-us", rate);
    const char *time[] = {"--mission", mission, "--figure", "time", "--by", "temp-offset=-10C,0C,25C", NULL};
    figure("time", time);
    const char *mass[] = {"--vary", "mass", "--from", "1kg", "--to", "10kg", "--step", "0.5kg", "--family",
                          "conical", "--nominal-diameter", "2.2m", "--family", "cross", "--nominal-diameter", "0.9m",
                          "--mark-speed", "6.1m/s", NULL};
    figure("mass", mass);
    const char *diam[] = {"--vary", "diameter", "--values", "0.6m,1m,1.5m,2m,3m", "--mass", "5kg", "--family",
                          "hemispherical", "--by", "altitude=0,3000m", NULL};
    figure("diameter", diam);
    const char *site[] = {"--vary", "site-elevation", "--from", "0", "--to", "3000m", "--step", "250m", "--mass",
                          "5kg", "--family", "conical", "--nominal-diameter", "2m", "--temp-offset", "20C", NULL};
    figure("site", site);
    const char *speed[] = {"--vary", "speed", "--from", "3m/s", "--to", "9m/s", "--step", "0.25m/s", "--mass", "5.3kg",
                           "--family", "conical", "--family", "annular", "--family", "cross", "--family",
                           "flat-circular", "--mark-speed", "6.1m/s", NULL}; /* four curves: outlined bands */
    figure("speed", speed);
    const char *temp[] = {"--vary", "temp-offset", "--from", "-30C", "--to", "40C", "--step", "5C", "--mass", "5.3kg",
                          "--family", "conical", "--nominal-diameter", "2.2m", "--altitude", "1400m", NULL};
    figure("temp", temp);

    /* SVG */
    char prefix[512];
    snprintf(prefix, sizeof prefix, "%s/fig/vector", tmpdir);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "sweep", "--mission", mission, "--plot", prefix, "--plot-format", "svg", "-o",
                         tpath("t.txt"), NULL);
    assert_int_equal(rc, 0);
    char svg[600];
    snprintf(svg, sizeof svg, "%s.svg", prefix);
    assert_true(exists(svg));
    free(out);
    free(err);
}

static void test_without_gnuplot(void **state)
{
    (void)state;
    char *old = strdup(getenv("PATH"));
    char prefix[512], path[600];
    snprintf(prefix, sizeof prefix, "%s/nognu/descent", tmpdir);
    setenv("PATH", tmpdir, 1);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "sweep", "--mission", sr_test_path("payloads/desert-club-rocket.yaml"), "--plot",
                         prefix, "--format", "csv", NULL);
    setenv("PATH", old, 1);
    free(old);
    assert_int_equal(rc, 0);
    assert_non_null(strstr(err, "gnuplot is not on PATH"));
    char hint[600];
    snprintf(hint, sizeof hint, "gnuplot %s.gp", prefix);
    assert_non_null(strstr(err, hint));
    assert_non_null(strstr(out, "altitude [m]")); /* the table still comes out */
    snprintf(path, sizeof path, "%s.dat", prefix);
    assert_true(exists(path));
    snprintf(path, sizeof path, "%s.png", prefix);
    assert_false(exists(path));
    /* the script written then renders later, from another directory */
    char gp[1024], cwd[1024];
    assert_true(sr_plot_find_gnuplot(gp, sizeof gp));
    assert_non_null(getcwd(cwd, sizeof cwd));
    assert_int_equal(chdir("/"), 0);
    sr_error e;
    char diag[2048];
    rc = sr_plot_render(NULL, gp, prefix, "png", diag, sizeof diag, &e);
    assert_int_equal(chdir(cwd), 0);
    if (rc)
        fail_msg("%s", e.msg);
    assert_string_equal(diag, "");
    unsigned w, h;
    assert_true(sr_test_png_size(path, &w, &h));
    assert_int_equal(w, 1000);
    free(out);
    free(err);
}

static void test_failed_run_leaves_nothing(void **state)
{
    (void)state;
    char prefix[512], path[600];
    snprintf(prefix, sizeof prefix, "%s/failed/x", tmpdir);
    char *out, *err;
    int rc = sr_test_cli(&out, &err, "sweep", "--mass", "5kg", "--family", "conical", "--nominal-diameter", "2m",
                         "--from", "0", "--to", "1km", "--step", "0", "--plot", prefix, "-o", tpath("failed.csv"),
                         NULL);
    assert_int_equal(rc, 2);
    snprintf(path, sizeof path, "%s.dat", prefix);
    assert_false(exists(path));
    assert_false(exists(tpath("failed.csv")));
    free(out);
    free(err);
    /* no progress lines when the error stream is not a terminal */
    rc = sr_test_cli(&out, &err, "sweep", "--mass", "5kg", "--family", "conical", "--nominal-diameter", "2m",
                     "--from", "0", "--to", "29999m", "--step", "1m", "--format", "csv", "-o", tpath("big.csv"), NULL);
    assert_int_equal(rc, 0);
    assert_string_equal(err, "");
    free(out);
    free(err);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_altitude_rows_equal_rate),
        cmocka_unit_test(test_other_rows_equal_rate),
        cmocka_unit_test(test_speed_rows_equal_size),
        cmocka_unit_test(test_against_standard_and_drag_balance),
        cmocka_unit_test(test_descent_time_closed_forms),
        cmocka_unit_test(test_range_values),
        cmocka_unit_test(test_csv_and_json_read_back),
        cmocka_unit_test(test_bad_ranges_are_one_line),
        cmocka_unit_test(test_figures_render),
        cmocka_unit_test(test_without_gnuplot),
        cmocka_unit_test(test_failed_run_leaves_nothing),
    };
    return cmocka_run_group_tests_name("sweep", tests, setup, teardown);
}
