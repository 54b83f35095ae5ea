/* spectrum.c - JONSWAP wave spectrum: evaluation, numerical normalisation,
 * moments and energy bands.  Formulas and sources in spectrum.h and
 * docs/design.md. */
#include <math.h>
#include <stddef.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include "holdfast/spectrum.h"

#define G_STD 9.80665 /* standard gravity, m/s^2 (CGPM 1901, exact) */

/* The shape without the normalising factor A:
 * (5/16) Hs^2 wp^4 w^-5 exp(-5/4 (wp/w)^4) gamma^r (DNV-RP-C205 sec. 3.5.5). */
static double shape(double hs, double wp, double gamma, double w)
{
    if (!(w > 0.0))
        return 0.0;
    double q = wp / w, q4 = q * q * q * q;
    double e = 1.25 * q4;
    if (e > 700.0) /* exp(-700) ~ 1e-304: below any quantity of interest */
        return 0.0;
    double pm = (5.0 / 16.0) * hs * hs * q4 / w * exp(-e); /* wp^4 w^-5 = q^4 / w */
    if (gamma == 1.0)
        return pm;
    double sg = w <= wp ? 0.07 : 0.09;
    double d = (w - wp) / (sg * wp);
    return pm * pow(gamma, exp(-0.5 * d * d));
}

double hf_spectrum_eval(const hf_spectrum *s, double w)
{
    return s->scale * shape(s->hs, s->wp, s->gamma, w);
}

typedef struct {
    const hf_spectrum *s;
    int n;        /* power of w */
    double scale; /* A used while integrating */
} mom_params;

static double mom_f(double w, void *p)
{
    const mom_params *mp = p;
    double v = mp->scale * shape(mp->s->hs, mp->s->wp, mp->s->gamma, w);
    return v == 0.0 ? 0.0 : v * pow(w, mp->n);
}

/* Integral of w^n A shape(w) over [lo, hi] (hi may be INFINITY), split at the
 * peak: QAG 21-point on finite pieces, QAGIU on the tail. */
static hf_status integrate(const hf_spectrum *s, double scale, int n, double lo, double hi,
                           gsl_integration_workspace *ws, double *out, hf_error *err)
{
    mom_params mp = {s, n, scale};
    gsl_function f = {mom_f, &mp};
    double a = 0.0, b = 0.0, ea, eb;
    int rc = 0;
    double mid = fmin(fmax(s->wp, lo), hi);
    if (mid > lo)
        rc = gsl_integration_qag(&f, lo, mid, 0.0, HF_SPECTRUM_EPSREL, ws->limit, GSL_INTEG_GAUSS21,
                                 ws, &a, &ea);
    if (rc == 0 && hi > mid) {
        if (isinf(hi))
            rc = gsl_integration_qagiu(&f, mid, 0.0, HF_SPECTRUM_EPSREL, ws->limit, ws, &b, &eb);
        else
            rc = gsl_integration_qag(&f, mid, hi, 0.0, HF_SPECTRUM_EPSREL, ws->limit,
                                     GSL_INTEG_GAUSS21, ws, &b, &eb);
    }
    if (rc != 0)
        return hf_error_set(
            err, HF_ENOCONV,
            "spectrum: quadrature of moment %d failed (Hs %g m, Tp %g s, gamma %g): %s", n, s->hs,
            s->tp, s->gamma, gsl_strerror(rc));
    *out = a + b;
    return HF_OK;
}

hf_status hf_spectrum_jonswap_init(hf_spectrum *s, double hs, double tp, double gamma,
                                   gsl_integration_workspace *ws, hf_error *err)
{
    if (!s || !ws)
        return hf_error_set(err, HF_EINVAL, "spectrum: no spectrum or workspace given");
    if (!(hs > 0.0) || !isfinite(hs))
        return hf_error_set(err, HF_EINVAL, "waves.hs: expected a positive height, got %g m", hs);
    if (!(tp > 0.0) || !isfinite(tp))
        return hf_error_set(err, HF_EINVAL, "waves.tp: expected a positive period, got %g s", tp);
    if (!(gamma >= 1.0 && gamma <= HF_SPECTRUM_GAMMA_MAX))
        return hf_error_set(err, HF_EINVAL,
                            "waves.gamma: expected a peak enhancement factor from 1 to %g, got %g",
                            HF_SPECTRUM_GAMMA_MAX, gamma);
    double lp = G_STD * tp * tp / (2.0 * M_PI); /* deep-water wave length at Tp, m */
    if (hs / lp > HF_SPECTRUM_STEEPNESS_MAX)
        return hf_error_set(err, HF_EINVAL,
                            "waves: Hs %g m with Tp %g s is steeper than a breaking wave "
                            "(Hs/Lp = %.3f > 1/7); no such sea state exists",
                            hs, tp, hs / lp);
    hf_spectrum t = {hs, tp, gamma, 2.0 * M_PI / tp, 1.0, 1.0 - 0.287 * log(gamma)};
    double m0;
    hf_status st = integrate(&t, 1.0, 0, 0.0, INFINITY, ws, &m0, err);
    if (st != HF_OK)
        return st;
    if (!(m0 > 0.0) || !isfinite(m0))
        return hf_error_set(err, HF_ENOCONV, "spectrum: zeroth moment %g is not positive", m0);
    t.scale = hs * hs / 16.0 / m0;
    *s = t;
    return HF_OK;
}

hf_status hf_spectrum_moment(const hf_spectrum *s, int n, gsl_integration_workspace *ws, double *m,
                             hf_error *err)
{
    if (n < -2 || n > 3)
        return hf_error_set(err, HF_EINVAL, "spectrum: moment %d not available (-2 .. 3)", n);
    return integrate(s, s->scale, n, 0.0, INFINITY, ws, m, err);
}

hf_status hf_spectrum_outside(const hf_spectrum *s, double lo, double hi,
                              gsl_integration_workspace *ws, double *fraction, hf_error *err)
{
    if (!(lo >= 0.0) || !(hi >= lo) || isinf(lo))
        return hf_error_set(err, HF_EINVAL, "spectrum: bad frequency band [%g, %g] rad/s", lo, hi);
    double in = 0.0;
    hf_status st = HF_OK;
    if (hi > lo)
        st = integrate(s, s->scale, 0, lo, hi, ws, &in, err);
    if (st != HF_OK)
        return st;
    double f = 1.0 - in / (s->hs * s->hs / 16.0);
    *fraction = f < 0.0 ? 0.0 : f > 1.0 ? 1.0 : f;
    return HF_OK;
}

void hf_spectrum_band(const hf_spectrum *s, double eps, double *lo, double *hi)
{
    /* Half of eps on each side.  Lower: below wp the Pierson-Moskowitz
     * distribution function is exp(-5/4 (wp/w)^4) and A gamma^r <= gamma.
     * Upper: 1 - exp(-5/4 (wp/w)^4) <= 5/4 (wp/w)^4, and above 2 wp both
     * A <= 1 and gamma^r ~ 1.  Both follow from integrating the shape above. */
    double e = fmax(fmin(eps, 0.999), 1e-15) * 0.5;
    *lo = s->wp * pow(1.25 / log(s->gamma / e), 0.25);
    *hi = fmax(2.0 * s->wp, s->wp * pow(1.25 / e, 0.25));
}
