/* csv.h - CSV output: fast round-tripping numbers, RFC 4180 quoting, rows.
 *
 * Flow: case -> model -> line solve -> spread -> studies -> **writers**.
 * Every command that writes CSV goes through this module, so all CSV files
 * share one dialect:
 *   - comma separator, "\n" line ends (RFC 4180 allows CRLF; plain LF is what
 *     every spreadsheet, pandas and R accept), no BOM;
 *   - numbers in C-locale "%.Ng" form (default N = 10 significant digits),
 *     written by a hand-made formatter that gives the same text as printf
 *     "%.Ng" (checked in tests/test_csv.c) about ten times faster;
 *   - text fields quoted per RFC 4180 when needed (comma, quote, CR, LF, or
 *     leading/trailing space): the field is enclosed in double quotes and
 *     every quote inside is doubled;
 *   - NaN and Inf are NEVER written as numbers: such a field is left EMPTY
 *     (an RFC 4180 empty field, read as "missing" by spreadsheets, pandas and
 *     R) and counted in hf_csv.nonfinite, so the caller can warn.  The library
 *     never produces NaN/Inf on purpose; an empty field means a bug or a
 *     failed point the caller chose to keep.
 *
 * Usage (writers take a FILE *; the hf_csv struct lives on the caller's
 * stack, allocates nothing and buffers the current row; each ended row is
 * handed to the FILE in one fwrite):
 *
 *     hf_csv c;
 *     hf_csv_init(&c, out, 0);                       // 0 = default digits (10)
 *     hf_csv_header(&c, "offset_m", "force_kN", NULL);
 *     for (...) {
 *         hf_csv_field_double(&c, x);
 *         hf_csv_field_double(&c, f / 1e3);
 *         hf_csv_end_row(&c);
 *     }
 *     if (c.nonfinite) ...warn...;                   // write errors: ferror(out)
 */
#ifndef HOLDFAST_CSV_H
#define HOLDFAST_CSV_H

#include <stddef.h>
#include <stdio.h>

#define HF_CSV_DIGITS_DEFAULT 10 /* significant digits of numbers */
#define HF_CSV_DIGITS_MIN 1
#define HF_CSV_DIGITS_MAX 17   /* 17 digits round-trip every double exactly */
#define HF_CSV_NUMBER_MAX 32   /* buffer size that holds any formatted number and its NUL */
#define HF_CSV_ROW_BUFFER 4096 /* row bytes buffered before a write (not a row limit) */

/* A CSV writer.  Fields are public for reading; change them only through the
 * functions below. */
typedef struct {
    FILE *out;        /* destination (not owned; never closed here) */
    int digits;       /* significant digits of numbers, HF_CSV_DIGITS_MIN..MAX */
    size_t column;    /* fields written in the current row so far */
    size_t rows;      /* rows ended so far (the header counts as a row) */
    size_t nonfinite; /* NaN/Inf values written as empty fields so far */
    size_t len;       /* bytes pending in buf */
    char buf[HF_CSV_ROW_BUFFER];
} hf_csv;

/* Formats v with `digits` significant digits (clamped to 1..17) exactly as
 * snprintf(buf, HF_CSV_NUMBER_MAX, "%.*g", digits, v) would in the C locale,
 * into buf (at least HF_CSV_NUMBER_MAX bytes), NUL-terminated.  Returns the
 * length.  -0.0 is written "-0" as printf does.  Non-finite v writes ""
 * (length 0): the CSV convention above.  Pure function, thread-safe, no
 * allocation.  Strings parse back with strtod to within half a unit of the
 * last written digit (and exactly for digits = 17). */
size_t hf_csv_format_double(char *buf, double v, int digits);

/* Starts a writer on `out` (not owned).  digits <= 0 means
 * HF_CSV_DIGITS_DEFAULT; other values are clamped to 1..17. */
void hf_csv_init(hf_csv *c, FILE *out, int digits);

/* Writes one row of column names (a NULL-terminated list of strings, quoted
 * as needed) and ends it.  Column names carry their units: "tension_kN". */
void hf_csv_header(hf_csv *c, const char *name, ...)
#if defined(__GNUC__)
    __attribute__((sentinel))
#endif
    ;

/* The same from an array of n names. */
void hf_csv_header_array(hf_csv *c, const char *const *names, size_t n);

/* Appends one field to the current row: a number (empty when not finite, and
 * counted in c->nonfinite), a string (RFC 4180 quoting; NULL writes an empty
 * field), an integer, or an empty field. */
void hf_csv_field_double(hf_csv *c, double v);
void hf_csv_field_str(hf_csv *c, const char *s);
void hf_csv_field_long(hf_csv *c, long v);
void hf_csv_field_size(hf_csv *c, size_t v);
void hf_csv_field_empty(hf_csv *c);

/* Ends the current row ("\n") and hands the row to the FILE (one fwrite), so
 * after hf_csv_end_row nothing is pending in the writer. */
void hf_csv_end_row(hf_csv *c);

/* Hands the bytes of an unfinished row to the FILE (does not fflush it).
 * Needed only when mixing direct FILE writes into the middle of a row.
 * Returns 0, or -1 when the FILE has seen a write error (ferror). */
int hf_csv_flush(hf_csv *c);

/* Writes s to `out` as one CSV field with RFC 4180 quoting (no separator).
 * Exposed for writers that build rows by hand.  Returns 0 or EOF. */
int hf_csv_quote(FILE *out, const char *s);

#endif
