/* canopy.c - reference-area bookkeeping for canopies and clusters. */
#include "physics/canopy.h"

#include <math.h>
#include <stdio.h>
#include <string.h>
#include <stdlib.h>

#define PI 3.14159265358979323846

const char *sr_ref_name(sr_ref ref)
{
    switch (ref) {
    case SR_REF_NOMINAL: return "nominal";
    case SR_REF_PROJECTED: return "projected";
    case SR_REF_CONSTRUCTED: return "constructed";
    }
    return "?";
}

int sr_ref_parse(const char *s, sr_ref *ref)
{
    if (strcmp(s, "nominal") == 0)
        *ref = SR_REF_NOMINAL;
    else if (strcmp(s, "projected") == 0)
        *ref = SR_REF_PROJECTED;
    else if (strcmp(s, "constructed") == 0 || strcmp(s, "flat") == 0)
        *ref = SR_REF_CONSTRUCTED;
    else
        return SR_EINVAL;
    return SR_OK;
}

const char *sr_size_kind_name(sr_size_kind k)
{
    switch (k) {
    case SR_SIZE_NOMINAL_DIAMETER: return "nominal diameter";
    case SR_SIZE_PROJECTED_DIAMETER: return "projected diameter";
    case SR_SIZE_FLAT_DIAMETER: return "flat (constructed) diameter";
    case SR_SIZE_NOMINAL_AREA: return "nominal area";
    }
    return "?";
}

static const char *const FV_KEY[SR_FV_COUNT_] = {"drag-coefficient", "projected-ratio", "constructed-ratio",
                                                 "opening-factor",   "filling-constant", "oscillation",
                                                 "mach-limit",       "areal-mass",       "growth-exponent"};
static const char *const FV_LABEL[SR_FV_COUNT_] = {"CD0 on nominal area",   "Dp/D0",       "Dc/D0",
                                                   "opening-load factor CX", "filling constant n", "oscillation",
                                                   "Mach limit of usual use", "areal mass", "growth exponent n"};

const char *sr_family_value_key(sr_family_value v)
{
    return (unsigned)v < SR_FV_COUNT_ ? FV_KEY[v] : "?";
}

const char *sr_family_value_label(sr_family_value v)
{
    return (unsigned)v < SR_FV_COUNT_ ? FV_LABEL[v] : "?";
}

double sr_canopy_cluster_factor(int n)
{
    /* from memory: see canopy.h */
    if (n <= 1)
        return 1.0;
    if (n == 2)
        return 0.97;
    if (n == 3)
        return 0.93;
    return 0.90;
}

double sr_canopy_d0_from_s0(double s0)
{
    return sqrt(4.0 * s0 / PI);
}

double sr_canopy_s0_from_d0(double d0)
{
    return PI * d0 * d0 / 4.0;
}

/* Ratio band of a reference diameter to D0 (1 for nominal). */
static sr_band ratio_of(const sr_family *f, sr_ref ref)
{
    sr_band one = {1, 1, 1};
    if (ref == SR_REF_PROJECTED)
        return f->dp_d0;
    if (ref == SR_REF_CONSTRUCTED)
        return f->dc_d0;
    return one;
}

double sr_canopy_cd_on(const sr_family *fam, double cd0, sr_ref ref)
{
    double r = ratio_of(fam, ref).typ;
    return cd0 / (r * r);
}

static void recompute(sr_canopy *c)
{
    c->d0.lo = sr_canopy_d0_from_s0(c->s0.lo);
    c->d0.typ = sr_canopy_d0_from_s0(c->s0.typ);
    c->d0.hi = sr_canopy_d0_from_s0(c->s0.hi);
}

int sr_canopy_from_size(sr_canopy *c, const sr_family *fam, sr_size_kind kind, double value, sr_error *err)
{
    memset(c, 0, sizeof *c);
    c->fam = *fam;
    c->count = 1;
    c->cluster_factor = 1.0;
    c->areal_mass = fam->areal_mass;
    if (!isfinite(value) || value <= 0.0)
        return sr_error_set(err, SR_EINVAL, "the canopy %s must be a positive number (got %g)",
                            sr_size_kind_name(kind), value);
    double maxlen = SR_CANOPY_SIZE_MAX, minlen = SR_CANOPY_SIZE_MIN;
    if ((kind == SR_SIZE_NOMINAL_AREA && value > maxlen * maxlen) || (kind != SR_SIZE_NOMINAL_AREA && value > maxlen))
        return sr_error_set(err, SR_EINVAL, "a canopy %s of %g %s is beyond any canopy built; check the unit",
                            sr_size_kind_name(kind), value, kind == SR_SIZE_NOMINAL_AREA ? "m2" : "m");
    if ((kind == SR_SIZE_NOMINAL_AREA && value < minlen * minlen) || (kind != SR_SIZE_NOMINAL_AREA && value < minlen))
        return sr_error_set(err, SR_EINVAL, "a canopy %s of %g %s is below any canopy built; check the unit",
                            sr_size_kind_name(kind), value, kind == SR_SIZE_NOMINAL_AREA ? "m2" : "m");
    c->size_kind = kind;
    c->size_value = value;
    sr_band r = {1, 1, 1};
    double d = value;
    switch (kind) {
    case SR_SIZE_NOMINAL_AREA:
        d = sr_canopy_d0_from_s0(value);
        break;
    case SR_SIZE_NOMINAL_DIAMETER:
        break;
    case SR_SIZE_PROJECTED_DIAMETER:
        r = fam->dp_d0;
        break;
    case SR_SIZE_FLAT_DIAMETER:
        r = fam->dc_d0;
        break;
    }
    /* a larger ratio means a smaller canopy for the same reference diameter */
    c->s0.lo = sr_canopy_s0_from_d0(d / r.hi);
    c->s0.typ = sr_canopy_s0_from_d0(d / r.typ);
    c->s0.hi = sr_canopy_s0_from_d0(d / r.lo);
    if (kind == SR_SIZE_NOMINAL_AREA)
        c->s0.lo = c->s0.typ = c->s0.hi = value;
    recompute(c);
    c->cd = fam->cd0;
    snprintf(c->cd_source, sizeof c->cd_source, "%s", fam->cd0_source);
    c->cds.lo = fam->cd0.v.lo * c->s0.lo;
    c->cds.typ = fam->cd0.v.typ * c->s0.typ;
    c->cds.hi = fam->cd0.v.hi * c->s0.hi;
    return SR_OK;
}

static sr_ref ref_of_size(sr_size_kind k)
{
    switch (k) {
    case SR_SIZE_PROJECTED_DIAMETER: return SR_REF_PROJECTED;
    case SR_SIZE_FLAT_DIAMETER: return SR_REF_CONSTRUCTED;
    default: return SR_REF_NOMINAL;
    }
}

int sr_canopy_set_measured_cd(sr_canopy *c, double cd, sr_ref ref, const char *source, sr_error *err)
{
    sr_band b = {cd, cd, cd};
    return sr_canopy_set_measured_band(c, b, ref, source, err);
}

int sr_canopy_set_measured_band(sr_canopy *c, sr_band cd, sr_ref ref, const char *source, sr_error *err)
{
    const double v[3] = {cd.lo, cd.typ, cd.hi};
    for (int k = 0; k < 3; k++)
        if (!isfinite(v[k]) || v[k] <= 0.0 || v[k] > 3.0)
            return sr_error_set(err, SR_EINVAL,
                                "measured drag coefficient %g is outside 0 .. 3 (on %s area); check the reference", v[k],
                                sr_ref_name(ref));
    if (!(cd.lo <= cd.typ && cd.typ <= cd.hi))
        return sr_error_set(err, SR_EINVAL, "measured drag coefficient band %g / %g / %g is not ordered low <= value "
                                            "<= high", cd.lo, cd.typ, cd.hi);
    c->measured = 1;
    c->cd.v = cd;
    c->cd.ref = ref;
    snprintf(c->cd_source, sizeof c->cd_source, "%s", source ? source : "measured");
    /* area on the coefficient's reference, from the size as given */
    sr_ref given = ref_of_size(c->size_kind);
    double dgiven = c->size_kind == SR_SIZE_NOMINAL_AREA ? sr_canopy_d0_from_s0(c->size_value) : c->size_value;
    if (given == ref) {
        double s = sr_canopy_s0_from_d0(dgiven);
        c->cds.lo = cd.lo * s;
        c->cds.typ = cd.typ * s;
        c->cds.hi = cd.hi * s;
        return SR_OK;
    }
    /* convert: D_ref = D0 * ratio_ref, D0 from the given size */
    sr_band rr = ratio_of(&c->fam, ref);
    double lo = cd.lo * sr_canopy_s0_from_d0(c->d0.lo * rr.lo);
    double hi = cd.hi * sr_canopy_s0_from_d0(c->d0.hi * rr.hi);
    c->cds.lo = fmin(lo, hi);
    c->cds.hi = fmax(lo, hi);
    c->cds.typ = cd.typ * sr_canopy_s0_from_d0(c->d0.typ * rr.typ);
    return SR_OK;
}

int sr_canopy_set_cluster(sr_canopy *c, int n, double factor, sr_error *err)
{
    if (n < 1 || n > 16)
        return sr_error_set(err, SR_EINVAL, "cluster count %d is outside 1 .. 16", n);
    if (isnan(factor))
        factor = sr_canopy_cluster_factor(n);
    if (!(factor > 0.5 && factor <= 1.0))
        return sr_error_set(err, SR_EINVAL, "cluster drag factor %g is outside 0.5 .. 1", factor);
    c->count = n;
    c->cluster_factor = factor;
    return SR_OK;
}

sr_band sr_canopy_total_cds(const sr_canopy *c)
{
    double k = c->count * c->cluster_factor;
    sr_band b = {c->cds.lo * k, c->cds.typ * k, c->cds.hi * k};
    return b;
}

sr_band sr_canopy_cd0_band(const sr_canopy *c)
{
    if (!c->measured)
        return c->fam.cd0.v;
    sr_band ratio = {1, 1, 1};
    if (c->cd.ref == SR_REF_PROJECTED)
        ratio = c->fam.dp_d0;
    else if (c->cd.ref == SR_REF_CONSTRUCTED)
        ratio = c->fam.dc_d0;
    double v = c->cd.v.typ;
    sr_band b = {v * ratio.lo * ratio.lo, v * ratio.typ * ratio.typ, v * ratio.hi * ratio.hi};
    return b;
}

/* ---- families and canopies of a program (include/sinkrate/physics.h) ---- */

const char *sr_family_id(const sr_family *f)
{
    return f->id;
}

const char *sr_family_name(const sr_family *f)
{
    return f->name;
}

const char *sr_family_class(const sr_family *f)
{
    return f->cls;
}

static sr_band one(double v)
{
    sr_band b = {v, v, v};
    return b;
}

sr_band sr_family_band(const sr_family *f, sr_family_value v)
{
    switch (v) {
    case SR_FV_DRAG: return f->cd0.v;
    case SR_FV_PROJECTED: return f->dp_d0;
    case SR_FV_CONSTRUCTED: return f->dc_d0;
    case SR_FV_OPENING: return f->cx;
    case SR_FV_FILLING: return one(f->fill_n);
    case SR_FV_OSCILLATION: return f->oscillation;
    case SR_FV_MACH: return one(f->mach_max);
    case SR_FV_AREAL: return one(f->areal_mass);
    case SR_FV_GROWTH: return f->growth;
    default: return one(NAN);
    }
}

const char *sr_family_source(const sr_family *f, sr_family_value v)
{
    switch (v) {
    case SR_FV_DRAG: return f->cd0_source;
    case SR_FV_PROJECTED: return f->dp_source;
    case SR_FV_CONSTRUCTED: return f->dc_source;
    case SR_FV_OPENING: return f->cx_source;
    case SR_FV_FILLING: return f->fill_source;
    case SR_FV_OSCILLATION: return f->osc_source;
    case SR_FV_MACH: return f->mach_source;
    case SR_FV_AREAL: return f->areal_source;
    case SR_FV_GROWTH: return f->growth_source;
    default: return "";
    }
}

int sr_canopy_new(sr_canopy **out, const sr_family *f, sr_size_kind kind, double value, sr_error *err)
{
    *out = NULL;
    /* no family: most often sr_catalog_find failed just before, and its error stands */
    if (!f)
        return err && err->code ? err->code : sr_error_set(err, SR_EINVAL, "no canopy family given");
    sr_canopy *c = malloc(sizeof *c);
    if (!c)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_canopy_from_size(c, f, kind, value, err);
    if (rc) {
        free(c);
        return rc;
    }
    *out = c;
    return SR_OK;
}

int sr_canopy_dup(sr_canopy **out, const sr_canopy *src, sr_error *err)
{
    /* a canopy holds no memory of its own: a copy is a copy of the struct */
    *out = malloc(sizeof **out);
    if (!*out)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    **out = *src;
    return SR_OK;
}

void sr_canopy_free(sr_canopy *c)
{
    free(c);
}

const sr_family *sr_canopy_family(const sr_canopy *c)
{
    return &c->fam;
}

int sr_canopy_count(const sr_canopy *c)
{
    return c->count;
}

sr_band sr_canopy_nominal_area(const sr_canopy *c)
{
    return c->s0;
}

sr_band sr_canopy_nominal_diameter(const sr_canopy *c)
{
    return c->d0;
}
