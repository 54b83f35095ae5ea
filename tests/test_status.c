/* test_status.c - status texts, exit codes, error records, the GSL handler. */
#include <limits.h>
#include <pthread.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>
#include <cmocka.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_sf_gamma.h>
#include <gsl/gsl_sf_result.h>
#include "holdfast/cli.h"
#include "holdfast/status.h"

static void every_status_has_its_own_text(void **state)
{
    (void)state;
    for (int a = 0; a < HF_STATUS_COUNT; a++) {
        const char *s = hf_status_str((hf_status)a);
        assert_non_null(s);
        assert_true(strlen(s) > 0);
        assert_string_not_equal(s, "unknown status");
        for (int b = 0; b < a; b++)
            assert_string_not_equal(s, hf_status_str((hf_status)b));
    }
    assert_string_equal(hf_status_str(HF_OK), "ok");
    assert_string_equal(hf_status_str(HF_ENOMEM), "out of memory");
    assert_string_equal(hf_status_str(HF_ELIMIT), "limit exceeded");
}

static void unknown_status_text(void **state)
{
    (void)state;
    assert_string_equal(hf_status_str(HF_STATUS_COUNT), "unknown status");
    assert_string_equal(hf_status_str((hf_status)(HF_STATUS_COUNT + 517)), "unknown status");
    assert_string_equal(hf_status_str((hf_status)-1), "unknown status");
    assert_string_equal(hf_status_str((hf_status)INT_MIN), "unknown status");
}

/* The table in include/holdfast/status.h and cli.h: 0 ok, 2 bad input or
 * usage (EINVAL, ELIMIT, EIO), 3 numerical failure; 1 is left to criteria. */
static void exit_codes_follow_the_contract(void **state)
{
    (void)state;
    assert_int_equal(hf_status_exit_code(HF_OK), HF_EXIT_OK);
    assert_int_equal(hf_status_exit_code(HF_CONTINUE), HF_EXIT_OK);
    assert_int_equal(hf_status_exit_code(HF_EINVAL), HF_EXIT_USAGE);
    assert_int_equal(hf_status_exit_code(HF_ELIMIT), HF_EXIT_USAGE);
    assert_int_equal(hf_status_exit_code(HF_EIO), HF_EXIT_USAGE);
    /* out of memory has its own exit status (issue 12 item 13): 4 */
    assert_int_equal(hf_status_exit_code(HF_ENOMEM), 4);
    assert_true(hf_status_exit_code(HF_ENOMEM) != HF_EXIT_NUMERIC);
    assert_int_equal(hf_status_exit_code(HF_ENOCONV), HF_EXIT_NUMERIC);
    assert_int_equal(hf_status_exit_code(HF_EUNSUPPORTED), HF_EXIT_NUMERIC);
    assert_int_equal(hf_status_exit_code(HF_ENOEQUIL), HF_EXIT_NUMERIC);
    assert_int_equal(hf_status_exit_code(HF_ERANGE), HF_EXIT_NUMERIC);
    assert_int_equal(HF_EXIT_OK, 0);
    assert_int_equal(HF_EXIT_CRITERION, 1);
    assert_int_equal(HF_EXIT_USAGE, 2);
    assert_int_equal(HF_EXIT_NUMERIC, 3);
    /* No status may claim exit 1: that one means "a criterion failed". */
    for (int s = 0; s < HF_STATUS_COUNT; s++)
        assert_int_not_equal(hf_status_exit_code((hf_status)s), HF_EXIT_CRITERION);
    assert_int_not_equal(hf_status_exit_code((hf_status)(HF_STATUS_COUNT + 3)), HF_EXIT_OK);
}

static void error_set_formats_and_returns_the_status(void **state)
{
    (void)state;
    hf_error e;
    hf_error_clear(&e);
    assert_int_equal(e.status, HF_OK);
    assert_string_equal(e.text, "");
    hf_status s = hf_error_set(&e, HF_EINVAL, "%s:%d:%d: %s: expected %s, got \"%s\"", "barge.yaml",
                               14, 9, "lines[2].sections[0].length", "a positive length", "-300 m");
    assert_int_equal(s, HF_EINVAL);
    assert_int_equal(e.status, HF_EINVAL);
    assert_string_equal(e.text, "barge.yaml:14:9: lines[2].sections[0].length: expected a "
                                "positive length, got \"-300 m\"");
    /* A later error replaces the earlier one completely. */
    assert_int_equal(hf_error_set(&e, HF_ENOCONV, "%.3f", 2.385), HF_ENOCONV);
    assert_string_equal(e.text, "2.385");
    hf_error_clear(&e);
    assert_int_equal(e.status, HF_OK);
    assert_string_equal(e.text, "");
}

static void error_set_truncates_long_messages(void **state)
{
    (void)state;
    static char big[3 * HF_ERROR_TEXT];
    memset(big, 'q', sizeof big - 1);
    big[sizeof big - 1] = '\0';
    hf_error e;
    memset(&e, 0x5a, sizeof e); /* garbage, as an uninitialised record would be */
    assert_int_equal(hf_error_set(&e, HF_ELIMIT, "x%sy", big), HF_ELIMIT);
    assert_int_equal(strlen(e.text), HF_ERROR_TEXT - 1);
    assert_int_equal(e.text[0], 'x');
    assert_int_equal(e.text[HF_ERROR_TEXT - 2], 'q');
    assert_int_equal(e.status, HF_ELIMIT);
}

static void null_error_records_are_allowed(void **state)
{
    (void)state;
    hf_error_clear(NULL);
    assert_int_equal(hf_error_set(NULL, HF_EIO, "%s", "nowhere"), HF_EIO);
    assert_int_equal(hf_error_set(NULL, HF_OK, "fine"), HF_OK);
}

/* Copies what the thread saw before and after raising its own error. */
static void *other_thread(void *arg)
{
    char(*seen)[256] = arg;
    snprintf(seen[0], sizeof seen[0], "%s", hf_gsl_last_error());
    gsl_error("raised in the other thread", "test_status.c", 4242, GSL_EMAXITER);
    snprintf(seen[1], sizeof seen[1], "%s", hf_gsl_last_error());
    return NULL;
}

/* With the handler installed a GSL error is recorded, not fatal (GSL's
 * default handler calls abort()).  The record is per thread. */
static void gsl_handler_records_and_does_not_abort(void **state)
{
    (void)state;
    hf_gsl_handler_install();
    hf_gsl_handler_install(); /* idempotent */
    gsl_error("domain trouble at 2.385", "here.c", 77, GSL_EDOM);
    char first[256];
    snprintf(first, sizeof first, "%s", hf_gsl_last_error());
    assert_non_null(strstr(first, "domain trouble at 2.385"));
    assert_non_null(strstr(first, "here.c:77"));
    assert_non_null(strstr(first, gsl_strerror(GSL_EDOM)));

    /* A real library call failing: the gamma function at a pole (GSL
     * reference manual, "Gamma Functions": domain error for negative
     * integers). */
    gsl_sf_result r;
    int rc = gsl_sf_gamma_e(-3.0, &r);
    assert_int_not_equal(rc, GSL_SUCCESS);
    assert_string_not_equal(hf_gsl_last_error(), first);
    assert_non_null(strstr(hf_gsl_last_error(), "GSL error"));

    char seen[2][256];
    char before[256];
    snprintf(before, sizeof before, "%s", hf_gsl_last_error());
    pthread_t th;
    assert_int_equal(pthread_create(&th, NULL, other_thread, (void *)seen), 0);
    assert_int_equal(pthread_join(th, NULL), 0);
    assert_string_equal(seen[0], ""); /* a new thread has seen no error */
    assert_non_null(strstr(seen[1], "raised in the other thread"));
    assert_non_null(strstr(seen[1], "test_status.c:4242"));
    assert_string_equal(hf_gsl_last_error(), before); /* ours is untouched */
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(every_status_has_its_own_text),
        cmocka_unit_test(unknown_status_text),
        cmocka_unit_test(exit_codes_follow_the_contract),
        cmocka_unit_test(error_set_formats_and_returns_the_status),
        cmocka_unit_test(error_set_truncates_long_messages),
        cmocka_unit_test(null_error_records_are_allowed),
        cmocka_unit_test(gsl_handler_records_and_does_not_abort),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
