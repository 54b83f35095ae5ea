/* barchain.h - a reference model of one mooring line, for the tests only.
 *
 * Outside the library flow: tests hold the closed-form line solver
 * (src/line.c) to this model, which reaches the same statics by a different
 * method.  The line is cut into N straight elastic bars (N+1 nodes) with the
 * wet weight of each bar lumped half on each of its end nodes and every joint
 * load (clump > 0, buoy < 0) on the node at its joint.  The anchor node is
 * fixed at the origin, the fairlead node at (X, Z); the other nodes are the
 * unknowns of the nodal force balance, solved by a damped Newton method on
 * its block-tridiagonal Jacobian (2x2 blocks, analytic), reached by
 * continuation from a taut straight line (the fairlead moved from a point
 * where the line is taut toward (X, Z) in adaptive steps).  No catenary
 * formula, no touchdown search and no guess of the shape enter it.
 *
 * Physics of the model (docs/theory.md states the closed form's):
 *  - bars carry tension only: T = EA strain (or the section's tension-strain
 *    polynomial, hf_section.strain, inverted per bar by Newton); a bar
 *    shorter than its unstretched length carries a tiny compression
 *    (1e-5 of the line's total load per unit strain), which keeps the
 *    Jacobian regular on a slack grounded stretch without changing any
 *    force by more than that;
 *  - the seabed is the straight line through the anchor rising at
 *    hf_line.slope toward the fairlead; a node below it is pushed back by a
 *    penalty spring (stiffness 1e7 x total load / length: a node sinks by
 *    less than 1e-7 L / N);
 *  - Coulomb friction at a grounded node acts along the seabed toward the
 *    anchor, fully mobilised (mu N) where the line above pulls harder than
 *    that, otherwise just what holds the node (so tension never drops below
 *    zero on the grounded part): the convention of docs/theory.md, applied
 *    node by node on every grounded stretch.  Zero friction is exact
 *    statics; the friction rule is the project's convention, not a law.
 *
 * Discretisation error is O(h^2) for suspended lines (lumped weights) and
 * irregular, between O(h) and O(h^2), where the seabed contact point falls
 * between nodes (measured: a lazy wave's H within 2.7e-6 at 3200 bars);
 * barchain_refine solves N, 2N and 4N bars, reports the last change as an
 * error estimate, the observed order and a Richardson extrapolation.
 * Units SI (m, N, N/m, rad) and the sign conventions of hf_line_state. */
#ifndef HOLDFAST_TEST_BARCHAIN_H
#define HOLDFAST_TEST_BARCHAIN_H

#include <stddef.h>
#include "holdfast/line.h"
#include "holdfast/status.h"

/* One solution of the bar chain. */
typedef struct {
    size_t bars;     /* number of bars */
    double h;        /* fairlead horizontal force toward the anchor, N */
    double v;        /* fairlead vertical force, N (> 0 pulls the fairlead down) */
    double anchor_h; /* horizontal force on the anchor toward the fairlead, N (from the
                      * first bar's tension: O(h) where friction acts at the anchor) */
    double anchor_v; /* vertical uplift on the anchor, N (first bar minus its lumped
                      * half-weight; negative: the seabed carries that) */
    double grounded; /* unstretched length of bars with both ends on the seabed, m */
    int contacts;    /* separate grounded stretches (the anchor's one included) */
    double z_max;    /* highest node above the anchor, m */
    int iterations;  /* Newton iterations, continuation included */
    int steps;       /* continuation steps taken */
    double residual; /* largest nodal force imbalance at exit, N */
    size_t nodes;    /* bars + 1 */
    double *x, *z;   /* node positions, m, anchor first (owned: barchain_result_free) */
    double *tension; /* bar tensions, N (bars entries) */
} barchain_result;

/* Solves the line cut into about `bars` bars (each section gets
 * max(4, ceil(bars L_i / L)) of equal length) for a fairlead at (x, z) from
 * the anchor.  The line must pass hf_line_check except that the slope and
 * strain fields may be non-zero.  Fills *out (freeing what it held: start
 * from a zeroed struct).  Returns HF_OK, HF_EINVAL (bad line or span: z below
 * the seabed, non-finite), HF_ENOMEM or HF_ENOCONV (Newton failed even with
 * the smallest continuation step). */
hf_status barchain_solve(const hf_line *line, double x, double z, size_t bars,
                         barchain_result *out);

/* Frees the arrays of a result (NULL and a zeroed struct are fine). */
void barchain_result_free(barchain_result *r);

/* Solutions with about n, 2n and 4n bars, and their extrapolation. */
typedef struct {
    double h, v;               /* fairlead forces of the finest (4n) level, N */
    double h_err, v_err;       /* |4n level - 2n level|, N: the last change, an error
                                * estimate of h, v where the error falls as O(h^1) or faster */
    double h_rich, v_rich;     /* Richardson extrapolation (order 2) of the 2n and 4n levels,
                                * N: better than h, v only where the order is 2, i.e. for
                                * lines without seabed contact (see `order`) */
    double order;              /* observed order log2(|f_n - f_2n| / |f_2n - f_4n|) of the
                                * larger of the H and V changes (NAN if too small to
                                * measure); contact between nodes makes it irregular */
    double anchor_h, anchor_v; /* finest level's anchor forces, N */
    barchain_result fine;      /* the 4n solution (owned: barchain_refined_free) */
} barchain_refined;

/* Solves at n, 2n, 4n bars (the finer levels start from the coarser ones).
 * Same statuses as barchain_solve. */
hf_status barchain_refine(const hf_line *line, double x, double z, size_t n, barchain_refined *out);

void barchain_refined_free(barchain_refined *r);

#endif
