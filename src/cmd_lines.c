/* cmd_lines.c - 'holdfast lines': every line solved at one pose, as a table, CSV, profiles. */
#include <math.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/analysis.h"
#include "holdfast/cli.h"
#include "holdfast/csv.h"
#include "holdfast/outfile.h"
#include "holdfast/results.h"
#include "holdfast/spread.h"

/* Profile sampling: about this many points per line, never closer than the floor. */
#define PROFILE_POINTS 400.0
#define PROFILE_MIN_SPACING 0.05 /* m */

static const char usage_text[] =
    "usage: holdfast lines CASE [--offset X,Y,HEADING_DEG] [--csv FILE|-] [--profiles DIR]\n"
    "\n"
    "Solves every line with the hull at the case's pose plus the optional offset\n"
    "(m, m, degrees) and prints one row per line: status (regime or failure),\n"
    "fairlead tension and its horizontal and vertical parts, the line's angle\n"
    "above horizontal at the fairlead, the anchor load and uplift angle, the length\n"
    "resting on the seabed, the horizontal span and the largest utilisation (T/MBL);\n"
    "a line whose tension reaches the breaking load (utilisation >= 1) is marked\n"
    "'overloaded' (CSV column alert, last) and named in a message on stderr.\n"
    "\n"
    "options:\n"
    "  --offset X,Y,HEADING_DEG  offset from the case's hull pose\n"
    "  --csv FILE|-              one CSV row per line (- = standard output)\n"
    "  --profiles DIR            write DIR/<line>.csv: arc_m,x_m,y_m,z_m,tension_kN in\n"
    "                            global coordinates (DIR is created when missing)\n"
    "  --help                    show this text\n"
    "\n"
    "exit status: 0 ok, 1 a line is overloaded (output still complete), 2 bad\n"
    "input or usage, 3 numerical failure\n";

static void write_table(FILE *out, const hf_model *m, const hf_pose *p, const hf_spread_result *r)
{
    fprintf(out, "%s\n", m->title ? m->title : "");
    fprintf(out, "hull pose: x %.3f m, y %.3f m, heading %.3f deg; water depth %.2f m\n\n",
            p->surge, p->sway, p->yaw * 180.0 / M_PI, hf_model_water_height(m));
    fprintf(out, "%-14s %-10s %10s %10s %10s %7s %10s %7s %9s %9s %7s %s\n", "line", "status",
            "T top kN", "H kN", "V kN", "top deg", "T anch kN", "upl deg", "ground m", "span m",
            "util", "alert");
    for (size_t i = 0; i < m->nlines; i++) {
        char buf[HF_ERROR_TEXT];
        const hf_line_state *s = &r->states[i];
        const char *st = hf_results_line_status(r, i, buf, sizeof buf);
        if (!hf_results_line_solved(r, i)) {
            fprintf(out, "%-14s %s\n", m->lines[i].name, st);
            continue;
        }
        fprintf(out, "%-14s %-10s %10.1f %10.1f %10.1f %7.2f %10.1f %7.2f %9.1f %9.1f %7.3f%s%s\n",
                m->lines[i].name, st, s->tension / 1e3, s->h / 1e3, s->v / 1e3,
                hf_results_line_top_angle_deg(s), s->anchor_tension / 1e3,
                s->anchor_angle * 180.0 / M_PI, s->grounded, r->geom[i].x, s->max_utilisation,
                hf_results_line_overloaded(r, i) ? " " : "", hf_results_line_alert(r, i));
    }
    if (r->status == HF_OK) {
        fprintf(
            out,
            "\nmooring load on the hull: Fx %.1f kN, Fy %.1f kN, Fz %.1f kN, "
            "Mz %.1f kN m\n",
            hf_cli_zero_small(r->force[0] / 1e3, 0.05), hf_cli_zero_small(r->force[1] / 1e3, 0.05),
            hf_cli_zero_small(r->force[2] / 1e3, 0.05), hf_cli_zero_small(r->force[5] / 1e3, 0.05));
        if (r->max_utilisation_line != (size_t)-1)
            fprintf(out, "most utilised line: %s (%.3f of MBL)\n",
                    m->lines[r->max_utilisation_line].name, r->max_utilisation);
    }
    fprintf(out, "\n%s", hf_caution_text);
}

/* A line name made safe as a file name: letters, digits, '.', '-', '_' kept,
 * anything else '_', no leading '.' (no hidden file). */
static void safe_name(const char *name, char *out, size_t cap)
{
    size_t k = 0;
    for (; name[k] && k + 1 < cap; k++) {
        char ch = name[k];
        int ok = (ch >= 'a' && ch <= 'z') || (ch >= 'A' && ch <= 'Z') || (ch >= '0' && ch <= '9') ||
                 ch == '-' || ch == '_' || (ch == '.' && k > 0);
        out[k] = ok ? ch : '_';
    }
    out[k] = '\0';
}

/* The profile file's base name of line i: its safe name; "line-<i+1>" when
 * that is empty; with "-<i+1>" added when an earlier line has the same safe
 * name (so no profile replaces another). */
static void file_name(const hf_model *m, size_t i, char *out, size_t cap)
{
    safe_name(m->lines[i].name ? m->lines[i].name : "", out, cap);
    if (!out[0]) {
        snprintf(out, cap, "line-%zu", i + 1);
        return;
    }
    char other[256];
    for (size_t j = 0; j < i; j++) {
        safe_name(m->lines[j].name ? m->lines[j].name : "", other, sizeof other);
        if (!strcmp(other, out)) {
            size_t n = strlen(out);
            snprintf(out + n, cap - n, "-%zu", i + 1);
            return;
        }
    }
}

static double spacing_for(const hf_line *l)
{
    return fmax(hf_line_length(l) / PROFILE_POINTS, PROFILE_MIN_SPACING);
}

/* Writes the n profile points of line i to path: arc_m,x_m,y_m,z_m,tension_kN
 * in global coordinates (hf_analysis_profile_point). */
static hf_status write_profile(const char *path, const hf_model *m, const hf_spread_result *r,
                               size_t i, const hf_line_point *pts, size_t n, hf_error *err)
{
    hf_outfile *f = hf_outfile_open(path, err);
    if (!f)
        return err ? err->status : HF_EIO;
    hf_csv c;
    hf_csv_init(&c, hf_outfile_stream(f), 0);
    hf_csv_header(&c, "arc_m", "x_m", "y_m", "z_m", "tension_kN", NULL);
    for (size_t k = 0; k < n; k++) {
        double g[3];
        hf_analysis_profile_point(m, r, i, &pts[k], g);
        hf_csv_field_double(&c, pts[k].arc);
        hf_csv_field_double(&c, g[0]);
        hf_csv_field_double(&c, g[1]);
        hf_csv_field_double(&c, g[2]);
        hf_csv_field_double(&c, pts[k].tension / 1e3);
        hf_csv_end_row(&c);
    }
    hf_csv_flush(&c);
    return hf_outfile_commit(f, err);
}

/* DIR/<line>.csv for every solved line; none may be the case file. */
static hf_status write_profiles(const char *dir, const char *case_path, const hf_model *m,
                                const hf_spread_result *r, hf_error *err)
{
    hf_status s = hf_cli_make_dir("--profiles", dir, err);
    if (s != HF_OK)
        return s;
    size_t cap = 0;
    for (size_t i = 0; i < m->nlines; i++)
        if (hf_results_line_solved(r, i)) {
            size_t n = hf_line_profile(&m->lines[i].line, &r->states[i],
                                       spacing_for(&m->lines[i].line), NULL, 0);
            cap = n > cap ? n : cap;
        }
    hf_line_point *pts = hf_calloc(cap ? cap : 1, sizeof *pts);
    if (!pts)
        return hf_error_set(err, HF_ENOMEM, "out of memory for line profiles");
    for (size_t i = 0; i < m->nlines && s == HF_OK; i++) {
        if (!hf_results_line_solved(r, i))
            continue;
        const hf_line *l = &m->lines[i].line;
        size_t n = hf_line_profile(l, &r->states[i], spacing_for(l), pts, cap);
        char base[256], path[4096 + 300];
        file_name(m, i, base, sizeof base);
        snprintf(path, sizeof path, "%s/%s.csv", dir, base);
        s = hf_outfile_check_not_input(path, case_path, err);
        if (s == HF_OK)
            s = write_profile(path, m, r, i, pts, n > cap ? cap : n, err);
    }
    hf_free(pts);
    return s;
}

/* One line on stderr for the first overloaded line of r (none: returns
 * HF_EXIT_OK): its utilisation, the tension and MBL of its most utilised
 * section and the offset.  Returns HF_EXIT_CRITERION when a line is. */
static int report_overload(const hf_model *m, const hf_spread_result *r, const double off[3])
{
    size_t i = hf_results_first_overloaded(r);
    if (i == (size_t)-1)
        return HF_EXIT_OK;
    const hf_line_state *s = &r->states[i];
    size_t k = s->max_section;
    fprintf(stderr,
            "holdfast lines: line %s is overloaded: utilisation %.1f (T %.1f kN >= MBL %.1f kN) "
            "at offset %.6g,%.6g,%.6g\n",
            hf_results_line_name(m, i), s->max_utilisation, s->section[k].t_max / 1e3,
            m->lines[i].line.sec[k].mbl / 1e3, off[0], off[1], off[2] * 180.0 / M_PI);
    return HF_EXIT_CRITERION;
}

int hf_cmd_lines(int argc, char **argv)
{
    const char *cmd = "lines", *profiles = NULL;
    const hf_cli_opt extra[] = {{.name = "--profiles",
                                 .missing = "--profiles needs a directory",
                                 .nonempty = 1,
                                 .value = &profiles}};
    hf_cli_pose_cmd pc;
    int rc = hf_cli_pose_cmd_begin(&pc, argc, argv, cmd, usage_text, extra, 1);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    rc = HF_EXIT_OK;
    hf_error solve_err;
    hf_error_clear(&solve_err);
    /* A failing line does not stop the others: its row shows the failure and
     * the exit status reports it after the output is written. */
    hf_status st = hf_analysis_pose_solve(&pc.at, &pc.m, pc.offset, 0, &solve_err);
    const hf_spread_result *res = &pc.at.res;
    if (!pc.at.ws || (st == HF_EINVAL && res->failed_line == (size_t)-1)) {
        rc = hf_cli_fail(&solve_err); /* no workspace, or the pose itself was rejected */
        goto done;
    }
    if (pc.csv) {
        hf_outfile *f = hf_cli_csv_begin(pc.csv, NULL, &pc.m, &pc.err);
        if (!f || hf_cli_csv_end(cmd, &f, hf_results_lines_write(hf_outfile_stream(f), &pc.m, res),
                                 &pc.err) != HF_OK) {
            rc = hf_cli_fail(&pc.err);
            goto done;
        }
    }
    if (!pc.csv || strcmp(pc.csv, "-") != 0)
        write_table(stdout, &pc.m, &pc.at.pose, res);
    if (profiles && write_profiles(profiles, pc.path, &pc.m, res, &pc.err) != HF_OK) {
        rc = hf_cli_fail(&pc.err);
        goto done;
    }
    for (size_t i = 0; i < pc.m.nlines; i++)
        hf_results_stretch_warn(stderr, cmd, pc.m.lines[i].name, &res->geom[i],
                                &pc.m.lines[i].line);
    rc = report_overload(&pc.m, res, pc.offset);
    if (st != HF_OK)
        rc = hf_cli_fail(&solve_err);
done:
    hf_cli_pose_cmd_end(&pc);
    return rc;
}
