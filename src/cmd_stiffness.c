/* cmd_stiffness.c - 'holdfast stiffness': analytic 6x6 stiffness and static load at a pose. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/cli.h"
#include "holdfast/outfile.h"
#include "holdfast/results.h"
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

/* Row and column names of the matrix: the degrees of freedom. */
static const char *const *const dof = hf_results_stiffness_columns + 1;

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
    double Kp[6][6], Fp[6];
    hf_results_stiffness_for_people(K, r->force, Kp, Fp);
    for (int i = 0; i < 6; i++) {
        fprintf(out, "%-7s", dof[i]);
        for (int j = 0; j < 6; j++)
            fprintf(out, " %13.6g", Kp[i][j]);
        fprintf(out, "\n");
    }
    fprintf(out, "\nstatic mooring load on the hull (global axes, about the reference point):\n");
    fprintf(out, "  Fx %12.2f kN   Fy %12.2f kN   Fz %12.2f kN\n",
            hf_cli_zero_small(r->force[0] / 1e3, 0.005),
            hf_cli_zero_small(r->force[1] / 1e3, 0.005),
            hf_cli_zero_small(r->force[2] / 1e3, 0.005));
    fprintf(out, "  Mx %12.1f kN m My %12.1f kN m Mz %12.1f kN m\n",
            hf_cli_zero_small(r->force[3] / 1e3, 0.05), hf_cli_zero_small(r->force[4] / 1e3, 0.05),
            hf_cli_zero_small(r->force[5] / 1e3, 0.05));
    if (r->max_tension_line != (size_t)-1)
        fprintf(out, "largest line tension %.1f kN (%s), utilisation %.3f\n", r->max_tension / 1e3,
                m->lines[r->max_tension_line].name, r->max_utilisation);
    fprintf(out, "\n%s", hf_caution_text);
}

int hf_cmd_stiffness(int argc, char **argv)
{
    const char *cmd = "stiffness";
    hf_cli_pose_cmd pc;
    int rc = hf_cli_pose_cmd_begin(&pc, argc, argv, cmd, usage_text, NULL, 0);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    rc = HF_EXIT_OK;
    if (hf_analysis_pose_solve(&pc.at, &pc.m, pc.offset, 1, &pc.err) != HF_OK) {
        rc = hf_cli_fail(&pc.err);
        goto done;
    }
    const hf_spread_result *res = &pc.at.res;
    if (pc.csv) {
        hf_outfile *f = hf_cli_csv_begin(pc.csv, NULL, &pc.m, &pc.err);
        if (!f ||
            hf_cli_csv_end(cmd, &f,
                           hf_results_stiffness_write(hf_outfile_stream(f), pc.at.K, res->force),
                           &pc.err) != HF_OK) {
            rc = hf_cli_fail(&pc.err);
            goto done;
        }
    }
    if (!pc.csv || strcmp(pc.csv, "-") != 0)
        write_table(stdout, &pc.m, &pc.at.pose, pc.at.K, res);
done:
    hf_cli_pose_cmd_end(&pc);
    return rc;
}
