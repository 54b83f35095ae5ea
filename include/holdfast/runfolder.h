/* runfolder.h - a results folder that holds exactly one run, replaced as a whole.
 *
 * Flow: studies -> **writers** (csv, svg, report) into a results folder.
 * 'holdfast run --out DIR' builds the new run in a temporary sibling folder
 * (DIR.partial-XXXXXX) and swaps it in with renames when every file is
 * written, so DIR never holds a mix of an earlier run and this one, even
 * when the run is interrupted (an interruption leaves at most the sibling
 * folder behind, and DIR as it was).  A holdfast results folder is marked
 * by a small stamp file (HF_RUNFOLDER_STAMP; a folder of an earlier
 * holdfast without the stamp is recognised by its summary.txt starting with
 * "holdfast "); a folder that is neither empty nor marked is refused, so a
 * run never deletes files it did not write. */
#ifndef HOLDFAST_RUNFOLDER_H
#define HOLDFAST_RUNFOLDER_H

#include <stddef.h>
#include "holdfast/status.h"

/* The stamp file's name inside a results folder. */
#define HF_RUNFOLDER_STAMP ".holdfast-results"

/* Longest folder path accepted, bytes. */
#define HF_RUNFOLDER_PATH_MAX 4000

typedef struct {
    char dir[HF_RUNFOLDER_PATH_MAX + 1];  /* the final folder (trailing '/' removed) */
    char tmp[HF_RUNFOLDER_PATH_MAX + 32]; /* the sibling being built */
} hf_runfolder;

/* Checks `dir` (it may be missing, empty, or an earlier holdfast results
 * folder) and creates the sibling folder to build the run in, with its
 * stamp.  Returns HF_OK, HF_EINVAL (dir empty, too long, not a directory,
 * or not empty and not a holdfast results folder: the message says so and
 * nothing is touched) or HF_EIO (cannot create the sibling). */
hf_status hf_runfolder_begin(hf_runfolder *rf, const char *dir, hf_error *err);

/* The folder to write the run's files into (the sibling), for paths. */
const char *hf_runfolder_path(const hf_runfolder *rf);

/* Swaps the built run in place of dir (the earlier run, if any, is moved
 * aside by rename and then deleted; a missing dir is created by the
 * rename).  HF_OK or HF_EIO with the message (the new run then stays in the
 * sibling folder, named in the message). */
hf_status hf_runfolder_commit(hf_runfolder *rf, hf_error *err);

/* Deletes the sibling and what it holds (files only); dir is untouched.
 * Safe after a failed begin. */
void hf_runfolder_abort(hf_runfolder *rf);

#endif
