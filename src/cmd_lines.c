/* cmd_lines.c - 'holdfast lines': every line solved at one pose, as a table, CSV, profiles. */
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>
#include "holdfast/alloc.h"
#include "holdfast/cli.h"
#include "holdfast/csv.h"
#include "holdfast/outfile.h"
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
    "resting on the seabed, the horizontal span and the largest utilisation (T/MBL).\n"
    "\n"
    "options:\n"
    "  --offset X,Y,HEADING_DEG  offset from the case's hull pose\n"
    "  --csv FILE|-              one CSV row per line (- = standard output)\n"
    "  --profiles DIR            write DIR/<line>.csv: arc_m,x_m,y_m,z_m,tension_kN in\n"
    "                            global coordinates (DIR is created when missing)\n"
    "  --help                    show this text\n"
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

/* Status text of line i: regime name, "broken", or "failed: why". */
static const char *status_text(const hf_spread_result *r, size_t i, char *buf, size_t cap)
{
    const hf_line_state *s = &r->states[i];
    if (r->broken[i])
        return "broken";
    if (s->status != HF_OK) {
        snprintf(buf, cap, "failed: %s",
                 s->message && s->message[0] ? s->message : hf_status_str(s->status));
        return buf;
    }
    return hf_line_regime_name(s->regime);
}

static int solved(const hf_spread_result *r, size_t i)
{
    return !r->broken[i] && r->states[i].status == HF_OK;
}

static double top_angle_deg(const hf_line_state *s)
{
    return atan2(s->v, s->h) * 180.0 / M_PI;
}

static void write_csv(FILE *out, const hf_model *m, const hf_spread_result *r)
{
    hf_csv c;
    hf_csv_init(&c, out, 0);
    hf_csv_header(&c, "line", "status", "fairlead_tension_kN", "fairlead_horizontal_kN",
                  "fairlead_vertical_kN", "top_angle_deg", "anchor_tension_kN",
                  "anchor_vertical_kN", "anchor_uplift_deg", "grounded_m", "span_m",
                  "max_utilisation", "height_m", "anchor_horizontal_kN", "touchdown_m",
                  "max_tension_kN", NULL);
    for (size_t i = 0; i < m->nlines; i++) {
        char buf[HF_ERROR_TEXT];
        const hf_line_state *s = &r->states[i];
        hf_csv_field_str(&c, m->lines[i].name);
        hf_csv_field_str(&c, status_text(r, i, buf, sizeof buf));
        if (solved(r, i)) {
            hf_csv_field_double(&c, s->tension / 1e3);
            hf_csv_field_double(&c, s->h / 1e3);
            hf_csv_field_double(&c, s->v / 1e3);
            hf_csv_field_double(&c, top_angle_deg(s));
            hf_csv_field_double(&c, s->anchor_tension / 1e3);
            hf_csv_field_double(&c, s->anchor_v / 1e3);
            hf_csv_field_double(&c, s->anchor_angle * 180.0 / M_PI);
            hf_csv_field_double(&c, s->grounded);
            hf_csv_field_double(&c, r->geom[i].x);
            hf_csv_field_double(&c, s->max_utilisation);
            hf_csv_field_double(&c, r->geom[i].z);
            hf_csv_field_double(&c, s->anchor_h / 1e3);
            hf_csv_field_double(&c, s->touchdown_x);
            hf_csv_field_double(&c, r->line_tension[i] / 1e3);
        } else {
            for (int k = 0; k < 14; k++)
                hf_csv_field_empty(&c);
        }
        hf_csv_end_row(&c);
    }
    hf_csv_flush(&c);
}

/* For tables: a value that rounds to zero at the printed precision (half a
 * unit of the last digit) is printed as 0, not -0. */
static double nz(double v, double half)
{
    return fabs(v) < half ? 0.0 : v;
}

static void write_table(FILE *out, const hf_model *m, const hf_pose *p, const hf_spread_result *r)
{
    fprintf(out, "%s\n", m->title ? m->title : "");
    fprintf(out, "hull pose: x %.3f m, y %.3f m, heading %.3f deg; water depth %.2f m\n\n",
            p->surge, p->sway, p->yaw * 180.0 / M_PI, hf_model_water_height(m));
    fprintf(out, "%-14s %-10s %10s %10s %10s %7s %10s %7s %9s %9s %7s\n", "line", "status",
            "T top kN", "H kN", "V kN", "top deg", "T anch kN", "upl deg", "ground m", "span m",
            "util");
    for (size_t i = 0; i < m->nlines; i++) {
        char buf[HF_ERROR_TEXT];
        const hf_line_state *s = &r->states[i];
        const char *st = status_text(r, i, buf, sizeof buf);
        if (!solved(r, i)) {
            fprintf(out, "%-14s %s\n", m->lines[i].name, st);
            continue;
        }
        fprintf(out, "%-14s %-10s %10.1f %10.1f %10.1f %7.2f %10.1f %7.2f %9.1f %9.1f %7.3f\n",
                m->lines[i].name, st, s->tension / 1e3, s->h / 1e3, s->v / 1e3, top_angle_deg(s),
                s->anchor_tension / 1e3, s->anchor_angle * 180.0 / M_PI, s->grounded, r->geom[i].x,
                s->max_utilisation);
    }
    if (r->status == HF_OK) {
        fprintf(out,
                "\nmooring load on the hull: Fx %.1f kN, Fy %.1f kN, Fz %.1f kN, "
                "Mz %.1f kN m\n",
                nz(r->force[0] / 1e3, 0.05), nz(r->force[1] / 1e3, 0.05),
                nz(r->force[2] / 1e3, 0.05), nz(r->force[5] / 1e3, 0.05));
        if (r->max_utilisation_line != (size_t)-1)
            fprintf(out, "most utilised line: %s (%.3f of MBL)\n",
                    m->lines[r->max_utilisation_line].name, r->max_utilisation);
    }
    fprintf(out, "\n%s", hf_cli_caution);
}

/* mkdir -p for the profiles folder. */
static hf_status make_dir(const char *dir, hf_error *err)
{
    char path[4096];
    size_t n = strlen(dir);
    if (n == 0 || n >= sizeof path)
        return hf_error_set(err, HF_EINVAL, "--profiles: directory name empty or too long");
    memcpy(path, dir, n + 1);
    for (size_t k = 1; k <= n; k++) {
        if (path[k] != '/' && path[k] != '\0')
            continue;
        char keep = path[k];
        path[k] = '\0';
        if (mkdir(path, 0777) != 0 && errno != EEXIST)
            return hf_error_set(err, HF_EIO, "--profiles: cannot create directory '%s': %s", path,
                                strerror(errno));
        path[k] = keep;
    }
    struct stat sb;
    if (stat(dir, &sb) != 0 || !S_ISDIR(sb.st_mode))
        return hf_error_set(err, HF_EIO, "--profiles: '%s' is not a directory", dir);
    return HF_OK;
}

/* A line name made safe as a file name: letters, digits, '.', '-', '_' kept. */
static void file_name(const char *name, char *out, size_t cap)
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

static double spacing_for(const hf_line *l)
{
    return fmax(hf_line_length(l) / PROFILE_POINTS, PROFILE_MIN_SPACING);
}

static hf_status write_profiles(const char *dir, const hf_model *m, const hf_spread_result *r,
                                hf_error *err)
{
    hf_status s = make_dir(dir, err);
    if (s != HF_OK)
        return s;
    size_t cap = 0;
    for (size_t i = 0; i < m->nlines; i++)
        if (solved(r, i)) {
            size_t n = hf_line_profile(&m->lines[i].line, &r->states[i],
                                       spacing_for(&m->lines[i].line), NULL, 0);
            if (n > cap)
                cap = n;
        }
    hf_line_point *pts = hf_calloc(cap ? cap : 1, sizeof *pts);
    if (!pts)
        return hf_error_set(err, HF_ENOMEM, "out of memory for line profiles");
    double seabed = -hf_model_water_height(m);
    for (size_t i = 0; i < m->nlines && s == HF_OK; i++) {
        if (!solved(r, i))
            continue;
        const hf_model_line *ml = &m->lines[i];
        size_t n = hf_line_profile(&ml->line, &r->states[i], spacing_for(&ml->line), pts, cap);
        if (n > cap)
            n = cap;
        char base[256], path[4096 + 300];
        file_name(ml->name, base, sizeof base);
        snprintf(path, sizeof path, "%s/%s.csv", dir, base);
        hf_outfile *f = hf_outfile_open(path, err);
        if (!f) {
            s = err ? err->status : HF_EIO;
            break;
        }
        hf_csv c;
        hf_csv_init(&c, hf_outfile_stream(f), 0);
        hf_csv_header(&c, "arc_m", "x_m", "y_m", "z_m", "tension_kN", NULL);
        const double *d = r->geom[i].dir;
        for (size_t k = 0; k < n; k++) {
            hf_csv_field_double(&c, pts[k].arc);
            hf_csv_field_double(&c, ml->anchor[0] + pts[k].x * d[0]);
            hf_csv_field_double(&c, ml->anchor[1] + pts[k].x * d[1]);
            hf_csv_field_double(&c, seabed + pts[k].z);
            hf_csv_field_double(&c, pts[k].tension / 1e3);
            hf_csv_end_row(&c);
        }
        hf_csv_flush(&c);
        s = hf_outfile_commit(f, err);
    }
    hf_free(pts);
    return s;
}

int hf_cmd_lines(int argc, char **argv)
{
    const char *cmd = "lines", *path = NULL, *csv = NULL, *offset_text = NULL, *profiles = NULL;
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
        } else if (option(argc, argv, &i, "--profiles", &v, &missing)) {
            if (missing || !v[0])
                return hf_cli_usage_error(cmd, "--profiles needs a directory");
            profiles = v;
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
    hf_spread_result res;
    hf_error solve_err;
    hf_error_clear(&solve_err);
    /* A failing line does not stop the others: its row shows the failure and
     * the exit status reports it after the output is written. */
    hf_status st = hf_spread_solve(ws, &pose, &res, &solve_err);
    if (st == HF_EINVAL && res.failed_line == (size_t)-1) {
        rc = hf_cli_fail(&solve_err); /* the pose itself was rejected */
        goto done;
    }
    if (csv) {
        hf_outfile *f = hf_outfile_open(csv, &err);
        if (!f) {
            rc = hf_cli_fail(&err);
            goto done;
        }
        write_csv(hf_outfile_stream(f), &m, &res);
        if (hf_outfile_commit(f, &err) != HF_OK) {
            rc = hf_cli_fail(&err);
            goto done;
        }
    }
    if (!csv || strcmp(csv, "-") != 0)
        write_table(stdout, &m, &pose, &res);
    if (profiles && write_profiles(profiles, &m, &res, &err) != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    if (st != HF_OK)
        rc = hf_cli_fail(&solve_err);
done:
    hf_spread_free(ws);
    hf_model_free(&m);
    return rc;
}
