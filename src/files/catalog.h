/* catalog.h - the canopy catalog (canopies/<family>.yaml) and user canopy
 * files, read strictly with libyaml through yamldoc. */
#ifndef SR_CATALOG_H
#define SR_CATALOG_H

#include <stddef.h>

#include "physics/canopy.h"
#include "base/error.h"
#include "files/yamldoc.h"
#include "sinkrate/files.h"

#define SR_CATALOG_MAX 64

/* Where a family of the catalog came from. */
typedef struct sr_catalog_origin {
    char from[512];       /* "built-in", or how the user gave its directory ("--data DIR") */
    char replaces[256];   /* the file of the family with the same id it replaces, or "" */
    int layer;            /* which directory: 0 the first loaded (the built-in catalog) */
} sr_catalog_origin;

typedef struct sr_catalog {
    sr_family fam[SR_CATALOG_MAX];
    sr_catalog_origin origin[SR_CATALOG_MAX];
    size_t n;
    int layers;      /* directories loaded */
    char dir[512];   /* the canopies/ directory of the built-in catalog */
} sr_catalog;

/* Load every *.yaml in dir (sorted by file name) as the built-in catalog.
 * Any bad file fails the whole load with its file:line:column. */
int sr_catalog_open(sr_catalog *c, const char *dir, sr_error *err);

/* sr_catalog_add (public): origin[i].replaces names the file a family
 * replaces; two files of one directory with one id are an error, and so is a
 * bad file. A directory already loaded is not loaded twice.
 * sr_catalog_find (public): an unknown id fails with the closest id suggested. */

/* One family file. */
int sr_catalog_load_family(sr_family *f, const char *path, sr_error *err);
int sr_catalog_parse_family(sr_family *f, sr_yaml *y, sr_error *err);

/* A user canopy file: top-level key `canopy:`. Relative paths inside are not
 * used. */
int sr_catalog_load_canopy(sr_canopy *c, const sr_catalog *cat, const char *path, sr_error *err);
/* The same from a document already loaded (messages name y->name). */
int sr_catalog_parse_canopy(sr_canopy *c, const sr_catalog *cat, sr_yaml *y, sr_error *err);

/* Canopy keys shared by canopy files and mission stages. The mapping n may
 * hold other keys (checked by the caller); reads family, one size key
 * (nominal-diameter, projected-diameter, flat-diameter, nominal-area),
 * drag-coefficient, count, cluster-factor, areal-mass. When no size key is
 * present and size_optional is set, *has_size is 0 and the canopy holds a
 * nominal area of 1 m2 as a placeholder for sizing. */
extern const char *const sr_canopy_keys[];
int sr_catalog_canopy_from_node(sr_canopy *c, const sr_catalog *cat, const sr_yaml *y, yaml_node_t *n,
                                int size_optional, int *has_size, sr_error *err);

#endif
