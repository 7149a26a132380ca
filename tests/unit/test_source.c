/* test_source.c - unit tests for reading scripts (source_read_script in src/source.h).
 *
 * The size cap is checked here rather than in tests/hostile because a script over the cap would
 * be a 16 MiB file in the repository: the test makes a sparse file of that length (no disk used)
 * and a pipe that never ends. The kinds of file (folder, device) have hostile cases too
 * (file_load_*, file_arg_*); here they are checked without the interpreter.
 */
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "source.h"
#include "unit.h"

static unit_report rep;
static char dir[] = "/tmp/pk-test-source-XXXXXX";

/* Reads path and checks that it is refused with exactly `want`. */
static void check_refused(const char *path, int regular_only, const char *want)
{
    char *why = NULL;
    source *s = source_read_script(path, regular_only, &why);
    UNIT_CHECK(&rep, s == NULL && why && strcmp(why, want) == 0, "%s: got '%s', want '%s'", path,
               why ? why : "(read)", want);
    source_free(s);
    free(why);
}

/* A sparse file one byte over the cap is refused from its size, unread. */
static void test_size_cap(void)
{
    char path[512];
    snprintf(path, sizeof path, "%s/big.pk", dir);
    FILE *f = fopen(path, "wb");
    int made = f && ftruncate(fileno(f), (off_t)SOURCE_MAX_BYTES + 1) == 0;
    if (f)
        fclose(f);
    UNIT_CHECK(&rep, made, "could not make %s", path);
    check_refused(path, 1, "it has 16777217 bytes, more than the limit of 16777216 bytes (16 MiB) for a script");
    remove(path);
}

/* A script of exactly the cap is read, and a leading byte-order mark is dropped. */
static void test_at_cap_and_bom(void)
{
    char path[512];
    snprintf(path, sizeof path, "%s/bom.pk", dir);
    FILE *f = fopen(path, "wb");
    if (f) {
        fputs("\xEF\xBB\xBFprint 1\n", f);
        fclose(f);
    }
    char *why = NULL;
    source *s = source_read_script(path, 1, &why);
    UNIT_CHECK(&rep, s && s->len == 8 && memcmp(s->text, "print 1\n", 8) == 0, "BOM not skipped (%s)",
               why ? why : "read");
    source_free(s);
    free(why);
    f = fopen(path, "wb");
    int made = f && ftruncate(fileno(f), (off_t)SOURCE_MAX_BYTES) == 0;
    if (f)
        fclose(f);
    why = NULL;
    s = made ? source_read_script(path, 1, &why) : NULL;
    UNIT_CHECK(&rep, s && s->len == SOURCE_MAX_BYTES, "a script of exactly the cap was refused (%s)",
               why ? why : "not made");
    source_free(s);
    free(why);
    remove(path);
}

/* A pipe has no size beforehand: reading stops one byte past the cap. */
static void test_endless_pipe(void)
{
    int fd[2];
    if (pipe(fd) != 0) {
        UNIT_CHECK(&rep, 0, "pipe failed");
        return;
    }
    pid_t child = fork();
    if (child == 0) {
        close(fd[0]);
        char buf[65536];
        memset(buf, ' ', sizeof buf);
        while (write(fd[1], buf, sizeof buf) > 0)
            ;
        _exit(0);
    }
    close(fd[1]);
    char path[64];
    snprintf(path, sizeof path, "/dev/fd/%d", fd[0]);
    check_refused(path, 0, "it has more than the limit of 16777216 bytes (16 MiB) for a script");
    check_refused(path, 1, "it is not a regular file (a pipe or a socket)");
    close(fd[0]);
    kill(child, SIGTERM);
    waitpid(child, NULL, 0);
}

static void test_kinds(void)
{
    check_refused(dir, 1, "it is a folder, not a script file");
    check_refused(dir, 0, "it is a folder, not a script file");
    check_refused("/dev/null", 0, "it is a device, not a script file");
    char path[512];
    snprintf(path, sizeof path, "%s/none.pk", dir);
    check_refused(path, 1, "No such file or directory");
}

int main(void)
{
    if (!mkdtemp(dir)) {
        perror("mkdtemp");
        return 1;
    }
    test_size_cap();
    test_at_cap_and_bom();
    test_endless_pipe();
    test_kinds();
    rmdir(dir);
    return unit_finish("test_source", &rep);
}
