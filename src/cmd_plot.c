/* cmd_plot.c - 'holdfast plot': one SVG figure of a case (plan, line elevation, restoring curve).
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/analysis.h"
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

static hf_status plot_elevation(FILE *out, const hf_model *m, const double offset[3],
                                const char *line_name, hf_error *err)
{
    hf_analysis_pose at;
    hf_analysis_pose_init(&at);
    hf_status s = hf_analysis_pose_solve(&at, m, offset, 0, err);
    if (s == HF_OK) {
        size_t i = 0;
        if (line_name) {
            i = hf_model_line_find(m, line_name);
            const char *near = i == (size_t)-1 ? hf_cli_suggest_model(m, 0, line_name) : NULL;
            if (i == (size_t)-1)
                s = hf_error_set(err, HF_EINVAL, "--line: the case has no line named '%s'%s%s%s",
                                 line_name, near ? "; did you mean '" : "", near ? near : "",
                                 near ? "'?" : "");
        } else {
            for (size_t j = 1; j < at.res.nlines; j++)
                if (at.res.states[j].tension > at.res.states[i].tension)
                    i = j;
            fprintf(stderr, "holdfast plot: line '%s' (the largest fairlead tension)\n",
                    m->lines[i].name);
        }
        if (s == HF_OK)
            s = hf_report_svg_elevation(out, m, i, &at.res.states[i], 1, err);
    }
    hf_analysis_pose_clear(&at);
    return s;
}

/* Restoring curve along direction `dir` (rad) over n offsets from `from` by `step`. */
static hf_status plot_curve(FILE *out, const hf_model *m, double dir, const double range[3],
                            size_t n, hf_error *err)
{
    hf_analysis_curve *c = hf_analysis_curve_alloc(m, n, err);
    if (!c)
        return err->status;
    hf_status s = hf_analysis_curve_compute(c, m, dir, range[0], range[1], range[2], err);
    if (s == HF_OK && c->nfailed == n)
        s = hf_error_set(err, HF_ENOCONV,
                         "curve figure: the spread could not be solved at any offset; the first "
                         "failure: %s",
                         c->first_error.text);
    if (s == HF_OK) {
        if (c->nfailed)
            fprintf(stderr,
                    "holdfast plot: %zu of %zu offsets could not be solved (gaps in the curve)\n",
                    c->nfailed, n);
        char title[256], dl[160];
        snprintf(title, sizeof title, "%.200s: restoring curve", m->title ? m->title : "Case");
        snprintf(dl, sizeof dl,
                 "Hull moved from rest toward %.4g deg from global x, heading fixed. Restoring "
                 "force is minus the mooring force along that direction.",
                 dir * 180.0 / M_PI);
        s = hf_report_svg_curve(out, m, c, title, dl, 1, 1, err);
    }
    hf_analysis_curve_free(c);
    return s;
}

/* The options of one plot command. */
typedef struct {
    const char *path, *figure, *out, *offset, *line, *load, *direction, *range;
    int kind; /* 0 plan, 1 elevation, 2 curve */
} plot_args;

/* Parses and checks the arguments: HF_CLI_CONTINUE or the exit status. */
static int parse_args(int argc, char **argv, const char *cmd, plot_args *a)
{
    memset(a, 0, sizeof *a);
    a->out = "-";
    const hf_cli_opt opts[] = {
        HF_CLI_OPT_VALUE("--figure", "--figure needs plan, elevation or curve", &a->figure),
        HF_CLI_OPT_VALUE("--out", "--out needs a FILE (or - for standard output)", &a->out),
        HF_CLI_OPT_OFFSET(&a->offset),
        HF_CLI_OPT_VALUE("--line", "--line needs the NAME of a line", &a->line),
        HF_CLI_OPT_VALUE("--load", "--load needs the NAME of a load case", &a->load),
        HF_CLI_OPT_VALUE("--direction", "--direction needs an angle in degrees", &a->direction),
        HF_CLI_OPT_VALUE("--range", "--range needs FROM:TO:STEP (metres)", &a->range)};
    int rc = hf_cli_parse_case_args(argc, argv, cmd, usage_text, opts, 7, &a->path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    if (!a->figure)
        return hf_cli_usage_error(cmd, "--figure plan|elevation|curve is required");
    a->kind = !strcmp(a->figure, "plan")        ? 0
              : !strcmp(a->figure, "elevation") ? 1
              : !strcmp(a->figure, "curve")     ? 2
                                                : -1;
    if (a->kind < 0)
        return hf_cli_usage_error(cmd, "--figure: expected plan, elevation or curve, got '%s'",
                                  a->figure);
    if ((a->line && a->kind != 1) || (a->load && a->kind != 0) ||
        ((a->direction || a->range) && a->kind != 2) || (a->offset && a->kind == 2))
        return hf_cli_usage_error(cmd, "an option does not apply to --figure %s", a->figure);
    hf_error err;
    hf_error_clear(&err);
    if (hf_cli_check_output("--out", a->out, a->path, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);
    return HF_CLI_CONTINUE;
}

/* The curve's direction and range: the options, else the case's first
 * curve study, else 0 deg and -20:20:0.5. */
static hf_status curve_setup(const hf_study_list *sl, const plot_args *a, double *dir, double *from,
                             double *to, double *step, size_t *n, hf_error *err)
{
    *to = 20;
    *dir = 0;
    *from = -20;
    *step = 0.5;
    for (size_t k = 0; k < sl->n; k++)
        if (sl->v[k].kind == HF_STUDY_CURVE) {
            *dir = sl->v[k].direction;
            *from = sl->v[k].from;
            *to = sl->v[k].to;
            *step = sl->v[k].step;
            break;
        }
    if (a->direction &&
        hf_cli_parse_value("--direction", a->direction, HF_DIM_ANGLE, dir, err) != HF_OK)
        return err->status;
    if (a->range)
        return hf_cli_parse_range(a->range, from, to, step, MAX_POINTS, n, err);
    char text[128];
    snprintf(text, sizeof text, "%.17g:%.17g:%.17g", *from, *to, *step);
    return hf_cli_parse_range(text, from, to, step, MAX_POINTS, n, err);
}

/* Draws the figure of a into out. */
static hf_status draw(FILE *out, const hf_model *m, const hf_study_list *sl, const plot_args *a,
                      hf_error *err)
{
    double offs[3] = {0, 0, 0};
    if (a->offset && hf_cli_parse_offset(a->offset, offs, err) != HF_OK)
        return err->status;
    if (a->kind == 0) {
        const hf_load *ld = NULL;
        if (a->load) {
            size_t k = hf_model_load_find(m, a->load);
            const char *near = k == (size_t)-1 ? hf_cli_suggest_model(m, 1, a->load) : NULL;
            if (k == (size_t)-1)
                return hf_error_set(
                    err, HF_EINVAL, "--load: the case has no load case named '%s'%s%s%s", a->load,
                    near ? "; did you mean '" : "", near ? near : "", near ? "'?" : "");
            ld = &m->loads[k];
        }
        hf_pose pose;
        hf_spread_pose_rest(m, &pose);
        hf_spread_pose_offset(&pose, offs);
        return hf_report_svg_plan(out, m, &pose, NULL, ld, 1, err);
    }
    if (a->kind == 1)
        return plot_elevation(out, m, offs, a->line, err);
    double dir, r[3]; /* from, to, step */
    size_t n = 0;
    hf_status s = curve_setup(sl, a, &dir, &r[0], &r[1], &r[2], &n, err);
    return s == HF_OK ? plot_curve(out, m, dir, r, n, err) : s;
}

int hf_cmd_plot(int argc, char **argv)
{
    plot_args a;
    int rc = parse_args(argc, argv, "plot", &a);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_error err;
    hf_error_clear(&err);
    double offs[3];
    if (a.offset && hf_cli_parse_offset(a.offset, offs, &err) != HF_OK)
        return hf_cli_fail(&err);
    hf_model m;
    hf_study_list sl;
    rc = hf_cli_case_load_studies(a.path, &m, &sl);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_outfile *of = hf_outfile_open(a.out, &err);
    hf_status s = of ? HF_OK : err.status;
    if (of) {
        s = draw(hf_outfile_stream(of), &m, &sl, &a, &err);
        if (s == HF_OK)
            s = hf_outfile_commit(of, &err);
        else
            hf_outfile_abort(of);
    }
    hf_study_list_free(&sl);
    hf_study_list_free(&sl);
    hf_model_free(&m);
    return s == HF_OK ? HF_EXIT_OK : hf_cli_fail(&err);
}
