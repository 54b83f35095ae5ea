/* analysis.c - study drivers: one pose, restoring curves and balance runs, results in memory. */
#include <math.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/analysis.h"
#include "holdfast/criteria.h"
#include "holdfast/study.h"

void hf_analysis_pose_init(hf_analysis_pose *a)
{
    memset(a, 0, sizeof *a);
}

void hf_analysis_pose_clear(hf_analysis_pose *a)
{
    hf_spread_free(a->ws);
    hf_analysis_pose_init(a);
}

hf_status hf_analysis_pose_solve(hf_analysis_pose *a, const hf_model *m, const double offset[3],
                                 int stiffness, hf_error *err)
{
    if (!a->ws && !(a->ws = hf_spread_alloc(m, err)))
        return err ? err->status : HF_ENOMEM;
    hf_spread_pose_rest(m, &a->pose);
    hf_spread_pose_offset(&a->pose, offset);
    if (stiffness)
        return hf_spread_stiffness(a->ws, &a->pose, a->K, &a->res, err);
    memset(a->K, 0, sizeof a->K);
    return hf_spread_solve(a->ws, &a->pose, &a->res, err);
}

double hf_analysis_allowed_tension(const hf_model *m, size_t i)
{
    double f = hf_criteria_required(&m->criteria, 0);
    double mbl = INFINITY;
    for (size_t k = 0; k < m->lines[i].line.n; k++)
        mbl = fmin(mbl, m->lines[i].line.sec[k].mbl);
    return f > 0 && isfinite(mbl) ? mbl / f : 0.0;
}

void hf_analysis_profile_point(const hf_model *m, const hf_spread_result *r, size_t i,
                               const hf_line_point *p, double g[3])
{
    const double *d = r->geom[i].dir;
    g[0] = m->lines[i].anchor[0] + p->x * d[0];
    g[1] = m->lines[i].anchor[1] + p->x * d[1];
    g[2] = -hf_model_water_height(m) + r->geom[i].anchor_rise + p->z; /* rise: sloped seabed */
}

/* ---- curve ---- */

/* Allocates n (or n * nlines) elements of size sz, or NULL on overflow. */
static void *array(size_t n, size_t per, size_t sz)
{
    if (per && n > (size_t)-1 / per / sz)
        return NULL;
    return hf_calloc(n * (per ? per : 1), sz);
}

hf_analysis_curve *hf_analysis_curve_alloc(const hf_model *m, size_t n, hf_error *err)
{
    if (n == 0) {
        hf_error_set(err, HF_EINVAL, "a curve needs at least one offset");
        return NULL;
    }
    size_t nl = m->nlines;
    hf_analysis_curve *c = hf_calloc(1, sizeof *c);
    if (c) {
        c->n = n;
        c->nlines = nl;
        c->status = array(n, 1, sizeof *c->status);
        c->max_tension_line = array(n, 1, sizeof(size_t));
        c->max_utilisation_line = array(n, 1, sizeof(size_t));
        double **d[] = {&c->offset,       &c->restoring,       &c->stiffness,
                        &c->force_x,      &c->force_y,         &c->moment_z,
                        &c->max_tension,  &c->max_utilisation, &c->fairlead_tension,
                        &c->line_tension, &c->utilisation};
        for (size_t j = 0; j < sizeof d / sizeof d[0]; j++)
            *d[j] = array(n, j < 8 ? 1 : nl, sizeof(double));
    }
    if (!c || !c->status || !c->max_tension_line || !c->max_utilisation_line || !c->offset ||
        !c->restoring || !c->stiffness || !c->force_x || !c->force_y || !c->moment_z ||
        !c->max_tension || !c->max_utilisation || !c->fairlead_tension || !c->line_tension ||
        !c->utilisation) {
        hf_analysis_curve_free(c);
        hf_error_set(err, HF_ENOMEM, "out of memory for a curve of %zu offsets", n);
        return NULL;
    }
    return c;
}

void hf_analysis_curve_free(hf_analysis_curve *c)
{
    if (!c)
        return;
    void *p[] = {c->status,       c->max_tension_line, c->max_utilisation_line,
                 c->offset,       c->restoring,        c->stiffness,
                 c->force_x,      c->force_y,          c->moment_z,
                 c->max_tension,  c->max_utilisation,  c->fairlead_tension,
                 c->line_tension, c->utilisation};
    for (size_t j = 0; j < sizeof p / sizeof p[0]; j++)
        hf_free(p[j]);
    hf_free(c);
}

/* Point k of c from a solve at offset s along (cd, sd). */
static void point_set(hf_analysis_curve *c, size_t k, double s, double cd, double sd,
                      double K[6][6], const hf_spread_result *r)
{
    c->offset[k] = s;
    c->status[k] = HF_OK;
    c->restoring[k] = -(r->force[0] * cd + r->force[1] * sd);
    c->force_x[k] = r->force[0];
    c->force_y[k] = r->force[1];
    c->moment_z[k] = r->force[5];
    /* d(restoring)/ds = d^T K_h d (K = -dF/dq): the directional derivative
     * of a quadratic form; the order of the products is kept as released
     * so the CSV digits do not move. */
    c->stiffness[k] = K[0][0] * cd * cd + (K[0][1] + K[1][0]) * cd * sd + K[1][1] * sd * sd;
    c->max_tension[k] = r->max_tension;
    c->max_tension_line[k] = r->max_tension_line;
    c->max_utilisation[k] = r->max_utilisation;
    c->max_utilisation_line[k] = r->max_utilisation_line;
    for (size_t i = 0; i < c->nlines; i++) {
        c->fairlead_tension[k * c->nlines + i] = r->states[i].tension;
        c->line_tension[k * c->nlines + i] = r->line_tension[i];
        c->utilisation[k * c->nlines + i] = r->states[i].max_utilisation;
    }
}

/* Point k of c as a failed offset s: values NaN, the first failure kept. */
static void point_fail(hf_analysis_curve *c, size_t k, double s, hf_status st, const hf_error *e)
{
    double nan = NAN;
    c->offset[k] = s;
    c->status[k] = st;
    c->restoring[k] = c->force_x[k] = c->force_y[k] = c->moment_z[k] = c->stiffness[k] = nan;
    c->max_tension[k] = c->max_utilisation[k] = nan;
    c->max_tension_line[k] = c->max_utilisation_line[k] = (size_t)-1;
    for (size_t i = 0; i < c->nlines; i++)
        c->fairlead_tension[k * c->nlines + i] = c->line_tension[k * c->nlines + i] =
            c->utilisation[k * c->nlines + i] = nan;
    if (c->nfailed++ == 0) {
        c->first_failed = k;
        hf_error_set(&c->first_error, st, "curve at offset %.6g m: %.900s", s, e->text);
    }
}

hf_status hf_analysis_curve_compute(hf_analysis_curve *c, const hf_model *m, double direction,
                                    double from, double to, double step, hf_error *err)
{
    if (!isfinite(direction) || !isfinite(from) || !isfinite(to) || !isfinite(step))
        return hf_error_set(err, HF_EINVAL, "curve: direction, start and step must be finite");
    hf_spread *ws = hf_spread_alloc(m, err);
    if (!ws)
        return err ? err->status : HF_ENOMEM;
    c->direction = direction;
    c->nfailed = 0;
    c->first_failed = (size_t)-1;
    hf_error_clear(&c->first_error);
    double cd = cos(direction), sd = sin(direction);
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.from = from;
    v.to = to;
    v.step = step;
    hf_pose rest;
    hf_spread_pose_rest(m, &rest);
    for (size_t k = 0; k < c->n; k++) {
        double s = hf_study_vary_value(&v, k); /* the one range rule (study.h) */
        hf_pose p = rest;
        p.surge += s * cd;
        p.sway += s * sd;
        double K[6][6];
        hf_spread_result r;
        hf_error e;
        hf_error_clear(&e);
        hf_status st = hf_spread_stiffness(ws, &p, K, &r, &e);
        if (st == HF_OK) {
            point_set(c, k, s, cd, sd, K, &r);
        } else {
            point_fail(c, k, s, st, &e);
            hf_spread_reset(ws); /* the next offset starts cold */
        }
    }
    hf_spread_free(ws);
    return HF_OK;
}

/* ---- balance ---- */

/* The state of one load case's run, for the visitor. */
typedef struct {
    const hf_analysis_balance_sink *sink;
    const hf_load *load;
    hf_analysis_balance_count *count;
    size_t total;
    hf_status status; /* a sink's failure, else HF_OK */
    hf_error *err;
    hf_status intact;   /* the intact condition's status */
    double intact_u[3]; /* and its offset (surge m, sway m, yaw rad) */
} visit_ctx;

static int visit(void *ctx, size_t cond, const hf_balance_result *r)
{
    visit_ctx *v = ctx;
    hf_analysis_balance_count *n = v->count;
    if (cond == 0) {
        v->intact = r->status;
        memcpy(v->intact_u, r->offset, sizeof v->intact_u);
    }
    n->conditions++;
    n->passed += r->passed != 0;
    n->failed += r->passed == 0;
    n->noresult += r->status != HF_OK;
    if (v->sink->condition &&
        (v->status = v->sink->condition(v->sink->ctx, v->load, r, v->err)) != HF_OK)
        return 1;
    if (v->sink->progress)
        v->sink->progress(v->sink->ctx, n->conditions, v->total);
    return 0;
}

/* Solves every condition of load l with b (hf_balance_run_each: one result
 * at a time, memory linear in the lines) and hands the results to sink. */
static hf_status run_load(hf_balance *b, const hf_load *l, const hf_analysis_balance_sink *sink,
                          hf_analysis_balance_count *count, size_t total, hf_error *err)
{
    double f[3];
    hf_status s = hf_balance_load_force(l, f, err);
    if (s != HF_OK)
        return s;
    if (sink->load_begin && (s = sink->load_begin(sink->ctx, l, f, err)) != HF_OK)
        return s;
    visit_ctx v = {sink, l, count, total, HF_OK, err, HF_EINVAL, {0.0, 0.0, 0.0}};
    hf_error e;
    hf_error_clear(&e);
    (void)hf_balance_run_each(b, l, visit, &v, &e); /* statuses are in the results */
    if (v.status != HF_OK)
        return v.status;
    count->loads++;
    if (sink->load_end && (s = sink->load_end(sink->ctx, l, v.intact, v.intact_u, err)) != HF_OK)
        return s;
    return HF_OK;
}

hf_status hf_analysis_balance_run(const hf_model *m, const size_t *which, size_t nwhich,
                                  const hf_analysis_balance_sink *sink,
                                  hf_analysis_balance_count *count, hf_error *err)
{
    memset(count, 0, sizeof *count);
    size_t nload = which ? nwhich : m->nloads;
    for (size_t k = 0; which && k < nwhich; k++)
        if (which[k] >= m->nloads)
            return hf_error_set(err, HF_EINVAL, "balance: load index %zu out of range (%zu loads)",
                                which[k], m->nloads);
    hf_balance *b = hf_balance_alloc(m, err);
    if (!b)
        return err ? err->status : HF_ENOMEM;
    size_t total = nload * hf_balance_ncond(b);
    hf_status s = HF_OK;
    for (size_t k = 0; k < nload && s == HF_OK; k++)
        s = run_load(b, &m->loads[which ? which[k] : k], sink, count, total, err);
    hf_balance_free(b);
    return s;
}
