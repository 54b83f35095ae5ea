/* barchain.c - the bar-chain reference model of one line (tests only).
 *
 * See barchain.h for the model.  Layout: nodes 0 (anchor) .. nb (fairlead),
 * bar j joins nodes j and j+1; the unknowns are nodes 1 .. nb-1.  The nodal
 * residual is the sum of the forces on a node:
 *     R_k = T_k e_k - T_{k-1} e_{k-1} + (0, -W_k) + N_k n - F_k t
 * with e_j the unit vector of bar j, W_k the lumped load, n and t the seabed's
 * unit normal and tangent, N_k the penalty contact force and F_k the friction
 * toward the anchor.  Its Jacobian is block tridiagonal (2x2 blocks), solved
 * by block elimination (block Thomas algorithm, e.g. Golub and Van Loan,
 * Matrix Computations, 4th ed., sec. 4.5.1).  Bar stiffness (any structural
 * text): K = dT/dlen e e^T + (T/len)(I - e e^T). */
#include "barchain.h"

#include <float.h>
#include <math.h>
#include <string.h>
#include "holdfast/alloc.h"

typedef struct {
    const hf_line *line;
    size_t nb;
    double sa, ca;   /* sine and cosine of the seabed slope */
    double kpen;     /* penalty stiffness, N/m */
    double kc;       /* compression "stiffness" of a slack bar, N per unit strain */
    double ltot;     /* total unstretched length, m */
    double wabs;     /* total absolute load, N */
    double *mem;     /* one block for every array below */
    int *sec;        /* section of each bar */
    double *l;       /* unstretched bar length, m */
    double *w;       /* node load, N (down positive) */
    double *mu;      /* node friction coefficient */
    double *px, *pz; /* node positions */
    double *qx, *qz; /* saved positions (line search) */
    double *sx, *sz; /* saved positions (continuation) */
    double *t, *dt;  /* bar tension, dT/dlen */
    double *ex, *ez, *len;
    double *k;            /* bar stiffness blocks, 3 per bar (xx, xz, zz) */
    double *ja, *jb, *jc; /* Jacobian blocks per unknown node, 4 each (row major) */
    double *r;            /* residual, 2 per unknown node */
    double *du;           /* Newton step, 2 per unknown node */
    double *binv, *rp;    /* elimination storage */
    double rmax;          /* largest |R| component */
    double phi;           /* sum of R^2 */
    double sig;           /* signature of the set of nodes in contact (sum of their indices^2) */
} chain;

/* ---- the tension-strain law of a section ---- */

static int has_law(const hf_section *s)
{
    return s->strain[0] != 0.0 || s->strain[1] != 0.0 || s->strain[2] != 0.0;
}

/* strain(t) of the polynomial law, extended linearly past t = 1 (C1), and its derivative. */
static double law_eps(const hf_section *s, double t, double *deps)
{
    const double *a = s->strain;
    if (t > 1.0) {
        double d1 = a[0] + 2 * a[1] + 3 * a[2];
        *deps = d1;
        return a[0] + a[1] + a[2] + d1 * (t - 1.0);
    }
    *deps = a[0] + t * (2 * a[1] + 3 * a[2] * t);
    return t * (a[0] + t * (a[1] + t * a[2]));
}

/* Tension (N) of a section at strain eps > 0 and dT/deps: the inverse of the
 * law by safeguarded Newton (bisection inside a bracket). */
static double law_tension(const hf_section *s, double eps, double *dtde)
{
    if (!has_law(s)) {
        *dtde = s->ea;
        return s->ea * eps;
    }
    double lo = 0.0, hi = 1.0, d;
    for (int i = 0; i < 200 && law_eps(s, hi, &d) < eps; i++) {
        lo = hi;
        hi *= 2.0;
    }
    double t = 0.5 * (lo + hi);
    for (int i = 0; i < 200; i++) {
        double f = law_eps(s, t, &d) - eps;
        if (f > 0)
            hi = t;
        else
            lo = t;
        double tn = d > 0 ? t - f / d : 0.5 * (lo + hi);
        if (!(tn > lo && tn < hi))
            tn = 0.5 * (lo + hi);
        if (fabs(tn - t) <= 1e-16 * fmax(t, 1e-300) || hi - lo <= 1e-17 * hi) {
            t = tn;
            break;
        }
        t = tn;
    }
    law_eps(s, t, &d);
    *dtde = s->mbl / fmax(d, 1e-300);
    return t * s->mbl;
}

/* Strain of a section at tension T >= 0 (for the taut start). */
static double section_strain(const hf_section *s, double tension)
{
    double d;
    return has_law(s) ? law_eps(s, tension / s->mbl, &d) : tension / s->ea;
}

/* ---- allocation and set-up ---- */

static void chain_free(chain *c)
{
    hf_free(c->mem);
    hf_free(c->sec);
    memset(c, 0, sizeof *c);
}

static hf_status chain_alloc(chain *c, const hf_line *line, const size_t *m)
{
    memset(c, 0, sizeof *c);
    c->line = line;
    for (size_t i = 0; i < line->n; i++)
        c->nb += m[i];
    size_t nb = c->nb, nn = nb + 1, nu = nb - 1;
    size_t total = 8 * nn + 9 * nb + 22 * nu; /* the arrays below */
    c->mem = hf_calloc(total, sizeof(double));
    c->sec = hf_calloc(nb, sizeof(int));
    if (!c->mem || !c->sec) {
        chain_free(c);
        return HF_ENOMEM;
    }
    double *p = c->mem;
    double **arr[] = {&c->w,  &c->mu, &c->px, &c->pz, &c->qx, &c->qz, &c->sx,
                      &c->sz, &c->l,  &c->t,  &c->dt, &c->ex, &c->ez, &c->len};
    size_t sz[] = {nn, nn, nn, nn, nn, nn, nn, nn, nb, nb, nb, nb, nb, nb};
    for (size_t i = 0; i < sizeof sz / sizeof sz[0]; i++) {
        *arr[i] = p;
        p += sz[i];
    }
    c->k = p, p += 3 * nb;
    c->ja = p, p += 4 * nu;
    c->jb = p, p += 4 * nu;
    c->jc = p, p += 4 * nu;
    c->r = p, p += 2 * nu;
    c->du = p, p += 2 * nu;
    c->binv = p, p += 4 * nu;
    c->rp = p;
    return HF_OK;
}

/* Bar lengths, node loads and node friction from the sections and joints.
 * A node's friction coefficient weights those of the loads it carries (the
 * half-bars' weights with their section's, a clump with its joint's). */
static void chain_fill(chain *c, const size_t *m)
{
    const hf_line *ln = c->line;
    double *wf = c->qx; /* scratch: sum of mu * load per node; c->qz: sum of load */
    size_t j = 0;
    for (size_t i = 0; i < ln->n; i++) {
        const hf_section *s = &ln->sec[i];
        for (size_t b = 0; b < m[i]; b++, j++) {
            c->sec[j] = (int)i;
            c->l[j] = s->length / (double)m[i];
            double half = 0.5 * s->weight * c->l[j];
            c->w[j] += half, c->w[j + 1] += half;
            wf[j] += s->friction * half, wf[j + 1] += s->friction * half;
            c->qz[j] += half, c->qz[j + 1] += half;
        }
        c->ltot += s->length;
        c->wabs += s->weight * s->length;
        if (i + 1 < ln->n) {
            double p = ln->joint[i].load;
            c->w[j] += p;
            c->wabs += fabs(p);
            if (p > 0) /* a buoy touches nothing: what rests on the seabed is the rest */
                wf[j] += ln->joint[i].friction * p, c->qz[j] += p;
        }
    }
    for (size_t k = 0; k <= c->nb; k++) {
        c->mu[k] = c->qz[k] > 0 ? wf[k] / c->qz[k] : 0.0;
        wf[k] = c->qz[k] = 0.0;
    }
    c->sa = sin(ln->slope);
    c->ca = cos(ln->slope);
    c->kc = 1e-5 * c->wabs;
    /* penetration of a node: its load / kpen <= 1e-7 L / nb */
    c->kpen = 1e7 * c->wabs / c->ltot;
}

/* ---- residual and Jacobian ---- */

/* Tension, stiffness and direction of every bar at the current positions. */
static void bars_eval(chain *c)
{
    for (size_t j = 0; j < c->nb; j++) {
        double dx = c->px[j + 1] - c->px[j], dz = c->pz[j + 1] - c->pz[j];
        double len = hypot(dx, dz);
        double eps = len / c->l[j] - 1.0, dtde;
        double tt = eps > 0 ? law_tension(&c->line->sec[c->sec[j]], eps, &dtde)
                            : (dtde = c->kc, c->kc * eps);
        double ex = len > 0 ? dx / len : 1.0, ez = len > 0 ? dz / len : 0.0;
        double kl = dtde / c->l[j], kg = len > 0 ? tt / len : 0.0;
        c->t[j] = tt, c->dt[j] = kl, c->len[j] = len, c->ex[j] = ex, c->ez[j] = ez;
        c->k[3 * j] = kl * ex * ex + kg * (1 - ex * ex);
        c->k[3 * j + 1] = (kl - kg) * ex * ez;
        c->k[3 * j + 2] = kl * ez * ez + kg * (1 - ez * ez);
    }
}

static void blk_set(double *b, const double *k, double s)
{
    b[0] = s * k[0], b[1] = s * k[1], b[2] = s * k[1], b[3] = s * k[2];
}

/* Seabed contact and friction at unknown node k (1-based node index): adds
 * to the residual rk and the blocks b (diagonal) and cc (upper). */
static void node_contact(const chain *c, size_t k, double *rk, double *b, double *cc)
{
    double nx = -c->sa, nz = c->ca, tx = c->ca, tz = c->sa;
    double g = nx * c->px[k] + nz * c->pz[k];
    if (g >= 0)
        return;
    double n = -c->kpen * g;
    rk[0] += n * nx, rk[1] += n * nz;
    b[0] -= c->kpen * nx * nx, b[1] -= c->kpen * nx * nz;
    b[2] -= c->kpen * nz * nx, b[3] -= c->kpen * nz * nz;
    double fmaxf = c->mu[k] * n;
    if (fmaxf <= 0)
        return;
    /* demand along the tangent: the bar above and the node's weight.  Friction
     * takes it up to mu N toward the anchor; toward the fairlead it only holds
     * the node's own weight on a slope (at most mu N), never a compression
     * (a slack grounded stretch passes it on, as a frictionless one would) */
    double d = c->t[k] * (tx * c->ex[k] + tz * c->ez[k]) - c->w[k] * c->sa;
    double lo = fmax(-fmaxf, fmin(0.0, -c->w[k] * c->sa));
    const double *kk = &c->k[3 * k];
    if (d > lo && d < fmaxf) { /* friction holds the node: F = d */
        rk[0] -= d * tx, rk[1] -= d * tz;
        double tk0 = tx * kk[0] + tz * kk[1], tk1 = tx * kk[1] + tz * kk[2]; /* t^T K */
        b[0] += tx * tk0, b[1] += tx * tk1, b[2] += tz * tk0, b[3] += tz * tk1;
        if (cc)
            cc[0] -= tx * tk0, cc[1] -= tx * tk1, cc[2] -= tz * tk0, cc[3] -= tz * tk1;
        return;
    }
    double f = d >= fmaxf ? fmaxf : lo;
    rk[0] -= f * tx, rk[1] -= f * tz;
    double s = d >= fmaxf ? 1.0 : (lo == -fmaxf ? -1.0 : 0.0); /* F = s mu N */
    double q = s * c->mu[k] * c->kpen;
    b[0] += q * tx * nx, b[1] += q * tx * nz, b[2] += q * tz * nx, b[3] += q * tz * nz;
}

/* Residual and Jacobian blocks at the current positions. */
static void assemble(chain *c)
{
    bars_eval(c);
    size_t nu = c->nb - 1;
    c->rmax = 0.0, c->phi = 0.0, c->sig = 0.0;
    for (size_t i = 0; i < nu; i++) {
        size_t k = i + 1;
        double *rk = &c->r[2 * i], *a = &c->ja[4 * i], *b = &c->jb[4 * i], *cc = &c->jc[4 * i];
        rk[0] = c->t[k] * c->ex[k] - c->t[k - 1] * c->ex[k - 1];
        rk[1] = c->t[k] * c->ez[k] - c->t[k - 1] * c->ez[k - 1] - c->w[k];
        blk_set(a, &c->k[3 * (k - 1)], 1.0);
        blk_set(cc, &c->k[3 * k], 1.0);
        b[0] = -c->k[3 * k] - c->k[3 * (k - 1)];
        b[1] = b[2] = -c->k[3 * k + 1] - c->k[3 * (k - 1) + 1];
        b[3] = -c->k[3 * k + 2] - c->k[3 * (k - 1) + 2];
        node_contact(c, k, rk, b, i + 1 < nu ? cc : NULL);
        c->rmax = fmax(c->rmax, fmax(fabs(rk[0]), fabs(rk[1])));
        if (-c->sa * c->px[k] + c->ca * c->pz[k] < 0)
            c->sig += (double)k * (double)k;
        c->phi += rk[0] * rk[0] + rk[1] * rk[1];
    }
}

static int inv2(const double *m, double *o)
{
    double det = m[0] * m[3] - m[1] * m[2];
    double sc = fabs(m[0] * m[3]) + fabs(m[1] * m[2]);
    if (!(fabs(det) > 1e-15 * sc) || !isfinite(det))
        return 0;
    o[0] = m[3] / det, o[1] = -m[1] / det, o[2] = -m[2] / det, o[3] = m[0] / det;
    return 1;
}

static void mul2(const double *a, const double *b, double *o)
{
    double t0 = a[0] * b[0] + a[1] * b[2], t1 = a[0] * b[1] + a[1] * b[3];
    double t2 = a[2] * b[0] + a[3] * b[2], t3 = a[2] * b[1] + a[3] * b[3];
    o[0] = t0, o[1] = t1, o[2] = t2, o[3] = t3;
}

/* Solves J du = -R by block elimination.  Returns 0 on a singular pivot block. */
static int step_solve(chain *c)
{
    size_t nu = c->nb - 1;
    double bp[4], lm[4], t[4];
    for (size_t i = 0; i < nu; i++) {
        memcpy(bp, &c->jb[4 * i], sizeof bp);
        double r0 = -c->r[2 * i], r1 = -c->r[2 * i + 1];
        if (i > 0) {
            mul2(&c->ja[4 * i], &c->binv[4 * (i - 1)], lm); /* L = A B'^-1 */
            mul2(lm, &c->jc[4 * (i - 1)], t);
            for (int q = 0; q < 4; q++)
                bp[q] -= t[q];
            const double *rq = &c->rp[2 * (i - 1)];
            r0 -= lm[0] * rq[0] + lm[1] * rq[1];
            r1 -= lm[2] * rq[0] + lm[3] * rq[1];
        }
        if (!inv2(bp, &c->binv[4 * i]))
            return 0;
        c->rp[2 * i] = r0, c->rp[2 * i + 1] = r1;
    }
    for (size_t i = nu; i-- > 0;) {
        double r0 = c->rp[2 * i], r1 = c->rp[2 * i + 1];
        if (i + 1 < nu) {
            const double *cc = &c->jc[4 * i], *d = &c->du[2 * (i + 1)];
            r0 -= cc[0] * d[0] + cc[1] * d[1];
            r1 -= cc[2] * d[0] + cc[3] * d[1];
        }
        const double *bi = &c->binv[4 * i];
        c->du[2 * i] = bi[0] * r0 + bi[1] * r1;
        c->du[2 * i + 1] = bi[2] * r0 + bi[3] * r1;
    }
    return 1;
}

/* ---- Newton and continuation ---- */

static void copy_pos(const chain *c, double *dx, double *dz, const double *sx, const double *sz)
{
    memcpy(dx, sx, (c->nb + 1) * sizeof(double));
    memcpy(dz, sz, (c->nb + 1) * sizeof(double));
}

/* Converged: nodal forces balanced to 1e-11 of the line's total load, or to
 * rounding of the largest bar tension. */
static int converged(const chain *c)
{
    double tmax = 0.0, kmax = 0.0;
    for (size_t j = 0; j < c->nb; j++)
        tmax = fmax(tmax, fabs(c->t[j])), kmax = fmax(kmax, c->dt[j]);
    /* rounding of the node coordinates (an ulp of the line's size) times the
     * stiffest bar's dT/dlen: the floor below which the residual is noise */
    double floor = 1e-13 * tmax + 8 * DBL_EPSILON * kmax * (c->ltot + c->px[c->nb]);
    return c->rmax <= fmax(1e-11 * c->wabs, floor);
}

/* Newton from the current positions, every step capped so that no node
 * moves more than half the mean bar length (a trust region on displacement):
 * the residual is only piecewise smooth (seabed contact, friction, slack
 * bars), so a merit-function line search would stall at the kinks, while
 * capped full steps settle on the right contact set (semi-smooth Newton).
 * Returns 1 when converged. */
static int newton(chain *c, int maxit, int *iters)
{
    size_t nu = c->nb - 1;
    double lmin = 0.5 * c->ltot / (double)c->nb; /* half the mean bar */
    assemble(c);
    for (int it = 0; it < maxit; it++) {
        if (converged(c))
            return 1;
        if (!step_solve(c))
            return 0;
        (*iters)++;
        double lam = 1.0, big = 0.0;
        for (size_t i = 0; i < nu; i++)
            big = fmax(big, hypot(c->du[2 * i], c->du[2 * i + 1]));
        if (big > lmin)
            lam = lmin / big;
        for (size_t i = 0; i < nu; i++)
            c->px[i + 1] += lam * c->du[2 * i], c->pz[i + 1] += lam * c->du[2 * i + 1];
        assemble(c);
        if (!isfinite(c->phi))
            return 0;
        if (big * lam < 1e-15 * c->ltot && c->rmax <= 1e-7 * c->wabs)
            return 1; /* rounding floor */
    }
    return converged(c);
}

/* Straight line from the anchor to (fx, fz), nodes spaced by unstretched length. */
static void place_straight(chain *c, double fx, double fz)
{
    double s = 0.0;
    c->px[0] = c->pz[0] = 0.0;
    for (size_t j = 0; j < c->nb; j++) {
        s += c->l[j];
        c->px[j + 1] = fx * s / c->ltot;
        c->pz[j + 1] = fz * s / c->ltot;
    }
    c->px[c->nb] = fx, c->pz[c->nb] = fz;
    /* a straight line lying on the seabed (laid): each loaded node sunk by
     * its expected penetration, so it starts in contact, not about to fall */
    for (size_t k = 1; k < c->nb; k++)
        if (-c->sa * c->px[k] + c->ca * c->pz[k] <= 1e-9 * c->ltot && c->w[k] > 0) {
            double sink = c->w[k] * c->ca / c->kpen;
            c->px[k] -= -c->sa * sink, c->pz[k] -= c->ca * sink;
        }
}

/* Moves the fairlead to (fx, fz) and the other nodes by the tangent
 * predictor: J du = -(dR/dp_fairlead) dP, with J assembled at the current
 * (converged) positions.  Returns 0 if J is singular (nodes unmoved). */
static int move_fairlead(chain *c, double fx, double fz)
{
    size_t nu = c->nb - 1, top = c->nb - 1;
    double dx = fx - c->px[c->nb], dz = fz - c->pz[c->nb];
    const double *k = &c->k[3 * top];
    memset(c->r, 0, 2 * nu * sizeof(double));
    c->r[2 * (nu - 1)] = k[0] * dx + k[1] * dz;
    c->r[2 * (nu - 1) + 1] = k[1] * dx + k[2] * dz;
    int ok = step_solve(c);
    for (size_t i = 0; ok && i < nu; i++)
        c->px[i + 1] += c->du[2 * i], c->pz[i + 1] += c->du[2 * i + 1];
    c->px[c->nb] = fx, c->pz[c->nb] = fz;
    return ok;
}

/* From a taut straight line (tension 5x the total load, less if that would
 * stretch a section by more than 1 %; or the target if it is tauter) to the
 * fairlead at (x, z) in adaptive steps. */
static hf_status continuation(chain *c, double x, double z, int *iters, int *steps)
{
    const hf_line *ln = c->line;
    double d = hypot(x, z), d0 = 0.0, t0 = 5.0 * c->wabs;
    for (size_t i = 0; i < ln->n; i++) /* at most 1 % strain in any section */
        while (section_strain(&ln->sec[i], t0) > 0.01 && t0 > 1e-6 * c->wabs)
            t0 *= 0.5;
    for (size_t i = 0; i < ln->n; i++)
        d0 += ln->sec[i].length * (1.0 + section_strain(&ln->sec[i], t0));
    if (d0 < d)
        d0 = d;
    double x0 = x / d * d0, z0 = z / d * d0;
    place_straight(c, x0, z0);
    if (!newton(c, 200, iters))
        return HF_ENOCONV;
    double s = 0.0, ds = d0 > d ? 0.05 : 1.0;
    while (s < 1.0) {
        double s1 = fmin(1.0, s + ds);
        copy_pos(c, c->sx, c->sz, c->px, c->pz);
        int before = *iters;
        if (move_fairlead(c, x0 + (x - x0) * s1, z0 + (z - z0) * s1) && newton(c, 40, iters)) {
            s = s1, (*steps)++;
            if (*iters - before < 8)
                ds = fmin(1.5 * ds, 0.25);
        } else {
            copy_pos(c, c->px, c->pz, c->sx, c->sz);
            assemble(c);
            ds *= 0.5;
            if (ds < 1e-7)
                return HF_ENOCONV;
        }
    }
    return HF_OK;
}

/* ---- results and the public functions ---- */

void barchain_result_free(barchain_result *r)
{
    if (!r)
        return;
    hf_free(r->x);
    hf_free(r->z);
    hf_free(r->tension);
    r->x = r->z = r->tension = NULL;
}

static hf_status result_fill(const chain *c, barchain_result *out)
{
    size_t nb = c->nb, nn = nb + 1;
    barchain_result_free(out);
    memset(out, 0, sizeof *out);
    out->x = hf_malloc(nn * sizeof(double));
    out->z = hf_malloc(nn * sizeof(double));
    out->tension = hf_malloc(nb * sizeof(double));
    if (!out->x || !out->z || !out->tension) {
        barchain_result_free(out);
        return HF_ENOMEM;
    }
    memcpy(out->x, c->px, nn * sizeof(double));
    memcpy(out->z, c->pz, nn * sizeof(double));
    memcpy(out->tension, c->t, nb * sizeof(double));
    out->bars = nb, out->nodes = nn;
    size_t top = nb - 1;
    out->h = c->t[top] * c->ex[top];
    out->v = c->t[top] * c->ez[top] + c->w[nb];
    out->anchor_h = c->t[0] * c->ex[0];
    out->anchor_v = c->t[0] * c->ez[0] - c->w[0];
    out->residual = c->rmax;
    /* grounded: nodes touching the seabed (the anchor always does) */
    double gtol = 1e-8 * c->ltot;
    int prev = 1;
    out->contacts = 1;
    out->z_max = 0.0;
    for (size_t k = 1; k <= nb; k++) {
        double g = -c->sa * c->px[k] + c->ca * c->pz[k];
        int on = k < nb && g <= gtol;
        if (on && prev)
            out->grounded += c->l[k - 1];
        if (on && !prev)
            out->contacts++;
        prev = on;
        out->z_max = fmax(out->z_max, c->pz[k]);
    }
    return HF_OK;
}

static hf_status check_input(const hf_line *line, double x, double z)
{
    if (!line || line->n < 1 || line->n > HF_LINE_MAX_SECTIONS || !isfinite(x) || !isfinite(z) ||
        x < 0 || !(fabs(line->slope) < 0.5) || hypot(x, z) <= 0)
        return HF_EINVAL;
    if (z < x * tan(line->slope)) /* the fairlead below the seabed */
        return HF_EINVAL;
    for (size_t i = 0; i < line->n; i++) {
        const hf_section *s = &line->sec[i];
        if (!(s->length > 0) || !(s->weight > 0) || !(s->ea > 0) || !(s->mbl > 0) ||
            !(s->friction >= 0) || !isfinite(s->ea))
            return HF_EINVAL;
    }
    return HF_OK;
}

static void bars_per_section(const hf_line *line, size_t bars, size_t *m)
{
    double ltot = hf_line_length(line);
    for (size_t i = 0; i < line->n; i++) {
        double q = ceil((double)bars * line->sec[i].length / ltot);
        m[i] = q < 4 ? 4 : (size_t)q;
    }
}

/* Solves one level; (x0, z0, n0) a coarser solution with half the bars per
 * section to start from (its nodes kept, new ones at bar midpoints), or NULL. */
static hf_status solve_level(const hf_line *line, double x, double z, const size_t *m,
                             const barchain_result *from, barchain_result *out)
{
    chain c;
    hf_status st = chain_alloc(&c, line, m);
    if (st != HF_OK)
        return st;
    chain_fill(&c, m);
    int iters = 0, steps = 0, ok = 0;
    if (from && from->nodes == c.nb / 2 + 1) {
        for (size_t k = 0; k < from->nodes; k++) {
            c.px[2 * k] = from->x[k], c.pz[2 * k] = from->z[k];
            if (k + 1 < from->nodes)
                c.px[2 * k + 1] = 0.5 * (from->x[k] + from->x[k + 1]),
                             c.pz[2 * k + 1] = 0.5 * (from->z[k] + from->z[k + 1]);
        }
        ok = newton(&c, 60, &iters);
    }
    if (!ok)
        st = continuation(&c, x, z, &iters, &steps);
    if (st == HF_OK)
        st = result_fill(&c, out);
    if (st == HF_OK)
        out->iterations = iters, out->steps = steps;
    chain_free(&c);
    return st;
}

hf_status barchain_solve(const hf_line *line, double x, double z, size_t bars, barchain_result *out)
{
    hf_status st = check_input(line, x, z);
    if (st != HF_OK || bars < 2)
        return HF_EINVAL;
    size_t m[HF_LINE_MAX_SECTIONS];
    bars_per_section(line, bars, m);
    return solve_level(line, x, z, m, NULL, out);
}

void barchain_refined_free(barchain_refined *r)
{
    if (r)
        barchain_result_free(&r->fine);
}

hf_status barchain_refine(const hf_line *line, double x, double z, size_t n, barchain_refined *out)
{
    hf_status st = check_input(line, x, z);
    if (st != HF_OK || n < 2)
        return HF_EINVAL;
    size_t m[HF_LINE_MAX_SECTIONS];
    bars_per_section(line, n, m);
    barchain_result lv[3];
    memset(lv, 0, sizeof lv);
    for (int q = 0; q < 3 && st == HF_OK; q++) {
        st = solve_level(line, x, z, m, q ? &lv[q - 1] : NULL, &lv[q]);
        for (size_t i = 0; i < line->n; i++)
            m[i] *= 2;
    }
    if (st == HF_OK) {
        barchain_refined_free(out);
        memset(out, 0, sizeof *out);
        out->h = lv[2].h, out->v = lv[2].v;
        out->h_err = fabs(lv[2].h - lv[1].h), out->v_err = fabs(lv[2].v - lv[1].v);
        /* Richardson extrapolation, order 2 (Richardson 1911; any numerical analysis text) */
        out->h_rich = lv[2].h + (lv[2].h - lv[1].h) / 3.0;
        out->v_rich = lv[2].v + (lv[2].v - lv[1].v) / 3.0;
        out->anchor_h = lv[2].anchor_h, out->anchor_v = lv[2].anchor_v;
        double dh1 = fabs(lv[0].h - lv[1].h), dh2 = out->h_err;
        double dv1 = fabs(lv[0].v - lv[1].v), dv2 = out->v_err;
        double d1 = dh1 > dv1 ? dh1 : dv1, d2 = dh1 > dv1 ? dh2 : dv2;
        out->order = d2 > 0 && d1 > 0 ? log2(d1 / d2) : NAN;
        out->fine = lv[2];
        lv[2].x = lv[2].z = lv[2].tension = NULL;
    }
    for (int q = 0; q < 3; q++)
        barchain_result_free(&lv[q]);
    return st;
}
