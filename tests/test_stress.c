/* test_stress.c - random lines in extreme valid ranges through the line solver. */
/*
 * A fixed-seed generator builds lines across the ranges of issue 7: water
 * depth (= fairlead height) 2 m to 3000 m, EA 1e5 N to 1e11 N, wet weights
 * 1 N/m to 10 kN/m, 1 to 6 sections with clump weights and buoys at the
 * joints, and spans from X = 0 to beyond the line's length (taut and
 * stretched), plus the Z = 0 (laid) and Z small cases.  Every solve must:
 *   - return HF_OK or HF_EUNSUPPORTED (a buoy on the seabed, a sag into the
 *     seabed: include/holdfast/line.h); anything else is printed with the
 *     exact inputs and fails the test;
 *   - leave no NaN or Inf in any field of the state, whatever the status;
 *   - when OK, satisfy statics and the solver's own contract (see ok_state);
 *   - be bit-identical when repeated, and with 1 or 2 OpenMP threads;
 *   - agree with a warm-started solve from a nearby span.
 * The counts per status and regime are printed at the end.
 */
#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <cmocka.h>
#include "holdfast/case.h"
#include "holdfast/line.h"
#include "holdfast/model.h"
#include "holdfast/spread.h"

#define NLINES 10000 /* random lines */
#define NSPANS 8     /* spans per line */
#define NCASES (NLINES * NSPANS)
#define MAX_REPORT 3 /* failing inputs printed in full, per reason */
#define MAX_REASONS 32

typedef struct {
    hf_line line;
    double x, z;
} scase;

typedef struct {
    hf_status status;
    hf_line_regime regime;
    uint64_t hash; /* of every output field's bits (status and regime included) */
} outcome;

static scase *cases;
static outcome *first;

/* splitmix64 (Steele, Lea and Flood, OOPSLA 2014): small, fixed, portable. */
static uint64_t rng_state;
static uint64_t next_u64(void)
{
    uint64_t z = (rng_state += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}
static double unif(double lo, double hi)
{
    return lo + (hi - lo) * ((double)(next_u64() >> 11) * 0x1.0p-53);
}

/* The same generator on a caller's state (for threads). */
static double unif_r(uint64_t *st, double lo, double hi)
{
    uint64_t z = (*st += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    z ^= z >> 31;
    return lo + (hi - lo) * ((double)(z >> 11) * 0x1.0p-53);
}
static double logu(double lo, double hi)
{
    return exp(unif(log(lo), log(hi)));
}
static int pick(int n)
{
    return (int)(next_u64() % (uint64_t)n);
}

static void make_line(hf_line *ln, double depth)
{
    memset(ln, 0, sizeof *ln);
    ln->n = (size_t)(1 + pick(6));
    double total = depth * logu(0.4, 8.0); /* shorter than the depth up to 8x it */
    double frac[6], fsum = 0.0;
    for (size_t i = 0; i < ln->n; i++)
        fsum += frac[i] = unif(0.05, 1.0);
    for (size_t i = 0; i < ln->n; i++) {
        hf_section *s = &ln->sec[i];
        s->length = total * frac[i] / fsum;
        s->weight = logu(1.0, 1.0e4);
        s->ea = logu(1.0e5, 1.0e11);
        s->mbl = logu(1.0e3, 1.0e9);
        s->friction = pick(5) == 0 ? 0.0 : unif(0.0, 1.5);
    }
    for (size_t i = 0; i + 1 < ln->n; i++) {
        hf_joint *j = &ln->joint[i];
        double wl = ln->sec[i].weight * ln->sec[i].length;
        int kind = pick(20);
        if (kind < 9)
            j->load = 0.0;
        else if (kind < 16)
            j->load = wl * logu(0.01, 5.0); /* clump */
        else
            j->load = -wl * logu(0.01, 1.5); /* buoy */
        j->friction = unif(0.0, 1.2);
    }
}

/* Spans for one line: vertical, slack, touchdown, near taut, stretched past
 * the unstretched length, laid, and a low fairlead. */
static void make_spans(scase *c, const hf_line *ln, double depth)
{
    double L = hf_line_length(ln);
    double chord = L > depth ? sqrt(L * L - depth * depth) : 0.0;
    double xs[NSPANS - 2] = {
        0.0,
        unif(0.0, 0.4) * chord,
        unif(0.4, 0.95) * chord,
        chord * unif(0.97, 1.0),
        fmax(chord, L * 0.1) * unif(1.0, 1.08),
        L * unif(1.0, 1.3),
    };
    for (int k = 0; k < NSPANS - 2; k++) {
        c[k].line = *ln;
        c[k].x = xs[k];
        c[k].z = depth;
    }
    c[NSPANS - 2].line = *ln; /* laid: fairlead on the seabed */
    c[NSPANS - 2].x = L * unif(0.3, 1.2);
    c[NSPANS - 2].z = 0.0;
    c[NSPANS - 1].line = *ln; /* low fairlead */
    c[NSPANS - 1].x = L * unif(0.2, 1.1);
    c[NSPANS - 1].z = depth * logu(1e-3, 0.2);
}

static uint64_t mix(uint64_t h, const void *p, size_t n)
{
    const unsigned char *b = p;
    for (size_t i = 0; i < n; i++)
        h = (h ^ b[i]) * 0x100000001b3ULL; /* FNV-1a */
    return h;
}
#define MIX(h, v) ((h) = mix((h), &(v), sizeof(v)))

/* The whole-line double outputs of a state, in a fixed order. */
#define STATE_DOUBLES 17
static void state_doubles(const hf_line_state *s, double d[STATE_DOUBLES])
{
    const double v[STATE_DOUBLES] = {s->x,
                                     s->z,
                                     s->h,
                                     s->v,
                                     s->tension,
                                     s->anchor_h,
                                     s->anchor_v,
                                     s->anchor_tension,
                                     s->anchor_angle,
                                     s->touchdown_x,
                                     s->grounded,
                                     s->stiffness[0][0],
                                     s->stiffness[0][1],
                                     s->stiffness[1][0],
                                     s->stiffness[1][1],
                                     s->residual,
                                     s->max_utilisation};
    memcpy(d, v, sizeof v);
}

/* Hashes every output field (not padding) of a state.  Sections from n on
 * are not outputs: the solver leaves them as they were (it does not clear
 * the whole array on the hot path). */
static uint64_t state_hash(const hf_line_state *s)
{
    uint64_t h = 0xcbf29ce484222325ULL;
    int status = (int)s->status, regime = (int)s->regime;
    MIX(h, status);
    MIX(h, regime);
    MIX(h, s->iterations);
    MIX(h, s->evaluations);
    h = mix(h, s->message, strlen(s->message));
    double d[STATE_DOUBLES];
    state_doubles(s, d);
    h = mix(h, d, sizeof d);
    MIX(h, s->max_section);
    MIX(h, s->n);
    for (size_t i = 0; i < s->n && i < HF_LINE_MAX_SECTIONS; i++) {
        const hf_section_result *r = &s->section[i];
        const double e[] = {r->t_lower, r->t_upper, r->t_max, r->utilisation, r->grounded};
        h = mix(h, e, sizeof e);
    }
    return h;
}

/* Every double in the state is finite (sections up to n). */
static int all_finite(const hf_line_state *s)
{
    double d[STATE_DOUBLES];
    state_doubles(s, d);
    for (size_t i = 0; i < sizeof d / sizeof d[0]; i++)
        if (!isfinite(d[i]))
            return 0;
    if (s->n > HF_LINE_MAX_SECTIONS)
        return 0;
    for (size_t i = 0; i < s->n; i++) {
        const hf_section_result *r = &s->section[i];
        if (!isfinite(r->t_lower) || !isfinite(r->t_upper) || !isfinite(r->t_max) ||
            !isfinite(r->utilisation) || !isfinite(r->grounded))
            return 0;
    }
    return 1;
}

static void print_case(const char *why, const scase *c, const hf_line_state *s)
{
    fprintf(stderr, "stress: %s: status %d (%s), regime %s, message \"%s\"\n", why, (int)s->status,
            hf_status_str(s->status), hf_line_regime_name(s->regime),
            s->message ? s->message : "(null)");
    fprintf(stderr, "  X = %.17g, Z = %.17g, n = %zu\n", c->x, c->z, c->line.n);
    for (size_t i = 0; i < c->line.n; i++) {
        const hf_section *q = &c->line.sec[i];
        fprintf(stderr, "  sec[%zu] = {%.17g, %.17g, %.17g, %.17g, %.17g}", i, q->length, q->weight,
                q->ea, q->mbl, q->friction);
        if (i + 1 < c->line.n)
            fprintf(stderr, "  joint[%zu] = {%.17g, %.17g}", i, c->line.joint[i].load,
                    c->line.joint[i].friction);
        fputc('\n', stderr);
    }
    fprintf(stderr, "  h = %.17g, v = %.17g, residual = %.3g\n", s->h, s->v, s->residual);
}

/* The contract of a successful solve, and statics.  Returns a text naming
 * the first broken rule, or NULL. */
static const char *ok_state(const scase *c, const hf_line_state *s)
{
    const hf_line *ln = &c->line;
    double L = hf_line_length(ln);
    double scale = fmax(L, hypot(c->x, c->z));
    if (s->n != ln->n || s->x != c->x || s->z != c->z)
        return "n, x or z not copied";
    if (!(s->h >= 0.0) || !(s->tension >= 0.0) || !(s->anchor_h >= 0.0) || !(s->anchor_v >= 0.0) ||
        !(s->anchor_tension >= 0.0))
        return "a negative force";
    if (fabs(s->tension - hypot(s->h, s->v)) > 1e-12 * s->tension + 1e-300)
        return "fairlead tension != hypot(h, v)";
    if (fabs(s->anchor_tension - hypot(s->anchor_h, s->anchor_v)) >
        1e-12 * s->anchor_tension + 1e-300)
        return "anchor tension != hypot(anchor_h, anchor_v)";
    if (!(s->residual <= 1e-8))
        return "residual above 1e-8";
    if (!(s->grounded >= 0.0 && s->grounded <= L * (1.0 + 1e-12)))
        return "grounded length outside [0, L]";
    double gsum = 0.0, umax = 0.0;
    for (size_t k = 0; k < ln->n; k++) {
        const hf_section_result *r = &s->section[k];
        gsum += r->grounded;
        if (!(r->grounded >= 0.0) || r->grounded > ln->sec[k].length * (1.0 + 1e-12))
            return "section grounded length outside [0, length]";
        if (!(r->t_lower >= 0.0) || !(r->t_upper >= 0.0))
            return "negative section tension";
        if (r->t_max < fmax(r->t_lower, r->t_upper) * (1.0 - 1e-14))
            return "section t_max below an end tension";
        if (fabs(r->utilisation - r->t_max / ln->sec[k].mbl) > 1e-12 * r->utilisation + 1e-300)
            return "utilisation != t_max / mbl";
        umax = fmax(umax, r->utilisation);
    }
    if (fabs(gsum - s->grounded) > 1e-9 * L)
        return "section grounded lengths do not add up";
    if (s->max_utilisation != umax)
        return "max_utilisation is not the largest section utilisation";
    if (s->max_section >= ln->n)
        return "max_section out of range";
    if (s->regime == HF_LINE_SUSPENDED || s->regime == HF_LINE_TOUCHDOWN) {
        if (!(s->h > 0.0))
            return "h = 0 in a suspended or touchdown regime";
        /* The forward map at the returned forces gives back the span. */
        double x, z, J[2][2];
        hf_status fs = hf_line_span(ln, s->h, s->v, &x, &z, J);
        if (fs != HF_OK)
            return "hf_line_span rejects the returned forces";
        if (fabs(x - c->x) > 1e-8 * scale || fabs(z - c->z) > 1e-8 * scale)
            return "hf_line_span at the solution misses the span";
    }
    if (s->regime == HF_LINE_SUSPENDED) {
        /* Statics of the whole line as a free body: the fairlead's vertical
         * pull carries the line's weight and clumps less buoys, plus the
         * anchor's uplift; horizontal forces balance. */
        double W = hf_line_weight(ln), wabs = 0.0;
        for (size_t k = 0; k < ln->n; k++)
            wabs += ln->sec[k].weight * ln->sec[k].length +
                    (k + 1 < ln->n ? fabs(ln->joint[k].load) : 0.0);
        if (fabs(s->v - s->anchor_v - W) > 1e-9 * (wabs + s->tension))
            return "vertical equilibrium fails (suspended)";
        if (fabs(s->anchor_h - s->h) > 1e-12 * s->h)
            return "horizontal equilibrium fails (suspended)";
        if (s->grounded != 0.0)
            return "suspended line with grounded length";
    }
    if (s->regime == HF_LINE_TOUCHDOWN && !(s->anchor_h <= s->h * (1.0 + 1e-12)))
        return "friction raised the tension toward the anchor";
    if (s->regime == HF_LINE_SLACK && s->h != 0.0)
        return "slack line with h != 0";
    return NULL;
}

static const char *status_name(hf_status s)
{
    return hf_status_str(s);
}

static void solve_all(outcome *out, int threads, long *bad)
{
    long nbad = 0;
#pragma omp parallel for schedule(dynamic, 13) num_threads(threads) reduction(+ : nbad)
    for (long i = 0; i < NCASES; i++) {
        hf_line_state s;
        hf_status rc = hf_line_solve(&cases[i].line, cases[i].x, cases[i].z, NULL, NULL, &s);
        out[i].status = rc;
        out[i].regime = s.regime;
        out[i].hash = state_hash(&s);
        if (rc != s.status)
            nbad++;
    }
    *bad = nbad;
}

/* Every computed count is checked, and each miss is printed with its own
 * message; the test then fails once, naming how many checks missed, so one
 * miss never hides the others. */
static int expect_zero(const char *what, long n)
{
    if (n == 0)
        return 0;
    printf("stress: FAILED: %s: %ld, expected 0\n", what, n);
    return 1;
}

static int expect_equal(const char *what, long got, long want)
{
    if (got == want)
        return 0;
    printf("stress: FAILED: %s: %ld, expected %ld\n", what, got, want);
    return 1;
}

static int expect_at_least(const char *what, long got, long min)
{
    if (got >= min)
        return 0;
    printf("stress: FAILED: %s: %ld, expected at least %ld\n", what, got, min);
    return 1;
}

static void random_lines(void **state)
{
    (void)state;
    cases = calloc(NCASES, sizeof *cases);
    first = calloc(NCASES, sizeof *first);
    assert_non_null(cases);
    assert_non_null(first);
    rng_state = 0x5eed2385ULL;
    for (long i = 0; i < NLINES; i++) {
        hf_line ln;
        double depth = logu(2.0, 3000.0);
        make_line(&ln, depth);
        make_spans(&cases[i * NSPANS], &ln, depth);
    }

    long count[HF_STATUS_COUNT] = {0}, regimes[5] = {0}, failures = 0;
    const char *reasons[MAX_REASONS];
    long reason_count[MAX_REASONS] = {0};
    int nreasons = 0;
    long profiles = 0, warm = 0;
    static hf_line_point pts[8192];
    clock_t t0 = clock();
    for (long i = 0; i < NCASES; i++) {
        const scase *c = &cases[i];
        hf_line_state s;
        assert_int_equal(hf_line_check(&c->line, NULL), HF_OK);
        hf_status rc = hf_line_solve(&c->line, c->x, c->z, NULL, NULL, &s);
        const char *why = NULL;
        if (rc != s.status)
            why = "returned status differs from state.status";
        else if (!all_finite(&s))
            why = "NaN or Inf in the state";
        else if (!s.message)
            why = "NULL message";
        else if (rc != HF_OK && rc != HF_EUNSUPPORTED)
            why = "undocumented outcome for a valid line";
        else if (rc == HF_OK)
            why = ok_state(c, &s);
        if (!why && rc == HF_OK) {
            /* Profile: finite, from the anchor to the fairlead, above the
             * seabed, arc length non-decreasing. */
            double L = hf_line_length(&c->line);
            size_t np = hf_line_profile(&c->line, &s, L / 37.0, NULL, 0);
            if (np < 2 || np > sizeof pts / sizeof pts[0]) {
                why = "profile point count";
            } else {
                size_t got = hf_line_profile(&c->line, &s, L / 37.0, pts, np);
                double tol = 1e-7 * fmax(L, hypot(c->x, c->z));
                if (got != np)
                    why = "profile size changed between calls";
                for (size_t k = 0; !why && k < np; k++) {
                    const hf_line_point *p = &pts[k];
                    if (!isfinite(p->arc) || !isfinite(p->x) || !isfinite(p->z) ||
                        !isfinite(p->tension) || p->tension < 0.0)
                        why = "profile point not finite or negative tension";
                    else if (p->z < -tol)
                        why = "profile below the seabed";
                    else if (k > 0 && p->arc < pts[k - 1].arc)
                        why = "profile arc length decreases";
                }
                if (!why && (fabs(pts[0].x) > tol || fabs(pts[0].z) > tol ||
                             fabs(pts[np - 1].x - c->x) > tol || fabs(pts[np - 1].z - c->z) > tol))
                    why = "profile does not run from the anchor to the fairlead";
                profiles++;
            }
        }
        if (!why && rc == HF_OK && s.h > 0.0 && c->x > 0.0 && c->z > 0.0) {
            /* Warm start from this solution for a span 0.1 % longer must
             * agree with the cold solve there (the solution is unique). */
            hf_line_state cold, hot;
            double x2 = c->x * 1.001;
            hf_status r1 = hf_line_solve(&c->line, x2, c->z, NULL, NULL, &cold);
            hf_status r2 = hf_line_solve(&c->line, x2, c->z, &s, NULL, &hot);
            if (r1 != r2)
                why = "warm and cold solves disagree on the status";
            else if (r1 == HF_OK && (fabs(cold.h - hot.h) > 1e-6 * cold.tension + 1e-9 ||
                                     fabs(cold.v - hot.v) > 1e-6 * cold.tension + 1e-9))
                why = "warm and cold solves disagree on the forces";
            else if (!all_finite(&hot))
                why = "NaN or Inf in a warm-started state";
            warm++;
        }
        count[rc < HF_STATUS_COUNT ? rc : 0]++;
        if (rc == HF_OK && s.regime <= HF_LINE_LAID)
            regimes[s.regime]++;
        first[i].status = rc;
        first[i].regime = s.regime;
        first[i].hash = state_hash(&s);
        if (why) {
            failures++;
            int r = 0;
            while (r < nreasons && strcmp(reasons[r], why) != 0)
                r++;
            if (r == nreasons && nreasons < MAX_REASONS)
                reasons[nreasons++] = why;
            if (r < MAX_REASONS && reason_count[r]++ < MAX_REPORT)
                print_case(why, c, &s);
        }
    }
    double secs = (double)(clock() - t0) / CLOCKS_PER_SEC;

    /* Repeat serially, then on one and two OpenMP threads: bit-identical. */
    outcome *again = calloc(NCASES, sizeof *again);
    assert_non_null(again);
    long mism[3] = {0, 0, 0}, bad = 0, b;
    const int threads[3] = {1, 1, 2};
    for (int run = 0; run < 3; run++) {
        if (run == 0) {
            for (long i = 0; i < NCASES; i++) {
                hf_line_state s;
                hf_line_solve(&cases[i].line, cases[i].x, cases[i].z, NULL, NULL, &s);
                again[i].hash = state_hash(&s);
            }
        } else {
            solve_all(again, threads[run], &b);
            bad += b;
        }
        for (long i = 0; i < NCASES; i++)
            if (again[i].hash != first[i].hash || (run > 0 && (again[i].status != first[i].status ||
                                                               again[i].regime != first[i].regime)))
                mism[run]++;
    }
    free(again);

    printf("stress: %d lines x %d spans = %d solves (%.2f s serial), %ld warm-start pairs, "
           "%ld profiles\n",
           NLINES, NSPANS, NCASES, secs, warm, profiles);
    printf("stress: statuses:");
    for (int k = 0; k < HF_STATUS_COUNT; k++)
        if (count[k])
            printf(" %s %ld,", status_name((hf_status)k), count[k]);
    printf(" regimes (ok):");
    for (int k = 0; k <= HF_LINE_LAID; k++)
        printf(" %s %ld", hf_line_regime_name((hf_line_regime)k), regimes[k]);
    printf("\nstress: contract failures %ld; repeat mismatches serial %ld, 1 thread %ld, "
           "2 threads %ld\n",
           failures, mism[0], mism[1], mism[2]);
    for (int r = 0; r < nreasons; r++)
        printf("stress: FAILED %ld x %s\n", reason_count[r], reasons[r]);
    free(cases);
    free(first);
    int misses = 0;
    misses += expect_zero("contract failures (reasons above)", failures);
    misses += expect_zero("threaded solves whose status differs from state.status", bad);
    misses += expect_zero("serial repeat differs from the first solve", mism[0]);
    misses += expect_zero("repeat on 1 OpenMP thread differs from the first solve", mism[1]);
    misses += expect_zero("repeat on 2 OpenMP threads differs from the first solve", mism[2]);
    /* Every OK solve had its profile checked (bar those already failed). */
    misses += expect_at_least("profiles checked", profiles, count[HF_OK] - failures);
    /* The generator must reach the regimes and outcomes it aims at, or the
     * test proves little: each regime, the unsupported status and the warm
     * starts at least a few times. */
    for (int k = 0; k <= HF_LINE_LAID; k++) {
        char what[64];
        snprintf(what, sizeof what, "OK solves in the %s regime",
                 hf_line_regime_name((hf_line_regime)k));
        misses += expect_at_least(what, regimes[k], 10);
    }
    misses += expect_at_least("unsupported configurations", count[HF_EUNSUPPORTED], 10);
    misses += expect_at_least("warm-start pairs", warm, 1000);
    fflush(stdout);
    if (misses)
        fail_msg("stress: %d of the line checks failed (each is listed above)", misses);
}

/* ---- random spreads, through the case loader ---- */

#define NSPREADS 2000
#define NPOSES 4

typedef struct {
    hf_status status;
    uint64_t hash;
} spread_outcome;

/* Writes a random spread as a case file: 3 to 10 lines around the hull,
 * depth 2 m to 3000 m, custom components across the ranges, clumps
 * and buoys, lines from 10 % short of the anchor chord (taut, stretched) to
 * 80 % longer (slack). */
static size_t make_spread_case(char *out, size_t cap, double *radius)
{
    size_t n = 0;
#define W(...) (n += (size_t)snprintf(out + n, n < cap ? cap - n : 0, __VA_ARGS__))
    double depth = logu(2.0, 3000.0);
    int nl = 3 + pick(8);
    double R = depth * logu(1.2, 10.0) + 20.0;
    *radius = R;
    W("site: {depth: %.9g m}\ncomponents:\n", depth);
    double cw[3];
    for (int k = 0; k < 3; k++) {
        cw[k] = logu(1.0, 1.0e4);
        W("  c%d: {type: custom, wet_weight: %.9g N/m, axial_stiffness: %.9g N, "
          "breaking_load: %.9g N, seabed_friction: %.6g}\n",
          k, cw[k], logu(1.0e5, 1.0e11), logu(1.0e4, 1.0e9), unif(0.0, 1.2));
    }
    W("hull: {position: [%.6g, %.6g], heading: %.6g deg}\nlines:\n", unif(-50, 50), unif(-50, 50),
      unif(-180, 180));
    for (int i = 0; i < nl; i++) {
        double a = 2.0 * M_PI * (i + unif(-0.2, 0.2)) / nl;
        double fr = unif(2.0, 12.0), fz = -unif(0.0, fmin(8.0, 0.5 * depth));
        double chord = hypot(R - fr, depth + fz);
        double len = chord * unif(0.9, 1.8);
        int ns = 1 + pick(4);
        W("  - name: L%d\n    anchor: [%.9g, %.9g]\n    fairlead: [%.9g, %.9g, %.9g]\n"
          "    sections:\n",
          i, R * cos(a), R * sin(a), fr * cos(a), fr * sin(a), fz);
        int prev = -1;
        for (int k = 0; k < ns; k++) {
            int c = pick(3);
            if (k > 0) {
                /* Clumps up to twice, buoys up to half the weight of the
                 * section below them; buoys rare (a buoy in a slack line
                 * is unsupported, and one such line fails the spread). */
                int kind = pick(40);
                double wbelow = cw[prev] * len / ns;
                if (kind < 10)
                    W("      - {clump: %.9g N}\n", wbelow * logu(0.01, 2.0));
                else if (kind == 2)
                    W("      - {buoy: %.9g N}\n", wbelow * logu(0.01, 0.5));
            }
            W("      - {component: c%d, length: %.9g m}\n", c, len / ns);
            prev = c;
        }
    }
#undef W
    return n;
}

static uint64_t spread_hash(const hf_spread_result *r, double K[6][6])
{
    uint64_t h = 0xcbf29ce484222325ULL;
    int st = (int)r->status;
    MIX(h, st);
    h = mix(h, r->force, sizeof r->force);
    h = mix(h, K, 36 * sizeof(double));
    MIX(h, r->max_tension);
    for (size_t i = 0; i < r->nlines; i++)
        h = mix(h, r->line_force[i], sizeof r->line_force[i]);
    return h;
}

/* Solves pose set `k` of spread model m; returns the status, fills hash. */
static hf_status spread_poses(const hf_model *m, double R, uint64_t pseed, int check, long *bad,
                              uint64_t *hash, long *fd_checked)
{
    hf_error err;
    hf_spread *sp = hf_spread_alloc(m, &err);
    if (!sp) {
        (*bad)++;
        return HF_ENOMEM;
    }
    uint64_t h = 0;
    hf_status worst = HF_OK;
    uint64_t rs = pseed;
    for (int p = 0; p < NPOSES; p++) {
        hf_pose pose;
        hf_spread_pose_rest(m, &pose);
        double off[3] = {unif_r(&rs, -0.15, 0.15) * R, unif_r(&rs, -0.15, 0.15) * R,
                         unif_r(&rs, -0.2, 0.2)};
        hf_spread_pose_offset(&pose, off);
        hf_spread_result res;
        double K[6][6];
        hf_status rc = hf_spread_stiffness(sp, &pose, K, &res, &err);
        h = h * 31 + spread_hash(&res, K);
        if (rc != HF_OK && worst == HF_OK)
            worst = rc;
        if (rc == HF_EUNSUPPORTED && getenv("HF_STRESS_VERBOSE"))
            fprintf(stderr, "stress: unsupported: %s\n", err.text);
        int finite = 1;
        for (int i = 0; i < 6; i++) {
            finite &= isfinite(res.force[i]);
            for (int j = 0; j < 6; j++)
                finite &= isfinite(K[i][j]);
        }
        if (!finite || (rc != HF_OK && rc != HF_EUNSUPPORTED)) {
            if (check && *bad < 5)
                fprintf(stderr, "stress: spread pose %d: %s (%s)%s\n", p, hf_status_str(rc),
                        err.text, finite ? "" : ", NaN or Inf in the result");
            (*bad)++;
            continue;
        }
        if (!check || rc != HF_OK)
            continue;
        /* K = -dF/dq (spread.h): central differences in surge, sway and yaw,
         * where no line changes regime within the step. */
        hf_line_regime reg0[16];
        size_t nl = res.nlines < 16 ? res.nlines : 16;
        for (size_t i = 0; i < nl; i++)
            reg0[i] = res.states[i].regime;
        for (int j = 0; j < 3; j++) {
            int col = j == 2 ? 5 : j;
            double rel = getenv("HF_STRESS_STEP") ? atof(getenv("HF_STRESS_STEP")) : 1e-4;
            double step = j == 2 ? rel : rel * R;
            /* F at -h, +h, -h/2, +h/2 */
            double F[4][6];
            int same = 1;
            for (int e = 0; e < 4 && same; e++) {
                double d = (e & 1 ? 1.0 : -1.0) * (e < 2 ? step : 0.5 * step);
                hf_pose q = pose;
                if (j == 0)
                    q.surge += d;
                else if (j == 1)
                    q.sway += d;
                else
                    q.yaw += d;
                hf_spread_result r2;
                if (hf_spread_solve(sp, &q, &r2, &err) != HF_OK) {
                    same = 0;
                    break;
                }
                for (size_t i = 0; i < nl; i++)
                    same &= r2.states[i].regime == reg0[i];
                memcpy(F[e], r2.force, sizeof F[e]);
            }
            if (!same)
                continue;
            double kmax = 0.0, fscale = 0.0;
            for (int i = 0; i < 6; i++) {
                kmax = fmax(kmax, fabs(K[i][col]));
                for (int e = 0; e < 4; e++)
                    fscale = fmax(fscale, fabs(F[e][i]));
            }
            for (int i = 0; i < 6; i++) {
                /* Central differences at h and h/2, Richardson-extrapolated;
                 * their disagreement estimates the truncation error, and the
                 * solver's tolerance (1e-10 relative) over h/2 the noise. */
                double d1 = -(F[1][i] - F[0][i]) / (2.0 * step);
                double d2 = -(F[3][i] - F[2][i]) / step;
                double fd = (4.0 * d2 - d1) / 3.0;
                /* One-sided differences disagree where F has a kink inside
                 * the step (touchdown passing a clump, a section lifting
                 * off): no derivative to compare there. */
                double fwd = -(F[3][i] - res.force[i]) / (0.5 * step);
                double bwd = -(res.force[i] - F[2][i]) / (0.5 * step);
                double tol =
                    1e-4 * kmax + fabs(d1 - d2) + 2.0 * fabs(fwd - bwd) + 1e-8 * fscale / step;
                if (getenv("HF_STRESS_ONLY"))
                    fprintf(stderr, "  pose %d K[%d][%d] = %.12g fd %.12g tol %.3g\n", p, i, col,
                            K[i][col], fd, tol);
                if (fabs(fd - K[i][col]) > tol) {
                    if (*bad < 5)
                        fprintf(stderr,
                                "stress: spread (seed %llu) K[%d][%d] = %.9g, extrapolated "
                                "central difference %.9g\n",
                                (unsigned long long)pseed, i, col, K[i][col], fd);
                    (*bad)++;
                }
            }
            (*fd_checked)++;
        }
    }
    hf_spread_free(sp);
    *hash = h;
    return worst;
}

static void random_spreads(void **state)
{
    (void)state;
    static char text[1 << 16];
    hf_model *models = calloc(NSPREADS, sizeof *models);
    double *radius = calloc(NSPREADS, sizeof *radius);
    spread_outcome *a = calloc(NSPREADS, sizeof *a), *b = calloc(NSPREADS, sizeof *b);
    spread_outcome *c = calloc(NSPREADS, sizeof *c), *d = calloc(NSPREADS, sizeof *d);
    assert_non_null(models);
    assert_non_null(radius);
    assert_non_null(a);
    assert_non_null(b);
    assert_non_null(c);
    assert_non_null(d);
    rng_state = 0x5bead2385ULL;
    long count[HF_STATUS_COUNT] = {0};
    for (int i = 0; i < NSPREADS; i++) {
        size_t n = make_spread_case(text, sizeof text, &radius[i]);
        assert_true(n < sizeof text);
        hf_error err;
        hf_model_init(&models[i]);
        hf_status st = hf_case_load_buffer(text, n, "spread.yaml", &models[i], &err);
        if (st != HF_OK)
            fail_msg("generated spread %d does not load: %s\n%s", i, err.text, text);
    }
    /* Four passes over the same spreads, one workspace per spread so warm
     * starts follow the same path: plain solves serially (a) and on two
     * threads (b) must give the same bits; the checking pass (contract and
     * central differences) serially (c) and on two threads (d) must give the
     * same bits, the same number of difference checks and no failure. */
    const char *only = getenv("HF_STRESS_ONLY");
    long bad_a = 0, bad_b = 0, bad_c = 0, bad_d = 0, fd_a = 0, fd_b = 0, fd_c = 0, fd_d = 0;
    clock_t t0 = clock();
    for (int i = 0; i < NSPREADS; i++) {
        a[i].status =
            spread_poses(&models[i], radius[i], 1000u + (uint64_t)i, 0, &bad_a, &a[i].hash, &fd_a);
        count[a[i].status]++;
    }
    double secs = (double)(clock() - t0) / CLOCKS_PER_SEC;
    for (int i = 0; i < NSPREADS; i++) {
        if (only && 1000 + i != atoi(only))
            continue;
        c[i].status =
            spread_poses(&models[i], radius[i], 1000u + (uint64_t)i, 1, &bad_c, &c[i].hash, &fd_c);
    }
#pragma omp parallel for schedule(dynamic, 3) num_threads(2) reduction(+ : bad_b, fd_b, bad_d, fd_d)
    for (int i = 0; i < NSPREADS; i++) {
        long lb = 0, lf = 0;
        b[i].status =
            spread_poses(&models[i], radius[i], 1000u + (uint64_t)i, 0, &lb, &b[i].hash, &lf);
        bad_b += lb;
        fd_b += lf;
        if (only && 1000 + i != atoi(only))
            continue;
        lb = lf = 0;
        d[i].status =
            spread_poses(&models[i], radius[i], 1000u + (uint64_t)i, 1, &lb, &d[i].hash, &lf);
        bad_d += lb;
        fd_d += lf;
    }
    long mism_ab = 0, mism_cd = 0;
    for (int i = 0; i < NSPREADS; i++) {
        if (a[i].hash != b[i].hash || a[i].status != b[i].status)
            mism_ab++;
        if (c[i].hash != d[i].hash || c[i].status != d[i].status)
            mism_cd++;
    }
    printf("stress: %d random spreads x %d poses (%.2f s): worst status per spread:", NSPREADS,
           NPOSES, secs);
    for (int k = 0; k < HF_STATUS_COUNT; k++)
        if (count[k])
            printf(" %s %ld,", hf_status_str((hf_status)k), count[k]);
    printf(" %ld stiffness columns checked by central differences (%ld on 2 threads); "
           "contract failures %ld, %ld on 2 threads; 1 vs 2 threads mismatches %ld plain, "
           "%ld checking\n",
           fd_c, fd_d, bad_c, bad_d, mism_ab, mism_cd);
    for (int i = 0; i < NSPREADS; i++)
        hf_model_free(&models[i]);
    free(models);
    free(radius);
    free(a);
    free(b);
    free(c);
    free(d);
    int misses = 0;
    misses += expect_zero("plain pass, serial: non-finite results or undocumented statuses", bad_a);
    misses +=
        expect_zero("plain pass, 2 threads: non-finite results or undocumented statuses", bad_b);
    misses += expect_zero("plain pass: difference checks run, serial", fd_a);
    misses += expect_zero("plain pass: difference checks run, 2 threads", fd_b);
    misses += expect_zero("checking pass, serial: contract failures", bad_c);
    misses += expect_zero("checking pass, 2 threads: contract failures", bad_d);
    misses += expect_zero("plain pass: spreads differing between 1 and 2 threads", mism_ab);
    misses += expect_zero("checking pass: spreads differing between 1 and 2 threads", mism_cd);
    misses += expect_equal("difference checks on 2 threads (serial count)", fd_d, fd_c);
    if (!only) /* the difference check really ran: on average over one column per spread */
        misses += expect_at_least("stiffness columns checked by differences", fd_c, NSPREADS);
    fflush(stdout);
    if (misses)
        fail_msg("stress: %d of the spread checks failed (each is listed above)", misses);
}

int main(void)
{
    hf_gsl_handler_install(); /* as main() does: GSL errors become statuses */
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(random_lines),
        cmocka_unit_test(random_spreads),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
