/* test_units.c - unit parsing: every unit, spacing, exponents, signs, bad input. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>
#include <cmocka.h>
#include "holdfast/units.h"

/* Parses text as dimension d and checks the SI value to a relative tolerance. */
static void ok(const char *text, hf_dim d, double want)
{
    hf_error err;
    double v = -123.456;
    hf_error_clear(&err);
    hf_status st = hf_units_parse(text, d, &v, &err);
    if (st != HF_OK)
        fail_msg("\"%s\" as %s: %s", text, hf_dim_name(d), err.text);
    if (!(fabs(v - want) <= 1e-14 * fabs(want) + 1e-300))
        fail_msg("\"%s\": got %.17g, want %.17g", text, v, want);
}

/* Parses text as d, expects HF_EINVAL, out untouched, and `part` in the message. */
static void bad(const char *text, hf_dim d, const char *part)
{
    hf_error err;
    double v = 7.123;
    hf_error_clear(&err);
    hf_status st = hf_units_parse(text, d, &v, &err);
    if (st != HF_EINVAL)
        fail_msg("\"%s\" as %s: accepted (%.17g)", text ? text : "(null)", hf_dim_name(d), v);
    assert_true(v == 7.123);
    assert_int_equal(err.status, HF_EINVAL);
    if (part && !strstr(err.text, part))
        fail_msg("\"%s\": message \"%s\" lacks \"%s\"", text ? text : "(null)", err.text, part);
}

/* Lengths.  Exact factors: NIST SP 811 (2008), Appendix B.8: ft = 0.3048 m,
 * in = 0.0254 m, nautical mile = 1852 m. */
static void test_length(void **state)
{
    (void)state;
    ok("76 mm", HF_DIM_LENGTH, 0.076);
    ok("76mm", HF_DIM_LENGTH, 0.076);
    ok("  76 \t mm  ", HF_DIM_LENGTH, 0.076);
    ok("2.385 cm", HF_DIM_LENGTH, 0.02385);
    ok("84.7 m", HF_DIM_LENGTH, 84.7);
    ok("84.7", HF_DIM_LENGTH, 84.7); /* plain number is SI */
    ok("-9.375 m", HF_DIM_LENGTH, -9.375);
    ok("+12.5 m", HF_DIM_LENGTH, 12.5);
    ok("3.17 km", HF_DIM_LENGTH, 3170.0);
    ok("12.7 ft", HF_DIM_LENGTH, 3.87096); /* 12.7 x 0.3048, NIST SP 811 */
    ok("3.5 in", HF_DIM_LENGTH, 0.0889);   /* 3.5 x 0.0254, NIST SP 811 */
    ok("1.25 nmi", HF_DIM_LENGTH, 2315.0); /* 1.25 x 1852, NIST SP 811 */
    ok(".5 m", HF_DIM_LENGTH, 0.5);
    ok("5. m", HF_DIM_LENGTH, 5.0);
    ok("-.25m", HF_DIM_LENGTH, -0.25);
    ok("0 m", HF_DIM_LENGTH, 0.0);
    ok("-0 m", HF_DIM_LENGTH, 0.0);
    ok("450 m\n", HF_DIM_LENGTH, 450.0);
}

/* Exponents in the number. */
static void test_exponent(void **state)
{
    (void)state;
    ok("1.5e3 kN", HF_DIM_FORCE, 1.5e6);
    ok("1.5E3kN", HF_DIM_FORCE, 1.5e6);
    ok("3.25e-1 MN", HF_DIM_FORCE, 3.25e5);
    ok("7.5e+2 mm", HF_DIM_LENGTH, 0.75);
    ok("-2.5e2 m", HF_DIM_LENGTH, -250.0);
    ok("1e308", HF_DIM_LENGTH, 1e308);
    ok("4.9e-324 m", HF_DIM_LENGTH, 4.9e-324); /* subnormal is finite: accepted */
}

/* Forces.  NIST SP 811 (2008) B.8/B.9 with exact definitions: kgf = 9.80665 N,
 * tf = 9806.65 N, lbf = 0.45359237 kg x 9.80665 m/s^2 = 4.4482216152605 N,
 * kip = 1000 lbf. */
static void test_force(void **state)
{
    (void)state;
    ok("2.385 N", HF_DIM_FORCE, 2.385);
    ok("80 kN", HF_DIM_FORCE, 80e3);
    ok("3.9 MN", HF_DIM_FORCE, 3.9e6);
    ok("1000 kgf", HF_DIM_FORCE, 9806.65);
    ok("12.5 tf", HF_DIM_FORCE, 122583.125);
    ok("1 lbf", HF_DIM_FORCE, 4.4482216152605);
    ok("7.3 kip", HF_DIM_FORCE, 32472.017791401646);
    ok("1500", HF_DIM_FORCE, 1500.0);
}

/* Masses: t = 1000 kg; lb = 0.45359237 kg exact (NIST SP 811 (2008) B.8). */
static void test_mass(void **state)
{
    (void)state;
    ok("12.5 t", HF_DIM_MASS, 12500.0);
    ok("3.7 kg", HF_DIM_MASS, 3.7);
    ok("2.2 lb", HF_DIM_MASS, 0.997903214);
    ok("115 kg/m", HF_DIM_MASS_PER_LENGTH, 115.0);
    ok("0.115 t/m", HF_DIM_MASS_PER_LENGTH, 115.0);
    ok("1.25 lb/ft", HF_DIM_MASS_PER_LENGTH, 1.8602049294619425); /* 1.25 x 0.45359237 / 0.3048 */
    ok("115 kg / m", HF_DIM_MASS_PER_LENGTH, 115.0);
}

static void test_force_per_length(void **state)
{
    (void)state;
    ok("980 N/m", HF_DIM_FORCE_PER_LENGTH, 980.0);
    ok("1.1 kN/m", HF_DIM_FORCE_PER_LENGTH, 1100.0);
    ok("0.0125 MN/m", HF_DIM_FORCE_PER_LENGTH, 12500.0);
    ok("99.5 kgf/m", HF_DIM_FORCE_PER_LENGTH, 99.5 * 9.80665);
    ok("0.35 tf/m", HF_DIM_FORCE_PER_LENGTH, 3432.3275);
    ok("20 lbf/ft", HF_DIM_FORCE_PER_LENGTH, 20 * 4.4482216152605 / 0.3048);
    ok("2 kip/ft", HF_DIM_FORCE_PER_LENGTH, 2000 * 4.4482216152605 / 0.3048);
    ok("1.1kN / m", HF_DIM_FORCE_PER_LENGTH, 1100.0);
}

/* Pressures: bar = 1e5 Pa exact; psi = lbf/in^2 = 6894.757293168361 Pa
 * (NIST SP 811 (2008) B.8 lists 6.894 757 E+03). */
static void test_pressure(void **state)
{
    (void)state;
    ok("101325 Pa", HF_DIM_PRESSURE, 101325.0);
    ok("250 kPa", HF_DIM_PRESSURE, 2.5e5);
    ok("355 MPa", HF_DIM_PRESSURE, 3.55e8);
    ok("206 GPa", HF_DIM_PRESSURE, 2.06e11);
    ok("355 N/mm^2", HF_DIM_PRESSURE, 3.55e8);
    ok("355 N/mm2", HF_DIM_PRESSURE, 3.55e8);
    ok("1.75 bar", HF_DIM_PRESSURE, 1.75e5);
    ok("1 psi", HF_DIM_PRESSURE, 6894.757293168361);
    ok("36 ksi", HF_DIM_PRESSURE, 36 * 6894757.293168361);
}

/* Angles: a plain number means degrees; deg = pi/180 rad. */
static void test_angle(void **state)
{
    (void)state;
    ok("12.5 deg", HF_DIM_ANGLE, 0.2181661564992912);
    ok("12.5", HF_DIM_ANGLE, 0.2181661564992912);
    ok("12.5\xc2\xb0", HF_DIM_ANGLE, 0.2181661564992912);
    ok("-37.25 deg", HF_DIM_ANGLE, -37.25 * M_PI / 180.0);
    ok("0.7525 rad", HF_DIM_ANGLE, 0.7525);
    ok("0", HF_DIM_ANGLE, 0.0);
}

/* Exact reduction of angles by whole turns (issue 12 item 4).  References:
 * 1e15 = 360 x 2,777,777,777,777 + 280 and 1e20 = 2^20 5^20 is 0 mod 40 and
 * 1 mod 9, so 280 mod 360 (integer arithmetic by hand); the same angle must
 * give the same radians bit for bit. */
static void test_angle_reduction(void **state)
{
    (void)state;
    double r280 = hf_units_deg_to_rad(280.0);
    assert_true(r280 == 280.0 * (M_PI / 180.0)); /* (-360, 360): as before, bit for bit */
    assert_true(hf_units_deg_to_rad(1e15) == r280);
    assert_true(hf_units_deg_to_rad(1e20) == r280);
    assert_true(hf_units_deg_to_rad(280.0 + 360.0 * 1e6) == r280);
    assert_true(hf_units_deg_to_rad(-1e15) == -r280);
    assert_true(hf_units_deg_to_rad(-37.25) == -37.25 * (M_PI / 180.0));
    assert_true(hf_units_deg_to_rad(359.999) == 359.999 * (M_PI / 180.0));
    assert_true(hf_units_deg_to_rad(720.0) == 0.0);
    /* the largest double is a whole number of turns plus some angle: finite, in range */
    double big = hf_units_deg_to_rad(1.7976931348623157e308);
    assert_true(isfinite(big) && fabs(big) < 2.0 * M_PI);
    assert_true(isnan(hf_units_deg_to_rad(INFINITY)));
    assert_true(isnan(hf_units_deg_to_rad(NAN)));
    /* the parser uses it for every spelling of degrees */
    double v = 0.0;
    hf_error e;
    const char *same[] = {"280", "1e15", "1e20 deg", "1e15\xc2\xb0", "280 deg"};
    for (size_t k = 0; k < sizeof same / sizeof same[0]; k++) {
        assert_int_equal(hf_units_parse(same[k], HF_DIM_ANGLE, &v, &e), HF_OK);
        if (v != r280)
            fail_msg("\"%s\": %.17g rad, want %.17g", same[k], v, r280);
    }
    assert_int_equal(hf_units_parse("1e308", HF_DIM_ANGLE, &v, &e), HF_OK);
    assert_true(isfinite(v) && fabs(v) < 2.0 * M_PI);
    /* radians: below one turn unchanged; larger ones reduced to the same direction */
    assert_int_equal(hf_units_parse("6.2 rad", HF_DIM_ANGLE, &v, &e), HF_OK);
    assert_true(v == 6.2);
    assert_int_equal(hf_units_parse("1e15 rad", HF_DIM_ANGLE, &v, &e), HF_OK);
    assert_true(v >= 0.0 && v < 2.0 * M_PI);
    assert_float_equal(sin(v), sin(1e15), 1e-12);
    assert_float_equal(cos(v), cos(1e15), 1e-12);
    assert_int_equal(hf_units_parse("-7 rad", HF_DIM_ANGLE, &v, &e), HF_OK);
    assert_true(v < 0.0 && v > -2.0 * M_PI);
    assert_float_equal(v, -7.0 + 2.0 * M_PI, 1e-14);
}

static void test_density_speed_area(void **state)
{
    (void)state;
    ok("1025 kg/m^3", HF_DIM_DENSITY, 1025.0);
    ok("1025 kg/m3", HF_DIM_DENSITY, 1025.0);
    ok("1025 kg/m\xc2\xb3", HF_DIM_DENSITY, 1025.0); /* superscript three */
    ok("1.0275 t/m^3", HF_DIM_DENSITY, 1027.5);
    ok("1.0275 g/cm^3", HF_DIM_DENSITY, 1027.5);
    ok("64 lb/ft^3", HF_DIM_DENSITY, 64 * 0.45359237 / (0.3048 * 0.3048 * 0.3048));
    ok("1020", HF_DIM_DENSITY, 1020.0);
    ok("2.35 m/s", HF_DIM_SPEED, 2.35);
    ok("7.2 km/h", HF_DIM_SPEED, 2.0);
    ok("3.5 ft/s", HF_DIM_SPEED, 1.0668);
    /* knot = 1852/3600 m/s exact, NIST SP 811 (2008) B.8 */
    ok("2.5 kn", HF_DIM_SPEED, 2.5 * 1852.0 / 3600.0);
    ok("1 knot", HF_DIM_SPEED, 0.51444444444444444);
    ok("35 knots", HF_DIM_SPEED, 35 * 1852.0 / 3600.0);
    ok("850 m^2", HF_DIM_AREA, 850.0);
    ok("850 m2", HF_DIM_AREA, 850.0);
    ok("850 m\xc2\xb2", HF_DIM_AREA, 850.0);
    ok("1250 cm^2", HF_DIM_AREA, 0.125);
    ok("4537 mm2", HF_DIM_AREA, 4.537e-3);
    ok("12.5 ft^2", HF_DIM_AREA, 12.5 * 0.09290304);
}

static void test_moment(void **state)
{
    (void)state;
    ok("35 MN m", HF_DIM_MOMENT, 35e6);
    ok("35 MN*m", HF_DIM_MOMENT, 35e6);
    ok("35 MN * m", HF_DIM_MOMENT, 35e6);
    ok("35 MN\xc2\xb7m", HF_DIM_MOMENT, 35e6); /* middle dot */
    ok("35MNm", HF_DIM_MOMENT, 35e6);
    ok("12.75 kN m", HF_DIM_MOMENT, 12750.0);
    ok("12.75 kNm", HF_DIM_MOMENT, 12750.0);
    ok("12.75 kN*m", HF_DIM_MOMENT, 12750.0);
    ok("840 N m", HF_DIM_MOMENT, 840.0);
    ok("840 Nm", HF_DIM_MOMENT, 840.0);
    ok("840 N*m", HF_DIM_MOMENT, 840.0);
    ok("3.5 tf m", HF_DIM_MOMENT, 34323.275);
    ok("100 lbf ft", HF_DIM_MOMENT, 100 * 4.4482216152605 * 0.3048);
    ok("2.5 kip*ft", HF_DIM_MOMENT, 2500 * 4.4482216152605 * 0.3048);
}

static void test_dimensionless(void **state)
{
    (void)state;
    ok("0.85", HF_DIM_NONE, 0.85);
    ok("  -1.375e-2 ", HF_DIM_NONE, -0.01375);
    bad("0.85 m", HF_DIM_NONE, "expected a plain number without a unit, got \"0.85 m\" (a length)");
    bad("0.85 zz", HF_DIM_NONE, "expected a plain number without a unit");
    bad("abc", HF_DIM_NONE, "without a unit");
}

/* Exact messages the case loader shows after its file:line:col and key path. */
static void test_wrong_dimension(void **state)
{
    hf_error err;
    double v = 0;
    (void)state;
    assert_int_equal(hf_units_parse("3 kN", HF_DIM_LENGTH, &v, &err), HF_EINVAL);
    assert_string_equal(err.text, "expected a length, got \"3 kN\" (a force)");
    assert_int_equal(hf_units_parse("76 mm", HF_DIM_FORCE, &v, &err), HF_EINVAL);
    assert_string_equal(err.text, "expected a force, got \"76 mm\" (a length)");
    assert_int_equal(hf_units_parse("12 deg", HF_DIM_AREA, &v, &err), HF_EINVAL);
    assert_string_equal(err.text, "expected an area, got \"12 deg\" (an angle)");
    bad("1025 kg/m", HF_DIM_DENSITY, "expected a density, got \"1025 kg/m\" (a mass per length)");
    bad("1.1 kN/m", HF_DIM_MASS_PER_LENGTH, "(a force per length)");
    bad("5 t", HF_DIM_FORCE, "(a mass)");
    bad("206 GPa", HF_DIM_FORCE, "(a pressure)");
    bad("2 m/s", HF_DIM_LENGTH, "(a speed)");
    bad("5 m^2", HF_DIM_LENGTH, "(an area)");
    bad("5 kN m", HF_DIM_FORCE, "(a moment)");
    bad("1025 kg/m^3", HF_DIM_MASS, "(a density)");
    /* "kn" is the knot; written for a force it gets a hint. */
    bad("50 kn", HF_DIM_FORCE, "expected a force, got \"50 kn\" (a speed; did you mean kN?)");
}

static void test_unknown_units(void **state)
{
    (void)state;
    bad("3 kNN", HF_DIM_FORCE, "unknown unit \"kNN\" in \"3 kNN\" (a force takes N, kN, MN");
    bad("3 kNN", HF_DIM_FORCE, "did you mean kN?");
    bad("3 KN", HF_DIM_FORCE, "did you mean kN?");
    bad("3 mN", HF_DIM_FORCE, "did you mean MN?");
    bad("76 MM", HF_DIM_LENGTH, "did you mean mm?");
    bad("76 metres", HF_DIM_LENGTH, "unknown unit \"metres\"");
    bad("76 furlong", HF_DIM_LENGTH, "a length takes mm, cm, m, km, in, ft, nmi");
    bad("1025 kg/m^4", HF_DIM_DENSITY, "unknown unit");
    bad("1025 kg m^-3", HF_DIM_DENSITY, "unknown unit");
    bad("5 m**2", HF_DIM_AREA, "unknown unit");
    bad("5 N * * m", HF_DIM_MOMENT, "unknown unit");
    bad("12 degrees", HF_DIM_ANGLE, "an angle takes deg");
    bad("3 %", HF_DIM_NONE, NULL);
    bad("3 %", HF_DIM_LENGTH, "unknown unit \"%\"");
}

static void test_garbage(void **state)
{
    (void)state;
    bad("", HF_DIM_LENGTH, "expected a length, got an empty value");
    bad("   \t ", HF_DIM_FORCE, "got an empty value");
    bad(NULL, HF_DIM_FORCE, "got an empty value");
    bad("m", HF_DIM_LENGTH, "expected a length (a number and a unit such as \"76 mm\"), got \"m\"");
    bad("abc", HF_DIM_FORCE, "got \"abc\"");
    bad("-", HF_DIM_LENGTH, "got \"-\"");
    bad(".", HF_DIM_LENGTH, "got \".\"");
    bad("e5 m", HF_DIM_LENGTH, "got \"e5 m\"");
    bad("3 m x", HF_DIM_LENGTH, "unknown unit \"m x\"");
    bad("3 4 m", HF_DIM_LENGTH, "unknown unit");
    bad("3 m 4", HF_DIM_LENGTH, "unknown unit");
    bad("76 mm;", HF_DIM_LENGTH, "unknown unit");
    bad("0x1p4 m", HF_DIM_LENGTH, "unknown unit");
    bad("1,5 m", HF_DIM_LENGTH, "write decimals with a point");
    bad("3\x01m", HF_DIM_LENGTH, "\"3?m\"");
    bad("--3 m", HF_DIM_LENGTH, NULL);
    bad("1e m", HF_DIM_LENGTH, "unknown unit \"e m\"");
    /* A long value is shortened in the message. */
    bad("12.5 mmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmmm",
        HF_DIM_LENGTH, "...\"");
}

static void test_non_finite(void **state)
{
    (void)state;
    bad("nan", HF_DIM_LENGTH, "expected a finite length, got \"nan\"");
    bad("NaN m", HF_DIM_LENGTH, "finite");
    bad("-nan", HF_DIM_FORCE, "finite");
    bad("inf", HF_DIM_FORCE, "expected a finite force, got \"inf\"");
    bad("-inf kN", HF_DIM_FORCE, "finite");
    bad("Infinity", HF_DIM_NONE, "finite");
    bad("1e309", HF_DIM_LENGTH,
        "expected a finite length, got \"1e309\" (the number is out of range)");
    bad("-1e309 m", HF_DIM_LENGTH, "out of range");
    bad("1e309 mm", HF_DIM_LENGTH, "out of range");
    bad("2.5e99999 kN", HF_DIM_FORCE, "out of range");
    /* Finite number, but not in SI: 1e308 km = 1e311 m. */
    bad("1e308 km", HF_DIM_LENGTH, "out of range in SI units");
    bad("-9e307 MN", HF_DIM_FORCE, "out of range in SI units");
}

/* Every spelling hf_units_list announces parses as its own dimension, and
 * only as that one (no spelling belongs to two dimensions). */
static void test_lists(void **state)
{
    (void)state;
    int count = 0;
    for (int d = HF_DIM_LENGTH; d < HF_DIM_COUNT; d++) {
        const char *list = hf_units_list((hf_dim)d);
        char buf[256];
        assert_true(strlen(list) > 0 && strlen(list) < sizeof buf);
        strcpy(buf, list);
        for (char *tok = strtok(buf, ","); tok; tok = strtok(NULL, ",")) {
            char text[64];
            double v = 0;
            hf_error err;
            while (*tok == ' ')
                tok++;
            snprintf(text, sizeof text, "2.385 %s", tok);
            if (hf_units_parse(text, (hf_dim)d, &v, &err) != HF_OK)
                fail_msg("listed unit \"%s\": %s", text, err.text);
            assert_true(v > 0 && isfinite(v));
            for (int e = HF_DIM_NONE; e < HF_DIM_COUNT; e++)
                if (e != d)
                    assert_int_equal(hf_units_parse(text, (hf_dim)e, &v, &err), HF_EINVAL);
            count++;
        }
    }
    assert_true(count >= 50);
    assert_string_equal(hf_units_list(HF_DIM_NONE), "");
    assert_string_equal(hf_units_list(HF_DIM_COUNT), "");
}

static void test_names(void **state)
{
    (void)state;
    static const char *const want[][2] = {
        {"plain number", ""},
        {"length", "m"},
        {"force", "N"},
        {"mass", "kg"},
        {"mass per length", "kg/m"},
        {"force per length", "N/m"},
        {"pressure", "Pa"},
        {"angle", "rad"},
        {"density", "kg/m^3"},
        {"speed", "m/s"},
        {"area", "m^2"},
        {"moment", "N m"},
    };
    assert_int_equal(sizeof want / sizeof want[0], HF_DIM_COUNT);
    for (int d = 0; d < HF_DIM_COUNT; d++) {
        double v = 0;
        hf_error err;
        assert_string_equal(hf_dim_name((hf_dim)d), want[d][0]);
        assert_string_equal(hf_dim_si((hf_dim)d), want[d][1]);
        /* the SI symbol itself is an accepted spelling with factor 1 */
        if (d != HF_DIM_NONE) {
            char text[64];
            snprintf(text, sizeof text, "3.719 %s", want[d][1]);
            assert_int_equal(hf_units_parse(text, (hf_dim)d, &v, &err), HF_OK);
            assert_true(fabs(v - 3.719) < 1e-15);
        }
    }
    assert_string_equal(hf_dim_name(HF_DIM_COUNT), "unknown quantity");
    assert_string_equal(hf_dim_si((hf_dim)-1), "");
    bad("3 m", HF_DIM_COUNT, "internal");
}

/* err may be NULL: the status still tells. */
static void test_null_err(void **state)
{
    double v = 1.5;
    (void)state;
    assert_int_equal(hf_units_parse("3 kN", HF_DIM_LENGTH, &v, NULL), HF_EINVAL);
    assert_true(v == 1.5);
    assert_int_equal(hf_units_parse("3.25 m", HF_DIM_LENGTH, &v, NULL), HF_OK);
    assert_true(v == 3.25);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_length),
        cmocka_unit_test(test_exponent),
        cmocka_unit_test(test_force),
        cmocka_unit_test(test_mass),
        cmocka_unit_test(test_force_per_length),
        cmocka_unit_test(test_pressure),
        cmocka_unit_test(test_angle),
        cmocka_unit_test(test_angle_reduction),
        cmocka_unit_test(test_density_speed_area),
        cmocka_unit_test(test_moment),
        cmocka_unit_test(test_dimensionless),
        cmocka_unit_test(test_wrong_dimension),
        cmocka_unit_test(test_unknown_units),
        cmocka_unit_test(test_garbage),
        cmocka_unit_test(test_non_finite),
        cmocka_unit_test(test_lists),
        cmocka_unit_test(test_names),
        cmocka_unit_test(test_null_err),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
