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
    assert_non_null(strstr(out, "verdict: FAIL (governing: offset; offset "));
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
    assert_non_null(strstr(out, "verdict: FAIL (governing: anchor:nw; nw sliding 0."));
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

/* ---- issue 13: envelopes, overloads, anchors ---- */

static char err_buf[OUT_CAP];
static hf_test_io split_io = {.out = out, .out_cap = OUT_CAP, .err = err_buf, .err_cap = OUT_CAP};

/* The pontoon case with `extra` after the site's depth line and `crit` as
 * its criteria block, written to dir/name. */
static void write_variant(char *path, size_t cap, const char *name, const char *extra,
                          const char *loads, const char *crit)
{
    static char text[8192];
    const char *lines = PONTOON_LINES;
    const char *depth = strstr(lines, "  depth: 18.4 m\n");
    assert_non_null(depth);
    size_t head = (size_t)(depth - lines) + strlen("  depth: 18.4 m\n");
    snprintf(text, sizeof text, "title: Fictional ferry pontoon Lathe Point, %s\n%.*s%s%s%s%s",
             name, (int)head, lines, extra, lines + head, loads, crit);
    snprintf(path, cap, "%s/%s.yaml", dir, name);
    hf_test_file_write(path, text);
}

static const char env_loads[] = "loads:\n"
                                "  - name: breeze\n"
                                "    wind: {speed: 14.5 m/s, direction: 90 deg, coefficient: "
                                "1.1, area: 96 m^2}\n"
                                "  - name: ebb\n"
                                "    force: 6.25 kN\n"
                                "    direction: 200 deg\n";

/* Issue 13 item 2, the issue's own reference: each row of an envelope run
 * equals, byte for byte, the row of a separate `balance` of the case edited
 * to that water level. */
static void test_envelope_rows_equal_edited_cases(void **state)
{
    (void)state;
    NEED_BIN();
    static const char *const level[3] = {"-0.6", "0.45", "1.85"};
    char env[400];
    write_variant(env, sizeof env, "envelope", "  water_levels: [-0.6 m, 0.45 m, 1.85 m]\n",
                  env_loads, "criteria:\n  preset: ufc-4-159-03\n");
    static char all[OUT_CAP];
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", env, "--csv", "-"), 0);
    memcpy(all, out, sizeof all);
    char *cur = all, *row = hf_test_line_next(&cur);
    assert_non_null(row);
    for (int k = 0; k < 3; k++) {
        char extra[64], one[400], name[32];
        snprintf(extra, sizeof extra, "  water_level: %s m\n", level[k]);
        snprintf(name, sizeof name, "edited-%d", k);
        write_variant(one, sizeof one, name, extra, env_loads,
                      "criteria:\n  preset: ufc-4-159-03\n");
        assert_int_equal(HF_TEST_RUN(&quiet, "balance", one, "--csv", "-"), 0);
        char *c2 = out;
        assert_non_null(hf_test_line_next(&c2)); /* same header */
        for (int r = 0; r < 10; r++) {
            char *a = hf_test_line_next(&cur), *b = hf_test_line_next(&c2);
            assert_non_null(a);
            assert_non_null(b);
            if (strcmp(a, b) != 0)
                fail_msg("level %s m, row %d:\n envelope %s\n edited   %s", level[k], r, a, b);
            char lv[32];
            snprintf(lv, sizeof lv, ",%s,", level[k]);
            assert_non_null(strstr(a, lv)); /* water_level_m */
        }
        assert_null(hf_test_line_next(&c2));
    }
    assert_null(hf_test_line_next(&cur));
    /* the readable summary names the scope and the worst level per line */
    assert_int_equal(HF_TEST_RUN(&both, "balance", env), 0);
    assert_non_null(strstr(out, "verdict: PASS over 2 load cases x 3 water levels (-0.6 to 1.85 "
                                "m) x 5 conditions (intact and each of 4 lines broken) = 30 "
                                "conditions"));
    assert_non_null(strstr(out, "=== still water level 0.45 m above the datum (2 of 3)"));
    assert_non_null(strstr(out, "worst line tension over the envelope"));
}

/* [low, high] expands to every 0.1 m from low and high itself; the command
 * line's --water-level replaces the case's levels (a range keeps TO). */
static void test_envelope_levels(void **state)
{
    (void)state;
    NEED_BIN();
    char env[400];
    write_variant(env, sizeof env, "range", "  water_levels: [-0.6 m, 0.45 m]\n", env_loads, "");
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", env, "--csv", "-", "--load", "ebb"), 0);
    static char ranged[OUT_CAP];
    memcpy(ranged, out, sizeof ranged);
    static const double want[] = {-0.6, -0.5, -0.4, -0.3, -0.2, -0.1,
                                  0.0,  0.1,  0.2,  0.3,  0.4,  0.45};
    char *cur = out, *line = hf_test_line_next(&cur);
    for (size_t k = 0; k < 12; k++)
        for (int c = 0; c < 5; c++) {
            line = hf_test_line_next(&cur);
            assert_non_null(line);
            char *f[64];
            hf_test_csv_split(line, f, 64);
            if (fabs(strtod(f[2], NULL) - want[k]) > 1e-12)
                fail_msg("row %zu: level %s, expected %g", k * 5 + (size_t)c, f[2], want[k]);
        }
    assert_null(hf_test_line_next(&cur));
    /* a level of the expanded range (-0.6 + 9 x 0.1) is the level a case file's
     * "0.3 m" gives: the rows agree byte for byte with the edited case */
    const char *r03 = strstr(ranged, "ebb,intact,0.3,");
    assert_non_null(r03);
    char one[400];
    write_variant(one, sizeof one, "edited-0.3", "  water_level: 0.3 m\n", env_loads, "");
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", one, "--csv", "-", "--load", "ebb"), 0);
    const char *e03 = strstr(out, "ebb,intact,0.3,");
    assert_non_null(e03);
    size_t len = strcspn(e03, "\n");
    assert_int_equal(strcspn(r03, "\n"), len);
    assert_memory_equal(r03, e03, len);
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", env, "--csv", "-", "--load", "ebb",
                                 "--water-level", "0.2:0.45:0.1"),
                     0);
    assert_non_null(strstr(out, "ebb,intact,0.45,ok"));
    cur = out;
    int rows = -1;
    while ((line = hf_test_line_next(&cur)))
        rows++;
    assert_int_equal(rows, 4 * 5); /* 0.2, 0.3, 0.4 and TO = 0.45 */
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", env, "--csv", "-", "--load", "ebb",
                                 "--water-level", "1.2 ft,0.35"),
                     0);
    assert_non_null(strstr(out, "ebb,intact,0.36576,ok")); /* 1.2 ft = 0.36576 m exactly */
    assert_non_null(strstr(out, "ebb,intact,0.35,ok"));
    assert_int_equal(HF_TEST_RUN(&both, "balance", env, "--water-level", "-30"), 2);
    assert_non_null(strstr(out, "--water-level"));
    assert_int_equal(HF_TEST_RUN(&both, "balance", env, "--water-level", "1:0:0.5"), 2);
    assert_int_equal(HF_TEST_RUN(&both, "balance", env, "--water-level", "1,x"), 2);
    assert_non_null(strstr(out, "--water-level"));
}

/* Bad envelope and anchor keys are refused at file:line:col. */
static void test_envelope_and_anchor_keys_refused(void **state)
{
    (void)state;
    NEED_BIN();
    static const struct {
        const char *extra, *crit, *want;
    } bad[] = {
        {"  water_levels: []\n", "", "site.water_levels"},
        {"  water_levels: [1 m, 0 m]\n", "", "low < high"},
        {"  water_levels: [0 m, -19 m, 1 m]\n", "", "above the seabed"},
        {"  water_levels: 2 m\n", "", "expected a list of water levels"},
        {"", "criteria:\n  block_sliding_factor: 0.8\n", "criteria.block_sliding_factor"},
        {"", "criteria:\n  anchor_line_friction: maybe\n", "include, ignore"},
    };
    for (size_t k = 0; k < sizeof bad / sizeof bad[0]; k++) {
        char path[400], name[32];
        snprintf(name, sizeof name, "bad-%zu", k);
        write_variant(path, sizeof path, name, bad[k].extra, env_loads, bad[k].crit);
        int rc = HF_TEST_RUN(&both, "balance", path);
        if (rc != 2 || !strstr(out, bad[k].want) || !strstr(out, ".yaml:"))
            fail_msg("case %zu: exit %d, expected 2 and \"%s\" at file:line:col; got:\n%s", k, rc,
                     bad[k].want, out);
    }
}

/* Issue 13 item 1: an equilibrium with a line beyond its MBL is flagged,
 * never "PASS", even with no criteria at all; exit 1 with one line naming it. */
static void test_overload_flagged(void **state)
{
    (void)state;
    NEED_BIN();
    char path[400];
    /* 3000 kN toward +x.  Statics as in test_criterion_fails: the two -x
     * chains carry H >= 3000 / (2 x 0.806 x 1.01) = 1843 kN each, T >= H, far
     * beyond their MBL of 1380 kN (utilisation > 1.33). */
    write_variant(path, sizeof path, "overload", "",
                  "loads:\n  - {name: hurricane, force: 3000 kN, direction: 0 deg}\n", "");
    assert_int_equal(HF_TEST_RUN(&split_io, "balance", path), 1);
    assert_non_null(strstr(out, "OVERLOADED: line "));
    assert_null(strstr(out, "verdict: PASS"));
    assert_non_null(strstr(out, "verdict: FAIL (governing: overload:"));
    /* one line on stderr: line, utilisation, load, condition, level */
    const char *msg = strstr(err_buf, "holdfast balance: line ");
    assert_non_null(msg);
    assert_non_null(strstr(msg, "is overloaded: utilisation "));
    /* the worst overload of the run: with one -x chain broken the other takes it */
    assert_non_null(strstr(msg, "under hurricane, broken:"));
    assert_non_null(strstr(msg, ", 0 m; 5 conditions with an overloaded line"));
    double u = strtod(strstr(msg, "utilisation ") + 12, NULL);
    assert_true(u > 1.33);
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", path, "--csv", "-"), 1);
    char *cur = out, *line = hf_test_line_next(&cur);
    line = hf_test_line_next(&cur);
    char *f[64];
    size_t n = hf_test_csv_split(line, f, 64);
    assert_string_equal(f[1], "intact");
    assert_true(!strncmp(f[10], "overload:", 9));
    assert_string_equal(f[11], "0");
    assert_true(strtod(f[9], NULL) >= 1.33);
    assert_string_equal(f[n - 1], "overloaded");
}

/* Issue 13 item 3: anchors in the CSV and the summary, factors set per case
 * and per line, friction of the grounded line ignored on request. */
static void test_anchor_outputs_and_options(void **state)
{
    (void)state;
    NEED_BIN();
    char base[400], strict[400];
    snprintf(base, sizeof base, "%s/anchors.yaml", dir);
    hf_test_file_write(base, anchors_text);
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", base, "--csv", "-"), 1);
    char *cur = out, *head = hf_test_line_next(&cur), *f[64];
    char names[4096];
    snprintf(names, sizeof names, "%s", head);
    size_t nh = hf_test_csv_split(names, f, 64);
    size_t js = 0, ju = 0, ja = 0, jl = 0;
    for (size_t j = 0; j < nh; j++) {
        js = strcmp(f[j], "sliding_nw") ? js : j;
        ju = strcmp(f[j], "uplift_nw") ? ju : j;
        ja = strcmp(f[j], "angle_ne_deg") ? ja : j;
        jl = strcmp(f[j], "anchor_load_ne_kN") ? jl : j;
    }
    assert_true(js && ju && ja && jl);
    char *row = hf_test_line_next(&cur); /* ebb, intact */
    char *v[64];
    hf_test_csv_split(row, v, 64);
    double slide = strtod(v[js], NULL);
    assert_true(slide > 1.0); /* intact: the block holds */
    assert_true(strtod(v[jl], NULL) > 0.0);
    /* the pile: load and angle reported */
    double ang = strtod(v[ja], NULL);
    assert_true(ang >= 0.0 && ang < 90.0);
    /* the summary shows the failing sliding factor (below 1 with ne broken) */
    assert_int_equal(HF_TEST_RUN(&both, "balance", base), 1);
    const char *p = strstr(out, "anchors over the envelope");
    assert_non_null(p);
    p = strstr(p, "\n  nw ");
    assert_non_null(p);
    assert_non_null(strstr(p, "FAIL in "));
    double smin = strtod(strstr(p, "sliding ") + 8, NULL);
    assert_true(smin < 1.0 && smin > 0.0);
    /* a required sliding factor of 1.5 on the case makes the intact block fail
     * when its factor is below 1.5 (and never a pass where 1.0 failed) */
    char text[8192];
    snprintf(text, sizeof text,
             "%scriteria:\n  block_sliding_factor: 1.5\n  "
             "anchor_line_friction: ignore\n",
             anchors_text);
    snprintf(strict, sizeof strict, "%s/anchors-strict.yaml", dir);
    hf_test_file_write(strict, text);
    assert_int_equal(HF_TEST_RUN(&both, "balance", strict), 1);
    assert_non_null(strstr(out, "gravity blocks: sliding factor >= 1.50"));
    assert_non_null(strstr(out, "seabed friction of the grounded line ignored"));
    assert_int_equal(HF_TEST_RUN(&quiet, "balance", strict, "--csv", "-"), 1);
    cur = out;
    hf_test_line_next(&cur);
    row = hf_test_line_next(&cur);
    hf_test_csv_split(row, v, 64);
    double slide_nf = strtod(v[js], NULL);
    /* without the line's friction (0.7 on a long grounded chain) the block
     * sees more pull: 50.2 kN against 27.0 kN when this test was written */
    assert_true(slide_nf < slide);
    /* the CSV's factor is the statics of its own anchor load: the chain lies
     * on the seabed at the block (angle 0, V = 0), so mu W / H with the
     * block's W = 150 kN, mu = 0.45 (REFERENCE.md section 4) */
    size_t jn = 0;
    for (size_t j = 0; j < nh; j++)
        jn = strcmp(f[j], "anchor_load_nw_kN") ? jn : j;
    assert_true(jn > 0);
    double hload = strtod(v[jn], NULL);
    assert_float_equal(strtod(v[jn + 4], NULL), 0.0, 0.0); /* angle_nw_deg */
    assert_float_equal(slide_nf, 0.45 * 150.0 / hload, 1e-8 * slide_nf);
    assert_true(hload > 27.0);
    /* 1.345 < 1.5: the intact condition fails on that anchor */
    assert_true(slide_nf < 1.5);
    assert_string_equal(v[10], "anchor:nw");
    assert_string_equal(v[11], "0");
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
        cmocka_unit_test(test_envelope_rows_equal_edited_cases),
        cmocka_unit_test(test_envelope_levels),
        cmocka_unit_test(test_envelope_and_anchor_keys_refused),
        cmocka_unit_test(test_overload_flagged),
        cmocka_unit_test(test_anchor_outputs_and_options),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
