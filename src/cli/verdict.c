/* verdict.c - the one judge's verdict on a page: option, header line, limits
 * table and the "limit exceeded" lines. */
#include "cli/verdict.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "cli/common.h"

int sr_cli_limits_at(sr_cli *c, const char *text, sr_judge_basis *basis)
{
    if (strcmp(text, "band-end") == 0)
        *basis = SR_JUDGE_BAND_END;
    else if (strcmp(text, "typical") == 0)
        *basis = SR_JUDGE_TYPICAL;
    else
        return sr_cli_fail(c, "--limits-at: '%s' is not band-end (the conservative default) or typical", text);
    return 0;
}

void sr_cli_verdict_header(sr_report *r, sr_judge_basis basis)
{
    if (basis == SR_JUDGE_TYPICAL)
        sr_report_header(r, "verdict_basis",
                         "VERDICT NOT CONSERVATIVE: limits judged at the typical values (--limits-at typical); a "
                         "limit broken only at the worse end of a band does not set the exit code.");
    else
        sr_report_header(r, "verdict_basis",
                         "Verdict: every limit judged at the worse end of every band (conservative).");
}

sr_quantity sr_cli_verdict_quantity(sr_limit_kind k)
{
    return sr_judge_kind_quantity(k);
}

void sr_cli_verdict_label(const sr_mission *m, const sr_judge_limits *l, const sr_judge_row *row, char *buf,
                          size_t len)
{
    const char *stage = sr_judge_row_subject(m, row), *sec = stage;
    switch (row->kind) {
    case SR_JUDGE_SPEED: snprintf(buf, len, "touchdown descent rate"); break;
    case SR_JUDGE_ENERGY:
        snprintf(buf, len, "landing energy, %s%s", sec, l->energy_ground ? " (ground-relative)" : "");
        break;
    case SR_JUDGE_TIME: snprintf(buf, len, "descent time"); break;
    case SR_JUDGE_DRIFT: snprintf(buf, len, "drift from the launch point"); break;
    case SR_JUDGE_DEPLOY_Q: snprintf(buf, len, "dynamic pressure at deployment, %s", stage); break;
    case SR_JUDGE_MACH: snprintf(buf, len, "Mach at deployment, %s (family envelope)", stage); break;
    case SR_JUDGE_OPENING: snprintf(buf, len, "opening load, %s (rated / design factor)", stage); break;
    default: snprintf(buf, len, "?"); break;
    }
}

static const char *status_of(const sr_verdict *v, const sr_judge_row *row)
{
    if (!row->known)
        return "not reached";
    if (v->basis == SR_JUDGE_TYPICAL) {
        if (row->exceeded_typical)
            return "EXCEEDED";
        if (row->exceeded_band_end)
            return "met at typical; EXCEEDED at the band end (not judged)";
        return "met";
    }
    if (row->exceeded_typical)
        return "EXCEEDED";
    if (row->exceeded_band_end)
        return "EXCEEDED at the band end";
    return "met";
}

size_t sr_cli_verdict_table(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_judge_limits *l,
                            const sr_verdict *v, unsigned only)
{
    size_t any = 0;
    for (size_t i = 0; i < v->nrows; i++)
        any += !only || ((only >> v->row[i].kind) & 1u);
    if (!any)
        return 0;
    sr_rtable *t = sr_report_table(r, "limits",
                                   v->basis == SR_JUDGE_TYPICAL
                                       ? "Limits (judged at the typical values: NOT conservative)"
                                       : "Limits (judged at the band end: the worse end of every band)");
    sr_rtable_text_column(t, "limit", "limit");
    sr_rtable_column(t, "value", "allowed", SR_Q_NONE, 4);
    sr_rtable_column(t, "typical", "typical", SR_Q_NONE, 4);
    sr_rtable_column(t, "band_end", "band end", SR_Q_NONE, 4);
    sr_rtable_column(t, "margin", "margin", SR_Q_NONE, 4);
    sr_rtable_text_column(t, "unit", "unit");
    sr_rtable_text_column(t, "binding", "binds");
    sr_rtable_text_column(t, "status", "status");
    size_t shown = 0;
    for (size_t i = 0; i < v->nrows; i++) {
        const sr_judge_row *row = &v->row[i];
        if (only && !((only >> row->kind) & 1u))
            continue;
        char label[200];
        sr_cli_verdict_label(m, l, row, label, sizeof label);
        sr_quantity q = sr_cli_verdict_quantity(row->kind);
        double lim = sr_units_from_si(row->limit, q, c->units);
        double typ = sr_units_from_si(row->typical, q, c->units);
        double end = sr_units_from_si(row->band_end, q, c->units);
        double mar = sr_units_from_si(row->judged, q, c->units);
        double vals[] = {lim, typ, end, row->known ? lim - mar : NAN};
        const char *txt[] = {label, sr_units_label(q, c->units), (int)i == v->binding ? "*" : "", status_of(v, row)};
        sr_rtable_row(t, vals, txt);
        shown++;
    }
    return shown;
}

int sr_cli_verdict_messages(sr_report *r, sr_cli *c, const sr_mission *m, const sr_judge_limits *l,
                            const sr_verdict *v, unsigned only)
{
    int n = 0, hidden = 0;
    for (size_t i = 0; i < v->nrows; i++) {
        const sr_judge_row *row = &v->row[i];
        if (only && !((only >> row->kind) & 1u))
            continue;
        char label[200], a[64], b[64];
        sr_cli_verdict_label(m, l, row, label, sizeof label);
        sr_quantity q = sr_cli_verdict_quantity(row->kind);
        if (row->exceeded) {
            n++;
            char t[64];
            sr_report_format_value(a, sizeof a, row->judged, q, c->units, 4);
            sr_report_format_value(b, sizeof b, row->limit, q, c->units, 4);
            sr_report_format_value(t, sizeof t, row->typical, q, c->units, 4);
            if (v->basis == SR_JUDGE_TYPICAL || row->band_end == row->typical)
                sr_cli_note(c, "limit exceeded: %s %s > %s", label, a, b);
            else
                sr_cli_note(c, "limit exceeded: %s %s > %s at the worse end of the band (typical %s)", label, a, b,
                            t);
        } else if (row->exceeded_band_end) {
            hidden++;
            sr_report_format_value(a, sizeof a, row->band_end, q, c->units, 4);
            sr_report_format_value(b, sizeof b, row->limit, q, c->units, 4);
            sr_report_warning(r, "%s: met at the typical values, but %s at the worse end of the band exceeds %s; "
                                 "with --limits-at typical this does not set the exit code (the default judges the "
                                 "band end)",
                              label, a, b);
        }
    }
    (void)hidden;
    return n;
}

double sr_cli_verdict_breaches(const sr_mission *m, const sr_verdict *v, char *buf, size_t len)
{
    buf[0] = '\0';
    double top = 0.0;
    size_t used = 0;
    for (size_t i = 0; i < v->nrows; i++) {
        const sr_judge_row *row = &v->row[i];
        if (!row->exceeded)
            continue;
        top = fmax(top, row->ratio);
        char what[160];
        const char *stage = sr_judge_row_subject(m, row), *sec = stage;
        switch (row->kind) {
        case SR_JUDGE_SPEED: snprintf(what, sizeof what, "speed"); break;
        case SR_JUDGE_ENERGY: snprintf(what, sizeof what, "energy %s", sec); break;
        case SR_JUDGE_TIME: snprintf(what, sizeof what, "time"); break;
        case SR_JUDGE_DRIFT: snprintf(what, sizeof what, "drift"); break;
        case SR_JUDGE_DEPLOY_Q: snprintf(what, sizeof what, "deployment pressure %s", stage); break;
        case SR_JUDGE_MACH: snprintf(what, sizeof what, "Mach %s", stage); break;
        case SR_JUDGE_OPENING: snprintf(what, sizeof what, "opening load %s", stage); break;
        default: snprintf(what, sizeof what, "?"); break;
        }
        int w = snprintf(buf + used, len - used, row->ratio < 2.0 ? "%s%s %.2fx" : "%s%s %.1fx", used ? ", " : "", what,
                         row->ratio);
        if (w < 0 || (size_t)w >= len - used)
            break;
        used += (size_t)w;
    }
    return top;
}
