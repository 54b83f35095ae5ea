/* test_balance.c - balance module: loads, mean equilibrium, broken lines, criteria, failures. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "support.h"
#include "holdfast/alloc.h"
#include "holdfast/balance.h"

#define DEG (M_PI / 180.0)
#define MAXL 6

/* A model built directly in C (no case loader). */
typedef struct {
    hf_model m;
    hf_model_line lines[MAXL];
    char names[MAXL][16];
} fixture;

/* 76 mm R3 studless chain (fictional test spread, numbers derived from
 * REFERENCE.md section 3): mass 0.0199 d^2 = 114.94 kg/m, wet weight
 * 114.94 x 9.80665 x 0.8694 = 979.97 N/m; EA = (5.40 - 0.0040 d) 1e10 x
 * 2 pi d^2 / 4 = 4.6236e8 N; MBL 0.0223 d^2 (44 - 0.08 d) = 4884.278 kN. */
#define CHAIN_W 979.97
#define CHAIN_EA 4.6236e8
#define CHAIN_MBL 4884278.016

static void chain(hf_line *l, double length)
{
    /* chain sliding friction 0.7 (from memory, REFERENCE section 3) */
    hf_test_line_one(l, length, CHAIN_W, CHAIN_EA, CHAIN_MBL, 0.7);
}

/* The "Skerrow pontoon" (fictional): depth 62.5 m, four chains from
 * fairleads at hull-frame (+-38.2, +-14.6, -8.5) m running 400 m outward
 * along the diagonals (45, 135, 225, 315 deg) to their anchors.  Symmetric
 * about the hull x and y axes.  Lines: L1 at 45, L2 135, L3 225, L4 315 deg. */
static void four_line(fixture *fx)
{
    memset(fx, 0, sizeof *fx);
    hf_model_init(&fx->m);
    fx->m.site.depth = 62.5;
    fx->m.nlines = 4;
    fx->m.lines = fx->lines;
    static const double sx[4] = {1, -1, -1, 1}, sy[4] = {1, 1, -1, -1};
    for (size_t i = 0; i < 4; i++) {
        hf_model_line *l = &fx->lines[i];
        snprintf(fx->names[i], sizeof fx->names[i], "L%zu", i + 1);
        l->name = fx->names[i];
        l->fairlead[0] = 38.2 * sx[i];
        l->fairlead[1] = 14.6 * sy[i];
        l->fairlead[2] = -8.5;
        l->anchor[0] = l->fairlead[0] + 400.0 * sx[i] * M_SQRT1_2;
        l->anchor[1] = l->fairlead[1] + 400.0 * sy[i] * M_SQRT1_2;
        l->anchor_spec.kind = HF_ANCHOR_DRAG;
        chain(&l->line, 430.0);
    }
}

/* Two lines along the x axis (L1 anchor at +x, L2 at -x). */
static void two_line(fixture *fx)
{
    memset(fx, 0, sizeof *fx);
    hf_model_init(&fx->m);
    fx->m.site.depth = 41.3;
    fx->m.nlines = 2;
    fx->m.lines = fx->lines;
    for (size_t i = 0; i < 2; i++) {
        hf_model_line *l = &fx->lines[i];
        double s = i == 0 ? 1.0 : -1.0;
        snprintf(fx->names[i], sizeof fx->names[i], "E%zu", i + 1);
        l->name = fx->names[i];
        l->fairlead[0] = 21.7 * s;
        l->fairlead[2] = -3.1;
        l->anchor[0] = (21.7 + 265.0) * s;
        l->anchor_spec.kind = HF_ANCHOR_DRAG;
        chain(&l->line, 290.0);
    }
}

static hf_load load_of(const char *name, double force, double dir_deg, double moment)
{
    hf_load l;
    memset(&l, 0, sizeof l);
    l.name = (char *)name;
    l.force = force;
    l.direction = dir_deg * DEG;
    l.moment = moment;
    return l;
}

/* Independent check of an equilibrium: solve the spread at the reported
 * pose with a fresh workspace and sum mooring force + load. */
static void check_residual(const hf_model *m, const hf_balance_result *r, size_t broken,
                           double tol_force)
{
    hf_error e;
    hf_spread *sp = hf_spread_alloc(m, &e);
    assert_non_null(sp);
    if (broken != HF_BALANCE_NONE)
        assert_int_equal(hf_spread_set_broken(sp, broken, 1), HF_OK);
    hf_pose p;
    hf_spread_pose_rest(m, &p);
    double off[3] = {r->offset[0], r->offset[1], r->offset[2]};
    hf_spread_pose_offset(&p, off);
    hf_spread_result sr;
    assert_int_equal(hf_spread_solve(sp, &p, &sr, &e), HF_OK);
    assert_float_equal(sr.force[0] + r->load[0], 0.0, tol_force);
    assert_float_equal(sr.force[1] + r->load[1], 0.0, tol_force);
    assert_float_equal(sr.force[5] + r->load[2], 0.0, tol_force * 40.0); /* N m, arm ~40 m */
    for (size_t i = 0; i < m->nlines; i++)
        assert_float_equal(sr.line_tension[i], r->tension[i], 1e-6 * CHAIN_MBL);
    hf_spread_free(sp);
}

static void test_load_force(void **state)
{
    (void)state;
    /* Drag 1/2 rho C A V^2 (the classical drag law; hand calculation):
     * wind: 0.5 x 1.225 x 1.05 x 312.0 x 25.7^2 = 132,912.3 N toward 200 deg
     * (0.5 x 1.225 = 0.6125; x 1.05 = 0.643125; x 312 = 200.655; x 660.49 =
     * 132,530.6 N).  current: 0.5 x 1025 x 0.83 x 96.4 x 1.35^2 = 74,653.6 N
     * toward 200 deg too (0.5 x 1025 = 512.5; x 0.83 = 425.375; x 96.4 =
     * 41,006.15; x 1.8225 = 74,733.7 N).  Direct 150 kN toward 200 deg. */
    hf_drag d[2] = {{1.225, 1.05, 312.0, 25.7, 200.0 * DEG},
                    {1025.0, 0.83, 96.4, 1.35, 200.0 * DEG}};
    hf_load l = load_of("storm", 150e3, 200.0, -2.375e6);
    l.ndrag = 2;
    l.drag = d;
    double f[3];
    hf_error e;
    assert_int_equal(hf_balance_load_force(&l, f, &e), HF_OK);
    double total = 150e3 + 132530.6 + 74733.7;
    assert_float_equal(hypot(f[0], f[1]), total, 0.2);
    assert_float_equal(atan2(f[1], f[0]) / DEG, 200.0 - 360.0, 1e-9);
    assert_float_equal(f[2], -2.375e6, 0.0);
    /* bad terms */
    d[1].speed = -1.0;
    assert_int_equal(hf_balance_load_force(&l, f, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "storm"));
    d[1].speed = NAN;
    assert_int_equal(hf_balance_load_force(&l, f, &e), HF_EINVAL);
    d[1].speed = 1.35;
    d[0].area = 1e300;
    d[0].speed = 1e200; /* 1e700: overflows */
    assert_int_equal(hf_balance_load_force(&l, f, &e), HF_EINVAL);
    l.ndrag = 0;
    l.force = -3.0;
    assert_int_equal(hf_balance_load_force(&l, f, &e), HF_EINVAL);
    l.force = INFINITY;
    assert_int_equal(hf_balance_load_force(&l, f, &e), HF_EINVAL);
    assert_int_equal(hf_balance_load_force(NULL, f, &e), HF_EINVAL);
}

static void test_drag_force(void **state)
{
    (void)state;
    /* The drag equation F = 1/2 rho C A V^2 (classical; hand calculation):
     * 0.5 x 1025 x 0.83 x 96.4 x 1.35^2 = 74,733.7 N (see test_load_force),
     * toward 137.5 deg: Fx = F cos 137.5, Fy = F sin 137.5. */
    hf_drag d = {1025.0, 0.83, 96.4, 1.35, 137.5 * DEG};
    double q = -1.0, fx = -1.0, fy = -1.0;
    hf_error e;
    hf_error_clear(&e);
    assert_int_equal(hf_drag_force(&d, &q, &fx, &fy, &e), HF_OK);
    assert_float_equal(q, 74733.7, 0.05);
    assert_float_equal(fx, 74733.7 * cos(137.5 * DEG), 0.05);
    assert_float_equal(fy, 74733.7 * sin(137.5 * DEG), 0.05);
    /* NULL outputs are allowed */
    assert_int_equal(hf_drag_force(&d, NULL, NULL, &fy, NULL), HF_OK);
    assert_float_equal(fy, 74733.7 * sin(137.5 * DEG), 0.05);
    /* every field validated; outputs zeroed on failure */
    const double bad[] = {-1.0, NAN, INFINITY};
    for (int field = 0; field < 5; field++) {
        for (size_t k = 0; k < sizeof bad / sizeof bad[0]; k++) {
            hf_drag b = d;
            double *v[5] = {&b.density, &b.coefficient, &b.area, &b.speed, &b.direction};
            if (field == 4 && bad[k] < 0.0)
                continue; /* a negative direction is a valid angle */
            *v[field] = bad[k];
            q = fx = fy = 5.0;
            hf_error_clear(&e);
            if (hf_drag_force(&b, &q, &fx, &fy, &e) != HF_EINVAL)
                fail_msg("field %d = %g accepted", field, bad[k]);
            assert_true(q == 0.0 && fx == 0.0 && fy == 0.0);
            assert_non_null(strstr(e.text, "expected finite"));
        }
    }
    /* overflow of the product is refused, not returned as inf */
    hf_drag big = {1025.0, 1.0, 1e300, 1e200, 0.0};
    assert_int_equal(hf_drag_force(&big, &q, &fx, &fy, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "overflows"));
    assert_int_equal(hf_drag_force(NULL, &q, &fx, &fy, &e), HF_EINVAL);
}

static void test_zero_load(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    assert_non_null(b);
    assert_int_equal(hf_balance_ncond(b), 5);
    hf_load l = load_of("calm", 0.0, 37.0, 0.0);
    assert_int_equal(hf_balance_solve(b, &l, 0, &e), HF_OK);
    const hf_balance_result *r = hf_balance_result_at(b, 0);
    /* symmetry: the rest pose is the equilibrium */
    assert_float_equal(r->offset[0], 0.0, 1e-6);
    assert_float_equal(r->offset[1], 0.0, 1e-6);
    assert_float_equal(r->offset[2], 0.0, 1e-9);
    /* four equal pretensions */
    for (size_t i = 1; i < 4; i++)
        assert_float_equal(r->tension[i], r->tension[0], 1e-6 * r->tension[0]);
    assert_true(r->tension[0] > 1e3);
    assert_int_equal(r->broken, HF_BALANCE_NONE);
    check_residual(&fx.m, r, HF_BALANCE_NONE, 1e-3);
    hf_balance_free(b);
}

static void test_load_along_x(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    fx.m.criteria.factor_intact = 2.0; /* API RP 2SK quasi-static (from memory) */
    fx.m.criteria.factor_damaged = 1.43;
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    assert_non_null(b);
    hf_load l = load_of("gale-east", 412.5e3, 0.0, 0.0);
    assert_int_equal(hf_balance_run(b, &l, &e), HF_OK);
    const hf_balance_result *r = hf_balance_result_at(b, 0);
    assert_int_equal(r->status, HF_OK);
    /* load toward +x: the hull moves +x; symmetry about x: no sway, no yaw */
    assert_true(r->offset[0] > 0.5);
    assert_float_equal(r->offset[1], 0.0, 1e-6);
    assert_float_equal(r->offset[2], 0.0, 1e-9);
    /* the -x lines (L2, L3) take the load; equal by symmetry */
    assert_float_equal(r->tension[1], r->tension[2], 1e-6 * r->tension[1]);
    assert_float_equal(r->tension[0], r->tension[3], 1e-6 * r->tension[0]);
    assert_true(r->tension[1] > r->tension[0]);
    /* force balance to 1e-6 of the load (independent re-solve) */
    assert_float_equal(r->residual[0], 0.0, 1e-6 * 412.5e3);
    check_residual(&fx.m, r, HF_BALANCE_NONE, 1e-6 * 412.5e3);
    /* criteria: line factor by hand from the reported tension, MBL/T >= 2 */
    assert_true(r->max_tension_line == 1 || r->max_tension_line == 2);
    double factor = CHAIN_MBL / r->line[1].tension;
    assert_float_equal(r->line[1].factor, factor, 1e-9 * factor);
    assert_int_equal(r->line[1].passed, factor >= 2.0);
    assert_float_equal(r->line[1].required, 2.0, 0.0);
    assert_int_equal(r->criterion, HF_CRIT_LINE);
    /* single-section line: utilisation is tension / MBL */
    assert_float_equal(r->max_utilisation, r->line[1].tension / CHAIN_MBL, 1e-12);
    hf_balance_free(b);
}

static void test_broken_conditions(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    fx.m.criteria.factor_intact = 2.0;
    fx.m.criteria.factor_damaged = 1.43;
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    assert_non_null(b);
    hf_load l = load_of("gale-east", 412.5e3, 0.0, 0.0);
    assert_int_equal(hf_balance_run(b, &l, &e), HF_OK);
    const hf_balance_result *in = hf_balance_result_at(b, 0);
    assert_null(hf_balance_result_at(b, 5));
    for (size_t c = 1; c <= 4; c++) {
        const hf_balance_result *r = hf_balance_result_at(b, c);
        assert_int_equal(r->status, HF_OK);
        assert_int_equal(r->broken, c - 1);              /* condition c = line c-1 broken */
        assert_float_equal(r->tension[c - 1], 0.0, 0.0); /* the broken line carries nothing */
        assert_int_equal(r->line[c - 1].checked, 0);
        assert_float_equal(r->line[(c % 4)].required, 1.43, 0.0); /* damaged factor */
        check_residual(&fx.m, r, c - 1, 1e-6 * 412.5e3);
    }
    /* breaking a line that holds against the load (L2 at 135 or L3 at 225
     * deg) is worse than intact in the loaded direction: more surge and a
     * higher worst tension; the two are mirror images (sway and yaw flip). */
    const hf_balance_result *b2 = hf_balance_result_at(b, 2), *b3 = hf_balance_result_at(b, 3);
    assert_true(b2->offset[0] > in->offset[0] + 0.1);
    assert_true(b2->max_tension > in->max_tension * 1.05);
    assert_float_equal(b2->offset[0], b3->offset[0], 1e-6);
    assert_float_equal(b2->offset[1], -b3->offset[1], 1e-6);
    assert_float_equal(b2->offset[2], -b3->offset[2], 1e-9);
    assert_float_equal(b2->max_tension, b3->max_tension, 1e-6 * b2->max_tension);
    /* the broken line is on the -x, +y side: the hull drifts away from it */
    assert_true(b2->offset[1] < -1e-3);
    /* breaking a line on the load side (L1 or L4) lowers the surge */
    assert_true(hf_balance_result_at(b, 1)->offset[0] < in->offset[0]);
    hf_balance_free(b);
}

static void test_symmetry_sway_and_yaw(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    assert_non_null(b);
    /* load toward +y: no surge, no yaw (symmetry about the y axis) */
    hf_load l = load_of("beam", 263.8e3, 90.0, 0.0);
    assert_int_equal(hf_balance_solve(b, &l, 0, &e), HF_OK);
    const hf_balance_result *r = hf_balance_result_at(b, 0);
    assert_true(r->offset[1] > 0.5);
    assert_float_equal(r->offset[0], 0.0, 1e-6);
    assert_float_equal(r->offset[2], 0.0, 1e-9);
    /* a pure yaw moment: yaw only, no translation; sign follows the moment */
    hf_load t = load_of("twist", 0.0, 0.0, 4.73e6);
    assert_int_equal(hf_balance_solve(b, &t, 0, &e), HF_OK);
    r = hf_balance_result_at(b, 0);
    assert_true(r->offset[2] > 1e-4);
    assert_float_equal(r->offset[0], 0.0, 1e-5);
    assert_float_equal(r->offset[1], 0.0, 1e-5);
    check_residual(&fx.m, r, HF_BALANCE_NONE, 1e-3);
    hf_balance_free(b);
}

static void test_rotation_invariance(void **state)
{
    (void)state;
    /* Turning the whole problem (anchors, hull heading, load direction) by
     * 37.5 deg about a shifted hull position turns the offset by the same
     * angle and leaves yaw and tensions unchanged (isotropy of statics). */
    fixture fx, rx;
    four_line(&fx);
    four_line(&rx);
    double th = 37.5 * DEG, c = cos(th), s = sin(th), px = 12.25, py = -7.5;
    rx.m.hull.position[0] = px;
    rx.m.hull.position[1] = py;
    rx.m.hull.heading = th;
    for (size_t i = 0; i < 4; i++) {
        double ax = fx.lines[i].anchor[0], ay = fx.lines[i].anchor[1];
        rx.lines[i].anchor[0] = px + c * ax - s * ay;
        rx.lines[i].anchor[1] = py + s * ax + c * ay;
    }
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e), *br = hf_balance_alloc(&rx.m, &e);
    hf_load l = load_of("gust", 296.1e3, 18.0, 1.35e6), lr = load_of("gust", 296.1e3, 55.5, 1.35e6);
    assert_int_equal(hf_balance_run(b, &l, &e), HF_OK);
    assert_int_equal(hf_balance_run(br, &lr, &e), HF_OK);
    for (size_t k = 0; k < 5; k++) {
        const hf_balance_result *r = hf_balance_result_at(b, k), *q = hf_balance_result_at(br, k);
        /* tolerance: residual up to 100 ftol F = 0.3 N over a stiffness of
         * ~1e4 N/m gives ~3e-5 m (the documented convergence test) */
        assert_float_equal(q->offset[0], c * r->offset[0] - s * r->offset[1], 1e-4);
        assert_float_equal(q->offset[1], s * r->offset[0] + c * r->offset[1], 1e-4);
        assert_float_equal(q->offset[2], r->offset[2], 1e-6);
        for (size_t i = 0; i < 4; i++)
            assert_float_equal(q->tension[i], r->tension[i], 1e-6 * CHAIN_MBL);
    }
    hf_balance_free(b);
    hf_balance_free(br);
}

static void test_small_load_linear(void **state)
{
    (void)state;
    /* For a small load the offset approaches K^-1 F with K the spread's
     * analytic stiffness at rest (first-order Taylor expansion). */
    fixture fx;
    four_line(&fx);
    hf_error e;
    hf_spread *sp = hf_spread_alloc(&fx.m, &e);
    hf_pose p;
    hf_spread_pose_rest(&fx.m, &p);
    double k[6][6];
    hf_spread_result sr;
    assert_int_equal(hf_spread_stiffness(sp, &p, k, &sr, &e), HF_OK);
    hf_spread_free(sp);
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    double f = 2.385e3; /* N, small */
    hf_load l = load_of("nudge", f, 0.0, 0.0);
    assert_int_equal(hf_balance_solve(b, &l, 0, &e), HF_OK);
    const hf_balance_result *r = hf_balance_result_at(b, 0);
    /* by symmetry K11 alone governs surge */
    assert_float_equal(r->offset[0], f / k[0][0], 2e-3 * f / k[0][0]);
    hf_balance_free(b);
}

static void test_no_equilibrium_overload(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    /* 2 GN: two chains of EA 4.6e8 N would have to stretch ~2x: the hull
     * would leave the anchor circle long before (no equilibrium in range) */
    hf_load l = load_of("absurd", 2e9, 0.0, 0.0);
    assert_int_equal(hf_balance_solve(b, &l, 0, &e), HF_ENOEQUIL);
    const hf_balance_result *r = hf_balance_result_at(b, 0);
    assert_int_equal(r->status, HF_ENOEQUIL);
    assert_int_equal(r->passed, 0);
    assert_int_equal(r->criterion, HF_CRIT_EQUILIBRIUM);
    assert_non_null(strstr(r->message, "no equilibrium"));
    assert_non_null(strstr(e.text, "absurd"));
    assert_non_null(strstr(e.text, "intact"));
    /* never garbage: the numbers are zero, finite */
    assert_float_equal(r->offset[0], 0.0, 0.0);
    assert_float_equal(r->max_tension, 0.0, 0.0);
    hf_balance_free(b);
}

static void test_no_equilibrium_broken(void **state)
{
    (void)state;
    /* Two lines on the x axis, load toward +x.  Intact: E2 (anchor at -x)
     * holds it.  With E2 broken only E1, whose anchor lies at +x, is left: it
     * pulls the hull the same way as the load, so nothing resists within the
     * anchor circle. */
    fixture fx;
    two_line(&fx);
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    hf_load l = load_of("push", 87.4e3, 0.0, 0.0);
    hf_status s = hf_balance_run(b, &l, &e);
    assert_int_equal(s, HF_ENOEQUIL);
    assert_int_equal(hf_balance_result_at(b, 0)->status, HF_OK);
    assert_int_equal(hf_balance_result_at(b, 1)->status, HF_OK); /* E1 broken: E2 holds */
    const hf_balance_result *r = hf_balance_result_at(b, 2);
    assert_int_equal(r->status, HF_ENOEQUIL);
    assert_non_null(strstr(e.text, "broken:E2"));
    assert_int_equal(r->passed, 0);
    /* intact: no sway, no yaw (symmetry), load balanced */
    const hf_balance_result *in = hf_balance_result_at(b, 0);
    assert_float_equal(in->offset[1], 0.0, 1e-6);
    check_residual(&fx.m, in, HF_BALANCE_NONE, 1e-6 * 87.4e3);
    hf_balance_free(b);
    /* a one-line spread with its line broken has nothing left */
    fx.m.nlines = 1;
    b = hf_balance_alloc(&fx.m, &e);
    assert_int_equal(hf_balance_ncond(b), 2);
    assert_int_equal(hf_balance_run(b, &l, &e), HF_ENOEQUIL);
    assert_int_equal(hf_balance_result_at(b, 1)->status, HF_ENOEQUIL);
    assert_non_null(strstr(hf_balance_result_at(b, 1)->message, "no line is left"));
    hf_balance_free(b);
}

static void test_no_equilibrium_limit_point(void **state)
{
    (void)state;
    /* A yaw moment on the two-line spread.  Intact, the two pretensioned
     * collinear lines resist yaw.  With one line broken a single line is
     * left: with no external force its tension must vanish at equilibrium,
     * and a slack line gives no moment (statics), so no equilibrium holds the
     * moment.  The load path ends at a limit point: HF_ENOEQUIL, not a
     * numerical failure. */
    fixture fx;
    two_line(&fx);
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    hf_load l = load_of("twist", 0.0, 0.0, 5e6);
    assert_int_equal(hf_balance_run(b, &l, &e), HF_ENOEQUIL);
    const hf_balance_result *in = hf_balance_result_at(b, 0);
    assert_int_equal(in->status, HF_OK);
    assert_true(in->offset[2] > 0.0); /* turns with the moment */
    assert_float_equal(in->offset[0], 0.0, 1e-6);
    for (size_t c = 1; c <= 2; c++) {
        const hf_balance_result *r = hf_balance_result_at(b, c);
        assert_int_equal(r->status, HF_ENOEQUIL);
        assert_non_null(strstr(r->message, "no equilibrium"));
    }
    hf_balance_free(b);
}

static void test_offset_and_anchor_criteria(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    /* L2 and L3 (the lines holding a +x load) on gravity blocks of 95.3 kN,
     * friction 0.45 (sand, NAVFAC DM-7.02, from memory). */
    for (size_t i = 1; i <= 2; i++) {
        fx.lines[i].anchor_spec.kind = HF_ANCHOR_GRAVITY;
        fx.lines[i].anchor_spec.weight = 95.3e3;
        fx.lines[i].anchor_spec.friction = 0.45;
    }
    fx.m.criteria.max_offset = 0.25; /* m: tight on purpose */
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    hf_load l = load_of("gale-east", 412.5e3, 0.0, 0.0);
    assert_int_equal(hf_balance_solve(b, &l, 0, &e), HF_OK);
    const hf_balance_result *r = hf_balance_result_at(b, 0);
    assert_int_equal(r->offset_checked, 1);
    assert_int_equal(r->offset_passed, r->horizontal <= 0.25);
    assert_false(r->offset_passed);
    assert_false(r->passed);
    /* the gravity block factors, recomputed by hand from the anchor forces:
     * sliding mu (W - V) / H, uplift W / V */
    const hf_anchor_criterion *a = &r->anchor[1];
    assert_int_equal(a->kind, HF_ANCHOR_GRAVITY);
    assert_true(a->h > 0.0);
    /* both branches checked: no assertion behind a condition that may never hold */
    if (a->v < 95.3e3)
        assert_float_equal(a->sliding_factor, 0.45 * (95.3e3 - a->v) / a->h, 1e-12);
    else
        assert_true(a->sliding_factor == 0.0); /* lifted block: no sliding resistance */
    assert_true(a->has_sliding);
    /* the drag anchors on the slack side see no uplift */
    assert_int_equal(r->anchor[0].kind, HF_ANCHOR_DRAG);
    /* a block this light slides under ~200 kN of line load */
    assert_false(a->passed);
    assert_false(r->anchors_passed);
    hf_balance_free(b);
}

static void test_zero_yaw_stiffness(void **state)
{
    (void)state;
    /* Three lines meeting at one fairlead on the yaw axis (a turret-like
     * point mooring): the lines give no yaw stiffness at all.  A force still
     * finds its equilibrium (the yaw direction is singular but unloaded); a
     * yaw moment has nothing to resist it: no equilibrium. */
    fixture fx;
    four_line(&fx);
    fx.m.nlines = 3;
    for (size_t i = 0; i < 3; i++) {
        double a = (30.0 + 120.0 * (double)i) * DEG;
        fx.lines[i].fairlead[0] = fx.lines[i].fairlead[1] = 0.0;
        fx.lines[i].anchor[0] = 410.0 * cos(a);
        fx.lines[i].anchor[1] = 410.0 * sin(a);
    }
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    assert_non_null(b);
    hf_load l = load_of("push", 187.3e3, 30.0, 0.0);
    assert_int_equal(hf_balance_solve(b, &l, 0, &e), HF_OK);
    const hf_balance_result *r = hf_balance_result_at(b, 0);
    assert_float_equal(r->offset[2], 0.0, 1e-12);
    /* the spread is symmetric about the 30 deg axis: the hull moves along it */
    assert_true(r->offset[0] > 0.0 && r->offset[1] > 0.0);
    assert_float_equal(atan2(r->offset[1], r->offset[0]) / DEG, 30.0, 1e-6);
    check_residual(&fx.m, r, HF_BALANCE_NONE, 1e-6 * 187.3e3);
    hf_load t = load_of("twist", 0.0, 0.0, 3.1e5);
    assert_int_equal(hf_balance_solve(b, &t, 0, &e), HF_ENOEQUIL);
    assert_non_null(strstr(e.text, "no equilibrium"));
    hf_balance_free(b);
}

static void test_reset_and_order(void **state)
{
    (void)state;
    /* The equilibrium does not depend on what was solved before: a run after
     * another load, or after hf_balance_reset, gives the same answer to
     * within 1e-5 m and 1e-5 rad: both runs follow the same load path from
     * the same start, only the line solver's warm starts differ. */
    fixture fx;
    four_line(&fx);
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    hf_load a = load_of("quarter", 318.4e3, 211.0, -2.2e6), q = load_of("beam", 263.8e3, 97.5, 0.0);
    assert_int_equal(hf_balance_run(b, &q, &e), HF_OK);
    double ref[5][3];
    for (size_t c = 0; c < 5; c++)
        memcpy(ref[c], hf_balance_result_at(b, c)->offset, sizeof ref[c]);
    assert_int_equal(hf_balance_run(b, &a, &e), HF_OK);
    assert_int_equal(hf_balance_run(b, &q, &e), HF_OK);
    for (size_t c = 0; c < 5; c++)
        for (int k = 0; k < 3; k++)
            assert_float_equal(hf_balance_result_at(b, c)->offset[k], ref[c][k], 1e-5);
    hf_balance_reset(b);
    hf_balance_reset(NULL);
    /* a broken condition alone after a reset starts from rest, same answer */
    assert_int_equal(hf_balance_solve(b, &q, 3, &e), HF_OK);
    for (int k = 0; k < 3; k++)
        assert_float_equal(hf_balance_result_at(b, 3)->offset[k], ref[3][k], 1e-5);
    hf_balance_free(b);
}

static void test_bad_input(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    hf_error e;
    fx.m.criteria.factor_intact = 0.5;
    assert_null(hf_balance_alloc(&fx.m, &e));
    assert_int_equal(e.status, HF_EINVAL);
    fx.m.criteria.factor_intact = 2.0;
    hf_model empty;
    hf_model_init(&empty);
    assert_null(hf_balance_alloc(&empty, &e));
    assert_null(hf_balance_alloc(NULL, NULL));
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    hf_load l = load_of("bad", NAN, 0.0, 0.0);
    assert_int_equal(hf_balance_run(b, &l, &e), HF_EINVAL);
    assert_int_equal(hf_balance_solve(b, &l, 0, &e), HF_EINVAL);
    l.force = 1e3;
    assert_int_equal(hf_balance_solve(b, &l, 9, &e), HF_EINVAL);
    hf_balance_options o;
    hf_balance_options_default(&o);
    o.ftol = 0.0;
    assert_int_equal(hf_balance_set_options(b, &o, &e), HF_EINVAL);
    hf_balance_options_default(&o);
    o.max_yaw = 4.0;
    assert_int_equal(hf_balance_set_options(b, &o, &e), HF_EINVAL);
    assert_int_equal(hf_balance_set_options(b, NULL, &e), HF_OK);
    assert_string_equal(hf_balance_criterion_name(HF_CRIT_LINE), "line_factor");
    assert_string_equal(hf_balance_criterion_name(HF_CRIT_EQUILIBRIUM), "equilibrium");
    hf_balance_free(b);
    hf_balance_free(NULL);
}

static void test_alloc_failures(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    hf_error e;
    /* every allocation of the constructor may fail: NULL with HF_ENOMEM */
    int failures = 0;
    for (long n = 1; n < 40; n++) {
        hf_alloc_fail_at(n, 1);
        hf_balance *b = hf_balance_alloc(&fx.m, &e);
        hf_alloc_fail_at(0, 0);
        if (b) {
            hf_balance_free(b);
            break;
        }
        assert_int_equal(e.status, HF_ENOMEM);
        failures++;
    }
    assert_true(failures >= 6);
    /* solving condition by condition allocates nothing */
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    hf_load l = load_of("gale-east", 412.5e3, 33.0, 1.2e6);
    hf_alloc_fail_at(1, 1);
    hf_status s = hf_balance_run_each(b, &l, NULL, NULL, &e);
    long count = hf_alloc_count();
    hf_alloc_fail_at(0, 0);
    assert_int_equal(s, HF_OK);
    assert_int_equal(count, 0);
    /* the first keep-everything run allocates its arrays: a failure is HF_ENOMEM, with
     * its own message, never a numerical status */
    hf_alloc_fail_at(1, 1);
    s = hf_balance_run(b, &l, &e);
    hf_alloc_fail_at(0, 0);
    assert_int_equal(s, HF_ENOMEM);
    assert_non_null(strstr(e.text, "out of memory"));
    assert_int_equal(hf_balance_run(b, &l, &e), HF_OK);
    /* later runs allocate nothing */
    hf_alloc_fail_at(1, 1);
    s = hf_balance_run(b, &l, &e);
    count = hf_alloc_count();
    hf_alloc_fail_at(0, 0);
    assert_int_equal(s, HF_OK);
    assert_int_equal(count, 0);
    hf_balance_free(b);
}

/* n lines on a circle (fictional "Tarrow ring" spread), 76 mm chain. */
static hf_model_line *ring(hf_model *m, size_t n, char (*names)[16])
{
    hf_model_line *lines = calloc(n, sizeof *lines);
    assert_non_null(lines);
    hf_model_init(m);
    m->site.depth = 62.5;
    m->nlines = n;
    m->lines = lines;
    for (size_t i = 0; i < n; i++) {
        double a = 2.0 * M_PI * ((double)i + 0.37) / (double)n;
        snprintf(names[i], 16, "R%zu", i + 1);
        lines[i].name = names[i];
        lines[i].fairlead[0] = 31.4 * cos(a);
        lines[i].fairlead[1] = 31.4 * sin(a);
        lines[i].fairlead[2] = -8.5;
        lines[i].anchor[0] = 431.4 * cos(a);
        lines[i].anchor[1] = 431.4 * sin(a);
        lines[i].anchor_spec.kind = HF_ANCHOR_DRAG;
        chain(&lines[i].line, 430.0);
    }
    return lines;
}

/* Issue 12 item 13: the workspace's memory grows linearly with the number of
 * lines (before: (1 + n) x n per-line entries, 189 MB for 1,000 lines).
 * Eight times the lines must cost at most nine times the bytes (quadratic
 * growth would give about 64). */
static void test_memory_linear(void **state)
{
    (void)state;
    static char names[1200][16];
    hf_model m50, m400;
    hf_model_line *l50 = ring(&m50, 150, names);
    hf_model_line *l400 = ring(&m400, 1200, names);
    hf_error e;
    hf_balance *a = hf_balance_alloc(&m50, &e), *b = hf_balance_alloc(&m400, &e);
    assert_non_null(a);
    assert_non_null(b);
    double ratio = (double)hf_balance_footprint(b) / (double)hf_balance_footprint(a);
    print_message("balance footprint: 150 lines %zu B, 1200 lines %zu B (x %.2f)\n",
                  hf_balance_footprint(a), hf_balance_footprint(b), ratio);
    assert_true(ratio > 7.0 && ratio < 9.0);
    assert_true(hf_balance_footprint(b) < 1200u * 1024u); /* under 1 KB per line */
    hf_balance_free(a);
    hf_balance_free(b);
    free(l50);
    free(l400);
}

typedef struct {
    size_t seen[8];
    double tension[8];
    size_t count, stop_after;
} visit_log;

static int visit(void *ctx, size_t cond, const hf_balance_result *r)
{
    visit_log *v = ctx;
    v->seen[v->count] = cond;
    v->tension[v->count] = r->max_tension;
    v->count++;
    return v->count >= v->stop_after;
}

/* hf_balance_run_each hands every condition over in order, with the same
 * numbers hf_balance_run keeps; a visitor can stop the run. */
static void test_run_each(void **state)
{
    (void)state;
    fixture fx;
    four_line(&fx);
    hf_error e;
    hf_balance *b = hf_balance_alloc(&fx.m, &e);
    hf_load l = load_of("gale-east", 412.5e3, 33.0, 1.2e6);
    visit_log v = {.stop_after = 100};
    hf_balance_reset(b); /* warm starts forgotten: both runs start alike */
    assert_int_equal(hf_balance_run_each(b, &l, visit, &v, &e), HF_OK);
    assert_int_equal(v.count, 5);
    /* only the last condition is kept without hf_balance_run */
    assert_null(hf_balance_result_at(b, 0));
    assert_non_null(hf_balance_result_at(b, 4));
    hf_balance_reset(b);
    assert_int_equal(hf_balance_run(b, &l, &e), HF_OK);
    for (size_t c = 0; c < 5; c++) {
        assert_int_equal(v.seen[c], c);
        const hf_balance_result *r = hf_balance_result_at(b, c);
        assert_non_null(r);
        assert_true(r->max_tension == v.tension[c]); /* same solve, same bits */
    }
    visit_log w = {.stop_after = 2};
    assert_int_equal(hf_balance_run_each(b, &l, visit, &w, &e), HF_CONTINUE);
    assert_int_equal(w.count, 2);
    hf_balance_free(b);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_load_force),
        cmocka_unit_test(test_drag_force),
        cmocka_unit_test(test_zero_load),
        cmocka_unit_test(test_load_along_x),
        cmocka_unit_test(test_broken_conditions),
        cmocka_unit_test(test_symmetry_sway_and_yaw),
        cmocka_unit_test(test_rotation_invariance),
        cmocka_unit_test(test_small_load_linear),
        cmocka_unit_test(test_no_equilibrium_overload),
        cmocka_unit_test(test_no_equilibrium_broken),
        cmocka_unit_test(test_no_equilibrium_limit_point),
        cmocka_unit_test(test_offset_and_anchor_criteria),
        cmocka_unit_test(test_zero_yaw_stiffness),
        cmocka_unit_test(test_reset_and_order),
        cmocka_unit_test(test_bad_input),
        cmocka_unit_test(test_alloc_failures),
        cmocka_unit_test(test_memory_linear),
        cmocka_unit_test(test_run_each),
    };
    hf_gsl_handler_install();
    return cmocka_run_group_tests(tests, NULL, NULL);
}
