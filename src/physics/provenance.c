/* provenance.c - the model table of provenance.h: source and outside-check
 * status of each model value that is not in the catalog files. */
#include "physics/provenance.h"

#include <stdio.h>
#include <string.h>

#include "physics/bluff.h"
#include "physics/canopy.h"
#include "physics/opening.h"
#include "physics/packing.h"

#define K91 "Knacke 1991, NWC TP 6575"

static const sr_provenance MODELS[] = {
    {"growth-exponent-solid", "drag-area growth exponent, solid cloth: typical and band",
     K91 ", the Pflanz curves (from memory); the band from drop-test fits spreading about 0.5 .. 3 "
         "(trade-facts.md section 6, from memory)", "none",
     K91 ", sec. 5 opening-force section, the Pflanz X1(A, n) curves for n = 1/2, 1, 2 (figure number not "
         "verified); Pflanz 1942"},
    {"growth-exponent-slotted", "drag-area growth exponent, slotted (ribbon, ringslot, ringsail): typical and band",
     K91 ", the Pflanz curves (from memory); the band from drop-test fits spreading about 0.5 .. 3 "
         "(trade-facts.md section 6, from memory)", "none",
     K91 ", sec. 5 opening-force section, the Pflanz X1(A, n) curves (figure number not verified)"},
    {"growth-exponent-reefed", "drag-area growth exponent, a reefed stage",
     K91 ", the Pflanz curves (from memory)", "none",
     K91 ", sec. 5 opening-force section, the Pflanz X1(A, n) curves (figure number not verified)"},
    {"cluster-factor", "drag per canopy in a cluster over a single canopy's",
     K91 " discusses cluster drag loss; the values are from memory", "none",
     K91 ", the cluster drag-loss figure of Ch. 5 (not read); Ewing, Bixby & Knacke 1978, AFFDL-TR-78-151, "
         "cluster section"},
    {"x1-envelope", "force-reduction factor X1(R_m) of the opening-load-factor method",
     "our derivation: the upper envelope of the Pflanz closed form for n = 1 and 2 (docs/method.md 8.1); "
     "the handbook's curve and its abscissa R_m are from memory",
     "none", K91 ", sec. 5 opening-force section, the X1 versus mass-ratio figure (figure number not verified)"},
    {"pflanz-closed-form", "Pflanz peak force X1(A, n) in closed form",
     "our derivation of the growth model (docs/method.md 8.2); the ballistic parameter A from memory", "none",
     K91 ", the Pflanz X1(A, n) curves; Pflanz 1942 (the original report)"},
    {"cx-method", "opening force F = CD0 S0 q1 CX X1, X1 = 1 at infinite mass",
     K91 ", sec. 5 opening-force section (from memory)", "none",
     K91 ", sec. 5 opening-force section and its worked examples"},
    {"filling-time-law", "filling time t_f = n D0 / max(v1, v_s)",
     K91 ", Ch. 5 (from memory); the floor at the steady rate v_s is our choice (docs/method.md 8)", "none",
     K91 ", Ch. 5 filling-time section and the filling-constant table (number not verified)"},
    {"tumbling-drag", "a section falling without canopy: broadside, tumbling (cross-flow average) and end-on",
     "our model (docs/method.md 7.5a): the cross-flow principle (Hoerner 1965, from memory) averaged over the "
     "sphere (our derivation); the cylinder data are published (Wieselsberger 1922, DNV-RP-C205); end-on Cd 0.82 "
     "(Hoerner 1965, from memory)",
     "none",
     "Hoerner 1965, Fluid-Dynamic Drag, the chapter on tumbling and autorotating bodies (section not verified); "
     "drop tests of tumbling cylinders"},
    {"disk-drag", "drag coefficient of a thin disk normal to the flow",
     "Roos & Willmarth 1971, AIAA J. 9:285: the lower envelope of the measured Cd (1.07 at Re 1e3, 1.16 from "
     "5e4), log-log between; Hoerner 1965, p. 3-17: 1.17 at high Re (from memory)",
     "published: Roos & Willmarth 1971 measured 1.07-1.11 at Re 1e3, 1.19-1.28 at 1.2e4-3.8e4, 1.16 and 1.17 at 5e4 "
     "and 6e4: the curve lies at or below each (tests/test_bluff.c); it errs to the faster fall",
     "Roos & Willmarth 1971, the full disk data between Re 1e3 and 1e4; disk data above Re 6e4"},
    {"pack-density-hand", "packing density of a canopy packed by hand (packed volume, `design`)",
     K91 ", ch. 6 packing section: about 20-30 lb/ft3 (from memory); typical the middle (our choice)", "none",
     K91 ", ch. 6, the pack-density figures (page not verified)"},
    {"pack-density-machine", "packing density of a machine or pressure pack (packed volume, `design`)",
     K91 ", ch. 6 packing section: about 35-45 lb/ft3 for machine and pressure packs alike (from memory); "
         "typical the middle (our choice)",
     "none", K91 ", ch. 6, the pack-density figures (page not verified)"},
    {"cloth-areal-mass", "areal mass of the canopy cloth when neither canopy nor family gives one",
     "light ripstop nylon, 1.1 oz/yd2 uncoated (about 37 g/m2) to about 50 g/m2 coated: common practice, from "
     "memory; slotted canopies of tapes weigh more",
     "none", "a parachute-cloth specification (the 1.1 oz/yd2 ripstop grade; number not verified); weighed canopies"},
    {"line-mass-factor", "mass of a canopy with its suspension lines over its cloth",
     "about 1.3-1.6 x the cloth for small canopies (from memory, low confidence)", "none",
     "weighed canopies of known size and cloth; " K91 ", ch. 6 weight estimates (page not verified)"},
};

#define NMODELS (sizeof MODELS / sizeof MODELS[0])

const sr_provenance *sr_provenance_models(size_t *n)
{
    *n = NMODELS;
    return MODELS;
}

const sr_provenance *sr_provenance_find(const char *id)
{
    for (size_t i = 0; i < NMODELS; i++)
        if (strcmp(MODELS[i].id, id) == 0)
            return &MODELS[i];
    return NULL;
}

const sr_provenance *sr_provenance_growth(const char *canopy_class)
{
    if (strcmp(canopy_class, SR_CANOPY_CLASS_SOLID) == 0)
        return sr_provenance_find("growth-exponent-solid");
    if (strcmp(canopy_class, SR_CANOPY_CLASS_SLOTTED) == 0)
        return sr_provenance_find("growth-exponent-slotted");
    return NULL;
}

void sr_provenance_value(const sr_provenance *p, char *buf, size_t len)
{
    const char *id = p->id;
    static const struct {
        const char *id;
        sr_opening_class c;
    } G[] = {{"growth-exponent-solid", SR_OPENING_SOLID},
             {"growth-exponent-slotted", SR_OPENING_SLOTTED},
             {"growth-exponent-reefed", SR_OPENING_REEFED}};
    for (size_t i = 0; i < sizeof G / sizeof G[0]; i++)
        if (strcmp(id, G[i].id) == 0) {
            double lo, typ, hi;
            sr_opening_class_band(G[i].c, &lo, &typ, &hi);
            snprintf(buf, len, "n = %g, band %g .. %g", typ, lo, hi);
            return;
        }
    if (0)
        ;
    else if (strcmp(id, "cluster-factor") == 0)
        snprintf(buf, len, "%.2f for 2, %.2f for 3, %.2f for 4 or more canopies", sr_canopy_cluster_factor(2),
                 sr_canopy_cluster_factor(3), sr_canopy_cluster_factor(4));
    else if (strcmp(id, "disk-drag") == 0) {
        sr_bluff_curve k;
        double cd = 0.0, lo = 0.0;
        if (sr_bluff_curve_init(&k, SR_CURVE_DISK, NULL) == SR_OK) {
            lo = sr_bluff_curve_cd(&k, 1e3, NULL);
            cd = sr_bluff_curve_cd(&k, 1e5, NULL);
            sr_bluff_curve_free(&k);
        }
        snprintf(buf, len, "Cd = %.3g at Re 1e3 to %.3g from Re 5e4 on the frontal area", lo, cd);
    } else if (strcmp(id, "x1-envelope") == 0)
        snprintf(buf, len, "max of the n = 1 and n = 2 curves at each R_m");
    else if (strcmp(id, "pflanz-closed-form") == 0)
        snprintf(buf, len, "X1 = k^(n/(n+1)) ((n+2)/(2(n+1)))^2 or (1 + 1/((n+1) A))^-2");
    else if (strcmp(id, "cx-method") == 0)
        snprintf(buf, len, "CX per family (catalog)");
    else if (strcmp(id, "filling-time-law") == 0)
        snprintf(buf, len, "n per family (catalog)");
    else if (strcmp(id, "pack-density-hand") == 0 || strcmp(id, "pack-density-machine") == 0) {
        sr_band d = sr_pack_density(strcmp(id, "pack-density-hand") == 0 ? SR_PACK_HAND : SR_PACK_MACHINE);
        snprintf(buf, len, "%.0f / %.0f / %.0f kg/m3", d.lo, d.typ, d.hi);
    } else if (strcmp(id, "cloth-areal-mass") == 0) {
        sr_band a = sr_pack_cloth();
        snprintf(buf, len, "%.1f / %.1f / %.1f g/m2", 1e3 * a.lo, 1e3 * a.typ, 1e3 * a.hi);
    } else if (strcmp(id, "line-mass-factor") == 0) {
        sr_band k = sr_pack_line_factor();
        snprintf(buf, len, "%.2f / %.2f / %.2f", k.lo, k.typ, k.hi);
    } else if (strcmp(id, "tumbling-drag") == 0)
        snprintf(buf, len, "broadside Cd(Re) d L; tumbling 3 pi/16 of it plus 1/4 of the ends' 0.82 pi d^2/4; judged "
                           "at the worse");
    else
        snprintf(buf, len, "-");
}
