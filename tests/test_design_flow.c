/* test_design_flow.c - the environment module driven the way a `design`
 * study will drive it, on the demo barge of cases/barge.yaml (fictional)
 * with the invented tables of tests/data/env: mean pose under
 * heading-dependent loads (fixed point on yaw around hf_balance_solve),
 * stiffness from hf_spread_stiffness, motions, design offset, tensions at
 * the design pose; intact and with the most loaded line broken.
 *
 * This is an integration check of the interfaces, not a check against an
 * outside reference (those are in test_environment.c and test_spectrum.c):
 * it holds the flow to its own physics (equilibrium residual, monotone
 * tension with offset, the combination rule) and prints the motion budget. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/environment.h"
#include "holdfast/spread.h"
#include "support.h"

#define DEG (M_PI / 180.0)

typedef struct {
    hf_model m;
    hf_balance *b;
    hf_spread *sp;
    hf_env_workspace *ws;
    hf_table *t[4];
    hf_env_hull h;
    hf_environment e;
} flow;

static void setup_flow(flow *f)
{
    hf_error err;
    char path[4096];
    const char *names[4] = {"barge-raos.csv", "barge-drift.csv", "barge-wind.csv",
                            "barge-current.csv"};
    const hf_table_kind kinds[4] = {HF_TABLE_RAO, HF_TABLE_DRIFT, HF_TABLE_COEF, HF_TABLE_COEF};
    memset(f, 0, sizeof *f);
    hf_model_init(&f->m);
    hf_test_root_path(path, sizeof path, "cases/barge.yaml");
    if (hf_case_load(path, &f->m, &err) != HF_OK)
        fail_msg("%s", err.text);
    for (int i = 0; i < 4; i++) {
        char rel[256];
        snprintf(rel, sizeof rel, "tests/data/env/%s", names[i]);
        hf_test_root_path(path, sizeof path, rel);
        if (hf_table_load(path, kinds[i], &f->t[i], &err) != HF_OK)
            fail_msg("%s", err.text);
    }
    f->b = hf_balance_alloc(&f->m, &err);
    f->sp = hf_spread_alloc(&f->m, &err);
    f->ws = hf_env_workspace_alloc(&err);
    assert_true(f->b && f->sp && f->ws);
    hf_env_hull *h = &f->h; /* invented masses for the fictional barge */
    hf_env_hull_default(h);
    h->inertia[0] = 2.21e7 * 1.05;
    h->inertia[1] = 2.21e7 * 1.62;
    h->inertia[2] = 2.21e7 * 1.62 * 36.0 * 36.0;
    h->damping[0] = 0.06, h->damping[1] = 0.08, h->damping[2] = 0.07;
    h->raos = f->t[0], h->drift = f->t[1], h->wind = f->t[2], h->current = f->t[3];
    h->wind_area = 900.0, h->current_area = 560.0, h->length = 120.0;
    h->water_density = f->m.site.water_density;
    hf_environment_default(&f->e); /* a fictional storm at Harrowmere */
    f->e.name = "harrowmere-storm";
    f->e.has_wind = f->e.has_current = f->e.has_waves = 1;
    f->e.wind = (hf_env_flow){21.5, 255 * DEG};
    f->e.current = (hf_env_flow){0.85, 240 * DEG};
    f->e.waves = (hf_env_waves){4.6, 10.4, 3.3, 250 * DEG};
}

static void teardown_flow(flow *f)
{
    hf_balance_free(f->b);
    hf_spread_free(f->sp);
    hf_env_workspace_free(f->ws);
    for (int i = 0; i < 4; i++)
        hf_table_free(f->t[i]);
    hf_model_free(&f->m);
}

/* Mean pose of condition cond under the environment: the loads depend on
 * the hull's yaw, so iterate yaw -> loads -> equilibrium -> yaw. */
static const hf_balance_result *mean_pose(flow *f, size_t cond, hf_env_mean *mean, int *iters)
{
    double psi0 = f->m.hull.heading, dyaw = 0.0;
    const hf_balance_result *r = NULL;
    for (*iters = 1; *iters <= 30; (*iters)++) {
        hf_error err;
        if (hf_env_mean_load(&f->h, &f->e, psi0 + dyaw, f->ws, mean, &err) != HF_OK)
            fail_msg("%s", err.text);
        const double *g = mean->total_global;
        hf_load load = {"env", hypot(g[0], g[1]), atan2(g[1], g[0]), g[2], 0, NULL};
        if (hf_balance_solve(f->b, &load, cond, &err) != HF_OK)
            fail_msg("condition %zu: %s", cond, err.text);
        r = hf_balance_result_at(f->b, cond);
        double step = r->offset[2] - dyaw;
        dyaw = r->offset[2];
        if (fabs(step) < 1e-9)
            return r;
    }
    fail_msg("yaw did not settle in 30 iterations");
    return r;
}

/* Runs one condition and prints its motion budget; returns the tensions. */
static void condition(flow *f, size_t cond, double *t_mean, double *t_design, size_t *worst)
{
    hf_env_mean mean;
    int iters;
    hf_error err;
    const hf_balance_result *r = mean_pose(f, cond, &mean, &iters);
    hf_spread_clear_broken(f->sp);
    if (cond > 0)
        assert_int_equal(hf_spread_set_broken(f->sp, cond - 1, 1), HF_OK);
    hf_pose pose;
    hf_spread_pose_rest(&f->m, &pose);
    hf_spread_pose_offset(&pose, r->offset);
    double K[6][6], k[3];
    hf_spread_result sr;
    if (hf_spread_stiffness(f->sp, &pose, K, &sr, &err) != HF_OK)
        fail_msg("%s", err.text);
    /* the mooring balances the environment at the mean pose (balance's tolerance) */
    for (int i = 0; i < 2; i++)
        assert_true(fabs(sr.force[i] + mean.total_global[i]) <=
                    1e-3 * hypot(mean.total_global[0], mean.total_global[1]));
    *t_mean = sr.max_tension;
    hf_env_stiffness_hull(K, pose.yaw, k);
    hf_env_motion_result mo;
    if (hf_env_motion(&f->h, &f->e, pose.yaw, k, f->ws, &mo, &err) != HF_OK)
        fail_msg("%s", err.text);
    hf_env_design d;
    if (hf_env_design_offset(r->offset, r->offset[2], pose.yaw, &mo, f->e.waves.direction, &d,
                             &err) != HF_OK)
        fail_msg("%s", err.text);
    assert_true(d.offset >= d.mean + d.combo_lf_max - 1e-12);
    assert_true(d.offset >= d.mean + d.combo_wf_max - 1e-12);
    hf_pose dp;
    hf_spread_pose_rest(&f->m, &dp);
    double off[3] = {d.offset_xy[0], d.offset_xy[1], d.yaw};
    hf_spread_pose_offset(&dp, off);
    if (hf_spread_solve(f->sp, &dp, &sr, &err) != HF_OK)
        fail_msg("design pose: %s", err.text);
    *t_design = sr.max_tension;
    *worst = sr.max_tension_line;
    print_message("%-14s yaw iterations %d | mean %.2f m, yaw %.2f deg | surge T_n %.0f s, sway "
                  "T_n %.0f s | LF sig %.2f / max %.2f m, WF sig %.2f / max %.2f m | "
                  "LFmax+WFsig %.2f m, LFsig+WFmax %.2f m | design %.2f m, yaw %.2f deg | "
                  "T mean %.0f kN -> design %.0f kN (%s)\n",
                  cond ? f->m.lines[cond - 1].name : "intact", iters, d.mean, r->offset[2] / DEG,
                  mo.dof[0].lf_period, mo.dof[1].lf_period, d.lf_sig, d.lf_max, d.wf_sig, d.wf_max,
                  d.combo_lf_max, d.combo_wf_max, d.offset, d.yaw / DEG, *t_mean / 1e3,
                  *t_design / 1e3, f->m.lines[*worst].name);
}

static void test_flow(void **state)
{
    (void)state;
    static flow f;
    setup_flow(&f);
    double tm, td;
    size_t worst;
    condition(&f, 0, &tm, &td, &worst);
    assert_true(td > tm); /* moving on along the mean offset loads the worst line more */
    double tm1, td1;
    size_t worst1;
    condition(&f, worst + 1, &tm1, &td1, &worst1);
    assert_true(td1 > tm1);
    assert_true(tm1 > tm); /* losing the most loaded line loads the others more */
    teardown_flow(&f);
}

int main(void)
{
    const struct CMUnitTest tests[] = {cmocka_unit_test(test_flow)};
    hf_gsl_handler_install();
    return cmocka_run_group_tests(tests, NULL, NULL);
}
