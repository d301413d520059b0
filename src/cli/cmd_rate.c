/* cmd_rate.c - `sinkrate rate`: descent rate of a given canopy (or cluster)
 * at one or more altitudes, with dynamic pressure, equivalent drop height and
 * touchdown kinetic energy. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"
#include "analysis/input_warnings.h"
#include "physics/descent.h"
#include "files/mission.h"

typedef struct rate_opts {
    sr_payload_opts payload;
    sr_canopy_opts canopy;
    sr_atmos_opts atmos;
} rate_opts;

static const sr_opt OPTS[] = {
    SR_OPT_GROUP(sr_cli_group_payload, rate_opts, payload),
    SR_OPT_FOR("mass", "M",
               "descending mass (payload; the canopy's own mass is added when --areal-mass is given)"),
    SR_OPT_FOR("altitude", "Z[,Z...]", "altitudes above sea level (default: the site elevation, or 0)"),
    SR_OPT_FOR("body-drag-area", "A", "payload drag area CdA added to the canopy's (\"0.02 m2\")"),
    SR_OPT_FOR("mission", "FILE", "mass (all sections), site and the last stage's canopy from a mission file"),
    SR_OPT_GROUP(sr_cli_group_canopy, rate_opts, canopy),
    SR_OPT_GROUP(sr_cli_group_atmos, rate_opts, atmos),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "rates", NULL};

static int run_rate(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_rate = {
    .name = "rate",
    .summary = "descent rate of a canopy or cluster at one or more altitudes",
    .usage = "usage: sinkrate rate --mass M --family ID --nominal-diameter D [--altitude Z,...] [options]\n"
             "       sinkrate rate --mass M --canopy FILE [options]\n"
             "       sinkrate rate --mission FILE [options]\n",
    .about = "Equilibrium descent rate of a canopy or cluster carrying mass M, at each altitude, as a band from "
             "the drag-coefficient range (or exact for a measured coefficient on the reference the size is given "
             "on), with dynamic pressure, the equivalent drop height v^2/2g and the kinetic energy at that speed.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_rate,
};

#define MAX_ALT 256

static int run_rate(sr_cli *c, int argc, char **argv)
{
    rate_opts o;
    memset(&o, 0, sizeof o);
    int rc = sr_cli_parse_options(c, argc, argv, &o, NULL);
    if (rc)
        return rc;
    sr_catalog *cat = NULL;
    sr_mission *mis = NULL;
    sr_atmos atm;
    sr_atmos_init_standard(&atm);
    sr_report *r = NULL;
    sr_error e;
    double mass = NAN, ground = 0.0, body = 0.0;
    double *alt = NULL;
    sr_canopy cp;
    if ((rc = sr_cli_catalog(c, &cat)) || (rc = sr_cli_mission(c, o.payload.mission, cat, &o.atmos, &mis, &atm, &ground)))
        goto out;
    if (mis) {
        mass = sr_mission_total_mass(mis);
        const sr_stage *last = &mis->stages[mis->nstages - 1];
        cp = last->canopy;
        if (!last->has_size && !sr_cli_canopy_given(&o.canopy)) {
            rc = sr_cli_fail(c, "--mission: stage '%s' has no size; give one in the file, or run `sinkrate size "
                                "--mission` first", last->name);
            goto out;
        }
    }
    if (sr_cli_canopy_given(&o.canopy) || !mis) {
        if ((rc = sr_cli_canopy(c, cat, &o.canopy, 1, &cp)))
            goto out;
    }
    if ((rc = sr_cli_mass(c, o.payload.mass, "the descending mass", &mass)))
        goto out;
    if ((rc = sr_cli_body_drag(c, o.payload.body, &body)))
        goto out;
    alt = malloc(MAX_ALT * sizeof *alt);
    size_t nalt = 1;
    if (!alt) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    alt[0] = ground;
    if (o.payload.altitude && (rc = sr_cli_quantity_list(c, "--altitude", o.payload.altitude, SR_Q_LENGTH, alt, MAX_ALT, &nalt)))
        goto out;
    r = sr_report_new("rate", "descent rate of a canopy");
    sr_report_section(r, "Inputs");
    if (mis)
        sr_report_text(r, "mission", "mission", mis->name);
    sr_report_value(r, "mass", "descending mass", mass, SR_Q_MASS, 4);
    sr_cli_report_atmos(r, &atm);
    sr_cli_report_canopy(r, &cp);
    char buf[256];
    snprintf(buf, sizeof buf, "%s", sr_size_kind_name(cp.size_kind));
    sr_report_text(r, "size_given_as", "size given as", buf);
    sr_report_band(r, "nominal_area", "nominal area S0 (each)", cp.s0.lo, cp.s0.typ, cp.s0.hi, SR_Q_AREA, 4);
    sr_report_band(r, "nominal_diameter", "nominal diameter D0", cp.d0.lo, cp.d0.typ, cp.d0.hi, SR_Q_SIZE, 4);
    sr_band cds = sr_canopy_total_cds(&cp);
    sr_report_band(r, "drag_area", "drag area CdS (all canopies)", cds.lo, cds.typ, cds.hi, SR_Q_AREA, 4);
    if (body > 0)
        sr_report_value(r, "body_drag_area", "payload drag area", body, SR_Q_AREA, 4);
    if (cp.areal_mass > 0)
        sr_report_band(r, "canopy_mass", "canopy fabric mass (added)", cp.count * cp.areal_mass * cp.s0.lo,
                       cp.count * cp.areal_mass * cp.s0.typ, cp.count * cp.areal_mass * cp.s0.hi, SR_Q_MASS, 3);

    sr_rtable *t = sr_report_table(r, "rates", "Descent rate (band from the drag range)");
    sr_rtable_column(t, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "density", "density", SR_Q_DENSITY, 4);
    sr_rtable_column(t, "rate_low", "rate low", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_typical", "typical", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_high", "high", SR_Q_SPEED, 3);
    sr_rtable_column(t, "dynamic_pressure", "q typ", SR_Q_PRESSURE, 3);
    sr_rtable_column(t, "drop_height", "drop height typ", SR_Q_LENGTH, 3);
    sr_rtable_column(t, "energy_low", "energy low", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "energy_typical", "typical", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "energy_high", "high", SR_Q_ENERGY, 3);
    double mt = mass + (cp.areal_mass > 0 ? cp.count * cp.areal_mass * cp.s0.typ : 0.0);
    /* the slowest typical rate and the highest Mach number over the rows, for the warnings */
    double slow = INFINITY, slow_z = 0.0, mach = 0.0, mach_z = 0.0;
    for (size_t i = 0; i < nalt; i++) {
        sr_air a;
        if (sr_atmos_at(&atm, alt[i], &a, &e)) {
            rc = sr_cli_fail(c, "--altitude: %s", e.msg);
            goto out;
        }
        sr_band v;
        if (sr_descent_rate(&cp, mass, body, &a, &v, &e)) {
            rc = sr_cli_fail_err(c, &e);
            goto out;
        }
        double row[] = {alt[i],
                        a.rho,
                        v.lo,
                        v.typ,
                        v.hi,
                        0.5 * a.rho * v.typ * v.typ,
                        sr_descent_drop_height(v.typ, a.g),
                        0.5 * mt * v.lo * v.lo,
                        0.5 * mt * v.typ * v.typ,
                        0.5 * mt * v.hi * v.hi};
        sr_rtable_row(t, row, NULL);
        if (v.typ < slow)
            slow = v.typ, slow_z = alt[i];
        if (v.hi / a.a > mach)
            mach = v.hi / a.a, mach_z = alt[i];
    }
    sr_report_note(r, "Equilibrium rate where drag equals weight: v = sqrt(2 m g / (rho CdS)). The energy "
                      "columns are the kinetic energy of the whole descending mass at that speed; per-section "
                      "energies are in `sinkrate profile`.");
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    sr_input_warnings_value(&iw, SR_PLAUS_MASS, mass, "descending mass", c->units);
    sr_input_warnings_canopy(&iw, &cp, "canopy", c->units);
    char what[160], az[48];
    sr_report_format_value(az, sizeof az, slow_z, SR_Q_LENGTH, c->units, SR_FIXED(0));
    snprintf(what, sizeof what, "descent rate (typical) at %s", az);
    sr_input_warnings_value(&iw, SR_PLAUS_DESCENT_SPEED, slow, what, c->units);
    unsigned mj = sr_mach_judge(mach, cp.fam.mach_max);
    if (mj) {
        char msg[SR_INPUT_WARN_LEN];
        sr_report_format_value(az, sizeof az, mach_z, SR_Q_LENGTH, c->units, SR_FIXED(0));
        snprintf(what, sizeof what, "the descent at %s (rate high)", az);
        sr_mach_describe(mj, mach, cp.fam.mach_max, cp.fam.id, what, msg, sizeof msg);
        sr_input_warnings_add(&iw, msg);
    }
    sr_cli_report_input_warnings(r, &iw);
    if (!cp.measured && strstr(cp.fam.cd0_source, "memory"))
        sr_report_warning(r, "The family's drag data are recalled handbook values, not checked against the printed "
                             "table: confirm with a drop test.");
    rc = sr_cli_emit(c, r);
out:
    free(alt);
    sr_report_free(r);
    sr_atmos_release(&atm);
    sr_cli_mission_free(mis);
    free(cat);
    return rc;
}
