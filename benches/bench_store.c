/* bench_store.c - the store's speed and size on the scale: a
 * 50-element bench with 10,000 setups, each changing one value.  Prints
 * record, history, compare and open times and the bytes one setup adds to
 * the file; asserts nothing.  Usage: bench_store [SETUPS] [DIR]. */
#include <config.h>

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "bench-file.h"
#include "core-diff.h"
#include "core-edit.h"
#include "store.h"
#include "util-err.h"

static double
now_ms(void)
{
	struct timespec ts;

	clock_gettime(CLOCK_MONOTONIC, &ts);
	return ts.tv_sec * 1e3 + ts.tv_nsec / 1e6;
}

static long long
file_size(const char *p)
{
	struct stat sb;

	return stat(p, &sb) == 0 ? (long long)sb.st_size : 0;
}

static void
die(const char *what, char *cause)
{
	fprintf(stderr, "bench_store: %s: %s\n", what, cause != NULL ? cause : "?");
	exit(2);
}

/* 50 elements: spaces and mirrors, lenses, a splitter with a side branch of
 * four, and a dump at the end. */
static struct bench *
make_bench(void)
{
	struct bench *b = model_bench_new("bench-50");
	char *cause = NULL, id[32];
	int n = 0;

	b->src.wavelength = 1064e-9;
	b->src.power = 5;
	b->src.waist[0] = b->src.waist[1] = 1e-3;
	while (n < 44) {
		struct element el;
		char *kv[3];
		const char *type;
		size_t nkv = 0;

		if (n % 2 == 0) {
			type = "space";
			kv[nkv++] = "length=100 mm";
		} else if (n % 6 == 1) {
			type = "lens";
			kv[nkv++] = "focal=500 mm";
			kv[nkv++] = "damage.cw_irradiance=1 MW/cm^2";
		} else {
			type = "mirror";
			kv[nkv++] = "reflectance=0.99";
			kv[nkv++] = "aoi=45";
			kv[nkv++] = "damage.cw_linear=10 kW/cm";
		}
		snprintf(id, sizeof id, "E%d", n);
		if (edit_element_new(&el, type, id, kv, nkv, &cause) != 0 ||
		    edit_add(b, &el, NULL, &cause) != 0)
			die("building", cause);
		n++;
	}
	{
		struct element el;
		char *kv[] = { "reflectance=0.05" }, *sk[] = { "length=50 mm" },
		    *mk[] = { "reflectance=0.5" }, *dk[] = { "max_power=1 W" };
		struct edit_place into = { NULL, NULL, "BS.reflected", 0 };

		if (edit_element_new(&el, "splitter", "BS", kv, 1, &cause) != 0 ||
		    edit_add(b, &el, NULL, &cause) != 0 ||
		    edit_element_new(&el, "space", "B1", sk, 1, &cause) != 0 ||
		    edit_add(b, &el, &into, &cause) != 0 ||
		    edit_element_new(&el, "mirror", "B2", mk, 1, &cause) != 0 ||
		    edit_add(b, &el, &into, &cause) != 0 ||
		    edit_element_new(&el, "space", "B3", sk, 1, &cause) != 0 ||
		    edit_add(b, &el, &into, &cause) != 0 ||
		    edit_element_new(&el, "dump", "B4", dk, 1, &cause) != 0 ||
		    edit_add(b, &el, &into, &cause) != 0 ||
		    edit_element_new(&el, "dump", "END", dk, 1, &cause) != 0 ||
		    edit_add(b, &el, NULL, &cause) != 0)
			die("building", cause);
	}
	return b;
}

int
main(int argc, char **argv)
{
	int nrev = argc > 1 ? atoi(argv[1]) : 10000;
	char dir[256], path[300], *cause = NULL, rev[32], rev2[32];
	struct bench *b = make_bench(), *x, *y;
	struct store_rev *revs;
	struct store *s;
	double t0, commit_ms = 0, commit_max = 0, save_ms = 0, log_ms, diff_ms, open_ms,
	    load_ms;
	long long size_mid = 0, size_end;
	int tail = nrev / 10 > 0 ? nrev / 10 : 1, mid = nrev - tail, no, nlog = 10, ndiff = 100;
	size_t n;

	snprintf(dir, sizeof dir, "%s/bench_store.XXXXXX", argc > 2 ? argv[2] :
	    getenv("TMPDIR") != NULL ? getenv("TMPDIR") : "/tmp");
	if (mkdtemp(dir) == NULL) {
		perror("bench_store: mkdtemp");
		return 2;
	}
	snprintf(path, sizeof path, "%s/bench.db", dir);
	printf("bench_store: %zu elements, %d setups, database %s\n",
	    model_count(&b->path), nrev, path);
	if ((s = store_open(path, &cause)) == NULL)
		die("open", cause);
	if (store_bench_create(s, b, "start", "bench", &cause) != 0)
		die("create", cause);
	srand(12345);
	for (int r = 2; r <= nrev; r++) {
		/* One value of one element, new each time: a length, a focal
		 * length or a reflectance. */
		int e = rand() % 44;
		char id[16], val[48];
		double t1;

		snprintf(id, sizeof id, "E%d", e);
		if (e % 2 == 0)
			snprintf(val, sizeof val, "length=%d um", 50000 + r);
		else if (e % 6 == 1)
			snprintf(val, sizeof val, "focal=%d um", 200000 + r);
		else
			snprintf(val, sizeof val, "reflectance=%.6f", 0.9 + r * 1e-6);
		{
			char *kv[] = { val };

			if (edit_set_pairs(b, id, kv, 1, &cause) != 0)
				die("edit", cause);
		}
		t1 = now_ms();
		if (store_draft_save(s, "bench-50", b, &cause) != 0)
			die("draft save", cause);
		t0 = now_ms();
		if (store_commit(s, "bench-50", "one value", "bench", &no, &cause) != 0)
			die("record", cause);
		t1 = t0 - t1;
		t0 = now_ms() - t0;
		if (r > mid) {
			commit_ms += t0;
			save_ms += t1;
			if (t0 > commit_max)
				commit_max = t0;
		}
		if (r == mid) {
			store_close(s);        /* checkpoints: the file holds it all */
			size_mid = file_size(path);
			if ((s = store_open(path, &cause)) == NULL)
				die("reopen", cause);
		}
	}
	store_close(s);
	size_end = file_size(path);

	t0 = now_ms();
	for (int i = 0; i < 20; i++) {
		if ((s = store_open(path, &cause)) == NULL)
			die("open", cause);
		if (i < 19)
			store_close(s);
	}
	open_ms = (now_ms() - t0) / 20;

	t0 = now_ms();
	for (int i = 0; i < nlog; i++) {
		if (store_log(s, "bench-50", &revs, &n, &cause) != 0)
			die("history", cause);
		store_revs_free(revs, n);
	}
	log_ms = (now_ms() - t0) / nlog;

	t0 = now_ms();
	for (int i = 0; i < ndiff; i++) {
		struct diff *d;

		snprintf(rev, sizeof rev, "%d", 1 + rand() % nrev);
		snprintf(rev2, sizeof rev2, "%d", 1 + rand() % nrev);
		if ((x = store_bench_load(s, "bench-50", rev, NULL, &cause)) == NULL ||
		    (y = store_bench_load(s, "bench-50", rev2, NULL, &cause)) == NULL)
			die("load", cause);
		d = diff_run(x, y);
		diff_free(d);
		model_bench_free(x);
		model_bench_free(y);
	}
	diff_ms = (now_ms() - t0) / ndiff;

	t0 = now_ms();
	for (int i = 0; i < ndiff; i++) {
		snprintf(rev, sizeof rev, "%d", 1 + rand() % nrev);
		if ((x = store_bench_load(s, "bench-50", rev, NULL, &cause)) == NULL)
			die("load", cause);
		model_bench_free(x);
	}
	load_ms = (now_ms() - t0) / ndiff;
	store_close(s);

	printf("record:   %.3f ms mean, %.3f ms max over the last %d records "
	    "(limit 5 ms)\n", commit_ms / tail, commit_max, tail);
	printf("draft:    %.3f ms mean to save the draft before each record\n", save_ms / tail);
	printf("history:  %.3f ms for %d setups (limit 50 ms)\n", log_ms, nrev);
	printf("compare:  %.3f ms for two random setups: load both, compare, "
	    "trace both (limit 5 ms)\n", diff_ms);
	printf("load:     %.3f ms for one setup\n", load_ms);
	printf("open:     %.3f ms (limit 20 ms)\n", open_ms);
	printf("size:     %.0f bytes per one-value setup over the last %d "
	    "(limit 2048); file %lld bytes\n", (double)(size_end - size_mid) / tail, tail,
	    size_end);
	model_bench_free(b);
	unlink(path);
	rmdir(dir);
	return 0;
}
