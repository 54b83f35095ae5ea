/* test_criteria.c - criteria module: presets and sources, factor arithmetic, anchor checks. */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/criteria.h"

#define DEG (M_PI / 180.0)

static void criteria_blank(hf_criteria *c, hf_analysis_kind kind)
{
    memset(c, 0, sizeof *c);
    c->analysis = kind;
    c->max_offset = 17.25;
}

/* Applies preset `name` and checks the two factors to 1e-12. */
static void expect_preset(const char *name, hf_analysis_kind kind, double intact, double damaged)
{
    hf_criteria c;
    hf_error e;
    criteria_blank(&c, kind);
    assert_int_equal(hf_criteria_preset_apply(&c, name, &e), HF_OK);
    assert_float_equal(c.factor_intact, intact, 1e-12);
    assert_float_equal(c.factor_damaged, damaged, 1e-12);
    assert_non_null(c.source);
    assert_true(strlen(c.source) > 20);
    assert_float_equal(c.max_offset, 17.25, 0.0); /* untouched */
    assert_null(c.preset);                        /* untouched: the caller owns it */
}

static void test_api_rp_2sk(void **state)
{
    (void)state;
    /* API RP 2SK 3rd ed. (2005), line tension safety factors (from memory,
     * REFERENCE.md section 4): quasi-static 2.00 intact / 1.43 one line
     * broken; dynamic 1.67 / 1.25. */
    expect_preset("api-rp-2sk", HF_ANALYSIS_QUASI_STATIC, 2.00, 1.43);
    expect_preset("api-rp-2sk", HF_ANALYSIS_DYNAMIC, 1.67, 1.25);
    const hf_criteria_preset *p = hf_criteria_preset_find("api-rp-2sk");
    assert_non_null(p);
    assert_int_equal(p->from_memory, 1);
    assert_non_null(strstr(p->source, "from memory"));
    assert_non_null(strstr(p->source, "API RP 2SK"));
}

static void test_iso_19901_7(void **state)
{
    (void)state;
    /* ISO 19901-7 mirrors API RP 2SK's line factors (from memory). */
    expect_preset("iso-19901-7", HF_ANALYSIS_QUASI_STATIC, 2.00, 1.43);
    expect_preset("iso-19901-7", HF_ANALYSIS_DYNAMIC, 1.67, 1.25);
    const hf_criteria_preset *p = hf_criteria_preset_find("iso-19901-7");
    assert_non_null(strstr(p->source, "ISO 19901-7"));
    assert_non_null(strstr(p->source, "from memory"));
}

static void test_dnv(void **state)
{
    (void)state;
    /* DNV-OS-E301 ULS partial factors (from memory, REFERENCE.md section 4):
     * CC1 mean 1.10 / dynamic 1.50, CC2 1.40 / 2.10, capacity 0.95 MBL; ALS
     * (one line broken) 1.00 / 1.10 (from memory).  holdfast takes the whole
     * quasi-static tension as dynamic: required MBL/T = gamma_dyn / 0.95:
     *   CC1 intact 1.50 / 0.95 = 1.5789473684..., CC2 2.10 / 0.95 = 2.2105263157...,
     *   ALS 1.10 / 0.95 = 1.1578947368... */
    expect_preset("dnv-cc1", HF_ANALYSIS_QUASI_STATIC, 1.5789473684210527, 1.1578947368421053);
    expect_preset("dnv-cc2", HF_ANALYSIS_QUASI_STATIC, 2.2105263157894737, 1.1578947368421053);
    /* the analysis kind does not change the DNV equivalents (documented) */
    expect_preset("dnv-cc2", HF_ANALYSIS_DYNAMIC, 2.2105263157894737, 1.1578947368421053);
    const hf_criteria_preset *p1 = hf_criteria_preset_find("dnv-cc1");
    const hf_criteria_preset *p2 = hf_criteria_preset_find("dnv-cc2");
    /* the raw partial factors stay visible */
    assert_float_equal(p1->gamma_mean, 1.10, 0.0);
    assert_float_equal(p1->gamma_dyn, 1.50, 0.0);
    assert_float_equal(p2->gamma_mean, 1.40, 0.0);
    assert_float_equal(p2->gamma_dyn, 2.10, 0.0);
    assert_float_equal(p2->capacity, 0.95, 0.0);
    assert_float_equal(p2->gamma_dyn_als, 1.10, 0.0);
    /* the equivalent is the conservative one: never below the all-mean reading */
    assert_true(p1->intact_qs > p1->gamma_mean / p1->capacity);
    assert_true(p2->intact_qs > p2->gamma_mean / p2->capacity);
    assert_non_null(strstr(p1->source, "from memory"));
    assert_non_null(strstr(p2->source, "gamma_dyn / 0.95"));
}

static void test_ufc(void **state)
{
    (void)state;
    /* UFC 4-159-03 (3 Oct 2005) table 3-7, "Minimum Quasi-Static Factors of
     * Safety" (published): chain, wire and synthetic lines 3.0.  The
     * one-member-missing factor 0.75 x 3.0 = 2.25 is NOT in that table: it is
     * kept, marked "from memory" (issue 12 item 19). */
    expect_preset("ufc-4-159-03", HF_ANALYSIS_QUASI_STATIC, 3.0, 2.25);
    expect_preset("ufc-4-159-03", HF_ANALYSIS_DYNAMIC, 3.0, 2.25);
    const hf_criteria_preset *p = hf_criteria_preset_find("ufc-4-159-03");
    assert_int_equal(p->from_memory, 1);
    assert_int_equal(p->damaged_from_memory, 1);
    assert_non_null(strstr(p->source, "table 3-7"));
    assert_non_null(strstr(p->source, "3.0 on MBL (published)"));
    assert_non_null(strstr(p->source, "2.25 (from memory: not in table 3-7"));
    assert_true(p->damaged_qs >= 0.75 * p->intact_qs - 1e-15);
    /* the further values table 3-7 does hold (published) */
    assert_float_equal(p->bend_factor, 4.0, 0.0);         /* chain around bends */
    assert_float_equal(p->wet_nylon_strength, 0.85, 0.0); /* wet nylon: strength less 15 % */
    assert_float_equal(p->holding[HF_HOLDING_STOCKLESS], 1.5, 0.0);
    assert_float_equal(p->holding[HF_HOLDING_HIGH_EFFICIENCY], 2.0, 0.0);
    assert_float_equal(p->holding[HF_HOLDING_PILE_PLATE], 3.0, 0.0);
    assert_float_equal(p->holding[HF_HOLDING_SHIP], 1.0, 0.0);
    assert_non_null(p->table_source);
    assert_non_null(strstr(p->table_source, "table 3-7 (published)"));
    assert_null(strstr(p->table_source, "from memory"));
}

/* Presets that give no further table values leave them at 0, and the
 * helpers then change nothing. */
static void test_table_values_absent(void **state)
{
    (void)state;
    const char *names[] = {"api-rp-2sk", "iso-19901-7", "dnv-cc1", "dnv-cc2"};
    for (size_t i = 0; i < 4; i++) {
        const hf_criteria_preset *p = hf_criteria_preset_find(names[i]);
        assert_non_null(p);
        assert_float_equal(p->bend_factor, 0.0, 0.0);
        assert_float_equal(p->wet_nylon_strength, 0.0, 0.0);
        for (int k = 0; k < HF_HOLDING_NCLASSES; k++)
            assert_float_equal(p->holding[k], 0.0, 0.0);
        assert_null(p->table_source);
        assert_float_equal(hf_criteria_bend_required(p, 2.385, 0), 2.385, 0.0);
        double eff = 0;
        assert_int_equal(hf_criteria_effective_mbl(p, 7.43e6, 1, &eff, NULL), HF_OK);
        assert_float_equal(eff, 7.43e6, 0.0);
    }
}

static void test_bend_factor(void **state)
{
    (void)state;
    const hf_criteria_preset *p = hf_criteria_preset_find("ufc-4-159-03");
    /* UFC 4-159-03 table 3-7: chain around bends 4.0 (intact, published) */
    assert_float_equal(hf_criteria_bend_required(p, 3.0, 0), 4.0, 0.0);
    /* one line broken: same ratio 4/3 on the from-memory 2.25 -> 3.0
     * (holdfast's reading, documented in docs/criteria.md) */
    assert_float_equal(hf_criteria_bend_required(p, 2.25, 1), 3.0, 1e-15);
    /* never below the factor the case asks for */
    assert_float_equal(hf_criteria_bend_required(p, 4.75, 0), 4.75, 0.0);
    /* no check stays no check; no preset changes nothing */
    assert_float_equal(hf_criteria_bend_required(p, 0.0, 0), 0.0, 0.0);
    assert_float_equal(hf_criteria_bend_required(NULL, 3.0, 0), 3.0, 0.0);
}

static void test_wet_nylon(void **state)
{
    (void)state;
    const hf_criteria_preset *p = hf_criteria_preset_find("ufc-4-159-03");
    double eff = -1;
    /* UFC 4-159-03 table 3-7: wet nylon's strength reduced by 15 %:
     * 1,234.5 kN dry -> 0.85 x 1,234.5 = 1,049.325 kN */
    assert_int_equal(hf_criteria_effective_mbl(p, 1234.5e3, 1, &eff, NULL), HF_OK);
    assert_float_equal(eff, 1049.325e3, 1e-6);
    assert_int_equal(hf_criteria_effective_mbl(p, 1234.5e3, 0, &eff, NULL), HF_OK);
    assert_float_equal(eff, 1234.5e3, 0.0);
    hf_error e;
    hf_error_clear(&e);
    assert_int_equal(hf_criteria_effective_mbl(p, 0.0, 1, &eff, &e), HF_EINVAL);
    assert_float_equal(eff, 0.0, 0.0);
    assert_non_null(strstr(e.text, "MBL"));
    assert_int_equal(hf_criteria_effective_mbl(p, NAN, 1, &eff, NULL), HF_EINVAL);
    assert_int_equal(hf_criteria_effective_mbl(p, INFINITY, 1, &eff, NULL), HF_EINVAL);
}

static void test_holding(void **state)
{
    (void)state;
    const hf_criteria_preset *p = hf_criteria_preset_find("ufc-4-159-03");
    hf_holding_criterion h;
    /* UFC 4-159-03 table 3-7: high-efficiency drag anchors need an ultimate
     * holding capacity of 2.0 times the load: 961 kN against 480.5 kN is
     * exactly 2.0 (passes), against 480.6 kN just below (fails). */
    assert_int_equal(
        hf_criteria_holding_evaluate(p, HF_HOLDING_HIGH_EFFICIENCY, 961e3, 480.5e3, &h, NULL),
        HF_OK);
    assert_float_equal(h.factor, 2.0, 1e-15);
    assert_float_equal(h.required, 2.0, 0.0);
    assert_true(h.checked && h.passed);
    assert_int_equal(
        hf_criteria_holding_evaluate(p, HF_HOLDING_HIGH_EFFICIENCY, 961e3, 480.6e3, &h, NULL),
        HF_OK);
    assert_false(h.passed);
    /* stockless 1.5: 961 / 640 = 1.5016 passes; pile and plate 3.0 fails */
    assert_int_equal(hf_criteria_holding_evaluate(p, HF_HOLDING_STOCKLESS, 961e3, 640e3, &h, NULL),
                     HF_OK);
    assert_true(h.passed);
    assert_float_equal(h.factor, 961.0 / 640.0, 1e-15);
    assert_int_equal(hf_criteria_holding_evaluate(p, HF_HOLDING_PILE_PLATE, 961e3, 640e3, &h, NULL),
                     HF_OK);
    assert_false(h.passed);
    /* zero load: no factor, passes */
    assert_int_equal(hf_criteria_holding_evaluate(p, HF_HOLDING_SHIP, 961e3, 0.0, &h, NULL), HF_OK);
    assert_false(h.has_factor);
    assert_true(h.passed);
    /* a preset without the table: reported, not checked */
    assert_int_equal(hf_criteria_holding_evaluate(hf_criteria_preset_find("api-rp-2sk"),
                                                  HF_HOLDING_STOCKLESS, 961e3, 2000e3, &h, NULL),
                     HF_OK);
    assert_false(h.checked);
    assert_true(h.passed);
    assert_float_equal(h.factor, 0.4805, 1e-15);
    /* bad input */
    hf_error e;
    hf_error_clear(&e);
    assert_int_equal(hf_criteria_holding_evaluate(p, HF_HOLDING_SHIP, 0.0, 1.0, &h, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "capacity"));
    assert_int_equal(hf_criteria_holding_evaluate(p, HF_HOLDING_SHIP, 1.0, -1.0, &h, NULL),
                     HF_EINVAL);
    assert_int_equal(hf_criteria_holding_evaluate(p, HF_HOLDING_SHIP, 1.0, NAN, &h, NULL),
                     HF_EINVAL);
    assert_int_equal(hf_criteria_holding_evaluate(p, HF_HOLDING_NCLASSES, 1.0, 1.0, &h, NULL),
                     HF_EINVAL);
}

static void test_holding_names(void **state)
{
    (void)state;
    for (int k = 0; k < HF_HOLDING_NCLASSES; k++) {
        hf_holding_class c = HF_HOLDING_NCLASSES;
        const char *n = hf_criteria_holding_class_name((hf_holding_class)k);
        assert_int_equal(hf_criteria_holding_class_find(n, &c, NULL), HF_OK);
        assert_int_equal(c, k);
    }
    assert_string_equal(hf_criteria_holding_class_name(HF_HOLDING_NCLASSES), "unknown");
    hf_holding_class c;
    hf_error e;
    hf_error_clear(&e);
    assert_int_equal(hf_criteria_holding_class_find("Stockless", &c, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "high-efficiency"));
    assert_non_null(strstr(e.text, "Stockless"));
    assert_int_equal(hf_criteria_holding_class_find(NULL, &c, NULL), HF_EINVAL);
}

static void test_preset_table(void **state)
{
    (void)state;
    size_t n = hf_criteria_preset_count();
    assert_int_equal(n, 5);
    for (size_t i = 0; i < n; i++) {
        const hf_criteria_preset *p = hf_criteria_preset_at(i);
        assert_non_null(p);
        /* every preset is listed in the names text and found by its name */
        assert_non_null(strstr(HF_CRITERIA_PRESET_NAMES, p->name));
        assert_ptr_equal(hf_criteria_preset_find(p->name), p);
        /* every factor is a real safety factor and a damaged one never exceeds intact */
        assert_true(p->intact_qs >= 1.0 && p->damaged_qs >= 1.0);
        assert_true(p->damaged_qs <= p->intact_qs);
        assert_true(p->damaged_dyn <= p->intact_dyn);
        /* a from-memory preset says so in its source text */
        assert_int_equal(p->from_memory, strstr(p->source, "from memory") != NULL);
    }
    assert_null(hf_criteria_preset_at(n));
    assert_null(hf_criteria_preset_find(NULL));
    assert_null(hf_criteria_preset_find("API-RP-2SK")); /* exact names only */
    assert_null(hf_criteria_preset_find("api-rp-2sk "));
}

static void test_preset_unknown(void **state)
{
    (void)state;
    hf_criteria c;
    hf_error e;
    criteria_blank(&c, HF_ANALYSIS_QUASI_STATIC);
    c.factor_intact = 2.75;
    c.factor_damaged = 1.85;
    assert_int_equal(hf_criteria_preset_apply(&c, "api-2sk", &e), HF_EINVAL);
    assert_int_equal(e.status, HF_EINVAL);
    assert_non_null(strstr(e.text, "\"api-2sk\""));
    for (size_t i = 0; i < hf_criteria_preset_count(); i++)
        assert_non_null(strstr(e.text, hf_criteria_preset_at(i)->name));
    /* c unchanged */
    assert_float_equal(c.factor_intact, 2.75, 0.0);
    assert_float_equal(c.factor_damaged, 1.85, 0.0);
    assert_null(c.source);
    assert_int_equal(hf_criteria_preset_apply(&c, "", &e), HF_EINVAL);
    assert_int_equal(hf_criteria_preset_apply(&c, NULL, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_preset_apply(NULL, "api-rp-2sk", NULL), HF_EINVAL);
}

static void test_criteria_check(void **state)
{
    (void)state;
    hf_criteria c;
    hf_error e;
    criteria_blank(&c, HF_ANALYSIS_QUASI_STATIC);
    assert_int_equal(hf_criteria_check(&c, &e), HF_OK); /* all zero: no checks */
    c.factor_intact = 2.385;
    c.factor_damaged = 1.0; /* exactly 1 is allowed */
    assert_int_equal(hf_criteria_check(&c, &e), HF_OK);
    c.factor_damaged = 0.97; /* would accept T > MBL */
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "damaged_factor"));
    c.factor_damaged = 1.43;
    c.factor_intact = NAN;
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "intact_factor"));
    c.factor_intact = INFINITY;
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    c.factor_intact = -2.0;
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    c.factor_intact = 2.0;
    c.max_offset = -0.5;
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "max_offset"));
    c.max_offset = strtod("1e309", NULL); /* overflows to inf */
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_check(NULL, NULL), HF_EINVAL);
}

static void test_required(void **state)
{
    (void)state;
    hf_criteria c;
    criteria_blank(&c, HF_ANALYSIS_QUASI_STATIC);
    assert_int_equal(hf_criteria_preset_apply(&c, "ufc-4-159-03", NULL), HF_OK);
    assert_float_equal(hf_criteria_required(&c, 0), 3.0, 0.0);
    assert_float_equal(hf_criteria_required(&c, 1), 2.25, 0.0);
    /* a user override after the preset wins (what the case loader does) */
    c.factor_damaged = 2.6;
    assert_float_equal(hf_criteria_required(&c, 7), 2.6, 0.0);
}

static void test_line_factor_arithmetic(void **state)
{
    (void)state;
    hf_line_criterion r;
    hf_error e;
    /* 76 mm R3 studless chain: MBL = 0.0223 d^2 (44 - 0.08 d) kN = 4884.2 kN
     * (DNV-OS-E302 / IACS UR W22 formula, REFERENCE.md section 3):
     * 0.0223 x 5776 x 37.92 = 4884.278016 kN.  At T = 2138.7 kN:
     * factor 4884.278016 / 2138.7 = 2.283760236, utilisation 0.4378743374 */
    double mbl = 0.0223 * 76.0 * 76.0 * (44.0 - 0.08 * 76.0) * 1e3;
    assert_float_equal(mbl, 4884278.016, 1e-3);
    assert_int_equal(hf_criteria_line_evaluate(2.1387e6, mbl, 2.00, &r, &e), HF_OK);
    assert_float_equal(r.factor, 4884278.016 / 2.1387e6, 1e-12);
    assert_float_equal(r.factor, 2.283760236, 1e-8);
    assert_float_equal(r.utilisation, 0.4378743374, 1e-9);
    assert_true(r.checked && r.passed && r.has_factor);
    /* the same tension fails API's 2.00 -> UFC's 3.0 */
    assert_int_equal(hf_criteria_line_evaluate(2.1387e6, mbl, 3.0, &r, &e), HF_OK);
    assert_true(r.checked && !r.passed);
    /* boundary: T = MBL / 2 exactly meets a factor of 2 (pass is >=) */
    assert_int_equal(hf_criteria_line_evaluate(mbl / 2.0, mbl, 2.0, &r, &e), HF_OK);
    assert_true(r.passed);
    assert_int_equal(hf_criteria_line_evaluate(mbl / 2.0 * (1.0 + 1e-12), mbl, 2.0, &r, &e), HF_OK);
    assert_false(r.passed);
    /* no check requested: never fails, even above MBL */
    assert_int_equal(hf_criteria_line_evaluate(1.7 * mbl, mbl, 0.0, &r, &e), HF_OK);
    assert_true(!r.checked && r.passed);
    assert_float_equal(r.utilisation, 1.7, 1e-15);
    /* zero and subnormal tension: no factor reported, no Inf */
    assert_int_equal(hf_criteria_line_evaluate(0.0, mbl, 2.0, &r, &e), HF_OK);
    assert_true(r.passed && !r.has_factor);
    assert_float_equal(r.factor, 0.0, 0.0);
    assert_int_equal(hf_criteria_line_evaluate(4.9e-324, 1e300, 2.0, &r, &e), HF_OK);
    assert_true(isfinite(r.factor) && r.passed);
    /* bad input */
    assert_int_equal(hf_criteria_line_evaluate(NAN, mbl, 2.0, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_line_evaluate(-1.0, mbl, 2.0, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_line_evaluate(strtod("1e309", NULL), mbl, 2.0, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_line_evaluate(1e5, 0.0, 2.0, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_line_evaluate(1e5, mbl, -2.0, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_line_evaluate(1e5, mbl, INFINITY, &r, NULL), HF_EINVAL);
    assert_float_equal(r.factor, 0.0, 0.0); /* zeroed on failure */
}

static void test_anchor_gravity_block(void **state)
{
    (void)state;
    /* A gravity block, hand calculation (check: sliding when H > mu (W - V),
     * uplift when V > W, REFERENCE.md section 4; block friction on sand
     * 0.45-0.60, NAVFAC DM-7.02, from memory):
     *   W_sub = 312.5 kN, mu = 0.45, H = 85.3 kN, V = 23.7 kN
     *   sliding  mu (W - V) / H = 0.45 x (312.5 - 23.7) / 85.3
     *                           = 0.45 x 288.8 / 85.3 = 129.96 / 85.3 = 1.523563892
     *   uplift   W / V          = 312.5 / 23.7 = 13.18565401
     *   angle    atan(23.7 / 85.3) = 15.52757528 deg
     *   load     sqrt(85.3^2 + 23.7^2) = 88.53123742 kN */
    hf_anchor a = {.kind = HF_ANCHOR_GRAVITY, .weight = 312.5e3, .friction = 0.45};
    hf_anchor_criterion r;
    hf_error e;
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 85.3e3, 23.7e3, HF_CRITERIA_GRAVITY_SLIDING,
                                                 HF_CRITERIA_GRAVITY_UPLIFT, &r, &e),
                     HF_OK);
    assert_float_equal(r.sliding_factor, 1.523563892, 1e-9);
    assert_float_equal(r.uplift_factor, 13.18565401, 1e-8);
    assert_float_equal(r.angle / DEG, 15.52757528, 1e-7);
    assert_float_equal(r.load, 88531.23742, 1e-4);
    assert_true(r.has_sliding && r.has_uplift && r.checked && r.passed);
    /* a required sliding factor of 1.5 still passes, 1.6 does not */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 85.3e3, 23.7e3, 1.5, 1.0, &r, &e), HF_OK);
    assert_true(r.passed);
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 85.3e3, 23.7e3, 1.6, 1.0, &r, &e), HF_OK);
    assert_false(r.passed);
    /* H = 140 kN: 129.96 / 140 = 0.928285714 < 1: the block slides */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 140e3, 23.7e3, 1.0, 1.0, &r, &e), HF_OK);
    assert_float_equal(r.sliding_factor, 0.928285714, 1e-9);
    assert_false(r.passed);
    /* V = 320 kN > W: lifts off; no normal force, sliding factor 0;
     * uplift 312.5 / 320 = 0.9765625 */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 10e3, 320e3, 1.0, 1.0, &r, &e), HF_OK);
    assert_float_equal(r.sliding_factor, 0.0, 0.0);
    assert_float_equal(r.uplift_factor, 0.9765625, 1e-15);
    assert_false(r.passed);
    /* nothing pulling: holds, no factors reported (no Inf) */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 0.0, 0.0, 1.0, 1.0, &r, &e), HF_OK);
    assert_true(r.passed && !r.has_sliding && !r.has_uplift);
    assert_float_equal(r.angle, 0.0, 0.0);
    /* pure horizontal pull: uplift not reported, sliding 0.45 x 312.5 / 50 = 2.8125 */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 50e3, 0.0, 1.0, 1.0, &r, &e), HF_OK);
    assert_float_equal(r.sliding_factor, 2.8125, 1e-15);
    assert_true(r.passed && !r.has_uplift);
    /* bad blocks and factors */
    hf_anchor bad = a;
    bad.weight = 0.0;
    assert_int_equal(hf_criteria_anchor_evaluate(&bad, 1e3, 0.0, 1.0, 1.0, &r, &e), HF_EINVAL);
    bad = a;
    bad.friction = -0.1;
    assert_int_equal(hf_criteria_anchor_evaluate(&bad, 1e3, 0.0, 1.0, 1.0, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 1e3, 0.0, 0.0, 1.0, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 1e3, 0.0, 1.0, NAN, &r, &e), HF_EINVAL);
}

static void test_anchor_drag(void **state)
{
    (void)state;
    hf_anchor a = {.kind = HF_ANCHOR_DRAG, .max_uplift_angle = 0.0};
    hf_anchor_criterion r;
    hf_error e;
    /* Drag-embedment anchors: zero uplift angle intact (DNV-RP-E301 scope,
     * API RP 2SK, from memory). */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 612.4e3, 0.0, 1, 1, &r, &e), HF_OK);
    assert_true(r.checked && r.passed);
    assert_float_equal(r.angle, 0.0, 0.0);
    /* V/H = tan(2 deg): fails with no allowance */
    double h = 612.4e3, v = h * tan(2.0 * DEG);
    assert_int_equal(hf_criteria_anchor_evaluate(&a, h, v, 1, 1, &r, &e), HF_OK);
    assert_float_equal(r.angle / DEG, 2.0, 1e-12);
    assert_false(r.passed);
    /* allowed 3 deg: passes; allowed 1.5 deg: fails */
    a.max_uplift_angle = 3.0 * DEG;
    assert_int_equal(hf_criteria_anchor_evaluate(&a, h, v, 1, 1, &r, &e), HF_OK);
    assert_true(r.passed);
    assert_float_equal(r.max_angle, 3.0 * DEG, 0.0);
    a.max_uplift_angle = 1.5 * DEG;
    assert_int_equal(hf_criteria_anchor_evaluate(&a, h, v, 1, 1, &r, &e), HF_OK);
    assert_false(r.passed);
    /* a numerically tiny angle below the tolerance counts as zero */
    a.max_uplift_angle = 0.0;
    assert_int_equal(hf_criteria_anchor_evaluate(&a, h, h * 1e-9, 1, 1, &r, &e), HF_OK);
    assert_true(r.passed);
    /* vertical pull: 90 deg */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 0.0, 5e4, 1, 1, &r, &e), HF_OK);
    assert_float_equal(r.angle, M_PI / 2, 1e-15);
    assert_false(r.passed);
    a.max_uplift_angle = NAN;
    assert_int_equal(hf_criteria_anchor_evaluate(&a, h, 0.0, 1, 1, &r, &e), HF_EINVAL);
    a.max_uplift_angle = M_PI / 2;
    assert_int_equal(hf_criteria_anchor_evaluate(&a, h, 0.0, 1, 1, &r, &e), HF_EINVAL);
}

static void test_anchor_pile_plate_and_input(void **state)
{
    (void)state;
    hf_anchor_criterion r;
    hf_error e;
    hf_anchor p = {.kind = HF_ANCHOR_PILE};
    /* 3-4-5 triangle: load 5 x 96.25 kN, angle atan(4/3) = 53.130102 deg */
    assert_int_equal(hf_criteria_anchor_evaluate(&p, 3 * 96.25e3, 4 * 96.25e3, 1, 1, &r, &e),
                     HF_OK);
    assert_float_equal(r.load, 5 * 96.25e3, 1e-6);
    assert_float_equal(r.angle / DEG, 53.13010235, 1e-7);
    assert_true(!r.checked && r.passed);
    assert_string_equal(hf_criteria_anchor_kind_name(r.kind), "pile");
    hf_anchor q = {.kind = HF_ANCHOR_PLATE};
    assert_int_equal(hf_criteria_anchor_evaluate(&q, 3e5, 7e5, 1, 1, &r, &e), HF_OK);
    assert_true(!r.checked && r.passed);
    assert_string_equal(hf_criteria_anchor_kind_name(HF_ANCHOR_PLATE), "plate");
    assert_string_equal(hf_criteria_anchor_kind_name(HF_ANCHOR_DRAG), "drag");
    assert_string_equal(hf_criteria_anchor_kind_name(HF_ANCHOR_GRAVITY), "gravity");
    /* bad forces and kinds */
    assert_int_equal(hf_criteria_anchor_evaluate(&p, -1.0, 0.0, 1, 1, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_anchor_evaluate(&p, 1.0, NAN, 1, 1, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_anchor_evaluate(&p, INFINITY, 0.0, 1, 1, &r, &e), HF_EINVAL);
    assert_int_equal(hf_criteria_anchor_evaluate(NULL, 1.0, 0.0, 1, 1, &r, &e), HF_EINVAL);
    hf_anchor k = {.kind = (hf_anchor_kind)17};
    assert_int_equal(hf_criteria_anchor_evaluate(&k, 1.0, 0.0, 1, 1, &r, NULL), HF_EINVAL);
}

/* Issue 13 item 3: the statics of a block on a frictional seabed decide the
 * verdict at the published thresholds: it slides when H > mu (W - V) and
 * lifts when V > W (REFERENCE.md section 4; the friction values are those
 * docs/criteria.md cites for a block on the seabed: sand 0.45-0.60, clay
 * 0.30-0.35, NAVFAC DM-7.02, from memory).  The block is the marina demo's
 * (submerged weight 140 kN, invented). */
static void test_block_statics_thresholds(void **state)
{
    (void)state;
    static const double mu[] = {0.45, 0.60, 0.30, 0.35};
    const double w = 140e3, v = 17.35e3;
    for (size_t k = 0; k < sizeof mu / sizeof mu[0]; k++) {
        hf_anchor a = {.kind = HF_ANCHOR_GRAVITY, .weight = w, .friction = mu[k]};
        hf_anchor_criterion r;
        double hcrit = mu[k] * (w - v); /* friction resistance, N */
        assert_int_equal(hf_criteria_anchor_evaluate(&a, hcrit * (1 - 1e-9), v, 1.0, 1.0, &r, NULL),
                         HF_OK);
        assert_true(r.passed && r.sliding_factor > 1.0);
        assert_int_equal(hf_criteria_anchor_evaluate(&a, hcrit * (1 + 1e-9), v, 1.0, 1.0, &r, NULL),
                         HF_OK);
        if (r.passed || !(r.sliding_factor < 1.0))
            fail_msg("mu %.2f: H just above mu (W - V) = %.6g N must slide", mu[k], hcrit);
        /* a required factor of 1.5 moves the threshold to mu (W - V) / 1.5 */
        assert_int_equal(
            hf_criteria_anchor_evaluate(&a, hcrit / 1.5 * (1 + 1e-9), v, 1.5, 1.0, &r, NULL),
            HF_OK);
        assert_false(r.passed);
        assert_int_equal(
            hf_criteria_anchor_evaluate(&a, hcrit / 1.5 * (1 - 1e-9), v, 1.5, 1.0, &r, NULL),
            HF_OK);
        assert_true(r.passed);
        assert_float_equal(r.sliding_factor, 1.5, 1e-8);
    }
    /* lifting: V just above W fails (and nothing holds it against sliding),
     * V just below passes the uplift check with W / V just above 1 */
    hf_anchor a = {.kind = HF_ANCHOR_GRAVITY, .weight = w, .friction = 0.5};
    hf_anchor_criterion r;
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 1e3, w * (1 + 1e-9), 1.0, 1.0, &r, NULL),
                     HF_OK);
    assert_false(r.passed);
    assert_true(r.uplift_factor < 1.0);
    assert_float_equal(r.sliding_factor, 0.0, 0.0);
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 0.0, w * (1 - 1e-9), 1.0, 1.0, &r, NULL),
                     HF_OK);
    assert_true(r.passed);
    /* required uplift 1.25: W / V = 140 / 115 = 1.217 < 1.25 fails */
    assert_int_equal(hf_criteria_anchor_evaluate(&a, 0.0, 115e3, 1.0, 1.25, &r, NULL), HF_OK);
    assert_false(r.passed);
    assert_float_equal(r.uplift_factor, 140.0 / 115.0, 1e-12);
}

/* The required block factors: the line's own, else the case's, else 1.0. */
static void test_block_required(void **state)
{
    (void)state;
    hf_criteria c;
    criteria_blank(&c, HF_ANALYSIS_QUASI_STATIC);
    hf_anchor a = {.kind = HF_ANCHOR_GRAVITY, .weight = 90e3, .friction = 0.5};
    double s, u;
    hf_criteria_block_required(&c, &a, &s, &u);
    assert_float_equal(s, HF_CRITERIA_GRAVITY_SLIDING, 0.0);
    assert_float_equal(u, HF_CRITERIA_GRAVITY_UPLIFT, 0.0);
    assert_float_equal(s, 1.0, 0.0); /* defaults unchanged (issue 13) */
    c.block_sliding = 1.375;
    c.block_uplift = 1.125;
    hf_criteria_block_required(&c, &a, &s, NULL);
    hf_criteria_block_required(&c, &a, NULL, &u);
    assert_float_equal(s, 1.375, 0.0);
    assert_float_equal(u, 1.125, 0.0);
    a.required_sliding = 1.6;
    hf_criteria_block_required(&c, &a, &s, &u);
    assert_float_equal(s, 1.6, 0.0);
    assert_float_equal(u, 1.125, 0.0);
    a.required_uplift = 2.05;
    hf_criteria_block_required(NULL, &a, &s, &u);
    assert_float_equal(u, 2.05, 0.0);
    /* hf_criteria_check holds the case's block factors to 0 or >= 1 */
    assert_int_equal(hf_criteria_check(&c, NULL), HF_OK);
    c.block_sliding = 0.8;
    hf_error e;
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "block_sliding_factor"));
    c.block_sliding = 0.0;
    c.block_uplift = NAN;
    assert_int_equal(hf_criteria_check(&c, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "block_uplift_factor"));
}

/* Anchor loads with and without the grounded line's friction, on a solved
 * chain (the line solver): with friction the anchor sees
 * max(H - mu w L_B, 0) (Coulomb friction on the grounded length L_B,
 * Jonkman, NREL/TP-500-41958, 2007, as REFERENCE.md gives it); ignoring it,
 * the horizontal tension H of the suspended part. */
static void test_anchor_forces_friction(void **state)
{
    (void)state;
    hf_line ln;
    memset(&ln, 0, sizeof ln);
    ln.n = 1;
    /* 76 mm studless chain, invented round values near common practice */
    ln.sec[0] = (hf_section){
        .length = 412.5, .weight = 1.1375e3, .ea = 5.83e8, .mbl = 5.77e6, .friction = 1.0};
    hf_line_state st;
    assert_int_equal(hf_line_solve(&ln, 385.25, 58.4, NULL, NULL, &st), HF_OK);
    assert_true(st.grounded > 1.0); /* part of it rests on the seabed */
    double expect = fmax(st.h - 1.0 * 1.1375e3 * st.grounded, 0.0);
    hf_criteria c;
    criteria_blank(&c, HF_ANALYSIS_QUASI_STATIC);
    double h, v;
    hf_criteria_anchor_forces(&c, &st, &h, &v);
    assert_float_equal(h, st.anchor_h, 0.0);
    assert_float_equal(h, expect, 1e-6 * st.h);
    assert_float_equal(v, 0.0, 0.0); /* grounded: no uplift at the anchor */
    c.anchor_ignore_friction = 1;
    hf_criteria_anchor_forces(&c, &st, &h, &v);
    assert_float_equal(h, st.h, 0.0);
    assert_true(h > st.anchor_h);
    assert_float_equal(v, 0.0, 0.0);
    /* the same line solved with no friction: anchor load = its H, close to the
     * H above (the geometry differs only by the extra stretch of the grounded
     * chain without friction, H L_B / EA ~ 0.1 m here: within 1 %) */
    ln.sec[0].friction = 0.0;
    hf_line_state nf;
    assert_int_equal(hf_line_solve(&ln, 385.25, 58.4, NULL, NULL, &nf), HF_OK);
    assert_float_equal(nf.anchor_h, nf.h, 1e-9 * nf.h);
    assert_float_equal(nf.anchor_h, st.h, 1e-2 * st.h);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_api_rp_2sk),
        cmocka_unit_test(test_iso_19901_7),
        cmocka_unit_test(test_dnv),
        cmocka_unit_test(test_ufc),
        cmocka_unit_test(test_table_values_absent),
        cmocka_unit_test(test_bend_factor),
        cmocka_unit_test(test_wet_nylon),
        cmocka_unit_test(test_holding),
        cmocka_unit_test(test_holding_names),
        cmocka_unit_test(test_preset_table),
        cmocka_unit_test(test_preset_unknown),
        cmocka_unit_test(test_criteria_check),
        cmocka_unit_test(test_required),
        cmocka_unit_test(test_line_factor_arithmetic),
        cmocka_unit_test(test_anchor_gravity_block),
        cmocka_unit_test(test_anchor_drag),
        cmocka_unit_test(test_anchor_pile_plate_and_input),
        cmocka_unit_test(test_block_statics_thresholds),
        cmocka_unit_test(test_block_required),
        cmocka_unit_test(test_anchor_forces_friction),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
