/* test_scalar_terms.c - the term collector of src/values/scalar_terms.c against setting the same
 * coefficients one at a time (fmpq_mpoly_set_coeff / add), on random terms with repeated
 * monomials, random denominators, cancellation and pi powers (a property test: both must give
 * the same polynomial).
 */
#include <string.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>
#include <flint/ulong_extras.h>

#include "scalar.h"
#include "unit.h"

/* One random trial: len terms over variables 0..2 and pi, added to a random start polynomial. */
static int trial(flint_rand_t st, scalar_ring *R, slong len)
{
    fmpq_mpoly_t ref, got, mono;
    scalar_terms T;
    fmpq_t c;
    ulong exps[SCALAR_MAX_VARS];
    int same;
    fmpq_mpoly_init(ref, R->ctx);
    fmpq_mpoly_init(got, R->ctx);
    fmpq_mpoly_init(mono, R->ctx);
    fmpq_init(c);
    scalar_terms_init(&T);
    fmpq_set_si(c, (slong)n_randint(st, 7) - 3, 1 + n_randint(st, 5));
    fmpq_mpoly_set_fmpq(ref, c, R->ctx);
    fmpq_mpoly_set(got, ref, R->ctx);
    for (slong i = 0; i < len; i++) {
        memset(exps, 0, sizeof exps);
        exps[0] = n_randint(st, 3), exps[1] = n_randint(st, 3), exps[2] = n_randint(st, 2);
        exps[SCALAR_PI] = 2 * n_randint(st, 3);
        fmpq_set_si(c, (slong)n_randint(st, 2001) - 1000, 1 + n_randint(st, 1u << 20));
        fmpq_mpoly_zero(mono, R->ctx);
        fmpq_mpoly_set_coeff_fmpq_ui(mono, c, exps, R->ctx);
        fmpq_mpoly_add(ref, ref, mono, R->ctx);   /* repeated monomials add up */
        scalar_terms_push(&T, c, exps);
        if (n_randint(st, 8) == 0) {              /* the negative: cancels that term */
            fmpq_neg(c, c);
            fmpq_mpoly_zero(mono, R->ctx);
            fmpq_mpoly_set_coeff_fmpq_ui(mono, c, exps, R->ctx);
            fmpq_mpoly_add(ref, ref, mono, R->ctx);
            scalar_terms_push(&T, c, exps);
        }
    }
    scalar_terms_add_to(got, &T, R);
    same = fmpq_mpoly_equal(ref, got, R->ctx) && fmpq_mpoly_is_canonical(got, R->ctx) && T.len == 0;
    scalar_terms_clear(&T);
    fmpq_clear(c);
    fmpq_mpoly_clear(mono, R->ctx);
    fmpq_mpoly_clear(got, R->ctx);
    fmpq_mpoly_clear(ref, R->ctx);
    return same;
}

int main(void)
{
    unit_report rep = {0, 0};
    scalar_ring R;
    flint_rand_t st;
    scalar_ring_init(&R);
    scalar_ring_declare(&R, "x");
    scalar_ring_declare(&R, "y");
    scalar_ring_declare(&R, "z");
    flint_randinit(st);
    long iters = unit_iterations(300);
    for (long it = 0; it < iters; it++) {
        slong len = (slong)n_randint(st, 60);
        UNIT_CHECK(&rep, trial(st, &R, len), "trial %ld with %ld terms", it, (long)len);
    }
    {   /* no terms at all leaves the polynomial as it was */
        fmpq_mpoly_t p;
        scalar_terms T;
        fmpq_mpoly_init(p, R.ctx);
        fmpq_mpoly_one(p, R.ctx);
        scalar_terms_init(&T);
        scalar_terms_add_to(p, &T, &R);
        UNIT_CHECK(&rep, fmpq_mpoly_is_one(p, R.ctx), "empty collector changed the polynomial");
        fmpq_mpoly_clear(p, R.ctx);
    }
    flint_randclear(st);
    scalar_ring_clear(&R);
    return unit_finish("test_scalar_terms", &rep);
}
