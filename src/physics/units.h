/* units.h - quantities with units at the edges: parse "2.5 kg", "36in",
 * "18 ft/s", "31 C" into SI, and express SI values in SI or US customary. */
#ifndef SR_UNITS_H
#define SR_UNITS_H

#include "base/error.h"
#include "sinkrate/physics.h"

/* sr_quantity, sr_unit_system and the parsing and display functions a
 * program needs are public: include/sinkrate/physics.h. */

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
