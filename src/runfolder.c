/* runfolder.c - results folders that hold one run, built aside and swapped in by rename. */
#include <dirent.h>
#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include "holdfast/runfolder.h"

static const char stamp_text[] =
    "holdfast results folder: written by 'holdfast run' and replaced as a whole by the next\n"
    "run into this folder.  Do not keep other files here.\n";

/* 1 when d is a results folder of a holdfast from before the stamp: its
 * summary.txt starts with "holdfast " (the line every run writes first). */
static int legacy(const char *d)
{
    char p[HF_RUNFOLDER_PATH_MAX + 32], head[16] = "";
    snprintf(p, sizeof p, "%s/summary.txt", d);
    FILE *f = fopen(p, "r");
    if (!f)
        return 0;
    size_t n = fread(head, 1, 9, f);
    fclose(f);
    head[n] = '\0';
    return !strcmp(head, "holdfast ");
}

/* Classifies folder d: 0 missing, 1 empty, 2 holdfast results folder,
 * 3 something else (not a directory, or other files), 4 a symbolic link;
 * -1 unreadable. */
static int classify(const char *d)
{
    struct stat st;
    if (lstat(d, &st) != 0)
        return errno == ENOENT ? 0 : -1;
    if (S_ISLNK(st.st_mode)) /* never followed: its target would be replaced */
        return 4;
    if (!S_ISDIR(st.st_mode))
        return 3;
    DIR *dp = opendir(d);
    if (!dp)
        return -1;
    int any = 0, stamped = 0;
    struct dirent *e;
    while ((e = readdir(dp))) {
        if (!strcmp(e->d_name, ".") || !strcmp(e->d_name, ".."))
            continue;
        any = 1;
        stamped |= !strcmp(e->d_name, HF_RUNFOLDER_STAMP);
    }
    closedir(dp);
    return !any ? 1 : stamped || legacy(d) ? 2 : 3;
}

/* Deletes the regular files in d, then d (a results folder holds no
 * subfolders).  Best effort. */
static void remove_tree(const char *d)
{
    DIR *dp = opendir(d);
    if (dp) {
        struct dirent *e;
        char p[HF_RUNFOLDER_PATH_MAX + 320];
        while ((e = readdir(dp))) {
            if (!strcmp(e->d_name, ".") || !strcmp(e->d_name, ".."))
                continue;
            snprintf(p, sizeof p, "%s/%s", d, e->d_name);
            unlink(p);
        }
        closedir(dp);
    }
    rmdir(d);
}

static hf_status write_stamp(const char *d, hf_error *err)
{
    char p[HF_RUNFOLDER_PATH_MAX + 64];
    snprintf(p, sizeof p, "%s/%s", d, HF_RUNFOLDER_STAMP);
    FILE *f = fopen(p, "w");
    int ok = f && fputs(stamp_text, f) >= 0;
    if (f && fclose(f) != 0)
        ok = 0;
    if (!ok)
        return hf_error_set(err, HF_EIO, "%s: cannot write the results folder stamp: %s", p,
                            strerror(errno));
    return HF_OK;
}

hf_status hf_runfolder_begin(hf_runfolder *rf, const char *dir, hf_error *err)
{
    size_t n = strlen(dir);
    rf->tmp[0] = '\0';
    while (n > 1 && dir[n - 1] == '/')
        n--;
    if (n == 0 || n > HF_RUNFOLDER_PATH_MAX)
        return hf_error_set(err, HF_EINVAL, "results folder: name empty or longer than %d bytes",
                            HF_RUNFOLDER_PATH_MAX);
    memcpy(rf->dir, dir, n);
    rf->dir[n] = '\0';
    int kind = classify(rf->dir);
    if (kind < 0)
        return hf_error_set(err, HF_EIO, "%s: cannot read the results folder: %s", rf->dir,
                            strerror(errno));
    if (kind == 4)
        return hf_error_set(err, HF_EINVAL,
                            "%s: is a symbolic link; give the results folder itself", rf->dir);
    if (kind == 3)
        return hf_error_set(err, HF_EINVAL,
                            "%s: exists and is not an empty folder or a holdfast results folder "
                            "(no %s stamp); refusing to mix a run with other files: choose "
                            "another --out or empty it",
                            rf->dir, HF_RUNFOLDER_STAMP);
    snprintf(rf->tmp, sizeof rf->tmp, "%s.partial-XXXXXX", rf->dir);
    if (!mkdtemp(rf->tmp)) {
        hf_status s = hf_error_set(err, HF_EIO, "%s: cannot create a folder beside it: %s", rf->dir,
                                   strerror(errno));
        rf->tmp[0] = '\0';
        return s;
    }
    mode_t mask = umask(0); /* mkdtemp makes 0700; give the folder the usual mode */
    umask(mask);
    chmod(rf->tmp, 0777 & ~mask);
    hf_status s = write_stamp(rf->tmp, err);
    if (s != HF_OK)
        hf_runfolder_abort(rf);
    return s;
}

const char *hf_runfolder_path(const hf_runfolder *rf)
{
    return rf->tmp;
}

hf_status hf_runfolder_commit(hf_runfolder *rf, hf_error *err)
{
    char old[HF_RUNFOLDER_PATH_MAX + 32];
    int kind = classify(rf->dir), had = kind > 0;
    if (kind < 0 || kind >= 3)
        return hf_error_set(err, HF_EIO,
                            "%s: changed during the run (now neither empty nor a "
                            "holdfast results folder); the new run is in %s",
                            rf->dir, rf->tmp);
    if (had) {
        /* rename onto an empty directory replaces it (POSIX rename) */
        snprintf(old, sizeof old, "%s.old-XXXXXX", rf->dir);
        if (!mkdtemp(old) || rename(rf->dir, old) != 0) {
            int e = errno;
            rmdir(old);
            return hf_error_set(err, HF_EIO,
                                "%s: cannot move the earlier run aside: %s; the new "
                                "run is in %s",
                                rf->dir, strerror(e), rf->tmp);
        }
    }
    if (rename(rf->tmp, rf->dir) != 0) {
        int e = errno;
        if (had)
            rename(old, rf->dir); /* put the earlier run back */
        return hf_error_set(err, HF_EIO, "%s: cannot move the new run into place: %s; it is in %s",
                            rf->dir, strerror(e), rf->tmp);
    }
    rf->tmp[0] = '\0';
    if (had)
        remove_tree(old);
    return HF_OK;
}

void hf_runfolder_abort(hf_runfolder *rf)
{
    if (rf->tmp[0])
        remove_tree(rf->tmp);
    rf->tmp[0] = '\0';
}
