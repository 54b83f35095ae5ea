/* test_csv.c - CSV writer: number formatting against printf/strtod, RFC 4180 quoting, rows. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include "support.h"
#include "holdfast/csv.h"

/* xorshift64*: deterministic, high-entropy test inputs (Vigna 2016). */
static uint64_t rng_state = 0x9E3779B97F4A7C15ull;
static uint64_t rng(void)
{
    rng_state ^= rng_state >> 12;
    rng_state ^= rng_state << 25;
    rng_state ^= rng_state >> 27;
    return rng_state * 0x2545F4914F6CDD1Dull;
}

/* A random finite double from random bits: every exponent, subnormals included. */
static double random_bits_double(void)
{
    for (;;) {
        uint64_t u = rng();
        double d;
        memcpy(&d, &u, sizeof d);
        if (isfinite(d))
            return d;
    }
}

/* A random double of "engineering" size: mantissa uniform, exponent -12..12. */
static double random_eng_double(void)
{
    double m = (double)(rng() >> 11) / 9007199254740992.0; /* [0, 1) */
    int e = (int)(rng() % 25) - 12;
    double v = (1.0 + 9.0 * m) * pow(10.0, e);
    return (rng() & 1) ? -v : v;
}

/* The reference: the C library's printf "%.*g" (ISO C 7.21.6.1). */
static void expect_same_as_printf(double v, int digits)
{
    char ours[HF_CSV_NUMBER_MAX], ref[64];
    if (!isfinite(v))
        return; /* nextafter(DBL_MAX, inf); non-finite values are tested apart */
    size_t n = hf_csv_format_double(ours, v, digits);
    snprintf(ref, sizeof ref, "%.*g", digits, v);
    if (strcmp(ours, ref) != 0 || n != strlen(ref)) {
        print_error("value %a digits %d: ours \"%s\" printf \"%s\"\n", v, digits, ours, ref);
        fail();
    }
}

static void test_format_matches_printf_random_bits(void **state)
{
    (void)state;
    for (int i = 0; i < 200000; i++) {
        double v = random_bits_double();
        expect_same_as_printf(v, 10);
        if (i % 8 == 0)
            expect_same_as_printf(v, 1 + (int)(rng() % 17));
    }
}

static void test_format_matches_printf_engineering(void **state)
{
    (void)state;
    for (int i = 0; i < 200000; i++) {
        double v = random_eng_double();
        expect_same_as_printf(v, 10);
        expect_same_as_printf(v, 8);
        if (i % 4 == 0)
            expect_same_as_printf(v, 1 + (int)(rng() % 17));
    }
}

/* Edges: zero, signed zero, powers of ten and their neighbours, exact
 * decimal ties (round half to even in glibc), the largest and smallest
 * doubles, subnormals, the switch points between %f and %e style. */
static void test_format_edges(void **state)
{
    (void)state;
    static const double edge[] = {
        0.0,
        -0.0,
        1.0,
        -1.0,
        0.1,
        0.5,
        2.385,
        -2.385,
        9.999999999,
        9.9999999995,
        9.99999999949999,
        99999.999995,
        1e-4,
        9.99999e-5,
        1e-5,
        1e10,
        9999999999.0,
        9999999999.5,
        12345678905.0,
        12345678915.0,
        0.000123456789055,
        1e15,
        1e16,
        1e22,
        1e23,
        1e-300,
        1e300,
        1.7976931348623157e308,
        2.2250738585072014e-308,
        4.9406564584124654e-324,
        2.4703282292062328e-322,
        1.5e-310,
        123456.7890125,
        0.30000000000000004,
        7.0e-10,
        1e-9,
        1e9,
        5e-324,
    };
    for (size_t i = 0; i < sizeof edge / sizeof edge[0]; i++)
        for (int d = 1; d <= 17; d++) {
            expect_same_as_printf(edge[i], d);
            expect_same_as_printf(nextafter(edge[i], INFINITY), d);
            expect_same_as_printf(nextafter(edge[i], -INFINITY), d);
        }
    /* Every power of ten representable as a double, both neighbours. */
    for (int e = -323; e <= 308; e++) {
        double p = pow(10.0, e);
        expect_same_as_printf(p, 10);
        expect_same_as_printf(nextafter(p, 0.0), 10);
        expect_same_as_printf(nextafter(p, INFINITY), 10);
    }
    char b[HF_CSV_NUMBER_MAX];
    hf_csv_format_double(b, -0.0, 10);
    assert_string_equal(b, "-0");
    hf_csv_format_double(b, 2.385, 10);
    assert_string_equal(b, "2.385");
    hf_csv_format_double(b, -1234.5678e-9, 10);
    assert_string_equal(b, "-1.2345678e-06");
    /* Out-of-range digit counts are clamped to 1..17. */
    hf_csv_format_double(b, 2.385, 0);
    assert_string_equal(b, "2");
    hf_csv_format_double(b, 0.1, 40);
    assert_string_equal(b, "0.10000000000000001");
}

/* Round trip: strtod (ISO C 7.22.1.3, correctly rounded in glibc) reads the
 * text back to within half a unit in the last written digit; with 17 digits
 * exactly (IEEE 754-2008, 5.12.2: 17 significant digits identify a double). */
static void test_format_round_trip(void **state)
{
    (void)state;
    char b[HF_CSV_NUMBER_MAX];
    for (int i = 0; i < 100000; i++) {
        double v = (i & 1) ? random_bits_double() : random_eng_double();
        hf_csv_format_double(b, v, 17);
        assert_true(strtod(b, NULL) == v);
        hf_csv_format_double(b, v, 10);
        double back = strtod(b, NULL);
        double a = fabs(v);
        if (a >= 2.2250738585072014e-308) {
            /* half a unit of the 10th digit, relative to the value: <= 5e-10 */
            assert_true(fabs(back - v) <= 5.0000001e-10 * a);
        } else {
            /* subnormal: the text itself is within 5e-10 relative, strtod then
             * rounds to the subnormal grid (spacing 4.94e-324) */
            assert_true(fabs(back - v) <= 5.0000001e-10 * a + 4.95e-324);
        }
    }
}

static void test_format_nonfinite(void **state)
{
    (void)state;
    char b[HF_CSV_NUMBER_MAX] = "x";
    assert_int_equal(hf_csv_format_double(b, NAN, 10), 0);
    assert_string_equal(b, "");
    assert_int_equal(hf_csv_format_double(b, -INFINITY, 10), 0);
    assert_string_equal(b, "");
    assert_int_equal(hf_csv_format_double(b, strtod("1e309", NULL), 10), 0);
    assert_string_equal(b, "");
}

/* RFC 4180 section 2: fields with commas, quotes or line breaks are enclosed
 * in double quotes; a quote inside is written twice. */
static void test_writer_rows_and_quoting(void **state)
{
    (void)state;
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_csv c;
    hf_csv_init(&c, f, 0);
    assert_int_equal(c.digits, HF_CSV_DIGITS_DEFAULT);
    hf_csv_header(&c, "line", "tension_kN", "note", NULL);
    hf_csv_field_str(&c, "bow-port");
    hf_csv_field_double(&c, 1234.56789012345);
    hf_csv_field_str(&c, "plain");
    hf_csv_end_row(&c);
    hf_csv_field_str(&c, "a,b");
    hf_csv_field_double(&c, NAN);
    hf_csv_field_str(&c, "say \"hi\"\nnext");
    hf_csv_end_row(&c);
    hf_csv_field_str(&c, " padded");
    hf_csv_field_double(&c, -INFINITY);
    hf_csv_field_str(&c, NULL);
    hf_csv_end_row(&c);
    hf_csv_field_long(&c, -42);
    hf_csv_field_size(&c, (size_t)7);
    hf_csv_field_empty(&c);
    hf_csv_end_row(&c);
    assert_int_equal(hf_csv_flush(&c), 0);
    assert_int_equal(c.rows, 5);
    assert_int_equal(c.nonfinite, 2);
    char *s = hf_test_stream_read(f, 0);
    assert_string_equal(s, "line,tension_kN,note\n"
                           "bow-port,1234.56789,plain\n"
                           "\"a,b\",,\"say \"\"hi\"\"\nnext\"\n"
                           "\" padded\",,\n"
                           "-42,7,\n");
    free(s);
    fclose(f);
}

static void test_writer_long_rows(void **state)
{
    (void)state;
    /* A row much longer than the internal buffer, and a field longer than
     * half of it, arrive intact and in order. */
    FILE *f = tmpfile();
    assert_non_null(f);
    hf_csv c;
    hf_csv_init(&c, f, 12);
    char *big = malloc(3001);
    assert_non_null(big);
    memset(big, 'q', 3000);
    big[3000] = '\0';
    double sum = 0;
    for (int i = 0; i < 700; i++) {
        double v = 2.385 * i - 17.25;
        sum += v;
        hf_csv_field_double(&c, v);
    }
    hf_csv_field_str(&c, big);
    hf_csv_end_row(&c);
    char *s = hf_test_stream_read(f, 0);
    char *p = s;
    double back = 0;
    for (int i = 0; i < 700; i++) {
        char *end;
        double v = strtod(p, &end);
        assert_true(end > p && *end == ',');
        assert_true(fabs(v - (2.385 * i - 17.25)) <= 1e-11 * fabs(v));
        back += v;
        p = end + 1;
    }
    assert_true(fabs(back - sum) < 1e-8);
    assert_int_equal(strlen(p), 3001);
    assert_memory_equal(p, big, 3000);
    assert_int_equal(p[3000], '\n');
    free(s);
    free(big);
    fclose(f);
}

static void test_quote_direct(void **state)
{
    (void)state;
    FILE *f = tmpfile();
    assert_non_null(f);
    assert_int_equal(hf_csv_quote(f, "x\"y"), 0);
    assert_int_equal(hf_csv_quote(f, "plain"), 0);
    assert_int_equal(hf_csv_quote(f, "trail "), 0);
    assert_int_equal(hf_csv_quote(f, "cr\r"), 0);
    char *s = hf_test_stream_read(f, 0);
    assert_string_equal(s, "\"x\"\"y\"plain\"trail \"\"cr\r\"");
    free(s);
    fclose(f);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_format_matches_printf_random_bits),
        cmocka_unit_test(test_format_matches_printf_engineering),
        cmocka_unit_test(test_format_edges),
        cmocka_unit_test(test_format_round_trip),
        cmocka_unit_test(test_format_nonfinite),
        cmocka_unit_test(test_writer_rows_and_quoting),
        cmocka_unit_test(test_writer_long_rows),
        cmocka_unit_test(test_quote_direct),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
