/* cmd_curve.c - 'holdfast curve': restoring force and analytic stiffness against offset. */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/cli.h"
#include "holdfast/csv.h"
#include "holdfast/outfile.h"
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

static int option(int argc, char **argv, int *i, const char *name, const char **value, int *missing)
{
    size_t n = strlen(name);
    if (strncmp(argv[*i], name, n) != 0)
        return 0;
    if (argv[*i][n] == '=') {
        *value = argv[*i] + n + 1;
        return 1;
    }
    if (argv[*i][n] != '\0')
        return 0;
    if (*i + 1 >= argc) {
        *missing = 1;
        return 1;
    }
    *value = argv[++*i];
    return 1;
}

/* For tables: a value that rounds to zero at the printed precision (half a
 * unit of the last digit) is printed as 0, not -0. */
static double nz(double v, double half)
{
    return fabs(v) < half ? 0.0 : v;
}

/* One curve point, as printed. */
typedef struct {
    double offset, restoring, fx, fy, mz, stiffness, tmax, umax;
    const char *tmax_line;
} point;

static void table_header(FILE *out)
{
    fprintf(out, "%10s %12s %12s %12s %13s %12s %12s %-14s %7s\n", "offset m", "restoring kN",
            "Fx kN", "Fy kN", "Mz kN m", "k kN/m", "T max kN", "line", "util");
}

static void table_row(FILE *out, const point *p)
{
    fprintf(out, "%10.3f %12.2f %12.2f %12.2f %13.1f %12.3f %12.2f %-14s %7.4f\n", p->offset,
            nz(p->restoring, 0.005), nz(p->fx, 0.005), nz(p->fy, 0.005), nz(p->mz, 0.05),
            p->stiffness, p->tmax, p->tmax_line, p->umax);
}

int hf_cmd_curve(int argc, char **argv)
{
    const char *cmd = "curve", *path = NULL, *csv = NULL, *dir_text = NULL, *range_text = NULL;
    for (int i = 1; i < argc; i++) {
        const char *v = NULL;
        int missing = 0;
        if (!strcmp(argv[i], "--help") || !strcmp(argv[i], "-h")) {
            fputs(usage_text, stdout);
            return HF_EXIT_OK;
        } else if (option(argc, argv, &i, "--csv", &v, &missing)) {
            if (missing)
                return hf_cli_usage_error(cmd, "--csv needs a FILE (or - for standard output)");
            csv = v;
        } else if (option(argc, argv, &i, "--direction", &v, &missing)) {
            if (missing)
                return hf_cli_usage_error(cmd, "--direction needs an angle in degrees");
            dir_text = v;
        } else if (option(argc, argv, &i, "--range", &v, &missing)) {
            if (missing)
                return hf_cli_usage_error(cmd, "--range needs FROM:TO:STEP (metres)");
            range_text = v;
        } else if (argv[i][0] == '-' && argv[i][1] != '\0') {
            return hf_cli_usage_error(cmd, "unknown option '%s'", argv[i]);
        } else if (!path) {
            path = argv[i];
        } else {
            return hf_cli_usage_error(cmd, "unexpected argument '%s' (one CASE file only)",
                                      argv[i]);
        }
    }
    if (!path)
        return hf_cli_usage_error(cmd, "missing the CASE file");
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
    hf_model_init(&m);
    if (hf_cli_load(path, &m, &err) != HF_OK)
        return hf_cli_fail(&err);
    int rc = HF_EXIT_OK;
    hf_spread *ws = NULL;
    hf_outfile *f = NULL;
    char **names = NULL;
    size_t ncol = 9 + m.nlines;
    ws = hf_spread_alloc(&m, &err);
    names = hf_calloc(ncol, sizeof *names);
    if (!ws || !names) {
        if (ws)
            hf_error_set(&err, HF_ENOMEM, "out of memory");
        rc = hf_cli_fail(&err);
        goto done;
    }
    static const char *const fixed[9] = {"offset_m",       "restoring_kN",     "force_x_kN",
                                         "force_y_kN",     "moment_z_kNm",     "stiffness_kN_per_m",
                                         "max_tension_kN", "max_tension_line", "max_utilisation"};
    for (size_t j = 0; j < ncol; j++) {
        if (j < 9) {
            names[j] = hf_strdup(fixed[j]);
        } else {
            const char *ln = m.lines[j - 9].name;
            size_t len = strlen(ln) + 6;
            names[j] = hf_malloc(len);
            if (names[j])
                snprintf(names[j], len, "T_%s_kN", ln);
        }
        if (!names[j]) {
            hf_error_set(&err, HF_ENOMEM, "out of memory");
            rc = hf_cli_fail(&err);
            goto done;
        }
    }

    FILE *out = stdout;
    int human = !csv || strcmp(csv, "-") != 0;
    hf_csv c;
    if (csv) {
        f = hf_outfile_open(csv, &err);
        if (!f) {
            rc = hf_cli_fail(&err);
            goto done;
        }
        hf_csv_init(&c, hf_outfile_stream(f), 0);
        hf_csv_header_array(&c, (const char *const *)names, ncol);
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
        point pt;
        pt.offset = s;
        pt.restoring = -(r.force[0] * cd + r.force[1] * sd) / 1e3;
        pt.fx = r.force[0] / 1e3;
        pt.fy = r.force[1] / 1e3;
        pt.mz = r.force[5] / 1e3;
        /* d(restoring)/ds = d^T K_h d, K_h the horizontal translation block. */
        pt.stiffness =
            (K[0][0] * cd * cd + (K[0][1] + K[1][0]) * cd * sd + K[1][1] * sd * sd) / 1e3;
        pt.tmax = r.max_tension / 1e3;
        pt.tmax_line = r.max_tension_line != (size_t)-1 ? m.lines[r.max_tension_line].name : "";
        pt.umax = r.max_utilisation;
        if (human)
            table_row(out, &pt);
        if (csv) {
            hf_csv_field_double(&c, pt.offset);
            hf_csv_field_double(&c, pt.restoring);
            hf_csv_field_double(&c, pt.fx);
            hf_csv_field_double(&c, pt.fy);
            hf_csv_field_double(&c, pt.mz);
            hf_csv_field_double(&c, pt.stiffness);
            hf_csv_field_double(&c, pt.tmax);
            hf_csv_field_str(&c, pt.tmax_line);
            hf_csv_field_double(&c, pt.umax);
            for (size_t i = 0; i < m.nlines; i++)
                hf_csv_field_double(&c, r.states[i].tension / 1e3);
            hf_csv_end_row(&c);
        }
    }
    if (csv) {
        hf_csv_flush(&c);
        hf_outfile *g = f;
        f = NULL;
        if (hf_outfile_commit(g, &err) != HF_OK) {
            rc = hf_cli_fail(&err);
            goto done;
        }
    }
    if (human)
        fprintf(out, "\n%s", hf_cli_caution);
done:
    hf_outfile_abort(f);
    if (names)
        for (size_t j = 0; j < ncol; j++)
            hf_free(names[j]);
    hf_free(names);
    hf_spread_free(ws);
    hf_model_free(&m);
    return rc;
}
