/* studyrun.c - one study of a case run to its CSV and its report section (holdfast run). */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/analysis.h"
#include "holdfast/balance.h"
#include "holdfast/criteria.h"
#include "holdfast/invert.h"
#include "holdfast/outputs.h"
#include "holdfast/report.h"
#include "holdfast/report_design.h"
#include "holdfast/results.h"
#include "holdfast/spread.h"
#include "holdfast/studyrun.h"
#include "holdfast/svg.h"
#include "holdfast/sweep.h"

/* ---- report pieces ---- */

static void report_fail_note(hf_report *rep, const char *what, const hf_error *e)
{
    char buf[HF_ERROR_TEXT + 128];
    snprintf(buf, sizeof buf, "%s could not be drawn: %s", what, e->text);
    hf_report_note(rep, "note", buf);
}

/* One elevation per group of identical lines of r at `pose` (at most `max`
 * groups; hf_report_line_groups), then every line overlaid in one figure
 * when there are two groups or more.  Broken and unsolved lines are left
 * out. */
static void report_elevations(hf_report *rep, const hf_model *m, const hf_spread_result *r,
                              const hf_pose *pose, size_t max, const char *when)
{
    size_t nl = m->nlines, *group = hf_malloc(nl * sizeof *group),
           *idx = hf_malloc(nl * sizeof *idx), shown = 0, ngroups = 0;
    hf_error e;
    hf_error_clear(&e);
    if (!group || !idx) {
        hf_error_set(&e, HF_ENOMEM, "out of memory");
        report_fail_note(rep, "The elevations", &e);
        nl = 0;
    } else {
        ngroups = hf_report_line_groups(m, pose, group);
    }
    for (size_t i = 0; i < nl && shown < max; i++) {
        size_t n = 0;
        for (size_t j = i; group[i] == i && j < nl; j++)
            if (group[j] == i && !r->broken[j] && r->states[j].status == HF_OK)
                idx[n++] = j;
        if (n == 0)
            continue;
        FILE *f = hf_report_figure_begin(rep);
        hf_status st = hf_report_svg_elevation_group(f, m, idx, n, &r->states[idx[0]], 0, &e);
        char cap[HF_MODEL_MAX_NAME + 200];
        if (n == 1)
            snprintf(cap, sizeof cap, "Line %s %s: profile and tension along the line.",
                     m->lines[idx[0]].name, when);
        else
            snprintf(cap, sizeof cap,
                     "%zu lines of one make-up and geometry (up to a rotation) %s, drawn once: "
                     "profile and tension along the line.",
                     n, when);
        hf_report_figure_end(rep, cap);
        if (st != HF_OK)
            report_fail_note(rep, "An elevation", &e);
        shown++;
    }
    if (ngroups > shown) {
        char buf[160];
        snprintf(buf, sizeof buf, "Elevations of the first %zu of %zu groups of lines are shown.",
                 shown, ngroups);
        hf_report_paragraph(rep, buf);
    }
    if (ngroups >= 2) {
        FILE *f = hf_report_figure_begin(rep);
        hf_status st = hf_report_svg_elevation_overlay(f, m, r, 0, &e);
        char cap[160];
        snprintf(cap, sizeof cap,
                 "Every line %s overlaid, each in its own vertical plane with its anchor at "
                 "distance 0.",
                 when);
        hf_report_figure_end(rep, cap);
        if (st != HF_OK)
            report_fail_note(rep, "The overlay", &e);
    }
    hf_free(group);
    hf_free(idx);
}

/* The rest pose: plan and every line's elevation. */
void hf_studyrun_rest(hf_report *rep, const hf_model *m)
{
    hf_report_section(rep, "Rest pose",
                      "The spread with the hull at the case's position and "
                      "heading, no load.");
    hf_error e;
    hf_error_clear(&e);
    FILE *f = hf_report_figure_begin(rep);
    hf_status st = hf_report_svg_plan(f, m, NULL, NULL, NULL, 0, &e);
    hf_report_figure_end(rep, "Plan of the spread at rest: hull, fairleads, lines and anchors.");
    if (st != HF_OK)
        report_fail_note(rep, "The plan", &e);
    hf_analysis_pose at;
    hf_analysis_pose_init(&at);
    static const double zero[3] = {0.0, 0.0, 0.0};
    if (hf_analysis_pose_solve(&at, m, zero, 0, &e) == HF_OK)
        report_elevations(rep, m, &at.res, &at.pose, 12, "at rest");
    else
        report_fail_note(rep, "The rest pose", &e);
    hf_analysis_pose_clear(&at);
}

static void fmt(char *buf, double v)
{
    hf_report_number(buf, 32, v, 4);
}

#define REPORT_SWEEP_MAX_CASES 20000
#define REPORT_SWEEP_MAX_CURVES 10

/* "<stem> (<unit for people>)" for a column named <stem>_<unit>, else the
 * name: "T_north_kN" -> "T_north (kN)", "site.depth_m" -> "site.depth (m)". */
static void axis_label(const char *name, const char *unit, const char *people, char *buf,
                       size_t cap)
{
    size_t n = strlen(name), k = strlen(unit);
    if (k && n > k + 1 && name[n - k - 1] == '_' && !strcmp(name + n - k, unit))
        snprintf(buf, cap, "%.*s (%s)", (int)(n - k - 1), name, people);
    else
        snprintf(buf, cap, "%s", name);
}

/* Axis label of output column 0 of t, from the output catalogue. */
static void output_label(const hf_sweep_table *t, char *buf, size_t cap)
{
    const hf_output_column *c = &t->cols[0];
    const hf_output_info *info = hf_output_info_of(c->kind);
    if (c->kind == HF_OUT_OFFSET && c->sub == 2)
        axis_label(t->col_names[0], "deg", "deg", buf, cap);
    else
        axis_label(t->col_names[0], info ? info->unit : "", info ? info->unit_text : "", buf, cap);
}

/* Axis label of varied parameter j of t: the column's unit after the path
 * ("site.depth_m", "..._N_per_m"), read for people ("N/m"). */
static void vary_label(const hf_sweep_table *t, const hf_study *s, size_t j, char *buf, size_t cap)
{
    const char *name = t->vary_names[j];
    size_t np = strlen(s->vary[j].path);
    if (strncmp(name, s->vary[j].path, np) != 0 || name[np] != '_') {
        snprintf(buf, cap, "%s", name);
        return;
    }
    char people[64];
    const char *u = name + np + 1;
    size_t o = 0;
    for (size_t i = 0; u[i] && o + 4 < sizeof people; i++) {
        if (!strncmp(u + i, "_per_", 5)) {
            people[o++] = '/';
            i += 4;
        } else if (!strncmp(u + i, "kNm", 3) && u[i + 3] != '_' && u[i + 3]) {
            people[o++] = u[i];
        } else {
            people[o++] = u[i] == '_' ? ' ' : u[i];
        }
    }
    people[o] = '\0';
    axis_label(name, u, people, buf, cap);
}

/* Shape of the sweep figure: x parameter ix, curve parameter ic, ncurves
 * curves of n points.  0 when no figure is drawn (too many cases or curves). */
static int sweep_shape(const hf_study *s, const hf_study_grid *g, size_t *ix, size_t *ic,
                       size_t *ncurves, size_t *n)
{
    *ix = *ic = 0;
    *ncurves = 1;
    *n = (size_t)g->ncases;
    if (!s->zip && s->nvary == 2) {
        *ix = g->count[1] >= g->count[0] ? 1 : 0;
        *ic = 1 - *ix;
        *ncurves = g->count[*ic];
        *n = g->count[*ix];
    }
    return g->ncases <= REPORT_SWEEP_MAX_CASES && (s->zip || s->nvary <= 2) &&
           *ncurves <= REPORT_SWEEP_MAX_CURVES;
}

/* Legend entries of the curves: the values of parameter ic, for people
 * (degrees for angles, kN for forces), into names (96 bytes each). */
static void sweep_legend(const hf_study *s, size_t ic, size_t ncurves, char *names, const char **cn)
{
    hf_dim d = s->vary[ic].dim;
    double scale = d == HF_DIM_ANGLE ? 180.0 / M_PI : d == HF_DIM_FORCE ? 1e-3 : 1.0;
    const char *u = d == HF_DIM_ANGLE ? "deg" : d == HF_DIM_FORCE ? "kN" : hf_dim_si(d);
    for (size_t c = 0; c < ncurves; c++) {
        char v[32];
        fmt(v, hf_study_vary_value(&s->vary[ic], c) * scale);
        snprintf(names + 96 * c, 96, "%s %s", v, u);
        cn[c] = names + 96 * c;
    }
}

/* Draws the figure of sweep s from the rows of t (the sweep's in-memory
 * table, never its CSV read back). */
static void sweep_figure(hf_report *rep, const hf_model *m, const hf_study *s,
                         const hf_study_grid *g, const hf_sweep_table *t, size_t ix, size_t ic,
                         size_t ncurves, size_t n)
{
    double *x = hf_malloc(n * sizeof *x), *y = hf_malloc(ncurves * n * sizeof *y);
    char *names = hf_malloc(ncurves * 96);
    const char **cn = hf_calloc(ncurves, sizeof *cn);
    if (x && y && names && cn && t->ncols > 0) {
        for (size_t i = 0; i < ncurves * n; i++)
            y[i] = NAN;
        size_t idx[HF_STUDY_MAX_VARY];
        for (uint64_t k = 0; k < t->nrows && k < g->ncases; k++) {
            hf_study_grid_index(g, k, idx);
            size_t i = ncurves > 1 ? idx[ix] : (size_t)k, c = ncurves > 1 ? idx[ic] : 0;
            x[i] = t->vary[k * t->nvary + ix];
            y[c * n + i] = t->out[k * t->ncols];
        }
        char xl[256], yl[256], buf[1024];
        vary_label(t, s, ix, xl, sizeof xl);
        output_label(t, yl, sizeof yl);
        sweep_legend(s, ic, ncurves, names, cn);
        hf_output_kind k0 = t->cols[0].kind;
        int util = k0 == HF_OUT_UTILISATION || k0 == HF_OUT_MAX_UTILISATION ||
                   k0 == HF_OUT_UTILISATION_AT || k0 == HF_OUT_MAX_UTILISATION_AT;
        /* Legend title: the last part of the curve parameter's path ("length");
         * the caption names the whole path. */
        const char *lt = strrchr(s->vary[ic].path, '.');
        lt = lt ? lt + 1 : s->vary[ic].path;
        double fi = m->criteria.factor_intact;
        hf_svg_sweep sw = {s->name,
                           xl,
                           yl,
                           n,
                           ncurves,
                           x,
                           y,
                           ncurves > 1 ? cn : NULL,
                           ncurves > 1 ? lt : NULL,
                           util && fi > 0,
                           fi > 0 ? 1.0 / fi : 0.0,
                           "intact limit 1/factor"};
        hf_error e;
        hf_error_clear(&e);
        FILE *fig = hf_report_figure_begin(rep);
        hf_status st = hf_svg_figure_sweep(fig, &sw, 0, &e);
        if (ncurves > 1)
            snprintf(buf, sizeof buf, "%s against %s, one curve per value of %s.", yl, xl,
                     s->vary[ic].path);
        else
            snprintf(buf, sizeof buf, "%s against %s.", yl, xl);
        hf_report_figure_end(rep, buf);
        if (st != HF_OK)
            report_fail_note(rep, "The sweep figure", &e);
    }
    hf_free(x);
    hf_free(y);
    hf_free(names);
    hf_free(cn);
}

/* The sweep's section: its size and a figure of its first output against
 * one varied parameter, one curve per value of a second one. */
static void report_sweep(hf_report *rep, const hf_model *m, const hf_study *s,
                         const hf_sweep_table *t)
{
    char head[HF_MODEL_MAX_NAME + 64], buf[1024];
    snprintf(head, sizeof head, "Sweep: %s", s->name);
    hf_report_section(rep, head, NULL);
    hf_study_grid g;
    hf_error e;
    if (hf_study_grid_init(&g, s->vary, s->nvary, s->zip, &e) != HF_OK)
        return;
    snprintf(buf, sizeof buf, "%llu cases (%s of %zu parameters); every row is in %s.csv.",
             (unsigned long long)g.ncases, s->zip ? "zipped lists" : "full grid", s->nvary,
             s->name);
    hf_report_paragraph(rep, buf);
    size_t ix, ic, ncurves, n;
    if (!sweep_shape(s, &g, &ix, &ic, &ncurves, &n) || !t) {
        hf_report_paragraph(rep, "No figure: figures are drawn for sweeps of up to 20,000 cases "
                                 "over one parameter, zipped lists, or two parameters with at "
                                 "most 10 values of one of them.");
        return;
    }
    sweep_figure(rep, m, s, &g, t, ix, ic, ncurves, n);
}

/* ---- per-kind studies through the library API; the CSV layouts are those of
 * the matching commands, from include/holdfast/results.h (docs/studies.md) ---- */

static hf_status run_lines(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    hf_analysis_pose at;
    hf_analysis_pose_init(&at);
    hf_status st = hf_analysis_pose_solve(&at, m, s->offset, 0, err);
    if (!at.ws)
        return st;
    const hf_spread_result r = at.res;
    /* A study whose pose does not solve fails as a whole (its file is not
     * kept), so the rows are those of 'holdfast lines --csv'. */
    oc->nonfinite += hf_results_lines_write(out, m, &r);
    if (st == HF_OK)
        snprintf(oc->note, sizeof oc->note, "%zu lines; max utilisation %.4f (%s)", m->nlines,
                 r.max_utilisation,
                 r.max_utilisation_line < m->nlines ? m->lines[r.max_utilisation_line].name : "-");
    char head[HF_MODEL_MAX_NAME + 64], intro[256];
    snprintf(head, sizeof head, "Lines: %s", s->name);
    snprintf(intro, sizeof intro,
             "Every line with the hull offset by %.4g m, %.4g m and %.4g deg from its rest pose.",
             s->offset[0], s->offset[1], s->offset[2] * 180.0 / M_PI);
    hf_report_section(rep, head, intro);
    if (st != HF_OK) {
        hf_report_note(rep, "warning", err->text);
    } else {
        static const char *const cols[] = {"line",
                                           "state",
                                           "fairlead tension (kN)",
                                           "horizontal (kN)",
                                           "vertical (kN)",
                                           "anchor tension (kN)",
                                           "grounded (m)",
                                           "utilisation"};
        hf_report_table_begin(rep, "Line states", cols, 8);
        for (size_t i = 0; i < m->nlines; i++) {
            const hf_line_state *ls = &r.states[i];
            char v[6][32];
            fmt(v[0], ls->tension / 1e3);
            fmt(v[1], ls->h / 1e3);
            fmt(v[2], ls->v / 1e3);
            fmt(v[3], ls->anchor_tension / 1e3);
            fmt(v[4], ls->grounded);
            fmt(v[5], ls->max_utilisation);
            const char *cells[8] = {m->lines[i].name,
                                    r.broken[i] ? "broken" : hf_line_regime_name(ls->regime),
                                    v[0],
                                    v[1],
                                    v[2],
                                    v[3],
                                    v[4],
                                    v[5]};
            hf_report_table_row(rep, cells);
        }
        hf_report_table_end(rep);
        if (s->offset[0] != 0.0 || s->offset[1] != 0.0 || s->offset[2] != 0.0)
            report_elevations(rep, m, &r, &at.pose, 12, "at this pose");
        else
            hf_report_paragraph(rep, "The pose is the rest pose: the elevations are above.");
    }
    hf_analysis_pose_clear(&at);
    return st;
}

static hf_status run_stiffness(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                               hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    const char *const *dof = hf_results_stiffness_columns + 1;
    hf_analysis_pose at;
    hf_analysis_pose_init(&at);
    hf_status st = hf_analysis_pose_solve(&at, m, s->offset, 1, err);
    const hf_spread_result r = at.res;
    double(*K)[6] = at.K;
    if (st == HF_OK) {
        oc->nonfinite += hf_results_stiffness_write(out, K, r.force);
        snprintf(oc->note, sizeof oc->note, "K11 %.6g kN/m, K22 %.6g kN/m, K66 %.6g kN m/rad",
                 K[0][0] / 1e3, K[1][1] / 1e3, K[5][5] / 1e3);
        char head[HF_MODEL_MAX_NAME + 64];
        snprintf(head, sizeof head, "Stiffness: %s", s->name);
        hf_report_section(rep, head,
                          "The 6x6 mooring stiffness K[i][j] = -dF_i/dq_j at the pose, and the "
                          "static mooring load on the hull.");
        hf_report_table_begin(rep,
                              "Stiffness (kN/m, kN/rad, kN m/m, kN m/rad) and static load "
                              "(kN, kN m)",
                              hf_results_stiffness_columns, HF_RESULTS_STIFFNESS_COLUMNS);
        double Kp[6][6], load[6];
        hf_results_stiffness_for_people(K, r.force, Kp, load);
        for (int i = 0; i < 6; i++)
            hf_report_table_row_numbers(rep, dof[i], Kp[i], 5);
        hf_report_table_row_numbers(rep, "static load", load, 5);
        hf_report_table_end(rep);
    }
    hf_analysis_pose_clear(&at);
    return st;
}

static hf_status run_curve(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.from = s->from;
    v.to = s->to;
    v.step = s->step;
    size_t n = hf_study_vary_count(&v);
    if (n == 0 || n > HF_STUDY_MAX_VALUES)
        return hf_error_set(err, HF_EINVAL, "curve study %s: invalid range", s->name);
    if (hf_results_curve_header_write(out, m, err) != HF_OK)
        return err->status;
    hf_analysis_curve *c = hf_analysis_curve_alloc(m, n, err);
    if (!c ||
        hf_analysis_curve_compute(c, m, s->direction, s->from, s->to, s->step, err) != HF_OK) {
        hf_analysis_curve_free(c);
        return err->status;
    }
    /* A failed offset keeps its row with the values left empty (the command
     * stops at such a point; a study keeps going and counts it). */
    size_t nonfinite = 0;
    for (size_t k = 0; k < n; k++)
        nonfinite += hf_results_curve_row_write(out, m, c, k);
    oc->nonfinite += nonfinite;
    char dir[32]; /* one convention: 0-360 deg counter-clockwise from x */
    hf_svg_direction_label(s->direction, dir, sizeof dir);
    snprintf(oc->note, sizeof oc->note, "%zu offsets along %s, %zu failed", n, dir, c->nfailed);
    char head[HF_MODEL_MAX_NAME + 64], label[64];
    snprintf(head, sizeof head, "Restoring curve: %s", s->name);
    snprintf(label, sizeof label, "direction %s", dir);
    hf_report_section(rep, head,
                      "Restoring force and stiffness against a horizontal offset of the hull "
                      "along one direction, heading fixed; line tensions and utilisations.");
    if (n >= 2) {
        hf_error e;
        hf_error_clear(&e);
        FILE *f = hf_report_figure_begin(rep);
        hf_status st = hf_report_svg_curve(f, m, c, s->name, label, 0, 0, &e);
        hf_report_figure_end(rep, "Restoring force, stiffness, line tensions and utilisations "
                                  "against offset; the utilisation limit is 1 / the intact "
                                  "factor.");
        if (st != HF_OK)
            report_fail_note(rep, "The curve", &e);
    }
    if (c->nfailed) {
        char buf[128];
        snprintf(buf, sizeof buf, "%zu of %zu offsets did not solve (gaps in the curves).",
                 c->nfailed, n);
        hf_report_note(rep, "warning", buf);
    }
    hf_analysis_curve_free(c);
    return HF_OK;
}

/* A balance study's writers: the CSV rows and the report's checks.  m is
 * the model at the level being run (hf_analysis_envelope_sink.level_begin:
 * a copy with site.water_level set, whose loads have m's indices). */
typedef struct {
    const hf_model *m;
    FILE *out;
    hf_report *rep;
    size_t nonfinite;
    size_t level, nlevels;        /* the level being run (index) of how many */
    size_t *line_failed;          /* per line: conditions whose line check failed */
    hf_analysis_where *line_fail; /* per line: the first of them */
} balance_ctx;

/* The requirement and the result of condition r, for the report. */
static void balance_check(const balance_ctx *c, const hf_load *l, const hf_balance_result *r)
{
    char cond[HF_MODEL_MAX_NAME + 16];
    hf_results_balance_condition(c->m, r, cond, sizeof cond);
    char item[2 * HF_MODEL_MAX_NAME + 32], req[128], res[384], a[32], b2[32], why[160];
    hf_results_balance_failure(c->m, r, why, sizeof why); /* the failing number, if any */
    if (c->nlevels > 1) {
        char lv[32];
        hf_report_number(lv, sizeof lv, c->m->site.water_level, 4);
        snprintf(item, sizeof item, "load %s, %s, water level %s m", l->name, cond, lv);
    } else {
        snprintf(item, sizeof item, "load %s, %s", l->name, cond);
    }
    double need = hf_criteria_required(&c->m->criteria, r->broken != HF_BALANCE_NONE);
    fmt(a, need);
    if (need > 0)
        snprintf(req, sizeof req, "MBL/T at least %s%s", a,
                 r->offset_checked ? "; offset within the limit" : "");
    else
        snprintf(req, sizeof req, "%s",
                 r->offset_checked ? "offset within the limit" : "equilibrium");
    if (r->status != HF_OK) {
        snprintf(res, sizeof res, "%s%s%.180s", hf_status_str(r->status), r->message[0] ? ": " : "",
                 r->message);
    } else {
        fmt(a, r->max_utilisation > 0 ? 1.0 / r->max_utilisation : 0.0);
        fmt(b2, r->horizontal);
        snprintf(res, sizeof res, "MBL/T %s (%s), offset %s m, governing: %s%s%s", a,
                 hf_results_line_name(c->m, r->max_utilisation_line), b2,
                 hf_balance_criterion_name(r->criterion), why[0] ? "; " : "", why);
    }
    hf_report_check(c->rep, item, req, res, r->passed);
}

/* What the check of condition r covered, for the report's verdict: the
 * load case, the condition and the still water level it was solved at. */
static void balance_scope(const balance_ctx *c, const hf_load *l, const hf_balance_result *r)
{
    size_t load = l >= c->m->loads && l < c->m->loads + c->m->nloads
                      ? (size_t)(l - c->m->loads)
                      : hf_model_load_find(c->m, l->name);
    size_t cond = r->broken == HF_BALANCE_NONE ? 0 : r->broken + 1;
    hf_report_scope_add(c->rep, load, cond, c->m->site.water_level);
}

/* Counts the lines of condition r that fail their line check (overload
 * included), for the per-line table over the envelope. */
static void balance_lines(balance_ctx *c, const hf_load *l, const hf_balance_result *r)
{
    if (r->status != HF_OK || !c->line_failed)
        return;
    for (size_t i = 0; i < r->nlines && i < c->m->nlines; i++) {
        int over = hf_criteria_overloaded(r->utilisation[i]) && r->broken != i;
        if ((r->line[i].passed || r->broken == i) && !over)
            continue;
        if (!c->line_failed[i]++) {
            hf_analysis_where w = {hf_model_load_find(c->m, l->name),
                                   r->broken == HF_BALANCE_NONE ? 0 : r->broken + 1,
                                   c->m->site.water_level};
            c->line_fail[i] = w;
        }
    }
}

static hf_status balance_row(void *ctx, const hf_load *l, const hf_balance_result *r, hf_error *err)
{
    balance_ctx *c = ctx;
    (void)err;
    c->nonfinite += hf_results_balance_row_write(c->out, c->m, l, r);
    balance_check(c, l, r);
    balance_scope(c, l, r);
    balance_lines(c, l, r);
    return HF_OK;
}

/* After a load case: the plan at its intact equilibrium. */
static hf_status balance_plan(void *ctx, const hf_load *l, hf_status intact, const double offset[3],
                              hf_error *err)
{
    balance_ctx *c = ctx;
    (void)err;
    if (intact != HF_OK || c->level > 0) /* plans at the first level only */
        return HF_OK;
    hf_pose pose;
    hf_spread_pose_rest(c->m, &pose);
    hf_spread_pose_offset(&pose, offset);
    hf_error fe;
    hf_error_clear(&fe);
    FILE *f = hf_report_figure_begin(c->rep);
    hf_status fs = hf_report_svg_plan(f, c->m, &pose, NULL, l, 0, &fe);
    char cap[HF_MODEL_MAX_NAME + 96];
    char lv[32];
    hf_report_number(lv, sizeof lv, c->m->site.water_level, 4);
    snprintf(cap, sizeof cap,
             "Plan at the intact equilibrium under load %s (still water level %s m).", l->name, lv);
    hf_report_figure_end(c->rep, cap);
    if (fs != HF_OK)
        report_fail_note(c->rep, "The plan", &fe);
    return HF_OK;
}

/* "<load>, <condition>, <level> m" of w, the level to 4 significant digits
 * as everywhere in the report ("-" when nothing was found). */
static void where_text(const hf_model *m, const hf_analysis_where *w, char *buf, size_t cap)
{
    if (w->load >= m->nloads) {
        snprintf(buf, cap, "-");
        return;
    }
    char lv[32];
    hf_report_number(lv, sizeof lv, w->level, 4);
    if (w->cond == 0)
        snprintf(buf, cap, "%s, intact, %s m", m->loads[w->load].name, lv);
    else
        snprintf(buf, cap, "%s, broken:%s, %s m", m->loads[w->load].name,
                 hf_results_line_name(m, w->cond - 1), lv);
}

/* The anchor cell of line i over envelope line el: kind, the governing
 * numbers against their requirement, where, PASS/FAIL ("" for no result). */
static int envelope_anchor_cell(const hf_model *m, size_t i, const hf_analysis_envelope_line *el,
                                char *buf, size_t cap)
{
    const hf_anchor *a = &m->lines[i].anchor_spec;
    char w[2 * HF_MODEL_MAX_NAME + 64], x[32], y[32];
    if (el->anchor_load_at.load == (size_t)-1) {
        snprintf(buf, cap, "no result");
        return 1;
    }
    fmt(x, el->anchor_load / 1e3);
    fmt(y, el->angle * 180.0 / M_PI);
    int n = snprintf(buf, cap, "%s: largest load %s kN, uplift angle %s deg",
                     hf_criteria_anchor_kind_name(a->kind), x, y);
    if (a->kind == HF_ANCHOR_GRAVITY && n > 0 && (size_t)n < cap) {
        double rs, ru;
        hf_criteria_block_required(&m->criteria, a, &rs, &ru);
        char r1[32], r2[32];
        fmt(r1, rs);
        fmt(r2, ru);
        fmt(x, el->sliding);
        fmt(y, el->uplift);
        where_text(m, &el->sliding_at, w, sizeof w);
        n += snprintf(buf + n, cap - (size_t)n, "; sliding factor %s (at least %s) at %s",
                      el->sliding_at.load != (size_t)-1 ? x : "- (never pulled)", r1, w);
        if ((size_t)n < cap)
            n += snprintf(buf + n, cap - (size_t)n, "; uplift factor %s (at least %s)",
                          el->uplift_at.load != (size_t)-1 ? y : "- (never lifted)", r2);
    } else if (a->kind == HF_ANCHOR_DRAG && n > 0 && (size_t)n < cap) {
        fmt(x, a->max_uplift_angle * 180.0 / M_PI);
        n += snprintf(buf + n, cap - (size_t)n, " (allowed %s)", x);
    }
    if (el->anchor_failed && n > 0 && (size_t)n < cap) {
        where_text(m, &el->anchor_fail_at, w, sizeof w);
        snprintf(buf + n, cap - (size_t)n, "; FAIL in %zu conditions, first %s", el->anchor_failed,
                 w);
    } else if ((a->kind == HF_ANCHOR_PILE || a->kind == HF_ANCHOR_PLATE) && n > 0 &&
               (size_t)n < cap) {
        snprintf(buf + n, cap - (size_t)n, " (reported, not checked)");
    }
    return !el->anchor_failed;
}

/* The answer to "which line is worst over the envelope, where, and does it
 * pass": one row per line (issue 13). */
static void report_envelope(hf_report *rep, const hf_model *m, const hf_analysis_envelope *e,
                            const balance_ctx *c)
{
    static const char *const cols[] = {"line",        "worst tension (kN)",
                                       "utilisation", "where (load, condition, water level)",
                                       "line check",  "anchor over the envelope",
                                       "verdict"};
    char cap[600], lo[32], hi[32];
    hf_report_number(lo, sizeof lo, e->level[0], 4);
    hf_report_number(hi, sizeof hi, e->level[e->nlevels - 1], 4);
    snprintf(cap, sizeof cap,
             "Worst of each line over %zu load case%s \xc3\x97 %zu still water level%s "
             "(%s%s%s m) \xc3\x97 %zu conditions (intact and each line broken)",
             e->nloads, e->nloads == 1 ? "" : "s", e->nlevels, e->nlevels == 1 ? "" : "s",
             e->nlevels > 1 ? lo : "", e->nlevels > 1 ? " to " : "", e->nlevels > 1 ? hi : lo,
             m->nlines + 1);
    hf_report_table_begin(rep, cap, cols, 7);
    for (size_t i = 0; i < m->nlines && i < e->nlines; i++) {
        const hf_analysis_envelope_line *el = &e->line[i];
        char t[32], u[48], w[2 * HF_MODEL_MAX_NAME + 64], lc[2 * HF_MODEL_MAX_NAME + 160],
            an[4 * HF_MODEL_MAX_NAME + 400];
        int found = el->at.load != (size_t)-1;
        fmt(t, el->tension / 1e3);
        hf_report_number(u, sizeof u, el->utilisation, 4);
        if (found && hf_criteria_overloaded(el->utilisation))
            strcat(u, " OVERLOADED");
        where_text(m, &el->at, w, sizeof w);
        size_t nf = c->line_failed ? c->line_failed[i] : 0;
        if (nf) {
            char fw[2 * HF_MODEL_MAX_NAME + 64];
            where_text(m, &c->line_fail[i], fw, sizeof fw);
            snprintf(lc, sizeof lc, "FAIL in %zu conditions, first %s", nf, fw);
        } else {
            char f1[32], f2[32];
            fmt(f1, el->min_factor);
            fmt(f2, hf_criteria_required(&m->criteria, el->factor_at.cond != 0));
            snprintf(lc, sizeof lc, "smallest MBL/T %s (required %s there)", f1, f2);
        }
        int anchor_ok = envelope_anchor_cell(m, i, el, an, sizeof an);
        int ok = found && !nf && anchor_ok && !hf_criteria_overloaded(el->utilisation);
        const char *cells[7] = {m->lines[i].name,
                                found ? t : "-",
                                found ? u : "-",
                                found ? w : "no result",
                                lc,
                                an,
                                !found ? "no result"
                                : ok   ? "PASS"
                                       : "FAIL"};
        hf_report_table_row(rep, cells);
    }
    hf_report_table_end(rep);
}

/* Each level of the envelope: the model at that level for the rows. */
static hf_status balance_level(void *ctx, size_t k, double level, const hf_model *at, hf_error *err)
{
    balance_ctx *c = ctx;
    (void)level, (void)err;
    c->m = at;
    c->level = k;
    return HF_OK;
}

/* The load cases of balance study s into which[] (*n; 0 = all). */
static hf_status balance_loads(const hf_model *m, const hf_study *s, size_t **which, size_t *n,
                               hf_error *err)
{
    *n = s->nloads;
    *which = hf_calloc(*n ? *n : 1, sizeof **which);
    if (!*which)
        return hf_error_set(err, HF_ENOMEM, "balance study %s: out of memory", s->name);
    for (size_t l = 0; l < *n; l++)
        if (((*which)[l] = hf_model_load_find(m, s->loads[l])) >= m->nloads)
            return hf_error_set(err, HF_EINVAL, "balance study %s: no load named %s", s->name,
                                s->loads[l]);
    return HF_OK;
}

static hf_status run_balance(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                             hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    size_t nwhich, *which = NULL;
    size_t nlev = hf_analysis_envelope_levels(m, NULL, 0);
    hf_analysis_envelope *e = NULL;
    hf_status st = balance_loads(m, s, &which, &nwhich, err);
    if (st == HF_OK && !(e = hf_analysis_envelope_alloc(m, nlev, err)))
        st = err->status;
    if (st == HF_OK)
        st = hf_results_balance_header_write(out, m, err);
    if (st != HF_OK) {
        hf_free(which);
        hf_analysis_envelope_free(e);
        return st;
    }
    hf_analysis_envelope_levels(m, e->level, nlev);
    char head[HF_MODEL_MAX_NAME + 64], intro[1024], scope[512];
    snprintf(head, sizeof head, "Mean position under load: %s", s->name);
    char lv[64];
    if (nlev == 1)
        snprintf(lv, sizeof lv, "at the case's still water level");
    else
        snprintf(lv, sizeof lv, "at each of the %zu still water levels the case declares", nlev);
    snprintf(intro, sizeof intro,
             "Equilibrium in surge, sway and yaw under each load case, intact and with each line "
             "broken in turn, %s, checked against the case's criteria%s.",
             lv,
             m->criteria.anchor_ignore_friction
                 ? "; anchor loads with the grounded line's seabed friction ignored "
                   "(criteria.anchor_line_friction: ignore)"
                 : "; anchor loads as solved, the grounded line's seabed friction included");
    hf_report_section(rep, head, intro);
    balance_ctx c = {m,
                     out,
                     rep,
                     0,
                     0,
                     nlev,
                     hf_calloc(m->nlines, sizeof *c.line_failed),
                     hf_calloc(m->nlines, sizeof *c.line_fail)};
    hf_analysis_envelope_sink sink = {{&c, NULL, balance_row, balance_plan, NULL}, balance_level};
    hf_error ee;
    hf_error_clear(&ee);
    st = hf_analysis_envelope_run(e, m, nwhich ? which : NULL, nwhich, &sink, &ee);
    hf_free(which);
    if (st != HF_OK) {
        hf_free(c.line_failed);
        hf_free(c.line_fail);
        hf_analysis_envelope_free(e);
        return hf_error_set(err, ee.status, "balance study %s: %.900s", s->name, ee.text);
    }
    if (!c.line_failed || !c.line_fail) {
        hf_free(c.line_failed);
        hf_free(c.line_fail);
        hf_analysis_envelope_free(e);
        return hf_error_set(err, HF_ENOMEM, "balance study %s: out of memory", s->name);
    }
    report_envelope(rep, m, e, &c);
    hf_free(c.line_failed);
    hf_free(c.line_fail);
    hf_results_envelope_scope(m, e, scope, sizeof scope);
    oc->nonfinite += c.nonfinite;
    oc->criterion_failed = e->count.failed > 0 || e->overloaded > 0;
    char over[2 * HF_MODEL_MAX_NAME + 160] = "";
    if (e->overloaded) {
        char ow[2 * HF_MODEL_MAX_NAME + 64];
        hf_results_where(m, &e->overload_at, ow, sizeof ow);
        snprintf(over, sizeof over, "; OVERLOADED: line %s at utilisation %.3f (%s)",
                 hf_results_line_name(m, e->overload_line), e->overload_utilisation, ow);
    }
    snprintf(oc->note, sizeof oc->note,
             "%s; %zu conditions failed a criterion (%zu without equilibrium)%s", scope,
             e->count.failed, e->count.noresult, over);
    hf_analysis_envelope_free(e);
    return HF_OK;
}

static hf_status run_sweep(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    hf_sweep *sw = hf_sweep_alloc(m, s->vary, s->nvary, s->zip, (const char *const *)s->outputs,
                                  s->noutputs, jobs, err);
    if (!sw)
        return err->status;
    hf_sweep_range r;
    memset(&r, 0, sizeof r);
    r.end = hf_sweep_ncases(sw);
    /* The rows the report's figure can use stay in memory (at most
     * REPORT_SWEEP_MAX_CASES; the CSV receives every row). */
    uint64_t cap = r.end < REPORT_SWEEP_MAX_CASES ? r.end : REPORT_SWEEP_MAX_CASES;
    oc->table = hf_sweep_table_alloc(sw, cap ? cap : 1, err);
    hf_status st = oc->table ? hf_sweep_write_header(sw, out, err) : err->status;
    if (st == HF_OK)
        st = hf_sweep_run(sw, &r, out, oc->table, err);
    if (st == HF_OK)
        snprintf(oc->note, sizeof oc->note, "%llu cases, %llu did not solve",
                 (unsigned long long)r.end, (unsigned long long)hf_sweep_failed_count(sw));
    hf_sweep_free(sw);
    return st;
}

static hf_status run_invert(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                            hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    char text[2 * HF_MODEL_MAX_NAME + 64];
    hf_invert_target_text(s->target_output, s->target_line, text, sizeof text);
    hf_output o;
    hf_status st = hf_output_parse(m, text, &o, err);
    if (st != HF_OK || s->nvary != 1)
        return st != HF_OK ? st : hf_error_set(err, HF_EINVAL, "invert study needs one parameter");
    hf_invert_result res;
    st = hf_invert_solve(m, s->vary[0].path, s->vary[0].from, s->vary[0].to, &o, s->target_value,
                         &res, err);
    if (st != HF_OK)
        return st;
    int deg = s->vary[0].dim == HF_DIM_ANGLE;
    snprintf(oc->note, sizeof oc->note, "%s = %.10g %s meets %s (relative error %.2g)",
             s->vary[0].path, deg ? res.value * 180.0 / M_PI : res.value,
             deg ? "deg" : hf_dim_si(s->vary[0].dim), text, res.relative_error);
    char head[HF_MODEL_MAX_NAME + 64];
    snprintf(head, sizeof head, "Design inversion: %s", s->name);
    hf_report_section(rep, head, NULL);
    char para[HF_ERROR_TEXT];
    double sc = 1e-3;
    const char *ou = "kN";
    switch (hf_output_dim(&o)) {
    case HF_DIM_NONE:
        sc = 1.0;
        ou = "";
        break;
    case HF_DIM_FORCE_PER_LENGTH:
        ou = "kN/m";
        break;
    case HF_DIM_MOMENT:
        ou = "kN m/rad";
        break;
    case HF_DIM_LENGTH:
        sc = 1.0;
        ou = "m";
        break;
    default:
        break;
    }
    double vs = deg ? 180.0 / M_PI : 1.0;
    const char *vu = deg ? "deg" : hf_dim_si(s->vary[0].dim);
    snprintf(para, sizeof para,
             "%s = %.8g %s gives %s = %.8g %s at the rest pose (target %.8g %s, relative error "
             "%.2g; GSL Brent bracketing in [%.6g, %.6g] %s, %d iterations).",
             s->vary[0].path, res.value * vs, vu, text, res.achieved * sc, ou, s->target_value * sc,
             ou, res.relative_error, res.lo * vs, res.hi * vs, vu, res.iterations);
    hf_report_paragraph(rep, para);
    return hf_invert_write_csv(out, m, s->vary[0].path, &o, s->target_value, &res, err);
}

/* A design study (issue 14): report_design.c does the work. */
static hf_status run_design(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                            hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    hf_report_design_count n;
    hf_status st = hf_report_design_study(m, s, out, rep, &n, err);
    if (st != HF_OK)
        return st;
    oc->nonfinite += n.nonfinite;
    oc->criterion_failed = n.failed + n.noresult > 0;
    snprintf(oc->note, sizeof oc->note,
             "%zu conditions; %zu failed a criterion, %zu without a result", n.conditions, n.failed,
             n.noresult);
    return HF_OK;
}

/* ---- the default studies of a case without a studies: section ---- */

/* The 1-2-5 round number at or above x > 0 (1, 2, 5, 10, 20, ...). */
static double round_up_125(double x)
{
    double p = pow(10.0, floor(log10(x)));
    static const double f[] = {1.0, 2.0, 5.0, 10.0};
    for (int i = 0; i < 4; i++)
        if (f[i] * p >= x * (1.0 - 1e-12))
            return f[i] * p;
    return 10.0 * p;
}

double hf_studyrun_default_range(const hf_model *m)
{
    double r = 1.5 * m->criteria.max_offset;
    if (!(r > 0)) {
        hf_pose pose;
        hf_spread_pose_rest(m, &pose);
        double dmin = INFINITY;
        for (size_t i = 0; i < m->nlines; i++) {
            hf_spread_geom g;
            if (hf_spread_line_geometry(m, i, &pose, &g, NULL) == HF_OK && g.x < dmin)
                dmin = g.x;
        }
        r = isfinite(dmin) ? 0.1 * dmin : 1.0;
    }
    return round_up_125(r < 1.0 ? 1.0 : r);
}

/* Appends a study of kind k named `name` to sl (capacity 5). */
static hf_study *add_default(hf_study_list *sl, const char *name, hf_study_kind k)
{
    hf_study *s = &sl->v[sl->n];
    memset(s, 0, sizeof *s);
    s->kind = k;
    if (!(s->name = hf_strdup(name)))
        return NULL;
    sl->n++;
    return s;
}

hf_status hf_studyrun_defaults(const hf_model *m, hf_study_list *sl, hf_error *err)
{
    hf_study_list_free(sl);
    if (!m || m->nlines == 0)
        return hf_error_set(err, HF_EINVAL, "default studies: the case has no lines");
    if (!(sl->v = hf_calloc(5, sizeof *sl->v)))
        return hf_error_set(err, HF_ENOMEM, "out of memory for the default studies");
    double r = hf_studyrun_default_range(m), h = m->hull.heading;
    hf_study *s[5] = {add_default(sl, "rest", HF_STUDY_LINES),
                      add_default(sl, "stiffness", HF_STUDY_STIFFNESS),
                      add_default(sl, "surge-curve", HF_STUDY_CURVE),
                      add_default(sl, "sway-curve", HF_STUDY_CURVE),
                      m->nloads ? add_default(sl, "balance", HF_STUDY_BALANCE) : NULL};
    if (sl->n != (m->nloads ? 5u : 4u)) { /* a name could not be copied */
        hf_study_list_free(sl);
        return hf_error_set(err, HF_ENOMEM, "out of memory for the default studies");
    }
    for (int i = 2; i < 4; i++) {
        s[i]->direction = h + (i == 3 ? M_PI / 2 : 0.0);
        s[i]->from = -r;
        s[i]->to = r;
        s[i]->step = r / 20.0;
    }
    return HF_OK;
}

/* The study of each kind, indexed by hf_study_kind (the order of hf_study_kind_name). */
typedef hf_status (*study_fn)(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                              hf_report *rep, hf_studyrun_outcome *oc, hf_error *err);
static const study_fn run_kind[] = {run_lines, run_curve,  run_stiffness, run_balance,
                                    run_sweep, run_invert, run_design};
_Static_assert(sizeof run_kind / sizeof run_kind[0] == HF_STUDY_DESIGN + 1,
               "one study function per hf_study_kind");

hf_status hf_studyrun_exec(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, hf_studyrun_outcome *oc, hf_error *err)
{
    memset(oc, 0, sizeof *oc);
    if ((unsigned)s->kind > HF_STUDY_DESIGN)
        return hf_error_set(err, HF_EINVAL, "study %s: unknown kind", s->name);
    return run_kind[s->kind](m, s, jobs, out, rep, oc, err);
}

void hf_studyrun_finish(hf_report *rep, const hf_model *m, const hf_study *s,
                        hf_studyrun_outcome *oc, int committed)
{
    if (committed && s->kind == HF_STUDY_SWEEP)
        report_sweep(rep, m, s, oc->table);
    hf_sweep_table_free(oc->table);
    oc->table = NULL;
}
