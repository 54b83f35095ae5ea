/* test_sweep.c - sweeps against individual solves, output names, inversion. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "support.h"
#include "holdfast/alloc.h"
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/invert.h"
#include "holdfast/spread.h"
#include "holdfast/sweep.h"

/* The model: hf_test_case_quarrel (support.h), a fictional three-line buoy
 * mooring (invented site "Quarrel Point"): three-section lines (chain, wire,
 * chain) with a clump at the first joint. */
static hf_model model;

static int setup(void **s)
{
    (void)s;
    hf_model_init(&model);
    hf_error e;
    const char *text = hf_test_case_quarrel;
    if (hf_case_load_buffer(text, strlen(text), "quarrel.yaml", &model, &e) != HF_OK) {
        fprintf(stderr, "%s\n", e.text);
        return -1;
    }
    return 0;
}

static int teardown(void **s)
{
    (void)s;
    hf_model_free(&model);
    return 0;
}

/* Field `col` (0-based) of a CSV row without quoted fields, as a number. */
static double field(const char *row, int col, char *word, size_t cap)
{
    const char *p = row;
    for (int i = 0; i < col; i++)
        p = strchr(p, ',') + 1;
    size_t n = strcspn(p, ",\n");
    if (word) {
        snprintf(word, cap, "%.*s", (int)n, p);
    }
    return strtod(p, NULL);
}

/* Solves the model directly with the parameters set, for comparison. */
static void direct(const char *p1, double v1, const char *p2, double v2, hf_spread_result *r,
                   double K[6][6], hf_spread **wsp, hf_model *copy)
{
    hf_error e;
    hf_model_init(copy);
    assert_int_equal(hf_model_copy(copy, &model), HF_OK);
    hf_param a, b;
    assert_int_equal(hf_model_param_lookup(copy, p1, &a, &e), HF_OK);
    assert_int_equal(hf_model_param_lookup(copy, p2, &b, &e), HF_OK);
    assert_int_equal(hf_model_param_set(copy, &a, v1, &e), HF_OK);
    assert_int_equal(hf_model_param_set(copy, &b, v2, &e), HF_OK);
    *wsp = hf_spread_alloc(copy, &e);
    assert_non_null(*wsp);
    hf_pose pose;
    hf_spread_pose_rest(copy, &pose);
    assert_int_equal(hf_spread_stiffness(*wsp, &pose, K, r, &e), HF_OK);
}

static void test_rows_equal_individual_runs(void **s)
{
    (void)s;
    double lengths[] = {110.385, 112.7, 111.05};
    hf_vary v[2];
    memset(v, 0, sizeof v);
    v[0].path = "lines[north].sections[3].length";
    v[0].nvalues = 3;
    v[0].values = lengths;
    v[1].path = "site.water_level";
    v[1].from = -0.85;
    v[1].to = 1.235;
    v[1].step = 0.695; /* -0.85, -0.155, 0.54, 1.235 */
    const char *outs[] = {"fairlead_tension", "anchor_tension:southwest", "stiffness_surge",
                          "max_utilisation"};
    hf_error e;
    hf_sweep *sw = hf_sweep_alloc(&model, v, 2, 0, outs, 4, 2, &e);
    assert_non_null(sw);
    assert_int_equal(hf_sweep_ncases(sw), 12);
    char *text = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&text, &len);
    assert_int_equal(hf_sweep_write_header(sw, f, &e), HF_OK);
    hf_sweep_range r = {0, 12, NULL, NULL, NULL};
    assert_int_equal(hf_sweep_write_rows(sw, &r, f, &e), HF_OK);
    fclose(f);
    const char *header = "lines[north].sections[3].length_m,site.water_level_m,status,T_north_kN,"
                         "T_southwest_kN,T_southeast_kN,anchor_T_southwest_kN,"
                         "stiffness_surge_kN_per_m,max_utilisation,worst_line,alert\n";
    assert_memory_equal(text, header, strlen(header));
    const char *row = text + strlen(header);
    for (int k = 0; k < 12; k++) {
        double l = lengths[k / 4], w = -0.85 + 0.695 * (k % 4);
        char word[64];
        assert_true(fabs(field(row, 0, NULL, 0) - l) < 1e-12);
        assert_true(fabs(field(row, 1, NULL, 0) - w) < 1e-9);
        field(row, 2, word, sizeof word);
        assert_string_equal(word, "ok");
        hf_spread_result res;
        double K[6][6];
        hf_spread *ws;
        hf_model copy;
        direct("lines[north].sections[3].length", l, "site.water_level", w, &res, K, &ws, &copy);
        /* The sweep warm-starts each line from the previous case, the direct
         * solve starts cold: both converge to the line solver's tolerance
         * (1e-10 of the length scale in position), which moves the tension of
         * these near-taut lines by ~1e-9 relative; the CSV carries 10 digits. */
        for (int i = 0; i < 3; i++) {
            double t = field(row, 3 + i, NULL, 0);
            assert_true(fabs(t - res.states[i].tension / 1e3) <= 1e-8 * t);
        }
        double ta = field(row, 6, NULL, 0);
        assert_true(fabs(ta - res.states[1].anchor_tension / 1e3) <= 1e-8 * fabs(ta) + 1e-12);
        double k11 = field(row, 7, NULL, 0);
        assert_true(fabs(k11 - K[0][0] / 1e3) <= 1e-7 * fabs(k11));
        double um = field(row, 8, NULL, 0);
        assert_true(fabs(um - res.max_utilisation) <= 1e-8 * um);
        field(row, 9, word, sizeof word);
        assert_string_equal(word, model.lines[res.max_utilisation_line].name);
        /* alert (issue 13): "overloaded" exactly when max utilisation >= 1 */
        field(row, 10, word, sizeof word);
        assert_string_equal(word, res.max_utilisation >= 1.0 ? "overloaded" : "");
        hf_spread_free(ws);
        hf_model_free(&copy);
        row = strchr(row, '\n') + 1;
    }
    assert_true(*row == '\0');
    free(text);
    hf_sweep_free(sw);
}

static void test_invalid_value_row(void **s)
{
    (void)s;
    double lengths[] = {112.0, -5.0, 0.0};
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.path = "lines[north].sections[3].length";
    v.nvalues = 3;
    v.values = lengths;
    hf_error e;
    hf_sweep *sw = hf_sweep_alloc(&model, &v, 1, 0, NULL, 0, 1, &e);
    assert_non_null(sw);
    char buf[4096];
    assert_int_equal(hf_sweep_case_row(sw, 1, buf, sizeof buf, &e), HF_OK);
    /* Varied value kept, status says why, outputs empty: never NaN. */
    assert_true(!strncmp(buf, "-5,invalid,,,,", 14));
    assert_null(strstr(buf, "nan"));
    assert_int_equal(hf_sweep_case_row(sw, 2, buf, sizeof buf, &e), HF_OK);
    assert_true(!strncmp(buf, "0,invalid,", 10));
    assert_int_equal(hf_sweep_case_row(sw, 0, buf, sizeof buf, &e), HF_OK);
    assert_true(!strncmp(buf, "112,ok,", 7));
    assert_int_equal(hf_sweep_case_row(sw, 3, buf, sizeof buf, &e), HF_EINVAL);
    assert_int_equal(hf_sweep_case_row(sw, 0, buf, 16, &e), HF_ELIMIT);
    hf_sweep_free(sw);
}

static void test_output_names(void **s)
{
    (void)s;
    hf_output o;
    hf_error e;
    assert_int_equal(hf_output_parse(&model, "fairlead_tension:southeast", &o, &e), HF_OK);
    assert_int_equal(o.kind, HF_OUT_FAIRLEAD_TENSION);
    assert_int_equal(o.line, 2);
    assert_true(hf_output_is_scalar(&o));
    assert_int_equal(hf_output_parse(&model, "utilisation", &o, &e), HF_OK);
    assert_false(hf_output_is_scalar(&o));
    assert_int_equal(hf_output_parse(&model, "offset_gale", &o, &e), HF_OK);
    assert_int_equal(o.kind, HF_OUT_OFFSET);
    assert_int_equal(hf_output_parse(&model, "offset_calm", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "calm"));
    assert_int_equal(hf_output_parse(&model, "stiffness_surge:north", &o, &e), HF_EINVAL);
    assert_int_equal(hf_output_parse(&model, "fairlead_tension:west", &o, &e), HF_EINVAL);
    assert_int_equal(hf_output_parse(&model, "tension", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "fairlead_tension"));
    assert_int_equal(hf_output_parse(&model, "", &o, &e), HF_EINVAL);
}

static void test_vary_parse(void **s)
{
    (void)s;
    hf_vary v;
    hf_error e;
    assert_int_equal(
        hf_sweep_vary_parse(&model, "components.chain76.diameter=70mm:90mm:2.5mm", 0, &v, &e),
        HF_OK);
    assert_int_equal(hf_study_vary_count(&v), 9);
    assert_true(fabs(v.from - 0.070) < 1e-15 && fabs(v.step - 0.0025) < 1e-15);
    hf_sweep_vary_clear(&v);
    assert_int_equal(hf_sweep_vary_parse(&model, "loads[gale].force=1.5e5,250 kN", 0, &v, &e),
                     HF_OK);
    assert_int_equal(v.nvalues, 2);
    assert_true(v.values[1] == 250e3);
    hf_sweep_vary_clear(&v);
    assert_int_equal(hf_sweep_vary_parse(&model, "lines[north].anchor_radius=380:425", 1, &v, &e),
                     HF_OK);
    assert_true(v.from == 380 && v.to == 425);
    hf_sweep_vary_clear(&v);
    /* Headings over two turns: nine values (each of FROM, TO, STEP reduced
     * to one turn made it the single value 0), and a bracket across 360 deg. */
    assert_int_equal(hf_sweep_vary_parse(&model, "hull.heading=0:720:90", 0, &v, &e), HF_OK);
    assert_int_equal(hf_study_vary_count(&v), 9);
    hf_sweep_vary_clear(&v);
    assert_int_equal(hf_sweep_vary_parse(&model, "hull.heading=350:370", 1, &v, &e), HF_OK);
    assert_true(v.from < v.to);
    hf_sweep_vary_clear(&v);
    const char *bad[] = {"site.depth",         "=1,2",
                         "site.depth=",        "site.depth=1:2",
                         "site.depth=3:1:1",   "site.depth=1:2:0",
                         "site.depth=1,nan",   "site.depth=1e309",
                         "site.depth=3 kN",    "site.deep=1,2",
                         "site.depth=1:2,3:4", "site.depth=1::2"};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++)
        assert_int_not_equal(hf_sweep_vary_parse(&model, bad[i], 0, &v, &e), HF_OK);
    /* A bracket must be LO:HI with LO < HI. */
    assert_int_equal(hf_sweep_vary_parse(&model, "site.depth=70:60", 1, &v, &e), HF_EINVAL);
    assert_int_equal(hf_sweep_vary_parse(&model, "site.depth=60:70:1", 1, &v, &e), HF_EINVAL);
}

/* Re-solves the model with the parameter at `value` and returns the output. */
static double check_output(const char *path, double value, const char *output)
{
    hf_model copy;
    hf_model_init(&copy);
    hf_error e;
    assert_int_equal(hf_model_copy(&copy, &model), HF_OK);
    hf_param p;
    assert_int_equal(hf_model_param_lookup(&copy, path, &p, &e), HF_OK);
    assert_int_equal(hf_model_param_set(&copy, &p, value, &e), HF_OK);
    hf_spread *ws = hf_spread_alloc(&copy, &e);
    hf_pose pose;
    hf_spread_pose_rest(&copy, &pose);
    hf_spread_result r;
    double K[6][6];
    assert_int_equal(hf_spread_stiffness(ws, &pose, K, &r, &e), HF_OK);
    double y = !strcmp(output, "stiffness_surge") ? K[0][0]
               : !strcmp(output, "h_north")       ? r.states[0].h
                                                  : r.states[0].tension;
    hf_spread_free(ws);
    hf_model_free(&copy);
    return y;
}

static void test_invert_hits_target(void **s)
{
    (void)s;
    hf_output o;
    hf_error e;
    hf_invert_result res;
    /* Section length for a 300 kN pretension of line north. */
    assert_int_equal(hf_output_parse(&model, "fairlead_tension:north", &o, &e), HF_OK);
    assert_int_equal(hf_invert_solve(&model, "lines[north].sections[3].length", 100.0, 125.0, &o,
                                     300e3, &res, &e),
                     HF_OK);
    assert_true(res.value > 100.0 && res.value < 112.0); /* shorter than 112 m: tauter */
    double t = check_output("lines[north].sections[3].length", res.value, "tension");
    assert_true(fabs(t - 300e3) <= 1e-6 * 300e3);
    /* Anchor radius for a 150.35 kN horizontal fairlead force. */
    assert_int_equal(hf_output_parse(&model, "fairlead_horizontal:north", &o, &e), HF_OK);
    assert_int_equal(
        hf_invert_solve(&model, "lines[north].anchor_radius", 400.0, 425.0, &o, 150.35e3, &res, &e),
        HF_OK);
    double h = check_output("lines[north].anchor_radius", res.value, "h_north");
    assert_true(fabs(h - 150.35e3) <= 1e-6 * 150.35e3);
    /* A surge stiffness of 21.7 kN/m from the wire length of line north. */
    assert_int_equal(hf_output_parse(&model, "stiffness_surge", &o, &e), HF_OK);
    assert_int_equal(hf_invert_solve(&model, "lines[north].sections[2].length", 140.0, 160.0, &o,
                                     21.7e3, &res, &e),
                     HF_OK);
    double k = check_output("lines[north].sections[2].length", res.value, "stiffness_surge");
    assert_true(fabs(k - 21.7e3) <= 1e-6 * 21.7e3);
    assert_true(res.relative_error <= HF_INVERT_RTOL);
}

/* One line (fictional "Carrow Bank" test line) whose clump hangs in the
 * water column near the fairlead, so its weight sets the surge stiffness. */
static const char clump_text[] =
    "title: Single test line off Carrow Bank (fictional)\n"
    "site: {depth: 62 m}\n"
    "components:\n"
    "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
    "  wire64: {type: spiral_strand, diameter: 64 mm}\n"
    "lines:\n"
    "  - name: bow\n"
    "    anchor: [424 m, 0 m]\n"
    "    fairlead: [4 m, 0 m, -8 m]\n"
    "    sections: [{component: chain76, length: 120 m}, {component: wire64, length: 240 m},\n"
    "               {clump: 60 kN}, {component: chain76, length: 80 m}]\n";

static void test_invert_clump_for_stiffness(void **s)
{
    (void)s;
    hf_model one;
    hf_model_init(&one);
    hf_error e;
    assert_int_equal(hf_case_load_buffer(clump_text, strlen(clump_text), "carrow.yaml", &one, &e),
                     HF_OK);
    hf_output o;
    assert_int_equal(hf_output_parse(&one, "stiffness_surge", &o, &e), HF_OK);
    hf_invert_result res;
    assert_int_equal(
        hf_invert_solve(&one, "lines[bow].sections[2].clump", 10e3, 300e3, &o, 13.385e3, &res, &e),
        HF_OK);
    /* Independent check: set the clump found and solve the spread directly. */
    hf_param p;
    assert_int_equal(hf_model_param_lookup(&one, "lines[bow].sections[2].clump", &p, &e), HF_OK);
    assert_int_equal(hf_model_param_set(&one, &p, res.value, &e), HF_OK);
    hf_spread *ws = hf_spread_alloc(&one, &e);
    hf_pose pose;
    hf_spread_pose_rest(&one, &pose);
    hf_spread_result r;
    double K[6][6];
    assert_int_equal(hf_spread_stiffness(ws, &pose, K, &r, &e), HF_OK);
    assert_true(fabs(K[0][0] - 13.385e3) <= 1e-6 * 13.385e3);
    assert_true(res.value > 126e3 && res.value < 155e3); /* between the sweep's neighbours */
    hf_spread_free(ws);
    hf_model_free(&one);
}

/* Classical check (catenary identities, any statics text: T = w y from the
 * directrix, suspended length s = sqrt(d^2 + 2 a d) with a = H / w, and
 * T = H + w d at the fairlead): an inextensible line of wet weight 828 N/m
 * in 25 m of water with a fairlead tension of 1510 kN has a = T/w - d =
 * 1798.67 m, a suspended length of 300.93 m and H = w a = 1489.3 kN (by
 * hand, to the digits written).  Here the inversion finds the anchor radius
 * of a 400 m line for 1510 kN at the fairlead; the suspended length must
 * then be the hand-calculated 300.93 m. */
static const char hand_text[] =
    "title: Inextensible line, worked-example check\n"
    "site: {depth: 25 m}\n"
    "components:\n"
    "  line828: {type: custom, wet_weight: 828 N/m, axial_stiffness: 1e15 N,\n"
    "            breaking_load: 10 MN, seabed_friction: 0}\n"
    "lines:\n"
    "  - name: one\n"
    "    anchor: [390 m, 0 m]\n"
    "    fairlead: [0 m, 0 m, 0 m]\n"
    "    sections: [{component: line828, length: 400 m}]\n";

static void test_invert_hand_catenary(void **s)
{
    (void)s;
    hf_model hand;
    hf_model_init(&hand);
    hf_error e;
    assert_int_equal(hf_case_load_buffer(hand_text, strlen(hand_text), "hand.yaml", &hand, &e),
                     HF_OK);
    hf_output o;
    assert_int_equal(hf_output_parse(&hand, "fairlead_tension:one", &o, &e), HF_OK);
    hf_invert_result res;
    assert_int_equal(
        hf_invert_solve(&hand, "lines[one].anchor_radius", 370.0, 399.0, &o, 1510e3, &res, &e),
        HF_OK);
    hf_param p;
    assert_int_equal(hf_model_param_lookup(&hand, "lines[one].anchor_radius", &p, &e), HF_OK);
    assert_int_equal(hf_model_param_set(&hand, &p, res.value, &e), HF_OK);
    hf_spread *ws = hf_spread_alloc(&hand, &e);
    hf_pose pose;
    hf_spread_pose_rest(&hand, &pose);
    hf_spread_result r;
    assert_int_equal(hf_spread_solve(ws, &pose, &r, &e), HF_OK);
    double suspended = 400.0 - r.states[0].grounded;
    /* hand calculation to 5 significant digits: +-0.005 m */
    if (fabs(suspended - 300.93) > 0.006)
        fail_msg("suspended length %.4f m, hand calculation 300.93 m", suspended);
    assert_true(fabs(r.states[0].h - 1489.3e3) <= 0.06e3); /* derived, 5 digits */
    assert_true(fabs(r.states[0].tension - 1510e3) <= 1e-6 * 1510e3);
    hf_spread_free(ws);
    hf_model_free(&hand);
}

static void test_invert_not_bracketed(void **s)
{
    (void)s;
    hf_output o;
    hf_error e;
    hf_invert_result res;
    assert_int_equal(hf_output_parse(&model, "fairlead_tension:north", &o, &e), HF_OK);
    assert_int_equal(
        hf_invert_solve(&model, "lines[north].sections[3].length", 111.0, 125.0, &o, 5e6, &res, &e),
        HF_ERANGE);
    /* The message gives the outputs at both ends of the bracket. */
    assert_non_null(strstr(e.text, "at 111"));
    assert_non_null(strstr(e.text, "at 125"));
    assert_non_null(strstr(e.text, "kN"));
    assert_int_equal(
        hf_invert_solve(&model, "lines[north].sections[3].length", 125.0, 111.0, &o, 3e5, &res, &e),
        HF_EINVAL);
    assert_int_equal(
        hf_invert_solve(&model, "lines[north].sections[3].length", 100.0, 125.0, &o, NAN, &res, &e),
        HF_EINVAL);
    assert_int_equal(hf_invert_solve(&model, "site.nowhere", 1.0, 2.0, &o, 3e5, &res, &e),
                     HF_EINVAL);
    /* A bracket end where the case cannot be built is named. */
    assert_int_equal(
        hf_invert_solve(&model, "lines[north].sections[3].length", -10.0, 125.0, &o, 3e5, &res, &e),
        HF_ERANGE);
    assert_non_null(strstr(e.text, "lower end"));
    /* Messages name the output in full (its line or load) and give the
     * parameter in the unit people read: degrees for angles (issue 12 item 17). */
    assert_int_equal(
        hf_invert_solve(&model, "lines[north].sections[3].length", 111.0, 125.0, &o, 5e6, &res, &e),
        HF_ERANGE);
    assert_non_null(strstr(e.text, "fairlead_tension:north = 5000 kN"));
    assert_non_null(strstr(e.text, "[111 m, 125 m]"));
    assert_int_equal(hf_output_parse(&model, "offset_gale", &o, &e), HF_OK);
    const double deg = M_PI / 180.0;
    assert_int_equal(
        hf_invert_solve(&model, "hull.heading", 10.0 * deg, 12.5 * deg, &o, 1e3, &res, &e),
        HF_ERANGE);
    assert_non_null(strstr(e.text, "offset_gale = 1000 m"));
    assert_non_null(strstr(e.text, "[10 deg, 12.5 deg]"));
}

/* The table in memory holds the numbers the CSV prints (hf_csv's 10
 * significant digits: relative 1e-9), with the row cap respected, and a run
 * into the table alone gives bit-identical values. */
static void test_table_matches_csv(void **s)
{
    (void)s;
    hf_vary v[2];
    memset(v, 0, sizeof v);
    double heads[] = {-7.5, 12.25};
    v[0].path = "hull.heading";
    v[0].nvalues = 2;
    v[0].values = heads;
    v[1].path = "site.water_level";
    v[1].from = -0.85;
    v[1].to = 1.235;
    v[1].step = 0.695;
    for (int i = 0; i < 2; i++)
        heads[i] *= M_PI / 180.0;
    const char *outs[] = {"fairlead_tension", "max_tension", "stiffness_yaw", "offset_gale"};
    hf_error e;
    hf_sweep *sw = hf_sweep_alloc(&model, v, 2, 0, outs, 4, 2, &e);
    assert_non_null(sw);
    hf_sweep_table *t = hf_sweep_table_alloc(sw, 5, &e);
    hf_sweep_table *t2 = hf_sweep_table_alloc(sw, 100, &e);
    assert_non_null(t);
    assert_non_null(t2);
    assert_null(hf_sweep_table_alloc(sw, 0, &e));
    assert_int_equal(t->nvary, 2);
    assert_int_equal(t->ncols, 3 + 2 + 1 + 3);
    assert_string_equal(t->vary_names[0], "hull.heading_deg");
    assert_string_equal(t->col_names[1], "T_southwest_kN");
    assert_string_equal(t->col_names[4], "max_tension_line");
    assert_string_equal(t->col_names[5], "stiffness_yaw_kNm_per_rad");
    assert_string_equal(t->col_names[8], "offset_gale_yaw_deg");
    char *text = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&text, &len);
    hf_sweep_range r = {1, 8, NULL, NULL, NULL};
    assert_int_equal(hf_sweep_run(sw, &r, f, t, &e), HF_OK);
    fclose(f);
    assert_int_equal(t->first, 1);
    assert_int_equal(t->total, 7);
    assert_int_equal(t->nrows, 5); /* the cap */
    assert_int_equal(t->failed, 0);
    const char *row = text;
    for (uint64_t i = 0; i < t->nrows; i++) {
        char word[64];
        assert_true(fabs(field(row, 0, NULL, 0) - t->vary[i * 2]) <= 1e-9 * fabs(t->vary[i * 2]));
        field(row, 2, word, sizeof word);
        assert_string_equal(word, "ok");
        for (size_t c = 0; c < t->ncols; c++) {
            double x = t->out[i * t->ncols + c];
            if (hf_output_column_is_line(&t->cols[c])) {
                field(row, 3 + (int)c, word, sizeof word);
                assert_string_equal(word, model.lines[(size_t)x].name);
                continue;
            }
            double y = field(row, 3 + (int)c, NULL, 0);
            if (!(fabs(x - y) <= 1e-9 * fabs(x) + 1e-300))
                fail_msg("row %llu column %s: table %.17g, CSV %.17g", (unsigned long long)i,
                         t->col_names[c], x, y);
        }
        row = strchr(row, '\n') + 1;
    }
    /* the table alone: the same numbers, every row */
    assert_int_equal(hf_sweep_run(sw, &r, NULL, t2, &e), HF_OK);

    assert_int_equal(t2->nrows, 7);
    for (size_t i = 0; i < 5 * t->ncols; i++)
        if (memcmp(&t2->out[i], &t->out[i], sizeof(double)))
            fail_msg("value %zu (%s): %.17g then %.17g", i, t->col_names[i % t->ncols], t->out[i],
                     t2->out[i]);
    assert_int_equal(hf_sweep_run(sw, &r, NULL, NULL, &e), HF_EINVAL);
    /* The offsets are those of a balance solved on the case itself: with
     * hull.heading varied, the equilibrium is found from that heading's rest
     * pose (a stale rest pose gave the yaw offset from the first heading). */
    for (uint64_t i = 0; i < t2->nrows; i++) {
        hf_model copy;
        hf_model_init(&copy);
        assert_int_equal(hf_model_copy(&copy, &model), HF_OK);
        hf_param ph, pw;
        assert_int_equal(hf_model_param_lookup(&copy, "hull.heading", &ph, &e), HF_OK);
        assert_int_equal(hf_model_param_lookup(&copy, "site.water_level", &pw, &e), HF_OK);
        assert_int_equal(hf_model_param_set(&copy, &ph, t2->vary[i * 2] * M_PI / 180.0, &e), HF_OK);
        assert_int_equal(hf_model_param_set(&copy, &pw, t2->vary[i * 2 + 1], &e), HF_OK);
        hf_balance *b = hf_balance_alloc(&copy, &e);
        assert_non_null(b);
        assert_int_equal(hf_balance_solve(b, &copy.loads[0], 0, &e), HF_OK);
        const double *u = hf_balance_result_at(b, 0)->offset;
        for (int k = 0; k < 3; k++) {
            double want = k == 2 ? u[2] * 180.0 / M_PI : u[k];
            double got = t2->out[i * t2->ncols + 6 + (size_t)k];
            if (!(fabs(got - want) <= 1e-6 * (1.0 + fabs(want))))
                fail_msg("case %llu offset %d: sweep %.12g, direct %.12g",
                         (unsigned long long)(i + t2->first), k, got, want);
        }
        hf_balance_free(b);
        hf_model_free(&copy);
    }
    free(text);
    hf_sweep_table_free(t);
    hf_sweep_table_free(t2);
    hf_sweep_table_free(NULL);
    hf_sweep_free(sw);
}

/* A case whose load finds no equilibrium (a 1e12 N push on a spread whose
 * lines break near 5e6 N) has no outputs at all: the docs say a failed row is
 * empty, so the rest-pose tensions of that case must not appear either
 * (issue 12 item 7). */
static void test_failed_row_is_empty(void **s)
{
    (void)s;
    double force[] = {400e3, 1e12};
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.path = "loads[gale].force";
    v.nvalues = 2;
    v.values = force;
    const char *outs[] = {"offset_gale", "fairlead_tension:north", "max_utilisation"};
    hf_error e;
    hf_sweep *sw = hf_sweep_alloc(&model, &v, 1, 0, outs, 3, 1, &e);
    assert_non_null(sw);
    char buf[4096];
    assert_int_equal(hf_sweep_case_row(sw, 1, buf, sizeof buf, &e), HF_OK);
    assert_string_equal(buf, "1e+12,no_equilibrium,,,,,,,\n");
    assert_int_equal(hf_sweep_case_row(sw, 0, buf, sizeof buf, &e), HF_OK);
    assert_true(!strncmp(buf, "400000,ok,", 10));
    hf_sweep_table *t = hf_sweep_table_alloc(sw, 2, &e);
    hf_sweep_range r = {0, 2, NULL, NULL, NULL};
    assert_int_equal(hf_sweep_run(sw, &r, NULL, t, &e), HF_OK);
    assert_int_equal(t->status[1], HF_ENOEQUIL);
    assert_int_equal(t->failed, 1);
    for (size_t c = 0; c < t->ncols; c++)
        assert_true(isnan(t->out[t->ncols + c]));
    hf_sweep_table_free(t);
    hf_sweep_free(sw);
}

/* One parameter varied twice, through any spelling, is refused naming both
 * (issue 12 item 3). */
static void test_vary_twice_refused(void **s)
{
    (void)s;
    static const char *const pairs[][2] = {
        {"site.depth", "site.depth"},
        {"lines[0].sections[0].length", "lines[north].sections[0].length"},
        {"components.chain76.diameter", "components[chain76].diameter"},
        {"lines[1].anchor_radius", "lines[southwest].anchor.x"},
        {"lines[southwest].anchor.y", "lines[1].anchor_radius"},
    };
    for (size_t i = 0; i < sizeof pairs / sizeof pairs[0]; i++) {
        hf_vary v[2];
        memset(v, 0, sizeof v);
        double vals[] = {1.5, 2.5};
        for (int j = 0; j < 2; j++) {
            v[j].path = (char *)pairs[i][j];
            v[j].nvalues = 2;
            v[j].values = vals;
        }
        hf_error e;
        hf_error_clear(&e);
        hf_sweep *sw = hf_sweep_alloc(&model, v, 2, 0, NULL, 0, 1, &e);
        if (sw)
            fail_msg("%s with %s: accepted", pairs[i][0], pairs[i][1]);
        assert_int_equal(e.status, HF_EINVAL);
        assert_non_null(strstr(e.text, pairs[i][0]));
        assert_non_null(strstr(e.text, pairs[i][1]));
        assert_non_null(strstr(e.text, "varied twice"));
    }
    /* a varied moment's column has no space in its unit (issue 12 item 17:
     * it read "loads[gale].moment_N m") */
    {
        hf_vary v1;
        memset(&v1, 0, sizeof v1);
        double mom[] = {1.5e6};
        v1.path = "loads[gale].moment";
        v1.nvalues = 1;
        v1.values = mom;
        hf_error e1;
        hf_sweep *sw1 = hf_sweep_alloc(&model, &v1, 1, 0, NULL, 0, 1, &e1);
        assert_non_null(sw1);
        char *text = NULL;
        size_t len = 0;
        FILE *f = open_memstream(&text, &len);
        assert_int_equal(hf_sweep_write_header(sw1, f, &e1), HF_OK);
        fclose(f);
        assert_true(!strncmp(text, "loads[gale].moment_Nm,status,", 29));
        free(text);
        hf_sweep_free(sw1);
    }
    /* different parameters of one line are fine */
    hf_vary v[2];
    memset(v, 0, sizeof v);
    double vals[] = {100.5, 120.5};
    v[0].path = "lines[0].sections[0].length";
    v[1].path = "lines[0].sections[2].length";
    v[0].nvalues = v[1].nvalues = 2;
    v[0].values = v[1].values = vals;
    hf_error e;
    hf_sweep *sw = hf_sweep_alloc(&model, v, 2, 0, NULL, 0, 1, &e);
    assert_non_null(sw);
    hf_sweep_free(sw);
}

static void test_alloc_failures(void **s)
{
    (void)s;
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.path = "site.water_level";
    v.from = -1.0;
    v.to = 1.0;
    v.step = 0.5;
    const char *outs[] = {"offset_gale", "fairlead_tension"};
    hf_error e;
    int ok = 0;
    for (long i = 1; i < 400 && !ok; i++) {
        hf_alloc_fail_at(i, 0);
        hf_sweep *sw = hf_sweep_alloc(&model, &v, 1, 0, outs, 2, 2, &e);
        hf_alloc_fail_at(0, 0);
        if (sw) {
            ok = 1;
        } else {
            assert_int_equal(e.status, HF_ENOMEM);
        }
        hf_sweep_free(sw);
    }
    assert_true(ok);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_rows_equal_individual_runs),
        cmocka_unit_test(test_invalid_value_row),
        cmocka_unit_test(test_output_names),
        cmocka_unit_test(test_vary_parse),
        cmocka_unit_test(test_invert_hits_target),
        cmocka_unit_test(test_invert_clump_for_stiffness),
        cmocka_unit_test(test_invert_hand_catenary),
        cmocka_unit_test(test_invert_not_bracketed),
        cmocka_unit_test(test_table_matches_csv),
        cmocka_unit_test(test_failed_row_is_empty),
        cmocka_unit_test(test_vary_twice_refused),
        cmocka_unit_test(test_alloc_failures),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
