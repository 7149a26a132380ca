/* libFuzzer harness for the command line: the input, split at newlines, is
   the argument list of psikappa (main.c is compiled into the harness with its
   main renamed psikappa_main by run.sh), followed by small limits so that no
   input runs long. Options, their values, -e code and script names are all
   fuzzed; crashes, sanitizer reports, leaks and timeouts are findings.

   Build and run with tests/fuzz/run.sh cli [SECONDS]. The harness works in
   the scratch folder run.sh makes; the results store is off, standard output
   goes to /dev/null, and the timer and memory cap an input may set are
   cleared after it. */
#define _GNU_SOURCE /* memmem */
#include <fcntl.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/time.h>
#include <unistd.h>

#include "cancel.h"
#include "memory.h"

int psikappa_main(int argc, char **argv);

#define FUZZ_MAX_ARGS 24

int LLVMFuzzerInitialize(int *argc, char ***argv)
{
    (void)argc;
    (void)argv;
    const char *dir = getenv("PSIKAPPA_FUZZ_SCRATCH");
    if (dir && *dir && chdir(dir) != 0) {
        perror("fuzz_cli: PSIKAPPA_FUZZ_SCRATCH");
        abort();
    }
    setenv("HOME", dir && *dir ? dir : "/nonexistent", 1);
    setenv("XDG_CACHE_HOME", dir && *dir ? dir : "/nonexistent", 1);
    setenv("PSIKAPPA_STORE", "off", 1);
    unsetenv("PSIKAPPA_PATH");
    int null = open("/dev/null", O_RDWR);
    if (null >= 0) {
        dup2(null, STDIN_FILENO);
        dup2(null, STDOUT_FILENO);
        close(null);
    }
    return 0;
}

/* Splits the input at newlines into argv (after argv[0]); returns argc. */
static int fuzz_split(char *text, char **argv, int max)
{
    int argc = 1;
    for (char *s = text; argc < max;) {
        char *nl = strchr(s, '\n');
        argv[argc++] = s;
        if (!nl)
            break;
        *nl = '\0';
        s = nl + 1;
    }
    return argc;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    /* a memory cap outlives the input (it would end every later one), and
       svgplot writes files named by the input */
    if (size > 2048 || memchr(data, '\0', size) || memmem(data, size, "--max-memory", 12)
        || memmem(data, size, "svgplot", 7))
        return -1;
    static const char *limits[] = {"--max-seconds", "0.01", "--max-terms", "1e5", "--max-table", "1e5",
                                   "--max-depth", "200", "--digits", "30"};
    const int nlim = (int)(sizeof limits / sizeof limits[0]);
    char *text = malloc(size + 1);
    memcpy(text, data, size);
    text[size] = '\0';
    char *argv[2 * FUZZ_MAX_ARGS + 24];
    argv[0] = (char *)"psikappa";
    for (int i = 0; i < nlim; i++)
        argv[1 + i] = (char *)limits[i];
    int argc = nlim + fuzz_split(text, argv + nlim, FUZZ_MAX_ARGS);
    for (int i = 0; i < nlim - 2; i++)   /* the same limits again: the input's own come before */
        argv[argc++] = (char *)limits[i];
    argv[argc] = NULL;
    psikappa_main(argc, argv);
    struct itimerval off;
    memset(&off, 0, sizeof off);
    setitimer(ITIMER_REAL, &off, NULL);
    cancel_reset();
    free(text);
    return 0;
}
