/* wind.h - the wind a descending payload drifts with: calm, constant, power
 * law, log law, or a table of height, speed and direction interpolated by
 * vector components. Directions follow the meteorological convention: the
 * bearing the wind blows FROM, clockwise from north. Heights are above ground. */
#ifndef SR_WIND_H
#define SR_WIND_H

#include <stddef.h>

#include "base/error.h"
#include "physics/units.h"
#include "sinkrate/physics.h"

typedef enum sr_wind_kind {
    SR_WIND_CALM = 0,
    SR_WIND_CONSTANT,  /* the same speed and direction at every height */
    SR_WIND_POWER,     /* u(h) = u_ref (h / h_ref)^alpha, one direction */
    SR_WIND_LOG,       /* u(h) = u_ref ln((h - d)/z0) / ln((h_ref - d)/z0), one direction */
    SR_WIND_TABLE      /* rows of height, speed, direction; linear in east/north components */
} sr_wind_kind;

/* Power-law exponent for neutral flow over open, flat ground: 1/7, the
 * "seventh-root profile" (trade-facts.md section 6, verified; common practice). */
#define SR_WIND_ALPHA_OPEN (1.0 / 7.0)
/* Height of the reference wind when none is given: 10 m, the usual
 * anemometer height of surface weather stations (common practice). */
#define SR_WIND_REF_HEIGHT 10.0
/* Gradient height over open country, m: the top of the layer a power or log
 * law describes; above it the wind follows the weather, not the ground.
 * About 270-300 m in wind engineering (ASCE 7 exposure C: 274 m; Davenport's
 * open-country profile about 270 m; from memory): rounded up to 300 m. */
#define SR_WIND_GRADIENT_HEIGHT 300.0
#define SR_WIND_MAX_ROWS 4096
#define SR_WIND_MAX_SPEED 100.0   /* m/s: beyond any wind a recovery is flown in; catches unit slips */

/* Caller-owned; the table kind holds memory (release with sr_wind_release). The
 * struct is never written by evaluation, so one model serves many threads. A
 * program holds it as a handle (sr_wind_new_*, public:
 * include/sinkrate/physics.h with sr_wind_at and sr_wind_describe). */
typedef struct sr_wind {
    sr_wind_kind kind;
    double speed;     /* constant: the speed; power/log: the speed at h_ref, m/s */
    double from;      /* direction it blows from, rad clockwise from north */
    double ue, un;    /* unit vector of the air's motion for `from` (set by the init calls) */
    double h_ref;     /* power/log: reference height above ground, m */
    double alpha;     /* power law exponent */
    double z0;        /* log law: roughness length, m */
    double d;         /* log law: displacement height, m */
    double h_grad;    /* power/log: gradient height given (the law holds below, the wind is
                       * held at its value there above), m; 0: none, the law goes on */
    /* table */
    size_t n;
    double *h;        /* heights above ground, m, strictly increasing */
    double *east;     /* component toward east of the air's motion, m/s */
    double *north;    /* component toward north of the air's motion, m/s */
    char source[256]; /* file the table came from, or "" */
} sr_wind;

void sr_wind_init_calm(sr_wind *w);
int sr_wind_init_constant(sr_wind *w, double speed, double from, sr_error *err);
int sr_wind_init_power(sr_wind *w, double speed_ref, double from, double h_ref, double alpha, sr_error *err);
int sr_wind_init_log(sr_wind *w, double speed_ref, double from, double h_ref, double z0, double d,
                     sr_error *err);
/* Table from rows of height above ground (m, strictly increasing), speed
 * (m/s) and the direction it blows from (rad). Copies the data. */
int sr_wind_init_table(sr_wind *w, const double *h, const double *speed, const double *from, size_t n,
                       sr_error *err);
/* As sr_wind_init_table, with the failing row in *bad ((size_t)-1 when the
 * error is about no row) and no row in the message: for readers that name
 * the row's place in a file (files/windtable.h). */
int sr_wind_init_table_rows(sr_wind *w, const double *h, const double *speed, const double *from, size_t n,
                            size_t *bad, sr_error *err);
/* Deep copy (a table's arrays are duplicated): dst, initialised or released
 * before, afterwards owns its own memory. */
int sr_wind_copy(sr_wind *dst, const sr_wind *src, sr_error *err);
void sr_wind_release(sr_wind *w);

/* Hold a power or log law constant above gradient height h (m above ground,
 * above the reference height, at most 5000 m). Other kinds: SR_EINVAL. */
int sr_wind_set_gradient_height(sr_wind *w, double h, sr_error *err);

/* Whether a power or log law without a gradient height is used up to top
 * (m above ground) beyond SR_WIND_GRADIENT_HEIGHT: 1 with a one-line warning
 * in buf (values in the unit system sys), 0 otherwise. Every command that
 * flies a mission's wind asks here. */
int sr_wind_check_extrapolation(const sr_wind *w, double top, sr_unit_system sys, char *buf, size_t len);

/* sr_wind_at (public): below the lowest table row the lowest row holds,
 * above the highest the highest (callers check the range with sr_wind_top);
 * power and log laws are calm at and below ground (log law: below d + z0).
 * Pure and thread-safe. */

/* Highest height the model is given for (INFINITY for the laws). */
double sr_wind_top(const sr_wind *w);

/* Heights where the profile has kinks: table rows, a law's gradient height
 * (NULL when none). */
const double *sr_wind_knots(const sr_wind *w, size_t *n);

/* Conversions between speed + from-direction and east/north components. */
void sr_wind_components(double speed, double from, double *east, double *north);
void sr_wind_polar(double east, double north, double *speed, double *from);
/* Writes one number of a description: si in quantity q, sig significant
 * figures (0: a whole number), with its unit. */
typedef void (*sr_wind_value_fn)(char *buf, size_t len, double si, sr_quantity q, int sig, void *ctx);
/* The wind in words, its numbers written by value: the one description the
 * report and the figure titles share (sr_wind_describe writes them plainly). */
void sr_wind_describe_fmt(const sr_wind *w, sr_wind_value_fn value, void *ctx, char *buf, size_t len);

#endif
