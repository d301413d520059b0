/* yamldoc.c - libyaml document loading with size and depth limits, and the
 * strict schema helpers every YAML reader in sinkrate uses. */
#include "files/yamldoc.h"

#include "output/fileio.h"

#include <errno.h>
#include <math.h>
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

/* Depth and size of the tree as the schema code walks it. Aliases are
 * followed, so every use of an anchor counts: a file that repeats one list
 * through nested aliases ("billion laughs") exhausts the budget instead of
 * making this walk, and later ones, exponential. */
static int tree_ok(yaml_document_t *d, yaml_node_t *n, int depth, size_t *budget, yaml_node_t **bad)
{
    if (depth > SR_YAML_MAX_DEPTH || *budget == 0) {
        *bad = n;
        return 0;
    }
    (*budget)--;
    if (n->type == YAML_SEQUENCE_NODE) {
        for (yaml_node_item_t *it = n->data.sequence.items.start; it < n->data.sequence.items.top; it++) {
            yaml_node_t *c = yaml_document_get_node(d, *it);
            if (c && !tree_ok(d, c, depth + 1, budget, bad))
                return 0;
        }
    } else if (n->type == YAML_MAPPING_NODE) {
        for (yaml_node_pair_t *p = n->data.mapping.pairs.start; p < n->data.mapping.pairs.top; p++) {
            yaml_node_t *k = yaml_document_get_node(d, p->key);
            yaml_node_t *v = yaml_document_get_node(d, p->value);
            if ((k && !tree_ok(d, k, depth + 1, budget, bad)) || (v && !tree_ok(d, v, depth + 1, budget, bad)))
                return 0;
        }
    }
    return 1;
}

/* Before libyaml builds anything: a NUL byte, or flow brackets nested deeper
 * than any sinkrate file needs (the usual vehicle of pathological nesting).
 * Reports the 1-based line and column of the offending byte. */
static int prescan(const sr_yaml *y, const char *buf, size_t len, sr_error *err)
{
    size_t line = 1, col = 1;
    int flow = 0;
    for (size_t i = 0; i < len; i++, col++) {
        char ch = buf[i];
        if (ch == '\0')
            return sr_error_set(err, SR_EINVAL, "%s:%zu:%zu: binary data (a NUL byte); not a YAML text file", y->name,
                                line, col);
        if (ch == '\n') {
            line++;
            col = 0;
        } else if (ch == '[' || ch == '{') {
            if (++flow > SR_YAML_MAX_DEPTH)
                return sr_error_set(err, SR_EINVAL, "%s:%zu:%zu: nested more than %d levels deep; not a sinkrate file",
                                    y->name, line, col, SR_YAML_MAX_DEPTH);
        } else if ((ch == ']' || ch == '}') && flow > 0) {
            flow--;
        }
    }
    return SR_OK;
}

int sr_yaml_load_string(sr_yaml *y, const char *name, const char *buf, size_t len, sr_error *err)
{
    memset(y, 0, sizeof *y);
    snprintf(y->name, sizeof y->name, "%s", name);
    if (len > SR_YAML_MAX_BYTES)
        return sr_error_set(err, SR_EINVAL, "%s: larger than 1 MiB; not a sinkrate file", name);
    if (len == 0)
        return sr_error_set(err, SR_EINVAL, "%s:1:1: the file is empty", name);
    int rc = prescan(y, buf, len, err);
    if (rc)
        return rc;
    yaml_parser_t p;
    if (!yaml_parser_initialize(&p))
        return sr_error_set(err, SR_ENOMEM, "%s: cannot start the YAML parser", name);
    yaml_parser_set_input_string(&p, (const unsigned char *)buf, len);
    if (!yaml_parser_load(&p, &y->doc)) {
        size_t line = p.problem_mark.line + 1, col = p.problem_mark.column + 1;
        if (p.error == YAML_READER_ERROR) {
            /* libyaml gives a reader error (bad UTF-8, control bytes) as a byte offset only */
            line = col = 1;
            for (size_t i = 0; i < p.problem_offset && i < len; i++, col++)
                if (buf[i] == '\n') {
                    line++;
                    col = 0;
                }
        }
        if (p.error == YAML_MEMORY_ERROR)
            sr_error_set(err, SR_ENOMEM, "%s: out of memory while reading YAML", name);
        else
            sr_error_set(err, SR_EINVAL, "%s:%zu:%zu: malformed YAML: %s%s%s", name, line, col,
                         p.problem ? p.problem : "syntax error", p.context ? " " : "", p.context ? p.context : "");
        yaml_parser_delete(&p);
        return err ? err->code : SR_EINVAL;
    }
    /* a second document in the same file is a mistake worth reporting, and
     * a malformed one must not pass unseen */
    yaml_document_t extra;
    int more = 0;
    size_t more_line = 0, more_col = 0;
    if (yaml_parser_load(&p, &extra)) {
        more = yaml_document_get_root_node(&extra) != NULL;
        more_line = extra.start_mark.line + 1;
        more_col = extra.start_mark.column + 1;
        yaml_document_delete(&extra);
    } else {
        more = 1;
        more_line = p.problem_mark.line + 1;
        more_col = p.problem_mark.column + 1;
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
        return sr_error_set(err, SR_EINVAL, "%s:%zu:%zu: more than one YAML document (---); keep one per file", name,
                            more_line, more_col);
    }
    size_t nodes = (size_t)(y->doc.nodes.top - y->doc.nodes.start), budget = SR_YAML_MAX_NODES;
    yaml_node_t *bad = root;
    if (nodes > SR_YAML_MAX_NODES || !tree_ok(&y->doc, root, 0, &budget, &bad)) {
        size_t line = bad->start_mark.line + 1, col = bad->start_mark.column + 1;
        sr_yaml_free(y);
        return sr_error_set(err, SR_EINVAL,
                            "%s:%zu:%zu: too large or too deeply nested for a sinkrate file (aliases count at "
                            "every use)",
                            name, line, col);
    }
    return SR_OK;
}

int sr_yaml_load_file(sr_yaml *y, const char *path, sr_error *err)
{
    memset(y, 0, sizeof *y);
    FILE *f;
    int rc = sr_file_open_read(path, &f, err);
    if (rc)
        return rc;
    char *buf = malloc(SR_YAML_MAX_BYTES + 1);
    if (!buf) {
        fclose(f);
        return sr_error_set(err, SR_ENOMEM, "%s: out of memory", path);
    }
    size_t len = fread(buf, 1, SR_YAML_MAX_BYTES + 1, f);
    int bad = ferror(f), bad_errno = errno;
    fclose(f);
    if (bad) {
        free(buf);
        return sr_error_set(err, SR_EIO, "%s: read error: %s", path, strerror(bad_errno));
    }
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
