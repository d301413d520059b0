/* report.c - rendering a command's result as text, CSV or JSON.
 * CSV cells go through libcsv's writer and JSON through jansson, so nothing
 * is escaped by hand. */
#include "output/report.h"

#include <csv.h>
#include <jansson.h>
#include <math.h>
#include <stdarg.h>
#include <stdlib.h>
#include <string.h>

#include "base/version.h"

static const char CAUTION[] =
    "CAUTION: preliminary engineering estimates only. This tool is not for designing, selecting or "
    "certifying parachutes that carry people. Canopies, risers and attachments must be verified by test; "
    "rigging, packing and inspection follow certified rigging practice and the applicable local rules and "
    "codes.";

const char *sr_report_caution(void)
{
    return CAUTION;
}

/* the caution of a program's output (include/sinkrate/output.h): the same text */
const char *sr_caution(void)
{
    return CAUTION;
}

enum item_kind { IT_SECTION, IT_VALUE, IT_BAND, IT_TEXT };

typedef struct item {
    enum item_kind kind;
    char *key, *label, *text;
    double v[3];
    sr_quantity q;
    int sig;
} item;

typedef struct column {
    char *key, *label;
    sr_quantity q;
    int sig;
    int is_text;
} column;

struct sr_rtable {
    char *key, *title;
    column *cols;
    size_t ncols;
    double *nums;   /* row-major, ncols per row (text columns hold NaN) */
    char **texts;   /* row-major, ncols per row (numeric columns hold NULL) */
    size_t nrows, cap;
};

typedef struct strlist {
    char **s;
    size_t n;
} strlist;

struct sr_report {
    char *command, *title;
    strlist header_keys, header_texts;
    item *items;
    size_t nitems;
    strlist notes, warnings;
    sr_rtable **tables;
    size_t ntables;
};

/* Every text a report holds, with its control characters (C0, DEL, C1)
 * written visibly (as the text \e, \n, \x07, \u009b): a name or a file name
 * can never move the cursor, retitle a terminal or break a table. */
static char *dup(const char *s)
{
    if (!s)
        return NULL;
    size_t n = 0;
    for (const unsigned char *p = (const unsigned char *)s; *p; p++)
        n += *p < 0x20 || *p == 0x7f || (p[0] == 0xc2 && p[1] >= 0x80 && p[1] <= 0x9f) ? 6 : 1;
    char *d = malloc(n + 1), *o = d;
    if (!d)
        return NULL;
    for (const unsigned char *p = (const unsigned char *)s; *p; p++) {
        if (p[0] == 0xc2 && p[1] >= 0x80 && p[1] <= 0x9f) {
            o += sprintf(o, "\\u%04x", p[1]);
            p++;
        } else if (*p < 0x20 || *p == 0x7f) {
            const char *e = *p == '\n' ? "\\n" : *p == '\r' ? "\\r" : *p == '\t' ? "\\t" : *p == 0x1b ? "\\e" : NULL;
            o += e ? sprintf(o, "%s", e) : sprintf(o, "\\x%02x", *p);
        } else {
            *o++ = (char)*p;
        }
    }
    *o = '\0';
    return d;
}

sr_report *sr_report_new(const char *command, const char *title)
{
    sr_report *r = calloc(1, sizeof *r);
    if (!r)
        return NULL;
    r->command = dup(command);
    r->title = dup(title);
    return r;
}

static void free_table(sr_rtable *t)
{
    for (size_t c = 0; c < t->ncols; c++) {
        free(t->cols[c].key);
        free(t->cols[c].label);
    }
    for (size_t i = 0; i < t->nrows * t->ncols; i++)
        free(t->texts[i]);
    free(t->cols);
    free(t->nums);
    free(t->texts);
    free(t->key);
    free(t->title);
    free(t);
}

void sr_report_free(sr_report *r)
{
    if (!r)
        return;
    for (size_t i = 0; i < r->nitems; i++) {
        free(r->items[i].key);
        free(r->items[i].label);
        free(r->items[i].text);
    }
    free(r->items);
    for (size_t i = 0; i < r->notes.n; i++)
        free(r->notes.s[i]);
    for (size_t i = 0; i < r->warnings.n; i++)
        free(r->warnings.s[i]);
    for (size_t i = 0; i < r->header_keys.n; i++) {
        free(r->header_keys.s[i]);
        free(r->header_texts.s[i]);
    }
    free(r->header_keys.s);
    free(r->header_texts.s);
    free(r->notes.s);
    free(r->warnings.s);
    for (size_t i = 0; i < r->ntables; i++)
        free_table(r->tables[i]);
    free(r->tables);
    free(r->command);
    free(r->title);
    free(r);
}

static item *push_item(sr_report *r)
{
    item *n = realloc(r->items, (r->nitems + 1) * sizeof *n);
    if (!n)
        return NULL;
    r->items = n;
    item *it = &r->items[r->nitems++];
    memset(it, 0, sizeof *it);
    return it;
}

int sr_report_section(sr_report *r, const char *heading)
{
    item *it = push_item(r);
    if (!it)
        return SR_ENOMEM;
    it->kind = IT_SECTION;
    it->label = dup(heading);
    return SR_OK;
}

int sr_report_value(sr_report *r, const char *key, const char *label, double si, sr_quantity q, int sig)
{
    item *it = push_item(r);
    if (!it)
        return SR_ENOMEM;
    it->kind = IT_VALUE;
    it->key = dup(key);
    it->label = dup(label);
    it->v[0] = it->v[1] = it->v[2] = si;
    it->q = q;
    it->sig = sig;
    return SR_OK;
}

int sr_report_band(sr_report *r, const char *key, const char *label, double lo, double typ, double hi,
                   sr_quantity q, int sig)
{
    item *it = push_item(r);
    if (!it)
        return SR_ENOMEM;
    it->kind = IT_BAND;
    it->key = dup(key);
    it->label = dup(label);
    it->v[0] = lo;
    it->v[1] = typ;
    it->v[2] = hi;
    it->q = q;
    it->sig = sig;
    return SR_OK;
}

int sr_report_text(sr_report *r, const char *key, const char *label, const char *text)
{
    item *it = push_item(r);
    if (!it)
        return SR_ENOMEM;
    it->kind = IT_TEXT;
    it->key = dup(key);
    it->label = dup(label);
    it->text = dup(text);
    return SR_OK;
}

static int vpush(strlist *l, const char *fmt, va_list ap)
{
    char buf[1024];
    vsnprintf(buf, sizeof buf, fmt, ap);
    char **n = realloc(l->s, (l->n + 1) * sizeof *n);
    if (!n)
        return SR_ENOMEM;
    l->s = n;
    l->s[l->n++] = dup(buf);
    return SR_OK;
}

static int push_str(strlist *l, const char *s)
{
    char **n = realloc(l->s, (l->n + 1) * sizeof *n);
    if (!n)
        return SR_ENOMEM;
    l->s = n;
    l->s[l->n] = strdup(s ? s : "");
    if (!l->s[l->n])
        return SR_ENOMEM;
    l->n++;
    return SR_OK;
}

int sr_report_header(sr_report *r, const char *key, const char *text)
{
    if (push_str(&r->header_keys, key))
        return SR_ENOMEM;
    if (push_str(&r->header_texts, text)) {
        free(r->header_keys.s[--r->header_keys.n]);
        return SR_ENOMEM;
    }
    return SR_OK;
}

int sr_report_note(sr_report *r, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    int rc = vpush(&r->notes, fmt, ap);
    va_end(ap);
    return rc;
}

int sr_report_warning(sr_report *r, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    int rc = vpush(&r->warnings, fmt, ap);
    va_end(ap);
    return rc;
}

size_t sr_report_warnings(const sr_report *r)
{
    return r->warnings.n;
}

const char *sr_report_infinite(const sr_report *r)
{
    for (size_t i = 0; i < r->nitems; i++) {
        const item *it = &r->items[i];
        if ((it->kind == IT_VALUE || it->kind == IT_BAND) && (isinf(it->v[0]) || isinf(it->v[1]) || isinf(it->v[2])))
            return it->label ? it->label : it->key;
    }
    for (size_t k = 0; k < r->ntables; k++) {
        const sr_rtable *t = r->tables[k];
        for (size_t i = 0; i < t->nrows * t->ncols; i++)
            if (!t->cols[i % t->ncols].is_text && isinf(t->nums[i]))
                return t->cols[i % t->ncols].label;
    }
    return NULL;
}

sr_rtable *sr_report_table(sr_report *r, const char *key, const char *title)
{
    sr_rtable **n = realloc(r->tables, (r->ntables + 1) * sizeof *n);
    if (!n)
        return NULL;
    r->tables = n;
    sr_rtable *t = calloc(1, sizeof *t);
    if (!t)
        return NULL;
    t->key = dup(key);
    t->title = dup(title);
    r->tables[r->ntables++] = t;
    return t;
}

static int add_column(sr_rtable *t, const char *key, const char *label, sr_quantity q, int sig, int is_text)
{
    if (t->nrows > 0)
        return SR_EINVAL;
    column *n = realloc(t->cols, (t->ncols + 1) * sizeof *n);
    if (!n)
        return SR_ENOMEM;
    t->cols = n;
    column *c = &t->cols[t->ncols++];
    c->key = dup(key);
    c->label = dup(label);
    c->q = q;
    c->sig = sig;
    c->is_text = is_text;
    return SR_OK;
}

int sr_rtable_column(sr_rtable *t, const char *key, const char *label, sr_quantity q, int sig)
{
    return add_column(t, key, label, q, sig, 0);
}

int sr_rtable_text_column(sr_rtable *t, const char *key, const char *label)
{
    return add_column(t, key, label, SR_Q_NONE, 0, 1);
}

int sr_rtable_row(sr_rtable *t, const double *nums, const char *const *texts)
{
    if (t->nrows == t->cap) {
        size_t cap = t->cap ? t->cap * 2 : 16;
        double *nn = realloc(t->nums, cap * t->ncols * sizeof *nn);
        if (!nn)
            return SR_ENOMEM;
        t->nums = nn;
        char **nt = realloc(t->texts, cap * t->ncols * sizeof *nt);
        if (!nt)
            return SR_ENOMEM;
        t->texts = nt;
        t->cap = cap;
    }
    size_t ni = 0, ti = 0, base = t->nrows * t->ncols;
    for (size_t c = 0; c < t->ncols; c++) {
        if (t->cols[c].is_text) {
            t->nums[base + c] = NAN;
            t->texts[base + c] = dup(texts ? texts[ti++] : "");
        } else {
            t->nums[base + c] = nums ? nums[ni++] : NAN;
            t->texts[base + c] = NULL;
        }
    }
    t->nrows++;
    return SR_OK;
}

size_t sr_rtable_rows(const sr_rtable *t)
{
    return t->nrows;
}

/* ---- number formatting ---- */

static void fmt_num(char *buf, size_t len, double x, int sig)
{
    if (isnan(x)) {
        snprintf(buf, len, "-");
        return;
    }
    if (sig >= SR_FIXED(0)) {
        snprintf(buf, len, "%.*f", sig - SR_FIXED(0), x);
        if (strcmp(buf, "-0") == 0)
            snprintf(buf, len, "0");
        return;
    }
    if (sig < 1)
        sig = 4;
    double ax = fabs(x);
    if (ax == 0.0) {
        snprintf(buf, len, "0");
        return;
    }
    if (ax >= 1e-3 && ax < 1e9) {
        int mag = (int)floor(log10(ax));
        int dec = sig - 1 - mag;
        if (dec < 0)
            dec = 0;
        snprintf(buf, len, "%.*f", dec, x);
        /* rounding may print one digit more than asked (9.996 -> 10.00); accept */
    } else {
        snprintf(buf, len, "%.*e", sig - 1, x);
    }
}

/* Decimals a value is printed with: fixed, or about that many for a number
 * of significant digits of a bearing (at most 360). */
static int decimals_of(int sig)
{
    return sig >= SR_FIXED(0) ? sig - SR_FIXED(0) : sig > 3 ? sig - 3 : 0;
}

/* An SI value in the unit of its value, band or column (mag: the largest
 * magnitude there, which picks inches or feet, ounces or pounds under US);
 * a bearing wrapped so it never prints 360. */
static double shown(double si, sr_quantity q, sr_unit_system sys, double mag, int decimals)
{
    if (isnan(si))
        return si;
    if (q == SR_Q_BEARING)
        return sr_units_bearing_deg(si, decimals);
    return sr_units_from_si_at(si, q, sys, mag);
}

static const char *unit_of(sr_quantity q, sr_unit_system sys, double mag)
{
    return sr_units_label_at(q, sys, mag);
}

/* The largest magnitude of an item (NaN when it has no number). */
static double item_mag(const item *it)
{
    double m = NAN;
    for (int k = 0; k < (it->kind == IT_BAND ? 3 : 1); k++)
        if (isfinite(it->v[k]) && !(fabs(it->v[k]) <= m))
            m = fabs(it->v[k]);
    return m;
}

static double col_mag(const sr_rtable *t, size_t c)
{
    double m = NAN;
    for (size_t i = 0; i < t->nrows; i++) {
        double x = t->nums[i * t->ncols + c];
        if (isfinite(x) && !(fabs(x) <= m))
            m = fabs(x);
    }
    return m;
}

void sr_report_format_value(char *buf, size_t len, double si, sr_quantity q, sr_unit_system sys, int sig)
{
    char num[64];
    fmt_num(num, sizeof num, shown(si, q, sys, fabs(si), decimals_of(sig)), sig);
    const char *u = unit_of(q, sys, fabs(si));
    snprintf(buf, len, "%s%s%s", num, u[0] ? " " : "", u);
}

/* ---- text ---- */

static void wrap(FILE *f, const char *prefix, const char *text, size_t width)
{
    size_t plen = strlen(prefix), col = 0;
    const char *p = text;
    fputs(prefix, f);
    col = plen;
    while (*p) {
        const char *w = p;
        while (*w && *w != ' ')
            w++;
        size_t wl = (size_t)(w - p);
        if (col > plen && col + 1 + wl > width) {
            fputc('\n', f);
            for (size_t i = 0; i < plen; i++)
                fputc(' ', f);
            col = plen;
        } else if (col > plen) {
            fputc(' ', f);
            col++;
        }
        fwrite(p, 1, wl, f);
        col += wl;
        p = w;
        while (*p == ' ')
            p++;
    }
    fputc('\n', f);
}

/* Which parts a selection keeps (see sr_report_write_part). */
typedef struct part {
    int values, notes;
    const sr_rtable *only; /* NULL: every table (when tables is set) */
    int tables;
} part;

static void write_text(const sr_report *r, FILE *f, sr_unit_system sys, const part *sel)
{
    fprintf(f, "sinkrate %s: %s\n", r->command, r->title);
    wrap(f, "", CAUTION, 78);
    for (size_t i = 0; i < r->header_texts.n; i++)
        wrap(f, "", r->header_texts.s[i], 78);
    size_t lw = 0;
    for (size_t i = 0; i < r->nitems; i++)
        if (r->items[i].kind != IT_SECTION && r->items[i].label && strlen(r->items[i].label) > lw)
            lw = strlen(r->items[i].label);
    for (size_t i = 0; sel->values && i < r->nitems; i++) {
        const item *it = &r->items[i];
        char a[64], b[64], c[64];
        switch (it->kind) {
        case IT_SECTION:
            fprintf(f, "\n%s\n", it->label);
            break;
        case IT_VALUE: {
            double mg = item_mag(it);
            fmt_num(a, sizeof a, shown(it->v[0], it->q, sys, mg, decimals_of(it->sig)), it->sig);
            const char *u = unit_of(it->q, sys, mg);
            fprintf(f, "  %-*s  %s%s%s\n", (int)lw, it->label, a, u[0] ? " " : "", u);
            break;
        }
        case IT_BAND: {
            double mg = item_mag(it);
            int dec = decimals_of(it->sig);
            fmt_num(a, sizeof a, shown(it->v[0], it->q, sys, mg, dec), it->sig);
            fmt_num(b, sizeof b, shown(it->v[1], it->q, sys, mg, dec), it->sig);
            fmt_num(c, sizeof c, shown(it->v[2], it->q, sys, mg, dec), it->sig);
            const char *u = unit_of(it->q, sys, mg);
            fprintf(f, "  %-*s  %s / %s / %s%s%s  (low / typical / high)\n", (int)lw, it->label, a, b, c,
                    u[0] ? " " : "", u);
            break;
        }
        case IT_TEXT: {
            char prefix[128];
            snprintf(prefix, sizeof prefix, "  %-*s  ", (int)lw, it->label);
            wrap(f, prefix, it->text, lw + 4 + 40 > 78 ? lw + 4 + 40 : 78);
            break;
        }
        }
    }
    for (size_t k = 0; sel->tables && k < r->ntables; k++) {
        const sr_rtable *t = r->tables[k];
        if (sel->only && t != sel->only)
            continue;
        if (t->title)
            fprintf(f, "\n%s\n", t->title);
        else
            fputc('\n', f);
        /* cell strings first, to size the columns */
        size_t nc = t->ncols, nr = t->nrows;
        char **cells = calloc((nr + 2) * nc + 1, sizeof *cells);
        size_t *w = calloc(nc + 1, sizeof *w);
        if (!cells || !w) {
            free(cells);
            free(w);
            return;
        }
        for (size_t c = 0; c < nc; c++) {
            const column *col = &t->cols[c];
            char u[64];
            double mg = col->is_text ? NAN : col_mag(t, c);
            const char *ul = col->is_text ? "" : unit_of(col->q, sys, mg);
            snprintf(u, sizeof u, "%s%s%s", ul[0] ? "[" : "", ul, ul[0] ? "]" : "");
            cells[c] = strdup(col->label);
            cells[nc + c] = strdup(u);
            for (size_t i = 0; i < nr; i++) {
                char buf[256];
                if (col->is_text)
                    snprintf(buf, sizeof buf, "%s", t->texts[i * nc + c] ? t->texts[i * nc + c] : "");
                else
                    fmt_num(buf, sizeof buf, shown(t->nums[i * nc + c], col->q, sys, mg, decimals_of(col->sig)),
                            col->sig);
                cells[(i + 2) * nc + c] = strdup(buf);
            }
            for (size_t i = 0; i < nr + 2; i++) {
                size_t l = cells[i * nc + c] ? strlen(cells[i * nc + c]) : 0;
                if (l > w[c])
                    w[c] = l;
            }
        }
        int units_row = 0;
        for (size_t c = 0; c < nc; c++)
            if (cells[nc + c] && cells[nc + c][0])
                units_row = 1;
        for (size_t i = 0; i < nr + 2; i++) {
            if (i == 1 && !units_row)
                continue;
            for (size_t c = 0; c < nc; c++) {
                const char *s = cells[i * nc + c] ? cells[i * nc + c] : "";
                if (t->cols[c].is_text)
                    /* no trailing blanks after the last column */
                    fprintf(f, "  %-*s", c + 1 == nc ? 0 : (int)w[c], s);
                else
                    fprintf(f, "  %*s", (int)w[c], s);
            }
            fputc('\n', f);
        }
        for (size_t i = 0; i < (nr + 2) * nc; i++)
            free(cells[i]);
        free(cells);
        free(w);
    }
    if (r->notes.n && sel->notes) {
        fputs("\nNotes\n", f);
        for (size_t i = 0; i < r->notes.n; i++)
            wrap(f, "  - ", r->notes.s[i], 78);
    }
    if (r->warnings.n) {
        fputs("\nWarnings\n", f);
        for (size_t i = 0; i < r->warnings.n; i++)
            wrap(f, "  ! ", r->warnings.s[i], 78);
    }
}

/* ---- CSV ---- */

static void csv_cell(FILE *f, const char *s, int first)
{
    if (!first)
        fputc(',', f);
    csv_fwrite(f, s, strlen(s));
}

/* Numbers never hold a comma, quote or line break, so they need no quoting. */
static void csv_num(FILE *f, double x, int first)
{
    if (!first)
        fputc(',', f);
    if (!isnan(x))
        fprintf(f, "%.10g", x);
}

void sr_report_comment(FILE *f, const char *text, size_t width)
{
    fputs("# ", f);
    size_t col = 2;
    for (const char *p = text; *p; p++) {
        if (width > 0 && (*p == '\n' || (*p == ' ' && col > width))) {
            fputs("\n# ", f);
            col = 2;
            continue;
        }
        fputc(*p == '\n' ? ' ' : *p, f);
        col++;
    }
    fputc('\n', f);
}

/* comment lines are outside RFC 4180; keep them single-line */
static void csv_comment(FILE *f, const char *text)
{
    sr_report_comment(f, text, 0);
}

static void write_csv(const sr_report *r, FILE *f, sr_unit_system sys, const part *sel)
{
    char buf[1200];
    snprintf(buf, sizeof buf, "sinkrate %s %s: %s", SR_VERSION, r->command, r->title);
    csv_comment(f, buf);
    csv_comment(f, CAUTION);
    for (size_t i = 0; i < r->header_texts.n; i++) {
        snprintf(buf, sizeof buf, "%s: %s", r->header_keys.s[i], r->header_texts.s[i]);
        csv_comment(f, buf);
    }
    for (size_t i = 0; i < r->warnings.n; i++) {
        snprintf(buf, sizeof buf, "warning: %s", r->warnings.s[i]);
        csv_comment(f, buf);
    }
    for (size_t i = 0; sel->notes && i < r->notes.n; i++) {
        snprintf(buf, sizeof buf, "note: %s", r->notes.s[i]);
        csv_comment(f, buf);
    }
    /* the values are a table of their own when there is no other, or when
     * they are the part asked for; otherwise comment lines */
    int values_as_rows = r->ntables == 0 || (sel->values && !sel->tables);
    if (values_as_rows) {
        csv_cell(f, "quantity", 1);
        csv_cell(f, "value", 0);
        csv_cell(f, "unit", 0);
        fputs("\r\n", f);
    }
    static const char *suffix[3] = {"_low", "_typical", "_high"};
    for (size_t i = 0; sel->values && i < r->nitems; i++) {
        const item *it = &r->items[i];
        if (it->kind == IT_SECTION)
            continue;
        double mg = item_mag(it);
        const char *u = it->kind == IT_TEXT ? "" : unit_of(it->q, sys, mg);
        int n = it->kind == IT_BAND ? 3 : 1;
        for (int k = 0; k < n; k++) {
            char key[256];
            snprintf(key, sizeof key, "%s%s", it->key, n == 3 ? suffix[k] : "");
            if (values_as_rows) {
                csv_cell(f, key, 1);
                if (it->kind == IT_TEXT)
                    csv_cell(f, it->text, 0);
                else
                    csv_num(f, shown(it->v[k], it->q, sys, mg, 9), 0);
                csv_cell(f, u, 0);
                fputs("\r\n", f);
            } else {
                if (it->kind == IT_TEXT)
                    snprintf(buf, sizeof buf, "%s = %s", key, it->text);
                else
                    snprintf(buf, sizeof buf, "%s = %.10g %s", key, shown(it->v[k], it->q, sys, mg, 9), u);
                csv_comment(f, buf);
            }
        }
    }
    for (size_t k = 0; sel->tables && k < r->ntables; k++) {
        const sr_rtable *t = r->tables[k];
        if (sel->only && t != sel->only)
            continue;
        if (r->ntables > 1 && !sel->only) {
            if (k > 0)
                fputs("\r\n", f);
            snprintf(buf, sizeof buf, "table: %s", t->key);
            csv_comment(f, buf);
        }
        for (size_t c = 0; c < t->ncols; c++) {
            const column *col = &t->cols[c];
            const char *u = col->is_text ? "" : unit_of(col->q, sys, col_mag(t, c));
            if (u[0])
                snprintf(buf, sizeof buf, "%s [%s]", col->key, u);
            else
                snprintf(buf, sizeof buf, "%s", col->key);
            csv_cell(f, buf, c == 0);
        }
        fputs("\r\n", f);
        double mags[64];
        for (size_t c = 0; c < t->ncols && c < 64; c++)
            mags[c] = t->cols[c].is_text ? NAN : col_mag(t, c);
        for (size_t i = 0; i < t->nrows; i++) {
            for (size_t c = 0; c < t->ncols; c++) {
                if (t->cols[c].is_text)
                    csv_cell(f, t->texts[i * t->ncols + c] ? t->texts[i * t->ncols + c] : "", c == 0);
                else
                    csv_num(f, shown(t->nums[i * t->ncols + c], t->cols[c].q, sys, c < 64 ? mags[c] : NAN, 9),
                            c == 0);
            }
            fputs("\r\n", f);
        }
    }
}

/* ---- JSON ---- */

static json_t *jnum(double x)
{
    return isfinite(x) ? json_real(x) : json_null();
}

static int write_json(const sr_report *r, FILE *f, sr_unit_system sys, const part *sel, sr_error *err)
{
    json_t *root = json_object();
    json_object_set_new(root, "tool", json_string("sinkrate"));
    json_object_set_new(root, "version", json_string(SR_VERSION));
    json_object_set_new(root, "command", json_string(r->command));
    json_object_set_new(root, "title", json_string(r->title));
    json_object_set_new(root, "caution", json_string(CAUTION));
    json_object_set_new(root, "units", json_string(sys == SR_UNITS_US ? "us" : "si"));
    for (size_t i = 0; i < r->header_keys.n; i++)
        json_object_set_new(root, r->header_keys.s[i], json_string(r->header_texts.s[i]));
    json_t *vals = json_object();
    for (size_t i = 0; sel->values && i < r->nitems; i++) {
        const item *it = &r->items[i];
        json_t *v = NULL;
        double mg = item_mag(it);
        if (it->kind == IT_VALUE) {
            v = json_object();
            json_object_set_new(v, "value", jnum(shown(it->v[0], it->q, sys, mg, 9)));
            json_object_set_new(v, "unit", json_string(unit_of(it->q, sys, mg)));
        } else if (it->kind == IT_BAND) {
            v = json_object();
            json_object_set_new(v, "low", jnum(shown(it->v[0], it->q, sys, mg, 9)));
            json_object_set_new(v, "typical", jnum(shown(it->v[1], it->q, sys, mg, 9)));
            json_object_set_new(v, "high", jnum(shown(it->v[2], it->q, sys, mg, 9)));
            json_object_set_new(v, "unit", json_string(unit_of(it->q, sys, mg)));
        } else if (it->kind == IT_TEXT) {
            v = json_string(it->text ? it->text : "");
        }
        if (v)
            json_object_set_new(vals, it->key, v);
    }
    if (sel->values)
        json_object_set_new(root, "values", vals);
    else
        json_decref(vals);
    json_t *tabs = json_object();
    for (size_t k = 0; sel->tables && k < r->ntables; k++) {
        const sr_rtable *t = r->tables[k];
        if (sel->only && t != sel->only)
            continue;
        json_t *jt = json_object(), *cols = json_array(), *rows = json_array();
        double mags[64];
        for (size_t c = 0; c < t->ncols && c < 64; c++)
            mags[c] = t->cols[c].is_text ? NAN : col_mag(t, c);
        for (size_t c = 0; c < t->ncols; c++) {
            json_t *jc = json_object();
            json_object_set_new(jc, "key", json_string(t->cols[c].key));
            json_object_set_new(jc, "unit", json_string(t->cols[c].is_text ? ""
                                                                            : unit_of(t->cols[c].q, sys,
                                                                                      c < 64 ? mags[c] : NAN)));
            json_array_append_new(cols, jc);
        }
        for (size_t i = 0; i < t->nrows; i++) {
            json_t *row = json_array();
            for (size_t c = 0; c < t->ncols; c++) {
                size_t at = i * t->ncols + c;
                if (t->cols[c].is_text)
                    json_array_append_new(row, json_string(t->texts[at] ? t->texts[at] : ""));
                else
                    json_array_append_new(row, jnum(shown(t->nums[at], t->cols[c].q, sys, c < 64 ? mags[c] : NAN, 9)));
            }
            json_array_append_new(rows, row);
        }
        if (t->title)
            json_object_set_new(jt, "title", json_string(t->title));
        json_object_set_new(jt, "columns", cols);
        json_object_set_new(jt, "rows", rows);
        json_object_set_new(tabs, t->key, jt);
    }
    if (sel->tables)
        json_object_set_new(root, "tables", tabs);
    else
        json_decref(tabs);
    json_t *notes = json_array(), *warns = json_array();
    for (size_t i = 0; sel->notes && i < r->notes.n; i++)
        json_array_append_new(notes, json_string(r->notes.s[i]));
    for (size_t i = 0; i < r->warnings.n; i++)
        json_array_append_new(warns, json_string(r->warnings.s[i]));
    if (sel->notes)
        json_object_set_new(root, "notes", notes);
    else
        json_decref(notes);
    json_object_set_new(root, "warnings", warns);
    int rc = json_dumpf(root, f, JSON_INDENT(2) | JSON_PRESERVE_ORDER | JSON_REAL_PRECISION(10));
    json_decref(root);
    if (rc != 0)
        return sr_error_set(err, SR_EIO, "cannot write the JSON output");
    fputc('\n', f);
    return SR_OK;
}

int sr_report_write_part(const sr_report *r, FILE *f, sr_report_format fmt, sr_unit_system sys, const char *table,
                         sr_error *err)
{
    part sel = {1, 1, NULL, 1};
    if (table) {
        sel.notes = 0;
        if (strcmp(table, SR_REPORT_VALUES) == 0) {
            sel.tables = 0;
        } else {
            sel.values = 0;
            for (size_t k = 0; k < r->ntables && !sel.only; k++)
                if (r->tables[k]->key && strcmp(r->tables[k]->key, table) == 0)
                    sel.only = r->tables[k];
            if (!sel.only) {
                char have[512] = SR_REPORT_VALUES;
                for (size_t k = 0; k < r->ntables; k++) {
                    size_t l = strlen(have);
                    snprintf(have + l, sizeof have - l, ", %s", r->tables[k]->key ? r->tables[k]->key : "?");
                }
                return sr_error_set(err, SR_EINVAL, "this output has no table '%s' (it has: %s)", table, have);
            }
        }
    }
    switch (fmt) {
    case SR_REPORT_TEXT:
        write_text(r, f, sys, &sel);
        break;
    case SR_REPORT_CSV:
        write_csv(r, f, sys, &sel);
        break;
    case SR_REPORT_JSON:
        return write_json(r, f, sys, &sel, err);
    }
    if (ferror(f))
        return sr_error_set(err, SR_EIO, "cannot write the output");
    return SR_OK;
}

int sr_report_write(const sr_report *r, FILE *f, sr_report_format fmt, sr_unit_system sys, sr_error *err)
{
    return sr_report_write_part(r, f, fmt, sys, NULL, err);
}
