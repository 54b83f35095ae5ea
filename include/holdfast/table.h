/* table.h - the hull's coefficient tables: RAOs, drift, wind and current.
 *
 * Flow: case (paths) -> **table** -> environment -> design study.
 * Reads the four CSV tables of the design method, checks them, holds them in
 * SI units and interpolates them.  Knows nothing of spectra or moorings.
 *
 * Columns (names fixed; any order; each exactly once; no other column):
 *   HF_TABLE_RAO    frequency_rad_s,heading_deg,surge_m_per_m,sway_m_per_m,yaw_deg_per_m
 *                   motion amplitude per unit wave amplitude (>= 0)
 *   HF_TABLE_DRIFT  frequency_rad_s,heading_deg,surge_kN_per_m2,sway_kN_per_m2,yaw_kNm_per_m2
 *                   mean drift force per wave amplitude squared (any sign)
 *   HF_TABLE_COEF   heading_deg,cx,cy,cmz
 *                   wind or current load coefficients (any sign)
 * heading_deg is the direction the waves (wind, current) travel toward,
 * relative to the hull's x axis, counter-clockwise, in degrees (any finite
 * value; taken modulo 360).  The three values are along the hull's x and y
 * axes and about its vertical axis (counter-clockwise positive).
 *
 * File dialect: comma separated, one header line, then one row per line;
 * blank lines and lines starting with '#' are skipped; spaces around fields
 * and a final CR are ignored; numbers in C syntax (no NaN, no Inf).  Frequency
 * tables must be a full grid: every tabulated frequency at every tabulated
 * heading, exactly once.  At most HF_TABLE_MAX_ROWS rows and
 * HF_TABLE_MAX_LINE bytes per line.
 *
 * Stored in SI: frequency rad/s, heading rad in [0, 2 pi), RAO m/m and rad/m
 * (yaw degrees per metre times pi/180), drift N/m^2 and N m/m^2 (kN times
 * 1000), coefficients as read.
 *
 * Interpolation: linear in frequency, held constant beyond the first and
 * last tabulated frequency (the design checks refuse spectra with more than
 * 0.1 % of their energy out there); linear and periodic in heading (the
 * last tabulated heading joins the first across 360 deg).  A table with one
 * heading is constant in heading, but covers only that heading. */
#ifndef HOLDFAST_TABLE_H
#define HOLDFAST_TABLE_H

#include <stddef.h>
#include <stdio.h>
#include "holdfast/status.h"

#define HF_TABLE_MAX_ROWS 200000 /* rows per file (HF_ELIMIT beyond) */
#define HF_TABLE_MAX_LINE 4096   /* bytes per line, newline included (HF_ELIMIT beyond) */
#define HF_TABLE_HEADING_GAP_DEFAULT 0.78539816339744830962 /* rad, 45 deg */

typedef enum {
    HF_TABLE_RAO = 0, /* wave-frequency motion RAOs */
    HF_TABLE_DRIFT,   /* mean wave drift force coefficients */
    HF_TABLE_COEF,    /* wind or current load coefficients */
    HF_TABLE_KIND_COUNT
} hf_table_kind;

typedef struct hf_table hf_table;

/* Stable name of a kind ("raos", "drift", "coefficients"). */
const char *hf_table_kind_name(hf_table_kind k);

/* The header a table of kind k must have, in the documented order. */
const char *hf_table_columns(hf_table_kind k);

/* Reads a table of kind k from `in`; `name` (the file name) starts every
 * message: "barge-raos.csv:7:14: column surge_m_per_m: expected a number,
 * got \"abc\"".  On success *out owns a new table (free with hf_table_free).
 * Returns HF_OK; HF_EINVAL for a bad header (missing, unknown or repeated
 * column), a bad value, a row with too few or too many fields, a frequency
 * <= 0, a negative RAO, a repeated (frequency, heading) pair or an
 * incomplete grid, no data rows; HF_ELIMIT for too many rows or too long a
 * line; HF_EIO on a read error; HF_ENOMEM.  *out is NULL on failure. */
hf_status hf_table_read(FILE *in, const char *name, hf_table_kind k, hf_table **out, hf_error *err);

/* Opens `path` and reads it with hf_table_read (name = path).  HF_EIO with
 * the system's reason when the file cannot be opened. */
hf_status hf_table_load(const char *path, hf_table_kind k, hf_table **out, hf_error *err);

/* Builds a table from values already in SI units: nf frequencies (rad/s,
 * strictly increasing, > 0; nf = 1 and freq may be NULL for HF_TABLE_COEF),
 * nh headings (rad, strictly increasing within [0, 2 pi)), and
 * values[(i_f * nh + i_h) * 3 + c] for c = x, y, yaw.  Same checks and
 * statuses as hf_table_read; name is copied for messages. */
hf_status hf_table_from_values(hf_table_kind k, const char *name, size_t nf, const double *freq,
                               size_t nh, const double *head, const double *values, hf_table **out,
                               hf_error *err);

/* Frees a table; NULL is allowed. */
void hf_table_free(hf_table *t);

/* Accessors (t not NULL): kind; file name (owned by the table); number of
 * tabulated frequencies (0 for HF_TABLE_COEF) and headings. */
hf_table_kind hf_table_kind_of(const hf_table *t);
const char *hf_table_name(const hf_table *t);
size_t hf_table_nfreq(const hf_table *t);
size_t hf_table_nheading(const hf_table *t);
/* The tabulated frequencies, rad/s, increasing, hf_table_nfreq of them
 * (NULL for HF_TABLE_COEF); owned by the table. */
const double *hf_table_freqs(const hf_table *t);
/* Tabulated frequency range, rad/s (both 0 for HF_TABLE_COEF). */
void hf_table_freq_range(const hf_table *t, double *lo, double *hi);

/* Largest gap between neighbouring tabulated headings, across 360 deg too,
 * rad (2 pi for a table with one heading): for `holdfast check` reports. */
double hf_table_heading_gap_max(const hf_table *t);

/* Interpolated values at frequency w (rad/s; ignored for HF_TABLE_COEF) and
 * relative heading (rad, any finite value): v[0] along hull x, v[1] along
 * hull y, v[2] about the vertical axis, in the SI units above.  Pure; no
 * allocation; thread-safe. */
void hf_table_eval(const hf_table *t, double w, double heading, double v[3]);

/* Checks that the table covers relative heading `heading` (rad): it is a
 * tabulated heading (within 1e-9 rad), or it lies between two neighbouring
 * tabulated headings (across 360 deg too) at most max_gap (rad) apart, so
 * the linear interpolation bridges a gap the user chose to tabulate.
 * Returns HF_OK or HF_EINVAL with a message naming the file, the heading
 * and the neighbours, prefixed by `what` (e.g. "environment storm-1: waves"). */
hf_status hf_table_heading_check(const hf_table *t, double heading, double max_gap,
                                 const char *what, hf_error *err);

#endif
