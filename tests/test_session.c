/* test_session.c - the session API (session.h): loading, parameters, result tables.
 *
 * The tables are checked three ways: against the CSV the command line's
 * writers produce for the same solve (the same numbers to the printed 10
 * digits), against classical identities (Pythagoras on the fairlead force,
 * the stiffness as the derivative of the static force, the directional
 * stiffness d^T K d), and for their failure paths (bad text, bad values,
 * no memory).  Cases: the demo cases (fictional scenarios). */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/analysis.h"
#include "holdfast/case.h"
#include "holdfast/results.h"
#include "holdfast/session.h"
#include "support.h"

static hf_session *open_case(const char *rel)
{
    char path[4096];
    hf_test_root_path(path, sizeof path, rel);
    hf_session *s = hf_session_alloc();
    assert_non_null(s);
    if (hf_session_load_file(s, path) != HF_OK)
        fail_msg("%s: %s", path, hf_session_message(s));
    assert_string_equal(hf_session_message(s), "");
    return s;
}

/* Column j of table t by name, or fails. */
static size_t col(const hf_session_table *t, const char *name)
{
    for (size_t j = 0; j < hf_session_table_columns(t); j++)
        if (!strcmp(hf_session_table_column(t, j), name))
            return j;
    fail_msg("no column %s", name);
    return 0;
}

static double cell(const hf_session_table *t, size_t i, const char *name)
{
    return hf_session_table_values(t)[i * hf_session_table_columns(t) + col(t, name)];
}

/* Checks every cell of t against the CSV text (header + rows): names
 * equal, text equal, numbers equal to the 10 printed digits, empty fields
 * empty.  The CSV has no quoted fields in these cases. */
static void same_as_csv(const hf_session_table *t, char *csv)
{
    char *save = NULL, *line = strtok_r(csv, "\n", &save);
    char *f[512];
    size_t n = hf_test_csv_split(line, f, 512);
    assert_int_equal(n, hf_session_table_columns(t));
    for (size_t j = 0; j < n; j++)
        assert_string_equal(f[j], hf_session_table_column(t, j));
    size_t i = 0;
    const double *v = hf_session_table_values(t);
    for (; (line = strtok_r(NULL, "\n", &save)) != NULL; i++) {
        assert_true(i < hf_session_table_rows(t));
        assert_int_equal(hf_test_csv_split(line, f, 512), n);
        for (size_t j = 0; j < n; j++) {
            if (hf_session_table_is_text(t, j)) {
                assert_string_equal(f[j], hf_session_table_text(t, i, j));
            } else if (!f[j][0]) {
                assert_true(hf_session_table_is_empty(t, i, j));
            } else {
                char buf[64];
                snprintf(buf, sizeof buf, "%.10g", v[i * n + j]);
                if (strcmp(buf, f[j]))
                    fail_msg("row %zu column %s: table %s, CSV %s", i,
                             hf_session_table_column(t, j), buf, f[j]);
            }
        }
    }
    assert_int_equal(i, hf_session_table_rows(t));
}

/* The CSV text the writer gives, into a malloc'd string (free()). */
static char *capture(void (*write)(FILE *, void *), void *ctx)
{
    FILE *f = tmpfile();
    assert_non_null(f);
    write(f, ctx);
    long n = ftell(f);
    rewind(f);
    char *buf = calloc((size_t)n + 1, 1);
    assert_non_null(buf);
    assert_int_equal(fread(buf, 1, (size_t)n, f), (size_t)n);
    fclose(f);
    return buf;
}

typedef struct {
    hf_model m;
    hf_analysis_pose a;
} pose_ctx;

static void write_lines(FILE *f, void *ctx)
{
    pose_ctx *p = ctx;
    hf_results_lines_write(f, &p->m, &p->a.res);
}

static void write_stiffness(FILE *f, void *ctx)
{
    pose_ctx *p = ctx;
    hf_results_stiffness_write(f, p->a.K, p->a.res.force);
}

/* The writer's CSV of the case solved at offset without the session. */
static char *pose_csv(const char *rel, const double off[3], int stiffness)
{
    char path[4096];
    hf_test_root_path(path, sizeof path, rel);
    pose_ctx p;
    hf_model_init(&p.m);
    hf_analysis_pose_init(&p.a);
    hf_error err;
    hf_error_clear(&err);
    assert_int_equal(hf_case_load(path, &p.m, &err), HF_OK);
    assert_int_equal(hf_analysis_pose_solve(&p.a, &p.m, off, stiffness, &err), HF_OK);
    char *csv = capture(stiffness ? write_stiffness : write_lines, &p);
    hf_analysis_pose_clear(&p.a);
    hf_model_free(&p.m);
    return csv;
}

static void test_lines_same_as_csv(void **state)
{
    (void)state;
    const char *cases[] = {"cases/barge.yaml", "cases/marina.yaml", "cases/student.yaml"};
    const double off[3] = {2.385, -1.75, 0.0523}; /* m, m, rad */
    for (size_t c = 0; c < 3; c++) {
        hf_session *s = open_case(cases[c]);
        hf_session_table *t = NULL;
        assert_int_equal(hf_session_lines(s, off, &t), HF_OK);
        assert_int_equal(hf_session_table_rows(t), hf_session_nlines(s));
        char *csv = pose_csv(cases[c], off, 0);
        same_as_csv(t, csv);
        free(csv);
        /* Pythagoras: T^2 = H^2 + V^2 at the fairlead; top angle atan2(V, H) */
        for (size_t i = 0; i < hf_session_table_rows(t); i++) {
            double T = cell(t, i, "fairlead_tension_kN"), H = cell(t, i, "fairlead_horizontal_kN"),
                   V = cell(t, i, "fairlead_vertical_kN");
            HF_TEST_ASSERT_NEAR(T, hypot(H, V), 1e-9 * T);
            HF_TEST_ASSERT_NEAR(cell(t, i, "top_angle_deg"), atan2(V, H) * 180.0 / M_PI, 1e-9);
        }
        HF_TEST_ASSERT_NEAR(hf_session_table_scale(t, col(t, "fairlead_tension_kN")), 1e3, 0);
        HF_TEST_ASSERT_NEAR(hf_session_table_scale(t, col(t, "top_angle_deg")), M_PI / 180.0, 0);
        assert_true(hf_session_table_is_text(t, col(t, "alert")));
        assert_null(hf_session_table_text(t, 0, col(t, "span_m")));
        hf_session_table_free(t);
        hf_session_free(s);
    }
}

static void test_stiffness_same_as_csv_and_derivative(void **state)
{
    (void)state;
    const double off[3] = {1.25, 0.5, 0.0};
    hf_session *s = open_case("cases/barge.yaml");
    hf_session_table *t = NULL;
    assert_int_equal(hf_session_stiffness(s, off, &t), HF_OK);
    assert_int_equal(hf_session_table_rows(t), 7);
    char *csv = pose_csv("cases/barge.yaml", off, 1);
    same_as_csv(t, csv);
    free(csv);
    assert_string_equal(hf_session_table_text(t, 6, 0), "static_load");
    /* K[0][0] = -dFx/dsurge: central difference of the static load row
     * (definition of the derivative; step 1 cm, tolerance 0.1 %) */
    double h = 0.01, fp, fm;
    hf_session_table *u = NULL;
    double o[3] = {off[0] + h, off[1], off[2]};
    assert_int_equal(hf_session_stiffness(s, o, &u), HF_OK);
    fp = cell(u, 6, "surge");
    hf_session_table_free(u);
    o[0] = off[0] - h;
    assert_int_equal(hf_session_stiffness(s, o, &u), HF_OK);
    fm = cell(u, 6, "surge");
    hf_session_table_free(u);
    double k00 = cell(t, 0, "surge");
    HF_TEST_ASSERT_NEAR(-(fp - fm) / (2 * h), k00, 1e-3 * k00);
    hf_session_table_free(t);
    hf_session_free(s);
}

static void test_curve_identities(void **state)
{
    (void)state;
    hf_session *s = open_case("cases/student.yaml");
    const double offs[] = {-3.5, 0.0, 2.25, 4.75};
    double dir = 0.7; /* rad */
    hf_session_table *c = NULL, *k = NULL;
    assert_int_equal(hf_session_curve(s, dir, offs, 4, &c), HF_OK);
    assert_int_equal(hf_session_table_rows(c), 4);
    assert_int_equal(hf_session_table_columns(c),
                     HF_RESULTS_CURVE_FIXED + hf_session_nlines(s) + 1);
    char name[256];
    snprintf(name, sizeof name, "T_%s_kN", hf_session_line_name(s, 0));
    assert_string_equal(hf_session_table_column(c, HF_RESULTS_CURVE_FIXED), name);
    /* d^T K d (quadratic form, the directional derivative) against the
     * stiffness table at the same pose */
    for (size_t i = 0; i < 4; i++) {
        double off[3] = {offs[i] * cos(dir), offs[i] * sin(dir), 0.0};
        assert_int_equal(hf_session_stiffness(s, off, &k), HF_OK);
        double cd = cos(dir), sd = sin(dir);
        double K00 = cell(k, 0, "surge"), K01 = cell(k, 0, "sway"), K10 = cell(k, 1, "surge"),
               K11 = cell(k, 1, "sway");
        double dkd = K00 * cd * cd + (K01 + K10) * cd * sd + K11 * sd * sd;
        HF_TEST_ASSERT_NEAR(cell(c, i, "stiffness_kN_per_m"), dkd, 1e-6 * fabs(dkd));
        /* restoring = -(Fx cos + Fy sin) */
        HF_TEST_ASSERT_NEAR(cell(c, i, "restoring_kN"),
                            -(cell(c, i, "force_x_kN") * cd + cell(c, i, "force_y_kN") * sd),
                            1e-9 * (1 + fabs(cell(c, i, "restoring_kN"))));
        HF_TEST_ASSERT_NEAR(cell(c, i, "offset_m"), offs[i], 0);
        hf_session_table_free(k);
    }
    hf_session_table_free(c);
    /* no offsets, non-finite offset: refused with a message */
    assert_int_equal(hf_session_curve(s, dir, offs, 0, &c), HF_EINVAL);
    assert_null(c);
    const double bad[] = {1.0, NAN};
    assert_int_equal(hf_session_curve(s, dir, bad, 2, &c), HF_EINVAL);
    assert_non_null(strstr(hf_session_message(s), "not finite"));
    hf_session_free(s);
}

static void test_balance_rows(void **state)
{
    (void)state;
    hf_session *s = open_case("cases/barge.yaml");
    hf_session_table *t = NULL;
    const char *one[] = {"head-storm"};
    assert_int_equal(hf_session_balance(s, one, 1, &t), HF_OK);
    size_t nl = hf_session_nlines(s);
    assert_int_equal(hf_session_table_rows(t), nl + 1);
    assert_string_equal(hf_session_table_text(t, 0, col(t, "condition")), "intact");
    assert_string_equal(hf_session_table_text(t, 0, col(t, "load")), "head-storm");
    /* horizontal offset = hypot(surge, sway) (Pythagoras) */
    HF_TEST_ASSERT_NEAR(cell(t, 0, "horizontal_m"),
                        hypot(cell(t, 0, "surge_m"), cell(t, 0, "sway_m")), 1e-12);
    hf_session_table_free(t);
    assert_int_equal(hf_session_balance(s, NULL, 0, &t), HF_OK);
    assert_int_equal(hf_session_table_rows(t), hf_session_nloads(s) * (nl + 1));
    hf_session_table_free(t);
    const char *bad[] = {"head-strom"};
    assert_int_equal(hf_session_balance(s, bad, 1, &t), HF_EINVAL);
    assert_null(t);
    assert_non_null(strstr(hf_session_message(s), "no load case named \"head-strom\""));
    assert_non_null(strstr(hf_session_message(s), "head-storm"));
    hf_session_free(s);
}

static void test_load_errors(void **state)
{
    (void)state;
    hf_session *s = open_case("cases/student.yaml");
    size_t n = hf_session_nlines(s);
    const char *bad = "title: fictional\n"
                      "site:\n"
                      "  depth: -40 m\n"
                      "components:\n"
                      "  chain: {type: studless_chain, grade: R3S, diameter: 52 mm}\n"
                      "lines:\n"
                      "  - name: one\n"
                      "    anchor: [-365, 0]\n"
                      "    fairlead: [0, 0, -6]\n"
                      "    sections:\n"
                      "      - {component: chain, length: 370 m}\n";
    assert_int_equal(hf_session_load_string(s, bad, strlen(bad), "bad.yaml"), HF_EINVAL);
    /* the loader's located message: file:line:col, key, what was expected */
    assert_non_null(strstr(hf_session_message(s), "bad.yaml:3:10: site.depth"));
    assert_int_equal(hf_session_nlines(s), n); /* the case held before is kept */
    assert_int_equal(hf_session_load_file(s, "/nonexistent/case.yaml"), HF_EIO);
    assert_non_null(strstr(hf_session_message(s), "/nonexistent/case.yaml"));
    hf_session_table *t = NULL;
    assert_int_equal(hf_session_lines(s, NULL, &t), HF_OK);
    hf_session_table_free(t);
    hf_session_free(s);
    /* no case yet: every call refused with a message */
    s = hf_session_alloc();
    assert_int_equal(hf_session_lines(s, NULL, &t), HF_EINVAL);
    assert_non_null(strstr(hf_session_message(s), "no case loaded"));
    double v;
    assert_int_equal(hf_session_get(s, "site.depth", &v), HF_EINVAL);
    hf_session_free(s);
    hf_session_free(NULL);
    hf_session_table_free(NULL);
}

static void test_set_get(void **state)
{
    (void)state;
    hf_session *s = open_case("cases/student.yaml");
    hf_session_table *before = NULL, *after = NULL;
    assert_int_equal(hf_session_lines(s, NULL, &before), HF_OK);
    double depth;
    assert_int_equal(hf_session_get(s, "site.depth", &depth), HF_OK);
    /* bad values: refused, message names the path, case unchanged */
    const char *texts[] = {"3 kN", "-40 m", "nan", "1e309 m", "", "12 furlongs"};
    for (size_t k = 0; k < sizeof texts / sizeof texts[0]; k++) {
        assert_int_equal(hf_session_set_text(s, "site.depth", texts[k]), HF_EINVAL);
        assert_true(strncmp(hf_session_message(s), "site.depth: ", 12) == 0);
    }
    const double values[] = {-1.0, 0.0, NAN, INFINITY};
    for (size_t k = 0; k < 4; k++)
        assert_int_equal(hf_session_set(s, "site.depth", values[k]), HF_EINVAL);
    assert_int_equal(hf_session_set(s, "site.no_such_key", 3.0), HF_EINVAL);
    double v;
    assert_int_equal(hf_session_get(s, "site.depth", &v), HF_OK);
    HF_TEST_ASSERT_NEAR(v, depth, 0);
    assert_int_equal(hf_session_lines(s, NULL, &after), HF_OK);
    size_t n = hf_session_table_rows(before) * hf_session_table_columns(before);
    assert_memory_equal(hf_session_table_values(before), hf_session_table_values(after),
                        n * sizeof(double));
    hf_session_table_free(after);
    /* units: 76 mm = 0.076 m; 30 (plain) on an angle is degrees, as in case files */
    assert_int_equal(hf_session_set_text(s, "site.depth", "152.4 ft"), HF_OK);
    assert_int_equal(hf_session_get(s, "site.depth", &v), HF_OK);
    HF_TEST_ASSERT_NEAR(v, 46.45152, 1e-9); /* 1 ft = 0.3048 m exactly (international foot) */
    assert_int_equal(hf_session_set(s, "site.depth", depth), HF_OK);
    assert_int_equal(hf_session_lines(s, NULL, &after), HF_OK);
    assert_memory_equal(hf_session_table_values(before), hf_session_table_values(after),
                        n * sizeof(double));
    hf_session_table_free(after);
    hf_session_table_free(before);
    hf_session_free(s);
}

static void test_warnings_and_failed_solves(void **state)
{
    (void)state;
    /* marina at 3 m, -2 m, 4 deg: a line reaches its MBL (the golden test's
     * lines-offset exits 1 there); the table is complete, the alert column
     * marks the line and the warnings name it */
    hf_session *s = open_case("cases/marina.yaml");
    hf_session_table *t = NULL;
    assert_int_equal(hf_session_lines(s, NULL, &t), HF_OK);
    assert_string_equal(hf_session_warnings(s), "");
    hf_session_table_free(t);
    const double off[3] = {3.0, -2.0, 4.0 * M_PI / 180.0};
    assert_int_equal(hf_session_lines(s, off, &t), HF_OK);
    size_t over = 0;
    for (size_t i = 0; i < hf_session_table_rows(t); i++)
        if (!strcmp(hf_session_table_text(t, i, col(t, "alert")), "overloaded")) {
            over++;
            assert_true(cell(t, i, "max_utilisation") >= 1.0);
            assert_non_null(strstr(hf_session_warnings(s), hf_session_table_text(t, i, 0)));
        }
    assert_true(over > 0);
    assert_non_null(strstr(hf_session_warnings(s), "is overloaded"));
    hf_session_table_free(t);
    hf_session_free(s);
    /* a 700 kN buoy on a short chain: a shape the solver does not support;
     * lines and a curve fail with the solver's message naming the line */
    const char *buoy = "title: fictional buoyed line\n"
                       "site: {depth: 48 m}\n"
                       "components:\n"
                       "  chain: {type: studless_chain, grade: R3S, diameter: 52 mm}\n"
                       "lines:\n"
                       "  - name: one\n"
                       "    anchor: [-365, 0]\n"
                       "    fairlead: [0, 0, -6]\n"
                       "    sections:\n"
                       "      - {component: chain, length: 200 m}\n"
                       "      - {buoy: 700 kN}\n"
                       "      - {component: chain, length: 170 m}\n";
    s = hf_session_alloc();
    assert_int_equal(hf_session_load_string(s, buoy, strlen(buoy), NULL), HF_OK);
    assert_int_equal(hf_session_lines(s, NULL, &t), HF_EUNSUPPORTED);
    assert_null(t);
    assert_non_null(strstr(hf_session_message(s), "line 'one'"));
    const double offs[] = {0.0, 1.0};
    assert_int_equal(hf_session_curve(s, 0.0, offs, 2, &t), HF_EUNSUPPORTED);
    assert_null(t);
    assert_non_null(strstr(hf_session_message(s), "curve at offset 0 m"));
    hf_session_free(s);
}

static void test_no_memory(void **state)
{
    (void)state;
    hf_session *s = open_case("cases/barge.yaml");
    const double offs[] = {0.0, 1.5};
    int ok = 0;
    for (long n = 1; n < 2000 && !ok; n++) {
        hf_session_table *t = NULL, *c = NULL, *b = NULL;
        hf_alloc_fail_at(n, 1);
        hf_status a = hf_session_lines(s, NULL, &t);
        hf_status d = hf_session_curve(s, 0.3, offs, 2, &c);
        const char *one[] = {"beam-storm"};
        hf_status e = hf_session_balance(s, one, 1, &b);
        hf_alloc_fail_at(0, 0);
        ok = a == HF_OK && d == HF_OK && e == HF_OK;
        assert_true(a == HF_OK || a == HF_ENOMEM);
        assert_true(d == HF_OK || d == HF_ENOMEM);
        assert_true(e == HF_OK || e == HF_ENOMEM);
        assert_true((a == HF_OK) == (t != NULL));
        hf_session_table_free(t);
        hf_session_table_free(c);
        hf_session_table_free(b);
    }
    assert_true(ok);
    hf_session_free(s);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_lines_same_as_csv),
        cmocka_unit_test(test_stiffness_same_as_csv_and_derivative),
        cmocka_unit_test(test_curve_identities),
        cmocka_unit_test(test_balance_rows),
        cmocka_unit_test(test_load_errors),
        cmocka_unit_test(test_set_get),
        cmocka_unit_test(test_warnings_and_failed_solves),
        cmocka_unit_test(test_no_memory),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
