/* units.h - quantities with units at the edges: parse "2.5 kg", "36in",
 * "18 ft/s", "31 C" into SI, and express SI values in SI or US customary. */
#ifndef SR_UNITS_H
#define SR_UNITS_H

#include "base/error.h"

typedef enum sr_quantity {
    SR_Q_NONE = 0,     /* dimensionless: a bare number, no unit allowed */
    SR_Q_MASS,
    SR_Q_LENGTH,
    SR_Q_AREA,
    SR_Q_SPEED,
    SR_Q_TEMP,         /* absolute temperature */
    SR_Q_TEMP_DIFF,    /* a temperature offset (hot day +15 C) */
    SR_Q_PRESSURE,
    SR_Q_FORCE,
    SR_Q_ENERGY,
    SR_Q_ANGLE,        /* SI inside is the radian */
    SR_Q_TIME,
    SR_Q_DENSITY,
    SR_Q_AREAL_MASS,
    SR_Q_VISCOSITY,    /* dynamic */
    SR_Q_KIN_VISCOSITY,
    SR_Q_ACCEL,
    SR_Q_SIZE,         /* a canopy's diameter: a length shown in inches (feet from 10 ft on) under US */
    SR_Q_BEARING,      /* a direction clockwise from north: an angle shown from 0 up to, never at, 360 deg */
    SR_Q_VOLUME,       /* a packed canopy or a bay: shown in litres (SI) or cubic inches (US) */
    SR_Q_COUNT_
} sr_quantity;

typedef enum sr_unit_system { SR_UNITS_SI = 0, SR_UNITS_US = 1 } sr_unit_system;

/* Parse a number with an optional unit. A bare number is SI for the
 * quantity (radians excepted: a bare angle is degrees, since nobody writes
 * flight-path angles in radians; the help says so). NaN, inf, hex floats,
 * trailing junk and an absolute temperature below 0 K are errors; an unknown
 * unit is an error listing the accepted ones. */
int sr_units_parse(const char *text, sr_quantity q, double *si, sr_error *err);

/* As sr_units_parse, but a unit is required (YAML files insist on one). */
int sr_units_parse_strict(const char *text, sr_quantity q, double *si, sr_error *err);

/* Display unit of a quantity in a unit system, and the SI value in it. */
const char *sr_units_label(sr_quantity q, sr_unit_system sys);
double sr_units_from_si(double si, sr_quantity q, sr_unit_system sys);

/* US customary as hobby teams use it: the display unit of q for values up
 * to the magnitude mag (SI; the largest of a value, a band or a table
 * column; NaN: the plain unit). Under US a canopy size below 10 ft is in
 * inches, from 10 ft on in feet; a mass below 1 lb in ounces. Otherwise as
 * sr_units_label / sr_units_from_si. */
const char *sr_units_label_at(sr_quantity q, sr_unit_system sys, double mag);
double sr_units_from_si_at(double si, sr_quantity q, sr_unit_system sys, double mag);

/* A bearing (rad) in degrees within [0, 360) that, printed with `decimals`
 * decimals, never reads 360 (a due-north bearing prints 0). */
double sr_units_bearing_deg(double rad, int decimals);

/* Name of a quantity ("mass", "speed") and its accepted units,
 * comma-separated, for messages and help. */
const char *sr_units_quantity_name(sr_quantity q);
const char *sr_units_accepted(sr_quantity q);

/* Factor and offset of a unit: si = (value + offset) * factor.
 * Returns SR_EINVAL for a unit the quantity does not know. */
int sr_units_lookup(const char *unit, sr_quantity q, double *factor, double *offset);

/* Exact conversion factors (NIST SP 811, 2008 edition, Appendix B). */
#define SR_FT 0.3048
#define SR_IN 0.0254
#define SR_LB 0.45359237
#define SR_G0 9.80665
#define SR_LBF (SR_LB * SR_G0)
#define SR_FT_LBF (SR_FT * SR_LBF)

#endif
