/* study.h - the study list, the range rule, the case space of a sweep and
 * the ordered parallel row stream.
 *
 * Flow: case -> model -> line solve -> spread -> **studies** -> writers.
 * The study list (hf_study_list) is what a case file's `studies:` section
 * asks for; the case loader fills it beside the model and the drivers run
 * it.  The rest of this module knows nothing of mooring: it counts ranges
 * (hf_study_range_count, the one range rule), turns varied parameters (ranges
 * or lists, a full factorial grid or zipped lists) into case numbers and back
 * into values, splits a case range into shards, and drives any per-case row
 * function over a range of cases on several OpenMP threads while writing the
 * rows in case order.  sweep.h puts the mooring evaluation on top of it and
 * invert.h the design inversion.
 *
 * Cases are never materialised: case k's parameter values are computed from
 * k, and rows are formatted block by block into one buffer sized up front,
 * so memory does not grow with the number of cases. */
#ifndef HOLDFAST_STUDY_H
#define HOLDFAST_STUDY_H

#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include "holdfast/model.h"
#include "holdfast/status.h"

/* Documented limits. */
#define HF_STUDY_MAX_VARY 16                /* varied parameters in one sweep */
#define HF_STUDY_MAX_VALUES 100000000u      /* values of one range or list */
#define HF_STUDY_MAX_CASES 1000000000000ull /* cases in one sweep (1e12) */
#define HF_STUDY_MAX_SHARDS 1000000u        /* N of --shard K/N */

/* ---- the study list of a case ----
 *
 * A case file's `studies:` section, loaded by the case loader beside the
 * model (hf_case_load_with_studies) and validated there against the model
 * and the output catalogue (outputs.h).  It is a list of its own: the model
 * holds only the physical model.  Units SI (angles in rad). */

typedef enum {
    HF_STUDY_LINES = 0,
    HF_STUDY_CURVE,
    HF_STUDY_STIFFNESS,
    HF_STUDY_BALANCE,
    HF_STUDY_SWEEP,
    HF_STUDY_INVERT,
    HF_STUDY_DESIGN /* issue 14: the design check of the environments (design.h) */
} hf_study_kind;

/* One varied parameter: a range (from, to, step) or a list of values. */
typedef struct {
    char *path; /* e.g. "lines[bow-port].sections[2].length" */
    hf_dim dim;
    size_t nvalues;        /* list form: number of values, else 0 */
    double *values;        /* list form, SI */
    double from, to, step; /* range form (nvalues == 0), SI; also invert's bracket */
} hf_vary;

typedef struct {
    char *name; /* names the CSV file: <name>.csv */
    hf_study_kind kind;
    double offset[3];      /* lines, stiffness: x, y (m), heading (rad) offsets */
    double direction;      /* curve: rad */
    double from, to, step; /* curve: offsets, m */
    size_t nloads;         /* balance: load names, 0 = all */
    char **loads;
    size_t nvary; /* sweep: parameters; invert: exactly one */
    hf_vary *vary;
    int zip;         /* sweep: 1 = zipped lists, 0 = full factorial grid */
    size_t noutputs; /* sweep: chosen output names, 0 = defaults */
    char **outputs;
    char *target_output; /* invert: "fairlead_tension", "fairlead_horizontal", "stiffness_surge",
                            ... */
    char *target_line;   /* invert: line name, where the output is per line */
    double target_value; /* invert: SI */

    size_t nenvironments; /* design (issue 14): environment names, 0 = all */
    char **environments;
} hf_study;

/* The studies of a case, in file order.  Owns everything it points to. */
typedef struct {
    size_t n;
    hf_study *v;
} hf_study_list;

/* Empty list. */
void hf_study_list_init(hf_study_list *l);

/* Releases everything the list owns and re-initialises it.  NULL is allowed. */
void hf_study_list_free(hf_study_list *l);

/* Stable name of a study kind ("lines", "curve", ..., "invert"); "?" out of range. */
const char *hf_study_kind_name(hf_study_kind k);

/* ---- ranges ---- */

/* Reads one value of a varied parameter (a list entry, a range's FROM, TO or
 * STEP, an inversion's bracket) of dimension d into *out, SI: as
 * hf_units_parse (units.h), except that angles are not reduced by whole
 * turns.  A range of headings 0:720:90 deg spans two turns and its step
 * 450 deg is not 90 deg: reducing FROM, TO and STEP one by one would change
 * the range (0:720:90 became the single value 0).  Each case's angle is a
 * direction again once set in the model.  Angles of more than
 * HF_STUDY_MAX_TURNS turns are reduced as hf_units_parse does (exactly, in
 * degrees), so 1e15 deg gives the 280 deg it is.  HF_EINVAL with
 * hf_units_parse's message. */
#define HF_STUDY_MAX_TURNS 100
hf_status hf_study_parse_value(const char *text, hf_dim d, double *out, hf_error *err);

/* The one range rule of holdfast (case files, --vary, --range): the number
 * of values FROM, FROM + STEP, ... up to TO.  TO is included when it lies on
 * the grid up to rounding: the tolerance is 1e-9 of a step plus 64 units in
 * the last place of the largest of |FROM| and |TO| (in steps), so a step
 * that is tiny relative to the values (366:366.0001:0.00001, 11 values) does
 * not lose its end point.  Returns 0 for an invalid range (a non-finite
 * number, step 0, a step pointing away from TO) and `max + 1` when the count
 * exceeds max (so the caller can name the limit). */
size_t hf_study_range_count(double from, double to, double step, size_t max);

/* Number of values of a varied parameter: its list length, or for a range
 * hf_study_range_count(from, to, step, HF_STUDY_MAX_VALUES).  0 for an
 * invalid range. */
size_t hf_study_vary_count(const hf_vary *v);

/* Value i (< count) of a varied parameter, SI: list entry i, or FROM + i*STEP
 * (computed by one multiplication, not accumulated, so it never drifts); the
 * last value of a range whose end lies on the grid (within the tolerance of
 * hf_study_range_count) is TO itself. */
double hf_study_vary_value(const hf_vary *v, size_t i);

/* The case space of a sweep.  Borrows the vary array (it must outlive it). */
typedef struct {
    size_t nvary;
    const hf_vary *vary;
    int zip;                         /* 1: zipped lists, case k takes value k of each */
    size_t count[HF_STUDY_MAX_VARY]; /* values of each parameter */
    uint64_t ncases;                 /* number of cases */
} hf_study_grid;

/* Sets up the case space.  Full factorial grid (zip 0): the first parameter
 * varies slowest, the last fastest; ncases is the product of the counts.
 * Zipped (zip 1): every parameter must have the same count, which is ncases.
 * Returns HF_OK, HF_EINVAL (no parameter, an empty or invalid range, zipped
 * lengths differ: the message names the paths and counts) or HF_ELIMIT
 * (more than HF_STUDY_MAX_VARY parameters, a parameter with more than
 * HF_STUDY_MAX_VALUES values, more than HF_STUDY_MAX_CASES cases). */
hf_status hf_study_grid_init(hf_study_grid *g, const hf_vary *vary, size_t nvary, int zip,
                             hf_error *err);

/* Index of each parameter's value for case k (< ncases) into idx[nvary]. */
void hf_study_grid_index(const hf_study_grid *g, uint64_t k, size_t *idx);

/* Values (SI) of every parameter for case k (< ncases) into values[nvary]. */
void hf_study_grid_values(const hf_study_grid *g, uint64_t k, double *values);

/* The cases [*begin, *end) of shard k (1-based, 1 <= k <= n) of n contiguous,
 * near-equal parts of `total` cases (sizes differ by at most one, the larger
 * ones first).  The shards of 1..n cover 0..total exactly once, in order. */
void hf_study_shard_range(uint64_t total, unsigned k, unsigned n, uint64_t *begin, uint64_t *end);

/* Parses "K/N" (1 <= K <= N <= HF_STUDY_MAX_SHARDS, plain decimal integers).
 * HF_EINVAL with a message otherwise. */
hf_status hf_study_shard_parse(const char *text, unsigned *k, unsigned *n, hf_error *err);

/* A row function formats case k into buf (capacity cap, including the final
 * '\0'), ending with '\n', and returns the number of bytes written (without
 * the '\0').  It must return a value >= cap (or < 0) only when the row does
 * not fit; the stream then stops with HF_ELIMIT.  A failing case is not an
 * error here: the row function writes a row with its status.  `state` is the
 * calling thread's own state (see hf_study_stream); row functions must not
 * allocate.
 *
 * `chunk_start` is 1 when k is the first case of a warm-start chain (see
 * HF_STUDY_CHAIN): the row function must then forget any warm start, so the
 * result of case k depends only on k and never on which thread ran it or on
 * where a shard began.  `emit` is 0 for cases evaluated only to rebuild such a
 * chain ahead of a shard's first case: the function must then still solve the
 * case (to update its warm start) and its text is discarded. */
typedef int (*hf_study_row_fn)(void *state, uint64_t k, int chunk_start, int emit, char *buf,
                               size_t cap);

/* Progress callback: called on the calling thread after each block is
 * written, with the cases written so far and the total of the range. */
typedef void (*hf_study_progress_fn)(void *ctx, uint64_t done, uint64_t total);

/* Cases per warm-start chain: cases k with k % HF_STUDY_CHAIN == 0 start a
 * chain.  Chains are the unit of parallel work, so results do not depend on
 * the number of threads or on shard boundaries. */
#define HF_STUDY_CHAIN 16

typedef struct {
    int jobs;                      /* threads, >= 1 (states must hold this many) */
    size_t row_cap;                /* bytes reserved per row, including '\0' (>= 2) */
    size_t block;                  /* cases per block (0 = automatic: ~4 MiB of rows, 256..16384
                                      cases; always rounded up to a multiple of HF_STUDY_CHAIN) */
    hf_study_progress_fn progress; /* may be NULL */
    void *progress_ctx;
    volatile int *stop; /* optional: when *stop becomes non-zero the stream stops
                           after the current block with HF_EIO "interrupted" */
} hf_study_stream_options;

/* Evaluates cases [begin, end) with `row` on opt->jobs OpenMP threads, thread
 * t using states[t], and writes the rows to out in case order: the bytes
 * written are the same for any number of threads (out may be NULL: the
 * rows are evaluated and their text dropped, for row functions that keep
 * their results in memory).  Allocates one block
 * buffer (block * row_cap bytes) up front and nothing per case.  Returns
 * HF_OK, HF_ENOMEM, HF_ELIMIT (a row did not fit in row_cap: a bug or a huge
 * line count), HF_EIO (a write to out failed, or stopped). */
hf_status hf_study_stream(uint64_t begin, uint64_t end, void **states, hf_study_row_fn row,
                          const hf_study_stream_options *opt, FILE *out, hf_error *err);

/* The number of processors OpenMP sees (the default for --jobs), >= 1. */
int hf_study_default_jobs(void);

#endif
