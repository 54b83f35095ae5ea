/* invert.h - design inversion: the parameter value that meets a target.
 *
 * Flow: case -> model -> line solve -> spread -> **studies** -> writers.
 * Finds the value of one model parameter (a path of hf_model_param_lookup)
 * inside a bracket [lo, hi] for which one scalar output at the rest pose
 * (output catalogue names, outputs.h: fairlead_tension:LINE, fairlead_horizontal:LINE,
 * stiffness_surge, ...) equals a target, with GSL's Brent bracketing solver
 * (gsl_root_fsolver_brent; Brent, "Algorithms for Minimization without
 * Derivatives", 1973).  Examples: a section length for a pretension, the
 * anchor radius for a pretension, a clump weight for a surge stiffness. */
#ifndef HOLDFAST_INVERT_H
#define HOLDFAST_INVERT_H

#include <stdio.h>
#include "holdfast/model.h"
#include "holdfast/status.h"
#include "holdfast/sweep.h"

/* The target must be met to this relative error (checked by re-evaluating
 * the output at the value found, from a cold start). */
#define HF_INVERT_RTOL 1e-6
/* Brent iterations before giving up. */
#define HF_INVERT_MAX_ITER 200

typedef struct {
    double value;          /* the parameter value found, SI */
    double achieved;       /* the output at that value, SI */
    double relative_error; /* |achieved - target| / |target| (/ output scale when target is 0) */
    int iterations;        /* Brent iterations */
    double lo, hi;         /* the bracket, SI */
    double f_lo, f_hi;     /* the output at lo and hi, SI */
} hf_invert_result;

/* Solves for the value of parameter `path` of model m (borrowed, not changed)
 * in [lo, hi] (SI, lo < hi) such that output o (hf_output_is_scalar)
 * equals target (SI).  Returns:
 *   HF_OK      res filled, relative error <= HF_INVERT_RTOL
 *   HF_EINVAL  bad path, bracket or output (message)
 *   HF_ERANGE  the target is not between the outputs at lo and hi, or the
 *              case does not solve at an end; the message gives both values
 *   HF_ENOCONV the case failed to solve inside the bracket, or the tolerance
 *              was not reached in HF_INVERT_MAX_ITER iterations
 *   HF_ENOMEM */
hf_status hf_invert_solve(const hf_model *m, const char *path, double lo, double hi,
                          const hf_output *o, double target, hf_invert_result *res, hf_error *err);

/* Text of a study's target for hf_output_parse: "output" or
 * "output:line" into buf (cap bytes). */
void hf_invert_target_text(const char *output, const char *line, char *buf, size_t cap);

/* Writes the result as CSV: a header and one row
 *   parameter,value,value_unit,output,target,achieved,output_unit,relative_error,iterations
 * with the value in the parameter's SI unit (degrees for angles) and target
 * and achieved in the output's column unit (kN, kN/m, kN m/rad, m, -).
 * HF_EIO when the write fails. */
hf_status hf_invert_write_csv(FILE *out, const hf_model *m, const char *path, const hf_output *o,
                              double target, const hf_invert_result *res, hf_error *err);

#endif
