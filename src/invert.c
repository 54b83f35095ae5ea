/* invert.c - design inversion with GSL's Brent bracketing root solver. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_roots.h>
#include "holdfast/alloc.h"
#include "holdfast/balance.h"
#include "holdfast/csv.h"
#include "holdfast/invert.h"
#include "holdfast/spread.h"

/* Column unit of an output and the factor from SI to it (the catalogue's). */
static const char *out_unit(const hf_output *o, double *scale)
{
    const hf_output_info *in = hf_output_info_of(o->kind);
    *scale = in ? in->scale : 1.0;
    return in ? in->unit_text : "-";
}

typedef struct {
    hf_model model; /* own copy */
    const hf_model *base;
    const char *path;                       /* the parameter's path (borrowed) */
    char otext[2 * HF_MODEL_MAX_NAME + 32]; /* the output as the user writes it */
    hf_param param;
    hf_spread *ws;
    hf_balance *bal;
    const hf_output *o;
    double target;
    hf_status failed; /* first failure inside the solver, HF_OK if none */
    double failed_at;
    hf_error err;
} problem;

/* Output at parameter value x, SI.  The anchors go back to the case's
 * positions first so anchor_radius moves along the case's own direction. */
static hf_status output_at(problem *p, double x, double *y)
{
    for (size_t i = 0; i < p->model.nlines; i++) {
        p->model.lines[i].anchor[0] = p->base->lines[i].anchor[0];
        p->model.lines[i].anchor[1] = p->base->lines[i].anchor[1];
    }
    hf_status st = hf_model_param_set(&p->model, &p->param, x, &p->err);
    if (st != HF_OK)
        return st;
    if (p->bal)
        hf_balance_refresh(p->bal); /* the rest pose of this value */
    return hf_sweep_output_eval(&p->model, p->ws, p->bal, p->o, y, &p->err);
}

static double gsl_fn(double x, void *params)
{
    problem *p = params;
    double y = 0.0;
    hf_status st = output_at(p, x, &y);
    if (st != HF_OK) {
        if (p->failed == HF_OK) {
            p->failed = st;
            p->failed_at = x;
        }
        return 0.0; /* the caller checks p->failed after every iteration */
    }
    return y - p->target;
}

void hf_invert_target_text(const char *output, const char *line, char *buf, size_t cap)
{
    snprintf(buf, cap, "%s%s%s", output ? output : "", line ? ":" : "", line ? line : "");
}

/* An output value for messages, in its column unit ("812.5 kN"). */
static void describe(const problem *p, char *buf, size_t cap, double y)
{
    double scale;
    const char *u = out_unit(p->o, &scale);
    snprintf(buf, cap, "%.10g %s", y * scale, strcmp(u, "-") ? u : "");
}

/* A parameter value for messages, in the unit people read: degrees for
 * angles, else the SI unit ("12.5 deg", "859.4 m"). */
static const char *value_text(const problem *p, double x, char *buf, size_t cap)
{
    int deg = p->param.dim == HF_DIM_ANGLE;
    snprintf(buf, cap, "%.10g%s%s", deg ? x * (180.0 / M_PI) : x,
             deg || *hf_dim_si(p->param.dim) ? " " : "", deg ? "deg" : hf_dim_si(p->param.dim));
    return buf;
}

/* Copies the model, looks the parameter up and allocates the workspaces. */
static hf_status problem_init(problem *p, const hf_model *m, const char *path, const hf_output *o,
                              double target, hf_error *err)
{
    memset(p, 0, sizeof *p);
    p->base = m;
    p->path = path;
    p->o = o;
    p->target = target;
    hf_model_init(&p->model);
    if (hf_model_copy(&p->model, m) != HF_OK)
        return hf_error_set(err, HF_ENOMEM, "out of memory copying the model");
    hf_status st = hf_model_param_lookup(&p->model, path, &p->param, err);
    if (st != HF_OK)
        return st;
    hf_output_text(m, o, p->otext, sizeof p->otext);
    p->ws = hf_spread_alloc(&p->model, err);
    if (!p->ws)
        return err ? err->status : HF_ENOMEM;
    if (hf_output_needs_balance(o)) {
        p->bal = hf_balance_alloc(&p->model, err);
        if (!p->bal)
            return err ? err->status : HF_ENOMEM;
    }
    return HF_OK;
}

static void problem_clear(problem *p)
{
    hf_balance_free(p->bal);
    hf_spread_free(p->ws);
    hf_model_free(&p->model);
}

/* The output at both ends of the bracket, from cold starts; HF_ERANGE
 * unless the case solves at both and the target lies between them. */
static hf_status bracket_ends(problem *p, hf_invert_result *res, hf_error *err)
{
    char a[96], b[96], t[96], x[64], y[64];
    double ends[2] = {res->lo, res->hi}, f[2];
    for (int i = 0; i < 2; i++) {
        hf_spread_reset(p->ws);
        hf_balance_reset(p->bal);
        if (output_at(p, ends[i], &f[i]) != HF_OK)
            return hf_error_set(err, HF_ERANGE,
                                "invert: %s = %s (%s end of the bracket): the case does not "
                                "solve there (%s); choose a bracket where it does",
                                p->path, value_text(p, ends[i], x, sizeof x), i ? "upper" : "lower",
                                p->err.text);
    }
    res->f_lo = f[0];
    res->f_hi = f[1];
    double g0 = f[0] - p->target, g1 = f[1] - p->target;
    if ((g0 > 0 && g1 > 0) || (g0 < 0 && g1 < 0)) {
        describe(p, t, sizeof t, p->target);
        describe(p, a, sizeof a, f[0]);
        describe(p, b, sizeof b, f[1]);
        return hf_error_set(err, HF_ERANGE,
                            "invert: the target %s = %s is not reached for %s in [%s, %s]: it "
                            "gives %s at %s and %s at %s; widen or move the bracket",
                            p->otext, t, p->path, value_text(p, res->lo, x, sizeof x),
                            value_text(p, res->hi, y, sizeof y), a, x, b, y);
    }
    return HF_OK;
}

/* Brent's bracketing iterations (GSL) until the output meets the target to
 * 1e-3 of the tolerance or the bracket collapses; the root into *root. */
static hf_status brent(problem *p, hf_invert_result *res, double ref, double *root, hf_error *err)
{
    char x[64];
    gsl_root_fsolver *solver = gsl_root_fsolver_alloc(gsl_root_fsolver_brent);
    if (!solver)
        return hf_error_set(err, HF_ENOMEM, "out of memory for the root solver");
    gsl_function fn = {gsl_fn, p};
    gsl_root_fsolver_set(solver, &fn, res->lo, res->hi);
    hf_status st = HF_OK;
    int it = 0, done_iter = 0;
    *root = 0.5 * (res->lo + res->hi);
    while (!done_iter && it < HF_INVERT_MAX_ITER) {
        it++;
        gsl_root_fsolver_iterate(solver);
        if (p->failed != HF_OK) {
            st = hf_error_set(err, HF_ENOCONV,
                              "invert: %s = %s inside the bracket: the case does not solve there "
                              "(%s)",
                              p->path, value_text(p, p->failed_at, x, sizeof x), p->err.text);
            break;
        }
        *root = gsl_root_fsolver_root(solver);
        double xl = gsl_root_fsolver_x_lower(solver), xu = gsl_root_fsolver_x_upper(solver);
        double y;
        if (output_at(p, *root, &y) == HF_OK && fabs(y - p->target) <= 1e-3 * HF_INVERT_RTOL * ref)
            done_iter = 1;
        else if (gsl_root_test_interval(xl, xu, 0.0, 1e-14) == GSL_SUCCESS)
            done_iter = 1;
    }
    res->iterations = it;
    gsl_root_fsolver_free(solver);
    return st;
}

/* The value must meet the target on its own: re-evaluated from a cold start. */
static hf_status verify(problem *p, hf_invert_result *res, double root, double ref, hf_error *err)
{
    char a[96], t[96], x[64];
    hf_spread_reset(p->ws);
    hf_balance_reset(p->bal);
    double y;
    if (output_at(p, root, &y) != HF_OK)
        return hf_error_set(err, HF_ENOCONV, "invert: %s = %s: the case does not solve (%s)",
                            p->path, value_text(p, root, x, sizeof x), p->err.text);
    res->value = root;
    res->achieved = y;
    res->relative_error = fabs(y - p->target) / ref;
    if (!(res->relative_error <= HF_INVERT_RTOL)) {
        describe(p, a, sizeof a, y);
        describe(p, t, sizeof t, p->target);
        return hf_error_set(err, HF_ENOCONV,
                            "invert: %s = %s gives %s = %s, %.3g relative to the target %s; the "
                            "output may jump there (a regime change) - narrow the bracket",
                            p->path, value_text(p, root, x, sizeof x), p->otext, a,
                            res->relative_error, t);
    }
    return HF_OK;
}

hf_status hf_invert_solve(const hf_model *m, const char *path, double lo, double hi,
                          const hf_output *o, double target, hf_invert_result *res, hf_error *err)
{
    memset(res, 0, sizeof *res);
    if (!m || !path || !o)
        return hf_error_set(err, HF_EINVAL, "invert: no model, path or output");
    if (!hf_output_is_scalar(o))
        return hf_error_set(err, HF_EINVAL,
                            "invert: the target %s must be one value (give :LINE for a per-line "
                            "output)",
                            hf_output_name(o->kind));
    if (!isfinite(lo) || !isfinite(hi) || !(lo < hi))
        return hf_error_set(err, HF_EINVAL, "invert: %s: expected a bracket LO < HI, got %g:%g",
                            path, lo, hi);
    if (!isfinite(target))
        return hf_error_set(err, HF_EINVAL, "invert: the target value must be finite");
    problem p;
    res->lo = lo;
    res->hi = hi;
    hf_status st = problem_init(&p, m, path, o, target, err);
    if (st == HF_OK)
        st = bracket_ends(&p, res, err);
    if (st == HF_OK) {
        double scale = fmax(fabs(target), fmax(fabs(res->f_lo), fabs(res->f_hi)));
        double ref = target != 0.0 ? fabs(target) : scale;
        double root = res->f_lo == target ? lo : hi;
        if (res->f_lo != target && res->f_hi != target)
            st = brent(&p, res, ref, &root, err);
        if (st == HF_OK)
            st = verify(&p, res, root, ref, err);
    }
    problem_clear(&p);
    return st;
}

hf_status hf_invert_write_csv(FILE *out, const hf_model *m, const char *path, const hf_output *o,
                              double target, const hf_invert_result *res, hf_error *err)
{
    hf_model copy;
    hf_param p;
    hf_dim d = HF_DIM_NONE;
    hf_model_init(&copy);
    /* The parameter's dimension, looked up on a copy (lookup needs a mutable model). */
    if (hf_model_copy(&copy, m) == HF_OK && hf_model_param_lookup(&copy, path, &p, NULL) == HF_OK)
        d = p.dim;
    hf_model_free(&copy);
    double scale, vs = d == HF_DIM_ANGLE ? 180.0 / M_PI : 1.0;
    const char *u = out_unit(o, &scale);
    char name[2 * HF_MODEL_MAX_NAME + 32];
    hf_output_text(m, o, name, sizeof name);
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header(&c, "parameter", "value", "value_unit", "output", "target", "achieved",
                  "output_unit", "relative_error", "iterations", NULL);
    hf_csv_field_str(&c, path);
    hf_csv_field_double(&c, res->value * vs);
    hf_csv_field_str(&c, d == HF_DIM_ANGLE ? "deg" : (*hf_dim_si(d) ? hf_dim_si(d) : "-"));
    hf_csv_field_str(&c, name);
    hf_csv_field_double(&c, target * scale);
    hf_csv_field_double(&c, res->achieved * scale);
    hf_csv_field_str(&c, u);
    hf_csv_field_double(&c, res->relative_error);
    hf_csv_field_long(&c, res->iterations);
    hf_csv_end_row(&c);
    if (ferror(out))
        return hf_error_set(err, HF_EIO, "writing the inversion result failed");
    return HF_OK;
}
