/* profile_failcase.c - the failure cases of `sinkrate profile FILE`: each
 * section's drag without a canopy, the what-if descents of failure-cases:
 * (impact speed, energy, time to ground and drift of every section, judged
 * against the limits but never changing the exit code), free-fall warnings. */
#include "cli/profile_failcase.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli/common.h"
#include "cli/verdict.h"

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

void sr_cli_profile_report_free_drag(sr_report *r, const sr_cli *c, const sr_mission *m)
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

void sr_cli_profile_free_fall_warnings(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_profile_result *p,
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

static void stage_names(const sr_mission *m, unsigned set, char *buf, size_t len)
{
    buf[0] = '\0';
    for (size_t k = 0; k < m->nstages; k++)
        if ((set >> k) & 1u) {
            size_t l = strlen(buf);
            snprintf(buf + l, len - l, "%s%s", l ? " + " : "", m->stages[k].name);
        }
}

static const char *ATT_KEY[3] = {"broadside", "tumbling", "end_on"};

/* The attitude models in a note, once. */
static void attitude_note(sr_report *r, const sr_mission *m)
{
    int cyl = 0, disk = 0, end = 0;
    for (size_t i = 0; i < m->nsections; i++) {
        cyl |= m->sections[i].has_body && m->sections[i].shape == SR_BLUFF_CYLINDER;
        disk |= m->sections[i].has_body && m->sections[i].shape == SR_BLUFF_DISK;
        end |= m->sections[i].stable_end_on;
    }
    if (!cyl && !disk)
        return;
    sr_report_note(r, "Attitude of a falling body (failure cases): broadside is its highest drag, so the cases also "
                      "run it tumbling through every orientation (cross-flow principle, Hoerner 1965, from memory: "
                      "drag as the cube of the normal flow share, averaged over the sphere, our derivation: a "
                      "cylinder 3 pi/16 = 0.59 of broadside plus a quarter of its ends' drag, a disk 1/4 of "
                      "face-on)%s, and judge each limit at the worse.",
                   end ? " and end-on (Cd 0.82 on the end area, Hoerner 1965, from memory) where the file marks a "
                         "section stable-end-on (fins or a weighted nose keep it pointing into the flow)"
                       : "; a cylinder without fins is not stable end-on (common practice), so end-on is run only "
                         "for sections marked stable-end-on");
}

void sr_cli_profile_report_attitudes(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_failcase_result *f)
{
    (void)c;
    if (f->nattitudes < 2)
        return;
    sr_rtable *t = sr_report_table(r, "attitudes",
                                   "Impact speed in each attitude (descent rate at the ground, band end)");
    sr_rtable_text_column(t, "section", "section");
    for (size_t a = 0; a < f->nattitudes; a++)
        sr_rtable_column(t, ATT_KEY[f->attitude[a]], sr_bluff_attitude_name(f->attitude[a]), SR_Q_SPEED, 3);
    for (size_t i = 0; i < m->nsections; i++) {
        double row[SR_FAILCASE_MAX_ATTITUDES];
        for (size_t a = 0; a < f->nattitudes; a++)
            row[a] = f->impact[a][i];
        const char *txt[] = {m->sections[i].name};
        sr_rtable_row(t, row, txt);
    }
    attitude_note(r, m);
}

int sr_cli_profile_report_failures(sr_report *r, const sr_cli *c, const sr_mission *m, const sr_judge_limits *l,
                               sr_judge_basis basis)
{
    if (!m->nfailures)
        return 0;
    sr_failcase_result *fr = calloc(m->nfailures, sizeof *fr);
    if (!fr)
        return sr_cli_fail((sr_cli *)c, "out of memory");
    int ok[SR_MISSION_MAX_FAILURES] = {0};
    size_t natt = 1;
    sr_bluff_attitude atts[SR_FAILCASE_MAX_ATTITUDES];
    natt = sr_failcase_attitudes(m, atts);
    for (size_t i = 0; i < m->nfailures; i++) {
        sr_error e;
        if (sr_failcase_run(m, m->failures[i].failed, l, basis, NULL, &fr[i], &e)) {
            sr_report_warning(r, "failure case '%s' could not be computed: %s", m->failures[i].name, e.msg);
            continue;
        }
        ok[i] = 1;
    }
    sr_rtable *t = sr_report_table(r, "failure_case_list",
                                   "Failure cases (what-if descents listed in the file; judged against every limit, "
                                   "they never change the exit code)");
    sr_rtable_text_column(t, "case", "case");
    sr_rtable_text_column(t, "not_deploying", "stages that do not deploy");
    sr_rtable_text_column(t, "worse_attitude", "worse attitude");
    sr_rtable_text_column(t, "against_limits", "against the limits");
    for (size_t i = 0; i < m->nfailures; i++) {
        char names[200], status[600] = "not computed", breaches[500];
        stage_names(m, m->failures[i].failed, names, sizeof names);
        const char *att = "-";
        if (ok[i]) {
            const sr_verdict *v = &fr[i].verdict;
            double top = sr_cli_verdict_breaches(m, v, breaches, sizeof breaches);
            if (!v->nrows)
                snprintf(status, sizeof status, "no limits set");
            else if (!breaches[0])
                snprintf(status, sizeof status, "within the limits");
            else
                snprintf(status, sizeof status, "%s the limits: %s the limit", top >= FAR_BEYOND ? "FAR BEYOND" : "beyond",
                         breaches);
            att = sr_bluff_attitude_name(fr[i].attitude[fr[i].worse]);
        }
        const char *txt[] = {m->failures[i].name, names, att, status};
        sr_rtable_row(t, NULL, txt);
    }
    t = sr_report_table(r, "failure_cases",
                        "Failure cases per section (impact: descent rate at the ground at the band end, in each "
                        "attitude; energy at the worse)");
    sr_rtable_text_column(t, "case", "case");
    sr_rtable_text_column(t, "section", "section");
    sr_rtable_text_column(t, "lands_under", "lands under");
    for (size_t a = 0; a < natt; a++) {
        char key[48];
        snprintf(key, sizeof key, "impact_speed_%s", ATT_KEY[atts[a]]);
        sr_rtable_column(t, key, a == 0 ? "impact broadside" : sr_bluff_attitude_name(atts[a]), SR_Q_SPEED, 3);
    }
    sr_rtable_column(t, "energy", "energy", SR_Q_ENERGY, 3);
    sr_rtable_column(t, "time_to_ground", "time to ground", SR_Q_TIME, SR_FIXED(1));
    sr_rtable_column(t, "drift", "drift", SR_Q_LENGTH, SR_FIXED(0));
    for (size_t i = 0; i < m->nfailures; i++) {
        if (!ok[i])
            continue;
        const sr_failcase_result *f = &fr[i];
        const sr_profile_result *p = &f->band[f->worse].run[SR_BAND_TYPICAL];
        for (size_t s = 0; s < m->nsections; s++) {
            const sr_profile_body *b = &p->body[p->section_body[s]];
            char under[200], area[64];
            const sr_section *sec = &m->sections[s];
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
            } else if (sec->has_body)
                snprintf(under, sizeof under, "no canopy: '%s' Cd(Re) on %s",
                         sec->shape == SR_BLUFF_TABLE ? sec->curve.path : sec->curve.name, area);
            else if (sec->drag_area > 0)
                snprintf(under, sizeof under, "no canopy: drag area %s", area);
            else
                snprintf(under, sizeof under, "no canopy: no drag of its own");
            double row[SR_FAILCASE_MAX_ATTITUDES + 3];
            size_t n = 0;
            double energy = 0.0;
            for (size_t a = 0; a < natt; a++) {
                /* the attitudes of every case are the mission's */
                row[n++] = a < f->nattitudes ? f->impact[a][s] : NAN;
                if (a < f->nattitudes)
                    energy = fmax(energy, f->energy[a][s]);
            }
            row[n++] = energy;
            row[n++] = b->t_land;
            row[n++] = b->drift;
            const char *txt[] = {m->failures[i].name, m->sections[s].name, under};
            sr_rtable_row(t, row, txt);
        }
        /* far beyond a limit: repeated as a warning, with the worst breach */
        const sr_verdict *v = &f->verdict;
        int worst = -1;
        for (size_t k = 0; k < v->nrows; k++)
            if (v->row[k].exceeded && (worst < 0 || v->row[k].ratio > v->row[worst].ratio))
                worst = (int)k;
        if (worst >= 0 && v->row[worst].ratio >= FAR_BEYOND) {
            char label[200], a[64], b2[64];
            sr_cli_verdict_label(m, l, &v->row[worst], label, sizeof label);
            sr_quantity q = sr_cli_verdict_quantity(v->row[worst].kind);
            fmt(a, sizeof a, c, v->row[worst].judged, q, 4);
            fmt(b2, sizeof b2, c, v->row[worst].limit, q, 4);
            sr_report_warning(r, "failure case '%s': %s %s, %.1f times the limit %s: far beyond the limits (a what-if "
                                 "result; the exit code follows the nominal descent)",
                              m->failures[i].name, label, a, v->row[worst].ratio, b2);
        }
        char prefix[160];
        snprintf(prefix, sizeof prefix, "failure case '%s': ", m->failures[i].name);
        sr_cli_profile_free_fall_warnings(r, c, m, p, prefix);
        for (size_t b = 0; b < p->nbodies; b++) {
            const sr_profile_body *pb = &p->body[b];
            if (pb->no_drag) {
                char bn[256];
                sr_mission_set_name(m, pb->sections, bn, sizeof bn);
                sr_report_warning(r, "failure case '%s': %s fall%s with no canopy and no drag of its own (neither "
                                     "drag-area: nor body:): a fall in vacuum",
                                  m->failures[i].name, bn, strchr(bn, '+') ? "" : "s");
            }
            if (pb->free_fall && pb->equilibria == 1 && pb->speed_arrive < 0.99 * pb->v_terminal) {
                char bn[256], va[64], vt[64];
                sr_mission_set_name(m, pb->sections, bn, sizeof bn);
                fmt(va, sizeof va, c, pb->speed_arrive, SR_Q_SPEED, 3);
                fmt(vt, sizeof vt, c, pb->v_terminal, SR_Q_SPEED, 3);
                sr_report_note(r, "Failure case '%s': %s reaches the ground at %s, before its terminal speed %s.",
                               m->failures[i].name, bn, va, vt);
            }
        }
    }
    free(fr);
    attitude_note(r, m);
    sr_report_note(r, "Failure cases: the named stages do not deploy (no separation happens at them) and the descent "
                      "runs like the nominal one, full integration, at every band end; a body with no canopy open "
                      "falls with its sections' drag curves, integrated to the ground. They are judged against every "
                      "limit of the file (landing, deployment pressure, Mach envelope, opening load) by the same "
                      "judge as the nominal descent, at %s, but never change the exit code: only the nominal "
                      "descent does (`--fail STAGE` makes a failure case the descent).",
                   basis == SR_JUDGE_TYPICAL ? "the typical values (--limits-at typical)" : "the band end");
    return 0;
}
