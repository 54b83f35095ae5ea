/* cmd_curve.c - 'holdfast curve': restoring force and analytic stiffness against offset. */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
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
    "Each offset is warm-started from the previous one.\n"
    "\n"
    "options:\n"
    "  --direction DEG       offset direction, degrees from global x (required)\n"
    "  --range FROM:TO:STEP  offsets in metres (required; at most 100000 points)\n"
    "  --csv FILE|-          write the curve as CSV (- = standard output)\n"
    "  --help                show this text\n"
    "\n"
    "exit status: 0 ok, 2 bad input or usage, 3 numerical failure\n";

static void table_header(FILE *out)
{
    fprintf(out, "%10s %12s %12s %12s %13s %12s %12s %-14s %7s\n", "offset m", "restoring kN",
            "Fx kN", "Fy kN", "Mz kN m", "k kN/m", "T max kN", "line", "util");
}

static void table_row(FILE *out, const hf_results_curve_point *p)
{
    fprintf(out, "%10.3f %12.2f %12.2f %12.2f %13.1f %12.3f %12.2f %-14s %7.4f\n", p->offset,
            hf_cli_zero_small(p->restoring / 1e3, 0.005),
            hf_cli_zero_small(p->force_x / 1e3, 0.005), hf_cli_zero_small(p->force_y / 1e3, 0.005),
            hf_cli_zero_small(p->moment_z / 1e3, 0.05), p->stiffness / 1e3, p->max_tension / 1e3,
            p->max_tension_line, p->max_utilisation);
}

int hf_cmd_curve(int argc, char **argv)
{
    const char *cmd = "curve", *path = NULL, *csv = NULL, *dir_text = NULL, *range_text = NULL;
    const hf_cli_opt opts[] = {
        HF_CLI_OPT_CSV(&csv),
        {"--direction", "--direction needs an angle in degrees", 0, &dir_text, NULL},
        {"--range", "--range needs FROM:TO:STEP (metres)", 0, &range_text, NULL}};
    int rc = hf_cli_parse_case_args(argc, argv, cmd, usage_text, opts, 3, &path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    if (!dir_text)
        return hf_cli_usage_error(cmd, "missing --direction DEG");
    if (!range_text)
        return hf_cli_usage_error(cmd, "missing --range FROM:TO:STEP");
    char *end;
    errno = 0;
    double dir_deg = strtod(dir_text, &end);
    if (end == dir_text || *end != '\0' || errno == ERANGE || !isfinite(dir_deg))
        return hf_cli_usage_error(
            cmd, "--direction: expected a finite angle in degrees, got \"%s\"", dir_text);
    hf_error err;
    hf_error_clear(&err);
    double from, to, step;
    size_t count;
    if (hf_cli_parse_range(range_text, &from, &to, &step, MAX_POINTS, &count, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "--range: %s", err.text);

    hf_model m;
    rc = hf_cli_case_load(path, &m);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    rc = HF_EXIT_OK;
    hf_outfile *f = NULL;
    hf_spread *ws = hf_spread_alloc(&m, &err);
    if (!ws) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    FILE *out = stdout;
    /* The table is for a person at a terminal: with --csv FILE a summary
     * replaces it (a 10,001-row table helps nobody and costs time). */
    int human = !csv || strcmp(csv, "-") != 0;
    int table = !csv;
    double worst_u = -1.0, worst_t = 0.0, worst_at = 0.0;
    const char *worst_line = "";
    size_t nonfinite = 0;
    if (csv && !(f = hf_cli_csv_begin(csv, hf_results_curve_header_write, &m, &err))) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    double d = dir_deg * M_PI / 180.0, cd = cos(d), sd = sin(d);
    hf_pose rest;
    hf_spread_pose_rest(&m, &rest);
    if (human) {
        fprintf(out, "%s\n", m.title ? m.title : "");
        fprintf(out,
                "restoring curve along %.3f deg from global x; hull rest pose x %.3f m, "
                "y %.3f m, heading %.3f deg\n\n",
                dir_deg, rest.surge, rest.sway, rest.yaw * 180.0 / M_PI);
        if (table)
            table_header(out);
    }
    for (size_t k = 0; k < count; k++) {
        double s = from + (double)k * step;
        hf_pose p = rest;
        p.surge += s * cd;
        p.sway += s * sd;
        double K[6][6];
        hf_spread_result r;
        hf_status st = hf_spread_stiffness(ws, &p, K, &r, &err);
        if (st != HF_OK) {
            char text[HF_ERROR_TEXT];
            snprintf(text, sizeof text, "%s", err.text);
            hf_error_set(&err, st, "curve at offset %.6g m: %s", s, text);
            rc = hf_cli_fail(&err);
            goto done;
        }
        hf_results_curve_point pt;
        hf_results_curve_point_set(&pt, &m, s, d, K, &r);
        if (table)
            table_row(out, &pt);
        if (r.max_utilisation > worst_u && r.max_utilisation_line < m.nlines) {
            worst_u = r.max_utilisation;
            worst_t = r.max_tension;
            worst_at = s;
            worst_line = m.lines[r.max_utilisation_line].name;
        }
        if (csv)
            nonfinite += hf_results_curve_row_write(hf_outfile_stream(f), &m, &pt, &r);
    }
    if (csv && hf_cli_csv_end(cmd, &f, nonfinite, &err) != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    if (human && !table) {
        fprintf(out, "%zu offsets from %.6g m to %.6g m written to %s\n", count, from,
                from + (double)(count - 1) * step, csv);
        if (worst_u >= 0.0)
            fprintf(out, "most utilised: %s at offset %.6g m, tension %.1f kN, utilisation %.4f\n",
                    worst_line, worst_at, worst_t / 1e3, worst_u);
    }
    if (human)
        fprintf(out, "\n%s", hf_cli_caution);
done:
    hf_outfile_abort(f);
    hf_spread_free(ws);
    hf_model_free(&m);
    return rc;
}
