/* packing.c - canopy mass and packed volume (packing.h). Every figure here is
 * recalled, not read: provenance.c lists them with what would check them. */
#include "physics/packing.h"

#include <math.h>
#include <string.h>

#include "physics/units.h"

#define LB_FT3 (SR_LB / (SR_FT * SR_FT * SR_FT)) /* kg/m3 per lb/ft3 (NIST SP 811) */
#define OZ_YD2 ((SR_LB / 16.0) / (9.0 * SR_FT * SR_FT)) /* kg/m2 per oz/yd2 */

static const char *const NAMES[SR_PACK_NKINDS] = {"hand", "machine", "pressure"};

const char *sr_pack_name(sr_pack_kind k)
{
    return k >= 0 && k < SR_PACK_NKINDS ? NAMES[k] : "?";
}

int sr_pack_parse(const char *s, sr_pack_kind *k)
{
    for (int i = 0; i < SR_PACK_NKINDS; i++)
        if (strcmp(s, NAMES[i]) == 0) {
            *k = (sr_pack_kind)i;
            return SR_OK;
        }
    return SR_EINVAL;
}

sr_band sr_pack_density(sr_pack_kind k)
{
    /* Knacke 1991, NWC TP 6575, ch. 6 (from memory): a hand pack about
     * 20-30 lb/ft3, a machine or pressure pack about 35-45 lb/ft3 (the
     * recollection does not tell the two apart); the typical value is the
     * middle of each range (our choice) */
    if (k == SR_PACK_HAND)
        return (sr_band){20.0 * LB_FT3, 25.0 * LB_FT3, 30.0 * LB_FT3};
    return (sr_band){35.0 * LB_FT3, 40.0 * LB_FT3, 45.0 * LB_FT3};
}

sr_band sr_pack_cloth(void)
{
    /* light ripstop nylon, 1.1 oz/yd2 uncoated (about 37 g/m2) up to about
     * 50 g/m2 coated: common practice, from memory; typical: the middle */
    return (sr_band){1.1 * OZ_YD2, 0.5 * (1.1 * OZ_YD2 + 0.050), 0.050};
}

sr_band sr_pack_line_factor(void)
{
    /* a small canopy with its suspension lines weighs about 1.3-1.6 x its
     * cloth (from memory, low confidence); typical: the middle */
    return (sr_band){1.3, 1.45, 1.6};
}

void sr_pack_canopy(double s0, int count, double areal, sr_pack_kind kind, sr_pack *out)
{
    memset(out, 0, sizeof *out);
    out->areal_given = areal > 0.0 && isfinite(areal);
    out->areal = out->areal_given ? (sr_band){areal, areal, areal} : sr_pack_cloth();
    sr_band k = sr_pack_line_factor();
    double n = count > 0 ? (double)count : 1.0;
    out->mass.lo = n * s0 * out->areal.lo * k.lo;
    out->mass.typ = n * s0 * out->areal.typ * k.typ;
    out->mass.hi = n * s0 * out->areal.hi * k.hi;
    out->density = sr_pack_density(kind);
    out->volume.lo = out->mass.lo / out->density.hi;
    out->volume.typ = out->mass.typ / out->density.typ;
    out->volume.hi = out->mass.hi / out->density.lo;
}

double sr_pack_max_area(double volume, int count, double areal, sr_pack_kind kind)
{
    sr_pack one;
    sr_pack_canopy(1.0, count, areal, kind, &one);
    return one.volume.hi > 0.0 ? volume / one.volume.hi : INFINITY;
}
