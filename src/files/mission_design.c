/* mission_design.c - the mission file's `design:` block and the same checks
 * for the design command's options (mission_design.h). */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "files/mission_design.h"
#include "files/yamldoc.h"

static const char *const DESIGN_KEYS[] = {"objective", "packing", "grid", "heights", "stages", NULL};
static const char *const DSTAGE_KEYS[] = {"families",  "nominal-diameter", "count",   "deploy-height",
                                          "optional",  "bay-volume",       "packing", NULL};
static const char *const RANGE_KEYS[] = {"min", "max", "step", NULL};
static const char *const RANGE_REQ[] = {"min", "max", NULL};
static const char *const HEIGHT_KEYS[] = {"min", "max", "points", NULL};
static const char *const CLASS_KEYS[] = {"class", NULL};

static const char *const OBJECTIVES[] = {"mass", "volume", "drift", NULL};

const char *sr_design_objective_name(sr_design_objective o)
{
    return o >= SR_DESIGN_MASS && o <= SR_DESIGN_DRIFT ? OBJECTIVES[o] : "?";
}

int sr_design_objective_parse(const char *s, sr_design_objective *o)
{
    for (int i = 0; OBJECTIVES[i]; i++)
        if (strcmp(s, OBJECTIVES[i]) == 0) {
            *o = (sr_design_objective)i;
            return SR_OK;
        }
    return SR_EINVAL;
}

void sr_design_spec_init(sr_design_spec *d)
{
    memset(d, 0, sizeof *d);
    d->objective = SR_DESIGN_MASS;
    d->packing = SR_PACK_HAND;
    d->grid = SR_DESIGN_DEFAULT_GRID;
    d->heights = SR_DESIGN_DEFAULT_HEIGHTS;
    for (size_t k = 0; k < SR_DESIGN_MAX_STAGES; k++) {
        d->stage[k].bay = NAN;
        d->stage[k].packing = -1;
        d->stage[k].hmin = d->stage[k].hmax = NAN;
        d->stage[k].dmin = d->stage[k].dmax = NAN;
    }
}

int sr_design_stage_varies(const sr_design_stage *s)
{
    return s->nfamilies > 0 || s->sizes != SR_DSIZE_FIXED || s->ncounts > 0 || s->height || s->optional;
}

/* ---- the checks, shared by the file and the options (messages without a location) ---- */

static int add_family(sr_design_stage *s, const sr_catalog *cat, const char *id, sr_error *err)
{
    sr_error e;
    if (!sr_catalog_find(cat, id, &e))
        return sr_error_set(err, SR_EINVAL, "%s", e.msg);
    for (size_t i = 0; i < s->nfamilies; i++)
        if (strcmp(s->family[i], id) == 0)
            return sr_error_set(err, SR_EINVAL, "family '%s' is listed twice", id);
    if (s->nfamilies >= SR_DESIGN_MAX_FAMILIES)
        return sr_error_set(err, SR_EINVAL, "at most %d families", SR_DESIGN_MAX_FAMILIES);
    snprintf(s->family[s->nfamilies++], sizeof s->family[0], "%s", id);
    return SR_OK;
}

/* every family of the catalog ("" class: all of them) */
static int add_class(sr_design_stage *s, const sr_catalog *cat, const char *cls, sr_error *err)
{
    size_t before = s->nfamilies;
    for (size_t i = 0; i < cat->n; i++)
        if ((!cls[0] || strcmp(cat->fam[i].cls, cls) == 0)) {
            int dup = 0;
            for (size_t j = 0; j < s->nfamilies; j++)
                dup |= strcmp(s->family[j], cat->fam[i].id) == 0;
            if (!dup && s->nfamilies < SR_DESIGN_MAX_FAMILIES)
                snprintf(s->family[s->nfamilies++], sizeof s->family[0], "%s", cat->fam[i].id);
        }
    if (s->nfamilies == before) {
        if (cls[0])
            return sr_error_set(err, SR_EINVAL, "no family of the catalog has class '%s' (classes: %s, %s)", cls,
                                SR_CANOPY_CLASS_SOLID, SR_CANOPY_CLASS_SLOTTED);
        return sr_error_set(err, SR_EINVAL, "the catalog holds no family");
    }
    return SR_OK;
}

static int check_diameter(double d, sr_error *err)
{
    if (!(d >= SR_CANOPY_SIZE_MIN && d <= SR_CANOPY_SIZE_MAX))
        return sr_error_set(err, SR_EINVAL, "a nominal diameter of %g m is outside %g m .. %g m", d, SR_CANOPY_SIZE_MIN,
                            SR_CANOPY_SIZE_MAX);
    return SR_OK;
}

static int set_range(sr_design_stage *s, double lo, double hi, double step, sr_error *err)
{
    int rc;
    if ((rc = check_diameter(lo, err)) || (rc = check_diameter(hi, err)))
        return rc;
    if (lo > hi)
        return sr_error_set(err, SR_EINVAL, "the size range's min %g m is above its max %g m", lo, hi);
    if (hi / lo > SR_DESIGN_MAX_SPAN)
        return sr_error_set(err, SR_EINVAL, "the size range %g m .. %g m spans more than a factor %g; split the search",
                            lo, hi, SR_DESIGN_MAX_SPAN);
    if (isnan(step)) {
        if (lo == hi) { /* one size */
            s->sizes = SR_DSIZE_LIST;
            s->nsizes = 1;
            s->size[0] = lo;
            return SR_OK;
        }
        s->sizes = SR_DSIZE_RANGE;
        s->dmin = lo;
        s->dmax = hi;
        return SR_OK;
    }
    if (!(step > 0.0))
        return sr_error_set(err, SR_EINVAL, "the size step must be positive");
    double n = floor((hi - lo) / step * (1.0 + 1e-9)) + 1.0;
    if (n > SR_DESIGN_MAX_SIZES)
        return sr_error_set(err, SR_EINVAL, "%g m .. %g m in steps of %g m gives %.0f sizes; at most %d", lo, hi, step,
                            n, SR_DESIGN_MAX_SIZES);
    s->sizes = SR_DSIZE_LIST;
    s->nsizes = (size_t)n;
    for (size_t i = 0; i < s->nsizes; i++)
        s->size[i] = lo + step * (double)i;
    return SR_OK;
}

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return x < y ? -1 : x > y;
}

static int set_list(sr_design_stage *s, const double *v, size_t n, sr_error *err)
{
    int rc;
    if (n == 0)
        return sr_error_set(err, SR_EINVAL, "the list of sizes is empty");
    if (n > SR_DESIGN_MAX_SIZES)
        return sr_error_set(err, SR_EINVAL, "at most %d sizes", SR_DESIGN_MAX_SIZES);
    for (size_t i = 0; i < n; i++)
        if ((rc = check_diameter(v[i], err)))
            return rc;
    memcpy(s->size, v, n * sizeof *v);
    qsort(s->size, n, sizeof *v, cmp_double);
    for (size_t i = 1; i < n; i++)
        if (s->size[i] == s->size[i - 1])
            return sr_error_set(err, SR_EINVAL, "the size %g m is listed twice", s->size[i]);
    if (s->size[n - 1] / s->size[0] > SR_DESIGN_MAX_SPAN)
        return sr_error_set(err, SR_EINVAL, "the sizes span more than a factor %g; split the search",
                            SR_DESIGN_MAX_SPAN);
    s->sizes = SR_DSIZE_LIST;
    s->nsizes = n;
    return SR_OK;
}

static int set_heights(sr_design_stage *s, const sr_design_basis *b, size_t k, double lo, double hi, double points,
                       sr_error *err)
{
    const sr_design_basis_stage *st = &b->stage[k];
    if (st->deploy != SR_DEPLOY_ALTITUDE)
        return sr_error_set(err, SR_EINVAL, "stage '%s' does not deploy at a height (deploy: height:), so its "
                                            "deployment height cannot vary",
                            st->name);
    if (!(lo > 0.0 && hi > 0.0))
        return sr_error_set(err, SR_EINVAL, "deployment heights must be above ground");
    if (lo > hi)
        return sr_error_set(err, SR_EINVAL, "the height range's min %g m is above its max %g m", lo, hi);
    if (b->has_start && !(hi < b->start_height))
        return sr_error_set(err, SR_EINVAL, "the height range reaches %g m, not below the start at %g m above ground",
                            hi, b->start_height);
    if (!isnan(points) && !(points >= 1 && points <= SR_DESIGN_MAX_POINTS && points == floor(points)))
        return sr_error_set(err, SR_EINVAL, "points must be a whole number from 1 to %d", SR_DESIGN_MAX_POINTS);
    s->height = 1;
    s->hmin = lo;
    s->hmax = hi;
    s->hpoints = isnan(points) ? 0 : (size_t)points;
    if (lo == hi)
        s->hpoints = 1;
    return SR_OK;
}

static int add_count(sr_design_stage *s, double v, sr_error *err)
{
    if (!(v >= 1 && v <= 16 && v == floor(v)))
        return sr_error_set(err, SR_EINVAL, "a cluster count is a whole number from 1 to 16");
    for (size_t i = 0; i < s->ncounts; i++)
        if (s->count[i] == (int)v)
            return sr_error_set(err, SR_EINVAL, "the count %d is listed twice", (int)v);
    if (s->ncounts >= SR_DESIGN_MAX_COUNTS)
        return sr_error_set(err, SR_EINVAL, "at most %d cluster counts", SR_DESIGN_MAX_COUNTS);
    s->count[s->ncounts++] = (int)v;
    return SR_OK;
}

int sr_design_check_stage(const sr_design_stage *s, const sr_design_basis *b, size_t k, sr_error *err)
{
    const sr_design_basis_stage *st = &b->stage[k];
    if (st->canopy_file && (s->nfamilies || s->sizes != SR_DSIZE_FIXED || s->ncounts))
        return sr_error_set(err, SR_EINVAL, "stage '%s' is a canopy file (a canopy you own): its family, size and "
                                            "count stay as they are; only its deployment height may vary",
                            st->name);
    if (st->measured_load && (s->nfamilies || s->sizes != SR_DSIZE_FIXED ||
                                                           s->ncounts || s->height))
        return sr_error_set(err, SR_EINVAL, "stage '%s' has a measured opening load, which holds for its own size "
                                            "and deployment only: it cannot vary",
                            st->name);
    if (s->sizes == SR_DSIZE_FIXED && !st->has_size && (s->nfamilies || s->ncounts || s->height))
        return sr_error_set(err, SR_EINVAL, "stage '%s' has no size in the file: give the sizes to search",
                            st->name);
    return SR_OK;
}

/* ---- text forms (the command's options) ---- */

static int text_fail(sr_error *err, const char *what, const sr_error *e)
{
    return sr_error_set(err, SR_EINVAL, "%s: %s", what, e->msg);
}

int sr_design_set_families(sr_design_stage *s, const sr_design_basis *b, size_t k, const sr_catalog *cat,
                           const char *text, const char *what, sr_error *err)
{
    (void)b;
    (void)k;
    sr_error e;
    s->nfamilies = 0;
    char buf[1024];
    snprintf(buf, sizeof buf, "%s", text);
    int rc = SR_OK;
    char *save = NULL;
    for (char *tok = strtok_r(buf, ",", &save); tok && !rc; tok = strtok_r(NULL, ",", &save)) {
        while (*tok == ' ')
            tok++;
        size_t l = strlen(tok);
        while (l > 0 && tok[l - 1] == ' ')
            tok[--l] = '\0';
        if (strcmp(tok, "all") == 0)
            rc = add_class(s, cat, "", &e);
        else if (strncmp(tok, "class:", 6) == 0)
            rc = add_class(s, cat, tok + 6 + strspn(tok + 6, " "), &e);
        else
            rc = add_family(s, cat, tok, &e);
    }
    if (rc)
        return text_fail(err, what, &e);
    if (!s->nfamilies)
        return sr_error_set(err, SR_EINVAL, "%s: give at least one family (ids, 'all' or 'class:solid')", what);
    return SR_OK;
}

/* "a..b" into two texts; 0 when there is no "..". */
static int split_range(const char *text, char *a, char *b, size_t len)
{
    const char *dots = strstr(text, "..");
    if (!dots)
        return 0;
    snprintf(a, len, "%.*s", (int)(dots - text), text);
    snprintf(b, len, "%s", dots + 2);
    return 1;
}

int sr_design_set_sizes(sr_design_stage *s, const sr_design_basis *basis, size_t k, const char *text, const char *what,
                        sr_error *err)
{
    (void)basis;
    (void)k;
    char a[128], b[128], st[128];
    sr_error e;
    if (split_range(text, a, b, sizeof a)) {
        char *slash = strchr(b, '/');
        double lo, hi, step = NAN;
        if (slash) {
            snprintf(st, sizeof st, "%s", slash + 1);
            *slash = '\0';
            if (sr_units_parse(st, SR_Q_LENGTH, &step, &e))
                return text_fail(err, what, &e);
        }
        if (sr_units_parse(a, SR_Q_LENGTH, &lo, &e) || sr_units_parse(b, SR_Q_LENGTH, &hi, &e))
            return text_fail(err, what, &e);
        if (set_range(s, lo, hi, step, &e))
            return text_fail(err, what, &e);
        return SR_OK;
    }
    double v[SR_DESIGN_MAX_SIZES + 1];
    size_t n = 0;
    char buf[2048];
    snprintf(buf, sizeof buf, "%s", text);
    char *save = NULL;
    for (char *tok = strtok_r(buf, ",", &save); tok; tok = strtok_r(NULL, ",", &save)) {
        if (n > SR_DESIGN_MAX_SIZES)
            return sr_error_set(err, SR_EINVAL, "%s: at most %d sizes", what, SR_DESIGN_MAX_SIZES);
        if (sr_units_parse(tok, SR_Q_LENGTH, &v[n++], &e))
            return text_fail(err, what, &e);
    }
    if (set_list(s, v, n, &e))
        return text_fail(err, what, &e);
    return SR_OK;
}

int sr_design_set_heights(sr_design_stage *s, const sr_design_basis *basis, size_t k, const char *text, const char *what,
                          sr_error *err)
{
    char a[128], b[128];
    sr_error e;
    double lo, hi, pts = NAN;
    if (!split_range(text, a, b, sizeof a))
        return sr_error_set(err, SR_EINVAL, "%s: give a range MIN..MAX (\"150m..450m\", or \"150m..450m/25\" for 25 "
                                            "points)",
                            what);
    char *slash = strchr(b, '/');
    if (slash) {
        *slash = '\0';
        if (sr_units_parse(slash + 1, SR_Q_NONE, &pts, &e))
            return text_fail(err, what, &e);
    }
    if (sr_units_parse(a, SR_Q_LENGTH, &lo, &e) || sr_units_parse(b, SR_Q_LENGTH, &hi, &e))
        return text_fail(err, what, &e);
    if (set_heights(s, basis, k, lo, hi, pts, &e))
        return text_fail(err, what, &e);
    return SR_OK;
}

int sr_design_set_counts(sr_design_stage *s, const sr_design_basis *b, size_t k, const char *text, const char *what,
                         sr_error *err)
{
    (void)b;
    (void)k;
    sr_error e;
    s->ncounts = 0;
    char buf[256];
    snprintf(buf, sizeof buf, "%s", text);
    char *save = NULL;
    for (char *tok = strtok_r(buf, ",", &save); tok; tok = strtok_r(NULL, ",", &save)) {
        double v;
        if (sr_units_parse(tok, SR_Q_NONE, &v, &e) || add_count(s, v, &e))
            return text_fail(err, what, &e);
    }
    if (!s->ncounts)
        return sr_error_set(err, SR_EINVAL, "%s: give at least one cluster count", what);
    return SR_OK;
}

/* ---- the design: block ---- */

static int yfail(sr_yaml *y, yaml_node_t *n, sr_error *err, const sr_error *e)
{
    return sr_yaml_fail(y, n, err, "%s", e->msg);
}

static int parse_families(sr_design_stage *s, sr_yaml *y, yaml_node_t *n, const sr_catalog *cat, sr_error *err)
{
    sr_error e;
    int rc;
    if (n->type == YAML_SCALAR_NODE) {
        const char *v = (const char *)n->data.scalar.value;
        if (strcmp(v, "all") != 0)
            return sr_yaml_fail(y, n, err, "families: a list of family ids, 'all', or {class: solid}, not '%s'", v);
        return add_class(s, cat, "", &e) ? yfail(y, n, err, &e) : SR_OK;
    }
    if (n->type == YAML_MAPPING_NODE) {
        if ((rc = sr_yaml_check_map(y, n, "families", CLASS_KEYS, CLASS_KEYS, err)))
            return rc;
        char cls[32];
        yaml_node_t *cn = sr_yaml_get(y, n, "class");
        if ((rc = sr_yaml_string(y, cn, cls, sizeof cls, err)))
            return rc;
        return add_class(s, cat, cls, &e) ? yfail(y, cn, err, &e) : SR_OK;
    }
    if (n->type == YAML_SEQUENCE_NODE && sr_yaml_seq_len(n) == 0)
        return sr_yaml_fail(y, n, err, "families: the list is empty; give at least one family");
    if ((rc = sr_yaml_require_seq(y, n, "families", 1, SR_DESIGN_MAX_FAMILIES, err)))
        return rc;
    for (size_t i = 0; i < sr_yaml_seq_len(n); i++) {
        yaml_node_t *f = sr_yaml_seq_at(y, n, i);
        char id[48];
        if ((rc = sr_yaml_string(y, f, id, sizeof id, err)))
            return rc;
        if (add_family(s, cat, id, &e))
            return yfail(y, f, err, &e);
    }
    return SR_OK;
}

static int parse_sizes(sr_design_stage *s, sr_yaml *y, yaml_node_t *n, sr_error *err)
{
    sr_error e;
    int rc;
    if (n->type == YAML_SEQUENCE_NODE) {
        size_t len = sr_yaml_seq_len(n);
        if (len == 0)
            return sr_yaml_fail(y, n, err, "nominal-diameter: the list of sizes is empty");
        if ((rc = sr_yaml_require_seq(y, n, "nominal-diameter", 1, SR_DESIGN_MAX_SIZES, err)))
            return rc;
        double v[SR_DESIGN_MAX_SIZES];
        for (size_t i = 0; i < len; i++) {
            yaml_node_t *x = sr_yaml_seq_at(y, n, i);
            if ((rc = sr_yaml_quantity(y, x, SR_Q_LENGTH, &v[i], err)))
                return rc;
            if (check_diameter(v[i], &e))
                return yfail(y, x, err, &e);
        }
        return set_list(s, v, len, &e) ? yfail(y, n, err, &e) : SR_OK;
    }
    if (n->type != YAML_MAPPING_NODE)
        return sr_yaml_fail(y, n, err, "nominal-diameter: a range {min:, max:} (with step: for sizes you can obtain), "
                                       "or a list of sizes");
    if ((rc = sr_yaml_check_map(y, n, "nominal-diameter", RANGE_KEYS, RANGE_REQ, err)))
        return rc;
    double lo, hi, step = NAN;
    yaml_node_t *ln = sr_yaml_get(y, n, "min"), *hn = sr_yaml_get(y, n, "max"), *sn = sr_yaml_get(y, n, "step");
    if ((rc = sr_yaml_quantity(y, ln, SR_Q_LENGTH, &lo, err)) || (rc = sr_yaml_quantity(y, hn, SR_Q_LENGTH, &hi, err)))
        return rc;
    if (sn && (rc = sr_yaml_quantity(y, sn, SR_Q_LENGTH, &step, err)))
        return rc;
    if (check_diameter(lo, &e))
        return yfail(y, ln, err, &e);
    if (check_diameter(hi, &e))
        return yfail(y, hn, err, &e);
    if (set_range(s, lo, hi, step, &e))
        return yfail(y, lo > hi ? ln : sn && !(step > 0) ? sn : n, err, &e);
    return SR_OK;
}

static int parse_stage_design(sr_design_spec *d, const sr_design_basis *b, size_t k, sr_yaml *y, yaml_node_t *n,
                              const sr_catalog *cat, sr_error *err)
{
    sr_design_stage *s = &d->stage[k];
    sr_error e;
    int rc;
    if ((rc = sr_yaml_check_map(y, n, "a stage's design", DSTAGE_KEYS, NULL, err)))
        return rc;
    yaml_node_t *fn = sr_yaml_get(y, n, "families"), *dn = sr_yaml_get(y, n, "nominal-diameter"),
                *cn = sr_yaml_get(y, n, "count"), *hn = sr_yaml_get(y, n, "deploy-height"),
                *on = sr_yaml_get(y, n, "optional"), *bn = sr_yaml_get(y, n, "bay-volume"),
                *pn = sr_yaml_get(y, n, "packing");
    if (fn && (rc = parse_families(s, y, fn, cat, err)))
        return rc;
    if (dn && (rc = parse_sizes(s, y, dn, err)))
        return rc;
    if (cn) {
        if (cn->type == YAML_SEQUENCE_NODE) {
            if (sr_yaml_seq_len(cn) == 0)
                return sr_yaml_fail(y, cn, err, "count: the list is empty");
            if ((rc = sr_yaml_require_seq(y, cn, "count", 1, SR_DESIGN_MAX_COUNTS, err)))
                return rc;
            for (size_t i = 0; i < sr_yaml_seq_len(cn); i++) {
                yaml_node_t *x = sr_yaml_seq_at(y, cn, i);
                long v;
                if ((rc = sr_yaml_int(y, x, 1, 16, &v, err)))
                    return rc;
                if (add_count(s, (double)v, &e))
                    return yfail(y, x, err, &e);
            }
        } else {
            long v;
            if ((rc = sr_yaml_int(y, cn, 1, 16, &v, err)))
                return rc;
            add_count(s, (double)v, &e);
        }
    }
    if (hn) {
        if ((rc = sr_yaml_check_map(y, hn, "deploy-height", HEIGHT_KEYS, RANGE_REQ, err)))
            return rc;
        double lo, hi, pts = NAN;
        yaml_node_t *ln = sr_yaml_get(y, hn, "min"), *un = sr_yaml_get(y, hn, "max"), *qn = sr_yaml_get(y, hn, "points");
        if ((rc = sr_yaml_quantity(y, ln, SR_Q_LENGTH, &lo, err)) ||
            (rc = sr_yaml_quantity(y, un, SR_Q_LENGTH, &hi, err)))
            return rc;
        if (qn) {
            long p;
            if ((rc = sr_yaml_int(y, qn, 1, SR_DESIGN_MAX_POINTS, &p, err)))
                return rc;
            pts = (double)p;
        }
        if (set_heights(s, b, k, lo, hi, pts, &e))
            return yfail(y, lo > hi ? ln : hn, err, &e);
    }
    if (on && (rc = sr_yaml_bool(y, on, &s->optional, err)))
        return rc;
    if (bn) {
        if ((rc = sr_yaml_quantity(y, bn, SR_Q_VOLUME, &s->bay, err)))
            return rc;
        if (!(s->bay > 0.0 && s->bay <= 10.0))
            return sr_yaml_fail(y, bn, err, "bay-volume must lie above 0 and at most 10 m3");
    }
    if (pn) {
        char v[32];
        sr_pack_kind pk;
        if ((rc = sr_yaml_string(y, pn, v, sizeof v, err)))
            return rc;
        if (sr_pack_parse(v, &pk))
            return sr_yaml_fail(y, pn, err, "packing must be hand, machine or pressure, not '%s'", v);
        s->packing = (int)pk;
    }
    if (sr_design_check_stage(s, b, k, &e))
        return sr_yaml_fail(y, n, err, "%s", e.msg);
    return SR_OK;
}

int sr_mission_parse_design(sr_design_spec *d, sr_yaml *y, yaml_node_t *n, const sr_design_basis *b,
                            const sr_catalog *cat, sr_error *err)
{
    sr_design_spec_init(d);
    if (!n)
        return SR_OK;
    int rc;
    if ((rc = sr_yaml_check_map(y, n, "design", DESIGN_KEYS, NULL, err)))
        return rc;
    d->given = 1;
    yaml_node_t *on = sr_yaml_get(y, n, "objective"), *pn = sr_yaml_get(y, n, "packing"),
                *gn = sr_yaml_get(y, n, "grid"), *hn = sr_yaml_get(y, n, "heights"), *sn = sr_yaml_get(y, n, "stages");
    char v[32];
    if (on) {
        if ((rc = sr_yaml_string(y, on, v, sizeof v, err)))
            return rc;
        if (sr_design_objective_parse(v, &d->objective))
            return sr_yaml_fail(y, on, err, "objective must be mass (the lightest), volume (the smallest packed) or "
                                            "drift (the least drift), not '%s'",
                                v);
    }
    if (pn) {
        if ((rc = sr_yaml_string(y, pn, v, sizeof v, err)))
            return rc;
        if (sr_pack_parse(v, &d->packing))
            return sr_yaml_fail(y, pn, err, "packing must be hand, machine or pressure, not '%s'", v);
    }
    long g;
    if (gn) {
        if ((rc = sr_yaml_int(y, gn, 2, 64, &g, err)))
            return rc;
        d->grid = (size_t)g;
    }
    if (hn) {
        if ((rc = sr_yaml_int(y, hn, 1, SR_DESIGN_MAX_POINTS, &g, err)))
            return rc;
        d->heights = (size_t)g;
    }
    if (!sn)
        return SR_OK;
    const char *names[SR_DESIGN_MAX_STAGES + 1];
    for (size_t k = 0; k < b->nstages; k++)
        names[k] = b->stage[k].name;
    names[b->nstages] = NULL;
    if ((rc = sr_yaml_check_map(y, sn, "design stages (keys are stage names)", names, NULL, err)))
        return rc;
    for (size_t k = 0; k < b->nstages; k++) {
        yaml_node_t *x = sr_yaml_get(y, sn, b->stage[k].name);
        if (x && (rc = parse_stage_design(d, b, k, y, x, cat, err)))
            return rc;
    }
    return SR_OK;
}
