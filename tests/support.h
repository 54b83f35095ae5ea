/* support.h - helpers shared by the cmocka test programs (linked into every
 * tests/test_*.c program by the Makefile): running the built CLI ($HF_BIN) as a
 * child process, reading and writing whole files, scratch directories, CSV
 * text splitting and small hand-built lines.  Outside the library flow; test
 * code only.  Include it after <cmocka.h> (the macros below use cmocka). */
#ifndef HOLDFAST_TEST_SUPPORT_H
#define HOLDFAST_TEST_SUPPORT_H

#include <math.h>
#include <stddef.h>
#include <stdio.h>
#include "holdfast/line.h"

/* ---- environment ---- */

/* $HF_BIN (the built holdfast, set by make check), or NULL when unset or empty. */
const char *hf_test_bin(void);

/* $HF_ROOT (the repository), or "." when unset or empty. */
const char *hf_test_root(void);

/* Writes "$HF_ROOT/rel" into buf (cap bytes, truncated, NUL-terminated). */
void hf_test_root_path(char *buf, size_t cap, const char *rel);

/* Fails the current cmocka test, naming cond, when cond is false: a
 * missing precondition (e.g. HF_BIN unset) is a failure, never a silent
 * skip.  A test that may legitimately not apply calls cmocka's skip(),
 * which scripts/run-tests.sh counts and lists as skipped. */
#define HF_TEST_NEED(cond)                                                                         \
    do {                                                                                           \
        if (!(cond))                                                                               \
            fail_msg("precondition failed: %s", #cond);                                            \
    } while (0)

/* |a - b| <= tol, with both values printed on failure (cmocka 1.1 has no double assert). */
#define HF_TEST_ASSERT_NEAR(a, b, tol)                                                             \
    do {                                                                                           \
        double a_ = (a), b_ = (b);                                                                 \
        if (!(fabs(a_ - b_) <= (tol)))                                                             \
            fail_msg("%s = %.12g, expected %.12g (tolerance %g)", #a, a_, b_, (double)(tol));      \
    } while (0)

/* ---- running a program ---- */

/* What a run captures.  Buffers belong to the caller; each is overwritten
 * with what the child wrote, NUL-terminated and cut at cap - 1 bytes (the
 * rest is read and dropped, so the child never blocks on a full pipe). */
typedef struct {
    char *out;      /* standard output (NULL: read and dropped) */
    size_t out_cap; /* bytes at out */
    char *err;      /* standard error (NULL: dropped; unused when merge is set) */
    size_t err_cap; /* bytes at err */
    int merge;      /* nonzero: standard error goes into out too, as the shell's 2>&1 */
    double timeout; /* s; > 0: the child is killed (SIGKILL) after this long */
    int signal;     /* set by the run: the signal that ended the child, 0 if it exited */
} hf_test_io;

/* Runs argv[0] (a path; NULL-terminated argv) with standard input from
 * /dev/null, capturing its output as io says, and waits for it.  Returns the
 * exit status (0..255; 127 when argv[0] could not be executed), or -1 when
 * the child ended by a signal (io->signal names it) or could not be started. */
int hf_test_run(const char *const argv[], hf_test_io *io);

/* hf_test_run with argv[0] = $HF_BIN and the following const char *
 * arguments up to a NULL (at most 62).  -1 when HF_BIN is unset. */
int hf_test_run_bin(hf_test_io *io, ...);

/* hf_test_run_bin with the terminating NULL added. */
#define HF_TEST_RUN(io, ...) hf_test_run_bin((io), __VA_ARGS__, (const char *)NULL)

/* ---- files ---- */

/* The whole file at path as a malloc'd NUL-terminated string (free() it);
 * *len (if len is not NULL) gets its length.  NULL when it cannot be opened.
 * A read error fails the test. */
char *hf_test_file_read(const char *path, size_t *len);

/* Reads at most cap - 1 bytes of the file at path into buf, NUL-terminated.
 * Returns the bytes read, or -1 (buf empty) when it cannot be opened. */
long hf_test_file_read_into(const char *path, char *buf, size_t cap);

/* The whole of stream f, whose position is at its end (as after writing
 * it), as a malloc'd NUL-terminated string; asserts the length >= min_len. */
char *hf_test_stream_read(FILE *f, long min_len);

/* Writes text to path (created or truncated); any failure fails the test. */
void hf_test_file_write(const char *path, const char *text);

/* ---- scratch directories ---- */

/* Makes a fresh directory "$TMPDIR/hf-<tag>-XXXXXX" ($TMPDIR defaults to
 * /tmp) and writes its path into dir (cap bytes).  0 on success, -1 if not. */
int hf_test_tmpdir_make(char *dir, size_t cap, const char *tag);

/* Group setup of the tests that run the CLI: *bin = hf_test_bin() and a
 * scratch directory "hf-<tag>-XXXXXX" as hf_test_tmpdir_make.  0 on success;
 * -1, with a message on standard error, when HF_BIN is unset, empty or not
 * an executable (*bin is then NULL) or the directory cannot be made: the
 * group setup fails and so does the test program. */
int hf_test_cli_setup(const char **bin, char *dir, size_t cap, const char *tag);

/* Removes path and, for a directory, everything below it (symbolic links
 * are removed, not followed).  0 on success or when path does not exist. */
int hf_test_tmpdir_remove(const char *path);

/* ---- text ---- */

/* Next line of a text buffer, cut in place at its newline; *cur advances.
 * NULL at the end. */
char *hf_test_line_next(char **cur);

/* Splits one CSV line in place at every comma (no quoted fields) into at
 * most cap fields; f[k] for missing fields reads "".  Returns the count. */
size_t hf_test_csv_split(char *line, char **f, size_t cap);

/* Fails the test, naming the first fault, unless doc is well-formed XML
 * (tests/xml_check.h). */
void hf_test_assert_xml(const char *doc);

/* ---- lines built in C ---- */

/* A one-section line: length m, wet weight N/m, EA N, MBL N, seabed friction -. */
void hf_test_line_one(hf_line *l, double length, double weight, double ea, double mbl,
                      double friction);

/* ---- shared case text ---- */

/* Fictional three-line buoy mooring at the invented "Quarrel Point":
 * three-section lines (chain, wire, chain) with a clump at the first joint,
 * one load case (gale), api-rp-2sk criteria. */
extern const char hf_test_case_quarrel[];

#endif
