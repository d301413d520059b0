/* sinkrate/files.h - the readers: the canopy catalog and canopy files,
 * mission files, and the CSV tables models take (soundings, wind tables).
 * Every file error names file:line:column in its message and in
 * sr_error_file / sr_error_line / sr_error_column. The formats are described
 * in docs/files.md (installed in the documentation directory). Conventions:
 * sinkrate/base.h. */
#ifndef SINKRATE_FILES_H
#define SINKRATE_FILES_H

#include <stddef.h>

#include "sinkrate/base.h"
#include "sinkrate/physics.h"

#ifdef __cplusplus
extern "C" {
#endif

/* ---- the catalog ---------------------------------------------------------
 * Canopy families, one YAML file each (canopies/<id>.yaml), every value with
 * its source. */

typedef struct sr_catalog sr_catalog;

/* The directory of the built-in catalog: $SINKRATE_DATA/canopies when that
 * variable is set, else the one installed with the library. */
SR_API void sr_catalog_default_dir(char *buf, size_t len);
/* Open the catalog in dir (every *.yaml in it), or the built-in one (dir
 * NULL). Any bad file fails the whole load with its file:line:column. */
SR_API int sr_catalog_new(sr_catalog **out, const char *dir, sr_error *err);
SR_API void sr_catalog_free(sr_catalog *c);
/* Put the families of another directory in front: a family with the id of
 * one loaded before replaces it. from names the directory in listings. */
SR_API int sr_catalog_add(sr_catalog *c, const char *dir, const char *from, sr_error *err);
/* The families, sorted by file name within each directory. */
SR_API size_t sr_catalog_count(const sr_catalog *c);
SR_API const sr_family *sr_catalog_family(const sr_catalog *c, size_t i);
/* A family by id; NULL with an error suggesting the closest id otherwise. */
SR_API const sr_family *sr_catalog_find(const sr_catalog *c, const char *id, sr_error *err);

/* A canopy file (top-level key `canopy:`: a family of the catalog, a size,
 * maybe a measured drag coefficient or cluster). */
SR_API int sr_canopy_open(sr_canopy **out, const sr_catalog *cat, const char *path, sr_error *err);

/* ---- tables --------------------------------------------------------------
 * CSV with a header row naming each column with its unit in brackets. */

/* A sounding: columns altitude, temperature, pressure (extra columns such as
 * the wind are ignored), rows in increasing altitude. */
SR_API int sr_atmos_open_sounding(sr_atmos **out, const char *path, sr_error *err);
/* A wind table: columns height (above ground) or altitude (above sea level,
 * converted with ground, the site elevation in m), speed and from. */
SR_API int sr_wind_open_table(sr_wind **out, const char *path, double ground, sr_error *err);

/* ---- missions ------------------------------------------------------------
 * A mission file: the site and its weather, the sections and their masses,
 * the recovery stages with their canopies and deployment events, the state
 * at first deployment, the limits, failure cases and uncertainties. */

typedef struct sr_mission sr_mission;

/* Read and check a mission file; canopy families come from cat. Relative
 * file names inside (a sounding, canopy files) are relative to the file. */
SR_API int sr_mission_open(sr_mission **out, const char *path, const sr_catalog *cat, sr_error *err);
SR_API void sr_mission_free(sr_mission *m);

SR_API const char *sr_mission_name(const sr_mission *m);
SR_API double sr_mission_ground(const sr_mission *m);            /* site elevation, m above sea level */
SR_API const sr_atmos *sr_mission_atmos(const sr_mission *m);    /* the site's weather */
SR_API const sr_wind *sr_mission_wind(const sr_mission *m);
SR_API size_t sr_mission_sections(const sr_mission *m);
SR_API const char *sr_mission_section_name(const sr_mission *m, size_t i);
SR_API double sr_mission_section_mass(const sr_mission *m, size_t i); /* typical, kg */
SR_API double sr_mission_total_mass(const sr_mission *m);             /* kg */
/* "booster + payload bay" for a set of sections. */
SR_API void sr_mission_set_name(const sr_mission *m, sr_section_set s, char *buf, size_t len);
SR_API size_t sr_mission_stages(const sr_mission *m);
SR_API const char *sr_mission_stage_name(const sr_mission *m, size_t k);
/* The stage's canopy (owned by the mission); its size may be a placeholder
 * when the file gives none (sr_mission_stage_has_size). */
SR_API const sr_canopy *sr_mission_stage_canopy(const sr_mission *m, size_t k);
SR_API int sr_mission_stage_has_size(const sr_mission *m, size_t k);
/* Whether the file sets any limit. */
SR_API int sr_mission_has_limits(const sr_mission *m);
/* Its failure cases (`failure-cases:`): a name and the stages that do not
 * deploy (bit k: stage k). */
SR_API size_t sr_mission_failures(const sr_mission *m);
SR_API const char *sr_mission_failure_name(const sr_mission *m, size_t i);
SR_API unsigned sr_mission_failure_stages(const sr_mission *m, size_t i);

/* The profile context of a mission (sinkrate/physics.h): every stage needs a
 * size and the mission a start: block. The context keeps copies of what it
 * needs; m need not outlive it. o: NULL for the defaults. */
SR_API int sr_mission_profile(sr_profile_ctx **ctx, const sr_mission *m, const sr_profile_opts *o, sr_error *err);

#ifdef __cplusplus
}
#endif

#endif
