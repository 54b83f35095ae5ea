/* cmd_run.c - 'holdfast run': every study of a case into a results folder. */
#include <stdio.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/cli.h"
#include "holdfast/outfile.h"
#include "holdfast/outputs.h"
#include "holdfast/report.h"
#include "holdfast/runfolder.h"
#include "holdfast/studyrun.h"
#include "holdfast/study.h"

static const char usage_text[] =
    "usage: holdfast run CASE [--out DIR] [--jobs N] [--quiet]\n"
    "\n"
    "Runs every study of the case's studies: list and writes DIR/<study>.csv for\n"
    "each, DIR/report.html and DIR/summary.txt.  DIR defaults to <case file name without\n"
    "extension>-results.  A results folder holds exactly one run: the run is\n"
    "built in a folder beside it (DIR.partial-XXXXXX) and swapped in with renames\n"
    "when complete, replacing an earlier run as a whole; an interrupted run\n"
    "leaves DIR as it was (and the partial folder).  A folder that is neither\n"
    "empty nor a holdfast results folder (marked by its .holdfast-results file)\n"
    "is refused.\n"
    "\n"
    "A case without a studies: section gets the default report: every line at\n"
    "rest (rest.csv), the stiffness (stiffness.csv), restoring curves along the\n"
    "hull's surge and sway axes (surge-curve.csv, sway-curve.csv) and the balance\n"
    "of every load case, intact and each line broken (balance.csv).\n"
    "\n"
    "  --out DIR   results folder (created when missing; replaced as a whole)\n"
    "  --jobs N    threads for sweep studies (default: every processor)\n"
    "  --quiet, -q print nothing but errors\n"
    "\n"
    "See docs/studies.md.  Exit status: 0 ok, 1 a criterion failed in a balance\n"
    "study, 2 bad input or an output that could not be written, 3 numerical\n"
    "failure (other studies still run), 4 out of memory.\n";

/* ---- the run ---- */

/* Default folder: the case file's base name without extension + "-results". */
static void default_dir(const char *case_path, char *buf, size_t cap)
{
    const char *base = strrchr(case_path, '/');
    base = base ? base + 1 : case_path;
    const char *dot = strrchr(base, '.');
    int n = dot && dot != base ? (int)(dot - base) : (int)strlen(base);
    snprintf(buf, cap, "%.*s-results", n, base);
}

/* Opens dir/name for writing (outfile.h: committed when complete); path
 * (cap bytes) receives the file's path. */
static hf_outfile *open_in(const char *dir, const char *name, char *path, size_t cap, hf_error *err)
{
    snprintf(path, cap, "%s/%s", dir, name);
    return hf_outfile_open(path, err);
}

/* How bad a study's failure is for the exit status: out of memory > bad
 * input > numerical failure. */
static int severity(hf_status st)
{
    if (st == HF_OK)
        return 0;
    if (st == HF_ENOMEM)
        return 4;
    return hf_status_exit_code(st) == HF_EXIT_USAGE ? 3 : 2;
}

/* The rest of --help, from the library's tables: the study kinds (the
 * study list) and the outputs of sweep studies and invert targets (the
 * output catalogue). */
static void more_help(FILE *out)
{
    fprintf(out, "\nstudy kinds:");
    for (int k = 0; k <= HF_STUDY_DESIGN; k++)
        fprintf(out, " %s", hf_study_kind_name((hf_study_kind)k));
    fprintf(out, "\n\noutputs of sweep studies (outputs:) and invert targets (target:):\n");
    hf_output_write_help(out, "  ");
}

/* The options of one run. */
typedef struct {
    const char *case_path, *dir;
    int jobs, quiet;
    int defaults; /* 1: the case has no studies: the default studies run */
} run_args;

static int parse_args(int argc, char **argv, run_args *a)
{
    const char *jobs = NULL;
    int quiet = 0;
    const hf_cli_opt opts[] = {
        HF_CLI_OPT_VALUE("--out", "--out needs a DIR (the results folder)", &a->dir),
        HF_CLI_OPT_VALUE("--jobs", "--jobs needs a number of threads", &jobs),
        HF_CLI_OPT_FLAG("--quiet", &quiet), HF_CLI_OPT_FLAG("-q", &quiet)};
    a->dir = NULL;
    a->jobs = 0;
    int rc = hf_cli_parse_case_args_help(argc, argv, "run", usage_text, more_help, opts, 4,
                                         &a->case_path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_error e;
    hf_error_clear(&e);
    if (jobs && hf_cli_parse_jobs(jobs, &a->jobs, &e) != HF_OK)
        return hf_cli_usage_error("run", "%s", e.text);
    if (a->jobs == 0)
        a->jobs = hf_study_default_jobs();
    a->quiet = quiet > 0;
    return HF_CLI_CONTINUE;
}

/* Runs study k of m into dir (its CSV and its report section); fills oc. */
static void run_study(const hf_model *m, const hf_study *s, const char *dir, const run_args *a,
                      hf_report *rep, hf_studyrun_outcome *oc)
{
    char path[HF_RUNFOLDER_PATH_MAX + 2 * HF_MODEL_MAX_NAME + 64];
    snprintf(path, sizeof path, "%s/%s.csv", dir, s->name);
    hf_error e;
    hf_error_clear(&e);
    hf_outfile *of = hf_outfile_open(path, &e);
    hf_status st = of ? HF_OK : e.status;
    if (of) {
        st = hf_studyrun_exec(m, s, a->jobs, hf_outfile_stream(of), rep, oc, &e);
        hf_cli_warn_nonfinite("run", oc->nonfinite);
        if (st == HF_OK)
            st = hf_outfile_commit(of, &e);
        else
            hf_outfile_abort(of);
        hf_studyrun_finish(rep, m, s, oc, st == HF_OK);
    }
    oc->status = st;
    if (st != HF_OK) {
        snprintf(oc->note, sizeof oc->note, "FAILED (%s): %s", hf_status_str(st), e.text);
        fprintf(stderr, "holdfast run: study %s: %s\n", s->name, e.text);
        char head[HF_MODEL_MAX_NAME + 64];
        snprintf(head, sizeof head, "Study %s (%s): failed", s->name, hf_study_kind_name(s->kind));
        hf_report_section(rep, head, NULL);
        hf_report_note(rep, "warning", oc->note);
    } else if (!a->quiet) {
        printf("%-24s %-9s %s\n", s->name, hf_study_kind_name(s->kind), oc->note);
    }
}

/* summary.txt: one line per study; written last, so it describes the folder. */
static hf_status write_summary(const hf_model *m, const hf_study_list *sl, const char *dir,
                               const run_args *a, const hf_studyrun_outcome *oc, hf_error *err)
{
    char path[HF_RUNFOLDER_PATH_MAX + 64];
    hf_outfile *of = open_in(dir, "summary.txt", path, sizeof path, err);
    if (!of)
        return err->status;
    FILE *out = hf_outfile_stream(of);
    fprintf(out, "holdfast %s run of %s\n", HF_VERSION, a->case_path);
    if (m->title)
        fprintf(out, "case: %s\n", m->title);
    fprintf(out, "\n");
    for (size_t k = 0; k < sl->n; k++)
        fprintf(out, "%-24s %-9s %-8s %s\n", sl->v[k].name, hf_study_kind_name(sl->v[k].kind),
                oc[k].status != HF_OK    ? "failed"
                : oc[k].criterion_failed ? "criterion"
                                         : "ok",
                oc[k].note);
    fprintf(out, "\n%s", hf_caution_text);
    return hf_outfile_commit(of, err);
}

/* The report's note on the default studies (a case without studies:). */
static void default_note(hf_report *rep, const hf_model *m)
{
    char text[640], r[32];
    hf_report_number(r, sizeof r, hf_studyrun_default_range(m), 4);
    snprintf(text, sizeof text,
             "The case has no studies: section, so this is the default report: every line at "
             "rest, the 6x6 stiffness, restoring curves along the hull's surge and sway axes "
             "from -%s to %s m%s. Add a studies: section to choose your own "
             "(docs/case-format.md).",
             r, r,
             m->nloads ? ", and the mean position under every load case, intact and with each "
                         "line broken, checked against the criteria"
                       : "; the case has no load cases, so no criteria checks are made");
    hf_report_note(rep, "note", text);
}

/* Every study, the report and the summary into dir.  Returns the exit
 * status the studies call for; *st is the status of the report and summary
 * files (their message in err). */
static int run_all(const hf_model *m, const hf_study_list *sl, const char *dir, const run_args *a,
                   hf_studyrun_outcome *oc, hf_status *st, hf_error *err)
{
    char path[HF_RUNFOLDER_PATH_MAX + 64];
    /* The report is written alongside the studies and committed last. */
    hf_outfile *rf = open_in(dir, "report.html", path, sizeof path, err);
    if (!rf) {
        *st = err->status;
        return 0;
    }
    char command[HF_RUNFOLDER_PATH_MAX + 64];
    snprintf(command, sizeof command, "holdfast run %s", a->case_path);
    hf_report rep;
    hf_report_begin(&rep, hf_outfile_stream(rf), m, command);
    if (a->defaults)
        default_note(&rep, m);
    hf_studyrun_rest(&rep, m);
    int worst = 0, crit = 0;
    for (size_t k = 0; k < sl->n; k++) {
        run_study(m, &sl->v[k], dir, a, &rep, &oc[k]);
        if (severity(oc[k].status) > worst)
            worst = severity(oc[k].status);
        crit |= oc[k].criterion_failed;
    }
    *st = hf_report_end(&rep, err);
    if (*st == HF_OK)
        *st = hf_outfile_commit(rf, err);
    else
        hf_outfile_abort(rf);
    if (*st == HF_OK)
        *st = write_summary(m, sl, dir, a, oc, err);
    static const int exit_of[] = {HF_EXIT_OK, HF_EXIT_OK, HF_EXIT_NUMERIC, HF_EXIT_USAGE,
                                  HF_EXIT_NOMEM};
    return worst ? exit_of[worst] : crit ? HF_EXIT_CRITERION : HF_EXIT_OK;
}

int hf_cmd_run(int argc, char **argv)
{
    run_args a;
    int rc = parse_args(argc, argv, &a);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_model m;
    hf_study_list sl;
    rc = hf_cli_case_load_studies(a.case_path, &m, &sl);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_error err;
    hf_error_clear(&err);
    char dbuf[HF_RUNFOLDER_PATH_MAX + 16];
    hf_studyrun_outcome *oc = NULL;
    hf_runfolder rf;
    hf_status st = HF_OK;
    a.defaults = sl.n == 0;
    if (a.defaults)
        st = hf_studyrun_defaults(&m, &sl, &err);
    if (st == HF_OK) {
        if (!a.dir) {
            default_dir(a.case_path, dbuf, sizeof dbuf);
            a.dir = dbuf;
        }
        if (!(oc = hf_calloc(sl.n, sizeof *oc)))
            st = hf_error_set(&err, HF_ENOMEM, "out of memory");
        else if ((st = hf_runfolder_begin(&rf, a.dir, &err)) == HF_OK) {
            rc = run_all(&m, &sl, hf_runfolder_path(&rf), &a, oc, &st, &err);
            if (st == HF_OK)
                st = hf_runfolder_commit(&rf, &err);
            else
                hf_runfolder_abort(&rf);
        }
    }
    if (st != HF_OK)
        rc = hf_cli_fail(&err);
    else if (!a.quiet)
        printf("results in %s/\n%s", rf.dir, hf_caution_text);
    hf_free(oc);
    hf_study_list_free(&sl);
    hf_model_free(&m);
    return rc;
}
