/* wpvol_table.c - the table of volumes V_{g,n} as a job of the multi-modular driver: the
 * residues of (3g-3+n)! V_{g,n} modulo a list of primes (wpvol_table_residues, which a caller
 * may run anywhere, e.g. in other processes), their combination into exact values
 * (wpvol_table_combine, the driver's Chinese remaindering, rational reconstruction and
 * confirmation), and the threaded table (wpvol_table_ex: the two together).  See wpvol.h.
 */
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/ulong_extras.h>

#include "wpvol.h"
#include "wpvol_internal.h"

/* The table as a job of the driver: the values are int kappa_1^d = d! V_{g,n} (d = 3g-3+n),
   whose denominators are much smaller than those of V_{g,n}. */
typedef struct
{
    slong G, N;
} wpvol_tab_t;

static void *wpvol_tab_ws_new(const wpvol_job_t *job)
{
    const wpvol_tab_t *t = job->data;
    return wpvol_ws_new(t->G, t->N);
}

static void wpvol_tab_ws_free(void *ws)
{
    wpvol_ws_free(ws);
}

/* Residues of d! V_{g,n} for one prime (V from wpvol_modp_run, then the factorial). */
static int wpvol_tab_run(void *ws, ulong *res, nmod_t mod)
{
    const wpvol_ws_t *w = ws;
    slong G, N, k;
    int st;

    if (ws == NULL)
        return WPVOL_NOMEM;
    st = wpvol_modp_run(ws, res, mod, 1);
    G = wpvol_ws_genus(w);
    N = wpvol_ws_points(w);
    for (k = 0; st == WPVOL_OK && k < (G + 1) * (N + 1); k++)
    {
        slong g = k / (N + 1), n = k % (N + 1), d;
        ulong f = 1;
        for (d = 2; d <= 3 * g - 3 + n; d++)
            f = nmod_mul(f, (ulong) d, mod);
        res[k] = nmod_mul(res[k], f, mod);
    }
    return st;
}

/* Modelled modulus bits of value k, or -1 for the unstable (g, n) (value 0). */
static double wpvol_tab_need(const wpvol_job_t *job, slong k)
{
    const wpvol_tab_t *t = job->data;
    slong g = k / (t->N + 1), n = k % (t->N + 1);
    if (2 * g - 2 + n <= 0)
        return -1.0;
    return wpvol_estimate_table_need(g, n);
}

/* The denominator multiple of value k, or 1 where none is used. */
static void wpvol_tab_mult(const wpvol_job_t *job, slong k, fmpz_t B)
{
    const wpvol_tab_t *t = job->data;
    slong g = k / (t->N + 1), n = k % (t->N + 1);
    if (wpvol_estimate_uses_mult(g, n))
        wpvol_estimate_den_mult(B, g, n);
    else
        fmpz_one(B);
}

static slong wpvol_tab_den(const wpvol_job_t *job, slong k)
{
    const wpvol_tab_t *t = job->data;
    return (slong) wpvol_estimate_den_bits(k / (t->N + 1));
}

/* Fills job with the table job for (G, N); tab must outlive job. */
static void wpvol_tab_job(wpvol_job_t *job, wpvol_tab_t *tab, slong G, slong N)
{
    tab->G = G;
    tab->N = N;
    job->nv = (G + 1) * (N + 1);
    job->ws_new = wpvol_tab_ws_new;
    job->ws_free = wpvol_tab_ws_free;
    job->run = wpvol_tab_run;
    job->need_bits = wpvol_tab_need;
    job->den_bits = wpvol_tab_den;
    job->den_mult = wpvol_tab_mult;
    job->first_bits = wpvol_estimate_bits(G, N);
    job->data = tab;
}

/* See wpvol.h. */
int wpvol_table_residues(ulong *res, slong G, slong N, const ulong *primes, slong count,
                         int threads)
{
    wpvol_tab_t tab;
    wpvol_job_t job;
    slong i;

    if (res == NULL || G < 0 || N < 0 || count < 0 || threads < 1 || (count > 0 && primes == NULL))
        return WPVOL_BADARG;
    for (i = 0; i < count; i++)
        if (primes[i] < (UWORD(1) << 19) || !n_is_prime(primes[i]))
            return WPVOL_BADARG;
    wpvol_tab_job(&job, &tab, G, N);
    return wpvol_job_residues(res, primes, count, &job, threads);
}

/* See wpvol.h. */
int wpvol_table_combine(fmpq *out, slong G, slong N, wpvol_residue_fn residues, void *ctx,
                        int width, int prime_bits, slong min_primes, slong *primes_used)
{
    wpvol_tab_t tab;
    wpvol_job_t job;
    wpvol_source_t src;
    slong k;
    fmpz_t f;
    int status;

    if (primes_used != NULL)
        *primes_used = 0;
    if (out == NULL || residues == NULL || G < 0 || N < 0 || width < 1 || prime_bits < 20
        || prime_bits > 63)
        return WPVOL_BADARG;
    for (k = 0; k < (G + 1) * (N + 1); k++)
        fmpq_zero(out + k);
    wpvol_tab_job(&job, &tab, G, N);
    src.residues = residues;
    src.ctx = ctx;
    src.width = width;
    status = wpvol_drive_from(out, &job, &src, prime_bits, min_primes, primes_used);
    fmpz_init(f);
    for (k = 0; status == WPVOL_OK && k < job.nv; k++)
    {
        slong g = k / (N + 1), n = k % (N + 1);
        if (2 * g - 2 + n <= 0)
            continue;
        fmpz_fac_ui(f, (ulong) (3 * g - 3 + n));
        fmpq_div_fmpz(out + k, out + k, f);
    }
    fmpz_clear(f);
    return status;
}

/* The threaded source of wpvol_table_ex: ctx holds (G, N, threads). */
typedef struct
{
    slong G, N;
    int threads;
} wpvol_tab_threads_t;

static int wpvol_tab_thread_residues(void *ctx, ulong *res, const ulong *primes, slong count)
{
    const wpvol_tab_threads_t *t = ctx;
    return wpvol_table_residues(res, t->G, t->N, primes, count, t->threads);
}

/* See wpvol.h. */
int wpvol_table_ex(fmpq *out, slong G, slong N, int threads, int prime_bits, slong min_primes,
                   slong *primes_used)
{
    wpvol_tab_threads_t t;
    double sec, bytes;
    slong k;

    if (primes_used != NULL)
        *primes_used = 0;
    if (out == NULL || G < 0 || N < 0 || threads < 1 || prime_bits < 20 || prime_bits > 63)
        return WPVOL_BADARG;
    for (k = 0; k < (G + 1) * (N + 1); k++)
        fmpq_zero(out + k);
    wpvol_estimate(&sec, &bytes, G, N);
    if (sec > WPVOL_MAX_SECONDS || bytes > WPVOL_MAX_BYTES)
        return WPVOL_LIMIT;
    t.G = G;
    t.N = N;
    t.threads = threads;
    return wpvol_table_combine(out, G, N, wpvol_tab_thread_residues, &t, threads, prime_bits,
                               min_primes, primes_used);
}

/* See wpvol.h: transform-friendly primes of wpvol_default_prime_bits(), first batch from the
   size model. */
int wpvol_table(fmpq *out, slong G, slong N, int threads)
{
    return wpvol_table_ex(out, G, N, threads, wpvol_default_prime_bits(), 1, NULL);
}
