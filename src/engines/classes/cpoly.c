#include "hash.h"
#include "cpoly.h"

#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>

#include "util.h"

void cpoly_init(cpoly *P, slong g, slong n, slong max_terms, const fmpq_mpoly_ctx_t ctx)
{
    memset(P, 0, sizeof(cpoly));
    P->g = g;
    P->n = n;
    P->D = 3 * g - 3 + n;
    P->nexp = n + (P->D > 0 ? P->D : 0);
    P->max_terms = max_terms;
    P->ctx = ctx;
}

void cpoly_init_degree(cpoly *P, slong g, slong n, slong D, slong max_terms, const fmpq_mpoly_ctx_t ctx)
{
    cpoly_init(P, g, n, max_terms, ctx);
    P->D = D;
    P->nexp = n + (D > 0 ? D : 0);
}

void cpoly_init_hodge(cpoly *P, slong g, slong n, slong max_terms, const fmpq_mpoly_ctx_t ctx)
{
    cpoly_init(P, g, n, max_terms, ctx);
    P->hodge = 1;
    P->nexp += g + (P->D > 0 ? P->D : 0);
}

/* An empty polynomial on the same space, with the same truncation degree and
   the same slots as Q (the Hodge slots, or a degree set by cpoly_init_degree). */
static void cpoly_init_like(cpoly *P, const cpoly *Q)
{
    cpoly_init(P, Q->g, Q->n, Q->max_terms, Q->ctx);
    P->D = Q->D;
    P->nexp = Q->nexp;
    P->hodge = Q->hodge;
}

static void cpoly_free_terms(cpoly *P)
{
    for (slong i = 0; i < P->len; i++)
        fmpq_mpoly_clear(P->coeffs + i, P->ctx);
    free(P->exps);
    free(P->deg);
    free(P->coeffs);
    free(P->slots);
    P->exps = NULL;
    P->deg = NULL;
    P->coeffs = NULL;
    P->slots = NULL;
    P->len = P->alloc = P->nslots = 0;
}

void cpoly_clear(cpoly *P)
{
    cpoly_free_terms(P);
}

/* Moves the terms of src into dst (same space), leaving src empty. */
static void cpoly_swap(cpoly *a, cpoly *b)
{
    cpoly t = *a;
    *a = *b;
    *b = t;
}

static const cpoly_exp *cpoly_term_exps(const cpoly *P, slong i)
{
    return P->exps + i * P->nexp;
}

static ulong cpoly_hash(const cpoly_exp *e, slong nexp)
{
    return hash_bytes((const unsigned char *)e, (size_t)nexp * sizeof(cpoly_exp));
}

static void cpoly_rehash(cpoly *P, slong nslots)
{
    free(P->slots);
    P->nslots = nslots;
    P->slots = xmalloc(nslots * sizeof(slong));
    for (slong s = 0; s < nslots; s++)
        P->slots[s] = -1;
    for (slong i = 0; i < P->len; i++) {
        ulong s = cpoly_hash(cpoly_term_exps(P, i), P->nexp) & (ulong)(nslots - 1);
        while (P->slots[s] >= 0)
            s = (s + 1) & (ulong)(nslots - 1);
        P->slots[s] = i;
    }
}

/* Index of the term with exponents e, creating a zero term when absent;
   -1 when that would pass max_terms. */
static slong cpoly_find_or_add(cpoly *P, const cpoly_exp *e, slong deg)
{
    if (2 * (P->len + 1) > P->nslots)
        cpoly_rehash(P, P->nslots ? 2 * P->nslots : 16);
    ulong mask = (ulong)(P->nslots - 1);
    ulong s = cpoly_hash(e, P->nexp) & mask;
    size_t bytes = P->nexp * sizeof(cpoly_exp);
    for (; P->slots[s] >= 0; s = (s + 1) & mask)
        if (memcmp(cpoly_term_exps(P, P->slots[s]), e, bytes) == 0)
            return P->slots[s];
    if (P->max_terms > 0 && P->len >= P->max_terms)
        return -1;
    if (P->len == P->alloc) {
        P->alloc = P->alloc ? 2 * P->alloc : 8;
        P->exps = xrealloc(P->exps, P->alloc * bytes + 1);
        P->deg = xrealloc(P->deg, P->alloc * sizeof(slong));
        P->coeffs = xrealloc(P->coeffs, P->alloc * sizeof(fmpq_mpoly_struct));
    }
    slong i = P->len++;
    memcpy(P->exps + i * P->nexp, e, bytes);
    P->deg[i] = deg;
    fmpq_mpoly_init(P->coeffs + i, P->ctx);
    P->slots[s] = i;
    return i;
}

/* P += c * monomial(e); returns CPOLY_TOO_BIG when the term count limit is hit. */
static int cpoly_add_term(cpoly *P, const cpoly_exp *e, slong deg, const fmpq_mpoly_t c)
{
    if (deg > P->D || fmpq_mpoly_is_zero(c, P->ctx))
        return CPOLY_OK;
    slong i = cpoly_find_or_add(P, e, deg);
    if (i < 0)
        return CPOLY_TOO_BIG;
    fmpq_mpoly_add(P->coeffs + i, P->coeffs + i, c, P->ctx);
    return CPOLY_OK;
}

/* Drops the terms whose coefficients cancelled, keeping the index valid. */
static void cpoly_compact(cpoly *P)
{
    slong j = 0;
    for (slong i = 0; i < P->len; i++) {
        if (fmpq_mpoly_is_zero(P->coeffs + i, P->ctx)) {
            fmpq_mpoly_clear(P->coeffs + i, P->ctx);
            continue;
        }
        if (i != j) {
            memmove(P->exps + j * P->nexp, P->exps + i * P->nexp, P->nexp * sizeof(cpoly_exp));
            P->deg[j] = P->deg[i];
            P->coeffs[j] = P->coeffs[i];
        }
        j++;
    }
    P->len = j;
    if (P->nslots)
        cpoly_rehash(P, P->nslots);
}

static int cpoly_set_scalar(cpoly *P, const fmpq_mpoly_t c)
{
    cpoly_exp *zero = xcalloc(P->nexp + 1, sizeof(cpoly_exp));
    int rc = cpoly_add_term(P, zero, 0, c);
    free(zero);
    return rc;
}

/* Sets P (empty) to the single generator of slot `slot` and degree `deg`. */
static int cpoly_set_gen(cpoly *P, slong slot, slong deg)
{
    cpoly_exp *e = xcalloc(P->nexp + 1, sizeof(cpoly_exp));
    fmpq_mpoly_t one;
    fmpq_mpoly_init(one, P->ctx);
    fmpq_mpoly_one(one, P->ctx);
    e[slot] = 1;
    int rc = cpoly_add_term(P, e, deg, one);
    fmpq_mpoly_clear(one, P->ctx);
    free(e);
    return rc;
}

/* R = A + B (R empty on entry). */
static int cpoly_add(cpoly *R, const cpoly *A, const cpoly *B)
{
    const cpoly *src[2] = {A, B};
    for (int k = 0; k < 2; k++)
        for (slong i = 0; i < src[k]->len; i++) {
            int rc = cpoly_add_term(R, cpoly_term_exps(src[k], i), src[k]->deg[i], src[k]->coeffs + i);
            if (rc)
                return rc;
        }
    cpoly_compact(R);
    return CPOLY_OK;
}

/* R = A * B truncated above degree D (R empty on entry). */
static int cpoly_mul(cpoly *R, const cpoly *A, const cpoly *B)
{
    cpoly_exp *e = xmalloc((R->nexp + 1) * sizeof(cpoly_exp));
    fmpq_mpoly_t c;
    fmpq_mpoly_init(c, R->ctx);
    int rc = CPOLY_OK;
    for (slong i = 0; i < A->len && rc == CPOLY_OK; i++)
        for (slong j = 0; j < B->len && rc == CPOLY_OK; j++) {
            slong deg = A->deg[i] + B->deg[j];
            if (deg > R->D)
                continue;
            const cpoly_exp *a = cpoly_term_exps(A, i), *b = cpoly_term_exps(B, j);
            for (slong k = 0; k < R->nexp; k++)
                e[k] = (cpoly_exp)(a[k] + b[k]);
            fmpq_mpoly_mul(c, A->coeffs + i, B->coeffs + j, R->ctx);
            rc = cpoly_add_term(R, e, deg, c);
        }
    fmpq_mpoly_clear(c, R->ctx);
    free(e);
    cpoly_compact(R);
    return rc;
}

/* P *= c / d for a rational constant, in place. */
static void cpoly_scale_ui(cpoly *P, ulong d)
{
    for (slong i = 0; i < P->len; i++)
        fmpq_mpoly_scalar_div_ui(P->coeffs + i, P->coeffs + i, d, P->ctx);
}

static int cpoly_has_constant(const cpoly *P)
{
    for (slong i = 0; i < P->len; i++)
        if (P->deg[i] == 0)
            return 1;
    return 0;
}

static int cpoly_expand_rec(cpoly *P, const cx *e, const cx **bad);

/* P = A^k by repeated multiplication: truncation keeps every step small. */
static int cpoly_expand_pow(cpoly *P, const cx *e, const cx **bad)
{
    cpoly A, T;
    cpoly_init_like(&A, P);
    int rc = cpoly_expand_rec(&A, e->a, bad);
    fmpq_mpoly_t one;
    fmpq_mpoly_init(one, P->ctx);
    fmpq_mpoly_one(one, P->ctx);
    if (rc == CPOLY_OK)
        rc = cpoly_set_scalar(P, one);
    fmpq_mpoly_clear(one, P->ctx);
    int nilpotent = !cpoly_has_constant(&A);
    ulong k = nilpotent && e->index > P->D + 1 ? (ulong)P->D + 1 : (ulong)e->index;
    /* square and multiply: O(log k) truncated products even for huge k */
    for (int bit = FLINT_BITS - 1; bit >= 0 && rc == CPOLY_OK; bit--) {
        cpoly_init_like(&T, P);
        rc = cpoly_mul(&T, P, P);
        cpoly_swap(P, &T);
        cpoly_clear(&T);
        if (rc == CPOLY_OK && ((k >> bit) & 1)) {
            cpoly_init_like(&T, P);
            rc = cpoly_mul(&T, P, &A);
            cpoly_swap(P, &T);
            cpoly_clear(&T);
        }
    }
    if (rc == CPOLY_TOO_BIG)
        *bad = e;
    cpoly_clear(&A);
    return rc;
}

/* P = exp(A) = sum_k A^k/k!, which is finite because A has no degree-0 part. */
static int cpoly_expand_exp(cpoly *P, const cx *e, const cx **bad)
{
    cpoly A, term, T;
    cpoly_init_like(&A, P);
    int rc = cpoly_expand_rec(&A, e->a, bad);
    if (rc == CPOLY_OK && cpoly_has_constant(&A)) {
        *bad = e;
        rc = CPOLY_EXP_CONSTANT;
    }
    fmpq_mpoly_t one;
    fmpq_mpoly_init(one, P->ctx);
    fmpq_mpoly_one(one, P->ctx);
    cpoly_init_like(&term, P);
    if (rc == CPOLY_OK)
        rc = cpoly_set_scalar(&term, one);
    for (slong k = 1; rc == CPOLY_OK && term.len > 0; k++) {
        cpoly_init_like(&T, P);
        rc = cpoly_add(&T, P, &term);
        cpoly_swap(P, &T);
        cpoly_clear(&T);
        cpoly_init_like(&T, P);
        if (rc == CPOLY_OK)
            rc = cpoly_mul(&T, &term, &A);
        cpoly_scale_ui(&T, (ulong)k);
        cpoly_swap(&term, &T);
        cpoly_clear(&T);
    }
    if (rc == CPOLY_TOO_BIG && !*bad)
        *bad = e;
    fmpq_mpoly_clear(one, P->ctx);
    cpoly_clear(&term);
    cpoly_clear(&A);
    return rc;
}

static atomic_int *cpoly_cancel;

void cpoly_set_cancel(atomic_int *flag)
{
    cpoly_cancel = flag;
}

/* A chain of sums or products, operand by operand in a loop: sum[] and prod[]
   build chains far longer than the C stack could recurse through. */
static int cpoly_expand_binary(cpoly *P, const cx *e, const cx **bad)
{
    const cx **ops;
    slong n = cx_chain(e, e->kind, &ops);
    int rc = cpoly_expand_rec(P, ops[0], bad);
    for (slong i = 1; i < n && rc == CPOLY_OK; i++) {
        if ((i & 255) == 0 && cpoly_cancel && *cpoly_cancel) {   /* chains of 10^6 take seconds */
            rc = CPOLY_CANCELLED;
            break;
        }
        cpoly B, T;
        cpoly_init_like(&B, P);
        cpoly_init_like(&T, P);
        rc = cpoly_expand_rec(&B, ops[i], bad);
        if (rc == CPOLY_OK)
            rc = e->kind == CX_ADD ? cpoly_add(&T, P, &B) : cpoly_mul(&T, P, &B);
        if (rc == CPOLY_OK)
            cpoly_swap(P, &T);
        cpoly_clear(&B);
        cpoly_clear(&T);
    }
    if (rc == CPOLY_TOO_BIG && !*bad)
        *bad = e;
    free(ops);
    return rc;
}

static int cpoly_expand_kappa(cpoly *P, const cx *e)
{
    if (e->index > 0)
        return e->index > P->D ? CPOLY_OK : cpoly_set_gen(P, P->n + e->index - 1, e->index);
    /* kappa_0 = 2g-2+n, Arbarello-Cornalba convention. */
    fmpq_mpoly_t c;
    fmpq_mpoly_init(c, P->ctx);
    fmpq_mpoly_set_si(c, 2 * P->g - 2 + P->n, P->ctx);
    int rc = cpoly_set_scalar(P, c);
    fmpq_mpoly_clear(c, P->ctx);
    return rc;
}

/* lambda_0 = 1, lambda_j = 0 above the rank g, ch_0 = g, ch_{2k} = 0 (Mumford); the rest are
   generators in the Hodge slots (none above the dimension). */
static int cpoly_expand_hodge(cpoly *P, const cx *e, const cx **bad)
{
    slong j = e->index, D = P->D > 0 ? P->D : 0;
    fmpq_mpoly_t c;
    int rc;
    if (!P->hodge) {
        *bad = e;
        return CPOLY_HODGE;
    }
    if (j > 0) {
        if (j > D || (e->kind == CX_LAMBDA && j > P->g) || (e->kind == CX_CH && j % 2 == 0))
            return CPOLY_OK;
        return cpoly_set_gen(P, P->n + D + (e->kind == CX_LAMBDA ? 0 : P->g) + j - 1, j);
    }
    fmpq_mpoly_init(c, P->ctx);
    fmpq_mpoly_set_si(c, e->kind == CX_LAMBDA ? 1 : P->g, P->ctx);
    rc = cpoly_set_scalar(P, c);
    fmpq_mpoly_clear(c, P->ctx);
    return rc;
}

static int cpoly_expand_rec(cpoly *P, const cx *e, const cx **bad)
{
    if (util_stack_exhausted()) {
        *bad = e;
        return CPOLY_TOO_DEEP;
    }
    switch (e->kind) {
    case CX_SCALAR:
        return cpoly_set_scalar(P, e->scalar);
    case CX_PSI:
        if (e->index < 1 || e->index > P->n) {
            *bad = e;
            return CPOLY_PSI_RANGE;
        }
        return P->D >= 1 ? cpoly_set_gen(P, e->index - 1, 1) : CPOLY_OK;
    case CX_KAPPA:
        return cpoly_expand_kappa(P, e);
    case CX_ADD:
    case CX_MUL:
        return cpoly_expand_binary(P, e, bad);
    case CX_POW:
        return cpoly_expand_pow(P, e, bad);
    case CX_EXP:
        return cpoly_expand_exp(P, e, bad);
    case CX_THETA:        /* Theta is split off before expansion (theta_lang.c) */
        *bad = e;
        return CPOLY_THETA;
    case CX_LAMBDA:
    case CX_CH:
        return cpoly_expand_hodge(P, e, bad);
    case CX_BOUNDARY:
    case CX_STRATUM:      /* boundary factors are split off before expansion (strata_class.c) */
        *bad = e;
        return CPOLY_BOUNDARY;
    }
    return CPOLY_OK;
}

int cpoly_expand(cpoly *P, const cx *e, const cx **bad)
{
    *bad = NULL;
    return cpoly_expand_rec(P, e, bad);
}

/* Unpacks term i into psi exponents and kappa multiplicities (kmult[1..D]). */
static slong cpoly_unpack(const cpoly *P, slong i, slong *psi, slong *kmult)
{
    const cpoly_exp *e = cpoly_term_exps(P, i);
    slong kmax = 0;
    for (slong k = 0; k < P->n; k++)
        psi[k] = e[k];
    kmult[0] = 0;
    for (slong j = 1; j <= P->D; j++) {
        kmult[j] = e[P->n + j - 1];
        if (kmult[j])
            kmax = j;
    }
    return kmax;
}

int cpoly_foreach_top(const cpoly *P, cpoly_term_fn f, void *data)
{
    slong *psi = xmalloc((P->n + 1) * sizeof(slong));
    slong *kmult = xmalloc((P->D + 2) * sizeof(slong));
    int rc = 0;
    for (slong i = 0; i < P->len && rc == 0; i++) {
        if (P->deg[i] != P->D || fmpq_mpoly_is_zero(P->coeffs + i, P->ctx))
            continue;
        slong kmax = cpoly_unpack(P, i, psi, kmult);
        rc = f(data, psi, P->n, kmult, kmax, P->coeffs + i);
    }
    free(psi);
    free(kmult);
    return rc;
}

/* Unpacks the Hodge slots of term i into lmult[0..g] and cmult[0..D]; sets their maxima. */
static void cpoly_unpack_hodge(const cpoly *P, slong i, slong *lmult, slong *lmax, slong *cmult, slong *cmax)
{
    const cpoly_exp *e = cpoly_term_exps(P, i) + P->n + P->D;
    *lmax = *cmax = 0;
    lmult[0] = cmult[0] = 0;
    for (slong j = 1; j <= P->g; j++)
        if ((lmult[j] = e[j - 1]) != 0)
            *lmax = j;
    for (slong k = 1; k <= P->D; k++)
        if ((cmult[k] = e[P->g + k - 1]) != 0)
            *cmax = k;
}

int cpoly_foreach_top_hodge(const cpoly *P, cpoly_hodge_term_fn f, void *data)
{
    slong *psi = xmalloc((P->n + 1) * sizeof(slong));
    slong *kmult = xmalloc((P->D + 2) * sizeof(slong));
    slong *lmult = xmalloc((P->g + 2) * sizeof(slong));
    slong *cmult = xmalloc((P->D + 2) * sizeof(slong));
    int rc = 0;
    for (slong i = 0; i < P->len && rc == 0 && P->hodge; i++) {
        slong lmax, cmax;
        if (P->deg[i] != P->D || fmpq_mpoly_is_zero(P->coeffs + i, P->ctx))
            continue;
        slong kmax = cpoly_unpack(P, i, psi, kmult);
        cpoly_unpack_hodge(P, i, lmult, &lmax, cmult, &cmax);
        rc = f(data, psi, P->n, kmult, kmax, lmult, lmax, cmult, cmax, P->coeffs + i);
    }
    free(psi);
    free(kmult);
    free(lmult);
    free(cmult);
    return rc;
}

typedef struct {
    fmpq_mpoly_struct *res;
    const cpoly *P;
    cpoly_integral_fn f;
    void *data;
    fmpq_t value;
    fmpq_mpoly_t term;
} cpoly_integrate_state;

static int cpoly_integrate_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                                const fmpq_mpoly_t coeff)
{
    cpoly_integrate_state *s = data;
    int rc = s->f(s->value, s->data, s->P->g, psi, n, kmult, kmax);
    if (rc)
        return rc;
    fmpq_mpoly_scalar_mul_fmpq(s->term, coeff, s->value, s->P->ctx);
    fmpq_mpoly_add(s->res, s->res, s->term, s->P->ctx);
    return 0;
}

int cpoly_integrate(fmpq_mpoly_t res, const cpoly *P, cpoly_integral_fn f, void *data)
{
    cpoly_integrate_state s;
    s.res = res;
    s.P = P;
    s.f = f;
    s.data = data;
    fmpq_init(s.value);
    fmpq_mpoly_init(s.term, P->ctx);
    fmpq_mpoly_zero(res, P->ctx);
    int rc = cpoly_foreach_top(P, cpoly_integrate_term, &s);
    fmpq_mpoly_clear(s.term, P->ctx);
    fmpq_clear(s.value);
    return rc;
}
