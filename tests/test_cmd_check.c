/* test_cmd_check.c - 'holdfast check' end to end: demo cases, malformed input, usage. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <cmocka.h>
#include "support.h"

static const char *bin; /* $HF_BIN: the built holdfast (set by make check) */
#define NEED_BIN() HF_TEST_NEED(bin)
static const char *root; /* $HF_ROOT: the repository */
static char dir[256];    /* scratch directory */
static char out[1 << 16], err[1 << 14];
static hf_test_io io = {.out = out, .out_cap = sizeof out, .err = err, .err_cap = sizeof err};

static int setup(void **state)
{
    (void)state;
    root = hf_test_root();
    return hf_test_cli_setup(&bin, dir, sizeof dir, "cmd-check");
}

static int teardown(void **state)
{
    (void)state;
    return bin && hf_test_tmpdir_remove(dir) != 0 ? -1 : 0;
}

static void demo_cases_are_valid(void **state)
{
    (void)state;
    NEED_BIN();
    const char *cases[] = {"barge.yaml", "marina.yaml", "student.yaml"};
    for (size_t i = 0; i < 3; i++) {
        char path[1024];
        snprintf(path, sizeof path, "%s/cases/%s", root, cases[i]);
        int rc = HF_TEST_RUN(&io, "check", path);
        if (rc != 0)
            fail_msg("check %s: exit %d, stderr: %s", cases[i], rc, err);
        assert_non_null(strstr(out, "the case is valid"));
        assert_non_null(strstr(out, "CAUTION"));
        assert_string_equal(err, "");
    }
    /* the barge uses wire: its approximate values are flagged, and the
     * derived chain MBL names its formula's source */
    char path[1024];
    snprintf(path, sizeof path, "%s/cases/barge.yaml", root);
    assert_int_equal(HF_TEST_RUN(&io, "check", path), 0);
    assert_non_null(strstr(out, "approximate"));
    assert_non_null(strstr(out, "DNV-OS-E302"));
    assert_non_null(strstr(out, "given in the case file"));
    assert_non_null(strstr(out, "8 lines"));
}

static void malformed_case_exits_2_with_location(void **state)
{
    (void)state;
    NEED_BIN();
    char path[320], want[512];
    snprintf(path, sizeof path, "%s/bad.yaml", dir);
    hf_test_file_write(path, "site: {depth: 85 m}\n"
                             "components:\n"
                             "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
                             "lines:\n"
                             "  - name: a\n"
                             "    anchor: [-500, 0]\n"
                             "    fairlead: [0, 0, -9]\n"
                             "    sections:\n"
                             "      - {component: chain76, length: 300 kN}\n");
    assert_int_equal(HF_TEST_RUN(&io, "check", path), 2);
    snprintf(want, sizeof want,
             "holdfast: %s:9:38: lines[0].sections[0].length: expected a length, got \"300 kN\"",
             path);
    if (strncmp(err, want, strlen(want)))
        fail_msg("stderr:\n%s\nexpected it to start with:\n%s", err, want);
    assert_string_equal(out, "");

    /* YAML syntax error */
    hf_test_file_write(path, "site: {depth: 85 m\n");
    assert_int_equal(HF_TEST_RUN(&io, "check", path), 2);
    snprintf(want, sizeof want, "holdfast: %s:2:1: YAML syntax:", path);
    if (strncmp(err, want, strlen(want)))
        fail_msg("stderr:\n%s\nexpected it to start with:\n%s", err, want);
}

/* Issue 13: a line too short to reach its anchor is valid input but gets a
 * warning with the strain it needs.  Fictional: 90 m of chain to an anchor
 * 461 m away in 48 m of water (fairlead 6 m down) at invented Brannock Cove.
 * Strain = hypot(461, 42) / 90 - 1 = 462.909 / 90 - 1 = 4.1434 (Pythagoras). */
static void short_line_warns_with_strain(void **state)
{
    (void)state;
    NEED_BIN();
    char path[320];
    snprintf(path, sizeof path, "%s/short.yaml", dir);
    hf_test_file_write(path, "title: Fictional short chain at Brannock Cove\n"
                             "site: {depth: 48 m}\n"
                             "components:\n"
                             "  chain: {type: studless_chain, grade: R3S, diameter: 52 mm}\n"
                             "lines:\n"
                             "  - name: stub\n"
                             "    anchor: [-461, 0]\n"
                             "    fairlead: [0, 0, -6]\n"
                             "    sections:\n"
                             "      - {component: chain, length: 90 m}\n");
    assert_int_equal(HF_TEST_RUN(&io, "check", path), 0);
    assert_non_null(strstr(out, "the case is valid"));
    if (!strstr(err, "holdfast check: warning: line stub must stretch 414.34 % to reach its "
                     "anchor (straight fairlead-anchor distance 462.9 m > unstretched length "
                     "90.0 m)\n"))
        fail_msg("stderr:\n%s", err);
}

static void usage_and_help(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&io, "check", "--help"), 0);
    assert_non_null(strstr(out, "usage: holdfast check CASE"));
    assert_int_equal(HF_TEST_RUN(&io, "check"), 2);
    assert_non_null(strstr(err, "missing the CASE file"));
    assert_int_equal(HF_TEST_RUN(&io, "check", "--frobnicate", "x.yaml"), 2);
    assert_non_null(strstr(err, "unknown option '--frobnicate'"));
    assert_int_equal(HF_TEST_RUN(&io, "check", "a.yaml", "b.yaml"), 2);
    assert_int_equal(HF_TEST_RUN(&io, "check", "/nonexistent/holdfast.yaml"), 2);
    assert_non_null(strstr(err, "holdfast: /nonexistent/holdfast.yaml: cannot open the case file"));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(demo_cases_are_valid),
        cmocka_unit_test(malformed_case_exits_2_with_location),
        cmocka_unit_test(short_line_warns_with_strain),
        cmocka_unit_test(usage_and_help),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
