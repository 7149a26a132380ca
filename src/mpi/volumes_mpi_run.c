/* volumes_mpi_run.c - the MPI protocol of psikappa-volumes-mpi.
 *
 * Rank 0 runs the engine's combination (wpvol_table_combine) with a residue source that splits
 * every batch of primes the combination asks for into one contiguous share per rank (all
 * primes cost the same), sends each other rank its share (tag VOLMPI_TAG_WORK), computes its
 * own share, and receives from every rank a status and, if it is WPVOL_OK, the residues
 * (tag VOLMPI_TAG_RESULT).  A failed share ends the combination with that status; then, as
 * after success, rank 0 sends every rank VOLMPI_TAG_STOP.  A rank that dies never answers:
 * rank 0 then waits until the MPI launcher ends the job, so it never prints a table built
 * without that rank's residues.
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <sys/resource.h>
#include <time.h>
#include <unistd.h>

#include <mpi.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "volumes/wpvol.h"
#include "volumes_mpi.h"

_Static_assert(sizeof(ulong) == sizeof(uint64_t), "residues travel as 64-bit words");

enum { VOLMPI_TAG_WORK = 1, VOLMPI_TAG_RESULT = 2, VOLMPI_TAG_STOP = 3 };

/* State of one process's part of the run. */
typedef struct
{
    const volmpi_opts_t *o;
    int rank, size;
    slong nv;              /* values per prime: (G+1)(N+1) */
    long batches;          /* batches this rank has started */
    int failed_rank;       /* first rank whose share failed, -1 if none */
} volmpi_ctx_t;

/* Ends the whole job after an MPI call failed (the communicator returns errors instead of
   aborting silently, so that the message names the call). */
static void volmpi_check(int rc, const char *call, const volmpi_ctx_t *c)
{
    char text[MPI_MAX_ERROR_STRING];
    int len = 0;

    if (rc == MPI_SUCCESS)
        return;
    MPI_Error_string(rc, text, &len);
    fprintf(stderr, "psikappa-volumes-mpi: rank %d: %s failed: %s; stopping every process\n",
            c->rank, call, text);
    fflush(stderr);
    MPI_Abort(MPI_COMM_WORLD, 2);
    _exit(2);
}

/* Applies the injected fault of this rank at the start of its batch (see volumes_mpi.h).
   Returns VOLMPI_INJECTED for an injected failure, WPVOL_OK otherwise. */
static int volmpi_fault(volmpi_ctx_t *c)
{
    const volmpi_opts_t *o = c->o;

    c->batches++;
    if (o->fault == VOLMPI_FAULT_NONE || o->fault_rank != c->rank || o->fault_batch != c->batches)
        return WPVOL_OK;
    if (o->fault == VOLMPI_FAULT_EXIT)
    {
        fprintf(stderr, "psikappa-volumes-mpi: rank %d: leaving at batch %ld (--fault-exit)\n",
                c->rank, c->batches);
        fflush(stderr);
        _exit(3);
    }
    return VOLMPI_INJECTED;
}

/* Residues of this rank's share of primes (count may be 0). */
static int volmpi_share(volmpi_ctx_t *c, ulong *res, const ulong *primes, slong count)
{
    int st = volmpi_fault(c);

    if (st == WPVOL_OK && count > 0)
        st = wpvol_table_residues(res, c->o->G, c->o->N, primes, count, c->o->threads);
    return st;
}

/* The residue source of rank 0 (see the file comment).  Returns the first failed status. */
static int volmpi_residues(void *ctx, ulong *res, const ulong *primes, slong count)
{
    volmpi_ctx_t *c = ctx;
    int r, st, status = WPVOL_OK;

    for (r = 1; r < c->size; r++)
    {
        slong lo = r * count / c->size, hi = (r + 1) * count / c->size;
        if (hi > lo)
            volmpi_check(MPI_Send(primes + lo, (int) (hi - lo), MPI_UINT64_T, r, VOLMPI_TAG_WORK,
                                  MPI_COMM_WORLD), "MPI_Send", c);
    }
    status = volmpi_share(c, res, primes, count / c->size);
    if (status != WPVOL_OK)
        c->failed_rank = 0;
    for (r = 1; r < c->size; r++)
    {
        slong lo = r * count / c->size, hi = (r + 1) * count / c->size;
        if (hi <= lo)
            continue;
        volmpi_check(MPI_Recv(&st, 1, MPI_INT, r, VOLMPI_TAG_RESULT, MPI_COMM_WORLD,
                              MPI_STATUS_IGNORE), "MPI_Recv", c);
        if (st == WPVOL_OK)
            volmpi_check(MPI_Recv(res + lo * c->nv, (int) ((hi - lo) * c->nv), MPI_UINT64_T, r,
                                  VOLMPI_TAG_RESULT, MPI_COMM_WORLD, MPI_STATUS_IGNORE),
                         "MPI_Recv", c);
        else if (status == WPVOL_OK)
        {
            status = st;
            c->failed_rank = r;
        }
    }
    return status;
}

/* Serves batches of primes until rank 0 says stop.  Returns 0, or 1 on exhausted memory. */
static int volmpi_serve(volmpi_ctx_t *c)
{
    for (;;)
    {
        MPI_Status ms;
        int count = 0, st;
        ulong *primes, *res;

        volmpi_check(MPI_Probe(0, MPI_ANY_TAG, MPI_COMM_WORLD, &ms), "MPI_Probe", c);
        if (ms.MPI_TAG == VOLMPI_TAG_STOP)
        {
            volmpi_check(MPI_Recv(NULL, 0, MPI_INT, 0, VOLMPI_TAG_STOP, MPI_COMM_WORLD,
                                  MPI_STATUS_IGNORE), "MPI_Recv", c);
            return 0;
        }
        volmpi_check(MPI_Get_count(&ms, MPI_UINT64_T, &count), "MPI_Get_count", c);
        primes = malloc((size_t) count * sizeof(ulong) + 1);
        res = malloc((size_t) count * (size_t) c->nv * sizeof(ulong) + 1);
        if (primes != NULL)
            volmpi_check(MPI_Recv(primes, count, MPI_UINT64_T, 0, VOLMPI_TAG_WORK,
                                  MPI_COMM_WORLD, MPI_STATUS_IGNORE), "MPI_Recv", c);
        st = primes == NULL || res == NULL ? WPVOL_NOMEM : volmpi_share(c, res, primes, count);
        volmpi_check(MPI_Send(&st, 1, MPI_INT, 0, VOLMPI_TAG_RESULT, MPI_COMM_WORLD), "MPI_Send", c);
        if (st == WPVOL_OK)
            volmpi_check(MPI_Send(res, (int) (count * c->nv), MPI_UINT64_T, 0, VOLMPI_TAG_RESULT,
                                  MPI_COMM_WORLD), "MPI_Send", c);
        free(primes);
        free(res);
        if (primes == NULL)   /* its message was not received: the protocol cannot go on */
        {
            fprintf(stderr, "psikappa-volumes-mpi: rank %d: out of memory\n", c->rank);
            MPI_Abort(MPI_COMM_WORLD, 1);
        }
    }
}

/* Wall seconds since an arbitrary origin. */
static double volmpi_now(void)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double) t.tv_sec + 1e-9 * (double) t.tv_nsec;
}

/* --stats: every rank's CPU seconds and peak resident memory, printed by rank 0 with the
   primes used and the wall time.  Collective: every rank calls it once, after the stop. */
static void volmpi_stats(const volmpi_ctx_t *c, slong primes, double wall)
{
    struct rusage ru;
    double mine[2], *all = NULL;
    int r;

    getrusage(RUSAGE_SELF, &ru);
    mine[0] = (double) ru.ru_utime.tv_sec + 1e-6 * (double) ru.ru_utime.tv_usec
              + (double) ru.ru_stime.tv_sec + 1e-6 * (double) ru.ru_stime.tv_usec;
    mine[1] = (double) ru.ru_maxrss / 1024.0;   /* MiB (ru_maxrss is in KiB on Linux) */
    if (c->rank == 0)
        all = malloc(2 * (size_t) c->size * sizeof(double));
    volmpi_check(MPI_Gather(mine, 2, MPI_DOUBLE, all, 2, MPI_DOUBLE, 0, MPI_COMM_WORLD),
                 "MPI_Gather", c);
    if (c->rank != 0 || all == NULL)
        return;
    fprintf(stderr, "stats: g <= %ld, n <= %ld: %d processes x %d threads, %ld primes, "
            "%.2f s wall\n", (long) c->o->G, (long) c->o->N, c->size, c->o->threads,
            (long) primes, wall);
    for (r = 0; r < c->size; r++)
        fprintf(stderr, "stats: rank %d: %.2f s CPU, peak %.1f MiB\n", r, all[2 * r],
                all[2 * r + 1]);
    free(all);
}

/* Sends every other rank the stop message. */
static void volmpi_stop_all(const volmpi_ctx_t *c)
{
    int r;

    for (r = 1; r < c->size; r++)
        volmpi_check(MPI_Send(NULL, 0, MPI_INT, r, VOLMPI_TAG_STOP, MPI_COMM_WORLD), "MPI_Send", c);
}

/* Rank 0 with --check: the table again from the threaded engine in this process, compared
   entry by entry.  Returns 0 if equal, 1 after a message. */
static int volmpi_compare(const fmpq *out, const volmpi_opts_t *o)
{
    slong k, nv = (o->G + 1) * (o->N + 1);
    fmpq *ref = _fmpq_vec_init(nv);
    int st = wpvol_table(ref, o->G, o->N, o->threads), bad = 0;

    if (st != WPVOL_OK)
        fprintf(stderr, "psikappa-volumes-mpi: --check: the threaded engine failed: %s\n",
                volmpi_status_text(st));
    for (k = 0; st == WPVOL_OK && k < nv && !bad; k++)
        if (!fmpq_equal(out + k, ref + k))
        {
            fprintf(stderr, "psikappa-volumes-mpi: --check: V_{%ld,%ld} differs from the "
                    "threaded engine's\n", (long) (k / (o->N + 1)), (long) (k % (o->N + 1)));
            bad = 1;
        }
    if (st == WPVOL_OK && !bad)
        fprintf(stderr, "check: all %ld entries equal to the threaded engine's\n", (long) nv);
    _fmpq_vec_clear(ref, nv);
    return st != WPVOL_OK || bad;
}

/* Rank 0: the combination, the stop, the check and the table.  Returns the exit status. */
static int volmpi_root(volmpi_ctx_t *c)
{
    const volmpi_opts_t *o = c->o;
    fmpq *out = _fmpq_vec_init(c->nv);
    slong used = 0;
    double t0 = volmpi_now();
    int st, rc = 0;

    st = wpvol_table_combine(out, o->G, o->N, volmpi_residues, c, c->size * o->threads,
                             wpvol_default_prime_bits(), 1, &used);
    volmpi_stop_all(c);
    if (o->stats)
        volmpi_stats(c, used, volmpi_now() - t0);
    if (st != WPVOL_OK)
    {
        if (c->failed_rank >= 0)
            fprintf(stderr, "psikappa-volumes-mpi: rank %d failed on its share of primes: %s; "
                    "no table printed\n", c->failed_rank, volmpi_status_text(st));
        else
            fprintf(stderr, "psikappa-volumes-mpi: the combination failed: %s; no table "
                    "printed\n", volmpi_status_text(st));
        rc = 1;
    }
    else if (o->check && volmpi_compare(out, o) != 0)
        rc = 1;
    else if (volmpi_print_table(out, o->G, o->N) != 0)
    {
        fprintf(stderr, "psikappa-volumes-mpi: writing the table failed\n");
        rc = 1;
    }
    _fmpq_vec_clear(out, c->nv);
    return rc;
}

/* See volumes_mpi.h. */
int volmpi_run(const volmpi_opts_t *o)
{
    volmpi_ctx_t c;
    int rc;

    c.o = o;
    c.nv = (o->G + 1) * (o->N + 1);
    c.batches = 0;
    c.failed_rank = -1;
    MPI_Comm_set_errhandler(MPI_COMM_WORLD, MPI_ERRORS_RETURN);
    MPI_Comm_rank(MPI_COMM_WORLD, &c.rank);
    MPI_Comm_size(MPI_COMM_WORLD, &c.size);
    if (c.rank == 0)
        return volmpi_root(&c);
    rc = volmpi_serve(&c);
    if (o->stats)
        volmpi_stats(&c, 0, 0.0);
    return rc;
}
