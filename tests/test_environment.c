/* test_environment.c - environment numerics of the quasi-static design method:
 * mean loads, wave-frequency and slow-drift motions, the oscillator integral
 * against its closed form and against time-domain simulation (GSL random
 * numbers and odeiv2), statistics, the design offset and every refusal.
 * All hulls and tables here are invented (the fictional barge of
 * cases/barge.yaml, "Kestrel Deep 3"). */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <cmocka.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include <gsl/gsl_odeiv2.h>
#include <gsl/gsl_rng.h>
#include <gsl/gsl_sf_gamma.h>
#include "holdfast/alloc.h"
#include "holdfast/environment.h"
#include "support.h"

#define DEG (M_PI / 180.0)

static hf_env_workspace *ws;

/* ---- helpers ------------------------------------------------------------ */

/* A frequency table with the same three values everywhere, from 0.02 to
 * 60 rad/s (wide enough for any spectrum below), headings every 30 deg. */
static hf_table *flat(hf_table_kind k, double a, double b, double c)
{
    double fr[] = {0.02, 60.0}, hd[12], val[2 * 12 * 3];
    for (int j = 0; j < 12; j++)
        hd[j] = j * 30 * DEG;
    for (int i = 0; i < 2 * 12; i++) {
        val[3 * i] = a;
        val[3 * i + 1] = b;
        val[3 * i + 2] = c;
    }
    hf_table *t = NULL;
    hf_error e;
    if (hf_table_from_values(k, "flat", k == HF_TABLE_COEF ? 1 : 2, fr, 12, hd, val, &t, &e) !=
        HF_OK)
        fail_msg("%s", e.text);
    return t;
}

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

/* The fictional barge "Kestrel Deep 3" of cases/barge.yaml (120 m x 36 m)
 * with invented masses and the invented tables of tests/data/env. */
static void barge_hull(hf_env_hull *h)
{
    hf_env_hull_default(h);
    h->inertia[0] = 2.21e7 * 1.05; /* mass 22 100 t, surge added mass 5 % */
    h->inertia[1] = 2.21e7 * 1.62;
    h->inertia[2] = 2.21e7 * 1.62 * 36.0 * 36.0; /* radius of gyration 36 m */
    h->damping[0] = 0.06;
    h->damping[1] = 0.08;
    h->damping[2] = 0.07;
    h->wind_area = 612.0;
    h->current_area = 499.2;
    h->length = 120.0;
    h->water_density = 1025.0;
}

static hf_environment waves_env(double hs, double tp, double gamma, double dir)
{
    hf_environment e;
    hf_environment_default(&e);
    e.name = "storm-1";
    e.has_waves = 1;
    e.waves.hs = hs;
    e.waves.tp = tp;
    e.waves.gamma = gamma;
    e.waves.direction = dir;
    return e;
}

#define OK(call)                                                                                   \
    do {                                                                                           \
        hf_error e_;                                                                               \
        hf_error_clear(&e_);                                                                       \
        hf_status s_ = (call);                                                                     \
        if (s_ != HF_OK)                                                                           \
            fail_msg("%s: %s", #call, e_.text);                                                    \
    } while (0)
#define E_ (&e_)

static void rel_near(double got, double want, double tol, const char *what)
{
    if (!(fabs(got - want) <= tol * fabs(want)))
        fail_msg("%s: got %.12g, want %.12g (rel. tol %g)", what, got, want, tol);
}

/* ---- mean loads --------------------------------------------------------- */

/* F = 1/2 rho C A V^2 and M = 1/2 rho Cmz A L V^2 (issue 14's definition;
 * the classical drag form), rotated from hull to global axes. */
static void test_wind_current(void **state)
{
    (void)state;
    hf_env_hull h;
    barge_hull(&h);
    hf_table *w = load("tests/data/env/barge-wind.csv", HF_TABLE_COEF);
    hf_table *c = load("tests/data/env/barge-current.csv", HF_TABLE_COEF);
    h.wind = w;
    h.current = c;
    hf_environment e;
    hf_environment_default(&e);
    e.has_wind = e.has_current = 1;
    double yaw = 23.5 * DEG;
    e.wind = (hf_env_flow){27.4, yaw + 60 * DEG};     /* relative 60 deg: node 0.310,0.788,0.074 */
    e.current = (hf_env_flow){1.37, yaw - 150 * DEG}; /* relative 210 deg */
    hf_env_mean m;
    OK(hf_env_mean_load(&h, &e, yaw, ws, &m, E_));
    double qa = 0.5 * 1.225 * 27.4 * 27.4 * 612.0;
    rel_near(m.wind[0], qa * 0.310, 1e-12, "wind Fx");
    rel_near(m.wind[1], qa * 0.788, 1e-12, "wind Fy");
    rel_near(m.wind[2], qa * 120.0 * 0.074, 1e-12, "wind Mz");
    double qc = 0.5 * 1025.0 * 1.37 * 1.37 * 499.2;
    rel_near(m.current[0], qc * -0.416, 1e-12, "current Fx"); /* 210,-0.416,-0.415,0.055 */
    rel_near(m.current[1], qc * -0.415, 1e-12, "current Fy");
    rel_near(m.current[2], qc * 120.0 * 0.055, 1e-12, "current Mz");
    assert_true(m.drift[0] == 0.0 && m.drift[1] == 0.0 && m.drift[2] == 0.0);
    double fx = m.total_hull[0], fy = m.total_hull[1];
    rel_near(m.total_global[0], fx * cos(yaw) - fy * sin(yaw), 1e-12, "global Fx");
    rel_near(m.total_global[1], fx * sin(yaw) + fy * cos(yaw), 1e-12, "global Fy");
    rel_near(hypot(m.total_global[0], m.total_global[1]), hypot(fx, fy), 1e-12, "|F|");
    /* zero speed needs no table */
    h.wind = NULL;
    e.wind.speed = 0.0;
    OK(hf_env_mean_load(&h, &e, yaw, ws, &m, E_));
    assert_true(m.wind[0] == 0.0);
    hf_table_free(w);
    hf_table_free(c);
}

/* Mean drift with a constant coefficient D: 2 int S D dw = 2 D m0 = D Hs^2/8
 * (Faltinsen 1990, ch. 5: regular-wave drift D a^2 with a^2 -> 2 S dw). */
static void test_mean_drift(void **state)
{
    (void)state;
    hf_env_hull h;
    barge_hull(&h);
    hf_table *r = flat(HF_TABLE_RAO, 0.5, 0.5, 0.01);
    hf_table *d = flat(HF_TABLE_DRIFT, 38.7e3, -112.4e3, 1.93e6);
    h.raos = r;
    h.drift = d;
    const double g[] = {1.0, 3.3, 6.1};
    for (int i = 0; i < 3; i++) {
        hf_environment e = waves_env(4.37, 10.2, g[i], 71 * DEG);
        hf_env_mean m;
        OK(hf_env_mean_load(&h, &e, 12 * DEG, ws, &m, E_));
        double hs2 = 4.37 * 4.37 / 8.0;
        rel_near(m.drift[0], 38.7e3 * hs2, 1e-7, "drift surge");
        rel_near(m.drift[1], -112.4e3 * hs2, 1e-7, "drift sway");
        rel_near(m.drift[2], 1.93e6 * hs2, 1e-7, "drift yaw");
    }
    hf_table_free(r);
    hf_table_free(d);
}

/* ---- wave-frequency motion ------------------------------------------------ */

/* RAO 1 m/m in surge at every frequency: sigma^2 = m0 = Hs^2/16, so the
 * significant single amplitude 2 sigma = Hs/2 (issue 14), T_z = the waves'
 * T_z (Pierson-Moskowitz: Tp / (5 pi/4)^(1/4), derived in test_spectrum.c);
 * a yaw RAO of r deg/m gives sigma = r (pi/180) Hs/4 rad. */
static void test_wave_frequency(void **state)
{
    (void)state;
    hf_env_hull h;
    barge_hull(&h);
    hf_table *r = flat(HF_TABLE_RAO, 1.0, 0.0, 0.85 * DEG);
    hf_table *d = flat(HF_TABLE_DRIFT, 1e3, 1e3, 1e4);
    h.raos = r;
    h.drift = d;
    const double hs[] = {1.27, 3.85, 9.6}, tp[] = {6.3, 9.7, 14.2}, g[] = {1.0, 3.3, 5.0};
    const double k[3] = {8.1e4, 1.3e5, 2.7e9};
    for (int i = 0; i < 3; i++) {
        hf_environment e = waves_env(hs[i], tp[i], g[i], 200 * DEG);
        hf_env_motion_result m;
        OK(hf_env_motion(&h, &e, -33 * DEG, k, ws, &m, E_));
        rel_near(m.dof[0].wf_sig, hs[i] / 2.0, 1e-6, "WF significant surge = Hs/2");
        assert_true(m.dof[1].wf_sig == 0.0 && m.dof[1].wf_max == 0.0 && m.dof[1].wf_tz == 0.0);
        rel_near(m.dof[2].wf_sigma, 0.85 * DEG * hs[i] / 4.0, 1e-6, "WF yaw sigma");
        if (g[i] == 1.0)
            rel_near(m.dof[0].wf_tz, tp[i] * pow(1.25 * M_PI, -0.25), 1e-6, "T_z");
        double n = 10800.0 / m.dof[0].wf_tz;
        rel_near(m.dof[0].wf_max, hs[i] / 4.0 * sqrt(2.0 * log(n)), 1e-6, "WF max");
    }
    hf_table_free(r);
    hf_table_free(d);
}

/* ---- oscillator integral ------------------------------------------------- */

static double white(double mu, void *p)
{
    (void)mu;
    return *(const double *)p;
}

/* For white noise the integral is exactly pi S0 / (2 k c) (classical
 * random-vibration result, e.g. Newland, An Introduction to Random
 * Vibrations, ch. 7), for any damping. */
static void test_oscillator_white(void **state)
{
    (void)state;
    double s0 = 3.71e9;
    hf_env_fspec sf = {white, &s0};
    const double zeta[] = {0.005, 0.05, 0.3, 0.9};
    for (int i = 0; i < 4; i++) {
        double k = 2.37e5, m = 4.1e7, var;
        OK(hf_env_oscillator_variance(&sf, k, m, zeta[i], 1e-9, ws, &var, E_));
        double c = 2.0 * zeta[i] * sqrt(k * m);
        rel_near(var, M_PI * s0 / (2.0 * k * c), 1e-8, "white-noise integral");
        rel_near(hf_env_white_noise_variance(s0, k, m, zeta[i]), M_PI * s0 / (2.0 * k * c), 1e-15,
                 "white-noise formula");
    }
    hf_error e;
    double var;
    assert_int_equal(hf_env_oscillator_variance(&sf, 0.0, 1.0, 0.1, 1e-6, ws, &var, &e), HF_EINVAL);
    assert_int_equal(hf_env_oscillator_variance(&sf, 1.0, -1.0, 0.1, 1e-6, ws, &var, &e),
                     HF_EINVAL);
    assert_int_equal(hf_env_oscillator_variance(&sf, 1.0, 1.0, 0.0, 1e-6, ws, &var, &e), HF_EINVAL);
    assert_int_equal(hf_env_oscillator_variance(&sf, NAN, 1.0, 0.1, 1e-6, ws, &var, &e), HF_EINVAL);
}

/* ---- slow drift --------------------------------------------------------- */

/* Newman's approximation at mu = 0 with constant D and the Pierson-Moskowitz
 * spectrum: S_F(0) = 8 D^2 int S^2 dw, and with the substitution
 * u = 5/2 (wp/w)^4: int S^2 dw = (5/16)^2 Hs^4 wp^8 (1/4) c^(-9/4) Gamma(9/4),
 * c = 5/2 wp^4 (derived here from the closed form of S). */
static void test_newman_zero(void **state)
{
    (void)state;
    hf_spectrum s;
    hf_error e;
    hf_error_clear(&e);
    assert_int_equal(hf_spectrum_jonswap_init(&s, 3.62, 9.85, 1.0, hf_env_workspace_inner(ws), &e),
                     HF_OK);
    hf_table *d = flat(HF_TABLE_DRIFT, 41.3e3, 0.0, 0.0);
    double sf = -1.0, wp = s.wp, c = 2.5 * pow(wp, 4);
    OK(hf_env_slow_drift_spectrum(&s, d, 0.3, 0, 0.0, ws, &sf, E_));
    double s2 =
        pow(5.0 / 16.0, 2) * pow(3.62, 4) * pow(wp, 8) * 0.25 * pow(c, -2.25) * gsl_sf_gamma(2.25);
    rel_near(sf, 8.0 * 41.3e3 * 41.3e3 * s2, 1e-7, "S_F(0)");
    /* decreasing in mu for constant D, zero for sway here */
    double sf1, sf2, sy;
    OK(hf_env_slow_drift_spectrum(&s, d, 0.3, 0, 0.05, ws, &sf1, E_));
    OK(hf_env_slow_drift_spectrum(&s, d, 0.3, 0, 0.2, ws, &sf2, E_));
    OK(hf_env_slow_drift_spectrum(&s, d, 0.3, 1, 0.05, ws, &sy, E_));
    assert_true(sf > sf1 && sf1 > sf2 && sf2 > 0.0 && sy == 0.0);
    assert_int_equal(hf_env_slow_drift_spectrum(&s, d, 0.3, 3, 0.05, ws, &sy, &e), HF_EINVAL);
    assert_int_equal(hf_env_slow_drift_spectrum(&s, d, 0.3, 0, -0.05, ws, &sy, &e), HF_EINVAL);
    hf_table_free(d);
}

/* The white-noise approximation approaches the full integral as damping
 * falls (the response spectrum narrows to a spike at w_n; Newland ch. 7).
 * Measured on the invented barge's drift table. */
static void test_white_noise_light_damping(void **state)
{
    (void)state;
    hf_env_hull h;
    barge_hull(&h);
    hf_table *r = load("tests/data/env/barge-raos.csv", HF_TABLE_RAO);
    hf_table *d = load("tests/data/env/barge-drift.csv", HF_TABLE_DRIFT);
    h.raos = r;
    h.drift = d;
    hf_environment e = waves_env(5.1, 11.4, 3.3, 150 * DEG);
    const double k[3] = {9.2e4, 1.61e5, 4.4e9};
    const double zeta[] = {0.01, 0.03, 0.1};
    double prev = -1.0;
    for (int i = 0; i < 3; i++) {
        for (int j = 0; j < 3; j++)
            h.damping[j] = zeta[i];
        hf_env_motion_result m;
        OK(hf_env_motion(&h, &e, 10 * DEG, k, ws, &m, E_));
        double worst = 0.0;
        for (int j = 0; j < 3; j++) {
            double rel = fabs(m.dof[j].lf_var_white / m.dof[j].lf_var - 1.0);
            worst = fmax(worst, rel);
            rel_near(m.dof[j].lf_period, 2.0 * M_PI * sqrt(h.inertia[j] / k[j]), 1e-14, "T_n");
        }
        print_message("zeta %.2f: white-noise vs full integral, worst of 3 DOF %.3f %%\n", zeta[i],
                      100.0 * worst);
        if (zeta[i] <= 0.01 && !(worst <= 0.02))
            fail_msg("zeta %g: white noise off by %.3f %%", zeta[i], 100.0 * worst);
        assert_true(worst > prev); /* the approximation worsens as damping grows */
        prev = worst;
    }
    hf_table_free(r);
    hf_table_free(d);
}

/* ---- time-domain check of the oscillator and extreme formulas ------------ */

/* A smooth force spectrum with compact support [MC_A, MC_B] (rad/s):
 * S0 sin^2(pi (mu - a)/(b - a)).  Invented for the test. */
#define MC_A 0.35
#define MC_B 1.25
#define MC_S0 4.1e10 /* N^2 s/rad */
static double mc_sf(double mu, void *p)
{
    (void)p;
    if (mu <= MC_A || mu >= MC_B)
        return 0.0;
    double s = sin(M_PI * (mu - MC_A) / (MC_B - MC_A));
    return MC_S0 * s * s;
}

typedef struct {
    double m, k, c;
    const double *force; /* F on a grid of spacing dt */
    double dt;
} mc_sys;

static int mc_rhs(double t, const double y[], double dydt[], void *p)
{
    const mc_sys *s = p;
    double q = t / s->dt;
    long i = lround(q);
    if (fabs(q - (double)i) > 1e-6) /* rk4 asks for F at t, t+h/4, t+h/2, t+3h/4, t+h */
        return GSL_EBADFUNC;
    dydt[0] = y[1];
    dydt[1] = (s->force[i] - s->c * y[1] - s->k * y[0]) / s->m;
    return GSL_SUCCESS;
}

/* One record: random phases (and random frequencies within equal bins, so
 * the force never repeats), force synthesised on the grid by rotating each
 * component, response by GSL's rk4 with a fixed step; returns the record's
 * standard deviation and largest value after a warm-up. */
static void mc_record(unsigned long seed, mc_sys *sys, double *force, long ngrid, double h,
                      long warm, double *sd, double *xmax)
{
    enum { NC = 600 };
    static double zr[NC], zi[NC], rr[NC], ri[NC];
    gsl_rng *rng = gsl_rng_alloc(gsl_rng_mt19937);
    gsl_rng_set(rng, seed);
    double dmu = (MC_B - MC_A) / NC;
    for (int j = 0; j < NC; j++) {
        double mu = MC_A + (j + gsl_rng_uniform(rng)) * dmu;
        double amp = sqrt(2.0 * mc_sf(mu, NULL) * dmu), ph = 2.0 * M_PI * gsl_rng_uniform(rng);
        zr[j] = amp * cos(ph);
        zi[j] = amp * sin(ph);
        rr[j] = cos(mu * sys->dt);
        ri[j] = sin(mu * sys->dt);
    }
    gsl_rng_free(rng);
    for (long n = 0; n < ngrid; n++) {
        double f = 0.0;
        for (int j = 0; j < NC; j++) {
            f += zr[j];
            double a = zr[j] * rr[j] - zi[j] * ri[j];
            zi[j] = zr[j] * ri[j] + zi[j] * rr[j];
            zr[j] = a;
        }
        force[n] = f;
    }
    gsl_odeiv2_system ode = {mc_rhs, NULL, 2, sys};
    gsl_odeiv2_step *st = gsl_odeiv2_step_alloc(gsl_odeiv2_step_rk4, 2);
    double y[2] = {0.0, 0.0}, yerr[2], t = 0.0, s2 = 0.0, mx = -INFINITY;
    long nstep = (ngrid - 1) / 4, count = 0;
    for (long n = 0; n < nstep; n++) {
        int rc = gsl_odeiv2_step_apply(st, t, h, y, yerr, NULL, NULL, &ode);
        assert_int_equal(rc, GSL_SUCCESS);
        t = (n + 1) * h;
        if (n + 1 > warm) {
            s2 += y[0] * y[0];
            mx = fmax(mx, y[0]);
            count++;
        }
    }
    gsl_odeiv2_step_free(st);
    *sd = sqrt(s2 / count);
    *xmax = mx;
}

/* mu^2 S_F(mu) |H(mu)|^2 for the response's second moment. */
static double mc_m2_f(double mu, void *p)
{
    const double *q = p;
    double re = q[0] - q[1] * mu * mu, im = q[2] * mu;
    return mu * mu * mc_sf(mu, NULL) / (re * re + im * im);
}

/* Simulates a linear oscillator (T_n 8.37 s, damping ratio zeta) driven by
 * the force spectrum above over nseed 3-hour records and compares:
 *   (1) the pooled standard deviation with sqrt(hf_env_oscillator_variance);
 *   (2) the mean of the 3-hour maxima with the expected largest of N
 *       independent Rayleigh peaks, sigma (sqrt(2 ln N) + 0.5772/sqrt(2 ln N))
 *       (Cartwright and Longuet-Higgins 1956), whose mode is the most
 *       probable maximum sigma sqrt(2 ln N) (Longuet-Higgins 1952) that the
 *       design method uses; N = duration / T_z, T_z from the response's
 *       moments.
 * Statistical tolerance: 3 standard errors of the seed-to-seed scatter plus
 * 1 % for the finite number of components and the time step.
 * Measured with 60 seeds (mean max against the expected-max formula; against
 * the most probable maximum in brackets): zeta 0.03 -5.6 % (-1.8 %), 0.07
 * -3.2 % (+0.7 %), 0.15 -1.7 % (+2.3 %), 0.30 -1.0 % (+2.9 %), standard
 * error ~0.9 %; sigma within +0.3 % at every zeta.  Light damping makes a
 * narrow-band response whose peaks come in groups, so fewer independent
 * peaks than duration / T_z and a lower mean maximum (the clumping effect,
 * from memory: Vanmarcke 1975).  Hence check (2) uses the expected-max
 * formula at zeta 0.30 and the most probable maximum at zeta 0.07. */
static void time_domain(double zeta, int nseed, int check_mpm)
{
    const double duration = 10800.0, h = 0.4, tn = 8.37, m = 2.35e6;
    const double k = m * pow(2.0 * M_PI / tn, 2);
    mc_sys sys = {m, k, 2.0 * zeta * sqrt(k * m), NULL, h / 4.0};
    long warm = lround(300.0 / h), nstep = warm + lround(duration / h), ngrid = 4 * nstep + 1;
    double *force = malloc((size_t)ngrid * sizeof *force);
    assert_non_null(force);
    sys.force = force;

    hf_env_fspec sf = {mc_sf, NULL};
    double var;
    OK(hf_env_oscillator_variance(&sf, k, m, zeta, 1e-9, ws, &var, E_));
    /* T_z of the response from m0 = var and m2 = int mu^2 S_F |H|^2 (test's own quadrature) */
    gsl_integration_workspace *w = gsl_integration_workspace_alloc(1000);
    double m2 = 0.0, err;
    for (double a = MC_A; a < MC_B - 1e-12; a += (MC_B - MC_A) / 8) {
        double part;
        double p[3] = {k, m, sys.c};
        gsl_function f = {mc_m2_f, p};
        gsl_integration_qag(&f, a, a + (MC_B - MC_A) / 8, 0.0, 1e-10, 1000, GSL_INTEG_GAUSS21, w,
                            &part, &err);
        m2 += part;
    }
    gsl_integration_workspace_free(w);
    double sigma = sqrt(var), tz = 2.0 * M_PI * sqrt(var / m2);
    double n = duration / tz, r = sqrt(2.0 * log(n)), expect_max = sigma * (r + 0.5772 / r);
    double mpm;
    OK(hf_env_most_probable_max(sigma, duration, tz, &mpm, E_));

    double sv = 0.0, sv2 = 0.0, sm = 0.0, sm2 = 0.0;
    clock_t t0 = clock();
    for (int i = 0; i < nseed; i++) {
        double sd, mx;
        mc_record(1000u + (unsigned long)i, &sys, force, ngrid, h, warm, &sd, &mx);
        sv += sd * sd;
        sv2 += sd * sd * sd * sd;
        sm += mx;
        sm2 += mx * mx;
    }
    double secs = (double)(clock() - t0) / CLOCKS_PER_SEC;
    free(force);
    double mv = sv / nseed, se_v = sqrt((sv2 / nseed - mv * mv) / (nseed - 1));
    double mmax = sm / nseed, se_m = sqrt((sm2 / nseed - mmax * mmax) / (nseed - 1));
    double sd_pool = sqrt(mv), se_sd = 0.5 * se_v / sd_pool;
    print_message(
        "time domain, zeta %.2f, %d x 3 h records (%.1f s): sigma %.5g m vs formula %.5g m "
        "(%+.2f %%, SE %.2f %%); mean max %.5g m vs expected %.5g m (%+.2f %%, SE "
        "%.2f %%), most probable %.5g m; T_z %.3f s, T_n %.3f s\n",
        zeta, nseed, secs, sd_pool, sigma, 100.0 * (sd_pool / sigma - 1.0), 100.0 * se_sd / sigma,
        mmax, expect_max, 100.0 * (mmax / expect_max - 1.0), 100.0 * se_m / expect_max, mpm, tz,
        tn);
    if (!(fabs(sd_pool - sigma) <= 3.0 * se_sd + 0.01 * sigma))
        fail_msg("sigma: simulated %.6g, formula %.6g", sd_pool, sigma);
    double want = check_mpm ? mpm : expect_max;
    if (!(fabs(mmax - want) <= 3.0 * se_m + 0.01 * want))
        fail_msg("mean max: simulated %.6g, formula %.6g", mmax, want);
}

static void test_time_domain(void **state)
{
    (void)state;
    time_domain(0.07, 40, 1);
    time_domain(0.30, 40, 0);
}

/* ---- statistics, stiffness axes, design offset --------------------------- */

/* sigma sqrt(2 ln N), N = duration / period (Longuet-Higgins 1952). */
static void test_most_probable_max(void **state)
{
    (void)state;
    double mx = -1.0;
    hf_error e;
    OK(hf_env_most_probable_max(1.93, 10800.0, 7.41, &mx, E_));
    rel_near(mx, 1.93 * sqrt(2.0 * log(10800.0 / 7.41)), 1e-15, "mpm");
    OK(hf_env_most_probable_max(0.0, 10800.0, 7.41, &mx, E_));
    assert_true(mx == 0.0);
    OK(hf_env_most_probable_max(2.0, 60.0, 60.0, &mx, E_)); /* N = 1: ln 1 = 0 */
    assert_true(mx == 0.0);
    assert_int_equal(hf_env_most_probable_max(2.0, 59.0, 60.0, &mx, &e), HF_EINVAL);
    assert_non_null(strstr(e.text, "shorter than one period"));
    assert_int_equal(hf_env_most_probable_max(-1.0, 600.0, 6.0, &mx, &e), HF_EINVAL);
    assert_int_equal(hf_env_most_probable_max(NAN, 600.0, 6.0, &mx, &e), HF_EINVAL);
    assert_int_equal(hf_env_most_probable_max(1.0, INFINITY, 6.0, &mx, &e), HF_EINVAL);
    assert_int_equal(hf_env_most_probable_max(1.0, 600.0, 0.0, &mx, &e), HF_EINVAL);
}

/* Rotation of the translational stiffness into hull axes: a quadratic form
 * e.K.e (linear algebra); isotropic K gives the same k in every direction. */
static void test_stiffness_hull(void **state)
{
    (void)state;
    double K[6][6] = {{0}}, k[3];
    K[0][0] = 3.1e5;
    K[1][1] = 1.7e5;
    K[0][1] = 2.2e4;
    K[1][0] = 1.8e4;
    K[5][5] = 8.8e9;
    hf_env_stiffness_hull(K, 0.0, k);
    assert_true(k[0] == 3.1e5 && k[1] == 1.7e5 && k[2] == 8.8e9);
    hf_env_stiffness_hull(K, 90 * DEG, k);
    rel_near(k[0], 1.7e5, 1e-12, "k surge at 90 deg");
    rel_near(k[1], 3.1e5, 1e-12, "k sway at 90 deg");
    double y = 37.0 * DEG, c = cos(y), s = sin(y);
    hf_env_stiffness_hull(K, y, k);
    rel_near(k[0], c * c * 3.1e5 + c * s * 4.0e4 + s * s * 1.7e5, 1e-12, "k surge");
    rel_near(k[0] + k[1], 3.1e5 + 1.7e5, 1e-12, "trace invariant");
    double I[6][6] = {{0}};
    I[0][0] = I[1][1] = 2.345e5;
    for (double a = -3.0; a < 3.0; a += 0.7) {
        hf_env_stiffness_hull(I, a, k);
        rel_near(k[0], 2.345e5, 1e-12, "isotropic surge");
        rel_near(k[1], 2.345e5, 1e-12, "isotropic sway");
    }
}

/* The combination of API RP 2SK's quasi-static method (from memory):
 * mean + max(LF max + WF sig, LF sig + WF max), along the mean offset. */
static void test_design_offset(void **state)
{
    (void)state;
    hf_env_motion_result m;
    memset(&m, 0, sizeof m);
    m.dof[0].lf_sig = 4.2, m.dof[0].lf_max = 7.9, m.dof[0].wf_sig = 1.3, m.dof[0].wf_max = 2.4;
    m.dof[1].lf_sig = 2.6, m.dof[1].lf_max = 5.1, m.dof[1].wf_sig = 3.9, m.dof[1].wf_max = 7.3;
    m.dof[2].lf_sig = 0.02, m.dof[2].lf_max = 0.037, m.dof[2].wf_sig = 0.011;
    m.dof[2].wf_max = 0.021;
    hf_env_design d;
    double yaw = 20 * DEG, mean[2] = {13.0 * cos(yaw), 13.0 * sin(yaw)};
    OK(hf_env_design_offset(mean, -0.031, yaw, &m, 1.0, &d, E_));
    /* along the hull's x axis: surge values only */
    rel_near(d.direction, yaw, 1e-12, "direction");
    assert_false(d.from_fallback);
    rel_near(d.combo_lf_max, 7.9 + 1.3, 1e-12, "LF max + WF sig");
    rel_near(d.combo_wf_max, 4.2 + 2.4, 1e-12, "LF sig + WF max");
    rel_near(d.offset, 13.0 + 9.2, 1e-12, "design offset");
    rel_near(d.offset_xy[0], 22.2 * cos(yaw), 1e-12, "x");
    rel_near(d.yaw, -0.031 - (0.037 + 0.011), 1e-12, "design yaw, sense of the mean yaw");
    /* along the hull's y axis: sway values; WF max governs */
    double mean_y[2] = {-5.0 * sin(yaw), 5.0 * cos(yaw)};
    OK(hf_env_design_offset(mean_y, 0.0, yaw, &m, 1.0, &d, E_));
    rel_near(d.offset, 5.0 + 2.6 + 7.3, 1e-12, "sway design offset");
    rel_near(d.yaw, 0.02 + 0.021 > 0.037 + 0.011 ? 0.041 : 0.048, 1e-12, "yaw 0 -> positive");
    /* at 45 deg in hull axes, SRSS of the projections */
    double mean_d[2] = {3.0 * cos(yaw + M_PI / 4), 3.0 * sin(yaw + M_PI / 4)};
    OK(hf_env_design_offset(mean_d, 0.0, yaw, &m, 1.0, &d, E_));
    rel_near(d.lf_max, sqrt(0.5 * (7.9 * 7.9 + 5.1 * 5.1)), 1e-12, "projected LF max");
    /* no mean offset: fallback direction */
    double zero[2] = {0.0, 0.0};
    OK(hf_env_design_offset(zero, 0.0, 0.0, &m, 90 * DEG, &d, E_));
    assert_true(d.from_fallback);
    rel_near(d.offset, fmax(5.1 + 3.9, 2.6 + 7.3), 1e-12, "fallback: sway");
    hf_error e;
    double bad[2] = {NAN, 0.0};
    assert_int_equal(hf_env_design_offset(bad, 0.0, 0.0, &m, 0.0, &d, &e), HF_EINVAL);
    assert_int_equal(hf_env_design_offset(mean, 0.0, INFINITY, &m, 0.0, &d, &e), HF_EINVAL);
}

/* ---- refusals ----------------------------------------------------------- */

static void refused(const hf_env_hull *h, const hf_environment *e, double yaw, hf_status want,
                    const char *p1, const char *p2)
{
    hf_error err;
    hf_error_clear(&err);
    double out[2];
    hf_status st = hf_env_check(h, e, yaw, ws, out, &err);
    if (st != want)
        fail_msg("status %d, want %d: %s", st, want, err.text);
    if ((p1 && !strstr(err.text, p1)) || (p2 && !strstr(err.text, p2)))
        fail_msg("message \"%s\" lacks \"%s\" / \"%s\"", err.text, p1, p2 ? p2 : "");
}

static void test_refusals(void **state)
{
    (void)state;
    hf_env_hull h;
    barge_hull(&h);
    hf_table *r = load("tests/data/env/barge-raos.csv", HF_TABLE_RAO);
    hf_table *d = load("tests/data/env/barge-drift.csv", HF_TABLE_DRIFT);
    hf_table *w = load("tests/data/env/barge-wind.csv", HF_TABLE_COEF);
    hf_environment e = waves_env(4.4, 10.3, 3.3, 45 * DEG);
    refused(&h, &e, 0.0, HF_EINVAL, "storm-1: waves need the hull's raos table", NULL);
    h.raos = r;
    refused(&h, &e, 0.0, HF_EINVAL, "waves need the hull's drift table", NULL);
    h.drift = d;
    double out[2] = {-1, -1};
    OK(hf_env_check(&h, &e, 0.0, ws, out, E_));
    assert_true(out[0] >= 0.0 && out[0] <= 1e-3 && out[1] >= 0.0);
    print_message("barge tables, Hs 4.4 m Tp 10.3 s: %.2e of the energy outside the RAOs\n",
                  out[0]);
    /* a short-period sea with energy above the tables' 5 rad/s */
    hf_environment hi = waves_env(0.3, 1.6, 3.3, 45 * DEG);
    refused(&h, &hi, 0.0, HF_EINVAL, "of the spectrum's energy", "barge-raos.csv");
    /* a table that ends at 1.5 rad/s */
    double fr[] = {0.3, 1.5}, hd[] = {0.0, 90 * DEG, 180 * DEG, 270 * DEG}, val[24] = {0};
    hf_table *narrow = NULL;
    hf_error er;
    assert_int_equal(
        hf_table_from_values(HF_TABLE_RAO, "narrow.csv", 2, fr, 4, hd, val, &narrow, &er), HF_OK);
    h.raos = narrow;
    h.heading_gap = 100 * DEG; /* let its 90-degree heading steps pass */
    refused(&h, &e, 0.0, HF_EINVAL, "lies outside the 0.3 to 1.5 rad/s of narrow.csv",
            "extend the table");
    h.heading_gap = 60 * DEG; /* 90-degree steps do not cover 45 deg then */
    refused(&h, &e, 0.0, HF_EINVAL, "narrow.csv does not cover the relative heading 45 deg", NULL);
    h.raos = r;
    h.heading_gap = HF_TABLE_HEADING_GAP_DEFAULT;
    h.damping[1] = 0.0;
    refused(&h, &e, 0.0, HF_EINVAL, "sway damping ratio", NULL);
    h.damping[1] = 1.0;
    refused(&h, &e, 0.0, HF_EINVAL, "sway damping ratio", NULL);
    h.damping[1] = 0.08;
    h.inertia[2] = 0.0;
    refused(&h, &e, 0.0, HF_EINVAL, "positive yaw inertia", NULL);
    h.inertia[2] = 1e10;
    e.duration = 0.0;
    refused(&h, &e, 0.0, HF_EINVAL, "duration", NULL);
    e.duration = 10800.0;
    refused(&h, &e, NAN, HF_EINVAL, "yaw is not finite", NULL);
    e.waves.hs = -1.0;
    refused(&h, &e, 0.0, HF_EINVAL, "storm-1: waves.hs", NULL);
    e.waves.hs = 4.4;
    e.has_wind = 1;
    e.wind = (hf_env_flow){-3.0, 0.0};
    refused(&h, &e, 0.0, HF_EINVAL, "wind: expected a speed >= 0", NULL);
    e.wind = (hf_env_flow){23.0, 0.0};
    refused(&h, &e, 0.0, HF_EINVAL, "wind needs the hull's wind_coefficients table", NULL);
    h.wind = w;
    h.wind_area = 0.0;
    refused(&h, &e, 0.0, HF_EINVAL, "positive hull wind_area", NULL);
    h.wind_area = 612.0;
    OK(hf_env_check(&h, &e, 0.0, ws, NULL, E_));
    /* a finite but absurd wind: the load overflows and is refused, not printed */
    hf_env_mean mn;
    e.wind.speed = 1e160;
    hf_error_clear(&er);
    assert_int_equal(hf_env_mean_load(&h, &e, 0.0, ws, &mn, &er), HF_EINVAL);
    assert_non_null(strstr(er.text, "overflows"));
    e.wind.speed = 23.0;
    /* motions: stiffness must be positive; the storm longer than a period */
    hf_env_motion_result m;
    const double k0[3] = {9.2e4, -1.0, 4.4e9};
    hf_error_clear(&er);
    assert_int_equal(hf_env_motion(&h, &e, 0.0, k0, ws, &m, &er), HF_EUNSUPPORTED);
    assert_non_null(strstr(er.text, "sway stiffness"));
    const double k1[3] = {9.2e4, 1.6e5, 4.4e9};
    e.duration = 50.0; /* shorter than the surge natural period (~100 s) */
    assert_int_equal(hf_env_motion(&h, &e, 0.0, k1, ws, &m, &er), HF_EINVAL);
    assert_non_null(strstr(er.text, "shorter than one period"));
    /* no waves: no motion, natural periods still reported */
    e.has_waves = 0;
    e.duration = 10800.0;
    OK(hf_env_motion(&h, &e, 0.0, k0, ws, &m, E_));
    assert_true(m.dof[0].lf_sig == 0.0 && m.dof[0].wf_max == 0.0 && m.dof[0].lf_period > 0.0);
    assert_true(m.dof[1].lf_period == 0.0);
    hf_table_free(r);
    hf_table_free(d);
    hf_table_free(w);
    hf_table_free(narrow);
}

/* The whole chain on the invented barge: finite, ordered results; the
 * motions allocate nothing; timing printed. */
static void test_barge_chain(void **state)
{
    (void)state;
    hf_env_hull h;
    barge_hull(&h);
    hf_table *r = load("tests/data/env/barge-raos.csv", HF_TABLE_RAO);
    hf_table *d = load("tests/data/env/barge-drift.csv", HF_TABLE_DRIFT);
    hf_table *w = load("tests/data/env/barge-wind.csv", HF_TABLE_COEF);
    hf_table *c = load("tests/data/env/barge-current.csv", HF_TABLE_COEF);
    h.raos = r, h.drift = d, h.wind = w, h.current = c;
    hf_environment e = waves_env(5.8, 11.9, 2.6, 205 * DEG);
    e.has_wind = e.has_current = 1;
    e.wind = (hf_env_flow){24.7, 215 * DEG};
    e.current = (hf_env_flow){0.93, 190 * DEG};
    double yaw = 8 * DEG, k[3] = {8.4e4, 1.22e5, 3.9e9};
    hf_env_mean mean;
    hf_env_motion_result m;
    clock_t t0 = clock();
    hf_alloc_fail_at(1, 1); /* any allocation would fail */
    hf_error er;
    hf_error_clear(&er);
    hf_status s1 = hf_env_mean_load(&h, &e, yaw, ws, &mean, &er);
    hf_status s2 = hf_env_motion(&h, &e, yaw, k, ws, &m, &er);
    long count = hf_alloc_count();
    hf_alloc_fail_at(0, 0);
    double secs = (double)(clock() - t0) / CLOCKS_PER_SEC;
    if (s1 != HF_OK || s2 != HF_OK)
        fail_msg("%s", er.text);
    assert_int_equal(count, 0);
    for (int i = 0; i < 3; i++) {
        const hf_env_dof *q = &m.dof[i];
        assert_true(isfinite(q->lf_var) && q->lf_var > 0.0 && q->wf_var > 0.0);
        assert_true(q->lf_max > q->lf_sigma && q->wf_max > q->wf_sigma);
        assert_true(fabs(q->lf_var_white / q->lf_var - 1.0) < 0.5);
    }
    /* wind and waves toward ~205 deg global, hull at 8 deg: pushed toward -x */
    assert_true(mean.total_global[0] < 0.0);
    print_message("barge chain (%.3f s): mean Fx %.4g kN; surge T_n %.1f s, LF sig %.3f m "
                  "(white noise %.3f m), LF max %.3f m, WF sig %.3f m, WF max %.3f m, T_z %.2f s\n",
                  secs, mean.total_global[0] / 1e3, m.dof[0].lf_period, m.dof[0].lf_sig,
                  2.0 * sqrt(m.dof[0].lf_var_white), m.dof[0].lf_max, m.dof[0].wf_sig,
                  m.dof[0].wf_max, m.dof[0].wf_tz);
    hf_table_free(r);
    hf_table_free(d);
    hf_table_free(w);
    hf_table_free(c);
}

static void test_workspace_alloc(void **state)
{
    (void)state;
    hf_error e;
    hf_alloc_fail_at(1, 0);
    hf_env_workspace *x = hf_env_workspace_alloc(&e);
    hf_alloc_fail_at(0, 0);
    assert_null(x);
    assert_int_equal(e.status, HF_ENOMEM);
    hf_env_workspace_free(NULL);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_wind_current),    cmocka_unit_test(test_mean_drift),
        cmocka_unit_test(test_wave_frequency),  cmocka_unit_test(test_oscillator_white),
        cmocka_unit_test(test_newman_zero),     cmocka_unit_test(test_white_noise_light_damping),
        cmocka_unit_test(test_time_domain),     cmocka_unit_test(test_most_probable_max),
        cmocka_unit_test(test_stiffness_hull),  cmocka_unit_test(test_design_offset),
        cmocka_unit_test(test_refusals),        cmocka_unit_test(test_barge_chain),
        cmocka_unit_test(test_workspace_alloc),
    };
    hf_gsl_handler_install();
    hf_error e;
    ws = hf_env_workspace_alloc(&e);
    if (!ws)
        return 1;
    int rc = cmocka_run_group_tests(tests, NULL, NULL);
    hf_env_workspace_free(ws);
    return rc;
}
