/* test_cmd_check.c - 'holdfast check' end to end: demo cases, malformed input, usage. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>
#include <cmocka.h>

static const char *bin;  /* $HF_BIN: the built holdfast (set by make check) */
static const char *root; /* $HF_ROOT: the repository */
static char dir[64];     /* scratch directory */
static char out[1 << 16], err[1 << 14];

static int setup(void **state)
{
    (void)state;
    bin = getenv("HF_BIN");
    root = getenv("HF_ROOT");
    if (!root || !root[0])
        root = ".";
    if (!bin || !bin[0] || access(bin, X_OK) != 0) {
        bin = NULL;
        return 0;
    }
    snprintf(dir, sizeof dir, "/tmp/hf-cmd-check-XXXXXX");
    return mkdtemp(dir) ? 0 : -1;
}

static int teardown(void **state)
{
    (void)state;
    if (bin && dir[0]) {
        char cmd[128];
        snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
        if (system(cmd) != 0)
            return -1;
    }
    return 0;
}

#define NEED_BIN()                                                                                 \
    do {                                                                                           \
        if (!bin)                                                                                  \
            skip();                                                                                \
    } while (0)

static void slurp(const char *path, char *buf, size_t cap)
{
    FILE *f = fopen(path, "rb");
    size_t n = 0;
    if (f) {
        n = fread(buf, 1, cap - 1, f);
        fclose(f);
    }
    buf[n] = '\0';
}

/* Runs `holdfast ARGS` (ARGS already shell-quoted), capturing stdout and
 * stderr; returns the exit status. */
static int run(const char *args)
{
    char cmd[2048], o[128], e[128];
    snprintf(o, sizeof o, "%s/out.txt", dir);
    snprintf(e, sizeof e, "%s/err.txt", dir);
    snprintf(cmd, sizeof cmd, "'%s' %s >'%s' 2>'%s'", bin, args, o, e);
    int st = system(cmd);
    slurp(o, out, sizeof out);
    slurp(e, err, sizeof err);
    return WIFEXITED(st) ? WEXITSTATUS(st) : -1;
}

static void demo_cases_are_valid(void **state)
{
    (void)state;
    NEED_BIN();
    const char *cases[] = {"barge.yaml", "marina.yaml", "student.yaml"};
    for (size_t i = 0; i < 3; i++) {
        char args[1024];
        snprintf(args, sizeof args, "check '%s/cases/%s'", root, cases[i]);
        int rc = run(args);
        if (rc != 0)
            fail_msg("check %s: exit %d, stderr: %s", cases[i], rc, err);
        assert_non_null(strstr(out, "the case is valid"));
        assert_non_null(strstr(out, "CAUTION"));
        assert_string_equal(err, "");
    }
    /* the barge uses wire: its approximate values are flagged, and the
     * derived chain MBL names its formula's source */
    char args[1024];
    snprintf(args, sizeof args, "check '%s/cases/barge.yaml'", root);
    assert_int_equal(run(args), 0);
    assert_non_null(strstr(out, "approximate"));
    assert_non_null(strstr(out, "DNV-OS-E302"));
    assert_non_null(strstr(out, "given in the case file"));
    assert_non_null(strstr(out, "8 lines"));
}

static void malformed_case_exits_2_with_location(void **state)
{
    (void)state;
    NEED_BIN();
    char path[128], args[256], want[256];
    snprintf(path, sizeof path, "%s/bad.yaml", dir);
    FILE *f = fopen(path, "w");
    assert_non_null(f);
    fputs("site: {depth: 85 m}\n"
          "components:\n"
          "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
          "lines:\n"
          "  - name: a\n"
          "    anchor: [-500, 0]\n"
          "    fairlead: [0, 0, -9]\n"
          "    sections:\n"
          "      - {component: chain76, length: 300 kN}\n",
          f);
    fclose(f);
    snprintf(args, sizeof args, "check '%s'", path);
    assert_int_equal(run(args), 2);
    snprintf(want, sizeof want,
             "holdfast: %s:9:38: lines[0].sections[0].length: expected a length, got \"300 kN\"",
             path);
    if (strncmp(err, want, strlen(want)))
        fail_msg("stderr:\n%s\nexpected it to start with:\n%s", err, want);
    assert_string_equal(out, "");

    /* YAML syntax error */
    f = fopen(path, "w");
    assert_non_null(f);
    fputs("site: {depth: 85 m\n", f);
    fclose(f);
    assert_int_equal(run(args), 2);
    snprintf(want, sizeof want, "holdfast: %s:2:1: YAML syntax:", path);
    if (strncmp(err, want, strlen(want)))
        fail_msg("stderr:\n%s\nexpected it to start with:\n%s", err, want);
}

static void usage_and_help(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(run("check --help"), 0);
    assert_non_null(strstr(out, "usage: holdfast check CASE"));
    assert_int_equal(run("check"), 2);
    assert_non_null(strstr(err, "expected a CASE file"));
    assert_int_equal(run("check --frobnicate x.yaml"), 2);
    assert_non_null(strstr(err, "unknown option '--frobnicate'"));
    assert_int_equal(run("check a.yaml b.yaml"), 2);
    assert_int_equal(run("check /nonexistent/holdfast.yaml"), 2);
    assert_non_null(strstr(err, "holdfast: /nonexistent/holdfast.yaml: cannot open the case file"));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(demo_cases_are_valid),
        cmocka_unit_test(malformed_case_exits_2_with_location),
        cmocka_unit_test(usage_and_help),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
