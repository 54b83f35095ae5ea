/* session.h - a binding-friendly handle on one loaded case: parameters by path, results as tables.
 *
 * Flow: case -> model -> line solve -> spread -> balance -> analysis -> **session** (scripts).
 * A session owns a loaded case (its model) and the workspaces to solve it,
 * and answers the questions the commands answer - lines at a pose, the 6x6
 * stiffness, a restoring curve, balance of the load cases - as flat tables
 * whose column names are those of the matching CSV (holdfast lines,
 * stiffness, curve, balance --csv) and whose numbers come from the same
 * functions the CSV writers use (results.h), so a script and the command
 * line see the same numbers.  It is what the Python package (python/holdfast)
 * binds through ctypes: opaque handles, plain C types, a status on every call
 * and the message of the last failure kept in the session.
 *
 * Units: parameters are read and set in SI (m, N, kg/m^3, rad...), or set
 * from a string with units ("310 m", "76 mm", "30 deg") parsed by the units
 * module.  Offsets and directions passed in are SI (m, rad).  Table values
 * are in the unit each column name declares (tension_kN in kN, _deg in
 * degrees, _m in m), exactly as in the CSV files; hf_session_table_scale
 * gives the factor to SI.
 *
 * Ownership: a session is created by hf_session_alloc and released by
 * hf_session_free.  A table returned through *out belongs to the caller and
 * is released by hf_session_table_free; it copies everything it holds and
 * stays valid after the session is changed or freed.  Strings returned by
 * accessors are borrowed from their session or table.
 *
 * Threads: one session must not be used by two threads at once (every call,
 * even a solve, uses its workspace and its message).  Different sessions may
 * be used on different threads at the same time; they share nothing but
 * GSL's error handler, which holdfast installs once (hf_session_alloc calls
 * hf_gsl_handler_install; call hf_session_alloc once before starting threads
 * that create sessions).  Tables are read-only after they are returned and
 * may be read from any thread.
 *
 * Statuses (status.h): HF_OK; HF_EINVAL bad input (case text, path, value,
 * load name), also for a call that needs a loaded case before one is;
 * HF_ELIMIT a size limit; HF_EIO a file that cannot be read; HF_ENOMEM;
 * HF_ENOCONV, HF_EUNSUPPORTED, HF_ENOEQUIL a solve that failed.  After
 * every call hf_session_message holds the failure's complete message (the
 * command line's text: "case.yaml:12:7: lines[0]...: expected ..."), or ""
 * after success. */
#ifndef HOLDFAST_SESSION_H
#define HOLDFAST_SESSION_H

#include <stddef.h>
#include "holdfast/status.h"

typedef struct hf_session hf_session;
typedef struct hf_session_table hf_session_table;

/* A new session without a case; NULL when memory runs out.  Thread-safe
 * after the first call returns (see Threads above). */
hf_session *hf_session_alloc(void);

/* Releases the session and everything it owns.  NULL is allowed.  Tables
 * returned earlier stay valid. */
void hf_session_free(hf_session *s);

/* The message of the last call on s: the failure's text, or "" when it
 * succeeded.  Borrowed: valid until the next call on s. */
const char *hf_session_message(const hf_session *s);

/* Warnings of the last successful result call (one per line, e.g. "line
 * bow is overloaded: utilisation 1.21 at offset 0 m"), "" when none.  The
 * results are complete; the warning says what the CSV's alert column says
 * and the command line's exit status 1 would report.  Borrowed as above. */
const char *hf_session_warnings(const hf_session *s);

/* Loads the case file at `path` (hf_case_load), or the case text text[0..len)
 * whose messages name the file `name` (NULL: "<string>").  The case held
 * before is replaced on success and kept on failure.  HF_OK, HF_EINVAL,
 * HF_ELIMIT, HF_EIO, HF_ENOMEM with the loader's located message. */
hf_status hf_session_load_file(hf_session *s, const char *path);
hf_status hf_session_load_string(hf_session *s, const char *text, size_t len, const char *name);

/* The loaded case's number of lines and of load cases (0 without a case),
 * and the name of line / load case i (NULL out of range).  Borrowed. */
size_t hf_session_nlines(const hf_session *s);
size_t hf_session_nloads(const hf_session *s);
const char *hf_session_line_name(const hf_session *s, size_t i);
const char *hf_session_load_name(const hf_session *s, size_t i);

/* Reads the parameter at `path` (the paths of --vary: "site.depth",
 * "lines[bow].sections[1].length", "loads[storm].force"...) in SI into
 * *value.  HF_EINVAL with the model's message for an unknown path. */
hf_status hf_session_get(hf_session *s, const char *path, double *value);

/* Sets the parameter at `path` to `value` (SI), or to the quantity in
 * `text` with its units ("310 m"; a bare number is SI).  On any failure
 * (unknown path, bad text, a value the model refuses) the case is left
 * exactly as it was and stays usable; HF_EINVAL with a message that starts
 * with the path. */
hf_status hf_session_set(hf_session *s, const char *path, double value);
hf_status hf_session_set_text(hf_session *s, const char *path, const char *text);

/* Every line solved with the hull at the case's pose plus offset (surge m,
 * sway m, heading rad; NULL = no offset), cold-started as 'holdfast lines'
 * does: a table of the lines CSV's columns, one row per line.  A line that
 * fails to solve fails the call (its message, no table), as the command's
 * exit status does.  Overloaded lines are results (column alert) and are
 * named in hf_session_warnings. */
hf_status hf_session_lines(hf_session *s, const double offset[3], hf_session_table **out);

/* The 6x6 stiffness at the same pose: the stiffness CSV's table, rows
 * surge..yaw then static_load (first column "row", text), kN/m, kN/rad,
 * kN m/m, kN m/rad and kN, kN m. */
hf_status hf_session_stiffness(hf_session *s, const double offset[3], hf_session_table **out);

/* The restoring curve along `direction` (rad from global x, heading fixed)
 * at the n >= 1 offsets (m from the rest pose), warm-started in order as
 * 'holdfast curve' does: the curve CSV's table, one row per offset.  An
 * offset that does not solve fails the call with its message (the command
 * stops there too).  Overloaded points go to hf_session_warnings. */
hf_status hf_session_curve(hf_session *s, double direction, const double *offsets, size_t n,
                           hf_session_table **out);

/* Balance of the load cases named loads[0..nloads) (nloads 0: every load
 * case, in case order), intact and each line broken, as 'holdfast balance'
 * does: the balance CSV's table, one row per still water level, load case and
 * condition (the levels of site.water_levels, else the one level).  A
 * condition without equilibrium is a row (status column, message, empty
 * values) and is named in hf_session_warnings.  HF_EINVAL for an unknown
 * load name or a case without load cases. */
hf_status hf_session_balance(hf_session *s, const char *const *loads, size_t nloads,
                             hf_session_table **out);

/* ---- tables ---- */

/* Releases a table.  NULL is allowed. */
void hf_session_table_free(hf_session_table *t);

size_t hf_session_table_rows(const hf_session_table *t);
size_t hf_session_table_columns(const hf_session_table *t);

/* Name of column j, as in the CSV header (NULL out of range).  Borrowed. */
const char *hf_session_table_column(const hf_session_table *t, size_t j);

/* 1 when column j holds text (line, status, alert...), 0 when numbers. */
int hf_session_table_is_text(const hf_session_table *t, size_t j);

/* Factor from column j's unit to SI (kN -> 1e3, deg -> pi/180, m and
 * plain numbers 1); 0 for text columns. */
double hf_session_table_scale(const hf_session_table *t, size_t j);

/* The numbers, rows x columns row-major (row i, column j at [i * columns + j]),
 * in each column's unit.  NaN in text columns and in the cells the CSV
 * leaves empty (a broken line, a condition without equilibrium): check
 * hf_session_table_is_empty or the row's status before using a value.
 * Borrowed: valid until the table is freed. */
const double *hf_session_table_values(const hf_session_table *t);

/* 1 when cell (i, j) is empty in the CSV (no value), else 0. */
int hf_session_table_is_empty(const hf_session_table *t, size_t i, size_t j);

/* Text of cell (i, j) of a text column ("" when empty), NULL for a numeric
 * column or out of range.  Borrowed. */
const char *hf_session_table_text(const hf_session_table *t, size_t i, size_t j);

#endif
