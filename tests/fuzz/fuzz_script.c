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
   is off, and inputs that name a builtin writing files are skipped. */
#ifndef _XOPEN_SOURCE
#define _XOPEN_SOURCE 700 /* setenv, unsetenv, chdir */
#endif
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "diag.h"
#include "interp.h"
#include "util.h"
#include "memory.h"
#include "source.h"

static FILE *fuzz_null;

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
    (void)interp_run_source(&I, source_new("<fuzz>", (const char *)data, size));
    diag_set_stream(NULL);
    interp_clear(&I);
    return 0;
}
