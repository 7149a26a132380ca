/* volumes_mpi.c - psikappa-volumes-mpi: the table of normalised Weil-Petersson volumes
 * V_{g,n} for g <= G, n <= N, with the volume engine's primes spread over MPI processes.
 *
 *   mpirun -np P psikappa-volumes-mpi [--threads T] [--check] [--stats] [--max-gib X] G N
 *   psikappa-volumes-mpi --table [--threads T] G N      (the threaded engine alone, no MPI)
 *   psikappa-volumes-mpi --estimate P G N                (the model for P processes)
 *
 * Output (stdout, rank 0, only once the whole table is known and confirmed): one line per
 * stable (g, n) (2g - 2 + n > 0), g ascending, then n ascending: `g n numerator/denominator`
 * (decimal, lowest terms, the denominator always written).  Both modes print the same bytes.
 * Exit status 0 means the table is complete; any failure prints a message on stderr and gives
 * a nonzero status (a rank that dies: the MPI launcher ends the job with a nonzero status and
 * rank 0 says it was stopped before printing).
 */
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <mpi.h>
#include <flint/fmpz.h>
#include <flint/fmpq.h>
#include <flint/fmpq_vec.h>

#include "volumes/wpvol.h"
#include "volumes_mpi.h"

static volatile sig_atomic_t volmpi_printing;

/* See volumes_mpi.h. */
void volmpi_mark_printing(int on)
{
    volmpi_printing = on;
}

/* A fatal signal (the launcher ends the job when another rank died, or Ctrl-C): say whether a
   table was being printed, with write(2) only, and leave with 128 + the signal. */
static void volmpi_on_signal(int sig)
{
    static const char before[] = "psikappa-volumes-mpi: stopped by a signal before the table "
                                 "was complete (did another process fail?); no table printed\n";
    static const char during[] = "psikappa-volumes-mpi: stopped by a signal while printing; "
                                 "the printed table is incomplete\n";
    ssize_t w = volmpi_printing ? write(2, during, sizeof during - 1)
                                : write(2, before, sizeof before - 1);
    (void) w;
    _exit(128 + sig);
}

/* See volumes_mpi.h. */
const char *volmpi_status_text(int status)
{
    switch (status)
    {
    case WPVOL_OK: return "no error";
    case WPVOL_BADARG: return "invalid arguments (or a prime the engine refuses)";
    case WPVOL_LIMIT: return "beyond the engine's limits";
    case WPVOL_NOMEM: return "out of memory";
    case WPVOL_INTERNAL: return "a built-in consistency check of the engine failed";
    case WPVOL_CANCELLED: return "cancelled";
    case VOLMPI_INJECTED: return "failure injected by --fault-fail";
    default: return "unknown error";
    }
}

/* See volumes_mpi.h. */
int volmpi_print_table(const fmpq *out, slong G, slong N)
{
    slong g, n;

    volmpi_mark_printing(1);
    for (g = 0; g <= G; g++)
        for (n = 0; n <= N; n++)
        {
            const fmpq *v = out + g * (N + 1) + n;
            if (2 * g - 2 + n <= 0)
                continue;
            printf("%ld %ld ", (long) g, (long) n);
            fmpz_fprint(stdout, fmpq_numref(v));
            putchar('/');
            fmpz_fprint(stdout, fmpq_denref(v));
            putchar('\n');
        }
    volmpi_mark_printing(0);
    return fflush(stdout) != 0 || ferror(stdout) ? -1 : 0;
}

static void volmpi_usage(FILE *f)
{
    fprintf(f, "usage: mpirun -np P psikappa-volumes-mpi [--threads T] [--check] [--stats] "
               "[--max-gib X] G N\n"
               "       psikappa-volumes-mpi --table [--threads T] G N\n"
               "       psikappa-volumes-mpi --estimate P G N\n"
               "prints `g n numerator/denominator` for every stable V_{g,n}, g <= G, n <= N\n");
}

/* Reads a whole decimal integer in [lo, hi] into *v.  Returns 0 or -1. */
static int volmpi_long(const char *s, long lo, long hi, long *v)
{
    char *end;
    long x;

    if (s == NULL || *s == '\0')
        return -1;
    x = strtol(s, &end, 10);
    if (*end != '\0' || x < lo || x > hi)
        return -1;
    *v = x;
    return 0;
}

/* --fault-exit=R:K / --fault-fail=R:K.  Returns 0 or -1. */
static int volmpi_fault_arg(volmpi_opts_t *o, int kind, const char *s)
{
    long r, k;
    char buf[64], *colon;

    if (strlen(s) >= sizeof buf)
        return -1;
    strcpy(buf, s);
    colon = strchr(buf, ':');
    if (colon == NULL)
        return -1;
    *colon = '\0';
    if (volmpi_long(buf, 0, 1000000, &r) != 0 || volmpi_long(colon + 1, 1, 1000000, &k) != 0)
        return -1;
    o->fault = kind;
    o->fault_rank = (int) r;
    o->fault_batch = k;
    return 0;
}

/* Parses the command line into o.  Returns 0, or -1 after a message. */
static int volmpi_parse(volmpi_opts_t *o, int argc, char **argv)
{
    long v, pos[2];
    int i, npos = 0;

    memset(o, 0, sizeof *o);
    o->threads = 1;
    o->max_gib = 8.0;
    for (i = 1; i < argc; i++)
    {
        const char *a = argv[i];
        if (strcmp(a, "--check") == 0)
            o->check = 1;
        else if (strcmp(a, "--table") == 0)
            o->table_only = 1;
        else if (strcmp(a, "--stats") == 0)
            o->stats = 1;
        else if (strcmp(a, "--threads") == 0 && volmpi_long(argv[i + 1], 1, 256, &v) == 0)
            o->threads = (int) v, i++;
        else if (strcmp(a, "--estimate") == 0 && volmpi_long(argv[i + 1], 1, 1000000, &v) == 0)
            o->estimate = (int) v, i++;
        else if (strcmp(a, "--max-gib") == 0 && volmpi_long(argv[i + 1], 1, 1000000, &v) == 0)
            o->max_gib = (double) v, i++;
        else if (strncmp(a, "--fault-exit=", 13) == 0 && volmpi_fault_arg(o, VOLMPI_FAULT_EXIT, a + 13) == 0)
            continue;
        else if (strncmp(a, "--fault-fail=", 13) == 0 && volmpi_fault_arg(o, VOLMPI_FAULT_FAIL, a + 13) == 0)
            continue;
        else if (a[0] != '-' && npos < 2 && volmpi_long(a, 0, 100000, &pos[npos]) == 0)
            npos++;
        else
        {
            fprintf(stderr, "psikappa-volumes-mpi: bad argument `%s'\n", a);
            volmpi_usage(stderr);
            return -1;
        }
    }
    if (npos != 2)
    {
        volmpi_usage(stderr);
        return -1;
    }
    o->G = pos[0];
    o->N = pos[1];
    return 0;
}

/* --estimate P: the model of wpvol_estimate_spread for P processes and for one. */
static int volmpi_estimate(const volmpi_opts_t *o)
{
    double sec, each, root, primes, sec1, bytes1;

    wpvol_estimate_spread(&sec, &each, &root, &primes, o->G, o->N, o->estimate);
    wpvol_estimate(&sec1, &bytes1, o->G, o->N);
    printf("model for g <= %ld, n <= %ld: one core (threaded engine): %.3g s, %.3g MiB\n",
           (long) o->G, (long) o->N, sec1, bytes1 / 1048576.0);
    printf("on %d processes: %.0f primes, %.3g s wall, %.3g MiB per process, %.3g MiB more on "
           "rank 0\n", o->estimate, primes, sec, each / 1048576.0, root / 1048576.0);
    return 0;
}

/* --table: the threaded engine in this process, printed in the same format. */
static int volmpi_table(const volmpi_opts_t *o)
{
    slong nv = (o->G + 1) * (o->N + 1);
    fmpq *out = _fmpq_vec_init(nv);
    int st = wpvol_table(out, o->G, o->N, o->threads), rc = 0;

    if (st != WPVOL_OK)
    {
        fprintf(stderr, "psikappa-volumes-mpi: the engine failed: %s\n", volmpi_status_text(st));
        rc = 1;
    }
    else if (volmpi_print_table(out, o->G, o->N) != 0)
    {
        fprintf(stderr, "psikappa-volumes-mpi: writing the table failed\n");
        rc = 1;
    }
    _fmpq_vec_clear(out, nv);
    return rc;
}

/* Every rank decides alike (same arguments, same model) whether the memory model allows the
   run.  Returns 0, or -1 (rank 0 says why). */
static int volmpi_fits(const volmpi_opts_t *o, int rank)
{
    double sec, each, root, primes;

    wpvol_estimate_spread(&sec, &each, &root, &primes, o->G, o->N, 1);
    if (each * o->threads + root <= o->max_gib * 1073741824.0)
        return 0;
    if (rank == 0)
        fprintf(stderr, "psikappa-volumes-mpi: the model needs %.1f GiB per process (more than "
                "--max-gib %.0f)\n", (each * o->threads + root) / 1073741824.0, o->max_gib);
    return -1;
}

int main(int argc, char **argv)
{
    volmpi_opts_t o;
    int rank = 0, rc;

    if (volmpi_parse(&o, argc, argv) != 0)
        return 2;
    if (o.estimate)
        return volmpi_estimate(&o);
    signal(SIGTERM, volmpi_on_signal);
    signal(SIGINT, volmpi_on_signal);
    if (o.table_only)
        rc = volmpi_table(&o);
    else
    {
        MPI_Init(&argc, &argv);
        MPI_Comm_rank(MPI_COMM_WORLD, &rank);
        rc = volmpi_fits(&o, rank) != 0 ? 1 : volmpi_run(&o);
        MPI_Finalize();
    }
    flint_cleanup();
    return rc;
}
