/* yamldoc.c - libyaml document loading with size and depth limits, and the
 * strict schema helpers every YAML reader in sinkrate uses. */
#include "files/yamldoc.h"

#include "base/fileread.h"

#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* The node holding n (a mapping or sequence), or NULL for the root. A scan
 * of the document: libyaml keeps no parent links, and this runs only when a
 * message is made. */
static const yaml_node_t *parent_of(const sr_yaml *y, const yaml_node_t *n)
{
    yaml_document_t *d = (yaml_document_t *)&y->doc;
    int id = (int)(n - d->nodes.start) + 1;
    for (yaml_node_t *p = d->nodes.start; p < d->nodes.top; p++) {
        if (p->type == YAML_MAPPING_NODE) {
            for (yaml_node_pair_t *q = p->data.mapping.pairs.start; q < p->data.mapping.pairs.top; q++)
                if (q->key == id || q->value == id)
                    return p;
        } else if (p->type == YAML_SEQUENCE_NODE) {
            for (yaml_node_item_t *q = p->data.sequence.items.start; q < p->data.sequence.items.top; q++)
                if (*q == id)
                    return p;
        }
    }
    return NULL;
}

/* The key an error at node n is about: n itself when it is a key, the key
 * it is the value of, or for an item of a list the key of the list. */
static void key_of(const sr_yaml *y, const yaml_node_t *n, char *buf, size_t len)
{
    buf[0] = '\0';
    yaml_document_t *d = (yaml_document_t *)&y->doc;
    if (!y->loaded || !n || n < d->nodes.start || n >= d->nodes.top)
        return;
    for (int depth = 0; n && depth < 64; depth++) {
        const yaml_node_t *p = parent_of(y, n);
        if (!p)
            return;
        if (p->type == YAML_MAPPING_NODE) {
            int id = (int)(n - d->nodes.start) + 1;
            for (yaml_node_pair_t *q = p->data.mapping.pairs.start; q < p->data.mapping.pairs.top; q++) {
                yaml_node_t *k = yaml_document_get_node(d, q->key);
                if ((q->key == id || q->value == id) && k && k->type == YAML_SCALAR_NODE) {
                    snprintf(buf, len, "%s", (const char *)k->data.scalar.value);
                    return;
                }
            }
            return;
        }
        n = p; /* an item of a list: the list's key */
    }
}

int sr_yaml_fail(const sr_yaml *y, const yaml_node_t *n, sr_error *err, const char *fmt, ...)
{
    char msg[SR_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    sr_error local;
    if (!err)
        err = &local;
    /* libyaml counts lines and columns from zero */
    if (n)
        sr_error_set_at(err, SR_EINVAL, y->name, n->start_mark.line + 1, n->start_mark.column + 1, "%s", msg);
    else
        sr_error_set_at(err, SR_EINVAL, y->name, 0, 0, "%s", msg);
    key_of(y, n, err->key, sizeof err->key);
    sr_yaml_keep(y, err);
    return SR_EINVAL;
}

void sr_yaml_keep(const sr_yaml *y, const sr_error *err)
{
    sr_yaml_errors *l = y ? y->errors : NULL;
    if (!l || !err || !err->msg[0])
        return;
    for (size_t i = 0; i < l->n; i++)
        if (strcmp(l->msg[i], err->msg) == 0)
            return;
    if (l->n < SR_YAML_MAX_ERRORS) {
        int here = strcmp(err->file, y->name) == 0;
        l->line[l->n] = here ? err->line : 0;
        l->column[l->n] = here ? err->column : 0;
        snprintf(l->msg[l->n++], sizeof l->msg[0], "%s", err->msg);
    }
    else
        l->more++;
}

int sr_yaml_go_on(const sr_yaml *y, const sr_error *err, int rc, int *acc)
{
    if (rc == SR_OK)
        return 1;
    if (!y->errors || rc == SR_ENOMEM)
        return 0;
    sr_yaml_keep(y, err);
    if (!*acc)
        *acc = rc;
    return 1;
}

/* Where libyaml stops at a tab: the tab's column on that line, 0 when the
 * line has none before the place libyaml names. */
static size_t tab_column(const char *buf, size_t len, size_t line, size_t upto)
{
    size_t l = 1, i = 0;
    while (i < len && l < line)
        if (buf[i++] == '\n')
            l++;
    for (size_t c = 1; i < len && buf[i] != '\n' && c <= upto + 1; i++, c++)
        if (buf[i] == '\t')
            return c;
    return 0;
}

/* Before libyaml reads anything: a NUL byte means binary data. */
static int prescan(const sr_yaml *y, const char *buf, size_t len, sr_error *err)
{
    const char *nul = memchr(buf, '\0', len);
    if (!nul)
        return SR_OK;
    size_t line = 1, col = 1;
    for (const char *p = buf; p < nul; p++, col++)
        if (*p == '\n') {
            line++;
            col = 0;
        }
    return sr_error_set_at(err, SR_EINVAL, y->name, line, col, "binary data (a NUL byte); not a YAML text file");
}

/* The document is built here from libyaml's events rather than by
 * yaml_parser_load, for three limits the loader lacks: nesting is counted on
 * the collections themselves (never on brackets inside strings or comments);
 * an alias is a copy of its anchor's nodes that counts against the node
 * budget at every use, and its nodes carry the position of the use, so an
 * error in an anchored value is reported where it is used; and anchors are
 * few (SR_YAML_MAX_ANCHORS), so finding one is cheap, where the loader's
 * search costs anchors x aliases (minutes for a crafted 1 MiB file). */
typedef struct anchor {
    char *name;
    int node;
} anchor;

typedef struct frame {
    int node;
    int key; /* a mapping's key waiting for its value, 0 for none */
} frame;

typedef struct builder {
    sr_yaml *y;
    frame stack[SR_YAML_MAX_DEPTH + 2];
    int depth;
    anchor *anchors;
    size_t nanchors, cap;
    size_t nodes;
    sr_error *err;
} builder;

static int fail_at(builder *b, yaml_mark_t m, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;
static int fail_at(builder *b, yaml_mark_t m, const char *fmt, ...)
{
    char msg[SR_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    return sr_error_set_at(b->err, SR_EINVAL, b->y->name, m.line + 1, m.column + 1, "%s", msg);
}

static int too_deep(builder *b, yaml_mark_t m)
{
    return fail_at(b, m, "nested more than %d levels deep: too deeply nested for a sinkrate file", SR_YAML_MAX_DEPTH);
}

static int count_node(builder *b, yaml_mark_t m)
{
    if (++b->nodes > SR_YAML_MAX_NODES)
        return fail_at(b, m, "too large or too deeply nested for a sinkrate file (more than %d values; aliases count "
                             "at every use)",
                       SR_YAML_MAX_NODES);
    return SR_OK;
}

/* Hang a finished node on the collection open above it. */
static int attach(builder *b, int node, yaml_mark_t m)
{
    if (b->depth == 0)
        return SR_OK; /* the root */
    frame *f = &b->stack[b->depth - 1];
    yaml_node_t *parent = yaml_document_get_node(&b->y->doc, f->node);
    int ok;
    if (parent->type == YAML_SEQUENCE_NODE) {
        ok = yaml_document_append_sequence_item(&b->y->doc, f->node, node);
    } else if (!f->key) {
        f->key = node;
        ok = 1;
    } else {
        ok = yaml_document_append_mapping_pair(&b->y->doc, f->node, f->key, node);
        f->key = 0;
    }
    if (!ok)
        return sr_error_set_at(b->err, SR_ENOMEM, b->y->name, 0, 0, "out of memory while reading YAML");
    (void)m;
    return SR_OK;
}

static int add_anchor(builder *b, const yaml_char_t *name, int node, yaml_mark_t m)
{
    if (!name)
        return SR_OK;
    if (b->nanchors >= SR_YAML_MAX_ANCHORS)
        return fail_at(b, m, "more than %d anchors (&name); a sinkrate file needs few", SR_YAML_MAX_ANCHORS);
    if (b->nanchors == b->cap) {
        size_t cap = b->cap ? 2 * b->cap : 16;
        anchor *n = realloc(b->anchors, cap * sizeof *n);
        if (!n)
            return SR_ENOMEM;
        b->anchors = n;
        b->cap = cap;
    }
    b->anchors[b->nanchors].name = strdup((const char *)name);
    b->anchors[b->nanchors].node = node;
    return b->anchors[b->nanchors++].name ? SR_OK : SR_ENOMEM;
}

/* A copy of node src (and all below it) at the position of an alias;
 * *out receives the new node's index. depth: the level the copy starts at. */
static int copy_node(builder *b, int src, yaml_mark_t m, int depth, int *out)
{
    if (depth > SR_YAML_MAX_DEPTH)
        return too_deep(b, m);
    int rc = count_node(b, m);
    if (rc)
        return rc;
    yaml_document_t *d = &b->y->doc;
    /* adding a node may move the node array: n is not used after an add */
    yaml_node_t *n = yaml_document_get_node(d, src);
    int idx = 0;
    if (n->type == YAML_SCALAR_NODE) {
        idx = yaml_document_add_scalar(d, n->tag, n->data.scalar.value, (int)n->data.scalar.length,
                                       n->data.scalar.style);
    } else if (n->type == YAML_SEQUENCE_NODE) {
        size_t items = (size_t)(n->data.sequence.items.top - n->data.sequence.items.start);
        idx = yaml_document_add_sequence(d, n->tag, n->data.sequence.style);
        for (size_t i = 0; idx && !rc && i < items; i++) {
            int c;
            /* the array may move as nodes are added: look the item up again */
            int item = yaml_document_get_node(d, src)->data.sequence.items.start[i];
            if (!(rc = copy_node(b, item, m, depth + 1, &c)) && !yaml_document_append_sequence_item(d, idx, c))
                rc = SR_ENOMEM;
        }
    } else {
        size_t pairs = (size_t)(n->data.mapping.pairs.top - n->data.mapping.pairs.start);
        idx = yaml_document_add_mapping(d, n->tag, n->data.mapping.style);
        for (size_t i = 0; idx && !rc && i < pairs; i++) {
            yaml_node_pair_t pr = yaml_document_get_node(d, src)->data.mapping.pairs.start[i];
            int k, v;
            if (!(rc = copy_node(b, pr.key, m, depth + 1, &k)) && !(rc = copy_node(b, pr.value, m, depth + 1, &v)) &&
                !yaml_document_append_mapping_pair(d, idx, k, v))
                rc = SR_ENOMEM;
        }
    }
    if (!idx && !rc)
        rc = SR_ENOMEM;
    if (rc == SR_ENOMEM)
        return sr_error_set_at(b->err, SR_ENOMEM, b->y->name, 0, 0, "out of memory while reading YAML");
    if (rc)
        return rc;
    n = yaml_document_get_node(d, idx);
    n->start_mark = n->end_mark = m;
    *out = idx;
    return SR_OK;
}

/* One event: a node made and hung in place, a collection opened or closed. */
static int on_event(builder *b, yaml_event_t *ev)
{
    yaml_document_t *d = &b->y->doc;
    yaml_mark_t m = ev->start_mark;
    int idx = 0, rc;
    switch (ev->type) {
    case YAML_SCALAR_EVENT: {
        const char *v = (const char *)ev->data.scalar.value;
        if (memchr(v, '\0', ev->data.scalar.length))
            return fail_at(b, m, "a NUL character (\\0) in a text or key; sinkrate files hold plain text");
        if ((rc = count_node(b, m)))
            return rc;
        idx = yaml_document_add_scalar(d, ev->data.scalar.tag, ev->data.scalar.value, (int)ev->data.scalar.length,
                                       ev->data.scalar.style);
        if (!idx)
            return SR_ENOMEM;
        yaml_document_get_node(d, idx)->start_mark = m;
        yaml_document_get_node(d, idx)->end_mark = ev->end_mark;
        if ((rc = add_anchor(b, ev->data.scalar.anchor, idx, m)))
            return rc;
        return attach(b, idx, m);
    }
    case YAML_SEQUENCE_START_EVENT:
    case YAML_MAPPING_START_EVENT: {
        if (b->depth >= SR_YAML_MAX_DEPTH)
            return too_deep(b, m);
        if ((rc = count_node(b, m)))
            return rc;
        int seq = ev->type == YAML_SEQUENCE_START_EVENT;
        idx = seq ? yaml_document_add_sequence(d, ev->data.sequence_start.tag, ev->data.sequence_start.style)
                  : yaml_document_add_mapping(d, ev->data.mapping_start.tag, ev->data.mapping_start.style);
        if (!idx)
            return SR_ENOMEM;
        yaml_document_get_node(d, idx)->start_mark = m;
        b->stack[b->depth].node = idx;
        b->stack[b->depth].key = 0;
        b->depth++;
        /* the anchor names the collection once it is complete: an alias inside it is undefined */
        return SR_OK;
    }
    case YAML_SEQUENCE_END_EVENT:
    case YAML_MAPPING_END_EVENT: {
        frame f = b->stack[--b->depth];
        yaml_node_t *n = yaml_document_get_node(d, f.node);
        n->end_mark = ev->end_mark;
        return attach(b, f.node, m);
    }
    case YAML_ALIAS_EVENT: {
        const char *name = (const char *)ev->data.alias.anchor;
        /* the newest anchor of that name counts (YAML lets a name be reused) */
        int src = 0;
        for (size_t i = b->nanchors; i-- > 0 && !src;)
            if (strcmp(b->anchors[i].name, name) == 0)
                src = b->anchors[i].node;
        if (!src)
            return fail_at(b, m, "the alias *%s names no anchor (&%s) defined before it", name, name);
        if ((rc = copy_node(b, src, m, b->depth, &idx)))
            return rc;
        return attach(b, idx, m);
    }
    default:
        return SR_OK;
    }
}

/* Anchors on collections are known only when the collection closes; the
 * events keep them, so they are recorded here, by start position. */
typedef struct pending_anchor {
    char *name;
    int depth;
} pending_anchor;

static int build(builder *b, yaml_parser_t *p, const char *buf, size_t len)
{
    pending_anchor open[SR_YAML_MAX_DEPTH + 2];
    int docs = 0, rc = SR_OK;
    for (;;) {
        yaml_event_t ev;
        if (!yaml_parser_parse(p, &ev)) {
            size_t line = p->problem_mark.line + 1, col = p->problem_mark.column + 1;
            if (p->error == YAML_READER_ERROR) {
                /* libyaml gives a reader error (bad UTF-8, control bytes) as a byte offset only */
                line = col = 1;
                for (size_t i = 0; i < p->problem_offset && i < len; i++, col++)
                    if (buf[i] == '\n') {
                        line++;
                        col = 0;
                    }
            }
            size_t tab = p->error == YAML_MEMORY_ERROR ? 0 : tab_column(buf, len, line, col);
            if (p->error == YAML_MEMORY_ERROR)
                rc = sr_error_set_at(b->err, SR_ENOMEM, b->y->name, 0, 0, "out of memory while reading YAML");
            else if (tab)
                rc = sr_error_set_at(b->err, SR_EINVAL, b->y->name, line, tab,
                                     "a tab character: YAML indents with spaces, never tabs (replace it with spaces)");
            else
                rc = sr_error_set_at(b->err, SR_EINVAL, b->y->name, line, col, "malformed YAML: %s%s%s",
                                     p->problem ? p->problem : "syntax error", p->context ? " " : "",
                                     p->context ? p->context : "");
            break;
        }
        yaml_event_type_t type = ev.type;
        if (type == YAML_DOCUMENT_START_EVENT) {
            /* a second document in the same file is a mistake worth reporting */
            if (++docs > 1)
                rc = fail_at(b, ev.start_mark, "more than one YAML document (---); keep one per file");
            else if (!yaml_document_initialize(&b->y->doc, NULL, NULL, NULL, 1, 1))
                rc = SR_ENOMEM;
            else
                b->y->loaded = 1;
        } else {
            int depth_before = b->depth;
            const yaml_char_t *anchor_name = type == YAML_SEQUENCE_START_EVENT ? ev.data.sequence_start.anchor
                                             : type == YAML_MAPPING_START_EVENT ? ev.data.mapping_start.anchor
                                                                                : NULL;
            rc = on_event(b, &ev);
            if (!rc && (type == YAML_SEQUENCE_START_EVENT || type == YAML_MAPPING_START_EVENT)) {
                open[depth_before].name = anchor_name ? strdup((const char *)anchor_name) : NULL;
                open[depth_before].depth = depth_before;
                if (anchor_name && !open[depth_before].name)
                    rc = SR_ENOMEM;
            } else if (!rc && (type == YAML_SEQUENCE_END_EVENT || type == YAML_MAPPING_END_EVENT)) {
                char *name = open[b->depth].name;
                open[b->depth].name = NULL;
                if (name)
                    rc = add_anchor(b, (const yaml_char_t *)name, b->stack[b->depth].node, ev.start_mark);
                free(name);
            }
        }
        yaml_event_delete(&ev);
        if (rc == SR_ENOMEM)
            rc = sr_error_set_at(b->err, SR_ENOMEM, b->y->name, 0, 0, "out of memory while reading YAML");
        if (rc || type == YAML_STREAM_END_EVENT)
            break;
    }
    /* anchors of collections left open by an error */
    for (int i = 0; i < b->depth; i++)
        free(open[i].name);
    return rc;
}

/* Lines indented with a tab, each kept in the list (after libyaml has
 * stopped at one: the rest of the file cannot be read, but every such line
 * can be named at once). */
static void keep_tab_lines(sr_yaml *y, const char *buf, size_t len)
{
    size_t line = 1;
    for (size_t i = 0; i < len; line++) {
        size_t c = 1;
        int tab = 0;
        while (i < len && (buf[i] == ' ' || buf[i] == '\t')) {
            if (buf[i] == '\t' && !tab)
                tab = (int)c;
            i++;
            c++;
        }
        if (tab && i < len && buf[i] != '\n' && buf[i] != '#') {
            sr_error e;
            sr_error_set_at(&e, SR_EINVAL, y->name, line, (size_t)tab,
                            "a tab character: YAML indents with spaces, never tabs (replace it with spaces)");
            sr_yaml_keep(y, &e);
        }
        while (i < len && buf[i] != '\n')
            i++;
        i++;
    }
}

static int load_string(sr_yaml *y, const char *name, const char *buf, size_t len, sr_yaml_errors *list,
                       sr_error *err);

int sr_yaml_load_string(sr_yaml *y, const char *name, const char *buf, size_t len, sr_error *err)
{
    return load_string(y, name, buf, len, NULL, err);
}

static int load_string(sr_yaml *y, const char *name, const char *buf, size_t len, sr_yaml_errors *list,
                       sr_error *err)
{
    memset(y, 0, sizeof *y);
    y->errors = list;
    snprintf(y->name, sizeof y->name, "%s", name);
    if (len > SR_YAML_MAX_BYTES)
        return sr_error_set_at(err, SR_EINVAL, name, 0, 0, "larger than 1 MiB; not a sinkrate file");
    if (len == 0)
        return sr_error_set_at(err, SR_EINVAL, name, 1, 1, "the file is empty");
    int rc = prescan(y, buf, len, err);
    if (rc)
        return rc;
    yaml_parser_t p;
    if (!yaml_parser_initialize(&p))
        return sr_error_set_at(err, SR_ENOMEM, name, 0, 0, "cannot start the YAML parser");
    yaml_parser_set_input_string(&p, (const unsigned char *)buf, len);
    builder b;
    memset(&b, 0, sizeof b);
    b.y = y;
    b.err = err;
    rc = build(&b, &p, buf, len);
    yaml_parser_delete(&p);
    for (size_t i = 0; i < b.nanchors; i++)
        free(b.anchors[i].name);
    free(b.anchors);
    if (rc) {
        sr_yaml_keep(y, err);
        if (strstr(err->msg, "a tab character"))
            keep_tab_lines(y, buf, len);
        sr_yaml_free(y);
        return rc;
    }
    if (!sr_yaml_root(y)) {
        sr_yaml_free(y);
        return sr_error_set_at(err, SR_EINVAL, name, 1, 1, "the file holds no YAML document");
    }
    return SR_OK;
}

int sr_yaml_load_file(sr_yaml *y, const char *path, sr_error *err)
{
    return sr_yaml_load_file_all(y, path, NULL, err);
}

int sr_yaml_load_file_all(sr_yaml *y, const char *path, sr_yaml_errors *list, sr_error *err)
{
    memset(y, 0, sizeof *y);
    y->errors = list;
    FILE *f;
    int rc = sr_file_open_read(path, &f, err);
    if (rc)
        return rc;
    char *buf = malloc(SR_YAML_MAX_BYTES + 1);
    if (!buf) {
        fclose(f);
        return sr_error_set_at(err, SR_ENOMEM, path, 0, 0, "out of memory");
    }
    size_t len = fread(buf, 1, SR_YAML_MAX_BYTES + 1, f);
    int bad = ferror(f), bad_errno = errno;
    fclose(f);
    if (bad) {
        free(buf);
        return sr_error_set_at(err, SR_EIO, path, 0, 0, "read error: %s", strerror(bad_errno));
    }
    rc = load_string(y, path, buf, len, list, err);
    free(buf);
    return rc;
}

void sr_yaml_free(sr_yaml *y)
{
    if (y && y->loaded) {
        yaml_document_delete(&y->doc);
        y->loaded = 0;
    }
}

yaml_node_t *sr_yaml_root(sr_yaml *y)
{
    return y->loaded ? yaml_document_get_root_node(&y->doc) : NULL;
}

static const char *scalar_of(const yaml_node_t *n)
{
    return n && n->type == YAML_SCALAR_NODE ? (const char *)n->data.scalar.value : NULL;
}

/* Damerau-Levenshtein (optimal string alignment) distance. */
static size_t edit_distance(const char *a, const char *b)
{
    size_t la = strlen(a), lb = strlen(b);
    if (la > 63 || lb > 63)
        return 99;
    size_t d[64][64];
    for (size_t i = 0; i <= la; i++)
        d[i][0] = i;
    for (size_t j = 0; j <= lb; j++)
        d[0][j] = j;
    for (size_t i = 1; i <= la; i++)
        for (size_t j = 1; j <= lb; j++) {
            size_t c = d[i - 1][j - 1] + (a[i - 1] != b[j - 1]);
            if (d[i - 1][j] + 1 < c)
                c = d[i - 1][j] + 1;
            if (d[i][j - 1] + 1 < c)
                c = d[i][j - 1] + 1;
            /* a swapped pair of letters is one typo, not two */
            if (i > 1 && j > 1 && a[i - 1] == b[j - 2] && a[i - 2] == b[j - 1] && d[i - 2][j - 2] + 1 < c)
                c = d[i - 2][j - 2] + 1;
            d[i][j] = c;
        }
    return d[la][lb];
}

const char *sr_yaml_suggest(const char *word, const char *const *candidates)
{
    const char *best = NULL;
    size_t bd = 99;
    for (const char *const *c = candidates; c && *c; c++) {
        size_t d = edit_distance(word, *c);
        if (d < bd) {
            bd = d;
            best = *c;
        }
    }
    size_t lim = strlen(word) <= 4 ? 1 : strlen(word) <= 8 ? 2 : 3;
    return bd <= lim ? best : NULL;
}

static void list_words(char *buf, size_t len, const char *const *words)
{
    buf[0] = '\0';
    for (const char *const *w = words; w && *w; w++) {
        if (w != words)
            strncat(buf, ", ", len - strlen(buf) - 1);
        strncat(buf, *w, len - strlen(buf) - 1);
    }
}

int sr_yaml_check_map(const sr_yaml *y, yaml_node_t *n, const char *what, const char *const *allowed,
                      const char *const *required, sr_error *err)
{
    if (!n || n->type != YAML_MAPPING_NODE)
        return sr_yaml_fail(y, n, err, "%s must be a mapping of keys to values", what);
    yaml_document_t *d = (yaml_document_t *)&y->doc;
    int acc = SR_OK; /* with a list: every unknown, repeated and missing key */
    const char *suggested[32]; /* a misspelt key is not also a missing one */
    size_t nsug = 0;
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        yaml_node_t *k = yaml_document_get_node(d, p->key);
        const char *ks = scalar_of(k);
        int rc = SR_OK;
        if (!ks) {
            rc = sr_yaml_fail(y, k, err, "%s: keys must be plain words", what);
            if (!sr_yaml_go_on(y, err, rc, &acc))
                return rc;
            continue;
        }
        int known = 0;
        for (const char *const *a = allowed; *a; a++)
            if (strcmp(*a, ks) == 0)
                known = 1;
        if (!known) {
            const char *s = sr_yaml_suggest(ks, allowed);
            char list[400];
            list_words(list, sizeof list, allowed);
            if (s && nsug < sizeof suggested / sizeof suggested[0])
                suggested[nsug++] = s;
            if (s)
                rc = sr_yaml_fail(y, k, err, "unknown key '%s' in %s; did you mean '%s'?", ks, what, s);
            else
                rc = sr_yaml_fail(y, k, err, "unknown key '%s' in %s (allowed: %s)", ks, what, list);
        }
        for (yaml_node_pair_t *q = n->data.mapping.pairs.start; q < p && !rc; q++) {
            const char *qs = scalar_of(yaml_document_get_node(d, q->key));
            if (qs && strcmp(qs, ks) == 0)
                rc = sr_yaml_fail(y, k, err, "duplicate key '%s' in %s", ks, what);
        }
        if (!sr_yaml_go_on(y, err, rc, &acc))
            return rc;
    }
    for (const char *const *r = required; r && *r; r++) {
        int misspelt = 0;
        for (size_t k = 0; k < nsug; k++)
            misspelt |= strcmp(suggested[k], *r) == 0;
        if (!sr_yaml_get(y, n, *r) && !misspelt) {
            int rc = sr_yaml_fail(y, n, err, "%s is missing the required key '%s'", what, *r);
            if (!sr_yaml_go_on(y, err, rc, &acc))
                return rc;
        }
    }
    return acc;
}

yaml_node_t *sr_yaml_key_node(const sr_yaml *y, yaml_node_t *n, const char *key)
{
    if (!n || n->type != YAML_MAPPING_NODE)
        return NULL;
    yaml_document_t *d = (yaml_document_t *)&y->doc;
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        yaml_node_t *k = yaml_document_get_node(d, p->key);
        const char *ks = scalar_of(k);
        if (ks && strcmp(ks, key) == 0)
            return k;
    }
    return NULL;
}

yaml_node_t *sr_yaml_get(const sr_yaml *y, yaml_node_t *n, const char *key)
{
    if (!n || n->type != YAML_MAPPING_NODE)
        return NULL;
    yaml_document_t *d = (yaml_document_t *)&y->doc;
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        const char *ks = scalar_of(yaml_document_get_node(d, p->key));
        if (ks && strcmp(ks, key) == 0)
            return yaml_document_get_node(d, p->value);
    }
    return NULL;
}

/* The first control character of s (C0, DEL, or C1 as UTF-8 C2 80..9F),
 * or NULL; *len receives its length in bytes. */
static const char *control_char(const char *s, size_t *len)
{
    for (const unsigned char *p = (const unsigned char *)s; *p; p++) {
        if (*p < 0x20 || *p == 0x7f) {
            *len = 1;
            return (const char *)p;
        }
        if (p[0] == 0xc2 && p[1] >= 0x80 && p[1] <= 0x9f) {
            *len = 2;
            return (const char *)p;
        }
    }
    return NULL;
}

static void describe_control(const char *c, size_t len, char *buf, size_t blen)
{
    unsigned v = len == 2 ? (unsigned char)c[1] : (unsigned char)c[0];
    const char *name = v == '\n' ? "a line break" : v == '\r' ? "a carriage return" : v == '\t' ? "a tab"
                     : v == 0x1b ? "an escape (ESC)" : v == '\b' ? "a backspace" : v == 0x07 ? "a bell" : NULL;
    if (name)
        snprintf(buf, blen, "%s, U+%04X", name, v);
    else
        snprintf(buf, blen, "U+%04X", v);
}

static int text_value(const sr_yaml *y, yaml_node_t *n, char *buf, size_t len, int free_text, sr_error *err)
{
    const char *s = scalar_of(n);
    if (!s)
        return sr_yaml_fail(y, n, err, "expected a text value here");
    if (strlen(s) >= len)
        return sr_yaml_fail(y, n, err, "text longer than %zu characters", len - 1);
    snprintf(buf, len, "%s", s);
    if (free_text) {
        /* a folded or literal block: its line breaks and tabs read as spaces */
        for (char *p = buf; *p; p++)
            if (*p == '\n' || *p == '\r' || *p == '\t')
                *p = ' ';
        size_t l = strlen(buf);
        while (l > 0 && buf[l - 1] == ' ')
            buf[--l] = '\0';
    }
    size_t cl;
    const char *c = control_char(buf, &cl);
    if (c) {
        /* names reach reports, tables and terminals: a terminal escape or a
         * line break there would rewrite or break what a reader sees */
        char what[64];
        describe_control(c, cl, what, sizeof what);
        return sr_yaml_fail(y, n, err, "a control character (%s) in the text; write it as plain printable text",
                            what);
    }
    if (buf[0] == '\0')
        return sr_yaml_fail(y, n, err, "empty text value");
    return SR_OK;
}

int sr_yaml_string(const sr_yaml *y, yaml_node_t *n, char *buf, size_t len, sr_error *err)
{
    return text_value(y, n, buf, len, 0, err);
}

int sr_yaml_text(const sr_yaml *y, yaml_node_t *n, char *buf, size_t len, sr_error *err)
{
    return text_value(y, n, buf, len, 1, err);
}

int sr_yaml_number(const sr_yaml *y, yaml_node_t *n, double *v, sr_error *err)
{
    const char *s = scalar_of(n);
    if (!s)
        return sr_yaml_fail(y, n, err, "expected a number here");
    sr_error e;
    if (sr_units_parse(s, SR_Q_NONE, v, &e) != SR_OK)
        return sr_yaml_fail(y, n, err, "%s", e.msg);
    return SR_OK;
}

int sr_yaml_int(const sr_yaml *y, yaml_node_t *n, long lo, long hi, long *v, sr_error *err)
{
    double d;
    int rc = sr_yaml_number(y, n, &d, err);
    if (rc)
        return rc;
    /* range first: converting a double beyond long's range is undefined */
    if (!(d >= (double)lo && d <= (double)hi) || d != floor(d))
        return sr_yaml_fail(y, n, err, "expected a whole number from %ld to %ld, got '%s'", lo, hi,
                            scalar_of(n));
    *v = (long)d;
    return SR_OK;
}

int sr_yaml_bool(const sr_yaml *y, yaml_node_t *n, int *v, sr_error *err)
{
    const char *s = scalar_of(n);
    if (s && strcmp(s, "true") == 0)
        *v = 1;
    else if (s && strcmp(s, "false") == 0)
        *v = 0;
    else
        return sr_yaml_fail(y, n, err, "expected true or false, got '%s'", s ? s : "a mapping or list");
    return SR_OK;
}

int sr_yaml_quantity(const sr_yaml *y, yaml_node_t *n, sr_quantity q, double *si, sr_error *err)
{
    const char *s = scalar_of(n);
    if (!s)
        return sr_yaml_fail(y, n, err, "expected a %s with a unit here (e.g. \"%s %s\")", sr_units_quantity_name(q),
                            q == SR_Q_TEMP || q == SR_Q_TEMP_DIFF ? "15" : "1.5",
                            q == SR_Q_TEMP || q == SR_Q_TEMP_DIFF ? "C" : sr_units_label(q, SR_UNITS_SI));
    sr_error e;
    if (sr_units_parse_strict(s, q, si, &e) != SR_OK)
        return sr_yaml_fail(y, n, err, "%s", e.msg);
    return SR_OK;
}

size_t sr_yaml_seq_len(const yaml_node_t *n)
{
    if (!n || n->type != YAML_SEQUENCE_NODE)
        return 0;
    return (size_t)(n->data.sequence.items.top - n->data.sequence.items.start);
}

yaml_node_t *sr_yaml_seq_at(const sr_yaml *y, yaml_node_t *n, size_t i)
{
    if (i >= sr_yaml_seq_len(n))
        return NULL;
    return yaml_document_get_node((yaml_document_t *)&y->doc, n->data.sequence.items.start[i]);
}

int sr_yaml_require_seq(const sr_yaml *y, yaml_node_t *n, const char *what, size_t min, size_t max, sr_error *err)
{
    if (!n || n->type != YAML_SEQUENCE_NODE)
        return sr_yaml_fail(y, n, err, "%s must be a list (items starting with '- ')", what);
    size_t len = sr_yaml_seq_len(n);
    if (len < min || len > max)
        return sr_yaml_fail(y, n, err, "%s must have %zu to %zu items, it has %zu", what, min, max, len);
    return SR_OK;
}

void sr_yaml_relative_path(char *out, size_t len, const char *base, const char *file)
{
    if (file[0] == '/') {
        snprintf(out, len, "%s", file);
        return;
    }
    const char *slash = strrchr(base, '/');
    if (!slash) {
        snprintf(out, len, "%s", file);
        return;
    }
    snprintf(out, len, "%.*s/%s", (int)(slash - base), base, file);
}
