/* plausible.h - the one judgement of inputs that are valid but probably a
 * unit slip (a 36 m canopy meant as 36 in, a payload in g read as kg), and
 * of the Mach number a drag model is used at. Every command that takes
 * these inputs asks here, so no two commands can disagree. */
#ifndef SR_PLAUSIBLE_H
#define SR_PLAUSIBLE_H

#include <stddef.h>

#include "physics/units.h"

typedef enum sr_plaus_kind {
    SR_PLAUS_MASS = 0,      /* a payload or section mass, kg */
    SR_PLAUS_CANOPY_D0,     /* a canopy's nominal diameter D0, m */
    SR_PLAUS_DESCENT_SPEED, /* a steady descent rate or a target touchdown speed, m/s */
    SR_PLAUS_BODY_SIZE,     /* a falling body's diameter or length, m */
    SR_PLAUS_AREAL_MASS,    /* canopy mass per nominal area, kg/m2 */
    SR_PLAUS_NKINDS
} sr_plaus_kind;

/* One rule: values below lo or above hi (NaN: no bound) are flagged. The
 * thresholds are ours and documented in docs/method.md ("Plausibility"). */
typedef struct sr_plaus_rule {
    sr_plaus_kind kind;
    sr_quantity q;
    double lo, hi;          /* SI */
    const char *why_lo;     /* what a value below lo would be ("lighter than ...") */
    const char *why_hi;
    const char *hint;       /* what to do about it */
} sr_plaus_rule;

const sr_plaus_rule *sr_plausible_rule(sr_plaus_kind kind);

/* Judge one value: 0 when plausible; 1 when probably a unit slip, with a
 * one-line warning in buf that names `what` ("--mass", "section 'a' mass")
 * and shows the value in the unit system sys. */
int sr_plausible_check(sr_plaus_kind kind, double si, const char *what, sr_unit_system sys, char *buf, size_t len);

/* Below this Mach number the air is taken as incompressible, as every drag
 * balance here does (common practice: density changes under 5 % below 0.3). */
#define SR_MACH_INCOMPRESSIBLE 0.3

enum {
    SR_MACH_OVER_INCOMPRESSIBLE = 1, /* above SR_MACH_INCOMPRESSIBLE */
    SR_MACH_OVER_ENVELOPE = 2        /* above the family's application limit (its mach-limit) */
};

/* The Mach judgement every command shares: a bit set of the above.
 * envelope <= 0 or NaN: the family gives none. */
unsigned sr_mach_judge(double mach, double envelope);

/* One-line warning for a judgement (bits != 0): "what reaches Mach 2.95, above
 * the conical family's usual application (Mach 0.5) and above 0.3 where ...".
 * family may be NULL when no envelope applies. */
void sr_mach_describe(unsigned bits, double mach, double envelope, const char *family, const char *what, char *buf,
                      size_t len);

#endif
