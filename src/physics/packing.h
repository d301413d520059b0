/* packing.h - what a canopy weighs and how much room it takes packed: its
 * mass from the cloth's areal mass times its nominal area, times a factor for
 * the suspension lines, and its packed volume from that mass over a packing
 * density (hand, machine or pressure pack). Every value is a band low /
 * typical / high; all of them are recalled, not read (provenance.c says so,
 * and docs/method.md section 16 names the sources). */
#ifndef SR_PACKING_H
#define SR_PACKING_H

#include "base/error.h"
#include "physics/canopy.h"

typedef enum sr_pack_kind {
    SR_PACK_HAND = 0,   /* packed by hand into a bag or the bay */
    SR_PACK_MACHINE,    /* compressed with a packing press */
    SR_PACK_PRESSURE,   /* pressure packed (the source groups it with machine packing) */
    SR_PACK_NKINDS
} sr_pack_kind;

/* "hand", "machine", "pressure". */
const char *sr_pack_name(sr_pack_kind k);
/* SR_OK or SR_EINVAL. */
int sr_pack_parse(const char *s, sr_pack_kind *k);

/* Packing density of a pack, kg/m3 (lo < typ < hi; typical: the middle of the
 * recalled range, our choice). From memory: Knacke 1991, ch. 6. */
sr_band sr_pack_density(sr_pack_kind k);

/* Areal mass of light ripstop canopy cloth, kg/m2 of nominal area, uncoated
 * to coated (from memory, common practice): used when neither the canopy nor
 * its family gives one. */
sr_band sr_pack_cloth(void);

/* Mass of a canopy with its suspension lines over the mass of its cloth
 * (from memory, low confidence; small canopies). */
sr_band sr_pack_line_factor(void);

/* The mass and packed volume of a canopy or a cluster. */
typedef struct sr_pack {
    sr_band areal;        /* cloth areal mass used, kg/m2 */
    int areal_given;      /* 1: the canopy's (or its family's) own value; 0: the recalled cloth */
    sr_band mass;         /* canopies with their lines, kg: low, typical, high */
    sr_band density;      /* packing density, kg/m3 */
    sr_band volume;       /* packed volume, m3: low (light, dense), typical, high (heavy, loose) */
} sr_pack;

/* Mass and volume of count canopies of nominal area s0 each (m2), cloth of
 * areal mass `areal` (kg/m2; NaN or <= 0: the recalled cloth band), packed as
 * `kind`. The high volume is the conservative one (a bay must hold it). */
void sr_pack_canopy(double s0, int count, double areal, sr_pack_kind kind, sr_pack *out);

/* The largest nominal area of one canopy whose conservative (high) packed
 * volume fits `volume` m3: the inverse of sr_pack_canopy's high end. */
double sr_pack_max_area(double volume, int count, double areal, sr_pack_kind kind);

#endif
