/* test_wpoly_adjoint.c - the transposed route of the one-point volume polynomials
 * (src/engines/volumes/wpoly_adjoint.c) against the per-index route (wpoly_modp.c).
 *
 * Two routes, one answer: for every g in 2..12 (2..12 m^(1/2) with PSIKAPPA_TEST_MULTIPLIER
 * = m, up to 25) every coefficient W_a of V_{g,1}(L) by WPOLY_ROUTE_TRANSPOSED must equal the
 * one by WPOLY_ROUTE_PER_INDEX (an independent run of the recursion per a).  The default
 * route (WPOLY_ROUTE_AUTO) must be the transposed one for n = 1 and give the same values with
 * 2 threads.  Published values (Mirzakhani 2007, V_{2,1}(L)) and the reduction are checked
 * through the default route in test_wpoly.c.  A cancel request raised during the transposed
 * route stops it (WPVOL_CANCELLED, all zero).
 */
#include <math.h>
#include <pthread.h>
#include <stdatomic.h>
#include <time.h>

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

static atomic_int stop_flag;

static void *raise_later(void *arg)
{
    struct timespec t = { 0, 100000000 };   /* 0.1 s */
    (void) arg;
    nanosleep(&t, NULL);
    atomic_store(&stop_flag, 1);
    return NULL;
}

/* A request raised during the transposed route (V_{40,1} takes seconds) ends it with
   WPVOL_CANCELLED and all coefficients zero. */
static void test_cancel(void)
{
    slong n = wpoly_indices(NULL, 40, 1), k, nz = 0;
    fmpq *a = _fmpq_vec_init(n);
    pthread_t th;
    int st;

    atomic_store(&stop_flag, 0);
    wpvol_set_cancel(&stop_flag);
    if (pthread_create(&th, NULL, raise_later, NULL) != 0)
    {
        UNIT_CHECK(&rep, 0, "cancel: no thread");
        wpvol_set_cancel(NULL);
        _fmpq_vec_clear(a, n);
        return;
    }
    st = wpoly_coeffs_route(a, 40, 1, 2, 62, 1, 0, WPOLY_ROUTE_TRANSPOSED, NULL);
    pthread_join(th, NULL);
    wpvol_set_cancel(NULL);
    for (k = 0; k < n; k++)
        nz += !fmpq_is_zero(a + k);
    UNIT_CHECK(&rep, st == WPVOL_CANCELLED && nz == 0, "cancel: status %d, %ld nonzero", st,
               (long) nz);
    _fmpq_vec_clear(a, n);
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
    test_cancel();
    flint_cleanup_master();
    return unit_finish("test_wpoly_adjoint", &rep);
}
