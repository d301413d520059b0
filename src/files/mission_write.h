/* mission_write.h - a mission file written back with changes: the design
 * search's candidates (another family, size, cluster count or deployment
 * height for a stage, a stage dropped). Everything else of the file is
 * copied from its YAML document (libyaml's emitter), so the written file
 * describes the same mission; comments are not kept. */
#ifndef SR_MISSION_WRITE_H
#define SR_MISSION_WRITE_H

#include <stddef.h>

#include "base/error.h"
#include "files/mission.h"
#include "files/yamldoc.h"

typedef struct sr_mission_edit_stage {
    const char *family;  /* a catalog id, or NULL: as in the file */
    double d0;           /* nominal diameter, m (written as given: round it first), NaN: as in the file */
    int count;           /* cluster count, 0: as in the file */
    double height;       /* deployment height above ground, m, NaN: as in the file */
} sr_mission_edit_stage;

typedef struct sr_mission_edit {
    unsigned dropped;    /* bit k: stage k is left out (and every reference to it: its rated strength, its drag
                          * uncertainty, the failure cases that name it) */
    sr_mission_edit_stage stage[SR_MISSION_MAX_STAGES];
    int keep_design;     /* keep the design: block (it is dropped otherwise) */
    const char *header;  /* comment lines written before the document (each line starts "# "), or NULL */
    const char *target;  /* where the text will be read from (file names inside are rewritten to resolve from
                          * there); NULL: next to the mission */
} sr_mission_edit;

/* An edit that changes nothing. */
void sr_mission_edit_init(sr_mission_edit *e);

/* The mission m (loaded from the document y) with the edit applied, as YAML
 * text in *buf (malloc'd, *len bytes). */
int sr_mission_write(const sr_mission *m, const sr_yaml *y, const sr_mission_edit *e, char **buf, size_t *len,
                     sr_error *err);

#endif
