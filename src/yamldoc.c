/* yamldoc.c - libyaml document loading with size and depth limits, and the
 * strict schema helpers every YAML reader in sinkrate uses. */
#include "yamldoc.h"

#include "fileio.h"

#include <errno.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

int sr_yaml_fail(const sr_yaml *y, const yaml_node_t *n, sr_error *err, const char *fmt, ...)
{
    char msg[SR_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    /* libyaml counts lines and columns from zero */
    if (n)
        return sr_error_set(err, SR_EINVAL, "%s:%zu:%zu: %s", y->name, n->start_mark.line + 1,
                            n->start_mark.column + 1, msg);
    return sr_error_set(err, SR_EINVAL, "%s: %s", y->name, msg);
}

static int depth_ok(yaml_document_t *d, yaml_node_t *n, int depth)
{
    if (depth > SR_YAML_MAX_DEPTH)
        return 0;
    if (n->type == YAML_SEQUENCE_NODE) {
        for (yaml_node_item_t *it = n->data.sequence.items.start; it < n->data.sequence.items.top; it++) {
            yaml_node_t *c = yaml_document_get_node(d, *it);
            if (c && !depth_ok(d, c, depth + 1))
                return 0;
        }
    } else if (n->type == YAML_MAPPING_NODE) {
        for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
            yaml_node_t *k = yaml_document_get_node(d, p->key);
            yaml_node_t *v = yaml_document_get_node(d, p->value);
            if ((k && !depth_ok(d, k, depth + 1)) || (v && !depth_ok(d, v, depth + 1)))
                return 0;
        }
    }
    return 1;
}

int sr_yaml_load_string(sr_yaml *y, const char *name, const char *buf, size_t len, sr_error *err)
{
    memset(y, 0, sizeof *y);
    snprintf(y->name, sizeof y->name, "%s", name);
    if (len > SR_YAML_MAX_BYTES)
        return sr_error_set(err, SR_EINVAL, "%s: larger than 1 MiB; not a sinkrate file", name);
    if (len == 0)
        return sr_error_set(err, SR_EINVAL, "%s:1:1: the file is empty", name);
    if (memchr(buf, '\0', len))
        return sr_error_set(err, SR_EINVAL, "%s: binary data (a NUL byte); not a YAML text file", name);
    /* Refuse deep nesting before libyaml builds it: count the indentation-free
     * flow brackets, the usual vehicle of pathological nesting. */
    int flow = 0, maxflow = 0;
    for (size_t i = 0; i < len; i++) {
        if (buf[i] == '[' || buf[i] == '{')
            flow++;
        else if ((buf[i] == ']' || buf[i] == '}') && flow > 0)
            flow--;
        if (flow > maxflow)
            maxflow = flow;
    }
    if (maxflow > SR_YAML_MAX_DEPTH)
        return sr_error_set(err, SR_EINVAL, "%s: nested more than %d levels deep; not a sinkrate file", name,
                            SR_YAML_MAX_DEPTH);
    yaml_parser_t p;
    if (!yaml_parser_initialize(&p))
        return sr_error_set(err, SR_ENOMEM, "%s: cannot start the YAML parser", name);
    yaml_parser_set_input_string(&p, (const unsigned char *)buf, len);
    if (!yaml_parser_load(&p, &y->doc)) {
        size_t line = p.problem_mark.line + 1, col = p.problem_mark.column + 1;
        if (p.error == YAML_MEMORY_ERROR)
            sr_error_set(err, SR_ENOMEM, "%s: out of memory while reading YAML", name);
        else
            sr_error_set(err, SR_EINVAL, "%s:%zu:%zu: malformed YAML: %s%s%s", name, line, col,
                         p.problem ? p.problem : "syntax error", p.context ? " " : "", p.context ? p.context : "");
        yaml_parser_delete(&p);
        return err ? err->code : SR_EINVAL;
    }
    /* a second document in the same file is a mistake worth reporting */
    yaml_document_t extra;
    int more = 0;
    if (yaml_parser_load(&p, &extra)) {
        more = yaml_document_get_root_node(&extra) != NULL;
        yaml_document_delete(&extra);
    }
    yaml_parser_delete(&p);
    y->loaded = 1;
    yaml_node_t *root = yaml_document_get_root_node(&y->doc);
    if (!root) {
        sr_yaml_free(y);
        return sr_error_set(err, SR_EINVAL, "%s:1:1: the file holds no YAML document", name);
    }
    if (more) {
        sr_yaml_free(y);
        return sr_error_set(err, SR_EINVAL, "%s: more than one YAML document (---); keep one per file", name);
    }
    size_t nodes = (size_t)(y->doc.nodes.top - y->doc.nodes.start);
    if (nodes > SR_YAML_MAX_NODES || !depth_ok(&y->doc, root, 0)) {
        sr_yaml_free(y);
        return sr_error_set(err, SR_EINVAL, "%s: too large or too deeply nested for a sinkrate file", name);
    }
    return SR_OK;
}

int sr_yaml_load_file(sr_yaml *y, const char *path, sr_error *err)
{
    memset(y, 0, sizeof *y);
    char *buf;
    size_t len;
    int rc = sr_file_read(path, SR_YAML_MAX_BYTES, &buf, &len, err);
    if (rc == SR_EINVAL)
        return sr_error_set(err, SR_EINVAL, "%s: larger than 1 MiB; not a sinkrate file", path);
    if (rc)
        return rc;
    rc = sr_yaml_load_string(y, path, buf, len, err);
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
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
        yaml_node_t *k = yaml_document_get_node(d, p->key);
        const char *ks = scalar_of(k);
        if (!ks)
            return sr_yaml_fail(y, k, err, "%s: keys must be plain words", what);
        int known = 0;
        for (const char *const *a = allowed; *a; a++)
            if (strcmp(*a, ks) == 0)
                known = 1;
        if (!known) {
            const char *s = sr_yaml_suggest(ks, allowed);
            char list[400];
            list_words(list, sizeof list, allowed);
            if (s)
                return sr_yaml_fail(y, k, err, "unknown key '%s' in %s; did you mean '%s'?", ks, what, s);
            return sr_yaml_fail(y, k, err, "unknown key '%s' in %s (allowed: %s)", ks, what, list);
        }
        for (yaml_node_pair_t *q = n->data.mapping.pairs.start; q < p; q++) {
            const char *qs = scalar_of(yaml_document_get_node(d, q->key));
            if (qs && strcmp(qs, ks) == 0)
                return sr_yaml_fail(y, k, err, "duplicate key '%s' in %s", ks, what);
        }
    }
    for (const char *const *r = required; r && *r; r++)
        if (!sr_yaml_get(y, n, *r))
            return sr_yaml_fail(y, n, err, "%s is missing the required key '%s'", what, *r);
    return SR_OK;
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

int sr_yaml_string(const sr_yaml *y, yaml_node_t *n, char *buf, size_t len, sr_error *err)
{
    const char *s = scalar_of(n);
    if (!s)
        return sr_yaml_fail(y, n, err, "expected a text value here");
    if (strlen(s) >= len)
        return sr_yaml_fail(y, n, err, "text longer than %zu characters", len - 1);
    if (s[0] == '\0')
        return sr_yaml_fail(y, n, err, "empty text value");
    snprintf(buf, len, "%s", s);
    return SR_OK;
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
    if (d != (double)(long)d || d < (double)lo || d > (double)hi)
        return sr_yaml_fail(y, n, err, "expected a whole number from %ld to %ld, got '%s'", lo, hi,
                            scalar_of(n));
    *v = (long)d;
    return SR_OK;
}

int sr_yaml_quantity(const sr_yaml *y, yaml_node_t *n, sr_quantity q, double *si, sr_error *err)
{
    const char *s = scalar_of(n);
    if (!s)
        return sr_yaml_fail(y, n, err, "expected a %s with a unit here (e.g. \"%s\")", sr_units_quantity_name(q),
                            q == SR_Q_TEMP ? "15 C" : "1.5 m");
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
