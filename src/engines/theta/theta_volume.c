/* theta_volume.c - coefficients of the super volume polynomials
 *     V^Theta_{g,n}(L) = int_{Mbar_{g,n}} Theta_{g,n} exp(2 pi^2 kappa_1 + sum_i L_i^2 psi_i / 2)
 *                      = sum_d c_d (2 pi^2)^k prod_i (L_i^2/2)^{d_i} / d_i! ,   k = g-1-|d|,
 *     c_d = int Theta psi^d kappa_1^k / k! .
 * By the time shift of theta_kappa.c with s_1 = s only, p_j = (-s)^j / j!, so
 *     c_d = sum over partitions lambda of k of (-1)^{k+len(lambda)} / (prod lambda_i! prod_j e_j!)
 *           <Theta | tau_d tau_lambda>_g       (e_j the multiplicity of j in lambda):
 * one correlator per partition of k, no polynomial arithmetic.
 */
#include <stdlib.h>
#include "theta_internal.h"

typedef struct {
    theta_table *T;
    slong g, n, len;
    slong *key;
    fmpq_t acc;
} theta_vc;

/* acc += (-1)^{k+len} / (prod lambda_i! prod e_j!) <Theta | tau_key>_g for the partition in
   key[n..len-1] (descending). */
static int vc_leaf(theta_vc *V, slong k)
{
    slong i, j;
    int st;
    fmpz_t den, f;
    fmpq_t v;
    fmpz_init_set_ui(den, 1);
    fmpz_init(f);
    fmpq_init(v);
    for (i = V->n; i < V->len; i = j) {
        for (j = i; j < V->len && V->key[j] == V->key[i]; j++) {
            fmpz_fac_ui(f, (ulong) V->key[j]);
            fmpz_mul(den, den, f);
        }
        fmpz_fac_ui(f, (ulong) (j - i));
        fmpz_mul(den, den, f);
    }
    st = theta_correlator(v, V->T, V->g, V->key, V->len);
    fmpq_div_fmpz(v, v, den);
    if ((k + V->len - V->n) % 2)
        fmpq_neg(v, v);
    fmpq_add(V->acc, V->acc, v);
    fmpz_clear(den);
    fmpz_clear(f);
    fmpq_clear(v);
    return st;
}

/* Partitions of rest into parts <= maxpart, appended to key; k is the total. */
static int vc_partitions(theta_vc *V, slong rest, slong maxpart, slong k)
{
    slong j;
    int st = WK_OK;
    if (rest == 0)
        return vc_leaf(V, k);
    if (V->T->cancel && *V->T->cancel)
        return WK_CANCELLED;
    for (j = rest < maxpart ? rest : maxpart; st == WK_OK && j >= 1; j--) {
        V->key[V->len++] = j;
        st = vc_partitions(V, rest - j, j, k);
        V->len--;
    }
    return st;
}

/* c_d of the file comment (see theta.h).
   Zero when |d| > g-1; status codes as for theta_correlator. */
int theta_volume_coeff(fmpq_t res, theta_table *T, slong g, const slong *d, slong n)
{
    theta_vc V;
    slong kmult[2] = {0, 0}, K, i, D = 0;
    int st;
    fmpq_zero(res);
    for (i = 0; i < n && d != NULL; i++)
        D += (d[i] < 0 || d[i] > g) ? g + 1 : d[i];
    kmult[1] = g - 1 - D > 0 ? g - 1 - D : 0;
    st = theta_kappa_check(&K, g, d, n, kmult, 1);
    if (T == NULL)
        return WK_BADARG;
    if (st != WK_OK || K < 0)
        return st;
    V.T = T;
    V.g = g;
    V.n = n;
    V.len = n;
    V.key = malloc((size_t) (n + K + 1) * sizeof(slong));
    if (V.key == NULL)
        return WK_LIMIT;
    for (i = 0; i < n; i++)
        V.key[i] = d[i];
    fmpq_init(V.acc);
    st = vc_partitions(&V, K, K, K);
    if (st == WK_OK)
        fmpq_set(res, V.acc);
    fmpq_clear(V.acc);
    free(V.key);
    return st;
}
