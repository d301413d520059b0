/* cmd_sweep.c - `sinkrate sweep`: a table, and a figure with --plot, of the
 * descent rate band over altitude, mass, nominal diameter, temperature
 * offset or site elevation (with the time to the ground for altitude), or of
 * the nominal size each canopy family needs over a range of target speeds. */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "physics/descent.h"
#include "files/mission.h"
#include "analysis/input_warnings.h"
#include "analysis/sweep.h"

#define MAX_CANOPIES 8
#define MAX_BY 8
#define MAX_MARKS 4

typedef struct sweep_opts {
    const char *vary, *from, *to, *step, *values, *by, *figure;
    const char *mark_speed, *mark_altitude;
    sr_payload_opts payload;
    sr_canopy_opts canopy[MAX_CANOPIES];
    int ncanopy;
    sr_atmos_opts atmos;
} sweep_opts;

/* Several canopies: --family or --canopy starts each, and the canopy
 * options after it belong to it (each once per canopy). */
static int take_canopy(sr_cli *c, const sr_opt *opt, const char *arg, void *place)
{
    sweep_opts *o = place;
    int family = strcmp(opt->name, "family") == 0;
    if (family || strcmp(opt->name, "canopy") == 0) {
        if (o->ncanopy == MAX_CANOPIES)
            return sr_cli_fail(c, "--%s: at most %d canopies in one sweep", opt->name, MAX_CANOPIES);
        sr_canopy_opts *n = &o->canopy[o->ncanopy++];
        memset(n, 0, sizeof *n);
        if (family)
            n->family = arg;
        else
            n->canopy = arg;
        return 0;
    }
    if (o->ncanopy == 0)
        return sr_cli_fail(c, "--%s: give it after the --family (or --canopy) it belongs to", opt->name);
    sr_canopy_opts *cur = &o->canopy[o->ncanopy - 1];
    const char **slot = (const char **)((char *)cur + opt->offset);
    if (*slot)
        return sr_cli_fail(c, "--%s: given twice for canopy %d (%s); start the next canopy with --family", opt->name,
                           o->ncanopy, cur->family ? cur->family : cur->canopy);
    *slot = arg;
    return 0;
}

static const sr_opt OPTS[] = {
    SR_OPT_HEADING("What varies:"),
    SR_OPT_STRING("vary", "VAR", sweep_opts, vary,
                  "altitude (default), mass, diameter, temp-offset, site-elevation, or speed:"),
    SR_OPT_ITEM("altitude", "rows at each altitude above sea level, with the time to descend from there to the "
                            "ground under that canopy"),
    SR_OPT_ITEM("mass", "payload mass, rate at --altitude (default: the ground)"),
    SR_OPT_ITEM("diameter", "the canopy's nominal diameter D0 (give --family without a size)"),
    SR_OPT_ITEM("temp-offset", "hot or cold day: temperature offset from standard"),
    SR_OPT_ITEM("site-elevation", "touchdown rate at sites of these elevations (standard pressure there, the "
                                  "temperature offset kept)"),
    SR_OPT_ITEM("speed", "sizing: the nominal diameter each family needs to descend at these target speeds at "
                         "--altitude (give --family without a size)"),
    SR_OPT_STRING("from", "X", sweep_opts, from,
                  "the first value: --from, --to and --step give the values, ends included when a step lands on "
                  "them (altitude default: the ground to 3000 m above it, or the mission's first deployment)"),
    SR_OPT_STRING("to", "X", sweep_opts, to, "the last value"),
    SR_OPT_STRING("step", "X", sweep_opts, step, "the step; it takes the sign of to - from"),
    SR_OPT_STRING("values", "X,Y,...", sweep_opts, values, "or a list of values"),
    SR_OPT_STRING("by", "VAR=X,Y,...", sweep_opts, by,
                  "a second variable (any of the first five): one curve per value, e.g. --by "
                  "temp-offset=-20C,0C,25C; at most 100000 rows in all (values x curves)"),
    SR_OPT_HEADING("The case:"),
    SR_OPT_GROUP(sr_cli_group_payload, sweep_opts, payload),
    SR_OPT_FOR("mass", "M", "payload mass (the canopy's fabric is added with --areal-mass)"),
    SR_OPT_FOR("altitude", "Z",
               "where mass, diameter, temp-offset and speed rows are evaluated (default: the ground)"),
    SR_OPT_FOR("body-drag-area", "A", "payload drag area CdA added to each canopy's"),
    SR_OPT_FOR("mission", "FILE",
               "mass (all sections), site, and every stage's canopy as a curve; --family options replace the "
               "stages"),
    SR_OPT_TEXT("Several canopies: each --family ID (or --canopy FILE) starts a canopy, and the size, drag and "
                "cluster options that follow it, up to the next --family or --canopy, belong to it; e.g.\n"
                "  --family cross --nominal-diameter 0.9m --family conical --nominal-diameter 2.2m\n"
                "At most 8 canopies and 8 --by values."),
    SR_OPT_HEADING("What the figure shows (with --plot):"),
    SR_OPT_STRING("figure", "rate|time|both", sweep_opts, figure,
                  "altitude sweeps: altitude (vertical) against descent rate, descent time against deployment "
                  "altitude, or both side by side (default both)"),
    SR_OPT_STRING("mark-speed", "V,...", sweep_opts, mark_speed,
                  "marker lines at these speeds (a touchdown-speed limit)"),
    SR_OPT_STRING("mark-altitude", "Z,...", sweep_opts, mark_altitude,
                  "marker lines at these altitudes above sea level"),
    SR_OPT_GROUP_CALL(sr_cli_group_canopy, take_canopy, SR_OPT_REPEAT),
    SR_OPT_GROUP(sr_cli_group_atmos, sweep_opts, atmos),
    SR_OPT_CLI_GROUP(sr_cli_group_plot),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "sweep", NULL};

static int run_sweep(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_sweep = {
    .name = "sweep",
    .summary = "a table and figure over altitude, mass, diameter, temperature or site",
    .usage = "usage: sinkrate sweep [--vary VAR] (--from X --to X --step X | --values X,...) [--by VAR=X,...]\n"
             "                      --mass M --family ID --nominal-diameter D [--family ID ...] [options]\n"
             "       sinkrate sweep --mission FILE [--vary VAR ...] [options]\n",
    .about = "A table of the equilibrium descent rate (low / typical / high from the drag range), air density, "
             "dynamic pressure and Mach number over one variable, one row per value and one curve per canopy (and "
             "per --by value); --plot draws it.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_sweep,
};

/* ---- progress on a terminal ---- */

typedef struct progress {
    FILE *f;
    size_t base, total;
    int last;
} progress;

static void show_progress(void *ud, size_t done, size_t total)
{
    (void)total;
    progress *p = ud;
    int pct = (int)(100.0 * (double)(p->base + done) / (double)p->total);
    if (pct != p->last) {
        fprintf(p->f, "\rsinkrate sweep: %3d%% of %zu rows", pct, p->total);
        fflush(p->f);
        p->last = pct;
    }
}

/* ---- labels ---- */

static void size_label(char *buf, size_t len, const sr_canopy *cp, sr_unit_system sys)
{
    char v[64];
    static const char *SYM[] = {"D0", "Dp", "Dc", "S0"};
    sr_report_format_value(v, sizeof v, cp->size_value, cp->size_kind == SR_SIZE_NOMINAL_AREA ? SR_Q_AREA : SR_Q_SIZE,
                           sys, 3);
    snprintf(buf, len, "%s %s", SYM[cp->size_kind], v);
}

static void canopy_label(char *buf, size_t len, const sr_canopy *cp, const char *stage, int with_size,
                         sr_unit_system sys)
{
    char size[96] = "", cl[32] = "";
    if (with_size)
        size_label(size, sizeof size, cp, sys);
    if (cp->count > 1)
        snprintf(cl, sizeof cl, "%d x ", cp->count);
    char out[256];
    if (stage)
        snprintf(out, sizeof out, "%s (%s%s%s%s)", stage, cl, cp->fam.id, size[0] ? ", " : "", size);
    else
        snprintf(out, sizeof out, "%s%s%s%s", cl, cp->fam.id, size[0] ? ", " : "", size);
    snprintf(buf, len, "%s", out);
}

static void var_value_label(char *buf, size_t len, sr_sweep_var v, double x, sr_unit_system sys)
{
    char val[64];
    int sig = v == SR_SWEEP_ALTITUDE || v == SR_SWEEP_SITE_ELEVATION ? SR_FIXED(0) : 3;
    if (v == SR_SWEEP_TEMP_OFFSET) {
        double d = sr_units_from_si(x, SR_Q_TEMP_DIFF, sys);
        sig = fabs(d - round(d)) < 0.05 ? SR_FIXED(0) : SR_FIXED(1);
    }
    sr_report_format_value(val, sizeof val, x, sr_sweep_var_quantity(v), sys, sig);
    static const char *WHAT[] = {"altitude", "mass", "D0", "\u0394T", "site", "speed"};
    /* offsets carry their sign, with a true minus */
    const char *sign = v == SR_SWEEP_TEMP_OFFSET && x > 0 ? "+" : "";
    if (v == SR_SWEEP_TEMP_OFFSET && val[0] == '-') {
        memmove(val, val + 1, strlen(val));
        sign = "\u2212";
    }
    snprintf(buf, len, "%s %s%s", WHAT[v], sign, val);
}

/* A "nice" step near span/100: 1, 2 or 5 times a power of ten. */
static double nice_step(double span)
{
    double raw = span / 100.0, p = pow(10.0, floor(log10(raw))), m = raw / p;
    return (m < 1.5 ? 1.0 : m < 3.5 ? 2.0 : m < 7.5 ? 5.0 : 10.0) * p;
}

/* ---- the command ---- */

typedef struct curve {
    sr_sweep_case cs;
    char label[200];
    int canopy;     /* index into the canopy list */
    double by;      /* the --by value, NaN without */
    sr_sweep_row *rows;
} curve;

typedef struct run {
    sr_cli *c;
    sweep_opts o;
    sr_catalog *cat;
    sr_mission *mis;
    sr_atmos atm;
    double ground, mass, body, altitude;
    sr_canopy canopies[MAX_CANOPIES];
    char labels[MAX_CANOPIES][160];
    const char *stage_names[MAX_CANOPIES];
    int ncanopy;
    sr_sweep_var var, byvar;
    int has_by;
    double byvals[MAX_BY];
    size_t nby;
    double *xs;
    size_t nx;
    curve *curves;
    size_t ncurves;
    sr_sweep_row *rows;
    double marks_v[MAX_MARKS], marks_z[MAX_MARKS + SR_MISSION_MAX_STAGES];
    char marks_z_label[MAX_MARKS + SR_MISSION_MAX_STAGES][80];
    size_t nmark_v, nmark_z;
    int figure; /* 0 rate, 1 time, 2 both */
    const char *range_opt[2];
    double ends[2];
    int has_ends;
} run;

static int parse_by(run *R)
{
    sr_cli *c = R->c;
    const char *eq = strchr(R->o.by, '=');
    if (!eq)
        return sr_cli_fail(c, "--by: '%s' is not VAR=LIST (e.g. temp-offset=-20C,0C,25C)", R->o.by);
    char var[32];
    snprintf(var, sizeof var, "%.*s", (int)(eq - R->o.by), R->o.by);
    if (sr_sweep_var_parse(var, &R->byvar) || R->byvar == SR_SWEEP_SPEED)
        return sr_cli_fail(c, "--by: '%s' is not one of altitude, mass, diameter, temp-offset, site-elevation", var);
    if (R->byvar == R->var)
        return sr_cli_fail(c, "--by: %s is already the swept variable (--vary)", var);
    R->has_by = 1;
    return sr_cli_quantity_list(c, "--by", eq + 1, sr_sweep_var_quantity(R->byvar), R->byvals, MAX_BY, &R->nby);
}

static int uses(const run *R, sr_sweep_var v)
{
    return R->var == v || (R->has_by && R->byvar == v);
}

static int load_case(run *R)
{
    sr_cli *c = R->c;
    sweep_opts *o = &R->o;
    sr_error e;
    int rc;
    if ((rc = sr_cli_catalog(c, &R->cat)) ||
        (rc = sr_cli_mission(c, o->payload.mission, R->cat, &o->atmos, &R->mis, &R->atm, &R->ground)))
        return rc;
    R->mass = R->mis ? sr_mission_total_mass(R->mis) : NAN;
    int sized_by_sweep = uses(R, SR_SWEEP_DIAMETER) || R->var == SR_SWEEP_SPEED;
    if (o->ncanopy > 0) {
        for (int i = 0; i < o->ncanopy; i++) {
            sr_canopy_opts *co = &o->canopy[i];
            int has_size = co->nominal_diameter || co->projected_diameter || co->flat_diameter || co->nominal_area;
            if (sized_by_sweep && has_size)
                return sr_cli_fail(c, "canopy %d (%s): %s sets the size; drop its size option", i + 1,
                                   co->family ? co->family : co->canopy,
                                   R->var == SR_SWEEP_SPEED ? "--vary speed" : "the diameter sweep");
            if ((rc = sr_cli_canopy(c, R->cat, co, !sized_by_sweep, &R->canopies[i])))
                return rc;
            R->stage_names[i] = NULL;
        }
        R->ncanopy = o->ncanopy;
    } else if (R->mis) {
        for (size_t i = 0; i < R->mis->nstages; i++) {
            const sr_stage *st = &R->mis->stages[i];
            if (!st->has_size && !sized_by_sweep)
                return sr_cli_fail(c, "--mission: stage '%s' has no size; give one in the file, or --family with a "
                                      "size", st->name);
            R->canopies[R->ncanopy] = st->canopy;
            R->stage_names[R->ncanopy] = st->name;
            R->ncanopy++;
        }
    } else {
        return sr_cli_fail(c, "--family: at least one canopy is needed (--family ID with a size, --canopy FILE, or "
                              "--mission FILE); sinkrate canopies lists the families");
    }
    for (int i = 0; i < R->ncanopy; i++)
        canopy_label(R->labels[i], sizeof R->labels[i], &R->canopies[i], R->stage_names[i], !sized_by_sweep, c->units);

    if (uses(R, SR_SWEEP_MASS)) {
        if (o->payload.mass)
            return sr_cli_fail(c, "--mass: the sweep sets the mass; drop --mass");
        R->mass = 1.0; /* replaced row by row */
    } else if ((rc = sr_cli_mass(c, o->payload.mass, "the payload mass", &R->mass))) {
        return rc;
    }
    R->body = 0.0;
    if ((rc = sr_cli_body_drag(c, o->payload.body, &R->body)))
        return rc;
    R->altitude = NAN;
    if (o->payload.altitude) {
        if (uses(R, SR_SWEEP_ALTITUDE))
            return sr_cli_fail(c, "--altitude: the sweep sets the altitude; drop --altitude");
        if (uses(R, SR_SWEEP_SITE_ELEVATION))
            return sr_cli_fail(c, "--altitude: a site-elevation sweep evaluates at each site's ground; drop --altitude");
        if ((rc = sr_cli_quantity(c, "--altitude", o->payload.altitude, SR_Q_LENGTH, 0, &R->altitude)))
            return rc;
        sr_air a;
        if (sr_atmos_at(&R->atm, R->altitude, &a, &e))
            return sr_cli_fail(c, "--altitude: %s", e.msg);
    }
    if (uses(R, SR_SWEEP_TEMP_OFFSET) || uses(R, SR_SWEEP_SITE_ELEVATION)) {
        if (R->atm.kind == SR_ATMOS_SOUNDING)
            return sr_cli_fail(c, "--sounding: a sounding fixes temperature and ground; it cannot be swept over %s",
                               uses(R, SR_SWEEP_TEMP_OFFSET) ? "temp-offset" : "site-elevation");
        if (uses(R, SR_SWEEP_TEMP_OFFSET) && o->atmos.temp_offset)
            return sr_cli_fail(c, "--temp-offset: the sweep sets the temperature offset; drop --temp-offset");
        if (uses(R, SR_SWEEP_TEMP_OFFSET) && o->atmos.surface_temp)
            return sr_cli_fail(c, "--surface-temp: the sweep sets the temperature offset; drop --surface-temp");
        if (uses(R, SR_SWEEP_SITE_ELEVATION) && (o->atmos.site_elevation || o->atmos.surface_pressure))
            return sr_cli_fail(c, "%s: the sweep sets the site elevation; drop it",
                               o->atmos.site_elevation ? "--site-elevation" : "--surface-pressure");
    }
    return 0;
}

static int check_value(run *R, const char *opt, double x);

static int make_values(run *R)
{
    sr_cli *c = R->c;
    sweep_opts *o = &R->o;
    sr_quantity q = sr_sweep_var_quantity(R->var);
    sr_error e;
    int rc;
    if (o->values && (o->from || o->to || o->step))
        return sr_cli_fail(c, "--values: give a list or --from/--to/--step, not both");
    if (o->values) {
        R->xs = malloc(1024 * sizeof *R->xs);
        if (!R->xs)
            return sr_cli_fail(c, "out of memory");
        R->range_opt[0] = R->range_opt[1] = "--values";
        return sr_cli_quantity_list(c, "--values", o->values, q, R->xs, 1024, &R->nx);
    }
    double from, to, step;
    if (!o->from && !o->to && !o->step) {
        if (R->var != SR_SWEEP_ALTITUDE)
            return sr_cli_fail(c, "--from/--to/--step or --values: which values of %s to sweep?",
                               sr_sweep_var_name(R->var));
        /* altitude: from the ground up to the mission's first deployment, or 3000 m */
        double top = R->mis && R->mis->has_start ? R->mis->start_height : 3000.0;
        from = R->ground;
        to = R->ground + top;
        step = nice_step(top);
        R->range_opt[0] = R->range_opt[1] = "--vary altitude (default range)";
    } else {
        if (!o->from || !o->to || !o->step)
            return sr_cli_fail(c, "%s: --from, --to and --step go together (or give --values)",
                               !o->from ? "--from" : !o->to ? "--to" : "--step");
        if ((rc = sr_cli_quantity(c, "--from", o->from, q, 0, &from)) || (rc = sr_cli_quantity(c, "--to", o->to, q, 0, &to)))
            return rc;
        /* the step of a temperature is a difference whatever the variable's unit */
        if ((rc = sr_cli_quantity(c, "--step", o->step, q == SR_Q_TEMP ? SR_Q_TEMP_DIFF : q, 0, &step)))
            return rc;
        R->range_opt[0] = "--from";
        R->range_opt[1] = "--to";
    }
    R->ends[0] = from;
    R->ends[1] = to;
    R->has_ends = 1;
    if ((rc = check_value(R, R->range_opt[0], from)) || (rc = check_value(R, R->range_opt[1], to)))
        return rc;
    if (sr_sweep_range(from, to, step, SR_SWEEP_MAX_ROWS, &R->xs, &R->nx, &e))
        return sr_cli_fail(c, "--step: %s", e.msg);
    return 0;
}

/* Check a value against the model before any row is made, so the message
 * names the option that gave the bad one. */
static int check_value(run *R, const char *opt, double x)
{
    sr_cli *c = R->c;
    switch (R->var) {
    case SR_SWEEP_ALTITUDE: {
        sr_error e;
        sr_air a;
        if (sr_atmos_at(&R->atm, x, &a, &e))
            return sr_cli_fail(c, "%s: %s", opt, e.msg);
        if (x < R->ground && !(R->has_by && R->byvar == SR_SWEEP_SITE_ELEVATION))
            return sr_cli_fail(c, "%s: altitude %.1f m is below the ground (%.1f m above sea level); altitudes are "
                                  "above sea level",
                               opt, x, R->ground);
        return 0;
    }
    case SR_SWEEP_MASS:
    case SR_SWEEP_DIAMETER:
    case SR_SWEEP_SPEED:
        if (!(x > 0.0))
            return sr_cli_fail(c, "%s: %s must be greater than zero (got %g %s)", opt, sr_sweep_var_name(R->var), x,
                               sr_units_label(sr_sweep_var_quantity(R->var), SR_UNITS_SI));
        if (R->var == SR_SWEEP_MASS && x > 1e5)
            return sr_cli_fail(c, "%s: %g kg is beyond any payload this tool is meant for", opt, x);
        if (R->var == SR_SWEEP_SPEED && x > 300.0)
            return sr_cli_fail(c, "%s: %g m/s is not a descent speed a canopy is sized for", opt, x);
        if (R->var == SR_SWEEP_DIAMETER && x > 200.0)
            return sr_cli_fail(c, "%s: a nominal diameter of %g m is beyond any canopy this tool is meant for", opt, x);
        return 0;
    case SR_SWEEP_TEMP_OFFSET:
    case SR_SWEEP_SITE_ELEVATION: {
        sr_sweep_case k = {.atmos = R->atm, .ground = R->ground};
        sr_error e;
        if (sr_sweep_set(&k, R->var, x, &e))
            return sr_cli_fail(c, "%s: %s", opt, e.msg);
        return 0;
    }
    default:
        return 0;
    }
}

static int check_values(run *R)
{
    if (R->has_ends)
        return 0; /* the ends were checked; every value lies between them */
    for (size_t i = 0; i < R->nx; i++) {
        int rc = check_value(R, "--values", R->xs[i]);
        if (rc)
            return rc;
    }
    return 0;
}

static int build_curves(run *R)
{
    sr_cli *c = R->c;
    sr_error e;
    size_t nb = R->has_by ? R->nby : 1;
    R->ncurves = (size_t)R->ncanopy * nb;
    if (R->ncurves * R->nx > SR_SWEEP_MAX_ROWS)
        return sr_cli_fail(c, "%s: %zu values for each of %zu curves make %zu rows; the most is %d in all",
                           R->has_ends ? "--step" : R->range_opt[0], R->nx, R->ncurves, R->ncurves * R->nx, SR_SWEEP_MAX_ROWS);
    R->curves = calloc(R->ncurves, sizeof *R->curves);
    R->rows = malloc(R->ncurves * R->nx * sizeof *R->rows);
    if (!R->curves || !R->rows)
        return sr_cli_fail(c, "out of memory for %zu rows", R->ncurves * R->nx);
    size_t k = 0;
    for (int i = 0; i < R->ncanopy; i++) {
        for (size_t j = 0; j < nb; j++, k++) {
            curve *cv = &R->curves[k];
            cv->canopy = i;
            cv->by = R->has_by ? R->byvals[j] : NAN;
            cv->rows = R->rows + k * R->nx;
            cv->cs.canopy = R->canopies[i];
            cv->cs.mass = R->mass;
            cv->cs.body_cds = R->body;
            cv->cs.altitude = R->altitude;
            cv->cs.ground = R->ground;
            cv->cs.atmos = R->atm;
            if (R->has_by && sr_sweep_set(&cv->cs, R->byvar, cv->by, &e)) {
                char lab[64];
                var_value_label(lab, sizeof lab, R->byvar, cv->by, SR_UNITS_SI);
                return sr_cli_fail(c, "--by: %s: %s", lab, e.msg);
            }
            if (R->has_by && R->byvar == SR_SWEEP_SITE_ELEVATION && R->var == SR_SWEEP_ALTITUDE) {
                /* the swept altitudes are above sea level: none may lie under this site's ground */
                double lowest = R->xs[0];
                for (size_t i = 1; i < R->nx; i++)
                    lowest = fmin(lowest, R->xs[i]);
                if (lowest < cv->cs.ground) {
                    char lab[64], low[64];
                    var_value_label(lab, sizeof lab, R->byvar, cv->by, c->units);
                    sr_report_format_value(low, sizeof low, lowest, SR_Q_LENGTH, c->units, SR_FIXED(0));
                    return sr_cli_fail(c, "--by: %s puts the ground above the lowest swept altitude, %s above sea "
                                          "level; sweep from the highest site up (--from)",
                                       lab, low);
                }
            }
            if (R->has_by && R->byvar == SR_SWEEP_ALTITUDE) {
                sr_air a;
                if (sr_atmos_at(&cv->cs.atmos, cv->by, &a, &e))
                    return sr_cli_fail(c, "--by: %s", e.msg);
            }
            char bl[96] = "";
            if (R->has_by)
                var_value_label(bl, sizeof bl, R->byvar, cv->by, c->units);
            if (R->has_by && R->ncanopy > 1)
                snprintf(cv->label, sizeof cv->label, "%s; %s", R->labels[i], bl);
            else if (R->has_by)
                snprintf(cv->label, sizeof cv->label, "%s", bl);
            else
                snprintf(cv->label, sizeof cv->label, "%s", R->labels[i]);
        }
    }
    return 0;
}

static int compute(run *R)
{
    sr_cli *c = R->c;
    size_t total = R->ncurves * R->nx;
    int tty = total >= 20000 && isatty(fileno(c->err));
    progress pg = {c->err, 0, total, -1};
    for (size_t k = 0; k < R->ncurves; k++) {
        curve *cv = &R->curves[k];
        sr_error e;
        pg.base = k * R->nx;
        if (sr_sweep_run(&cv->cs, R->var, R->xs, R->nx, cv->rows, tty ? show_progress : NULL, &pg, &e)) {
            if (tty)
                fputc('\n', c->err);
            if (R->has_by) /* the curve's --by value led here: name it */
                sr_error_prefix(&e, "--by %s: ", cv->label);
            else if (R->ncurves > 1)
                sr_error_prefix(&e, "%s: ", cv->label);
            return sr_cli_fail_err(c, &e);
        }
    }
    if (tty)
        fprintf(c->err, "\rsinkrate sweep: %zu rows computed; writing them%*s\n", total, 8, "");
    return 0;
}

/* ---- the table ---- */

static int x_sig(const run *R)
{
    switch (R->var) {
    case SR_SWEEP_ALTITUDE:
    case SR_SWEEP_SITE_ELEVATION: {
        /* enough decimals for the spacing of the values */
        double gap = INFINITY;
        for (size_t i = 1; i < R->nx; i++)
            if (fabs(R->xs[i] - R->xs[i - 1]) > 0)
                gap = fmin(gap, fabs(R->xs[i] - R->xs[i - 1]));
        int d = isfinite(gap) && gap < 1.0 ? (int)ceil(-log10(gap) - 1e-9) : 0;
        return SR_FIXED(d > 3 ? 3 : d);
    }
    case SR_SWEEP_TEMP_OFFSET: return SR_FIXED(1);
    default: return 4;
    }
}

static const char *X_KEY[] = {"altitude", "mass", "nominal_diameter", "temp_offset", "site_elevation", "target_speed"};
static const char *X_LABEL[] = {"altitude", "mass", "D0", "temp offset", "site elevation", "target speed"};

/* The plausibility and Mach warnings of a sweep: the shared judgements of
 * physics/plausible, at the extremes of what was swept and found. */
static void sweep_warnings(const run *R, sr_report *r, const double *mach, double slow, double dmin, double dmax)
{
    sr_unit_system sys = R->c->units;
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    double lo = INFINITY, hi = -INFINITY;
    for (size_t i = 0; i < R->nx; i++)
        lo = fmin(lo, R->xs[i]), hi = fmax(hi, R->xs[i]);
    double blo = INFINITY, bhi = -INFINITY;
    for (size_t i = 0; R->has_by && i < R->nby; i++)
        blo = fmin(blo, R->byvals[i]), bhi = fmax(bhi, R->byvals[i]);
    if (!uses(R, SR_SWEEP_MASS))
        sr_input_warnings_value(&iw, SR_PLAUS_MASS, R->mass, "payload mass", sys);
    const struct {
        sr_sweep_var v;
        sr_plaus_kind k;
        const char *what;
    } SWEPT[] = {{SR_SWEEP_MASS, SR_PLAUS_MASS, "swept mass"},
                 {SR_SWEEP_DIAMETER, SR_PLAUS_CANOPY_D0, "swept nominal diameter"},
                 {SR_SWEEP_SPEED, SR_PLAUS_DESCENT_SPEED, "target speed"}};
    for (size_t j = 0; j < sizeof SWEPT / sizeof SWEPT[0]; j++) {
        if (R->var == SWEPT[j].v) {
            sr_input_warnings_value(&iw, SWEPT[j].k, lo, SWEPT[j].what, sys);
            sr_input_warnings_value(&iw, SWEPT[j].k, hi, SWEPT[j].what, sys);
        }
        if (R->has_by && R->byvar == SWEPT[j].v) {
            sr_input_warnings_value(&iw, SWEPT[j].k, blo, SWEPT[j].what, sys);
            sr_input_warnings_value(&iw, SWEPT[j].k, bhi, SWEPT[j].what, sys);
        }
    }
    int sized_by_sweep = uses(R, SR_SWEEP_DIAMETER) || R->var == SR_SWEEP_SPEED;
    for (int i = 0; i < R->ncanopy && !sized_by_sweep; i++) {
        char what[200];
        if (R->ncanopy > 1)
            snprintf(what, sizeof what, "canopy %d (%s)", i + 1, R->canopies[i].fam.id);
        else
            snprintf(what, sizeof what, "canopy (%s)", R->canopies[i].fam.id);
        sr_input_warnings_canopy(&iw, &R->canopies[i], what, sys);
    }
    if (R->var == SR_SWEEP_SPEED) {
        sr_input_warnings_value(&iw, SR_PLAUS_CANOPY_D0, dmin, "nominal diameter D0 needed (typical)", sys);
        sr_input_warnings_value(&iw, SR_PLAUS_CANOPY_D0, dmax, "nominal diameter D0 needed (typical)", sys);
    } else {
        sr_input_warnings_value(&iw, SR_PLAUS_DESCENT_SPEED, slow, "slowest descent rate (typical)", sys);
    }
    for (int i = 0; i < R->ncanopy; i++) {
        const sr_family *f = &R->canopies[i].fam;
        unsigned mj = sr_mach_judge(mach[i], f->mach_max);
        if (!mj)
            continue;
        char what[200], msg[SR_INPUT_WARN_LEN];
        snprintf(what, sizeof what, "%s%s%s", R->var == SR_SWEEP_SPEED ? "the target speed" : "the descent",
                 R->ncanopy > 1 ? " of " : "", R->ncanopy > 1 ? R->labels[i] : "");
        sr_mach_describe(mj, mach[i], f->mach_max, f->id, what, msg, sizeof msg);
        sr_input_warnings_add(&iw, msg);
    }
    sr_cli_report_input_warnings(r, &iw);
}

static void build_report(run *R, sr_report *r)
{
    static const char *TITLES[] = {"descent rate over altitude", "descent rate over payload mass",
                                   "descent rate over nominal diameter", "descent rate over temperature offset",
                                   "touchdown rate over site elevation", "nominal size over target descent speed"};
    sr_report_section(r, "Inputs");
    if (R->mis)
        sr_report_text(r, "mission", "mission", R->mis->name);
    sr_report_text(r, "swept", "swept", sr_sweep_var_name(R->var));
    if (R->has_by) {
        char buf[64];
        snprintf(buf, sizeof buf, "%s (one curve per value)", sr_sweep_var_name(R->byvar));
        sr_report_text(r, "by", "by", buf);
    }
    if (!uses(R, SR_SWEEP_MASS))
        sr_report_value(r, "mass", R->var == SR_SWEEP_SPEED ? "payload mass (without canopy)" : "descending mass",
                        R->mass, SR_Q_MASS, 4);
    if (!uses(R, SR_SWEEP_TEMP_OFFSET) && !uses(R, SR_SWEEP_SITE_ELEVATION))
        sr_cli_report_atmos(r, &R->atm);
    else if (R->atm.kind != SR_ATMOS_STANDARD) {
        char buf[300];
        sr_atmos_describe(&R->atm, buf, sizeof buf);
        sr_report_text(r, "atmosphere_base", "atmosphere (before the sweep)", buf);
    } else {
        sr_report_text(r, "atmosphere", "atmosphere", "U.S. Standard Atmosphere 1976, varied row by row");
    }
    if (!uses(R, SR_SWEEP_SITE_ELEVATION))
        sr_report_value(r, "ground", "ground (above sea level)", R->ground, SR_Q_LENGTH, SR_FIXED(0));
    if (R->var != SR_SWEEP_ALTITUDE && !uses(R, SR_SWEEP_SITE_ELEVATION) && !(R->has_by && R->byvar == SR_SWEEP_ALTITUDE))
        sr_report_value(r, "altitude", "rows evaluated at (above sea level)",
                        isnan(R->altitude) ? R->ground : R->altitude, SR_Q_LENGTH, SR_FIXED(0));
    if (R->body > 0)
        sr_report_value(r, "body_drag_area", "payload drag area", R->body, SR_Q_AREA, 4);
    for (int i = 0; i < R->ncanopy; i++) {
        const sr_canopy *cp = &R->canopies[i];
        char key[32], lab[32], buf[600];
        snprintf(key, sizeof key, "canopy_%d", i + 1);
        snprintf(lab, sizeof lab, R->ncanopy > 1 ? "canopy %d" : "canopy", i + 1);
        sr_band cd0 = sr_sweep_cd0_band(cp);
        if (cp->measured)
            snprintf(buf, sizeof buf, "%s; %s family; drag coefficient %.4g on %s area (%s)", R->labels[i], cp->fam.name,
                     cp->cd.v.typ, sr_ref_name(cp->cd.ref), cp->cd_source);
        else
            snprintf(buf, sizeof buf, "%s; %s family; CD0 %.3g / %.3g / %.3g on nominal area S0", R->labels[i], cp->fam.name,
                     cd0.lo, cd0.typ, cd0.hi);
        if (cp->count > 1) {
            size_t l = strlen(buf);
            snprintf(buf + l, sizeof buf - l, "; cluster of %d, drag factor %.2f each", cp->count, cp->cluster_factor);
        }
        sr_report_text(r, key, lab, buf);
    }

    sr_rtable *t = sr_report_table(r, "sweep", TITLES[R->var]);
    int multi_canopy = R->ncanopy > 1;
    if (multi_canopy)
        sr_rtable_text_column(t, "canopy", "canopy");
    if (R->has_by)
        sr_rtable_column(t, X_KEY[R->byvar], X_LABEL[R->byvar], sr_sweep_var_quantity(R->byvar),
                         R->byvar == SR_SWEEP_TEMP_OFFSET ? SR_FIXED(1)
                         : R->byvar == SR_SWEEP_ALTITUDE || R->byvar == SR_SWEEP_SITE_ELEVATION ? SR_FIXED(0)
                                                                                                 : 4);
    sr_rtable_column(t, X_KEY[R->var], X_LABEL[R->var], sr_sweep_var_quantity(R->var), x_sig(R));
    int alt_col = uses(R, SR_SWEEP_SITE_ELEVATION) && R->var != SR_SWEEP_ALTITUDE;
    if (alt_col)
        sr_rtable_column(t, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "density", "density", SR_Q_DENSITY, 4);
    int speed = R->var == SR_SWEEP_SPEED;
    int areal = 0;
    for (int i = 0; i < R->ncanopy; i++)
        if (R->canopies[i].areal_mass > 0)
            areal = 1;
    if (speed) {
        sr_rtable_column(t, "nominal_diameter_low", "D0 low", SR_Q_SIZE, 4);
        sr_rtable_column(t, "nominal_diameter_typical", "typical", SR_Q_SIZE, 4);
        sr_rtable_column(t, "nominal_diameter_high", "high", SR_Q_SIZE, 4);
        sr_rtable_column(t, "nominal_area_typical", "S0 typ", SR_Q_AREA, 4);
        if (areal)
            sr_rtable_column(t, "canopy_mass_typical", "canopy mass typ", SR_Q_MASS, 3);
    } else {
        sr_rtable_column(t, "rate_low", "rate low", SR_Q_SPEED, 4);
        sr_rtable_column(t, "rate_typical", "typical", SR_Q_SPEED, 4);
        sr_rtable_column(t, "rate_high", "high", SR_Q_SPEED, 4);
    }
    sr_rtable_column(t, "dynamic_pressure", speed ? "q" : "q typ", SR_Q_PRESSURE, 4);
    sr_rtable_column(t, "mach", speed ? "Mach" : "Mach typ", SR_Q_NONE, 3);
    int times = R->var == SR_SWEEP_ALTITUDE;
    if (times) {
        sr_rtable_column(t, "time_low", "time to ground low", SR_Q_TIME, 4);
        sr_rtable_column(t, "time_typical", "typical", SR_Q_TIME, 4);
        sr_rtable_column(t, "time_high", "high", SR_Q_TIME, 4);
    }
    /* for the warnings: per canopy the highest Mach number (rate high), over all rows the slowest
     * typical rate and the extreme sizes found */
    double mach[MAX_CANOPIES] = {0}, slow = INFINITY, dmin = INFINITY, dmax = 0.0;
    for (size_t k = 0; k < R->ncurves; k++) {
        const curve *cv = &R->curves[k];
        const char *txt[1] = {R->labels[cv->canopy]};
        for (size_t i = 0; i < R->nx; i++) {
            const sr_sweep_row *w = &cv->rows[i];
            double row[16];
            int n = 0;
            if (R->has_by)
                row[n++] = cv->by;
            row[n++] = w->x;
            if (alt_col)
                row[n++] = w->z;
            row[n++] = w->rho;
            if (speed) {
                row[n++] = w->d0.lo;
                row[n++] = w->d0.typ;
                row[n++] = w->d0.hi;
                row[n++] = w->s0.typ;
                if (areal)
                    row[n++] = w->mass_total.typ - R->mass;
            } else {
                row[n++] = w->v.lo;
                row[n++] = w->v.typ;
                row[n++] = w->v.hi;
            }
            row[n++] = w->q;
            row[n++] = w->mach;
            if (times) {
                row[n++] = w->t.lo;
                row[n++] = w->t.typ;
                row[n++] = w->t.hi;
            }
            sr_rtable_row(t, row, multi_canopy ? txt : NULL);
            if (w->v.hi / w->a > mach[cv->canopy])
                mach[cv->canopy] = w->v.hi / w->a;
            slow = fmin(slow, w->v.typ);
            dmin = fmin(dmin, w->d0.typ);
            dmax = fmax(dmax, w->d0.typ);
        }
    }
    sweep_warnings(R, r, mach, slow, dmin, dmax);
    if (speed)
        sr_report_note(r, "Sizes are nominal diameters D0 (from the nominal area S0, vent included) of one canopy; the "
                          "low size comes from the high drag coefficient. Choose from the large end to meet the speed "
                          "with margin.");
    else
        sr_report_note(r, "Equilibrium rate where drag equals weight: v = sqrt(2 m g / (rho CdS)); the band comes from "
                          "the drag-coefficient range (low rate from the high coefficient).");
    if (times)
        sr_report_note(r, "Time to ground: quasi-steady descent under the canopy from that altitude to the ground, t = "
                          "integral of dz / v(z); the deployment and opening transient are not included "
                          "(sinkrate profile models them).");
    if (uses(R, SR_SWEEP_SITE_ELEVATION))
        sr_report_note(r, "Each site elevation takes the standard pressure there and keeps the temperature offset; a "
                          "measured surface pressure belongs to one site only.");
    if (uses(R, SR_SWEEP_DIAMETER))
        sr_report_note(r, "The diameter swept is the nominal diameter D0; measured drag, cluster and areal mass of the "
                          "canopy are kept.");
    for (int i = 0; i < R->ncanopy; i++)
        if (!R->canopies[i].measured && strstr(R->canopies[i].fam.cd0_source, "memory")) {
            sr_report_warning(r, "The drag data of %s are recalled handbook values, not checked against the printed "
                                 "table: confirm with a drop test.",
                              R->canopies[i].fam.id);
            break;
        }
}

/* ---- the figure ---- */

/* From this many curves on, bands are drawn as dotted edges: fills would hide each other. */
#define OUTLINE_CURVES 4

/* The atmosphere in a few words, for the figure's subtitle. */
static void short_atmos(const run *R, char *buf, size_t len)
{
    const sr_atmos *m = &R->atm;
    if (uses(R, SR_SWEEP_TEMP_OFFSET) && uses(R, SR_SWEEP_SITE_ELEVATION)) {
        snprintf(buf, len, "each site at standard pressure; \u0394T: temperature offset from standard");
        return;
    }
    sr_cli_atmos_short(m, R->c->units, buf, len);
    if (uses(R, SR_SWEEP_TEMP_OFFSET) && m->kind != SR_ATMOS_SITE)
        snprintf(buf, len, "U.S. Standard Atmosphere 1976; \u0394T: temperature offset from standard");
    else if (uses(R, SR_SWEEP_TEMP_OFFSET))
        snprintf(buf + strlen(buf), len - strlen(buf), "; \u0394T: temperature offset from standard");
    if (uses(R, SR_SWEEP_SITE_ELEVATION))
        snprintf(buf, len, "sites at standard pressure%s",
                 m->dT != 0.0 ? ", same temperature offset" : "");
}

static void subtitle(const run *R, char *buf, size_t len)
{
    sr_unit_system sys = R->c->units;
    char m[64] = "", atm[200] = "", one[200] = "";
    if (!uses(R, SR_SWEEP_MASS)) {
        sr_report_format_value(m, sizeof m, R->mass, SR_Q_MASS, sys, 3);
        strncat(m, R->var == SR_SWEEP_SPEED ? " payload; " : " descending; ", sizeof m - strlen(m) - 1);
    }
    short_atmos(R, atm, sizeof atm);
    if (R->ncanopy == 1 && R->has_by)
        snprintf(one, sizeof one, "%s; ", R->labels[0]);
    snprintf(buf, len, "%s%s%s. %s the family's drag-coefficient range; line: typical.", one, m, atm,
             R->ncurves >= OUTLINE_CURVES ? "Dotted:" : "Shaded:");
}

static int figure(run *R, int argc, char **argv)
{
    sr_cli *c = R->c;
    sr_unit_system sys = c->units;
    static const char *TITLES[] = {"Descent rate vs altitude", "Descent rate vs payload mass",
                                   "Descent rate vs nominal diameter", "Descent rate vs temperature offset",
                                   "Touchdown rate vs site elevation", "Nominal diameter needed vs target descent speed"};
    const char *title = TITLES[R->var];
    if (R->var == SR_SWEEP_ALTITUDE && R->figure == 1)
        title = "Descent time to the ground vs deployment altitude";
    if (R->var == SR_SWEEP_ALTITUDE && R->figure == 2)
        title = "Descent rate and time to the ground vs altitude";
    sr_plot *p = sr_plot_new(title);
    if (!p)
        return sr_cli_fail(c, "out of memory");
    char sub[600];
    subtitle(R, sub, sizeof sub);
    sr_plot_subtitle(p, sub);
    sr_quantity qx = sr_sweep_var_quantity(R->var);
    const char *ux = sr_units_label(qx, sys), *uv = sr_units_label(SR_Q_SPEED, sys),
               *ul = sr_units_label(SR_Q_LENGTH, sys), *ut = sr_units_label(SR_Q_TIME, sys);
    static const char *XNAME[] = {"altitude above sea level", "payload mass", "nominal diameter D0",
                                  "temperature offset from standard", "site elevation", "target descent speed"};
    char xl[128], yl[128], tl[128];
    snprintf(xl, sizeof xl, "%s [%s]", XNAME[R->var], ux);
    snprintf(yl, sizeof yl, "%s [%s]", R->var == SR_SWEEP_SITE_ELEVATION ? "touchdown rate" : "descent rate", uv);
    snprintf(tl, sizeof tl, "time to the ground [%s]", ut);
    sr_plot_axes a;
    int alt = R->var == SR_SWEEP_ALTITUDE;
    int panels = alt && R->figure == 2 ? 2 : 1;
    sr_plot_layout(p, panels, 0);
    sr_plot_axes_init(&a);
    if (alt && R->figure != 1) {
        a.xlabel = yl;
        a.ylabel = xl;
        if (panels == 2)
            a.title = "descent rate";
        a.key = SR_PLOT_KEY_ABOVE;
        a.ytight = 1;
        sr_plot_set_axes(p, 0, &a);
        if (panels == 2) {
            sr_plot_axes_init(&a);
            a.xlabel = tl;
            a.ylabel = xl;
            a.title = "time to the ground from that altitude";
            a.key = SR_PLOT_KEY_NONE;
            a.ytight = 1;
            sr_plot_set_axes(p, 1, &a);
        }
    } else if (alt) {
        char dl[128];
        snprintf(dl, sizeof dl, "deployment altitude above sea level [%s]", ul);
        a.xlabel = dl;
        a.ylabel = tl;
        a.key = SR_PLOT_KEY_ABOVE;
        a.xtight = 1;
        sr_plot_set_axes(p, 0, &a);
    } else if (R->var == SR_SWEEP_SPEED) {
        char dl[128];
        snprintf(dl, sizeof dl, "nominal diameter D0 needed [%s]", sr_units_label(SR_Q_SIZE, sys));
        a.xlabel = xl;
        a.ylabel = dl;
        a.key = SR_PLOT_KEY_ABOVE;
        a.xtight = 1;
        sr_plot_set_axes(p, 0, &a);
    } else {
        a.xlabel = xl;
        a.ylabel = yl;
        a.key = SR_PLOT_KEY_ABOVE;
        a.xtight = 1;
        sr_plot_set_axes(p, 0, &a);
    }
    int rc = 0;
    for (size_t k = 0; k < R->ncurves && !rc; k++) {
        int outline = R->ncurves >= OUTLINE_CURVES;
        int few = R->nx <= 12; /* few values: show them as points on the lines */
        const curve *cv = &R->curves[k];
        char xname[48], n2[48], n3[48], n4[48], n5[48], n6[48], n7[48];
        snprintf(xname, sizeof xname, "%s[%s]", X_KEY[R->var], ux);
        const char *what = R->var == SR_SWEEP_SPEED ? "d0" : "rate";
        const char *uw = R->var == SR_SWEEP_SPEED ? sr_units_label(SR_Q_SIZE, sys) : uv;
        snprintf(n2, sizeof n2, "%s_low[%s]", what, uw);
        snprintf(n3, sizeof n3, "%s_typical[%s]", what, uw);
        snprintf(n4, sizeof n4, "%s_high[%s]", what, uw);
        snprintf(n5, sizeof n5, "time_low[%s]", ut);
        snprintf(n6, sizeof n6, "time_typical[%s]", ut);
        snprintf(n7, sizeof n7, "time_high[%s]", ut);
        const char *names[] = {xname, n2, n3, n4, n5, n6, n7};
        size_t b;
        size_t ncol = alt ? 7 : 4;
        if (sr_plot_block(p, cv->label, ncol, names, &b)) {
            rc = sr_cli_fail(c, "out of memory");
            break;
        }
        for (size_t i = 0; i < R->nx; i++) {
            const sr_sweep_row *w = &cv->rows[i];
            sr_band y = R->var == SR_SWEEP_SPEED ? w->d0 : w->v;
            sr_quantity qy = R->var == SR_SWEEP_SPEED ? SR_Q_SIZE : SR_Q_SPEED;
            double row[7] = {sr_units_from_si(w->x, qx, sys),     sr_units_from_si(y.lo, qy, sys),
                             sr_units_from_si(y.typ, qy, sys),    sr_units_from_si(y.hi, qy, sys),
                             sr_units_from_si(w->t.lo, SR_Q_TIME, sys), sr_units_from_si(w->t.typ, SR_Q_TIME, sys),
                             sr_units_from_si(w->t.hi, SR_Q_TIME, sys)};
            sr_plot_row(p, b, row);
        }
        int color = (int)(k % SR_PLOT_COLORS) + 1, dash = (int)(k / SR_PLOT_COLORS) % 3;
        if (alt && R->figure != 1) {
            sr_plot_series band = {.kind = SR_PLOT_BAND_X, .panel = 0, .block = b, .y = 1, .lo = 2, .hi = 4,
                                   .color = color, .outline = outline};
            sr_plot_series line = {.kind = few ? SR_PLOT_LINESPOINTS : SR_PLOT_LINES, .panel = 0, .block = b, .x = 3, .y = 1, .color = color,
                                   .dash = dash, .title = cv->label};
            sr_plot_add(p, &band);
            sr_plot_add(p, &line);
            if (panels == 2) {
                sr_plot_series tb = {.kind = SR_PLOT_BAND_X, .panel = 1, .block = b, .y = 1, .lo = 5, .hi = 7,
                                     .color = color, .outline = outline};
                sr_plot_series tline = {.kind = few ? SR_PLOT_LINESPOINTS : SR_PLOT_LINES, .panel = 1, .block = b, .x = 6, .y = 1,
                                        .color = color, .dash = dash};
                sr_plot_add(p, &tb);
                sr_plot_add(p, &tline);
            }
        } else if (alt) {
            sr_plot_series band = {.kind = SR_PLOT_BAND, .block = b, .x = 1, .lo = 5, .hi = 7, .color = color,
                                   .outline = outline};
            sr_plot_series line = {.kind = few ? SR_PLOT_LINESPOINTS : SR_PLOT_LINES, .block = b, .x = 1, .y = 6, .color = color, .dash = dash,
                                   .title = cv->label};
            sr_plot_add(p, &band);
            sr_plot_add(p, &line);
        } else {
            sr_plot_series band = {.kind = SR_PLOT_BAND, .block = b, .x = 1, .lo = 2, .hi = 4, .color = color,
                                   .outline = outline};
            sr_plot_series line = {.kind = few ? SR_PLOT_LINESPOINTS : SR_PLOT_LINES, .block = b, .x = 1,
                                   .y = 3, .color = color, .dash = dash, .title = cv->label};
            sr_plot_add(p, &band);
            sr_plot_add(p, &line);
        }
    }
    /* marker lines */
    for (size_t i = 0; i < R->nmark_v && !rc; i++) {
        char lab[80], v[48];
        sr_report_format_value(v, sizeof v, R->marks_v[i], SR_Q_SPEED, sys, 3);
        snprintf(lab, sizeof lab, "%s%s", R->o.mark_speed ? "" : "touchdown limit ", v);
        double mv = sr_units_from_si(R->marks_v[i], SR_Q_SPEED, sys);
        if (alt && R->figure != 1)
            sr_plot_marker(p, 0, 'x', mv, lab, 0);
        else if (R->var == SR_SWEEP_SPEED)
            sr_plot_marker(p, 0, 'x', mv, lab, 0);
        else if (!alt)
            sr_plot_marker(p, 0, 'y', mv, lab, 0);
    }
    if (alt) {
        for (size_t i = 0; i < R->nmark_z; i++) {
            double mz = sr_units_from_si(R->marks_z[i], SR_Q_LENGTH, sys);
            for (int k = 0; k < panels; k++)
                sr_plot_marker(p, k, R->figure == 1 ? 'x' : 'y', mz, k == 0 ? R->marks_z_label[i] : NULL, 1);
        }
    }
    if (!rc)
        rc = sr_cli_plot(c, p, argc, argv);
    sr_plot_free(p);
    return rc;
}

static int marks(run *R)
{
    sr_cli *c = R->c;
    int rc;
    if (R->o.mark_speed &&
        (rc = sr_cli_quantity_list(c, "--mark-speed", R->o.mark_speed, SR_Q_SPEED, R->marks_v, MAX_MARKS, &R->nmark_v)))
        return rc;
    if (R->o.mark_altitude) {
        if (R->var != SR_SWEEP_ALTITUDE)
            return sr_cli_fail(c, "--mark-altitude: only altitude sweeps have an altitude axis");
        if ((rc = sr_cli_quantity_list(c, "--mark-altitude", R->o.mark_altitude, SR_Q_LENGTH, R->marks_z, MAX_MARKS,
                                       &R->nmark_z)))
            return rc;
        for (size_t i = 0; i < R->nmark_z; i++) {
            char v[48];
            sr_report_format_value(v, sizeof v, R->marks_z[i], SR_Q_LENGTH, c->units, SR_FIXED(0));
            snprintf(R->marks_z_label[i], sizeof R->marks_z_label[i], "%s", v);
        }
    }
    if (R->var == SR_SWEEP_ALTITUDE && R->mis && !R->o.mark_altitude) {
        /* the mission's deployments at a height above ground */
        for (size_t i = 0; i < R->mis->nstages && R->nmark_z < MAX_MARKS + SR_MISSION_MAX_STAGES; i++) {
            const sr_stage *st = &R->mis->stages[i];
            if (st->deploy != SR_DEPLOY_ALTITUDE)
                continue;
            R->marks_z[R->nmark_z] = R->ground + st->deploy_value;
            char v[48];
            sr_report_format_value(v, sizeof v, st->deploy_value, SR_Q_LENGTH, c->units, SR_FIXED(0));
            snprintf(R->marks_z_label[R->nmark_z], sizeof R->marks_z_label[0], "%s deploys (%s above ground)",
                     st->name, v);
            R->nmark_z++;
        }
    }
    if (!R->o.mark_speed && R->mis && isfinite(R->mis->limit_speed))
        R->marks_v[R->nmark_v++] = R->mis->limit_speed;
    /* the ground, on the altitude axis of the rate figure */
    if (R->var == SR_SWEEP_ALTITUDE && R->figure != 1 && R->ground > 0 &&
        R->nmark_z < MAX_MARKS + SR_MISSION_MAX_STAGES && !(R->has_by && R->byvar == SR_SWEEP_SITE_ELEVATION)) {
        R->marks_z[R->nmark_z] = R->ground;
        snprintf(R->marks_z_label[R->nmark_z], sizeof R->marks_z_label[0], "ground");
        R->nmark_z++;
    }
    return 0;
}

static int run_sweep(sr_cli *c, int argc, char **argv)
{
    run *R = calloc(1, sizeof *R);
    if (!R)
        return sr_cli_fail(c, "out of memory");
    R->c = c;
    sr_atmos_init_standard(&R->atm);
    sr_report *r = NULL;
    int rc = sr_cli_parse_options(c, argc, argv, &R->o, NULL);
    if (rc)
        goto out;
    R->var = SR_SWEEP_ALTITUDE;
    if (R->o.vary && sr_sweep_var_parse(R->o.vary, &R->var)) {
        rc = sr_cli_fail(c, "--vary: '%s' is not one of altitude, mass, diameter, temp-offset, site-elevation, speed",
                         R->o.vary);
        goto out;
    }
    R->figure = R->var == SR_SWEEP_ALTITUDE ? 2 : 0;
    if (R->o.figure) {
        if (R->var != SR_SWEEP_ALTITUDE) {
            rc = sr_cli_fail(c, "--figure: only altitude sweeps choose between rate, time and both");
            goto out;
        }
        if (strcmp(R->o.figure, "rate") == 0)
            R->figure = 0;
        else if (strcmp(R->o.figure, "time") == 0)
            R->figure = 1;
        else if (strcmp(R->o.figure, "both") == 0)
            R->figure = 2;
        else {
            rc = sr_cli_fail(c, "--figure: '%s' is not one of rate, time, both", R->o.figure);
            goto out;
        }
    }
    if (R->o.by && (rc = parse_by(R)))
        goto out;
    if (R->var == SR_SWEEP_SPEED && R->has_by && R->byvar == SR_SWEEP_DIAMETER) {
        rc = sr_cli_fail(c, "--by: a speed sweep finds the diameter; it cannot also be given");
        goto out;
    }
    if ((rc = load_case(R)) || (rc = make_values(R)) || (rc = check_values(R)) || (rc = marks(R)) ||
        (rc = build_curves(R)) || (rc = compute(R)))
        goto out;
    static const char *TITLES[] = {"descent rate over altitude", "descent rate over payload mass",
                                   "descent rate over nominal diameter", "descent rate over temperature offset",
                                   "touchdown rate over site elevation", "nominal size over target descent speed"};
    r = sr_report_new("sweep", TITLES[R->var]);
    if (!r) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    build_report(R, r);
    if (c->plot_prefix && (rc = figure(R, argc, argv)))
        goto out;
    rc = sr_cli_emit(c, r);
out:
    sr_report_free(r);
    free(R->xs);
    free(R->rows);
    free(R->curves);
    sr_atmos_release(&R->atm);
    sr_cli_mission_free(R->mis);
    free(R->cat);
    free(R);
    return rc;
}
