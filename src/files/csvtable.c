/* csvtable.c - header-driven numeric CSV reading on top of libcsv.
 * Lines are fed to libcsv one at a time so every cell knows its line. */
#include "files/csvtable.h"

#include "base/fileread.h"

#include <csv.h>
#include <ctype.h>
#include <errno.h>
#include <stdio.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

#define CELL_MAX 256

typedef struct parse_state {
    const char *name;
    const sr_csv_column *specs;
    size_t nspecs;
    sr_csvtable *t;
    sr_error *err;
    int failed;
    size_t line;        /* current source line, 1-based */
    const char *linebuf;
    size_t linelen;
    int header_done;
    size_t field;       /* index of the field within the current record */
    int map[SR_CSVTABLE_MAX_COLS * 2]; /* file column -> spec index, -1 unknown */
    size_t nfilecols;
    size_t cap;
    double rowvals[SR_CSVTABLE_MAX_COLS];
} parse_state;

/* 1-based character column where field k starts on the current line. */
static size_t field_column(const parse_state *s, size_t k)
{
    size_t f = 0, i = 0;
    int quoted = 0;
    for (; i < s->linelen && f < k; i++) {
        char c = s->linebuf[i];
        if (c == '"')
            quoted = !quoted;
        else if (c == ',' && !quoted)
            f++;
    }
    return i + 1;
}

static void fail_at(parse_state *s, size_t column, const char *fmt, const char *a, const char *b)
{
    if (s->failed)
        return;
    s->failed = 1;
    char msg[SR_ERROR_MSG_MAX];
    snprintf(msg, sizeof msg, fmt, a, b);
    sr_error_set_at(s->err, SR_EINVAL, s->name, s->line, column, "%s", msg);
}

static void fail(parse_state *s, size_t field, const char *fmt, const char *a, const char *b)
{
    fail_at(s, field_column(s, field), fmt, a, b);
}

static void trim(char *c)
{
    size_t n = strlen(c);
    while (n > 0 && isspace((unsigned char)c[n - 1]))
        c[--n] = '\0';
    size_t i = 0;
    while (isspace((unsigned char)c[i]))
        i++;
    if (i)
        memmove(c, c + i, n - i + 1);
}

static void header_cell(parse_state *s, char *cell)
{
    size_t k = s->field;
    if (k >= sizeof s->map / sizeof s->map[0]) {
        fail(s, k, "too many columns%s%s", "", "");
        return;
    }
    char name[CELL_MAX], unit[CELL_MAX] = "";
    const char *br = strchr(cell, '[');
    if (br) {
        const char *close = strchr(br, ']');
        if (!close || close[1] != '\0') {
            fail(s, k, "header cell '%s' has a malformed unit (write it as \"name [unit]\")%s", cell, "");
            return;
        }
        size_t nl = (size_t)(br - cell);
        memcpy(name, cell, nl);
        name[nl] = '\0';
        size_t ul = (size_t)(close - br - 1);
        memcpy(unit, br + 1, ul);
        unit[ul] = '\0';
        trim(unit);
    } else {
        snprintf(name, sizeof name, "%s", cell);
    }
    trim(name);
    s->map[k] = -1;
    if (name[0] == '\0') {
        fail(s, k, "empty column name in the header%s%s", "", "");
        return;
    }
    for (size_t j = 0; j < s->nspecs; j++) {
        if (strcmp(s->specs[j].name, name) == 0) {
            for (size_t i = 0; i < k; i++)
                if (s->map[i] == (int)j) {
                    fail(s, k, "column '%s' appears twice%s", name, "");
                    return;
                }
            s->map[k] = (int)j;
            break;
        }
    }
    if (s->map[k] < 0) {
        char accepted[SR_ERROR_MSG_MAX] = "";
        for (size_t j = 0; j < s->nspecs; j++) {
            strncat(accepted, s->specs[j].name, sizeof accepted - strlen(accepted) - 3);
            if (j + 1 < s->nspecs)
                strncat(accepted, ", ", sizeof accepted - strlen(accepted) - 1);
        }
        fail(s, k, "unknown column '%s' (expected: %s)", name, accepted);
        return;
    }
    const sr_csv_column *sp = &s->specs[s->map[k]];
    /* A header unit is checked now so a typo is reported on the header line. */
    if (sp->q != SR_Q_NONE) {
        double f, off;
        if (unit[0] == '\0') {
            char m[CELL_MAX + 64];
            snprintf(m, sizeof m, "column '%s' needs a unit in brackets, e.g. \"%s [%s]\"", name, name,
                     sr_units_label(sp->q, SR_UNITS_SI));
            fail(s, k, "%s%s", m, "");
            return;
        }
        if (sr_units_lookup(unit, sp->q, &f, &off) != SR_OK) {
            char m[SR_ERROR_MSG_MAX];
            snprintf(m, sizeof m, "unknown %s unit '%s' in column '%s' (accepted: %s)",
                     sr_units_quantity_name(sp->q), unit, name, sr_units_accepted(sp->q));
            fail(s, k, "%s%s", m, "");
            return;
        }
    } else if (unit[0] != '\0') {
        fail(s, k, "column '%s' takes no unit%s", name, "");
        return;
    }
}

typedef struct unitconv {
    double f, off;
} unitconv;

/* per-load conversion table: file column -> factor/offset */
typedef struct load_ctx {
    parse_state s;
    unitconv conv[SR_CSVTABLE_MAX_COLS * 2];
    char units[SR_CSVTABLE_MAX_COLS * 2][CELL_MAX];
} load_ctx;

static void on_field(void *data, size_t len, void *ctx_)
{
    load_ctx *c = ctx_;
    parse_state *s = &c->s;
    if (s->failed)
        return;
    char cell[CELL_MAX];
    if (len >= sizeof cell) {
        fail(s, s->field, "cell longer than %s characters%s", "255", "");
        return;
    }
    memcpy(cell, data ? data : "", len);
    cell[len] = '\0';
    trim(cell);
    if (!s->header_done) {
        if (s->field < sizeof s->map / sizeof s->map[0]) {
            /* stash the unit for this file column */
            const char *br = strchr(cell, '[');
            c->units[s->field][0] = '\0';
            if (br) {
                snprintf(c->units[s->field], CELL_MAX, "%s", br + 1);
                char *close = strchr(c->units[s->field], ']');
                if (close)
                    *close = '\0';
                trim(c->units[s->field]);
            }
        }
        header_cell(s, cell);
        if (!s->failed) {
            int j = s->map[s->field];
            const sr_csv_column *sp = &s->specs[j];
            c->conv[s->field].f = 1;
            c->conv[s->field].off = 0;
            if (sp->q != SR_Q_NONE)
                sr_units_lookup(c->units[s->field], sp->q, &c->conv[s->field].f, &c->conv[s->field].off);
        }
        s->field++;
        return;
    }
    if (s->field >= s->nfilecols) {
        char n[24];
        snprintf(n, sizeof n, "%zu", s->nfilecols);
        fail(s, s->field, "row has more cells than the header's %s columns%s", n, "");
        return;
    }
    int j = s->map[s->field];
    if (cell[0] == '\0') {
        fail(s, s->field, "empty cell in column '%s'%s", s->specs[j].name, "");
        return;
    }
    double v;
    sr_error e;
    if (sr_units_parse(cell, SR_Q_NONE, &v, &e) != SR_OK) {
        fail(s, s->field, "column '%s': %s", s->specs[j].name, e.msg);
        return;
    }
    s->rowvals[j] = (v + c->conv[s->field].off) * c->conv[s->field].f;
    s->field++;
}

static void on_record(int ch, void *ctx_)
{
    (void)ch;
    load_ctx *c = ctx_;
    parse_state *s = &c->s;
    if (s->failed)
        return;
    if (!s->header_done) {
        s->nfilecols = s->field;
        for (size_t j = 0; j < s->nspecs; j++) {
            int found = 0;
            for (size_t k = 0; k < s->nfilecols; k++)
                if (s->map[k] == (int)j)
                    found = 1;
            if (!found && s->specs[j].required) {
                fail(s, 0, "the header has no '%s' column%s", s->specs[j].name, "");
                return;
            }
        }
        for (size_t j = 0; j < s->nspecs; j++)
            for (size_t k = 0; k < s->nfilecols; k++)
                if (s->map[k] == (int)j)
                    s->t->field[j] = k;
        s->header_done = 1;
        s->field = 0;
        return;
    }
    if (s->field < s->nfilecols) {
        char have[24], want[24];
        snprintf(have, sizeof have, "%zu", s->field);
        snprintf(want, sizeof want, "%zu", s->nfilecols);
        fail(s, s->field, "row has %s of the header's %s cells", have, want);
        return;
    }
    if (s->t->nrows >= SR_CSVTABLE_MAX_ROWS) {
        fail(s, 0, "more than %s rows%s", "100000", "");
        return;
    }
    if (s->t->nrows == s->cap) {
        size_t ncap = s->cap ? s->cap * 2 : 64;
        for (size_t j = 0; j < s->nspecs; j++) {
            int present = 0;
            for (size_t k = 0; k < s->nfilecols; k++)
                if (s->map[k] == (int)j)
                    present = 1;
            if (!present)
                continue;
            double *p = realloc(s->t->col[j], ncap * sizeof *p);
            if (!p) {
                s->failed = 1;
                sr_error_set_at(s->err, SR_ENOMEM, s->name, 0, 0, "out of memory");
                return;
            }
            s->t->col[j] = p;
        }
        size_t *rl = realloc(s->t->row_line, ncap * sizeof *rl);
        if (!rl) {
            s->failed = 1;
            sr_error_set_at(s->err, SR_ENOMEM, s->name, 0, 0, "out of memory");
            return;
        }
        s->t->row_line = rl;
        s->cap = ncap;
    }
    for (size_t j = 0; j < s->nspecs; j++)
        if (s->t->col[j])
            s->t->col[j][s->t->nrows] = s->rowvals[j];
    s->t->row_line[s->t->nrows] = s->line;
    s->t->nrows++;
    s->field = 0;
}

int sr_csvtable_parse(sr_csvtable *t, const char *name, const char *buf, size_t len,
                      const sr_csv_column *specs, size_t nspecs, sr_error *err)
{
    memset(t, 0, sizeof *t);
    for (size_t j = 0; j < SR_CSVTABLE_MAX_COLS; j++)
        t->field[j] = SIZE_MAX;
    if (nspecs > SR_CSVTABLE_MAX_COLS)
        return sr_error_set(err, SR_EINVAL, "internal: too many columns");
    t->ncols = nspecs;
    load_ctx *c = calloc(1, sizeof *c);
    if (!c)
        return sr_error_set_at(err, SR_ENOMEM, name, 0, 0, "out of memory");
    parse_state *s = &c->s;
    s->name = name;
    s->specs = specs;
    s->nspecs = nspecs;
    s->t = t;
    s->err = err;
    struct csv_parser p;
    if (csv_init(&p, CSV_STRICT | CSV_STRICT_FINI | CSV_EMPTY_IS_NULL) != 0) {
        free(c);
        return sr_error_set_at(err, SR_ENOMEM, name, 0, 0, "cannot start the CSV parser");
    }
    size_t pos = 0;
    /* a UTF-8 byte-order mark, as spreadsheets write it, is not part of the header */
    if (len >= 3 && memcmp(buf, "\xEF\xBB\xBF", 3) == 0)
        pos = 3;
    while (pos < len && !s->failed) {
        /* a line ends at LF (also CRLF) or at a lone CR (old spreadsheet exports) */
        size_t end = pos;
        while (end < len && buf[end] != '\n' && !(buf[end] == '\r' && (end + 1 == len || buf[end + 1] != '\n')))
            end++;
        s->line++;
        s->linebuf = buf + pos;
        s->linelen = end - pos;
        if (s->linelen > 0 && s->linebuf[s->linelen - 1] == '\r')
            s->linelen--;
        size_t i = pos;
        while (i < end && (buf[i] == ' ' || buf[i] == '\t' || buf[i] == '\r'))
            i++;
        const char *nul = memchr(buf + pos, '\0', end - pos);
        if (nul) {
            fail_at(s, (size_t)(nul - (buf + pos)) + 1, "binary data (a NUL byte) in a text table%s%s", "", "");
            break;
        }
        int skip = (i == end) || buf[i] == '#';
        if (!skip) {
            size_t chunk = end - pos + (end < len ? 1 : 0);
            if (csv_parse(&p, buf + pos, chunk, on_field, on_record, c) != chunk && !s->failed) {
                fail(s, s->field, "malformed CSV: %s%s", csv_strerror(csv_error(&p)), "");
            }
            /* a quoted cell open at the end of its line (libcsv: FIELD_BEGUN
             * inside quotes) would swallow the next lines, '#' ones too: a
             * numeric table keeps every cell on its line */
            if (!s->failed && end < len && p.pstate == 2 && p.quoted)
                fail(s, s->field, "a quoted cell runs past the end of its line (its closing '\"' is missing)%s%s",
                     "", "");
        }
        pos = end + 1;
    }
    /* the last record may lack a line end; an open quote there must not
     * silently drop the row */
    if (!s->failed && csv_fini(&p, on_field, on_record, c) != 0 && !s->failed)
        fail_at(s, s->linelen + 1, "the file ends inside a quoted cell (a '\"' is not closed)%s%s", "", "");
    csv_free(&p);
    int failed = s->failed;
    if (!failed && !s->header_done) {
        sr_error_set_at(err, SR_EINVAL, name, 1, 1, "empty table (expected a header row and data rows)");
        failed = 1;
    } else if (!failed && t->nrows == 0) {
        sr_error_set_at(err, SR_EINVAL, name, s->line, 1, "the table has a header but no data rows");
        failed = 1;
    }
    free(c);
    if (failed) {
        sr_csvtable_free(t);
        return err ? err->code : SR_EINVAL;
    }
    return SR_OK;
}

int sr_csvtable_read_file(const char *path, char **out, size_t *outlen, sr_error *err)
{
    *out = NULL;
    *outlen = 0;
    FILE *f;
    int rc = sr_file_open_read(path, &f, err);
    if (rc)
        return rc;
    char *buf = NULL;
    size_t len = 0, cap = 0;
    for (;;) {
        if (len + 4096 > cap) {
            if (cap > (size_t)64 << 20) {
                free(buf);
                fclose(f);
                return sr_error_set_at(err, SR_EINVAL, path, 0, 0, "larger than 64 MiB, not a table");
            }
            cap = cap ? cap * 2 : 8192;
            char *nb = realloc(buf, cap);
            if (!nb) {
                free(buf);
                fclose(f);
                return sr_error_set_at(err, SR_ENOMEM, path, 0, 0, "out of memory");
            }
            buf = nb;
        }
        size_t got = fread(buf + len, 1, cap - len, f);
        len += got;
        if (got == 0)
            break;
    }
    int bad = ferror(f), bad_errno = errno;
    fclose(f);
    if (bad) {
        free(buf);
        return sr_error_set_at(err, SR_EIO, path, 0, 0, "read error: %s", strerror(bad_errno));
    }
    *out = buf;
    *outlen = len;
    return SR_OK;
}

int sr_csvtable_load(sr_csvtable *t, const char *path, const sr_csv_column *specs, size_t nspecs,
                     sr_error *err)
{
    memset(t, 0, sizeof *t);
    char *buf;
    size_t len;
    int rc = sr_csvtable_read_file(path, &buf, &len, err);
    if (rc)
        return rc;
    rc = sr_csvtable_parse(t, path, buf ? buf : "", len, specs, nspecs, err);
    free(buf);
    return rc;
}

size_t sr_csvtable_cell_column(const char *buf, size_t len, size_t line, size_t field)
{
    size_t pos = 0, at = 1;
    if (len >= 3 && memcmp(buf, "\xEF\xBB\xBF", 3) == 0)
        pos = 3;
    /* the same line ends as sr_csvtable_parse: LF, CRLF or a lone CR */
    while (pos < len && at < line) {
        if (buf[pos] == '\n' || (buf[pos] == '\r' && (pos + 1 == len || buf[pos + 1] != '\n')))
            at++;
        pos++;
    }
    if (at != line)
        return 1;
    parse_state s;
    memset(&s, 0, sizeof s);
    s.linebuf = buf + pos;
    size_t end = pos;
    while (end < len && buf[end] != '\n' && buf[end] != '\r')
        end++;
    s.linelen = end - pos;
    return field_column(&s, field);
}

void sr_csvtable_free(sr_csvtable *t)
{
    for (size_t j = 0; j < SR_CSVTABLE_MAX_COLS; j++) {
        free(t->col[j]);
        t->col[j] = NULL;
    }
    free(t->row_line);
    t->row_line = NULL;
    t->nrows = 0;
}

int sr_csvtable_require_increasing(const sr_csvtable *t, size_t c, const char *path, const char *what,
                                   sr_error *err)
{
    if (!t->col[c])
        return SR_OK;
    for (size_t i = 1; i < t->nrows; i++)
        if (!(t->col[c][i] > t->col[c][i - 1]))
            return sr_error_set_at(err, SR_EINVAL, path, t->row_line[i], 1, "%s must increase strictly from row to row",
                                   what);
    return SR_OK;
}
