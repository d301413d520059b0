/* plausible.c - thresholds of inputs that are valid but probably a unit slip,
 * and the Mach judgement shared by every command. The thresholds are ours:
 * far enough out that no real recovery system reaches them (docs/method.md). */
#include "physics/plausible.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

static const sr_plaus_rule RULES[SR_PLAUS_NKINDS] = {
    /* a few grams: lighter than any payload that needs a canopy; 10 t: the largest cargo drops
     * carry a few tonnes per canopy (from memory) */
    {SR_PLAUS_MASS, SR_Q_MASS, 0.005, 1.0e4, "lighter than any payload a canopy is sized for",
     "heavier than the payloads this tool is meant for", "is the unit right?"},
    /* the largest canopies flown are about 40-50 m across (from memory); pilot chutes about 0.1-0.2 m */
    {SR_PLAUS_CANOPY_D0, SR_Q_SIZE, 0.1, 50.0, "smaller than any recovery canopy",
     "wider than the largest canopies built (about 40-50 m)", "is the unit right?"},
    /* recovery canopies land at about 3-8 m/s (common practice); under 1 m/s the canopy is
     * far too large for the mass, which is what a unit slip in either produces */
    {SR_PLAUS_DESCENT_SPEED, SR_Q_SPEED, 1.0, NAN, "slower than recovery canopies descend (about 3-8 m/s)", NULL,
     "check the units of mass and canopy size"},
    /* nothing falling freely that this tool is for is larger than a big canopy */
    {SR_PLAUS_BODY_SIZE, SR_Q_LENGTH, NAN, 50.0, NULL, "larger than any body this tool is meant for",
     "is the unit right?"},
    /* the lightest canopy cloths weigh about 30 g/m2 (from memory) */
    {SR_PLAUS_AREAL_MASS, SR_Q_AREAL_MASS, 0.01, NAN, "lighter than any canopy cloth (about 30 g/m2 and up)",
     NULL, "is the unit right?"},
};

const sr_plaus_rule *sr_plausible_rule(sr_plaus_kind kind)
{
    return kind < SR_PLAUS_NKINDS ? &RULES[kind] : NULL;
}

/* A value in the unit system with its unit, three significant digits. */
static void fmt(char *buf, size_t len, double si, sr_quantity q, sr_unit_system sys)
{
    double v = sr_units_from_si_at(si, q, sys, fabs(si));
    snprintf(buf, len, fabs(v) >= 1000.0 ? "%.0f %s" : "%.3g %s", v, sr_units_label_at(q, sys, fabs(si)));
}

int sr_plausible_check(sr_plaus_kind kind, double si, const char *what, sr_unit_system sys, char *buf, size_t len)
{
    const sr_plaus_rule *r = sr_plausible_rule(kind);
    if (!r || !isfinite(si))
        return 0;
    int low = !isnan(r->lo) && si < r->lo, high = !isnan(r->hi) && si > r->hi;
    if (!low && !high)
        return 0;
    if (buf && len) {
        char v[48], lim[48];
        fmt(v, sizeof v, si, r->q, sys);
        fmt(lim, sizeof lim, low ? r->lo : r->hi, r->q, sys);
        snprintf(buf, len, "%s: %s is %s %s, %s; %s", what, v, low ? "under" : "over", lim,
                 low ? r->why_lo : r->why_hi, r->hint);
    }
    return 1;
}

unsigned sr_mach_judge(double mach, double envelope)
{
    unsigned bits = 0;
    if (!(mach >= 0.0))
        return 0;
    if (mach > SR_MACH_INCOMPRESSIBLE)
        bits |= SR_MACH_OVER_INCOMPRESSIBLE;
    if (envelope > 0.0 && mach > envelope)
        bits |= SR_MACH_OVER_ENVELOPE;
    return bits;
}

void sr_mach_describe(unsigned bits, double mach, double envelope, const char *family, const char *what, char *buf,
                      size_t len)
{
    if (!buf || !len)
        return;
    int env = (bits & SR_MACH_OVER_ENVELOPE) != 0;
    char e[160] = "";
    if (env)
        snprintf(e, sizeof e, "above the %s family's usual application (Mach %.2g)", family ? family : "canopy",
                 envelope);
    const char *inc = "above Mach 0.3, where the air's compressibility (not in the incompressible drag balance "
                      "used here) starts to matter";
    if (env)
        snprintf(buf, len, "%s reaches Mach %.2f, %s%s%s: the drag data do not cover it", what, mach, e,
                 bits & SR_MACH_OVER_INCOMPRESSIBLE ? " and " : "", bits & SR_MACH_OVER_INCOMPRESSIBLE ? inc : "");
    else
        snprintf(buf, len, "%s reaches Mach %.2f, %s: the result is less accurate there", what, mach, inc);
}
