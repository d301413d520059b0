/* maps.h - the time-history and landing-map files of `profile` and
 * `dispersion`: --trajectory FILE (CSV or JSON) and --geojson FILE
 * (RFC 7946), written atomically like -o. */
#ifndef SR_CLI_MAPS_H
#define SR_CLI_MAPS_H

#include <stddef.h>

#include "analysis/dispersion_mission.h"
#include "analysis/scatter.h"
#include "cli/cli.h"
#include "files/mission.h"
#include "physics/profile.h"

/* Points a run's track may hold for these files (the engine keeps at most
 * 400 a steady stage and one an ODE step). */
#define SR_MAPS_TRACK_CAP 200000

/* One descent of the profile: which run it is ("typical drag", "low drag",
 * "high drag"), its result and its track. */
typedef struct sr_map_run {
    const char *name;
    const sr_profile_result *r;
    const sr_profile_track *tr;
} sr_map_run;

/* The launch point on the map, when the mission gives it, as a report line
 * ("28.9500 deg N, 105.3500 deg W (WGS 84)"). */
struct sr_report;
void sr_cli_maps_report_position(struct sr_report *r, const sr_mission *m);

/* Refuse --geojson (opt) for a mission without site.latitude and
 * site.longitude, before any work. 0 or an exit code. */
int sr_cli_maps_need_position(sr_cli *c, const char *opt, const sr_mission *m);

/* The format of the trajectory file: JSON for a name ending in .json, CSV
 * for .csv; otherwise JSON under --format json and CSV else. */
int sr_cli_maps_trajectory_format(const sr_cli *c, const char *path);

/* The documents are built before any output is written (a map that cannot
 * be drawn fails the run first) into *buf (malloc'd, *len bytes); then
 * sr_cli_maps_write puts them in place. Each returns 0 or an exit code (message
 * printed). */

/* --trajectory FILE: every body of every run, rows by body and time, in the
 * format of sr_cli_maps_trajectory_format(path). */
int sr_cli_maps_trajectory(sr_cli *c, const char *path, const sr_mission *m, const sr_profile_ctx *ctx,
                       const sr_map_run *runs, size_t nruns, char **buf, size_t *len);

/* --geojson FILE of profile: launch point, tracks and landing points of
 * every run, the deployments of the first, the drift limit. */
int sr_cli_maps_profile_geojson(sr_cli *c, const sr_mission *m, const sr_map_run *runs, size_t nruns, char **buf,
                            size_t *len);

/* --geojson FILE of dispersion: launch point, the nominal tracks, for every
 * landing body the nominal and mean landing points, the 1- and 3-sigma
 * ellipses, the 50 % and 95 % circles, the drift limit, and up to
 * max_samples landing points (every k-th sample; 0: none). */
int sr_cli_maps_dispersion_geojson(sr_cli *c, const sr_mission *m, const sr_disp_mission *dm, const sr_disp_result *res,
                               const sr_disp_stats *st, const sr_landing *nom, size_t max_samples, char **buf,
                               size_t *len);

/* Write one of them (opt names the option in errors) through the atomic
 * writer, as -o is written. */
int sr_cli_maps_write(sr_cli *c, const char *opt, const char *path, const char *data, size_t len);

#endif
