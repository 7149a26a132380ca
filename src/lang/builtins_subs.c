/* Substitution and the shape of polynomials: subs(P, m, v) replaces the
   variable or monomial m by v (exact when v is a number or polynomial, a real
   when v is a real and nothing but pi remains), degree(P, x) and
   coefficients(P, x). There is no imaginary unit: evaluation at L = 2 pi i of a
   polynomial even in L is subs(P, L^2, -4*pi^2). */
#include <stdlib.h>

#include "builtins.h"
#include "real_funcs.h"
#include "scalar_arb.h"
#include "util.h"

/* Reads argument i as a monomial with coefficient 1 in the declared variables
   (x, L_1^2, x*y^2), its exponents into a; 0 after reporting. */
static int subs_get_monomial(interp *I, const node *call, value **args, int i, ulong *a)
{
    const value *m = args[i];
    fmpq_t c;
    fmpq_init(c);
    int ok = m->kind == V_NUM && fmpq_mpoly_length(m->num, I->ring.ctx) == 1;
    if (ok) {
        fmpq_mpoly_get_term_coeff_fmpq(c, m->num, 0, I->ring.ctx);
        fmpq_mpoly_get_term_exp_ui(a, m->num, 0, I->ring.ctx);
        ok = fmpq_is_one(c) && a[SCALAR_PI] == 0 && a[SCALAR_PINV] == 0 && !fmpq_mpoly_is_fmpq(m->num, I->ring.ctx);
    }
    fmpq_clear(c);
    if (!ok)
        builtin_fail_at(call, i, "expected a formal variable or a monomial in them, such as L_1 or L_1^2 (coefficient "
                                 "1, no pi)");
    return ok;
}

/* How many times the monomial a divides the exponent vector e. */
static ulong subs_times(const ulong *e, const ulong *a)
{
    ulong j = WORD_MAX;
    for (int v = 0; v < SCALAR_PINV; v++)
        if (a[v] > 0 && e[v] / a[v] < j)
            j = e[v] / a[v];
    return j;
}

/* Splits p = sum_j R[j] m^j with no R[j] divisible by m; returns the number of
   parts (max j + 1) and sets *R to a new array of that many polynomials (the
   caller clears and frees them). */
static slong subs_split(interp *I, const fmpq_mpoly_t p, const ulong *a, fmpq_mpoly_struct **R)
{
    slong len = fmpq_mpoly_length(p, I->ring.ctx), parts = 1;
    ulong *e = xcalloc(SCALAR_MAX_VARS, sizeof(ulong));
    for (slong t = 0; t < len; t++) {
        fmpq_mpoly_get_term_exp_ui(e, p, t, I->ring.ctx);
        if ((slong)subs_times(e, a) + 1 > parts)
            parts = (slong)subs_times(e, a) + 1;
    }
    *R = xcalloc((size_t)parts, sizeof(fmpq_mpoly_struct));
    for (slong j = 0; j < parts; j++)
        fmpq_mpoly_init(*R + j, I->ring.ctx);
    fmpq_t c;
    fmpq_init(c);
    for (slong t = 0; t < len; t++) {
        fmpq_mpoly_get_term_exp_ui(e, p, t, I->ring.ctx);
        fmpq_mpoly_get_term_coeff_fmpq(c, p, t, I->ring.ctx);
        ulong j = subs_times(e, a);
        for (int v = 0; v < SCALAR_PINV; v++)
            e[v] -= j * a[v];
        fmpq_mpoly_push_term_fmpq_ui(*R + j, c, e, I->ring.ctx);
    }
    for (slong j = 0; j < parts; j++) {
        fmpq_mpoly_sort_terms(*R + j, I->ring.ctx);
        fmpq_mpoly_combine_like_terms(*R + j, I->ring.ctx);
    }
    fmpq_clear(c);
    free(e);
    return parts;
}

static void subs_free_parts(interp *I, fmpq_mpoly_struct *R, slong parts)
{
    for (slong j = 0; j < parts; j++)
        fmpq_mpoly_clear(R + j, I->ring.ctx);
    free(R);
}

/* Exact: r = sum_j R[j] v^j by Horner's rule. */
static value *subs_exact(interp *I, fmpq_mpoly_struct *R, slong parts, const fmpq_mpoly_t v)
{
    value *r = value_new_num(&I->ring);
    for (slong j = parts - 1; j >= 0; j--) {
        fmpq_mpoly_mul(r->num, r->num, v, I->ring.ctx);
        fmpq_mpoly_add(r->num, r->num, R + j, I->ring.ctx);
        scalar_normalise(r->num, &I->ring);
    }
    return r;
}

/* A real: every part must be a number in pi once m is replaced; Horner in balls. */
static value *subs_real(interp *I, const node *call, fmpq_mpoly_struct *R, slong parts, const value *v)
{
    for (slong j = 0; j < parts; j++)
        if (!scalar_is_pi_only(R + j, &I->ring))
            return builtin_fail_at(call, 0, "substituting a real needs the other formal variables gone first (a "
                                            "real cannot hold a variable): substitute them too");
    slong prec = real_work_prec(I);
    if (!arb_is_exact(v->re) && arb_rel_accuracy_bits(v->re) + 32 > prec)
        prec = arb_rel_accuracy_bits(v->re) + 32;
    value *r = value_new_real(&I->ring);
    arb_t c;
    arb_init(c);
    for (slong j = parts - 1; j >= 0; j--) {
        arb_mul(r->re, r->re, v->re, prec);
        scalar_get_arb(c, R + j, &I->ring, prec);
        arb_add(r->re, r->re, c, prec);
    }
    arb_clear(c);
    return r;
}

value *subs_apply(interp *I, const node *call, const value *p, const ulong *a, const value *v)
{
    fmpq_mpoly_struct *R;
    slong parts = subs_split(I, p->num, a, &R);
    value *r = v->kind == V_REAL ? subs_real(I, call, R, parts, v) : subs_exact(I, R, parts, v->num);
    subs_free_parts(I, R, parts);
    return r;
}

/* subs_lengths with exact arguments: one composition (FLINT), every other variable kept. */
static value *subs_lengths_exact(interp *I, const node *call, const value *p, const int *vars, slong n,
                                 value **args)
{
    slong nv = fmpq_mpoly_ctx_nvars(I->ring.ctx);
    fmpq_mpoly_struct *gens = flint_malloc((size_t)nv * sizeof(fmpq_mpoly_struct));
    fmpq_mpoly_struct **C = flint_malloc((size_t)nv * sizeof(fmpq_mpoly_struct *));
    for (slong k = 0; k < nv; k++) {
        fmpq_mpoly_init(gens + k, I->ring.ctx);
        fmpq_mpoly_gen(gens + k, k, I->ring.ctx);
        C[k] = gens + k;
    }
    for (slong i = 0; i < n; i++)
        C[vars[i]] = args[i]->num;
    value *r = value_new_num(&I->ring);
    if (fmpq_mpoly_compose_fmpq_mpoly(r->num, p->num, C, I->ring.ctx, I->ring.ctx))
        scalar_normalise(r->num, &I->ring);
    else {
        value_release(r);
        r = builtin_fail_at(call, -1, "the exponents of this substitution are too large");
    }
    for (slong k = 0; k < nv; k++)
        fmpq_mpoly_clear(gens + k, I->ring.ctx);
    flint_free(gens);
    flint_free(C);
    return r;
}

/* out = p at the real point a[0..n) of the variables vars[0..n): Horner in the first variable
   over values of the parts, each by the same rule in the others. Returns 0 after reporting
   when a variable other than these (or pi) remains. */
static int subs_lengths_arb(interp *I, const node *call, arb_t out, const fmpq_mpoly_t p, const int *vars,
                            slong n, arb_srcptr a, slong prec)
{
    if (n == 0) {
        if (!scalar_is_pi_only(p, &I->ring)) {
            builtin_fail_at(call, -1, "with a real argument the value is a real, which cannot hold the other formal "
                               "variables: substitute them first");
            return 0;
        }
        scalar_get_arb(out, p, &I->ring, prec);
        return 1;
    }
    ulong e[SCALAR_MAX_VARS] = {0};
    e[vars[0]] = 1;
    fmpq_mpoly_struct *R;
    slong parts = subs_split(I, p, e, &R);
    int ok = 1;
    arb_t c;
    arb_init(c);
    arb_zero(out);
    for (slong j = parts - 1; j >= 0 && ok; j--) {
        arb_mul(out, out, a, prec);
        ok = subs_lengths_arb(I, call, c, R + j, vars + 1, n - 1, a + 1, prec);
        arb_add(out, out, c, prec);
    }
    arb_clear(c);
    subs_free_parts(I, R, parts);
    return ok;
}

/* subs_lengths with a real argument: every argument a number (a real, or exact in pi). */
static value *subs_lengths_real(interp *I, const node *call, const value *p, const int *vars, slong n,
                                value **args)
{
    slong prec = real_work_prec(I);
    for (slong i = 0; i < n; i++) {
        if (args[i]->kind == V_NUM && !scalar_is_pi_only(args[i]->num, &I->ring))
            return builtin_fail_at(call, (int)i, "with a real argument every argument must be a number (this one "
                                                 "holds a formal variable)");
        if (args[i]->kind == V_REAL && !arb_is_exact(args[i]->re) && arb_rel_accuracy_bits(args[i]->re) + 32 > prec)
            prec = arb_rel_accuracy_bits(args[i]->re) + 32;
    }
    arb_ptr a = _arb_vec_init(n);
    for (slong i = 0; i < n; i++)
        if (args[i]->kind == V_REAL)
            arb_set(a + i, args[i]->re);
        else
            scalar_get_arb(a + i, args[i]->num, &I->ring, prec);
    value *r = value_new_real(&I->ring);
    if (!subs_lengths_arb(I, call, r->re, p->num, vars, n, a, prec)) {
        value_release(r);
        r = NULL;
    }
    _arb_vec_clear(a, n);
    return r;
}

value *subs_lengths(interp *I, const node *call, const value *p, const int *vars, slong n, value **args)
{
    int real = 0;
    for (slong i = 0; i < n; i++) {
        if (args[i]->kind == V_REAL)
            real = 1;
        else if (args[i]->kind != V_NUM)
            return builtin_fail_at(call, (int)i, "an argument of a volume polynomial must be a number, a "
                                                 "polynomial or a real");
    }
    if (p->kind != V_NUM)
        return builtin_fail_at(call, -1, "only a polynomial can be evaluated at these arguments");
    return real ? subs_lengths_real(I, call, p, vars, n, args) : subs_lengths_exact(I, call, p, vars, n, args);
}

/* subs(P, m, v): P with the monomial m replaced by v. */
static value *builtin_subs(interp *I, const node *call, value **args)
{
    ulong a[SCALAR_MAX_VARS];
    if (args[0]->kind == V_LIST) {
        if (!subs_get_monomial(I, call, args, 1, a))
            return NULL;
        value *r = value_new_list(args[0]->len, &I->ring);
        for (slong i = 0; i < args[0]->len; i++) {
            value *item[3] = {args[0]->items[i], args[1], args[2]};
            if (!(r->items[i] = builtin_subs(I, call, item))) {
                value_release(r);
                return NULL;
            }
        }
        return r;
    }
    if (args[0]->kind != V_NUM)
        return builtin_fail_at(call, 0, "subs() takes a number, a polynomial or a list of them (a series: trunc it "
                                        "first)");
    if (!subs_get_monomial(I, call, args, 1, a))
        return NULL;
    if (args[2]->kind != V_NUM && args[2]->kind != V_REAL)
        return builtin_fail_at(call, 2, "the value substituted must be a number, a polynomial or a real");
    return subs_apply(I, call, args[0], a, args[2]);
}

/* degree(P, x): the degree of P in the variable x (-1 for P = 0). */
static value *builtin_degree(interp *I, const node *call, value **args)
{
    if (args[0]->kind != V_NUM)
        return builtin_fail_at(call, 0, "degree() takes a number or a polynomial");
    slong x = builtin_get_var(I, call, args, 1);
    if (x < 0)
        return NULL;
    if (fmpq_mpoly_is_zero(args[0]->num, I->ring.ctx))
        return value_new_si(&I->ring, -1);
    return value_new_si(&I->ring, fmpq_mpoly_degree_si(args[0]->num, x, I->ring.ctx));
}

/* coefficients(P, x): [c_0, ..., c_d] with P = sum c_k x^k, d the degree in x. */
static value *builtin_coefficients(interp *I, const node *call, value **args)
{
    if (args[0]->kind != V_NUM)
        return builtin_fail_at(call, 0, "coefficients() takes a number or a polynomial");
    slong x = builtin_get_var(I, call, args, 1);
    if (x < 0)
        return NULL;
    ulong a[SCALAR_MAX_VARS] = {0};
    a[x] = 1;
    fmpq_mpoly_struct *R;
    slong parts = subs_split(I, args[0]->num, a, &R);
    value *r = value_new_list(parts, &I->ring);
    for (slong j = 0; j < parts; j++) {
        r->items[j] = value_new_num(&I->ring);
        fmpq_mpoly_swap(r->items[j]->num, R + j, I->ring.ctx);
    }
    subs_free_parts(I, R, parts);
    return r;
}

/* The transforms of a polynomial P in b, term by term (R[j] the coefficient of b^j):
   gauss (kind 0): b^(2k) -> 4^k k! t^k, i.e. (1/(2t)) int_0^inf b P(b) e^(-b^2/(4t)) db;
   resolvent (kind 1): b^j -> (j+1)! t^(j+2), i.e. int_0^inf b P(b) e^(-b z) db with t = 1/z. */
static value *transform_apply(interp *I, const node *call, value **args, int kind)
{
    const char *name = kind == 0 ? "gauss_transform" : "resolvent_transform";
    if (args[0]->kind != V_NUM) {
        char *msg = xasprintf("%s() takes a number or a polynomial", name);
        builtin_fail_at(call, 0, msg);
        free(msg);
        return NULL;
    }
    slong b = builtin_get_var(I, call, args, 1), t = b < 0 ? -1 : builtin_get_var(I, call, args, 2);
    if (t < 0)
        return NULL;
    if (t == b || fmpq_mpoly_degree_si(args[0]->num, t, I->ring.ctx) > 0)
        return builtin_fail_at(call, 2, "the new variable must be another one, absent from the polynomial");
    ulong a[SCALAR_MAX_VARS] = {0};
    a[b] = 1;
    fmpq_mpoly_struct *R;
    slong parts = subs_split(I, args[0]->num, a, &R);
    value *r = value_new_num(&I->ring);
    fmpq_mpoly_t m;
    fmpz_t c, f;
    fmpq_mpoly_init(m, I->ring.ctx);
    fmpz_init(c);
    fmpz_init(f);
    for (slong j = 0; j < parts && r; j++) {
        if (fmpq_mpoly_is_zero(R + j, I->ring.ctx))
            continue;
        if (kind == 0 && j % 2) {
            value_release(r);
            r = builtin_fail_at(call, 0, "gauss_transform() needs a polynomial even in its variable (V_{g,n} is)");
            break;
        }
        ulong e[SCALAR_MAX_VARS] = {0};
        e[t] = kind == 0 ? (ulong)j / 2 : (ulong)j + 2;
        if (kind == 0) {
            fmpz_fac_ui(f, (ulong)j / 2);
            fmpz_one(c);
            fmpz_mul_2exp(c, c, (ulong)j);   /* 4^k = 2^(2k) = 2^j */
            fmpz_mul(c, c, f);
        } else {
            fmpz_fac_ui(c, (ulong)j + 1);
        }
        fmpq_t q;
        fmpq_init(q);
        fmpz_set(fmpq_numref(q), c);
        fmpq_mpoly_zero(m, I->ring.ctx);
        fmpq_mpoly_set_coeff_fmpq_ui(m, q, e, I->ring.ctx);
        fmpq_clear(q);
        fmpq_mpoly_mul(m, m, R + j, I->ring.ctx);
        fmpq_mpoly_add(r->num, r->num, m, I->ring.ctx);
    }
    fmpq_mpoly_clear(m, I->ring.ctx);
    fmpz_clear(c);
    fmpz_clear(f);
    subs_free_parts(I, R, parts);
    return r;
}

static value *builtin_gauss(interp *I, const node *call, value **args)
{
    return transform_apply(I, call, args, 0);
}

static value *builtin_resolvent(interp *I, const node *call, value **args)
{
    return transform_apply(I, call, args, 1);
}

const builtin builtins_subs[] = {
    {"gauss_transform", 3, builtin_gauss, "gauss_transform(P, b, t): b^(2k) -> 4^k k! t^k, (1/2t) int_0^inf b P e^(-b^2/4t) db"},
    {"resolvent_transform", 3, builtin_resolvent, "resolvent_transform(P, b, u): b^j -> (j+1)! u^(j+2), int_0^inf b P e^(-bz) db at u = 1/z"},
    {"subs", 3, builtin_subs, "subs(P, m, v): P with the variable or monomial m (L_1, L_1^2) replaced by v"},
    {"degree", 2, builtin_degree, "degree(P, x): the degree of P in x (-1 for 0)"},
    {"coefficients", 2, builtin_coefficients, "coefficients(P, x): [c_0, ..., c_d] with P = sum c_k x^k"},
    {NULL, 0, NULL, NULL},
};
