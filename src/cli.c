/* cli.c - helpers shared by the command files: errors, options, loading. */
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include "holdfast/hint.h"
#include "holdfast/alloc.h"
#include "holdfast/case.h"
#include "holdfast/cli.h"
#include "holdfast/outputs.h"
#include "holdfast/units.h"

int hf_cli_exit_code(hf_status s)
{
    return s == HF_ENOMEM ? HF_EXIT_NOMEM : hf_status_exit_code(s);
}

int hf_cli_fail(const hf_error *e)
{
    fprintf(stderr, "holdfast: %s\n", e->text[0] ? e->text : hf_status_str(e->status));
    if (e->status == HF_ENOMEM)
        fprintf(stderr,
                "holdfast: out of memory: try fewer lines, offsets or cases, or a "
                "machine with more memory (exit status %d)\n",
                HF_EXIT_NOMEM);
    return hf_cli_exit_code(e->status);
}

int hf_cli_fail_status(hf_status s, const char *text)
{
    hf_error e;
    hf_error_set(&e, s, "%s", text);
    return hf_cli_fail(&e);
}

const char *hf_cli_suggest(const char *word, const char *const *names, size_t n)
{
    const char *best = NULL;
    size_t bd = 99, limit = strlen(word) / 3 + 1;
    if (limit > 3)
        limit = 3;
    for (size_t i = 0; i < n; i++) {
        if (!names[i])
            continue;
        size_t d = hf_hint_distance(word, names[i]);
        if (d < bd) {
            bd = d;
            best = names[i];
        }
    }
    return bd <= limit ? best : NULL;
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

/* Applies option o to argv[*i] when it is that option: returns 0 (not this
 * option), 1 (taken) or the usage exit status. */
static int take_option(int argc, char **argv, int *i, const char *cmd, const hf_cli_opt *o)
{
    if (o->flag) {
        if (strcmp(argv[*i], o->name) != 0)
            return 0;
        if (o->count)
            ++*o->count;
        return 1;
    }
    const char *v = NULL;
    int missing = 0;
    if (!hf_cli_option(argc, argv, i, o->name, &v, &missing))
        return 0;
    if (missing || (o->nonempty && !v[0]))
        return hf_cli_usage_error(cmd, "%s", o->missing);
    if (o->list && o->count) {
        if ((size_t)*o->count >= o->list_cap)
            return hf_cli_usage_error(cmd, "%s: at most %zu values", o->name, o->list_cap);
        o->list[*o->count] = v;
    }
    if (o->value)
        *o->value = v;
    if (o->count)
        ++*o->count;
    return 1;
}

int hf_cli_parse_case_args(int argc, char **argv, const char *cmd, const char *usage,
                           const hf_cli_opt *opts, size_t nopts, const char **case_path)
{
    return hf_cli_parse_case_args_help(argc, argv, cmd, usage, NULL, opts, nopts, case_path);
}

int hf_cli_parse_case_args_help(int argc, char **argv, const char *cmd, const char *usage,
                                void (*more)(FILE *out), const hf_cli_opt *opts, size_t nopts,
                                const char **case_path)
{
    const char *path = NULL;
    for (int i = 1; i < argc; i++) {
        if (hf_cli_help(argv[i], usage)) {
            if (more)
                more(stdout);
            return HF_EXIT_OK;
        }
        int taken = 0;
        for (size_t k = 0; k < nopts && !taken; k++)
            taken = take_option(argc, argv, &i, cmd, &opts[k]);
        if (taken == HF_EXIT_USAGE)
            return HF_EXIT_USAGE;
        if (taken)
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

int hf_cli_case_load_studies(const char *path, hf_model *m, hf_study_list *sl)
{
    hf_error err;
    hf_error_clear(&err);
    hf_model_init(m);
    hf_study_list_init(sl);
    if (hf_case_load_with_studies(path, m, sl, &err) != HF_OK)
        return hf_cli_fail(&err);
    return HF_CLI_CONTINUE;
}

int hf_cli_pose_cmd_begin(hf_cli_pose_cmd *pc, int argc, char **argv, const char *cmd,
                          const char *usage, const hf_cli_opt *extra, size_t nextra)
{
    pc->path = pc->csv = pc->offset_text = NULL;
    pc->offset[0] = pc->offset[1] = pc->offset[2] = 0.0;
    hf_analysis_pose_init(&pc->at);
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
    if (pc->offset_text && hf_cli_parse_offset(pc->offset_text, pc->offset, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);
    if (pc->csv && hf_cli_check_output("--csv", pc->csv, pc->path, &err) != HF_OK)
        return hf_cli_usage_error(cmd, "%s", err.text);
    return hf_cli_case_load(pc->path, &pc->m);
}

void hf_cli_pose_cmd_end(hf_cli_pose_cmd *pc)
{
    hf_analysis_pose_clear(&pc->at);
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

const char *hf_cli_suggest_model(const hf_model *m, int loads, const char *word)
{
    size_t n = loads ? m->nloads : m->nlines;
    const char **names = hf_calloc(n ? n : 1, sizeof *names);
    if (!names)
        return NULL;
    for (size_t i = 0; i < n; i++)
        names[i] = loads ? m->loads[i].name : m->lines[i].name;
    const char *best = hf_cli_suggest(word, names, n);
    hf_free(names);
    return best;
}

hf_status hf_cli_parse_value(const char *option, const char *text, hf_dim dim, double *out,
                             hf_error *err)
{
    hf_error e;
    hf_error_clear(&e);
    if (hf_units_parse(text, dim, out, &e) != HF_OK)
        return hf_error_set(err, HF_EINVAL, "%s: %s", option, e.text);
    return HF_OK;
}

/* Splits text at `sep` into exactly n parts (copied into buf, cap bytes) and
 * parses part j as a quantity of dimension dims[j] into v[j].  HF_EINVAL
 * with the message "<option>: expected <what>, got ..." otherwise. */
static hf_status parse_parts(const char *option, const char *what, const char *text, char sep,
                             const hf_dim *dims, size_t n, double *v, hf_error *err)
{
    char buf[512];
    if (strlen(text) >= sizeof buf)
        return hf_error_set(err, HF_EINVAL, "%s%sexpected %s, got a value of %zu bytes",
                            option ? option : "", option ? ": " : "", what, strlen(text));
    memcpy(buf, text, strlen(text) + 1);
    char *p = buf;
    for (size_t j = 0; j < n; j++) {
        char *end = j + 1 < n ? strchr(p, sep) : p + strlen(p);
        if (!end || (j + 1 == n && strchr(p, sep)))
            return hf_error_set(err, HF_EINVAL, "%s%sexpected %s, got \"%s\"", option ? option : "",
                                option ? ": " : "", what, text);
        *end = '\0';
        hf_error e;
        hf_error_clear(&e);
        if (hf_units_parse(p, dims[j], &v[j], &e) != HF_OK)
            return hf_error_set(err, HF_EINVAL, "%s%sexpected %s, got \"%s\": %s",
                                option ? option : "", option ? ": " : "", what, text, e.text);
        p = end + 1;
    }
    return HF_OK;
}

hf_status hf_cli_parse_offset(const char *text, double offset[3], hf_error *err)
{
    static const hf_dim dims[3] = {HF_DIM_LENGTH, HF_DIM_LENGTH, HF_DIM_ANGLE};
    return parse_parts("--offset",
                       "X,Y,HEADING_DEG (lengths in m, heading in degrees; units allowed)", text,
                       ',', dims, 3, offset, err);
}

hf_status hf_cli_parse_range(const char *text, double *from, double *to, double *step,
                             size_t max_points, size_t *count, hf_error *err)
{
    static const hf_dim dims[3] = {HF_DIM_LENGTH, HF_DIM_LENGTH, HF_DIM_LENGTH};
    double v[3];
    hf_status s =
        parse_parts(NULL, "FROM:TO:STEP (lengths in m; units allowed)", text, ':', dims, 3, v, err);
    if (s != HF_OK)
        return s;
    size_t n = hf_study_range_count(v[0], v[1], v[2], max_points); /* the one range rule */
    if (n == 0)
        return hf_error_set(err, HF_EINVAL,
                            "range \"%s\": STEP must be non-zero and point from FROM to TO", text);
    if (n > max_points)
        return hf_error_set(err, HF_ELIMIT, "range \"%s\" has more than %zu points (the limit)",
                            text, max_points);
    *from = v[0];
    *to = v[1];
    *step = v[2];
    *count = n;
    return HF_OK;
}

hf_status hf_cli_check_output(const char *option, const char *out, const char *input, hf_error *err)
{
    if (!out[0])
        return hf_error_set(err, HF_EINVAL,
                            "%s: expected a FILE name (or - for standard output), "
                            "got an empty name",
                            option);
    if (!strcmp(out, "-") || !input)
        return HF_OK;
    hf_error e;
    hf_error_clear(&e);
    if (hf_outfile_check_not_input(out, input, &e) != HF_OK)
        return hf_error_set(err, HF_EINVAL, "%s: %s", option, e.text);
    return HF_OK;
}

hf_status hf_cli_make_dir(const char *what, const char *dir, hf_error *err)
{
    char path[4096];
    size_t n = strlen(dir);
    if (n == 0 || n >= sizeof path)
        return hf_error_set(err, HF_EINVAL, "%s: directory name empty or too long", what);
    memcpy(path, dir, n + 1);
    for (size_t k = 1; k <= n; k++) {
        if (path[k] != '/' && path[k] != '\0')
            continue;
        char keep = path[k];
        path[k] = '\0';
        if (mkdir(path, 0777) != 0 && errno != EEXIST)
            return hf_error_set(err, HF_EIO, "%s: cannot create directory '%s': %s", what, path,
                                strerror(errno));
        path[k] = keep;
    }
    struct stat sb;
    if (stat(dir, &sb) != 0 || !S_ISDIR(sb.st_mode))
        return hf_error_set(err, HF_EIO, "%s: '%s' is not a directory", what, dir);
    return HF_OK;
}

static double cli_now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

void hf_cli_bar_start(hf_cli_bar *b)
{
    b->start = cli_now();
    b->last = 0.0;
    b->drawn = 0;
}

void hf_cli_bar_draw(hf_cli_bar *b, unsigned long long done, unsigned long long total,
                     const char *what)
{
    double t = cli_now();
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
    fprintf(stderr, "\r  [%s] %5.1f%%  %llu/%llu %s  %.0f/s  %.0f s left   ", cells, 100.0 * f,
            done, total, what, rate, eta);
    fflush(stderr);
}

void hf_cli_bar_clear(hf_cli_bar *b)
{
    if (b->drawn)
        fprintf(stderr, "\r%70s\r", "");
    b->drawn = 0;
}
