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

static const char usage_head[] =
    "usage: holdfast sweep CASE --vary PATH=FROM:TO:STEP [--vary PATH=V1,V2,...]...\n"
    "                      [--zip] [--output NAME]... [--csv FILE|-] [--jobs N]\n"
    "                      [--shard K/N] [--allow-large] [--quiet]\n"
    "\n"
    "Solves the case at rest for every combination of the varied parameters and\n"
    "writes one CSV row per case: the varied values, a status, the outputs.  The\n"
    "outputs NAME@LOAD and offset_<load> are taken at the intact mean equilibrium\n"
    "under that load case, solved for every case.\n"
    "\n"
    "  --vary PATH=SPEC  a parameter path (site.water_level, lines[NAME].sections[K].length,\n"
    "                    lines[NAME].anchor_radius, components.NAME.diameter,\n"
    "                    loads[NAME].force, ...) and a range FROM:TO:STEP or a list.\n"
    "                    Plain numbers are SI (m, N, kg/m ...; degrees for angles);\n"
    "                    units are allowed: 70mm:90mm:2mm.  Each parameter once.\n"
    "  --zip             take the lists in step (equal lengths) instead of the full grid\n"
    "                    (default: full grid, the first parameter varying slowest)\n"
    "  --output NAME     an output below (repeatable; NAME:LINE for one line of a per-line\n"
    "                    output; default: fairlead_tension utilisation max_utilisation\n"
    "                    stiffness_surge)\n"
    "  --csv FILE|-      where the rows go (default -, standard output)\n"
    "  --jobs N          threads (default: every processor)\n"
    "  --shard K/N       only the K-th of N contiguous parts of the cases; only part 1\n"
    "                    writes the header, so the parts concatenate to the full sweep;\n"
    "                    with --csv FILE, FILE.shard records the sweep's fingerprint and\n"
    "                    the part's place for scripts/merge-shards.sh\n"
    "  --allow-large     write a sweep estimated above 10 GB of CSV (refused otherwise)\n"
    "  --quiet           no progress bar (it is shown only when stderr is a terminal)\n"
    "\n"
    "Outputs (name, CSV column with its unit, meaning):\n";

static const char usage_tail[] =
    "\n"
    "A case whose equilibrium under a load is not found has status no_equilibrium\n"
    "and empty outputs.  The last column, alert, is 'overloaded' when a line's\n"
    "utilisation T/MBL >= 1 in that case, at rest or at an equilibrium under a load\n"
    "of the outputs, else empty.  The worst chain over a tide range under a gale:\n"
    "  holdfast sweep CASE --vary site.water_level=0:3.4:0.1 --output max_tension@gale\n"
    "See docs/studies.md.  Exit status: 0 written (failed cases carry their status),\n"
    "1 written but a case has an overloaded line (stderr names the first), 2 bad\n"
    "input (also a sweep over the size limit), 3 numerical failure.\n";

/* The sweep's progress callback: the shared bar (cli.h), counted in cases. */
static void progress(void *ctx, uint64_t done, uint64_t total)
{
    hf_cli_bar_draw(ctx, (unsigned long long)done, (unsigned long long)total, "cases");
}

/* The command line of a sweep. */
typedef struct {
    const char *case_path, *csv, *shard;
    int jobs, zip, quiet, allow_large;
    size_t nvary, noutputs;
    const char **vary_text; /* argc entries */
    const char **outputs;   /* argc entries */
} options;

/* --help after the usage head: the output catalogue and the closing lines. */
static void help_more(FILE *out)
{
    hf_output_write_help(out, "  ");
    fputs(usage_tail, out);
}

/* Parses the options with the shared parser (cli.h); HF_CLI_CONTINUE, or the
 * exit status (help, usage error). */
static int parse_args(int argc, char **argv, options *o)
{
    hf_error err;
    int nvary = 0, noutputs = 0, zip = 0, large = 0, quiet = 0;
    const char *jobs = NULL;
    const hf_cli_opt opts[] = {
        {.name = "--vary",
         .missing = "--vary needs PATH=SPEC",
         .nonempty = 1,
         .count = &nvary,
         .list = o->vary_text,
         .list_cap = (size_t)argc},
        {.name = "--output",
         .missing = "--output needs a NAME",
         .nonempty = 1,
         .count = &noutputs,
         .list = o->outputs,
         .list_cap = (size_t)argc},
        HF_CLI_OPT_CSV(&o->csv),
        HF_CLI_OPT_VALUE("--shard", "--shard needs K/N", &o->shard),
        HF_CLI_OPT_VALUE("--jobs", "--jobs needs N", &jobs),
        HF_CLI_OPT_FLAG("--zip", &zip),
        HF_CLI_OPT_FLAG("--allow-large", &large),
        HF_CLI_OPT_FLAG("--quiet", &quiet),
        HF_CLI_OPT_FLAG("-q", &quiet),
    };
    int rc = hf_cli_parse_case_args_help(argc, argv, "sweep", usage_head, help_more, opts,
                                         sizeof opts / sizeof opts[0], &o->case_path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    o->nvary = (size_t)nvary;
    o->noutputs = (size_t)noutputs;
    o->zip = zip > 0;
    o->allow_large = large > 0;
    o->quiet = quiet > 0;
    if (jobs && hf_cli_parse_jobs(jobs, &o->jobs, &err) != HF_OK)
        return hf_cli_usage_error("sweep", "%s", err.text);
    if (o->nvary == 0)
        return hf_cli_usage_error("sweep", "no --vary PATH=SPEC given");
    return HF_CLI_CONTINUE;
}

/* The case file's bytes (malloc'd through hf_malloc, *n bytes) for the
 * sweep's fingerprint, or NULL when it cannot be read again. */
static char *case_bytes(const char *path, size_t *n)
{
    FILE *f = fopen(path, "rb");
    char *buf = NULL;
    *n = 0;
    if (!f)
        return NULL;
    if (fseek(f, 0, SEEK_END) == 0) {
        long len = ftell(f);
        if (len >= 0 && fseek(f, 0, SEEK_SET) == 0 && (buf = hf_malloc((size_t)len + 1)))
            *n = fread(buf, 1, (size_t)len, f);
    }
    fclose(f);
    return buf;
}

/* The sidecar of a shard written to FILE: FILE.shard (docs/studies.md),
 * telling which sweep the part belongs to and where it lies in it, so that
 * scripts/merge-shards.sh can refuse parts that do not fit together. */
static int write_sidecar(hf_sweep *s, const options *o, unsigned k, unsigned n,
                         const hf_sweep_range *r)
{
    hf_error err;
    char path[4096];
    size_t len;
    char *bytes = case_bytes(o->case_path, &len);
    uint64_t fp = hf_sweep_fingerprint(s, bytes, len);
    hf_free(bytes);
    snprintf(path, sizeof path, "%s.shard", o->csv);
    hf_outfile *of = hf_outfile_open(path, &err);
    if (!of)
        return hf_cli_fail(&err);
    fprintf(hf_outfile_stream(of),
            "# holdfast sweep part: scripts/merge-shards.sh checks these\n"
            "fingerprint=%016llx\npart=%u\nparts=%u\nfirst_case=%llu\ncases=%llu\n"
            "total_cases=%llu\n",
            (unsigned long long)fp, k, n, (unsigned long long)r->begin,
            (unsigned long long)(r->end - r->begin), (unsigned long long)hf_sweep_ncases(s));
    if (hf_outfile_commit(of, &err) != HF_OK)
        return hf_cli_fail(&err);
    return HF_EXIT_OK;
}

/* Writes the header (part 1 only) and the rows of r to the CSV file and
 * reports failed cases; returns the exit status. */
static int write_sweep(hf_sweep *s, const options *o, unsigned part, hf_sweep_range *r)
{
    hf_error err;
    hf_error_clear(&err);
    hf_cli_bar b;
    hf_cli_bar_start(&b);
    if (!o->quiet && isatty(STDERR_FILENO)) {
        r->progress = progress;
        r->progress_ctx = &b;
    }
    hf_outfile *of = hf_outfile_open(o->csv, &err);
    if (!of)
        return hf_cli_fail(&err);
    FILE *out = hf_outfile_stream(of);
    hf_status st = HF_OK;
    if (part == 1)
        st = hf_sweep_write_header(s, out, &err);
    if (st == HF_OK)
        st = hf_sweep_write_rows(s, r, out, &err);
    if (b.drawn)
        fputc('\n', stderr);
    if (st != HF_OK) {
        hf_outfile_abort(of);
        return hf_cli_fail(&err);
    }
    if (hf_outfile_commit(of, &err) != HF_OK)
        return hf_cli_fail(&err);
    if (!o->quiet)
        fputs(hf_cli_caution, stderr);
    uint64_t failed = hf_sweep_failed_count(s);
    if (failed && !o->quiet)
        fprintf(stderr,
                "holdfast sweep: %llu of %llu cases did not solve; their rows say why in the "
                "status column\n",
                (unsigned long long)failed, (unsigned long long)(r->end - r->begin));
    char over[1024];
    if (hf_sweep_overload_text(s, over, sizeof over)) {
        fprintf(stderr, "holdfast sweep: %s\n", over);
        return HF_EXIT_CRITERION;
    }
    return HF_EXIT_OK;
}

/* Loads the case, parses the varied parameters, prepares and writes the sweep. */
static int run_sweep(options *o, hf_model *m, hf_vary *vary)
{
    hf_error err;
    hf_error_clear(&err);
    unsigned sk = 1, sn = 1;
    if (o->shard && hf_study_shard_parse(o->shard, &sk, &sn, &err) != HF_OK)
        return hf_cli_usage_error("sweep", "%s", err.text);
    if (hf_cli_check_output("--csv", o->csv, o->case_path, &err) != HF_OK)
        return hf_cli_usage_error("sweep", "%s", err.text);
    if (hf_cli_load(o->case_path, m, &err) != HF_OK)
        return hf_cli_fail(&err);
    for (size_t j = 0; j < o->nvary; j++)
        if (hf_sweep_vary_parse(m, o->vary_text[j], 0, &vary[j], &err) != HF_OK)
            return hf_cli_fail(&err);
    if (o->jobs == 0)
        o->jobs = hf_study_default_jobs();
    hf_sweep *s = hf_sweep_alloc(m, vary, o->nvary, o->zip, o->outputs, o->noutputs, o->jobs, &err);
    if (!s)
        return hf_cli_fail(&err);
    hf_sweep_range r;
    memset(&r, 0, sizeof r);
    hf_study_shard_range(hf_sweep_ncases(s), sk, sn, &r.begin, &r.end);
    int rc, sidecar = o->shard && strcmp(o->csv, "-");
    char old[4096];
    snprintf(old, sizeof old, "%s.shard", o->csv);
    if (sidecar)
        remove(old); /* a stale sidecar must never describe the new part */
    if (hf_sweep_check_size(s, r.end - r.begin, o->allow_large, "--allow-large", &err) != HF_OK)
        rc = hf_cli_fail(&err);
    else
        rc = write_sweep(s, o, sk, &r);
    if (rc == HF_EXIT_OK && sidecar)
        rc = write_sidecar(s, o, sk, sn, &r);
    hf_sweep_free(s);
    return rc;
}

int hf_cmd_sweep(int argc, char **argv)
{
    options o;
    memset(&o, 0, sizeof o);
    o.csv = "-";
    o.vary_text = hf_calloc((size_t)argc, sizeof *o.vary_text);
    o.outputs = hf_calloc((size_t)argc, sizeof *o.outputs);
    hf_vary *vary = hf_calloc((size_t)argc, sizeof *vary);
    hf_model m;
    hf_model_init(&m);
    int rc;
    if (!o.vary_text || !o.outputs || !vary) {
        hf_error err;
        hf_error_set(&err, HF_ENOMEM, "out of memory");
        rc = hf_cli_fail(&err);
    } else {
        rc = parse_args(argc, argv, &o);
        if (rc == HF_CLI_CONTINUE)
            rc = run_sweep(&o, &m, vary);
    }
    if (vary)
        for (size_t j = 0; j < o.nvary; j++)
            hf_sweep_vary_clear(&vary[j]);
    hf_free(vary);
    hf_free(o.vary_text);
    hf_free(o.outputs);
    hf_model_free(&m);
    return rc;
}
