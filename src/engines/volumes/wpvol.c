/* wpvol.c - multi-modular driver of the Weil-Petersson volume engine: chooses primes, runs
 * wpvol_modp_table for each of them on worker threads, combines the residues by Chinese
 * remaindering and recovers the rationals by rational reconstruction, each one confirmed by
 * primes that were not used to reconstruct it.  See wpvol.h for the contract.
 */
#include <pthread.h>
#include <signal.h>
#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>

#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/ulong_extras.h>

#include "wpvol.h"
#include "wpvol_internal.h"

/* Primes of the form c 2^WPVOL_PRIME_K + 1 allow transforms up to 2^WPVOL_PRIME_K points. */
#define WPVOL_PRIME_K 28

/* Candidates must be confirmed by at least this many primes not used to reconstruct them. */
#define WPVOL_CONFIRM 2

/* Work shared by the worker threads of one batch (owned by wpvol_batch_run). */
typedef struct
{
    pthread_mutex_t lock;
    slong next, end;          /* next prime index to take, one past the last */
    const ulong *primes;      /* all primes of the run */
    ulong *res;               /* residues: res[i*nv + k] for prime i and value k */
    const wpvol_job_t *job;
    slong nv;
    int status;               /* first error met, WPVOL_OK otherwise */
} wpvol_batch_t;

/* Records the first error of a batch. */
static void wpvol_batch_fail(wpvol_batch_t *b, int st)
{
    pthread_mutex_lock(&b->lock);
    if (b->status == WPVOL_OK)
        b->status = st;
    pthread_mutex_unlock(&b->lock);
}

/* The caller's signal flag is read only by the thread that set it (signals are blocked in
   the workers, so the handler runs there too); every thread reads the stop request through
   the C11 atomic, which that thread raises once it sees the flag. */
static atomic_int *wpvol_cancel_flag;
static pthread_t wpvol_cancel_owner;
static atomic_int wpvol_stop;

void wpvol_set_cancel(atomic_int *flag)
{
    wpvol_cancel_flag = flag;
    wpvol_cancel_owner = pthread_self();
    atomic_store(&wpvol_stop, 0);
}

/* See wpvol_internal.h. */
int wpvol_cancelled(void)
{
    if (atomic_load_explicit(&wpvol_stop, memory_order_relaxed))
        return 1;
    if (wpvol_cancel_flag == NULL || !pthread_equal(pthread_self(), wpvol_cancel_owner) || !*wpvol_cancel_flag)
        return 0;
    atomic_store(&wpvol_stop, 1);
    return 1;
}

/* Takes prime indices one at a time until the batch is exhausted or an error was recorded,
   with one workspace for all its primes (allocating per prime would cost page faults). */
static void wpvol_batch_loop(wpvol_batch_t *b)
{
    void *ws = b->job->ws_new(b->job);

    if (ws == NULL)
        wpvol_batch_fail(b, WPVOL_NOMEM);
    for (;;)
    {
        slong i;
        int st;
        nmod_t mod;

        if (wpvol_cancelled())
            wpvol_batch_fail(b, WPVOL_CANCELLED);
        pthread_mutex_lock(&b->lock);
        i = (b->status == WPVOL_OK && b->next < b->end) ? b->next++ : -1;
        pthread_mutex_unlock(&b->lock);
        if (i < 0)
            break;
        nmod_init(&mod, b->primes[i]);
        st = b->job->run(ws, b->res + i * b->nv, mod);
        if (st != WPVOL_OK)
            wpvol_batch_fail(b, st);
    }
    b->job->ws_free(ws);
}

/* Entry point of the extra threads: the loop, then release of this thread's FLINT caches
   before it exits (keeps valgrind clean).  Returns NULL (pthread signature). */
static void *wpvol_batch_thread(void *arg)
{
    wpvol_batch_loop(arg);
    flint_cleanup();
    return NULL;
}

/* Computes the residues for primes[start..end) with up to `threads` threads (the calling
   thread works too).  A thread that cannot be created just leaves more work to the others.
   Returns WPVOL_OK or the first error of a worker. */
static int wpvol_batch_run(ulong *res, const ulong *primes, slong start, slong end,
                           const wpvol_job_t *job, int threads)
{
    wpvol_batch_t b;
    pthread_t *tid;
    sigset_t all, old;
    int t, started = 0;

    b.next = start;
    b.end = end;
    b.primes = primes;
    b.res = res;
    b.job = job;
    b.nv = job->nv;
    b.status = WPVOL_OK;
    if (pthread_mutex_init(&b.lock, NULL) != 0)
        return WPVOL_NOMEM;
    tid = threads > 1 ? malloc((size_t) (threads - 1) * sizeof(pthread_t)) : NULL;
    sigfillset(&all);   /* the workers inherit a mask blocking every signal: see wpvol_cancelled */
    pthread_sigmask(SIG_BLOCK, &all, &old);
    for (t = 0; tid != NULL && t < threads - 1 && t < end - start - 1; t++)
        if (pthread_create(&tid[started], NULL, wpvol_batch_thread, &b) == 0)
            started++;
    pthread_sigmask(SIG_SETMASK, &old, NULL);
    wpvol_batch_loop(&b);
    for (t = 0; t < started; t++)
        pthread_join(tid[t], NULL);
    free(tid);
    pthread_mutex_destroy(&b.lock);
    return b.status;
}

/* See wpvol_internal.h: the threaded residue computation as a source of the driver. */
int wpvol_job_residues(ulong *res, const ulong *primes, slong count, const wpvol_job_t *job,
                       int threads)
{
    return count <= 0 ? WPVOL_OK : wpvol_batch_run(res, primes, 0, count, job, threads);
}

/* Source of the threaded driver: ctx is the job's thread count and job. */
typedef struct
{
    const wpvol_job_t *job;
    int threads;
} wpvol_thread_src_t;

static int wpvol_thread_residues(void *ctx, ulong *res, const ulong *primes, slong count)
{
    const wpvol_thread_src_t *t = ctx;
    return wpvol_job_residues(res, primes, count, t->job, t->threads);
}

/* Appends primes to reach `count`, each below the previous one.  prime_bits in [20, 62]:
   primes 1 mod 2^k (k = min(28, prime_bits-8)) below 2^prime_bits, which allow the transform
   products; prime_bits = 63: consecutive primes above 2^62, which force the FLINT products.
   Deterministic.  Returns 0, or -1 on exhausted memory or primes. */
static int wpvol_primes_extend(ulong **primes, slong *have, slong count, int prime_bits)
{
    ulong *p = realloc(*primes, (size_t) count * sizeof(ulong));
    slong i;

    if (p == NULL)
        return -1;
    *primes = p;
    for (i = *have; i < count; i++)
    {
        if (prime_bits >= 63)
            p[i] = n_nextprime(i == 0 ? UWORD(1) << 62 : p[i - 1], 1);
        else
            p[i] = wpvol_ntt_prime_below(i == 0 ? UWORD(1) << prime_bits : p[i - 1],
                                         FLINT_MIN(WPVOL_PRIME_K, prime_bits - 8));
        if (p[i] == 0)
            return -1;
    }
    *have = count;
    return 0;
}

/* See wpvol.h. */
ulong wpvol_check_prime(void)
{
    return wpvol_ntt_prime_below(UWORD(1) << 61, WPVOL_PRIME_K);
}

/* Per-value reconstruction state (owned by wpvol_table_ex). */
typedef struct
{
    fmpz_t a;        /* residue of d! V modulo the product M of the primes absorbed so far */
    fmpq_t cand;     /* candidate, valid when has_cand */
    fmpz_t mult;     /* denominator multiple tried first (1: none) */
    slong confirmed; /* primes that agreed with cand since it was found */
    int has_cand, done;
} wpvol_val_t;

/* Rational reconstruction of a (mod M) with |num| <= M / 2^(db+16), 0 < den <= 2^db.  Then
   2 |num| den < M, so a solution is unique, and the 2^14-fold slack makes it unlikely that a
   modulus still too small yields a (wrong) candidate, which would cost a confirmation round.
   Returns 1 and sets q on success. */
static int wpvol_reconstruct_db(fmpq_t q, const fmpz_t a, const fmpz_t M, slong db)
{
    fmpz_t nb, dbz;
    int ok = 0;

    fmpz_init(nb);
    fmpz_init_set_ui(dbz, 1);
    fmpz_mul_2exp(dbz, dbz, (ulong) db);
    fmpz_fdiv_q_2exp(nb, M, (ulong) (db + 16));
    if (fmpz_sgn(nb) > 0)
        ok = fmpq_reconstruct_fmpz_2(q, a, M, nb, dbz);
    fmpz_clear(nb);
    fmpz_clear(dbz);
    return ok;
}

/* Tries denominator bounds db, 5db/4, 3db/2, 2db with db from the job's size model (the
   scaled values have small denominators, so this needs the fewest primes), then the balanced
   bound.  Each attempt is cheap next to a prime.  Returns 1 and sets q on success. */
static int wpvol_reconstruct(fmpq_t q, const fmpz_t a, const fmpz_t M, slong db)
{
    slong bits = fmpz_bits(M), k;

    for (k = 4; k <= 8; k += (k < 6 ? 1 : 2))
    {
        slong b = db * k / 4;
        if (b + 16 >= bits / 2)
            break;
        if (wpvol_reconstruct_db(q, a, M, b))
            return 1;
    }
    return bits > 40 && wpvol_reconstruct_db(q, a, M, bits / 2 - 8);
}

/* Denominator bound (bits) of the first attempt with a denominator multiple: B x then has a
   denominator of a few bits, or a larger cofactor where B misses a factor. */
#define WPVOL_MULT_DB 24

/* Reconstruction of x from a = x mod M given B, a likely multiple of its denominator: B x
   (mod M) with the denominator bound 2^WPVOL_MULT_DB, divided by B.  Returns 1 and sets q on
   success. */
static int wpvol_reconstruct_mult(fmpq_t q, const fmpz_t a, const fmpz_t M, const fmpz_t B)
{
    fmpz_t t;
    int ok;

    fmpz_init(t);
    fmpz_mul(t, a, B);
    fmpz_mod(t, t, M);
    ok = wpvol_reconstruct_db(q, t, M, WPVOL_MULT_DB);
    if (ok)
        fmpq_div_fmpz(q, q, B);
    fmpz_clear(t);
    return ok;
}

/* Residue of the rational q modulo p, or UWORD_MAX if its denominator vanishes mod p. */
static ulong wpvol_fmpq_mod(const fmpq_t q, nmod_t mod)
{
    ulong n = fmpz_fdiv_ui(fmpq_numref(q), mod.n), d = fmpz_fdiv_ui(fmpq_denref(q), mod.n);

    if (d == 0)
        return UWORD_MAX;
    return nmod_mul(n, nmod_inv(d, mod), mod);
}

/* Run state of wpvol_drive (owned there; released by wpvol_run_clear). */
typedef struct
{
    const wpvol_job_t *job;
    slong nv;
    wpvol_val_t *val;
    ulong *primes, *res;
    slong nprimes;             /* primes used so far (all folded into the residues) */
    fmpz_t M;                  /* product of the absorbed primes */
    slong *try_bits;           /* bits(M) needed before the next reconstruction attempt */
} wpvol_drv_t;

/* Releases everything in D (safe on a partly initialised D with val == NULL). */
static void wpvol_run_clear(wpvol_drv_t *D)
{
    slong k;

    for (k = 0; D->val != NULL && k < D->nv; k++)
    {
        fmpz_clear(D->val[k].a);
        fmpz_clear(D->val[k].mult);
        fmpq_clear(D->val[k].cand);
    }
    free(D->val);
    free(D->primes);
    free(D->res);
    free(D->try_bits);
    fmpz_clear(D->M);
}

/* Marks the values the job knows to be 0 as done and initialises the others.
   Returns 0 or -1. */
static int wpvol_run_init(wpvol_drv_t *D, const wpvol_job_t *job)
{
    slong k;

    memset(D, 0, sizeof(*D));
    fmpz_init_set_ui(D->M, 1);
    D->job = job;
    D->nv = job->nv;
    D->val = malloc((size_t) D->nv * sizeof(wpvol_val_t));
    D->try_bits = calloc((size_t) D->nv, sizeof(slong));
    if (D->val == NULL || D->try_bits == NULL)
    {
        free(D->val);   /* entries not initialised yet: wpvol_run_clear must not see them */
        D->val = NULL;
        return -1;
    }
    for (k = 0; k < D->nv; k++)
    {
        double need = job->need_bits(job, k);
        fmpz_init(D->val[k].a);
        fmpz_init_set_ui(D->val[k].mult, 1);
        if (job->den_mult != NULL && need >= 0.0)
            job->den_mult(job, k, D->val[k].mult);
        fmpq_init(D->val[k].cand);
        D->val[k].has_cand = 0;
        D->val[k].confirmed = 0;
        D->val[k].done = need < 0.0;
        /* no attempt before the modulus reaches 7/8 of the modelled need */
        D->try_bits[k] = (slong) (0.875 * need);
    }
    return 0;
}

/* Folds the residues of prime i into every pending value: checks the candidate (if any)
   against it, then extends the Chinese remainder a mod M by a mod p_i. */
static void wpvol_run_absorb(wpvol_drv_t *D, slong i)
{
    nmod_t mod;
    ulong minv;
    slong k;

    nmod_init(&mod, D->primes[i]);
    minv = nmod_inv(fmpz_fdiv_ui(D->M, mod.n), mod);
    for (k = 0; k < D->nv; k++)
    {
        wpvol_val_t *v = &D->val[k];
        ulong r = D->res[i * D->nv + k], t;

        if (v->done)
            continue;
        if (v->has_cand)
        {
            if (wpvol_fmpq_mod(v->cand, mod) == r)
                v->done = (++v->confirmed >= WPVOL_CONFIRM);
            else
                v->has_cand = 0;
        }
        /* a + M ((r - a) / M mod p) */
        t = nmod_mul(nmod_sub(r, fmpz_fdiv_ui(v->a, mod.n), mod), minv, mod);
        fmpz_addmul_ui(v->a, D->M, t);
    }
    fmpz_mul_ui(D->M, D->M, mod.n);
}

/* Attempts reconstruction of the pending values without candidate whose attempt threshold
   is reached; a failure raises the threshold by 1/32 so that attempts stay few.  Returns the
   number of values still pending; *uncand counts those without a candidate. */
static slong wpvol_run_reconstruct(wpvol_drv_t *D, slong *uncand)
{
    slong k, pending = 0, bits = fmpz_bits(D->M);

    *uncand = 0;

    for (k = 0; k < D->nv; k++)
    {
        wpvol_val_t *v = &D->val[k];

        if (v->done)
            continue;
        pending++;
        if (v->has_cand)
            continue;
        if (bits < D->try_bits[k])
        {
            ++*uncand;
            continue;
        }
        if ((!fmpz_is_one(v->mult) && wpvol_reconstruct_mult(v->cand, v->a, D->M, v->mult))
            || wpvol_reconstruct(v->cand, v->a, D->M, D->job->den_bits(D->job, k)))
        {
            v->has_cand = 1;
            v->confirmed = 0;
        }
        else
            D->try_bits[k] = bits + FLINT_MAX(64, bits / 32);
        *uncand += !v->has_cand;
    }
    return pending;
}

/* Writes out[k] = the reconstructed value (0 for the values known to be 0). */
static void wpvol_run_output(fmpq *out, const wpvol_drv_t *D)
{
    slong k;

    for (k = 0; k < D->nv; k++)
        fmpq_set(out + k, D->val[k].cand);
}

/* Number of primes for the first batch: the modelled need of the largest entry (scaled to
   this prime size) plus one, at least min_primes and at least one per thread.  Below 62 bits
   the primes are taken downwards from 2^prime_bits (wpvol_primes_extend), so the first few
   hundred bring more than prime_bits - 1 bits each (a short first batch only costs a further
   round, never a wrong value). */
static slong wpvol_first_batch(double bits, int threads, int prime_bits, slong min_primes)
{
    double b = prime_bits >= 62 ? 61.0 : prime_bits - 1.0;
    slong np = (slong) (bits / b) + 1;

    np = FLINT_MAX(np, min_primes);
    return FLINT_MAX(np, (slong) threads);
}

/* Main loop: batches of primes until every value is reconstructed and confirmed.  After a
   batch where every pending value has a candidate, the next batch only has to confirm them
   (WPVOL_CONFIRM primes, rounded up to the source's width); otherwise the modulus grows by 1/32
   (small steps: an overshoot costs whole primes, a round only a reconstruction pass).
   Returns WPVOL_OK or an error code. */
static int wpvol_run_loop(wpvol_drv_t *D, const wpvol_source_t *src, int prime_bits, slong first)
{
    slong target = first;
    ulong *r;
    int status = WPVOL_OK;

    while (status == WPVOL_OK)
    {
        slong start = D->nprimes, i, pending, uncand;

        if (target > 1000000)
            status = WPVOL_LIMIT;
        else if (wpvol_primes_extend(&D->primes, &D->nprimes, target, prime_bits) != 0)
            status = WPVOL_NOMEM;
        else if ((r = realloc(D->res, (size_t) target * (size_t) D->nv * sizeof(ulong))) == NULL)
            status = WPVOL_NOMEM;
        if (status != WPVOL_OK)
            break;
        D->res = r;
        status = src->residues(src->ctx, D->res + (size_t) start * (size_t) D->nv,
                               D->primes + start, target - start);
        if (status != WPVOL_OK)
            break;
        for (i = start; i < target && status == WPVOL_OK; i++)
        {
            wpvol_run_absorb(D, i);
            if (wpvol_cancelled())   /* large outputs: absorbing a batch is not instant either */
                status = WPVOL_CANCELLED;
        }
        if (status != WPVOL_OK)
            break;
        pending = wpvol_run_reconstruct(D, &uncand);
        if (pending == 0)
            break;
        if (uncand == 0)
            target += FLINT_MAX((slong) src->width, (slong) WPVOL_CONFIRM);
        else
            target += FLINT_MAX((slong) src->width, target / 32 + 1);
    }
    return status;
}

/* See wpvol_internal.h. */
int wpvol_drive_from(fmpq *out, const wpvol_job_t *job, const wpvol_source_t *src, int prime_bits,
                     slong min_primes, slong *primes_used)
{
    wpvol_drv_t D;
    int status;

    if (primes_used != NULL)
        *primes_used = 0;
    if (wpvol_run_init(&D, job) != 0)
        status = WPVOL_NOMEM;
    else
        status = wpvol_run_loop(&D, src, prime_bits,
                                wpvol_first_batch(job->first_bits, src->width, prime_bits,
                                                  min_primes));
    if (status == WPVOL_OK)
        wpvol_run_output(out, &D);
    if (primes_used != NULL)
        *primes_used = D.nprimes;
    wpvol_run_clear(&D);
    return status;
}

/* See wpvol_internal.h. */
int wpvol_drive(fmpq *out, const wpvol_job_t *job, int threads, int prime_bits, slong min_primes,
                slong *primes_used)
{
    wpvol_thread_src_t t;
    wpvol_source_t src;

    t.job = job;
    t.threads = threads;
    src.residues = wpvol_thread_residues;
    src.ctx = &t;
    src.width = threads;
    return wpvol_drive_from(out, job, &src, prime_bits, min_primes, primes_used);
}
