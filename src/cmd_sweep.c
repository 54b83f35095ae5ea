/* cmd_sweep.c - 'holdfast sweep': vary case parameters, stream CSV rows. */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>
#include "holdfast/alloc.h"
#include "holdfast/cli.h"
#include "holdfast/outfile.h"
#include "holdfast/study.h"
#include "holdfast/sweep.h"

static const char usage_text[] =
    "usage: holdfast sweep CASE --vary PATH=FROM:TO:STEP [--vary PATH=V1,V2,...]...\n"
    "                      [--zip] [--output NAME]... [--csv FILE|-] [--jobs N]\n"
    "                      [--shard K/N] [--quiet]\n"
    "\n"
    "Solves the case at rest for every combination of the varied parameters and\n"
    "writes one CSV row per case: the varied values, a status, the outputs.\n"
    "\n"
    "  --vary PATH=SPEC  a parameter path (site.water_level, lines[NAME].sections[K].length,\n"
    "                    lines[NAME].anchor_radius, components.NAME.diameter,\n"
    "                    loads[NAME].force, ...) and a range FROM:TO:STEP or a list.\n"
    "                    Plain numbers are SI (m, N, kg/m ...; degrees for angles);\n"
    "                    units are allowed: 70mm:90mm:2mm\n"
    "  --zip             take the lists in step (equal lengths) instead of the full grid\n"
    "                    (default: full grid, the first parameter varying slowest)\n"
    "  --output NAME     fairlead_tension[:LINE], fairlead_horizontal[:LINE],\n"
    "                    fairlead_vertical[:LINE], anchor_tension[:LINE], utilisation[:LINE],\n"
    "                    max_tension, max_utilisation, stiffness_surge, stiffness_sway,\n"
    "                    stiffness_heave, stiffness_yaw, vertical_load, offset_<load>\n"
    "                    (default: fairlead_tension utilisation max_utilisation stiffness_surge)\n"
    "  --csv FILE|-      where the rows go (default -, standard output)\n"
    "  --jobs N          threads (default: every processor)\n"
    "  --shard K/N       only the K-th of N contiguous parts of the cases; only part 1\n"
    "                    writes the header, so the parts concatenate to the full sweep\n"
    "  --quiet           no progress bar (it is shown only when stderr is a terminal)\n"
    "\n"
    "See docs/studies.md.  Exit status: 0 written (failed cases carry their status),\n"
    "2 bad input, 3 numerical failure.\n";

typedef struct {
    double start;      /* s */
    double last;       /* s, last drawn */
    int drawn;
} bar;

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

/* Progress bar on stderr, redrawn at most ten times a second. */
static void progress(void *ctx, uint64_t done, uint64_t total)
{
    bar *b = ctx;
    double t = now();
    if (done < total && t - b->last < 0.1)
        return;
    b->last = t;
    b->drawn = 1;
    double f = total ? (double)done / (double)total : 1.0;
    int w = 30, fill = (int)(f * w + 0.5);
    double rate = t > b->start ? (double)done / (t - b->start) : 0.0;
    double eta = rate > 0 ? (double)(total - done) / rate : 0.0;
    char cells[64];
    for (int i = 0; i < w; i++)
        cells[i] = i < fill ? '#' : '.';
    cells[w] = '\0';
    fprintf(stderr, "\r  [%s] %5.1f%%  %llu/%llu cases  %.0f/s  %.0f s left   ", cells,
            100.0 * f, (unsigned long long)done, (unsigned long long)total, rate, eta);
    fflush(stderr);
}

int hf_cmd_sweep(int argc, char **argv)
{
    const char *case_path = NULL, *csv = "-", *shard = NULL;
    int jobs = 0, zip = 0, quiet = 0;
    size_t nvary = 0, noutputs = 0;
    const char **vary_text = hf_calloc((size_t)argc, sizeof *vary_text);
    const char **outputs = hf_calloc((size_t)argc, sizeof *outputs);
    hf_vary *vary = hf_calloc((size_t)argc, sizeof *vary);
    hf_model m;
    hf_model_init(&m);
    hf_error err;
    hf_error_clear(&err);
    hf_sweep *s = NULL;
    hf_outfile *of = NULL;
    int rc = HF_EXIT_OK;
    if (!vary_text || !outputs || !vary) {
        hf_error_set(&err, HF_ENOMEM, "out of memory");
        rc = hf_cli_fail(&err);
        goto done;
    }
    for (int i = 1; i < argc; i++) {
        const char *a = argv[i], *v = NULL;
        if (hf_cli_help(a, usage_text)) {
            goto done;
        } else if (hf_cli_value(argc, argv, &i, "--vary", &vary_text[nvary])) {
            nvary++;
        } else if (hf_cli_value(argc, argv, &i, "--output", &outputs[noutputs])) {
            noutputs++;
        } else if (hf_cli_value(argc, argv, &i, "--csv", &csv) ||
                   hf_cli_value(argc, argv, &i, "--shard", &shard)) {
            continue;
        } else if (hf_cli_value(argc, argv, &i, "--jobs", &v)) {
            if (hf_cli_parse_jobs(v, &jobs, &err) != HF_OK) {
                rc = hf_cli_usage_error("sweep", "%s", err.text);
                goto done;
            }
        } else if (!strcmp(a, "--zip")) {
            zip = 1;
        } else if (!strcmp(a, "--quiet") || !strcmp(a, "-q")) {
            quiet = 1;
        } else if (a[0] == '-' && a[1]) {
            rc = hf_cli_usage_error("sweep", "unknown option or missing value: %s", a);
            goto done;
        } else if (!case_path) {
            case_path = a;
        } else {
            rc = hf_cli_usage_error("sweep", "one case file expected, got \"%s\" too", a);
            goto done;
        }
    }
    if (!case_path) {
        rc = hf_cli_usage_error("sweep", "no case file given");
        goto done;
    }
    if (nvary == 0) {
        rc = hf_cli_usage_error("sweep", "no --vary PATH=SPEC given");
        goto done;
    }
    unsigned sk = 1, sn = 1;
    if (shard && hf_study_shard_parse(shard, &sk, &sn, &err) != HF_OK) {
        rc = hf_cli_usage_error("sweep", "%s", err.text);
        goto done;
    }
    if (hf_cli_load(case_path, &m, &err) != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    for (size_t j = 0; j < nvary; j++)
        if (hf_sweep_vary_parse(&m, vary_text[j], 0, &vary[j], &err) != HF_OK) {
            rc = hf_cli_fail(&err);
            goto done;
        }
    if (jobs == 0)
        jobs = hf_study_default_jobs();
    s = hf_sweep_alloc(&m, vary, nvary, zip, outputs, noutputs, jobs, &err);
    if (!s) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    hf_sweep_range r;
    memset(&r, 0, sizeof r);
    hf_study_shard_range(hf_sweep_ncases(s), sk, sn, &r.begin, &r.end);
    bar b = {now(), 0.0, 0};
    if (!quiet && isatty(STDERR_FILENO)) {
        r.progress = progress;
        r.progress_ctx = &b;
    }
    of = hf_outfile_open(csv, &err);
    if (!of) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    FILE *out = hf_outfile_stream(of);
    hf_status st = HF_OK;
    if (sk == 1)
        st = hf_sweep_write_header(s, out, &err);
    if (st == HF_OK)
        st = hf_sweep_write_rows(s, &r, out, &err);
    if (b.drawn)
        fputc('\n', stderr);
    if (st != HF_OK) {
        hf_outfile_abort(of);
        of = NULL;
        rc = hf_cli_fail(&err);
        goto done;
    }
    st = hf_outfile_commit(of, &err);
    of = NULL;
    if (st != HF_OK) {
        rc = hf_cli_fail(&err);
        goto done;
    }
    if (!quiet)
        fputs(hf_cli_caution, stderr);
    uint64_t failed = hf_sweep_failed_count(s);
    if (failed && !quiet)
        fprintf(stderr,
                "holdfast sweep: %llu of %llu cases did not solve; their rows say why in the "
                "status column\n",
                (unsigned long long)failed, (unsigned long long)(r.end - r.begin));
done:
    hf_outfile_abort(of);
    hf_sweep_free(s);
    if (vary)
        for (size_t j = 0; j < nvary; j++)
            hf_sweep_vary_clear(&vary[j]);
    hf_free(vary);
    hf_free(vary_text);
    hf_free(outputs);
    hf_model_free(&m);
    return rc;
}
