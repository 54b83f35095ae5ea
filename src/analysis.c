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
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.from = from;
    v.to = to;
    v.step = step;
    for (size_t k = 0; k < c->n; k++)
        c->offset[k] = hf_study_vary_value(&v, k); /* the one range rule (study.h) */
    return hf_analysis_curve_compute_at(c, m, direction, c->offset, err);
}

hf_status hf_analysis_curve_compute_at(hf_analysis_curve *c, const hf_model *m, double direction,
                                       const double *offsets, hf_error *err)
{
    if (!isfinite(direction))
        return hf_error_set(err, HF_EINVAL, "curve: the direction must be finite");
    for (size_t k = 0; k < c->n; k++)
        if (!isfinite(offsets[k]))
            return hf_error_set(err, HF_EINVAL, "curve: offset %zu is not finite", k);
    hf_spread *ws = hf_spread_alloc(m, err);
    if (!ws)
        return err ? err->status : HF_ENOMEM;
    c->direction = direction;
    c->nfailed = 0;
    c->first_failed = (size_t)-1;
    hf_error_clear(&c->first_error);
    double cd = cos(direction), sd = sin(direction);
    hf_pose rest;
    hf_spread_pose_rest(m, &rest);
    for (size_t k = 0; k < c->n; k++) {
        double s = offsets[k];
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

/* ---- balance over a water-level envelope ---- */

static const hf_analysis_where nowhere = {(size_t)-1, 0, 0.0};

size_t hf_analysis_envelope_levels(const hf_model *m, double *out, size_t cap)
{
    size_t n = m->site.nwater_levels;
    if (n == 0) {
        if (cap > 0)
            out[0] = m->site.water_level;
        return 1;
    }
    for (size_t k = 0; k < n && k < cap; k++)
        out[k] = m->site.water_levels[k];
    return n;
}

hf_analysis_envelope *hf_analysis_envelope_alloc(const hf_model *m, size_t nlevels, hf_error *err)
{
    if (nlevels == 0) {
        hf_error_set(err, HF_EINVAL, "an envelope needs at least one water level");
        return NULL;
    }
    hf_analysis_envelope *e = hf_calloc(1, sizeof *e);
    if (e) {
        e->nlevels = nlevels;
        e->nlines = m->nlines;
        e->level = array(nlevels, 1, sizeof *e->level);
        e->line = array(m->nlines ? m->nlines : 1, 1, sizeof *e->line);
    }
    if (!e || !e->level || !e->line) {
        hf_analysis_envelope_free(e);
        hf_error_set(err, HF_ENOMEM, "out of memory for an envelope of %zu levels", nlevels);
        return NULL;
    }
    return e;
}

void hf_analysis_envelope_free(hf_analysis_envelope *e)
{
    if (!e)
        return;
    hf_free(e->level);
    hf_free(e->line);
    hf_free(e);
}

/* The state of an envelope run, for the forwarding callbacks. */
typedef struct {
    hf_analysis_envelope *e;
    const hf_analysis_envelope_sink *sink;
    const hf_model *at; /* the model at the current level */
    double level;
    size_t before, total; /* conditions of the levels done, of the whole run */
} env_ctx;

/* Keeps v (at w) in *best when none is kept yet or `better`. */
static void keep(double *best, hf_analysis_where *bw, double v, const hf_analysis_where *w,
                 int better)
{
    if (bw->load == (size_t)-1 || better) {
        *best = v;
        *bw = *w;
    }
}

/* The anchor of line i in r into the envelope line el. */
static void env_anchor(hf_analysis_envelope_line *el, const hf_anchor_criterion *a,
                       const hf_analysis_where *w)
{
    keep(&el->anchor_load, &el->anchor_load_at, a->load, w, a->load > el->anchor_load);
    keep(&el->angle, &el->angle_at, a->angle, w, a->angle > el->angle);
    if (a->kind == HF_ANCHOR_GRAVITY && a->has_sliding)
        keep(&el->sliding, &el->sliding_at, a->sliding_factor, w, a->sliding_factor < el->sliding);
    if (a->kind == HF_ANCHOR_GRAVITY && a->has_uplift)
        keep(&el->uplift, &el->uplift_at, a->uplift_factor, w, a->uplift_factor < el->uplift);
    if (a->checked && !a->passed && el->anchor_failed++ == 0)
        el->anchor_fail_at = *w;
}

/* One condition's result into the envelope. */
static void env_add(hf_analysis_envelope *e, const hf_analysis_where *w, const hf_balance_result *r)
{
    if (!r->passed && e->first_failed.load == (size_t)-1)
        e->first_failed = *w;
    if (r->status != HF_OK)
        return;
    for (size_t i = 0; i < e->nlines && i < r->nlines; i++) {
        if (r->broken == i)
            continue;
        hf_analysis_envelope_line *el = &e->line[i];
        double u = r->utilisation[i], f = u > 0.0 ? 1.0 / u : 0.0;
        keep(&el->tension, &el->at, r->tension[i], w, r->tension[i] > el->tension);
        if (el->at.load == w->load && el->at.cond == w->cond && el->at.level == w->level)
            el->utilisation = u;
        keep(&el->min_factor, &el->factor_at, f, w,
             f > 0.0 && (el->min_factor == 0.0 || f < el->min_factor));
        env_anchor(el, &r->anchor[i], w);
    }
    if (r->overloaded && r->overloaded_line < r->nlines) {
        size_t i = r->overloaded_line;
        if (e->overloaded++ == 0 || r->utilisation[i] > e->overload_utilisation) {
            e->overload_line = i;
            e->overload_utilisation = r->utilisation[i];
            e->overload_tension = r->tension[i];
            e->overload_at = *w;
        }
    }
}

static hf_status env_load_begin(void *ctx, const hf_load *l, const double force[3], hf_error *err)
{
    env_ctx *c = ctx;
    const hf_analysis_balance_sink *s = &c->sink->each;
    return s->load_begin ? s->load_begin(s->ctx, l, force, err) : HF_OK;
}

static hf_status env_condition(void *ctx, const hf_load *l, const hf_balance_result *r,
                               hf_error *err)
{
    env_ctx *c = ctx;
    hf_analysis_where w = {(size_t)(l - c->at->loads),
                           r->broken == HF_BALANCE_NONE ? 0 : r->broken + 1, c->level};
    env_add(c->e, &w, r);
    const hf_analysis_balance_sink *s = &c->sink->each;
    return s->condition ? s->condition(s->ctx, l, r, err) : HF_OK;
}

static hf_status env_load_end(void *ctx, const hf_load *l, hf_status intact, const double offset[3],
                              hf_error *err)
{
    env_ctx *c = ctx;
    const hf_analysis_balance_sink *s = &c->sink->each;
    return s->load_end ? s->load_end(s->ctx, l, intact, offset, err) : HF_OK;
}

static void env_progress(void *ctx, size_t done, size_t total)
{
    env_ctx *c = ctx;
    (void)total;
    if (c->sink->each.progress)
        c->sink->each.progress(c->sink->each.ctx, c->before + done, c->total);
}

/* Clears the results of e before a run. */
static void env_reset(hf_analysis_envelope *e)
{
    memset(&e->count, 0, sizeof e->count);
    for (size_t i = 0; i < e->nlines; i++) {
        memset(&e->line[i], 0, sizeof e->line[i]);
        hf_analysis_envelope_line *el = &e->line[i];
        el->at = el->factor_at = el->anchor_load_at = el->angle_at = el->sliding_at =
            el->uplift_at = el->anchor_fail_at = nowhere;
    }
    e->nloads = 0;
    e->overloaded = 0;
    e->overload_line = (size_t)-1;
    e->overload_utilisation = e->overload_tension = 0.0;
    e->overload_at = e->first_failed = nowhere;
}

/* The copy at level z: site.water_level set through the model's parameter. */
static hf_status env_set_level(hf_model *copy, double z, hf_error *err)
{
    if (!isfinite(z) || !(copy->site.depth + z > 0.0))
        return hf_error_set(err, HF_EINVAL,
                            "water level %.6g m: expected a finite level above the seabed "
                            "(> -%.6g m)",
                            z, copy->site.depth);
    if (copy->site.water_level == z)
        return HF_OK;
    hf_param p;
    hf_status s = hf_model_param_lookup(copy, "site.water_level", &p, err);
    return s == HF_OK ? hf_model_param_set(copy, &p, z, err) : s;
}

hf_status hf_analysis_envelope_run(hf_analysis_envelope *e, const hf_model *m, const size_t *which,
                                   size_t nwhich, const hf_analysis_envelope_sink *sink,
                                   hf_error *err)
{
    static const hf_analysis_envelope_sink none;
    if (!sink)
        sink = &none;
    env_reset(e);
    hf_model copy;
    if (hf_model_copy(&copy, m) != HF_OK)
        return hf_error_set(err, HF_ENOMEM, "out of memory for a copy of the model");
    size_t nload = which ? nwhich : m->nloads;
    env_ctx c = {e, sink, &copy, 0.0, 0, e->nlevels * nload * (1 + m->nlines)};
    hf_analysis_balance_sink inner = {&c, env_load_begin, env_condition, env_load_end,
                                      env_progress};
    hf_status s = HF_OK;
    for (size_t k = 0; k < e->nlevels && s == HF_OK; k++) {
        c.level = e->level[k];
        s = env_set_level(&copy, c.level, err);
        if (s == HF_OK && sink->level_begin)
            s = sink->level_begin(sink->each.ctx, k, c.level, &copy, err);
        hf_analysis_balance_count n;
        if (s == HF_OK)
            s = hf_analysis_balance_run(&copy, which, nwhich, &inner, &n, err);
        if (s != HF_OK)
            break;
        e->count.loads += n.loads;
        e->count.conditions += n.conditions;
        e->count.passed += n.passed;
        e->count.failed += n.failed;
        e->count.noresult += n.noresult;
        c.before += n.conditions;
    }
    e->nloads = nload;
    hf_model_free(&copy);
    return s;
}
