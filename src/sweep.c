/* sweep.c - parametric sweeps: output names, per-thread evaluation, CSV rows. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/csv.h"
#include "holdfast/sweep.h"

#define NONE ((size_t)-1)

static const struct {
    const char *name;
    int per_line;
} kinds[HF_OUT_COUNT] = {
    [HF_OUT_FAIRLEAD_TENSION] = {"fairlead_tension", 1},
    [HF_OUT_FAIRLEAD_HORIZONTAL] = {"fairlead_horizontal", 1},
    [HF_OUT_FAIRLEAD_VERTICAL] = {"fairlead_vertical", 1},
    [HF_OUT_ANCHOR_TENSION] = {"anchor_tension", 1},
    [HF_OUT_UTILISATION] = {"utilisation", 1},
    [HF_OUT_MAX_TENSION] = {"max_tension", 0},
    [HF_OUT_MAX_UTILISATION] = {"max_utilisation", 0},
    [HF_OUT_STIFFNESS_SURGE] = {"stiffness_surge", 0},
    [HF_OUT_STIFFNESS_SWAY] = {"stiffness_sway", 0},
    [HF_OUT_STIFFNESS_HEAVE] = {"stiffness_heave", 0},
    [HF_OUT_STIFFNESS_YAW] = {"stiffness_yaw", 0},
    [HF_OUT_VERTICAL_LOAD] = {"vertical_load", 0},
    [HF_OUT_OFFSET] = {"offset_", 0},
};

static const char names_list[] =
    "fairlead_tension[:LINE], fairlead_horizontal[:LINE], fairlead_vertical[:LINE], "
    "anchor_tension[:LINE], utilisation[:LINE], max_tension, max_utilisation, "
    "stiffness_surge, stiffness_sway, stiffness_heave, stiffness_yaw, vertical_load, "
    "offset_<load>";

static const char *const default_outputs[] = {"fairlead_tension", "utilisation",
                                              "max_utilisation", "stiffness_surge"};

const char *hf_sweep_output_name(hf_output_kind k)
{
    return (unsigned)k < HF_OUT_COUNT ? kinds[k].name : "?";
}

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

hf_status hf_sweep_output_parse(const hf_model *m, const char *text, hf_output *out,
                                hf_error *err)
{
    memset(out, 0, sizeof *out);
    out->line = HF_OUTPUT_ALL;
    out->load = NONE;
    const char *colon = strchr(text, ':');
    size_t n = colon ? (size_t)(colon - text) : strlen(text);
    if (n > 7 && !strncmp(text, "offset_", 7) && !colon) {
        char name[HF_MODEL_MAX_NAME + 1];
        if (n - 7 > HF_MODEL_MAX_NAME)
            return hf_error_set(err, HF_EINVAL, "output \"%s\": load name too long", text);
        memcpy(name, text + 7, n - 7);
        name[n - 7] = '\0';
        size_t li = hf_model_load_find(m, name);
        if (li == NONE)
            return hf_error_set(err, HF_EINVAL,
                                "output \"%s\": the case has no load named \"%s\" (offset_<load> "
                                "takes a name from the loads: list)",
                                text, name);
        out->kind = HF_OUT_OFFSET;
        out->load = li;
        return HF_OK;
    }
    for (int k = 0; k < HF_OUT_COUNT; k++) {
        if (k == HF_OUT_OFFSET || strlen(kinds[k].name) != n || strncmp(kinds[k].name, text, n))
            continue;
        out->kind = (hf_output_kind)k;
        if (!colon)
            return HF_OK;
        if (!kinds[k].per_line)
            return hf_error_set(err, HF_EINVAL,
                                "output \"%s\": %s is one value for the spread and takes no "
                                ":LINE",
                                text, kinds[k].name);
        size_t li = hf_model_line_find(m, colon + 1);
        if (li == NONE)
            return hf_error_set(err, HF_EINVAL, "output \"%s\": the case has no line named \"%s\"",
                                text, colon + 1);
        out->line = li;
        return HF_OK;
    }
    return hf_error_set(err, HF_EINVAL, "unknown output \"%s\"; expected one of %s", text,
                        names_list);
}

int hf_sweep_output_is_scalar(const hf_output *o)
{
    if ((unsigned)o->kind >= HF_OUT_COUNT)
        return 0;
    if (kinds[o->kind].per_line)
        return o->line != HF_OUTPUT_ALL;
    return 1;
}

/* ---- evaluation ---- */

/* One CSV column of outputs. */
typedef struct {
    hf_output_kind kind;
    size_t line;   /* per-line kinds */
    size_t slot;   /* HF_OUT_OFFSET: index into the distinct loads */
    int sub;       /* 0 value; 1 line name (max_tension/max_utilisation); offset: 0..2 */
} column;

typedef struct {
    const hf_sweep *plan;
    hf_model model;              /* this thread's copy */
    hf_param param[HF_STUDY_MAX_VARY];
    hf_spread *ws;
    hf_balance *bal;             /* NULL unless an offset output is asked for */
    hf_spread_result res;
    double K[6][6];
    hf_status solved;            /* spread status of the current case */
    hf_status *bal_status;       /* per distinct load */
    double (*bal_offset)[3];     /* per distinct load: surge, sway (m), yaw (rad) */
    uint64_t failed;             /* emitted cases whose status was not ok */
    hf_error err;
} thread_state;

struct hf_sweep {
    const hf_model *base;
    const hf_vary *vary;
    hf_dim dim[HF_STUDY_MAX_VARY];
    hf_study_grid grid;
    size_t ncols;
    column *cols;
    char **qname;                /* CSV-quoted line names */
    int need_k;
    size_t nbal;                 /* distinct loads of offset outputs */
    size_t *bal_load;
    int jobs;
    thread_state **th;
    size_t row_cap;
};

static void thread_free(thread_state *t)
{
    if (!t)
        return;
    hf_balance_free(t->bal);
    hf_spread_free(t->ws);
    hf_model_free(&t->model);
    hf_free(t->bal_status);
    hf_free(t->bal_offset);
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
    if (s->nbal) {
        t->bal = hf_balance_alloc(&t->model, err);
        t->bal_status = hf_calloc(s->nbal, sizeof *t->bal_status);
        t->bal_offset = hf_calloc(s->nbal, sizeof *t->bal_offset);
        if (!t->bal || !t->bal_status || !t->bal_offset) {
            if (t->bal)
                hf_error_set(err, HF_ENOMEM, "out of memory for a sweep thread");
            goto fail;
        }
    }
    return t;
fail:
    thread_free(t);
    return NULL;
}

/* Solves case k on thread t: sets every varied parameter, solves the spread
 * at the rest pose (with the 6x6 stiffness when asked for) and, when that
 * succeeded, each load of the offset outputs.  Every case is solved in full
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
    for (size_t b = 0; b < s->nbal; b++) {
        hf_status bs = HF_ENOMEM;
        const hf_balance_result *r = NULL;
        if (t->bal) {
            bs = hf_balance_solve(t->bal, &t->model.loads[s->bal_load[b]], 0, &t->err);
            r = hf_balance_result_at(t->bal, 0);
        }
        t->bal_status[b] = bs;
        if (bs == HF_OK && r)
            memcpy(t->bal_offset[b], r->offset, sizeof r->offset);
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

/* SI -> the column's unit: kN for forces, kN/m, kN m/rad, deg. */
static double column_scale(hf_output_kind kind)
{
    return kind == HF_OUT_UTILISATION || kind == HF_OUT_MAX_UTILISATION ? 1.0 : 1e-3;
}

static int format_row(thread_state *t, uint64_t k, hf_status st, char *buf, size_t cap)
{
    const hf_sweep *s = t->plan;
    if (cap < s->row_cap)
        return (int)cap;
    double v[HF_STUDY_MAX_VARY];
    hf_study_grid_values(&s->grid, k, v);
    char *p = buf;
    for (size_t j = 0; j < s->grid.nvary; j++) {
        double x = s->dim[j] == HF_DIM_ANGLE ? v[j] * (180.0 / M_PI) : v[j];
        p = put_num(p, x);
    }
    /* The first field has no leading comma: shift the row left by one. */
    memmove(buf, buf + 1, (size_t)(p - buf - 1));
    p--;
    p = put_text(p, hf_sweep_status_word(st));
    int solved = t->solved == HF_OK;
    for (size_t c = 0; c < s->ncols; c++) {
        const column *col = &s->cols[c];
        if (col->kind == HF_OUT_OFFSET) {
            if (t->bal_status[col->slot] != HF_OK || !solved) {
                *p++ = ',';
                continue;
            }
            double x = t->bal_offset[col->slot][col->sub];
            p = put_num(p, col->sub == 2 ? x * (180.0 / M_PI) : x);
            continue;
        }
        if (!solved) {
            *p++ = ',';
            continue;
        }
        if (kinds[col->kind].per_line) {
            p = put_num(p, line_value(t, col->kind, col->line) * column_scale(col->kind));
        } else if (col->sub == 1) {
            size_t li = col->kind == HF_OUT_MAX_TENSION ? t->res.max_tension_line
                                                        : t->res.max_utilisation_line;
            *p++ = ',';
            if (li < s->base->nlines) {
                size_t n = strlen(s->qname[li]);
                memcpy(p, s->qname[li], n);
                p += n;
            }
        } else {
            p = put_num(p, spread_value(t, col->kind) * column_scale(col->kind));
        }
    }
    *p++ = '\n';
    *p = '\0';
    return (int)(p - buf);
}

static int sweep_row(void *state, uint64_t k, int start, int emit, char *buf, size_t cap)
{
    thread_state *t = state;
    if (start) {
        hf_spread_reset(t->ws);
        /* hf_balance keeps warm starts with no public reset: a fresh workspace
         * per chain keeps the offsets independent of thread and shard (one
         * allocation per HF_STUDY_CHAIN cases, only with offset outputs). */
        if (t->plan->nbal) {
            hf_balance_free(t->bal);
            t->bal = hf_balance_alloc(&t->model, NULL);
        }
    }
    hf_status st = evaluate(t, k);
    if (!emit)
        return 0;
    if (st != HF_OK)
        t->failed++;
    return format_row(t, k, st, buf, cap);
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

static hf_status plan_outputs(hf_sweep *s, const char *const *outputs, size_t noutputs,
                              hf_error *err)
{
    const hf_model *m = s->base;
    if (noutputs == 0) {
        outputs = default_outputs;
        noutputs = sizeof default_outputs / sizeof default_outputs[0];
    }
    s->bal_load = hf_calloc(noutputs, sizeof *s->bal_load);
    if (!s->bal_load)
        return hf_error_set(err, HF_ENOMEM, "out of memory planning the sweep outputs");
    size_t cap = 0;
    for (size_t o = 0; o < noutputs; o++) {
        hf_output out;
        hf_status st = hf_sweep_output_parse(m, outputs[o], &out, err);
        if (st != HF_OK)
            return st;
        column c = {out.kind, 0, 0, 0};
        if (out.kind >= HF_OUT_STIFFNESS_SURGE && out.kind <= HF_OUT_STIFFNESS_YAW)
            s->need_k = 1;
        if (out.kind == HF_OUT_OFFSET) {
            size_t b = 0;
            while (b < s->nbal && s->bal_load[b] != out.load)
                b++;
            if (b == s->nbal)
                s->bal_load[s->nbal++] = out.load;
            c.slot = b;
            for (int k = 0; k < 3 && st == HF_OK; k++) {
                c.sub = k;
                st = add_column(s, &cap, c);
            }
        } else if (kinds[out.kind].per_line) {
            size_t lo = out.line == HF_OUTPUT_ALL ? 0 : out.line;
            size_t hi = out.line == HF_OUTPUT_ALL ? m->nlines : out.line + 1;
            for (size_t i = lo; i < hi && st == HF_OK; i++) {
                c.line = i;
                st = add_column(s, &cap, c);
            }
        } else {
            st = add_column(s, &cap, c);
            if (st == HF_OK &&
                (out.kind == HF_OUT_MAX_TENSION || out.kind == HF_OUT_MAX_UTILISATION)) {
                c.sub = 1;
                st = add_column(s, &cap, c);
            }
        }
        if (st != HF_OK)
            return hf_error_set(err, HF_ENOMEM, "out of memory planning the sweep outputs");
    }
    return HF_OK;
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
    /* Check every path on the model first, for a clear message. */
    {
        hf_model probe;
        hf_model_init(&probe);
        if (hf_model_copy(&probe, m) != HF_OK) {
            hf_error_set(err, HF_ENOMEM, "out of memory preparing the sweep");
            goto fail;
        }
        hf_status st = HF_OK;
        for (size_t j = 0; j < nvary && st == HF_OK; j++) {
            hf_param p;
            st = hf_model_param_lookup(&probe, vary[j].path, &p, err);
            s->dim[j] = p.dim;
        }
        hf_model_free(&probe);
        if (st != HF_OK)
            goto fail;
    }
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
     * or a quoted line name; the status word; the newline and NUL. */
    s->row_cap = (nvary + s->ncols + 1) * (HF_CSV_NUMBER_MAX + 1) + 2 * (longest + 1) + 32;
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

static const char *unit_suffix(hf_output_kind kind)
{
    switch (kind) {
    case HF_OUT_UTILISATION:
    case HF_OUT_MAX_UTILISATION:
        return "";
    case HF_OUT_STIFFNESS_SURGE:
    case HF_OUT_STIFFNESS_SWAY:
    case HF_OUT_STIFFNESS_HEAVE:
        return "_kN_per_m";
    case HF_OUT_STIFFNESS_YAW:
        return "_kNm_per_rad";
    default:
        return "_kN";
    }
}

hf_status hf_sweep_write_header(const hf_sweep *s, FILE *out, hf_error *err)
{
    const hf_model *m = s->base;
    hf_csv c;
    hf_csv_init(&c, out, 0);
    char name[2 * HF_MODEL_MAX_NAME + 4096];
    for (size_t j = 0; j < s->grid.nvary; j++) {
        hf_dim d = s->dim[j];
        const char *u = d == HF_DIM_ANGLE ? "deg" : hf_dim_si(d);
        snprintf(name, sizeof name, "%s%s%s", s->vary[j].path, *u ? "_" : "", u);
        hf_csv_field_str(&c, name);
    }
    hf_csv_field_str(&c, "status");
    static const char *const line_prefix[] = {
        [HF_OUT_FAIRLEAD_TENSION] = "T_", [HF_OUT_FAIRLEAD_HORIZONTAL] = "H_",
        [HF_OUT_FAIRLEAD_VERTICAL] = "V_", [HF_OUT_ANCHOR_TENSION] = "anchor_T_",
        [HF_OUT_UTILISATION] = "U_"};
    static const char *const off_name[] = {"surge_m", "sway_m", "yaw_deg"};
    for (size_t i = 0; i < s->ncols; i++) {
        const column *col = &s->cols[i];
        if (col->kind == HF_OUT_OFFSET)
            snprintf(name, sizeof name, "offset_%s_%s", m->loads[s->bal_load[col->slot]].name,
                     off_name[col->sub]);
        else if (kinds[col->kind].per_line)
            snprintf(name, sizeof name, "%s%s%s", line_prefix[col->kind], m->lines[col->line].name,
                     unit_suffix(col->kind));
        else if (col->sub == 1)
            snprintf(name, sizeof name, "%s",
                     col->kind == HF_OUT_MAX_TENSION ? "max_tension_line" : "worst_line");
        else
            snprintf(name, sizeof name, "%s%s", kinds[col->kind].name, unit_suffix(col->kind));
        hf_csv_field_str(&c, name);
    }
    hf_csv_end_row(&c);
    if (ferror(out))
        return hf_error_set(err, HF_EIO, "writing the sweep header failed");
    return HF_OK;
}

hf_status hf_sweep_write_rows(hf_sweep *s, const hf_sweep_range *r, FILE *out, hf_error *err)
{
    if (!r || r->begin > r->end || r->end > s->grid.ncases)
        return hf_error_set(err, HF_EINVAL, "sweep: case range outside 0..%llu",
                            (unsigned long long)s->grid.ncases);
    hf_study_stream_options o;
    memset(&o, 0, sizeof o);
    o.jobs = s->jobs;
    o.row_cap = s->row_cap;
    o.progress = r->progress;
    o.progress_ctx = r->progress_ctx;
    o.stop = r->stop;
    return hf_study_stream(r->begin, r->end, (void **)s->th, sweep_row, &o, out, err);
}

hf_status hf_sweep_case_row(hf_sweep *s, uint64_t k, char *buf, size_t cap, hf_error *err)
{
    if (k >= s->grid.ncases)
        return hf_error_set(err, HF_EINVAL, "sweep: case %llu out of range",
                            (unsigned long long)k);
    if (cap < s->row_cap)
        return hf_error_set(err, HF_ELIMIT, "sweep: a row needs up to %zu bytes", s->row_cap);
    thread_state *t = s->th[0];
    hf_spread_reset(t->ws);
    if (s->nbal) {
        hf_balance_free(t->bal);
        t->bal = hf_balance_alloc(&t->model, NULL);
    }
    hf_status st = evaluate(t, k);
    format_row(t, k, st, buf, cap);
    return HF_OK;
}

hf_status hf_sweep_output_eval(const hf_model *m, hf_spread *ws, hf_balance *bal,
                               const hf_output *o, double *value, hf_error *err)
{
    *value = 0.0;
    if (!hf_sweep_output_is_scalar(o))
        return hf_error_set(err, HF_EINVAL, "output %s is not a single value",
                            hf_sweep_output_name(o->kind));
    hf_pose pose;
    hf_spread_pose_rest(m, &pose);
    if (o->kind == HF_OUT_OFFSET) {
        if (!bal)
            return hf_error_set(err, HF_EINVAL, "offset output without a balance workspace");
        hf_status st = hf_balance_solve(bal, &m->loads[o->load], 0, err);
        if (st == HF_OK)
            *value = hf_balance_result_at(bal, 0)->offset[0];
        return st;
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
    *value = kinds[o->kind].per_line ? line_value(&t, o->kind, o->line)
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
    if (hf_units_parse(buf, d, out, &sub) != HF_OK)
        return hf_error_set(err, HF_EINVAL, "--vary %s: %s", whole, sub.text);
    return HF_OK;
}

hf_status hf_sweep_vary_parse(hf_model *m, const char *text, int bracket, hf_vary *v,
                              hf_error *err)
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
                                "--vary %s: STEP must be non-zero and point from FROM to TO",
                                text);
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
