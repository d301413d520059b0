/* cmd_air.c - `sinkrate air`: the atmosphere as a table, for the standard,
 * a hot or cold day, a site's measured surface values, or a sounding. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "cli/commands.h"
#include "cli/common.h"

typedef struct air_opts {
    const char *from, *to, *step, *altitude;
    sr_atmos_opts atmos;
} air_opts;

static const sr_opt OPTS[] = {
    SR_OPT_STRING("from", "Z0", air_opts, from, "the first altitude of a range (at most 10000 rows)"),
    SR_OPT_STRING("to", "Z1", air_opts, to, "its last altitude"),
    SR_OPT_STRING("step", "DZ", air_opts, step, "its step"),
    SR_OPT_STRING("altitude", "Z[,Z...]", air_opts, altitude, "a list of altitudes"),
    SR_OPT_GROUP(sr_cli_group_atmos, air_opts, atmos),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "atmosphere", NULL};

static int run_air(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_air = {
    .name = "air",
    .summary = "atmosphere table (standard, offset, site, sounding)",
    .usage = "usage: sinkrate air [--from Z0 --to Z1 --step DZ | --altitude Z,...] [atmosphere options]\n",
    .about = "The atmosphere at each altitude above sea level (geometric): temperature, pressure, density and its "
             "ratio to sea level, speed of sound, dynamic and kinematic viscosity, gravity. Default: 0 to 11 km "
             "every 1 km (from the site elevation with a site model). The 1976 standard covers -1 km to 86 km; a "
             "sounding covers its own rows and is never extrapolated.",
    .options = OPTS,
    .tables = TABLES,
    .run = run_air,
};

#define MAX_ROWS 10000

static int run_air(sr_cli *c, int argc, char **argv)
{
    air_opts o;
    memset(&o, 0, sizeof o);
    int rc = sr_cli_parse_options(c, argc, argv, &o, NULL);
    if (rc)
        return rc;
    if (o.altitude && (o.from || o.to || o.step))
        return sr_cli_fail(c, "--altitude: give either a list or --from/--to/--step, not both");
    sr_atmos atm;
    double ground;
    if ((rc = sr_cli_atmos(c, &o.atmos, &atm, &ground)))
        return rc;
    double *z = malloc(MAX_ROWS * sizeof *z);
    sr_report *r = NULL;
    size_t n = 0;
    if (!z) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    if (o.altitude) {
        if ((rc = sr_cli_quantity_list(c, "--altitude", o.altitude, SR_Q_LENGTH, z, MAX_ROWS, &n)))
            goto out;
    } else {
        double lo, hi;
        sr_atmos_range(&atm, &lo, &hi);
        double z0 = atm.kind == SR_ATMOS_SOUNDING ? lo : ground;
        double z1 = atm.kind == SR_ATMOS_SOUNDING ? hi : ground + 11000.0;
        double dz = 1000.0;
        if (o.from && (rc = sr_cli_quantity(c, "--from", o.from, SR_Q_LENGTH, 0, &z0)))
            goto out;
        if (o.to && (rc = sr_cli_quantity(c, "--to", o.to, SR_Q_LENGTH, 0, &z1)))
            goto out;
        if (o.step && (rc = sr_cli_quantity(c, "--step", o.step, SR_Q_LENGTH, 0, &dz)))
            goto out;
        if (dz == 0.0 || (z1 - z0) * dz < 0.0) {
            rc = sr_cli_fail(c, "--step: %g m never gets from %g m to %g m", dz, z0, z1);
            goto out;
        }
        double rows = floor((z1 - z0) / dz + 1e-9) + 1.0;
        if (rows > MAX_ROWS) {
            rc = sr_cli_fail(c, "--step: %.0f rows is more than %d; use a larger step", rows, MAX_ROWS);
            goto out;
        }
        for (n = 0; n < (size_t)rows; n++)
            z[n] = z0 + (double)n * dz;
    }
    r = sr_report_new("air", "atmosphere table");
    sr_report_section(r, "Model");
    sr_cli_report_atmos(r, &atm);
    sr_rtable *t = sr_report_table(r, "atmosphere", NULL);
    sr_rtable_column(t, "altitude", "altitude", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "temperature", "temperature", SR_Q_TEMP, 5);
    sr_rtable_column(t, "pressure", "pressure", SR_Q_PRESSURE, 5);
    sr_rtable_column(t, "density", "density", SR_Q_DENSITY, 5);
    sr_rtable_column(t, "density_ratio", "sigma", SR_Q_NONE, 4);
    sr_rtable_column(t, "sound_speed", "sound speed", SR_Q_SPEED, 5);
    sr_rtable_column(t, "viscosity", "viscosity", SR_Q_VISCOSITY, 5);
    sr_rtable_column(t, "kinematic_viscosity", "kin. viscosity", SR_Q_KIN_VISCOSITY, 4);
    sr_rtable_column(t, "gravity", "gravity", SR_Q_ACCEL, 6);
    sr_error e;
    for (size_t i = 0; i < n; i++) {
        sr_air a;
        if (sr_atmos_at(&atm, z[i], &a, &e)) {
            rc = sr_cli_fail(c, "%s: %s", o.altitude ? "--altitude" : "--from/--to", e.msg);
            goto out;
        }
        double row[] = {a.z, a.T, a.p, a.rho, a.rho / 1.2249991558877122, a.a, a.mu, a.nu, a.g};
        sr_rtable_row(t, row, NULL);
    }
    sr_report_note(r, "Altitudes are geometric, above mean sea level. sigma is the density over the 1976 "
                      "sea-level density 1.225 kg/m3. Temperature above 80 km is the molecular-scale temperature.");
    rc = sr_cli_emit(c, r);
out:
    free(z);
    sr_report_free(r);
    sr_atmos_release(&atm);
    return rc;
}
