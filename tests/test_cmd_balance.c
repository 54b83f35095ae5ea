/* test_cmd_balance.c - end-to-end 'holdfast balance' runs ($HF_BIN): report, CSV, exit statuses. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <fcntl.h>
#include <sys/wait.h>
#include <unistd.h>
#include "support.h"

static const char *bin; /* $HF_BIN */
#define NEED_BIN() HF_TEST_NEED(bin)
static char dir[256]; /* scratch directory */
static char pass_case[320], fail_case[320], tight_case[320], noeq_case[320];

#define OUT_CAP (1 << 18)
static char out[OUT_CAP];
static hf_test_io both = {.out = out, .out_cap = OUT_CAP, .merge = 1}; /* as 2>&1 */
static hf_test_io quiet = {.out = out, .out_cap = OUT_CAP};            /* stderr dropped */

/* Fictional scenario: the ferry pontoon "Lathe Point" of the invented harbour
 * of Ormsby Wick on four chains (all names and numbers invented).  The
 * chain is a custom component; the criteria are the UFC 4-159-03 harbour
 * preset (3.0 intact from table 3-7; 2.25 one member missing, from memory:
 * not in table 3-7). */
#define PONTOON_LINES                                                                              \
    "site:\n  depth: 18.4 m\n"                                                                     \
    "components:\n"                                                                                \
    "  ch: {type: custom, wet_weight: 0.412 kN/m, axial_stiffness: 215 MN,\n"                      \
    "       breaking_load: 1.38 MN, seabed_friction: 0.7}\n"                                       \
    "lines:\n"                                                                                     \
    "  - {name: ne, anchor: [131.5, 92.0], fairlead: [14.5, 6.2, -0.8],\n"                         \
    "     sections: [{component: ch, length: 148.0 m}]}\n"                                         \
    "  - {name: nw, anchor: [-131.5, 92.0], fairlead: [-14.5, 6.2, -0.8],\n"                       \
    "     sections: [{component: ch, length: 148.0 m}]}\n"                                         \
    "  - {name: sw, anchor: [-131.5, -92.0], fairlead: [-14.5, -6.2, -0.8],\n"                     \
    "     sections: [{component: ch, length: 148.0 m}]}\n"                                         \
    "  - {name: se, anchor: [131.5, -92.0], fairlead: [14.5, -6.2, -0.8],\n"                       \
    "     sections: [{component: ch, length: 148.0 m}]}\n"                                         \
    "hull:\n  position: [0, 0]\n  heading: 0 deg\n"

static const char pass_text[] =
    "title: Fictional ferry pontoon Lathe Point, Ormsby Wick\n" PONTOON_LINES "loads:\n"
    "  - name: breeze\n"
    "    wind: {speed: 14.5 m/s, direction: 90 deg, coefficient: 1.1, area: 96 m^2}\n"
    "  - name: ebb\n"
    "    force: 6.25 kN\n"
    "    direction: 200 deg\n"
    "criteria:\n  preset: ufc-4-159-03\n  max_offset: 25 m\n";

/* The same with a load that breaks the UFC factor (exit 1). */
static const char fail_text[] =
    "title: Fictional ferry pontoon Lathe Point, storm check\n" PONTOON_LINES "loads:\n"
    "  - name: storm\n"
    "    force: 760 kN\n"
    "    direction: 0 deg\n"
    "criteria:\n  preset: ufc-4-159-03\n";

/* A small load with an offset limit far too tight (exit 1 from the offset). */
static const char tight_text[] =
    "title: Fictional ferry pontoon Lathe Point, gangway check\n" PONTOON_LINES "loads:\n"
    "  - name: ebb\n"
    "    force: 6.25 kN\n"
    "    direction: 200 deg\n"
    "criteria:\n  max_offset: 0.01 m\n";

/* A load far beyond what four such chains can hold (exit 3). */
static const char noeq_text[] =
    "title: Fictional ferry pontoon Lathe Point, impossible load\n" PONTOON_LINES "loads:\n"
    "  - name: absurd\n"
    "    force: 900 MN\n"
    "    direction: 0 deg\n";

static int setup(void **state)
{
    (void)state;
    if (hf_test_cli_setup(&bin, dir, sizeof dir, "cmd-balance") != 0)
        return -1;
    if (!bin)
        return 0;
    snprintf(pass_case, sizeof pass_case, "%s/pass.yaml", dir);
    snprintf(fail_case, sizeof fail_case, "%s/fail.yaml", dir);
    snprintf(tight_case, sizeof tight_case, "%s/tight.yaml", dir);
    snprintf(noeq_case, sizeof noeq_case, "%s/noeq.yaml", dir);
    hf_test_file_write(pass_case, pass_text);
    hf_test_file_write(fail_case, fail_text);
    hf_test_file_write(tight_case, tight_text);
    hf_test_file_write(noeq_case, noeq_text);
    return 0;
}

static int teardown(void **state)
{
    (void)state;
    return bin && hf_test_tmpdir_remove(dir) != 0 ? -1 : 0;
}

static void test_pass_report(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case), 0);
    assert_non_null(strstr(out, "CAUTION"));
    assert_non_null(strstr(out, "ufc-4-159-03"));
    assert_non_null(strstr(out, "table 3-7"));
    assert_non_null(strstr(out, "-- intact"));
    assert_non_null(strstr(out, "-- broken:ne"));
    assert_non_null(strstr(out, "-- broken:se"));
    assert_null(strstr(out, "FAIL"));
    /* wind 1/2 x 1.225 x 1.1 x 96 x 14.5^2 = 13.6 kN toward 90 deg (drag law, hand calculation) */
    assert_non_null(strstr(out, "13.6 kN toward 90.0 deg"));
    /* the caution comes with each load case's results */
    const char *first = strstr(out, "CAUTION"), *second = first ? strstr(first + 1, "CAUTION") : 0;
    assert_non_null(second);
}

static void test_pass_csv(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", pass_case, "--csv", "-"), 0);
    char *cur = out, *line = hf_test_line_next(&cur);
    assert_non_null(line);
    const char *head = "load,condition,water_level_m,status,surge_m,sway_m,yaw_deg,max_tension_kN,"
                       "max_tension_line,max_utilisation,criterion,passed,Tmax_ne_kN,Tmax_nw_kN,"
                       "Tmax_sw_kN,Tmax_se_kN,";
    assert_memory_equal(line, head, strlen(head));
    /* 2 loads x (intact + 4 broken) rows, in order */
    static const char *const cond[5] = {"intact", "broken:ne", "broken:nw", "broken:sw",
                                        "broken:se"};
    for (int k = 0; k < 2; k++)
        for (int c = 0; c < 5; c++) {
            line = hf_test_line_next(&cur);
            assert_non_null(line);
            char *f[64];
            assert_true(hf_test_csv_split(line, f, 64) >= 15);
            assert_string_equal(f[0], k == 0 ? "breeze" : "ebb");
            assert_string_equal(f[1], cond[c]);
            assert_string_equal(f[2], "0"); /* site.water_level, the default 0 */
            assert_string_equal(f[3], "ok");
            assert_string_equal(f[11], "1");
            if (c > 0) /* the broken line carries nothing */
                assert_float_equal(strtod(f[11 + c], NULL), 0.0, 0.0);
            if (k == 0 && c == 0) {
                /* wind toward +y on a hull symmetric about y: sway only */
                assert_true(strtod(f[5], NULL) > 0.0);
                assert_float_equal(strtod(f[4], NULL), 0.0, 1e-6);
                assert_float_equal(strtod(f[6], NULL), 0.0, 1e-6);
                /* >= 8 significant digits in the CSV */
                assert_true(strlen(f[7]) >= 9);
            }
        }
    assert_null(hf_test_line_next(&cur));
}

static void test_load_selection_and_file(void **state)
{
    (void)state;
    NEED_BIN();
    char csv[400];
    snprintf(csv, sizeof csv, "%s/ebb.csv", dir);
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", pass_case, "--load", "ebb", "--csv", csv), 0);
    assert_non_null(strstr(out, "CAUTION"));
    assert_null(strstr(out, "breeze"));
    FILE *f = fopen(csv, "r");
    assert_non_null(f);
    int rows = 0, c;
    while ((c = fgetc(f)) != EOF)
        rows += c == '\n';
    fclose(f);
    assert_int_equal(rows, 1 + 5);
}

static void test_criterion_fails(void **state)
{
    (void)state;
    NEED_BIN();
    /* 760 kN toward +x.  Hand bound (statics): the two -x chains (nw, sw)
     * hold it at cos = 117 / hypot(117, 85.8) = 0.806 to the x axis (the
     * hull moves a few metres, which changes this by < 1 %), and the slack
     * +x chains pull the same way as the load, so each carries
     * H >= 760 / (2 x 0.806 x 1.01) = 467 kN and T >= H: MBL/T <= 1380 / 467
     * = 2.96 < 3.0, the UFC 4-159-03 intact factor (table 3-7).  Exit 1. */
    assert_int_equal(HF_TEST_RUN(&both, "balance", fail_case), 1);
    assert_non_null(strstr(out, "verdict: FAIL (governing: line_factor:"));
    assert_non_null(strstr(out, "CAUTION"));
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", fail_case, "--csv", "-"), 1);
    char *cur = out, *line = hf_test_line_next(&cur);
    line = hf_test_line_next(&cur);
    assert_non_null(line);
    char *f[64];
    assert_true(hf_test_csv_split(line, f, 64) >= 15);
    assert_string_equal(f[1], "intact");
    assert_true(!strcmp(f[10], "line_factor:nw") || !strcmp(f[10], "line_factor:sw"));
    assert_string_equal(f[11], "0");
    double t = strtod(f[7], NULL);
    assert_true(t >= 467.0 && 1380.0 / t < 3.0);
    /* the tight offset limit always fails, intact included */
    assert_int_equal(HF_TEST_RUN(&both, "balance", tight_case), 1);
    assert_non_null(strstr(out, "offset limit"));
    assert_non_null(strstr(out, "verdict: FAIL (governing: offset)"));
    assert_non_null(strstr(out, "CAUTION"));
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", tight_case, "--csv", "-"), 1);
    assert_non_null(strstr(out, "ebb,intact,0,ok,"));
    assert_non_null(strstr(out, ",offset,0,"));
}

static void test_no_equilibrium_exit(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&both, "balance", noeq_case), 3);
    assert_non_null(strstr(out, "no equilibrium"));
    assert_non_null(strstr(out, "CAUTION"));
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", noeq_case, "--csv", "-"), 3);
    assert_non_null(strstr(out, "absurd,intact,0,no equilibrium,,,,,,,equilibrium,0,"));
}

/* The pontoon with a pile at ne and a gravity block at nw (invented). */
static const char anchors_text[] =
    "title: Fictional ferry pontoon Lathe Point, block and pile anchors\n"
    "site:\n  depth: 18.4 m\n"
    "components:\n"
    "  ch: {type: custom, wet_weight: 0.412 kN/m, axial_stiffness: 215 MN,\n"
    "       breaking_load: 1.38 MN, seabed_friction: 0.7}\n"
    "lines:\n"
    "  - {name: ne, anchor: [131.5, 92.0], fairlead: [14.5, 6.2, -0.8], anchor_kind: pile,\n"
    "     sections: [{component: ch, length: 148.0 m}]}\n"
    "  - {name: nw, anchor: [-131.5, 92.0], fairlead: [-14.5, 6.2, -0.8], anchor_kind: gravity,\n"
    "     block_weight: 150 kN, block_friction: 0.45,\n"
    "     sections: [{component: ch, length: 148.0 m}]}\n"
    "  - {name: sw, anchor: [-131.5, -92.0], fairlead: [-14.5, -6.2, -0.8],\n"
    "     sections: [{component: ch, length: 148.0 m}]}\n"
    "  - {name: se, anchor: [131.5, -92.0], fairlead: [14.5, -6.2, -0.8],\n"
    "     sections: [{component: ch, length: 148.0 m}]}\n"
    "loads:\n"
    "  - {name: ebb, force: 42.5 kN, direction: 200 deg}\n";

static void test_anchor_kinds_report(void **state)
{
    (void)state;
    NEED_BIN();
    char path[400];
    snprintf(path, sizeof path, "%s/anchors.yaml", dir);
    hf_test_file_write(path, anchors_text);
    /* With ne broken the hull drifts away from it, loading nw, and the light block
     * there slides (factor below 1): exit 1, governed by that anchor. */
    assert_int_equal(HF_TEST_RUN(&both, "balance", path), 1);
    assert_non_null(strstr(out, "verdict: FAIL (governing: anchor:nw)"));
    /* intact block of nw: the report's factors agree with the statics
     * mu (W - V) / H and W / V (REFERENCE.md section 4) from its own H and V */
    char *p = strstr(out, "\n    nw                 gravity");
    assert_non_null(p);
    double h, v, ang, slide, lift;
    assert_int_equal(sscanf(p, " nw gravity %lf %lf %lf sliding %lf, uplift %lf", &h, &v, &ang,
                            &slide, &lift) >= 4,
                     1);
    assert_true(h > 1.0);
    assert_float_equal(slide, 0.45 * (150.0 - v) / h, 0.001 + 0.05 / h * slide);
    /* the pile is reported, not judged */
    p = strstr(out, "\n    ne                 pile");
    assert_non_null(p);
    assert_non_null(strstr(p, "reported only"));
}

static void test_usage_errors(void **state)
{
    (void)state;
    NEED_BIN();
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--load", "gale"), 2);
    assert_non_null(strstr(out, "breeze"));
    assert_non_null(strstr(out, "ebb"));
    assert_int_equal(HF_TEST_RUN(&both, "balance"), 2);
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--frobnicate"), 2);
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--load"), 2);
    char missing[320], nodir[320];
    snprintf(missing, sizeof missing, "%s/missing.yaml", dir);
    snprintf(nodir, sizeof nodir, "%s/no/such/dir/x.csv", dir);
    assert_int_equal(HF_TEST_RUN(&both, "balance", missing), 2);
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--csv", nodir), 2);
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", "--help"), 0);
    assert_non_null(strstr(out, "usage: holdfast balance"));
}

/* Runs $HF_BIN with args (NULL-terminated) and standard output on
 * /dev/full (every write fails with ENOSPC); returns the exit status. */
static int run_to_full(const char *const *args)
{
    const char *argv[16] = {bin};
    size_t n = 1;
    for (; args[n - 1] && n < 15; n++)
        argv[n] = args[n - 1];
    argv[n] = NULL;
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int fd = open("/dev/full", O_WRONLY), nul = open("/dev/null", O_WRONLY);
        if (fd < 0 || nul < 0)
            _exit(126);
        dup2(fd, 1);
        dup2(nul, 2);
        execv(bin, (char *const *)argv);
        _exit(127);
    }
    int st;
    assert_true(waitpid(pid, &st, 0) == pid);
    return WIFEXITED(st) ? WEXITSTATUS(st) : -1;
}

/* Issue 12 item 8: a write error on standard output is exit 2, never 0 (or
 * 1): before the fix every one of these exited 0 (balance 1) with the
 * output lost. */
static void test_stdout_write_errors(void **state)
{
    (void)state;
    NEED_BIN();
    const char *const cmds[][8] = {
        {"balance", pass_case, NULL},
        {"balance", fail_case, "--csv", "-", NULL},
        {"lines", pass_case, NULL},
        {"stiffness", pass_case, "--csv", "-", NULL},
        {"curve", pass_case, "--direction", "30", "--range", "0:4:2", NULL},
        {"check", pass_case, NULL},
        {"--help", NULL},
    };
    for (size_t i = 0; i < sizeof cmds / sizeof cmds[0]; i++) {
        int rc = run_to_full(cmds[i]);
        if (rc != 2)
            fail_msg("holdfast %s ... > /dev/full: exit %d, expected 2", cmds[i][0], rc);
    }
}

/* Issue 12 items 10 and 17: an output that is the case file is refused and
 * the case is left as it was; a misspelt load name gets a suggestion. */
static void test_output_is_input_and_suggestion(void **state)
{
    (void)state;
    NEED_BIN();
    size_t n0, n1;
    char *before = hf_test_file_read(pass_case, &n0);
    char alias[400];
    snprintf(alias, sizeof alias, "%s/./%s", dir, strrchr(pass_case, '/') + 1);
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--csv", alias), 2);
    assert_non_null(strstr(out, "same file"));
    assert_int_equal(HF_TEST_RUN(&both, "lines", pass_case, "--csv", pass_case), 2);
    char *after = hf_test_file_read(pass_case, &n1);
    assert_int_equal(n0, n1);
    assert_memory_equal(before, after, n0);
    free(after);
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--load", "breze"), 2);
    assert_non_null(strstr(out, "did you mean \"breeze\""));
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--load", "hurricane"), 2);
    assert_null(strstr(out, "did you mean"));
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case, "--csv="), 2);
    assert_non_null(strstr(out, "empty name"));
    /* every command that writes a CSV: refused before anything is printed */
    assert_int_equal(HF_TEST_RUN(&both, "invert", pass_case, "--vary",
                                 "lines[ne].sections[0].length=140:150", "--target",
                                 "fairlead_tension:ne=20kN", "--csv="),
                     2);
    assert_true(strncmp(out, "holdfast invert: --csv", 22) == 0);
    assert_int_equal(HF_TEST_RUN(&both, "curve", pass_case, "--direction", "10", "--range", "0:1:1",
                                 "--csv", alias),
                     2);
    assert_int_equal(HF_TEST_RUN(&both, "plot", pass_case, "--figure", "plan", "--out", alias), 2);
    after = hf_test_file_read(pass_case, &n1);
    assert_int_equal(n0, n1);
    assert_memory_equal(before, after, n0);
    free(before);
    free(after);
}

/* Issue 12 item 13: a balance run shows its progress on a terminal
 * (standard error a terminal, standard output redirected): the bar ends
 * with every condition counted.  In a file it stays silent. */
static void test_progress_on_terminal(void **state)
{
    (void)state;
    NEED_BIN();
    int master = posix_openpt(O_RDWR | O_NOCTTY);
    assert_true(master >= 0);
    assert_int_equal(grantpt(master), 0);
    assert_int_equal(unlockpt(master), 0);
    char *slave_name = ptsname(master);
    assert_non_null(slave_name);
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int slave = open(slave_name, O_RDWR), nul = open("/dev/null", O_WRONLY);
        dup2(nul, 1);
        dup2(slave, 2);
        execl(bin, bin, "balance", pass_case, (char *)NULL);
        _exit(127);
    }
    static char buf[1 << 16];
    size_t n = 0;
    for (;;) {
        ssize_t k = read(master, buf + n, sizeof buf - 1 - n);
        if (k <= 0) /* EIO once the child closed the terminal */
            break;
        n += (size_t)k;
        if (n + 1 >= sizeof buf)
            break;
    }
    buf[n] = '\0';
    int st;
    assert_true(waitpid(pid, &st, 0) == pid);
    close(master);
    /* 2 load cases x (1 intact + 4 broken) conditions */
    assert_non_null(strstr(buf, "10/10 conditions"));
    assert_int_equal(HF_TEST_RUN(&both, "balance", pass_case), 0);
    assert_null(strstr(out, "conditions  "));
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_pass_report),
        cmocka_unit_test(test_pass_csv),
        cmocka_unit_test(test_load_selection_and_file),
        cmocka_unit_test(test_criterion_fails),
        cmocka_unit_test(test_no_equilibrium_exit),
        cmocka_unit_test(test_anchor_kinds_report),
        cmocka_unit_test(test_usage_errors),
        cmocka_unit_test(test_stdout_write_errors),
        cmocka_unit_test(test_output_is_input_and_suggestion),
        cmocka_unit_test(test_progress_on_terminal),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
