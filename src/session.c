/* session.c - one loaded case behind an opaque handle; results as tables built from results.h
 * cells.
 *
 * The tables are filled from the same cell functions the CSV writers use
 * (hf_results_lines_row, _stiffness_row, _curve_cell, _balance_cell), so a
 * table holds the CSV's numbers at full precision, in the CSV's units. */
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/analysis.h"
#include "holdfast/case.h"
#include "holdfast/criteria.h"
#include "holdfast/results.h"
#include "holdfast/session.h"
#include "holdfast/units.h"

struct hf_session {
    int loaded;              /* 1 once a case is loaded */
    hf_model m;              /* the case (owned) */
    hf_analysis_pose pose;   /* pose workspace, bound to m */
    char msg[HF_ERROR_TEXT]; /* last call's failure, "" after success */
    char warn[HF_ERROR_TEXT];
};

struct hf_session_table {
    size_t rows, cols, cap;  /* cap: rows allocated */
    char **names;            /* cols column names (owned) */
    unsigned char *text_col; /* cols flags: 1 text column */
    double *scale;           /* cols factors to SI (0 text) */
    double *values;          /* cap x cols, NaN in text and empty cells */
    unsigned char *empty;    /* cap x cols flags */
    char **texts;            /* cap x cols, owned strings in text cells, else NULL */
};

/* ---- messages ---- */

/* Records a failure of status st with e's message in s and returns st.
 * st HF_OK (a constructor returned NULL): e's status, or HF_ENOMEM when e
 * has none - a failure is never reported as success. */
static hf_status fail(hf_session *s, hf_status st, const hf_error *e)
{
    if (st == HF_OK)
        st = e->status != HF_OK ? e->status : HF_ENOMEM;
    snprintf(s->msg, sizeof s->msg, "%s", e->text[0] ? e->text : hf_status_str(st));
    return st;
}

static hf_status failf(hf_session *s, hf_status st, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;

static hf_status failf(hf_session *s, hf_status st, const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(s->msg, sizeof s->msg, fmt, ap);
    va_end(ap);
    return st;
}

/* Appends one warning line to s->warn (cut when full). */
static void warnf(hf_session *s, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 2, 3)))
#endif
    ;

static void warnf(hf_session *s, const char *fmt, ...)
{
    size_t n = strlen(s->warn);
    if (n + 2 >= sizeof s->warn)
        return;
    if (n)
        s->warn[n++] = '\n';
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(s->warn + n, sizeof s->warn - n, fmt, ap);
    va_end(ap);
}

/* Starts a call: clears the message and warnings.  HF_EINVAL when the call
 * needs a case and none is loaded (s may be NULL: HF_EINVAL, no message). */
static hf_status begin(hf_session *s, int need_case)
{
    if (!s)
        return HF_EINVAL;
    s->msg[0] = s->warn[0] = '\0';
    if (need_case && !s->loaded)
        return failf(s, HF_EINVAL, "no case loaded: load a case file or text first");
    return HF_OK;
}

/* ---- the session ---- */

hf_session *hf_session_alloc(void)
{
    hf_gsl_handler_install();
    hf_session *s = hf_calloc(1, sizeof *s);
    if (!s)
        return NULL;
    hf_model_init(&s->m);
    hf_analysis_pose_init(&s->pose);
    return s;
}

void hf_session_free(hf_session *s)
{
    if (!s)
        return;
    hf_analysis_pose_clear(&s->pose);
    hf_model_free(&s->m);
    hf_free(s);
}

const char *hf_session_message(const hf_session *s)
{
    return s ? s->msg : "no session";
}

const char *hf_session_warnings(const hf_session *s)
{
    return s ? s->warn : "";
}

/* Replaces the case with *m (moved in) after a successful load. */
static void adopt(hf_session *s, hf_model *m)
{
    hf_analysis_pose_clear(&s->pose);
    hf_model_free(&s->m);
    s->m = *m;
    hf_model_init(m);
    s->loaded = 1;
}

hf_status hf_session_load_file(hf_session *s, const char *path)
{
    hf_status st = begin(s, 0);
    if (st != HF_OK)
        return st;
    if (!path)
        return failf(s, HF_EINVAL, "no case file path given");
    hf_model m;
    hf_model_init(&m);
    hf_error err;
    hf_error_clear(&err);
    if ((st = hf_case_load(path, &m, &err)) != HF_OK) {
        hf_model_free(&m);
        return fail(s, st, &err);
    }
    adopt(s, &m);
    return HF_OK;
}

hf_status hf_session_load_string(hf_session *s, const char *text, size_t len, const char *name)
{
    hf_status st = begin(s, 0);
    if (st != HF_OK)
        return st;
    if (!text)
        return failf(s, HF_EINVAL, "no case text given");
    hf_model m;
    hf_model_init(&m);
    hf_error err;
    hf_error_clear(&err);
    if ((st = hf_case_load_buffer(text, len, name ? name : "<string>", &m, &err)) != HF_OK) {
        hf_model_free(&m);
        return fail(s, st, &err);
    }
    adopt(s, &m);
    return HF_OK;
}

size_t hf_session_nlines(const hf_session *s)
{
    return s && s->loaded ? s->m.nlines : 0;
}

size_t hf_session_nloads(const hf_session *s)
{
    return s && s->loaded ? s->m.nloads : 0;
}

const char *hf_session_line_name(const hf_session *s, size_t i)
{
    return i < hf_session_nlines(s) ? s->m.lines[i].name : NULL;
}

const char *hf_session_load_name(const hf_session *s, size_t i)
{
    return i < hf_session_nloads(s) ? s->m.loads[i].name : NULL;
}

/* ---- parameters ---- */

/* Looks up `path` in the case; on failure the message names the path. */
static hf_status lookup(hf_session *s, const char *path, hf_param *p)
{
    if (!path)
        return failf(s, HF_EINVAL, "no parameter path given");
    hf_error err;
    hf_error_clear(&err);
    hf_status st = hf_model_param_lookup(&s->m, path, p, &err);
    if (st != HF_OK)
        return fail(s, st, &err);
    return HF_OK;
}

hf_status hf_session_get(hf_session *s, const char *path, double *value)
{
    hf_status st = begin(s, 1);
    hf_param p;
    if (st != HF_OK || (st = lookup(s, path, &p)) != HF_OK)
        return st;
    hf_error err;
    hf_error_clear(&err);
    if (!value)
        return failf(s, HF_EINVAL, "%s: nowhere to store the value", path);
    if ((st = hf_model_param_get(&s->m, &p, value, &err)) != HF_OK)
        return fail(s, st, &err);
    return HF_OK;
}

/* Sets the looked-up parameter p (path for messages) to value, SI.  The
 * model refuses a bad value and is then left as it was (model.h). */
static hf_status set_value(hf_session *s, const char *path, const hf_param *p, double value)
{
    hf_error err;
    hf_error_clear(&err);
    hf_status st = hf_model_param_set(&s->m, p, value, &err);
    if (st != HF_OK) {
        const char *t = err.text;
        if (!strncmp(t, "parameter: ", 11))
            t += 11; /* the path says which parameter */
        return failf(s, st, "%s: %s", path, t[0] ? t : hf_status_str(st));
    }
    return HF_OK;
}

hf_status hf_session_set(hf_session *s, const char *path, double value)
{
    hf_status st = begin(s, 1);
    hf_param p;
    if (st != HF_OK || (st = lookup(s, path, &p)) != HF_OK)
        return st;
    return set_value(s, path, &p, value);
}

hf_status hf_session_set_text(hf_session *s, const char *path, const char *text)
{
    hf_status st = begin(s, 1);
    hf_param p;
    if (st != HF_OK || (st = lookup(s, path, &p)) != HF_OK)
        return st;
    if (!text)
        return failf(s, HF_EINVAL, "%s: no value given", path);
    double v;
    hf_error err;
    hf_error_clear(&err);
    if ((st = hf_units_parse(text, p.dim, &v, &err)) != HF_OK)
        return failf(s, st, "%s: %s", path, err.text);
    return set_value(s, path, &p, v);
}

/* ---- tables ---- */

void hf_session_table_free(hf_session_table *t)
{
    if (!t)
        return;
    for (size_t j = 0; t->names && j < t->cols; j++)
        hf_free(t->names[j]);
    for (size_t k = 0; t->texts && k < t->cap * t->cols; k++)
        hf_free(t->texts[k]);
    hf_free(t->names);
    hf_free(t->text_col);
    hf_free(t->scale);
    hf_free(t->values);
    hf_free(t->empty);
    hf_free(t->texts);
    hf_free(t);
}

/* Room for `cap` rows (the rows kept).  HF_OK or HF_ENOMEM (t unchanged). */
static hf_status table_reserve(hf_session_table *t, size_t cap)
{
    if (cap <= t->cap)
        return HF_OK;
    size_t n = cap * t->cols, old = t->cap * t->cols;
    double *v = hf_realloc(t->values, (n ? n : 1) * sizeof *v);
    if (v)
        t->values = v;
    unsigned char *e = v ? hf_realloc(t->empty, n ? n : 1) : NULL;
    if (e)
        t->empty = e;
    char **x = e ? hf_realloc(t->texts, (n ? n : 1) * sizeof *x) : NULL;
    if (!x)
        return HF_ENOMEM;
    t->texts = x;
    for (size_t k = old; k < n; k++) {
        t->values[k] = NAN;
        t->empty[k] = 1;
        t->texts[k] = NULL;
    }
    t->cap = cap;
    return HF_OK;
}

/* A table of cols columns with room for rows rows; names are set later. */
static hf_session_table *table_alloc(size_t cols, size_t rows)
{
    hf_session_table *t = hf_calloc(1, sizeof *t);
    if (!t)
        return NULL;
    t->cols = cols;
    t->names = hf_calloc(cols ? cols : 1, sizeof *t->names);
    t->text_col = hf_calloc(cols ? cols : 1, 1);
    t->scale = hf_calloc(cols ? cols : 1, sizeof *t->scale);
    if (!t->names || !t->text_col || !t->scale || table_reserve(t, rows ? rows : 1) != HF_OK) {
        hf_session_table_free(t);
        return NULL;
    }
    return t;
}

/* Factor from the unit a column name declares to SI: the name's unit
 * suffix as results.h writes it (kN, kNm, kN_per_m -> 1e3; deg -> pi/180;
 * m, plain numbers -> 1). */
static double name_scale(const char *name)
{
    size_t n = strlen(name);
    if (strstr(name, "_kN"))
        return 1e3;
    if (n > 4 && !strcmp(name + n - 4, "_deg"))
        return M_PI / 180.0;
    return 1.0;
}

/* Names column j (scale from the name unless scale > 0).  HF_ENOMEM or HF_OK. */
static hf_status table_name(hf_session_table *t, size_t j, const char *name, double scale)
{
    if (!(t->names[j] = hf_strdup(name)))
        return HF_ENOMEM;
    t->scale[j] = scale > 0.0 ? scale : name_scale(name);
    return HF_OK;
}

/* Stores cell c at (i, j); row i must be reserved.  HF_ENOMEM or HF_OK. */
static hf_status table_put(hf_session_table *t, size_t i, size_t j, hf_results_cell c)
{
    size_t k = i * t->cols + j;
    if (c.kind == HF_RESULTS_TEXT) {
        t->text_col[j] = 1;
        t->scale[j] = 0.0;
        if (!(t->texts[k] = hf_strdup(c.text)))
            return HF_ENOMEM;
        t->empty[k] = c.text[0] == '\0';
    } else if (c.kind == HF_RESULTS_NUMBER) {
        t->values[k] = c.value;
        t->empty[k] = !isfinite(c.value); /* the CSV writes it empty */
    }
    return HF_OK;
}

size_t hf_session_table_rows(const hf_session_table *t)
{
    return t ? t->rows : 0;
}

size_t hf_session_table_columns(const hf_session_table *t)
{
    return t ? t->cols : 0;
}

const char *hf_session_table_column(const hf_session_table *t, size_t j)
{
    return t && j < t->cols ? t->names[j] : NULL;
}

int hf_session_table_is_text(const hf_session_table *t, size_t j)
{
    return t && j < t->cols ? t->text_col[j] : 0;
}

double hf_session_table_scale(const hf_session_table *t, size_t j)
{
    return t && j < t->cols ? t->scale[j] : 0.0;
}

const double *hf_session_table_values(const hf_session_table *t)
{
    return t ? t->values : NULL;
}

int hf_session_table_is_empty(const hf_session_table *t, size_t i, size_t j)
{
    return t && i < t->rows && j < t->cols ? t->empty[i * t->cols + j] : 1;
}

const char *hf_session_table_text(const hf_session_table *t, size_t i, size_t j)
{
    if (!t || i >= t->rows || j >= t->cols || !t->text_col[j])
        return NULL;
    const char *x = t->texts[i * t->cols + j];
    return x ? x : "";
}

/* Hands t to *out, or frees it and records HF_ENOMEM when st says so. */
static hf_status deliver(hf_session *s, hf_session_table *t, hf_status st, hf_session_table **out)
{
    if (st != HF_OK) {
        hf_session_table_free(t);
        return failf(s, st, "out of memory for a result table");
    }
    *out = t;
    return HF_OK;
}

/* ---- results ---- */

/* Checks the arguments common to every result call and clears *out. */
static hf_status begin_result(hf_session *s, hf_session_table **out)
{
    hf_status st = begin(s, 1);
    if (st != HF_OK)
        return st;
    if (!out)
        return failf(s, HF_EINVAL, "nowhere to return the table");
    *out = NULL;
    return HF_OK;
}

/* Solves the pose (rest + offset, cold start as a fresh command does). */
static hf_status solve_pose(hf_session *s, const double offset[3], int stiffness)
{
    static const double none[3] = {0.0, 0.0, 0.0};
    if (s->pose.ws)
        hf_spread_reset(s->pose.ws);
    hf_error err;
    hf_error_clear(&err);
    hf_status st = hf_analysis_pose_solve(&s->pose, &s->m, offset ? offset : none, stiffness, &err);
    if (st != HF_OK)
        return fail(s, st, &err);
    return HF_OK;
}

hf_status hf_session_lines(hf_session *s, const double offset[3], hf_session_table **out)
{
    hf_status st = begin_result(s, out);
    if (st != HF_OK || (st = solve_pose(s, offset, 0)) != HF_OK)
        return st;
    const hf_spread_result *r = &s->pose.res;
    hf_session_table *t = table_alloc(HF_RESULTS_LINES_COLUMNS, s->m.nlines);
    if (!t)
        return failf(s, HF_ENOMEM, "out of memory for a result table");
    for (size_t j = 0; j < HF_RESULTS_LINES_COLUMNS && st == HF_OK; j++)
        st = table_name(t, j, hf_results_lines_columns[j], 0.0);
    for (size_t i = 0; i < s->m.nlines && st == HF_OK; i++) {
        hf_results_cell cells[HF_RESULTS_LINES_COLUMNS];
        hf_results_text x;
        hf_results_lines_row(&s->m, r, i, cells, &x);
        for (size_t j = 0; j < HF_RESULTS_LINES_COLUMNS && st == HF_OK; j++)
            st = table_put(t, i, j, cells[j]);
        t->rows = i + 1;
        if (hf_results_line_overloaded(r, i))
            warnf(s, "line %s is overloaded: utilisation %.3f (T/MBL >= 1)",
                  hf_results_line_name(&s->m, i), r->states[i].max_utilisation);
    }
    return deliver(s, t, st, out);
}

hf_status hf_session_stiffness(hf_session *s, const double offset[3], hf_session_table **out)
{
    hf_status st = begin_result(s, out);
    if (st != HF_OK || (st = solve_pose(s, offset, 1)) != HF_OK)
        return st;
    hf_session_table *t = table_alloc(HF_RESULTS_STIFFNESS_COLUMNS, 7);
    if (!t)
        return failf(s, HF_ENOMEM, "out of memory for a result table");
    /* every entry is kN/m, kN/rad, kN m/m, kN m/rad or kN, kN m: 1e3 to SI */
    for (size_t j = 0; j < HF_RESULTS_STIFFNESS_COLUMNS && st == HF_OK; j++)
        st = table_name(t, j, hf_results_stiffness_columns[j], 1e3);
    for (int i = 0; i <= 6 && st == HF_OK; i++) {
        hf_results_cell cells[HF_RESULTS_STIFFNESS_COLUMNS];
        hf_results_stiffness_row(s->pose.K, s->pose.res.force, i, cells);
        for (size_t j = 0; j < HF_RESULTS_STIFFNESS_COLUMNS && st == HF_OK; j++)
            st = table_put(t, (size_t)i, j, cells[j]);
        t->rows = (size_t)i + 1;
    }
    return deliver(s, t, st, out);
}

/* The table of a computed curve c; warnings for its overloaded points. */
static hf_status curve_table(hf_session *s, const hf_analysis_curve *c, hf_session_table **out)
{
    size_t cols = hf_results_curve_ncolumns(&s->m);
    hf_session_table *t = table_alloc(cols, c->n);
    if (!t)
        return failf(s, HF_ENOMEM, "out of memory for a result table");
    hf_status st = HF_OK;
    for (size_t j = 0; j < cols && st == HF_OK; j++) {
        char name[HF_MODEL_MAX_NAME + 16];
        st = table_name(t, j, hf_results_curve_column_name(&s->m, j, name, sizeof name), 0.0);
    }
    int warned = 0;
    for (size_t k = 0; k < c->n && st == HF_OK; k++) {
        for (size_t j = 0; j < cols && st == HF_OK; j++)
            st = table_put(t, k, j, hf_results_curve_cell(&s->m, c, k, j));
        t->rows = k + 1;
        if (!warned && hf_results_curve_overloaded(c, k)) {
            warned = 1;
            warnf(s, "line %s is overloaded: utilisation %.3f at offset %.6g m along %.6g deg",
                  hf_results_line_name(&s->m, c->max_utilisation_line[k]), c->max_utilisation[k],
                  c->offset[k], c->direction * 180.0 / M_PI);
        }
    }
    return deliver(s, t, st, out);
}

hf_status hf_session_curve(hf_session *s, double direction, const double *offsets, size_t n,
                           hf_session_table **out)
{
    hf_status st = begin_result(s, out);
    if (st != HF_OK)
        return st;
    if (!offsets || n == 0)
        return failf(s, HF_EINVAL, "curve: expected at least one offset");
    hf_error err;
    hf_error_clear(&err);
    hf_analysis_curve *c = hf_analysis_curve_alloc(&s->m, n, &err);
    if (!c)
        return fail(s, HF_OK, &err);
    st = hf_analysis_curve_compute_at(c, &s->m, direction, offsets, &err);
    if (st != HF_OK)
        fail(s, st, &err);
    else if (c->nfailed)
        st = fail(s, c->first_error.status, &c->first_error); /* 'holdfast curve' stops there too */
    else
        st = curve_table(s, c, out);
    hf_analysis_curve_free(c);
    return st;
}

/* The balance table being filled by the run's sink. */
typedef struct {
    hf_session *s;
    hf_session_table *t;
    const hf_model *at; /* the model at the level being run (rows are built from it) */
} balance_ctx;

static hf_status on_level(void *ctx, size_t k, double level, const hf_model *at, hf_error *err)
{
    balance_ctx *b = ctx;
    (void)k, (void)level, (void)err;
    b->at = at; /* as 'holdfast balance': the row's water_level_m is this model's */
    return HF_OK;
}

static hf_status on_condition(void *ctx, const hf_load *l, const hf_balance_result *r,
                              hf_error *err)
{
    balance_ctx *b = ctx;
    hf_session_table *t = b->t;
    if (t->rows == t->cap && table_reserve(t, 2 * t->cap) != HF_OK)
        return hf_error_set(err, HF_ENOMEM, "out of memory for a result table");
    hf_results_text x;
    for (size_t j = 0; j < t->cols; j++)
        if (table_put(t, t->rows, j, hf_results_balance_cell(b->at, l, r, j, &x)) != HF_OK) {
            t->rows++; /* so that its strings are freed */
            return hf_error_set(err, HF_ENOMEM, "out of memory for a result table");
        }
    t->rows++;
    if (r->status != HF_OK) {
        char cn[HF_MODEL_MAX_NAME + 16];
        hf_results_balance_condition(&b->s->m, r, cn, sizeof cn);
        warnf(b->s, "load %s, %s, water level %.6g m: %s", l->name, cn, b->at->site.water_level,
              r->message);
    }
    return HF_OK;
}

/* The indices of the load cases named in loads[0..n) into which[] (case
 * order kept as given); n 0: every load case.  HF_EINVAL for a bad name. */
static hf_status pick_loads(hf_session *s, const char *const *loads, size_t n, size_t *which,
                            size_t *nwhich)
{
    const hf_model *m = &s->m;
    if (m->nloads == 0)
        return failf(s, HF_EINVAL, "%s: no load cases: add a loads: list to the case file",
                     m->source_path ? m->source_path : "case");
    *nwhich = 0;
    for (size_t k = 0; k < (n ? n : m->nloads); k++) {
        size_t i = n ? hf_model_load_find(m, loads[k] ? loads[k] : "") : k;
        if (i == (size_t)-1) {
            char list[HF_ERROR_TEXT / 2] = "";
            for (size_t j = 0, used = 0; j < m->nloads && used < sizeof list; j++)
                used += (size_t)snprintf(list + used, sizeof list - used, "%s%s", j ? ", " : "",
                                         m->loads[j].name);
            return failf(s, HF_EINVAL, "no load case named \"%.200s\"; the load cases are: %s",
                         loads[k] ? loads[k] : "", list);
        }
        which[(*nwhich)++] = i;
    }
    return HF_OK;
}

/* Runs the load cases which[0..nwhich) at every still water level the
 * case's design check covers (hf_analysis_envelope_levels: site.water_levels,
 * else the one level), as 'holdfast balance' does, into table t. */
static hf_status balance_run(hf_session *s, const size_t *which, size_t nwhich, hf_session_table *t)
{
    double levels[HF_MODEL_MAX_LEVELS];
    size_t nlev = hf_analysis_envelope_levels(&s->m, levels, HF_MODEL_MAX_LEVELS);
    hf_error err;
    hf_error_clear(&err);
    hf_analysis_envelope *e = hf_analysis_envelope_alloc(&s->m, nlev, &err);
    if (!e)
        return fail(s, HF_OK, &err);
    memcpy(e->level, levels, nlev * sizeof *levels);
    balance_ctx b = {s, t, &s->m};
    hf_analysis_envelope_sink sink = {{&b, NULL, on_condition, NULL, NULL}, on_level};
    hf_status st = hf_analysis_envelope_run(e, &s->m, which, nwhich, &sink, &err);
    if (st != HF_OK)
        fail(s, st, &err);
    else if (e->overloaded)
        warnf(s,
              "%zu condition(s) with a line at or beyond its MBL (alert column); the most "
              "utilised: line %s, utilisation %.3f",
              e->overloaded, hf_results_line_name(&s->m, e->overload_line),
              e->overload_utilisation);
    hf_analysis_envelope_free(e);
    return st;
}

hf_status hf_session_balance(hf_session *s, const char *const *loads, size_t nloads,
                             hf_session_table **out)
{
    hf_status st = begin_result(s, out);
    if (st != HF_OK)
        return st;
    size_t n = nloads ? nloads : s->m.nloads, nwhich = 0;
    size_t *which = hf_calloc(n ? n : 1, sizeof *which);
    if (!which)
        return failf(s, HF_ENOMEM, "out of memory");
    size_t cols = hf_results_balance_ncolumns(&s->m);
    hf_session_table *t = NULL;
    if ((st = pick_loads(s, loads, nloads, which, &nwhich)) != HF_OK)
        goto done;
    if (!(t = table_alloc(cols, nwhich * (s->m.nlines + 1)))) {
        st = failf(s, HF_ENOMEM, "out of memory for a result table");
        goto done;
    }
    for (size_t j = 0; j < cols && st == HF_OK; j++) {
        char name[HF_MODEL_MAX_NAME + 16];
        st = table_name(t, j, hf_results_balance_column_name(&s->m, j, name, sizeof name), 0.0);
    }
    if (st != HF_OK) {
        st = failf(s, st, "out of memory for a result table");
    } else if ((st = balance_run(s, which, nwhich, t)) == HF_OK) {
        st = deliver(s, t, HF_OK, out); /* *out owns it now */
        t = NULL;
    }
done:
    hf_session_table_free(t);
    hf_free(which);
    return st;
}
