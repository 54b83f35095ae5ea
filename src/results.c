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
    "load",    "condition",      "water_level_m",    "status",          "surge_m",   "sway_m",
    "yaw_deg", "max_tension_kN", "max_tension_line", "max_utilisation", "criterion", "passed"};

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

/* ---- cells ---- */

static hf_results_cell num(double v)
{
    hf_results_cell c = {HF_RESULTS_NUMBER, v, NULL};
    return c;
}

static hf_results_cell text(const char *t)
{
    hf_results_cell c = {HF_RESULTS_TEXT, 0.0, t ? t : ""};
    return c;
}

static hf_results_cell empty(void)
{
    hf_results_cell c = {HF_RESULTS_EMPTY, 0.0, NULL};
    return c;
}

/* Writes n cells (the caller ends the row). */
static void cells_write(hf_csv *c, const hf_results_cell *cells, size_t n)
{
    for (size_t j = 0; j < n; j++) {
        if (cells[j].kind == HF_RESULTS_NUMBER)
            hf_csv_field_double(c, cells[j].value);
        else if (cells[j].kind == HF_RESULTS_TEXT)
            hf_csv_field_str(c, cells[j].text);
        else
            hf_csv_field_empty(c);
    }
}

void hf_results_lines_row(const hf_model *m, const hf_spread_result *r, size_t i,
                          hf_results_cell *cells, hf_results_text *t)
{
    const hf_line_state *s = &r->states[i];
    cells[0] = text(m->lines[i].name);
    cells[1] = text(hf_results_line_status(r, i, t->a, sizeof t->a));
    if (!hf_results_line_solved(r, i)) {
        for (int k = 2; k < HF_RESULTS_LINES_COLUMNS - 1; k++)
            cells[k] = empty();
        cells[HF_RESULTS_LINES_COLUMNS - 1] = text("");
        return;
    }
    cells[2] = num(s->tension / 1e3);
    cells[3] = num(s->h / 1e3);
    cells[4] = num(s->v / 1e3);
    cells[5] = num(hf_results_line_top_angle_deg(s));
    cells[6] = num(s->anchor_tension / 1e3);
    cells[7] = num(s->anchor_v / 1e3);
    cells[8] = num(s->anchor_angle * 180.0 / M_PI);
    cells[9] = num(s->grounded);
    cells[10] = num(r->geom[i].x);
    cells[11] = num(s->max_utilisation);
    cells[12] = num(r->geom[i].z);
    cells[13] = num(s->anchor_h / 1e3);
    cells[14] = num(s->touchdown_x);
    cells[15] = num(r->line_tension[i] / 1e3);
    cells[16] = text(hf_results_line_alert(r, i));
}

size_t hf_results_lines_write(FILE *out, const hf_model *m, const hf_spread_result *r)
{
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header_array(&c, hf_results_lines_columns, HF_RESULTS_LINES_COLUMNS);
    for (size_t i = 0; i < m->nlines; i++) {
        hf_results_cell cells[HF_RESULTS_LINES_COLUMNS];
        hf_results_text t;
        hf_results_lines_row(m, r, i, cells, &t);
        cells_write(&c, cells, HF_RESULTS_LINES_COLUMNS);
        hf_csv_end_row(&c);
    }
    return c.nonfinite;
}

void hf_results_stiffness_row(double K[6][6], const double force[6], int i, hf_results_cell *cells)
{
    cells[0] = text(i < 6 ? dof[i] : "static_load");
    for (int j = 0; j < 6; j++)
        cells[1 + j] = num((i < 6 ? K[i][j] : force[j]) / 1e3);
}

size_t hf_results_stiffness_write(FILE *out, double K[6][6], const double force[6])
{
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header_array(&c, hf_results_stiffness_columns, HF_RESULTS_STIFFNESS_COLUMNS);
    for (int i = 0; i <= 6; i++) {
        hf_results_cell cells[HF_RESULTS_STIFFNESS_COLUMNS];
        hf_results_stiffness_row(K, force, i, cells);
        cells_write(&c, cells, HF_RESULTS_STIFFNESS_COLUMNS);
        hf_csv_end_row(&c);
    }
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

/* Column j of a header head[0..nhead-1], <per>_<line>_kN per line of m,
 * tail[0..ntail-1], into buf (cap bytes).  Returns buf. */
static const char *column(const hf_model *m, const char *const *head, size_t nhead, const char *per,
                          const char *const *tail, size_t j, char *buf, size_t cap)
{
    if (j < nhead)
        snprintf(buf, cap, "%s", head[j]);
    else if (j < nhead + m->nlines)
        snprintf(buf, cap, "%s_%s_kN", per, hf_results_line_name(m, j - nhead));
    else
        snprintf(buf, cap, "%s", tail[j - nhead - m->nlines]);
    return buf;
}

/* A header row: the columns above. */
static hf_status header(FILE *out, const hf_model *m, const char *const *head, size_t nhead,
                        const char *per, const char *const *tail, size_t ntail, hf_error *err)
{
    hf_status s = check_names(m, err);
    if (s != HF_OK)
        return s;
    hf_csv c;
    hf_csv_init(&c, out, 0);
    for (size_t j = 0; j < nhead + m->nlines + ntail; j++) {
        char name[HF_MODEL_MAX_NAME + 16];
        hf_csv_field_str(&c, column(m, head, nhead, per, tail, j, name, sizeof name));
    }
    hf_csv_end_row(&c);
    return HF_OK;
}

static const char *const curve_tail[] = {"alert"};

size_t hf_results_curve_ncolumns(const hf_model *m)
{
    return HF_RESULTS_CURVE_FIXED + m->nlines + 1;
}

size_t hf_results_balance_ncolumns(const hf_model *m)
{
    return HF_RESULTS_BALANCE_HEAD + m->nlines * (1 + HF_RESULTS_BALANCE_ANCHOR) +
           HF_RESULTS_BALANCE_TAIL;
}

const char *hf_results_curve_column_name(const hf_model *m, size_t j, char *buf, size_t cap)
{
    return column(m, hf_results_curve_columns, HF_RESULTS_CURVE_FIXED, "T", curve_tail, j, buf,
                  cap);
}

const char *hf_results_balance_column_name(const hf_model *m, size_t j, char *buf, size_t cap)
{
    /* Tmax: the largest tension along the line, not the fairlead tension
     * that T_<line>_kN means in the curve and sweep CSVs (issue 11 item 2);
     * then the anchor groups, each nlines wide */
    size_t nl = m->nlines, per = HF_RESULTS_BALANCE_HEAD + nl;
    if (j < per)
        return column(m, hf_results_balance_head, HF_RESULTS_BALANCE_HEAD, "Tmax",
                      hf_results_balance_tail, j, buf, cap);
    if (j < per + HF_RESULTS_BALANCE_ANCHOR * nl) {
        const char *const *g = hf_results_balance_anchor_groups[(j - per) / nl];
        snprintf(buf, cap, "%s_%s%s", g[0], hf_results_line_name(m, (j - per) % nl), g[1]);
        return buf;
    }
    snprintf(buf, cap, "%s", hf_results_balance_tail[j - per - HF_RESULTS_BALANCE_ANCHOR * nl]);
    return buf;
}

hf_status hf_results_curve_header_write(FILE *out, const hf_model *m, hf_error *err)
{
    return header(out, m, hf_results_curve_columns, HF_RESULTS_CURVE_FIXED, "T", curve_tail, 1,
                  err);
}

int hf_results_curve_overloaded(const hf_analysis_curve *c, size_t k)
{
    return c->status[k] == HF_OK && hf_criteria_overloaded(c->max_utilisation[k]);
}

hf_results_cell hf_results_curve_cell(const hf_model *m, const hf_analysis_curve *c, size_t k,
                                      size_t j)
{
    size_t n = hf_results_curve_ncolumns(m);
    if (j == 0)
        return num(c->offset[k]);
    if (c->status[k] != HF_OK) /* the offset only: the gap is intended */
        return j == 7 || j == n - 1 ? text("") : empty();
    if (j == n - 1)
        return text(hf_results_curve_overloaded(c, k) ? HF_RESULTS_ALERT_OVERLOADED : "");
    if (j >= HF_RESULTS_CURVE_FIXED)
        return num(c->fairlead_tension[k * c->nlines + (j - HF_RESULTS_CURVE_FIXED)] / 1e3);
    switch (j) {
    case 1:
        return num(c->restoring[k] / 1e3);
    case 2:
        return num(c->force_x[k] / 1e3);
    case 3:
        return num(c->force_y[k] / 1e3);
    case 4:
        return num(c->moment_z[k] / 1e3);
    case 5:
        return num(c->stiffness[k] / 1e3);
    case 6:
        return num(c->max_tension[k] / 1e3);
    case 7:
        return text(c->max_tension_line[k] < m->nlines
                        ? hf_results_line_name(m, c->max_tension_line[k])
                        : "");
    default:
        return num(c->max_utilisation[k]);
    }
}

size_t hf_results_curve_row_write(FILE *out, const hf_model *m, const hf_analysis_curve *c,
                                  size_t k)
{
    hf_csv w;
    hf_csv_init(&w, out, 0);
    for (size_t j = 0; j < hf_results_curve_ncolumns(m); j++) {
        hf_results_cell cell = hf_results_curve_cell(m, c, k, j);
        cells_write(&w, &cell, 1);
    }
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
    for (size_t j = 0; j < hf_results_balance_ncolumns(m); j++) {
        char name[HF_MODEL_MAX_NAME + 32];
        hf_csv_field_str(&c, hf_results_balance_column_name(m, j, name, sizeof name));
    }
    hf_csv_end_row(&c);
    return HF_OK;
}

/* A positive number, or an empty cell for 0 (= not checked / none); NaN
 * stays a number so that the writer counts it. */
static hf_results_cell positive_or_empty(double v)
{
    return v > 0.0 || isnan(v) ? num(v) : empty();
}

/* Cell j of the columns after the per-line tensions and anchors (tail column j). */
static hf_results_cell balance_tail(const hf_model *m, const hf_load *load,
                                    const hf_balance_result *r, size_t j)
{
    (void)load;
    int ok = r->status == HF_OK;
    switch (j) {
    case 0:
        return ok ? num(r->horizontal) : empty();
    case 1:
        return text(ok && r->max_utilisation_line != HF_BALANCE_NONE
                        ? hf_results_line_name(m, r->max_utilisation_line)
                        : "");
    case 2:
        return ok ? positive_or_empty(hf_results_balance_min_factor(r)) : empty();
    case 3:
        return positive_or_empty(hf_criteria_required(&m->criteria, r->broken != HF_BALANCE_NONE));
    case 4:
        return text(r->message);
    default:
        return text(ok && r->overloaded ? HF_RESULTS_ALERT_OVERLOADED : "");
    }
}

/* Cell of anchor group g (hf_results_balance_anchor_groups) of line i: empty
 * for a broken line, no result, or a factor the anchor does not have. */
static hf_results_cell balance_anchor(const hf_balance_result *r, size_t g, size_t i)
{
    if (r->status != HF_OK || !r->anchor || r->broken == i || i >= r->nlines)
        return empty();
    const hf_anchor_criterion *a = &r->anchor[i];
    int gravity = a->kind == HF_ANCHOR_GRAVITY;
    if (g == 0)
        return num(a->load / 1e3);
    if (g == 1)
        return num(a->angle * RAD2DEG);
    if (g == 2)
        return gravity && a->has_sliding ? num(a->sliding_factor) : empty();
    return gravity && a->has_uplift ? num(a->uplift_factor) : empty();
}

hf_results_cell hf_results_balance_cell(const hf_model *m, const hf_load *load,
                                        const hf_balance_result *r, size_t j, hf_results_text *t)
{
    int ok = r->status == HF_OK;
    size_t nl = m->nlines, per = HF_RESULTS_BALANCE_HEAD + nl;
    if (j >= per + HF_RESULTS_BALANCE_ANCHOR * nl)
        return balance_tail(m, load, r, j - per - HF_RESULTS_BALANCE_ANCHOR * nl);
    if (j >= per)
        return balance_anchor(r, (j - per) / nl, (j - per) % nl);
    if (j >= HF_RESULTS_BALANCE_HEAD)
        return ok ? num(r->tension[j - HF_RESULTS_BALANCE_HEAD] / 1e3) : empty();
    switch (j) {
    case 0:
        return text(load->name);
    case 1:
        hf_results_balance_condition(m, r, t->a, sizeof t->a);
        return text(t->a);
    case 2:
        return num(m->site.water_level); /* the level the row was solved at */
    case 3:
        return text(hf_status_str(r->status));
    case 10:
        hf_results_balance_criterion(m, r, t->b, sizeof t->b);
        return text(t->b);
    case 11:
        return num(r->passed ? 1 : 0);
    case 8:
        return text(ok && r->max_tension_line != HF_BALANCE_NONE
                        ? hf_results_line_name(m, r->max_tension_line)
                        : "");
    default:
        break;
    }
    if (!ok)
        return empty();
    switch (j) {
    case 4:
        return num(r->offset[0]);
    case 5:
        return num(r->offset[1]);
    case 6:
        return num(r->offset[2] * RAD2DEG);
    case 7:
        return num(r->max_tension / 1e3);
    default:
        return num(r->max_utilisation);
    }
}

size_t hf_results_balance_row_write(FILE *out, const hf_model *m, const hf_load *load,
                                    const hf_balance_result *r)
{
    hf_results_text t;
    hf_csv c;
    hf_csv_init(&c, out, 0);
    for (size_t j = 0; j < hf_results_balance_ncolumns(m); j++) {
        hf_results_cell cell = hf_results_balance_cell(m, load, r, j, &t);
        cells_write(&c, &cell, 1);
    }
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

/* The failed check of anchor a (line name n) in words. */
static void anchor_failure(const char *n, const hf_anchor_criterion *a, char *buf, size_t cap)
{
    if (a->kind == HF_ANCHOR_DRAG)
        snprintf(buf, cap, "%s uplift angle %.2f deg > %.2f deg", n, a->angle * RAD2DEG,
                 a->max_angle * RAD2DEG);
    else if (a->has_uplift && a->uplift_factor < a->required_uplift)
        snprintf(buf, cap, "%s uplift %.3f < %.2f", n, a->uplift_factor, a->required_uplift);
    else
        snprintf(buf, cap, "%s sliding %.3f < %.2f", n, a->sliding_factor, a->required_sliding);
}

void hf_results_balance_failure(const hf_model *m, const hf_balance_result *r, char *buf,
                                size_t cap)
{
    buf[0] = '\0';
    if (r->passed || r->status != HF_OK)
        return;
    size_t i = r->criterion_line;
    const char *n = hf_results_line_name(m, i);
    double req = hf_criteria_required(&m->criteria, r->broken != HF_BALANCE_NONE);
    switch (r->criterion) {
    case HF_CRIT_OVERLOAD:
        snprintf(buf, cap, "%s overloaded: T/MBL %.3f", n, r->utilisation[i]);
        break;
    case HF_CRIT_LINE:
        if (i < r->nlines)
            snprintf(buf, cap, "MBL/T %.3f < %.3f (%s)", r->line[i].factor, req, n);
        break;
    case HF_CRIT_OFFSET:
        snprintf(buf, cap, "offset %.2f m > %.2f m", r->horizontal, m->criteria.max_offset);
        break;
    case HF_CRIT_ANCHOR:
        if (i < r->nlines && r->anchor)
            anchor_failure(n, &r->anchor[i], buf, cap);
        break;
    default:
        break;
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
        fprintf(out,
                "OVERLOADED: %zu conditions have a line at or beyond its MBL; worst: %s at "
                "utilisation %.3f (%s)\n",
                e->overloaded, hf_results_line_name(m, e->overload_line), e->overload_utilisation,
                w);
    }
}
