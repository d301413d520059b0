/* opening.h - opening loads of a canopy (or cluster) at deployment: filling
 * time, the opening-load-factor method, the Pflanz method and an inflation ODE.
 * Pure numerics on SI inputs; no files, no options, no printing. */
#ifndef SR_OPENING_H
#define SR_OPENING_H

#include <stddef.h>

#include "base/error.h"
#include "sinkrate/physics.h"

/* Growth-law exponent of the drag area by canopy class (K91 Pflanz curves,
 * exponents from memory: handbook reference file section 4.2). The typical
 * value of each class; sr_opening_class_band gives the band the trade's
 * drop-test fits spread over. */
typedef enum sr_opening_class {
    SR_OPENING_SOLID = 0, /* solid cloth: slow start, fast finish, n = 2 */
    SR_OPENING_SLOTTED,   /* ribbon, ringslot, ringsail: near-linear, n = 1 */
    SR_OPENING_REEFED     /* a reefed stage: fast start, n = 1/2 (reefing itself is not modelled) */
} sr_opening_class;

/* Which side of the infinite/finite-mass divide a case is closer to. */
typedef enum sr_opening_regime {
    SR_OPENING_INFINITE_MASS = 0, /* peak at full inflation: the payload barely slows while filling */
    SR_OPENING_FINITE_MASS        /* peak before full inflation: the payload slows while filling */
} sr_opening_regime;

/* How the inflation ODE's peak came about. */
typedef enum sr_opening_peak_kind {
    SR_PEAK_INTERIOR = 0, /* a smooth maximum during filling (dF/dt changes sign) */
    SR_PEAK_FULL,         /* at the end of filling (the growth law's kink) */
    SR_PEAK_STEADY        /* still rising at full inflation: deployment below terminal speed, the
                           * force only approaches the weight; no opening shock above steady drag */
} sr_opening_peak_kind;

/* Mach number at deployment from which the models here stop: the filling-time
 * law and the incompressible growth model are subsonic models (common practice). */
#define SR_OPENING_MACH_MAX 1.0

/* Everything the opening-load methods need, SI. sr_opening_input_init sets
 * the required fields to NaN (so a forgotten one is reported) and the
 * optional ones to their defaults. */
typedef struct sr_opening_input {
    /* required */
    double cds0;     /* drag area CD0*S0 of ONE fully open canopy, on nominal area S0, m2
                      * (apply any cluster drag loss before passing it) */
    double d0;       /* nominal diameter D0 of one canopy, m */
    double mass;     /* mass the canopies decelerate, kg */
    double v1;       /* speed at line stretch (start of filling), m/s */
    double rho;      /* air density at deployment, kg/m3 (held constant over the opening) */
    double a;        /* speed of sound at deployment, m/s */
    double n_fill;   /* the family's filling constant: t_f = n_fill*D0/v1 (0.5 .. 50) */
    double cx;       /* the family's opening-load factor at infinite mass */
    /* optional */
    int count;       /* canopies in the cluster, >= 1 (default 1) */
    double path_angle; /* flight-path angle at line stretch, rad, positive BELOW the horizontal
                        * as in mission files (pi/2 = straight down, the default; 0 = level,
                        * as at apogee; negative = climbing) */
    double g;        /* gravity for the ODE, m/s2 (default 9.80665; 0 switches it off) */
    double exponent; /* Pflanz growth exponent n; default 2 (solid cloth) */
    double design_factor;     /* 1 .. 10 to get required rated strengths; 0 = none (default) */
    double cluster_allowance; /* per-canopy load over the equal share, 1 .. 10; 0 = derive the bound
                               * "lead canopy takes the whole mass alone" (default) */
    double mach_envelope;     /* the family's application limit; above it only a warning flag; 0 = none */
    double v_steady;          /* steady descent rate after the opening, m/s, for the filling time (below);
                               * NaN (default): the full canopies' own rate with this mass, rho and g */
    double cds_other;         /* drag area open besides the canopies (a drogue kept, the sections), m2,
                               * default 0: it slows the payload in the inflation ODE (the ODE estimate
                               * and the traces); the closed forms and the fast path leave it out, which
                               * overstates their peaks */
} sr_opening_input;

/* One method's peak. Forces are totals on the payload (all canopies). */
typedef struct sr_opening_peak {
    double force;   /* peak opening force, N (includes CX, except a steady peak: the weight) */
    double x1;      /* force-reduction factor: force / (CX * CD0S0_total * q1) */
    double time;    /* time of peak after line stretch, s (NaN when the method has none) */
    double speed;   /* speed at the peak, m/s (NaN when the method has none) */
    double decel_g; /* force / (mass * g0): the payload's peak deceleration in standard g */
    int kind;       /* sr_opening_peak_kind for the ODE and Pflanz; -1 for the opening-load-factor
                     * method, which has no time history */
} sr_opening_peak;

typedef struct sr_opening_result {
    /* deployment state */
    double q1;          /* dynamic pressure at line stretch, Pa */
    double mach;        /* Mach number at line stretch */
    double t_fill;      /* filling time, s */
    double cds_total;   /* count * cds0, m2 */
    double cd0;         /* cds0 / S0, on nominal area */
    double drag_steady; /* cds_total * q1: drag of the full canopies at v1, N */
    double f_infinite;  /* CX * cds_total * q1: infinite-mass peak, N */
    /* mass ratios */
    double mass_ratio;  /* R_m = rho*(CD0S0)^1.5 / (m/count), per canopy, dimensionless */
    double ballistic;   /* Pflanz A = 2 m / (CD0S0_total rho v1 t_f) */
    double exponent;    /* growth exponent used */
    int regime;         /* sr_opening_regime */
    /* the three estimates */
    sr_opening_peak olf;    /* opening-load-factor method (X1 from R_m) */
    sr_opening_peak pflanz; /* Pflanz closed form, gravity neglected */
    sr_opening_peak ode;    /* inflation ODE with gravity and path angle */
    double f_low, f_high;   /* lowest and highest of the three, N */
    double spread;          /* (f_high - f_low) / f_low */
    double decel_g_max;     /* highest of the three decelerations, g */
    /* clusters (count > 1; for a single canopy both equal f_high) */
    double f_canopy_equal;  /* f_high / count: every canopy inflating together, N */
    double f_canopy_design; /* per-canopy load with the unequal-inflation allowance, N */
    double allowance;       /* f_canopy_design / f_canopy_equal */
    int allowance_derived;  /* 1 when the allowance is the lead-canopy bound, 0 when given */
    /* design factor (0 when none was given) */
    double design_factor;
    double strength_total;  /* design_factor * f_high: attachment of the whole system, N */
    double strength_canopy; /* design_factor * f_canopy_design: each canopy and its riser, N */
    double v_terminal;      /* steady descent speed of the full canopies at rho, m/s (inf when g = 0) */
    /* warnings */
    int above_envelope;     /* Mach above the family's application envelope */
    int slow_deployment;    /* v1 below v_terminal: the payload speeds up while the canopy fills, the
                             * time law t_f = n D0/v1 stretches the filling and the weight governs */
} sr_opening_result;

void sr_opening_input_init(sr_opening_input *in);

/* Growth exponent of a canopy class (from memory, see sr_opening_class). */
double sr_opening_class_exponent(sr_opening_class c);

/* The band of the growth exponent of a class: solid cloth 1 / 2 / 3, slotted
 * 0.5 / 1 / 2, reefed 0.5 / 0.5 / 1 (n = 2 solid and 1 slotted are the values
 * commonly used; fits to drop tests spread about 0.5 .. 3: from memory,
 * trade-facts.md section 6). A family file may set its own. */
void sr_opening_class_band(sr_opening_class c, double *lo, double *typ, double *hi);

/* Filling time, the one definition every command uses:
 *     t_f = n_fill * D0 / max(v1, v_steady)
 * n_fill D0 / v1 is the handbook's law (K91, from memory: handbook reference
 * file section 4.3), meant for deployments at speed; a canopy deployed slower
 * than its steady descent rate v_steady (an opening from rest, a drogue at
 * apogee) fills as at that rate. v_steady <= 0 or NaN: the law alone. Errors
 * for a non-positive constant, diameter or speed. */
/* (sr_opening_fill_time, public: include/sinkrate/physics.h) */

/* sr_opening_mass_ratio (public): R_m = rho * cds^1.5 / m, one canopy's drag
 * area and the mass it carries. */

/* Pflanz closed form for drag area growing as (t/t_f)^n with gravity
 * neglected: X1 (peak force over cds*q1) and the peak's time over t_f, from
 * the ballistic parameter A = 2m/(cds rho v1 t_f). Speed ratio at the peak in
 * *v_ratio (any out-pointer may be NULL). */
int sr_opening_pflanz_x1(double A, double n, double *x1, double *tau_peak, double *v_ratio, sr_error *err);

/* X1 of the opening-load-factor method from the mass ratio R_m: the upper
 * envelope of the growth-model curves for the unreefed classes (n = 1 and 2),
 * mapped to A through R_m, CD0S0, D0 and n_fill (see opening.c). */
int sr_opening_olf_x1(double mass_ratio, double cds, double d0, double n_fill, double *x1, sr_error *err);

/* All three estimates, the cluster split and the design strengths. */
int sr_opening_solve(const sr_opening_input *in, sr_opening_result *out, sr_error *err);

/* The three estimates on the fast path (design search, dispersion): the two
 * closed forms exactly, the inflation ODE by a fixed-step classical
 * Runge-Kutta scheme on 32 steps over the filling time (more where the drag
 * would make it stiff), the peak placed by cubic Hermite interpolation of F
 * and dF/dt between steps. About 7 times faster than sr_opening_solve's
 * adaptive solver; no allocation. The forces are for CX = 1 and without the
 * weight, so every opening-load factor of a band is one multiplication (see
 * sr_opening_quick_high/low). Within 0.5 % of sr_opening_solve's f_high on the
 * grid of cases in tests/test_opening.c. Single canopies and the equal share
 * of clusters; the cluster allowance is not computed here. */
typedef struct sr_opening_quick {
    double olf, pflanz, ode; /* peak forces at CX = 1, N (the ODE's dynamic peak, without the weight) */
    double weight;           /* m g with gravity on, else 0: the ODE's steady peak */
    double mass;             /* kg */
    double t_fill, q1, mach; /* s, Pa, - */
    int slow_deployment;     /* v1 below the steady rate */
} sr_opening_quick;

int sr_opening_solve_fast(const sr_opening_input *in, sr_opening_quick *out, sr_error *err);

/* Highest and lowest of the three estimates at opening-load factor cx, as
 * sr_opening_solve's f_high and f_low. */
double sr_opening_quick_high(const sr_opening_quick *q, double cx);
double sr_opening_quick_low(const sr_opening_quick *q, double cx);

/* An upper bound of f_high (any growth exponent, any of the three methods),
 * without solving: while it fills the payload gains at most g t_f of speed,
 * so no force exceeds max(CX, 1) (v1 + g t_f)^2 rho/2 times the full drag
 * area, or the weight (docs/method.md, opening loads). 5 % above that for
 * the fixed-step solver's interpolation. For skipping solves whose result
 * cannot break a limit; +inf when the input is not valid. */
double sr_opening_bound(const sr_opening_input *in);

/* The inflation ODE's drag force of the growth model, all canopies, WITHOUT
 * CX (the over-inflation factor belongs to the peak, not to the steady drag
 * that follows), at n times evenly spread over [0, t_end] (t_end <= 0: three
 * filling times), for plotting only. t and force hold n values each. */
int sr_opening_trace(const sr_opening_input *in, double t_end, size_t n, double *t, double *force, sr_error *err);

/* The same drag force (all canopies, without CX; not cds_other's) at the
 * given non-decreasing times after line stretch (times before it: the
 * deployment state, no force), with the filling time t_fill when it is
 * positive (a fit's trial value) or else the law's. speed (may be NULL) gets
 * the payload's airspeed there. The one inflation model a measured force
 * history is fitted with (analysis/fit_opening.c). */
int sr_opening_trace_at(const sr_opening_input *in, double t_fill, const double *t, size_t n, double *force,
                        double *speed, sr_error *err);

#endif
