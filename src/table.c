/* table.c - coefficient tables of the design method: CSV reading with
 * located errors, grid assembly, interpolation and heading coverage.
 * Contract and file dialect in table.h. */
#include <errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include "holdfast/alloc.h"
#include "holdfast/table.h"

#define TWO_PI (2.0 * M_PI)
#define DEG (M_PI / 180.0)
#define NCOL_MAX 5

struct hf_table {
    hf_table_kind kind;
    char *name;   /* file name for messages */
    size_t nf;    /* frequencies (1 for HF_TABLE_COEF) */
    size_t nh;    /* headings */
    double *freq; /* nf, rad/s, increasing (NULL for HF_TABLE_COEF) */
    double *head; /* nh, rad, increasing in [0, 2 pi) */
    double *val;  /* nf * nh * 3, SI */
};

/* Per kind: column names in documented order; the first `nkey` are keys
 * (frequency, heading); then the three values with their factor to SI. */
typedef struct {
    const char *name;
    const char *header;
    int ncol, nkey;
    const char *col[NCOL_MAX];
    double factor[3]; /* file unit -> SI */
    int nonneg;       /* values must be >= 0 (RAO amplitudes) */
} kind_info;

static const kind_info kinds[HF_TABLE_KIND_COUNT] = {
    [HF_TABLE_RAO] = {"raos",
                      "frequency_rad_s,heading_deg,surge_m_per_m,sway_m_per_m,yaw_deg_per_m",
                      5,
                      2,
                      {"frequency_rad_s", "heading_deg", "surge_m_per_m", "sway_m_per_m",
                       "yaw_deg_per_m"},
                      {1.0, 1.0, DEG},
                      1},
    [HF_TABLE_DRIFT] = {"drift",
                        "frequency_rad_s,heading_deg,surge_kN_per_m2,sway_kN_per_m2,yaw_kNm_per_m2",
                        5,
                        2,
                        {"frequency_rad_s", "heading_deg", "surge_kN_per_m2", "sway_kN_per_m2",
                         "yaw_kNm_per_m2"},
                        {1e3, 1e3, 1e3},
                        0},
    [HF_TABLE_COEF] = {"coefficients",
                       "heading_deg,cx,cy,cmz",
                       4,
                       1,
                       {"heading_deg", "cx", "cy", "cmz"},
                       {1.0, 1.0, 1.0},
                       0},
};

const char *hf_table_kind_name(hf_table_kind k)
{
    return (unsigned)k < HF_TABLE_KIND_COUNT ? kinds[k].name : "unknown";
}

const char *hf_table_columns(hf_table_kind k)
{
    return (unsigned)k < HF_TABLE_KIND_COUNT ? kinds[k].header : "";
}

void hf_table_free(hf_table *t)
{
    if (!t)
        return;
    hf_free(t->name);
    hf_free(t->freq);
    hf_free(t->head);
    hf_free(t->val);
    hf_free(t);
}

hf_table_kind hf_table_kind_of(const hf_table *t)
{
    return t->kind;
}
const char *hf_table_name(const hf_table *t)
{
    return t->name;
}
size_t hf_table_nfreq(const hf_table *t)
{
    return t->kind == HF_TABLE_COEF ? 0 : t->nf;
}
size_t hf_table_nheading(const hf_table *t)
{
    return t->nh;
}

const double *hf_table_freqs(const hf_table *t)
{
    return t->freq;
}

void hf_table_freq_range(const hf_table *t, double *lo, double *hi)
{
    *lo = t->freq ? t->freq[0] : 0.0;
    *hi = t->freq ? t->freq[t->nf - 1] : 0.0;
}

/* ---- reading ---------------------------------------------------------- */

typedef struct {
    const char *name; /* file name */
    hf_table_kind kind;
    int map[NCOL_MAX]; /* file field i holds documented column map[i] */
    size_t nrow, cap;
    double *rows; /* nrow * ncol values in file units, documented order */
    long *line;   /* file line of each row */
} reader;

/* One field of a line: [start, end) trimmed, column (1-based) of its start. */
typedef struct {
    char *s;
    int col;
} field;

/* Splits `buf` in place at commas into at most max fields (returns the
 * count, max + 1 when there are more), trimming blanks and one pair of
 * enclosing double quotes. */
static int split(char *buf, field *f, int max)
{
    int n = 0;
    char *p = buf;
    for (;;) {
        char *comma = strchr(p, ',');
        if (comma)
            *comma = '\0';
        if (n == max)
            return max + 1;
        char *b = p, *e = p + strlen(p);
        while (*b == ' ' || *b == '\t')
            b++;
        while (e > b && (e[-1] == ' ' || e[-1] == '\t'))
            e--;
        if (e - b >= 2 && *b == '"' && e[-1] == '"') {
            b++;
            e--;
        }
        *e = '\0';
        f[n].s = b;
        f[n].col = (int)(b - buf) + 1;
        n++;
        if (!comma)
            return n;
        p = comma + 1;
    }
}

static hf_status header(reader *r, char *buf, long ln, hf_error *err)
{
    const kind_info *ki = &kinds[r->kind];
    field f[NCOL_MAX + 1];
    int n = split(buf, f, NCOL_MAX), seen[NCOL_MAX] = {0};
    for (int i = 0; i < n && i < NCOL_MAX; i++) {
        int c = 0;
        while (c < ki->ncol && strcmp(f[i].s, ki->col[c]) != 0)
            c++;
        if (c == ki->ncol)
            return hf_error_set(err, HF_EINVAL,
                                "%s:%ld:%d: unknown column \"%s\"; a %s table has the columns %s",
                                r->name, ln, f[i].col, f[i].s, ki->name, ki->header);
        if (seen[c]++)
            return hf_error_set(err, HF_EINVAL, "%s:%ld:%d: column %s appears twice", r->name, ln,
                                f[i].col, ki->col[c]);
        r->map[i] = c;
    }
    for (int c = 0; c < ki->ncol; c++)
        if (!seen[c])
            return hf_error_set(err, HF_EINVAL,
                                "%s:%ld: missing column %s; a %s table has the columns %s", r->name,
                                ln, ki->col[c], ki->name, ki->header);
    return HF_OK;
}

/* Checks one value (file units) of documented column c. */
static hf_status check_value(const reader *r, int c, double v, const field *f, long ln,
                             hf_error *err)
{
    const kind_info *ki = &kinds[r->kind];
    const char *col = ki->col[c];
    if (r->kind != HF_TABLE_COEF && c == 0 && !(v > 0.0))
        return hf_error_set(err, HF_EINVAL,
                            "%s:%ld:%d: column %s: expected a positive frequency, got \"%s\"",
                            r->name, ln, f->col, col, f->s);
    if (ki->nonneg && c >= ki->nkey && v < 0.0)
        return hf_error_set(err, HF_EINVAL,
                            "%s:%ld:%d: column %s: expected an amplitude >= 0, got \"%s\"", r->name,
                            ln, f->col, col, f->s);
    return HF_OK;
}

static hf_status row(reader *r, char *buf, long ln, hf_error *err)
{
    const kind_info *ki = &kinds[r->kind];
    field f[NCOL_MAX + 1];
    int n = split(buf, f, ki->ncol);
    if (n != ki->ncol)
        return hf_error_set(err, HF_EINVAL, "%s:%ld: expected %d fields (%s), got %s%d", r->name,
                            ln, ki->ncol, ki->header, n > ki->ncol ? "more than " : "",
                            n > ki->ncol ? ki->ncol : n);
    if (r->nrow == HF_TABLE_MAX_ROWS)
        return hf_error_set(err, HF_ELIMIT, "%s:%ld: more than %d rows", r->name, ln,
                            HF_TABLE_MAX_ROWS);
    if (r->nrow == r->cap) {
        size_t cap = r->cap ? 2 * r->cap : 64;
        double *rows = hf_realloc(r->rows, cap * NCOL_MAX * sizeof *rows);
        if (!rows)
            return hf_error_set(err, HF_ENOMEM, "%s: out of memory", r->name);
        r->rows = rows;
        long *line = hf_realloc(r->line, cap * sizeof *line);
        if (!line)
            return hf_error_set(err, HF_ENOMEM, "%s: out of memory", r->name);
        r->line = line;
        r->cap = cap;
    }
    double *dst = r->rows + r->nrow * NCOL_MAX;
    for (int i = 0; i < n; i++) {
        char *end;
        int c = r->map[i];
        errno = 0;
        double v = strtod(f[i].s, &end);
        if (end == f[i].s || *end != '\0' || !isfinite(v) || errno == ERANGE)
            return hf_error_set(err, HF_EINVAL,
                                "%s:%ld:%d: column %s: expected a finite number, got \"%s\"",
                                r->name, ln, f[i].col, ki->col[c], f[i].s);
        hf_status st = check_value(r, c, v, &f[i], ln, err);
        if (st != HF_OK)
            return st;
        dst[c] = v;
    }
    r->line[r->nrow++] = ln;
    return HF_OK;
}

/* Reads every line: header first, then rows. */
static hf_status read_lines(reader *r, FILE *in, hf_error *err)
{
    char buf[HF_TABLE_MAX_LINE + 1];
    long ln = 0;
    int have_header = 0;
    while (fgets(buf, sizeof buf, in)) {
        ln++;
        size_t len = strlen(buf);
        if (len == HF_TABLE_MAX_LINE && buf[len - 1] != '\n' && !feof(in))
            return hf_error_set(err, HF_ELIMIT, "%s:%ld: line longer than %d bytes", r->name, ln,
                                HF_TABLE_MAX_LINE - 1);
        while (len > 0 && (buf[len - 1] == '\n' || buf[len - 1] == '\r'))
            buf[--len] = '\0';
        size_t lead = strspn(buf, " \t");
        if (buf[lead] == '\0' || buf[lead] == '#')
            continue;
        hf_status st = have_header ? row(r, buf, ln, err) : header(r, buf, ln, err);
        if (st != HF_OK)
            return st;
        have_header = 1;
    }
    if (ferror(in))
        return hf_error_set(err, HF_EIO, "%s: read error", r->name);
    if (!have_header)
        return hf_error_set(err, HF_EINVAL, "%s: no header line; expected %s", r->name,
                            kinds[r->kind].header);
    if (r->nrow == 0)
        return hf_error_set(err, HF_EINVAL, "%s: no data rows after the header", r->name);
    return HF_OK;
}

/* ---- grid assembly ---------------------------------------------------- */

static int cmp_double(const void *a, const void *b)
{
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* Heading in degrees to radians in [0, 2 pi). */
static double wrap(double rad)
{
    double h = fmod(rad, TWO_PI);
    if (h < 0.0)
        h += TWO_PI;
    return h >= TWO_PI ? 0.0 : h;
}

/* Sorted distinct values of column c of the rows (headings wrapped) into
 * out (capacity nrow); returns the count. */
static size_t distinct(const reader *r, int c, int heading, double *out)
{
    for (size_t i = 0; i < r->nrow; i++) {
        double v = r->rows[i * NCOL_MAX + c];
        out[i] = heading ? wrap(v * DEG) : v;
    }
    qsort(out, r->nrow, sizeof *out, cmp_double);
    size_t n = 0;
    for (size_t i = 0; i < r->nrow; i++)
        if (n == 0 || out[i] != out[n - 1])
            out[n++] = out[i];
    return n;
}

static size_t find(const double *v, size_t n, double x)
{
    const double *p = bsearch(&x, v, n, sizeof *v, cmp_double);
    return (size_t)(p - v);
}

static hf_status fill_grid(const reader *r, hf_table *t, long *owner, hf_error *err)
{
    const kind_info *ki = &kinds[r->kind];
    int hc = ki->nkey - 1; /* heading column */
    for (size_t i = 0; i < t->nf * t->nh; i++)
        owner[i] = 0;
    for (size_t i = 0; i < r->nrow; i++) {
        const double *rw = r->rows + i * NCOL_MAX;
        size_t jf = t->freq ? find(t->freq, t->nf, rw[0]) : 0;
        size_t jh = find(t->head, t->nh, wrap(rw[hc] * DEG));
        size_t cell = jf * t->nh + jh;
        if (owner[cell])
            return hf_error_set(err, HF_EINVAL,
                                "%s:%ld: heading %g deg%s repeats line %ld (headings are taken "
                                "modulo 360)",
                                r->name, r->line[i], rw[hc], t->freq ? " at this frequency" : "",
                                owner[cell]);
        owner[cell] = r->line[i];
        for (int c = 0; c < 3; c++)
            t->val[cell * 3 + c] = rw[ki->nkey + c] * ki->factor[c];
    }
    for (size_t jf = 0; jf < t->nf; jf++)
        for (size_t jh = 0; jh < t->nh; jh++)
            if (!owner[jf * t->nh + jh])
                return hf_error_set(err, HF_EINVAL,
                                    "%s: incomplete grid: no row for frequency %g rad/s at heading "
                                    "%g deg (every frequency needs every heading)",
                                    r->name, t->freq[jf], t->head[jh] / DEG);
    return HF_OK;
}

static hf_status build(const reader *r, hf_table **out, hf_error *err)
{
    hf_table *t = hf_calloc(1, sizeof *t);
    double *scratch = hf_malloc(r->nrow * sizeof *scratch);
    long *owner = NULL;
    hf_status st = HF_ENOMEM;
    if (!t || !scratch || !(t->name = hf_strdup(r->name)))
        goto fail;
    t->kind = r->kind;
    t->nf = 1;
    if (r->kind != HF_TABLE_COEF) {
        t->nf = distinct(r, 0, 0, scratch);
        if (!(t->freq = hf_malloc(t->nf * sizeof *t->freq)))
            goto fail;
        memcpy(t->freq, scratch, t->nf * sizeof *t->freq);
    }
    t->nh = distinct(r, kinds[r->kind].nkey - 1, 1, scratch);
    if (!(t->head = hf_malloc(t->nh * sizeof *t->head)))
        goto fail;
    memcpy(t->head, scratch, t->nh * sizeof *t->head);
    if (!(t->val = hf_malloc(t->nf * t->nh * 3 * sizeof *t->val)) ||
        !(owner = hf_malloc(t->nf * t->nh * sizeof *owner)))
        goto fail;
    st = fill_grid(r, t, owner, err);
    if (st != HF_OK)
        goto done;
    hf_free(scratch);
    hf_free(owner);
    *out = t;
    return HF_OK;
fail:
    hf_error_set(err, HF_ENOMEM, "%s: out of memory", r->name);
done:
    hf_free(scratch);
    hf_free(owner);
    hf_table_free(t);
    return st;
}

hf_status hf_table_read(FILE *in, const char *name, hf_table_kind k, hf_table **out, hf_error *err)
{
    if (out)
        *out = NULL;
    if (!in || !out || (unsigned)k >= HF_TABLE_KIND_COUNT)
        return hf_error_set(err, HF_EINVAL, "table: no stream, output or valid kind given");
    reader r = {name ? name : "(table)", k, {0}, 0, 0, NULL, NULL};
    hf_status st = read_lines(&r, in, err);
    if (st == HF_OK)
        st = build(&r, out, err);
    hf_free(r.rows);
    hf_free(r.line);
    return st;
}

hf_status hf_table_load(const char *path, hf_table_kind k, hf_table **out, hf_error *err)
{
    if (out)
        *out = NULL;
    if (!path)
        return hf_error_set(err, HF_EINVAL, "table: no path given");
    FILE *in = fopen(path, "r");
    if (!in)
        return hf_error_set(err, HF_EIO, "%s: cannot open: %s", path, strerror(errno));
    hf_status st = hf_table_read(in, path, k, out, err);
    fclose(in);
    return st;
}

hf_status hf_table_from_values(hf_table_kind k, const char *name, size_t nf, const double *freq,
                               size_t nh, const double *head, const double *values, hf_table **out,
                               hf_error *err)
{
    if (out)
        *out = NULL;
    if (!out || (unsigned)k >= HF_TABLE_KIND_COUNT || nh == 0 || !head || !values ||
        (k != HF_TABLE_COEF && (nf == 0 || !freq)) || (k == HF_TABLE_COEF && nf != 1))
        return hf_error_set(err, HF_EINVAL, "table: bad sizes or missing arrays");
    if (nf * nh > HF_TABLE_MAX_ROWS)
        return hf_error_set(err, HF_ELIMIT, "table: more than %d rows", HF_TABLE_MAX_ROWS);
    const kind_info *ki = &kinds[k];
    reader r = {name ? name : "(table)", k, {0}, 0, nf * nh, NULL, NULL};
    r.rows = hf_malloc(nf * nh * NCOL_MAX * sizeof *r.rows);
    r.line = hf_malloc(nf * nh * sizeof *r.line);
    hf_status st = HF_OK;
    if (!r.rows || !r.line)
        st = hf_error_set(err, HF_ENOMEM, "%s: out of memory", r.name);
    for (size_t jf = 0; st == HF_OK && jf < nf; jf++)
        for (size_t jh = 0; st == HF_OK && jh < nh; jh++) {
            double *rw = r.rows + r.nrow * NCOL_MAX;
            const double *v = values + (jf * nh + jh) * 3;
            if (k != HF_TABLE_COEF)
                rw[0] = freq[jf];
            rw[ki->nkey - 1] = head[jh] / DEG;
            for (int c = 0; c < 3; c++)
                rw[ki->nkey + c] = v[c] / ki->factor[c];
            int ok = isfinite(rw[0]) && isfinite(rw[ki->nkey - 1]);
            for (int c = 0; c < 3; c++)
                ok = ok && isfinite(v[c]) && !(ki->nonneg && v[c] < 0.0);
            if (!ok || (k != HF_TABLE_COEF && !(freq[jf] > 0.0)))
                st = hf_error_set(err, HF_EINVAL,
                                  "%s: row %zu (frequency %zu, heading %zu): a value is not "
                                  "finite, a frequency not positive or an amplitude negative",
                                  r.name, r.nrow + 1, jf + 1, jh + 1);
            r.line[r.nrow] = (long)r.nrow + 1;
            r.nrow++;
        }
    if (st == HF_OK)
        st = build(&r, out, err);
    hf_free(r.rows);
    hf_free(r.line);
    return st;
}

/* ---- interpolation ---------------------------------------------------- */

/* Bracket of x in increasing v[0..n): index i and weight a with
 * value = (1 - a) v_i + a v_{i+1}; clamped at both ends. */
static void bracket(const double *v, size_t n, double x, size_t *i, double *a)
{
    if (n == 1 || !(x > v[0])) {
        *i = 0;
        *a = 0.0;
        return;
    }
    if (x >= v[n - 1]) {
        *i = n - 2;
        *a = 1.0;
        return;
    }
    size_t lo = 0, hi = n - 1; /* v[lo] < x < v[hi] */
    while (hi - lo > 1) {
        size_t mid = lo + (hi - lo) / 2;
        if (v[mid] <= x)
            lo = mid;
        else
            hi = mid;
    }
    *i = lo;
    *a = (x - v[lo]) / (v[lo + 1] - v[lo]);
}

/* Periodic bracket of heading h (rad, wrapped) in t->head: neighbours j0, j1
 * (j1 = 0 across 360 deg), weight a of j1, and the gap between them. */
static void hbracket(const hf_table *t, double h, size_t *j0, size_t *j1, double *a, double *gap)
{
    size_t n = t->nh;
    const double *v = t->head;
    if (n == 1) {
        *j0 = *j1 = 0;
        *a = 0.0;
        *gap = TWO_PI;
        return;
    }
    if (h < v[0] || h >= v[n - 1]) { /* across 360 deg: from v[n-1] to v[0] + 2 pi */
        double g = v[0] + TWO_PI - v[n - 1];
        double d = h >= v[n - 1] ? h - v[n - 1] : h + TWO_PI - v[n - 1];
        *j0 = n - 1;
        *j1 = 0;
        *a = d / g;
        *gap = g;
        return;
    }
    size_t i;
    bracket(v, n, h, &i, a);
    *j0 = i;
    *j1 = i + 1;
    *gap = v[i + 1] - v[i];
}

void hf_table_eval(const hf_table *t, double w, double heading, double v[3])
{
    size_t i = 0, j0, j1;
    double a = 0.0, b, gap;
    if (t->freq)
        bracket(t->freq, t->nf, w, &i, &a);
    hbracket(t, wrap(heading), &j0, &j1, &b, &gap);
    size_t i1 = t->nf > 1 ? i + 1 : i;
    const double *p00 = t->val + (i * t->nh + j0) * 3, *p01 = t->val + (i * t->nh + j1) * 3;
    const double *p10 = t->val + (i1 * t->nh + j0) * 3, *p11 = t->val + (i1 * t->nh + j1) * 3;
    for (int c = 0; c < 3; c++) {
        double lo = (1.0 - b) * p00[c] + b * p01[c];
        double hi = (1.0 - b) * p10[c] + b * p11[c];
        v[c] = (1.0 - a) * lo + a * hi;
    }
}

hf_status hf_table_heading_check(const hf_table *t, double heading, double max_gap,
                                 const char *what, hf_error *err)
{
    if (!what)
        what = "table";
    if (!isfinite(heading))
        return hf_error_set(err, HF_EINVAL, "%s: relative heading is not finite", what);
    double h = wrap(heading);
    size_t j0, j1;
    double a, gap;
    hbracket(t, h, &j0, &j1, &a, &gap);
    double d0 = fabs(remainder(h - t->head[j0], TWO_PI));
    double d1 = fabs(remainder(h - t->head[j1], TWO_PI));
    if (d0 <= 1e-9 || d1 <= 1e-9 || gap <= max_gap)
        return HF_OK;
    if (t->nh == 1)
        return hf_error_set(err, HF_EINVAL,
                            "%s: %s tabulates heading %.6g deg only, not the relative heading "
                            "%.6g deg",
                            what, t->name, t->head[0] / DEG, h / DEG);
    return hf_error_set(err, HF_EINVAL,
                        "%s: %s does not cover the relative heading %.6g deg: its neighbours "
                        "%.6g and %.6g deg are %.6g deg apart (at most %.6g deg allowed)",
                        what, t->name, h / DEG, t->head[j0] / DEG, t->head[j1] / DEG, gap / DEG,
                        max_gap / DEG);
}
