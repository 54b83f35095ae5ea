/* csv.c - CSV writer: a fast "%.Ng" number formatter, RFC 4180 quoting, row buffering. */
#include <float.h>
#include <math.h>
#include <stdarg.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>
#include "holdfast/csv.h"

/* The fast path serves up to 15 digits.  Ordinary magnitudes are scaled by
 * an exact power of ten in double with the rounding error recovered exactly;
 * very large and small ones need a long double with at least a 64-bit
 * significand (x86 extended precision, or IEEE quad): two roundings of 2^-64
 * relative, and an exponent range that covers 10^-324..10^308 scaled by
 * 10^340.  Without such a long double, or under -ffast-math (which may
 * reassociate the exact steps away), every number goes through snprintf:
 * correct, slower.  (holdfast is not meant to be built with -ffast-math: its
 * NaN checks would vanish too.) */
#if LDBL_MANT_DIG >= 64 && !defined(__FAST_MATH__)
#define FAST_FORMAT 1
#else
#define FAST_FORMAT 0
#endif
#define FAST_DIGITS_MAX 15

#if FAST_FORMAT
/* 10^0..10^27 are exact in a 64-bit significand (5^27 < 2^64). */
static const long double p10small[28] = {
    1e0L,  1e1L,  1e2L,  1e3L,  1e4L,  1e5L,  1e6L,  1e7L,  1e8L,  1e9L,
    1e10L, 1e11L, 1e12L, 1e13L, 1e14L, 1e15L, 1e16L, 1e17L, 1e18L, 1e19L,
    1e20L, 1e21L, 1e22L, 1e23L, 1e24L, 1e25L, 1e26L, 1e27L,
};
/* 10^(28 i), correctly rounded by the compiler. */
static const long double p10big[13] = {
    1e0L,   1e28L,  1e56L,  1e84L,  1e112L, 1e140L, 1e168L,
    1e196L, 1e224L, 1e252L, 1e280L, 1e308L, 1e336L,
};

/* a * 10^k for |k| <= 363, with one rounding when |k| <= 27.  Dividing by an
 * exact power (instead of multiplying by an inexact reciprocal) keeps exact
 * decimal ties exact, so round-half-even matches printf on them. */
static long double scale10(long double a, int k)
{
    if (k >= 0)
        return k < 28 ? a * p10small[k] : a * p10big[k / 28] * p10small[k % 28];
    k = -k;
    return k < 28 ? a / p10small[k] : a / p10big[k / 28] / p10small[k % 28];
}

static const uint64_t u10[17] = {
    1ull,
    10ull,
    100ull,
    1000ull,
    10000ull,
    100000ull,
    1000000ull,
    10000000ull,
    100000000ull,
    1000000000ull,
    10000000000ull,
    100000000000ull,
    1000000000000ull,
    10000000000000ull,
    100000000000000ull,
    1000000000000000ull,
    10000000000000000ull,
};

/* Exact powers of ten in double: 10^0..10^22 (5^22 < 2^53). */
static const double d10[23] = {
    1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,  1e8,  1e9,  1e10, 1e11,
    1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
};

/* Decimal exponent estimate from the binary one: a in [2^(b-1), 2^b) gives
 * floor(log10 a) in {e, e + 1}.  78913 / 2^18 = log10(2) to 7 digits, exact
 * enough for |b| < 1700 (the Ryu estimate, Adams 2018). */
static int log10_estimate(double a)
{
    uint64_t u;
    memcpy(&u, &a, sizeof u);
    int be = (int)((u >> 52) & 0x7ff);
    int b;
    if (be)
        b = be - 1022; /* a = 1.f * 2^(be - 1023) */
    else
        (void)frexp(a, &b); /* subnormal: rare, let libm find the leading bit */
    int t = (b - 1) * 78913;
    return t >= 0 ? t >> 18 : -((-t + (1 << 18) - 1) >> 18);
}

/* Error-free product: a * b = *p + *err exactly (Dekker 1971, "A floating-
 * point technique for extending the available precision", TwoProduct with
 * Veltkamp splitting), valid while |a|, |b| < 2^996.  Used instead of fma,
 * which is a library call on baseline x86-64; where fma is an instruction
 * (FP_FAST_FMA) it is used directly.  A compiler contracting ah * bh - p
 * into an fma does not change the result: ah * bh is exact. */
static void two_product(double a, double b, double *p, double *err)
{
#if defined(FP_FAST_FMA)
    *p = a * b;
    *err = fma(a, b, -*p);
#else
    const double split = 134217729.0; /* 2^27 + 1 */
    double t = split * a, ah = t - (t - a), al = a - ah;
    t = split * b;
    double bh = t - (t - b), bl = b - bh;
    *p = a * b;
    *err = ((ah * bh - *p) + ah * bl + al * bh) + al * bl;
#endif
}

/* The d-digit integer nearest a * 10^k (round half to even, as glibc's
 * printf does on exact ties), a > 0, where a * 10^k < 10^d.  For |k| <= 22
 * the power is exact and the error of the one rounded product or quotient is
 * recovered exactly, so the decision is exact; beyond, long double scaling
 * decides (error 2^-62 relative: a wrong rounding needs the value within
 * 10^-4 ulp of a decimal tie). */
static uint64_t scaled_round(double a, int k)
{
    if (k >= -22 && k <= 22) {
        double y, r, p, err;
        if (k >= 0) {
            two_product(a, d10[k], &y, &r); /* a * 10^k = y + r exactly */
        } else {
            y = a / d10[-k];
            two_product(y, d10[-k], &p, &err); /* y * 10^-k = p + err exactly */
            r = (a - p) - err; /* a - p is exact (Sterbenz); only the sign of r is used */
        }
        uint64_t q = (uint64_t)y;    /* y < 2^53, so truncation is floor */
        double frac = y - (double)q; /* exact; a multiple of ulp(y) <= 1/8 */
        if (frac > 0.5 || (frac == 0.5 && (r > 0 || (r == 0 && (q & 1u)))))
            q++;
        return q;
    }
    long double m = scale10((long double)a, k);
    long double fl = floorl(m);
    uint64_t q = (uint64_t)fl;
    long double frac = m - fl;
    if (frac > 0.5L || (frac == 0.5L && (q & 1u)))
        q++;
    return q;
}

/* Formats finite, non-zero a > 0 with d <= 15 digits into p; returns length. */
static size_t fast(char *p, double a, int d)
{
    int e = log10_estimate(a);
    /* a >= 10^(e+1) means the estimate was one low: compare a * 10^(d-1-e)
     * against 10^d through the rounded integer, which is monotone in a. */
    uint64_t q = scaled_round(a, d - 1 - e);
    if (q >= u10[d]) {
        e++;
        q = scaled_round(a, d - 1 - e);
    }
    if (q >= u10[d]) { /* rounded up to the next power of ten */
        q /= 10;
        e++;
    }
    /* Digits of q, most significant first, two at a time; trailing zeros
     * dropped below. */
    static const char pairs[201] = "00010203040506070809101112131415161718192021222324252627282930"
                                   "31323334353637383940414243444546474849505152535455565758596061"
                                   "62636465666768697071727374757677787980818283848586878889909192"
                                   "93949596979899";
    char dig[20];
    int at = d;
    while (at >= 2) {
        unsigned r = (unsigned)(q % 100);
        q /= 100;
        dig[--at] = pairs[2 * r + 1];
        dig[--at] = pairs[2 * r];
    }
    if (at)
        dig[0] = (char)('0' + q);
    int nd = d;
    while (nd > 1 && dig[nd - 1] == '0')
        nd--;

    char *s = p;
    if (e >= -4 && e < d) { /* %f style */
        if (e >= 0) {
            for (int i = 0; i <= e; i++)
                *s++ = i < nd ? dig[i] : '0';
            if (nd > e + 1) {
                *s++ = '.';
                for (int i = e + 1; i < nd; i++)
                    *s++ = dig[i];
            }
        } else {
            *s++ = '0';
            *s++ = '.';
            for (int i = 0; i < -e - 1; i++)
                *s++ = '0';
            for (int i = 0; i < nd; i++)
                *s++ = dig[i];
        }
    } else { /* %e style */
        *s++ = dig[0];
        if (nd > 1) {
            *s++ = '.';
            for (int i = 1; i < nd; i++)
                *s++ = dig[i];
        }
        *s++ = 'e';
        *s++ = e < 0 ? '-' : '+';
        int x = e < 0 ? -e : e;
        if (x >= 100) {
            *s++ = (char)('0' + x / 100);
            x %= 100;
        }
        *s++ = (char)('0' + x / 10);
        *s++ = (char)('0' + x % 10);
    }
    *s = '\0';
    return (size_t)(s - p);
}
#endif

size_t hf_csv_format_double(char *buf, double v, int digits)
{
    if (digits < HF_CSV_DIGITS_MIN)
        digits = HF_CSV_DIGITS_MIN;
    if (digits > HF_CSV_DIGITS_MAX)
        digits = HF_CSV_DIGITS_MAX;
    if (!isfinite(v)) {
        buf[0] = '\0';
        return 0;
    }
#if FAST_FORMAT
    if (digits <= FAST_DIGITS_MAX) {
        if (v == 0.0) {
            if (signbit(v)) {
                memcpy(buf, "-0", 3);
                return 2;
            }
            memcpy(buf, "0", 2);
            return 1;
        }
        if (v < 0) {
            buf[0] = '-';
            return 1 + fast(buf + 1, -v, digits);
        }
        return fast(buf, v, digits);
    }
#endif
    int n = snprintf(buf, HF_CSV_NUMBER_MAX, "%.*g", digits, v);
    return n > 0 ? (size_t)n : 0;
}

/* Hands the row buffer to the FILE. */
static void drain(hf_csv *c)
{
    if (c->len) {
        fwrite(c->buf, 1, c->len, c->out);
        c->len = 0;
    }
}

/* Makes room for n more bytes (n < HF_CSV_ROW_BUFFER). */
static void room(hf_csv *c, size_t n)
{
    if (c->len + n > sizeof c->buf)
        drain(c);
}

static void put(hf_csv *c, const char *s, size_t n)
{
    if (n >= sizeof c->buf / 2) { /* long text: straight through */
        drain(c);
        fwrite(s, 1, n, c->out);
        return;
    }
    room(c, n);
    memcpy(c->buf + c->len, s, n);
    c->len += n;
}

/* Writes the separator before a field (none before the first). */
static void sep(hf_csv *c)
{
    if (c->column++) {
        room(c, 1);
        c->buf[c->len++] = ',';
    }
}

void hf_csv_init(hf_csv *c, FILE *out, int digits)
{
    c->out = out;
    if (digits <= 0)
        digits = HF_CSV_DIGITS_DEFAULT;
    if (digits > HF_CSV_DIGITS_MAX)
        digits = HF_CSV_DIGITS_MAX;
    c->digits = digits;
    c->column = 0;
    c->rows = 0;
    c->nonfinite = 0;
    c->len = 0;
}

void hf_csv_field_double(hf_csv *c, double v)
{
    sep(c);
    if (!isfinite(v)) {
        c->nonfinite++;
        return;
    }
    room(c, HF_CSV_NUMBER_MAX);
    c->len += hf_csv_format_double(c->buf + c->len, v, c->digits);
}

/* True when s must be quoted (RFC 4180 section 2, items 5-7; leading or
 * trailing spaces are quoted too, so readers that trim keep them). */
static int needs_quotes(const char *s)
{
    if (!*s)
        return 0;
    if (s[0] == ' ' || s[strlen(s) - 1] == ' ')
        return 1;
    return strpbrk(s, ",\"\r\n") != NULL;
}

void hf_csv_field_str(hf_csv *c, const char *s)
{
    sep(c);
    if (!s || !*s)
        return;
    if (!needs_quotes(s)) {
        put(c, s, strlen(s));
        return;
    }
    put(c, "\"", 1);
    for (const char *q; (q = strchr(s, '"')) != NULL; s = q + 1) {
        put(c, s, (size_t)(q - s) + 1);
        put(c, "\"", 1); /* a quote inside is doubled */
    }
    put(c, s, strlen(s));
    put(c, "\"", 1);
}

void hf_csv_field_long(hf_csv *c, long v)
{
    char t[32];
    int n = snprintf(t, sizeof t, "%ld", v);
    sep(c);
    put(c, t, (size_t)n);
}

void hf_csv_field_size(hf_csv *c, size_t v)
{
    char t[32];
    int n = snprintf(t, sizeof t, "%zu", v);
    sep(c);
    put(c, t, (size_t)n);
}

void hf_csv_field_empty(hf_csv *c)
{
    sep(c);
}

void hf_csv_end_row(hf_csv *c)
{
    room(c, 1);
    c->buf[c->len++] = '\n';
    c->column = 0;
    c->rows++;
    drain(c); /* whole rows reach the FILE at once: one fwrite per row */
}

void hf_csv_header_array(hf_csv *c, const char *const *names, size_t n)
{
    for (size_t i = 0; i < n; i++)
        hf_csv_field_str(c, names[i]);
    hf_csv_end_row(c);
}

void hf_csv_header(hf_csv *c, const char *name, ...)
{
    va_list ap;
    va_start(ap, name);
    for (const char *s = name; s; s = va_arg(ap, const char *))
        hf_csv_field_str(c, s);
    va_end(ap);
    hf_csv_end_row(c);
}

int hf_csv_flush(hf_csv *c)
{
    drain(c);
    return ferror(c->out) ? -1 : 0;
}

int hf_csv_quote(FILE *out, const char *s)
{
    if (!s || !*s)
        return 0;
    if (!needs_quotes(s))
        return fputs(s, out) < 0 ? EOF : 0;
    if (putc('"', out) == EOF)
        return EOF;
    for (; *s; s++) {
        if (*s == '"' && putc('"', out) == EOF)
            return EOF;
        if (putc(*s, out) == EOF)
            return EOF;
    }
    return putc('"', out) == EOF ? EOF : 0;
}
