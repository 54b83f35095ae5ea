/* cli.c - helpers shared by the command files: errors, options, loading. */
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/case.h"
#include "holdfast/cli.h"

const char hf_cli_caution[] =
    "CAUTION: quasi-static results. Line dynamics, snap loads, wear and corrosion are not\n"
    "included. Check against the governing classification rules or local codes; results\n"
    "must be approved by a competent, licensed engineer before anyone relies on them.\n";

int hf_cli_fail(const hf_error *e)
{
    fprintf(stderr, "holdfast: %s\n", e->text[0] ? e->text : hf_status_str(e->status));
    return hf_status_exit_code(e->status);
}

int hf_cli_usage_error(const char *cmd, const char *fmt, ...)
{
    va_list ap;
    fprintf(stderr, "holdfast %s: ", cmd);
    va_start(ap, fmt);
    vfprintf(stderr, fmt, ap);
    va_end(ap);
    fprintf(stderr, "\n'holdfast %s --help' shows the usage\n", cmd);
    return HF_EXIT_USAGE;
}

int hf_cli_option(int argc, char **argv, int *i, const char *name, const char **value, int *missing)
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

int hf_cli_value(int argc, char **argv, int *i, const char *name, const char **value)
{
    int at = *i, missing = 0;
    const char *v = NULL;
    if (!hf_cli_option(argc, argv, &at, name, &v, &missing) || missing)
        return 0;
    *i = at;
    *value = v;
    return 1;
}

int hf_cli_help(const char *arg, const char *usage)
{
    if (strcmp(arg, "--help") != 0 && strcmp(arg, "-h") != 0)
        return 0;
    fputs(usage, stdout);
    return 1;
}

int hf_cli_parse_case_args(int argc, char **argv, const char *cmd, const char *usage,
                           const hf_cli_opt *opts, size_t nopts, const char **case_path)
{
    const char *path = NULL;
    for (int i = 1; i < argc; i++) {
        if (hf_cli_help(argv[i], usage))
            return HF_EXIT_OK;
        size_t k = 0;
        for (; k < nopts; k++) {
            const char *v = NULL;
            int missing = 0;
            if (!hf_cli_option(argc, argv, &i, opts[k].name, &v, &missing))
                continue;
            if (missing || (opts[k].nonempty && !v[0]))
                return hf_cli_usage_error(cmd, "%s", opts[k].missing);
            if (opts[k].value)
                *opts[k].value = v;
            if (opts[k].count)
                ++*opts[k].count;
            break;
        }
        if (k < nopts)
            continue;
        if (argv[i][0] == '-' && argv[i][1] != '\0')
            return hf_cli_usage_error(cmd, "unknown option '%s'", argv[i]);
        if (path)
            return hf_cli_usage_error(cmd, "unexpected argument '%s' (one CASE file only)",
                                      argv[i]);
        path = argv[i];
    }
    if (!path)
        return hf_cli_usage_error(cmd, "missing the CASE file");
    *case_path = path;
    return HF_CLI_CONTINUE;
}

int hf_cli_case_load(const char *path, hf_model *m)
{
    hf_error err;
    hf_error_clear(&err);
    hf_model_init(m);
    if (hf_cli_load(path, m, &err) != HF_OK)
        return hf_cli_fail(&err);
    return HF_CLI_CONTINUE;
}

int hf_cli_pose_cmd_begin(hf_cli_pose_cmd *pc, int argc, char **argv, const char *cmd,
                          const char *usage, const hf_cli_opt *extra, size_t nextra)
{
    pc->path = pc->csv = pc->offset_text = NULL;
    pc->ws = NULL;
    hf_model_init(&pc->m); /* so that hf_cli_pose_cmd_end is always safe */
    hf_error_clear(&pc->err);
    hf_cli_opt opts[2 + HF_CLI_POSE_EXTRA_MAX] = {HF_CLI_OPT_CSV(&pc->csv),
                                                  HF_CLI_OPT_OFFSET(&pc->offset_text)};
    size_t n = 2;
    if (nextra > HF_CLI_POSE_EXTRA_MAX) {
        fprintf(stderr, "holdfast %s: internal error: %zu extra options, at most %d\n", cmd, nextra,
                HF_CLI_POSE_EXTRA_MAX);
        return HF_EXIT_USAGE;
    }
    for (size_t k = 0; k < nextra; k++)
        opts[n++] = extra[k];
    int rc = hf_cli_parse_case_args(argc, argv, cmd, usage, opts, n, &pc->path);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    hf_error err;
    hf_error_clear(&err);
    double offset[3] = {0.0, 0.0, 0.0};
    if (pc->offset_text && hf_cli_parse_offset(pc->offset_text, offset, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);
    rc = hf_cli_case_load(pc->path, &pc->m);
    if (rc != HF_CLI_CONTINUE)
        return rc;
    pc->ws = hf_spread_alloc(&pc->m, &err);
    if (!pc->ws) {
        hf_model_free(&pc->m);
        return hf_cli_fail(&err);
    }
    hf_spread_pose_rest(&pc->m, &pc->pose);
    hf_spread_pose_offset(&pc->pose, offset);
    return HF_CLI_CONTINUE;
}

void hf_cli_pose_cmd_end(hf_cli_pose_cmd *pc)
{
    hf_spread_free(pc->ws);
    pc->ws = NULL;
    hf_model_free(&pc->m);
}

hf_outfile *hf_cli_csv_begin(const char *csv, hf_cli_csv_header_fn header, const hf_model *m,
                             hf_error *err)
{
    hf_outfile *f = hf_outfile_open(csv, err);
    if (f && header && header(hf_outfile_stream(f), m, err) != HF_OK) {
        hf_outfile_abort(f);
        return NULL;
    }
    return f;
}

hf_status hf_cli_csv_end(const char *cmd, hf_outfile **f, size_t nonfinite, hf_error *err)
{
    hf_outfile *g = *f;
    *f = NULL;
    hf_cli_warn_nonfinite(cmd, nonfinite);
    return hf_outfile_commit(g, err);
}

hf_status hf_cli_parse_jobs(const char *text, int *jobs, hf_error *err)
{
    char *end;
    long j = strtol(text, &end, 10);
    if (*end || end == text || j < 1 || j > 1024)
        return hf_error_set(err, HF_EINVAL, "--jobs: expected a whole number 1..1024, got \"%s\"",
                            text);
    *jobs = (int)j;
    return HF_OK;
}

double hf_cli_zero_small(double v, double half)
{
    return fabs(v) < half ? 0.0 : v;
}

void hf_cli_warn_nonfinite(const char *cmd, size_t n)
{
    if (n > 0)
        fprintf(stderr,
                "holdfast %s: warning: %zu value%s not finite and left as empty CSV "
                "field%s (a bug: please report it)\n",
                cmd, n, n == 1 ? " was" : "s were", n == 1 ? "" : "s");
}

hf_status hf_cli_load(const char *path, hf_model *m, hf_error *err)
{
    return hf_case_load(path, m, err);
}

/* Parses one finite number and advances *p past it. */
static int number(const char **p, double *out)
{
    char *end;
    errno = 0;
    double v = strtod(*p, &end);
    if (end == *p || errno == ERANGE || !isfinite(v))
        return 0;
    *out = v;
    *p = end;
    return 1;
}

hf_status hf_cli_parse_offset(const char *text, double offset[3], hf_error *err)
{
    const char *p = text;
    double v[3];
    for (int i = 0; i < 3; i++) {
        if (!number(&p, &v[i]) || *p != (i < 2 ? ',' : '\0'))
            return hf_error_set(
                err, HF_EINVAL,
                "--offset: expected X,Y,HEADING_DEG (three finite numbers), got \"%s\"", text);
        if (i < 2)
            p++;
    }
    offset[0] = v[0];
    offset[1] = v[1];
    offset[2] = v[2] * M_PI / 180.0;
    return HF_OK;
}

hf_status hf_cli_parse_range(const char *text, double *from, double *to, double *step,
                             size_t max_points, size_t *count, hf_error *err)
{
    const char *p = text;
    double v[3];
    for (int i = 0; i < 3; i++) {
        if (!number(&p, &v[i]) || *p != (i < 2 ? ':' : '\0'))
            return hf_error_set(err, HF_EINVAL,
                                "expected a range FROM:TO:STEP of finite numbers, got \"%s\"",
                                text);
        if (i < 2)
            p++;
    }
    double span = v[1] - v[0];
    if (v[2] == 0.0 || (span != 0.0 && (span > 0) != (v[2] > 0)))
        return hf_error_set(err, HF_EINVAL,
                            "range \"%s\": STEP must be non-zero and point from FROM to TO", text);
    double n = floor(span / v[2] + 1e-9) + 1.0;
    if (!(n >= 1.0) || n > (double)max_points)
        return hf_error_set(err, HF_ELIMIT, "range \"%s\" has %.0f points; the limit is %zu", text,
                            n, max_points);
    *from = v[0];
    *to = v[1];
    *step = v[2];
    *count = (size_t)n;
    return HF_OK;
}
