/* wind.c - wind models (constant, power law, log law, table) evaluated at a
 * height above ground, as east/north components of the air's motion. */
#include "physics/wind.h"

#include <gsl/gsl_interp.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>


#define PI 3.14159265358979323846

void sr_wind_components(double speed, double from, double *east, double *north)
{
    /* blowing FROM bearing b, the air moves toward b + 180 deg */
    *east = -speed * sin(from);
    *north = -speed * cos(from);
}

void sr_wind_polar(double east, double north, double *speed, double *from)
{
    *speed = hypot(east, north);
    double b = atan2(-east, -north);
    if (b < 0.0)
        b += 2.0 * PI;
    if (*speed == 0.0)
        b = 0.0;
    *from = b;
}

void sr_wind_init_calm(sr_wind *w)
{
    memset(w, 0, sizeof *w);
    w->kind = SR_WIND_CALM;
    w->h_ref = SR_WIND_REF_HEIGHT;
    w->alpha = SR_WIND_ALPHA_OPEN;
}

static int check_speed_dir(double speed, double from, sr_error *err)
{
    if (!(speed >= 0.0 && speed <= SR_WIND_MAX_SPEED))
        return sr_error_set_key(err, SR_EINVAL, "speed", "wind speed %g m/s is outside 0 .. %g m/s", speed,
                                SR_WIND_MAX_SPEED);
    if (!(from >= -2.0 * PI && from <= 4.0 * PI))
        return sr_error_set_key(err, SR_EINVAL, "from", "wind direction %g deg is outside -360 .. 720 deg",
                                from * 180.0 / PI);
    return SR_OK;
}

static double wrap_bearing(double b)
{
    b = fmod(b, 2.0 * PI);
    return b < 0.0 ? b + 2.0 * PI : b;
}

/* A law of height fitted near the ground: it takes a gradient height, and
 * is warned about when used far above it. A new law of that kind is added
 * here once. */
static int is_law(const sr_wind *w)
{
    return w->kind == SR_WIND_POWER || w->kind == SR_WIND_LOG;
}

/* The law's name in messages ("power-law"), as the mission file writes it. */
static const char *law_name(const sr_wind *w)
{
    return w->kind == SR_WIND_POWER ? "power-law" : "log-law";
}

int sr_wind_init_constant(sr_wind *w, double speed, double from, sr_error *err)
{
    sr_wind_init_calm(w);
    int rc = check_speed_dir(speed, from, err);
    if (rc)
        return rc;
    w->kind = SR_WIND_CONSTANT;
    w->speed = speed;
    w->from = wrap_bearing(from);
    sr_wind_components(1.0, w->from, &w->ue, &w->un);
    return SR_OK;
}

int sr_wind_init_power(sr_wind *w, double speed_ref, double from, double h_ref, double alpha, sr_error *err)
{
    sr_wind_init_calm(w);
    int rc = check_speed_dir(speed_ref, from, err);
    if (rc)
        return rc;
    if (!(h_ref > 0.0 && h_ref <= 1000.0))
        return sr_error_set_key(err, SR_EINVAL, "reference-height", "wind reference height %g m is outside 0 .. 1000 m",
                                h_ref);
    /* 0.05 .. 0.8 spans open water to very stable air (trade-facts.md section 6) */
    if (!(alpha >= 0.05 && alpha <= 0.8))
        return sr_error_set_key(err, SR_EINVAL, "exponent", "power-law exponent %g is outside 0.05 .. 0.8", alpha);
    w->kind = SR_WIND_POWER;
    w->speed = speed_ref;
    w->from = wrap_bearing(from);
    sr_wind_components(1.0, w->from, &w->ue, &w->un);
    w->h_ref = h_ref;
    w->alpha = alpha;
    return SR_OK;
}

int sr_wind_init_log(sr_wind *w, double speed_ref, double from, double h_ref, double z0, double d, sr_error *err)
{
    sr_wind_init_calm(w);
    int rc = check_speed_dir(speed_ref, from, err);
    if (rc)
        return rc;
    /* typical z0 runs from 0.0002 m (open water) to 1 m (forest), trade-facts.md section 6 */
    if (!(z0 >= 1e-5 && z0 <= 5.0))
        return sr_error_set_key(err, SR_EINVAL, "roughness-length", "roughness length %g m is outside 0.00001 .. 5 m",
                                z0);
    if (!(d >= 0.0 && d <= 100.0))
        return sr_error_set_key(err, SR_EINVAL, "displacement", "displacement height %g m is outside 0 .. 100 m", d);
    if (!(h_ref > d + z0 && h_ref <= 1000.0))
        return sr_error_set_key(err, SR_EINVAL, "reference-height",
                                "wind reference height %g m must lie above displacement + roughness (%g m) and "
                                "at most 1000 m",
                                h_ref, d + z0);
    w->kind = SR_WIND_LOG;
    w->speed = speed_ref;
    w->from = wrap_bearing(from);
    sr_wind_components(1.0, w->from, &w->ue, &w->un);
    w->h_ref = h_ref;
    w->z0 = z0;
    w->d = d;
    return SR_OK;
}

int sr_wind_set_gradient_height(sr_wind *w, double h, sr_error *err)
{
    if (!is_law(w))
        return sr_error_set(err, SR_EINVAL, "a gradient height belongs to a power-law or log-law wind");
    if (!(h > w->h_ref && h <= 5000.0))
        return sr_error_set_key(err, SR_EINVAL, "gradient-height",
                                "gradient height %g m must lie above the reference height (%g m) and at most 5000 m",
                                h, w->h_ref);
    w->h_grad = h;
    return SR_OK;
}

int sr_wind_check_extrapolation(const sr_wind *w, double top, sr_unit_system sys, char *buf, size_t len)
{
    if (!is_law(w) || w->h_grad > 0.0 || !(top > SR_WIND_GRADIENT_HEIGHT))
        return 0;
    double e, n;
    sr_wind_at(w, top, &e, &n);
    const char *ul = sr_units_label(SR_Q_LENGTH, sys), *uv = sr_units_label(SR_Q_SPEED, sys);
    if (buf && len)
        snprintf(buf, len,
                 "the %s wind is extrapolated from its reference height (%.0f %s) to %.0f %s above ground, where it "
                 "blows %.1f %s; such a law describes the wind near the ground, up to a gradient height of about "
                 "%.0f %s over open country (wind engineering, from memory): for drift you rely on, give a wind "
                 "table or a sounding, or set gradient-height: to hold the wind constant above it",
                 law_name(w), sr_units_from_si(w->h_ref, SR_Q_LENGTH, sys), ul,
                 sr_units_from_si(top, SR_Q_LENGTH, sys), ul, sr_units_from_si(hypot(e, n), SR_Q_SPEED, sys), uv,
                 sr_units_from_si(SR_WIND_GRADIENT_HEIGHT, SR_Q_LENGTH, sys), ul);
    return 1;
}

int sr_wind_copy(sr_wind *dst, const sr_wind *src, sr_error *err)
{
    sr_wind_release(dst);
    *dst = *src;
    dst->h = dst->east = dst->north = NULL;
    if (src->kind != SR_WIND_TABLE)
        return SR_OK;
    size_t b = src->n * sizeof(double);
    dst->h = malloc(b);
    dst->east = malloc(b);
    dst->north = malloc(b);
    if (!dst->h || !dst->east || !dst->north) {
        sr_wind_release(dst);
        sr_wind_init_calm(dst);
        return sr_error_set(err, SR_ENOMEM, "out of memory for a copy of the wind table");
    }
    memcpy(dst->h, src->h, b);
    memcpy(dst->east, src->east, b);
    memcpy(dst->north, src->north, b);
    return SR_OK;
}

void sr_wind_release(sr_wind *w)
{
    if (!w)
        return;
    free(w->h);
    free(w->east);
    free(w->north);
    w->h = w->east = w->north = NULL;
    w->n = 0;
}

int sr_wind_init_table_rows(sr_wind *w, const double *h, const double *speed, const double *from, size_t n, size_t *bad,
                      sr_error *err)
{
    sr_wind_init_calm(w);
    *bad = (size_t)-1;
    if (n < 1)
        return sr_error_set(err, SR_EINVAL, "a wind table needs at least one row");
    if (n > SR_WIND_MAX_ROWS)
        return sr_error_set(err, SR_EINVAL, "a wind table has at most %d rows", SR_WIND_MAX_ROWS);
    for (size_t i = 0; i < n; i++) {
        *bad = i;
        if (!(h[i] >= -100.0 && h[i] <= 86000.0))
            return sr_error_set(err, SR_EINVAL, "height %g m is outside -100 .. 86000 m above ground", h[i]);
        if (i > 0 && !(h[i] > h[i - 1]))
            return sr_error_set(err, SR_EINVAL, "height %g m does not increase from the row before (%g m)", h[i],
                                h[i - 1]);
        int rc = check_speed_dir(speed[i], from[i], err);
        if (rc)
            return rc;
    }
    *bad = (size_t)-1;
    w->h = malloc(n * sizeof *w->h);
    w->east = malloc(n * sizeof *w->east);
    w->north = malloc(n * sizeof *w->north);
    if (!w->h || !w->east || !w->north) {
        sr_wind_release(w);
        return sr_error_set(err, SR_ENOMEM, "out of memory for the wind table");
    }
    for (size_t i = 0; i < n; i++) {
        w->h[i] = h[i];
        sr_wind_components(speed[i], from[i], &w->east[i], &w->north[i]);
    }
    w->n = n;
    w->kind = SR_WIND_TABLE;
    return SR_OK;
}

int sr_wind_init_table(sr_wind *w, const double *h, const double *speed, const double *from, size_t n,
                       sr_error *err)
{
    size_t bad;
    int rc = sr_wind_init_table_rows(w, h, speed, from, n, &bad, err);
    if (rc && bad != (size_t)-1)
        sr_error_prefix(err, "wind row %zu: ", bad + 1);
    return rc;
}

void sr_wind_at(const sr_wind *w, double h, double *east, double *north)
{
    double s;
    switch (w->kind) {
    case SR_WIND_CONSTANT:
        *east = w->speed * w->ue;
        *north = w->speed * w->un;
        return;
    case SR_WIND_POWER:
        if (w->h_grad > 0.0 && h > w->h_grad)
            h = w->h_grad;
        s = h > 0.0 ? w->speed * pow(h / w->h_ref, w->alpha) : 0.0;
        *east = s * w->ue;
        *north = s * w->un;
        return;
    case SR_WIND_LOG:
        if (w->h_grad > 0.0 && h > w->h_grad)
            h = w->h_grad;
        s = h - w->d > w->z0 ? w->speed * log((h - w->d) / w->z0) / log((w->h_ref - w->d) / w->z0) : 0.0;
        *east = s * w->ue;
        *north = s * w->un;
        return;
    case SR_WIND_TABLE: {
        if (h <= w->h[0] || w->n == 1) {
            *east = w->east[0];
            *north = w->north[0];
            return;
        }
        if (h >= w->h[w->n - 1]) {
            *east = w->east[w->n - 1];
            *north = w->north[w->n - 1];
            return;
        }
        /* gsl_interp_bsearch is a pure search: no accelerator, so no shared state */
        size_t i = gsl_interp_bsearch(w->h, h, 0, w->n - 1);
        double f = (h - w->h[i]) / (w->h[i + 1] - w->h[i]);
        *east = w->east[i] + f * (w->east[i + 1] - w->east[i]);
        *north = w->north[i] + f * (w->north[i + 1] - w->north[i]);
        return;
    }
    case SR_WIND_CALM:
    default:
        *east = *north = 0.0;
        return;
    }
}

double sr_wind_top(const sr_wind *w)
{
    return w->kind == SR_WIND_TABLE ? w->h[w->n - 1] : INFINITY;
}

const double *sr_wind_knots(const sr_wind *w, size_t *n)
{
    if (w->kind == SR_WIND_TABLE) {
        *n = w->n;
        return w->h;
    }
    if (is_law(w) && w->h_grad > 0.0) {
        *n = 1;
        return &w->h_grad;
    }
    *n = 0;
    return NULL;
}

/* The library's own numbers: three significant figures in the chosen units. */
static void plain_value(char *buf, size_t len, double si, sr_quantity q, int sig, void *ctx)
{
    sr_unit_system sys = *(const sr_unit_system *)ctx;
    (void)sig;
    const char *u = sr_units_label(q, sys);
    snprintf(buf, len, "%.3g%s%s", sr_units_from_si(si, q, sys), u[0] ? " " : "", u);
}

void sr_wind_describe_fmt(const sr_wind *w, sr_wind_value_fn value, void *ctx, char *buf, size_t len)
{
    char v[64], h[64], v2[64], h2[64];
    double deg = sr_units_bearing_deg(w->from, 0);
    switch (w->kind) {
    case SR_WIND_CALM:
        snprintf(buf, len, "calm");
        return;
    case SR_WIND_CONSTANT:
        value(v, sizeof v, w->speed, SR_Q_SPEED, 3, ctx);
        snprintf(buf, len, "constant, %s from %.0f deg at every height", v, deg);
        return;
    case SR_WIND_POWER:
    case SR_WIND_LOG:
        value(v, sizeof v, w->speed, SR_Q_SPEED, 3, ctx);
        value(h, sizeof h, w->h_ref, SR_Q_LENGTH, 3, ctx);
        if (w->kind == SR_WIND_POWER) {
            snprintf(buf, len, "power law, %s from %.0f deg at %s above ground, exponent %.3f", v, deg, h, w->alpha);
        } else {
            value(v2, sizeof v2, w->z0, SR_Q_LENGTH, 3, ctx);
            value(h2, sizeof h2, w->d, SR_Q_LENGTH, 3, ctx);
            snprintf(buf, len, "log law, %s from %.0f deg at %s above ground, roughness length %s, displacement %s", v,
                     deg, h, v2, h2);
        }
        if (w->h_grad > 0.0) {
            size_t l = strlen(buf);
            value(h, sizeof h, w->h_grad, SR_Q_LENGTH, 3, ctx);
            snprintf(buf + l, len > l ? len - l : 0, "; held constant above %s (gradient height)", h);
        }
        return;
    case SR_WIND_TABLE: {
        double s0, f0, s1, f1;
        sr_wind_polar(w->east[0], w->north[0], &s0, &f0);
        sr_wind_polar(w->east[w->n - 1], w->north[w->n - 1], &s1, &f1);
        value(v, sizeof v, s0, SR_Q_SPEED, 3, ctx);
        value(h, sizeof h, w->h[0], SR_Q_LENGTH, 0, ctx);
        value(v2, sizeof v2, s1, SR_Q_SPEED, 3, ctx);
        value(h2, sizeof h2, w->h[w->n - 1], SR_Q_LENGTH, 0, ctx);
        snprintf(buf, len, "table%s%s, %zu rows: %s from %.0f deg at %s to %s from %.0f deg at %s above ground",
                 w->source[0] ? " " : "", w->source, w->n, v, sr_units_bearing_deg(f0, 0), h, v2,
                 sr_units_bearing_deg(f1, 0), h2);
        return;
    }
    }
}

void sr_wind_describe(const sr_wind *w, sr_unit_system sys, char *buf, size_t len)
{
    sr_wind_describe_fmt(w, plain_value, &sys, buf, len);
}

/* ---- a program's handles (include/sinkrate/physics.h) ---- */

/* The model built in tmp moves into a new handle, or is released. */
static int wind_handle(sr_wind **out, sr_wind *tmp, int rc, sr_error *err)
{
    sr_error_gsl_off();
    *out = NULL;
    if (rc) {
        sr_wind_release(tmp);
        return rc;
    }
    sr_wind *w = malloc(sizeof *w);
    if (!w) {
        sr_wind_release(tmp);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    *w = *tmp;
    *out = w;
    return SR_OK;
}

int sr_wind_new_calm(sr_wind **out, sr_error *err)
{
    sr_wind t;
    sr_wind_init_calm(&t);
    return wind_handle(out, &t, SR_OK, err);
}

int sr_wind_new_constant(sr_wind **out, double speed, double from, sr_error *err)
{
    sr_wind t;
    int rc = sr_wind_init_constant(&t, speed, from, err);
    return wind_handle(out, &t, rc, err);
}

int sr_wind_new_power(sr_wind **out, double speed_ref, double from, double h_ref, double alpha, sr_error *err)
{
    sr_wind t;
    int rc = sr_wind_init_power(&t, speed_ref, from, h_ref, alpha, err);
    return wind_handle(out, &t, rc, err);
}

int sr_wind_new_log(sr_wind **out, double speed_ref, double from, double h_ref, double z0, double d, sr_error *err)
{
    sr_wind t;
    int rc = sr_wind_init_log(&t, speed_ref, from, h_ref, z0, d, err);
    return wind_handle(out, &t, rc, err);
}

int sr_wind_new_table(sr_wind **out, const double *h, const double *speed, const double *from, size_t n,
                      sr_error *err)
{
    sr_wind t;
    int rc = sr_wind_init_table(&t, h, speed, from, n, err);
    return wind_handle(out, &t, rc, err);
}

int sr_wind_dup(sr_wind **out, const sr_wind *src, sr_error *err)
{
    sr_wind t;
    sr_wind_init_calm(&t);
    int rc = sr_wind_copy(&t, src, err);
    return wind_handle(out, &t, rc, err);
}

void sr_wind_free(sr_wind *w)
{
    if (!w)
        return;
    sr_wind_release(w);
    free(w);
}
