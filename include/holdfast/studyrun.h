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
