/* test_spectrum.c - JONSWAP spectrum: normalisation, peak, moments, energy
 * bands and refusals, against closed forms of the Pierson-Moskowitz
 * spectrum and published JONSWAP properties. */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <string.h>
#include <cmocka.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_sf_gamma.h>
#include "holdfast/spectrum.h"

static gsl_integration_workspace *ws;

static hf_spectrum make(double hs, double tp, double gamma)
{
    hf_spectrum s;
    hf_error e;
    hf_error_clear(&e);
    hf_status st = hf_spectrum_jonswap_init(&s, hs, tp, gamma, ws, &e);
    if (st != HF_OK)
        fail_msg("Hs %g Tp %g gamma %g: %s", hs, tp, gamma, e.text);
    return s;
}

/* Zeroth moment by the test's own composite Simpson rule in u = ln w (an
 * integration independent of the library's GSL quadrature). */
static double simpson_m0(const hf_spectrum *s)
{
    const int n = 200000; /* even */
    double a = log(0.05 * s->wp), b = log(400.0 * s->wp), h = (b - a) / n, sum = 0.0;
    for (int i = 0; i <= n; i++) {
        double u = a + i * h, w = exp(u);
        double f = hf_spectrum_eval(s, w) * w; /* dw = w du */
        sum += f * (i == 0 || i == n ? 1.0 : (i % 2 ? 4.0 : 2.0));
    }
    /* tail above 400 wp: 5/4 (wp/w)^4 m0 bound ~ 5e-11 m0, far below the tolerance */
    return sum * h / 3.0;
}

/* m0 = Hs^2/16: the definition of Hs as 4 sqrt(m0) (DNV-RP-C205 sec. 3.5.5). */
static void test_m0(void **state)
{
    (void)state;
    const double cases[][3] = {{2.385, 9.37, 1.0},
                               {4.71, 11.3, 3.3},
                               {7.13, 13.9, 6.85},
                               {0.613, 4.27, 2.17},
                               {13.2, 16.8, 1.43}};
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        hf_spectrum s = make(cases[i][0], cases[i][1], cases[i][2]);
        double want = cases[i][0] * cases[i][0] / 16.0, m0 = -1.0;
        hf_error e;
        assert_int_equal(hf_spectrum_moment(&s, 0, ws, &m0, &e), HF_OK);
        assert_true(fabs(m0 - want) <= 1e-9 * want);
        double mine = simpson_m0(&s);
        if (!(fabs(mine - want) <= 1e-6 * want))
            fail_msg("case %zu: Simpson m0 %.12g, want Hs^2/16 = %.12g", i, mine, want);
    }
}

/* The peak lies at wp = 2 pi / Tp: d/dw of w^-5 exp(-5/4 (wp/w)^4) vanishes
 * at w = wp, and the peak factor gamma^r is largest there (r = 1). */
static void test_peak(void **state)
{
    (void)state;
    const double g[] = {1.0, 2.17, 3.3, 7.0};
    for (size_t i = 0; i < 4; i++) {
        hf_spectrum s = make(3.17, 10.45, g[i]);
        double best = 0.0, wbest = 0.0, wp = 2.0 * M_PI / 10.45;
        for (int j = 0; j <= 200000; j++) {
            double w = wp * (0.5 + j * 1e-5), v = hf_spectrum_eval(&s, w);
            if (v > best) {
                best = v;
                wbest = w;
            }
        }
        if (!(fabs(wbest - wp) <= 2e-5 * wp))
            fail_msg("gamma %g: peak at %.8g rad/s, want %.8g", g[i], wbest, wp);
        assert_true(fabs(s.wp - wp) <= 1e-15 * wp);
    }
}

/* gamma = 1 is the Pierson-Moskowitz spectrum in its Hs, Tp form
 * (DNV-RP-C205 sec. 3.5.5): A = 1 exactly, S matches the closed form. */
static void test_pierson_moskowitz(void **state)
{
    (void)state;
    double hs = 5.83, tp = 12.71, wp = 2.0 * M_PI / tp;
    hf_spectrum s = make(hs, tp, 1.0);
    assert_true(fabs(s.scale - 1.0) <= 1e-9);
    assert_true(fabs(s.scale_closed - 1.0) <= 1e-15);
    const double w[] = {0.21, 0.38, wp, 0.731, 1.17, 2.93};
    for (size_t i = 0; i < 6; i++) {
        double pm =
            5.0 / 16.0 * hs * hs * pow(wp, 4) * pow(w[i], -5) * exp(-1.25 * pow(wp / w[i], 4));
        assert_true(fabs(hf_spectrum_eval(&s, w[i]) - pm) <= 1e-9 * pm + 1e-300);
    }
}

/* Closed-form normalising factor 1 - 0.287 ln gamma (DNV-RP-C205 sec. 3.5.5)
 * against the numerical one, gamma 1..7: "within about 1 %" (issue 14).
 * Measured here: within 0.33 % for gamma <= 5.5, 0.69 % at 6, 1.18 % at 6.5
 * and 1.75 % at 7 (the closed form is a fit that drifts low at the top of
 * its range), so the check is 1 % up to gamma 6 and 2 % above. */
static void test_closed_form_factor(void **state)
{
    (void)state;
    double worst = 0.0;
    for (double g = 1.0; g <= 7.0001; g += 0.25) {
        hf_spectrum s = make(4.4, 10.9, g);
        double rel = fabs(s.scale_closed / s.scale - 1.0);
        worst = fmax(worst, rel);
        if (!(rel <= (g <= 6.0 ? 0.01 : 0.02)))
            fail_msg("gamma %g: closed %.6f numerical %.6f (%.3f %%)", g, s.scale_closed, s.scale,
                     100.0 * rel);
    }
    print_message("closed-form factor: worst relative difference %.3f %% over gamma 1..7\n",
                  100.0 * worst);
}

/* Periods of the Pierson-Moskowitz spectrum from its moments (derived here
 * by the substitution u = 5/4 (wp/w)^4, which gives
 * m_n = (Hs^2/16) (5/4 wp^4)^(n/4) Gamma(1 - n/4)):
 * T_z = 2 pi sqrt(m0/m2) = Tp / (5 pi / 4)^(1/4) = 0.70941 Tp,
 * T_1 = 2 pi m0/m1 = Tp / ((5/4)^(1/4) Gamma(3/4)) = 0.77178 Tp.
 * For JONSWAP gamma 3.3, DNV-RP-C205 (sec. 3.5.5) gives the fit
 * T_z/Tp = 0.6673 + 0.05037 g - 0.006230 g^2 + 0.0003341 g^3 (from memory). */
static void test_periods(void **state)
{
    (void)state;
    hf_error e;
    double tp = 8.93, m0, m1, m2, mm1;
    hf_spectrum s = make(2.71, tp, 1.0);
    assert_int_equal(hf_spectrum_moment(&s, 0, ws, &m0, &e), HF_OK);
    assert_int_equal(hf_spectrum_moment(&s, 1, ws, &m1, &e), HF_OK);
    assert_int_equal(hf_spectrum_moment(&s, 2, ws, &m2, &e), HF_OK);
    assert_int_equal(hf_spectrum_moment(&s, -1, ws, &mm1, &e), HF_OK);
    double tz = 2.0 * M_PI * sqrt(m0 / m2), t1 = 2.0 * M_PI * m0 / m1;
    assert_true(fabs(tz / tp - pow(1.25 * M_PI, -0.25)) <= 1e-8);
    assert_true(fabs(t1 / tp - 1.0 / (pow(1.25, 0.25) * gsl_sf_gamma(0.75))) <= 1e-8);
    /* m_-1 = (Hs^2/16) (5/4 wp^4)^(-1/4) Gamma(5/4), same substitution */
    double want = m0 * pow(1.25, -0.25) / s.wp * gsl_sf_gamma(1.25);
    assert_true(fabs(mm1 - want) <= 1e-8 * want);

    double g = 3.3;
    s = make(2.71, tp, g);
    assert_int_equal(hf_spectrum_moment(&s, 0, ws, &m0, &e), HF_OK);
    assert_int_equal(hf_spectrum_moment(&s, 2, ws, &m2, &e), HF_OK);
    double fit = 0.6673 + 0.05037 * g - 0.006230 * g * g + 0.0003341 * g * g * g;
    double ratio = 2.0 * M_PI * sqrt(m0 / m2) / tp;
    if (!(fabs(ratio / fit - 1.0) <= 0.005))
        fail_msg("gamma 3.3: Tz/Tp %.5f, DNV fit %.5f", ratio, fit);
}

/* Energy outside a band: the Pierson-Moskowitz distribution function is
 * F(w) = exp(-5/4 (wp/w)^4) (integral of the closed form), so the fraction
 * outside [lo, hi] is F(lo) + 1 - F(hi). */
static void test_outside(void **state)
{
    (void)state;
    hf_error e;
    double tp = 11.7, wp = 2.0 * M_PI / tp, frac = -1.0;
    hf_spectrum s = make(3.9, tp, 1.0);
    const double band[][2] = {{0.3, 2.5}, {0.45, 1.1}, {0.0, 4.0}, {0.6, INFINITY}, {0.5, 0.5}};
    for (size_t i = 0; i < 5; i++) {
        double lo = band[i][0], hi = band[i][1];
        double want =
            exp(-1.25 * pow(wp / lo, 4)) + 1.0 - (isinf(hi) ? 1.0 : exp(-1.25 * pow(wp / hi, 4)));
        assert_int_equal(hf_spectrum_outside(&s, lo, hi, ws, &frac, &e), HF_OK);
        if (!(fabs(frac - want) <= 1e-9))
            fail_msg("band [%g, %g]: %.12g, want %.12g", lo, hi, frac, want);
    }
    assert_int_equal(hf_spectrum_outside(&s, 1.0, 0.5, ws, &frac, &e), HF_EINVAL);
    assert_int_equal(hf_spectrum_outside(&s, -0.1, 0.5, ws, &frac, &e), HF_EINVAL);
    assert_int_equal(hf_spectrum_outside(&s, NAN, 0.5, ws, &frac, &e), HF_EINVAL);
    /* the band helper never gives a band holding less than 1 - eps */
    /* eps above ~1e-8: the fraction is 1 - (band integral)/m0, known to the
     * quadrature tolerance HF_SPECTRUM_EPSREL = 1e-10 only */
    const double gs[] = {1.0, 3.3, 7.0}, eps[] = {1e-3, 1e-5, 1e-7};
    for (size_t i = 0; i < 3; i++)
        for (size_t j = 0; j < 3; j++) {
            hf_spectrum t = make(3.9, tp, gs[i]);
            double lo, hi;
            hf_spectrum_band(&t, eps[j], &lo, &hi);
            assert_int_equal(hf_spectrum_outside(&t, lo, hi, ws, &frac, &e), HF_OK);
            if (!(frac <= eps[j] && frac >= 0.05 * eps[j]))
                fail_msg("gamma %g eps %g: band [%g, %g] leaves %g", gs[i], eps[j], lo, hi, frac);
        }
}

static void bad(double hs, double tp, double gamma, const char *part)
{
    hf_spectrum s = {.hs = -7.0};
    hf_error e;
    hf_error_clear(&e);
    hf_status st = hf_spectrum_jonswap_init(&s, hs, tp, gamma, ws, &e);
    if (st != HF_EINVAL)
        fail_msg("Hs %g Tp %g gamma %g accepted", hs, tp, gamma);
    assert_true(s.hs == -7.0);
    if (!strstr(e.text, part))
        fail_msg("message \"%s\" lacks \"%s\"", e.text, part);
}

static void test_refusals(void **state)
{
    (void)state;
    bad(0.0, 9.0, 3.3, "waves.hs");
    bad(-2.5, 9.0, 3.3, "waves.hs");
    bad(NAN, 9.0, 3.3, "waves.hs");
    bad(INFINITY, 9.0, 3.3, "waves.hs");
    bad(-1e-320, 9.0, 3.3, "waves.hs"); /* negative subnormal */
    bad(2.5, 0.0, 3.3, "waves.tp");
    bad(2.5, -9.0, 3.3, "waves.tp");
    bad(2.5, NAN, 3.3, "waves.tp");
    bad(2.5, 9.0, 0.99, "waves.gamma");
    bad(2.5, 9.0, 10.5, "waves.gamma");
    bad(2.5, 9.0, NAN, "waves.gamma");
    /* Hs 6 m at Tp 5 s: Lp = g Tp^2 / (2 pi) = 39.0 m, Hs/Lp = 0.154 > 1/7 */
    bad(6.0, 5.0, 3.3, "breaking");
    hf_spectrum s = make(5.4, 5.0, 3.3); /* Hs/Lp = 0.138: allowed */
    hf_error e;
    double m;
    assert_int_equal(hf_spectrum_moment(&s, 4, ws, &m, &e), HF_EINVAL);
    assert_int_equal(hf_spectrum_moment(&s, -3, ws, &m, &e), HF_EINVAL);
    assert_int_equal(hf_spectrum_jonswap_init(&s, 2.0, 9.0, 3.3, NULL, &e), HF_EINVAL);
}

/* Edge frequencies: 0, negative, subnormal, huge, NaN-free. */
static void test_eval_edges(void **state)
{
    (void)state;
    hf_spectrum s = make(2.385, 7.93, 3.3);
    const double w[] = {0.0, -1.3, 4.9e-324, 1e-300, 1e-3, 1e300, INFINITY};
    for (size_t i = 0; i < 7; i++) {
        double v = hf_spectrum_eval(&s, w[i]);
        assert_true(v >= 0.0 && isfinite(v));
    }
    assert_true(hf_spectrum_eval(&s, 0.0) == 0.0);
    assert_true(hf_spectrum_eval(&s, -1.3) == 0.0);
    assert_true(hf_spectrum_eval(&s, 1e-3) == 0.0);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_m0),
        cmocka_unit_test(test_peak),
        cmocka_unit_test(test_pierson_moskowitz),
        cmocka_unit_test(test_closed_form_factor),
        cmocka_unit_test(test_periods),
        cmocka_unit_test(test_outside),
        cmocka_unit_test(test_refusals),
        cmocka_unit_test(test_eval_edges),
    };
    hf_gsl_handler_install();
    ws = gsl_integration_workspace_alloc(HF_SPECTRUM_LIMIT);
    int rc = cmocka_run_group_tests(tests, NULL, NULL);
    gsl_integration_workspace_free(ws);
    return rc;
}
