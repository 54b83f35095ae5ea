/* test_alloc.c - the counted allocator and its failure injection. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/alloc.h"

static int reset(void **state)
{
    (void)state;
    hf_alloc_fail_at(0, 0);
    return 0;
}

static void every_entry_point_counts_once(void **state)
{
    (void)state;
    hf_alloc_fail_at(0, 0);
    assert_int_equal(hf_alloc_count(), 0);
    void *a = hf_malloc(37);
    assert_int_equal(hf_alloc_count(), 1);
    void *b = hf_calloc(5, 11);
    assert_int_equal(hf_alloc_count(), 2);
    a = hf_realloc(a, 2385);
    assert_int_equal(hf_alloc_count(), 3);
    char *c = hf_strdup("fairlead");
    assert_int_equal(hf_alloc_count(), 4);
    char *d = hf_strndup("touchdown", 5);
    assert_int_equal(hf_alloc_count(), 5);
    hf_free(a);
    hf_free(b);
    hf_free(c);
    hf_free(d);
    hf_free(NULL);
    assert_int_equal(hf_alloc_count(), 5); /* freeing is not counted */
    hf_alloc_fail_at(0, 0);
    assert_int_equal(hf_alloc_count(), 0); /* arming (or disarming) restarts the count */
}

static void nth_allocation_fails_once(void **state)
{
    (void)state;
    hf_alloc_fail_at(3, 0);
    void *p1 = hf_malloc(16);
    char *p2 = hf_strdup("clump");
    void *p3 = hf_calloc(4, 8);
    void *p4 = hf_malloc(16);
    void *p5 = hf_realloc(NULL, 9);
    assert_non_null(p1);
    assert_non_null(p2);
    assert_null(p3);
    assert_non_null(p4);
    assert_non_null(p5);
    assert_int_equal(hf_alloc_count(), 5);
    hf_free(p1);
    hf_free(p2);
    hf_free(p4);
    hf_free(p5);
}

static void sticky_failure_fails_every_later_call(void **state)
{
    (void)state;
    hf_alloc_fail_at(2, 1);
    void *p1 = hf_malloc(8);
    assert_non_null(p1);
    for (int i = 0; i < 7; i++)
        assert_null(hf_malloc(8));
    assert_null(hf_calloc(1, 1));
    assert_null(hf_strdup("buoy"));
    assert_null(hf_strndup("buoy", 2));
    assert_null(hf_realloc(NULL, 3));
    hf_free(p1);
    hf_alloc_fail_at(0, 0);
    void *p2 = hf_malloc(8);
    assert_non_null(p2); /* disarmed */
    hf_free(p2);
}

static void first_allocation_can_fail(void **state)
{
    (void)state;
    hf_alloc_fail_at(1, 0);
    assert_null(hf_strdup("anchor"));
    char *p = hf_strdup("anchor");
    assert_non_null(p);
    assert_string_equal(p, "anchor");
    hf_free(p);
}

/* C11 7.22.3.5: when realloc fails the old block is left untouched. */
static void failed_realloc_keeps_the_old_block(void **state)
{
    (void)state;
    hf_alloc_fail_at(0, 0);
    unsigned char *p = hf_malloc(64);
    assert_non_null(p);
    for (int i = 0; i < 64; i++)
        p[i] = (unsigned char)(i * 7 + 3);
    hf_alloc_fail_at(1, 0);
    assert_null(hf_realloc(p, 1 << 20));
    for (int i = 0; i < 64; i++)
        assert_int_equal(p[i], (unsigned char)(i * 7 + 3));
    hf_free(p);
}

static void zero_sizes_give_freeable_blocks(void **state)
{
    (void)state;
    hf_alloc_fail_at(0, 0);
    void *a = hf_malloc(0);
    void *b = hf_calloc(0, 8);
    void *c = hf_calloc(8, 0);
    void *d = hf_realloc(NULL, 0);
    assert_non_null(a);
    assert_non_null(b);
    assert_non_null(c);
    assert_non_null(d);
    hf_free(a);
    hf_free(b);
    hf_free(c);
    hf_free(d);
}

static void calloc_zeroes_and_checks_overflow(void **state)
{
    (void)state;
    hf_alloc_fail_at(0, 0);
    unsigned char *z = hf_calloc(513, 3);
    assert_non_null(z);
    for (int i = 0; i < 513 * 3; i++)
        assert_int_equal(z[i], 0);
    hf_free(z);
    /* count * size overflows size_t: must fail, not allocate a small block. */
    assert_null(hf_calloc(SIZE_MAX / 2 + 2, 2));
    assert_null(hf_malloc(SIZE_MAX));
}

static void strndup_copies_at_most_n(void **state)
{
    (void)state;
    hf_alloc_fail_at(0, 0);
    char *a = hf_strndup("sixstrand", 3);
    char *b = hf_strndup("ab", 100);
    char *c = hf_strndup("", 0);
    char src[4] = {'w', 'i', 'r', 'e'}; /* not terminated: n bounds the read */
    char *d = hf_strndup(src, 4);
    assert_string_equal(a, "six");
    assert_string_equal(b, "ab");
    assert_string_equal(c, "");
    assert_string_equal(d, "wire");
    hf_free(a);
    hf_free(b);
    hf_free(c);
    hf_free(d);
}

/* The count is process-wide and exact under threads (alloc.h contract). */
static void counting_is_exact_across_threads(void **state)
{
    (void)state;
    enum { PER = 1500 };
    hf_alloc_fail_at(0, 0);
    long nulls = 0;
#pragma omp parallel num_threads(2) reduction(+ : nulls)
    for (int i = 0; i < PER; i++) {
        void *p = hf_malloc((size_t)(i % 61) + 1);
        if (!p)
            nulls++;
        hf_free(p);
    }
    assert_int_equal(nulls, 0);
#ifdef _OPENMP
    assert_int_equal(hf_alloc_count(), 2 * PER);
#else
    assert_int_equal(hf_alloc_count(), PER);
#endif
    /* Exactly one call fails when armed once, whichever thread makes it. */
    hf_alloc_fail_at(777, 0);
    nulls = 0;
#pragma omp parallel num_threads(2) reduction(+ : nulls)
    for (int i = 0; i < PER; i++) {
        void *p = hf_malloc(24);
        if (!p)
            nulls++;
        hf_free(p);
    }
    assert_int_equal(nulls, 1);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test_teardown(every_entry_point_counts_once, reset),
        cmocka_unit_test_teardown(nth_allocation_fails_once, reset),
        cmocka_unit_test_teardown(sticky_failure_fails_every_later_call, reset),
        cmocka_unit_test_teardown(first_allocation_can_fail, reset),
        cmocka_unit_test_teardown(failed_realloc_keeps_the_old_block, reset),
        cmocka_unit_test_teardown(zero_sizes_give_freeable_blocks, reset),
        cmocka_unit_test_teardown(calloc_zeroes_and_checks_overflow, reset),
        cmocka_unit_test_teardown(strndup_copies_at_most_n, reset),
        cmocka_unit_test_teardown(counting_is_exact_across_threads, reset),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
