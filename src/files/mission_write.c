/* mission_write.c - a mission's YAML document emitted again (libyaml's
 * emitter) with a design's changes (mission_write.h). */
#define _DEFAULT_SOURCE
#include "files/mission_write.h"

#include <limits.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

void sr_mission_edit_init(sr_mission_edit *e)
{
    memset(e, 0, sizeof *e);
    for (size_t k = 0; k < SR_MISSION_MAX_STAGES; k++)
        e->stage[k].d0 = e->stage[k].height = NAN;
}

typedef struct writer {
    yaml_emitter_t em;
    const sr_yaml *y;
    const sr_mission *m;
    const sr_mission_edit *e;
    int rewrite_paths;   /* the text is read from another directory than the mission */
    int failed;
} writer;

static const char *scalar(const yaml_node_t *n)
{
    return n && n->type == YAML_SCALAR_NODE ? (const char *)n->data.scalar.value : NULL;
}

static int is_key(const yaml_node_t *k, const char *name)
{
    const char *s = scalar(k);
    return s && strcmp(s, name) == 0;
}

static yaml_node_t *node(const writer *w, int idx)
{
    return yaml_document_get_node((yaml_document_t *)&w->y->doc, idx);
}

static void emit(writer *w, yaml_event_t *ev, int ok)
{
    if (w->failed || !ok) {
        if (ok)
            yaml_event_delete(ev);
        w->failed = 1;
        return;
    }
    if (!yaml_emitter_emit(&w->em, ev))
        w->failed = 1;
}

static void emit_scalar_style(writer *w, const char *text, yaml_scalar_style_t style)
{
    yaml_event_t ev;
    int ok = yaml_scalar_event_initialize(&ev, NULL, NULL, (yaml_char_t *)text, (int)strlen(text), 1, 1, style);
    emit(w, &ev, ok);
}

static void emit_scalar(writer *w, const char *text)
{
    emit_scalar_style(w, text, YAML_ANY_SCALAR_STYLE);
}

static void begin(writer *w, int mapping, int flow)
{
    yaml_event_t ev;
    int ok = mapping ? yaml_mapping_start_event_initialize(&ev, NULL, NULL, 1,
                                                             flow ? YAML_FLOW_MAPPING_STYLE : YAML_BLOCK_MAPPING_STYLE)
                     : yaml_sequence_start_event_initialize(&ev, NULL, NULL, 1,
                                                              flow ? YAML_FLOW_SEQUENCE_STYLE
                                                                   : YAML_BLOCK_SEQUENCE_STYLE);
    emit(w, &ev, ok);
}

static void end(writer *w, int mapping)
{
    yaml_event_t ev;
    int ok = mapping ? yaml_mapping_end_event_initialize(&ev) : yaml_sequence_end_event_initialize(&ev);
    emit(w, &ev, ok);
}

static int flow_of(const yaml_node_t *n)
{
    return n->type == YAML_MAPPING_NODE ? n->data.mapping.style == YAML_FLOW_MAPPING_STYLE
                                        : n->data.sequence.style == YAML_FLOW_SEQUENCE_STYLE;
}

/* A node as it is (aliases were expanded when the file was read). */
static void copy(writer *w, const yaml_node_t *n)
{
    if (!n) {
        w->failed = 1;
        return;
    }
    switch (n->type) {
    case YAML_SCALAR_NODE:
        emit_scalar_style(w, (const char *)n->data.scalar.value, n->data.scalar.style);
        return;
    case YAML_SEQUENCE_NODE:
        begin(w, 0, flow_of(n));
        for (yaml_node_item_t *it = n->data.sequence.items.start; it < n->data.sequence.items.top; it++)
            copy(w, node(w, *it));
        end(w, 0);
        return;
    case YAML_MAPPING_NODE:
        begin(w, 1, flow_of(n));
        for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
            copy(w, node(w, p->key));
            copy(w, node(w, p->value));
        }
        end(w, 1);
        return;
    default:
        w->failed = 1;
    }
}

/* A file name from the mission, to be read from the target's directory. */
static void emit_path(writer *w, const yaml_node_t *v)
{
    const char *s = scalar(v);
    if (!s || !w->rewrite_paths || s[0] == '/') {
        copy(w, v);
        return;
    }
    char rel[1024], abs[PATH_MAX];
    sr_yaml_relative_path(rel, sizeof rel, w->m->path, s);
    emit_scalar(w, realpath(rel, abs) ? abs : rel);
}

/* A mapping copied as it is but for the file name under path_key. */
static void emit_map_path(writer *w, const yaml_node_t *map, const char *path_key)
{
    begin(w, 1, flow_of(map));
    for (yaml_node_pair_t *q = map->data.mapping.pairs.start; q < map->data.mapping.pairs.top; q++) {
        copy(w, node(w, q->key));
        if (is_key(node(w, q->key), path_key))
            emit_path(w, node(w, q->value));
        else
            copy(w, node(w, q->value));
    }
    end(w, 1);
}

static int stage_index(const writer *w, const char *name)
{
    for (size_t k = 0; name && k < w->m->nstages; k++)
        if (strcmp(w->m->stages[k].name, name) == 0)
            return (int)k;
    return -1;
}

static int dropped_name(const writer *w, const char *name)
{
    int k = stage_index(w, name);
    return k >= 0 && ((w->e->dropped >> k) & 1u);
}

/* A mapping without the pairs whose key is a dropped stage. */
static void copy_without_dropped(writer *w, const yaml_node_t *n)
{
    if (n->type != YAML_MAPPING_NODE) {
        copy(w, n);
        return;
    }
    begin(w, 1, flow_of(n));
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        if (dropped_name(w, scalar(node(w, p->key))))
            continue;
        copy(w, node(w, p->key));
        copy(w, node(w, p->value));
    }
    end(w, 1);
}

/* Whether a failure case names a dropped stage (in fails: or only:). */
static int names_dropped(const writer *w, const yaml_node_t *fc)
{
    if (fc->type != YAML_MAPPING_NODE)
        return 0;
    for (yaml_node_pair_t *p = fc->data.mapping.pairs.start; p < fc->data.mapping.pairs.top; p++) {
        const yaml_node_t *v = node(w, p->value);
        if (!(is_key(node(w, p->key), "fails") || is_key(node(w, p->key), "only")))
            continue;
        if (v->type == YAML_SCALAR_NODE && dropped_name(w, scalar(v)))
            return 1;
        if (v->type == YAML_SEQUENCE_NODE)
            for (yaml_node_item_t *it = v->data.sequence.items.start; it < v->data.sequence.items.top; it++)
                if (dropped_name(w, scalar(node(w, *it))))
                    return 1;
    }
    return 0;
}

static void emit_number(writer *w, double v, const char *unit)
{
    char buf[64];
    snprintf(buf, sizeof buf, "%.10g %s", v, unit);
    emit_scalar(w, buf);
}

static int is_size_key(const yaml_node_t *k)
{
    return is_key(k, "nominal-diameter") || is_key(k, "projected-diameter") || is_key(k, "flat-diameter") ||
           is_key(k, "nominal-area");
}

static void emit_stage(writer *w, size_t k, const yaml_node_t *n)
{
    const sr_mission_edit_stage *es = &w->e->stage[k];
    const sr_stage *st = &w->m->stages[k];
    int new_family = es->family && strcmp(es->family, st->canopy.fam.id) != 0;
    int new_count = es->count > 0 && es->count != st->canopy.count;
    int size_done = 0, count_done = 0, carries_seen = 0;
    /* a stage before it dropped: its sections are written out, as the default would follow the dropped one */
    int earlier_dropped = (w->e->dropped & ((1u << k) - 1u)) != 0;
    begin(w, 1, flow_of(n));
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        const yaml_node_t *key = node(w, p->key), *val = node(w, p->value);
        if (is_key(key, "family") && es->family) {
            copy(w, key);
            emit_scalar(w, es->family);
            continue;
        }
        if (is_size_key(key) && !isnan(es->d0)) {
            if (!size_done) {
                emit_scalar(w, "nominal-diameter");
                emit_number(w, es->d0, "m");
                size_done = 1;
            }
            continue;
        }
        if (is_key(key, "count") && es->count > 0) {
            copy(w, key);
            char buf[16];
            snprintf(buf, sizeof buf, "%d", es->count);
            emit_scalar(w, buf);
            count_done = 1;
            continue;
        }
        if (is_key(key, "cluster-factor") && new_count)
            continue; /* a factor for another count: the new count takes its default */
        if ((is_key(key, "drag-coefficient") || is_key(key, "measured-opening")) && new_family)
            continue; /* measured on a canopy of another family */
        if (is_key(key, "deploy") && !isnan(es->height)) {
            copy(w, key);
            begin(w, 1, val->type == YAML_MAPPING_NODE && flow_of(val));
            emit_scalar(w, "height");
            emit_number(w, es->height, "m");
            end(w, 1);
            continue;
        }
        if (is_key(key, "canopy")) {
            copy(w, key);
            emit_path(w, val);
            continue;
        }
        carries_seen |= is_key(key, "carries");
        copy(w, key);
        copy(w, val);
    }
    if (!isnan(es->d0) && !size_done) {
        emit_scalar(w, "nominal-diameter");
        emit_number(w, es->d0, "m");
    }
    if (es->count > 1 && !count_done) {
        emit_scalar(w, "count");
        char buf[16];
        snprintf(buf, sizeof buf, "%d", es->count);
        emit_scalar(w, buf);
    }
    if (earlier_dropped && !carries_seen) {
        emit_scalar(w, "carries");
        begin(w, 0, 1);
        for (size_t i = 0; i < w->m->nsections; i++)
            if ((st->carries >> i) & 1u)
                emit_scalar(w, w->m->sections[i].name);
        end(w, 0);
    }
    end(w, 1);
}

/* site: the sounding's file name, the wind table's */
static void emit_site(writer *w, const yaml_node_t *n)
{
    if (n->type != YAML_MAPPING_NODE) {
        copy(w, n);
        return;
    }
    begin(w, 1, flow_of(n));
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        const yaml_node_t *key = node(w, p->key), *val = node(w, p->value);
        copy(w, key);
        if (is_key(key, "sounding")) {
            emit_path(w, val);
        } else if (is_key(key, "wind") && val->type == YAML_MAPPING_NODE) {
            emit_map_path(w, val, "file");
        } else {
            copy(w, val);
        }
    }
    end(w, 1);
}

/* sections: a body's drag table */
static void emit_sections(writer *w, const yaml_node_t *n)
{
    if (n->type != YAML_SEQUENCE_NODE) {
        copy(w, n);
        return;
    }
    begin(w, 0, flow_of(n));
    for (yaml_node_item_t *it = n->data.sequence.items.start; it < n->data.sequence.items.top; it++) {
        const yaml_node_t *s = node(w, *it);
        if (s->type != YAML_MAPPING_NODE) {
            copy(w, s);
            continue;
        }
        begin(w, 1, flow_of(s));
        for (yaml_node_pair_t *p = s->data.mapping.pairs.start; p < s->data.mapping.pairs.top; p++) {
            const yaml_node_t *key = node(w, p->key), *val = node(w, p->value);
            copy(w, key);
            if (is_key(key, "body") && val->type == YAML_MAPPING_NODE) {
                emit_map_path(w, val, "cd-table");
            } else {
                copy(w, val);
            }
        }
        end(w, 1);
    }
    end(w, 0);
}

static void emit_root(writer *w, const yaml_node_t *root)
{
    begin(w, 1, 0);
    for (yaml_node_pair_t *p = root->data.mapping.pairs.start; p < root->data.mapping.pairs.top; p++) {
        const yaml_node_t *key = node(w, p->key), *val = node(w, p->value);
        if (is_key(key, "design") && (!w->e->keep_design || w->e->dropped))
            continue;
        if (is_key(key, "failure-cases") && w->e->dropped && val->type == YAML_SEQUENCE_NODE) {
            size_t kept = 0;
            for (yaml_node_item_t *it = val->data.sequence.items.start; it < val->data.sequence.items.top; it++)
                kept += !names_dropped(w, node(w, *it));
            if (!kept)
                continue;
            copy(w, key);
            begin(w, 0, flow_of(val));
            for (yaml_node_item_t *it = val->data.sequence.items.start; it < val->data.sequence.items.top; it++)
                if (!names_dropped(w, node(w, *it)))
                    copy(w, node(w, *it));
            end(w, 0);
            continue;
        }
        copy(w, key);
        if (is_key(key, "stages") && val->type == YAML_SEQUENCE_NODE) {
            begin(w, 0, flow_of(val));
            size_t k = 0;
            for (yaml_node_item_t *it = val->data.sequence.items.start; it < val->data.sequence.items.top; it++, k++) {
                if ((w->e->dropped >> k) & 1u)
                    continue;
                emit_stage(w, k, node(w, *it));
            }
            end(w, 0);
        } else if (is_key(key, "site")) {
            emit_site(w, val);
        } else if (is_key(key, "sections")) {
            emit_sections(w, val);
        } else if ((is_key(key, "limits") || is_key(key, "uncertainty")) && val->type == YAML_MAPPING_NODE &&
                   w->e->dropped) {
            /* limits.rated-strength and uncertainty.drag may name a dropped stage */
            begin(w, 1, flow_of(val));
            for (yaml_node_pair_t *q = val->data.mapping.pairs.start; q < val->data.mapping.pairs.top; q++) {
                copy(w, node(w, q->key));
                if (is_key(node(w, q->key), "rated-strength") || is_key(node(w, q->key), "drag"))
                    copy_without_dropped(w, node(w, q->value));
                else
                    copy(w, node(w, q->value));
            }
            end(w, 1);
        } else {
            copy(w, val);
        }
    }
    end(w, 1);
}

static int out_handler(void *data, unsigned char *buffer, size_t size)
{
    return fwrite(buffer, 1, size, (FILE *)data) == size;
}

/* The directory part of a path ("" for none). */
static void dir_of(const char *path, char *out, size_t len)
{
    const char *slash = strrchr(path, '/');
    snprintf(out, len, "%.*s", slash ? (int)(slash - path) : 0, path);
}

int sr_mission_write(const sr_mission *m, const sr_yaml *y, const sr_mission_edit *e, char **buf, size_t *len,
                     sr_error *err)
{
    *buf = NULL;
    *len = 0;
    yaml_node_t *root = yaml_document_get_root_node((yaml_document_t *)&y->doc);
    if (!root || root->type != YAML_MAPPING_NODE)
        return sr_error_set(err, SR_EINVAL, "%s: not a mission document", m->path);
    writer w;
    memset(&w, 0, sizeof w);
    w.y = y;
    w.m = m;
    w.e = e;
    if (e->target) {
        char a[1024], b[1024];
        dir_of(m->path, a, sizeof a);
        dir_of(e->target, b, sizeof b);
        w.rewrite_paths = strcmp(a, b) != 0;
    }
    char *text = NULL;
    size_t tlen = 0;
    FILE *f = open_memstream(&text, &tlen);
    if (!f)
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    if (e->header)
        fputs(e->header, f);
    if (!yaml_emitter_initialize(&w.em)) {
        fclose(f);
        free(text);
        return sr_error_set(err, SR_ENOMEM, "out of memory");
    }
    yaml_emitter_set_output(&w.em, out_handler, f);
    yaml_emitter_set_unicode(&w.em, 1);
    yaml_emitter_set_indent(&w.em, 2);
    yaml_emitter_set_width(&w.em, -1); /* long texts stay on their line */
    yaml_event_t ev;
    int ok = yaml_stream_start_event_initialize(&ev, YAML_UTF8_ENCODING);
    emit(&w, &ev, ok);
    ok = yaml_document_start_event_initialize(&ev, NULL, NULL, NULL, 1);
    emit(&w, &ev, ok);
    emit_root(&w, root);
    ok = yaml_document_end_event_initialize(&ev, 1);
    emit(&w, &ev, ok);
    ok = yaml_stream_end_event_initialize(&ev);
    emit(&w, &ev, ok);
    yaml_emitter_delete(&w.em);
    int bad = fclose(f) != 0;
    if (w.failed || bad) {
        free(text);
        return sr_error_set(err, SR_ENOMEM, "%s: cannot write the mission back as YAML", m->path);
    }
    *buf = text;
    *len = tlen;
    return SR_OK;
}
