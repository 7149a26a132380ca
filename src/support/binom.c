#include "binom.h"

void binom_mul(fmpz_t w, fmpz_t b, slong n, slong k)
{
    ulong r = 1;
    if (k > n - k)
        k = n - k;
    if (k <= 0)
        return;
    if (n > 60) {
        fmpz_bin_uiui(b, (ulong) n, (ulong) k);
        fmpz_mul(w, w, b);
        return;
    }
    for (slong i = 0; i < k; i++)
        r = r * (ulong) (n - i) / (ulong) (i + 1);
    fmpz_mul_ui(w, w, r);
}
