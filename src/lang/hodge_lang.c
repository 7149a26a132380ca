/* The language's bridge to the Hodge engine: which integrands hold Hodge classes, the session's
   engine context and explain; the names are in hodge_names.c, the routes in route_hodge.c. */
#include <stdlib.h>
#include <string.h>

#include "cancel.h"
#include "classes/cpoly.h"
#include "class_expand.h"
#include "diag.h"
#include "hodge/hodge.h"
#include "hodge_lang.h"
#include "strbuf.h"
#include "util.h"
#include "failure.h"

int hodge_lang_applies(const value *integrand)
{
    return integrand->kind == V_CLASS && cx_has_hodge(integrand->cls);
}

void hodge_lang_clear(interp *I)
{
    hodge_free(I->hodge);
    I->hodge = NULL;
}

/* The engine context, created on first use with the correlator table and the limits. */
hodge_ctx *hodge_lang_ctx(interp *I)
{
    if (I->hodge == NULL) {
        I->hodge = hodge_new(I->wk);
        if (I->hodge == NULL)
            return NULL;
        hodge_set_cancel(I->hodge, &cancel_flag);
        hodge_set_limit(I->hodge, I->lim.max_table > 1e15 ? (slong)1e15 : (slong)I->lim.max_table);
    }
    return I->hodge;
}


slong hodge_lang_degree(const slong *lmult, slong lmax, const slong *cmult, slong cmax)
{
    slong s = 0;
    for (slong j = 1; j <= lmax; j++)
        s += j * lmult[j];
    for (slong k = 1; k <= cmax; k++)
        s += k * cmult[k];
    return s;
}

/* The integrand of explain as a sum of psi-kappa-ch monomials: keys[i] holds psi_1..psi_n,
   kappa_1..kappa_D, ch_1..ch_D exponents, coeffs[i] its coefficient (both owned). */
typedef struct {
    interp *I;
    slong n, D, len, cap;
    slong **keys;
    fmpq_mpoly_struct *coeffs;
} hodge_sum;

/* S += c * monomial(key) (key of n + 2D entries, copied). */
static void hodge_sum_add(hodge_sum *S, const slong *key, const fmpq_mpoly_t c)
{
    slong w = S->n + 2 * S->D, i;
    for (i = 0; i < S->len; i++)
        if (memcmp(S->keys[i], key, (size_t)w * sizeof(slong)) == 0)
            break;
    if (i == S->len) {
        if (S->len == S->cap) {
            S->cap = S->cap ? 2 * S->cap : 8;
            S->keys = xrealloc(S->keys, (size_t)S->cap * sizeof(slong *));
            S->coeffs = xrealloc(S->coeffs, (size_t)S->cap * sizeof(fmpq_mpoly_struct));
        }
        S->keys[i] = xmalloc(((size_t)w + 1) * sizeof(slong));
        memcpy(S->keys[i], key, (size_t)w * sizeof(slong));
        fmpq_mpoly_init(S->coeffs + i, S->I->ring.ctx);
        S->len++;
    }
    fmpq_mpoly_add(S->coeffs + i, S->coeffs + i, c, S->I->ring.ctx);
}

/* Adds one top term with its lambda monomial written in ch classes (Newton's identities). */
static int hodge_sum_term(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                          const slong *lmult, slong lmax, const slong *cmult, slong cmax, const fmpq_mpoly_t coeff)
{
    hodge_sum *S = data;
    slong ldeg = hodge_lang_degree(lmult, lmax, NULL, 0), nv = ldeg > 0 ? (ldeg + 1) / 2 : 1;
    slong *key = xcalloc((size_t)(n + 2 * S->D) + 1, sizeof(slong)), *e = xcalloc((size_t)nv + 1, sizeof(slong));
    fmpq_mpoly_ctx_t R;
    fmpq_mpoly_t P, c;
    fmpq_t q;
    fmpq_mpoly_ctx_init(R, nv, ORD_LEX);
    fmpq_mpoly_init(P, R);
    fmpq_mpoly_init(c, S->I->ring.ctx);
    fmpq_init(q);
    int st = hodge_lambda_ch_poly(P, lmult, lmax, R);
    for (slong t = 0; st == WK_OK && t < fmpq_mpoly_length(P, R); t++) {
        fmpq_mpoly_get_term_exp_si(e, P, t, R);
        fmpq_mpoly_get_term_coeff_fmpq(q, P, t, R);
        memcpy(key, psi, (size_t)n * sizeof(slong));
        for (slong j = 1; j <= S->D; j++)
            key[n + j - 1] = j <= kmax ? kmult[j] : 0, key[n + S->D + j - 1] = j <= cmax ? cmult[j] : 0;
        for (slong v = 0; v < nv && 2 * v + 1 <= S->D; v++)
            key[n + S->D + 2 * v] += e[v];
        fmpq_mpoly_scalar_mul_fmpq(c, coeff, q, S->I->ring.ctx);
        hodge_sum_add(S, key, c);
    }
    fmpq_clear(q);
    fmpq_mpoly_clear(c, S->I->ring.ctx);
    fmpq_mpoly_clear(P, R);
    fmpq_mpoly_ctx_clear(R);
    free(key);
    free(e);
    return st;
}

/* Appends "name_i^e" factors for the nonzero entries of a[0..len), joined by '*'. */
static void hodge_put_factors(strbuf *b, const char *name, const slong *a, slong len, int *first)
{
    for (slong i = 0; i < len; i++) {
        if (a[i] == 0)
            continue;
        strbuf_printf(b, "%s%s_%ld", *first ? "" : "*", name, (long)(i + 1));
        if (a[i] > 1)
            strbuf_printf(b, "^%ld", (long)a[i]);
        *first = 0;
    }
}

/* Appends one summand: sign, coefficient (omitted when 1 before a monomial), monomial. */
static void hodge_put_term(strbuf *b, const hodge_sum *S, slong i, int lead)
{
    fmpq_mpoly_t a;
    fmpq_t c;
    strbuf m;
    int none = 1;
    fmpq_mpoly_init(a, S->I->ring.ctx);
    fmpq_init(c);
    strbuf_init(&m);
    hodge_put_factors(&m, "psi", S->keys[i], S->n, &none);
    hodge_put_factors(&m, "kappa", S->keys[i] + S->n, S->D, &none);
    hodge_put_factors(&m, "ch", S->keys[i] + S->n + S->D, S->D, &none);
    fmpq_mpoly_set(a, S->coeffs + i, S->I->ring.ctx);
    int single = fmpq_mpoly_length(a, S->I->ring.ctx) == 1;
    fmpq_mpoly_get_term_coeff_fmpq(c, a, 0, S->I->ring.ctx);
    if (single && fmpq_sgn(c) < 0) {
        strbuf_puts(b, lead ? "-" : " - ");
        fmpq_mpoly_neg(a, a, S->I->ring.ctx);
    } else if (!lead) {
        strbuf_puts(b, " + ");
    }
    char *s = scalar_get_str(a, &S->I->ring);
    if (none)
        strbuf_puts(b, s);
    else if (!fmpq_mpoly_is_one(a, S->I->ring.ctx))
        strbuf_printf(b, single ? "%s*" : "(%s)*", s);
    strbuf_puts(b, none ? "" : m.data);
    free(s);
    strbuf_clear(&m);
    fmpq_clear(c);
    fmpq_mpoly_clear(a, S->I->ring.ctx);
}

/* Prints the source text of where, then "  = " and the sum S. */
static void hodge_sum_print(FILE *out, const hodge_sum *S, const node *where)
{
    strbuf b;
    const char *line;
    int lead = 1;
    strbuf_init(&b);
    size_t len = source_line(where->loc.src, where->loc.first_line, &line);
    if (where->loc.last_line == where->loc.first_line && (size_t)where->loc.last_column <= len + 1)
        strbuf_printf(&b, "%.*s\n", where->loc.last_column - where->loc.first_column,
                      line + where->loc.first_column - 1);
    strbuf_puts(&b, "  = ");
    for (slong i = 0; i < S->len; i++) {
        if (fmpq_mpoly_is_zero(S->coeffs + i, S->I->ring.ctx))
            continue;
        hodge_put_term(&b, S, i, lead);
        lead = 0;
    }
    if (lead)
        strbuf_putc(&b, '0');
    fprintf(out, "%s\n", b.data);
    strbuf_clear(&b);
}

int hodge_lang_explain(interp *I, const node *where, const cpoly *P)
{
    hodge_sum S = {I, P->n, P->D > 0 ? P->D : 0, 0, 0, NULL, NULL};
    int st = cpoly_foreach_top_hodge(P, hodge_sum_term, &S);
    if (st == WK_OK)
        hodge_sum_print(I->out, &S, where);
    else
        failure_report(where, "the Hodge engine", st, WK_CANCELLED, NULL);
    for (slong i = 0; i < S.len; i++) {
        free(S.keys[i]);
        fmpq_mpoly_clear(S.coeffs + i, I->ring.ctx);
    }
    free(S.keys);
    free(S.coeffs);
    return st == WK_OK;
}
