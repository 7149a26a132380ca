/* explain of the spectral-curve builtins: the dictionary between the curve and the intersection
   numbers (times s_j, shifted KdV times, psi weights, normalisation, route).  Conventions:
   docs/conventions.md, "Spectral curves". */
#include <stdlib.h>
#include <string.h>
#include <flint/fmpq.h>
#include <flint/fmpq_mpoly.h>

#include "builtins_spectral.h"
#include "diag.h"
#include "spectral/spectral.h"
#include "eval.h"

/* See builtins.h.  A name bound in the scope (a function of the user's, or a variable) hides the
   builtin, as in eval_call, so explain leaves it alone. */
int spectral_explains(scope *s, const char *name)
{
    if (strcmp(name, "omega") != 0 && strcmp(name, "omega_coeff") != 0 && strcmp(name, "curve_volume") != 0)
        return 0;
    return scope_lookup(s, name) == NULL;
}

/* Prints "  label name_j = value" for the nonzero entries j = from..to of s (curve context). */
static void bsp_print_list(interp *I, const char *label, const char *name, const fmpq_mpoly_struct *s,
                           slong from, slong to, slong shift, const bsp_curve *C)
{
    fmpq_mpoly_t t;
    slong shown = 0, zeros = 0;
    fmpq_mpoly_init(t, I->ring.ctx);
    fprintf(I->out, "  %s:", label);
    for (slong j = from; j <= to; j++) {
        if (fmpq_mpoly_is_zero(s + j, C->ctx)) {
            zeros++;
            continue;
        }
        bsp_to_ring(I, t, s + j, C);
        char *txt = scalar_get_str(t, &I->ring);
        fprintf(I->out, "%s %s_%ld = %s", shown++ ? "," : "", name, (long) (j + shift), txt);
        free(txt);
    }
    if (!shown)
        fprintf(I->out, " all 0 up to %s_%ld\n", name, (long) (to + shift));
    else if (zeros)
        fprintf(I->out, "; the others up to %s_%ld are 0\n", name, (long) (to + shift));
    else
        fputc('\n', I->out);
    fmpq_mpoly_clear(t, I->ring.ctx);
}

/* The dictionary of omega_{g,n} for the curve C: times, weights, normalisation, route. */
static void bsp_print_dictionary(interp *I, const bsp_curve *C, slong g, slong n, int volume)
{
    int bessel = C->kind == SP_CURVE_BESSEL;
    slong D = 3 * g - 3 + n, Dt = bessel ? (g > 0 ? g - 1 : 0) : D, j;
    fmpq_mpoly_struct *s = flint_malloc((size_t) (D + 1) * sizeof(fmpq_mpoly_struct));
    int only1 = 1;
    fmpq_t c;
    for (j = 0; j <= D; j++)
        fmpq_mpoly_init(s + j, C->ctx);
    sp_times_kind(s, D, C->kind, C->y, C->K, C->ctx);
    for (j = 2; j <= D; j++)
        only1 &= fmpq_mpoly_is_zero(s + j, C->ctx);
    if (bessel)
        fprintf(I->out, "%s of the Bessel-type curve x = z^2/2, y_odd = sum_k y_k z^(2k-1), Theta on Mbar_{%ld,%ld}\n",
                volume ? "volume polynomial" : "omega", (long) g, (long) n);
    else
        fprintf(I->out, "%s of the curve x = z^2/2, y_odd = sum_k y_k z^(2k+1), Mbar_{%ld,%ld} of dimension %ld\n",
                volume ? "volume polynomial" : "omega", (long) g, (long) n, (long) D);
    if (bessel && g == 0) {
        fprintf(I->out, "  Theta_{0,%ld} = 0: every coefficient vanishes\n", (long) n);
        for (j = 0; j <= D; j++)
            fmpq_mpoly_clear(s + j, C->ctx);
        flint_free(s);
        return;
    }
    bsp_print_list(I, "y_k", "y", C->y, 0, Dt < C->K ? Dt : C->K, 0, C);
    bsp_print_list(I, bessel ? "kappa times, exp(-sum s_j u^j) = sum (2k-1)!! y_k/y_0 u^k"
                             : "kappa times, exp(-sum s_j u^j) = sum (2k+1)!! y_k/y_0 u^k", "s", s, 1, Dt, 0, C);
    sp_shift_times_kind(s, D, C->kind, C->y, C->K, C->ctx);
    for (j = 1; j <= D; j++)
        fmpq_mpoly_neg(s + j, s + j, C->ctx);
    if (bessel)
        bsp_print_list(I, "Theta times t_0 = 0, t_k = -(2k-1)!! y_k/y_0", "t", s, 1, Dt, 0, C);
    else
        bsp_print_list(I, "KdV times t_0 = t_1 = 0, t_{k+1} = -(2k+1)!! y_k/y_0", "t", s, 1, D, 1, C);
    fmpq_init(c);
    fmpq_mpoly_get_fmpq(c, C->y + 0, C->ctx);
    fmpq_pow_si(c, c, 2 - 2 * g - n);
    if (n % 2)
        fmpq_neg(c, c);
    char *ct = fmpq_get_str(NULL, 10, c);
    const char *th = bessel ? "Theta " : "";
    if (volume)
        fprintf(I->out, "  V_{%ld,%ld}(L) = c * int %sexp(sum_j s_j kappa_j + sum_i L_i^2 psi_i/2), "
                        "c = (-1)^n y_0^(2-2g-n) = %s\n", (long) g, (long) n, th, ct);
    else
        fprintf(I->out, "  omega_{%ld,%ld} = c * sum_d prod_i (2d_i+1)!! u_i^(2d_i+2) int %sexp(sum_j s_j kappa_j) "
                        "prod_i psi_i^d_i, u_i = 1/z_i, c = (-1)^n y_0^(2-2g-n) = %s\n", (long) g, (long) n, th, ct);
    flint_free(ct);
    fmpq_clear(c);
    if (bessel)
        fprintf(I->out, "  route: Theta-psi numbers at the Theta times, %.0f of them at most\n",
                sp_shift_estimate_kind(SP_CURVE_BESSEL, g, n, C->K));
    else if (only1 && g >= 2 && n <= 6)
        fprintf(I->out, "  route: only s_1 is nonzero: the volume engine\n");
    else
        fprintf(I->out, "  route: psi correlators at the KdV times, %.0f of them at most\n", sp_shift_estimate(g, n, C->K));
    for (j = 0; j <= D; j++)
        fmpq_mpoly_clear(s + j, C->ctx);
    flint_free(s);
}

/* See builtins.h: evaluates the arguments and prints the dictionary (the caller prints the value). */
int spectral_explain(interp *I, scope *s, const node *call)
{
    value *args[3] = {NULL, NULL, NULL};
    slong g = 0, n = 0, *d = NULL;
    int ok = call->list->len == 3;
    bsp_curve C;
    for (int i = 0; ok && i < 3; i++)
        ok = (args[i] = eval_expr(I, s, call->list->items[i])) != NULL;
    if (ok)
        ok = builtin_get_slong(I, call, args, 1, 0, SP_MAX_DIM, &g);
    if (ok && strcmp(call->text, "omega_coeff") == 0)
        ok = (n = bsp_read_index(I, call, args, 2, &d)) > 0;
    else if (ok)
        ok = builtin_get_slong(I, call, args, 2, 1, SP_MAX_DIM, &n);
    if (ok && (2 * g - 2 + n <= 0 || 3 * g - 3 + n > SP_MAX_DIM)) {
        diag_error(&call->loc, "omega_{%ld,%ld} is not a stable correlator of dimension at most 400", (long) g, (long) n);
        ok = 0;
    }
    if (ok)
        ok = bsp_curve_read(I, call, args, 0, bsp_curve_needs(I, args[0], g, n), "this request", &C);
    if (ok) {
        bsp_print_dictionary(I, &C, g, n, strcmp(call->text, "curve_volume") == 0);
        bsp_curve_clear(&C);
    }
    free(d);
    for (int i = 0; i < 3; i++)
        if (args[i])
            value_release(args[i]);
    return ok;
}
