/* descent.c - equilibrium descent rate and the exact sizing inversion
 * (Knacke 1991, NWC TP 6575, sec. 4.5: drag equals weight in steady descent). */
#include "physics/descent.h"

#include <math.h>

double sr_descent_speed(double mass, double g, double rho, double cds)
{
    return sqrt(2.0 * mass * g / (rho * cds));
}

int sr_descent_rate(const sr_canopy *c, double mass, double body_cds, const sr_air *air, sr_band *v,
                    sr_error *err)
{
    if (!(mass > 0.0) || !isfinite(mass))
        return sr_error_set(err, SR_EINVAL, "mass must be positive (got %g kg)", mass);
    if (!(body_cds >= 0.0))
        return sr_error_set(err, SR_EINVAL, "body drag area must be zero or positive (got %g m2)", body_cds);
    sr_band cds = sr_canopy_total_cds(c);
    double k = c->count;
    double m[3] = {mass, mass, mass};
    if (c->areal_mass > 0.0) {
        /* the fabric of a bigger canopy weighs more: pair the band ends */
        m[0] += k * c->areal_mass * c->s0.hi;
        m[1] += k * c->areal_mass * c->s0.typ;
        m[2] += k * c->areal_mass * c->s0.lo;
    }
    v->lo = sr_descent_speed(m[0], air->g, air->rho, cds.hi + body_cds);
    v->typ = sr_descent_speed(m[1], air->g, air->rho, cds.typ + body_cds);
    v->hi = sr_descent_speed(m[2], air->g, air->rho, cds.lo + body_cds);
    return SR_OK;
}

static int size_one(const sr_size_request *r, double cd, double *s0, sr_error *err)
{
    double q = 0.5 * r->rho * r->speed * r->speed;
    double num = r->mass * r->g - r->body_cds * q;
    double den = r->count * (r->cluster_factor * cd * q - r->areal_mass * r->g);
    if (num <= 0.0)
        return sr_error_set(err, SR_EIMPOSSIBLE,
                            "the payload's own drag already holds it to %.3g m/s or less; no canopy is needed",
                            r->speed);
    if (den <= 0.0)
        return sr_error_set(err, SR_EIMPOSSIBLE,
                            "no canopy size reaches %.3g m/s: at that speed a canopy of this family weighs more "
                            "than the drag it makes (areal mass %.3g g/m2)",
                            r->speed, r->areal_mass * 1e3);
    *s0 = num / den;
    return SR_OK;
}

int sr_descent_size(const sr_size_request *r, sr_size_result *res, sr_error *err)
{
    if (!(r->mass > 0.0) || !isfinite(r->mass))
        return sr_error_set(err, SR_EINVAL, "mass must be positive (got %g kg)", r->mass);
    if (!(r->speed > 0.0) || !isfinite(r->speed))
        return sr_error_set(err, SR_EINVAL, "target speed must be positive (got %g m/s)", r->speed);
    if (!(r->rho > 0.0) || !(r->g > 0.0))
        return sr_error_set(err, SR_EINVAL, "air density and gravity must be positive");
    if (r->count < 1)
        return sr_error_set(err, SR_EINVAL, "cluster count must be at least 1");
    if (!(r->cd0.lo > 0.0 && r->cd0.lo <= r->cd0.typ && r->cd0.typ <= r->cd0.hi))
        return sr_error_set(err, SR_EINVAL, "drag coefficient band must satisfy 0 < low <= typical <= high");
    int rc;
    /* high drag coefficient -> smaller canopy */
    if ((rc = size_one(r, r->cd0.hi, &res->s0.lo, err)) || (rc = size_one(r, r->cd0.typ, &res->s0.typ, err)) ||
        (rc = size_one(r, r->cd0.lo, &res->s0.hi, err)))
        return rc;
    res->d0.lo = sr_canopy_d0_from_s0(res->s0.lo);
    res->d0.typ = sr_canopy_d0_from_s0(res->s0.typ);
    res->d0.hi = sr_canopy_d0_from_s0(res->s0.hi);
    /* the same bounds a given size must meet (sr_canopy_from_size): outside them the answer
     * is no canopy at all, usually a unit slip in mass or speed */
    if (res->d0.lo < SR_CANOPY_SIZE_MIN || res->d0.hi > SR_CANOPY_SIZE_MAX)
        return sr_error_set(err, SR_EIMPOSSIBLE,
                            "no canopy fits: the nominal diameter needed, %.3g m .. %.3g m, is outside any canopy "
                            "built (%g cm .. %g m); check the mass and the target speed",
                            res->d0.lo, res->d0.hi, SR_CANOPY_SIZE_MIN * 100.0, SR_CANOPY_SIZE_MAX);
    res->canopy_mass.lo = r->count * r->areal_mass * res->s0.lo;
    res->canopy_mass.typ = r->count * r->areal_mass * res->s0.typ;
    res->canopy_mass.hi = r->count * r->areal_mass * res->s0.hi;
    double mt = r->mass + res->canopy_mass.typ;
    res->cds_total = 2.0 * mt * r->g / (r->rho * r->speed * r->speed);
    return SR_OK;
}

int sr_descent_size_canopy(const sr_canopy *c, double mass, double speed, double body_cds, const sr_air *air,
                           sr_size_result *res, sr_error *err)
{
    sr_size_request req = {.mass = mass,
                           .speed = speed,
                           .rho = air->rho,
                           .g = air->g,
                           .count = c->count,
                           .cluster_factor = c->cluster_factor,
                           .areal_mass = c->areal_mass > 0.0 ? c->areal_mass : 0.0,
                           .body_cds = body_cds,
                           .cd0 = sr_canopy_cd0_band(c)};
    return sr_descent_size(&req, res, err);
}

double sr_descent_drop_height(double v, double g)
{
    return v * v / (2.0 * g);
}
