/* test_cmd_study.c - 'holdfast sweep', 'invert' and 'run' as a user runs them:
 * thread-independent bytes, shards, interruption, bounded memory, exit codes. */
#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <setjmp.h>
#include <signal.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>
#include <cmocka.h>
#include "support.h"

/* wait4 is BSD/GNU, not X/Open: declared here (glibc provides it). */
pid_t wait4(pid_t pid, int *status, int options, struct rusage *rusage);

static const char *bin;
static char dir[256];
static const char *watch; /* directory where run() waits for a temporary file */

static int count_named(const char *d, const char *part);
static const char *partial(const char *out);

/* Temporary files in folder w or in the partial folder of a run into w. */
static int pending_tmp(const char *w)
{
    return count_named(w, ".tmp") + count_named(partial(w), ".tmp");
}

/* Writes a, then b unless NULL, to path.  The case files here are the
 * fictional three-line buoy mooring hf_test_case_quarrel (support.h: three
 * sections and a clump per line, one load case) with studies appended. */
static void write_file(const char *path, const char *a, const char *b)
{
    FILE *f = fopen(path, "w");
    assert_non_null(f);
    fputs(a, f);
    if (b)
        fputs(b, f);
    assert_int_equal(fclose(f), 0);
}

/* dir/name in one of 8 rotating buffers: copy it when it must live longer. */
static char *path_in(const char *name)
{
    static char buf[8][512];
    static int i;
    i = (i + 1) % 8;
    snprintf(buf[i], sizeof buf[i], "%s/%s", dir, name);
    return buf[i];
}

/* Runs holdfast with args (NULL-terminated), stdout to `out` (NULL: /dev/null),
 * stderr to /dev/null.  If kill_after > 0, sends `sig` after that many
 * seconds.  Returns the wait status; *rss gets the child's peak RSS (KiB). */
static int run(const char *out, double kill_after, int sig, long *rss, ...)
{
    const char *argv[64];
    int n = 0;
    argv[n++] = bin;
    va_list ap;
    va_start(ap, rss);
    const char *a;
    while ((a = va_arg(ap, const char *)) != NULL && n < 63)
        argv[n++] = a;
    va_end(ap);
    argv[n] = NULL;
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int fd = open(out ? out : "/dev/null", O_WRONLY | O_CREAT | O_TRUNC, 0644);
        int nul = open("/dev/null", O_WRONLY);
        dup2(fd, 1);
        dup2(nul, 2);
        execv(bin, (char *const *)argv);
        _exit(127);
    }
    if (kill_after > 0 && watch) {
        /* Wait (up to 10 s) until the output's temporary file exists, so the
         * signal surely arrives in the middle of writing it. */
        for (int i = 0; i < 1000 && pending_tmp(watch) == 0; i++) {
            struct timespec w = {0, 10000000};
            nanosleep(&w, NULL);
        }
        assert_true(pending_tmp(watch) > 0);
    }
    if (kill_after > 0) {
        struct timespec ts = {(time_t)kill_after,
                              (long)((kill_after - (double)(time_t)kill_after) * 1e9)};
        nanosleep(&ts, NULL);
        kill(pid, sig);
    }
    int status;
    struct rusage ru;
    assert_true(wait4(pid, &status, 0, &ru) == pid);
    if (rss)
        *rss = ru.ru_maxrss;
    return status;
}

static int exit_code(int status)
{
    return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

/* The file at a (malloc'd), after checking that the file at b holds the same bytes. */
static char *read_same(const char *a, const char *b)
{
    size_t na, nb;
    char *ta = hf_test_file_read(a, &na), *tb = hf_test_file_read(b, &nb);
    assert_non_null(ta);
    assert_non_null(tb);
    assert_int_equal(na, nb);
    assert_memory_equal(ta, tb, na);
    free(tb);
    return ta;
}

/* Number of directory entries whose name contains `part`. */
static int count_named(const char *d, const char *part)
{
    DIR *dp = opendir(d);
    if (!dp)
        return 0;
    int n = 0;
    struct dirent *e;
    while ((e = readdir(dp)) != NULL)
        if (strstr(e->d_name, part))
            n++;
    closedir(dp);
    return n;
}

/* The folder a run into `out` is built in (out.partial-XXXXXX beside it,
 * include/holdfast/runfolder.h), or "" when there is none. */
static const char *partial(const char *out)
{
    static char found[600];
    const char *base = strrchr(out, '/') ? strrchr(out, '/') + 1 : out;
    char prefix[300];
    snprintf(prefix, sizeof prefix, "%s.partial-", base);
    found[0] = '\0';
    DIR *dp = opendir(dir);
    if (!dp)
        return found;
    struct dirent *e;
    while ((e = readdir(dp)) != NULL)
        if (!strncmp(e->d_name, prefix, strlen(prefix)))
            snprintf(found, sizeof found, "%s/%s", dir, e->d_name);
    closedir(dp);
    return found;
}

static int setup(void **s)
{
    (void)s;
    if (hf_test_cli_setup(&bin, dir, sizeof dir, "cmd-study") != 0)
        return -1;
    write_file(path_in("quarrel.yaml"), hf_test_case_quarrel, NULL);
    return 0;
}

static int teardown(void **s)
{
    (void)s;
    return hf_test_tmpdir_remove(dir) == 0 ? 0 : -1;
}

#define SWEEP_ARGS                                                                                 \
    "sweep", path_in("quarrel.yaml"), "--vary", "site.water_level=-1.5:1.5:0.01", "--vary",        \
        "lines[north].sections[3].length=110,111.385,112.7", "--output", "fairlead_tension",       \
        "--output", "max_utilisation", "--output", "stiffness_surge", "--output", "offset_gale",   \
        "--quiet"

static void test_jobs_identical(void **s)
{
    (void)s;
    char *a = path_in("j1.csv"), *b = path_in("j2.csv");
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, SWEEP_ARGS, "--jobs", "1", "--csv", a, NULL)),
                     0);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, SWEEP_ARGS, "--jobs", "2", "--csv", b, NULL)),
                     0);
    char *ta = read_same(a, b);
    /* 301 x 3 cases and a header, every case solved. */
    int rows = 0;
    for (char *p = ta; (p = strchr(p, '\n')) != NULL; p++)
        rows++;
    assert_int_equal(rows, 1 + 301 * 3);
    assert_null(strstr(ta, ",no_convergence,"));
    assert_null(strstr(ta, ",invalid,"));
    free(ta);
}

static void test_shards_concatenate(void **s)
{
    (void)s;
    char full[512], cat[512];
    snprintf(full, sizeof full, "%s", path_in("full.csv"));
    snprintf(cat, sizeof cat, "%s", path_in("cat.csv"));
    assert_int_equal(exit_code(run(full, 0, 0, NULL, SWEEP_ARGS, "--jobs", "2", NULL)), 0);
    FILE *fc = fopen(cat, "w");
    assert_non_null(fc);
    const char *shard[] = {"1/4", "2/4", "3/4", "4/4"};
    for (int k = 0; k < 4; k++) {
        char *part = path_in("part.csv");
        assert_int_equal(exit_code(run(NULL, 0, 0, NULL, SWEEP_ARGS, "--jobs", k % 2 ? "1" : "2",
                                       "--shard", shard[k], "--csv", part, NULL)),
                         0);
        size_t n;
        char *t = hf_test_file_read(part, &n);
        assert_non_null(t);
        /* Only the first part carries the header. */
        assert_true((k == 0) == (strncmp(t, "site.water_level_m,", 19) == 0));
        fwrite(t, 1, n, fc);
        free(t);
    }
    fclose(fc);
    free(read_same(full, cat));
}

static void test_sweep_interrupted(void **s)
{
    (void)s;
    /* 3.6 million cases: many seconds of work, stopped 0.2 s after the
     * temporary output file appeared. */
    int sigs[] = {SIGTERM, SIGINT};
    for (int i = 0; i < 2; i++) {
        char *out = path_in("big.csv");
        watch = dir;
        int st = run(NULL, 0.2, sigs[i], NULL, "sweep", path_in("quarrel.yaml"), "--vary",
                     "site.water_level=-1.5:1.5:0.0000025", "--vary",
                     "lines[north].sections[3].length=110,112,113", "--jobs", "2", "--quiet",
                     "--csv", out, NULL);
        watch = NULL;
        assert_true(WIFSIGNALED(st) && WTERMSIG(st) == sigs[i]); /* it was still running */
        struct stat sb;
        assert_int_equal(stat(out, &sb), -1);             /* no partial file */
        assert_int_equal(count_named(dir, "big.csv"), 0); /* and no temporary left */
    }
}

static void test_run_interrupted_and_complete(void **s)
{
    (void)s;
    static const char studies_big[] =
        "studies:\n"
        "  - {name: rest, kind: lines}\n"
        "  - name: huge\n"
        "    kind: sweep\n"
        "    vary:\n"
        "      - {path: site.water_level, range: [-1.5 m, 1.5 m, 0.0000025 m]}\n"
        "      - {path: \"lines[north].sections[3].length\", values: [110 m, 112 m, 113 m]}\n";
    char *c = path_in("big-run.yaml"), *out = path_in("big-out");
    write_file(c, hf_test_case_quarrel, studies_big);
    watch = out;
    int st = run(NULL, 0.2, SIGTERM, NULL, "run", c, "--out", out, "--jobs", "2", "--quiet", NULL);
    watch = NULL;
    assert_true(WIFSIGNALED(st) && WTERMSIG(st) == SIGTERM);
    /* The results folder is untouched (a run replaces it as a whole, at the
     * end); in the folder the run was built in, the finished study stays and
     * the interrupted one left nothing. */
    char p[700];
    struct stat sb;
    assert_int_not_equal(stat(out, &sb), 0);
    char part[600];
    snprintf(part, sizeof part, "%s", partial(out));
    assert_true(part[0] != '\0');
    snprintf(p, sizeof p, "%s/rest.csv", part);
    assert_int_equal(stat(p, &sb), 0);
    assert_int_equal(count_named(part, "huge"), 0);
    assert_int_equal(count_named(part, "tmp"), 0);
    assert_int_equal(count_named(part, "summary"), 0);
    assert_int_equal(count_named(part, "report"), 0);

    /* A complete run: one file per study plus the summary; the balance study
     * has a condition without equilibrium (one of three lines broken under
     * 400 kN), which fails a criterion: exit status 1. */
    static const char studies[] =
        "studies:\n"
        "  - {name: rest, kind: lines}\n"
        "  - {name: k, kind: stiffness}\n"
        "  - {name: surge, kind: curve, direction: 0 deg, range: [0 m, 10 m, 2.5 m]}\n"
        "  - {name: storm, kind: balance}\n"
        "  - name: tide\n"
        "    kind: sweep\n"
        "    vary: [{path: site.water_level, range: [-1.5 m, 1.5 m, 0.5 m]}]\n"
        "  - name: pretension\n"
        "    kind: invert\n"
        "    vary: {path: \"lines[north].sections[3].length\", range: [100 m, 125 m]}\n"
        "    target: {output: fairlead_tension, line: north, value: 300 kN}\n";
    c = path_in("full-run.yaml");
    out = path_in("full-out");
    write_file(c, hf_test_case_quarrel, studies);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "run", c, "--out", out, "--quiet", NULL)), 1);
    const char *files[] = {"rest.csv", "k.csv",          "surge.csv",   "storm.csv",
                           "tide.csv", "pretension.csv", "summary.txt", "report.html"};
    for (size_t i = 0; i < sizeof files / sizeof files[0]; i++) {
        snprintf(p, sizeof p, "%s/%s", out, files[i]);
        assert_int_equal(stat(p, &sb), 0);
        assert_true(sb.st_size > 40);
    }
    snprintf(p, sizeof p, "%s/pretension.csv", out);
    size_t n;
    char *t = hf_test_file_read(p, &n);
    /* target 300 kN, achieved within 1e-6 relative (field 6 of the row) */
    char *row = strchr(t, '\n') + 1;
    const char *f = row;
    for (int i = 0; i < 5; i++)
        f = strchr(f, ',') + 1;
    double achieved = strtod(f, NULL);
    assert_true(fabs(achieved - 300.0) <= 1e-6 * 300.0);
    free(t);
    snprintf(p, sizeof p, "%s/summary.txt", out);
    t = hf_test_file_read(p, &n);
    assert_non_null(strstr(t, "CAUTION"));
    free(t);
    /* The report: complete, with the caution, a section per study and figures
     * (its XML well-formedness is checked by the report module's tests). */
    snprintf(p, sizeof p, "%s/report.html", out);
    t = hf_test_file_read(p, &n);
    assert_non_null(strstr(t, "CAUTION"));
    assert_non_null(strstr(t, "Sweep: tide"));
    assert_non_null(strstr(t, "Design inversion: pretension"));
    assert_non_null(strstr(t, "<svg"));
    assert_non_null(strstr(t, "FAIL"));
    assert_non_null(strstr(t + n - 16, "</html>"));
    free(t);
    assert_int_equal(count_named(out, "tmp"), 0);

    /* The lines, stiffness, curve and balance studies write exactly what the
     * matching commands write with --csv. */
    static const struct {
        const char *file;
        const char *args[6];
    } same[] = {
        {"rest.csv", {"lines", NULL}},
        {"k.csv", {"stiffness", NULL}},
        {"surge.csv", {"curve", "--direction", "0", "--range", "0:10:2.5", NULL}},
        {"storm.csv", {"balance", NULL}},
    };
    char cmdcsv[512];
    snprintf(cmdcsv, sizeof cmdcsv, "%s", path_in("command.csv"));
    for (size_t i = 0; i < sizeof same / sizeof same[0]; i++) {
        const char *const *a = same[i].args;
        int stc;
        if (!a[1])
            stc = run(NULL, 0, 0, NULL, a[0], c, "--csv", cmdcsv, NULL);
        else
            stc = run(NULL, 0, 0, NULL, a[0], c, a[1], a[2], a[3], a[4], "--csv", cmdcsv, NULL);
        assert_true(WIFEXITED(stc));
        snprintf(p, sizeof p, "%s/%s", out, same[i].file);
        size_t na, nb;
        char *ta = hf_test_file_read(p, &na), *tb = hf_test_file_read(cmdcsv, &nb);
        assert_non_null(ta);
        assert_non_null(tb);
        if (na != nb || memcmp(ta, tb, na))
            fail_msg("%s differs from 'holdfast %s --csv'", same[i].file, a[0]);
        free(ta);
        free(tb);
    }

    /* A bad output name in a sweep study: bad input, exit 2. */
    static const char bad[] = "studies:\n"
                              "  - name: tide\n"
                              "    kind: sweep\n"
                              "    vary: [{path: site.water_level, values: [0 m, 1 m]}]\n"
                              "    outputs: [tension_of_everything]\n";
    c = path_in("bad-run.yaml");
    write_file(c, hf_test_case_quarrel, bad);
    assert_int_equal(
        exit_code(run(NULL, 0, 0, NULL, "run", c, "--out", path_in("bad-out"), "--quiet", NULL)),
        2);
    assert_int_equal(count_named(path_in("bad-out"), "tide"), 0);
}

static void test_memory_bounded(void **s)
{
    (void)s;
    /* Peak RSS of a 20,000-case and a 200,000-case sweep to /dev/null: rows
     * are streamed (both fill the same block buffer), so ten times the cases
     * must not cost memory. */
    long small, big;
    assert_int_equal(exit_code(run(NULL, 0, 0, &small, "sweep", path_in("quarrel.yaml"), "--vary",
                                   "site.water_level=-1:0.9999:0.0001", "--jobs", "1", "--quiet",
                                   "--output", "fairlead_tension:north", NULL)),
                     0);
    assert_int_equal(exit_code(run(NULL, 0, 0, &big, "sweep", path_in("quarrel.yaml"), "--vary",
                                   "site.water_level=-1:0.99999:0.00001", "--jobs", "1", "--quiet",
                                   "--output", "fairlead_tension:north", NULL)),
                     0);
    fprintf(stderr, "peak RSS: 20,000 cases %ld KiB, 200,000 cases %ld KiB\n", small, big);
    assert_true(big < small + 2048);
    assert_true(big < 64 * 1024);
}

static void test_cli_errors(void **s)
{
    (void)s;
    const char *c = path_in("quarrel.yaml");
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", c, NULL)), 2);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", c, "--vary", "site.depth=60,61",
                                   "--shard", "0/3", NULL)),
                     2);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", c, "--vary", "site.depth=60,61",
                                   "--vary", "site.water_level=0,1,2", "--zip", NULL)),
                     2);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", c, "--vary", "site.depth=60,61",
                                   "--jobs", "0", NULL)),
                     2);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", c, "--vary", "site.depth=60,61",
                                   "--output", "nothing", NULL)),
                     2);
    /* issue 12 item 10: the sweep's --csv may not name the case file, nor be
     * empty; both are refused before anything is written, and the case file
     * is left as it was. */
    size_t before_n, after_n;
    char *before = hf_test_file_read(c, &before_n);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", c, "--vary", "site.depth=60,61",
                                   "--csv", c, NULL)),
                     2);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", c, "--vary", "site.depth=60,61",
                                   "--csv", "", NULL)),
                     2);
    char *after = hf_test_file_read(c, &after_n);
    assert_int_equal(before_n, after_n);
    assert_memory_equal(before, after, before_n);
    free(before);
    free(after);
    /* Not bracketed: exit 3 (HF_ERANGE). */
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "invert", c, "--vary",
                                   "lines[north].sections[3].length=111:125", "--target",
                                   "fairlead_tension:north=5000kN", NULL)),
                     3);
    char *o = path_in("inv.csv");
    assert_int_equal(
        exit_code(run(NULL, 0, 0, NULL, "invert", c, "--vary", "lines[north].anchor_radius=400:425",
                      "--target", "fairlead_horizontal:north=150.35kN", "--csv", o, NULL)),
        0);
    size_t n;
    char *t = hf_test_file_read(o, &n);
    assert_non_null(strstr(t, "lines[north].anchor_radius,"));
    assert_non_null(strstr(t, ",150.35,"));
    free(t);
}

/* Column index of `name` among the n header fields f, or fails. */
static size_t column_of(char **f, size_t n, const char *name)
{
    for (size_t i = 0; i < n; i++)
        if (!strcmp(f[i], name))
            return i;
    fail_msg("no column %s", name);
    return 0;
}

/* The quarrel case with its still water level set to `level` (m). */
static char *quarrel_at_level(double level)
{
    static char text[4096];
    const char *site = "site: {depth: 62 m}";
    const char *at = strstr(hf_test_case_quarrel, site);
    assert_non_null(at);
    snprintf(text, sizeof text, "%.*ssite: {depth: 62 m, water_level: %.10g m}%s",
             (int)(at - hf_test_case_quarrel), hf_test_case_quarrel, level, at + strlen(site));
    return text;
}

/* Issue 13: outputs at equilibrium under a load.  Each row of a sweep over
 * the still water level with max_tension@gale, utilisation@gale,
 * tension@gale and offset@gale equals the intact row of a separate
 * `holdfast balance` of the case file edited to that level (the reference
 * the issue names: the same quantities reached through another command and
 * another load of the case). */
static void test_sweep_at_load_matches_balance(void **s)
{
    (void)s;
    static const double level[] = {-2.385, -0.75, 0.0, 1.13, 2.6};
    const size_t nlev = sizeof level / sizeof level[0];
    const char *c = path_in("quarrel.yaml");
    char *sw = path_in("at-load.csv");
    assert_int_equal(
        exit_code(run(sw, 0, 0, NULL, "sweep", c, "--vary",
                      "site.water_level=-2.385,-0.75,0,1.13,2.6", "--output", "max_tension@gale",
                      "--output", "utilisation@gale", "--output", "tension@gale:north", "--output",
                      "offset@gale", "--output", "max_utilisation@gale", "--quiet", NULL)),
        0);
    char *text = hf_test_file_read(sw, NULL), *cur = text, *f[32], *g[64];
    assert_non_null(text);
    size_t nf = hf_test_csv_split(hf_test_line_next(&cur), f, 32);
    assert_int_equal(nf, 12); /* level, status, 2 + 3 + 1 + 1 + 2 outputs, alert */
    size_t c_mt = column_of(f, nf, "max_tension@gale_kN"),
           c_ml = column_of(f, nf, "max_tension_line@gale"),
           c_un = column_of(f, nf, "U_north@gale"), c_uw = column_of(f, nf, "U_southwest@gale"),
           c_us = column_of(f, nf, "U_southeast@gale"),
           c_tn = column_of(f, nf, "Tmax_north@gale_kN"), c_of = column_of(f, nf, "offset@gale_m"),
           c_mu = column_of(f, nf, "max_utilisation@gale"),
           c_wl = column_of(f, nf, "worst_line@gale");
    assert_string_equal(f[nf - 1], "alert");
    for (size_t k = 0; k < nlev; k++) {
        char *row = hf_test_line_next(&cur);
        assert_non_null(row);
        assert_int_equal(hf_test_csv_split(row, f, 32), nf);
        HF_TEST_ASSERT_NEAR(strtod(f[0], NULL), level[k], 1e-12);
        assert_string_equal(f[1], "ok");
        assert_string_equal(f[nf - 1], "");
        /* the case edited to this level, balanced on its own */
        char name[32], csv[32];
        snprintf(name, sizeof name, "level-%zu.yaml", k);
        snprintf(csv, sizeof csv, "level-%zu.csv", k);
        char *cp = path_in(name), *bp = path_in(csv);
        write_file(cp, quarrel_at_level(level[k]), NULL);
        /* exit 3: a broken-line condition of this case finds no equilibrium;
         * the intact row, compared here, is solved */
        int brc = exit_code(run(NULL, 0, 0, NULL, "balance", cp, "--csv", bp, NULL));
        assert_true(brc == 0 || brc == 3);
        char *bt = hf_test_file_read(bp, NULL), *bc = bt;
        assert_non_null(bt);
        size_t ng = hf_test_csv_split(hf_test_line_next(&bc), g, 64);
        size_t b_mt = column_of(g, ng, "max_tension_kN"),
               b_ml = column_of(g, ng, "max_tension_line"),
               b_tn = column_of(g, ng, "Tmax_north_kN"),
               b_ts = column_of(g, ng, "Tmax_southeast_kN"), b_h = column_of(g, ng, "horizontal_m"),
               b_mu = column_of(g, ng, "max_utilisation"),
               b_wl = column_of(g, ng, "max_utilisation_line"),
               b_cond = column_of(g, ng, "condition"), b_st = column_of(g, ng, "status");
        char *brow = hf_test_line_next(&bc);
        assert_non_null(brow);
        assert_true(hf_test_csv_split(brow, g, 64) >= ng);
        assert_string_equal(g[b_cond], "intact");
        assert_string_equal(g[b_st], "ok");
        double tol = 1e-6; /* relative: two solves to the balance tolerance (1e-8) */
        double mt = strtod(g[b_mt], NULL), mu = strtod(g[b_mu], NULL);
        HF_TEST_ASSERT_NEAR(strtod(f[c_mt], NULL), mt, tol * mt);
        assert_string_equal(f[c_ml], g[b_ml]);
        HF_TEST_ASSERT_NEAR(strtod(f[c_tn], NULL), strtod(g[b_tn], NULL), tol * mt);
        HF_TEST_ASSERT_NEAR(strtod(f[c_of], NULL), strtod(g[b_h], NULL),
                            tol * (1.0 + strtod(g[b_h], NULL)));
        HF_TEST_ASSERT_NEAR(strtod(f[c_mu], NULL), mu, tol * mu);
        assert_string_equal(f[c_wl], g[b_wl]);
        /* per-line utilisations: the worst line's is the balance's largest, the
         * others do not exceed it (the sections differ, so U is not T/one MBL) */
        size_t ui[3] = {c_un, c_uw, c_us};
        static const char *const ln[3] = {"north", "southwest", "southeast"};
        for (int i = 0; i < 3; i++) {
            double u = strtod(f[ui[i]], NULL);
            assert_true(u > 0.0 && u <= mu * (1 + tol));
            if (!strcmp(ln[i], g[b_wl]))
                HF_TEST_ASSERT_NEAR(u, mu, tol * mu);
        }
        (void)b_ts;
        free(bt);
    }
    assert_null(hf_test_line_next(&cur));
    free(text);
}

/* Issue 13: an equilibrium whose line reaches its MBL carries the alert and
 * exits 1 naming the load; a load no equilibrium holds is a stated failure
 * (status no_equilibrium), its outputs empty, never a number. */
static void test_sweep_at_load_overload(void **s)
{
    (void)s;
    const char *c = path_in("quarrel.yaml");
    hf_test_io io = {0};
    char out[8192], err[2048];
    io.out = out;
    io.out_cap = sizeof out;
    io.err = err;
    io.err_cap = sizeof err;
    int rc = HF_TEST_RUN(&io, "sweep", c, "--vary", "loads[gale].force=400kN,9MN,1e12", "--output",
                         "max_utilisation@gale", "--output", "fairlead_tension:north", "--quiet");
    assert_int_equal(rc, 1);
    char *cur = out, *f[16];
    size_t nf = hf_test_csv_split(hf_test_line_next(&cur), f, 16);
    assert_int_equal(nf, 6);
    assert_int_equal(hf_test_csv_split(hf_test_line_next(&cur), f, 16), nf);
    assert_string_equal(f[1], "ok");
    assert_true(strtod(f[2], NULL) < 1.0);
    assert_string_equal(f[5], "");
    assert_int_equal(hf_test_csv_split(hf_test_line_next(&cur), f, 16), nf);
    assert_string_equal(f[1], "ok");
    assert_true(strtod(f[2], NULL) >= 1.0); /* 9 MN: beyond the 76 mm R3 chain's MBL (4884 kN) */
    assert_string_equal(f[5], "overloaded");
    assert_int_equal(hf_test_csv_split(hf_test_line_next(&cur), f, 16), nf);
    assert_string_equal(f[1], "no_equilibrium");
    for (size_t i = 2; i < nf; i++)
        assert_string_equal(f[i], "");
    assert_non_null(strstr(err, "overloaded"));
    assert_non_null(strstr(err, "under load gale"));
    assert_non_null(strstr(err, "loads[gale].force=9e+06 N"));
}

/* Lines of a text (its newlines). */
static size_t nlines_of(const char *t)
{
    size_t n = 0;
    for (; *t; t++)
        n += *t == '\n';
    return n;
}

/* Issue 13 item 5: a case without studies: gets the default report (every
 * line at rest, the stiffness, curves along surge and sway, the balance of
 * every load case) instead of "nothing to run". */
static void test_run_default_report(void **s)
{
    (void)s;
    char *out = path_in("defaults"), *c = path_in("quarrel.yaml");
    char o[600];
    snprintf(o, sizeof o, "%s", out);
    /* exit 1: the quarrel buoy's load finds no equilibrium with line
     * southwest broken (a criterion failure, not an error) */
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "run", c, "--out", o, "--quiet", NULL)), 1);
    static const char *const want[] = {"rest.csv",       "stiffness.csv", "surge-curve.csv",
                                       "sway-curve.csv", "balance.csv",   "report.html",
                                       "summary.txt"};
    char p[700];
    for (size_t i = 0; i < sizeof want / sizeof want[0]; i++) {
        snprintf(p, sizeof p, "%s/%s", o, want[i]);
        size_t n = 0;
        char *t = hf_test_file_read(p, &n);
        if (!t)
            fail_msg("the default run wrote no %s", want[i]);
        assert_true(n > 0);
        if (!strcmp(want[i], "rest.csv"))
            assert_int_equal(nlines_of(t), 1 + 3); /* header + the 3 lines */
        if (strstr(want[i], "curve.csv"))
            assert_int_equal(nlines_of(t), 1 + 41); /* -R..R in 40 steps */
        if (!strcmp(want[i], "balance.csv"))        /* 1 load case x (intact + 3 broken) */
            assert_int_equal(nlines_of(t), 1 + 4);
        if (!strcmp(want[i], "summary.txt")) {
            assert_non_null(strstr(t, "surge-curve"));
            assert_non_null(strstr(t, "sway-curve"));
            assert_non_null(strstr(t, "criterion"));
        }
        if (!strcmp(want[i], "report.html")) {
            hf_test_assert_xml(t);
            assert_non_null(strstr(t, "this is the default report"));
            assert_non_null(strstr(t, "1 of 1 load case"));
            assert_non_null(strstr(t, "4 of 4 conditions"));
        }
        free(t);
    }
    /* the curve along surge starts at -R: 1.5 x no limit -> 10 % of the
     * smallest anchor-fairlead distance (~416 m) = 41.6 m, rounded up to 50 m */
    snprintf(p, sizeof p, "%s/surge-curve.csv", o);
    char *t = hf_test_file_read(p, NULL), *cur = t;
    assert_non_null(t);
    hf_test_line_next(&cur);
    HF_TEST_ASSERT_NEAR(strtod(cur, NULL), -50.0, 1e-12);
    free(t);
}

/* The report's cell after `<td>name</td>` in the row of line `name` of the
 * table captioned `caption`: cell k (0 = the one after the name), its text
 * into buf (cap bytes). */
static int report_cell(const char *html, const char *caption, const char *name, int k, char *buf,
                       size_t cap)
{
    const char *t = strstr(html, caption);
    char key[128];
    snprintf(key, sizeof key, "<tr><td>%s</td>", name);
    const char *r = t ? strstr(t, key) : NULL;
    if (!r)
        return 0;
    r += strlen(key);
    for (int i = 0; i <= k; i++) {
        r = strstr(r, "<td");
        if (!r)
            return 0;
        r = strchr(r, '>') + 1;
        if (i == k) {
            const char *e = strstr(r, "</td>");
            snprintf(buf, cap, "%.*s", (int)(e - r), r);
            return 1;
        }
    }
    return 0;
}

/* Issue 13 item 5: the report's row per line over the water-level envelope
 * (worst tension and where) equals the worst over separate `holdfast
 * balance` runs of the case edited to each level (the reference the issue
 * names). */
static void test_run_envelope_table(void **s)
{
    (void)s;
    static const double level[] = {-1.2, 0.9, 2.385};
    const char *site = "site: {depth: 62 m}";
    const char *at = strstr(hf_test_case_quarrel, site);
    assert_non_null(at);
    char text[4096];
    snprintf(text, sizeof text,
             "%.*ssite: {depth: 62 m, water_levels: [-1.2 m, 0.9 m, 2.385 m]}%s"
             "studies:\n  - {name: storms, kind: balance}\n",
             (int)(at - hf_test_case_quarrel), hf_test_case_quarrel, at + strlen(site));
    char cp[600], out[600], rp[700];
    snprintf(cp, sizeof cp, "%s", path_in("levels.yaml"));
    snprintf(out, sizeof out, "%s", path_in("levels-run"));
    write_file(cp, text, NULL);
    /* exit 1: with southwest broken the buoy finds no equilibrium (a criterion failure) */
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "run", cp, "--out", out, "--quiet", NULL)), 1);
    snprintf(rp, sizeof rp, "%s/report.html", out);
    char *html = hf_test_file_read(rp, NULL);
    assert_non_null(html);
    assert_non_null(strstr(html, "3 of 3 still water levels (-1.2 to 2.385 m above datum)"));
    static const char *const ln[3] = {"north", "southwest", "southeast"};
    double worst[3] = {0, 0, 0};
    char where[3][160];
    for (size_t k = 0; k < 3; k++) {
        char name[32], csv[32], *f[64];
        snprintf(name, sizeof name, "edited-%zu.yaml", k);
        snprintf(csv, sizeof csv, "edited-%zu.csv", k);
        char *ep = path_in(name), *bp = path_in(csv);
        write_file(ep, quarrel_at_level(level[k]), NULL);
        int brc = exit_code(run(NULL, 0, 0, NULL, "balance", ep, "--csv", bp, NULL));
        assert_true(brc == 0 || brc == 3);
        char *bt = hf_test_file_read(bp, NULL), *cur = bt;
        assert_non_null(bt);
        size_t nf = hf_test_csv_split(hf_test_line_next(&cur), f, 64), col[3];
        for (int i = 0; i < 3; i++) {
            char cn[64];
            snprintf(cn, sizeof cn, "Tmax_%s_kN", ln[i]);
            col[i] = column_of(f, nf, cn);
        }
        char *row;
        while ((row = hf_test_line_next(&cur)) != NULL && *row) {
            hf_test_csv_split(row, f, 64);
            for (int i = 0; i < 3; i++) {
                double v = strtod(f[col[i]], NULL);
                if (*f[col[i]] && v > worst[i]) {
                    worst[i] = v;
                    snprintf(where[i], sizeof where[i], "gale, %s, %.4g m", f[1], level[k]);
                }
            }
        }
        free(bt);
    }
    for (int i = 0; i < 3; i++) {
        char cell[256];
        assert_true(report_cell(html, "Worst of each line", ln[i], 0, cell, sizeof cell));
        /* the report writes 4 significant digits */
        HF_TEST_ASSERT_NEAR(strtod(cell, NULL), worst[i], 5e-4 * worst[i]);
        assert_true(report_cell(html, "Worst of each line", ln[i], 2, cell, sizeof cell));
        if (strcmp(cell, where[i]))
            fail_msg("line %s: the report says the worst is at \"%s\", the balances at \"%s\"",
                     ln[i], cell, where[i]);
    }
    free(html);
}

static void test_slurm_scripts(void **s)
{
    (void)s;
    /* scripts/slurm-sweep.sh run by hand as array tasks 1..3 of 3, then
     * scripts/merge-shards.sh: the merge equals the one-machine sweep. */
    const char *root = getenv("HF_ROOT");
    if (!root)
        fail_msg("HF_ROOT is not set (run through make check)");
    char full[512], merged[512], parts[512], cmd[4096];
    snprintf(full, sizeof full, "%s", path_in("one-machine.csv"));
    snprintf(merged, sizeof merged, "%s", path_in("merged.csv"));
    snprintf(parts, sizeof parts, "%s", path_in("parts"));
    assert_int_equal(exit_code(run(full, 0, 0, NULL, "sweep", path_in("quarrel.yaml"), "--vary",
                                   "site.water_level=-1.5:1.5:0.01", "--vary",
                                   "lines[north].sections[3].length=110,112", "--quiet", NULL)),
                     0);
    for (int k = 1; k <= 3; k++) {
        snprintf(cmd, sizeof cmd,
                 "SLURM_ARRAY_TASK_ID=%d SLURM_ARRAY_TASK_COUNT=3 CASE='%s' HOLDFAST='%s' "
                 "OUT='%s' SWEEP_ARGS='--vary site.water_level=-1.5:1.5:0.01 --vary "
                 "lines[north].sections[3].length=110,112' sh '%s/scripts/slurm-sweep.sh'",
                 k, path_in("quarrel.yaml"), bin, parts, root);
        assert_int_equal(system(cmd), 0);
    }
    /* A missing part is refused before anything is written. */
    snprintf(cmd, sizeof cmd, "sh '%s/scripts/merge-shards.sh' '%s' 4 '%s' 2>/dev/null", root,
             parts, merged);
    assert_int_not_equal(system(cmd), 0);
    struct stat sb;
    assert_int_equal(stat(merged, &sb), -1);
    snprintf(cmd, sizeof cmd, "sh '%s/scripts/merge-shards.sh' '%s' 3 '%s'", root, parts, merged);
    assert_int_equal(system(cmd), 0);
    free(read_same(full, merged));
    /* Part 2 rerun with another range (issue 12 item 12): its fingerprint
     * differs and the merge refuses it, leaving no result behind. */
    char part2[600], merged2[512];
    snprintf(part2, sizeof part2, "%s/part-000002.csv", parts);
    snprintf(merged2, sizeof merged2, "%s", path_in("merged2.csv"));
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", path_in("quarrel.yaml"), "--vary",
                                   "site.water_level=-1.5:1.5:0.02", "--vary",
                                   "lines[north].sections[3].length=110,112", "--shard", "2/3",
                                   "--csv", part2, "--quiet", NULL)),
                     0);
    snprintf(cmd, sizeof cmd, "sh '%s/scripts/merge-shards.sh' '%s' 3 '%s' 2>/dev/null", root,
             parts, merged2);
    assert_int_not_equal(system(cmd), 0);
    assert_int_equal(stat(merged2, &sb), -1);
    /* A part cut for another N is refused too: parts 1..3 of 4 are not 1..3 of 3. */
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", path_in("quarrel.yaml"), "--vary",
                                   "site.water_level=-1.5:1.5:0.01", "--vary",
                                   "lines[north].sections[3].length=110,112", "--shard", "2/4",
                                   "--csv", part2, "--quiet", NULL)),
                     0);
    assert_int_not_equal(system(cmd), 0);
    /* A part rewritten without its sidecar (no --shard: a full sweep into the
     * part's file) no longer matches the row count its old sidecar states. */
    char side[700];
    snprintf(side, sizeof side, "%s.shard", part2);
    assert_int_equal(exit_code(run(NULL, 0, 0, NULL, "sweep", path_in("quarrel.yaml"), "--vary",
                                   "site.water_level=-1.5:1.5:0.01", "--vary",
                                   "lines[north].sections[3].length=110,112", "--shard", "2/3",
                                   "--csv", part2, "--quiet", NULL)),
                     0);
    assert_int_equal(system(cmd), 0); /* back in place: merges again */
    assert_int_equal(
        exit_code(run(NULL, 0, 0, NULL, "sweep", path_in("quarrel.yaml"), "--vary",
                      "site.water_level=-1.5:1.5:0.5", "--csv", part2, "--quiet", NULL)),
        0);
    assert_int_equal(stat(side, &sb), 0); /* the old sidecar is still there */
    assert_int_not_equal(system(cmd), 0);
}

/* The Slurm example of docs/studies.md runs on the demo case it names (issue
 * 12 item 18: its parameter path did not exist in marina.yaml).  One shard of
 * a thousand is enough to check the options. */
static void test_docs_slurm_example(void **s)
{
    (void)s;
    const char *root = getenv("HF_ROOT");
    if (!root)
        fail_msg("HF_ROOT is not set (run through make check)");
    char path[600], cmd[4096], args[1024], casef[256];
    snprintf(path, sizeof path, "%s/docs/studies.md", root);
    size_t n;
    char *doc = hf_test_file_read(path, &n);
    assert_non_null(doc);
    char *c = strstr(doc, " CASE=");
    char *a = strstr(doc, "export SWEEP_ARGS='");
    assert_non_null(c);
    assert_non_null(a);
    c += 6;
    a += strlen("export SWEEP_ARGS='");
    size_t lc = strcspn(c, " \n"), la = strcspn(a, "'");
    assert_true(lc < sizeof casef && la < sizeof args);
    snprintf(casef, sizeof casef, "%.*s", (int)lc, c);
    snprintf(args, sizeof args, "%.*s", (int)la, a);
    free(doc);
    snprintf(cmd, sizeof cmd,
             "set -f; '%s' sweep '%s/%s' %s --shard 1/1000 --quiet --csv /dev/null 2>&1", bin, root,
             casef, args);
    assert_int_equal(system(cmd), 0);
}

/* A sweep estimated above HF_SWEEP_MAX_BYTES of CSV is refused before it
 * starts, with a message naming the way out (issue 12 item 13), and --help
 * lists every output of the catalogue. */
static void test_sweep_size_and_help(void **s)
{
    (void)s;
    char out[1 << 15], errbuf[4096];
    hf_test_io io = {out, sizeof out, errbuf, sizeof errbuf, 0, 60.0, 0};
    const char *c = path_in("quarrel.yaml");
    const char *csv = path_in("huge.csv");
    /* 1e5 x 1e5 = 1e10 cases */
    assert_int_equal(HF_TEST_RUN(&io, "sweep", c, "--vary", "site.depth=60:61:1e-5", "--vary",
                                 "site.water_level=0:1:1e-5", "--csv", csv),
                     2);
    assert_non_null(strstr(errbuf, "cases, about"));
    assert_non_null(strstr(errbuf, "--allow-large"));
    struct stat sb;
    assert_int_equal(stat(csv, &sb), -1);
    /* the same sweep cut into a million parts is small enough per part */
    assert_int_equal(HF_TEST_RUN(&io, "sweep", c, "--vary", "site.depth=60:61:1e-5", "--vary",
                                 "site.water_level=0:1:1e-5", "--shard", "1000000/1000000", "--csv",
                                 csv, "--quiet"),
                     0);
    assert_int_equal(HF_TEST_RUN(&io, "sweep", "--help"), 0);
    static const char *const names[] = {
        "fairlead_tension[:LINE]", "anchor_T_<line>_kN", "stiffness_yaw_kNm_per_rad",
        "offset_<load>",           "vertical_load",      "worst_line"};
    for (size_t i = 0; i < sizeof names / sizeof names[0]; i++)
        if (!strstr(out, names[i]))
            fail_msg("sweep --help does not list %s", names[i]);
}

/* Runs `holdfast sweep` with stderr on a pseudo-terminal and returns what
 * the terminal received (malloc'd). */
static char *sweep_on_terminal(int quiet)
{
    int master = posix_openpt(O_RDWR | O_NOCTTY);
    assert_true(master >= 0);
    assert_int_equal(grantpt(master), 0);
    assert_int_equal(unlockpt(master), 0);
    char *slave_name = ptsname(master);
    assert_non_null(slave_name);
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int slave = open(slave_name, O_RDWR);
        int nul = open("/dev/null", O_WRONLY);
        dup2(nul, 1);
        dup2(slave, 2);
        const char *argv[] = {bin,
                              "sweep",
                              path_in("quarrel.yaml"),
                              "--vary",
                              "site.water_level=-1.5:1.5:0.0001",
                              "--jobs",
                              "1",
                              quiet ? "--quiet" : NULL,
                              NULL};
        execv(bin, (char *const *)argv);
        _exit(127);
    }
    size_t cap = 1 << 16, n = 0;
    char *buf = malloc(cap);
    assert_non_null(buf);
    for (;;) {
        ssize_t k = read(master, buf + n, cap - 1 - n);
        if (k <= 0) /* EIO once the child closed the terminal */
            break;
        n += (size_t)k;
        if (n + 1 >= cap)
            break;
    }
    buf[n] = '\0';
    int st;
    assert_true(waitpid(pid, &st, 0) == pid);
    assert_int_equal(exit_code(st), 0);
    close(master);
    return buf;
}

static void test_progress_bar(void **s)
{
    (void)s;
    /* On a terminal: a bar with the case count; with --quiet: nothing.  (In
     * a pipe or file, every other test shows it stays silent: their stderr
     * is /dev/null, not a terminal, and a bar would not hurt them, so the
     * pipe case is checked here too.) */
    char *t = sweep_on_terminal(0);
    assert_non_null(strstr(t, "30001/30001 cases"));
    assert_non_null(strstr(t, "CAUTION"));
    free(t);
    t = sweep_on_terminal(1);
    assert_null(strstr(t, "cases"));
    free(t);
    char *err = path_in("stderr.txt");
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int fd = open(err, O_WRONLY | O_CREAT | O_TRUNC, 0644);
        int nul = open("/dev/null", O_WRONLY);
        dup2(nul, 1);
        dup2(fd, 2);
        execl(bin, bin, "sweep", path_in("quarrel.yaml"), "--vary",
              "site.water_level=-1.5:1.5:0.0001", NULL);
        _exit(127);
    }
    int st;
    assert_true(waitpid(pid, &st, 0) == pid);
    size_t n;
    t = hf_test_file_read(err, &n);
    assert_null(strstr(t, "cases")); /* no bar in a file */
    assert_non_null(strstr(t, "CAUTION"));
    free(t);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_jobs_identical),
        cmocka_unit_test(test_shards_concatenate),
        cmocka_unit_test(test_sweep_interrupted),
        cmocka_unit_test(test_run_interrupted_and_complete),
        cmocka_unit_test(test_memory_bounded),
        cmocka_unit_test(test_cli_errors),
        cmocka_unit_test(test_slurm_scripts),
        cmocka_unit_test(test_sweep_size_and_help),
        cmocka_unit_test(test_docs_slurm_example),
        cmocka_unit_test(test_progress_bar),
        cmocka_unit_test(test_sweep_at_load_matches_balance),
        cmocka_unit_test(test_sweep_at_load_overload),
        cmocka_unit_test(test_run_default_report),
        cmocka_unit_test(test_run_envelope_table),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
