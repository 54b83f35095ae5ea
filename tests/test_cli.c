/* test_cli.c - the shared command-line helpers: options, offsets, ranges,
 * job counts, rounding for tables and exit codes. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/cli.h"

static void test_option_forms(void **state)
{
    (void)state;
    char *argv[] = {"lines", "--csv", "out.csv", "--offset=1,2,3", "--csv", "--profiles"};
    int argc = 6, i = 1, missing = 0;
    const char *v = NULL;
    assert_int_equal(hf_cli_option(argc, argv, &i, "--csv", &v, &missing), 1);
    assert_string_equal(v, "out.csv");
    assert_int_equal(i, 2); /* moved past the value */
    i = 3;
    assert_int_equal(hf_cli_option(argc, argv, &i, "--offset", &v, &missing), 1);
    assert_string_equal(v, "1,2,3");
    assert_int_equal(i, 3);
    /* a prefix of another option does not match */
    assert_int_equal(hf_cli_option(argc, argv, &i, "--off", &v, &missing), 0);
    /* the last word without its value */
    i = 5;
    missing = 0;
    assert_int_equal(hf_cli_option(argc, argv, &i, "--profiles", &v, &missing), 1);
    assert_int_equal(missing, 1);
}

static void test_offset(void **state)
{
    (void)state;
    double o[3];
    hf_error e;
    assert_int_equal(hf_cli_parse_offset("2.385,-4.5,30", o, &e), HF_OK);
    assert_true(o[0] == 2.385 && o[1] == -4.5);
    assert_true(fabs(o[2] - M_PI / 6.0) < 1e-15); /* degrees in, radians out */
    const char *bad[] = {"",        "1,2",     "1,2,3,4",   "a,b,c",  "1,,3",
                         "nan,0,0", "inf,0,0", "1e309,0,0", "1,2,3x", " ,1,2"};
    for (size_t k = 0; k < sizeof bad / sizeof bad[0]; k++) {
        hf_error_clear(&e);
        if (hf_cli_parse_offset(bad[k], o, &e) != HF_EINVAL)
            fail_msg("offset \"%s\" was accepted", bad[k]);
        assert_non_null(strstr(e.text, "X,Y,HEADING_DEG"));
    }
}

static void test_range(void **state)
{
    (void)state;
    double a, b, s;
    size_t n;
    hf_error e;
    assert_int_equal(hf_cli_parse_range("-10:10:0.5", &a, &b, &s, 100000, &n, &e), HF_OK);
    assert_int_equal(n, 41);
    assert_int_equal(hf_cli_parse_range("0:1:0.1", &a, &b, &s, 100000, &n, &e), HF_OK);
    assert_int_equal(n, 11); /* 1/0.1 is 9.999..., the end point still counts */
    assert_int_equal(hf_cli_parse_range("5:-5:-2.5", &a, &b, &s, 100000, &n, &e), HF_OK);
    assert_int_equal(n, 5);
    assert_int_equal(hf_cli_parse_range("3:3:1", &a, &b, &s, 100000, &n, &e), HF_OK);
    assert_int_equal(n, 1);
    assert_int_equal(hf_cli_parse_range("0:5:-1", &a, &b, &s, 100, &n, &e), HF_EINVAL);
    assert_int_equal(hf_cli_parse_range("0:5:0", &a, &b, &s, 100, &n, &e), HF_EINVAL);
    assert_int_equal(hf_cli_parse_range("0:5", &a, &b, &s, 100, &n, &e), HF_EINVAL);
    assert_int_equal(hf_cli_parse_range("0:nan:1", &a, &b, &s, 100, &n, &e), HF_EINVAL);
    assert_int_equal(hf_cli_parse_range("0:1e309:1", &a, &b, &s, 100, &n, &e), HF_EINVAL);
    assert_int_equal(hf_cli_parse_range("0:1000:1", &a, &b, &s, 100, &n, &e), HF_ELIMIT);
    assert_non_null(strstr(e.text, "limit"));
}

static void test_jobs(void **state)
{
    (void)state;
    int j = 0;
    hf_error e;
    assert_int_equal(hf_cli_parse_jobs("2", &j, &e), HF_OK);
    assert_int_equal(j, 2);
    const char *bad[] = {"0", "-1", "two", "", "1.5", "99999999999999999999"};
    for (size_t k = 0; k < sizeof bad / sizeof bad[0]; k++)
        if (hf_cli_parse_jobs(bad[k], &j, &e) == HF_OK)
            fail_msg("--jobs \"%s\" was accepted", bad[k]);
}

static void test_zero_small_and_exit(void **state)
{
    (void)state;
    assert_true(hf_cli_zero_small(-0.0004, 0.0005) == 0.0);
    assert_false(signbit(hf_cli_zero_small(-0.0004, 0.0005)));
    assert_true(hf_cli_zero_small(-0.0006, 0.0005) == -0.0006);
    assert_int_equal(hf_status_exit_code(HF_OK), HF_EXIT_OK);
    assert_int_equal(hf_status_exit_code(HF_EINVAL), HF_EXIT_USAGE);
    assert_int_equal(hf_status_exit_code(HF_ENOCONV), HF_EXIT_NUMERIC);
    assert_int_equal(hf_status_exit_code(HF_ENOEQUIL), HF_EXIT_NUMERIC);
    assert_non_null(strstr(hf_cli_caution, "licensed engineer"));
    assert_non_null(strstr(hf_cli_caution, "quasi-static"));
}

/* Issue 12 item 17: one number reader.  Units are accepted (1 ft = 0.3048 m
 * exactly, international foot of 1959), hex is refused (before the fix
 * "0x10" read as 16), angles are degrees by default; "did you mean" for
 * a misspelt name; ENOMEM has its own exit status. */
static void test_units_hex_suggest(void **state)
{
    (void)state;
    hf_error e;
    double o[3], a, b, s;
    size_t n;
    assert_int_equal(hf_cli_parse_offset("10m,-2 ft,30deg", o, &e), HF_OK);
    assert_true(o[0] == 10.0 && fabs(o[1] + 0.6096) < 1e-15);
    assert_true(fabs(o[2] - M_PI / 6.0) < 1e-15);
    assert_int_equal(hf_cli_parse_offset("0x10,0,0", o, &e), HF_EINVAL);
    assert_int_equal(hf_cli_parse_offset("1,2,3 kN", o, &e), HF_EINVAL);
    assert_int_equal(hf_cli_parse_range("0 m:5m:1m", &a, &b, &s, 100, &n, &e), HF_OK);
    assert_int_equal(n, 6);
    assert_int_equal(hf_cli_parse_range("0:0x10:1", &a, &b, &s, 100, &n, &e), HF_EINVAL);
    /* issue 12 item 5: the end point of a tiny step relative to the values
     * (10 values before the one range rule; 366 + 10 x 0.00001 = 366.0001) */
    assert_int_equal(hf_cli_parse_range("366:366.0001:0.00001", &a, &b, &s, 100, &n, &e), HF_OK);
    assert_int_equal(n, 11);
    assert_int_equal(hf_cli_parse_range("0:10:1", &a, &b, &s, 10, &n, &e), HF_ELIMIT);
    assert_int_equal(hf_cli_parse_value("--direction", "0x10", HF_DIM_ANGLE, &a, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "--direction"));
    assert_int_equal(hf_cli_parse_value("--direction", "0.5 rad", HF_DIM_ANGLE, &a, &e), HF_OK);
    assert_true(a == 0.5);
    const char *names[] = {"head-storm", NULL, "beam-storm", "calm"};
    assert_string_equal(hf_cli_suggest("beam-strom", names, 4), "beam-storm");
    assert_string_equal(hf_cli_suggest("clam", names, 4), "calm");
    assert_null(hf_cli_suggest("hurricane", names, 4));
    assert_int_equal(hf_cli_exit_code(HF_ENOMEM), HF_EXIT_NOMEM);
    assert_int_equal(hf_cli_exit_code(HF_ENOCONV), HF_EXIT_NUMERIC);
    assert_int_equal(hf_cli_check_output("--csv", "", NULL, &e), HF_EINVAL);
    assert_int_equal(hf_cli_check_output("--csv", "-", "x.yaml", &e), HF_OK);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_option_forms),
        cmocka_unit_test(test_offset),
        cmocka_unit_test(test_range),
        cmocka_unit_test(test_jobs),
        cmocka_unit_test(test_units_hex_suggest),
        cmocka_unit_test(test_zero_small_and_exit),
    };
    return cmocka_run_group_tests_name("cli", tests, NULL, NULL);
}
