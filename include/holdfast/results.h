/* results.h - solved results as CSV: the column layouts of lines, stiffness, curve, balance.
 *
 * Flow: case -> model -> line solve -> spread -> balance / studies -> **writers**.
 * One place for the CSV layouts that both the commands (holdfast lines,
 * stiffness, curve, balance --csv) and the studies of holdfast run write, so
 * a study file is byte-identical to the matching command's CSV.  The column
 * names are fixed (docs/studies.md and the commands' --help); numbers go
 * through the csv module (include/holdfast/csv.h: 10 significant digits,
 * RFC 4180 quoting).  Values are converted from SI to the units the column
 * names declare (kN, kN m, deg).
 *
 * Matrices are passed as double K[6][6] and only read (a const 2-D array
 * parameter would need casts at every call in C11).
 *
 * Every writer takes a FILE * (not owned, never closed or flushed), writes
 * whole rows (each row reaches the FILE in one fwrite), allocates nothing and
 * never prints elsewhere.  A value that is not finite is never written as a
 * number: its field is left empty and counted in the returned number, so the
 * caller can warn (hf_cli_warn_nonfinite); the library never produces NaN on
 * purpose.  Write errors show in ferror(out); the output file layer
 * (include/holdfast/outfile.h) reports them at commit. */
#ifndef HOLDFAST_RESULTS_H
#define HOLDFAST_RESULTS_H

#include <stddef.h>
#include <stdio.h>
#include "holdfast/analysis.h"
#include "holdfast/balance.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"
#include "holdfast/status.h"

/* Columns of the lines CSV (17) and of the stiffness CSV (7). */
#define HF_RESULTS_LINES_COLUMNS 17
#define HF_RESULTS_STIFFNESS_COLUMNS 7
/* Fixed columns of the curve CSV before T_<line>_kN, and of the balance CSV
 * before and after Tmax_<line>_kN. */
#define HF_RESULTS_CURVE_FIXED 9
#define HF_RESULTS_BALANCE_HEAD 12
#define HF_RESULTS_BALANCE_TAIL 6
/* Per-line anchor columns of the balance CSV, each group nlines wide, after
 * Tmax_<line>_kN: anchor_load_<line>_kN, angle_<line>_deg, sliding_<line>,
 * uplift_<line> (hf_results_balance_anchor_groups). */
#define HF_RESULTS_BALANCE_ANCHOR 4
extern const char *const hf_results_balance_anchor_groups[HF_RESULTS_BALANCE_ANCHOR][2];

/* Column names, in order (static strings). */
extern const char *const hf_results_lines_columns[HF_RESULTS_LINES_COLUMNS];
extern const char *const hf_results_stiffness_columns[HF_RESULTS_STIFFNESS_COLUMNS];
extern const char *const hf_results_curve_columns[HF_RESULTS_CURVE_FIXED];
extern const char *const hf_results_balance_head[HF_RESULTS_BALANCE_HEAD];
extern const char *const hf_results_balance_tail[HF_RESULTS_BALANCE_TAIL];

/* ---- result cells: one row of a table before it is written ----
 *
 * Each writer below builds its rows as cells first (the *_row functions) and
 * writes the cells, so the session tables (session.h) and the CSV files get
 * the same numbers from one computation.  A number is in the unit its column
 * name declares (kN, kN m, deg, m); a number that is not finite is written
 * as an empty field and counted; an empty cell is written empty and not
 * counted (a broken line, a condition without result: the gap is intended).
 * A text column's cell is always text ("" when there is nothing to say), so
 * every column is either numeric or text whatever the row. */
typedef enum {
    HF_RESULTS_EMPTY = 0, /* numeric column, no value (written empty, not counted) */
    HF_RESULTS_NUMBER,    /* value, in the column's unit */
    HF_RESULTS_TEXT       /* text (borrowed: the model, a static string or the caller's scratch) */
} hf_results_cell_kind;

typedef struct {
    hf_results_cell_kind kind;
    double value;
    const char *text;
} hf_results_cell;

/* Scratch space for the formatted text cells of one row (status, condition,
 * criterion); the cells point into it, so it must outlive their use. */
typedef struct {
    char a[HF_ERROR_TEXT];
    char b[HF_MODEL_MAX_NAME + 32];
} hf_results_text;

/* Name of column j (< the table's column count) of the curve CSV
 * (HF_RESULTS_CURVE_FIXED + nlines + 1 columns) or of the balance CSV
 * (HF_RESULTS_BALANCE_HEAD + nlines x (1 + HF_RESULTS_BALANCE_ANCHOR) +
 * HF_RESULTS_BALANCE_TAIL columns) of model m into buf (cap bytes, at least
 * HF_MODEL_MAX_NAME + 32).  Returns buf. */
size_t hf_results_curve_ncolumns(const hf_model *m);
size_t hf_results_balance_ncolumns(const hf_model *m);
const char *hf_results_curve_column_name(const hf_model *m, size_t j, char *buf, size_t cap);
const char *hf_results_balance_column_name(const hf_model *m, size_t j, char *buf, size_t cap);

/* The cells of one row of the lines CSV (line i, HF_RESULTS_LINES_COLUMNS
 * cells) and of the stiffness CSV (row i: 0..5 surge..yaw, 6 static_load;
 * HF_RESULTS_STIFFNESS_COLUMNS cells), and cell j of a row of the curve CSV
 * (point k) and of the balance CSV (condition r of load case `load`), whose
 * width depends on the number of lines.  Text cells may point into *t, which
 * then must outlive their use.  Pure functions: no allocation, no output. */
void hf_results_lines_row(const hf_model *m, const hf_spread_result *r, size_t i,
                          hf_results_cell *cells, hf_results_text *t);
void hf_results_stiffness_row(double K[6][6], const double force[6], int i, hf_results_cell *cells);
hf_results_cell hf_results_curve_cell(const hf_model *m, const hf_analysis_curve *c, size_t k,
                                      size_t j);
hf_results_cell hf_results_balance_cell(const hf_model *m, const hf_load *load,
                                        const hf_balance_result *r, size_t j, hf_results_text *t);

/* ---- lines: one row per line at one pose ---- */

/* Name of line i of m for messages and cells, "-" when i is out of range or
 * the line has no name.  Never NULL; borrowed from the model. */
const char *hf_results_line_name(const hf_model *m, size_t i);

/* 1 when line i of r was solved (not broken, status HF_OK), else 0. */
int hf_results_line_solved(const hf_spread_result *r, size_t i);

/* Status text of line i of r: its regime name ("suspended", ...), "broken",
 * or "failed: <why>" formatted into buf (cap bytes, cut to fit).  Returns a
 * static string or buf. */
const char *hf_results_line_status(const hf_spread_result *r, size_t i, char *buf, size_t cap);

/* The mark of the "alert" column for a line whose tension reaches the
 * breaking load (MBL) of one of its sections: utilisation T/MBL >= 1. */
#define HF_RESULTS_ALERT_OVERLOADED "overloaded"

/* 1 when line i of r was solved and is overloaded (max utilisation >= 1),
 * else 0.  An overloaded line is a state, not a failure: the numbers stay,
 * the alert column and the exit status 1 report it. */
int hf_results_line_overloaded(const hf_spread_result *r, size_t i);

/* HF_RESULTS_ALERT_OVERLOADED when line i is overloaded, else "" (static). */
const char *hf_results_line_alert(const hf_spread_result *r, size_t i);

/* Index of the first overloaded line of r, (size_t)-1 when none is. */
size_t hf_results_first_overloaded(const hf_spread_result *r);

/* Strain a line needs to reach its anchor: the straight fairlead-anchor
 * distance hypot(g->x, g->z) over the unstretched length of l, minus 1
 * (a fraction; <= 0 when the line is long enough to reach it slack). */
double hf_results_line_needed_strain(const hf_spread_geom *g, const hf_line *l);

/* When line `name` (geometry g, line l) must stretch beyond its unstretched
 * length to reach its anchor, writes one line to err:
 * "holdfast <cmd>: warning: line <name> must stretch <e> % to reach its
 * anchor (...)" and returns 1; otherwise writes nothing and returns 0. */
int hf_results_stretch_warn(FILE *err, const char *cmd, const char *name, const hf_spread_geom *g,
                            const hf_line *l);

/* Angle of the line above horizontal at the fairlead, degrees: atan2(V, H). */
double hf_results_line_top_angle_deg(const hf_line_state *s);

/* Writes the lines CSV: the header (hf_results_lines_columns) and one row
 * per line of m from r (a spread solve of m; r->nlines == m->nlines): line,
 * status, then fairlead tension, horizontal, vertical (kN), top angle (deg),
 * anchor tension, anchor vertical (kN), anchor uplift (deg), grounded length,
 * span (m), max utilisation, fairlead height (m), anchor horizontal (kN),
 * touchdown (m), largest tension along the line (kN), alert
 * (hf_results_line_alert).  A broken or failed line keeps its name and
 * status, its 15 other cells are left empty.  Returns the
 * number of non-finite values left empty (0 normally). */
size_t hf_results_lines_write(FILE *out, const hf_model *m, const hf_spread_result *r);

/* ---- stiffness: the 6x6 matrix and the static load ---- */

/* Writes the stiffness CSV: header row,surge,...,yaw; rows surge..yaw of K
 * (K[i][j] = -dF_i/dq_j in N/m, N/rad, N m/m, N m/rad, written /1e3: kN/m,
 * kN/rad, kN m/m, kN m/rad); a last row static_load with force (N, N m on
 * the hull, written in kN, kN m).  Returns the number of non-finite values
 * left empty. */
size_t hf_results_stiffness_write(FILE *out, double K[6][6], const double force[6]);

/* The matrix and static load for tables people read: K in kN/m, kN/rad,
 * kN m/m, kN m/rad and the load in kN, kN m, with entries below 1e-9 of the
 * largest entry of K (or of the load) set to 0 - they are solver round-off,
 * not coupling.  CSV files keep the exact values. */
void hf_results_stiffness_for_people(double K[6][6], const double force[6], double Kp[6][6],
                                     double Fp[6]);

/* ---- curve: restoring force and stiffness against offset ---- */

/* Writes the curve CSV header: hf_results_curve_columns then T_<line>_kN per
 * line of m, then alert.  Returns HF_OK, or HF_ELIMIT (err set, nothing
 * written) when a line name is longer than HF_MODEL_MAX_NAME bytes (the case
 * file limit). */
hf_status hf_results_curve_header_write(FILE *out, const hf_model *m, hf_error *err);

/* 1 when point k of curve c solved and a line is overloaded there (max
 * utilisation >= 1), else 0. */
int hf_results_curve_overloaded(const hf_analysis_curve *c, size_t k);

/* Writes row k < c->n of curve c (computed for m; include/holdfast/analysis.h):
 * the point (forces in kN, moment in kN m, stiffness in kN/m), the name of
 * the line with the largest tension ("" when none) and each line's fairlead
 * tension in kN, then alert ("overloaded" when hf_results_curve_overloaded,
 * else empty).  A point that did not solve is written as its offset with
 * every other field empty (not counted: the gap is intended).  Returns the
 * number of non-finite values left empty. */
size_t hf_results_curve_row_write(FILE *out, const hf_model *m, const hf_analysis_curve *c,
                                  size_t k);

/* ---- balance: one row per load case and condition ---- */

/* "intact" or "broken:<line>" for r, into buf (cap bytes). */
void hf_results_balance_condition(const hf_model *m, const hf_balance_result *r, char *buf,
                                  size_t cap);

/* The governing criterion of r: "<name>" or "<name>:<line>", into buf. */
void hf_results_balance_criterion(const hf_model *m, const hf_balance_result *r, char *buf,
                                  size_t cap);

/* Smallest MBL/T over the lines of r that carry load, or 0 when none does. */
double hf_results_balance_min_factor(const hf_balance_result *r);

/* Writes the balance CSV header: hf_results_balance_head, Tmax_<line>_kN per
 * line of m, the anchor groups (anchor_load_<line>_kN, angle_<line>_deg,
 * sliding_<line>, uplift_<line>, each per line), hf_results_balance_tail.
 * HF_OK, or HF_ELIMIT as hf_results_curve_header_write. */
hf_status hf_results_balance_header_write(FILE *out, const hf_model *m, hf_error *err);

/* Writes one balance row for condition r of load case `load`, solved in m
 * (the model at the row's still water level): load, condition, water level
 * (m->site.water_level, m above the datum), status, surge, sway (m), yaw
 * (deg), max tension (kN), its line, max utilisation, criterion, passed
 * (1/0), each line's largest tension (kN), each line's anchor load (kN) and
 * uplift angle (deg) (as checked: hf_criteria_anchor_forces), gravity-block
 * sliding and uplift factors (empty for other anchors or when nothing
 * slides / lifts it), horizontal offset (m), most utilised line, smallest
 * MBL/T, required MBL/T (empty when not checked), message, alert
 * ("overloaded" when a line reached its MBL, else empty).  When r->status
 * is not HF_OK the result values are left empty; a broken line's anchor
 * fields too.  Returns the number of non-finite values left empty. */
size_t hf_results_balance_row_write(FILE *out, const hf_model *m, const hf_load *load,
                                    const hf_balance_result *r);

/* The failing number of condition r in words, into buf ("" when r passed or
 * has no result): "nw overloaded: T/MBL 1.690", "MBL/T 2.960 < 3.000 (nw)",
 * "offset 12.24 m > 5.00 m", "nw sliding 0.608 < 1.00", "nw uplift 0.930
 * < 1.00", "nw uplift angle 3.20 deg > 0.00 deg". */
void hf_results_balance_failure(const hf_model *m, const hf_balance_result *r, char *buf,
                                size_t cap);

/* ---- balance over a water-level envelope (analysis.h) ---- */

/* "<load>, <condition>, <level> m" of w (m's names; "-" when nothing was
 * found, w->load == (size_t)-1) into buf (cap bytes). */
void hf_results_where(const hf_model *m, const hf_analysis_where *w, char *buf, size_t cap);

/* The scope of e: "N load cases x M water levels (low to high m) x K
 * conditions (intact and each of L lines broken) = T conditions" into buf. */
void hf_results_envelope_scope(const hf_model *m, const hf_analysis_envelope *e, char *buf,
                               size_t cap);

/* Writes the readable summary of envelope e (run on m) to out: the scope, per
 * line the worst tension with its utilisation, MBL/T, load, condition and
 * level, and per line the anchor over the envelope (largest load and angle,
 * smallest gravity-block factors with where, the required factors, PASS/FAIL
 * with the first failure), the anchor-load choice (friction), and the worst
 * overload. */
void hf_results_envelope_summary_write(FILE *out, const hf_model *m, const hf_analysis_envelope *e);

#endif
