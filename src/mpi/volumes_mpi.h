/* volumes_mpi.h - shared declarations of psikappa-volumes-mpi: the table of Weil-Petersson
 * volumes V_{g,n}, g <= G, n <= N, with the residues of the volume engine computed by MPI
 * processes (volumes_mpi_run.c) and combined exactly on rank 0 by the engine's own
 * combination (wpvol_table_combine), so the result is the threaded engine's by construction.
 * Usage and output format: volumes_mpi.c and docs/volumes-engine.md ("Beyond one machine").
 */
#ifndef PSIKAPPA_VOLUMES_MPI_H
#define PSIKAPPA_VOLUMES_MPI_H

#include <flint/fmpq.h>

/* Fault injection for the tests (hidden options --fault-exit=R:K, --fault-fail=R:K): rank R
   leaves the run (exit status 3, no MPI_Finalize) or reports a failed batch when it starts its
   K-th batch of primes. */
enum { VOLMPI_FAULT_NONE = 0, VOLMPI_FAULT_EXIT = 1, VOLMPI_FAULT_FAIL = 2 };

/* Status a rank reports for a batch whose failure was injected (not an engine code). */
#define VOLMPI_INJECTED 100

typedef struct
{
    slong G, N;
    int threads;        /* worker threads per process */
    int check;          /* rank 0 compares with the threaded engine in-process */
    int table_only;     /* --table: the threaded engine alone, no MPI */
    int stats;          /* primes, wall time, CPU and peak memory of every rank on stderr */
    int estimate;       /* --estimate P: the model for P processes, no computation */
    double max_gib;     /* refuse when the modelled memory per process exceeds this */
    int fault, fault_rank;
    long fault_batch;
} volmpi_opts_t;

/* Runs the distributed table under MPI (MPI_Init already called): rank 0 combines and, on
   success, prints the table to stdout; the other ranks serve batches of primes.  Returns the
   process's exit status (0, or 1 after a message on stderr). */
int volmpi_run(const volmpi_opts_t *o);

/* Prints the table in the program's format (volumes_mpi.c).  Returns 0, or -1 if writing
   failed. */
int volmpi_print_table(const fmpq *out, slong G, slong N);

/* Words for an engine status code (or VOLMPI_INJECTED). */
const char *volmpi_status_text(int status);

/* Marks that the table is being printed (the message of a fatal signal says so). */
void volmpi_mark_printing(int on);

#endif
