# frechet_ext - PGXS build.  `make`, `make install`, `make installcheck`
# (against a running server), `make check-core` (engine unit tests),
# `make bench`.  See DEVELOPERS.md.

EXTENSION = frechet_ext
MODULE_big = frechet_ext
EXTVERSION = 0.1

CORE_OBJS = src/core/freespace.o src/core/decide.o src/core/distance.o \
	src/core/discrete.o
OBJS = $(CORE_OBJS) src/frechet_ext.o src/point_array.o

# Index: cheap bounds in the engine, GiST operator class, planner support.
CORE_OBJS += src/core/bounds.o
OBJS += src/track_key.o src/gist.o src/support.o

DATA_built = sql/frechet_ext--$(EXTVERSION).sql
EXTRA_CLEAN = sql/frechet_ext--$(EXTVERSION).sql test/core/*.bin \
	regression.diffs regression.out results

REGRESS = $(patsubst test/sql/%.sql,%,$(sort $(wildcard test/sql/*.sql)))
REGRESS_OPTS = --inputdir=test --load-extension=frechet_ext

PG_CFLAGS = -Wall -Wextra -Wno-unused-parameter -Wno-missing-field-initializers \
	-Wno-sign-compare -Werror=implicit-function-declaration
PG_CPPFLAGS = -I$(srcdir)/src/core

# Debian installs several majors side by side; prefer 15, the supported one.
PG_CONFIG ?= $(firstword $(wildcard /usr/lib/postgresql/15/bin/pg_config) pg_config)
PGXS := $(shell $(PG_CONFIG) --pgxs)
include $(PGXS)

sql/frechet_ext--$(EXTVERSION).sql: sql/frechet_ext.sql
	cp $< $@

# Engine unit tests: plain C, no server needed.
CORE_SRC = $(CORE_OBJS:.o=.c)
CORE_TEST_CFLAGS = -std=c11 -O2 -g -Wall -Wextra -Wno-unused-parameter -Isrc/core

test/core/test_engine.bin: test/core/test_engine.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_engine.c $(CORE_SRC) -lcmocka -lm

test/core/test_geos.bin: test/core/test_geos.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_geos.c $(CORE_SRC) -lgeos_c -lcmocka -lm

CORE_TESTS = test/core/test_engine.bin test/core/test_geos.bin

.PHONY: check-core bench
check-core: $(CORE_TESTS)
	@set -e; for t in $(CORE_TESTS); do ./$$t; done

bench:
	$(MAKE) -C bench

# Index: unit tests of the summaries and cheap bounds.
test/core/test_bounds.bin: test/core/test_bounds.c test/core/testutil.h $(CORE_SRC) src/core/*.h
	$(CC) $(CORE_TEST_CFLAGS) -o $@ test/core/test_bounds.c $(CORE_SRC) -lcmocka -lm

CORE_TESTS += test/core/test_bounds.bin
