/* outfile.h - output files that are never left half-written.
 *
 * Flow: writers -> **outfile** -> disk.  A regular file is written to a
 * temporary file in the same directory and renamed over the target only on
 * commit; "-" means standard output, and pipes, devices and FIFOs are
 * written in place (they cannot be renamed).  Temporary files still open
 * when the process gets SIGINT, SIGTERM or SIGHUP are removed before it dies. */
#ifndef HOLDFAST_OUTFILE_H
#define HOLDFAST_OUTFILE_H

#include <stdio.h>
#include "holdfast/status.h"

typedef struct hf_outfile hf_outfile;

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

#endif
