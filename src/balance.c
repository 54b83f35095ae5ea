/* balance.c - mean equilibrium in surge, sway and yaw by homotopy + Newton, intact and broken. */
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>
#include <gsl/gsl_linalg.h>
#include "holdfast/alloc.h"
#include "holdfast/balance.h"

/* Line-search halvings per Newton iteration. */
#define LS_MAX 10
/* Largest Newton step: a quarter of the search radius in translation and
 * 0.25 rad in yaw (the step is scaled down as a whole to respect both). */
#define STEP_FRAC 0.25
#define STEP_YAW 0.25
/* Singular values below this fraction of the largest are treated as zero
 * stiffness (truncated SVD step). */
#define SV_CUT 1e-10
/* When the load steps shrink to nothing while the stiffness is this close to
 * singular (smallest over largest singular value), the path has reached a
 * limit point: the spread's resistance peaks there and no equilibrium exists
 * for more load along it (a turning point of the load-displacement path). */
#define FOLD_SV 1e-3
/* Trial poses farther than this multiple of the search limits are refused. */
#define HARD_BOUND 2.0

struct hf_balance {
    const hf_model *m;
    hf_spread *sp;
    hf_balance_options opt;
    size_t n;     /* lines */
    size_t ncond; /* 1 + n */
    hf_pose rest;
    double lref;   /* yaw length scale, m: largest hull-frame fairlead radius (>= 1 m) */
    double radius; /* default search radius, m */
    hf_balance_result *res;
    /* per-line arrays of the results: one condition's worth (scratch, always)
     * and, after the first hf_balance_run, one per condition (full) */
    double *tension, *util;
    hf_line_criterion *lines;
    hf_anchor_criterion *anchors;
    double *full_tension, *full_util;
    hf_line_criterion *full_lines;
    hf_anchor_criterion *full_anchors;
    int full;     /* the full arrays exist */
    size_t last;  /* condition last solved into the scratch arrays, or HF_BALANCE_NONE */
    size_t bytes; /* bytes allocated by this workspace (spread workspace excluded) */
    /* the last successful intact solution: start of the broken conditions */
    const hf_load *intact_load;
    double intact_u[3];
    int have_intact;
};

/* State of one condition's solve. */
typedef struct {
    double fext[3];        /* load: Fx, Fy (N), Mz / lref (N) */
    double r0[3];          /* residual at the start point, N */
    double fscale;         /* force scale of the tolerance, N */
    double maxoff;         /* search radius, m */
    double maxyaw;         /* search limit on yaw, rad */
    int singular;          /* a step met zero stiffness against the residual */
    int capped;            /* a step was limited by the step size */
    double svratio;        /* smallest s_min / s_max of the stiffness met in the attempt */
    hf_status line_status; /* last failing line evaluation */
    char line_msg[HF_BALANCE_MESSAGE];
    int iterations;
} solve_ctx;

/* Copies text into buf (capacity cap >= 1), cut to fit. */
static void copy_text(char *buf, size_t cap, const char *text)
{
    size_t n = strlen(text);
    if (n >= cap)
        n = cap - 1;
    memcpy(buf, text, n);
    buf[n] = '\0';
}

void hf_balance_options_default(hf_balance_options *o)
{
    o->ftol = 1e-8;
    o->xtol = 1e-10;
    o->max_iter = 40;
    o->max_steps = 400;
    o->min_step = 1.0 / 65536.0;
    o->max_offset = 0.0;
    o->max_yaw = M_PI / 2;
}

const char *hf_balance_criterion_name(hf_balance_criterion c)
{
    switch (c) {
    case HF_CRIT_NONE:
        return "none";
    case HF_CRIT_EQUILIBRIUM:
        return "equilibrium";
    case HF_CRIT_LINE:
        return "line_factor";
    case HF_CRIT_OFFSET:
        return "offset";
    case HF_CRIT_ANCHOR:
        return "anchor";
    case HF_CRIT_OVERLOAD:
        return "overload";
    }
    return "unknown";
}

hf_status hf_drag_force(const hf_drag *d, double *q, double *fx, double *fy, hf_error *err)
{
    if (q)
        *q = 0.0;
    if (fx)
        *fx = 0.0;
    if (fy)
        *fy = 0.0;
    if (!d)
        return hf_error_set(err, HF_EINVAL, "no drag term given");
    if (!isfinite(d->density) || d->density < 0.0 || !isfinite(d->coefficient) ||
        d->coefficient < 0.0 || !isfinite(d->area) || d->area < 0.0 || !isfinite(d->speed) ||
        d->speed < 0.0 || !isfinite(d->direction))
        return hf_error_set(err, HF_EINVAL,
                            "expected finite density, coefficient, area and speed >= 0 and a "
                            "finite direction");
    /* the drag equation 1/2 rho C A V^2 (classical; e.g. White, Fluid Mechanics,
     * ch. 7 - from memory), toward its direction, fixed in the global frame */
    double f = 0.5 * d->density * d->coefficient * d->area * d->speed * d->speed;
    if (!isfinite(f))
        return hf_error_set(err, HF_EINVAL,
                            "the drag force 1/2 rho C A V^2 overflows (rho %.6g kg/m^3, C %.6g, "
                            "A %.6g m^2, V %.6g m/s)",
                            d->density, d->coefficient, d->area, d->speed);
    if (q)
        *q = f;
    if (fx)
        *fx = f * cos(d->direction);
    if (fy)
        *fy = f * sin(d->direction);
    return HF_OK;
}

hf_status hf_balance_load_force(const hf_load *load, double f[3], hf_error *err)
{
    f[0] = f[1] = f[2] = 0.0;
    if (!load)
        return hf_error_set(err, HF_EINVAL, "balance: no load case given");
    const char *name = load->name ? load->name : "?";
    if (!isfinite(load->force) || load->force < 0.0 || !isfinite(load->direction) ||
        !isfinite(load->moment))
        return hf_error_set(err, HF_EINVAL,
                            "loads[%s]: expected a finite force >= 0, direction and moment, got "
                            "force %.10g N, direction %.10g deg, moment %.10g N m",
                            name, load->force, load->direction * (180.0 / M_PI), load->moment);
    double fx = load->force * cos(load->direction);
    double fy = load->force * sin(load->direction);
    for (size_t k = 0; k < load->ndrag; k++) {
        double dx, dy;
        hf_error e;
        hf_error_clear(&e);
        if (hf_drag_force(&load->drag[k], NULL, &dx, &dy, &e) != HF_OK)
            return hf_error_set(err, HF_EINVAL, "loads[%s].drag[%zu]: %s", name, k, e.text);
        fx += dx;
        fy += dy;
    }
    if (!isfinite(fx) || !isfinite(fy))
        return hf_error_set(err, HF_EINVAL, "loads[%s]: the total force is not finite", name);
    f[0] = fx;
    f[1] = fy;
    f[2] = load->moment;
    return HF_OK;
}

static hf_status options_ok(const hf_balance_options *o, hf_error *err)
{
    if (!(isfinite(o->ftol) && o->ftol > 0.0 && o->ftol < 1e-2))
        return hf_error_set(err, HF_EINVAL, "balance options: ftol must be in (0, 0.01), got %g",
                            o->ftol);
    if (!(isfinite(o->xtol) && o->xtol > 0.0 && o->xtol < 1e-2))
        return hf_error_set(err, HF_EINVAL, "balance options: xtol must be in (0, 0.01), got %g",
                            o->xtol);
    if (o->max_iter < 1 || o->max_steps < 1)
        return hf_error_set(err, HF_EINVAL, "balance options: max_iter and max_steps must be >= 1");
    if (!(isfinite(o->min_step) && o->min_step > 0.0 && o->min_step <= 1.0))
        return hf_error_set(err, HF_EINVAL, "balance options: min_step must be in (0, 1], got %g",
                            o->min_step);
    if (!(isfinite(o->max_offset) && o->max_offset >= 0.0))
        return hf_error_set(err, HF_EINVAL,
                            "balance options: max_offset must be finite and >= 0, got %g",
                            o->max_offset);
    if (!(isfinite(o->max_yaw) && o->max_yaw > 0.0 && o->max_yaw <= M_PI))
        return hf_error_set(err, HF_EINVAL,
                            "balance options: max_yaw must be in (0, pi] rad, got %g", o->max_yaw);
    return HF_OK;
}

hf_status hf_balance_set_options(hf_balance *b, const hf_balance_options *opt, hf_error *err)
{
    hf_balance_options o;
    if (opt)
        o = *opt;
    else
        hf_balance_options_default(&o);
    hf_status s = options_ok(&o, err);
    if (s == HF_OK)
        b->opt = o;
    return s;
}

void hf_balance_free(hf_balance *b)
{
    if (!b)
        return;
    hf_spread_free(b->sp);
    hf_free(b->res);
    hf_free(b->tension);
    hf_free(b->util);
    hf_free(b->lines);
    hf_free(b->anchors);
    hf_free(b->full_tension);
    hf_free(b->full_util);
    hf_free(b->full_lines);
    hf_free(b->full_anchors);
    hf_free(b);
}

size_t hf_balance_footprint(const hf_balance *b)
{
    return b ? b->bytes : 0;
}

/* Points the per-line arrays of result r (condition c) at its storage: the
 * full arrays when they exist, else the scratch arrays (one condition). */
static void bind_arrays(hf_balance *b, hf_balance_result *r, size_t c)
{
    size_t off = b->full ? c * b->n : 0;
    r->tension = (b->full ? b->full_tension : b->tension) + off;
    r->utilisation = (b->full ? b->full_util : b->util) + off;
    r->line = (b->full ? b->full_lines : b->lines) + off;
    r->anchor = (b->full ? b->full_anchors : b->anchors) + off;
}

/* Allocates the per-condition arrays hf_balance_run keeps: (1 + n) x n
 * entries.  HF_OK (also when they exist already), HF_ELIMIT, HF_ENOMEM. */
static hf_status alloc_full(hf_balance *b, hf_error *err)
{
    if (b->full)
        return HF_OK;
    size_t cells = b->ncond * b->n;
    size_t per = 2 * sizeof(double) + sizeof(hf_line_criterion) + sizeof(hf_anchor_criterion);
    if (cells / b->ncond != b->n || cells > ((size_t)-1) / per)
        return hf_error_set(err, HF_ELIMIT,
                            "balance: too many lines (%zu) to keep every "
                            "condition's results",
                            b->n);
    b->full_tension = hf_calloc(cells, sizeof(double));
    b->full_util = hf_calloc(cells, sizeof(double));
    b->full_lines = hf_calloc(cells, sizeof(hf_line_criterion));
    b->full_anchors = hf_calloc(cells, sizeof(hf_anchor_criterion));
    if (!b->full_tension || !b->full_util || !b->full_lines || !b->full_anchors) {
        hf_free(b->full_tension);
        hf_free(b->full_util);
        hf_free(b->full_lines);
        hf_free(b->full_anchors);
        b->full_tension = b->full_util = NULL;
        b->full_lines = NULL;
        b->full_anchors = NULL;
        return hf_error_set(err, HF_ENOMEM,
                            "balance: out of memory keeping the results of %zu conditions x %zu "
                            "lines (%.3g MB); hf_balance_run_each needs memory linear in the "
                            "number of lines",
                            b->ncond, b->n, (double)cells * (double)per / 1e6);
    }
    b->full = 1;
    b->bytes += cells * per;
    for (size_t c = 0; c < b->ncond; c++)
        bind_arrays(b, &b->res[c], c);
    return HF_OK;
}

hf_balance *hf_balance_alloc(const hf_model *m, hf_error *err)
{
    if (!m || m->nlines == 0 || !m->lines) {
        hf_error_set(err, HF_EINVAL, "balance: the case has no lines");
        return NULL;
    }
    if (hf_criteria_check(&m->criteria, err) != HF_OK)
        return NULL;
    hf_balance *b = hf_calloc(1, sizeof *b);
    if (!b) {
        hf_error_set(err, HF_ENOMEM, "balance: out of memory");
        return NULL;
    }
    b->m = m;
    b->n = m->nlines;
    b->ncond = b->n + 1;
    b->last = HF_BALANCE_NONE;
    hf_balance_options_default(&b->opt);
    if (b->ncond < b->n || b->ncond > ((size_t)-1) / sizeof *b->res) {
        hf_balance_free(b);
        hf_error_set(err, HF_ELIMIT, "balance: too many lines");
        return NULL;
    }
    /* memory linear in the number of lines: the headers of every condition,
     * per-line arrays for one condition (see hf_balance_run_each) */
    b->res = hf_calloc(b->ncond, sizeof *b->res);
    b->tension = hf_calloc(b->n, sizeof *b->tension);
    b->util = hf_calloc(b->n, sizeof *b->util);
    b->lines = hf_calloc(b->n, sizeof *b->lines);
    b->anchors = hf_calloc(b->n, sizeof *b->anchors);
    if (!b->res || !b->tension || !b->util || !b->lines || !b->anchors) {
        hf_balance_free(b);
        hf_error_set(err, HF_ENOMEM, "balance: out of memory");
        return NULL;
    }
    b->bytes = sizeof *b + b->ncond * sizeof *b->res +
               b->n * (2 * sizeof(double) + sizeof *b->lines + sizeof *b->anchors);
    b->sp = hf_spread_alloc(m, err);
    if (!b->sp) {
        hf_balance_free(b);
        return NULL;
    }
    for (size_t c = 0; c < b->ncond; c++) {
        hf_balance_result *r = &b->res[c];
        r->nlines = b->n;
        r->broken = c == 0 ? HF_BALANCE_NONE : c - 1;
        bind_arrays(b, r, c);
        r->status = HF_CONTINUE;
        r->max_tension_line = r->max_utilisation_line = r->criterion_line = HF_BALANCE_NONE;
    }
    hf_balance_refresh(b);
    return b;
}

void hf_balance_refresh(hf_balance *b)
{
    const hf_model *m = b->m;
    hf_spread_pose_rest(m, &b->rest);
    /* length scales: fairlead radius for yaw, anchor radius for the search */
    b->lref = 1.0;
    b->radius = 0.0;
    for (size_t i = 0; i < b->n; i++) {
        const hf_model_line *l = &m->lines[i];
        double rf = hypot(l->fairlead[0], l->fairlead[1]);
        double ra = hypot(l->anchor[0] - m->hull.position[0], l->anchor[1] - m->hull.position[1]);
        if (isfinite(rf) && rf > b->lref)
            b->lref = rf;
        if (isfinite(ra) && ra > b->radius)
            b->radius = ra;
    }
    if (!(b->radius > 0.0))
        b->radius = b->lref;
}

void hf_balance_reset(hf_balance *b)
{
    if (!b)
        return;
    hf_spread_reset(b->sp);
    b->have_intact = 0;
    b->intact_load = NULL;
}

size_t hf_balance_ncond(const hf_balance *b)
{
    return b->ncond;
}

const hf_balance_result *hf_balance_result_at(const hf_balance *b, size_t cond)
{
    if (cond >= b->ncond || (!b->full && cond != b->last))
        return NULL;
    return &b->res[cond];
}

/* Pose for the solve variables u = (surge, sway, lref * yaw) relative to rest. */
static void pose_of(const hf_balance *b, const double u[3], hf_pose *p)
{
    *p = b->rest;
    p->surge += u[0];
    p->sway += u[1];
    p->yaw += u[2] / b->lref;
}

/* Mooring force + load (scaled moment) minus the homotopy share (1 - t) r0,
 * and the scaled stiffness Ks = -d(residual)/du.  Returns the spread's status. */
static hf_status eval(hf_balance *b, solve_ctx *cx, const double u[3], double t, double r[3],
                      double ks[3][3], double raw[3])
{
    hf_pose p;
    hf_spread_result sr;
    double k6[6][6];
    hf_error e;
    hf_error_clear(&e);
    pose_of(b, u, &p);
    hf_status s = hf_spread_stiffness(b->sp, &p, k6, &sr, &e);
    if (s != HF_OK) {
        cx->line_status = s;
        copy_text(cx->line_msg, sizeof cx->line_msg, e.text);
        return s;
    }
    const int idx[3] = {0, 1, 5};
    const double sc[3] = {1.0, 1.0, 1.0 / b->lref};
    double f[3] = {sr.force[0], sr.force[1], sr.force[5] / b->lref};
    for (int a = 0; a < 3; a++) {
        raw[a] = f[a] + cx->fext[a];
        r[a] = raw[a] - (1.0 - t) * cx->r0[a];
        for (int c = 0; c < 3; c++)
            ks[a][c] = k6[idx[a]][idx[c]] * sc[a] * sc[c];
    }
    for (int a = 0; a < 3; a++)
        if (!isfinite(r[a]))
            return HF_ENOCONV;
    return HF_OK;
}

static double norm3(const double v[3])
{
    return sqrt(v[0] * v[0] + v[1] * v[1] + v[2] * v[2]);
}

static int converged(const solve_ctx *cx, const hf_balance *b, const double r[3])
{
    double tol = b->opt.ftol * cx->fscale;
    return fabs(r[0]) <= tol && fabs(r[1]) <= tol && fabs(r[2]) <= tol;
}

static int near_converged(const solve_ctx *cx, const hf_balance *b, const double r[3])
{
    double tol = 100.0 * b->opt.ftol * cx->fscale;
    return fabs(r[0]) <= tol && fabs(r[1]) <= tol && fabs(r[2]) <= tol;
}

/* Truncated-SVD solution of ks du = r (GSL one-sided Jacobi/Golub-Reinsch on
 * stack views: no allocation).  Flags zero stiffness against r. */
static void newton_step(solve_ctx *cx, double ks[3][3], const double r[3], double du[3])
{
    double a[9], v[9], s[3], w[3];
    for (int i = 0; i < 3; i++)
        for (int j = 0; j < 3; j++)
            a[3 * i + j] = ks[i][j];
    gsl_matrix_view A = gsl_matrix_view_array(a, 3, 3);
    gsl_matrix_view V = gsl_matrix_view_array(v, 3, 3);
    gsl_vector_view S = gsl_vector_view_array(s, 3);
    gsl_vector_view W = gsl_vector_view_array(w, 3);
    du[0] = du[1] = du[2] = 0.0;
    if (gsl_linalg_SV_decomp(&A.matrix, &V.matrix, &S.vector, &W.vector) != GSL_SUCCESS ||
        !(s[0] > 0.0) || !isfinite(s[0])) {
        cx->singular = 1;
        return;
    }
    double rr = r[0] * r[0] + r[1] * r[1] + r[2] * r[2], lost = 0.0;
    if (s[2] / s[0] < cx->svratio)
        cx->svratio = s[2] / s[0];
    for (int k = 0; k < 3; k++) {
        /* component of r along the k-th left singular vector (column k of U, now in a) */
        double c = a[k] * r[0] + a[3 + k] * r[1] + a[6 + k] * r[2];
        if (s[k] <= SV_CUT * s[0]) {
            lost += c * c;
            continue;
        }
        for (int i = 0; i < 3; i++)
            du[i] += v[3 * i + k] * c / s[k];
    }
    if (lost > 1e-4 * rr)
        cx->singular = 1;
}

/* Newton iterations at homotopy parameter t from u (updated in place on
 * success).  HF_OK when converged, else HF_ENOCONV (u unchanged). */
static hf_status newton(hf_balance *b, solve_ctx *cx, double u[3], double t)
{
    double r[3], ks[3][3], raw[3], uu[3] = {u[0], u[1], u[2]};
    hf_status s = eval(b, cx, uu, t, r, ks, raw);
    if (s != HF_OK)
        return s;
    double hard_off = HARD_BOUND * cx->maxoff;
    double hard_yaw = fmin(HARD_BOUND * cx->maxyaw, M_PI);
    for (int it = 0; it < b->opt.max_iter; it++) {
        if (converged(cx, b, r)) {
            memcpy(u, uu, sizeof uu);
            return HF_OK;
        }
        cx->iterations++;
        double du[3];
        newton_step(cx, ks, r, du);
        double lim = 1.0;
        double dt = hypot(du[0], du[1]), dy = fabs(du[2]) / b->lref;
        if (dt > STEP_FRAC * cx->maxoff)
            lim = fmin(lim, STEP_FRAC * cx->maxoff / dt);
        if (dy > STEP_YAW)
            lim = fmin(lim, STEP_YAW / dy);
        if (lim < 1.0)
            cx->capped = 1;
        if (!(norm3(du) > 0.0))
            return HF_ENOCONV; /* no direction to move in */
        /* At the line solver's noise floor the Newton step shrinks to nothing
         * while the residual stops falling: accept a tiny step with a residual
         * within 100 ftol as converged. */
        if (norm3(du) <= b->opt.xtol * cx->maxoff && near_converged(cx, b, r)) {
            memcpy(u, uu, sizeof uu);
            return HF_OK;
        }
        double phi = norm3(r), alpha = lim;
        int ok = 0;
        for (int ls = 0; ls < LS_MAX; ls++, alpha *= 0.5) {
            double ut[3], rt[3], kt[3][3], rawt[3];
            for (int i = 0; i < 3; i++)
                ut[i] = uu[i] + alpha * du[i];
            if (hypot(ut[0], ut[1]) > hard_off || fabs(ut[2] / b->lref) > hard_yaw)
                continue;
            if (eval(b, cx, ut, t, rt, kt, rawt) != HF_OK)
                continue;
            /* sufficient decrease of |r| (Armijo, Newton direction) */
            if (norm3(rt) <= (1.0 - 1e-4 * alpha) * phi || converged(cx, b, rt)) {
                memcpy(uu, ut, sizeof ut);
                memcpy(r, rt, sizeof rt);
                memcpy(ks, kt, sizeof kt);
                ok = 1;
                break;
            }
        }
        if (!ok) {
            if (near_converged(cx, b, r)) { /* noise floor reached: no further decrease */
                memcpy(u, uu, sizeof uu);
                return HF_OK;
            }
            return HF_ENOCONV;
        }
    }
    if (converged(cx, b, r)) {
        memcpy(u, uu, sizeof uu);
        return HF_OK;
    }
    return HF_ENOCONV;
}

static void zero_result(hf_balance_result *r)
{
    size_t n = r->nlines;
    memset(r->tension, 0, n * sizeof *r->tension);
    memset(r->utilisation, 0, n * sizeof *r->utilisation);
    memset(r->line, 0, n * sizeof *r->line);
    memset(r->anchor, 0, n * sizeof *r->anchor);
    memset(r->load, 0, sizeof r->load);
    memset(r->offset, 0, sizeof r->offset);
    memset(r->residual, 0, sizeof r->residual);
    r->horizontal = 0.0;
    r->iterations = r->steps = 0;
    r->max_tension = r->max_utilisation = 0.0;
    r->max_tension_line = r->max_utilisation_line = r->criterion_line = HF_BALANCE_NONE;
    r->offset_checked = 0;
    r->offset_passed = r->lines_passed = r->anchors_passed = 0;
    r->overloaded = 0;
    r->overloaded_line = HF_BALANCE_NONE;
    r->passed = 0;
    r->criterion = HF_CRIT_NONE;
    r->message[0] = '\0';
}

static const char *cond_name(const hf_balance *b, size_t cond, char *buf, size_t cap)
{
    const char *name = cond > 0 ? b->m->lines[cond - 1].name : NULL;
    if (cond == 0)
        snprintf(buf, cap, "intact");
    else
        snprintf(buf, cap, "broken:%s", name ? name : "?");
    return buf;
}

#if defined(__GNUC__)
__attribute__((format(printf, 7, 8)))
#endif
static hf_status
fail(hf_balance *b, hf_balance_result *r, const hf_load *load, size_t cond, hf_status s,
     hf_error *err, const char *fmt, ...)
{
    char cn[HF_MODEL_MAX_NAME + 16];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(r->message, sizeof r->message, fmt, ap);
    va_end(ap);
    r->status = s;
    r->passed = 0;
    r->criterion = HF_CRIT_EQUILIBRIUM;
    hf_error_set(err, s, "load '%s', %s: %s", load->name ? load->name : "?",
                 cond_name(b, cond, cn, sizeof cn), r->message);
    return s;
}

/* Overloads, the verdict and the governing criterion of a solved condition:
 * an overloaded line (u >= 1, hf_criteria_overloaded: the trade's MBL) fails
 * the condition whatever the required factor, and governs; then the first
 * failed check in the order line factor, offset, anchor; else the line with
 * the smallest margin. */
static void govern(const hf_balance *b, hf_balance_result *r, double req, size_t worst_line,
                   size_t first_anchor_fail)
{
    r->overloaded = 0;
    r->overloaded_line = HF_BALANCE_NONE;
    for (size_t i = 0; i < b->n; i++)
        if (r->broken != i && hf_criteria_overloaded(r->utilisation[i])) {
            r->line[i].passed = 0;
            r->lines_passed = 0;
            if (r->overloaded++ == 0 || r->utilisation[i] > r->utilisation[r->overloaded_line])
                r->overloaded_line = i;
        }
    r->passed = r->lines_passed && r->offset_passed && r->anchors_passed;
    int any_anchor_checked = 0;
    for (size_t i = 0; i < b->n; i++)
        any_anchor_checked |= r->anchor[i].checked;
    if (r->overloaded) {
        r->criterion = HF_CRIT_OVERLOAD;
        r->criterion_line = r->overloaded_line;
    } else if (!r->lines_passed) {
        r->criterion = HF_CRIT_LINE;
        r->criterion_line = worst_line;
    } else if (!r->offset_passed) {
        r->criterion = HF_CRIT_OFFSET;
    } else if (!r->anchors_passed) {
        r->criterion = HF_CRIT_ANCHOR;
        r->criterion_line = first_anchor_fail;
    } else if (req > 0.0 && worst_line != HF_BALANCE_NONE) {
        r->criterion = HF_CRIT_LINE;
        r->criterion_line = worst_line;
    } else if (r->offset_checked) {
        r->criterion = HF_CRIT_OFFSET;
    } else if (any_anchor_checked) {
        r->criterion = HF_CRIT_ANCHOR;
    } else {
        r->criterion = HF_CRIT_NONE;
    }
}

/* Criteria at the solved pose (spread results from the last solve). */
static hf_status evaluate(hf_balance *b, hf_balance_result *r, const hf_spread_result *sr,
                          hf_error *err)
{
    const hf_model *m = b->m;
    int damaged = r->broken != HF_BALANCE_NONE;
    double req = hf_criteria_required(&m->criteria, damaged);
    r->lines_passed = r->anchors_passed = 1;
    double worst_factor_ratio = INFINITY;
    size_t worst_line = HF_BALANCE_NONE, first_anchor_fail = HF_BALANCE_NONE;
    for (size_t i = 0; i < b->n; i++) {
        r->anchor[i].kind = m->lines[i].anchor_spec.kind;
        if (sr->broken[i]) {
            r->line[i].passed = r->anchor[i].passed = 1;
            continue;
        }
        const hf_line_state *st = &sr->states[i];
        size_t ms = st->max_section < st->n ? st->max_section : 0;
        double t = st->section[ms].t_max, mbl = m->lines[i].line.sec[ms].mbl;
        r->tension[i] = sr->line_tension[i];
        r->utilisation[i] = st->max_utilisation;
        hf_status s = hf_criteria_line_evaluate(t, mbl, req, &r->line[i], err);
        double ah, av, rs, ru;
        hf_criteria_anchor_forces(&m->criteria, st, &ah, &av);
        hf_criteria_block_required(&m->criteria, &m->lines[i].anchor_spec, &rs, &ru);
        if (s == HF_OK)
            s = hf_criteria_anchor_evaluate(&m->lines[i].anchor_spec, ah, av, rs, ru, &r->anchor[i],
                                            err);
        if (s != HF_OK)
            return s;
        if (!r->line[i].passed)
            r->lines_passed = 0;
        if (!r->anchor[i].passed) {
            r->anchors_passed = 0;
            if (first_anchor_fail == HF_BALANCE_NONE)
                first_anchor_fail = i;
        }
        /* governing line: the smallest factor / required (largest utilisation if unchecked) */
        if (t > 0.0) {
            double ratio = r->line[i].checked ? mbl / (t * req) : mbl / t;
            if (ratio < worst_factor_ratio) {
                worst_factor_ratio = ratio;
                worst_line = i;
            }
        }
        if (r->tension[i] > r->max_tension) {
            r->max_tension = r->tension[i];
            r->max_tension_line = i;
        }
        if (r->utilisation[i] > r->max_utilisation) {
            r->max_utilisation = r->utilisation[i];
            r->max_utilisation_line = i;
        }
    }
    r->offset_checked = m->criteria.max_offset > 0.0;
    r->offset_passed = !r->offset_checked || r->horizontal <= m->criteria.max_offset;
    govern(b, r, req, worst_line, first_anchor_fail);
    return HF_OK;
}

/* Sets up the solve of one condition: the load (validated), the search
 * limits, the broken line.  Returns HF_OK or the load's status (recorded in r). */
static hf_status begin_condition(hf_balance *b, hf_balance_result *r, const hf_load *load,
                                 size_t cond, solve_ctx *cx, double f[3], hf_error *err)
{
    bind_arrays(b, r, cond);
    zero_result(r);
    r->status = HF_CONTINUE;
    memset(cx, 0, sizeof *cx);
    hf_status s = hf_balance_load_force(load, f, err);
    if (s != HF_OK) {
        r->status = s;
        copy_text(r->message, sizeof r->message, err ? err->text : "invalid load");
        r->criterion = HF_CRIT_EQUILIBRIUM;
        return s;
    }
    memcpy(r->load, f, 3 * sizeof *f);
    cx->fext[0] = f[0];
    cx->fext[1] = f[1];
    cx->fext[2] = f[2] / b->lref;
    cx->maxoff = b->opt.max_offset > 0.0 ? b->opt.max_offset : b->radius;
    cx->maxyaw = b->opt.max_yaw;
    hf_spread_clear_broken(b->sp);
    if (cond > 0)
        hf_spread_set_broken(b->sp, cond - 1, 1);
    return HF_OK;
}

/* Start point u (rest for the intact spread, the intact equilibrium of this
 * load for a broken line, rest again when that fails), its residual r0 and
 * the force scale of the tolerance.  HF_OK or the spread's status. */
static hf_status start_point(hf_balance *b, solve_ctx *cx, const hf_load *load, size_t cond,
                             const double f[3], double u[3])
{
    u[0] = u[1] = u[2] = 0.0;
    if (cond > 0 && b->have_intact && b->intact_load == load)
        memcpy(u, b->intact_u, 3 * sizeof *u);
    double rs[3], ks[3][3], raw[3];
    memset(cx->r0, 0, sizeof cx->r0);
    hf_status s = eval(b, cx, u, 1.0, rs, ks, raw);
    if (s != HF_OK && (u[0] != 0.0 || u[1] != 0.0 || u[2] != 0.0)) {
        u[0] = u[1] = u[2] = 0.0; /* the intact pose failed for this condition: try rest */
        s = eval(b, cx, u, 1.0, rs, ks, raw);
    }
    if (s != HF_OK)
        return s;
    memcpy(cx->r0, raw, sizeof raw);
    /* force scale: load, largest line tension at the start, 1 N */
    hf_pose p;
    hf_spread_result sr;
    pose_of(b, u, &p);
    double fs = fmax(1.0, fmax(hypot(f[0], f[1]), fabs(f[2]) / b->lref));
    if (hf_spread_solve(b->sp, &p, &sr, NULL) == HF_OK)
        for (size_t i = 0; i < b->n; i++)
            fs = fmax(fs, sr.line_tension[i]);
    cx->fscale = fs;
    return HF_OK;
}

/* Homotopy r(u) - (1 - t) r0 = 0 from t = 0 (u exact) to t = 1, with
 * adaptive load steps.  Returns HF_OK with *t the load fraction reached
 * (1 when solved), or HF_ENOEQUIL (already recorded) when the path leaves
 * the search region. */
static hf_status continuation(hf_balance *b, solve_ctx *cx, hf_balance_result *r,
                              const hf_load *load, size_t cond, double u[3], double *t,
                              hf_error *err)
{
    double dt = 1.0;
    int tries = 0;
    *t = 0.0;
    while (*t < 1.0) {
        if (++tries > b->opt.max_steps)
            break;
        double tn = fmin(1.0, *t + dt);
        double un[3] = {u[0], u[1], u[2]};
        cx->singular = cx->capped = 0;
        cx->svratio = 1.0;
        if (newton(b, cx, un, tn) != HF_OK) {
            dt *= 0.5;
            if (dt < b->opt.min_step)
                break;
            continue;
        }
        double horiz = hypot(un[0], un[1]), yaw = un[2] / b->lref;
        if (horiz > cx->maxoff)
            return fail(b, r, load, cond, HF_ENOEQUIL, err,
                        "no equilibrium within the search region: at %.3g %% of the load "
                        "the horizontal offset already reaches %.6g m, beyond the search "
                        "radius %.6g m (the spread cannot hold the load)",
                        100.0 * tn, horiz, cx->maxoff);
        if (fabs(yaw) > cx->maxyaw)
            return fail(b, r, load, cond, HF_ENOEQUIL, err,
                        "no equilibrium within the search region: at %.3g %% of the load "
                        "the yaw already reaches %.6g deg, beyond the limit %.6g deg (the "
                        "spread cannot hold the load)",
                        100.0 * tn, yaw * 180.0 / M_PI, cx->maxyaw * 180.0 / M_PI);
        memcpy(u, un, sizeof un);
        *t = tn;
        r->steps++;
        dt = fmin(2.0 * dt, 1.0);
    }
    return HF_OK;
}

/* Why the continuation stopped at load fraction t < 1 (recorded in r). */
static hf_status diagnose(hf_balance *b, const solve_ctx *cx, hf_balance_result *r,
                          const hf_load *load, size_t cond, double t, hf_error *err)
{
    double pct = 100.0 * t;
    if (cx->singular || cx->capped)
        return fail(b, r, load, cond, HF_ENOEQUIL, err,
                    "no equilibrium: the spread has no stiffness left against the load "
                    "(reached %.3g %% of it; resisting lines broken or slack)",
                    pct);
    if (cx->svratio < FOLD_SV)
        return fail(b, r, load, cond, HF_ENOEQUIL, err,
                    "no equilibrium reached: on the way from the start position the "
                    "spread's resistance peaks at %.3g %% of the load (a limit point: the "
                    "hull would run away from there)",
                    pct);
    if (cx->line_status != HF_OK && cx->line_status != HF_ENOCONV)
        return fail(b, r, load, cond, cx->line_status, err,
                    "the lines cannot be solved on the way to equilibrium: %s (reached %.3g %% "
                    "of the load)",
                    cx->line_msg, pct);
    return fail(b, r, load, cond, HF_ENOCONV, err,
                "the equilibrium search did not converge (reached %.3g %% of the load)", pct);
}

/* The solved condition: lines at the solution, offsets, residual, criteria. */
static hf_status finish_condition(hf_balance *b, hf_balance_result *r, const hf_load *load,
                                  size_t cond, const double u[3], const double f[3], hf_error *err)
{
    hf_pose p;
    hf_spread_result sr;
    hf_error e;
    hf_error_clear(&e);
    pose_of(b, u, &p);
    hf_status s = hf_spread_solve(b->sp, &p, &sr, &e);
    if (s != HF_OK)
        return fail(b, r, load, cond, s, err, "the lines cannot be solved at the solution: %s",
                    e.text);
    r->offset[0] = u[0];
    r->offset[1] = u[1];
    r->offset[2] = u[2] / b->lref;
    r->horizontal = hypot(u[0], u[1]);
    r->residual[0] = sr.force[0] + f[0];
    r->residual[1] = sr.force[1] + f[1];
    r->residual[2] = sr.force[5] + f[2];
    s = evaluate(b, r, &sr, &e);
    if (s != HF_OK)
        return fail(b, r, load, cond, s, err, "criteria: %s", e.text);
    r->status = HF_OK;
    if (cond == 0) {
        b->have_intact = 1;
        b->intact_load = load;
        memcpy(b->intact_u, u, 3 * sizeof *u);
    }
    return HF_OK;
}

hf_status hf_balance_solve(hf_balance *b, const hf_load *load, size_t cond, hf_error *err)
{
    if (cond >= b->ncond)
        return hf_error_set(err, HF_EINVAL, "balance: condition %zu out of range (0..%zu)", cond,
                            b->ncond - 1);
    hf_balance_result *r = &b->res[cond];
    b->last = cond;
    solve_ctx cx;
    double f[3], u[3], t;
    hf_status s = begin_condition(b, r, load, cond, &cx, f, err);
    if (s != HF_OK)
        return s;
    int alive = 0;
    for (size_t i = 0; i < b->n; i++)
        alive += !hf_spread_is_broken(b->sp, i);
    s = start_point(b, &cx, load, cond, f, u);
    if (s != HF_OK)
        return fail(b, r, load, cond, s, err, "the lines cannot be solved at the start pose: %s",
                    cx.line_msg);
    if (alive == 0 && !converged(&cx, b, cx.r0))
        return fail(b, r, load, cond, HF_ENOEQUIL, err,
                    "no equilibrium: no line is left to hold the load");
    s = continuation(b, &cx, r, load, cond, u, &t, err);
    if (s != HF_OK)
        return s;
    r->iterations = cx.iterations;
    if (t < 1.0)
        return diagnose(b, &cx, r, load, cond, t, err);
    return finish_condition(b, r, load, cond, u, f, err);
}

/* Records an invalid load in every condition's result (no stale results). */
static void refuse_load(hf_balance *b, hf_status s, const hf_error *err)
{
    for (size_t c = 0; c < b->ncond; c++) {
        bind_arrays(b, &b->res[c], c);
        zero_result(&b->res[c]);
        b->res[c].status = s;
        b->res[c].criterion = HF_CRIT_EQUILIBRIUM;
        copy_text(b->res[c].message, sizeof b->res[c].message, err ? err->text : "invalid load");
    }
}

hf_status hf_balance_run_each(hf_balance *b, const hf_load *load, hf_balance_visit visit, void *ctx,
                              hf_error *err)
{
    double f[3];
    hf_status s = hf_balance_load_force(load, f, err);
    b->have_intact = 0;
    if (s != HF_OK) {
        refuse_load(b, s, err);
        b->last = 0;
        if (visit)
            (void)visit(ctx, 0, &b->res[0]);
        return s;
    }
    hf_status first = HF_OK;
    hf_error e;
    for (size_t c = 0; c < b->ncond; c++) {
        hf_error_clear(&e);
        s = hf_balance_solve(b, load, c, &e);
        if (s != HF_OK && first == HF_OK) {
            first = s;
            if (err)
                *err = e;
        }
        if (visit && visit(ctx, c, &b->res[c]) != 0) {
            hf_spread_clear_broken(b->sp);
            return first != HF_OK ? first : HF_CONTINUE;
        }
    }
    hf_spread_clear_broken(b->sp);
    return first;
}

hf_status hf_balance_run(hf_balance *b, const hf_load *load, hf_error *err)
{
    hf_status s = alloc_full(b, err);
    if (s != HF_OK)
        return s;
    return hf_balance_run_each(b, load, NULL, NULL, err);
}
