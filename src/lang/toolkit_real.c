/* The sequence toolkit on real data: ratios, diffs, richardson and fitexp
   by ball arithmetic when a list holds a real (or a decimal string, read as
   a ball one unit wide in its last digit). Exact lists never come here. */
#include <stdlib.h>

#include "builtins.h"
#include "real_funcs.h"
#include "util.h"

#ifdef PSIKAPPA_FLINT3_ARB
#include <flint/arb_mat.h>
#else
#include <arb_mat.h>
#endif

int toolkit_arb_of_decimal(arb_t r, const char *s, slong prec);   /* toolkit_numeric.c */

int toolkit_list_is_real(const value *xs)
{
    if (xs->kind != V_LIST)
        return 0;
    for (slong i = 0; i < xs->len; i++)
        if (xs->items[i]->kind == V_REAL || xs->items[i]->kind == V_STR)
            return 1;
    return 0;
}

/* The working precision for the list: the interpreter's, or more when its
   reals are known more accurately. */
static slong tkr_prec(interp *I, const value *xs)
{
    slong p = real_work_prec(I);
    for (slong i = 0; i < xs->len; i++) {
        const value *v = xs->items[i];
        if (v->kind == V_REAL && !arb_is_exact(v->re) && arb_rel_accuracy_bits(v->re) + 32 > p)
            p = arb_rel_accuracy_bits(v->re) + 32;
    }
    return p;
}

/* Reads the list argument i into v (xs->len balls); 0 after naming the bad item. */
static int tkr_read(interp *I, const node *call, const value *xs, int i, arb_ptr v, slong prec)
{
    for (slong j = 0; j < xs->len; j++) {
        const value *it = xs->items[j];
        int ok = it->kind == V_STR ? toolkit_arb_of_decimal(v + j, it->str, prec) : real_applies(I, it);
        if (ok && it->kind != V_STR)
            ok = real_get_ball(I, call, v + j, it, prec, "the toolkit");
        if (!ok) {
            char *msg = xasprintf("item %ld of this list is not a real number (a number in pi, a real, or a decimal "
                                  "string such as \"1.25\")", (long)(j + 1));
            builtin_fail_at(call, i, msg);
            free(msg);
            return 0;
        }
    }
    return 1;
}

/* A list of reals from balls v[0..len). */
static value *tkr_list(interp *I, arb_srcptr v, slong len)
{
    value *r = value_new_list(len, &I->ring);
    for (slong i = 0; i < len; i++) {
        r->items[i] = value_new_real(&I->ring);
        arb_set(r->items[i]->re, v + i);
    }
    return r;
}

/* ratios (op 0) or diffs (op 1) of a real list. */
value *toolkit_real_step(interp *I, const node *call, const value *xs, int op)
{
    slong prec = tkr_prec(I, xs), n = xs->len;
    arb_ptr v = _arb_vec_init(n), w = _arb_vec_init(n);
    value *r = NULL;
    int ok = tkr_read(I, call, xs, 0, v, prec);
    for (slong i = 0; ok && i + 1 < n; i++) {
        if (op == 1) {
            arb_sub(w + i, v + i + 1, v + i, prec);
        } else if (arb_contains_zero(v + i)) {
            char *msg = xasprintf("xs[%ld] may be zero (its ball contains 0), so xs[%ld]/xs[%ld] is undefined",
                                  (long)(i + 1), (long)(i + 2), (long)(i + 1));
            builtin_fail_at(call, 0, msg);
            free(msg);
            ok = 0;
        } else {
            arb_div(w + i, v + i + 1, v + i, prec);
        }
    }
    if (ok)
        r = tkr_list(I, w, n - 1);
    _arb_vec_clear(v, n);
    _arb_vec_clear(w, n);
    return r;
}

/* richardson of order k with xs[1] = a_{n0}, by the same integer weights as the exact one. */
value *toolkit_real_richardson(interp *I, const node *call, const value *xs, slong k, slong n0)
{
    slong prec = tkr_prec(I, xs), n = xs->len;
    arb_ptr v = _arb_vec_init(n), w = _arb_vec_init(n - k);
    value *r = NULL;
    if (tkr_read(I, call, xs, 0, v, prec)) {
        fmpz_t c, t, kfac;
        fmpz_init(c);
        fmpz_init(t);
        fmpz_init(kfac);
        fmpz_fac_ui(kfac, (ulong)k);
        arb_t term;
        arb_init(term);
        for (slong i = 0; i + k < n; i++) {
            for (slong j = 0; j <= k; j++) {
                fmpz_bin_uiui(c, (ulong)k, (ulong)j);
                fmpz_set_si(t, n0 + i + j);
                fmpz_pow_ui(t, t, (ulong)k);
                fmpz_mul(c, c, t);
                if ((k + j) % 2)
                    fmpz_neg(c, c);
                arb_mul_fmpz(term, v + i + j, c, prec);
                arb_add(w + i, w + i, term, prec);
            }
            arb_div_fmpz(w + i, w + i, kfac, prec);
        }
        arb_clear(term);
        fmpz_clear(c);
        fmpz_clear(t);
        fmpz_clear(kfac);
        r = tkr_list(I, w, n - k);
    }
    _arb_vec_clear(v, n);
    _arb_vec_clear(w, n - k);
    return r;
}

/* fitexp: c_0..c_{K-1} of a_n = sum c_j/n^j at the last K terms (first = 0-based
   position of the first of them, whose index is n_first), by a ball linear solve. */
value *toolkit_real_fitexp(interp *I, const node *call, const value *xs, slong K, slong first, slong n_first)
{
    slong prec = tkr_prec(I, xs) + 2 * K * 8;   /* the Vandermonde system loses about 8 bits per unknown */
    arb_ptr v = _arb_vec_init(xs->len);
    value *r = NULL;
    arb_mat_t M, B, X;
    arb_mat_init(M, K, K);
    arb_mat_init(B, K, 1);
    arb_mat_init(X, K, 1);
    if (tkr_read(I, call, xs, 0, v, prec)) {
        for (slong i = 0; i < K; i++) {
            for (slong j = 0; j < K; j++) {
                arb_set_si(arb_mat_entry(M, i, j), n_first + i);
                arb_pow_ui(arb_mat_entry(M, i, j), arb_mat_entry(M, i, j), (ulong)j, prec);
                arb_inv(arb_mat_entry(M, i, j), arb_mat_entry(M, i, j), prec);
            }
            arb_set(arb_mat_entry(B, i, 0), v + first + i);
        }
        if (arb_mat_solve(X, M, B, prec)) {
            r = value_new_list(K, &I->ring);
            for (slong j = 0; j < K; j++) {
                r->items[j] = value_new_real(&I->ring);
                arb_set(r->items[j]->re, arb_mat_entry(X, j, 0));
            }
        } else {
            builtin_fail_at(call, 2, "the fit cannot be solved at this precision (raise it with precision D)");
        }
    }
    arb_mat_clear(M);
    arb_mat_clear(B);
    arb_mat_clear(X);
    _arb_vec_clear(v, xs->len);
    return r;
}
