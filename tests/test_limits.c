/* test_limits.c - input limits: huge files, deep nesting, long text, many lines. */
/*
 * Each hostile input is loaded in a forked child, so a crash, a hang (alarm)
 * or a blown memory budget is a failed test and not a dead test program.
 * The child reports the status, the message, its peak memory growth and CPU
 * time through a pipe.  Where a documented limit (include/holdfast/case.h,
 * model.h, line.h) is hit, the message must name it.  Also here: the inputs
 * the fuzzer once broke the loader with (fuzz/regressions/), and the CLI's
 * promise that results are never left half-written when a run is killed.
 */
#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <setjmp.h>
#include <signal.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <sys/time.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>
#include <cmocka.h>
#include "support.h"
#include "holdfast/case.h"
#include "holdfast/line.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"

/* Memory bounds hold for the plain allocator.  Under AddressSanitizer its
 * redzones and quarantine of freed blocks (256 MiB) inflate the resident
 * set, so there the bounds are reported, not checked; time bounds stay. */
#if defined(__SANITIZE_ADDRESS__)
#define UNDER_ASAN 1
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
#define UNDER_ASAN 1
#endif
#endif
#ifndef UNDER_ASAN
#define UNDER_ASAN 0
#endif
#define MEM_BELOW(kb, bound) (UNDER_ASAN || (kb) < (bound))

/* ---- a growable text buffer (plain malloc: test scaffolding) ---- */

typedef struct {
    char *p;
    size_t n, cap;
} buf;

/* Grows b (doubling, from 4096 bytes) to hold k more bytes and a NUL. */
static void reserve(buf *b, size_t k)
{
    size_t cap = b->cap ? b->cap * 2 : 4096;
    while (cap < b->n + k + 1)
        cap *= 2;
    char *q = realloc(b->p, cap);
    if (!q)
        abort();
    b->p = q;
    b->cap = cap;
}

static void put(buf *b, const char *fmt, ...)
{
    va_list ap;
    for (;;) {
        va_start(ap, fmt);
        int k = vsnprintf(b->p ? b->p + b->n : NULL, b->p ? b->cap - b->n : 0, fmt, ap);
        va_end(ap);
        if (k < 0)
            abort();
        if (b->p && b->n + (size_t)k < b->cap) {
            b->n += (size_t)k;
            return;
        }
        reserve(b, (size_t)k);
    }
}

static void repeat(buf *b, const char *s, size_t times)
{
    size_t k = strlen(s);
    for (size_t i = 0; i < times; i++) {
        if (b->n + k + 1 > b->cap)
            reserve(b, k);
        memcpy(b->p + b->n, s, k);
        b->n += k;
        b->p[b->n] = '\0';
    }
}

/* A small valid case; `title` may be NULL. */
static void base_case(buf *b, const char *title)
{
    if (title)
        put(b, "title: \"%s\"\n", title);
    put(b, "site: {depth: 96.5 m}\n"
           "components:\n"
           "  c: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
           "lines:\n"
           "  - {name: a, anchor: [640.5, 0], fairlead: [5.2, 0, -4], "
           "sections: [{component: c, length: 700 m}]}\n");
}

/* ---- running a load in a child ---- */

typedef struct {
    hf_status status;
    char text[HF_ERROR_TEXT];
    long rss_kb;   /* growth of the peak resident set during the load, KiB */
    double cpu;    /* user + system CPU seconds of the load */
    size_t nlines; /* lines in the loaded model */
    int solved;    /* spread solve at rest: 1 ok, 0 not asked, -1 failed */
    char title[8]; /* first bytes of the loaded title */
    size_t title_len;
} probe_result;

typedef void (*maker)(buf *b, const void *arg);

static long peak_kb(void)
{
    struct rusage ru;
    getrusage(RUSAGE_SELF, &ru);
    return ru.ru_maxrss;
}

static double cpu_now(void)
{
    struct rusage ru;
    getrusage(RUSAGE_SELF, &ru);
    return ru.ru_utime.tv_sec + ru.ru_stime.tv_sec +
           1e-6 * (double)(ru.ru_utime.tv_usec + ru.ru_stime.tv_usec);
}

/* Builds the input with `make` in a child and loads it from a buffer, or
 * from a file when path is not NULL (then `make` may be NULL).  With solve,
 * a successful model is also solved at its rest pose. */
static probe_result probe(maker make, const void *arg, const char *path, int solve,
                          unsigned timeout_s)
{
    int fd[2];
    assert_int_equal(pipe(fd), 0);
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        close(fd[0]);
        alarm(timeout_s);
        probe_result r;
        memset(&r, 0, sizeof r);
        buf b = {0};
        if (make)
            make(&b, arg);
        long rss0 = peak_kb();
        double t0 = cpu_now();
        hf_model m;
        hf_model_init(&m);
        hf_error err;
        hf_error_clear(&err);
        r.status = path ? hf_case_load(path, &m, &err)
                        : hf_case_load_buffer(b.p ? b.p : "", b.n, "limits.yaml", &m, &err);
        snprintf(r.text, sizeof r.text, "%s", err.text);
        r.nlines = m.nlines;
        if (m.title) {
            r.title_len = strlen(m.title);
            snprintf(r.title, sizeof r.title, "%s", m.title);
        }
        if (solve && r.status == HF_OK) {
            hf_spread *sp = hf_spread_alloc(&m, &err);
            hf_pose pose;
            hf_spread_pose_rest(&m, &pose);
            hf_spread_result res;
            double K[6][6];
            r.solved = -1;
            if (sp && hf_spread_stiffness(sp, &pose, K, &res, &err) == HF_OK) {
                int finite = 1;
                for (int i = 0; i < 6; i++) {
                    finite &= isfinite(res.force[i]);
                    for (int j = 0; j < 6; j++)
                        finite &= isfinite(K[i][j]);
                }
                r.solved = finite ? 1 : -1;
            }
            if (r.solved < 0)
                snprintf(r.text, sizeof r.text, "spread: %.1000s", err.text);
            hf_spread_free(sp);
        }
        hf_model_free(&m);
        r.cpu = cpu_now() - t0;
        r.rss_kb = peak_kb() - rss0;
        free(b.p);
        ssize_t w = write(fd[1], &r, sizeof r);
        _exit(w == (ssize_t)sizeof r ? 0 : 1);
    }
    close(fd[1]);
    probe_result r;
    memset(&r, 0, sizeof r);
    size_t got = 0;
    while (got < sizeof r) {
        ssize_t k = read(fd[0], (char *)&r + got, sizeof r - got);
        if (k <= 0)
            break;
        got += (size_t)k;
    }
    close(fd[0]);
    int ws;
    assert_int_equal(waitpid(pid, &ws, 0), pid);
    if (WIFSIGNALED(ws))
        fail_msg("the load died of signal %d%s", WTERMSIG(ws),
                 WTERMSIG(ws) == SIGALRM ? " (time limit: a hang)" : "");
    assert_true(WIFEXITED(ws));
    assert_int_equal(WEXITSTATUS(ws), 0);
    assert_int_equal(got, sizeof r);
    return r;
}

static void expect_limit(const probe_result *r, const char *limit_name)
{
    if (r->status != HF_ELIMIT)
        fail_msg("expected HF_ELIMIT naming %s, got %s: %s", limit_name, hf_status_str(r->status),
                 r->text);
    if (!strstr(r->text, limit_name))
        fail_msg("the message does not name %s: %s", limit_name, r->text);
}

/* ---- size ---- */

static void make_blank(buf *b, const void *arg)
{
    size_t n = *(const size_t *)arg;
    b->p = malloc(n + 1);
    if (!b->p)
        abort();
    memset(b->p, '#', n); /* one long comment */
    b->p[n] = '\0';
    b->n = n;
    b->cap = n + 1;
}

static void file_size_limit(void **state)
{
    (void)state;
    size_t over = (size_t)HF_CASE_MAX_BYTES + 1;
    probe_result r = probe(make_blank, &over, NULL, 0, 60);
    expect_limit(&r, "HF_CASE_MAX_BYTES");
    assert_true(r.cpu < 2.0);                    /* rejected before parsing */
    assert_true(MEM_BELOW(r.rss_kb, 16 * 1024)); /* and without copying */

    /* The same from a file on disk: a sparse file just over the limit. */
    char path[] = "/tmp/hf-limits-XXXXXX";
    int fd = mkstemp(path);
    assert_true(fd >= 0);
    assert_int_equal(ftruncate(fd, (off_t)HF_CASE_MAX_BYTES + 4096), 0);
    close(fd);
    r = probe(NULL, NULL, path, 0, 60);
    unlink(path);
    expect_limit(&r, "HF_CASE_MAX_BYTES");
    /* Reading stops near the limit: at most twice the limit in memory. */
    assert_true(MEM_BELOW(r.rss_kb, 2 * (long)(HF_CASE_MAX_BYTES / 1024) + 32 * 1024));
    assert_true(r.cpu < 10.0);
}

/* A valid case padded with comments to 8 MiB loads, in bounded time. */
static void make_padded(buf *b, const void *arg)
{
    (void)arg;
    base_case(b, "padded");
    for (size_t i = 0; b->n < (8u << 20); i++)
        put(b, "# %zu: padding comment, the quick brown fox jumps over the lazy dog\n", i);
}

static void large_valid_file(void **state)
{
    (void)state;
    probe_result r = probe(make_padded, NULL, NULL, 0, 60);
    if (r.status != HF_OK)
        fail_msg("8 MiB of comments: %s", r.text);
    assert_int_equal(r.nlines, 1);
    assert_true(r.cpu < 10.0);
    assert_true(MEM_BELOW(r.rss_kb, 64 * 1024));
}

/* An 8 MiB flat list of 4,194,305 items: past HF_CASE_MAX_NODES.  Every
 * item would become a node; the loader stops at the node limit, so memory
 * and time stay bounded whatever the file's size. */
static void make_flat(buf *b, const void *arg)
{
    (void)arg;
    put(b, "title: [");
    repeat(b, "1,", 1u << 22);
    put(b, "1]\n");
    base_case(b, NULL);
}

static void flat_list_memory(void **state)
{
    (void)state;
    probe_result r = probe(make_flat, NULL, NULL, 0, 60);
    expect_limit(&r, "HF_CASE_MAX_NODES");
    printf("limits: 8 MiB flat list: %ld KiB peak growth, %.2f s\n", r.rss_kb, r.cpu);
    assert_true(MEM_BELOW(r.rss_kb, 250 * 1024)); /* about 120 MB measured at the limit */
    assert_true(r.cpu < 10.0);
}

/* ---- nesting ---- */

typedef struct {
    size_t depth;
    int block;
} nest_arg;

/* title: [[[...]]] with `depth` brackets, or a block mapping `depth` deep. */
static void make_nested(buf *b, const void *arg)
{
    const nest_arg *a = arg;
    if (a->block) {
        for (size_t i = 0; i < a->depth; i++) {
            repeat(b, " ", i);
            put(b, "k%zu:\n", i);
        }
        repeat(b, " ", a->depth);
        put(b, "leaf\n");
        return;
    }
    put(b, "title: ");
    repeat(b, "[", a->depth);
    repeat(b, "]", a->depth);
    put(b, "\n");
    base_case(b, NULL);
}

static void nesting_limit(void **state)
{
    (void)state;
    /* The root mapping is level 1, so title's value may nest 31 more. */
    nest_arg at = {HF_CASE_MAX_DEPTH - 1, 0};
    probe_result r = probe(make_nested, &at, NULL, 0, 30);
    assert_int_equal(r.status, HF_EINVAL); /* within the limit: just not a title */
    assert_null(strstr(r.text, "HF_CASE_MAX_DEPTH"));

    nest_arg over = {HF_CASE_MAX_DEPTH, 0};
    r = probe(make_nested, &over, NULL, 0, 30);
    expect_limit(&r, "HF_CASE_MAX_DEPTH");
    assert_non_null(strstr(r.text, "limits.yaml:1:")); /* located */

    nest_arg deep = {1000000, 0};
    r = probe(make_nested, &deep, NULL, 0, 30);
    expect_limit(&r, "HF_CASE_MAX_DEPTH");
    assert_true(r.cpu < 5.0);
    assert_true(MEM_BELOW(r.rss_kb, 64 * 1024));

    nest_arg blk = {200, 1};
    r = probe(make_nested, &blk, NULL, 0, 30);
    expect_limit(&r, "HF_CASE_MAX_DEPTH");
}

/* ---- long text ---- */

typedef struct {
    size_t len;
    int where; /* 0 title, 1 key, 2 line name, 3 quoted with escapes */
} long_arg;

static void make_long(buf *b, const void *arg)
{
    const long_arg *a = arg;
    char *s = malloc(a->len + 1);
    if (!s)
        abort();
    for (size_t i = 0; i < a->len; i++)
        s[i] = (char)('a' + (i * 7) % 26);
    s[a->len] = '\0';
    switch (a->where) {
    case 0:
        base_case(b, s);
        break;
    case 1:
        put(b, "%s: 1\n", s);
        base_case(b, NULL);
        break;
    case 2:
        put(b,
            "site: {depth: 96.5 m}\ncomponents:\n"
            "  c: {type: studless_chain, grade: R3, diameter: 76 mm}\nlines:\n"
            "  - {name: %s, anchor: [640.5, 0], fairlead: [5.2, 0, -4], "
            "sections: [{component: c, length: 700 m}]}\n",
            s);
        break;
    default:
        put(b, "title: \"");
        repeat(b, "\\x41", a->len);
        put(b, "\"\n");
        base_case(b, NULL);
        break;
    }
    free(s);
}

static void long_strings(void **state)
{
    (void)state;
    long_arg ok = {HF_CASE_MAX_SCALAR, 0};
    probe_result r = probe(make_long, &ok, NULL, 0, 30);
    if (r.status != HF_OK)
        fail_msg("a title of exactly HF_CASE_MAX_SCALAR bytes: %s", r.text);
    assert_int_equal(r.title_len, HF_CASE_MAX_SCALAR);
    assert_string_equal(r.title, "ahovcjq");

    long_arg over = {HF_CASE_MAX_SCALAR + 1, 0};
    r = probe(make_long, &over, NULL, 0, 30);
    expect_limit(&r, "HF_CASE_MAX_SCALAR");

    long_arg huge = {16u << 20, 0};
    r = probe(make_long, &huge, NULL, 0, 60);
    expect_limit(&r, "HF_CASE_MAX_SCALAR");
    assert_true(r.cpu < 10.0);
    assert_true(MEM_BELOW(r.rss_kb, 256 * 1024));

    long_arg key = {HF_CASE_MAX_SCALAR * 3, 1};
    r = probe(make_long, &key, NULL, 0, 30);
    if (r.status != HF_ELIMIT && r.status != HF_EINVAL)
        fail_msg("a 12 KiB key: %s %s", hf_status_str(r.status), r.text);

    long_arg name_ok = {HF_MODEL_MAX_NAME, 2};
    r = probe(make_long, &name_ok, NULL, 0, 30);
    if (r.status != HF_OK)
        fail_msg("a line name of HF_MODEL_MAX_NAME bytes: %s", r.text);
    long_arg name_over = {HF_MODEL_MAX_NAME + 1, 2};
    r = probe(make_long, &name_over, NULL, 0, 30);
    expect_limit(&r, "HF_MODEL_MAX_NAME");

    /* Escapes: 4 bytes of text, 1 byte of value each; the limit is on the value. */
    long_arg esc = {HF_CASE_MAX_SCALAR + 1, 3};
    r = probe(make_long, &esc, NULL, 0, 30);
    expect_limit(&r, "HF_CASE_MAX_SCALAR");
}

/* ---- many lines ---- */

static void make_lines(buf *b, const void *arg)
{
    size_t n = *(const size_t *)arg;
    put(b, "title: many lines\nsite: {depth: 96.5 m}\ncomponents:\n"
           "  c: {type: studless_chain, grade: R3, diameter: 76 mm}\nlines:\n");
    for (size_t i = 0; i < n; i++) {
        /* Anchors on a 640 m circle, fairleads on a 5.2 m one, same bearing. */
        double a = 2.0 * M_PI * (double)i / (double)n;
        put(b,
            "  - {name: l%zu, anchor: [%.6f, %.6f], fairlead: [%.6f, %.6f, -4], "
            "sections: [{component: c, length: 700 m}]}\n",
            i, 640.5 * cos(a), 640.5 * sin(a), 5.2 * cos(a), 5.2 * sin(a));
    }
}

static void ten_thousand_lines(void **state)
{
    (void)state;
    size_t n = 10000;
    probe_result r = probe(make_lines, &n, NULL, 1, 120);
    if (r.status != HF_OK)
        fail_msg("10,000 lines: %s", r.text);
    assert_int_equal(r.nlines, 10000);
    if (r.solved != 1)
        fail_msg("10,000 lines: the spread solve failed: %s", r.text);
    printf("limits: 10,000 lines: load + spread solve + 6x6 stiffness %.2f s, %ld KiB\n", r.cpu,
           r.rss_kb);
    assert_true(r.cpu < 20.0);
    assert_true(MEM_BELOW(r.rss_kb, 512 * 1024));

    size_t over = HF_MODEL_MAX_LINES + 1;
    r = probe(make_lines, &over, NULL, 0, 120);
    expect_limit(&r, "HF_CASE_MAX_NODES"); /* reached before HF_MODEL_MAX_LINES */
    printf("limits: %zu lines (over the limit): rejected in %.2f s, %ld KiB\n", over, r.cpu,
           r.rss_kb);
    assert_true(r.cpu < 60.0);
}

/* ---- sections per line ---- */

static void make_sections(buf *b, const void *arg)
{
    size_t n = *(const size_t *)arg; /* component sections; clumps between them */
    put(b, "site: {depth: 96.5 m}\ncomponents:\n"
           "  c: {type: studless_chain, grade: R3, diameter: 76 mm}\nlines:\n"
           "  - name: a\n    anchor: [640.5, 0]\n    fairlead: [5.2, 0, -4]\n    sections:\n");
    for (size_t i = 0; i < n; i++) {
        if (i)
            put(b, "      - {clump: 1.5 kN}\n");
        put(b, "      - {component: c, length: %.4f m}\n", 700.0 / (double)n);
    }
}

static void sections_limit(void **state)
{
    (void)state;
    size_t ok = HF_LINE_MAX_SECTIONS;
    probe_result r = probe(make_sections, &ok, NULL, 1, 30);
    if (r.status != HF_OK)
        fail_msg("%d sections: %s", HF_LINE_MAX_SECTIONS, r.text);
    assert_int_equal(r.solved, 1);
    size_t over = HF_LINE_MAX_SECTIONS + 1;
    r = probe(make_sections, &over, NULL, 0, 30);
    expect_limit(&r, "HF_LINE_MAX_SECTIONS");
    size_t many = 5000;
    r = probe(make_sections, &many, NULL, 0, 30);
    if (r.status != HF_ELIMIT)
        fail_msg("5000 sections: %s %s", hf_status_str(r.status), r.text);
}

/* ---- fuzz regressions ---- */

static void fuzz_regressions(void **state)
{
    (void)state;
    const char *root = getenv("HF_ROOT");
    char dir[1024];
    hf_test_root_path(dir, sizeof dir, "fuzz/regressions");
    DIR *d = opendir(dir);
    if (!d)
        fail_msg("cannot open %s (HF_ROOT=%s)", dir, root ? root : "(unset)");
    int n = 0;
    struct dirent *e;
    while ((e = readdir(d)) != NULL) {
        if (e->d_name[0] == '.' || !strcmp(e->d_name, "README"))
            continue;
        char path[1400];
        snprintf(path, sizeof path, "%s/%s", dir, e->d_name);
        probe_result r = probe(NULL, NULL, path, 1, 30);
        if (r.status != HF_OK && r.status != HF_EINVAL && r.status != HF_ELIMIT)
            fail_msg("%s: %s: %s", e->d_name, hf_status_str(r.status), r.text);
        if (r.status != HF_OK && r.text[0] == '\0')
            fail_msg("%s: failed without a message", e->d_name);
        n++;
    }
    closedir(d);
    printf("limits: %d fuzz regression inputs replayed\n", n);
}

/* ---- results never half-written (the CLI) ---- */

static int run_cli(const char *bin, const char *casefile, const char *out, double kill_after,
                   int *sig)
{
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int nul = open("/dev/null", O_WRONLY);
        dup2(nul, 1);
        dup2(nul, 2);
        execl(bin, bin, "run", casefile, "--out", out, (char *)NULL);
        _exit(127);
    }
    int ws = 0;
    *sig = 0;
    if (kill_after > 0.0) {
        struct timespec ts = {(time_t)kill_after, (long)((kill_after - floor(kill_after)) * 1e9)};
        nanosleep(&ts, NULL);
        if (waitpid(pid, &ws, WNOHANG) == 0) {
            kill(pid, SIGTERM);
            *sig = SIGTERM;
        } else {
            return WIFEXITED(ws) ? WEXITSTATUS(ws) : -1;
        }
    }
    assert_int_equal(waitpid(pid, &ws, 0), pid);
    if (WIFSIGNALED(ws))
        return 128 + WTERMSIG(ws);
    return WEXITSTATUS(ws);
}

/* Every regular file in `dir` (recursively) must be complete: byte-equal to
 * the same file of the complete run in `ref` for CSV and SVG; other files
 * non-empty.  No temporary file may remain.  Returns the files checked. */
static int check_tree(const char *dir, const char *ref)
{
    DIR *d = opendir(dir);
    if (!d)
        return 0; /* killed before the folder was made */
    int n = 0;
    struct dirent *e;
    while ((e = readdir(d)) != NULL) {
        if (!strcmp(e->d_name, ".") || !strcmp(e->d_name, ".."))
            continue;
        char p[2048], q[2048];
        snprintf(p, sizeof p, "%s/%s", dir, e->d_name);
        snprintf(q, sizeof q, "%s/%s", ref, e->d_name);
        if (strstr(e->d_name, ".tmp"))
            fail_msg("a temporary file was left behind: %s", p);
        struct stat st;
        assert_int_equal(lstat(p, &st), 0);
        if (S_ISDIR(st.st_mode)) {
            n += check_tree(p, q);
            continue;
        }
        size_t la = 0, lb = 0;
        char *a = hf_test_file_read(p, &la), *b = hf_test_file_read(q, &lb);
        long na = a ? (long)la : -1, nb = b ? (long)lb : -1;
        if (nb < 0)
            fail_msg("%s exists but the complete run has no such file", p);
        const char *ext = strrchr(e->d_name, '.');
        if (ext && (!strcmp(ext, ".csv") || !strcmp(ext, ".svg"))) {
            if (na != nb || memcmp(a, b, (size_t)na) != 0)
                fail_msg("%s differs from the complete run's (%ld vs %ld bytes): half-written", p,
                         na, nb);
        } else if (na <= 0) {
            fail_msg("%s is empty", p);
        }
        free(a);
        free(b);
        n++;
    }
    closedir(d);
    return n;
}

static double wall(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* Runs `holdfast run casefile` to the end into tmp/complete (exit status
 * must be `want`, or 0/1 when want < 0), then 8 times SIGTERMed at 5 % to
 * 89 % of that duration; checks every output tree.  `absent` names a file
 * the complete run must not have written (a failed study), or NULL. */
static void killed_runs(const char *bin, const char *casefile, const char *tmp, int want,
                        const char *absent)
{
    char ref[1100];
    snprintf(ref, sizeof ref, "%s/complete", tmp);
    int sig;
    double t0 = wall();
    int rc = run_cli(bin, casefile, ref, 0.0, &sig);
    double full = wall() - t0;
    if (want < 0 ? (rc != 0 && rc != 1) : rc != want)
        fail_msg("holdfast run %s exited %d", casefile, rc);
    int files = check_tree(ref, ref);
    assert_true(files > 0);
    if (absent) {
        char p[1300];
        struct stat st;
        snprintf(p, sizeof p, "%s/%s", ref, absent);
        if (stat(p, &st) == 0)
            fail_msg("%s was written although its study failed", p);
    }
    int checked = 0, killed = 0;
    for (int k = 0; k < 8; k++) {
        char out[1200];
        snprintf(out, sizeof out, "%s/killed%d", tmp, k);
        double at = full * (0.05 + 0.12 * k);
        rc = run_cli(bin, casefile, out, at, &sig);
        if (sig)
            killed++;
        checked += check_tree(out, ref);
        hf_test_tmpdir_remove(out);
    }
    hf_test_tmpdir_remove(ref);
    printf("limits: %s: run takes %.2f s (exit %d), %d files; 8 runs SIGTERMed at 5..89 %% "
           "(%d were still running): %d files checked, none half-written\n",
           strrchr(casefile, '/') + 1, full, want < 0 ? 0 : want, files, killed, checked);
}

static void killed_run_leaves_whole_files(void **state)
{
    (void)state;
    const char *bin = getenv("HF_BIN"), *root = getenv("HF_ROOT");
    if (!bin || !root)
        fail_msg("HF_BIN and HF_ROOT must be set (make check sets them)");
    char tmp[256], casefile[1100];
    assert_int_equal(hf_test_tmpdir_make(tmp, sizeof tmp, "killed"), 0);

    /* The barge demo: a short run that succeeds. */
    snprintf(casefile, sizeof casefile, "%s/cases/barge.yaml", root);
    killed_runs(bin, casefile, tmp, -1, NULL);

    /* A long run that fails: fuzz/seeds/full.yaml with a 60,001-case depth
     * sweep (a CSV of several MB, written while the signal comes) and an
     * inversion whose bracket misses the target (exit 3, no CSV for it). */
    char seed[1100];
    snprintf(seed, sizeof seed, "%s/fuzz/seeds/full.yaml", root);
    size_t n = 0;
    char *text = hf_test_file_read(seed, &n);
    assert_non_null(text);
    assert_true(n > 0);
    const char *from = "range: [20 m, 26 m, 1 m]";
    char *at = strstr(text, from);
    assert_non_null(at);
    snprintf(casefile, sizeof casefile, "%s/long.yaml", tmp);
    FILE *f = fopen(casefile, "w");
    assert_non_null(f);
    fprintf(f, "%.*srange: [20 m, 26 m, 0.0001 m]%s", (int)(at - text), text, at + strlen(from));
    assert_int_equal(fclose(f), 0);
    free(text);
    killed_runs(bin, casefile, tmp, 3, "find-length.csv");
    unlink(casefile);
    hf_test_tmpdir_remove(tmp);
}

/* ---- a file size limit (ulimit -f) on the CLI (issue 12 item 11) ---- */

/* Runs argv (argv[0] a path) in a fresh process under RLIMIT_FSIZE = limit
 * bytes with SIGXFSZ at its default action (as a shell leaves it), standard
 * output to /dev/null and standard error into errbuf.  Returns the exit
 * status, or 128 + the signal that ended it.  With stdout_path, standard
 * output goes to that file (created or truncated) instead. */
static int run_size_limited(const char *const argv[], rlim_t limit, const char *stdout_path,
                            char *errbuf, size_t cap)
{
    int p[2];
    assert_int_equal(pipe(p), 0);
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        close(p[0]);
        signal(SIGXFSZ, SIG_DFL); /* exec keeps an ignored signal ignored */
        struct rlimit rl = {limit, limit};
        int nul = stdout_path ? open(stdout_path, O_WRONLY | O_CREAT | O_TRUNC, 0644)
                              : open("/dev/null", O_WRONLY);
        if (setrlimit(RLIMIT_FSIZE, &rl) != 0 || nul < 0)
            _exit(120);
        dup2(nul, 1);
        dup2(p[1], 2);
        execv(argv[0], (char *const *)argv);
        _exit(127);
    }
    close(p[1]);
    size_t n = 0;
    char junk[512];
    for (;;) { /* read to the end; what does not fit is dropped */
        size_t room = cap - 1 - n;
        ssize_t k = read(p[0], room ? errbuf + n : junk, room ? room : sizeof junk);
        if (k <= 0)
            break;
        if (room)
            n += (size_t)k;
    }
    errbuf[n] = '\0';
    close(p[0]);
    int ws;
    assert_int_equal(waitpid(pid, &ws, 0), pid);
    return WIFSIGNALED(ws) ? 128 + WTERMSIG(ws) : WEXITSTATUS(ws);
}

/* Number of temporary files ("." name with ".tmp") under dir, recursively. */
static int count_tmp(const char *dir)
{
    DIR *d = opendir(dir);
    if (!d)
        return 0;
    int n = 0;
    struct dirent *e;
    while ((e = readdir(d)) != NULL) {
        if (!strcmp(e->d_name, ".") || !strcmp(e->d_name, ".."))
            continue;
        char p[2048];
        snprintf(p, sizeof p, "%s/%s", dir, e->d_name);
        struct stat st;
        if (lstat(p, &st) == 0 && S_ISDIR(st.st_mode))
            n += count_tmp(p);
        else if (e->d_name[0] == '.' && strstr(e->d_name, ".tmp"))
            n++;
    }
    closedir(d);
    return n;
}

/* Before the fix the kernel's SIGXFSZ killed holdfast mid-write (exit
 * 128 + 25) and left .NAME.tmpXXXXXX files; now each command exits 2 with
 * a message and leaves no temporary file, and no file under a target name
 * that the limit cut short. */
static void file_size_limit_cli(void **state)
{
    (void)state;
    const char *bin = getenv("HF_BIN"), *root = getenv("HF_ROOT");
    if (!bin || !root)
        fail_msg("HF_BIN and HF_ROOT must be set (make check sets them)");
    char tmp[256], casefile[1100], csv[1100], prof[1100], run[1100], err[4096];
    assert_int_equal(hf_test_tmpdir_make(tmp, sizeof tmp, "fsize"), 0);
    snprintf(casefile, sizeof casefile, "%s/cases/barge.yaml", root);
    snprintf(csv, sizeof csv, "%s/sweep.csv", tmp);
    snprintf(prof, sizeof prof, "%s/profiles", tmp);
    snprintf(run, sizeof run, "%s/run", tmp);

    /* A 20,001-row sweep CSV (about 2 MB) under a 64 KiB limit. */
    const char *sweep[] = {bin,     "sweep", casefile,  "--vary", "site.water_level=-1:1:0.0001",
                           "--csv", csv,     "--quiet", NULL};
    int rc = run_size_limited(sweep, 65536, NULL, err, sizeof err);
    if (rc != 2)
        fail_msg("sweep under ulimit -f: exit %d, expected 2; stderr: %s", rc, err);
    assert_non_null(strstr(err, "holdfast"));
    struct stat st;
    if (stat(csv, &st) == 0)
        fail_msg("%s exists (%lld bytes) although its writing failed", csv, (long long)st.st_size);

    /* Line profiles (one CSV per line) under a 4 KiB limit. */
    const char *lines[] = {bin, "lines", casefile, "--profiles", prof, NULL};
    rc = run_size_limited(lines, 4096, NULL, err, sizeof err);
    if (rc != 2)
        fail_msg("lines --profiles under ulimit -f: exit %d, expected 2; stderr: %s", rc, err);
    assert_non_null(strstr(err, "file size limit"));

    /* A whole run folder under a 64 KiB limit (the report is larger). */
    const char *runargv[] = {bin, "run", casefile, "--out", run, "--quiet", NULL};
    rc = run_size_limited(runargv, 65536, NULL, err, sizeof err);
    if (rc != 2)
        fail_msg("run under ulimit -f: exit %d, expected 2; stderr: %s", rc, err);
    assert_true(err[0] != '\0');

    /* Standard output redirected to a file under a 1 KiB limit: the text
     * of `check` and `lines` is longer (main ignores SIGXFSZ at start). */
    char text[1100];
    snprintf(text, sizeof text, "%s/stdout.txt", tmp);
    const char *check[] = {bin, "check", casefile, NULL};
    rc = run_size_limited(check, 1024, text, err, sizeof err);
    if (rc != 2)
        fail_msg("check > file under ulimit -f: exit %d, expected 2; stderr: %s", rc, err);
    assert_non_null(strstr(err, "standard output"));
    const char *table[] = {bin, "lines", casefile, NULL};
    rc = run_size_limited(table, 1024, text, err, sizeof err);
    if (rc != 2)
        fail_msg("lines > file under ulimit -f: exit %d, expected 2; stderr: %s", rc, err);

    int left = count_tmp(tmp);
    if (left)
        fail_msg("%d temporary files left under %s", left, tmp);
    printf("limits: sweep, lines --profiles, run, check and lines to standard output under a "
           "file size limit: exit 2, no temporary file left\n");
    hf_test_tmpdir_remove(tmp);
}

int main(void)
{
    hf_gsl_handler_install();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(file_size_limit),
        cmocka_unit_test(large_valid_file),
        cmocka_unit_test(flat_list_memory),
        cmocka_unit_test(nesting_limit),
        cmocka_unit_test(long_strings),
        cmocka_unit_test(ten_thousand_lines),
        cmocka_unit_test(sections_limit),
        cmocka_unit_test(fuzz_regressions),
        cmocka_unit_test(killed_run_leaves_whole_files),
        cmocka_unit_test(file_size_limit_cli),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
