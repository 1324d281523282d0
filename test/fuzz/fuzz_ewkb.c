/*
 * fuzz_ewkb.c - libFuzzer target for the EWKB/WKB decoder of the PostGIS
 * layer (src/postgis/ewkb.c, compiled unchanged against the PostgreSQL 15 headers;
 * the server's error and memory functions are stubbed in pg_stubs.c).
 *
 * The input bytes are the EWKB, copied into a buffer of exactly their size,
 * so AddressSanitizer reports any read past its end.  Properties: no crash
 * and no undefined behaviour; every refusal is an ERROR with one of the
 * documented SQLSTATEs (invalid binary representation, invalid parameter
 * value, numeric value out of range, and data exception for NaN or infinite
 * coordinates), a lower-case message and a detail sentence; an accepted value is a curve of 1 or more finite vertices of
 * dimension 2 or 3; the quiet decoder (for index keys) accepts exactly what
 * the raising one accepts.
 */
#include "postgres.h"

#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "ewkb.h"
#include "pg_stubs.h"

#undef fprintf

/* Reports a violated property and aborts, so libFuzzer saves the input. */
static void
fail(const char *what)
{
	fprintf(stderr, "property violated: %s (sqlstate %d, message \"%s\", detail \"%s\")\n",
			what, stub_error.sqlerrcode, stub_error.message, stub_error.detail);
	abort();
}

/* Is an accepted curve well formed? */
static void
check_curve(const ewkb_curve *c)
{
	if (c->n < 1 || (c->dim != 2 && c->dim != 3) || c->coords == NULL)
		fail("accepted a value that is no curve");
	for (size_t i = 0; i < c->n * (size_t) c->dim; i++)
		if (!isfinite(c->coords[i]))
			fail("accepted a non-finite coordinate");
}

int			LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
	uint8	   *buf = malloc(size > 0 ? size : 1);
	sigjmp_buf	jb;
	ewkb_curve	curve,
				quiet;
	bool		accepted = false,
				quiet_ok;

	memcpy(buf, data, size);
	memset(&curve, 0, sizeof(curve));
	stub_error.sqlerrcode = 0;
	if (sigsetjmp(jb, 0) == 0)
	{
		stub_catch = &jb;
		ewkb_decode(buf, size, 1, &curve);
		stub_catch = NULL;
		accepted = true;
		check_curve(&curve);
	}
	else
	{
		stub_catch = NULL;
		if (stub_error.internal)
			fail("an internal error (elog) from user-supplied bytes");
		if (stub_error.sqlerrcode != ERRCODE_INVALID_BINARY_REPRESENTATION &&
			stub_error.sqlerrcode != ERRCODE_INVALID_PARAMETER_VALUE &&
			stub_error.sqlerrcode != ERRCODE_NUMERIC_VALUE_OUT_OF_RANGE &&
			stub_error.sqlerrcode != ERRCODE_DATA_EXCEPTION)
			fail("an undocumented SQLSTATE");
		if (stub_error.message[0] == '\0' || isupper((unsigned char) stub_error.message[0]))
			fail("message not lower-case");
		if (stub_error.detail[0] == '\0' || stub_error.detail[strlen(stub_error.detail) - 1] != '.')
			fail("detail is not a sentence");
	}
	memset(&quiet, 0, sizeof(quiet));
	quiet_ok = ewkb_decode_quiet(buf, size, &quiet);
	if (quiet_ok != accepted)
		fail("the quiet decoder disagrees with the raising one");
	if (quiet_ok)
	{
		check_curve(&quiet);
		if (quiet.n != curve.n || quiet.dim != curve.dim ||
			memcmp(quiet.coords, curve.coords, curve.n * curve.dim * sizeof(double)) != 0)
			fail("the quiet decoder decoded another curve");
	}
	stub_palloc_reset();		/* the memory context of the call goes */
	free(buf);
	return 0;
}
