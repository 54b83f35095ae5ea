/* outputs.h - the output catalogue: every output a study can produce.
 *
 * Flow: case -> model -> line solve -> spread / balance -> studies -> writers.
 * This module sits just above the model: it knows the names, dimensions,
 * units, column names and meanings of the outputs, and nothing of how they
 * are computed.  One table (src/outputs.c) is read by the sweep, the
 * inversion, the CSV headers, the case loader's validation and the --help
 * texts, so an output's name, unit and column can never disagree between
 * them.
 *
 * Output names (`--output NAME`, a sweep study's `outputs:` list, an invert
 * target); per-line ones take ":LINE" for one line, else give one column per
 * line.  Most are evaluated at the rest pose; offset_<load> and the
 * NAME@LOAD forms (max_tension@gale, utilisation@gale:bow, offset@gale...)
 * at the intact mean equilibrium under that load case.  The catalogue lists
 * each with its column(s), unit and meaning (hf_output_write_help prints
 * it). */
#ifndef HOLDFAST_OUTPUTS_H
#define HOLDFAST_OUTPUTS_H

#include <stddef.h>
#include <stdio.h>
#include "holdfast/model.h"
#include "holdfast/status.h"
#include "holdfast/units.h"

typedef enum {
    HF_OUT_FAIRLEAD_TENSION = 0,
    HF_OUT_FAIRLEAD_HORIZONTAL,
    HF_OUT_FAIRLEAD_VERTICAL,
    HF_OUT_ANCHOR_TENSION,
    HF_OUT_UTILISATION,
    HF_OUT_MAX_TENSION,
    HF_OUT_MAX_UTILISATION,
    HF_OUT_STIFFNESS_SURGE,
    HF_OUT_STIFFNESS_SWAY,
    HF_OUT_STIFFNESS_HEAVE,
    HF_OUT_STIFFNESS_YAW,
    HF_OUT_VERTICAL_LOAD,
    HF_OUT_OFFSET,
    /* At the intact mean equilibrium under a named load case (NAME@LOAD):
     * solved by hf_balance_solve (balance.h) from the case's rest pose. */
    HF_OUT_TENSION_AT,         /* tension@<load>[:LINE]: largest tension along each line */
    HF_OUT_UTILISATION_AT,     /* utilisation@<load>[:LINE]: T/MBL, most loaded section */
    HF_OUT_MAX_TENSION_AT,     /* max_tension@<load>: largest tension and its line */
    HF_OUT_MAX_UTILISATION_AT, /* max_utilisation@<load>: largest utilisation and its line */
    HF_OUT_OFFSET_AT,          /* offset@<load>: horizontal offset sqrt(surge^2 + sway^2) */
    HF_OUT_COUNT
} hf_output_kind;

/* One entry of the catalogue (static data, never freed). */
typedef struct {
    hf_output_kind kind;
    const char *name;      /* "fairlead_tension"; HF_OUT_OFFSET: "offset_" (offset_<load>) */
    int per_line;          /* 1: one value per line (NAME[:LINE]) */
    const char *column;    /* per-line: column prefix before the line name ("T_");
                              others: the column stem ("stiffness_surge") */
    hf_dim dim;            /* dimension of the value in SI (N, N/m, N m/rad, -, m) */
    const char *unit;      /* column unit as written at the end of the column name
                              ("kN", "kN_per_m", "kNm_per_rad", "" for none) */
    const char *unit_text; /* the same for people: "kN", "kN/m", "kN m/rad", "-", "m" */
    double scale;          /* SI value * scale = value in the column unit */
    const char *meaning;   /* one line */
    int at_load;           /* 1: evaluated at equilibrium under a load (NAME@LOAD; the name
                              is the part before '@', "max_tension") */
} hf_output_info;

#define HF_OUTPUT_ALL ((size_t)-1)

/* One parsed output name. */
typedef struct {
    hf_output_kind kind;
    size_t line; /* per-line kinds: line index, or HF_OUTPUT_ALL */
    size_t load; /* HF_OUT_OFFSET and the NAME@LOAD kinds: load index */
} hf_output;

/* One column of outputs in a table or CSV row. */
typedef struct {
    hf_output_kind kind;
    size_t line; /* per-line kinds: the line */
    size_t load; /* HF_OUT_OFFSET and the NAME@LOAD kinds: the load */
    int sub;     /* 0 the value; 1 the line name of max_tension / max_utilisation and of
                    their @LOAD forms (max_tension_line, worst_line); HF_OUT_OFFSET:
                    0 surge, 1 sway, 2 yaw */
} hf_output_column;

/* The catalogue entry of kind k, or NULL for a kind out of range. */
const hf_output_info *hf_output_info_of(hf_output_kind k);

/* Short name of an output kind ("fairlead_tension", ...; "?" out of range). */
const char *hf_output_name(hf_output_kind k);

/* Parses "NAME", "NAME:LINE", "offset_LOAD", "NAME@LOAD" or
 * "NAME@LOAD:LINE" against model m.  HF_EINVAL with a message listing the
 * valid names, with "did you mean" for a near miss (unknown name, unknown
 * line or load, ":LINE" on an output that has none, "@LOAD" on an output
 * evaluated at rest or a NAME@ output without a load). */
hf_status hf_output_parse(const hf_model *m, const char *text, hf_output *out, hf_error *err);

/* 1 when the output is evaluated at an equilibrium under a load case
 * (HF_OUT_OFFSET and the NAME@LOAD kinds): its evaluation needs a balance
 * workspace (hf_balance_alloc) besides the spread workspace. */
int hf_output_needs_balance(const hf_output *o);

/* 1 when the output is one number (a per-line output with one line, or a
 * spread output): the outputs an inversion can aim at. */
int hf_output_is_scalar(const hf_output *o);

/* The dimension of a scalar output's value (HF_OUT_OFFSET: the surge
 * offset, a length; HF_OUT_OFFSET_AT: the horizontal offset). */
hf_dim hf_output_dim(const hf_output *o);

/* Full text of a scalar output as a user writes it: "fairlead_tension:bow",
 * "offset_storm", "stiffness_surge", "max_tension@storm",
 * "utilisation@storm:bow" into buf (cap bytes). */
void hf_output_text(const hf_model *m, const hf_output *o, char *buf, size_t cap);

/* The columns output o gives on model m: one per line for a per-line output
 * without :LINE, value and line name for max_tension / max_utilisation (and
 * their @LOAD forms), surge, sway and yaw for offset_<load>, else one.  Writes at most cap
 * columns into cols (may be NULL when cap is 0) and returns how many o gives. */
size_t hf_output_columns(const hf_model *m, const hf_output *o, hf_output_column *cols, size_t cap);

/* The column's name with its unit ("T_bow_kN", "stiffness_surge_kN_per_m",
 * "offset_storm_yaw_deg", "worst_line", "Tmax_bow@storm_kN", "U_bow@storm",
 * "max_tension@storm_kN", "max_tension_line@storm", "max_utilisation@storm",
 * "worst_line@storm", "offset@storm_m") into buf (cap bytes). */
void hf_output_column_name(const hf_model *m, const hf_output_column *c, char *buf, size_t cap);

/* Factor from the SI value to the column's unit (kN, kN/m, deg for the yaw
 * offset...).  0 for the line-name columns (their value is a line index). */
double hf_output_column_scale(const hf_output_column *c);

/* 1 for the columns that hold a line name (max_tension_line, worst_line and
 * their @LOAD forms). */
int hf_output_column_is_line(const hf_output_column *c);

/* The default outputs of a sweep, as names (count in *n). */
const char *const *hf_output_defaults(size_t *n);

/* Writes the catalogue for --help: per output a line with NAME[:LINE] and
 * its column(s) with their unit, then a line with its meaning, each line
 * starting with `indent`.  Returns 0,
 * or -1 when a write fails. */
int hf_output_write_help(FILE *out, const char *indent);

/* The column-name form of a unit for a dimension: the SI unit with spaces
 * and '/' spelled for a CSV column ("N m" -> "N_m", "N/m" -> "N_per_m",
 * angles "deg"), "" for no unit; into buf (cap bytes).  Returns buf. */
const char *hf_output_unit_for_column(hf_dim d, char *buf, size_t cap);

#endif
