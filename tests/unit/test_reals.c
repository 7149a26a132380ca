/* test_reals.c - certified reals (src/real_funcs.c, src/real_ops.c, src/toolkit_real.c).
 *
 * Property test (marked as such): 1000 random expressions built from rationals, pi, + * / and
 * exp, log, sqrt, sin, cos, sinh, cosh, gamma, zeta and besselj (fixed seed) are evaluated at a
 * working precision of P digits and again at 2P; every digit printed at P must agree with the value
 * at 2P: the printed decimal, read as a ball one unit wide in its last digit, must meet the ball
 * printed at 2P. Exact results (no real entered) must print identically at both precisions.
 */
#include <fcntl.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "arb_compat.h"
#include "interp.h"
#include "unit.h"
#include "run_script.h"

int toolkit_arb_of_decimal(arb_t r, const char *s, slong prec);   /* toolkit_numeric.c */

static unit_report rep;
static flint_rand_t state;

static void rl_put(char *s, size_t cap, const char *fmt, const char *a, const char *b)
{
    size_t len = strlen(s);
    snprintf(s + len, cap - len, fmt, a, b);
}

/* Appends a random positive expression of depth at most d to s. */
static void rl_positive(char *s, size_t cap, int d)
{
    char a[2048] = "", b[2048] = "";
    if (d == 0 || n_randint(state, 4) == 0) {
        int p = 1 + (int)n_randint(state, 9), q = 1 + (int)n_randint(state, 6);
        char t[64];
        snprintf(t, sizeof t, n_randint(state, 3) == 0 ? "(%d*pi/%d)" : "(%d/%d)", p, q);
        rl_put(s, cap, "%s%s", t, "");
        return;
    }
    rl_positive(a, sizeof a, d - 1);
    rl_positive(b, sizeof b, d - 1);
    static const char *const forms[] = {
        "(%s + %s)", "(%s * %s)", "(%s / numeric(%s))", "sqrt(%s)%.0s", "exp(%s/numeric(1 + %s))",
        "log(1 + %s)%.0s", "cosh(%s/numeric(1 + %s))", "(2 + sin(%s))%.0s", "(2 + cos(%s))%.0s",
        "sinh(1 + %s/numeric(1 + %s))", "gamma(1 + %s/numeric(1 + %s))", "zeta(2 + %s)%.0s", "(2 + besselj(1, %s))%.0s", "(2 + besselj(0, %s))%.0s",
    };
    const char *f = forms[n_randint(state, sizeof forms / sizeof forms[0])];
    int reuse = strstr(f, "/numeric(1 + %s)") != NULL;   /* x/(1 + x): the same operand twice */
    rl_put(s, cap, f, a, reuse ? a : b);
}

/* Whether the text printed at low precision agrees with the one at high precision. */
static int rl_agree(const char *lo, const char *hi, slong *digits)
{
    if (lo[0] != '[' && !strchr(lo, '.') && !strchr(lo, 'e'))
        return strcmp(lo, hi) == 0;   /* an exact answer */
    arb_t x, y;
    arb_init(x);
    arb_init(y);
    int ok = toolkit_arb_of_decimal(x, lo, 4000) && toolkit_arb_of_decimal(y, hi, 4000) && arb_overlaps(x, y);
    *digits = lo[0] == '[' ? 0 : (slong)strspn(lo + (lo[0] == '-'), "0123456789.") - 1;
    arb_clear(x);
    arb_clear(y);
    return ok;
}

/* Property test: each digit printed at P digits is confirmed at 2P. */
static void test_random_expressions(void)
{
    static const int precs[] = {10, 20, 30, 50};
    long trials = unit_iterations(1000), wide = 0, exact = 0;
    for (long t = 0; t < trials; t++) {
        char e[8192] = "", code[9000];
        rl_positive(e, sizeof e, 1 + (int)n_randint(state, 3));
        if (n_randint(state, 5) == 0) {
            memmove(e + 2, e, strlen(e) + 1);
            memcpy(e, "- ", 2);
        }
        int P = precs[n_randint(state, 4)], s1, s2;
        snprintf(code, sizeof code, "precision %d\n%s\n", P, e);
        char *lo = unit_run_script(code, &s1);
        snprintf(code, sizeof code, "precision %d\n%s\n", 2 * P, e);
        char *hi = unit_run_script(code, &s2);
        lo[strcspn(lo, "\n")] = hi[strcspn(hi, "\n")] = '\0';
        slong digits = 0;
        UNIT_CHECK(&rep, s1 == 0 && s2 == 0 && rl_agree(lo, hi, &digits),
                   "%s at %d digits printed %s (status %d), at %d digits %s (status %d)", e, P, lo, s1, 2 * P, hi, s2);
        int is_exact = lo[0] != '[' && !strchr(lo, '.');
        exact += is_exact;
        wide += !is_exact && digits < P;
        free(lo);
        free(hi);
    }
    printf("random expressions: %ld compared at P and 2P digits (%ld exact; of the reals, %ld printed fewer than P digits)\n",
           trials, exact, wide);
}

int main(void)
{
    flint_randinit(state);
    test_random_expressions();
    flint_randclear(state);
    flint_cleanup();
    return unit_finish("test_reals", &rep);
}
