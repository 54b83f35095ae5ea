/* case.h - YAML case files -> model, with located error messages.
 *
 * Flow: case file -> **case** -> model.  Reads a case file with libyaml,
 * converts every value to SI through the units module, validates names,
 * types and ranges, and fills an hf_model and, beside it, the case's study
 * list (study.h).  Study outputs and targets are checked against the output
 * catalogue (outputs.h); the loader runs no study.  Every error message reads
 * `FILE:LINE:COLUMN: KEY.PATH: expected WHAT, got "TEXT"`.  The file format
 * is documented in docs/case-format.md. */
#ifndef HOLDFAST_CASE_H
#define HOLDFAST_CASE_H

#include <stddef.h>
#include "holdfast/model.h"
#include "holdfast/study.h"

/* Documented input limits. */
#define HF_CASE_MAX_BYTES (64u << 20) /* case file size, bytes */
#define HF_CASE_MAX_DEPTH 32          /* YAML nesting depth */
#define HF_CASE_MAX_SCALAR 4096       /* length of one scalar, bytes */
#define HF_CASE_MAX_NODES 1000000     /* YAML values (scalars, lists, maps) in one file */

/* Loads the case file at `path` into m (initialised by the caller with
 * hf_model_init) and resolves it, and its `studies:` section into `studies`
 * (initialised by the caller with hf_study_list_init; NULL: the studies are
 * checked, then dropped).  What m and studies held before is freed first.
 * On failure both are left empty and err holds the located message; returns
 * HF_EINVAL, HF_ELIMIT, HF_EIO or HF_ENOMEM. */
hf_status hf_case_load_with_studies(const char *path, hf_model *m, hf_study_list *studies,
                                    hf_error *err);

/* hf_case_load_with_studies(path, m, NULL, err): the model only. */
hf_status hf_case_load(const char *path, hf_model *m, hf_error *err);

/* The same from a buffer; `name` stands for the file name in messages. */
hf_status hf_case_load_buffer_with_studies(const char *text, size_t len, const char *name,
                                           hf_model *m, hf_study_list *studies, hf_error *err);
hf_status hf_case_load_buffer(const char *text, size_t len, const char *name, hf_model *m,
                              hf_error *err);

#endif
