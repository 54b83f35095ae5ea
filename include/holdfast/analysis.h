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

/* ---- balance over a water-level envelope ---- */

/* Where a result of an envelope was found: load index (into m->loads; (size_t)-1 when
 * nothing was found), condition (0 intact, k line k-1 broken) and still water level
 * (m above the datum). */
typedef struct {
    size_t load, cond;
    double level;
} hf_analysis_where;

/* The worst of one line over an envelope (every level, load case and solved
 * condition in which the line is intact).  Values without a `where` found
 * (load == (size_t)-1) are 0. */
typedef struct {
    double tension;     /* N, the largest tension along the line */
    double utilisation; /* -, T/MBL of its most loaded section, at that condition */
    hf_analysis_where at;
    double min_factor; /* -, the smallest MBL/T (the largest utilisation) */
    hf_analysis_where factor_at;
    /* its anchor (criteria.h, hf_anchor_criterion) */
    double anchor_load; /* N, the largest resultant on the anchor */
    hf_analysis_where anchor_load_at;
    double angle; /* rad, the largest uplift angle at the anchor */
    hf_analysis_where angle_at;
    double sliding; /* -, the smallest gravity-block sliding factor (has_sliding) */
    hf_analysis_where sliding_at;
    double uplift; /* -, the smallest gravity-block uplift factor (has_uplift) */
    hf_analysis_where uplift_at;
    size_t anchor_failed;             /* conditions whose anchor check failed */
    hf_analysis_where anchor_fail_at; /* the first of them */
} hf_analysis_envelope_line;

/* The results of a balance run over a water-level envelope: nloads load
 * cases x nlevels levels x (1 + nlines) conditions. */
typedef struct {
    size_t nlevels;
    double *level; /* m above the datum, the levels run, in order */
    size_t nloads; /* load cases run */
    size_t nlines;
    hf_analysis_balance_count count; /* summed over the levels (count.loads: load-level runs) */
    hf_analysis_envelope_line *line; /* nlines */
    size_t overloaded;               /* conditions with a line at or beyond its MBL */
    size_t overload_line;            /* the most utilised overloaded line, or (size_t)-1 */
    double overload_utilisation;     /* its utilisation, - */
    double overload_tension;         /* its tension, N */
    hf_analysis_where overload_at;   /* and where */
    hf_analysis_where first_failed;  /* the first condition that failed, load (size_t)-1 none */
} hf_analysis_envelope;

/* The still water levels (m above the datum) a design check of m covers: the
 * case's site.water_levels when it gives them, else the one level
 * site.water_level.  Writes at most cap levels into out; returns how many
 * there are (>= 1). */
size_t hf_analysis_envelope_levels(const hf_model *m, double *out, size_t cap);

/* Allocates an envelope for the lines of m and nlevels >= 1 levels.  NULL with
 * err set (HF_EINVAL for 0 levels, HF_ENOMEM). */
hf_analysis_envelope *hf_analysis_envelope_alloc(const hf_model *m, size_t nlevels, hf_error *err);
void hf_analysis_envelope_free(hf_analysis_envelope *e);

/* Callbacks of an envelope run: `each` as for one balance run (its ctx is
 * passed to every callback, level_begin included; progress counts the
 * conditions of the whole envelope), and level_begin (may be NULL) before
 * each level: index k < nlevels, the level (m above the datum) and the model
 * at that level (a copy of m with site.water_level set; valid until the next
 * level_begin or the end of the run; the load pointers handed to `each` point
 * into it, with the same indices as in m). */
typedef struct {
    hf_analysis_balance_sink each;
    hf_status (*level_begin)(void *ctx, size_t k, double level, const hf_model *at, hf_error *err);
} hf_analysis_envelope_sink;

/* Runs hf_analysis_balance_run (load cases m->loads[which[k]], k < nwhich;
 * which NULL: all) at every level of e->level (set by the caller, e.g. from
 * hf_analysis_envelope_levels or a command-line range), the levels outer,
 * and fills e with the per-line worst values, the overload and the first
 * failure.  Each level's results equal those of a case edited to that
 * site.water_level (the copy is re-resolved through the model's parameter
 * "site.water_level"; a level equal to m's own is run on an unchanged copy).
 * Returns HF_OK, HF_EINVAL (a level below the seabed or not finite, a bad load
 * or index), HF_ENOMEM, or a sink's status, with err set. */
hf_status hf_analysis_envelope_run(hf_analysis_envelope *e, const hf_model *m, const size_t *which,
                                   size_t nwhich, const hf_analysis_envelope_sink *sink,
                                   hf_error *err);

#endif
