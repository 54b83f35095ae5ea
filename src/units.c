/* units.c - parses quantities written with units ("76 mm") into SI values. */
#include <ctype.h>
#include <errno.h>
#include <float.h>
#include <locale.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include "holdfast/hint.h"
#include "holdfast/units.h"

/* Conversion factors to SI.  Source: NIST Special Publication 811, 2008
 * edition, "Guide for the Use of the International System of Units",
 * Appendix B.8/B.9.  Factors that are exact by definition are written out
 * exactly:
 *   international foot 0.3048 m, inch 0.0254 m, nautical mile 1852 m (exact);
 *   pound (avoirdupois) 0.45359237 kg (exact);
 *   standard acceleration of gravity g_n = 9.80665 m/s^2 (exact), so
 *   kilogram-force 9.80665 N, metric ton-force 9806.65 N and
 *   pound-force 0.45359237 kg x 9.80665 m/s^2 = 4.4482216152605 N (exact;
 *   NIST SP 811 prints it rounded as 4.448 222 E+00), kip 1000 lbf;
 *   knot 1852/3600 m/s (exact); bar 1e5 Pa (exact);
 *   psi = lbf/in^2 = 4.4482216152605 / 0.00064516 Pa. */
#define FT 0.3048
#define INCH 0.0254
#define LB 0.45359237
#define GN 9.80665
#define LBF (LB * GN)
#define DEG (M_PI / 180.0)

typedef struct {
    const char *name; /* normalised spelling (see normalise()) */
    hf_dim dim;
    double factor; /* SI value of one unit */
} unit;

/* Spellings after normalisation: a product is written with '*' (input may use
 * a space, '*' or U+00B7 middle dot), powers without '^' (input may use
 * "m^3", "m3" or U+00B3).  Keep in step with spellings[] below and
 * docs/components.md ("Units"). */
static const unit units[] = {
    {"mm", HF_DIM_LENGTH, 1e-3},
    {"cm", HF_DIM_LENGTH, 1e-2},
    {"m", HF_DIM_LENGTH, 1.0},
    {"km", HF_DIM_LENGTH, 1e3},
    {"in", HF_DIM_LENGTH, INCH},
    {"ft", HF_DIM_LENGTH, FT},
    {"nmi", HF_DIM_LENGTH, 1852.0},

    {"N", HF_DIM_FORCE, 1.0},
    {"kN", HF_DIM_FORCE, 1e3},
    {"MN", HF_DIM_FORCE, 1e6},
    {"kgf", HF_DIM_FORCE, GN},
    {"tf", HF_DIM_FORCE, 1e3 * GN},
    {"lbf", HF_DIM_FORCE, LBF},
    {"kip", HF_DIM_FORCE, 1e3 * LBF},

    {"kg", HF_DIM_MASS, 1.0},
    {"t", HF_DIM_MASS, 1e3},
    {"lb", HF_DIM_MASS, LB},

    {"kg/m", HF_DIM_MASS_PER_LENGTH, 1.0},
    {"t/m", HF_DIM_MASS_PER_LENGTH, 1e3},
    {"lb/ft", HF_DIM_MASS_PER_LENGTH, LB / FT},

    {"N/m", HF_DIM_FORCE_PER_LENGTH, 1.0},
    {"kN/m", HF_DIM_FORCE_PER_LENGTH, 1e3},
    {"MN/m", HF_DIM_FORCE_PER_LENGTH, 1e6},
    {"kgf/m", HF_DIM_FORCE_PER_LENGTH, GN},
    {"tf/m", HF_DIM_FORCE_PER_LENGTH, 1e3 * GN},
    {"lbf/ft", HF_DIM_FORCE_PER_LENGTH, LBF / FT},
    {"kip/ft", HF_DIM_FORCE_PER_LENGTH, 1e3 * LBF / FT},

    {"Pa", HF_DIM_PRESSURE, 1.0},
    {"kPa", HF_DIM_PRESSURE, 1e3},
    {"MPa", HF_DIM_PRESSURE, 1e6},
    {"GPa", HF_DIM_PRESSURE, 1e9},
    {"N/mm2", HF_DIM_PRESSURE, 1e6},
    {"bar", HF_DIM_PRESSURE, 1e5},
    {"psi", HF_DIM_PRESSURE, LBF / (INCH * INCH)},
    {"ksi", HF_DIM_PRESSURE, 1e3 * LBF / (INCH * INCH)},

    {"deg", HF_DIM_ANGLE, DEG},
    {"\xc2\xb0", HF_DIM_ANGLE, DEG}, /* U+00B0 degree sign */
    {"rad", HF_DIM_ANGLE, 1.0},

    {"kg/m3", HF_DIM_DENSITY, 1.0},
    {"t/m3", HF_DIM_DENSITY, 1e3},
    {"g/cm3", HF_DIM_DENSITY, 1e3},
    {"lb/ft3", HF_DIM_DENSITY, LB / (FT * FT * FT)},

    {"m/s", HF_DIM_SPEED, 1.0},
    {"km/h", HF_DIM_SPEED, 1.0 / 3.6},
    {"ft/s", HF_DIM_SPEED, FT},
    {"kn", HF_DIM_SPEED, 1852.0 / 3600.0},
    {"knot", HF_DIM_SPEED, 1852.0 / 3600.0},
    {"knots", HF_DIM_SPEED, 1852.0 / 3600.0},

    {"mm2", HF_DIM_AREA, 1e-6},
    {"cm2", HF_DIM_AREA, 1e-4},
    {"m2", HF_DIM_AREA, 1.0},
    {"ft2", HF_DIM_AREA, FT *FT},

    {"N*m", HF_DIM_MOMENT, 1.0},
    {"Nm", HF_DIM_MOMENT, 1.0},
    {"kN*m", HF_DIM_MOMENT, 1e3},
    {"kNm", HF_DIM_MOMENT, 1e3},
    {"MN*m", HF_DIM_MOMENT, 1e6},
    {"MNm", HF_DIM_MOMENT, 1e6},
    {"tf*m", HF_DIM_MOMENT, 1e3 * GN},
    {"lbf*ft", HF_DIM_MOMENT, LBF *FT},
    {"kip*ft", HF_DIM_MOMENT, 1e3 * LBF *FT},
};
#define NUNITS (sizeof units / sizeof units[0])

/* Human-readable lists of the accepted spellings, per dimension. */
static const char *const spellings[HF_DIM_COUNT] = {
    [HF_DIM_NONE] = "",
    [HF_DIM_LENGTH] = "mm, cm, m, km, in, ft, nmi",
    [HF_DIM_FORCE] = "N, kN, MN, kgf, tf, lbf, kip",
    [HF_DIM_MASS] = "kg, t, lb",
    [HF_DIM_MASS_PER_LENGTH] = "kg/m, t/m, lb/ft",
    [HF_DIM_FORCE_PER_LENGTH] = "N/m, kN/m, MN/m, kgf/m, tf/m, lbf/ft, kip/ft",
    [HF_DIM_PRESSURE] = "Pa, kPa, MPa, GPa, N/mm^2, bar, psi, ksi",
    [HF_DIM_ANGLE] = "deg, \xc2\xb0, rad",
    [HF_DIM_DENSITY] = "kg/m^3, t/m^3, g/cm^3, lb/ft^3",
    [HF_DIM_SPEED] = "m/s, km/h, ft/s, kn, knot, knots",
    [HF_DIM_AREA] = "mm^2, cm^2, m^2, ft^2",
    [HF_DIM_MOMENT] = "N m, kN m, MN m, tf m, lbf ft, kip ft",
};

static const char *const names[HF_DIM_COUNT] = {
    [HF_DIM_NONE] = "plain number",
    [HF_DIM_LENGTH] = "length",
    [HF_DIM_FORCE] = "force",
    [HF_DIM_MASS] = "mass",
    [HF_DIM_MASS_PER_LENGTH] = "mass per length",
    [HF_DIM_FORCE_PER_LENGTH] = "force per length",
    [HF_DIM_PRESSURE] = "pressure",
    [HF_DIM_ANGLE] = "angle",
    [HF_DIM_DENSITY] = "density",
    [HF_DIM_SPEED] = "speed",
    [HF_DIM_AREA] = "area",
    [HF_DIM_MOMENT] = "moment",
};

static const char *const si[HF_DIM_COUNT] = {
    [HF_DIM_NONE] = "",
    [HF_DIM_LENGTH] = "m",
    [HF_DIM_FORCE] = "N",
    [HF_DIM_MASS] = "kg",
    [HF_DIM_MASS_PER_LENGTH] = "kg/m",
    [HF_DIM_FORCE_PER_LENGTH] = "N/m",
    [HF_DIM_PRESSURE] = "Pa",
    [HF_DIM_ANGLE] = "rad",
    [HF_DIM_DENSITY] = "kg/m^3",
    [HF_DIM_SPEED] = "m/s",
    [HF_DIM_AREA] = "m^2",
    [HF_DIM_MOMENT] = "N m",
};

/* An example of a valid value, used in messages. */
static const char *const examples[HF_DIM_COUNT] = {
    [HF_DIM_NONE] = "0.85",
    [HF_DIM_LENGTH] = "76 mm",
    [HF_DIM_FORCE] = "1500 kN",
    [HF_DIM_MASS] = "12.5 t",
    [HF_DIM_MASS_PER_LENGTH] = "115 kg/m",
    [HF_DIM_FORCE_PER_LENGTH] = "1.1 kN/m",
    [HF_DIM_PRESSURE] = "206 GPa",
    [HF_DIM_ANGLE] = "12.5 deg",
    [HF_DIM_DENSITY] = "1025 kg/m^3",
    [HF_DIM_SPEED] = "2.5 m/s",
    [HF_DIM_AREA] = "850 m^2",
    [HF_DIM_MOMENT] = "35 MN m",
};

const char *hf_dim_name(hf_dim d)
{
    return (unsigned)d < HF_DIM_COUNT ? names[d] : "unknown quantity";
}

const char *hf_dim_si(hf_dim d)
{
    return (unsigned)d < HF_DIM_COUNT ? si[d] : "";
}

const char *hf_units_list(hf_dim d)
{
    return (unsigned)d < HF_DIM_COUNT ? spellings[d] : "";
}

/* "a length", "an angle", "an area": the dimension with its article. */
static const char *article(hf_dim d)
{
    return (d == HF_DIM_ANGLE || d == HF_DIM_AREA) ? "an" : "a";
}

/* Copies at most 64 bytes of text for quoting in a message, with control
 * bytes shown as '?'. */
static void quote(char *dst, size_t cap, const char *src)
{
    size_t n = 0, max = cap - 4;
    if (max > 64)
        max = 64;
    for (; src[n] && n < max; n++) {
        unsigned char ch = (unsigned char)src[n];
        dst[n] = (ch < 0x20 || ch == 0x7f) ? '?' : (char)ch;
    }
    if (src[n])
        memcpy(dst + n, "...", 3), n += 3;
    dst[n] = '\0';
}

static int is_space(char ch)
{
    return ch == ' ' || ch == '\t';
}

/* Writes the normalised spelling of the unit text u[0..len) into out:
 * runs of spaces with at most one '*' or middle dot between two symbols
 * become one '*', spaces next to '/' vanish, "^2"/"^3" and U+00B2/U+00B3
 * become "2"/"3".  Returns 0 when the text cannot be a unit (too long,
 * stray separators). */
static int normalise(const char *u, size_t len, char *out, size_t cap)
{
    size_t o = 0, i = 0;
    while (i < len) {
        unsigned char ch = (unsigned char)u[i];
        if (is_space(u[i]) || ch == '*' ||
            (ch == 0xc2 && i + 1 < len && (unsigned char)u[i + 1] == 0xb7)) {
            int signs = 0;
            while (i < len) {
                if (is_space(u[i])) {
                    i++;
                } else if (u[i] == '*') {
                    signs++, i++;
                } else if ((unsigned char)u[i] == 0xc2 && i + 1 < len &&
                           (unsigned char)u[i + 1] == 0xb7) {
                    signs++, i += 2;
                } else {
                    break;
                }
            }
            if (signs > 1 || o == 0 || i >= len)
                return 0;
            if (out[o - 1] == '/' || u[i] == '/')
                continue;
            if (o + 1 >= cap)
                return 0;
            out[o++] = '*';
            continue;
        }
        if (ch == '^' && i + 1 < len && (u[i + 1] == '2' || u[i + 1] == '3')) {
            i++;
            continue;
        }
        if (ch == 0xc2 && i + 1 < len &&
            ((unsigned char)u[i + 1] == 0xb2 || (unsigned char)u[i + 1] == 0xb3)) {
            if (o + 1 >= cap)
                return 0;
            out[o++] = (unsigned char)u[i + 1] == 0xb2 ? '2' : '3';
            i += 2;
            continue;
        }
        if (o + 1 >= cap)
            return 0;
        out[o++] = u[i++];
    }
    out[o] = '\0';
    return o > 0;
}

static const unit *find(const char *norm)
{
    for (size_t i = 0; i < NUNITS; i++)
        if (strcmp(units[i].name, norm) == 0)
            return &units[i];
    return NULL;
}

static int same_nocase(const char *a, const char *b)
{
    for (; *a && *b; a++, b++)
        if (tolower((unsigned char)*a) != tolower((unsigned char)*b))
            return 0;
    return *a == *b;
}

/* A unit of dimension `want` close to the spelling `norm` (same letters but
 * another case or, when `edits`, one edit away), or NULL. */
static const unit *suggest(const char *norm, hf_dim want, int edits)
{
    for (size_t i = 0; i < NUNITS; i++)
        if (units[i].dim == want && same_nocase(units[i].name, norm))
            return &units[i];
    for (size_t i = 0; edits && i < NUNITS; i++)
        if (units[i].dim == want && hf_hint_distance(units[i].name, norm) <= 1)
            return &units[i];
    return NULL;
}

/* Prints a normalised spelling the way users write it: '*' as a space,
 * trailing powers with '^' ("kg/m3" -> "kg/m^3"). */
static void display(char *dst, size_t cap, const char *norm)
{
    size_t o = 0;
    for (size_t i = 0; norm[i] && o + 2 < cap; i++) {
        char ch = norm[i];
        if (ch == '*') {
            dst[o++] = ' ';
        } else if ((ch == '2' || ch == '3') && i > 0 && isalpha((unsigned char)norm[i - 1])) {
            dst[o++] = '^';
            dst[o++] = ch;
        } else {
            dst[o++] = ch;
        }
    }
    dst[o] = '\0';
}

/* Scans a decimal number [+-]digits[.digits][(e|E)[+-]digits] from s.
 * Returns the number of bytes it spans, 0 when s does not start with one. */
static size_t scan_number(const char *s)
{
    size_t i = 0, digits = 0;
    if (s[i] == '+' || s[i] == '-')
        i++;
    while (isdigit((unsigned char)s[i]))
        i++, digits++;
    if (s[i] == '.') {
        i++;
        while (isdigit((unsigned char)s[i]))
            i++, digits++;
    }
    if (digits == 0)
        return 0;
    if (s[i] == 'e' || s[i] == 'E') {
        size_t j = i + 1;
        if (s[j] == '+' || s[j] == '-')
            j++;
        if (isdigit((unsigned char)s[j])) {
            while (isdigit((unsigned char)s[j]))
                j++;
            i = j;
        }
    }
    return i;
}

/* Converts the scanned number with strtod.  holdfast never calls setlocale,
 * but should a program embedding the library do so, the locale's decimal
 * point replaces '.' first so the conversion means the same everywhere. */
static double convert(const char *s, size_t len, int *range, int *under)
{
    char buf[128];
    const char *dp = localeconv()->decimal_point;
    char *end;
    double v;
    *under = 0;
    if (len >= sizeof buf) {
        *range = 1;
        return 0.0;
    }
    memcpy(buf, s, len);
    buf[len] = '\0';
    if (dp && dp[0] && dp[0] != '.' && dp[1] == '\0') {
        char *p = strchr(buf, '.');
        if (p)
            *p = dp[0];
    }
    errno = 0;
    v = strtod(buf, &end);
    *range = !isfinite(v) || (errno == ERANGE && fabs(v) > 1.0) || *end != '\0';
    /* underflow: a non-zero number written, zero or subnormal returned */
    *under = errno == ERANGE && fabs(v) <= 1.0;
    return v;
}

double hf_units_deg_to_rad(double deg)
{
    /* fmod returns x - n y with the sign of x and |result| < |y| (C11
     * 7.12.10.1); in IEEE 754 arithmetic that value is representable, so the
     * reduction adds no rounding and |deg| < 360 is returned unchanged. */
    return fmod(deg, 360.0) * DEG;
}

/* An angle in radians reduced by whole turns when |v| >= 2 pi: sin and cos
 * of the C library reduce their argument accurately, so atan2(sin v, cos v)
 * is v's direction in (-pi, pi]; it is moved to the sign of v (like fmod). */
static double rad_reduce(double v)
{
    if (fabs(v) < 2.0 * M_PI)
        return v;
    double r = atan2(sin(v), cos(v));
    if (v > 0.0 && r < 0.0)
        r += 2.0 * M_PI;
    else if (v < 0.0 && r > 0.0)
        r -= 2.0 * M_PI;
    return r;
}

/* SI value of v written in unit u (angles reduced by whole turns). */
static double to_si(double v, const unit *u)
{
    if (u->dim != HF_DIM_ANGLE)
        return v * u->factor;
    return u->factor == 1.0 ? rad_reduce(v) : hf_units_deg_to_rad(v);
}

/* A non-zero value below the smallest normal double (DBL_MIN, 2.2e-308):
 * subnormal, with few significant bits, and its reciprocal overflows (a
 * breaking load of 1e-320 N gave an infinite utilisation).  Angles are
 * exempt only as exact zero, like every other quantity. */
static int tiny(double v)
{
    return v != 0.0 && fabs(v) < DBL_MIN;
}

static hf_status too_small(hf_dim want, const char *shown, hf_error *err)
{
    return hf_error_set(err, HF_EINVAL,
                        "expected %s %s, got \"%s\" (too small to compute with: a non-zero value "
                        "must be at least 2.2e-308 in SI units; write 0 for zero)",
                        article(want), names[want], shown);
}

/* The message for a unit text u[0..ulen) that is no known unit. */
static hf_status unknown_unit(const char *u, size_t ulen, hf_dim want, const char *shown,
                              hf_error *err)
{
    char unit_shown[80], raw[64], norm[64], hint[64];
    size_t k = ulen < sizeof raw - 1 ? ulen : sizeof raw - 1;
    const unit *close = NULL;
    memcpy(raw, u, k);
    raw[k] = '\0';
    quote(unit_shown, sizeof unit_shown, raw);
    if (u[0] == ',' && isdigit((unsigned char)u[1]))
        return hf_error_set(err, HF_EINVAL,
                            "expected %s %s, got \"%s\" (write decimals with a point: "
                            "\"%s\")",
                            article(want), names[want], shown, examples[want]);
    if (want == HF_DIM_NONE)
        return hf_error_set(err, HF_EINVAL, "expected a plain number without a unit, got \"%s\"",
                            shown);
    if (normalise(u, ulen, norm, sizeof norm))
        close = suggest(norm, want, 1);
    hint[0] = '\0';
    if (close) {
        char d[32];
        display(d, sizeof d, close->name);
        snprintf(hint, sizeof hint, "; did you mean %s?", d);
    }
    return hf_error_set(err, HF_EINVAL, "unknown unit \"%s\" in \"%s\" (%s %s takes %s)%s",
                        unit_shown, shown, article(want), names[want], spellings[want], hint);
}

/* The message for a known unit of another dimension than `want`. */
static hf_status wrong_dimension(const char *norm, const unit *found, hf_dim want,
                                 const char *shown, hf_error *err)
{
    char hint[64];
    const unit *close = suggest(norm, want, 0);
    hint[0] = '\0';
    if (close) {
        char d[32];
        display(d, sizeof d, close->name);
        snprintf(hint, sizeof hint, "; did you mean %s?", d);
    }
    if (want == HF_DIM_NONE)
        return hf_error_set(err, HF_EINVAL,
                            "expected a plain number without a unit, got \"%s\" (%s %s)", shown,
                            article(found->dim), names[found->dim]);
    return hf_error_set(err, HF_EINVAL, "expected %s %s, got \"%s\" (%s %s%s)", article(want),
                        names[want], shown, article(found->dim), names[found->dim], hint);
}

hf_status hf_units_parse(const char *text, hf_dim want, double *out, hf_error *err)
{
    char shown[80], norm[64];
    const char *s, *u;
    size_t n, ulen;
    const unit *found;
    int range, under;
    double v;

    if ((unsigned)want >= HF_DIM_COUNT)
        return hf_error_set(err, HF_EINVAL, "internal: unknown dimension %d", (int)want);
    if (!text)
        text = "";
    quote(shown, sizeof shown, text);

    s = text;
    while (is_space(*s) || *s == '\n' || *s == '\r')
        s++;
    if (*s == '\0')
        return hf_error_set(err, HF_EINVAL, "expected %s %s, got an empty value", article(want),
                            names[want]);

    n = scan_number(s);
    if (n == 0) {
        const char *t = s + (*s == '+' || *s == '-');
        if (strncasecmp(t, "nan", 3) == 0 || strncasecmp(t, "inf", 3) == 0)
            return hf_error_set(err, HF_EINVAL, "expected a finite %s, got \"%s\"", names[want],
                                shown);
        return hf_error_set(err, HF_EINVAL,
                            "expected %s %s (a number%s such as \"%s\"), got \"%s\"", article(want),
                            names[want], want == HF_DIM_NONE ? " without a unit" : " and a unit",
                            examples[want], shown);
    }
    v = convert(s, n, &range, &under);
    if (range)
        return hf_error_set(err, HF_EINVAL,
                            "expected a finite %s, got \"%s\" (the number is out of range)",
                            names[want], shown);
    if (under)
        return too_small(want, shown, err);

    /* The unit: what follows the number, trimmed. */
    u = s + n;
    while (is_space(*u))
        u++;
    ulen = strlen(u);
    while (ulen > 0 && (is_space(u[ulen - 1]) || u[ulen - 1] == '\n' || u[ulen - 1] == '\r'))
        ulen--;

    if (ulen == 0) {
        /* A plain number is SI, except that angles are given in degrees. */
        v = want == HF_DIM_ANGLE ? hf_units_deg_to_rad(v) : v;
        if (tiny(v))
            return too_small(want, shown, err);
        *out = v;
        return HF_OK;
    }

    found = normalise(u, ulen, norm, sizeof norm) ? find(norm) : NULL;
    if (!found)
        return unknown_unit(u, ulen, want, shown, err);
    if (found->dim != want)
        return wrong_dimension(norm, found, want, shown, err);

    if (tiny(v))
        return too_small(want, shown, err);
    v = to_si(v, found);
    if (!isfinite(v))
        return hf_error_set(err, HF_EINVAL,
                            "expected a finite %s, got \"%s\" (out of range in SI units)",
                            names[want], shown);
    if (tiny(v))
        return too_small(want, shown, err);
    *out = v;
    return HF_OK;
}
