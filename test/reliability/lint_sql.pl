#!/usr/bin/perl
# lint_sql.pl - checks extension install and upgrade scripts against
# PostgreSQL's "Security Considerations for Extension Scripts"
# (documentation, section 38.17) and our house rules (STYLE.md):
#
#   echo      the script starts with \echo Use "CREATE|ALTER EXTENSION ..." \quit
#   replace   no CREATE OR REPLACE, no CREATE ... IF NOT EXISTS
#   definer   no SECURITY DEFINER
#   name      every created object is schema-qualified (@extschema@. etc.)
#   unqual    every other name the script refers to (types, functions,
#             operators) is schema-qualified: pg_catalog., @extschema@. ...
#   body      SQL-language function bodies qualify their function calls and
#             casts, and write operators as OPERATOR(schema.op)
#   atomic    so do standard SQL bodies (RETURN ..., BEGIN ATOMIC ... END):
#             they are bound when the script runs, but with the script's
#             search_path, which starts with the target schema, where
#             others may have planted look-alikes
#   plpgsql   PL/pgSQL functions carry SET search_path (their bodies are
#             not parsed here)
#
# A DO block's own code is not checked, but the statements it builds are:
# every dollar-quoted string in it that starts with CREATE, COMMENT or
# ALTER is linted like a statement of the script, with format()'s %I
# placeholders (a schema read from pg_extension, as PostgreSQL 15 has no
# @extschema:name@) standing for a qualifier.  Upgrade scripts
# (EXT--FROM--TO.sql) may CREATE OR REPLACE FUNCTION: they replace
# functions of the extension, and PostgreSQL refuses to replace a function
# that is not a member.
#
# The check is lexical: parameter and column names, keywords and the names
# of languages and access methods are recognised and allowed.  A script
# may allow further names in a comment line
#   -- lint_sql: allow geometry geography
# for the types of a required extension, which PostgreSQL 15 offers no
# placeholder to qualify (@extschema:name@ came in 16) and which CREATE
# EXTENSION finds through the search_path it sets (the target schema, the
# schemas of required extensions, then pg_temp); say why beside it.
#
# Usage: lint_sql.pl FILE...      prints one TAP-like line per file
#        lint_sql.pl --self-test  lints a script with one planted
#                                 violation of each rule, which must all
#                                 be found
use strict;
use warnings;

# Words that may stand unqualified: SQL keywords of DDL, languages, access
# methods, function attributes.  Type and function names are not here.
my %KEYWORD = map { $_ => 1 } qw(
	add after aggregate all alter and any as asc atomic before begin between
	by c called cascade cast class collate comment commutator cost create
	current_user default definer delete deterministic desc distinct do drop
	each else end execute exists extension false family fetch filter first
	for from function gin gist hash hashes immutable implicit in index
	inherits inout input insert instead internal into invoker is join
	language last leakproof left leftarg like limit local materialized
	merges negator not null nulls of offset on only operator options or
	order out over owner parallel partition plpgsql procedure public
	recheck replace restrict restricted return returns right rightarg
	rows safe schema search security select sequence set setof sfunc
	some sql stable statement storage strict stype support table temp
	temporary then to trigger true type unsafe update using values
	variadic view volatile when where window with without assignment
	btree brin spgist combinefunc finalfunc initcond msfunc minvfunc
	mstype msspace mfinalfunc sspace serialfunc deserialfunc sortop
	hypothetical finalfunc_extra finalfunc_modify mfinalfunc_extra
	receive send input output typmod_in typmod_out analyze alignment
	internallength passedbyvalue category preferred element delimiter
	collatable subtype canonical subtype_diff multirange_type_name
	hashes merges rows row array case coalesce nullif greatest least
	cast extract overlay position substring trim within ignore respect
	interval zone
);

# Lets a plain function-call syntax pass in a body: these are grammar, not functions.
my %BODY_GRAMMAR = map { $_ => 1 }
  qw(case coalesce nullif greatest least exists array row in any some all values
  cast extract overlay position substring trim filter over within select from
  where and or not on using returns table lateral);

# Option values written as bare words: ALIGNMENT = double, STORAGE = plain,
# INTERNALLENGTH = VARIABLE.
my %WORD_VALUED_OPTION = map { $_ => 1 } qw(alignment storage category preferred internallength
  collatable passedbyvalue delimiter);

my @findings;
my %allowed;
our $in_do = '';			# set while linting a statement a DO block builds
my $upgrade = 0;		# linting an upgrade script


# Records a finding at a line.
sub finding
{
	my ($file, $line, $rule, $msg) = @_;
	push @findings, "$file:$line: [$rule] $msg$in_do";
}

# Splits a script into statements, each with its first line, its text with
# comments removed and string literals replaced by '?', and its quoted
# bodies (the contents of $tag$...$tag$ and of '...' after AS).
sub statements
{
	my ($text) = @_;
	my @out;
	my ($cur, $line, $start, @bodies) = ('', 1, 1);
	my $i = 0;
	my $n = length $text;
	my $prev_word = '';
	while ($i < $n)
	{
		my $c = substr($text, $i, 1);
		my $rest = substr($text, $i, 2);
		if ($rest eq '--')
		{
			my $e = index($text, "\n", $i);
			$e = $n if $e < 0;
			$i = $e;
			next;
		}
		if ($rest eq '/*')
		{
			my $e = index($text, '*/', $i + 2);
			$e = $n - 2 if $e < 0;
			$line += () = substr($text, $i, $e + 2 - $i) =~ /\n/g;
			$i = $e + 2;
			next;
		}
		if ($c eq '$' && substr($text, $i) =~ /^(\$([A-Za-z_][A-Za-z0-9_]*)?\$)/)
		{
			my $tag = $1;
			my $e = index($text, $tag, $i + length $tag);
			$e = $n if $e < 0;
			my $body = substr($text, $i + length $tag, $e - $i - length $tag);
			push @bodies, [$body, $line];
			$line += () = $body =~ /\n/g;
			$cur .= "'?'";
			$i = $e + length $tag;
			next;
		}
		if ($c eq "'")
		{
			my $j = $i + 1;
			while ($j < $n)
			{
				if (substr($text, $j, 1) eq "'")
				{
					last unless substr($text, $j + 1, 1) eq "'";
					$j++;
				}
				$j++;
			}
			my $lit = substr($text, $i + 1, $j - $i - 1);
			push @bodies, [$lit =~ s/''/'/gr, $line] if $prev_word eq 'as';
			$line += () = $lit =~ /\n/g;
			$cur .= "'?'";
			$i = $j + 1;
			next;
		}
		if ($c eq '\\' && $cur =~ /^\s*$/)
		{
			# a psql meta-command line, kept as its own statement
			my $e = index($text, "\n", $i);
			$e = $n if $e < 0;
			push @out, {line => $line, text => substr($text, $i, $e - $i), bodies => [], meta => 1};
			$i = $e;
			next;
		}
		if ($c eq ';')
		{
			push @out, {line => $start, text => $cur, bodies => [@bodies]} if $cur =~ /\S/;
			($cur, @bodies) = ('');
			$i++;
			next;
		}
		$start = $line if $cur !~ /\S/ && $c =~ /\S/;
		$line++ if $c eq "\n";
		$prev_word = lc $1 if $c =~ /\S/ && substr($text, $i) =~ /^([A-Za-z_]+)/;
		$prev_word = '' if $c =~ /[^\sA-Za-z_]/;
		$cur .= $c;
		$i++;
	}
	push @out, {line => $start, text => $cur, bodies => [@bodies]} if $cur =~ /\S/;
	return @out;
}

# Tokens of a statement: qualified names (a.b, @extschema@.b, a."b"),
# words, quoted identifiers, operators and punctuation.
sub tokens
{
	my ($s) = @_;
	my @t;
	my $word = qr/(?:"(?:[^"]|"")+"|[A-Za-z_][A-Za-z0-9_\$]*|\@extschema(?::[A-Za-z_0-9]+)?\@)/;
	while ($s =~ /\G\s*(
			(?:$word\s*\.\s*)+(?:$word|[-+*\/<>=~!\@#%^&|`?]+)  # qualified
			| $word
			| '\?'
			| ::
			| [0-9]+(?:\.[0-9]*)?(?:[eE][-+]?[0-9]+)?
			| [-+*\/<>=~!\@#%^&|`?]+
			| [(),\[\].;:]
		)/gcx)
	{
		push @t, $1;
	}
	return @t;
}

sub is_word      { return $_[0] =~ /^(?:"|[A-Za-z_])/ && $_[0] !~ /\./; }
sub is_qualified { return $_[0] =~ /\./; }
sub is_operator  { return $_[0] =~ /^[-+*\/<>=~!\@#%^&|`?]+$/ && $_[0] ne '='; }

# Positions of tokens that are parameter or column names in a
# parenthesised list starting at index $open: "[mode] name type ...".
sub param_names
{
	my ($t, $open) = @_;
	my %names;
	my ($depth, $elem_start) = (0, $open + 1);
	for (my $k = $open; $k < @$t; $k++)
	{
		$depth++ if $t->[$k] eq '(';
		$depth-- if $t->[$k] eq ')';
		if (($depth == 1 && $t->[$k] eq ',') || $depth == 0)
		{
			my @e = ($elem_start .. $k - 1);
			shift @e while @e && $t->[$e[0]] =~ /^(?:in|out|inout|variadic)$/i;
			$names{$e[0]} = 1 if @e >= 2 && is_word($t->[$e[0]])
			  && (is_word($t->[$e[1]]) || is_qualified($t->[$e[1]]));
			$elem_start = $k + 1;
		}
		last if $depth == 0;
	}
	return %names;
}

# Checks one statement outside quoted bodies.
sub check_statement
{
	my ($file, $st) = @_;
	my $s = $st->{text};
	my $l = $st->{line};
	my @t = tokens($s);
	my $head = lc join ' ', grep { is_word($_) } @t[0 .. ($#t < 5 ? $#t : 5)];

	finding($file, $l, 'replace', 'CREATE OR REPLACE adopts an object planted beforehand')
	  if $s =~ /\bor\s+replace\b/i && !($upgrade && $head =~ /^create or replace function\b/);
	finding($file, $l, 'replace', 'IF NOT EXISTS adopts an object planted beforehand')
	  if $head =~ /^create/ && $s =~ /\bif\s+not\s+exists\b/i;
	finding($file, $l, 'definer', 'SECURITY DEFINER') if $s =~ /\bsecurity\s+definer\b/i;

	if ($head =~ /^create (?:or replace )?(?:function|procedure|aggregate|type|domain|table|view|materialized view|sequence|operator class|operator family|operator|collation|conversion)\b/)
	{
		my ($k) = grep { lc($t[$_]) !~ /^(?:create|or|replace|function|procedure|aggregate|type|domain|table|view|materialized|sequence|operator|class|family|collation|conversion|temp|temporary)$/ } 0 .. $#t;
		finding($file, $l, 'name', "created object $t[$k] is not schema-qualified")
		  if defined $k && !is_qualified($t[$k]) && $t[$k] ne '(';
	}

	my %skip;
	for (my $k = 0; $k < @t; $k++)
	{
		# the name list of CREATE FUNCTION (...) and RETURNS TABLE (...)
		if ($t[$k] eq '(' && $k > 0 && (is_qualified($t[$k - 1]) || lc $t[$k - 1] eq 'table')
			&& $head =~ /^create (?:or replace )?(?:function|procedure)/)
		{
			%skip = (%skip, param_names(\@t, $k));
		}
		# columns of CREATE TABLE (...)
		if ($t[$k] eq '(' && $k > 0 && $head =~ /^create (?:temp |temporary )?table/ && is_qualified($t[$k - 1]))
		{
			%skip = (%skip, param_names(\@t, $k));
		}
	}
	my $in_operator_ref = 0;
	my $is_function = $head =~ /^create (?:or replace )?(?:function|procedure)/;
	for (my $k = 0; $k < @t; $k++)
	{
		my $w = $t[$k];
		next if $skip{$k};
		# A SQL-standard body (RETURN expr, or BEGIN ATOMIC ... END) is parsed
		# when the function is created, with the script's search_path (the
		# target schema first, then those of the extensions it requires),
		# and bound then: its calls, casts and operators must be qualified.
		if ($is_function && (lc $w eq 'return' || (lc $w eq 'begin' && lc($t[$k + 1] // '') eq 'atomic')))
		{
			check_body_tokens($file, $l, 'atomic', [@t[$k + 1 .. $#t]]);
			last;
		}
		if (lc $w eq 'operator' && ($t[$k + 1] // '') eq '(')
		{
			$in_operator_ref = 1;
			next;
		}
		if ($in_operator_ref)
		{
			finding($file, $l, 'unqual', "operator $w is not schema-qualified")
			  if $w ne '(' && $w ne ')' && !is_qualified($w);
			$in_operator_ref = 0 if $w eq ')';
			next;
		}
		if (is_word($w) && !$KEYWORD{lc $w} && !$allowed{lc $w} && $w !~ /^\@extschema/)
		{
			next if ($t[$k + 1] // '') eq '=' && $head =~ /^create/;	# option names
			next if $k >= 2 && $t[$k - 1] eq '=' && $WORD_VALUED_OPTION{lc $t[$k - 2]};
			finding($file, $l, 'unqual', "name $w is not schema-qualified");
		}
		elsif (is_operator($w) && !($w eq '*' && $head =~ /^(?:select|grant|revoke)/))
		{
			my $names_operator = $k >= 2 && $t[$k - 1] eq '=' && $t[$k - 2] =~ /^(?:commutator|negator)$/i;
			finding($file, $l, 'unqual', "operator $w is not written OPERATOR(schema.op)")
			  if $names_operator
			  || !($head =~ /^comment on operator/ || $head =~ /^(?:create|alter) operator/);
		}
	}
	finding($file, $l, 'plpgsql', 'PL/pgSQL function without SET search_path')
	  if $head =~ /^create (?:or replace )?(?:function|procedure)/ && $s =~ /\blanguage\s+plpgsql\b/i
	  && $s !~ /\bset\s+search_path\b/i;
	if ($head =~ /^create (?:or replace )?(?:function|procedure)/ && $s =~ /\blanguage\s+sql\b/i)
	{
		check_body($file, $_->[1], $_->[0]) for @{$st->{bodies}};
	}
	check_do_block($file, $_->[1], $_->[0]) for $head =~ /^do\b/ ? @{$st->{bodies}} : ();
}

# Lints the statements a DO block builds: its dollar-quoted strings that
# start with CREATE, COMMENT or ALTER, format()'s %I standing for a schema.
sub check_do_block
{
	my ($file, $l, $code) = @_;
	while ($code =~ /(\$(?:[A-Za-z_][A-Za-z0-9_]*)?\$)(.*?)\1/sg)
	{
		my $inner = $2;
		my $at = $l + (() = substr($code, 0, $-[0]) =~ /\n/g);
		next unless $inner =~ /^\s*(?:create|comment|alter)\b/i;
		$inner =~ s/%(?:[0-9]+\$)?I\./placeholder_schema./g;
		$inner =~ s/%%/%/g;
		local $in_do = ' (in a statement a DO block builds)';
		for my $st (statements($inner))
		{
			$st->{line} += $at - 1;
			$_->[1] += $at - 1 for @{$st->{bodies}};
			check_statement($file, $st) unless $st->{meta};
		}
	}
}

# Checks a SQL-language function body: calls, casts and operators qualified.
sub check_body
{
	my ($file, $l, $body) = @_;
	check_body_tokens($file, $l, 'body', [tokens($body =~ s/'(?:[^']|'')*'/'?'/gr)]);
}

# Checks the tokens of a body under the given rule.
sub check_body_tokens
{
	my ($file, $l, $rule, $tok) = @_;
	my @t = @$tok;
	my $in_operator_ref = 0;
	for (my $k = 0; $k < @t; $k++)
	{
		my $w = $t[$k];
		if (lc $w eq 'operator' && ($t[$k + 1] // '') eq '(')
		{
			$in_operator_ref = 1;
			next;
		}
		if ($in_operator_ref)
		{
			finding($file, $l, $rule, "operator $w in a body is not schema-qualified")
			  if $w ne '(' && $w ne ')' && !is_qualified($w);
			$in_operator_ref = 0 if $w eq ')';
			next;
		}
		# a table alias with column names: ... AS x(a, b)
		next if is_word($w) && $k > 0 && lc $t[$k - 1] eq 'as';
		if (is_word($w) && ($t[$k + 1] // '') eq '(' && !$BODY_GRAMMAR{lc $w} && !$allowed{lc $w})
		{
			finding($file, $l, $rule, "call of $w in a body is not schema-qualified");
		}
		elsif ($w eq '::' && defined $t[$k + 1] && !is_qualified($t[$k + 1]))
		{
			finding($file, $l, $rule, "cast to $t[$k + 1] in a body is not schema-qualified");
		}
		elsif (is_operator($w) || $w eq '=')
		{
			next if $w eq '*' && $k > 0 && $t[$k - 1] =~ /^(?:\(|,|select)$/i;
			finding($file, $l, $rule, "operator $w in a body is not written OPERATOR(schema.op)");
		}
	}
}

# Lints one file; returns the number of statements checked.
sub lint_file
{
	my ($file, $text) = @_;
	my @st = statements($text);

	$upgrade = $file =~ /--[^\/]*--[^\/]*\.sql$/ ? 1 : 0;
	%allowed = ();
	while ($text =~ /^\s*--\s*lint_sql:\s*allow\s+([^\n]*)/mg)
	{
		$allowed{lc $_} = 1 for split ' ', $1 =~ s/\(.*//r;
	}
	my ($first) = grep { $_->{text} =~ /\S/ } @st;
	if (!$first || !$first->{meta} || $first->{text} !~ /^\\echo Use "(?:CREATE|ALTER) EXTENSION [^"]*".*\\quit\s*$/)
	{
		finding($file, $first ? $first->{line} : 1, 'echo',
				'the script does not start with \echo Use "CREATE|ALTER EXTENSION ..." ... \quit');
	}
	for my $s (@st)
	{
		next if $s->{meta};
		check_statement($file, $s);
	}
	return scalar @st;
}

# A script with one planted violation of each rule, for --self-test.
my $BAD = <<'SQL';
CREATE FUNCTION @extschema@.f(a pg_catalog.point[]) RETURNS float8
AS 'MODULE_PATHNAME', 'f' LANGUAGE C;
CREATE OR REPLACE FUNCTION @extschema@.g(x pg_catalog.float8) RETURNS pg_catalog.float8
AS 'MODULE_PATHNAME', 'g' LANGUAGE C SECURITY DEFINER;
CREATE FUNCTION h(x pg_catalog.float8) RETURNS pg_catalog.float8
AS $$ SELECT abs(x) + 1 $$ LANGUAGE sql;
CREATE FUNCTION @extschema@.k(x pg_catalog.float8) RETURNS pg_catalog.float8
AS $$ BEGIN RETURN x; END $$ LANGUAGE plpgsql;
CREATE TABLE IF NOT EXISTS @extschema@.t (id pg_catalog.int4);
CREATE FUNCTION @extschema@.m(x pg_catalog.float8) RETURNS pg_catalog.float8
LANGUAGE sql RETURN st_srid(x);
SQL

# A DO block building a statement with a violation (an unqualified call in
# a standard body), and the same with the call qualified: --self-test
# wants a finding in the first and none in the second.
my $BAD_DO = <<'SQL';
\echo Use "CREATE EXTENSION x" to load this file. \quit
DO $do$
BEGIN
	EXECUTE pg_catalog.format($sql$
CREATE FUNCTION @extschema@.n(g %1$I.geometry) RETURNS pg_catalog.int4
LANGUAGE sql RETURN st_srid(g);
$sql$, 'gis');
END $do$;
SQL
(my $GOOD_DO = $BAD_DO) =~ s/RETURN st_srid/RETURN %1\$I.st_srid/;

if (@ARGV && $ARGV[0] eq '--self-test')
{
	lint_file('self-test.sql', $BAD);
	my %seen = map { /\[(\w+)\]/ ? ($1 => 1) : () } @findings;
	my @rules = qw(echo replace definer name unqual body atomic plpgsql);
	my @missed = grep { !$seen{$_} } @rules;
	my @bad_findings = @findings;
	@findings = ();
	lint_file('self-test-do.sql', $BAD_DO);
	push @missed, 'a statement built in a DO block' unless grep { /DO block builds/ } @findings;
	push @bad_findings, @findings;
	@findings = ();
	lint_file('self-test-do-good.sql', $GOOD_DO);
	push @missed, 'no finding in a clean DO block (' . join('; ', @findings) . ')' if @findings;
	@findings = @bad_findings;
	if (@missed)
	{
		print "not ok 1 - lint_sql self-test: planted violations not found: @missed\n";
		print "    $_\n" for @findings;
		exit 1;
	}
	print "ok 1 - lint_sql self-test: a planted violation of each of the " . scalar(@rules) . " rules is found\n";
	exit 0;
}

my $k = 0;
my $failed = 0;
for my $file (@ARGV)
{
	@findings = ();
	open my $fh, '<', $file or die "$file: $!";
	my $text = do { local $/; <$fh> };
	close $fh;
	my $n = lint_file($file, $text);
	$k++;
	if (@findings)
	{
		$failed++;
		print "not ok $k - $file breaks the extension-script rules\n";
		print "    $_\n" for @findings;
	}
	else
	{
		print "ok $k - $file: $n statements follow the extension-script rules\n";
	}
}
exit($failed ? 1 : 0);
