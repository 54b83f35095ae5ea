/* balance.h - mean equilibrium of a moored hull under load, intact and broken.
 *
 * Flow: case -> model -> line solve -> spread -> **balance** -> criteria ->
 * writers.  For one load case (hf_load, model.h) it finds the hull pose where
 * the mooring force balances the load in surge, sway and yaw, for the intact
 * spread and for every condition with one line broken, and evaluates the
 * criteria (criteria.h) at each equilibrium.  See docs/criteria.md.
 *
 * Model and conventions (all SI: m, N, N m, rad):
 *   - The load is fixed in the global frame: the direct force acts toward
 *     load->direction, each drag term 1/2 rho C A V^2 toward its own direction
 *     whatever the hull's yaw or offset (no relative-velocity or heading
 *     dependence), the yaw moment is about the hull reference point.
 *   - Only surge, sway and yaw are solved for.  Heave, roll and pitch are held
 *     at their rest values (the hull's hydrostatics, not modelled here, are
 *     taken to carry the vertical mooring load and its moments).
 *   - Offsets and yaw are reported relative to the rest pose (the case's hull
 *     position and heading).
 *   - Solution: Newton on the 3 DOF with the analytic stiffness sub-matrix of
 *     hf_spread_stiffness (rows/columns surge, sway, yaw), a truncated-SVD
 *     step (zero-stiffness directions are not moved), step limits and a
 *     backtracking line search, inside a homotopy (load stepping) that starts
 *     from an exact solution: the rest pose for the intact spread, the intact
 *     equilibrium for a broken-line condition.
 *   - No equilibrium (HF_ENOEQUIL) is reported when the path leaves the search
 *     region (horizontal offset beyond opt.max_offset, by default the largest
 *     horizontal distance from the rest reference point to an anchor; |yaw|
 *     beyond opt.max_yaw), when the spread has no stiffness left against the
 *     remaining unbalanced load (all resisting lines broken or slack), or when
 *     the load path reaches a limit point (the resistance peaks below the full
 *     load).  It means "none on a continuous path from the start inside the
 *     search region": see docs/criteria.md.
 *
 * The workspace borrows the model, which must outlive it. */
#ifndef HOLDFAST_BALANCE_H
#define HOLDFAST_BALANCE_H

#include <stddef.h>
#include "holdfast/criteria.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"
#include "holdfast/status.h"

#define HF_BALANCE_NONE ((size_t)-1)
#define HF_BALANCE_MESSAGE 512 /* room for a line's refusal and the load reached */

typedef struct {
    double ftol;       /* converged when |Fx|,|Fy| <= ftol * F and |Mz| <= ftol * F * Lref,
                        * F = max(load, largest line tension at the start, 1 N), Lref the
                        * yaw length scale (largest fairlead radius, >= 1 m); default 1e-8 */
    double xtol;       /* also converged when the Newton step is below xtol * search radius
                        * and the residual within 100 ftol (the line solver's noise
                        * floor); default 1e-10 */
    int max_iter;      /* Newton iterations per load step; default 40 */
    int max_steps;     /* load steps, accepted and rejected, per condition; default 400 */
    double min_step;   /* smallest load-step fraction before giving up; default 1/65536 */
    double max_offset; /* search radius for the horizontal offset, m; 0 = largest rest
                        * distance reference point -> anchor (default) */
    double max_yaw;    /* search limit on |yaw - heading|, rad; default pi/2 */
} hf_balance_options;

/* Fills o with the documented defaults. */
void hf_balance_options_default(hf_balance_options *o);

/* Names of the governing criterion of a condition. */
typedef enum {
    HF_CRIT_NONE = 0,    /* nothing checked */
    HF_CRIT_EQUILIBRIUM, /* no equilibrium was found */
    HF_CRIT_LINE,        /* line safety factor MBL/T (line index in criterion_line) */
    HF_CRIT_OFFSET,      /* horizontal offset limit */
    HF_CRIT_ANCHOR,      /* anchor check (line index in criterion_line) */
    HF_CRIT_OVERLOAD     /* a line at or beyond a section's MBL (hf_criteria_overloaded; line
                          * index in criterion_line): governs before every other check */
} hf_balance_criterion;

/* The result of one condition (intact or one line broken) of one load case.
 * Arrays have nlines entries and are owned by the workspace. */
typedef struct {
    hf_status status; /* HF_OK, HF_ENOEQUIL, HF_ENOCONV, HF_EUNSUPPORTED, HF_EINVAL */
    char message[HF_BALANCE_MESSAGE]; /* why it failed; "" when ok */
    size_t broken;                    /* index of the broken line, HF_BALANCE_NONE when intact */
    double load[3];                   /* applied Fx, Fy (N) and Mz (N m), global */
    double offset[3];   /* surge, sway (m) from the rest position; yaw (rad) from heading */
    double horizontal;  /* sqrt(surge^2 + sway^2), m */
    double residual[3]; /* mooring + load at the solution: Fx, Fy (N), Mz (N m) */
    int iterations;     /* Newton iterations, all steps */
    int steps;          /* accepted load steps */
    size_t nlines;
    double *tension;             /* largest tension along each line, N (0 broken) */
    double *utilisation;         /* T/MBL of each line's most loaded section, - */
    hf_line_criterion *line;     /* line checks (required factor by condition) */
    hf_anchor_criterion *anchor; /* anchor checks (broken line: zeroed, kind kept) */
    double max_tension;          /* N */
    size_t max_tension_line;     /* HF_BALANCE_NONE when no line carries load */
    double max_utilisation;      /* - */
    size_t max_utilisation_line;
    int offset_checked; /* 1 when criteria.max_offset > 0 */
    int offset_passed;
    int lines_passed, anchors_passed;
    size_t overloaded;              /* lines at or beyond a section's MBL (u >= 1): never a pass */
    size_t overloaded_line;         /* the most utilised of them, or HF_BALANCE_NONE */
    int passed;                     /* status ok and every check passed */
    hf_balance_criterion criterion; /* the first failed check, or the governing one */
    size_t criterion_line;          /* line of that criterion, or HF_BALANCE_NONE */
} hf_balance_result;

typedef struct hf_balance hf_balance;

/* Allocates a workspace for m (borrowed).  Its memory is linear in the
 * number of lines: the scalar results of the 1 + nlines conditions of one
 * load case and the per-line arrays of one condition (hf_balance_footprint);
 * hf_balance_run adds the per-line arrays of every condition on its first
 * call.  m must have at least one line and valid criteria
 * (hf_criteria_check).  Returns NULL with err set: HF_EINVAL (bad model),
 * HF_ELIMIT (size overflow), HF_ENOMEM. */
hf_balance *hf_balance_alloc(const hf_model *m, hf_error *err);

/* Bytes this workspace has allocated itself (its spread workspace
 * excluded): about 0.46 KB per condition plus 0.18 KB per line, plus
 * (1 + n) x n x 0.18 KB once hf_balance_run has kept every condition. */
size_t hf_balance_footprint(const hf_balance *b);

/* Releases a workspace and its results.  NULL is allowed. */
void hf_balance_free(hf_balance *b);

/* Re-reads what the workspace derives from its model at allocation (the
 * rest pose, the length scales of the search) after the model's parameters
 * were changed in place (a sweep or an inversion varying hull.heading, an
 * anchor, a fairlead...), so the next solve starts from the model's rest
 * pose as it is now.  Warm starts are kept (hf_balance_reset forgets them).
 * Allocates nothing. */
void hf_balance_refresh(hf_balance *b);

/* Forgets every warm start: the line states of the spread workspace and the
 * remembered intact equilibrium, so the next solve depends only on its input
 * (sweeps use this to make results independent of the order of cases). */
void hf_balance_reset(hf_balance *b);

/* Solver options (copied); NULL restores the defaults.  HF_EINVAL when a
 * value is out of range (non-finite, ftol <= 0, max_iter < 1, ...). */
hf_status hf_balance_set_options(hf_balance *b, const hf_balance_options *opt, hf_error *err);

/* The drag equation F = 1/2 rho C A V^2 for one wind or current term of a
 * load case, validated: density, coefficient, area and speed finite and
 * >= 0, direction finite.  Writes the magnitude *q (N) and its global
 * components *fx = q cos(direction), *fy = q sin(direction) (N); any of q,
 * fx, fy may be NULL.  Returns HF_OK, or HF_EINVAL with a message (without
 * a location: the caller prefixes it, e.g. "loads[gale].drag[1]: ") when a
 * value is out of range or the product overflows; the outputs are then 0.
 * This is the one implementation of the formula in holdfast: every caller
 * (balance, commands, report) uses it. */
hf_status hf_drag_force(const hf_drag *d, double *q, double *fx, double *fy, hf_error *err);

/* The resultant external load of a load case in global axes: f[0] Fx, f[1]
 * Fy (N), f[2] Mz (N m): the direct force plus every drag term
 * 1/2 rho C A V^2 toward its direction.  HF_EINVAL with a message naming the
 * load when a value is not finite or out of range (negative force, density,
 * coefficient, area or speed) or the sum overflows. */
hf_status hf_balance_load_force(const hf_load *load, double f[3], hf_error *err);

/* Number of conditions per load case: 1 + nlines (0 intact, k line k-1 broken). */
size_t hf_balance_ncond(const hf_balance *b);

/* Called by hf_balance_run_each after each condition (0 intact, k line
 * k-1 broken) with its result, which stays valid until the next condition
 * is solved.  Return 0 to go on, non-zero to stop the run (progress display
 * and cancellation belong here).  Must not call back into the workspace. */
typedef int (*hf_balance_visit)(void *ctx, size_t cond, const hf_balance_result *r);

/* Solves every condition of one load case in order, evaluates the criteria
 * and hands each result to visit (may be NULL) as soon as it is solved:
 * memory stays linear in the number of lines, and nothing is allocated.
 * Returns HF_EINVAL for a bad load (nothing solved; condition 0 carries the
 * status and message and is visited), HF_OK when every condition found its
 * equilibrium, else the status of the first condition that did not
 * (HF_ENOEQUIL, HF_ENOCONV, HF_EUNSUPPORTED, HF_EINVAL): every condition is
 * still attempted and carries its own status and message.  When visit stops
 * the run: that first failure status, else HF_CONTINUE. */
hf_status hf_balance_run_each(hf_balance *b, const hf_load *load, hf_balance_visit visit, void *ctx,
                              hf_error *err);

/* Like hf_balance_run_each without a visitor, but keeps the result of every
 * condition for hf_balance_result_at.  Its first call on a workspace
 * allocates the per-line arrays of all 1 + n conditions ((1 + n) x n
 * entries, 0.18 KB each: memory quadratic in the number of lines; use
 * hf_balance_run_each for large spreads): HF_ENOMEM or HF_ELIMIT when that
 * fails (nothing solved).  Later calls allocate nothing.  Same statuses
 * otherwise. */
hf_status hf_balance_run(hf_balance *b, const hf_load *load, hf_error *err);

/* Solves one condition only (0 intact, k = line k-1 broken), starting from
 * the rest pose for the intact condition and from the intact equilibrium of
 * the last successful intact solve of the same hf_load object (else the
 * rest pose) for a broken one.  Same statuses as hf_balance_run for that condition. */
hf_status hf_balance_solve(hf_balance *b, const hf_load *load, size_t cond, hf_error *err);

/* Result of condition `cond` of the last run/solve, or NULL when out of
 * range or not kept: before hf_balance_run has been called on the workspace,
 * only the condition solved last (hf_balance_solve, hf_balance_run_each) is
 * kept. */
const hf_balance_result *hf_balance_result_at(const hf_balance *b, size_t cond);

/* Stable criterion names: "none", "equilibrium", "line_factor", "offset", "anchor",
 * "overload". */
const char *hf_balance_criterion_name(hf_balance_criterion c);

#endif
