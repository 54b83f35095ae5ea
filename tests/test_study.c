/* test_study.c - case spaces, shards and the ordered parallel row stream. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/alloc.h"
#include "holdfast/study.h"

/* |a - b| <= tol, with both values in the failure message. */
#define assert_near(a, b, tol)                                                                     \
    do {                                                                                           \
        double a_ = (a), b_ = (b);                                                                 \
        if (!(fabs(a_ - b_) <= (tol)))                                                             \
            fail_msg("%.17g != %.17g (tolerance %g)", a_, b_, (double)(tol));                      \
    } while (0)

static hf_vary range(const char *path, double from, double to, double step)
{
    hf_vary v;
    memset(&v, 0, sizeof v);
    v.path = (char *)path;
    v.from = from;
    v.to = to;
    v.step = step;
    return v;
}

static void test_vary_count(void **s)
{
    (void)s;
    hf_vary v = range("a", 0.0, 1.0, 0.1); /* 0.1 is not exact in binary: 11 values */
    assert_int_equal(hf_study_vary_count(&v), 11);
    assert_near(hf_study_vary_value(&v, 10), 1.0, 1e-12);
    v = range("a", 2.385, 2.385, 0.5); /* a single value */
    assert_int_equal(hf_study_vary_count(&v), 1);
    v = range("a", 10.0, 4.0, -1.5); /* descending: 10, 8.5, 7, 5.5, 4 */
    assert_int_equal(hf_study_vary_count(&v), 5);
    assert_near(hf_study_vary_value(&v, 4), 4.0, 0.0);
    v = range("a", 0.0, 1.0, 0.3); /* 0, 0.3, 0.6, 0.9: TO not on the grid */
    assert_int_equal(hf_study_vary_count(&v), 4);
    v = range("a", 0.0, 1.0, 0.0);
    assert_int_equal(hf_study_vary_count(&v), 0);
    v = range("a", 0.0, 1.0, -0.1);
    assert_int_equal(hf_study_vary_count(&v), 0);
    v = range("a", 0.0, NAN, 0.1);
    assert_int_equal(hf_study_vary_count(&v), 0);
    v = range("a", 0.0, INFINITY, 1.0);
    assert_int_equal(hf_study_vary_count(&v), 0);
    v = range("a", 0.0, 1e300, 1e-300); /* absurdly many: above the limit */
    assert_true(hf_study_vary_count(&v) > HF_STUDY_MAX_VALUES);
    /* Values are FROM + i*STEP, not accumulated: after 1e6 steps of 0.1 an
     * accumulated sum drifts by ~1e-6 (rounding errors add up: Goldberg, "What
     * every computer scientist should know about floating-point arithmetic",
     * ACM Computing Surveys 23(1), 1991), the product stays within one
     * rounding of the exact 100000. */
    v = range("a", 0.0, 1e5, 0.1);
    assert_int_equal(hf_study_vary_count(&v), 1000001);
    assert_near(hf_study_vary_value(&v, 1000000), 1e5, 1e-9);
}

/* The one range rule at its edges (issue 12 item 5).  The count of
 * FROM:TO:STEP is the number of grid points FROM + i STEP up to TO; the
 * rounding of TO - FROM is about one ulp of the values' magnitude (IEEE 754
 * round-to-nearest: Goldberg 1991, cited above), so the end point must be
 * recognised with a tolerance relative to the values, not only the step. */
static void test_range_count_edges(void **s)
{
    (void)s;
    /* 366, 366.00001, ..., 366.0001: 11 points although (TO - FROM) / STEP
     * rounds to 9.99999999962 */
    assert_int_equal(hf_study_range_count(366.0, 366.0001, 0.00001, 1000), 11);
    hf_vary v = range("a", 366.0, 366.0001, 0.00001);
    assert_int_equal(hf_study_vary_count(&v), 11);
    assert_near(hf_study_vary_value(&v, 10), 366.0001, 0.0); /* TO itself */
    assert_near(hf_study_vary_value(&v, 5), 366.00005, 1e-12);
    /* the same far from zero and descending */
    assert_int_equal(hf_study_range_count(1e6 + 0.0003, 1e6, -0.0001, 1000), 4);
    assert_int_equal(hf_study_range_count(-366.0001, -366.0, 0.00001, 1000), 11);
    /* a point just short of TO by more than rounding is not TO: 0, 0.3, 0.6, 0.9 */
    assert_int_equal(hf_study_range_count(0.0, 1.0, 0.3, 1000), 4);
    assert_int_equal(hf_study_range_count(0.0, 0.999999, 0.1, 1000), 10);
    assert_int_equal(hf_study_range_count(366.0, 366.0000999, 0.00001, 1000), 10);
    /* one point, the limit, invalid ranges */
    assert_int_equal(hf_study_range_count(2.385, 2.385, 0.5, 1000), 1);
    assert_int_equal(hf_study_range_count(0.0, 99.0, 1.0, 100), 100);
    assert_int_equal(hf_study_range_count(0.0, 100.0, 1.0, 100), 101); /* max + 1: over */
    assert_int_equal(hf_study_range_count(0.0, 1.0, 0.0, 1000), 0);
    assert_int_equal(hf_study_range_count(0.0, 1.0, -0.5, 1000), 0);
    assert_int_equal(hf_study_range_count(NAN, 1.0, 0.5, 1000), 0);
    assert_int_equal(hf_study_range_count(-1e308, 1e308, 1.0, 1000), 0); /* span overflows */
    assert_int_equal(hf_study_range_count(0.0, 1.0, 4.9e-324, 1000), 1001);
}

/* Varied angles keep their whole turns (a range 0:720:90 deg spans two
 * turns); a plain number is degrees, "rad" radians; beyond
 * HF_STUDY_MAX_TURNS the exact reduction of hf_units_parse stands. */
static void test_parse_value_turns(void **s)
{
    (void)s;
    const double deg = M_PI / 180.0;
    double x;
    hf_error e;
    assert_int_equal(hf_study_parse_value("720", HF_DIM_ANGLE, &x, &e), HF_OK);
    assert_near(x, 720 * deg, 1e-12);
    assert_int_equal(hf_study_parse_value("-450 deg", HF_DIM_ANGLE, &x, &e), HF_OK);
    assert_near(x, -450 * deg, 1e-12);
    assert_int_equal(hf_study_parse_value("12.5 rad", HF_DIM_ANGLE, &x, &e), HF_OK);
    assert_near(x, 12.5, 1e-15);
    /* 1e15 = 2777777777777 * 360 + 280: the reduced angle, exactly */
    assert_int_equal(hf_study_parse_value("1e15", HF_DIM_ANGLE, &x, &e), HF_OK);
    assert_near(x, 280 * deg, 1e-12);
    /* other dimensions as hf_units_parse; errors kept */
    assert_int_equal(hf_study_parse_value("76 mm", HF_DIM_LENGTH, &x, &e), HF_OK);
    assert_near(x, 0.076, 1e-15);
    assert_int_equal(hf_study_parse_value("0x10", HF_DIM_ANGLE, &x, &e), HF_EINVAL);
    assert_int_equal(hf_study_parse_value("3 kN", HF_DIM_ANGLE, &x, &e), HF_EINVAL);
    /* the range 0:720:90 keeps its nine values */
    hf_vary v = range("hull.heading", 0.0, 0.0, 0.0);
    assert_int_equal(hf_study_parse_value("720", HF_DIM_ANGLE, &v.to, &e), HF_OK);
    assert_int_equal(hf_study_parse_value("90", HF_DIM_ANGLE, &v.step, &e), HF_OK);
    assert_int_equal(hf_study_vary_count(&v), 9);
}

static void test_study_list(void **s)
{
    (void)s;
    hf_study_list l;
    hf_study_list_init(&l);
    assert_int_equal(l.n, 0);
    hf_study_list_free(&l); /* empty: nothing to free */
    hf_study_list_free(NULL);
    l.v = hf_calloc(2, sizeof *l.v);
    assert_non_null(l.v);
    l.n = 2;
    l.v[0].name = hf_strdup("a");
    l.v[1].nvary = 1;
    l.v[1].vary = hf_calloc(1, sizeof *l.v[1].vary);
    assert_non_null(l.v[1].vary);
    l.v[1].vary[0].path = hf_strdup("site.depth");
    hf_study_list_free(&l); /* everything owned is released (checked by the sanitizer runs) */
    assert_int_equal(l.n, 0);
    assert_null(l.v);
    assert_string_equal(hf_study_kind_name(HF_STUDY_INVERT), "invert");
    assert_string_equal(hf_study_kind_name((hf_study_kind)99), "?");
}

static void test_grid_factorial(void **s)
{
    (void)s;
    double l0[] = {7.25, -3.5};
    hf_vary v[3] = {range("a", 1.0, 3.0, 1.0), range("b", 0.0, 0.0, 1.0), range("c", 0, 0, 1)};
    v[2].nvalues = 2;
    v[2].values = l0;
    hf_study_grid g;
    hf_error e;
    assert_int_equal(hf_study_grid_init(&g, v, 3, 0, &e), HF_OK);
    assert_int_equal(g.ncases, 3 * 1 * 2);
    /* First parameter slowest, last fastest: the order of nested loops. */
    uint64_t k = 0;
    for (int a = 0; a < 3; a++)
        for (int c = 0; c < 2; c++, k++) {
            double val[3];
            size_t idx[3];
            hf_study_grid_index(&g, k, idx);
            assert_int_equal(idx[0], a);
            assert_int_equal(idx[1], 0);
            assert_int_equal(idx[2], c);
            hf_study_grid_values(&g, k, val);
            assert_near(val[0], 1.0 + a, 0.0);
            assert_near(val[2], l0[c], 0.0);
        }
}

static void test_grid_zip(void **s)
{
    (void)s;
    double l0[] = {7.25, -3.5, 11.0};
    hf_vary v[2] = {range("a", 0.5, 1.5, 0.5), range("b", 0, 0, 1)};
    v[1].nvalues = 3;
    v[1].values = l0;
    hf_study_grid g;
    hf_error e;
    assert_int_equal(hf_study_grid_init(&g, v, 2, 1, &e), HF_OK);
    assert_int_equal(g.ncases, 3);
    double val[2];
    hf_study_grid_values(&g, 2, val);
    assert_near(val[0], 1.5, 0.0);
    assert_near(val[1], 11.0, 0.0);
    /* Unequal lengths are refused with both names in the message. */
    v[0] = range("site.depth", 0.5, 2.0, 0.5);
    assert_int_equal(hf_study_grid_init(&g, v, 2, 1, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "site.depth has 4"));
    assert_non_null(strstr(e.text, "b has 3"));
}

static void test_grid_errors(void **s)
{
    (void)s;
    hf_study_grid g;
    hf_error e;
    hf_vary v[HF_STUDY_MAX_VARY + 1];
    for (int i = 0; i <= HF_STUDY_MAX_VARY; i++)
        v[i] = range("p", 0.0, 9.0, 1.0);
    assert_int_equal(hf_study_grid_init(&g, v, 0, 0, &e), HF_EINVAL);
    assert_int_equal(hf_study_grid_init(&g, v, HF_STUDY_MAX_VARY + 1, 0, &e), HF_ELIMIT);
    /* 10^13 cases: above the 1e12 limit, and no overflow on the way. */
    assert_int_equal(hf_study_grid_init(&g, v, 13, 0, &e), HF_ELIMIT);
    assert_int_equal(hf_study_grid_init(&g, v, 12, 0, &e), HF_OK);
    assert_true(g.ncases == 1000000000000ull);
    v[1] = range("q", 0.0, 1.0, -1.0);
    assert_int_equal(hf_study_grid_init(&g, v, 2, 0, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "q:"));
    double bad[] = {1.0, NAN};
    v[1].nvalues = 2;
    v[1].values = bad;
    assert_int_equal(hf_study_grid_init(&g, v, 2, 0, &e), HF_EINVAL);
    /* The last case of a big grid decodes to the last value of every parameter. */
    for (int i = 0; i < 12; i++)
        v[i] = range("p", 0.0, 9.0, 1.0);
    assert_int_equal(hf_study_grid_init(&g, v, 12, 0, &e), HF_OK);
    double val[12];
    hf_study_grid_values(&g, g.ncases - 1, val);
    for (int i = 0; i < 12; i++)
        assert_near(val[i], 9.0, 0.0);
    hf_study_grid_values(&g, 123456789012ull, val); /* digits of k, last fastest */
    assert_near(val[0], 1.0, 0.0);
    assert_near(val[11], 2.0, 0.0);
    assert_near(val[6], 7.0, 0.0);
}

static void test_shard_range(void **s)
{
    (void)s;
    uint64_t totals[] = {0, 1, 7, 100, 1000003, 1000000000000ull};
    unsigned ns[] = {1, 2, 3, 7, 64, 1000000};
    for (size_t a = 0; a < sizeof totals / sizeof totals[0]; a++)
        for (size_t b = 0; b < sizeof ns / sizeof ns[0]; b++) {
            uint64_t prev = 0, mn = UINT64_MAX, mx = 0;
            for (unsigned k = 1; k <= ns[b]; k++) {
                uint64_t lo, hi;
                hf_study_shard_range(totals[a], k, ns[b], &lo, &hi);
                assert_true(lo == prev); /* contiguous and in order */
                assert_true(hi >= lo);
                if (hi - lo < mn)
                    mn = hi - lo;
                if (hi - lo > mx)
                    mx = hi - lo;
                prev = hi;
            }
            assert_true(prev == totals[a]); /* covers everything exactly once */
            assert_true(mx - mn <= 1);
        }
}

static void test_shard_parse(void **s)
{
    (void)s;
    unsigned k, n;
    hf_error e;
    assert_int_equal(hf_study_shard_parse("3/17", &k, &n, &e), HF_OK);
    assert_int_equal(k, 3);
    assert_int_equal(n, 17);
    const char *bad[] = {"",      "0/4",  "5/4", "1/0", "-1/4",      "1/-4",
                         "1/4x",  "1 /4", "a/b", "1",   "1/1000001", "99999999999999999999/1",
                         "1/4/5", "+1/4"};
    for (size_t i = 0; i < sizeof bad / sizeof bad[0]; i++)
        assert_int_equal(hf_study_shard_parse(bad[i], &k, &n, &e), HF_EINVAL);
}

/* A synthetic row function whose value depends on the warm-start history of
 * its chain, as a real solver's last bits can: a wrong chain rebuild or a
 * thread-dependent history changes the text. */
typedef struct {
    double prev;
    long calls;
} synth;

static int synth_row(void *state, uint64_t k, int start, int emit, char *buf, size_t cap)
{
    synth *st = state;
    if (start)
        st->prev = 0.0;
    st->prev = st->prev / 3.0 + sqrt((double)k + 0.385);
    st->calls++;
    if (!emit)
        return 0;
    return snprintf(buf, cap, "%llu,%.17g\n", (unsigned long long)k, st->prev);
}

static char *stream_text(uint64_t begin, uint64_t end, int jobs, size_t block, size_t *len,
                         hf_status *status)
{
    synth st[4] = {{0}};
    void *states[4] = {&st[0], &st[1], &st[2], &st[3]};
    hf_study_stream_options o = {0};
    o.jobs = jobs;
    o.row_cap = 64;
    o.block = block;
    char *text = NULL;
    FILE *f = open_memstream(&text, len);
    hf_error e;
    *status = hf_study_stream(begin, end, states, synth_row, &o, f, &e);
    fclose(f);
    return text;
}

static void test_stream_order_and_jobs(void **s)
{
    (void)s;
    size_t n1, n2;
    hf_status s1, s2;
    char *a = stream_text(0, 5003, 1, 0, &n1, &s1);
    char *b = stream_text(0, 5003, 2, 64, &n2, &s2);
    assert_int_equal(s1, HF_OK);
    assert_int_equal(s2, HF_OK);
    assert_int_equal(n1, n2);
    assert_memory_equal(a, b, n1);
    /* Rows in case order, each once. */
    const char *p = a;
    for (unsigned long long k = 0; k < 5003; k++) {
        unsigned long long got = strtoull(p, NULL, 10);
        assert_true(got == k);
        p = strchr(p, '\n') + 1;
    }
    assert_true(*p == '\0');
    free(a);
    free(b);
}

static void test_stream_shards_concatenate(void **s)
{
    (void)s;
    size_t nfull;
    hf_status st;
    uint64_t total = 1237; /* not a multiple of the chain or the block */
    char *full = stream_text(0, total, 2, 48, &nfull, &st);
    assert_int_equal(st, HF_OK);
    size_t off = 0;
    for (unsigned k = 1; k <= 7; k++) {
        uint64_t lo, hi;
        size_t n;
        hf_study_shard_range(total, k, 7, &lo, &hi);
        char *part = stream_text(lo, hi, 2, 0, &n, &st);
        assert_int_equal(st, HF_OK);
        assert_true(off + n <= nfull);
        assert_memory_equal(part, full + off, n);
        off += n;
        free(part);
    }
    assert_int_equal(off, nfull);
    free(full);
}

static int long_row(void *state, uint64_t k, int start, int emit, char *buf, size_t cap)
{
    (void)state;
    (void)start;
    (void)emit;
    if (k == 700)
        return (int)cap; /* does not fit */
    return snprintf(buf, cap, "x\n");
}

static void test_stream_errors(void **s)
{
    (void)s;
    synth st[2] = {{0}};
    void *states[2] = {&st[0], &st[1]};
    hf_study_stream_options o = {0};
    o.jobs = 2;
    o.row_cap = 64;
    hf_error e;
    FILE *f = tmpfile();
    assert_non_null(f);
    assert_int_equal(hf_study_stream(0, 1000, states, long_row, &o, f, &e), HF_ELIMIT);
    assert_non_null(strstr(e.text, "longer than 64"));
    /* Every allocation failure is reported, nothing leaks (run under ASan). */
    for (long i = 1; i <= 3; i++) {
        hf_alloc_fail_at(i, 0);
        assert_int_equal(hf_study_stream(0, 10, states, synth_row, &o, f, &e), HF_ENOMEM);
    }
    hf_alloc_fail_at(0, 0);
    o.jobs = 0;
    assert_int_equal(hf_study_stream(0, 10, states, synth_row, &o, f, &e), HF_EINVAL);
    o.jobs = 2;
    volatile int stop = 1;
    o.stop = &stop;
    assert_int_equal(hf_study_stream(0, 10, states, synth_row, &o, f, &e), HF_EIO);
    o.stop = NULL;
    /* A read-only stream: the write fails and says so. */
    FILE *ro = fopen("/dev/null", "r");
    assert_non_null(ro);
    assert_int_equal(hf_study_stream(0, 100, states, synth_row, &o, ro, &e), HF_EIO);
    fclose(ro);
    fclose(f);
    /* An empty range writes nothing and succeeds. */
    size_t n;
    hf_status stt;
    char *t = stream_text(42, 42, 2, 0, &n, &stt);
    assert_int_equal(stt, HF_OK);
    assert_int_equal(n, 0);
    free(t);
}

static uint64_t seen_done, seen_total;
static int progress_calls;

static void progress(void *ctx, uint64_t done, uint64_t total)
{
    (void)ctx;
    assert_true(done > seen_done || progress_calls == 0);
    seen_done = done;
    seen_total = total;
    progress_calls++;
}

static void test_stream_progress(void **s)
{
    (void)s;
    synth st[1] = {{0}};
    void *states[1] = {&st[0]};
    hf_study_stream_options o = {0};
    o.jobs = 1;
    o.row_cap = 64;
    o.block = 100; /* rounded up to 112, a multiple of the chain */
    o.progress = progress;
    FILE *f = tmpfile();
    hf_error e;
    assert_int_equal(hf_study_stream(5, 1005, states, synth_row, &o, f, &e), HF_OK);
    fclose(f);
    assert_true(seen_done == 1000 && seen_total == 1000);
    assert_int_equal(progress_calls, 9); /* blocks end at 112, 224, ..., 896, then 1005 */
    /* The chain holding case 5 was rebuilt from case 0: 1005 evaluations. */
    assert_int_equal(st[0].calls, 1005);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_vary_count),
        cmocka_unit_test(test_range_count_edges),
        cmocka_unit_test(test_study_list),
        cmocka_unit_test(test_parse_value_turns),
        cmocka_unit_test(test_grid_factorial),
        cmocka_unit_test(test_grid_zip),
        cmocka_unit_test(test_grid_errors),
        cmocka_unit_test(test_shard_range),
        cmocka_unit_test(test_shard_parse),
        cmocka_unit_test(test_stream_order_and_jobs),
        cmocka_unit_test(test_stream_shards_concatenate),
        cmocka_unit_test(test_stream_errors),
        cmocka_unit_test(test_stream_progress),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
