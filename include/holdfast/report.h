/* report.h - the self-contained HTML report (report.html of `holdfast run`).
 *
 * Flow: case -> model -> line solve -> spread -> studies -> **writers**.
 * The report is one HTML file with inline CSS and inline SVG figures: no
 * JavaScript, nothing fetched, readable offline, in any browser and in
 * print.  It is written as a stream, so `holdfast run` can add each study's
 * section as soon as the study completes:
 *
 *     hf_report r;
 *     hf_report_begin(&r, out, model, "holdfast run cases/barge.yaml");
 *         // head, title, caution, case summary, components with sources, lines
 *     hf_report_section(&r, "Restoring curve", "Offsets along 0 deg ...");
 *     hf_report_table_begin(&r, "Line tensions at rest", cols, 4);
 *     hf_report_table_row(&r, cells);        // strings, escaped here
 *     hf_report_table_end(&r);
 *     FILE *f = hf_report_figure_begin(&r);
 *     hf_svg_figure_curve(f, &curve, 0, &err);  // standalone = 0: inline SVG
 *     hf_report_figure_end(&r, "Restoring force, stiffness, tensions ...");
 *     hf_report_check(&r, "line bow-port, intact", "MBL/T >= 1.67", "2.31", 1);
 *     hf_report_end(&r, &err);               // verdict, caution, footer
 *
 * The verdict (all checks passed / N of M FAILED) is written at the end,
 * when every check is known, but is shown at the top of the page (CSS
 * order), so a reader sees it first.  The output is well-formed XML
 * (XHTML-compatible HTML5), which the tests check.
 *
 * The verdict states its scope: how many load cases, still water levels
 * and conditions (intact, each line broken) the checks covered, against
 * what the case declares, and which criteria (hf_report_scope_add records
 * what each check covered).  It is green only when every check passed AND
 * the checks cover every load case, water level and condition the case
 * declares; checks that passed over a narrower scope get an amber banner
 * saying what was left out.
 *
 * The writer allocates the scope record at hf_report_begin (two flag
 * arrays sized from the model; hf_report_end frees them, so every begun
 * report must be ended) and in the model-aware figure helpers at the end,
 * which say so.  Write errors are found by ferror (hf_report_end
 * reports them) or by outfile.h's commit. */
#ifndef HOLDFAST_REPORT_H
#define HOLDFAST_REPORT_H

#include <stddef.h>
#include <stdio.h>
#include "holdfast/line.h"
#include "holdfast/analysis.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"
#include "holdfast/status.h"

/* Distinct still water levels a report's scope record keeps. */
#define HF_REPORT_MAX_LEVELS 64

/* A report being written.  Lives on the caller's stack; fields are for
 * reading only. */
typedef struct {
    FILE *out;      /* destination (not owned) */
    int in_section; /* 1 while a section is open */
    int in_table;   /* 0 none, 1 a data table, 2 the checks table of this section */
    size_t ncols;   /* columns of the open data table */
    size_t nsections, ntables, nfigures;
    size_t nchecks; /* criteria checks written so far */
    size_t nfailed; /* ... of which failed */
    /* scope of the checks (hf_report_scope_add) */
    const hf_model *model;                    /* borrowed at hf_report_begin, or NULL */
    unsigned char *scope_load;                /* model->nloads flags: load case checked */
    unsigned char *scope_cond;                /* 1 + model->nlines flags: condition checked */
    double scope_level[HF_REPORT_MAX_LEVELS]; /* distinct levels checked, m above datum */
    size_t nscope_levels;
    /* issue 14: design checks (hf_report_scope_add_env) */
    unsigned char *scope_env; /* model->design->nenv flags: environment checked, or NULL */
    size_t nscoped;        /* checks with a recorded scope (scope_add calls, scope_extra counts) */
    char scope_extra[512]; /* what the hf_report_scope_extra checks covered, "; "-separated */
    int scope_lost;        /* 1: the record is incomplete (no memory, too many levels) */
} hf_report;

/* Starts the report on `out`: the HTML head with its stylesheet, the title
 * (the model's title, or its file name), `command` (how it was produced,
 * e.g. "holdfast run cases/barge.yaml"; may be NULL), the safety caution
 * (hf_cli_caution), then three sections from the model:
 *   "Case" - source file, site, hull, loads, criteria with their source;
 *   "Components" - every resolved component's properties with the source
 *     of each value (given, or the formula and reference that derived it);
 *   "Lines" - each line's anchor, fairlead and make-up, anchor first.
 * m must be resolved (hf_model_resolve). */
void hf_report_begin(hf_report *r, FILE *out, const hf_model *m, const char *command);

/* Opens a new section (closing any open one) with a heading and an optional
 * introductory paragraph (NULL for none). */
void hf_report_section(hf_report *r, const char *heading, const char *intro);

/* A paragraph of plain text (escaped). */
void hf_report_paragraph(hf_report *r, const char *text);

/* A highlighted note: kind "warning" (bold frame) or "note". */
void hf_report_note(hf_report *r, const char *kind, const char *text);

/* A data table: caption (may be NULL), ncols column headings (units in the
 * headings: "tension (kN)"); then rows of ncols cells (strings, escaped; a
 * NULL cell is shown empty); then hf_report_table_end.  Cells that look
 * like numbers are right-aligned. */
void hf_report_table_begin(hf_report *r, const char *caption, const char *const *columns,
                           size_t ncols);
void hf_report_table_row(hf_report *r, const char *const *cells);
/* A row of a label and ncols - 1 numbers shown with `digits` significant
 * digits for people (hf_report_number); non-finite values show "-". */
void hf_report_table_row_numbers(hf_report *r, const char *label, const double *values, int digits);
void hf_report_table_end(hf_report *r);

/* A figure: returns the stream to write one inline SVG to (call a figure
 * function with standalone = 0), then hf_report_figure_end adds the caption
 * (escaped; may be NULL) and closes the figure. */
FILE *hf_report_figure_begin(hf_report *r);
void hf_report_figure_end(hf_report *r, const char *caption);

/* One criteria check, in the section's checks table (opened on the first
 * check of a section, closed by the next section or table or the end):
 * what was checked ("line bow-port, intact"), the requirement in words
 * ("MBL/T at least 1.67"), the result ("2.31"), and whether it passed.
 * The result column says "PASS" or "FAIL" in words (not only in colour). */
void hf_report_check(hf_report *r, const char *item, const char *requirement, const char *result,
                     int passed);

/* Records what a check covered: load case `load` (index into the model's
 * loads), condition `cond` (0 intact, k line k-1 broken) at the still water
 * level `level` (m above datum).  Call it for each check written for a
 * load-case condition (balance studies do).  Indices out of range and
 * non-finite levels are ignored and mark the scope as incomplete. */
void hf_report_scope_add(hf_report *r, size_t load, size_t cond, double level);

/* Records what a design check covered (issue 14, report_design.c):
 * environment `env` (index into the case's environments) in condition
 * `cond` (0 intact, k line k-1 broken).  The verdict then also states how
 * many of the declared environments were checked.  Out of range: ignored,
 * the scope marked incomplete. */
void hf_report_scope_add_env(hf_report *r, size_t env, size_t cond);
/* Records that the last n checks written covered something other than a
 * load-case condition, described by `what` (e.g. "the 18 conditions of
 * design study storm-design"; copied, cut to fit): they count as having a
 * scope, and the verdict names them after the load-case scope. */
void hf_report_scope_extra(hf_report *r, size_t n, const char *what);

/* The still water levels the case declares (m above datum) into out (at
 * most cap; returns how many): site.water_level. */
size_t hf_report_levels_declared(const hf_model *m, double *out, size_t cap);

/* Ends the report: closes what is open, writes the verdict with its scope
 * ("All 12 criteria checks passed, covering everything the case declares:
 * 2 load cases x 1 still water level (1.9 m) x 5 conditions (intact and
 * each of the 4 lines broken). Criteria: ..." / "All 3 criteria checks
 * passed, but they cover less than the case declares: ..." / "3 of 12
 * criteria checks FAILED. ..." / "No criteria checks were made."), the
 * caution again and the footer, and frees the scope record.  Returns HF_OK,
 * or HF_EIO when the stream has seen a write error. */
hf_status hf_report_end(hf_report *r, hf_error *err);

/* Formats v for people with `digits` (1..10) significant digits, in plain
 * decimals for 1e-3 <= |v| < 1e9 ("1234", "0.0412", "2.385") and an
 * exponent form otherwise; trailing zeros after the point are dropped;
 * non-finite values give "-".  buf holds at least 32 bytes. */
void hf_report_number(char *buf, size_t cap, double v, int digits);

/* Writes s with the five XML special characters escaped (HTML text and
 * attribute values); control characters XML forbids become '?'. */
void hf_report_escape(FILE *out, const char *s);

/* ---- model-aware figures (used by the report and by `holdfast plot`) ---- */

/* Plan of the model's spread at `pose` (NULL: the rest pose): fairleads
 * placed through spread.h's geometry, the hull outline from the case (or
 * the hull through the fairleads), `broken` flags (nlines, or NULL), and
 * the direction of `load`'s resultant (direct force plus drag terms,
 * 1/2 rho C A V^2) when load is not NULL.  Away from the rest pose, the
 * hull detail also shows the hull at rest and the offset.  Allocates five
 * arrays (hf_malloc) and frees them.  HF_OK, HF_ENOMEM, HF_EINVAL. */
hf_status hf_report_svg_plan(FILE *out, const hf_model *m, const hf_pose *pose,
                             const unsigned char *broken, const hf_load *load, int standalone,
                             hf_error *err);

/* Elevation of line i of m in the solved state st (HF_OK status): profile
 * sampled by hf_line_profile at about 500 points, touchdown marked, the
 * allowed tension MBL / intact factor (criteria) of each section drawn over
 * that section when the case has an intact factor, points whose tension
 * reaches their section's MBL crossed.  Allocates the profile
 * (hf_malloc) and frees it.  HF_OK, HF_ENOMEM, HF_EINVAL. */
hf_status hf_report_svg_elevation(FILE *out, const hf_model *m, size_t i, const hf_line_state *st,
                                  int standalone, hf_error *err);

/* Elevation of a group of identical lines (hf_report_line_groups): the
 * lines idx[0..n) of m drawn once from line idx[0]'s solved state st, with
 * a caption naming them all (n == 1: the plain elevation).  Every section's
 * allowed tension (MBL / intact factor) is drawn and overloaded points are
 * crossed, as in hf_report_svg_elevation.  Allocates the profile and names
 * (hf_malloc) and frees them.  HF_OK, HF_ENOMEM, HF_EINVAL. */
hf_status hf_report_svg_elevation_group(FILE *out, const hf_model *m, const size_t *idx, size_t n,
                                        const hf_line_state *st, int standalone, hf_error *err);

/* Every solved, unbroken line of the solve r of m overlaid in one elevation
 * (hf_svg_figure_elevation_overlay): each in its own vertical plane with its
 * anchor at distance 0, its tension, its sections' allowed tensions and its
 * overloaded points.  Allocates and frees.  HF_OK, HF_ENOMEM, HF_EINVAL (no
 * solved line). */
hf_status hf_report_svg_elevation_overlay(FILE *out, const hf_model *m, const hf_spread_result *r,
                                          int standalone, hf_error *err);

/* Groups identical lines of m: the same make-up (pieces in order: the same
 * component and length, clump or buoy load and friction) and the same
 * geometry at `pose` (NULL: the rest pose) up to a rotation about the
 * vertical (horizontal anchor-fairlead distance within 1e-6 relative,
 * fairlead height within 1 micrometre).  group[i] (nlines entries) gets the
 * index of the first line of line i's group; returns the number of groups. */
size_t hf_report_line_groups(const hf_model *m, const hf_pose *pose, size_t *group);

/* Restoring-curve figure (hf_svg_figure_curve) of curve c, computed for m
 * (include/holdfast/analysis.h; failed offsets are NaN: gaps), titled
 * `title`, with `label` under it (or NULL).  The utilisation limit is
 * 1 / the intact factor when the case has one; with tension_limits != 0 the
 * allowed tension of each line (hf_analysis_allowed_tension) is drawn on
 * the tension panel.  c->n must be at least 2.  Allocates the line names
 * and limits (hf_malloc) and frees them.  HF_OK, HF_ENOMEM, HF_EINVAL. */
hf_status hf_report_svg_curve(FILE *out, const hf_model *m, const hf_analysis_curve *c,
                              const char *title, const char *label, int tension_limits,
                              int standalone, hf_error *err);

#endif
