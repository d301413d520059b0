/* profile_failcase.c - the failure cases of `sinkrate profile FILE`: each
 * section's drag without a canopy, the what-if descents of failure-cases:
 * (impact speed, energy, time to ground and drift of every section, judged
 * against the limits but never changing the exit code), free-fall warnings. */
#include "cli/profile_failcase.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

/* a what-if result this many times a limit is "far beyond" it */
#define FAR_BEYOND 2.0

static void fmt(char *buf, size_t len, const sr_cli *c, double v, sr_quantity q, int sig)
{
    sr_report_format_value(buf, len, v, q, c->units, sig);
}

static int any_body(const sr_mission *m)
{
    for (size_t i = 0; i < m->nsections; i++)
        if (m->sections[i].has_body)
            return 1;
    return 0;
}

static void body_text(const sr_cli *c, const sr_section *s, char *buf, size_t len)
{
    char d[64], l[64];
    fmt(d, sizeof d, c, s->body_d, SR_Q_LENGTH, 3);
    switch (s->shape) {
    case SR_BLUFF_SPHERE: snprintf(buf, len, "sphere, d %s", d); break;
    case SR_BLUFF_DISK: snprintf(buf, len, "disk normal to the flow, d %s", d); break;
    case SR_BLUFF_CYLINDER:
        fmt(l, sizeof l, c, s->body_length, SR_Q_LENGTH, 3);
        snprintf(buf, len, "cylinder broadside, d %s, L %s", d, l);
        break;
    default: snprintf(buf, len, "drag table, Re on d %s", d); break;
    }
}

void sr_profile_report_free_drag(sr_report *r, const sr_cli *c, const sr_mission *m)
{
    if (!any_body(m))
        return;
    sr_rtable *t = sr_report_table(r, "free_fall_drag",
                                   "Drag of the sections with no canopy open (Cd on the reference area named)");
    sr_rtable_text_column(t, "section", "section");
    sr_rtable_text_column(t, "body", "body");
    sr_rtable_text_column(t, "drag_curve", "drag curve Cd(Re)");
    sr_rtable_column(t, "reference_area", "ref. area", SR_Q_AREA, 3);
    sr_rtable_text_column(t, "area_is", "area is");
    sr_rtable_text_column(t, "valid_re", "valid Re");
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        char body[128], valid[64], curve[300];
        double row[1];
        if (s->has_body) {
            body_text(c, s, body, sizeof body);
            snprintf(curve, sizeof curve, "%s", s->shape == SR_BLUFF_TABLE ? s->curve.path : s->curve.name);
            if (isfinite(s->curve.re_max))
                snprintf(valid, sizeof valid, "%.3g .. %.3g", s->curve.re_min, s->curve.re_max);
            else
                snprintf(valid, sizeof valid, "%.3g and above", s->curve.re_min);
            row[0] = s->body_area;
            const char *txt[] = {s->name, body, curve, s->body_area_ref, valid};
            sr_rtable_row(t, row, txt);
        } else {
            row[0] = s->drag_area > 0 ? s->drag_area : NAN;
            const char *txt[] = {s->name, "-", s->drag_area > 0 ? "constant (drag-area:)" : "none given: no drag",
                                 s->drag_area > 0 ? "drag area Cd A, Cd included" : "-", "-"};
            sr_rtable_row(t, row, txt);
        }
    }
    for (size_t i = 0; i < m->nsections; i++) {
        const sr_section *s = &m->sections[i];
        int seen = 0;
        for (size_t j = 0; j < i; j++)
            seen |= m->sections[j].has_body && m->sections[j].curve.id == s->curve.id &&
                    strcmp(m->sections[j].curve.source, s->curve.source) == 0;
        if (s->has_body && !seen)
            sr_report_note(r, "Drag curve '%s': %s.", s->shape == SR_BLUFF_TABLE ? s->curve.path : s->curve.name,
                           s->curve.source);
    }
    sr_report_note(r, "A section's body: drag (Cd(Re) times its reference area, Re on its diameter in the local air) "
                      "acts only while no canopy is open on it; sections falling together add their drags (no "
                      "interference). Under a canopy it is neglected: the body hangs in another attitude there "
                      "(conservative; use drag-area: for a body that should count under the canopy).");
}

void sr_profile_free_fall_warnings(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_profile_result *p,
                                   const char *prefix)
{
    for (size_t i = 0; i < p->nbodies; i++) {
        const sr_profile_body *b = &p->body[i];
        if (!b->free_fall)
            continue;
        char bn[256], vf[64], va[64];
        sr_mission_set_name(m, b->sections, bn, sizeof bn);
        fmt(vf, sizeof vf, c, b->v_terminal, SR_Q_SPEED, 3);
        fmt(va, sizeof va, c, b->speed_arrive, SR_Q_SPEED, 3);
        if (b->equilibria > 1) {
            if (b->crisis)
                sr_report_warning(r, "%s%s: %d equilibrium speeds at the ground (drag crisis); the impact speed is "
                                     "the fastest stable one, %s (conservative); the integration arrived at %s",
                                  prefix, bn, b->equilibria, vf, va);
            else
                sr_report_warning(r, "%s%s: %d equilibrium speeds at the ground (drag crisis); it arrives at %s, "
                                     "the fastest stable one is %s",
                                  prefix, bn, b->equilibria, va, vf);
        }
        for (unsigned bit = 1; bit && bit <= b->drag_warn; bit <<= 1)
            if (b->drag_warn & bit)
                sr_report_warning(r, "%s%s at the ground: %s", prefix, bn, sr_bluff_warn_text(bit));
    }
}

/* "FAR BEYOND the limits: energy 15.7x, speed 5.0x" */
static void judge(const sr_mission *m, double speed, double energy, double time, double drift, char *buf,
                  size_t len, double *worst)
{
    struct {
        const char *what;
        double v, lim;
    } L[] = {{"energy", energy, m->limit_energy},
             {"speed", speed, m->limit_speed},
             {"time", time, m->limit_time},
             {"drift", drift, m->limit_drift}};
    char parts[160] = "";
    int any = 0;
    *worst = 0.0;
    for (size_t i = 0; i < sizeof L / sizeof L[0]; i++) {
        if (isnan(L[i].lim))
            continue;
        any = 1;
        double ratio = L[i].v / L[i].lim;
        if (!(ratio > 1.0))
            continue;
        *worst = fmax(*worst, ratio);
        size_t l = strlen(parts);
        snprintf(parts + l, sizeof parts - l, "%s%s %.1fx", l ? ", " : "", L[i].what, ratio);
    }
    if (!any)
        snprintf(buf, len, "no limits set");
    else if (!parts[0])
        snprintf(buf, len, "within the limits");
    else if (*worst >= FAR_BEYOND)
        snprintf(buf, len, "FAR BEYOND the limits: %s the limit", parts);
    else
        snprintf(buf, len, "beyond the limits: %s the limit", parts);
}

static void stage_names(const sr_mission *m, unsigned set, char *buf, size_t len)
{
    buf[0] = '\0';
    for (size_t k = 0; k < m->nstages; k++)
        if ((set >> k) & 1u) {
            size_t l = strlen(buf);
            snprintf(buf + l, len - l, "%s%s", l ? " + " : "", m->stages[k].name);
        }
}

typedef struct fc_run {
    sr_profile_ctx *ctx;
    sr_profile_result lo; /* the low end of the drag range: the faster landing */
} fc_run;

void sr_profile_report_failures(sr_report *r, const sr_cli *c, const sr_mission *m)
{
    if (!m->nfailures)
        return;
    sr_rtable *t = sr_report_table(r, "failure_case_list",
                                   "Failure cases (what-if descents listed in the file; they never change the exit "
                                   "code)");
    sr_rtable_text_column(t, "case", "case");
    sr_rtable_text_column(t, "not_deploying", "stages that do not deploy");
    for (size_t i = 0; i < m->nfailures; i++) {
        char names[200];
        stage_names(m, m->failures[i].failed, names, sizeof names);
        const char *txt[] = {m->failures[i].name, names};
        sr_rtable_row(t, NULL, txt);
    }
    t = sr_report_table(r, "failure_cases",
                                   "Failure cases per section (impact: descent rate at the ground; band end: the low "
                                   "end of the open canopies' drag range)");
    sr_rtable_text_column(t, "case", "case");
    sr_rtable_text_column(t, "section", "section");
    sr_rtable_text_column(t, "lands_under", "lands under");
    sr_rtable_column(t, "impact_speed", "impact speed", SR_Q_SPEED, 3);
    sr_rtable_column(t, "impact_speed_band_end", "band end", SR_Q_SPEED, 3);
    sr_rtable_column(t, "energy", "energy", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "energy_band_end", "band end", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "time_to_ground", "time to ground", SR_Q_TIME, SR_FIXED(1));
    sr_rtable_column(t, "drift", "drift", SR_Q_LENGTH, SR_FIXED(0));
    sr_rtable_text_column(t, "against_limits", "against the limits");
    sr_profile_work *w = NULL;
    sr_error e;
    if (sr_profile_work_new(&w, &e)) {
        sr_report_warning(r, "failure cases not computed: %s", e.msg);
        return;
    }
    int far = 0;
    for (size_t i = 0; i < m->nfailures; i++) {
        const sr_failure_case *f = &m->failures[i];
        sr_profile_opts po;
        sr_profile_opts_init(&po);
        po.failed = f->failed;
        fc_run run;
        run.ctx = NULL;
        sr_profile_perturb lo;
        sr_profile_perturb_init(&lo);
        for (size_t k = 0; k < m->nstages; k++) {
            sr_band b = sr_canopy_total_cds(&m->stages[k].canopy);
            lo.drag_scale[k] = b.lo / b.typ;
        }
        if (sr_profile_ctx_new(&run.ctx, m, &po, &e) ||
            sr_profile_run(run.ctx, &lo, SR_PROFILE_FULL, w, &run.lo, NULL, &e)) {
            sr_report_warning(r, "failure case '%s' could not be computed: %s", f->name, e.msg);
            sr_profile_ctx_free(run.ctx);
            continue;
        }
        const sr_profile_result *p = sr_profile_nominal(run.ctx);
        double worst_ratio = 0.0;
        size_t worst_sec = 0;
        for (size_t s = 0; s < m->nsections; s++) {
            const sr_profile_body *b = &p->body[p->section_body[s]];
            char under[200], status[256];
            const sr_section *sec = &m->sections[s];
            char area[64];
            fmt(area, sizeof area, c, sec->has_body ? sec->body_area : sec->drag_area, SR_Q_AREA, 3);
            if (b->canopies) {
                double cds = 0.0;
                for (size_t k = 0; k < m->nstages; k++)
                    if ((b->open >> k) & 1u)
                        cds += sr_canopy_total_cds(&m->stages[k].canopy).typ;
                char names[160], cs[64];
                stage_names(m, b->open, names, sizeof names);
                fmt(cs, sizeof cs, c, cds, SR_Q_AREA, 3);
                snprintf(under, sizeof under, "%s: drag area CdS %s", names, cs);
            }
            else if (sec->has_body)
                snprintf(under, sizeof under, "no canopy: '%s' Cd(Re) on %s",
                         sec->shape == SR_BLUFF_TABLE ? sec->curve.path : sec->curve.name, area);
            else if (sec->drag_area > 0)
                snprintf(under, sizeof under, "no canopy: drag area %s", area);
            else
                snprintf(under, sizeof under, "no canopy: no drag of its own");
            double ratio;
            judge(m, run.lo.section_rate[s], run.lo.section_energy[s], b->t_land, b->drift, status, sizeof status,
                  &ratio);
            if (ratio > worst_ratio) {
                worst_ratio = ratio;
                worst_sec = s;
            }
            double row[] = {p->section_rate[s], run.lo.section_rate[s], p->section_energy[s],
                            run.lo.section_energy[s], b->t_land, b->drift};
            const char *txt[] = {f->name, m->sections[s].name, under, status};
            sr_rtable_row(t, row, txt);
        }
        if (worst_ratio >= FAR_BEYOND) {
            far = 1;
            char v[64], en[64], lim[64];
            fmt(v, sizeof v, c, run.lo.section_rate[worst_sec], SR_Q_SPEED, 3);
            fmt(en, sizeof en, c, run.lo.section_energy[worst_sec], SR_Q_ENERGY, 3);
            if (!isnan(m->limit_energy)) {
                fmt(lim, sizeof lim, c, m->limit_energy, SR_Q_ENERGY, 4);
                sr_report_warning(r, "failure case '%s': %s lands at %s with %s, %.1f times the %s landing-energy "
                                     "limit: far beyond the limits (a what-if result; the exit code follows the "
                                     "nominal descent)",
                                  f->name, m->sections[worst_sec].name, v, en,
                                  run.lo.section_energy[worst_sec] / m->limit_energy, lim);
            } else {
                sr_report_warning(r, "failure case '%s': %s lands at %s with %s, far beyond the limits (a what-if "
                                     "result; the exit code follows the nominal descent)",
                                  f->name, m->sections[worst_sec].name, v, en);
            }
        }
        char prefix[160];
        snprintf(prefix, sizeof prefix, "failure case '%s': ", f->name);
        sr_profile_free_fall_warnings(r, c, m, p, prefix);
        for (size_t b = 0; b < p->nbodies; b++) {
            const sr_profile_body *pb = &p->body[b];
            if (pb->free_fall && pb->equilibria == 1 && pb->speed_arrive < 0.99 * pb->v_terminal) {
                char bn[256], va[64], vt[64];
                sr_mission_set_name(m, pb->sections, bn, sizeof bn);
                fmt(va, sizeof va, c, pb->speed_arrive, SR_Q_SPEED, 3);
                fmt(vt, sizeof vt, c, pb->v_terminal, SR_Q_SPEED, 3);
                sr_report_note(r, "Failure case '%s': %s reaches the ground at %s, before its terminal speed %s.",
                               f->name, bn, va, vt);
            }
        }
        sr_profile_ctx_free(run.ctx);
    }
    sr_profile_work_free(w);
    sr_report_note(r, "Failure cases: the named stages do not deploy (no separation happens at them) and the "
                      "descent runs like the nominal one, full integration, typical drag; a body with no canopy "
                      "open falls with its sections' drag curves, integrated to the ground. Impact speed and "
                      "energy use the descent rate, as the landing limits do. These what-if results are judged "
                      "against the limits (speed and energy at the band end%s) but never change the exit code: "
                      "only the nominal descent does.",
                   far ? "; some are far beyond them" : "");
}
