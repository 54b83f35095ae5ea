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
            return hf_error_set(err, HF_EINVAL,
                                "--offset: expected X,Y,HEADING_DEG (three finite numbers), got \"%s\"",
                                text);
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
                                "expected a range FROM:TO:STEP of finite numbers, got \"%s\"", text);
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
