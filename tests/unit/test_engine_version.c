/* test_engine_version.c - the results store must never answer a question whose meaning changed.
 *
 * The store keys every answer by RESULTS_ENGINE_VERSION (src/lang/engine_version.h).  This test runs
 * the fixed questions of engine_answers.pk through the interpreter (store off) and compares the
 * printed answers with the record engine_answers.txt, whose first line is the version they were
 * recorded under:
 *   - same version, same answers: pass;
 *   - same version, other answers: fail (an engine change altered answers without a new version,
 *     so old stored answers would be served): bump the version, then refresh the record;
 *   - other version: fail until the record is refreshed, so that record and version move together.
 * `test_engine_version --refresh` rewrites the record from the current engine and version.
 * The answers themselves are checked against published values by the other tests; this one only
 * ties them to the version.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "engine_version.h"
#include "interp.h"
#include "source.h"
#include "unit.h"

#define ANSWERS_SCRIPT PSIKAPPA_SOURCE_DIR "/tests/unit/engine_answers.pk"
#define ANSWERS_RECORD PSIKAPPA_SOURCE_DIR "/tests/unit/engine_answers.txt"

static unit_report rep;

/* Reads all of f from the start into a new string (caller frees); NULL on failure. */
static char *slurp(FILE *f)
{
    if (!f || fseek(f, 0, SEEK_END) != 0)
        return NULL;
    long len = ftell(f);
    rewind(f);
    char *s = len >= 0 ? malloc((size_t) len + 1) : NULL;
    if (s && fread(s, 1, (size_t) len, f) != (size_t) len) {
        free(s);
        return NULL;
    }
    if (s)
        s[len] = '\0';
    return s;
}

/* The answers of engine_answers.pk as printed (caller frees), or NULL if the script failed. */
static char *answers_now(void)
{
    interp I;
    char *why = NULL, *text = NULL;
    FILE *out = tmpfile();
    interp_init(&I);
    I.store_off = 1;
    I.out = out;
    source *src = source_read_script(ANSWERS_SCRIPT, 0, &why);
    if (out && src && interp_run_source(&I, src) == 0) {
        fflush(out);
        text = slurp(out);
    }
    if (!src)
        fprintf(stderr, "cannot read %s: %s\n", ANSWERS_SCRIPT, why ? why : "?");
    free(why);
    interp_clear(&I);
    if (out)
        fclose(out);
    return text;
}

/* Writes the record: the version line, then the answers.  Returns 0 on success. */
static int record_write(const char *answers)
{
    FILE *f = fopen(ANSWERS_RECORD, "w");
    if (!f)
        return 1;
    fprintf(f, "version: %s\n%s", RESULTS_ENGINE_VERSION, answers);
    return fclose(f) != 0;
}

int main(int argc, char **argv)
{
    char *now = answers_now();
    UNIT_CHECK(&rep, now != NULL, "the questions of %s run", ANSWERS_SCRIPT);
    if (now && argc > 1 && strcmp(argv[1], "--refresh") == 0) {
        UNIT_CHECK(&rep, record_write(now) == 0, "writing %s", ANSWERS_RECORD);
        printf("recorded the answers under %s in %s\n", RESULTS_ENGINE_VERSION, ANSWERS_RECORD);
    } else if (now) {
        FILE *f = fopen(ANSWERS_RECORD, "r");
        char *rec = slurp(f), *nl = rec ? strchr(rec, '\n') : NULL;
        if (f)
            fclose(f);
        UNIT_CHECK(&rep, nl != NULL && strncmp(rec, "version: ", 9) == 0, "%s has a version line", ANSWERS_RECORD);
        if (nl) {
            *nl = '\0';
            int same_version = strcmp(rec + 9, RESULTS_ENGINE_VERSION) == 0;
            int same_answers = strcmp(nl + 1, now) == 0;
            UNIT_CHECK(&rep, !same_version || same_answers,
                       "the engine's answers to %s changed but the store's engine version (%s) did not: "
                       "bump RESULTS_ENGINE_VERSION in src/lang/engine_version.h so that old stored answers are "
                       "not reused, then refresh the record with: build/test_engine_version --refresh",
                       ANSWERS_SCRIPT, RESULTS_ENGINE_VERSION);
            UNIT_CHECK(&rep, same_version, "the record %s is for version %s, the engine is %s: refresh it with "
                       "build/test_engine_version --refresh", ANSWERS_RECORD, rec + 9, RESULTS_ENGINE_VERSION);
        }
        free(rec);
    }
    free(now);
    flint_cleanup();
    return unit_finish("test_engine_version", &rep);
}
