/* environment.c - mean loads, slow-drift and wave-frequency motions,
 * extremes and the design offset of the quasi-static design method.
 * Contracts in environment.h; formulas and sources in docs/design.md. */
#include <math.h>
#include <string.h>
#include <gsl/gsl_errno.h>
#include <gsl/gsl_integration.h>
#include "holdfast/alloc.h"
#include "holdfast/environment.h"

#define DEG (M_PI / 180.0)
static const char *const dof_name[3] = {"surge", "sway", "yaw"};

struct hf_env_workspace {
    gsl_integration_workspace *inner; /* spectral integrals over w */
    gsl_integration_workspace *outer; /* the oscillator integral over mu */
};

hf_env_workspace *hf_env_workspace_alloc(hf_error *err)
{
    hf_env_workspace *ws = hf_calloc(1, sizeof *ws);
    if (ws) {
        ws->inner = gsl_integration_workspace_alloc(HF_ENV_LIMIT);
        ws->outer = gsl_integration_workspace_alloc(HF_ENV_LIMIT);
    }
    if (!ws || !ws->inner || !ws->outer) {
        hf_env_workspace_free(ws);
        hf_error_set(err, HF_ENOMEM, "environment: out of memory for quadrature workspaces");
        return NULL;
    }
    return ws;
}

void hf_env_workspace_free(hf_env_workspace *ws)
{
    if (!ws)
        return;
    if (ws->inner)
        gsl_integration_workspace_free(ws->inner);
    if (ws->outer)
        gsl_integration_workspace_free(ws->outer);
    hf_free(ws);
}

gsl_integration_workspace *hf_env_workspace_inner(hf_env_workspace *ws)
{
    return ws->inner;
}

void hf_environment_default(hf_environment *e)
{
    memset(e, 0, sizeof *e);
    e->duration = HF_ENV_DURATION_DEFAULT;
    e->waves.gamma = HF_ENV_GAMMA_DEFAULT;
}

void hf_env_hull_default(hf_env_hull *h)
{
    memset(h, 0, sizeof *h);
    h->air_density = HF_ENV_AIR_DENSITY;
    h->water_density = 1025.0; /* seawater, Tupper, Introduction to Naval Architecture */
    h->heading_gap = HF_TABLE_HEADING_GAP_DEFAULT;
}

static const char *ename(const hf_environment *e)
{
    return e->name ? e->name : "(unnamed)";
}

/* ---- integrals over the wave spectrum ---------------------------------- */

typedef struct {
    const hf_spectrum *s;
    const hf_table *t;
    double heading; /* relative, rad */
    int dof;
    int power; /* w^power weight (0 or 2) */
    double mu; /* difference frequency, rad/s (slow drift) */
} spec_params;

/* Integral over (0, inf) of fn, an integrand made of the spectrum and a
 * table linear between its frequencies.  The integrand is smooth between
 * breakpoints: the table's frequencies shifted by -shift (Newman's
 * D(w + mu/2) has its kinks at f_i - mu/2), the peak wp and, for the slow
 * drift, wp - mu.  Each piece from lo (below which the spectrum holds less
 * than 1e-14 of its energy) to the last breakpoint goes to GSL QAG
 * (21-point Gauss-Kronrod), the rest to QAGIU.  Tolerances: epsrel, and an
 * absolute tolerance per piece of epsrel times a first estimate of the
 * integral of |fn| (one 21-point rule per piece) over the number of pieces,
 * so that pieces holding nothing do not chase relative accuracy. */
static hf_status spec_integral(double (*fn)(double, void *), spec_params *sp, double shift,
                               gsl_integration_workspace *ws, double epsrel, double *out,
                               const char *what, hf_error *err)
{
    gsl_function f = {fn, sp};
    const double *fr = hf_table_freqs(sp->t);
    size_t nf = hf_table_nfreq(sp->t);
    double lo, hi, extra[2] = {sp->s->wp - sp->mu, sp->s->wp}, est = 0.0, sum = 0.0, r, e, r1, r2;
    hf_spectrum_band(sp->s, 1e-14, &lo, &hi);
    hi = fmax(fmax(fr[nf - 1] - shift, 2.0 * sp->s->wp), lo);
    int rc = 0;
    for (int pass = 0, npiece = 0; pass < 2 && rc == 0; pass++) {
        double a = lo, epsabs = pass ? epsrel * est / npiece : 0.0;
        size_t i = 0;
        int j = 0;
        while (a < hi && rc == 0) {
            while (i < nf && fr[i] - shift <= a)
                i++;
            while (j < 2 && extra[j] <= a)
                j++;
            double b = fmin(hi, fmin(i < nf ? fr[i] - shift : hi, j < 2 ? extra[j] : hi));
            if (pass == 0) {
                gsl_integration_qk21(&f, a, b, &r, &e, &r1, &r2);
                est += r1; /* integral of |fn| by the same rule */
                npiece++;
            } else {
                rc = gsl_integration_qag(&f, a, b, epsabs, epsrel, ws->limit, GSL_INTEG_GAUSS21, ws,
                                         &r, &e);
                sum += r;
            }
            a = b;
        }
        if (pass == 1 && rc == 0) {
            rc = gsl_integration_qagiu(&f, hi, epsabs, epsrel, ws->limit, ws, &r, &e);
            sum += r;
        }
    }
    if (rc != 0 || !isfinite(sum))
        return hf_error_set(err, HF_ENOCONV, "%s: quadrature failed: %s", what,
                            rc ? gsl_strerror(rc) : "non-finite integrand");
    *out = sum;
    return HF_OK;
}

/* S(w) D(w), D the drift coefficient of one DOF (mean wave drift). */
static double drift_f(double w, void *p)
{
    const spec_params *sp = p;
    double s = hf_spectrum_eval(sp->s, w), v[3];
    if (s == 0.0)
        return 0.0;
    hf_table_eval(sp->t, w, sp->heading, v);
    return s * v[sp->dof];
}

/* w^power |RAO(w)|^2 S(w) (wave-frequency response spectrum). */
static double rao_f(double w, void *p)
{
    const spec_params *sp = p;
    double s = hf_spectrum_eval(sp->s, w), v[3];
    if (s == 0.0)
        return 0.0;
    hf_table_eval(sp->t, w, sp->heading, v);
    return (sp->power ? w * w : 1.0) * v[sp->dof] * v[sp->dof] * s;
}

/* S(w) S(w + mu) D(w + mu/2)^2 (Newman's approximation). */
static double newman_f(double w, void *p)
{
    const spec_params *sp = p;
    double s1 = hf_spectrum_eval(sp->s, w), v[3];
    if (s1 == 0.0)
        return 0.0;
    double s2 = hf_spectrum_eval(sp->s, w + sp->mu);
    if (s2 == 0.0)
        return 0.0;
    hf_table_eval(sp->t, w + 0.5 * sp->mu, sp->heading, v);
    return s1 * s2 * v[sp->dof] * v[sp->dof];
}

hf_status hf_env_slow_drift_spectrum(const hf_spectrum *s, const hf_table *drift, double heading,
                                     int dof, double mu, hf_env_workspace *ws, double *sf,
                                     hf_error *err)
{
    if (dof < 0 || dof > 2 || !(mu >= 0.0) || !isfinite(mu))
        return hf_error_set(err, HF_EINVAL, "slow drift: bad DOF %d or frequency %g", dof, mu);
    spec_params sp = {s, drift, heading, dof, 0, mu};
    double v;
    hf_status st = spec_integral(newman_f, &sp, 0.5 * mu, ws->inner, HF_ENV_EPSREL_INNER, &v,
                                 "slow-drift force spectrum", err);
    if (st == HF_OK)
        *sf = 8.0 * v; /* Newman (1974) */
    return st;
}

/* ---- checks ------------------------------------------------------------ */

static hf_status check_flow(const hf_environment *e, const char *part, const hf_env_flow *f,
                            const hf_table *t, double area, double length, double rho, double yaw,
                            double gap, hf_error *err)
{
    if (!(f->speed >= 0.0) || !isfinite(f->speed) || !isfinite(f->direction))
        return hf_error_set(err, HF_EINVAL,
                            "environment %s: %s: expected a speed >= 0 and a finite direction, "
                            "got %g m/s toward %g deg",
                            ename(e), part, f->speed, f->direction / DEG);
    if (f->speed == 0.0)
        return HF_OK;
    if (!t)
        return hf_error_set(err, HF_EINVAL,
                            "environment %s: %s needs the hull's %s_coefficients table", ename(e),
                            part, part);
    if (!(area > 0.0) || !(length > 0.0) || !(rho > 0.0) || !isfinite(area * length * rho))
        return hf_error_set(err, HF_EINVAL,
                            "environment %s: %s needs a positive hull %s_area (got %g m^2), "
                            "hull length (got %g m) and density (got %g kg/m^3)",
                            ename(e), part, part, area, length, rho);
    char what[200];
    snprintf(what, sizeof what, "environment %s: %s", ename(e), part);
    return hf_table_heading_check(t, f->direction - yaw, gap, what, err);
}

/* The fraction of the spectrum outside table t's frequency range; refused
 * above HF_ENV_OUTSIDE_MAX. */
static hf_status check_band(const hf_environment *e, const hf_spectrum *s, const hf_table *t,
                            gsl_integration_workspace *ws, double *frac, hf_error *err)
{
    double lo, hi;
    hf_table_freq_range(t, &lo, &hi);
    hf_status st = hf_spectrum_outside(s, lo, hi, ws, frac, err);
    if (st != HF_OK)
        return st;
    if (*frac > HF_ENV_OUTSIDE_MAX)
        return hf_error_set(err, HF_EINVAL,
                            "environment %s: waves: %.3g %% of the spectrum's energy (Hs %g m, "
                            "Tp %g s) lies outside the %g to %g rad/s of %s (at most %g %% "
                            "allowed); extend the table",
                            ename(e), 100.0 * *frac, s->hs, s->tp, lo, hi, hf_table_name(t),
                            100.0 * HF_ENV_OUTSIDE_MAX);
    return HF_OK;
}

static hf_status check_hull_dynamics(const hf_env_hull *h, const hf_environment *e, hf_error *err)
{
    for (int i = 0; i < 3; i++) {
        if (!(h->inertia[i] > 0.0) || !isfinite(h->inertia[i]))
            return hf_error_set(err, HF_EINVAL,
                                "environment %s: waves need a positive %s inertia (mass plus "
                                "added mass), got %g",
                                ename(e), dof_name[i], h->inertia[i]);
        if (!(h->damping[i] > 0.0 && h->damping[i] < 1.0))
            return hf_error_set(err, HF_EINVAL,
                                "environment %s: waves need a %s damping ratio between 0 and 1 "
                                "(fraction of critical), got %g",
                                ename(e), dof_name[i], h->damping[i]);
    }
    if (!h->raos || !h->drift)
        return hf_error_set(err, HF_EINVAL, "environment %s: waves need the hull's %s table",
                            ename(e), h->raos ? "drift" : "raos");
    return HF_OK;
}

static hf_status check_waves(const hf_env_hull *h, const hf_environment *e, double yaw,
                             hf_env_workspace *ws, double outside[2], hf_error *err)
{
    hf_spectrum s;
    hf_error sub;
    hf_error_clear(&sub);
    if (!isfinite(e->waves.direction))
        return hf_error_set(err, HF_EINVAL, "environment %s: waves: direction is not finite",
                            ename(e));
    hf_status st =
        hf_spectrum_jonswap_init(&s, e->waves.hs, e->waves.tp, e->waves.gamma, ws->inner, &sub);
    if (st != HF_OK)
        return hf_error_set(err, st, "environment %s: %s", ename(e), sub.text);
    if ((st = check_hull_dynamics(h, e, err)) != HF_OK)
        return st;
    char what[200];
    snprintf(what, sizeof what, "environment %s: waves", ename(e));
    double rel = e->waves.direction - yaw, frac[2];
    if ((st = hf_table_heading_check(h->raos, rel, h->heading_gap, what, err)) != HF_OK ||
        (st = hf_table_heading_check(h->drift, rel, h->heading_gap, what, err)) != HF_OK ||
        (st = check_band(e, &s, h->raos, ws->inner, &frac[0], err)) != HF_OK ||
        (st = check_band(e, &s, h->drift, ws->inner, &frac[1], err)) != HF_OK)
        return st;
    if (outside) {
        outside[0] = frac[0];
        outside[1] = frac[1];
    }
    return HF_OK;
}

hf_status hf_env_check(const hf_env_hull *h, const hf_environment *e, double yaw,
                       hf_env_workspace *ws, double outside[2], hf_error *err)
{
    if (!h || !e || !ws)
        return hf_error_set(err, HF_EINVAL, "environment: no hull, environment or workspace");
    if (outside)
        outside[0] = outside[1] = 0.0;
    if (!isfinite(yaw))
        return hf_error_set(err, HF_EINVAL, "environment %s: hull yaw is not finite", ename(e));
    if (!(e->duration > 0.0) || !isfinite(e->duration))
        return hf_error_set(err, HF_EINVAL,
                            "environment %s: duration: expected a positive time, got %g s",
                            ename(e), e->duration);
    hf_status st = HF_OK;
    if (e->has_wind)
        st = check_flow(e, "wind", &e->wind, h->wind, h->wind_area, h->length, h->air_density, yaw,
                        h->heading_gap, err);
    if (st == HF_OK && e->has_current)
        st = check_flow(e, "current", &e->current, h->current, h->current_area, h->length,
                        h->water_density, yaw, h->heading_gap, err);
    if (st == HF_OK && e->has_waves)
        st = check_waves(h, e, yaw, ws, outside, err);
    return st;
}

/* ---- mean loads -------------------------------------------------------- */

/* F = 1/2 rho C A V^2 along hull x and y, M = 1/2 rho Cmz A L V^2 (issue 14;
 * the usual drag-coefficient form). */
static void flow_load(const hf_table *t, double rho, double area, double length,
                      const hf_env_flow *f, double yaw, double out[3])
{
    double c[3], q = 0.5 * rho * f->speed * f->speed;
    hf_table_eval(t, 0.0, f->direction - yaw, c);
    out[0] = q * area * c[0];
    out[1] = q * area * c[1];
    out[2] = q * area * length * c[2];
}

hf_status hf_env_mean_load(const hf_env_hull *h, const hf_environment *e, double yaw,
                           hf_env_workspace *ws, hf_env_mean *out, hf_error *err)
{
    hf_status st = hf_env_check(h, e, yaw, ws, NULL, err);
    if (st != HF_OK)
        return st;
    memset(out, 0, sizeof *out);
    if (e->has_wind && e->wind.speed > 0.0)
        flow_load(h->wind, h->air_density, h->wind_area, h->length, &e->wind, yaw, out->wind);
    if (e->has_current && e->current.speed > 0.0)
        flow_load(h->current, h->water_density, h->current_area, h->length, &e->current, yaw,
                  out->current);
    if (e->has_waves) {
        hf_spectrum s;
        st = hf_spectrum_jonswap_init(&s, e->waves.hs, e->waves.tp, e->waves.gamma, ws->inner, err);
        for (int i = 0; st == HF_OK && i < 3; i++) {
            spec_params sp = {&s, h->drift, e->waves.direction - yaw, i, 0, 0.0};
            double v = 0.0;
            st = spec_integral(drift_f, &sp, 0.0, ws->inner, HF_ENV_EPSREL, &v, "mean wave drift",
                               err);
            out->drift[i] = 2.0 * v; /* Faltinsen (1990), ch. 5 */
        }
        if (st != HF_OK)
            return st;
    }
    for (int i = 0; i < 3; i++)
        out->total_hull[i] = out->wind[i] + out->current[i] + out->drift[i];
    double c = cos(yaw), sn = sin(yaw);
    out->total_global[0] = c * out->total_hull[0] - sn * out->total_hull[1];
    out->total_global[1] = sn * out->total_hull[0] + c * out->total_hull[1];
    out->total_global[2] = out->total_hull[2];
    for (int i = 0; i < 3; i++)
        if (!isfinite(out->total_global[i]) || !isfinite(out->total_hull[i]))
            return hf_error_set(err, HF_EINVAL,
                                "environment %s: the mean load overflows (speeds, areas or "
                                "coefficients too large)",
                                ename(e));
    return HF_OK;
}

void hf_env_stiffness_hull(double K[6][6], double yaw, double k[3])
{
    double c = cos(yaw), s = sin(yaw), cross = K[0][1] + K[1][0];
    k[0] = c * c * K[0][0] + c * s * cross + s * s * K[1][1];
    k[1] = s * s * K[0][0] - c * s * cross + c * c * K[1][1];
    k[2] = K[5][5];
}

/* ---- statistics and the oscillator -------------------------------------- */

hf_status hf_env_most_probable_max(double sigma, double duration, double period, double *max,
                                   hf_error *err)
{
    if (!(sigma >= 0.0) || !isfinite(sigma) || !(duration > 0.0) || !isfinite(duration) ||
        !(period > 0.0) || !isfinite(period))
        return hf_error_set(err, HF_EINVAL, "extremes: bad sigma %g, duration %g s or period %g s",
                            sigma, duration, period);
    double n = duration / period;
    if (n < 1.0)
        return hf_error_set(err, HF_EINVAL,
                            "extremes: the duration %g s is shorter than one period (%g s): "
                            "no maximum can be estimated",
                            duration, period);
    *max = sigma * sqrt(2.0 * log(n)); /* Longuet-Higgins (1952), Rayleigh peaks */
    return HF_OK;
}

typedef struct {
    const hf_env_fspec *sf;
    double k, m, c;
} osc_params;

/* S_F(mu) |H(mu)|^2, H = 1 / (k - M mu^2 + i c mu). */
static double osc_f(double mu, void *p)
{
    const osc_params *op = p;
    double re = op->k - op->m * mu * mu, im = op->c * mu;
    return op->sf->eval(mu, op->sf->params) / (re * re + im * im);
}

hf_status hf_env_oscillator_variance(const hf_env_fspec *sf, double k, double m, double zeta,
                                     double epsrel, hf_env_workspace *ws, double *var,
                                     hf_error *err)
{
    if (!sf || !sf->eval || !ws || !(k > 0.0) || !(m > 0.0) || !(zeta > 0.0) ||
        !isfinite(k * m * zeta) || !(epsrel > 0.0))
        return hf_error_set(err, HF_EINVAL,
                            "oscillator: expected positive stiffness, inertia and damping "
                            "ratio, got %g, %g, %g",
                            k, m, zeta);
    osc_params op = {sf, k, m, 2.0 * zeta * sqrt(k * m)};
    gsl_function f = {osc_f, &op};
    gsl_integration_workspace *w = ws->outer;
    double wn = sqrt(k / m), edge[4] = {0.0, 0.5 * wn, wn, 2.0 * wn}, sum = 0.0, r, e;
    int rc = 0;
    for (int i = 0; rc == 0 && i < 3; i++) {
        rc = gsl_integration_qag(&f, edge[i], edge[i + 1], 0.0, epsrel, w->limit, GSL_INTEG_GAUSS21,
                                 w, &r, &e);
        sum += r;
    }
    if (rc == 0)
        rc = gsl_integration_qagiu(&f, edge[3], 0.0, epsrel, w->limit, w, &r, &e);
    sum += r;
    if (rc != 0 || !isfinite(sum))
        return hf_error_set(err, HF_ENOCONV, "oscillator: response variance quadrature failed: %s",
                            rc ? gsl_strerror(rc) : "non-finite force spectrum");
    *var = sum;
    return HF_OK;
}

double hf_env_white_noise_variance(double sf_at_wn, double k, double m, double zeta)
{
    double c = 2.0 * zeta * sqrt(k * m);
    return M_PI * sf_at_wn / (2.0 * k * c);
}

/* ---- motions ----------------------------------------------------------- */

typedef struct {
    const hf_spectrum *s;
    const hf_table *drift;
    double heading;
    int dof;
    hf_env_workspace *ws;
    hf_error *err;
    hf_status st; /* first failure of the inner integral */
} newman_params;

static double newman_eval(double mu, void *p)
{
    newman_params *np = p;
    double v = 0.0;
    hf_status st =
        hf_env_slow_drift_spectrum(np->s, np->drift, np->heading, np->dof, mu, np->ws, &v, np->err);
    if (st != HF_OK) {
        if (np->st == HF_OK)
            np->st = st;
        return NAN;
    }
    return v;
}

/* Low-frequency response of one DOF: T_n, full and white-noise variances,
 * extremes over N = duration / T_n. */
static hf_status lf_dof(const hf_spectrum *s, const hf_env_hull *h, const hf_environment *e,
                        double rel, int i, hf_env_workspace *ws, hf_env_dof *d, hf_error *err)
{
    newman_params np = {s, h->drift, rel, i, ws, err, HF_OK};
    hf_env_fspec sf = {newman_eval, &np};
    double wn = sqrt(d->stiffness / d->inertia), sf_wn;
    hf_status st = hf_env_oscillator_variance(&sf, d->stiffness, d->inertia, h->damping[i],
                                              HF_ENV_EPSREL_OUTER, ws, &d->lf_var, err);
    if (np.st != HF_OK)
        return np.st;
    if (st == HF_OK)
        st = hf_env_slow_drift_spectrum(s, h->drift, rel, i, wn, ws, &sf_wn, err);
    if (st != HF_OK)
        return st;
    d->lf_var_white = hf_env_white_noise_variance(sf_wn, d->stiffness, d->inertia, h->damping[i]);
    d->lf_sigma = sqrt(d->lf_var);
    d->lf_sig = 2.0 * d->lf_sigma;
    return hf_env_most_probable_max(d->lf_sigma, e->duration, d->lf_period, &d->lf_max, err);
}

/* Wave-frequency response of one DOF: variance int |RAO|^2 S dw, T_z from
 * the response's m0 and m2, extremes over N = duration / T_z. */
static hf_status wf_dof(const hf_spectrum *s, const hf_env_hull *h, const hf_environment *e,
                        double rel, int i, hf_env_workspace *ws, hf_env_dof *d, hf_error *err)
{
    spec_params sp = {s, h->raos, rel, i, 0, 0.0};
    double m2 = 0.0;
    hf_status st = spec_integral(rao_f, &sp, 0.0, ws->inner, HF_ENV_EPSREL, &d->wf_var,
                                 "wave-frequency response", err);
    if (st != HF_OK || d->wf_var == 0.0)
        return st;
    sp.power = 2;
    st = spec_integral(rao_f, &sp, 0.0, ws->inner, HF_ENV_EPSREL, &m2, "wave-frequency response",
                       err);
    if (st != HF_OK)
        return st;
    d->wf_tz = 2.0 * M_PI * sqrt(d->wf_var / m2);
    d->wf_sigma = sqrt(d->wf_var);
    d->wf_sig = 2.0 * d->wf_sigma;
    return hf_env_most_probable_max(d->wf_sigma, e->duration, d->wf_tz, &d->wf_max, err);
}

hf_status hf_env_motion(const hf_env_hull *h, const hf_environment *e, double yaw,
                        const double k[3], hf_env_workspace *ws, hf_env_motion_result *out,
                        hf_error *err)
{
    hf_status st = hf_env_check(h, e, yaw, ws, NULL, err);
    if (st != HF_OK)
        return st;
    if (!k || !out)
        return hf_error_set(err, HF_EINVAL, "environment %s: no stiffness or result", ename(e));
    memset(out, 0, sizeof *out);
    for (int i = 0; i < 3; i++) {
        hf_env_dof *d = &out->dof[i];
        d->stiffness = k[i];
        d->inertia = h->inertia[i];
        if (k[i] > 0.0 && h->inertia[i] > 0.0 && isfinite(k[i])) {
            d->damping = 2.0 * h->damping[i] * sqrt(k[i] * h->inertia[i]);
            d->lf_period = 2.0 * M_PI * sqrt(h->inertia[i] / k[i]);
        }
    }
    if (!e->has_waves)
        return HF_OK;
    for (int i = 0; i < 3; i++)
        if (!(k[i] > 0.0) || !isfinite(k[i]))
            return hf_error_set(err, HF_EUNSUPPORTED,
                                "environment %s: the mooring's %s stiffness at the mean pose is "
                                "%g, not positive: no natural period, no slow-drift response",
                                ename(e), dof_name[i], k[i]);
    st = hf_spectrum_jonswap_init(&out->spectrum, e->waves.hs, e->waves.tp, e->waves.gamma,
                                  ws->inner, err);
    double rel = e->waves.direction - yaw;
    for (int i = 0; st == HF_OK && i < 3; i++) {
        st = lf_dof(&out->spectrum, h, e, rel, i, ws, &out->dof[i], err);
        if (st == HF_OK)
            st = wf_dof(&out->spectrum, h, e, rel, i, ws, &out->dof[i], err);
        const hf_env_dof *d = &out->dof[i];
        if (st == HF_OK && !isfinite(d->lf_max + d->wf_max + d->lf_var_white + d->wf_tz))
            st = hf_error_set(err, HF_EINVAL,
                              "environment %s: the %s motion overflows (inputs too large)",
                              ename(e), dof_name[i]);
    }
    return st;
}

/* ---- design offset ----------------------------------------------------- */

hf_status hf_env_design_offset(const double mean_xy[2], double mean_yaw, double yaw,
                               const hf_env_motion_result *m, double fallback_direction,
                               hf_env_design *out, hf_error *err)
{
    if (!mean_xy || !m || !out || !isfinite(mean_xy[0]) || !isfinite(mean_xy[1]) ||
        !isfinite(mean_yaw) || !isfinite(yaw) || !isfinite(fallback_direction))
        return hf_error_set(err, HF_EINVAL, "design offset: missing or non-finite input");
    memset(out, 0, sizeof *out);
    out->mean = hypot(mean_xy[0], mean_xy[1]);
    out->from_fallback = !(out->mean > 1e-6);
    out->direction = out->from_fallback ? fallback_direction : atan2(mean_xy[1], mean_xy[0]);
    double ux = cos(out->direction - yaw), uy = sin(out->direction - yaw); /* hull axes */
    const hf_env_dof *s = &m->dof[0], *w = &m->dof[1], *z = &m->dof[2];
    out->lf_sig = hypot(ux * s->lf_sig, uy * w->lf_sig);
    out->lf_max = hypot(ux * s->lf_max, uy * w->lf_max);
    out->wf_sig = hypot(ux * s->wf_sig, uy * w->wf_sig);
    out->wf_max = hypot(ux * s->wf_max, uy * w->wf_max);
    /* API RP 2SK (3rd ed., 2005), quasi-static method: from memory. */
    out->combo_lf_max = out->lf_max + out->wf_sig;
    out->combo_wf_max = out->lf_sig + out->wf_max;
    out->offset = out->mean + fmax(out->combo_lf_max, out->combo_wf_max);
    out->offset_xy[0] = out->offset * cos(out->direction);
    out->offset_xy[1] = out->offset * sin(out->direction);
    out->yaw_mean = mean_yaw;
    out->yaw_combo_lf_max = z->lf_max + z->wf_sig;
    out->yaw_combo_wf_max = z->lf_sig + z->wf_max;
    double sense = mean_yaw < 0.0 ? -1.0 : 1.0;
    out->yaw = mean_yaw + sense * fmax(out->yaw_combo_lf_max, out->yaw_combo_wf_max);
    return HF_OK;
}
