/* test_shlib.c - the shared library as a user links it: this program is
 * linked against build/libholdfast.so (-lholdfast), not the static archive
 * (Makefile: the rule for $(BUILD)/test_shlib), and checks
 *   - that its hf_* functions really come from libholdfast.so.1 (dladdr);
 *   - that the library exports the public hf_* names and nothing else, each
 *     declared in a public header (include/holdfast/ minus cli.h);
 *   - loading a case from a string and from a file, the loader's located
 *     message, a parameter read and set by path (the paths of --vary), lines
 *     at a pose, the 6x6 stiffness, a restoring curve and a balance run,
 *     each against the command line's CSV ($HF_BIN, built from the archive)
 *     or a classical identity named beside the check;
 *   - that solves on separate workspaces of one shared model agree across
 *     threads (the thread-safety docs/library.md states). */
#define _GNU_SOURCE /* dladdr */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <ctype.h>
#include <dlfcn.h>
#include <math.h>
#include <pthread.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include "holdfast/analysis.h"
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"
#include "holdfast/status.h"
#include "support.h"

static const char *bin; /* $HF_BIN */
static char dir[256];   /* scratch directory */

#define OUT_CAP (1 << 18)
static char out[OUT_CAP];
static hf_test_io quiet = {.out = out, .out_cap = OUT_CAP};

static int setup(void **state)
{
    (void)state;
    /* The command lines below name the demo cases relative to the repository. */
    if (chdir(hf_test_root()) != 0)
        return -1;
    return hf_test_cli_setup(&bin, dir, sizeof dir, "shlib");
}

static int teardown(void **state)
{
    (void)state;
    hf_test_tmpdir_remove(dir);
    return 0;
}

/* Path of the shared object that defines the function at addr ("" if none). */
static const char *object_of(void *addr)
{
    Dl_info info;
    if (!dladdr(addr, &info) || !info.dli_fname)
        return "";
    return info.dli_fname;
}

static void test_functions_come_from_the_shared_library(void **state)
{
    (void)state;
    const char *a = object_of((void *)(uintptr_t)&hf_case_load);
    const char *b = object_of((void *)(uintptr_t)&hf_spread_stiffness);
    if (!strstr(a, "libholdfast.so.1"))
        fail_msg("hf_case_load comes from '%s', not libholdfast.so.1", a);
    assert_string_equal(a, b);
}

/* Text of every public header (include/holdfast/, cli.h excepted), malloc'd. */
static char *public_headers(void)
{
    char cmd[600], path[512];
    hf_test_root_path(path, sizeof path, "include/holdfast");
    snprintf(cmd, sizeof cmd, "ls '%s'/*.h | grep -v '/cli\\.h$' | xargs cat", path);
    FILE *p = popen(cmd, "r");
    HF_TEST_NEED(p);
    size_t cap = 1 << 20, n = 0;
    char *text = malloc(cap);
    assert_non_null(text);
    n = fread(text, 1, cap - 1, p);
    text[n] = '\0';
    assert_int_equal(pclose(p), 0);
    assert_true(n > 10000 && n < cap - 1);
    return text;
}

/* 1 when name is declared in text: a whole word followed by '(' (a
 * function) or by '[' or ';' (an object such as hf_caution_text). */
static int declared(const char *text, const char *name)
{
    size_t len = strlen(name);
    for (const char *s = strstr(text, name); s; s = strstr(s + 1, name)) {
        int word_start = s == text || !(s[-1] == '_' || isalnum((unsigned char)s[-1]));
        const char *e = s + len;
        while (*e == ' ' || *e == '\n')
            e++;
        if (word_start && (*e == '(' || *e == '[' || *e == ';'))
            return 1;
    }
    return 0;
}

/* nm -D --defined-only on the library this program loaded: every dynamic
 * symbol it defines is an hf_ function declared in a public header. */
static void test_exports_only_public_hf_names(void **state)
{
    (void)state;
    const char *so = object_of((void *)(uintptr_t)&hf_case_load);
    HF_TEST_NEED(strstr(so, "libholdfast.so"));
    char cmd[700];
    snprintf(cmd, sizeof cmd, "nm -D --defined-only '%s'", so);
    FILE *p = popen(cmd, "r");
    HF_TEST_NEED(p);
    char *headers = public_headers();
    char line[512], name[400];
    int total = 0, seen_load = 0, seen_stiff = 0, seen_set = 0;
    while (fgets(line, sizeof line, p)) {
        /* "ADDRESS TYPE NAME" */
        char type;
        if (sscanf(line, "%*s %c %399s", &type, name) != 2)
            fail_msg("nm line not understood: %s", line);
        total++;
        if (strncmp(name, "hf_", 3) != 0)
            fail_msg("libholdfast.so exports '%s' (type %c): only hf_* names are public", name,
                     type);
        if (strncmp(name, "hf_cli_", 7) == 0 || strncmp(name, "hf_cmd_", 7) == 0)
            fail_msg("libholdfast.so exports the program's '%s'", name);
        if (!declared(headers, name))
            fail_msg("libholdfast.so exports '%s', declared in no public header", name);
        seen_load += strcmp(name, "hf_case_load_buffer") == 0;
        seen_stiff += strcmp(name, "hf_spread_stiffness") == 0;
        seen_set += strcmp(name, "hf_model_param_set") == 0;
    }
    assert_int_equal(pclose(p), 0);
    free(headers);
    /* 297 hf_ functions when this test was written; the public API only grows. */
    if (total < 250)
        fail_msg("only %d exported symbols", total);
    assert_int_equal(seen_load + seen_stiff + seen_set, 3);
    /* The OpenMP lock of the allocator's critical section is internal. */
    assert_null(dlsym(RTLD_DEFAULT, ".gomp_critical_user_hf_alloc"));
}

/* ---- the command line's CSV ---- */

/* Runs $HF_BIN with args (NULL-terminated list) into out; asserts exit 0. */
#define RUN_CLI(...)                                                                               \
    do {                                                                                           \
        int rc_ = HF_TEST_RUN(&quiet, __VA_ARGS__);                                                \
        if (rc_ != 0)                                                                              \
            fail_msg("holdfast exited %d: %s", rc_, out);                                          \
    } while (0)

/* Value of column `col` in data row `row` (0 = first after the header) of
 * the CSV text csv; fails the test when either is missing. */
static double csv_value(const char *csv, size_t row, const char *col)
{
    static char copy[OUT_CAP];
    char *f[256];
    snprintf(copy, sizeof copy, "%s", csv);
    char *cur = copy, *line = hf_test_line_next(&cur);
    HF_TEST_NEED(line);
    size_t n = hf_test_csv_split(line, f, 256), k;
    for (k = 0; k < n && strcmp(f[k], col) != 0; k++)
        ;
    if (k == n)
        fail_msg("no column '%s' in the CSV", col);
    for (size_t r = 0; r <= row; r++)
        if (!(line = hf_test_line_next(&cur)) || !*line)
            fail_msg("no row %zu in the CSV", row);
    size_t m = hf_test_csv_split(line, f, 256);
    HF_TEST_NEED(k < m);
    char *end;
    double v = strtod(f[k], &end);
    if (end == f[k] || *end)
        fail_msg("row %zu, column '%s': '%s' is not a number", row, col, f[k]);
    return v;
}

/* The CSV prints 10 significant digits (%.10g): agreement to 2e-9 relative,
 * or `abs` absolute for values printed near zero (rounding noise). */
#define NEAR_PRINTED(lib, cli, abs) HF_TEST_ASSERT_NEAR((lib), (cli), fmax((abs), 2e-9 * fabs(cli)))

static void load_file(hf_model *m, const char *rel)
{
    char path[512];
    hf_error err;
    hf_test_root_path(path, sizeof path, rel);
    hf_model_init(m);
    if (hf_case_load(path, m, &err) != HF_OK)
        fail_msg("%s", err.text);
}

/* ---- loading ---- */

/* Fictional: a section length given as a force, at the invented Orrin Bay. */
static const char bad_case[] = "title: Fictional bad case, Orrin Bay\n"
                               "site: {depth: 48 m}\n"
                               "components:\n"
                               "  chain: {type: studless_chain, grade: R3S, diameter: 52 mm}\n"
                               "lines:\n"
                               "  - name: practice\n"
                               "    anchor: [-365, 0]\n"
                               "    fairlead: [0, 0, -6]\n"
                               "    sections: [{component: chain, length: 370 kN}]\n";

static void test_load_string_error_is_the_command_lines(void **state)
{
    (void)state;
    char path[512], cli[1024];
    snprintf(path, sizeof path, "%s/bad.yaml", dir);
    hf_test_file_write(path, bad_case);
    hf_test_io io = {.out = out, .out_cap = OUT_CAP, .err = cli, .err_cap = sizeof cli};
    assert_int_equal(HF_TEST_RUN(&io, "check", path), 2);
    hf_model m;
    hf_error err;
    hf_model_init(&m);
    assert_int_equal(hf_case_load_buffer(bad_case, strlen(bad_case), path, &m, &err), HF_EINVAL);
    assert_int_equal(err.status, HF_EINVAL);
    assert_int_equal(m.nlines, 0);
    /* The program prints "holdfast: " and the library's message. */
    char *nl = strchr(cli, '\n');
    HF_TEST_NEED(nl);
    *nl = '\0';
    HF_TEST_NEED(strncmp(cli, "holdfast: ", 10) == 0);
    assert_string_equal(err.text, cli + 10);
    char where[600];
    snprintf(where, sizeof where, "%s:9:43: ", path);
    if (strncmp(err.text, where, strlen(where)) != 0)
        fail_msg("message '%s' does not start with '%s'", err.text, where);
    hf_model_free(&m);
}

/* ---- one pose: lines and stiffness ---- */

static void test_lines_at_a_pose_match_the_cli(void **state)
{
    (void)state;
    hf_model m;
    load_file(&m, "cases/barge.yaml");
    RUN_CLI("lines", "cases/barge.yaml", "--offset", "3,-2,4", "--csv", "-");
    hf_analysis_pose a;
    hf_error err;
    hf_analysis_pose_init(&a);
    const double offset[3] = {3, -2, 4 * M_PI / 180}; /* --offset X,Y,HEADING_DEG */
    assert_int_equal(hf_analysis_pose_solve(&a, &m, offset, 0, &err), HF_OK);
    assert_int_equal(a.res.nlines, 8);
    for (size_t i = 0; i < m.nlines; i++) {
        const hf_line_state *s = &a.res.states[i];
        NEAR_PRINTED(s->tension / 1e3, csv_value(out, i, "fairlead_tension_kN"), 1e-9);
        NEAR_PRINTED(s->h / 1e3, csv_value(out, i, "fairlead_horizontal_kN"), 1e-9);
        NEAR_PRINTED(s->v / 1e3, csv_value(out, i, "fairlead_vertical_kN"), 1e-9);
        NEAR_PRINTED(s->grounded, csv_value(out, i, "grounded_m"), 1e-9);
        /* Pythagoras at the fairlead: T^2 = H^2 + V^2 (classical identity). */
        HF_TEST_ASSERT_NEAR(hypot(s->h, s->v), s->tension, 1e-9 * s->tension);
    }
    hf_analysis_pose_clear(&a);
    hf_model_free(&m);
}

static void test_stiffness_matches_the_cli_and_differences(void **state)
{
    (void)state;
    static const char *const rows[6] = {"surge", "sway", "heave", "roll", "pitch", "yaw"};
    hf_model m;
    load_file(&m, "cases/barge.yaml");
    RUN_CLI("stiffness", "cases/barge.yaml", "--offset", "2,1,1", "--csv", "-");
    hf_analysis_pose a;
    hf_error err;
    hf_analysis_pose_init(&a);
    const double offset[3] = {2, 1, M_PI / 180};
    assert_int_equal(hf_analysis_pose_solve(&a, &m, offset, 1, &err), HF_OK);
    double kmax = 0;
    for (int i = 0; i < 6; i++)
        for (int j = 0; j < 6; j++)
            kmax = fmax(kmax, fabs(a.K[i][j]));
    for (int i = 0; i < 6; i++)
        for (int j = 0; j < 6; j++)
            NEAR_PRINTED(a.K[i][j] / 1e3, csv_value(out, (size_t)i, rows[j]), 1e-9 * kmax / 1e3);
    /* K = -dF/dq (spread.h): central difference in surge, step 1 mm. */
    hf_spread *ws = hf_spread_alloc(&m, &err);
    assert_non_null(ws);
    hf_pose p = a.pose;
    hf_spread_result r;
    double fp[6], fm[6];
    p.surge += 1e-3;
    assert_int_equal(hf_spread_solve(ws, &p, &r, &err), HF_OK);
    memcpy(fp, r.force, sizeof fp);
    p.surge -= 2e-3;
    assert_int_equal(hf_spread_solve(ws, &p, &r, &err), HF_OK);
    memcpy(fm, r.force, sizeof fm);
    double ktrans = fmax(fabs(a.K[0][0]), fmax(fabs(a.K[1][1]), fabs(a.K[2][2])));
    for (int i = 0; i < 3; i++)
        HF_TEST_ASSERT_NEAR(-(fp[i] - fm[i]) / 2e-3, a.K[i][0], 1e-5 * ktrans);
    hf_spread_free(ws);
    hf_analysis_pose_clear(&a);
    hf_model_free(&m);
}

/* ---- a parameter by path ---- */

static void test_parameter_by_path(void **state)
{
    (void)state;
    const char *path = "lines[practice].sections[0].length";
    hf_model m;
    load_file(&m, "cases/student.yaml");
    RUN_CLI("sweep", "cases/student.yaml", "--vary", "lines[practice].sections[0].length=375",
            "--csv", "-");
    hf_param p;
    hf_error err;
    double v = 0;
    assert_int_equal(hf_model_param_lookup(&m, path, &p, &err), HF_OK);
    assert_int_equal(hf_model_param_get(&m, &p, &v, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(v, 370.0, 0); /* cases/student.yaml: length: 370 m */
    assert_int_equal(hf_model_param_set(&m, &p, 375.0, &err), HF_OK);
    /* A bad value is refused and leaves the model as it was. */
    assert_int_equal(hf_model_param_set(&m, &p, -12.5, &err), HF_EINVAL);
    assert_true(strstr(err.text, "length") != NULL);
    assert_int_equal(hf_model_param_get(&m, &p, &v, &err), HF_OK);
    HF_TEST_ASSERT_NEAR(v, 375.0, 0);
    /* An unknown path is refused with a message. */
    hf_param q;
    assert_int_equal(hf_model_param_lookup(&m, "lines[nowhere].sections[0].length", &q, &err),
                     HF_EINVAL);
    assert_true(strstr(err.text, "nowhere") != NULL);

    hf_analysis_pose a;
    hf_analysis_pose_init(&a);
    const double zero[3] = {0, 0, 0};
    assert_int_equal(hf_analysis_pose_solve(&a, &m, zero, 1, &err), HF_OK);
    const hf_line_state *s = &a.res.states[0];
    NEAR_PRINTED(s->tension / 1e3, csv_value(out, 0, "T_practice_kN"), 1e-9);
    NEAR_PRINTED(a.K[0][0] / 1e3, csv_value(out, 0, "stiffness_surge_kN_per_m"), 1e-9);
    /* Elastic catenary from the touchdown point, where the line leaves the
     * seabed horizontally (Irvine 1981, "Cable Structures", ch. 2; this form
     * from memory): the suspended part carries V = w s, and the fairlead
     * height above the seabed is z = H/w (sqrt(1 + (V/H)^2) - 1) + V^2 / (2 w EA). */
    const hf_section *sec = &m.lines[0].line.sec[0];
    double w = sec->weight, h = s->h, vv = s->v;
    assert_int_equal(s->regime, HF_LINE_TOUCHDOWN);
    HF_TEST_ASSERT_NEAR(vv, w * (375.0 - s->grounded), 1e-8 * vv);
    double z = h / w * (sqrt(1 + (vv / h) * (vv / h)) - 1) + vv * vv / (2 * w * sec->ea);
    HF_TEST_ASSERT_NEAR(z, 48.0 - 6.0, 1e-6); /* depth 48 m, fairlead 6 m below the surface */
    hf_analysis_pose_clear(&a);
    hf_model_free(&m);
}

/* ---- restoring curve and balance ---- */

static void test_curve_matches_the_cli(void **state)
{
    (void)state;
    hf_model m;
    load_file(&m, "cases/barge.yaml");
    RUN_CLI("curve", "cases/barge.yaml", "--direction", "30", "--range", "-10:10:2.5", "--csv",
            "-");
    hf_error err;
    hf_analysis_curve *c = hf_analysis_curve_alloc(&m, 9, &err);
    assert_non_null(c);
    assert_int_equal(hf_analysis_curve_compute(c, &m, 30 * M_PI / 180, -10, 10, 2.5, &err), HF_OK);
    assert_int_equal(c->nfailed, 0);
    for (size_t k = 0; k < c->n; k++) {
        NEAR_PRINTED(c->offset[k], csv_value(out, k, "offset_m"), 1e-12);
        NEAR_PRINTED(c->restoring[k] / 1e3, csv_value(out, k, "restoring_kN"), 1e-9);
        NEAR_PRINTED(c->stiffness[k] / 1e3, csv_value(out, k, "stiffness_kN_per_m"), 1e-9);
        NEAR_PRINTED(c->max_tension[k] / 1e3, csv_value(out, k, "max_tension_kN"), 1e-9);
        NEAR_PRINTED(c->fairlead_tension[k * c->nlines] / 1e3, csv_value(out, k, "T_bow-port-a_kN"),
                     1e-9);
    }
    hf_analysis_curve_free(c);
    hf_model_free(&m);
}

static void test_balance_matches_the_cli(void **state)
{
    (void)state;
    hf_model m;
    load_file(&m, "cases/barge.yaml");
    RUN_CLI("balance", "cases/barge.yaml", "--csv", "-");
    hf_error err;
    hf_balance *b = hf_balance_alloc(&m, &err);
    assert_non_null(b);
    HF_TEST_NEED(m.nloads >= 1);
    assert_int_equal(hf_balance_run(b, &m.loads[0], &err), HF_OK);
    size_t ncond = hf_balance_ncond(b);
    assert_int_equal(ncond, 1 + m.nlines);
    for (size_t k = 0; k < ncond; k++) {
        const hf_balance_result *r = hf_balance_result_at(b, k);
        assert_non_null(r);
        assert_int_equal(r->status, HF_OK);
        NEAR_PRINTED(r->offset[0], csv_value(out, k, "surge_m"), 1e-9);
        NEAR_PRINTED(r->offset[1], csv_value(out, k, "sway_m"), 1e-9);
        NEAR_PRINTED(r->offset[2] * 180 / M_PI, csv_value(out, k, "yaw_deg"), 1e-9);
        NEAR_PRINTED(r->max_tension / 1e3, csv_value(out, k, "max_tension_kN"), 1e-9);
        /* Equilibrium: the residual (mooring + load) is the solver's
         * tolerance, far below the load itself. */
        double load = hypot(r->load[0], r->load[1]);
        assert_true(hypot(r->residual[0], r->residual[1]) <= 1e-6 * load);
    }
    hf_balance_free(b);
    hf_model_free(&m);
}

/* ---- threads: one shared model, one workspace each ---- */

typedef struct {
    const hf_model *m;
    double offset[3];
    double force[6];
    hf_status status;
} job;

static void *solve_job(void *arg)
{
    job *j = arg;
    hf_analysis_pose a;
    hf_error err;
    hf_analysis_pose_init(&a);
    j->status = hf_analysis_pose_solve(&a, j->m, j->offset, 1, &err);
    memcpy(j->force, a.res.force, sizeof j->force);
    hf_analysis_pose_clear(&a);
    return NULL;
}

static void test_workspaces_on_threads_agree(void **state)
{
    (void)state;
    enum { N = 4 };
    hf_model m;
    load_file(&m, "cases/barge.yaml");
    job par[N], ser[N];
    pthread_t t[N];
    for (int k = 0; k < N; k++) {
        par[k] = (job){.m = &m, .offset = {1.25 * k - 2.1, 0.7 * k, 0.01 * k}};
        ser[k] = par[k];
    }
    for (int k = 0; k < N; k++)
        assert_int_equal(pthread_create(&t[k], NULL, solve_job, &par[k]), 0);
    for (int k = 0; k < N; k++)
        assert_int_equal(pthread_join(t[k], NULL), 0);
    for (int k = 0; k < N; k++) {
        solve_job(&ser[k]);
        assert_int_equal(par[k].status, HF_OK);
        assert_int_equal(ser[k].status, HF_OK);
        assert_memory_equal(par[k].force, ser[k].force, sizeof par[k].force);
    }
    hf_model_free(&m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_functions_come_from_the_shared_library),
        cmocka_unit_test(test_exports_only_public_hf_names),
        cmocka_unit_test(test_load_string_error_is_the_command_lines),
        cmocka_unit_test(test_lines_at_a_pose_match_the_cli),
        cmocka_unit_test(test_stiffness_matches_the_cli_and_differences),
        cmocka_unit_test(test_parameter_by_path),
        cmocka_unit_test(test_curve_matches_the_cli),
        cmocka_unit_test(test_balance_matches_the_cli),
        cmocka_unit_test(test_workspaces_on_threads_agree),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
