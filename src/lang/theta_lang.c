/* int_{g,n} of integrands holding Norbury's class Theta.
 *
 * Theta_{g,n} has degree 2g-2+n, so int_{Mbar_{g,n}} Theta * R only sees the part of R of degree
 * g-1 = (3g-3+n) - (2g-2+n).  Each additive term of the integrand is classified: without Theta
 * it goes to the ordinary integral; Theta times a Theta-free class R goes to the Theta pushforward
 * (src/engines/theta/theta_kappa.c) after R is expanded up to degree g-1; a term with Theta^2 is zero,
 * because 2(2g-2+n) > 3g-3+n whenever g + n > 1, which holds on every space where Theta is not
 * already zero (genus 0).  Theta inside exp() or added to Theta-free classes inside a product is
 * refused with a message, as is anything the classification cannot read.
 */
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "classes/cpoly.h"
#include "correlators/pushforward.h"
#include "class_expand.h"
#include "diag.h"
#include "print.h"
#include "source.h"
#include "strbuf.h"
#include "theta_lang.h"
#include "verify_account.h"
#include "util.h"
#include "integrate.h"
#include "integrand_check.h"

#define THETA_WALK_MAX_DEPTH 4000

static int theta_split(const cx *e, cx **rest, int depth);
static const cx *theta_find(const cx *e);

/* The class 1 in e's ring (new reference). */
static cx *theta_one(const cx *e)
{
    fmpq_mpoly_t o;
    fmpq_mpoly_init(o, e->ctx);
    fmpq_mpoly_one(o, e->ctx);
    cx *c = cx_scalar(o, e->ctx);
    fmpq_mpoly_clear(o, e->ctx);
    return c;
}

/* Product a*b from the orders of its factors: Theta-linear when exactly one factor is. */
static int theta_split_mul(const cx *e, cx **rest, int depth)
{
    cx *ra = NULL, *rb = NULL;
    int oa = theta_split(e->a, &ra, depth + 1), ob = oa < 0 ? oa : theta_split(e->b, &rb, depth + 1);
    int o = oa < 0 ? oa : ob < 0 ? ob : oa + ob >= TH_SQUARE ? TH_SQUARE : oa + ob;
    if (o == TH_LINEAR)
        *rest = oa == TH_LINEAR ? cx_mul(ra, cx_ref(e->b)) : cx_mul(cx_ref(e->a), rb);
    else {
        if (ra)
            cx_release(ra);
        if (rb)
            cx_release(rb);
    }
    return o;
}

/* Sum a+b: both Theta-free, both Theta-linear (rests added), or a Theta^2 part that vanishes. */
static int theta_split_add(const cx *e, cx **rest, int depth)
{
    cx *ra = NULL, *rb = NULL;
    int oa = theta_split(e->a, &ra, depth + 1), ob = oa < 0 ? oa : theta_split(e->b, &rb, depth + 1);
    int o = oa < 0 ? oa : ob < 0 ? ob : TH_BAD;
    if (oa >= 0 && oa == ob && oa != TH_LINEAR)
        o = oa;
    else if (oa == TH_LINEAR && ob == TH_LINEAR) {
        *rest = cx_add(ra, rb);
        return TH_LINEAR;
    } else if ((oa == TH_LINEAR && ob == TH_SQUARE) || (oa == TH_SQUARE && ob == TH_LINEAR)) {
        *rest = oa == TH_LINEAR ? ra : rb;
        ra = oa == TH_LINEAR ? NULL : ra;
        rb = ob == TH_LINEAR ? NULL : rb;
        o = TH_LINEAR;
    }
    if (ra)
        cx_release(ra);
    if (rb)
        cx_release(rb);
    return o;
}

/* Order of Theta in e (TH_*); for TH_LINEAR, *rest is a new reference to R with e = Theta * R. */
static int theta_split(const cx *e, cx **rest, int depth)
{
    cx *ra = NULL;
    int o;
    *rest = NULL;
    if (theta_find(e) == NULL)
        return TH_FREE;                 /* Theta-free subtrees are not walked (long sums) */
    if (depth > THETA_WALK_MAX_DEPTH)
        return TH_DEEP;
    switch (e->kind) {
    case CX_THETA:
        *rest = theta_one(e);
        return TH_LINEAR;
    case CX_MUL:
        return theta_split_mul(e, rest, depth);
    case CX_ADD:
        return theta_split_add(e, rest, depth);
    case CX_POW:
        o = theta_split(e->a, &ra, depth + 1);
        if (o == TH_LINEAR && e->index == 1) {
            *rest = ra;
            return TH_LINEAR;
        }
        if (ra)
            cx_release(ra);
        return o < 0 ? o : o == TH_FREE ? TH_FREE : e->index == 0 ? TH_BAD : TH_SQUARE;
    case CX_EXP:
        o = theta_split(e->a, &ra, depth + 1);
        if (ra)
            cx_release(ra);
        return o < 0 ? o : o == TH_FREE ? TH_FREE : TH_BAD;
    default:
        return TH_FREE;
    }
}

/* The first Theta node of e (also for the location of messages), or NULL.  Iterative, with a
   heap stack, since sums built in loops make trees of any depth. */
static const cx *theta_find(const cx *e)
{
    slong len = 0, cap = 64;
    const cx **st = xmalloc(cap * sizeof(const cx *)), *hit = NULL;
    if (e)
        st[len++] = e;
    while (len > 0 && hit == NULL) {
        const cx *x = st[--len];
        if (x->kind == CX_THETA) {
            hit = x;
            break;
        }
        if (len + 2 > cap) {
            cap *= 2;
            st = xrealloc(st, cap * sizeof(const cx *));
        }
        if (x->b)
            st[len++] = x->b;
        if (x->a)
            st[len++] = x->a;
    }
    free(st);
    return hit;
}

int theta_in_value(const value *v)
{
    return v->kind == V_CLASS && theta_find(v->cls) != NULL;
}

/* Calls fn on each additive term of e (the top-level sums are flattened iteratively, so long
   sums built in loops are fine), with its Theta order and rest.  Returns 0 as soon as fn does. */
int theta_each_term(const cx *e, theta_term_visit fn, void *data)
{
    slong len = 0, cap = 64;
    const cx **st = xmalloc(cap * sizeof(const cx *));
    int ok = 1;
    st[len++] = e;
    while (ok && len > 0) {
        const cx *x = st[--len];
        if (x->kind == CX_ADD) {
            if (len + 2 > cap) {
                cap *= 2;
                st = xrealloc(st, cap * sizeof(const cx *));
            }
            st[len++] = x->b;
            st[len++] = x->a;
            continue;
        }
        cx *rest = NULL;
        int o = theta_split(x, &rest, 0);
        ok = fn(data, x, o, rest);
        if (rest)
            cx_release(rest);
    }
    free(st);
    return ok;
}

/* Says once why an integral with Theta is 0 (genus 0, Theta^2, no cofactor of degree g-1): the
   answer is right, but the question was probably not the one meant. */
void theta_warn_zero(interp *I, const node *where, slong g, slong n, int why)
{
    if (why == 0 || !integrand_first_warning(I, where))
        return;
    if (why & THETA_ZERO_GENUS0)
        diag_warning(&where->loc, "Theta is zero on Mbar_{0,%ld} (it vanishes in genus 0): the integral is 0",
                     (long)n);
    else if (why & THETA_ZERO_SQUARE && !(why & THETA_ZERO_DEGREE))
        diag_warning(&where->loc, "Theta^2 has degree %ld, above the dimension %ld of Mbar_{%ld,%ld}: the integral "
                                  "is 0", (long)(4 * g - 4 + 2 * n), (long)(3 * g - 3 + n), (long)g, (long)n);
    else
        diag_warning(&where->loc, "Theta has degree 2g-2+n = %ld on Mbar_{%ld,%ld}, so only the part of degree "
                                  "g-1 = %ld of its cofactor counts, and there is none: the integral is 0",
                     (long)(2 * g - 2 + n), (long)g, (long)n, (long)(g - 1));
}

/* Reports why a term cannot be integrated with Theta, at its Theta node. */
void theta_report_bad(const node *where, const cx *term, int order)
{
    const cx *t = theta_find(term);
    const node *at = t && t->origin ? t->origin : where;
    if (order == TH_DEEP) {
        diag_error(&at->loc, "this class expression is nested too deeply around Theta to be read");
        return;
    }
    diag_error(&at->loc, "Theta must be a factor of each term of the integrand (as in Theta*psi_1 + "
                         "Theta*kappa_1), not inside exp() nor added to classes without Theta");
}

/* Expands the Theta-free rest R up to degree g-1 into P, reporting errors at their nodes.
   Returns 1 on success. */
int theta_expand_rest(cpoly *P, const node *where, const cx *rest)
{
    return class_expand_reported(P, where, rest);
}

/* Checks the genus against the engine's limit and the table estimate (see theta_lang_values.c). */
int theta_rest_genus_ok(interp *I, const node *where, slong g)
{
    if (g > THETA_MAX_GENUS) {
        diag_error(&where->loc, "Theta integrals are computed up to genus %d, not %ld", THETA_MAX_GENUS, (long)g);
        return 0;
    }
    if (theta_estimate_entries(g) > I->lim.max_table) {
        diag_error(&where->loc, "Theta numbers of genus %ld need about %.3g table entries, above the limit of "
                                "%.3g (raise it with --max-table N)", (long)g, theta_estimate_entries(g),
                   I->lim.max_table);
        return 0;
    }
    return 1;
}

typedef struct {
    const node *where;
    slong g;
    cx *free_part, *theta_part;   /* sums of the Theta-free and the Theta-linear terms */
    int why;                      /* THETA_ZERO_* of the terms dropped or kept */
} theta_parts;

/* Adds one term to its part (theta_each_term); a term Theta cannot be read in is reported. */
static int theta_parts_add(void *data, const cx *term, int order, cx *rest)
{
    theta_parts *T = data;
    (void)rest;
    if (order < 0) {
        theta_report_bad(T->where, term, order);
        return 0;
    }
    if (order == TH_SQUARE) {                    /* Theta^2 = 0 by degree */
        T->why |= T->g == 0 ? THETA_ZERO_GENUS0 : THETA_ZERO_SQUARE;
        return 1;
    }
    if (order != TH_LINEAR)
        T->why |= THETA_ZERO_NOT;
    cx **part = order == TH_LINEAR ? &T->theta_part : &T->free_part;
    cx *t = cx_ref((cx *)term);
    *part = *part ? cx_add(*part, t) : t;
    return 1;
}

int theta_split_integrand(interp *I, const node *where, slong g, const cx *e, cx **free_part, cx **theta_part,
                          int *why)
{
    (void)I;
    theta_parts T = {where, g, NULL, NULL, 0};
    int ok = theta_each_term(e, theta_parts_add, &T);
    if (!ok) {
        if (T.free_part)
            cx_release(T.free_part);
        if (T.theta_part)
            cx_release(T.theta_part);
        T.free_part = T.theta_part = NULL;
    }
    *free_part = T.free_part;
    *theta_part = T.theta_part;
    *why = T.why;
    return ok;
}

/* The reduction printed by explain: merged terms coeff * <Theta | tau_key>_g. */
typedef struct {
    interp *I;
    slong g, len, cap;
    slong **keys;                  /* keys[i][0] = number of points, then the sorted indices */
    fmpq_mpoly_struct *coeffs;
    const fmpq_mpoly_struct *mono; /* coefficient of the monomial being expanded */
    int notes;                     /* bit 1: Theta^2 dropped, bit 2: genus 0, bit 4: Theta-free terms */
} theta_red;

/* Adds coeff * mono * <Theta | tau_key>_g to the reduction, merging equal correlators. */
static int theta_red_add(void *data, slong g, const slong *key, slong len, const fmpz_t coeff)
{
    theta_red *R = data;
    slong *k = xmalloc((len + 1) * sizeof(slong)), i;
    (void)g;
    k[0] = len;
    memcpy(k + 1, key, len * sizeof(slong));
    for (i = 2; i <= len; i++)                        /* descending, as print_correlator wants */
        for (slong j = i; j > 1 && k[j - 1] < k[j]; j--) {
            slong t = k[j];
            k[j] = k[j - 1];
            k[j - 1] = t;
        }
    for (i = 0; i < R->len; i++)
        if (R->keys[i][0] == len && memcmp(R->keys[i] + 1, k + 1, len * sizeof(slong)) == 0)
            break;
    if (i == R->len) {
        if (R->len == R->cap) {
            R->cap = R->cap ? 2 * R->cap : 16;
            R->keys = xrealloc(R->keys, R->cap * sizeof(slong *));
            R->coeffs = xrealloc(R->coeffs, R->cap * sizeof(fmpq_mpoly_struct));
        }
        R->keys[R->len] = k;
        fmpq_mpoly_init(R->coeffs + R->len, R->I->ring.ctx);
        R->len++;
        k = NULL;
    }
    fmpq_mpoly_t t;
    fmpq_mpoly_init(t, R->I->ring.ctx);
    fmpq_mpoly_scalar_mul_fmpz(t, R->mono, coeff, R->I->ring.ctx);
    fmpq_mpoly_add(R->coeffs + i, R->coeffs + i, t, R->I->ring.ctx);
    fmpq_mpoly_clear(t, R->I->ring.ctx);
    free(k);
    return WK_OK;
}

/* One monomial of the expanded rest: its pushforward terms into the reduction. */
static int theta_red_monomial(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                              const fmpq_mpoly_t coeff)
{
    theta_red *R = data;
    R->mono = coeff;
    slong maxt = R->I->lim.max_terms > 1e18 ? 0 : (slong)R->I->lim.max_terms;
    return theta_kappa_terms(R->g, psi, n, kmult, kmax, maxt, theta_red_add, R);
}

typedef struct {
    theta_red red;
    const node *where;
    slong n;
} theta_explain_walk;

/* One additive term for explain: Theta-linear terms are reduced, the others noted. */
static int theta_explain_term(void *data, const cx *term, int order, cx *rest)
{
    theta_explain_walk *E = data;
    interp *I = E->red.I;
    if (order < 0) {
        theta_report_bad(E->where, term, order);
        return 0;
    }
    if (order != TH_LINEAR || E->red.g == 0) {
        E->red.notes |= order == TH_SQUARE ? 1 : order == TH_FREE ? 4 : 2;
        return 1;
    }
    if (!theta_rest_genus_ok(I, E->where, E->red.g))
        return 0;
    cpoly P;
    cpoly_init_degree(&P, E->red.g, E->n, E->red.g - 1, I->lim.max_class_terms, I->ring.ctx);
    int ok = theta_expand_rest(&P, E->where, rest);
    if (ok) {
        int rc = cpoly_foreach_top(&P, theta_red_monomial, &E->red);
        if (rc != WK_OK)
            theta_lang_report(I, E->where, rc);
        ok = rc == WK_OK;
    }
    cpoly_clear(&P);
    return ok;
}

/* Prints the source of the integral, the reduction and the reasons for vanishing parts. */
static void theta_explain_print(interp *I, const theta_explain_walk *E)
{
    const node *where = E->where;
    slong g = E->red.g, n = E->n;
    strbuf b, c;
    strbuf_init(&b);
    const char *line;
    size_t len = source_line(where->loc.src, where->loc.first_line, &line);
    if (where->loc.last_line == where->loc.first_line && (size_t)where->loc.last_column <= len + 1)
        strbuf_printf(&b, "%.*s\n", where->loc.last_column - where->loc.first_column, line + where->loc.first_column - 1);
    strbuf_puts(&b, "  = ");
    int first = 1;
    for (slong i = 0; i < E->red.len; i++) {
        if (fmpq_mpoly_is_zero(E->red.coeffs + i, I->ring.ctx))
            continue;
        print_signed_coeff(&b, E->red.coeffs + i, first, &I->ring);
        strbuf_init(&c);
        print_correlator(&c, g, E->red.keys[i] + 1, E->red.keys[i][0]);
        strbuf_printf(&b, "<Theta | %s", c.data + 1);
        strbuf_clear(&c);
        first = 0;
    }
    if (first)
        strbuf_putc(&b, '0');
    if (E->red.notes & 2)
        strbuf_printf(&b, "\n  (Theta is zero on Mbar_{0,%ld})", (long)n);
    if (E->red.notes & 1)
        strbuf_printf(&b, "\n  (Theta^2 has degree %ld, above the dimension %ld of Mbar_{%ld,%ld}: those terms are 0)",
                      (long)(4 * g - 4 + 2 * n), (long)(3 * g - 3 + n), (long)g, (long)n);
    if (E->red.notes & 4)
        strbuf_puts(&b, "\n  (terms without Theta are integrated as usual and added)");
    if (first && g > 0 && !(E->red.notes & 1))
        strbuf_printf(&b, "\n  (Theta has degree 2g-2+n = %ld on Mbar_{%ld,%ld}: only the part of degree g-1 = %ld "
                          "of its cofactor counts, and there is none)", (long)(2 * g - 2 + n), (long)g, (long)n, (long)(g - 1));
    fprintf(I->out, "%s\n", b.data);
    strbuf_clear(&b);
}

int theta_explain(interp *I, const node *where, slong g, slong n, const value *integrand)
{
    if (2 * g - 2 + n <= 0) {
        diag_error(&where->loc, "Mbar_{%ld,%ld} is not a stable moduli space (needs 2g-2+n > 0)", (long)g, (long)n);
        return 0;
    }
    theta_explain_walk E;
    memset(&E, 0, sizeof E);
    E.red.I = I;
    E.red.g = g;
    E.where = where;
    E.n = n;
    int ok = theta_each_term(integrand->cls, theta_explain_term, &E);
    if (ok)
        theta_explain_print(I, &E);
    for (slong i = 0; i < E.red.len; i++) {
        free(E.red.keys[i]);
        fmpq_mpoly_clear(E.red.coeffs + i, I->ring.ctx);
    }
    free(E.red.keys);
    free(E.red.coeffs);
    return ok;
}
