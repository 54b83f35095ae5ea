/* cmd_plot.c - 'holdfast plot': one SVG figure of a case (plan, line elevation, restoring curve).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/case.h"
#include "holdfast/cli.h"
#include "holdfast/criteria.h"
#include "holdfast/outfile.h"
#include "holdfast/report.h"
#include "holdfast/spread.h"
#include "holdfast/svg.h"

/* Documented limit: offsets of one curve figure. */
#define MAX_POINTS 100000

static const char usage_text[] =
    "usage: holdfast plot CASE --figure plan|elevation|curve [OPTIONS]\n"
    "\n"
    "Writes one SVG figure of the case (the same figures as in report.html):\n"
    "  plan       the spread seen from above: hull outline (or the hull drawn\n"
    "             through the fairleads), lines, anchors; with --load, the\n"
    "             direction of that load case's resultant as an arrow\n"
    "  elevation  one line in its vertical plane: seabed, still water level,\n"
    "             anchor, touchdown, fairlead, the line coloured by tension,\n"
    "             and tension along the line with the allowed tension\n"
    "             (MBL / intact factor) when the case has criteria\n"
    "  curve      against offset along --direction: restoring force, stiffness,\n"
    "             the tension and utilisation of each line, with the criterion\n"
    "             limit as a horizontal line\n"
    "\n"
    "options:\n"
    "  --figure plan|elevation|curve   which figure (required)\n"
    "  --out FILE|-                    where to write it (default -: standard output)\n"
    "  --offset X,Y,HEADING_DEG        hull pose: offset from the case's rest pose\n"
    "                                  (plan, elevation; default none)\n"
    "  --line NAME                     elevation: the line (default: the line with\n"
    "                                  the largest fairlead tension at the pose)\n"
    "  --load NAME                     plan: show this load case's direction\n"
    "  --direction DEG                 curve: offset direction, degrees from global x\n"
    "                                  (default: the case's first curve study, else 0)\n"
    "  --range FROM:TO:STEP            curve: offsets in metres (default: the case's\n"
    "                                  first curve study, else -20:20:0.5; at most\n"
    "                                  100000 points)\n"
    "  --help                          show this text\n"
    "\n"
    "Curve points where the spread cannot be solved are left as gaps and counted\n"
    "on standard error.  Figures are for looking at; numbers come from the CSV of\n"
    "'holdfast lines' and 'holdfast curve'.\n"
    "\n"
    "exit status: 0 ok, 2 bad input or usage, 3 numerical failure\n";

/* Parses a finite number of degrees into radians. */
static int degrees(const char *text, double *rad)
{
    char *end;
    double v = strtod(text, &end);
    if (end == text || *end != '\0' || !isfinite(v))
        return 0;
    *rad = v * M_PI / 180.0;
    return 1;
}

/* The spread at a pose: solves and returns the workspace's result. */
static hf_status solve_at(hf_spread *ws, const hf_pose *pose, hf_spread_result *res, hf_error *err)
{
    return hf_spread_solve(ws, pose, res, err);
}

static hf_status plot_elevation(FILE *out, const hf_model *m, const hf_pose *pose,
                                const char *line_name, hf_error *err)
{
    hf_spread *ws = hf_spread_alloc(m, err);
    if (!ws)
        return err->status;
    hf_spread_result res;
    hf_status s = solve_at(ws, pose, &res, err);
    if (s == HF_OK) {
        size_t i = 0;
        if (line_name) {
            i = hf_model_line_find(m, line_name);
            if (i == (size_t)-1)
                s = hf_error_set(err, HF_EINVAL, "--line: the case has no line named '%s'",
                                 line_name);
        } else {
            for (size_t j = 1; j < res.nlines; j++)
                if (res.states[j].tension > res.states[i].tension)
                    i = j;
            fprintf(stderr, "holdfast plot: line '%s' (the largest fairlead tension)\n",
                    m->lines[i].name);
        }
        if (s == HF_OK)
            s = hf_report_svg_elevation(out, m, i, &res.states[i], 1, err);
    }
    hf_spread_free(ws);
    return s;
}

/* Restoring curve along direction `dir` over n offsets from `from` by `step`. */
static hf_status plot_curve(FILE *out, const hf_model *m, double dir, double from, double step,
                            size_t n, hf_error *err)
{
    size_t nl = m->nlines;
    hf_status s = HF_OK;
    double *off = hf_malloc(n * sizeof *off), *force = hf_malloc(n * sizeof *force);
    double *stiff = hf_malloc(n * sizeof *stiff);
    double *ten = hf_malloc(n * nl * sizeof *ten), *util = hf_malloc(n * nl * sizeof *util);
    double *lim = hf_malloc(nl * sizeof *lim);
    const char **names = hf_malloc(nl * sizeof *names);
    hf_spread *ws = NULL;
    if (!off || !force || !stiff || !ten || !util || !lim || !names) {
        s = hf_error_set(err, HF_ENOMEM, "curve figure: out of memory");
        goto done;
    }
    ws = hf_spread_alloc(m, err);
    if (!ws) {
        s = err->status;
        goto done;
    }
    double f = hf_criteria_required(&m->criteria, 0);
    for (size_t j = 0; j < nl; j++) {
        names[j] = m->lines[j].name;
        /* allowed tension of the line's weakest section: MBL / intact factor */
        double mbl = INFINITY;
        for (size_t k = 0; k < m->lines[j].line.n; k++)
            mbl = fmin(mbl, m->lines[j].line.sec[k].mbl);
        lim[j] = f > 0 && isfinite(mbl) ? mbl / f : 0.0;
    }
    double c = cos(dir), sn = sin(dir);
    size_t failed = 0;
    hf_error perr;
    for (size_t i = 0; i < n; i++) {
        double d = from + (double)i * step;
        hf_pose pose;
        hf_spread_pose_rest(m, &pose);
        pose.surge += d * c;
        pose.sway += d * sn;
        double K[6][6];
        hf_spread_result res;
        off[i] = d;
        if (hf_spread_stiffness(ws, &pose, K, &res, &perr) != HF_OK) {
            /* a gap in the figure; the next point starts cold */
            failed++;
            hf_spread_reset(ws);
            force[i] = stiff[i] = NAN;
            for (size_t j = 0; j < nl; j++)
                ten[i * nl + j] = util[i * nl + j] = NAN;
            continue;
        }
        force[i] = -(res.force[0] * c + res.force[1] * sn);
        stiff[i] = K[0][0] * c * c + (K[0][1] + K[1][0]) * c * sn + K[1][1] * sn * sn;
        for (size_t j = 0; j < nl; j++) {
            ten[i * nl + j] = res.broken[j] ? NAN : res.line_tension[j];
            util[i * nl + j] = res.broken[j] ? NAN : res.states[j].max_utilisation;
        }
    }
    if (failed == n) {
        s = hf_error_set(err, HF_ENOCONV,
                         "curve figure: the spread could not be solved at any "
                         "offset; the first failure: %s",
                         perr.text);
        goto done;
    }
    if (failed)
        fprintf(stderr,
                "holdfast plot: %zu of %zu offsets could not be solved (gaps in the curve)\n",
                failed, n);
    char title[256], dl[160];
    snprintf(title, sizeof title, "%.200s: restoring curve", m->title ? m->title : "Case");
    snprintf(dl, sizeof dl,
             "Hull moved from rest toward %.4g deg from global x, heading fixed. Restoring force "
             "is minus the mooring force along that direction.",
             dir * 180.0 / M_PI);
    hf_svg_curve cv = {title,
                       n,
                       off,
                       force,
                       stiff,
                       nl,
                       names,
                       ten,
                       util,
                       f > 0 ? 1.0 / f : 0.0,
                       f > 0 ? lim : NULL,
                       dl};
    s = hf_svg_figure_curve(out, &cv, 1, err);
done:
    hf_spread_free(ws);
    hf_free(off);
    hf_free(force);
    hf_free(stiff);
    hf_free(ten);
    hf_free(util);
    hf_free(lim);
    hf_free(names);
    return s;
}

int hf_cmd_plot(int argc, char **argv)
{
    const char *cmd = "plot";
    const char *path = NULL, *figure = NULL, *outpath = "-", *offset = NULL, *line = NULL,
               *load = NULL, *direction = NULL, *range = NULL;
    for (int i = 1; i < argc; i++) {
        int missing = 0;
        if (!strcmp(argv[i], "--help") || !strcmp(argv[i], "-h")) {
            fputs(usage_text, stdout);
            return HF_EXIT_OK;
        }
        if (hf_cli_option(argc, argv, &i, "--figure", &figure, &missing) ||
            hf_cli_option(argc, argv, &i, "--out", &outpath, &missing) ||
            hf_cli_option(argc, argv, &i, "--offset", &offset, &missing) ||
            hf_cli_option(argc, argv, &i, "--line", &line, &missing) ||
            hf_cli_option(argc, argv, &i, "--load", &load, &missing) ||
            hf_cli_option(argc, argv, &i, "--direction", &direction, &missing) ||
            hf_cli_option(argc, argv, &i, "--range", &range, &missing)) {
            if (missing)
                return hf_cli_usage_error(cmd, "option '%s' needs a value", argv[i]);
        } else if (argv[i][0] == '-' && argv[i][1] != '\0') {
            return hf_cli_usage_error(cmd, "unknown option '%s'", argv[i]);
        } else if (path) {
            return hf_cli_usage_error(cmd, "one case file expected, got '%s' and '%s'", path,
                                      argv[i]);
        } else {
            path = argv[i];
        }
    }
    if (!path)
        return hf_cli_usage_error(cmd, "no case file given");
    if (!figure)
        return hf_cli_usage_error(cmd, "--figure plan|elevation|curve is required");
    int kind = !strcmp(figure, "plan")        ? 0
               : !strcmp(figure, "elevation") ? 1
               : !strcmp(figure, "curve")     ? 2
                                              : -1;
    if (kind < 0)
        return hf_cli_usage_error(cmd, "--figure: expected plan, elevation or curve, got '%s'",
                                  figure);
    if ((line && kind != 1) || (load && kind != 0) || ((direction || range) && kind != 2) ||
        (offset && kind == 2))
        return hf_cli_usage_error(cmd, "an option does not apply to --figure %s", figure);

    hf_error err;
    hf_error_clear(&err);
    double offs[3] = {0, 0, 0};
    if (offset && hf_cli_parse_offset(offset, offs, &err) != HF_OK)
        return hf_cli_fail(&err);
    hf_model m;
    hf_study_list sl;
    hf_model_init(&m);
    hf_study_list_init(&sl);
    if (hf_case_load_with_studies(path, &m, &sl, &err) != HF_OK)
        return hf_cli_fail(&err);

    hf_status s = HF_OK;
    hf_pose pose;
    hf_spread_pose_rest(&m, &pose);
    hf_spread_pose_offset(&pose, offs);
    double dir = 0, from = -20, to = 20, step = 0.5;
    size_t n = 0;
    const hf_load *ld = NULL;
    if (kind == 0 && load) {
        size_t k = hf_model_load_find(&m, load);
        if (k == (size_t)-1)
            s = hf_error_set(&err, HF_EINVAL, "--load: the case has no load case named '%s'", load);
        else
            ld = &m.loads[k];
    }
    if (kind == 2) {
        for (size_t k = 0; k < sl.n; k++)
            if (sl.v[k].kind == HF_STUDY_CURVE) {
                dir = sl.v[k].direction;
                from = sl.v[k].from;
                to = sl.v[k].to;
                step = sl.v[k].step;
                break;
            }
        if (direction && !degrees(direction, &dir))
            s = hf_error_set(&err, HF_EINVAL, "--direction: expected degrees, got \"%s\"",
                             direction);
        if (s == HF_OK && range)
            s = hf_cli_parse_range(range, &from, &to, &step, MAX_POINTS, &n, &err);
        else if (s == HF_OK) {
            char text[128];
            snprintf(text, sizeof text, "%.17g:%.17g:%.17g", from, to, step);
            s = hf_cli_parse_range(text, &from, &to, &step, MAX_POINTS, &n, &err);
        }
    }
    hf_outfile *of = NULL;
    if (s == HF_OK) {
        of = hf_outfile_open(outpath, &err);
        if (!of)
            s = err.status;
    }
    if (s == HF_OK) {
        FILE *out = hf_outfile_stream(of);
        if (kind == 0)
            s = hf_report_svg_plan(out, &m, &pose, NULL, ld, 1, &err);
        else if (kind == 1)
            s = plot_elevation(out, &m, &pose, line, &err);
        else
            s = plot_curve(out, &m, dir, from, step, n, &err);
        if (s == HF_OK)
            s = hf_outfile_commit(of, &err);
        else
            hf_outfile_abort(of);
    }
    hf_study_list_free(&sl);
    hf_model_free(&m);
    if (s != HF_OK)
        return hf_cli_fail(&err);
    return HF_EXIT_OK;
}
