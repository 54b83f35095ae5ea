/* report_design.h - the design check (issue 14) in the report and as a
 * study of `holdfast run`: the hull's design data and the environments in
 * the Case section, and a `kind: design` study's CSV, checks, spectrum
 * figure, motion-budget figure (mean, LF, WF, design offset per condition)
 * and tensions table.
 *
 * Flow: design, designcsv -> **report_design** -> report (case section
 * hook), studyrun (study kind design).  Figures are inline SVG through
 * svg.h; nothing here prints to a terminal or opens a file. */
#ifndef HOLDFAST_REPORT_DESIGN_H
#define HOLDFAST_REPORT_DESIGN_H

#include <stddef.h>
#include <stdio.h>
#include "holdfast/design.h"
#include "holdfast/model.h"
#include "holdfast/report.h"
#include "holdfast/spectrum.h"
#include "holdfast/status.h"
#include "holdfast/study.h"

/* Rows of the Case section for the design method: the hull's masses,
 * damping, tables (with their coverage) and areas, and one row per
 * environment.  Writes nothing when m has no design data.  Called by
 * report.c inside the Case section. */
void hf_report_design_case(hf_report *r, const hf_model *m);

/* What a design study gave. */
typedef struct {
    size_t conditions, passed, failed, noresult; /* conditions solved and their verdicts */
    size_t nonfinite;                            /* CSV values written as empty */
} hf_report_design_count;

/* Runs design study s of m: the CSV (designcsv.h) to csv, the section,
 * checks and figures to rep, counts into *n.  Returns HF_OK (conditions
 * without a result are counted, not errors), HF_EINVAL (no design data, an
 * unknown environment name), HF_ENOMEM. */
hf_status hf_report_design_study(const hf_model *m, const hf_study *s, FILE *csv, hf_report *rep,
                                 hf_report_design_count *n, hf_error *err);

/* The wave spectrum S(w) (m^2 s/rad) of s against w (rad/s) over the band
 * holding all but 1e-3 of its energy, with the tables' frequency ranges
 * [lo[k], hi[k]] (k < nranges, names[k]) marked.  HF_OK or HF_EINVAL. */
hf_status hf_report_svg_spectrum(FILE *out, const hf_spectrum *s, const char *title, size_t nranges,
                                 const double *lo, const double *hi, const char *const *names,
                                 int standalone, hf_error *err);

/* The motion budget of n conditions as horizontal stacked bars: mean, the
 * low-frequency and wave-frequency parts of the governing combination
 * (their sum is the design offset, labelled at the bar's end); `limit` (m,
 * 0 = none) drawn as a vertical line.  part[i * 3 + 0..2] = mean, LF, WF
 * in m.  HF_OK or HF_EINVAL (n = 0, non-finite or negative parts). */
hf_status hf_report_svg_budget(FILE *out, const char *title, size_t n, const char *const *labels,
                               const double *part, double limit, int standalone, hf_error *err);

#endif
