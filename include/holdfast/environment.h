/* environment.h - environments on a moored hull: mean loads, slow-drift and
 * wave-frequency motions, extreme statistics and the design offset of the
 * quasi-static design method.
 *
 * Flow: case -> model -> spread / balance (mean pose, 6x6 stiffness)
 *       -> **environment** (with table, spectrum) -> design study -> writers.
 * Takes plain structs in SI units; never reads files, never prints; the
 * caller owns every workspace.  Formulas and sources: docs/design.md.
 *
 * Conventions (SI: m, s, N, N m, rad, kg, kg m^2):
 *   - Directions (wind, current, waves) are where the environment goes
 *     toward, counter-clockwise from the global x axis, like the loads.
 *   - The relative heading of a table lookup is direction - hull yaw, the
 *     hull yaw being the heading of the hull's x axis at the mean pose.
 *   - The three degrees of freedom are surge and sway along the hull's x and
 *     y axes and yaw about the vertical, in that order (index 0, 1, 2), in
 *     m, m and rad.
 *
 * A design study uses it like this (one environment, one condition):
 *   1. mean pose: hf_env_mean_pose(h, e, heading, eq = balance) finds the
 *      yaw at which the loads (which depend on the relative headings) and
 *      the equilibrium agree;
 *   2. k = hf_env_stiffness_hull(K at the mean pose, yaw);
 *   3. hf_env_motion(h, e, yaw, k) -> LF and WF statistics per DOF;
 *   4. hf_env_design_offset(mean offset, mean yaw offset, yaw, motions) ->
 *      design pose; the line tensions are solved there by the spread.
 * hf_env_check reports table coverage and refuses what the tables cannot
 * support, before any of this. */
#ifndef HOLDFAST_ENVIRONMENT_H
#define HOLDFAST_ENVIRONMENT_H

#include <stddef.h>
#include <gsl/gsl_integration.h>
#include "holdfast/spectrum.h"
#include "holdfast/status.h"
#include "holdfast/table.h"

#define HF_ENV_DURATION_DEFAULT 10800.0 /* s, 3 h */
#define HF_ENV_GAMMA_DEFAULT 3.3        /* JONSWAP peak factor (DNV-RP-C205 common value) */
#define HF_ENV_AIR_DENSITY 1.225        /* kg/m^3, ISA sea level (ISO 2533) */
#define HF_ENV_OUTSIDE_MAX 1e-3         /* largest spectral energy fraction outside a table */
#define HF_ENV_LIMIT 1000               /* intervals per quadrature workspace */
#define HF_ENV_EPSREL 1e-7              /* relative tolerance, one-level integrals */
#define HF_ENV_EPSREL_INNER 1e-8        /* relative tolerance, Newman's inner integral */
#define HF_ENV_EPSREL_OUTER 1e-6        /* relative tolerance, slow-drift variance */

/* A steady flow (wind or current). */
typedef struct {
    double speed;     /* m/s, >= 0 */
    double direction; /* rad, global, toward */
} hf_env_flow;

/* A sea state (JONSWAP). */
typedef struct {
    double hs;        /* significant wave height, m (> 0) */
    double tp;        /* peak period, s (> 0) */
    double gamma;     /* peak enhancement factor, - (1 .. HF_SPECTRUM_GAMMA_MAX) */
    double direction; /* rad, global, toward */
} hf_env_waves;

/* One environment; any part may be absent. */
typedef struct {
    const char *name; /* for messages; may be NULL */
    int has_wind, has_current, has_waves;
    hf_env_flow wind, current;
    hf_env_waves waves;
    double duration; /* storm duration for the extremes, s (> 0) */
} hf_environment;

/* The hull as the design method sees it.  Tables are borrowed (may be NULL
 * when the environment does not need them; hf_env_check says which). */
typedef struct {
    double inertia[3];       /* mass + added mass: surge kg, sway kg, yaw kg m^2 (> 0) */
    double damping[3];       /* low-frequency damping, fraction of critical (0 < z < 1) */
    const hf_table *raos;    /* HF_TABLE_RAO */
    const hf_table *drift;   /* HF_TABLE_DRIFT */
    const hf_table *wind;    /* HF_TABLE_COEF */
    const hf_table *current; /* HF_TABLE_COEF */
    double wind_area;        /* reference area for wind, m^2 */
    double current_area;     /* reference area for current, m^2 */
    double length;           /* reference length for the yaw moments, m */
    double air_density;      /* kg/m^3 (HF_ENV_AIR_DENSITY) */
    double water_density;    /* kg/m^3 (the site's) */
    double heading_gap;      /* largest heading gap a table may bridge, rad
                              * (HF_TABLE_HEADING_GAP_DEFAULT) */
} hf_env_hull;

/* Mean loads in hull axes (x, y: N; yaw: N m) and their global sum. */
typedef struct {
    double wind[3], current[3], drift[3]; /* hull axes: Fx, Fy, Mz */
    double total_hull[3];                 /* hull axes: Fx, Fy, Mz */
    double total_global[3];               /* global Fx, Fy (N) and Mz (N m) */
} hf_env_mean;

/* Low- and wave-frequency response of one degree of freedom. */
typedef struct {
    double stiffness;                /* k, N/m or N m/rad */
    double inertia;                  /* M, kg or kg m^2 */
    double damping;                  /* c = 2 zeta sqrt(k M), N s/m or N m s/rad */
    double lf_period;                /* natural period T_n = 2 pi sqrt(M / k), s */
    double lf_var;                   /* variance, full integral, m^2 or rad^2 */
    double lf_var_white;             /* variance, white-noise approximation, m^2 or rad^2 */
    double lf_sigma, lf_sig, lf_max; /* sigma, 2 sigma, sigma sqrt(2 ln(duration / T_n)) */
    double wf_var;                   /* variance, m^2 or rad^2 */
    double wf_tz; /* zero-crossing period 2 pi sqrt(m0 / m2), s (0 when wf_var is 0) */
    double wf_sigma, wf_sig, wf_max; /* sigma, 2 sigma, sigma sqrt(2 ln(duration / T_z)) */
} hf_env_dof;

/* Motions of one environment at one mean pose. */
typedef struct {
    hf_spectrum spectrum; /* valid when the environment has waves */
    hf_env_dof dof[3];    /* surge, sway, yaw */
} hf_env_motion_result;

/* Design offset along a direction, and in yaw. */
typedef struct {
    double direction;                      /* rad, global: of the mean offset (or the fallback) */
    int from_fallback;                     /* 1 when the mean offset was too small to give one */
    double mean;                           /* |mean horizontal offset|, m */
    double lf_sig, lf_max, wf_sig, wf_max; /* motions along direction, m */
    double combo_lf_max;                   /* LF max + WF significant, m */
    double combo_wf_max;                   /* LF significant + WF max, m */
    double offset;                         /* mean + the larger combination, m */
    double offset_xy[2];                   /* design offset vector from rest, global, m */
    double yaw_mean;                       /* mean yaw from rest, rad */
    double yaw_combo_lf_max, yaw_combo_wf_max; /* the same combinations in yaw, rad */
    double yaw; /* design yaw from rest, rad, in the sense of the mean yaw */
    /* The two combinations as whole poses (x, y from rest in m, global; yaw
     * from rest in rad), horizontal and yaw combined alike: pose_lf_max
     * with LF max + WF significant, pose_wf_max with LF significant + WF
     * max.  Solve the tensions at both and keep the larger per line; the
     * envelope pose (offset_xy, yaw) takes the larger of each separately. */
    double pose_lf_max[3], pose_wf_max[3];
} hf_env_design;

/* Quadrature workspace of the module (two GSL workspaces of HF_ENV_LIMIT
 * intervals: inner and outer).  Not thread-safe; one per thread. */
typedef struct hf_env_workspace hf_env_workspace;

/* A new workspace owned by the caller, or NULL with HF_ENOMEM in err. */
hf_env_workspace *hf_env_workspace_alloc(hf_error *err);
/* Frees a workspace; NULL is allowed. */
void hf_env_workspace_free(hf_env_workspace *ws);

/* Defaults: no parts, duration HF_ENV_DURATION_DEFAULT, gamma
 * HF_ENV_GAMMA_DEFAULT. */
void hf_environment_default(hf_environment *e);

/* Defaults for a hull: zeros, no tables, air density HF_ENV_AIR_DENSITY,
 * water density 1025 kg/m^3, heading gap HF_TABLE_HEADING_GAP_DEFAULT. */
void hf_env_hull_default(hf_env_hull *h);

/* Validates the environment and the hull data it needs, and checks that the
 * tables cover the relative headings at hull yaw `yaw` (rad) and that the
 * wave spectrum holds at most HF_ENV_OUTSIDE_MAX of its energy outside the
 * RAO and drift tables' frequency ranges.  The fractions found are stored in
 * outside[0] (RAOs) and outside[1] (drift) when outside is not NULL (0 when
 * there are no waves).  HF_OK, or HF_EINVAL with a message naming the
 * environment, the quantity and the table file; HF_ENOCONV (quadrature). */
hf_status hf_env_check(const hf_env_hull *h, const hf_environment *e, double yaw,
                       hf_env_workspace *ws, double outside[2], hf_error *err);

/* Mean loads at hull yaw `yaw` (rad): wind and current 1/2 rho C A V^2 (and
 * 1/2 rho Cmz A L V^2), mean wave drift 2 int S(w) D(w) dw.  Call
 * hf_env_check first; statuses as hf_env_check. */
hf_status hf_env_mean_load(const hf_env_hull *h, const hf_environment *e, double yaw,
                           hf_env_workspace *ws, hf_env_mean *out, hf_error *err);

/* The caller's mean equilibrium (e.g. hf_balance_solve for one condition):
 * given the global mean load (Fx, Fy in N, Mz in N m), fills the offset of
 * the equilibrium from rest (surge, sway in m, yaw in rad).  Returns HF_OK or
 * a failure status with err set; the failure is passed on unchanged. */
typedef hf_status (*hf_env_equilibrium_fn)(const double load[3], double offset[3], void *ctx,
                                           hf_error *err);

/* Options of hf_env_mean_pose. */
typedef struct {
    double yaw_tol;  /* |equilibrium yaw - yaw the loads were computed at|, rad (1e-9) */
    int max_iter;    /* equilibrium calls at most (50) */
    double max_step; /* largest change of yaw per iteration, rad (0.2) */
} hf_env_pose_options;

void hf_env_pose_options_default(hf_env_pose_options *o);

/* Mean pose under heading-dependent loads: finds the yaw offset x (from the
 * rest heading `heading`, rad) where the equilibrium under the loads at
 * heading + x has yaw offset x: a root of g(x) = eq(load(heading + x)).yaw - x.
 * First step: plain substitution; then secant steps (limited to max_step;
 * a substitution step when the secant is undefined).  Plain substitution
 * alone diverges when the environment's yaw moment grows with yaw faster
 * than the mooring resists (|dMz/dyaw| > k_yaw); the secant does not.
 * On HF_OK: offset (from the last equilibrium), *mean (loads at heading +
 * x) and *iterations (equilibrium calls).  Statuses: those of
 * hf_env_mean_load and of eq; HF_ENOCONV with a message when the yaw has
 * not settled after max_iter calls (no stable mean heading found).  opt may
 * be NULL (defaults). */
hf_status hf_env_mean_pose(const hf_env_hull *h, const hf_environment *e, double heading,
                           hf_env_equilibrium_fn eq, void *ctx, const hf_env_pose_options *opt,
                           hf_env_workspace *ws, double offset[3], hf_env_mean *mean,
                           int *iterations, hf_error *err);

/* Stiffness in hull axes from the 6x6 mooring stiffness K (global surge,
 * sway, heave, roll, pitch, yaw; spread.h) at hull yaw `yaw`:
 * k[0] = ex.K.ex, k[1] = ey.K.ey (ex, ey the hull's horizontal axes, over
 * the translational block), k[2] = K[5][5]. */
void hf_env_stiffness_hull(double K[6][6], double yaw, double k[3]); /* K is only read */

/* Motions at hull yaw `yaw` with stiffness k (hull axes, from
 * hf_env_stiffness_hull).  Without waves every motion is 0.  With waves:
 * HF_EUNSUPPORTED when a stiffness is not positive (no natural period) or a
 * damping ratio is not in (0, 1); HF_EINVAL when the storm is shorter than
 * a period; else as hf_env_check. */
hf_status hf_env_motion(const hf_env_hull *h, const hf_environment *e, double yaw,
                        const double k[3], hf_env_workspace *ws, hf_env_motion_result *out,
                        hf_error *err);

/* Design offset: mean_xy (global offset of the mean pose from rest, m),
 * mean_yaw (mean yaw from rest, rad), yaw (hull heading at the mean pose,
 * rad), the motions, and a fallback direction (rad, global; e.g. the waves')
 * used when |mean_xy| <= 1e-6 m.  Along the direction u the surge and sway
 * amplitudes combine as sqrt((u_x a_surge)^2 + (u_y a_sway)^2) (u_x, u_y in
 * hull axes; exact for sigma with independent surge and sway).
 * HF_EINVAL for non-finite input. */
hf_status hf_env_design_offset(const double mean_xy[2], double mean_yaw, double yaw,
                               const hf_env_motion_result *m, double fallback_direction,
                               hf_env_design *out, hf_error *err);

/* ---- building blocks (public for tests and reports) -------------------- */

/* Most probable largest of N = duration / period Rayleigh peaks of a
 * zero-mean Gaussian process of standard deviation sigma:
 * sigma sqrt(2 ln N) (Longuet-Higgins 1952).  HF_EINVAL when N < 1 or an
 * input is not finite and positive (sigma may be 0). */
hf_status hf_env_most_probable_max(double sigma, double duration, double period, double *max,
                                   hf_error *err);

/* A one-sided force spectrum S_F(mu), N^2 s/rad (or (N m)^2 s/rad). */
typedef struct {
    double (*eval)(double mu, void *params);
    void *params;
} hf_env_fspec;

/* Variance of x for M x'' + c x' + k x = F(t), c = 2 zeta sqrt(k M):
 * int_0^inf S_F(mu) / ((k - M mu^2)^2 + (c mu)^2) dmu, by GSL QAG on
 * [0, w_n/2], [w_n/2, w_n], [w_n, 2 w_n] and QAGIU on [2 w_n, inf)
 * (w_n = sqrt(k/M)), epsabs 0, epsrel `epsrel`, with ws's outer workspace.
 * HF_EINVAL for non-positive k, M or zeta; HF_ENOCONV on quadrature failure
 * or when S_F returns a non-finite value (its way to report a failure). */
hf_status hf_env_oscillator_variance(const hf_env_fspec *sf, double k, double m, double zeta,
                                     double epsrel, hf_env_workspace *ws, double *var,
                                     hf_error *err);

/* White-noise approximation of the same variance: pi S_F(w_n) / (2 k c)
 * (e.g. Newland, An Introduction to Random Vibrations). */
double hf_env_white_noise_variance(double sf_at_wn, double k, double m, double zeta);

/* Newman's approximation (Newman 1974) of the slow-drift force spectrum of
 * DOF `dof` (0 surge, 1 sway, 2 yaw) at difference frequency mu (rad/s):
 * 8 int S(w) S(w + mu) D(w + mu/2)^2 dw, D from the drift table at relative
 * heading `heading` (rad).  Uses ws's inner workspace.  HF_ENOCONV on
 * quadrature failure. */
hf_status hf_env_slow_drift_spectrum(const hf_spectrum *s, const hf_table *drift, double heading,
                                     int dof, double mu, hf_env_workspace *ws, double *sf,
                                     hf_error *err);

/* The inner GSL workspace of ws, for callers' own spectral integrals. */
gsl_integration_workspace *hf_env_workspace_inner(hf_env_workspace *ws);

#endif
