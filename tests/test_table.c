/* test_table.c - coefficient tables: reading the four CSV kinds, unit
 * conversion, bilinear/periodic interpolation, heading coverage, located
 * errors, limits and allocation failures. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <cmocka.h>
#include <gsl/gsl_rng.h>
#include "holdfast/alloc.h"
#include "holdfast/table.h"
#include "support.h"

#define DEG (M_PI / 180.0)

static hf_table *load(const char *rel, hf_table_kind k)
{
    char path[4096];
    hf_error e;
    hf_table *t = NULL;
    hf_test_root_path(path, sizeof path, rel);
    if (hf_table_load(path, k, &t, &e) != HF_OK)
        fail_msg("%s", e.text);
    return t;
}

/* Reads `text` as a table of kind k named "t.csv" through a memory stream. */
static hf_status parse(const char *text, hf_table_kind k, hf_table **t, hf_error *e)
{
    FILE *f = fmemopen((void *)text, strlen(text), "r");
    assert_non_null(f);
    hf_error_clear(e);
    hf_status st = hf_table_read(f, "t.csv", k, t, e);
    fclose(f);
    return st;
}

static void near3(const double v[3], double a, double b, double c, double tol)
{
    if (!(fabs(v[0] - a) <= tol * (1 + fabs(a)) && fabs(v[1] - b) <= tol * (1 + fabs(b)) &&
          fabs(v[2] - c) <= tol * (1 + fabs(c))))
        fail_msg("got (%.15g, %.15g, %.15g), want (%.15g, %.15g, %.15g)", v[0], v[1], v[2], a, b,
                 c);
}

/* The invented barge tables: sizes, and node values as written in the files
 * (lines quoted), converted to SI (yaw deg -> rad; kN -> N). */
static void test_barge_files(void **state)
{
    (void)state;
    double v[3], lo, hi;
    hf_table *r = load("tests/data/env/barge-raos.csv", HF_TABLE_RAO);
    assert_int_equal(hf_table_nfreq(r), 27);
    assert_int_equal(hf_table_nheading(r), 12);
    hf_table_freq_range(r, &lo, &hi);
    assert_true(lo == 0.1 && hi == 5.0);
    hf_table_eval(r, 0.45, 60 * DEG, v); /* line 91: 0.45,60,0.3453,0.7667,0.3330 */
    near3(v, 0.3453, 0.7667, 0.3330 * DEG, 1e-12);
    hf_table_eval(r, 2.5, -60 * DEG, v); /* line 279: 2.5,300,0.0012,0.0070,0.0447 */
    near3(v, 0.0012, 0.0070, 0.0447 * DEG, 1e-12);
    assert_int_equal(hf_table_kind_of(r), HF_TABLE_RAO);
    assert_non_null(strstr(hf_table_name(r), "barge-raos.csv"));
    hf_table_free(r);

    hf_table *d = load("tests/data/env/barge-drift.csv", HF_TABLE_DRIFT);
    hf_table_eval(d, 0.45, 420 * DEG, v); /* line 91: 0.45,60,6.564,37.899,-176.86 */
    near3(v, 6564.0, 37899.0, -176860.0, 1e-12);
    hf_table_eval(d, 9.0, 90 * DEG, v); /* beyond 5 rad/s: held at line 320 */
    near3(v, 0.0, 299885.0, 0.0, 1e-12);
    hf_table_free(d);

    hf_table *c = load("tests/data/env/barge-wind.csv", HF_TABLE_COEF);
    assert_int_equal(hf_table_nfreq(c), 0);
    hf_table_freq_range(c, &lo, &hi);
    assert_true(lo == 0.0 && hi == 0.0);
    hf_table_eval(c, 123.0, 150 * DEG, v); /* line 10: 150,-0.537,0.455,-0.074 */
    near3(v, -0.537, 0.455, -0.074, 1e-12);
    hf_table_eval(c, 0.0, 165 * DEG, v); /* halfway: mean of lines 10 and 11 (180,-0.620,0,-0) */
    near3(v, 0.5 * (-0.537 - 0.620), 0.5 * 0.455, 0.5 * -0.074, 1e-12);
    hf_table_free(c);
    hf_table_free(NULL);
}

/* Bilinear interpolation reproduces a bilinear function exactly inside a
 * cell (a classical identity of linear interpolation); periodic in heading;
 * held constant beyond the frequency range. */
static void test_interpolation(void **state)
{
    (void)state;
    const double fr[] = {0.213, 0.377, 0.805, 1.94};
    const double hd[] = {0.0, 90 * DEG, 200 * DEG, 300 * DEG};
    double val[4 * 4 * 3];
    for (int i = 0; i < 4; i++)
        for (int j = 0; j < 4; j++)
            for (int c = 0; c < 3; c++)
                val[(i * 4 + j) * 3 + c] =
                    1.5 + c + 2.25 * fr[i] + 0.75 * hd[j] + 0.4 * fr[i] * hd[j];
    hf_table *t = NULL;
    hf_error e;
    assert_int_equal(hf_table_from_values(HF_TABLE_RAO, "grid", 4, fr, 4, hd, val, &t, &e), HF_OK);
    double v[3];
    double w = 0.5912, h = 137.3 * DEG, f = 1.5 + 2.25 * w + 0.75 * h + 0.4 * w * h;
    hf_table_eval(t, w, h, v);
    near3(v, f, f + 1, f + 2, 1e-13);
    hf_table_eval(t, w, h + 4 * M_PI, v); /* any turn */
    near3(v, f, f + 1, f + 2, 1e-13);
    /* across 360 deg: 330 deg is halfway from 300 to 360 (= 0) deg */
    double a300 = 1.5 + 2.25 * w + 0.75 * hd[3] + 0.4 * w * hd[3];
    double a0 = 1.5 + 2.25 * w;
    hf_table_eval(t, w, 330 * DEG, v);
    near3(v, 0.5 * (a300 + a0), 0.5 * (a300 + a0) + 1, 0.5 * (a300 + a0) + 2, 1e-13);
    hf_table_eval(t, w, -30 * DEG, v);
    near3(v, 0.5 * (a300 + a0), 0.5 * (a300 + a0) + 1, 0.5 * (a300 + a0) + 2, 1e-13);
    /* 0 deg exactly, and below the first frequency (held) */
    hf_table_eval(t, 1e-9, 0.0, v);
    near3(v, 1.5 + 2.25 * fr[0], 2.5 + 2.25 * fr[0], 3.5 + 2.25 * fr[0], 1e-13);
    hf_table_eval(t, 1e300, 90 * DEG, v);
    double top = 1.5 + 2.25 * fr[3] + 0.75 * hd[1] + 0.4 * fr[3] * hd[1];
    near3(v, top, top + 1, top + 2, 1e-13);
    hf_table_free(t);
}

/* Any column order, quoted names, CRLF, comments, blanks and spaces. */
static void test_dialect(void **state)
{
    (void)state;
    const char *text = "# invented, fictional barge\r\n"
                       "\r\n"
                       " \"cmz\" , heading_deg,cy,cx\r\n"
                       "0.031, 0, 0.0, 0.71\r\n"
                       "   # a comment row\n"
                       "-0.02,90,0.93,0.0\r\n"
                       "0.0,180,0,-0.66\n"
                       "0.02,270,-0.93,0\n";
    hf_table *t = NULL;
    hf_error e;
    if (parse(text, HF_TABLE_COEF, &t, &e) != HF_OK)
        fail_msg("%s", e.text);
    double v[3];
    hf_table_eval(t, 0.0, 45 * DEG, v);
    near3(v, 0.355, 0.465, 0.0055, 1e-12);
    hf_table_free(t);
}

/* One bad table: expected status, and every `part` in the message. */
static void bad(const char *text, hf_table_kind k, hf_status want, const char *p1, const char *p2)
{
    hf_table *t = (hf_table *)&t; /* must come back NULL */
    hf_error e;
    hf_status st = parse(text, k, &t, &e);
    if (st != want)
        fail_msg("status %d (%s), want %d, for:\n%s", st, e.text, want, text);
    assert_null(t);
    if ((p1 && !strstr(e.text, p1)) || (p2 && !strstr(e.text, p2)))
        fail_msg("message \"%s\" lacks \"%s\" or \"%s\"", e.text, p1, p2 ? p2 : "");
}

#define RAO_H "frequency_rad_s,heading_deg,surge_m_per_m,sway_m_per_m,yaw_deg_per_m\n"
#define DRIFT_H "frequency_rad_s,heading_deg,surge_kN_per_m2,sway_kN_per_m2,yaw_kNm_per_m2\n"

static void test_errors(void **state)
{
    (void)state;
    bad("", HF_TABLE_RAO, HF_EINVAL, "t.csv: no header", "frequency_rad_s,heading_deg");
    bad("# only a comment\n", HF_TABLE_COEF, HF_EINVAL, "no header", NULL);
    bad("heading_deg,cx,cy,cmz\n", HF_TABLE_COEF, HF_EINVAL, "t.csv: no data rows", NULL);
    bad("heading_deg,cx,cy,cmz,cz\n0,1,1,1,1\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:1:23",
        "unknown column \"cz\"");
    bad("heading_deg,cx,cy\n0,1,1\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:1: missing column cmz",
        NULL);
    bad("heading_deg,cx,cx,cmz\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:1:16", "cx appears twice");
    bad("heading_deg,cx,cy,cmz\n0,1,1\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:2: expected 4 fields",
        "got 3");
    bad("heading_deg,cx,cy,cmz\n0,1,1,1,1\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:2:", "more than 4");
    bad("heading_deg,cx,cy,cmz\n0,1,abc,1\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:2:5: column cy",
        "\"abc\"");
    bad("heading_deg,cx,cy,cmz\n0,1,,1\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:2:5: column cy", NULL);
    bad("heading_deg,cx,cy,cmz\n0,nan,0,1\n", HF_TABLE_COEF, HF_EINVAL, "column cx", "nan");
    bad("heading_deg,cx,cy,cmz\n0,1,inf,1\n", HF_TABLE_COEF, HF_EINVAL, "column cy", "inf");
    bad("heading_deg,cx,cy,cmz\n0,1,1,1e309\n", HF_TABLE_COEF, HF_EINVAL, "column cmz", "1e309");
    bad("heading_deg,cx,cy,cmz\n0,1,1,2.5m\n", HF_TABLE_COEF, HF_EINVAL, "column cmz", "2.5m");
    bad("heading_deg,cx,cy,cmz\n0,1,1,1\n360,1,1,1\n", HF_TABLE_COEF, HF_EINVAL, "t.csv:3",
        "repeats line 2");
    bad(RAO_H "0,0,1,0,0\n", HF_TABLE_RAO, HF_EINVAL, "t.csv:2:1: column frequency_rad_s",
        "positive");
    bad(RAO_H "-0.5,0,1,0,0\n", HF_TABLE_RAO, HF_EINVAL, "column frequency_rad_s", "\"-0.5\"");
    bad(RAO_H "0.5,0,1,-0.01,0\n", HF_TABLE_RAO, HF_EINVAL, "t.csv:2:9: column sway_m_per_m",
        "amplitude >= 0");
    bad(RAO_H "0.5,0,1,0,0\n0.6,0,1,0,0\n0.5,90,1,0,0\n", HF_TABLE_RAO, HF_EINVAL,
        "incomplete grid", "frequency 0.6 rad/s at heading 90 deg");
    bad(DRIFT_H "0.5,0,1,0,0\n0.5,0,2,0,0\n", HF_TABLE_DRIFT, HF_EINVAL, "t.csv:3",
        "at this frequency repeats line 2");
    bad(RAO_H "0.5,0,1,0\n", HF_TABLE_RAO, HF_EINVAL, "expected 5 fields", NULL);
    /* a line longer than the limit */
    size_t n = HF_TABLE_MAX_LINE + 100;
    char *big = malloc(n + 64);
    assert_non_null(big);
    strcpy(big, "heading_deg,cx,cy,cmz\n0,1,1,");
    size_t len = strlen(big);
    memset(big + len, '1', n);
    strcpy(big + len + n, "\n");
    bad(big, HF_TABLE_COEF, HF_ELIMIT, "t.csv:2: line longer than", NULL);
    free(big);

    hf_table *t = NULL;
    hf_error e;
    assert_int_equal(hf_table_load("/nonexistent/holdfast/raos.csv", HF_TABLE_RAO, &t, &e), HF_EIO);
    assert_null(t);
    assert_non_null(strstr(e.text, "/nonexistent/holdfast/raos.csv: cannot open"));
    assert_int_equal(hf_table_read(NULL, "x", HF_TABLE_RAO, &t, &e), HF_EINVAL);
    assert_int_equal(hf_table_read(stdin, "x", HF_TABLE_KIND_COUNT, &t, &e), HF_EINVAL);
    const double fr[] = {0.5, 0.4}, hd[] = {0.0}, val[6] = {0};
    assert_int_equal(hf_table_from_values(HF_TABLE_RAO, "v", 2, fr, 1, hd, val, &t, &e), HF_OK);
    hf_table_free(t); /* order of frequencies does not matter, they are sorted */
    const double negv[3] = {0.1, -0.2, 0.3};
    assert_int_equal(hf_table_from_values(HF_TABLE_RAO, "v", 1, fr, 1, hd, negv, &t, &e),
                     HF_EINVAL);
    assert_int_equal(hf_table_from_values(HF_TABLE_DRIFT, "v", 1, fr, 1, hd, negv, &t, &e), HF_OK);
    hf_table_free(t);
    const double nanv[3] = {0.1, NAN, 0.3};
    assert_int_equal(hf_table_from_values(HF_TABLE_DRIFT, "v", 1, fr, 1, hd, nanv, &t, &e),
                     HF_EINVAL);
    assert_null(t);
}

static void covered(const hf_table *t, double deg, double gap_deg, int want, const char *part)
{
    hf_error e;
    hf_error_clear(&e);
    hf_status st = hf_table_heading_check(t, deg * DEG, gap_deg * DEG, "env storm", &e);
    if ((st == HF_OK) != want)
        fail_msg("heading %g deg: status %d (%s)", deg, st, e.text);
    if (!want && part && !strstr(e.text, part))
        fail_msg("message \"%s\" lacks \"%s\"", e.text, part);
}

static void test_heading_coverage(void **state)
{
    (void)state;
    hf_table *r = load("tests/data/env/barge-raos.csv", HF_TABLE_RAO);
    covered(r, 45.0, 45.0, 1, NULL);
    covered(r, 345.0, 45.0, 1, NULL); /* between 330 and 360 */
    covered(r, -721.3, 45.0, 1, NULL);
    covered(r, 45.0, 20.0, 0, "neighbours 30 and 60 deg are 30 deg apart"); /* gap 30 > 20 */
    covered(r, 60.0, 20.0, 1, NULL); /* a tabulated heading */
    hf_table_free(r);
    hf_table *t = NULL;
    hf_error e;
    const double hd[] = {0.0, 45 * DEG, 90 * DEG, 135 * DEG, 180 * DEG}, val[15] = {0};
    assert_int_equal(hf_table_from_values(HF_TABLE_COEF, "half.csv", 1, NULL, 5, hd, val, &t, &e),
                     HF_OK);
    covered(t, 100.0, 45.0, 1, NULL);
    covered(t, 270.0, 45.0, 0, "half.csv does not cover the relative heading 270 deg");
    covered(t, 180.0, 45.0, 1, NULL);
    covered(t, 181.0, 45.0, 0, "180 and 0 deg are 180 deg apart");
    hf_table_free(t);
    assert_int_equal(
        hf_table_from_values(HF_TABLE_COEF, "one.csv", 1, NULL, 1, hd + 2, val, &t, &e), HF_OK);
    covered(t, 90.0, 45.0, 1, NULL);
    covered(t, 90.5, 45.0, 0, "one.csv tabulates heading 90 deg only");
    hf_error_clear(&e);
    assert_int_equal(hf_table_heading_check(t, NAN, 1.0, "w", &e), HF_EINVAL);
    hf_table_free(t);
}

/* Every allocation failure returns HF_ENOMEM and no table. */
static void test_alloc_failures(void **state)
{
    (void)state;
    char path[4096];
    hf_test_root_path(path, sizeof path, "tests/data/env/barge-drift.csv");
    int failures = 0;
    for (long n = 1; n < 200; n++) {
        hf_table *t = NULL;
        hf_error e;
        hf_alloc_fail_at(n, 0);
        hf_status st = hf_table_load(path, HF_TABLE_DRIFT, &t, &e);
        hf_alloc_fail_at(0, 0);
        if (st == HF_OK) {
            hf_table_free(t);
            break;
        }
        assert_int_equal(st, HF_ENOMEM);
        assert_null(t);
        failures++;
    }
    assert_true(failures >= 5);
}

/* Mutated copies of a good table (bytes replaced, inserted, lines cut): the
 * reader must always return a status, never crash; a failure names the
 * file; a success gives a table whose values are finite everywhere.
 * Mutations drawn from GSL's Mersenne twister, fixed seed. */
static void test_mutations(void **state)
{
    (void)state;
    const char *good = "# invented\n" DRIFT_H "0.31,0,12.5,0,-3\n0.31,120,-6.1,8.8,4\n"
                       "0.31,240,-6.2,-8.7,1\n0.87,0,41.2,0,-9\n0.87,120,-20.5,33.1,12\n"
                       "0.87,240,-20.4,-33.3,2.5\n";
    const char alphabet[] = "0123456789.,-+eE#\" \n\rxnaif";
    gsl_rng *r = gsl_rng_alloc(gsl_rng_mt19937);
    gsl_rng_set(r, 4242);
    size_t len = strlen(good);
    char buf[1024];
    int ok = 0, refused = 0;
    for (int n = 0; n < 3000; n++) {
        memcpy(buf, good, len + 1);
        size_t l = len;
        int edits = 1 + (int)gsl_rng_uniform_int(r, 4);
        for (int k = 0; k < edits; k++) {
            size_t at = gsl_rng_uniform_int(r, l);
            char c = alphabet[gsl_rng_uniform_int(r, sizeof alphabet - 1)];
            switch (gsl_rng_uniform_int(r, 3)) {
            case 0:
                buf[at] = c;
                break;
            case 1:
                memmove(buf + at + 1, buf + at, l - at + 1);
                buf[at] = c;
                l++;
                break;
            default:
                l = at;
                buf[l] = '\0';
            }
        }
        hf_table *t = NULL;
        hf_error e;
        hf_status st = parse(buf, HF_TABLE_DRIFT, &t, &e);
        if (st == HF_OK) {
            double v[3];
            hf_table_eval(t, 0.5, 1.0, v);
            assert_true(isfinite(v[0]) && isfinite(v[1]) && isfinite(v[2]));
            assert_true(hf_table_nfreq(t) >= 1 && hf_table_nheading(t) >= 1);
            hf_table_free(t);
            ok++;
        } else {
            assert_true(st == HF_EINVAL || st == HF_ELIMIT);
            assert_null(t);
            assert_true(strncmp(e.text, "t.csv", 5) == 0);
            refused++;
        }
    }
    gsl_rng_free(r);
    print_message("mutated tables: %d read, %d refused with a message\n", ok, refused);
    assert_true(ok > 0 && refused > 0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_barge_files),      cmocka_unit_test(test_interpolation),
        cmocka_unit_test(test_dialect),          cmocka_unit_test(test_errors),
        cmocka_unit_test(test_heading_coverage), cmocka_unit_test(test_alloc_failures),
        cmocka_unit_test(test_mutations),
    };
    hf_gsl_handler_install();
    return cmocka_run_group_tests(tests, NULL, NULL);
}
