/* cmd_curve.c - 'holdfast curve': restoring force and analytic stiffness against offset. */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/analysis.h"
#include "holdfast/cli.h"
#include "holdfast/outfile.h"
#include "holdfast/results.h"
#include "holdfast/spread.h"

/* Documented limit: points of one curve. */
#define MAX_POINTS 100000

static const char usage_text[] =
    "usage: holdfast curve CASE --direction DEG --range FROM:TO:STEP [--csv FILE|-]\n"
    "\n"
    "Moves the hull from the case's rest pose along a horizontal direction\n"
    "(degrees counterclockwise from global x; the heading stays fixed) over the\n"
    "offsets FROM, FROM+STEP, ... up to TO (metres), and reports at each offset:\n"
    "  restoring_kN        minus the mooring force along the direction\n"
    "  force_x_kN, force_y_kN, moment_z_kNm  the mooring load on the hull\n"
    "  stiffness_kN_per_m  d(restoring)/d(offset) from the analytic 6x6 stiffness\n"
    "  max_tension_kN, max_tension_line, max_utilisation, T_<line>_kN (fairlead tension)\n"
    "  alert               'overloaded' when a line's utilisation T/MBL >= 1, else empty\n"
    "Each offset is warm-started from the previous one.\n"
    "\n"
    "options:\n"
    "  --direction DEG       offset direction, degrees from global x (required)\n"
    "  --range FROM:TO:STEP  offsets in metres (required; at most 100000 points)\n"
    "  --csv FILE|-          write the curve as CSV (- = standard output)\n"
    "  --help                show this text\n"
    "\n"
    "exit status: 0 ok, 1 a line is overloaded at some offset (the output is still\n"
    "complete; stderr names the first such point), 2 bad input or usage, 3\n"
    "numerical failure\n";

static void table_header(FILE *out)
{
    fprintf(out, "%10s %12s %12s %12s %13s %12s %12s %-14s %7s %s\n", "offset m", "restoring kN",
            "Fx kN", "Fy kN", "Mz kN m", "k kN/m", "T max kN", "line", "util", "alert");
}

static void table_row(FILE *out, const hf_model *m, const hf_analysis_curve *c, size_t k)
{
    size_t tl = c->max_tension_line[k];
    int over = hf_results_curve_overloaded(c, k);
    fprintf(out, "%10.3f %12.2f %12.2f %12.2f %13.1f %12.3f %12.2f %-14s %7.4f%s\n", c->offset[k],
            hf_cli_zero_small(c->restoring[k] / 1e3, 0.005),
            hf_cli_zero_small(c->force_x[k] / 1e3, 0.005),
            hf_cli_zero_small(c->force_y[k] / 1e3, 0.005),
            hf_cli_zero_small(c->moment_z[k] / 1e3, 0.05), c->stiffness[k] / 1e3,
            c->max_tension[k] / 1e3, tl < m->nlines ? m->lines[tl].name : "", c->max_utilisation[k],
            over ? " " HF_RESULTS_ALERT_OVERLOADED : "");
}

/* One line on stderr for the first overloaded point of c (none: returns
 * HF_EXIT_OK): the most utilised line there, its utilisation and tension,
 * the offset.  Returns HF_EXIT_CRITERION when a point is overloaded. */
static int report_overload(const hf_model *m, const hf_analysis_curve *c, double dir)
{
    for (size_t k = 0; k < c->n; k++) {
        if (!hf_results_curve_overloaded(c, k))
            continue;
        size_t i = c->max_utilisation_line[k];
        fprintf(stderr,
                "holdfast curve: line %s is overloaded: utilisation %.1f (T %.1f kN) at offset "
                "%.6g m along %.6g deg\n",
                hf_results_line_name(m, i), c->max_utilisation[k],
                i < c->nlines ? c->line_tension[k * c->nlines + i] / 1e3 : NAN, c->offset[k],
                dir * 180.0 / M_PI);
        return HF_EXIT_CRITERION;
    }
    return HF_EXIT_OK;
}

/* The options of one curve command. */
typedef struct {
    const char *path, *csv;
    double dir, from, to, step; /* rad, m, m, m */
    size_t count;
} curve_args;

/* Parses the arguments into *a: HF_CLI_CONTINUE, or the exit status. */
static int parse_args(int argc, char **argv, const char *cmd, curve_args *a)
{
    const char *dir_text = NULL, *range_text = NULL;
    a->csv = NULL;
    const hf_cli_opt opts[] = {
        HF_CLI_OPT_CSV(&a->csv),
        HF_CLI_OPT_VALUE("--direction", "--direction needs an angle in degrees", &dir_text),
        HF_CLI_OPT_VALUE("--range", "--range needs FROM:TO:STEP (metres)", &range_text)};
    int rc = hf_cli_parse_case_args(argc, argv, cmd, usage_text, opts, 3, &a->path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    if (!dir_text)
        return hf_cli_usage_error(cmd, "missing --direction DEG");
    if (!range_text)
        return hf_cli_usage_error(cmd, "missing --range FROM:TO:STEP");
    hf_error err;
    hf_error_clear(&err);
    if (hf_cli_parse_value("--direction", dir_text, HF_DIM_ANGLE, &a->dir, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);
    if (hf_cli_parse_range(range_text, &a->from, &a->to, &a->step, MAX_POINTS, &a->count, &err) !=
        HF_OK)
        return hf_cli_usage_error(cmd, "--range: %s", err.text);
    if (a->csv && hf_cli_check_output("--csv", a->csv, a->path, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);
    return HF_CLI_CONTINUE;
}

/* The most utilised point of the solved points before `end`: its index, or
 * (size_t)-1 when none. */
static size_t worst_point(const hf_model *m, const hf_analysis_curve *c, size_t end)
{
    size_t w = (size_t)-1;
    for (size_t k = 0; k < end; k++)
        if (c->max_utilisation_line[k] < m->nlines &&
            (w == (size_t)-1 || c->max_utilisation[k] > c->max_utilisation[w]))
            w = k;
    return w;
}

/* Writes the points before `end` to the table (when table) and the CSV (f). */
static size_t write_points(FILE *out, int table, hf_outfile *f, const hf_model *m,
                           const hf_analysis_curve *c, size_t end)
{
    size_t nonfinite = 0;
    for (size_t k = 0; k < end; k++) {
        if (table)
            table_row(out, m, c, k);
        if (f)
            nonfinite += hf_results_curve_row_write(hf_outfile_stream(f), m, c, k);
    }
    return nonfinite;
}

static void summary(FILE *out, const hf_model *m, const hf_analysis_curve *c, const curve_args *a)
{
    fprintf(out, "%zu offsets from %.6g m to %.6g m written to %s\n", a->count, a->from,
            a->from + (double)(a->count - 1) * a->step, a->csv);
    size_t w = worst_point(m, c, c->n);
    if (w != (size_t)-1)
        fprintf(out, "most utilised: %s at offset %.6g m, tension %.1f kN, utilisation %.4f\n",
                m->lines[c->max_utilisation_line[w]].name, c->offset[w], c->max_tension[w] / 1e3,
                c->max_utilisation[w]);
}

/* Writes the curve; the command stops at the first offset that did not
 * solve (after the rows before it).  Returns the exit status. */
static int write_curve(const hf_model *m, const hf_analysis_curve *c, const curve_args *a)
{
    hf_error err;
    hf_error_clear(&err);
    hf_outfile *f = NULL;
    FILE *out = stdout;
    /* The table is for a person at a terminal: with --csv FILE a summary
     * replaces it (a 10,001-row table helps nobody and costs time). */
    int human = !a->csv || strcmp(a->csv, "-") != 0, table = !a->csv;
    if (a->csv && !(f = hf_cli_csv_begin(a->csv, hf_results_curve_header_write, m, &err)))
        return hf_cli_fail(&err);
    if (human) {
        hf_pose rest;
        hf_spread_pose_rest(m, &rest);
        fprintf(out, "%s\n", m->title ? m->title : "");
        fprintf(out,
                "restoring curve along %.3f deg from global x; hull rest pose x %.3f m, "
                "y %.3f m, heading %.3f deg\n\n",
                a->dir * 180.0 / M_PI, rest.surge, rest.sway, rest.yaw * 180.0 / M_PI);
        if (table)
            table_header(out);
    }
    size_t end = c->nfailed ? c->first_failed : c->n;
    size_t nonfinite = write_points(out, table, f, m, c, end);
    if (c->nfailed) {
        hf_outfile_abort(f);
        return hf_cli_fail(&c->first_error);
    }
    if (a->csv && hf_cli_csv_end("curve", &f, nonfinite, &err) != HF_OK)
        return hf_cli_fail(&err);
    if (human && !table)
        summary(out, m, c, a);
    if (human)
        fprintf(out, "\n%s", hf_caution_text);
    return report_overload(m, c, a->dir);
}

int hf_cmd_curve(int argc, char **argv)
{
    curve_args a;
    int rc = parse_args(argc, argv, "curve", &a);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_model m;
    rc = hf_cli_case_load(a.path, &m);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_error err;
    hf_error_clear(&err);
    hf_analysis_curve *c = hf_analysis_curve_alloc(&m, a.count, &err);
    if (!c || hf_analysis_curve_compute(c, &m, a.dir, a.from, a.to, a.step, &err) != HF_OK)
        rc = hf_cli_fail(&err);
    else
        rc = write_curve(&m, c, &a);
    hf_analysis_curve_free(c);
    hf_model_free(&m);
    return rc;
}
