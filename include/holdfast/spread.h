/* spread.h - a spread of mooring lines on one hull: pose, assembly, 6x6 stiffness.
 *
 * Flow: case -> model -> line solve -> **spread** -> balance / studies -> writers.
 * The hull pose moves every fairlead; each line is solved in its own vertical
 * plane through its anchor and its fairlead (hf_line_solve), and the line
 * forces and their moments about the hull reference point are summed.  The
 * 6x6 mooring stiffness at a pose is assembled analytically from each line's
 * 2x2 fairlead stiffness, the transverse term h/X and the moment-arm and
 * rotation (geometric) terms.  See docs/spread.md for the derivation.
 *
 * Conventions (all SI: m, N, N m, rad):
 *   - Global axes x, y horizontal, z up; z = 0 is the still water level; the
 *     flat seabed lies at z = -hf_model_water_height(m).  A sloped seabed
 *     (hf_site.seabed_slope) lies at -hf_model_water_height(m) +
 *     hf_model_seabed_rise(m, x, y): each anchor at its own depth, each line
 *     solved with the seabed's slope along its own vertical plane (which
 *     turns with the plane as the hull moves).  The analytic 6x6 stiffness
 *     leaves out the change of that slope as the plane turns (a sideways
 *     fairlead motion); see docs/spread.md.
 *   - The hull frame has its origin (the reference point) at the still water
 *     level; x forward, y to port, z up.
 *   - A pose is the global position (surge, sway, heave) of the reference
 *     point and the rotation R = Rz(yaw) Ry(pitch) Rx(roll): z-y-x intrinsic
 *     Euler angles, exact (not linearised).  A hull-frame point p lies at
 *     global  (surge, sway, heave) + R p.
 *   - The case's hull position and heading are the rest pose (heave, roll,
 *     pitch zero, yaw = heading).
 *   - Forces and moments are those the mooring exerts ON THE HULL, in global
 *     axes, moments about the reference point: F = (Fx, Fy, Fz, Mx, My, Mz).
 *   - Stiffness K[i][j] = -dF_i/dq_j, q = (surge, sway, heave, roll, pitch,
 *     yaw): the exact derivative of the assembled force with respect to the
 *     pose parameters (so K can be checked by differencing F).  Units: N/m,
 *     N/rad, N m/m, N m/rad.  K is not symmetric in general.
 *
 * The workspace borrows the model: the model must outlive it and keep its
 * number of lines; line properties may change between calls (sweeps).  A
 * workspace is not thread-safe; use one per thread. */
#ifndef HOLDFAST_SPREAD_H
#define HOLDFAST_SPREAD_H

#include <stddef.h>
#include "holdfast/status.h"
#include "holdfast/model.h"
#include "holdfast/line.h"

/* Hull pose: global position of the reference point, m, and z-y-x Euler angles, rad. */
typedef struct {
    double surge, sway, heave; /* m, global x, y, z of the hull reference point */
    double roll, pitch, yaw;   /* rad, R = Rz(yaw) Ry(pitch) Rx(roll) */
} hf_pose;

/* Where one line lies at a pose. */
typedef struct {
    double fairlead[3]; /* global position of the fairlead, m */
    double arm[3];      /* fairlead minus reference point, global axes, m */
    double x;           /* horizontal distance anchor -> fairlead, m (>= 0) */
    double z;           /* fairlead height above the seabed at the anchor, m (may be < 0:
                         * invalid pose) */
    double dir[2];      /* global unit horizontal vector from the anchor toward the
                         * fairlead; (1, 0) when x is 0 */
    double slope;       /* sloped seabed: its slope along dir (the line's hf_line.slope at
                         * this pose), rad; 0 on a flat seabed */
    double anchor_rise; /* sloped seabed: seabed height at the anchor above the datum
                         * seabed, m (hf_model_seabed_rise); 0 on a flat seabed */
} hf_spread_geom;

/* Opaque workspace: per-line states (warm starts), geometry, forces, mask. */
typedef struct hf_spread hf_spread;

/* Result of one spread solve.  The pointers point into the workspace and stay
 * valid until the next solve/stiffness call or hf_spread_free. */
typedef struct {
    hf_status status;              /* HF_OK, or the status of the first failing line */
    size_t failed_line;            /* index of that line, or (size_t)-1 */
    double force[6];               /* Fx, Fy, Fz (N), Mx, My, Mz (N m) on the hull */
    double max_tension;            /* largest tension along any intact line, N */
    size_t max_tension_line;       /* its index, or (size_t)-1 when no intact line */
    double max_utilisation;        /* largest section utilisation t_max/MBL, - */
    size_t max_utilisation_line;   /* its index, or (size_t)-1 */
    size_t nlines;                 /* number of lines (= model lines) */
    const hf_line_state *states;   /* nlines solved states; a broken line's state is
                                    * zero (status HF_OK, no forces) */
    const hf_spread_geom *geom;    /* nlines geometries at the pose */
    const double (*line_force)[3]; /* nlines forces on the hull at each fairlead, N, global */
    const double *line_tension;    /* nlines largest tension along each line, N (0 broken) */
    const unsigned char *broken;   /* nlines: 1 = line marked broken (excluded) */
} hf_spread_result;

/* Rest pose of the model's hull: position, heading; heave, roll, pitch zero. */
void hf_spread_pose_rest(const hf_model *m, hf_pose *pose);

/* Adds a horizontal offset to a pose: offset[0], offset[1] (m) to surge and
 * sway, offset[2] (rad) to yaw.  This is how `--offset X,Y,HEADING_DEG` applies. */
void hf_spread_pose_offset(hf_pose *pose, const double offset[3]);

/* Rotation matrix R = Rz(yaw) Ry(pitch) Rx(roll) of a pose (hull -> global). */
void hf_spread_pose_rotation(const hf_pose *pose, double rot[3][3]);

/* HF_OK when every pose value is finite, else HF_EINVAL with a message. */
hf_status hf_spread_pose_check(const hf_pose *pose, hf_error *err);

/* Geometry of line i of m at a pose: global fairlead position, arm, span
 * (x, z) and plane direction.  Returns HF_OK, or HF_EINVAL (message in err)
 * when i is out of range or the pose is not finite.  Does not check z >= 0. */
hf_status hf_spread_line_geometry(const hf_model *m, size_t i, const hf_pose *pose,
                                  hf_spread_geom *g, hf_error *err);

/* Allocates a workspace for model m (borrowed, not copied).  All lines are
 * intact and without warm starts.  Returns NULL with err set (HF_ENOMEM) when
 * an allocation fails. */
hf_spread *hf_spread_alloc(const hf_model *m, hf_error *err);

/* Releases a workspace.  NULL is allowed. */
void hf_spread_free(hf_spread *ws);

/* The model the workspace reads, and its number of lines. */
const hf_model *hf_spread_model(const hf_spread *ws);
size_t hf_spread_nlines(const hf_spread *ws);

/* Line solver options used for every line (copied); NULL restores defaults. */
void hf_spread_set_options(hf_spread *ws, const hf_line_options *opt);

/* Forgets the warm starts: the next solve starts every line cold. */
void hf_spread_reset(hf_spread *ws);

/* Marks line i broken (1) or intact (0).  A broken line is not solved and
 * contributes no force or stiffness.  HF_EINVAL when i is out of range. */
hf_status hf_spread_set_broken(hf_spread *ws, size_t i, int broken);

/* Marks every line intact. */
void hf_spread_clear_broken(hf_spread *ws);

/* 1 when line i is marked broken, 0 otherwise (also when i is out of range). */
int hf_spread_is_broken(const hf_spread *ws, size_t i);

/* Solves every intact line at `pose`, warm-starting each from its last
 * successful state, and sums forces and moments.  Fills *res (never NaN).
 * Allocates nothing.  Returns:
 *   HF_OK
 *   HF_EINVAL       pose not finite, or a fairlead below the seabed at this
 *                   pose, or a line the solver rejects (message names the line),
 *                   or the model's number of lines changed since hf_spread_alloc
 *   HF_EUNSUPPORTED a line in a configuration the model cannot represent,
 *                   including a fairlead above the still water level at this
 *                   pose or a line its buoys lift above it (message names the
 *                   line and the height: the model uses wet weights only)
 *   HF_ENOCONV      a line solve did not converge
 *   HF_ENOMEM       (from the line solver; not expected, see line.h)
 * On failure res->status and res->failed_line name the first failing line,
 * err says why ("line 'bow-port': ..."), and res->force is zero. */
hf_status hf_spread_solve(hf_spread *ws, const hf_pose *pose, hf_spread_result *res, hf_error *err);

/* As hf_spread_solve, and fills K with the analytic 6x6 mooring stiffness
 * K[i][j] = -dF_i/dq_j at the pose (N/m, N/rad, N m/m, N m/rad; rows
 * Fx, Fy, Fz, Mx, My, Mz; columns surge, sway, heave, roll, pitch, yaw).
 * The static force is res->force.  On failure K is zero.  Same statuses. */
hf_status hf_spread_stiffness(hf_spread *ws, const hf_pose *pose, double K[6][6],
                              hf_spread_result *res, hf_error *err);

#endif
