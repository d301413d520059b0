/* mission_design.h - the `design:` block of a mission file: what the design
 * search (`sinkrate design`) may vary per stage -- candidate families, a size
 * range or a list of sizes you can obtain, cluster counts, the deployment
 * height of a height-triggered stage, whether the stage may be dropped -- and
 * the bay each stage must pack into. The same checks serve the command's
 * options, so a range means the same in a file and on the command line. */
#ifndef SR_MISSION_DESIGN_H
#define SR_MISSION_DESIGN_H

#include <stddef.h>

#include "base/error.h"
#include "files/catalog.h"
#include "files/yamldoc.h"
#include "physics/descent_spec.h"
#include "physics/packing.h"

#define SR_DESIGN_MAX_FAMILIES SR_CATALOG_MAX
#define SR_DESIGN_MAX_SIZES 64
#define SR_DESIGN_MAX_COUNTS 4
#define SR_DESIGN_MAX_POINTS 200
#define SR_DESIGN_MAX_STAGES 6          /* = SR_MISSION_MAX_STAGES */
/* a size range spans at most this ratio of diameters (the search flies every
 * size as a scale of one reference canopy: docs/method.md section 16) */
#define SR_DESIGN_MAX_SPAN 50.0

typedef enum sr_design_objective {
    SR_DESIGN_MASS = 0, /* lightest recovery system (canopies with lines), the default */
    SR_DESIGN_VOLUME,   /* smallest packed volume */
    SR_DESIGN_DRIFT     /* smallest drift at the band end */
} sr_design_objective;

const char *sr_design_objective_name(sr_design_objective o);
int sr_design_objective_parse(const char *s, sr_design_objective *o);

typedef enum sr_design_sizes {
    SR_DSIZE_FIXED = 0, /* the stage's size in the mission */
    SR_DSIZE_RANGE,     /* continuous between min and max nominal diameter */
    SR_DSIZE_LIST       /* the sizes in the list (obtainable ones) */
} sr_design_sizes;

typedef struct sr_design_stage {
    size_t nfamilies;                           /* 0: the stage's own family */
    char family[SR_DESIGN_MAX_FAMILIES][48];
    sr_design_sizes sizes;
    double dmin, dmax;                          /* SR_DSIZE_RANGE: nominal diameters, m */
    size_t nsizes;                              /* SR_DSIZE_LIST: ascending nominal diameters, m */
    double size[SR_DESIGN_MAX_SIZES];
    size_t ncounts;                             /* 0: the stage's own count */
    int count[SR_DESIGN_MAX_COUNTS];
    int height;                                 /* the deployment height varies */
    double hmin, hmax;                          /* m above ground */
    size_t hpoints;                             /* grid points over it (0: the design's `heights`) */
    int optional;                               /* the stage may be dropped */
    double bay;                                 /* m3 the packed stage must fit; NaN: no bay given */
    int packing;                                /* an sr_pack_kind, or -1: the design's */
} sr_design_stage;

typedef struct sr_design_spec {
    int given;                                  /* the file has a design: block */
    sr_design_objective objective;
    sr_pack_kind packing;
    size_t grid;                                /* grid points over the size range of a stage that is not
                                                 * the last (default 9) */
    size_t heights;                             /* grid points over a deployment-height range (default 20) */
    sr_design_stage stage[SR_DESIGN_MAX_STAGES];                   /* indexed as the mission's stages */
} sr_design_spec;

/* What the design: block and the options are read against: the mission's
 * stages read before it (sr_mission_design_basis fills it), so this reader
 * needs nothing of sr_mission. */
typedef struct sr_design_basis_stage {
    const char *name;
    sr_deploy_kind deploy;
    int canopy_file;     /* the stage is a canopy file (a canopy you own) */
    int measured_load;   /* its opening load is measured (holds for its own size only) */
    int has_size;        /* the file gives its size */
} sr_design_basis_stage;

typedef struct sr_design_basis {
    size_t nstages;
    sr_design_basis_stage stage[SR_DESIGN_MAX_STAGES];
    int has_start;
    double start_height; /* m above ground */
} sr_design_basis;

#define SR_DESIGN_DEFAULT_GRID 9
#define SR_DESIGN_DEFAULT_HEIGHTS 20

/* The defaults: nothing varies, lightest, hand pack. */
void sr_design_spec_init(sr_design_spec *d);

/* Whether a stage varies in anything. */
int sr_design_stage_varies(const sr_design_stage *s);

/* The parts of a stage's search from text (the command's options; the file's
 * keys go through the same checks). what: the option, for messages.
 *   families: "cross,conical", "all", "class:slotted"
 *   sizes:    "0.3m..1.2m" (continuous), "12in..48in/6in" (every 6 in), "12in,18in,24in"
 *   heights:  "150m..450m" (points from the design), "150m..450m/25" (25 points)
 *   counts:   "1,2"
 * The stage context (its name, its canopy, whether it is height-triggered)
 * comes from the basis the caller passes (sr_mission_design_basis). */
int sr_design_set_families(sr_design_stage *s, const sr_design_basis *b, size_t k, const sr_catalog *cat,
                           const char *text, const char *what, sr_error *err);
int sr_design_set_sizes(sr_design_stage *s, const sr_design_basis *b, size_t k, const char *text,
                        const char *what, sr_error *err);
int sr_design_set_heights(sr_design_stage *s, const sr_design_basis *b, size_t k, const char *text,
                          const char *what, sr_error *err);
int sr_design_set_counts(sr_design_stage *s, const sr_design_basis *b, size_t k, const char *text,
                         const char *what, sr_error *err);

/* What a stage may vary given its kind (a canopy file keeps family, size and
 * count; a measured opening load holds only for its own size and
 * deployment). SR_OK or SR_EINVAL with one line naming the stage. */
int sr_design_check_stage(const sr_design_stage *s, const sr_design_basis *b, size_t k, sr_error *err);

/* The design: block into d (n may be NULL: no block). Called by
 * sr_mission_parse after the stages and start, with their basis. */
int sr_mission_parse_design(sr_design_spec *d, sr_yaml *y, yaml_node_t *n, const sr_design_basis *b,
                            const sr_catalog *cat, sr_error *err);

#endif
