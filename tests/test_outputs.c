/* test_outputs.c - the output catalogue: consistency, parsing, columns, help. */
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
#include "holdfast/case.h"
#include "holdfast/hint.h"
#include "holdfast/outputs.h"

static hf_model model; /* hf_test_case_quarrel: lines north, southwest, southeast; load gale */

static int setup(void **s)
{
    (void)s;
    hf_model_init(&model);
    hf_error e;
    const char *text = hf_test_case_quarrel;
    if (hf_case_load_buffer(text, strlen(text), "quarrel.yaml", &model, &e) != HF_OK) {
        fprintf(stderr, "%s\n", e.text);
        return -1;
    }
    return 0;
}

static int teardown(void **s)
{
    (void)s;
    hf_model_free(&model);
    return 0;
}

/* Every entry is indexed by its kind, has a unique name, and its scale
 * converts SI to its column unit: checked against the units module, which
 * reads "1 kN", "1 kN/m" and "1 kN m" from its own conversion table
 * (SI prefixes: BIPM, The International System of Units, 9th ed., 2019). */
static void test_catalogue_consistent(void **s)
{
    (void)s;
    for (int k = 0; k < HF_OUT_COUNT; k++) {
        const hf_output_info *in = hf_output_info_of((hf_output_kind)k);
        assert_non_null(in);
        assert_int_equal(in->kind, k);
        assert_true(strlen(in->meaning) > 10);
        /* names are unique among the outputs at rest and among those under a
         * load (NAME@LOAD): utilisation and utilisation@<load> may share one */
        for (int j = 0; j < k; j++)
            if (hf_output_info_of((hf_output_kind)j)->at_load == in->at_load)
                assert_string_not_equal(in->name, hf_output_info_of((hf_output_kind)j)->name);
        if (in->dim == HF_DIM_NONE) {
            assert_true(in->scale == 1.0);
            assert_string_equal(in->unit_text, "-");
            continue;
        }
        /* the people's unit (kN m/rad: the moment part "kN m") read by the units module */
        char u[32];
        snprintf(u, sizeof u, "1 %s", in->unit_text);
        char *slash = strstr(u, "/rad");
        if (slash)
            *slash = '\0';
        hf_dim d = in->dim == HF_DIM_MOMENT ? HF_DIM_MOMENT : in->dim;
        double si = 0.0;
        hf_error e;
        if (hf_units_parse(u, d, &si, &e) != HF_OK)
            fail_msg("%s: \"%s\": %s", in->name, u, e.text);
        if (!(fabs(in->scale * si - 1.0) <= 1e-15))
            fail_msg("%s: scale %g but 1 %s = %g SI", in->name, in->scale, in->unit_text, si);
    }
    assert_null(hf_output_info_of(HF_OUT_COUNT));
    assert_string_equal(hf_output_name(HF_OUT_COUNT), "?");
    size_t n;
    const char *const *d = hf_output_defaults(&n);
    assert_int_equal(n, 4);
    hf_output o;
    hf_error e;
    for (size_t i = 0; i < n; i++)
        assert_int_equal(hf_output_parse(&model, d[i], &o, &e), HF_OK);
}

static void test_parse_and_hints(void **s)
{
    (void)s;
    hf_output o;
    hf_error e;
    assert_int_equal(hf_output_parse(&model, "fairlead_tension:southeast", &o, &e), HF_OK);
    assert_int_equal(o.kind, HF_OUT_FAIRLEAD_TENSION);
    assert_int_equal(o.line, 2);
    assert_true(hf_output_is_scalar(&o));
    assert_int_equal(hf_output_dim(&o), HF_DIM_FORCE);
    char text[128];
    hf_output_text(&model, &o, text, sizeof text);
    assert_string_equal(text, "fairlead_tension:southeast");
    assert_int_equal(hf_output_parse(&model, "offset_gale", &o, &e), HF_OK);
    hf_output_text(&model, &o, text, sizeof text);
    assert_string_equal(text, "offset_gale");
    assert_int_equal(hf_output_dim(&o), HF_DIM_LENGTH);
    /* near misses get a hint; far ones do not */
    assert_int_equal(hf_output_parse(&model, "fairlead_tensoin", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "did you mean \"fairlead_tension\"?"));
    assert_int_equal(hf_output_parse(&model, "fairlead_tension:nort", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "did you mean \"north\"?"));
    assert_int_equal(hf_output_parse(&model, "offset_gael", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "did you mean \"gale\"?"));
    assert_int_equal(hf_output_parse(&model, "xyzzy", &o, &e), HF_EINVAL);
    assert_null(strstr(e.text, "did you mean"));
    assert_non_null(strstr(e.text, "offset_<load>"));
    assert_int_equal(hf_output_parse(&model, "stiffness_surge:north", &o, &e), HF_EINVAL);
    assert_int_equal(hf_output_parse(&model, "", &o, &e), HF_EINVAL);
}

static void test_columns(void **s)
{
    (void)s;
    hf_output o;
    hf_error e;
    hf_output_column c[8];
    char name[256];
    assert_int_equal(hf_output_parse(&model, "utilisation", &o, &e), HF_OK);
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 3);
    hf_output_column_name(&model, &c[1], name, sizeof name);
    assert_string_equal(name, "U_southwest");
    assert_int_equal(hf_output_parse(&model, "max_tension", &o, &e), HF_OK);
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 2);
    hf_output_column_name(&model, &c[0], name, sizeof name);
    assert_string_equal(name, "max_tension_kN");
    assert_true(hf_output_column_is_line(&c[1]));
    assert_true(hf_output_column_scale(&c[1]) == 0.0);
    assert_int_equal(hf_output_parse(&model, "stiffness_yaw", &o, &e), HF_OK);
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 1);
    hf_output_column_name(&model, &c[0], name, sizeof name);
    assert_string_equal(name, "stiffness_yaw_kNm_per_rad");
    assert_int_equal(hf_output_parse(&model, "offset_gale", &o, &e), HF_OK);
    assert_int_equal(hf_output_columns(&model, &o, NULL, 0), 3); /* counts without writing */
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 3);
    hf_output_column_name(&model, &c[2], name, sizeof name);
    assert_string_equal(name, "offset_gale_yaw_deg");
    assert_true(fabs(hf_output_column_scale(&c[2]) - 180.0 / M_PI) < 1e-15);
    /* column units: no spaces in a CSV column name (issue 12 item 17) */
    char u[32];
    assert_string_equal(hf_output_unit_for_column(HF_DIM_MOMENT, u, sizeof u), "Nm");
    assert_string_equal(hf_output_unit_for_column(HF_DIM_ANGLE, u, sizeof u), "deg");
    assert_string_equal(hf_output_unit_for_column(HF_DIM_NONE, u, sizeof u), "");
    for (int d = 0; d < HF_DIM_COUNT; d++)
        assert_null(strchr(hf_output_unit_for_column((hf_dim)d, u, sizeof u), ' '));
}

/* Issue 13: outputs at the intact equilibrium under a load, NAME@LOAD. */
static void test_at_load(void **s)
{
    (void)s;
    hf_output o;
    hf_error e;
    hf_output_column c[8];
    char name[256];
    assert_int_equal(hf_output_parse(&model, "max_tension@gale", &o, &e), HF_OK);
    assert_int_equal(o.kind, HF_OUT_MAX_TENSION_AT);
    assert_int_equal(o.load, 0);
    assert_true(hf_output_is_scalar(&o));
    assert_true(hf_output_needs_balance(&o));
    assert_int_equal(hf_output_dim(&o), HF_DIM_FORCE);
    hf_output_text(&model, &o, name, sizeof name);
    assert_string_equal(name, "max_tension@gale");
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 2);
    hf_output_column_name(&model, &c[0], name, sizeof name);
    assert_string_equal(name, "max_tension@gale_kN");
    hf_output_column_name(&model, &c[1], name, sizeof name);
    assert_string_equal(name, "max_tension_line@gale");
    assert_true(hf_output_column_is_line(&c[1]));
    assert_true(hf_output_column_scale(&c[0]) == 1e-3);
    /* per line, all or one */
    assert_int_equal(hf_output_parse(&model, "utilisation@gale", &o, &e), HF_OK);
    assert_int_equal(o.kind, HF_OUT_UTILISATION_AT);
    assert_false(hf_output_is_scalar(&o));
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 3);
    hf_output_column_name(&model, &c[2], name, sizeof name);
    assert_string_equal(name, "U_southeast@gale");
    assert_int_equal(hf_output_parse(&model, "tension@gale:southwest", &o, &e), HF_OK);
    assert_int_equal(o.line, 1);
    assert_true(hf_output_is_scalar(&o));
    hf_output_text(&model, &o, name, sizeof name);
    assert_string_equal(name, "tension@gale:southwest");
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 1);
    hf_output_column_name(&model, &c[0], name, sizeof name);
    assert_string_equal(name, "Tmax_southwest@gale_kN");
    assert_int_equal(hf_output_parse(&model, "max_utilisation@gale", &o, &e), HF_OK);
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 2);
    hf_output_column_name(&model, &c[1], name, sizeof name);
    assert_string_equal(name, "worst_line@gale");
    assert_int_equal(hf_output_parse(&model, "offset@gale", &o, &e), HF_OK);
    assert_int_equal(hf_output_dim(&o), HF_DIM_LENGTH);
    assert_int_equal(hf_output_columns(&model, &o, c, 8), 1);
    hf_output_column_name(&model, &c[0], name, sizeof name);
    assert_string_equal(name, "offset@gale_m");
    /* the outputs at rest need no balance */
    assert_int_equal(hf_output_parse(&model, "max_tension", &o, &e), HF_OK);
    assert_false(hf_output_needs_balance(&o));
    assert_int_equal(hf_output_parse(&model, "offset_gale", &o, &e), HF_OK);
    assert_true(hf_output_needs_balance(&o));
    /* refusals, each with its reason */
    assert_int_equal(hf_output_parse(&model, "max_tension@gael", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "did you mean \"gale\"?"));
    assert_int_equal(hf_output_parse(&model, "max_tension@", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "a load name after '@'"));
    assert_int_equal(hf_output_parse(&model, "max_tension@gale:north", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "takes no :LINE"));
    assert_int_equal(hf_output_parse(&model, "stiffness_surge@gale", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "evaluated at rest"));
    assert_int_equal(hf_output_parse(&model, "offset", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "offset@<load>"));
    assert_int_equal(hf_output_parse(&model, "max_tensoin@gale", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "did you mean \"max_tension\"?"));
    assert_int_equal(hf_output_parse(&model, "utilisation@gale:west", &o, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "no line named \"west\""));
}

static void test_help_lists_every_output(void **s)
{
    (void)s;
    char *text = NULL;
    size_t len = 0;
    FILE *f = open_memstream(&text, &len);
    assert_int_equal(hf_output_write_help(f, "  "), 0);
    fclose(f);
    for (int k = 0; k < HF_OUT_COUNT; k++) {
        const hf_output_info *in = hf_output_info_of((hf_output_kind)k);
        assert_non_null(strstr(text, in->name));
        assert_non_null(strstr(text, in->meaning));
    }
    free(text);
}

static void test_hint_distance(void **s)
{
    (void)s;
    /* Levenshtein distances from the standard examples (kitten/sitting 3,
     * flaw/lawn 2: Levenshtein 1966; Navarro, ACM Computing Surveys 33(1), 2001) */
    assert_int_equal(hf_hint_distance("kitten", "sitting"), 3);
    assert_int_equal(hf_hint_distance("flaw", "lawn"), 2);
    assert_int_equal(hf_hint_distance("", "abc"), 3);
    hf_hint h;
    hf_hint_init(&h);
    hf_hint_try(&h, "studles_chain", "studless_chain");
    hf_hint_try(&h, "studles_chain", "studlink_chain");
    char buf[64];
    assert_string_equal(hf_hint_text(&h, buf, sizeof buf), "; did you mean \"studless_chain\"?");
    hf_hint_init(&h);
    hf_hint_try(&h, "studless_chain", "studless_chain"); /* exact: no hint */
    assert_string_equal(hf_hint_text(&h, buf, sizeof buf), "");
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_catalogue_consistent),
        cmocka_unit_test(test_parse_and_hints),
        cmocka_unit_test(test_columns),
        cmocka_unit_test(test_at_load),
        cmocka_unit_test(test_help_lists_every_output),
        cmocka_unit_test(test_hint_distance),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
