/* dragtable.c - drag curves Cd(Re) of a body from a file: a CSV table with
 * the columns Re and Cd, or a YAML file with its points, name, source and
 * reference area; every bad row named by file:line:column. */
#include "files/dragtable.h"

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "files/csvtable.h"
#include "files/yamldoc.h"

static int load_csv(sr_bluff_curve *c, const char *path, sr_bluff_interp kind, sr_error *err)
{
    static const sr_csv_column cols[] = {{"Re", SR_Q_NONE, 1}, {"Cd", SR_Q_NONE, 1}};
    sr_csvtable t;
    int rc = sr_csvtable_load(&t, path, cols, 2, err);
    if (rc != SR_OK)
        return rc;
    rc = sr_bluff_curve_table_at(c, t.col[0], t.col[1], t.nrows, kind, path, t.row_line, NULL, err);
    sr_csvtable_free(&t);
    return rc;
}

#define YAML_MAX_POINTS 10000

static int load_yaml(sr_bluff_curve *c, const char *path, sr_bluff_interp kind, sr_error *err)
{
    static const char *const allowed[] = {"name", "source", "reference-area", "points", NULL};
    static const char *const required[] = {"points", NULL};
    sr_yaml y;
    int rc = sr_yaml_load_file(&y, path, err);
    if (rc != SR_OK)
        return rc;
    double *re = NULL, *cd = NULL;
    size_t *line = NULL, *col = NULL;
    char name[256] = "", source[256] = "";
    double area = 0;
    yaml_node_t *root = sr_yaml_root(&y), *pts, *n;
    if ((rc = sr_yaml_check_map(&y, root, "drag table", allowed, required, err)))
        goto out;
    if ((n = sr_yaml_get(&y, root, "name")) && (rc = sr_yaml_string(&y, n, name, sizeof name, err)))
        goto out;
    if ((n = sr_yaml_get(&y, root, "source")) && (rc = sr_yaml_text(&y, n, source, sizeof source, err)))
        goto out;
    if ((n = sr_yaml_get(&y, root, "reference-area"))) {
        if ((rc = sr_yaml_quantity(&y, n, SR_Q_AREA, &area, err)))
            goto out;
        if (!(area > 0)) {
            rc = sr_yaml_fail(&y, n, err, "reference-area must be positive");
            goto out;
        }
    }
    pts = sr_yaml_get(&y, root, "points");
    if ((rc = sr_yaml_require_seq(&y, pts, "points", 1, YAML_MAX_POINTS, err)))
        goto out;
    size_t np = sr_yaml_seq_len(pts);
    re = malloc(np * sizeof *re);
    cd = malloc(np * sizeof *cd);
    line = malloc(np * sizeof *line);
    col = malloc(np * sizeof *col);
    if (!re || !cd || !line || !col) {
        rc = sr_error_set_at(err, SR_ENOMEM, path, 0, 0, "out of memory");
        goto out;
    }
    for (size_t i = 0; i < np; i++) {
        yaml_node_t *p = sr_yaml_seq_at(&y, pts, i);
        if (!p || p->type != YAML_SEQUENCE_NODE || sr_yaml_seq_len(p) != 2) {
            rc = sr_yaml_fail(&y, p, err, "each point is a pair [Re, Cd], e.g. [1.0e5, 0.47]");
            goto out;
        }
        if ((rc = sr_yaml_number(&y, sr_yaml_seq_at(&y, p, 0), &re[i], err)) ||
            (rc = sr_yaml_number(&y, sr_yaml_seq_at(&y, p, 1), &cd[i], err)))
            goto out;
        line[i] = p->start_mark.line + 1; /* libyaml counts from zero */
        col[i] = p->start_mark.column + 1;
    }
    if ((rc = sr_bluff_curve_table_at(c, re, cd, np, kind, path, line, col, err)))
        goto out;
    c->table_area = area;
    if (name[0] || source[0])
        snprintf(c->info, sizeof c->info, "%s (%s%s%s)", path, name, name[0] && source[0] ? "; " : "", source);
out:
    free(re);
    free(cd);
    free(line);
    free(col);
    sr_yaml_free(&y);
    return rc;
}

int sr_dragtable_load(sr_bluff_curve *c, const char *path, sr_bluff_interp kind, sr_error *err)
{
    memset(c, 0, sizeof *c);
    const char *dot = strrchr(path, '.');
    if (dot && (strcmp(dot, ".yaml") == 0 || strcmp(dot, ".yml") == 0))
        return load_yaml(c, path, kind, err);
    return load_csv(c, path, kind, err);
}
