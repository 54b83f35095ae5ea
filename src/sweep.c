/* sweep.c - parametric sweeps: output names, per-thread evaluation, CSV rows. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <stdint.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/criteria.h"
#include "holdfast/csv.h"
#include "holdfast/results.h"
#include "holdfast/sweep.h"

#define NONE ((size_t)-1)

const char *hf_sweep_status_word(hf_status s)
{
    switch (s) {
    case HF_OK:
        return "ok";
    case HF_EINVAL:
        return "invalid";
    case HF_EUNSUPPORTED:
        return "unsupported";
    case HF_ENOCONV:
        return "no_convergence";
    case HF_ENOEQUIL:
        return "no_equilibrium";
    default:
        return "failed";
    }
}

/* ---- evaluation ---- */

/* One CSV column of outputs: the catalogue's column and, for an output
 * under a load (offset_<load>, NAME@LOAD), the slot of its load among the
 * distinct loads solved per case. */
typedef struct {
    hf_output_column c;
    size_t slot;
} column;

/* The intact mean equilibrium of one case under one load (one slot): what
 * the outputs under a load read, copied from the balance result. */
typedef struct {
    hf_status status;
    double offset[3];        /* surge, sway (m), yaw (rad) from the rest pose */
    double horizontal;       /* m */
    double max_tension;      /* N, largest along any line */
    double max_utilisation;  /* - */
    size_t max_tension_line; /* NONE when no line carries load */
    size_t max_utilisation_line;
    double *tension;     /* nlines: largest along each line, N */
    double *utilisation; /* nlines: T/MBL of the most loaded section, - */
} equilibrium;

typedef struct {
    const hf_sweep *plan;
    hf_model model; /* this thread's copy */
    hf_param param[HF_STUDY_MAX_VARY];
    hf_spread *ws;
    hf_balance *bal; /* NULL unless an output under a load is asked for */
    hf_spread_result res;
    double K[6][6];
    hf_status solved;  /* spread status of the current case */
    equilibrium *eq;   /* per distinct load */
    double *eq_values; /* 2 x nbal x nlines: the eq[].tension and utilisation arrays */
    double *vals;      /* ncols: the current row's outputs, column units */
    uint64_t failed;   /* emitted cases whose status was not ok */
    uint64_t over_n;   /* emitted cases with an overloaded line */
    uint64_t over_k;   /* the first of them (valid when over_n) */
    double over_util;  /* its largest utilisation, - */
    size_t over_line;  /* its most utilised line */
    size_t over_slot;  /* the load slot where it is largest, NONE at rest */
    hf_error err;
} thread_state;

struct hf_sweep {
    const hf_model *base;
    const hf_vary *vary;
    hf_dim dim[HF_STUDY_MAX_VARY];
    hf_study_grid grid;
    size_t ncols;
    column *cols;
    char **qname; /* CSV-quoted line names */
    int need_k;
    size_t nbal; /* distinct loads of the outputs under a load */
    size_t *bal_load;
    int jobs;
    thread_state **th;
    size_t row_cap;
    hf_sweep_table *table; /* during hf_sweep_run: where rows are kept, or NULL */
};

static void thread_free(thread_state *t)
{
    if (!t)
        return;
    hf_balance_free(t->bal);
    hf_spread_free(t->ws);
    hf_model_free(&t->model);
    hf_free(t->eq);
    hf_free(t->eq_values);
    hf_free(t->vals);
    hf_free(t);
}

static thread_state *thread_alloc(const hf_sweep *s, hf_error *err)
{
    thread_state *t = hf_calloc(1, sizeof *t);
    if (!t) {
        hf_error_set(err, HF_ENOMEM, "out of memory for a sweep thread");
        return NULL;
    }
    t->plan = s;
    hf_model_init(&t->model);
    if (hf_model_copy(&t->model, s->base) != HF_OK) {
        hf_error_set(err, HF_ENOMEM, "out of memory copying the model for a sweep thread");
        goto fail;
    }
    for (size_t j = 0; j < s->grid.nvary; j++)
        if (hf_model_param_lookup(&t->model, s->vary[j].path, &t->param[j], err) != HF_OK)
            goto fail;
    t->ws = hf_spread_alloc(&t->model, err);
    if (!t->ws)
        goto fail;
    t->vals = hf_calloc(s->ncols ? s->ncols : 1, sizeof *t->vals);
    if (!t->vals) {
        hf_error_set(err, HF_ENOMEM, "out of memory for a sweep thread");
        goto fail;
    }
    if (s->nbal) {
        size_t nl = t->model.nlines;
        t->bal = hf_balance_alloc(&t->model, err);
        t->eq = hf_calloc(s->nbal, sizeof *t->eq);
        t->eq_values = hf_calloc(2 * s->nbal * nl, sizeof *t->eq_values);
        if (!t->bal || !t->eq || !t->eq_values) {
            if (t->bal)
                hf_error_set(err, HF_ENOMEM, "out of memory for a sweep thread");
            goto fail;
        }
        for (size_t b = 0; b < s->nbal; b++) {
            t->eq[b].tension = t->eq_values + 2 * b * nl;
            t->eq[b].utilisation = t->eq_values + (2 * b + 1) * nl;
        }
    }
    return t;
fail:
    thread_free(t);
    return NULL;
}

/* Points e at balance result r (its arrays borrowed from r). */
static void view_equilibrium(equilibrium *e, const hf_balance_result *r)
{
    e->status = r->status;
    memcpy(e->offset, r->offset, sizeof r->offset);
    e->horizontal = r->horizontal;
    e->max_tension = r->max_tension;
    e->max_utilisation = r->max_utilisation;
    e->max_tension_line = r->max_tension_line;
    e->max_utilisation_line = r->max_utilisation_line;
    e->tension = r->tension;
    e->utilisation = r->utilisation;
}

/* Copies what the outputs under a load read from balance result r into e
 * (e's own arrays, r->nlines entries each). */
static void keep_equilibrium(equilibrium *e, const hf_balance_result *r)
{
    double *t = e->tension, *u = e->utilisation;
    view_equilibrium(e, r);
    memcpy(t, r->tension, r->nlines * sizeof *t);
    memcpy(u, r->utilisation, r->nlines * sizeof *u);
    e->tension = t;
    e->utilisation = u;
}

/* Solves case k on thread t: sets every varied parameter, solves the spread
 * at the rest pose (with the 6x6 stiffness when asked for) and, when that
 * succeeded, the intact equilibrium under each load of the outputs under a
 * load.  Every case is solved in full
 * even when its row is not written (a chain rebuilt ahead of a shard), so the
 * warm starts of the next cases do not depend on where the shard began.
 * Returns the case status (first failure). */
static hf_status evaluate(thread_state *t, uint64_t k)
{
    const hf_sweep *s = t->plan;
    double v[HF_STUDY_MAX_VARY];
    hf_study_grid_values(&s->grid, k, v);
    /* Anchors back to the case's positions first, so an anchor_radius value
     * moves the anchor along the case's own direction, whatever the history
     * of this thread (results depend on k only). */
    for (size_t i = 0; i < t->model.nlines; i++) {
        t->model.lines[i].anchor[0] = s->base->lines[i].anchor[0];
        t->model.lines[i].anchor[1] = s->base->lines[i].anchor[1];
    }
    t->solved = HF_EINVAL;
    for (size_t j = 0; j < s->grid.nvary; j++)
        if (hf_model_param_set(&t->model, &t->param[j], v[j], &t->err) != HF_OK)
            return HF_EINVAL;
    hf_pose pose;
    hf_spread_pose_rest(&t->model, &pose);
    if (s->need_k)
        t->solved = hf_spread_stiffness(t->ws, &pose, t->K, &t->res, &t->err);
    else
        t->solved = hf_spread_solve(t->ws, &pose, &t->res, &t->err);
    hf_status st = t->solved;
    if (st != HF_OK)
        return st;
    /* The balance starts from the rest pose of this case (hull.heading and
     * position, anchors and fairleads may be varied). */
    if (t->bal)
        hf_balance_refresh(t->bal);
    for (size_t b = 0; b < s->nbal; b++) {
        hf_status bs = HF_ENOMEM;
        const hf_balance_result *r = NULL;
        if (t->bal) {
            bs = hf_balance_solve(t->bal, &t->model.loads[s->bal_load[b]], 0, &t->err);
            r = hf_balance_result_at(t->bal, 0);
        }
        t->eq[b].status = bs;
        if (bs == HF_OK && r)
            keep_equilibrium(&t->eq[b], r);
        else if (st == HF_OK)
            st = bs == HF_OK ? HF_EINVAL : bs;
    }
    return st;
}

static char *put_num(char *p, double v)
{
    *p++ = ',';
    if (isfinite(v))
        p += hf_csv_format_double(p, v, HF_CSV_DIGITS_DEFAULT);
    return p;
}

static char *put_text(char *p, const char *text)
{
    *p++ = ',';
    size_t n = strlen(text);
    memcpy(p, text, n);
    return p + n;
}

/* Value of a per-line or spread output from the solved state, SI. */
static double line_value(const thread_state *t, hf_output_kind kind, size_t i)
{
    const hf_line_state *ls = &t->res.states[i];
    if (t->res.broken && t->res.broken[i])
        return 0.0;
    switch (kind) {
    case HF_OUT_FAIRLEAD_TENSION:
        return ls->tension;
    case HF_OUT_FAIRLEAD_HORIZONTAL:
        return ls->h;
    case HF_OUT_FAIRLEAD_VERTICAL:
        return ls->v;
    case HF_OUT_ANCHOR_TENSION:
        return ls->anchor_tension;
    case HF_OUT_UTILISATION:
        return ls->max_utilisation;
    default:
        return 0.0;
    }
}

static double spread_value(const thread_state *t, hf_output_kind kind)
{
    switch (kind) {
    case HF_OUT_MAX_TENSION:
        return t->res.max_tension;
    case HF_OUT_MAX_UTILISATION:
        return t->res.max_utilisation;
    case HF_OUT_STIFFNESS_SURGE:
        return t->K[0][0];
    case HF_OUT_STIFFNESS_SWAY:
        return t->K[1][1];
    case HF_OUT_STIFFNESS_HEAVE:
        return t->K[2][2];
    case HF_OUT_STIFFNESS_YAW:
        return t->K[5][5];
    case HF_OUT_VERTICAL_LOAD:
        return -t->res.force[2]; /* the mooring pulls the hull down: Fz < 0 */
    default:
        return 0.0;
    }
}

/* The varied values of case k in their column units (deg for angles). */
static void vary_values(const hf_sweep *s, uint64_t k, double *v)
{
    hf_study_grid_values(&s->grid, k, v);
    for (size_t j = 0; j < s->grid.nvary; j++)
        if (s->dim[j] == HF_DIM_ANGLE)
            v[j] *= 180.0 / M_PI;
}

/* Value of an output under a load from equilibrium e, SI (a line-name
 * column: the line's index, NAN when there is none). */
static double equilibrium_value(const equilibrium *e, const hf_output_column *c, size_t nlines)
{
    size_t li = NONE;
    switch (c->kind) {
    case HF_OUT_OFFSET:
        return e->offset[c->sub >= 0 && c->sub < 3 ? c->sub : 0];
    case HF_OUT_OFFSET_AT:
        return e->horizontal;
    case HF_OUT_TENSION_AT:
        return c->line < nlines ? e->tension[c->line] : NAN;
    case HF_OUT_UTILISATION_AT:
        return c->line < nlines ? e->utilisation[c->line] : NAN;
    case HF_OUT_MAX_TENSION_AT:
        li = e->max_tension_line;
        return c->sub ? (li < nlines ? (double)li : NAN) : e->max_tension;
    case HF_OUT_MAX_UTILISATION_AT:
        li = e->max_utilisation_line;
        return c->sub ? (li < nlines ? (double)li : NAN) : e->max_utilisation;
    default:
        return NAN;
    }
}

/* The value of one output column of the solved case, in the column's unit;
 * NAN for an empty cell.  Line-name columns give the line's index. */
static double column_value(const thread_state *t, const column *col)
{
    const hf_output_column *c = &col->c;
    const hf_output_info *in = hf_output_info_of(c->kind);
    if (c->kind == HF_OUT_OFFSET || in->at_load) {
        const equilibrium *e = &t->eq[col->slot];
        if (e->status != HF_OK)
            return NAN;
        double v = equilibrium_value(e, c, t->model.nlines);
        return hf_output_column_is_line(c) ? v : v * hf_output_column_scale(c);
    }
    if (hf_output_column_is_line(c)) {
        size_t li =
            c->kind == HF_OUT_MAX_TENSION ? t->res.max_tension_line : t->res.max_utilisation_line;
        return li < t->plan->base->nlines ? (double)li : NAN;
    }
    if (hf_output_info_of(c->kind)->per_line)
        return line_value(t, c->kind, c->line) * hf_output_column_scale(c);
    return spread_value(t, c->kind) * hf_output_column_scale(c);
}

/* Every output of the case into t->vals: all empty (NAN) unless the case
 * solved in full (status ok), so a row whose status says a load case found
 * no equilibrium carries no rest-pose numbers either. */
static void row_values(thread_state *t, hf_status st)
{
    const hf_sweep *s = t->plan;
    for (size_t c = 0; c < s->ncols; c++)
        t->vals[c] = st == HF_OK ? column_value(t, &s->cols[c]) : NAN;
}

/* The case's largest utilisation: at rest or at one of the equilibria
 * under a load that were solved for its outputs (*slot: that load's slot,
 * NONE at rest; *line: the line, NONE when none carries load). */
static double worst_utilisation(const thread_state *t, size_t *slot, size_t *line)
{
    double u = t->res.max_utilisation;
    *slot = NONE;
    *line = t->res.max_utilisation_line;
    for (size_t b = 0; b < t->plan->nbal; b++)
        if (t->eq[b].status == HF_OK && t->eq[b].max_utilisation > u) {
            u = t->eq[b].max_utilisation;
            *slot = b;
            *line = t->eq[b].max_utilisation_line;
        }
    return u;
}

/* 1 when case st solved in full and a line is overloaded at rest or at an
 * equilibrium under a load of the outputs (hf_criteria_overloaded, the
 * alert column's rule). */
static int overloaded(const thread_state *t, hf_status st)
{
    size_t slot, line;
    return st == HF_OK && hf_criteria_overloaded(worst_utilisation(t, &slot, &line));
}

static int format_row(thread_state *t, uint64_t k, hf_status st, char *buf, size_t cap)
{
    const hf_sweep *s = t->plan;
    if (cap < s->row_cap)
        return (int)cap;
    double v[HF_STUDY_MAX_VARY];
    vary_values(s, k, v);
    char *p = buf;
    for (size_t j = 0; j < s->grid.nvary; j++)
        p = put_num(p, v[j]);
    /* The first field has no leading comma: shift the row left by one. */
    memmove(buf, buf + 1, (size_t)(p - buf - 1));
    p--;
    p = put_text(p, hf_sweep_status_word(st));
    row_values(t, st);
    for (size_t c = 0; c < s->ncols; c++) {
        double x = t->vals[c];
        if (hf_output_column_is_line(&s->cols[c].c)) {
            p = put_text(p, isfinite(x) ? s->qname[(size_t)x] : "");
        } else {
            p = put_num(p, x);
        }
    }
    p = put_text(p, overloaded(t, st) ? "overloaded" : "");
    *p++ = '\n';
    *p = '\0';
    return (int)(p - buf);
}

/* Keeps case k's row in the table when it has room (cases are distinct, so
 * threads write distinct rows; the counters are per thread, summed after). */
static void keep_row(thread_state *t, uint64_t k, hf_status st)
{
    hf_sweep_table *tb = t->plan->table;
    if (!tb || k < tb->first || k - tb->first >= tb->cap)
        return;
    uint64_t i = k - tb->first;
    vary_values(t->plan, k, tb->vary + i * tb->nvary);
    tb->status[i] = st;
    memcpy(tb->out + i * tb->ncols, t->vals, tb->ncols * sizeof *t->vals);
}

static int sweep_row(void *state, uint64_t k, int start, int emit, char *buf, size_t cap)
{
    thread_state *t = state;
    if (start) {
        hf_spread_reset(t->ws);
        hf_balance_reset(t->bal); /* NULL without offset outputs */
    }
    hf_status st = evaluate(t, k);
    if (!emit)
        return 0;
    if (st != HF_OK)
        t->failed++;
    if (overloaded(t, st) && (!t->over_n++ || k < t->over_k)) {
        t->over_k = k;
        t->over_util = worst_utilisation(t, &t->over_slot, &t->over_line);
    }
    int n = format_row(t, k, st, buf, cap);
    keep_row(t, k, st);
    return n;
}

/* ---- set-up ---- */

/* RFC 4180 quoting of a name into a new string. */
static char *quoted(const char *name)
{
    size_t n = strlen(name), q = 0;
    int need = n == 0 || name[0] == ' ' || name[n - 1] == ' ';
    for (size_t i = 0; i < n; i++) {
        if (name[i] == '"')
            q++;
        if (strchr(",\"\r\n", name[i]))
            need = 1;
    }
    if (!need)
        return hf_strdup(name);
    char *out = hf_malloc(n + q + 3);
    if (!out)
        return NULL;
    char *p = out;
    *p++ = '"';
    for (size_t i = 0; i < n; i++) {
        if (name[i] == '"')
            *p++ = '"';
        *p++ = name[i];
    }
    *p++ = '"';
    *p = '\0';
    return out;
}

static hf_status add_column(hf_sweep *s, size_t *cap, column c)
{
    if (s->ncols == *cap) {
        size_t nc = *cap ? 2 * *cap : 16;
        column *n = hf_realloc(s->cols, nc * sizeof *n);
        if (!n)
            return HF_ENOMEM;
        s->cols = n;
        *cap = nc;
    }
    s->cols[s->ncols++] = c;
    return HF_OK;
}

/* The slot of load li among the distinct loads of offset outputs. */
static size_t balance_slot(hf_sweep *s, size_t li)
{
    size_t b = 0;
    while (b < s->nbal && s->bal_load[b] != li)
        b++;
    if (b == s->nbal)
        s->bal_load[s->nbal++] = li;
    return b;
}

/* Appends the catalogue's columns of output o (slot: its load's slot). */
static hf_status add_columns(hf_sweep *s, const hf_output *o, size_t slot, size_t *cap)
{
    size_t n = hf_output_columns(s->base, o, NULL, 0);
    hf_output_column *oc = hf_calloc(n ? n : 1, sizeof *oc);
    if (!oc)
        return HF_ENOMEM;
    hf_output_columns(s->base, o, oc, n);
    hf_status st = HF_OK;
    for (size_t i = 0; i < n && st == HF_OK; i++) {
        column c = {oc[i], slot};
        st = add_column(s, cap, c);
    }
    hf_free(oc);
    return st;
}

static hf_status plan_outputs(hf_sweep *s, const char *const *outputs, size_t noutputs,
                              hf_error *err)
{
    if (noutputs == 0)
        outputs = hf_output_defaults(&noutputs);
    s->bal_load = hf_calloc(noutputs, sizeof *s->bal_load);
    if (!s->bal_load)
        return hf_error_set(err, HF_ENOMEM, "out of memory planning the sweep outputs");
    size_t cap = 0;
    for (size_t o = 0; o < noutputs; o++) {
        hf_output out;
        hf_status st = hf_output_parse(s->base, outputs[o], &out, err);
        if (st != HF_OK)
            return st;
        if (out.kind >= HF_OUT_STIFFNESS_SURGE && out.kind <= HF_OUT_STIFFNESS_YAW)
            s->need_k = 1;
        size_t slot = hf_output_needs_balance(&out) ? balance_slot(s, out.load) : 0;
        if (add_columns(s, &out, slot, &cap) != HF_OK)
            return hf_error_set(err, HF_ENOMEM, "out of memory planning the sweep outputs");
    }
    return HF_OK;
}

/* Checks every path on (a copy of) the model first, for a clear message,
 * records their dimensions and refuses a parameter varied twice (also
 * through another spelling or an overlapping path: hf_model_param_same). */
static hf_status check_paths(hf_sweep *s, const hf_model *m, const hf_vary *vary, size_t nvary,
                             hf_error *err)
{
    hf_model probe;
    hf_model_init(&probe);
    if (hf_model_copy(&probe, m) != HF_OK)
        return hf_error_set(err, HF_ENOMEM, "out of memory preparing the sweep");
    hf_param p[HF_STUDY_MAX_VARY];
    hf_status st = HF_OK;
    for (size_t j = 0; j < nvary && st == HF_OK; j++) {
        st = hf_model_param_lookup(&probe, vary[j].path, &p[j], err);
        s->dim[j] = p[j].dim;
        for (size_t i = 0; i < j && st == HF_OK; i++)
            if (hf_model_param_same(&p[i], &p[j]))
                st = hf_error_set(err, HF_EINVAL,
                                  "the parameter %s is varied twice: \"%s\" sets the same value "
                                  "as \"%s\"; vary each parameter once",
                                  vary[j].path, vary[j].path, vary[i].path);
    }
    hf_model_free(&probe);
    return st;
}

hf_sweep *hf_sweep_alloc(const hf_model *m, const hf_vary *vary, size_t nvary, int zip,
                         const char *const *outputs, size_t noutputs, int jobs, hf_error *err)
{
    if (!m || jobs < 1) {
        hf_error_set(err, HF_EINVAL, "a sweep needs a model and at least one thread");
        return NULL;
    }
    if (m->nlines == 0) {
        hf_error_set(err, HF_EINVAL, "a sweep needs a case with at least one line");
        return NULL;
    }
    hf_sweep *s = hf_calloc(1, sizeof *s);
    if (!s) {
        hf_error_set(err, HF_ENOMEM, "out of memory preparing the sweep");
        return NULL;
    }
    s->base = m;
    s->vary = vary;
    if (hf_study_grid_init(&s->grid, vary, nvary, zip, err) != HF_OK)
        goto fail;
    if (check_paths(s, m, vary, nvary, err) != HF_OK)
        goto fail;
    if (plan_outputs(s, outputs, noutputs, err) != HF_OK)
        goto fail;
    s->qname = hf_calloc(m->nlines, sizeof *s->qname);
    if (!s->qname) {
        hf_error_set(err, HF_ENOMEM, "out of memory preparing the sweep");
        goto fail;
    }
    size_t longest = 0;
    for (size_t i = 0; i < m->nlines; i++) {
        s->qname[i] = quoted(m->lines[i].name ? m->lines[i].name : "");
        if (!s->qname[i]) {
            hf_error_set(err, HF_ENOMEM, "out of memory preparing the sweep");
            goto fail;
        }
        if (strlen(s->qname[i]) > longest)
            longest = strlen(s->qname[i]);
    }
    /* Every field: a separator and at most HF_CSV_NUMBER_MAX - 1 characters,
     * or a quoted line name; the status word, the alert, the newline and NUL. */
    size_t nnames = 0;
    for (size_t c = 0; c < s->ncols; c++)
        nnames += hf_output_column_is_line(&s->cols[c].c);
    s->row_cap = (nvary + s->ncols + 1) * (HF_CSV_NUMBER_MAX + 1) + nnames * (longest + 1) + 48;
    s->jobs = jobs;
    s->th = hf_calloc((size_t)jobs, sizeof *s->th);
    if (!s->th) {
        hf_error_set(err, HF_ENOMEM, "out of memory preparing the sweep");
        goto fail;
    }
    for (int t = 0; t < jobs; t++) {
        s->th[t] = thread_alloc(s, err);
        if (!s->th[t])
            goto fail;
    }
    return s;
fail:
    hf_sweep_free(s);
    return NULL;
}

void hf_sweep_free(hf_sweep *s)
{
    if (!s)
        return;
    if (s->th)
        for (int t = 0; t < s->jobs; t++)
            thread_free(s->th[t]);
    hf_free(s->th);
    if (s->qname)
        for (size_t i = 0; i < s->base->nlines; i++)
            hf_free(s->qname[i]);
    hf_free(s->qname);
    hf_free(s->cols);
    hf_free(s->bal_load);
    hf_free(s);
}

uint64_t hf_sweep_ncases(const hf_sweep *s)
{
    return s->grid.ncases;
}

const hf_study_grid *hf_sweep_grid(const hf_sweep *s)
{
    return &s->grid;
}

/* FNV-1a, 64 bits: offset basis 14695981039346656037, prime 1099511628211. */
static uint64_t fnv(uint64_t h, const void *data, size_t n)
{
    const unsigned char *p = data;
    for (size_t i = 0; i < n; i++) {
        h ^= p[i];
        h *= 1099511628211ull;
    }
    return h;
}

uint64_t hf_sweep_fingerprint(const hf_sweep *s, const void *extra, size_t n)
{
    uint64_t h = 14695981039346656037ull;
    char name[2 * HF_MODEL_MAX_NAME + 4096];
    for (size_t j = 0; j < s->grid.nvary; j++) {
        const hf_vary *v = &s->vary[j];
        h = fnv(h, v->path, strlen(v->path) + 1);
        h = fnv(h, &s->dim[j], sizeof s->dim[j]);
        h = fnv(h, &v->nvalues, sizeof v->nvalues);
        if (v->nvalues)
            h = fnv(h, v->values, v->nvalues * sizeof *v->values);
        else {
            const double r[3] = {v->from, v->to, v->step};
            h = fnv(h, r, sizeof r);
        }
    }
    h = fnv(h, &s->grid.zip, sizeof s->grid.zip);
    h = fnv(h, &s->grid.ncases, sizeof s->grid.ncases);
    for (size_t c = 0; c < s->ncols; c++) {
        hf_output_column_name(s->base, &s->cols[c].c, name, sizeof name);
        h = fnv(h, name, strlen(name) + 1);
    }
    return extra ? fnv(h, extra, n) : h;
}

uint64_t hf_sweep_estimate_bytes(const hf_sweep *s, uint64_t ncases)
{
    uint64_t per_row = 12u * (uint64_t)(s->grid.nvary + s->ncols) + 16u;
    if (ncases > UINT64_MAX / per_row)
        return UINT64_MAX;
    return ncases * per_row;
}

hf_status hf_sweep_check_size(const hf_sweep *s, uint64_t ncases, int allow_large,
                              const char *option, hf_error *err)
{
    uint64_t bytes = hf_sweep_estimate_bytes(s, ncases);
    if (allow_large || bytes <= HF_SWEEP_MAX_BYTES)
        return HF_OK;
    return hf_error_set(err, HF_ELIMIT,
                        "the sweep has %llu cases, about %.3g GB of CSV (more than the %.0f GB "
                        "limit, HF_SWEEP_MAX_BYTES); check the ranges, split it with --shard, or "
                        "pass %s to write it anyway",
                        (unsigned long long)ncases, (double)bytes / 1e9,
                        (double)HF_SWEEP_MAX_BYTES / 1e9, option);
}

/* The column name of varied parameter j: its path and unit ("site.depth_m"). */
static void vary_name(const hf_sweep *s, size_t j, char *buf, size_t cap)
{
    char u[32];
    hf_output_unit_for_column(s->dim[j], u, sizeof u);
    snprintf(buf, cap, "%s%s%s", s->vary[j].path, *u ? "_" : "", u);
}

hf_status hf_sweep_write_header(const hf_sweep *s, FILE *out, hf_error *err)
{
    hf_csv c;
    hf_csv_init(&c, out, 0);
    char name[2 * HF_MODEL_MAX_NAME + 4096];
    for (size_t j = 0; j < s->grid.nvary; j++) {
        vary_name(s, j, name, sizeof name);
        hf_csv_field_str(&c, name);
    }
    hf_csv_field_str(&c, "status");
    for (size_t i = 0; i < s->ncols; i++) {
        hf_output_column_name(s->base, &s->cols[i].c, name, sizeof name);
        hf_csv_field_str(&c, name);
    }
    hf_csv_field_str(&c, "alert");
    hf_csv_end_row(&c);
    if (ferror(out))
        return hf_error_set(err, HF_EIO, "writing the sweep header failed");
    return HF_OK;
}

/* ---- rows in memory ---- */

void hf_sweep_table_free(hf_sweep_table *t)
{
    if (!t)
        return;
    for (size_t j = 0; t->vary_names && j < t->nvary; j++)
        hf_free(t->vary_names[j]);
    for (size_t c = 0; t->col_names && c < t->ncols; c++)
        hf_free(t->col_names[c]);
    hf_free(t->vary_names);
    hf_free(t->col_names);
    hf_free(t->vary_dim);
    hf_free(t->cols);
    hf_free(t->vary);
    hf_free(t->status);
    hf_free(t->out);
    hf_free(t);
}

/* The table's column names and kinds, copied from the sweep; 0 on failure. */
static int table_columns(hf_sweep_table *t, const hf_sweep *s)
{
    char name[2 * HF_MODEL_MAX_NAME + 4096];
    t->vary_names = hf_calloc(t->nvary, sizeof *t->vary_names);
    t->vary_dim = hf_calloc(t->nvary, sizeof *t->vary_dim);
    t->col_names = hf_calloc(t->ncols ? t->ncols : 1, sizeof *t->col_names);
    t->cols = hf_calloc(t->ncols ? t->ncols : 1, sizeof *t->cols);
    if (!t->vary_names || !t->vary_dim || !t->col_names || !t->cols)
        return 0;
    for (size_t j = 0; j < t->nvary; j++) {
        vary_name(s, j, name, sizeof name);
        t->vary_dim[j] = s->dim[j];
        if (!(t->vary_names[j] = hf_strdup(name)))
            return 0;
    }
    for (size_t c = 0; c < t->ncols; c++) {
        t->cols[c] = s->cols[c].c;
        hf_output_column_name(s->base, &s->cols[c].c, name, sizeof name);
        if (!(t->col_names[c] = hf_strdup(name)))
            return 0;
    }
    return 1;
}

hf_sweep_table *hf_sweep_table_alloc(const hf_sweep *s, uint64_t cap, hf_error *err)
{
    if (!s || cap == 0) {
        hf_error_set(err, HF_EINVAL, "a sweep table needs a sweep and room for a row");
        return NULL;
    }
    size_t width = s->grid.nvary + s->ncols + 1;
    if (cap > SIZE_MAX / (width * sizeof(double) + sizeof(hf_status))) {
        hf_error_set(err, HF_ENOMEM, "a sweep table of %llu rows does not fit in memory",
                     (unsigned long long)cap);
        return NULL;
    }
    hf_sweep_table *t = hf_calloc(1, sizeof *t);
    if (t) {
        t->nvary = s->grid.nvary;
        t->ncols = s->ncols;
        t->cap = cap;
        t->vary = hf_calloc((size_t)cap * (t->nvary ? t->nvary : 1), sizeof *t->vary);
        t->out = hf_calloc((size_t)cap * (t->ncols ? t->ncols : 1), sizeof *t->out);
        t->status = hf_calloc((size_t)cap, sizeof *t->status);
    }
    if (!t || !t->vary || !t->out || !t->status || !table_columns(t, s)) {
        hf_sweep_table_free(t);
        hf_error_set(err, HF_ENOMEM, "out of memory for a sweep table of %llu rows",
                     (unsigned long long)cap);
        return NULL;
    }
    return t;
}

/* Counts what the table holds after a run of [begin, end). */
static void table_close(hf_sweep_table *t, uint64_t begin, uint64_t end)
{
    t->total = end - begin;
    t->nrows = t->total < t->cap ? t->total : t->cap;
    t->failed = 0;
    for (uint64_t i = 0; i < t->nrows; i++)
        t->failed += t->status[i] != HF_OK;
}

hf_status hf_sweep_run(hf_sweep *s, const hf_sweep_range *r, FILE *out, hf_sweep_table *t,
                       hf_error *err)
{
    if (!r || r->begin > r->end || r->end > s->grid.ncases)
        return hf_error_set(err, HF_EINVAL, "sweep: case range outside 0..%llu",
                            (unsigned long long)s->grid.ncases);
    if (!out && !t)
        return hf_error_set(err, HF_EINVAL, "sweep: neither a CSV stream nor a table to fill");
    if (t && (t->nvary != s->grid.nvary || t->ncols != s->ncols))
        return hf_error_set(err, HF_EINVAL, "sweep: the table was made for another sweep");
    if (t) {
        t->first = r->begin;
        t->nrows = t->total = t->failed = 0;
    }
    hf_study_stream_options o;
    memset(&o, 0, sizeof o);
    o.jobs = s->jobs;
    o.row_cap = s->row_cap;
    o.progress = r->progress;
    o.progress_ctx = r->progress_ctx;
    o.stop = r->stop;
    s->table = t;
    hf_status st = hf_study_stream(r->begin, r->end, (void **)s->th, sweep_row, &o, out, err);
    s->table = NULL;
    if (t && st == HF_OK)
        table_close(t, r->begin, r->end);
    return st;
}

hf_status hf_sweep_write_rows(hf_sweep *s, const hf_sweep_range *r, FILE *out, hf_error *err)
{
    if (!out)
        return hf_error_set(err, HF_EINVAL, "sweep: no stream to write the rows to");
    return hf_sweep_run(s, r, out, NULL, err);
}

hf_status hf_sweep_case_row(hf_sweep *s, uint64_t k, char *buf, size_t cap, hf_error *err)
{
    if (k >= s->grid.ncases)
        return hf_error_set(err, HF_EINVAL, "sweep: case %llu out of range", (unsigned long long)k);
    if (cap < s->row_cap)
        return hf_error_set(err, HF_ELIMIT, "sweep: a row needs up to %zu bytes", s->row_cap);
    thread_state *t = s->th[0];
    hf_spread_reset(t->ws);
    hf_balance_reset(t->bal);
    hf_status st = evaluate(t, k);
    format_row(t, k, st, buf, cap);
    return HF_OK;
}

hf_status hf_sweep_output_eval(const hf_model *m, hf_spread *ws, hf_balance *bal,
                               const hf_output *o, double *value, hf_error *err)
{
    *value = 0.0;
    if (!hf_output_is_scalar(o))
        return hf_error_set(err, HF_EINVAL, "output %s is not a single value",
                            hf_output_name(o->kind));
    hf_pose pose;
    hf_spread_pose_rest(m, &pose);
    if (hf_output_needs_balance(o)) {
        if (!bal)
            return hf_error_set(err, HF_EINVAL, "output under a load without a balance workspace");
        hf_status st = hf_balance_solve(bal, &m->loads[o->load], 0, err);
        const hf_balance_result *r = hf_balance_result_at(bal, 0);
        if (st != HF_OK || !r)
            return st != HF_OK ? st : hf_error_set(err, HF_EINVAL, "no balance result");
        equilibrium e;
        view_equilibrium(&e, r);
        hf_output_column c = {o->kind, o->line, o->load, 0}; /* offset_<load>: the surge */
        *value = equilibrium_value(&e, &c, m->nlines);
        return HF_OK;
    }
    thread_state t;
    memset(&t, 0, sizeof t);
    hf_status st;
    if (o->kind >= HF_OUT_STIFFNESS_SURGE && o->kind <= HF_OUT_STIFFNESS_YAW)
        st = hf_spread_stiffness(ws, &pose, t.K, &t.res, err);
    else
        st = hf_spread_solve(ws, &pose, &t.res, err);
    if (st != HF_OK)
        return st;
    *value = hf_output_info_of(o->kind)->per_line ? line_value(&t, o->kind, o->line)
                                                  : spread_value(&t, o->kind);
    return HF_OK;
}

uint64_t hf_sweep_failed_count(const hf_sweep *s)
{
    uint64_t n = 0;
    for (int t = 0; t < s->jobs; t++)
        n += s->th[t]->failed;
    return n;
}

void hf_sweep_vary_clear(hf_vary *v)
{
    if (!v)
        return;
    hf_free(v->path);
    hf_free(v->values);
    memset(v, 0, sizeof *v);
}

/* Parses one quantity of text[0..n) with dimension d. */
static hf_status quantity(const char *text, size_t n, hf_dim d, const char *whole, double *out,
                          hf_error *err)
{
    char buf[128];
    if (n >= sizeof buf)
        return hf_error_set(err, HF_EINVAL, "--vary %s: value too long", whole);
    memcpy(buf, text, n);
    buf[n] = '\0';
    hf_error sub;
    hf_error_clear(&sub);
    if (hf_study_parse_value(buf, d, out, &sub) != HF_OK)
        return hf_error_set(err, HF_EINVAL, "--vary %s: %s", whole, sub.text);
    return HF_OK;
}

hf_status hf_sweep_vary_parse(hf_model *m, const char *text, int bracket, hf_vary *v, hf_error *err)
{
    memset(v, 0, sizeof *v);
    const char *eq = strchr(text, '=');
    const char *form = bracket ? "PATH=LO:HI" : "PATH=FROM:TO:STEP or PATH=V1,V2,...";
    if (!eq || eq == text || !eq[1])
        return hf_error_set(err, HF_EINVAL, "--vary: expected %s, got \"%s\"", form, text);
    v->path = hf_strndup(text, (size_t)(eq - text));
    if (!v->path)
        return hf_error_set(err, HF_ENOMEM, "out of memory");
    hf_param p;
    hf_status st = hf_model_param_lookup(m, v->path, &p, err);
    if (st != HF_OK) {
        hf_sweep_vary_clear(v);
        return st;
    }
    v->dim = p.dim;
    const char *spec = eq + 1;
    size_t ncolon = 0, ncomma = 0;
    for (const char *q = spec; *q; q++) {
        ncolon += *q == ':';
        ncomma += *q == ',';
    }
    if (bracket ? (ncolon != 1 || ncomma) : (ncolon && (ncolon != 2 || ncomma))) {
        hf_sweep_vary_clear(v);
        return hf_error_set(err, HF_EINVAL, "--vary: expected %s, got \"%s\"", form, text);
    }
    if (ncolon) {
        double x[3] = {0, 0, 0};
        const char *a = spec;
        for (size_t i = 0; i <= ncolon; i++) {
            const char *b = strchr(a, ':');
            size_t n = b ? (size_t)(b - a) : strlen(a);
            st = quantity(a, n, v->dim, text, &x[i], err);
            if (st != HF_OK) {
                hf_sweep_vary_clear(v);
                return st;
            }
            a = b ? b + 1 : a + n;
        }
        v->from = x[0];
        v->to = x[1];
        v->step = x[2];
        if (bracket && !(x[0] < x[1])) {
            hf_sweep_vary_clear(v);
            return hf_error_set(err, HF_EINVAL, "--vary %s: expected LO < HI", text);
        }
        if (!bracket && hf_study_vary_count(v) == 0) {
            hf_sweep_vary_clear(v);
            return hf_error_set(err, HF_EINVAL,
                                "--vary %s: STEP must be non-zero and point from FROM to TO", text);
        }
        return HF_OK;
    }
    v->values = hf_calloc(ncomma + 1, sizeof *v->values);
    if (!v->values) {
        hf_sweep_vary_clear(v);
        return hf_error_set(err, HF_ENOMEM, "out of memory");
    }
    v->nvalues = ncomma + 1;
    const char *a = spec;
    for (size_t i = 0; i < v->nvalues; i++) {
        const char *b = strchr(a, ',');
        size_t n = b ? (size_t)(b - a) : strlen(a);
        st = quantity(a, n, v->dim, text, &v->values[i], err);
        if (st != HF_OK) {
            hf_sweep_vary_clear(v);
            return st;
        }
        a = b ? b + 1 : a + n;
    }
    return HF_OK;
}

int hf_sweep_overload_text(const hf_sweep *s, char *buf, size_t cap)
{
    const thread_state *w = NULL;
    for (int t = 0; t < s->jobs; t++)
        if (s->th[t]->over_n && (!w || s->th[t]->over_k < w->over_k))
            w = s->th[t];
    if (!w)
        return 0;
    double v[HF_STUDY_MAX_VARY];
    vary_values(s, w->over_k, v);
    int n = snprintf(buf, cap, "line %s is overloaded: utilisation %.1f%s%s%s at case",
                     hf_results_line_name(s->base, w->over_line), w->over_util,
                     w->over_slot == NONE ? "" : " at the intact equilibrium under load ",
                     w->over_slot == NONE ? "" : s->base->loads[s->bal_load[w->over_slot]].name,
                     w->over_slot == NONE ? "" : ",");
    for (size_t j = 0; j < s->grid.nvary && n >= 0 && (size_t)n < cap; j++) {
        char u[32];
        hf_output_unit_for_column(s->dim[j], u, sizeof u);
        n += snprintf(buf + n, cap - (size_t)n, "%s %s=%.6g%s%s", j ? "," : "", s->vary[j].path,
                      v[j], *u ? " " : "", u);
    }
    return 1;
}
