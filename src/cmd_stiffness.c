/* cmd_stiffness.c - 'holdfast stiffness': analytic 6x6 stiffness and static load at a pose. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/cli.h"
#include "holdfast/csv.h"
#include "holdfast/outfile.h"
#include "holdfast/spread.h"

static const char usage_text[] =
    "usage: holdfast stiffness CASE [--offset X,Y,HEADING_DEG] [--csv FILE|-]\n"
    "\n"
    "Analytic 6x6 mooring stiffness of the spread at a hull pose, with the static\n"
    "mooring force and moment on the hull there.  The pose is the case's hull\n"
    "position and heading plus the optional offset (m, m, degrees).\n"
    "\n"
    "  K[i][j] = -dF_i/dq_j, rows Fx Fy Fz Mx My Mz (global axes, moments about the\n"
    "  hull reference point at the still water level), columns surge sway heave\n"
    "  roll pitch yaw (z-y-x Euler angles).  Units kN/m, kN/rad, kN m/m, kN m/rad.\n"
    "\n"
    "options:\n"
    "  --offset X,Y,HEADING_DEG  offset from the case's hull pose\n"
    "  --csv FILE|-              write rows surge..yaw and static_load as CSV\n"
    "  --help                    show this text\n"
    "\n"
    "exit status: 0 ok, 2 bad input or usage, 3 numerical failure\n";

static const char *const dof[6] = {"surge", "sway", "heave", "roll", "pitch", "yaw"};

/* Matches "--name VALUE" or "--name=VALUE"; advances *i past what it used. */
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

static void write_csv(FILE *out, double K[6][6], const double F[6])
{
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header(&c, "row", "surge", "sway", "heave", "roll", "pitch", "yaw", NULL);
    for (int i = 0; i < 6; i++) {
        hf_csv_field_str(&c, dof[i]);
        for (int j = 0; j < 6; j++)
            hf_csv_field_double(&c, K[i][j] / 1e3);
        hf_csv_end_row(&c);
    }
    hf_csv_field_str(&c, "static_load");
    for (int j = 0; j < 6; j++)
        hf_csv_field_double(&c, F[j] / 1e3);
    hf_csv_end_row(&c);
    hf_csv_flush(&c);
}

static void write_table(FILE *out, const hf_model *m, const hf_pose *p, double K[6][6],
                        const hf_spread_result *r)
{
    fprintf(out, "%s\n", m->title ? m->title : "");
    fprintf(out, "hull pose: x %.3f m, y %.3f m, heading %.3f deg\n\n", p->surge, p->sway,
            p->yaw * 180.0 / M_PI);
    fprintf(out, "mooring stiffness K = -dF/dq (kN/m | kN/rad; moment rows kN m/m | kN m/rad)\n");
    fprintf(out, "%-7s", "");
    for (int j = 0; j < 6; j++)
        fprintf(out, " %13s", dof[j]);
    fprintf(out, "\n");
    /* For people: entries below 1e-9 of the largest are solver round-off, shown as 0. */
    double kmax = 0.0;
    for (int i = 0; i < 6; i++)
        for (int j = 0; j < 6; j++)
            kmax = fmax(kmax, fabs(K[i][j]));
    for (int i = 0; i < 6; i++) {
        fprintf(out, "%-7s", dof[i]);
        for (int j = 0; j < 6; j++) {
            double v = fabs(K[i][j]) < 1e-9 * kmax ? 0.0 : K[i][j] / 1e3;
            fprintf(out, " %13.6g", v);
        }
        fprintf(out, "\n");
    }
    fprintf(out, "\nstatic mooring load on the hull (global axes, about the reference point):\n");
    fprintf(out, "  Fx %12.2f kN   Fy %12.2f kN   Fz %12.2f kN\n", nz(r->force[0] / 1e3, 0.005),
            nz(r->force[1] / 1e3, 0.005), nz(r->force[2] / 1e3, 0.005));
    fprintf(out, "  Mx %12.1f kN m My %12.1f kN m Mz %12.1f kN m\n", nz(r->force[3] / 1e3, 0.05),
            nz(r->force[4] / 1e3, 0.05), nz(r->force[5] / 1e3, 0.05));
    if (r->max_tension_line != (size_t)-1)
        fprintf(out, "largest line tension %.1f kN (%s), utilisation %.3f\n", r->max_tension / 1e3,
                m->lines[r->max_tension_line].name, r->max_utilisation);
    fprintf(out, "\n%s", hf_cli_caution);
}

int hf_cmd_stiffness(int argc, char **argv)
{
    const char *cmd = "stiffness", *path = NULL, *csv = NULL, *offset_text = NULL;
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
        } else if (option(argc, argv, &i, "--offset", &v, &missing)) {
            if (missing)
                return hf_cli_usage_error(cmd, "--offset needs X,Y,HEADING_DEG");
            offset_text = v;
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
    hf_error err;
    hf_error_clear(&err);
    double offset[3] = {0.0, 0.0, 0.0};
    if (offset_text && hf_cli_parse_offset(offset_text, offset, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);

    hf_model m;
    hf_model_init(&m);
    if (hf_cli_load(path, &m, &err) != HF_OK)
        return hf_cli_fail(&err);
    int rc = HF_EXIT_OK;
    hf_spread *ws = hf_spread_alloc(&m, &err);
    if (!ws) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    hf_pose pose;
    hf_spread_pose_rest(&m, &pose);
    hf_spread_pose_offset(&pose, offset);
    double K[6][6];
    hf_spread_result res;
    if (hf_spread_stiffness(ws, &pose, K, &res, &err) != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    if (csv) {
        hf_outfile *f = hf_outfile_open(csv, &err);
        if (!f) {
            rc = hf_cli_fail(&err);
            goto done;
        }
        write_csv(hf_outfile_stream(f), K, res.force);
        if (hf_outfile_commit(f, &err) != HF_OK) {
            rc = hf_cli_fail(&err);
            goto done;
        }
        if (strcmp(csv, "-") != 0)
            write_table(stdout, &m, &pose, K, &res);
    } else {
        write_table(stdout, &m, &pose, K, &res);
    }
done:
    hf_spread_free(ws);
    hf_model_free(&m);
    return rc;
}
