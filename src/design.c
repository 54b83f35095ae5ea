/* design.c - the quasi-static design check of one environment in one
 * condition (design.h): mean pose (hf_env_mean_pose around
 * hf_balance_solve), stiffness and motions at the mean pose, design offset
 * (API RP 2SK combination, from memory; docs/design.md), line tensions at
 * both combination poses and the criteria.  Allocates in hf_design_alloc
 * only. */
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/balance.h"
#include "holdfast/design.h"
#include "holdfast/spread.h"

struct hf_design {
    const hf_model *m;
    const hf_designdata *dd;
    hf_env_hull hull;
    hf_balance *bal;
    hf_spread *sp;
    hf_env_workspace *ws;
    hf_load load;    /* the environment's mean load handed to balance */
    size_t cond;     /* condition being solved */
    double *scratch; /* nlines: tension at the first combination pose, N */
    double *scr_u;   /* nlines: its utilisation, - */
    hf_design_result r;
};

void hf_design_free(hf_design *d)
{
    if (!d)
        return;
    hf_balance_free(d->bal);
    hf_spread_free(d->sp);
    hf_env_workspace_free(d->ws);
    hf_free(d->r.tension_mean);
    hf_free(d->r.tension);
    hf_free(d->r.utilisation);
    hf_free(d->r.governs);
    hf_free(d->r.line);
    hf_free(d->r.anchor);
    hf_free(d->scratch);
    hf_free(d->scr_u);
    hf_free(d);
}

hf_design *hf_design_alloc(const hf_model *m, hf_error *err)
{
    if (!m || !m->design || m->design->nenv == 0) {
        hf_error_set(err, HF_EINVAL,
                     "%s: the case has no environments (an `environments:` list and the "
                     "hull's design keys: docs/design.md)",
                     m && m->source_path ? m->source_path : "case");
        return NULL;
    }
    hf_design *d = hf_calloc(1, sizeof *d);
    if (!d) {
        hf_error_set(err, HF_ENOMEM, "out of memory for the design workspace");
        return NULL;
    }
    d->m = m;
    d->dd = m->design;
    hf_designdata_hull(d->dd, m->site.water_density, &d->hull);
    size_t n = m->nlines;
    d->r.nlines = n;
    d->bal = hf_balance_alloc(m, err);
    if (d->bal && !(d->sp = hf_spread_alloc(m, err)))
        goto fail;
    if (!d->bal || !(d->ws = hf_env_workspace_alloc(err)))
        goto fail;
    d->r.tension_mean = hf_calloc(n, sizeof(double));
    d->r.tension = hf_calloc(n, sizeof(double));
    d->r.utilisation = hf_calloc(n, sizeof(double));
    d->r.governs = hf_calloc(n, 1);
    d->r.line = hf_calloc(n, sizeof *d->r.line);
    d->r.anchor = hf_calloc(n, sizeof *d->r.anchor);
    d->scratch = hf_calloc(n, sizeof(double));
    d->scr_u = hf_calloc(n, sizeof(double));
    if (!d->r.tension_mean || !d->r.tension || !d->r.utilisation || !d->r.governs || !d->r.line ||
        !d->r.anchor || !d->scratch || !d->scr_u) {
        hf_error_set(err, HF_ENOMEM, "out of memory for the design workspace");
        goto fail;
    }
    return d;
fail:
    hf_design_free(d);
    return NULL;
}

size_t hf_design_nenv(const hf_design *d)
{
    return d->dd->nenv;
}

size_t hf_design_ncond(const hf_design *d)
{
    return 1 + d->m->nlines;
}

const hf_design_result *hf_design_result_get(const hf_design *d)
{
    return &d->r;
}

const char *hf_design_status_name(const hf_design_result *r, char *buf, size_t cap)
{
    snprintf(buf, cap, "%s", r->status == HF_OK ? "ok" : hf_status_str(r->status));
    for (char *p = buf; *p; p++)
        if (*p == ' ')
            *p = '_';
    return buf;
}

hf_status hf_design_coverage(hf_design *d, size_t env, double outside[2], hf_error *err)
{
    if (env >= d->dd->nenv)
        return hf_error_set(err, HF_EINVAL, "environment index %zu out of range", env);
    return hf_env_check(&d->hull, &d->dd->env[env].env, d->m->hull.heading, d->ws, outside, err);
}

/* The condition's equilibrium under a global mean load, for hf_env_mean_pose. */
static hf_status balance_eq(const double load[3], double offset[3], void *ctx, hf_error *err)
{
    hf_design *d = ctx;
    hf_load *l = &d->load;
    memset(l, 0, sizeof *l);
    l->name = (char *)(d->dd->env[d->r.env].name);
    l->force = hypot(load[0], load[1]);
    l->direction = l->force > 0.0 ? atan2(load[1], load[0]) : 0.0;
    l->moment = load[2];
    hf_status st = hf_balance_solve(d->bal, l, d->cond, err);
    if (st == HF_OK)
        memcpy(offset, hf_balance_result_at(d->bal, d->cond)->offset, 3 * sizeof *offset);
    return st;
}

/* Records a failure of the condition and returns its status. */
static hf_status failed(hf_design *d, hf_status st, const hf_error *sub, hf_error *err)
{
    const hf_model *m = d->m;
    d->r.status = st;
    d->r.passed = 0;
    snprintf(d->r.message, sizeof d->r.message, "%.500s", sub->text);
    if (d->r.broken == HF_DESIGN_INTACT)
        return hf_error_set(err, st, "environment %s, intact: %s", d->dd->env[d->r.env].name,
                            sub->text);
    return hf_error_set(err, st, "environment %s, line %s broken: %s", d->dd->env[d->r.env].name,
                        m->lines[d->r.broken].name, sub->text);
}

/* Pose from rest plus an offset (m, m, rad). */
static void pose_at(const hf_model *m, const double off[3], hf_pose *p)
{
    hf_spread_pose_rest(m, p);
    hf_spread_pose_offset(p, off);
}

/* Tensions at one combination pose into t[] / u[] (N, -), k = 0 or 1. */
static hf_status combo_tensions(hf_design *d, const double off[3], int k, double *t, double *u,
                                hf_error *err)
{
    hf_pose p;
    hf_spread_result sr;
    pose_at(d->m, off, &p);
    hf_status st = hf_spread_solve(d->sp, &p, &sr, err);
    if (st != HF_OK)
        return st;
    for (size_t i = 0; i < d->r.nlines; i++) {
        t[i] = sr.broken[i] ? 0.0 : sr.line_tension[i];
        u[i] = sr.broken[i] ? 0.0 : sr.states[i].max_utilisation;
    }
    d->r.max_tension_combo[k] = sr.max_tension;
    return HF_OK;
}

/* Line and anchor checks of line i from the spread result at the pose that
 * governs it. */
static hf_status check_line(hf_design *d, const hf_spread_result *sr, size_t i, double req,
                            hf_error *err)
{
    hf_design_result *r = &d->r;
    const hf_line_state *st = &sr->states[i];
    size_t ms = st->max_section < st->n ? st->max_section : 0;
    double t = st->section[ms].t_max, mbl = d->m->lines[i].line.sec[ms].mbl;
    hf_status s = hf_criteria_line_evaluate(t, mbl, req, &r->line[i], err);
    if (s == HF_OK)
        s = hf_criteria_anchor_evaluate(&d->m->lines[i].anchor_spec, st->anchor_h, st->anchor_v,
                                        HF_CRITERIA_GRAVITY_SLIDING, HF_CRITERIA_GRAVITY_UPLIFT,
                                        &r->anchor[i], err);
    return s;
}

/* Design tensions (larger of the two combination poses per line) and the
 * criteria.  Leaves the spread solved at the second pose. */
static hf_status design_tensions(hf_design *d, hf_error *err)
{
    hf_design_result *r = &d->r;
    const hf_env_design *g = &r->design;
    hf_status st = combo_tensions(d, g->pose_lf_max, 0, d->scratch, d->scr_u, err);
    if (st == HF_OK)
        st = combo_tensions(d, g->pose_wf_max, 1, r->tension, r->utilisation, err);
    if (st != HF_OK)
        return st;
    double req = hf_criteria_required(&d->m->criteria, r->broken != HF_DESIGN_INTACT);
    r->lines_passed = r->anchors_passed = 1;
    r->max_tension_line = r->max_utilisation_line = HF_DESIGN_INTACT;
    for (size_t i = 0; i < r->nlines; i++) /* the larger utilisation governs; ties: WF max */
        r->governs[i] = hf_spread_is_broken(d->sp, i) ? 0 : d->scr_u[i] > r->utilisation[i] ? 1 : 2;
    for (int pass = 0; pass < 2; pass++) { /* pass 0: lines governed by pose_lf_max */
        hf_pose p;
        hf_spread_result sr;
        pose_at(d->m, pass == 0 ? g->pose_lf_max : g->pose_wf_max, &p);
        if ((st = hf_spread_solve(d->sp, &p, &sr, err)) != HF_OK)
            return st;
        for (size_t i = 0; i < r->nlines; i++) {
            if (sr.broken[i] || r->governs[i] != pass + 1)
                continue;
            r->tension[i] = sr.line_tension[i];
            r->utilisation[i] = sr.states[i].max_utilisation;
            if ((st = check_line(d, &sr, i, req, err)) != HF_OK)
                return st;
            r->lines_passed &= r->line[i].passed;
            r->anchors_passed &= r->anchor[i].passed;
            if (r->tension[i] > r->max_tension)
                r->max_tension = r->tension[i], r->max_tension_line = i;
            if (r->utilisation[i] > r->max_utilisation)
                r->max_utilisation = r->utilisation[i], r->max_utilisation_line = i;
        }
    }
    return HF_OK;
}

/* Mean pose, tensions and stiffness there, motions and design offset. */
static hf_status mean_and_motions(hf_design *d, const hf_environment *e, hf_error *err)
{
    hf_design_result *r = &d->r;
    hf_status st = hf_env_mean_pose(&d->hull, e, d->m->hull.heading, balance_eq, d, NULL, d->ws,
                                    r->mean_offset, &r->mean, &r->pose_iterations, err);
    if (st != HF_OK)
        return st;
    r->yaw = d->m->hull.heading + r->mean_offset[2];
    hf_pose p;
    hf_spread_result sr;
    double K[6][6], k[3];
    pose_at(d->m, r->mean_offset, &p);
    if ((st = hf_spread_stiffness(d->sp, &p, K, &sr, err)) != HF_OK)
        return st;
    for (size_t i = 0; i < r->nlines; i++)
        r->tension_mean[i] = sr.broken[i] ? 0.0 : sr.line_tension[i];
    r->max_tension_mean = sr.max_tension;
    hf_env_stiffness_hull(K, r->yaw, k);
    if ((st = hf_env_check(&d->hull, e, r->yaw, d->ws, r->outside, err)) != HF_OK ||
        (st = hf_env_motion(&d->hull, e, r->yaw, k, d->ws, &r->motion, err)) != HF_OK)
        return st;
    double fallback = e->has_waves     ? e->waves.direction
                      : e->has_wind    ? e->wind.direction
                      : e->has_current ? e->current.direction
                                       : d->m->hull.heading;
    return hf_env_design_offset(r->mean_offset, r->mean_offset[2], r->yaw, &r->motion, fallback,
                                &r->design, err);
}

hf_status hf_design_solve(hf_design *d, size_t env, size_t cond, hf_error *err)
{
    hf_design_result *r = &d->r;
    hf_error sub;
    hf_error_clear(&sub);
    /* keep the arrays, clear the rest */
    hf_design_result keep = *r;
    memset(r, 0, sizeof *r);
    r->nlines = keep.nlines;
    r->tension_mean = keep.tension_mean, r->tension = keep.tension;
    r->utilisation = keep.utilisation, r->governs = keep.governs;
    r->line = keep.line, r->anchor = keep.anchor;
    for (size_t i = 0; i < r->nlines; i++) {
        r->tension_mean[i] = r->tension[i] = r->utilisation[i] = 0.0;
        r->governs[i] = 0;
        memset(&r->line[i], 0, sizeof r->line[i]);
        memset(&r->anchor[i], 0, sizeof r->anchor[i]);
        r->line[i].passed = r->anchor[i].passed = 1;
        r->anchor[i].kind = d->m->lines[i].anchor_spec.kind;
    }
    r->env = env < d->dd->nenv ? env : 0;
    r->broken = cond == 0 ? HF_DESIGN_INTACT : cond - 1;
    r->max_tension_line = r->max_utilisation_line = HF_DESIGN_INTACT;
    if (env >= d->dd->nenv || cond >= hf_design_ncond(d)) {
        r->broken = HF_DESIGN_INTACT;
        hf_error_set(&sub, HF_EINVAL, "environment %zu, condition %zu: out of range", env, cond);
        return failed(d, HF_EINVAL, &sub, err);
    }
    d->cond = cond;
    hf_spread_clear_broken(d->sp);
    if (cond > 0)
        hf_spread_set_broken(d->sp, cond - 1, 1);
    hf_status st = mean_and_motions(d, &d->dd->env[env].env, &sub);
    if (st == HF_OK)
        st = design_tensions(d, &sub);
    if (st != HF_OK)
        return failed(d, st, &sub, err);
    const hf_criteria *c = &d->m->criteria;
    r->offset_checked = c->max_offset > 0.0;
    r->offset_passed = !r->offset_checked || r->design.offset <= c->max_offset;
    r->overloaded = hf_criteria_overloaded(r->max_utilisation);
    r->passed = r->lines_passed && r->anchors_passed && r->offset_passed && !r->overloaded;
    r->status = HF_OK;
    return HF_OK;
}
