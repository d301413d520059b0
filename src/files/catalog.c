/* catalog.c - strict readers for canopy family files and user canopy files.
 * Every value in a family file carries its source; missing sources are errors. */
#define _DEFAULT_SOURCE
#include "files/catalog.h"

#include "physics/opening.h"

#include <dirent.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#define PI 3.14159265358979323846

static const char *const FAMILY_KEYS[] = {"id", "name", "class", "drag-coefficient", "projected-ratio",
                                          "constructed-ratio", "opening-factor", "filling-constant",
                                          "oscillation", "mach-limit", "areal-mass", "growth-exponent", "notes",
                                          NULL};
static const char *const FAMILY_REQ[] = {"id", "name", "class", "drag-coefficient", "projected-ratio",
                                         "constructed-ratio", "opening-factor", "filling-constant",
                                         "oscillation", "mach-limit", NULL};
static const char *const BAND_KEYS[] = {"low", "typical", "high", "source", "outside-check", "to-check", NULL};
static const char *const BAND_REQ[] = {"low", "high", "source", NULL};
static const char *const CD_KEYS[] = {"reference", "low",           "typical",  "high",
                                      "source",    "outside-check", "to-check", NULL};
static const char *const CD_REQ[] = {"reference", "low", "high", "source", NULL};
static const char *const VALUE_KEYS[] = {"value", "source", "outside-check", "to-check", NULL};
static const char *const VALUE_REQ[] = {"value", "source", NULL};

/* The classes an outside check may name (tests/testutil.h, docs/validation.md). */
static const char *const OUTSIDE_CLASSES[] = {"published: ", "reference library: ", "independent method: ", NULL};

/* The optional check status of a value block: outside-check is `none` (the
 * default) or "<outside class>: <what it was checked against>"; to-check names
 * the publication and table that would check it. */
static int read_check(const sr_yaml *y, yaml_node_t *block, sr_value_check *c, sr_error *err)
{
    snprintf(c->outside, sizeof c->outside, "none");
    c->to_check[0] = '\0';
    yaml_node_t *n = sr_yaml_get(y, block, "outside-check");
    int rc;
    if (n) {
        if ((rc = sr_yaml_string(y, n, c->outside, sizeof c->outside, err)))
            return rc;
        int ok = strcmp(c->outside, "none") == 0;
        for (size_t i = 0; !ok && OUTSIDE_CLASSES[i]; i++) {
            size_t l = strlen(OUTSIDE_CLASSES[i]);
            ok = strncmp(c->outside, OUTSIDE_CLASSES[i], l) == 0 && strlen(c->outside) > l + 3;
        }
        if (!ok)
            return sr_yaml_fail(y, n, err,
                                "outside-check must be 'none' or name its check after 'published: ', "
                                "'reference library: ' or 'independent method: '");
        if (strstr(c->outside, "from memory"))
            return sr_yaml_fail(y, n, err, "outside-check: a value from memory is not an outside check");
    }
    n = sr_yaml_get(y, block, "to-check");
    if (n && (rc = sr_yaml_string(y, n, c->to_check, sizeof c->to_check, err)))
        return rc;
    return SR_OK;
}

/* A band of plain numbers (q == SR_Q_NONE) or quantities; typical defaults
 * to the midpoint. Checks lo <= typ <= hi and the physical range. */
static int read_band(const sr_yaml *y, yaml_node_t *map, const char *key, sr_quantity q, double min, double max,
                     sr_band *b, char *src, size_t srclen, sr_value_check *chk, sr_error *err)
{
    yaml_node_t *n = sr_yaml_get(y, map, key);
    int is_cd = strcmp(key, "drag-coefficient") == 0;
    int rc = sr_yaml_check_map(y, n, key, is_cd ? CD_KEYS : BAND_KEYS, is_cd ? CD_REQ : BAND_REQ, err);
    if (rc)
        return rc;
    const char *names[3] = {"low", "typical", "high"};
    double v[3];
    for (int i = 0; i < 3; i++) {
        yaml_node_t *vn = sr_yaml_get(y, n, names[i]);
        if (!vn) {
            v[i] = NAN;
            continue;
        }
        rc = q == SR_Q_NONE ? sr_yaml_number(y, vn, &v[i], err) : sr_yaml_quantity(y, vn, q, &v[i], err);
        if (rc)
            return rc;
        if (!(v[i] >= min && v[i] <= max))
            return sr_yaml_fail(y, vn, err, "%s %s is outside the plausible range %g .. %g", key, names[i],
                                q == SR_Q_ANGLE ? min * 180 / PI : min, q == SR_Q_ANGLE ? max * 180 / PI : max);
    }
    if (isnan(v[1]))
        v[1] = 0.5 * (v[0] + v[2]);
    if (!(v[0] <= v[1] && v[1] <= v[2]))
        return sr_yaml_fail(y, n, err, "%s: low <= typical <= high does not hold", key);
    b->lo = v[0];
    b->typ = v[1];
    b->hi = v[2];
    if ((rc = read_check(y, n, chk, err)))
        return rc;
    return sr_yaml_text(y, sr_yaml_get(y, n, "source"), src, srclen, err);
}

static int read_value(const sr_yaml *y, yaml_node_t *map, const char *key, sr_quantity q, double min, double max,
                      double *v, char *src, size_t srclen, sr_value_check *chk, sr_error *err)
{
    yaml_node_t *n = sr_yaml_get(y, map, key);
    int rc = sr_yaml_check_map(y, n, key, VALUE_KEYS, VALUE_REQ, err);
    if (rc)
        return rc;
    yaml_node_t *vn = sr_yaml_get(y, n, "value");
    rc = q == SR_Q_NONE ? sr_yaml_number(y, vn, v, err) : sr_yaml_quantity(y, vn, q, v, err);
    if (rc)
        return rc;
    if (!(*v >= min && *v <= max))
        return sr_yaml_fail(y, vn, err, "%s is outside the plausible range %g .. %g", key, min, max);
    if ((rc = read_check(y, n, chk, err)))
        return rc;
    return sr_yaml_text(y, sr_yaml_get(y, n, "source"), src, srclen, err);
}

static int valid_id(const char *s)
{
    if (!*s)
        return 0;
    for (const char *p = s; *p; p++)
        if (!((*p >= 'a' && *p <= 'z') || (*p >= '0' && *p <= '9') || *p == '-'))
            return 0;
    return s[0] != '-';
}

int sr_catalog_parse_family(sr_family *f, sr_yaml *y, sr_error *err)
{
    memset(f, 0, sizeof *f);
    snprintf(f->file, sizeof f->file, "%s", y->name);
    yaml_node_t *root = sr_yaml_root(y);
    int acc = SR_OK, rc;
    if (!root || root->type != YAML_MAPPING_NODE)
        return sr_yaml_check_map(y, root, "the canopy family", FAMILY_KEYS, FAMILY_REQ, err);
    /* each block on its own: with a list of problems (check), every one is named */
    SR_YAML_STEP(sr_yaml_check_map(y, root, "the canopy family", FAMILY_KEYS, FAMILY_REQ, err));
    yaml_node_t *n = sr_yaml_get(y, root, "id");
    if (n) {
        SR_YAML_STEP(rc = sr_yaml_string(y, n, f->id, sizeof f->id, err));
        if (!rc && !valid_id(f->id))
            SR_YAML_STEP(sr_yaml_fail(y, n, err, "id '%s' must be lower-case kebab-case (letters, digits, '-')",
                                      f->id));
    }
    if ((n = sr_yaml_get(y, root, "name")))
        SR_YAML_STEP(sr_yaml_string(y, n, f->name, sizeof f->name, err));
    if ((n = sr_yaml_get(y, root, "class"))) {
        SR_YAML_STEP(rc = sr_yaml_string(y, n, f->cls, sizeof f->cls, err));
        if (!rc && strcmp(f->cls, SR_CANOPY_CLASS_SOLID) != 0 && strcmp(f->cls, SR_CANOPY_CLASS_SLOTTED) != 0)
            SR_YAML_STEP(sr_yaml_fail(y, n, err, "class must be 'solid' or 'slotted', not '%s'", f->cls));
    }
    yaml_node_t *cd = sr_yaml_get(y, root, "drag-coefficient");
    if (cd) {
        SR_YAML_STEP(rc = sr_yaml_check_map(y, cd, "drag-coefficient", CD_KEYS, CD_REQ, err));
        char ref[32];
        if (!rc && (n = sr_yaml_get(y, cd, "reference"))) {
            SR_YAML_STEP(rc = sr_yaml_string(y, n, ref, sizeof ref, err));
            if (!rc && strcmp(ref, "nominal") != 0)
                SR_YAML_STEP(sr_yaml_fail(y, n, err,
                                          "catalog drag coefficients must be on nominal area (reference: nominal); "
                                          "convert '%s' with the family's diameter ratio first",
                                          ref));
        }
        f->cd0.ref = SR_REF_NOMINAL;
        if (!rc)
            SR_YAML_STEP(read_band(y, root, "drag-coefficient", SR_Q_NONE, 0.05, 2.5, &f->cd0.v, f->cd0_source,
                                   sizeof f->cd0_source, &f->check[SR_FV_DRAG], err));
    }
    if (sr_yaml_get(y, root, "projected-ratio"))
        SR_YAML_STEP(read_band(y, root, "projected-ratio", SR_Q_NONE, 0.3, 1.2, &f->dp_d0, f->dp_source,
                               sizeof f->dp_source, &f->check[SR_FV_PROJECTED], err));
    if (sr_yaml_get(y, root, "constructed-ratio"))
        SR_YAML_STEP(read_band(y, root, "constructed-ratio", SR_Q_NONE, 0.3, 1.5, &f->dc_d0, f->dc_source,
                               sizeof f->dc_source, &f->check[SR_FV_CONSTRUCTED], err));
    if (sr_yaml_get(y, root, "opening-factor"))
        SR_YAML_STEP(read_band(y, root, "opening-factor", SR_Q_NONE, 0.5, 3.0, &f->cx, f->cx_source,
                               sizeof f->cx_source, &f->check[SR_FV_OPENING], err));
    if (sr_yaml_get(y, root, "filling-constant"))
        SR_YAML_STEP(read_value(y, root, "filling-constant", SR_Q_NONE, 0.5, 50.0, &f->fill_n, f->fill_source,
                                sizeof f->fill_source, &f->check[SR_FV_FILLING], err));
    if (sr_yaml_get(y, root, "oscillation"))
        SR_YAML_STEP(read_band(y, root, "oscillation", SR_Q_ANGLE, 0.0, PI / 2, &f->oscillation, f->osc_source,
                               sizeof f->osc_source, &f->check[SR_FV_OSCILLATION], err));
    if (sr_yaml_get(y, root, "mach-limit"))
        SR_YAML_STEP(read_value(y, root, "mach-limit", SR_Q_NONE, 0.01, 5.0, &f->mach_max, f->mach_source,
                                sizeof f->mach_source, &f->check[SR_FV_MACH], err));
    /* the growth exponent: the file's band, or the class's (from memory) */
    if (sr_yaml_get(y, root, "growth-exponent")) {
        SR_YAML_STEP(rc = read_band(y, root, "growth-exponent", SR_Q_NONE, 0.25, 6.0, &f->growth, f->growth_source,
                                    sizeof f->growth_source, &f->check[SR_FV_GROWTH], err));
        f->growth_given = !rc;
    } else {
        snprintf(f->check[SR_FV_GROWTH].outside, sizeof f->check[SR_FV_GROWTH].outside, "none");
        int slotted = strcmp(f->cls, SR_CANOPY_CLASS_SLOTTED) == 0;
        sr_opening_class_band(slotted ? SR_OPENING_SLOTTED : SR_OPENING_SOLID, &f->growth.lo, &f->growth.typ,
                              &f->growth.hi);
        snprintf(f->growth_source, sizeof f->growth_source,
                 "class default (%s): n = %g commonly used, drop-test fits spread about %g .. %g; from memory "
                 "(trade-facts.md section 6)",
                 slotted ? "slotted" : "solid cloth", f->growth.typ, f->growth.lo, f->growth.hi);
    }
    f->areal_mass = NAN;
    snprintf(f->check[SR_FV_AREAL].outside, sizeof f->check[SR_FV_AREAL].outside, "none");
    if (sr_yaml_get(y, root, "areal-mass"))
        SR_YAML_STEP(read_value(y, root, "areal-mass", SR_Q_AREAL_MASS, 1e-3, 2.0, &f->areal_mass, f->areal_source,
                                sizeof f->areal_source, &f->check[SR_FV_AREAL], err));
    n = sr_yaml_get(y, root, "notes");
    if (n)
        SR_YAML_STEP(sr_yaml_text(y, n, f->notes, sizeof f->notes, err));
    return acc;
}

int sr_catalog_load_family(sr_family *f, const char *path, sr_error *err)
{
    sr_yaml y;
    int rc = sr_yaml_load_file(&y, path, err);
    if (rc)
        return rc;
    rc = sr_catalog_parse_family(f, &y, err);
    sr_yaml_free(&y);
    return rc;
}

static int cmp_name(const void *a, const void *b)
{
    return strcmp(*(char *const *)a, *(char *const *)b);
}

/* Families sorted by id, their origins along. */
static void sort_families(sr_catalog *c)
{
    for (size_t i = 1; i < c->n; i++)
        for (size_t j = i; j > 0 && strcmp(c->fam[j - 1].id, c->fam[j].id) > 0; j--) {
            sr_family f = c->fam[j];
            sr_catalog_origin o = c->origin[j];
            c->fam[j] = c->fam[j - 1];
            c->origin[j] = c->origin[j - 1];
            c->fam[j - 1] = f;
            c->origin[j - 1] = o;
        }
}

int sr_catalog_open(sr_catalog *c, const char *dir, sr_error *err)
{
    c->n = 0;
    c->layers = 0;
    snprintf(c->dir, sizeof c->dir, "%s", dir);
    return sr_catalog_add(c, dir, "built-in", err);
}

int sr_catalog_add(sr_catalog *c, const char *dir, const char *from, sr_error *err)
{
    /* the same directory twice (--data naming the built-in catalog) adds nothing */
    char real[4096], other[4096];
    if (realpath(dir, real))
        for (size_t i = 0; i < c->n; i++) {
            char fdir[256];
            snprintf(fdir, sizeof fdir, "%s", c->fam[i].file);
            char *slash = strrchr(fdir, '/');
            if (slash)
                *slash = '\0';
            if (slash && realpath(fdir, other) && strcmp(real, other) == 0)
                return SR_OK;
        }
    DIR *d = opendir(dir);
    if (!d)
        return sr_error_set(err, SR_EIO, "cannot open the canopy catalog directory %s", dir);
    char *names[SR_CATALOG_MAX + 1];
    size_t n = 0;
    struct dirent *e;
    int rc = SR_OK;
    while ((e = readdir(d)) != NULL) {
        size_t l = strlen(e->d_name);
        if (l < 6 || strcmp(e->d_name + l - 5, ".yaml") != 0 || e->d_name[0] == '.')
            continue;
        /* a family is a regular file: a FIFO would block every command on its open, a device or a
         * directory is no family */
        char path[1024];
        struct stat st;
        snprintf(path, sizeof path, "%s/%s", dir, e->d_name);
        if (stat(path, &st) != 0 || !S_ISREG(st.st_mode))
            continue;
        if (n >= SR_CATALOG_MAX) {
            rc = sr_error_set_at(err, SR_EINVAL, dir, 0, 0, "more than %d family files", SR_CATALOG_MAX);
            break;
        }
        names[n++] = strdup(e->d_name);
    }
    closedir(d);
    if (!rc && n == 0)
        rc = sr_error_set(err, SR_EIO, "%s holds no canopy family files (*.yaml)", dir);
    qsort(names, n, sizeof names[0], cmp_name);
    int layer = c->layers;
    size_t n0 = c->n;
    for (size_t i = 0; i < n && !rc; i++) {
        char path[1024];
        snprintf(path, sizeof path, "%s/%s", dir, names[i]);
        sr_family f;
        rc = sr_catalog_load_family(&f, path, err);
        if (rc)
            break;
        size_t at = c->n;
        for (size_t j = 0; j < c->n; j++)
            if (strcmp(c->fam[j].id, f.id) == 0)
                at = j;
        if (at < c->n && c->origin[at].layer == layer) {
            rc = sr_error_set_at(err, SR_EINVAL, path, 0, 0, "id '%s' is already used by %s", f.id, c->fam[at].file);
            break;
        }
        if (at == c->n && c->n >= SR_CATALOG_MAX) {
            rc = sr_error_set_at(err, SR_EINVAL, path, 0, 0, "more than %d families in all", SR_CATALOG_MAX);
            break;
        }
        sr_catalog_origin o = {.layer = layer};
        snprintf(o.from, sizeof o.from, "%s", from ? from : dir);
        if (at < c->n)
            snprintf(o.replaces, sizeof o.replaces, "%s", c->fam[at].file);
        c->fam[at] = f;
        c->origin[at] = o;
        if (at == c->n)
            c->n++;
    }
    for (size_t i = 0; i < n; i++)
        free(names[i]);
    if (rc) {
        if (layer == 0)
            c->n = 0;
        else
            c->n = n0; /* a failed load is an error anyway; what was replaced is not restored */
        return rc;
    }
    c->layers++;
    sort_families(c);
    return rc;
}

const sr_family *sr_catalog_find(const sr_catalog *c, const char *id, sr_error *err)
{
    const char *ids[SR_CATALOG_MAX + 1];
    for (size_t i = 0; i < c->n; i++) {
        if (strcmp(c->fam[i].id, id) == 0)
            return &c->fam[i];
        ids[i] = c->fam[i].id;
    }
    ids[c->n] = NULL;
    const char *s = sr_yaml_suggest(id, ids);
    if (s)
        sr_error_set_key(err, SR_EINVAL, "family",
                         "unknown canopy family '%s'; did you mean '%s'? (sinkrate canopies lists them)", id, s);
    else
        sr_error_set_key(err, SR_EINVAL, "family", "unknown canopy family '%s' (sinkrate canopies lists them)", id);
    return NULL;
}

const char *const sr_canopy_keys[] = {"family", "nominal-diameter", "projected-diameter", "flat-diameter",
                                      "nominal-area", "drag-coefficient", "count", "cluster-factor",
                                      "areal-mass", "measured-opening", NULL};
static const char *const SIZE_KEYS[] = {"nominal-diameter", "projected-diameter", "flat-diameter",
                                        "nominal-area"};
static const sr_size_kind SIZE_KIND[] = {SR_SIZE_NOMINAL_DIAMETER, SR_SIZE_PROJECTED_DIAMETER,
                                         SR_SIZE_FLAT_DIAMETER, SR_SIZE_NOMINAL_AREA};
static const char *const MEASURED_KEYS[] = {"value", "reference", "source", "low", "high", NULL};
static const char *const MEASURED_REQUIRED[] = {"value", "reference", "source", NULL};
static const char *const OPENING_KEYS[] = {"factor", "load", "source", NULL};
static const char *const OPENING_REQ[] = {"source", NULL};

/* measured-opening: {factor: 1.3, source: ...} or {load: 850 N, source: ...} */
static int parse_measured_opening(sr_canopy *c, const sr_yaml *y, yaml_node_t *m, sr_error *err)
{
    int rc;
    if ((rc = sr_yaml_check_map(y, m, "measured-opening", OPENING_KEYS, OPENING_REQ, err)))
        return rc;
    yaml_node_t *fn = sr_yaml_get(y, m, "factor"), *ln = sr_yaml_get(y, m, "load");
    if ((fn && ln) || (!fn && !ln))
        return sr_yaml_fail(y, m, err, "measured-opening takes exactly one of factor: (the measured peak over CD0 S0 "
                                       "q at line stretch) or load: (the measured peak force)");
    if (fn) {
        if ((rc = sr_yaml_number(y, fn, &c->opening_value, err)))
            return rc;
        if (!(c->opening_value >= 0.05 && c->opening_value <= 5.0))
            return sr_yaml_fail(y, fn, err, "a measured opening-load factor must lie in 0.05 .. 5");
        c->opening = SR_OPENING_MEASURED_FACTOR;
    } else {
        if ((rc = sr_yaml_quantity(y, ln, SR_Q_FORCE, &c->opening_value, err)))
            return rc;
        if (!(c->opening_value > 0 && c->opening_value <= 1e7))
            return sr_yaml_fail(y, ln, err, "a measured opening load must lie above 0 and at most 10 MN");
        c->opening = SR_OPENING_MEASURED_LOAD;
    }
    return sr_yaml_string(y, sr_yaml_get(y, m, "source"), c->opening_source, sizeof c->opening_source, err);
}

int sr_catalog_canopy_from_node(sr_canopy *c, const sr_catalog *cat, const sr_yaml *y, yaml_node_t *n,
                                int size_optional, int *has_size, sr_error *err)
{
    int rc;
    char fam_id[64];
    yaml_node_t *fn = sr_yaml_get(y, n, "family");
    if (!fn)
        return sr_yaml_fail(y, n, err, "the canopy needs a 'family' (a catalog id such as conical)");
    if ((rc = sr_yaml_string(y, fn, fam_id, sizeof fam_id, err)))
        return rc;
    sr_error e;
    const sr_family *fam = sr_catalog_find(cat, fam_id, &e);
    if (!fam)
        return sr_yaml_fail(y, fn, err, "%s", e.msg);
    int found = -1;
    for (int i = 0; i < 4; i++) {
        yaml_node_t *sn = sr_yaml_get(y, n, SIZE_KEYS[i]);
        if (!sn)
            continue;
        if (found >= 0)
            return sr_yaml_fail(y, sr_yaml_key_node(y, n, SIZE_KEYS[i]), err,
                                "give one size only: both '%s' and '%s' are set", SIZE_KEYS[found], SIZE_KEYS[i]);
        found = i;
    }
    if (found < 0 && !size_optional)
        return sr_yaml_fail(y, n, err, "the canopy needs a size: one of nominal-diameter, projected-diameter, "
                                       "flat-diameter, nominal-area");
    if (has_size)
        *has_size = found >= 0;
    double value = 1.0;
    sr_size_kind kind = SR_SIZE_NOMINAL_AREA;
    int acc = SR_OK; /* past the family, each part on its own: check names every problem */
    sr_canopy_from_size(c, fam, kind, value, &e); /* the placeholder the other parts build on */
    if (found >= 0) {
        yaml_node_t *sn = sr_yaml_get(y, n, SIZE_KEYS[found]);
        kind = SIZE_KIND[found];
        SR_YAML_STEP(rc = sr_yaml_quantity(y, sn, kind == SR_SIZE_NOMINAL_AREA ? SR_Q_AREA : SR_Q_LENGTH, &value,
                                           err));
        if (!rc && sr_canopy_from_size(c, fam, kind, value, &e)) {
            SR_YAML_STEP(sr_yaml_fail(y, sn, err, "%s", e.msg));
            sr_canopy_from_size(c, fam, SR_SIZE_NOMINAL_AREA, 1.0, &e);
        }
    }
    yaml_node_t *m = sr_yaml_get(y, n, "drag-coefficient");
    if (m) {
        SR_YAML_STEP(rc = sr_yaml_check_map(y, m, "drag-coefficient", MEASURED_KEYS, MEASURED_REQUIRED, err));
        double cd;
        char refs[32], src[SR_SOURCE_MAX];
        sr_ref ref;
        yaml_node_t *vn = sr_yaml_get(y, m, "value"), *rn = sr_yaml_get(y, m, "reference");
        int ok = !rc;
        if (ok) {
            SR_YAML_STEP(rc = sr_yaml_number(y, vn, &cd, err));
            ok = !rc;
            SR_YAML_STEP(rc = sr_yaml_string(y, rn, refs, sizeof refs, err));
            if (!rc && sr_ref_parse(refs, &ref) != SR_OK)
                SR_YAML_STEP(rc = sr_yaml_fail(y, rn, err, "reference must be nominal, projected or constructed, not "
                                                           "'%s'",
                                               refs));
            ok = ok && !rc;
            SR_YAML_STEP(rc = sr_yaml_text(y, sr_yaml_get(y, m, "source"), src, sizeof src, err));
            ok = ok && !rc;
        }
        /* optional low / high: a measured band (a fit's confidence interval) */
        sr_band b = {0, 0, 0};
        yaml_node_t *ln = sr_yaml_get(y, m, "low"), *hn = sr_yaml_get(y, m, "high");
        if (ok) {
            b = (sr_band){cd, cd, cd};
            if ((ln != NULL) != (hn != NULL))
                SR_YAML_STEP(rc = sr_yaml_fail(y, ln ? ln : hn, err,
                                               "give both 'low' and 'high' of the measured band, or neither"));
            else if (ln)
                SR_YAML_STEP(rc = sr_yaml_number(y, ln, &b.lo, err) ? SR_EINVAL : sr_yaml_number(y, hn, &b.hi, err));
            ok = !rc;
        }
        if (ok && (rc = sr_canopy_set_measured_band(c, b, ref, src, &e)))
            SR_YAML_STEP(sr_yaml_fail(y, ln && !(b.lo <= cd && cd <= b.hi) ? ln : vn, err, "%s", e.msg));
    }
    long count = 1;
    double factor = NAN;
    yaml_node_t *cn = sr_yaml_get(y, n, "count"), *kn = sr_yaml_get(y, n, "cluster-factor");
    int crc = SR_OK;
    if (cn)
        SR_YAML_STEP(crc = sr_yaml_int(y, cn, 1, 16, &count, err));
    if (kn && !crc)
        SR_YAML_STEP(crc = sr_yaml_number(y, kn, &factor, err));
    if (!crc && sr_canopy_set_cluster(c, (int)count, factor, &e))
        SR_YAML_STEP(sr_yaml_fail(y, kn ? kn : cn, err, "%s", e.msg));
    yaml_node_t *an = sr_yaml_get(y, n, "areal-mass");
    if (an) {
        SR_YAML_STEP(rc = sr_yaml_quantity(y, an, SR_Q_AREAL_MASS, &c->areal_mass, err));
        if (!rc && !(c->areal_mass > 0 && c->areal_mass < 2.0))
            SR_YAML_STEP(sr_yaml_fail(y, an, err, "areal mass must be between 0 and 2 kg/m2 (2000 g/m2)"));
    }
    yaml_node_t *on = sr_yaml_get(y, n, "measured-opening");
    if (on)
        SR_YAML_STEP(parse_measured_opening(c, y, on, err));
    return acc;
}

static const char *const CANOPY_FILE_KEYS[] = {"canopy", NULL};

int sr_catalog_parse_canopy(sr_canopy *c, const sr_catalog *cat, sr_yaml *y, sr_error *err)
{
    yaml_node_t *root = sr_yaml_root(y);
    int rc = sr_yaml_check_map(y, root, "a canopy file", CANOPY_FILE_KEYS, CANOPY_FILE_KEYS, err);
    if (rc)
        return rc;
    yaml_node_t *n = sr_yaml_get(y, root, "canopy");
    static const char *const keys[] = {"name",          "family",           "nominal-diameter", "projected-diameter",
                                       "flat-diameter", "nominal-area",     "drag-coefficient", "count",
                                       "cluster-factor", "areal-mass",      "measured-opening", NULL};
    int acc = SR_OK;
    if (!n || n->type != YAML_MAPPING_NODE)
        return sr_yaml_check_map(y, n, "canopy", keys, NULL, err);
    SR_YAML_STEP(sr_yaml_check_map(y, n, "canopy", keys, NULL, err));
    SR_YAML_STEP(sr_catalog_canopy_from_node(c, cat, y, n, 0, NULL, err));
    return acc;
}

int sr_catalog_load_canopy(sr_canopy *c, const sr_catalog *cat, const char *path, sr_error *err)
{
    sr_yaml y;
    int rc = sr_yaml_load_file(&y, path, err);
    if (rc)
        return rc;
    rc = sr_catalog_parse_canopy(c, cat, &y, err);
    sr_yaml_free(&y);
    return rc;
}

/* ---- a program's catalog (include/sinkrate/files.h) ---- */

#ifndef SR_DATADIR
#define SR_DATADIR "/usr/local/share/sinkrate"
#endif

void sr_catalog_default_dir(char *buf, size_t len)
{
    const char *env = getenv("SINKRATE_DATA");
    snprintf(buf, len, "%s/canopies", env && env[0] ? env : SR_DATADIR);
}

int sr_catalog_new(sr_catalog **out, const char *dir, sr_error *err)
{
    sr_error_gsl_off();
    *out = NULL;
    char def[1024];
    if (!dir) {
        sr_catalog_default_dir(def, sizeof def);
        dir = def;
    }
    sr_catalog *c = malloc(sizeof *c);
    if (!c)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_catalog_open(c, dir, err);
    if (rc) {
        free(c);
        return rc;
    }
    *out = c;
    return SR_OK;
}

void sr_catalog_free(sr_catalog *c)
{
    free(c);
}

size_t sr_catalog_count(const sr_catalog *c)
{
    return c->n;
}

const sr_family *sr_catalog_family(const sr_catalog *c, size_t i)
{
    return i < c->n ? &c->fam[i] : NULL;
}

int sr_canopy_open(sr_canopy **out, const sr_catalog *cat, const char *path, sr_error *err)
{
    *out = NULL;
    sr_canopy *c = malloc(sizeof *c);
    if (!c)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_catalog_load_canopy(c, cat, path, err);
    if (rc) {
        free(c);
        return rc;
    }
    *out = c;
    return SR_OK;
}
