/* sizing.c - canopy size for a target speed, with its diameters, energy and
 * the rate of the typical size higher up. */
#include "analysis/sizing.h"

#include <math.h>
#include <string.h>

/* the bounds sr_canopy_from_size puts on a given size */
#define D0_MIN 0.01
#define D0_MAX 200.0

int sr_sizing_run(const sr_sizing_request *req, sr_sizing_result *out, sr_error *err)
{
    memset(out, 0, sizeof *out);
    const sr_canopy *cp = req->canopy;
    int rc;
    if ((rc = sr_atmos_at(req->atmos, req->altitude, &out->air, err)))
        return rc;
    /* the drag band on nominal area: from the family, or a measured value converted */
    sr_band cd0 = cp->fam.cd0.v;
    if (cp->measured) {
        sr_band ratio = {1, 1, 1};
        if (cp->cd.ref == SR_REF_PROJECTED)
            ratio = cp->fam.dp_d0;
        else if (cp->cd.ref == SR_REF_CONSTRUCTED)
            ratio = cp->fam.dc_d0;
        double v = cp->cd.v.typ;
        cd0.lo = v * ratio.lo * ratio.lo;
        cd0.typ = v * ratio.typ * ratio.typ;
        cd0.hi = v * ratio.hi * ratio.hi;
        out->cd0_converted = cp->cd.ref != SR_REF_NOMINAL;
    }
    out->cd0 = cd0;
    sr_size_request sq = {.mass = req->mass,
                          .speed = req->speed,
                          .rho = out->air.rho,
                          .g = out->air.g,
                          .count = cp->count,
                          .cluster_factor = cp->cluster_factor,
                          .areal_mass = cp->areal_mass > 0 ? cp->areal_mass : 0.0,
                          .body_cds = req->body_cds,
                          .cd0 = cd0};
    if ((rc = sr_descent_size(&sq, &out->size, err)))
        return rc;
    if (out->size.d0.lo < D0_MIN || out->size.d0.hi > D0_MAX)
        return sr_error_set(err, SR_EIMPOSSIBLE,
                            "no canopy fits: the nominal diameter needed, %.3g m .. %.3g m, is outside any canopy "
                            "built (1 cm .. 200 m)",
                            out->size.d0.lo, out->size.d0.hi);
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
    typ.areal_mass = sq.areal_mass;
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
