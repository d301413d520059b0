/* cmd_size.c - `sinkrate size`: the nominal area and diameters a canopy
 * family needs to bring a payload down at a target speed. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"
#include "analysis/input_warnings.h"
#include "analysis/sizing.h"
#include "physics/descent.h"
#include "files/mission.h"

typedef struct size_opts {
    const char *speed;
    sr_payload_opts payload;
    sr_canopy_opts canopy;
    sr_atmos_opts atmos;
} size_opts;

static const sr_opt OPTS[] = {
    SR_OPT_GROUP(sr_cli_group_payload, size_opts, payload),
    SR_OPT_FOR("altitude", "Z",
               "altitude above sea level of the target speed (default: the ground, the site elevation or 0: a "
               "touchdown speed)"),
    SR_OPT_FOR("body-drag-area", "A", "payload drag area CdA to count with the canopy (\"0.02 m2\")"),
    SR_OPT_FOR("mission", "FILE",
               "take mass (all sections), touchdown-speed limit, site and the last stage's family from a mission "
               "file; options given as well override it"),
    SR_OPT_STRING("speed", "V", size_opts, speed,
                  "target descent speed (\"5.5 m/s\", \"18 ft/s\"): at touchdown, or at --altitude"),
    SR_OPT_GROUP(sr_cli_group_canopy, size_opts, canopy),
    SR_OPT_GROUP(sr_cli_group_atmos, size_opts, atmos),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "rate_of_typical_size", NULL};

static int run_size(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_size = {
    .name = "size",
    .summary = "nominal area and diameters a canopy family needs for a target touchdown speed",
    .usage = "usage: sinkrate size --mass M --speed V --family ID [options]\n"
             "       sinkrate size --mission FILE [options]\n",
    .about = "Nominal area S0 and nominal, projected and flat diameters a canopy family needs so that a payload of "
             "mass M descends at V at the touchdown altitude (or at --altitude: a drogue sized for its descent rate "
             "where the main opens). The band (low / typical / high) comes from the family's drag-coefficient "
             "range: the high drag coefficient gives the smallest canopy.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_size,
};

static int run_size(sr_cli *c, int argc, char **argv)
{
    size_opts o;
    memset(&o, 0, sizeof o);
    int rc = sr_cli_parse_options(c, argc, argv, &o, NULL);
    if (rc)
        return rc;
    if (o.canopy.nominal_diameter || o.canopy.projected_diameter || o.canopy.flat_diameter || o.canopy.nominal_area)
        return sr_cli_fail(c, "%s: size finds the canopy size; drop the size option (use `sinkrate rate` for a given "
                              "size)",
                           o.canopy.nominal_diameter     ? "--nominal-diameter"
                           : o.canopy.projected_diameter ? "--projected-diameter"
                           : o.canopy.flat_diameter      ? "--flat-diameter"
                                                         : "--nominal-area");

    sr_catalog *cat = NULL;
    sr_mission *mis = NULL;
    sr_atmos atm;
    sr_atmos_init_standard(&atm);
    sr_report *r = NULL;
    sr_error e;
    double mass = NAN, speed = NAN, ground = 0.0, z, body = 0.0;
    sr_canopy cp;
    if ((rc = sr_cli_catalog(c, &cat)) || (rc = sr_cli_mission(c, o.payload.mission, cat, &o.atmos, &mis, &atm, &ground)))
        goto out;
    if (mis) {
        mass = sr_mission_total_mass(mis);
        speed = mis->limit_speed;
        cp = mis->stages[mis->nstages - 1].canopy;
    }
    if (sr_cli_canopy_given(&o.canopy) || !mis) {
        if ((rc = sr_cli_canopy(c, cat, &o.canopy, 0, &cp)))
            goto out;
    } else if (o.canopy.cluster || o.canopy.cluster_factor || o.canopy.areal_mass) {
        rc = sr_cli_fail(c, "with --mission, give --family too when changing cluster or areal mass");
        goto out;
    }
    if ((rc = sr_cli_mass(c, o.payload.mass, "the payload mass", &mass)))
        goto out;
    if (o.speed && (rc = sr_cli_quantity(c, "--speed", o.speed, SR_Q_SPEED, 1, &speed)))
        goto out;
    if (isnan(speed)) {
        rc = sr_cli_fail(c, "--speed: the target descent speed is required%s",
                         mis ? " (the mission file has no touchdown-speed limit)" : "");
        goto out;
    }
    if (speed > 300.0) {
        rc = sr_cli_fail(c, "--speed: %g m/s is not a descent speed a canopy is sized for", speed);
        goto out;
    }
    if ((rc = sr_cli_body_drag(c, o.payload.body, &body)))
        goto out;
    z = ground;
    if (o.payload.altitude && (rc = sr_cli_quantity(c, "--altitude", o.payload.altitude, SR_Q_LENGTH, 0, &z)))
        goto out;
    sr_air air;
    if (sr_atmos_at(&atm, z, &air, &e)) {
        rc = sr_cli_fail(c, "--altitude: %s", e.msg);
        goto out;
    }
    /* the size and what is reported around it (analysis/sizing.h) */
    sr_sizing_request sreq = {.canopy = &cp, .mass = mass, .speed = speed, .body_cds = body, .atmos = &atm,
                              .altitude = z};
    sr_sizing_result szr;
    if (sr_sizing_run(&sreq, &szr, &e)) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    const sr_size_result res = szr.size;
    double areal = cp.areal_mass > 0 ? cp.areal_mass : 0.0;

    /* the words fit the stage: a touchdown speed at the ground, a descent
     * speed anywhere above it (a drogue sized for where the main opens) */
    int touchdown = fabs(z - ground) < 0.5;
    r = sr_report_new("size", touchdown ? "canopy size for a target touchdown speed"
                                        : "canopy size for a target descent speed");
    sr_report_section(r, "Inputs");
    if (mis)
        sr_report_text(r, "mission", "mission", mis->name);
    sr_report_value(r, "mass", "payload mass (without canopy)", mass, SR_Q_MASS, 4);
    sr_report_value(r, "target_speed", touchdown ? "target touchdown speed" : "target descent speed", speed,
                    SR_Q_SPEED, 4);
    sr_report_value(r, "altitude", touchdown ? "touchdown altitude (above sea level)"
                                             : "altitude of the target speed (above sea level)",
                    z, SR_Q_LENGTH, SR_FIXED(0));
    sr_cli_report_atmos(r, &atm);
    sr_report_value(r, "density", "air density there", air.rho, SR_Q_DENSITY, 5);
    sr_cli_report_canopy(r, &cp);
    if (body > 0)
        sr_report_value(r, "body_drag_area", "payload drag area", body, SR_Q_AREA, 4);
    if (areal > 0)
        sr_report_value(r, "areal_mass", "canopy areal mass", areal, SR_Q_AREAL_MASS, 3);

    sr_report_section(r, cp.count > 1 ? "Result (each canopy of the cluster)" : "Result");
    sr_report_band(r, "nominal_area", "nominal area S0", res.s0.lo, res.s0.typ, res.s0.hi, SR_Q_AREA, 4);
    sr_report_band(r, "nominal_diameter", "nominal diameter D0", res.d0.lo, res.d0.typ, res.d0.hi, SR_Q_SIZE, 4);
    sr_report_band(r, "projected_diameter", "projected diameter Dp", szr.dp.lo, szr.dp.typ, szr.dp.hi, SR_Q_SIZE, 4);
    sr_report_band(r, "flat_diameter", "flat (constructed) diameter Dc", szr.dc.lo, szr.dc.typ, szr.dc.hi,
                   SR_Q_SIZE, 4);
    if (areal > 0)
        sr_report_band(r, "canopy_mass", "canopy fabric mass (all canopies)", res.canopy_mass.lo,
                       res.canopy_mass.typ, res.canopy_mass.hi, SR_Q_MASS, 3);
    sr_report_value(r, "drag_area", "drag area needed (total, typical)", res.cds_total, SR_Q_AREA, 4);
    sr_report_value(r, "touchdown_energy", touchdown ? "touchdown kinetic energy" : "kinetic energy at that speed",
                    szr.energy, SR_Q_ENERGY, 4);

    if (mis && mis->stages[mis->nstages - 1].has_size && !sr_cli_canopy_given(&o.canopy)) {
        const sr_stage *st = &mis->stages[mis->nstages - 1];
        sr_report_section(r, "Against the mission file");
        char buf[300], sz[64];
        sr_report_format_value(sz, sizeof sz, st->canopy.size_value,
                               st->canopy.size_kind == SR_SIZE_NOMINAL_AREA ? SR_Q_AREA : SR_Q_SIZE, c->units, 4);
        snprintf(buf, sizeof buf, "stage '%s': %s %s", st->name, sr_size_kind_name(st->canopy.size_kind), sz);
        sr_report_text(r, "file_size", "size in the file", buf);
        sr_report_band(r, "file_nominal_area", "its nominal area S0", st->canopy.s0.lo, st->canopy.s0.typ,
                       st->canopy.s0.hi, SR_Q_AREA, 4);
        switch (sr_sizing_compare(&szr, &st->canopy)) {
        case SR_SIZING_FITS_BAND:
            sr_report_note(r, "The file's canopy is at least as large as the high end of the band: it meets the "
                              "target speed over the whole drag range.");
            break;
        case SR_SIZING_FITS_TYPICAL:
            sr_report_warning(r, "The file's canopy meets the target with the typical drag coefficient but not over "
                                 "the whole range: it needs S0 = %.3g m2 to be sure.", res.s0.hi);
            break;
        default:
            sr_report_warning(r, "The file's canopy is smaller than the typical size needed (%.3g m2): it lands "
                                 "faster than the target.", res.s0.typ);
        }
    }
    sr_rtable *t = sr_report_table(r, "rate_of_typical_size", "Descent rate of the typical size at altitude");
    sr_rtable_column(t, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "density", "density", SR_Q_DENSITY, 4);
    sr_rtable_column(t, "rate_low", "rate low", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_typical", "rate typical", SR_Q_SPEED, 3);
    sr_rtable_column(t, "rate_high", "rate high", SR_Q_SPEED, 3);
    for (size_t i = 0; i < szr.nrates; i++) {
        double row[] = {szr.rate_altitude[i], szr.rate_density[i], szr.rate[i].lo, szr.rate[i].typ, szr.rate[i].hi};
        sr_rtable_row(t, row, NULL);
    }
    sr_report_note(r, "Sizes are on nominal area S0 (total canopy surface, vent included), D0 = sqrt(4 S0/pi). "
                      "Projected and flat diameters use the family's Dp/D0 and Dc/D0 ratios.");
    sr_report_note(r, "The band comes from the drag-coefficient range of the family: the high coefficient gives "
                      "the small canopy, the low one the large. Choose from the large end to meet the speed with "
                      "margin.");
    if (szr.cd0_converted)
        sr_report_note(r, "A measured drag coefficient on %s area was converted to nominal area through the family "
                          "ratio.", sr_ref_name(cp.cd.ref));
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    sr_input_warnings_value(&iw, SR_PLAUS_MASS, mass, "payload mass", c->units);
    sr_input_warnings_value(&iw, SR_PLAUS_DESCENT_SPEED, speed,
                            touchdown ? "target touchdown speed" : "target descent speed", c->units);
    sr_input_warnings_value(&iw, SR_PLAUS_CANOPY_D0, res.d0.typ, "nominal diameter D0 needed (typical)", c->units);
    if (areal > 0)
        sr_input_warnings_value(&iw, SR_PLAUS_AREAL_MASS, areal, "canopy areal mass", c->units);
    unsigned mj = sr_mach_judge(speed / air.a, cp.fam.mach_max);
    if (mj) {
        char msg[SR_INPUT_WARN_LEN];
        sr_mach_describe(mj, speed / air.a, cp.fam.mach_max, cp.fam.id, "the target speed", msg, sizeof msg);
        sr_input_warnings_add(&iw, msg);
    }
    sr_cli_report_input_warnings(r, &iw);
    if (cp.fam.cd0_source[0] && strstr(cp.fam.cd0_source, "memory"))
        sr_report_warning(r, "The family's drag data are recalled handbook values, not checked against the printed "
                             "table: confirm with a drop test before relying on the size.");
    rc = sr_cli_emit(c, r);
out:
    sr_report_free(r);
    sr_atmos_release(&atm);
    sr_cli_mission_free(mis);
    free(cat);
    return rc;
}
