/* provenance.h - the models behind the numbers that are not catalog values
 * (growth exponents, cluster factors, the X1 envelope, ...), each with where
 * its value comes from and whether anything outside the project has checked
 * it. The catalog files carry the same status for the family values;
 * `sinkrate canopies` and docs/validation.md both read it from here. */
#ifndef SR_PROVENANCE_H
#define SR_PROVENANCE_H

#include <stddef.h>

typedef struct sr_provenance {
    const char *id;        /* kebab-case key, e.g. "growth-exponent-solid" */
    const char *name;      /* what it is */
    const char *source;    /* where the value comes from ("from memory" when recalled) */
    const char *outside;   /* "none", or "<outside class>: <the check>" */
    const char *to_check;  /* the publication and table that would check it */
} sr_provenance;

/* The table, and its length in *n. */
const sr_provenance *sr_provenance_models(size_t *n);

/* One entry by id, or NULL. */
const sr_provenance *sr_provenance_find(const char *id);

/* The value the code uses, as text ("n = 2"), from the functions that use it. */
void sr_provenance_value(const sr_provenance *p, char *buf, size_t len);

/* The growth-exponent entry of a canopy class ("solid", "slotted"), or NULL. */
const sr_provenance *sr_provenance_growth(const char *canopy_class);

#endif
