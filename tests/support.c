/* support.c - helpers shared by the test programs: CLI runner, files, scratch directories, text. */
#include <dirent.h>
#include <errno.h>
#include <fcntl.h>
#include <poll.h>
#include <setjmp.h>
#include <signal.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <time.h>
#include <unistd.h>
#include <cmocka.h>
#include "support.h"
#include "xml_check.h"

/* Test code allocates with plain malloc on purpose: the library's hf_malloc
 * carries the failure injection the tests switch on. */

const char *hf_test_bin(void)
{
    const char *b = getenv("HF_BIN");
    return b && b[0] ? b : NULL;
}

const char *hf_test_root(void)
{
    const char *r = getenv("HF_ROOT");
    return r && r[0] ? r : ".";
}

void hf_test_root_path(char *buf, size_t cap, const char *rel)
{
    snprintf(buf, cap, "%s/%s", hf_test_root(), rel);
}

/* ---- running a program ---- */

typedef struct {
    int fd;     /* read end of the pipe, -1 once closed */
    char *buf;  /* caller's buffer or NULL */
    size_t cap; /* bytes at buf */
    size_t n;   /* bytes stored */
} sink;

/* Reads what is ready on s->fd into its buffer; closes it at end of file. */
static void drain(sink *s)
{
    char chunk[4096];
    ssize_t k = read(s->fd, chunk, sizeof chunk);
    if (k < 0 && errno == EINTR)
        return;
    if (k <= 0) {
        close(s->fd);
        s->fd = -1;
        return;
    }
    if (s->buf && s->cap > 1 && s->n < s->cap - 1) {
        size_t room = s->cap - 1 - s->n, take = (size_t)k < room ? (size_t)k : room;
        memcpy(s->buf + s->n, chunk, take);
        s->n += take;
    }
}

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

int hf_test_run(const char *const argv[], hf_test_io *io)
{
    io->signal = 0;
    if (io->out && io->out_cap)
        io->out[0] = '\0';
    if (io->err && io->err_cap)
        io->err[0] = '\0';
    int po[2], pe[2] = {-1, -1};
    if (pipe(po) != 0)
        return -1;
    if (!io->merge && pipe(pe) != 0) {
        close(po[0]);
        close(po[1]);
        return -1;
    }
    pid_t pid = fork();
    if (pid < 0) {
        close(po[0]);
        close(po[1]);
        if (pe[0] >= 0) {
            close(pe[0]);
            close(pe[1]);
        }
        return -1;
    }
    if (pid == 0) {
        int nul = open("/dev/null", O_RDONLY);
        if (nul < 0 || dup2(nul, 0) < 0 || dup2(po[1], 1) < 0 ||
            dup2(io->merge ? po[1] : pe[1], 2) < 0)
            _exit(127);
        close(nul);
        close(po[0]);
        close(po[1]);
        if (pe[0] >= 0) {
            close(pe[0]);
            close(pe[1]);
        }
        execv(argv[0], (char *const *)argv);
        _exit(127);
    }
    close(po[1]);
    if (pe[1] >= 0)
        close(pe[1]);
    sink s[2] = {{po[0], io->out, io->out_cap, 0},
                 {pe[0], io->merge ? NULL : io->err, io->err_cap, 0}};
    double deadline = io->timeout > 0 ? now() + io->timeout : 0.0;
    int killed = 0;
    while (s[0].fd >= 0 || s[1].fd >= 0) {
        struct pollfd p[2];
        nfds_t np = 0;
        int which[2];
        for (int i = 0; i < 2; i++)
            if (s[i].fd >= 0) {
                p[np].fd = s[i].fd;
                p[np].events = POLLIN;
                p[np].revents = 0;
                which[np++] = i;
            }
        int wait_ms = -1;
        if (deadline > 0 && !killed) {
            double left = deadline - now();
            wait_ms = left > 0 ? (int)(left * 1e3) + 1 : 0;
        }
        int r = poll(p, np, wait_ms);
        if (r < 0 && errno == EINTR)
            continue;
        if (r < 0)
            break;
        if (r == 0) { /* timed out: stop the child; the pipes then reach their end */
            kill(pid, SIGKILL);
            killed = 1;
            continue;
        }
        for (nfds_t k = 0; k < np; k++)
            if (p[k].revents)
                drain(&s[which[k]]);
    }
    for (int i = 0; i < 2; i++)
        if (s[i].fd >= 0)
            close(s[i].fd);
    if (s[0].buf && s[0].cap)
        s[0].buf[s[0].n] = '\0';
    if (s[1].buf && s[1].cap)
        s[1].buf[s[1].n] = '\0';
    int st;
    while (waitpid(pid, &st, 0) < 0)
        if (errno != EINTR)
            return -1;
    if (WIFSIGNALED(st)) {
        io->signal = WTERMSIG(st);
        return -1;
    }
    return WIFEXITED(st) ? WEXITSTATUS(st) : -1;
}

int hf_test_run_bin(hf_test_io *io, ...)
{
    const char *argv[64];
    int n = 0;
    argv[n++] = hf_test_bin();
    if (!argv[0])
        return -1;
    va_list ap;
    va_start(ap, io);
    const char *a;
    while ((a = va_arg(ap, const char *)) != NULL) {
        if (n == 63) {
            va_end(ap);
            fail_msg("hf_test_run_bin: more than 62 arguments");
        }
        argv[n++] = a;
    }
    va_end(ap);
    argv[n] = NULL;
    return hf_test_run(argv, io);
}

/* ---- files ---- */

char *hf_test_file_read(const char *path, size_t *len)
{
    FILE *f = fopen(path, "rb");
    if (!f)
        return NULL;
    size_t cap = 1 << 16, n = 0;
    char *buf = malloc(cap);
    assert_non_null(buf);
    for (;;) {
        n += fread(buf + n, 1, cap - 1 - n, f);
        if (n < cap - 1)
            break;
        cap *= 2;
        char *more = realloc(buf, cap);
        assert_non_null(more);
        buf = more;
    }
    int bad = ferror(f);
    fclose(f);
    if (bad) {
        free(buf);
        fail_msg("cannot read %s", path);
    }
    buf[n] = '\0';
    if (len)
        *len = n;
    return buf;
}

long hf_test_file_read_into(const char *path, char *buf, size_t cap)
{
    if (cap)
        buf[0] = '\0';
    FILE *f = fopen(path, "rb");
    if (!f)
        return -1;
    size_t n = cap ? fread(buf, 1, cap - 1, f) : 0;
    if (cap)
        buf[n] = '\0';
    fclose(f);
    return (long)n;
}

char *hf_test_stream_read(FILE *f, long min_len)
{
    long n = ftell(f);
    assert_true(n >= min_len);
    assert_true(n >= 0);
    rewind(f);
    char *s = malloc((size_t)n + 1);
    assert_non_null(s);
    assert_int_equal(fread(s, 1, (size_t)n, f), (size_t)n);
    s[n] = '\0';
    return s;
}

void hf_test_file_write(const char *path, const char *text)
{
    FILE *f = fopen(path, "w");
    if (!f)
        fail_msg("cannot write %s: %s", path, strerror(errno));
    fputs(text, f);
    assert_int_equal(fclose(f), 0);
}

/* ---- scratch directories ---- */

int hf_test_tmpdir_make(char *dir, size_t cap, const char *tag)
{
    const char *tmp = getenv("TMPDIR");
    int k = snprintf(dir, cap, "%s/hf-%s-XXXXXX", tmp && *tmp ? tmp : "/tmp", tag);
    if (k < 0 || (size_t)k >= cap)
        return -1;
    return mkdtemp(dir) ? 0 : -1;
}

int hf_test_cli_setup(const char **bin, char *dir, size_t cap, const char *tag)
{
    *bin = hf_test_bin();
    if (cap)
        dir[0] = '\0';
    if (!*bin || access(*bin, X_OK) != 0) {
        /* A missing binary is a failed precondition, never a silent pass. */
        fprintf(stderr,
                "%s: HF_BIN must name the built holdfast (got '%s'); run the tests "
                "through make check, or set HF_BIN=build/holdfast HF_ROOT=.\n",
                tag, *bin ? *bin : "");
        *bin = NULL;
        return -1;
    }
    if (hf_test_tmpdir_make(dir, cap, tag) != 0) {
        fprintf(stderr, "%s: cannot make a scratch directory: %s\n", tag, strerror(errno));
        return -1;
    }
    return 0;
}

int hf_test_tmpdir_remove(const char *path)
{
    struct stat st;
    if (lstat(path, &st) != 0)
        return errno == ENOENT ? 0 : -1;
    if (!S_ISDIR(st.st_mode))
        return unlink(path) == 0 ? 0 : -1;
    DIR *d = opendir(path);
    if (!d)
        return -1;
    int rc = 0;
    struct dirent *e;
    while ((e = readdir(d)) != NULL) {
        if (!strcmp(e->d_name, ".") || !strcmp(e->d_name, ".."))
            continue;
        char p[4096];
        int k = snprintf(p, sizeof p, "%s/%s", path, e->d_name);
        if (k < 0 || (size_t)k >= sizeof p || hf_test_tmpdir_remove(p) != 0)
            rc = -1;
    }
    closedir(d);
    if (rmdir(path) != 0)
        rc = -1;
    return rc;
}

/* ---- text ---- */

char *hf_test_line_next(char **cur)
{
    if (!*cur || !**cur)
        return NULL;
    char *s = *cur, *nl = strchr(s, '\n');
    if (nl) {
        *nl = '\0';
        *cur = nl + 1;
    } else {
        *cur = s + strlen(s);
    }
    return s;
}

size_t hf_test_csv_split(char *line, char **f, size_t cap)
{
    static char empty[1];
    for (size_t k = 0; k < cap; k++)
        f[k] = empty; /* missing fields read as "" */
    size_t n = 0;
    char *s = line;
    while (n < cap) {
        f[n++] = s;
        char *c = strchr(s, ',');
        if (!c)
            break;
        *c = '\0';
        s = c + 1;
    }
    return n;
}

void hf_test_assert_xml(const char *doc)
{
    const char *m = hf_test_xml_check(doc);
    if (m) {
        print_error("not well-formed XML: %s\n", m);
        fail();
    }
}

/* ---- lines built in C ---- */

void hf_test_line_one(hf_line *l, double length, double weight, double ea, double mbl,
                      double friction)
{
    memset(l, 0, sizeof *l);
    l->n = 1;
    l->sec[0].length = length;
    l->sec[0].weight = weight;
    l->sec[0].ea = ea;
    l->sec[0].mbl = mbl;
    l->sec[0].friction = friction;
}

/* ---- shared case text ---- */

const char hf_test_case_quarrel[] =
    "title: Tri-line buoy at Quarrel Point (fictional)\n"
    "site: {depth: 62 m}\n"
    "components:\n"
    "  chain76: {type: studless_chain, grade: R3, diameter: 76 mm}\n"
    "  wire64: {type: spiral_strand, diameter: 64 mm}\n"
    "lines:\n"
    "  - name: north\n"
    "    anchor: [0 m, 420 m]\n"
    "    fairlead: [0 m, 4 m, -8 m]\n"
    "    sections: [{component: chain76, length: 160 m}, {clump: 60 kN},\n"
    "               {component: wire64, length: 160 m}, {component: chain76, length: 112 m}]\n"
    "  - name: southwest\n"
    "    anchor: [-363.7 m, -210 m]\n"
    "    fairlead: [-3.46 m, -2 m, -8 m]\n"
    "    sections: [{component: chain76, length: 160 m}, {clump: 60 kN},\n"
    "               {component: wire64, length: 160 m}, {component: chain76, length: 112 m}]\n"
    "  - name: southeast\n"
    "    anchor: [363.7 m, -210 m]\n"
    "    fairlead: [3.46 m, -2 m, -8 m]\n"
    "    sections: [{component: chain76, length: 160 m}, {clump: 60 kN},\n"
    "               {component: wire64, length: 160 m}, {component: chain76, length: 112 m}]\n"
    "loads:\n"
    "  - {name: gale, force: 400 kN, direction: 30 deg}\n"
    "criteria: {preset: api-rp-2sk}\n";
