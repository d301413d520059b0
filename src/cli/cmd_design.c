/* cmd_design.c - `sinkrate design FILE`: the designs of a mission (families,
 * sizes, cluster counts, deployment heights, stages kept) that meet every
 * limit at the band end and fit their bays, the best of each combination
 * ranked, their margins, the closest misses, a Pareto front, and the chosen
 * one as a mission file that `profile` passes. */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "analysis/design.h"
#include "analysis/dispersion.h"
#include "analysis/input_warnings.h"
#include "cli/cliplot.h"
#include "cli/commands.h"
#include "cli/common.h"
#include "cli/progress.h"
#include "cli/verdict.h"
#include "files/mission.h"
#include "output/txn.h"
#include "physics/provenance.h"

#define DEFAULT_TOP 5
#define DEFAULT_RISK_DESIGNS 3
#define DEFAULT_MAX_RISK 0.01 /* as dispersion's default: our choice, stated in --help */
#define MAX_REPEAT 24

typedef struct stage_arg {
    const char *v[MAX_REPEAT];
    size_t n;
} stage_arg;

typedef struct design_opts {
    stage_arg families, diameters, heights, counts, optional, bay;
    const char *objective, *packing, *grid, *pareto, *top, *write, *limits_at, *risk_samples, *risk_designs,
        *max_risk;
} design_opts;

/* A stage option given once per stage: each value kept in order. */
static int keep_stage(sr_cli *c, const sr_opt *opt, const char *arg, void *place)
{
    stage_arg *a = place;
    if (a->n >= MAX_REPEAT)
        return sr_cli_fail(c, "--%s: given more than %d times", opt->name, MAX_REPEAT);
    a->v[a->n++] = arg;
    return 0;
}

static const sr_opt OPTS[] = {
    SR_OPT_TEXT("Stage options take STAGE=VALUE and may be given once per stage:"),
    SR_OPT_REPEATED("families", "STAGE=LIST", design_opts, families, keep_stage,
                    "candidate families: ids (cross,conical), all, class:solid"),
    SR_OPT_REPEATED("diameters", "STAGE=SIZES", design_opts, diameters, keep_stage,
                    "nominal diameters: 0.3m..1.2m (continuous), 12in..48in/6in (every 6 in), or a list "
                    "12in,18in,24in (sizes you can obtain)"),
    SR_OPT_REPEATED("heights", "STAGE=RANGE", design_opts, heights, keep_stage,
                    "deployment heights of a height-triggered stage: 150m..450m (points from the design: block, "
                    "default 20), 150m..450m/25"),
    SR_OPT_REPEATED("counts", "STAGE=LIST", design_opts, counts, keep_stage, "cluster counts: 1,2,3"),
    SR_OPT_REPEATED("optional", "STAGE", design_opts, optional, keep_stage,
                    "the stage may be dropped (single against dual deployment)"),
    SR_OPT_REPEATED("bay", "STAGE=VOLUME", design_opts, bay, keep_stage,
                    "the bay the packed stage must fit (\"0.8 L\", \"50 in3\")"),
    SR_OPT_STRING("objective", "mass|volume|drift", design_opts, objective,
                  "rank by recovery mass (default), packed volume or drift"),
    SR_OPT_STRING("packing", "hand|machine|pressure", design_opts, packing,
                  "how the canopies are packed (default hand: the loosest pack)"),
    SR_OPT_STRING("grid", "N", design_opts, grid,
                  "grid points over a size range that is not the last stage's (default 9)"),
    SR_OPT_STRING("pareto", "X,Y", design_opts, pareto,
                  "the two quantities of the Pareto front, each one of speed, drift, mass, volume, time (default "
                  "speed,drift)"),
    SR_OPT_STRING("top", "N", design_opts, top, "designs (with their margins) and misses shown (default 5)"),
    SR_OPT_STRING("write", "FILE", design_opts, write, "the chosen design as a mission file (profile passes it)"),
    SR_OPT_LIMITS_AT(design_opts, limits_at),
    SR_OPT_STRING("risk-samples", "N", design_opts, risk_samples,
                  "run the mission's dispersion (N samples) on the best designs and drop those breaking a limit in "
                  "more than --max-risk"),
    SR_OPT_STRING("risk-designs", "K", design_opts, risk_designs, "how many of the best designs (default 3)"),
    SR_OPT_STRING("max-risk", "P", design_opts, max_risk,
                  "accepted share of samples breaking a limit (\"1 %\", default 1 %, our choice, not a rule)"),
    SR_OPT_CLI_GROUP(sr_cli_group_run),
    SR_OPT_FOR("seed", "N", "seed of the risk check's random streams (default 1)"),
    SR_OPT_FOR("threads", "N", "threads (default 0: all cores); the output is the same bytes at any count"),
    SR_OPT_CLI_GROUP(sr_cli_group_plot),
    SR_OPT_CLI_GROUP(sr_cli_group_output),
    SR_OPT_END};

/* the tables of its output, for --table ("values": its single values) */
static const char *const TABLES[] = {"values", "designs", "margins", "limits", "packing",
                                     "misses", "pareto",  "risk",    NULL};

static int run_design(sr_cli *c, int argc, char **argv);

const sr_command sr_cmd_design = {
    .name = "design",
    .summary = "search the lightest design of a mission that meets every limit at the band end",
    .usage = "usage: sinkrate design FILE [options]\n",
    .about = "Search the recovery designs of a mission file -- canopy families, sizes, cluster counts, deployment "
             "heights, stages kept -- for those that meet every limit of the file at the band end (the judge of "
             "`sinkrate profile`: touchdown speed, landing energy, descent time, drift, deployment pressure, the "
             "family's Mach envelope, opening load against rated strength / design factor) and whose packed "
             "canopies fit their bays. What may vary comes from the file's design: block (docs/files.md) and the "
             "options below; with neither, each stage's size is searched from half to twice its nominal diameter.\n"
             "\n"
             "The last stage's size is exact for the touchdown limits (the sizing inversion, then bisection to "
             "0.01 %); other sizes and the deployment heights come from a grid refined three times around the best. "
             "Candidates are judged on the fast path; the best design of each combination is then written as a "
             "mission file, read back and judged with the full integration exactly as `sinkrate profile` judges "
             "it: the numbers shown are those.\n"
             "\n"
             "Shows the best design of each combination, lightest first (or --objective), its margin to every "
             "limit, the closest miss of every combination that meets none, and a Pareto front. Exit 1 when no "
             "design meets every limit (the closest miss is named).",
    .options = OPTS,
    .tables = TABLES,
    .run = run_design,
};

/* ---- options that name a stage ---- */

static int stage_of(sr_cli *c, const sr_mission *m, const char *opt, const char *arg, int need_value, size_t *k,
                    const char **value)
{
    char name[SR_NAME_MAX + 1];
    const char *eq = strchr(arg, '=');
    if (need_value && !eq)
        return sr_cli_fail(c, "%s: give STAGE=VALUE (e.g. %s main=%s)", opt, opt,
                           strcmp(opt, "--families") == 0    ? "conical,annular"
                           : strcmp(opt, "--diameters") == 0 ? "1.5m..3m"
                           : strcmp(opt, "--heights") == 0   ? "150m..450m"
                           : strcmp(opt, "--bay") == 0       ? "1.2L"
                                                             : "1,2");
    size_t len = eq ? (size_t)(eq - arg) : strlen(arg);
    if (len >= sizeof name)
        return sr_cli_fail(c, "%s: the mission has no stage '%.*s'", opt, (int)len, arg);
    memcpy(name, arg, len);
    name[len] = '\0';
    const char *names[SR_MISSION_MAX_STAGES + 1];
    for (size_t i = 0; i < m->nstages; i++) {
        names[i] = m->stages[i].name;
        if (strcmp(name, m->stages[i].name) == 0) {
            *k = i;
            *value = eq ? eq + 1 : NULL;
            if (!need_value && eq)
                return sr_cli_fail(c, "%s: give the stage name only, not '%s'", opt, arg);
            if (need_value && !eq[1])
                return sr_cli_fail(c, "%s: no value after '%s='", opt, name);
            return 0;
        }
    }
    names[m->nstages] = NULL;
    const char *s = sr_yaml_suggest(name, names);
    if (s)
        return sr_cli_fail(c, "%s: the mission has no stage '%s'; did you mean '%s'?", opt, name, s);
    return sr_cli_fail(c, "%s: the mission has no stage '%s' (its stages: see `sinkrate profile`)", opt, name);
}

/* Under --units us every length of a size or height range needs its unit, as
 * any other option's (a bare 30 would be 30 m, not 30 in). For heights the
 * part after '/' is a number of points, not a length. */
static int us_lengths_given(sr_cli *c, const char *opt, const char *text, int heights)
{
    if (c->units != SR_UNITS_US)
        return 0;
    char buf[2048];
    snprintf(buf, sizeof buf, "%s", text);
    char *slash = strchr(buf, '/');
    if (slash && heights)
        *slash = '\0';
    else if (slash)
        *slash = ',';
    for (char *p = strstr(buf, ".."); p; p = strstr(p, ".."))
        p[0] = p[1] = ',';
    char *save = NULL;
    for (char *tok = strtok_r(buf, ",", &save); tok; tok = strtok_r(NULL, ",", &save)) {
        double v;
        int rc = sr_cli_quantity(c, opt, tok, SR_Q_LENGTH, 0, &v);
        if (rc)
            return rc;
    }
    return 0;
}

/* The options into the mission's design spec (the file's design: block is
 * the start; an option replaces the same part of a stage). */
static int apply_options(sr_cli *c, const design_opts *o, sr_mission *m, const sr_catalog *cat, int *given)
{
    sr_design_spec *d = &m->design;
    sr_error e;
    int rc;
    size_t k = 0;
    const char *v = NULL;
    unsigned touched = 0;
    sr_design_basis b;
    sr_mission_design_basis(m, &b);
    *given = 0;
    struct {
        const stage_arg *a;
        const char *opt;
        int kind;
    } A[] = {{&o->families, "--families", 0}, {&o->diameters, "--diameters", 1}, {&o->heights, "--heights", 2},
             {&o->counts, "--counts", 3},     {&o->optional, "--optional", 4},   {&o->bay, "--bay", 5}};
    for (size_t a = 0; a < sizeof A / sizeof A[0]; a++) {
        unsigned seen = 0;
        for (size_t i = 0; i < A[a].a->n; i++) {
            if ((rc = stage_of(c, m, A[a].opt, A[a].a->v[i], A[a].kind != 4, &k, &v)))
                return rc;
            if ((seen >> k) & 1u)
                return sr_cli_fail(c, "%s: stage '%s' given twice; give it once", A[a].opt, m->stages[k].name);
            seen |= 1u << k;
            touched |= 1u << k;
            *given = 1;
            sr_design_stage *s = &d->stage[k];
            if ((A[a].kind == 1 || A[a].kind == 2) && (rc = us_lengths_given(c, A[a].opt, v, A[a].kind == 2)))
                return rc;
            switch (A[a].kind) {
            case 0: rc = sr_design_set_families(s, &b, k, cat, v, A[a].opt, &e); break;
            case 1: rc = sr_design_set_sizes(s, &b, k, v, A[a].opt, &e); break;
            case 2: rc = sr_design_set_heights(s, &b, k, v, A[a].opt, &e); break;
            case 3: rc = sr_design_set_counts(s, &b, k, v, A[a].opt, &e); break;
            case 4: s->optional = 1; rc = SR_OK; break;
            default: {
                double bay;
                if ((rc = sr_cli_quantity(c, "--bay", v, SR_Q_VOLUME, 1, &bay)))
                    return rc;
                if (!(bay <= 10.0))
                    return sr_cli_fail(c, "--bay: %s is more than 10 m3; not a bay of a payload", v);
                s->bay = bay;
            }
            }
            if (rc)
                return sr_cli_fail(c, "%s", e.msg);
        }
    }
    for (k = 0; k < m->nstages; k++)
        if (((touched >> k) & 1u) && sr_design_check_stage(&d->stage[k], &b, k, &e))
            return sr_cli_fail(c, "%s", e.msg);
    if (o->objective) {
        if (sr_design_objective_parse(o->objective, &d->objective))
            return sr_cli_fail(c, "--objective: '%s' is not one of mass, volume, drift", o->objective);
        *given = 1;
    }
    if (o->packing && sr_pack_parse(o->packing, &d->packing))
        return sr_cli_fail(c, "--packing: '%s' is not one of hand, machine, pressure", o->packing);
    if (o->grid) {
        long g;
        if ((rc = sr_cli_count(c, "--grid", o->grid, 2, 64, &g)))
            return rc;
        d->grid = (size_t)g;
    }
    return 0;
}

/* ---- the page ---- */

static void key_of(char *buf, size_t len, const char *stage, const char *what)
{
    size_t j = 0;
    for (const char *p = stage; *p && j + 1 < len; p++) {
        char ch = *p;
        buf[j++] = (ch >= 'A' && ch <= 'Z') ? (char)(ch - 'A' + 'a') : ((ch >= 'a' && ch <= 'z') || (ch >= '0' && ch <= '9')) ? ch : '_';
    }
    snprintf(buf + j, len - j, "_%s", what);
}

static void canopy_text(const sr_design_point *p, size_t k, char *buf, size_t len)
{
    if (!((p->present >> k) & 1u))
        snprintf(buf, len, "(dropped)");
    else if (p->count[k] > 1)
        snprintf(buf, len, "%s x%d", p->family[k], p->count[k]);
    else
        snprintf(buf, len, "%s", p->family[k]);
}

static void combo_text(const sr_mission *m, const sr_design_combo *cb, char *buf, size_t len)
{
    buf[0] = '\0';
    for (size_t k = 0; k < m->nstages; k++) {
        char one[96];
        canopy_text(&cb->best, k, one, sizeof one);
        size_t l = strlen(buf);
        snprintf(buf + l, len - l, "%s%s %s", k ? ", " : "", m->stages[k].name, one);
    }
}

/* The label of a design's worst (or binding) limit: a judge row on its own
 * mission, or a bay. */
static void limit_text(const sr_cli *c, const sr_mission *m, const sr_design_combo *cb, const sr_design_point *p,
                       char *buf, size_t len)
{
    const sr_design_limit *w = &p->worst;
    if (w->row >= 0 && cb->mission) {
        sr_judge_limits lim;
        sr_judge_limits_init(&lim, cb->mission);
        sr_cli_verdict_label(cb->mission, &lim, &p->verdict.row[w->row], buf, len);
    } else if (w->stage >= 0) {
        char a[48], b[48];
        sr_report_format_value(a, sizeof a, p->pack[w->stage].volume.hi, SR_Q_VOLUME, c->units, 3);
        sr_report_format_value(b, sizeof b, p->bay[w->stage], SR_Q_VOLUME, c->units, 3);
        snprintf(buf, len, "packed volume, %s (%s in a %s bay)", m->stages[w->stage].name, a, b);
    } else {
        snprintf(buf, len, "-");
    }
}

/* The columns that name a design: each stage's canopy, nominal diameter and,
 * where it varies, deployment height. */
static void design_columns(sr_rtable *t, const sr_mission *m)
{
    char key[96], label[96];
    for (size_t k = 0; k < m->nstages; k++) {
        key_of(key, sizeof key, m->stages[k].name, "canopy");
        sr_rtable_text_column(t, key, m->stages[k].name);
    }
    for (size_t k = 0; k < m->nstages; k++) {
        key_of(key, sizeof key, m->stages[k].name, "nominal_diameter");
        snprintf(label, sizeof label, "D0 %s", m->stages[k].name);
        sr_rtable_column(t, key, label, SR_Q_SIZE, 4);
    }
    for (size_t k = 0; k < m->nstages; k++)
        if (m->design.stage[k].height) {
            key_of(key, sizeof key, m->stages[k].name, "deploy_height");
            snprintf(label, sizeof label, "%s at", m->stages[k].name);
            sr_rtable_column(t, key, label, SR_Q_LENGTH, SR_FIXED(0));
        }
}

static void report_search(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_design_result *res,
                          int defaults)
{
    char buf[512];
    sr_report_section(r, "Search");
    sr_report_text(r, "mission", "mission", m->name);
    sr_report_text(r, "file", "file", m->path);
    snprintf(buf, sizeof buf, "%s",
             m->design.objective == SR_DESIGN_VOLUME ? "the smallest packed volume (typical)"
             : m->design.objective == SR_DESIGN_DRIFT ? "the least drift (as judged)"
                                                      : "the lightest recovery system (canopies with lines, typical)");
    sr_report_text(r, "objective", "objective", buf);
    snprintf(buf, sizeof buf, "%s pack (from memory: Knacke 1991, ch. 6)", sr_pack_name(m->design.packing));
    sr_report_text(r, "packing", "packing", buf);
    sr_report_value(r, "combinations", "combinations of families, counts, stages", (double)res->ncombos, SR_Q_NONE,
                    SR_FIXED(0));
    sr_report_value(r, "candidates", "candidates judged (fast path)", (double)res->candidates, SR_Q_NONE, SR_FIXED(0));
    sr_report_value(r, "confirmed", "designs judged again in full (as profile)", (double)res->confirmed, SR_Q_NONE,
                    SR_FIXED(0));
    for (size_t i = 0; i < res->naxes; i++) {
        const sr_design_axis *a = &res->axis[i];
        char key[96], label[128], lo[48], hi[48];
        const char *st = m->stages[a->stage].name;
        sr_report_format_value(lo, sizeof lo, a->lo, a->height ? SR_Q_LENGTH : SR_Q_SIZE, c->units, 4);
        sr_report_format_value(hi, sizeof hi, a->hi, a->height ? SR_Q_LENGTH : SR_Q_SIZE, c->units, 4);
        key_of(key, sizeof key, st, a->height ? "deploy_height_search" : "nominal_diameter_search");
        snprintf(label, sizeof label, "%s %s", st, a->height ? "deployment height" : "nominal diameter");
        if (a->height) {
            char res_[48];
            sr_report_format_value(res_, sizeof res_, a->resolution, SR_Q_LENGTH, c->units, 2);
            if (a->points > 1)
                snprintf(buf, sizeof buf, "%s .. %s: %zu points, refined %d times around the best (to %s)", lo, hi,
                         a->points, SR_DESIGN_REFINE, res_);
            else
                snprintf(buf, sizeof buf, "%s", lo);
        } else if (a->exact && a->list) {
            snprintf(buf, sizeof buf, "%zu sizes %s .. %s: the least that meets the touchdown limits (bisection "
                                      "over the list)",
                     a->points, lo, hi);
        } else if (a->exact) {
            snprintf(buf, sizeof buf, "%s .. %s: exact for the touchdown limits (sizing inversion, bisection to "
                                      "%.2g %%)",
                     lo, hi, 100.0 * a->resolution);
        } else if (a->list) {
            snprintf(buf, sizeof buf, "%zu sizes %s .. %s: every one", a->points, lo, hi);
        } else {
            snprintf(buf, sizeof buf, "%s .. %s: %zu-point grid, refined %d times around the best (to %.2g %%)", lo,
                     hi, a->points, SR_DESIGN_REFINE, 100.0 * a->resolution);
        }
        sr_report_text(r, key, label, buf);
    }
    if (defaults)
        sr_report_text(r, "search_space", "what varies",
                       "the file has no design: block: each stage's size from half to twice its nominal diameter; "
                       "families, counts and heights as in the file");
}

static void report_designs(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_design_result *res,
                           size_t top, int any_height[SR_MISSION_MAX_STAGES], int risk)
{
    sr_rtable *t = sr_report_table(r, "designs",
                                   res->objective == SR_DESIGN_VOLUME  ? "Designs that meet every limit, smallest "
                                                                         "packed first (the best of each combination)"
                                   : res->objective == SR_DESIGN_DRIFT ? "Designs that meet every limit, least drift "
                                                                         "first (the best of each combination)"
                                                                       : "Designs that meet every limit, lightest "
                                                                         "first (the best of each combination)");
    sr_rtable_column(t, "rank", "rank", SR_Q_NONE, SR_FIXED(0));
    design_columns(t, m);
    sr_rtable_column(t, "recovery_mass", "mass", SR_Q_MASS, 3);
    sr_rtable_column(t, "packed_volume", "packed", SR_Q_VOLUME, 3);
    sr_rtable_column(t, "touchdown_speed", "touchdown", SR_Q_SPEED, 3);
    sr_rtable_column(t, "drift", "drift", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_column(t, "binding_percent", "% of limit", SR_Q_NONE, 3);
    sr_rtable_text_column(t, "binding_limit", "binding limit");
    if (risk)
        sr_rtable_column(t, "risk_percent", "risk %", SR_Q_NONE, 2);
    for (size_t i = 0; i < res->nranked && i < top; i++) {
        const sr_design_combo *cb = &res->combo[res->rank[i]];
        const sr_design_point *p = &cb->best;
        double nums[4 + 2 * SR_MISSION_MAX_STAGES + 8];
        const char *txt[SR_MISSION_MAX_STAGES + 1];
        char can[SR_MISSION_MAX_STAGES][96], lim[256];
        size_t n = 0;
        nums[n++] = (double)(i + 1);
        for (size_t k = 0; k < m->nstages; k++) {
            canopy_text(p, k, can[k], sizeof can[k]);
            txt[k] = can[k];
        }
        for (size_t k = 0; k < m->nstages; k++)
            nums[n++] = (p->present >> k) & 1u ? p->d0[k] : NAN;
        for (size_t k = 0; k < m->nstages; k++)
            if (any_height[k])
                nums[n++] = (p->present >> k) & 1u ? p->height[k] : NAN;
        nums[n++] = p->mass;
        nums[n++] = p->volume;
        nums[n++] = p->speed;
        nums[n++] = p->drift;
        nums[n++] = 100.0 * p->worst.ratio;
        limit_text(c, m, cb, p, lim, sizeof lim);
        txt[m->nstages] = lim;
        if (risk)
            nums[n++] = cb->risk_checked ? 100.0 * cb->risk : NAN;
        sr_rtable_row(t, nums, txt);
    }
}

/* Every limit of the designs shown, with its margin; the bays too. */
static void report_margins(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_design_result *res,
                           size_t top)
{
    sr_rtable *t = sr_report_table(r, "margins", res->basis == SR_JUDGE_TYPICAL
                                                     ? "Margins of the designs shown (judged at the typical values: "
                                                       "NOT conservative)"
                                                     : "Margins of the designs shown (judged at the band end; bays "
                                                       "at the loosest pack and heaviest cloth)");
    sr_rtable_column(t, "rank", "rank", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_text_column(t, "limit", "limit");
    sr_rtable_column(t, "allowed", "allowed", SR_Q_NONE, 4);
    sr_rtable_column(t, "judged", "judged", SR_Q_NONE, 4);
    sr_rtable_column(t, "margin", "margin", SR_Q_NONE, 4);
    sr_rtable_text_column(t, "unit", "unit");
    sr_rtable_column(t, "percent", "% of limit", SR_Q_NONE, 3);
    sr_rtable_text_column(t, "binding", "binds");
    for (size_t i = 0; i < res->nranked && i < top; i++) {
        const sr_design_combo *cb = &res->combo[res->rank[i]];
        const sr_design_point *p = &cb->best;
        sr_judge_limits lim;
        sr_judge_limits_init(&lim, cb->mission);
        for (size_t j = 0; j < p->verdict.nrows; j++) {
            const sr_judge_row *row = &p->verdict.row[j];
            char label[200];
            sr_cli_verdict_label(cb->mission, &lim, row, label, sizeof label);
            sr_quantity q = sr_cli_verdict_quantity(row->kind);
            double a = sr_units_from_si(row->limit, q, c->units), v = sr_units_from_si(row->judged, q, c->units);
            double nums[] = {(double)(i + 1), a, row->known ? v : NAN, row->known ? a - v : NAN,
                             row->known ? 100.0 * row->ratio : NAN};
            const char *txt[] = {label, sr_units_label(q, c->units), p->worst.row == (int)j ? "*" : ""};
            sr_rtable_row(t, nums, txt);
        }
        for (size_t k = 0; k < m->nstages; k++) {
            if (!((p->present >> k) & 1u) || !(p->bay[k] > 0.0))
                continue;
            char label[200];
            snprintf(label, sizeof label, "packed volume, %s (bay)", m->stages[k].name);
            double a = sr_units_from_si(p->bay[k], SR_Q_VOLUME, c->units),
                   v = sr_units_from_si(p->pack[k].volume.hi, SR_Q_VOLUME, c->units);
            double nums[] = {(double)(i + 1), a, v, a - v, 100.0 * p->pack[k].volume.hi / p->bay[k]};
            const char *txt[] = {label, sr_units_label(SR_Q_VOLUME, c->units),
                                 p->worst.row < 0 && p->worst.stage == (int)k ? "*" : ""};
            sr_rtable_row(t, nums, txt);
        }
    }
}

static void report_packing(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_design_point *p)
{
    (void)c;
    sr_rtable *t = sr_report_table(r, "packing", "Canopies of the chosen design: mass with lines and packed volume "
                                                 "(low / typical / high; the high volume must fit the bay)");
    sr_rtable_text_column(t, "stage", "stage");
    sr_rtable_text_column(t, "canopy", "canopy");
    sr_rtable_column(t, "nominal_diameter", "D0", SR_Q_SIZE, 4);
    sr_rtable_column(t, "areal_mass", "cloth", SR_Q_AREAL_MASS, 3);
    sr_rtable_column(t, "mass_low", "mass low", SR_Q_MASS, 3);
    sr_rtable_column(t, "mass_typical", "typ", SR_Q_MASS, 3);
    sr_rtable_column(t, "mass_high", "high", SR_Q_MASS, 3);
    sr_rtable_column(t, "volume_low", "packed low", SR_Q_VOLUME, 3);
    sr_rtable_column(t, "volume_typical", "typ", SR_Q_VOLUME, 3);
    sr_rtable_column(t, "volume_high", "high", SR_Q_VOLUME, 3);
    sr_rtable_column(t, "bay", "bay", SR_Q_VOLUME, 3);
    sr_rtable_text_column(t, "cloth_from", "cloth from");
    for (size_t k = 0; k < m->nstages; k++) {
        if (!((p->present >> k) & 1u))
            continue;
        const sr_pack *pk = &p->pack[k];
        char can[96];
        canopy_text(p, k, can, sizeof can);
        double nums[] = {p->d0[k], pk->areal.typ, pk->mass.lo, pk->mass.typ, pk->mass.hi, pk->volume.lo,
                         pk->volume.typ, pk->volume.hi, p->bay[k]};
        const char *txt[] = {m->stages[k].name, can,
                             pk->areal_given ? "the canopy or its family" : "light ripstop (from memory)"};
        sr_rtable_row(t, nums, txt);
    }
}

static int miss_cmp(const sr_design_combo *a, const sr_design_combo *b)
{
    return a->best.worst.ratio < b->best.worst.ratio ? -1 : a->best.worst.ratio > b->best.worst.ratio;
}

static void report_misses(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_design_result *res, size_t top,
                          size_t *order, size_t nmiss)
{
    if (!nmiss)
        return;
    char title[200];
    snprintf(title, sizeof title, "Combinations with no design that meets every limit: the closest miss of each%s",
             nmiss > top ? " (the closest shown; --top)" : "");
    sr_rtable *t = sr_report_table(r, "misses", title);
    sr_rtable_text_column(t, "combination", "combination");
    sr_rtable_text_column(t, "limit", "limit missed");
    sr_rtable_column(t, "percent", "% of limit", SR_Q_NONE, SR_FIXED(2));
    sr_rtable_text_column(t, "detail", "at best");
    for (size_t i = 0; i < nmiss && i < top; i++) {
        const sr_design_combo *cb = &res->combo[order[i]];
        char comb[512], lim[256], det[256];
        combo_text(m, cb, comb, sizeof comb);
        if (cb->best.note[0]) {
            snprintf(lim, sizeof lim, "cannot be flown");
            snprintf(det, sizeof det, "%s", cb->best.note);
        } else {
            limit_text(c, m, cb, &cb->best, lim, sizeof lim);
            det[0] = '\0';
            if (cb->best.worst.row >= 0) {
                const sr_judge_row *row = &cb->best.verdict.row[cb->best.worst.row];
                char a[48], b[48];
                sr_quantity q = sr_cli_verdict_quantity(row->kind);
                sr_report_format_value(a, sizeof a, row->judged, q, c->units, 4);
                sr_report_format_value(b, sizeof b, row->limit, q, c->units, 4);
                snprintf(det, sizeof det, "%s against %s", a, b);
            }
            size_t l = strlen(det);
            for (size_t k = 0; k < m->nstages; k++)
                if ((cb->best.present >> k) & 1u) {
                    char d0[48];
                    sr_report_format_value(d0, sizeof d0, cb->best.d0[k], SR_Q_SIZE, c->units, 4);
                    l = strlen(det);
                    snprintf(det + l, sizeof det - l, "%s%s %s%s", l ? "; " : "", m->stages[k].name, d0,
                             cb->best.bay_capped == (int)k + 1 ? " (the most its bay holds)" : "");
                }
        }
        double nums[] = {isfinite(cb->best.worst.ratio) ? 100.0 * cb->best.worst.ratio : NAN};
        const char *txt[] = {comb, lim, det};
        sr_rtable_row(t, nums, txt);
    }
}

static void report_pareto(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_design_result *res,
                          sr_design_quantity qx, sr_design_quantity qy)
{
    if (!res->npareto)
        return;
    char title[200];
    snprintf(title, sizeof title, "Pareto front: %s against %s over the designs that meet every limit (none is "
                                  "better in both)",
             sr_design_quantity_name(qy), sr_design_quantity_name(qx));
    sr_rtable *t = sr_report_table(r, "pareto", title);
    static const sr_quantity Q[SR_DQ_N] = {SR_Q_SPEED, SR_Q_LENGTH, SR_Q_MASS, SR_Q_VOLUME, SR_Q_TIME};
    sr_rtable_column(t, sr_design_quantity_name(qx), sr_design_quantity_name(qx), Q[qx], 4);
    sr_rtable_column(t, sr_design_quantity_name(qy), sr_design_quantity_name(qy), Q[qy], 4);
    design_columns(t, m);
    sr_rtable_column(t, "recovery_mass", "mass", SR_Q_MASS, 3);
    for (size_t i = 0; i < res->npareto; i++) {
        const sr_design_point *p = &res->pareto[i];
        double nums[3 + 2 * SR_MISSION_MAX_STAGES];
        const char *txt[SR_MISSION_MAX_STAGES];
        char can[SR_MISSION_MAX_STAGES][96];
        size_t n = 0;
        nums[n++] = sr_design_quantity_of(p, qx);
        nums[n++] = sr_design_quantity_of(p, qy);
        for (size_t k = 0; k < m->nstages; k++) {
            canopy_text(p, k, can[k], sizeof can[k]);
            txt[k] = can[k];
            nums[2 + k] = (p->present >> k) & 1u ? p->d0[k] : NAN;
        }
        n = 2 + m->nstages;
        for (size_t k = 0; k < m->nstages; k++)
            if (m->design.stage[k].height)
                nums[n++] = (p->present >> k) & 1u ? p->height[k] : NAN;
        nums[n++] = p->mass;
        sr_rtable_row(t, nums, txt);
    }
}

static void report_risk(sr_report *r, const sr_mission *m, const sr_design_result *res, size_t n, double max_risk,
                        const size_t *before, size_t nbefore)
{
    sr_rtable *t = sr_report_table(r, "risk", "Risk check: the mission's dispersion on the best designs");
    sr_rtable_column(t, "rank", "rank before", SR_Q_NONE, SR_FIXED(0));
    sr_rtable_text_column(t, "combination", "combination");
    sr_rtable_column(t, "risk_percent", "samples breaking a limit %", SR_Q_NONE, 3);
    sr_rtable_text_column(t, "worst", "most often broken");
    sr_rtable_text_column(t, "verdict", "verdict");
    for (size_t i = 0; i < nbefore; i++) {
        const sr_design_combo *cb = &res->combo[before[i]];
        if (!cb->risk_checked)
            continue;
        char comb[512], worst[128], verdict[160];
        combo_text(m, cb, comb, sizeof comb);
        int wb = -1;
        for (int b = 0; b < SR_DISP_NLIMITS; b++)
            if (cb->risk_limit[b] > 0.0 && (wb < 0 || cb->risk_limit[b] > cb->risk_limit[wb]))
                wb = b;
        if (wb >= 0)
            snprintf(worst, sizeof worst, "%s (%.3g %%)", sr_limit_name(wb), 100.0 * cb->risk_limit[wb]);
        else
            snprintf(worst, sizeof worst, "none");
        if (cb->risk_dropped)
            snprintf(verdict, sizeof verdict, "DROPPED: above the accepted %.3g %%", 100.0 * max_risk);
        else
            snprintf(verdict, sizeof verdict, "kept");
        double nums[] = {(double)(i + 1), 100.0 * cb->risk};
        const char *txt[] = {comb, worst, verdict};
        sr_rtable_row(t, nums, txt);
    }
    (void)n;
}

/* ---- the figure: the Pareto front and the ranked designs ---- */

static int figure(sr_cli *c, const sr_mission *m, const sr_design_result *res, sr_design_quantity qx,
                  sr_design_quantity qy, int argc, char **argv)
{
    static const sr_quantity Q[SR_DQ_N] = {SR_Q_SPEED, SR_Q_LENGTH, SR_Q_MASS, SR_Q_VOLUME, SR_Q_TIME};
    static const char *const LABEL[SR_DQ_N] = {"touchdown speed (judged)", "drift (judged)", "recovery mass",
                                               "packed volume", "descent time (judged)"};
    sr_unit_system sys = c->units;
    char title[256], xl[96], yl[96], sub[400];
    static const char *const WORDS[SR_DQ_N] = {"touchdown speed", "drift", "recovery mass", "packed volume",
                                               "descent time"};
    snprintf(title, sizeof title, "Design search: %s against %s", WORDS[qy], WORDS[qx]);
    sr_plot *p = sr_plot_new(title);
    if (!p)
        return sr_cli_fail(c, "--plot: out of memory");
    snprintf(sub, sizeof sub, "%s; designs that meet every limit %s", m->name,
             res->basis == SR_JUDGE_TYPICAL ? "at the typical values (not conservative)" : "at the band end");
    sr_plot_subtitle(p, sub);
    snprintf(xl, sizeof xl, "%s [%s]", LABEL[qx], sr_units_label(Q[qx], sys));
    snprintf(yl, sizeof yl, "%s [%s]", LABEL[qy], sr_units_label(Q[qy], sys));
    sr_plot_axes ax;
    sr_plot_axes_init(&ax);
    ax.xlabel = xl;
    ax.ylabel = yl;
    ax.key = SR_PLOT_KEY_ABOVE;
    sr_plot_set_axes(p, 0, &ax);
    const char *cols[] = {"x", "y"};
    size_t bf, br, bc;
    int rc = sr_plot_block(p, "Pareto front", 2, cols, &bf);
    for (size_t i = 0; i < res->npareto && !rc; i++) {
        double row[2] = {sr_units_from_si(sr_design_quantity_of(&res->pareto[i], qx), Q[qx], sys),
                         sr_units_from_si(sr_design_quantity_of(&res->pareto[i], qy), Q[qy], sys)};
        rc = sr_plot_row(p, bf, row);
    }
    sr_plot_series s1 = {.kind = SR_PLOT_LINESPOINTS, .block = bf, .x = 1, .y = 2, .title = "Pareto front",
                         .color = 1};
    if (!rc && res->npareto)
        rc = sr_plot_add(p, &s1);
    if (!rc)
        rc = sr_plot_block(p, "best design of each combination", 2, cols, &br);
    for (size_t i = 0; i < res->nranked && !rc; i++) {
        const sr_design_point *d = &res->combo[res->rank[i]].best;
        double row[2] = {sr_units_from_si(sr_design_quantity_of(d, qx), Q[qx], sys),
                         sr_units_from_si(sr_design_quantity_of(d, qy), Q[qy], sys)};
        rc = sr_plot_row(p, br, row);
    }
    sr_plot_series s2 = {.kind = SR_PLOT_POINTS, .block = br, .x = 1, .y = 2,
                         .title = "best of each combination", .color = 3, .open = 1};
    if (!rc && res->nranked)
        rc = sr_plot_add(p, &s2);
    if (!rc && res->nranked) {
        rc = sr_plot_block(p, "chosen design", 2, cols, &bc);
        const sr_design_point *d = &res->combo[res->rank[0]].best;
        double row[2] = {sr_units_from_si(sr_design_quantity_of(d, qx), Q[qx], sys),
                         sr_units_from_si(sr_design_quantity_of(d, qy), Q[qy], sys)};
        if (!rc)
            rc = sr_plot_row(p, bc, row);
        sr_plot_series s3 = {.kind = SR_PLOT_POINTS, .block = bc, .x = 1, .y = 2, .title = "chosen design",
                             .color = 5};
        if (!rc)
            rc = sr_plot_add(p, &s3);
    }
    /* the limits on the axes, where the mission sets them */
    double lx = qx == SR_DQ_SPEED ? m->limit_speed : qx == SR_DQ_DRIFT ? m->limit_drift : qx == SR_DQ_TIME ? m->limit_time : NAN;
    double ly = qy == SR_DQ_SPEED ? m->limit_speed : qy == SR_DQ_DRIFT ? m->limit_drift : qy == SR_DQ_TIME ? m->limit_time : NAN;
    if (!rc && isfinite(lx))
        rc = sr_plot_marker(p, 0, 'x', sr_units_from_si(lx, Q[qx], sys), "limit", 0);
    if (!rc && isfinite(ly))
        rc = sr_plot_marker(p, 0, 'y', sr_units_from_si(ly, Q[qy], sys), "limit", 0);
    if (rc) {
        sr_plot_free(p);
        return sr_cli_fail(c, "--plot: out of memory");
    }
    rc = sr_cli_plot(c, p, argc, argv);
    sr_plot_free(p);
    return rc;
}

/* ---- the command ---- */

static void on_progress(size_t done, size_t n, void *ud)
{
    sr_progress *bar = ud;
    bar->n = n; /* the search's own estimate of its candidates */
    sr_cli_progress_update(bar, done);
}

static void header_text(const sr_mission *m, char *buf, size_t len)
{
    char *text = NULL;
    size_t n = 0;
    FILE *f = open_memstream(&text, &n);
    buf[0] = '\0';
    if (!f)
        return;
    fprintf(f,
            "# A design written by `sinkrate design %s`: the mission with the chosen canopies, sizes and\n# "
            "deployment heights (its design: block and its comments are not kept). Check it with `sinkrate "
            "profile`.\n",
            m->path);
    sr_report_comment(f, sr_report_caution(), 100);
    if (fclose(f) == 0)
        snprintf(buf, len, "%s", text);
    free(text);
}

static int run_design(sr_cli *c, int argc, char **argv)
{
    design_opts o;
    memset(&o, 0, sizeof o);
    int first, rc = sr_cli_parse_options(c, argc, argv, &o, &first);
    if (rc)
        return rc;
    if (first >= argc)
        return sr_cli_fail(c, "give a mission file (e.g. payloads/desert-club-rocket.yaml)");
    if (first + 1 < argc)
        return sr_cli_fail(c, "unexpected argument '%s' (design takes one mission file)", argv[first + 1]);
    sr_judge_basis basis = SR_JUDGE_BAND_END;
    if (o.limits_at && (rc = sr_cli_limits_at(c, o.limits_at, &basis)))
        return rc;
    long top = DEFAULT_TOP, risk_n = 0, risk_k = DEFAULT_RISK_DESIGNS;
    double max_risk = DEFAULT_MAX_RISK;
    if (o.top && (rc = sr_cli_count(c, "--top", o.top, 1, 100000, &top)))
        return rc;
    if (o.risk_samples && (rc = sr_cli_count(c, "--risk-samples", o.risk_samples, 1, SR_DISP_MAX_SAMPLES, &risk_n)))
        return rc;
    if (o.risk_designs && (rc = sr_cli_count(c, "--risk-designs", o.risk_designs, 1, 1000, &risk_k)))
        return rc;
    if ((o.risk_designs || o.max_risk) && !o.risk_samples)
        return sr_cli_fail(c, "%s: goes with --risk-samples N", o.risk_designs ? "--risk-designs" : "--max-risk");
    if (o.max_risk && (rc = sr_cli_share(c, "--max-risk", o.max_risk, &max_risk)))
        return rc;
    sr_design_opts dopt;
    sr_design_opts_init(&dopt);
    dopt.basis = basis;
    if (o.pareto) {
        char a[32], b[32];
        const char *comma = strchr(o.pareto, ',');
        if (!comma || comma - o.pareto >= (long)sizeof a || strlen(comma + 1) >= sizeof b)
            return sr_cli_fail(c, "--pareto: give two quantities X,Y (of speed, drift, mass, volume, time)");
        snprintf(a, sizeof a, "%.*s", (int)(comma - o.pareto), o.pareto);
        snprintf(b, sizeof b, "%s", comma + 1);
        if (sr_design_quantity_parse(a, &dopt.pareto_x) || sr_design_quantity_parse(b, &dopt.pareto_y))
            return sr_cli_fail(c, "--pareto: '%s' is not two of speed, drift, mass, volume, time", o.pareto);
        if (dopt.pareto_x == dopt.pareto_y)
            return sr_cli_fail(c, "--pareto: give two different quantities, not '%s' twice", a);
    }
    if (o.write && (rc = sr_cli_output(c, "--write", o.write)))
        return rc;
    if ((rc = sr_cli_input(c, "the mission file", argv[first])))
        return rc;
    sr_catalog *cat = NULL;
    sr_mission *m = NULL;
    sr_yaml y;
    int have_doc = 0;
    sr_design_result res;
    memset(&res, 0, sizeof res);
    sr_report *r = NULL;
    size_t *before = NULL, *miss = NULL;
    sr_error e;
    if ((rc = sr_cli_catalog(c, &cat)))
        goto out;
    m = calloc(1, sizeof *m);
    if (!m) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    if (sr_mission_load_doc(m, argv[first], cat, &y, &e)) {
        free(m);
        m = NULL;
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    have_doc = 1;
    if ((rc = sr_cli_mission_inputs(c, m)))
        goto out;
    if (!m->has_start) {
        rc = sr_cli_fail(c, "%s: the mission has no start: block (height above ground, airspeed and path angle at "
                            "the first deployment); a design search flies the descent and needs it",
                         m->path);
        goto out;
    }
    int given = 0;
    if ((rc = apply_options(c, &o, m, cat, &given)))
        goto out;
    int defaults = 0;
    if (!m->design.given && !given) {
        defaults = sr_design_default_ranges(m) > 0;
        if (!defaults) {
            rc = sr_cli_fail(c, "%s: nothing to search: the file has no design: block and no stage can vary (give "
                                "--families, --diameters or --heights)",
                             m->path);
            goto out;
        }
    }
    char header[8192]; /* the path (up to PATH_MAX) and the caution */
    header_text(m, header, sizeof header);
    dopt.header = header;
    dopt.target = o.write;
    dopt.threads = c->threads;
    sr_progress bar;
    sr_cli_progress_start(&bar, c->err, 1, "grid points");
    dopt.progress = on_progress;
    dopt.progress_ud = &bar;
    /* the bar's total is the search's estimate, set at its first call */
    rc = sr_design_run(m, &y, cat, &dopt, &res, &e);
    sr_cli_progress_end(&bar);
    if (rc) {
        rc = sr_cli_fail_err(c, &e);
        goto out;
    }
    size_t nbefore = res.nranked;
    before = malloc((res.nranked + 1) * sizeof *before);
    miss = malloc((res.ncombos + 1) * sizeof *miss);
    if (!before || !miss) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    memcpy(before, res.rank, res.nranked * sizeof *before);
    if (risk_n > 0 && res.nranked) {
        int threads = c->threads;
        uint64_t seed = c->seed_set ? (uint64_t)c->seed : 1u;
        if (sr_design_risk(&res, (size_t)risk_k, (size_t)risk_n, seed, max_risk, threads, &e)) {
            rc = sr_cli_fail_err(c, &e);
            goto out;
        }
    }
    /* the misses: combinations without a feasible design, closest first */
    size_t nmiss = 0;
    for (size_t i = 0; i < res.ncombos; i++)
        if (!res.combo[i].feasible)
            miss[nmiss++] = i;
    for (size_t i = 1; i < nmiss; i++) {
        size_t x = miss[i], j = i;
        while (j > 0 && miss_cmp(&res.combo[x], &res.combo[miss[j - 1]]) < 0) {
            miss[j] = miss[j - 1];
            j--;
        }
        miss[j] = x;
    }

    r = sr_report_new("design", "design search of a mission");
    if (!r) {
        rc = sr_cli_fail(c, "out of memory");
        goto out;
    }
    sr_cli_verdict_header(r, basis);
    report_search(r, c, m, &res, defaults);
    int any_height[SR_MISSION_MAX_STAGES] = {0};
    for (size_t k = 0; k < m->nstages; k++)
        any_height[k] = m->design.stage[k].height;
    const sr_design_combo *chosen = res.nranked ? &res.combo[res.rank[0]] : NULL;
    if (chosen) {
        sr_report_section(r, "Chosen design (rank 1)");
        char buf[512], lim[256];
        combo_text(m, chosen, buf, sizeof buf);
        sr_report_text(r, "chosen", "canopies", buf);
        for (size_t k = 0; k < m->nstages; k++) {
            if (!((chosen->best.present >> k) & 1u))
                continue;
            char key[96], label[96];
            key_of(key, sizeof key, m->stages[k].name, "nominal_diameter");
            snprintf(label, sizeof label, "%s nominal diameter", m->stages[k].name);
            sr_report_value(r, key, label, chosen->best.d0[k], SR_Q_SIZE, 4);
            if (m->stages[k].deploy == SR_DEPLOY_ALTITUDE) {
                key_of(key, sizeof key, m->stages[k].name, "deploy_height");
                snprintf(label, sizeof label, "%s deploys at", m->stages[k].name);
                sr_report_value(r, key, label, chosen->best.height[k], SR_Q_LENGTH, SR_FIXED(1));
            }
        }
        sr_report_value(r, "recovery_mass", "recovery mass (canopies with lines, typical)", chosen->best.mass,
                        SR_Q_MASS, 3);
        sr_report_value(r, "packed_volume", "packed volume (typical)", chosen->best.volume, SR_Q_VOLUME, 3);
        limit_text(c, m, chosen, &chosen->best, lim, sizeof lim);
        snprintf(buf, sizeof buf, "%s (%.1f %% of its limit)", lim, 100.0 * chosen->best.worst.ratio);
        sr_report_text(r, "binding_limit", "limit closest to breaking", buf);
        if (o.write)
            sr_report_text(r, "written_to", "written to", o.write);
    }
    report_designs(r, c, m, &res, (size_t)top, any_height, risk_n > 0);
    report_margins(r, c, m, &res, (size_t)top);
    if (chosen) {
        sr_judge_limits lim;
        sr_judge_limits_init(&lim, chosen->mission);
        sr_cli_verdict_table(r, c, chosen->mission, &lim, &chosen->best.verdict, 0);
        report_packing(r, c, m, &chosen->best);
    }
    report_misses(r, c, m, &res, (size_t)top, miss, nmiss);
    report_pareto(r, c, m, &res, dopt.pareto_x, dopt.pareto_y);
    if (risk_n > 0)
        report_risk(r, m, &res, (size_t)risk_n, max_risk, before, nbefore < (size_t)risk_k ? nbefore : (size_t)risk_k);
    /* what the numbers rest on */
    size_t rejected = 0;
    for (size_t i = 0; i < res.ncombos; i++)
        rejected += (size_t)res.combo[i].rejected;
    if (rejected)
        sr_report_note(r, "%zu candidate%s that the fast path passed failed the full integration (a limit met by less "
                          "than the fast path's error); the next candidates of %s combination%s were taken.",
                       rejected, rejected == 1 ? "" : "s", rejected == 1 ? "its" : "their", rejected == 1 ? "" : "s");
    int slotted = 0, cloth = 0;
    for (size_t i = 0; i < res.ncombos; i++)
        for (size_t k = 0; k < m->nstages; k++)
            if ((res.combo[i].present >> k) & 1u && !res.combo[i].best.pack[k].areal_given) {
                cloth = 1;
                const sr_family *f = sr_catalog_find(cat, res.combo[i].family[k], NULL);
                slotted |= f && strcmp(f->cls, SR_CANOPY_CLASS_SLOTTED) == 0;
            }
    sr_report_warning(r, "Packed volumes and canopy masses rest on recalled figures: packing density (Knacke 1991, "
                         "ch. 6, from memory)%s and the mass of the lines (1.3-1.6 x the cloth, from memory); weigh "
                         "and pack the real canopies before trusting a bay.",
                      cloth ? ", light ripstop cloth of 37-50 g/m2 where neither canopy nor family gives an areal mass "
                              "(common practice, from memory)"
                            : "");
    if (slotted)
        sr_report_warning(r, "Slotted canopies (ribbon, ringslot, ringsail) are built of tapes and weigh more per "
                             "nominal area than cloth; with no areal mass in their family the search takes cloth's, "
                             "which flatters them in mass and volume.");
    unsigned dropped = 0;
    for (size_t i = 0; i < res.nranked && i < (size_t)top; i++)
        dropped |= ((1u << m->nstages) - 1u) & ~res.combo[res.rank[i]].present;
    for (size_t k = 0; k < m->nstages; k++)
        if ((dropped >> k) & 1u)
            sr_report_warning(r, "Designs without '%s' fall with no canopy open until the next stage opens; that fall is "
                                 "flown as `sinkrate profile` flies it (each section broadside, its attitude of most "
                                 "drag). A tumbling or end-on fall is faster and opens the next canopy harder: judge "
                                 "the written file's failure cases in every attitude before choosing it.",
                              m->stages[k].name);
    sr_report_note(r, "Each candidate is the mission with other canopies, sizes and heights, judged by the judge of "
                      "`sinkrate profile` on the band runs (fast path). The best of each combination was then written "
                      "as a mission file, read back and judged with the full integration, as `sinkrate profile` "
                      "judges that file: every number above is that judgement.");
    sr_report_note(r, "The canopies' own mass enters the descent only where the file gives an areal mass (as in "
                      "`sinkrate profile`); otherwise the section masses are taken to hold them.");
    sr_report_note(r, "The last stage's size is the least that meets the touchdown limits: bigger canopies land "
                      "slower but drift farther, take longer and open harder, so within a combination the least is "
                      "the best for every objective. A stage whose size comes from a grid is as good as the grid.");
    sr_input_warnings iw;
    sr_input_warnings_init(&iw);
    sr_input_warnings_mission(&iw, m, NULL, c->units);
    sr_cli_report_input_warnings(r, &iw);

    if (!chosen) {
        /* the closest miss, in one line */
        char comb[512], lim[256], d0[48], bay[48];
        if (nmiss) {
            const sr_design_combo *cb = &res.combo[miss[0]];
            const sr_design_point *p = &cb->best;
            combo_text(m, cb, comb, sizeof comb);
            limit_text(c, m, cb, p, lim, sizeof lim);
            if (res.bay_blocks) {
                size_t k = (size_t)(cb->bay_blocked - 1);
                char vol[48];
                sr_report_format_value(d0, sizeof d0, p->d0[k], SR_Q_SIZE, c->units, 4);
                sr_report_format_value(vol, sizeof vol, p->pack[k].volume.hi, SR_Q_VOLUME, c->units, 3);
                sr_report_format_value(bay, sizeof bay, p->bay[k], SR_Q_VOLUME, c->units, 3);
                sr_cli_note(c, "no candidate fits its bay: the least '%s', a %s %s, packs into %s at the band end; its "
                               "bay holds %s",
                            m->stages[k].name, d0, p->family[k], vol, bay);
            }
            else if (p->note[0])
                sr_cli_note(c, "no design meets every limit; the closest combination, %s, cannot be flown: %s", comb,
                            p->note);
            else if (p->bay_capped) {
                size_t k = (size_t)(p->bay_capped - 1);
                sr_report_format_value(d0, sizeof d0, p->d0[k], SR_Q_SIZE, c->units, 4);
                sr_report_format_value(bay, sizeof bay, p->bay[k], SR_Q_VOLUME, c->units, 3);
                sr_cli_note(c, "no design meets every limit within the bays; the closest, %s, misses %s at %.2f %% of "
                               "its limit with the largest %s its %s bay holds (%s)",
                            comb, lim, 100.0 * p->worst.ratio, m->stages[k].name, bay, d0);
            } else
                sr_cli_note(c, "no design meets every limit; the closest, %s, misses %s at %.2f %% of its limit", comb,
                            lim, 100.0 * p->worst.ratio);
        }
        if (res.ncombos && nbefore)
            sr_cli_note(c, "the risk check dropped every design that met the limits");
    }
    for (size_t i = 0; i < nbefore && risk_n > 0; i++) {
        const sr_design_combo *cb = &res.combo[before[i]];
        if (cb->risk_dropped) {
            char comb[512];
            combo_text(m, cb, comb, sizeof comb);
            sr_cli_note(c, "risk check: dropped %s: %.3g %% of the samples break a limit (accepted %.3g %%)", comb,
                        100.0 * cb->risk, 100.0 * max_risk);
        }
    }
    if ((rc = sr_cli_emit(c, r)))
        goto out;
    if (o.write) {
        if (chosen) {
            if (sr_txn_write(c->txn, o.write, chosen->text, chosen->len, &e)) {
                rc = sr_cli_fail(c, "%s", e.msg);
                goto out;
            }
            sr_cli_note(c, "wrote %s (check it: sinkrate profile %s)", o.write, o.write);
        } else {
            sr_txn_drop(c->txn, o.write);
        }
    }
    if (c->plot_prefix && (rc = figure(c, m, &res, dopt.pareto_x, dopt.pareto_y, argc, argv)))
        goto out;
    rc = chosen ? SR_EXIT_OK : SR_EXIT_LIMIT;
out:
    sr_report_free(r);
    sr_design_result_free(&res);
    free(before);
    free(miss);
    if (have_doc)
        sr_yaml_free(&y);
    if (m) {
        sr_mission_release(m);
        free(m);
    }
    free(cat);
    return rc;
}
