/* sizing.c - canopy size for a target speed, with its diameters, energy and
 * the rate of the typical size higher up. */
#include "analysis/sizing.h"

#include <math.h>
#include <stdlib.h>
#include <string.h>

int sr_sizing_run(const sr_sizing_request *req, sr_sizing_result *out, sr_error *err)
{
    memset(out, 0, sizeof *out);
    const sr_canopy *cp = req->canopy;
    int rc;
    if ((rc = sr_atmos_at(req->atmos, req->altitude, &out->air, err)))
        return rc;
    /* the drag band on nominal area and the inversion: the functions `sweep --vary speed` uses too */
    sr_band cd0 = sr_canopy_cd0_band(cp);
    out->cd0 = cd0;
    out->cd0_converted = cp->measured && cp->cd.ref != SR_REF_NOMINAL;
    if ((rc = sr_descent_size_canopy(cp, req->mass, req->speed, req->body_cds, &out->air, &out->size, err)))
        return rc;
    const sr_band *d0 = &out->size.d0, *dp = &cp->fam.dp_d0, *dc = &cp->fam.dc_d0;
    out->dp = (sr_band){d0->lo * dp->lo, d0->typ * dp->typ, d0->hi * dp->hi};
    out->dc = (sr_band){d0->lo * dc->lo, d0->typ * dc->typ, d0->hi * dc->hi};
    out->energy = 0.5 * (req->mass + out->size.canopy_mass.typ) * req->speed * req->speed;
    /* the typical size higher up */
    sr_canopy typ;
    sr_error e;
    if (sr_canopy_from_size(&typ, &cp->fam, SR_SIZE_NOMINAL_AREA, out->size.s0.typ, &e) != SR_OK)
        return SR_OK;
    typ.cd.v = cd0;
    typ.cds.lo = cd0.lo * out->size.s0.typ;
    typ.cds.typ = cd0.typ * out->size.s0.typ;
    typ.cds.hi = cd0.hi * out->size.s0.typ;
    typ.count = cp->count;
    typ.cluster_factor = cp->cluster_factor;
    typ.areal_mass = cp->areal_mass > 0 ? cp->areal_mass : 0.0;
    static const double DZ[SR_SIZING_RATES] = {0, 500, 1000, 2000, 3000, 5000};
    for (size_t i = 0; i < SR_SIZING_RATES; i++) {
        sr_air a;
        sr_band v;
        if (sr_atmos_at(req->atmos, req->altitude + DZ[i], &a, NULL) ||
            sr_descent_rate(&typ, req->mass, req->body_cds, &a, &v, NULL))
            break;
        out->rate_altitude[i] = req->altitude + DZ[i];
        out->rate_density[i] = a.rho;
        out->rate[i] = v;
        out->nrates = i + 1;
    }
    return SR_OK;
}

sr_sizing_fit sr_sizing_compare(const sr_sizing_result *res, const sr_canopy *given)
{
    if (given->s0.lo >= res->size.s0.hi)
        return SR_SIZING_FITS_BAND;
    if (given->s0.typ >= res->size.s0.typ)
        return SR_SIZING_FITS_TYPICAL;
    return SR_SIZING_TOO_SMALL;
}

/* ---- a program's sizing (include/sinkrate/analysis.h) ---- */

int sr_sizing_new(sr_sizing_result **out, const sr_canopy *c, double mass, double speed, double body_cds,
                  const sr_atmos *atmos, double altitude, sr_error *err)
{
    *out = NULL;
    sr_sizing_result *s = malloc(sizeof *s);
    if (!s)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    sr_sizing_request req = {.canopy = c, .mass = mass, .speed = speed, .body_cds = body_cds, .atmos = atmos,
                             .altitude = altitude};
    int rc = sr_sizing_run(&req, s, err);
    if (rc) {
        free(s);
        return rc;
    }
    *out = s;
    return SR_OK;
}

void sr_sizing_free(sr_sizing_result *s)
{
    free(s);
}

sr_band sr_sizing_nominal_area(const sr_sizing_result *s)
{
    return s->size.s0;
}

sr_band sr_sizing_nominal_diameter(const sr_sizing_result *s)
{
    return s->size.d0;
}

sr_band sr_sizing_projected_diameter(const sr_sizing_result *s)
{
    return s->dp;
}

sr_band sr_sizing_flat_diameter(const sr_sizing_result *s)
{
    return s->dc;
}

sr_band sr_sizing_canopy_mass(const sr_sizing_result *s)
{
    return s->size.canopy_mass;
}

sr_band sr_sizing_cd0(const sr_sizing_result *s)
{
    return s->cd0;
}

double sr_sizing_energy(const sr_sizing_result *s)
{
    return s->energy;
}

const sr_air *sr_sizing_air(const sr_sizing_result *s)
{
    return &s->air;
}
