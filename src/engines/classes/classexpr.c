#include "classexpr.h"

#include <stdlib.h>

#include "util.h"

static cx *cx_node(cx_kind kind, const fmpq_mpoly_ctx_struct *ctx)
{
    cx *e = xcalloc(1, sizeof(cx));
    e->kind = kind;
    e->refs = 1;
    e->ctx = ctx;
    return e;
}

cx *cx_scalar(const fmpq_mpoly_t c, const fmpq_mpoly_ctx_t ctx)
{
    cx *e = cx_node(CX_SCALAR, ctx);
    fmpq_mpoly_init(e->scalar, ctx);
    fmpq_mpoly_set(e->scalar, c, ctx);
    return e;
}

cx *cx_psi(slong i, const fmpq_mpoly_ctx_t ctx, const void *origin)
{
    cx *e = cx_node(CX_PSI, ctx);
    e->index = i;
    e->origin = origin;
    return e;
}

cx *cx_kappa(slong j, const fmpq_mpoly_ctx_t ctx, const void *origin)
{
    cx *e = cx_psi(j, ctx, origin);
    e->kind = CX_KAPPA;
    return e;
}

cx *cx_theta(const fmpq_mpoly_ctx_t ctx, const void *origin)
{
    cx *e = cx_psi(0, ctx, origin);
    e->kind = CX_THETA;
    return e;
}

cx *cx_boundary(slong h, ulong legs, const fmpq_mpoly_ctx_t ctx, const void *origin)
{
    cx *e = cx_psi(h, ctx, origin);
    e->kind = CX_BOUNDARY;
    e->legs = legs;
    return e;
}

cx *cx_stratum(slong g, slong n, slong k, slong edges, const fmpq_mpoly_ctx_t ctx, const void *origin)
{
    cx *e = cx_psi(edges, ctx, origin);
    e->kind = CX_STRATUM;
    e->graph[0] = g;
    e->graph[1] = n;
    e->graph[2] = k;
    return e;
}

cx *cx_lambda(slong j, const fmpq_mpoly_ctx_t ctx, const void *origin)
{
    cx *e = cx_psi(j, ctx, origin);
    e->kind = CX_LAMBDA;
    return e;
}

cx *cx_ch(slong k, const fmpq_mpoly_ctx_t ctx, const void *origin)
{
    cx *e = cx_psi(k, ctx, origin);
    e->kind = CX_CH;
    return e;
}

static cx *cx_binary(cx_kind kind, cx *a, cx *b)
{
    cx *e = cx_node(kind, a->ctx);
    e->a = a;
    e->b = b;
    return e;
}

cx *cx_add(cx *a, cx *b)
{
    return cx_binary(CX_ADD, a, b);
}

cx *cx_mul(cx *a, cx *b)
{
    return cx_binary(CX_MUL, a, b);
}

cx *cx_pow(cx *a, slong k, const void *origin)
{
    cx *e = cx_node(CX_POW, a->ctx);
    e->a = a;
    e->index = k;
    e->origin = origin;
    return e;
}

cx *cx_exp(cx *a, const void *origin)
{
    cx *e = cx_node(CX_EXP, a->ctx);
    e->a = a;
    e->origin = origin;
    return e;
}

cx *cx_ref(cx *e)
{
    e->refs++;
    return e;
}

/* Nodes whose second operand is left for later because the C stack was nearly
   full (chained through a), and the state of the outermost release. */
static _Thread_local cx *cx_deferred;
static _Thread_local int cx_releasing, cx_draining;

/* Releases the operands put aside by deep releases, from a shallow stack. */
static void cx_release_deferred(void)
{
    cx_draining = 1;
    while (cx_deferred) {
        cx *p = cx_deferred, *b = p->b;
        cx_deferred = p->a;
        free(p);
        cx_release(b);
    }
    cx_draining = 0;
}

/* Frees along a in a loop and recurses on b; once the stack is nearly full a
   node with a b is put aside (its a is done first) and finished by the
   outermost call, so that no nesting of the tree can exhaust the stack. */
void cx_release(cx *e)
{
    cx_releasing++;
    while (e && --e->refs == 0) {
        cx *next = e->a;
        if (e->b && util_stack_exhausted()) {
            e->a = cx_deferred;
            cx_deferred = e;
            e = next;
            continue;
        }
        cx_release(e->b);
        if (e->kind == CX_SCALAR)
            fmpq_mpoly_clear(e->scalar, e->ctx);
        free(e);
        e = next;
    }
    if (--cx_releasing == 0 && !cx_draining && cx_deferred)
        cx_release_deferred();
}

slong cx_chain(const cx *e, cx_kind kind, const cx ***ops)
{
    slong m = 0;
    for (const cx *x = e; x->kind == kind; x = x->a)
        m++;
    const cx **v = xmalloc((size_t)(m + 1) * sizeof(cx *));
    const cx *x = e;
    for (slong k = m; k > 0; k--, x = x->a)
        v[k] = x->b;
    v[0] = x;
    *ops = v;
    return m + 1;
}

slong cx_max_psi(const cx *e)
{
    slong m = 0;
    for (; e; e = e->a) {
        if (util_stack_exhausted())
            return WORD_MAX;   /* unknown: callers then expand, which reports the depth */
        if (e->kind == CX_PSI && e->index > m)
            m = e->index;
        slong mb = cx_max_psi(e->b);
        if (mb > m)
            m = mb;
    }
    return m;
}

int cx_has_boundary(const cx *e)
{
    for (; e; e = e->a) {
        if (e->kind == CX_BOUNDARY || e->kind == CX_STRATUM || cx_has_boundary(e->b))
            return 1;
    }
    return 0;
}

int cx_has_hodge(const cx *e)
{
    for (; e; e = e->a) {
        if (e->kind == CX_LAMBDA || e->kind == CX_CH || cx_has_hodge(e->b))
            return 1;
    }
    return 0;
}

/* a + b and k * a, saturating at WORD_MAX (degrees are >= 0). */
static slong cx_degree_add(slong a, slong b)
{
    return a > WORD_MAX - b ? WORD_MAX : a + b;
}

static slong cx_degree_mul(slong k, slong a)
{
    return a != 0 && k > WORD_MAX / a ? WORD_MAX : k * a;
}

/* Walks of the expression tree stop this deep (long sums built in loops): no degree bound, no
   match, rather than a deep C recursion. */
#define CX_WALK_MAX_DEPTH 4000

static slong cx_max_degree_at(const cx *e, int depth)
{
    if (depth > CX_WALK_MAX_DEPTH || util_stack_exhausted())
        return WORD_MAX;
    slong a = e->a ? cx_max_degree_at(e->a, depth + 1) : 0, b = e->b ? cx_max_degree_at(e->b, depth + 1) : 0;
    switch (e->kind) {
    case CX_PSI:
    case CX_BOUNDARY:
        return 1;
    case CX_KAPPA:
    case CX_LAMBDA:
    case CX_CH:
    case CX_STRATUM:
        return e->index;
    case CX_ADD:
        return a > b ? a : b;
    case CX_MUL:
        return cx_degree_add(a, b);
    case CX_POW:
        return cx_degree_mul(e->index, a);
    case CX_EXP:
        return WORD_MAX;   /* also for degree 0 inside: exp() reports a constant part itself */
    case CX_THETA:
        return WORD_MAX;   /* its degree 2g-2+n depends on the space */
    default:
        return 0;
    }
}

slong cx_max_degree(const cx *e)
{
    return cx_max_degree_at(e, 0);
}

/* Matches kappa_1 times a scalar (either order, or kappa_1 alone); sets c. */
static int cx_match_scaled_kappa1(const cx *e, fmpq_mpoly_t c)
{
    if (e->kind == CX_KAPPA && e->index == 1) {
        fmpq_mpoly_one(c, e->ctx);
        return 1;
    }
    if (e->kind != CX_MUL)
        return 0;
    const cx *k = e->a->kind == CX_KAPPA ? e->a : e->b, *s = e->a->kind == CX_KAPPA ? e->b : e->a;
    if (k->kind != CX_KAPPA || k->index != 1 || s->kind != CX_SCALAR)
        return 0;
    fmpq_mpoly_set(c, s->scalar, e->ctx);
    return 1;
}

/* Strips scalar factors s1*(s2*(X)) down to X, multiplying them into f. */
static const cx *cx_peel_scalars(const cx *e, fmpq_mpoly_t f)
{
    fmpq_mpoly_one(f, e->ctx);
    while (e->kind == CX_MUL && (e->a->kind == CX_SCALAR || e->b->kind == CX_SCALAR)) {
        const cx *s = e->a->kind == CX_SCALAR ? e->a : e->b;
        fmpq_mpoly_mul(f, f, s->scalar, e->ctx);
        e = e->a->kind == CX_SCALAR ? e->b : e->a;
    }
    return e;
}

int cx_match_exp_kappa1(const cx *e, fmpq_mpoly_t c, fmpq_mpoly_t factor)
{
    const cx *x = cx_peel_scalars(e, factor);
    return x->kind == CX_EXP && cx_match_scaled_kappa1(x->a, c);
}

/* Multiplies the scalars of the product e into s and finds its one class factor (*cls, which
   must be NULL on entry); 0 if e is not such a product. */
static int cx_collect_term(const cx *e, fmpq_mpoly_t s, const cx **cls, int depth)
{
    if (depth > CX_WALK_MAX_DEPTH || util_stack_exhausted())
        return 0;
    if (e->kind == CX_MUL)
        return cx_collect_term(e->a, s, cls, depth + 1) && cx_collect_term(e->b, s, cls, depth + 1);
    if (e->kind == CX_SCALAR) {
        fmpq_mpoly_mul(s, s, e->scalar, e->ctx);
        return 1;
    }
    if ((e->kind != CX_PSI && e->kind != CX_KAPPA) || *cls)
        return 0;
    *cls = e;
    return 1;
}

/* Adds the linear form e (a sum of scalar multiples of psi_i and kappa_1) into c and b. */
static int cx_collect_linear(const cx *e, slong n, fmpq_mpoly_t c, fmpq_mpoly_struct *b, int depth)
{
    if (depth > CX_WALK_MAX_DEPTH || util_stack_exhausted())
        return 0;
    if (e->kind == CX_ADD)
        return cx_collect_linear(e->a, n, c, b, depth + 1) && cx_collect_linear(e->b, n, c, b, depth + 1);
    const cx *cls = NULL;
    fmpq_mpoly_t s;
    fmpq_mpoly_init(s, e->ctx);
    fmpq_mpoly_one(s, e->ctx);
    int ok = cx_collect_term(e, s, &cls, depth) && cls;
    if (ok && cls->kind == CX_KAPPA && cls->index == 1)
        fmpq_mpoly_add(c, c, s, e->ctx);
    else if (ok && cls->kind == CX_PSI && cls->index >= 1 && cls->index <= n)
        fmpq_mpoly_add(b + cls->index - 1, b + cls->index - 1, s, e->ctx);
    else
        ok = 0;
    fmpq_mpoly_clear(s, e->ctx);
    return ok;
}

int cx_match_exp_linear(const cx *e, slong n, fmpq_mpoly_t factor, fmpq_mpoly_t c, fmpq_mpoly_struct *b)
{
    const cx *x = cx_peel_scalars(e, factor);
    if (x->kind != CX_EXP)
        return 0;
    fmpq_mpoly_zero(c, e->ctx);
    for (slong i = 0; i < n; i++)
        fmpq_mpoly_zero(b + i, e->ctx);
    return cx_collect_linear(x->a, n, c, b, 0);
}

int cx_match_kappa1_power(const cx *e, fmpq_mpoly_t c, slong *k)
{
    const cx *p = cx_peel_scalars(e, c);
    if (p->kind == CX_KAPPA && p->index == 1) {
        *k = 1;
        return 1;
    }
    if (p->kind != CX_POW || p->a->kind != CX_KAPPA || p->a->index != 1)
        return 0;
    *k = p->index;
    return 1;
}

/* Multiplies one factor of a product into the match state m; returns 0 for a factor that is
   not a scalar, psi_i (1 <= i <= n), kappa_1, a power of these, or one exp(c*kappa_1). */
static int cx_match_factor(const cx *e, cx_monomial *m, slong n)
{
    /* products built in loops are long chains along a: walked in a loop, and the
       stack guard stops the rare deep nesting on the other side (no match: the
       expansion then reports the depth) */
    for (; e->kind == CX_MUL; e = e->a)
        if (util_stack_exhausted() || !cx_match_factor(e->b, m, n))
            return 0;
    if (e->kind == CX_SCALAR) {
        fmpq_mpoly_mul(m->factor, m->factor, e->scalar, e->ctx);
        return 1;
    }
    if (e->kind == CX_EXP) {
        if (m->is_exp || !cx_match_scaled_kappa1(e->a, m->c))
            return 0;
        m->is_exp = 1;
        return 1;
    }
    slong k = 1;
    if (e->kind == CX_POW) {
        k = e->index;
        e = e->a;
    }
    if (k < 0)
        return 0;
    if (e->kind == CX_PSI && e->index >= 1 && e->index <= n) {
        m->psi[e->index - 1] += k;
        return 1;
    }
    if (e->kind == CX_KAPPA && e->index == 1) {
        m->kappa1 += k;
        return 1;
    }
    return 0;
}

int cx_match_psi_kappa1(const cx *e, slong n, cx_monomial *m)
{
    if (n < 1 || n > CX_MONOMIAL_MAX_PSI)
        return 0;
    fmpq_mpoly_one(m->factor, e->ctx);
    fmpq_mpoly_one(m->c, e->ctx);
    m->kappa1 = 0;
    m->is_exp = 0;
    for (slong i = 0; i < n; i++)
        m->psi[i] = 0;
    return cx_match_factor(e, m, n);
}
