/* libFuzzer harness: runs the input bytes as a psikappa script, in process.

   Build and run with tests/fuzz/run.sh (clang -fsanitize=fuzzer,address,undefined).
   Each input gets a fresh interpreter with small limits, so that a single
   input finishes in well under a second unless something is wrong; the
   interpreter's output goes to /dev/null (through
   the writer of whole records, as in the program). Sanitizer reports, crashes, leaks
   and inputs that exceed libFuzzer's -timeout are findings.

   Side effects are kept away from the machine: under run.sh the harness works
   in a scratch folder (relative paths of load and of files a script writes
   land there) and HOME and the XDG folders point into it; the results store
   is off, and inputs that name a builtin writing files are skipped.

   A script may legitimately run for a long time (a sum over a large range, a
   loop of a user function), as it may in the program, where Ctrl-C or
   --time-limit stops it. The harness does what --time-limit does: a watchdog
   thread raises the cancellation flag once an input has run for
   FUZZ_BUDGET_MS. Only an input that ignores the flag then reaches
   libFuzzer's -timeout, and that is a finding: the program could not be
   interrupted there either. */
#ifndef _XOPEN_SOURCE
#define _XOPEN_SOURCE 700 /* setenv, unsetenv, chdir */
#endif
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>
#include <pthread.h>
#include <stdatomic.h>
#include <time.h>

#include "cancel.h"

#include "diag.h"
#include "interp.h"
#include "util.h"
#include "memory.h"
#include "source.h"

static FILE *fuzz_null;

enum { FUZZ_BUDGET_MS = 2000 };

/* Start of the input being run, in milliseconds of CLOCK_MONOTONIC; 0 between inputs. */
static atomic_llong fuzz_input_start;

static long long fuzz_now_ms(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (long long)ts.tv_sec * 1000 + ts.tv_nsec / 1000000;
}

/* The --time-limit of the harness: cancels an input that runs past its budget. A
   flag raised just as an input ends can at worst cancel the next one early, which
   is an error of that script, not a finding. */
static void *fuzz_watchdog(void *unused)
{
    (void)unused;
    const struct timespec tick = {0, 20 * 1000000};
    for (;;) {
        nanosleep(&tick, NULL);
        long long start = atomic_load(&fuzz_input_start);
        if (start != 0 && fuzz_now_ms() - start > FUZZ_BUDGET_MS)
            atomic_store(&cancel_flag, CANCEL_TIMEOUT);
    }
    return NULL;
}

/* Builtins that write files named by the script. */
static const char *const fuzz_writers[] = {"svgplot"};

static int fuzz_contains(const uint8_t *data, size_t size, const char *word)
{
    size_t n = strlen(word);
    for (size_t i = 0; i + n <= size; i++)
        if (memcmp(data + i, word, n) == 0)
            return 1;
    return 0;
}

static int fuzz_names_writer(const uint8_t *data, size_t size)
{
    for (size_t i = 0; i < sizeof fuzz_writers / sizeof fuzz_writers[0]; i++)
        if (fuzz_contains(data, size, fuzz_writers[i]))
            return 1;
    return 0;
}

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    /* run.sh makes the scratch folder and removes it afterwards. Without it
       (replaying a reproducer by hand) the harness stays where it is, so
       that relative paths on the command line keep working. */
    const char *env = getenv("PSIKAPPA_FUZZ_SCRATCH");
    char *scratch = env && *env ? strdup(env) : NULL;
    if (scratch && chdir(scratch) != 0) {
        perror("fuzz_script: PSIKAPPA_FUZZ_SCRATCH");
        abort();
    }
    if (!scratch)
        scratch = strdup("/nonexistent");
    setenv("HOME", scratch, 1);
    setenv("XDG_CACHE_HOME", scratch, 1);
    setenv("XDG_STATE_HOME", scratch, 1);
    setenv("PSIKAPPA_STORE", "off", 1);
    unsetenv("PSIKAPPA_PATH");
    free(scratch);
    fuzz_null = fopen("/dev/null", "w");
    if (!fuzz_null) {
        perror("fuzz_script: /dev/null");
        abort();
    }
    /* As in main(): GMP and FLINT allocate through the checked hooks, and
       FLINT aborts become errors of the statement being run. */
    memory_install_hooks();
    interp_install_abort_handler();
    pthread_t watchdog;
    if (pthread_create(&watchdog, NULL, fuzz_watchdog, NULL) != 0) {
        perror("fuzz_script: watchdog thread");
        abort();
    }
    pthread_detach(watchdog);
    return 0;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (fuzz_names_writer(data, size))
        return -1; /* not added to the corpus */
    char stack_base;
    util_stack_init(&stack_base);   /* as main() does: deep input stops with an error */
    interp I;
    interp_init(&I);
    I.lim.max_terms = 1e5;
    I.lim.max_table = 1e5;
    I.lim.max_class_terms = 100000;
    I.lim.max_depth = 200;
    I.lim.max_dim = 60;
    I.lim.max_seconds = 0.01;  /* the volume engines refuse what they predict to take longer
                                  (instrumented code runs some 50 times slower than -O2) */
    I.store_off = 1;
    I.sink.fd = fileno(fuzz_null);   /* output goes through the record writer, into /dev/null */
    /* interp_run_source routes diagnostics itself while parsing and then
       back to stderr, so this only covers what happens before; run.sh closes
       the target's stderr (-close_fd_mask) for the rest. */
    diag_set_stream(fuzz_null);
    cancel_reset();
    atomic_store(&fuzz_input_start, fuzz_now_ms());
    (void)interp_run_source(&I, source_new("<fuzz>", (const char *)data, size));
    atomic_store(&fuzz_input_start, 0);
    cancel_reset();
    diag_set_stream(NULL);
    interp_clear(&I);
    return 0;
}
