/* Builtins for the asymptotic analysis of exact sequences: ratios, diffs,
   richardson and fitexp (all exact), and the table builtins_toolkit, which
   also lists the numerical builtins of toolkit_numeric.c and the plot of
   toolkit_svg.c. Sequences are lists of numbers; item i of a list is a_{n0+i-1}. */
#include <stdlib.h>
#include <string.h>

#include <flint/fmpq_mat.h>
#include <flint/fmpz_vec.h>

#include "builtins.h"
#include "util.h"
#include "eval.h"
#include "failure.h"

/* toolkit_numeric.c */
value *toolkit_ball(interp *I, const node *call, value **args);
value *toolkit_recognise(interp *I, const node *call, value **args);
value *toolkit_j0_zero(interp *I, const node *call, value **args);
value *toolkit_j1(interp *I, const node *call, value **args);
value *toolkit_mz_constant(interp *I, const node *call, value **args);
/* toolkit_real.c: the same on lists holding reals or decimal strings */
int toolkit_list_is_real(const value *xs);
value *toolkit_real_step(interp *I, const node *call, const value *xs, int op);
value *toolkit_real_richardson(interp *I, const node *call, const value *xs, slong k, slong n0);
value *toolkit_real_fitexp(interp *I, const node *call, const value *xs, slong K, slong first, slong n_first);
/* toolkit_svg.c */
value *toolkit_svgplot(interp *I, const node *call, value **args);

/* Largest order / number of fitted coefficients: order 300 on 600 terms of
   (1+1/n)^n already takes a minute and a half, far beyond any useful fit. */
#define TOOLKIT_MAX_ORDER 200

/* Checks that argument i is a list of at least min numbers (V_NUM).
   Returns it, or NULL after naming the offending item or the short length. */
static const value *toolkit_get_numlist(const node *call, value **args, int i, slong min)
{
    const value *v = args[i];
    if (v->kind != V_LIST)
        return builtin_fail_at(call, i, "expected a list of numbers here, such as [1, 2, 3] or seq_{n=1..9} n^2");
    for (slong j = 0; j < v->len; j++)
        if (v->items[j]->kind != V_NUM) {
            char *msg = xasprintf("item %ld of this list is a %s, expected a number", (long)(j + 1),
                                  value_kind_name(v->items[j]));
            builtin_fail_at(call, i, msg);
            free(msg);
            return NULL;
        }
    if (v->len < min) {
        char *msg = xasprintf("this list has %ld item%s, at least %ld needed", (long)v->len,
                              v->len == 1 ? "" : "s", (long)min);
        builtin_fail_at(call, i, msg);
        free(msg);
        return NULL;
    }
    return v;
}

/* ratios(xs): [x_2/x_1, x_3/x_2, ...], exact. Powers of pi divide always;
   items with variables are divided only when the quotient is again a polynomial. */
static value *toolkit_ratios(interp *I, const node *call, value **args)
{
    if (toolkit_list_is_real(args[0]))
        return toolkit_real_step(I, call, args[0], 0);
    const value *xs = toolkit_get_numlist(call, args, 0, 1);
    if (!xs)
        return NULL;
    value *r = value_new_list(xs->len - 1, &I->ring);
    for (slong i = 0; i + 1 < xs->len; i++) {
        const fmpq_mpoly_struct *a = xs->items[i + 1]->num, *b = xs->items[i]->num;
        char *msg = NULL;
        /* fmpq_mpoly_divides aborts on a zero divisor: test first */
        if (fmpq_mpoly_is_zero(b, I->ring.ctx))
            msg = xasprintf("xs[%ld] is zero, so xs[%ld]/xs[%ld] is undefined", (long)(i + 1), (long)(i + 2),
                            (long)(i + 1));
        r->items[i] = value_new_num(&I->ring);
        if (!msg && !scalar_div(r->items[i]->num, a, b, &I->ring))
            msg = xasprintf("xs[%ld]/xs[%ld] is not a polynomial in the variables (Laurent in pi)", (long)(i + 2),
                            (long)(i + 1));
        if (msg) {
            builtin_fail_at(call, 0, msg);
            free(msg);
            value_release(r);
            return NULL;
        }
    }
    return r;
}

/* diffs(xs): [x_2 - x_1, x_3 - x_2, ...], exact for any numbers. */
static value *toolkit_diffs(interp *I, const node *call, value **args)
{
    if (toolkit_list_is_real(args[0]))
        return toolkit_real_step(I, call, args[0], 1);
    const value *xs = toolkit_get_numlist(call, args, 0, 1);
    if (!xs)
        return NULL;
    value *r = value_new_list(xs->len - 1, &I->ring);
    for (slong i = 0; i + 1 < xs->len; i++) {
        r->items[i] = value_new_num(&I->ring);
        fmpq_mpoly_sub(r->items[i]->num, xs->items[i + 1]->num, xs->items[i]->num, I->ring.ctx);
    }
    return r;
}

/* P[m] = (n0+m)^k for m = 0..len-1 and B[j] = (-1)^(k+j) binomial(k, j): the
   weight of a_{n+j} in R_n is B[j] P[n+j-n0] / k!, so each power is made once. */
static void toolkit_richardson_tables(fmpz *P, fmpz *B, slong len, slong k, slong n0)
{
    for (slong m = 0; m < len; m++) {
        fmpz_set_si(P + m, n0 + m);
        fmpz_pow_ui(P + m, P + m, (ulong)k);
    }
    for (slong j = 0; j <= k; j++) {
        fmpz_bin_uiui(B + j, (ulong)k, (ulong)j);
        if ((k + j) % 2)
            fmpz_neg(B + j, B + j);
    }
}

/* Reads the order / count argument i (lo..TOOLKIT_MAX_ORDER) and the starting
   index argument j (n0 >= 1, since the expansions are in powers of 1/n). */
static int toolkit_get_order_start(interp *I, const node *call, value **args, int i, slong lo, slong *k, int j,
                                   slong *n0)
{
    if (!builtin_get_slong(I, call, args, i, lo, TOOLKIT_MAX_ORDER, k)
        || !builtin_get_slong(I, call, args, j, WORD_MIN / 4, WORD_MAX / 4, n0))
        return 0;
    if (*n0 >= 1)
        return 1;
    builtin_fail_at(call, j, "the index n0 of the first term must be at least 1 (the expansion is in powers of 1/n)");
    return 0;
}

/* Sets r = k! R_n for the row starting at position i of xs (integer weights,
   one division by k! at the end). */
static void toolkit_richardson_row(fmpq_mpoly_t r, const value *xs, slong i, slong k, const fmpz *P, const fmpz *B,
                                   const fmpq_mpoly_ctx_t ctx)
{
    fmpz_t w;
    fmpq_mpoly_t t;
    fmpz_init(w);
    fmpq_mpoly_init(t, ctx);
    for (slong j = 0; j <= k; j++) {
        fmpz_mul(w, B + j, P + i + j);
        fmpq_mpoly_scalar_mul_fmpz(t, xs->items[i + j]->num, w, ctx);
        fmpq_mpoly_add(r, r, t, ctx);
    }
    fmpq_mpoly_clear(t, ctx);
    fmpz_clear(w);
}

/* richardson(xs, k, n0): R^(k)_n = sum_{j=0}^k (-1)^(k+j) (n+j)^k a_{n+j} / (j!(k-j)!)
   for every n with a_{n+k} in the list; exact, and equal to a when
   a_n = a + b_1/n + ... + b_k/n^k exactly. */
static value *toolkit_richardson(interp *I, const node *call, value **args)
{
    slong k, n0;
    int real = toolkit_list_is_real(args[0]);
    const value *xs = real ? args[0] : toolkit_get_numlist(call, args, 0, 1);
    if (!xs || !toolkit_get_order_start(I, call, args, 1, 0, &k, 2, &n0))
        return NULL;
    if (xs->len <= k) {
        char *msg = xasprintf("order %ld needs at least %ld terms, the list has %ld", (long)k, (long)(k + 1),
                              (long)xs->len);
        builtin_fail_at(call, 0, msg);
        free(msg);
        return NULL;
    }
    if (real)
        return toolkit_real_richardson(I, call, xs, k, n0);
    value *r = value_new_list(xs->len - k, &I->ring);
    fmpz *P = _fmpz_vec_init(xs->len), *B = _fmpz_vec_init(k + 1);
    fmpz_t kfac;
    fmpz_init(kfac);
    fmpz_fac_ui(kfac, (ulong)k);
    toolkit_richardson_tables(P, B, xs->len, k, n0);
    for (slong i = 0; i < r->len && !failure_cancelled(call); i++) {
        r->items[i] = value_new_num(&I->ring);
        toolkit_richardson_row(r->items[i]->num, xs, i, k, P, B, I->ring.ctx);
        fmpq_mpoly_scalar_div_fmpz(r->items[i]->num, r->items[i]->num, kfac, I->ring.ctx);
    }
    _fmpz_vec_clear(P, xs->len);
    _fmpz_vec_clear(B, k + 1);
    fmpz_clear(kfac);
    if (r->len > 0 && !r->items[r->len - 1]) {
        value_release(r);
        return NULL;
    }
    return r;
}

/* Sets M to the K x K matrix M_ij = 1/n_i^j, n_i = n_first + i (all n_i >= 1):
   row i says c_0 + c_1/n_i + ... + c_{K-1}/n_i^{K-1} = a_{n_i}. */
static void toolkit_fit_matrix(fmpq_mat_t M, slong K, slong n_first)
{
    for (slong i = 0; i < K; i++)
        for (slong j = 0; j < K; j++) {
            fmpq *e = fmpq_mat_entry(M, i, j);
            fmpz_one(fmpq_numref(e));
            fmpz_set_si(fmpq_denref(e), n_first + i);
            fmpz_pow_ui(fmpq_denref(e), fmpq_denref(e), (ulong)j);
        }
}

/* The distinct monomials of a list of polynomials (exponent vectors of
   nvars entries each), so that polynomial data become columns of rationals. */
typedef struct {
    slong n, alloc, nvars;
    ulong *exp; /* n vectors, owned */
} toolkit_monos;

/* Returns the column of monomial e, appending it when new. */
static slong toolkit_monos_find(toolkit_monos *m, const ulong *e)
{
    for (slong c = 0; c < m->n; c++)
        if (memcmp(m->exp + c * m->nvars, e, (size_t)m->nvars * sizeof(ulong)) == 0)
            return c;
    if (m->n == m->alloc) {
        m->alloc = 2 * m->alloc + 4;
        m->exp = xrealloc(m->exp, (size_t)(m->alloc * m->nvars) * sizeof(ulong));
    }
    memcpy(m->exp + m->n * m->nvars, e, (size_t)m->nvars * sizeof(ulong));
    return m->n++;
}

/* Collects the monomials of items first..first+K-1 of xs into m. */
static void toolkit_monos_collect(toolkit_monos *m, const value *xs, slong first, slong K,
                                  const fmpq_mpoly_ctx_t ctx)
{
    ulong *e = xcalloc((size_t)m->nvars, sizeof(ulong));
    for (slong i = first; i < first + K; i++)
        for (slong t = 0; t < fmpq_mpoly_length(xs->items[i]->num, ctx); t++) {
            fmpq_mpoly_get_term_exp_ui(e, xs->items[i]->num, t, ctx);
            toolkit_monos_find(m, e);
        }
    free(e);
}

/* Sets item j of r to c_j = sum_c X[j][c] monomial_c. */
static void toolkit_fit_assemble(value *r, const fmpq_mat_t X, const toolkit_monos *m, const scalar_ring *R)
{
    for (slong j = 0; j < r->len; j++) {
        r->items[j] = value_new_num(R);
        for (slong c = 0; c < m->n; c++)
            fmpq_mpoly_set_coeff_fmpq_ui(r->items[j]->num, fmpq_mat_entry(X, j, c), m->exp + c * m->nvars, R->ctx);
    }
}

/* Solves M X = B, B[i][c] the coefficient of monomial c in the i-th sampled
   term (first + i in xs), and fills r (K items). Returns 0 when FLINT finds
   M singular (it cannot be: the n_i are distinct and nonzero). */
static int toolkit_fit_solve(value *r, const value *xs, slong first, slong n_first, const scalar_ring *R)
{
    slong K = r->len;
    toolkit_monos m = {0, 0, fmpq_mpoly_ctx_nvars(R->ctx), NULL};
    toolkit_monos_collect(&m, xs, first, K, R->ctx);
    fmpq_mat_t M, B, X;
    fmpq_mat_init(M, K, K);
    fmpq_mat_init(B, K, m.n);
    fmpq_mat_init(X, K, m.n);
    toolkit_fit_matrix(M, K, n_first);
    for (slong i = 0; i < K; i++)
        for (slong c = 0; c < m.n; c++)
            fmpq_mpoly_get_coeff_fmpq_ui(fmpq_mat_entry(B, i, c), xs->items[first + i]->num, m.exp + c * m.nvars,
                                         R->ctx);
    /* with no monomial at all (every term zero) there is nothing to solve */
    int ok = m.n == 0 || fmpq_mat_solve(X, M, B);
    if (ok)
        toolkit_fit_assemble(r, X, &m, R);
    fmpq_mat_clear(M);
    fmpq_mat_clear(B);
    fmpq_mat_clear(X);
    free(m.exp);
    return ok;
}

/* fitexp(xs, n0, K): c_0..c_{K-1} with c_0 + c_1/n + ... + c_{K-1}/n^{K-1} = a_n
   at the last K terms, i.e. the solution of the K x K Vandermonde system in 1/n. */
static value *toolkit_fitexp(interp *I, const node *call, value **args)
{
    slong K, n0;
    int real = toolkit_list_is_real(args[0]);
    const value *xs = real ? args[0] : toolkit_get_numlist(call, args, 0, 1);
    if (!xs || !toolkit_get_order_start(I, call, args, 2, 1, &K, 1, &n0))
        return NULL;
    if (xs->len < K) {
        char *msg = xasprintf("fitting %ld coefficients needs %ld terms, the list has %ld", (long)K, (long)K,
                              (long)xs->len);
        builtin_fail_at(call, 0, msg);
        free(msg);
        return NULL;
    }
    slong first = xs->len - K; /* 0-based position of the first sampled term */
    if (real)
        return toolkit_real_fitexp(I, call, xs, K, first, n0 + first);
    value *r = value_new_list(K, &I->ring);
    if (toolkit_fit_solve(r, xs, first, n0 + first, &I->ring))
        return r;
    value_release(r);
    return builtin_fail_at(call, 2, "the system of the fit is singular");
}

const builtin builtins_toolkit[] = {
    {"ratios", 1, toolkit_ratios, "ratios(xs): [xs[2]/xs[1], xs[3]/xs[2], ...]"},
    {"diffs", 1, toolkit_diffs, "diffs(xs): [xs[2] - xs[1], xs[3] - xs[2], ...]"},
    {"richardson", 3, toolkit_richardson, "richardson(xs, k, n0): order-k extrapolation, xs[1] = a_{n0}"},
    {"fitexp", 3, toolkit_fitexp, "fitexp(xs, n0, K): c_0..c_{K-1} of a_n = sum c_j/n^j at the last K terms"},
    {"ball", 2, toolkit_ball, "ball(x, digits): x as an Arb ball \"[mid +/- rad]\""},
    {"recognise", 3, toolkit_recognise, "recognise(x, basis, digits): x as a rational combination of the basis"},
    {"bessel_j0_zero", 1, toolkit_j0_zero, "bessel_j0_zero(digits): the first positive zero of J_0"},
    {"bessel_j1", 2, toolkit_j1, "bessel_j1(x, digits): J_1(x) for x in Q[pi] or a decimal string"},
    {"mz_constant", 1, toolkit_mz_constant, "mz_constant(digits): 2/(x_0 J_1(x_0)), x_0 the first zero of J_0"},
    {"svgplot", 3, toolkit_svgplot, "svgplot(\"file.svg\", series, options)"},
    {NULL, 0, NULL, NULL},
};
