/* test_alloc_fail.c - every allocation of a whole load and run made to fail in turn. */
/*
 * hf_alloc_fail_at(n) makes the n-th allocation fail (alloc.h).  For a case
 * load, and for a whole computation (load, copy, resolve, spread workspace,
 * a restoring curve, the 6x6 stiffness, balance of every load case intact
 * and broken), the test first counts the allocations of a clean run, then
 * runs again once for every n from 1 to that count, in both modes (only the
 * n-th fails; the n-th and all later fail).  Each run must end in an error
 * status (HF_ENOMEM for the loader and constructors), leave the model empty,
 * not crash, and give back every byte: the heap in use (glibc mallinfo2) is
 * the same after the run as before it, and under `make sanitize` LeakSanitizer
 * checks the same at exit.  The number of failure points is printed.
 *
 * Cases: fuzz/seeds/full.yaml (every section of the format) and the barge
 * demo, cases/barge.yaml, when it exists.
 */
#include <malloc.h>
#include <math.h>
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
#include "holdfast/alloc.h"
#include "holdfast/balance.h"
#include "holdfast/case.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"

/* Bytes of heap in use (constant when the allocator does not say, e.g.
 * under ASan, where LeakSanitizer takes over).  Exact only without glibc's
 * per-thread cache, whose free chunks count as in use: main() re-executes
 * the test with the cache off. */
static size_t heap_in_use(void)
{
    struct mallinfo2 mi = mallinfo2();
    return mi.uordblks;
}

/* The name the case buffer is loaded under: the case file's path, so that
 * the paths in it (the design tables of issue 14) resolve beside it. */
static const char *buffer_name = "alloc-fail.yaml";

typedef struct {
    hf_status status;
    const char *step; /* where the chain stopped */
    hf_error err;
} outcome;

/* Load only. */
static void run_load(const char *text, size_t len, outcome *o)
{
    hf_model m;
    hf_model_init(&m);
    hf_error_clear(&o->err);
    o->step = "load";
    o->status = hf_case_load_buffer(text, len, buffer_name, &m, &o->err);
    if (o->status != HF_OK &&
        (m.nlines || m.lines || m.ncomponents || m.components || m.title || m.source_path))
        o->step = "load left a non-empty model";
    hf_model_free(&m);
}

/* The whole chain; stops at the first failing step. */
static void run_chain(const char *text, size_t len, outcome *o)
{
    hf_model m, copy;
    hf_model_init(&m);
    hf_model_init(&copy);
    hf_spread *sp = NULL;
    hf_balance *bal = NULL;
    hf_error_clear(&o->err);
    hf_status st;
    o->step = "load";
    st = hf_case_load_buffer(text, len, buffer_name, &m, &o->err);
    if (st != HF_OK)
        goto out;
    o->step = "copy";
    st = hf_model_copy(&copy, &m);
    if (st != HF_OK) {
        hf_error_set(&o->err, st, "hf_model_copy failed");
        goto out;
    }
    o->step = "resolve";
    if ((st = hf_model_resolve(&copy, &o->err)) != HF_OK)
        goto out;
    o->step = "spread alloc";
    sp = hf_spread_alloc(&copy, &o->err);
    if (!sp) {
        st = o->err.status;
        goto out;
    }
    o->step = "curve";
    hf_pose rest, pose;
    hf_spread_pose_rest(&copy, &rest);
    hf_spread_result res;
    for (int k = -4; k <= 4; k++) {
        /* A restoring curve along 15 deg, offsets -6 m ... 6 m. */
        double off[3] = {1.5 * k * cos(0.2618), 1.5 * k * sin(0.2618), 0.0};
        pose = rest;
        hf_spread_pose_offset(&pose, off);
        if ((st = hf_spread_solve(sp, &pose, &res, &o->err)) != HF_OK)
            goto out;
    }
    o->step = "stiffness";
    double K[6][6];
    if ((st = hf_spread_stiffness(sp, &rest, K, &res, &o->err)) != HF_OK)
        goto out;
    o->step = "balance alloc";
    bal = hf_balance_alloc(&copy, &o->err);
    if (!bal) {
        st = o->err.status;
        goto out;
    }
    o->step = "balance";
    for (size_t i = 0; i < copy.nloads; i++) {
        st = hf_balance_run(bal, &copy.loads[i], &o->err);
        if (st == HF_ENOMEM)
            goto out;
    }
    st = HF_OK; /* a load case without equilibrium is a result, not a failure */
    o->step = "done";
out:
    o->status = st;
    hf_balance_free(bal);
    hf_spread_free(sp);
    hf_model_free(&copy);
    hf_model_free(&m);
}

typedef void (*runner)(const char *, size_t, outcome *);

/* Returns the number of failure points exercised. */
static long sweep(const char *name, const char *text, size_t len, runner run, int sticky)
{
    outcome o;
    /* The clean run: must succeed, and counts the allocations.  Run twice so
     * one-time initialisation (libc, GSL, OpenMP) is out of the way. */
    hf_alloc_fail_at(0, 0);
    run(text, len, &o);
    hf_alloc_fail_at(0, 0);
    size_t heap0 = heap_in_use();
    run(text, len, &o);
    long total = hf_alloc_count();
    if (o.status != HF_OK)
        fail_msg("%s: the clean run fails at %s: %s", name, o.step, o.err.text);
    assert_int_equal(heap_in_use(), heap0);
    assert_true(total > 0);
    for (long n = 1; n <= total; n++) {
        size_t before = heap_in_use();
        hf_alloc_fail_at(n, sticky);
        run(text, len, &o);
        hf_alloc_fail_at(0, 0);
        if (o.status == HF_OK)
            fail_msg("%s: allocation %ld of %ld failed%s but the run reports success", name, n,
                     total, sticky ? " (and all later)" : "");
        if (o.status != HF_ENOMEM)
            fail_msg("%s: allocation %ld of %ld failed at step %s: status %s, not out of memory "
                     "(%s)",
                     name, n, total, o.step, hf_status_str(o.status), o.err.text);
        if (o.err.status != HF_ENOMEM || o.err.text[0] == '\0')
            fail_msg("%s: allocation %ld: error record not filled (status %d, \"%s\")", name, n,
                     (int)o.err.status, o.err.text);
        if (strcmp(o.step, "load left a non-empty model") == 0)
            fail_msg("%s: allocation %ld: the failed load left data in the model", name, n);
        size_t after = heap_in_use();
        if (after != before)
            fail_msg("%s: allocation %ld of %ld failed at step %s: %zd bytes leaked", name, n,
                     total, o.step, (ssize_t)(after - before));
    }
    return total;
}

static long points_total;

/* rel is part of the repository: a file that cannot be read fails the test. */
static void sweep_file(const char *rel)
{
    size_t len = 0;
    char path[1024];
    hf_test_root_path(path, sizeof path, rel);
    char *text = hf_test_file_read(path, &len);
    if (!text)
        fail_msg("cannot read %s (HF_ROOT=%s)", rel, getenv("HF_ROOT"));
    buffer_name = path;
    long a = sweep(rel, text, len, run_load, 0);
    long b = sweep(rel, text, len, run_load, 1);
    long c = sweep(rel, text, len, run_chain, 0);
    long d = sweep(rel, text, len, run_chain, 1);
    printf("alloc_fail: %s: load %ld allocation points (x2 modes), whole run %ld points "
           "(x2 modes)\n",
           rel, a, c);
    assert_int_equal(a, b);
    assert_int_equal(c, d);
    assert_true(c > a);
    points_total += a + b + c + d;
    free(text);
}

static void full_seed(void **state)
{
    (void)state;
    sweep_file("fuzz/seeds/full.yaml");
}

static void barge_demo(void **state)
{
    (void)state;
    sweep_file("cases/barge.yaml");
}

static void report(void **state)
{
    (void)state;
    printf("alloc_fail: %ld failure points exercised in all\n", points_total);
    assert_true(points_total > 0);
}

int main(int argc, char **argv)
{
    (void)argc;
    const char *tun = getenv("GLIBC_TUNABLES");
    if (!tun || !strstr(tun, "glibc.malloc.tcache_count=0")) {
        char env[512];
        snprintf(env, sizeof env, "%s%sglibc.malloc.tcache_count=0", tun ? tun : "",
                 tun && *tun ? ":" : "");
        setenv("GLIBC_TUNABLES", env, 1);
        execv("/proc/self/exe", argv);
        fprintf(stderr, "alloc_fail: cannot re-execute with the tcache off\n");
        return 1;
    }
    hf_gsl_handler_install();
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(full_seed),
        cmocka_unit_test(barge_demo),
        cmocka_unit_test(report),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
