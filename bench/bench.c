/* bench.c - `make bench`: line-solver micro-benchmarks and whole-process timings of holdfast.
 *
 * Every figure is a median over repeated samples, printed with its ratio to
 * the unit cost: one hf_line_span call (the closed-form span equations and
 * their Jacobian) on the same line, measured in the same run.  Targets are
 * printed next to the figures, never asserted (docs/performance.md).
 *
 *   holdfast-bench [--holdfast BIN] [--root DIR] [--out DIR] [--quick] [--in-process]
 *   holdfast-bench --profile-line N [cold|warm|span|all] [1|3]
 *                          N solves or span calls of the 1- or 3-section
 *                          line, no timing (for valgrind --tool=callgrind)
 *   holdfast-bench --profile-spread CASE N   N warm 12-line stiffness poses
 *
 * Whole processes are timed with clock_gettime around fork/exec/wait; peak
 * memory comes from getrusage(RUSAGE_CHILDREN) of a helper child that runs
 * exactly one command, so each run's figure is its own. */
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>
#include "holdfast/case.h"
#include "holdfast/csv.h"
#include "holdfast/line.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"

#ifndef HF_BENCH_OPT
#define HF_BENCH_OPT "?"
#endif

#define MAX_SAMPLES 64

static volatile double sink; /* keeps results alive so no call is optimised away */

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* CPU time of the calling thread: in-process figures do not count the time
 * the scheduler gives to other work on a busy machine. */
static double cpu_now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* Median of v[0..n-1] (sorts v). */
static double median(double *v, int n)
{
    qsort(v, (size_t)n, sizeof *v, cmp_double);
    return n % 2 ? v[n / 2] : 0.5 * (v[n / 2 - 1] + v[n / 2]);
}

/* ------------------------------------------------------------------------
 * In-process timing: calibrate a batch to last at least `min_batch` seconds
 * of thread CPU time, then take `samples` batches; the figure is the median
 * time per operation.
 * ---------------------------------------------------------------------- */

typedef void (*op_fn)(void *ctx, long iters);

/* One operation to time. */
typedef struct {
    op_fn f;
    void *ctx;
    long iters;            /* operations per batch (calibrated) */
    double t[MAX_SAMPLES]; /* s per operation, one per round */
    double median, q1, q3; /* s per operation */
    double ratio;          /* median over the rounds of t / t of ops[0] */
} bench_op;

/* Operations per batch so that one batch lasts at least min_batch seconds. */
static long calibrate(op_fn f, void *ctx, double min_batch)
{
    long iters = 1;
    for (;;) {
        double t0 = cpu_now();
        f(ctx, iters);
        double dt = cpu_now() - t0;
        if (dt >= min_batch || iters > (1L << 40))
            return iters;
        iters *= dt > 0.0 && dt < min_batch / 16.0 ? 8 : 2;
    }
}

/* Times ops[0..n-1] round-robin: every round takes one batch of each, so all
 * see the same machine conditions, and the ratio to ops[0] (the unit) is
 * taken round by round before the median. */
static void time_set(bench_op *ops, int n, int samples, double min_batch)
{
    if (samples > MAX_SAMPLES)
        samples = MAX_SAMPLES;
    for (int j = 0; j < n; j++)
        ops[j].iters = calibrate(ops[j].f, ops[j].ctx, min_batch);
    for (int i = 0; i < samples; i++) {
        for (int j = 0; j < n; j++) {
            double t0 = cpu_now();
            ops[j].f(ops[j].ctx, ops[j].iters);
            ops[j].t[i] = (cpu_now() - t0) / (double)ops[j].iters;
        }
    }
    double r[MAX_SAMPLES];
    for (int j = n; j-- > 0;) { /* ops[0] last: its t[] gets sorted */
        for (int i = 0; i < samples; i++)
            r[i] = ops[j].t[i] / ops[0].t[i];
        ops[j].ratio = median(r, samples);
        ops[j].median = median(ops[j].t, samples);
        ops[j].q1 = ops[j].t[samples / 4];
        ops[j].q3 = ops[j].t[(3 * samples) / 4];
    }
}

/* ------------------------------------------------------------------------
 * Benchmark lines.  Invented properties of the order of 76-84 mm studless
 * chain and 76 mm spiral strand (demo values, not catalogue data).
 * ---------------------------------------------------------------------- */

static void line_single(hf_line *l, double *X, double *Z)
{
    memset(l, 0, sizeof *l);
    l->n = 1;
    l->sec[0] = (hf_section){
        .length = 850.0, .weight = 1163.7, .ea = 5.83e8, .mbl = 5.61e6, .friction = 0.95};
    *X = 803.5; /* partly on the seabed (checked at run time) */
    *Z = 96.25;
}

static void line_three(hf_line *l, double *X, double *Z)
{
    memset(l, 0, sizeof *l);
    l->n = 3;
    l->sec[0] = (hf_section){
        .length = 300.0, .weight = 1373.4, .ea = 6.48e8, .mbl = 6.27e6, .friction = 1.0};
    l->sec[1] = (hf_section){
        .length = 330.0, .weight = 238.6, .ea = 4.94e8, .mbl = 5.43e6, .friction = 0.6};
    l->sec[2] = (hf_section){
        .length = 180.0, .weight = 1373.4, .ea = 6.48e8, .mbl = 6.27e6, .friction = 0.8};
    l->joint[0] = (hf_joint){.load = 185.0e3, .friction = 0.9}; /* clump between chain and wire */
    *X = 768.4;
    *Z = 99.6;
}

typedef struct {
    const hf_line *line;
    double X, Z;
    double h, v;            /* solution at (X, Z), for the unit cost */
    hf_line_state guess[4]; /* solutions at X (1 -/+ 0.001), then X (1 -/+ 0.0001) */
    hf_line_state st;
    long bad; /* solves that did not return HF_OK */
} line_ctx;

static void op_span(void *p, long iters)
{
    line_ctx *c = p;
    double acc = 0.0, x, z, J[2][2];
    for (long i = 0; i < iters; i++) {
        /* The tiny change of v defeats any caching of identical calls. */
        if (hf_line_span(c->line, c->h, c->v + 1e-9 * (double)(i & 7), &x, &z, J) != HF_OK)
            c->bad++;
        acc += x + J[1][1];
    }
    sink = acc;
}

static void op_cold(void *p, long iters)
{
    line_ctx *c = p;
    for (long i = 0; i < iters; i++)
        if (hf_line_solve(c->line, c->X, c->Z, NULL, NULL, &c->st) != HF_OK)
            c->bad++;
    sink = c->st.h;
}

/* Warm: the previous solution lies at a span 0.1 % (near: 0.01 %) shorter
 * or longer, alternately (a curve step or a neighbouring sweep case). */
static void warm(line_ctx *c, long iters, const hf_line_state *g)
{
    for (long i = 0; i < iters; i++)
        if (hf_line_solve(c->line, c->X, c->Z, &g[i & 1], NULL, &c->st) != HF_OK)
            c->bad++;
    sink = c->st.h;
}

static void op_warm(void *p, long iters)
{
    line_ctx *c = p;
    warm(c, iters, c->guess);
}

static void op_warm_near(void *p, long iters)
{
    line_ctx *c = p;
    warm(c, iters, c->guess + 2);
}

typedef struct {
    double span;       /* unit cost, s */
    double cold, warm; /* s per solve */
    int cold_evals, warm_evals[4];
} line_figures;

static int line_prepare(line_ctx *c, const hf_line *line, double X, double Z, const char *name)
{
    memset(c, 0, sizeof *c);
    c->line = line;
    c->X = X;
    c->Z = Z;
    hf_line_state s;
    if (hf_line_solve(line, X, Z, NULL, NULL, &s) != HF_OK || s.regime != HF_LINE_TOUCHDOWN) {
        fprintf(stderr, "bench: the %s line does not solve partly grounded (%s: %s)\n", name,
                hf_line_regime_name(s.regime), s.message);
        return -1;
    }
    c->h = s.h;
    c->v = s.v;
    static const double f[4] = {0.999, 1.001, 0.9999, 1.0001};
    for (int k = 0; k < 4; k++)
        if (hf_line_solve(line, X * f[k], Z, NULL, NULL, &c->guess[k]) != HF_OK) {
            fprintf(stderr, "bench: the %s line's warm-start neighbour does not solve\n", name);
            return -1;
        }
    return 0;
}

/* ------------------------------------------------------------------------
 * Report lines.
 * ---------------------------------------------------------------------- */

static const char *pretty_time(double s, char *buf, size_t cap)
{
    if (s < 1e-6)
        snprintf(buf, cap, "%8.1f ns", s * 1e9);
    else if (s < 1e-3)
        snprintf(buf, cap, "%8.3f us", s * 1e6);
    else if (s < 1.0)
        snprintf(buf, cap, "%8.3f ms", s * 1e3);
    else
        snprintf(buf, cap, "%8.3f s ", s);
    return buf;
}

/* One result row: name, median, ratio to the unit cost, a note, and the
 * target verdict when there is one (target <= 0: none). */
static void row(const char *name, double t, double ratio, const char *note, double value,
                double target, int higher_is_better)
{
    char b[32];
    if (ratio < 1e4)
        printf("  %-44s %s %11.1f x  %s", name, pretty_time(t, b, sizeof b), ratio, note);
    else
        printf("  %-44s %s %11.3g x  %s", name, pretty_time(t, b, sizeof b), ratio, note);
    if (target > 0.0) {
        int met = higher_is_better ? value >= target : value <= target;
        printf("  [target %s %g: %s]", higher_is_better ? ">=" : "<=", target,
               met ? "met" : "NOT MET");
    }
    printf("\n");
}

/* ------------------------------------------------------------------------
 * Whole processes.
 * ---------------------------------------------------------------------- */

typedef struct {
    int ok;         /* the command ran and exited 0 (or 1: a criterion failed) */
    int status;     /* exit status, or -1 when it did not exit normally */
    double seconds; /* wall time around fork/exec/wait */
    double cpu;     /* user + system CPU time of the command, s */
    long maxrss_kb; /* peak resident set of the command, KiB */
} proc_result;

/* Runs argv once with stdout to /dev/null and stderr to err_path.  A helper
 * child forks and execs the command, times it and reads its peak memory with
 * getrusage(RUSAGE_CHILDREN), which then covers that one command only; it
 * reports both through a pipe. */
static proc_result proc_run_env(char *const argv[], const char *err_path, char *env)
{
    proc_result r = {0, -1, 0.0, 0.0, 0};
    int fd[2];
    if (pipe(fd) != 0)
        return r;
    pid_t helper = fork();
    if (helper < 0) {
        close(fd[0]);
        close(fd[1]);
        return r;
    }
    if (helper == 0) {
        close(fd[0]);
        double msg[4] = {-1.0, 0.0, 0.0, 0.0};
        double t0 = now();
        pid_t pid = fork();
        if (pid == 0) {
            int nul = open("/dev/null", O_WRONLY);
            int err = open(err_path, O_WRONLY | O_CREAT | O_TRUNC, 0644);
            if (nul >= 0)
                dup2(nul, STDOUT_FILENO);
            if (err >= 0)
                dup2(err, STDERR_FILENO);
            if (env)
                putenv(env);
            execv(argv[0], argv);
            _exit(127);
        }
        int ws = 0;
        if (pid > 0 && waitpid(pid, &ws, 0) == pid) {
            msg[1] = now() - t0;
            msg[0] = WIFEXITED(ws) ? WEXITSTATUS(ws) : -1;
            struct rusage ru;
            if (getrusage(RUSAGE_CHILDREN, &ru) == 0) {
                msg[2] = (double)ru.ru_maxrss; /* KiB on Linux */
                msg[3] = (double)ru.ru_utime.tv_sec + 1e-6 * (double)ru.ru_utime.tv_usec +
                         (double)ru.ru_stime.tv_sec + 1e-6 * (double)ru.ru_stime.tv_usec;
            }
        }
        ssize_t w = write(fd[1], msg, sizeof msg);
        _exit(w == (ssize_t)sizeof msg ? 0 : 1);
    }
    close(fd[1]);
    double msg[4];
    ssize_t n = read(fd[0], msg, sizeof msg);
    close(fd[0]);
    int hs;
    waitpid(helper, &hs, 0);
    if (n != (ssize_t)sizeof msg)
        return r;
    r.status = (int)msg[0];
    r.seconds = msg[1];
    r.maxrss_kb = (long)msg[2];
    r.cpu = msg[3];
    r.ok = r.status == 0 || r.status == 1;
    return r;
}

static proc_result proc_run(char *const argv[], const char *err_path)
{
    return proc_run_env(argv, err_path, NULL);
}

typedef struct {
    int ok;
    double median, best; /* wall time, s */
    double cpu;          /* median user + system CPU time, s */
    long maxrss_kb;      /* largest over the runs, KiB */
    int status;          /* exit status of a failing run */
} proc_stats;

/* One untimed warm-up run (page cache, dynamic loader), then `runs` timed runs. */
static proc_stats proc_bench(char *const argv[], int runs, const char *err_path)
{
    proc_stats s = {0, 0.0, 0.0, 0.0, 0, 0};
    double v[MAX_SAMPLES], c[MAX_SAMPLES];
    if (runs > MAX_SAMPLES)
        runs = MAX_SAMPLES;
    proc_result r = proc_run(argv, err_path);
    if (!r.ok) {
        s.status = r.status;
        return s;
    }
    for (int i = 0; i < runs; i++) {
        r = proc_run(argv, err_path);
        if (!r.ok) {
            s.status = r.status;
            return s;
        }
        v[i] = r.seconds;
        c[i] = r.cpu;
        if (r.maxrss_kb > s.maxrss_kb)
            s.maxrss_kb = r.maxrss_kb;
    }
    s.ok = 1;
    s.median = median(v, runs);
    s.best = v[0]; /* v is sorted by median() */
    s.cpu = median(c, runs);
    return s;
}

/* First line of a file (an error message), for a skipped benchmark. */
static void first_line(const char *path, char *buf, size_t cap)
{
    buf[0] = '\0';
    FILE *f = fopen(path, "r");
    if (!f)
        return;
    if (fgets(buf, (int)cap, f))
        buf[strcspn(buf, "\n")] = '\0';
    fclose(f);
}

static void skipped(const char *name, const proc_stats *s, const char *err_path)
{
    char msg[512];
    first_line(err_path, msg, sizeof msg);
    printf("  %-44s not measured: exit %d%s%s\n", name, s->status, msg[0] ? ": " : "", msg);
}

static long count_lines(const char *path)
{
    FILE *f = fopen(path, "r");
    if (!f)
        return -1;
    long n = 0;
    int ch;
    while ((ch = getc(f)) != EOF)
        n += ch == '\n';
    fclose(f);
    return n;
}

/* ------------------------------------------------------------------------
 * Machine description.
 * ---------------------------------------------------------------------- */

static void cpu_model(char *buf, size_t cap)
{
    snprintf(buf, cap, "unknown");
    FILE *f = fopen("/proc/cpuinfo", "r");
    if (!f)
        return;
    char line[512];
    while (fgets(line, sizeof line, f)) {
        if (!strncmp(line, "model name", 10)) {
            char *p = strchr(line, ':');
            if (p) {
                p += 1 + strspn(p + 1, " \t");
                p[strcspn(p, "\n")] = '\0';
                snprintf(buf, cap, "%s", p);
            }
            break;
        }
    }
    fclose(f);
}

static double loadavg(void)
{
    double l = -1.0;
    FILE *f = fopen("/proc/loadavg", "r");
    if (f) {
        if (fscanf(f, "%lf", &l) != 1)
            l = -1.0;
        fclose(f);
    }
    return l;
}

/* ------------------------------------------------------------------------
 * In-process spread and CSV pieces (to split the curve process's time).
 * ---------------------------------------------------------------------- */

typedef struct {
    hf_spread *ws;
    hf_pose rest;
    double cd, sd, from, step;
    long count, k; /* curve points, next point */
    long bad;
} spread_ctx;

static void op_spread_point(void *p, long iters)
{
    spread_ctx *c = p;
    double K[6][6];
    hf_spread_result r;
    hf_error err;
    double acc = 0.0;
    for (long i = 0; i < iters; i++) {
        if (c->k >= c->count) {
            c->k = 0;
            hf_spread_reset(c->ws);
        }
        double s = c->from + (double)c->k++ * c->step;
        hf_pose pose = c->rest;
        pose.surge += s * c->cd;
        pose.sway += s * c->sd;
        if (hf_spread_stiffness(c->ws, &pose, K, &r, &err) != HF_OK)
            c->bad++;
        acc += K[0][0] + r.force[0];
    }
    sink = acc;
}

static void op_format(void *p, long iters)
{
    (void)p;
    char buf[HF_CSV_NUMBER_MAX];
    size_t n = 0;
    for (long i = 0; i < iters; i++)
        n += hf_csv_format_double(buf, -8536.689486 + 0.0123456789 * (double)(i & 1023),
                                  HF_CSV_DIGITS_DEFAULT);
    sink = (double)n;
}

static void op_snprintf(void *p, long iters)
{
    (void)p;
    char buf[HF_CSV_NUMBER_MAX];
    long n = 0;
    for (long i = 0; i < iters; i++)
        n += snprintf(buf, sizeof buf, "%.10g", -8536.689486 + 0.0123456789 * (double)(i & 1023));
    sink = (double)n;
}

/* ------------------------------------------------------------------------
 * Profiling modes: fixed work, no timing, for callgrind.
 * ---------------------------------------------------------------------- */

/* what: "cold", "warm", "span" or "all"; lines: 1 or 3 sections. */
static int profile_line(long n, const char *what, int sections)
{
    hf_line l;
    double X, Z;
    if (sections == 1)
        line_single(&l, &X, &Z);
    else
        line_three(&l, &X, &Z);
    static line_ctx c;
    if (line_prepare(&c, &l, X, Z, sections == 1 ? "single-section" : "three-section") != 0)
        return 1;
    int all = !strcmp(what, "all");
    if (all || !strcmp(what, "cold"))
        op_cold(&c, n);
    if (all || !strcmp(what, "warm"))
        op_warm(&c, n);
    if (all || !strcmp(what, "span"))
        op_span(&c, n);
    printf("profile: %ld x %s on the %d-section line; %ld failures\n", n, what, sections, c.bad);
    return c.bad != 0;
}

static int spread_open(const char *path, hf_model *m, spread_ctx *c)
{
    hf_error err;
    hf_error_clear(&err);
    hf_model_init(m);
    memset(c, 0, sizeof *c);
    if (hf_case_load(path, m, &err) != HF_OK) {
        fprintf(stderr, "bench: %s\n", err.text);
        return -1;
    }
    c->ws = hf_spread_alloc(m, &err);
    if (!c->ws) {
        fprintf(stderr, "bench: %s\n", err.text);
        hf_model_free(m);
        return -1;
    }
    hf_spread_pose_rest(m, &c->rest);
    double d = 30.0 * M_PI / 180.0; /* the curve benchmark's direction */
    c->cd = cos(d);
    c->sd = sin(d);
    c->from = -10.0;
    c->step = 0.002;
    c->count = 10001;
    return 0;
}

static int profile_spread(const char *path, long n)
{
    hf_model m;
    spread_ctx c;
    if (spread_open(path, &m, &c) != 0)
        return 1;
    op_spread_point(&c, n);
    printf("profile: %ld spread stiffness poses of %zu lines; %ld failures\n", n, m.nlines, c.bad);
    hf_spread_free(c.ws);
    hf_model_free(&m);
    return c.bad != 0;
}

/* ------------------------------------------------------------------------
 * The benchmark run.
 * ---------------------------------------------------------------------- */

typedef struct {
    const char *bin, *root, *out;
    int quick;
    int in_process; /* only the in-process benchmarks (no whole processes) */
} config;

/* *unit_line: the three-section line's context, for later ratios. */
static int bench_lines(const config *cfg, line_figures *f1, line_figures *f3, line_ctx **unit_line)
{
    static hf_line l1, l3; /* the contexts point at them after return */
    double X1, Z1, X3, Z3;
    line_single(&l1, &X1, &Z1);
    line_three(&l3, &X3, &Z3);
    static line_ctx c1, c3;
    if (line_prepare(&c1, &l1, X1, Z1, "single-section") != 0 ||
        line_prepare(&c3, &l3, X3, Z3, "three-section") != 0)
        return -1;
    *unit_line = &c3;
    int samples = cfg->quick ? 7 : 21;
    double batch = cfg->quick ? 0.002 : 0.005;
    struct {
        line_ctx *c;
        line_figures *f;
        const char *title;
    } set[2] = {{&c1, f1, "single section, 850 m chain, partly on the seabed"},
                {&c3, f3, "chain 300 m + clump 185 kN + wire 330 m + chain 180 m, friction"}};
    for (int i = 0; i < 2; i++) {
        line_ctx *c = set[i].c;
        line_figures *f = set[i].f;
        enum { SPAN, COLD, WARM, NEAR, NOPS };
        bench_op ops[NOPS] = {{.f = op_span, .ctx = c},
                              {.f = op_cold, .ctx = c},
                              {.f = op_warm, .ctx = c},
                              {.f = op_warm_near, .ctx = c}};
        time_set(ops, NOPS, samples, batch);
        hf_line_state s;
        hf_line_solve(c->line, c->X, c->Z, NULL, NULL, &s);
        f->cold_evals = s.evaluations;
        for (int k = 0; k < 4; k++) {
            hf_line_solve(c->line, c->X, c->Z, &c->guess[k], NULL, &s);
            f->warm_evals[k] = s.evaluations;
        }
        f->span = ops[SPAN].median;
        f->cold = ops[COLD].median;
        f->warm = ops[WARM].median;
        if (c->bad) {
            fprintf(stderr, "bench: %ld solver calls failed\n", c->bad);
            return -1;
        }
        char b1[32], b2[32], b3[32];
        printf("\n%s (X %.1f m, Z %.2f m, %s; solved H %.1f kN, V %.1f kN)\n", set[i].title, c->X,
               c->Z, hf_line_regime_name(s.regime), s.h / 1e3, s.v / 1e3);
        printf("  %-44s %s %11.1f x  (quartiles %s .. %s)\n", "unit cost: one hf_line_span call",
               pretty_time(ops[SPAN].median, b1, sizeof b1), 1.0,
               pretty_time(ops[SPAN].q1, b2, sizeof b2), pretty_time(ops[SPAN].q3, b3, sizeof b3));
        char note[96];
        snprintf(note, sizeof note, "%2d evaluations", f->cold_evals);
        row("cold solve (guess NULL)", ops[COLD].median, ops[COLD].ratio, note, ops[COLD].ratio,
            8.0, 0);
        snprintf(note, sizeof note, "%d/%d evaluations", f->warm_evals[0], f->warm_evals[1]);
        row("warm solve (previous span -/+ 0.1 %)", ops[WARM].median, ops[WARM].ratio, note,
            ops[WARM].ratio, 3.0, 0);
        snprintf(note, sizeof note, "%d/%d evaluations", f->warm_evals[2], f->warm_evals[3]);
        row("warm solve (previous span -/+ 0.01 %)", ops[NEAR].median, ops[NEAR].ratio, note, 0, 0,
            0);
    }
    return 0;
}

/* The unit line (three sections) is timed again in the same rounds, so the
 * ratios here are round by round too. */
static void bench_pieces(const config *cfg, line_ctx *unit_line)
{
    int samples = cfg->quick ? 7 : 15;
    char path[4096];
    snprintf(path, sizeof path, "%s/bench/cases/spread12.yaml", cfg->root);
    printf("\npieces of the curve process (in-process, for the profile)\n");
    hf_model m;
    spread_ctx c;
    int have_spread = spread_open(path, &m, &c) == 0;
    enum { SPAN, FORMAT, PRINTF, POSE, NOPS };
    bench_op ops[NOPS] = {{.f = op_span, .ctx = unit_line},
                          {.f = op_format, .ctx = NULL},
                          {.f = op_snprintf, .ctx = NULL},
                          {.f = op_spread_point, .ctx = &c}};
    time_set(ops, have_spread ? NOPS : POSE, samples, 0.005);
    if (have_spread) {
        char note[96];
        snprintf(note, sizeof note, "%.1f x per line; x 10,001 = %.3f s", ops[POSE].ratio / 12.0,
                 ops[POSE].median * 10001.0);
        row("12-line spread + 6x6 stiffness, one pose", ops[POSE].median, ops[POSE].ratio, note, 0,
            0, 0);
        if (c.bad)
            printf("  (%ld poses failed)\n", c.bad);
        hf_spread_free(c.ws);
        hf_model_free(&m);
    }
    row("one CSV number, hf_csv_format_double", ops[FORMAT].median, ops[FORMAT].ratio, "", 0, 0, 0);
    row("one number with snprintf %.10g (reference)", ops[PRINTF].median, ops[PRINTF].ratio, "", 0,
        0, 0);
}

static void bench_curve(const config *cfg, double unit)
{
    char cas[4096], csv[4096], err[4096];
    snprintf(cas, sizeof cas, "%s/bench/cases/spread12.yaml", cfg->root);
    snprintf(csv, sizeof csv, "%s/curve.csv", cfg->out);
    snprintf(err, sizeof err, "%s/curve.err", cfg->out);
    char *argv[] = {(char *)cfg->bin, "curve",        cas,     "--direction", "30",
                    "--range",        "-10:10:0.002", "--csv", csv,           NULL};
    printf("\nholdfast curve bench/cases/spread12.yaml --direction 30 --range -10:10:0.002 "
           "--csv FILE\n(12 lines, 10,001 offsets, stdout to /dev/null)\n");
    proc_stats s = proc_bench(argv, cfg->quick ? 3 : 9, err);
    if (!s.ok) {
        skipped("curve, whole process", &s, err);
        return;
    }
    long rows = count_lines(csv) - 1;
    char note[128];
    snprintf(note, sizeof note, "best %.3f s, %ld CSV rows, peak %ld KiB", s.best, rows,
             s.maxrss_kb);
    row("curve, whole process (wall)", s.median, (s.median) / unit, note, s.median, 0.1, 0);
    row("curve, whole process (CPU user + system)", s.cpu, (s.cpu) / unit, "", s.cpu, 0.1, 0);
    if (rows > 0) {
        double per = s.cpu / (double)rows / 12.0;
        snprintf(note, sizeof note, "(process CPU time / %ld points / 12 lines)", rows);
        row("  per line and offset", per, (per) / unit, note, 0, 0, 0);
    }
}

static void bench_sweep(const config *cfg, double unit)
{
    char cas[4096], csv[4096], err[4096];
    snprintf(cas, sizeof cas, "%s/bench/cases/sweep3.yaml", cfg->root);
    snprintf(csv, sizeof csv, "%s/sweep.csv", cfg->out);
    snprintf(err, sizeof err, "%s/sweep.err", cfg->out);
    /* 100 clump weights x 1000 anchor radii; both steps are exact binary
     * fractions so the point counts are exact. */
    char *big[] = {(char *)cfg->bin,
                   "sweep",
                   cas,
                   "--vary",
                   "lines[trial].sections[1].clump=50000:149000:1000",
                   "--vary",
                   "lines[trial].anchor_radius=660:691.21875:0.03125",
                   "--csv",
                   csv,
                   "--quiet",
                   "--jobs",
                   "1",
                   NULL};
    static char passive[] = "OMP_WAIT_POLICY=passive";
    printf("\nholdfast sweep bench/cases/sweep3.yaml (three sections + clump, 100 clump weights "
           "x 1000 anchor radii,\ndefault outputs, CSV to a file, stdout to /dev/null)\n");
    int runs = cfg->quick ? 3 : 7;
    /* Variants: --jobs 1, --jobs 2, --jobs 2 with OpenMP's passive wait
     * policy (idle threads sleep instead of spinning).  They alternate so a
     * change in the machine's load hits all alike. */
    enum { NV = 3 };
    static const char *jobs[NV] = {"1", "2", "2"};
    char *envs[NV] = {NULL, NULL, passive};
    double t[NV][MAX_SAMPLES], cpu[NV][MAX_SAMPLES];
    long rss[NV] = {0, 0, 0};
    for (int i = -1; i < runs; i++) {
        for (int j = 0; j < NV; j++) {
            big[11] = (char *)jobs[j];
            proc_result r = proc_run_env(big, err, envs[j]);
            if (!r.ok) {
                proc_stats st = {0, 0, 0, 0, 0, r.status};
                skipped("sweep, whole process", &st, err);
                return;
            }
            if (i >= 0) {
                t[j][i] = r.seconds;
                cpu[j][i] = r.cpu;
                if (r.maxrss_kb > rss[j])
                    rss[j] = r.maxrss_kb;
            }
        }
    }
    long rows = count_lines(csv) - 1;
    double m[NV], c[NV], best[NV];
    for (int j = 0; j < NV; j++) {
        m[j] = median(t[j], runs);
        best[j] = t[j][0]; /* sorted by median() */
        c[j] = median(cpu[j], runs);
    }
    static const char *names[NV] = {"100,000 cases, --jobs 1", "100,000 cases, --jobs 2",
                                    "100,000 cases, --jobs 2, passive OpenMP wait"};
    for (int j = 0; j < NV; j++) {
        char note[128];
        snprintf(note, sizeof note, "%.0f cases/s, CPU %.3f s, peak %ld KiB", (double)rows / m[j],
                 c[j], rss[j]);
        row(names[j], m[j], (m[j]) / unit, note, 0, 0, 0);
    }
    char note[128];
    snprintf(note, sizeof note, "(--jobs 1 CPU time / %ld cases)", rows);
    row("  per case, --jobs 1", c[0] / (double)rows, (c[0] / (double)rows) / unit, note, 0, 0, 0);
    printf("  %-44s %11.2f x %13s  [target >= 1.8: %s]\n", "speed-up 2 threads / 1 thread",
           m[0] / m[1], "", m[0] / m[1] >= 1.8 ? "met" : "NOT MET");
    printf("  %-44s %11.2f x\n", "speed-up with OMP_WAIT_POLICY=passive", m[0] / m[2]);
    printf("  %-44s %11.2f x  (best of %d runs each: %.3f s and %.3f s)\n",
           "speed-up from the best runs", best[0] / best[1], runs, best[0], best[1]);
    printf("  %-44s %11.2f x  (a busy machine lowers the wall-time speed-up, not this)\n",
           "CPU time 2 threads / 1 thread", c[1] / c[0]);
    /* Peak memory against case count: 10,000, 100,000 and 1,000,000 cases
     * (1000 anchor radii times 10, 100 and 1000 clump weights). */
    static const char *clumps[3] = {"lines[trial].sections[1].clump=50000:59000:1000",
                                    "lines[trial].sections[1].clump=50000:149000:1000",
                                    "lines[trial].sections[1].clump=50000:1049000:1000"};
    long peak[2][3] = {{0, 0, 0}, {0, 0, 0}};
    for (int j = 0; j < 2; j++) {
        for (int n = 0; n < 3; n++) {
            int reps = n == 2 || cfg->quick ? 1 : 2;
            for (int i = 0; i < reps; i++) {
                big[4] = (char *)clumps[n];
                big[11] = (char *)jobs[j];
                proc_result r = proc_run(big, err);
                if (r.ok && r.maxrss_kb > peak[j][n])
                    peak[j][n] = r.maxrss_kb;
            }
        }
    }
    for (int j = 0; j < 2; j++) {
        double growth = peak[j][1] > 0 ? (double)peak[j][2] / (double)peak[j][1] : 0.0;
        printf("  peak memory, --jobs %d: %ld KiB (10,000 cases), %ld KiB (100,000), %ld KiB "
               "(1,000,000)\n      1,000,000 / 100,000: x %.3f  [target: no growth: %s]\n",
               j + 1, peak[j][0], peak[j][1], peak[j][2], growth,
               growth <= 1.05 ? "met" : "NOT MET");
    }
}

static void bench_run(const config *cfg, double unit)
{
    char cas[4096], dir[4096], err[4096];
    snprintf(cas, sizeof cas, "%s/cases/barge.yaml", cfg->root);
    snprintf(dir, sizeof dir, "%s/barge-results", cfg->out);
    snprintf(err, sizeof err, "%s/run.err", cfg->out);
    char *argv[] = {(char *)cfg->bin, "run", cas, "--out", dir, NULL};
    printf("\nholdfast run cases/barge.yaml --out DIR (every study of the demo case)\n");
    proc_stats s = proc_bench(argv, cfg->quick ? 3 : 7, err);
    if (!s.ok) {
        skipped("run, whole process", &s, err);
        return;
    }
    char note[96];
    snprintf(note, sizeof note, "best %.3f s, CPU %.3f s, peak %ld KiB", s.best, s.cpu,
             s.maxrss_kb);
    row("run, whole process", s.median, (s.median) / unit, note, 0, 0, 0);
}

static void usage(FILE *out)
{
    fprintf(out, "usage: holdfast-bench [--holdfast BIN] [--root DIR] [--out DIR] [--quick] "
                 "[--in-process]\n"
                 "       holdfast-bench --profile-line N [cold|warm|span|all] [1|3]\n"
                 "       holdfast-bench --profile-spread CASE N\n");
}

int main(int argc, char **argv)
{
    config cfg = {"build-bench/holdfast", ".", "build-bench/bench-out", 0, 0};
    for (int i = 1; i < argc; i++) {
        int more = i + 1 < argc;
        if (!strcmp(argv[i], "--holdfast") && more) {
            cfg.bin = argv[++i];
        } else if (!strcmp(argv[i], "--root") && more) {
            cfg.root = argv[++i];
        } else if (!strcmp(argv[i], "--out") && more) {
            cfg.out = argv[++i];
        } else if (!strcmp(argv[i], "--quick")) {
            cfg.quick = 1;
        } else if (!strcmp(argv[i], "--in-process")) {
            cfg.in_process = 1;
        } else if (!strcmp(argv[i], "--profile-line") && more) {
            const char *what = i + 2 < argc ? argv[i + 2] : "all";
            int sections = i + 3 < argc ? atoi(argv[i + 3]) : 3;
            return profile_line(atol(argv[i + 1]), what, sections);
        } else if (!strcmp(argv[i], "--profile-spread") && i + 2 < argc) {
            return profile_spread(argv[i + 1], atol(argv[i + 2]));
        } else if (!strcmp(argv[i], "--help")) {
            usage(stdout);
            return 0;
        } else {
            usage(stderr);
            return 2;
        }
    }
    if (mkdir(cfg.out, 0755) != 0 && errno != EEXIST) {
        fprintf(stderr, "bench: cannot create %s: %s\n", cfg.out, strerror(errno));
        return 2;
    }
    char cpu[256];
    cpu_model(cpu, sizeof cpu);
    time_t t0 = time(NULL);
    char when[64];
    strftime(when, sizeof when, "%Y-%m-%d %H:%M UTC", gmtime(&t0));
    double load0 = loadavg();
    printf("holdfast benchmarks, %s\n", when);
    printf("machine: %ld processors, %s\n", sysconf(_SC_NPROCESSORS_ONLN), cpu);
    printf("compiler: %s %s, flags %s\n",
#if defined(__clang__)
           "clang",
#else
           "gcc",
#endif
           __VERSION__, HF_BENCH_OPT);
    printf("load average at start: %.2f%s\n", load0,
           load0 > 0.5 ? "  (other work on the machine: timings and the speed-up are inflated)"
                       : "");
    printf("figures: median time per operation and its ratio to one hf_line_span call\n"
           "(the closed-form span equations plus Jacobian) of the same line, this run.\n"
           "In-process figures are thread CPU time; whole processes show wall and CPU time.\n");

    line_figures f1, f3;
    line_ctx *unit_line = NULL;
    if (bench_lines(&cfg, &f1, &f3, &unit_line) != 0)
        return 3;
    double unit = f3.span; /* the process benchmarks' lines are three sections + clump */
    printf("\nratios below are to the three-section unit cost, %.1f ns\n", unit * 1e9);
    bench_pieces(&cfg, unit_line);
    if (!cfg.in_process) {
        bench_curve(&cfg, unit);
        bench_sweep(&cfg, unit);
        bench_run(&cfg, unit);
    }
    double load1 = loadavg();
    printf("\nload average at end: %.2f; elapsed %.0f s\n", load1, difftime(time(NULL), t0));
    printf("targets are printed, not asserted; see docs/performance.md\n");
    return 0;
}
