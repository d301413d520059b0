/* units.c - the unit table and the quantity parser.
 * Factors are exact where NIST SP 811 (2008), Appendix B, defines them so. */
#include "physics/units.h"

#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#define PI 3.14159265358979323846

typedef struct unit_def {
    sr_quantity q;
    const char *name;
    double factor; /* si = (value + offset) * factor */
    double offset;
} unit_def;

/* One row per accepted spelling; the first spelling of each unit is the one
 * listed in messages. */
static const unit_def UNITS[] = {
    {SR_Q_MASS, "kg", 1.0, 0},
    {SR_Q_MASS, "g", 1e-3, 0},
    {SR_Q_MASS, "lb", SR_LB, 0},
    {SR_Q_MASS, "lbs", SR_LB, 0},
    {SR_Q_MASS, "lbm", SR_LB, 0},
    {SR_Q_MASS, "oz", SR_LB / 16.0, 0},
    {SR_Q_MASS, "slug", SR_LBF / SR_FT, 0},

    {SR_Q_LENGTH, "m", 1.0, 0},
    {SR_Q_LENGTH, "cm", 1e-2, 0},
    {SR_Q_LENGTH, "mm", 1e-3, 0},
    {SR_Q_LENGTH, "km", 1e3, 0},
    {SR_Q_LENGTH, "ft", SR_FT, 0},
    {SR_Q_LENGTH, "in", SR_IN, 0},

    {SR_Q_AREA, "m2", 1.0, 0},
    {SR_Q_AREA, "m^2", 1.0, 0},
    {SR_Q_AREA, "cm2", 1e-4, 0},
    {SR_Q_AREA, "cm^2", 1e-4, 0},
    {SR_Q_AREA, "ft2", SR_FT * SR_FT, 0},
    {SR_Q_AREA, "ft^2", SR_FT * SR_FT, 0},
    {SR_Q_AREA, "in2", SR_IN * SR_IN, 0},
    {SR_Q_AREA, "in^2", SR_IN * SR_IN, 0},

    {SR_Q_SPEED, "m/s", 1.0, 0},
    {SR_Q_SPEED, "km/h", 1.0 / 3.6, 0},
    {SR_Q_SPEED, "ft/s", SR_FT, 0},
    {SR_Q_SPEED, "fps", SR_FT, 0},
    {SR_Q_SPEED, "mph", 0.44704, 0},
    {SR_Q_SPEED, "kn", 1852.0 / 3600.0, 0},
    {SR_Q_SPEED, "kt", 1852.0 / 3600.0, 0},

    {SR_Q_TEMP, "K", 1.0, 0},
    {SR_Q_TEMP, "C", 1.0, 273.15},
    {SR_Q_TEMP, "degC", 1.0, 273.15},
    {SR_Q_TEMP, "\xc2\xb0" "C", 1.0, 273.15},
    {SR_Q_TEMP, "F", 5.0 / 9.0, 459.67},
    {SR_Q_TEMP, "degF", 5.0 / 9.0, 459.67},
    {SR_Q_TEMP, "\xc2\xb0" "F", 5.0 / 9.0, 459.67},
    {SR_Q_TEMP, "R", 5.0 / 9.0, 0},

    {SR_Q_TEMP_DIFF, "K", 1.0, 0},
    {SR_Q_TEMP_DIFF, "C", 1.0, 0},
    {SR_Q_TEMP_DIFF, "degC", 1.0, 0},
    {SR_Q_TEMP_DIFF, "\xc2\xb0" "C", 1.0, 0},
    {SR_Q_TEMP_DIFF, "F", 5.0 / 9.0, 0},
    {SR_Q_TEMP_DIFF, "degF", 5.0 / 9.0, 0},
    {SR_Q_TEMP_DIFF, "\xc2\xb0" "F", 5.0 / 9.0, 0},

    {SR_Q_PRESSURE, "Pa", 1.0, 0},
    {SR_Q_PRESSURE, "hPa", 100.0, 0},
    {SR_Q_PRESSURE, "mbar", 100.0, 0},
    {SR_Q_PRESSURE, "kPa", 1000.0, 0},
    {SR_Q_PRESSURE, "bar", 1e5, 0},
    {SR_Q_PRESSURE, "atm", 101325.0, 0},
    {SR_Q_PRESSURE, "psi", SR_LBF / (SR_IN * SR_IN), 0},
    {SR_Q_PRESSURE, "psf", SR_LBF / (SR_FT * SR_FT), 0},
    {SR_Q_PRESSURE, "lbf/ft2", SR_LBF / (SR_FT * SR_FT), 0},
    /* conventional inch of mercury: 25.4 mm x 13.5951 g/cm3 x g0 (NIST SP 811 B.8) */
    {SR_Q_PRESSURE, "inHg", 3386.388640341, 0},

    {SR_Q_FORCE, "N", 1.0, 0},
    {SR_Q_FORCE, "kN", 1000.0, 0},
    {SR_Q_FORCE, "lbf", SR_LBF, 0},
    {SR_Q_FORCE, "kgf", SR_G0, 0},

    {SR_Q_ENERGY, "J", 1.0, 0},
    {SR_Q_ENERGY, "kJ", 1000.0, 0},
    {SR_Q_ENERGY, "ft-lbf", SR_FT_LBF, 0},
    {SR_Q_ENERGY, "ft*lbf", SR_FT_LBF, 0},
    {SR_Q_ENERGY, "ft-lb", SR_FT_LBF, 0},

    {SR_Q_ANGLE, "deg", PI / 180.0, 0},
    {SR_Q_ANGLE, "\xc2\xb0", PI / 180.0, 0},
    {SR_Q_ANGLE, "rad", 1.0, 0},

    {SR_Q_TIME, "s", 1.0, 0},
    {SR_Q_TIME, "ms", 1e-3, 0},
    {SR_Q_TIME, "min", 60.0, 0},
    {SR_Q_TIME, "h", 3600.0, 0},

    {SR_Q_DENSITY, "kg/m3", 1.0, 0},
    {SR_Q_DENSITY, "kg/m^3", 1.0, 0},
    {SR_Q_DENSITY, "g/cm3", 1000.0, 0},
    {SR_Q_DENSITY, "slug/ft3", (SR_LBF / SR_FT) / (SR_FT * SR_FT * SR_FT), 0},
    {SR_Q_DENSITY, "lb/ft3", SR_LB / (SR_FT * SR_FT * SR_FT), 0},

    {SR_Q_AREAL_MASS, "kg/m2", 1.0, 0},
    {SR_Q_AREAL_MASS, "g/m2", 1e-3, 0},
    {SR_Q_AREAL_MASS, "oz/yd2", (SR_LB / 16.0) / (9.0 * SR_FT * SR_FT), 0},

    {SR_Q_VISCOSITY, "Pa*s", 1.0, 0},
    {SR_Q_VISCOSITY, "Pa.s", 1.0, 0},
    {SR_Q_VISCOSITY, "lbf*s/ft2", SR_LBF / (SR_FT * SR_FT), 0},

    {SR_Q_KIN_VISCOSITY, "m2/s", 1.0, 0},
    {SR_Q_KIN_VISCOSITY, "ft2/s", SR_FT * SR_FT, 0},

    {SR_Q_ACCEL, "m/s2", 1.0, 0},
    {SR_Q_ACCEL, "m/s^2", 1.0, 0},
    {SR_Q_ACCEL, "ft/s2", SR_FT, 0},
    {SR_Q_ACCEL, "g", SR_G0, 0},

    {SR_Q_VOLUME, "m3", 1.0, 0},
    {SR_Q_VOLUME, "m^3", 1.0, 0},
    {SR_Q_VOLUME, "L", 1e-3, 0},
    {SR_Q_VOLUME, "mL", 1e-6, 0},
    {SR_Q_VOLUME, "cm3", 1e-6, 0},
    {SR_Q_VOLUME, "cm^3", 1e-6, 0},
    {SR_Q_VOLUME, "in3", SR_IN * SR_IN * SR_IN, 0},
    {SR_Q_VOLUME, "in^3", SR_IN * SR_IN * SR_IN, 0},
    {SR_Q_VOLUME, "ft3", SR_FT * SR_FT * SR_FT, 0},
    {SR_Q_VOLUME, "ft^3", SR_FT * SR_FT * SR_FT, 0},
};

#define N_UNITS (sizeof UNITS / sizeof UNITS[0])

typedef struct display_def {
    const char *name;
    const char *si;
    const char *us;
    const char *accepted;
} display_def;

static const display_def DISPLAY[SR_Q_COUNT_] = {
    [SR_Q_NONE] = {"number", "", "", "(none)"},
    [SR_Q_MASS] = {"mass", "kg", "lb", "kg, g, lb, lbs, lbm, oz, slug"},
    [SR_Q_LENGTH] = {"length", "m", "ft", "m, cm, mm, km, ft, in"},
    [SR_Q_AREA] = {"area", "m2", "ft2", "m2, cm2, ft2, in2"},
    [SR_Q_SPEED] = {"speed", "m/s", "ft/s", "m/s, km/h, ft/s, fps, mph, kn"},
    [SR_Q_TEMP] = {"temperature", "K", "F", "K, C, F, R"},
    [SR_Q_TEMP_DIFF] = {"temperature offset", "K", "F", "K, C, F"},
    [SR_Q_PRESSURE] = {"pressure", "Pa", "psf", "Pa, hPa, mbar, kPa, bar, atm, psi, psf, inHg"},
    [SR_Q_FORCE] = {"force", "N", "lbf", "N, kN, lbf, kgf"},
    [SR_Q_ENERGY] = {"energy", "J", "ft-lbf", "J, kJ, ft-lbf"},
    [SR_Q_ANGLE] = {"angle", "deg", "deg", "deg, rad"},
    [SR_Q_TIME] = {"time", "s", "s", "s, ms, min, h"},
    [SR_Q_DENSITY] = {"density", "kg/m3", "slug/ft3", "kg/m3, g/cm3, slug/ft3, lb/ft3"},
    [SR_Q_AREAL_MASS] = {"areal mass", "g/m2", "oz/yd2", "kg/m2, g/m2, oz/yd2"},
    [SR_Q_VISCOSITY] = {"dynamic viscosity", "Pa*s", "lbf*s/ft2", "Pa*s, lbf*s/ft2"},
    [SR_Q_KIN_VISCOSITY] = {"kinematic viscosity", "m2/s", "ft2/s", "m2/s, ft2/s"},
    [SR_Q_ACCEL] = {"acceleration", "m/s2", "ft/s2", "m/s2, ft/s2, g"},
    [SR_Q_SIZE] = {"length", "m", "in", "m, cm, mm, km, ft, in"},
    [SR_Q_BEARING] = {"angle", "deg", "deg", "deg, rad"},
    [SR_Q_VOLUME] = {"volume", "L", "in3", "m3, L, mL, cm3, in3, ft3"},
};

/* The quantity whose units a display-only quantity shares. */
static sr_quantity base_of(sr_quantity q)
{
    return q == SR_Q_SIZE ? SR_Q_LENGTH : q == SR_Q_BEARING ? SR_Q_ANGLE : q;
}

int sr_units_lookup(const char *unit, sr_quantity q, double *factor, double *offset)
{
    q = base_of(q);
    for (size_t i = 0; i < N_UNITS; i++) {
        if (UNITS[i].q == q && strcmp(UNITS[i].name, unit) == 0) {
            *factor = UNITS[i].factor;
            *offset = UNITS[i].offset;
            return SR_OK;
        }
    }
    return SR_EINVAL;
}

/* Hand-written scan: strtod alone would take "nan", "inf", hex floats and
 * locale-dependent commas, none of which belong in an engineering input. */
static size_t scan_decimal(const char *s)
{
    size_t i = 0, digits = 0;
    if (s[i] == '+' || s[i] == '-')
        i++;
    while (isdigit((unsigned char)s[i])) {
        i++;
        digits++;
    }
    if (s[i] == '.') {
        i++;
        while (isdigit((unsigned char)s[i])) {
            i++;
            digits++;
        }
    }
    if (digits == 0)
        return 0;
    if (s[i] == 'e' || s[i] == 'E') {
        size_t j = i + 1;
        if (s[j] == '+' || s[j] == '-')
            j++;
        if (isdigit((unsigned char)s[j])) {
            while (isdigit((unsigned char)s[j]))
                j++;
            i = j;
        }
    }
    return i;
}

static int parse(const char *text, sr_quantity q, double *si, int need_unit, sr_error *err)
{
    if (q <= SR_Q_NONE && q != SR_Q_NONE)
        return sr_error_set(err, SR_EINVAL, "internal: bad quantity");
    if (q >= SR_Q_COUNT_)
        return sr_error_set(err, SR_EINVAL, "internal: bad quantity");
    const char *what = DISPLAY[q].name;
    if (!text)
        return sr_error_set(err, SR_EINVAL, "missing %s", what);
    const char *s = text;
    while (isspace((unsigned char)*s))
        s++;
    if (*s == '\0')
        return sr_error_set(err, SR_EINVAL, "empty %s", what);
    const char *h = s + (*s == '+' || *s == '-');
    if (h[0] == '0' && (h[1] == 'x' || h[1] == 'X'))
        return sr_error_set(err, SR_EINVAL, "'%s' is a hexadecimal number; write it in decimal", text);
    size_t n = scan_decimal(s);
    if (n == 0) {
        if (q == SR_Q_NONE)
            return sr_error_set(err, SR_EINVAL, "'%s' is not a number", text);
        return sr_error_set(err, SR_EINVAL, "'%s' is not a number (%s %s is written like \"%s %s\")", text,
                            strchr("aeiou", what[0]) ? "an" : "a", what, q == SR_Q_TEMP || q == SR_Q_TEMP_DIFF ? "15" : "1.5",
                            q == SR_Q_TEMP || q == SR_Q_TEMP_DIFF ? "C" : DISPLAY[q].si);
    }
    char numbuf[64];
    if (n >= sizeof numbuf)
        return sr_error_set(err, SR_EINVAL, "'%.40s...' is too long for a number", text);
    memcpy(numbuf, s, n);
    numbuf[n] = '\0';
    errno = 0;
    char *end;
    double v = strtod(numbuf, &end);
    /* strtod follows LC_NUMERIC: under a decimal-comma locale it would stop
     * at the '.' and return a wrong number silently */
    if (end != numbuf + n)
        return sr_error_set(err, SR_EINVAL, "'%s': cannot read the number (is LC_NUMERIC set to a non-C locale?)",
                            text);
    if (errno == ERANGE || !isfinite(v))
        return sr_error_set(err, SR_EINVAL, "'%s' is out of the range of a number", text);
    const char *u = s + n;
    while (isspace((unsigned char)*u))
        u++;
    char unit[32];
    size_t ul = strlen(u);
    while (ul > 0 && isspace((unsigned char)u[ul - 1]))
        ul--;
    if (ul >= sizeof unit)
        return sr_error_set(err, SR_EINVAL, "unknown %s unit in '%s' (accepted: %s)", what, text,
                            DISPLAY[q].accepted);
    memcpy(unit, u, ul);
    unit[ul] = '\0';

    if (unit[0] == '\0') {
        if (q == SR_Q_NONE) {
            *si = v;
            return SR_OK;
        }
        if (need_unit)
            return sr_error_set_key(err, SR_EINVAL, "unit", "'%s' needs a unit (%s %s in %s)", text,
                                strchr("aeiou", what[0]) ? "an" : "a", what, DISPLAY[q].accepted);
        if (q == SR_Q_TEMP && v < 0.0)
            return sr_error_set(err, SR_EINVAL, "'%s' is below absolute zero (a bare temperature is in K)", text);
        /* a bare angle is degrees: see units.h */
        *si = base_of(q) == SR_Q_ANGLE ? v * (PI / 180.0) : v;
        return SR_OK;
    }
    /* "2,5 kg": a decimal comma reads as a unit ",5 kg"; say what went wrong */
    if (unit[0] == ',' && isdigit((unsigned char)unit[1]))
        return sr_error_set(err, SR_EINVAL, "'%s': write decimals with a point (%.*s.%c...), not a comma", text,
                            (int)n, s, unit[1]);
    if (q == SR_Q_NONE)
        return sr_error_set(err, SR_EINVAL, "'%s' takes no unit", text);
    double f, off;
    if (sr_units_lookup(unit, q, &f, &off) != SR_OK)
        return sr_error_set(err, SR_EINVAL, "unknown %s unit '%s' in '%s' (accepted: %s)", what, unit,
                            text, DISPLAY[q].accepted);
    double r = (v + off) * f;
    if (!isfinite(r))
        return sr_error_set(err, SR_EINVAL, "'%s' is out of the range of a number", text);
    if (q == SR_Q_TEMP && r < 0.0)
        return sr_error_set(err, SR_EINVAL, "'%s' is below absolute zero", text);
    *si = r;
    return SR_OK;
}

int sr_units_parse(const char *text, sr_quantity q, double *si, sr_error *err)
{
    return parse(text, q, si, 0, err);
}

int sr_units_parse_strict(const char *text, sr_quantity q, double *si, sr_error *err)
{
    return parse(text, q, si, 1, err);
}

const char *sr_units_label(sr_quantity q, sr_unit_system sys)
{
    if (q < 0 || q >= SR_Q_COUNT_)
        return "";
    return sys == SR_UNITS_US ? DISPLAY[q].us : DISPLAY[q].si;
}

double sr_units_from_si(double si, sr_quantity q, sr_unit_system sys)
{
    if (q <= SR_Q_NONE || q >= SR_Q_COUNT_)
        return si;
    double f, off;
    if (sr_units_lookup(sr_units_label(q, sys), q, &f, &off) != SR_OK)
        return si;
    return si / f - off;
}

const char *sr_units_label_at(sr_quantity q, sr_unit_system sys, double mag)
{
    if (sys == SR_UNITS_US && isfinite(mag)) {
        if (q == SR_Q_SIZE)
            return fabs(mag) >= 10.0 * SR_FT ? "ft" : "in";
        if (q == SR_Q_MASS)
            return fabs(mag) < SR_LB ? "oz" : "lb";
    }
    return sr_units_label(q, sys);
}

double sr_units_from_si_at(double si, sr_quantity q, sr_unit_system sys, double mag)
{
    if (q <= SR_Q_NONE || q >= SR_Q_COUNT_)
        return si;
    double f, off;
    if (sr_units_lookup(sr_units_label_at(q, sys, mag), q, &f, &off) != SR_OK)
        return si;
    return si / f - off;
}

double sr_units_bearing_deg(double rad, int decimals)
{
    double d = fmod(rad * (180.0 / PI), 360.0);
    if (d < 0.0)
        d += 360.0;
    double scale = pow(10.0, decimals < 0 ? 0 : decimals > 12 ? 12 : decimals);
    /* 359.96 at one decimal would print 360.0: that is north, 0.0 */
    if (round(d * scale) / scale >= 360.0)
        d = 0.0;
    return d;
}

const char *sr_units_quantity_name(sr_quantity q)
{
    return (q >= 0 && q < SR_Q_COUNT_) ? DISPLAY[q].name : "?";
}

const char *sr_units_accepted(sr_quantity q)
{
    return (q >= 0 && q < SR_Q_COUNT_) ? DISPLAY[q].accepted : "";
}
