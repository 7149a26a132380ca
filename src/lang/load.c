/* load "file.pk": runs another script's statements in the global scope,
   once per file. The file is looked up next to the script that loads it,
   then along the search path (--lib DIR options, PSIKAPPA_PATH, and the
   standard library shipped with psikappa). Cycles are reported with the
   chain of loads that led to them. */
#include <errno.h>
#include <limits.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "diag.h"
#include "interp.h"
#include "util.h"
#include "exec.h"

#ifndef PSIKAPPA_STDLIB_DIR
#define PSIKAPPA_STDLIB_DIR "lib"
#endif

void interp_add_search_dir(interp *I, const char *dir)
{
    I->search = xrealloc(I->search, (I->nsearch + 1) * sizeof(char *));
    I->search[I->nsearch++] = xstrdup(dir);
}

/* Directory part of a path ("." when there is none); the caller frees it. */
static char *load_dirname(const char *path)
{
    const char *slash = strrchr(path, '/');
    if (!slash)
        return xstrdup(".");
    return xasprintf("%.*s", (int)(slash - path), path);
}

/* The first candidate that exists but cannot be read, so that the error says
   why instead of "cannot find" (path owned, NULL when there was none). */
typedef struct {
    char *path;
    int err;
} load_miss;

static char *load_try(const char *dir, const char *name, load_miss *miss)
{
    char *path = name[0] == '/' || strcmp(dir, ".") == 0 ? xstrdup(name) : xasprintf("%s/%s", dir, name);
    if (access(path, R_OK) == 0)
        return path;
    if (errno != ENOENT && errno != ENOTDIR && !miss->path) {
        miss->path = path;
        miss->err = errno;
        return NULL;
    }
    free(path);
    return NULL;
}

/* The standard library installed beside this executable (PREFIX/bin/psikappa
   -> PREFIX/share/psikappa/lib), so that an install into any prefix finds its
   own copy first; NULL when the executable's path is unknown. Caller frees. */
static char *load_exe_libdir(void)
{
    char exe[PATH_MAX];
    ssize_t len = readlink("/proc/self/exe", exe, sizeof exe - 1);
    if (len <= 0)
        return NULL;
    exe[len] = '\0';
    char *bin = load_dirname(exe);
    char *lib = xasprintf("%s/../share/psikappa/lib", bin);
    free(bin);
    return lib;
}

/* Why a file that is there cannot be loaded, in words. */
static const char *load_miss_reason(int err)
{
    if (err == ELOOP)
        return "it is a loop of symbolic links";
    if (err == EACCES)
        return "it is not readable (permission denied)";
    if (err == ENAMETOOLONG)
        return "its name is too long";
    return strerror(err);
}

/* Finds name, first beside the loading script; NULL when nowhere. */
static char *load_resolve(interp *I, const node *n, load_miss *miss)
{
    char *here = load_dirname(n->loc.src ? n->loc.src->name : ".");
    char *path = load_try(here, n->text, miss);
    free(here);
    for (int i = 0; !path && i < I->nsearch; i++)
        path = load_try(I->search[i], n->text, miss);
    const char *env = getenv("PSIKAPPA_PATH");
    if (!path && env) {
        char *copy = xstrdup(env), *save = NULL;
        for (char *d = strtok_r(copy, ":", &save); d && !path; d = strtok_r(NULL, ":", &save))
            path = load_try(d, n->text, miss);
        free(copy);
    }
    char *installed = path ? NULL : load_exe_libdir();
    if (installed) {
        path = load_try(installed, n->text, miss);
        free(installed);
    }
    if (!path)
        path = load_try(PSIKAPPA_STDLIB_DIR, n->text, miss);
#ifdef PSIKAPPA_INSTALLED_LIB_DIR
    if (!path)
        path = load_try(PSIKAPPA_INSTALLED_LIB_DIR, n->text, miss);
#endif
    return path;
}

static int load_index(char **list, int len, const char *path)
{
    for (int i = 0; i < len; i++)
        if (strcmp(list[i], path) == 0)
            return i;
    return -1;
}

static void load_report_cycle(interp *I, const node *n, int from)
{
    diag_error(&n->loc, "load cycle: '%s' is already being loaded", n->text);
    for (int i = from; i < I->nloading; i++)
        diag_note(NULL, "  %s%s", I->loading_names[i], i + 1 < I->nloading ? " loads" : " loads it again");
}

static void load_push(char ***list, int *len, const char *path)
{
    *list = xrealloc(*list, (*len + 1) * sizeof(char *));
    (*list)[(*len)++] = xstrdup(path);
}

int exec_load(interp *I, const node *n)
{
    if (n->text[0] == '\0') {
        diag_error(&n->loc, "load needs a file name, got an empty string");
        return 0;
    }
    load_miss miss = {NULL, 0};
    char *found = load_resolve(I, n, &miss);
    if (!found && miss.path)
        diag_error(&n->loc, "cannot load '%s': %s (%s)", n->text, load_miss_reason(miss.err), miss.path);
    else if (!found)
        diag_error(&n->loc, "cannot find '%s' (looked beside this script, in --lib folders, PSIKAPPA_PATH "
                            "and the standard library)", n->text);
    free(miss.path);
    if (!found)
        return 0;
    char real[PATH_MAX];
    char *canon = realpath(found, real) ? xstrdup(real) : xstrdup(found);
    int ok = 1, cycle = load_index(I->loading, I->nloading, canon);
    if (cycle >= 0) {
        load_report_cycle(I, n, cycle);
        ok = 0;
    } else if (load_index(I->loaded, I->nloaded, canon) < 0) {
        char *why;
        source *src = source_read_script(found, 1, &why);
        if (!src) {
            diag_error(&n->loc, "cannot load '%s': %s", found, why);
            free(why);
            ok = 0;
        } else {
            int depth = I->nloading;
            load_push(&I->loading_names, &depth, found);
            load_push(&I->loading, &I->nloading, canon);
            ok = interp_run_source(I, src) == 0;
            free(I->loading[--I->nloading]);
            free(I->loading_names[I->nloading]);
            if (ok)
                load_push(&I->loaded, &I->nloaded, canon);
            else
                diag_note(&n->loc, "in the script loaded here");
        }
    }
    free(canon);
    free(found);
    return ok;
}
