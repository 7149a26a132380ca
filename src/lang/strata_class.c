/* strata_class.c - boundary divisors as classes (strata_class.h).
 *
 *   delta_{irr}, delta_irr   the divisor of irreducible nodal curves, (1/2) xi_*(1) for the
 *                            gluing map from Mbar_{g-1,n+2} (docs/conventions.md, "Boundary strata")
 *   stratum_{g,n,k}          the stratum (1/|Aut|) xi_*(1) of the k-th graph of stablegraphs_{g,n}
 *   delta_{h,S}              the closure of curves with a separating node, a side of genus h
 *                            carrying the legs S (a list such as [1,2]) and the other side the
 *                            rest; delta_{h} is delta_{h,[]}
 *
 * A divisor is read without a space: whether it exists on Mbar_{g,n} is checked when int_{g,n}
 * names the space (sc_divisor_on).  The expansion distributes products over sums so that every
 * term is (product of divisors) x (a class in psi and kappa), the form the engine integrates.
 */
#include <stdlib.h>
#include <string.h>

#include "diag.h"
#include "eval.h"
#include "print.h"
#include "strata_class.h"
#include "strata_lang.h"
#include "strbuf.h"
#include "util.h"

/* Genus subscripts above this are refused at once (the engine stops far below). */
#define SC_MAX_GENUS 1000

static value *sc_fail(const node *at, char *msg)
{
    diag_error(&at->loc, "%s", msg);
    free(msg);
    return NULL;
}

int strata_class_name(interp *I, const node *n, value **out)
{
    if (strcmp(n->text, "delta_irr") != 0)
        return 0;
    *out = value_new_class(cx_boundary(CX_BOUNDARY_IRR, 0, I->ring.ctx, n), &I->ring);
    return 1;
}

/* The leg set S of delta_{h,S} from the list value v; 0 after an error at at. */
static int sc_read_legs(interp *I, const node *at, const value *v, ulong *legs)
{
    *legs = 0;
    if (v->kind != V_LIST) {
        sc_fail(at, xasprintf("the legs of delta_{h,S} are a list such as [1,2], not a %s", value_kind_name(v)));
        return 0;
    }
    for (slong i = 0; i < v->len; i++) {
        slong leg;
        if (v->items[i]->kind != V_NUM || !scalar_get_slong(&leg, v->items[i]->num, &I->ring) || leg < 1
            || leg > SG_MAX_N || (*legs >> (leg - 1) & 1)) {
            sc_fail(at, xasprintf("the legs of delta_{h,S} are distinct integers from 1 to %d (the stable-graph "
                                  "engine's limit)", SG_MAX_N));
            return 0;
        }
        *legs |= 1UL << (leg - 1);
    }
    return 1;
}

/* stratum_{g,n,k}: the graph is looked up at once (its codimension is the class's degree). */
static void sc_read_stratum(interp *I, scope *s, const node *n, value **out)
{
    slong g, np, k;
    sg_list L;
    if (n->list->len != 3) {
        sc_fail(n, xasprintf("stratum_{g,n,k} takes three subscripts: the space and the number k of the graph in "
                             "stablegraphs_{g,n} (got %d)", n->list->len));
        return;
    }
    if (!eval_slong(I, s, n->list->items[0], "genus", 0, &g) || !eval_slong(I, s, n->list->items[1], "number of legs", 0, &np)
        || !eval_slong(I, s, n->list->items[2], "graph number", 1, &k))
        return;
    if (g > SC_MAX_GENUS || np > SG_MAX_N || 2 * g - 2 + np <= 0 || 3 * g - 3 + np > SG_MAX_E
        || 2 * g - 2 + np > SG_MAX_V) {
        sc_fail(n, xasprintf("Mbar_{%ld,%ld} is %s", (long)g, (long)np, 2 * g - 2 + np <= 0 ? "not stable (2g-2+n must "
                             "be positive)" : "too large for the stable-graph engine"));
        return;
    }
    if (!strata_lang_graphs(I, n, (int)g, (int)np, -1, &L))
        return;
    if (k > L.len)
        sc_fail(n->list->items[2], xasprintf("Mbar_{%ld,%ld} has %ld stable graphs, not %ld", (long)g, (long)np,
                                             (long)L.len, (long)k));
    else
        *out = value_new_class(cx_stratum(g, np, k, L.gr[k - 1].ne, I->ring.ctx, n), &I->ring);
    sg_list_clear(&L);
}

int sc_stratum_graph(interp *I, sgraph *G, const node *where, slong g, slong n, const cx *st)
{
    const node *at = st->origin ? st->origin : where;
    sg_list L;
    if (st->graph[0] != g || st->graph[1] != n) {
        sc_fail(at, xasprintf("stratum_{%ld,%ld,%ld} is a class of Mbar_{%ld,%ld}, not of Mbar_{%ld,%ld}",
                              (long)st->graph[0], (long)st->graph[1], (long)st->graph[2], (long)st->graph[0],
                              (long)st->graph[1], (long)g, (long)n));
        return 0;
    }
    if (!strata_lang_graphs(I, at, (int)g, (int)n, -1, &L))
        return 0;
    int ok = st->graph[2] <= L.len;
    if (ok)
        *G = L.gr[st->graph[2] - 1];
    sg_list_clear(&L);
    return ok;
}

int strata_class_subscript(interp *I, scope *s, const node *n, value **out)
{
    if (strcmp(n->text, "stratum") == 0) {
        *out = NULL;
        sc_read_stratum(I, s, n, out);
        return 1;
    }
    if (strcmp(n->text, "delta") != 0)
        return 0;
    *out = NULL;
    int nsub = n->list->len;
    const node *first = nsub > 0 ? n->list->items[0] : NULL;
    if (nsub < 1 || nsub > 2) {
        sc_fail(n, xasprintf("delta_{...} takes irr, a genus h, or a genus and a list of legs: delta_{irr}, "
                             "delta_{1}, delta_{0,[1,2]} (got %d subscripts)", nsub));
        return 1;
    }
    if (first->kind == N_NAME && strcmp(first->text, "irr") == 0) {
        if (nsub == 2)
            sc_fail(n, xasprintf("delta_{irr} takes no legs: the irreducible divisor has none on a side"));
        else
            *out = value_new_class(cx_boundary(CX_BOUNDARY_IRR, 0, I->ring.ctx, n), &I->ring);
        return 1;
    }
    slong h;
    ulong legs = 0;
    if (!eval_slong(I, s, first, "genus of delta_{h,S}", 0, &h))
        return 1;
    if (h > SC_MAX_GENUS) {
        sc_fail(first, xasprintf("the genus of delta_{h,S} is at most %d", SC_MAX_GENUS));
        return 1;
    }
    if (nsub == 2) {
        value *v = eval_expr(I, s, n->list->items[1]);
        int ok = v != NULL && sc_read_legs(I, n->list->items[1], v, &legs);
        value_release(v);
        if (!ok)
            return 1;
    }
    *out = value_new_class(cx_boundary(h, legs, I->ring.ctx, n), &I->ring);
    return 1;
}

int strata_class_in_value(const value *v)
{
    return v->kind == V_CLASS && cx_has_boundary(v->cls);
}

/* ---- the divisor on a given space ---- */

static int sc_bits(ulong x)
{
    int c = 0;
    for (; x; x &= x - 1)
        c++;
    return c;
}

int sc_divisor_on(sg_divisor *D, const node *where, slong g, slong n, const cx *d)
{
    const node *at = d->origin ? d->origin : where;
    strbuf b;
    strbuf_init(&b);
    print_boundary(&b, d, 0);
    char *msg = NULL;
    int ns = sc_bits(d->legs), top = 0;
    for (int i = 0; i < 64; i++)
        if (d->legs >> i & 1)
            top = i + 1;
    memset(D, 0, sizeof *D);
    D->irr = d->index == CX_BOUNDARY_IRR;
    D->h = D->irr ? 0 : (int)d->index;
    D->S = d->legs;
    if (D->irr && g < 1)
        msg = xasprintf("%s does not exist on Mbar_{0,%ld}: a nodal curve of genus 0 has only separating nodes",
                        b.data, (long)n);
    else if (!D->irr && top > n)
        msg = xasprintf("%s is not a divisor of Mbar_{%ld,%ld}: leg %d is not among the legs 1..%ld", b.data,
                        (long)g, (long)n, top, (long)n);
    else if (!D->irr && d->index > g)
        msg = xasprintf("%s is not a divisor of Mbar_{%ld,%ld}: a side of genus %ld is above the genus %ld",
                        b.data, (long)g, (long)n, (long)d->index, (long)g);
    else if (!D->irr && 2 * d->index - 1 + ns <= 0)
        msg = xasprintf("%s is not a divisor of Mbar_{%ld,%ld}: its side of genus %ld with %d leg%s and the node "
                        "is not stable%s", b.data, (long)g, (long)n, (long)d->index, ns, ns == 1 ? "" : "s",
                        d->index == 0 ? " (a genus-0 side needs at least two legs; the irreducible divisor is "
                                        "delta_{irr})" : "");
    else if (!D->irr && 2 * (g - d->index) - 1 + (n - ns) <= 0)
        msg = xasprintf("%s is not a divisor of Mbar_{%ld,%ld}: the other side, of genus %ld with %ld leg%s and "
                        "the node, is not stable", b.data, (long)g, (long)n, (long)(g - d->index), (long)(n - ns),
                        n - ns == 1 ? "" : "s");
    strbuf_clear(&b);
    if (msg)
        sc_fail(at, msg);
    return msg == NULL;
}

/* ---- expansion into (divisors) x (psi-kappa class) ---- */

void sc_terms_init(sc_terms *T)
{
    memset(T, 0, sizeof *T);
}

void sc_terms_clear(sc_terms *T)
{
    for (slong i = 0; i < T->len; i++)
        cx_release(T->t[i].rest);
    free(T->t);
    memset(T, 0, sizeof *T);
}

/* Order of divisors inside a term: irr first, then by genus and leg set. */
static int sc_cmp(const cx *a, const cx *b)
{
    if (a->kind != b->kind)
        return a->kind == CX_STRATUM ? -1 : 1;
    for (int i = 0; a->kind == CX_STRATUM && i < 3; i++)
        if (a->graph[i] != b->graph[i])
            return a->graph[i] < b->graph[i] ? -1 : 1;
    if (a->index != b->index)
        return a->index < b->index ? -1 : 1;
    return a->legs < b->legs ? -1 : a->legs > b->legs;
}

static int sc_same_factors(const sc_term *a, int nf, const cx *const *d)
{
    if (a->nf != nf)
        return 0;
    for (int i = 0; i < nf; i++)
        if (sc_cmp(a->d[i], d[i]) != 0)
            return 0;
    return 1;
}

/* Adds d[0..nf) x rest to T (takes rest), merged with a term of the same divisors; 0 when T
   would pass SC_MAX_TERMS. */
static int sc_push(sc_terms *T, int nf, const cx *const *d, cx *rest)
{
    for (slong i = 0; i < T->len; i++)
        if (sc_same_factors(&T->t[i], nf, d)) {
            T->t[i].rest = cx_add(T->t[i].rest, rest);
            return 1;
        }
    if (T->len >= SC_MAX_TERMS) {
        cx_release(rest);
        return 0;
    }
    if (T->len == T->cap) {
        T->cap = T->cap ? 2 * T->cap : 8;
        T->t = xrealloc(T->t, (size_t)T->cap * sizeof *T->t);
    }
    sc_term *t = &T->t[T->len++];
    t->nf = nf;
    for (int i = 0; i < nf; i++)
        t->d[i] = d[i];
    t->rest = rest;
    return 1;
}

static cx *sc_one(const cx *e)
{
    fmpq_mpoly_t o;
    fmpq_mpoly_init(o, e->ctx);
    fmpq_mpoly_one(o, e->ctx);
    cx *c = cx_scalar(o, e->ctx);
    fmpq_mpoly_clear(o, e->ctx);
    return c;
}

static int sc_is_one(const cx *e)
{
    return e->kind == CX_SCALAR && fmpq_mpoly_is_one(e->scalar, e->ctx);
}

/* a * b (new reference), without factors 1: the cofactors read as written in explain. */
static cx *sc_mul(cx *a, cx *b)
{
    return sc_is_one(a) ? cx_ref(b) : sc_is_one(b) ? cx_ref(a) : cx_mul(cx_ref(a), cx_ref(b));
}

/* out = A x B (out empty on entry), dropping products of more than maxf divisors. */
static int sc_product(sc_terms *out, const sc_terms *A, const sc_terms *B, slong maxf)
{
    for (slong i = 0; i < A->len; i++)
        for (slong j = 0; j < B->len; j++) {
            const sc_term *a = &A->t[i], *b = &B->t[j];
            if (a->nf + b->nf > maxf)
                continue;
            const cx *d[SC_MAX_FACTORS];
            int ia = 0, ib = 0, k = 0;
            while (ia < a->nf || ib < b->nf)      /* merge of two sorted lists */
                d[k++] = ib >= b->nf || (ia < a->nf && sc_cmp(a->d[ia], b->d[ib]) <= 0) ? a->d[ia++] : b->d[ib++];
            if (!sc_push(out, k, d, sc_mul(a->rest, b->rest)))
                return 0;
        }
    return 1;
}

typedef struct {
    const node *where;
    slong maxf;
} sc_walk;

static int sc_expand(sc_walk *W, sc_terms *T, const cx *e);

static int sc_too_many(sc_walk *W)
{
    diag_error(&W->where->loc, "this integrand expands into more than %d products of boundary divisors",
               SC_MAX_TERMS);
    return 0;
}

/* T = the product of the operands of a chain of products, or of e^k (ops NULL). */
static int sc_expand_product(sc_walk *W, sc_terms *T, const cx *e, const cx **ops, slong nops, slong k)
{
    sc_terms base, acc, next;
    sc_terms_init(&base);
    sc_terms_init(&acc);
    int ok = 1;
    const cx *one_at = ops ? ops[0] : e;
    ok = sc_push(&acc, 0, NULL, sc_one(one_at));
    if (!ops)
        ok = sc_expand(W, &base, e->a);
    slong steps = ops ? nops : k;
    for (slong i = 0; ok && i < steps && acc.len > 0; i++) {
        sc_terms factor;
        sc_terms_init(&factor);
        ok = ops ? sc_expand(W, &factor, ops[i]) : 1;
        sc_terms_init(&next);
        if (ok && !sc_product(&next, &acc, ops ? &factor : &base, W->maxf))
            ok = sc_too_many(W);
        sc_terms_clear(&factor);
        sc_terms_clear(&acc);
        acc = next;
    }
    sc_terms_clear(&base);
    for (slong i = 0; ok && i < acc.len; i++)
        if (!sc_push(T, acc.t[i].nf, acc.t[i].d, cx_ref(acc.t[i].rest)))
            ok = sc_too_many(W);
    sc_terms_clear(&acc);
    return ok;
}

static int sc_expand(sc_walk *W, sc_terms *T, const cx *e)
{
    if (!cx_has_boundary(e)) {
        if (!sc_push(T, 0, NULL, cx_ref((cx *)e)))
            return sc_too_many(W);
        return 1;
    }
    if (util_stack_exhausted()) {
        diag_error(&W->where->loc, "this class expression is nested too deeply to expand its boundary divisors");
        return 0;
    }
    const cx **ops = NULL;
    slong nops;
    int ok = 1;
    switch (e->kind) {
    case CX_BOUNDARY:
    case CX_STRATUM:
        if (!sc_push(T, 1, &e, sc_one(e)))
            return sc_too_many(W);
        return 1;
    case CX_ADD:
        nops = cx_chain(e, CX_ADD, &ops);
        for (slong i = 0; ok && i < nops; i++)
            ok = sc_expand(W, T, ops[i]);
        free(ops);
        return ok;
    case CX_MUL:
        nops = cx_chain(e, CX_MUL, &ops);
        ok = sc_expand_product(W, T, e, ops, nops, 0);
        free(ops);
        return ok;
    case CX_POW:
        if (e->index > SC_MAX_POWER) {
            diag_error(&W->where->loc, "a class with boundary divisors is raised to the power %ld here; powers up "
                                       "to %d are expanded", (long)e->index, SC_MAX_POWER);
            return 0;
        }
        return sc_expand_product(W, T, e, NULL, 0, e->index);
    default:   /* CX_EXP: the only other node with a boundary divisor below it */
        diag_error(&W->where->loc, "exp() of a class holding a boundary divisor is not supported: write the "
                                   "powers of the divisor out as a sum");
        return 0;
    }
}

int sc_expand_integrand(sc_terms *T, const node *where, const cx *e, slong max_factors)
{
    sc_walk W = {where, max_factors < SC_MAX_FACTORS ? max_factors : SC_MAX_FACTORS};
    return sc_expand(&W, T, e);
}
