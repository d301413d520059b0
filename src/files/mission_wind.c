/* mission_wind.c - the site.wind block of a mission file: a constant wind,
 * a power or log law, or a table (CSV file, inline rows, or the sounding's
 * wind columns). Each model takes only its own keys. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "files/mission_int.h"
#include "files/windtable.h"

static const char *const WIND_KEYS[] = {"model",        "speed",            "from",         "reference-height",
                                        "exponent",     "roughness-length", "displacement", "file",
                                        "rows",         "gradient-height",  NULL};
static const char *const MODELS[] = {"constant", "power-law", "log-law", "table", "sounding", NULL};
/* keys each model takes (besides `model`) */
static const char *const KEYS_CONSTANT[] = {"speed", "from", NULL};
static const char *const KEYS_POWER[] = {"speed", "from", "reference-height", "exponent", "gradient-height", NULL};
static const char *const KEYS_LOG[] = {"speed",        "from",            "reference-height", "roughness-length",
                                       "displacement", "gradient-height", NULL};
static const char *const KEYS_TABLE[] = {"file", "rows", NULL};
static const char *const KEYS_SOUNDING[] = {NULL};
static const char *const ROW_KEYS[] = {"height", "altitude", "speed", "from", NULL};
static const char *const ROW_REQ[] = {"speed", "from", NULL};

static int in_list(const char *const *list, const char *k)
{
    for (; *list; list++)
        if (strcmp(*list, k) == 0)
            return 1;
    return 0;
}

static int quantity(const sr_yaml *y, yaml_node_t *map, const char *key, sr_quantity q, double *v, sr_error *err)
{
    yaml_node_t *n = sr_yaml_get(y, map, key);
    return n ? sr_yaml_quantity(y, n, q, v, err) : SR_OK;
}

static int parse_rows(sr_wind *w, double ground, const sr_yaml *y, yaml_node_t *rows, sr_error *err)
{
    int rc = sr_yaml_require_seq(y, rows, "wind rows", 1, SR_WIND_MAX_ROWS, err);
    if (rc)
        return rc;
    size_t n = sr_yaml_seq_len(rows);
    double *buf = malloc(3 * n * sizeof *buf);
    if (!buf)
        return sr_error_set(err, SR_ENOMEM, "out of memory for the wind rows");
    double *h = buf, *s = buf + n, *f = buf + 2 * n;
    for (size_t i = 0; i < n && !rc; i++) {
        yaml_node_t *r = sr_yaml_seq_at(y, rows, i);
        if ((rc = sr_yaml_check_map(y, r, "a wind row", ROW_KEYS, ROW_REQ, err)))
            break;
        yaml_node_t *hn = sr_yaml_get(y, r, "height"), *an = sr_yaml_get(y, r, "altitude");
        if ((hn != NULL) == (an != NULL)) {
            rc = sr_yaml_fail(y, r, err, "a wind row takes exactly one of height: (above ground) or altitude: "
                                         "(above sea level)");
            break;
        }
        if ((rc = sr_yaml_quantity(y, hn ? hn : an, SR_Q_LENGTH, &h[i], err)))
            break;
        if (an)
            h[i] -= ground;
        if ((rc = sr_yaml_quantity(y, sr_yaml_get(y, r, "speed"), SR_Q_SPEED, &s[i], err)) ||
            (rc = sr_yaml_quantity(y, sr_yaml_get(y, r, "from"), SR_Q_ANGLE, &f[i], err)))
            break;
        if (i > 0 && !(h[i] > h[i - 1])) {
            rc = sr_yaml_fail(y, hn ? hn : an, err, "wind rows must go up: %g m above ground is not above the row "
                                                    "before (%g m)",
                              h[i], h[i - 1]);
            break;
        }
        sr_error e;
        sr_wind one;
        if (sr_wind_init_table(&one, &h[i], &s[i], &f[i], 1, &e)) {
            rc = sr_yaml_fail(y, r, err, "%s", e.msg);
            break;
        }
        sr_wind_release(&one);
    }
    if (!rc) {
        sr_error e;
        if ((rc = sr_wind_init_table(w, h, s, f, n, &e)))
            rc = sr_yaml_fail(y, rows, err, "%s", e.msg);
    }
    free(buf);
    return rc;
}

int sr_mission_wind_parse(sr_wind *w, const sr_yaml *y, yaml_node_t *n, const char *mission_path, double ground,
                          const sr_atmos *atmos, sr_error *err)
{
    int rc;
    if ((rc = sr_yaml_check_map(y, n, "wind", WIND_KEYS, NULL, err)))
        return rc;
    char model[32];
    yaml_node_t *mn = sr_yaml_get(y, n, "model");
    if (mn) {
        if ((rc = sr_yaml_string(y, mn, model, sizeof model, err)))
            return rc;
        if (!in_list(MODELS, model)) {
            const char *s = sr_yaml_suggest(model, MODELS);
            if (s)
                return sr_yaml_fail(y, mn, err, "unknown wind model '%s'; did you mean '%s'?", model, s);
            char list[160] = "";
            for (const char *const *k = MODELS; *k; k++)
                snprintf(list + strlen(list), sizeof list - strlen(list), "%s%s", k == MODELS ? "" : ", ", *k);
            return sr_yaml_fail(y, mn, err, "unknown wind model '%s' (%s)", model, list);
        }
    } else {
        /* without a model: a table when rows or a file are given, else constant */
        snprintf(model, sizeof model, "%s",
                 sr_yaml_get(y, n, "rows") || sr_yaml_get(y, n, "file") ? "table" : "constant");
    }
    const char *const *keys = strcmp(model, "constant") == 0    ? KEYS_CONSTANT
                              : strcmp(model, "power-law") == 0 ? KEYS_POWER
                              : strcmp(model, "log-law") == 0   ? KEYS_LOG
                              : strcmp(model, "table") == 0     ? KEYS_TABLE
                                                                : KEYS_SOUNDING;
    yaml_document_t *d = (yaml_document_t *)&y->doc;
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        yaml_node_t *k = yaml_document_get_node(d, p->key);
        const char *ks = (const char *)k->data.scalar.value;
        if (strcmp(ks, "model") != 0 && !in_list(keys, ks))
            return sr_yaml_fail(y, k, err, "'%s' does not belong to the %s wind model%s", ks, model,
                                mn ? "" : " (the default without model:); set model: to the one you mean");
    }
    sr_error e;
    if (strcmp(model, "table") == 0) {
        yaml_node_t *fn = sr_yaml_get(y, n, "file"), *rn = sr_yaml_get(y, n, "rows");
        if ((fn != NULL) == (rn != NULL))
            return sr_yaml_fail(y, n, err, "a wind table takes exactly one of file: (CSV) or rows: (inline)");
        if (rn)
            return parse_rows(w, ground, y, rn, err);
        char file[400], path[1024];
        if ((rc = sr_yaml_string(y, fn, file, sizeof file, err)))
            return rc;
        sr_yaml_relative_path(path, sizeof path, mission_path, file);
        if (sr_windtable_load(w, path, ground, &e))
            return sr_yaml_fail(y, fn, err, "%s", e.msg);
        return SR_OK;
    }
    if (strcmp(model, "sounding") == 0) {
        if (atmos->kind != SR_ATMOS_SOUNDING)
            return sr_yaml_fail(y, mn, err, "wind model 'sounding' takes the wind columns of site.sounding, and the "
                                            "site has no sounding");
        if (sr_windtable_load_sounding(w, atmos->source, ground, &e))
            return sr_yaml_fail(y, mn, err, "%s", e.msg);
        return SR_OK;
    }
    double speed, from, href = SR_WIND_REF_HEIGHT, alpha = SR_WIND_ALPHA_OPEN, z0 = NAN, disp = 0.0;
    static const char *const REQ[] = {"speed", "from", NULL};
    if ((rc = sr_yaml_check_map(y, n, "wind", WIND_KEYS, REQ, err)))
        return rc;
    if ((rc = quantity(y, n, "speed", SR_Q_SPEED, &speed, err)) || (rc = quantity(y, n, "from", SR_Q_ANGLE, &from, err)) ||
        (rc = quantity(y, n, "reference-height", SR_Q_LENGTH, &href, err)) ||
        (rc = quantity(y, n, "roughness-length", SR_Q_LENGTH, &z0, err)) ||
        (rc = quantity(y, n, "displacement", SR_Q_LENGTH, &disp, err)))
        return rc;
    yaml_node_t *xn = sr_yaml_get(y, n, "exponent");
    if (xn && (rc = sr_yaml_number(y, xn, &alpha, err)))
        return rc;
    if (strcmp(model, "constant") == 0) {
        rc = sr_wind_init_constant(w, speed, from, &e);
    } else if (strcmp(model, "power-law") == 0) {
        rc = sr_wind_init_power(w, speed, from, href, alpha, &e);
    } else {
        if (isnan(z0))
            return sr_yaml_fail(y, n, err, "the log-law wind needs roughness-length: (e.g. \"0.03 m\" for open "
                                           "grassland)");
        rc = sr_wind_init_log(w, speed, from, href, z0, disp, &e);
    }
    if (rc) {
        /* the wind model names the key it refuses (its keys are the file's) */
        yaml_node_t *blame = sr_yaml_get(y, n, e.key[0] ? e.key : "speed");
        return sr_yaml_fail(y, blame ? blame : n, err, "%s", e.msg);
    }
    yaml_node_t *gn = sr_yaml_get(y, n, "gradient-height");
    if (gn) {
        double hg;
        if ((rc = sr_yaml_quantity(y, gn, SR_Q_LENGTH, &hg, err)))
            return rc;
        if (sr_wind_set_gradient_height(w, hg, &e))
            return sr_yaml_fail(y, gn, err, "%s", e.msg);
    }
    return SR_OK;
}
