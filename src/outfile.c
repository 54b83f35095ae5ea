/* outfile.c - atomic output files: temporary file, then rename on commit. */
#include <errno.h>
#include <pthread.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include "holdfast/alloc.h"
#include "holdfast/outfile.h"

struct hf_outfile {
    FILE *fp;
    char *path;     /* target path */
    char *tmp;      /* temporary path, NULL when writing in place */
    int is_stdout;
    int slot;       /* index in the cleanup registry, -1 if none */
};

/* Temporary files to remove if a signal kills the process.  Signal handlers
 * may only call async-signal-safe functions: unlink() is one. */
#define MAX_OPEN 64
static char *volatile pending[MAX_OPEN];
static int handlers_installed;

static void on_signal(int sig)
{
    for (int i = 0; i < MAX_OPEN; i++)
        if (pending[i])
            unlink(pending[i]);
    signal(sig, SIG_DFL);
    raise(sig);
}

static void install_handlers(void)
{
    if (handlers_installed)
        return;
    handlers_installed = 1;
    int sigs[] = {SIGINT, SIGTERM, SIGHUP, SIGPIPE};
    for (size_t i = 0; i < sizeof sigs / sizeof sigs[0]; i++) {
        struct sigaction sa;
        memset(&sa, 0, sizeof sa);
        sa.sa_handler = on_signal;
        sigemptyset(&sa.sa_mask);
        sigaction(sigs[i], &sa, NULL);
    }
}

static int register_tmp(char *tmp)
{
    for (int i = 0; i < MAX_OPEN; i++)
        if (!pending[i]) {
            pending[i] = tmp;
            return i;
        }
    return -1;
}

static void release(hf_outfile *f)
{
    if (f->slot >= 0)
        pending[f->slot] = NULL;
    hf_free(f->tmp);
    hf_free(f->path);
    hf_free(f);
}

hf_outfile *hf_outfile_open(const char *path, hf_error *err)
{
    hf_outfile *f = hf_calloc(1, sizeof *f);
    if (!f) {
        hf_error_set(err, HF_ENOMEM, "out of memory opening %s", path);
        return NULL;
    }
    f->slot = -1;
    if (strcmp(path, "-") == 0) {
        f->fp = stdout;
        f->is_stdout = 1;
        return f;
    }
    f->path = hf_strdup(path);
    if (!f->path)
        goto nomem;
    struct stat st;
    if (stat(path, &st) == 0 && !S_ISREG(st.st_mode)) {
        /* A pipe, device or FIFO: write in place, it cannot be renamed over. */
        f->fp = fopen(path, "w");
        if (!f->fp) {
            hf_error_set(err, HF_EIO, "%s: cannot open for writing: %s", path, strerror(errno));
            release(f);
            return NULL;
        }
        return f;
    }
    size_t n = strlen(path) + 32;
    f->tmp = hf_malloc(n);
    if (!f->tmp)
        goto nomem;
    const char *slash = strrchr(path, '/');
    int dirlen = slash ? (int)(slash - path + 1) : 0;
    snprintf(f->tmp, n, "%.*s.%s.tmpXXXXXX", dirlen, path, slash ? slash + 1 : path);
    install_handlers();
    /* Block the cleanup signals while the file exists but is not yet
     * registered, so a kill in between cannot leave it behind. */
    sigset_t block, old;
    sigemptyset(&block);
    sigaddset(&block, SIGINT);
    sigaddset(&block, SIGTERM);
    sigaddset(&block, SIGHUP);
    sigaddset(&block, SIGPIPE);
    pthread_sigmask(SIG_BLOCK, &block, &old);
    int fd = mkstemp(f->tmp);
    if (fd >= 0)
        f->slot = register_tmp(f->tmp);
    int saved = errno;
    pthread_sigmask(SIG_SETMASK, &old, NULL);
    if (fd < 0) {
        hf_error_set(err, HF_EIO, "%s: cannot create a file there: %s", path, strerror(saved));
        release(f);
        return NULL;
    }
    fchmod(fd, 0644);
    f->fp = fdopen(fd, "w");
    if (!f->fp) {
        close(fd);
        unlink(f->tmp);
        goto nomem;
    }
    return f;
nomem:
    hf_error_set(err, HF_ENOMEM, "out of memory opening %s", path);
    release(f);
    return NULL;
}

FILE *hf_outfile_stream(hf_outfile *f)
{
    return f->fp;
}

hf_status hf_outfile_commit(hf_outfile *f, hf_error *err)
{
    hf_status st = HF_OK;
    if (f->is_stdout) {
        if (fflush(stdout) != 0 || ferror(stdout))
            st = hf_error_set(err, HF_EIO, "error writing to standard output");
        release(f);
        return st;
    }
    int bad = ferror(f->fp);
    if (fflush(f->fp) != 0)
        bad = 1;
    if (f->tmp && !bad && fsync(fileno(f->fp)) != 0)
        bad = 1;
    if (fclose(f->fp) != 0)
        bad = 1;
    if (bad) {
        st = hf_error_set(err, HF_EIO, "%s: write failed: %s", f->path, strerror(errno));
        if (f->tmp)
            unlink(f->tmp);
    } else if (f->tmp && rename(f->tmp, f->path) != 0) {
        st = hf_error_set(err, HF_EIO, "%s: cannot rename temporary file into place: %s",
                          f->path, strerror(errno));
        unlink(f->tmp);
    }
    release(f);
    return st;
}

void hf_outfile_abort(hf_outfile *f)
{
    if (!f)
        return;
    if (!f->is_stdout) {
        fclose(f->fp);
        if (f->tmp)
            unlink(f->tmp);
    } else {
        fflush(stdout);
    }
    release(f);
}

int hf_outfile_same_file(const char *out, const char *in)
{
    if (!out || !in || strcmp(out, "-") == 0)
        return 0;
    struct stat so, si;
    if (stat(out, &so) != 0 || stat(in, &si) != 0)
        return 0;
    return so.st_dev == si.st_dev && so.st_ino == si.st_ino;
}

hf_status hf_outfile_check_not_input(const char *out, const char *in, hf_error *err)
{
    if (!hf_outfile_same_file(out, in))
        return HF_OK;
    return hf_error_set(err, HF_EINVAL,
                        "%s: output is the same file as the input %s; choose another output path",
                        out, in);
}
