/* richardson_factorial: Richardson's extrapolation for sequences whose corrections form an
   inverse factorial series, a(x) = c_0 + sum_{j=1}^k c_j Gamma(x-j)/Gamma(x), sampled at
   x = x1, x1 + h, x1 + 2h, ... (exact lists, or reals by ball arithmetic). Such series are how
   many large-order expansions come (Gamma(2g-2+n-j)/Gamma(2g-2+n) at large genus), and they may
   converge where the same corrections in powers of 1/x diverge quickly. */
#include <stdlib.h>

#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>
#include <flint/fmpz.h>
#include <flint/fmpz_vec.h>

#include "builtins.h"
#include "failure.h"
#include "real_funcs.h"
#include "util.h"

#ifdef PSIKAPPA_FLINT3_ARB
#include <flint/arb.h>
#else
#include <arb.h>
#endif

int toolkit_list_is_real(const value *xs); /* toolkit_real.c */

/* The same bound as richardson's order (toolkit.c). */
#define TKF_MAX_ORDER 200

/* Reports msg at argument i; returns 0 (the caller's ok). */
static int tkf_fail(const node *call, int i, const char *msg)
{
    builtin_fail_at(call, i, msg);
    return 0;
}

/* Reads argument i as a rational number into q; 0 after reporting an error. */
static int tkf_get_rational(interp *I, const node *call, value **args, int i, fmpq_t q)
{
    if (args[i]->kind == V_NUM && scalar_get_fmpq(q, args[i]->num, &I->ring))
        return 1;
    builtin_fail_at(call, i, "expected a rational number here, such as 2 or 3/2");
    return 0;
}

/* The weights, kept factored so that a long list costs memory linear in its length: the
   weight of a_{i+j} in the i-th value is B[j] P[i+j] / scale, with P[m] = (x_m-1)...(x_m-k),
   x_m = x1 + m h, B[j] = (-1)^(k+j) binomial(k, j) and scale = k! h^k. A polynomial of degree k
   in x has k-th difference k! h^k times its leading coefficient, and a(x) P(x) is one with
   leading coefficient c_0 when a is an inverse factorial series of order k. */
typedef struct {
    slong k, len;
    fmpq *P;   /* len entries, owned */
    fmpz *B;   /* k + 1 entries, owned */
    fmpq_t scale;
} tkf_weights;

static void tkf_weights_init(tkf_weights *w, slong len, slong k, const fmpq_t x1, const fmpq_t h)
{
    fmpq_t x, t;
    fmpz_t f;
    w->k = k;
    w->len = len;
    w->P = _fmpq_vec_init(len);
    w->B = _fmpz_vec_init(k + 1);
    fmpq_init(w->scale);
    fmpq_init(x);
    fmpq_init(t);
    fmpz_init(f);
    for (slong m = 0; m < len; m++) {
        fmpq_mul_si(x, h, m);
        fmpq_add(x, x, x1);
        fmpq_one(w->P + m);
        for (slong s = 1; s <= k; s++) {
            fmpq_sub_si(t, x, s);
            fmpq_mul(w->P + m, w->P + m, t);
        }
    }
    for (slong j = 0; j <= k; j++) {
        fmpz_bin_uiui(w->B + j, (ulong)k, (ulong)j);
        if ((k + j) % 2)
            fmpz_neg(w->B + j, w->B + j);
    }
    fmpq_pow_si(w->scale, h, k);
    fmpz_fac_ui(f, (ulong)k);
    fmpq_mul_fmpz(w->scale, w->scale, f);
    fmpq_clear(x);
    fmpq_clear(t);
    fmpz_clear(f);
}

static void tkf_weights_clear(tkf_weights *w)
{
    _fmpq_vec_clear(w->P, w->len);
    _fmpz_vec_clear(w->B, w->k + 1);
    fmpq_clear(w->scale);
}

/* Sets r to the weight of a_{i+j} in the i-th value. */
static void tkf_weight(fmpq_t r, const tkf_weights *w, slong i, slong j)
{
    fmpq_mul_fmpz(r, w->P + i + j, w->B + j);
    fmpq_div(r, r, w->scale);
}

/* Checks that every item of xs is an exact number (V_NUM); 0 after naming the first that is not. */
static int tkf_check_exact(const node *call, const value *xs)
{
    for (slong j = 0; j < xs->len; j++)
        if (xs->items[j]->kind != V_NUM) {
            char *msg = xasprintf("item %ld of this list is a %s, expected a number or a real", (long)(j + 1),
                                  value_kind_name(xs->items[j]));
            builtin_fail_at(call, 0, msg);
            free(msg);
            return 0;
        }
    return 1;
}

/* The values sum_j w(i, j) a_{i+j} of an exact list. */
static value *tkf_apply_exact(interp *I, const node *call, const value *xs, const tkf_weights *w, slong count)
{
    if (!tkf_check_exact(call, xs))
        return NULL;
    value *r = value_new_list(count, &I->ring);
    fmpq_mpoly_t t;
    fmpq_t c;
    fmpq_mpoly_init(t, I->ring.ctx);
    fmpq_init(c);
    for (slong i = 0; i < count && !failure_cancelled(call); i++) {
        r->items[i] = value_new_num(&I->ring);
        for (slong j = 0; j <= w->k; j++) {
            tkf_weight(c, w, i, j);
            fmpq_mpoly_scalar_mul_fmpq(t, xs->items[i + j]->num, c, I->ring.ctx);
            fmpq_mpoly_add(r->items[i]->num, r->items[i]->num, t, I->ring.ctx);
        }
    }
    fmpq_mpoly_clear(t, I->ring.ctx);
    fmpq_clear(c);
    if (count > 0 && !r->items[count - 1]) {
        value_release(r);
        return NULL;
    }
    return r;
}

/* The same on a list holding reals: balls at the working precision, or more when the
   list's reals are known better (the weights are large and alternate in sign). */
static value *tkf_apply_real(interp *I, const node *call, const value *xs, const tkf_weights *w, slong count)
{
    slong prec = real_work_prec(I);
    for (slong j = 0; j < xs->len; j++) {
        const value *v = xs->items[j];
        if (v->kind == V_REAL && !arb_is_exact(v->re) && arb_rel_accuracy_bits(v->re) + 32 > prec)
            prec = arb_rel_accuracy_bits(v->re) + 32;
    }
    arb_ptr a = _arb_vec_init(xs->len);
    value *r = NULL;
    int ok = 1;
    for (slong j = 0; ok && j < xs->len; j++) {
        ok = real_applies(I, xs->items[j]) && real_get_ball(I, call, a + j, xs->items[j], prec, "richardson_factorial");
        if (!ok) {
            char *msg = xasprintf("item %ld of this list is not a real number (a number in pi or a real)", (long)(j + 1));
            builtin_fail_at(call, 0, msg);
            free(msg);
        }
    }
    if (ok) {
        r = value_new_list(count, &I->ring);
        arb_t t;
        fmpq_t c;
        arb_init(t);
        fmpq_init(c);
        for (slong i = 0; i < count; i++) {
            r->items[i] = value_new_real(&I->ring);
            for (slong j = 0; j <= w->k; j++) {
                tkf_weight(c, w, i, j);
                arb_mul_fmpz(t, a + i + j, fmpq_numref(c), prec);
                arb_div_fmpz(t, t, fmpq_denref(c), prec);
                arb_add(r->items[i]->re, r->items[i]->re, t, prec);
            }
        }
        arb_clear(t);
        fmpq_clear(c);
    }
    _arb_vec_clear(a, xs->len);
    return r;
}

/* richardson_factorial(xs, k, x1, h): for every i with xs[i + k] in the list, the value
   sum_{j=0}^k (-1)^(k+j) binomial(k, j) P(x_{i+j}) xs[i+j] / (k! h^k), x_m = x1 + (m-1) h,
   P(x) = (x-1)...(x-k); it equals c_0 when xs[m] = a(x_m) for an inverse factorial series
   a(x) = c_0 + sum_{j=1}^k c_j / ((x-1)...(x-j)) (no x_m in 1..k). */
static value *toolkit_richardson_factorial(interp *I, const node *call, value **args)
{
    const value *xs = args[0];
    slong k;
    fmpq_t x1, h;
    fmpq_init(x1);
    fmpq_init(h);
    value *r = NULL;
    int ok = 1;
    if (xs->kind != V_LIST)
        ok = tkf_fail(call, 0, "expected a list of numbers or reals here, such as seq_{n=1..9} 1/n");
    ok = ok && builtin_get_slong(I, call, args, 1, 0, TKF_MAX_ORDER, &k) && tkf_get_rational(I, call, args, 2, x1)
         && tkf_get_rational(I, call, args, 3, h);
    if (ok && fmpq_is_zero(h))
        ok = tkf_fail(call, 3, "the step h between the sampled points must not be zero");
    if (ok && xs->len <= k) {
        char *msg = xasprintf("order %ld needs at least %ld terms, the list has %ld", (long)k, (long)(k + 1),
                              (long)xs->len);
        ok = tkf_fail(call, 0, msg);
        free(msg);
    }
    if (ok) {
        slong count = xs->len - k;
        tkf_weights w;
        tkf_weights_init(&w, xs->len, k, x1, h);
        r = toolkit_list_is_real(xs) ? tkf_apply_real(I, call, xs, &w, count) : tkf_apply_exact(I, call, xs, &w, count);
        tkf_weights_clear(&w);
    }
    fmpq_clear(x1);
    fmpq_clear(h);
    return r;
}

const builtin builtins_toolkit_factorial[] = {
    {"richardson_factorial", 4, toolkit_richardson_factorial,
     "richardson_factorial(xs, k, x1, h): order-k extrapolation in Gamma(x-j)/Gamma(x), xs[m] at x = x1 + (m-1) h"},
    {NULL, 0, NULL, NULL},
};
