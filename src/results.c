/* results.c - CSV layouts of solved lines, stiffness, curves and balance conditions. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/criteria.h"
#include "holdfast/csv.h"
#include "holdfast/results.h"

#define RAD2DEG (180.0 / M_PI)

/* clang-format off */
const char *const hf_results_lines_columns[HF_RESULTS_LINES_COLUMNS] = {
    "line", "status", "fairlead_tension_kN", "fairlead_horizontal_kN", "fairlead_vertical_kN",
    "top_angle_deg", "anchor_tension_kN", "anchor_vertical_kN", "anchor_uplift_deg",
    "grounded_m", "span_m", "max_utilisation", "height_m", "anchor_horizontal_kN",
    "touchdown_m", "max_tension_kN", "alert"};
/* clang-format on */

const char *const hf_results_stiffness_columns[HF_RESULTS_STIFFNESS_COLUMNS] = {
    "row", "surge", "sway", "heave", "roll", "pitch", "yaw"};

const char *const hf_results_curve_columns[HF_RESULTS_CURVE_FIXED] = {
    "offset_m",           "restoring_kN",   "force_x_kN",       "force_y_kN",     "moment_z_kNm",
    "stiffness_kN_per_m", "max_tension_kN", "max_tension_line", "max_utilisation"};

const char *const hf_results_balance_head[HF_RESULTS_BALANCE_HEAD] = {
    "load",           "condition",      "water_level_m",    "status",
    "surge_m",        "sway_m",         "yaw_deg",          "max_tension_kN",
    "max_tension_line", "max_utilisation", "criterion",     "passed"};

const char *const hf_results_balance_anchor_groups[HF_RESULTS_BALANCE_ANCHOR][2] = {
    {"anchor_load", "_kN"}, {"angle", "_deg"}, {"sliding", ""}, {"uplift", ""}};

const char *const hf_results_balance_tail[HF_RESULTS_BALANCE_TAIL] = {
    "horizontal_m", "max_utilisation_line", "min_line_factor", "required_line_factor", "message",
    "alert"};

/* Rows of the stiffness matrix: the degrees of freedom (= columns 1..6). */
static const char *const *const dof = hf_results_stiffness_columns + 1;

const char *hf_results_line_name(const hf_model *m, size_t i)
{
    return i < m->nlines && m->lines[i].name ? m->lines[i].name : "-";
}

int hf_results_line_solved(const hf_spread_result *r, size_t i)
{
    return !r->broken[i] && r->states[i].status == HF_OK;
}

const char *hf_results_line_status(const hf_spread_result *r, size_t i, char *buf, size_t cap)
{
    const hf_line_state *s = &r->states[i];
    if (r->broken[i])
        return "broken";
    if (s->status != HF_OK) {
        snprintf(buf, cap, "failed: %s",
                 s->message && s->message[0] ? s->message : hf_status_str(s->status));
        return buf;
    }
    return hf_line_regime_name(s->regime);
}

double hf_results_line_top_angle_deg(const hf_line_state *s)
{
    return atan2(s->v, s->h) * 180.0 / M_PI;
}

int hf_results_line_overloaded(const hf_spread_result *r, size_t i)
{
    return hf_results_line_solved(r, i) && hf_criteria_overloaded(r->states[i].max_utilisation);
}

const char *hf_results_line_alert(const hf_spread_result *r, size_t i)
{
    return hf_results_line_overloaded(r, i) ? HF_RESULTS_ALERT_OVERLOADED : "";
}

size_t hf_results_first_overloaded(const hf_spread_result *r)
{
    for (size_t i = 0; i < r->nlines; i++)
        if (hf_results_line_overloaded(r, i))
            return i;
    return (size_t)-1;
}

double hf_results_line_needed_strain(const hf_spread_geom *g, const hf_line *l)
{
    return hypot(g->x, g->z) / hf_line_length(l) - 1.0;
}

int hf_results_stretch_warn(FILE *err, const char *cmd, const char *name, const hf_spread_geom *g,
                            const hf_line *l)
{
    double e = hf_results_line_needed_strain(g, l);
    if (!(e > 0.0))
        return 0;
    fprintf(err,
            "holdfast %s: warning: line %s must stretch %.2f %% to reach its anchor (straight "
            "fairlead-anchor distance %.1f m > unstretched length %.1f m)\n",
            cmd, name, 100.0 * e, hypot(g->x, g->z), hf_line_length(l));
    return 1;
}

size_t hf_results_lines_write(FILE *out, const hf_model *m, const hf_spread_result *r)
{
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header_array(&c, hf_results_lines_columns, HF_RESULTS_LINES_COLUMNS);
    for (size_t i = 0; i < m->nlines; i++) {
        char buf[HF_ERROR_TEXT];
        const hf_line_state *s = &r->states[i];
        hf_csv_field_str(&c, m->lines[i].name);
        hf_csv_field_str(&c, hf_results_line_status(r, i, buf, sizeof buf));
        if (hf_results_line_solved(r, i)) {
            hf_csv_field_double(&c, s->tension / 1e3);
            hf_csv_field_double(&c, s->h / 1e3);
            hf_csv_field_double(&c, s->v / 1e3);
            hf_csv_field_double(&c, hf_results_line_top_angle_deg(s));
            hf_csv_field_double(&c, s->anchor_tension / 1e3);
            hf_csv_field_double(&c, s->anchor_v / 1e3);
            hf_csv_field_double(&c, s->anchor_angle * 180.0 / M_PI);
            hf_csv_field_double(&c, s->grounded);
            hf_csv_field_double(&c, r->geom[i].x);
            hf_csv_field_double(&c, s->max_utilisation);
            hf_csv_field_double(&c, r->geom[i].z);
            hf_csv_field_double(&c, s->anchor_h / 1e3);
            hf_csv_field_double(&c, s->touchdown_x);
            hf_csv_field_double(&c, r->line_tension[i] / 1e3);
            hf_csv_field_str(&c, hf_results_line_alert(r, i));
        } else {
            for (int k = 2; k < HF_RESULTS_LINES_COLUMNS; k++)
                hf_csv_field_empty(&c);
        }
        hf_csv_end_row(&c);
    }
    return c.nonfinite;
}

size_t hf_results_stiffness_write(FILE *out, double K[6][6], const double force[6])
{
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header_array(&c, hf_results_stiffness_columns, HF_RESULTS_STIFFNESS_COLUMNS);
    for (int i = 0; i < 6; i++) {
        hf_csv_field_str(&c, dof[i]);
        for (int j = 0; j < 6; j++)
            hf_csv_field_double(&c, K[i][j] / 1e3);
        hf_csv_end_row(&c);
    }
    hf_csv_field_str(&c, "static_load");
    for (int j = 0; j < 6; j++)
        hf_csv_field_double(&c, force[j] / 1e3);
    hf_csv_end_row(&c);
    return c.nonfinite;
}

/* HF_ELIMIT when a line name would not fit a T_<line>_kN column name. */
static hf_status check_names(const hf_model *m, hf_error *err)
{
    for (size_t i = 0; i < m->nlines; i++)
        if (strlen(hf_results_line_name(m, i)) > HF_MODEL_MAX_NAME)
            return hf_error_set(err, HF_ELIMIT,
                                "line %zu: name longer than %d bytes (HF_MODEL_MAX_NAME)", i,
                                HF_MODEL_MAX_NAME);
    return HF_OK;
}

/* A header row: head[0..nhead-1], <per>_<line>_kN per line of m, tail[0..ntail-1]. */
static hf_status header(FILE *out, const hf_model *m, const char *const *head, size_t nhead,
                        const char *per, const char *const *tail, size_t ntail, hf_error *err)
{
    hf_status s = check_names(m, err);
    if (s != HF_OK)
        return s;
    hf_csv c;
    hf_csv_init(&c, out, 0);
    for (size_t j = 0; j < nhead; j++)
        hf_csv_field_str(&c, head[j]);
    for (size_t i = 0; i < m->nlines; i++) {
        char name[HF_MODEL_MAX_NAME + 16];
        snprintf(name, sizeof name, "%s_%s_kN", per, hf_results_line_name(m, i));
        hf_csv_field_str(&c, name);
    }
    for (size_t j = 0; j < ntail; j++)
        hf_csv_field_str(&c, tail[j]);
    hf_csv_end_row(&c);
    return HF_OK;
}

hf_status hf_results_curve_header_write(FILE *out, const hf_model *m, hf_error *err)
{
    static const char *const tail[] = {"alert"};
    return header(out, m, hf_results_curve_columns, HF_RESULTS_CURVE_FIXED, "T", tail, 1, err);
}

int hf_results_curve_overloaded(const hf_analysis_curve *c, size_t k)
{
    return c->status[k] == HF_OK && hf_criteria_overloaded(c->max_utilisation[k]);
}

size_t hf_results_curve_row_write(FILE *out, const hf_model *m, const hf_analysis_curve *c,
                                  size_t k)
{
    hf_csv w;
    hf_csv_init(&w, out, 0);
    hf_csv_field_double(&w, c->offset[k]);
    if (c->status[k] != HF_OK) {
        for (size_t j = 1; j < HF_RESULTS_CURVE_FIXED + m->nlines + 1; j++)
            hf_csv_field_empty(&w);
        hf_csv_end_row(&w);
        return 0;
    }
    hf_csv_field_double(&w, c->restoring[k] / 1e3);
    hf_csv_field_double(&w, c->force_x[k] / 1e3);
    hf_csv_field_double(&w, c->force_y[k] / 1e3);
    hf_csv_field_double(&w, c->moment_z[k] / 1e3);
    hf_csv_field_double(&w, c->stiffness[k] / 1e3);
    hf_csv_field_double(&w, c->max_tension[k] / 1e3);
    hf_csv_field_str(&w, c->max_tension_line[k] < m->nlines
                             ? hf_results_line_name(m, c->max_tension_line[k])
                             : "");
    hf_csv_field_double(&w, c->max_utilisation[k]);
    for (size_t i = 0; i < m->nlines; i++)
        hf_csv_field_double(&w, c->fairlead_tension[k * c->nlines + i] / 1e3);
    hf_csv_field_str(&w, hf_results_curve_overloaded(c, k) ? HF_RESULTS_ALERT_OVERLOADED : "");
    hf_csv_end_row(&w);
    return w.nonfinite;
}

void hf_results_balance_condition(const hf_model *m, const hf_balance_result *r, char *buf,
                                  size_t cap)
{
    if (r->broken == HF_BALANCE_NONE)
        snprintf(buf, cap, "intact");
    else
        snprintf(buf, cap, "broken:%s", hf_results_line_name(m, r->broken));
}

void hf_results_balance_criterion(const hf_model *m, const hf_balance_result *r, char *buf,
                                  size_t cap)
{
    const char *c = hf_balance_criterion_name(r->criterion);
    if (r->criterion_line != HF_BALANCE_NONE)
        snprintf(buf, cap, "%s:%s", c, hf_results_line_name(m, r->criterion_line));
    else
        snprintf(buf, cap, "%s", c);
}

double hf_results_balance_min_factor(const hf_balance_result *r)
{
    double f = 0.0;
    for (size_t i = 0; i < r->nlines; i++)
        if (r->line[i].has_factor && (f == 0.0 || r->line[i].factor < f))
            f = r->line[i].factor;
    return f;
}

hf_status hf_results_balance_header_write(FILE *out, const hf_model *m, hf_error *err)
{
    hf_status s = check_names(m, err);
    if (s != HF_OK)
        return s;
    hf_csv c;
    hf_csv_init(&c, out, 0);
    for (size_t j = 0; j < HF_RESULTS_BALANCE_HEAD; j++)
        hf_csv_field_str(&c, hf_results_balance_head[j]);
    /* Tmax: the largest tension along the line, not the fairlead tension
     * that T_<line>_kN means in the curve and sweep CSVs (issue 11 item 2) */
    for (size_t i = 0; i < m->nlines; i++) {
        char name[HF_MODEL_MAX_NAME + 16];
        snprintf(name, sizeof name, "Tmax_%s_kN", hf_results_line_name(m, i));
        hf_csv_field_str(&c, name);
    }
    for (size_t g = 0; g < HF_RESULTS_BALANCE_ANCHOR; g++)
        for (size_t i = 0; i < m->nlines; i++) {
            char name[HF_MODEL_MAX_NAME + 32];
            snprintf(name, sizeof name, "%s_%s%s", hf_results_balance_anchor_groups[g][0],
                     hf_results_line_name(m, i), hf_results_balance_anchor_groups[g][1]);
            hf_csv_field_str(&c, name);
        }
    for (size_t j = 0; j < HF_RESULTS_BALANCE_TAIL; j++)
        hf_csv_field_str(&c, hf_results_balance_tail[j]);
    hf_csv_end_row(&c);
    return HF_OK;
}

/* The anchor groups of a balance row (empty for a broken line or no result). */
static void balance_anchor_fields(hf_csv *c, const hf_model *m, const hf_balance_result *r)
{
    int ok = r->status == HF_OK && r->anchor;
    for (size_t g = 0; g < HF_RESULTS_BALANCE_ANCHOR; g++)
        for (size_t i = 0; i < m->nlines; i++) {
            const hf_anchor_criterion *a = ok && r->broken != i ? &r->anchor[i] : NULL;
            int gravity = a && a->kind == HF_ANCHOR_GRAVITY;
            if (a && g == 0)
                hf_csv_field_double(c, a->load / 1e3);
            else if (a && g == 1)
                hf_csv_field_double(c, a->angle * RAD2DEG);
            else if (gravity && g == 2 && a->has_sliding)
                hf_csv_field_double(c, a->sliding_factor);
            else if (gravity && g == 3 && a->has_uplift)
                hf_csv_field_double(c, a->uplift_factor);
            else
                hf_csv_field_empty(c);
        }
}

/* A positive number, or an empty field for 0 (= not checked / none); NaN
 * goes through hf_csv_field_double so that it is counted. */
static void positive_or_empty(hf_csv *c, double v)
{
    if (v > 0.0 || isnan(v))
        hf_csv_field_double(c, v);
    else
        hf_csv_field_empty(c);
}

size_t hf_results_balance_row_write(FILE *out, const hf_model *m, const hf_load *load,
                                    const hf_balance_result *r)
{
    char cn[HF_MODEL_MAX_NAME + 16], crit[HF_MODEL_MAX_NAME + 32];
    hf_results_balance_condition(m, r, cn, sizeof cn);
    hf_results_balance_criterion(m, r, crit, sizeof crit);
    int ok = r->status == HF_OK;
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_field_str(&c, load->name);
    hf_csv_field_str(&c, cn);
    hf_csv_field_double(&c, m->site.water_level);
    hf_csv_field_str(&c, hf_status_str(r->status));
    if (ok) {
        hf_csv_field_double(&c, r->offset[0]);
        hf_csv_field_double(&c, r->offset[1]);
        hf_csv_field_double(&c, r->offset[2] * RAD2DEG);
        hf_csv_field_double(&c, r->max_tension / 1e3);
        hf_csv_field_str(&c, r->max_tension_line != HF_BALANCE_NONE
                                 ? hf_results_line_name(m, r->max_tension_line)
                                 : "");
        hf_csv_field_double(&c, r->max_utilisation);
    } else {
        for (int k = 0; k < 6; k++)
            hf_csv_field_empty(&c);
    }
    hf_csv_field_str(&c, crit);
    hf_csv_field_long(&c, r->passed ? 1 : 0);
    for (size_t i = 0; i < m->nlines; i++) {
        if (ok)
            hf_csv_field_double(&c, r->tension[i] / 1e3);
        else
            hf_csv_field_empty(&c);
    }
    balance_anchor_fields(&c, m, r);
    if (ok) {
        hf_csv_field_double(&c, r->horizontal);
        hf_csv_field_str(&c, r->max_utilisation_line != HF_BALANCE_NONE
                                 ? hf_results_line_name(m, r->max_utilisation_line)
                                 : "");
        positive_or_empty(&c, hf_results_balance_min_factor(r));
    } else {
        for (int k = 0; k < 3; k++)
            hf_csv_field_empty(&c);
    }
    positive_or_empty(&c, hf_criteria_required(&m->criteria, r->broken != HF_BALANCE_NONE));
    hf_csv_field_str(&c, r->message);
    hf_csv_field_str(&c, ok && r->overloaded ? HF_RESULTS_ALERT_OVERLOADED : "");
    hf_csv_end_row(&c);
    return c.nonfinite;
}

void hf_results_stiffness_for_people(double K[6][6], const double force[6], double Kp[6][6],
                                     double Fp[6])
{
    double kmax = 0.0, fmax_ = 0.0;
    for (int i = 0; i < 6; i++) {
        fmax_ = fmax(fmax_, fabs(force[i]));
        for (int j = 0; j < 6; j++)
            kmax = fmax(kmax, fabs(K[i][j]));
    }
    for (int i = 0; i < 6; i++) {
        Fp[i] = fabs(force[i]) < 1e-9 * fmax_ ? 0.0 : force[i] / 1e3;
        for (int j = 0; j < 6; j++)
            Kp[i][j] = fabs(K[i][j]) < 1e-9 * kmax ? 0.0 : K[i][j] / 1e3;
    }
}

/* ---- balance over a water-level envelope ---- */

void hf_results_where(const hf_model *m, const hf_analysis_where *w, char *buf, size_t cap)
{
    if (w->load >= m->nloads) {
        snprintf(buf, cap, "-");
        return;
    }
    char cn[HF_MODEL_MAX_NAME + 16];
    if (w->cond == 0)
        snprintf(cn, sizeof cn, "intact");
    else
        snprintf(cn, sizeof cn, "broken:%s", hf_results_line_name(m, w->cond - 1));
    snprintf(buf, cap, "%s, %s, %.3g m", m->loads[w->load].name, cn, w->level);
}

void hf_results_envelope_scope(const hf_model *m, const hf_analysis_envelope *e, char *buf,
                               size_t cap)
{
    double lo = INFINITY, hi = -INFINITY;
    for (size_t k = 0; k < e->nlevels; k++)
        lo = fmin(lo, e->level[k]), hi = fmax(hi, e->level[k]);
    char lv[96];
    if (e->nlevels == 1)
        snprintf(lv, sizeof lv, "1 water level (%.3g m)", lo);
    else
        snprintf(lv, sizeof lv, "%zu water levels (%.3g to %.3g m)", e->nlevels, lo, hi);
    snprintf(buf, cap,
             "%zu load case%s x %s x %zu conditions (intact and each of %zu lines broken) = %zu "
             "conditions",
             e->nloads, e->nloads == 1 ? "" : "s", lv, m->nlines + 1, m->nlines,
             e->nloads * e->nlevels * (m->nlines + 1));
}

static int same_where(const hf_analysis_where *a, const hf_analysis_where *b)
{
    return a->load == b->load && a->cond == b->cond && a->level == b->level;
}

/* Where the anchor values of el were found: once when they agree, else each. */
static void envelope_anchor_where(FILE *out, const hf_model *m, const hf_analysis_envelope_line *el,
                                  int gravity)
{
    const hf_analysis_where *w[4] = {&el->anchor_load_at, &el->angle_at, &el->sliding_at,
                                     &el->uplift_at};
    static const char *const what[4] = {"load", "angle", "sliding", "uplift"};
    hf_analysis_where flat = {(size_t)-1, 0, 0.0};
    if (!(el->angle > 0.0))
        w[1] = &flat; /* no uplift anywhere: no place to name */
    int all = 1;
    for (int k = 1; k < (gravity ? 4 : 2); k++)
        all &= w[k]->load == (size_t)-1 || same_where(w[0], w[k]);
    char buf[2 * HF_MODEL_MAX_NAME + 64];
    fprintf(out, "      at:");
    for (int k = 0; k < (all ? 1 : gravity ? 4 : 2); k++) {
        if (w[k]->load == (size_t)-1)
            continue;
        hf_results_where(m, w[k], buf, sizeof buf);
        fprintf(out, "%s%s%s %s", k ? ";" : "", all ? "" : " ", all ? "" : what[k], buf);
    }
    fputc('\n', out);
}

/* One anchor's lines of the envelope summary. */
static void envelope_anchor(FILE *out, const hf_model *m, size_t i,
                            const hf_analysis_envelope_line *el)
{
    char w[2 * HF_MODEL_MAX_NAME + 64];
    const hf_anchor *a = &m->lines[i].anchor_spec;
    int gravity = a->kind == HF_ANCHOR_GRAVITY;
    fprintf(out, "  %-18s %-8s", hf_results_line_name(m, i), hf_criteria_anchor_kind_name(a->kind));
    if (el->anchor_load_at.load == (size_t)-1) {
        fprintf(out, " no result\n");
        return;
    }
    fprintf(out, " load %.1f kN, angle %.2f deg", el->anchor_load / 1e3, el->angle * RAD2DEG);
    if (a->kind == HF_ANCHOR_DRAG)
        fprintf(out, " (allowed %.2f)", a->max_uplift_angle * RAD2DEG);
    if (gravity) {
        double rs, ru;
        hf_criteria_block_required(&m->criteria, a, &rs, &ru);
        if (el->sliding_at.load != (size_t)-1)
            fprintf(out, ", sliding %.3f (>= %.2f)", el->sliding, rs);
        else
            fprintf(out, ", sliding - (never pulled)");
        if (el->uplift_at.load != (size_t)-1)
            fprintf(out, ", uplift %.3f (>= %.2f)", el->uplift, ru);
        else
            fprintf(out, ", uplift - (never lifted)");
    }
    if (a->kind == HF_ANCHOR_PILE || a->kind == HF_ANCHOR_PLATE) {
        fprintf(out, "  reported only\n");
    } else if (el->anchor_failed) {
        hf_results_where(m, &el->anchor_fail_at, w, sizeof w);
        fprintf(out, "  FAIL in %zu conditions (first: %s)\n", el->anchor_failed, w);
    } else {
        fprintf(out, "  PASS\n");
    }
    envelope_anchor_where(out, m, el, gravity);
}

void hf_results_envelope_summary_write(FILE *out, const hf_model *m, const hf_analysis_envelope *e)
{
    char buf[512], w[2 * HF_MODEL_MAX_NAME + 64];
    hf_results_envelope_scope(m, e, buf, sizeof buf);
    fprintf(out, "\nenvelope: %s\n", buf);
    fprintf(out, "worst line tension over the envelope:\n");
    fprintf(out, "  %-18s %10s %11s %8s  %s\n", "line", "Tmax kN", "utilisation", "MBL/T",
            "load, condition, water level");
    for (size_t i = 0; i < m->nlines && i < e->nlines; i++) {
        const hf_analysis_envelope_line *el = &e->line[i];
        hf_results_where(m, &el->at, w, sizeof w);
        if (el->at.load == (size_t)-1) {
            fprintf(out, "  %-18s %10s %11s %8s  %s\n", hf_results_line_name(m, i), "-", "-", "-",
                    "no result");
            continue;
        }
        char fac[32];
        if (el->utilisation > 0.0)
            snprintf(fac, sizeof fac, "%.3f", 1.0 / el->utilisation);
        else
            snprintf(fac, sizeof fac, "-");
        fprintf(out, "  %-18s %10.1f %11.4f %8s  %s%s\n", hf_results_line_name(m, i),
                el->tension / 1e3, el->utilisation, fac, w,
                hf_criteria_overloaded(el->utilisation) ? "  OVERLOADED" : "");
    }
    fprintf(out, "anchors over the envelope (largest load and angle, smallest factors)%s:\n",
            m->criteria.anchor_ignore_friction ? ", line's seabed friction ignored" : "");
    for (size_t i = 0; i < m->nlines && i < e->nlines; i++)
        envelope_anchor(out, m, i, &e->line[i]);
    if (e->overloaded) {
        hf_analysis_where at = e->overload_at;
        hf_results_where(m, &at, w, sizeof w);
        fprintf(out, "OVERLOADED: %zu conditions have a line at or beyond its MBL; worst: %s at "
                     "utilisation %.3f (%s)\n",
                e->overloaded, hf_results_line_name(m, e->overload_line), e->overload_utilisation,
                w);
    }
}
