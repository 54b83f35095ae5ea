/* test_design.c - the design driver (design.h) and the case keys of the
 * design method (case_env.c, designdata.h).
 *
 * References: the drag equation F = 1/2 rho C A V^2 (any fluid-mechanics
 * text, e.g. Hoerner, Fluid-Dynamic Drag) for the mean current load; the
 * quasi-static design method's definition (API RP 2SK, 3rd ed. 2005, from
 * memory): with no waves there is no slow-drift or wave-frequency motion, so
 * the design offset is the mean offset and the design tensions are the mean
 * tensions; the design offset is mean + max(LF max + WF sig, LF sig + WF
 * max); each line's design tension is the larger of its two combination
 * poses.  The driver is also held to the library chain of
 * tests/test_design_flow.c (hf_env_mean_pose around hf_balance_solve,
 * hf_spread_stiffness, hf_env_motion, hf_env_design_offset) on the demo
 * barge (fictional, invented tables). */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/design.h"
#include "holdfast/designcsv.h"
#include "holdfast/spread.h"
#include "support.h"

#define DEG (M_PI / 180.0)

static char dir[512]; /* scratch directory with the small case's tables */

static int setup(void **state)
{
    (void)state;
    if (hf_test_tmpdir_make(dir, sizeof dir, "design") != 0)
        return -1;
    char p[700];
    snprintf(p, sizeof p, "%s/cur.csv", dir); /* invented: constant coefficients */
    char tab[1024] = "# invented test table\nheading_deg,cx,cy,cmz\n";
    for (int h = 0; h < 360; h += 30)
        snprintf(tab + strlen(tab), sizeof tab - strlen(tab), "%d,0.6,0.6,0\n", h);
    hf_test_file_write(p, tab);
    snprintf(p, sizeof p, "%s/bad.csv", dir);
    hf_test_file_write(p, "heading_deg,cx,cy,cmz\n0,0.6,0.6,0\n90,0.6,abc,0\n");
    return 0;
}

static int teardown(void **state)
{
    (void)state;
    return hf_test_tmpdir_remove(dir);
}

/* A small fictional four-point spread (the "Glimmer Reach" test buoy
 * tender, invented) with the given hull design keys and environments. */
static hf_status load_small(const char *hull_extra, const char *envs, hf_model *m,
                            hf_study_list *sl, hf_error *err)
{
    char text[8192], name[700];
    snprintf(text, sizeof text,
             "title: Glimmer Reach tender (fictional)\n"
             "site: {depth: 80 m}\n"
             "components:\n"
             "  chain: {type: studless_chain, grade: R3, diameter: 64 mm}\n"
             "hull:\n"
             "  heading: 0 deg\n"
             "%s"
             "lines:\n"
             "  - {name: ne, anchor: [430, 430], fairlead: [20, 8, -3], sections: [{component: "
             "chain, length: 640 m}]}\n"
             "  - {name: nw, anchor: [-430, 430], fairlead: [-20, 8, -3], sections: [{component: "
             "chain, length: 640 m}]}\n"
             "  - {name: sw, anchor: [-430, -430], fairlead: [-20, -8, -3], sections: "
             "[{component: chain, length: 640 m}]}\n"
             "  - {name: se, anchor: [430, -430], fairlead: [20, -8, -3], sections: [{component: "
             "chain, length: 640 m}]}\n"
             "criteria: {intact_factor: 1.67, damaged_factor: 1.25}\n"
             "%s",
             hull_extra, envs);
    snprintf(name, sizeof name, "%s/small.yaml", dir);
    return hf_case_load_buffer_with_studies(text, strlen(text), name, m, sl, err);
}

static const char cur_hull[] = "  current_coefficients: cur.csv\n"
                               "  current_area: 310 m^2\n"
                               "  length: 40 m\n";

/* With current only there is no motion: design offset = mean offset, and
 * the design tensions are the tensions at the mean pose. */
static void current_only_design_is_mean(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (load_small(
            cur_hull,
            "environments:\n  - {name: ebb, current: {speed: 1.35 m/s, direction: 37 deg}}\n", &m,
            NULL, &err) != HF_OK)
        fail_msg("%s", err.text);
    hf_design *d = hf_design_alloc(&m, &err);
    assert_non_null(d);
    assert_int_equal(hf_design_nenv(d), 1);
    assert_int_equal(hf_design_ncond(d), 5);
    for (size_t cond = 0; cond < 2; cond++) {
        if (hf_design_solve(d, 0, cond, &err) != HF_OK)
            fail_msg("condition %zu: %s", cond, err.text);
        const hf_design_result *r = hf_design_result_get(d);
        /* drag equation in hull axes: 1/2 rho C A V^2 (the yaw changes only
         * the global direction, the coefficients are constant) */
        double q = 0.5 * 1025.0 * 0.6 * 310.0 * 1.35 * 1.35;
        HF_TEST_ASSERT_NEAR(r->mean.current[0], q, 1e-9 * q);
        HF_TEST_ASSERT_NEAR(r->mean.current[1], q, 1e-9 * q);
        double mean = hypot(r->mean_offset[0], r->mean_offset[1]);
        assert_true(mean > 0.5); /* the current moves the hull */
        HF_TEST_ASSERT_NEAR(r->design.offset, mean, 1e-12);
        HF_TEST_ASSERT_NEAR(r->design.yaw, r->mean_offset[2], 1e-15);
        for (int k = 0; k < 3; k++) {
            assert_true(r->motion.dof[k].lf_sig == 0.0 && r->motion.dof[k].wf_max == 0.0);
            assert_true(r->motion.dof[k].lf_period == 0.0); /* no masses given */
        }
        for (size_t i = 0; i < m.nlines; i++)
            HF_TEST_ASSERT_NEAR(r->tension[i], r->tension_mean[i], 1e-9 * r->tension_mean[i]);
        assert_true(r->status == HF_OK && r->passed);
        assert_true(cond == 0 ? r->broken == HF_DESIGN_INTACT : r->broken == cond - 1);
        if (cond > 0) /* the broken line carries nothing */
            assert_true(r->tension[cond - 1] == 0.0 && r->governs[cond - 1] == 0);
    }
    /* a bad index is refused, with the failure in the result */
    assert_int_equal(hf_design_solve(d, 1, 0, &err), HF_EINVAL);
    assert_int_equal(hf_design_result_get(d)->status, HF_EINVAL);
    assert_false(hf_design_result_get(d)->passed);
    hf_design_free(d);
    hf_design_free(NULL);
    hf_model_free(&m);
}

/* A factor no line can meet, an offset limit below the mean, and a strong
 * current that breaks the chain: each shows in the verdict. */
static void criteria_and_overload(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (load_small(cur_hull,
                   "environments:\n  - {name: spring, current: {speed: 1.1 m/s, direction: 0}}\n"
                   "  - {name: surge-tide, current: {speed: 6.5 m/s, direction: 0}}\n",
                   &m, NULL, &err) != HF_OK)
        fail_msg("%s", err.text);
    m.criteria.factor_intact = 50.0;
    m.criteria.max_offset = 0.1;
    hf_design *d = hf_design_alloc(&m, &err);
    assert_non_null(d);
    assert_int_equal(hf_design_solve(d, 0, 0, &err), HF_OK);
    const hf_design_result *r = hf_design_result_get(d);
    assert_false(r->lines_passed);
    assert_false(r->offset_passed);
    assert_false(r->passed);
    size_t w = r->max_utilisation_line;
    assert_true(w < m.nlines);
    /* MBL/T of the governing section, and the utilisation is its inverse */
    HF_TEST_ASSERT_NEAR(r->line[w].factor * r->utilisation[w], 1.0, 1e-9);
    assert_int_equal(r->overloaded, hf_criteria_overloaded(r->max_utilisation));
    hf_status st = hf_design_solve(d, 1, 0, &err);
    r = hf_design_result_get(d);
    print_message("surge-tide: status %s, max utilisation %.3f\n", hf_status_str(st),
                  r->max_utilisation);
    assert_int_equal(st, HF_OK);            /* measured: utilisation 1.52 */
    assert_true(r->max_utilisation >= 1.0); /* 6.5 m/s: about 5.7 MN on a 64 mm chain */
    assert_true(r->overloaded);
    assert_false(r->passed);
    hf_design_free(d);
    hf_model_free(&m);
}

/* ---- the driver against the library chain (test_design_flow.c) ---- */

typedef struct {
    hf_balance *b;
    size_t cond;
} eq_ctx;

static hf_status balance_eq(const double load[3], double offset[3], void *ctx, hf_error *err)
{
    eq_ctx *c = ctx;
    hf_load l = {"env", hypot(load[0], load[1]), atan2(load[1], load[0]), load[2], 0, NULL, 0};
    hf_status st = hf_balance_solve(c->b, &l, c->cond, err);
    if (st == HF_OK)
        memcpy(offset, hf_balance_result_at(c->b, c->cond)->offset, 3 * sizeof *offset);
    return st;
}

/* Tensions of every line at rest + off (m, m, rad) into t (N). */
static void tensions_at(hf_spread *sp, const hf_model *m, const double off[3], double *t)
{
    hf_pose p;
    hf_spread_result sr;
    hf_error err;
    hf_spread_pose_rest(m, &p);
    hf_spread_pose_offset(&p, off);
    if (hf_spread_solve(sp, &p, &sr, &err) != HF_OK)
        fail_msg("%s", err.text);
    for (size_t i = 0; i < m->nlines; i++)
        t[i] = sr.line_tension[i];
}

/* One condition by hand, compared with the driver's result r. */
static void chain_check(const hf_model *m, size_t cond, const hf_design_result *r)
{
    hf_error err;
    hf_env_hull h;
    hf_designdata_hull(m->design, m->site.water_density, &h);
    const hf_environment *e = &m->design->env[0].env;
    hf_balance *b = hf_balance_alloc(m, &err);
    hf_spread *sp = hf_spread_alloc(m, &err);
    hf_env_workspace *ws = hf_env_workspace_alloc(&err);
    assert_true(b && sp && ws);
    eq_ctx c = {b, cond};
    double off[3], K[6][6], k[3];
    hf_env_mean mean;
    int it;
    if (hf_env_mean_pose(&h, e, m->hull.heading, balance_eq, &c, NULL, ws, off, &mean, &it, &err) !=
        HF_OK)
        fail_msg("%s", err.text);
    for (int i = 0; i < 3; i++)
        HF_TEST_ASSERT_NEAR(r->mean_offset[i], off[i], 1e-6);
    if (cond > 0)
        assert_int_equal(hf_spread_set_broken(sp, cond - 1, 1), HF_OK);
    hf_pose p;
    hf_spread_result sr;
    hf_spread_pose_rest(m, &p);
    hf_spread_pose_offset(&p, off);
    if (hf_spread_stiffness(sp, &p, K, &sr, &err) != HF_OK)
        fail_msg("%s", err.text);
    hf_env_stiffness_hull(K, p.yaw, k);
    hf_env_motion_result mo;
    hf_env_design g;
    if (hf_env_motion(&h, e, p.yaw, k, ws, &mo, &err) != HF_OK ||
        hf_env_design_offset(off, off[2], p.yaw, &mo, e->waves.direction, &g, &err) != HF_OK)
        fail_msg("%s", err.text);
    HF_TEST_ASSERT_NEAR(r->design.offset, g.offset, 1e-5);
    HF_TEST_ASSERT_NEAR(r->motion.dof[0].lf_period, mo.dof[0].lf_period, 1e-5);
    HF_TEST_ASSERT_NEAR(r->motion.dof[1].wf_sig, mo.dof[1].wf_sig, 1e-6);
    /* the rule: mean + the larger combination */
    HF_TEST_ASSERT_NEAR(r->design.offset,
                        r->design.mean + fmax(r->design.combo_lf_max, r->design.combo_wf_max),
                        1e-12);
    /* each line: the larger of its tensions at the two combination poses */
    double t1[16], t2[16];
    assert_true(m->nlines <= 16);
    tensions_at(sp, m, r->design.pose_lf_max, t1);
    tensions_at(sp, m, r->design.pose_wf_max, t2);
    double tmax = 0.0;
    for (size_t i = 0; i < m->nlines; i++) {
        double want = fmax(t1[i], t2[i]);
        HF_TEST_ASSERT_NEAR(r->tension[i], want, 1e-7 * want + 1e-6);
        tmax = fmax(tmax, want);
    }
    HF_TEST_ASSERT_NEAR(r->max_tension, tmax, 1e-7 * tmax);
    assert_true(r->max_tension > r->max_tension_mean); /* moving on loads the worst line more */
    hf_balance_free(b);
    hf_spread_free(sp);
    hf_env_workspace_free(ws);
}

static void driver_matches_chain(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    char path[4096];
    hf_model_init(&m);
    hf_test_root_path(path, sizeof path, "cases/barge.yaml");
    if (hf_case_load(path, &m, &err) != HF_OK)
        fail_msg("%s", err.text);
    assert_non_null(m.design);
    assert_true(m.design->env[0].env.has_waves);
    hf_design *d = hf_design_alloc(&m, &err);
    assert_non_null(d);
    size_t broken = hf_model_line_find(&m, "stern-port-b");
    assert_true(broken < m.nlines);
    const size_t conds[2] = {0, broken + 1};
    for (int i = 0; i < 2; i++) {
        if (hf_design_solve(d, 0, conds[i], &err) != HF_OK)
            fail_msg("%s", err.text);
        chain_check(&m, conds[i], hf_design_result_get(d));
    }
    /* a copy of the model shares the design data */
    hf_model copy;
    assert_int_equal(hf_model_copy(&copy, &m), HF_OK);
    assert_ptr_equal(copy.design, m.design);
    hf_model_free(&copy);
    assert_non_null(m.design->env); /* still alive after the copy is freed */
    hf_design_free(d);
    hf_model_free(&m);
}

/* ---- case keys ---- */

/* The error of loading the small case with these parts contains `want`. */
static void refused(const char *hull_extra, const char *envs, const char *want)
{
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    hf_status st = load_small(hull_extra, envs, &m, NULL, &err);
    if (st == HF_OK)
        fail_msg("accepted; expected an error containing \"%s\"", want);
    if (!strstr(err.text, want))
        fail_msg("error \"%s\" does not contain \"%s\"", err.text, want);
    assert_null(m.design); /* nothing left behind */
    hf_model_free(&m);
}

static void case_keys_read(void **state)
{
    (void)state;
    hf_model m;
    hf_error err;
    hf_study_list sl;
    hf_model_init(&m);
    hf_study_list_init(&sl);
    const char *hull = "  mass: 5300 t\n  added_mass: [260 t, 3100 t]\n"
                       "  yaw_inertia: 7.1e5 t*m^2\n  added_yaw_inertia: 2.2e8 kg*m^2\n"
                       "  damping: [5 %, 0.07, 8.5 %]\n"
                       "  current_coefficients: cur.csv\n  current_area: 310 m^2\n"
                       "  length: 40 m\n";
    if (load_small(hull,
                   "environments:\n  - name: neap\n    current: {speed: 0.4 m/s, direction: 1.5 "
                   "rad}\n    duration: 2 h\n  - name: calm\n"
                   "studies:\n  - {name: d, kind: design, environments: [calm]}\n",
                   &m, &sl, &err) != HF_OK)
        fail_msg("%s", err.text);
    const hf_designdata *d = m.design;
    assert_non_null(d);
    HF_TEST_ASSERT_NEAR(d->mass, 5.3e6, 1e-6);
    HF_TEST_ASSERT_NEAR(d->added_mass[1], 3.1e6, 1e-6);
    HF_TEST_ASSERT_NEAR(d->yaw_inertia, 7.1e8, 1e-3);
    HF_TEST_ASSERT_NEAR(d->added_yaw_inertia, 2.2e8, 1e-3);
    HF_TEST_ASSERT_NEAR(d->damping[0], 0.05, 1e-15);
    HF_TEST_ASSERT_NEAR(d->damping[1], 0.07, 1e-15);
    HF_TEST_ASSERT_NEAR(d->damping[2], 0.085, 1e-15);
    assert_non_null(d->table[HF_DD_CURRENT]);
    assert_null(d->table[HF_DD_RAOS]);
    assert_non_null(strstr(d->path[HF_DD_CURRENT], "/cur.csv")); /* beside the case file */
    assert_int_equal(d->nenv, 2);
    assert_string_equal(d->env[0].name, "neap");
    HF_TEST_ASSERT_NEAR(d->env[0].env.duration, 7200.0, 0.0);
    HF_TEST_ASSERT_NEAR(d->env[0].env.current.direction, 1.5, 1e-15);
    HF_TEST_ASSERT_NEAR(d->env[1].env.duration, 10800.0, 0.0); /* default 3 h */
    assert_false(d->env[1].env.has_wind || d->env[1].env.has_current || d->env[1].env.has_waves);
    assert_int_equal(sl.n, 1);
    assert_int_equal(sl.v[0].kind, HF_STUDY_DESIGN);
    assert_int_equal(sl.v[0].nenvironments, 1);
    assert_string_equal(sl.v[0].environments[0], "calm");
    hf_designdata_hull(d, m.site.water_density, &(hf_env_hull){0});
    hf_study_list_free(&sl);
    hf_model_free(&m);
}

static void case_keys_refused(void **state)
{
    (void)state;
    /* a table that cannot be read: the case key's place, then the reason */
    refused("  raos: missing.csv\n", "", "small.yaml:7:9: hull.raos: expected a raos table");
    refused("  raos: missing.csv\n", "", "missing.csv: cannot open");
    /* a bad value in a table: the table's own file:line:col and column */
    refused("  current_coefficients: bad.csv\n", "", "bad.csv:3:");
    refused("  current_coefficients: bad.csv\n", "", "column cy");
    refused("  damping: [5 %, 150 %, 0.1]\n", "", "small.yaml:7:18: hull.damping[1]");
    refused("  damping: [0.05, 0.05]\n", "", "hull.damping: expected the damping ratios");
    refused("  yaw_inertia: 3 kN\n", "", "hull.yaw_inertia: expected a positive mass moment");
    refused("  mass: -3 t\n", "", "hull.mass: expected a positive mass");
    refused(cur_hull, "environments:\n  - {current: {speed: 1 m/s, direction: 0}}\n",
            "environments[0].name: expected a name for the environment");
    refused(cur_hull, "environments:\n  - {name: a, swell: {hs: 2 m}}\n",
            "expected a key of an environment");
    refused(cur_hull, "environments:\n  - {name: a}\n  - {name: a}\n",
            "environments[1].name: expected each environment name once");
    refused(cur_hull, "environments:\n  - {name: a, current: {speed: 1 m/s}}\n",
            "environments[0].current.direction: expected a direction");
    refused(cur_hull,
            "environments:\n  - {name: a, waves: {hs: 2 m, tp: 8 s, gamma: 12, "
            "direction: 0}}\n",
            "environments[0].waves.gamma: expected a peak factor gamma from 1 to 10");
    refused(cur_hull, "environments:\n  - {name: a, duration: -1 h}\n",
            "environments[0].duration: expected a positive storm duration");
    /* an environment the hull's data cannot support: no wind table */
    refused(cur_hull, "environments:\n  - {name: a, wind: {speed: 20 m/s, direction: 0}}\n",
            "environment a: wind needs the hull's wind_coefficients table");
    /* waves without RAOs, masses or damping */
    refused(cur_hull, "environments:\n  - {name: a, waves: {hs: 2 m, tp: 8 s, direction: 0}}\n",
            "environment a: waves need a positive surge inertia");
    /* a design study needs environments, and names known ones */
    refused(cur_hull, "studies:\n  - {name: d, kind: design}\n",
            "expected an environments: list in the case for a design study");
    refused(cur_hull,
            "environments:\n  - {name: a}\nstudies:\n  - {name: d, kind: design, environments: "
            "[b]}\n",
            "studies[0].environments[0]: expected the name of an environment of the case");
}

/* A spectrum with more than 0.1 % of its energy outside the RAO table's
 * frequencies is refused when the case is loaded (issue 14). */
static void coverage_refused(void **state)
{
    (void)state;
    char p[700], hull[4096];
    const char *src[2] = {"tests/data/env/barge-raos.csv", "tests/data/env/barge-drift.csv"};
    char abs[2][1024];
    for (int i = 0; i < 2; i++)
        hf_test_root_path(abs[i], sizeof abs[i], src[i]);
    /* a copy of the RAO table cut at 1.0 rad/s */
    char *text = hf_test_file_read(abs[0], NULL);
    assert_non_null(text);
    snprintf(p, sizeof p, "%s/short-raos.csv", dir);
    FILE *f = fopen(p, "w");
    assert_non_null(f);
    char *cur = text, *ln;
    while ((ln = hf_test_line_next(&cur)))
        if (ln[0] == '#' || ln[0] == 'f' || strtod(ln, NULL) <= 1.0)
            fprintf(f, "%s\n", ln);
    fclose(f);
    free(text);
    snprintf(hull, sizeof hull,
             "  mass: 5300 t\n  yaw_inertia: 7.1e5 t*m^2\n  damping: [5 %%, 5 %%, 5 %%]\n"
             "  raos: %s\n  drift: %s\n",
             "short-raos.csv", abs[1]);
    /* Tp 7 s: wp = 0.90 rad/s, much of the energy above 1.0 rad/s; on the
     * full table (to 5 rad/s = 5.6 wp) about 0.08 % lies above (docs/design.md) */
    refused(hull, "environments:\n  - {name: chop, waves: {hs: 1.5 m, tp: 7 s, direction: 0}}\n",
            "of the spectrum's energy");
    refused(hull, "environments:\n  - {name: chop, waves: {hs: 1.5 m, tp: 7 s, direction: 0}}\n",
            "short-raos.csv");
    /* the same sea on the full table is accepted */
    snprintf(hull, sizeof hull,
             "  mass: 5300 t\n  yaw_inertia: 7.1e5 t*m^2\n  damping: [5 %%, 5 %%, 5 %%]\n"
             "  raos: %s\n  drift: %s\n",
             abs[0], abs[1]);
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    if (load_small(hull,
                   "environments:\n  - {name: chop, waves: {hs: 1.5 m, tp: 7 s, direction: 0}}\n",
                   &m, NULL, &err) != HF_OK)
        fail_msg("%s", err.text);
    hf_model_free(&m);
}

static void csv_columns(void **state)
{
    (void)state;
    char *buf = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&buf, &len);
    assert_non_null(f);
    hf_model m;
    hf_model_init(&m);
    assert_int_equal(hf_design_csv_header_write(f, &m, NULL), HF_OK);
    fclose(f);
    /* the columns fixed by issue 14, in order, first */
    const char *fixed = "environment,condition,status,mean_surge_m,mean_sway_m,mean_yaw_deg,"
                        "lf_period_surge_s,lf_period_sway_s,lf_sig_surge_m,lf_max_surge_m,"
                        "wf_sig_surge_m,wf_max_surge_m,lf_sig_sway_m,wf_sig_sway_m,"
                        "design_offset_m,max_tension_kN,max_tension_line,max_utilisation,"
                        "passed,";
    assert_int_equal(strncmp(buf, fixed, strlen(fixed)), 0);
    assert_non_null(strstr(buf, ",lf_var_white_surge_m2,"));
    free(buf);
    hf_model_free(&m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {cmocka_unit_test(current_only_design_is_mean),
                                       cmocka_unit_test(criteria_and_overload),
                                       cmocka_unit_test(driver_matches_chain),
                                       cmocka_unit_test(case_keys_read),
                                       cmocka_unit_test(case_keys_refused),
                                       cmocka_unit_test(coverage_refused),
                                       cmocka_unit_test(csv_columns)};
    hf_gsl_handler_install();
    return cmocka_run_group_tests(tests, setup, teardown);
}
