/* sinkrate/physics.h - the models: quantities with units, the atmosphere, the
 * wind, canopy families and canopies, the equilibrium descent, opening
 * loads, free fall with Reynolds-dependent drag, and the staged-descent
 * engine's results. Conventions (errors, ownership, threads): sinkrate/base.h. */
#ifndef SINKRATE_PHYSICS_H
#define SINKRATE_PHYSICS_H

#include <stddef.h>

#include "sinkrate/base.h"

#ifdef __cplusplus
extern "C" {
#endif

/* ---- units ---------------------------------------------------------------
 * Quantities with units at the edges: "2.5 kg", "36in", "18 ft/s", "31 C". */

typedef enum sr_quantity {
    SR_Q_NONE = 0,     /* dimensionless: a bare number, no unit allowed */
    SR_Q_MASS,
    SR_Q_LENGTH,
    SR_Q_AREA,
    SR_Q_SPEED,
    SR_Q_TEMP,         /* absolute temperature */
    SR_Q_TEMP_DIFF,    /* a temperature offset (hot day +15 C) */
    SR_Q_PRESSURE,
    SR_Q_FORCE,
    SR_Q_ENERGY,
    SR_Q_ANGLE,        /* SI inside is the radian */
    SR_Q_TIME,
    SR_Q_DENSITY,
    SR_Q_AREAL_MASS,
    SR_Q_VISCOSITY,    /* dynamic */
    SR_Q_KIN_VISCOSITY,
    SR_Q_ACCEL,
    SR_Q_SIZE,         /* a canopy's diameter: a length shown in inches (feet from 10 ft on) under US */
    SR_Q_BEARING,      /* a direction clockwise from north: an angle shown from 0 up to, never at, 360 deg */
    SR_Q_VOLUME,       /* a packed canopy or a bay: shown in litres (SI) or cubic inches (US) */
    SR_Q_COUNT_        /* the number of quantities of this release (grows at the end) */
} sr_quantity;

typedef enum sr_unit_system { SR_UNITS_SI = 0, SR_UNITS_US = 1 } sr_unit_system;

/* Parse a number with an optional unit into SI. A bare number is SI for the
 * quantity (an angle excepted: a bare angle is degrees). NaN, inf, hex
 * floats, trailing junk and an absolute temperature below 0 K are errors; an
 * unknown unit is an error listing the accepted ones. */
SR_API int sr_units_parse(const char *text, sr_quantity q, double *si, sr_error *err);
/* As sr_units_parse, but a unit is required. */
SR_API int sr_units_parse_strict(const char *text, sr_quantity q, double *si, sr_error *err);
/* The display unit of a quantity in a unit system, and an SI value in it. */
SR_API const char *sr_units_label(sr_quantity q, sr_unit_system sys);
SR_API double sr_units_from_si(double si, sr_quantity q, sr_unit_system sys);
/* Name of a quantity ("mass", "speed") and its accepted units, comma-separated. */
SR_API const char *sr_units_quantity_name(sr_quantity q);
SR_API const char *sr_units_accepted(sr_quantity q);

/* ---- atmosphere ----------------------------------------------------------
 * The U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562) from -1 km to 86 km
 * geometric altitude, and its variants: a hot or cold day (an offset), a
 * site's measured surface values, a sounding. */

/* State of the air at one geometric altitude, SI (a fixed value struct). */
typedef struct sr_air {
    double z;   /* geometric altitude above mean sea level, m */
    double T;   /* temperature, K */
    double p;   /* pressure, Pa */
    double rho; /* density, kg/m3 */
    double a;   /* speed of sound, m/s */
    double mu;  /* dynamic viscosity, Pa s */
    double nu;  /* kinematic viscosity, m2/s */
    double g;   /* acceleration of gravity, m/s2 */
} sr_air;

typedef struct sr_atmos sr_atmos;

/* The 1976 standard. */
SR_API int sr_atmos_new_standard(sr_atmos **out, sr_error *err);
/* A hot (dT > 0) or cold day: T + dT at the standard pressure, K. */
SR_API int sr_atmos_new_offset(sr_atmos **out, double dT, sr_error *err);
/* A site at elevation z (m) with a measured surface temperature T (K)
 * and/or pressure p (Pa); NaN means "standard at that elevation". The
 * temperature difference to standard holds at every altitude, the pressure
 * follows the hydrostatic equation from the surface. */
SR_API int sr_atmos_new_site(sr_atmos **out, double z, double T, double p, sr_error *err);
/* A sounding: n rows of altitude (m, increasing), temperature (K) and
 * pressure (Pa); T linear and ln p linear between rows. The arrays are
 * copied. From a CSV file: sr_atmos_open_sounding (sinkrate/files.h). */
SR_API int sr_atmos_new_sounding(sr_atmos **out, const double *z, const double *T, const double *p, size_t n,
                                 sr_error *err);
/* A copy that owns its own memory. */
SR_API int sr_atmos_dup(sr_atmos **out, const sr_atmos *src, sr_error *err);
SR_API void sr_atmos_free(sr_atmos *m);

/* The air at geometric altitude z (m above mean sea level); outside the
 * model's range SR_EDOMAIN naming the range (never an extrapolation). */
SR_API int sr_atmos_at(const sr_atmos *m, double z, sr_air *out, sr_error *err);
/* Density only, with the same range rules. */
SR_API int sr_atmos_density(const sr_atmos *m, double z, double *rho, sr_error *err);
/* The valid altitude range, m. */
SR_API void sr_atmos_range(const sr_atmos *m, double *zmin, double *zmax);
/* One line, e.g. "U.S. Standard Atmosphere 1976 +15.0 K". */
SR_API void sr_atmos_describe(const sr_atmos *m, char *buf, size_t len);

/* ---- wind ----------------------------------------------------------------
 * Calm, constant, power law, log law, or a table. Directions are the
 * meteorological bearing the wind blows FROM, clockwise from north (rad);
 * heights are above ground. */

typedef struct sr_wind sr_wind;

SR_API int sr_wind_new_calm(sr_wind **out, sr_error *err);
SR_API int sr_wind_new_constant(sr_wind **out, double speed, double from, sr_error *err);
/* u(h) = u_ref (h / h_ref)^alpha */
SR_API int sr_wind_new_power(sr_wind **out, double speed_ref, double from, double h_ref, double alpha,
                             sr_error *err);
/* u(h) = u_ref ln((h - d)/z0) / ln((h_ref - d)/z0) */
SR_API int sr_wind_new_log(sr_wind **out, double speed_ref, double from, double h_ref, double z0, double d,
                           sr_error *err);
/* Rows of height (m, strictly increasing), speed (m/s) and direction (rad),
 * interpolated by east and north components. The arrays are copied. From a
 * CSV file: sr_wind_open_table (sinkrate/files.h). */
SR_API int sr_wind_new_table(sr_wind **out, const double *h, const double *speed, const double *from, size_t n,
                             sr_error *err);
SR_API int sr_wind_dup(sr_wind **out, const sr_wind *src, sr_error *err);
SR_API void sr_wind_free(sr_wind *w);

/* The air's velocity at height h above ground as east and north components
 * (the direction it moves TOWARD), m/s. */
SR_API void sr_wind_at(const sr_wind *w, double h, double *east, double *north);
/* One line, e.g. "power law: 5.0 m/s from 250 deg at 10 m, exponent 0.143". */
SR_API void sr_wind_describe(const sr_wind *w, sr_unit_system sys, char *buf, size_t len);

/* ---- canopy families and canopies ----------------------------------------
 * A family (a catalog entry, sinkrate/files.h) holds handbook values with
 * their sources; a canopy is a family at a size, alone or in a cluster.
 * Every drag coefficient carries its reference area. */

typedef enum sr_ref {
    SR_REF_NOMINAL = 0,   /* S0 = total canopy surface incl. vent and slots; D0 = sqrt(4 S0/pi) */
    SR_REF_PROJECTED,     /* Sp = pi Dp^2/4, the inflated canopy seen along the flow */
    SR_REF_CONSTRUCTED    /* Sc = pi Dc^2/4, from the flat (constructed) diameter */
} sr_ref;

SR_API const char *sr_ref_name(sr_ref ref); /* "nominal", "projected", "constructed" */

/* How a canopy's size is given. */
typedef enum sr_size_kind {
    SR_SIZE_NOMINAL_DIAMETER = 0,
    SR_SIZE_PROJECTED_DIAMETER,
    SR_SIZE_FLAT_DIAMETER,          /* the constructed (flat) diameter Dc */
    SR_SIZE_NOMINAL_AREA
} sr_size_kind;

/* The values of a family that carry a source. */
typedef enum sr_family_value {
    SR_FV_DRAG = 0,     /* drag coefficient CD0 on nominal area */
    SR_FV_PROJECTED,    /* projected ratio Dp/D0 */
    SR_FV_CONSTRUCTED,  /* constructed ratio Dc/D0 */
    SR_FV_OPENING,      /* opening-load factor CX */
    SR_FV_FILLING,      /* filling constant */
    SR_FV_OSCILLATION,  /* oscillation angle */
    SR_FV_MACH,         /* Mach limit of its usual application */
    SR_FV_AREAL,        /* areal mass (optional) */
    SR_FV_GROWTH,       /* growth exponent of the drag area while filling */
    SR_FV_COUNT_
} sr_family_value;

typedef struct sr_family sr_family;   /* owned by its catalog */
typedef struct sr_canopy sr_canopy;

SR_API const char *sr_family_id(const sr_family *f);     /* "conical" */
SR_API const char *sr_family_name(const sr_family *f);   /* "Conical (solid cloth)" */
SR_API const char *sr_family_class(const sr_family *f);  /* "solid" or "slotted" */
/* A value's band (the drag coefficient on nominal area, ratios, factors;
 * a single value as a band of three equal numbers; NaN when not given) and
 * its source as the family file states it ("" when none). */
SR_API sr_band sr_family_band(const sr_family *f, sr_family_value v);
SR_API const char *sr_family_source(const sr_family *f, sr_family_value v);

/* A canopy of family f from a size (m for a diameter, m2 for an area). A
 * diameter on another reference is converted through the family's Dp/D0 or
 * Dc/D0 range, which widens the bands. f NULL (a failed sr_catalog_find
 * just before): SR_EINVAL, and an error err already holds stays, so
 * sr_canopy_new(&c, sr_catalog_find(cat, id, err), ...) reports the
 * unknown id. */
SR_API int sr_canopy_new(sr_canopy **out, const sr_family *f, sr_size_kind kind, double value, sr_error *err);
SR_API int sr_canopy_dup(sr_canopy **out, const sr_canopy *src, sr_error *err);
SR_API void sr_canopy_free(sr_canopy *c);
/* Replace the family's drag range by a measured coefficient on a reference. */
SR_API int sr_canopy_set_measured_cd(sr_canopy *c, double cd, sr_ref ref, const char *source, sr_error *err);
/* A cluster of n (1..16) identical canopies; factor NaN: the default drag
 * loss of a cluster of n (from memory: 1.00, 0.97, 0.93, 0.90 from 4 on). */
SR_API int sr_canopy_set_cluster(sr_canopy *c, int n, double factor, sr_error *err);

SR_API const sr_family *sr_canopy_family(const sr_canopy *c);
SR_API int sr_canopy_count(const sr_canopy *c);
SR_API sr_band sr_canopy_nominal_area(const sr_canopy *c);     /* S0 of one canopy, m2 */
SR_API sr_band sr_canopy_nominal_diameter(const sr_canopy *c); /* D0 of one canopy, m */
/* Total drag area of the cluster (count x cluster factor x one canopy), m2. */
SR_API sr_band sr_canopy_total_cds(const sr_canopy *c);
/* The drag-coefficient band on nominal area. */
SR_API sr_band sr_canopy_cd0_band(const sr_canopy *c);

/* ---- descent -------------------------------------------------------------
 * The equilibrium drag balance m g = 1/2 rho v^2 CdS. */

/* v = sqrt(2 m g / (rho CdS)), SI. */
SR_API double sr_descent_speed(double mass, double g, double rho, double cds);
/* Descent rate of a canopy (cluster) carrying mass (kg) in the air state,
 * as a band ordered by value (lo from the high drag coefficient). body_cds:
 * the payload's own drag area (m2, 0 to neglect); a canopy with an areal mass
 * adds its fabric to the mass. */
SR_API int sr_descent_rate(const sr_canopy *c, double mass, double body_cds, const sr_air *air, sr_band *v,
                           sr_error *err);

/* ---- opening -------------------------------------------------------------
 * The pieces of the opening-load models every caller may want on its own;
 * the opening load of a deployment over its bands is sr_loads_deployment
 * (sinkrate/analysis.h). */

/* Filling time t_f = n_fill D0 / max(v1, v_steady), s (v_steady NaN: the law alone). */
SR_API int sr_opening_fill_time(double n_fill, double d0, double v1, double v_steady, double *t_f, sr_error *err);
/* Ballistic mass ratio R_m = rho cds^1.5 / m. */
SR_API double sr_opening_mass_ratio(double rho, double cds, double m);

/* ---- free fall -----------------------------------------------------------
 * A body falling without a canopy, with a drag coefficient that depends on
 * the Reynolds number (published curves for the sphere, the circular
 * cylinder broadside and the disk, or a table of your own). */

typedef enum sr_bluff_shape {
    SR_BLUFF_SPHERE = 0,
    SR_BLUFF_CYLINDER, /* circular cylinder broadside to the flow */
    SR_BLUFF_DISK,     /* thin circular disk normal to the flow */
    SR_BLUFF_TABLE     /* a Cd(Re) table of your own, any body */
} sr_bluff_shape;

/* How a body meets the flow when it falls with no canopy (failure cases). */
typedef enum sr_bluff_attitude {
    SR_ATTITUDE_BROADSIDE = 0, /* the curve's own attitude (a cylinder broadside, a disk face-on) */
    SR_ATTITUDE_TUMBLING,      /* tumbling through every orientation */
    SR_ATTITUDE_END_ON         /* stable end-on where the body can be, else tumbling */
} sr_bluff_attitude;

SR_API const char *sr_bluff_attitude_name(sr_bluff_attitude a); /* "broadside", "tumbling", "end-on" */

typedef struct sr_freefall sr_freefall;

/* A sphere, a cylinder or a disk of diameter d (m; a cylinder needs its
 * length, m) and mass (kg), on a built-in curve: curve NULL for the shape's
 * default, or a curve's short name ("sphere-cgw", "cylinder", ...). */
SR_API int sr_freefall_new(sr_freefall **out, sr_bluff_shape shape, const char *curve, double d, double length,
                           double mass, sr_error *err);
/* A body on a Cd(Re) table of n rows (Re increasing), with the length of
 * its Reynolds number d (m), the reference area of its Cd (m2) and its mass. */
SR_API int sr_freefall_new_table(sr_freefall **out, const double *re, const double *cd, size_t n, double d,
                                 double area, double mass, sr_error *err);
SR_API void sr_freefall_free(sr_freefall *f);
/* Cd at Reynolds number re (on the body's reference area). */
SR_API double sr_freefall_cd(const sr_freefall *f, double re);
/* Every equilibrium speed in the air state (drag equals weight), in
 * increasing order: up to cap of them into v, their number into *n. More
 * than one means a drag crisis; the fastest is always stable. */
SR_API int sr_freefall_speeds(const sr_freefall *f, const sr_air *air, double *v, size_t cap, size_t *n,
                              sr_error *err);
/* The terminal speed: the fastest equilibrium (a body that arrives fast
 * settles there), m/s. */
SR_API int sr_freefall_terminal(const sr_freefall *f, const sr_air *air, double *v, sr_error *err);

/* ---- the staged descent --------------------------------------------------
 * A mission flown stage by stage: build a context from a mission
 * (sr_mission_profile, sinkrate/files.h), run it (sr_profile_run) as often
 * as needed, from any number of threads, each with its own result. The
 * judged band runs of a mission are sr_band_run (sinkrate/analysis.h). */

/* Sections as a bit set: bit i is the mission's section i. */
typedef unsigned sr_section_set;

typedef enum sr_profile_mode {
    SR_PROFILE_FULL = 0, /* transients by an adaptive ODE, steady stages by adaptive quadrature */
    SR_PROFILE_FAST      /* table look-ups and the nominal transients reused (Monte Carlo work) */
} sr_profile_mode;

typedef enum sr_event_kind {
    SR_EVENT_START = 0,    /* the start state (apogee, release) */
    SR_EVENT_DEPLOY,       /* a stage's deployment event; a separation when it carries part of a body */
    SR_EVENT_LINE_STRETCH, /* only when the stage has a line-stretch time */
    SR_EVENT_FULL_OPEN,    /* end of the filling time */
    SR_EVENT_STEADY,       /* transient over: within the steady tolerance of the equilibrium */
    SR_EVENT_TOUCHDOWN
} sr_event_kind;

SR_API const char *sr_profile_event_name(sr_event_kind k);

/* A record: one event of a descent. */
typedef struct sr_profile_event {
    sr_event_kind kind;
    int stage;           /* stage index, -1 for start and touchdown */
    int body;            /* index of the body (sr_profile_result_body) */
    sr_section_set sections; /* the body's sections at that moment (a separation changes them) */
    double t;            /* s from the start */
    double h;            /* m above ground */
    double east, north;  /* m from the launch / release point */
    double speed;        /* airspeed, m/s */
    double rate;         /* descent rate (downward speed), m/s */
    double q;            /* dynamic pressure on the airspeed, Pa */
    double mach;
} sr_profile_event;

/* A record: what one stage did. */
typedef struct sr_profile_stage {
    int deployed;           /* 0: failed (failure case) or its body landed first */
    int body;               /* body it deployed on */
    double t_deploy, h_deploy;
    double speed_deploy;    /* airspeed at the deployment event, m/s */
    double q_deploy, mach_deploy, rho_deploy;
    double t_line, speed_line;  /* line stretch: time and airspeed */
    double h_line;          /* height of line stretch, m */
    double path_line;       /* flight-path angle at line stretch, rad below the horizontal */
    double t_fill;          /* filling time, s */
    double d0;              /* nominal diameter of one canopy in this run, m */
    double cds_canopy;      /* full drag area of one canopy in this run (cluster factor included), m2 */
    double t_full, h_full;  /* full open (NaN in fast mode) */
    double t_steady, h_steady; /* steady again (NaN in fast mode or when never reached) */
    double t_end, h_end;    /* next deployment on the same body, or touchdown */
    double rate_top, rate_bottom; /* steady descent rate at h_deploy and h_end, m/s */
    double cds;             /* drag area of the body with this stage fully open, m2 */
    double mass;            /* mass of the body under it, kg */
} sr_profile_stage;

/* A record: one body that lands (sections hanging together). */
typedef struct sr_profile_body {
    sr_section_set sections;
    int parent;             /* body it separated from, -1 for the first */
    int stage_split;        /* stage whose deployment separated it, -1 */
    double mass;            /* kg, canopy fabric included */
    double t_land;          /* s */
    double east, north;     /* landing point from the launch / release point, m */
    double drift;           /* distance of the landing point from it, m */
    double bearing;         /* rad, direction from it to the landing point, clockwise from north */
    double rate_land;       /* descent rate at touchdown, m/s */
    double speed_land;      /* airspeed at touchdown, m/s */
    double ground_speed;    /* horizontal speed over the ground at touchdown, m/s */
    int steady_land;        /* 1 when it lands in steady descent, 0 during a transient */
    int canopies;           /* number of stages open on it at touchdown */
    unsigned open;          /* those stages (bit k: stage k) */
    int free_fall;          /* it fell with no canopy open on Reynolds-dependent drag */
    int equilibria;         /* equilibrium speeds at the ground (free fall), 0 otherwise */
    int crisis;             /* several equilibria: the touchdown speed was raised to v_terminal */
    double speed_arrive;    /* airspeed the integration arrived with, m/s (free fall; NaN otherwise) */
    double v_terminal;      /* fastest equilibrium speed at the ground, m/s (free fall; NaN otherwise) */
    unsigned drag_warn;     /* warnings of the drag curves at touchdown (free fall) */
    int no_drag;            /* it fell some way with no canopy open and no drag of its own at all */
} sr_profile_body;

typedef struct sr_profile_ctx sr_profile_ctx;         /* a mission, ready to fly */
typedef struct sr_profile_result sr_profile_result;   /* one descent */
typedef struct sr_profile_opts sr_profile_opts;       /* options: pass NULL for the defaults */
typedef struct sr_profile_perturb sr_profile_perturb; /* changes of one sample: pass NULL for none */
typedef struct sr_profile_work sr_profile_work;       /* per-thread scratch: pass NULL to allocate per call */
typedef struct sr_profile_track sr_profile_track;     /* points for plots: pass NULL for none */

SR_API void sr_profile_ctx_free(sr_profile_ctx *ctx);
SR_API int sr_profile_result_new(sr_profile_result **out, sr_error *err);
SR_API void sr_profile_result_free(sr_profile_result *r);

/* One descent of the mission. Thread-safe for a shared ctx, each thread with
 * its own result. Pass NULL for p, w and track. */
SR_API int sr_profile_run(const sr_profile_ctx *ctx, const sr_profile_perturb *p, sr_profile_mode mode,
                          sr_profile_work *w, sr_profile_result *r, sr_profile_track *track, sr_error *err);
/* The nominal full-mode result the context keeps (owned by ctx). */
SR_API const sr_profile_result *sr_profile_nominal(const sr_profile_ctx *ctx);

/* A result's events (in time order), stages and bodies; NULL past the end. */
SR_API size_t sr_profile_result_events(const sr_profile_result *r);
SR_API const sr_profile_event *sr_profile_result_event(const sr_profile_result *r, size_t i);
SR_API size_t sr_profile_result_stages(const sr_profile_result *r);
SR_API const sr_profile_stage *sr_profile_result_stage(const sr_profile_result *r, size_t k);
SR_API size_t sr_profile_result_bodies(const sr_profile_result *r);
SR_API const sr_profile_body *sr_profile_result_body(const sr_profile_result *r, size_t i);
/* Summary: the last touchdown (s), the highest touchdown descent rate (m/s),
 * the highest landing energy of a section (J), the farthest landing point (m). */
SR_API double sr_profile_result_descent_time(const sr_profile_result *r);
SR_API double sr_profile_result_max_rate(const sr_profile_result *r);
SR_API double sr_profile_result_max_energy(const sr_profile_result *r);
SR_API double sr_profile_result_max_drift(const sr_profile_result *r);

#ifdef __cplusplus
}
#endif

#endif
