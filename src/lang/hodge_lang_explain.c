/* explain for integrals with Hodge classes: the integrand with every lambda monomial written in ch
 * classes (Newton's identities, hodge_lambda_ch_poly), then the steps of Mumford's
 * Grothendieck-Riemann-Roch formula removing one ch factor at a time (the terms of
 * hodge_mumford_terms with their Bernoulli weights), down to psi-kappa integrals, printed with
 * their values.  Only Mumford's formula is applied here (the engine also removes psi exponents 0
 * and 1 by the string and dilaton equations), and the output stops after HX_MAX_LINES steps.
 */
#include <stdlib.h>
#include <string.h>

#include "classes/cpoly.h"
#include "hodge/hodge.h"
#include "hodge_lang.h"
#include "keymap.h"
#include "strbuf.h"
#include "util.h"

/* The integrand of explain as a sum of psi-kappa-ch monomials: keys[i] holds psi_1..psi_n,
   kappa_1..kappa_D, ch_1..ch_D exponents, coeffs[i] its coefficient (both owned). */
typedef struct {
    interp *I;
    slong g, n, D, len, cap;
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
    slong ldeg = 0;
    for (slong j = 1; j <= lmax; j++)
        ldeg += j * lmult[j];
    slong nv = ldeg > 0 ? (ldeg + 1) / 2 : 1;
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

/* Terms of the ch sum written out at most. */
#define HX_MAX_SUM_TERMS 40

/* Prints the source text of where, then "  = " and the sum S (its first HX_MAX_SUM_TERMS terms). */
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
    slong shown = 0, total = 0;
    for (slong i = 0; i < S->len; i++) {
        if (fmpq_mpoly_is_zero(S->coeffs + i, S->I->ring.ctx))
            continue;
        if (total++ < HX_MAX_SUM_TERMS)
            hodge_put_term(&b, S, i, lead), shown++;
        lead = 0;
    }
    if (lead)
        strbuf_putc(&b, '0');
    if (total > shown)
        strbuf_printf(&b, " + ... (%ld terms in all)", (long)total);
    fprintf(out, "%s\n", b.data);
    strbuf_clear(&b);
}

/* Steps and psi-kappa integrals printed at most (the rest is summarised in one line). */
#define HX_MAX_LINES 24

/* The integrands met by the walk, each once: keys[i] is the normal form of hodge_mono
   (g, n, d descending, kmax, km[1..kmax], cmax, cm[1..cmax]), index by keymap. */
typedef struct {
    slong len, cap;
    slong **keys;
    keymap index;                      /* key -> position */
} hx_states;

/* One term of a step: coeff * int A (* int B when b >= 0), a <= b. */
typedef struct {
    slong a, b;
    fmpq_t coeff;
} hx_term;

typedef struct {
    hx_states *S;
    hx_term *t;
    slong len, cap;
} hx_step;

/* The normal form of M into a new array (owned by the caller); *len gets its length. */
static slong *hx_key(const hodge_mono *M, slong *len)
{
    slong kmax = M->kmax, cmax = M->cmax, p = 0;
    while (kmax > 0 && M->km[kmax] == 0)
        kmax--;
    while (cmax > 0 && M->cm[cmax] == 0)
        cmax--;
    slong *k = xmalloc((size_t)(M->n + kmax + cmax + 4) * sizeof(slong));
    k[p++] = M->g, k[p++] = M->n;
    for (slong i = 0; i < M->n; i++, p++) {
        slong v = M->d[i], j = p;
        for (; j > 2 && k[j - 1] < v; j--)          /* insertion: descending */
            k[j] = k[j - 1];
        k[j] = v;
    }
    k[p++] = kmax;
    for (slong j = 1; j <= kmax; j++)
        k[p++] = M->km[j];
    k[p++] = cmax;
    for (slong j = 1; j <= cmax; j++)
        k[p++] = M->cm[j];
    *len = p;
    return k;
}

/* The view of a stored key as an integrand (arrays point into the key; index 0 of km and cm is
   the count before them, never read as a multiplicity). */
static hodge_mono hx_mono(const slong *k)
{
    hodge_mono M;
    M.g = k[0], M.n = k[1], M.d = (slong *)k + 2;
    M.kmax = k[2 + M.n], M.km = (slong *)k + 2 + M.n;
    M.cmax = k[3 + M.n + M.kmax], M.cm = (slong *)k + 3 + M.n + M.kmax;
    return M;
}

/* Position of M among the states, adding it when new. */
static slong hx_state(hx_states *S, const hodge_mono *M)
{
    slong len, *k = hx_key(M, &len);
    const fmpq *hit = keymap_get(&S->index, k, len);
    if (hit != NULL) {
        free(k);
        return (slong)fmpz_get_si(fmpq_numref(hit));
    }
    if (S->len == S->cap) {
        S->cap = S->cap ? 2 * S->cap : 16;
        S->keys = xrealloc(S->keys, (size_t)S->cap * sizeof(slong *));
    }
    fmpq_t pos;
    fmpq_init(pos);
    fmpq_set_si(pos, S->len, 1);
    keymap_set(&S->index, k, len, pos);
    fmpq_clear(pos);
    S->keys[S->len] = k;
    return S->len++;
}

/* Sink of hodge_mumford_terms: adds w * A (* B) to the step, merging equal terms. */
static int hx_step_add(void *data, const fmpq_t w, const hodge_mono *A, const hodge_mono *B)
{
    hx_step *T = data;
    if (hodge_mono_vanishes(A) || (B != NULL && hodge_mono_vanishes(B)))
        return WK_OK;
    slong a = hx_state(T->S, A), b = B != NULL ? hx_state(T->S, B) : -1, i;
    if (b >= 0 && b < a) {
        slong t = a;
        a = b, b = t;
    }
    for (i = 0; i < T->len && (T->t[i].a != a || T->t[i].b != b); i++)
        ;
    if (i == T->len) {
        if (T->len == T->cap) {
            T->cap = T->cap ? 2 * T->cap : 16;
            T->t = xrealloc(T->t, (size_t)T->cap * sizeof(hx_term));
        }
        T->t[i].a = a, T->t[i].b = b;
        fmpq_init(T->t[i].coeff);
        T->len++;
    }
    fmpq_add(T->t[i].coeff, T->t[i].coeff, w);
    return WK_OK;
}

/* Appends "name_j^m" for the nonzero m[1..mmax], space separated; *first tracks the separator. */
static void hx_put_classes(strbuf *b, const char *name, const slong *m, slong mmax, int *first)
{
    for (slong j = 1; j <= mmax; j++) {
        if (m[j] == 0)
            continue;
        strbuf_printf(b, "%s%s_%ld", *first ? "" : " ", name, (long)j);
        if (m[j] > 1)
            strbuf_printf(b, "^%ld", (long)m[j]);
        *first = 0;
    }
}

/* Appends <ch_1^2 kappa_1 | tau_0^2>_g: classes, then the points as tau_d (ascending). */
static void hx_put_state(strbuf *b, const hx_states *S, slong i)
{
    hodge_mono M = hx_mono(S->keys[i]);
    int first = 1;
    strbuf_putc(b, '<');
    hx_put_classes(b, "ch", M.cm, M.cmax, &first);
    hx_put_classes(b, "kappa", M.km, M.kmax, &first);
    if (M.n > 0 && !first)
        strbuf_puts(b, " |");
    for (slong p = M.n - 1; p >= 0;) {
        slong q = p;
        while (q >= 0 && M.d[q] == M.d[p])
            q--;
        strbuf_printf(b, "%stau_%ld", first && p == M.n - 1 ? "" : " ", (long)M.d[p]);
        if (p - q > 1)
            strbuf_printf(b, "^%ld", (long)(p - q));
        p = q;
    }
    strbuf_printf(b, ">_%ld", (long)M.g);
}

/* Appends a rational coefficient of a written-out sum: "c*", "-c*", "" or "-" when first, else
   " + c*", " - c*", " + ", " - " (c = 1 is not written). */
static void hx_put_coeff(strbuf *b, const fmpq_t c, int first)
{
    fmpq_t a;
    fmpq_init(a);
    fmpq_abs(a, c);
    strbuf_puts(b, fmpq_sgn(c) < 0 ? (first ? "-" : " - ") : (first ? "" : " + "));
    if (!fmpq_is_one(a)) {
        char *s = fmpq_get_str(NULL, 10, a);
        strbuf_printf(b, "%s*", s);
        flint_free(s);
    }
    fmpq_clear(a);
}

/* Prints one step: "  ch_k, B_{k+1}/(k+1)! = w: <S>_g = w*(terms)". */
static void hx_print_step(FILE *out, const hx_states *S, slong i, slong k, const fmpq_t w, const hx_step *T)
{
    strbuf b;
    int first = 1;
    char *ws = fmpq_get_str(NULL, 10, w);
    strbuf_init(&b);
    strbuf_printf(&b, "  ch_%ld, B_%ld/%ld! = %s: ", (long)k, (long)(k + 1), (long)(k + 1), ws);
    hx_put_state(&b, S, i);
    strbuf_printf(&b, " = %s*(", ws);
    for (slong t = 0; t < T->len; t++) {
        if (fmpq_is_zero(T->t[t].coeff))
            continue;
        hx_put_coeff(&b, T->t[t].coeff, first);
        hx_put_state(&b, S, T->t[t].a);
        if (T->t[t].b >= 0) {
            strbuf_putc(&b, '*');
            hx_put_state(&b, S, T->t[t].b);
        }
        first = 0;
    }
    strbuf_puts(&b, first ? "0)" : ")");
    fprintf(out, "%s\n", b.data);
    flint_free(ws);
    strbuf_clear(&b);
}

/* One step of the walk on state i (which has ch factors): the smallest ch index goes. */
static int hx_walk_step(FILE *out, hodge_ctx *H, hx_states *S, slong i)
{
    hodge_mono M = hx_mono(S->keys[i]);
    hx_step T = {S, NULL, 0, 0};
    slong k = 1;
    fmpq_t w;
    while (M.cm[k] == 0)
        k += 2;
    fmpq_init(w);
    int st = hodge_mumford_terms(w, H, &M, k, hx_step_add, &T);
    if (st == WK_OK)
        hx_print_step(out, S, i, k, w, &T);
    for (slong t = 0; t < T.len; t++)
        fmpq_clear(T.t[t].coeff);
    free(T.t);
    fmpq_clear(w);
    return st;
}

/* Prints the psi-kappa integrals (no ch factor) met by the walk with their values. */
static int hx_print_leaves(FILE *out, hodge_ctx *H, const hx_states *S)
{
    slong shown = 0, total = 0;
    int st = WK_OK;
    fmpq_t v;
    fmpq_init(v);
    for (slong i = 0; i < S->len && st == WK_OK; i++) {
        hodge_mono M = hx_mono(S->keys[i]);
        if (M.cmax > 0)
            continue;
        if (total++ == 0)
            fprintf(out, "  psi-kappa integrals (pushforward reduction):\n");
        if (shown == HX_MAX_LINES)
            continue;
        st = hodge_integral(v, H, HODGE_ROUTE_GRR, M.g, M.d, M.n, M.km, M.kmax, NULL, 0);
        strbuf b;
        strbuf_init(&b);
        strbuf_puts(&b, "    ");
        hx_put_state(&b, S, i);
        char *s = fmpq_get_str(NULL, 10, v);
        fprintf(out, "%s = %s\n", b.data, s);
        flint_free(s);
        strbuf_clear(&b);
        shown++;
    }
    if (total > shown)
        fprintf(out, "    ... and %ld more\n", (long)(total - shown));
    fmpq_clear(v);
    return st;
}

/* The walk from the monomials of the ch sum: each state with ch factors once, breadth first. */
static int hx_walk(FILE *out, hodge_ctx *H, const hodge_sum *Sum)
{
    hx_states S = {0, 0, NULL, {0}};
    slong D = Sum->D, steps = 0, i;
    slong *km = xcalloc((size_t)(2 * D + 2), sizeof(slong)), *cm = km + D + 1;
    int st = WK_OK;
    keymap_init(&S.index);
    for (slong t = 0; t < Sum->len; t++) {
        if (fmpq_mpoly_is_zero(Sum->coeffs + t, Sum->I->ring.ctx))
            continue;
        hodge_mono M = {Sum->g, Sum->n, D, D, Sum->keys[t], km, cm};
        for (slong j = 1; j <= D; j++)
            km[j] = Sum->keys[t][Sum->n + j - 1], cm[j] = Sum->keys[t][Sum->n + D + j - 1];
        if (!hodge_mono_vanishes(&M))
            hx_state(&S, &M);
    }
    for (i = 0; i < S.len && st == WK_OK && steps < HX_MAX_LINES; i++)
        if (hx_mono(S.keys[i]).cmax > 0)
            st = hx_walk_step(out, H, &S, i), steps++;
    for (; i < S.len && hx_mono(S.keys[i]).cmax == 0; i++)
        ;
    if (st == WK_OK && i < S.len)
        fprintf(out, "  ... the reduction goes on the same way (only the first %d steps are shown)\n", HX_MAX_LINES);
    else if (st == WK_OK)
        st = hx_print_leaves(out, H, &S);
    for (slong j = 0; j < S.len; j++)
        free(S.keys[j]);
    free(S.keys);
    keymap_clear(&S.index);
    free(km);
    return st;
}

/* Counts the terms of the integrand that have a closed form (hodge_closed.c). */
static int hx_count_closed(void *data, const slong *psi, slong n, const slong *kmult, slong kmax,
                           const slong *lmult, slong lmax, const slong *cmult, slong cmax, const fmpq_mpoly_t coeff)
{
    slong *counts = data;
    (void)coeff;
    int kind = hodge_closed_kind(counts[0], psi, n, kmult, kmax, lmult, lmax, cmult, cmax);
    counts[kind]++;
    return WK_OK;
}

/* Names the closed forms that give terms of the integrand instead of the reduction shown. */
static void hx_print_closed(FILE *out, const cpoly *P)
{
    slong counts[3] = {P->g, 0, 0};
    cpoly_foreach_top_hodge(P, hx_count_closed, counts);
    if (counts[HODGE_CLOSED_TOP_PAIR] > 0)
        fprintf(out, "  (the value of prod psi_i^{a_i} lambda_g lambda_{g-1}, all a_i >= 1, comes from the closed form "
                     "(2g-3+n)! |B_2g| / (2^(2g-1) (2g)! prod (2a_i-1)!!))\n");
    if (counts[HODGE_CLOSED_CUBED] > 0)
        fprintf(out, "  (the value of lambda_{g-1}^3 comes from the closed form |B_2g| |B_(2g-2)| / (2g (2g-2) (2g-2)!))\n");
}

int hodge_lang_explain(interp *I, const node *where, const cpoly *P)
{
    hodge_sum S = {I, P->g, P->n, P->D > 0 ? P->D : 0, 0, 0, NULL, NULL};
    hodge_ctx *H = hodge_lang_ctx(I);
    int st = H ? cpoly_foreach_top_hodge(P, hodge_sum_term, &S) : WK_LIMIT;
    if (st == WK_OK) {
        hodge_sum_print(I->out, &S, where);
        st = hx_walk(I->out, H, &S);
    }
    if (st == WK_OK)
        hx_print_closed(I->out, P);
    if (st != WK_OK)
        hodge_lang_report(I, where, st);
    for (slong i = 0; i < S.len; i++) {
        free(S.keys[i]);
        fmpq_mpoly_clear(S.coeffs + i, I->ring.ctx);
    }
    free(S.keys);
    free(S.coeffs);
    return st == WK_OK;
}
