/* designcsv.h - writers of the design check's results (design.h): the CSV
 * of `holdfast design` and of run's design studies (one row per
 * environment and condition), the condition's name, and the caution
 * naming what the quasi-static design method leaves out.
 *
 * Flow: design -> **designcsv** -> cmd_design, studyrun, report_design.
 * Writers take a FILE *; numbers in the units of the column names. */
#ifndef HOLDFAST_DESIGNCSV_H
#define HOLDFAST_DESIGNCSV_H

#include <stddef.h>
#include <stdio.h>
#include "holdfast/design.h"
#include "holdfast/model.h"
#include "holdfast/status.h"

/* What the method leaves out, one paragraph of lines each ending in '\n'
 * (printed after hf_caution_text): line dynamics (the dynamic factors cover
 * them), transient motion after a line breaks, second-order coupling
 * between the degrees of freedom. */
extern const char hf_design_caution_text[];

/* "intact" or "broken:<line>" (as the balance CSV) into buf; returns buf. */
const char *hf_design_condition_name(const hf_model *m, const hf_design_result *r, char *buf,
                                     size_t cap);

/* Writes the header row: the columns fixed by issue 14 first
 * (environment ... passed), then the extra columns (docs/design.md).
 * HF_OK or HF_EIO when the stream has failed. */
hf_status hf_design_csv_header_write(FILE *out, const hf_model *m, hf_error *err);

/* Writes one row for result r of model m (numbers empty when r has no
 * result).  Returns the number of non-finite values written as empty. */
size_t hf_design_csv_row_write(FILE *out, const hf_model *m, const hf_design_result *r);

#endif
