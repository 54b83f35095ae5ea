/* spectrum.h - the JONSWAP wave spectrum, its moments and its energy bands.
 *
 * Flow: case -> model -> ... -> **spectrum** -> environment (mean drift,
 * slow-drift and wave-frequency motions) -> design study -> writers.
 * Knows nothing of hulls, tables or files.
 *
 * Form (Hasselmann et al. 1973, as written in DNV-RP-C205, sec. 3.5.5), one-sided,
 * in angular frequency w (rad/s), S in m^2 s/rad:
 *
 *     S(w) = A (5/16) Hs^2 wp^4 w^-5 exp(-5/4 (wp/w)^4) gamma^r,
 *     r = exp(-(w - wp)^2 / (2 s^2 wp^2)),  s = 0.07 (w <= wp), 0.09 (w > wp),
 *     wp = 2 pi / Tp.
 *
 * Without the peak factor (gamma = 1, A = 1) this is the Pierson-Moskowitz
 * spectrum in its Hs, Tp form, whose zeroth moment is exactly Hs^2/16.
 * Here A is computed NUMERICALLY so that m0 = Hs^2/16 holds to the quadrature
 * tolerance for every gamma; the closed-form approximation A = 1 - 0.287 ln
 * gamma (DNV-RP-C205, same section) is kept beside it for reports.
 *
 * Quadrature: GSL QAG (21-point Gauss-Kronrod) on [0, wp] and QAGIU on
 * [wp, inf), epsabs 0, epsrel HF_SPECTRUM_EPSREL, with a caller-owned
 * gsl_integration_workspace of at least HF_SPECTRUM_LIMIT intervals.
 * Nothing here allocates. */
#ifndef HOLDFAST_SPECTRUM_H
#define HOLDFAST_SPECTRUM_H

#include <gsl/gsl_integration.h>
#include "holdfast/status.h"

#define HF_SPECTRUM_EPSREL 1e-10              /* relative tolerance of the moment integrals */
#define HF_SPECTRUM_LIMIT 200                 /* intervals the caller's workspace must hold */
#define HF_SPECTRUM_GAMMA_MAX 10.0            /* largest peak enhancement factor accepted */
#define HF_SPECTRUM_STEEPNESS_MAX (1.0 / 7.0) /* Hs / Lp refused above (breaking) */

/* A JONSWAP sea state.  Filled by hf_spectrum_jonswap_init; read-only after. */
typedef struct {
    double hs;           /* significant wave height, m (> 0) */
    double tp;           /* peak period, s (> 0) */
    double gamma;        /* peak enhancement factor, - (1 .. HF_SPECTRUM_GAMMA_MAX) */
    double wp;           /* peak angular frequency 2 pi / tp, rad/s */
    double scale;        /* A, numerical: m0 = hs^2 / 16 exactly (to EPSREL) */
    double scale_closed; /* A, closed form 1 - 0.287 ln gamma (DNV-RP-C205) */
} hf_spectrum;

/* Sets up a JONSWAP spectrum and normalises it numerically.
 * hs in m, tp in s, gamma dimensionless; ws is the caller's GSL workspace
 * (HF_SPECTRUM_LIMIT intervals or more).
 * Returns HF_OK; HF_EINVAL when hs or tp is not a positive finite number,
 * gamma is outside [1, HF_SPECTRUM_GAMMA_MAX], ws is NULL, or the sea state
 * is steeper than a breaking wave (Hs / Lp > 1/7 with Lp = g Tp^2 / (2 pi):
 * Michell's limit for regular waves, common practice as an upper bound);
 * HF_ENOCONV when the quadrature fails.  s is untouched on failure. */
hf_status hf_spectrum_jonswap_init(hf_spectrum *s, double hs, double tp, double gamma,
                                   gsl_integration_workspace *ws, hf_error *err);

/* Spectral density S(w), m^2 s/rad; 0 for w <= 0 and where it underflows. */
double hf_spectrum_eval(const hf_spectrum *s, double w);

/* Spectral moment m_n = integral over (0, inf) of w^n S(w) dw, units
 * m^2 (rad/s)^n, for n in -2 .. 3 (m_4 diverges for a w^-5 tail).
 * HF_EINVAL for another n; HF_ENOCONV when the quadrature fails. */
hf_status hf_spectrum_moment(const hf_spectrum *s, int n, gsl_integration_workspace *ws, double *m,
                             hf_error *err);

/* Fraction of the spectrum's energy (m0) lying outside the band [lo, hi]
 * (rad/s, 0 <= lo <= hi; hi may be INFINITY), in [0, 1].
 * HF_EINVAL for a bad band; HF_ENOCONV when the quadrature fails. */
hf_status hf_spectrum_outside(const hf_spectrum *s, double lo, double hi,
                              gsl_integration_workspace *ws, double *fraction, hf_error *err);

/* A band [*lo, *hi] (rad/s) outside which the spectrum holds at most a
 * fraction eps (1e-15 <= eps < 1) of its energy, from the w^-5 tail bound
 * (upper) and the exponential cut-off (lower); generous, never too narrow. */
void hf_spectrum_band(const hf_spectrum *s, double eps, double *lo, double *hi);

#endif
