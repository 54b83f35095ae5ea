/* study.c - case spaces (grid, zip), shards and the ordered parallel row stream. */
#include <errno.h>
#include <float.h>
#include <math.h>
#include <omp.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/study.h"

/* ---- the study list ---- */

void hf_study_list_init(hf_study_list *l)
{
    if (l)
        memset(l, 0, sizeof *l);
}

static void study_clear(hf_study *s)
{
    hf_free(s->name);
    for (size_t i = 0; i < s->nloads; i++)
        hf_free(s->loads[i]);
    hf_free(s->loads);
    for (size_t i = 0; i < s->nvary; i++) {
        hf_free(s->vary[i].path);
        hf_free(s->vary[i].values);
    }
    hf_free(s->vary);
    for (size_t i = 0; i < s->noutputs; i++)
        hf_free(s->outputs[i]);
    hf_free(s->outputs);
    hf_free(s->target_output);
    hf_free(s->target_line);
    for (size_t i = 0; i < s->nenvironments; i++)
        hf_free(s->environments[i]);
    hf_free(s->environments);
}

void hf_study_list_free(hf_study_list *l)
{
    if (!l)
        return;
    for (size_t i = 0; i < l->n; i++)
        study_clear(&l->v[i]);
    hf_free(l->v);
    hf_study_list_init(l);
}

const char *hf_study_kind_name(hf_study_kind k)
{
    static const char *const names[] = {"lines", "curve",  "stiffness", "balance",
                                        "sweep", "invert", "design"};
    return (unsigned)k < sizeof names / sizeof names[0] ? names[k] : "?";
}

/* ---- ranges ---- */

hf_status hf_study_parse_value(const char *text, hf_dim d, double *out, hf_error *err)
{
    hf_status st = hf_units_parse(text, d, out, err);
    if (st != HF_OK || d != HF_DIM_ANGLE)
        return st;
    /* The text is a valid angle: its number (decimal, as hf_units_parse
     * reads it) times the angle of one of its unit, without the reduction. */
    char *end;
    double num = strtod(text, &end), one;
    char unit[64];
    if (end == text || snprintf(unit, sizeof unit, "1%s", end) >= (int)sizeof unit ||
        hf_units_parse(unit, HF_DIM_ANGLE, &one, NULL) != HF_OK)
        return HF_OK; /* keep the reduced value */
    double x = num * one;
    /* Up to HF_STUDY_MAX_TURNS whole turns are kept; beyond, the reduced
     * value stands (exact: reduced in degrees first), so 1e15 deg is 280 deg. */
    if (isfinite(x) && fabs(x) <= HF_STUDY_MAX_TURNS * 2.0 * M_PI)
        *out = x;
    return HF_OK;
}

/* The tolerance of the range rule, in steps: 1e-9 of a step for rounding
 * in the division, plus 64 ulps of the values' magnitude (the rounding of
 * TO - FROM, which grows with the values, not with the step). */
static double range_tol(double from, double to, double step)
{
    return 1e-9 + 64.0 * DBL_EPSILON * fmax(fabs(from), fabs(to)) / fabs(step);
}

size_t hf_study_range_count(double from, double to, double step, size_t max)
{
    if (!isfinite(from) || !isfinite(to) || !isfinite(step) || step == 0.0)
        return 0;
    double span = to - from;
    if (!isfinite(span) || (span != 0.0 && (span > 0) != (step > 0)))
        return 0;
    double n = floor(span / step + range_tol(from, to, step)) + 1.0;
    if (!(n >= 1.0))
        return 0;
    if (n > (double)max)
        return max + 1;
    return (size_t)n;
}

size_t hf_study_vary_count(const hf_vary *v)
{
    if (v->nvalues > 0)
        return v->nvalues;
    return hf_study_range_count(v->from, v->to, v->step, HF_STUDY_MAX_VALUES);
}

double hf_study_vary_value(const hf_vary *v, size_t i)
{
    if (v->nvalues > 0)
        return v->values[i];
    double x = v->from + (double)i * v->step;
    /* The end point lies on the grid up to rounding: give TO itself. */
    if (fabs(x - v->to) <= range_tol(v->from, v->to, v->step) * fabs(v->step))
        return v->to;
    return x;
}

hf_status hf_study_grid_init(hf_study_grid *g, const hf_vary *vary, size_t nvary, int zip,
                             hf_error *err)
{
    memset(g, 0, sizeof *g);
    if (nvary == 0 || !vary)
        return hf_error_set(err, HF_EINVAL, "a sweep needs at least one varied parameter");
    if (nvary > HF_STUDY_MAX_VARY)
        return hf_error_set(err, HF_ELIMIT, "%zu varied parameters; the limit is %d", nvary,
                            HF_STUDY_MAX_VARY);
    g->nvary = nvary;
    g->vary = vary;
    g->zip = zip ? 1 : 0;
    uint64_t total = 1;
    for (size_t j = 0; j < nvary; j++) {
        size_t c = hf_study_vary_count(&vary[j]);
        const char *path = vary[j].path ? vary[j].path : "?";
        if (c == 0)
            return hf_error_set(err, HF_EINVAL,
                                "%s: the range %.10g:%.10g:%.10g is empty or invalid (STEP must "
                                "be non-zero and point from FROM to TO)",
                                path, vary[j].from, vary[j].to, vary[j].step);
        if (c > HF_STUDY_MAX_VALUES)
            return hf_error_set(err, HF_ELIMIT, "%s: more than %u values; the limit is %u", path,
                                HF_STUDY_MAX_VALUES, HF_STUDY_MAX_VALUES);
        for (size_t i = 0; i < vary[j].nvalues; i++)
            if (!isfinite(vary[j].values[i]))
                return hf_error_set(err, HF_EINVAL, "%s: value %zu is not a finite number", path,
                                    i + 1);
        g->count[j] = c;
        if (g->zip) {
            if (c != g->count[0])
                return hf_error_set(err, HF_EINVAL,
                                    "zipped parameters need equal numbers of values: %s has %zu, "
                                    "%s has %zu",
                                    vary[0].path ? vary[0].path : "?", g->count[0], path, c);
            total = c;
        } else {
            if (total > HF_STUDY_MAX_CASES / c)
                return hf_error_set(err, HF_ELIMIT,
                                    "the grid has more than %llu cases (the limit); use --zip, "
                                    "fewer values or split the study",
                                    (unsigned long long)HF_STUDY_MAX_CASES);
            total *= c;
        }
    }
    g->ncases = total;
    return HF_OK;
}

void hf_study_grid_index(const hf_study_grid *g, uint64_t k, size_t *idx)
{
    if (g->zip) {
        for (size_t j = 0; j < g->nvary; j++)
            idx[j] = (size_t)k;
        return;
    }
    /* Mixed-radix digits of k, the last parameter fastest. */
    for (size_t j = g->nvary; j-- > 0;) {
        idx[j] = (size_t)(k % g->count[j]);
        k /= g->count[j];
    }
}

void hf_study_grid_values(const hf_study_grid *g, uint64_t k, double *values)
{
    size_t idx[HF_STUDY_MAX_VARY];
    hf_study_grid_index(g, k, idx);
    for (size_t j = 0; j < g->nvary; j++)
        values[j] = hf_study_vary_value(&g->vary[j], idx[j]);
}

void hf_study_shard_range(uint64_t total, unsigned k, unsigned n, uint64_t *begin, uint64_t *end)
{
    /* Balanced split without overflow: the first total % n shards get one more. */
    uint64_t q = total / n, r = total % n;
    uint64_t i = k - 1u;
    *begin = q * i + (i < r ? i : r);
    *end = *begin + q + (i < r ? 1 : 0);
}

static int parse_uint(const char *s, const char **end, unsigned long *out)
{
    if (*s < '0' || *s > '9')
        return 0;
    char *e;
    errno = 0;
    unsigned long v = strtoul(s, &e, 10);
    if (errno == ERANGE)
        return 0;
    *out = v;
    *end = e;
    return 1;
}

hf_status hf_study_shard_parse(const char *text, unsigned *k, unsigned *n, hf_error *err)
{
    unsigned long a, b;
    const char *p = text;
    if (!parse_uint(p, &p, &a) || *p != '/' || !parse_uint(p + 1, &p, &b) || *p != '\0' || a < 1 ||
        a > b || b > HF_STUDY_MAX_SHARDS)
        return hf_error_set(err, HF_EINVAL,
                            "--shard: expected K/N with whole numbers 1 <= K <= N <= %u, got "
                            "\"%s\"",
                            HF_STUDY_MAX_SHARDS, text);
    *k = (unsigned)a;
    *n = (unsigned)b;
    return HF_OK;
}

int hf_study_default_jobs(void)
{
    int n = omp_get_num_procs();
    return n >= 1 ? n : 1;
}

/* One block: chains of HF_STUDY_CHAIN cases aligned on absolute case
 * numbers, evaluated in parallel, each row into its own slot. */
typedef struct {
    uint64_t b0, b1; /* cases of the block (emitted) */
    char *buf;       /* block * row_cap */
    int *len;        /* block row lengths */
} slab;

typedef struct {
    char *scratch; /* jobs * row_cap, for cases that rebuild a chain */
    size_t row_cap;
    void **states;
    hf_study_row_fn row;
    int jobs;
} block_job;

/* Number of chains touching the slab's cases, and the first one. */
static long chains(const slab *sl, uint64_t *c0)
{
    *c0 = sl->b0 / HF_STUDY_CHAIN;
    uint64_t c1 = (sl->b1 + HF_STUDY_CHAIN - 1) / HF_STUDY_CHAIN;
    return (long)(c1 - *c0);
}

/* Evaluates chain c of the slab on thread t; returns 1 when a row overflowed. */
static int run_chain(const block_job *b, const slab *sl, uint64_t c0, long c, int t)
{
    int overflow = 0;
    uint64_t k = ((uint64_t)c + c0) * HF_STUDY_CHAIN;
    uint64_t kend = k + HF_STUDY_CHAIN;
    if (kend > sl->b1)
        kend = sl->b1;
    for (; k < kend; k++) {
        int start = (k % HF_STUDY_CHAIN) == 0;
        if (k < sl->b0) {
            /* Rebuild the warm start of a chain cut by the stream's start. */
            b->row(b->states[t], k, start, 0, b->scratch + (size_t)t * b->row_cap, b->row_cap);
            continue;
        }
        char *slot = sl->buf + (size_t)(k - sl->b0) * b->row_cap;
        int n = b->row(b->states[t], k, start, 1, slot, b->row_cap);
        if (n < 0 || (size_t)n >= b->row_cap) {
            overflow = 1;
            n = 0;
        }
        sl->len[k - sl->b0] = n;
    }
    return overflow;
}

/* Writes a computed slab's rows in case order; 0 on success. */
static int write_slab(const block_job *b, const slab *sl, FILE *out)
{
    if (!out)
        return 0; /* rows kept in memory only (the row function's business) */
    for (uint64_t k = sl->b0; k < sl->b1; k++) {
        size_t n = (size_t)sl->len[k - sl->b0];
        if (n && fwrite(sl->buf + (size_t)(k - sl->b0) * b->row_cap, 1, n, out) != n)
            return -1;
    }
    return ferror(out) ? -1 : 0;
}

/* Computes slab `next` on every thread while one thread first writes slab
 * `done` (NULL: nothing to write): output overlaps computation, and the
 * rows still leave in case order.  Returns the overflow flag; *werr is set
 * when the write failed. */
static int step(const block_job *b, const slab *next, const slab *done, FILE *out, int *werr)
{
    uint64_t c0 = 0;
    long n = next ? chains(next, &c0) : 0;
    int overflow = 0, wfail = 0;
#pragma omp parallel num_threads(b->jobs) reduction(| : overflow)
    {
#pragma omp single nowait
        {
            if (done && write_slab(b, done, out) != 0)
                wfail = 1;
        }
#pragma omp for schedule(dynamic, 1) nowait
        for (long c = 0; c < n; c++)
            overflow |= run_chain(b, next, c0, c, omp_get_thread_num());
    }
    *werr = wfail;
    return overflow;
}

hf_status hf_study_stream(uint64_t begin, uint64_t end, void **states, hf_study_row_fn row,
                          const hf_study_stream_options *opt, FILE *out, hf_error *err)
{
    if (!opt || opt->jobs < 1 || opt->row_cap < 2 || !states || !row || begin > end)
        return hf_error_set(err, HF_EINVAL, "hf_study_stream: invalid arguments");
    size_t block = opt->block;
    if (block == 0) {
        /* Few, large blocks: each ends with a barrier, and on a busy machine
         * a descheduled thread holds every other one there. */
        block = ((size_t)2 << 20) / opt->row_cap; /* two such slabs */
        if (block < 256)
            block = 256;
        if (block > 16384)
            block = 16384;
    }
    block = (block + HF_STUDY_CHAIN - 1) / HF_STUDY_CHAIN * HF_STUDY_CHAIN;
    if (opt->row_cap > ((size_t)1 << 40) / block)
        return hf_error_set(err, HF_ELIMIT, "rows of %zu bytes are too long to buffer",
                            opt->row_cap);
    block_job b = {0};
    b.row_cap = opt->row_cap;
    b.states = states;
    b.row = row;
    b.jobs = opt->jobs;
    /* Two slabs: one is written while the other is computed. */
    slab sl[2] = {{0}, {0}};
    for (int i = 0; i < 2; i++) {
        sl[i].buf = hf_malloc(block * opt->row_cap);
        sl[i].len = hf_calloc(block, sizeof *sl[i].len);
    }
    b.scratch = hf_malloc((size_t)opt->jobs * opt->row_cap);
    hf_status st = HF_OK;
    if (!sl[0].buf || !sl[0].len || !sl[1].buf || !sl[1].len || !b.scratch) {
        st = hf_error_set(err, HF_ENOMEM, "out of memory for a block of %zu rows", block);
        goto done;
    }
    uint64_t total = end - begin;
    /* The first block starts at the chain holding `begin`, so the chain is
     * rebuilt from its first case; blocks end on multiples of `block`. */
    uint64_t s = begin;
    slab *pending = NULL; /* computed, not yet written */
    int cur = 0;
    while (s < end || pending) {
        if (opt->stop && *opt->stop) {
            st = hf_error_set(err, HF_EIO, "interrupted");
            goto done;
        }
        slab *next = NULL;
        if (s < end) {
            uint64_t e = (s / block + 1) * block;
            if (e > end)
                e = end;
            next = &sl[cur];
            next->b0 = s;
            next->b1 = e;
        }
        int werr = 0;
        int overflow = step(&b, next, pending, out, &werr);
        if (werr) {
            st = hf_error_set(err, HF_EIO, "writing the rows failed: %s", strerror(errno));
            goto done;
        }
        if (pending && opt->progress)
            opt->progress(opt->progress_ctx, pending->b1 - begin, total);
        if (overflow) {
            st = hf_error_set(
                err, HF_ELIMIT, "a row of the cases %llu..%llu is longer than %zu bytes",
                (unsigned long long)next->b0, (unsigned long long)(next->b1 - 1), opt->row_cap);
            goto done;
        }
        pending = next;
        if (next) {
            s = next->b1;
            cur ^= 1;
        }
    }
done:
    for (int i = 0; i < 2; i++) {
        hf_free(sl[i].buf);
        hf_free(sl[i].len);
    }
    hf_free(b.scratch);
    return st;
}
