/* test_wpoly_adjoint.c - the transposed route of the one-point volume polynomials
 * (src/engines/volumes/wpoly_adjoint.c) against the per-index route (wpoly_modp.c).
 *
 * Two routes, one answer: for every g in 2..12 (2..12 m^(1/2) with PSIKAPPA_TEST_MULTIPLIER
 * = m, up to 25) every coefficient W_a of V_{g,1}(L) by WPOLY_ROUTE_TRANSPOSED must equal the
 * one by WPOLY_ROUTE_PER_INDEX (an independent run of the recursion per a).  The default
 * route (WPOLY_ROUTE_AUTO) must be the transposed one for n = 1 and give the same values with
 * 2 threads.  Published values (Mirzakhani 2007, V_{2,1}(L)) and the reduction are checked
 * through the default route in test_wpoly.c.
 */
#include <math.h>

#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "volumes/wpoly.h"
#include "volumes/wpvol.h"
#include "unit.h"

static unit_report rep;

/* Compares both routes at genus g with the given threads (and the default route). */
static void compare_routes(slong g, int threads)
{
    slong n = wpoly_indices(NULL, g, 1), k, bad = -1;
    fmpq *a = _fmpq_vec_init(n), *b = _fmpq_vec_init(n), *c = _fmpq_vec_init(n);
    int s1 = wpoly_coeffs_route(a, g, 1, threads, 62, 1, 0, WPOLY_ROUTE_PER_INDEX, NULL);
    int s2 = wpoly_coeffs_route(b, g, 1, threads, 62, 1, 0, WPOLY_ROUTE_TRANSPOSED, NULL);
    int s3 = wpoly_coeffs(c, g, 1, threads);

    UNIT_CHECK(&rep, s1 == WPVOL_OK && s2 == WPVOL_OK && s3 == WPVOL_OK,
               "g = %ld: status %d %d %d", (long) g, s1, s2, s3);
    for (k = 0; k < n && bad < 0; k++)
        if (!fmpq_equal(a + k, b + k) || !fmpq_equal(a + k, c + k) || fmpq_is_zero(a + k))
            bad = k;
    UNIT_CHECK(&rep, bad < 0, "g = %ld, %d threads: W_%ld differs between the routes (or is 0)",
               (long) g, threads, (long) bad);
    _fmpq_vec_clear(a, n);
    _fmpq_vec_clear(b, n);
    _fmpq_vec_clear(c, n);
}

/* A larger truncation and 63-bit primes (no transforms: the per-index fallback) give the
   same values as the transposed route. */
static void test_fallbacks(slong g)
{
    slong n = wpoly_indices(NULL, g, 1), k, bad = -1;
    fmpq *a = _fmpq_vec_init(n), *b = _fmpq_vec_init(n), *c = _fmpq_vec_init(n);
    int s1 = wpoly_coeffs_route(a, g, 1, 1, 62, 1, 0, WPOLY_ROUTE_TRANSPOSED, NULL);
    int s2 = wpoly_coeffs_route(b, g, 1, 1, 62, 1, 3, WPOLY_ROUTE_TRANSPOSED, NULL);
    int s3 = wpoly_coeffs_route(c, g, 1, 1, 63, 1, 0, WPOLY_ROUTE_TRANSPOSED, NULL);

    UNIT_CHECK(&rep, s1 == WPVOL_OK && s2 == WPVOL_OK && s3 == WPVOL_OK, "fallbacks: status");
    for (k = 0; k < n && bad < 0; k++)
        if (!fmpq_equal(a + k, b + k) || !fmpq_equal(a + k, c + k))
            bad = k;
    UNIT_CHECK(&rep, bad < 0, "g = %ld: truncation + 3 or 63-bit primes change W_%ld", (long) g,
               (long) bad);
    _fmpq_vec_clear(a, n);
    _fmpq_vec_clear(b, n);
    _fmpq_vec_clear(c, n);
}

int main(void)
{
    slong g, top = (slong) floor(12.0 * sqrt((double) unit_iterations(100) / 100.0));

    if (top > 25)
        top = 25;
    if (top < 12)
        top = 12;
    for (g = 2; g <= top; g++)
        compare_routes(g, 1);
    compare_routes(9, 2);
    test_fallbacks(7);
    flint_cleanup_master();
    return unit_finish("test_wpoly_adjoint", &rep);
}
