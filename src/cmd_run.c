/* cmd_run.c - 'holdfast run': every study of a case into a results folder. */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include "holdfast/alloc.h"
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/cli.h"
#include "holdfast/invert.h"
#include "holdfast/outfile.h"
#include "holdfast/report.h"
#include "holdfast/results.h"
#include "holdfast/svg.h"
#include "holdfast/spread.h"
#include "holdfast/study.h"
#include "holdfast/sweep.h"

static const char usage_text[] =
    "usage: holdfast run CASE [--out DIR] [--jobs N] [--quiet]\n"
    "\n"
    "Runs every study of the case's studies: list and writes DIR/<study>.csv for\n"
    "each, DIR/report.html and DIR/summary.txt.  DIR defaults to <case file name without\n"
    "extension>-results.  Every file is written to a temporary file and renamed\n"
    "into place when complete: an interrupted or failed run leaves no partial\n"
    "file (files of studies finished before the interruption stay).\n"
    "\n"
    "  --out DIR   results folder (created when missing)\n"
    "  --jobs N    threads for sweep studies (default: every processor)\n"
    "  --quiet     print nothing but errors\n"
    "\n"
    "See docs/studies.md.  Exit status: 0 ok, 1 a criterion failed in a balance\n"
    "study, 2 bad input, 3 numerical failure (other studies still run).\n";

static const char *const kind_name[] = {"lines",   "curve", "stiffness",
                                        "balance", "sweep", "invert"};

/* Outcome of one study, for the summary and the exit status. */
typedef struct {
    hf_status status;              /* HF_OK or why the study failed */
    int criterion_failed;          /* balance: some condition failed a criterion */
    char note[HF_ERROR_TEXT + 64]; /* one line for the summary */
} outcome;

/* ---- report pieces ---- */

static void report_fail_note(hf_report *rep, const char *what, const hf_error *e)
{
    char buf[HF_ERROR_TEXT + 128];
    snprintf(buf, sizeof buf, "%s could not be drawn: %s", what, e->text);
    hf_report_note(rep, "note", buf);
}

/* Elevation figures of every solved line of r (at most `max` lines). */
static void report_elevations(hf_report *rep, const hf_model *m, const hf_spread_result *r,
                              size_t max, const char *when)
{
    size_t n = m->nlines < max ? m->nlines : max;
    for (size_t i = 0; i < n; i++) {
        if (r->broken[i] || r->states[i].status != HF_OK)
            continue;
        hf_error e;
        hf_error_clear(&e);
        FILE *f = hf_report_figure_begin(rep);
        hf_status st = hf_report_svg_elevation(f, m, i, &r->states[i], 0, &e);
        char cap[HF_MODEL_MAX_NAME + 128];
        snprintf(cap, sizeof cap, "Line %s %s: profile and tension along the line.",
                 m->lines[i].name, when);
        hf_report_figure_end(rep, cap);
        if (st != HF_OK)
            report_fail_note(rep, "An elevation", &e);
    }
    if (m->nlines > n) {
        char buf[128];
        snprintf(buf, sizeof buf, "Elevations of the first %zu of %zu lines are shown.", n,
                 m->nlines);
        hf_report_paragraph(rep, buf);
    }
}

/* The rest pose: plan and every line's elevation. */
static void report_rest(hf_report *rep, const hf_model *m)
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
    hf_spread *ws = hf_spread_alloc(m, &e);
    if (!ws) {
        report_fail_note(rep, "The rest pose", &e);
        return;
    }
    hf_pose pose;
    hf_spread_pose_rest(m, &pose);
    hf_spread_result r;
    if (hf_spread_solve(ws, &pose, &r, &e) == HF_OK)
        report_elevations(rep, m, &r, 12, "at rest");
    else
        report_fail_note(rep, "The rest pose", &e);
    hf_spread_free(ws);
}

static void fmt(char *buf, double v)
{
    hf_report_number(buf, 32, v, 4);
}

/* Splits one CSV line in place into at most `max` fields (RFC 4180 quotes
 * removed); returns the number of fields. */
static size_t split_csv(char *line, char **fields, size_t max)
{
    size_t n = 0;
    char *p = line;
    line[strcspn(line, "\n")] = '\0';
    while (n < max) {
        char *w = p;
        fields[n++] = w;
        if (*p == '"') {
            p++;
            for (;;) {
                if (*p == '"' && p[1] == '"') {
                    *w++ = '"';
                    p += 2;
                } else if (*p == '"' || *p == '\0') {
                    if (*p)
                        p++;
                    break;
                } else {
                    *w++ = *p++;
                }
            }
            char *next = strchr(p, ',');
            *w = '\0';
            if (!next)
                break;
            p = next + 1;
        } else {
            char *next = strchr(p, ',');
            if (!next)
                break;
            *next = '\0';
            p = next + 1;
        }
    }
    return n;
}

/* "T_north_kN" -> "T_north (kN)" for an axis. */
static void axis_label(const char *name, char *buf, size_t cap)
{
    static const char *const suffix[][2] = {{"_kN_per_m", "kN/m"}, {"_kNm_per_rad", "kN m/rad"},
                                            {"_kN", "kN"},         {"_deg", "deg"},
                                            {"_m", "m"},           {"_N", "N"},
                                            {"_N_per_m", "N/m"},   {"_kg_per_m", "kg/m"}};
    size_t n = strlen(name);
    for (size_t i = 0; i < sizeof suffix / sizeof suffix[0]; i++) {
        size_t k = strlen(suffix[i][0]);
        if (n > k && !strcmp(name + n - k, suffix[i][0])) {
            snprintf(buf, cap, "%.*s (%s)", (int)(n - k), name, suffix[i][1]);
            return;
        }
    }
    snprintf(buf, cap, "%s", name);
}

#define REPORT_SWEEP_MAX_CASES 20000
#define REPORT_SWEEP_MAX_CURVES 10
#define REPORT_LINE_MAX 65536

/* The sweep's figure: its first output against one varied parameter, one
 * curve per value of a second one, read back from the CSV just written. */
static void report_sweep(hf_report *rep, const hf_model *m, const hf_study *s, const char *path)
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
    size_t ix = 0, ic = 0, ncurves = 1, n = (size_t)g.ncases;
    if (!s->zip && s->nvary == 2) {
        ix = g.count[1] >= g.count[0] ? 1 : 0;
        ic = 1 - ix;
        ncurves = g.count[ic];
        n = g.count[ix];
    }
    if (g.ncases > REPORT_SWEEP_MAX_CASES || (!s->zip && s->nvary > 2) ||
        ncurves > REPORT_SWEEP_MAX_CURVES) {
        hf_report_paragraph(rep, "No figure: figures are drawn for sweeps of up to 20,000 cases "
                                 "over one parameter, zipped lists, or two parameters with at "
                                 "most 10 values of one of them.");
        return;
    }
    double *x = hf_malloc(n * sizeof *x), *y = hf_malloc(ncurves * n * sizeof *y);
    char *line = hf_malloc(REPORT_LINE_MAX), *names = hf_malloc(ncurves * 96);
    const char **cn = hf_calloc(ncurves, sizeof *cn);
    char **fields = hf_calloc(s->nvary + 2, sizeof *fields);
    FILE *f = fopen(path, "r");
    if (!x || !y || !line || !names || !cn || !fields || !f)
        goto done;
    for (size_t i = 0; i < ncurves * n; i++)
        y[i] = NAN;
    char xl[256], yl[256], ylabel_raw[256];
    if (!fgets(line, REPORT_LINE_MAX, f) || split_csv(line, fields, s->nvary + 2) < s->nvary + 2)
        goto done;
    axis_label(fields[ix], xl, sizeof xl);
    snprintf(ylabel_raw, sizeof ylabel_raw, "%s", fields[s->nvary + 1]);
    axis_label(ylabel_raw, yl, sizeof yl);
    size_t idx[HF_STUDY_MAX_VARY];
    for (uint64_t k = 0; k < g.ncases && fgets(line, REPORT_LINE_MAX, f); k++) {
        if (split_csv(line, fields, s->nvary + 2) < s->nvary + 2)
            continue;
        double xv = strtod(fields[ix], NULL);
        char *end;
        double yv = strtod(fields[s->nvary + 1], &end);
        if (end == fields[s->nvary + 1])
            yv = NAN;
        hf_study_grid_index(&g, k, idx);
        size_t i = ncurves > 1 ? idx[ix] : (size_t)k, c = ncurves > 1 ? idx[ic] : 0;
        x[i] = xv;
        y[c * n + i] = yv;
    }
    for (size_t c = 0; c < ncurves; c++) {
        /* Legend values for people: degrees for angles, kN for forces. */
        char v[32];
        hf_dim d = s->vary[ic].dim;
        double scale = d == HF_DIM_ANGLE ? 180.0 / M_PI : d == HF_DIM_FORCE ? 1e-3 : 1.0;
        const char *u = d == HF_DIM_ANGLE ? "deg" : d == HF_DIM_FORCE ? "kN" : hf_dim_si(d);
        fmt(v, hf_study_vary_value(&s->vary[ic], c) * scale);
        snprintf(names + 96 * c, 96, "%s %s", v, u);
        cn[c] = names + 96 * c;
    }
    int util = !strncmp(ylabel_raw, "U_", 2) || !strcmp(ylabel_raw, "max_utilisation");
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
done:
    if (f)
        fclose(f);
    hf_free(x);
    hf_free(y);
    hf_free(line);
    hf_free(names);
    hf_free(cn);
    hf_free(fields);
}

/* ---- per-kind studies through the library API; the CSV layouts are those of
 * the matching commands, from include/holdfast/results.h (docs/studies.md) ---- */

/* A spread workspace of m and the study's pose (rest pose plus offset), or
 * NULL with err set. */
static hf_spread *study_begin(const hf_model *m, const hf_study *s, hf_pose *pose, hf_error *err)
{
    hf_spread_pose_rest(m, pose);
    hf_spread_pose_offset(pose, s->offset);
    return hf_spread_alloc(m, err);
}

static hf_status run_lines(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, outcome *oc, hf_error *err)
{
    hf_pose pose;
    hf_spread *ws = study_begin(m, s, &pose, err);
    if (!ws)
        return err->status;
    hf_spread_result r;
    hf_status st = hf_spread_solve(ws, &pose, &r, err);
    /* A study whose pose does not solve fails as a whole (its file is not
     * kept), so the rows are those of 'holdfast lines --csv'. */
    hf_cli_warn_nonfinite("run", hf_results_lines_write(out, m, &r));
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
            report_elevations(rep, m, &r, 12, "at this pose");
        else
            hf_report_paragraph(rep, "The pose is the rest pose: the elevations are above.");
    }
    hf_spread_free(ws);
    return st;
}

static hf_status run_stiffness(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                               hf_report *rep, outcome *oc, hf_error *err)
{
    const char *const *dof = hf_results_stiffness_columns + 1;
    hf_pose pose;
    hf_spread *ws = study_begin(m, s, &pose, err);
    if (!ws)
        return err->status;
    hf_spread_result r;
    double K[6][6];
    hf_status st = hf_spread_stiffness(ws, &pose, K, &r, err);
    if (st == HF_OK) {
        hf_cli_warn_nonfinite("run", hf_results_stiffness_write(out, K, r.force));
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
    hf_spread_free(ws);
    return st;
}

static hf_status run_curve(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, outcome *oc, hf_error *err)
{
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.from = s->from;
    v.to = s->to;
    v.step = s->step;
    size_t n = hf_study_vary_count(&v);
    if (n == 0 || n > HF_STUDY_MAX_VALUES)
        return hf_error_set(err, HF_EINVAL, "curve study %s: invalid range", s->name);
    hf_spread *ws = hf_spread_alloc(m, err);
    if (!ws)
        return err->status;
    double cd = cos(s->direction), sd = sin(s->direction);
    if (hf_results_curve_header_write(out, m, err) != HF_OK) {
        hf_spread_free(ws);
        return err->status;
    }
    size_t failed = 0, nonfinite = 0, nl = m->nlines;
    /* Figure data (the CSV is written as it goes; these feed the report). */
    double *fo = hf_malloc(n * sizeof *fo), *ff = hf_malloc(n * sizeof *ff);
    double *fk = hf_malloc(n * sizeof *fk), *ft = hf_malloc(n * nl * sizeof *ft);
    double *fu = hf_malloc(n * nl * sizeof *fu);
    int figure = fo && ff && fk && ft && fu;
    for (size_t k = 0; k < n; k++) {
        double x = hf_study_vary_value(&v, k);
        hf_pose pose;
        hf_spread_pose_rest(m, &pose);
        double off[3] = {x * cd, x * sd, 0.0};
        hf_spread_pose_offset(&pose, off);
        hf_spread_result r;
        double K[6][6];
        hf_error e;
        hf_status st = hf_spread_stiffness(ws, &pose, K, &r, &e);
        if (st == HF_OK) {
            hf_results_curve_point pt;
            hf_results_curve_point_set(&pt, m, x, s->direction, K, &r);
            nonfinite += hf_results_curve_row_write(out, m, &pt, &r);
            if (figure) {
                fo[k] = x;
                ff[k] = pt.restoring;
                fk[k] = pt.stiffness;
                for (size_t i = 0; i < nl; i++) {
                    ft[k * nl + i] = r.line_tension[i];
                    fu[k * nl + i] = r.states[i].max_utilisation;
                }
            }
        } else {
            if (figure) {
                fo[k] = x;
                ff[k] = fk[k] = NAN;
                for (size_t i = 0; i < nl; i++)
                    ft[k * nl + i] = fu[k * nl + i] = NAN;
            }
            /* The offset is kept, its values left empty (the command stops at
             * such a point; a study keeps going and counts it). */
            failed++;
            hf_results_curve_row_failed_write(out, m, x);
        }
    }
    hf_cli_warn_nonfinite("run", nonfinite);
    snprintf(oc->note, sizeof oc->note, "%zu offsets along %.4g deg, %zu failed", n,
             s->direction * 180.0 / M_PI, failed);
    char head[HF_MODEL_MAX_NAME + 64], label[64];
    snprintf(head, sizeof head, "Restoring curve: %s", s->name);
    snprintf(label, sizeof label, "direction %.4g deg", s->direction * 180.0 / M_PI);
    hf_report_section(rep, head,
                      "Restoring force and stiffness against a horizontal offset of the hull "
                      "along one direction, heading fixed; line tensions and utilisations.");
    if (figure && n >= 2) {
        const char **names = hf_calloc(nl, sizeof *names);
        if (names)
            for (size_t i = 0; i < nl; i++)
                names[i] = m->lines[i].name;
        double fi = m->criteria.factor_intact;
        hf_svg_curve cv = {s->name, n,    fo, ff, fk, nl, names, ft, fu, fi > 0 ? 1.0 / fi : 0.0,
                           NULL,    label};
        hf_error e;
        hf_error_clear(&e);
        FILE *f = hf_report_figure_begin(rep);
        hf_status st = hf_svg_figure_curve(f, &cv, 0, &e);
        hf_report_figure_end(rep, "Restoring force, stiffness, line tensions and utilisations "
                                  "against offset; the utilisation limit is 1 / the intact "
                                  "factor.");
        if (st != HF_OK)
            report_fail_note(rep, "The curve", &e);
        hf_free(names);
    }
    if (failed) {
        char buf[128];
        snprintf(buf, sizeof buf, "%zu of %zu offsets did not solve (gaps in the curves).", failed,
                 n);
        hf_report_note(rep, "warning", buf);
    }
    hf_free(fo);
    hf_free(ff);
    hf_free(fk);
    hf_free(ft);
    hf_free(fu);
    hf_spread_free(ws);
    return HF_OK;
}

static hf_status run_balance(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                             hf_report *rep, outcome *oc, hf_error *err)
{
    hf_balance *b = hf_balance_alloc(m, err);
    if (!b)
        return err->status;
    if (hf_results_balance_header_write(out, m, err) != HF_OK) {
        hf_balance_free(b);
        return err->status;
    }
    size_t nload = s->nloads ? s->nloads : m->nloads, nfail = 0, nnot = 0, nonfinite = 0;
    char head[HF_MODEL_MAX_NAME + 64];
    snprintf(head, sizeof head, "Mean position under load: %s", s->name);
    hf_report_section(rep, head,
                      "Equilibrium in surge, sway and yaw under each load case, intact and with "
                      "each line broken in turn, checked against the case's criteria.");
    for (size_t l = 0; l < nload; l++) {
        size_t li = s->nloads ? hf_model_load_find(m, s->loads[l]) : l;
        if (li >= m->nloads) {
            hf_balance_free(b);
            return hf_error_set(err, HF_EINVAL, "balance study %s: no load named %s", s->name,
                                s->loads[l]);
        }
        hf_error e;
        hf_status st = hf_balance_run(b, &m->loads[li], &e);
        if (st == HF_EINVAL) {
            hf_balance_free(b);
            return hf_error_set(err, HF_EINVAL, "balance study %s: %s", s->name, e.text);
        }
        for (size_t k = 0; k < hf_balance_ncond(b); k++) {
            const hf_balance_result *r = hf_balance_result_at(b, k);
            nonfinite += hf_results_balance_row_write(out, m, &m->loads[li], r);
            if (!r->passed)
                nfail++;
            if (r->status != HF_OK)
                nnot++;
            char cond[HF_MODEL_MAX_NAME + 16];
            hf_results_balance_condition(m, r, cond, sizeof cond);
            char item[2 * HF_MODEL_MAX_NAME + 32], req[128], res[256], a[32], b2[32];
            snprintf(item, sizeof item, "load %s, %s", m->loads[li].name, cond);
            double need = hf_criteria_required(&m->criteria, r->broken != HF_BALANCE_NONE);
            fmt(a, need);
            if (need > 0)
                snprintf(req, sizeof req, "MBL/T at least %s%s", a,
                         r->offset_checked ? "; offset within the limit" : "");
            else
                snprintf(req, sizeof req, "%s",
                         r->offset_checked ? "offset within the limit" : "equilibrium");
            if (r->status != HF_OK) {
                snprintf(res, sizeof res, "%s%s%.180s", hf_status_str(r->status),
                         r->message[0] ? ": " : "", r->message);
            } else {
                fmt(a, r->max_utilisation > 0 ? 1.0 / r->max_utilisation : 0.0);
                fmt(b2, r->horizontal);
                snprintf(res, sizeof res, "MBL/T %s (%s), offset %s m, governing: %s", a,
                         hf_results_line_name(m, r->max_utilisation_line), b2,
                         hf_balance_criterion_name(r->criterion));
            }
            hf_report_check(rep, item, req, res, r->passed);
        }
        const hf_balance_result *r0 = hf_balance_result_at(b, 0);
        if (r0 && r0->status == HF_OK) {
            hf_pose pose;
            hf_spread_pose_rest(m, &pose);
            hf_spread_pose_offset(&pose, r0->offset);
            hf_error fe;
            hf_error_clear(&fe);
            FILE *f = hf_report_figure_begin(rep);
            hf_status fs = hf_report_svg_plan(f, m, &pose, NULL, &m->loads[li], 0, &fe);
            char cap[HF_MODEL_MAX_NAME + 96];
            snprintf(cap, sizeof cap, "Plan at the intact equilibrium under load %s.",
                     m->loads[li].name);
            hf_report_figure_end(rep, cap);
            if (fs != HF_OK)
                report_fail_note(rep, "The plan", &fe);
        }
    }
    hf_cli_warn_nonfinite("run", nonfinite);
    oc->criterion_failed = nfail > 0;
    snprintf(oc->note, sizeof oc->note,
             "%zu load cases; %zu conditions failed a criterion (%zu without equilibrium)", nload,
             nfail, nnot);
    hf_balance_free(b);
    return HF_OK;
}

static hf_status run_sweep(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, outcome *oc, hf_error *err)
{
    hf_sweep *sw = hf_sweep_alloc(m, s->vary, s->nvary, s->zip, (const char *const *)s->outputs,
                                  s->noutputs, jobs, err);
    if (!sw)
        return err->status;
    hf_sweep_range r;
    memset(&r, 0, sizeof r);
    r.end = hf_sweep_ncases(sw);
    hf_status st = hf_sweep_write_header(sw, out, err);
    if (st == HF_OK)
        st = hf_sweep_write_rows(sw, &r, out, err);
    if (st == HF_OK)
        snprintf(oc->note, sizeof oc->note, "%llu cases, %llu did not solve",
                 (unsigned long long)r.end, (unsigned long long)hf_sweep_failed_count(sw));
    hf_sweep_free(sw);
    return st;
}

static hf_status run_invert(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                            hf_report *rep, outcome *oc, hf_error *err)
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

/* The study of each kind, indexed by hf_study_kind (the order of kind_name).
 * Every one writes its CSV to out and its report section to rep (a sweep's
 * figure comes after its file is committed: report_sweep); jobs is used by
 * sweeps only. */
typedef hf_status (*study_fn)(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                              hf_report *rep, outcome *oc, hf_error *err);
static const study_fn run_kind[] = {run_lines,   run_curve, run_stiffness,
                                    run_balance, run_sweep, run_invert};
_Static_assert(sizeof run_kind / sizeof run_kind[0] == HF_STUDY_INVERT + 1,
               "one study function per hf_study_kind");

/* ---- the run ---- */

static hf_status make_dir(const char *dir, hf_error *err)
{
    if (mkdir(dir, 0777) == 0 || errno == EEXIST) {
        struct stat st;
        if (stat(dir, &st) == 0 && S_ISDIR(st.st_mode))
            return HF_OK;
    }
    return hf_error_set(err, HF_EIO, "%s: cannot create the results folder: %s", dir,
                        strerror(errno ? errno : ENOTDIR));
}

/* Default folder: the case file's base name without extension + "-results". */
static void default_dir(const char *case_path, char *buf, size_t cap)
{
    const char *base = strrchr(case_path, '/');
    base = base ? base + 1 : case_path;
    const char *dot = strrchr(base, '.');
    int n = dot && dot != base ? (int)(dot - base) : (int)strlen(base);
    snprintf(buf, cap, "%.*s-results", n, base);
}

/* Opens dir/name for writing (outfile.h: committed when complete); path
 * (cap bytes) receives the file's path. */
static hf_outfile *open_in(const char *dir, const char *name, char *path, size_t cap, hf_error *err)
{
    snprintf(path, cap, "%s/%s", dir, name);
    return hf_outfile_open(path, err);
}

static int severity(hf_status st)
{
    if (st == HF_OK)
        return 0;
    return hf_status_exit_code(st) == HF_EXIT_USAGE ? 3 : 2; /* bad input > numeric */
}

int hf_cmd_run(int argc, char **argv)
{
    const char *case_path = NULL, *dir = NULL;
    int jobs = 0, quiet = 0;
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i], *v = NULL;
        hf_error e;
        if (hf_cli_help(a, usage_text)) {
            return HF_EXIT_OK;
        } else if (hf_cli_value(argc, argv, &i, "--out", &dir)) {
            continue;
        } else if (hf_cli_value(argc, argv, &i, "--jobs", &v)) {
            if (hf_cli_parse_jobs(v, &jobs, &e) != HF_OK)
                return hf_cli_usage_error("run", "%s", e.text);
        } else if (!strcmp(a, "--quiet") || !strcmp(a, "-q")) {
            quiet = 1;
        } else if (a[0] == '-' && a[1]) {
            return hf_cli_usage_error("run", "unknown option or missing value: %s", a);
        } else if (!case_path) {
            case_path = a;
        } else {
            return hf_cli_usage_error("run", "one case file expected, got \"%s\" too", a);
        }
    }
    if (!case_path)
        return hf_cli_usage_error("run", "no case file given");
    if (jobs == 0)
        jobs = hf_study_default_jobs();
    hf_model m;
    hf_study_list sl;
    hf_model_init(&m);
    hf_study_list_init(&sl);
    hf_error err;
    hf_error_clear(&err);
    int rc = HF_EXIT_OK;
    outcome *oc = NULL;
    char dbuf[4096], path[8192];
    if (hf_case_load_with_studies(case_path, &m, &sl, &err) != HF_OK)
        goto fail;
    if (sl.n == 0) {
        hf_error_set(&err, HF_EINVAL, "%s: the case has no studies: section; nothing to run",
                     case_path);
        goto fail;
    }
    if (!dir) {
        default_dir(case_path, dbuf, sizeof dbuf);
        dir = dbuf;
    }
    if (make_dir(dir, &err) != HF_OK)
        goto fail;
    oc = hf_calloc(sl.n, sizeof *oc);
    if (!oc) {
        hf_error_set(&err, HF_ENOMEM, "out of memory");
        goto fail;
    }
    /* The report is written alongside the studies and committed last. */
    hf_outfile *rf = open_in(dir, "report.html", path, sizeof path, &err);
    if (!rf)
        goto fail;
    char command[4200];
    snprintf(command, sizeof command, "holdfast run %s", case_path);
    hf_report rep;
    hf_report_begin(&rep, hf_outfile_stream(rf), &m, command);
    report_rest(&rep, &m);
    int worst = 0, crit = 0;
    for (size_t k = 0; k < sl.n; k++) {
        const hf_study *s = &sl.v[k];
        snprintf(path, sizeof path, "%s/%s.csv", dir, s->name);
        hf_error e;
        hf_error_clear(&e);
        hf_outfile *of = hf_outfile_open(path, &e);
        hf_status st = of ? HF_OK : e.status;
        if (of) {
            FILE *out = hf_outfile_stream(of);
            st = run_kind[s->kind](&m, s, jobs, out, &rep, &oc[k], &e);
            if (st == HF_OK)
                st = hf_outfile_commit(of, &e);
            else
                hf_outfile_abort(of);
            if (st == HF_OK && s->kind == HF_STUDY_SWEEP)
                report_sweep(&rep, &m, s, path);
        }
        oc[k].status = st;
        if (st != HF_OK) {
            snprintf(oc[k].note, sizeof oc[k].note, "FAILED (%s): %s", hf_status_str(st), e.text);
            fprintf(stderr, "holdfast run: study %s: %s\n", s->name, e.text);
            char head[HF_MODEL_MAX_NAME + 64];
            snprintf(head, sizeof head, "Study %s (%s): failed", s->name, kind_name[s->kind]);
            hf_report_section(&rep, head, NULL);
            hf_report_note(&rep, "warning", oc[k].note);
            if (severity(st) > worst)
                worst = severity(st);
        } else if (!quiet) {
            printf("%-24s %-9s %s\n", s->name, kind_name[s->kind], oc[k].note);
        }
        if (oc[k].criterion_failed)
            crit = 1;
    }
    if (hf_report_end(&rep, &err) != HF_OK) {
        hf_outfile_abort(rf); /* a failed report leaves neither file nor leak */
        goto fail;
    }
    if (hf_outfile_commit(rf, &err) != HF_OK)
        goto fail;
    /* The summary goes last, so it describes what is in the folder. */
    hf_outfile *of = open_in(dir, "summary.txt", path, sizeof path, &err);
    if (!of)
        goto fail;
    FILE *out = hf_outfile_stream(of);
    fprintf(out, "holdfast %s run of %s\n", HF_VERSION, case_path);
    if (m.title)
        fprintf(out, "case: %s\n", m.title);
    fprintf(out, "\n");
    for (size_t k = 0; k < sl.n; k++)
        fprintf(out, "%-24s %-9s %-8s %s\n", sl.v[k].name, kind_name[sl.v[k].kind],
                oc[k].status != HF_OK    ? "failed"
                : oc[k].criterion_failed ? "criterion"
                                         : "ok",
                oc[k].note);
    fprintf(out, "\n%s", hf_cli_caution);
    if (hf_outfile_commit(of, &err) != HF_OK)
        goto fail;
    if (!quiet)
        printf("results in %s/\n%s", dir, hf_cli_caution);
    rc = worst == 3 ? HF_EXIT_USAGE : worst == 2 ? HF_EXIT_NUMERIC : crit ? HF_EXIT_CRITERION : 0;
    goto done;
fail:
    rc = hf_cli_fail(&err);
done:
    hf_free(oc);
    hf_study_list_free(&sl);
    hf_model_free(&m);
    return rc;
}
