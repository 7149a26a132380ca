/* Runs a script in a fresh interpreter for the unit tests that check what the language prints. */
#ifndef PSIKAPPA_TEST_RUN_SCRIPT_H
#define PSIKAPPA_TEST_RUN_SCRIPT_H

#include <fcntl.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include "interp.h"
#include "source.h"

/* Returns what code printed (caller frees) and sets *status. Standard error goes to /dev/null
   meanwhile (interp_run_source chooses the stream of the messages itself), so that the errors
   the tests provoke stay quiet. */
static inline char *unit_run_script(const char *code, int *status)
{
    char *out = NULL;
    size_t nout = 0;
    FILE *fo = open_memstream(&out, &nout);
    fflush(stderr);
    int saved = dup(STDERR_FILENO), quiet = open("/dev/null", O_WRONLY);
    if (quiet >= 0)
        dup2(quiet, STDERR_FILENO);
    interp I;
    interp_init(&I);
    I.out = fo;
    *status = interp_run_source(&I, source_new("test", code, strlen(code)));
    interp_clear(&I);
    fclose(fo);
    fflush(stderr);
    if (saved >= 0) {
        dup2(saved, STDERR_FILENO);
        close(saved);
    }
    if (quiet >= 0)
        close(quiet);
    return out;
}

#endif
