/* opening.c - opening loads: filling time, the opening-load-factor method
 * (X1 from the ballistic mass ratio), the Pflanz closed form and the inflation
 * ODE (GSL adaptive Runge-Kutta, peak by sign change of dF/dt + Brent).
 *
 * One drag-area growth model underlies all three (K91 Pflanz method, the
 * handbook reference file section 4.2): (CD S)(t) = CD0 S0 (t/t_f)^n for
 * 0 <= t <= t_f, CD0 S0 afterwards. The opening-load factor CX multiplies the
 * model's force in every method (F = CD0 S0 q1 CX X1, section 4.1): it stands
 * for the brief over-inflation that the smooth growth law does not resolve, so
 * it is applied to the reported force, not to the equations of motion
 * (applying it there too would count it twice against the speed loss). */
#include "physics/opening.h"

#include <math.h>
#include <string.h>

#include <gsl/gsl_errno.h>
#include <gsl/gsl_odeiv2.h>
#include <gsl/gsl_roots.h>

#include "physics/plausible.h"
#include "physics/units.h"

#ifndef M_PI
#define M_PI 3.14159265358979323846
#endif

/* Plausible CD0 on nominal area: the catalog's solid, slotted and rotating
 * families span about 0.28 to 1.8 (handbook reference file section 2, from
 * memory); far outside it the drag area is almost surely on another reference. */
#define CD0_MIN 0.05
#define CD0_MAX 3.0
/* The filling constants a family file accepts (catalog.c); beyond them the
 * filling time is no longer a canopy's. */
#define FILL_MIN 0.5
#define FILL_MAX 50.0
/* Design factors and cluster allowances are a few units (common practice);
 * our bound keeps a typo (1e9) from becoming a printed strength. */
#define FACTOR_MAX 10.0

void sr_opening_input_init(sr_opening_input *in)
{
    memset(in, 0, sizeof *in);
    in->cds0 = in->d0 = in->mass = in->v1 = NAN;
    in->rho = in->a = in->n_fill = in->cx = NAN;
    in->count = 1;
    in->path_angle = M_PI / 2;
    in->g = SR_G0;
    in->exponent = 2.0;
    in->v_steady = NAN;
}

double sr_opening_class_exponent(sr_opening_class c)
{
    /* From memory (K91 Pflanz curves for n = 1/2, 1, 2): handbook reference file section 4.2. */
    switch (c) {
    case SR_OPENING_SLOTTED: return 1.0;
    case SR_OPENING_REEFED: return 0.5;
    case SR_OPENING_SOLID:
    default: return 2.0;
    }
}

void sr_opening_class_band(sr_opening_class c, double *lo, double *typ, double *hi)
{
    /* n = 2 solid and n = 1 slotted are the values commonly used; fits to drop
     * tests spread about 0.5 .. 3 (from memory, trade-facts.md section 6) */
    switch (c) {
    case SR_OPENING_SLOTTED: *lo = 0.5, *typ = 1.0, *hi = 2.0; return;
    case SR_OPENING_REEFED: *lo = 0.5, *typ = 0.5, *hi = 1.0; return;
    case SR_OPENING_SOLID:
    default: *lo = 1.0, *typ = 2.0, *hi = 3.0; return;
    }
}

/* The steady rate the filling time falls back on: the caller's, or the full
 * canopies' own with the mass they decelerate (0 without gravity). */
static double steady_of(const sr_opening_input *in)
{
    if (isfinite(in->v_steady) && in->v_steady > 0)
        return in->v_steady;
    if (!(in->g > 0))
        return 0;
    return sqrt(2 * in->mass * in->g / (in->rho * in->count * in->cds0));
}

int sr_opening_fill_time(double n_fill, double d0, double v1, double v_steady, double *t_f, sr_error *err)
{
    if (!(isfinite(n_fill) && n_fill > 0))
        return sr_error_set_key(err, SR_EINVAL, "n_fill", "filling constant must be positive (got %g)", n_fill);
    if (!(isfinite(d0) && d0 > 0))
        return sr_error_set_key(err, SR_EINVAL, "d0", "nominal diameter must be positive (got %g m)", d0);
    /* the law is for deployments at speed: slower than the steady rate, the
     * canopy fills as at that rate (a canopy opening from rest has no speed of
     * its own to fill with) */
    double v = isfinite(v_steady) && v_steady > v1 ? v_steady : v1;
    if (!(isfinite(v1) && v1 >= 0 && isfinite(v) && v > 0))
        return sr_error_set_key(err, SR_EINVAL, "v1", "deployment speed must be positive (got %g m/s)", v1);
    *t_f = n_fill * d0 / v;
    return SR_OK;
}

double sr_opening_mass_ratio(double rho, double cds, double m)
{
    return rho * pow(cds, 1.5) / m;
}

int sr_opening_pflanz_x1(double A, double n, double *x1, double *tau_peak, double *v_ratio, sr_error *err)
{
    if (!(isfinite(A) && A > 0))
        return sr_error_set(err, SR_EINVAL, "ballistic parameter must be positive (got %g)", A);
    if (!(isfinite(n) && n > 0))
        return sr_error_set_key(err, SR_EINVAL, "exponent", "growth exponent must be positive (got %g)", n);
    /* Derived closed form (handbook reference file section 4.2 [D]): with
     * tau = t/t_f, v/v1 = 1/(1 + tau^(n+1)/((n+1)A)) and F/(cds q1) = tau^n (v/v1)^2,
     * whose maximum sits where tau^(n+1) = k = (n+1) A n/(n+2). */
    double k = (n + 1) * A * n / (n + 2);
    double x, tau, vr;
    if (k < 1) {
        double r = (n + 2) / (2 * (n + 1));
        x = pow(k, n / (n + 1)) * r * r;
        tau = pow(k, 1 / (n + 1));
        vr = r;
    } else {
        vr = 1 / (1 + 1 / ((n + 1) * A));
        x = vr * vr;
        tau = 1;
    }
    if (x1)
        *x1 = x;
    if (tau_peak)
        *tau_peak = tau;
    if (v_ratio)
        *v_ratio = vr;
    return SR_OK;
}

int sr_opening_olf_x1(double mass_ratio, double cds, double d0, double n_fill, double *x1, sr_error *err)
{
    if (!(isfinite(mass_ratio) && mass_ratio > 0))
        return sr_error_set(err, SR_EINVAL, "mass ratio must be positive (got %g)", mass_ratio);
    if (!(isfinite(cds) && cds > 0 && isfinite(d0) && d0 > 0 && isfinite(n_fill) && n_fill > 0))
        return sr_error_set_key(err, SR_EINVAL, !(isfinite(n_fill) && n_fill > 0) ? "n_fill" : !(isfinite(cds) && cds > 0) ? "cds0" : "d0",
                                "drag area, nominal diameter and filling constant must be positive");
    /* The handbook reads X1 off one curve against R_m = rho (CD0 S0)^1.5 / m
     * (section 4.1, from memory); that curve is not available to us. With
     * t_f = n_fill D0 / v1 the Pflanz parameter depends on R_m alone for a given
     * canopy: A = 2 m/(cds rho v1 t_f) = 2 sqrt(cds) / (R_m n_fill D0), the speed
     * cancels. Using the canopy's own exponent would merely repeat the Pflanz
     * method, so this method takes the upper envelope of the growth-model
     * curves over the unreefed classes (n = 1 slotted, n = 2 solid): a single,
     * shape-free and deliberately conservative curve, like the handbook's. */
    double A = 2 * sqrt(cds) / (mass_ratio * n_fill * d0);
    double xa, xb;
    int rc = sr_opening_pflanz_x1(A, 1.0, &xa, NULL, NULL, err);
    if (rc == SR_OK)
        rc = sr_opening_pflanz_x1(A, 2.0, &xb, NULL, NULL, err);
    if (rc != SR_OK)
        return rc;
    *x1 = xa > xb ? xa : xb;
    return SR_OK;
}

/* ---- inflation ODE ---------------------------------------------------- */

/* Parameters of one ODE solve (force without CX). */
typedef struct ode_par {
    double S;     /* full drag area of all canopies, m2 */
    double So;    /* drag area open besides them (a drogue kept, the sections), m2 */
    double m;     /* mass, kg */
    double rho;   /* air density, kg/m3 */
    double g;     /* gravity, m/s2 */
    double tf;    /* filling time, s */
    double n;     /* growth exponent */
} ode_par;

static double area_at(const ode_par *p, double t)
{
    if (t >= p->tf)
        return p->S;
    if (t <= 0)
        return 0;
    return p->S * pow(t / p->tf, p->n);
}

/* Growth rate of the drag area; at t_f the left (filling) or right (full) value. */
static double area_rate(const ode_par *p, double t, int right)
{
    if (t > p->tf || (t == p->tf && right) || t <= 0)
        return 0;
    return p->S * p->n * pow(t / p->tf, p->n - 1) / p->tf;
}

/* State (vx, vz), z up: vertical components avoid the 1/v of the
 * speed/path-angle form when a climbing deployment stalls. */
static int rhs(double t, const double y[], double dydt[], void *params)
{
    const ode_par *p = params;
    double v = hypot(y[0], y[1]);
    double c = 0.5 * p->rho * (area_at(p, t) + p->So) * v / p->m;
    dydt[0] = -c * y[0];
    dydt[1] = -c * y[1] - p->g;
    return GSL_SUCCESS;
}

static double force_of(const ode_par *p, double t, const double y[])
{
    return 0.5 * p->rho * (y[0] * y[0] + y[1] * y[1]) * area_at(p, t);
}

/* dF/dt = rho S v.a + 1/2 rho v^2 dS/dt, from the state. */
static double dforce_of(const ode_par *p, double t, const double y[], int right)
{
    double d[2];
    rhs(t, y, d, (void *)p);
    double S = area_at(p, t);
    return p->rho * S * (y[0] * d[0] + y[1] * d[1]) +
           0.5 * p->rho * (y[0] * y[0] + y[1] * y[1]) * area_rate(p, t, right);
}

#define ODE_EPS_REL 1e-10
#define ODE_MAX_STEPS 100000

/* Refinement: dF/dt at time t, integrating afresh from the step start (ta, ya). */
typedef struct refine_ctx {
    const ode_par *p;
    gsl_odeiv2_driver *drv;
    double ta;
    double ya[2];
    double y[2]; /* state at the last evaluation */
    int status;
} refine_ctx;

static int state_at(refine_ctx *c, double t)
{
    c->y[0] = c->ya[0];
    c->y[1] = c->ya[1];
    if (t == c->ta)
        return GSL_SUCCESS;
    double tt = c->ta;
    gsl_odeiv2_driver_reset_hstart(c->drv, t - c->ta);
    return gsl_odeiv2_driver_apply(c->drv, &tt, t, c->y);
}

static double refine_fn(double t, void *params)
{
    refine_ctx *c = params;
    int st = state_at(c, t);
    if (st != GSL_SUCCESS) {
        c->status = st;
        return NAN;
    }
    return dforce_of(c->p, t, c->y, 0);
}

/* Peak of dF/dt's sign change from + (at ta) to - (at tb) by Brent's method;
 * fills the time, force and state at the peak. */
static int refine_peak(refine_ctx *c, double tb, double *tp, double *fp, double yp[2], sr_error *err)
{
    double lo = c->ta, hi = tb, root = tb;
    double ga = dforce_of(c->p, lo, c->ya, 0);
    double gb = refine_fn(hi, c);
    /* At line stretch dF/dt may be 0 (n > 1) although F rises from zero:
     * halve towards it until the lower end is truly rising. */
    for (int k = 0; !(ga > 0) && gb < 0 && k < 200 && c->status == GSL_SUCCESS; k++) {
        double x = lo + 0.5 * (hi - lo);
        double gx = refine_fn(x, c);
        if (gx > 0) {
            lo = x;
            ga = gx;
        } else {
            hi = x;
            gb = gx;
        }
    }
    if (c->status != GSL_SUCCESS)
        return sr_error_set(err, SR_ENUMERIC, "inflation ODE: integration failed while refining the peak (%s)",
                            gsl_strerror(c->status));
    root = hi;
    if (gb < 0 && ga > 0) {
        gsl_function F = {refine_fn, c};
        gsl_root_fsolver *s = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
        if (!s)
            return sr_error_set(err, SR_ENOMEM, "inflation ODE: out of memory");
        int st = gsl_root_fsolver_set(s, &F, lo, hi);
        for (int it = 0; st == GSL_SUCCESS && it < 200; it++) {
            st = gsl_root_fsolver_iterate(s);
            if (st != GSL_SUCCESS)
                break;
            root = gsl_root_fsolver_root(s);
            lo = gsl_root_fsolver_x_lower(s);
            hi = gsl_root_fsolver_x_upper(s);
            if (gsl_root_test_interval(lo, hi, 1e-14 * c->p->tf, 1e-12) == GSL_SUCCESS)
                break;
        }
        gsl_root_fsolver_free(s);
        if (st != GSL_SUCCESS || c->status != GSL_SUCCESS)
            return sr_error_set(err, SR_ENUMERIC, "inflation ODE: the peak search did not converge (%s)",
                                gsl_strerror(c->status != GSL_SUCCESS ? c->status : st));
    }
    if (state_at(c, root) != GSL_SUCCESS)
        return sr_error_set(err, SR_ENUMERIC, "inflation ODE: integration failed at the peak");
    *tp = root;
    *fp = force_of(c->p, root, c->y);
    yp[0] = c->y[0];
    yp[1] = c->y[1];
    return SR_OK;
}

/* Largest force of the ODE from line stretch: every local maximum during
 * filling and the kink at t_f (times CX), and - with gravity - the weight,
 * which the force approaches when the canopy is full below terminal speed
 * (no CX there: a steady canopy does not over-inflate).
 * After t_f no other maximum can exceed both: there dF/dt = 0 needs
 * (rho S / 2m) v^2 = g sin(path angle) <= g, so F <= m g. */
static int ode_peak(const ode_par *p, double v1, double path_angle, double cx, sr_opening_peak *pk,
                    sr_error *err)
{
    gsl_odeiv2_system sys = {rhs, NULL, 2, (void *)p};
    double epsabs = ODE_EPS_REL * v1;
    gsl_odeiv2_step *step = gsl_odeiv2_step_alloc(gsl_odeiv2_step_rk8pd, 2);
    gsl_odeiv2_control *ctl = gsl_odeiv2_control_standard_new(epsabs, ODE_EPS_REL, 1, 0);
    gsl_odeiv2_evolve *ev = gsl_odeiv2_evolve_alloc(2);
    gsl_odeiv2_driver *drv = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, p->tf * 1e-3, epsabs,
                                                           ODE_EPS_REL);
    int rc = SR_OK;
    if (!step || !ctl || !ev || !drv) {
        rc = sr_error_set(err, SR_ENOMEM, "inflation ODE: out of memory");
        goto done;
    }
    gsl_odeiv2_driver_set_nmax(drv, ODE_MAX_STEPS);

    double y[2] = {v1 * cos(path_angle), -v1 * sin(path_angle)};
    double t = 0, h = p->tf * 1e-3;
    double best_f = -1, best_t = NAN, best_v = NAN;
    int best_kind = SR_PEAK_INTERIOR;
    double g_prev = 1; /* F rises from zero at line stretch */
    refine_ctx rc_ctx = {.p = p, .drv = drv, .status = GSL_SUCCESS};
    long steps = 0;
    while (t < p->tf) {
        double ta = t, ya[2] = {y[0], y[1]};
        int st = gsl_odeiv2_evolve_apply(ev, ctl, step, &sys, &t, p->tf, &h, y);
        if (st != GSL_SUCCESS || ++steps > ODE_MAX_STEPS) {
            rc = sr_error_set(err, SR_ENUMERIC, "inflation ODE: integration failed during filling (%s)",
                              st != GSL_SUCCESS ? gsl_strerror(st) : "too many steps");
            goto done;
        }
        double g_now = dforce_of(p, t, y, 0);
        if (g_prev > 0 && g_now <= 0) {
            double tp = 0, fp = 0, yp[2] = {0, 0};
            rc_ctx.ta = ta;
            rc_ctx.ya[0] = ya[0];
            rc_ctx.ya[1] = ya[1];
            if ((rc = refine_peak(&rc_ctx, t, &tp, &fp, yp, err)) != SR_OK)
                goto done;
            if (fp > best_f) {
                best_f = fp;
                best_t = tp;
                best_v = hypot(yp[0], yp[1]);
                best_kind = SR_PEAK_INTERIOR;
            }
        }
        g_prev = g_now;
    }
    /* The kink at full inflation: rising just before, falling just after. */
    double f_full = force_of(p, p->tf, y);
    if (g_prev > 0 && dforce_of(p, p->tf, y, 1) <= 0 && f_full > best_f) {
        best_f = f_full;
        best_t = p->tf;
        best_v = hypot(y[0], y[1]);
        best_kind = SR_PEAK_FULL;
    }
    best_f *= cx;
    if (p->g > 0 && p->m * p->g > best_f) {
        best_f = p->m * p->g;
        best_t = NAN;
        best_v = sqrt(2 * p->m * p->g / (p->rho * p->S));
        best_kind = SR_PEAK_STEADY;
    }
    pk->force = best_f;
    pk->time = best_t;
    pk->speed = best_v;
    pk->kind = best_kind;
done:
    if (drv)
        gsl_odeiv2_driver_free(drv);
    if (ev)
        gsl_odeiv2_evolve_free(ev);
    if (ctl)
        gsl_odeiv2_control_free(ctl);
    if (step)
        gsl_odeiv2_step_free(step);
    return rc;
}

/* ---- input checks ----------------------------------------------------- */

/* key: the field of sr_opening_input, for the error's key */
static int need(double x, const char *key, const char *what, sr_error *err)
{
    if (isnan(x))
        return sr_error_set_key(err, SR_EINVAL, key, "%s is not set", what);
    if (!isfinite(x))
        return sr_error_set_key(err, SR_EINVAL, key, "%s must be finite", what);
    return SR_OK;
}

static int validate(const sr_opening_input *in, sr_error *err)
{
    int rc;
    if ((rc = need(in->cds0, "cds0", "drag area", err)) || (rc = need(in->d0, "d0", "nominal diameter", err)) ||
        (rc = need(in->mass, "mass", "payload mass", err)) || (rc = need(in->v1, "v1", "deployment speed", err)) ||
        (rc = need(in->rho, "rho", "air density", err)) || (rc = need(in->a, "a", "speed of sound", err)) ||
        (rc = need(in->n_fill, "n_fill", "filling constant", err)) ||
        (rc = need(in->cx, "cx", "opening-load factor", err)) ||
        (rc = need(in->path_angle, "path_angle", "flight-path angle", err)) || (rc = need(in->g, "g", "gravity", err)) ||
        (rc = need(in->exponent, "exponent", "growth exponent", err)) ||
        (rc = need(in->design_factor, "design_factor", "design factor", err)) ||
        (rc = need(in->cluster_allowance, "cluster_allowance", "cluster allowance", err)) ||
        (rc = need(in->mach_envelope, "mach_envelope", "Mach envelope", err)))
        return rc;
    if (!isnan(in->v_steady) && !(in->v_steady >= 0 && isfinite(in->v_steady)))
        return sr_error_set_key(err, SR_EINVAL, "v_steady", "steady descent rate must be zero or positive (got %g m/s)",
                                in->v_steady);
    if (!(isfinite(in->cds_other) && in->cds_other >= 0))
        return sr_error_set_key(err, SR_EINVAL, "cds_other", "drag area open besides the canopies must be zero or "
                                "positive (got %g m2)", in->cds_other);
    if (in->cds0 <= 0)
        return sr_error_set_key(err, SR_EINVAL, "cds0", "drag area must be positive (got %g m2)", in->cds0);
    if (in->d0 <= 0)
        return sr_error_set_key(err, SR_EINVAL, "d0", "nominal diameter must be positive (got %g m)", in->d0);
    double cd0 = in->cds0 / (M_PI * in->d0 * in->d0 / 4);
    if (cd0 < CD0_MIN || cd0 > CD0_MAX)
        return sr_error_set_key(err, SR_EINVAL, "cds0",
                            "drag area %g m2 on a %g m nominal diameter gives CD0 = %.3g on nominal area, "
                            "outside %g..%g: is the drag area on another reference area?",
                            in->cds0, in->d0, cd0, CD0_MIN, CD0_MAX);
    if (in->mass <= 0)
        return sr_error_set_key(err, SR_EINVAL, "mass", "payload mass must be positive (got %g kg)", in->mass);
    if (in->v1 <= 0)
        return sr_error_set_key(err, SR_EINVAL, "v1", "deployment speed must be positive (got %g m/s)", in->v1);
    if (in->rho <= 0)
        return sr_error_set_key(err, SR_EINVAL, "rho", "air density must be positive (got %g kg/m3)", in->rho);
    if (in->a <= 0)
        return sr_error_set_key(err, SR_EINVAL, "a", "speed of sound must be positive (got %g m/s)", in->a);
    if (in->n_fill < FILL_MIN || in->n_fill > FILL_MAX)
        return sr_error_set_key(err, SR_EINVAL, "n_fill",
                                "filling constant must lie in %g .. %g, as in a family file (got %g)",
                            FILL_MIN, FILL_MAX, in->n_fill);
    if (in->cx <= 0 || in->cx > 5)
        return sr_error_set_key(err, SR_EINVAL, "cx", "opening-load factor must lie in (0, 5] (got %g)", in->cx);
    if (in->count < 1 || in->count > 1000)
        return sr_error_set_key(err, SR_EINVAL, "count", "canopy count must be 1 to 1000 (got %d)", in->count);
    if (fabs(in->path_angle) > M_PI / 2 + 1e-12)
        return sr_error_set_key(err, SR_EINVAL, "path_angle", "flight-path angle must lie within -90..90 degrees (got %g)",
                            in->path_angle * 180 / M_PI);
    if (in->g < 0 || in->g > 50)
        return sr_error_set_key(err, SR_EINVAL, "g", "gravity must lie within 0..50 m/s2 (got %g)", in->g);
    if (in->exponent <= 0 || in->exponent > 10)
        return sr_error_set_key(err, SR_EINVAL, "exponent", "growth exponent must lie in (0, 10] (got %g)",
                                in->exponent);
    if (in->design_factor != 0 && (in->design_factor < 1 || in->design_factor > FACTOR_MAX))
        return sr_error_set_key(err, SR_EINVAL, "design_factor", "design factor must lie in 1 .. %g (got %g)", FACTOR_MAX,
                            in->design_factor);
    if (in->cluster_allowance != 0 && (in->cluster_allowance < 1 || in->cluster_allowance > FACTOR_MAX))
        return sr_error_set_key(err, SR_EINVAL, "cluster_allowance", "cluster allowance must lie in 1 .. %g (got %g)",
                                FACTOR_MAX,
                            in->cluster_allowance);
    if (in->mach_envelope < 0)
        return sr_error_set_key(err, SR_EINVAL, "mach_envelope", "Mach envelope must not be negative (got %g)",
                                in->mach_envelope);
    double mach = in->v1 / in->a;
    if (mach >= SR_OPENING_MACH_MAX)
        return sr_error_set_key(err, SR_EDOMAIN, "v1",
                            "deployment speed %g m/s is Mach %.2f: the filling-time law and the growth model "
                            "hold for subsonic deployment only (below Mach %g)",
                            in->v1, mach, SR_OPENING_MACH_MAX);
    return SR_OK;
}

/* ---- the three methods for one mass / drag-area split ------------------ */

typedef struct split {
    double S;    /* drag area the mass sees, m2 */
    double m;    /* mass, kg */
    double rm;   /* mass ratio per canopy */
    double A;    /* Pflanz ballistic parameter */
    int regime;
    sr_opening_peak olf, pflanz, ode;
    double f_low, f_high;
} split;

static void set_peak(sr_opening_peak *pk, double f, double f_inf, double m)
{
    pk->force = f;
    pk->x1 = f / f_inf;
    pk->decel_g = f / (m * SR_G0);
}

static int three_methods(const sr_opening_input *in, double tf, double q1, int ncan, double m, split *s,
                         sr_error *err)
{
    int rc;
    s->S = ncan * in->cds0;
    s->m = m;
    s->rm = sr_opening_mass_ratio(in->rho, in->cds0, m / ncan);
    s->A = 2 * m / (s->S * in->rho * in->v1 * tf);
    double f_inf = in->cx * s->S * q1;

    double x1, tau, vr;
    if ((rc = sr_opening_olf_x1(s->rm, in->cds0, in->d0, in->n_fill, &x1, err)) != SR_OK)
        return rc;
    set_peak(&s->olf, f_inf * x1, f_inf, m);
    s->olf.time = s->olf.speed = NAN;
    s->olf.kind = -1;

    if ((rc = sr_opening_pflanz_x1(s->A, in->exponent, &x1, &tau, &vr, err)) != SR_OK)
        return rc;
    set_peak(&s->pflanz, f_inf * x1, f_inf, m);
    s->pflanz.time = tau * tf;
    s->pflanz.speed = vr * in->v1;
    s->pflanz.kind = tau < 1 ? SR_PEAK_INTERIOR : SR_PEAK_FULL;
    s->regime = tau < 1 ? SR_OPENING_FINITE_MASS : SR_OPENING_INFINITE_MASS;

    ode_par p = {.S = s->S, .So = in->cds_other, .m = m, .rho = in->rho, .g = in->g, .tf = tf, .n = in->exponent};
    if ((rc = ode_peak(&p, in->v1, in->path_angle, in->cx, &s->ode, err)) != SR_OK)
        return rc;
    set_peak(&s->ode, s->ode.force, f_inf, m);

    s->f_low = fmin(s->olf.force, fmin(s->pflanz.force, s->ode.force));
    s->f_high = fmax(s->olf.force, fmax(s->pflanz.force, s->ode.force));
    return SR_OK;
}

int sr_opening_solve(const sr_opening_input *in, sr_opening_result *out, sr_error *err)
{
    int rc;
    if ((rc = validate(in, err)) != SR_OK)
        return rc;
    memset(out, 0, sizeof *out);
    double tf;
    if ((rc = sr_opening_fill_time(in->n_fill, in->d0, in->v1, steady_of(in), &tf, err)) != SR_OK)
        return rc;
    out->q1 = 0.5 * in->rho * in->v1 * in->v1;
    out->mach = in->v1 / in->a;
    out->t_fill = tf;
    out->cds_total = in->count * in->cds0;
    out->cd0 = in->cds0 / (M_PI * in->d0 * in->d0 / 4);
    out->drag_steady = out->cds_total * out->q1;
    out->f_infinite = in->cx * out->drag_steady;
    out->exponent = in->exponent;

    split eq;
    if ((rc = three_methods(in, tf, out->q1, in->count, in->mass, &eq, err)) != SR_OK)
        return rc;
    out->mass_ratio = eq.rm;
    out->ballistic = eq.A;
    out->regime = eq.regime;
    out->olf = eq.olf;
    out->pflanz = eq.pflanz;
    out->ode = eq.ode;
    out->f_low = eq.f_low;
    out->f_high = eq.f_high;
    out->spread = (eq.f_high - eq.f_low) / eq.f_low;
    out->decel_g_max = eq.f_high / (in->mass * SR_G0);

    /* Clusters: canopies never fill in step; the leading one takes more than
     * its share (K91 Ch. 6 reports lead/lag inflation in clusters, handbook
     * reference file section 5, verified qualitatively; no handbook number for
     * the allowance was available). Unless the caller gives an allowance, the
     * per-canopy load is the bound of the same models with the lead canopy
     * decelerating the whole mass alone: lagging canopies only add drag, which
     * slows the payload and lowers the lead canopy's peak. */
    out->f_canopy_equal = eq.f_high / in->count;
    if (in->count == 1) {
        out->allowance = 1;
        out->f_canopy_design = out->f_canopy_equal;
    } else if (in->cluster_allowance > 0) {
        out->allowance = in->cluster_allowance;
        out->f_canopy_design = in->cluster_allowance * out->f_canopy_equal;
    } else {
        split lead;
        if ((rc = three_methods(in, tf, out->q1, 1, in->mass, &lead, err)) != SR_OK)
            return rc;
        out->f_canopy_design = fmax(lead.f_high, out->f_canopy_equal);
        out->allowance = out->f_canopy_design / out->f_canopy_equal;
        out->allowance_derived = 1;
    }

    out->design_factor = in->design_factor;
    if (in->design_factor > 0) {
        out->strength_total = in->design_factor * out->f_high;
        out->strength_canopy = in->design_factor * out->f_canopy_design;
    }
    out->v_terminal = in->g > 0 ? sqrt(2 * in->mass * in->g / (in->rho * out->cds_total)) : INFINITY;
    out->above_envelope = (sr_mach_judge(out->mach, in->mach_envelope) & SR_MACH_OVER_ENVELOPE) != 0;
    out->slow_deployment = in->v1 < out->v_terminal;
    return SR_OK;
}

/* ---- the fast path ---------------------------------------------------- */

/* Fixed steps over the filling time: at least FAST_STEPS, more where the
 * drag's relaxation rate lambda = rho S v / m would make the classical
 * Runge-Kutta scheme stiff (h lambda kept below 2/3, within its stability
 * region), at most FAST_STEPS_MAX. */
#ifndef FAST_STEPS
#define FAST_STEPS 32
#endif
#define FAST_STEPS_MAX 4000

/* tau^n without pow for the exponents of the class bands (multiples of 1/2
 * up to 4): the fast path evaluates it a hundred times a solve. */
static double tau_pow(double tau, double n, int half)
{
    if (half < 0)
        return pow(tau, n);
    double r = (half & 1) ? sqrt(tau) : 1.0;
    for (int k = 0; k < half / 2; k++)
        r *= tau;
    return r;
}

typedef struct fast_ode {
    double S, m, rho, g, tf, n;
    double c; /* rho / 2m */
    int steps;
    int half; /* 2n when n is a multiple of 1/2 up to 4, else -1 */
} fast_ode;

static void fast_rhs(const fast_ode *p, double area, const double y[2], double d[2])
{
    double c = p->c * area * sqrt(y[0] * y[0] + y[1] * y[1]);
    d[0] = -c * y[0];
    d[1] = -c * y[1] - p->g;
}

/* F and dF/dt at tau = t/t_f <= 1 of state y, whose rates d are given; right:
 * the growth rate just after t_f (zero). */
static void fast_force(const fast_ode *p, double tau, double area, const double y[2], const double d[2], int right,
                       double *F, double *dF)
{
    double v2 = y[0] * y[0] + y[1] * y[1];
    double rate = 0;
    if (!right && tau > 0)
        rate = p->S * p->n * (p->half >= 2 ? tau_pow(tau, p->n - 1, p->half - 2) : pow(tau, p->n - 1)) / p->tf;
    *F = 0.5 * p->rho * v2 * area;
    *dF = p->rho * area * (y[0] * d[0] + y[1] * d[1]) + 0.5 * p->rho * v2 * rate;
}

/* Largest value of the cubic Hermite interpolant on [0, h] with end values
 * F0, F1 and slopes D0 > 0 >= D1 (a maximum inside). */
static double hermite_max(double F0, double F1, double D0, double D1, double h)
{
    /* p'(s) = a s^2 + b s + c on s in [0, 1] */
    double a = 6 * (F0 - F1) + 3 * h * (D0 + D1), b = -6 * (F0 - F1) - 2 * h * (2 * D0 + D1), c = h * D0;
    double s;
    if (fabs(a) < 1e-14 * (fabs(b) + fabs(c)))
        s = -c / b;
    else {
        double disc = b * b - 4 * a * c;
        if (disc < 0)
            disc = 0;
        double q = -0.5 * (b + (b >= 0 ? sqrt(disc) : -sqrt(disc)));
        double s1 = q / a, s2 = c / q;
        s = (s1 >= 0 && s1 <= 1) ? s1 : s2;
    }
    if (!(s >= 0 && s <= 1))
        return fmax(F0, F1);
    double s2 = s * s, s3 = s2 * s;
    return (2 * s3 - 3 * s2 + 1) * F0 + (s3 - 2 * s2 + s) * h * D0 + (-2 * s3 + 3 * s2) * F1 + (s3 - s2) * h * D1;
}

/* The ODE's dynamic peak at CX = 1 (interior maxima and the kink at t_f), the
 * same rules as ode_peak; the weight is the caller's. */
static double fast_ode_peak(const fast_ode *p, double v1, double path_angle)
{
    double y[2] = {v1 * cos(path_angle), -v1 * sin(path_angle)};
    const int N = p->steps;
    double h = p->tf / N, best = 0;
    double F0 = 0, D0 = 1; /* F rises from zero at line stretch */
    double a0 = 0, k1[2];
    fast_rhs(p, 0, y, k1);
    for (int i = 0; i < N; i++) {
        double tm = (i + 0.5) / N, t1 = (i + 1.0) / N;
        double am = p->S * tau_pow(tm, p->n, p->half), a1 = i + 1 == N ? p->S : p->S * tau_pow(t1, p->n, p->half);
        double k2[2], k3[2], k4[2], yt[2];
        yt[0] = y[0] + 0.5 * h * k1[0], yt[1] = y[1] + 0.5 * h * k1[1];
        fast_rhs(p, am, yt, k2);
        yt[0] = y[0] + 0.5 * h * k2[0], yt[1] = y[1] + 0.5 * h * k2[1];
        fast_rhs(p, am, yt, k3);
        yt[0] = y[0] + h * k3[0], yt[1] = y[1] + h * k3[1];
        fast_rhs(p, a1, yt, k4);
        y[0] += h / 6 * (k1[0] + 2 * k2[0] + 2 * k3[0] + k4[0]);
        y[1] += h / 6 * (k1[1] + 2 * k2[1] + 2 * k3[1] + k4[1]);
        /* the rates at the new state: dF/dt here, and the next step's first stage */
        fast_rhs(p, a1, y, k1);
        double F1, D1;
        fast_force(p, t1, a1, y, k1, 0, &F1, &D1);
        if (D0 > 0 && D1 <= 0)
            best = fmax(best, hermite_max(F0, F1, D0, D1, h));
        F0 = F1, D0 = D1, a0 = a1;
    }
    (void)a0;
    /* the kink at full inflation: rising before, falling after */
    double Fr, Dr;
    fast_force(p, 1, p->S, y, k1, 1, &Fr, &Dr);
    if (D0 > 0 && Dr <= 0)
        best = fmax(best, F0);
    return best;
}

int sr_opening_solve_fast(const sr_opening_input *in, sr_opening_quick *out, sr_error *err)
{
    int rc;
    if ((rc = validate(in, err)) != SR_OK)
        return rc;
    double tf;
    if ((rc = sr_opening_fill_time(in->n_fill, in->d0, in->v1, steady_of(in), &tf, err)) != SR_OK)
        return rc;
    double q1 = 0.5 * in->rho * in->v1 * in->v1, S = in->count * in->cds0, m = in->mass;
    double f_inf = S * q1, x1, tau;
    out->t_fill = tf;
    out->q1 = q1;
    out->mach = in->v1 / in->a;
    out->mass = m;
    double rm = sr_opening_mass_ratio(in->rho, in->cds0, m / in->count);
    if ((rc = sr_opening_olf_x1(rm, in->cds0, in->d0, in->n_fill, &x1, err)) != SR_OK)
        return rc;
    out->olf = f_inf * x1;
    double A = 2 * m / (S * in->rho * in->v1 * tf);
    if ((rc = sr_opening_pflanz_x1(A, in->exponent, &x1, &tau, NULL, err)) != SR_OK)
        return rc;
    out->pflanz = f_inf * x1;
    fast_ode p = {.S = S, .m = m, .rho = in->rho, .g = in->g, .tf = tf, .n = in->exponent, .half = -1,
                  .c = 0.5 * in->rho / m};
    /* the drag's relaxation rate is at most rho S v1 / m, or 2 g / v_s where the payload speeds up */
    double vs = in->g > 0 ? sqrt(2 * m * in->g / (in->rho * S)) : 0;
    double lam = fmax(in->rho * S * in->v1 / m, vs > 0 ? 2 * in->g / vs : 0);
    double need = ceil(1.5 * lam * tf);
    p.steps = need < FAST_STEPS ? FAST_STEPS : need > FAST_STEPS_MAX ? FAST_STEPS_MAX : (int)need;
    double twice = 2 * in->exponent;
    if (twice <= 8 && fabs(twice - round(twice)) < 1e-12)
        p.half = (int)round(twice);
    out->ode = fast_ode_peak(&p, in->v1, in->path_angle);
    out->weight = in->g > 0 ? m * in->g : 0;
    double vt = in->g > 0 ? sqrt(2 * m * in->g / (in->rho * S)) : INFINITY;
    out->slow_deployment = in->v1 < vt;
    return SR_OK;
}

double sr_opening_quick_high(const sr_opening_quick *q, double cx)
{
    double ode = fmax(cx * q->ode, q->weight);
    return fmax(cx * fmax(q->olf, q->pflanz), ode);
}

double sr_opening_quick_low(const sr_opening_quick *q, double cx)
{
    double ode = fmax(cx * q->ode, q->weight);
    return fmin(cx * fmin(q->olf, q->pflanz), ode);
}

double sr_opening_bound(const sr_opening_input *in)
{
    double tf;
    if (!(in->v1 >= 0 && in->rho > 0 && in->cds0 > 0 && in->mass > 0 && in->count >= 1 && in->cx > 0) ||
        sr_opening_fill_time(in->n_fill, in->d0, in->v1, steady_of(in), &tf, NULL) != SR_OK)
        return INFINITY;
    double g = in->g > 0 ? in->g : 0.0, v = in->v1 + g * tf;
    double f = fmax(in->cx, 1.0) * 0.5 * in->rho * v * v * in->count * in->cds0;
    return 1.05 * fmax(f, in->mass * g);
}

int sr_opening_trace(const sr_opening_input *in, double t_end, size_t n, double *t, double *force, sr_error *err)
{
    int rc;
    if ((rc = validate(in, err)) != SR_OK)
        return rc;
    if (n < 2 || !t || !force)
        return sr_error_set(err, SR_EINVAL, "trace needs at least two points");
    double tf;
    if ((rc = sr_opening_fill_time(in->n_fill, in->d0, in->v1, steady_of(in), &tf, err)) != SR_OK)
        return rc;
    if (!(t_end > 0))
        t_end = 3 * tf;
    for (size_t i = 0; i < n; i++)
        t[i] = t_end * (double)i / (double)(n - 1);
    return sr_opening_trace_at(in, tf, t, n, force, NULL, err);
}

int sr_opening_trace_at(const sr_opening_input *in, double t_fill, const double *t, size_t n, double *force,
                        double *speed, sr_error *err)
{
    int rc;
    if ((rc = validate(in, err)) != SR_OK)
        return rc;
    if (n < 1 || !t || !force)
        return sr_error_set(err, SR_EINVAL, "trace needs at least one point");
    double tf = t_fill;
    if (!(t_fill > 0) && (rc = sr_opening_fill_time(in->n_fill, in->d0, in->v1, steady_of(in), &tf, err)) != SR_OK)
        return rc;
    if (!isfinite(tf))
        return sr_error_set_key(err, SR_EINVAL, "t_fill", "filling time must be finite (got %g s)", tf);
    for (size_t i = 1; i < n; i++)
        if (!(t[i] >= t[i - 1]))
            return sr_error_set(err, SR_EINVAL, "trace times must increase (row %zu)", i + 1);
    ode_par p = {.S = in->count * in->cds0, .So = in->cds_other, .m = in->mass, .rho = in->rho, .g = in->g,
                 .tf = tf, .n = in->exponent};
    gsl_odeiv2_system sys = {rhs, NULL, 2, &p};
    gsl_odeiv2_driver *drv = gsl_odeiv2_driver_alloc_y_new(&sys, gsl_odeiv2_step_rk8pd, tf * 1e-3,
                                                           ODE_EPS_REL * in->v1, ODE_EPS_REL);
    if (!drv)
        return sr_error_set(err, SR_ENOMEM, "inflation ODE: out of memory");
    gsl_odeiv2_driver_set_nmax(drv, ODE_MAX_STEPS);
    double y[2] = {in->v1 * cos(in->path_angle), -in->v1 * sin(in->path_angle)};
    double tt = 0;
    for (size_t i = 0; i < n && rc == SR_OK; i++) {
        /* before line stretch the model holds the deployment state */
        double ti = t[i] > 0 ? t[i] : 0;
        /* stop at the kink of the growth law so no step straddles it */
        if (tt < tf && ti > tf && gsl_odeiv2_driver_apply(drv, &tt, tf, y) != GSL_SUCCESS)
            rc = SR_ENUMERIC;
        if (rc == SR_OK && ti > tt && gsl_odeiv2_driver_apply(drv, &tt, ti, y) != GSL_SUCCESS)
            rc = SR_ENUMERIC;
        force[i] = force_of(&p, ti, y);
        if (speed)
            speed[i] = hypot(y[0], y[1]);
    }
    gsl_odeiv2_driver_free(drv);
    if (rc != SR_OK)
        return sr_error_set(err, rc, "inflation ODE: integration failed while tracing the force");
    return SR_OK;
}
