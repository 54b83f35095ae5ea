/* test_component.c - catalogue formulas against published values, overrides, errors. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/component.h"
#include "holdfast/case.h"
#include "holdfast/model.h"

#define SEAWATER 1025.0 /* kg/m^3, Tupper, Introduction to Naval Architecture */
#define GN 9.80665      /* m/s^2, NIST SP 811 (2008) */

/* Builds and resolves a component; fails the test on error. */
static hf_component make(hf_component_type t, hf_chain_grade g, double d_mm)
{
    hf_component c;
    hf_error err;
    hf_component_init(&c, t);
    c.grade = g;
    c.diameter = d_mm * 1e-3;
    if (hf_component_resolve(&c, SEAWATER, &err) != HF_OK)
        fail_msg("%s %s %g mm: %s", hf_component_type_name(t), hf_component_grade_name(g), d_mm,
                 err.text);
    return c;
}

/* Resolves c and expects HF_EINVAL with `part` in the message. */
static void refuse(hf_component *c, double rho, const char *part)
{
    hf_error err;
    hf_error_clear(&err);
    if (hf_component_resolve(c, rho, &err) != HF_EINVAL)
        fail_msg("accepted; expected an error containing \"%s\"", part);
    if (!strstr(err.text, part))
        fail_msg("message \"%s\" lacks \"%s\"", err.text, part);
}

static void close_rel(double got, double want, double rel, const char *what)
{
    if (!(fabs(got - want) <= rel * fabs(want)))
        fail_msg("%s: got %.10g, want %.10g (rel tol %g)", what, got, want, rel);
}

/* Offshore chain MBL = c d^2 (44 - 0.08 d) kN: DNV-OS-E302 / IACS UR W22 (the
 * formula and its constants as quoted in REFERENCE.md section 3 [sec]). */
static void test_chain_mbl_offshore(void **state)
{
    (void)state;
    /* R3 76 mm: 4884 kN [derived from the DNV formula; REFERENCE.md] */
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R3, 76).value[HF_PROP_MBL], 4884e3, 1e-4,
              "R3 76");
    /* Hand evaluations of the same published formula:
     * R4 84 mm: 0.0274 x 84^2 x (44 - 6.72) = 7207.5 kN */
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R4, 84).value[HF_PROP_MBL], 7207.5e3, 1e-5,
              "R4 84");
    /* R5 120 mm: 0.0320 x 120^2 x (44 - 9.6) = 15851.5 kN */
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R5, 120).value[HF_PROP_MBL], 15851.52e3, 1e-6,
              "R5 120");
    /* R3S 102 mm: 0.0249 x 102^2 x (44 - 8.16) = 9284.7 kN */
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R3S, 102).value[HF_PROP_MBL], 9284.696e3, 1e-6,
              "R3S 102");
    /* R4S 95 mm: 0.0304 x 95^2 x (44 - 7.6) = 9986.7 kN */
    close_rel(make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_R4S, 95).value[HF_PROP_MBL], 9986.704e3, 1e-6,
              "R4S 95 studlink");
    /* The grade constants order the grades: R3 < R3S < R4 < R4S < R5 at any size. */
    double last = 0;
    for (int g = HF_GRADE_R3; g <= HF_GRADE_R5; g++) {
        double v = make(HF_COMP_STUDLESS_CHAIN, (hf_chain_grade)g, 137.5).value[HF_PROP_MBL];
        assert_true(v > last);
        last = v;
    }
    /* Studless and studlink share the MBL formula (DNV-OS-E302). */
    close_rel(make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_R3, 76).value[HF_PROP_MBL], 4884e3, 1e-4,
              "R3 76 studlink");
    assert_non_null(strstr(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R4S, 95).source[HF_PROP_MBL],
                           "DNV-OS-E302 / IACS UR W22 MBL formula, grade R4S"));
}

/* Ship anchor chain, stud-link grades 1, 2, 3 at 76 mm.  Published stud-link
 * table values (IACS UR W18 / UR A1 tables, from memory): 2150, 3010 and
 * 4300 kN.  The formula is within 0.2 % of them (REFERENCE.md section 3). */
static void test_chain_mbl_ship(void **state)
{
    (void)state;
    close_rel(make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_1, 76).value[HF_PROP_MBL], 2150e3, 2e-3,
              "grade 1 76");
    close_rel(make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_2, 76).value[HF_PROP_MBL], 3010e3, 2e-3,
              "grade 2 76");
    close_rel(make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_3, 76).value[HF_PROP_MBL], 4300e3, 2e-3,
              "grade 3 76");
    /* The formula itself (IACS UR W18, from memory): 0.01373 x 58^2 x 39.36 kN */
    close_rel(make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_2, 58).value[HF_PROP_MBL], 1817.9487e3, 1e-6,
              "grade 2 58");
    assert_non_null(
        strstr(make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_3, 58).source[HF_PROP_MBL], "IACS UR W18"));
}

/* Studless chain EA, DNV-OS-E301 (2010-2015) [sec]: E A with A = 2 pi d^2/4. */
static void test_chain_ea(void **state)
{
    (void)state;
    /* 147 mm R4S gives 1725 MN (REFERENCE.md section 3, DNV-OS-E301, R4 line). */
    hf_component c = make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R4S, 147);
    close_rel(c.value[HF_PROP_EA], 1725e6, 5e-4, "R4S 147 EA");
    assert_non_null(strstr(c.source[HF_PROP_EA], "R4 line used for R4S"));
    assert_false(c.approximate);
    /* R4 uses the same line. */
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R4, 147).value[HF_PROP_EA], c.value[HF_PROP_EA],
              1e-15, "R4 = R4S");
    /* R3 76 mm: (5.40 - 0.304) 1e10 Pa x 2 pi 0.076^2 / 4 m^2 = 462.36 MN */
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R3, 76).value[HF_PROP_EA], 462.356e6, 1e-5,
              "R3 76 EA");
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R3S, 76).value[HF_PROP_EA], 462.356e6, 1e-5,
              "R3S 76 EA (R3 line)");
    /* R5 114 mm: (6.00 - 0.3762) 1e10 x 2 pi 0.114^2 / 4 = 1148.05 MN */
    close_rel(make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R5, 114).value[HF_PROP_EA], 1148.046e6, 1e-5,
              "R5 114 EA");
    /* Ship grade studless: R3 line, flagged approximate. */
    c = make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_2, 76);
    close_rel(c.value[HF_PROP_EA], 462.356e6, 1e-5, "grade 2 studless EA");
    assert_true(c.approximate);
    /* Studlink: 1.01e11 d^2 N (from memory, approximate): 76 mm -> 583.38 MN */
    c = make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_R3, 76);
    close_rel(c.value[HF_PROP_EA], 583.376e6, 1e-6, "studlink 76 EA");
    assert_true(c.approximate);
    assert_non_null(strstr(c.source[HF_PROP_EA], "approximate"));
}

/* Chain mass 0.0199 d^2 (studless), 0.0219 d^2 (studlink) kg/m (catalogue
 * practice [sec]); wet weight x (1 - 1025/7850) = 0.8694 (REFERENCE.md). */
static void test_chain_weight(void **state)
{
    (void)state;
    hf_component c = make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R3, 76);
    close_rel(c.value[HF_PROP_MASS], 114.9424, 1e-9, "studless 76 mass");
    close_rel(c.value[HF_PROP_WET_WEIGHT], 114.9424 * GN * 0.8694, 1e-4, "studless 76 wet");
    close_rel(c.value[HF_PROP_WET_WEIGHT] / (c.value[HF_PROP_MASS] * GN), 0.8694, 1e-4, "ratio");
    close_rel(c.value[HF_PROP_FRICTION], 1.0, 0, "chain friction");
    assert_non_null(strstr(c.source[HF_PROP_MASS], "0.0199 d^2"));
    assert_non_null(strstr(c.source[HF_PROP_WET_WEIGHT], "7850"));
    assert_int_equal(c.given, 0);

    c = make(HF_COMP_STUDLINK_CHAIN, HF_GRADE_R4, 63.5);
    close_rel(c.value[HF_PROP_MASS], 0.0219 * 63.5 * 63.5, 1e-12, "studlink 63.5 mass");

    /* Fresher water: less buoyancy, more wet weight (1000 kg/m^3). */
    hf_component f;
    hf_error err;
    hf_component_init(&f, HF_COMP_STUDLESS_CHAIN);
    f.grade = HF_GRADE_R3;
    f.diameter = 0.076;
    assert_int_equal(hf_component_resolve(&f, 1000.0, &err), HF_OK);
    close_rel(f.value[HF_PROP_WET_WEIGHT], 114.9424 * GN * (1 - 1000.0 / 7850.0), 1e-12,
              "fresh water");
}

/* Wire: approximate values from memory (REFERENCE.md section 3 [mem]). */
static void test_wire(void **state)
{
    (void)state;
    hf_component c = make(HF_COMP_SPIRAL_STRAND, HF_GRADE_NONE, 64);
    close_rel(c.value[HF_PROP_MASS], 0.0050 * 4096, 1e-12, "spiral mass");
    close_rel(c.value[HF_PROP_MBL], 0.95 * 4096 * 1e3, 1e-12, "spiral MBL");
    close_rel(c.value[HF_PROP_EA], 95 * 4096 * 1e3, 1e-12, "spiral EA");
    close_rel(c.value[HF_PROP_WET_WEIGHT], 20.48 * GN * (1 - 1025 / 7850.0), 1e-12, "spiral wet");
    close_rel(c.value[HF_PROP_FRICTION], 0.6, 0, "wire friction");
    assert_true(c.approximate);
    for (int p = HF_PROP_MASS; p <= HF_PROP_MBL; p++)
        if (!strstr(c.source[p], "approximate: enter manufacturer catalogue data"))
            fail_msg("spiral %s source: %s", hf_component_prop_name((hf_component_prop)p),
                     c.source[p]);

    c = make(HF_COMP_SIX_STRAND, HF_GRADE_NONE, 52.5);
    close_rel(c.value[HF_PROP_MASS], 0.0040 * 52.5 * 52.5, 1e-12, "six mass");
    close_rel(c.value[HF_PROP_MBL], 0.7 * 52.5 * 52.5 * 1e3, 1e-12, "six MBL");
    close_rel(c.value[HF_PROP_EA], 45 * 52.5 * 52.5 * 1e3, 1e-12, "six EA");
    assert_true(c.approximate);
    assert_non_null(strstr(c.source[HF_PROP_EA], "approximate: enter manufacturer catalogue data"));
}

/* Fibre: approximate values from memory; EA a multiple of MBL (polyester
 * 12-30 x MBL per open textbook practice, REFERENCE.md [sec]). */
static void test_fibre(void **state)
{
    (void)state;
    hf_component c = make(HF_COMP_POLYESTER, HF_GRADE_NONE, 162.5);
    double d2 = 162.5 * 162.5;
    close_rel(c.value[HF_PROP_MASS], 0.00070 * d2, 1e-12, "polyester mass");
    close_rel(c.value[HF_PROP_WET_WEIGHT], 0.00070 * d2 * GN * (1 - 1025 / 1380.0), 1e-12,
              "polyester wet");
    close_rel(c.value[HF_PROP_MBL], 0.25 * d2 * 1e3, 1e-12, "polyester MBL");
    double ratio = c.value[HF_PROP_EA] / c.value[HF_PROP_MBL];
    assert_true(ratio >= 12 && ratio <= 30);
    close_rel(c.value[HF_PROP_FRICTION], 0.6, 0, "fibre friction");
    assert_true(c.approximate);
    assert_non_null(
        strstr(c.source[HF_PROP_MBL], "approximate: enter manufacturer catalogue data"));

    c = make(HF_COMP_NYLON, HF_GRADE_NONE, 88);
    close_rel(c.value[HF_PROP_MASS], 0.00060 * 88 * 88, 1e-12, "nylon mass");
    close_rel(c.value[HF_PROP_WET_WEIGHT], 0.00060 * 88 * 88 * GN * (1 - 1025 / 1140.0), 1e-12,
              "nylon wet");
    close_rel(c.value[HF_PROP_EA], 5 * 0.20 * 88 * 88 * 1e3, 1e-12, "nylon EA");
    assert_true(c.approximate);

    /* A given MBL drives the fibre EA. */
    hf_error err;
    hf_component_init(&c, HF_COMP_POLYESTER);
    c.diameter = 0.16;
    hf_component_give(&c, HF_PROP_MBL, 8.725e6);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    close_rel(c.value[HF_PROP_EA], 20 * 8.725e6, 1e-12, "EA from given MBL");
    assert_non_null(strstr(c.source[HF_PROP_EA], "given MBL"));
}

static void test_custom(void **state)
{
    (void)state;
    hf_component c;
    hf_error err;
    hf_component_init(&c, HF_COMP_CUSTOM);
    hf_component_give(&c, HF_PROP_WET_WEIGHT, 1.1e3);
    hf_component_give(&c, HF_PROP_EA, 5.0e8);
    hf_component_give(&c, HF_PROP_MBL, 5.0e6);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    assert_true(c.value[HF_PROP_WET_WEIGHT] == 1.1e3);
    assert_true(c.value[HF_PROP_EA] == 5.0e8);
    assert_true(c.value[HF_PROP_MBL] == 5.0e6);
    assert_true(c.value[HF_PROP_MASS] == 0.0);
    assert_string_equal(c.source[HF_PROP_MASS], "not given (informational only)");
    assert_string_equal(c.source[HF_PROP_MBL], "given");
    close_rel(c.value[HF_PROP_FRICTION], 1.0, 0, "custom friction");
    assert_false(c.approximate);

    /* Friction zero is allowed (a frictionless seabed). */
    hf_component_give(&c, HF_PROP_FRICTION, 0.0);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    assert_true(c.value[HF_PROP_FRICTION] == 0.0);

    /* Missing values are all named. */
    hf_component_init(&c, HF_COMP_CUSTOM);
    hf_component_give(&c, HF_PROP_WET_WEIGHT, 835.5);
    refuse(&c, SEAWATER,
           "a custom component needs wet_weight, axial_stiffness and "
           "breaking_load; missing: axial_stiffness, breaking_load");
    hf_component_init(&c, HF_COMP_CUSTOM);
    hf_component_give(&c, HF_PROP_MASS, 95.5); /* mass is not turned into wet weight */
    refuse(&c, SEAWATER, "missing: wet_weight, axial_stiffness, breaking_load");
    hf_component_init(&c, HF_COMP_CUSTOM);
    hf_component_give(&c, HF_PROP_WET_WEIGHT, 835.5);
    hf_component_give(&c, HF_PROP_EA, 2.5e8);
    hf_component_give(&c, HF_PROP_MBL, 3.5e6);
    c.diameter = -0.05;
    refuse(&c, SEAWATER, "diameter must be a positive length");
    c.diameter = 0.05;
    c.grade = HF_GRADE_R3;
    refuse(&c, SEAWATER, "grade R3 applies to chain only, not to a custom component");
}

/* User values override derived ones; the other values stay derived. */
static void test_override(void **state)
{
    (void)state;
    hf_component c;
    hf_error err;
    /* The example: spiral strand 64 mm with breaking_load 3.9 MN. */
    hf_component_init(&c, HF_COMP_SPIRAL_STRAND);
    c.diameter = 0.064;
    hf_component_give(&c, HF_PROP_MBL, 3.9e6);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    assert_true(c.value[HF_PROP_MBL] == 3.9e6);
    assert_string_equal(c.source[HF_PROP_MBL], "given");
    assert_int_equal(c.given, 1u << HF_PROP_MBL);
    close_rel(c.value[HF_PROP_EA], 95 * 4096 * 1e3, 1e-12, "EA still derived");
    assert_true(c.approximate);
    /* Entering all catalogue data clears the approximate flag. */
    hf_component_give(&c, HF_PROP_MASS, 21.35);
    hf_component_give(&c, HF_PROP_WET_WEIGHT, 178.5);
    hf_component_give(&c, HF_PROP_EA, 4.125e8);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    assert_false(c.approximate);
    assert_true(c.value[HF_PROP_WET_WEIGHT] == 178.5);

    /* Wet weight given, mass derived from it (and said so). */
    hf_component_init(&c, HF_COMP_STUDLESS_CHAIN);
    c.grade = HF_GRADE_R3;
    c.diameter = 0.076;
    hf_component_give(&c, HF_PROP_WET_WEIGHT, 1.1e3);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    close_rel(c.value[HF_PROP_MASS], 1.1e3 / (GN * (1 - 1025 / 7850.0)), 1e-12, "mass from wet");
    assert_non_null(strstr(c.source[HF_PROP_MASS], "derived from the given wet weight"));
    close_rel(c.value[HF_PROP_MBL], 4884e3, 1e-4, "MBL still derived");

    /* Mass given, wet weight derived from it. */
    hf_component_init(&c, HF_COMP_STUDLINK_CHAIN);
    c.grade = HF_GRADE_R4;
    c.diameter = 0.084;
    hf_component_give(&c, HF_PROP_MASS, 157.25);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    close_rel(c.value[HF_PROP_WET_WEIGHT], 157.25 * GN * (1 - 1025 / 7850.0), 1e-12, "wet");
    assert_non_null(strstr(c.source[HF_PROP_WET_WEIGHT], "derived from the given mass"));

    /* Every property given: no diameter needed. */
    hf_component_init(&c, HF_COMP_STUDLESS_CHAIN);
    c.grade = HF_GRADE_R3S;
    hf_component_give(&c, HF_PROP_WET_WEIGHT, 1.2375e3);
    hf_component_give(&c, HF_PROP_EA, 6.15e8);
    hf_component_give(&c, HF_PROP_MBL, 6.35e6);
    hf_component_give(&c, HF_PROP_FRICTION, 0.85);
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    assert_true(c.value[HF_PROP_FRICTION] == 0.85);
    assert_non_null(strstr(c.source[HF_PROP_MASS], "given wet weight"));

    /* An unknown property index is ignored. */
    hf_component_give(&c, HF_PROP_COUNT, 99.0);
    assert_int_equal(c.given, (1u << HF_PROP_WET_WEIGHT) | (1u << HF_PROP_EA) |
                                  (1u << HF_PROP_MBL) | (1u << HF_PROP_FRICTION));
}

/* Resolving again after the spec changed (as a sweep does) re-derives. */
static void test_reresolve(void **state)
{
    (void)state;
    hf_component c = make(HF_COMP_STUDLESS_CHAIN, HF_GRADE_R3, 76);
    hf_error err;
    c.diameter = 0.084;
    c.grade = HF_GRADE_R4;
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    close_rel(c.value[HF_PROP_MBL], 7207.5e3, 1e-5, "re-resolved MBL");
    close_rel(c.value[HF_PROP_MASS], 0.0199 * 84 * 84, 1e-12, "re-resolved mass");
    /* and a type change from wire to chain does not keep wire values */
    c = make(HF_COMP_SPIRAL_STRAND, HF_GRADE_NONE, 76);
    c.type = HF_COMP_STUDLESS_CHAIN;
    c.grade = HF_GRADE_R3;
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    close_rel(c.value[HF_PROP_MBL], 4884e3, 1e-4, "wire -> chain");
    assert_false(c.approximate);
}

static void test_errors_grade_diameter(void **state)
{
    (void)state;
    hf_component c;
    hf_component_init(&c, HF_COMP_STUDLESS_CHAIN);
    c.diameter = 0.076;
    refuse(&c, SEAWATER,
           "a studless chain needs a grade: R3, R3S, R4, R4S, R5 (offshore) and "
           "1, 2, 3 (ship anchor chain)");
    c.grade = (hf_chain_grade)42;
    refuse(&c, SEAWATER, "unknown chain grade 42");
    hf_component_init(&c, HF_COMP_POLYESTER);
    c.diameter = 0.16;
    c.grade = HF_GRADE_R4;
    refuse(&c, SEAWATER, "grade R4 applies to chain only, not to a polyester rope");

    hf_component_init(&c, HF_COMP_STUDLINK_CHAIN);
    c.grade = HF_GRADE_R3;
    refuse(&c, SEAWATER,
           "a studlink chain needs a diameter (or else mass or wet_weight, "
           "axial_stiffness and breaking_load)");
    c.diameter = 0.0049;
    refuse(&c, SEAWATER, "diameter 4.9 mm is outside 5 mm to 300 mm for a studlink chain");
    c.diameter = 0.3015;
    refuse(&c, SEAWATER, "diameter 301.5 mm is outside 5 mm to 300 mm");
    c.diameter = -0.076;
    refuse(&c, SEAWATER, "outside 5 mm to 300 mm");
    c.diameter = NAN;
    refuse(&c, SEAWATER, "outside");
    c.diameter = INFINITY;
    refuse(&c, SEAWATER, "outside");
    c.diameter = 0.005; /* the bounds themselves are accepted */
    hf_error err;
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
    c.diameter = 0.300;
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);

    hf_component_init(&c, HF_COMP_SIX_STRAND);
    c.diameter = 0.2035;
    refuse(&c, SEAWATER, "outside 5 mm to 200 mm for a six-strand wire rope");
    hf_component_init(&c, HF_COMP_NYLON);
    c.diameter = 0.0095;
    refuse(&c, SEAWATER, "outside 10 mm to 400 mm for a nylon rope");
    /* A diameter that is given is checked even when nothing needs it. */
    hf_component_init(&c, HF_COMP_SPIRAL_STRAND);
    hf_component_give(&c, HF_PROP_MASS, 20.5);
    hf_component_give(&c, HF_PROP_EA, 3.8e8);
    hf_component_give(&c, HF_PROP_MBL, 3.9e6);
    c.diameter = 0.5;
    refuse(&c, SEAWATER, "outside 5 mm to 200 mm");
    c.diameter = 0.0;
    assert_int_equal(hf_component_resolve(&c, SEAWATER, &err), HF_OK);
}

static void test_errors_values(void **state)
{
    (void)state;
    static const struct {
        hf_component_prop p;
        double v;
        const char *msg;
    } cases[] = {
        {HF_PROP_MASS, -115.5, "mass must be positive, got -115.5 kg/m"},
        {HF_PROP_MASS, 0.0, "mass must be positive, got 0 kg/m"},
        {HF_PROP_WET_WEIGHT, NAN, "wet_weight must be a finite number"},
        {HF_PROP_WET_WEIGHT, -980.25, "wet_weight must be positive, got -980.25 N/m"},
        {HF_PROP_EA, INFINITY, "axial_stiffness must be a finite number"},
        {HF_PROP_EA, -4.5e8, "axial_stiffness must be positive"},
        {HF_PROP_MBL, 0.0, "breaking_load must be positive, got 0 N"},
        {HF_PROP_MBL, -INFINITY, "breaking_load must be a finite number"},
        {HF_PROP_FRICTION, -0.25, "seabed_friction must be zero or positive, got -0.25"},
        {HF_PROP_FRICTION, NAN, "seabed_friction must be a finite number"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        for (int t = 0; t < HF_COMP_TYPE_COUNT; t++) {
            hf_component c;
            hf_component_init(&c, (hf_component_type)t);
            if (hf_component_is_chain((hf_component_type)t))
                c.grade = HF_GRADE_R4;
            c.diameter = 0.0635;
            hf_component_give(&c, cases[i].p, cases[i].v);
            refuse(&c, SEAWATER, cases[i].msg);
        }
    }
}

static void test_errors_water(void **state)
{
    (void)state;
    hf_component c;
    hf_component_init(&c, HF_COMP_STUDLESS_CHAIN);
    c.grade = HF_GRADE_R3;
    c.diameter = 0.076;
    refuse(&c, NAN, "water density must be a positive number");
    refuse(&c, 0.0, "water density must be a positive number");
    refuse(&c, -1025.0, "water density");
    refuse(&c, INFINITY, "water density");
    refuse(&c, 7850.0,
           "a studless chain (material density 7850 kg/m^3) does not sink in water "
           "of density 7850 kg/m^3; give both mass and wet_weight");
    /* Nylon barely sinks in sea water and floats in brine of 1200 kg/m^3. */
    hf_component_init(&c, HF_COMP_NYLON);
    c.diameter = 0.072;
    refuse(&c, 1200.0, "a nylon rope (material density 1140 kg/m^3) does not sink");
    /* The same with a given mass: the derived wet weight would be negative. */
    hf_component_give(&c, HF_PROP_MASS, 3.15);
    refuse(&c, 1200.0, "does not sink");
    /* With both given it is the user's call. */
    hf_component_give(&c, HF_PROP_WET_WEIGHT, 1.75);
    hf_error err;
    assert_int_equal(hf_component_resolve(&c, 1200.0, &err), HF_OK);

    hf_component_init(&c, (hf_component_type)77);
    refuse(&c, SEAWATER, "unknown component type 77");
}

static void test_names(void **state)
{
    (void)state;
    static const char *const types[] = {"studless_chain", "studlink_chain", "six_strand",
                                        "spiral_strand",  "polyester",      "nylon",
                                        "custom"};
    static const char *const grades[] = {"R3", "R3S", "R4", "R4S", "R5", "1", "2", "3"};
    static const char *const props[] = {"mass", "wet_weight", "axial_stiffness", "breaking_load",
                                        "seabed_friction"};
    hf_component_type t;
    hf_chain_grade g;
    assert_int_equal(sizeof types / sizeof types[0], HF_COMP_TYPE_COUNT);
    for (int i = 0; i < HF_COMP_TYPE_COUNT; i++) {
        assert_string_equal(hf_component_type_name((hf_component_type)i), types[i]);
        assert_int_equal(hf_component_type_lookup(types[i], &t), HF_OK);
        assert_int_equal(t, i);
        assert_non_null(strstr(hf_component_type_list(), types[i]));
    }
    for (int i = 0; i < 8; i++) {
        assert_string_equal(hf_component_grade_name((hf_chain_grade)(i + 1)), grades[i]);
        assert_int_equal(hf_component_grade_lookup(grades[i], &g), HF_OK);
        assert_int_equal(g, i + 1);
    }
    for (int i = 0; i < HF_PROP_COUNT; i++)
        assert_string_equal(hf_component_prop_name((hf_component_prop)i), props[i]);
    t = HF_COMP_NYLON;
    assert_int_equal(hf_component_type_lookup("studless", &t), HF_EINVAL);
    assert_int_equal(hf_component_type_lookup("Custom", &t), HF_EINVAL);
    assert_int_equal(hf_component_type_lookup("", &t), HF_EINVAL);
    assert_int_equal(hf_component_type_lookup(NULL, &t), HF_EINVAL);
    assert_int_equal(t, HF_COMP_NYLON);
    g = HF_GRADE_R5;
    assert_int_equal(hf_component_grade_lookup("R6", &g), HF_EINVAL);
    assert_int_equal(hf_component_grade_lookup("r3", &g), HF_EINVAL);
    assert_int_equal(hf_component_grade_lookup("none", &g), HF_EINVAL);
    assert_int_equal(hf_component_grade_lookup("4", &g), HF_EINVAL);
    assert_int_equal(hf_component_grade_lookup(NULL, &g), HF_EINVAL);
    assert_int_equal(g, HF_GRADE_R5);
    assert_string_equal(hf_component_type_name(HF_COMP_TYPE_COUNT), "unknown");
    assert_string_equal(hf_component_grade_name(HF_GRADE_COUNT), "unknown");
    assert_string_equal(hf_component_prop_name(HF_PROP_COUNT), "unknown");
    assert_true(hf_component_is_chain(HF_COMP_STUDLINK_CHAIN));
    assert_false(hf_component_is_chain(HF_COMP_SPIRAL_STRAND));

    double lo, hi;
    assert_int_equal(hf_component_diameter_range(HF_COMP_STUDLESS_CHAIN, &lo, &hi), HF_OK);
    assert_true(lo == 0.005 && hi == 0.300);
    assert_int_equal(hf_component_diameter_range(HF_COMP_CUSTOM, &lo, &hi), HF_OK);
    assert_true(lo == 0 && hi == 0);
    assert_int_equal(hf_component_diameter_range(HF_COMP_TYPE_COUNT, &lo, &hi), HF_EINVAL);

    /* init: nothing given, every source says so */
    hf_component c;
    hf_component_init(&c, HF_COMP_POLYESTER);
    assert_int_equal(c.given, 0);
    assert_int_equal(c.grade, HF_GRADE_NONE);
    assert_true(c.diameter == 0.0);
    for (int p = 0; p < HF_PROP_COUNT; p++)
        assert_string_equal(c.source[p], "not given");
}

/* Every resolved value of every type and grade is finite and positive
 * (friction >= 0) across the diameter range, and every source is set. */
static void test_all_finite(void **state)
{
    (void)state;
    for (int t = 0; t < HF_COMP_CUSTOM; t++) {
        double lo, hi;
        hf_component_diameter_range((hf_component_type)t, &lo, &hi);
        int g0 = hf_component_is_chain((hf_component_type)t) ? HF_GRADE_R3 : HF_GRADE_NONE;
        int g1 = hf_component_is_chain((hf_component_type)t) ? HF_GRADE_3 : HF_GRADE_NONE;
        for (int g = g0; g <= g1; g++) {
            for (int k = 0; k <= 8; k++) {
                double f = 0.001 + k * 0.12475; /* 0.001 .. 0.999 of the range */
                hf_component c =
                    make((hf_component_type)t, (hf_chain_grade)g, (lo + f * (hi - lo)) * 1e3);
                for (int p = 0; p < HF_PROP_COUNT; p++) {
                    assert_true(isfinite(c.value[p]) && c.value[p] > 0.0);
                    assert_non_null(c.source[p]);
                    assert_true(strncmp(c.source[p], "not given", 9) != 0);
                }
            }
        }
    }
}

/* ---- tension-strain curves (issue 15) ---- */

/* The default curves: polyester's tangent stiffness T / (d strain) stays in
 * the common-practice range EA = 12-30 x MBL (load dependent; open textbook
 * practice, REFERENCE section 3) over 0 <= T/MBL <= 1 and stiffens with load;
 * nylon is far softer (from memory: about 3-7 x MBL).  Other types have none. */
static void test_strain_defaults(void **state)
{
    (void)state;
    static const struct {
        hf_component_type t;
        double lo, hi; /* tangent EA / MBL range */
    } want[] = {{HF_COMP_POLYESTER, 12.0, 30.0}, {HF_COMP_NYLON, 3.0, 8.0}};
    for (size_t k = 0; k < 2; k++) {
        double a[3];
        const char *src = NULL;
        assert_int_equal(hf_component_strain_default(want[k].t, a, &src), HF_OK);
        assert_non_null(strstr(src, "approximate: enter the manufacturer's data"));
        hf_error e;
        assert_int_equal(hf_component_strain_check(a, &e), HF_OK);
        for (int i = 0; i <= 100; i++) {
            double t = i / 100.0, slope = a[0] + 2 * a[1] * t + 3 * a[2] * t * t;
            double ea = 1.0 / slope; /* tangent EA in units of MBL */
            if (!(ea >= want[k].lo && ea <= want[k].hi))
                fail_msg("%s: tangent EA %.3g x MBL at t = %.2f outside %.0f-%.0f",
                         hf_component_type_name(want[k].t), ea, t, want[k].lo, want[k].hi);
        }
        assert_true(a[1] < 0); /* stiffening at low load */
    }
    double a[3] = {9, 9, 9};
    assert_int_equal(hf_component_strain_default(HF_COMP_STUDLESS_CHAIN, a, NULL), HF_EINVAL);
    assert_int_equal(hf_component_strain_default(HF_COMP_SIX_STRAND, a, NULL), HF_EINVAL);
    assert_true(a[0] == 9 && a[1] == 9 && a[2] == 9);
}

/* Curves that do not stretch more under more tension are refused, with the
 * smallest slope named; edge numbers too. */
static void test_strain_check(void **state)
{
    (void)state;
    static const double bad[][3] = {
        {-0.01, 0.05, 0.0},  /* shrinks at first */
        {0.0, 0.04, 0.0},    /* no stiffness limit at slack: slope 0 at t = 0 */
        {0.05, -0.05, 0.0},  /* slope 0.05 - 0.1 t < 0 past t = 0.5 */
        {0.10, -0.20, 0.08}, /* vertex t = 0.833: slope 0.1 - 0.333 + 0.167 = -0.067 */
        {0.6, 0.3, 0.2},     /* strain 1.1 at the MBL */
        {NAN, 0, 0},         {0.05, INFINITY, 0},
    };
    for (size_t k = 0; k < sizeof bad / sizeof bad[0]; k++) {
        hf_error e;
        hf_error_clear(&e);
        if (hf_component_strain_check(bad[k], &e) != HF_EINVAL)
            fail_msg("curve %zu [%g, %g, %g] accepted", k, bad[k][0], bad[k][1], bad[k][2]);
        assert_non_null(strstr(e.text, "strain"));
    }
    static const double good[][3] = {{0.0312, 0, 0}, {0.08, -0.06, 0.025}, {0.02, 0.01, 0.003}};
    for (size_t k = 0; k < 3; k++)
        assert_int_equal(hf_component_strain_check(good[k], NULL), HF_OK);
}

/* The case key: `strain: default` or [a1, a2, a3]; bad values at their
 * file:line:col.  The model's line sections get the curve. */
static const char strain_case[] = "site: {depth: 55 m}\n"
                                  "components:\n"
                                  "  rope: {type: %s, diameter: 96 mm, strain: %s}\n"
                                  "lines:\n"
                                  "  - {name: a, anchor: [420 m, 0 m], fairlead: [0 m, 0 m, -6 m], "
                                  "sections: [{component: rope, length: 450 m}]}\n";

static hf_status strain_load(const char *type, const char *strain, hf_model *m, hf_error *e)
{
    char text[1024];
    int n = snprintf(text, sizeof text, strain_case, type, strain);
    hf_model_init(m);
    return hf_case_load_buffer(text, (size_t)n, "rope.yaml", m, e);
}

static void test_strain_case_key(void **state)
{
    (void)state;
    static const struct {
        const char *type, *strain, *text;
    } bad[] = {
        {"six_strand", "default", "components.rope.strain: expected [a1, a2, a3]"},
        {"polyester", "[0.08, -0.06]", "components.rope.strain: expected a tension-strain"},
        {"polyester", "[0.05, -0.05, 0]", "strain: expected a curve whose strain grows"},
        {"polyester", "[0.05, 1 m, 0]", "components.rope.strain[1]"},
        {"polyester", "linear", "components.rope.strain: expected a tension-strain"},
    };
    for (size_t k = 0; k < sizeof bad / sizeof bad[0]; k++) {
        hf_model m;
        hf_error e;
        hf_error_clear(&e);
        hf_status st = strain_load(bad[k].type, bad[k].strain, &m, &e);
        if (st == HF_OK || !strstr(e.text, bad[k].text) || strncmp(e.text, "rope.yaml:3:", 12))
            fail_msg("%s strain %s: status %d \"%s\", expected \"%s\"", bad[k].type, bad[k].strain,
                     (int)st, e.text, bad[k].text);
        hf_model_free(&m);
    }
    /* a valid curve reaches the line's sections, or the line solver refuses
     * it as unsupported (until it takes strain laws) - never as bad input */
    hf_model m;
    hf_error e;
    hf_error_clear(&e);
    hf_status st = strain_load("nylon", "default", &m, &e);
    if (st == HF_OK) {
        double a[3];
        assert_int_equal(hf_component_strain_default(HF_COMP_NYLON, a, NULL), HF_OK);
        assert_memory_equal(m.lines[0].line.sec[0].strain, a, sizeof a);
        assert_true(m.components[0].comp.approximate);
    } else {
        assert_int_equal(st, HF_EUNSUPPORTED);
        assert_non_null(strstr(e.text, "load-dependent stretch"));
    }
    hf_model_free(&m);
    /* without the key nothing changes: linear, no curve */
    assert_int_equal(strain_load("polyester", "[0.05, 0, 0]", &m, &e) == HF_OK ||
                         strstr(e.text, "load-dependent stretch") != NULL,
                     1);
    hf_model_free(&m);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_chain_mbl_offshore),
        cmocka_unit_test(test_chain_mbl_ship),
        cmocka_unit_test(test_chain_ea),
        cmocka_unit_test(test_chain_weight),
        cmocka_unit_test(test_wire),
        cmocka_unit_test(test_fibre),
        cmocka_unit_test(test_custom),
        cmocka_unit_test(test_override),
        cmocka_unit_test(test_reresolve),
        cmocka_unit_test(test_errors_grade_diameter),
        cmocka_unit_test(test_errors_values),
        cmocka_unit_test(test_errors_water),
        cmocka_unit_test(test_names),
        cmocka_unit_test(test_all_finite),
        cmocka_unit_test(test_strain_defaults),
        cmocka_unit_test(test_strain_check),
        cmocka_unit_test(test_strain_case_key),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
