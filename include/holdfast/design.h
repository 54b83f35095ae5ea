/* design.h - the quasi-static design check of issue 14: for one environment
 * of the case and one condition (intact, or one line broken) it finds the
 * mean pose under the environment's heading-dependent loads, the
 * low-frequency (slow-drift) and wave-frequency motions there, the design
 * offset (mean + the larger of LF max + WF significant and LF significant
 * + WF max), and the line tensions at the design pose, checked against the
 * case's criteria with the quasi-static factors.
 *
 * Flow: case (designdata) -> model -> balance (mean equilibrium) / spread
 * (6x6 stiffness, tensions) -> environment (loads, motions, statistics)
 * -> **design** -> cmd_design, studyrun, report_design.  Never prints; the
 * workspace owns every array it hands out.  Formulas and sources:
 * docs/design.md.
 *
 * Conventions (SI: m, s, N, N m, rad):
 *   - Mean offsets are global, from the rest pose (as in balance.h); motion
 *     amplitudes are along the hull's own surge and sway axes and in yaw.
 *   - The two combinations are applied as whole poses along the direction
 *     of the mean horizontal offset (hf_env_design.pose_lf_max and
 *     pose_wf_max); each line's design tension is the larger of its
 *     tensions at the two poses, and the criteria are checked with it.
 *   - The horizontal offset limit of the criteria (max_offset) is checked
 *     against the design offset. */
#ifndef HOLDFAST_DESIGN_H
#define HOLDFAST_DESIGN_H

#include <stddef.h>
#include "holdfast/criteria.h"
#include "holdfast/designdata.h"
#include "holdfast/environment.h"
#include "holdfast/model.h"
#include "holdfast/status.h"

#define HF_DESIGN_INTACT ((size_t)-1) /* hf_design_result.broken of the intact condition */
#define HF_DESIGN_MESSAGE 512

/* One environment in one condition.  Arrays have nlines entries and are
 * owned by the workspace; the whole result is valid until the next
 * hf_design_solve or hf_design_free. */
typedef struct {
    hf_status status;                /* HF_OK, else why this condition has no result */
    char message[HF_DESIGN_MESSAGE]; /* "" when ok */
    size_t env;                      /* environment index (hf_designdata.env) */
    size_t broken;                   /* broken line, or HF_DESIGN_INTACT */
    double mean_offset[3];           /* global surge, sway from rest (m); yaw from rest (rad) */
    double yaw;                      /* hull heading at the mean pose, rad */
    int pose_iterations;             /* equilibria solved to find the mean pose */
    hf_env_mean mean;                /* mean loads at the mean pose */
    double outside[2];               /* spectral energy outside the RAO, drift tables, - */
    hf_env_motion_result motion;     /* LF and WF statistics (spectrum valid with waves) */
    hf_env_design design;            /* design offset, both combinations */
    size_t nlines;
    double *tension_mean;        /* largest tension along each line at the mean pose, N */
    double *tension;             /* design tension of each line (larger of the two poses), N */
    double *utilisation;         /* T/MBL of the most loaded section at the design pose, - */
    unsigned char *governs;      /* 1: the LF-max pose governs the line, 2: the WF-max pose */
    hf_line_criterion *line;     /* line checks with the quasi-static factor of the condition */
    hf_anchor_criterion *anchor; /* anchor checks at the governing pose */
    double max_tension_mean;     /* N */
    double max_tension_combo[2]; /* largest tension at pose_lf_max, pose_wf_max, N */
    double max_tension;          /* largest design tension, N */
    size_t max_tension_line;     /* its line, or HF_DESIGN_INTACT when none */
    double max_utilisation;      /* largest design utilisation, - */
    size_t max_utilisation_line;
    int lines_passed, anchors_passed;
    int offset_checked, offset_passed; /* design offset against criteria.max_offset */
    int overloaded;                    /* hf_criteria_overloaded(max_utilisation) */
    int passed;                        /* status ok, every check passed and nothing overloaded */
} hf_design_result;

typedef struct hf_design hf_design;

/* A workspace for model m (borrowed; must outlive it and keep its lines):
 * balance and spread workspaces, the environment module's quadrature
 * workspace and the per-line arrays, all allocated here once.  m must
 * carry design data (m->design, from the case's hull keys and
 * environments) and valid criteria.  NULL with err set: HF_EINVAL (no
 * design data, no environment, bad model), HF_ENOMEM. */
hf_design *hf_design_alloc(const hf_model *m, hf_error *err);

/* Frees a workspace; NULL is allowed. */
void hf_design_free(hf_design *d);

/* Number of environments, and of conditions per environment (1 + lines). */
size_t hf_design_nenv(const hf_design *d);
size_t hf_design_ncond(const hf_design *d);

/* Coverage of environment env at the hull's rest heading: the fractions of
 * the wave spectrum's energy outside the RAO and drift tables (0 without
 * waves).  HF_OK or the refusal of hf_env_check (HF_EINVAL, HF_ENOCONV). */
hf_status hf_design_coverage(hf_design *d, size_t env, double outside[2], hf_error *err);

/* Solves environment env (< hf_design_nenv) in condition cond (0 intact,
 * k line k-1 broken; < hf_design_ncond) into the workspace's result.
 * Returns HF_OK when the condition has a result (which may fail its
 * criteria: see result->passed); else the status of the step that failed,
 * also stored with its message in the result (passed 0): HF_EINVAL
 * (environment refused at the mean heading, bad index), HF_ENOEQUIL (no
 * mean equilibrium), HF_ENOCONV (equilibrium, mean heading or quadrature),
 * HF_EUNSUPPORTED (no positive stiffness in a degree of freedom with
 * waves, a line configuration the model cannot represent).  Allocates
 * nothing. */
hf_status hf_design_solve(hf_design *d, size_t env, size_t cond, hf_error *err);

/* The result of the last hf_design_solve (never NULL; zeroed before any). */
const hf_design_result *hf_design_result_get(const hf_design *d);

/* Stable short text of a result's status for CSV columns: "ok" or the
 * status name with spaces as '_' ("no_equilibrium", ...). */
const char *hf_design_status_name(const hf_design_result *r, char *buf, size_t cap);

#endif
