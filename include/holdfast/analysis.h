/* analysis.h - study drivers: one pose (lines, stiffness), restoring curves, balance runs.
 *
 * Flow: case -> model -> line solve -> spread -> balance -> **analysis** -> writers.
 * The commands (holdfast lines, stiffness, curve, balance, plot), the studies
 * of holdfast run and the report all get their numbers from these drivers,
 * so each computation has one implementation.  A driver returns its results
 * in memory (or hands each result to a caller's sink, for balance runs whose
 * results would not fit in memory as a whole), never prints and never opens
 * a file.  Derived quantities that writers need (restoring force, stiffness
 * along a direction, allowed tension) are computed here, not in the writers.
 *
 * Units are SI throughout (m, N, N m, rad). */
#ifndef HOLDFAST_ANALYSIS_H
#define HOLDFAST_ANALYSIS_H

#include <stddef.h>
#include "holdfast/balance.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"
#include "holdfast/status.h"

/* ---- one pose: every line solved, optionally the 6x6 stiffness ---- */

/* The spread solved at one pose.  Initialise with hf_analysis_pose_init,
 * release with hf_analysis_pose_clear (safe on an initialised, unsolved or
 * failed value).  res points into the owned workspace and stays valid until
 * the next solve or the clear. */
typedef struct {
    hf_pose pose;         /* the case's rest pose plus the offset */
    hf_spread_result res; /* the solve (filled also when a line failed) */
    double K[6][6];       /* analytic stiffness, N/m ... N m/rad (zero unless asked) */
    hf_spread *ws;        /* owned workspace */
} hf_analysis_pose;

void hf_analysis_pose_init(hf_analysis_pose *a);
void hf_analysis_pose_clear(hf_analysis_pose *a);

/* Solves every line of m (borrowed; must outlive a) with the hull at the
 * rest pose plus offset (m, m, rad; hf_spread_pose_offset); with stiffness
 * != 0 also the 6x6 stiffness (hf_spread_stiffness).  Returns HF_OK, HF_ENOMEM
 * (workspace), or the spread solve's status with err set; a->res is filled
 * whenever a workspace exists, so a caller can show the lines that did
 * solve (res.failed_line names the first that did not; (size_t)-1 when the
 * pose itself was refused). */
hf_status hf_analysis_pose_solve(hf_analysis_pose *a, const hf_model *m, const double offset[3],
                                 int stiffness, hf_error *err);

/* Allowed tension of line i of m: the smallest MBL of its sections over the
 * intact factor of the criteria (N); 0 when there is no factor or no MBL. */
double hf_analysis_allowed_tension(const hf_model *m, size_t i);

/* Global position g (x, y, z in m; z = 0 the still water level) of profile
 * point p of line i (hf_line_profile: x from the anchor in the line's
 * vertical plane, z above the flat seabed) in the solve r of m. */
void hf_analysis_profile_point(const hf_model *m, const hf_spread_result *r, size_t i,
                               const hf_line_point *p, double g[3]);

/* ---- restoring curve ---- */

/* A restoring curve: n offsets from `from` by `step` along `direction`
 * (rad counterclockwise from global x), heading fixed.
 *
 * Policy (the one every consumer sees): every offset is attempted in order;
 * each is warm-started from the previous offset that solved; an offset that
 * does not solve is recorded (status, and the first failure's message in
 * first_error) with its values NaN, and the workspace forgets its warm
 * starts so the next offset starts cold (a failed solve may leave states
 * that mislead the next one).  Whether a failed offset is an error is the
 * consumer's choice: 'holdfast curve' stops at the first one, a curve study
 * keeps the row empty, a figure draws a gap. */
typedef struct {
    size_t n, nlines;
    double direction; /* rad */
    /* n values each, point k at [k]; NaN (lines: (size_t)-1) where status[k] != HF_OK */
    hf_status *status;            /* HF_OK, or why this offset did not solve */
    double *offset;               /* m along the direction */
    double *restoring;            /* N: -(Fx cos + Fy sin), minus the mooring force along it */
    double *stiffness;            /* N/m: d(restoring)/d(offset) = d^T K_h d, d = (cos, sin) */
    double *force_x, *force_y;    /* N: mooring force on the hull, global axes */
    double *moment_z;             /* N m: mooring yaw moment about the reference point */
    double *max_tension;          /* N: largest tension along any intact line */
    size_t *max_tension_line;     /* its index, or (size_t)-1 */
    double *max_utilisation;      /* largest section utilisation, - */
    size_t *max_utilisation_line; /* its index, or (size_t)-1 */
    /* n x nlines, row-major (point k, line i at [k * nlines + i]); NaN where failed */
    double *fairlead_tension; /* N */
    double *line_tension;     /* N, largest along the line (0 broken) */
    double *utilisation;      /* -, largest section utilisation */
    size_t nfailed;           /* offsets that did not solve */
    size_t first_failed;      /* index of the first, or (size_t)-1 */
    hf_error first_error;     /* its message ("curve at offset 2.5 m: ...") */
} hf_analysis_curve;

/* Allocates a curve of n >= 1 points for the lines of m.  NULL with err set
 * (HF_ENOMEM, or HF_EINVAL for n == 0). */
hf_analysis_curve *hf_analysis_curve_alloc(const hf_model *m, size_t n, hf_error *err);
void hf_analysis_curve_free(hf_analysis_curve *c);

/* Computes c (allocated for m) over the offsets FROM, FROM + STEP, ... of
 * the range from:to:step, k < c->n, valued by the one range rule
 * (hf_study_vary_value: the end point on the grid is TO itself).
 * Returns HF_OK when the curve was computed (failed offsets are recorded,
 * see the policy above), HF_ENOMEM (workspace) or HF_EINVAL (direction,
 * from, to or step not finite) with err set. */
hf_status hf_analysis_curve_compute(hf_analysis_curve *c, const hf_model *m, double direction,
                                    double from, double to, double step, hf_error *err);

/* As hf_analysis_curve_compute, at the c->n offsets offsets[k] (m along
 * the direction, any order; offsets may be c->offset itself), under the same
 * policy.  HF_EINVAL when the direction or an offset is not finite. */
hf_status hf_analysis_curve_compute_at(hf_analysis_curve *c, const hf_model *m, double direction,
                                       const double *offsets, hf_error *err);

/* ---- balance runs: load cases, intact and each line broken ---- */

/* Receives the results of hf_analysis_balance_run as they are found (a run
 * over many lines would not fit in memory as a whole).  Every callback may
 * be NULL.  A callback returning anything but HF_OK stops the run with that
 * status (its message in err). */
typedef struct {
    void *ctx;
    /* a load case is about to be solved; force = resultant (Fx, Fy N, Mz N m) */
    hf_status (*load_begin)(void *ctx, const hf_load *l, const double force[3], hf_error *err);
    /* one condition's result (valid during the call) */
    hf_status (*condition)(void *ctx, const hf_load *l, const hf_balance_result *r, hf_error *err);
    /* every condition of the load is done: the intact condition's status and
     * offset (surge m, sway m, yaw rad from the rest pose) */
    hf_status (*load_end)(void *ctx, const hf_load *l, hf_status intact, const double offset[3],
                          hf_error *err);
    /* conditions done so far of the total, called after each condition */
    void (*progress)(void *ctx, size_t done, size_t total);
} hf_analysis_balance_sink;

/* Counts of a balance run. */
typedef struct {
    size_t loads;      /* load cases run */
    size_t conditions; /* conditions solved (rows) */
    size_t passed;     /* conditions that passed every criterion */
    size_t failed;     /* conditions that failed a criterion (includes no result) */
    size_t noresult;   /* conditions without an equilibrium */
} hf_analysis_balance_count;

/* Runs the load cases m->loads[which[k]], k < nwhich, in that order (which
 * NULL: every load case of m in order): for each, checks the load (hf_balance_load_force), then
 * solves every condition (intact, then each line broken; hf_balance_solve, warm starts as
 * hf_balance_run) and hands each result to the sink.  Fills *count. Returns HF_OK (a condition
 * without equilibrium is a result, not an error), HF_EINVAL for a bad load, index or model,
 * HF_ENOMEM, or a sink's status. The sink's callbacks run on the calling thread. */
hf_status hf_analysis_balance_run(const hf_model *m, const size_t *which, size_t nwhich,
                                  const hf_analysis_balance_sink *sink,
                                  hf_analysis_balance_count *count, hf_error *err);

#endif
