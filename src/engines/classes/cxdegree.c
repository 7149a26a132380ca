#include "cxdegree.h"

#include <stdlib.h>
#include <string.h>

#include <flint/flint.h>

/* Deeper expressions are left unknown rather than risking the C stack. */
#define CXDEG_MAX_DEPTH 4000

typedef struct {
    slong cap;
    double work, budget;
} cxdeg_walk;

/* r = the sums a + b of degrees, those >= cap counted at cap. */
static int cxdeg_sumset(cxdeg_walk *W, unsigned char *r, const unsigned char *a, const unsigned char *b)
{
    slong cap = W->cap;
    memset(r, 0, (size_t)cap + 1);
    for (slong i = 0; i <= cap; i++) {
        if (!a[i])
            continue;
        W->work += (double)(cap + 1);
        if (W->work > W->budget)
            return 0;
        for (slong j = 0; j <= cap; j++)
            if (b[j])
                r[i + j < cap ? i + j : cap] = 1;
    }
    return 1;
}

/* r = degrees of a^k, by repeated squaring of the degree set. */
static int cxdeg_power(cxdeg_walk *W, unsigned char *r, const unsigned char *a, slong k)
{
    size_t size = (size_t)W->cap + 1;
    unsigned char *base = malloc(size), *tmp = malloc(size);
    int ok = base && tmp;
    if (ok) {
        memcpy(base, a, size);
        memset(r, 0, size);
        r[0] = 1;
    }
    for (; ok && k > 0; k >>= 1) {
        if (k & 1) {
            ok = cxdeg_sumset(W, tmp, r, base);
            memcpy(r, tmp, size);
        }
        if (ok && k > 1) {
            ok = cxdeg_sumset(W, tmp, base, base);
            memcpy(base, tmp, size);
        }
    }
    free(base);
    free(tmp);
    return ok;
}

/* r = degrees of exp(a): every sum of degrees of a, reached degree by degree.
   Unknown (0) when a has degree 0, which exp cannot take exactly. */
static int cxdeg_exp(cxdeg_walk *W, unsigned char *r, const unsigned char *a)
{
    slong cap = W->cap;
    if (a[0])
        return 0;   /* exp of a class with a degree-0 part: the expansion reports it */
    if (a[1]) {   /* a term of degree 1: its powers reach every degree */
        memset(r, 1, (size_t)cap + 1);
        return 1;
    }
    memset(r, 0, (size_t)cap + 1);
    r[0] = 1;
    W->work += (double)(cap + 1) * (double)(cap + 1);
    if (W->work > W->budget)
        return 0;
    for (slong d = 1; d <= cap; d++)
        for (slong s = 1; s <= d && !r[d]; s++)
            if (a[s] && r[d - s])
                r[d] = 1;
    /* a degree >= cap is reached when a has one, or when a sum first passes cap */
    for (slong s = 1; s <= cap && !r[cap]; s++)
        for (slong d = cap - s; d < cap && !r[cap]; d++)
            r[cap] = a[s] && r[d] && d + s >= cap;
    return 1;
}

static int cxdeg_at(cxdeg_walk *W, const cx *e, unsigned char *r, int depth);

/* Degrees of the children a and b of e, into fresh sets (the caller frees them). */
static int cxdeg_children(cxdeg_walk *W, const cx *e, unsigned char **a, unsigned char **b, int depth)
{
    size_t size = (size_t)W->cap + 1;
    *a = calloc(size, 1);
    *b = calloc(size, 1);
    if (!*a || !*b)
        return 0;
    return cxdeg_at(W, e->a, *a, depth + 1) && (!e->b || cxdeg_at(W, e->b, *b, depth + 1));
}

static int cxdeg_at(cxdeg_walk *W, const cx *e, unsigned char *r, int depth)
{
    slong cap = W->cap;
    if (depth > CXDEG_MAX_DEPTH || e->kind == CX_THETA)
        return 0;   /* Theta's degree 2g-2+n depends on the space: unknown here */
    if (e->kind == CX_SCALAR || e->kind == CX_PSI || e->kind == CX_KAPPA || e->kind == CX_LAMBDA
        || e->kind == CX_CH || e->kind == CX_BOUNDARY || e->kind == CX_STRATUM) {
        slong d = e->kind == CX_PSI || e->kind == CX_BOUNDARY ? 1 : e->kind == CX_SCALAR ? 0 : e->index;
        if (e->kind != CX_SCALAR || !fmpq_mpoly_is_zero(e->scalar, e->ctx))
            r[d < cap ? d : cap] = 1;
        return 1;
    }
    unsigned char *a = NULL, *b = NULL;
    int ok = cxdeg_children(W, e, &a, &b, depth);
    if (ok && e->kind == CX_ADD)
        for (slong i = 0; i <= cap; i++)
            r[i] = a[i] | b[i];
    else if (ok && e->kind == CX_MUL)
        ok = cxdeg_sumset(W, r, a, b);
    else if (ok && e->kind == CX_POW)
        ok = cxdeg_power(W, r, a, e->index);
    else if (ok)
        ok = cxdeg_exp(W, r, a);
    free(a);
    free(b);
    return ok;
}

int cx_degree_set(const cx *e, slong cap, unsigned char *has, double budget)
{
    cxdeg_walk W = {cap, 0.0, budget};
    return cap >= 0 && cxdeg_at(&W, e, has, 0);
}
