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
    "load",           "condition",        "status",          "surge_m",   "sway_m", "yaw_deg",
    "max_tension_kN", "max_tension_line", "max_utilisation", "criterion", "passed"};

const char *const hf_results_balance_tail[HF_RESULTS_BALANCE_TAIL] = {
    "horizontal_m", "max_utilisation_line", "min_line_factor", "required_line_factor", "message"};

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
    /* Tmax: the largest tension along the line, not the fairlead tension
     * that T_<line>_kN means in the curve and sweep CSVs (issue 11 item 2) */
    return header(out, m, hf_results_balance_head, HF_RESULTS_BALANCE_HEAD, "Tmax",
                  hf_results_balance_tail, HF_RESULTS_BALANCE_TAIL, err);
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
