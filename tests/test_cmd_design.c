/* test_cmd_design.c - 'holdfast design' end to end on the demo barge
 * (fictional, invented tables): the CSV's fixed columns (issue 14), one row
 * per environment and condition, exit statuses (0 pass, 1 a criterion
 * fails, 2 bad input), the one-line message, the caution, and located
 * errors for a bad table path. */
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

static const char *bin; /* $HF_BIN */
#define NEED_BIN() HF_TEST_NEED(bin)
static char dir[256];
static char out[1 << 17], err[1 << 14];
static hf_test_io io = {.out = out, .out_cap = sizeof out, .err = err, .err_cap = sizeof err};
static char barge[1024];

static int setup(void **state)
{
    (void)state;
    hf_test_root_path(barge, sizeof barge, "cases/barge.yaml");
    return hf_test_cli_setup(&bin, dir, sizeof dir, "cmd-design");
}

static int teardown(void **state)
{
    (void)state;
    return bin && hf_test_tmpdir_remove(dir) != 0 ? -1 : 0;
}

/* The barge's text with `from` replaced by `to` (once) and the table paths
 * made absolute, written to dir/name; the path into buf. */
static void barge_variant(const char *name, const char *from, const char *to, char *buf, size_t cap)
{
    char *text = hf_test_file_read(barge, NULL), tables[1024];
    assert_non_null(text);
    hf_test_root_path(tables, sizeof tables, "cases/barge/");
    size_t n = strlen(text) + 8192;
    char *res = malloc(n);
    assert_non_null(res);
    res[0] = '\0';
    const char *at = strstr(text, from);
    assert_non_null(at);
    for (const char *p = text; *p;) {
        if (p == at) {
            strcat(res, to);
            p += strlen(from);
        } else if (!strncmp(p, " barge/", 7)) {
            strcat(res, " ");
            strcat(res, tables);
            p += 7;
        } else {
            strncat(res, p, 1);
            p++;
        }
    }
    snprintf(buf, cap, "%s/%s", dir, name);
    hf_test_file_write(buf, res);
    free(res);
    free(text);
}

static void csv_rows_and_columns(void **state)
{
    (void)state;
    NEED_BIN();
    int rc = HF_TEST_RUN(&io, "design", barge, "--environment", "head-swell", "--csv", "-");
    if (rc != 0)
        fail_msg("exit %d: %s", rc, err);
    char *cur = out, *line = hf_test_line_next(&cur);
    const char *fixed = "environment,condition,status,mean_surge_m,mean_sway_m,mean_yaw_deg,"
                        "lf_period_surge_s,lf_period_sway_s,lf_sig_surge_m,lf_max_surge_m,"
                        "wf_sig_surge_m,wf_max_surge_m,lf_sig_sway_m,wf_sig_sway_m,"
                        "design_offset_m,max_tension_kN,max_tension_line,max_utilisation,passed";
    assert_non_null(line);
    assert_int_equal(strncmp(line, fixed, strlen(fixed)), 0);
    size_t rows = 0;
    while ((line = hf_test_line_next(&cur)) && line[0]) {
        char *f[80];
        size_t nf = hf_test_csv_split(line, f, 80);
        assert_true(nf > 19);
        assert_string_equal(f[0], "head-swell");
        assert_string_equal(f[2], "ok");
        if (rows == 0)
            assert_string_equal(f[1], "intact");
        else
            assert_int_equal(strncmp(f[1], "broken:", 7), 0);
        double mean = hypot(strtod(f[3], NULL), strtod(f[4], NULL));
        double design = strtod(f[14], NULL);
        assert_true(design >= mean);              /* the motions only add to the mean offset */
        assert_true(strtod(f[6], NULL) > 10.0);   /* slow-drift periods of a moored barge */
        assert_true(strtod(f[15], NULL) > 100.0); /* kN */
        assert_string_equal(f[18], "1");
        rows++;
    }
    assert_int_equal(rows, 9); /* intact + 8 lines broken */
    assert_non_null(strstr(err, "CAUTION"));
    assert_non_null(strstr(err, "transient motion of the"));
    assert_non_null(strstr(err, "second-order coupling"));
}

static void human_budget_and_file(void **state)
{
    (void)state;
    NEED_BIN();
    char csv[512];
    snprintf(csv, sizeof csv, "%s/d.csv", dir);
    int rc = HF_TEST_RUN(&io, "design", barge, "--environment", "harrowmere-storm", "--csv", csv);
    if (rc != 0)
        fail_msg("exit %d: %s", rc, err);
    assert_non_null(strstr(out, "LFmax+WFsig"));
    assert_non_null(strstr(out, "closed form 1 - 0.287 ln gamma"));
    assert_non_null(strstr(out, "design: 9 of 9 conditions passed"));
    assert_non_null(strstr(out, "line dynamics"));
    char *text = hf_test_file_read(csv, NULL);
    assert_non_null(text);
    assert_int_equal(strncmp(text, "environment,condition,status,", 29), 0);
    free(text);
}

static void failing_condition_exits_1(void **state)
{
    (void)state;
    NEED_BIN();
    char path[512];
    barge_variant("tight.yaml", "max_offset: 8 m", "max_offset: 3 m", path, sizeof path);
    int rc = HF_TEST_RUN(&io, "design", path, "--environment", "head-swell", "--csv", "-");
    assert_int_equal(rc, 1);
    /* one line naming the environment, the condition and the check */
    assert_non_null(strstr(err, "holdfast design: environment head-swell, broken:"));
    assert_non_null(strstr(err, "fails the offset limit: design offset"));
    assert_non_null(strstr(out, ",0,")); /* a row with passed 0 */
}

static void bad_input_exits_2(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&io, "design", barge, "--environment", "monsoon"), 2);
    assert_non_null(strstr(err, "no environment named \"monsoon\""));
    assert_non_null(strstr(err, "harrowmere-storm"));
    char path[512];
    barge_variant("badtab.yaml", "drift: barge/barge-drift.csv", "drift: nowhere/drift.csv", path,
                  sizeof path);
    assert_int_equal(HF_TEST_RUN(&io, "design", path), 2);
    assert_non_null(strstr(err, "badtab.yaml:"));
    assert_non_null(strstr(err, ": hull.drift: expected a drift table"));
    assert_non_null(strstr(err, "nowhere/drift.csv: cannot open"));
    char student[1024];
    hf_test_root_path(student, sizeof student, "cases/student.yaml");
    assert_int_equal(HF_TEST_RUN(&io, "design", student), 2);
    assert_non_null(strstr(err, "has no environments"));
    assert_int_equal(HF_TEST_RUN(&io, "design", "--help"), 0);
    assert_non_null(strstr(out, "usage: holdfast design CASE [--environment NAME] [--csv FILE|-]"));
    assert_int_equal(HF_TEST_RUN(&io, "design", barge, "--environment"), 2);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(csv_rows_and_columns), cmocka_unit_test(human_budget_and_file),
        cmocka_unit_test(failing_condition_exits_1), cmocka_unit_test(bad_input_exits_2)};
    return cmocka_run_group_tests(tests, setup, teardown);
}
