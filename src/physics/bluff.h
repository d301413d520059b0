/* bluff.h - bodies falling without a canopy: drag curves Cd(Re) with their
 * sources and validity ranges, every equilibrium speed, and the classical
 * fixed-point iteration shown step by step. */
#ifndef SR_BLUFF_H
#define SR_BLUFF_H

#include <stddef.h>

#include <gsl/gsl_interp.h>

#include "physics/atmos.h"
#include "base/error.h"
#include "sinkrate/physics.h"

/* Warning bits carried by a drag-coefficient lookup, an equilibrium or a
 * trace step. Outside a curve's validity range the value is still returned
 * (a correlation's own formula, a table's end value held constant) but the
 * bit says so: never a silent extrapolation. */
enum {
    SR_BLUFF_WARN_RE_LOW = 1u << 0,   /* Re below the curve's validity range */
    SR_BLUFF_WARN_RE_HIGH = 1u << 1,  /* Re above the curve's validity range */
    SR_BLUFF_WARN_ASPECT = 1u << 2,   /* cylinder L/D outside the finite-length data */
    SR_BLUFF_WARN_MACH = 1u << 3,     /* Mach above 0.3: incompressible curves no longer hold */
    SR_BLUFF_WARN_STEP = 1u << 4,     /* the sign change is a step in the curve, not a root */
    SR_BLUFF_WARN_TRUNCATED = 1u << 5 /* more equilibria than SR_BLUFF_MAX_ROOTS */
};

/* One line of plain text per warning bit (the lowest set bit of `bit`). */
const char *sr_bluff_warn_text(unsigned bit);

/* sr_bluff_shape and sr_bluff_attitude are public (include/sinkrate/physics.h). */

typedef enum sr_bluff_curve_id {
    SR_CURVE_SPHERE_CGW = 0,        /* Clift, Grace & Weber 1978, Table 5.2: whole range */
    SR_CURVE_SPHERE_MORRISON,       /* Morrison 2013: Re <= 1e6 */
    SR_CURVE_SPHERE_BROWN_LAWLER,   /* Brown & Lawler 2003: Re < 2e5 */
    SR_CURVE_SPHERE_WHITE,          /* White 1991: Re <= 2e5 */
    SR_CURVE_SPHERE_SCHILLER_NAUMANN, /* Schiller & Naumann 1933: Re < 1000 */
    SR_CURVE_CYL_COMPOSITE,         /* Wieselsberger 1922 data, DNV-RP-C205 above 8.1e5 */
    SR_CURVE_CYL_WIESELSBERGER,     /* Wieselsberger 1922 data only: 0.728 .. 8.1e5 */
    SR_CURVE_CYL_DNV,               /* DNV-RP-C205 smooth-cylinder curve: 1.02e4 .. 4.94e6 */
    SR_CURVE_CYL_SUCKER_BRAUER,     /* Sucker & Brauer 1975 fit: 1e-4 .. 2e5 */
    SR_CURVE_DISK,                  /* thin disk, 1.17 (Hoerner 1965) */
    SR_CURVE_TABLE,                 /* user table */
    SR_CURVE_COUNT_
} sr_bluff_curve_id;

typedef enum sr_bluff_interp {
    SR_BLUFF_LOGLOG = 0, /* straight lines between points in log Re, log Cd */
    SR_BLUFF_STEFFEN     /* monotone cubic (GSL Steffen) in log Re, log Cd */
} sr_bluff_interp;

/* A drag curve Cd(Re). Caller-owned: fill with sr_bluff_curve_init,
 * sr_bluff_curve_table or a reader (sr_dragtable_load), release with
 * sr_bluff_curve_free. Read-only once built, so one curve can serve many
 * threads. */
typedef struct sr_bluff_curve {
    sr_bluff_curve_id id;
    sr_bluff_shape shape;     /* the body the curve belongs to (SR_BLUFF_TABLE: any) */
    const char *name;         /* short name, e.g. "sphere-cgw" */
    const char *source;       /* publication, or the table's file */
    const char *reference;    /* reference area and length the Cd and Re are based on */
    double re_min, re_max;    /* validity range of the curve */
    /* tabulated curves: knots in log space */
    size_t n;
    double *lnre, *lncd;
    gsl_interp *interp;
    sr_bluff_interp kind;
    char path[256];           /* user table: file name */
    char info[512];           /* user table: file name and the source it names; `source` points here */
    double table_area;        /* user table: reference area the file states, m2 (0: none) */
} sr_bluff_curve;

/* Built-in curve by id (not SR_CURVE_TABLE). */
int sr_bluff_curve_init(sr_bluff_curve *c, sr_bluff_curve_id id, sr_error *err);
/* User curve from arrays; `name` names the data in messages (a file name).
 * Re must increase strictly and be positive, Cd positive, at least 2 rows
 * (3 for Steffen). */
int sr_bluff_curve_table(sr_bluff_curve *c, const double *re, const double *cd, size_t n,
                         sr_bluff_interp kind, const char *name, sr_error *err);
/* The same with the file positions of its rows (line[i], col[i]; either may
 * be NULL) for messages: the drag-table reader's (files/dragtable.h). */
int sr_bluff_curve_table_at(sr_bluff_curve *c, const double *re, const double *cd, size_t n, sr_bluff_interp kind,
                            const char *name, const size_t *line, const size_t *col, sr_error *err);
void sr_bluff_curve_free(sr_bluff_curve *c);
/* Deep copy of a curve (a table's knots and interpolation are duplicated),
 * so that a copy can outlive the original. */
int sr_bluff_curve_copy(sr_bluff_curve *dst, const sr_bluff_curve *src, sr_error *err);

/* Curve id from its short name ("sphere-cgw", "cylinder", ...); SR_EINVAL
 * with the accepted names otherwise. */
int sr_bluff_curve_lookup(const char *name, sr_bluff_curve_id *id, sr_error *err);
/* Short name of a built-in curve id. */
const char *sr_bluff_curve_name(sr_bluff_curve_id id);
/* The default curve of a body shape. */
sr_bluff_curve_id sr_bluff_default_curve(sr_bluff_shape shape);

/* How a body meets the flow when it falls with no canopy (failure cases).
 * Its drag area is k Cd(Re) A + c, with Cd(Re) and A those of the curve's own
 * attitude (a cylinder broadside, a disk face-on: the highest drag):
 *  - broadside: k = 1, c = 0;
 *  - tumbling through every orientation, uniform on the sphere, by the
 *    cross-flow (independence) principle, where only the flow component
 *    normal to a face acts and the drag goes as the cube of that component's
 *    share (Hoerner 1965, Fluid-Dynamic Drag, ch. 3, from memory): a
 *    cylinder k = <sin^3> = 3 pi/16 = 0.589 plus its ends c = <|cos|^3> CD_end
 *    pi d^2/4 = 0.25 CD_end pi d^2/4; a thin disk k = <|cos|^3> = 1/4
 *    (the averages are our derivation);
 *  - end-on (a cylinder that fins or a weighted nose keep pointing into the
 *    flow): k = 0, c = CD_end pi d^2/4 with CD_end = 0.82, a flat-ended
 *    cylinder in axial flow (Hoerner 1965, from memory);
 *  - a sphere is the same in every attitude; a user table keeps its own
 *    (its attitude is whatever the table was measured in). */

#define SR_BLUFF_CD_END 0.82            /* flat-ended cylinder in axial flow: Hoerner 1965, from memory */
#define SR_BLUFF_TUMBLE_CROSS 0.58904862254808623 /* 3 pi / 16: <sin^3> over orientations on the sphere */


/* k and c of a body in an attitude; stable_end_on: the body can fall end-on
 * (else end-on falls back to tumbling). */
void sr_bluff_attitude_drag(sr_bluff_shape shape, double d, sr_bluff_attitude a, int stable_end_on, double *k,
                            double *c);

/* Cd at Reynolds number re > 0; ORs warning bits into *warn (may be NULL). */
double sr_bluff_curve_cd(const sr_bluff_curve *c, double re, unsigned *warn);

/* Finite-length factor of a circular cylinder broadside, Cd(L/D)/Cd(inf),
 * DNV-RP-C205 kappa (subcritical below Re 2e5, supercritical above 5e5,
 * blended in log Re between so the switch cannot make a false equilibrium),
 * with L/D = 1 from Wieselsberger's data as given by Hoerner 1965. */
double sr_bluff_length_factor(double l_over_d, double re, unsigned *warn);

/* A body: geometry, mass and its drag curve (borrowed, must outlive it). */
typedef struct sr_bluff_body {
    sr_bluff_shape shape;
    const sr_bluff_curve *curve;
    double d;          /* diameter: the length in Re, m */
    double length;     /* cylinder length, m (0 for other shapes) */
    double mass;       /* kg */
    double area;       /* reference area of Cd, m2 */
    char area_ref[64]; /* what the area is, e.g. "frontal area pi d^2/4" */
} sr_bluff_body;

/* Sphere and disk: area pi d^2/4. Cylinder: length > 0 required, area d L
 * (projected). Table: `area` when > 0, else the area the table file states,
 * else pi d^2/4 (NaN or 0: not given). The curve must belong to the shape (a
 * table body takes any). */
int sr_bluff_body_init(sr_bluff_body *b, sr_bluff_shape shape, const sr_bluff_curve *curve, double d,
                       double length, double mass, double area, sr_error *err);

/* Cd of the body at re, finite-length factor included. */
double sr_bluff_body_cd(const sr_bluff_body *b, double re, unsigned *warn);

#define SR_BLUFF_MAX_ROOTS 16

/* One equilibrium: drag equals weight. */
typedef struct sr_bluff_root {
    double v;      /* speed, m/s */
    double re;     /* Reynolds number */
    double cd;     /* drag coefficient on the body's reference area */
    double dfdv;   /* d(drag - weight)/dv, N/(m/s), central difference */
    double mach;   /* v / a (0 when the air gives no speed of sound) */
    int stable;    /* drag grows through the root: a disturbed body returns */
    unsigned warn;
} sr_bluff_root;

typedef struct sr_bluff_equilibria {
    size_t n;
    sr_bluff_root root[SR_BLUFF_MAX_ROOTS]; /* in increasing speed */
    double weight;                          /* m g, N */
    double re_lo, re_hi;                    /* the scanned Reynolds-number range */
    unsigned warn;                          /* OR of the roots' warnings */
} sr_bluff_equilibria;

/* Every equilibrium of the body in the given air (rho, mu, g; a for the Mach
 * check when > 0): f(v) = 1/2 rho v^2 Cd(Re(v)) A - m g is scanned for sign
 * changes on a log grid in Re (1e-6 .. 1e10, plus the curve's knots) and each
 * change refined with GSL's Brent solver. */
int sr_bluff_equilibria_find(const sr_bluff_body *b, const sr_air *air, sr_bluff_equilibria *out,
                             sr_error *err);

/* The classical fixed-point iteration: Cd -> v from the drag balance -> Re
 * -> Cd from the curve, repeated. */
#define SR_BLUFF_TRACE_MAX 200

typedef enum sr_bluff_outcome {
    SR_TRACE_CONVERGED = 0, /* successive Cd agree within the tolerance */
    SR_TRACE_CYCLE,         /* the iteration repeats a cycle of `period` steps */
    SR_TRACE_OSCILLATING,   /* alternates without settling or repeating */
    SR_TRACE_NOT_CONVERGED  /* the step limit came first */
} sr_bluff_outcome;

typedef struct sr_bluff_step {
    double cd;      /* the drag coefficient used in this step */
    double v;       /* speed from the drag balance with it, m/s */
    double re;      /* Reynolds number at that speed */
    double cd_next; /* the curve's Cd at that Re: the next step's guess */
    unsigned warn;
} sr_bluff_step;

typedef struct sr_bluff_trace {
    size_t n;
    sr_bluff_step step[SR_BLUFF_TRACE_MAX];
    sr_bluff_outcome outcome;
    int alternating; /* successive speeds jumped above and below (damped or not) */
    int period;      /* cycle length for SR_TRACE_CYCLE */
    int root;        /* index into the equilibria reached, -1 if none */
    double cd0, tol;
} sr_bluff_trace;

/* Run at most max_steps (<= SR_BLUFF_TRACE_MAX) from the guess cd0 (> 0),
 * converged when |Cd_next - Cd| <= tol Cd. `eq` (may be NULL) is used to name
 * the equilibrium reached. */
int sr_bluff_trace_run(const sr_bluff_body *b, const sr_air *air, double cd0, int max_steps, double tol,
                       const sr_bluff_equilibria *eq, sr_bluff_trace *out, sr_error *err);

/* Plain name of an outcome ("converged", "cycle", ...). */
const char *sr_bluff_outcome_name(sr_bluff_outcome o);

#endif
