/* line.h - one mooring line in its vertical plane: model, solver, outputs.
 *
 * Flow: case -> model -> **line solve** -> spread -> studies -> writers.
 * A line runs from an anchor resting on a flat seabed to a fairlead that is
 * X metres away horizontally and Z metres above the anchor.  It is made of
 * sections (elastic catenaries, Irvine 1981) joined end to end, with point
 * loads (clump weights, buoys) at the joints.  It may touch the seabed
 * several times (humps lifted by buoys, landing sags); every part that
 * rests on the seabed carries axial Coulomb friction (tension falling toward
 * the anchor).  Everything here is SI: m, N, N/m, rad.
 *
 * The module knows nothing of hulls, files or printing; it never allocates
 * (the fallback's GSL Brent solvers live in the solve's stack frame), so no
 * line solve can run out of memory.
 * See docs/theory.md for the equations, sign conventions and sources. */
#ifndef HOLDFAST_LINE_H
#define HOLDFAST_LINE_H

#include <stddef.h>
#include "holdfast/status.h"

/* Documented limit: sections per line. */
#define HF_LINE_MAX_SECTIONS 32

typedef struct {
    double length;    /* unstretched length, m (> 0) */
    double weight;    /* wet (submerged) weight per unstretched metre, N/m (> 0) */
    double ea;        /* axial stiffness EA, N (> 0, may be huge for "inextensible") */
    double mbl;       /* minimum breaking load, N (> 0) */
    double friction;  /* axial seabed friction coefficient, - (>= 0) */
    double strain[3]; /* optional load-dependent stretch (fibre ropes): strain =
                       * strain[0] t + strain[1] t^2 + strain[2] t^3 with t = T / mbl;
                       * all three 0 (the default) means linear, strain = T / ea.
                       * A non-zero law must give a strain increasing with T over
                       * 0 <= t <= 1 (checked by hf_line_check). */
} hf_section;

typedef struct {
    double load;     /* net vertical point load, N: > 0 clump (down), < 0 buoy (net lift), 0 none */
    double friction; /* friction coefficient of the clump or buoy on the seabed, - (>= 0) */
} hf_joint;

typedef struct {
    size_t n;                             /* number of sections, 1..HF_LINE_MAX_SECTIONS */
    hf_section sec[HF_LINE_MAX_SECTIONS]; /* sec[0] at the anchor ... sec[n-1] at the fairlead */
    hf_joint joint[HF_LINE_MAX_SECTIONS]; /* joint[i] joins sec[i] and sec[i+1], i < n-1; others
                                             unused */
    double slope; /* seabed slope in the line's vertical plane, rad: the seabed is the
                   * straight line through the anchor rising at this angle toward the
                   * fairlead (negative: falling toward the fairlead); 0 = flat, the
                   * default.  |slope| < 0.5 rad. */
} hf_line;

/* The regime of a solved line. */
typedef enum {
    HF_LINE_SUSPENDED = 0, /* no part on the seabed; the anchor may see uplift */
    HF_LINE_TOUCHDOWN,     /* partly on the seabed (touchdown inside a section or at a clump) */
    HF_LINE_SLACK, /* more line than the span needs: H = 0, hangs vertically, rest on the seabed */
    HF_LINE_VERTICAL, /* X = 0 and the line is taut: hangs straight up from the anchor */
    HF_LINE_LAID      /* Z = 0 and taut: the whole line lies stretched on the seabed */
} hf_line_regime;

/* Stable lower-case name of a regime: "suspended", "touchdown", "slack",
 * "vertical", "laid". */
const char *hf_line_regime_name(hf_line_regime r);

typedef struct {
    double t_lower;     /* tension at the section's anchor-side end, N */
    double t_upper;     /* tension at the section's fairlead-side end, N */
    double t_max;       /* largest tension along the section, N */
    double utilisation; /* t_max / mbl, - */
    double grounded;    /* unstretched length of this section resting on the seabed, m */
} hf_section_result;

typedef struct {
    hf_status status;    /* HF_OK, or why the solve failed */
    const char *message; /* static text explaining a failure or a warning; "" when none */
    hf_line_regime regime;
    int iterations;  /* Newton (or fallback) iterations used */
    int evaluations; /* forward-map evaluations used */
    double x, z;     /* the span solved for, m */
    double h;        /* fairlead horizontal force, N (line pulls the fairlead toward the anchor) */
    double v;        /* fairlead vertical force, N (> 0 pulls the fairlead down) */
    double tension;  /* fairlead tension, N */
    double anchor_h; /* horizontal force on the anchor, N (toward the fairlead) */
    double anchor_v; /* vertical uplift force on the anchor, N (>= 0) */
    double anchor_tension;  /* N */
    double anchor_angle;    /* uplift angle of the line at the anchor above horizontal, rad */
    double touchdown_x;     /* horizontal distance anchor -> touchdown, m (0 when suspended) */
    double grounded;        /* unstretched length resting on the seabed, m */
    double z_max;           /* highest point of the line above the anchor (seabed), m: the
                             * fairlead height z, or more where buoys lift the line above it */
    double stiffness[2][2]; /* d(h,v)/d(x,z), N/m: [0][0]=dH/dX [0][1]=dH/dZ [1][0]=dV/dX
                               [1][1]=dV/dZ */
    double residual;        /* forward-map residual at exit, relative to the line's length scale */
    double force_error;     /* estimated relative error of the forces at exit: the remaining
                             * Newton correction, max(|dH|/H, |dV|/T); 0 for the closed-form
                             * regimes (slack, vertical, laid).  Near 1e-9 or below for common
                             * lines; larger only where rounding of the span limits it (see
                             * docs/theory.md, "Attainable accuracy") */
    double max_utilisation; /* largest section utilisation, - */
    size_t max_section;     /* index of the section with max_utilisation */
    size_t n;               /* number of sections, copied from the line */
    hf_section_result section[HF_LINE_MAX_SECTIONS]; /* only the first n are written */
} hf_line_state;

/* Solver options: tolerance and every iteration limit, with their defaults
 * (hf_line_options_default).  hf_line_solve refuses out-of-range values
 * with HF_EINVAL.  scale = max(total unstretched length, span). */
typedef struct {
    double rtol;       /* converged when |x - X| and |z - Z| <= rtol * scale; in (0, 0.01);
                        * default 1e-10 */
    int max_iter;      /* Newton iterations before the bracketing fallback; default 40 */
    int max_backtrack; /* line-search halvings per Newton iteration; default 40 */
    int max_bracket;   /* fallback: Brent iterations per root, and doublings of the upper
                        * bracket of H or V; default 200 */
    int max_shrink;    /* fallback: divisions of the lower bracket of H by 1000; default 60 */
    int max_polish;    /* Newton iterations after the fallback; default 20 */
    int max_laid;      /* Newton iterations on H for a taut line laid on the seabed (Z = 0);
                        * default 200 */
    double ftol;       /* forces: once the span has converged, full Newton steps continue
                        * while the estimated force error (hf_line_state.force_error)
                        * exceeds ftol; in (0, 0.01); default 1e-9 */
    int max_refine;    /* at most this many such steps (0: span test only); default 4 */
} hf_line_options;

/* Fills o with the documented defaults. */
void hf_line_options_default(hf_line_options *o);

/* Validates a line: section count in range, every value finite, lengths,
 * weights, EA and MBL > 0, friction >= 0.  Returns HF_OK or HF_EINVAL with a
 * message naming the offending field in err (err may be NULL). */
hf_status hf_line_check(const hf_line *line, hf_error *err);

/* Total unstretched length, m, and total net vertical load of the line
 * (section weights plus joint loads), N. */
double hf_line_length(const hf_line *line);
double hf_line_weight(const hf_line *line);

/* The forward map of the line, its "span equations": for fairlead forces
 * (h > 0, v) returns the fairlead position (x, z) relative to the anchor and
 * the flexibility jac = d(x,z)/d(h,v) ([0][0]=dx/dh [0][1]=dx/dv
 * [1][0]=dz/dh [1][1]=dz/dv), m/N.  Several seabed contacts (humps lifted by
 * buoys, landing sags; docs/theory.md) are part of the map.  Returns HF_OK,
 * HF_EINVAL for h <= 0 or non-finite input, or HF_EUNSUPPORTED when the line
 * so loaded has no shape inside the model (a buoy's hump reaching past the
 * next joint, every touchdown sagging into the seabed); x, z, jac are then
 * those of the single-touchdown walk, for messages only. */
hf_status hf_line_span(const hf_line *line, double h, double v, double *x, double *z,
                       double jac[2][2]);

/* Solves the line for a fairlead at (x >= 0, z >= 0) from the anchor.
 * guess: a previous solution of the same line to warm-start from, or NULL.
 * opt: NULL for defaults.  On success fills *out completely and returns
 * HF_OK.  On failure returns the status (also in out->status) and a message
 * in out->message; no field of *out is ever NaN or Inf (section[k] for k >= n
 * is not written: read the first out->n entries only).  Results are zero on
 * failure, except that when HF_EUNSUPPORTED refuses a shape the solver did
 * find (a buoy resting on the seabed, a sag into it), out->h and out->v hold
 * that shape's fairlead forces, for messages only.
 *   HF_EINVAL       bad line, span (z < 0, non-finite values) or options, or
 *                   an MBL so small that the utilisation T/MBL overflows
 *   HF_EUNSUPPORTED a shape outside the model (the message says which): a
 *                   buoy's hump reaching past the next joint, no touchdown
 *                   whose arc stays above the seabed, a slack line with a
 *                   buoy on its laid part, a fully laid line with a buoy
 *   HF_ENOCONV      no convergence (not expected for valid input)
 *   HF_ENOMEM       only if a GSL build's Brent state outgrew the storage
 *                   reserved for it (512 bytes; GSL 2.x needs 64): never a
 *                   heap allocation */
hf_status hf_line_solve(const hf_line *line, double x, double z, const hf_line_state *guess,
                        const hf_line_options *opt, hf_line_state *out);

/* Copies a state: its scalar part and its first src->n section results only
 * (cheaper than a struct copy; later entries of dst->section are left). */
void hf_line_state_copy(hf_line_state *dst, const hf_line_state *src);

/* One sample of a solved line's profile, in the line's plane. */
typedef struct {
    double arc;     /* unstretched arc length from the anchor, m */
    double x;       /* horizontal distance from the anchor, m */
    double z;       /* height above the anchor (seabed), m */
    double tension; /* N */
} hf_line_point;

/* Samples a solved line from anchor to fairlead at unstretched arc spacing
 * `spacing` (> 0), always including both ends, touchdown and every section
 * end.  Writes at most `cap` points into pts (pts may be NULL when cap is 0)
 * and returns the number of points the full profile has, so a caller can
 * size its buffer with a first call.  Returns 0 for an unsolved state. */
size_t hf_line_profile(const hf_line *line, const hf_line_state *state, double spacing,
                       hf_line_point *pts, size_t cap);

#endif
