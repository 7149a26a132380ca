/* compositions.h - walking the compositions of an integer (test code only). */
#ifndef PSIKAPPA_TESTS_COMPOSITIONS_H
#define PSIKAPPA_TESTS_COMPOSITIONS_H

#include <flint/flint.h>

/* Next composition of S into n parts after a (a[0..n-2] lexicographic, a[n-1]
   the rest); start from a = (0, ..., 0, S). Returns 0 after the last one. */
static inline int next_composition(slong *a, slong n, slong S)
{
    for (slong i = n - 2; i >= 0; i--) {
        slong rest = 0;
        for (slong j = 0; j <= i; j++)
            rest += a[j];
        if (rest < S) {
            a[i]++;
            for (slong j = i + 1; j < n; j++)
                a[j] = 0;
            a[n - 1] = S - rest - 1;
            return 1;
        }
    }
    return 0;
}

#endif
