/* freefall.c - a program's falling body (include/sinkrate/physics.h): a
 * body and its drag curve in one handle, over the bluff module's models. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "physics/bluff.h"

struct sr_freefall {
    sr_bluff_curve curve;
    sr_bluff_body body;   /* body.curve points at curve */
};

static int finish(sr_freefall **out, sr_freefall *f, int rc)
{
    if (rc) {
        sr_freefall_free(f);
        return rc;
    }
    *out = f;
    return SR_OK;
}

int sr_freefall_new(sr_freefall **out, sr_bluff_shape shape, const char *curve, double d, double length,
                    double mass, sr_error *err)
{
    sr_error_gsl_off();
    *out = NULL;
    if (shape == SR_BLUFF_TABLE)
        return sr_error_set(err, SR_EINVAL, "a body on a table of its own: sr_freefall_new_table");
    sr_bluff_curve_id id = sr_bluff_default_curve(shape);
    int rc = curve ? sr_bluff_curve_lookup(curve, &id, err) : SR_OK;
    if (rc)
        return rc;
    sr_freefall *f = calloc(1, sizeof *f);
    if (!f)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    rc = sr_bluff_curve_init(&f->curve, id, err);
    if (!rc)
        rc = sr_bluff_body_init(&f->body, shape, &f->curve, d, length, mass, NAN, err);
    return finish(out, f, rc);
}

int sr_freefall_new_table(sr_freefall **out, const double *re, const double *cd, size_t n, double d, double area,
                          double mass, sr_error *err)
{
    sr_error_gsl_off();
    *out = NULL;
    sr_freefall *f = calloc(1, sizeof *f);
    if (!f)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    int rc = sr_bluff_curve_table(&f->curve, re, cd, n, SR_BLUFF_LOGLOG, "drag table", err);
    if (!rc)
        rc = sr_bluff_body_init(&f->body, SR_BLUFF_TABLE, &f->curve, d, 0.0, mass, area, err);
    return finish(out, f, rc);
}

void sr_freefall_free(sr_freefall *f)
{
    if (!f)
        return;
    sr_bluff_curve_free(&f->curve);
    free(f);
}

double sr_freefall_cd(const sr_freefall *f, double re)
{
    return sr_bluff_body_cd(&f->body, re, NULL);
}

int sr_freefall_speeds(const sr_freefall *f, const sr_air *air, double *v, size_t cap, size_t *n, sr_error *err)
{
    sr_bluff_equilibria eq;
    *n = 0;
    int rc = sr_bluff_equilibria_find(&f->body, air, &eq, err);
    if (rc)
        return rc;
    for (size_t i = 0; i < eq.n && i < cap; i++)
        v[i] = eq.root[i].v;
    *n = eq.n;
    return SR_OK;
}

int sr_freefall_terminal(const sr_freefall *f, const sr_air *air, double *v, sr_error *err)
{
    sr_bluff_equilibria eq;
    int rc = sr_bluff_equilibria_find(&f->body, air, &eq, err);
    if (rc)
        return rc;
    if (eq.n == 0)
        return sr_error_set(err, SR_EIMPOSSIBLE, "no speed at which the drag of the body equals its weight");
    *v = eq.root[eq.n - 1].v;
    return SR_OK;
}
