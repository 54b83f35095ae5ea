/* outfile.h - output files that are never left half-written.
 *
 * Flow: writers -> **outfile** -> disk.  A regular file is written to a
 * temporary file in the same directory and renamed over the target only on
 * commit; "-" means standard output, and pipes, devices and FIFOs are
 * written in place (they cannot be renamed).  Temporary files still open
 * when the process gets SIGINT, SIGTERM, SIGHUP or SIGPIPE are removed
 * before it dies.  SIGXFSZ is ignored from the first open on, so a file size
 * limit (`ulimit -f`) makes writes fail and the commit report it (HF_EIO),
 * removing the temporary file, instead of killing the process. */
#ifndef HOLDFAST_OUTFILE_H
#define HOLDFAST_OUTFILE_H

#include <stdio.h>
#include "holdfast/status.h"

typedef struct hf_outfile hf_outfile;

/* Installs the module's signal dispositions once per process (idempotent):
 * handlers for SIGINT, SIGTERM, SIGHUP and SIGPIPE that remove pending
 * temporary files and re-raise, SIGXFSZ ignored, and an atexit() handler
 * that removes temporary files of outputs never committed or aborted (only
 * in the process that installed it, not in forked children).  hf_outfile_open calls
 * it; a program calls it at start-up so that its writes to standard output
 * outside an outfile also fail with EFBIG at a file size limit instead of
 * being killed. */
void hf_outfile_signals_install(void);

/* Opens `path` for writing ("-" = stdout).  Returns NULL with err filled
 * (HF_EIO, HF_ENOMEM) on failure.  Nothing is visible under `path` until
 * hf_outfile_commit(). */
hf_outfile *hf_outfile_open(const char *path, hf_error *err);

/* The stream to write to.  Valid until commit or abort. */
FILE *hf_outfile_stream(hf_outfile *f);

/* Flushes, checks every write succeeded, and renames the temporary file onto
 * the target.  Always frees f.  On error the temporary file is removed and
 * HF_EIO returned with a message. */
hf_status hf_outfile_commit(hf_outfile *f, hf_error *err);

/* Discards the output: removes the temporary file and frees f.  NULL is ok. */
void hf_outfile_abort(hf_outfile *f);

/* 1 when the output path `out` names the same existing file as the input
 * path `in` (equal st_dev and st_ino after following symbolic links, so a
 * second hard link, a symbolic link or "./case.yaml" for "case.yaml" all
 * count); 0 otherwise, in particular when `out` is "-" or does not exist
 * yet, or either path is NULL or cannot be stat()ed.  Touches no file. */
int hf_outfile_same_file(const char *out, const char *in);

/* Refuses an output that would overwrite an input: HF_EINVAL with the
 * message "OUT: output is the same file as the input IN; choose another
 * output path" when hf_outfile_same_file(out, in), else HF_OK (err is then
 * left as it was).  err may be NULL.  Call it before hf_outfile_open(). */
hf_status hf_outfile_check_not_input(const char *out, const char *in, hf_error *err);

#endif
