/* test_runfolder.c - results folders that hold exactly one run (issue 12 item 9). */
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <cmocka.h>
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>
#include "holdfast/runfolder.h"
#include "support.h"

static char dir[256];

static void put(const char *d, const char *name, const char *text)
{
    char p[HF_RUNFOLDER_PATH_MAX + 200];
    snprintf(p, sizeof p, "%s/%s", d, name);
    hf_test_file_write(p, text);
}

static int exists(const char *d, const char *name)
{
    char p[HF_RUNFOLDER_PATH_MAX + 200];
    struct stat sb;
    snprintf(p, sizeof p, "%s/%s", d, name);
    return stat(p, &sb) == 0;
}

/* A new folder is created by the swap; a second run replaces the first as
 * a whole (a file only the first run wrote is gone: before the fix an old
 * invert result survived beside the new files); an aborted run leaves the
 * folder as it was. */
static void test_replace_as_a_whole(void **state)
{
    (void)state;
    char out[400];
    snprintf(out, sizeof out, "%s/quay-results/", dir); /* trailing '/' accepted */
    hf_runfolder rf;
    hf_error err;
    assert_int_equal(hf_runfolder_begin(&rf, out, &err), HF_OK);
    assert_false(exists(rf.dir, ""));
    put(hf_runfolder_path(&rf), "old-invert.csv", "x\n");
    assert_int_equal(hf_runfolder_commit(&rf, &err), HF_OK);
    assert_true(exists(rf.dir, "old-invert.csv"));
    assert_true(exists(rf.dir, HF_RUNFOLDER_STAMP));

    assert_int_equal(hf_runfolder_begin(&rf, out, &err), HF_OK);
    put(hf_runfolder_path(&rf), "summary.txt", "second\n");
    assert_true(exists(rf.dir, "old-invert.csv")); /* untouched until the swap */
    assert_int_equal(hf_runfolder_commit(&rf, &err), HF_OK);
    assert_false(exists(rf.dir, "old-invert.csv"));
    assert_true(exists(rf.dir, "summary.txt"));

    assert_int_equal(hf_runfolder_begin(&rf, out, &err), HF_OK);
    char tmp[sizeof rf.tmp];
    snprintf(tmp, sizeof tmp, "%s", hf_runfolder_path(&rf));
    put(tmp, "half.csv", "y\n");
    hf_runfolder_abort(&rf);
    struct stat sb;
    assert_int_not_equal(stat(tmp, &sb), 0);
    assert_true(exists(rf.dir, "summary.txt"));
    assert_false(exists(rf.dir, "half.csv"));
}

/* A folder with other files (no stamp) is refused and left alone; an
 * empty folder and a file name are handled; an empty name is refused. */
static void test_refusals(void **state)
{
    (void)state;
    char mine[400], empty[400], file[400];
    snprintf(mine, sizeof mine, "%s/thesis", dir);
    snprintf(empty, sizeof empty, "%s/empty", dir);
    snprintf(file, sizeof file, "%s/plain.txt", dir);
    assert_int_equal(mkdir(mine, 0777), 0);
    assert_int_equal(mkdir(empty, 0777), 0);
    put(mine, "chapter1.tex", "precious\n");
    hf_test_file_write(file, "z\n");
    hf_runfolder rf;
    hf_error err;
    assert_int_equal(hf_runfolder_begin(&rf, mine, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "not an empty folder or a holdfast results folder"));
    assert_true(exists(mine, "chapter1.tex"));
    assert_int_equal(hf_runfolder_begin(&rf, file, &err), HF_EINVAL);
    char link[400];
    snprintf(link, sizeof link, "%s/link-results", dir);
    assert_int_equal(symlink(mine, link), 0); /* a link is not followed */
    assert_int_equal(hf_runfolder_begin(&rf, link, &err), HF_EINVAL);
    assert_non_null(strstr(err.text, "symbolic link"));
    assert_true(exists(mine, "chapter1.tex"));
    assert_int_equal(hf_runfolder_begin(&rf, "", &err), HF_EINVAL);
    hf_runfolder_abort(&rf); /* harmless after a failed begin */
    /* a results folder from before the stamp: summary.txt says holdfast */
    char legacy[400];
    snprintf(legacy, sizeof legacy, "%s/old-results", dir);
    assert_int_equal(mkdir(legacy, 0777), 0);
    put(legacy, "summary.txt", "holdfast 0.0.9 run of harbour.yaml\n");
    put(legacy, "rest.csv", "line\n");
    assert_int_equal(hf_runfolder_begin(&rf, legacy, &err), HF_OK);
    assert_int_equal(hf_runfolder_commit(&rf, &err), HF_OK);
    assert_false(exists(legacy, "rest.csv"));
    put(mine, "summary.txt", "my own summary\n"); /* not holdfast's */
    assert_int_equal(hf_runfolder_begin(&rf, mine, &err), HF_EINVAL);
    assert_int_equal(hf_runfolder_begin(&rf, empty, &err), HF_OK);
    put(hf_runfolder_path(&rf), "a.csv", "1\n");
    assert_int_equal(hf_runfolder_commit(&rf, &err), HF_OK);
    assert_true(exists(empty, "a.csv"));
}

static int setup(void **s)
{
    (void)s;
    return hf_test_tmpdir_make(dir, sizeof dir, "runfolder");
}

static int teardown(void **s)
{
    (void)s;
    return hf_test_tmpdir_remove(dir);
}

int main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_replace_as_a_whole),
        cmocka_unit_test(test_refusals),
    };
    return cmocka_run_group_tests(tests, setup, teardown);
}
