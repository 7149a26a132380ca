/* wk_published.h - small published Witten-Kontsevich numbers, shared by the unit tests of the
 * two correlator routes (DVV in test_wk.c, KdV in test_kdv.c), so that both are checked against
 * the same outside values.  Test code only.
 *
 * Sources: the genus-0 and genus-1 bases are from E. Witten, "Two-dimensional gravity and
 * intersection theory on moduli space", Surveys in Diff. Geom. 1 (1991).  The genus-2 and genus-3
 * values are recalled from memory (values of this kind are tabulated in C. Itzykson and
 * J.-B. Zuber, "Combinatorics of the modular group II: the Kontsevich integrals", 1992; not
 * checked against the paper here).
 */
#ifndef PSIKAPPA_TESTS_WK_PUBLISHED_H
#define PSIKAPPA_TESTS_WK_PUBLISHED_H

#include <flint/flint.h>

typedef struct {
    slong g, n, d[3];        /* <tau_{d[0]} ... tau_{d[n-1]}>_g */
    slong num, den;          /* its value num/den */
    const char *source;
} wk_published_value;

static const wk_published_value wk_published_values[] = {
    {0, 3, {0, 0, 0}, 1, 1, "Witten 1991"},
    {1, 1, {1, 0, 0}, 1, 24, "Witten 1991"},
    {2, 1, {4, 0, 0}, 1, 1152, "from memory"},
    {2, 2, {2, 3, 0}, 29, 5760, "from memory"},
    {2, 3, {2, 2, 2}, 7, 240, "from memory"},
    {3, 1, {7, 0, 0}, 1, 82944, "from memory"},
    {3, 2, {2, 6, 0}, 77, 414720, "from memory"},
    {3, 2, {3, 5, 0}, 503, 1451520, "from memory"},
    {3, 2, {4, 4, 0}, 607, 1451520, "from memory"},
};

#define WK_PUBLISHED_COUNT ((slong)(sizeof wk_published_values / sizeof wk_published_values[0]))

#endif
