/* studyrun.h - one study of a case run to its CSV file and its report section.
 *
 * Flow: case -> model -> spread / balance -> analysis, sweep, invert -> **studyrun**
 * (a study's results handed to the writers: results.h CSV, report.h HTML).
 * 'holdfast run' opens the files and the folder and calls these; nothing
 * here prints or opens a file.  The CSV of a study is the CSV of the
 * matching command (docs/studies.md). */
#ifndef HOLDFAST_STUDYRUN_H
#define HOLDFAST_STUDYRUN_H

#include <stdio.h>
#include "holdfast/model.h"
#include "holdfast/report.h"
#include "holdfast/status.h"
#include "holdfast/study.h"
#include "holdfast/sweep.h"

/* What one study gave, for the summary and the exit status. */
typedef struct {
    hf_status status;              /* HF_OK or why the study failed (set by the caller) */
    int criterion_failed;          /* balance: some condition failed a criterion */
    size_t nonfinite;              /* values not finite, written as empty CSV fields */
    char note[HF_ERROR_TEXT + 64]; /* one line for the summary */
    hf_sweep_table *table;         /* sweep: the rows kept for the report until
                                    * hf_studyrun_finish, else NULL */
} hf_studyrun_outcome;

/* The report's rest-pose section: the plan and the elevation of every line
 * (at most 12).  A figure that cannot be drawn becomes a note. */
void hf_studyrun_rest(hf_report *rep, const hf_model *m);

/* The default studies of a case without a studies: section (a run then
 * gives the default report, not "nothing to run"), into sl (emptied
 * first; owned by it, release with hf_study_list_free):
 *   rest         lines at the rest pose (every line's elevation, table);
 *   stiffness    the 6x6 stiffness at rest;
 *   surge-curve  restoring curve along the hull's surge axis (its heading),
 *   sway-curve   ... and along its sway axis (heading + 90 deg), both over
 *                -R..R in 40 steps, R the 1-2-5 round number at or above
 *                1.5 x the offset limit of the criteria, or when there is
 *                none 10 % of the smallest horizontal anchor-fairlead
 *                distance at rest (at least 1 m);
 *   balance      every load case, intact and each line broken (only when
 *                the case has load cases).
 * Returns HF_OK, HF_EINVAL (a model without lines or a rest pose that
 * cannot be placed), HF_ENOMEM. */
hf_status hf_studyrun_defaults(const hf_model *m, hf_study_list *sl, hf_error *err);

/* The half-range R (m) of the default restoring curves (above). */
double hf_studyrun_default_range(const hf_model *m);

/* Runs study s of m (jobs threads for sweeps): writes its CSV to out and
 * its report section to rep, and fills *oc (cleared first).  Returns HF_OK,
 * or the study's failure (HF_EINVAL, HF_ENOMEM, HF_ENOCONV, HF_ERANGE, ...)
 * with err set; out may then hold part of the CSV (the caller discards it).
 * Call hf_studyrun_finish afterwards in either case. */
hf_status hf_studyrun_exec(const hf_model *m, const hf_study *s, int jobs, FILE *out,
                           hf_report *rep, hf_studyrun_outcome *oc, hf_error *err);

/* After the study's CSV was committed (committed != 0) or discarded: adds
 * what comes after the file (a sweep's figure, drawn from oc->table, never
 * from the CSV) and frees oc->table. */
void hf_studyrun_finish(hf_report *rep, const hf_model *m, const hf_study *s,
                        hf_studyrun_outcome *oc, int committed);

#endif
