#include "scalar_arb.h"

void scalar_get_arb(arb_t r, const fmpq_mpoly_t p, const scalar_ring *R, slong prec)
{
    arb_t pi, t;
    arb_init(pi);
    arb_init(t);
    arb_const_pi(pi, prec);
    arb_zero(r);
    fmpq_t c;
    fmpq_init(c);
    ulong exp[SCALAR_MAX_VARS];
    for (slong i = 0; i < fmpq_mpoly_length(p, R->ctx); i++) {
        fmpq_mpoly_get_term_coeff_fmpq(c, p, i, R->ctx);
        fmpq_mpoly_get_term_exp_ui(exp, p, i, R->ctx);
        arb_pow_ui(t, pi, exp[SCALAR_PI], prec);
        if (exp[SCALAR_PINV] > 0) {   /* a negative power of pi */
            arb_t u;
            arb_init(u);
            arb_pow_ui(u, pi, exp[SCALAR_PINV], prec);
            arb_div(t, t, u, prec);
            arb_clear(u);
        }
        arb_mul_fmpz(t, t, fmpq_numref(c), prec);
        arb_div_fmpz(t, t, fmpq_denref(c), prec);
        arb_add(r, r, t, prec);
    }
    fmpq_clear(c);
    arb_clear(pi);
    arb_clear(t);
}
