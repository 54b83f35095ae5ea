/* sweep.h - parametric sweeps of a case: outputs, per-case evaluation, rows.
 *
 * Flow: case -> model -> line solve -> spread / balance -> **studies** -> writers.
 * A sweep varies model parameters (paths of hf_model_param_lookup) over the
 * case space of study.h and evaluates chosen outputs at the rest pose of
 * every case: fairlead tensions, utilisations, stiffness, mean offsets under
 * a load case.  Rows are CSV (csv.h number format): the varied values, a
 * status, then the outputs.  Each thread works on its own copy of the model
 * with its own solver workspaces, allocated once; no case allocates.
 *
 * Output names (`--output NAME` / a study's `outputs:` list); per-line ones
 * take ":LINE" for one line, else give one column per line:
 *   fairlead_tension[:LINE]     T_<line>_kN        fairlead tension, kN
 *   fairlead_horizontal[:LINE]  H_<line>_kN        horizontal fairlead force, kN
 *   fairlead_vertical[:LINE]    V_<line>_kN        vertical fairlead force, kN
 *   anchor_tension[:LINE]       anchor_T_<line>_kN line tension at the anchor, kN
 *   utilisation[:LINE]          U_<line>           T/MBL of the most loaded section, -
 *   max_tension                 max_tension_kN, max_tension_line
 *   max_utilisation             max_utilisation, worst_line
 *   stiffness_surge             stiffness_surge_kN_per_m    K11 at rest
 *   stiffness_sway              stiffness_sway_kN_per_m     K22
 *   stiffness_heave             stiffness_heave_kN_per_m    K33
 *   stiffness_yaw               stiffness_yaw_kNm_per_rad   K66
 *   vertical_load               vertical_load_kN   downward mooring load on the hull
 *   offset_<load>               offset_<load>_surge_m, _sway_m, _yaw_deg: intact mean
 *                               equilibrium under that load case (balance.h)
 * Defaults: fairlead_tension, utilisation, max_utilisation, stiffness_surge.
 *
 * Status column: ok, invalid (a parameter value the model refuses),
 * unsupported, no_convergence, no_equilibrium, failed (other).  A case that
 * fails keeps its varied values and status; the outputs it could not compute
 * are left empty (never NaN or made-up numbers). */
#ifndef HOLDFAST_SWEEP_H
#define HOLDFAST_SWEEP_H

#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include "holdfast/balance.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"
#include "holdfast/status.h"
#include "holdfast/study.h"

typedef enum {
    HF_OUT_FAIRLEAD_TENSION = 0, HF_OUT_FAIRLEAD_HORIZONTAL, HF_OUT_FAIRLEAD_VERTICAL,
    HF_OUT_ANCHOR_TENSION, HF_OUT_UTILISATION, HF_OUT_MAX_TENSION, HF_OUT_MAX_UTILISATION,
    HF_OUT_STIFFNESS_SURGE, HF_OUT_STIFFNESS_SWAY, HF_OUT_STIFFNESS_HEAVE, HF_OUT_STIFFNESS_YAW,
    HF_OUT_VERTICAL_LOAD, HF_OUT_OFFSET, HF_OUT_COUNT
} hf_output_kind;

#define HF_OUTPUT_ALL ((size_t)-1)

/* One parsed output name. */
typedef struct {
    hf_output_kind kind;
    size_t line;   /* per-line kinds: line index, or HF_OUTPUT_ALL */
    size_t load;   /* HF_OUT_OFFSET: load index */
} hf_output;

/* Parses "NAME" or "NAME:LINE" against model m.  HF_EINVAL with a message
 * listing the valid names (unknown name, unknown line or load, ":LINE" on an
 * output that has none). */
hf_status hf_sweep_output_parse(const hf_model *m, const char *text, hf_output *out,
                                hf_error *err);

/* 1 when the output is one number (a per-line output with one line, or a
 * scalar output other than the names max_tension_line/worst_line): the
 * outputs an inversion can aim at. */
int hf_sweep_output_is_scalar(const hf_output *o);

/* A prepared sweep: the grid, the outputs, one evaluation state per thread. */
typedef struct hf_sweep hf_sweep;

/* Prepares a sweep of model m (borrowed; it must outlive the sweep and not
 * change).  vary: nvary parameters (paths checked against m; their dim is
 * taken from the model, not from vary[].dim); zip: zipped lists; outputs:
 * noutputs names (0 = defaults); jobs >= 1 threads (a model copy and
 * workspaces are allocated for each here, once).  Returns NULL with err:
 * HF_EINVAL (unknown path or output, zip lengths differ, empty range),
 * HF_ELIMIT (too many cases or parameters), HF_ENOMEM. */
hf_sweep *hf_sweep_alloc(const hf_model *m, const hf_vary *vary, size_t nvary, int zip,
                         const char *const *outputs, size_t noutputs, int jobs, hf_error *err);

/* Releases a sweep.  NULL is allowed. */
void hf_sweep_free(hf_sweep *s);

/* Number of cases, and the grid (valid while s lives). */
uint64_t hf_sweep_ncases(const hf_sweep *s);
const hf_study_grid *hf_sweep_grid(const hf_sweep *s);

/* Writes the header row (column names with units) to out.  HF_EIO when the
 * write fails. */
hf_status hf_sweep_write_header(const hf_sweep *s, FILE *out, hf_error *err);

typedef struct {
    uint64_t begin, end;     /* cases [begin, end) to write, end <= ncases */
    hf_study_progress_fn progress;  /* may be NULL */
    void *progress_ctx;
    volatile int *stop;      /* optional stop flag (see hf_study_stream_options) */
} hf_sweep_range;

/* Writes the rows of cases [r->begin, r->end) to out, in case order, on the
 * threads given to hf_sweep_alloc.  Identical bytes for any thread count and
 * any split into ranges.  Returns HF_OK, HF_EINVAL (bad range), HF_EIO
 * (write failed or stopped), HF_ENOMEM, HF_ELIMIT.  A failing case is not an
 * error (see the status column). */
hf_status hf_sweep_write_rows(hf_sweep *s, const hf_sweep_range *r, FILE *out, hf_error *err);

/* Evaluates one case k on thread state 0 (cold start) and returns its row
 * text in buf (cap bytes).  For tests and small tools.  HF_ELIMIT when the
 * row does not fit, HF_EINVAL for k out of range. */
hf_status hf_sweep_case_row(hf_sweep *s, uint64_t k, char *buf, size_t cap, hf_error *err);

/* Evaluates one scalar output (hf_sweep_output_is_scalar) of model m at its
 * rest pose with the workspace ws (borrowing m; warm starts are used).
 * bal may be NULL unless o is HF_OUT_OFFSET (then the surge offset is
 * returned).  Fills *value in SI (N, N/m, N m/rad, -, m).  Returns HF_OK or
 * the solver's status (HF_EINVAL, HF_EUNSUPPORTED, HF_ENOCONV,
 * HF_ENOEQUIL) with a message. */
hf_status hf_sweep_output_eval(const hf_model *m, hf_spread *ws, hf_balance *bal,
                               const hf_output *o, double *value, hf_error *err);

/* Short name of an output kind ("fairlead_tension", ...). */
const char *hf_sweep_output_name(hf_output_kind k);

/* The status word of the status column: "ok", "invalid", "unsupported",
 * "no_convergence", "no_equilibrium", "failed". */
const char *hf_sweep_status_word(hf_status s);

/* Parses a command-line "PATH=SPEC" into v, checking PATH on model m (its
 * dimension goes into v->dim).  SPEC is "FROM:TO:STEP" (a range), or
 * "V1,V2,..." (a list; one value is a list of one); with `bracket` set it
 * must be "LO:HI" (stored in from/to, step 0, LO < HI).  Each number is read
 * by hf_units_parse with the parameter's dimension: a plain number is SI
 * (degrees for angles), and units are allowed ("76mm", "1.5 kN").  v->path
 * points into `text`'s copy owned by v; release with hf_sweep_vary_clear.
 * HF_EINVAL with a message, HF_ENOMEM. */
hf_status hf_sweep_vary_parse(hf_model *m, const char *text, int bracket, hf_vary *v,
                              hf_error *err);

/* Frees what hf_sweep_vary_parse allocated in v and zeroes it.  NULL is allowed. */
void hf_sweep_vary_clear(hf_vary *v);

/* Cases whose status was not "ok" among the rows written so far. */
uint64_t hf_sweep_failed_count(const hf_sweep *s);

#endif
