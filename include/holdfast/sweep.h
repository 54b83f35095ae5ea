/* sweep.h - parametric sweeps of a case: outputs, per-case evaluation, rows.
 *
 * Flow: case -> model -> line solve -> spread / balance -> **studies** -> writers.
 * A sweep varies model parameters (paths of hf_model_param_lookup) over the
 * case space of study.h and evaluates chosen outputs at the rest pose of
 * every case (fairlead tensions, utilisations, stiffness) or at its intact
 * mean equilibrium under a load case (offset_<load>, max_tension@<load>,
 * utilisation@<load>, ...: hf_balance_solve, condition 0).  Rows are CSV (csv.h number format): the
 * varied values, a status, then the outputs.  Each thread works on its own copy of the model with
 * its own solver workspaces, allocated once; no case allocates.
 *
 * Outputs: the names of the output catalogue (outputs.h; `holdfast sweep
 * --help` lists them with their columns, units and meanings).  Defaults:
 * fairlead_tension, utilisation, max_utilisation, stiffness_surge.
 *
 * Results go to a CSV stream, to a table in memory (hf_sweep_table, for
 * `run` and the report: nothing re-reads a file), or both in one pass.
 *
 * Status column: ok, invalid (a parameter value the model refuses),
 * unsupported, no_convergence, no_equilibrium (a load of the outputs that
 * no equilibrium holds), failed (other).  A case that fails keeps its varied values and status and
 * all its outputs are left empty (never NaN, never the rest-pose numbers of a case whose
 * equilibrium under a load was not found). */
#ifndef HOLDFAST_SWEEP_H
#define HOLDFAST_SWEEP_H

#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include "holdfast/balance.h"
#include "holdfast/model.h"
#include "holdfast/outputs.h"
#include "holdfast/spread.h"
#include "holdfast/status.h"
#include "holdfast/study.h"

/* A prepared sweep: the grid, the outputs, one evaluation state per thread. */
typedef struct hf_sweep hf_sweep;

/* Prepares a sweep of model m (borrowed; it must outlive the sweep and not
 * change).  vary: nvary parameters (paths checked against m; their dim is
 * taken from the model, not from vary[].dim); zip: zipped lists; outputs:
 * noutputs names (0 = defaults); jobs >= 1 threads (a model copy and
 * workspaces are allocated for each here, once).  Returns NULL with err:
 * HF_EINVAL (unknown path or output, zip lengths differ, empty range, a
 * parameter varied twice: hf_model_param_same),
 * HF_ELIMIT (too many cases or parameters), HF_ENOMEM. */
hf_sweep *hf_sweep_alloc(const hf_model *m, const hf_vary *vary, size_t nvary, int zip,
                         const char *const *outputs, size_t noutputs, int jobs, hf_error *err);

/* Releases a sweep.  NULL is allowed. */
void hf_sweep_free(hf_sweep *s);

/* Number of cases, and the grid (valid while s lives). */
uint64_t hf_sweep_ncases(const hf_sweep *s);
const hf_study_grid *hf_sweep_grid(const hf_sweep *s);

/* Largest CSV a sweep writes without being asked explicitly (sweep
 * --allow-large): 10 GB.  At the ~100 MB/s a sweep can write, that is about
 * two minutes of disk filling; a mistyped range (0:1e6:1e-4 on four
 * parameters) is refused before it starts. */
#define HF_SWEEP_MAX_BYTES 10000000000ull

/* Estimated CSV size of `ncases` rows of sweep s, in bytes: each field
 * counted at 12 bytes (a 10-digit number with its sign, exponent or
 * separator), plus the row's status word and newline.  An estimate, not a
 * bound: the point is the order of magnitude. */
uint64_t hf_sweep_estimate_bytes(const hf_sweep *s, uint64_t ncases);

/* HF_OK when ncases rows of s are estimated at most HF_SWEEP_MAX_BYTES or
 * allow_large is set; else HF_ELIMIT with a message giving the case count,
 * the estimated size and the way to proceed (`option` names the switch,
 * e.g. "--allow-large"). */
hf_status hf_sweep_check_size(const hf_sweep *s, uint64_t ncases, int allow_large,
                              const char *option, hf_error *err);

/* A fingerprint of the sweep: 64-bit FNV-1a (Fowler, Noll and Vo; IETF
 * draft-eastlake-fnv) over the varied parameters (paths, dimensions, every
 * list value or the range's from, to and step as bit patterns), the way they
 * combine, the number of cases, the output column names and `extra` (n
 * bytes, may be NULL: e.g. the case file's bytes).  Two sweeps that would
 * write different rows get different fingerprints (up to hash collisions);
 * the parts of one sweep share it, so a merge can tell them apart. */
uint64_t hf_sweep_fingerprint(const hf_sweep *s, const void *extra, size_t n);

/* Writes the header row (column names with units) to out.  HF_EIO when the
 * write fails. */
hf_status hf_sweep_write_header(const hf_sweep *s, FILE *out, hf_error *err);

typedef struct {
    uint64_t begin, end;           /* cases [begin, end) to write, end <= ncases */
    hf_study_progress_fn progress; /* may be NULL */
    void *progress_ctx;
    volatile int *stop; /* optional stop flag (see hf_study_stream_options) */
} hf_sweep_range;

/* Writes the rows of cases [r->begin, r->end) to out, in case order, on the
 * threads given to hf_sweep_alloc.  Identical bytes for any thread count and
 * any split into ranges.  Returns HF_OK, HF_EINVAL (bad range), HF_EIO
 * (write failed or stopped), HF_ENOMEM, HF_ELIMIT.  A failing case is not an
 * error (see the status column).  The same as hf_sweep_run(s, r, out, NULL). */
hf_status hf_sweep_write_rows(hf_sweep *s, const hf_sweep_range *r, FILE *out, hf_error *err);

/* ---- rows in memory ----
 *
 * A table of sweep rows: the same numbers as the CSV, as doubles, with the
 * column names and units of the output catalogue.  Memory is bounded by the
 * caller: the table holds at most `cap` rows (the first cap cases of the
 * range run; `total` counts every case run), so a report that draws a figure
 * asks for the rows it can draw (e.g. 20,000) whatever the size of the
 * sweep, while the CSV still receives every row.  Values are in the column
 * units (kN, kN/m, kN m/rad, m, deg, -; varied angles in deg), exactly the
 * numbers the CSV prints; an empty CSV cell is NAN.  The line-name columns
 * (hf_output_column_is_line) hold the line's index (0-based, as a double) or
 * NAN. */
typedef struct {
    size_t nvary;           /* varied parameters */
    char **vary_names;      /* nvary column names with units ("site.depth_m") */
    hf_dim *vary_dim;       /* nvary dimensions of the varied parameters */
    size_t ncols;           /* output columns */
    char **col_names;       /* ncols column names with units ("T_bow_kN") */
    hf_output_column *cols; /* ncols: what each output column is (outputs.h) */
    uint64_t cap;           /* rows the table can hold */
    uint64_t first;         /* case number of row 0 (the range's begin) */
    uint64_t nrows;         /* rows held: min(cap, cases run) */
    uint64_t total;         /* cases run into the table (may exceed nrows) */
    uint64_t failed;        /* rows held whose status is not HF_OK */
    double *vary;           /* nrows x nvary: row i, parameter j at [i * nvary + j] */
    hf_status *status;      /* nrows statuses (hf_sweep_status_word gives the word) */
    double *out;            /* nrows x ncols: row i, column c at [i * ncols + c] */
} hf_sweep_table;

/* A table for sweep s (column names and kinds copied from it) holding at
 * most cap rows (cap >= 1; storage for cap rows is allocated here, once).
 * NULL with err: HF_EINVAL (cap 0), HF_ENOMEM (cap too large for memory:
 * choose a smaller cap). */
hf_sweep_table *hf_sweep_table_alloc(const hf_sweep *s, uint64_t cap, hf_error *err);

/* Releases a table.  NULL is allowed. */
void hf_sweep_table_free(hf_sweep_table *t);

/* Evaluates cases [r->begin, r->end) on the sweep's threads in one pass:
 * writes their CSV rows to out (NULL: no CSV) and keeps the first t->cap of
 * them in t (NULL: no table; t is reset first: nrows, total and failed start
 * at 0, first = r->begin).  out and t may not both be NULL.  Returns as
 * hf_sweep_write_rows; the table is valid after HF_OK. */
hf_status hf_sweep_run(hf_sweep *s, const hf_sweep_range *r, FILE *out, hf_sweep_table *t,
                       hf_error *err);

/* Evaluates one case k on thread state 0 (cold start) and returns its row
 * text in buf (cap bytes).  For tests and small tools.  HF_ELIMIT when the
 * row does not fit, HF_EINVAL for k out of range. */
hf_status hf_sweep_case_row(hf_sweep *s, uint64_t k, char *buf, size_t cap, hf_error *err);

/* Evaluates one scalar output (hf_output_is_scalar) of model m at its
 * rest pose with the workspace ws (borrowing m; warm starts are used).
 * bal may be NULL unless hf_output_needs_balance(o): then the output is
 * taken at the intact equilibrium under its load (HF_OUT_OFFSET: the surge
 * offset).  Fills *value in SI (N, N/m, N m/rad, -, m).  Returns HF_OK or
 * the solver's status (HF_EINVAL, HF_EUNSUPPORTED, HF_ENOCONV,
 * HF_ENOEQUIL) with a message. */
hf_status hf_sweep_output_eval(const hf_model *m, hf_spread *ws, hf_balance *bal,
                               const hf_output *o, double *value, hf_error *err);

/* The status word of the status column: "ok", "invalid", "unsupported",
 * "no_convergence", "no_equilibrium", "failed". */
const char *hf_sweep_status_word(hf_status s);

/* Parses a command-line "PATH=SPEC" into v, checking PATH on model m (its
 * dimension goes into v->dim).  SPEC is "FROM:TO:STEP" (a range), or
 * "V1,V2,..." (a list; one value is a list of one); with `bracket` set it
 * must be "LO:HI" (stored in from/to, step 0, LO < HI).  Each number is read
 * by hf_study_parse_value with the parameter's dimension: a plain number is
 * SI (degrees for angles, which keep their whole turns), and units are
 * allowed ("76mm", "1.5 kN").  v->path
 * points into `text`'s copy owned by v; release with hf_sweep_vary_clear.
 * HF_EINVAL with a message, HF_ENOMEM. */
hf_status hf_sweep_vary_parse(hf_model *m, const char *text, int bracket, hf_vary *v,
                              hf_error *err);

/* Frees what hf_sweep_vary_parse allocated in v and zeroes it.  NULL is allowed. */
void hf_sweep_vary_clear(hf_vary *v);

/* Cases whose status was not "ok" among the rows written so far. */
uint64_t hf_sweep_failed_count(const hf_sweep *s);

/* When a row written so far has an overloaded line (alert column
 * "overloaded": max utilisation T/MBL >= 1 at rest or at an equilibrium
 * under a load of the outputs), formats into buf (cap bytes, cut to fit)
 * "line <name> is overloaded: utilisation <u>[ at the intact equilibrium
 * under load <load>,] at case <path>=<value> <unit>, ..." for the first
 * such case (the largest of its utilisations) and returns 1; else returns
 * 0 and leaves buf alone. */
int hf_sweep_overload_text(const hf_sweep *s, char *buf, size_t cap);

#endif
