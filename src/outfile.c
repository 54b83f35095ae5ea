/* outfile.c - atomic output files: temporary file, then rename on commit.
 *
 * Signals: SIGINT, SIGTERM, SIGHUP and SIGPIPE remove the pending temporary
 * files and then end the process as the signal would have; SIGXFSZ (a file
 * size limit, `ulimit -f`, was reached) is ignored, so the write fails with
 * EFBIG instead of killing the process, and the commit reports it
 * (HF_EIO, exit status 2) and removes the temporary file.  At exit() any
 * temporary file still pending (an output neither committed nor aborted) is
 * removed too. */
#include <errno.h>
#include <pthread.h>
#include <signal.h>
#include <stdatomic.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/resource.h>
#include <sys/stat.h>
#include <unistd.h>
#include "holdfast/alloc.h"
#include "holdfast/outfile.h"

struct hf_outfile {
    FILE *fp;
    char *path; /* target path */
    char *tmp;  /* temporary path, NULL when writing in place */
    int is_stdout;
    int slot; /* index in the cleanup registry, -1 if none */
};

/* Temporary files to remove if a signal kills the process or it exits
 * with outputs neither committed nor aborted.  Signal handlers may only call
 * async-signal-safe functions: unlink() and getpid() are.  A forked child
 * inherits the registry but not the files: only the process that created
 * a file (pending_pid) removes it. */
#define MAX_OPEN 64
static char *volatile pending[MAX_OPEN];
static volatile pid_t pending_pid[MAX_OPEN];
static int handlers_installed;
/* Nonzero while hf_outfile_open creates and registers a temporary file.
 * That thread blocks the signals, but a process signal may be handled on
 * another thread (an idle OpenMP worker does not share the mask): the
 * handler then waits for the registration, so the new file is removed too.
 * A lock-free atomic is async-signal-safe (C11 7.14.1.1). */
static atomic_int creating;

static void remove_pending(void)
{
    pid_t self = getpid();
    for (int i = 0; i < MAX_OPEN; i++)
        if (pending[i] && pending_pid[i] == self)
            unlink(pending[i]);
}

static void on_signal(int sig)
{
    while (atomic_load(&creating))
        ; /* another thread is between mkstemp and the registry */
    remove_pending();
    signal(sig, SIG_DFL);
    raise(sig);
}

void hf_outfile_signals_install(void)
{
    if (handlers_installed)
        return;
    handlers_installed = 1;
    /* An output left open at exit (an error path that forgot to abort it)
     * leaves no temporary file behind either. */
    atexit(remove_pending);
    /* Past a file size limit the kernel sends SIGXFSZ, whose default action
     * kills the process before any cleanup; ignored, write() fails with
     * EFBIG instead (POSIX, setrlimit RLIMIT_FSIZE). */
    signal(SIGXFSZ, SIG_IGN);
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
            pending_pid[i] = getpid();
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
    hf_outfile_signals_install();
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
    /* Block the cleanup signals while the file exists but is not yet
     * registered, so a kill in between cannot leave it behind; a handler
     * on another thread waits for `creating` to clear. */
    sigset_t block, old;
    sigemptyset(&block);
    sigaddset(&block, SIGINT);
    sigaddset(&block, SIGTERM);
    sigaddset(&block, SIGHUP);
    sigaddset(&block, SIGPIPE);
    pthread_sigmask(SIG_BLOCK, &block, &old);
    atomic_store(&creating, 1);
    int fd = mkstemp(f->tmp);
    int saved = errno;
    if (fd >= 0)
        f->slot = register_tmp(f->tmp);
    atomic_store(&creating, 0);
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

/* 1 when the open file fd has reached the process's file size limit. */
static int hit_size_limit(int fd)
{
    struct rlimit rl;
    struct stat st;
    if (getrlimit(RLIMIT_FSIZE, &rl) != 0 || rl.rlim_cur == RLIM_INFINITY)
        return 0;
    if (fstat(fd, &st) != 0 || !S_ISREG(st.st_mode))
        return 0;
    return (rlim_t)st.st_size >= rl.rlim_cur;
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
    /* errno of the first failing call here; 0 when only an earlier write
     * failed (stdio keeps the error flag, not its cause). */
    int bad = ferror(f->fp), why = 0;
    errno = 0;
    if (fflush(f->fp) != 0 && !why)
        bad = 1, why = errno;
    if (f->tmp && !bad && fsync(fileno(f->fp)) != 0)
        bad = 1, why = errno;
    int fd = fileno(f->fp);
    int too_big = bad && hit_size_limit(fd);
    if (fclose(f->fp) != 0 && !why)
        bad = 1, why = errno;
    if (bad) {
        if (too_big || why == EFBIG)
            st = hf_error_set(err, HF_EIO,
                              "%s: write failed: the file size limit (ulimit -f) "
                              "was reached; the file was not written",
                              f->path);
        else
            st = hf_error_set(err, HF_EIO, "%s: write failed: %s", f->path,
                              why ? strerror(why) : "an earlier write to it failed");
        if (f->tmp)
            unlink(f->tmp);
    } else if (f->tmp && rename(f->tmp, f->path) != 0) {
        st = hf_error_set(err, HF_EIO, "%s: cannot rename temporary file into place: %s", f->path,
                          strerror(errno));
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
