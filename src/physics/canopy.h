/* canopy.h - canopy families (handbook data with sources) and specific
 * canopies: reference areas, diameter conversions, drag area, clusters.
 * Every drag coefficient here carries its reference area. */
#ifndef SR_CANOPY_H
#define SR_CANOPY_H

#include <stddef.h>

#include "base/error.h"
#include "sinkrate/physics.h"

/* sr_ref (the reference area a drag coefficient is based on), sr_band,
 * sr_size_kind, sr_family_value and the functions of a program's handles
 * are public: include/sinkrate/physics.h. */

int sr_ref_parse(const char *s, sr_ref *ref);   /* SR_OK or SR_EINVAL */

/* A drag coefficient band with its reference area. */
typedef struct sr_cd {
    sr_band v;
    sr_ref ref;
} sr_cd;

#define SR_SOURCE_MAX 320
#define SR_CANOPY_CLASS_SOLID "solid"
#define SR_CANOPY_CLASS_SLOTTED "slotted"

/* sr_family_value (public) lists the values of a family that carry a check
 * status, in the order `sinkrate canopies ID` shows them; the growth exponent
 * is optional (the class's band otherwise, physics/provenance.h). */

#define SR_CHECK_MAX 240
/* What a value has been checked against outside the project, and what would
 * check it (docs/validation.md, "Not yet checked", reads the same). */
typedef struct sr_value_check {
    char outside[SR_CHECK_MAX];  /* "none", or "<class>: <the check>" of an outside class */
    char to_check[SR_CHECK_MAX]; /* the publication and table that would check it ("" when not named) */
} sr_value_check;

/* The YAML key and the label of a family value. */
const char *sr_family_value_key(sr_family_value v);
const char *sr_family_value_label(sr_family_value v);

/* One family from canopies/<id>.yaml. Angles in radians. */
typedef struct sr_family {
    char id[48];
    char name[96];
    char cls[16];                   /* "solid" or "slotted" (drag-area growth during filling) */
    sr_cd cd0;                      /* on nominal area */
    char cd0_source[SR_SOURCE_MAX];
    sr_band dp_d0;                  /* projected / nominal diameter */
    char dp_source[SR_SOURCE_MAX];
    sr_band dc_d0;                  /* constructed / nominal diameter */
    char dc_source[SR_SOURCE_MAX];
    sr_band cx;                     /* opening-load factor, infinite mass */
    char cx_source[SR_SOURCE_MAX];
    double fill_n;                  /* filling constant, t_f = n D0 / v */
    char fill_source[SR_SOURCE_MAX];
    sr_band growth;                 /* exponent n of the drag-area growth (t/t_f)^n while filling: the
                                     * class's band unless the file sets `growth-exponent:` */
    char growth_source[SR_SOURCE_MAX];
    int growth_given;               /* the file set growth-exponent: (else the class's band) */
    sr_band oscillation;            /* rad, typical range in steady descent */
    char osc_source[SR_SOURCE_MAX];
    double mach_max;                /* upper Mach number of the family's usual application */
    char mach_source[SR_SOURCE_MAX];
    double areal_mass;              /* kg/m2 of nominal area, NaN when not given */
    char areal_source[SR_SOURCE_MAX];
    sr_value_check check[SR_FV_COUNT_]; /* outside-check / to-check of each value */
    char notes[512];
    char file[256];                 /* where it was loaded from */
} sr_family;

const char *sr_size_kind_name(sr_size_kind k); /* "nominal diameter", ... */

/* Cluster drag factor: drag per canopy in a cluster of n over a single
 * canopy's. From memory (Knacke 1991 discusses cluster drag loss; the figure
 * was not read): 1 canopy 1.00, 2: 0.97, 3: 0.93, 4 or more: 0.90. */
double sr_canopy_cluster_factor(int n);

/* A measured opening of a specific canopy (`measured-opening:` in a canopy
 * file or a mission stage): it replaces the three opening-load estimates. */
typedef enum sr_measured_opening {
    SR_OPENING_ESTIMATED = 0, /* none: the three estimates on the growth model */
    SR_OPENING_MEASURED_FACTOR, /* peak force over CD0 S0 q1 at line stretch (CX X1 as measured) */
    SR_OPENING_MEASURED_LOAD    /* the peak force itself, N, for the deployment of the mission */
} sr_measured_opening;

/* A specific canopy (or a cluster of identical ones). */
typedef struct sr_canopy {
    sr_family fam;
    sr_size_kind size_kind;
    double size_value;      /* as given, SI (m or m2) */
    sr_band s0;             /* nominal area of one canopy, m2 (a band when converted through a ratio) */
    sr_band d0;             /* nominal diameter, m */
    sr_cd cd;               /* drag coefficient used, with its reference */
    sr_band cds;            /* drag area of ONE canopy, m2 (reference-free), low / typical / high */
    int measured;           /* cd from a measurement rather than the family range */
    char cd_source[SR_SOURCE_MAX];
    int count;              /* canopies in the cluster */
    double cluster_factor;
    double areal_mass;      /* kg/m2 of nominal area, NaN if unknown */
    sr_measured_opening opening;  /* a measured opening load or factor replaces the estimates */
    double opening_value;         /* the factor, or the load in N */
    char opening_source[SR_SOURCE_MAX];
} sr_canopy;

/* Sizes a canopy can have, m: 200 m is larger than any canopy flown and 1 cm
 * smaller than any that flies; outside them a size is an input error (a unit
 * slip, cm read as m) and a size found by sizing means no canopy fits. */
#define SR_CANOPY_SIZE_MAX 200.0
#define SR_CANOPY_SIZE_MIN 0.01

/* Build a canopy of family fam from a size. The drag band comes from the
 * family's CD0 range; a diameter given on another reference is converted
 * through the family's Dp/D0 or Dc/D0 range, which widens the band. */
int sr_canopy_from_size(sr_canopy *c, const sr_family *fam, sr_size_kind kind, double value, sr_error *err);

/* sr_canopy_set_measured_cd (public) replaces the family drag range by a
 * measured coefficient on a stated reference (e.g. 1.45 on projected area).
 * Where the reference matches how the size was given, the drag area is
 * exact; otherwise it is converted through the family ratios and stays a band. */
/* The same with a band low / value / high (a measured value with its
 * confidence interval, as `sinkrate fit --write-canopy` writes it). */
int sr_canopy_set_measured_band(sr_canopy *c, sr_band cd, sr_ref ref, const char *source, sr_error *err);

/* sr_canopy_set_cluster, sr_canopy_total_cds and sr_canopy_cd0_band are
 * public; the drag-coefficient band on nominal area is the family's, or a
 * measured coefficient converted through the family's diameter ratios. */

/* Conversions of one nominal area through the family ratios. */
double sr_canopy_d0_from_s0(double s0);
double sr_canopy_s0_from_d0(double d0);

/* Equivalent drag coefficient of the canopy on another reference area,
 * using the typical ratios: CD_ref = CD0 (D0/D_ref)^2. */
double sr_canopy_cd_on(const sr_family *fam, double cd0, sr_ref ref);

#endif
